"""A batch file's header row: column names, separator, where the known columns are."""

from __future__ import annotations

import csv
from dataclasses import dataclass

from curvetui.batch import columns as cols

HEAD_BYTES = 1 << 16  # bytes read first, to find the header row


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
    # the header row ends at the first line end: LF, CR LF or a lone CR (old Mac files)
    ends = [i for i in (head.find(b"\n"), head.find(b"\r")) if i >= 0]
    line = head[: min(ends)] if ends else head
    try:
        text = line.decode("utf-8")
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
    return header_of(best, delimiter)


def header_of(best: list[str], delimiter: str = ",") -> Header:
    """The header of these column names (a CSV header row, or a Parquet file's schema);
    BatchFileError for a column named twice or a required one missing."""
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
