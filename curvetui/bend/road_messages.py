"""Plain-language reasons for a road check's flags, in the user's units (text without
the severity word: the registry below gives each its severity and code).

Each flag has one builder, ``builder(check, i, table, units) -> str`` for element ``i`` of
the check's arrays (``()`` for a scalar check). A one-bend check calls them for the flags
it has; batch mode calls each for the rows that carry its flag, so both say the same words.
Builders marked constant give the same text for every row of one table.
"""

from __future__ import annotations

from collections.abc import Callable

from curvetui.bend.display import shown
from curvetui.core import road
from curvetui.core.road import RoadCheck
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem

Builder = Callable[[RoadCheck, object, RoadTable, UnitSystem], str]


def _spd(units: UnitSystem, v) -> str:
    return f"{units.speed_from_si(float(v)):g} {units.speed_label}"


def _spd_down(units: UnitSystem, v) -> str:
    """A safe speed as people read it: whole units, rounded down (the safe side)."""
    return f"{shown('safe_speed', units.speed_from_si(float(v)), units.name)} {units.speed_label}"


def _lng(units: UnitSystem, x) -> str:
    return f"{units.length_from_si(float(x)):.1f} {units.length_label}"


def _table_range(table: RoadTable) -> str:
    tu = "km/h" if table.units == "metric" else "mph"
    return f"{float(table.speeds[0]):g}-{float(table.speeds[-1]):g} {tu}"


def _radius(c: RoadCheck, i, t: RoadTable, u: UnitSystem) -> str:
    return (
        f"radius {_lng(u, c.radius[i])} is below the minimum radius "
        f"{_lng(u, c.min_radius[i])} for {_spd(u, c.speed[i])} at e_max "
        f"{100 * float(c.e_max[i]):.1f} %"
    )


def _friction(c: RoadCheck, i, t: RoadTable, u: UnitSystem) -> str:
    return (
        f"side friction demand {float(c.side_friction_demand[i]):.3f} exceeds "
        f"f_max {float(c.side_friction_max[i]):.3f}; safe speed is "
        + (
            f"{_spd_down(u, c.safe_speed[i])}"
            if c.safe_speed[i] == c.safe_speed[i]  # NaN: below the table's lowest speed
            else f"below the table's lowest speed {float(t.speeds[0]):g}"
        )
    )


def _superelevation(c: RoadCheck, i, t: RoadTable, u: UnitSystem) -> str:
    return (
        f"superelevation {100 * float(c.superelevation[i]):.1f} % exceeds e_max "
        f"{100 * float(c.e_max[i]):.1f} %"
    )


def _below(c, i, t: RoadTable, u) -> str:
    return f"design speed is below the table ({_table_range(t)}): no f_max"


def _above(c, i, t: RoadTable, u) -> str:
    return f"design speed is above the table ({_table_range(t)}): no f_max"


def _interpolated(c, i, t, u) -> str:
    return "design speed falls between table rows: f_max and running speed interpolated"


def _emax(c: RoadCheck, i, t: RoadTable, u) -> str:
    tab = ", ".join(f"{100 * e:g}" for e in t.emax_tabulated)
    return (
        f"e_max {100 * float(c.e_max[i]):.1f} % is not one the source "
        f"tabulates ({tab} %): computed by its method, not read from a printed table"
    )


def _normal_crown(c, i, t: RoadTable, u) -> str:
    if t.distribution == "aashto-method-2":
        return (
            f"side friction carries the bend with the adverse -{100 * t.normal_crown:.1f} % "
            "crown within f_max (Method 2): normal crown kept"
        )
    return (
        f"design e below {100 * t.normal_crown_limit:.1f} %: normal crown kept; "
        f"friction checked on the outside lane at the adverse -{100 * t.normal_crown:.1f} %"
    )


def _remove_crown(c, i, t: RoadTable, u) -> str:
    return (
        f"remove adverse crown: superelevate at the normal cross slope {100 * t.normal_crown:.1f} %"
    )


def _safe_at_least(c, i, t: RoadTable, u) -> str:
    return (
        f"safe speed is at least the table's top speed {_table_top(t)}: the table gives no "
        "f_max beyond it, so no higher speed is claimed"
    )


def _safe_below(c, i, t: RoadTable, u) -> str:
    return (
        f"safe speed is below the table's lowest speed ({_table_range(t)}): even that speed "
        "needs more side friction than the table allows"
    )


def _table_top(t: RoadTable) -> str:
    tu = "km/h" if t.units == "metric" else "mph"
    return f"{float(t.speeds[-1]):g} {tu}"


def _friction_given(c, i, t, u) -> str:
    return (
        "side friction given by the user replaces the table's f_max in the check (R_min, "
        "friction demand, safe speed); the design superelevation keeps the table's distribution"
    )


def _below_design(c: RoadCheck, i, t, u) -> str:
    return (
        f"superelevation given is below the design value "
        f"{100 * float(c.superelevation_design[i]):.1f} %"
    )


# (flag, severity, code, builder, constant, values): in the order the messages are listed;
# ``values`` are the record keys whose numbers the text quotes
ROAD_MESSAGES: tuple = (
    (
        road.FAIL_RADIUS,
        "fail",
        "radius_below_minimum",
        _radius,
        False,
        ("radius", "min_radius", "speed", "e_max"),
    ),
    (
        road.FAIL_FRICTION,
        "fail",
        "friction_above_limit",
        _friction,
        False,
        ("side_friction_demand", "side_friction_max", "safe_speed"),
    ),
    (
        road.FAIL_SUPERELEVATION,
        "fail",
        "superelevation_above_emax",
        _superelevation,
        False,
        ("superelevation", "e_max"),
    ),
    (road.WARN_SPEED_BELOW_TABLE, "warning", "speed_below_table", _below, True, ()),
    (road.WARN_SPEED_ABOVE_TABLE, "warning", "speed_above_table", _above, True, ()),
    (road.WARN_INTERPOLATED, "note", "table_interpolated", _interpolated, True, ()),
    (road.WARN_EMAX_NOT_TABULATED, "warning", "emax_not_tabulated", _emax, False, ("e_max",)),
    (road.NOTE_NORMAL_CROWN, "note", "normal_crown", _normal_crown, True, ()),
    (road.NOTE_REMOVE_CROWN, "note", "remove_adverse_crown", _remove_crown, True, ()),
    (road.NOTE_SAFE_SPEED_AT_LEAST, "note", "safe_speed_at_least", _safe_at_least, True, ()),
    (road.WARN_SAFE_SPEED_BELOW_TABLE, "warning", "safe_speed_below_table", _safe_below, True, ()),
    (road.NOTE_FRICTION_GIVEN, "note", "friction_given", _friction_given, True, ()),
    (
        road.WARN_BELOW_DESIGN_E,
        "warning",
        "superelevation_below_design",
        _below_design,
        False,
        ("superelevation", "superelevation_design"),
    ),
)
