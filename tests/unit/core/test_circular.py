"""Simple circular curves and degree of curve.

Check values come from:
- mpmath at 30 digits, evaluating the textbook relations T = R tan(D/2), L = R D,
  E = R (sec(D/2) - 1), M = R (1 - cos(D/2)), LC = 2 R sin(D/2) (REFERENCES.md, read in a
  surveying reference, "Horizontal Curves");
- plane geometry that does not use those relations: Pythagoras on the triangle
  centre-PC-PI (T^2 + R^2 = (R + E)^2) and the intersecting-chords theorem
  (Euclid, Elements III.35: (LC/2)^2 = M (2R - M));
- stations PC = PI - T, PT = PC + L (Indiana DOT Design Manual, Fig. 43-6D, read);
- the definitions of degree of curve: a 100 ft arc (arc definition) or a 100 ft chord
  (chord definition) subtends D (REFERENCES.md).
The published worked example (Delta 60 deg, R 150 ft) is in tests/validation.
"""

from __future__ import annotations

import dataclasses

import mpmath
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from curvetui.core.circular import (
    CircularCurve,
    GeometryError,
    circular_curve,
    degree_of_curve_arc,
    degree_of_curve_chord,
    radius_from_degree_arc,
    radius_from_degree_chord,
)
from curvetui.core.units import FOOT

SETTINGS = settings(max_examples=80, deadline=None)
radii = st.floats(1.0, 1e5)
deflections = st.floats(1e-6, np.pi - 1e-3)


@pytest.fixture(autouse=True)
def _thirty_digits():
    with mpmath.workdps(30):
        yield


def _mp_reference(r, d):
    r, h = mpmath.mpf(r), mpmath.mpf(d) / 2
    return {
        "tangent": r * mpmath.tan(h),
        "length": r * 2 * h,
        "external": r * (mpmath.sec(h) - 1),
        "middle_ordinate": r * (1 - mpmath.cos(h)),
        "long_chord": 2 * r * mpmath.sin(h),
    }


@SETTINGS
@given(r=radii, d=deflections)
def test_elements_match_mpmath(r, d):
    """Every element to 1e-12 relative, flat bends included (no 1 - cos cancellation)."""
    c = circular_curve(r, d)
    for name, expected in _mp_reference(r, d).items():
        assert float(getattr(c, name)) == pytest.approx(float(expected), rel=1e-12), name


@SETTINGS
@given(r=radii, d=st.floats(1e-3, np.pi - 1e-3))
def test_elements_obey_plane_geometry(r, d):
    c = circular_curve(r, d)
    t, e, m, lc = (float(v) for v in (c.tangent, c.external, c.middle_ordinate, c.long_chord))
    # Pythagoras, right angle at the PC between radius and tangent
    assert t**2 + r**2 == pytest.approx((r + e) ** 2, rel=1e-11)
    # intersecting chords through the midpoint of the long chord
    assert (lc / 2) ** 2 == pytest.approx(m * (2 * r - m), rel=1e-9)
    # an arc is longer than its chord and shorter than the two tangents
    assert lc < float(c.length) < 2 * t


def test_flat_bend_middle_ordinate():
    # Delta 1e-7 rad on R 1000 m: M = R (1 - cos(D/2)) ~ R D^2 / 8 = 1.25e-12 m, where the
    # naive 1 - cos loses every digit. mpmath reference.
    c = circular_curve(1000.0, 1e-7)
    ref = _mp_reference(1000.0, 1e-7)
    assert float(c.middle_ordinate) == pytest.approx(float(ref["middle_ordinate"]), rel=1e-12)
    assert float(c.external) == pytest.approx(float(ref["external"]), rel=1e-12)


def test_stations_pc_pi_minus_t_and_pt_pc_plus_l():
    # Indiana DOT Design Manual Fig. 43-6D: PC = PI - T, PT = PC + L (never PI + T).
    # R 400 m, Delta 50 deg, PI at 2+345.678: T = 400 tan 25 deg, L = 400 x 50 pi/180 (mpmath).
    t = 400 * mpmath.tan(mpmath.radians(25))
    length = 400 * mpmath.radians(50)
    c = circular_curve(400.0, np.radians(50.0), pi_station=2345.678)
    assert float(c.pc) == pytest.approx(float(2345.678 - t), abs=1e-9)
    assert float(c.pt) == pytest.approx(float(2345.678 - t + length), abs=1e-9)
    assert float(c.pt) < 2345.678 + float(t)  # L < 2T: PT is short of PI + T


