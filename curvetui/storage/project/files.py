"""Reading, migrating, validating and saving project files (JSON, format versions 2 and 3).

Format 3 is format 2 with an optional ``alignment``; a project without one is written as
format 2 (so such files stay as they were, and older curvetui reads them), one with an
alignment as format 3 (an older curvetui then says it needs updating instead of refusing
an unknown key).

Loading reports every problem at once, each with its JSON path and the allowed range; a
file from a newer format is refused; version 1 files are migrated. Saving writes a
temporary file beside the target, fsyncs it and renames it over the old one, keeping the
previous file as FILE.bak, so a save killed at any moment leaves the old or the new file.
"""

from __future__ import annotations

import json
import math
import sys
from functools import cache
from importlib import resources
from pathlib import Path
from typing import Any

from curvetui.storage.files import atomic_write_text
from curvetui.storage.project.model import (
    DETAIL_FIELDS,
    FORMAT_VERSION,
    PLAIN_VERSION,
    Alignment,
    AlignmentLeg,
    AlignmentPoint,
    Bend,
    Details,
    Project,
)
from curvetui.storage.project.quick_check import conforms
from curvetui.storage.table_files import TableError, read_limited

MAX_PROJECT_BYTES = 200_000_000  # 200 MB: some 150,000 bends with notes and stored results


class ProjectError(ValueError):
    """A project file that cannot be used; ``problems`` lists every fault found."""

    def __init__(self, path: str, problems: list[str]):
        self.path = path
        self.problems = problems
        head = f"{path}: " + (problems[0] if len(problems) == 1 else f"{len(problems)} problems")
        super().__init__(head)


@cache
def project_schema() -> dict:
    """The JSON Schema of format version 2, shipped in the package."""
    text = (resources.files("curvetui") / "data" / "project-schema.json").read_text("utf-8")
    return json.loads(text)


def json_path(parts) -> str:
    out = "$"
    for p in parts:
        out += f"[{p}]" if isinstance(p, int) else f".{p}"
    return out


def _describe(error) -> str:
    """One schema error in plain words, with the allowed range where the schema gives one."""
    v, s = error.validator, error.schema
    where = json_path(error.absolute_path)
    got = error.instance
    if v == "required":
        missing = error.message.split("'")[1] if "'" in error.message else error.message
        return f"{where}: missing '{missing}'"
    if v in ("minimum", "maximum", "exclusiveMinimum", "exclusiveMaximum"):
        lo = s.get("minimum", s.get("exclusiveMinimum"))
        hi = s.get("maximum", s.get("exclusiveMaximum"))
        lo_word = "greater than" if "exclusiveMinimum" in s else "from"
        rng = f"{lo_word} {lo:g} to {hi:g}" if lo is not None and hi is not None else ""
        return f"{where}: must be a number {rng}, got {got!r}".replace("number ,", "number,")
    if v == "type":
        want = s["type"] if isinstance(s["type"], str) else " or ".join(s["type"])
        lo = s.get("minimum", s.get("exclusiveMinimum"))
        hi = s.get("maximum", s.get("exclusiveMaximum"))
        if lo is not None and hi is not None:
            lo_word = "greater than" if "exclusiveMinimum" in s else "from"
            return (
                f"{where}: must be a number {lo_word} {lo:g} to {hi:g}, got {json.dumps(got)[:40]}"
            )
        return f"{where}: must be {want}, got {json.dumps(got)[:40]}"
    if v == "enum":
        return f"{where}: must be one of {', '.join(map(repr, s['enum']))}, got {got!r}"
    if v == "const":
        return f"{where}: must be {s['const']!r}, got {got!r}"
    if v == "additionalProperties":
        return f"{where}: {error.message} (not a field of this format)"
    if v is False or "False schema" in str(error.message):  # the alignment's two forms
        return (
            f"{where}: an alignment gives either 'points', or 'start', 'start_bearing' and "
            "'legs', not both"
        )
    if v in ("minLength", "maxLength"):
        return (
            f"{where}: text length must be {s.get('minLength', 0)} to "
            f"{s.get('maxLength', 'any')} characters"
        )
    if v == "pattern":
        return f"{where}: must be a date written YYYY-MM-DD, got {got!r}"
    return f"{where}: {error.message}"


