"""The realignment design solve: recovery of known slews, hold points, limits, infeasibility.

The synthetic surveys are built from geometry written out here, not from the code: the
track's offsets y_i (outward, from a straight base line) at stations half a chord apart;
the versine at station i on the chord from i-1 to i+1 is v_i = y_i - (y_{i-1} + y_{i+1}) / 2
(the chord's mid-ordinate, small angles; c^2 / (8R) on a circle). The designed track y_d
has the designed versines d; the track as it lies is y_m = y_d - s (slewing it outward by s
puts it on the design), so its measured versines are m = d + (s_{i-1} - 2 s_i + s_{i+1}) / 2.

Sources of the check values: v = c^2 / (8R) and the Hallade slews s = 2 x second sums of
(measured - designed) (REFERENCES.md "Track realignment from versines": read in outline
from US Army TR 0671 3.18-3.28, the recurrence derived); the smallest slew limit is checked
against scipy.optimize.linprog set up independently in this file; the least sum of squared
slews as the objective is common practice, no source. The surveys are synthetic geometry
built here (not project data).
"""

import numpy as np
import pytest
from scipy.optimize import linprog

from curvetui.core.versine_design import design_realignment

CHORD = 20.0  # m: stations 10 m apart
STEP = CHORD / 2


def trapezoid(n, ts, n1, n2, st, u):
    """Point versines: 0 to the TS, linear to u over n1 spacings, u, linear to 0 at the ST."""
    i = np.arange(n, dtype=float)
    return u * np.clip(np.minimum((i - ts) / n1, (st - i) / n2), 0.0, 1.0)


def offsets_from_versines(d):
    """y with y_i - (y_{i-1} + y_{i+1}) / 2 = d_i, y_{-1} = y_0 = 0; returns y_{-1}..y_n."""
    y = [0.0, 0.0]
    for v in d:
        y.append(2 * y[-1] - y[-2] - 2 * v)
    return np.array(y)


def chord_versines(y):
    """Mid-ordinates at stations 0..n-1 from offsets y_{-1}..y_n."""
    return y[1:-1] - (y[:-2] + y[2:]) / 2


def known_slews(n, first, last, amp):
    """Smooth slews, zero up to ``first`` and from ``last`` on (so s_{-1} = s_n = 0)."""
    i = np.arange(n, dtype=float)
    s = amp * np.sin(np.pi * (i - first) / (last - first)) ** 2
    s[(i <= first) | (i >= last)] = 0.0
    return s


def survey(n=60, ts=10, n1=6, n2=8, st=48, radius=800.0, slews=None):
    d = trapezoid(n, ts, n1, n2, st, CHORD**2 / (8 * radius))
    y_design = offsets_from_versines(d)
    s = np.zeros(n) if slews is None else slews
    y_track = y_design - np.concatenate(([0.0], s, [0.0]))
    return np.arange(n) * STEP, d, chord_versines(y_track), s


def test_sign_of_measured_versines_from_geometry():
    # an outward bump of the track raises its versine: the track lies outside the design
    # where s < 0, so m = d + (s_{i-1} - 2 s_i + s_{i+1}) / 2
    n = 30
    s = known_slews(n, 5, 25, 0.02)
    st, d, m, _ = survey(n, 3, 4, 4, 26, 600.0, s)
    expect = d + (np.concatenate(([0], s[:-1])) - 2 * s + np.concatenate((s[1:], [0]))) / 2
    np.testing.assert_allclose(m, expect, atol=1e-15)


def test_a_survey_on_its_design_needs_no_slew():
    st, d, m, _ = survey()
    r = design_realignment(st, m, CHORD, max_transition=10)
    assert r.feasible
    assert r.max_slew < 1e-9
    np.testing.assert_allclose(r.designed, d, atol=1e-12)
    assert r.radius == pytest.approx(800.0, rel=1e-9)
    assert r.transition_in == 60.0 and r.transition_out == 80.0
    assert r.ts == pytest.approx(100.0, abs=1e-8) and r.st == pytest.approx(480.0, abs=1e-8)


def test_known_slews_recovered_exactly_with_holds():
    n = 60
    s = known_slews(n, 6, 52, 0.035)
    st, d, m, _ = survey(n, 10, 6, 8, 48, 800.0, s)
    holds = {st[15]: s[15], st[30]: s[30], st[40]: s[40]}
    r = design_realignment(st, m, CHORD, holds=holds, max_transition=10)
    assert r.feasible
    np.testing.assert_allclose(r.slews, s, rtol=0, atol=1e-9)
    np.testing.assert_allclose(r.designed, d, rtol=0, atol=1e-12)
    assert r.radius == pytest.approx(800.0, rel=1e-9)


