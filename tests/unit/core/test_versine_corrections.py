"""Local versine corrections at hold points (core.versine_corrections via design_realignment).

Local corrections at holds: common practice, no source. The corrections balance over each
run of corrected stations (their sum and first moment 0), so the slews outside the runs are
the smooth diagram's. Every expected value here is
computed in the test from the versine (Hallade) relation written out below, not by the
code under test: slewing the track outward by s changes the versine at i by
s_i - (s_{i-1} + s_{i+1}) / 2, so e_i = m_i - d_i = (s_{i-1} - 2 s_i + s_{i+1}) / 2 and,
with the track fixed at the start (s_{-1} = s_0 = 0), s_{i+1} = 2 e_i + 2 s_i - s_{i-1}
(derived; the method in outline: US Army TR 0671 3.18-3.28, read in outline). The slews
close when s_{n-1} = s_n = 0.

The surveys are synthetic (a trapezoid diagram plus known smooth slews, built as in
test_versine_design.py); they are test inputs, not checks.
"""

import numpy as np
import pytest
from scipy.optimize import linprog

from curvetui.core.versine_design import design_realignment

CHORD = 20.0
STEP = CHORD / 2
WINDOW = 2


def recurrence_slews(measured, designed):
    """s_0 .. s_n from s_{i+1} = 2 e_i + 2 s_i - s_{i-1}, s_{-1} = s_0 = 0 (written out)."""
    e = np.asarray(measured) - np.asarray(designed)
    prev, cur = 0.0, 0.0
    out = [cur]
    for ei in e:
        prev, cur = cur, 2.0 * ei + 2.0 * cur - prev
        out.append(cur)
    return np.array(out)  # n + 1 values: s_0 .. s_n


def survey(n=60, ts=10, n1=6, n2=8, st=48, radius=800.0, amp=0.02):
    """Measured versines m = d + (s_{i-1} - 2 s_i + s_{i+1}) / 2 for known slews s."""
    i = np.arange(n, dtype=float)
    d = CHORD**2 / (8 * radius) * np.clip(np.minimum((i - ts) / n1, (st - i) / n2), 0, 1)
    s = amp * np.sin(np.pi * (i - 5) / 50) ** 2 * np.sin(3 * np.pi * i / n)
    s[(i <= 5) | (i >= 55)] = 0.0
    sp = np.concatenate(([0.0], s, [0.0]))
    m = d + (sp[:-2] - 2 * sp[1:-1] + sp[2:]) / 2
    return i * STEP, m


def smooth_diagram(design, n):
    """u * trapezoid from the reported breakpoints (stations -> spacings)."""
    i = np.arange(n, dtype=float)
    ts, sc, cs, st = (
        (x - design.stations[0]) / STEP for x in (design.ts, design.sc, design.cs, design.st)
    )
    return design.central_versine * np.clip(
        np.minimum((i - ts) / (sc - ts), (st - i) / (st - cs)), 0.0, 1.0
    ), (ts, sc, cs, st)


def window_mask(n, hold_idx):
    i = np.arange(n)
    return np.any([np.abs(i - h) <= WINDOW for h in hold_idx], axis=0)


def check_design(r, st, m, holds):
    """Holds met to 1e-9 m, closure, corrections only in the window, slews recomputed."""
    n = m.size
    hold_idx = [int(round(s / STEP)) for s in holds]
    s_all = recurrence_slews(m, r.designed)
    assert r.slews == pytest.approx(s_all[:-1], abs=1e-12)
    for h, (_, v) in zip(hold_idx, sorted(holds.items()), strict=True):
        assert abs(s_all[h] - v) <= 1e-9
    assert abs(s_all[-2]) <= 1e-9 and abs(s_all[-1]) <= 1e-9  # closure: s_{n-1} = s_n = 0
    smooth, _ = smooth_diagram(r, n)
    c = r.designed - smooth
    inside = window_mask(n, hold_idx)
    assert np.all(np.abs(c[~inside]) <= 1e-12)
    assert np.max(np.abs(c[inside])) > 1e-6  # corrections were needed
    assert r.correction_window == WINDOW
    assert [s for s, _ in r.corrections] == pytest.approx(list(st[inside]))
    assert [v for _, v in r.corrections] == pytest.approx(list(c[inside]), abs=1e-12)
    # the corrections balance over each run of the window (sum c = 0, sum i c = 0), so
    # outside the windows the slews are the smooth diagram's alone
    s_smooth = recurrence_slews(m, smooth)
    assert r.slews[~inside] == pytest.approx(s_smooth[:-1][~inside], abs=1e-10)
    assert np.max(np.abs(r.slews[inside] - s_smooth[:-1][inside])) > 1e-6
    assert any("local versine corrections" in t for t in r.notes)


