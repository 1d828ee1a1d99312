"""Modal dialogs of the terminal app."""
