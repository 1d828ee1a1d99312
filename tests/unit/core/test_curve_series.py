"""curvetui.core.curve_series: curves in series by the tangents between them.

The check values: curve-direction signs for two changes of direction separated by less
than 600 ft of tangent (REFERENCES.md "Existing curves": MUTCD 2009, read, secondary);
Reverse for two curves, Winding Road for three or more (MUTCD 2009 2C.07, FROM MEMORY;
driver-education pages read agree, secondary). 600 ft = 182.88 m exactly (1 ft = 0.3048 m,
international foot). The same-direction pair is the project's choice (no source).
Stations below are written in feet and converted exactly, as a US register would be.
"""

from __future__ import annotations

import numpy as np
from hypothesis import example, given, settings
from hypothesis import strategies as st

from curvetui.core.curve_series import (
    ENDS_BEFORE_BEGIN,
    IN_SERIES,
    LEFT,
    NOT_PLACED,
    OUT_OF_ORDER,
    REVERSE,
    RIGHT,
    SAME_DIRECTION,
    SINGLE,
    WINDING,
    SeriesScanner,
    series_places,
)
from curvetui.core.units import FOOT

LIMIT = 600 * FOOT  # 182.88 m


def places(curves_ft, features=None):
    """Places of curves given as (begin ft, end ft, direction)."""
    b = np.array([c[0] for c in curves_ft], float) * FOOT
    e = np.array([c[1] for c in curves_ft], float) * FOOT
    d = np.array([c[2] for c in curves_ft], float)
    f = np.zeros(len(b), int) if features is None else np.asarray(features)
    return series_places(f, b, e, d, LIMIT).tolist()


def test_limit_is_600_ft_exactly():
    assert LIMIT == 182.88


def test_tangent_exactly_600_ft_does_not_join():
    # 'less than 600 ft': a tangent of 600 ft leaves two single curves
    assert places([(0, 1000, LEFT), (1600, 2400, RIGHT)]) == [SINGLE, SINGLE]


def test_tangent_just_under_600_ft_makes_a_reverse_pair():
    assert places([(0, 1000, LEFT), (1599.99, 2400, RIGHT)]) == [REVERSE, IN_SERIES]


def test_tangent_just_over_600_ft_does_not_join():
    assert places([(0, 1000, LEFT), (1600.01, 2400, RIGHT)]) == [SINGLE, SINGLE]


def test_metric_stations_at_the_limit():
    # the same rule with stations in metres: 182.88 m apart is at the limit
    b, e = np.array([0.0, 282.88]), np.array([100.0, 400.0])
    assert series_places([1, 1], b, e, [LEFT, RIGHT], LIMIT).tolist() == [SINGLE, SINGLE]
    b[1] = 282.87
    assert series_places([1, 1], b, e, [LEFT, RIGHT], LIMIT).tolist() == [REVERSE, IN_SERIES]


def test_three_curves_are_winding():
    curves = [(0, 500, LEFT), (600, 900, RIGHT), (1100, 1400, LEFT)]
    assert places(curves) == [WINDING, IN_SERIES, IN_SERIES]
    # four curves: one Winding Road sign for the series
    curves.append((1500, 1800, RIGHT))
    assert places(curves) == [WINDING, IN_SERIES, IN_SERIES, IN_SERIES]


def test_three_curves_in_one_direction_are_still_three_changes():
    curves = [(0, 500, LEFT), (600, 900, LEFT), (1100, 1400, LEFT)]
    assert places(curves) == [WINDING, IN_SERIES, IN_SERIES]


def test_same_direction_pair_keeps_own_signs():
    assert places([(0, 500, RIGHT), (700, 900, RIGHT)]) == [SAME_DIRECTION, SAME_DIRECTION]


def test_long_tangent_splits_series():
    curves = [(0, 500, LEFT), (600, 900, RIGHT), (2000, 2400, LEFT), (2500, 2600, RIGHT)]
    assert places(curves) == [REVERSE, IN_SERIES, REVERSE, IN_SERIES]


