"""Advisory speed of an existing curve and its inferred design speed (pure, SI, vectorised).

Advisory speed by the design method (TxDOT *Procedures for Establishing Speed Zones*, curves
and turns, design method; read, see /work/shared/REFERENCES.md): the point-mass formula
V = sqrt(k R (e + f)) (V^2 = 15 R (e + f) in mph and ft, 127 R (e + f) in km/h and m) with
a side friction f that depends on the speed itself (f = 0.15 at 35 mph and above, 0.18 from
20 to 35 mph: read; 0.21 below 20 mph: from memory). The bands are given as a lower speed
and an f each; how the band is matched to the speed is described in ``advisory_speed``.

Inferred design speed (FHWA-SA-10-001, *Speed Concepts: Informational Guide*, 2009,
appendix; method read): the highest speed at which the curve's side friction demand
f = v^2 / (k R) - e stays within the design table's f_max at that speed, with f_max
interpolated linearly between the table's speeds (the interpolation is derived: the guide's
own final figure was not read).
"""

from __future__ import annotations

import numpy as np

from curvetui.core.road import speed_within_table
from curvetui.core.road_table import ABOVE_TABLE, BELOW_TABLE, INTERPOLATED, ROW

__all__ = [
    "ABOVE_TABLE",
    "BELOW_TABLE",
    "INTERPOLATED",
    "ROW",
    "advisory_speed",
    "inferred_design_speed",
    "round_speed",
]


def advisory_speed(radius, e, band_lower, band_f, k: float):
    """Advisory speed [m/s] by the design method with speed-banded side friction.

    ``radius`` [m] and ``e`` (fraction) per curve; ``band_lower`` [m/s], ascending from 0,
    the lower speed of each friction band and ``band_f`` its f (non-increasing as speed
    rises); ``k`` the point-mass constant in SI (v^2 = k R (e + f)).

    How the band is matched: for every band j, V_j = sqrt(k R (e + f_j)). Band j is
    consistent when V_j reaches its lower speed; as f falls with speed, V_j falls with j,
    so the highest consistent band gives the highest speed that meets its own band's f.
    Where V_j also reaches the next band's lower speed (a gap: too fast for band j's f,
    too slow for the next band's), every speed below that edge meets band j's f and the
    edge itself does not: the result is the edge, flagged ``capped`` (not attained).

    Returns (speed [m/s], band index, capped); NaN and band -1 where e + f <= 0 in every
    band (no speed at all).
    """
    r = np.asarray(radius, dtype=float)[..., None]
    e_ = np.asarray(e, dtype=float)[..., None]
    lower = np.asarray(band_lower, dtype=float)
    f = np.asarray(band_f, dtype=float)
    upper = np.append(lower[1:], np.inf)
    with np.errstate(invalid="ignore"):
        v = np.sqrt(k * r * (e_ + f))  # NaN where e + f < 0
        ok = v >= lower  # False for NaN
    band = np.where(ok.any(axis=-1), ok.shape[-1] - 1 - np.argmax(ok[..., ::-1], axis=-1), -1)
    pick = np.clip(band, 0, None)[..., None]
    v_band = np.take_along_axis(v, pick, axis=-1)[..., 0]
    hi = upper[np.clip(band, 0, None)]
    capped = (band >= 0) & (v_band >= hi)
    speed = np.where(band < 0, np.nan, np.minimum(v_band, hi))
    return speed, band, capped


def round_speed(speed, step: float, capped=False, mode: str = "down"):
    """A speed (any unit) to a multiple of ``step`` in that unit: ``down`` (the safe side;
    a ``capped`` speed is an edge not attained, so it goes one step lower when it is itself a
    multiple) or ``nearest`` (half up). NaN stays NaN."""
    s = np.asarray(speed, dtype=float) / step
    if mode == "nearest":
        return np.floor(s + 0.5 + 1e-9) * step
    if mode != "down":
        raise ValueError(f"rounding must be 'down' or 'nearest', got {mode!r}")
    down = np.floor(s + 1e-9)
    with np.errstate(invalid="ignore"):
        at_edge = np.asarray(capped, bool) & (np.abs(s - down) <= 1e-9)
    return np.where(at_edge, down - 1, down) * step


def inferred_design_speed(radius, e, speeds, f_max, k: float):
    """Highest speed [m/s] at which f = v^2/(k R) - e is within the table's f_max(v): the
    safe speed's own solve (``curvetui.core.road.speed_within_table``: f_max linear between
    rows, the crossing a quadratic, the table never extended), told as the FHWA guide's
    method reports it (FHWA-SA-10-001, 2009, appendix; REFERENCES.md).

    ``speeds`` [m/s] ascending and ``f_max`` the table's rows; ``k`` the table's constant
    in SI. Returns (speed [m/s], kind, highest table row met [m/s]): kind INTERPOLATED
    (between rows), ROW (on a row), ABOVE_TABLE (the curve meets even the top row: the
    speed given is that row, "at least"), BELOW_TABLE (it fails the lowest row: NaN, and
    the row speed NaN).
    """
    xs = np.asarray(speeds, dtype=float)
    speed, beyond = speed_within_table(radius, e, xs, f_max, k)
    met = np.sum(xs <= speed[..., None] * (1 + 1e-12), axis=-1)  # rows at or below it
    row_speed = np.where(met > 0, xs[np.clip(met - 1, 0, None)], np.nan)
    on_row = np.abs(speed - row_speed) <= 1e-12 * xs[-1]
    kind = np.where(
        beyond < 0,
        BELOW_TABLE,
        np.where(beyond > 0, ABOVE_TABLE, np.where(on_row, ROW, INTERPOLATED)),
    )
    return speed, kind, row_speed
