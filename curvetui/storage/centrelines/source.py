"""Opening a centreline file the user named: read-only, regular files only, a size limit,
and every failure turned into a CentrelineError naming the file."""

from __future__ import annotations

from pathlib import Path

from curvetui.storage.centrelines.model import CentrelineError

MAX_TEXT_BYTES = 1_000_000_000  # 1 GB of GeoJSON or CSV text, read whole (see the README)
MAX_PRJ_BYTES = 1_000_000  # a .prj or .cpg beside a Shapefile: a line of WKT


def read_bytes(path: str | Path, limit: int = MAX_TEXT_BYTES, what: str = "file") -> bytes:
    """The bytes of a regular file of at most ``limit`` bytes, opened read-only (a FIFO or
    device is never opened); CentrelineError otherwise."""
    from curvetui.storage.table_files import TableError, read_limited

    try:
        return read_limited(path, limit, what)
    except TableError as exc:
        raise CentrelineError(str(exc)) from None


def require_file(path: str | Path, what: str = "file") -> None:
    """CentrelineError unless ``path`` is an existing regular file (never opened here)."""
    import os
    import stat

    try:
        info = os.stat(path)
    except FileNotFoundError:
        raise CentrelineError(f"{path}: no such file") from None
    except (OSError, ValueError) as exc:
        raise CentrelineError(f"{path}: cannot read ({exc})") from None
    if not stat.S_ISREG(info.st_mode):
        raise CentrelineError(f"{path}: not a regular {what} (a folder, device or pipe)")


def decode_text(data: bytes, path: str | Path) -> str:
    """UTF-8 text (a byte-order mark dropped); CentrelineError naming the fix otherwise."""
    from curvetui.storage.table_files import TableError, decode_utf8

    try:
        return decode_utf8(data, path)
    except TableError as exc:
        raise CentrelineError(str(exc)) from None


def plain_value(value: object) -> object:
    """A property value as the register may carry it: text, a number, a truth value or
    None; dates as ISO 8601 text; lists, objects and bytes become None (they are not one cell)."""
    import datetime

    if value is None or isinstance(value, (str, bool, int, float)):
        return value
    if isinstance(value, (datetime.date, datetime.time)):
        return value.isoformat()
    return None