def test_feature_change_breaks_a_series():
    curves = [(0, 500, LEFT), (600, 900, RIGHT), (1000, 1200, LEFT)]
    assert places(curves, ["A", "A", "B"]) == [REVERSE, IN_SERIES, SINGLE]
    assert places(curves, ["A", "B", "B"]) == [SINGLE, REVERSE, IN_SERIES]


def test_out_of_order_rows_are_reported_and_break():
    # the second curve begins before the first one ends: not in station order
    curves = [(0, 500, LEFT), (400, 900, RIGHT), (1000, 1200, LEFT)]
    assert places(curves) == [SINGLE, OUT_OF_ORDER, SINGLE]
    curves = [(0, 500, LEFT), (900, 600, RIGHT), (1000, 1200, LEFT)]
    assert places(curves) == [SINGLE, ENDS_BEFORE_BEGIN, SINGLE]


def test_touching_curves_join_and_missing_values_break():
    assert places([(0, 500, LEFT), (500, 900, RIGHT)]) == [REVERSE, IN_SERIES]
    curves = [(0, 500, LEFT), (600, np.nan, RIGHT), (700, 900, LEFT)]
    assert places(curves) == [SINGLE, NOT_PLACED, SINGLE]
    curves = [(0, 500, LEFT), (600, 650, np.nan), (700, 900, LEFT)]
    assert places(curves) == [SINGLE, NOT_PLACED, SINGLE]


def test_empty_input():
    assert series_places([], [], [], [], LIMIT).tolist() == []
    scanner = SeriesScanner(LIMIT)
    assert scanner.push([], [], [], []).tolist() == []
    assert scanner.finish().tolist() == []


def _register(draw_list):
    """Arrays from drawn (feature, gap m, length m, direction, fault) rows."""
    f, b, e, d = [], [], [], []
    at = 0.0
    for feature, gap, length, direction, fault in draw_list:
        begin = at + gap
        end = begin + length
        if fault == 1:  # a curve out of order
            begin, end = begin - 120.0, end - 120.0
        elif fault == 2:
            begin, end = end, begin
        elif fault == 3:
            end = np.nan
        f.append(feature)
        b.append(begin)
        e.append(end)
        d.append(direction)
        at = max(at, end if np.isfinite(end) else begin)
    return np.array(f), np.array(b), np.array(e), np.array(d, float)


ROW = st.tuples(
    st.sampled_from([0, 0, 0, 1]),  # feature: mostly one
    st.sampled_from([0.0, 50.0, 150.0, 182.88, 300.0]),
    st.sampled_from([20.0, 100.0]),
    st.sampled_from([LEFT, RIGHT]),
    st.sampled_from([0, 0, 0, 0, 0, 1, 2, 3]),
)


# a curve out of order three rows back decides whether the row two back starts a pair:
# the scanner must keep three rows of context (two are not enough)
_FOUND = [(0, 0.0, 100.0, LEFT, 0), (0, 50.0, 100.0, RIGHT, 1), (0, 50.0, 100.0, LEFT, 0)]
_FOUND += [(0, 50.0, 100.0, LEFT, 0), (0, 300.0, 100.0, RIGHT, 0), (0, 300.0, 20.0, LEFT, 0)]


@settings(max_examples=100, derandomize=True, deadline=None)
@given(rows=st.lists(ROW, max_size=14), cuts=st.lists(st.integers(0, 14), max_size=5))
@example(rows=_FOUND, cuts=[1, 2, 3, 4, 5])
def test_chunks_anywhere_give_the_one_call_answer(rows, cuts):
    f, b, e, d = _register(rows)
    # run numbers stand for the features chunk by chunk (as the batch passes them)
    runs = np.cumsum(np.r_[0, f[1:] != f[:-1]]) if len(f) else f
    whole = series_places(runs, b, e, d, LIMIT)
    scanner = SeriesScanner(LIMIT)
    got = []
    edges = [0, *sorted(min(c, len(f)) for c in cuts), len(f)]
    for lo, hi in zip(edges, edges[1:], strict=False):
        got += scanner.push(runs[lo:hi], b[lo:hi], e[lo:hi], d[lo:hi]).tolist()
        assert scanner.held <= 2
    got += scanner.finish().tolist()
    assert got == whole.tolist()
    assert whole.tolist() == series_places(f, b, e, d, LIMIT).tolist()
