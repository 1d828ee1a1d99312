"""The rows a run writes: the output schema, malformed rows as error rows, one chunk checked."""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc
import pyarrow.csv as pcsv

from curvetui.batch import columns as cols
from curvetui.batch.chunk import MESSAGE_ITEM, BatchContext, evaluate_chunk
from curvetui.batch.header import Header
from curvetui.batch.summary import Tally, tally_bad_rows, tally_rows

MESSAGE_ITEMS = "__messages__"  # the extra column ``on_table`` readers get (never written)


def output_schema(header: Header) -> pa.Schema:
    """The written columns: every input column as text, then the result columns."""
    types = {cols.FLOAT: pa.float64(), cols.INT: pa.int64(), cols.TEXT: pa.string()}
    out_names = cols.output_names(list(header.names))
    fields = [pa.field(name, pa.string()) for name in header.names]
    fields += [
        pa.field(name, types[kind])
        for name, (_, kind) in zip(out_names, cols.results_for(list(header.names)), strict=True)
    ]
    return pa.schema(fields)


def bad_rows_table(bad: list[tuple[int, int, str]], header: Header, schema: pa.Schema) -> pa.Table:
    """Rows whose field count differs from the header's, as error rows."""
    width = len(header.names)
    data: dict[str, list] = {f"c{i}": [] for i in range(width)}
    rows, messages = [], []
    for number, actual, text in bad:
        fields = next(csv.reader([text], delimiter=header.delimiter), [])
        fields = (fields + [""] * width)[:width]
        for i in range(width):
            data[f"c{i}"].append(fields[i])
        rows.append(number)
        messages.append(
            f"ERROR row {number}: {actual} field{'s' if actual != 1 else ''} where the header "
            f"has {width}; row not checked (a separator or quote out of place?)"
        )
    arrays = [pa.array(data[f"c{i}"], pa.string()) for i in range(width)]
    n = len(rows)
    for fld in list(schema)[width:]:
        base = fld.name.removeprefix("check.") if fld.name.startswith("check.") else fld.name
        if base == "row" and fld.type == pa.int64():
            arrays.append(pa.array(rows, pa.int64()))
        elif base == "status" and fld.type == pa.string():
            arrays.append(pa.array(["error"] * n, pa.string()))
        elif base == "messages" and fld.type == pa.string():
            arrays.append(pa.array(messages, pa.string()))
        else:
            arrays.append(pa.nulls(n, fld.type))
    return pa.Table.from_arrays(arrays, schema=schema)


@dataclass
class Job:
    """What every chunk of one file needs."""

    header: Header
    schema: pa.Schema
    ctx: BatchContext
    want_bytes: bool


@dataclass
class Part(Tally):
    """One chunk's output (CSV bytes, or a table for the app) and its share of the summary."""

    table: pa.Table | None = None
    data: bytes | None = None


def process_chunk(job: Job, batch: pa.RecordBatch, rows: np.ndarray, bad) -> Part:
    """Check one chunk and build its output rows (in row order, malformed rows included)."""
    header, schema = job.header, job.schema
    width = len(header.names)
    id_pos = header.known.get("id")
    part = Part()
    tables = []
    if batch.num_rows:
        cells = {key: batch.column(pos) for key, pos in header.known.items()}
        result = evaluate_chunk(cells, rows, job.ctx, items=not job.want_bytes)
        arrays = [batch.column(i) for i in range(width)]
        arrays += [result.columns[name] for name in cols.result_names(list(header.names))]
        tbl = pa.Table.from_arrays(arrays, schema=schema)
        if not job.want_bytes:  # the reader gets each row's messages as a list too
            tbl = tbl.append_column(MESSAGE_ITEMS, result.items)
        tables.append(tbl)
        tally_rows(part, result, rows, batch, id_pos)
    if bad:
        bad_table = bad_rows_table(bad, header, schema)
        if not job.want_bytes:
            at = width + cols.result_names(list(header.names)).index("messages")
            lines = bad_table.column(at).to_pylist()
            bad_table = bad_table.append_column(
                MESSAGE_ITEMS,
                pa.array(
                    [[{"severity": "error", "line": m}] for m in lines], pa.list_(MESSAGE_ITEM)
                ),
            )
        tables.append(bad_table)
        tally_bad_rows(part, bad, header)
    if not tables:
        tbl = schema.empty_table()
    elif len(tables) == 1:
        tbl = tables[0]
    else:
        tbl = pa.concat_tables(tables)
        row_at = width + cols.result_names(list(header.names)).index("row")
        tbl = tbl.take(pc.sort_indices(tbl.column(row_at)))
    if job.want_bytes:
        options = pcsv.WriteOptions(
            include_header=False, delimiter=header.delimiter, quoting_style="needed"
        )
        buf = io.BytesIO()
        pcsv.write_csv(tbl, buf, options)
        part.data = buf.getvalue()
    else:
        part.table = tbl
    return part
