"""Picture data: the plan of a bend (curvetui.reports.plan) and the road and rail charts
(curvetui.reports.charts).

Check values come from:
- plane geometry: a simple curve's PC lies T = R tan(D/2) before the PI, its arc centre R
  from the PC square to the back tangent, every arc point R from that centre; the radius
  of the circle through three points (circumradius abc / 4 area); stations PC = PI - T,
  PT = PC + R D (Indiana DOT Design Manual Fig. 43-6D, REFERENCES.md);
- the clothoid by mpmath's Fresnel integrals (30 digits): X, Y at the SC, p = Y - R (1 -
  cos theta), k = X - R sin theta, Ts = (R + p) tan(D/2) + k for equal spirals;
- AASHTO Green Book 2018: R_min = V^2 / (127 (e_max + f_max)) (Eq. 3-10), so e(R_min) =
  e_max by definition of R_min, and f = V^2 / (127 R) - e (Eq. 3-8); f_max 0.14 at 80 km/h
  (REFERENCES.md, read in a secondary compilation of AASHTO 2011); Iowa DOT Design Manual
  superelevation table, e_max 6 %, R 2000 ft and 1700 ft, e "rounded up to the nearest
  two-tenths of a percent" (REFERENCES.md, read);
- rail: E = 11.8 V^2 / R (mm, km/h, m) for s = 1500 mm, the EN 13803 form derived in
  REFERENCES.md; the band edges from D = E(V) - E_a <= I and X = E_a - E(V) <= X_lim.
Speeds, radii, deflections and stations below are arbitrary inputs, not check values; the
limit values I and X are read from the shipped limits file (values from memory there), as
inputs.
"""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest

from curvetui.core.circular import GeometryError
from curvetui.core.rail import check_rail
from curvetui.core.spiral import spiral_curve
from curvetui.core.units import FOOT, KMH, METRIC, MPH
from curvetui.reports.charts import (
    rail_chart,
    rail_chart_for_inputs,
    road_chart,
    road_chart_for_inputs,
)
from curvetui.reports.plan import (
    ARC,
    SPIRAL_IN,
    SPIRAL_OUT,
    TANGENT,
    plan_for_inputs,
    plan_points,
    station_texts,
)
from curvetui.storage.tables import rail_limits

EN13803 = rail_limits("en13803-2010")


def circumcircle(p1, p2, p3):
    """Centre and radius of the circle through three points (plane geometry)."""
    (ax, ay), (bx, by), (cx, cy) = p1, p2, p3
    d = 2 * (ax * (by - cy) + bx * (cy - ay) + cx * (ay - by))
    ux = (ax**2 + ay**2) * (by - cy) + (bx**2 + by**2) * (cy - ay) + (cx**2 + cy**2) * (ay - by)
    uy = (ax**2 + ay**2) * (cx - bx) + (bx**2 + by**2) * (ax - cx) + (cx**2 + cy**2) * (bx - ax)
    centre = (ux / d, uy / d)
    return centre, math.dist(centre, p1)


def part(shape, kind, which=0):
    return [p for p in shape.parts if p.kind == kind][which]


# --------------------------------------------------------------------------- plan
def test_simple_curve_key_points_and_arc_by_hand():
    r, d, pi = 300.0, math.radians(50), 1000.0
    shape = plan_points(r, d, direction=+1, pi_station=pi)
    t = r * math.tan(d / 2)  # T = R tan(D/2)
    pc, pt = shape.key("PC"), shape.key("PT")
    assert (pc.x, pc.y) == pytest.approx((-t, 0.0), abs=1e-9)
    # PT = PI + T along the forward tangent, turned D clockwise (right-hand bend)
    assert (pt.x, pt.y) == pytest.approx((t * math.cos(d), -t * math.sin(d)), abs=1e-9)
    assert pc.station == pytest.approx(pi - t, abs=1e-9)  # PC = PI - T
    assert pt.station == pytest.approx(pi - t + r * d, abs=1e-9)  # PT = PC + L, not PI + T
    assert shape.key("PI").station == pi
    assert (shape.key("PI").x, shape.key("PI").y) == (0.0, 0.0)
    # the arc centre is R from the PC, square to the back tangent, inside the bend (-y)
    centre = (-t, -r)
    assert shape.centre == pytest.approx(centre, abs=1e-9)
    arc = part(shape, ARC)
    assert len(arc.x) > 100
    assert np.hypot(arc.x - centre[0], arc.y - centre[1]) == pytest.approx(r, abs=1e-8)


