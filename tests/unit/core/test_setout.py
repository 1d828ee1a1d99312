"""Setting-out tables and versines.

Check values come from:
- plane geometry: every arc point lies R from the arc centre; for a simple curve the
  deflection from the tangent at the PC to a point an arc length l on is l / (2R) and the
  chord 2 R sin(l / (2R)) (tangent-chord angle, Euclid, Elements III.32);
- the clothoid by mpmath's Fresnel integrals (mpmath.fresnelc / fresnels, 30 digits),
  placed in the ground frame by a rotation written here;
- the bend rebuilt from coordinates by integrating its heading with scipy quad (the same
  independent helper as in test_spiral.py, repeated here);
- versine v = R - sqrt(R^2 - (c/2)^2) by mpmath, and the hand arithmetic c^2 / (8R):
  20 m chord on R 1000 m, 400 / 8000 = 0.05 m.
PI coordinates, bearings and stations below are arbitrary inputs, not check values.
"""

from __future__ import annotations

import math

import mpmath
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from curvetui.core.circular import GeometryError, circular_curve
from curvetui.core.setout import SetoutTable, setout_points, versines, versines_along
from curvetui.core.spiral import spiral_curve

SETTINGS = settings(max_examples=30, deadline=None)


@pytest.fixture(autouse=True)
def _thirty_digits():
    with mpmath.workdps(30):
        yield


def mp_clothoid(s, ls, r):
    scale = mpmath.sqrt(mpmath.pi * mpmath.mpf(r) * mpmath.mpf(ls))
    z = mpmath.mpf(s) / scale
    return float(scale * mpmath.fresnelc(z)), float(scale * mpmath.fresnels(z))


def walk(r, d, l1, l2):
    """TS, SC, CS, ST in the local frame (TS at the origin, bend towards +y) by quad."""
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
        if length > 0:
            opts = {"epsabs": 1e-12 * length, "epsrel": 1e-12, "limit": 200}
            x += quad(lambda s, h=heading: math.cos(h(s)), 0.0, length, **opts)[0]
            y += quad(lambda s, h=heading: math.sin(h(s)), 0.0, length, **opts)[0]
        points.append((x, y))
    return [np.array(p) for p in points]


def frame(beta, sign):
    """Unit vectors (easting, northing): forward along the back tangent, towards the inside."""
    forward = np.array([math.sin(beta), math.cos(beta)])
    inside = sign * np.array([math.cos(beta), -math.sin(beta)])
    return forward, inside


def rows(t: SetoutTable):
    return list(zip(t.station, t.point, t.element, strict=True))


# --- simple curve -----------------------------------------------------------------------

R, DELTA, PI_ST = 350.0, math.radians(64.0), 4321.0
PI_E, PI_N, BETA = 512000.0, 6105000.0, math.radians(71.5)


@pytest.mark.parametrize("sign", [1, -1])
def test_simple_curve_points_on_the_circle(sign):
    c = circular_curve(R, DELTA, PI_ST)
    t = setout_points(c, PI_E, PI_N, BETA, 20.0, direction=sign)
    forward, inside = frame(BETA, sign)
    tangent = R * math.tan(DELTA / 2)
    pc = np.array([PI_E, PI_N]) - tangent * forward
    centre = pc + R * inside
    pts = np.column_stack([t.easting, t.northing])
    np.testing.assert_allclose(np.hypot(*(pts - centre).T), R, rtol=0, atol=1e-8)
    # PC and PT: PT = PI + T along the forward bearing beta + sign D
    beta2 = BETA + sign * DELTA
    pt = np.array([PI_E, PI_N]) + tangent * np.array([math.sin(beta2), math.cos(beta2)])
    np.testing.assert_allclose(pts[0], pc, atol=1e-8)
    np.testing.assert_allclose(pts[-1], pt, atol=1e-8)
    # tangent-chord angle: deflection l / (2R), chord 2 R sin(l / (2R))
    arc = t.station - (PI_ST - tangent)
    np.testing.assert_allclose(t.deflection, sign * arc / (2 * R), rtol=0, atol=1e-12)
    np.testing.assert_allclose(t.chord, 2 * R * np.sin(arc / (2 * R)), rtol=0, atol=1e-9)


