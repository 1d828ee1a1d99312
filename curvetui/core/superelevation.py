"""Superelevation distributions: the design e for a radius, capped at e_max.

AASHTO Method 5 (A Policy on Geometric Design of Highways and Streets, 7th ed., 2018,
section 3.3.5, "Procedure for Development of Finalized e Distribution"): side friction
at the design speed follows an unsymmetrical parabola in curvature 1/R whose legs are
the Method 4 lines, meeting at 1/R_PI, the curvature at which e_max balances the
average running speed with no friction:

    1/R_PI = e_max k / v_R^2          1/R_min = (e_max + f_max) k / v_D^2
    h  = e_max (v_D^2 / v_R^2 - 1)     (friction at the PI)
    S1 = h R_PI,  S2 = (f_max - h) / (1/R_min - 1/R_PI)
    M0 = (1/R_PI)(1/R_min - 1/R_PI)(S2 - S1) / (2 / R_min)
    f  = M0 (x R_PI)^2 + S1 x                                   for x <= 1/R_PI
    f  = M0 ((1/R_min - x)/(1/R_min - 1/R_PI))^2 + h + S2 (x - 1/R_PI)   otherwise
    e  = v_D^2 x / k - f,   x = 1/R

Method 1 ("linear"): e and f both in proportion to 1/R, e = e_max R_min / R; used by
standards that keep a straight-line distribution.

Method 2 ("aashto-method-2", Green Book 2018 section 3.3.5 lists the five methods; its use
on low-speed urban streets, with the low-speed f_max, is from memory): side friction alone
carries the lateral demand V^2/(C R) up to f_max, superelevation the rest:

    e = V^2 / (C R) - f_max, at least 0, at most e_max       (v^2/(k R) in SI)

The section keeps the normal crown while the outside lane, at the adverse -e_NC, stays
within f_max (V^2/(C R) + e_NC <= f_max); past that the adverse crown is removed (a plane
section at e_NC) until e reaches e_NC, and then e itself is built.
"""

from __future__ import annotations

import numpy as np

# Cross-section codes for a design superelevation.
NORMAL_CROWN = 0  # design e below the normal-crown limit: keep the crown
REMOVE_CROWN = 1  # remove adverse crown, superelevate at the normal cross slope
SUPERELEVATED = 2
AT_EMAX = 3  # radius at or below R_min: e_max


LEG_1, LEG_2, LEG_EMAX = 1, 2, 3  # the parabola's leg used, or e_max at R <= R_min


def method5_terms(radius, v_design, v_running, e_max, f_max, k) -> dict:
    """Method 5's intermediate values (see module docstring), SI, arrays broadcast:
    ``x`` = 1/R, ``x_pi`` = 1/R_PI, ``x_min`` = 1/R_min [1/m], ``h``, ``s1``, ``s2`` [m],
    ``m0``, the side friction ``f`` by the distribution, the uncapped ``e`` [fractions] and
    ``leg`` (LEG_1, LEG_2 or LEG_EMAX). The design e is min(e, e_max), e_max from R_min down.
    """
    x = 1.0 / np.asarray(radius, dtype=float)
    kd = np.asarray(v_design, dtype=float) ** 2 / k
    kr = np.asarray(v_running, dtype=float) ** 2 / k
    x_pi = e_max / kr
    x_min = (e_max + f_max) / kd
    # A running speed so close to the design speed that the PI falls past R_min would
    # make the parabola meaningless; hold the PI just inside (never met in the tables).
    x_pi = np.minimum(x_pi, x_min * (1 - 1e-9))
    h = kd * x_pi - e_max
    s1 = h / x_pi
    s2 = (f_max - h) / (x_min - x_pi)
    m0 = x_pi * (x_min - x_pi) * (s2 - s1) / (2.0 * x_min)
    f_low = m0 * (x / x_pi) ** 2 + s1 * x
    f_high = m0 * ((x_min - x) / (x_min - x_pi)) ** 2 + h + s2 * (x - x_pi)
    low = x <= x_pi
    f = np.where(low, f_low, f_high)
    leg = np.where(x >= x_min, LEG_EMAX, np.where(low, LEG_1, LEG_2))
    terms = {"x": x, "x_pi": x_pi, "x_min": x_min, "h": h, "s1": s1, "s2": s2, "m0": m0}
    return {**terms, "f": f, "e": kd * x - f, "leg": leg}


