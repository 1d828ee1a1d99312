"""The versine (Hallade) method against the worked example in ../shared/REFERENCES.md.

Source: REFERENCES.md "Track realignment from versines (Hallade)": the method read in
outline from US Army TR 0671 3.18-3.28; the worked example is derived there, exact
(whole millimetres, so every sum is exact in floating point).
"""

import numpy as np

from curvetui.core.versine_realign import hallade_slews, radius_for_versine, versine_for_radius

DESIGNED = [0, 0, 10, 20, 30, 30, 30, 30, 30, 30, 20, 10, 0, 0]  # mm (REFERENCES.md)
MEASURED = [0, 2, 9, 20, 28, 29, 30, 31, 32, 31, 19, 7, 2, 0]  # mm
SLEWS = [0, 0, 4, 6, 8, 6, 2, -2, -4, -2, 2, 4, 0, 0]  # mm, outward +


def test_worked_example_slews_exact():
    got = hallade_slews(MEASURED, DESIGNED)
    assert got.slews.tolist() == SLEWS  # exact, not approximate


def test_worked_example_working_by_hand():
    # written out by hand from the example: e = m - d, F running sum, G_i = sum_{j<i} F_j
    e = [0, 2, -1, 0, -2, -1, 0, 1, 2, 1, -1, -3, 2, 0]
    f = [0, 2, 1, 1, -1, -2, -2, -1, 1, 2, 1, -2, 0, 0]
    g = [0, 0, 2, 3, 4, 3, 1, -1, -2, -1, 1, 2, 0, 0]
    got = hallade_slews(MEASURED, DESIGNED)
    assert got.differences.tolist() == e
    assert got.first_sums.tolist() == f
    assert got.second_sums.tolist() == g


def test_worked_example_closes():
    # sum e = 0 and sum i e_i = 2 - 2 - 8 - 5 + 7 + 16 + 9 - 10 - 33 + 24 = 0 (by hand)
    got = hallade_slews(MEASURED, DESIGNED)
    assert got.closure_sum == 0.0
    assert got.closure_moment == 0.0
    assert got.slews[-1] == 0.0 and got.end_slew == 0.0
    assert got.closes()


def test_versine_of_radius_20_m_chord():
    # REFERENCES.md: 20 m chord on R 1000 m: v = c^2/(8R) = 400/8000 m = 50 mm
    assert versine_for_radius(1000.0, 20.0) * 1000 == 50.0
    assert radius_for_versine(0.050, 20.0) == 1000.0


def test_scaled_example_in_metres():
    # the same example in metres: slews scale with the versines (the method is linear)
    got = hallade_slews(np.array(MEASURED) / 1000, np.array(DESIGNED) / 1000)
    np.testing.assert_allclose(got.slews, np.array(SLEWS) / 1000, rtol=0, atol=1e-15)
