"""Plan elements (lines, arcs, clothoids) back to a chain of PIs.

``chain_from_elements``: consecutive elements are grouped into bends (spiral in, arc,
spiral out; either spiral may be missing, or the arc), each bend's PI is where its entry
and exit tangents cross (``tangent_intersection``; a tangent is measured along the Line
next to the bend where there is one), and the chain is laid out again and compared with the
elements given: a gap, a kink, a spiral that is not the clothoid its length and radius make,
or any element end further than POSITION_TOL from the rebuilt one is refused with the
element's label (ElementError).
"""

from __future__ import annotations

import math

from curvetui.core.alignment import AlignmentError, Chain
from curvetui.core.plan_elements import (
    ANGLE_TOL,
    POSITION_TOL,
    ArcElement,
    Element,
    ElementError,
    LineElement,
    Point,
    SpiralElement,
    arc_sweep,
    chain_elements,
    directions,
    element_length,
    length_of,
    minus,
    offset,
    right_of,
    scaled,
    signed_turn,
    tangent_intersection,
)


def _check_element(el: Element) -> None:
    if isinstance(el, LineElement):
        return
    if isinstance(el, ArcElement):
        for end, p in (("start", el.start), ("end", el.end)):
            off = abs(length_of(minus(p, el.center)) - el.radius)
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
    ds, de, _, _ = directions(el)
    if math.isfinite(el.radius_end):  # tangent -> curve: from the start
        expected = offset(el.start, (x, ds), (y, scaled(right_of(ds), el.rot)))
        given, which = el.end, "end"
    else:  # curve -> tangent: back from the end
        expected = offset(el.end, (-x, de), (y, scaled(right_of(de), el.rot)))
        given, which = el.start, "start"
    off = length_of(minus(given, expected))
    turn = signed_turn(ds, de) * el.rot
    _, _, base_a, base_b = directions(el)
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
    gap = length_of(minus(b.start, a.end))
    if gap > POSITION_TOL:
        raise ElementError(
            f"a gap of {gap:.4f} m between {a.label} and {b.label} (at most "
            f"{POSITION_TOL} m allowed)"
        )
    _, da, _, base_a = directions(a)
    db, _, base_b, _ = directions(b)
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
        return directions(elements[j])[0]
    ds, de, _, _ = directions(elements[index])
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
            off = length_of(minus(getattr(el, which), getattr(new, which)))
            if off > POSITION_TOL:
                raise ElementError(
                    f"{el.label}: its {which} lies {off:.4f} m from where the alignment "
                    "rebuilt from the tangents' intersections puts it (at most "
                    f"{POSITION_TOL} m); check its length and radius"
                )
