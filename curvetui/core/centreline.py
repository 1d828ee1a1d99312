"""A centreline (polyline) in a local plane: cleaned, resampled evenly, smoothed, with its
headings and curvature.

Coordinates are x east, y north [m]. Headings are measured counter-clockwise from east
(atan2(dy, dx)) and unwrapped along the line, so a left turn raises the heading and has a
positive curvature kappa = d(heading)/ds [1/m].

Steps (``prepare_centreline``):

1. Vertices with a coordinate that is not a number refuse the line; repeated vertices
   (a step under ``REPEAT_TOL``) are dropped.
2. The noise of the vertices is estimated from the offset d of each vertex from the chord
   of its two neighbours: for independent errors of standard deviation sigma on equally
   spaced vertices, var(d) = 1.5 sigma^2, so sigma = median|d| / (0.6745 sqrt 1.5) (the
   median of |N(0, s)| is 0.6745 s). On a curve of radius R the offset adds about
   a b / (2 R) for neighbours a and b away; the median over a line of tangents and
   moderate curves keeps that small.
3. The line is resampled at an even step along its own length (linear between vertices).
4. With noise, the resampled points are smoothed with a Gaussian kernel of standard
   deviation ``NOISE_TO_SMOOTHING`` sigma [m] (at least none): the heading of a noisy
   line changes by about sigma sqrt 2 / h over each step h, which would swamp the
   curvature of a 2000 m radius; averaging over a width grown with the noise keeps it
   down, and the same smoothing is applied to every model compared with these headings
   (``smooth_like``), so it does not bias a fit. The ends are padded by point reflection
   (2 P0 - P_k), which keeps a straight end straight.
5. The heading at each point is the bearing of the chord between the points ``half``
   steps either side: on a circle a chord is parallel to the tangent at its middle, so
   the chord's bearing is exact there; elsewhere it is the mean heading over the chord to
   first order.
6. The curvature is the heading's change across the same chord, divided by its length
   along the smoothed line.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

REPEAT_TOL = 1e-9  # [m] a step shorter than this repeats the vertex before it
# Gaussian smoothing width per metre of vertex noise (tuned on the accuracy benchmark,
# benchmarks/curve_finder_accuracy.py; no source)
NOISE_TO_SMOOTHING = 16.0
NOISE_FLOOR = 0.02  # [m] noise below this is not smoothed (survey and digitising precision)
MAD_TO_SIGMA = 1.0 / (0.6744897501960817 * math.sqrt(1.5))


class CentrelineError(ValueError):
    """A line that cannot be searched (the message says why)."""


@dataclass(frozen=True)
class Centreline:
    """One line, cleaned and resampled; lengths [m], headings [rad], curvature [1/m].

    ``vertex_x``, ``vertex_y``, ``vertex_station``: the vertices kept (repeats dropped) and
    their stations along the original line from its first vertex. ``station``: the
    original-line station of each resampled point; ``raw_x``, ``raw_y`` the resampled
    points, ``x``, ``y`` the same smoothed (with noise); ``arc`` the length along the
    smoothed line; ``heading`` and ``curvature`` at each point. ``noise`` the vertex
    noise estimate, ``smoothing`` the Gaussian width used [m], ``half`` the chord's
    half-width in steps.
    """

    vertex_x: NDArray[np.float64]
    vertex_y: NDArray[np.float64]
    vertex_station: NDArray[np.float64]
    station: NDArray[np.float64]
    x: NDArray[np.float64]
    y: NDArray[np.float64]
    arc: NDArray[np.float64]
    heading: NDArray[np.float64]
    curvature: NDArray[np.float64]
    raw_x: NDArray[np.float64]
    raw_y: NDArray[np.float64]
    step: float
    noise: float
    smoothing: float
    half: int
    dropped_repeats: int

    @property
    def length(self) -> float:
        """Length of the original line [m]."""
        return float(self.vertex_station[-1])

    def to_station(self, arc: ArrayLike) -> NDArray[np.float64]:
        """Original-line stations of points given by their length along the smoothed line."""
        return np.interp(arc, self.arc, self.station)

    def to_arc(self, station: ArrayLike) -> NDArray[np.float64]:
        """Lengths along the smoothed line of original-line stations."""
        return np.interp(station, self.station, self.arc)


def clean_vertices(x: ArrayLike, y: ArrayLike) -> tuple[NDArray, NDArray, int]:
    """The vertices as float arrays without repeats, and how many repeats were dropped.

    Raises CentrelineError for coordinates that are not numbers, arrays of different
    lengths, or fewer than two distinct points.
    """
    xa = np.asarray(x, dtype=float).ravel()
    ya = np.asarray(y, dtype=float).ravel()
    if xa.size != ya.size:
        raise CentrelineError(f"{xa.size} x but {ya.size} y coordinates: nothing to search")
    bad = ~(np.isfinite(xa) & np.isfinite(ya))
    if bad.any():
        first = int(np.argmax(bad))
        raise CentrelineError(
            f"vertex {first + 1} (of {xa.size}) has a coordinate that is not a number: "
            "nothing to search"
        )
    if xa.size < 2:
        raise CentrelineError("fewer than two distinct points: nothing to search")
    steps = np.hypot(np.diff(xa), np.diff(ya))
    keep = np.concatenate(([True], steps > REPEAT_TOL))
    xa, ya = xa[keep], ya[keep]
    if xa.size < 2:
        raise CentrelineError("fewer than two distinct points (zero length): nothing to search")
    return xa, ya, int((~keep).sum())


def vertex_noise(x: NDArray, y: NDArray) -> float:
    """Estimated standard deviation [m] of the vertices' position errors (module doc, 2);
    0 for fewer than three vertices."""
    if x.size < 3:
        return 0.0
    ax, ay = x[:-2], y[:-2]
    cx, cy = x[2:] - ax, y[2:] - ay
    chord = np.hypot(cx, cy)
    ok = chord > REPEAT_TOL
    if not ok.any():
        return 0.0
    d = np.abs(cx * (y[1:-1] - ay) - cy * (x[1:-1] - ax))[ok] / chord[ok]
    return float(np.median(d) * MAD_TO_SIGMA)


def resample(x: NDArray, y: NDArray, stations: NDArray, step: float) -> tuple[NDArray, ...]:
    """Stations and points at an even step (the nearest to ``step`` [m] that divides the
    line's length), linear between vertices; at least two points."""
    length = float(stations[-1])
    n = max(2, int(math.ceil(length / step - 1e-9)) + 1)
    s = np.linspace(0.0, length, n)
    return s, np.interp(s, stations, x), np.interp(s, stations, y)


def smooth_points(v: NDArray, width: float) -> NDArray:
    """``v`` smoothed by a Gaussian of standard deviation ``width`` [steps], the ends padded
    by point reflection (2 v0 - v_k), so that a straight end stays straight."""
    if width <= 0 or v.size < 3:
        return v.copy()
    from scipy.ndimage import gaussian_filter1d

    pad = min(v.size - 1, int(math.ceil(4 * width)))
    head = 2 * v[0] - v[pad:0:-1]
    tail = 2 * v[-1] - v[-2 : -pad - 2 : -1]
    out = gaussian_filter1d(np.concatenate((head, v, tail)), width, mode="nearest")
    return out[pad : pad + v.size]


def chord_headings(x: NDArray, y: NDArray, half: int) -> NDArray:
    """Unwrapped heading [rad, counter-clockwise from east] of the chord from ``half``
    points before each point to ``half`` after (shortened at the ends)."""
    n = x.size
    i = np.arange(n)
    lo = np.clip(i - half, 0, n - 1)
    hi = np.clip(i + half, 0, n - 1)
    return np.unwrap(np.arctan2(y[hi] - y[lo], x[hi] - x[lo]))


def curvature_of(arc: NDArray, heading: NDArray, half: int) -> NDArray:
    """Heading change across ``half`` points either side over the length between them
    [1/m] (shortened at the ends)."""
    n = arc.size
    i = np.arange(n)
    lo = np.clip(i - half, 0, n - 1)
    hi = np.clip(i + half, 0, n - 1)
    return (heading[hi] - heading[lo]) / np.maximum(arc[hi] - arc[lo], REPEAT_TOL)


def smoothing_for(noise: float) -> float:
    """Gaussian smoothing width [m] for vertex noise ``noise`` [m] (module doc, 4)."""
    return NOISE_TO_SMOOTHING * noise if noise > NOISE_FLOOR else 0.0


def prepare_centreline(x: ArrayLike, y: ArrayLike, step: float) -> Centreline:
    """Clean, resample at ``step`` [m], smooth and measure a line (module doc)."""
    if not (math.isfinite(step) and step > 0):
        raise CentrelineError(f"the resampling step must be a positive length, got {step}")
    vx, vy, repeats = clean_vertices(x, y)
    vs = np.concatenate(([0.0], np.cumsum(np.hypot(np.diff(vx), np.diff(vy)))))
    s, rx, ry = resample(vx, vy, vs, step)
    h = float(s[1] - s[0])
    noise = vertex_noise(vx, vy)
    width = smoothing_for(noise)
    px = smooth_points(rx, width / h)
    py = smooth_points(ry, width / h)
    arc = np.concatenate(([0.0], np.cumsum(np.hypot(np.diff(px), np.diff(py)))))
    spacing = float(np.median(np.diff(vs))) if vs.size > 1 else h
    half = chord_half(max(width, spacing), h)
    heading = chord_headings(px, py, half)
    kappa = curvature_of(arc, heading, half)
    return Centreline(
        vx, vy, vs, s, px, py, arc, heading, kappa, rx, ry, h, noise, width, half, repeats
    )


def chord_half(width: float, step: float) -> int:
    """Half-width [steps] of the chord for headings: at least one step and 2 m, and
    ``width`` [m] (the smoothing width or the vertex spacing, whichever is larger: a
    chord shorter than the vertex spacing would see the corners of the polyline)."""
    return max(1, int(round(max(width, 2.0) / step)))


def smooth_like(line: Centreline, values: NDArray, stride: int = 1) -> NDArray:
    """Model headings at every ``stride``-th resampled point passed through the smoothing
    the line's headings had: the Gaussian on the points (to first order, on the heading
    itself) and the chord's mean over ``half`` points either side."""
    from scipy.ndimage import uniform_filter1d

    out = smooth_points(values, line.smoothing / (line.step * stride))
    size = 2 * int(round(line.half / stride)) + 1
    return uniform_filter1d(out, size, mode="nearest") if size > 1 else out
