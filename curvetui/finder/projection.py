"""Centreline coordinates to a metric plane, where the finder measures stations and radii.

Geographic coordinates (longitude, latitude on any datum) go to a transverse Mercator
projection of the feature's own ellipsoid, centred on the feature (central meridian at the
middle of its longitude range, origin latitude at the middle of its latitude range, scale 1
on the central meridian; no datum shift). So no result depends on where UTM zone edges
fall. Its point scale factor grows away from the central meridian as

    k - 1 ~= (1 + e'^2 cos^2 phi) x^2 / (2 N^2)

(the leading term of Snyder, *Map Projections - A Working Manual*, USGS PP 1395, 1987,
eq. 8-11, from memory; x the distance from the central meridian, N the prime-vertical
radius): 4.9e-6 (5 ppm) at 20 km, 1.2e-4 at 100 km. Radii and stations are plane values,
too long by that factor at most: for a feature spanning 40 km east-west, 5 ppm, far below a
fit's own error. The largest k - 1 over the feature's vertices is kept (``scale_error``).

Projected coordinates are used as they are, their linear unit converted to metres (a US
survey foot is 1200/3937 m): stations and radii are then grid values, which differ from
ground values by the projection's scale factor at the feature (UTM: 0.9996 on the central
meridian, k - 1 = -4e-4), and ``scale_error`` is that k - 1 at the feature's first vertex
(pyproj's ``Proj.get_factors``). The plane words (plane-m, plane-ft, plane-usft) are a
local grid taken as ground, scale_error 0.

Axis order: x is always easting or longitude and y northing or latitude, whatever order a
CRS definition states (pyproj ``always_xy``), as GeoJSON, WKT and GeoPackage write them.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from curvetui.storage.centrelines.model import CentrelineError, LineFeature, SourceCrs

JOIN_GAP = 1e-3  # [m] parts whose end and next start are closer are one line (no source)
GIS_EXTRA = "pip install 'curvetui[gis]'"


@dataclass(frozen=True)
class PlaneLine:
    """One line of a feature in the plane [m]: x east, y north, and the station of its
    first vertex along the feature (the lengths of the lines before it; gaps between parts
    are not counted)."""

    x: np.ndarray
    y: np.ndarray
    start_station: float


@dataclass(frozen=True)
class PlaneFeature:
    """A feature in the plane: its lines and the scale error (k - 1) of the plane there."""

    feature: LineFeature
    lines: tuple[PlaneLine, ...]
    scale_error: float
    plane: str  # "local transverse Mercator", "grid of <crs name>", "plane grid"
    notes: tuple[str, ...] = ()


class FeatureProblem(ValueError):
    """A feature whose coordinates cannot be projected (e.g. out of latitude range)."""


def _pyproj():
    try:
        import pyproj
    except ImportError:
        raise CentrelineError(
            f"projecting the coordinates needs pyproj: {GIS_EXTRA} (or give plane "
            "coordinates with --crs plane-m, plane-ft or plane-usft)"
        ) from None
    return pyproj


@lru_cache(maxsize=64)
def _resolve(text: str, origin: str):
    """(pyproj CRS of the horizontal part, kind 'geographic'|'projected')."""
    pyproj = _pyproj()
    try:
        crs = pyproj.CRS.from_user_input(text)
    except pyproj.exceptions.CRSError as exc:
        shown = text if len(text) <= 60 else text[:60] + "..."
        raise CentrelineError(
            f"coordinate system from {origin}: pyproj cannot read {shown!r} ({exc})"
        ) from None
    if crs.is_compound:
        crs = next((c for c in crs.sub_crs_list if c.is_geographic or c.is_projected), crs)
    if crs.is_projected:
        return crs, "projected"
    if crs.is_geographic:
        return crs, "geographic"
    raise CentrelineError(
        f"coordinate system from {origin} ({crs.name}) is neither geographic nor projected; "
        "give one that is with --crs"
    )


def _tmerc(crs, lon0: float, lat0: float):
    """A transformer (degrees on the CRS's ellipsoid -> metres) to the local TM."""
    pyproj = _pyproj()
    e = crs.ellipsoid
    return pyproj.Transformer.from_pipeline(
        f"+proj=tmerc +lat_0={lat0!r} +lon_0={lon0!r} +k=1 +x_0=0 +y_0=0 "
        f"+a={e.semi_major_metre!r} +b={e.semi_minor_metre!r}"
    )


def tm_scale_error(x: np.ndarray, lat_deg: np.ndarray, a: float, b: float) -> float:
    """Largest k - 1 of a scale-1 transverse Mercator at distances x [m] from its central
    meridian, latitudes ``lat_deg``: (1 + e'^2 cos^2 phi) x^2 / (2 N^2) (see the module)."""
    phi = np.radians(lat_deg)
    e2 = 1.0 - (b / a) ** 2
    ep2 = e2 / (1.0 - e2)
    n = a / np.sqrt(1.0 - e2 * np.sin(phi) ** 2)
    k1 = (1.0 + ep2 * np.cos(phi) ** 2) * np.asarray(x) ** 2 / (2.0 * n**2)
    return float(np.max(k1)) if k1.size else 0.0


def _geographic(parts, crs) -> tuple[list[tuple[np.ndarray, np.ndarray]], float, str]:
    factor = crs.axis_info[0].unit_conversion_factor  # radians per unit
    to_deg = math.degrees(factor)
    lon_parts = [p[:, 0] * to_deg for p in parts]
    lat_parts = [p[:, 1] * to_deg for p in parts]
    lat_all = np.concatenate(lat_parts)
    lon_all = np.concatenate(lon_parts)
    finite = np.isfinite(lat_all) & np.isfinite(lon_all)
    if not finite.any():
        raise FeatureProblem("no finite coordinates")
    if np.any(np.abs(lat_all[finite]) > 90.0) or np.any(np.abs(lon_all[finite]) > 540.0):
        raise FeatureProblem(
            "coordinates outside longitude/latitude range (the file may be projected: give "
            "its coordinate system with --crs)"
        )
    # longitudes unwrapped about the first vertex, so a line across 180 degrees is whole
    ref = lon_all[finite][0]
    lon_parts = [((lon - ref + 180.0) % 360.0) - 180.0 + ref for lon in lon_parts]
    lon_all = np.concatenate(lon_parts)
    lon0 = float(np.nanmin(lon_all) + np.nanmax(lon_all)) / 2.0
    lat0 = float(np.nanmin(lat_all) + np.nanmax(lat_all)) / 2.0
    tm = _tmerc(crs, lon0, lat0)
    out = []
    for lon, lat in zip(lon_parts, lat_parts, strict=True):
        x, y = tm.transform(lon, lat)
        out.append((np.asarray(x, dtype=float), np.asarray(y, dtype=float)))
    xs = np.concatenate([x for x, _ in out])
    e = crs.ellipsoid
    ok = np.isfinite(xs)
    scale = tm_scale_error(xs[ok], lat_all[ok], e.semi_major_metre, e.semi_minor_metre)
    return out, scale, "local transverse Mercator"


@lru_cache(maxsize=64)
def _grid_factors(text: str, origin: str):
    """(metres per unit, Proj, transformer to geographic) of a projected CRS."""
    pyproj = _pyproj()
    crs, _ = _resolve(text, origin)
    to_geo = pyproj.Transformer.from_crs(crs, crs.geodetic_crs, always_xy=True)
    return crs.axis_info[0].unit_conversion_factor, pyproj.Proj(crs), to_geo


def _projected(parts, source: SourceCrs, crs):
    unit, proj, to_geo = _grid_factors(source.text, source.origin)
    out = [(p[:, 0] * unit, p[:, 1] * unit) for p in parts]
    scale = 0.0
    first = np.concatenate(parts)
    first = first[np.all(np.isfinite(first), axis=1)]
    if len(first):
        lon, lat = to_geo.transform(first[0, 0], first[0, 1])
        try:
            f = proj.get_factors(lon, lat)
            scale = max(f.meridional_scale - 1.0, f.parallel_scale - 1.0, key=abs)
        except Exception:  # noqa: BLE001 - a point the projection cannot evaluate
            scale = math.nan
    return out, float(scale), f"grid of {crs.name}"


def to_plane(feature: LineFeature) -> PlaneFeature:
    """The feature's parts in metres on a plane (see the module); FeatureProblem when its
    coordinates cannot be, CentrelineError when its coordinate system cannot be read."""
    source = feature.crs
    parts = [np.asarray(p, dtype=float).reshape(-1, 2) for p in feature.parts]
    if source.plane_unit is not None:
        unit = source.plane_unit
        xy = [(p[:, 0] * unit, p[:, 1] * unit) for p in parts]
        scale, plane = 0.0, "plane grid"
    else:
        crs, kind = _resolve(source.text, source.origin)
        if kind == "geographic":
            xy, scale, plane = _geographic(parts, crs)
        else:
            xy, scale, plane = _projected(parts, source, crs)
    pieces, bad = _finite_pieces(xy)
    notes = (
        (f"{bad} vertex/vertices without finite coordinates dropped: the line is split "
         "there and the station runs on from piece to piece (the gap not counted)",)
        if bad else ()
    )  # fmt: skip
    return PlaneFeature(feature, _join(pieces), scale, plane, notes)


def _finite_pieces(xy):
    """The parts split at vertices whose plane coordinates are not finite (NaN in the
    file, or beyond the projection); (pieces, vertices dropped)."""
    pieces, bad = [], 0
    for x, y in xy:
        ok = np.isfinite(x) & np.isfinite(y)
        bad += int(np.count_nonzero(~ok))
        if ok.all():
            pieces.append((x, y))
            continue
        edges = np.flatnonzero(np.diff(np.r_[0, ok.astype(np.int8), 0]))
        for a, b in zip(edges[::2], edges[1::2], strict=True):
            pieces.append((x[a:b], y[a:b]))
    return pieces, bad


def _length(x: np.ndarray, y: np.ndarray) -> float:
    d = np.hypot(np.diff(x), np.diff(y))
    return float(np.sum(d[np.isfinite(d)]))


def _join(xy: list[tuple[np.ndarray, np.ndarray]]) -> tuple[PlaneLine, ...]:
    """Parts whose end meets the next one's start (within JOIN_GAP) as one line; the
    station runs on from line to line."""
    merged: list[tuple[np.ndarray, np.ndarray]] = []
    for x, y in xy:
        if len(x) == 0:
            continue
        if merged:
            px, py = merged[-1]
            if math.hypot(x[0] - px[-1], y[0] - py[-1]) <= JOIN_GAP:
                merged[-1] = (np.concatenate([px, x[1:]]), np.concatenate([py, y[1:]]))
                continue
        merged.append((x, y))
    lines, station = [], 0.0
    for x, y in merged:
        lines.append(PlaneLine(x, y, station))
        station += _length(x, y)
    return tuple(lines)
