"""The transitions module: spiral length criteria, runoff, flags; rail transition lengths;
the optional transition limits in rail limit files. Sources beside each check."""

from __future__ import annotations

import math
import tomllib

import mpmath as mp
import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from curvetui.core import transitions as tr
from curvetui.core.units import FOOT, INCH, KMH
from curvetui.storage.tables import TableError, parse_rail_limits, rail_limits


def _clothoid_shift(length, radius):
    """Lateral shift of the arc by a clothoid, by mpmath quadrature of the Fresnel integrals:
    y(L) - R (1 - cos(theta)), theta = L / (2R), A^2 = R L. Independent of L^2 / (24 R)."""
    mp.mp.dps = 30
    a2 = mp.mpf(radius) * length
    y = mp.quad(lambda s: mp.sin(s**2 / (2 * a2)), [0, length])
    theta = mp.mpf(length) / (2 * radius)
    return float(y - radius * (1 - mp.cos(theta)))


@pytest.mark.parametrize("radius, shift", [(150.0, 0.2), (400.0, 0.2), (400.0, 1.0), (2000.0, 1.0)])
def test_shift_length_gives_that_shift_on_a_clothoid(radius, shift):
    # p = L^2/(24R) is the small-angle shift (Green Book 2018 sec. 3.3.8, from memory); the
    # exact clothoid shift falls short of it by about L^4/(2688 R^3) (series, from memory)
    length = float(tr.shift_length(radius, shift))
    exact = _clothoid_shift(length, radius)
    assert exact == pytest.approx(shift, rel=length**2 / (50 * radius**2))
    assert float(tr.lateral_shift(length, radius)) == pytest.approx(shift, rel=1e-12)


def test_comfort_length_is_lateral_jerk():
    # first principles: on a clothoid run at v the curvature grows as s/(R L), so the lateral
    # acceleration v^2 s/(R L) changes at v^3/(R L) per second; at the comfort length that
    # rate equals C. Reference: mpmath differentiates a(t) = v^2 (v t)/(R L).
    v, r, c = 25.0, 300.0, 1.2
    length = float(tr.comfort_length(v, r, c))
    rate = mp.diff(lambda t: v**2 * (v * t) / (r * length), 1.0)
    assert float(rate) == pytest.approx(c, rel=1e-12)


def test_width_factor_against_table_3_16_from_memory():
    # Green Book 2018 Table 3-16 adjustment factor b_w (from memory): n1 = 1, 1.5, 2, 2.5, 3, 3.5
    got = tr.runoff_width_factor(np.array([1, 1.5, 2, 2.5, 3, 3.5]))
    np.testing.assert_allclose(got, [1.00, 0.83, 0.75, 0.70, 0.67, 0.64], atol=0.005)


def test_runoff_by_hand():
    # Green Book runoff equation by hand: 3.6 m x 2 lanes x 0.06 x 0.75 / 0.005 = 64.8 m
    assert float(tr.superelevation_runoff(0.06, 0.005, 3.6, 2)) == pytest.approx(64.8)
    assert float(tr.tangent_runout(64.8, 0.06, 0.02)) == pytest.approx(21.6)
    assert np.isinf(tr.superelevation_runoff(0.06, 0.0))
    assert np.isnan(tr.tangent_runout(0.0, 0.0))


def test_governing_minimum_and_names(metric):
    # three bends at 80 km/h (22.22 m/s) picked so each criterion governs in turn, by hand:
    # R 250, e 2 %: comfort 22.22^3/(1.2 x 250) = 36.6 m, shift sqrt(24 x 0.2 x 250) = 34.6 m,
    #   runoff 3.6 x 0.02 / 0.005 = 14.4 m (80 km/h gradient 0.50 %, table row)
    # R 2000, e 2 %: comfort 4.6 m, shift 98.0 m, runoff 14.4 m
    # R 500, e 8 %: comfort 18.3 m, shift 49.0 m, runoff 3.6 x 0.08 / 0.005 = 57.6 m
    t = tr.road_transition(
        metric, 80 * KMH, np.array([250.0, 2000.0, 500.0]), np.array([0.02, 0.02, 0.08])
    )
    assert float(t.length_comfort[0]) == pytest.approx(22.2222**3 / 300, rel=1e-4)
    assert float(t.length_shift_min[1]) == pytest.approx(math.sqrt(24 * 0.2 * 2000), rel=1e-12)
    assert float(t.runoff[2]) == pytest.approx(57.6, rel=1e-12)
    assert list(t.governing_name) == ["comfort", "lateral shift", "runoff"]
    np.testing.assert_allclose(
        t.spiral_length_min, np.max([t.length_comfort, t.length_shift_min, t.runoff], axis=0)
    )
    assert not t.failed.any()


