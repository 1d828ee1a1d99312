"""Checks between consecutive bends on hand-made chains.

Geometry by hand with the simple-curve tangent T = R tan(D/2) (any surveying text). The
rules and their sources (REFERENCES.md):
- the runoff a bend without spirals puts on the tangent: runoff_on_tangent x L_r, with
  L_r = (w n1) e b_w / Delta (Highway Engineering Handbook and AASHTO as cited by MnDOT
  2015, "Transitions"); the reverse pair's need is the sum (derived from that placement);
- broken-back: tangent at least 15 V ft, V in mph (TxDOT Roadway Design Manual, read);
- compound: larger / smaller radius at most 1.5 (TxDOT Roadway Design Manual, read).
"""

import math

import pytest
from chains import chain

from curvetui.core.alignment import build_alignment
from curvetui.core.alignment_checks import (
    BROKEN_BACK,
    COMPOUND_RATIO,
    FAIL,
    OVERLAP,
    REVERSE_RUNOFF,
    WARNING,
    BendFacts,
    broken_back_minimum,
    check_consecutive,
)

MPH = 0.44704  # m/s, exact
FT = 0.3048  # m, exact


def road(name, radius, speed=25.0, share=0.0):
    return BendFacts(name, "road", speed, radius, share, share)


def verdicts(bearings, legs, radii, facts):
    return check_consecutive(build_alignment(chain(bearings, legs), radii), facts)


def test_overlapping_bends_fail_with_the_overlap():
    # R 400, D 60 each: T = 400 tan 30 = 230.940 m; 2T on a 300 m leg: -161.880 m of tangent
    out = verdicts([0, 60, 0], [1000, 300, 1000], [400, 400], [road("A", 400), road("B", 400)])
    assert [(v.severity, v.code) for v in out] == [(FAIL, OVERLAP)]
    assert out[0].value == pytest.approx(300 - 2 * 400 * math.tan(math.radians(30)))
    assert "FAIL A to B" in out[0].text and "161.88 m" in out[0].text


def test_start_point_inside_the_first_bend_fails():
    # T = 400 tan 30 = 230.94 m on a 200 m leg from the start point
    out = verdicts([0, 60], [200, 1000], [400], [road("A", 400)])
    assert [(v.severity, v.code, v.first) for v in out] == [(FAIL, OVERLAP, -1)]


# two reverse simple curves, R 300 m, D 20 deg: T = 300 tan 10 deg = 52.898 m each
T300 = 300 * math.tan(math.radians(10))
# runoffs by hand, L_r = (w n1) e b_w / Delta, one 3.6 m lane, b_w = 1, Delta 0.50 %:
LR_A = 3.6 * 1 * 0.08 * 1 / 0.005  # 57.6 m at e 8 %
LR_B = 3.6 * 1 * 0.06 * 1 / 0.005  # 43.2 m at e 6 %
SHARE_A, SHARE_B = LR_A * 2 / 3, LR_B * 0.6  # 38.4 m and 25.92 m: 64.32 m together


@pytest.mark.parametrize(("tangent", "warned"), [(64.0, True), (64.7, False)])
def test_reverse_tangent_must_hold_both_runoff_shares(tangent, warned):
    facts = [road("A", 300, share=SHARE_A), road("B", 300, share=SHARE_B)]
    out = verdicts([0, 20, 0], [1000, tangent + 2 * T300, 1000], [300, 300], facts)
    assert [v.code for v in out] == ([REVERSE_RUNOFF] if warned else [])
    if warned:
        v = out[0]
        assert v.severity == WARNING
        assert v.value == pytest.approx(tangent)
        assert v.limit == pytest.approx(64.32)
        for number in ("64.00 m", "64.32 m", "A 38.40 m", "B 25.92 m"):
            assert number in v.text, number


def test_spiralled_reverse_bends_need_no_tangent_for_runoff():
    # a spiralled bend runs its runoff in the spiral: 0 on the tangent (REFERENCES.md)
    facts = [road("A", 300), road("B", 300)]
    out = verdicts([0, 20, 0], [1000, 0.5 + 2 * T300, 1000], [300, 300], facts)
    assert out == []


def test_broken_back_below_15_v_feet():
    # 60 mph: 15 x 60 = 900 ft = 274.32 m (TxDOT, by hand)
    assert broken_back_minimum(60 * MPH) == pytest.approx(900 * FT)
    # metric, 100 km/h = 62.137 mph: 932.06 ft = 284.09 m (derived by hand)
    assert broken_back_minimum(100 / 3.6) == pytest.approx(15 * (100 / 1.609344) * FT)
    t = 500 * math.tan(math.radians(10))  # R 500, D 20 each way the same
    facts = [road("A", 500, 60 * MPH), road("B", 500, 50 * MPH)]  # the higher speed counts
    short = verdicts([0, 20, 40], [1000, 274.0 + 2 * t, 1000], [500, 500], facts)
    assert [v.code for v in short] == [BROKEN_BACK]
    assert short[0].limit == pytest.approx(274.32)
    assert "274.00 m" in short[0].text and "274.32 m" in short[0].text
    long = verdicts([0, 20, 40], [1000, 274.7 + 2 * t, 1000], [500, 500], facts)
    assert long == []


@pytest.mark.parametrize(("ratio", "warned"), [(1.49, False), (1.51, True)])
def test_compound_curve_radius_ratio(ratio, warned):
    # two bends the same way, D 10 deg each, the leg = T1 + T2: no tangent between them
    r1 = 1000.0
    r2 = r1 / ratio
    leg = (r1 + r2) * math.tan(math.radians(5))
    facts = [road("A", r1, 60 * MPH), road("B", r2, 60 * MPH)]
    out = verdicts([0, 10, 20], [1000, leg, 1000], [r1, r2], facts)
    assert [v.code for v in out] == ([COMPOUND_RATIO] if warned else [])
    if warned:
        assert out[0].value == pytest.approx(1.51)
        assert "ratio 1.510 above 1.5" in out[0].text


def test_rail_bends_get_only_the_overlap_check():
    t = 500 * math.tan(math.radians(10))
    facts = [BendFacts("A", "rail", 20.0, 500), BendFacts("B", "rail", 20.0, 500)]
    assert verdicts([0, 20, 40], [1000, 10 + 2 * t, 1000], [500, 500], facts) == []
    overlap = verdicts([0, 20, 40], [1000, 2 * t - 5, 1000], [500, 500], facts)
    assert [v.code for v in overlap] == [OVERLAP]
