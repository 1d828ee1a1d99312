"""Bytes that are not UTF-8 cost their own row, never the file (issue 14: one bad row must
not stop a batch).

Expected verdicts: 80 km/h on R 400 m at e_max 8 % passes, since R_min = 80^2 / (127 x
(0.08 + 0.14)) = 229.1 m with f_max 0.14 at 80 km/h (AASHTO Green Book 2018 Table 3-7).
"""

from __future__ import annotations

import csv
import io

import pytest

from curvetui.batch.stream import batch_bytes
from curvetui.core.units import METRIC
from curvetui.storage.tables import rail_limits, road_table


def _run(data: bytes, **kw):
    out, summary = batch_bytes(data, METRIC, road_table(None), rail_limits(None), **kw)
    rows = list(csv.DictReader(io.StringIO(out.decode("utf-8"))))
    return rows, summary


def test_a_row_with_bytes_not_utf8_is_an_error_row_and_the_rest_are_checked():
    data = (
        b"id,kind,speed,radius\n"
        b"A\xc3\xa9,road,80,400\n"  # valid UTF-8: e with an acute accent
        b"B\xff,road,80,400\n"  # a byte that is never UTF-8
        b"C,road,80,400\n"
        b"D,road,80,400\xe2"  # a sequence cut short at the end of the file
    )
    rows, summary = _run(data)
    assert [r["row"] for r in rows] == ["2", "3", "4", "5"]
    assert [r["status"] for r in rows] == ["pass", "error", "pass", "error"]
    assert rows[0]["id"] == "A\u00e9"
    assert rows[1]["id"] == "B?" and "row 3: not UTF-8" in rows[1]["messages"]
    assert rows[3]["radius"] == "400?"
    assert (summary.rows, summary.errors) == (4, 2)


@pytest.mark.parametrize("block", [24, 29, 64])  # pyarrow needs the header in one block
def test_multibyte_characters_split_across_reads_stay_whole(block):
    """A character of 2 to 4 bytes split over the reader's blocks is not taken for bytes
    that are not UTF-8."""
    names = ["\u00e9t\u00e9", "\u20ac1", "\U0001f6a7x", "\u4e2d\u6587"]
    lines = ["id,kind,speed,radius"] + [f"{n},road,80,400" for n in names]
    rows, _ = _run("\n".join(lines).encode("utf-8"), block_size=block)
    assert [r["id"] for r in rows] == names
    assert {r["status"] for r in rows} == {"pass"}


@pytest.mark.parametrize("size", [1, 2, 3, 5])
def test_reads_of_any_size_return_valid_text_unchanged(size):
    """The reader's own stream, read a few bytes at a time: UTF-8 comes out byte for byte,
    each byte that is not UTF-8 as one SUB (sizes kept)."""
    from curvetui.batch.stream import _Counting

    good = "\u00e9\u20ac\U0001f6a7\u4e2d,a\n".encode() * 3
    for data, want in ((good, good), (b"a\xffb\xe2\x82", b"a\x1ab\x1a\x1a")):
        stream = _Counting(io.BytesIO(data))
        got = b""
        while chunk := stream.read(size):
            assert len(chunk) <= size
            got += chunk
        assert got == want
        assert stream.replaced == (data != want)


# pytest turns what Python would print as "Exception ignored" into this warning: an error here
@pytest.mark.filterwarnings("error::pytest.PytestUnraisableExceptionWarning")
def test_a_malformed_row_not_utf8_prints_no_traceback_in_the_survey(tmp_path, capfd):
    """Found by benchmarks/robustness.py: a row with too many fields holding bytes that are
    not UTF-8 made pyarrow's call of the kinds survey's row handler fail, and Python printed
    "Exception ignored ... Traceback" on the terminal (the check itself already kept it
    quiet). The survey now gives both kinds, as for any file it cannot read."""
    from curvetui.cli import main

    src = tmp_path / "bends.csv"
    src.write_bytes(
        b"id,kind,speed,radius\n"
        b"A,road,80,400\n"
        b"B,road,80,400,\xed\xb2\x80,extra\n"  # too many fields, and not UTF-8
        b"C,road,80,400\n"
    )
    code = main(["batch", str(src), "-o", str(tmp_path / "out.csv")])
    err = capfd.readouterr().err
    assert "Traceback" not in err and "Exception ignored" not in err, err
    assert code == 1  # the malformed row is an error row; the others pass
    with open(tmp_path / "out.csv", encoding="utf-8", newline="") as fh:
        rows = list(csv.DictReader(fh))
    assert [(r["row"], r["status"]) for r in rows] == [("2", "pass"), ("3", "error"), ("4", "pass")]
