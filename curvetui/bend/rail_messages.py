"""Plain-language reasons for a rail check's flags, in the user's units (pure strings).

As for roads (see road_messages): one builder per flag, ``builder(check, i, limits, units)``,
shared by the one-curve check and batch mode; constant builders give one text per file.
"""

from __future__ import annotations

from collections.abc import Callable

from curvetui.bend.display import shown
from curvetui.core import rail
from curvetui.core.rail import RailCheck, RailLimits
from curvetui.core.units import UnitSystem

Builder = Callable[[RailCheck, object, RailLimits, UnitSystem], str]


def _cant(u: UnitSystem, x) -> str:
    return f"{float(x) / u.cant:.1f} {u.cant_label}"


def _spd(u: UnitSystem, x) -> str:
    return f"{u.speed_from_si(float(x)):g} {u.speed_label}"


def _spd_down(u: UnitSystem, x) -> str:
    """A speed limit as people read it: whole units, rounded to the safe side (down)."""
    return f"{shown('max_speed', u.speed_from_si(float(x)), u.name)} {u.speed_label}"


def _spd_up(u: UnitSystem, x) -> str:
    """A least speed: whole units, rounded to the safe side (up)."""
    return f"{shown('min_speed', u.speed_from_si(float(x)), u.name)} {u.speed_label}"


def _over_cant(c: RailCheck, i, lim, u) -> str:
    return f"applied cant {_cant(u, c.cant[i])} exceeds the maximum {_cant(u, c.cant_limit[i])}"


def _deficiency(c: RailCheck, i, lim, u) -> str:
    return (
        f"cant deficiency {_cant(u, c.cant_deficiency[i])} exceeds the limit "
        f"{_cant(u, c.deficiency_limit[i])}; maximum speed is {_spd_down(u, c.max_speed[i])}"
    )


def _excess(c: RailCheck, i, lim, u) -> str:
    return (
        f"cant excess {_cant(u, c.cant_excess[i])} exceeds the limit "
        f"{_cant(u, c.excess_limit[i])}; minimum speed is {_spd_up(u, c.min_speed[i])}"
    )


def _no_balance(c: RailCheck, i, lim, u) -> str:
    need = c.equilibrium_cant[i] - c.deficiency_limit[i]
    allow = min(c.equilibrium_cant_low[i] + c.excess_limit[i], c.cant_limit[i])
    return (
        f"no cant satisfies both trains: the fast train needs at least {_cant(u, need)}, "
        f"the slow train and the cant limit allow at most {_cant(u, allow)}; "
        "raise the radius or narrow the speed range"
    )


def _fixed(text: str) -> Builder:
    return lambda c, i, lim, u: text


def _balance_outside(c: RailCheck, i, lim, u) -> str:
    return (
        f"the cant sharing both limits alike lies outside the cants the limits allow; any "
        f"cant from {_cant(u, c.cant_allowed_min[i])} to {_cant(u, c.cant_allowed_max[i])} "
        "serves both trains"
    )


def _radius_min(c: RailCheck, i, lim: RailLimits, u) -> str:
    lab = u.length_label
    return (
        f"radius {u.length_from_si(float(c.radius[i])):.1f} {lab} is below the "
        f"{u.length_from_si(lim.radius_min):.0f} {lab} least radius of {lim.name}"
    )


def _below_scope(c, i, lim: RailLimits, u) -> str:
    return (
        f"speed below {_spd(u, lim.scope_min)}, the lowest {lim.name} covers: its limits are "
        "applied outside the speeds they were set for"
    )


def _outside(c, i, lim: RailLimits, u) -> str:
    return f"speed above the last band of {lim.name}: the last band's limits applied"


# (flag, severity, code, builder, constant, values): in the order the messages are listed
RAIL_MESSAGES: tuple = (
    (rail.FAIL_CANT, "fail", "cant_above_maximum", _over_cant, False, ("cant", "cant_limit")),
    (
        rail.FAIL_DEFICIENCY,
        "fail",
        "deficiency_above_limit",
        _deficiency,
        False,
        ("cant_deficiency", "deficiency_limit", "max_speed"),
    ),
    (
        rail.FAIL_EXCESS,
        "fail",
        "excess_above_limit",
        _excess,
        False,
        ("cant_excess", "excess_limit", "min_speed"),
    ),
    (
        rail.FAIL_RADIUS_BELOW_MIN,
        "fail",
        "radius_below_limits_minimum",
        _radius_min,
        False,
        ("radius",),
    ),
    (
        rail.FAIL_NO_BALANCE,
        "fail",
        "no_cant_for_both_trains",
        _no_balance,
        False,
        (
            "equilibrium_cant",
            "equilibrium_cant_low",
            "deficiency_limit",
            "excess_limit",
            "cant_limit",
        ),
    ),
    (
        rail.WARN_CANT_ABOVE_RECOMMENDED,
        "warning",
        "cant_above_recommended",
        _fixed("applied cant is above the recommended value (within the maximum)"),
        True,
        (),
    ),
    (
        rail.WARN_DEFICIENCY_ABOVE_RECOMMENDED,
        "warning",
        "deficiency_above_recommended",
        _fixed("cant deficiency is above the recommended value (within the maximum)"),
        True,
        (),
    ),
    (
        rail.WARN_EXCESS_ABOVE_RECOMMENDED,
        "warning",
        "excess_above_recommended",
        _fixed("cant excess is above the recommended value (within the maximum)"),
        True,
        (),
    ),
    (
        rail.WARN_NEGATIVE_DEFICIENCY,
        "note",
        "below_equilibrium_speed",
        _fixed("the fastest train runs below its equilibrium speed (cant excess for it)"),
        True,
        (),
    ),
    (rail.WARN_SPEED_OUTSIDE_LIMITS, "warning", "speed_above_limits", _outside, True, ()),
    (rail.WARN_BELOW_SCOPE, "warning", "speed_below_scope", _below_scope, True, ()),
    (
        rail.WARN_BALANCE_OUTSIDE,
        "warning",
        "balancing_cant_outside_range",
        _balance_outside,
        False,
        ("cant_allowed_min", "cant_allowed_max"),
    ),
    (
        rail.WARN_CANT_BELOW_MIN,
        "warning",
        "cant_below_minimum",
        _fixed("applied cant is below the minimum of the limits"),
        True,
        (),
    ),
)
