"""What the project file can store, told field by field as the designer types (no Textual).

The project file's JSON Schema (``curvetui/data/project-schema.json``) is checked on one
bend at a time; each problem is given to the field it concerns, named by its label in the
form ("speed: the project file takes a number from 1 to 400, got 500"), not by a JSON path.
A refused save names the bend and the field the same way.
"""

from __future__ import annotations

import re
from functools import cache

from curvetui.app.field_text import field_label
from curvetui.storage.project.files import _describe, project_schema
from curvetui.storage.project.model import Bend
from curvetui.storage.project.quick_check import conforms

FORM_LABELS = {"id": "bend id", "station": "station", "notes": "notes", "kind": "kind"}
FORM_KEYS = {"id": "bend_id", "station": "station", "notes": "notes", "kind": "kind"}
_PATH = re.compile(r"^\$(?:\.bends\[(\d+)\])?((?:\.[A-Za-z_]+)*)(\[\d+\])?: ?(.*)$", re.S)


@cache
def _bend_schema() -> dict:
    schema = project_schema()
    return {"$defs": schema["$defs"], "$ref": "#/$defs/bend"}


@cache
def _bend_validator():
    from jsonschema import Draft202012Validator

    return Draft202012Validator(_bend_schema())


def file_problems(bend: Bend) -> dict[str, str]:
    """Field key (an input's key, or bend_id, station, notes) -> why the project file cannot
    store that field as it is now: the first problem of each field, in the form's words.
    A bend the quick check passes has none (jsonschema, for the words, only otherwise)."""
    data = bend.to_json()
    if conforms(data, _bend_schema()):
        return {}
    out: dict[str, str] = {}
    for error in _bend_validator().iter_errors(data):
        key, text = _field_and_text(_describe(error))
        if key is not None and key not in out:
            out[key] = text
    return out


def _field_and_text(problem: str) -> tuple[str | None, str]:
    """('speed', 'speed: the project file takes ...') from '$.inputs.speed: must be ...'."""
    m = _PATH.match(problem)
    if m is None:
        return None, problem
    parts = [p for p in m.group(2).split(".") if p]
    why = m.group(4)
    if parts[:1] == ["inputs"] and len(parts) >= 2:
        key, label = parts[1], field_label(parts[1])
    elif parts[:1] == ["inputs"] and why.startswith("missing '"):
        key = why.split("'")[1]
        return key, f"{field_label(key)}: required by the project file"
    elif parts and parts[0] in FORM_KEYS:
        key, label = FORM_KEYS[parts[0]], FORM_LABELS[parts[0]]
    else:
        return None, problem
    return key, f"{label}: the project file {_file_words(why)}"


def _file_words(why: str) -> str:
    """'must be a number from 1 to 400, got 500' -> 'takes a number from 1 to 400, got 500'."""
    why = re.sub(r"^text length must be (.*)", r"takes \1", why)
    return re.sub(r"^must be\b", "takes", why)


def readable_problems(problems: list[str], bends: list[Bend]) -> list[str]:
    """A refused save's problems with each '$.bends[i]...' path told as 'bend ID, field'."""
    out = []
    for problem in problems:
        m = _PATH.match(problem)
        if m is None or m.group(1) is None:
            out.append(problem.replace("$.details.", "project details, ").replace("$: ", ""))
            continue
        index = int(m.group(1))
        name = bends[index].id if index < len(bends) else f"#{index + 1}"
        _, text = _field_and_text("$" + problem[m.end(1) + 1 :])
        out.append(f"bend {name}, {text}")
    return out


def same_results(stored: dict | None, fresh: dict | None) -> bool:
    """Stored results that say what fresh ones say (to 1e-6, as the check on opening
    compares them; a key newer than the file that is null in the fresh ones is no change)."""
    if stored is None or fresh is None:
        return False
    from curvetui.storage.project.checking import differences  # the engine: loaded late

    return stored.get("messages") == fresh.get("messages") and not differences(stored, fresh)
