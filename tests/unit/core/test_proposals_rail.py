"""Rail proposals (curvetui.core.proposals_rail) against published values and hand
calculation.

Sources:
- 49 CFR 213 Appendix A, Table 1 (read, via REFERENCES): with 3 in of unbalance a curve of
  2 deg 00 min allows 46, 53, 60, 65, 71, 76, 80 mph at 0 ... 6 in of cant, rounded to the
  nearest mph, from V = sqrt((Ea + Eu) / (0.0007 D)) (49 CFR 213.57, read). Where the
  table's speed was rounded down (46, 53, 65, 80 mph) the least cant on the 1/4 in step
  that keeps the deficiency within 3 in is the table's cant itself.
- E = 11.8 V^2 / R (mm, km/h, m; derived from s = 1500 mm, REFERENCES) for the least
  radius in hand calculation; the EN 13803 limits used (cant 180 mm, deficiency 160 mm,
  excess 130 mm at 160 km/h) are the shipped file's, from memory.
The 5 mm / 1/4 in cant step and the targets are common practice, no source.
"""

from __future__ import annotations

import math

import pytest

from curvetui.core import proposals_rail as pr
from curvetui.core.units import FOOT, INCH, KMH, MPH
from curvetui.storage.tables import rail_limits

EN = rail_limits(None, "metric")
CFR = rail_limits("49cfr213-class3-5", "us")


@pytest.mark.parametrize("mph, cant_in", [(46, 0.0), (53, 1.0), (65, 3.0), (80, 6.0)])
def test_least_cant_on_a_2_degree_curve_is_the_cfr_table_cant(mph, cant_in):
    r = 5729.5779513 / 2.0 * FOOT  # 2 deg 00 min, arc definition
    p = pr.propose_rail(CFR, mph * MPH, None, r, CFR.rail_centres, "us")
    assert p.rule == "recommended deficiency"
    assert p.cant / INCH == pytest.approx(cant_in, abs=1e-9)
    # hand: the deficiency left, 0.0007 x 2 x V^2 - Ea, is within 3 in
    assert 0.0007 * 2 * mph**2 - cant_in <= 3.0 + 1e-9


def test_least_radius_for_the_fast_train_alone_is_the_cfr_formula():
    # D = (Ea + Eu) / (0.0007 V^2) = (7 + 3) / (0.0007 x 60^2) degrees, R = 5729.58 / D ft
    d = 10.0 / (0.0007 * 60**2)
    r = pr.least_radius(CFR, 60 * MPH, None, CFR.rail_centres) / FOOT
    assert r == pytest.approx(5729.5779513 / d, rel=1e-6)


def test_least_radius_for_both_trains_by_hand():
    s = EN.rail_centres
    fast = pr.least_radius(EN, 160 * KMH, None, s)
    # 11.8 x 160^2 / (180 + 160) = 888.5 m (the constant 11.8 is rounded: 0.1 %)
    assert fast == pytest.approx(11.8 * 160**2 / 340, rel=1e-3)
    both = pr.least_radius(EN, 160 * KMH, 40 * KMH, s)
    # 11.8 x (160^2 - 40^2) / (160 + 130) = 976.6 m
    assert both == pytest.approx(11.8 * (160**2 - 40**2) / 290, rel=1e-3)


def test_no_cant_fits_gives_the_least_radius_on_the_step_where_one_does():
    p = pr.propose_rail(EN, 160 * KMH, 40 * KMH, 500.0, EN.rail_centres, "metric")
    assert p.radius_changed and p.radius % 5.0 == 0
    assert p.radius >= p.radius_least
    band = p.band
    assert band.lo - 1e-9 <= p.cant <= band.hi + 1e-9
    assert (p.cant / 0.005) == pytest.approx(round(p.cant / 0.005), abs=1e-9)
    below = pr.band_at(EN, 160 * KMH, 40 * KMH, p.radius - 5.0, EN.rail_centres)
    assert math.isnan(pr.cant_on_step(below, 0.1, 0.005))


def test_balancing_target_uses_the_same_share_of_both_limits():
    p = pr.propose_rail(EN, 120 * KMH, 60 * KMH, 1000.0, EN.rail_centres, "metric")
    b = p.band
    # same share: (E_f - t) / I = (t - E_s) / X
    assert (b.e_fast - p.target) / b.deficiency_max == pytest.approx(
        (p.target - b.e_slow) / b.excess_max, rel=1e-12
    )
    assert abs(p.cant - p.target) <= 0.0025 + 1e-12  # the nearest 5 mm step
