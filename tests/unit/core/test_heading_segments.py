"""The heading diagram cut into straight pieces and grouped into bends.

Check values: headings written out from their definition (flat on a tangent, slope 1/R
on an arc; exact, no engine code). Source: the definition of curvature as the rate of
change of heading, d(theta)/ds = 1/R (plane geometry, derived here; no published table).
"""

from __future__ import annotations

import numpy as np
import pytest

from curvetui.core.heading_segments import bends_in, partition


def diagram(pieces, step=1.0):
    """Stations and headings of consecutive pieces (length [m], curvature [1/m])."""
    s, h = [0.0], [0.0]
    for length, kappa in pieces:
        for _ in range(int(round(length / step))):
            s.append(s[-1] + step)
            h.append(h[-1] + kappa * step)
    return np.array(s), np.array(h)


def test_partition_finds_the_breaks_of_straight_pieces():
    s, h = diagram([(100, 0.0), (80, 1 / 200), (100, 0.0)])
    cuts = partition(s, h, penalty=1e-6)
    assert [b for _, b in cuts[:-1]] == [pytest.approx(100, abs=1), pytest.approx(181, abs=1)]


def test_bends_parted_by_a_tangent_or_a_change_of_sense():
    s, h = diagram(
        [(60, 0), (50, 1 / 100), (40, 0), (50, 1 / 150), (0, 0), (70, -1 / 300), (60, 0)]
    )
    bends = bends_in(s, h, noise=0.0, span=3, max_radius=10_000.0)
    assert [b[2] for b in bends] == [1, 1, -1]
    assert [(s[b[0]], s[b[1]]) for b in bends] == [
        (pytest.approx(60, abs=2), pytest.approx(110, abs=2)),
        (pytest.approx(150, abs=2), pytest.approx(200, abs=2)),
        (pytest.approx(200, abs=2), pytest.approx(270, abs=2)),
    ]
    ((_, _, slope),) = bends[0][3]
    assert slope == pytest.approx(1 / 100, rel=1e-6)


def test_compound_pieces_stay_one_bend():
    s, h = diagram([(50, 0), (60, 1 / 400), (60, 1 / 120), (50, 0)])
    (bend,) = bends_in(s, h, noise=0.0, span=3, max_radius=10_000.0)
    assert sorted(p[2] for p in bend[3]) == [pytest.approx(1 / 400), pytest.approx(1 / 120)]


def test_flat_wobble_below_the_noise_is_no_bend():
    rng = np.random.default_rng(2)
    s = np.arange(0.0, 400.0)
    h = rng.normal(0, 0.002, s.size)
    assert bends_in(s, h, noise=0.002, span=1, max_radius=10_000.0) == []
