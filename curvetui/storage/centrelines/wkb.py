"""Well-known binary (OGC Simple Features, ISO 19125-1, clause 8) for line geometry, as a
GeoPackage stores it: byte order, type code (ISO 1000/2000/3000 offsets for Z, M and ZM, or
the extended flags 0x80000000 Z, 0x40000000 M, 0x20000000 SRID), then LineString (2) or
MultiLineString (5) points. Other types are recognised by code, so a point or polygon is
skipped and counted. Z and M values are dropped."""

from __future__ import annotations

import struct

import numpy as np

LINESTRING, MULTILINESTRING = 2, 5
TYPE_NAMES = {
    1: "a point", 3: "a polygon", 4: "a multi-point", 6: "a multi-polygon",
    7: "a geometry collection", 8: "a circular string", 9: "a compound curve",
    10: "a curve polygon", 11: "a multi-curve", 12: "a multi-surface",
}  # fmt: skip


class WkbError(ValueError):
    """Bytes that are not line WKB; the message says where."""


def _header(blob: bytes, pos: int) -> tuple[str, int, int, int]:
    """(byte order prefix, base type code, values per point, position after the header)."""
    if pos + 5 > len(blob):
        raise WkbError("ends inside a geometry header")
    order = blob[pos]
    if order not in (0, 1):
        raise WkbError(f"byte order {order} is neither 0 nor 1")
    end = "<" if order == 1 else ">"
    (code,) = struct.unpack_from(end + "I", blob, pos + 1)
    pos += 5
    z = bool(code & 0x80000000)
    m = bool(code & 0x40000000)
    if code & 0x20000000:  # an extended WKB SRID follows the type
        pos += 4
    code &= 0x0FFFFFFF
    thousands, base = divmod(code, 1000)
    if thousands in (1, 3):
        z = True
    if thousands in (2, 3):
        m = True
    if thousands > 3:
        raise WkbError(f"unknown geometry type code {code}")
    return end, base, 2 + z + m, pos


def geometry_kind(blob: bytes, pos: int = 0) -> int:
    """The base type code (2 LineString, 5 MultiLineString, ...)."""
    return _header(blob, pos)[1]


def _linestring(blob: bytes, pos: int, end: str, dims: int) -> tuple[np.ndarray, int]:
    if pos + 4 > len(blob):
        raise WkbError("ends before a point count")
    (n,) = struct.unpack_from(end + "I", blob, pos)
    pos += 4
    size = 8 * dims * n
    if pos + size > len(blob):
        raise WkbError(f"a line of {n} points runs past the end of the geometry")
    values = np.frombuffer(blob, dtype=end + "f8", count=dims * n, offset=pos)
    return values.reshape(n, dims)[:, :2].astype(float), pos + size


def parse_wkb(blob: bytes, pos: int = 0) -> tuple[int, list[np.ndarray]]:
    """(base type code, parts as (n, 2) arrays); a non-line type gives no parts."""
    end, base, dims, pos = _header(blob, pos)
    if base == LINESTRING:
        line, _ = _linestring(blob, pos, end, dims)
        return base, [line]
    if base != MULTILINESTRING:
        if base not in TYPE_NAMES:
            raise WkbError(f"unknown geometry type code {base}")
        return base, []
    if pos + 4 > len(blob):
        raise WkbError("ends before a part count")
    (count,) = struct.unpack_from(end + "I", blob, pos)
    pos += 4
    parts = []
    for i in range(count):
        part_end, part_base, part_dims, pos = _header(blob, pos)
        if part_base != LINESTRING:
            raise WkbError(f"MultiLineString member {i + 1} is not a LineString")
        line, pos = _linestring(blob, pos, part_end, part_dims)
        parts.append(line)
    return base, parts
