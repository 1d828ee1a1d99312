"""A road bend's transition: spiral rules only with a spiral, runoff placement without.

Sources (../shared/REFERENCES.md, "Transitions: bends with and without spirals"):
Highway Engineering Handbook, "Superelevation Position" (read): with spirals the runoff
is run within the spiral; without, two-thirds of full superelevation at the PC and PT.
Rosenow (MnDOT 2015, abstract, read): AASHTO advises 60 to 90 % of the runoff on the
tangent. b_w = (1 + 0.5 (n1 - 1)) / n1 (read, design sheet citing AASHTO). US comfort
rate C = 4 ft/s^3: from memory, unconfirmed.
"""

from __future__ import annotations

import pytest

from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC, US
from curvetui.storage.tables import rail_limits, road_table


def record(units, **inputs):
    table = road_table(None, units.name)
    return check_bend("road", inputs, units, table, rail_limits(None, units.name))


def codes(rec) -> list[str]:
    return [m.code for m in rec.messages]


@pytest.mark.parametrize(
    ("units", "speed", "radius", "emax"),
    [
        # Green Book 2018 Table 3-7: 35 mph, e_max 10 %, f_max 0.18 -> R_min 292 ft
        (US, 35, 300, 10),
        # Table 3-7 metric: 50 km/h, e_max 8 %, f_max 0.19 -> R_min 73.7 m
        (METRIC, 50, 80, 8),
    ],
)
def test_bend_without_spiral_never_fails_on_spiral_rules(units, speed, radius, emax):
    rec = record(units, speed=speed, radius=radius, emax=emax)
    assert rec.status == "pass" and rec.checks["transition"] == "pass"
    assert "spiral_not_suitable" in codes(rec)  # no length fits: said, as a note
    note = next(m for m in rec.messages if m.code == "spiral_not_suitable")
    assert note.severity == "note"


def test_the_same_bend_with_a_spiral_fails_when_no_length_fits():
    rec = record(US, speed=35, radius=300, emax=10, spiral_in=150)
    assert rec.status == "fail" and rec.checks["transition"] == "fail"
    assert "no_spiral_length_fits" in codes(rec)


def test_runoff_placement_stations_of_a_simple_curve():
    rec = record(METRIC, speed=80, radius=400, emax=8, deflection=30, pi_station="1+000")
    t, g = rec.to_json()["transition"], rec.to_json()["geometry"]
    lr, lt, pc, pt = t["runoff"], t["runout"], g["pc"], g["pt"]
    # two-thirds of the runoff on the tangent (Highway Engineering Handbook), by hand
    assert t["runoff_on_tangent"] == pytest.approx(2 / 3, abs=1e-6)
    assert t["level_crown_in"] == pytest.approx(pc - 2 / 3 * lr, abs=1e-5)
    assert t["full_superelevation_in"] == pytest.approx(pc + lr / 3, abs=1e-5)
    assert t["full_superelevation_out"] == pytest.approx(pt - lr / 3, abs=1e-5)
    assert t["runout_start"] == pytest.approx(pc - 2 / 3 * lr - lt, abs=1e-5)
    assert t["runout_end"] == pytest.approx(pt + 2 / 3 * lr + lt, abs=1e-5)
    # 80 % on the tangent, inside AASHTO's 60 to 90 %
    rec80 = record(METRIC, speed=80, radius=400, emax=8, deflection=30, runoff_on_tangent=0.8)
    t80, g80 = rec80.to_json()["transition"], rec80.to_json()["geometry"]
    assert t80["level_crown_in"] == pytest.approx(g80["pc"] - 0.8 * t80["runoff"], abs=1e-5)
    bad = record(METRIC, speed=80, radius=400, runoff_on_tangent=0.95)
    assert bad.status == "error" and "0.6 to 0.9" in bad.messages[0].text


def test_curve_too_short_for_full_superelevation_is_a_warning():
    # a 2-degree bend on R 400 m is 14 m long, less than a third of the runoff at each end
    rec = record(METRIC, speed=80, radius=400, emax=8, deflection=2)
    assert rec.status == "pass"
    warn = next(m for m in rec.messages if m.code == "curve_too_short_for_full_superelevation")
    assert warn.severity == "warning"


def test_lanes_rotated_scale_the_runoff_by_n1_bw():
    # n1 = 2: w n1 b_w = w x 2 x 0.75 = 1.5 w, so the runoff is 1.5 times one lane's
    one = record(METRIC, speed=80, radius=400, emax=8).to_json()["transition"]["runoff"]
    two = record(METRIC, speed=80, radius=400, emax=8, lanes_rotated=2)
    assert two.to_json()["transition"]["runoff"] == pytest.approx(1.5 * one, rel=1e-5)


def test_us_comfort_length_uses_4_ft_per_s3():
    # v^3 / (C R): 50 mph = 73.333 ft/s, R 1000 ft, C 4 ft/s^3 -> 98.59 ft (by hand)
    t = record(US, speed=50, radius=1000, emax=8).to_json()["transition"]
    assert t["length_comfort"] == pytest.approx(73.3333**3 / (4 * 1000), rel=1e-4)
