"""Curves found along one centreline in a local plane (x east, y north, metres).

``find_curves(x, y, settings)``:

1. the line is cleaned, resampled at ``settings.spacing`` and measured
   (core/centreline.py: headings, curvature, the vertex noise and the smoothing it needs);
2. the runs where it curves one way are found (core/curve_regions.py);
3. each run is fitted with a bend whose curvature is piecewise linear in station
   (core/curve_fit.py): a simple or spiralled curve (tangent, clothoid ramp, arc, ramp,
   tangent), a compound curve (two arcs of the same sense), or two bends the same way
   with a tangent between (the run's ends blurred together), the model with the lowest
   Bayesian information criterion winning (heading misfits are correlated over the
   smoothing, so the number of independent points is the points compared over that
   width);
4. each arc's radius is the geometric circle fit (core/curve_fit.py) to the original
   vertices on it, trimmed by ``ARC_TRIM`` of its length at each end against errors in
   where the arc starts; with fewer than ``MIN_ARC_VERTICES`` vertices (3 on a line
   without noise) the radius is 1 / kappa of the fitted plateau;
5. bends turning less than ``settings.min_deflection`` are dropped and counted; the
   tangent to the previous bend and the relation to it (reverse, broken-back when that
   tangent is shorter than ``settings.short_tangent``) complete each curve.

Stations (``begin``, ``end``) run along the ORIGINAL line from its first vertex. Lengths
(``length``, spirals, ``tangent_before``) are measured along the smoothed line, which is
the original one where the vertices carry no noise; with noise the original polyline is
longer than the road it traces (each step zigzags), so its stations run ahead of the
smoothed lengths.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from curvetui.core.centreline import (
    NOISE_FLOOR,
    Centreline,
    CentrelineError,
    prepare_centreline,
    smooth_like,
)
from curvetui.core.curve_fit import (
    CurvatureModel,
    circle_geometric,
    fit_curvature,
    heading_of_knots,
)
from curvetui.core.curve_regions import Region, find_regions

ARC_TRIM = 0.1  # share of an arc left out at each end of its circle fit (no source)
MAX_COMPARED = 200  # headings compared in a fit at most (evenly spread; they are correlated)
MIN_ARC_VERTICES = 6  # vertices an arc needs for a circle fit on a noisy line (no source)
BIC_MARGIN = 10.0  # a richer model must lower the criterion by this much (no source)
# 600 ft: MUTCD 2009, 2C.07 (read, secondary: REFERENCES.md, "Curve-direction signs for two
# changes of direction separated by less than 600 ft of tangent"); TxDOT's broken-back
# tangent of 15 V (ft, mph) gives the same at 40 mph (read).
SHORT_TANGENT = 600 * 0.3048


@dataclass(frozen=True)
class FinderSettings:
    """What the finder looks for; lengths [m], angles [rad].

    spacing: resampling step along the line.
    min_deflection: bends turning less are dropped and counted; 6 degrees: REFERENCES.md,
        "Curves with deflection under 6 degrees are not reliably measured" (read, TxDOT
        GPS method).
    short_tangent: two consecutive curves with less tangent between them are a reverse
        pair (opposite senses) or broken-back (same sense); 600 ft (182.88 m), see
        SHORT_TANGENT; an authority's own figure (e.g. TxDOT's 15 V) replaces it.
    max_radius: curvature flatter than 1 / max_radius is tangent (common practice, no
        source: highway curves rarely exceed 10 km radius).
    min_spiral: a curvature ramp shorter than this is reported as no spiral (no source:
        below the resolution of headings measured over a few metres).
    compound_ratio: the larger radius of two arcs must exceed the smaller by this factor
        to be reported as a compound curve (no source; TxDOT's limit on the ratio, 1.5,
        is a design rule, not a detection threshold).
    """

    spacing: float = 1.0
    min_deflection: float = math.radians(6.0)
    short_tangent: float = SHORT_TANGENT
    max_radius: float = 10_000.0
    min_spiral: float = 3.0
    compound_ratio: float = 1.1


@dataclass(frozen=True)
class FoundCurve:
    """One curve found; stations and lengths [m], angles [rad] (module doc)."""

    begin: float
    end: float
    radius: float
    radii: tuple[float, ...]
    deflection: float
    direction: str
    length: float
    spiral_in: float
    spiral_out: float
    shape: str
    fit_rms: float
    relation: str = ""
    tangent_before: float | None = None


@dataclass(frozen=True)
class FinderResult:
    """The curves in order along the line, how many fell below the minimum deflection, the
    line's length [m] and notes."""

    curves: tuple[FoundCurve, ...]
    dropped: int
    line_length: float
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class _Bend:
    """A fitted bend before its radius and relations: knots along the smoothed line."""

    knots: tuple[float, ...]
    plateaus: tuple[float, ...]
    turn: float


