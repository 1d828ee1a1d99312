"""Road e/f and rail cant chart data for the pictures, from the engine's checks (numpy, SI)."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from curvetui.core import rail as _rail
from curvetui.core import road as _road
from curvetui.core.rail import RailLimits, check_rail, equilibrium_cant
from curvetui.core.road import check_road, design_superelevation, minimum_radius
from curvetui.core.road import side_friction_demand as _friction_demand
from curvetui.core.road_table import RoadTable

__all__ = [
    "RailChart",
    "RoadChart",
    "rail_chart",
    "rail_chart_for_inputs",
    "road_chart",
    "road_chart_for_inputs",
]


@dataclass(frozen=True)
class RoadChart:
    """Superelevation and side friction against radius at one design speed (SI, fractions).

    ``radius``: the grid, rising, R_min and the current radius included; ``e_design`` the
    distribution's e(R); ``friction`` f(R) = v^2/(k R) - e(R) at the design speed.
    The current bend: ``radius_now``, ``e_now`` (in use), ``f_now`` (demand), ``failed``
    (the point-mass check: R < R_min, f > f_max or e > e_max) and its ``flags``.
    """

    speed: float
    e_max: float
    f_max: float
    min_radius: float
    k: float
    radius: np.ndarray
    e_design: np.ndarray
    friction: np.ndarray
    radius_now: float
    e_now: float
    f_now: float
    failed: bool
    flags: int
    reasons: tuple[str, ...] = field(default_factory=tuple)


def road_chart(
    table: RoadTable,
    speed,
    e_max,
    radius_now,
    f_max=None,
    superelevation=None,
    samples: int = 200,
) -> RoadChart:
    """Chart data for a road bend: ``speed`` [m/s], ``e_max`` [fraction], ``radius_now`` [m].

    ``f_max`` replaces the table's maximum side friction in the check and R_min (as the
    check's ``friction``; the design e keeps the table's distribution);
    ``superelevation`` [fraction] is the built e of the current bend (default: the design
    value). The grid is log-spaced from R_min/1.2 to 20 R_min (widened to hold the current
    radius) with R_min and the current radius added.
    """
    v, emax, r_now = float(speed), float(e_max), float(radius_now)
    k = table.k_si
    fmax = float(table.f_max(v)[0]) if f_max is None else float(f_max)
    r_min = float(minimum_radius(v, emax, fmax, k))
    lo = min(r_min / 1.2, r_now / 1.1)
    hi = max(20.0 * r_min, r_now * 1.2)
    grid = np.unique(np.concatenate([np.geomspace(lo, hi, samples), [r_min, r_now]]))
    # the distribution keeps the table's f_max whatever friction the check uses
    e = np.asarray(design_superelevation(table, v, grid, emax), dtype=float)
    f = np.asarray(_friction_demand(v, grid, e, k), dtype=float)

    check = check_road(table, v, r_now, emax, superelevation=superelevation, friction=f_max)
    flags = int(check.flags)
    reasons = []
    if flags & _road.FAIL_RADIUS:
        reasons.append("R < R_min")
    if flags & _road.FAIL_FRICTION:
        reasons.append("f > f_max")
    if flags & _road.FAIL_SUPERELEVATION:
        reasons.append("e > e_max")
    return RoadChart(
        speed=v,
        e_max=emax,
        f_max=fmax,
        min_radius=r_min,
        k=k,
        radius=grid,
        e_design=e,
        friction=f,
        radius_now=r_now,
        e_now=float(check.superelevation),
        f_now=float(check.side_friction_demand),
        failed=bool(check.failed),
        flags=flags,
        reasons=tuple(reasons),
    )


@dataclass(frozen=True)
class RailChart:
    """Cant against speed on one curve (SI: m/s, m).

    ``speed`` grid from 0 to about 1.3 x the larger of the current and maximum speeds, the
    current, low, minimum and maximum speeds included; ``equilibrium`` E(V) = s v^2/(g R);
    ``cant`` the applied cant; the allowed band is ``min_speed`` to ``max_speed`` (the
    check's own, from the limits of the band holding ``speed_now``): there the deficiency
    E(V) - cant stays within ``deficiency_limit`` and the excess cant - E(V) within
    ``excess_limit`` (NaN: none set, band from 0). ``in_band`` marks the grid speeds inside.
    """

    radius: float
    cant: float
    rail_centres: float
    speed: np.ndarray
    equilibrium: np.ndarray
    in_band: np.ndarray
    min_speed: float
    max_speed: float
    deficiency_limit: float
    excess_limit: float
    cant_limit: float
    speed_now: float
    cant_now: float  # E at speed_now
    low_speed: float  # NaN without one
    cant_low: float  # E at low_speed, NaN without one
    failed: bool
    flags: int
    reasons: tuple[str, ...] = field(default_factory=tuple)


def rail_chart(
    limits: RailLimits,
    radius,
    cant,
    rail_centres,
    speed_now,
    low_speed=None,
    samples: int = 200,
) -> RailChart:
    """Chart data for a rail curve: ``radius`` [m], applied ``cant`` [m], ``rail_centres``
    [m] (None: the limits' own), the fastest train's ``speed_now`` and optionally the slowest
    train's ``low_speed`` [m/s]. Uses ``check_rail`` and ``equilibrium_cant``."""
    r, ea, v_now = float(radius), float(cant), float(speed_now)
    s = float(limits.rail_centres if rail_centres is None else rail_centres)
    check = check_rail(limits, v_now, r, ea, low_speed=low_speed, rail_centres=s)
    v_min, v_max = float(check.min_speed), float(check.max_speed)
    low = float("nan") if low_speed is None else float(low_speed)
    top = 1.3 * max(v_now, v_max if math.isfinite(v_max) else 0.0)
    extra = [x for x in (v_now, low, v_min, v_max) if math.isfinite(x) and 0 <= x <= top]
    grid = np.unique(np.concatenate([np.linspace(0.0, top, samples), extra]))
    e = np.asarray(equilibrium_cant(grid, r, s), dtype=float)
    lo_edge = v_min if math.isfinite(v_min) else 0.0
    in_band = (grid >= lo_edge) & (grid <= v_max)
    flags = int(check.flags)
    names = (
        (_rail.FAIL_CANT, "cant > limit"),
        (_rail.FAIL_DEFICIENCY, "deficiency > limit"),
        (_rail.FAIL_EXCESS, "excess > limit"),
        (_rail.FAIL_NO_BALANCE, "no cant suits both trains"),
    )
    return RailChart(
        radius=r,
        cant=ea,
        rail_centres=s,
        speed=grid,
        equilibrium=e,
        in_band=in_band,
        min_speed=v_min,
        max_speed=v_max,
        deficiency_limit=float(check.deficiency_limit),
        excess_limit=float(check.excess_limit),
        cant_limit=float(check.cant_limit),
        speed_now=v_now,
        cant_now=float(check.equilibrium_cant),
        low_speed=low,
        cant_low=float(check.equilibrium_cant_low),
        failed=bool(check.failed),
        flags=flags,
        reasons=tuple(text for bit, text in names if flags & bit),
    )


# --------------------------------------------------------------------------- from inputs
# The faces hold a bend as its inputs (user units, as typed or stored); these parse them the
# way curvetui.bend.service does, so a picture shows exactly the bend that was checked.


def road_chart_for_inputs(raw, units, table: RoadTable) -> RoadChart:
    """``road_chart`` for a road bend's inputs, parsed as ``curvetui.bend.service`` parses them."""
    from curvetui.bend.service import si_inputs

    si = si_inputs("road", raw, units, table)
    return road_chart(
        table,
        si["speed"],
        si.get("emax", table.emax_default),
        si["radius"],
        f_max=si.get("friction"),
        superelevation=si.get("superelevation"),
    )


def rail_chart_for_inputs(raw, units, limits: RailLimits) -> RailChart:
    """``rail_chart`` for a rail curve's inputs, parsed as ``curvetui.bend.service`` parses them."""
    from curvetui.bend.service import si_inputs
    from curvetui.core.rail import rail_centres_for_gauge
    from curvetui.storage.tables import road_table

    si = si_inputs("rail", raw, units, road_table(None, units.name))
    gauge = si.get("gauge")
    return rail_chart(
        limits,
        si["radius"],
        si["cant"],
        None if gauge is None else rail_centres_for_gauge(gauge),
        si["speed"],
        si.get("low_speed"),
    )
