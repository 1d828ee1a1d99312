"""Low-speed urban streets: the Method 2 tables against Green Book Table 3-7 and by hand.

Sources:
- f_max: AASHTO Green Book 7th ed. 2018, Table 3-7, rows 10-45 mph and 15-70 km/h (read;
  ../shared/REFERENCES.md, "Road bends"). That Method 2 on low-speed urban streets uses
  these same f_max values is FROM MEMORY (the tables' provenance says so).
- R_min = V^2 / (C (e_max + f_max)), C = 15 (mph, ft) or 127 (km/h, m): Green Book 2018
  Eq. 3-10 (read, REFERENCES).
- Method 2 (Green Book 2018 section 3.3.5, the list of distribution methods; from memory):
  friction carries V^2/(C R) up to f_max, then e = V^2/(C R) - f_max up to e_max; the crown
  is kept while V^2/(C R) + e_NC <= f_max. Each expected value below is worked by hand in
  the test from those formulas and the literal f_max, never by the engine.
"""

from __future__ import annotations

import json

import pytest

from curvetui.bend.service import check_bend
from curvetui.cli import main
from curvetui.core.units import METRIC, US
from curvetui.storage.tables import rail_limits, road_table

US_TABLE, METRIC_TABLE = "aashto-2018-low-speed-us", "aashto-2018-low-speed-metric"
# Green Book 2018 Table 3-7, read (REFERENCES)
US_F = {10: 0.38, 15: 0.32, 20: 0.27, 25: 0.23, 30: 0.20, 35: 0.18, 40: 0.16, 45: 0.15}
METRIC_F = {15: 0.40, 20: 0.35, 30: 0.28, 40: 0.23, 50: 0.19, 60: 0.17, 70: 0.15}


def road(units, table: str, **inputs):
    t = road_table(table, units.name)
    return check_bend("road", inputs, units, t, rail_limits(None, units.name))


def test_the_tables_carry_table_3_7s_low_speed_rows():
    us, metric = road_table(US_TABLE), road_table(METRIC_TABLE)
    assert dict(zip(us.speeds.tolist(), us.side_friction_max.tolist(), strict=True)) == US_F
    assert dict(zip(metric.speeds.tolist(), metric.side_friction_max.tolist(), strict=True)) == (
        METRIC_F
    )
    assert us.distribution == metric.distribution == "aashto-method-2"
    assert all("from memory" in s for s in (*us.row_sources, *metric.row_sources))


@pytest.mark.parametrize("emax", [4, 6])
@pytest.mark.parametrize(
    ("units", "table", "c", "f_by_speed"),
    [(US, US_TABLE, 15, US_F), (METRIC, METRIC_TABLE, 127, METRIC_F)],
)
def test_minimum_radius_is_eq_3_10_with_table_3_7(units, table, c, f_by_speed, emax):
    for speed, f in f_by_speed.items():
        rec = road(units, table, speed=speed, radius=5000, emax=emax)
        assert rec.values["min_radius"] == pytest.approx(
            speed**2 / (c * (emax / 100 + f)), rel=1e-9
        ), speed


def test_minimum_radius_printed_as_table_3_7_rounds():
    # by hand: 30 mph, e 4 %: 900 / (15 x 0.24) = 250 ft; 45 mph, e 6 %: 2025 / (15 x 0.21)
    # = 642.86 -> 643 ft; 50 km/h, e 4 %: 2500 / (127 x 0.23) = 85.59 -> 86 m
    assert road(US, US_TABLE, speed=30, radius=900, emax=4).values["min_radius_rounded"] == 250
    assert road(US, US_TABLE, speed=45, radius=900, emax=6).values["min_radius_rounded"] == 643
    rec = road(METRIC, METRIC_TABLE, speed=50, radius=900, emax=4)
    assert rec.values["min_radius_rounded"] == 86


