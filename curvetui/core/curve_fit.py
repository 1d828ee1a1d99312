"""Fits for the curve finder: circles to points, and curvature that is piecewise linear in
station (tangents, clothoid ramps and arcs) to headings.

Circle: the algebraic fit (Kasa) minimises sum (x^2 + y^2 + D x + E y + F)^2, a linear
least-squares problem, with centre (-D/2, -E/2) and R^2 = D^2/4 + E^2/4 - F; computed on
coordinates centred on their mean to keep it well conditioned. It is then refined by the
geometric fit, minimising sum (|P_i - C| - R)^2 with scipy.optimize.least_squares
(Levenberg-Marquardt), started from the algebraic fit. The algebraic fit is biased towards
small circles on short noisy arcs; the geometric one is the maximum-likelihood fit for
independent Gaussian errors.

Curvature: a clothoid's curvature is linear in its length (1/rho = s / (R Ls)), an arc's
constant, a tangent's zero, so a bend's curvature is a continuous piecewise-linear function
kappa(s) of station with knots s_0 < ... < s_n, kappa(s_0) = kappa(s_n) = 0. Its heading is
the integral

    theta(s) = theta_0 + sum over earlier pieces + kappa_k (s - s_k)
               + (kappa_{k+1} - kappa_k) (s - s_k)^2 / (2 (s_{k+1} - s_k))   on piece k,

which the fits match to measured headings (least squares, scipy.optimize.least_squares).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

TINY = 1e-12
# points whose spread across their main direction is below this share of the spread along
# it are in line (a circle through them would be larger than rounding can tell)
COLLINEAR = 1e-9
OVERRUN_WEIGHT = 0.1  # [rad/m]
NO_RAMP = 1e-3  # [m] a ramp held at zero is kept under this (a millimetre: no spiral)
MAX_EVALUATIONS = 100  # per fit; a fit that needs more is a poor start (no source)
# relative change of the misfit and of the parameters that ends a fit: 1e-6 of a knot
# station is well under a millimetre on a curve of a kilometre (no source)
FIT_TOLERANCE = 1e-6


@dataclass(frozen=True)
class Circle:
    """A fitted circle: centre (xc, yc) [m], radius [m], RMS of the radial offsets [m]."""

    xc: float
    yc: float
    radius: float
    rms: float


def circle_algebraic(x: NDArray, y: NDArray) -> Circle:
    """Kasa's algebraic circle fit (module doc); at least three points not in line.

    Returns a circle of infinite radius when the points are collinear."""
    mx, my = float(np.mean(x)), float(np.mean(y))
    u, v = x - mx, y - my
    spread = np.linalg.svd(np.column_stack((u, v)), compute_uv=False)
    if spread.size < 2 or spread[1] <= COLLINEAR * spread[0]:
        return Circle(mx, my, math.inf, math.nan)
    a = np.column_stack((u, v, np.ones_like(u)))
    b = -(u * u + v * v)
    (d, e, f), *_ = np.linalg.lstsq(a, b, rcond=None)
    r2 = d * d / 4 + e * e / 4 - f
    if not (np.isfinite(r2) and r2 > 0):
        return Circle(mx, my, math.inf, math.nan)
    xc, yc, r = mx - d / 2, my - e / 2, math.sqrt(r2)
    return Circle(xc, yc, r, _rms(x, y, xc, yc, r))


def _rms(x: NDArray, y: NDArray, xc: float, yc: float, r: float) -> float:
    return float(np.sqrt(np.mean((np.hypot(x - xc, y - yc) - r) ** 2)))


def circle_geometric(x: NDArray, y: NDArray, start: Circle | None = None) -> Circle:
    """The geometric circle fit (module doc), started from ``start`` or the algebraic fit.

    Collinear points (or a start of infinite radius) give an infinite radius."""
    start = start or circle_algebraic(x, y)
    if not math.isfinite(start.radius):
        return start
    from scipy.optimize import least_squares

    mx, my = float(np.mean(x)), float(np.mean(y))
    u, v = x - mx, y - my

    def residuals(p: NDArray) -> NDArray:
        return np.hypot(u - p[0], v - p[1]) - p[2]

    def jacobian(p: NDArray) -> NDArray:
        dist = np.maximum(np.hypot(u - p[0], v - p[1]), TINY)
        return np.column_stack(((p[0] - u) / dist, (p[1] - v) / dist, -np.ones_like(u)))

    p0 = np.array([start.xc - mx, start.yc - my, start.radius])
    sol = least_squares(residuals, p0, jac=jacobian, method="lm", xtol=1e-12, ftol=1e-12)
    xc, yc, r = sol.x[0] + mx, sol.x[1] + my, abs(float(sol.x[2]))
    return Circle(float(xc), float(yc), r, _rms(x, y, xc, yc, r))


# --- piecewise-linear curvature and its heading ------------------------------------------


def heading_of_knots(s: NDArray, knots: NDArray, kappas: NDArray, theta0: float) -> NDArray:
    """Heading [rad] at stations ``s`` of the curvature piecewise linear between ``knots``
    [m, non-decreasing] with values ``kappas`` [1/m] (zero before the first knot and after
    the last); module doc."""
    knots = np.asarray(knots, dtype=float)
    kappas = np.asarray(kappas, dtype=float)
    lengths = np.diff(knots)
    areas = lengths * (kappas[:-1] + kappas[1:]) / 2
    before = np.concatenate(([0.0], np.cumsum(areas)))
    k = np.clip(np.searchsorted(knots, s, side="right") - 1, 0, knots.size - 2)
    t = np.clip(s - knots[k], 0.0, None)
    span = lengths[k]
    t = np.minimum(t, span)
    slope = np.where(span > TINY, (kappas[k + 1] - kappas[k]) / np.maximum(span, TINY), 0.0)
    theta = before[k] + kappas[k] * t + slope * t * t / 2
    theta = np.where(s >= knots[-1], before[-1], np.where(s < knots[0], 0.0, theta))
    return theta0 + theta


@dataclass(frozen=True)
class CurvatureModel:
    """A bend's curvature: knots [m along the smoothed line], plateau curvatures [1/m]
    between ramps, the heading before it [rad] and the RMS heading misfit [rad].

    ``knots`` = start, then for each plateau its ramp's end and the plateau's end, then
    the end: for one plateau TS, SC, CS, ST; for two TS, SC, CC1, CC2, CS, ST.
    """

    knots: tuple[float, ...]
    plateaus: tuple[float, ...]
    theta0: float
    rms: float
    cost: float  # half the sum of squared misfits [rad^2]
    points: int  # headings compared

    @property
    def kappas(self) -> tuple[float, ...]:
        out = [0.0]
        for k in self.plateaus:
            out += [k, k]
        return (*out, 0.0)

    @property
    def turn(self) -> float:
        """Signed heading change [rad] across the bend."""
        kn, kv = np.asarray(self.knots), np.asarray(self.kappas)
        return float(np.sum(np.diff(kn) * (kv[:-1] + kv[1:]) / 2))


def _unpack(p: NDArray, pattern: tuple[bool, ...]) -> tuple[float, NDArray, NDArray]:
    """Parameters [theta0, start, lengths (2 n + 1), free plateau curvatures]; ``pattern``
    says for each of the n plateaus whether its curvature is free (True) or zero (a
    tangent between two bends fitted together)."""
    n = len(pattern)
    theta0, start = p[0], p[1]
    lengths = p[2 : 2 + 2 * n + 1]
    free = iter(p[2 + 2 * n + 1 :])
    kappa = np.array([next(free) if f else 0.0 for f in pattern])
    knots = start + np.concatenate(([0.0], np.cumsum(lengths)))
    values = np.concatenate(([0.0], np.repeat(kappa, 2), [0.0]))
    return theta0, knots, values


def fit_curvature(
    s: NDArray,
    heading: NDArray,
    start: NDArray,
    smoother: Callable[[NDArray], NDArray],
    inside: NDArray,
    pattern: tuple[bool, ...],
    bounds_station: tuple[float, float],
    last_knot: float = math.inf,
    no_ramp: tuple[bool, bool] = (False, False),
) -> CurvatureModel:
    """Least-squares fit of a bend with plateaus of curvature ``pattern`` (see ``_unpack``)
    to ``heading`` at ``s``.

    ``start`` the initial parameters [theta0, first knot, 2 n + 1 lengths, free plateau
    curvatures]; ``smoother`` maps model headings at every ``s`` to what the measurement
    made of them; only the points where ``inside`` is true are compared. The first knot is
    kept within ``bounds_station``; lengths are non-negative; a plateau's curvature keeps
    its sign; a last knot beyond ``last_knot`` is penalised (OVERRUN_WEIGHT [rad/m]), so
    that the bend stays on the stretch fitted instead of running over unseen ground.
    ``no_ramp``: (entry, exit) ramps held at zero length (NO_RAMP: a plain arc's ends).
    """
    from scipy.optimize import least_squares

    def residuals(p: NDArray) -> NDArray:
        theta0, knots, values = _unpack(p, pattern)
        model = smoother(heading_of_knots(s, knots, values, theta0))
        past = max(0.0, knots[-1] - last_knot) * OVERRUN_WEIGHT
        return np.append((model - heading)[inside], past)

    n_len = 2 * len(pattern) + 1
    n_free = sum(pattern)
    lo = np.full(start.size, -np.inf)
    hi = np.full(start.size, np.inf)
    lo[1], hi[1] = bounds_station
    lo[2 : 2 + n_len] = 0.0
    for held, at in zip(no_ramp, (2, 1 + n_len), strict=True):
        if held:
            hi[at] = NO_RAMP
    for j, k in enumerate(start[2 + n_len :]):
        if k > 0:
            lo[2 + n_len + j] = 0.0
        else:
            hi[2 + n_len + j] = 0.0
    span = np.where(np.isfinite(hi - lo), hi - lo, 1.0)
    x0 = np.clip(start, lo + 1e-6 * span, hi - 1e-6 * span)
    kscale = max(float(np.max(np.abs(start[2 + n_len :]))), 1e-6)
    scale = np.concatenate(([0.01, 1.0], np.ones(n_len), np.full(n_free, kscale)))
    sol = least_squares(
        residuals,
        x0,
        bounds=(lo, hi),
        x_scale=scale,
        method="trf",
        max_nfev=MAX_EVALUATIONS,
        ftol=FIT_TOLERANCE,
        xtol=FIT_TOLERANCE,
    )
    theta0, knots, values = _unpack(sol.x, pattern)
    res = sol.fun[:-1]
    rms = float(np.sqrt(np.mean(res * res))) if res.size else 0.0
    plateaus = tuple(float(k) for k in values[1:-1:2])
    return CurvatureModel(
        tuple(float(k) for k in knots), plateaus, float(theta0), rms, float(sol.cost), res.size
    )
