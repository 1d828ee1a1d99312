"""The one path for callers: inputs -> parse -> evaluate -> record, for 1 or n bends.

``check_bend`` takes one bend's inputs as a project file or the command line gives them
(numbers or text, by input name); ``check_columns`` takes n bends as columns. Both run
the same vectorised parse and evaluation; messages name fields the caller's way.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping, Sequence
from typing import Any

import numpy as np

from curvetui.bend.evaluate import Context, Evaluation, evaluate
from curvetui.bend.fields import BY_KEY, FIELDS, cli_name
from curvetui.bend.parse import Column, Kinds, Parsed, column_for, parse
from curvetui.bend.record import BendRecord, record_at
from curvetui.core.rail import RailLimits
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem
from curvetui.inputs import InputError

Namer = Callable[[str], str]


def path_namer(prefix: str) -> Namer:
    """Names like ``$.bends[2].inputs.speed`` for messages about a project file."""
    return lambda key: f"{prefix}.{key}"


def columns_from_values(values: Mapping[str, Sequence], units: UnitSystem) -> dict[str, Column]:
    """Columns of Python values (numbers, text, None) by input name."""
    return {
        key: column_for(key, list(vals), units.name)
        for key, vals in values.items()
        if key in BY_KEY
    }


def check_columns(
    kinds: Sequence[str] | np.ndarray | Kinds,
    columns: Mapping[str, Column],
    units: UnitSystem,
    table: RoadTable,
    limits: RailLimits,
) -> Evaluation:
    """Parse and evaluate n bends given as columns (``curvetui.bend.parse.Column``)."""
    parsed: Parsed = parse(kinds, columns, units, table, limits)
    return evaluate(parsed, Context(units, table, limits))


def check_bend(
    kind: str,
    raw: Mapping[str, Any],
    units: UnitSystem,
    table: RoadTable,
    limits: RailLimits,
    name: Namer = cli_name,
) -> BendRecord:
    """One bend through the path (n = 1). Input problems give status "error" with one
    message per problem, each naming its field by ``name``."""
    known = {f.key for f in FIELDS}
    columns = columns_from_values({k: [v] for k, v in raw.items() if k in known}, units)
    ev = check_columns([kind], columns, units, table, limits)
    return record_at(ev, 0, name)


def evaluate_bend(
    kind: str,
    raw: Mapping[str, Any],
    units: UnitSystem,
    table: RoadTable,
    limits: RailLimits,
    name: Namer = cli_name,
) -> dict:
    """The JSON record of one bend; InputError (every problem, joined) for bad input."""
    record = check_bend(kind, raw, units, table, limits, name)
    if record.status == "error":
        raise InputError("; ".join(m.text for m in record.messages))
    return record.to_json()


def si_inputs(kind: str, raw: Mapping[str, Any], units: UnitSystem, table: RoadTable) -> dict:
    """One bend's inputs in SI (absent ones left out); InputError for bad input."""
    columns = columns_from_values({k: [v] for k, v in raw.items() if k in BY_KEY}, units)
    parsed = parse([kind], columns, units, table)
    if parsed.issues:
        raise InputError("; ".join(i.format(cli_name) for i in parsed.issues))
    return {k: float(v[0]) for k, v in parsed.si.items() if parsed.present[k][0]}


GEOMETRY_KEYS = ("deflection", "pi_station", "spiral_in", "spiral_out")


def geometry_inputs(raw: Mapping[str, Any], units: UnitSystem, name: Namer = cli_name):
    """Deflection [rad], PI station and spiral lengths [m] of one bend's inputs, checked
    against the field list's ranges; None without a deflection; InputError for bad input."""
    from curvetui.storage.tables import road_table

    given = {k: raw[k] for k in GEOMETRY_KEYS if k in raw}
    columns = columns_from_values({k: [v] for k, v in given.items()}, units)
    parsed = parse(["road"], columns, units, road_table(None, units.name))
    issues = [i for i in parsed.issues if i.field in GEOMETRY_KEYS]
    if issues:
        raise InputError("; ".join(i.format(name) for i in issues))
    if not parsed.present["deflection"][0]:
        return None
    si, present = parsed.si, parsed.present
    ls_in = float(si["spiral_in"][0]) if present["spiral_in"][0] else 0.0
    return {
        "deflection": float(np.radians(si["deflection"][0])),
        "pi_station": float(si["pi_station"][0]) if present["pi_station"][0] else 0.0,
        "ls_in": ls_in,
        "ls_out": float(si["spiral_out"][0]) if present["spiral_out"][0] else ls_in,
    }
