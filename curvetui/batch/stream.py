"""Whole batch files: read in chunks, check each chunk, write it out, keep a summary.

The file is parsed with pyarrow's CSV reader (quoted fields, fields with line breaks, UTF-8
with or without a byte-order mark) in blocks of ``block_size`` bytes, so memory stays
bounded whatever the file's length. Every cell is read as text; input columns are written
back as they were read, the result columns after them.

Rows are numbered as a spreadsheet shows them: the header is row 1, so the first bend is
row 2 (blank lines count too). A row with more or fewer fields than the header is written
with status ``error`` in its place.
"""

from __future__ import annotations

import collections
import csv
import heapq
import io
import os
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path
from typing import BinaryIO

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc
import pyarrow.csv as pcsv

from curvetui.batch import columns as cols
from curvetui.batch.chunk import (
    ERROR,
    FAIL,
    MESSAGE_ITEM,
    PASS,
    BatchContext,
    evaluate_chunk,
)
from curvetui.core.rail import RailLimits
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem

MESSAGE_ITEMS = "__messages__"  # the extra column ``on_table`` readers get (never written)

HEAD_BYTES = 1 << 16
# bytes per parsed block: about 15 000 rows of a typical file; two chunks in flight on two
# threads keep a whole run near 300 MB (measured: benchmarks/batch_speed.py)
BLOCK_SIZE = 1 << 20
WORST_SHOWN = 10


class BatchFileError(Exception):
    """The file cannot be used at all (unreadable, empty, required columns missing)."""


@dataclass(frozen=True)
class Header:
    """The header row: column names as written, the separator, and where the known
    columns are (lower-case name -> position)."""

    names: tuple[str, ...]
    delimiter: str
    known: dict[str, int]

    @property
    def decimal_comma(self) -> bool:
        """A semicolon-separated file may write 12,5 for 12.5 (as many locales do)."""
        return self.delimiter == ";"


def read_header(head: bytes) -> Header:
    """The header row from the first bytes of a file; BatchFileError if it cannot be used."""
    if head.startswith(b"\xef\xbb\xbf"):
        head = head[3:]
    if not head.strip():
        raise BatchFileError(
            "the file is empty: it needs a header row naming at least the columns "
            + ", ".join(cols.REQUIRED)
        )
    end = head.find(b"\n")
    line = head if end < 0 else head[:end]
    try:
        text = line.decode("utf-8").rstrip("\r")
    except UnicodeDecodeError as exc:
        raise BatchFileError(
            f"the header row is not UTF-8 text (byte {exc.start + 1}); save the file as UTF-8"
        ) from None
    best: list[str] = []
    delimiter = ","
    for candidate in (",", ";", "\t"):
        fields = next(csv.reader([text], delimiter=candidate))
        if len(fields) > len(best):
            best, delimiter = fields, candidate
    known: dict[str, int] = {}
    for pos, name in enumerate(best):
        key = name.strip().lower()
        if key in cols.INPUTS:
            if key in known:
                raise BatchFileError(
                    f"column {key!r} appears twice in the header (columns {known[key] + 1} "
                    f"and {pos + 1}); keep one"
                )
            known[key] = pos
    missing = [c for c in cols.REQUIRED if c not in known]
    if missing:
        raise BatchFileError(
            f"required column{'s' if len(missing) > 1 else ''} missing: {', '.join(missing)} "
            f"(the header has: {', '.join(best)}); columns needed: " + ", ".join(cols.REQUIRED)
        )
    return Header(tuple(best), delimiter, known)


class _Counting(io.RawIOBase):
    """A readable stream that counts the bytes read (for the progress bar), with the
    already-read head put back in front."""

    def __init__(self, raw: BinaryIO, head: bytes = b""):
        self.raw = raw
        self.head = head
        self.count = 0

    def readable(self) -> bool:
        return True

    def read(self, size: int = -1) -> bytes:
        if self.head:
            if size < 0 or size >= len(self.head):
                data, self.head = self.head, b""
                more = self.raw.read(-1 if size < 0 else size - len(data))
                data += more or b""
            else:
                data, self.head = self.head[:size], self.head[size:]
        else:
            data = self.raw.read(size) or b""
        self.count += len(data)
        return data

    def readinto(self, buffer) -> int:  # pragma: no cover - pyarrow calls read()
        data = self.read(len(buffer))
        buffer[: len(data)] = data
        return len(data)


