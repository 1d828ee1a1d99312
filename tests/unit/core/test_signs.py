"""curvetui.core.signs: row choice by the speed difference, Turn vs Curve (MUTCD 2009
Table 2C-5 columns, read; Turn at 30 mph or less, read, TxDOT).

Sources of the check values: the column edges 5, 10, 15, 20, 25+ mph and "required from
10 mph, chevrons from 15 mph" on the roads 2C.06 names (MUTCD 2009, read; REFERENCES.md
"Existing curves"); the rest of the table body, the plaque entries and the 5 mph column
are FROM MEMORY, as the shipped data file marks them; km/h differences converted with
1 mph = 1.609344 km/h exactly (international mile)."""

from __future__ import annotations

import numpy as np

from curvetui.core.signs import select_signs
from curvetui.core.units import KMH, MPH
from curvetui.storage.sign_tables import sign_table


def test_rows_by_difference_and_sign_word():
    t = sign_table()
    posted = np.array([55, 55, 55, 55, 40, np.nan]) * MPH
    adv = np.array([50, 52, 35, 25, 45, 30]) * MPH
    out = select_signs(t, posted, adv)
    assert list(out["row"]) == [0, -1, 3, 4, -1, -1]  # 5, 3 (none), 20, 30 (25+), -5, none
    assert list(out["sign"]) == ["Curve", "Curve", "Curve", "Turn", "Curve", "Turn"]
    assert out["warning_sign"][1] == "not required" and out["warning_sign"][4] == "not required"
    assert out["warning_sign"][5] is None  # no posted speed: no choice
    assert out["sign"][2] == "Curve"  # 35 mph > 30


def test_turn_at_exactly_30_and_metric_difference():
    t = sign_table()
    out = select_signs(t, np.array([100 * KMH]), np.array([80 * KMH]))
    # 20 km/h = 12.4 mph: the 10 mph column; 80 km/h = 49.7 mph: Curve
    assert int(out["row"][0]) == 1 and out["sign"][0] == "Curve"
    out = select_signs(t, np.array([40 * MPH]), np.array([30 * MPH]))
    assert out["sign"][0] == "Turn" and int(out["row"][0]) == 1
