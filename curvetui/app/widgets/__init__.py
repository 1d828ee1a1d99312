"""Widgets of the terminal app."""
