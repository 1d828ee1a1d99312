"""Parquet files in and out of a batch run (pyarrow.parquet).

In: the file's columns are read in batches of ``BATCH_ROWS`` rows (``iter_batches``, so
memory stays bounded), each cell as text for the one path (numbers as pyarrow writes them:
100.0 as "100", 0.1 as "0.1"; a null as a blank cell). Rows are numbered as in a CSV file
with a header row: the first data row (index 0) is row 2, so a row number means the same
whichever form the register came in. Out: the output table as it is built (numbers as
numbers, text as text) through one ParquetWriter, a row group per chunk, with the units,
the road table, the rail limits and the caution in the file's metadata.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import BinaryIO

import pyarrow as pa
import pyarrow.compute as pc

from curvetui.batch.header import BatchFileError, Header, header_of

BATCH_ROWS = 16_384  # rows per chunk: about the CSV reader's 1 MB block
PARQUET_SUFFIX = ".parquet"


def is_parquet(path: str | Path | None) -> bool:
    """Whether a file name says Parquet (by its ending, any case)."""
    return path is not None and str(path).lower().endswith(PARQUET_SUFFIX)


def _pq():
    import pyarrow.parquet as pq  # only a Parquet run pays for it

    return pq


def parquet_header(path: str | Path) -> Header:
    """The header of a Parquet file: its column names; BatchFileError if unreadable."""
    try:
        names = _pq().ParquetFile(path).schema_arrow.names
    except (pa.ArrowException, OSError) as exc:
        words = str(exc).splitlines()[0]
        raise BatchFileError(f"cannot read the file as Parquet: {words}") from None
    return header_of(list(names))


def as_text(column: pa.Array, name: str) -> pa.Array:
    """A column's cells as text for the one path (a null: a blank cell). A column that
    has no text form is refused by name: nested cells (lists, structs, maps), and any
    type pyarrow cannot cast to text (binary cells that are not UTF-8)."""
    if pa.types.is_string(column.type):
        return pc.fill_null(column, "")
    refused = BatchFileError(
        f"column {name!r}: its type {column.type} cannot be read as text or numbers"
    )
    if pa.types.is_nested(column.type):
        raise refused
    try:
        return pc.fill_null(pc.cast(column, pa.string()), "")
    except pa.ArrowException:
        raise refused from None


class ParquetRows:
    """A Parquet file read chunk by chunk, as the CSV reader delivers: every column as
    text under the names ``names``; ``count`` is the share of the file read, in bytes."""

    replaced = False  # Parquet text is UTF-8 by its format: no bytes to replace

    def __init__(self, path: str | Path, header: Header, names: list[str], rows: int = BATCH_ROWS):
        self.file = _pq().ParquetFile(path)
        self.header, self.names = header, names
        self.total = os.path.getsize(path)
        self.rows = max(self.file.metadata.num_rows, 1)
        self.done = 0
        self.count = 0
        self._batches = self.file.iter_batches(batch_size=rows)

    def read_next_batch(self) -> pa.RecordBatch:
        try:
            batch = next(self._batches)  # StopIteration at the end, as the CSV reader
        except (pa.ArrowException, OSError) as exc:
            words = str(exc).splitlines()[0]
            raise BatchFileError(f"cannot read the file as Parquet: {words}") from None
        arrays = [as_text(batch.column(i), self.header.names[i]) for i in range(batch.num_columns)]
        self.done += batch.num_rows
        self.count = self.total * self.done // self.rows
        return pa.RecordBatch.from_arrays(arrays, names=self.names)


def parquet_writer(sink: BinaryIO, schema: pa.Schema, about: dict[str, str]):
    """A ParquetWriter on ``sink`` for ``schema``, with ``about`` in the file's metadata
    (keys prefixed ``curvetui.``)."""
    meta = {f"curvetui.{k}".encode(): v.encode("utf-8") for k, v in about.items()}
    return _pq().ParquetWriter(sink, schema.with_metadata(meta))
