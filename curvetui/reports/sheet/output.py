"""The worksheets' entry point: a renderer per format, and the PDF written beside the project."""

from __future__ import annotations

from pathlib import Path

from curvetui.inputs import InputError
from curvetui.reports.sheet.pdf import render_pdf
from curvetui.reports.sheet.text import render_markdown, render_text
from curvetui.storage.files import atomic_binary

RENDERERS = {"pdf": render_pdf, "text": render_text, "md": render_markdown}


def atomic_write_bytes(path: str | Path, data: bytes) -> None:
    """Replace ``path`` with ``data`` via a temporary file beside it, fsync and rename
    (curvetui.storage.files.atomic_binary)."""
    with atomic_binary(path) as fh:
        fh.write(data)


def sheets_path(project_path: str | Path) -> Path:
    """PROJECT.sheets.pdf beside PROJECT.json."""
    p = Path(project_path)
    return p.with_name(f"{p.stem if p.suffix == '.json' else p.name}.sheets.pdf")


def write_sheets(session, current=None) -> Path:
    """Write the worksheets of every bend of the session's project (as edited, saved or not)
    beside its file and return the path. ``current`` (the bend on screen) is accepted for the
    app's call; every bend is printed."""
    if session.path is None:
        raise InputError("save the project first: its worksheets are written beside its file")
    out = sheets_path(session.path)
    atomic_write_bytes(out, render_pdf(session.project))
    return out
