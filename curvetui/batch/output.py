"""The rows a run writes: the output schema, malformed rows as error rows, one chunk checked."""

from __future__ import annotations

import io
from dataclasses import dataclass

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc
import pyarrow.csv as pcsv

from curvetui.batch import columns as cols
from curvetui.batch.chunk import MESSAGE_ITEM, BatchContext, evaluate_chunk
from curvetui.batch.formulas import neutralise
from curvetui.batch.header import Header
from curvetui.batch.summary import (
    Tally,
    add_tally,
    bad_row_message,
    row_cells,
    tally_bad_rows,
    tally_error_row,
    tally_rows,
)

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
    """Rows not checked (a field count other than the header's, or not UTF-8), as error
    rows."""
    width = len(header.names)
    cells, rows, messages = [], [], []
    for number, actual, text in bad:
        cells.append(row_cells(text, header.delimiter))
        rows.append(number)
        messages.append(bad_row_message(number, actual, width))
    return error_rows_table(cells, rows, messages, width, schema)


def error_rows_table(
    cells: list[list[str]], rows: list[int], messages: list[str], width: int, schema: pa.Schema
) -> pa.Table:
    """Rows written as read with status ``error``, their row and message, no results."""
    cells = [(list(c) + [""] * width)[:width] for c in cells]
    arrays = [pa.array([c[i] for c in cells], pa.string()) for i in range(width)]
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
    keep_formulas: bool = False  # write cells that would run as formulas verbatim


@dataclass
class Part(Tally):
    """One chunk's output (CSV bytes, or a table for the app) and its share of the summary."""

    table: pa.Table | None = None
    data: bytes | None = None


def process_chunk(job: Job, batch: pa.RecordBatch, rows: np.ndarray, bad, places=None) -> Part:
    """Check one chunk and build its output rows (in row order, malformed rows included);
    ``places``: each row's place in a register's series (curvetui.batch.series), if any.

    One row must never cost the others their results: should the chunk's check raise (a
    defect: every input the generator of benchmarks/robustness.py finds is refused with a
    message), the chunk is checked again in halves, down to the row at fault, which is
    written as an error row naming its row."""
    width = len(job.header.names)
    part = Part()
    tables = _checked_tables(job, batch, rows, part, places)
    if bad:
        bad_table = bad_rows_table(bad, job.header, job.schema)
        if not job.want_bytes:
            bad_table = _with_items(job, bad_table)
        tables.append(bad_table)
        tally_bad_rows(part, bad, job.header)
    if not tables:
        tbl = job.schema.empty_table()
    elif len(tables) == 1:
        tbl = tables[0]
    else:
        tbl = pa.concat_tables(tables)
        row_at = width + cols.result_names(list(job.header.names)).index("row")
        tbl = tbl.take(pc.sort_indices(tbl.column(row_at)))
    if job.want_bytes:
        if not job.keep_formulas:
            tbl = neutralise(tbl)
        options = pcsv.WriteOptions(
            include_header=False, delimiter=job.header.delimiter, quoting_style="needed"
        )
        buf = io.BytesIO()
        pcsv.write_csv(tbl, buf, options)
        part.data = buf.getvalue()
    else:
        part.table = tbl
    return part


def _checked_tables(
    job: Job, batch: pa.RecordBatch, rows: np.ndarray, part: Part, places=None
) -> list:
    """The chunk's rows checked, as output tables in row order (empty list for none)."""
    if not batch.num_rows:
        return []
    try:
        return [_checked_table(job, batch, rows, part, places)]
    except Exception as exc:  # noqa: BLE001 - a defect; the rows at fault are found below
        if batch.num_rows > 1:
            half = batch.num_rows // 2
            head, tail = (None, None) if places is None else (places[:half], places[half:])
            return _checked_tables(job, batch.slice(0, half), rows[:half], part, head) + (
                _checked_tables(job, batch.slice(half), rows[half:], part, tail)
            )
        return [_unchecked_row(job, batch, int(rows[0]), exc, part)]


def _checked_table(
    job: Job, batch: pa.RecordBatch, rows: np.ndarray, part: Part, places=None
) -> pa.Table:
    header, schema = job.header, job.schema
    width = len(header.names)
    cells = {key: batch.column(pos) for key, pos in header.known.items()}
    more = {} if places is None else {"series": places}  # a register's places, if any
    result = evaluate_chunk(cells, rows, job.ctx, items=not job.want_bytes, **more)
    arrays = [batch.column(i) for i in range(width)]
    arrays += [result.columns[name] for name in cols.result_names(list(header.names))]
    tbl = pa.Table.from_arrays(arrays, schema=schema)
    if not job.want_bytes:  # the reader gets each row's messages as a list too
        tbl = tbl.append_column(MESSAGE_ITEMS, result.items)
    own = Tally()  # counted apart, so a chunk that raises half-way counts nothing twice
    tally_rows(own, result, rows, batch, header.known.get("id"))
    add_tally(part, own)
    return tbl


def _unchecked_row(job: Job, batch: pa.RecordBatch, number: int, exc: Exception, part: Part):
    """The one row whose check raised, written as read with an error naming its row."""
    width = len(job.header.names)
    cells = [batch.column(i)[0].as_py() or "" for i in range(width)]
    text = (
        f"ERROR row {number}: this row could not be checked (internal error: "
        f"{type(exc).__name__}); please report it with the row"
    )
    tbl = error_rows_table([cells], [number], [text], width, job.schema)
    if not job.want_bytes:
        tbl = _with_items(job, tbl)
    id_pos = job.header.known.get("id")
    tally_error_row(part, number, "" if id_pos is None else str(cells[id_pos]).strip(), text)
    return tbl


def _with_items(job: Job, tbl: pa.Table) -> pa.Table:
    """An error table with the messages column the app reads, one error item per row."""
    at = len(job.header.names) + cols.result_names(list(job.header.names)).index("messages")
    lines = tbl.column(at).to_pylist()
    return tbl.append_column(
        MESSAGE_ITEMS,
        pa.array([[{"severity": "error", "line": m}] for m in lines], pa.list_(MESSAGE_ITEM)),
    )
