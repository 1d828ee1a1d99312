"""Points along plan elements (lines, circular arcs, clothoids) at given lengths.

For a Line from A to B: A + t (B - A) / |B - A|. For an Arc of centre O and sense rot
(+1 clockwise): the start's radius vector turned by -rot t / R. For a clothoid leaving a
tangent (radius_start infinite) with start direction u and normal n towards the curve:
start + x(t) u + y(t) n, x, y from core/spiral.py's clothoid_xy(t, Ls, R); for one
entering a tangent, the same measured back from its end along the reversed end direction:
end - x(Ls - t) u_end + y(Ls - t) n_end.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray

from curvetui.core.plan_elements import (
    ArcElement,
    Element,
    LineElement,
    SpiralElement,
    directions,
    element_length,
    right_of,
)
from curvetui.core.spiral import clothoid_xy


def element_points(el: Element, t: NDArray) -> tuple[NDArray, NDArray]:
    """(easting, northing) [m] of the points at lengths ``t`` [m] from the element's start
    (module doc)."""
    t = np.asarray(t, dtype=float)
    if isinstance(el, LineElement):
        length = element_length(el)
        ux, uy = (el.end[0] - el.start[0]) / length, (el.end[1] - el.start[1]) / length
        return el.start[0] + t * ux, el.start[1] + t * uy
    if isinstance(el, ArcElement):
        a0 = math.atan2(el.start[1] - el.center[1], el.start[0] - el.center[0])
        a = a0 - el.rot * t / el.radius  # clockwise (rot +1) lowers the angle
        return el.center[0] + el.radius * np.cos(a), el.center[1] + el.radius * np.sin(a)
    return _spiral_points(el, t)


def _spiral_points(el: SpiralElement, t: NDArray) -> tuple[NDArray, NDArray]:
    ds, de, _, _ = directions(el)
    if math.isfinite(el.radius_end):  # tangent -> curve, from the start
        x, y = clothoid_xy(t, el.length, el.radius_end)
        n = right_of(ds)
        return (
            el.start[0] + x * ds[0] + y * el.rot * n[0],
            el.start[1] + x * ds[1] + y * el.rot * n[1],
        )
    x, y = clothoid_xy(el.length - t, el.length, el.radius_start)
    n = right_of(de)
    return (
        el.end[0] - x * de[0] + y * el.rot * n[0],
        el.end[1] - x * de[1] + y * el.rot * n[1],
    )


def points_along(elements: list[Element], spacing: float) -> tuple[NDArray, NDArray, NDArray]:
    """Points every ``spacing`` [m] along the elements from the first one's start, and the
    last end: (lengths from the start, eastings, northings)."""
    lengths = [element_length(el) for el in elements]
    starts = np.concatenate(([0.0], np.cumsum(lengths)))
    total = float(starts[-1])
    s = np.arange(0.0, total, spacing)
    if total - s[-1] > 1e-9 * max(total, 1.0):
        s = np.append(s, total)
    else:
        s[-1] = total
    which = np.clip(np.searchsorted(starts, s, side="right") - 1, 0, len(elements) - 1)
    e = np.empty_like(s)
    n = np.empty_like(s)
    for k, el in enumerate(elements):
        pick = which == k
        if pick.any():
            t = np.minimum(s[pick] - starts[k], lengths[k])
            e[pick], n[pick] = element_points(el, t)
    return s, e, n
