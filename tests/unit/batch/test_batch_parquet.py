"""Parquet in and out of a batch run (issue 16, item 4), against the CSV path of the same
rows: the CSV output itself is compared with `check` in test_batch.py. Ids and places are
invented.
"""

from __future__ import annotations

import csv
import io
import math

import pyarrow as pa
import pyarrow.parquet as pq
import pytest

from curvetui import CAUTION
from curvetui.batch import columns as cols
from curvetui.batch.header import BatchFileError
from curvetui.batch.stream import run_batch
from curvetui.cli import main
from curvetui.core.units import METRIC
from curvetui.storage.tables import rail_limits, road_table

TEXT = (
    "id,kind,speed,radius,cant,deflection,note\n"
    'QV-01,road,100,700,,24.5,"Harrow Lane, east"\n'
    "QV-04,road,80,150,,,\n"
    "QS-01,rail,120,800,100,,\n"
    'QS-03,rail,160,500,40,31,say ""slow""\n'
    "QV-09,road,fast,300,,,\n"
)
SETTINGS = (METRIC, road_table(None), rail_limits(None))


def csv_rows(path) -> list[dict]:
    with open(path, encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(fh))


def same(cell: str, value) -> bool:
    """A CSV cell and a Parquet value are the same result."""
    if value is None:
        return cell == ""
    if isinstance(value, float):
        return cell != "" and (float(cell) == value or (math.isnan(value) and cell == "nan"))
    return cell == str(value)


@pytest.mark.parametrize("columns", [cols.DEFAULT, cols.ALL])
def test_parquet_out_holds_the_csv_outputs_values_as_numbers(tmp_path, columns):
    src = tmp_path / "register.csv"
    src.write_text(TEXT, encoding="utf-8")
    with open(tmp_path / "out.csv", "wb") as sink:
        run_batch(src, sink, *SETTINGS, columns=columns)
    with open(tmp_path / "out.parquet", "wb") as sink:
        run_batch(src, sink, *SETTINGS, columns=columns, parquet_out=True)
    table = pq.read_table(tmp_path / "out.parquet")
    rows = csv_rows(tmp_path / "out.csv")
    assert table.column_names == list(rows[0]) and table.num_rows == len(rows) == 5
    for name in table.column_names:
        for cell, value in zip(
            [r[name] for r in rows], table.column(name).to_pylist(), strict=True
        ):
            assert same(cell, value), (name, cell, value)
    types = dict(zip(table.column_names, table.schema.types, strict=True))
    assert types["min_radius"] == pa.float64() and types["row"] == pa.int64()
    assert types["speed"] == pa.string()  # input columns as read
    meta = table.schema.metadata
    assert meta[b"curvetui.units"] == b"metric"
    assert meta[b"curvetui.table"] == b"aashto-2018-metric"
    assert meta[b"curvetui.limits"] == b"en13803-2010"
    assert meta[b"curvetui.caution"].decode() == CAUTION


def test_parquet_in_with_number_and_text_columns_matches_the_csv(tmp_path):
    """Numbers as numbers or as text; rows numbered as in CSV (first data row is row 2)."""
    src = tmp_path / "register.csv"
    src.write_text(TEXT, encoding="utf-8")
    rows = list(csv.DictReader(io.StringIO(TEXT)))
    radius = [float(r["radius"]) for r in rows]  # a number column
    cant = [float(r["cant"]) if r["cant"] else None for r in rows]  # numbers with nulls
    table = pa.table(
        {
            "id": [r["id"] for r in rows],
            "kind": [r["kind"] for r in rows],
            "speed": [r["speed"] for r in rows],  # text, one cell not a number
            "radius": pa.array(radius, pa.float64()),
            "cant": pa.array(cant, pa.float64()),
            "deflection": [r["deflection"] for r in rows],
            "note": [r["note"] for r in rows],
        }
    )
    pq.write_table(table, tmp_path / "register.parquet")
    with open(tmp_path / "from-csv.csv", "wb") as sink:
        run_batch(src, sink, *SETTINGS, columns=cols.DEFAULT)
    with open(tmp_path / "from-parquet.csv", "wb") as sink:
        summary = run_batch(tmp_path / "register.parquet", sink, *SETTINGS, columns=cols.DEFAULT)
    want, got = csv_rows(tmp_path / "from-csv.csv"), csv_rows(tmp_path / "from-parquet.csv")
    skip = {"radius", "cant"}  # 700.0 written back as pyarrow writes it: "700"
    for a, b in zip(want, got, strict=True):
        assert {k: v for k, v in a.items() if k not in skip} == {
            k: v for k, v in b.items() if k not in skip
        }
    assert [r["row"] for r in got] == ["2", "3", "4", "5", "6"]
    assert "ERROR row 6, column speed" in got[4]["findings"]
    assert (summary.rows, summary.errors) == (5, 1)


@pytest.mark.parametrize(
    "cells",
    [
        pa.array([[1, 2]]),  # a list: nested
        pa.array([{"a": 1}]),  # a struct: nested
        pa.array([b"\xff"], pa.binary()),  # bytes that are not UTF-8
    ],
)
def test_a_parquet_column_that_is_not_text_or_numbers_is_refused_by_name(tmp_path, cells):
    table = pa.table({"kind": ["road"], "speed": [80.0], "radius": [300.0], "bends": cells})
    pq.write_table(table, tmp_path / "odd.parquet")
    with pytest.raises(BatchFileError, match="column 'bends'"):
        run_batch(tmp_path / "odd.parquet", io.BytesIO(), *SETTINGS, columns=cols.DEFAULT)


def test_cli_parquet_out_keeps_the_previous_file_when_the_input_is_unusable(tmp_path, capsys):
    src = tmp_path / "register.csv"
    src.write_text(TEXT, encoding="utf-8")
    dest = tmp_path / "checked.parquet"
    assert main(["batch", str(src), "-o", str(dest)]) == 1  # a row fails, one is an error
    before = dest.read_bytes()
    assert pq.read_table(dest).column("status").to_pylist()[-1] == "error"
    (tmp_path / "bad.csv").write_text("id,speed\nQV-1,80\n", encoding="utf-8")
    assert main(["batch", str(tmp_path / "bad.csv"), "-o", str(dest)]) == 2
    assert dest.read_bytes() == before
    assert not list(tmp_path.glob(".checked.parquet.*"))  # no temporary file left
    capsys.readouterr()
    pq.write_table(pq.read_table(dest).select(["id", "kind", "speed", "radius", "cant"]),
                   tmp_path / "again.parquet")  # fmt: skip
    assert main(["batch", str(tmp_path / "again.parquet")]) == 1  # beside it, as Parquet
    assert pq.read_table(tmp_path / "again.checked.parquet").num_rows == 5
