"""Closure conditions of the versine method, written out.

With e_i = (s_{i-1} - 2 s_i + s_{i+1}) / 2 (derived in the module docstring from the chord
geometry) and the track fixed at the start (s_{-1} = s_0 = 0):
  F_j = sum_{k<=j} e_k = (s_{j+1} - s_j) / 2            (telescoping, s_{-1} = s_0 = 0)
  G_i = sum_{j<i} F_j = s_i / 2                         (telescoping again)
so sum_{k<=n-1} e_k = F_{n-1} = (s_n - s_{n-1}) / 2 and
  sum_k k e_k = n sum_k e_k - G_n = n (s_n - s_{n-1}) / 2 - s_n / 2.
Both vanish  <=>  s_{n-1} = s_n = 0 (the last slew and the one a station beyond it).

Sources of the check values: the versine method's first and second sums and closure
(REFERENCES.md "Track realignment from versines", US Army TR 0671 3.18-3.28 read in
outline; the worked example there derived, exact); the telescoping sums above are the
derivation the tests check, done by hand.
"""

import numpy as np
import pytest

from curvetui.core.versine_realign import hallade_slews, slews_from_differences


def _second_differences_half(s):
    """e_i = (s_{i-1} - 2 s_i + s_{i+1}) / 2 for i = 0..n-1, given s_{-1}..s_n (n + 2 values)."""
    return [(s[i] - 2 * s[i + 1] + s[i + 2]) / 2 for i in range(len(s) - 2)]


def test_slews_from_their_own_second_differences():
    # integers: exact. s_{-1} = s_0 = 0, s_{n-1} = s_n = 0 (closing)
    s = [0, 0, 3, 7, 4, -2, -5, 1, 0, 0]
    e = _second_differences_half([float(v) * 2 for v in s])  # doubled: e stays whole
    got = hallade_slews(e, [0.0] * len(e))
    assert got.slews.tolist() == [2.0 * v for v in s[1:-1]]
    assert sum(e) == 0 and sum(i * v for i, v in enumerate(e)) == 0
    assert got.closes()


def test_not_closing_when_last_slews_are_not_zero():
    # s_{n-1} = 0 but s_n = 4: the track leaves in another direction; sum e = F_{n-1} = 2
    s = [0, 0, 2, 4, 2, 0, 4]
    e = _second_differences_half(s)
    got = hallade_slews(e, [0.0] * len(e))
    assert got.slews.tolist() == s[1:-1]
    assert got.end_slew == 4.0
    assert got.closure_sum == 2.0  # (s_n - s_{n-1}) / 2 by hand
    # sum k e_k = n (s_n - s_{n-1})/2 - s_n/2 = 5 * 2 - 2 = 8 (n = 5)
    assert got.closure_moment == 8.0
    assert not got.closes()


def test_closure_iff_sum_and_moment_vanish_random():
    rng = np.random.default_rng(17)
    for _ in range(20):
        n = int(rng.integers(5, 40))
        e = rng.integers(-9, 10, n).astype(float)
        # make sum and first moment vanish by adjusting the last two (whole numbers: exact)
        i = np.arange(n)
        m0, m1 = e[:-2].sum(), (i[:-2] * e[:-2]).sum()
        # e_{n-2} + e_{n-1} = -m0 ; (n-2) e_{n-2} + (n-1) e_{n-1} = -m1
        e[-1] = -m1 + (n - 2) * m0
        e[-2] = -m0 - e[-1]
        got = hallade_slews(e, np.zeros(n))
        assert got.closure_sum == 0 and got.closure_moment == 0
        assert got.slews[-1] == 0 and got.end_slew == 0
        e2 = e.copy()
        e2[n // 2] += 1.0  # breaks the sum: no closure
        assert not hallade_slews(e2, np.zeros(n)).closes()


def test_vectorised_rows_match_one_by_one():
    rng = np.random.default_rng(3)
    e = rng.normal(size=(4, 12))
    rows = slews_from_differences(e, axis=1)
    for k in range(4):
        np.testing.assert_array_equal(rows[k], hallade_slews(e[k], np.zeros(12)).slews)


def test_bad_shapes_refused():
    with pytest.raises(ValueError):
        hallade_slews([1, 2], [1])
    with pytest.raises(ValueError):
        hallade_slews([1, float("nan")], [1, 2])