def test_simple_curve_stations_and_labels():
    # PC at 4321 - 350 tan 32 deg = 4102.296 (mpmath below), PT = PC + 350 x 64 pi/180
    c = circular_curve(R, DELTA, PI_ST)
    t = setout_points(c, PI_E, PI_N, BETA, 20.0)
    pc = float(PI_ST - 350 * mpmath.tan(mpmath.radians(32)))
    pt = pc + float(350 * mpmath.radians(64))
    assert t.station[0] == pytest.approx(pc, abs=1e-9)
    assert t.station[-1] == pytest.approx(pt, abs=1e-9)
    assert list(t.point[[0, -1]]) == ["PC", "PT"]
    assert set(t.point[1:-1]) == {""}
    assert list(t.element[[0, -1]]) == ["tangent point", "tangent point"]
    assert set(t.element[1:-1]) == {"arc"}
    # every multiple of 20 m between, and nothing else: 4120, 4140, ..., 4480
    expected = np.arange(math.ceil(pc / 20) * 20, pt, 20.0)
    np.testing.assert_array_equal(t.station[1:-1], expected)


def test_round_station_on_a_key_point_is_not_repeated():
    # choose the PI so that the PC falls on 1+020 exactly (T = 100 tan 0.3 computed by mpmath)
    tangent = float(100 * mpmath.tan(mpmath.mpf(0.3)))
    c = circular_curve(100.0, 0.6, pi_station=1020.0 + tangent)
    t = setout_points(c, 0.0, 0.0, 0.0, 20.0)
    assert t.station[0] == pytest.approx(1020.0, abs=1e-9)
    assert t.station[1] == pytest.approx(1040.0)
    assert np.all(np.diff(t.station) > 1e-6)


@SETTINGS
@given(
    beta=st.floats(0, 2 * math.pi),
    r=st.floats(20, 3000),
    d=st.floats(0.01, 3.0),
    sign=st.sampled_from([1, -1]),
)
def test_chord_and_deflection_agree_with_coordinates(beta, r, d, sign):
    t = setout_points(circular_curve(r, d, 5000.0), 1e5, 2e5, beta, r * d / 7, sign)
    de, dn = t.easting - t.easting[0], t.northing - t.northing[0]
    np.testing.assert_allclose(np.hypot(de, dn), t.chord, rtol=0, atol=1e-7)
    # the point lies at distance chord on the bearing beta + deflection from the PC
    bearing = beta + t.deflection
    np.testing.assert_allclose(t.chord * np.sin(bearing), de, rtol=0, atol=1e-7)
    np.testing.assert_allclose(t.chord * np.cos(bearing), dn, rtol=0, atol=1e-7)


# --- spiralled bend ---------------------------------------------------------------------

SR, SD, L1, L2, SPI = 420.0, math.radians(38.0), 75.0, 110.0, 2750.0


def _spiral_table(sign=1, interval=20.0):
    c = spiral_curve(SR, SD, L1, L2, pi_station=SPI)
    return c, setout_points(c, PI_E, PI_N, BETA, interval, direction=sign)


@pytest.mark.parametrize("sign", [1, -1])
def test_spiral_points_lie_on_the_walked_bend(sign):
    c, t = _spiral_table(sign)
    forward, inside = frame(BETA, sign)
    ts = np.array([PI_E, PI_N]) - float(c.tangent_in) * forward
    pts = np.column_stack([t.easting, t.northing])
    local = np.column_stack([(pts - ts) @ forward, (pts - ts) @ inside])
    ts_w, sc_w, cs_w, st_w = walk(SR, SD, L1, L2)
    th1 = L1 / (2 * SR)
    centre = sc_w + SR * np.array([-math.sin(th1), math.cos(th1)])
    for (station, _point, element), xy in zip(rows(t), local, strict=True):
        s = station - float(c.ts)
        if element == "spiral in":
            assert np.allclose(xy, mp_clothoid(s, L1, SR), atol=1e-8), station
        elif element == "arc":
            assert np.hypot(*(xy - centre)) == pytest.approx(SR, abs=1e-8), station
        elif element == "spiral out":
            # from the ST backwards: the clothoid in the ST's frame, rotated by D
            w = float(c.st) - station
            xo, yo = mp_clothoid(w, L2, SR)
            back = -np.array([math.cos(SD), math.sin(SD)])
            normal = np.array([-math.sin(SD), math.cos(SD)])
            assert np.allclose(xy, st_w + xo * back + yo * normal, atol=1e-8), station
    named = dict(zip(t.point, local, strict=True))
    for name, walked in zip(["TS", "SC", "CS", "ST"], [ts_w, sc_w, cs_w, st_w], strict=True):
        assert np.allclose(named[name], walked, atol=1e-8), name