def find_curves(x: ArrayLike, y: ArrayLike, settings: FinderSettings = FinderSettings()):
    """The curves along the line through vertices (x, y) [m] (module doc); a line that
    cannot be searched gives no curves and a note saying why, never an exception."""
    try:
        line = prepare_centreline(x, y, settings.spacing)
    except CentrelineError as err:
        length = _safe_length(x, y)
        return FinderResult((), 0, length, (str(err),))
    notes: list[str] = []
    if line.dropped_repeats:
        notes.append(f"{line.dropped_repeats} repeated vertices dropped")
    if line.noise > NOISE_FLOOR:
        notes.append(
            f"vertex noise about {line.noise:.2f} m: headings smoothed over {line.smoothing:.1f} m"
        )
    if line.vertex_x.size == 2:
        notes.append("two points: a straight line, no curve")
        return FinderResult((), 0, line.length, tuple(notes))
    detection = find_regions(line, settings.max_radius)
    bends: list[_Bend] = []
    regions = detection.regions
    for i, region in enumerate(regions):
        before = regions[i - 1] if i > 0 else None
        after = regions[i + 1] if i + 1 < len(regions) else None
        bends.extend(_fit_region(line, region, before, after, detection.width))
    curves: list[FoundCurve] = []
    dropped = 0
    previous_end: float | None = None
    previous_sense = 0
    for bend in bends:
        if abs(bend.turn) < settings.min_deflection:
            dropped += 1
            continue
        curve = _curve_of(line, bend, settings)
        tangent = None if previous_end is None else max(0.0, bend.knots[0] - previous_end)
        relation = ""
        sense = 1 if bend.turn > 0 else -1
        if tangent is not None and tangent < settings.short_tangent:
            relation = "reverse" if sense != previous_sense else "broken-back"
        curves.append(_with(curve, relation, tangent))
        previous_end = max(bend.knots[-1], bend.knots[0])
        previous_sense = sense
    if dropped:
        notes.append(
            f"{dropped} curve(s) turning less than "
            f"{math.degrees(settings.min_deflection):g} degrees dropped"
        )
    return FinderResult(tuple(curves), dropped, line.length, tuple(notes))


def _safe_length(x: ArrayLike, y: ArrayLike) -> float:
    try:
        xa = np.asarray(x, dtype=float).ravel()
        ya = np.asarray(y, dtype=float).ravel()
        total = float(np.nansum(np.hypot(np.diff(xa), np.diff(ya))))
        return total if math.isfinite(total) else 0.0
    except (ValueError, TypeError):
        return 0.0


def _with(curve: FoundCurve, relation: str, tangent: float | None) -> FoundCurve:
    from dataclasses import replace

    return replace(curve, relation=relation, tangent_before=tangent)


# --- fitting one region -------------------------------------------------------------------


