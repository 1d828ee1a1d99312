"""Clothoid transitions and spiral - arc - spiral bends.

Check values come from:
- mpmath's Fresnel integrals at 30 digits: mpmath.fresnelc(z) = int_0^z cos(pi t^2 / 2) dt
  and fresnels likewise (the same normalisation as scipy.special.fresnel), so the clothoid
  with A^2 = R Ls is x = A sqrt(pi) C(s / (A sqrt(pi))); that normalisation is itself checked
  against mpmath.quad of the defining integral x = int_0^s cos(t^2 / (2 A^2)) dt;
- the series X = Ls (1 - theta^2/10 + theta^4/216 - ...), Y = Ls (theta/3 - theta^3/42 +
  theta^5/1320 - ...) as printed in route-surveying texts (from memory), summed here to
  convergence from the general term (term-by-term integration of the Maclaurin series);
- the bend rebuilt from coordinates: its heading (clothoid: theta = s^2 / (2 R Ls); arc:
  theta1 + s / R) integrated with scipy.integrate.quad from the TS, a helper that uses none
  of the engine's formulas for T, p, k or X, Y;
- the unequal-spiral tangent T1 = k1 + (R + p2) / sin D - (R + p1) / tan D (derived from
  the arc centre lying R + p1 from the back tangent and R + p2 from the forward one),
  with p and k from mpmath.
Published worked examples (Montana DOT, a textbook problem) are in tests/validation.
"""

from __future__ import annotations

import math
import re

import mpmath
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from curvetui.core.circular import circular_curve
from curvetui.core.spiral import (
    GeometryError,
    SpiralCurve,
    clothoid_xy,
    require_spirals_fit,
    spiral_curve,
)

SETTINGS = settings(max_examples=40, deadline=None)


@pytest.fixture(autouse=True)
def _thirty_digits():
    with mpmath.workdps(30):
        yield


# --- independent references -------------------------------------------------------------


def mp_clothoid(s, ls, r):
    """(x, y) by mpmath's Fresnel integrals, 30 digits."""
    scale = mpmath.sqrt(mpmath.pi * mpmath.mpf(r) * mpmath.mpf(ls))
    z = mpmath.mpf(s) / scale
    return scale * mpmath.fresnelc(z), scale * mpmath.fresnels(z)


def mp_shift(ls, r):
    """(theta, X, Y, p, k) of one spiral by mpmath."""
    r = mpmath.mpf(r)
    th = mpmath.mpf(ls) / (2 * r)
    x, y = mp_clothoid(ls, ls, r)
    return th, x, y, y - r * (1 - mpmath.cos(th)), x - r * mpmath.sin(th)


def series_xy(ls, theta):
    """X, Y by the Fresnel series in theta, summed until the terms vanish."""
    x = y = 0.0
    for n in range(40):
        tx = (-1) ** n * theta ** (2 * n) / (math.factorial(2 * n) * (4 * n + 1))
        ty = (-1) ** n * theta ** (2 * n + 1) / (math.factorial(2 * n + 1) * (4 * n + 3))
        x, y = x + tx, y + ty
        if abs(tx) < 1e-18 and abs(ty) < 1e-18:
            break
    return ls * x, ls * y


def walk(r, d, l1, l2):
    """TS, SC, CS, ST in the local frame (TS at the origin, back tangent along +x, bend
    towards +y), by integrating the heading of each element with scipy quad."""
    th1, th2 = l1 / (2 * r), l2 / (2 * r)
    lc = r * (d - th1 - th2)
    pieces = [
        (l1, lambda s: s * s / (2 * r * l1)),
        (lc, lambda s: th1 + s / r),
        (l2, lambda s: d - (l2 - s) ** 2 / (2 * r * l2)),
    ]
    x = y = 0.0
    points = [(0.0, 0.0)]
    for length, heading in pieces:
        if length > 1e-6:
            opts = {"epsabs": 1e-12 * length, "epsrel": 1e-12, "limit": 200}
            x += quad(lambda s, h=heading: math.cos(h(s)), 0.0, length, **opts)[0]
            y += quad(lambda s, h=heading: math.sin(h(s)), 0.0, length, **opts)[0]
        elif length > 0:  # a sliver: the midpoint rule is exact to O(length^3)
            x += length * math.cos(heading(length / 2))
            y += length * math.sin(heading(length / 2))
        points.append((x, y))
    return [np.array(p) for p in points]