@dataclass
class Worst:
    """One of the worst bends: its largest demand/limit ratio, row, id, kind, first reason."""

    utilisation: float
    row: int
    id: str
    kind: str
    message: str


@dataclass
class Summary:
    """Counts and the worst bends of a run."""

    rows: int = 0
    passed: int = 0
    failed: int = 0
    errors: int = 0
    blank: int = 0  # rows with every cell empty: skipped, not bends
    worst: list[Worst] = field(default_factory=list)
    first_errors: list[Worst] = field(default_factory=list)
    delimiter: str = ","
    columns: tuple[str, ...] = ()

    @property
    def exit_code(self) -> int:
        return 0 if self.failed == 0 and self.errors == 0 else 1


Progress = Callable[[int, int | None, int], None]  # (bytes read, total bytes, rows done)


def _schema(header: Header) -> pa.Schema:
    types = {cols.FLOAT: pa.float64(), cols.INT: pa.int64(), cols.TEXT: pa.string()}
    out_names = cols.output_names(list(header.names))
    fields = [pa.field(name, pa.string()) for name in header.names]
    fields += [
        pa.field(name, types[kind])
        for name, (_, kind) in zip(out_names, cols.results_for(list(header.names)), strict=True)
    ]
    return pa.schema(fields)


def _bad_rows_table(bad: list[tuple[int, int, str]], header: Header, schema: pa.Schema) -> pa.Table:
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


class _Numbering:
    """Row numbers of the rows pyarrow delivers, given the rows it skipped (blank or with
    the wrong number of fields), which its handler reports with their numbers."""

    def __init__(self):
        self.skipped: list[int] = []  # sorted row numbers skipped so far
        self.bad: list[tuple[int, int, str]] = []  # (row, fields, text) not yet written
        self.delivered = 0

    def handler(self, row) -> str:
        number = row.number if row.number is not None else -1
        self.skipped.append(number)
        if row.text.strip():
            self.bad.append((number, row.actual_columns, row.text))
        return "skip"

    def numbers(self, count: int) -> np.ndarray:
        k = np.arange(self.delivered, self.delivered + count, dtype=np.int64)
        self.delivered += count
        if not self.skipped:
            return k + 2
        s = np.asarray(self.skipped, dtype=np.int64)
        # good rows before skipped row j: s[j] - 2 - j; row k is shifted by every skip before it
        before = s - 2 - np.arange(len(s))
        return k + 2 + np.searchsorted(before, k, side="right")


def run_batch(
    source: str | Path | BinaryIO,
    sink: BinaryIO | None,
    units: UnitSystem,
    table: RoadTable,
    limits: RailLimits,
    progress: Progress | None = None,
    on_table: Callable[[pa.Table], None] | None = None,
    block_size: int = BLOCK_SIZE,
    workers: int | None = None,
) -> Summary:
    """Check every row of ``source`` (a path or a binary stream) and write the rows with
    their results to ``sink`` as CSV (the input's separator); ``on_table`` gets each output
    chunk as a pyarrow table too. Raises BatchFileError when the file cannot be used.

    Chunks are checked on ``workers`` threads (default: one per core), each taking whole
    chunks; their output is written in the input's order."""
    if workers is None:
        workers = os.cpu_count() or 1
    if isinstance(source, str | Path):
        raw: BinaryIO = open(source, "rb")  # noqa: SIM115 - closed below
        total: int | None = os.fstat(raw.fileno()).st_size
    else:
        raw, total = source, None
    try:
        head = raw.read(HEAD_BYTES) or b""
        header = read_header(head)
        return _run(
            header,
            _Counting(raw, head),
            total,
            sink,
            units,
            table,
            limits,
            progress,
            on_table,
            block_size,
            workers,
        )
    finally:
        if isinstance(source, str | Path):
            raw.close()