def _fit_region(
    line: Centreline, region: Region, before: Region | None, after: Region | None, width: float
) -> list[_Bend]:
    """The bend (or two) best fitting the headings over the region and the tangents beside
    it (up to the neighbouring regions)."""
    n = line.arc.size
    step = line.step
    margin = int(math.ceil(max(40.0, 2 * width, 0.5 * (region.last - region.first) * step) / step))
    lo = max(region.first - margin, before.last + 1 if before else 0)
    hi = min(region.last + margin, after.first - 1 if after else n - 1)
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

    first, last = line.arc[region.first], line.arc[region.last]
    turn = float(line.heading[region.last] - line.heading[region.first])
    if abs(turn) < 1e-9:
        return []
    span = max(last - first, step)
    bounds = (line.arc[lo] - span, line.arc[hi])
    sub = slice(region.first, region.last + 1)
    weight = np.abs(line.curvature[sub])
    centre = float(np.sum(line.arc[sub] * weight) / max(np.sum(weight), 1e-300))
    theta0 = float(line.heading[lo])
    candidates: list[tuple[float, list[_Bend]]] = []
    n_eff = max(2.0, (hi - lo + 1) / (2 * line.half + 1 + 2 * line.smoothing / step))

    def criterion(model: CurvatureModel, k: int) -> float:
        mean_sq = max(2 * model.cost / max(model.points, 1), 1e-30)
        return n_eff * math.log(mean_sq) + k * math.log(n_eff)

    singles = []
    for middle, le in ((centre, span * 0.6), ((first + last) / 2, span)):
        for share in (0.0, 0.3):
            lc = le * (1 - share)
            ls = max(le * share, 0.5)
            kappa = turn / (lc + ls)
            start = np.array([theta0, middle - lc / 2 - ls, ls, lc, ls, kappa])
            singles.append(fit_curvature(s, heading, start, smoother, inside, (True,), bounds))
    single = min(singles, key=lambda m: m.cost)
    candidates.append((criterion(single, 6), [_bend(single)]))

    for start in _compound_starts(line, single, region):
        model = fit_curvature(s, heading, start, smoother, inside, (True, True), bounds)
        if _ratio(model.plateaus) >= 1.0:
            candidates.append((criterion(model, 9), [_bend(model)]))

    min_tangent = 2 * (line.half * step + line.smoothing)
    split = _split_start(line, region, single, turn)
    if split is not None:
        model = fit_curvature(s, heading, split, smoother, inside, (True, False, True), bounds)
        kn = model.knots
        outer = (model.plateaus[0], model.plateaus[2])
        if kn[4] - kn[3] >= min_tangent and all(abs(k) > 0 for k in outer):
            parts = [
                _Bend(kn[:4], (model.plateaus[0],), _turn(kn[:4], model.plateaus[0])),
                _Bend(kn[4:], (model.plateaus[2],), _turn(kn[4:], model.plateaus[2])),
            ]
            candidates.append((criterion(model, 10), parts))

    best_value, best = candidates[0]
    for value, bends in candidates[1:]:
        if value < best_value - BIC_MARGIN:
            best_value, best = value, bends
    return [_within(b, float(line.arc[0]), float(line.arc[-1])) for b in best]


def _within(bend: _Bend, first: float, last: float) -> _Bend:
    """The bend cut to the line (a line that starts or ends inside a curve): knots clipped
    and the turn the part on the line makes."""
    knots = np.asarray(bend.knots)
    values = np.concatenate(([0.0], np.repeat(bend.plateaus, 2), [0.0]))
    a, b = max(knots[0], first), min(knots[-1], last)
    ends = heading_of_knots(np.array([a, b]), knots, values, 0.0)
    clipped = tuple(float(k) for k in np.clip(knots, first, last))
    return _Bend(clipped, bend.plateaus, float(ends[1] - ends[0]))


def _ratio(plateaus: tuple[float, ...]) -> float:
    a, b = abs(plateaus[0]), abs(plateaus[-1])
    return max(a, b) / min(a, b) if min(a, b) > 0 else math.inf


def _turn(knots: tuple[float, ...], kappa: float) -> float:
    """Heading change of one bend TS, SC, CS, ST with plateau ``kappa``."""
    ts, sc, cs, st = knots
    return kappa * ((sc - ts) / 2 + (cs - sc) + (st - cs) / 2)