def validate(data: Any, quick: bool = False) -> list[str]:
    """Every schema problem of a parsed document, sorted by path. With ``quick`` a document
    the quick check finds conforming (quick_check.py: only when jsonschema would too) is
    passed without importing jsonschema; any other gets the full validation."""
    schema = project_schema()
    if quick and conforms(data, schema):
        problems = []
    else:
        from jsonschema import Draft202012Validator

        validator = Draft202012Validator(schema)
        errors = sorted(validator.iter_errors(data), key=lambda e: list(map(str, e.absolute_path)))
        problems = [_describe(e) for e in errors]
    if isinstance(data, dict) and isinstance(data.get("bends"), list):
        seen: dict[str, int] = {}
        for i, b in enumerate(data["bends"]):
            if isinstance(b, dict) and isinstance(b.get("id"), str):
                if b["id"] in seen:
                    problems.append(
                        f"$.bends[{i}].id: {b['id']!r} is used by bends[{seen[b['id']]}]"
                        " too; ids must be unique"
                    )
                seen.setdefault(b["id"], i)
    return problems


def migrate(data: dict, path: str) -> tuple[dict, list[str]]:
    """Bring an older document up to the current format; returns it and notes of what moved."""
    if not isinstance(data, dict):
        raise ProjectError(path, ["$: must be a JSON object"])
    version = data.get("curvetui_project_version")
    if isinstance(version, bool):
        raise ProjectError(path, ["$.curvetui_project_version: must be a whole number"])
    if version is None and data.get("format") == "curvetui-project":
        version = data.get("version")
    if version in (PLAIN_VERSION, FORMAT_VERSION):
        return data, []
    if isinstance(version, int) and version > FORMAT_VERSION:
        raise ProjectError(
            path,
            [
                f"$: written by a newer curvetui (format {version}); this one "
                f"reads formats 1 to {FORMAT_VERSION}: update curvetui"
            ],
        )
    if version == 1:
        bends = []
        if not isinstance(data.get("project", {}), dict):
            raise ProjectError(path, ["$.project: must be an object (format 1)"])
        if not isinstance(data.get("bends", []), list):
            raise ProjectError(path, ["$.bends: must be a list (format 1)"])
        for i, b in enumerate(data.get("bends", [])):
            if not isinstance(b, dict):
                raise ProjectError(path, [f"$.bends[{i}]: must be an object (format 1)"])
            b = dict(b)
            b.setdefault("notes", "")
            b.setdefault("results", None)
            bends.append(b)
        details = dict(data.get("project", {}))
        return (
            {"curvetui_project_version": PLAIN_VERSION, "details": details, "bends": bends},
            ["migrated from format 1: 'project' became 'details'"],
        )
    raise ProjectError(path, ["$: not a curvetui project file (no 'curvetui_project_version')"])


def parse_project(data: dict) -> Project:
    """A validated document as a Project."""
    d = data["details"]
    details = Details(**{k: d[k] for k in d}, absent=frozenset(DETAIL_FIELDS) - set(d))
    bends = [
        Bend(
            id=b["id"],
            kind=b["kind"],
            inputs=dict(b["inputs"]),
            station=_number(b.get("station", 0.0)),
            notes=b.get("notes", ""),
            results=b.get("results"),
            absent=frozenset({"station", "notes", "results"}) - set(b),
            nulls=frozenset(k for k, v in b["inputs"].items() if v is None),
        )
        for b in data["bends"]
    ]
    version = data["curvetui_project_version"]
    return Project(
        details, bends, alignment=parse_alignment(data.get("alignment")), version=version
    )


