"""GeoPackage centrelines (OGC GeoPackage Encoding Standard 1.3, OGC 12-128r18), read with
the standard library's sqlite3.

The file is opened read-only and immutable (SQLite URI ``mode=ro&immutable=1``), so SQLite
writes nothing, not even a lock or journal file beside it. A write-ahead log beside the
file (``NAME-wal``) means another program may hold changes not yet in the file: that is
refused (close the other program), since an immutable read would not see them.

Layers are the ``features`` rows of gpkg_contents with their gpkg_geometry_columns entry;
the coordinate system is that column's srs_id in gpkg_spatial_ref_sys (``ORG:code`` when
the organisation gives one, else the definition's WKT). srs_id 0 is the undefined
geographic system (read as WGS 84 longitude/latitude, said in the notes) and -1 the
undefined Cartesian one (--crs needed), as the standard's clause 1.1.2.1.1 defines them.
Each geometry is the GeoPackage binary header (magic "GP", version, flags, srs_id,
envelope; clause 2.1.3) followed by WKB.
"""

from __future__ import annotations

import os
import sqlite3
import struct
from pathlib import Path

from curvetui.storage.centrelines import wkb
from curvetui.storage.centrelines.model import (
    WGS84_LONLAT,
    CentrelineError,
    CentrelineFile,
    LineFeature,
    SourceCrs,
)
from curvetui.storage.centrelines.source import plain_value, require_file

ENVELOPE_BYTES = {0: 0, 1: 32, 2: 48, 3: 48, 4: 64}  # clause 2.1.3, flags bits 1-3
LINE_TYPE_NAMES = ("LINESTRING", "MULTILINESTRING", "GEOMETRY", "GEOMETRYCOLLECTION")


def _quote(name: str) -> str:
    return '"' + name.replace('"', '""') + '"'


def _connect(path: str) -> sqlite3.Connection:
    require_file(path, "GeoPackage")
    p = Path(path)
    if os.path.exists(str(p) + "-wal"):
        raise CentrelineError(
            f"{path}: a write-ahead log ({p.name}-wal) is beside it: another program may have "
            "changes not yet in the file; close that program and try again"
        )
    uri = p.resolve().as_uri() + "?mode=ro&immutable=1"
    try:
        con = sqlite3.connect(uri, uri=True)
        con.execute("SELECT count(*) FROM sqlite_master").fetchone()
    except sqlite3.Error as exc:
        raise CentrelineError(f"{path}: not a GeoPackage (SQLite: {exc})") from None
    return con


def _layers(con: sqlite3.Connection, path: str) -> list[tuple[str, str, str, int]]:
    """(table, geometry column, geometry type name, srs_id) of every features layer."""
    try:
        return con.execute(
            "SELECT c.table_name, g.column_name, g.geometry_type_name, g.srs_id "
            "FROM gpkg_contents c JOIN gpkg_geometry_columns g ON g.table_name = c.table_name "
            "WHERE c.data_type = 'features' ORDER BY c.table_name"
        ).fetchall()
    except sqlite3.Error as exc:
        raise CentrelineError(
            f"{path}: not a GeoPackage: no gpkg_contents / gpkg_geometry_columns tables ({exc})"
        ) from None


def _choose(layers, layer: str | None, path: str, notes: list[str]):
    names = [row[0] for row in layers]
    if layer is not None:
        for row in layers:
            if row[0] == layer:
                return row
        raise CentrelineError(
            f"{path}: no features layer named {layer!r}; layers: {', '.join(names) or 'none'}"
        )
    if not layers:
        raise CentrelineError(f"{path}: holds no features layer")
    if len(layers) == 1:
        return layers[0]
    lines = [row for row in layers if str(row[2]).upper() in LINE_TYPE_NAMES[:2]]
    if len(lines) == 1:
        notes.append(f"layer {lines[0][0]!r} read: the only line layer of {len(layers)}")
        return lines[0]
    raise CentrelineError(
        f"{path}: holds {len(layers)} features layers; choose one with --layer: " + ", ".join(names)
    )


