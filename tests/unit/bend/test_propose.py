"""Proposals through the one path (curvetui.bend.propose): every proposal, checked by
``check_bend`` (the same parse and evaluation as `check`), passes every check it claims.

Property tests over each table's range (bounded, derandomized). What is asserted comes
from the evaluation's own record, never from the proposal's numbers: the verdicts, the
design superelevation, R_min, the allowed cants. The rounding steps (radius 5 m / 10 ft,
e to the table's superelevation_step, cant 5 mm / 1/4 in) are the proposal's stated
rules (common practice, no source, except the 5 m radius step: the Ethiopian Roads
Authority Geometric Design Manual 2002 ch. 8 rounds 393.7 m to 395 m, read).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from curvetui.bend.propose import propose
from curvetui.bend.service import check_bend, check_columns, columns_from_values
from curvetui.core.units import unit_system
from curvetui.inputs import InputError
from curvetui.storage.tables import rail_limits, road_table

BOUNDED = settings(max_examples=20, derandomize=True, deadline=None)
UNITS = {u: unit_system(u) for u in ("metric", "us")}
TABLES = {u: road_table(None, u) for u in UNITS}
# the shipped road tables by their units: Green Book Method 5 and the low-speed Method 2
SHIPPED = {
    "metric": ("aashto-2018-metric", "aashto-2018-low-speed-metric"),
    "us": ("aashto-2018-us", "aashto-2018-low-speed-us"),
}
LIMITS = {"metric": rail_limits(None, "metric"), "us": rail_limits("49cfr213-class3-5", "us")}
RADIUS_STEP = {"metric": 5.0, "us": 10.0}
CANT_STEP = {"metric": 5.0, "us": 0.25}


def _multiple(x: float, step: float) -> bool:
    return abs(x / step - round(x / step)) < 1e-9


@st.composite
def road_inputs(draw):
    u = draw(st.sampled_from(("metric", "us")))
    t = road_table(draw(st.sampled_from(SHIPPED[u])), u)
    speed = draw(st.sampled_from([float(s) for s in t.speeds]))
    raw = {"speed": speed, "emax": draw(st.sampled_from([100 * e for e in t.emax_tabulated]))}
    if draw(st.booleans()):
        raw["deflection"] = draw(st.floats(5.0, 120.0))
    if draw(st.booleans()):
        m = draw(st.floats(0.5, 25.0))
        raw["obstruction_offset"] = m if u == "metric" else m * 3.28
    return u, t, raw


@BOUNDED
@given(road_inputs())
def test_every_road_proposal_passes_every_check_it_claims(case):
    u, table, raw = case
    units = UNITS[u]
    p = propose("road", raw, units, table, None)
    rec = check_bend("road", p.inputs, units, table, None).to_json()
    assert rec["status"] == "pass", (raw, p.proposed, rec["messages"])
    for name in ("radius", "friction", "transition"):
        assert rec["checks"][name] == "pass"
    if "obstruction_offset" in raw:
        assert rec["checks"]["sight"] == "pass"
    r = p.proposed["radius"]
    assert _multiple(r, RADIUS_STEP[u]) and r >= rec["min_radius"] * (1 - 1e-6)
    e = p.proposed["superelevation"]
    if e is not None:
        step = 100 * table.superelevation_step
        assert _multiple(e, step)
        assert rec["checks"]["superelevation"] == "pass"
        assert e >= rec["superelevation_design"] - 1e-4  # the record is rounded to 6 figures
    if p.proposed["spiral_in"] is not None:
        assert _multiple(p.proposed["spiral_in"], RADIUS_STEP[u])
    assert p.record == rec  # the proposal carries the same evaluation


@BOUNDED
@given(road_inputs())
def test_a_road_radius_the_sight_line_governs_fails_one_step_smaller(case):
    u, table, raw = case
    units = UNITS[u]
    p = propose("road", raw, units, table, None)
    if p.figures["governing"] != "sight":
        return
    smaller = {**p.inputs, "radius": p.proposed["radius"] - RADIUS_STEP[u]}
    rec = check_bend("road", smaller, units, table, None).to_json()
    assert rec["checks"]["sight"] == "fail"


@st.composite
def rail_inputs(draw):
    u = draw(st.sampled_from(("metric", "us")))
    if u == "metric":
        fast = draw(st.floats(80.0, 300.0))
        radius = draw(st.floats(150.0, 8000.0))
    else:
        fast = draw(st.floats(10.0, 90.0))
        radius = draw(st.floats(300.0, 20000.0))
    raw = {"speed": round(fast, 1), "radius": round(radius)}
    if draw(st.booleans()):
        raw["low_speed"] = round(draw(st.floats(0.0, 1.0)) * raw["speed"], 1)
    return u, raw


@BOUNDED
@given(rail_inputs())
def test_every_rail_proposal_has_a_cant_on_the_step_inside_the_limits_and_passes(case):
    u, raw = case
    units, limits = UNITS[u], LIMITS[u]
    p = propose("rail", raw, units, None, limits)
    rec = check_bend("rail", p.inputs, units, None, limits).to_json()
    assert rec["status"] == "pass", (raw, p.proposed, rec["messages"])
    cant = p.proposed["cant"]
    assert _multiple(cant, CANT_STEP[u])
    assert cant <= rec["cant_limit"] + 1e-9
    assert rec["cant_deficiency"] <= rec["deficiency_limit"] + 1e-6
    if "low_speed" in raw and rec.get("excess_limit") is not None:
        assert rec["cant_excess"] <= rec["excess_limit"] + 1e-6
    if p.figures["rule"] == "balancing" or "low_speed" in raw:
        lo, hi = rec["cant_allowed_min"], rec["cant_allowed_max"]
        assert lo - 1e-6 <= cant <= hi + 1e-6


def _fails_with_every_cant(u: str, raw: dict, radius: float) -> bool:
    """True when no cant on the step from 0 to the maximum passes at ``radius``: all of
    them checked at once through check_columns."""
    units, limits = UNITS[u], LIMITS[u]
    top = 300.0 if u == "metric" else 12.0
    cants = np.arange(0.0, top + 1e-9, CANT_STEP[u])
    n = len(cants)
    values = {k: [v] * n for k, v in raw.items() if k not in ("spiral_in", "spiral_out")}
    values["radius"] = [radius] * n
    values["cant"] = list(cants)
    ev = check_columns(["rail"] * n, columns_from_values(values, units), units, None, limits)
    return bool(np.all(ev.status != 0))


@BOUNDED
@given(rail_inputs())
def test_no_cant_fits_gives_a_radius_where_one_does_and_none_a_step_smaller(case):
    u, raw = case
    raw = {**raw, "radius": RADIUS_STEP[u] * 20}  # small: most cases need a larger radius
    units, limits = UNITS[u], LIMITS[u]
    p = propose("rail", raw, units, None, limits)
    if p.proposed["radius"] == raw["radius"]:
        return
    assert p.status == "pass"
    assert _fails_with_every_cant(u, raw, p.proposed["radius"] - RADIUS_STEP[u])


def test_a_speed_outside_the_table_is_refused_with_the_field_and_range():
    with pytest.raises(InputError, match=r"--speed: must be a number from 15 to 130 km/h"):
        propose("road", {"speed": 200}, UNITS["metric"], TABLES["metric"], None)
    with pytest.raises(InputError, match=r"--speed: required"):
        propose("road", {}, UNITS["metric"], TABLES["metric"], None)
    with pytest.raises(InputError, match=r"--low-speed: must be a number from 0 to 120"):
        propose(
            "rail",
            {"speed": 120, "low_speed": 130, "radius": 900},
            UNITS["metric"],
            None,
            LIMITS["metric"],
        )


def test_a_sight_need_beyond_the_largest_radius_is_refused_naming_the_offset():
    # 75 mph down a 15 % grade past an obstruction 0.5 ft from the lane centre: the sight
    # line would need a radius beyond the field's 328084 ft (100 km)
    raw = {"speed": 75, "obstruction_offset": 0.5, "grade": -15}
    with pytest.raises(InputError, match=r"--obstruction-offset: too small .* \(328084 ft\)"):
        propose("road", raw, UNITS["us"], TABLES["us"], None)


def test_a_wrong_radius_or_superelevation_is_replaced_not_refused():
    p = propose(
        "road",
        {"speed": 100, "radius": "abc", "superelevation": 50},
        UNITS["metric"],
        TABLES["metric"],
        None,
    )
    assert p.status == "pass" and p.current["radius"] == "abc"
    assert p.changes()["radius"] == p.proposed["radius"]


def test_the_era_example_bend_proposes_at_least_its_395_m():
    # ERA GDM 2002 ch. 8: 100 km/h, e_max 8 %, f 0.12: R_min 393.7 m, "round to 395 m"
    p = propose("road", {"speed": 100, "emax": 8}, UNITS["metric"], TABLES["metric"], None)
    assert p.figures["min_radius"] == pytest.approx(393.7, abs=0.05)
    assert p.figures["min_radius_rounded"] == 394.0  # Green Book Table 3-7's printing
    assert p.proposed["radius"] >= 395.0
    assert any("desirable" in line and "common practice, no source" in line for line in p.reasons)
    assert math.isfinite(p.figures["desirable_radius"])
