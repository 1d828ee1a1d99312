"""Curve crash factors through the one bend path: check, JSON, batch column, working line.

Expected values are hand arithmetic on HSM 1st ed. (2010) Eq. 10-13 and Eqs. 10-14..16 (see
../shared/REFERENCES.md: the two "derived" checks 1.5174 and 1.9574), the bends built so that
the circular arc is exactly 0.1 mi = 528 ft: a simple curve's arc is R x deflection (rad); a
clothoid of length Ls turns Ls / (2 R) rad, so with spirals the arc is R (deflection -
Ls_in / (2 R) - Ls_out / (2 R)) (textbook clothoid geometry, from memory).
"""

from __future__ import annotations

import csv
import io
import math

import pytest

from curvetui.batch.stream import batch_bytes
from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC, US
from curvetui.reports.working import road_working
from curvetui.storage.tables import rail_limits, road_table

FT = 0.3048  # m, exact
CMF_1000_FT = 0.2352 / 0.155  # (1.55 x 0.1 + 80.2 / 1000) / (1.55 x 0.1) = 1.51742
CMF_500_FT_S1 = 0.3034 / 0.155  # (0.155 + 80.2 / 500 - 0.012) / 0.155 = 1.95742


def record(units, **inputs) -> dict:
    rec = check_bend(
        "road", inputs, units, road_table(None, units.name), rail_limits(None, "metric")
    )
    return rec.to_json()


def deg(rad: float) -> float:
    return math.degrees(rad)


def test_us_simple_curve_derived_check():
    rec = record(US, speed=50, radius=1000, deflection=deg(528 / 1000))
    c = rec["crash"]
    assert c["curvature_cmf"] == pytest.approx(CMF_1000_FT, rel=1e-5)  # record: 6 figures
    assert c["curve_length_mi"] == pytest.approx(0.1, rel=1e-6)
    assert c["radius_ft"] == 1000
    assert c["spirals"] == 0
    assert c["curvature_validity"] == "in range"
    assert "superelevation_variance" not in c  # no built e given: no SV factor
    assert not any(m["code"] == "crash_factor_outside_range" for m in rec["messages"])


def test_metric_bend_equal_to_the_us_one():
    # 1000 ft = 304.8 m exactly; the same deflection gives the same 528 ft arc
    rec = record(METRIC, speed=80, radius=304.8, deflection=deg(528 / 1000))
    assert rec["crash"]["curvature_cmf"] == pytest.approx(CMF_1000_FT, rel=1e-5)
    assert rec["crash"]["radius_ft"] == pytest.approx(1000, rel=1e-9)


def test_spirals_both_ends_derived_check():
    # R 500 ft, Ls 100 ft each end: deflection = 528 / 500 + 2 x 100 / (2 x 500) rad
    rec = record(US, speed=50, radius=500, deflection=deg(528 / 500 + 0.2), spiral_in=100)
    assert rec["geometry"]["circular_length"] == pytest.approx(528, abs=1e-5)
    assert rec["crash"]["spirals"] == 1
    assert rec["crash"]["curvature_cmf"] == pytest.approx(CMF_500_FT_S1, rel=1e-5)


def test_spiral_at_one_end():
    # S 0.5: (0.155 + 0.1604 - 0.006) / 0.155 = 0.3094 / 0.155 = 1.996129
    rec = record(
        US, speed=50, radius=500, deflection=deg(528 / 500 + 0.1), spiral_in=100, spiral_out=0
    )
    assert rec["crash"]["spirals"] == 0.5
    assert rec["crash"]["curvature_cmf"] == pytest.approx(0.3094 / 0.155, rel=1e-5)


@pytest.mark.parametrize(
    ("built", "sv", "cmf_sv"),
    [
        (8.0, 0.0, 1.0),  # no variance
        (7.5, 0.005, 1.0),  # Eq. 10-14, SV < 0.01
        (7.0, 0.01, 1.0),  # Eq. 10-15 at its lower edge
        (6.5, 0.015, 1.03),  # 1 + 6 x 0.005
        (6.0, 0.02, 1.06),  # Eq. 10-16 at its lower edge
        (4.0, 0.04, 1.12),  # 1.06 + 3 x 0.02
    ],
)
def test_superelevation_variance_bands(built, sv, cmf_sv):
    # R 700 ft at 50 mph is below R_min (757.6 ft at e_max 8 %), so the design e is e_max
    # = 8 % (the distribution reaches e_max at R_min: Green Book 2018 3.3.5)
    rec = record(
        US, speed=50, radius=700, emax=8, superelevation=built, deflection=deg(0.528 * 10 / 7)
    )
    c = rec["crash"]
    assert rec["superelevation_design"] == pytest.approx(8.0)
    assert c["superelevation_variance"] == pytest.approx(sv, abs=1e-9)
    assert c["superelevation_cmf"] == pytest.approx(cmf_sv, abs=1e-9)
    # arc 528 ft at R 700 ft: (0.155 + 80.2 / 700) / 0.155
    curv = (0.155 + 80.2 / 700) / 0.155
    assert c["curvature_cmf"] == pytest.approx(curv, rel=1e-5)
    assert c["cmf"] == pytest.approx(curv * cmf_sv, rel=1e-5)