def test_broadcasting_arrays_and_scalars():
    c = circular_curve(np.array([100.0, 200.0, 300.0]), 0.5, pi_station=[[0.0], [1000.0]])
    assert c.tangent.shape == (2, 3)
    assert c.pi.shape == (2, 3)
    assert float(c.tangent[1, 2]) == pytest.approx(float(300 * mpmath.tan(0.25)), rel=1e-14)
    one = circular_curve(100.0, 0.5)
    assert isinstance(one.tangent, np.ndarray) and one.tangent.shape == ()


def test_result_is_frozen():
    c = circular_curve(100.0, 0.5)
    assert isinstance(c, CircularCurve)
    with pytest.raises(dataclasses.FrozenInstanceError):
        c.radius = np.array(5.0)  # type: ignore[misc]


@pytest.mark.parametrize(
    ("radius", "deflection", "words"),
    [
        (0.0, 0.5, "radius"),
        (-10.0, 0.5, "radius"),
        (np.nan, 0.5, "radius"),
        (100.0, 0.0, "deflection"),
        (100.0, np.pi, "deflection"),
        (100.0, -0.2, "deflection"),
        (100.0, np.inf, "deflection"),
    ],
)
def test_bad_inputs_refused_with_a_message(radius, deflection, words):
    with pytest.raises(GeometryError, match=words):
        circular_curve(radius, deflection)


def test_bad_element_in_an_array_is_named():
    with pytest.raises(GeometryError, match=r"got 4 \(element 1\)"):
        circular_curve([100.0, 200.0], [0.3, 4.0])


def test_geometry_error_is_a_value_error():
    assert issubclass(GeometryError, ValueError)


# --- degree of curve --------------------------------------------------------------------


@pytest.mark.parametrize("d", [0.25, 1.0, 3.5, 10.0, 45.0])
def test_arc_definition_100_ft_arc_subtends_d(d):
    # definition: arc length R D (rad) = 100 ft
    r = radius_from_degree_arc(d)
    assert float(r * np.radians(d)) == pytest.approx(100 * FOOT, rel=1e-14)
    assert float(degree_of_curve_arc(r)) == pytest.approx(d, rel=1e-14)


@pytest.mark.parametrize("d", [0.25, 1.0, 3.5, 10.0, 45.0, 180.0])
def test_chord_definition_100_ft_chord_subtends_d(d):
    # definition: chord 2 R sin(D/2) = 100 ft; checked with mpmath
    r_ft = float(radius_from_degree_chord(d)) / FOOT
    assert float(2 * mpmath.mpf(r_ft) * mpmath.sin(mpmath.radians(d) / 2)) == pytest.approx(
        100.0, rel=1e-13
    )
    assert float(degree_of_curve_chord(r_ft * FOOT)) == pytest.approx(d, rel=1e-11)


def test_chord_radius_slightly_longer_than_arc_radius():
    # for the same D a 100 ft chord needs a larger radius than a 100 ft arc:
    # 1 deg: arc 5729.578 ft, chord 50 / sin(0.5 deg) = 5729.651 ft (mpmath)
    assert float(radius_from_degree_arc(1.0)) / FOOT == pytest.approx(
        float(18000 / mpmath.pi), rel=1e-14
    )
    assert float(radius_from_degree_chord(1.0)) / FOOT == pytest.approx(
        float(50 / mpmath.sin(mpmath.radians(0.5))), rel=1e-14
    )


def test_degree_of_curve_vectorised():
    d = degree_of_curve_arc(np.array([100.0, 1000.0]))
    assert d.shape == (2,)
    assert d[0] == pytest.approx(10 * d[1])


@pytest.mark.parametrize(
    ("call", "value"),
    [
        (degree_of_curve_arc, 0.0),
        (degree_of_curve_chord, -5.0),
        (degree_of_curve_chord, 10.0),  # 10 m < 50 ft: no 100 ft chord
        (radius_from_degree_arc, 0.0),
        (radius_from_degree_chord, 200.0),
        (radius_from_degree_chord, np.nan),
    ],
)
def test_degree_of_curve_refusals(call, value):
    with pytest.raises(GeometryError):
        call(value)
