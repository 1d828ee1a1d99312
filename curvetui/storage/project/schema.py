"""The project file's input properties, made from the field list (``curvetui.bend.fields``).

The shipped JSON Schema (``curvetui/data/project-schema.json``) holds them under
``$defs.inputs``; a test keeps that part equal to ``inputs_schema()``. After adding or
changing a field, rewrite the file with ``python -m curvetui.storage.project.schema``.

A project file stores inputs in its own units, so each bound here is the widest over both
unit systems and both kinds; the exact range is checked when the bend is evaluated.
"""

from __future__ import annotations

import json
from pathlib import Path

from curvetui.bend.fields import FIELDS, STATION, Field
from curvetui.core.units import METRIC, US

SCHEMA_PATH = Path(__file__).resolve().parents[2] / "data" / "project-schema.json"
# the two ranges that depend on something else, as their widest bounds
DYNAMIC_BOUNDS = {"emax": (0.0, 20.0), "low_speed": (0.0, 400.0)}


def _bounds(f: Field) -> tuple[float, float] | None:
    if f.key in DYNAMIC_BOUNDS:
        return DYNAMIC_BOUNDS[f.key]
    pairs = [f.allowed(k, u) for k in f.kinds for u in (METRIC, US)]
    pairs = [p for p in pairs if p is not None]
    if not pairs:
        return None
    return min(p[0] for p in pairs), max(p[1] for p in pairs)


def _property(f: Field) -> dict:
    if f.choices:  # one of the field's words, any case (checked when the bend is evaluated)
        return {"type": ["string", "null"], "description": f.help}
    required_always = set(f.required) == {"road", "rail"}
    types = ["number"] if required_always else ["number", "null"]
    if f.unit == STATION:
        types.insert(1, "string")  # a station may be stored as written: 2+710.5
    out: dict = {"type": types[0] if len(types) == 1 else types, "description": f.help}
    bounds = _bounds(f)
    if bounds is not None and f.unit != STATION:
        lo, hi = bounds
        out["exclusiveMinimum" if f.lo_open else "minimum"] = lo
        out["maximum"] = hi
    return out


def inputs_schema() -> dict:
    """The ``$defs.inputs`` object of the project schema."""
    return {
        "type": "object",
        "required": [f.key for f in FIELDS if set(f.required) == {"road", "rail"}],
        "additionalProperties": False,
        "properties": {f.key: _property(f) for f in FIELDS},
    }


def _xy(description: str) -> dict:
    coordinate = {"type": "number", "minimum": -1e9, "maximum": 1e9}
    return {
        "type": "object",
        "description": description,
        "required": ["easting", "northing"],
        "additionalProperties": False,
        "properties": {
            "easting": coordinate,
            "northing": coordinate,
            "bend": {"type": "string", "minLength": 1, "maxLength": 40},
        },
    }


def alignment_schema() -> dict:
    """The ``$defs.alignment`` object: points by easting and northing, or a start point, a
    start bearing and legs (distance, and at each PI its bend and signed deflection)."""
    named = {
        "name": {"type": "string", "maxLength": 200},
        "start_station": {"type": "number", "minimum": -1e7, "maximum": 1e7},
    }
    points = {
        "type": "array",
        "description": "start point, PI 1 .. PI n (each naming a bend of the project), end "
        "point; at least three",
        "items": _xy("a point; a PI names the bend built at it"),
    }
    leg = {
        "type": "object",
        "required": ["length"],
        "additionalProperties": False,
        "properties": {
            "length": {"type": "number", "exclusiveMinimum": 0, "maximum": 1e9},
            "bend": {"type": "string", "minLength": 1, "maxLength": 40},
            "deflection": {"type": "number", "exclusiveMinimum": -180, "exclusiveMaximum": 180},
        },
    }
    return {
        "type": "object",
        "description": "the project's alignment: its points, coordinates and stations in the "
        "project's units; the bends at its PIs take their deflection and PI station from it",
        "additionalProperties": False,
        "properties": {
            **named,
            "points": points,
            "start": _xy("the start point"),
            "start_bearing": {
                "type": "number",
                "minimum": 0,
                "exclusiveMaximum": 360,
                "description": "whole-circle bearing of the first leg, degrees clockwise "
                "from north",
            },
            "legs": {
                "type": "array",
                "description": "distance from the previous point to each PI, with the bend "
                "and its deflection (degrees, + right, - left); the last leg to the end point",
                "items": leg,
            },
        },
        "if": {"required": ["points"]},
        "then": {"properties": {"start": False, "start_bearing": False, "legs": False}},
        "else": {"required": ["start", "start_bearing", "legs"]},
    }


def rail_required() -> list[str]:
    return [f.key for f in FIELDS if "rail" in f.required]


def write_schema(path: Path = SCHEMA_PATH) -> None:
    """Rewrite the shipped schema's inputs from the field list (a developer's command)."""
    schema = json.loads(path.read_text("utf-8"))
    schema["$defs"]["inputs"] = inputs_schema()
    bend = schema["$defs"]["bend"]
    bend["allOf"][0]["then"]["properties"]["inputs"]["required"] = rail_required()
    schema["$defs"]["alignment"] = alignment_schema()
    path.write_text(json.dumps(schema, indent=2, ensure_ascii=False) + "\n", "utf-8")


if __name__ == "__main__":
    write_schema()