def test_no_spiral_length_fails(metric):
    # 100 km/h on 100 m: comfort 27.78^3 / 120 = 178.6 m, above sqrt(24 x 1.0 x 100) = 49 m
    t = tr.road_transition(metric, 100 * KMH, 100.0, 0.08)
    assert bool(t.failed)
    assert t.flags & tr.FAIL_NO_SPIRAL_LENGTH
    assert float(t.spiral_length_min) > float(t.spiral_length_max)


def test_nan_input_fails_not_passes(metric):
    t = tr.road_transition(metric, 80 * KMH, np.nan, 0.06)
    assert bool(t.failed)


def test_gradient_lookup_flags(metric):
    speeds = np.array([100, 105, 10, 150]) * KMH
    t = tr.road_transition(metric, speeds, 3000.0, 0.04)
    assert (
        t.flags[0]
        & (tr.WARN_GRADIENT_INTERPOLATED | tr.WARN_SPEED_BELOW_TABLE | tr.WARN_SPEED_ABOVE_TABLE)
        == 0
    )
    assert t.flags[1] & tr.WARN_GRADIENT_INTERPOLATED
    assert t.flags[2] & tr.WARN_SPEED_BELOW_TABLE
    assert t.flags[3] & tr.WARN_SPEED_ABOVE_TABLE
    # 100 km/h: 0.44 % read (AASHTO 2004 Exhibit 3-30 via a design sheet, REFERENCES.md)
    assert float(t.relative_gradient[0]) == pytest.approx(0.0044)


def test_speed_outside_the_table_has_no_gradient_and_no_runoff(metric):
    # never extrapolated (issue 13): 400 km/h lies beyond Green Book Table 3-15
    t = tr.road_transition(metric, 400 * KMH, 5000.0, 0.04)
    assert t.flags & tr.WARN_GRADIENT_NOT_POSITIVE
    assert t.flags & tr.WARN_SPEED_ABOVE_TABLE
    assert np.isinf(t.runoff) and bool(t.failed)


def test_normal_crown_defaults_to_table(us):
    t = tr.road_transition(us, 50 * 0.44704, 2000 * FOOT, 0.04)
    assert float(t.runout / t.runoff) == pytest.approx(us.normal_crown / 0.04)
    t0 = tr.road_transition(us, 50 * 0.44704, 2000 * FOOT, 0.0)
    assert t0.flags & tr.NOTE_NO_SUPERELEVATION and np.isnan(t0.runout)


# ---- rail ------------------------------------------------------------------------------


def test_rail_lengths_by_hand():
    # definitions L1 = E/(dE/ds), L2 = E v/(dE/dt), L3 = D v/(dD/dt), worked by hand:
    # E 150 mm, D 100 mm, 160 km/h (44.44 m/s), limits 2.25 mm/m, 50 mm/s, 55 mm/s:
    # L1 = 150/2.25 = 66.67 m, L2 = 0.150 x 44.44/0.050 = 133.33 m, L3 = 0.100 x 44.44/0.055
    # = 80.81 m; the rate of change of cant governs
    t = tr.rail_transition(0.150, 0.100, 160 * KMH, 0.00225, 0.050, 0.055)
    assert float(t.length_cant_gradient) == pytest.approx(66.667, abs=1e-3)
    assert float(t.length_cant_rate) == pytest.approx(133.333, abs=1e-3)
    assert float(t.length_deficiency_rate) == pytest.approx(80.808, abs=1e-3)
    assert float(t.length) == pytest.approx(133.333, abs=1e-3)
    assert t.governing_name == "rate of change of cant"
    assert int(t.flags) == 0


def test_rail_km_h_form():
    # the practitioners' form with V in km/h, L = V E / (3.6 dE/dt) (common practice, no source)
    e, v_kmh, rate = 0.120, 120.0, 0.055
    t = tr.rail_transition(e, 0.0, v_kmh * KMH, np.nan, rate, np.nan)
    assert float(t.length) == pytest.approx(v_kmh * e / (3.6 * rate), rel=1e-12)


def test_rail_unevaluated_criteria_are_named():
    t = tr.rail_transition(0.1, 0.05, 30.0, np.nan, 0.05, np.nan)
    assert t.flags & tr.WARN_CANT_GRADIENT_NOT_EVALUATED
    assert t.flags & tr.WARN_DEFICIENCY_RATE_NOT_EVALUATED
    assert not t.flags & tr.WARN_CANT_RATE_NOT_EVALUATED
    assert t.governing_name == "rate of change of cant"
    none = tr.rail_transition(0.1, 0.05, 30.0, np.nan, np.nan, np.nan)
    assert bool(none.failed) and np.isnan(none.length) and none.governing_name == "none evaluated"


