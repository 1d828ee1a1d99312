"""Transitions of any length: the search core.versine_design uses for two or three hold
points, which its whole-spacing transitions meet only where the survey allows.

On a cell with the TS in station interval [a, a+1], the SC in [b, b+1], the CS in [c, c+1]
and the ST in [e, e+1], the point versines are linear in x = (p1, q1, u, p2, q2):

    d_i = p1 + q1 i on a < i <= b,  u on b < i <= c,  p2 + q2 i on c < i <= e, 0 elsewhere,

the ramps' lines crossing 0 at the TS and ST and u at the SC and CS. The cell is linear
constraints: TS = -p1/q1 in [a, a+1] and SC = (u - p1)/q1 in [b, b+1] (q1 > 0), ST = -p2/q2
in [e, e+1] and CS = (u - p2)/q2 in [c, c+1] (q2 < 0), u >= 0, each multiplied out by the
slope's magnitude. Closure (2 equations) and the holds (one each) leave 5 - 2 - k free
parameters: one for two holds (or one hold and a chosen radius), none for three. The cells
searched are those within ``reach`` intervals of each breakpoint of the best whole-spacing
design without the holds. Lengths in metres, positions in spacings.
"""

from __future__ import annotations

import itertools

import numpy as np

from curvetui.core.versine_cells import (
    SLEW_TOLERANCE,
    _Best,
    _hold_rows,
    _interval,
    _limit_interval,
    _Problem,
)
from curvetui.core.versine_realign import slews_from_differences


def _free_columns(n: int, a, b, c, e):
    """Columns for (p1, q1, u, p2, q2): (C, 5, n)."""
    idx = np.arange(n, dtype=float)[None, :]
    a, b, c, e = (v[:, None] for v in (a, b, c, e))
    r1 = ((idx > a) & (idx <= b)).astype(float)
    mid = ((idx > b) & (idx <= c)).astype(float)
    r2 = ((idx > c) & (idx <= e)).astype(float)
    return np.stack([r1, r1 * idx, mid, r2, r2 * idx], axis=1)


def _cells_near(n: int, centre, reach: int):
    """Every valid (a, b, c, e) within ``reach`` of ``centre``: four float arrays."""
    steps = range(-reach, reach + 1)
    got = np.array(
        [
            [centre[0] + i, centre[1] + j, centre[2] + k, centre[3] + m]
            for i, j, k, m in itertools.product(steps, steps, steps, steps)
        ],
        dtype=float,
    )
    a, b, c, e = got.T
    ok = (a >= 0) & (b >= a + 1) & (c >= b + 1) & (e >= c + 1) & (e <= n - 2)
    return a[ok], b[ok], c[ok], e[ok]


def _inequalities(a, b, c, e):
    """Rows r (C, 9, 5) with r . x >= 0 for the cell (see the module docstring)."""
    z = np.zeros_like(a)
    one = np.ones_like(a)
    rows = [
        (-one, -a, z, z, z),  # -p1 - a q1 >= 0        TS >= a
        (one, a + 1, z, z, z),  # p1 + (a+1) q1 >= 0     TS <= a+1
        (-one, -b, one, z, z),  # u - p1 - b q1 >= 0     SC >= b
        (one, b + 1, -one, z, z),  # p1 + (b+1) q1 - u >= 0 SC <= b+1
        (z, z, z, one, e),  # p2 + e q2 >= 0         ST >= e
        (z, z, z, -one, -(e + 1)),  # -p2 - (e+1) q2 >= 0    ST <= e+1
        (z, z, -one, one, c),  # p2 - u + c q2 >= 0     CS >= c
        (z, z, one, -one, -(c + 1)),  # u - p2 - (c+1) q2 >= 0 CS <= c+1
        (z, z, one, z, z),  # u >= 0
    ]
    return np.stack([np.stack(r, axis=1) for r in rows], axis=1)


def free_search(p: _Problem, centre, reach: int = 2) -> tuple[_Best | None, int]:
    """Least sum of squared slews over the free-length cells near ``centre`` (a, b, c, e);
    used with two or three holds (or one hold and a chosen radius)."""
    a, b, c, e = _cells_near(p.m.size, centre, reach)
    if a.size == 0:
        return None, 0
    return _free_cells(p, a, b, c, e)


