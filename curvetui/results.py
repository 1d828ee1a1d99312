"""Engine results as named columns in the user's units: shared by JSON, tables and batch.

The column names are the JSON keys of ``curvetui check``; a batch file's result columns
carry the same names, so one bend's values agree whichever face printed them.
"""

from __future__ import annotations

import numpy as np

from curvetui.bend.outputs import main_results
from curvetui.core.rail import RailCheck
from curvetui.core.road import RoadCheck
from curvetui.core.superelevation import AT_EMAX, NORMAL_CROWN, REMOVE_CROWN, SUPERELEVATED
from curvetui.core.units import UnitSystem

CROSS_SECTION_NAMES = {
    NORMAL_CROWN: "normal crown",
    REMOVE_CROWN: "remove adverse crown",
    SUPERELEVATED: "superelevated",
    AT_EMAX: "at e_max",
}

# key: (label, unit kind) of the main results, from curvetui.bend.outputs
ROAD_FIELDS: dict[str, tuple[str, str]] = {o.key: (o.label, o.unit) for o in main_results("road")}
RAIL_FIELDS: dict[str, tuple[str, str]] = {o.key: (o.label, o.unit) for o in main_results("rail")}


def unit_label(kind: str, units: UnitSystem) -> str:
    return {
        "acceleration": units.acceleration_label,
        "length": units.length_label,
        "speed": units.speed_label,
        "cant": units.cant_label,
    }.get(kind, kind)


def road_columns(check: RoadCheck, units: UnitSystem) -> dict[str, np.ndarray]:
    """The check's results in the user's units, one array per JSON key (percent for e)."""
    return {
        "lateral_acceleration": units.acceleration_from_si(check.lateral_acceleration),
        "lateral_acceleration_g": check.lateral_acceleration_g,
        "side_friction_max": check.side_friction_max,
        "side_friction_demand": check.side_friction_demand,
        "min_radius": units.length_from_si(check.min_radius),
        "min_radius_rounded": units.length_from_si(check.min_radius_rounded),
        "superelevation": 100.0 * check.superelevation,
        "superelevation_design": 100.0 * check.superelevation_design,
        "safe_speed": units.speed_from_si(check.safe_speed),
    }


def rounded(value: float, digits: int = 6) -> float | None:
    """A float trimmed for output: enough digits for a checker, no binary noise; None for NaN."""
    value = float(value)
    if not np.isfinite(value):
        return None
    return float(f"{value:.{digits}g}")


def fixed(value: float, places: int = 6) -> float | None:
    """A length or station trimmed to ``places`` decimals (stations need decimals, not
    significant figures); None for NaN."""
    value = float(value)
    return round(value, places) if np.isfinite(value) else None


def rail_columns(check: RailCheck, units: UnitSystem) -> dict[str, np.ndarray]:
    """Rail results in the user's units: cant in mm or in, speeds km/h or mph, and the
    accelerations in m/s^2 in both systems (the quantity the limits are usually quoted in)."""
    c = units.cant
    return {
        "equilibrium_cant": check.equilibrium_cant / c,
        "equilibrium_cant_low": check.equilibrium_cant_low / c,
        "cant_deficiency": check.cant_deficiency / c,
        "cant_excess": check.cant_excess / c,
        "uncompensated_acceleration": check.lateral_acceleration,
        "centripetal_acceleration": check.centripetal_acceleration,
        "max_speed": units.speed_from_si(check.max_speed),
        "min_speed": units.speed_from_si(check.min_speed),
        "balancing_cant": check.balancing_cant / c,
        "cant_allowed_min": check.cant_allowed_min / c,
        "cant_allowed_max": check.cant_allowed_max / c,
        "cant_limit": check.cant_limit / c,
        "deficiency_limit": check.deficiency_limit / c,
        "excess_limit": check.excess_limit / c,
        "rail_centres": check.rail_centres / c,
        "low_speed": units.speed_from_si(check.low_speed),
    }
