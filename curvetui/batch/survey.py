"""Which kinds of bend (road, rail) a batch file holds, found before its header is written.

The default result columns depend on the kinds present (road results only with road rows),
and the header row comes first; so the ``kind`` column alone is read beforehand: pyarrow
parses the file in large blocks converting that one column, and stops as soon as both
kinds are seen (a mixed file is decided in its first block; a file of one kind is read to
its end: measured in benchmarks/batch_million.py). Anything that stops the survey (bytes
that are not UTF-8 in the kind column, a parse error) gives both kinds: more columns,
never a result left out; the check itself then reports the rows.
"""

from __future__ import annotations

from pathlib import Path
from typing import BinaryIO

import pyarrow as pa
import pyarrow.compute as pc
import pyarrow.csv as pcsv

from curvetui.batch.header import Header
from curvetui.batch.undecodable import undecodable

KINDS = frozenset(("road", "rail"))
SURVEY_BLOCK = 1 << 22  # bytes per parsed block while surveying


def _found(column: pa.Array) -> set[str]:
    values = pc.unique(pc.utf8_lower(pc.utf8_trim_whitespace(column))).to_pylist()
    return {v for v in values if v in KINDS}


def csv_kinds(source: str | Path | BinaryIO, header: Header) -> frozenset[str]:
    """The kinds named in the ``kind`` column of a CSV file (a path, or a seekable stream
    read from where it stands, left where it stood)."""
    names = [f"c{i}" for i in range(len(header.names))]
    kind = names[header.known["kind"]]
    start = None if isinstance(source, str | Path) else source.tell()
    try:
        with undecodable():  # a malformed row not UTF-8: pyarrow stops, both kinds below
            found = _surveyed(source, start, names, kind, header)
    except (pa.ArrowException, OSError, UnicodeError):
        return KINDS
    finally:
        if start is not None:
            source.seek(start)
    return frozenset(found)


def _surveyed(source, start, names: list[str], kind: str, header: Header) -> set[str]:
    found: set[str] = set()
    reader = pcsv.open_csv(
        str(source) if start is None else pa.PythonFile(source, mode="r"),
        read_options=pcsv.ReadOptions(
            column_names=names, skip_rows=1, block_size=SURVEY_BLOCK, use_threads=True
        ),
        parse_options=pcsv.ParseOptions(
            delimiter=header.delimiter,
            newlines_in_values=True,
            invalid_row_handler=lambda row: "skip",
        ),
        convert_options=pcsv.ConvertOptions(
            include_columns=[kind], column_types={kind: pa.string()}
        ),
    )
    for batch in reader:
        found |= _found(batch.column(0))
        if found == KINDS:
            break
    return found


def parquet_kinds(path: str | Path, header: Header) -> frozenset[str]:
    """The kinds named in a Parquet file's ``kind`` column (that column alone is read)."""
    import pyarrow.parquet as pq

    name = header.names[header.known["kind"]]
    found: set[str] = set()
    try:
        for batch in pq.ParquetFile(path).iter_batches(batch_size=1 << 16, columns=[name]):
            found |= _found(pc.cast(batch.column(0), pa.string()))
            if found == KINDS:
                break
    except (pa.ArrowException, OSError):
        return KINDS
    return frozenset(found)