def _bend(model: CurvatureModel) -> _Bend:
    return _Bend(model.knots, model.plateaus, model.turn)


def _compound_starts(line: Centreline, single: CurvatureModel, region: Region) -> list[NDArray]:
    """Start values for a compound curve: the arc of the single fit halved, and the arcs
    either side of the break that best splits the headings over the region into two
    straight pieces (least squares, every break tried through cumulative sums)."""
    ts, sc, cs, st = single.knots
    kap = single.plateaus[0]
    lc = max(cs - sc, 2 * line.step)
    starts = [
        np.array([single.theta0, ts, sc - ts + 0.5, lc / 2, 0.5, lc / 2, st - cs + 0.5,
                  kap * f, kap * (2 - f)])
        for f in (1.3, 0.7)
    ]  # fmt: skip
    if region.last - region.first >= 8:
        s = line.arc[region.first : region.last + 1]
        h = line.heading[region.first : region.last + 1]
        b, k1, k2 = _two_lines(s, h)
        if k1 * kap > 0 and k2 * kap > 0:
            theta0 = float(line.heading[region.first])
            starts.append(
                np.array([theta0, s[0], 0.5, s[b] - s[0], 0.5, s[-1] - s[b], 0.5, k1, k2])
            )
    return starts


def _two_lines(s: NDArray, h: NDArray) -> tuple[int, float, float]:
    """The break index b (2 < b < n - 2) whose straight-line fits to (s, h) on [0, b] and
    [b, n) leave the least squared misfit, and the two slopes."""
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


def _split_start(line: Centreline, region: Region, single: CurvatureModel, turn: float):
    """Start values for two bends the same way with a tangent between, split where the
    curvature is least in the middle half of the region; None for a short region."""
    count = region.last - region.first + 1
    if count * line.step < 40.0:
        return None
    a = region.first + count // 4
    b = region.last - count // 4
    j = a + int(np.argmin(np.abs(line.curvature[a : b + 1])))
    ts, st = single.knots[0], single.knots[-1]
    mid = float(line.arc[j])
    if not ts + 5 < mid < st - 5:
        return None
    t1 = float(line.heading[j] - line.heading[region.first])
    t2 = turn - t1
    if t1 * turn <= 0 or t2 * turn <= 0:
        return None
    l1, l2 = mid - ts, st - mid
    gap = min(10.0, 0.2 * min(l1, l2))
    k1 = t1 / max(l1 - gap / 2, 1.0)
    k2 = t2 / max(l2 - gap / 2, 1.0)
    r1 = max(l1 - gap / 2 - 1.0, 1.0)
    r2 = max(l2 - gap / 2 - 1.0, 1.0)
    return np.array([single.theta0, ts, 0.5, r1, 0.5, gap, 0.5, r2, 0.5, k1, k2])


# --- one bend to a found curve ------------------------------------------------------------


def _curve_of(line: Centreline, bend: _Bend, settings: FinderSettings) -> FoundCurve:
    kn = np.asarray(bend.knots)
    radii = []
    for j, kappa in enumerate(bend.plateaus):
        radii.append(_arc_radius(line, kn[2 * j + 1], kn[2 * j + 2], kappa))
    spiral_in = float(kn[1] - kn[0])
    spiral_out = float(kn[-1] - kn[-2])
    shortest = _shortest_spiral(line, settings)
    if spiral_in < shortest:
        spiral_in = 0.0
    if spiral_out < shortest:
        spiral_out = 0.0
    if len(radii) > 1:
        shape = "compound"
    elif spiral_in > 0 or spiral_out > 0:
        shape = "spiralled"
    else:
        shape = "simple"
    begin, end = (float(v) for v in line.to_station([kn[0], kn[-1]]))
    return FoundCurve(
        begin=begin,
        end=end,
        radius=min(radii),
        radii=tuple(radii),
        deflection=abs(bend.turn),
        direction="left" if bend.turn > 0 else "right",
        length=float(kn[-1] - kn[0]),
        spiral_in=spiral_in,
        spiral_out=spiral_out,
        shape=shape,
        fit_rms=_shape_rms(line, bend, kn[0], kn[-1]),
    )


