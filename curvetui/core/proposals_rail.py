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
gradient, rates of change of cant and deficiency), rounded up to ``LENGTH_STEP``.

With a deflection Delta the proposal puts two equal spirals of that length L on the curve;
they fit while their spiral angles L / (2 R) sum to no more than Delta, L <= R Delta (the
check's own overlap rule, curvetui.core.spiral). Where the target's cant needs a longer
transition, the cant on the step inside [lo, hi] nearest the target whose transition fits
is proposed (a lower cant shortens the cant-gradient and cant-rate runs and lengthens the
deficiency-rate run: common practice, no source); where no cant fits, the radius is walked
up its step from a lower bound until one does. The bound: with a = max(1 / (dE/ds)max,
v / (dE/dt)max) and b = v / (dD/dt)max, any cant c needs L >= max(a c, b (E_f - c)) >=
a b E_f / (a + b), and E_f = s v^2 / (g R), so L <= R Delta needs

    R >= sqrt(a b / (a + b) x s v^2 / (g Delta))    (and R >= LENGTH_STEP / Delta)
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

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


class NoRailProposal(ValueError):
    """No radius up to ``radius_max`` [m] admits a cant whose transitions fit the
    deflection."""

    def __init__(self, radius_max: float):
        super().__init__(f"no radius up to {radius_max:g} m fits the deflection")
        self.radius_max = radius_max


def transition_lengths(
    limits: RailLimits, cants: np.ndarray, e_fast: float, speed: float, units: str
) -> np.ndarray:
    """The governing transition length [m] of each cant [m], rounded up to LENGTH_STEP
    (NaN where the limits set no transition limit)."""
    t = tr.rail_transition_for(limits, cants, e_fast - cants, speed)
    step = LENGTH_STEP[units]
    length = np.asarray(t.length, dtype=float)
    q = length / step
    with np.errstate(invalid="ignore"):
        return np.ceil(q - 1e-12 * np.abs(q)) * step  # as ceil_to, elementwise


def spirals_fit(length: float, radius: float, deflection: float | None) -> bool:
    """Two spirals of ``length`` [m] fit a curve of ``radius`` [m] on ``deflection`` [rad]
    (None: no deflection, nothing to fit): 2 L / (2 R) <= Delta, with a margin of 1e-9 for
    the round trip through the user's units. NaN (no length needed) fits."""
    if deflection is None or not math.isfinite(length):
        return True
    return length <= radius * deflection * (1 - 1e-9)


def fit_radius_bound(
    limits: RailLimits, speed: float, s: float, deflection: float, units: str
) -> float:
    """A lower bound [m] on the radius at which some cant's transition fits ``deflection``
    [rad] (module docstring); 0 where the limits do not bound it."""
    g_max, r_max, dr_max, _ = (float(x) for x in tr.transition_limits(limits, speed))
    per_cant = [x for x in (1.0 / g_max, speed / r_max) if math.isfinite(x)]
    a = max(per_cant) if per_cant else 0.0
    b = speed / dr_max if math.isfinite(dr_max) else 0.0
    if a <= 0 or b <= 0:
        return 0.0
    k = a * b / (a + b)
    return max(math.sqrt(k * s * speed**2 / (G0 * deflection)), LENGTH_STEP[units] / deflection)


@dataclass(frozen=True)
class Choice:
    """The cant chosen at one radius: the band, the target and its rule, the step cant
    nearest the target and its rounded transition, the cant proposed and its transition
    (NaN where no cant on the step lies in the band or none fits the deflection)."""

    band: Band
    target: float
    rule: str
    target_cant: float
    target_length: float
    cant: float
    length: float
    shortest: float  # the shortest rounded transition of any cant in the band [m]


def choose_cant(
    limits: RailLimits,
    speed: float,
    low: float | None,
    radius: float,
    s: float,
    units: str,
    deflection: float | None,
) -> Choice:
    """The cant at ``radius``: the step cant nearest the target, or, where its transitions
    do not fit ``deflection``, the step cant inside the band nearest the target whose
    transitions fit (ties: the lower cant)."""
    step = CANT_STEP[units]
    band = band_at(limits, speed, low, radius, s)
    target, rule = target_cant(band)
    c0 = cant_on_step(band, target, step)
    nan = math.nan
    if not math.isfinite(c0):
        return Choice(band, target, rule, nan, nan, nan, nan, nan)
    k_lo = math.ceil((band.lo - TOL) / step)
    k_hi = math.floor((band.hi + TOL) / step)
    cants = np.arange(k_lo, k_hi + 1) * step
    lengths = transition_lengths(limits, cants, band.e_fast, speed, units)
    l0 = float(transition_lengths(limits, np.array([c0]), band.e_fast, speed, units)[0])
    shortest = float(np.min(lengths)) if np.isfinite(lengths).all() else nan
    if spirals_fit(l0, radius, deflection):
        return Choice(band, target, rule, c0, l0, c0, l0, shortest)
    fit = [
        (abs(c - target), c, ln)
        for c, ln in zip(cants.tolist(), lengths.tolist(), strict=True)
        if spirals_fit(ln, radius, deflection)
    ]
    if not fit:
        return Choice(band, target, rule, c0, l0, nan, nan, shortest)
    _, c, ln = min(fit)
    return Choice(band, target, rule, c0, l0, c, ln, shortest)


# why a proposal's radius is not the one given
RADIUS_KEPT, RADIUS_NO_CANT, RADIUS_DEFLECTION = "kept", "no cant", "deflection"


@dataclass(frozen=True)
class RailProposal:
    """A rail curve's proposal, SI: the radius (the one given, or the least that admits a
    cant on the step and, with a deflection, its transitions), the cant, its target and
    rule, the band, and the transition."""

    radius: float
    radius_changed: bool
    radius_least: float  # the closed form, before rounding (NaN when the radius was kept)
    cant: float
    target: float
    rule: str  # "balancing" or "recommended deficiency"
    band: Band
    transition: tr.RailTransition  # lengths by each rule at the proposed cant
    transition_length: float  # the governing length rounded up to LENGTH_STEP (NaN: none)
    # with a deflection [rad] (NaN: none): RADIUS_DEFLECTION where the transitions raised
    # the radius above ``radius_band`` (the given one, or the least on the step that admits
    # a cant), the lower bound on it (0: none), the shortest transition of the band's cants
    # at ``radius_band``; where the cant was moved off the target's step cant to fit, that
    # cant and its transition (NaN otherwise)
    radius_why: str = RADIUS_KEPT  # or RADIUS_NO_CANT, RADIUS_DEFLECTION
    deflection: float = math.nan
    radius_band: float = math.nan
    fit_bound: float = 0.0
    band_shortest: float = math.nan
    passed_cant: float = math.nan
    passed_length: float = math.nan


def _fit_any(limits, speed, low, s, units, radii: np.ndarray, deflection) -> np.ndarray:
    """Whether any cant on the step inside the band at each of ``radii`` [m] has
    transitions that fit ``deflection`` [rad]: choose_cant's test on many radii at once."""
    step = CANT_STEP[units]
    i = int(limits.band(speed)[0])
    c_max, d_max, x_max = (
        float(x[i]) for x in (limits.cant_max, limits.deficiency_max, limits.excess_max)
    )
    e_fast = np.asarray(equilibrium_cant(speed, radii, s))
    lo = np.maximum(e_fast - d_max, 0.0)
    hi = np.full_like(radii, c_max)
    if low is not None and math.isfinite(x_max):
        hi = np.minimum(np.asarray(equilibrium_cant(low, radii, s)) + x_max, c_max)
    k_lo = np.ceil((lo - TOL) / step)[:, None]
    k_hi = np.floor((hi + TOL) / step)[:, None]
    ks = np.arange(0, math.floor((c_max + TOL) / step) + 1)[None, :]
    lengths = transition_lengths(limits, ks * step, e_fast[:, None], speed, units)
    with np.errstate(invalid="ignore"):
        fit = np.isnan(lengths) | (lengths <= radii[:, None] * deflection * (1 - 1e-9))
    return np.any((ks >= k_lo) & (ks <= k_hi) & fit, axis=1)


BLOCK = 8, 1024  # radii tried at once on the walk with a deflection: first, doubled up to


def _walk(limits, speed, low, s, units, start, deflection, radius_max) -> tuple[float, Choice]:
    """The least radius on RADIUS_STEP from ``start`` [m] up at which a cant (and, with a
    ``deflection``, its transitions) fits, and the choice there."""
    r_step = RADIUS_STEP[units]
    r0 = ceil_to(start, r_step)
    i, size = 0, BLOCK[0]
    while i < MAX_STEPS:
        if deflection is not None:  # skip ahead over radii where no cant fits
            block = np.arange(i, i + size)
            size = min(2 * size, BLOCK[1])
            radii = r0 + block * r_step
            ok = np.nonzero(_fit_any(limits, speed, low, s, units, radii, deflection))[0]
            if not len(ok):
                i = int(block[-1]) + 1
                if r0 + i * r_step > radius_max:
                    break
                continue
            i = int(block[ok[0]])
        radius = r0 + i * r_step
        if radius > radius_max:
            break
        choice = choose_cant(limits, speed, low, radius, s, units, deflection)
        if math.isfinite(choice.cant):
            return radius, choice
        i += 1
    raise NoRailProposal(min(radius_max, r0 + MAX_STEPS * r_step))


def propose_rail(
    limits: RailLimits,
    speed: float,
    low: float | None,
    radius: float | None,
    s: float,
    units: str,
    radius_floor: float = 0.0,
    deflection: float | None = None,
    radius_max: float = math.inf,
) -> RailProposal:
    """Propose a cant (and, where none fits, a radius) for one rail curve (SI scalars).
    ``radius`` None: no radius given, the least that admits both trains is proposed, never
    below ``radius_floor`` [m] (the least radius the inputs take). ``deflection`` [rad]:
    the cant's two transitions must fit it (module docstring); NoRailProposal where no
    radius up to ``radius_max`` [m] does."""
    why, r_least = RADIUS_KEPT, math.nan
    band_choice = None
    if radius is not None and radius >= limits.radius_min * (1 - 1e-12):
        band_choice = choose_cant(limits, speed, low, radius, s, units, None)
    if band_choice is None or not math.isfinite(band_choice.cant):
        why = RADIUS_NO_CANT
        r_least = max(least_radius(limits, speed, low, s), radius_floor)
        radius, band_choice = _walk(limits, speed, low, s, units, r_least, None, radius_max)
    assert radius is not None
    r_band, choice, bound = radius, band_choice, 0.0
    if deflection is not None:
        choice = choose_cant(limits, speed, low, radius, s, units, deflection)
        if not math.isfinite(choice.cant):
            why = RADIUS_DEFLECTION
            bound = fit_radius_bound(limits, speed, s, deflection, units)
            start = max(radius, bound * (1 - 1e-9))
            radius, choice = _walk(limits, speed, low, s, units, start, deflection, radius_max)
    cant = choice.cant
    moved = cant != choice.target_cant
    t = tr.rail_transition_for(limits, cant, choice.band.e_fast - cant, speed)
    return RailProposal(
        radius=float(radius),
        radius_changed=why != RADIUS_KEPT,
        radius_least=r_least,
        cant=cant,
        target=choice.target,
        rule=choice.rule,
        band=choice.band,
        transition=t,
        transition_length=choice.length,
        radius_why=why,
        deflection=math.nan if deflection is None else deflection,
        radius_band=r_band,
        fit_bound=bound,
        band_shortest=band_choice.shortest,
        passed_cant=choice.target_cant if moved else math.nan,
        passed_length=choice.target_length if moved else math.nan,
    )
