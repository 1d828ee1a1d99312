"""A road bend's working as an existing curve: the advisory speed by the design method and
the inferred design speed, each with its numbers substituted (curvetui.bend.road_advisory).
"""

from __future__ import annotations

from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem
from curvetui.reports.working.table import in_user_units, interpolation, table_row_text
from curvetui.reports.working.text import Step, ans, missing, num

ADVISORY_SOURCE = (
    "design method, TxDOT Procedures for Establishing Speed Zones (read): f 0.15 at 35 mph "
    "and above, 0.18 for 20-35 mph (read), 0.21 below 20 mph (from memory)"
)
INFERRED_SOURCE = (
    "FHWA-SA-10-001 (2009) appendix: highest speed within the table's f_max (method read; "
    "f_max interpolated between rows: derived)"
)


def advisory_steps(record: dict, table: RoadTable, units: UnitSystem, K: float) -> list[Step]:
    """The advisory speed and inferred design speed lines (none without the object)."""
    a = record.get("advisory")
    if not a:
        return []
    R, e, sp = record["radius"], a.get("superelevation"), units.speed_label
    steps = []
    v, f = a.get("speed_calculated"), a.get("friction")
    if not missing(v) and not missing(f):
        top = a.get("band_top")
        if missing(top):
            how = f"{ans(v)} {sp} (in the band of f {num(f)})"
        else:
            how = (
                f"{ans(v)} {sp}, past its band's top {num(top)} {sp}: every speed below "
                f"{num(top)} meets f {num(f)}, {num(top)} itself does not"
            )
        steps.append(
            Step(
                "Advisory speed",
                f"V = sqrt({num(K)} R (e + f)), f by the speed's band",
                f"V = sqrt({num(K)} x {num(R)} x ({num(e)} / 100 + {num(f)}))",
                f"{how}; advisory {num(a['speed'])} {sp} (down to a multiple of {num(a['step'])})",
                ADVISORY_SOURCE,
            )
        )
    vd, kind = a.get("design_speed_inferred"), a.get("design_speed_inferred_kind")
    tu = "km/h" if table.units == "metric" else "mph"
    if kind == "below the table":
        first = float(table.speeds[0])
        steps.append(
            Step(
                "Inferred design speed",
                f"V^2 / ({num(K)} R) - e > f_max at the table's first row",
                f"{in_user_units(first, table, units)}^2 / ({num(K)} x {num(R)}) - "
                f"{num(e)} / 100 > {num(float(table.side_friction_max[0]))}",
                f"none: below the table's first row ({first:g} {tu})",
                INFERRED_SOURCE,
            )
        )
    elif kind and kind.startswith("at least"):
        top = float(table.speeds[-1])
        steps.append(
            Step(
                "Inferred design speed",
                f"V^2 / ({num(K)} R) - e <= f_max at the table's last row",
                f"{in_user_units(top, table, units)}^2 / ({num(K)} x {num(R)}) - "
                f"{num(e)} / 100 <= {num(float(table.side_friction_max[-1]))}",
                f"at least {ans(vd)} {sp} (the table's last row; never extended)",
                INFERRED_SOURCE,
            )
        )
    elif not missing(vd):
        interp = interpolation(table, table.side_friction_max, vd, units)
        steps.append(
            Step(
                "Inferred design speed",
                f"V^2 / ({num(K)} R) - e = f_max(V), f_max between the table's rows",
                f"{num(vd)}^2 / ({num(K)} x {num(R)}) - {num(e)} / 100 = {interp}",
                f"{ans(vd)} {sp} ({kind}); highest table row met "
                f"{num(a.get('design_speed_inferred_row'))} {sp}",
                INFERRED_SOURCE + "; " + table_row_text(table, vd, units),
            )
        )
    steps += _sign_steps(record, units)
    return steps


def _sign_steps(record: dict, units: UnitSystem) -> list[Step]:
    """The sign table's column by posted - advisory speed, and what it asks for."""
    s, a = record.get("signs"), record.get("advisory") or {}
    if not s or missing(s.get("posted_speed")) or missing(a.get("speed")):
        return []
    sp = units.speed_label
    return [
        Step(
            "Warning signs",
            "difference = posted speed - advisory speed; the sign table's column",
            f"{num(s['posted_speed'])} - {num(a['speed'])}",
            f"{ans(s['speed_difference'])} {sp}: {s['sign']} sign {s['warning_sign']}, "
            f"advisory speed plaque {s['plaque']}, chevrons or large arrow {s['chevrons']}",
            f"sign table {s.get('table')} (each value's source in its file); Turn at an "
            "advisory of 30 mph or less (read, TxDOT); Reverse/Winding need consecutive curves",
        )
    ]