# --- clothoid coordinates ---------------------------------------------------------------


@pytest.mark.parametrize("r", [30.0, 150.0, 800.0, 5000.0])
@pytest.mark.parametrize("ls", [10.0, 60.0, 200.0])
def test_clothoid_matches_mpmath_fresnel(r, ls):
    fractions = np.array([0.01, 0.1, 0.25, 0.5, 0.75, 0.9, 1.0])
    x, y = clothoid_xy(fractions * ls, ls, r)
    for f, xi, yi in zip(fractions, x, y, strict=True):
        xr, yr = mp_clothoid(f * ls, ls, r)
        assert abs(xi - float(xr)) <= 1e-9 * float(xr)
        assert abs(yi - float(yr)) <= 1e-9 * float(yr)


@pytest.mark.parametrize(("s", "ls", "r"), [(37.0, 80.0, 250.0), (200.0, 200.0, 90.0)])
def test_fresnel_normalisation_against_the_defining_integral(s, ls, r):
    a2 = mpmath.mpf(r) * ls
    x = mpmath.quad(lambda t: mpmath.cos(t**2 / (2 * a2)), [0, s])
    y = mpmath.quad(lambda t: mpmath.sin(t**2 / (2 * a2)), [0, s])
    xc, yc = clothoid_xy(s, ls, r)
    assert float(xc) == pytest.approx(float(x), rel=1e-12)
    assert float(yc) == pytest.approx(float(y), rel=1e-12)


@pytest.mark.parametrize("theta", [1e-4, 0.01, 0.1, 0.3, 0.6, 1.0])
def test_clothoid_end_matches_series(theta):
    r = 400.0
    ls = 2 * r * theta
    xs, ys = series_xy(ls, theta)
    x, y = clothoid_xy(ls, ls, r)
    assert float(x) == pytest.approx(xs, rel=1e-12)
    assert float(y) == pytest.approx(ys, rel=1e-12)


# theta = s^2 / (2 R Ls): up to 1 rad the engine sums the power series, beyond it calls
# scipy's fresnel; both sides of the switch against mpmath at 30 digits, to a few ulp.
@pytest.mark.parametrize(
    "theta", [1e-9, 1e-3, 0.05, 0.3, 0.7, 0.999999, 1.0, 1.000001, 1.3, 2.5, 6.0]
)
def test_clothoid_both_sides_of_the_series_limit_match_mpmath(theta):
    r, ls = 250.0, 600.0
    s = math.sqrt(theta * 2 * r * ls)
    xr, yr = mp_clothoid(s, ls, r)
    x, y = clothoid_xy(np.array([s, -s]), ls, r)
    for sign, xi, yi in zip((1, -1), x, y, strict=True):  # x and y are odd in s
        assert float(xi) == pytest.approx(sign * float(xr), rel=4e-15, abs=0)
        assert float(yi) == pytest.approx(sign * float(yr), rel=4e-15, abs=0)


def test_clothoid_mixed_arrays_and_scalars_keep_their_shape():
    x, y = clothoid_xy(np.array([[10.0, 600.0]]), 600.0, 250.0)  # theta 3e-4 and 1.2 rad
    assert x.shape == y.shape == (1, 2)
    x0, y0 = clothoid_xy(30.0, 60.0, 300.0)
    assert np.ndim(x0) == np.ndim(y0) == 0


def test_clothoid_zero_length_and_start():
    x, y = clothoid_xy(0.0, 0.0, 300.0)
    assert float(x) == 0.0 and float(y) == 0.0
    x, y = clothoid_xy(0.0, 50.0, 300.0)
    assert float(x) == 0.0 and float(y) == 0.0


def test_clothoid_broadcasts():
    x, y = clothoid_xy(np.linspace(0, 100, 5)[:, None], 100.0, np.array([200.0, 400.0]))
    assert x.shape == y.shape == (5, 2)


def test_clothoid_refuses_bad_radius():
    with pytest.raises(GeometryError, match="radius"):
        clothoid_xy(10.0, 50.0, 0.0)
    with pytest.raises(GeometryError, match="spiral length"):
        clothoid_xy(10.0, -5.0, 100.0)


