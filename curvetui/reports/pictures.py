"""Data for the pictures of a bend: the plan of its centreline, the road e/f chart and the
rail cant chart. Pure numpy, SI inside (m, m/s, rad, superelevation and friction as
fractions, cant in m); drawing lives in ``curvetui.app``.

Every number here comes from the engine (``curvetui.core``): the plan is set out by
``setout_points`` and the charts call ``design_superelevation``, ``check_road``,
``equilibrium_cant`` and ``check_rail``. Nothing is re-derived.

Plan frame: the PI at (0, 0), the back tangent arriving along +x (travel from -x towards
the PI), y up. A right-hand bend (direction +1) turns clockwise, towards -y; a left-hand one
(direction -1) towards +y. It is a sketch frame, not the ground frame (no bearing).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from curvetui.core import rail as _rail
from curvetui.core import road as _road
from curvetui.core.circular import CircularCurve, GeometryError, circular_curve
from curvetui.core.rail import RailLimits, check_rail, equilibrium_cant
from curvetui.core.road import check_road, design_superelevation, minimum_radius
from curvetui.core.road import side_friction_demand as _friction_demand
from curvetui.core.road_table import RoadTable
from curvetui.core.setout import ARC, SPIRAL_IN, SPIRAL_OUT, TANGENT, setout_points
from curvetui.core.spiral import SpiralCurve, spiral_curve

__all__ = [
    "ARC",
    "SPIRAL_IN",
    "SPIRAL_OUT",
    "TANGENT",
    "GeometryError",
    "KeyPoint",
    "PlanPart",
    "PlanShape",
    "RailChart",
    "RoadChart",
    "plan_for_inputs",
    "plan_points",
    "rail_chart",
    "rail_chart_for_inputs",
    "road_chart",
    "road_chart_for_inputs",
    "station_texts",
]

TANGENT_FRACTION = 0.25  # tangent shown beyond the TS/PC and ST/PT, share of the tangent length
PLAN_SAMPLES = 400  # default number of steps along the bend (TS to ST)


@dataclass(frozen=True)
class KeyPoint:
    """A named point of the plan: TS, SC, CS, ST (or PC, PT) and PI; station [m]."""

    name: str
    station: float
    x: float
    y: float


@dataclass(frozen=True)
class PlanPart:
    """One element of the centreline: ``kind`` is TANGENT, SPIRAL_IN, ARC or SPIRAL_OUT."""

    kind: str
    x: np.ndarray
    y: np.ndarray


@dataclass(frozen=True)
class PlanShape:
    """The centreline of one bend in the plan frame (see the module docstring), metres.

    ``x``, ``y``: the whole line in order of travel, back tangent to forward tangent;
    ``parts``: the same line split into its elements (tangents, spirals, arc), each sharing
    its end points with its neighbours; ``key_points``: in order of station, then the PI;
    ``centre``: the arc centre.
    """

    x: np.ndarray
    y: np.ndarray
    parts: tuple[PlanPart, ...]
    key_points: tuple[KeyPoint, ...]
    centre: tuple[float, float]
    radius: float
    deflection: float
    direction: int
    ls_in: float
    ls_out: float
    spiralled: bool

    def key(self, name: str) -> KeyPoint:
        """The key point called ``name`` (KeyError if the bend has none)."""
        for point in self.key_points:
            if point.name == name:
                return point
        raise KeyError(name)

    def bounds(self) -> tuple[float, float, float, float]:
        """(xmin, xmax, ymin, ymax) of the line, the key points and the PI."""
        xs = np.concatenate([self.x, [p.x for p in self.key_points]])
        ys = np.concatenate([self.y, [p.y for p in self.key_points]])
        return float(xs.min()), float(xs.max()), float(ys.min()), float(ys.max())


def _curve(radius, deflection, ls_in, ls_out, pi_station) -> CircularCurve | SpiralCurve:
    if ls_in == 0 and ls_out == 0:
        return circular_curve(radius, deflection, pi_station)
    return spiral_curve(radius, deflection, ls_in, ls_out, pi_station)


def plan_points(
    radius,
    deflection,
    ls_in=0.0,
    ls_out=0.0,
    direction=+1,
    step=None,
    pi_station=0.0,
    tangent_fraction=TANGENT_FRACTION,
) -> PlanShape:
    """The plan of a bend of ``radius`` [m] on ``deflection`` [rad] with spirals ``ls_in``,
    ``ls_out`` [m] (both 0: a simple curve), turning right (``direction`` +1) or left (-1).

    Points every ``step`` metres of station (default: the bend's length / 400) plus the key
    points, from ``setout_points`` with the PI at (0, 0) and the back tangent heading +x;
    ``tangent_fraction`` of the longer tangent length is shown before the TS/PC and after
    the ST/PT. ``pi_station`` [m] only sets the key points' stations. Refuses bad inputs and
    overlapping spirals with GeometryError (the engine's message).
    """
    if direction not in (1, -1):
        raise GeometryError(f"direction must be +1 (right-hand bend) or -1 (left); got {direction}")
    curve = _curve(float(radius), float(deflection), float(ls_in), float(ls_out), pi_station)
    spiralled = isinstance(curve, SpiralCurve)
    if spiralled:
        t1, t2 = float(curve.tangent_in), float(curve.tangent_out)
        start, end = float(curve.ts), float(curve.st)
        sc, cs = float(curve.sc), float(curve.cs)
    else:
        t1 = t2 = float(curve.tangent)
        start, end = float(curve.pc), float(curve.pt)
        sc, cs = start, end
    if step is None:
        step = (end - start) / PLAN_SAMPLES if math.isfinite(end - start) else 1.0
    # Back bearing 0 (north) keeps the frame exact: the engine's easting is direction * offset
    # and its northing the distance along the back tangent, with the PI at (0, 0). Turning to
    # the plan frame: x = northing, y = -easting.
    table = setout_points(curve, 0.0, 0.0, 0.0, step, direction)
    px = np.asarray(table.northing, dtype=float)
    py = 0.0 - np.asarray(table.easting, dtype=float)  # 0.0 - : no negative zeros
    stations = np.asarray(table.station, dtype=float)

    reach = tangent_fraction * max(t1, t2)
    d = float(deflection)
    fx, fy = math.cos(d), -direction * math.sin(d)  # forward tangent's unit vector
    back = (np.array([px[0] - reach, px[0]]), np.array([py[0], py[0]]))
    ahead = (np.array([px[-1], px[-1] + reach * fx]), np.array([py[-1], py[-1] + reach * fy]))

    def piece(kind, lo, hi):
        mask = (stations >= lo) & (stations <= hi)
        return PlanPart(kind, px[mask], py[mask])

    parts = [PlanPart(TANGENT, *back)]
    if spiralled and sc > start:
        parts.append(piece(SPIRAL_IN, start, sc))
    if cs > sc:
        parts.append(piece(ARC, sc, cs))
    if spiralled and end > cs:
        parts.append(piece(SPIRAL_OUT, cs, end))
    parts.append(PlanPart(TANGENT, *ahead))

    keys = [
        KeyPoint(str(name), float(s), float(x), float(y))
        for name, s, x, y in zip(table.point, stations, px, py, strict=True)
        if name
    ]
    keys.append(KeyPoint("PI", float(np.asarray(curve.pi)), 0.0, 0.0))

    # arc centre: the engine's local frame puts it at (k1, R + p1) from the TS (setout docs)
    r = float(radius)
    k1 = float(curve.k_in) if spiralled else 0.0
    p1 = float(curve.p_in) if spiralled else 0.0
    centre = (-t1 + k1, -direction * (r + p1))

    x = np.concatenate([back[0][:1], px, ahead[0][1:]])
    y = np.concatenate([back[1][:1], py, ahead[1][1:]])
    return PlanShape(
        x=x,
        y=y,
        parts=tuple(parts),
        key_points=tuple(keys),
        centre=centre,
        radius=r,
        deflection=d,
        direction=int(direction),
        ls_in=float(ls_in),
        ls_out=float(ls_out),
        spiralled=spiralled,
    )


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

    ``f_max`` replaces the table's maximum side friction (as the check's ``friction``);
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
    e = np.asarray(design_superelevation(table, v, grid, emax, fmax), dtype=float)
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


def plan_for_inputs(raw, units, radius, direction=+1, step=None, name=None) -> PlanShape | None:
    """The plan of a bend from its inputs (``curvetui.bend.service`` names, user units) and its
    radius [m]; None when no deflection is given. Raises InputError for bad inputs and
    GeometryError for overlapping spirals. ``name`` names fields in messages (default: the
    command-line names)."""
    from curvetui.bend.fields import cli_name
    from curvetui.bend.service import geometry_inputs

    geometry = geometry_inputs(raw, units, name or cli_name)
    if geometry is None:
        return None
    return plan_points(
        radius,
        geometry["deflection"],
        geometry["ls_in"],
        geometry["ls_out"],
        direction,
        step,
        pi_station=geometry["pi_station"],
    )


def station_texts(shape: PlanShape, units) -> dict[str, str]:
    """Station text of each key point in the user's units (``curvetui.stations``)."""
    from curvetui.stations import format_station

    return {
        p.name: format_station(float(units.length_from_si(p.station)), units.name)
        for p in shape.key_points
    }


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
