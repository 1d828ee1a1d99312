"""curvetui.core.advisory: band matching, edges, rounding, table edges (hand values).

Sources of the check values: V = sqrt(15 R (e + f)) (mph, ft) and the speed-banded side
friction f 0.15 at 35 mph and above, 0.18 for 20-35 mph (TxDOT, read; REFERENCES.md
"Existing curves"); f 0.21 below 20 mph FROM MEMORY (the stored text is garbled); advisory
speeds in multiples of 5 mph (MUTCD 2009, read), rounded DOWN to the safe side (common
practice, no source); f_max of AASHTO Green Book 2018 Table 3-7 (read) for the inferred
design speed. Every expected number is the hand arithmetic written beside it."""

from __future__ import annotations

import math

import numpy as np
import pytest

from curvetui.core.advisory import (
    ABOVE_TABLE,
    BELOW_TABLE,
    ROW,
    advisory_speed,
    inferred_design_speed,
    round_speed,
)
from curvetui.core.units import FOOT, KMH, MPH

K_US = 15 * MPH**2 / FOOT
BANDS = np.array([0.0, 20.0, 35.0]) * MPH
F = np.array([0.21, 0.18, 0.15])


def test_gap_between_bands_is_capped_at_the_edge():
    # R where f 0.15 gives under 35 mph but f 0.18 over 35: e = 0, R = 35^2 / (15 x 0.165)
    # = 494.9 ft: 0.15 -> sqrt(15 x 494.9 x 0.15) = 33.5; 0.18 -> 36.7 mph. Every speed below
    # 35 meets f 0.18 and 35 itself fails 0.15: the edge, not attained, so 30 mph.
    r = 35**2 / (15 * 0.165)
    v, band, capped = advisory_speed(np.array([r * FOOT]), np.array([0.0]), BANDS, F, K_US)
    assert float(v[0] / MPH) == pytest.approx(35.0)
    assert int(band[0]) == 1 and bool(capped[0])
    assert round_speed(v / MPH, 5.0, capped)[0] == 30.0


def test_exactly_on_band_edge_uses_upper_band():
    # e = 0, R = 35^2 / (15 x 0.15) = 544.4 ft: f 0.15 gives exactly 35 mph, in its band
    r = 35**2 / (15 * 0.15)
    v, band, capped = advisory_speed(np.array([r * FOOT]), np.array([0.0]), BANDS, F, K_US)
    assert float(v[0] / MPH) == pytest.approx(35.0) and int(band[0]) == 2
    assert not bool(capped[0])
    assert round_speed(v / MPH, 5.0, capped)[0] == 35.0


def test_low_speed_band_and_no_speed():
    # R 50 ft, e 2 %: 0.18 -> sqrt(15 x 50 x 0.20) = 12.2 < 20; 0.21 -> sqrt(172.5) = 13.13
    v, band, _ = advisory_speed(
        np.array([50 * FOOT, 50 * FOOT]), np.array([0.02, -0.5]), BANDS, F, K_US
    )
    assert float(v[0] / MPH) == pytest.approx(math.sqrt(15 * 50 * 0.23))
    assert int(band[0]) == 0
    assert math.isnan(v[1]) and int(band[1]) == -1  # e + f < 0 in every band


def test_metric_rounding_step():
    # 63.4 km/h -> 60 down (10 km/h step), 60 nearest; 65 nearest with a 5 km/h step
    assert round_speed(np.array([63.4]), 10.0)[0] == 60.0
    assert round_speed(np.array([63.4]), 5.0)[0] == 60.0
    assert round_speed(np.array([65.0]), 10.0, mode="nearest")[0] == 70.0
    assert np.isnan(round_speed(np.array([np.nan]), 5.0)[0])
    with pytest.raises(ValueError):
        round_speed(1.0, 5.0, mode="up")
    # a metric advisory: R 200 m, e 5 %, f 0.15 (over 35 mph = 56.3 km/h):
    # V = sqrt(127 x 200 x 0.20) = 71.27 km/h -> 70 km/h
    v, band, c = advisory_speed(np.array([200.0]), np.array([0.05]), BANDS, F, 127 * KMH**2)
    assert float(v[0] / KMH) == pytest.approx(math.sqrt(127 * 200 * 0.20))
    assert round_speed(v / KMH, 10.0, c)[0] == 70.0


SPEEDS = np.array([30.0, 40.0, 50.0]) * MPH
FMAX = np.array([0.20, 0.16, 0.14])


def test_inferred_above_below_and_on_row():
    # R 10000 ft, e 2 %: at 50 mph f = 2500 / 150000 - 0.02 = -0.003: meets the top row
    # R 50 ft, e 0: at 30 mph f = 900 / 750 = 1.2 > 0.20: fails the lowest row
    # exactly on the 40 mph row: R = 1600 / (15 x (0.16 + 0.04)) = 533.33 ft, e 4 %
    r = np.array([10000.0, 50.0, 1600 / (15 * 0.20)]) * FOOT
    v, kind, row = inferred_design_speed(r, np.array([0.02, 0.0, 0.04]), SPEEDS, FMAX, K_US)
    assert int(kind[0]) == ABOVE_TABLE and float(v[0] / MPH) == pytest.approx(50.0)
    assert int(kind[1]) == BELOW_TABLE and math.isnan(v[1]) and math.isnan(row[1])
    assert int(kind[2]) == ROW and float(v[2] / MPH) == pytest.approx(40.0)