def _run(
    header, stream, total, sink, units, table, limits, progress, on_table, block_size, workers
):
    width = len(header.names)
    names = [f"c{i}" for i in range(width)]
    numbering = _Numbering()
    schema = _schema(header)
    ctx = BatchContext(
        units=units,
        table=table,
        limits=limits,
        headers={key: header.names[pos].strip() for key, pos in header.known.items()},
        decimal_comma=header.decimal_comma,
    )
    try:
        reader = pcsv.open_csv(
            pa.PythonFile(stream, mode="r"),
            read_options=pcsv.ReadOptions(
                column_names=names, skip_rows=1, block_size=block_size, use_threads=False
            ),
            parse_options=pcsv.ParseOptions(
                delimiter=header.delimiter,
                newlines_in_values=True,
                ignore_empty_lines=False,
                invalid_row_handler=numbering.handler,
            ),
            convert_options=pcsv.ConvertOptions(
                column_types={name: pa.string() for name in names},
                strings_can_be_null=False,
                quoted_strings_can_be_null=False,
            ),
        )
    except pa.ArrowInvalid as exc:
        raise BatchFileError(_arrow_words(exc)) from None
    except StopIteration:  # pragma: no cover - header only, handled below
        reader = None

    summary = Summary(delimiter=header.delimiter, columns=tuple(schema.names))
    job = _Job(header, schema, ctx, want_bytes=sink is not None and on_table is None)
    options = pcsv.WriteOptions(delimiter=header.delimiter, quoting_style="needed")
    if sink is not None:
        pcsv.write_csv(schema.empty_table(), sink, options)  # the header row
    worst: list[tuple[float, int, str, str, str]] = []
    pool = None
    pending: collections.deque = collections.deque()

    def take(part: _Part) -> None:
        if part.data is not None:
            sink.write(part.data)
        if part.table is not None:
            if sink is not None:
                pcsv.write_csv(part.table, sink, _no_header(options))
            if on_table is not None:
                on_table(part.table)
        _merge(summary, part, worst)
        if progress is not None:
            progress(stream.count, total, summary.rows)

    try:
        while True:
            try:
                batch = reader.read_next_batch()
            except StopIteration:
                break
            except pa.ArrowInvalid as exc:
                raise BatchFileError(_arrow_words(exc)) from None
            rows = numbering.numbers(batch.num_rows)
            keep = _not_blank(batch, header.known["kind"])
            if keep is not None:
                summary.blank += int(np.sum(~keep))
                batch, rows = batch.filter(pa.array(keep)), rows[keep]
            bad, numbering.bad = numbering.bad, []
            if not job.want_bytes or workers < 2:
                take(_process(job, batch, rows, bad))  # in order, here (the app, one core)
                continue
            # chunks are checked on ``workers`` threads (the engine's numpy and pyarrow
            # work runs outside the GIL) and written back in the input's order
            if pool is None:
                pool = _start_pool(workers)
            pending.append(pool.submit(_process, job, batch, rows, bad))
            while len(pending) > workers + 1 or (pending and pending[0].done()):
                take(pending.popleft().result())
        while pending:
            take(pending.popleft().result())
        if numbering.bad:
            take(_process(job, _empty_batch(names), np.zeros(0, np.int64), numbering.bad))
            numbering.bad = []
    finally:
        for f in pending:
            f.cancel()
        if pool is not None:
            pool.shutdown(wait=True, cancel_futures=True)
    summary.first_errors.sort(key=lambda w: w.row)
    del summary.first_errors[WORST_SHOWN:]
    summary.worst = [
        Worst(u, r, i, k, m) for u, r, i, k, m in sorted(worst, key=lambda w: (-w[0], w[1]))
    ][:WORST_SHOWN]
    if progress is not None:
        progress(stream.count, total, summary.rows)
    return summary


def _no_header(options: pcsv.WriteOptions) -> pcsv.WriteOptions:
    return pcsv.WriteOptions(
        include_header=False, delimiter=options.delimiter, quoting_style="needed"
    )


def _empty_batch(names: list[str]) -> pa.RecordBatch:
    return pa.RecordBatch.from_arrays([pa.array([], pa.string()) for _ in names], names=names)


@dataclass
class _Job:
    """What every chunk of one file needs."""

    header: Header
    schema: pa.Schema
    ctx: BatchContext
    want_bytes: bool


@dataclass
class _Part:
    """One chunk's output (CSV bytes, or a table for the app) and its share of the summary."""

    table: pa.Table | None
    data: bytes | None
    rows: int
    passed: int
    failed: int
    errors: int
    worst: list[tuple[float, int, str, str, str]]
    first_errors: list[Worst]