def test_one_hold_met_exactly_and_binding():
    n = 60
    s = known_slews(n, 6, 52, 0.035)
    st, d, m, _ = survey(n, 10, 6, 8, 48, 800.0, s)
    free = design_realignment(st, m, CHORD, max_transition=10)
    for value in (0.0, 0.005):
        r = design_realignment(st, m, CHORD, holds={st[30]: value}, max_transition=10)
        assert r.feasible
        assert abs(r.slews[30] - value) <= 1e-12
        assert r.sum_squared_slews >= free.sum_squared_slews
        assert abs(free.slews[30] - value) > 1e-6  # the free optimum is elsewhere there
        assert r.binding_holds == (st[30],)
    # holding the station at the free optimum's own slew does not move the optimum
    r = design_realignment(st, m, CHORD, holds={st[30]: free.slews[30]}, max_transition=10)
    assert r.binding_holds == ()
    np.testing.assert_allclose(r.slews, free.slews, atol=1e-9)


def test_slews_close_and_limit_respected():
    n = 60
    s = known_slews(n, 6, 52, 0.035)
    st, d, m, _ = survey(n, 10, 6, 8, 48, 800.0, s)
    free = design_realignment(st, m, CHORD, max_transition=10)
    # the design closes: sum and first moment of e vanish (computed here by hand formula)
    e = free.measured - free.designed
    assert abs(e.sum()) < 1e-12 and abs((np.arange(n) * e).sum()) < 1e-10
    # a limit 3 % under the free optimum's greatest slew (4.39 mm on this survey; the
    # least greatest slew of any design is 4.05 mm) binds and is met
    limit = 0.97 * free.max_slew
    r = design_realignment(st, m, CHORD, slew_limit=limit, max_transition=10)
    assert r.feasible
    assert r.max_slew <= limit + 1e-9
    assert r.binding_limit_stations
    assert r.sum_squared_slews > free.sum_squared_slews


def _cell_minimax(m, n1, n2, a, e, holds):
    """min max |s| on one cell, set up here: slews s = T (m - d), T_ik = 2 max(i - k, 0)."""
    n = m.size
    i = np.arange(n)
    t = 2.0 * np.maximum(i[:, None] - i[None, :], 0)
    cu = np.zeros(n)
    cw = np.zeros(n)
    cz = np.zeros(n)
    for k in range(n):  # d_k = u cu + w cw + z cz, w = u t_TS, z = u t_ST
        if a < k <= a + n1:
            cu[k], cw[k] = k / n1, -1 / n1
        elif a + n1 < k <= e - n2:
            cu[k] = 1.0
        elif e - n2 < k <= e:
            cu[k], cz[k] = -k / n2, 1 / n2
    cols = np.column_stack([cu, cw, cz])
    tc, tm = t @ cols, t @ m
    a_ub = np.vstack(
        [
            np.hstack([-tc, -np.ones((n, 1))]),
            np.hstack([tc, -np.ones((n, 1))]),
            [[a, -1, 0, 0], [-(a + 1), 1, 0, 0], [e, 0, -1, 0], [-(e + 1), 0, 1, 0]],
        ]
    )
    b_ub = np.concatenate([-tm, tm, np.zeros(4)])
    a_eq = [np.append(cols.sum(0), 0), np.append(i @ cols, 0)]
    b_eq = [m.sum(), i @ m]
    for h, v in holds:
        a_eq.append(np.append(tc[h], 0))
        b_eq.append(tm[h] - v)
    res = linprog(
        [0, 0, 0, 1],
        A_ub=a_ub,
        b_ub=b_ub,
        A_eq=a_eq,
        b_eq=b_eq,
        bounds=[(0, None), (None, None), (None, None), (0, None)],
        method="highs",
    )
    return res.x[3] if res.status == 0 else np.inf


def test_infeasible_limit_gives_the_smallest_limit_checked_by_brute_force_lp():
    # a small survey: every cell (TS cell a, ST cell e, transitions 1..2) by its own LP
    n = 16
    s = known_slews(n, 2, 13, 0.03)
    st, d, m, _ = survey(n, 3, 2, 1, 12, 500.0, s)
    holds = [(7, 0.0)]
    brute = min(
        _cell_minimax(m, n1, n2, a, e, holds)
        for n1 in (1, 2)
        for n2 in (1, 2)
        for a in range(n)
        for e in range(n)
        if a + n1 + 1 <= e - n2 and e <= n - 2
    )
    assert np.isfinite(brute)
    r = design_realignment(
        st, m, CHORD, holds={st[7]: 0.0}, slew_limit=brute * 0.5, max_transition=2
    )
    assert not r.feasible
    assert r.smallest_limit == pytest.approx(brute, rel=1e-6, abs=1e-9)
    assert "smallest limit" in r.reason
    ok = design_realignment(
        st, m, CHORD, holds={st[7]: 0.0}, slew_limit=brute * (1 + 1e-6), max_transition=2
    )
    assert ok.feasible and ok.max_slew <= brute * (1 + 1e-6) + 1e-9


