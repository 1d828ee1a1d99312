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

import codecs
import collections
import contextlib
import errno
import io
import os
from collections.abc import Callable
from pathlib import Path
from typing import BinaryIO

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc
import pyarrow.csv as pcsv

from curvetui import CAUTION
from curvetui.batch import columns as cols
from curvetui.batch.chunk import BatchContext
from curvetui.batch.csv_text import csv_header, csv_lines
from curvetui.batch.formulas import neutral_text, neutralise
from curvetui.batch.header import HEAD_BYTES, BatchFileError, read_header
from curvetui.batch.output import Job, Part, output_schema, process_chunk
from curvetui.batch.parquet_io import ParquetRows, is_parquet, parquet_header, parquet_writer
from curvetui.batch.series import SeriesHold
from curvetui.batch.summary import NOT_UTF8_ROW, Summary, finish, merge
from curvetui.batch.survey import csv_kinds, parquet_kinds
from curvetui.batch.undecodable import undecodable
from curvetui.core.rail import RailLimits
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem

# bytes per parsed block: about 15 000 rows of a typical file; two chunks in flight on two
# threads keep a whole run near 300 MB (measured: benchmarks/batch_speed.py)
BLOCK_SIZE = 1 << 20


SUB = "\x1a"  # stands for each byte that is not UTF-8 (a control character no CSV needs)
_SUB_ERRORS = "curvetui-sub"
codecs.register_error(_SUB_ERRORS, lambda e: (SUB * (e.end - e.start), e.end))


class _Counting(io.RawIOBase):
    """A readable stream that counts the bytes read (for the progress bar), with the
    already-read head put back in front."""

    def __init__(self, raw: BinaryIO, head: bytes = b""):
        self.raw = raw
        self.head = head
        self.count = 0
        self._out = bytearray()
        self._decoder = None
        self._held = False
        self.replaced = False  # some byte was not UTF-8 (or the file holds SUB itself)

    def readable(self) -> bool:
        return True

    def read(self, size: int = -1) -> bytes:
        """The file's bytes with each byte that is not part of valid UTF-8 replaced by SUB
        (0x1A, one byte for one: sizes and positions stay), so that one undecodable cell
        costs its row, not the file (see not_utf8_rows). Pure ASCII passes untouched."""
        while len(self._out) < size or size < 0:
            data = self._read_raw(size if size > 0 else -1)
            if not data:
                if self._decoder is not None and self._held:
                    self._out += self._clean(b"", final=True)
                    self._held = False
                break
            if not self._held and data.isascii():
                self._out += data
            else:
                self._out += self._clean(data)
            if size < 0:
                continue
        if size < 0:
            data, self._out = bytes(self._out), bytearray()
        else:
            data, self._out = bytes(self._out[:size]), self._out[size:]
        return data

    def _clean(self, data: bytes, final: bool = False) -> bytes:
        if self._decoder is None:
            self._decoder = codecs.getincrementaldecoder("utf-8")(_SUB_ERRORS)
        text = self._decoder.decode(data, final=final)
        self._held = bool(self._decoder.getstate()[0])
        if text.count(SUB) > data.count(b"\x1a"):  # more than the file's own SUB bytes
            self.replaced = True
        return text.encode("utf-8", "surrogatepass")

    def _read_raw(self, size: int = -1) -> bytes:
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


Progress = Callable[[int, int | None, int], None]  # (bytes read, total bytes, rows done)


