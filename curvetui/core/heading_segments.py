"""The heading diagram cut into straight pieces: where one curve ends and the next begins.

Plotted against station, the heading of a tangent is flat, of an arc a sloping straight
line (slope 1 / R), of a clothoid a parabola. The headings over a stretch are cut into
pieces, each fitted with its own straight line, by the optimal partition (dynamic
programming over every cut, O(n^2)) that minimises

    sum over pieces of the squared misfit + PIECE_PENALTY c sigma^2 ln n   per piece

(a Bayesian information criterion for two parameters a piece, sigma the headings' noise
sd, c the number of points one noise value spans, as the smoothing correlates them). A
piece is tangent when its slope is within ZERO_SIGMAS standard errors of zero or flatter
than 1 / max_radius; runs of curving pieces of one sense are one bend each (a compound
curve and a clothoid's staircase of pieces stay together); a sense change or a tangent
piece between two runs parts them.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray

PIECE_PENALTY = 3.0  # no source: BIC's 2 ln n, and a margin against correlated noise
ZERO_SIGMAS = 3.0  # no source
MIN_PIECE_POINTS = 3
MAX_POINTS = 600  # points the partition works on at most (a longer stretch is thinned)
HEADING_NOISE_FLOOR = 2e-4  # [rad] (no source: a 5 m chord of a polyline, a millimetre off)


def _sums(s: NDArray, h: NDArray) -> list[NDArray]:
    columns = (np.ones_like(s), s, h, s * s, s * h, h * h)
    return [np.concatenate(([0.0], np.cumsum(v))) for v in columns]


def _fits(c: list[NDArray], a: NDArray | int, b: NDArray | int):
    """Misfit, slope and Sxx of the straight lines through points a .. b - 1."""
    m, sx, sy, sxx, sxy, syy = (v[b] - v[a] for v in c)
    m = np.maximum(m, 1)
    vx = sxx - sx * sx / m
    cov = sxy - sx * sy / m
    safe = np.where(vx > 0, vx, 1.0)
    slope = np.where(vx > 0, cov / safe, 0.0)
    sse = np.maximum(syy - sy * sy / m - slope * cov, 0.0)
    return sse, slope, vx


def partition(s: NDArray, h: NDArray, penalty: float, min_points: int = MIN_PIECE_POINTS):
    """Optimal cut of (s, h) into straight pieces (module doc): list of (first, end) index
    pairs, end exclusive."""
    n = s.size
    if n < 2 * min_points:
        return [(0, n)]
    c = _sums(s, h)
    best = np.full(n + 1, np.inf)
    best[0] = -penalty
    back = np.zeros(n + 1, dtype=int)
    for t in range(min_points, n + 1):
        k = np.arange(0, t - min_points + 1)
        ok = np.isfinite(best[k])
        if not ok.any():
            continue
        k = k[ok]
        sse, _, _ = _fits(c, k, t)
        total = best[k] + sse + penalty
        j = int(np.argmin(total))
        best[t], back[t] = total[j], k[j]
    cuts = []
    t = n
    while t > 0:
        cuts.append((int(back[t]), t))
        t = int(back[t])
    return cuts[::-1]


def bends_in(
    s: NDArray, h: NDArray, noise: float, span: float, max_radius: float
) -> list[tuple[int, int, int, tuple[tuple[int, int, float], ...]]]:
    """The bends along headings ``h`` [rad] at stations ``s`` [m]: (first, last, sense,
    pieces) with index ranges inclusive, sense +1 left, and the bend's curving pieces as
    (first, last, slope [1/m]). ``noise`` the headings' noise sd [rad], ``span`` the
    number of points one noise value spans."""
    n = s.size
    stride = max(1, int(math.ceil(n / MAX_POINTS)))
    idx = np.arange(0, n, stride)
    if idx[-1] != n - 1:
        idx = np.append(idx, n - 1)
    ss, hh = s[idx], h[idx]
    sigma = max(noise, HEADING_NOISE_FLOOR)
    corr = max(1.0, span / stride)
    penalty = PIECE_PENALTY * corr * sigma * sigma * math.log(max(ss.size, 2))
    c = _sums(ss, hh)
    runs: list[list] = []  # [first, last, sense, pieces] in thinned indices
    for a, b in partition(ss, hh, penalty):
        _, slope, vx = _fits(c, a, b)
        slope, vx = float(slope), float(vx)
        se = sigma * math.sqrt(corr / vx) if vx > 0 else math.inf
        if abs(slope) < max(1.0 / max_radius, ZERO_SIGMAS * se):
            continue
        sense = 1 if slope > 0 else -1
        piece = (int(idx[a]), int(idx[b - 1]), slope)
        if runs and runs[-1][2] == sense and runs[-1][1] >= a - 1:
            runs[-1][1] = b - 1
            runs[-1][3].append(piece)
        else:
            runs.append([a, b - 1, sense, [piece]])
    return [(int(idx[a]), int(idx[b]), sense, tuple(p)) for a, b, sense, p in runs]
