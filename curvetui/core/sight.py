"""Stopping sight distance and the horizontal sightline offset it needs on a bend.

Stopping sight distance (AASHTO Green Book, 7th ed., 2018, ch. 3, Eq. 3-2 and, on a grade,
Eq. 3-3; equation numbers from memory):

    metric: d = 0.278 V t + 0.039 V^2 / a      V km/h, t s, a m/s^2, d m
    US:     d = 1.47 V t + 1.075 V^2 / a       V mph, t s, a ft/s^2, d ft
    grade:  braking part V^2 / (254 (a/9.81 + G))  or  V^2 / (30 (a/32.2 + G))

with t = 2.5 s and a = 3.4 m/s^2 (11.2 ft/s^2) for design. In SI the physics reads
d = v t + v^2 / (2 (a + g G)). The standards' rounded constants (0.278 for 1/3.6, 0.039 for
1/25.92, 1.47 for 5280/3600, 1.075 for 1.4667^2/2) are kept in the "metric" and "us" forms so
the printed tables reproduce; the "exact" form is the SI physics. G is the grade as a
fraction, positive uphill.

Horizontal sightline offset (TxDOT Roadway Design Manual 4.7.9; Green Book 2018 ch. 3):

    HSO = R (1 - cos(28.65 S / R))   (angle in degrees)  =  R (1 - cos(S / (2 R)))

R the radius of the centre of the inside lane, valid while the sight distance S lies within
the curve length L.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from curvetui.core.units import FOOT, G0, KMH, MPH


@dataclass(frozen=True)
class SightForm:
    """Constants of one way of writing d = c_r V t + c_b V^2 / (a + g_c G)."""

    name: str
    speed_unit: float  # m/s per unit of V
    length_unit: float  # m per unit of d
    acceleration_unit: float  # m/s^2 per unit of a
    reaction_coefficient: float  # c_r
    braking_coefficient: float  # c_b
    gravity: float  # g_c, in the form's acceleration unit
    design_deceleration: float  # the Green Book's a, SI [m/s^2]


FORMS: dict[str, SightForm] = {
    # Green Book 2018 Eq. 3-2 (metric); 254 = 2 x 9.81 x 3.6^2 in Eq. 3-3
    "metric": SightForm("metric", KMH, 1.0, 1.0, 0.278, 0.039, 9.81, 3.4),
    # Green Book 2018 Eq. 3-2 (US customary); 30 = 2 x 32.2 / 1.47^2 in Eq. 3-3; a = 11.2 ft/s^2
    "us": SightForm("us", MPH, FOOT, FOOT, 1.47, 1.075, 32.2, 11.2 * FOOT),
    # the SI physics: d = v t + v^2 / (2 (a + g G))
    "exact": SightForm("exact", 1.0, 1.0, 1.0, 1.0, 0.5, G0, 3.4),
}

# Green Book Table 3-1 design values: the calculated distance rounded up to 5 ft (US, read
# via REFERENCES) and to 5 m (metric: every row of the metric table fits this, from memory).
DESIGN_STEP = 5.0

# Status flags of a sight check, one bit each.
FAIL_OFFSET = 1 << 0  # required offset above the available one (or not computable)
FAIL_NO_STOP = 1 << 1  # downgrade steeper than a/g: no finite stopping distance
WARN_BEYOND_FORMULA = 1 << 2  # half the sight angle over 90 degrees: offset >= radius
NOTE_SIGHT_LINE_ON_TANGENTS = 1 << 3  # S > L: sight line runs onto the tangents
NOTE_CURVE_LENGTH_UNKNOWN = 1 << 4  # no curve length: S < L assumed (conservative)
FAIL_MASK = FAIL_OFFSET | FAIL_NO_STOP


def _form(form: str) -> SightForm:
    try:
        return FORMS[form]
    except KeyError:
        raise ValueError(f"unknown sight-distance form {form!r}; use {', '.join(FORMS)}") from None


def _braking_factor(f: SightForm, deceleration, grade):
    """c_b / (a + g_c G) in the form's units: braking distance per V^2; inf if no stop."""
    a = np.asarray(deceleration, dtype=float) / f.acceleration_unit
    denom = a + f.gravity * np.asarray(grade, dtype=float)
    with np.errstate(divide="ignore"):
        return np.where(denom > 0, f.braking_coefficient / np.where(denom > 0, denom, 1.0), np.inf)


