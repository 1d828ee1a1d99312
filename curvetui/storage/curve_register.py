"""Writing the curve register (``curvetui find-curves``): CSV, or Parquet when the name
ends ``.parquet``, saved atomically with the previous file kept as NAME.bak
(storage.files.atomic_binary).

CSV text cells a spreadsheet would run as formulas (a feature id or a kept property
starting with =, +, -, @) get a leading apostrophe, as batch output does
(batch.formulas.neutral_text). Parquet columns are typed: numbers as float64, the rest as
text (a kept property's values as text unless every one is a number or blank)."""

from __future__ import annotations

import csv
import io
import math

from curvetui.finder.register import DECIMALS, TEXT, cell_text
from curvetui.storage.files import atomic_binary


def csv_bytes(columns: list[str], rows: list[dict[str, object]]) -> bytes:
    """The register as CSV (UTF-8, a header row, CRLF-free line ends)."""
    from curvetui.batch.formulas import neutral_text

    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    writer.writerow([neutral_text(c) for c in columns])
    for row in rows:
        cells = []
        for name in columns:
            value = row.get(name)
            text = cell_text(name, value)
            cells.append(neutral_text(text) if isinstance(value, str) else text)
        writer.writerow(cells)
    return buf.getvalue().encode("utf-8")


def _column(name: str, values: list[object]):
    import pyarrow as pa

    def rounded(v):
        if v is None or isinstance(v, bool) or not isinstance(v, (int, float)):
            return None
        x = float(v)
        if not math.isfinite(x):
            return None
        return round(x, DECIMALS[name]) if name in DECIMALS else x

    numeric = name not in TEXT and all(
        v is None or (isinstance(v, (int, float)) and not isinstance(v, bool)) for v in values
    )
    if numeric:
        return pa.array([rounded(v) for v in values], type=pa.float64())
    return pa.array([None if v is None else cell_text(name, v) for v in values], pa.string())


def parquet_bytes(columns: list[str], rows: list[dict[str, object]]) -> bytes:
    """The register as a Parquet file's bytes (pyarrow)."""
    import pyarrow as pa
    import pyarrow.parquet as pq

    table = pa.table({name: _column(name, [r.get(name) for r in rows]) for name in columns})
    sink = pa.BufferOutputStream()
    pq.write_table(table, sink)
    return sink.getvalue().to_pybytes()


def write_register(path: str, columns: list[str], rows: list[dict[str, object]]) -> None:
    """Save the register at ``path`` (Parquet for .parquet, else CSV), keeping NAME.bak."""
    data = (
        parquet_bytes(columns, rows)
        if path.lower().endswith(".parquet")
        else csv_bytes(columns, rows)
    )
    with atomic_binary(path, backup=True) as fh:
        fh.write(data)
