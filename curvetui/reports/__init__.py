"""Printable output: the bend worksheets."""
