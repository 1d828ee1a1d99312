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

Elements -> chain (``chain_from_elements``): consecutive elements are grouped into bends
(spiral in, arc, spiral out; either spiral may be missing, or the arc), each bend's PI is
where its entry and exit tangents cross (``tangent_intersection``), and the chain is laid
out again and compared with the elements given: a gap, a kink, a spiral that is not the
clothoid its length and radius make, or any element end further than POSITION_TOL from the
rebuilt one is refused with the element's label.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from curvetui.core.alignment import AlignmentError, Chain, bearing

# Tolerances for elements read from a file (common practice, no source: survey and design
# files carry coordinates to the millimetre or better). A direction measured between two
# points d apart, each known to POSITION_TOL, is known to about 2 POSITION_TOL / d, so the
# kink allowed between two elements is ANGLE_TOL plus that for the shorter baseline.
POSITION_TOL = 0.005  # [m]
ANGLE_TOL = 1e-4  # [rad], about 21 arc seconds
ZERO_LENGTH = 1e-9  # [m] a tangent shorter than this is no Line element
# [m] a spiral shorter than a micrometre is left out (no file writes its length; the offset
# it makes, Ls^2 / (6 R) at its end, is below 1e-12 m)
SHORTEST_SPIRAL = 1e-6


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


def _add(p: Point, *terms: tuple[float, Point]) -> Point:
    e, n = p
    for f, v in terms:
        e += f * v[0]
        n += f * v[1]
    return (e, n)


def _right(u: Point) -> Point:
    """The unit vector 90 degrees clockwise of ``u`` (to the right of travel)."""
    return (u[1], -u[0])


def _sub(a: Point, b: Point) -> Point:
    return (a[0] - b[0], a[1] - b[1])


def _norm(v: Point) -> float:
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
    s = _cross(_sub(q, p), v) / denom
    return _add(p, (s, u))


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
        n0 = _scale(_right(u0), side)
        n1 = _scale(_right(u1), side)
        r = float(g.radius)
        ts = _add(pi, (-float(g.tangent_in), u0))
        st = _add(pi, (float(g.tangent_out), u1))
        tangent = lay.tangents[i]
        if tangent < -POSITION_TOL:
            raise ElementError(f"PI {i + 1}: the bend overlaps the one before it (or the start)")
        if tangent > ZERO_LENGTH:
            out.append(LineElement(here, ts, station))
        station = float(g.ts)
        l1, l2 = float(g.ls_in), float(g.ls_out)
        sc = _add(ts, (float(g.xs_in), u0), (float(g.ys_in), n0))
        cs = _add(st, (-float(g.xs_out), u1), (float(g.ys_out), n1))
        centre = _add(ts, (float(g.k_in), u0), (r + float(g.p_in), n0))
        if l1 >= SHORTEST_SPIRAL:
            th = float(g.theta_in)
            long_t = float(g.xs_in) - float(g.ys_in) / math.tan(th)
            out.append(
                SpiralElement(ts, _add(ts, (long_t, u0)), sc, l1, math.inf, r, side, station)
            )
        lc = float(g.circular_length)
        if lc > ZERO_LENGTH:
            t_sc = _unit(bearing(points[i], pi) + side * float(g.theta_in))
            arc_pi = _add(sc, (r * math.tan(lc / (2 * r)), t_sc))
            out.append(ArcElement(sc, centre, cs, side, r, arc_pi, float(g.sc)))
        if l2 >= SHORTEST_SPIRAL:
            th = float(g.theta_out)
            long_t = float(g.xs_out) - float(g.ys_out) / math.tan(th)
            out.append(
                SpiralElement(cs, _add(st, (-long_t, u1)), st, l2, r, math.inf, side, float(g.cs))
            )
        here = st
        station = float(g.st)
    if lay.tangents[-1] < -POSITION_TOL:
        raise ElementError(f"PI {len(lay.bends)}: the bend runs past the end point")
    if lay.tangents[-1] > ZERO_LENGTH:
        out.append(LineElement(here, points[-1], station))
    return out


