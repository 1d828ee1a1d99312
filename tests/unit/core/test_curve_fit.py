"""Circle fits and the heading of piecewise-linear curvature.

Check values: points on an analytic circle; for noisy points, the geometric fit found
independently here with scipy.optimize.least_squares (its own residuals, finite-difference
Jacobian, a different start); the heading of a clothoid, theta = s^2 / (2 R Ls) (the
clothoid's definition, core/spiral.py's module doc), and of the whole bend by
scipy.integrate.quad of the curvature.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad
from scipy.optimize import least_squares

from curvetui.core.curve_fit import circle_algebraic, circle_geometric, heading_of_knots


def test_algebraic_and_geometric_fits_on_an_exact_arc():
    a = np.linspace(0.3, 0.9, 25)
    x, y = 1000.0 + 250.0 * np.cos(a), -40.0 + 250.0 * np.sin(a)
    for fit in (circle_algebraic(x, y), circle_geometric(x, y)):
        assert (fit.xc, fit.yc, fit.radius) == pytest.approx((1000.0, -40.0, 250.0), rel=1e-9)
        assert fit.rms < 1e-9


def test_geometric_fit_matches_scipy_least_squares_on_noisy_points():
    rng = np.random.default_rng(5)
    a = np.linspace(0.0, 0.6, 60)
    x = 300.0 * np.cos(a) + rng.normal(0, 0.3, a.size)
    y = 300.0 * np.sin(a) + rng.normal(0, 0.3, a.size)
    fit = circle_geometric(x, y)

    def res(p):
        return np.sqrt((x - p[0]) ** 2 + (y - p[1]) ** 2) - p[2]

    ref = least_squares(
        res, [float(x.mean()) - 250.0, float(y.mean()), 250.0], xtol=1e-14, ftol=1e-14, gtol=1e-14
    )
    # the same optimum: centre to a tenth of a millimetre (it lies near the origin, so a
    # relative tolerance would not do), radius to 1e-6
    assert (fit.xc, fit.yc) == pytest.approx(tuple(ref.x[:2]), abs=1e-4)
    assert fit.radius == pytest.approx(ref.x[2], rel=1e-6)
    assert fit.rms == pytest.approx(math.sqrt(np.mean(res(ref.x) ** 2)), rel=1e-6)


def test_collinear_points_give_an_infinite_radius():
    x = np.linspace(0.0, 10.0, 5)
    assert math.isinf(circle_geometric(x, 2 * x).radius)


def test_heading_of_a_spiral_arc_spiral():
    r, l1, lc, l2, ts = 200.0, 60.0, 100.0, 40.0, 25.0
    knots = np.array([ts, ts + l1, ts + l1 + lc, ts + l1 + lc + l2])
    kappas = np.array([0.0, 1 / r, 1 / r, 0.0])
    s = np.linspace(0.0, 300.0, 301)
    theta = heading_of_knots(s, knots, kappas, 0.1)
    in_spiral = (s > ts) & (s < ts + l1)
    u = s[in_spiral] - ts
    assert theta[in_spiral] == pytest.approx(0.1 + u * u / (2 * r * l1), abs=1e-12)
    assert theta[s <= ts] == pytest.approx(0.1)
    total = (l1 / 2 + lc + l2 / 2) / r
    assert theta[s >= knots[-1]] == pytest.approx(0.1 + total)
    for station in (90.0, 180.0, 210.0):
        ref, _ = quad(lambda t: np.interp(t, knots, kappas), 0.0, station, points=knots)
        assert heading_of_knots(np.array([station]), knots, kappas, 0.1)[0] == pytest.approx(
            0.1 + ref, abs=1e-10
        )
