"""Plan elements from a chain and back: hand-worked simple curves (T = R tan(D/2),
L = R D; Indiana DOT Design Manual Fig. 43-6D for PC = PI - T, PT = PC + L), reverse bends
with no tangent between them, a spiral-spiral bend, and what is refused.

Sources of the check values: T = R tan(D/2), L = R D (REFERENCES.md "Curve geometry", a
surveying reference, read; e.g. Delta 60 deg, R 150 ft: T 86.60, L 157.08 ft); a clothoid's
spiral angle Ls / (2R) (textbook clothoid geometry, REFERENCES.md "Geometry data"); the
coordinates are the plane geometry written beside each check.
"""

from __future__ import annotations

import math

import pytest

from curvetui.core.alignment import Chain
from curvetui.core.plan_chain import chain_from_elements
from curvetui.core.plan_elements import (
    ArcElement,
    ElementError,
    LineElement,
    SpiralElement,
    chain_elements,
    signed_turn,
    tangent_intersection,
)


def test_tangent_intersection_by_hand():
    # x = 0 northwards and y = 200 eastwards cross at (0, 200)
    assert tangent_intersection((0, 0), (0, 1), (300, 200), (1, 0)) == pytest.approx((0, 200))
    with pytest.raises(ElementError, match="parallel"):
        tangent_intersection((0, 0), (0, 1), (5, 0), (0, -1))
    assert signed_turn((0, 1), (1, 0)) == pytest.approx(math.pi / 2)  # north to east: right


def test_simple_curve_elements_by_hand():
    """R 100 m, 90 deg right at PI (0, 200): T = 100 tan 45 = 100 m, L = 100 pi / 2 m,
    PC (0, 100), centre (100, 100), PT (100, 200); stations from 10: PC 110, PT 110 + L."""
    chain = Chain(((0, 0), (0, 200), (300, 200)), (100.0,), (0.0,), (0.0,), 10.0)
    line, arc, last = chain_elements(chain)
    assert isinstance(line, LineElement) and isinstance(arc, ArcElement)
    assert line.end == pytest.approx((0, 100)) and line.station == 10
    assert arc.center == pytest.approx((100, 100)) and arc.end == pytest.approx((100, 200))
    assert arc.pi == pytest.approx((0, 200)) and arc.rot == 1
    assert arc.station == pytest.approx(110)
    assert last.station == pytest.approx(110 + 50 * math.pi)
    assert last.end == (300, 200)


def test_reverse_bends_without_a_tangent_between():
    """90 deg right then 90 deg left, R 100 m each: T = 100 m each, the 200 m leg between
    the PIs is used up, so no Line between the curves."""
    chain = Chain(((0, 0), (0, 200), (200, 200), (200, 400)), (100.0, 100.0), (0, 0), (0, 0))
    elements = chain_elements(chain)
    assert [type(e).__name__ for e in elements] == [
        "LineElement",
        "ArcElement",
        "ArcElement",
        "LineElement",
    ]
    assert [e.rot for e in elements[1:3]] == [1, -1]
    back = chain_from_elements(elements)
    for p, q in zip(back.points, chain.points, strict=True):
        assert math.dist(p, q) < 1e-9


def test_spiral_spiral_bend():
    """Ls = R D on each side (theta = Ls / 2R = D / 2): no arc is left between the spirals."""
    d = math.radians(20)
    ls = 300 * d / 1.0  # two spirals, each turning D / 2
    far = 1000.0
    end = (far * math.sin(d), far + far * math.cos(d))
    chain = Chain(((0, 0), (0, far), end), (300.0,), (ls,), (ls,))
    elements = chain_elements(chain)
    assert [type(e).__name__ for e in elements] == [
        "LineElement",
        "SpiralElement",
        "SpiralElement",
        "LineElement",
    ]
    back = chain_from_elements(elements)
    assert back.spirals_in == pytest.approx((ls,)) and back.radii == pytest.approx((300,))
    assert math.dist(back.points[1], chain.points[1]) < 1e-6


def test_refusals():
    overlapping = Chain(((0, 0), (0, 50), (300, 50)), (100.0,), (0.0,), (0.0,))
    with pytest.raises(ElementError, match="overlaps"):
        chain_elements(overlapping)
    with pytest.raises(ElementError, match="no plan elements"):
        chain_from_elements([])
    spiralled = Chain(((0, 0), (0, 500), (400, 800)), (200.0,), (50.0,), (50.0,))
    elements = chain_elements(spiralled)
    assert isinstance(elements[3], SpiralElement)
    with pytest.raises(ElementError, match="a spiral from radius 200.0000 m to a tangent"):
        chain_from_elements(elements[3:])  # the spiral out without its curve
    with pytest.raises(ElementError, match="a spiral into a curve must be followed"):
        chain_from_elements(elements[:2])
    with pytest.raises(ElementError, match="a gap of"):
        chain_from_elements([elements[0], *elements[2:]])
