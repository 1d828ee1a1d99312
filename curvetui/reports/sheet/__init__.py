"""Printable bend worksheets (PDF, plain text, Markdown); every page carries the caution."""

from curvetui.reports.sheet.content import BendSheet, SheetSet, build
from curvetui.reports.sheet.output import RENDERERS, atomic_write_bytes, sheets_path, write_sheets
from curvetui.reports.sheet.pdf import render_pdf
from curvetui.reports.sheet.text import render_markdown, render_text

__all__ = [
    "RENDERERS",
    "BendSheet",
    "SheetSet",
    "atomic_write_bytes",
    "build",
    "render_markdown",
    "render_pdf",
    "render_text",
    "sheets_path",
    "write_sheets",
]
