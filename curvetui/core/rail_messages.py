"""Plain-language reasons for a rail check's flags, in the user's units (pure strings)."""

from __future__ import annotations

from curvetui.core import rail
from curvetui.core.rail import RailCheck, RailLimits
from curvetui.core.units import UnitSystem


def rail_messages(check: RailCheck, index, limits: RailLimits, units: UnitSystem) -> list[str]:
    """Messages for one curve (``index`` into the arrays; ``()`` for a scalar check)."""
    flags = int(check.flags[index])
    cl = units.cant_label

    def cant(x):
        return f"{float(x) / units.cant:.1f} {cl}"

    def spd(x):
        return f"{units.speed_from_si(float(x)):.1f} {units.speed_label}"

    out: list[str] = []
    if flags & rail.FAIL_CANT:
        out.append(
            f"FAIL applied cant {cant(check.cant[index])} exceeds the maximum "
            f"{cant(check.cant_limit[index])}"
        )
    if flags & rail.FAIL_DEFICIENCY:
        out.append(
            f"FAIL cant deficiency {cant(check.cant_deficiency[index])} exceeds the limit "
            f"{cant(check.deficiency_limit[index])}; maximum speed is "
            f"{spd(check.max_speed[index])}"
        )
    if flags & rail.FAIL_EXCESS:
        out.append(
            f"FAIL cant excess {cant(check.cant_excess[index])} exceeds the limit "
            f"{cant(check.excess_limit[index])}; minimum speed is "
            f"{spd(check.min_speed[index])}"
        )
    if flags & rail.FAIL_NO_BALANCE:
        need = check.equilibrium_cant[index] - check.deficiency_limit[index]
        allow = min(
            check.equilibrium_cant_low[index] + check.excess_limit[index],
            check.cant_limit[index],
        )
        out.append(
            f"FAIL no cant satisfies both trains: the fast train needs at least {cant(need)}, "
            f"the slow train and the cant limit allow at most {cant(allow)}; "
            "raise the radius or narrow the speed range"
        )
    if flags & rail.WARN_CANT_ABOVE_RECOMMENDED:
        out.append("WARNING applied cant is above the recommended value (within the maximum)")
    if flags & rail.WARN_DEFICIENCY_ABOVE_RECOMMENDED:
        out.append("WARNING cant deficiency is above the recommended value (within the maximum)")
    if flags & rail.WARN_EXCESS_ABOVE_RECOMMENDED:
        out.append("WARNING cant excess is above the recommended value (within the maximum)")
    if flags & rail.WARN_NEGATIVE_DEFICIENCY:
        out.append("NOTE the fastest train runs below its equilibrium speed (cant excess for it)")
    if flags & rail.WARN_SPEED_OUTSIDE_LIMITS:
        out.append(f"WARNING speed above the last band of {limits.name}: its limits extrapolated")
    if flags & rail.WARN_CANT_BELOW_MIN:
        out.append("WARNING applied cant is below the minimum of the limits")
    return out
