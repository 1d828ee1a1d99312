"""The sight module: stopping distance forms, the sightline offset past the curve, the check's
flags and its passing speed. Sources beside each check; properties checked with hypothesis."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from scipy.integrate import solve_ivp

from curvetui.core import sight
from curvetui.core.units import FOOT, G0, KMH, MPH


def test_green_book_metric_constants_by_hand():
    # Green Book 2018 Eq. 3-2 (metric) evaluated by hand at 100 km/h, t 2.5 s, a 3.4 m/s^2:
    # 0.278 x 100 x 2.5 + 0.039 x 100^2 / 3.4 = 69.5 + 114.706 = 184.206 m
    d = sight.stopping_sight_distance(100 * KMH, 2.5, 3.4)
    assert float(d) == pytest.approx(69.5 + 0.039 * 1e4 / 3.4, rel=1e-12)


def test_green_book_us_constants_by_hand():
    # Eq. 3-2 (US) by hand at 55 mph, a 11.2 ft/s^2: 1.47 x 55 x 2.5 + 1.075 x 55^2 / 11.2
    d = sight.stopping_sight_distance(55 * MPH, 2.5, 11.2 * FOOT, form="us") / FOOT
    assert float(d) == pytest.approx(1.47 * 55 * 2.5 + 1.075 * 55**2 / 11.2, rel=1e-12)


@pytest.mark.parametrize("v, grade", [(15.0, 0.0), (30.0, -0.06), (36.0, 0.08)])
def test_exact_form_against_integrated_braking(v, grade):
    # reference: scipy integrates x'' = -(a + g G) from v until the car stops, after 2.5 s
    # of travel at v; independent of the closed form
    a = 3.4

    def rhs(_t, y):
        return [y[1], -(a + G0 * grade)]

    def stopped(_t, y):
        return y[1]

    stopped.terminal = True
    sol = solve_ivp(rhs, (0, 100), [0.0, v], events=stopped, rtol=1e-11, atol=1e-11)
    reference = v * 2.5 + sol.y_events[0][0][0]
    d = sight.stopping_sight_distance(v, 2.5, a, grade, form="exact")
    assert float(d) == pytest.approx(reference, rel=1e-8)


def test_steep_downgrade_cannot_stop():
    # a + g G <= 0 (first principles): braking cannot stop the car; the check fails, not hides
    assert np.isinf(sight.stopping_sight_distance(20.0, 2.5, 3.4, -0.40))
    c = sight.sight_check(20.0, 500.0, 10.0, grade=-0.40, design=False)
    assert not bool(c.status)
    assert c.flags & sight.FAIL_NO_STOP
    assert float(c.speed_that_passes) == 0.0


def test_unknown_form_rejected():
    with pytest.raises(ValueError, match="form"):
        sight.stopping_sight_distance(20.0, form="nope")
    with pytest.raises(ValueError, match="units"):
        sight.design_stopping_sight_distance(20.0, "exact")


def test_arc_formula_matches_the_degree_form():
    # TxDOT RDM 4.7.9 writes cos(28.65 S / R) in degrees; 28.65 = 90/pi rounded (derived)
    r, s = 300.0, 150.0
    by_hand = r * (1 - math.cos(math.radians(28.65 * s / r)))
    assert float(sight.sightline_offset(r, s)) == pytest.approx(by_hand, rel=2e-4)


def _brute_force_offset(radius, length, s):
    """The largest gap between the road (tangent, arc, tangent) and a chord of path length s,
    over every driver position: an independent geometric reference."""

    def point(u):
        u = np.asarray(u, dtype=float)
        th = length / radius
        end = np.array([radius * math.sin(th), radius * (1 - math.cos(th))])
        arc = np.stack([radius * np.sin(u / radius), radius * (1 - np.cos(u / radius))])
        before = np.stack([u, np.zeros_like(u)])
        after = end[:, None] + (u - length) * np.array([[math.cos(th)], [math.sin(th)]])
        return np.where(u < 0, before, np.where(u > length, after, arc))

    best = 0.0
    for s0 in np.linspace(-s, length, 801):
        a, b = point(np.array([s0])), point(np.array([s0 + s]))
        between = point(np.linspace(s0, s0 + s, 801))
        chord = (b - a)[:, 0]
        rel = between - a
        gap = np.abs(chord[0] * rel[1] - chord[1] * rel[0]) / np.hypot(*chord)
        best = max(best, float(gap.max()))
    return best


@pytest.mark.parametrize("radius, length, s", [(400.0, 60.0, 150.0), (250.0, 100.0, 130.0)])
def test_sight_line_on_tangents_against_geometry(radius, length, s):
    got = sight.sightline_offset(radius, s, length)
    assert float(got) == pytest.approx(_brute_force_offset(radius, length, s), rel=1e-4)


def test_sight_line_within_curve_against_geometry():
    # S < L: the brute force gives the middle ordinate R (1 - cos(S/2R)) as well
    got = sight.sightline_offset(400.0, 120.0, 300.0)
    assert float(got) == pytest.approx(_brute_force_offset(400.0, 300.0, 120.0), rel=1e-4)
    assert float(got) == pytest.approx(400 * (1 - math.cos(120 / 800)), rel=1e-12)


def test_sight_line_on_tangents_small_angle_form():
    # textbook form for S > L, from memory: m = L (2S - L) / (8R); the exact one tends to it
    r, length, s = 2000.0, 40.0, 180.0
    textbook = length * (2 * s - length) / (8 * r)
    assert float(sight.sightline_offset(r, s, length)) == pytest.approx(textbook, rel=1e-3)


def test_extension_is_continuous_and_below_the_arc_form():
    r, length = 500.0, 120.0
    at = sight.sightline_offset(r, np.array([length - 1e-9, length + 1e-9]), length)
    assert at[0] == pytest.approx(at[1], rel=1e-9)
    longer = 200.0
    assert sight.sightline_offset(r, longer, length) < sight.sightline_offset(r, longer)


def test_nan_curve_length_means_not_given():
    got = sight.sightline_offset(500.0, 200.0, np.array([np.nan, 120.0]))
    assert got[0] == pytest.approx(float(sight.sightline_offset(500.0, 200.0)))
    assert got[1] < got[0]


def test_check_flags():
    c = sight.sight_check(
        np.array([80, 80]) * KMH, 400.0, 6.0, curve_length=np.array([np.nan, 60.0])
    )
    assert c.flags[0] & sight.NOTE_CURVE_LENGTH_UNKNOWN
    assert c.flags[1] & sight.NOTE_SIGHT_LINE_ON_TANGENTS  # 130 m > 60 m
    assert not c.flags[1] & sight.NOTE_CURVE_LENGTH_UNKNOWN


def test_missing_offset_fails():
    c = sight.sight_check(80 * KMH, 400.0, np.nan)
    assert not bool(c.status) and c.flags & sight.FAIL_OFFSET


def test_offset_at_or_over_radius_is_flagged():
    c = sight.sight_check(60 * KMH, 30.0, 40.0)
    assert c.flags & sight.WARN_BEYOND_FORMULA


speeds = st.floats(5, 45)  # m/s
radii = st.floats(60, 3000)


@given(speeds, speeds, st.sampled_from(["metric", "us", "exact"]), st.floats(-0.1, 0.1))
def test_ssd_rises_with_speed(v1, v2, form, grade):
    lo, hi = sorted((v1, v2))
    a = sight.stopping_sight_distance(lo, 2.5, 3.4, grade, form)
    b = sight.stopping_sight_distance(hi, 2.5, 3.4, grade, form)
    assert b >= a


@given(speeds, st.floats(-0.1, 0.1), st.floats(-0.1, 0.1))
def test_ssd_falls_as_the_grade_rises(v, g1, g2):
    lo, hi = sorted((g1, g2))
    assert sight.stopping_sight_distance(v, grade=hi) <= sight.stopping_sight_distance(v, grade=lo)


@given(radii, st.floats(1, 500), st.floats(1, 500))
def test_offset_rises_with_ssd(r, s1, s2):
    lo, hi = sorted((s1, s2))
    lo, hi = min(lo, math.pi * r), min(hi, math.pi * r)  # the formula's range
    assert sight.sightline_offset(r, hi) >= sight.sightline_offset(r, lo)


@given(radii, radii, st.floats(1, 180))
def test_offset_falls_with_radius(r1, r2, s):
    lo, hi = sorted((r1, r2))
    assert sight.sightline_offset(hi, s) <= sight.sightline_offset(lo, s) + 1e-12


@given(radii, st.floats(1, 800), st.floats(1, 400), st.floats(1, 400))
def test_offset_rises_with_ssd_past_the_curve(r, length, s1, s2):
    length = min(length, r)  # central angle under one radian
    lo, hi = sorted((s1, s2))
    assert sight.sightline_offset(r, hi, length) >= sight.sightline_offset(r, lo, length) - 1e-12


@given(speeds, radii, st.floats(0.5, 30), st.sampled_from(["metric", "us"]))
def test_speed_that_passes_uses_up_the_offset(v, r, m, units):
    m = min(m, 0.9 * r)
    c = sight.sight_check(v, r, m, units=units, design=False)
    back = sight.sight_check(c.speed_that_passes, r, m, units=units, design=False)
    assert float(back.sightline_offset_required) == pytest.approx(m, rel=1e-9, abs=1e-9)


@given(speeds, radii, st.floats(0.5, 30), st.floats(20, 600))
def test_speed_that_passes_past_the_curve(v, r, m, length):
    m = min(m, 0.9 * r)
    length = min(length, r)
    c = sight.sight_check(v, r, m, curve_length=length, design=False)
    back = sight.sight_check(c.speed_that_passes, r, m, curve_length=length, design=False)
    assert float(back.sightline_offset_required) == pytest.approx(m, rel=1e-9, abs=1e-9)


@given(radii, st.floats(0.5, 30), st.sampled_from(["metric", "us"]))
def test_speed_that_passes_with_design_rounding(r, m, units):
    # Table 3-1 rounding: the passing speed's design distance fits; a little faster does not
    m = min(m, 0.9 * r)
    c = sight.sight_check(20.0, r, m, units=units)
    v = float(c.speed_that_passes)
    if v <= 0:
        return
    at = sight.sight_check(v, r, m, units=units)
    assert bool(at.status)
    above = sight.sight_check(v * (1 + 1e-6) + 1e-6, r, m, units=units)
    assert not bool(above.status)
