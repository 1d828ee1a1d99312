"""A road design table's look-ups written out: the row used, or the two rows interpolated
as arithmetic a checker can redo; speeds converted when the user's units are not the
table's (1 mph = 1.609344 km/h exactly)."""

from __future__ import annotations

import numpy as np

from curvetui.core.road_table import ROW, RoadTable
from curvetui.core.units import UnitSystem
from curvetui.reports.working.text import num


def table_speed(speed: float, table: RoadTable, units: UnitSystem) -> str:
    """A speed in the user's unit written in the table's (1 mph = 1.609344 km/h exactly)."""
    if units.name == table.units:
        return num(speed)
    return f"({num(speed)} x 1.609344)" if units.name == "us" else f"({num(speed)} / 1.609344)"


def interpolation(table: RoadTable, column, speed: float, units: UnitSystem) -> str:
    """column(V) between the two table rows around V, as arithmetic: c1 + (c2 - c1) (V - V1)
    / (V2 - V1); the last segment for V at the top row."""
    tv = units.speed_to_si(speed) / table.speed_unit
    sp = table.speeds
    i = int(np.clip(np.searchsorted(sp, tv * (1 - 1e-12)) - 1, 0, len(sp) - 2))
    c1, c2 = (num(float(c)) for c in column[i : i + 2])
    v1, v2 = num(float(sp[i])), num(float(sp[i + 1]))
    return f"{c1} + ({c2} - {c1}) x ({table_speed(speed, table, units)} - {v1}) / ({v2} - {v1})"


def on_row(table: RoadTable, speed: float, units: UnitSystem) -> bool:
    _, kind = table.f_max(units.speed_to_si(speed))
    return int(kind) == ROW


def table_row_text(
    table: RoadTable, speed_display: float, units: UnitSystem, column: str = "f_max"
) -> str:
    """Which table row(s) gave a value (``column`` "f_max" or "V_R"): the row itself with its
    source, or the two rows interpolated."""
    values = table.side_friction_max if column == "f_max" else table.running_speeds
    v_si = units.speed_to_si(speed_display)
    _, kind = table.f_max(v_si)
    tv = v_si / table.speed_unit
    sp = table.speeds
    tu = "km/h" if table.units == "metric" else "mph"
    if int(kind) == ROW:
        i = int(np.argmin(abs(sp - tv)))
        return f"{table.name} row {sp[i]:g} {tu}: {column} {values[i]:g} ({table.row_sources[i]})"
    i = int(np.clip(np.searchsorted(sp, tv) - 1, 0, len(sp) - 2))
    how = "interpolated" if sp[0] <= tv <= sp[-1] else "EXTRAPOLATED"
    return (
        f"{table.name}: {how} between rows {sp[i]:g} {tu} ({column} {values[i]:g}) and "
        f"{sp[i + 1]:g} {tu} ({column} {values[i + 1]:g})"
    )


def in_user_units(table_speed_value: float, table: RoadTable, units: UnitSystem) -> str:
    """A table speed written in the user's unit, as arithmetic when the units differ."""
    if units.name == table.units:
        return num(table_speed_value)
    if units.name == "us":
        return f"({num(table_speed_value)} / 1.609344)"
    return f"({num(table_speed_value)} x 1.609344)"


def user_speed(expression: str, table: RoadTable, units: UnitSystem) -> str:
    """A table-unit speed expression in the user's unit."""
    if units.name == table.units:
        return expression
    factor = "/ 1.609344" if table.units == "metric" else "x 1.609344"
    return f"({expression}) {factor}"