def test_left_hand_bend_is_the_mirror_image():
    right = plan_points(250.0, math.radians(35), 40.0, 40.0, direction=+1)
    left = plan_points(250.0, math.radians(35), 40.0, 40.0, direction=-1)
    assert np.allclose(left.x, right.x, atol=1e-9)
    assert np.allclose(left.y, -right.y, atol=1e-9)
    assert left.centre[1] > 0 > right.centre[1]


def test_spiral_key_points_by_mpmath():
    r, ls, d, pi = 400.0, 80.0, math.radians(30), 2500.0
    shape = plan_points(r, d, ls, ls, direction=+1, pi_station=pi)
    with mpmath.workdps(30):
        scale = mpmath.sqrt(mpmath.pi * r * ls)
        z = ls / scale
        xs, ys = float(scale * mpmath.fresnelc(z)), float(scale * mpmath.fresnels(z))
    theta = ls / (2 * r)
    p = ys - r * (1 - math.cos(theta))
    k = xs - r * math.sin(theta)
    ts = (r + p) * math.tan(d / 2) + k
    lc = r * (d - 2 * theta)
    expected_st = {
        "TS": pi - ts,
        "SC": pi - ts + ls,
        "CS": pi - ts + ls + lc,
        "ST": pi - ts + 2 * ls + lc,
    }
    for name, station in expected_st.items():
        assert shape.key(name).station == pytest.approx(station, abs=1e-6), name
    u = (math.cos(d), -math.sin(d))  # forward tangent
    n = (u[1], -u[0])  # its right-hand normal, towards the inside of a right-hand bend
    ts_pt, sc_pt = shape.key("TS"), shape.key("SC")
    cs_pt, st_pt = shape.key("CS"), shape.key("ST")
    assert (ts_pt.x, ts_pt.y) == pytest.approx((-ts, 0.0), abs=1e-6)
    assert (sc_pt.x, sc_pt.y) == pytest.approx((-ts + xs, -ys), abs=1e-6)
    assert (st_pt.x, st_pt.y) == pytest.approx((ts * u[0], ts * u[1]), abs=1e-6)
    cs_expect = (st_pt.x - xs * u[0] + ys * n[0], st_pt.y - xs * u[1] + ys * n[1])
    assert (cs_pt.x, cs_pt.y) == pytest.approx(cs_expect, abs=1e-6)


