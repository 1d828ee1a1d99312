"""storage.curve_register: the register saved as CSV (formula-like text neutralised as
batch output does, OWASP "CSV Injection") or Parquet (typed columns), the old file kept.

Sources: the formula rule is OWASP's "CSV Injection" page (common practice, no standard);
the numbers' text (300.0 written as 300) is the register's own display rule;
no engineering value is checked here (the curves written are invented rows)."""

from __future__ import annotations

import csv
import io

import pyarrow.parquet as pq

from curvetui.storage.curve_register import csv_bytes, write_register

COLUMNS = ["id", "feature", "radius", "speed", "note"]
ROWS = [
    {"id": "=HYPERLINK(1)-1", "feature": "=HYPERLINK(1)", "radius": 300.00049, "speed": None,
     "note": "-5"},
    {"id": "B-1", "feature": "B", "radius": 150.0, "speed": 60.0, "note": "+SUM(A1)"},
]  # fmt: skip


def test_csv_neutralises_formulas_and_rounds():
    rows = list(csv.reader(io.StringIO(csv_bytes(COLUMNS, ROWS).decode())))
    assert rows[0] == COLUMNS
    assert rows[1] == ["'=HYPERLINK(1)-1", "'=HYPERLINK(1)", "300", "", "-5"]
    assert rows[2] == ["B-1", "B", "150", "60", "'+SUM(A1)"]


def test_parquet_typed_and_old_file_kept(tmp_path):
    path = tmp_path / "register.parquet"
    path.write_bytes(b"old")
    write_register(str(path), COLUMNS, ROWS)
    table = pq.read_table(path)
    assert str(table.schema.field("radius").type) == "double"
    assert str(table.schema.field("note").type) == "string"
    assert table.column("radius").to_pylist() == [300.0, 150.0]
    assert table.column("speed").to_pylist() == [None, 60.0]
    assert table.column("feature").to_pylist() == ["=HYPERLINK(1)", "B"]
    assert (tmp_path / "register.parquet.bak").read_bytes() == b"old"
