"""Curves found along one centreline in a local plane (x east, y north, metres).

``find_curves(x, y, settings)``:

1. the line is cleaned, resampled at ``settings.spacing`` and measured
   (core/centreline.py: headings, curvature, the vertex noise and the smoothing it needs);
2. the runs where it curves clear of the noise are found (core/curve_regions.py), and
   each run's stretch is cut where its heading diagram has a tangent or a change of
   sense (core/heading_segments.py);
3. each bend is fitted with curvature piecewise linear in station (core/bend_fit.py,
   core/curve_fit.py): tangent, clothoid ramp, one to four arcs with ramps between,
   ramp, tangent; the fit with the lowest Bayesian information criterion wins (one arc:
   simple or spiralled; more: compound), and an inner arc that comes out flat parts the
   bend in two (broken-back pairs whose tangent the smoothing blurred);
4. each arc's radius is the geometric circle fit (core/curve_fit.py) to the original
   vertices on it, trimmed by ``ARC_TRIM`` of its length at each end against errors in
   where the arc starts; with fewer than ``MIN_ARC_VERTICES`` vertices (3 on a line
   without noise), or an arc so short for the noise that the circle fit's radius would
   scatter by more than ``CIRCLE_FIT_MAX_SD``, the radius is 1 / kappa of the fitted
   plateau;
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
from functools import partial

import numpy as np
from numpy.typing import ArrayLike, NDArray

from curvetui.core.bend_fit import HEADING_RESOLUTION, FittedBend, fit_region, heading_noise
from curvetui.core.centreline import (
    NOISE_FLOOR,
    Centreline,
    CentrelineError,
    prepare_centreline,
)
from curvetui.core.curve_fit import circle_geometric, heading_of_knots
from curvetui.core.curve_regions import Detection, Region, find_regions
from curvetui.core.heading_segments import bends_in

ARC_TRIM = 0.1  # share of an arc left out at each end of its circle fit (no source)
MIN_ARC_VERTICES = 6  # vertices an arc needs for a circle fit on a noisy line (no source)
# a ramp is a spiral only when its heading departs from a plain arc's by this many sd of
# the headings' noise averaged over it (_shortest_spiral; no source)
RAMP_SIGMAS = 1.5
# a circle fit whose radius would scatter more than this (relative sd) on the line's noise
# gives way to the curvature of the fitted bend, which the spirals and tangents steady
CIRCLE_FIT_MAX_SD = 0.03
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
        below the resolution of headings measured over a few metres); the finder raises
        it where the vertex spacing, the noise or a large radius hide shorter ramps
        (``_shortest_spiral``).

    A value out of range raises ValueError naming the setting and its range.
    """

    spacing: float = 1.0
    min_deflection: float = math.radians(6.0)
    short_tangent: float = SHORT_TANGENT
    max_radius: float = 10_000.0
    min_spiral: float = 3.0

    def __post_init__(self) -> None:
        for name, low, high, open_low in (
            ("spacing", 0.0, 1000.0, True),
            ("min_deflection", 0.0, math.pi, False),
            ("short_tangent", 0.0, math.inf, False),
            ("max_radius", 0.0, math.inf, True),
            ("min_spiral", 0.0, math.inf, False),
        ):
            value = getattr(self, name)
            ok = isinstance(value, int | float) and not math.isnan(value)
            ok = ok and (value > low if open_low else value >= low) and value <= high
            if name == "max_radius":
                ok = ok and math.isfinite(value)
            if not ok:
                edge = "more than" if open_low else "at least"
                top = f" and at most {high:g}" if math.isfinite(high) else ", finite"
                raise ValueError(f"{name} must be {edge} {low:g}{top}; got {value!r}")


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


def find_curves(
    x: ArrayLike, y: ArrayLike, settings: FinderSettings = FinderSettings()
) -> FinderResult:
    """The curves along the line through vertices (x, y) [m] (module doc); a line that
    cannot be searched gives no curves and a note saying why, never an exception. A bend
    dropped below the minimum deflection counts as tangent for the next curve's
    ``tangent_before`` and relation."""
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
    noise = heading_noise(line)
    regions = _split_regions(line, detection, noise, settings.max_radius)
    bends: list[FittedBend] = []
    shortest = partial(_shortest_spiral, line, settings, noise=noise)
    for i, region in enumerate(regions):
        lo, hi = _window(line, region, regions, i, detection.width)
        bends.extend(fit_region(line, region, lo, hi, settings.max_radius, noise, shortest))
    curves: list[FoundCurve] = []
    dropped = 0
    previous_end: float | None = None
    previous_sense = 0
    for bend in bends:
        if abs(bend.turn) < settings.min_deflection:
            dropped += 1
            continue
        curve = _curve_of(line, bend, settings, noise)
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


