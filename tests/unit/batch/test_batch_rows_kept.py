"""One bad row never costs the other rows their results (issue 14: "one bad row stops a
batch").

The rows issue 14 names (a deflection of 1e-320 degrees with a spiral, a station of
1e306, a radius of half the lane width in the sight check) are refused row by row with
their row and column, and the rows around them are checked and written. Should a row's
check still raise (a defect), the chunk is checked again in halves: the test makes the
check raise for one id and sees every other row written with its result.

Expectations are the row numbers and column names written in; Green Book 2018 Table 3-7
(from memory): R_min at 80 km/h and e_max 8 % is 229 m, so 400 m passes and 100 m fails.
"""

from __future__ import annotations

import csv
import io

import numpy as np
import pytest

from curvetui.batch import output
from curvetui.batch.stream import batch_bytes
from curvetui.core.units import METRIC
from curvetui.storage.tables import rail_limits, road_table

HEADER = "id,kind,speed,radius,deflection,spiral,pi_station,obstruction_offset,lane_width,cant\n"
ROWS = [
    "ok-1,road,80,400,,,,,,",
    "tiny,road,80,400,1e-320,60,,,,",
    "far,road,80,400,20,,1e306,,,",
    "lane,road,30,1.8,,,,3,3.6,",
    "tiny-rail,rail,80,400,5e-324,60,,,,50",
    "fails,road,80,100,,,,,,",
    "ok-2,rail,100,1500,,,,,,80",
]


def _run(text: str, **kw):
    data, summary = batch_bytes(
        text, METRIC, road_table(None, "metric"), rail_limits(None, "metric"), **kw
    )
    return list(csv.DictReader(io.StringIO(data.decode("utf-8")))), summary


@pytest.mark.parametrize("workers", [1, 2])
def test_named_hostile_rows_are_errors_and_the_rest_are_checked(workers):
    rows, summary = _run(HEADER + "\n".join(ROWS) + "\n", workers=workers, block_size=128)
    assert [r["id"] for r in rows] == [line.split(",")[0] for line in ROWS]
    assert [r["row"] for r in rows] == [str(i) for i in range(2, 9)]
    got = {r["id"]: (r["status"], r["messages"]) for r in rows}
    assert got["ok-1"][0] == "pass" and got["ok-2"][0] == "pass" and got["fails"][0] == "fail"
    assert got["tiny"] == (
        "error",
        "ERROR row 3, column deflection: must be a number from 1e-300 to 179 degrees, got 1e-320",
    )
    assert got["far"][1].startswith("ERROR row 4, column pi_station: must be a number from")
    assert got["lane"][1].startswith("ERROR row 5, column lane_width: must be less than twice")
    assert got["tiny-rail"][1].startswith("ERROR row 6, column deflection:")
    assert (summary.rows, summary.passed, summary.failed, summary.errors) == (7, 2, 1, 4)


def test_a_row_whose_check_raises_is_an_error_row_and_nothing_else_is_lost(monkeypatch):
    real = output.evaluate_chunk

    def flaky(cells, rows, ctx, items=False):
        if "boom" in cells["id"].to_pylist():
            raise FloatingPointError("planted")
        return real(cells, rows, ctx, items)

    monkeypatch.setattr(output, "evaluate_chunk", flaky)
    lines = [f"B{i},road,80,{400 if i % 3 else 100},,,,,," for i in range(40)]
    lines.insert(17, "boom,road,80,400,,,,,,")
    lines.insert(30, "too,few")  # a malformed row as well, kept in its place
    rows, summary = _run(HEADER + "\n".join(lines) + "\n", workers=2, block_size=256)
    assert [r["id"] for r in rows] == [line.split(",")[0] for line in lines]
    assert [int(r["row"]) for r in rows] == list(range(2, 44))
    boom = rows[17]
    assert boom["status"] == "error" and boom["row"] == "19"
    assert boom["messages"].startswith("ERROR row 19: this row could not be checked")
    assert "FloatingPointError" in boom["messages"]
    checked = [r for r in rows if r["id"].startswith("B")]
    assert len(checked) == 40 and {r["status"] for r in checked} == {"pass", "fail"}
    assert np.sum([r["status"] == "fail" for r in checked]) == 14  # i % 3 == 0, i < 40
    assert summary.rows == 42 and summary.errors == 2
    assert any(e.row == 19 for e in summary.first_errors)
