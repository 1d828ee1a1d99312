"""Road tables: look-up, interpolation, look-up kinds, radius rounding, table data.

Data values are checked against their sources (named beside each check). Look-up rules that
are the engine's own documented choice (linear extension of the end segments outside the
table) are marked as such: no published source.
"""

from __future__ import annotations

import numpy as np
import pytest

from curvetui.core.road_table import (
    ABOVE_TABLE,
    BELOW_TABLE,
    INTERPOLATED,
    ROW,
    RadiusRounding,
)
from curvetui.core.units import FOOT, KMH, MPH
from curvetui.storage.tables import TableError, parse_road_table, road_table

# --- look-up and kinds ------------------------------------------------------------------


def test_lookup_on_rows_returns_row_values(us):
    """On a row the value is the row's: 55 mph -> 0.13, 70 mph -> 0.10 (Highway Engineering
    Handbook Table 2.6, adapted from AASHTO 2004, read)."""
    f, kind = us.f_max(np.array([55.0, 70.0]) * MPH)
    np.testing.assert_allclose(f, [0.13, 0.10], rtol=0, atol=1e-12)
    assert list(kind) == [ROW, ROW]


def test_lookup_between_rows_interpolates_linearly(us, metric):
    """Between rows: linear interpolation (common practice, no source).
    62.5 mph: (0.12 + 0.11)/2 = 0.115; 52 mph: 0.14 + 0.4 x (0.13 - 0.14) = 0.136;
    85 km/h: (0.14 + 0.13)/2 = 0.135."""
    f, kind = us.f_max(np.array([62.5, 52.0]) * MPH)
    np.testing.assert_allclose(f, [0.115, 0.136], rtol=0, atol=1e-12)
    assert list(kind) == [INTERPOLATED, INTERPOLATED]
    f, kind = metric.f_max(85 * KMH)
    assert float(f) == pytest.approx(0.135, abs=1e-12)
    assert int(kind) == INTERPOLATED


def test_lookup_outside_the_table_gives_no_value(us):
    """Never extrapolated past the first or last row (issue 13): Green Book 2018 Table 3-7
    runs from 10 to 80 mph, so 5 and 90 mph have no f_max."""
    f, kind = us.f_max(np.array([5.0, 90.0]) * MPH)
    assert np.isnan(f).all()
    assert list(kind) == [BELOW_TABLE, ABOVE_TABLE]


def test_lookup_is_elementwise_over_arrays(metric):
    v = np.array([[20.0, 25.0], [130.0, 131.0]]) * KMH
    f, kind = metric.f_max(v)
    assert f.shape == (2, 2) and kind.shape == (2, 2)
    np.testing.assert_array_equal(kind, [[ROW, INTERPOLATED], [ROW, ABOVE_TABLE]])
    # 25 km/h: (0.35 + 0.28)/2 = 0.315 (linear interpolation, common practice, no source)
    assert f[0, 1] == pytest.approx(0.315, abs=1e-12)


def test_running_speed_100_kmh_is_85(metric):
    """Average running speed for 100 km/h design speed: 85 km/h (read: a design sheet
    citing Green Book 2004 Exhibit 3-14)."""
    assert float(metric.running_speed_si(100 * KMH)) / KMH == pytest.approx(85.0, abs=1e-9)


# --- table data against sources ---------------------------------------------------------


def test_point_mass_constants_in_si(us, metric):
    """Green Book Eq. 3-8 constants 127 (km/h, m) and 15 (mph, ft) in SI:
    127 / 3.6^2 = 9.79938 m/s^2; 15 x 0.44704^2 / 0.3048 = 2.9976714 / 0.3048 = 9.83488 m/s^2
    (by hand)."""
    assert metric.k_si == pytest.approx(127 / 3.6**2, rel=1e-15)
    assert metric.k_si == pytest.approx(9.79938, abs=1e-5)
    assert us.k_si == pytest.approx(9.83488, abs=1e-5)


def test_relative_gradient_100_kmh(metric):
    """Maximum relative gradient, 100 km/h: 0.44 % (read: AASHTO 2004 Exhibit 3-30 via a
    design sheet)."""
    g, _ = metric.lookup(metric.relative_gradient, 100 * KMH)
    assert float(g) == pytest.approx(0.0044, abs=1e-12)


# Iowa DOT Design Manual superelevation tables (read), e_max 6 %, 12 ft lane:
# speed mph -> [(e %, runoff L ft, runout x ft), ...]
IOWA_RUNOFF = {
    45: [(4.0, 133, 67), (4.2, 140, 67), (4.4, 147, 67)],
    50: [(4.4, 158, 72), (4.6, 166, 72), (4.8, 173, 72)],
    55: [(5.0, 192, 77), (5.2, 199, 77), (5.4, 207, 77)],
}


