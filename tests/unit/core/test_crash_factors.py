"""Curve crash modification factors against the HSM's equations, worked by hand here.

Source: Highway Safety Manual 1st ed. (AASHTO 2010), Eq. 10-13 (horizontal curvature, read in
a public implementation) and Eqs. 10-14 to 10-16 (superelevation variance, read), as listed
in ../shared/REFERENCES.md; the 100 ft validity bounds are from memory. Every expected value
is hand arithmetic written out below, never the code under test.
"""

from __future__ import annotations

import numpy as np
import pytest

from curvetui.core import crash_factors as cf

MI = 1609.344  # m, exact
FT = 0.3048  # m, exact


def test_derived_check_no_spirals():
    # REFERENCES (derived): 0.1 mi, 1000 ft, S 0 -> 1.5174
    # (1.55 x 0.1 + 80.2 / 1000) / (1.55 x 0.1) = (0.155 + 0.0802) / 0.155 = 0.2352 / 0.155
    c = cf.curvature_cmf(0.1 * MI, 1000 * FT, 0.0)
    assert float(c.cmf) == pytest.approx(0.2352 / 0.155, rel=1e-12)
    assert round(float(c.cmf), 4) == 1.5174
    assert int(c.flags) == 0


def test_derived_check_spirals_both_ends():
    # REFERENCES (derived): 0.1 mi, 500 ft, S 1 -> 1.9574
    # (0.155 + 80.2 / 500 - 0.012) / 0.155 = (0.155 + 0.1604 - 0.012) / 0.155 = 0.3034 / 0.155
    c = cf.curvature_cmf(0.1 * MI, 500 * FT, 1.0)
    assert float(c.cmf) == pytest.approx(0.3034 / 0.155, rel=1e-12)
    assert round(float(c.cmf), 4) == 1.9574


def test_more_hand_calculations_vectorised():
    # 0.05 mi, 300 ft, one spiral (S 0.5):
    #   (0.0775 + 0.267333... - 0.006) / 0.0775 = 0.338833... / 0.0775 = 4.372043...
    # 0.25 mi, 2000 ft, none: (0.3875 + 0.0401) / 0.3875 = 0.4276 / 0.3875 = 1.103484
    length = np.array([0.05, 0.25]) * MI
    radius = np.array([300.0, 2000.0]) * FT
    c = cf.curvature_cmf(length, radius, np.array([0.5, 0.0]))
    want = [(0.0775 + 80.2 / 300 - 0.006) / 0.0775, 0.4276 / 0.3875]
    assert c.cmf == pytest.approx(want, rel=1e-12)
    assert c.cmf[0] == pytest.approx(4.372043, abs=1e-6)
    assert c.cmf[1] == pytest.approx(1.103484, abs=1e-6)
    assert c.length_mi == pytest.approx([0.05, 0.25], rel=1e-15)
    assert c.radius_ft == pytest.approx([300.0, 2000.0], rel=1e-15)


def test_spiral_presence():
    s = cf.spiral_presence(np.array([0.0, 40.0, 0.0, 40.0]), np.array([0.0, 0.0, 30.0, 30.0]))
    assert s.tolist() == [0.0, 0.5, 0.5, 1.0]


def test_radius_and_length_below_100_ft_are_flagged_not_clamped():
    # R 90 ft, Lc 0.1 mi: (0.155 + 80.2 / 90) / 0.155 = (0.155 + 0.891111) / 0.155 = 6.749104
    c = cf.curvature_cmf(0.1 * MI, 90 * FT, 0.0)
    assert int(c.flags) == cf.RADIUS_BELOW_LIMIT
    assert float(c.cmf) == pytest.approx((0.155 + 80.2 / 90) / 0.155, rel=1e-12)
    # Lc 80 ft = 80 / 5280 mi, R 1000 ft: the factor as the equation gives it
    lc = 80 / 5280
    c = cf.curvature_cmf(80 * FT, 1000 * FT, 0.0)
    assert int(c.flags) == cf.LENGTH_BELOW_LIMIT
    assert float(c.cmf) == pytest.approx((1.55 * lc + 0.0802) / (1.55 * lc), rel=1e-12)
    assert cf.flag_text(int(c.flags)) == "curve length below 100 ft (30.48 m)"
    # exactly 100 ft is inside
    assert int(cf.curvature_cmf(100 * FT, 100 * FT, 0.0).flags) == 0


def test_factor_below_one_is_flagged_not_clamped():
    # R 10000 ft, Lc 0.2 mi, S 1: (0.31 + 0.00802 - 0.012) / 0.31 = 0.30602 / 0.31 = 0.987161
    c = cf.curvature_cmf(0.2 * MI, 10000 * FT, 1.0)
    assert float(c.cmf) == pytest.approx(0.30602 / 0.31, rel=1e-12)
    assert int(c.flags) == cf.CMF_BELOW_ONE


@pytest.mark.parametrize(
    ("sv", "want"),
    [
        (-0.03, 1.0),  # above the design rate: Eq. 10-14's band, SV < 0.01
        (0.0, 1.0),
        (0.0099, 1.0),
        (0.01, 1.0),  # Eq. 10-15 at its lower edge: 1 + 6 x 0 = 1.00
        (0.015, 1.03),  # 1 + 6 x 0.005
        (0.0199, 1.0594),  # 1 + 6 x 0.0099
        (0.02, 1.06),  # Eq. 10-16 at its lower edge: 1.06 + 3 x 0
        (0.05, 1.15),  # 1.06 + 3 x 0.03
    ],
)
def test_superelevation_variance_bands(sv, want):
    assert float(cf.superelevation_variance_cmf(sv)) == pytest.approx(want, abs=1e-12)


def test_superelevation_variance_vectorised_and_nan():
    got = cf.superelevation_variance_cmf(np.array([0.0, 0.012, 0.03, np.nan]))
    assert got[:3] == pytest.approx([1.0, 1.012, 1.09], abs=1e-12)  # 1 + 6 x 0.002; 1.06 + 0.03
    assert np.isnan(got[3])