def _split_regions(
    line: Centreline, detection: Detection, noise: float, max_radius: float
) -> list[Region]:
    """Each region's stretch (up to its neighbours) cut into bends where its heading
    diagram has a tangent or a change of sense (core/heading_segments.py); a region with
    no bend left in it was noise. ``noise`` the headings' noise sd [rad]."""
    regions, width = detection.regions, detection.width
    span = 2 * line.half + 1 + 2 * line.smoothing / line.step
    out: list[Region] = []
    n = line.arc.size
    for i, region in enumerate(regions):
        lo, hi = _window(line, region, regions, i, width)
        if hi - lo < 6:
            out.append(region)
            continue
        for a, b, sense, pieces in bends_in(
            line.arc[lo : hi + 1], line.heading[lo : hi + 1], noise, span, max_radius
        ):
            first, last = lo + a, lo + b
            if out and first <= out[-1].last:  # windows overlap: keep the earlier claim
                first = out[-1].last + 1
            moved = tuple((lo + p, lo + q, k) for p, q, k in pieces if lo + q > first)
            if last - first >= 1 and last < n and moved:
                out.append(Region(first, last, sense, moved))
    return out


def _window(line: Centreline, region: Region, regions, i: int, width: float) -> tuple[int, int]:
    """The stretch around a region searched for its bends: a margin of tangent each side,
    up to the neighbouring regions."""
    step = line.step
    margin = int(math.ceil(max(40.0, 2 * width, 0.5 * (region.last - region.first) * step) / step))
    before = regions[i - 1] if i > 0 else None
    after = regions[i + 1] if i + 1 < len(regions) else None
    lo = max(region.first - margin, before.last + 1 if before else 0)
    hi = min(region.last + margin, after.first - 1 if after else line.arc.size - 1)
    return lo, hi


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


# --- one bend to a found curve ------------------------------------------------------------


def _curve_of(
    line: Centreline, bend: FittedBend, settings: FinderSettings, noise: float
) -> FoundCurve:
    kn = np.asarray(bend.knots)
    radii = []
    for j, kappa in enumerate(bend.plateaus):
        radii.append(_arc_radius(line, kn[2 * j + 1], kn[2 * j + 2], kappa))
    spiral_in = float(kn[1] - kn[0])
    spiral_out = float(kn[-1] - kn[-2])
    if spiral_in < _shortest_spiral(line, settings, radii[0], noise):
        spiral_in = 0.0
    if spiral_out < _shortest_spiral(line, settings, radii[-1], noise):
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


def _shortest_spiral(
    line: Centreline, settings: FinderSettings, radius: float, noise: float
) -> float:
    """The shortest ramp reported as a spiral [m] on an arc of ``radius`` [m]:
    ``settings.min_spiral``, and no less than one and a half vertex spacings (the
    corners of a polyline round a curve's start off over about one spacing), the
    smoothing width (noise blurs the ramp as much), or the ramp whose heading departs from
    a plain arc's by the headings' resolution: a ramp of length L moves the heading by up
    to about L / (8 R) (derived: the clothoid's heading against the arc's, shifted by
    L / 2), so L = 8 R HEADING_RESOLUTION; nor than the ramp whose departure stands
    RAMP_SIGMAS sd clear of the headings' noise ``noise`` [rad] averaged over the ramp
    (L / w independent headings, w the width one noise value spans: the chord and the
    smoothing): L / (8 R) = c noise sqrt(w / L), so L = (8 c R noise sqrt w)^(2/3)."""
    spacing = float(np.median(np.diff(line.vertex_station)))
    if not math.isfinite(radius):
        return max(settings.min_spiral, 1.5 * spacing, line.smoothing)
    seen = 8 * radius * HEADING_RESOLUTION
    width = (2 * line.half + 1) * line.step + 2 * line.smoothing
    clear = (8 * RAMP_SIGMAS * radius * noise * math.sqrt(width)) ** (2 / 3)
    return max(settings.min_spiral, 1.5 * spacing, line.smoothing, seen, clear)


def _arc_radius(line: Centreline, a: float, b: float, kappa: float) -> float:
    """Radius [m] of the arc from ``a`` to ``b`` along the smoothed line (module doc, 4)."""
    fallback = 1.0 / abs(kappa) if kappa else math.inf
    trim = ARC_TRIM * (b - a)
    sa, sb = line.to_station([a + trim, b - trim])
    inside = (line.vertex_station >= sa) & (line.vertex_station <= sb)
    count = int(inside.sum())
    need = 3 if line.noise <= NOISE_FLOOR else MIN_ARC_VERTICES
    if count < need:
        return fallback
    if line.noise > NOISE_FLOOR and math.isfinite(fallback):
        # sagitta a = 1/(2R) of a parabola fitted to n points spread evenly over a chord L
        # has sd sigma sqrt(180 / n) / L^2, so the radius's relative sd is 2 R that
        # (least-squares variance of the quadratic term; derived)
        chord = max(float(sb - sa), 1e-9)
        relative = 2 * fallback * line.noise * math.sqrt(180.0 / count) / chord**2
        if relative > CIRCLE_FIT_MAX_SD:
            return fallback
    circle = circle_geometric(line.vertex_x[inside], line.vertex_y[inside])
    return circle.radius if math.isfinite(circle.radius) else fallback


def _shape_rms(line: Centreline, bend: FittedBend, a: float, b: float) -> float:
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