def method5_superelevation(radius, v_design, v_running, e_max, f_max, k):
    """Design superelevation [fraction] by AASHTO Method 5 (see module docstring).

    radius [m], v_design and v_running [m/s], f_max at the design speed, k the table's
    point-mass constant in SI [m/s^2]. Radii at or below R_min get e_max.
    """
    t = method5_terms(radius, v_design, v_running, e_max, f_max, k)
    return np.where(t["x"] >= t["x_min"], e_max, np.minimum(t["e"], e_max))


def linear_superelevation(radius, v_design, e_max, f_max, k):
    """Design superelevation [fraction] by Method 1: e = e_max R_min / R, capped at e_max."""
    r_min = np.asarray(v_design, dtype=float) ** 2 / (k * (e_max + f_max))
    return np.minimum(e_max * r_min / np.asarray(radius, dtype=float), e_max)


def method2_superelevation(radius, v_design, e_max, f_max, k):
    """Design superelevation [fraction] by Method 2: max(0, v^2/(k R) - f_max), capped at
    e_max; radius [m], v_design [m/s], k the table's point-mass constant in SI [m/s^2]."""
    demand = np.asarray(v_design, dtype=float) ** 2 / (k * np.asarray(radius, dtype=float))
    return np.minimum(np.maximum(demand - f_max, 0.0), e_max)


def method2_cross_section(demand, f_max, e_design, normal_crown, at_emax):
    """Classify a Method 2 section: normal crown while the demand ``demand`` = v^2/(k R)
    plus the adverse crown stays within f_max; then remove crown while the design e is
    below the normal cross slope; then superelevated (e_max at or below R_min)."""
    d = np.asarray(demand, dtype=float)
    e = np.asarray(e_design, dtype=float)
    crown_kept = d + normal_crown <= f_max + 1e-12
    code = np.where(
        crown_kept, NORMAL_CROWN, np.where(e < normal_crown, REMOVE_CROWN, SUPERELEVATED)
    )
    return np.where(at_emax, AT_EMAX, code)


# How each distribution is written out (formula, source) for a worked check.
DISTRIBUTION_TEXT = {
    "aashto-method-5": (
        "Method 5 (parabolic f distribution on the running speed)",
        "Green Book 2018 section 3.3.5 (Method 5)",
    ),
    "linear": (
        "e = e_max R_min / R (linear distribution)",
        "linear distribution (AASHTO Method 1)",
    ),
    "aashto-method-2": (
        "e = V^2 / (C R) - f_max, from 0 to e_max (Method 2: friction first)",
        "AASHTO Method 2 (Green Book 2018 section 3.3.5; low-speed use from memory)",
    ),
}


def cross_section(e_design, e_max, normal_crown, normal_crown_limit, at_emax):
    """Classify a design superelevation: normal crown, remove crown, superelevated, e_max.

    ``at_emax`` marks radii at or below R_min. Following the Green Book's tables, a design
    e below ``normal_crown_limit`` keeps the normal crown (NC); from there up to the normal
    cross slope the adverse crown is removed and the section tilted at the normal cross
    slope (RC).
    """
    e = np.asarray(e_design, dtype=float)
    code = np.where(e < normal_crown_limit, NORMAL_CROWN, SUPERELEVATED)
    code = np.where((e >= normal_crown_limit) & (e < normal_crown), REMOVE_CROWN, code)
    return np.where(at_emax, AT_EMAX, code)


def applied_superelevation(e_design, code, normal_crown):
    """The superelevation built on the outside lane for a cross-section code [fraction].

    Normal crown leaves the outside lane at the adverse cross slope (-normal_crown), which
    is what its side friction must carry; remove-crown builds the normal cross slope.
    """
    e = np.asarray(e_design, dtype=float)
    e = np.where(code == REMOVE_CROWN, normal_crown, e)
    return np.where(code == NORMAL_CROWN, -normal_crown, e)


def radius_for_superelevation(e_target, design_e, r_low, r_high, iterations: int = 80):
    """Radius [m] at which ``design_e(radius)`` equals ``e_target`` (bisection, vectorised).

    ``design_e`` must fall as the radius grows between ``r_low`` and ``r_high``; this is
    how the Green Book's tables list, for each e, the smallest radius that may use it.
    """
    target = np.asarray(e_target, dtype=float)
    lo = np.broadcast_to(np.asarray(r_low, dtype=float), target.shape).copy()
    hi = np.broadcast_to(np.asarray(r_high, dtype=float), target.shape).copy()
    for _ in range(iterations):
        mid = np.sqrt(lo * hi)  # radii span decades: bisect in log space
        too_much = design_e(mid) > target
        lo = np.where(too_much, mid, lo)
        hi = np.where(too_much, hi, mid)
    return np.sqrt(lo * hi)