def _scale(v: Point, f: float) -> Point:
    return (f * v[0], f * v[1])


def element_length(el: Element) -> float:
    """Length along the element [m]: |end - start|, R times the swept angle, or the given
    spiral length."""
    if isinstance(el, LineElement):
        return _norm(_sub(el.end, el.start))
    if isinstance(el, SpiralElement):
        return el.length
    return el.radius * arc_sweep(el)


def arc_sweep(el: ArcElement) -> float:
    """The angle [rad] the arc turns through from start to end in its sense, in [0, 2 pi)."""
    a = _sub(el.start, el.center)
    b = _sub(el.end, el.center)
    ccw = math.atan2(_cross(a, b), a[0] * b[0] + a[1] * b[1])  # counter-clockwise angle a->b
    sweep = -ccw if el.rot > 0 else ccw
    return sweep % (2 * math.pi)


# --- elements -> chain -------------------------------------------------------------


def _directions(el: Element) -> tuple[Point, Point, float, float]:
    """Unit directions of travel at the start and the end, and the baselines [m] each was
    measured over (for the kink tolerance)."""
    if isinstance(el, LineElement):
        d = _sub(el.end, el.start)
        length = _norm(d)
        u = _scale(d, 1 / length)
        return u, u, length, length
    if isinstance(el, ArcElement):
        rs = _sub(el.start, el.center)
        re = _sub(el.end, el.center)
        ds = _scale(_right(rs), el.rot / _norm(rs))  # clockwise travel: r turned right
        de = _scale(_right(re), el.rot / _norm(re))
        return ds, de, _norm(rs), _norm(re)
    a = _sub(el.pi, el.start)
    b = _sub(el.end, el.pi)
    la, lb = _norm(a), _norm(b)
    if la < ZERO_LENGTH or lb < ZERO_LENGTH:
        raise ElementError(f"{el.label}: its PI coincides with its start or end")
    return _scale(a, 1 / la), _scale(b, 1 / lb), la, lb


def _check_element(el: Element) -> None:
    if isinstance(el, LineElement):
        return
    if isinstance(el, ArcElement):
        for end, p in (("start", el.start), ("end", el.end)):
            off = abs(_norm(_sub(p, el.center)) - el.radius)
            if off > POSITION_TOL:
                raise ElementError(
                    f"{el.label}: its {end} lies {off:.4f} m off the circle of radius "
                    f"{el.radius:.4f} m about its centre"
                )
        sweep = arc_sweep(el)
        if not 0 < sweep < math.pi:
            raise ElementError(
                f"{el.label}: it turns through {math.degrees(sweep):.4f} deg; a bend must "
                "turn through more than 0 and less than 180 deg"
            )
        return
    finite = [r for r in (el.radius_start, el.radius_end) if math.isfinite(r)]
    if len(finite) != 1:
        raise ElementError(
            f"{el.label}: only a full clothoid from a tangent (radius INF) to a curve, or "
            "back, is supported; this one runs between "
            + ("two finite radii" if len(finite) == 2 else "two infinite radii")
        )
    if not (finite[0] > 0 and el.length > 0 and math.isfinite(el.length)):
        raise ElementError(f"{el.label}: its length and radius must be positive")


def _check_spiral_shape(el: SpiralElement, clothoid_xy) -> None:
    """The spiral's end (or start) where a clothoid of its length and radius puts it."""
    r = el.radius_end if math.isfinite(el.radius_end) else el.radius_start
    x, y = (float(v) for v in clothoid_xy(el.length, el.length, r))
    ds, de, _, _ = _directions(el)
    if math.isfinite(el.radius_end):  # tangent -> curve: from the start
        expected = _add(el.start, (x, ds), (y, _scale(_right(ds), el.rot)))
        given, which = el.end, "end"
    else:  # curve -> tangent: back from the end
        expected = _add(el.end, (-x, de), (y, _scale(_right(de), el.rot)))
        given, which = el.start, "start"
    off = _norm(_sub(given, expected))
    turn = signed_turn(ds, de) * el.rot
    _, _, base_a, base_b = _directions(el)
    allowed = ANGLE_TOL + 2 * POSITION_TOL / min(base_a, base_b)
    if off > POSITION_TOL or abs(turn - el.length / (2 * r)) > allowed:
        raise ElementError(
            f"{el.label}: not a clothoid of length {el.length:.4f} m to radius {r:.4f} m "
            f"turning {'clockwise' if el.rot > 0 else 'counter-clockwise'} (its {which} lies "
            f"{off:.4f} m from where that clothoid ends; it turns "
            f"{math.degrees(signed_turn(ds, de) * el.rot):.6f} deg, the clothoid "
            f"{math.degrees(el.length / (2 * r)):.6f} deg)"
        )


