"""The search behind core.versine_design: cells of the diagram, their one-parameter
families of closing designs, the least-squares and min-max solves (see that module's
docstring for the formulation). Lengths in metres, positions in station spacings.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.optimize import linprog

from curvetui.core.versine_realign import slews_from_differences

SLEW_TOLERANCE = 1e-9  # [m] a hold is met and a limit reached within this
DEFAULT_MAX_TRANSITION = 20  # station spacings


@dataclass(frozen=True)
class _Problem:
    m: np.ndarray
    holds: tuple[tuple[int, float], ...]
    limit: float | None
    u_fixed: float | None
    lengths: tuple[tuple[int, int], ...]


@dataclass(frozen=True)
class _Best:
    objective: float
    n1: int
    n2: int
    a: int
    e: int
    x: np.ndarray  # (u, w, z)
    slews: np.ndarray
    designed: np.ndarray
    # (TS, SC, CS, ST) in spacings from the first station, when the transitions are not
    # whole numbers of spacings (core.versine_free); None: from x, n1 and n2
    breaks: tuple[float, float, float, float] | None = None


def _columns(n: int, a, e, n1: int, n2: int):
    """Point-versine columns for u, w, z: arrays (cells, n)."""
    idx = np.arange(n, dtype=float)[None, :]
    a = a[:, None]
    e = e[:, None]
    r1 = (idx > a) & (idx <= a + n1)
    mid = (idx > a + n1) & (idx <= e - n2)
    r2 = (idx > e - n2) & (idx <= e)
    cu = np.where(r1, idx / n1, 0.0) + mid + np.where(r2, -idx / n2, 0.0)
    cw = np.where(r1, -1.0 / n1, 0.0)
    cz = np.where(r2, 1.0 / n2, 0.0)
    return cu, cw, cz


def _interval(alpha, beta, lo, hi, tol):
    """Narrow [lo, hi] by alpha + beta t >= 0 (arrays over cells); returns lo, hi, ok."""
    ok = np.ones_like(lo, dtype=bool)
    with np.errstate(divide="ignore", invalid="ignore"):
        bound = -alpha / beta
    pos = beta > 0
    neg = beta < 0
    zero = ~(pos | neg)
    lo = np.where(pos, np.maximum(lo, bound), lo)
    hi = np.where(neg, np.minimum(hi, bound), hi)
    ok &= ~(zero & (alpha < -tol))
    return lo, hi, ok


def _cells(p: _Problem, n1: int, n2: int):
    """Every cell (a, e) for transitions n1, n2 with its one-parameter family."""
    m = p.m
    n = m.size
    idx = np.arange(n, dtype=float)
    total, moment = m.sum(), idx @ m
    centroid = moment / total
    a = np.arange(0, n, dtype=float)
    # the ST cells near the one putting a trapezoid's centroid on the survey's
    guess = np.round(2.0 * centroid - a - (n1 - n2) / 3.0)
    offsets = np.arange(-3.0, 3.0)
    a = np.repeat(a, offsets.size)
    e = np.repeat(guess, offsets.size) + np.tile(offsets, guess.size)
    keep = (a + n1 + 1 <= e - n2) & (e <= n - 2) & (a >= 0)
    a, e = a[keep], e[keep]
    if a.size == 0:
        return None
    k = _closure_rows(a, e, n1, n2)  # (C, 2, 3)
    nv = np.cross(k[:, 0, :], k[:, 1, :])
    norm = np.linalg.norm(nv, axis=1)
    kkt = k @ np.transpose(k, (0, 2, 1))
    det = kkt[:, 0, 0] * kkt[:, 1, 1] - kkt[:, 0, 1] * kkt[:, 1, 0]
    good = (norm > 1e-12) & (np.abs(det) > 1e-12)
    if not np.any(good):
        return None
    a, e, k, nv, norm, kkt, det = (v[good] for v in (a, e, k, nv, norm, kkt, det))
    nv = nv / norm[:, None]
    rhs = np.array([total, moment])
    inv = (
        np.stack(
            [
                np.stack([kkt[:, 1, 1], -kkt[:, 0, 1]], 1),
                np.stack([-kkt[:, 1, 0], kkt[:, 0, 0]], 1),
            ],
            1,
        )
        / det[:, None, None]
    )
    xp = np.einsum("cji,cj->ci", k, inv @ rhs)
    return a, e, xp, nv


def _range_sums(lo, hi):
    """Sums of 1, i and i^2 over the whole numbers lo < i <= hi (arrays)."""

    def upto(x):  # sums over 0 <= i <= x
        return x + 1, x * (x + 1) / 2, x * (x + 1) * (2 * x + 1) / 6

    u0, u1, u2 = upto(hi)
    l0, l1, l2 = upto(lo)
    return u0 - l0, u1 - l1, u2 - l2


def _closure_rows(a, e, n1: int, n2: int):
    """The closure's rows (sum d, sum i d) as linear forms in (u, w, z): (C, 2, 3)."""
    r1 = _range_sums(a, a + n1)
    mid = _range_sums(a + n1, e - n2)
    r2 = _range_sums(e - n2, e)
    sum_row = np.stack([r1[1] / n1 + mid[0] - r2[1] / n2, -r1[0] / n1, r2[0] / n2], axis=1)
    mom_row = np.stack([r1[2] / n1 + mid[1] - r2[2] / n2, -r1[1] / n1, r2[1] / n2], axis=1)
    return np.stack([sum_row, mom_row], axis=1)


