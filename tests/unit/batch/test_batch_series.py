"""Batch: a register's curves in series, end to end (Reverse / Winding Road signs).

Check values: less than 600 ft of tangent joins two curves (REFERENCES.md "Existing
curves": MUTCD 2009, read, secondary); Reverse for two curves turning opposite ways,
Winding Road for three or more (MUTCD 2009 2C.07, FROM MEMORY); Turn form at an advisory
speed of 30 mph or less (read, TxDOT). The advisory speeds are the REFERENCES.md worked
values (derived): R 300 ft, e 4 % -> 30 mph (Turn); R 500 ft, e 6 % ->
sqrt(15 x 500 x 0.21) = 39.69 mph, 35 mph rounded down as the shipped table rounds (Curve).
Road names are invented.
"""

from __future__ import annotations

import csv
import io

import pytest

from curvetui.batch.stream import batch_bytes
from curvetui.core.units import US
from curvetui.storage.tables import rail_limits, road_table

HEAD = "id,kind,feature,begin_station,end_station,direction,radius,speed,superelevation,"
HEAD += "posted_speed"
TURN = "300,30,4,55"  # advisory 30 mph: Turn
CURVE = "500,40,6,55"  # advisory 35 mph: Curve
LINES = [
    f"QM-1,road,Quillmere Rd,0,300,left,{TURN}",
    f"QM-2,road,Quillmere Rd,899.99,1200,right,{CURVE}",  # 599.99 ft after QM-1
    f"QM-3,road,Quillmere Rd,1800,2000,left,{CURVE}",  # exactly 600 ft after QM-2
    f"QM-4,road,Quillmere Rd,2600.01,2700,right,{CURVE}",  # 600.01 ft after QM-3
    f"HB-1,road,Harrowby Ln,0,200,right,{CURVE}",  # a new feature
    f"HB-2,road,Harrowby Ln,300,500,left,{TURN}",
    f"HB-3,road,Harrowby Ln,7+00,9+00,right,{CURVE}",  # stations written 7+00
    f"HB-4,road,Harrowby Ln,1600,1700,right,{CURVE}",
    f"HB-5,road,Harrowby Ln,1800,1900,left,{CURVE}",
    f"HB-6,road,Harrowby Ln,1850,2100,right,{CURVE}",  # begins before HB-5 ends
    f"HB-7,road,Harrowby Ln,3000,3100,up,{CURVE}",  # no direction
    f"HB-8,road,Harrowby Ln,3200,3300,left,{CURVE}",
    f"HB-9,road,Harrowby Ln,3400,3500,left,{CURVE}",
]
EXPECTED = {
    "QM-1": "Reverse Turn",  # the first curve's advisory: 30 mph
    "QM-2": "in series",
    "QM-3": "single",
    "QM-4": "single",
    "HB-1": "Winding Road",
    "HB-2": "in series",
    "HB-3": "in series",
    "HB-4": "Reverse Curve",  # 700 ft after HB-3, 100 ft before HB-5 (advisory 35 mph)
    "HB-5": "in series",  # HB-6 is out of order: it neither joins nor ends the pair
    "HB-6": "",  # reported, not placed
    "HB-7": "",
    "HB-8": "same direction",
    "HB-9": "same direction",
}


def _rows(text: str, **kw) -> list[dict]:
    data, _ = batch_bytes(text, US, road_table(None, "us"), rail_limits(None, "us"), **kw)
    return list(csv.DictReader(io.StringIO(data.decode("utf-8"))))


def test_register_places_and_signs():
    rows = _rows(HEAD + "\n" + "\n".join(LINES) + "\n")
    assert {r["id"]: r["signs.series"] for r in rows} == EXPECTED
    by_id = {r["id"]: r for r in rows}
    assert by_id["QM-1"]["signs.sign"] == "Turn" and by_id["QM-1"]["advisory.speed"] == "30"
    assert "signs: WARNING" not in by_id["HB-5"]["messages"]
    assert "signs: WARNING begins before the previous curve" in by_id["HB-6"]["messages"]
    assert "signs: NOTE not placed in a series" in by_id["HB-7"]["messages"]
    # a placed curve's note says how it was placed, not that one bend cannot tell
    assert "with the curve's neighbours" in by_id["QM-2"]["messages"]
    assert "one bend alone does not say" not in by_id["QM-2"]["messages"]
    assert "one bend alone does not say" in by_id["HB-6"]["messages"]