def _free_cells(p: _Problem, a, b, c, e) -> tuple[_Best | None, int]:
    """The best design over the given free-length cells (arrays a, b, c, e)."""
    n = p.m.size
    cols = _free_columns(n, a, b, c, e)  # (C, 5, n)
    idx = np.arange(n, dtype=float)
    eq = [cols.sum(axis=2), cols @ idx]
    rhs = [np.full(a.size, p.m.sum()), np.full(a.size, idx @ p.m)]
    if p.holds:
        rows_h = _hold_rows(n, p.holds)
        hm = rows_h @ p.m
        hc = np.einsum("hn,cin->chi", rows_h, cols)
        for j, (_, v) in enumerate(p.holds):
            eq.append(hc[:, j, :])
            rhs.append(np.full(a.size, hm[j] - v))  # rows_h . d = rows_h . m - slew
    if p.u_fixed is not None:
        eq.append(np.tile([0.0, 0, 1, 0, 0], (a.size, 1)))
        rhs.append(np.full(a.size, p.u_fixed))
    e_mat = np.stack(eq, axis=1)  # (C, q, 5)
    f = np.stack(rhs, axis=1)
    q = e_mat.shape[1]
    if q < 4 or q > 5:
        return None, a.size
    # scale each row, then the least-norm solution and the null direction by SVD
    scale = np.linalg.norm(e_mat, axis=2, keepdims=True)
    scale = np.where(scale > 0, scale, 1.0)
    e_s, f_s = e_mat / scale, f / scale[:, :, 0]
    _, sing, vt = np.linalg.svd(e_s)
    full_rank = sing[:, -1] > 1e-10 * sing[:, 0]
    xp = np.einsum("ciq,cq->ci", np.linalg.pinv(e_s), f_s)
    nv = vt[:, -1, :] if q == 4 else np.zeros_like(xp)
    d0 = np.einsum("ci,cin->cn", xp, cols)
    dn = np.einsum("ci,cin->cn", nv, cols)
    s0 = slews_from_differences(p.m[None, :] - d0, axis=1)
    g = slews_from_differences(dn, axis=1)
    ok = full_rank.copy()
    for h, v in p.holds:  # the equations met on the slews themselves
        ok &= np.abs(s0[:, h] - v) <= SLEW_TOLERANCE
    ok &= np.abs(np.einsum("cn,n->c", d0, np.ones(n)) - p.m.sum()) <= 1e-9 * (1 + p.m.sum())
    big = 1e6 * (1.0 + np.linalg.norm(xp, axis=1))
    lo, hi = -big, big
    if q == 5:
        lo, hi = np.zeros(a.size), np.zeros(a.size)
    ineq = _inequalities(a, b, c, e)
    tol = 1e-12 * max(float(np.max(np.abs(p.m))), 1e-12) * (1.0 + e)
    for k in range(ineq.shape[1]):
        r = ineq[:, k, :]
        lo, hi, ok1 = _interval(
            np.einsum("ci,ci->c", r, xp), np.einsum("ci,ci->c", r, nv), lo, hi, tol
        )
        ok &= ok1
    fixed = np.where(q == 5, 0.0, np.nan) * np.ones(a.size)
    if p.limit is not None:
        lo, hi, ok = _limit_interval(p.limit, s0, g, lo, hi, fixed, ok)
    else:
        ok &= lo <= hi + 1e-12 * (1.0 + np.abs(lo) + np.abs(hi))
    if not np.any(ok):
        return None, a.size
    gg = np.einsum("cn,cn->c", g, g)
    t_free = np.where(gg > 0, np.einsum("cn,cn->c", s0, g) / np.where(gg > 0, gg, 1.0), 0.0)
    t = np.where(q == 5, 0.0, np.clip(t_free, lo, np.maximum(lo, hi)))
    s = s0 - t[:, None] * g
    obj = np.where(ok, np.einsum("cn,cn->c", s, s), np.inf)
    k = int(np.argmin(obj))
    x = xp[k] + t[k] * nv[k]
    p1, q1, u, p2, q2 = (float(v) for v in x)
    breaks = (-p1 / q1, (u - p1) / q1, (u - p2) / q2, -p2 / q2)
    best = _Best(
        objective=float(obj[k]),
        n1=0,
        n2=0,
        a=int(a[k]),
        e=int(e[k]),
        x=np.array([u, u * breaks[0], u * breaks[3]]),
        slews=s[k].copy(),
        designed=d0[k] + t[k] * dn[k],
        breaks=breaks,
    )
    return best, a.size


def free_smallest_limit(p: _Problem, centre, reach: int = 2, shortlist: int = 12):
    """The smallest slew limit the free-length cells near ``centre`` allow with the holds:
    min max |s| by linprog on each of the ``shortlist`` cells whose least-squares design
    (holds met) has the lowest greatest slew; (limit, cell) or None."""
    from scipy.optimize import linprog

    n = p.m.size
    free = _Problem(p.m, p.holds, None, p.u_fixed, p.lengths)
    a, b, c, e = _cells_near(n, centre, reach)
    if a.size == 0:
        return None
    ranked = []
    for k in range(a.size):  # the least-squares design of each cell, for the ranking
        one = tuple(np.array([v[k]]) for v in (a, b, c, e))
        best, _ = _free_cells(free, *one)
        if best is not None:
            ranked.append((float(np.max(np.abs(best.slews))), k))
    ranked.sort()
    idx = np.arange(n, dtype=float)
    t_mat = 2.0 * np.maximum(idx[:, None] - idx[None, :], 0.0)  # s = T (m - d)
    sm = t_mat @ p.m
    result = None
    for _, k in ranked[:shortlist]:
        cols = _free_columns(n, *(np.array([v[k]]) for v in (a, b, c, e)))[0].T  # (n, 5)
        sc = t_mat @ cols
        ineq = _inequalities(*(np.array([v[k]]) for v in (a, b, c, e)))[0]  # (9, 5)
        a_ub = np.vstack(
            [
                np.hstack([-sc, -np.ones((n, 1))]),
                np.hstack([sc, -np.ones((n, 1))]),
                np.hstack([-ineq, np.zeros((ineq.shape[0], 1))]),
            ]
        )
        b_ub = np.concatenate([-sm, sm, np.zeros(ineq.shape[0])])
        a_eq = [np.append(cols.sum(axis=0), 0.0), np.append(idx @ cols, 0.0)]
        b_eq = [p.m.sum(), idx @ p.m]
        for h, v in p.holds:
            a_eq.append(np.append(sc[h], 0.0))
            b_eq.append(sm[h] - v)
        if p.u_fixed is not None:
            a_eq.append([0.0, 0, 1, 0, 0, 0])
            b_eq.append(p.u_fixed)
        res = linprog(
            np.array([0, 0, 0, 0, 0, 1.0]),
            A_ub=a_ub,
            b_ub=b_ub,
            A_eq=np.array(a_eq),
            b_eq=np.array(b_eq),
            bounds=[(None, None)] * 5 + [(0, None)],
            method="highs",
        )
        if res.status == 0 and (result is None or res.x[5] < result[0]):
            result = (float(res.x[5]), k)
    return result
