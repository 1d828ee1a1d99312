"""The terminal app: a thin layer over the engine and the project model."""
