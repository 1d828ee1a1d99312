"""One stretch of a centreline fitted with a bend whose curvature is piecewise linear in
station (core/curve_fit.py): tangent, clothoid ramp, arc, ... , ramp, tangent.

Starts: the curving pieces of the heading diagram (core/heading_segments.py) give the
arcs: for K plateaus (1 to MAX_PLATEAUS) the K longest pieces are the arcs, what lies
between them the ramps; where the pieces are too few, guessed ones (``_candidate_pieces``:
the best two-line split of the headings, a flat piece where the curvature is least, or
a flat piece put in at a junction); two more starts for one arc come from the stretch's
turn and extent. More than one arc is tried only when one arc misfits the headings by
more than GOOD_FIT_SIGMAS noise sd. Of the fits, the lowest Bayesian information criterion
wins (a richer model must lower it by BIC_MARGIN); the number of independent headings is
the points compared over the width one noise value spans (the smoothing). A plateau
flatter than 1 / max_radius, or than FLAT_SHARE of its flatter neighbour, between two
others is a tangent: the bend is parted there into two bends (broken-back, the
stretch's ends having been blurred together).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from curvetui.core.centreline import Centreline, smooth_like
from curvetui.core.curve_fit import NO_RAMP, CurvatureModel, fit_curvature, heading_of_knots
from curvetui.core.curve_regions import Region

MAX_PLATEAUS = 4
# [m] an arc of a compound shorter than this (or the chord, or the smoothing width) is
# not told apart from a ramp (no source)
MIN_ARC = 5.0
# [rad] heading misfits below this (0.06 degree) are not told apart: the chord's mean and
# the Gaussian stand-in for the point smoothing (centreline.smooth_like) round a sudden
# change of curvature off by about as much (no source)
HEADING_RESOLUTION = 1e-3
# an inner plateau flatter than this share of its flatter neighbour (or 1 / max_radius) is
# a tangent (no source: compound curves keep a radius ratio far below 10; TxDOT's design
# limit is 1.5)
FLAT_SHARE = 0.1
MAX_COMPARED = 200  # headings compared in a fit at most (evenly spread; they are correlated)
BIC_MARGIN = 6.0  # a richer model must lower the criterion by this much (no source)
# a single bend fitting the headings to within this many noise sd (or GOOD_FIT_FLOOR
# [rad]) is not tried with more plateaus (saves time; no source)
GOOD_FIT_SIGMAS = 1.2
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
    shortest_ramp: Callable[[float], float],
) -> list[FittedBend]:
    """The bend (or bends) best fitting the headings from point ``lo`` to ``hi`` around
    ``region`` (module doc); ``noise`` the headings' noise sd [rad]; ``shortest_ramp``:
    the shortest end ramp [m] told from a plain arc's end on an arc of a radius [m]
    (shorter ones are held at zero and the bend fitted again, ``_plain_ends``)."""
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

    def fit(start: NDArray, plateaus: int, held=(False, False)) -> CurvatureModel:
        pattern = (True,) * plateaus
        return fit_curvature(
            s, heading, start, smoother, inside, pattern, bounds, end_limit, no_ramp=held
        )

    def criterion(model: CurvatureModel) -> float:
        k = 2 + 3 * len(model.plateaus) + 1
        # misfits under HEADING_RESOLUTION do not count (a line without noise would
        # otherwise buy extra arcs for the smoothing's rounding at a change of curvature)
        mean_sq = max(2 * model.cost / max(model.points, 1), HEADING_RESOLUTION**2)
        return n_eff * math.log(mean_sq) + k * math.log(n_eff)

    weight = np.abs(line.curvature[region.first : region.last + 1])
    centre = float(
        np.sum(line.arc[region.first : region.last + 1] * weight) / max(np.sum(weight), 1e-300)
    )
    starts = [_piece_start(line, region, theta0, 1, region.pieces)]
    for middle, le, share in ((centre, span * 0.6, 0.3), ((first + last) / 2, span, 0.0)):
        lc = le * (1 - share)
        ls = max(le * share, 0.5)
        starts.append(np.array([theta0, middle - lc / 2 - ls, ls, lc, ls, turn / (lc + ls)]))
    single = min((fit(x0, 1) for x0 in starts if x0 is not None), key=lambda m: m.cost)
    best, best_value = single, criterion(single)
    shortest_arc = max(MIN_ARC, 2 * line.half * step, line.smoothing)
    if single.rms > max(GOOD_FIT_SIGMAS * noise, GOOD_FIT_FLOOR):
        for k in range(2, MAX_PLATEAUS + 1):
            for pieces in _candidate_pieces(line, region, k):
                start = _piece_start(line, region, theta0, k, pieces)
                if start is None:
                    continue
                model = fit(start, k)
                if _has_short_arc(model, shortest_arc):
                    continue
                value = criterion(model)
                if value < best_value - BIC_MARGIN:
                    best, best_value = model, value
    bends = _parted(_plain_ends(best, fit, shortest_ramp), 1.0 / max_radius)
    return [within(b, float(line.arc[0]), float(line.arc[-1])) for b in bends]


def _plain_ends(model: CurvatureModel, fit, shortest_ramp) -> CurvatureModel:
    """The bend fitted again with its end ramps held at zero where they are shorter than
    ``shortest_ramp`` of the arc beside them: noise rounds a plain arc's ends off into short
    ramps, which would be reported as spirals (and failed as too short by a check); the
    arc's ends and radius are then those of a plain arc, not of an arc between ramps."""
    kn = model.knots
    ramps = (kn[1] - kn[0], kn[-1] - kn[-2])
    radii = tuple(abs(1 / k) if k else math.inf for k in (model.plateaus[0], model.plateaus[-1]))
    held = tuple(
        NO_RAMP < ramp < shortest_ramp(radius) for ramp, radius in zip(ramps, radii, strict=True)
    )
    if not any(held):
        return model
    return fit(_held_start(model, held), len(model.plateaus), held)