class _Numbering:
    """Row numbers of the rows pyarrow delivers, given the rows it skipped (blank or with
    the wrong number of fields), which its handler reports with their numbers."""

    def __init__(self):
        self.skipped: list[int] = []  # sorted row numbers skipped so far
        self.bad: list[tuple[int, int, str]] = []  # (row, fields, text) not yet written
        self.delivered = 0

    def handler(self, row) -> str:
        # pyarrow decodes the row's text before calling this; a row that is not UTF-8 never
        # gets here: pyarrow reports that decoding error as "unraisable" (see batch/undecodable.py)
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
    keep_formulas: bool = False,
    columns: tuple[str, ...] | str = cols.ALL,
    parquet_out: bool = False,
) -> Summary:
    """Check every row of ``source`` (a path or a binary stream; a path ending .parquet is
    read as Parquet) and write the rows with their results to ``sink`` as CSV (the input's
    separator), or as Parquet with ``parquet_out``; ``on_table`` gets each output chunk as
    a pyarrow table too. ``columns``: the result columns (columns.parse_columns: "all",
    "default" or names); the default's kinds are surveyed first (survey.py), a stream that
    cannot seek is first copied to a temporary file for it. Raises BatchFileError when the
    file cannot be used. Text cells that a spreadsheet would run as formulas are written
    with a leading apostrophe in CSV unless ``keep_formulas`` (see
    curvetui.batch.formulas); ``on_table`` and Parquet get them as read.

    Chunks are checked on ``workers`` threads (default: one per core), each taking whole
    chunks; their output is written in the input's order."""
    if workers is None:
        workers = os.cpu_count() or 1
    out = dict(on_table=on_table, block_size=block_size, workers=workers)
    out.update(keep_formulas=keep_formulas, parquet_out=parquet_out)
    if isinstance(source, str | Path) and is_parquet(source):
        header = parquet_header(source)
        results = _results(columns, header, lambda: parquet_kinds(source, header))
        reader = ParquetRows(source, header, [f"c{i}" for i in range(len(header.names))])
        out.update(rows=reader, results=results)
        return _run(header, reader, reader.total, sink, units, table, limits, progress, **out)
    spool = None
    if isinstance(source, str | Path):
        raw: BinaryIO = open(source, "rb")  # noqa: SIM115 - closed below
        total: int | None = os.fstat(raw.fileno()).st_size
    else:
        raw, total = source, None
        if columns == cols.DEFAULT and not _seekable(raw):
            raw = spool = _spooled(raw)  # standard input: surveyed from a copy
    try:
        start = None if isinstance(source, str | Path) else raw.tell()
        head = raw.read(HEAD_BYTES) or b""
        header = read_header(head)
        if start is None:
            results = _results(columns, header, lambda: csv_kinds(source, header))
        else:
            raw.seek(start)
            results = _results(columns, header, lambda: csv_kinds(raw, header))
            raw.seek(start + len(head))
        out["results"] = results
        return _run(
            header,
            _Counting(raw, head),
            total,
            sink,
            units,
            table,
            limits,
            progress,
            **out,
        )
    finally:
        if isinstance(source, str | Path):
            raw.close()
        if spool is not None:
            spool.close()


def _seekable(raw) -> bool:
    try:
        return bool(raw.seekable())
    except (AttributeError, OSError, ValueError):
        return False


def _spooled(raw: BinaryIO) -> BinaryIO:
    """A copy of a stream that cannot seek (a pipe), in a temporary file removed on close."""
    import shutil
    import tempfile

    copy = tempfile.TemporaryFile(prefix="curvetui-batch-")  # noqa: SIM115 - closed by caller
    shutil.copyfileobj(raw, copy, 1 << 20)
    copy.seek(0)
    return copy


def _results(choice, header, kinds_present) -> tuple[str, ...]:
    """The result columns chosen for this file (the kinds surveyed only for the default)."""
    kinds = kinds_present() if choice == cols.DEFAULT else None
    try:
        return cols.chosen_results(choice, list(header.names), kinds)
    except cols.ColumnsError as exc:
        raise BatchFileError(str(exc)) from None


