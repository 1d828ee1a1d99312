"""'A spiral is not needed': the largest radius that uses a spiral, by design speed.

Source: AASHTO Green Book 2018, the table "Maximum radius for use of a spiral curve
transition" -- every value below is FROM MEMORY, unconfirmed (the table files say so), as
is the relation they follow, a lateral acceleration of about 1.3 m/s^2 (4.25 ft/s^2):
R = v^2 / 1.3. Above that radius a bend gets a note, never a failure. The bends checked are
invented.
"""

from __future__ import annotations

import pytest

from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC, US
from curvetui.storage.tables import TableError, parse_road_table, rail_limits, road_table

# from memory (Green Book 2018, maximum radius for use of a spiral curve transition)
METRIC_R = {20: 24, 30: 54, 40: 95, 50: 148, 60: 213, 70: 290, 80: 379, 90: 480, 100: 592}
METRIC_R |= {110: 716, 120: 852, 130: 1000}
US_R = {15: 114, 20: 203, 25: 317, 30: 456, 35: 620, 40: 810, 45: 1025, 50: 1265, 55: 1531}
US_R |= {60: 1822, 65: 2138, 70: 2479, 75: 2846, 80: 3238}
TABLES = [
    ("aashto-2018-metric", "metric", METRIC_R),
    ("aashto-2018-us", "us", US_R),
    ("aashto-2018-low-speed-metric", "metric", {v: r for v, r in METRIC_R.items() if v <= 70}),
    ("aashto-2018-low-speed-us", "us", {v: r for v, r in US_R.items() if v <= 45}),
]


def road(table: str, units_name: str, **inputs):
    units = METRIC if units_name == "metric" else US
    t = road_table(table, units_name)
    return check_bend("road", inputs, units, t, rail_limits(None, units_name))


def notes(rec) -> list[str]:
    return [m.code for m in rec.messages]


@pytest.mark.parametrize(("name", "units", "values"), TABLES)
def test_each_table_row_carries_the_remembered_radius(name, units, values):
    t = road_table(name, units)
    given = {
        int(v): float(r)
        for v, r in zip(t.speeds, t.spiral_radius_max, strict=True)
        if r == r  # rows without one (15 km/h, 10 mph) hold NaN
    }
    assert given == values
    assert "FROM MEMORY" in t.spiral_radius_max_source


def test_the_remembered_values_follow_v2_over_1_3():
    # by hand: v = V / 3.6 m/s (metric) or V x 22/15 ft/s (US); R = v^2 / a, within 1.5 %
    for speed, r in METRIC_R.items():
        assert r == pytest.approx((speed / 3.6) ** 2 / 1.3, rel=0.015), speed
    for speed, r in US_R.items():
        assert r == pytest.approx((speed * 22 / 15) ** 2 / 4.25, rel=0.015), speed


@pytest.mark.parametrize(("name", "units", "values"), TABLES)
def test_a_note_above_the_radius_and_none_at_it(name, units, values):
    for speed, r in values.items():
        at = road(name, units, speed=speed, radius=r, emax=6)
        above = road(name, units, speed=speed, radius=r + 1, emax=6)
        assert "spiral_not_needed" not in notes(at), speed
        assert "spiral_not_needed" in notes(above), speed
        note = next(m for m in above.messages if m.code == "spiral_not_needed")
        assert note.severity == "note" and note.part == "transition"
        assert note.text.startswith("a spiral is not needed here")
        assert note.values["transition.spiral_radius_max"] == r


def test_never_a_failure_with_a_spiral_or_without():
    # 100 km/h, R 800 m (above the 592 m remembered), e_max 8 %: a passing bend stays one
    plain = road("aashto-2018-metric", "metric", speed=100, radius=800, deflection=20)
    spiral = road(
        "aashto-2018-metric", "metric", speed=100, radius=800, deflection=20, spiral_in=80
    )
    for rec in (plain, spiral):
        assert rec.status == "pass" and "spiral_not_needed" in notes(rec)
        assert rec.checks["transition"] == "pass"


def test_between_rows_the_radius_is_interpolated():
    # 55 km/h lies half way between 50 (148 m) and 60 (213 m): 180.5 m by hand
    rec = road("aashto-2018-metric", "metric", speed=55, radius=181)
    assert rec.to_json()["transition"]["spiral_radius_max"] == pytest.approx(180.5, abs=1e-9)
    assert "spiral_not_needed" in notes(rec)
    assert "spiral_not_needed" not in notes(
        road("aashto-2018-metric", "metric", speed=55, radius=180)
    )


def test_no_note_where_the_table_gives_no_radius():
    # 15 km/h: the remembered table starts at 20 km/h
    rec = road("aashto-2018-metric", "metric", speed=15, radius=5000)
    assert "spiral_not_needed" not in notes(rec)
    assert rec.to_json()["transition"]["spiral_radius_max"] is None


def test_a_file_giving_radii_must_name_their_source():
    data = {
        "table": {
            "name": "x",
            "units": "metric",
            "source": "invented for the test",
            "point_mass_constant": 127,
            "distribution": "linear",
            "emax": {"default": 8, "min": 4, "max": 12},
        },
        "rows": [
            {"speed": 50, "side_friction_max": 0.2, "relative_gradient": 0.6, "source": "x"},
            {
                "speed": 60,
                "side_friction_max": 0.18,
                "relative_gradient": 0.5,
                "spiral_radius_max": 200,
                "source": "x",
            },
        ],
    }
    with pytest.raises(TableError, match="spiral_radius_max_source"):
        parse_road_table(data)
    data["table"]["spiral_radius_max_source"] = "invented"
    assert parse_road_table(data).spiral_radius_max_source == "invented"