def test_radius_below_100_ft_flagged_with_a_warning():
    # R 90 ft, arc 150 ft (95.5 deg): Lc = 150 / 5280 = 0.0284091 mi, 1.55 Lc = 0.0440341;
    # (0.0440341 + 80.2 / 90) / 0.0440341 = (0.0440341 + 0.891111) / 0.0440341 = 21.2368
    rec = record(US, speed=20, radius=90, deflection=deg(150 / 90))
    c = rec["crash"]
    lc = 150 / 5280
    assert c["curvature_cmf"] == pytest.approx((1.55 * lc + 80.2 / 90) / (1.55 * lc), rel=1e-5)
    assert c["curvature_cmf"] == pytest.approx(21.2368, abs=1e-4)
    assert c["curvature_validity"] == "radius below 100 ft (30.48 m)"
    warn = [m for m in rec["messages"] if m["code"] == "crash_factor_outside_range"]
    assert len(warn) == 1 and warn[0]["severity"] == "warning" and warn[0]["part"] == "crash"
    assert "not clamped" in warn[0]["text"]


def test_curve_length_below_100_ft_flagged():
    # arc 80 ft at R 1000 ft: Lc = 80 / 5280 mi; (1.55 Lc + 0.0802) / (1.55 Lc) = 4.414839
    rec = record(US, speed=50, radius=1000, deflection=deg(80 / 1000))
    lc = 80 / 5280
    assert rec["crash"]["curvature_cmf"] == pytest.approx(
        (1.55 * lc + 0.0802) / (1.55 * lc), rel=1e-5
    )
    assert rec["crash"]["curvature_validity"] == "curve length below 100 ft (30.48 m)"


def test_no_deflection_no_factor_said_plainly():
    rec = record(US, speed=50, radius=1000, superelevation=6)
    assert "crash" not in rec
    steps = road_working(rec, road_table(None, "us"), US)
    line = [s for s in steps if s.label == "Curve crash factor"]
    assert len(line) == 1 and "without a deflection" in line[0].substituted
    assert line[0].result == "none"


def test_working_line_substituted_and_noted():
    rec = record(US, speed=20, radius=90, deflection=deg(150 / 90))
    (line,) = [s for s in road_working(rec, road_table(None, "us"), US) if "curvature" in s.label]
    assert line.substituted == (
        "CMF = (1.55 x 150.000000 / 5280 + 80.2 / (90) - 0.012 x 0) / (1.55 x 150.000000 / 5280)"
    )
    assert line.result.startswith("21.2368")
    assert "rural two-lane roads; HSM 1st ed. 2010 Eq. 10-13" in line.source
    assert "outside the range: radius below 100 ft" in line.result
    # metric: the conversions are written in the line
    rec = record(METRIC, speed=80, radius=304.8, deflection=deg(528 / 1000))
    (line,) = [
        s for s in road_working(rec, road_table(None, "metric"), METRIC) if "curvature" in s.label
    ]
    assert "/ 1609.344" in line.substituted and "80.2 / (304.8 / 0.3048)" in line.substituted


def _batch(text: str, units=US) -> list[dict]:
    data, _ = batch_bytes(text, units, road_table(None, units.name), rail_limits(None, "metric"))
    return list(csv.DictReader(io.StringIO(data.decode("utf-8"))))


def test_batch_column():
    d1, d2 = deg(528 / 1000), deg(528 / 500 + 0.2)
    rows = _batch(
        "kind,speed,radius,deflection,spiral\n"
        f"road,50,1000,{d1!r},\nroad,50,500,{d2!r},100\nroad,50,1000,,\n"
    )
    assert float(rows[0]["crash.curvature_cmf"]) == pytest.approx(CMF_1000_FT, rel=1e-5)
    assert float(rows[1]["crash.curvature_cmf"]) == pytest.approx(CMF_500_FT_S1, rel=1e-5)
    assert rows[2]["crash.curvature_cmf"] == ""  # no deflection on this row
    assert rows[0]["crash.curvature_validity"] == "in range"
    assert "crash.curve_length_mi" not in rows[0]  # working values stay in JSON


def test_batch_without_deflection_column_has_no_crash_columns():
    rows = _batch("kind,speed,radius\nroad,50,1000\n")
    assert not any(k.startswith("crash.") for k in rows[0])
