"""Reading a project file (JSON): metadata and an ordered list of bends."""

from __future__ import annotations

import json
from pathlib import Path

from curvetui.inputs import InputError


def load_project(path: str | Path) -> dict:
    """Load a project file; a missing or malformed file raises InputError naming it."""
    try:
        text = Path(path).read_text(encoding="utf-8")
    except OSError as exc:
        raise InputError(f"{path}: cannot read ({exc.strerror})") from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(f"{path}: not valid JSON (line {exc.lineno}: {exc.msg})") from None
    if not isinstance(data, dict) or "project" not in data or "bends" not in data:
        raise InputError(f"{path}: not a curvetui project (needs 'project' and 'bends')")
    return data
