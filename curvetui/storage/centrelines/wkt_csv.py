"""Centrelines as WKT in a column of a CSV file (one feature per row).

The header names the columns (comma, semicolon or tab separated, as batch files); the
geometry column is --wkt-column, or else the one named wkt, geometry, geom, the_geom or
wkt_geom (any case). The id is --id-field, or else the ``id`` column, or else the row
number (the header is row 1). The other cells are the feature's properties, as text. A
CSV file says nothing of its coordinate system, so --crs is required (an ``SRID=n;``
prefix on the WKT, extended WKT, is honoured when --crs is not given). A row whose WKT
cannot be read is skipped, counted, and named in the notes.
"""

from __future__ import annotations

import csv
import io

from curvetui.storage.centrelines.model import (
    CentrelineError,
    CentrelineFile,
    LineFeature,
    SourceCrs,
)
from curvetui.storage.centrelines.source import decode_text, read_bytes
from curvetui.storage.centrelines.wkt import WktError, parse_wkt

GEOMETRY_NAMES = ("wkt", "geometry", "geom", "the_geom", "wkt_geom")
MAX_CELL = 100_000_000  # characters in one WKT cell


def _column(names: list[str], wanted: str | None, defaults, path: str, what: str) -> int | None:
    lowered = [n.strip().lower() for n in names]
    if wanted is not None:
        if wanted.strip().lower() in lowered:
            return lowered.index(wanted.strip().lower())
        raise CentrelineError(
            f"{path}: no column {wanted!r} for {what}; columns: {', '.join(names)}"
        )
    for name in defaults:
        if name in lowered:
            return lowered.index(name)
    return None


def read_wkt_csv(
    path: str,
    wkt_column: str | None = None,
    id_field: str | None = None,
    crs: str | None = None,
) -> CentrelineFile:
    """The line features of a CSV file with a WKT column; CentrelineError when unusable."""
    from curvetui.storage.small_csv import header_names

    text = decode_text(read_bytes(path, what="CSV file"), path)
    lines = text.splitlines()
    first = next((i for i, line in enumerate(lines) if line.strip()), None)
    if first is None:
        raise CentrelineError(f"{path}: the file is empty: it needs a header row")
    _, delimiter = header_names(lines[first])
    old_limit = csv.field_size_limit()
    csv.field_size_limit(MAX_CELL)
    try:
        rows = csv.reader(io.StringIO(text), delimiter=delimiter)
        out = CentrelineFile(path)
        _read_rows(rows, path, wkt_column, id_field, crs, out)
    except csv.Error as exc:
        raise CentrelineError(f"{path}: not a readable CSV file ({exc})") from None
    finally:
        csv.field_size_limit(old_limit)
    return out


def _read_rows(rows, path, wkt_column, id_field, crs, out: CentrelineFile) -> None:
    names: list[str] | None = None
    geometry = ident = None
    srid_seen: set[int] = set()
    for row_number, cells in enumerate(rows, start=1):
        if not any(c.strip() for c in cells):
            continue
        if names is None:
            names = [c.strip() for c in cells]
            geometry = _column(names, wkt_column, GEOMETRY_NAMES, path, "--wkt-column")
            if geometry is None:
                raise CentrelineError(
                    f"{path}: no WKT column (named {', '.join(GEOMETRY_NAMES)}); name it with "
                    f"--wkt-column; columns: {', '.join(names)}"
                )
            ident = _column(names, id_field, ("id",), path, "--id-field")
            continue
        if len(cells) != len(names):
            out.skipped["row with the wrong number of cells"] += 1
            out.notes.append(f"row {row_number}: {len(cells)} cells, the header has {len(names)}")
            continue
        try:
            _word, parts, srid = parse_wkt(cells[geometry])
        except WktError as exc:
            out.skipped["WKT not readable"] += 1
            out.notes.append(f"row {row_number}, column {names[geometry]}: {exc}")
            continue
        if not parts:
            word = _word.lower()
            out.skipped[f"a {word} (not a line)" if "line" not in word else "an empty line"] += 1
            continue
        if srid is not None:
            srid_seen.add(srid)
        if crs:
            source = SourceCrs(crs, "--crs")
        elif srid is not None:
            source = SourceCrs(f"EPSG:{srid}", "the SRID of the extended WKT")
        else:
            raise CentrelineError(
                f"{path}: a CSV file does not say its coordinate system: give --crs (e.g. "
                "EPSG:4326 for longitude/latitude, EPSG:27700, or plane-m for a local grid in "
                "metres)"
            )
        fid = cells[ident].strip() if ident is not None else ""
        props = {n: c for i, (n, c) in enumerate(zip(names, cells, strict=True)) if i != geometry}
        out.features.append(
            LineFeature(fid or str(row_number), props, tuple(parts), source, row_number)
        )
    if names is None:
        raise CentrelineError(f"{path}: the file is empty: it needs a header row")
    if crs and srid_seen:
        out.notes.append("the SRID prefixes of the WKT were replaced by --crs")
