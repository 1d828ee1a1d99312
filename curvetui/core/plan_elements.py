"""An alignment as plan elements (lines, circular arcs, clothoids) and back.

Coordinates are (easting, northing) [m]; bearings clockwise from north. A bend turning
right (clockwise, ``rot`` +1) has its centre on the right of the direction of travel.

Chain -> elements (``chain_elements``): for a bend at PI with back direction u0, ahead
direction u1, the normal towards the curve n0 (n1), spiral ends X, Y, shifts p, k and
total tangents T_in, T_out from core/spiral.py:

    TS = PI - T_in u0             ST = PI + T_out u1
    SC = TS + X1 u0 + Y1 n0       CS = ST - X2 u1 + Y2 n1
    O  = TS + k1 u0 + (R + p1) n0 (the arc centre)
    spiral PI (where its end tangents meet) = TS + (X1 - Y1 / tan theta1) u0,
                                              ST - (X2 - Y2 / tan theta2) u1
    arc PI = SC + R tan(Dc / 2) t_SC, t_SC the direction at the SC, Dc = Lc / R.

The way back, elements to a chain, is core/plan_chain.py.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from curvetui.core.alignment import Chain, bearing

# Tolerances for elements read from a file (common practice, no source: survey and design
# files carry coordinates to the millimetre or better). A direction measured between two
# points d apart, each known to POSITION_TOL, is known to about 2 POSITION_TOL / d, so the
# kink allowed between two elements is ANGLE_TOL plus that for the shorter baseline.
POSITION_TOL = 0.005  # [m]
ANGLE_TOL = 1e-4  # [rad], about 21 arc seconds
ZERO_LENGTH = 1e-9  # [m] a tangent shorter than this is no Line element
# [m] a spiral shorter than a millimetre is left out: written to six decimals (a micrometre,
# or a millionth of a foot) its PI, about 2 Ls / 3 from its start, would round onto its start
# (seen: Ls 1e-6 m); the offset it makes, Ls^2 / (6 R) at its end, is below 2e-7 m for R >= 1 m
SHORTEST_SPIRAL = 1e-3


class ElementError(ValueError):
    """Plan elements that do not make a chain of bends (the message names the element)."""


Point = tuple[float, float]


@dataclass(frozen=True)
class LineElement:
    start: Point
    end: Point
    station: float | None = None
    label: str = "Line"


@dataclass(frozen=True)
class ArcElement:
    """A circular arc; ``rot`` +1 clockwise (turning right), -1 counter-clockwise."""

    start: Point
    center: Point
    end: Point
    rot: int
    radius: float
    pi: Point | None = None
    station: float | None = None
    label: str = "Curve"


@dataclass(frozen=True)
class SpiralElement:
    """A clothoid from ``radius_start`` to ``radius_end`` [m], one of them math.inf."""

    start: Point
    pi: Point
    end: Point
    length: float
    radius_start: float
    radius_end: float
    rot: int
    station: float | None = None
    label: str = "Spiral"


Element = LineElement | ArcElement | SpiralElement


def _unit(b: float) -> Point:
    return (math.sin(b), math.cos(b))


def offset(p: Point, *terms: tuple[float, Point]) -> Point:
    e, n = p
    for f, v in terms:
        e += f * v[0]
        n += f * v[1]
    return (e, n)


def right_of(u: Point) -> Point:
    """The unit vector 90 degrees clockwise of ``u`` (to the right of travel)."""
    return (u[1], -u[0])


def minus(a: Point, b: Point) -> Point:
    return (a[0] - b[0], a[1] - b[1])


def length_of(v: Point) -> float:
    return math.hypot(v[0], v[1])


def _cross(a: Point, b: Point) -> float:
    """a x b in (east, north): positive when b lies counter-clockwise of a."""
    return a[0] * b[1] - a[1] * b[0]


def signed_turn(u: Point, v: Point) -> float:
    """The angle [rad] from direction ``u`` to ``v``, right (clockwise) positive, in (-pi, pi]."""
    return -math.atan2(_cross(u, v), u[0] * v[0] + u[1] * v[1])


def tangent_intersection(p: Point, u: Point, q: Point, v: Point) -> Point:
    """Where the line through ``p`` along ``u`` meets the line through ``q`` along ``v``:
    p + s u with s = ((q - p) x v) / (u x v). Parallel lines raise ElementError."""
    denom = _cross(u, v)
    if abs(denom) < 1e-15:
        raise ElementError("the tangents are parallel: no PI")
    s = _cross(minus(q, p), v) / denom
    return offset(p, (s, u))


# --- chain -> elements -------------------------------------------------------------


def chain_elements(chain: Chain) -> list[Element]:
    """The chain as Line, Arc and Spiral elements in order, with their start stations; no
    Line where a tangent is zero. Overlapping bends raise ElementError."""
    lay = chain.lay_out()
    points = chain.points
    out: list[Element] = []
    here: Point = points[0]
    station = chain.start_station
    for i, bend in enumerate(lay.bends):
        g = bend.geometry
        pi = points[i + 1]
        u0 = _unit(bearing(points[i], pi))
        u1 = _unit(bearing(pi, points[i + 2]))
        side = bend.direction
        n0 = scaled(right_of(u0), side)
        n1 = scaled(right_of(u1), side)
        r = float(g.radius)
        ts = offset(pi, (-float(g.tangent_in), u0))
        st = offset(pi, (float(g.tangent_out), u1))
        tangent = lay.tangents[i]
        if tangent < -POSITION_TOL:
            raise ElementError(f"PI {i + 1}: the bend overlaps the one before it (or the start)")
        if tangent > ZERO_LENGTH:
            out.append(LineElement(here, ts, station))
        station = float(g.ts)
        l1, l2 = float(g.ls_in), float(g.ls_out)
        sc = offset(ts, (float(g.xs_in), u0), (float(g.ys_in), n0))
        cs = offset(st, (-float(g.xs_out), u1), (float(g.ys_out), n1))
        centre = offset(ts, (float(g.k_in), u0), (r + float(g.p_in), n0))
        if l1 >= SHORTEST_SPIRAL:
            th = float(g.theta_in)
            long_t = float(g.xs_in) - float(g.ys_in) / math.tan(th)
            out.append(
                SpiralElement(ts, offset(ts, (long_t, u0)), sc, l1, math.inf, r, side, station)
            )
        lc = float(g.circular_length)
        if lc > ZERO_LENGTH:
            t_sc = _unit(bearing(points[i], pi) + side * float(g.theta_in))
            arc_pi = offset(sc, (r * math.tan(lc / (2 * r)), t_sc))
            out.append(ArcElement(sc, centre, cs, side, r, arc_pi, float(g.sc)))
        if l2 >= SHORTEST_SPIRAL:
            th = float(g.theta_out)
            long_t = float(g.xs_out) - float(g.ys_out) / math.tan(th)
            out.append(
                SpiralElement(cs, offset(st, (-long_t, u1)), st, l2, r, math.inf, side, float(g.cs))
            )
        here = st
        station = float(g.st)
    if lay.tangents[-1] < -POSITION_TOL:
        raise ElementError(f"PI {len(lay.bends)}: the bend runs past the end point")
    if lay.tangents[-1] > ZERO_LENGTH:
        out.append(LineElement(here, points[-1], station))
    return out


def scaled(v: Point, f: float) -> Point:
    return (f * v[0], f * v[1])


def element_length(el: Element) -> float:
    """Length along the element [m]: |end - start|, R times the swept angle, or the given
    spiral length."""
    if isinstance(el, LineElement):
        return length_of(minus(el.end, el.start))
    if isinstance(el, SpiralElement):
        return el.length
    return el.radius * arc_sweep(el)


def arc_sweep(el: ArcElement) -> float:
    """The angle [rad] the arc turns through from start to end in its sense, in [0, 2 pi)."""
    a = minus(el.start, el.center)
    b = minus(el.end, el.center)
    ccw = math.atan2(_cross(a, b), a[0] * b[0] + a[1] * b[1])  # counter-clockwise angle a->b
    sweep = -ccw if el.rot > 0 else ccw
    return sweep % (2 * math.pi)


def directions(el: Element) -> tuple[Point, Point, float, float]:
    """Unit directions of travel at the start and the end, and the baselines [m] each was
    measured over (for the kink tolerance)."""
    if isinstance(el, LineElement):
        d = minus(el.end, el.start)
        length = length_of(d)
        u = scaled(d, 1 / length)
        return u, u, length, length
    if isinstance(el, ArcElement):
        rs = minus(el.start, el.center)
        re = minus(el.end, el.center)
        ds = scaled(right_of(rs), el.rot / length_of(rs))  # clockwise travel: r turned right
        de = scaled(right_of(re), el.rot / length_of(re))
        return ds, de, length_of(rs), length_of(re)
    a = minus(el.pi, el.start)
    b = minus(el.end, el.pi)
    la, lb = length_of(a), length_of(b)
    if la < ZERO_LENGTH or lb < ZERO_LENGTH:
        raise ElementError(f"{el.label}: its PI coincides with its start or end")
    return scaled(a, 1 / la), scaled(b, 1 / lb), la, lb
