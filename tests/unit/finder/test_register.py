"""finder.register: a found curve as register cells in the output units, speeds read from
properties, and how cells are written. Unit factors: the international foot 0.3048 m and
the mile 1609.344 m (both exact by the 1959 agreement); km/h = 1/3.6 m/s."""

from __future__ import annotations

import math

import pytest

from curvetui.core.curve_finder import FoundCurve
from curvetui.core.units import METRIC, US
from curvetui.finder.register import (
    SpeedSource,
    cell_text,
    curve_row,
    feature_speeds,
    speed_value,
)

CURVE = FoundCurve(
    begin=120.0, end=329.4391, radius=300.0, radii=(300.0,), deflection=-math.radians(40.0),
    direction="right", length=209.4391, spiral_in=0.0, spiral_out=0.0, shape="simple",
    fit_rms=0.012, relation="reverse", tangent_before=80.0,
)  # fmt: skip


def test_curve_row_metric_and_us():
    row = curve_row(CURVE, 2, "QM-1", "road", 1000.0, METRIC)
    assert row["id"] == "QM-1-2" and row["feature"] == "QM-1"
    assert row["begin_station"] == 1120.0 and row["end_station"] == pytest.approx(1329.4391)
    assert row["deflection"] == pytest.approx(40.0)  # unsigned, degrees
    assert (row["direction"], row["curve_type"], row["relation"]) == ("right", "simple", "reverse")
    us = curve_row(CURVE, 2, "QM-1", "road", 0.0, US)
    assert us["radius"] == pytest.approx(300.0 / 0.3048)
    assert us["tangent_before"] == pytest.approx(80.0 / 0.3048)
    assert us["fit_rms"] == pytest.approx(0.012 / 0.3048)


def test_first_curve_has_a_blank_tangent():
    first = FoundCurve(**{**CURVE.__dict__, "tangent_before": None, "relation": ""})
    row = curve_row(first, 1, "A", "rail", 0.0, METRIC)
    assert row["tangent_before"] is None and cell_text("tangent_before", None) == ""
    assert row["relation"] == "" and row["kind"] == "rail"


@pytest.mark.parametrize(
    "value, units, expected",
    [
        (50, METRIC, 50.0),
        ("60", METRIC, 60.0),
        (" 30 mph ", METRIC, 30 * 1.609344),
        ("50 km/h", US, 50 / 1.609344),
        ("45 MPH", US, 45.0),
        ("fast", METRIC, None),
        ("", METRIC, None),
        (0, METRIC, None),
        (float("nan"), METRIC, None),
        (True, METRIC, None),
    ],
)
def test_speed_value(value, units, expected):
    got = speed_value(value, units)
    assert got == (None if expected is None else pytest.approx(expected, rel=1e-12))


def test_feature_speeds_fallbacks_and_problems():
    problems: list[str] = []
    both = SpeedSource(speed=70.0, speed_field="design", posted_field="limit")
    assert feature_speeds({"design": "80", "limit": 60}, both, METRIC, problems, "A") == (80, 60)
    assert feature_speeds({"limit": 60}, both, METRIC, problems, "B") == (70.0, 60)
    assert problems == ["feature B: no 'design' value; --speed 70 used"]
    posted_only = SpeedSource(posted_field="limit")
    assert posted_only.posted_as_speed
    assert feature_speeds({"limit": "x"}, posted_only, METRIC, problems, "C") == (None, None)
    assert problems[-1] == "feature C: 'limit' is 'x', not a speed; left blank"
    field_only = SpeedSource(speed_field="design")
    assert feature_speeds({"design": None}, field_only, METRIC, problems, "D") == (None, None)
    assert problems[-1] == "feature D: no 'design' value; left blank"


@pytest.mark.parametrize(
    "name, value, text",
    [
        ("radius", 299.99951, "300"),
        ("radius", 300.1234, "300.123"),
        ("deflection", 40.000049, "40"),
        ("begin_station", -0.0001, "0"),
        ("speed", 80.0, "80"),
        ("radius", math.nan, ""),
        ("feature", "QM-1", "QM-1"),
        ("lanes", 2, "2"),
    ],
)
def test_cell_text(name, value, text):
    assert cell_text(name, value) == text


def test_the_register_names_the_columns_batch_reads():
    from curvetui.bend.fields import REGISTER_FIELDS, column_names
    from curvetui.finder.register import COLUMNS

    # batch places curves in series by these (bend/fields.py REGISTER_FIELDS) and checks
    # each by these inputs: the register must write them under the same names
    assert {f.key for f in REGISTER_FIELDS} <= set(COLUMNS)
    assert {"radius", "deflection", "spiral_in", "spiral_out", "speed", "posted_speed"} <= (
        set(COLUMNS) & set(column_names())
    )
