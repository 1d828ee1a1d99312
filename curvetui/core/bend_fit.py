"""One stretch of a centreline fitted with a bend whose curvature is piecewise linear in
station (core/curve_fit.py): tangent, clothoid ramp, arc, ... , ramp, tangent.

Starts: the curving pieces of the heading diagram (core/heading_segments.py) give the
arcs: for K plateaus (1 to MAX_PLATEAUS, no more than the pieces) the K longest pieces
are the arcs, what lies between them the ramps; two more starts for one arc come from
the stretch's turn and extent. Of the fits, the lowest Bayesian information criterion
wins (a richer model must lower it by BIC_MARGIN); the number of independent headings is
the points compared over the width one noise value spans (the smoothing). A plateau
flatter than 1 / max_radius between two others is a tangent: the bend is parted there
into two bends (broken-back, the stretch's ends having been blurred together).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from curvetui.core.centreline import Centreline, smooth_like
from curvetui.core.curve_fit import CurvatureModel, fit_curvature, heading_of_knots
from curvetui.core.curve_regions import Region

MAX_PLATEAUS = 3
MAX_COMPARED = 200  # headings compared in a fit at most (evenly spread; they are correlated)
BIC_MARGIN = 10.0  # a richer model must lower the criterion by this much (no source)
# a single bend fitting the headings to within this many noise sd (or GOOD_FIT_FLOOR
# [rad]) is not tried with more plateaus (saves time; no source)
GOOD_FIT_SIGMAS = 3.0
GOOD_FIT_FLOOR = 5e-4
# an end plateau under this share of the sharpest, turning less than STRAY_TURN [rad], is
# the tangent beyond the bend and is left off (no source)
STRAY_SHARE = 0.1
STRAY_TURN = math.radians(2.0)


@dataclass(frozen=True)
class FittedBend:
    """A fitted bend: knots [m along the smoothed line] TS, SC, (CC ...), CS, ST; the
    plateau curvatures [1/m, left positive]; the signed turn [rad]."""

    knots: tuple[float, ...]
    plateaus: tuple[float, ...]
    turn: float


def heading_noise(line: Centreline) -> float:
    """Robust standard deviation [rad] of the headings' noise: from second differences at
    a lag past the smoothing, sd = 1.4826 median|h(i+m) - 2 h(i) + h(i-m)| / sqrt 6
    (independent errors; curves add little where the curvature is steady)."""
    m = 2 * line.half + 1 + int(round(2 * line.smoothing / line.step))
    h = line.heading
    if h.size <= 2 * m:
        return 0.0
    d2 = h[2 * m :] - 2 * h[m:-m] + h[: -2 * m]
    return float(1.4826 * np.median(np.abs(d2)) / math.sqrt(6.0))


def fit_region(
    line: Centreline,
    region: Region,
    lo: int,
    hi: int,
    max_radius: float,
    noise: float,
) -> list[FittedBend]:
    """The bend (or bends) best fitting the headings from point ``lo`` to ``hi`` around
    ``region`` (module doc); ``noise`` the headings' noise sd [rad]."""
    n = line.arc.size
    step = line.step
    pad = int(math.ceil(4 * line.smoothing / step)) + line.half + 1
    elo, ehi = max(0, lo - pad), min(n - 1, hi + pad)
    # every k-th point only (headings are correlated over the chord): k = stride
    stride = max(1, (hi - lo + 1) // MAX_COMPARED)
    elo = lo - ((lo - elo) // stride) * stride
    s = line.arc[elo : ehi + 1 : stride]
    heading = line.heading[elo : ehi + 1 : stride]
    inside = (s >= line.arc[lo]) & (s <= line.arc[hi])

    def smoother(values: NDArray) -> NDArray:
        return smooth_like(line, values, stride)

    first, last = float(line.arc[region.first]), float(line.arc[region.last])
    turn = float(line.heading[region.last] - line.heading[region.first])
    if abs(turn) < 1e-9:
        return []
    span = max(last - first, step)
    # the bend starts and ends on the stretch, unless the line starts or ends in it
    bounds = (line.arc[lo] - (span if lo == 0 else 0.0), line.arc[hi])
    end_limit = math.inf if hi == n - 1 else float(line.arc[hi])
    theta0 = float(line.heading[lo])
    n_eff = max(2.0, (hi - lo + 1) / (2 * line.half + 1 + 2 * line.smoothing / step))

    def fit(start: NDArray, plateaus: int) -> CurvatureModel:
        pattern = (True,) * plateaus
        return fit_curvature(s, heading, start, smoother, inside, pattern, bounds, end_limit)

    def criterion(model: CurvatureModel) -> float:
        k = 2 + 3 * len(model.plateaus) + 1
        mean_sq = max(2 * model.cost / max(model.points, 1), 1e-30)
        return n_eff * math.log(mean_sq) + k * math.log(n_eff)

    weight = np.abs(line.curvature[region.first : region.last + 1])
    centre = float(
        np.sum(line.arc[region.first : region.last + 1] * weight) / max(np.sum(weight), 1e-300)
    )
    starts = [_piece_start(line, region, theta0, 1)]
    for middle, le, share in ((centre, span * 0.6, 0.3), ((first + last) / 2, span, 0.0)):
        lc = le * (1 - share)
        ls = max(le * share, 0.5)
        starts.append(np.array([theta0, middle - lc / 2 - ls, ls, lc, ls, turn / (lc + ls)]))
    single = min((fit(x0, 1) for x0 in starts if x0 is not None), key=lambda m: m.cost)
    best, best_value = single, criterion(single)
    if single.rms > max(GOOD_FIT_SIGMAS * noise, GOOD_FIT_FLOOR):
        for k in range(2, min(MAX_PLATEAUS, len(region.pieces)) + 1):
            start = _piece_start(line, region, theta0, k)
            if start is None:
                continue
            model = fit(start, k)
            value = criterion(model)
            if value < best_value - BIC_MARGIN:
                best, best_value = model, value
    bends = _parted(best, 1.0 / max_radius)
    return [within(b, float(line.arc[0]), float(line.arc[-1])) for b in bends]


def _piece_start(line: Centreline, region: Region, theta0: float, k: int) -> NDArray | None:
    """Start values with the ``k`` longest curving pieces as the arcs (module doc)."""
    pieces = sorted(region.pieces, key=lambda p: p[1] - p[0], reverse=True)[:k]
    if len(pieces) < k:
        return None
    pieces.sort()
    arc = line.arc
    ts, st = float(arc[region.first]), float(arc[region.last])
    lengths = [max(float(arc[pieces[0][0]]) - ts, 0.5)]
    for j, (a, b, _) in enumerate(pieces):
        lengths.append(max(float(arc[b] - arc[a]), 0.5))
        end = st if j == k - 1 else float(arc[pieces[j + 1][0]])
        lengths.append(max(end - float(arc[b]), 0.5))
    kappas = [p[2] for p in pieces]
    return np.array([theta0, ts, *lengths, *kappas])


def _parted(model: CurvatureModel, flat: float) -> list[FittedBend]:
    """The model as bends, parted at inner plateaus flatter than ``flat`` [1/m]."""
    knots, plateaus = list(model.knots), list(model.plateaus)
    sharpest = max(abs(k) for k in plateaus)

    def stray(j: int) -> bool:  # an end plateau that is the tangent beyond the bend
        turn = abs(plateaus[j]) * (knots[2 * j + 2] - knots[2 * j + 1])
        return abs(plateaus[j]) < max(flat, STRAY_SHARE * sharpest) and turn < STRAY_TURN

    while len(plateaus) > 1 and stray(len(plateaus) - 1):
        plateaus.pop()
        knots = knots[:-2]
    while len(plateaus) > 1 and stray(0):
        plateaus.pop(0)
        knots = knots[2:]
    out: list[FittedBend] = []
    start = 0  # the current bend's first plateau; its TS is knots[2 start]
    for j in range(1, len(plateaus) - 1):
        if abs(plateaus[j]) < flat:  # plateau j is a tangent from knots[2j+1] to [2j+2]
            out.append(_bend(knots[2 * start : 2 * j + 2], plateaus[start:j]))
            start = j + 1
    out.append(_bend(knots[2 * start :], plateaus[start:]))
    return out


def _bend(knots: list[float], plateaus: list[float]) -> FittedBend:
    kn = np.asarray(knots)
    values = np.concatenate(([0.0], np.repeat(plateaus, 2), [0.0]))
    turn = float(np.sum(np.diff(kn) * (values[:-1] + values[1:]) / 2))
    return FittedBend(tuple(float(v) for v in kn), tuple(float(v) for v in plateaus), turn)


def within(bend: FittedBend, first: float, last: float) -> FittedBend:
    """The bend cut to the line (a line that starts or ends inside a curve): knots clipped
    and the turn the part on the line makes."""
    knots = np.asarray(bend.knots)
    values = np.concatenate(([0.0], np.repeat(bend.plateaus, 2), [0.0]))
    a, b = max(knots[0], first), min(knots[-1], last)
    ends = heading_of_knots(np.array([a, b]), knots, values, 0.0)
    clipped = tuple(float(k) for k in np.clip(knots, first, last))
    return FittedBend(clipped, bend.plateaus, float(ends[1] - ends[0]))