def _hold_rows(n: int, holds) -> np.ndarray:
    """Rows r_h with s_h = r_h . e: s_h = 2 sum_{k<h} (h - k) e_k."""
    k = np.arange(n, dtype=float)
    return np.array([2.0 * np.maximum(h - k, 0.0) for h, _ in holds]).reshape(len(holds), n)


def _versines(n: int, a, e, n1: int, n2: int, x):
    """Point versines of the cells' diagrams for x = (u, w, z) per cell: (C, n)."""
    idx = np.arange(n, dtype=float)[None, :]
    a, e = a[:, None], e[:, None]
    u, w, z = x[:, 0:1], x[:, 1:2], x[:, 2:3]
    d = np.where((idx > a) & (idx <= a + n1), (u * idx - w) / n1, 0.0)
    d += np.where((idx > a + n1) & (idx <= e - n2), u, 0.0)
    d += np.where((idx > e - n2) & (idx <= e), (z - u * idx) / n2, 0.0)
    return d


def _slews(p: _Problem, a, e, n1: int, n2: int, xp, nv):
    """s(t) = s0 - t g per cell, with the designed versines d(t) = dp + t dn."""
    dp = _versines(p.m.size, a, e, n1, n2, xp)
    dn = _versines(p.m.size, a, e, n1, n2, nv)
    s0 = slews_from_differences(p.m[None, :] - dp, axis=1)
    g = slews_from_differences(dn, axis=1)
    return dp, dn, s0, g