def _joins(a: Element, b: Element) -> None:
    gap = _norm(_sub(b.start, a.end))
    if gap > POSITION_TOL:
        raise ElementError(
            f"a gap of {gap:.4f} m between {a.label} and {b.label} (at most "
            f"{POSITION_TOL} m allowed)"
        )
    _, da, _, base_a = _directions(a)
    db, _, base_b, _ = _directions(b)
    kink = abs(signed_turn(da, db))
    allowed = ANGLE_TOL + 2 * POSITION_TOL / min(base_a, base_b)
    if kink > allowed:
        raise ElementError(
            f"a kink of {math.degrees(kink):.6f} deg between {a.label} and {b.label} "
            f"(the elements must be tangent; at most {math.degrees(allowed):.6f} deg allowed)"
        )


def _radius_of(el: Element) -> float:
    """The finite radius of an arc or a spiral's curve end."""
    if isinstance(el, ArcElement):
        return el.radius
    assert isinstance(el, SpiralElement)
    return el.radius_end if math.isfinite(el.radius_end) else el.radius_start


def _same_radius(a: Element, b: Element) -> bool:
    ra, rb = _radius_of(a), _radius_of(b)
    return abs(ra - rb) <= POSITION_TOL + 1e-9 * max(ra, rb)


def group_bends(elements: list[Element]) -> list[list[Element]]:
    """The curved elements grouped into bends: [spiral in] [arc] [spiral out], each turning
    one way with one radius. Anything else raises ElementError naming the element."""
    bends: list[list[Element]] = []
    current: list[Element] = []
    for el in elements:
        if isinstance(el, LineElement):
            if current:
                _close(current)
                bends.append(current)
                current = []
            continue
        entering = isinstance(el, SpiralElement) and math.isfinite(el.radius_end)
        if current and (entering or current[-1].rot != el.rot):
            _close(current)  # a new bend starts right where the last ended
            bends.append(current)
            current = []
        if not current:
            if isinstance(el, SpiralElement) and not entering:
                raise ElementError(
                    f"{el.label}: a spiral from radius {el.radius_start:.4f} m to a tangent "
                    "must follow a curve (or spiral) of that radius turning the same way"
                )
            current = [el]
            continue
        last = current[-1]
        if isinstance(last, SpiralElement) and not math.isfinite(last.radius_end):
            raise ElementError(
                f"{el.label}: follows {last.label}, which already ended its bend on a tangent"
            )
        if not _same_radius(last, el):
            what = "compound curve" if isinstance(el, ArcElement) else "spiral"
            raise ElementError(
                f"{el.label}: radius {_radius_of(el):.4f} m after {last.label} of radius "
                f"{_radius_of(last):.4f} m ({what}): each bend has one radius here"
            )
        if isinstance(el, ArcElement) and isinstance(last, ArcElement):
            raise ElementError(
                f"{el.label}: a second curve of the same radius right after {last.label}; "
                "join them into one curve"
            )
        current.append(el)
    if current:
        _close(current)
        bends.append(current)
    return bends


def _close(bend: list[Element]) -> None:
    first, last = bend[0], bend[-1]
    if isinstance(first, SpiralElement) and isinstance(last, SpiralElement) and len(bend) == 1:
        raise ElementError(
            f"{first.label}: a spiral into a curve must be followed by the curve or a spiral "
            "back to a tangent"
        )
    if isinstance(last, SpiralElement) and math.isfinite(last.radius_end):
        raise ElementError(
            f"{last.label}: the spiral ends on radius {last.radius_end:.4f} m but no curve "
            "of that radius follows"
        )


