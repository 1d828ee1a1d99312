"""Local versine corrections at hold points: a design for many holds, or holds that pull
against each other, which no smooth transition - constant - transition diagram meets.

Practice (common practice, no source; read nowhere, the formulation below is derived): keep
the smooth diagram and adjust the designed versines at and next to each held station so the
slews there come to the held values, giving a short local irregularity instead of moving
the whole curve.

Formulation (derived). The smooth diagram's breakpoints (TS, SC, CS, ST, in station
spacings) are kept; its point versines are u phi_i with phi the unit trapezoid
(0 to the TS, linear to 1 at the SC, 1 to the CS, linear to 0 at the ST). The designed
versines are

    d = u phi + c,   c_i = 0 unless |i - h| <= window for some hold h,

and the slews s = T (m - d) with T_ik = 2 max(i - k, 0) (core.versine_realign: s_i =
2 sum_{k<i} (i - k) e_k). The unknowns y = (u, c_window) (u alone fixed with a chosen
radius) meet, as linear equations C y = f: the closure (sum e = 0, sum i e = 0) and every
hold (s_h = held value). Among those, the design minimises

    sum s_i^2 + weight * sum c_i^2          (weight 1 by default: a correction counts
                                             like a slew of the same size; chosen)

a linearly constrained least squares, solved on the null space of C (scipy.linalg:
y = y_p + N z, then an ordinary least squares in z). With a slew limit L the same objective
is minimised under |s_i| <= L (scipy.optimize.minimize, SLSQP, from the min-max design);
the smallest limit that works is min max |s_i| under the same equations, a linear program
in (y, tau) (scipy.optimize.linprog). The corrections balance over each run of corrected
stations (sum c = 0 and sum i c = 0 on the run: the practice's balancing pairs and
triples), so the slews outside the runs are the smooth diagram's and the closure is the
smooth diagram's. The breakpoints are those of the best smooth design
without the holds (within the limit when one is): with balanced corrections only a smooth
diagram that closes by itself can be kept, so other cells are not tried.

Computed in millimetres internally (better scaled); inputs and outputs in metres.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.linalg import lstsq, null_space
from scipy.optimize import linprog, minimize

from curvetui.core.versine_cells import SLEW_TOLERANCE
from curvetui.core.versine_realign import slews_from_differences

DEFAULT_WINDOW = 2  # stations either side of a hold where a correction may be made
DEFAULT_WEIGHT = 1.0  # penalty on sum c^2 against sum s^2 (dimensionless; chosen)
_MM = 1000.0


@dataclass(frozen=True)
class Corrected:
    """A design with local corrections (metres; breaks in spacings from the first station)."""

    designed: np.ndarray
    slews: np.ndarray
    corrections: np.ndarray  # c at every station (0 outside the windows)
    window_stations: np.ndarray  # indices where a correction may be made
    u: float
    breaks: tuple[float, float, float, float]
    objective: float  # sum s^2 + weight sum c^2 [m^2]
    feasible: bool  # holds, closure and the limit met
    smallest_limit: float | None  # min max |s| with corrections (None: not computed)
    binding: tuple[int, ...]  # hold indices whose multiplier is not 0
    cells: int


def unit_trapezoid(n: int, breaks) -> np.ndarray:
    """phi_i: 0 to the TS, linear to 1 at the SC, 1 to the CS, linear to 0 at the ST."""
    ts, sc, cs, st = (float(v) for v in breaks)
    i = np.arange(n, dtype=float)
    return np.clip(np.minimum((i - ts) / (sc - ts), (st - i) / (st - cs)), 0.0, 1.0)


def window_of(n: int, holds, window: int) -> np.ndarray:
    """Indices within ``window`` stations of any hold (sorted, inside the survey)."""
    got = set()
    for h, _ in holds:
        got.update(range(max(0, h - window), min(n - 1, h + window) + 1))
    return np.array(sorted(got), dtype=int)


def clusters_of(win: np.ndarray) -> list[np.ndarray]:
    """The window's runs of consecutive stations (positions in ``win``)."""
    if win.size == 0:
        return []
    cuts = np.flatnonzero(np.diff(win) > 1) + 1
    return np.split(np.arange(win.size), cuts)


