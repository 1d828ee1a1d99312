"""Plain-language reasons for a rail check's flags, in the user's units (pure strings).

As for roads (see road_messages): one builder per flag, ``builder(check, i, limits, units)``,
shared by the one-curve check and batch mode; constant builders give one text per file.
"""

from __future__ import annotations

from collections.abc import Callable

from curvetui.core import rail
from curvetui.core.rail import RailCheck, RailLimits
from curvetui.core.units import UnitSystem

Builder = Callable[[RailCheck, object, RailLimits, UnitSystem], str]


def _cant(u: UnitSystem, x) -> str:
    return f"{float(x) / u.cant:.1f} {u.cant_label}"


def _spd(u: UnitSystem, x) -> str:
    return f"{u.speed_from_si(float(x)):.1f} {u.speed_label}"


def _over_cant(c: RailCheck, i, lim, u) -> str:
    return (
        f"FAIL applied cant {_cant(u, c.cant[i])} exceeds the maximum {_cant(u, c.cant_limit[i])}"
    )


def _deficiency(c: RailCheck, i, lim, u) -> str:
    return (
        f"FAIL cant deficiency {_cant(u, c.cant_deficiency[i])} exceeds the limit "
        f"{_cant(u, c.deficiency_limit[i])}; maximum speed is {_spd(u, c.max_speed[i])}"
    )


def _excess(c: RailCheck, i, lim, u) -> str:
    return (
        f"FAIL cant excess {_cant(u, c.cant_excess[i])} exceeds the limit "
        f"{_cant(u, c.excess_limit[i])}; minimum speed is {_spd(u, c.min_speed[i])}"
    )


def _no_balance(c: RailCheck, i, lim, u) -> str:
    need = c.equilibrium_cant[i] - c.deficiency_limit[i]
    allow = min(c.equilibrium_cant_low[i] + c.excess_limit[i], c.cant_limit[i])
    return (
        f"FAIL no cant satisfies both trains: the fast train needs at least {_cant(u, need)}, "
        f"the slow train and the cant limit allow at most {_cant(u, allow)}; "
        "raise the radius or narrow the speed range"
    )


def _fixed(text: str) -> Builder:
    return lambda c, i, lim, u: text


def _outside(c, i, lim: RailLimits, u) -> str:
    return f"WARNING speed above the last band of {lim.name}: its limits extrapolated"


# (flag, builder, constant): in the order the messages are listed
RAIL_MESSAGES: tuple[tuple[int, Builder, bool], ...] = (
    (rail.FAIL_CANT, _over_cant, False),
    (rail.FAIL_DEFICIENCY, _deficiency, False),
    (rail.FAIL_EXCESS, _excess, False),
    (rail.FAIL_NO_BALANCE, _no_balance, False),
    (
        rail.WARN_CANT_ABOVE_RECOMMENDED,
        _fixed("WARNING applied cant is above the recommended value (within the maximum)"),
        True,
    ),
    (
        rail.WARN_DEFICIENCY_ABOVE_RECOMMENDED,
        _fixed("WARNING cant deficiency is above the recommended value (within the maximum)"),
        True,
    ),
    (
        rail.WARN_EXCESS_ABOVE_RECOMMENDED,
        _fixed("WARNING cant excess is above the recommended value (within the maximum)"),
        True,
    ),
    (
        rail.WARN_NEGATIVE_DEFICIENCY,
        _fixed("NOTE the fastest train runs below its equilibrium speed (cant excess for it)"),
        True,
    ),
    (rail.WARN_SPEED_OUTSIDE_LIMITS, _outside, True),
    (
        rail.WARN_CANT_BELOW_MIN,
        _fixed("WARNING applied cant is below the minimum of the limits"),
        True,
    ),
)


def rail_messages(check: RailCheck, index, limits: RailLimits, units: UnitSystem) -> list[str]:
    """Messages for one curve (``index`` into the arrays; ``()`` for a scalar check)."""
    flags = int(check.flags[index])
    return [build(check, index, limits, units) for bit, build, _ in RAIL_MESSAGES if flags & bit]
