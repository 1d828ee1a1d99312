"""Road engine: property tests (hypothesis) and unit tests of check_road.

Reference relations used as check values, all from AASHTO, A Policy on Geometric Design
of Highways and Streets, 7th ed., 2018, ch. 3:
- Eq. 3-8, point-mass model: e + f = V^2 / (127 R) (km/h, m), V^2 / (15 R) (mph, ft);
- Eq. 3-10: R_min = V^2 / (127 (e_max + f_max)) and its US form;
- Method 1 (straight-line distribution): e = e_max R_min / R.
Expected values are worked out by hand (shown beside each check) in the standard's own
units, or by scipy / mpmath, never with the engine under test.
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import brentq

from curvetui.core import road
from curvetui.core import superelevation as se
from curvetui.core.road import check_road, design_superelevation, safe_speed
from curvetui.core.units import FOOT, KMH, MPH
from curvetui.storage.tables import road_table

SETTINGS = settings(max_examples=60, deadline=None)

# speeds inside each table's rows, in table units
metric_speeds = st.floats(20, 130)
us_speeds = st.floats(15, 80)
e_maxes = st.sampled_from([0.04, 0.06, 0.08, 0.10, 0.12])


def _tables():
    return {
        "metric": (road_table("aashto-2018-metric"), KMH, 1.0, 127.0),
        "us": (road_table("aashto-2018-us"), MPH, FOOT, 15.0),
    }


units_names = st.sampled_from(["metric", "us"])


def _speed_in(units, data):
    return data.draw(metric_speeds if units == "metric" else us_speeds)


# --- properties -------------------------------------------------------------------------


@SETTINGS
@given(units=units_names, data=st.data(), e_max=e_maxes)
def test_min_radius_rises_with_speed(units, data, e_max):
    """Eq. 3-10 with f_max falling with speed: R_min rises with V."""
    table, su, _, _ = _tables()[units]
    v1 = _speed_in(units, data)
    v2 = _speed_in(units, data)
    lo, hi = sorted((v1, v2))
    if hi - lo < 1e-6:
        return
    r = check_road(table, np.array([lo, hi]) * su, 1e5, e_max=e_max).min_radius
    assert r[0] < r[1]


@SETTINGS
@given(units=units_names, data=st.data(), e1=e_maxes, e2=e_maxes)
def test_min_radius_falls_with_emax(units, data, e1, e2):
    """Eq. 3-10: more superelevation, smaller R_min."""
    table, su, _, _ = _tables()[units]
    v = _speed_in(units, data) * su
    lo, hi = sorted((e1, e2))
    if lo == hi:
        return
    r = check_road(table, v, 1e5, e_max=np.array([lo, hi])).min_radius
    assert r[0] > r[1]


@SETTINGS
@given(
    units=units_names,
    data=st.data(),
    e=st.floats(-0.02, 0.12),
    ratio1=st.floats(1.0, 20.0),
    ratio2=st.floats(1.0, 20.0),
)
def test_friction_demand_falls_as_radius_grows_for_a_given_e(units, data, e, ratio1, ratio2):
    """Eq. 3-8 with a built superelevation: f = V^2/(127 R) - e falls as R grows."""
    table, su, _, _ = _tables()[units]
    v = _speed_in(units, data) * su
    r_min = float(check_road(table, v, 1e5, e_max=0.08).min_radius)
    r = r_min * np.array(sorted((ratio1, ratio2)))
    if r[1] - r[0] < 1e-9 * r[0]:
        return
    f = check_road(table, v, r, e_max=0.08, superelevation=e).side_friction_demand
    assert f[0] > f[1]


@SETTINGS
@given(
    units=units_names,
    data=st.data(),
    e_max=e_maxes,
    ratio1=st.floats(1.0, 50.0),
    ratio2=st.floats(1.0, 50.0),
)
def test_distribution_friction_never_rises_with_radius(units, data, e_max, ratio1, ratio2):
    """Method 5 puts side friction on a curve rising with curvature 1/R (Green Book 2018,
    section 3.3.5): along the distribution, f = V^2/(kR) - e_design does not rise with R."""
    table, su, _, _ = _tables()[units]
    v = _speed_in(units, data) * su
    r_min = float(check_road(table, v, 1e5, e_max=e_max).min_radius)
    r = r_min * np.array(sorted((ratio1, ratio2)))
    e = design_superelevation(table, v, r, e_max)
    f = v**2 / (table.k_si * r) - e
    # 1e-12: float noise where the friction curve is flat
    assert f[1] <= f[0] + 1e-12


@SETTINGS
@given(
    units=units_names,
    data=st.data(),
    e_max=e_maxes,
    ratios=st.lists(st.floats(0.3, 60.0), min_size=2, max_size=8),
)
def test_design_e_capped_and_non_increasing_in_radius(units, data, e_max, ratios):
    """Design e never exceeds e_max and does not rise as the radius grows."""
    table, su, _, _ = _tables()[units]
    v = _speed_in(units, data) * su
    r_min = float(check_road(table, v, 1e5, e_max=e_max).min_radius)
    r = r_min * np.array(sorted(ratios))
    e = design_superelevation(table, v, r, e_max)
    assert np.all(e <= e_max)
    # 1e-12: float noise where the e curve meets e_max with zero slope
    assert np.all(np.diff(e) <= 1e-12)


@SETTINGS
@given(units=units_names, row=st.integers(0, 11), e_max=e_maxes)
def test_design_e_at_min_radius_is_emax(units, row, e_max):
    """At R_min = V^2/(C (e_max + f_max)) (Eq. 3-10, evaluated here in the table's units
    from the table's f_max at a row speed) the distribution gives e_max, and just above R_min
    it is still within 0.1 % of e_max (the distribution meets e_max smoothly)."""
    table, su, lu, constant = _tables()[units]
    speed = float(table.speeds[row])
    f_max = float(table.side_friction_max[row])
    r_min = speed**2 / (constant * (e_max + f_max)) * lu
    e = design_superelevation(table, speed * su, np.array([r_min, 1.001 * r_min]), e_max)
    assert e[0] == pytest.approx(e_max, abs=1e-12)
    assert e_max - 0.001 < e[1] <= e_max


@SETTINGS
@given(
    units=units_names,
    rows=st.lists(
        st.tuples(
            st.floats(0.2, 1.2),  # speed as a fraction of the table's top speed
            st.floats(5.0, 5000.0),  # radius, table units
            st.sampled_from([0.04, 0.06, 0.07, 0.08, 0.10, 0.12]),
            st.one_of(st.just(np.nan), st.floats(-0.02, 0.14)),
            st.one_of(st.just(np.nan), st.floats(0.05, 0.4)),
        ),
        min_size=1,
        max_size=6,
    ),
)
def test_array_results_equal_scalar_results(units, rows):
    """check_road on arrays gives, element by element, what it gives for each bend alone."""
    table, su, lu, _ = _tables()[units]
    top = float(table.speeds[-1])
    v, r, em, e, f = (np.array(c, dtype=float) for c in zip(*rows, strict=True))
    whole = check_road(table, v * top * su, r * lu, e_max=em, superelevation=e, friction=f)
    for i in range(len(rows)):
        one = check_road(
            table, v[i] * top * su, r[i] * lu, e_max=em[i], superelevation=e[i], friction=f[i]
        )
        for name in road.RoadCheck.__dataclass_fields__:
            a = np.asarray(getattr(whole, name))[i]
            b = np.asarray(getattr(one, name))
            if name in ("flags", "cross_section"):
                assert a == b, name
            else:
                # rtol 1e-14: numpy's SIMD loops do not promise bit-equal transcendental
                # results between array and scalar calls
                np.testing.assert_allclose(a, b, rtol=1e-14, atol=0, err_msg=name)


# --- point-mass values by hand ----------------------------------------------------------


def test_lateral_acceleration_and_demand_by_hand(metric):
    """100 km/h, R 400 m, e 6 %.

    a = (100/3.6)^2 / 400 = 771.6049 / 400 = 1.929012 m/s^2; a/g = 1.929012/9.80665 = 0.196704;
    Eq. 3-8: f = 100^2 / (127 x 400) - 0.06 = 0.196850 - 0.06 = 0.136850.
    """
    c = check_road(metric, 100 * KMH, 400.0, e_max=0.08, superelevation=0.06)
    assert float(c.lateral_acceleration) == pytest.approx(1.929012, abs=1e-6)
    assert float(c.lateral_acceleration_g) == pytest.approx(0.196704, abs=1e-6)
    assert float(c.side_friction_demand) == pytest.approx(0.136850, abs=1e-6)
    assert float(c.side_friction_max) == pytest.approx(0.12)  # Table 3-7, 100 km/h (read)
    assert c.flags & road.FAIL_FRICTION  # 0.1369 > 0.12


def test_us_demand_uses_the_constant_15(us):
    """Eq. 3-8, US: 60 mph, R 1000 ft, e 4 %: f = 3600 / (15 x 1000) - 0.04 = 0.2000."""
    c = check_road(us, 60 * MPH, 1000 * FOOT, superelevation=0.04)
    assert float(c.side_friction_demand) == pytest.approx(0.2, abs=1e-9)


# --- flags ------------------------------------------------------------------------------


def test_fail_radius_below_published_min_radius(metric):
    """Green Book Table 3-7: 100 km/h, e_max 8 % -> 394 m (393.7 m unrounded, ERA Geometric
    Design Manual 2002 ch. 8, read). 393 m fails; 394 m passes."""
    c = check_road(metric, 100 * KMH, np.array([393.0, 394.0]), e_max=0.08)
    assert c.flags[0] & road.FAIL_RADIUS
    assert not c.flags[1] & road.FAIL_RADIUS
    assert c.failed[0] and not c.failed[1]


def test_fail_superelevation_above_emax(metric):
    c = check_road(metric, 80 * KMH, 500.0, e_max=0.08, superelevation=np.array([0.10, 0.08]))
    assert c.flags[0] & road.FAIL_SUPERELEVATION
    assert not c.flags[1] & road.FAIL_SUPERELEVATION


def test_fail_friction_when_built_e_too_small(us):
    """60 mph, R 1200 ft, built e 2 %: f = 3600/(15 x 1200) - 0.02 = 0.18 > f_max 0.12
    (Handbook Table 2.6, read) -> FAIL_FRICTION. The radius itself is allowed: it equals
    R_min = 3600 / (15 x (0.08 + 0.12)) = 1200 ft at e_max 8 % (Eq. 3-10)."""
    c = check_road(us, 60 * MPH, 1200 * FOOT, e_max=0.08, superelevation=0.02)
    assert float(c.side_friction_demand) == pytest.approx(0.18, abs=1e-9)
    assert c.flags & road.FAIL_FRICTION
    assert not c.flags & road.FAIL_RADIUS


def test_warn_interpolated_between_rows(metric):
    """95 km/h lies between the 90 and 100 km/h rows; linear interpolation of f_max gives
    (0.13 + 0.12)/2 = 0.125 (linear interpolation: common practice, no source)."""
    c = check_road(metric, np.array([95.0, 100.0]) * KMH, 1000.0)
    assert c.flags[0] & road.WARN_INTERPOLATED
    assert not c.flags[1] & road.WARN_INTERPOLATED
    assert float(c.side_friction_max[0]) == pytest.approx(0.125, abs=1e-12)


def test_warn_speed_above_and_below_table(metric, us):
    c = check_road(metric, np.array([140.0, 10.0]) * KMH, 2000.0)
    assert c.flags[0] & road.WARN_SPEED_ABOVE_TABLE
    assert c.flags[1] & road.WARN_SPEED_BELOW_TABLE
    c = check_road(us, 85 * MPH, 5000 * FOOT)
    assert c.flags & road.WARN_SPEED_ABOVE_TABLE


def test_warn_emax_not_tabulated(metric):
    """Green Book Table 3-7 and the distribution tables cover e_max 4, 6, 8, 10, 12 %."""
    c = check_road(metric, 80 * KMH, 500.0, e_max=np.array([0.07, 0.08]))
    assert c.flags[0] & road.WARN_EMAX_NOT_TABULATED
    assert not c.flags[1] & road.WARN_EMAX_NOT_TABULATED


def test_note_friction_given_and_no_interpolation_warning(metric):
    c = check_road(metric, 95 * KMH, 1000.0, friction=0.12)
    assert c.flags & road.NOTE_FRICTION_GIVEN
    assert not c.flags & road.WARN_INTERPOLATED
    assert float(c.side_friction_max) == pytest.approx(0.12)


def test_normal_crown_on_very_flat_curve(metric):
    """A very flat curve keeps the normal crown; the outside lane then slopes -2 % (normal
    cross slope 2 %: Green Book normal crown, from memory) and its friction carries it:
    f = 100^2 / (127 x 20000) + 0.02 = 0.003937 + 0.02 = 0.023937."""
    c = check_road(metric, 100 * KMH, 20000.0, e_max=0.08)
    assert c.flags & road.NOTE_NORMAL_CROWN
    assert int(c.cross_section) == se.NORMAL_CROWN
    assert float(c.superelevation) == pytest.approx(-0.02)
    assert float(c.side_friction_demand) == pytest.approx(0.023937, abs=1e-6)
    assert not c.failed


def test_warn_below_design_e(us):
    c = check_road(us, 60 * MPH, 1500 * FOOT, e_max=0.08, superelevation=0.03)
    assert float(c.superelevation_design) > 0.03
    assert c.flags & road.WARN_BELOW_DESIGN_E


# --- linear distribution (Method 1) from a user table file --------------------------------


@pytest.fixture()
def linear_metric(tmp_path):
    src = Path(road_table("aashto-2018-metric").path).read_text(encoding="utf-8")
    text, n = re.subn(
        r'^distribution = "aashto-method-5"', 'distribution = "linear"', src, flags=re.M
    )
    assert n == 1
    text, n = re.subn(
        r'^name = "aashto-2018-metric"', 'name = "test-linear-metric"', text, flags=re.M
    )
    assert n == 1
    path = tmp_path / "linear.toml"
    path.write_text(text, encoding="utf-8")
    return road_table(str(path))


def test_linear_distribution_by_hand(linear_metric):
    """Method 1: e = e_max R_min / R. 100 km/h, e_max 8 %, f_max 0.12:
    R_min = 10000 / (127 x 0.20) = 393.7008 m;
    R 500 m: e = 0.08 x 393.7008 / 500 = 0.062992;
    R 1000 m: 0.031496; R 2000 m: 0.015748; R 300 m (< R_min): e_max 0.08."""
    assert linear_metric.distribution == "linear"
    r = np.array([300.0, 500.0, 1000.0, 2000.0])
    e = design_superelevation(linear_metric, 100 * KMH, r, 0.08)
    np.testing.assert_allclose(e, [0.08, 0.062992, 0.031496, 0.015748], atol=1e-6)
    c = check_road(linear_metric, 100 * KMH, r, e_max=0.08)
    np.testing.assert_allclose(c.superelevation_design, e, rtol=0, atol=0)
    # 500 and 1000 m are superelevated at the design e; friction is then f_max R_min / R:
    # 0.12 x 393.7008 / 500 = 0.094488, / 1000 -> 0.047244
    np.testing.assert_allclose(c.side_friction_demand[1:3], [0.094488, 0.047244], atol=1e-6)


# --- safe speed -------------------------------------------------------------------------


def _safe_speed_brentq(speeds, f_max, constant, radius, e):
    """Root of V^2/(C R) - e - f_max(V), f_max by np.interp of the table's column (scipy)."""

    def g(v):
        return v**2 / (constant * radius) - e - np.interp(v, speeds, f_max)

    return brentq(g, speeds[0], speeds[-1], xtol=1e-12, rtol=1e-14)


@pytest.mark.parametrize("units", ["metric", "us"])
def test_safe_speed_against_scipy_brentq(units):
    """Safe speed against an independent root-find (scipy.optimize.brentq), many radii."""
    table, su, lu, constant = _tables()[units]
    speeds = table.speeds
    f = table.side_friction_max
    n = 0
    for e in (-0.02, 0.0, 0.02, 0.04, 0.06, 0.08, 0.10, 0.12):
        # radii whose safe speed lies inside the table's rows
        r_lo = speeds[0] ** 2 / (constant * (e + f[0])) * 1.0001
        r_hi = speeds[-1] ** 2 / (constant * (e + f[-1])) * 0.9999
        radii = np.geomspace(r_lo, r_hi, 60)
        v, extrap = safe_speed(table, radii * lu, e)
        assert not extrap.any()
        for radius, got in zip(radii, v / su, strict=True):
            expected = _safe_speed_brentq(speeds, f, constant, radius, e)
            assert got == pytest.approx(expected, abs=1e-7), (e, radius)
            n += 1
    assert n == 480


def test_safe_speed_at_min_radius_is_design_speed(us):
    """At R_min (Eq. 3-10, Table 3-7 basis) with e_max the safe speed is the design speed:
    60 mph, e_max 8 %, f_max 0.12 (read) -> R_min = 3600 / (15 x 0.20) = 1200 ft."""
    c = check_road(us, 60 * MPH, 1200 * FOOT, e_max=0.08, superelevation=0.08)
    assert float(c.safe_speed) / MPH == pytest.approx(60.0, abs=1e-9)


def test_safe_speed_with_given_friction(metric):
    """Fixed f: V = sqrt(127 R (e + f)); R 400 m, e 6 %, f 0.10: sqrt(127 x 400 x 0.16)
    = sqrt(8128) = 90.1554 km/h."""
    c = check_road(metric, 80 * KMH, 400.0, superelevation=0.06, friction=0.10)
    assert float(c.safe_speed) / KMH == pytest.approx(90.1554, abs=1e-4)


def test_safe_speed_is_at_least_the_tables_top_speed(metric):
    """A radius so large that the bend carries 130 km/h, the table's top row (Green Book
    2018 Table 3-7 ends there): the safe speed is reported as at least 130 km/h, never
    beyond the table (issue 13)."""
    c = check_road(metric, 100 * KMH, 3000.0, e_max=0.08)
    assert float(c.safe_speed) / KMH == pytest.approx(130.0)
    assert c.flags & road.NOTE_SAFE_SPEED_AT_LEAST


def test_safe_speed_below_the_tables_lowest_speed_is_unknown(metric):
    """R 2 m with e 0: even 15 km/h (4.17 m/s) needs f = 4.17^2 / (9.799 x 2) = 0.89, above
    Table 3-7's f_max 0.40 at 15 km/h: no safe speed inside the table."""
    c = check_road(metric, 20 * KMH, 2.0, e_max=0.04, superelevation=0.0)
    assert np.isnan(float(c.safe_speed))
    assert c.flags & road.WARN_SAFE_SPEED_BELOW_TABLE