def test_negative_deficiency_uses_its_size():
    t = tr.rail_transition(0.1, -0.04, 30.0, np.nan, np.nan, 0.05)
    assert float(t.length) == pytest.approx(0.04 * 30 / 0.05)
    assert t.flags & tr.NOTE_NEGATIVE_DEFICIENCY


def test_us_limits_leave_transition_unevaluated():
    # 49 CFR 213.57 sets no transition limits: the file carries none, and the result says so
    t = tr.rail_transition_for(rail_limits("49cfr213-class3-5"), 0.1, 0.05, 25.0)
    assert t.flags & tr.FAIL_NONE_EVALUATED
    assert t.flags & tr.WARN_CANT_RATE_NOT_EVALUATED


def test_en_limits_carry_all_three():
    t = tr.rail_transition_for(rail_limits("en13803-2010"), 0.15, 0.10, 150 * KMH)
    assert not t.flags & (
        tr.WARN_CANT_GRADIENT_NOT_EVALUATED
        | tr.WARN_CANT_RATE_NOT_EVALUATED
        | tr.WARN_DEFICIENCY_RATE_NOT_EVALUATED
    )
    above = tr.rail_transition_for(rail_limits("en13803-2010"), 0.15, 0.10, 350 * KMH)
    assert above.flags & tr.WARN_SPEED_OUTSIDE_LIMITS


pos = st.floats(1e-3, 0.2)
lims = st.one_of(st.just(math.nan), st.floats(1e-4, 0.2))


# subnormal deficiencies (below 2.2e-308 m) lose precision in D v / L: not a track value
@given(pos, st.floats(-0.2, 0.2, allow_subnormal=False), st.floats(5, 90), lims, lims, lims)
def test_rail_length_meets_every_evaluated_limit(e, d, v, g, r, dr):
    # along a ramp of the governing length every evaluated rate is within its limit, and the
    # governing one meets it exactly (first principles: dE/ds = E/L, dE/dt = E v/L, dD/dt = D v/L)
    t = tr.rail_transition(e, d, v, g, r, dr)
    if np.isnan(t.length):
        assert np.isnan([g, r, dr]).all()
        return
    length = float(t.length)
    if length == 0.0:  # only a criterion with nothing to change was evaluated (D = 0)
        assert d == 0.0 and np.isnan([g, r]).all()
        return
    rates = [e / length, e * v / length, abs(d) * v / length]
    limits = [g, r, dr]
    for rate, limit in zip(rates, limits, strict=True):
        if not math.isnan(limit):
            assert rate <= limit * (1 + 1e-12)
    k = int(t.governing)
    assert rates[k] == pytest.approx(limits[k], rel=1e-12) or rates[k] == 0.0


# ---- limit files ------------------------------------------------------------------------

_BASE = """
[limits]
name = "t"
title = "t"
source = "unit test of the parser"
units = "{units}"
rail_centres = {centres}
[[bands]]
speed_max = 100
cant_recommended = 1
cant_max = 2
deficiency_recommended = 1
deficiency_max = 2
source = "unit test"
{extra}
"""


def test_parse_transition_keys_metric():
    doc = _BASE.format(
        units="metric",
        centres=1500,
        extra="cant_gradient_max = 2.5\ncant_rate_max = 60\ndeficiency_rate_max = 70",
    )
    lim = parse_rail_limits(tomllib.loads(doc))
    # unit conversion: mm/m -> m/m, mm/s -> m/s
    assert lim.cant_gradient_max[0] == pytest.approx(0.0025)
    assert lim.cant_rate_max[0] == pytest.approx(0.060)
    assert lim.deficiency_rate_max[0] == pytest.approx(0.070)


def test_parse_transition_keys_us():
    doc = _BASE.format(units="us", centres=60, extra="cant_gradient_max = 0.03\ncant_rate_max = 2")
    doc = doc.replace("rail_centres = 60", "cant_coefficient = 0.0007")
    lim = parse_rail_limits(tomllib.loads(doc))
    # in/ft -> m/m is 0.0254/0.3048 = 1/12; in/s -> m/s is 0.0254
    assert lim.cant_gradient_max[0] == pytest.approx(0.03 * INCH / FOOT)
    assert lim.cant_rate_max[0] == pytest.approx(2 * 0.0254)
    assert np.isnan(lim.deficiency_rate_max[0])


def test_parse_transition_keys_absent_and_bad():
    lim = parse_rail_limits(tomllib.loads(_BASE.format(units="metric", centres=1500, extra="")))
    assert np.isnan(lim.cant_gradient_max).all()
    bad = _BASE.format(units="metric", centres=1500, extra="cant_rate_max = 0")
    with pytest.raises(TableError, match="cant_rate_max"):
        parse_rail_limits(tomllib.loads(bad))