def test_spiral_arc_points_lie_on_one_circle_of_radius_r():
    r = 350.0
    shape = plan_points(r, math.radians(42), 60.0, 90.0, direction=-1)
    arc = part(shape, ARC)
    n = len(arc.x)
    pts = [(arc.x[i], arc.y[i]) for i in (0, n // 2, n - 1)]
    centre, radius = circumcircle(*pts)
    assert radius == pytest.approx(r, rel=1e-9)
    assert np.hypot(arc.x - centre[0], arc.y - centre[1]) == pytest.approx(r, rel=1e-9)
    assert shape.centre == pytest.approx(centre, abs=1e-6)
    # the spirals bend less: they stay outside that circle, touching it at the SC and CS
    # and, at the TS and ST, farther out than R + p (p about Ls^2 / (24 R), over 0.4 m)
    for kind in (SPIRAL_IN, SPIRAL_OUT):
        s = part(shape, kind)
        dist = np.hypot(s.x - centre[0], s.y - centre[1])
        assert (dist >= r - 1e-9).all()
        assert dist.max() > r + 0.4


def test_unequal_spiral_stations_match_the_spiral_engine():
    # consistency with curvetui.core.spiral (validated in test_spiral.py against mpmath)
    r, d, l1, l2 = 500.0, math.radians(25), 70.0, 110.0
    shape = plan_points(r, d, l1, l2, pi_station=123.0)
    c = spiral_curve(r, d, l1, l2, 123.0)
    for name, value in (("TS", c.ts), ("SC", c.sc), ("CS", c.cs), ("ST", c.st)):
        assert shape.key(name).station == pytest.approx(float(value), abs=1e-9)
    assert [p.kind for p in shape.parts] == [TANGENT, SPIRAL_IN, ARC, SPIRAL_OUT, TANGENT]


def test_tangents_are_straight_and_a_quarter_of_the_tangent_long():
    r, d = 200.0, math.radians(60)
    shape = plan_points(r, d, 50.0, 50.0, direction=+1)
    t = -shape.key("TS").x  # PI at the origin, TS on the back tangent
    back, ahead = part(shape, TANGENT, 0), part(shape, TANGENT, 1)
    assert (back.y == 0).all()
    assert back.x[0] == pytest.approx(-t - 0.25 * t)
    assert back.x[-1] == pytest.approx(-t)
    u = np.array([math.cos(d), -math.sin(d)])
    cross = ahead.x * u[1] - ahead.y * u[0]  # zero for points on the forward tangent line
    assert cross == pytest.approx(0.0, abs=1e-9)
    assert math.hypot(ahead.x[-1] - ahead.x[0], ahead.y[-1] - ahead.y[0]) == pytest.approx(0.25 * t)
    # the whole line runs in order: the two tangent stretches, and between them steps no
    # longer than the station step (a chord is never longer than its arc)
    steps = np.hypot(np.diff(shape.x), np.diff(shape.y))
    assert steps[0] == pytest.approx(0.25 * t) and steps[-1] == pytest.approx(0.25 * t)
    inner = steps[1:-1]
    assert 0 < inner.min()
    assert inner.max() <= (shape.key("ST").station - shape.key("TS").station) / 400 + 1e-9


def test_parts_share_their_end_points():
    shape = plan_points(300.0, math.radians(40), 60.0, 60.0)
    for a, b in zip(shape.parts, shape.parts[1:], strict=False):
        assert (a.x[-1], a.y[-1]) == pytest.approx((b.x[0], b.y[0]), abs=1e-9)


def test_plan_refuses_overlapping_spirals_and_bad_direction():
    # 2 x 100 m spirals on R 100 m turn Ls / 2R = 0.5 rad each: 57.3 degrees, more than 50
    with pytest.raises(GeometryError, match="overlap"):
        plan_points(100.0, math.radians(50), 100.0, 100.0)
    with pytest.raises(GeometryError, match="direction"):
        plan_points(100.0, math.radians(60), direction=0)


def test_plan_for_inputs_and_station_texts():
    raw = {"deflection": "40", "pi_station": "1+200", "spiral_in": "60"}
    shape = plan_for_inputs(raw, METRIC, 250.0)
    assert shape.key("PI").station == 1200.0
    assert shape.ls_in == shape.ls_out == 60.0
    texts = station_texts(shape, METRIC)
    assert texts["PI"] == "1+200.000"
    assert set(texts) == {"TS", "SC", "CS", "ST", "PI"}
    assert plan_for_inputs({"speed": "80"}, METRIC, 250.0) is None


# --------------------------------------------------------------------------- road chart
def test_road_chart_min_radius_and_friction_by_green_book(metric):
    v_kmh, e_max = 80.0, 0.08
    chart = road_chart(metric, v_kmh * KMH, e_max, 300.0)
    r_min = v_kmh**2 / (127 * (e_max + 0.14))  # Eq. 3-10, f_max 0.14 at 80 km/h
    assert r_min == pytest.approx(229.062, abs=1e-3)  # 6400 / 27.94, by hand
    assert chart.min_radius == pytest.approx(r_min, rel=1e-12)
    assert chart.f_max == pytest.approx(0.14)
    i = int(np.argmin(np.abs(chart.radius - r_min)))
    assert chart.radius[i] == pytest.approx(r_min, rel=1e-12)  # R_min is on the grid
    assert chart.e_design[i] == pytest.approx(e_max, abs=1e-12)  # e(R_min) = e_max
    assert chart.friction[i] == pytest.approx(0.14, abs=1e-12)  # f(R_min) = f_max
    # Eq. 3-8: f = V^2 / (127 R) - e on the whole grid
    expected = v_kmh**2 / (127 * chart.radius) - chart.e_design
    assert chart.friction == pytest.approx(expected, abs=1e-12)
    # below R_min the distribution holds e_max, and friction demand exceeds f_max
    below = chart.radius < r_min * (1 - 1e-9)
    assert below.any()
    assert (chart.e_design[below] == pytest.approx(e_max)) and (chart.friction[below] > 0.14).all()
    assert (np.diff(chart.e_design) <= 1e-12).all()  # e falls as the radius grows


def test_road_chart_grid_spans_the_requested_range(metric):
    chart = road_chart(metric, 80 * KMH, 0.08, 300.0)
    assert chart.radius[0] == pytest.approx(chart.min_radius / 1.2)
    assert chart.radius[-1] == pytest.approx(20 * chart.min_radius)
    assert 300.0 in chart.radius
    assert (np.diff(chart.radius) > 0).all()
    wide = road_chart(metric, 80 * KMH, 0.08, 50_000.0)
    assert wide.radius[0] == pytest.approx(wide.min_radius / 1.2)
    assert wide.radius[-1] >= 50_000.0


def test_road_chart_current_bend_fails_below_min_radius(metric):
    chart = road_chart(metric, 80 * KMH, 0.08, 200.0)
    assert chart.failed
    assert "R < R_min" in chart.reasons and "f > f_max" in chart.reasons
    # at R 200 m < R_min the bend uses e_max: f = 6400 / (127 x 200) - 0.08, by hand
    assert chart.e_now == pytest.approx(0.08)
    assert chart.f_now == pytest.approx(6400 / 25400 - 0.08, abs=1e-12)
    ok = road_chart(metric, 80 * KMH, 0.08, 400.0)
    assert not ok.failed and ok.reasons == ()
    assert ok.f_now == pytest.approx(6400 / (127 * 400) - ok.e_now, abs=1e-12)


def test_road_chart_given_superelevation_above_emax_fails(metric):
    chart = road_chart(metric, 80 * KMH, 0.06, 1000.0, superelevation=0.07)
    assert chart.failed and chart.reasons == ("e > e_max",)
    assert chart.e_now == 0.07


@pytest.mark.parametrize(
    ("mph", "radius_ft", "iowa_percent"),
    [
        (45, 2000, 4.0),
        (50, 2000, 4.4),
        (55, 2000, 5.0),
        (45, 1700, 4.2),
        (50, 1700, 4.8),
        (55, 1700, 5.4),
    ],
)
def test_road_chart_design_e_rounds_up_to_iowa_dot_values(us, mph, radius_ft, iowa_percent):
    chart = road_chart(us, mph * MPH, 0.06, radius_ft * FOOT)
    e = 100 * chart.e_now
    assert iowa_percent - 0.2 < e <= iowa_percent + 1e-9


def test_road_chart_for_inputs_uses_the_bend_inputs(metric):
    raw = {"speed": "80", "radius": "250", "emax": "8", "friction": "0.12"}
    chart = road_chart_for_inputs(raw, METRIC, metric)
    assert chart.f_max == 0.12
    assert chart.min_radius == pytest.approx(6400 / (127 * 0.20))  # Eq. 3-10 with f 0.12


# --------------------------------------------------------------------------- rail chart
def test_rail_chart_equilibrium_cant_is_11_8_v2_over_r():
    r = 800.0
    chart = rail_chart(EN13803, r, 0.100, None, 120 * KMH, 60 * KMH)
    assert chart.rail_centres == 1.5
    v_kmh = chart.speed / KMH
    e_mm = chart.equilibrium * 1000
    # 11.8 is rounded (1500 / (9.80665 x 3.6^2) = 11.802): relative 2e-4
    assert e_mm == pytest.approx(11.8 * v_kmh**2 / r, rel=3e-4, abs=1e-9)
    assert chart.cant_now * 1000 == pytest.approx(11.8 * 120**2 / r, rel=3e-4)  # 212.4 mm
    assert chart.cant_low * 1000 == pytest.approx(11.8 * 60**2 / r, rel=3e-4)  # 53.1 mm
    assert chart.speed[0] == 0.0
    assert chart.speed[-1] == pytest.approx(1.3 * max(120 * KMH, chart.max_speed))
    assert 120 * KMH in chart.speed and 60 * KMH in chart.speed


def test_rail_chart_band_edges_are_the_checks_speeds():
    r, ea = 600.0, 0.150
    chart = rail_chart(EN13803, r, ea, None, 110 * KMH, 70 * KMH)
    check = check_rail(EN13803, 110 * KMH, r, ea, 70 * KMH)
    assert chart.max_speed == float(check.max_speed)
    assert chart.min_speed == float(check.min_speed)
    i_lim, x_lim = chart.deficiency_limit * 1000, chart.excess_limit * 1000  # from the file
    # D = 11.8 V^2 / R - E_a = I at V_max, X = E_a - 11.8 V^2 / R = X_lim at V_min
    v_max = math.sqrt((150 + i_lim) * r / 11.8)
    v_min = math.sqrt((150 - x_lim) * r / 11.8)
    assert chart.max_speed / KMH == pytest.approx(v_max, rel=2e-4)
    assert chart.min_speed / KMH == pytest.approx(v_min, rel=2e-4)
    inside = chart.in_band
    assert inside.any() and (~inside).any()
    e = chart.equilibrium
    tol = 1e-12
    assert (e[inside] - ea <= chart.deficiency_limit + tol).all()
    assert (ea - e[inside] <= chart.excess_limit + tol).all()
    out_def = e[~inside] - ea > chart.deficiency_limit - tol
    out_exc = ea - e[~inside] > chart.excess_limit - tol
    assert (out_def | out_exc).all()


def test_rail_chart_failing_low_speed():
    # E_low = 11.8 x 20^2 / 600 = 7.9 mm, so the excess 150 - 7.9 mm exceeds a 130 mm limit
    chart = rail_chart(EN13803, 600.0, 0.150, None, 100 * KMH, 20 * KMH)
    assert chart.excess_limit == pytest.approx(0.130)  # the file's value, an input here
    assert chart.failed and "excess > limit" in chart.reasons
    assert not chart.in_band[np.searchsorted(chart.speed, 20 * KMH)]


def test_rail_chart_for_inputs_and_other_gauge():
    chart = rail_chart_for_inputs(
        {"speed": "120", "radius": "800", "cant": "100", "gauge": "1668"}, METRIC, EN13803
    )
    assert chart.rail_centres == pytest.approx(1.740)
    # E = s v^2 / (g R) with s 1740 mm: 1740 / 1500 of the standard gauge's 11.8 V^2 / R
    assert chart.cant_now * 1000 == pytest.approx(11.8 * 1740 / 1500 * 120**2 / 800, rel=3e-4)
    assert math.isnan(chart.low_speed) and math.isnan(chart.cant_low)