# --- spiral elements ---------------------------------------------------------------------


@pytest.mark.parametrize(
    ("r", "ls", "d_deg"), [(3000.0, 64.0, 15.0), (250.0, 90.0, 48.0), (90.0, 120.0, 140.0)]
)
def test_equal_spirals_match_mpmath(r, ls, d_deg):
    # Ts = (R + p) tan(D/2) + k, Es = (R + p) sec(D/2) - R, Lc = R (D - 2 theta)
    th, x, y, p, k = mp_shift(ls, r)
    d = mpmath.radians(d_deg)
    c = spiral_curve(r, float(d), ls, pi_station=5000.0)
    expected = {
        "theta_in": th,
        "xs_in": x,
        "ys_in": y,
        "p_in": p,
        "k_in": k,
        "xs_out": x,
        "p_out": p,
        "tangent_in": (r + p) * mpmath.tan(d / 2) + k,
        "tangent_out": (r + p) * mpmath.tan(d / 2) + k,
        "external": (r + p) * mpmath.sec(d / 2) - r,
        "circular_length": r * (d - 2 * th),
        "total_length": r * (d - 2 * th) + 2 * ls,
    }
    for name, value in expected.items():
        assert float(getattr(c, name)) == pytest.approx(float(value), rel=1e-9), name
    assert not bool(c.overlap)


def test_small_angle_approximations():
    # the classic approximations p ~ Ls^2 / (24 R), k ~ Ls / 2 (from memory; errors of
    # relative order theta^2) on Ls 60 m, R 1500 m (theta = 0.02)
    c = spiral_curve(1500.0, 0.4, 60.0)
    assert float(c.p_in) == pytest.approx(60.0**2 / (24 * 1500.0), rel=1e-3)
    assert float(c.k_in) == pytest.approx(30.0, rel=1e-4)


def test_unequal_tangent_formula_from_the_brief():
    # T1 = k1 + (R + p2)/sin D - (R + p1)/tan D, T2 symmetric, p and k from mpmath
    r, d, l1, l2 = 600.0, mpmath.radians(35), 70.0, 130.0
    _, _, _, p1, k1 = mp_shift(l1, r)
    _, _, _, p2, k2 = mp_shift(l2, r)
    t1 = k1 + (r + p2) / mpmath.sin(d) - (r + p1) / mpmath.tan(d)
    t2 = k2 + (r + p1) / mpmath.sin(d) - (r + p2) / mpmath.tan(d)
    c = spiral_curve(r, float(d), l1, l2)
    assert float(c.tangent_in) == pytest.approx(float(t1), rel=1e-10)
    assert float(c.tangent_out) == pytest.approx(float(t2), rel=1e-10)


def _check_by_walking(c: SpiralCurve):
    r, d = float(c.radius), float(c.deflection)
    l1, l2 = float(c.ls_in), float(c.ls_out)
    ts, sc, cs, st_ = walk(r, d, l1, l2)
    size = max(r, float(c.tangent_in), float(c.tangent_out))
    tol = 1e-9 * size
    pi = np.array([float(c.tangent_in), 0.0])
    forward = np.array([math.cos(d), math.sin(d)])
    # the walked end lies on the forward tangent, T_out from the PI
    assert np.allclose(st_, pi + float(c.tangent_out) * forward, rtol=0, atol=tol)
    # SC where the engine puts it (X, Y at the SC)
    assert np.allclose(sc, [float(c.xs_in), float(c.ys_in)], rtol=0, atol=tol)
    # the arc centre: R from SC and CS; external = |PI - O| - R
    th1 = l1 / (2 * r)
    centre = sc + r * np.array([-math.sin(th1), math.cos(th1)])
    assert np.hypot(*(cs - centre)) == pytest.approx(r, abs=tol)
    assert float(c.external) == pytest.approx(np.hypot(*(pi - centre)) - r, abs=tol)
    # shift p: the centre is R + p1 from the back tangent, k1 along it
    assert centre[1] - r == pytest.approx(float(c.p_in), abs=tol)
    assert centre[0] == pytest.approx(float(c.k_in), abs=tol)