def _crs(con, srs_id: int, crs: str | None, path: str, notes: list[str]) -> SourceCrs:
    if crs:
        return SourceCrs(crs, "--crs")
    if srs_id == 0:
        notes.append("srs_id 0 (undefined geographic) read as WGS 84 longitude/latitude")
        return WGS84_LONLAT
    row = con.execute(
        "SELECT organization, organization_coordsys_id, definition FROM gpkg_spatial_ref_sys "
        "WHERE srs_id = ?",
        (srs_id,),
    ).fetchone()
    if srs_id == -1 or row is None:
        raise CentrelineError(
            f"{path}: the layer's coordinate system is undefined (srs_id {srs_id}); give it "
            "with --crs (e.g. EPSG:27700, or plane-m for a local grid in metres)"
        )
    org, code, definition = row
    if org and str(org).upper() not in ("NONE", "") and code not in (None, 0, -1):
        return SourceCrs(f"{str(org).upper()}:{code}", f"the GeoPackage (srs_id {srs_id})")
    if definition and str(definition).strip().lower() != "undefined":
        return SourceCrs(str(definition), f"the GeoPackage (srs_id {srs_id})")
    raise CentrelineError(f"{path}: srs_id {srs_id} has no usable definition; give --crs")


def blob_geometry(blob: bytes) -> tuple[int, list]:
    """(WKB base type code, parts) of a GeoPackage geometry blob."""
    if len(blob) < 8 or blob[:2] != b"GP":
        raise wkb.WkbError("not a GeoPackage geometry (no 'GP' header)")
    flags = blob[3]
    envelope = (flags >> 1) & 0b111
    if envelope not in ENVELOPE_BYTES:
        raise wkb.WkbError(f"envelope code {envelope} is not defined")
    if flags & 0b10000:  # the empty-geometry flag
        return wkb.LINESTRING, []
    if flags & 0b100000:
        raise wkb.WkbError("an extended (non-standard) GeoPackage geometry type")
    start = 8 + ENVELOPE_BYTES[envelope]
    return wkb.parse_wkb(blob, start)


def read_geopackage(
    path: str, layer: str | None = None, id_field: str | None = None, crs: str | None = None
) -> CentrelineFile:
    """The line features of one layer of a GeoPackage; CentrelineError when unusable."""
    con = _connect(path)
    try:
        out = CentrelineFile(path)
        table, column, _, srs_id = _choose(_layers(con, path), layer, path, out.notes)
        out.layer = table
        source = _crs(con, int(srs_id), crs, path, out.notes)
        info = con.execute(f"PRAGMA table_info({_quote(table)})").fetchall()
        names = [row[1] for row in info]
        # SQLite names are case-insensitive: use the table's own spelling of the column
        column = next((n for n in names if n.lower() == str(column).lower()), column)
        pk = next((row[1] for row in info if row[5] == 1), None)
        if id_field is not None and id_field not in names:
            raise CentrelineError(
                f"{path}: layer {table!r} has no column {id_field!r} for --id-field; columns: "
                + ", ".join(names)
            )
        cursor = con.execute(f"SELECT * FROM {_quote(table)}")
        for index, row in enumerate(cursor, start=1):
            _read_row(dict(zip(names, row, strict=True)), index, column, pk, id_field, source, out)
        return out
    except sqlite3.Error as exc:
        raise CentrelineError(f"{path}: cannot read the GeoPackage ({exc})") from None
    finally:
        con.close()


def _read_row(values: dict, index, column, pk, id_field, source, out: CentrelineFile) -> None:
    blob = values.pop(column, None)
    if blob is None:
        out.skipped["no geometry"] += 1
        return
    try:
        code, parts = blob_geometry(bytes(blob))
    except (wkb.WkbError, struct.error, TypeError) as exc:
        out.skipped["geometry not readable"] += 1
        out.notes.append(f"row {index}: {exc}")
        return
    if not parts:
        empty = code in (wkb.LINESTRING, wkb.MULTILINESTRING)
        out.skipped["an empty line" if empty else wkb.TYPE_NAMES[code] + " (not a line)"] += 1
        return
    key = id_field or pk
    ident = values.get(key) if key else None
    fid = str(index) if ident is None or ident == "" else str(ident)
    out.features.append(
        LineFeature(
            fid, {k: plain_value(v) for k, v in values.items()}, tuple(parts), source, index
        )
    )
