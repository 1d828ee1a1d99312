"""Alignments of several bends. Checked by hand arithmetic with the simple-curve formulas
T = R tan(D/2), L = R D (any surveying text; REFERENCES.md: PC = PI - T, PT = PC + L) on
chains whose deflections are set by construction. The tangent thresholds for reverse and
broken-back warnings are common practice, no source."""

import math

import pytest
from chains import chain

from curvetui.core.alignment import (
    BROKEN_BACK,
    OVERLAP,
    SHORT_REVERSE,
    AlignmentError,
    build_alignment,
)
from curvetui.core.spiral import spiral_curve


def test_reverse_pair_by_hand():
    pts = chain([0, 30, 0], [1000, 800, 1000])
    a = build_alignment(pts, [500, 500])
    t = 500 * math.tan(math.radians(15))  # 133.975 m
    length = 500 * math.pi / 6  # 261.799 m
    b1, b2 = a.bends
    assert (b1.direction, b2.direction) == (1, -1)
    assert b1.deflection == pytest.approx(math.radians(30))
    assert float(b1.geometry.ts) == pytest.approx(1000 - t)
    assert float(b1.geometry.st) == pytest.approx(1000 - t + length)
    assert a.tangents[1] == pytest.approx(800 - 2 * t)
    assert float(b2.geometry.ts) == pytest.approx(1000 - t + length + 800 - 2 * t)
    # the built alignment is shorter than the chain by 2T - L at each bend
    assert a.end_station == pytest.approx(2800 - 2 * (2 * t - length))
    assert a.warnings == [] and not a.failed


def test_start_station_carries_through():
    pts = chain([90, 135], [400, 400])
    a = build_alignment(pts, [300], start_station=12000)
    t = 300 * math.tan(math.radians(22.5))
    assert float(a.bends[0].geometry.ts) == pytest.approx(12000 + 400 - t)
    assert a.bends[0].pi_station == pytest.approx(12000 + 400)


def test_overlapping_bends_fail():
    pts = chain([0, 60, 0], [1000, 300, 1000])
    a = build_alignment(pts, [400, 400])
    # T = 400 tan 30 = 230.9 m each: 461.9 m of tangents on a 300 m leg (hand arithmetic)
    assert a.failed
    kinds = [k for _, k, _ in a.warnings]
    assert OVERLAP in kinds
    assert a.tangents[1] == pytest.approx(300 - 2 * 400 * math.tan(math.radians(30)))


def test_short_reverse_tangent_warns():
    pts = chain([0, 30, 0], [1000, 300, 1000])
    a = build_alignment(pts, [500, 500])  # tangent 300 - 268 = 32 m < 60 m
    assert [k for _, k, _ in a.warnings] == [SHORT_REVERSE]
    assert not a.failed


def test_spiralled_reverse_curves_may_meet():
    pts = chain([0, 30, 0], [1000, 600, 1000])
    a = build_alignment(pts, [500, 500], [60, 60])
    assert SHORT_REVERSE not in [k for _, k, _ in a.warnings]
    t = float(spiral_curve(500, math.radians(30), 60).tangent_in)
    assert a.tangents[1] == pytest.approx(600 - 2 * t)


def test_broken_back_warns():
    pts = chain([0, 20, 40], [1000, 400, 1000])
    a = build_alignment(pts, [600, 600])  # both right, tangent 400 - 2 x 105.8 = 188 m
    assert a.warnings == []
    a = build_alignment(pts, [600, 600], broken_back_tangent_min=200)
    assert [k for _, k, _ in a.warnings] == [BROKEN_BACK]


@pytest.mark.parametrize(
    "pts, radii, fragment",
    [
        ([(0, 0), (0, 1)], [], "at least one PI"),
        (chain([0, 30], [100, 100]), [300, 300], "need 1 radii"),
        (chain([0, 0], [100, 100]), [300], "in line"),
        ([(0, 0), (0, 0), (1, 1)], [300], "coincide"),
    ],
)
def test_bad_chains_are_refused(pts, radii, fragment):
    with pytest.raises(AlignmentError, match=fragment):
        build_alignment(pts, radii)


def test_overlapping_spirals_at_a_pi_are_refused():
    with pytest.raises(AlignmentError, match="PI 1: spirals overlap"):
        build_alignment(chain([0, 5], [1000, 1000]), [400], [90])