def stopping_sight_distance(
    speed, reaction_time=2.5, deceleration=3.4, grade=0.0, form: str = "metric"
):
    """Stopping sight distance [m]: d = c_r V t + c_b V^2 / (a + g_c G) (see module docstring).

    speed [m/s], reaction_time [s], deceleration [m/s^2], grade as a fraction (+ uphill).
    ``form`` "metric" or "us" keeps the Green Book's rounded constants (Eq. 3-2); "exact" is
    v t + v^2 / (2 (a + g G)). On a grade the braking part c_b V^2 / (a + g_c G) equals
    Eq. 3-2 on the level and differs from Eq. 3-3 only by the rounding of 0.039 against
    9.81/254 (1.075 against 32.2/30), under 1 %; it keeps d continuous at G = 0. Downgrades
    steeper than a/g give inf.
    """
    f = _form(form)
    v = np.asarray(speed, dtype=float) / f.speed_unit
    t = np.asarray(reaction_time, dtype=float)
    braking = _braking_factor(f, deceleration, grade)
    with np.errstate(invalid="ignore"):
        d = f.reaction_coefficient * v * t + braking * v**2
    return d * f.length_unit


def _round_up(d_si, f: SightForm):
    """Round a distance [m] up to the next DESIGN_STEP in the form's length unit."""
    x = np.asarray(d_si, dtype=float) / f.length_unit
    with np.errstate(invalid="ignore"):
        return np.ceil(x / DESIGN_STEP - 1e-9) * DESIGN_STEP * f.length_unit


def design_stopping_sight_distance(
    speed, units: str, reaction_time=2.5, deceleration=None, grade=0.0
):
    """Design stopping sight distance [m] as Green Book 2018 Table 3-1 gives it: the distance
    of Eq. 3-2 in ``units`` ("metric" or "us") rounded up to 5 m or 5 ft.

    ``deceleration`` [m/s^2] defaults to the table's own: 3.4 m/s^2 metric, 11.2 ft/s^2 US.
    """
    if units not in ("metric", "us"):
        raise ValueError(f"units must be 'metric' or 'us', got {units!r}")
    f = FORMS[units]
    a = f.design_deceleration if deceleration is None else deceleration
    return _round_up(stopping_sight_distance(speed, reaction_time, a, grade, units), f)


def speed_for_sight_distance(
    distance, reaction_time=2.5, deceleration=3.4, grade=0.0, form: str = "metric"
):
    """The speed [m/s] whose stopping sight distance is ``distance`` [m]: the positive root of
    c_b' V^2 + c_r t V - d = 0 (c_b' = c_b / (a + g_c G)); 0 where braking cannot stop."""
    f = _form(form)
    d = np.asarray(distance, dtype=float) / f.length_unit
    a2 = _braking_factor(f, deceleration, grade)
    b = f.reaction_coefficient * np.asarray(reaction_time, dtype=float)
    a2, b, d = np.broadcast_arrays(a2, b, d)
    finite = np.isfinite(a2) & (a2 > 0)
    a_safe = np.where(finite, a2, 1.0)
    with np.errstate(invalid="ignore", divide="ignore"):
        root = 2.0 * d / (b + np.sqrt(b**2 + 4.0 * a_safe * np.maximum(d, 0.0)))
    v = np.where(finite, root, 0.0)
    v = np.where(np.isinf(d) & finite, np.inf, v)
    v = np.where(d > 0, v, np.where(np.isnan(d), np.nan, 0.0))
    return v * f.speed_unit


def sightline_offset(radius, ssd, curve_length=None):
    """Horizontal sightline offset [m] from the centre of the inside lane.

    S <= L (or no L given): HSO = R (1 - cos(S / (2R))) (TxDOT RDM 4.7.9, the 28.65 S/R form).
    S > L with the curve length L given: driver and object stand (S - L)/2 out on each
    tangent, symmetric about the middle of the curve, and the sight line clears the arc's
    middle by HSO = R (1 - cos(L / (2R))) + (S - L)/2 sin(L / (2R)) (geometry of that
    position, from memory; its small-angle form is the textbook L (2S - L) / (8R)).
    NaN curve lengths count as not given. radius, ssd, curve_length in m.
    """
    r = np.asarray(radius, dtype=float)
    s = np.asarray(ssd, dtype=float)
    with np.errstate(invalid="ignore"):
        arc = r * (1.0 - np.cos(s / (2.0 * r)))
    if curve_length is None:
        return arc
    length = np.asarray(curve_length, dtype=float)
    half = length / (2.0 * r)
    with np.errstate(invalid="ignore"):
        ext = r * (1.0 - np.cos(half)) + 0.5 * (s - length) * np.sin(half)
        on_tangents = ~np.isnan(length) & (s > length)
    return np.where(on_tangents, ext, arc)


