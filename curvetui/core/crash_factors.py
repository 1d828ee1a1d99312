"""Crash modification factors (CMFs) of a horizontal curve on a rural two-lane road.

Highway Safety Manual, 1st edition (AASHTO 2010), chapter 10 (rural two-lane, two-way roads).
Inputs in SI, converted inside with exact factors (1 ft = 0.3048 m, 1 mi = 1609.344 m),
because the HSM writes its equations in miles and feet.

Horizontal curvature, Eq. 10-13 (read in a public implementation, ../shared/REFERENCES.md):

    CMF = (1.55 Lc + 80.2 / R - 0.012 S) / (1.55 Lc)

Lc the curve length [mi], R the radius [ft], S = 1 with spirals at both ends, 0.5 at one,
0 at none. Lc is the circular arc without its spirals (from memory: the HSM's definition of
Lc leaves spiral transitions out).

Superelevation variance, Eqs. 10-14 to 10-16 (read):

    SV < 0.01:          CMF = 1.00
    0.01 <= SV < 0.02:  CMF = 1.00 + 6 (SV - 0.01)
    SV >= 0.02:         CMF = 1.06 + 3 (SV - 0.02)

SV [ft/ft] is the superelevation the design policy asks for at the curve's speed and radius
minus the superelevation the curve has (from memory: the HSM names the Green Book's rate;
here the road table's distribution gives it).

Validity (from memory, not read): the HSM applies Eq. 10-13 to R and Lc of at least 100 ft
and a CMF of at least 1. The factor is never clamped here: each bound that is not met sets a
flag, and the value computed from the equation is returned as it is.

The HSM's predictive method multiplies the CMFs of a site (Eq. 10-2; from memory), so
``combined`` is the product of the two factors.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

FOOT = 0.3048  # m, exact (international foot)
MILE = 1609.344  # m, exact (international mile)
LIMIT_FT = 100.0  # ft: least R and Lc the HSM applies Eq. 10-13 to (from memory)

RADIUS_BELOW_LIMIT = 1 << 0  # R < 100 ft
LENGTH_BELOW_LIMIT = 1 << 1  # Lc < 100 ft
CMF_BELOW_ONE = 1 << 2  # Eq. 10-13 gives below 1 (large R with spirals): not clamped
FLAG_TEXTS = {
    RADIUS_BELOW_LIMIT: "radius below 100 ft (30.48 m)",
    LENGTH_BELOW_LIMIT: "curve length below 100 ft (30.48 m)",
    CMF_BELOW_ONE: "factor below 1",
}


@dataclass(frozen=True)
class CurvatureCMF:
    """Eq. 10-13 for n curves: the factor, the inputs in the HSM's units, validity flags."""

    cmf: np.ndarray
    length_mi: np.ndarray  # Lc [mi]
    radius_ft: np.ndarray  # R [ft]
    spirals: np.ndarray  # S: 0, 0.5 or 1
    flags: np.ndarray  # RADIUS_BELOW_LIMIT | LENGTH_BELOW_LIMIT | CMF_BELOW_ONE


def spiral_presence(spiral_in, spiral_out) -> np.ndarray:
    """S of Eq. 10-13 from the two spiral lengths (any unit; 0 or less: no spiral)."""
    return 0.5 * (np.asarray(spiral_in) > 0) + 0.5 * (np.asarray(spiral_out) > 0)


def curvature_cmf(curve_length, radius, spirals) -> CurvatureCMF:
    """HSM Eq. 10-13 from the arc length [m], radius [m] and S (0, 0.5, 1); unclamped."""
    lc = np.asarray(curve_length, float) / MILE
    r = np.asarray(radius, float) / FOOT
    s = np.asarray(spirals, float)
    with np.errstate(divide="ignore", invalid="ignore"):
        cmf = (1.55 * lc + 80.2 / r - 0.012 * s) / (1.55 * lc)
    cmf = np.where(lc > 0, cmf, np.nan)  # no curve, no factor
    flags = np.where(r < LIMIT_FT, RADIUS_BELOW_LIMIT, 0)
    flags |= np.where(lc * (MILE / FOOT) < LIMIT_FT, LENGTH_BELOW_LIMIT, 0)
    flags |= np.where(cmf < 1.0, CMF_BELOW_ONE, 0)
    return CurvatureCMF(cmf, lc, r, np.broadcast_to(s, np.shape(cmf)), flags)


def superelevation_variance_cmf(sv) -> np.ndarray:
    """HSM Eqs. 10-14 to 10-16 from SV [fraction, ft/ft]: design e minus the curve's e."""
    sv = np.asarray(sv, float)
    return np.where(
        sv < 0.01, 1.0, np.where(sv < 0.02, 1.0 + 6.0 * (sv - 0.01), 1.06 + 3.0 * (sv - 0.02))
    )


def flag_text(flags: int) -> str:
    """The validity flags of one curve as words ("" when within the HSM's range)."""
    return "; ".join(text for bit, text in FLAG_TEXTS.items() if flags & bit)
