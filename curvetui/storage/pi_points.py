"""Reading a chain of PIs from a CSV file: the start point, PI 1 .. PI n and the end point
as easting and northing in the project's length unit, one row each, in order.

The file is read safely as table files are (``storage.table_files.read_limited``: a regular
file of at most MAX_POINTS_BYTES, UTF-8 only). A header row is required; its columns are
``easting`` and ``northing`` (any case, any order) and optionally ``id``, the bend id at
each PI (the start and end rows name no bend; blank ids become B01, B02...). Columns are
separated by commas, semicolons (then 12,5 may be written for 12.5) or tabs, as in batch
files. Every bad row is named by its row number (the header is row 1) and column; all
problems are given at once (``PointsFileError``), never a traceback.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from curvetui.inputs import InputError
from curvetui.storage.small_csv import (
    CsvFileError,
    bounded_numbers,
    data_rows,
    quoted,
    read_layout,
)

MAX_POINTS_BYTES = 1_000_000  # 1 MB: thousands of PIs, far more than one road holds
COLUMNS = ("id", "easting", "northing")
REQUIRED = ("easting", "northing")
MAX_COORDINATE = 1e8  # [project unit]: beyond any survey grid's false origin
ID_LENGTH = 40  # as the app's bend id rule (app/session.py ID_RULE)
# a PI turning by less than this is in line with its neighbours (as storage.project.chain)
IN_LINE = 1e-9  # [rad]


class PointsFileError(CsvFileError):
    """A points file that cannot be used; ``problems`` names each row and column."""

    what = "points file"


@dataclass(frozen=True)
class PointsFile:
    """The chain read: points (start, PIs, end) in the file's unit, the bend id at each PI,
    and the file row of each point (for messages)."""

    points: tuple[tuple[float, float], ...]
    ids: tuple[str, ...]
    rows: tuple[int, ...]


def parse_points(text: str, path: str = "points file") -> PointsFile:
    """The chain from the file's text; PointsFileError listing every problem."""
    lines = text.splitlines()
    layout = read_layout(
        lines, COLUMNS, REQUIRED, PointsFileError, path,
        empty="the file is empty: it needs a header row (easting,northing or id,easting,northing)",
        listing=f"columns: {', '.join(COLUMNS)}; easting and northing required",
        header="a points file's header names easting and northing (and optionally id)",
    )  # fmt: skip
    where = layout.where
    problems: list[str] = []
    points: list[tuple[float, float]] = []
    cells_id: list[str] = []
    rows: list[int] = []
    bounds = (("easting", MAX_COORDINATE), ("northing", MAX_COORDINATE))
    for row, cells in data_rows(lines, layout, problems):
        xy = bounded_numbers(cells, row, layout, bounds, problems)
        ident = cells[where["id"]].strip() if "id" in where else ""
        if not ident.isprintable():
            problems.append(
                f"row {row}, column id: {quoted(ident)} holds control characters; a bend id is "
                "1 to 40 printable characters"
            )
        elif len(ident) > ID_LENGTH:
            problems.append(f"row {row}, column id: must be 1 to {ID_LENGTH} characters")
        if xy is not None:
            points.append((xy[0], xy[1]))
            cells_id.append(ident)
            rows.append(row)
    if not problems and len(points) < 3:
        problems.append(
            f"{len(points)} point(s); a chain needs at least 3: the start point, one PI or "
            "more, and the end point, one row each in order"
        )
    if problems:
        raise PointsFileError(path, problems)
    ids = _bend_ids(cells_id, rows, problems)
    _geometry(points, rows, problems)
    if problems:
        raise PointsFileError(path, problems)
    return PointsFile(tuple(points), tuple(ids), tuple(rows))


def _bend_ids(cells: list[str], rows: list[int], problems: list[str]) -> list[str]:
    """The ids at the PIs (the first and last rows name no bend); blanks become B01..."""
    inner = cells[1:-1]
    seen: dict[str, int] = {}
    for ident, row in zip(inner, rows[1:-1], strict=True):
        if ident in seen:
            problems.append(
                f"row {row}, column id: {quoted(ident)} is the id of row {seen[ident]} too"
            )
        elif ident:
            seen[ident] = row
    ids, n = [], 1
    for ident in inner:
        if not ident:
            while f"B{n:02d}" in seen:
                n += 1
            ident = f"B{n:02d}"
            seen[ident] = 0
        ids.append(ident)
    return ids


def _geometry(points: list[tuple[float, float]], rows: list[int], problems: list[str]) -> None:
    """Coincident consecutive points, a point repeated, PIs in line or turning back."""
    first_at: dict[tuple[float, float], int] = {}
    for p, row in zip(points, rows, strict=True):
        if p in first_at:
            problems.append(
                f"row {row}: the same point as row {first_at[p]} ({p[0]:g}, {p[1]:g}); "
                "each point of the chain once"
            )
        else:
            first_at[p] = row
    if problems:
        return
    for k in range(1, len(points) - 1):
        (e0, n0), (e1, n1), (e2, n2) = points[k - 1], points[k], points[k + 1]
        turn = math.atan2(e2 - e1, n2 - n1) - math.atan2(e1 - e0, n1 - n0)
        turn = (turn + math.pi) % (2 * math.pi) - math.pi
        if abs(turn) < IN_LINE:
            problems.append(
                f"row {rows[k]}: this PI is in line with its neighbours (no deflection); "
                "leave it out"
            )
        elif abs(abs(turn) - math.pi) < IN_LINE:
            problems.append(f"row {rows[k]}: the chain turns straight back at this PI")


def read_points(path: str) -> PointsFile:
    """Read only ``path`` (a regular UTF-8 file of at most 1 MB) as a chain of PIs."""
    from curvetui.storage.table_files import TableError, decode_utf8, read_limited

    try:
        text = decode_utf8(read_limited(path, MAX_POINTS_BYTES, "points file"), path)
    except TableError as exc:
        raise InputError(str(exc)) from None
    return parse_points(text, str(path))
