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


# With a deflection (module docstring of curvetui.core.proposals_rail): two equal spirals
# of the transition length L fit while L / (2R) + L / (2R) <= Delta. The EN 13803 file's
# first band (V <= 160 km/h): cant 180 mm, deficiency 160 mm (recommended 130), cant
# gradient 2.5 mm/m, rate of cant 60 mm/s, rate of deficiency 70 mm/s, all from memory
# (the shipped file's values); the 5 mm / 5 m steps are common practice, no source.
V160 = 160 / 3.6  # [m/s]


def _e_fast_mm(radius: float) -> float:
    """E = s v^2 / (g R) in mm, s 1.5 m, g 9.80665 m/s^2 (by hand, EN 13803 form)."""
    return 1000 * 1.5 * V160**2 / (9.80665 * radius)


def _needed_5m(cant_mm: float, radius: float) -> float:
    """The longest of E / 2.5, E v / 60 and (E_f - E) v / 70 (mm, m/s: metres), rounded up
    to 5 m."""
    length = max(cant_mm / 2.5, cant_mm * V160 / 60, (_e_fast_mm(radius) - cant_mm) * V160 / 70)
    return 5.0 * math.ceil(length / 5.0 - 1e-12)


def test_a_deflection_too_short_for_the_targets_transition_moves_the_cant():
    # R 1500 m: E_f = 1.5 x 44.444^2 / (9.80665 x 1500) = 201.4 mm; target E_f - 130 =
    # 71.4 mm -> 70 mm on the step; its transition: (201.4 - 70) x 44.444 / 70 = 83.4 m,
    # rounded 85 m. Deflection 3 deg: R x Delta = 1500 x 0.05236 = 78.5 m < 85 m.
    # 75 mm: 80.3 -> 85 m; 80 mm: 77.1 -> 80 m (> 78.5); 85 mm: 73.9 -> 75 m, fits.
    assert _e_fast_mm(1500) == pytest.approx(201.43, abs=0.01)
    assert [_needed_5m(c, 1500) for c in (70, 75, 80, 85)] == [85, 85, 80, 75]
    p = pr.propose_rail(EN, 160 * KMH, None, 1500.0, 1.5, "metric", 20.0, math.radians(3.0))
    assert not p.radius_changed and p.radius == 1500.0
    assert p.cant == pytest.approx(0.085, abs=1e-12) and p.transition_length == 75.0
    assert p.passed_cant == pytest.approx(0.070, abs=1e-12) and p.passed_length == 85.0
    assert 2 * p.transition_length / (2 * p.radius) <= math.radians(3.0)


def test_no_cant_whose_transition_fits_raises_the_radius_to_the_least_that_fits():
    # Deflection 1.5 deg (0.026180 rad). At 2100 m, R x Delta = 54.98 m: the shortest
    # rounded transition is 55 m (65 mm: 48.1 m and (143.9 - 65) x 44.444 / 70 = 50.1 m;
    # 70 mm: 51.9 m), so nothing fits. At 2105 m, R x Delta = 55.11 m: 60 mm needs
    # (143.5 - 60) x 44.444 / 70 = 53.0 -> 55 m and fits; 55 mm needs 56.2 -> 60 m. The
    # target, E_f - 130 = 13.5 mm -> 15 mm, needs 81.6 -> 85 m: the fitting cant nearest it
    # is 60 mm. The given 1500 m is kept as the floor of the walk.
    d = math.radians(1.5)
    room = 2100 * d
    assert room == pytest.approx(54.978, abs=1e-3)
    assert min(_needed_5m(c, 2100) for c in range(0, 181, 5) if c >= _e_fast_mm(2100) - 160) > room
    assert _needed_5m(60, 2105) == 55 <= 2105 * d and _needed_5m(55, 2105) == 60
    p = pr.propose_rail(EN, 160 * KMH, None, 1500.0, 1.5, "metric", 20.0, d)
    assert p.radius_changed and p.radius_why == pr.RADIUS_DEFLECTION and p.radius == 2105.0
    assert p.cant == pytest.approx(0.060, abs=1e-12) and p.transition_length == 55.0
    assert p.passed_cant == pytest.approx(0.015, abs=1e-12)
    # the bound: a = 44.444 / 0.060, b = 44.444 / 0.070 (per m of cant), k = a b / (a + b)
    a, b = V160 / 0.060, V160 / 0.070
    bound = math.sqrt(a * b / (a + b) * 1.5 * V160**2 / (9.80665 * d))
    assert p.fit_bound == pytest.approx(bound, rel=1e-9) and bound <= 2105.0


def test_a_deflection_no_radius_fits_is_refused():
    # every cant's transition rounds up to 5 m at least, so R >= 5 m / Delta: 0.002 deg
    # needs R >= 143,000 m, beyond the 100,000 m allowed
    assert 5.0 / math.radians(0.002) > 100_000
    with pytest.raises(pr.NoRailProposal):
        pr.propose_rail(EN, 160 * KMH, None, 1500.0, 1.5, "metric", 20.0, math.radians(0.002), 1e5)