def test_chosen_radius_and_transitions():
    st, d, m, _ = survey()
    r = design_realignment(st, m, CHORD, central_versine=CHORD**2 / (8 * 800.0), transitions=(6, 8))
    assert r.feasible and r.max_slew < 1e-9
    assert r.radius == pytest.approx(800.0, rel=1e-12)


def test_bad_input_refused():
    st, d, m, _ = survey()
    with pytest.raises(ValueError, match="half the chord"):
        design_realignment(st * 1.1, m, CHORD)
    with pytest.raises(ValueError, match="not a station"):
        design_realignment(st, m, CHORD, holds={13.0: 0.0})
    with pytest.raises(ValueError, match="more than 0"):
        design_realignment(st, -m, CHORD)


def trapezoid_free(n, ts, sc, cs, st, u):
    """Point versines of a diagram with breakpoints anywhere (stations, fractional)."""
    i = np.arange(n, dtype=float)
    return u * np.clip(np.minimum((i - ts) / (sc - ts), (st - i) / (st - cs)), 0.0, 1.0)


def free_survey(n, breaks, radius, slews):
    d = trapezoid_free(n, *breaks, CHORD**2 / (8 * radius))
    y_track = offsets_from_versines(d) - np.concatenate(([0.0], slews, [0.0]))
    return np.arange(n) * STEP, d, chord_versines(y_track)


def test_three_holds_recover_transitions_of_any_length_exactly():
    # transitions 6.5 and 7.75 spacings: not whole spacings, found by the free-length search;
    # closure and three holds leave no free parameter, so the true design is the one found
    n = 60
    s = known_slews(n, 6, 52, 0.03)
    st, d, m = free_survey(n, (10.0, 16.5, 40.25, 48.0), 900.0, s)
    holds = {st[i]: s[i] for i in (15, 30, 44)}
    r = design_realignment(st, m, CHORD, holds=holds, max_transition=10)
    assert r.feasible
    np.testing.assert_allclose(r.slews, s, rtol=0, atol=1e-9)
    np.testing.assert_allclose(r.designed, d, rtol=0, atol=1e-12)
    assert r.transition_in == pytest.approx(65.0, abs=1e-6)
    assert r.transition_out == pytest.approx(77.5, abs=1e-6)
    assert r.radius == pytest.approx(900.0, rel=1e-9)


def test_two_holds_met_and_no_worse_than_the_true_slews():
    # two holds leave one free parameter: the true design meets them, so the optimum's sum
    # of squared slews is at most the true one's
    n = 60
    s = known_slews(n, 6, 52, 0.03)
    st, d, m = free_survey(n, (10.0, 16.5, 40.25, 48.0), 900.0, s)
    r = design_realignment(st, m, CHORD, holds={st[20]: s[20], st[35]: s[35]}, max_transition=10)
    assert r.feasible
    assert abs(r.slews[20] - s[20]) <= 1e-9 and abs(r.slews[35] - s[35]) <= 1e-9
    assert r.sum_squared_slews <= float(s @ s) + 1e-15


def test_two_holds_at_zero_met_and_the_limit_they_need():
    n = 60
    s = known_slews(n, 6, 52, 0.03)
    st, d, m = free_survey(n, (10.0, 16.5, 40.25, 48.0), 900.0, s)
    holds = {st[20]: 0.0, st[35]: 0.0}
    r = design_realignment(st, m, CHORD, holds=holds, max_transition=10)
    assert r.feasible
    assert abs(r.slews[20]) <= 1e-9 and abs(r.slews[35]) <= 1e-9
    e = r.measured - r.designed  # closes: sum and first moment of e vanish
    assert abs(e.sum()) < 1e-12 and abs((np.arange(n) * e).sum()) < 1e-10
    low = design_realignment(
        st, m, CHORD, holds=holds, slew_limit=0.2 * r.max_slew, max_transition=10
    )
    assert not low.feasible and low.smallest_limit is not None
    assert low.smallest_limit <= r.max_slew + 1e-12  # the least-squares design meets it
    assert abs(low.slews[20]) <= 1e-9 and abs(low.slews[35]) <= 1e-9
    ok = design_realignment(
        st, m, CHORD, holds=holds, slew_limit=low.smallest_limit * 1.001, max_transition=10
    )
    assert ok.feasible and ok.max_slew <= low.smallest_limit * 1.001 + 1e-9
