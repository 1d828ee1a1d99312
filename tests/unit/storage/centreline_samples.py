"""Small centreline files built in a test's tmp_path: GeoJSON, WKT in CSV, a GeoPackage
(sqlite3 tables and GeoPackage blobs with WKB encoded here) and a Shapefile (pyshp), and
geometry laid out on the ellipsoid with pyproj.Geod (geodesic forward/inverse, Karney's
algorithm): the reference the projection is checked against."""

from __future__ import annotations

import json
import sqlite3
import struct
from pathlib import Path

import numpy as np


def geod():
    import pyproj

    return pyproj.Geod(ellps="WGS84")


def geodesic_circle(lon: float, lat: float, radius: float, n: int = 41, arc: float = 90.0):
    """n points at geodesic distance ``radius`` [m] from (lon, lat), azimuths 0..arc."""
    az = np.linspace(0.0, arc, n)
    lo, la, _ = geod().fwd(np.full(n, lon), np.full(n, lat), az, np.full(n, radius))
    return np.column_stack([lo, la])


def geodesic_alignment(
    lon: float, lat: float, azimuth: float, radius: float, deflection: float,
    tangent: float = 200.0, step: float = 2.0, turn: str = "right",
):  # fmt: skip
    """Tangent, circular arc (radius [m], deflection [degrees]) and tangent, laid out on the
    WGS 84 ellipsoid with geodesic steps of about ``step`` m: (n, 2) lon/lat."""
    g = geod()
    side = 1.0 if turn == "right" else -1.0
    d = np.arange(0.0, tangent + step / 2, step)
    lo1, la1, _ = g.fwd(np.full(d.size, lon), np.full(d.size, lat), np.full(d.size, azimuth), d)
    pc = (lo1[-1], la1[-1])
    _, back, _ = g.inv(lon, lat, *pc)
    heading = (back + 180.0) % 360.0  # forward azimuth at PC
    clon, clat, _ = g.fwd(*pc, heading + side * 90.0, radius)
    from_centre, _, _ = g.inv(clon, clat, *pc)
    arc_len = np.radians(deflection) * radius
    m = max(int(round(arc_len / step)), 2)
    t = np.linspace(0.0, deflection, m + 1)[1:]
    az = from_centre + side * t
    lo2, la2, _ = g.fwd(np.full(m, clon), np.full(m, clat), az, np.full(m, radius))
    to_centre, _, _ = g.inv(lo2[-1], la2[-1], clon, clat)
    out_heading = to_centre - side * 90.0
    d3 = d[1:]
    lo3, la3, _ = g.fwd(
        np.full(d3.size, lo2[-1]), np.full(d3.size, la2[-1]), np.full(d3.size, out_heading), d3
    )
    return np.column_stack([np.r_[lo1, lo2, lo3], np.r_[la1, la2, la3]])


def write_geojson(path: Path, lines: dict[str, np.ndarray], extra: list | None = None) -> Path:
    """A FeatureCollection of LineStrings (id -> lon/lat array) and any extra features."""
    features = [
        {
            "type": "Feature",
            "id": fid,
            "properties": {"name": f"Quillmere lane {fid}"},
            "geometry": {"type": "LineString", "coordinates": xy.tolist()},
        }
        for fid, xy in lines.items()
    ]
    path.write_text(json.dumps({"type": "FeatureCollection", "features": features + (extra or [])}))
    return path


def wkb_linestring(xy: np.ndarray, z: bool = False) -> bytes:
    """ISO WKB LineString (little endian; type 1002 with Z, an elevation of 10 m added)."""
    code = 1002 if z else 2
    body = struct.pack("<BII", 1, code, len(xy))
    for x, y in xy:
        body += struct.pack("<dd", x, y) + (struct.pack("<d", 10.0) if z else b"")
    return body


