"""Points along plan elements.

Check values: a line's points on the segment at the given lengths; an arc's points at
radius R from its centre and at chord 2 R sin(t / 2R) from its start (plane
trigonometry); a clothoid's points against its own ends as core/plan_elements.py lays
them out (SC and CS from core/spiral.py's X, Y, checked in test_spiral.py) and with the
heading a clothoid has, theta = t^2 / (2 R Ls), between consecutive close points.
Sources: plane geometry for lines and arcs (derived); the clothoid's heading is its
definition (curvature linear in length, AASHTO Green Book 2018 section 3.3.8 on spiral
transitions, cited from memory).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from curvetui.core.alignment import Chain
from curvetui.core.plan_elements import ArcElement, LineElement, SpiralElement, chain_elements
from curvetui.core.plan_points import element_points, points_along


def test_line_points():
    el = LineElement((1.0, 2.0), (4.0, 6.0))
    e, n = element_points(el, np.array([0.0, 2.5, 5.0]))
    assert e.tolist() == pytest.approx([1.0, 2.5, 4.0])
    assert n.tolist() == pytest.approx([2.0, 4.0, 6.0])


@pytest.mark.parametrize("rot", [1, -1])
def test_arc_points_on_the_circle_and_turning_its_way(rot):
    el = ArcElement((0.0, 0.0), (rot * 100.0, 0.0), (0.0, 0.0), rot, 100.0)
    t = np.array([0.0, 30.0, 60.0])
    e, n = element_points(el, t)
    assert np.hypot(e - rot * 100.0, n) == pytest.approx(np.full(3, 100.0))
    assert np.hypot(e, n) == pytest.approx(200.0 * np.sin(t / 200.0))
    # leaving northwards from the start, a clockwise arc (rot +1) bends east, the other west
    assert n[1] > 0
    assert np.sign(e[1]) == rot


def test_spirals_meet_their_element_ends_and_have_clothoid_headings():
    chain = Chain(((0.0, 0.0), (0.0, 400.0), (300.0, 700.0)), (250.0,), (80.0,), (60.0,))
    elements = chain_elements(chain)
    spirals = [el for el in elements if isinstance(el, SpiralElement)]
    assert len(spirals) == 2
    for el in spirals:
        e, n = element_points(el, np.array([0.0, el.length]))
        assert (e[0], n[0]) == pytest.approx(el.start, abs=1e-9)
        assert (e[1], n[1]) == pytest.approx(el.end, abs=1e-9)
    entry = spirals[0]  # from the tangent (bearing 0, north) turning right
    t = np.array([40.0, 40.001])
    e, n = element_points(entry, t)
    heading = math.atan2(e[1] - e[0], n[1] - n[0])  # bearing, clockwise from north
    assert heading == pytest.approx(40.0005**2 / (2 * 250.0 * 80.0), abs=1e-6)


def test_points_along_a_chain_are_evenly_spaced_and_end_at_its_end():
    chain = Chain(((0.0, 0.0), (0.0, 400.0), (300.0, 700.0)), (250.0,), (80.0,), (60.0,))
    elements = chain_elements(chain)
    s, e, n = points_along(elements, 5.0)
    assert np.diff(s[:-1]) == pytest.approx(np.full(s.size - 2, 5.0))
    assert (e[-1], n[-1]) == pytest.approx((300.0, 700.0), abs=1e-9)
    assert (e[0], n[0]) == (0.0, 0.0)
    chords = np.hypot(np.diff(e), np.diff(n))
    assert np.all(chords <= np.diff(s) + 1e-9)  # chords no longer than the lengths
    assert np.all(chords[:-1] > 5.0 - 5.0**3 / (24 * 250.0**2) - 1e-9)  # arc chord at R
