"""The columns of a batch file: what is read, and the result columns that are added.

Input columns are the bend's fields (``curvetui.bend.fields``, aliases included) plus
``id`` and ``kind``, and a curve register's columns (``REGISTER_FIELDS``: feature, begin
and end station, direction) that place each curve among its neighbours. Result columns
are the record's outputs (``curvetui.bend.outputs``) that do not repeat an input, named as
the JSON keys (``transition.runoff``, ``geometry.tangent``); a result column whose name an
input column already uses is written with the prefix ``check.``.
"""

from __future__ import annotations

from curvetui.bend.fields import REGISTER_FIELDS, column_names
from curvetui.bend.outputs import OUTPUTS, RUNOFF_STATIONS, SPIRAL_OUT, STATIONS
from curvetui.bend.outputs import TEXT as TEXT_OUTPUT

FIELD_OF_COLUMN = column_names()  # column name (lower case) -> field key
REGISTER_COLUMNS = tuple(f.key for f in REGISTER_FIELDS)
INPUTS = ("id", "kind", *FIELD_OF_COLUMN, *REGISTER_COLUMNS)
REQUIRED = ("kind", "speed", "radius")

TEXT, FLOAT, INT = "text", "float", "int"

# (name, type) of every result column, in the order they are written
RESULTS: tuple[tuple[str, str], ...] = (
    ("units", TEXT),
    ("table", TEXT),
    ("limits", TEXT),
    *(
        (o.key, TEXT if o.rounding == TEXT_OUTPUT else FLOAT)
        for o in OUTPUTS
        if not (o.echo or o.working)
    ),
    ("row", INT),
    ("status", TEXT),
    ("messages", TEXT),
)
RESULT_NAMES = tuple(name for name, _ in RESULTS)
assert len(set(RESULT_NAMES)) == len(RESULT_NAMES)

# result columns written only when the file has the input they need
_NEEDS = (
    ("geometry.", "deflection"),
    ("sight.", "obstruction_offset"),
    ("crash.", "deflection"),
    ("signs.series", "begin_station"),  # a register: curves in series (batch.series)
    *((f"geometry.{k}", "pi_station") for k in STATIONS),
    *((f"transition.{k}", "deflection") for k in RUNOFF_STATIONS),
    *((f"transition.{k}", "pi_station") for k in RUNOFF_STATIONS),
    *((f"geometry.{k}", "spiral_out") for k in (*SPIRAL_OUT, "spiral_angle_out")),
)


def results_for(input_names: list[str]) -> tuple[tuple[str, str], ...]:
    """The result columns (name, type) a file with these headers gets: geometry only with a
    deflection column, stations only with a PI station, the outgoing spiral's keys only with
    a spiral_out column, sight only with an obstruction offset."""
    given = {FIELD_OF_COLUMN.get(n.strip().lower(), n.strip().lower()) for n in input_names}
    return tuple(
        (name, kind)
        for name, kind in RESULTS
        if not any(name.startswith(prefix) and need not in given for prefix, need in _NEEDS)
    )


def result_names(input_names: list[str]) -> tuple[str, ...]:
    return tuple(name for name, _ in results_for(input_names))


def output_names(input_names: list[str]) -> list[str]:
    """Result column names as written after ``input_names``: ``check.`` before any that an
    input column already uses (compared without case)."""
    taken = {n.strip().lower() for n in input_names}
    return [f"check.{n}" if n in taken else n for n in result_names(input_names)]
