"""Centreline files: line features read from GeoJSON, WKT in a CSV column, GeoPackage or
Shapefile, each as (id, properties, parts, coordinate system). Files are only read, never
written; a file that cannot be used raises CentrelineError naming it and the problem."""

from __future__ import annotations

from pathlib import Path

from curvetui.storage.centrelines.model import (
    CentrelineError,
    CentrelineFile,
    LineFeature,
    SourceCrs,
)

FORMATS = {
    ".geojson": "GeoJSON",
    ".json": "GeoJSON",
    ".csv": "WKT in a CSV column",
    ".tsv": "WKT in a CSV column",
    ".txt": "WKT in a CSV column",
    ".gpkg": "GeoPackage",
    ".shp": "Shapefile",
}

__all__ = [
    "FORMATS",
    "CentrelineError",
    "CentrelineFile",
    "LineFeature",
    "SourceCrs",
    "read_centrelines",
]


def read_centrelines(
    path: str,
    *,
    layer: str | None = None,
    wkt_column: str | None = None,
    id_field: str | None = None,
    crs: str | None = None,
) -> CentrelineFile:
    """The line features of ``path``, its format chosen by the file name's ending."""
    suffix = Path(path).suffix.lower()
    fmt = FORMATS.get(suffix)
    if fmt is None:
        known = ", ".join(sorted(set(FORMATS)))
        ending = suffix or "(no ending)"
        raise CentrelineError(f"{path}: unknown kind of file {ending!r}; read: {known}")
    if layer is not None and fmt != "GeoPackage":
        raise CentrelineError(f"--layer: only a GeoPackage has layers; {path} is {fmt}")
    if wkt_column is not None and fmt != "WKT in a CSV column":
        raise CentrelineError(f"--wkt-column: only for a CSV file; {path} is {fmt}")
    if fmt == "GeoJSON":
        from curvetui.storage.centrelines.geojson import read_geojson

        return read_geojson(path, id_field, crs)
    if fmt == "GeoPackage":
        from curvetui.storage.centrelines.geopackage import read_geopackage

        return read_geopackage(path, layer, id_field, crs)
    if fmt == "Shapefile":
        from curvetui.storage.centrelines.shapefile_reader import read_shapefile

        return read_shapefile(path, id_field, crs)
    from curvetui.storage.centrelines.wkt_csv import read_wkt_csv

    return read_wkt_csv(path, wkt_column, id_field, crs)