def wkb_multilinestring(parts: list[np.ndarray]) -> bytes:
    return struct.pack("<BII", 1, 5, len(parts)) + b"".join(wkb_linestring(p) for p in parts)


def wkb_point(x: float, y: float) -> bytes:
    return struct.pack("<BIdd", 1, 1, x, y)


def gpkg_blob(wkb: bytes, srs_id: int, envelope: bool = False) -> bytes:
    """GeoPackage geometry: 'GP', version 0, flags (little endian; envelope code 1 with a
    32-byte xy envelope when asked), srs_id, then the WKB (GeoPackage 1.3, 2.1.3)."""
    flags = 0b1 | ((1 << 1) if envelope else 0)
    head = b"GP" + bytes([0, flags]) + struct.pack("<i", srs_id)
    return head + (struct.pack("<4d", 0, 1, 0, 1) if envelope else b"") + wkb


def write_geopackage(
    path: Path, rows: list[tuple[str, bytes | None]], srs_id: int = 4326,
    organization: str = "EPSG", code: int = 4326, table: str = "centrelines",
    extra_layers: tuple[str, ...] = (),
) -> Path:  # fmt: skip
    """A GeoPackage with one features layer (name, geometry blob per row)."""
    con = sqlite3.connect(path)
    con.executescript(
        """
        CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT, srs_id INTEGER PRIMARY KEY,
          organization TEXT, organization_coordsys_id INTEGER, definition TEXT,
          description TEXT);
        CREATE TABLE gpkg_contents (table_name TEXT PRIMARY KEY, data_type TEXT,
          identifier TEXT, srs_id INTEGER);
        CREATE TABLE gpkg_geometry_columns (table_name TEXT, column_name TEXT,
          geometry_type_name TEXT, srs_id INTEGER, z TINYINT, m TINYINT);
        """
    )
    con.execute(
        "INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)",
        ("test", srs_id, organization, code, "undefined", ""),
    )
    for name in (table, *extra_layers):
        con.execute(f'CREATE TABLE "{name}" (fid INTEGER PRIMARY KEY, name TEXT, geom BLOB)')
        con.execute("INSERT INTO gpkg_contents VALUES (?, 'features', ?, ?)", (name, name, srs_id))
        con.execute(
            "INSERT INTO gpkg_geometry_columns VALUES (?, 'geom', 'LINESTRING', ?, 0, 0)",
            (name, srs_id),
        )
    con.executemany(f'INSERT INTO "{table}" (name, geom) VALUES (?, ?)', rows)
    con.commit()
    con.close()
    return path


def write_shapefile(path: Path, lines: dict[str, list[np.ndarray]], epsg: int | None = 4326):
    """A PolyLine Shapefile (pyshp) with a 'name' attribute, and its .prj (ESRI WKT from
    pyproj) unless ``epsg`` is None."""
    import pyproj
    import shapefile

    with shapefile.Writer(str(path), shapeType=shapefile.POLYLINE) as w:
        w.field("name", "C", size=40)
        for name, parts in lines.items():
            w.line([p.tolist() for p in parts])
            w.record(name)
    if epsg is not None:
        wkt = pyproj.CRS.from_epsg(epsg).to_wkt(pyproj.enums.WktVersion.WKT1_ESRI)
        path.with_suffix(".prj").write_text(wkt)
    return path


def line_wkt(xy: np.ndarray) -> str:
    return "LINESTRING (" + ", ".join(f"{float(x)!r} {float(y)!r}" for x, y in xy) + ")"


def kasa_radius(x: np.ndarray, y: np.ndarray) -> float:
    """The radius of the least-squares circle x^2 + y^2 + D x + E y + F = 0 (Kasa 1976,
    an algebraic fit; exact for points on a circle)."""
    a = np.column_stack([x, y, np.ones_like(x)])
    d, e, f = np.linalg.lstsq(a, -(x**2 + y**2), rcond=None)[0]
    return float(np.sqrt(d * d / 4 + e * e / 4 - f))
