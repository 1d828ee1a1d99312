"""A road bend's working: the point-mass lines (lateral acceleration, f_max, R_min, side
friction, safe speed), then the superelevation, transition, geometry and sight lines.

The point-mass equation is written e + f = V^2 / (K R) in the user's units: K is the table's
own constant (127 for km/h and m, 15 for mph and ft, Green Book 2018 Eq. 3-8) when the
units are the table's, else that constant converted (the record's
``superelevation_working.constant``).
"""

from __future__ import annotations

from curvetui.bend.display import shown
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem
from curvetui.reports.working.advisory import advisory_steps
from curvetui.reports.working.crash import crash_steps
from curvetui.reports.working.geometry import geometry_steps
from curvetui.reports.working.sight import sight_steps
from curvetui.reports.working.superelevation import superelevation_steps
from curvetui.reports.working.table import in_user_units, interpolation, on_row, table_row_text
from curvetui.reports.working.text import (
    Step,
    ans,
    at_least,
    gravity,
    missing,
    num,
    per_second,
    verdict,
)
from curvetui.reports.working.transition import road_transition_steps

POINT_MASS = "AASHTO Green Book 2018 Eq. 3-8 (point-mass model)"


def has_message(record: dict, code: str) -> bool:
    return any(m.get("code") == code for m in record.get("messages", ()))


def point_mass_constant(record: dict, table: RoadTable, units: UnitSystem) -> float:
    """K of e + f = V^2 / (K R) in the user's units, as the record keeps it."""
    k = (record.get("superelevation_working") or {}).get("constant")
    return k if k is not None else table.k_si * units.length / units.speed**2


def road_working(record: dict, table: RoadTable, units: UnitSystem) -> list[Step]:
    """The steps of a road check, each with its constants substituted."""
    V, R = record["speed"], record["radius"]
    K = point_mass_constant(record, table, units)
    ln = units.length_label
    e = record["superelevation"]
    steps = [
        Step(
            "Lateral acceleration",
            "a = v^2 / R",
            f"a = {per_second(V, units)}^2 / {num(R)}",
            f"{ans(record['lateral_acceleration'])} {units.acceleration_label}",
            "Newtonian circular motion",
        ),
        Step(
            "Lateral acceleration in g",
            "a / g",
            f"{num(record['lateral_acceleration'])} / {gravity(units)}",
            f"{ans(record['lateral_acceleration_g'])} g",
            "standard gravity g = 9.80665 m/s^2 (CGPM 1901); 1 ft = 0.3048 m",
        ),
        _f_max_step(record, table, units),
        Step(
            "Minimum radius",
            f"R_min = V^2 / ({num(K)} (e_max + f_max))",
            f"R_min = {num(V)}^2 / ({num(K)} x ({at_least(record['e_max'] / 100, 3)} + "
            f"{at_least(record['side_friction_max'], 3)}))",
            f"{ans(record['min_radius'])} {ln}; as the table rounds "
            f"{num(record['min_radius_rounded'])} {ln}",
            f"{table.source.split(':')[0]}; Eq. 3-10",
            verdict(record, "radius"),
        ),
    ]
    steps += superelevation_steps(record, table, units, K)
    steps.append(
        Step(
            "Side friction demand",
            f"f = V^2 / ({num(K)} R) - e",
            f"f = {num(V)}^2 / ({num(K)} x {num(R)}) - {num(e)} / 100",
            f"{ans(record['side_friction_demand'])} against f_max "
            f"{num(record['side_friction_max'])}",
            POINT_MASS,
            verdict(record, "friction"),
        )
    )
    steps += _safe_speed_steps(record, table, units, K)
    steps += advisory_steps(record, table, units, K)
    steps += road_transition_steps(record, units)
    steps += geometry_steps(record, units)
    steps += sight_steps(record, units)
    steps += crash_steps(record, units)
    return steps


def _f_max_step(record: dict, table: RoadTable, units: UnitSystem) -> Step:
    V = record["speed"]
    fmax = record["side_friction_max"]
    if has_message(record, "friction_given"):
        return Step(
            "Maximum side friction",
            "f_max given",
            f"f given: {num(fmax)}",
            f"{ans(fmax)}",
            "given by the user in place of the table's f_max",
        )
    if on_row(table, V, units):
        sub = f"row {num(V)} {units.speed_label} of {table.name}"
    else:
        sub = f"f_max = {interpolation(table, table.side_friction_max, V, units)}"
    return Step(
        "Maximum side friction",
        "f_max from the design table",
        sub,
        f"{ans(fmax)}",
        table_row_text(table, V, units),
    )


def _safe_speed_steps(record: dict, table: RoadTable, units: UnitSystem, K: float) -> list:
    """V = sqrt(K R (e + f_max(V))) with f_max at that speed (substituted, so the line can be
    redone); "at least" the table's last row, or a comparison where no row's speed passes."""
    R, e, sp = record["radius"], record["superelevation"], units.speed_label
    vs = record.get("safe_speed")
    src = "point-mass equation solved for V: " + POINT_MASS
    check = verdict(record, "friction")
    design = f"shown {shown('safe_speed', vs)} {sp} (rounded down)" if not missing(vs) else ""
    if has_message(record, "friction_given"):
        f = record["side_friction_max"]
        return [
            Step(
                "Safe speed",
                f"V = sqrt({num(K)} R (e + f))",
                f"V = sqrt({num(K)} x {num(R)} x ({num(e)} / 100 + {num(f)}))",
                f"{ans(vs)} {sp}; {design}",
                src,
                check,
            )
        ]
    top, first = float(table.speeds[-1]), float(table.speeds[0])
    tu = "km/h" if table.units == "metric" else "mph"
    if missing(vs):
        f1 = num(float(table.side_friction_max[0]))
        return [
            Step(
                "Safe speed",
                f"V^2 / ({num(K)} R) - e > f_max at the table's first row",
                f"{in_user_units(first, table, units)}^2 / ({num(K)} x {num(R)}) - "
                f"{num(e)} / 100 > {f1}",
                f"none: below the table's first row ({first:g} {tu})",
                src,
                check,
            )
        ]
    if has_message(record, "safe_speed_at_least"):
        f_top = num(float(table.side_friction_max[-1]))
        return [
            Step(
                "Safe speed",
                f"V^2 / ({num(K)} R) - e <= f_max at the table's last row",
                f"{in_user_units(top, table, units)}^2 / ({num(K)} x {num(R)}) - "
                f"{num(e)} / 100 <= {f_top}",
                f"at least {ans(vs)} {sp} (the table's last row; never extended)",
                src,
                check,
            )
        ]
    interp = interpolation(table, table.side_friction_max, vs, units)
    return [
        Step(
            "Safe speed",
            f"V^2 / ({num(K)} R) - e = f_max(V), f_max between the table's rows",
            f"{num(vs)}^2 / ({num(K)} x {num(R)}) - {num(e)} / 100 = {interp}",
            f"{ans(vs)} {sp}; {design}",
            src + "; " + table_row_text(table, vs, units),
            check,
        ),
    ]