def test_spiral_key_points_and_stations():
    c, t = _spiral_table()
    keys = [(p, e) for _, p, e in rows(t) if p]
    assert keys == [("TS", "tangent point"), ("SC", "arc"), ("CS", "arc"), ("ST", "tangent point")]
    for name in ("ts", "sc", "cs", "st"):
        assert t.station[list(t.point).index(name.upper())] == float(getattr(c, name))
    between = t.station[t.point == ""]
    np.testing.assert_allclose(between % 20.0, 0.0, atol=1e-9)
    expected = np.arange(math.ceil(float(c.ts) / 20) * 20, float(c.st), 20.0)
    np.testing.assert_array_equal(between, expected)
    assert np.all(np.diff(t.station) > 0)
    for station, point, element in rows(t):
        if point:
            continue
        if station < float(c.sc):
            assert element == "spiral in"
        elif station < float(c.cs):
            assert element == "arc"
        else:
            assert element == "spiral out"


def test_spiral_deflection_at_sc_is_atan_y_over_x():
    # deflection at the TS to the SC: atan(Y / X), about theta / 3 (from memory, the usual
    # approximation; differs here by under 0.1 %)
    c, t = _spiral_table()
    sc = list(t.point).index("SC")
    x, y = mp_clothoid(L1, L1, SR)
    assert t.deflection[sc] == pytest.approx(math.atan2(y, x), abs=1e-12)
    assert t.deflection[sc] == pytest.approx(L1 / (2 * SR) / 3, rel=1e-3)
    assert t.chord[sc] == pytest.approx(math.hypot(x, y), abs=1e-9)


def test_left_bend_mirrors_right_bend():
    _, right = _spiral_table(1)
    _, left = _spiral_table(-1)
    normal = np.array([math.cos(BETA), -math.sin(BETA)])  # right of the back tangent
    pa = np.column_stack([right.easting - PI_E, right.northing - PI_N])
    pb = np.column_stack([left.easting - PI_E, left.northing - PI_N])
    # reflected in the back tangent line through the PI, the left bend is the right one
    mirrored = pb - 2 * np.outer(pb @ normal, normal)
    np.testing.assert_allclose(pa, mirrored, atol=1e-8)
    np.testing.assert_allclose(left.deflection, -right.deflection, atol=0)
    np.testing.assert_array_equal(left.chord, right.chord)


def test_zero_length_spirals_set_out_like_the_simple_curve():
    c = circular_curve(R, DELTA, PI_ST)
    s = spiral_curve(R, DELTA, 0.0, pi_station=PI_ST)
    a = setout_points(c, PI_E, PI_N, BETA, 20.0)
    b = setout_points(s, PI_E, PI_N, BETA, 20.0)
    keep = b.point != "SC"  # SC = TS, CS = ST on a bend without spirals
    keep &= b.point != "CS"
    np.testing.assert_allclose(b.easting[keep], a.easting, atol=1e-9)
    np.testing.assert_allclose(b.northing[keep], a.northing, atol=1e-9)


# --- refusals ---------------------------------------------------------------------------


def test_overlapping_spirals_refused():
    c = spiral_curve(500.0, math.radians(10), 108.0)
    with pytest.raises(GeometryError, match="spirals overlap"):
        setout_points(c, 0.0, 0.0, 0.0, 20.0)
    with pytest.raises(GeometryError, match="spirals overlap"):
        versines_along(c, 20.0, 10.0)


@pytest.mark.parametrize(
    ("kwargs", "words"),
    [
        ({"interval": 0.0}, "interval"),
        ({"interval": -5.0}, "interval"),
        ({"interval": np.nan}, "interval"),
        ({"interval": 1e-6}, "stations"),
        ({"direction": 0}, "direction"),
        ({"direction": 2}, "direction"),
        ({"back_bearing": np.inf}, "bearing"),
    ],
)
def test_bad_setout_inputs_refused(kwargs, words):
    args = {"pi_easting": 0.0, "pi_northing": 0.0, "back_bearing": 0.0, "interval": 20.0}
    args.update(kwargs)
    with pytest.raises(GeometryError, match=words):
        setout_points(circular_curve(300.0, 0.5), **args)