def test_reverse_curve_form_from_the_first_curve():
    lines = [f"A-1,road,A,0,300,left,{CURVE}", f"A-2,road,A,400,700,right,{TURN}"]
    rows = _rows(HEAD + "\n" + "\n".join(lines) + "\n")
    assert [r["signs.series"] for r in rows] == ["Reverse Curve", "in series"]


@pytest.mark.parametrize(("block_size", "workers"), [(100, 1), (128, 2), (200, 2), (333, 1)])
def test_chunk_boundaries_do_not_change_the_answer(block_size, workers):
    text = HEAD + "\n" + "\n".join(LINES) + "\n"
    rows = _rows(text, block_size=block_size, workers=workers)
    assert [r["id"] for r in rows] == [line.split(",")[0] for line in LINES]
    assert {r["id"]: r["signs.series"] for r in rows} == EXPECTED


def test_malformed_and_blank_rows_keep_their_places():
    lines = [*LINES[:2], "", "too,few", *LINES[2:]]
    rows = _rows(HEAD + "\n" + "\n".join(lines) + "\n", block_size=128, workers=2)
    assert [r["id"] for r in rows][:4] == ["QM-1", "QM-2", "too", "QM-3"]
    got = {r["id"]: r["signs.series"] for r in rows if r["id"] != "too"}
    assert got == EXPECTED


def test_without_register_columns_no_series_column():
    rows = _rows("id,kind,radius,speed,superelevation,posted_speed\nX,road," + TURN + "\n")
    assert "signs.series" not in rows[0] and rows[0]["signs.sign"] == "Turn"


def test_without_direction_column_every_curve_is_noted():
    text = "id,kind,begin_station,end_station,radius,speed,superelevation,posted_speed\n"
    text += f"A,road,0,100,{TURN}\nB,road,150,300,{TURN}\n"
    rows = _rows(text)
    assert [r["signs.series"] for r in rows] == ["", ""]
    assert all("not placed in a series" in r["messages"] for r in rows)


def test_rail_rows_and_error_rows():
    text = HEAD + ",cant\n"
    text += f"R-1,road,F,0,100,left,{TURN},\n"
    text += "R-2,rail,F,150,300,right,800,80,,,100\n"  # a rail curve: no signs, breaks
    text += f"R-3,road,F,350,400,left,{TURN},\n"
    text += "R-4,road,F,450,500,right,-3,30,4,55,\n"  # a bad radius: an error row
    rows = _rows(text)
    got = [(r["id"], r["status"], r["signs.series"]) for r in rows]
    assert got[0][0::2] == ("R-1", "single") and got[1][2] == ""
    assert got[2][2] == "Reverse Turn" and got[3][1:] == ("error", "")


def test_a_feature_coming_back_is_reported():
    lines = [
        f"A-1,road,A,0,300,left,{TURN}",
        f"B-1,road,B,0,300,left,{TURN}",
        f"A-2,road,A,400,700,right,{TURN}",  # A again: not grouped by feature
        f"A-3,road,A,800,900,left,{TURN}",
    ]
    for block_size in (120, 1 << 20):
        rows = _rows(HEAD + "\n" + "\n".join(lines) + "\n", block_size=block_size)
        got = {r["id"]: r["signs.series"] for r in rows}
        # are not joined across B; still make a pair
        assert got == {"A-1": "single", "B-1": "single", "A-2": "Reverse Turn", "A-3": "in series"}
        warned = [r["id"] for r in rows if "not grouped by feature" in r["messages"]]
        assert warned == ["A-2"]
