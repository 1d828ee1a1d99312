"""Rail-track curves: equilibrium cant, cant deficiency and excess, speed limits.

Equilibrium cant balances the lateral acceleration of a train at speed v on radius R:

    E = s v^2 / (g R)                                       (EN 13803-1:2010, 3.x, in SI)

s is the distance between the running-rail centres (1500 mm for 1435 mm gauge, so
E = 11.8 V^2 / R with V in km/h, R in m, E in mm). Cant deficiency for the fastest train
D = E(v_max) - E_a, cant excess for the slowest E_x = E_a - E(v_low), and the uncompensated
lateral acceleration in the plane of the track a_q = g D / s.

US customary: 49 CFR 213.57 writes E_a + E_u = 0.0007 D V^2 (inches, degrees of curve, mph);
with s = 59.99 in and the arc definition of D (R = 5729.58 / D ft) the SI formula above gives
the same number (see US_RAIL_CENTRES).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from curvetui.core.units import FOOT, G0, INCH, MPH

# Distance between rail centres [m] for common gauges [mm]: gauge plus the rail head width.
# 1435 -> 1500 mm is the EN 13803 value; the others follow the same rule with a head of
# about 65-75 mm (common practice, values from memory: check with the authority).
RAIL_CENTRES_MM = {
    1435: 1500.0,
    1520: 1600.0,
    1600: 1670.0,
    1668: 1740.0,
    1067: 1130.0,
    1000: 1065.0,
}

# The s for which s v^2/(g R) equals 0.0007 D V^2 (49 CFR 213.57) with R = 5729.578/D ft:
# s = 0.0007 in x g x 5729.578 ft / (5280/3600 ft/s per mph)^2, about 59.99 in.
US_RAIL_CENTRES = 0.0007 * INCH * G0 * (5729.5779513 * FOOT) / MPH**2

# Kinds of train traffic, in the order a CHOICE input codes them (0 passenger, 1 freight):
# 49 CFR 213.9 sets each track class's top speed by traffic.
TRAFFIC = ("passenger", "freight")

# Status flags
FAIL_CANT = 1 << 0  # applied cant above its maximum
FAIL_DEFICIENCY = 1 << 1
FAIL_EXCESS = 1 << 2
FAIL_NO_BALANCE = 1 << 3  # no cant satisfies both the fast and the slow train
WARN_NEGATIVE_DEFICIENCY = 1 << 4  # fastest train runs below equilibrium
WARN_SPEED_OUTSIDE_LIMITS = 1 << 5  # speed above the limit file's last band
WARN_CANT_BELOW_MIN = 1 << 6
WARN_BELOW_SCOPE = 1 << 10  # speed below the lowest the limits file covers
FAIL_RADIUS_BELOW_MIN = 1 << 12  # radius below the least the limits file allows
WARN_BALANCE_OUTSIDE = 1 << 11  # the same-share cant lies outside the cants the limits allow
WARN_CANT_ABOVE_RECOMMENDED = 1 << 7
WARN_DEFICIENCY_ABOVE_RECOMMENDED = 1 << 8
WARN_EXCESS_ABOVE_RECOMMENDED = 1 << 9
FAIL_MASK = FAIL_CANT | FAIL_DEFICIENCY | FAIL_EXCESS | FAIL_NO_BALANCE | FAIL_RADIUS_BELOW_MIN


def rail_centres_for_coefficient(coefficient: float) -> float:
    """The s [m] for which s v^2/(g R) equals ``coefficient`` x D x V^2 inches (D degrees of
    curve, arc definition R = 5729.578/D ft, V mph); 0.0007 gives 59.99 in."""
    return coefficient * INCH * G0 * (5729.5779513 * FOOT) / MPH**2


def rail_centres_for_gauge(gauge_mm: float) -> float:
    """Distance between rail centres [m] for a gauge [mm]: the preset, else gauge + 65 mm."""
    return RAIL_CENTRES_MM.get(int(round(gauge_mm)), gauge_mm + 65.0) / 1000.0


def equilibrium_cant(speed, radius, rail_centres=1.5):
    """E = s v^2 / (g R) [m]; speed [m/s], radius [m], rail_centres s [m]."""
    return rail_centres * np.asarray(speed, dtype=float) ** 2 / (G0 * np.asarray(radius))


def speed_for_cant(cant, radius, rail_centres=1.5):
    """The speed [m/s] whose equilibrium cant is ``cant`` [m]: v = sqrt(g R E / s); 0 for E <= 0."""
    c = np.maximum(np.asarray(cant, dtype=float), 0.0)
    return np.sqrt(G0 * np.asarray(radius, dtype=float) * c / rail_centres)


def uncompensated_acceleration(deficiency, rail_centres=1.5):
    """Lateral acceleration in the track plane left unbalanced, a_q = g D / s [m/s^2]."""
    return G0 * np.asarray(deficiency, dtype=float) / rail_centres


def band_speed_limits(limits, cant, radius, rail_centres) -> tuple[np.ndarray, np.ndarray]:
    """The fastest and the slowest speed [m/s] that keep cant deficiency and excess within
    the limits *of the band each speed falls in*.

    Band i covers (s_{i-1}, s_i]. In it the deficiency limit I_i allows speeds up to
    w_i = sqrt(g R (E_a + I_i) / s); the allowed speeds are the union of
    (s_{i-1}, min(s_i, w_i)] over the bands where w_i > s_{i-1}, and the maximum speed is
    the largest of those ends (never above the last band: the limits say nothing beyond
    it). Likewise the excess limit X_i allows speeds from u_i = sqrt(g R (E_a - X_i) / s),
    and the minimum speed is the smallest max(u_i, s_{i-1}) over the bands where u_i <= s_i
    (NaN where no band sets an excess limit).
    """
    ea = np.asarray(cant, dtype=float)[..., None]
    r = np.asarray(radius, dtype=float)[..., None]
    s = np.asarray(rail_centres, dtype=float)[..., None]
    top = limits.speed_max
    bottom = np.concatenate([[0.0], top[:-1]])
    w = speed_for_cant(ea + limits.deficiency_max, r, s)
    ends = np.where(w > bottom, np.minimum(top, w), -np.inf)
    v_max = np.max(ends, axis=-1)
    has_x = ~np.isnan(limits.excess_max)
    u = speed_for_cant(ea - np.where(has_x, limits.excess_max, 0.0), r, s)
    u = np.where(has_x, u, 0.0)
    starts = np.where(u <= top, np.maximum(u, bottom), np.inf)
    v_min = np.min(starts, axis=-1)
    v_min = np.where(has_x.any() & np.isfinite(v_min), v_min, np.nan)
    v_max = np.where(np.isfinite(v_max), v_max, 0.0)
    return v_max, v_min


def balancing_cant(e_fast, e_slow, deficiency_limit, excess_limit, cant_max):
    """The applied cant [m] that shares the limits between the fast and the slow train.

    Feasible cants lie in [e_fast - deficiency_limit, e_slow + excess_limit] and [0, cant_max].
    The choice uses the same fraction of each limit, (e_fast - E_a)/I = (E_a - e_slow)/X, so
    E_a = (X e_fast + I e_slow)/(I + X) with I, X the deficiency and excess limits (common
    practice, no source). The value is never clipped: where it lies outside the feasible
    range (or none exists) it is NaN, and the range [lo, hi] says what the limits allow.
    Returns (cant, lo, hi); the range is empty (lo > hi) where no cant serves both trains.
    """
    lo = np.maximum(e_fast - deficiency_limit, 0.0)
    hi = np.minimum(e_slow + excess_limit, cant_max)
    share = (e_fast * excess_limit + e_slow * deficiency_limit) / (deficiency_limit + excess_limit)
    inside = (share >= lo - 1e-12) & (share <= hi + 1e-12)
    return np.where(inside, share, np.nan), lo, hi


@dataclass(frozen=True)
class RailLimits:
    """Limits for cant, cant deficiency and excess by speed band, in SI (m, m/s).

    Band i covers speeds up to ``speed_max[i]``; excess limits may be NaN (none set), and so
    may the transition limits (one value per band from a file; a scalar NaN by default).
    ``traffic_top_speeds`` gives a top speed [m/s] per kind of traffic (49 CFR 213.9: class 2
    track, freight 25 mph, passenger 30 mph); without one the last band's top applies.
    """

    name: str
    title: str
    source: str
    units: str
    rail_centres: float  # [m]
    speed_max: np.ndarray  # [m/s], rising
    cant_recommended: np.ndarray  # [m]
    cant_max: np.ndarray
    deficiency_recommended: np.ndarray
    deficiency_max: np.ndarray
    excess_recommended: np.ndarray
    excess_max: np.ndarray
    band_sources: tuple[str, ...]
    cant_min: float = 0.0
    path: str = ""
    # the speeds and the gauge the file covers: a check below ``scope_min`` is warned, one
    # above the last band is refused (see curvetui.bend.parse); gauge [m], NaN if unstated
    scope_min: float = 0.0  # [m/s]
    gauge: float = np.nan
    radius_min: float = 0.0  # [m], the least radius the file allows (0: none set)
    # Transition limits by band (see curvetui.core.transitions); NaN where none is set.
    cant_gradient_max: np.ndarray | float = np.nan  # dE/ds [m/m]
    cant_rate_max: np.ndarray | float = np.nan  # dE/dt [m/s]
    deficiency_rate_max: np.ndarray | float = np.nan  # dD/dt [m/s]
    traffic_top_speeds: tuple[tuple[str, float], ...] = ()  # (traffic, [m/s]) pairs
    traffic_source: str = ""

    def top_speed(self, traffic: str) -> float:
        """The top speed [m/s] the limits allow for ``traffic`` (one of TRAFFIC): the file's
        own for that traffic, else its last band's."""
        return dict(self.traffic_top_speeds).get(traffic, float(self.speed_max[-1]))

    def top_speeds(self) -> np.ndarray:
        """Top speed [m/s] of each traffic, in TRAFFIC's order (index with a traffic code)."""
        return np.array([self.top_speed(t) for t in TRAFFIC])

    def band(self, speed) -> tuple[np.ndarray, np.ndarray]:
        """Index of the band holding ``speed`` [m/s], and whether it lies above the last."""
        v = np.asarray(speed, dtype=float)
        idx = np.searchsorted(self.speed_max, v - 1e-9, side="left")
        above = idx >= len(self.speed_max)
        return np.minimum(idx, len(self.speed_max) - 1), above