def _base_interval(p: _Problem, a, e, xp, nv, n1: int, n2: int):
    """Interval of t per cell meeting the cell, u >= 0, the holds and a fixed u."""
    scale = max(float(np.max(np.abs(p.m))), 1e-12)
    big = 1e6 * (1.0 + np.linalg.norm(xp, axis=1))
    lo, hi = -big, big
    ok = np.ones(a.size, dtype=bool)
    tol = 1e-12 * scale * (1.0 + e)
    rows = [
        (np.array([0.0, 0, 0]) + [1, 0, 0], 0.0),  # u >= 0
    ]
    for r, _ in rows:
        lo, hi, ok1 = _interval(xp @ r, nv @ r, lo, hi, tol)
        ok &= ok1
    u0, u1 = xp[:, 0], nv[:, 0]
    w0, w1 = xp[:, 1], nv[:, 1]
    z0, z1 = xp[:, 2], nv[:, 2]
    for alpha, beta in (
        (w0 - a * u0, w1 - a * u1),
        ((a + 1) * u0 - w0, (a + 1) * u1 - w1),
        (z0 - e * u0, z1 - e * u1),
        ((e + 1) * u0 - z0, (e + 1) * u1 - z1),
    ):
        lo, hi, ok1 = _interval(alpha, beta, lo, hi, tol)
        ok &= ok1
    # equalities: holds and a chosen central versine
    eqs = []
    keep = ok & (lo <= hi + 1e-12 * (1.0 + np.abs(lo) + np.abs(hi)))
    a, e, xp, nv, lo, hi, ok = (v[keep] for v in (a, e, xp, nv, lo, hi, ok))
    u0, u1 = xp[:, 0], nv[:, 0]
    if p.holds and a.size:
        cols = np.stack(_columns(p.m.size, a, e, n1, n2), axis=1)
        rows_h = _hold_rows(p.m.size, p.holds)  # (H, n)
        hold_m = rows_h @ p.m
        hold_p = np.einsum("hn,cin,ci->ch", rows_h, cols, xp)
        hold_n = np.einsum("hn,cin,ci->ch", rows_h, cols, nv)
        eqs = [
            (hold_m[j] - hold_p[:, j] - v, -hold_n[:, j], SLEW_TOLERANCE)
            for j, (_, v) in enumerate(p.holds)
        ]
    if p.u_fixed is not None:
        eqs.append((u0 - p.u_fixed, u1, 1e-12 * max(p.u_fixed, 1e-12)))
    fixed = np.full(a.size, np.nan)
    if eqs:
        alphas = np.stack([q[0] for q in eqs], 1)
        betas = np.stack([q[1] for q in eqs], 1)
        tols = np.array([q[2] for q in eqs])
        j = np.argmax(np.abs(betas), axis=1)
        rows_ = np.arange(a.size)
        bj = betas[rows_, j]
        has = np.abs(bj) > 1e-15
        t_eq = np.where(has, -alphas[rows_, j] / np.where(has, bj, 1.0), 0.0)
        resid = np.abs(alphas + betas * t_eq[:, None])
        ok &= np.all(resid <= tols[None, :], axis=1)
        fixed = np.where(has, t_eq, np.nan)
    span_tol = 1e-12 * (1.0 + np.abs(lo) + np.abs(hi))
    has_fixed = np.isfinite(fixed)
    inside = (fixed >= lo - span_tol) & (fixed <= hi + span_tol)
    ok &= np.where(has_fixed, inside, lo <= hi + span_tol)
    return a, e, xp, nv, lo, hi, fixed, ok


def _limit_interval(limit: float, s0, g, lo, hi, fixed, ok):
    """Narrow the intervals by |s0 - t g| <= limit at every station."""
    for sign in (1.0, -1.0):  # limit - sign s >= 0, s = s0 - t g
        lo2 = np.broadcast_to(lo[:, None], g.shape)
        hi2 = np.broadcast_to(hi[:, None], g.shape)
        lo2, hi2, ok2 = _interval(limit - sign * s0, sign * g, lo2, hi2, SLEW_TOLERANCE)
        lo, hi = lo2.max(axis=1), hi2.min(axis=1)
        ok = ok & ok2.all(axis=1)
    span_tol = 1e-12 * (1.0 + np.abs(lo) + np.abs(hi))
    has_fixed = np.isfinite(fixed)
    inside = (fixed >= lo - span_tol) & (fixed <= hi + span_tol)
    ok &= np.where(has_fixed, inside, lo <= hi + span_tol)
    return lo, hi, ok


def _candidates(p: _Problem, n1: int, n2: int):
    """The cells for n1, n2 that close and meet the holds, with their slews; or None."""
    cells = _cells(p, n1, n2)
    if cells is None:
        return None, 0
    a, e, xp, nv = cells
    searched = a.size
    a, e, xp, nv, lo, hi, fixed, ok = _base_interval(p, a, e, xp, nv, n1, n2)
    if not np.any(ok):
        return None, searched
    a, e, xp, nv, lo, hi, fixed = (v[ok] for v in (a, e, xp, nv, lo, hi, fixed))
    dp, dn, s0, g = _slews(p, a, e, n1, n2, xp, nv)
    return (a, e, xp, nv, dp, dn, s0, g, lo, hi, fixed), searched


COARSE_ABOVE = 100  # more transition pairs than this: every other length first, then refine