def _system(m, holds, breaks, u_fixed, win, balanced=True):
    """Matrices (mm): sm, B (s = sm - B y), C, f (C y = f), D (penalty diagonal)."""
    n = m.size
    idx = np.arange(n, dtype=float)
    t_mat = 2.0 * np.maximum(idx[:, None] - idx[None, :], 0.0)
    phi = unit_trapezoid(n, breaks)
    mm = m * _MM
    p = np.zeros((n, win.size))
    p[win, np.arange(win.size)] = 1.0
    if u_fixed is None:
        cols = np.hstack([phi[:, None], p])
        pen = np.r_[0.0, np.ones(win.size)]
    else:
        mm = mm - u_fixed * _MM * phi
        cols = p
        pen = np.ones(win.size)
    sm = t_mat @ mm
    b = t_mat @ cols
    c_rows = [cols.sum(axis=0), idx @ cols]
    f = [mm.sum(), idx @ mm]
    for h, v in holds:
        c_rows.append(b[h])
        f.append(sm[h] - v * _MM)
    first = 1 if u_fixed is None else 0
    for run in clusters_of(win) if balanced else ():  # sum c = 0 and sum i c = 0 per run
        for weights in (np.ones(run.size), win[run].astype(float)):
            row = np.zeros(cols.shape[1])
            row[first + run] = weights
            c_rows.append(row)
            f.append(0.0)
    return sm, b, np.array(c_rows), np.array(f), pen, cols, phi


def _ls(sm, b, c_mat, f, pen, weight):
    """Least sum s^2 + weight sum c^2 with C y = f: (y, multipliers) or None."""
    y_p = lstsq(c_mat, f)[0]
    if np.max(np.abs(c_mat @ y_p - f) - 1e-13 * np.abs(f)) > 1e-6:  # mm (mm x stations)
        return None
    nsp = null_space(c_mat)
    a = np.vstack([b, np.sqrt(weight) * np.diag(np.sqrt(pen))])
    rhs = np.r_[sm, np.zeros(pen.size)]
    if nsp.shape[1]:
        z = lstsq(a @ nsp, rhs - a @ y_p)[0]
        y = y_p + nsp @ z
    else:
        y = y_p
    grad = 2.0 * a.T @ (a @ y - rhs)
    lam = lstsq(c_mat.T, -grad)[0]
    return y, lam


def _minimax(sm, b, c_mat, f, u_free: bool):
    """min max |sm - B y| with C y = f (mm): (tau, y) or None (linprog, HiGHS)."""
    n, k = b.shape
    ones = np.ones((n, 1))
    a_ub = np.vstack([np.hstack([-b, -ones]), np.hstack([b, -ones])])
    b_ub = np.r_[-sm, sm]
    a_eq = np.hstack([c_mat, np.zeros((c_mat.shape[0], 1))])
    bounds = [(None, None)] * k + [(0, None)]
    if u_free:
        bounds[0] = (0, None)
    obj = np.zeros(k + 1)
    obj[-1] = 1.0
    res = linprog(obj, A_ub=a_ub, b_ub=b_ub, A_eq=a_eq, b_eq=f, bounds=bounds, method="highs")
    if res.status != 0:
        return None
    return float(res.x[-1]), res.x[:-1]


def _limited(sm, b, c_mat, f, pen, weight, limit_mm, y0):
    """Least objective under |s| <= limit from the feasible y0 (SLSQP on the null space)."""
    nsp = null_space(c_mat)
    if nsp.shape[1] == 0:
        return y0
    a = np.vstack([b, np.sqrt(weight) * np.diag(np.sqrt(pen))])
    rhs = np.r_[sm, np.zeros(pen.size)]
    an = a @ nsp
    r0 = rhs - a @ y0
    bn = b @ nsp
    s0 = sm - b @ y0  # s = s0 - bn z

    def fun(z):
        r = an @ z - r0
        return float(r @ r), 2.0 * an.T @ r

    cons = [
        {"type": "ineq", "fun": lambda z: limit_mm - (s0 - bn @ z), "jac": lambda z: bn},
        {"type": "ineq", "fun": lambda z: limit_mm + (s0 - bn @ z), "jac": lambda z: -bn},
    ]
    res = minimize(
        fun,
        np.zeros(nsp.shape[1]),
        jac=True,
        method="SLSQP",
        constraints=cons,
        options={"maxiter": 200, "ftol": 1e-12},
    )
    y = y0 + nsp @ res.x
    if np.max(np.abs(sm - b @ y)) > limit_mm + SLEW_TOLERANCE * _MM:
        return y0
    return y


