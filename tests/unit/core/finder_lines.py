"""Centrelines for the curve finder's tests, with their true curves.

``circle_bend`` is exact analytic geometry (a tangent, a circular arc of radius R through
the deflection, a tangent), written out here from plane trigonometry with none of the
engine's code. ``chain_line`` builds bends through the project's own tested geometry
(core/spiral.py lays out each spiral - arc - spiral, checked against mpmath and the
values in REFERENCES.md by tests/unit/core/test_spiral.py; core/plan_elements.py makes
the elements, core/plan_points.py puts points on them). Generated shapes, no real road.
"""

from __future__ import annotations

import math

import numpy as np

from curvetui.core.alignment import Chain
from curvetui.core.plan_elements import chain_elements
from curvetui.core.plan_points import points_along
from curvetui.core.spiral import spiral_curve


def circle_bend(radius, deflection_deg, left=True, tangent=100.0, spacing=2.0):
    """x, y [m] of a tangent along +x, an arc turning left (or right) through the
    deflection, and a tangent; vertices every ``spacing`` m along each part; and the
    stations of the PC and PT."""
    d = math.radians(deflection_deg)
    side = 1.0 if left else -1.0
    t0 = np.arange(0.0, tangent, spacing)
    arc = np.arange(0.0, radius * d, spacing)
    t1 = np.arange(0.0, tangent + 1e-9, spacing)
    x = np.concatenate((t0, tangent + radius * np.sin(arc / radius)))
    y = np.concatenate((0 * t0, side * radius * (1 - np.cos(arc / radius))))
    ex, ey = tangent + radius * math.sin(d), side * radius * (1 - math.cos(d))
    x = np.concatenate((x, ex + t1 * math.cos(d)))
    y = np.concatenate((y, ey + side * t1 * math.sin(d)))
    return x, y, tangent, tangent + radius * d


def chain_line(bends, tangents, spacing=2.0, end=100.0):
    """Vertices every ``spacing`` m along bends (radius [m], signed deflection [deg, right
    positive], spiral in, spiral out [m]) with ``tangents`` [m] between them and ``end`` m
    of tangent before the first and after the last; returns (x, y, [(TS, ST), ...])."""
    geoms = [spiral_curve(r, math.radians(abs(d)), a, b) for r, d, a, b in bends]
    t_in = [float(g.tangent_in) for g in geoms]
    t_out = [float(g.tangent_out) for g in geoms]
    legs = [end + t_in[0]]
    legs += [t_out[i] + tangents[i] + t_in[i + 1] for i in range(len(bends) - 1)]
    legs.append(t_out[-1] + end)
    bearing = math.radians(30.0)
    points = [(0.0, 0.0)]
    for i, leg in enumerate(legs):
        e, n = points[-1]
        points.append((e + leg * math.sin(bearing), n + leg * math.cos(bearing)))
        if i < len(bends):
            bearing += math.radians(bends[i][1])
    chain = Chain(
        tuple(points),
        tuple(b[0] for b in bends),
        tuple(b[2] for b in bends),
        tuple(b[3] for b in bends),
    )
    lay = chain.lay_out(reverse_tangent_min=0, broken_back_tangent_min=0)
    _, x, y = points_along(chain_elements(chain), spacing)
    return x, y, [(float(b.geometry.ts), float(b.geometry.st)) for b in lay.bends]