def parse_alignment(a: dict | None) -> Alignment | None:
    """A validated ``alignment`` object as the model (numbers as stored)."""
    if a is None:
        return None

    def point(p: dict) -> AlignmentPoint:
        return AlignmentPoint(p["easting"], p["northing"], p.get("bend"))

    out = Alignment(
        name=a.get("name", ""),
        start_station=a.get("start_station", 0.0),
        absent=frozenset({"name", "start_station"}) - set(a),
    )
    if "points" in a:
        out.points = [point(p) for p in a["points"]]
    else:
        out.start = point(a["start"])
        out.start_bearing = a["start_bearing"]
        out.legs = [
            AlignmentLeg(g["length"], g.get("bend"), g.get("deflection")) for g in a["legs"]
        ]
    return out


def _number(value) -> float:
    """A stored number as read (a whole number stays whole), once it is known to be one a
    float can hold."""
    float(value)
    return value


def load_project(path: str | Path) -> tuple[Project, list[str]]:
    """Load, migrate and validate a project; returns it and notes (e.g. a migration).

    Raises ProjectError listing every problem with its JSON path.
    """
    name = str(path)
    try:  # a regular file only (never a device or FIFO), of a bounded size
        raw = read_limited(path, MAX_PROJECT_BYTES, "project file")
    except TableError as exc:
        raise ProjectError(name, [str(exc).removeprefix(f"{path}: ")]) from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise ProjectError(name, ["not UTF-8 text"]) from None
    if not text.strip():
        raise ProjectError(name, ["the file is empty"])
    try:
        data = json.loads(text)  # NaN/Infinity parse, then are refused with their path
    except json.JSONDecodeError as exc:
        raise ProjectError(
            name,
            [
                f"not valid JSON (line {exc.lineno}, column {exc.colno}: "
                f"{exc.msg}); the file may be truncated or corrupt"
            ],
        ) from None
    except RecursionError:
        raise ProjectError(name, ["not a project: nested too deeply to read (corrupt?)"]) from None
    except ValueError as exc:  # a whole number beyond Python's digit limit for int()
        raise ProjectError(name, [f"not a project: a number cannot be read ({exc})"]) from None
    data, notes = migrate(data, name)
    problems = validate(data, quick=True) + non_finite_numbers(data)
    if problems:
        raise ProjectError(name, problems)
    project = parse_project(data)
    project.folder = Path(path).parent
    return project, notes


def non_finite_numbers(data, parts=()) -> list[str]:
    """Paths of numbers too large to be finite (1e999 reads as infinity; an integer such as
    1 followed by 400 zeros is read exactly, but no float holds it)."""
    out: list[str] = []
    if isinstance(data, dict):
        for k, v in data.items():
            out += non_finite_numbers(v, (*parts, k))
    elif isinstance(data, list):
        for i, v in enumerate(data):
            out += non_finite_numbers(v, (*parts, i))
    elif isinstance(data, float) and not math.isfinite(data):
        out.append(f"{json_path(parts)}: must be a finite number, got {data}")
    elif isinstance(data, int) and not isinstance(data, bool) and abs(data) > sys.float_info.max:
        out.append(
            f"{json_path(parts)}: must be a finite number (within +/-{sys.float_info.max:.4g}), "
            f"got a whole number of {len(str(abs(data)))} digits"
        )
    return out


def project_text(project: Project) -> str:
    """The file's JSON text: UTF-8 characters as they are, except when a text holds a lone
    surrogate (a file name's undecodable byte, or a \\ud800 escape read from a file),
    which UTF-8 cannot write: then every non-ASCII character is escaped, so the same
    text loads back."""
    data = project.to_json()
    text = json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False) + "\n"
    try:
        text.encode("utf-8")
    except UnicodeEncodeError:
        text = json.dumps(data, indent=2, ensure_ascii=True, allow_nan=False) + "\n"
    return text


def save_project(project: Project, path: str | Path, exclusive: bool = False) -> None:
    """Save atomically, keeping the previous file as FILE.bak. A project that would not load
    back (e.g. a name longer than the format allows) is refused before anything is written.
    With ``exclusive`` (a new project) an existing file is never replaced."""
    problems = validate(project.to_json())
    if problems:
        raise ProjectError(str(path), problems)
    try:
        text = project_text(project)
    except ValueError:
        raise ProjectError(str(path), ["a number in the project is not finite"]) from None
    atomic_write_text(path, text, backup=not exclusive, exclusive=exclusive)