def corrected_design(
    m, holds, breaks, u_fixed=None, limit=None, window=DEFAULT_WINDOW, weight=DEFAULT_WEIGHT
) -> Corrected | None:
    """The design with local corrections near ``breaks`` (see the module docstring).

    ``m`` measured versines [m]; ``holds`` (index, slew [m]) pairs; ``breaks`` the smooth
    design's (TS, SC, CS, ST) in spacings; ``u_fixed`` a chosen central versine [m];
    ``limit`` [m]. None when no cell meets the holds and the closure at all.
    """
    m = np.asarray(m, dtype=float)
    n = m.size
    win = window_of(n, holds, window)
    best = None
    cells = [tuple(float(v) for v in breaks)]  # balanced: only a closing smooth diagram
    systems = []
    for q in cells:
        sm, b, c_mat, f, pen, cols, phi = _system(m, holds, q, u_fixed, win)
        got = _ls(sm, b, c_mat, f, pen, weight)
        if got is None:
            continue
        y, lam = got
        if u_fixed is None and y[0] < 0:
            continue
        r = np.r_[sm - b @ y, np.sqrt(weight * pen) * y]
        obj = float(r @ r)
        systems.append((obj, q, sm, b, c_mat, f, pen, cols, phi, y, lam))
    if not systems:
        return None
    systems.sort(key=lambda t: t[0])
    if limit is not None:
        lim = limit * _MM
        fits = [t for t in systems if np.max(np.abs(t[2] - t[3] @ t[9])) <= lim + 1e-6]
        if fits:
            best = fits[0]
            return _build(m, best, u_fixed, win, True, None, len(cells), weight, len(holds))
        ranked = []
        for t in systems:
            mm_ = _minimax(t[2], t[3], t[4], t[5], u_fixed is None)
            if mm_ is not None:
                ranked.append((mm_[0], t, mm_[1]))
        if not ranked:
            return None
        ranked.sort(key=lambda r: r[0])
        tau, t, y_lp = ranked[0]
        smallest = tau / _MM
        if tau > lim + 1e-6:
            # the design shown: least objective with every slew within the smallest limit
            y = _limited(t[2], t[3], t[4], t[5], t[6], weight, tau * (1 + 1e-9), y_lp)
            chosen = t[:9] + (y, None)
            return _build(m, chosen, u_fixed, win, False, smallest, len(cells), weight, len(holds))
        under = [r for r in ranked if r[0] <= lim + 1e-6]
        under.sort(key=lambda r: r[1][0])
        tau, t, y_lp = under[0]
        y = _limited(t[2], t[3], t[4], t[5], t[6], weight, lim, y_lp)
        chosen = t[:9] + (y, None)
        return _build(m, chosen, u_fixed, win, True, smallest, len(cells), weight, len(holds))
    return _build(m, systems[0], u_fixed, win, True, None, len(cells), weight, len(holds))


def _build(m, t, u_fixed, win, feasible, smallest, count, weight, n_holds) -> Corrected:
    obj_, q, sm, b, c_mat, f, pen, cols, phi, y, lam = t
    n = m.size
    c = np.zeros(n)
    if u_fixed is None:
        u = float(y[0]) / _MM
        c[win] = y[1:] / _MM
    else:
        u = float(u_fixed)
        c[win] = y / _MM
    designed = u * phi + c
    s = slews_from_differences(m - designed)
    obj = float(s @ s + weight * c @ c)
    binding = ()
    if lam is not None:
        hold_lam = np.abs(lam[2 : 2 + n_holds])
        scale = 1e-9 * max(obj * _MM * _MM, 1e-12)
        binding = tuple(int(j) for j in np.flatnonzero(hold_lam * 1.0 > scale))
    return Corrected(
        designed=designed,
        slews=s,
        corrections=c,
        window_stations=win,
        u=u,
        breaks=tuple(float(v) for v in q),
        objective=obj,
        feasible=feasible,
        smallest_limit=smallest,
        binding=binding,
        cells=count,
    )