def _search(p: _Problem, fallback: bool = True):
    """Least sum of squared slews; (best or None, cells searched).

    Up to COARSE_ABOVE pairs of transition lengths every pair is searched; above, every
    other length first, then every pair within 2 of the best (every pair if none fits and
    ``fallback``).
    """
    if len(p.lengths) <= COARSE_ABOVE:
        return _search_pairs(p, p.lengths)
    coarse = tuple((i, j) for i, j in p.lengths if i % 2 == 1 and j % 2 == 1)
    best, count = _search_pairs(p, coarse)
    if best is None and not fallback:
        return None, count
    if best is None:
        rest = tuple(q for q in p.lengths if q not in coarse)
        other, more = _search_pairs(p, rest)
        return other, count + more
    near = tuple(
        (i, j)
        for i, j in p.lengths
        if abs(i - best.n1) <= 2 and abs(j - best.n2) <= 2 and (i, j) not in coarse
    )
    other, more = _search_pairs(p, near)
    if other is not None and other.objective < best.objective:
        best = other
    return best, count + more


def _search_pairs(p: _Problem, lengths):
    """Least sum of squared slews over every cell of these transition lengths."""
    best: _Best | None = None
    count = 0
    for n1, n2 in lengths:
        got, searched = _candidates(p, n1, n2)
        count += searched
        if got is None:
            continue
        a, e, xp, nv, dp, dn, s0, g, lo, hi, fixed = got
        ok = np.ones(a.size, dtype=bool)
        if p.limit is not None:
            lo, hi, ok = _limit_interval(p.limit, s0, g, lo, hi, fixed, ok)
            if not np.any(ok):
                continue
        gg = np.einsum("cn,cn->c", g, g)
        t_free = np.where(gg > 0, np.einsum("cn,cn->c", s0, g) / np.where(gg > 0, gg, 1.0), 0.0)
        t = np.where(np.isfinite(fixed), fixed, np.clip(t_free, lo, np.maximum(lo, hi)))
        s = s0 - t[:, None] * g
        obj = np.where(ok, np.einsum("cn,cn->c", s, s), np.inf)
        c = int(np.argmin(obj))
        if np.isfinite(obj[c]) and (best is None or obj[c] < best.objective):
            x = xp[c] + t[c] * nv[c]
            best = _Best(
                float(obj[c]), n1, n2, int(a[c]), int(e[c]), x, s[c].copy(), dp[c] + t[c] * dn[c]
            )
    return best, count


def _minimax_cell(p: _Problem, n1: int, n2: int, a: int, e: int):
    """min max |s| on one cell as a linear program in (u, w, z, tau); (tau, x) or None."""
    n = p.m.size
    idx = np.arange(n, dtype=float)
    cu, cw, cz = _columns(n, np.array([float(a)]), np.array([float(e)]), n1, n2)
    cols = np.stack([cu[0], cw[0], cz[0]], axis=1)  # (n, 3)
    sa = slews_from_differences(cols, axis=0)  # slews of each column
    sm = slews_from_differences(p.m)
    # s = sm - sa x ; |s| <= tau
    a_ub = np.vstack(
        [
            np.hstack([-sa, -np.ones((n, 1))]),  # sm - sa x <= tau
            np.hstack([sa, -np.ones((n, 1))]),  # -(sm - sa x) <= tau
            [[a, -1, 0, 0], [-(a + 1), 1, 0, 0], [e, 0, -1, 0], [-(e + 1), 0, 1, 0]],
        ]
    )
    b_ub = np.concatenate([-sm, sm, np.zeros(4)])
    a_eq = [np.append(cols.sum(axis=0), 0.0), np.append(idx @ cols, 0.0)]
    b_eq = [p.m.sum(), idx @ p.m]
    for h, v in p.holds:
        a_eq.append(np.append(sa[h], 0.0))
        b_eq.append(sm[h] - v)
    if p.u_fixed is not None:
        a_eq.append([1.0, 0, 0, 0])
        b_eq.append(p.u_fixed)
    res = linprog(
        c=[0, 0, 0, 1.0],
        A_ub=a_ub,
        b_ub=b_ub,
        A_eq=np.array(a_eq),
        b_eq=np.array(b_eq),
        bounds=[(0, None), (None, None), (None, None), (0, None)],
        method="highs",
    )
    if res.status != 0:
        return None
    return float(res.x[3]), res.x[:3]