@pytest.mark.parametrize(
    ("r", "d_deg", "l1", "l2"),
    [
        (600.0, 35.0, 70.0, 130.0),
        (250.0, 80.0, 150.0, 40.0),
        (1200.0, 12.0, 0.0, 110.0),  # spiral out only
        (400.0, 120.0, 90.0, 0.0),  # spiral in only
        (500.0, 20.0, 100.0, 2 * 500.0 * math.radians(20) - 100.0),  # no arc left
    ],
)
def test_unequal_spirals_by_coordinates(r, d_deg, l1, l2):
    _check_by_walking(spiral_curve(r, math.radians(d_deg), l1, l2))


@SETTINGS
@given(
    r=st.floats(30.0, 5000.0),
    d=st.floats(0.02, 3.0),
    f1=st.floats(0.0, 1.0),
    f2=st.floats(0.0, 1.0),
)
def test_any_fitting_bend_closes_by_coordinates(r, d, f1, f2):
    # Ls1 + Ls2 <= 2 R D always fits
    _check_by_walking(spiral_curve(r, d, f1 * r * d, f2 * r * d))


@SETTINGS
@given(r=st.floats(30.0, 5000.0), d=st.floats(0.02, 3.0), f1=st.floats(0, 1), f2=st.floats(0, 1))
def test_swapping_spirals_swaps_tangents(r, d, f1, f2):
    a = spiral_curve(r, d, f1 * r * d, f2 * r * d)
    b = spiral_curve(r, d, f2 * r * d, f1 * r * d)
    scale = max(float(a.tangent_in), float(a.tangent_out), r)
    assert float(a.tangent_in) == pytest.approx(float(b.tangent_out), abs=1e-12 * scale)
    assert float(a.external) == pytest.approx(float(b.external), abs=1e-9 * scale)


def test_stations_close():
    # ST = PI - T_in + total length; SC = TS + Ls1, CS = SC + Lc, ST = CS + Ls2
    c = spiral_curve(700.0, math.radians(40), 80.0, 120.0, pi_station=12345.6)
    t_in, total = float(c.tangent_in), float(c.total_length)
    assert float(c.ts) == pytest.approx(12345.6 - t_in, abs=1e-9)
    assert float(c.st) == pytest.approx(12345.6 - t_in + total, abs=1e-9)
    assert float(c.sc) - float(c.ts) == pytest.approx(80.0, abs=1e-9)
    assert float(c.st) - float(c.cs) == pytest.approx(120.0, abs=1e-9)
    lc = 700.0 * (math.radians(40) - 80.0 / 1400.0 - 120.0 / 1400.0)
    assert float(c.cs) - float(c.sc) == pytest.approx(lc, abs=1e-9)


def test_zero_spirals_give_the_simple_curve_exactly():
    r = np.array([50.0, 300.0, 2500.0, 1e4])
    d = np.array([0.01, 0.5, 1.2, 3.0])
    s = spiral_curve(r, d, 0.0, pi_station=1000.0)
    c = circular_curve(r, d, pi_station=1000.0)
    np.testing.assert_array_equal(s.tangent_in, c.tangent)
    np.testing.assert_array_equal(s.tangent_out, c.tangent)
    np.testing.assert_array_equal(s.external, c.external)
    np.testing.assert_array_equal(s.circular_length, c.length)
    np.testing.assert_array_equal(s.total_length, c.length)
    np.testing.assert_array_equal(s.ts, c.pc)
    np.testing.assert_array_equal(s.sc, c.pc)
    np.testing.assert_array_equal(s.cs, c.pt)
    np.testing.assert_array_equal(s.st, c.pt)
    assert not s.overlap.any()
    assert (s.p_in == 0).all() and (s.k_in == 0).all()


def test_equal_and_nearly_equal_external_agree():
    # the equal-spiral formula and the general one meet where the spirals become equal
    a = spiral_curve(800.0, 0.6, 100.0, 100.0)
    b = spiral_curve(800.0, 0.6, 100.0, 100.0 * (1 + 1e-9))
    assert float(b.external) == pytest.approx(float(a.external), rel=1e-8)


# --- overlapping spirals ----------------------------------------------------------------


