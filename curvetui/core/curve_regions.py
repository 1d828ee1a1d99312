"""Where a centreline curves: runs of points whose smoothed curvature stands clear of the
noise, one sign each.

The curvature of a noisy line is smoothed again with a Gaussian of width ``W`` [m] for
finding the curves only (the fits use the headings, not this). With vertex noise sigma
[m], the curvature that remains on a straight line after the smoothing of
core/centreline.py and this one was measured (benchmarks/curve_finder_accuracy.py
--calibrate; no source) at about

    s_kappa = NOISE_KAPPA sigma / W^NOISE_POWER   [1/m]

so W is chosen to bring s_kappa down to a fifth of the flattest curvature searched for
(1 / max_radius), within [DETECT_WIDTH_MIN, DETECT_WIDTH_MAX]. A point is in a curve
while |kappa| > kappa_off = kappa_on / 2, and a run counts once some point in it reaches
kappa_on = max(1 / max_radius, DETECT_SIGMAS s_kappa) (hysteresis: a curve's ends, where
kappa ramps, are kept with it).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from curvetui.core.centreline import Centreline

NOISE_KAPPA = 0.27
NOISE_POWER = 2.15
DETECT_WIDTH_MIN = 3.0  # [m]
DETECT_WIDTH_MAX = 60.0  # [m]
DETECT_SIGMAS = 5.0


@dataclass(frozen=True)
class Region:
    """Points ``first`` .. ``last`` (indices of the resampled line) curving one way
    (``sign`` +1 left, -1 right)."""

    first: int
    last: int
    sign: int
    # straight pieces of its heading diagram (first, last, slope [1/m]), where known
    pieces: tuple[tuple[int, int, float], ...] = ()


@dataclass(frozen=True)
class Detection:
    """The regions found, the smoothed curvature and the thresholds used."""

    regions: tuple[Region, ...]
    kappa: NDArray[np.float64]
    width: float
    kappa_on: float


def detection_width(noise: float, max_radius: float) -> float:
    """Width [m] of the smoothing for finding curves (module doc)."""
    if noise <= 0:
        return DETECT_WIDTH_MIN
    target = 1.0 / (max_radius * DETECT_SIGMAS)
    width = (NOISE_KAPPA * noise / target) ** (1.0 / NOISE_POWER)
    return float(np.clip(width, DETECT_WIDTH_MIN, DETECT_WIDTH_MAX))


def find_regions(line: Centreline, max_radius: float) -> Detection:
    """The runs of points where the line curves (module doc)."""
    from scipy.ndimage import gaussian_filter1d

    width = detection_width(line.noise, max_radius)
    kappa = gaussian_filter1d(line.curvature, width / line.step, mode="nearest")
    noise_kappa = NOISE_KAPPA * line.noise / width**NOISE_POWER if line.noise > 0 else 0.0
    k_on = max(1.0 / max_radius, DETECT_SIGMAS * noise_kappa)
    k_off = k_on / 2
    sign = np.where(kappa > k_off, 1, np.where(kappa < -k_off, -1, 0))
    regions: list[Region] = []
    n = sign.size
    i = 0
    while i < n:
        if sign[i] == 0:
            i += 1
            continue
        j = i
        while j + 1 < n and sign[j + 1] == sign[i]:
            j += 1
        if np.any(np.abs(kappa[i : j + 1]) > k_on):
            regions.append(Region(i, j, int(sign[i])))
        i = j + 1
    return Detection(tuple(regions), kappa, width, k_on)
