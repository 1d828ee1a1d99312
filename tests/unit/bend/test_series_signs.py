"""curvetui.bend.series_signs: places in a series to words and notes, on an evaluation.

The Turn form at an advisory speed of 30 mph or less (read, TxDOT); the advisory speeds are
the REFERENCES.md worked values (derived): R 300 ft, e 4 % -> 30 mph; R 500 ft, e 6 % ->
sqrt(15 x 500 x 0.21) = 39.69 mph, 35 mph rounded down as the shipped table rounds (Curve).
Reverse/Winding names as the shipped sign table gives them (MUTCD 2009 2C.07, from memory).
"""

from __future__ import annotations

import numpy as np

from curvetui.bend import evaluate as ev_mod
from curvetui.bend.series_signs import series_signs
from curvetui.bend.service import check_columns, columns_from_values
from curvetui.core import curve_series as cs
from curvetui.core.units import US
from curvetui.storage.tables import rail_limits, road_table


def _evaluate(radii, es, posted):
    n = len(radii)
    values = {"speed": [30] * n, "radius": radii, "superelevation": es, "posted_speed": posted}
    cols = columns_from_values(values, US)
    return check_columns(["road"] * n, cols, US, road_table(None, "us"), rail_limits(None, "us"))


def test_words_by_place_and_advisory_speed():
    ev = _evaluate([300, 500, 300, 500, 300, 500, 300, 300], [4, 6] * 4, [55] * 8)
    places = np.array(
        [cs.REVERSE, cs.REVERSE, cs.WINDING, cs.IN_SERIES, cs.SINGLE, cs.SAME_DIRECTION,
         cs.OUT_OF_ORDER, cs.NOT_PLACED],
        np.int8,
    )  # fmt: skip
    assert list(ev.values["advisory.speed"][:2]) == [30, 35]
    series_signs(ev, places)
    assert list(ev.texts["signs.series"]) == [
        "Reverse Turn",
        "Reverse Curve",
        "Winding Road",
        "in series",
        "single",
        "same direction",
        None,
        None,
    ]
    f = ev.bend_flags
    assert all(f[:6] & ev_mod.SIGNS_SERIES) and not any(f[:6] & ev_mod.SIGNS_SINGLE_BEND)
    assert f[6] & ev_mod.SERIES_OUT_OF_ORDER and f[6] & ev_mod.SIGNS_SINGLE_BEND
    assert f[7] & ev_mod.SERIES_NOT_PLACED and not f[7] & ev_mod.SIGNS_SERIES


def test_without_posted_speed_place_but_no_sign_note():
    ev = _evaluate([300], [4], [None])
    series_signs(ev, np.array([cs.REVERSE], np.int8))
    assert ev.texts["signs.series"][0] == "Reverse Turn"
    assert not ev.bend_flags[0] & (ev_mod.SIGNS_SERIES | ev_mod.SIGNS_SINGLE_BEND)


def test_error_rows_are_left_alone():
    ev = _evaluate([-3], [4], [55])
    assert ev.status[0] == ev_mod.ERROR
    series_signs(ev, np.array([cs.REVERSE], np.int8))
    assert ev.texts["signs.series"][0] is None and ev.bend_flags[0] == 0


def test_feature_again_is_a_warning_beside_the_place():
    ev = _evaluate([300], [4], [55])
    series_signs(ev, np.array([cs.REVERSE | cs.FEATURE_AGAIN], np.int8))
    assert ev.texts["signs.series"][0] == "Reverse Turn"
    assert ev.bend_flags[0] & ev_mod.SERIES_FEATURE_AGAIN