# (radius, demand V^2/(C R), design e %, e in use %, section), all by hand
US_30_MPH = [
    # 30 mph, f_max 0.20, e_max 4 %, e_NC 2 %: V^2/15 = 60
    (240, 60 / 240, 4.0, 4.0, "at e_max"),  # 0.25 - 0.20 = 0.05 -> capped at 4 %
    (255, 60 / 255, 100 * (60 / 255 - 0.20), 100 * (60 / 255 - 0.20), "superelevated"),
    (280, 60 / 280, 100 * (60 / 280 - 0.20), 2.0, "remove adverse crown"),  # 1.43 % < e_NC
    (300, 0.20, 0.0, 2.0, "remove adverse crown"),  # 0.20 + 0.02 > f_max: crown removed
    (340, 60 / 340, 0.0, -2.0, "normal crown"),  # 0.1765 + 0.02 = 0.1965 <= 0.20
    (500, 0.12, 0.0, -2.0, "normal crown"),
]
METRIC_50_KMH = [
    # 50 km/h, f_max 0.19, e_max 4 %: V^2/127 = 19.685
    (80, 2500 / (127 * 80), 4.0, 4.0, "at e_max"),
    (90, 2500 / (127 * 90), 100 * (2500 / (127 * 90) - 0.19), None, "superelevated"),
    (100, 2500 / (127 * 100), 100 * (2500 / (127 * 100) - 0.19), 2.0, "remove adverse crown"),
    (150, 2500 / (127 * 150), 0.0, -2.0, "normal crown"),  # 0.131 + 0.02 <= 0.19
]


@pytest.mark.parametrize(
    ("units", "table", "speed", "f_max", "rows"),
    [(US, US_TABLE, 30, 0.20, US_30_MPH), (METRIC, METRIC_TABLE, 50, 0.19, METRIC_50_KMH)],
)
def test_method_2_superelevation_by_hand(units, table, speed, f_max, rows):
    for radius, demand, e_design, e_use, section in rows:
        rec = road(units, table, speed=speed, radius=radius, emax=4)
        v = rec.values
        e_use = e_design if e_use is None else e_use
        assert v["superelevation_design"] == pytest.approx(e_design, abs=1e-9), radius
        assert v["superelevation"] == pytest.approx(e_use, abs=1e-9), radius
        assert v["cross_section"] == section, radius
        # friction carries what e does not: f = V^2/(C R) - e in use
        assert v["side_friction_demand"] == pytest.approx(demand - e_use / 100, abs=1e-9)
        assert v["side_friction_demand"] <= f_max + 1e-9 or section == "at e_max"


def test_method_2_normal_crown_note_names_its_rule():
    rec = road(US, US_TABLE, speed=30, radius=500, emax=4)
    note = [m for m in rec.messages if m.code == "normal_crown"]
    assert note and "Method 2" in note[0].text and "-2.0 %" in note[0].text


def test_speeds_outside_the_low_speed_rows_are_refused():
    rec = road(US, US_TABLE, speed=50, radius=900)
    assert rec.status == "error" and "from 10 to 45 mph" in rec.messages[0].text
    rec = road(METRIC, METRIC_TABLE, speed=80, radius=900)
    assert rec.status == "error" and "from 15 to 70 km/h" in rec.messages[0].text


@pytest.mark.parametrize(
    ("units", "table", "speed", "radius"),
    [(US, US_TABLE, 30, 280), (US, "aashto-2018-us", 50, 900), (METRIC, None, 100, 600)],
)
def test_friction_given_replaces_the_check_limit_only(units, table, speed, radius):
    """--friction: R_min, the friction check and the safe speed use the factor given; the
    design superelevation keeps the table's distribution (the choice documented beside
    the option). R_min by hand from Eq. 3-10 with f = 0.15."""
    plain = road(units, table, speed=speed, radius=radius, emax=4)
    given = road(units, table, speed=speed, radius=radius, emax=4, friction=0.15)
    assert given.values["superelevation_design"] == plain.values["superelevation_design"]
    assert given.values["cross_section"] == plain.values["cross_section"]
    c = 15 if units is US else 127
    assert given.values["side_friction_max"] == 0.15
    assert given.values["min_radius"] == pytest.approx(speed**2 / (c * 0.19), rel=1e-9)
    assert "friction_given" in [m.code for m in given.messages]


def test_the_low_speed_tables_are_listed(capsys):
    assert main(["tables", "--json"]) == 0
    rows = {r["name"]: r for r in json.loads(capsys.readouterr().out)}
    assert rows[US_TABLE]["distribution"] == "aashto-method-2"
    assert rows[US_TABLE]["speeds"] == [10, 45]
    assert rows[METRIC_TABLE]["speeds"] == [15, 70]