def test_platform_six_stations_held_at_zero():
    st, m = survey()
    holds = {st[i]: 0.0 for i in range(24, 30)}  # a platform: stations 240 to 290 m
    plain = design_realignment(st, m, CHORD, holds)
    assert not plain.feasible and plain.corrections == ()  # default: no corrections
    r = design_realignment(st, m, CHORD, holds, corrections=True)
    assert r.feasible and r.reason == ""
    check_design(r, st, m, holds)
    # between held stations the designed versine is the measured one (e = 0 there)
    assert r.designed[25:29] == pytest.approx(m[25:29], abs=1e-12)


def test_bridge_two_holds_with_fixed_transitions():
    st, m = survey()
    holds = {st[18]: 0.0, st[33]: 0.004}  # a bridge's two ends (4 mm out at the far end)
    plain = design_realignment(st, m, CHORD, holds, transitions=(6, 8))
    assert not plain.feasible
    r = design_realignment(st, m, CHORD, holds, transitions=(6, 8), corrections=True)
    assert r.feasible
    check_design(r, st, m, holds)


def test_infeasible_limit_smallest_limit_by_independent_linprog():
    st, m = survey()
    holds = {st[i]: 0.0 for i in range(24, 30)}
    free = design_realignment(st, m, CHORD, holds, corrections=True)
    r = design_realignment(st, m, CHORD, holds, slew_limit=0.3 * free.max_slew, corrections=True)
    assert not r.feasible and r.smallest_limit is not None
    assert "even with local versine corrections" in r.reason
    n = m.size
    hold_idx = list(range(24, 30))
    _, (ts, sc, cs, stt) = smooth_diagram(r, n)
    i = np.arange(n, dtype=float)
    phi = np.clip(np.minimum((i - ts) / (sc - ts), (stt - i) / (stt - cs)), 0.0, 1.0)
    win = np.flatnonzero(window_mask(n, hold_idx))
    # s = T (m - u phi - P c), T_ik = 2 (i - k) for k < i: written out, variables (u, c, tau)
    t_mat = np.array([[2.0 * (a - b) if b < a else 0.0 for b in range(n)] for a in range(n)])
    cols = np.zeros((n, 1 + win.size))
    cols[:, 0] = phi
    cols[win, 1 + np.arange(win.size)] = 1.0
    sa, sm = t_mat @ cols, t_mat @ m
    k = cols.shape[1]
    a_ub = np.vstack([np.hstack([-sa, -np.ones((n, 1))]), np.hstack([sa, -np.ones((n, 1))])])
    b_ub = np.r_[-sm, sm]
    a_eq = [np.r_[cols.sum(0), 0.0], np.r_[i @ cols, 0.0]] + [np.r_[sa[h], 0.0] for h in hold_idx]
    b_eq = [m.sum(), i @ m] + [sm[h] for h in hold_idx]
    runs = np.split(win, np.flatnonzero(np.diff(win) > 1) + 1)  # balance over each run
    for run in runs:
        for w in (np.isin(win, run).astype(float), np.where(np.isin(win, run), win, 0.0)):
            a_eq.append(np.r_[0.0, w, 0.0])
            b_eq.append(0.0)
    res = linprog(
        np.r_[np.zeros(k), 1.0],
        A_ub=a_ub,
        b_ub=b_ub,
        A_eq=np.array(a_eq),
        b_eq=b_eq,
        bounds=[(0, None)] + [(None, None)] * win.size + [(0, None)],
        method="highs",
    )
    assert res.status == 0
    assert r.smallest_limit == pytest.approx(res.x[-1], rel=1e-6)
    # the design shown meets the holds and the closure with that greatest slew
    s_all = recurrence_slews(m, r.designed)
    assert np.max(np.abs(s_all[hold_idx])) <= 1e-9 and abs(s_all[-1]) <= 1e-9
    assert np.max(np.abs(s_all)) == pytest.approx(res.x[-1], rel=1e-6)
    # and that limit is met
    ok = design_realignment(
        st, m, CHORD, holds, slew_limit=r.smallest_limit * (1 + 1e-6), corrections=True
    )
    assert ok.feasible and ok.max_slew <= r.smallest_limit * (1 + 1e-6) + 1e-9


def test_bad_window_named():
    st, m = survey()
    with pytest.raises(ValueError, match="correction window"):
        design_realignment(st, m, CHORD, {st[20]: 0.0}, corrections=True, correction_window=0)


def test_bridge_at_a_chosen_radius_keeps_it():
    st, m = survey()
    holds = {st[18]: 0.0, st[33]: 0.0}
    v = CHORD**2 / (8 * 800.0)  # R 800 m on a 20 m chord: 62.5 mm (by hand)
    r = design_realignment(
        st, m, CHORD, holds, central_versine=v, transitions=(6, 8), corrections=True
    )
    assert r.feasible and r.central_versine == v
    check_design(r, st, m, holds)