def sight_distance_for_offset(radius, offset, curve_length=None):
    """The longest sight distance [m] an offset [m] allows: sightline_offset inverted.

    Within the curve S = 2 R acos(1 - m / R); past the curve's own offset m_L (L given)
    S = L + 2 (m - m_L) / sin(L / (2R)). The arc form is inverted up to m = 2R.
    """
    r = np.asarray(radius, dtype=float)
    m = np.asarray(offset, dtype=float)
    with np.errstate(invalid="ignore"):
        arc = 2.0 * r * np.arccos(np.clip(1.0 - m / r, -1.0, 1.0))
    arc = np.where(m < 0, 0.0, arc)
    if curve_length is None:
        return arc
    length = np.asarray(curve_length, dtype=float)
    half = length / (2.0 * r)
    m_l = r * (1.0 - np.cos(half))
    sin_h = np.sin(half)
    with np.errstate(invalid="ignore", divide="ignore"):
        ext = length + 2.0 * (m - m_l) / np.where(sin_h > 0, sin_h, np.nan)
        beyond = ~np.isnan(length) & (m > m_l)
    return np.where(beyond, ext, arc)


@dataclass(frozen=True)
class SightCheck:
    """A stopping-sight check on a bend, SI units, arrays broadcast from the inputs."""

    speed: np.ndarray  # [m/s]
    radius: np.ndarray  # [m], centre of the inside lane
    curve_length: np.ndarray  # [m], NaN where not given
    grade: np.ndarray  # fraction, + uphill
    stopping_sight_distance: np.ndarray  # [m] (design value when rounded)
    sightline_offset_required: np.ndarray  # [m]
    offset_available: np.ndarray  # [m]
    sight_distance_available: np.ndarray  # [m], the sight distance the offset allows
    status: np.ndarray  # bool: True = passes
    speed_that_passes: np.ndarray  # [m/s], highest speed whose required offset fits
    offset_that_passes: np.ndarray  # [m], the offset needed at the given speed
    flags: np.ndarray  # bit set of FAIL_* / WARN_* / NOTE_*

    @property
    def failed(self) -> np.ndarray:
        return ~self.status


def sight_check(
    speed,
    radius,
    offset_available,
    curve_length=None,
    units: str = "metric",
    design: bool = True,
    reaction_time=2.5,
    deceleration=None,
    grade=0.0,
) -> SightCheck:
    """Check the sight across the inside of a bend. SI inputs; any may be arrays.

    The stopping sight distance uses the Green Book constants of ``units`` ("metric", "us")
    and, with ``design``, Table 3-1's rounding up to 5 m / 5 ft; ``deceleration`` [m/s^2]
    defaults to the table's own (3.4 m/s^2, 11.2 ft/s^2). ``speed_that_passes`` inverts the
    chain exactly: the sight distance the available offset allows, rounded down to the design
    step when ``design``, then the positive root of the stopping-distance quadratic.
    """
    f = _form(units)
    a = f.design_deceleration if deceleration is None else deceleration
    length_given = curve_length is not None
    length = np.asarray(np.nan if curve_length is None else curve_length, dtype=float)
    v, r, m_av, length, t, a, g = np.broadcast_arrays(
        np.asarray(speed, dtype=float),
        np.asarray(radius, dtype=float),
        np.asarray(offset_available, dtype=float),
        length,
        np.asarray(reaction_time, dtype=float),
        np.asarray(a, dtype=float),
        np.asarray(grade, dtype=float),
    )
    ssd = stopping_sight_distance(v, t, a, g, units)
    if design:
        ssd = _round_up(ssd, f)
    need = sightline_offset(r, ssd, length if length_given else None)
    s_av = sight_distance_for_offset(r, m_av, length if length_given else None)
    s_fit = s_av
    if design:
        unit = f.length_unit
        with np.errstate(invalid="ignore"):
            s_fit = np.floor(s_av / unit / DESIGN_STEP + 1e-9) * DESIGN_STEP * unit
    v_pass = speed_for_sight_distance(s_fit, t, a, g, units)

    no_stop = ~np.isfinite(ssd) & np.isfinite(v) & (v > 0)
    with np.errstate(invalid="ignore"):
        ok = np.isfinite(need) & (need <= m_av + 1e-9)
        has_length = ~np.isnan(length)
        beyond = (ssd > np.pi * r) & ~(has_length & (ssd > length))
        beyond |= has_length & (length > np.pi * r)
        beyond |= m_av >= r
        on_tangents = has_length & (ssd > length)
    ok &= ~no_stop
    flags = np.zeros(v.shape, dtype=np.int64)
    flags |= np.where(ok | no_stop, 0, FAIL_OFFSET)
    flags |= np.where(no_stop, FAIL_NO_STOP, 0)
    flags |= np.where(beyond, WARN_BEYOND_FORMULA, 0)
    flags |= np.where(on_tangents, NOTE_SIGHT_LINE_ON_TANGENTS, 0)
    flags |= np.where(has_length, 0, NOTE_CURVE_LENGTH_UNKNOWN)
    return SightCheck(
        speed=v,
        radius=r,
        curve_length=length,
        grade=g,
        stopping_sight_distance=ssd,
        sightline_offset_required=need,
        offset_available=m_av,
        sight_distance_available=s_av,
        status=ok,
        speed_that_passes=v_pass,
        offset_that_passes=need,
        flags=flags,
    )