def test_one_bend_at_a_time():
    with pytest.raises(GeometryError, match="one bend at a time"):
        setout_points(circular_curve([300.0, 400.0], 0.5), 0.0, 0.0, 0.0, 20.0)
    with pytest.raises(GeometryError, match="CircularCurve or SpiralCurve"):
        setout_points("curve", 0.0, 0.0, 0.0, 20.0)


# --- versines ---------------------------------------------------------------------------


def test_versine_20_m_chord_on_1000_m():
    # hand arithmetic c^2 / (8R) = 400 / 8000 = 0.05 m; exact R - sqrt(R^2 - 100) by mpmath
    v = float(versines(1000.0, 20.0))
    assert v == pytest.approx(0.05, abs=2e-6)
    assert v == pytest.approx(float(1000 - mpmath.sqrt(1000**2 - 100)), rel=1e-13)


@pytest.mark.parametrize(("r", "c"), [(1e4, 0.01), (300.0, 20.0), (50.0, 100.0), (190.0, 30.0)])
def test_versine_exact_against_mpmath(r, c):
    expected = mpmath.mpf(r) - mpmath.sqrt(mpmath.mpf(r) ** 2 - (mpmath.mpf(c) / 2) ** 2)
    assert float(versines(r, c)) == pytest.approx(float(expected), rel=1e-13)


def test_versine_refuses_chord_longer_than_diameter():
    with pytest.raises(GeometryError, match="diameter"):
        versines(10.0, 20.5)
    with pytest.raises(GeometryError, match="chord"):
        versines(10.0, -1.0)


def test_versines_along_a_spiralled_curve():
    c = spiral_curve(SR, SD, L1, L2, pi_station=SPI)
    chord = 20.0
    v = versines_along(c, chord, 10.0)
    ts, sc, cs, st_ = (float(getattr(c, n)) for n in ("ts", "sc", "cs", "st"))
    # on the arc, at least c/2 from either end: the three points lie on the circle,
    # c/2 of arc apart: v = R (1 - cos(c / (2R))) (mpmath)
    on_arc = (v.station >= sc + chord / 2) & (v.station <= cs - chord / 2)
    assert on_arc.sum() >= 5
    arc_v = float(SR * (1 - mpmath.cos(mpmath.mpf(chord) / (2 * SR))))
    np.testing.assert_allclose(v.versine[on_arc], arc_v, rtol=1e-9)
    # and that is within c^4 / (96 R^3) of the string-chord versine
    assert abs(arc_v - float(versines(SR, chord))) < chord**4 / (96 * SR**3) * 1.01
    # inside the spiral in: curvature s / (R Ls), versine about c^2 s / (8 R Ls)
    in_spiral = (v.station >= ts + chord / 2) & (v.station <= sc - chord / 2)
    assert in_spiral.sum() >= 3
    s = v.station[in_spiral] - ts
    np.testing.assert_allclose(v.versine[in_spiral], chord**2 * s / (8 * SR * L1), rtol=1e-3)
    # spiral out likewise, measured back from the ST
    out_spiral = (v.station >= cs + chord / 2) & (v.station <= st_ - chord / 2)
    w = st_ - v.station[out_spiral]
    np.testing.assert_allclose(v.versine[out_spiral], chord**2 * w / (8 * SR * L2), rtol=1e-3)
    assert np.all(v.versine > 0)


def test_versines_along_a_simple_curve_hand_value():
    # R 1000 m, 20 m chord, mid-curve: about c^2 / (8R) = 0.05 m (hand arithmetic)
    c = circular_curve(1000.0, 0.3, pi_station=2000.0)
    v = versines_along(c, 20.0, 20.0)
    mid = (v.station > float(c.pc) + 10) & (v.station < float(c.pt) - 10)
    np.testing.assert_allclose(v.versine[mid], 0.05, atol=2e-6)
    # at the PC half the chord is on the tangent: a smaller versine, still positive
    assert 0 < v.versine[0] < 0.05


def test_versines_along_refusals():
    c = circular_curve(30.0, 0.5)
    with pytest.raises(GeometryError, match="chord"):
        versines_along(c, 0.0, 5.0)
    with pytest.raises(GeometryError, match="diameter"):
        versines_along(c, 61.0, 5.0)
