"""Proposals for a railway curve: a cant on the step inside every limit, the transition it
needs, or the least radius that admits both trains. Pure: SI in and out (m, m/s).

With E_f = s v^2 / (g R) and E_s = s u^2 / (g R) the equilibrium cants of the fast train
(v) and the slow one (u), and C, I, X the maximum cant, deficiency and excess of the fast
speed's band (as curvetui.core.rail.check_rail takes them), the cants that serve both are

    lo = max(E_f - I, 0)    hi = min(E_s + X, C)        (hi = C without u or X)

A cant is proposed on the step (5 mm, or 1/4 in on US projects: common practice, no
source) inside [lo, hi], the step nearest a target:

- with a slow train and an excess limit, the balancing cant that uses the same share of
  the deficiency and excess limits, (X E_f + I E_s) / (I + X) (curvetui.core.rail.
  balancing_cant; common practice, no source);
- otherwise the least cant that keeps the fast train's deficiency within its recommended
  value, max(E_f - I_rec, lo) (common practice, no source).

Where no step fits, the least radius that admits both trains follows from lo <= hi:

    R >= s v^2 / (g (C + I))           (fast train: cant and deficiency)
    R >= s (v^2 - u^2) / (g (I + X))   (both trains: deficiency and excess)
    R >= the limits' least radius

rounded up to ``radius_step`` and walked up that step until a cant on the cant step fits.
The transition length follows curvetui.core.transitions.rail_transition_for (cant
gradient, rates of change of cant and deficiency).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from curvetui.core import transitions as tr
from curvetui.core.proposals_road import ceil_to
from curvetui.core.rail import RailLimits, equilibrium_cant
from curvetui.core.units import FOOT, G0, INCH

CANT_STEP = {"metric": 0.005, "us": 0.25 * INCH}  # [m]
RADIUS_STEP = {"metric": 5.0, "us": 10.0 * FOOT}  # [m], common practice, no source
LENGTH_STEP = {"metric": 5.0, "us": 10.0 * FOOT}  # [m], transition lengths, likewise
MAX_STEPS = 100_000
TOL = 1e-9  # [m], the check's own tolerance on cant, deficiency and excess


@dataclass(frozen=True)
class Band:
    """The limits of the fast speed's band [m] and the cants serving both trains."""

    cant_max: float
    deficiency_max: float
    deficiency_recommended: float
    excess_max: float  # NaN where the limits set none
    e_fast: float
    e_slow: float  # NaN without a slow train
    lo: float
    hi: float


def band_at(limits: RailLimits, speed: float, low: float | None, radius: float, s: float) -> Band:
    """The feasible cants [lo, hi] at ``radius`` for the fast ``speed`` and the slow ``low``
    (None: no slow train), rail centres ``s`` [m]."""
    i, _ = limits.band(speed)
    i = int(i)
    c_max = float(limits.cant_max[i])
    d_max = float(limits.deficiency_max[i])
    x_max = float(limits.excess_max[i])
    e_fast = float(equilibrium_cant(speed, radius, s))
    e_slow = float(equilibrium_cant(low, radius, s)) if low is not None else math.nan
    lo = max(e_fast - d_max, 0.0)
    hi = c_max if (low is None or math.isnan(x_max)) else min(e_slow + x_max, c_max)
    return Band(
        c_max, d_max, float(limits.deficiency_recommended[i]), x_max, e_fast, e_slow, lo, hi
    )


def target_cant(band: Band) -> tuple[float, str]:
    """The cant aimed at and its rule (see the module docstring)."""
    if math.isfinite(band.e_slow) and math.isfinite(band.excess_max):
        share = (band.e_fast * band.excess_max + band.e_slow * band.deficiency_max) / (
            band.deficiency_max + band.excess_max
        )
        return float(share), "balancing"
    return max(band.e_fast - band.deficiency_recommended, band.lo), "recommended deficiency"


def cant_on_step(band: Band, target: float, step: float) -> float:
    """The multiple of ``step`` inside [lo, hi] nearest ``target``; NaN where none fits."""
    k_lo = math.ceil((band.lo - TOL) / step)
    k_hi = math.floor((band.hi + TOL) / step)
    if k_lo > k_hi:
        return math.nan
    return min(max(round(target / step), k_lo), k_hi) * step


def least_radius(limits: RailLimits, speed: float, low: float | None, s: float) -> float:
    """The least radius [m] at which some cant serves both trains (closed form above)."""
    i = int(limits.band(speed)[0])
    c_max, d_max, x_max = (
        float(limits.cant_max[i]),
        float(limits.deficiency_max[i]),
        float(limits.excess_max[i]),
    )
    need = s * speed**2 / (G0 * (c_max + d_max))
    if low is not None and math.isfinite(x_max):
        need = max(need, s * (speed**2 - low**2) / (G0 * (d_max + x_max)))
    return max(need, limits.radius_min)


@dataclass(frozen=True)
class RailProposal:
    """A rail curve's proposal, SI: the radius (the one given, or the least that admits a
    cant on the step), the cant, its target and rule, the band, and the transition."""

    radius: float
    radius_changed: bool
    radius_least: float  # the closed form, before rounding (NaN when the radius was kept)
    cant: float
    target: float
    rule: str  # "balancing" or "recommended deficiency"
    band: Band
    transition: tr.RailTransition  # lengths by each rule at the proposed cant
    transition_length: float  # the governing length rounded up to LENGTH_STEP (NaN: none)


def propose_rail(
    limits: RailLimits,
    speed: float,
    low: float | None,
    radius: float | None,
    s: float,
    units: str,
    radius_floor: float = 0.0,
) -> RailProposal:
    """Propose a cant (and, where none fits, a radius) for one rail curve (SI scalars).
    ``radius`` None: no radius given, the least that admits both trains is proposed, never
    below ``radius_floor`` [m] (the least radius the inputs take)."""
    step = CANT_STEP[units]
    cant = math.nan
    if radius is not None and radius >= limits.radius_min * (1 - 1e-12):
        band = band_at(limits, speed, low, radius, s)
        target, rule = target_cant(band)
        cant = cant_on_step(band, target, step)
    changed = not math.isfinite(cant)
    r_least = math.nan
    if changed:
        r_least = max(least_radius(limits, speed, low, s), radius_floor)
        r_step = RADIUS_STEP[units]
        r0 = ceil_to(r_least, r_step)
        for i in range(MAX_STEPS):
            radius = r0 + i * r_step
            band = band_at(limits, speed, low, radius, s)
            target, rule = target_cant(band)
            cant = cant_on_step(band, target, step)
            if math.isfinite(cant):
                break
    t = tr.rail_transition_for(limits, cant, band.e_fast - cant, speed)
    length = float(t.length)
    rounded = ceil_to(length, LENGTH_STEP[units]) if math.isfinite(length) else math.nan
    return RailProposal(
        radius=float(radius),
        radius_changed=changed,
        radius_least=r_least,
        cant=cant,
        target=target,
        rule=rule,
        band=band,
        transition=t,
        transition_length=rounded,
    )