@dataclass(frozen=True)
class RailCheck:
    """Results of a rail-curve check, SI units (m, m/s, m/s^2)."""

    speed: np.ndarray
    low_speed: np.ndarray  # NaN where none given
    radius: np.ndarray
    cant: np.ndarray  # applied
    rail_centres: np.ndarray
    equilibrium_cant: np.ndarray  # at the (fast) speed
    equilibrium_cant_low: np.ndarray  # at the low speed, NaN without one
    cant_deficiency: np.ndarray
    cant_excess: np.ndarray  # NaN without a low speed
    lateral_acceleration: np.ndarray  # uncompensated, g D / s
    centripetal_acceleration: np.ndarray  # v^2 / R
    max_speed: np.ndarray  # allowed by the deficiency limit
    min_speed: np.ndarray  # allowed by the excess limit (NaN where the limits set none)
    balancing_cant: np.ndarray  # NaN without a low speed, or outside the allowed range
    cant_allowed_min: np.ndarray  # the cants serving both trains: [min, max], NaN w/o low
    cant_allowed_max: np.ndarray
    cant_limit: np.ndarray
    deficiency_limit: np.ndarray
    excess_limit: np.ndarray
    flags: np.ndarray

    @property
    def failed(self) -> np.ndarray:
        return (self.flags & FAIL_MASK) != 0