def _run(
    header,
    stream,
    total,
    sink,
    units,
    table,
    limits,
    progress,
    on_table=None,
    block_size=BLOCK_SIZE,
    workers=1,
    keep_formulas=False,
    results=None,
    rows=None,
    parquet_out=False,
):
    width = len(header.names)
    names = [f"c{i}" for i in range(width)]
    numbering = _Numbering()
    schema = output_schema(header, results)
    ctx = BatchContext(
        units=units,
        table=table,
        limits=limits,
        headers={key: header.names[pos].strip() for key, pos in header.known.items()},
        decimal_comma=header.decimal_comma,
        results=results,
    )
    if rows is not None:
        reader = rows  # a Parquet file's chunks
    else:
        try:
            with undecodable() as not_utf8:
                reader = _open(stream, names, block_size, header, numbering)
        except pa.ArrowInvalid as exc:
            raise BatchFileError(_NOT_UTF8 if not_utf8 else _arrow_words(exc)) from None
        except StopIteration:  # pragma: no cover - header only, handled below
            reader = None

    summary = Summary(delimiter=header.delimiter, columns=tuple(schema.names))
    csv_out = sink is not None and on_table is None and not parquet_out
    job = Job(header, schema, ctx, csv_out, keep_formulas, items=on_table is not None)
    summary.results = job.results
    summary.units = units.name
    written = (lambda t: t) if keep_formulas else neutralise
    pq_out = None
    if sink is not None and parquet_out:
        about = {"units": units.name, "table": table.name, "limits": limits.name}
        pq_out = parquet_writer(sink, schema, {**about, "caution": CAUTION})
    elif sink is not None:
        names = schema.names if keep_formulas else [neutral_text(n) for n in schema.names]
        with _reader_may_leave(summary):
            sink.write(csv_header(names, header.delimiter))
    worst: list[tuple[float, int, str, str, str]] = []
    pool = None
    pending: collections.deque = collections.deque()

    def take(part: Part) -> None:
        with _reader_may_leave(summary):
            if part.data is not None and not summary.output_closed:
                sink.write(part.data)
            if part.table is not None and sink is not None and not summary.output_closed:
                if pq_out is not None:
                    pq_out.write_table(part.table)
                else:
                    sink.write(csv_lines(written(part.table), header.delimiter))
        if part.table is not None and on_table is not None:
            on_table(part.table)
        merge(summary, part, worst)
        if progress is not None:
            progress(stream.count, total, summary.rows)

    series = SeriesHold.for_file(header, ctx)

    def submit(chunk, pool):
        if job.items or workers < 2:
            take(process_chunk(job, *chunk))  # in order, here (the app, one core)
            return pool
        # chunks are checked on ``workers`` threads (the engine's numpy and pyarrow work
        # runs outside the GIL) and written back in the input's order
        if pool is None:
            pool = _start_pool(workers)
        pending.append(pool.submit(process_chunk, job, *chunk))
        while len(pending) > workers + 1 or (pending and pending[0].done()):
            take(pending.popleft().result())
        return pool

    try:
        while True:
            try:
                with undecodable() as not_utf8:
                    batch = reader.read_next_batch()
            except StopIteration:
                break
            except pa.ArrowInvalid as exc:
                if not_utf8:
                    raise BatchFileError(_NOT_UTF8) from None
                raise BatchFileError(_arrow_words(exc)) from None
            rows = numbering.numbers(batch.num_rows)
            keep = _not_blank(batch, header.known["kind"])
            if keep is not None:
                summary.blank += int(np.sum(~keep))
                batch, rows = batch.filter(pa.array(keep)), rows[keep]
            if stream.replaced:
                batch, rows = not_utf8_rows(batch, rows, numbering)
            # malformed rows up to this chunk's last row go with it; pyarrow may report
            # later ones while reading ahead, and they wait for their own chunk
            last = int(rows[-1]) if len(rows) else -1
            bad = [b for b in numbering.bad if b[0] <= last]
            numbering.bad = [b for b in numbering.bad if b[0] > last]
            # a register's chunk waits for the curves after its last (batch.series)
            ready = [(batch, rows, bad, None)] if series is None else series.put(batch, rows, bad)
            for chunk in ready:
                pool = submit(chunk, pool)
        for chunk in [] if series is None else series.rest():
            pool = submit(chunk, pool)
        while pending:
            take(pending.popleft().result())
        if numbering.bad:
            take(process_chunk(job, _empty_batch(names), np.zeros(0, np.int64), numbering.bad))
            numbering.bad = []
    finally:
        for f in pending:
            f.cancel()
        if pool is not None:
            pool.shutdown(wait=True, cancel_futures=True)
    if pq_out is not None:
        pq_out.close()
    finish(summary, worst)
    if progress is not None:
        progress(stream.count, total, summary.rows)
    return summary