def _rank_minimax(p: _Problem, lengths, per_pair: int):
    """(least max |s| found by golden section, n1, n2, a, e) for the best cells per pair."""
    ranked = []
    ratio = (math.sqrt(5) - 1) / 2
    for n1, n2 in lengths:
        got, _ = _candidates(p, n1, n2)
        if got is None:
            continue
        a, e, xp, nv, dp, dn, s0, g, lo, hi, fixed = got
        # golden section on the convex max |s0 - t g| (to rank the cells only)
        left = np.where(np.isfinite(fixed), fixed, lo)
        right = np.where(np.isfinite(fixed), fixed, hi)
        t1 = right - ratio * (right - left)
        t2 = left + ratio * (right - left)
        f1 = np.max(np.abs(s0 - t1[:, None] * g), axis=1)
        f2 = np.max(np.abs(s0 - t2[:, None] * g), axis=1)
        for _ in range(25):  # ranking only: linprog gives the value; one evaluation a step
            lower = f1 <= f2
            right = np.where(lower, t2, right)
            left = np.where(lower, left, t1)
            t_new = np.where(lower, right - ratio * (right - left), left + ratio * (right - left))
            f_new = np.max(np.abs(s0 - t_new[:, None] * g), axis=1)
            t1, t2, f1, f2 = (
                np.where(lower, t_new, t2),
                np.where(lower, t1, t_new),
                np.where(lower, f_new, f2),
                np.where(lower, f1, f_new),
            )
        t = (left + right) / 2
        f = np.max(np.abs(s0 - t[:, None] * g), axis=1)
        for c in np.argsort(f)[:per_pair]:
            ranked.append((float(f[c]), n1, n2, int(a[c]), int(e[c])))
    ranked.sort()
    return ranked


def _search_near_minimax(p: _Problem):
    """With a slew limit no coarse pair meets: (best, cells searched, smallest-limit tuple).

    The smallest limit that works is found first; under the given limit there is no design
    when it is larger; else the pairs within 2 of its lengths are searched, then all."""
    got = _smallest_limit(p)
    if got is None or p.limit is None or got[0] > p.limit + SLEW_TOLERANCE:
        return None, 0, got
    n1, n2 = got[1], got[2]
    near = tuple((i, j) for i, j in p.lengths if abs(i - n1) <= 2 and abs(j - n2) <= 2)
    best, count = _search_pairs(p, near)
    if best is None:
        best, more = _search_pairs(p, p.lengths)
        count += more
    return best, count, got


def _smallest_limit(p: _Problem, shortlist: int = 12):
    """Smallest slew limit that works: linprog on the cells whose least max |s| is lowest
    (golden section ranks them; coarse lengths first as in _search)."""
    free = _Problem(p.m, p.holds, None, p.u_fixed, p.lengths)
    if len(p.lengths) <= COARSE_ABOVE:
        ranked = _rank_minimax(free, p.lengths, shortlist)
    else:
        coarse = tuple((i, j) for i, j in p.lengths if i % 2 == 1 and j % 2 == 1)
        ranked = _rank_minimax(free, coarse, 3)
        if ranked:
            n1, n2 = ranked[0][1], ranked[0][2]
            near = tuple(
                (i, j)
                for i, j in p.lengths
                if abs(i - n1) <= 2 and abs(j - n2) <= 2 and (i, j) not in coarse
            )
        else:
            near = tuple(q for q in p.lengths if q not in coarse)
        ranked = sorted(ranked + _rank_minimax(free, near, 3))
    best = None
    for _, n1, n2, a, e in ranked[:shortlist]:
        got = _minimax_cell(free, n1, n2, a, e)
        if got is not None and (best is None or got[0] < best[0]):
            best = (got[0], n1, n2, a, e, got[1])
    return best


def _lengths(n: int, transitions, max_transition) -> tuple[tuple[int, int], ...]:
    if transitions is not None:
        return (tuple(int(v) for v in transitions),)
    k = DEFAULT_MAX_TRANSITION if max_transition is None else int(max_transition)
    k = max(1, min(k, (n - 3) // 2))
    return tuple((i, j) for i in range(1, k + 1) for j in range(1, k + 1))
