"""The verdict is decided once, on unrounded values, and every face reads it.

The boundary case: AASHTO Green Book 7th ed. (2018) Table 3-7, 100 km/h, e_max 8 %,
f_max 0.12: R_min = V^2 / (127 (e_max + f_max)) = 100^2 / (127 x 0.20) = 393.700787... m
(Eq. 3-10; the Ethiopian Roads Authority Geometric Design Manual 2002 ch. 8 works the
same bend to 393.7 m). A radius a hair above it passes, a hair below fails; the record,
the working, the batch row and the worksheet must say the same on both sides, though
every one of them shows the radius rounded to 393.7 m.
"""

from __future__ import annotations

import csv
import io

import pytest

from curvetui.batch.stream import batch_bytes
from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC
from curvetui.reports.working import road_working
from curvetui.storage.tables import rail_limits, road_table

R_MIN = 100.0**2 / (127.0 * (0.08 + 0.12))  # 393.7007874... m, by hand from Eq. 3-10

CASES = [
    (R_MIN * (1 + 2e-7), "pass"),  # 393.70086 m
    (R_MIN * (1 - 2e-7), "fail"),  # 393.70071 m
]


def _inputs(radius: float) -> dict:
    return {"speed": 100, "radius": radius, "emax": 8}


@pytest.mark.parametrize(("radius", "want"), CASES)
def test_record_and_working_agree_at_the_minimum_radius(radius, want):
    table, limits = road_table(None, "metric"), rail_limits(None, "metric")
    record = check_bend("road", _inputs(radius), METRIC, table, limits)
    assert record.checks["radius"] == want
    assert (record.status == "fail") == (want == "fail")
    assert any(m.code == "radius_below_minimum" for m in record.messages) == (want == "fail")
    steps = road_working(record.to_json(), table, METRIC)
    line = next(s for s in steps if s.label == "Minimum radius")
    assert line.check == want
    assert f"{record.to_json()['min_radius']:.1f}" == "393.7"  # what every face shows


@pytest.mark.parametrize(("radius", "want"), CASES)
def test_batch_row_agrees_at_the_minimum_radius(radius, want):
    text = f"id,kind,speed,radius,emax\nB1,road,100,{radius!r},8\n"
    data, _ = batch_bytes(text, METRIC, road_table(None, "metric"), rail_limits(None, "metric"))
    row = next(csv.DictReader(io.StringIO(data.decode("utf-8"))))
    assert row["status"] == want
    assert ("FAIL radius" in row["messages"]) == (want == "fail")
