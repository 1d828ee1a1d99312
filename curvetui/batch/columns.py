"""The columns of a batch file: what is read, and the result columns that are added.

Result columns carry the JSON keys of ``curvetui check road`` and ``check rail``; the keys
of the nested ``transition`` and ``geometry`` objects are written ``transition.runoff``,
``geometry.tangent`` and so on. Keys that only repeat an input (speed, radius, cant,
low_speed, deflection) are not repeated, nor are stations (a batch has no PI station, so
they would only restate the tangent). A result column whose name an input column already
uses is written with the prefix ``check.``.
"""

from __future__ import annotations

from curvetui.results import RAIL_FIELDS, ROAD_FIELDS

# Input columns the batch reads (lower case; the file may use any case).
INPUTS = (
    "id",
    "kind",
    "speed",
    "radius",
    "superelevation",
    "emax",
    "friction",
    "cant",
    "low_speed",
    "gauge",
    "deflection",
    "spiral",
)
REQUIRED = ("kind", "speed", "radius")
NUMERIC = tuple(c for c in INPUTS if c not in ("id", "kind"))
ROAD_ONLY = ("superelevation", "emax", "friction")
RAIL_ONLY = ("cant", "low_speed", "gauge")

TEXT, FLOAT, INT = "text", "float", "int"

ROAD_TRANSITION_KEYS = (
    "spiral_length_min",
    "spiral_length_max",
    "length_comfort",
    "length_shift_min",
    "length_shift_max",
    "relative_gradient",
    "runoff",
    "runout",
)
RAIL_TRANSITION_KEYS = (
    "length",
    "length_cant_gradient",
    "length_cant_rate",
    "length_deficiency_rate",
)
CIRCULAR_KEYS = ("tangent", "length", "external", "middle_ordinate", "long_chord")
SPIRAL_KEYS = (
    "spiral_angle",
    "xs",
    "ys",
    "p",
    "k",
    "total_tangent",
    "external",
    "circular_length",
    "total_length",
)
GEOMETRY_KEYS = tuple(dict.fromkeys((*CIRCULAR_KEYS, *SPIRAL_KEYS)))

# (name, type) of every result column, in the order they are written
RESULTS: tuple[tuple[str, str], ...] = (
    ("units", TEXT),
    ("table", TEXT),
    ("limits", TEXT),
    ("e_max", FLOAT),
    *((key, FLOAT) for key in ROAD_FIELDS),
    ("cross_section", TEXT),
    *((key, FLOAT) for key in RAIL_FIELDS),
    ("degree_of_curve_arc", FLOAT),
    ("degree_of_curve_chord", FLOAT),
    ("transition.governing", TEXT),
    ("transition.status", TEXT),
    *((f"transition.{key}", FLOAT) for key in ROAD_TRANSITION_KEYS),
    *((f"transition.{key}", FLOAT) for key in RAIL_TRANSITION_KEYS),
    ("geometry.type", TEXT),
    *((f"geometry.{key}", FLOAT) for key in GEOMETRY_KEYS),
    ("row", INT),
    ("status", TEXT),
    ("messages", TEXT),
)
RESULT_NAMES = tuple(name for name, _ in RESULTS)
assert len(set(RESULT_NAMES)) == len(RESULT_NAMES)


def output_names(input_names: list[str]) -> list[str]:
    """Result column names as written after ``input_names``: ``check.`` before any that an
    input column already uses (compared without case)."""
    taken = {n.strip().lower() for n in input_names}
    return [f"check.{n}" if n in taken else n for n in RESULT_NAMES]
