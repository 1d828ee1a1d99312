"""The columns of a batch file: what is read, and the result columns that are added.

Input columns are the bend's fields (``curvetui.bend.fields``, aliases included) plus
``id`` and ``kind``. Result columns are the record's outputs (``curvetui.bend.outputs``)
that do not repeat an input, named as the JSON keys (``transition.runoff``,
``geometry.tangent``); a result column whose name an input column already uses is written
with the prefix ``check.``.
"""

from __future__ import annotations

from curvetui.bend.fields import column_names
from curvetui.bend.outputs import OUTPUTS
from curvetui.bend.outputs import TEXT as TEXT_OUTPUT

FIELD_OF_COLUMN = column_names()  # column name (lower case) -> field key
INPUTS = ("id", "kind", *FIELD_OF_COLUMN)
REQUIRED = ("kind", "speed", "radius")

TEXT, FLOAT, INT = "text", "float", "int"

# (name, type) of every result column, in the order they are written
RESULTS: tuple[tuple[str, str], ...] = (
    ("units", TEXT),
    ("table", TEXT),
    ("limits", TEXT),
    *((o.key, TEXT if o.rounding == TEXT_OUTPUT else FLOAT) for o in OUTPUTS if not o.echo),
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
