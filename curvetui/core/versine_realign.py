"""Slews from measured and designed versines (the versine or Hallade method).

Versines are measured at stations i = 0 .. n-1 spaced half a chord apart: the versine at
station i is the offset of the track there from the chord joining stations i-1 and i+1,
positive bowing away from the curve's centre. On a circle v = c^2 / (8 R).

With y_i the track's offset measured outward (away from the centre) from any straight base
line, v_i = y_i - (y_{i-1} + y_{i+1}) / 2. Slewing the track outward by s_i changes the
versine by s_i - (s_{i-1} + s_{i+1}) / 2, so the slews that bring the measured versines m
to the designed versines d satisfy

    e_i = m_i - d_i = (s_{i-1} - 2 s_i + s_{i+1}) / 2.

Fixing the track at the start (s_{-1} = s_0 = 0) and summing twice:

    F_j = sum_{k<=j} e_k        (first sums)
    G_i = sum_{j<i} F_j         (second sums)
    s_i = 2 G_i                 (slew, outward +)

The slews close at the end (s_{n-1} = 0 and s_n = 0: the track rejoins in line and in
direction) if and only if sum e_i = 0 and sum i e_i = 0, because
F_{n-1} = sum e_k and G_n = sum_{k} (n - k) e_k = n sum e_k - sum k e_k, G_{n-1} = G_n - F_{n-1}.

Source: the recurrence is derived above; the method in outline from US Army TR 0671
(3.18-3.28, read in outline). Any consistent length unit works; the CLI uses metres.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


def versine_for_radius(radius, chord):
    """Versine [m] of a ``chord`` [m] on a curve of ``radius`` [m]: v = c^2 / (8 R)."""
    return np.asarray(chord, dtype=float) ** 2 / (8.0 * np.asarray(radius, dtype=float))


def radius_for_versine(versine, chord):
    """Radius [m] whose ``chord`` [m] has ``versine`` [m]: R = c^2 / (8 v) (inf for v = 0)."""
    v = np.asarray(versine, dtype=float)
    with np.errstate(divide="ignore"):
        return np.asarray(chord, dtype=float) ** 2 / (8.0 * np.abs(v))


def slews_from_differences(differences, axis: int = -1) -> np.ndarray:
    """Slews s_i = 2 sum_{j<i} sum_{k<=j} e_k for versine differences e (along ``axis``)."""
    e = np.asarray(differences, dtype=float)
    first = np.cumsum(e, axis=axis)
    second = np.cumsum(first, axis=axis)
    # G_i = sum_{j<i} F_j: the running sum shifted one station on, G_0 = 0.
    g = np.zeros_like(second)
    src = [slice(None)] * e.ndim
    dst = [slice(None)] * e.ndim
    src[axis] = slice(None, -1)
    dst[axis] = slice(1, None)
    g[tuple(dst)] = second[tuple(src)]
    return 2.0 * g


@dataclass(frozen=True)
class HalladeSlews:
    """The versine method's working and result (lengths in the input's unit).

    ``closure_sum`` = sum e_i, ``closure_moment`` = sum i e_i (i from 0); both zero when the
    slews close. ``end_slew`` = s_n, the slew one station beyond the last (s_{n-1} is
    ``slews[-1]``).
    """

    measured: np.ndarray
    designed: np.ndarray
    differences: np.ndarray  # e_i = measured - designed
    first_sums: np.ndarray  # F_j
    second_sums: np.ndarray  # G_i
    slews: np.ndarray  # s_i = 2 G_i, outward +
    closure_sum: float
    closure_moment: float
    end_slew: float

    def closes(self, tolerance: float = 1e-9) -> bool:
        """True when the last slew and the one beyond it are within ``tolerance`` of 0."""
        return abs(self.slews[-1]) <= tolerance and abs(self.end_slew) <= tolerance


def hallade_slews(measured, designed) -> HalladeSlews:
    """Slews for one survey: ``measured`` and ``designed`` versines, equal-length 1-D arrays.

    Raises ValueError for arrays of other shapes or values that are not finite.
    """
    m = np.asarray(measured, dtype=float)
    d = np.asarray(designed, dtype=float)
    if m.ndim != 1 or d.shape != m.shape or m.size == 0:
        raise ValueError("measured and designed versines must be 1-D arrays of the same length")
    if not (np.all(np.isfinite(m)) and np.all(np.isfinite(d))):
        raise ValueError("versines must be finite numbers")
    e = m - d
    f = np.cumsum(e)
    g = np.concatenate(([0.0], np.cumsum(f)[:-1]))
    i = np.arange(e.size, dtype=float)
    total = float(f[-1])
    moment = float(np.dot(i, e))
    end = 2.0 * float(g[-1] + f[-1])
    return HalladeSlews(
        measured=m,
        designed=d,
        differences=e,
        first_sums=f,
        second_sums=g,
        slews=2.0 * g,
        closure_sum=total,
        closure_moment=moment,
        end_slew=end,
    )