def _tangent_direction(elements: list[Element], index: int, before: bool) -> Point:
    """The direction of a bend's tangent at its first (``before``) or last element: that of
    the Line next to it when there is one (measured over the Line's whole length, better
    than over a short spiral's), else the element's own."""
    j = index - 1 if before else index + 1
    if 0 <= j < len(elements) and isinstance(elements[j], LineElement):
        return _directions(elements[j])[0]
    ds, de, _, _ = _directions(elements[index])
    return ds if before else de


def chain_from_elements(
    elements: list[Element], start_station: float = 0.0, name: str = ""
) -> Chain:
    """The chain of PIs the elements make (see the module text); ElementError if they do
    not make one within POSITION_TOL and ANGLE_TOL."""
    from curvetui.core.spiral import clothoid_xy

    elements = [el for el in elements if not _tiny_line(el)]  # a zero tangent written out
    if not elements:
        raise ElementError("no plan elements (Line, Curve, Spiral)")
    for el in elements:
        _check_element(el)
        if isinstance(el, SpiralElement):
            _check_spiral_shape(el, clothoid_xy)
    for a, b in zip(elements, elements[1:], strict=False):
        _joins(a, b)
    bends = group_bends(elements)
    if not bends:
        raise ElementError("only straight lines: an alignment needs at least one bend")
    points: list[Point] = [elements[0].start]
    radii, ls_in, ls_out = [], [], []
    position = {id(el): i for i, el in enumerate(elements)}
    for bend in bends:
        first, last = bend[0], bend[-1]
        u = _tangent_direction(elements, position[id(first)], before=True)
        v = _tangent_direction(elements, position[id(last)], before=False)
        turn = signed_turn(u, v)
        if turn * first.rot <= 0:
            raise ElementError(
                f"{first.label}: the bend turns {'right' if turn > 0 else 'left'} but is "
                f"marked {'cw' if first.rot > 0 else 'ccw'}"
            )
        try:
            points.append(tangent_intersection(first.start, u, last.end, v))
        except ElementError:
            raise ElementError(f"{first.label}: the bend's tangents are parallel") from None
        radii.append(_radius_of(first))
        ls_in.append(first.length if isinstance(first, SpiralElement) else 0.0)
        out = last.length if isinstance(last, SpiralElement) and last is not first else 0.0
        ls_out.append(out)
    points.append(elements[-1].end)
    chain = Chain(tuple(points), tuple(radii), tuple(ls_in), tuple(ls_out), start_station, name)
    _compare_rebuilt(chain, elements)
    return chain


def _tiny_line(el: Element) -> bool:
    return isinstance(el, LineElement) and element_length(el) <= POSITION_TOL


def _compare_rebuilt(chain: Chain, elements: list[Element]) -> None:
    """Lay the chain out again and require every element's ends within POSITION_TOL."""
    try:
        rebuilt = chain_elements(chain)
    except (AlignmentError, ElementError, ValueError) as exc:
        raise ElementError(f"the elements do not make an alignment: {exc}") from None
    given = [el for el in elements if not _tiny_line(el)]
    rebuilt = [el for el in rebuilt if not _tiny_line(el)]
    if len(given) != len(rebuilt):
        raise ElementError(
            f"the alignment rebuilt from its PIs has {len(rebuilt)} elements, the file "
            f"{len(given)}: check the elements' lengths and radii"
        )
    for el, new in zip(given, rebuilt, strict=True):
        for which in ("start", "end"):
            off = _norm(_sub(getattr(el, which), getattr(new, which)))
            if off > POSITION_TOL:
                raise ElementError(
                    f"{el.label}: its {which} lies {off:.4f} m from where the alignment "
                    "rebuilt from the tangents' intersections puts it (at most "
                    f"{POSITION_TOL} m); check its length and radius"
                )