def _held_start(model: CurvatureModel, held: tuple[bool, bool]) -> NDArray:
    """Start parameters for ``model`` with the held end ramps at zero: the arc next to a
    held ramp takes over half of it (the arc that a spiral of length L replaces begins
    about L / 2 into it)."""
    kn = list(model.knots)
    lengths = list(np.diff(kn))
    start = kn[0]
    if held[0]:
        start += lengths[0] / 2
        lengths[1] += lengths[0] / 2
        lengths[0] = NO_RAMP / 2
    if held[1]:
        lengths[-2] += lengths[-1] / 2
        lengths[-1] = NO_RAMP / 2
    return np.array([model.theta0, start, *lengths, *model.plateaus])


def _has_short_arc(model: CurvatureModel, shortest: float) -> bool:
    """True when an arc of a model of several is shorter than ``shortest`` [m]: too
    short to tell from the smoothing's rounding of a ramp."""
    k = model.knots
    return any(k[2 * j + 2] - k[2 * j + 1] < shortest for j in range(len(model.plateaus)))


def _candidate_pieces(line: Centreline, region: Region, k: int):
    """Piece sets to start a fit of ``k`` plateaus from: the heading diagram's own; the
    guessed ones for 2 and 3; and with one piece fewer than ``k``, the pieces with a
    short flat one put in at each junction in turn (a tangent between two bends that the
    pieces ran over)."""
    yield region.pieces
    if k < 4:
        yield _guessed_pieces(line, region, k)
    pieces = region.pieces
    if len(pieces) == k - 1:
        for j in range(len(pieces) - 1):
            a, b, k1 = pieces[j]
            c, d, k2 = pieces[j + 1]
            gap = max(1, int(round(min(10.0, 0.2 * (d - c) * line.step) / line.step)))
            if b - gap <= a or c + gap >= d:
                continue
            flat = (b - gap, c + gap, 0.01 * min(k1, k2, key=abs))
            yield (*pieces[:j], (a, b - gap, k1), flat, (c + gap, d, k2), *pieces[j + 2 :])


def _guessed_pieces(line: Centreline, region: Region, k: int) -> tuple:
    """Arcs guessed where the heading diagram's pieces were too few: for two, the break
    that best splits the region's headings into two straight lines; for three, a short
    flat middle where the curvature is least in the middle half (two bends whose
    tangent between was blurred away)."""
    a, b = region.first, region.last
    if b - a < 12:
        return ()
    s, h = line.arc[a : b + 1], line.heading[a : b + 1]
    if k == 2:
        j, k1, k2 = _two_lines(s, h)
        return ((a, a + j, k1), (a + j, b, k2))
    count = b - a + 1
    lo, hi = a + count // 4, b - count // 4
    j = lo + int(np.argmin(np.abs(line.curvature[lo : hi + 1])))
    gap = max(1, int(round(min(10.0, 0.1 * count * line.step) / line.step)))
    t1 = float(line.heading[j] - line.heading[a])
    t2 = float(line.heading[b] - line.heading[j])
    if t1 * t2 <= 0 or j - gap <= a or j + gap >= b:
        return ()
    k1 = t1 / max(line.arc[j] - line.arc[a], 1.0)
    k2 = t2 / max(line.arc[b] - line.arc[j], 1.0)
    return ((a, j - gap, k1), (j - gap, j + gap, 0.01 * k1), (j + gap, b, k2))


def _two_lines(s: NDArray, h: NDArray) -> tuple[int, float, float]:
    """The break index b (2 < b < n - 3) whose straight-line fits to (s, h) on [0, b) and
    [b, n) leave the least squared misfit, and the two slopes (cumulative sums)."""
    n = s.size
    c = [np.cumsum(v) for v in (np.ones(n), s, h, s * s, s * h, h * h)]

    def sse(tot):
        m, sx, sy, sxx, sxy, syy = tot
        vx = sxx - sx * sx / m
        cov = sxy - sx * sy / m
        slope = cov / np.where(vx > 0, vx, 1.0)
        return syy - sy * sy / m - slope * cov, slope

    b = np.arange(3, n - 3)
    left = [v[b - 1] for v in c]
    right = [v[-1] - v[b - 1] for v in c]
    e1, k1 = sse(left)
    e2, k2 = sse(right)
    j = int(np.argmin(e1 + e2))
    return int(b[j]), float(k1[j]), float(k2[j])


def _piece_start(
    line: Centreline, region: Region, theta0: float, k: int, pieces: tuple
) -> NDArray | None:
    """Start values with the ``k`` longest ``pieces`` as the arcs (module doc); None when
    there are fewer or their curvatures do not keep the region's sense (a flat middle
    piece may)."""
    pieces = sorted(pieces, key=lambda p: p[1] - p[0], reverse=True)[:k]
    if len(pieces) < k:
        return None
    pieces.sort()
    if any(p[2] * region.sign <= 0 for p in pieces):
        return None
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
        beside = min(abs(plateaus[j - 1]), abs(plateaus[j + 1]))
        if abs(plateaus[j]) < max(flat, FLAT_SHARE * beside):  # a tangent: knots 2j+1 to 2j+2
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