def _start_pool(workers: int):
    from concurrent.futures import ThreadPoolExecutor

    return ThreadPoolExecutor(max_workers=workers, thread_name_prefix="curvetui-batch")


def _process(job: _Job, batch: pa.RecordBatch, rows: np.ndarray, bad) -> _Part:
    """Check one chunk and build its output rows (in row order, malformed rows included)."""
    header, schema = job.header, job.schema
    width = len(header.names)
    id_pos = header.known.get("id")
    part = _Part(None, None, 0, 0, 0, 0, [], [])
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
        _tally(part, result, rows, batch, id_pos)
    if bad:
        bad_table = _bad_rows_table(bad, header, schema)
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
        _tally_bad(part, bad, header)
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


def _merge(summary: Summary, part: _Part, worst: list) -> None:
    summary.rows += part.rows
    summary.passed += part.passed
    summary.failed += part.failed
    summary.errors += part.errors
    for item in part.worst:
        if len(worst) < WORST_SHOWN:
            heapq.heappush(worst, item)
        elif item[0] > worst[0][0]:
            heapq.heapreplace(worst, item)
    room = WORST_SHOWN - len(summary.first_errors)
    summary.first_errors += part.first_errors[: max(room, 0)]


def _not_blank(batch: pa.RecordBatch, kind_pos: int) -> np.ndarray | None:
    """Mask of rows with any cell filled, or None when none is blank (the usual case)."""
    empty = pc.equal(pc.utf8_trim_whitespace(batch.column(kind_pos)), "")
    if not pc.any(empty).as_py():
        return None
    blank = empty
    for column in batch.columns:
        blank = pc.and_(blank, pc.equal(pc.utf8_trim_whitespace(column), ""))
    return ~blank.to_numpy(zero_copy_only=False)


def _arrow_words(exc: Exception) -> str:
    text = str(exc).split("\n")[0]
    if "UTF8" in text or "utf8" in text.lower():
        return "the file is not UTF-8 text; save it as UTF-8 (with or without a BOM)"
    return f"cannot read the file as CSV: {text}"


def _tally(part: _Part, result, rows, batch, id_pos) -> None:
    status = result.status
    part.rows += len(status)
    part.passed += int(np.sum(status == PASS))
    part.failed += int(np.sum(status == FAIL))
    part.errors += int(np.sum(status == ERROR))
    messages = result.columns["messages"]

    def ident(i: int) -> str:
        return "" if id_pos is None else str(batch.column(id_pos)[i].as_py()).strip()

    fails = np.nonzero(status == FAIL)[0]
    if len(fails):
        util = np.nan_to_num(result.utilisation[fails], nan=0.0)
        for i in fails[np.argsort(-util, kind="stable")[:WORST_SHOWN]]:
            text = messages[int(i)].as_py() or ""
            first = next((m for m in text.split("; ") if "FAIL" in m), text)
            part.worst.append(
                (
                    float(np.nan_to_num(result.utilisation[i], nan=0.0)),
                    int(rows[i]),
                    ident(int(i)),
                    "rail" if result.is_rail[i] else "road",
                    first,
                )
            )
    for i in np.nonzero(status == ERROR)[0][:WORST_SHOWN]:
        text = messages[int(i)].as_py() or ""
        part.first_errors.append(Worst(np.nan, int(rows[i]), ident(int(i)), "", text))


def _tally_bad(summary: _Part, bad, header: Header) -> None:
    summary.rows += len(bad)
    summary.errors += len(bad)
    id_pos = header.known.get("id")
    for number, actual, text in bad[:WORST_SHOWN]:
        fields = next(csv.reader([text], delimiter=header.delimiter), [])
        ident = fields[id_pos].strip() if id_pos is not None and id_pos < len(fields) else ""
        summary.first_errors.append(
            Worst(
                np.nan,
                number,
                ident,
                "",
                f"ERROR row {number}: {actual} fields where the header has {len(header.names)}",
            )
        )


def batch_bytes(text: str | bytes, units, table, limits, **kw) -> tuple[bytes, Summary]:
    """Run a whole CSV held in memory (tests and small files): (output bytes, summary)."""
    data = text.encode("utf-8") if isinstance(text, str) else text
    sink = io.BytesIO()
    summary = run_batch(io.BytesIO(data), sink, units, table, limits, **kw)
    return sink.getvalue(), summary