def test_overlap_gives_nan_and_flag_per_element():
    # R 500 m, D 10 deg: the spirals fit while Ls1 + Ls2 <= 2 x 500 x 0.17453 = 174.53 m
    c = spiral_curve(500.0, math.radians(10), np.array([60.0, 87.0, 88.0, 120.0]))
    assert c.overlap.tolist() == [False, False, True, True]
    for name in (
        "tangent_in",
        "tangent_out",
        "external",
        "circular_length",
        "total_length",
        "ts",
        "sc",
        "cs",
        "st",
    ):
        values = getattr(c, name)
        assert np.isnan(values[2:]).all(), name
        assert np.isfinite(values[:2]).all(), name
    assert np.isfinite(c.theta_in).all() and np.isfinite(c.p_in).all()


def test_require_spirals_fit_message_and_suggestions():
    # theta = 108 / 1000 rad = 6.19 deg each, D 10 deg
    c = spiral_curve(500.0, math.radians(10), 108.0)
    with pytest.raises(GeometryError) as info:
        require_spirals_fit(c)
    text = str(info.value)
    assert "spirals overlap" in text
    assert "6.2° + 6.2° exceed the deflection 10.0°" in text
    longest = float(re.search(r"at most ([\d.]+) m each", text).group(1))
    radius = float(re.search(r"radius of at least ([\d.]+) m", text).group(1))
    # the suggestions fit (hand arithmetic: Ls <= R D = 87.266 m; R >= Ls / D = 618.79 m)
    assert longest == pytest.approx(87.26, abs=0.005)
    assert not bool(spiral_curve(500.0, math.radians(10), longest).overlap)
    assert bool(spiral_curve(500.0, math.radians(10), longest + 0.01).overlap)
    assert not bool(spiral_curve(radius, math.radians(10), 108.0).overlap)


def test_require_spirals_fit_unequal_and_arrays():
    c = spiral_curve(500.0, math.radians(10), [50.0, 150.0], [60.0, 50.0])
    with pytest.raises(GeometryError, match=r"element 1; 1 of 2.*m in and .* m out") as info:
        require_spirals_fit(c)
    lengths = re.search(r"at most ([\d.]+) m in and ([\d.]+) m out", str(info.value))
    l1, l2 = float(lengths.group(1)), float(lengths.group(2))
    assert l1 / l2 == pytest.approx(3.0, rel=1e-3)  # ratio kept
    assert not bool(spiral_curve(500.0, math.radians(10), l1, l2).overlap)


def test_require_spirals_fit_passes_a_good_curve_through():
    c = spiral_curve(500.0, math.radians(30), 80.0)
    assert require_spirals_fit(c) is c


def test_angles_shown_with_enough_decimals():
    # theta sum 10.004 deg on D 10 deg: one decimal would read "5.0 + 5.0 exceed 10.0"
    d = math.radians(10.0)
    ls = 500.0 * d * 1.0004
    with pytest.raises(GeometryError) as info:
        require_spirals_fit(spiral_curve(500.0, d, ls))
    a, b, c = map(
        float,
        re.search(
            r"angles ([\d.]+)° \+ ([\d.]+)° exceed the deflection "
            r"([\d.]+)°",
            str(info.value),
        ).groups(),
    )
    assert a + b > c


@pytest.mark.parametrize("r", [97.3, 1145.9155902616465, 3333.3])
@pytest.mark.parametrize("d", [0.1, 0.98785, 2.2])
def test_spiral_to_spiral_within_rounding_is_accepted(r, d):
    # Ls = R D each: theta1 + theta2 = D, no arc left (in floating point the two spiral
    # angles may sum an ulp over D; that is not an overlap)
    c = spiral_curve(r, d, r * d)
    assert not bool(c.overlap)
    assert float(c.circular_length) == pytest.approx(0.0, abs=1e-9 * r)
    require_spirals_fit(c)


@pytest.mark.parametrize(
    ("args", "words"),
    [
        ((0.0, 0.5, 10.0), "radius"),
        ((100.0, 0.0, 10.0), "deflection"),
        ((100.0, 3.2, 10.0), "deflection"),
        ((100.0, 0.5, -1.0), "spiral length in"),
        ((100.0, 0.5, 10.0, np.nan), "spiral length out"),
    ],
)
def test_bad_inputs_refused(args, words):
    with pytest.raises(GeometryError, match=words):
        spiral_curve(*args)