def _shortest_spiral(line: Centreline, settings: FinderSettings) -> float:
    """The shortest ramp reported as a spiral [m]: ``settings.min_spiral``, and no less
    than one and a half vertex spacings (the corners of a polyline round a curve's start
    off over about one spacing) or the smoothing width (noise blurs the ramp as much)."""
    spacing = float(np.median(np.diff(line.vertex_station)))
    return max(settings.min_spiral, 1.5 * spacing, line.smoothing)


def _arc_radius(line: Centreline, a: float, b: float, kappa: float) -> float:
    """Radius [m] of the arc from ``a`` to ``b`` along the smoothed line (module doc, 4)."""
    fallback = 1.0 / abs(kappa) if kappa else math.inf
    trim = ARC_TRIM * (b - a)
    sa, sb = line.to_station([a + trim, b - trim])
    inside = (line.vertex_station >= sa) & (line.vertex_station <= sb)
    need = 3 if line.noise <= NOISE_FLOOR else MIN_ARC_VERTICES
    if inside.sum() < need:
        return fallback
    circle = circle_geometric(line.vertex_x[inside], line.vertex_y[inside])
    return circle.radius if math.isfinite(circle.radius) else fallback


def _shape_rms(line: Centreline, bend: _Bend, a: float, b: float) -> float:
    """RMS distance [m] of the resampled points from ``a`` to ``b`` from the fitted bend
    laid on them (rotation and shift by least squares, points matched by length)."""
    pick = (line.arc >= a) & (line.arc <= b)
    if pick.sum() < 3:
        return 0.0
    s = line.arc[pick]
    knots = np.asarray(bend.knots)
    values = np.concatenate(([0.0], np.repeat(bend.plateaus, 2), [0.0]))
    fine = np.linspace(s[0], s[-1], max(2, int((s[-1] - s[0]) / (0.1 * line.step)) + 1))
    theta = heading_of_knots(fine, knots, values, 0.0)
    dt = np.diff(fine)
    mx = np.concatenate(([0.0], np.cumsum(dt * np.cos((theta[1:] + theta[:-1]) / 2))))
    my = np.concatenate(([0.0], np.cumsum(dt * np.sin((theta[1:] + theta[:-1]) / 2))))
    model = np.column_stack((np.interp(s, fine, mx), np.interp(s, fine, my)))
    data = np.column_stack((line.raw_x[pick], line.raw_y[pick]))
    rot, shift = _rigid_fit(model, data)
    dense = np.column_stack((mx, my)) @ rot.T + shift
    from scipy.spatial import cKDTree

    _, j = cKDTree(dense).query(data)
    dist = np.minimum(
        _to_segment(data, dense[np.maximum(j - 1, 0)], dense[j]),
        _to_segment(data, dense[j], dense[np.minimum(j + 1, len(dense) - 1)]),
    )
    return float(np.sqrt(np.mean(dist * dist)))


def _to_segment(p: NDArray, a: NDArray, b: NDArray) -> NDArray:
    """Distance [m] of points ``p`` from the segments ``a`` to ``b`` (row by row)."""
    ab = b - a
    den = np.maximum(np.sum(ab * ab, axis=1), 1e-300)
    u = np.clip(np.sum((p - a) * ab, axis=1) / den, 0.0, 1.0)
    return np.hypot(*(p - a - u[:, None] * ab).T)


def _rigid_fit(p: NDArray, q: NDArray) -> tuple[NDArray, NDArray]:
    """Rotation and shift taking points ``p`` nearest to ``q`` (Kabsch: the SVD of the
    cross-covariance, no reflection)."""
    pc, qc = p.mean(axis=0), q.mean(axis=0)
    u, _, vt = np.linalg.svd((p - pc).T @ (q - qc))
    d = np.sign(np.linalg.det(vt.T @ u.T)) or 1.0
    rot = vt.T @ np.diag([1.0, d]) @ u.T
    return rot, qc - pc @ rot.T
