"""Rail limits that mean what they say (issue 13): bands, scope, class speeds, gauge.

Sources (../shared/REFERENCES.md, "Rail track" and "Rail limits"): 49 CFR 213.9 class
speed limits (read): class 2 passenger 30 mph, class 5 passenger 90 mph; EN 13803-1:2010
covers 80 to 300 km/h (scope, read); E = 0.0007 D V^2 in (a textbook solution, read:
D 1.75 deg, 60 mph gives 4.41 in). The EN limit values themselves are from memory.
"""

from __future__ import annotations

import pytest

from curvetui.bend.service import check_bend
from curvetui.core.rail import equilibrium_cant
from curvetui.core.units import KMH, METRIC, US
from curvetui.storage.tables import rail_limits, road_table


def rail(units, limits=None, **inputs):
    lim = rail_limits(limits, units.name)
    return check_bend("rail", inputs, units, road_table(None, units.name), lim), lim


def test_max_speed_uses_the_band_of_the_speed_it_returns():
    # the reported case: 150 km/h, R 3000 m, 150 mm. The answer must satisfy the deficiency
    # limit of its own band, not of the 150 km/h band.
    rec, lim = rail(METRIC, speed=150, radius=3000, cant=150)
    v_max = rec.values["max_speed"] * KMH
    band, _ = lim.band(v_max)
    deficiency = equilibrium_cant(v_max, 3000.0, lim.rail_centres) - 0.150
    assert deficiency <= lim.deficiency_max[band] + 1e-9
    assert v_max <= lim.speed_max[-1] + 1e-9


def test_speed_beyond_the_limits_is_refused_and_below_their_scope_warned():
    rec, _ = rail(METRIC, speed=400, radius=3000, cant=150)
    assert rec.status == "error" and "from 1 to 300 km/h (limits en13803-2010)" in str(
        rec.messages[0].text
    )
    rec, _ = rail(METRIC, speed=60, radius=1000, cant=20)  # below 80 km/h
    assert "speed_below_scope" in [m.code for m in rec.messages]


def test_49_cfr_class_speed_limits():
    rec, _ = rail(US, "49cfr213-class3-5", speed=100, radius=5000, cant=3)
    assert rec.status == "error" and "to 90 mph" in rec.messages[0].text
    rec, _ = rail(US, "49cfr213-class1-2", speed=31, radius=5000, cant=3)
    assert rec.status == "error" and "to 30 mph" in rec.messages[0].text


def test_naming_the_files_own_gauge_keeps_its_constant():
    # R 3274 ft is 1.75 degrees of curve (arc): 0.0007 x 1.75 x 60^2 = 4.41 in
    plain, _ = rail(US, speed=60, radius=3274, cant=2)
    named, _ = rail(US, speed=60, radius=3274, cant=2, gauge=1435)
    assert named.values["equilibrium_cant"] == pytest.approx(4.41, abs=0.005)
    assert named.values["equilibrium_cant"] == plain.values["equilibrium_cant"]
    assert "gauge_not_covered" not in [m.code for m in named.messages]


def test_another_gauge_is_warned_that_the_limits_were_not_set_for_it():
    rec, _ = rail(METRIC, speed=80, radius=500, cant=60, gauge=1000)
    warn = [m for m in rec.messages if m.code == "gauge_not_covered"]
    assert warn and warn[0].severity == "warning" and "1435 mm" in warn[0].text


def test_en_13803_2_least_radius_of_150_m():
    # EN 13803-2, 7.3: designed minimum radius 150 m where different vehicles operate (read)
    bad, _ = rail(METRIC, speed=40, radius=140, cant=20)
    assert bad.status == "fail" and bad.checks["radius"] == "fail"
    assert "radius_below_limits_minimum" in [m.code for m in bad.messages]
    good, _ = rail(METRIC, speed=40, radius=150, cant=20)
    assert good.checks["radius"] == "pass"


def test_the_working_shows_the_least_radius_line_with_its_verdict():
    from curvetui.reports.working import rail_working

    bad, lim = rail(METRIC, speed=40, radius=140, cant=20)
    line = next(s for s in rail_working(bad.to_json(), lim, METRIC) if s.label == "Least radius")
    assert line.check == "fail" and "150" in line.result