def check_rail(
    limits: RailLimits,
    speed,
    radius,
    cant,
    low_speed=None,
    rail_centres=None,
    top_speed=None,
) -> RailCheck:
    """Check rail curves against ``limits``. SI inputs; arrays broadcast.

    ``low_speed`` (NaN where absent) is the slowest train's speed; ``rail_centres`` [m]
    replaces the limits' own (for another gauge); ``top_speed`` [m/s] caps the maximum
    speed (the track class's top for the traffic, ``RailLimits.top_speed``).
    """
    s_given = limits.rail_centres if rail_centres is None else rail_centres
    low = np.asarray(np.nan if low_speed is None else low_speed, dtype=float)
    v, r, ea, low, s = np.broadcast_arrays(
        np.asarray(speed, dtype=float),
        np.asarray(radius, dtype=float),
        np.asarray(cant, dtype=float),
        low,
        np.asarray(s_given, dtype=float),
    )
    band, above = limits.band(v)
    c_max = limits.cant_max[band]
    i_max = limits.deficiency_max[band]
    x_max = limits.excess_max[band]
    e_fast = equilibrium_cant(v, r, s)
    e_slow = equilibrium_cant(low, r, s)
    deficiency = e_fast - ea
    excess = ea - e_slow
    has_low = ~np.isnan(low)
    has_x = ~np.isnan(x_max)
    v_max, v_min = band_speed_limits(limits, ea, r, s)
    if top_speed is not None:
        v_max = np.minimum(v_max, np.asarray(top_speed, dtype=float))
    x_for_balance = np.where(has_x, x_max, np.inf)
    with np.errstate(invalid="ignore"):
        bal, bal_lo, bal_hi = balancing_cant(
            e_fast, np.where(has_low, e_slow, 0.0), i_max, x_for_balance, c_max
        )
    feasible = bal_lo <= bal_hi + 1e-12
    # with no excess limit the same-share rule has no meaning: no balancing cant
    bal = np.where(has_low & has_x, bal, np.nan)
    bal_lo = np.where(has_low, bal_lo, np.nan)
    bal_hi = np.where(has_low, bal_hi, np.nan)

    tol = 1e-9
    flags = np.zeros(v.shape, dtype=np.int64)
    flags |= np.where(ea > c_max + tol, FAIL_CANT, 0)
    flags |= np.where(deficiency > i_max + tol, FAIL_DEFICIENCY, 0)
    flags |= np.where(has_low & has_x & (excess > np.where(has_x, x_max, 0) + tol), FAIL_EXCESS, 0)
    flags |= np.where(has_low & ~feasible, FAIL_NO_BALANCE, 0)
    flags |= np.where(has_low & has_x & feasible & np.isnan(bal), WARN_BALANCE_OUTSIDE, 0)
    flags |= np.where(deficiency < -tol, WARN_NEGATIVE_DEFICIENCY, 0)
    flags |= np.where(above, WARN_SPEED_OUTSIDE_LIMITS, 0)
    flags |= np.where(v < limits.scope_min * (1 - 1e-12), WARN_BELOW_SCOPE, 0)
    flags |= np.where(r < limits.radius_min * (1 - 1e-12), FAIL_RADIUS_BELOW_MIN, 0)
    flags |= np.where(ea < limits.cant_min - tol, WARN_CANT_BELOW_MIN, 0)
    flags |= np.where(
        (ea > limits.cant_recommended[band] + tol) & (ea <= c_max + tol),
        WARN_CANT_ABOVE_RECOMMENDED,
        0,
    )
    flags |= np.where(
        (deficiency > limits.deficiency_recommended[band] + tol) & (deficiency <= i_max + tol),
        WARN_DEFICIENCY_ABOVE_RECOMMENDED,
        0,
    )
    x_rec = limits.excess_recommended[band]
    flags |= np.where(
        has_low
        & has_x
        & (excess > np.where(has_x, x_rec, 0) + tol)
        & (excess <= np.where(has_x, x_max, 0) + tol),
        WARN_EXCESS_ABOVE_RECOMMENDED,
        0,
    )
    return RailCheck(
        speed=v,
        low_speed=low,
        radius=r,
        cant=ea,
        rail_centres=s,
        equilibrium_cant=e_fast,
        equilibrium_cant_low=e_slow,
        cant_deficiency=deficiency,
        cant_excess=np.where(has_low, excess, np.nan),
        lateral_acceleration=uncompensated_acceleration(deficiency, s),
        centripetal_acceleration=v**2 / r,
        max_speed=v_max,
        min_speed=v_min,
        balancing_cant=bal,
        cant_allowed_min=bal_lo,
        cant_allowed_max=bal_hi,
        cant_limit=c_max,
        deficiency_limit=i_max,
        excess_limit=x_max,
        flags=flags,
    )
