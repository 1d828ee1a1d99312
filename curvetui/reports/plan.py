"""The plan of a bend's centreline for the pictures, set out by the engine (numpy only, SI)."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from curvetui.core.circular import CircularCurve, GeometryError, circular_curve
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
    "plan_for_inputs",
    "plan_points",
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
    """The centreline of one bend in the plan frame, metres.

    Plan frame: the PI at (0, 0), the back tangent arriving along +x (travel from -x towards
    the PI), y up. A right-hand bend (direction +1) turns clockwise, towards -y; a left-hand
    one (direction -1) towards +y. It is a sketch frame, not the ground frame (no bearing).

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
