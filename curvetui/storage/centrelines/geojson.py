"""GeoJSON centrelines (RFC 7946): a FeatureCollection, a Feature or a bare geometry.

Positions are [longitude, latitude] in WGS 84 degrees (RFC 7946, 3.1.1 and 4); a third
value (height) is dropped. LineString and MultiLineString are read (a GeometryCollection's
lines too); points and polygons are skipped and counted. A feature's id is its ``id``
member (RFC 7946, 3.2), or the property named by ``id_field``, or its position.

A ``crs`` member is not part of RFC 7946 (it belonged to the 2008 GeoJSON format, which
RFC 7946 section 4 replaced). curvetui honours a named one
(``{"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::27700"}}``), as files
written by older GIS tools carry one, and says so in the notes; a linked one is refused.
``crs`` given by the user (--crs) overrides both.
"""

from __future__ import annotations

import json

from curvetui.storage.centrelines.model import (
    WGS84_LONLAT,
    CentrelineError,
    CentrelineFile,
    LineFeature,
    SourceCrs,
    as_xy,
)
from curvetui.storage.centrelines.source import decode_text, plain_value, read_bytes

LINE_TYPES = ("LineString", "MultiLineString")
OTHER_TYPES = ("Point", "MultiPoint", "Polygon", "MultiPolygon")


def _no_constant(name: str):
    raise ValueError(f"{name} is not a JSON number")


def read_geojson(path: str, id_field: str | None = None, crs: str | None = None) -> CentrelineFile:
    """The line features of a GeoJSON file; CentrelineError when it is not usable."""
    text = decode_text(read_bytes(path, what="GeoJSON file"), path)
    try:
        doc = json.loads(text, parse_constant=_no_constant)
    except (ValueError, RecursionError) as exc:
        raise CentrelineError(f"{path}: not valid JSON ({exc})") from None
    return parse_geojson(doc, path, id_field, crs)


def parse_geojson(
    doc: object, path: str, id_field: str | None = None, crs: str | None = None
) -> CentrelineFile:
    """The line features of a parsed GeoJSON document."""
    if not isinstance(doc, dict) or not isinstance(doc.get("type"), str):
        raise CentrelineError(
            f'{path}: not GeoJSON: the top level must be an object with a "type" '
            "(FeatureCollection, Feature or a geometry)"
        )
    out = CentrelineFile(path)
    source = _source_crs(doc, path, crs, out.notes)
    kind = doc["type"]
    if kind == "FeatureCollection":
        features = doc.get("features")
        if not isinstance(features, list):
            raise CentrelineError(f'{path}: a FeatureCollection needs a "features" list')
    elif kind == "Feature":
        features = [doc]
    else:
        features = [{"type": "Feature", "geometry": doc, "properties": None}]
    for index, feature in enumerate(features, start=1):
        _read_feature(feature, index, id_field, source, out)
    if id_field:
        missing = sum(1 for f in out.features if f.properties.get(id_field) in (None, ""))
        if missing:
            out.notes.append(
                f"{missing} feature(s) without a {id_field!r} property: their position in "
                "the file is their id"
            )
    return out


def _source_crs(doc: dict, path: str, crs: str | None, notes: list[str]) -> SourceCrs:
    member = doc.get("crs")
    if crs:
        if member is not None:
            notes.append("the file's crs member was replaced by --crs")
        return SourceCrs(crs, "--crs")
    if member is None:
        return WGS84_LONLAT
    props = member.get("properties") if isinstance(member, dict) else None
    name = props.get("name") if isinstance(props, dict) else None
    if not (isinstance(member, dict) and member.get("type") == "name" and isinstance(name, str)):
        raise CentrelineError(
            f"{path}: has a crs member that does not name a coordinate system (RFC 7946 "
            "GeoJSON has none: it is WGS 84 longitude/latitude); give the system with --crs"
        )
    notes.append(
        f"the file names its coordinate system in a crs member ({name}): not RFC 7946 "
        "(older GeoJSON), honoured"
    )
    return SourceCrs(name, "the file's crs member")


def _feature_id(feature: dict, index: int, id_field: str | None, props: dict) -> str:
    if id_field:
        value = props.get(id_field)
    else:
        value = feature.get("id")
    if value is None or isinstance(value, (dict, list)) or value == "":
        return str(index)
    return str(value)


def _read_feature(feature, index, id_field, source, out: CentrelineFile) -> None:
    if not isinstance(feature, dict) or feature.get("type") != "Feature":
        out.skipped["not a GeoJSON Feature object"] += 1
        return
    props = feature.get("properties")
    props = props if isinstance(props, dict) else {}
    geometry = feature.get("geometry")
    if geometry is None:
        out.skipped["no geometry"] += 1
        return
    try:
        parts, others = _line_parts(geometry)
    except ValueError as exc:
        out.skipped["geometry not readable"] += 1
        out.notes.append(f"feature {index}: {exc}")
        return
    if not parts:
        out.skipped[others or "no line geometry"] += 1
        return
    out.features.append(
        LineFeature(
            fid=_feature_id(feature, index, id_field, props),
            properties={k: plain_value(v) for k, v in props.items()},
            parts=tuple(parts),
            crs=source,
            index=index,
        )
    )


def _line_parts(geometry, depth: int = 0):
    """(parts, what else was there): the lines of a geometry as (n, 2) arrays."""
    if not isinstance(geometry, dict):
        raise ValueError("geometry is not an object")
    kind = geometry.get("type")
    coords = geometry.get("coordinates")
    if kind == "LineString":
        if not isinstance(coords, list):
            raise ValueError("a LineString needs a coordinates list")
        return [as_xy(coords, "LineString")], ""
    if kind == "MultiLineString":
        if not isinstance(coords, list) or not all(isinstance(c, list) for c in coords):
            raise ValueError("a MultiLineString needs a list of coordinate lists")
        return [as_xy(c, f"MultiLineString part {i + 1}") for i, c in enumerate(coords)], ""
    if kind == "GeometryCollection" and depth == 0:
        members = geometry.get("geometries")
        if not isinstance(members, list):
            raise ValueError("a GeometryCollection needs a geometries list")
        parts = []
        for member in members:
            got, _ = _line_parts(member, depth + 1)
            parts.extend(got)
        return parts, "a geometry collection without lines"
    if kind in OTHER_TYPES:
        return [], "a " + kind.lower().replace("multi", "multi-") + " (not a line)"
    raise ValueError(f"unknown geometry type {str(kind)[:40]!r}")