def not_utf8_rows(batch: pa.RecordBatch, rows: np.ndarray, numbering):
    """Take the rows holding a byte that is not UTF-8 (SUB, see _Counting) out of the
    chunk: each becomes an error row of its own (numbering.bad, written in its place with
    the bytes shown as '?'); the rest are checked as usual."""
    hit = None
    for column in batch.columns:
        found = pc.match_substring(column, SUB)
        hit = found if hit is None else pc.or_(hit, found)
    if hit is None or not pc.any(hit).as_py():
        return batch, rows
    mask = hit.to_numpy(zero_copy_only=False).astype(bool)
    for i in np.nonzero(mask)[0]:
        cells = [str(c[i].as_py() or "").replace(SUB, "?") for c in batch.columns]
        numbering.bad.append((int(rows[i]), NOT_UTF8_ROW, cells))
    numbering.bad.sort()
    return batch.filter(pa.array(~mask)), rows[~mask]


@contextlib.contextmanager
def _reader_may_leave(summary: Summary):
    """Run a write to the output; if the reader of a pipe went away (e.g. `| head`), mark the
    output closed instead of stopping: every row is still checked, so the summary and the
    exit code tell what the file holds."""
    try:
        yield
    except OSError as exc:  # BrokenPipeError, or pyarrow's own words for it
        if not _closed_pipe(exc):
            raise
        summary.output_closed = True
        summary.written_rows = summary.rows


def _closed_pipe(exc: OSError) -> bool:
    """Whether a write failed because the reading end of a pipe was closed."""
    return (
        isinstance(exc, BrokenPipeError)
        or exc.errno == errno.EPIPE
        or ("broken pipe" in str(exc).lower())
    )


def _empty_batch(names: list[str]) -> pa.RecordBatch:
    return pa.RecordBatch.from_arrays([pa.array([], pa.string()) for _ in names], names=names)


def _start_pool(workers: int):
    from concurrent.futures import ThreadPoolExecutor

    return ThreadPoolExecutor(max_workers=workers, thread_name_prefix="curvetui-batch")


def _not_blank(batch: pa.RecordBatch, kind_pos: int) -> np.ndarray | None:
    """Mask of rows with any cell filled, or None when none is blank (the usual case)."""
    empty = pc.equal(pc.utf8_trim_whitespace(batch.column(kind_pos)), "")
    if not pc.any(empty).as_py():
        return None
    blank = empty
    for column in batch.columns:
        blank = pc.and_(blank, pc.equal(pc.utf8_trim_whitespace(column), ""))
    return ~blank.to_numpy(zero_copy_only=False)


_NOT_UTF8 = "the file is not UTF-8 text; save it as UTF-8 (with or without a BOM)"


def _arrow_words(exc: Exception) -> str:
    text = str(exc).split("\n")[0]
    if "UTF8" in text or "utf8" in text.lower():
        return _NOT_UTF8
    return f"cannot read the file as CSV: {text}"


def batch_bytes(text: str | bytes, units, table, limits, **kw) -> tuple[bytes, Summary]:
    """Run a whole CSV held in memory (tests and small files): (output bytes, summary)."""
    data = text.encode("utf-8") if isinstance(text, str) else text
    sink = io.BytesIO()
    summary = run_batch(io.BytesIO(data), sink, units, table, limits, **kw)
    return sink.getvalue(), summary


def _open(stream, names, block_size, header, numbering):
    """pyarrow's streaming CSV reader (it reads the first block at once)."""
    return pcsv.open_csv(
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
