"""Plain-language reasons for a road check's flags, in the user's units (pure strings)."""

from __future__ import annotations

from curvetui.core import road
from curvetui.core.road import RoadCheck
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem


def road_messages(check: RoadCheck, index, table: RoadTable, units: UnitSystem) -> list[str]:
    """Messages for one bend (``index`` into the check's arrays; ``()`` for a scalar check)."""
    flags = int(check.flags[index])
    sp, ln = units.speed_label, units.length_label

    def spd(v):
        return f"{units.speed_from_si(float(v)):.1f} {sp}"

    def lng(x):
        return f"{units.length_from_si(float(x)):.1f} {ln}"

    lo = float(table.speeds[0])
    hi = float(table.speeds[-1])
    tu = "km/h" if table.units == "metric" else "mph"
    out: list[str] = []
    if flags & road.FAIL_RADIUS:
        out.append(
            f"FAIL radius {lng(check.radius[index])} is below the minimum radius "
            f"{lng(check.min_radius[index])} for {spd(check.speed[index])} at e_max "
            f"{100 * float(check.e_max[index]):.1f} %"
        )
    if flags & road.FAIL_FRICTION:
        out.append(
            f"FAIL side friction demand {float(check.side_friction_demand[index]):.3f} exceeds "
            f"f_max {float(check.side_friction_max[index]):.3f}; safe speed is "
            f"{spd(check.safe_speed[index])}"
        )
    if flags & road.FAIL_SUPERELEVATION:
        out.append(
            f"FAIL superelevation {100 * float(check.superelevation[index]):.1f} % exceeds e_max "
            f"{100 * float(check.e_max[index]):.1f} %"
        )
    if flags & road.WARN_SPEED_BELOW_TABLE:
        out.append(
            f"WARNING design speed is below the table ({lo:g}-{hi:g} {tu}): f_max extrapolated"
        )
    if flags & road.WARN_SPEED_ABOVE_TABLE:
        out.append(
            f"WARNING design speed is above the table ({lo:g}-{hi:g} {tu}): f_max extrapolated"
        )
    if flags & road.WARN_INTERPOLATED:
        out.append(
            "NOTE design speed falls between table rows: f_max and running speed interpolated"
        )
    if flags & road.WARN_EMAX_NOT_TABULATED:
        tab = ", ".join(f"{100 * e:g}" for e in table.emax_tabulated)
        out.append(
            f"WARNING e_max {100 * float(check.e_max[index]):.1f} % is not one the source "
            f"tabulates ({tab} %): computed by its method, not read from a printed table"
        )
    if flags & road.NOTE_NORMAL_CROWN:
        out.append(
            f"NOTE design e below {100 * table.normal_crown_limit:.1f} %: normal crown kept; "
            f"friction checked on the outside lane at the adverse -{100 * table.normal_crown:.1f} %"
        )
    if flags & road.NOTE_REMOVE_CROWN:
        out.append(
            f"NOTE remove adverse crown: superelevate at the normal cross slope "
            f"{100 * table.normal_crown:.1f} %"
        )
    if flags & road.WARN_SAFE_SPEED_EXTRAPOLATED:
        out.append(
            f"WARNING safe speed lies outside the table ({lo:g}-{hi:g} {tu}): f_max extrapolated"
        )
    if flags & road.NOTE_FRICTION_GIVEN:
        out.append("NOTE side friction given by the user replaces the table's f_max")
    if flags & road.WARN_BELOW_DESIGN_E:
        out.append(
            f"WARNING superelevation given is below the design value "
            f"{100 * float(check.superelevation_design[index]):.1f} %"
        )
    return out