@pytest.mark.parametrize("speed", sorted(IOWA_RUNOFF))
def test_relative_gradients_reproduce_iowa_runoff_lengths(speed, us):
    """Runoff L = 1.5 x 12 ft x e / relative gradient, runout x = L x 2 % / e (Iowa DOT
    tables, relation derived) with the table's gradient (0.54 / 0.50 / 0.47 % at 45 / 50 /
    55 mph, derived from those tables).

    Tolerance 1 ft rather than Iowa's whole-foot rounding (0.5 ft): at 55 mph, e 5.0 %,
    0.47 % gives 191.49 ft where Iowa prints 192 ft, which fits a slope of 1:213 (0.4695 %;
    the Green Book lists gradients with such slope equivalents, from memory). Every other
    length here is within 0.5 ft.
    """
    g, kind = us.lookup(us.relative_gradient, speed * MPH)
    assert int(kind) == ROW
    for e_pct, runoff, runout in IOWA_RUNOFF[speed]:
        length = 1.5 * 12.0 * (e_pct / 100) / float(g)
        assert abs(length - runoff) <= 1.0, (speed, e_pct, length)
        assert abs(length * 2.0 / e_pct - runout) <= 0.5, (speed, e_pct)


def test_every_row_names_a_source(us, metric):
    for table in (us, metric):
        assert len(table.row_sources) == len(table.speeds)
        assert all(s.strip() for s in table.row_sources)


def test_tabulated_emax(us, metric):
    """Green Book Table 3-7 and the distribution tables: e_max 4, 6, 8, 10, 12 %."""
    for table in (us, metric):
        np.testing.assert_allclose(table.emax_tabulated, [0.04, 0.06, 0.08, 0.10, 0.12])


# --- rounding ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "value, printed",
    [
        # Green Book Table 3-7 style (whole units below 1000, else 3 significant figures);
        # the raw values are Eq. 3-10 worked by hand, the printed ones the table's rounding
        (41.667, 42),  # US e_max 4 %, 15 mph: 225 / (15 x 0.36)
        (925.93, 926),  # US e_max 4 %, 50 mph: 2500 / (15 x 0.18)
        (1186.27, 1190),  # US e_max 4 %, 55 mph: 3025 / (15 x 0.17)
        (1814.81, 1810),  # US e_max 8 %, 70 mph (1814.8 ft read, secondary)
        (3555.56, 3560),  # US e_max 4 %, 80 mph
        (999.6, 1000),  # below 1000, rounds to the whole unit 1000
        (12345.0, 12300),  # 3 significant figures in any decade
        (7.682, 8),  # metric e_max 6 %, 20 km/h
    ],
)
def test_radius_rounding_like_table_3_7(value, printed):
    assert float(RadiusRounding().apply(value)) == pytest.approx(printed, abs=1e-9)


# Printed tables round exact ties half up (common practice, no source), not half-to-even.
@pytest.mark.parametrize("value, printed", [(38.5, 39), (36.5, 37), (1185.0, 1190)])
def test_radius_rounding_ties_half_up(value, printed):
    assert float(RadiusRounding().apply(value)) == pytest.approx(printed, abs=1e-9)


def test_round_radius_si_works_in_table_units(us, metric):
    """US: 1186.27 ft prints as 1190 ft (returned in m); metric: 393.70 m as 394 m."""
    assert float(us.round_radius_si(1186.27 * FOOT)) / FOOT == pytest.approx(1190, abs=1e-9)
    assert float(metric.round_radius_si(393.7008)) == pytest.approx(394, abs=1e-12)
    r = np.array([41.667, 1186.27]) * FOOT
    np.testing.assert_allclose(us.round_radius_si(r) / FOOT, [42, 1190], atol=1e-9)


# --- table files ------------------------------------------------------------------------


def _minimal(**head):
    table = {
        "name": "t",
        "units": "metric",
        "source": "invented for a unit test",
        "point_mass_constant": 127,
        "distribution": "linear",
        "emax": {"min": 4, "max": 12, "default": 8},
    }
    table.update(head)
    rows = [
        {"speed": 50, "side_friction_max": 0.2, "relative_gradient": 0.6, "source": "x"},
        {"speed": 60, "side_friction_max": 0.18, "relative_gradient": 0.5, "source": "x"},
    ]
    return {"table": table, "rows": rows}


def test_parse_minimal_table():
    t = parse_road_table(_minimal())
    assert t.distribution == "linear"
    assert t.emax_default == pytest.approx(0.08)
    np.testing.assert_allclose(t.relative_gradient, [0.006, 0.005])


def test_parse_rejects_bad_tables():
    with pytest.raises(TableError, match="units"):
        parse_road_table(_minimal(units="imperial"))
    with pytest.raises(TableError, match="distribution"):
        parse_road_table(_minimal(distribution="cubic"))
    data = _minimal()
    del data["rows"][1]["source"]
    with pytest.raises(TableError, match="source"):
        parse_road_table(data)
    data = _minimal()
    data["rows"][1]["speed"] = 40
    with pytest.raises(TableError, match="rise"):
        parse_road_table(data)


def test_unknown_table_name():
    with pytest.raises(TableError, match="unknown road table"):
        road_table("no-such-table")
