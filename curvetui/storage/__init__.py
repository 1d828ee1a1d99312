"""Storage: design tables, project files and atomic writes (file I/O lives here)."""
