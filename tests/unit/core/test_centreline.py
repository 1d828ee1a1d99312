"""Centreline cleaning, resampling, smoothing, headings and curvature.

Check values: analytic circles and straight lines (plane trigonometry: a chord of a circle
is parallel to the tangent at its middle, so the chord's bearing is the tangent's there;
a circle's curvature is 1/R everywhere), and for the noise estimate the variance of a
vertex's offset from its neighbours' chord, 1.5 sigma^2 for independent Gaussian errors of
sd sigma on equally spaced vertices (derived: d = e_1 - (e_0 + e_2)/2 across the chord).
Source: plane geometry and the variance of a sum of independent errors, derived here (no
published table gives these values).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from curvetui.core.centreline import (
    CentrelineError,
    clean_vertices,
    prepare_centreline,
    resample,
    smooth_points,
    vertex_noise,
)


def test_clean_vertices_drops_repeats_and_counts_them():
    x, y, dropped = clean_vertices([0, 0, 1, 1, 1, 2], [0, 0, 0, 0, 0, 1])
    assert x.tolist() == [0, 1, 2] and y.tolist() == [0, 0, 1]
    assert dropped == 3


@pytest.mark.parametrize(
    ("x", "y", "says"),
    [
        ([0, 1, float("nan")], [0, 0, 0], "vertex 3 (of 3)"),
        ([0, 0], [3, 3], "zero length"),
        ([0], [0], "fewer than two"),
        ([0, 1, 2], [0, 1], "3 x but 2 y"),
    ],
)
def test_clean_vertices_refuses_with_the_reason(x, y, says):
    with pytest.raises(CentrelineError, match=re_escape(says)):
        clean_vertices(x, y)


def re_escape(text):
    import re

    return re.escape(text)


def test_resample_is_even_and_on_the_polyline():
    vx = np.array([0.0, 10.0, 10.0])
    vy = np.array([0.0, 0.0, 7.5])
    stations = np.array([0.0, 10.0, 17.5])
    s, x, y = resample(vx, vy, stations, 2.0)
    steps = np.diff(s)
    assert steps == pytest.approx(np.full(steps.size, 17.5 / 9))  # 9 steps nearest 2 m
    on_first = s <= 10.0
    assert np.allclose(y[on_first], 0.0) and np.allclose(x[on_first], s[on_first])
    assert np.allclose(x[~on_first], 10.0) and np.allclose(y[~on_first], s[~on_first] - 10.0)


def test_smoothing_keeps_a_straight_line_straight_to_its_ends():
    v = 3.0 + 0.7 * np.arange(50.0)
    assert smooth_points(v, 4.0) == pytest.approx(v)


def test_headings_and_curvature_of_a_circle():
    r = 80.0
    a = np.linspace(0.0, 1.5, 300)  # counter-clockwise: a left turn
    line = prepare_centreline(r * np.cos(a), r * np.sin(a), 0.5)
    inner = slice(10, -10)
    # the heading at each resampled point: its angle round the centre plus 90 degrees
    phi = np.arctan2(line.y, line.x)
    assert line.heading[inner] == pytest.approx(phi[inner] + math.pi / 2, abs=1e-4)
    assert line.curvature[inner] == pytest.approx(
        np.full(line.curvature[inner].size, 1 / r), rel=1e-3
    )
    assert line.length == pytest.approx(r * 1.5, rel=1e-4)


def test_a_right_turn_has_negative_curvature():
    a = np.linspace(0.0, 1.0, 200)
    line = prepare_centreline(50 * np.sin(a), -50 * (1 - np.cos(a)), 1.0)
    assert np.all(line.curvature[5:-5] < 0)


@pytest.mark.parametrize("sigma", [0.1, 0.5])
def test_vertex_noise_estimate(sigma):
    rng = np.random.default_rng(7)
    s = np.arange(0.0, 3000.0, 2.0)
    x = s + rng.normal(0, sigma, s.size)
    y = rng.normal(0, sigma, s.size)
    assert vertex_noise(x, y) == pytest.approx(sigma, rel=0.1)
    assert vertex_noise(s, 0 * s) == 0.0


def test_stations_map_between_original_and_smoothed_lengths():
    rng = np.random.default_rng(3)
    s = np.arange(0.0, 500.0, 1.0)
    line = prepare_centreline(s + rng.normal(0, 0.3, s.size), rng.normal(0, 0.3, s.size), 1.0)
    # the noisy polyline zigzags: its length runs ahead of the smoothed one
    assert line.length > line.arc[-1]
    assert line.arc[-1] == pytest.approx(499.0, rel=0.01)
    back = line.to_station(line.to_arc([100.0, 250.0]))
    assert back == pytest.approx([100.0, 250.0])
    assert line.smoothing > 0 and line.noise == pytest.approx(0.3, rel=0.15)
