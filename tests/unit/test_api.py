"""The Python API: scalars, arrays and tables through the one bend path."""

from __future__ import annotations

import numpy as np
import pyarrow as pa
import pytest

from curvetui.api import check_bends, check_rail, check_road, check_table


def test_road_scalar_matches_green_book_table_3_7():
    # AASHTO Green Book 2018 Table 3-7: 100 km/h, e_max 8 %, f_max 0.12 -> R_min 393.7 m
    # (394 m as printed); 400 m passes
    r = check_road(speed=100, radius=400, emax=8)
    assert r["status"][0] == "pass"
    assert r["min_radius"][0] == pytest.approx(100**2 / (127 * 0.20), rel=1e-12)
    assert r["min_radius_rounded"][0] == 394


def test_arrays_give_each_row_its_own_result_and_bad_rows_are_errors():
    # Table 3-7 (metric, e_max 8 %): 50 km/h f 0.19 -> 73.7 m; 80 km/h f 0.14 -> 229.1 m
    r = check_road(speed=np.array([50.0, 80.0, 80.0]), radius=np.array([80.0, 200.0, -5.0]), emax=8)
    assert list(r["checks.radius"]) == ["pass", "fail", None]
    assert list(r["status"][1:]) == ["fail", "error"]
    assert r["min_radius"][0] == pytest.approx(50**2 / (127 * 0.27), rel=1e-12)
    assert r["min_radius"][1] == pytest.approx(80**2 / (127 * 0.22), rel=1e-12)
    assert np.isnan(r["min_radius"][2])
    assert "ERROR radius: must be a number from 1 to 100000 m, got -5" in r["messages"][2]


def test_rail_us_matches_49_cfr_213_57():
    # 49 CFR 213.57(b): Ea = 0.0007 D V^2 - Eu; 2 degree curve (arc), 60 mph, 3 in applied:
    # 0.0007 x 2 x 3600 = 5.04 in equilibrium, 2.04 in unbalance (computed by hand)
    r = check_rail(units="us", speed=60, radius=5729.5779513 / 2, cant=3)
    assert r["equilibrium_cant"][0] == pytest.approx(5.04, abs=0.005)
    assert r["cant_deficiency"][0] == pytest.approx(2.04, abs=0.005)


def test_check_table_adds_result_columns_to_a_pyarrow_table():
    tbl = pa.table(
        {
            "ID": ["a", "b", "c"],
            "Kind": ["road", "rail", "road"],
            "speed": [100.0, 120.0, None],
            "radius": [400.0, 1000.0, 300.0],
            "cant": [None, 100.0, None],
            "status": ["old", "old", "old"],
        }
    )
    out = check_table(tbl)
    assert out.column_names[:6] == tbl.column_names
    assert out.column("check.status").to_pylist() == ["pass", "pass", "error"]
    assert out.column("status").to_pylist() == ["old", "old", "old"]  # input kept
    # rail, 120 km/h, R 1000 m: E = 11.8 V^2 / R = 169.9 mm (EN 13803 form, s = 1500 mm)
    assert out.column("equilibrium_cant").to_pylist()[1] == pytest.approx(169.9, abs=0.1)
    assert "ERROR speed: required" in out.column("messages").to_pylist()[2]


def test_check_table_on_a_pandas_frame():
    pd = pytest.importorskip("pandas")
    df = pd.DataFrame({"kind": ["road"], "speed": [100], "radius": [400], "emax": [8]})
    out = check_table(df)
    assert list(out["status"]) == ["pass"] and len(df.columns) == 4


def test_check_bends_with_a_kind_column():
    inputs = {"speed": [100, 120], "radius": [400, 1000], "cant": [None, 100]}
    r = check_bends(["road", "rail"], inputs)
    assert list(r["status"]) == ["pass", "pass"]
