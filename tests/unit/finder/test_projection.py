"""finder.projection: longitude/latitude to a local transverse Mercator per feature, and
projected coordinates scaled to metres. References: circles laid out on the WGS 84
ellipsoid with pyproj.Geod (Karney's geodesics) of known radius; pyproj's own point scale
factors (Proj.get_factors); the EPSG definitions of UTM (scale 0.9996 on the central
meridian) and of the US survey foot (1200/3937 m)."""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pytest

sys.path.insert(0, str(Path(__file__).parents[1] / "storage"))
from centreline_samples import geodesic_circle, kasa_radius  # noqa: E402

from curvetui.finder.projection import (  # noqa: E402
    FeatureProblem,
    tm_scale_error,
    to_plane,
)
from curvetui.storage.centrelines.model import (  # noqa: E402
    WGS84_LONLAT,
    CentrelineError,
    LineFeature,
    SourceCrs,
)


def _feature(*parts, crs=WGS84_LONLAT):
    return LineFeature("A", {}, tuple(np.asarray(p, dtype=float) for p in parts), crs, 1)


def _radius(feature) -> float:
    plane = to_plane(feature)
    line = plane.lines[0]
    return kasa_radius(line.x, line.y)


@pytest.mark.parametrize("radius", [50.0, 300.0, 2000.0])
def test_geodesic_circle_keeps_its_radius(radius):
    # pyproj.Geod forward: every point at geodesic distance R from the centre; in a
    # conformal plane of scale 1 at the feature the image is a circle of radius R to
    # within the scale error (under 1e-7 here)
    circle = geodesic_circle(3.0, 45.0, radius, n=61, arc=180.0)
    assert _radius(_feature(circle)) == pytest.approx(radius, rel=1e-6)


def test_zone_edge_changes_nothing():
    # 6 degrees east is the edge between UTM zones 31 and 32 (EPSG 32631/32632): a circle
    # centred on it and one in the middle of zone 31 (3 degrees east) give the same radius
    on_edge = _radius(_feature(geodesic_circle(6.0, 52.0, 400.0, n=81, arc=300.0)))
    in_zone = _radius(_feature(geodesic_circle(3.0, 52.0, 400.0, n=81, arc=300.0)))
    assert on_edge == pytest.approx(400.0, rel=1e-6)
    assert on_edge == pytest.approx(in_zone, rel=1e-7)


def test_antimeridian_line_is_whole():
    circle = geodesic_circle(180.0, -41.0, 250.0, n=61, arc=359.0)
    circle[:, 0] = (circle[:, 0] + 180.0) % 360.0 - 180.0  # as a file writes it
    assert _radius(_feature(circle)) == pytest.approx(250.0, rel=1e-6)


@pytest.mark.parametrize("distance", [20_000.0, 100_000.0])
def test_scale_error_against_pyproj(distance):
    import pyproj

    # a scale-1 TM on the WGS 84 ellipsoid; pyproj's point scale factor at x = distance
    proj = pyproj.Proj("+proj=tmerc +lat_0=50 +lon_0=0 +k=1 +x_0=0 +y_0=0 +ellps=WGS84")
    lon, lat = proj(distance, 0.0, inverse=True)
    k = proj.get_factors(lon, lat).meridional_scale
    got = tm_scale_error(np.array([distance]), np.array([lat]), 6378137.0, 6356752.314245)
    assert got == pytest.approx(k - 1.0, rel=0.01)


def test_feature_scale_error_is_small_for_a_short_feature():
    plane = to_plane(_feature(geodesic_circle(6.0, 52.0, 400.0, n=41, arc=300.0)))
    assert plane.plane == "local transverse Mercator"
    assert 0 <= plane.scale_error < 1e-8  # (0.4 km)^2 / (2 (6380 km)^2) = 2e-9


def test_projected_crs_in_metres_and_us_feet():
    line = np.array([[500000.0, 5700000.0], [500100.0, 5700000.0]])
    utm = to_plane(_feature(line, crs=SourceCrs("EPSG:32631", "test")))
    np.testing.assert_array_equal(utm.lines[0].x, line[:, 0])
    # UTM: scale factor 0.9996 on the central meridian (EPSG method 9807 parameters)
    assert utm.scale_error == pytest.approx(-0.0004, abs=1e-7)
    assert utm.plane.startswith("grid of WGS 84 / UTM zone 31N")
    feet = to_plane(_feature(line / 10, crs=SourceCrs("EPSG:2263", "test")))  # NY, ftUS
    np.testing.assert_allclose(feet.lines[0].x, line[:, 0] / 10 * 1200 / 3937, rtol=1e-12)


def test_plane_words_and_refusals():
    line = np.array([[0.0, 0.0], [10.0, 0.0]])
    ft = to_plane(_feature(line, crs=SourceCrs("plane-ft", "--crs")))
    assert ft.lines[0].x[-1] == pytest.approx(3.048) and ft.scale_error == 0.0
    with pytest.raises(FeatureProblem, match="outside longitude/latitude"):
        to_plane(_feature(np.array([[500000.0, 5700000.0], [500100.0, 5700000.0]])))
    with pytest.raises(CentrelineError, match="from --crs: pyproj cannot read 'EPSG:999999'"):
        to_plane(_feature(line, crs=SourceCrs("EPSG:999999", "--crs")))


def test_parts_join_where_they_meet():
    a = np.array([[0.0, 0.0], [100.0, 0.0]])
    b = np.array([[100.0, 0.0], [100.0, 50.0]])
    c = np.array([[300.0, 0.0], [300.0, 30.0]])
    plane = to_plane(_feature(a, b, c, crs=SourceCrs("plane-m", "--crs")))
    assert len(plane.lines) == 2
    assert plane.lines[0].x.tolist() == [0.0, 100.0, 100.0]
    assert plane.lines[1].start_station == pytest.approx(150.0)  # gaps not counted


def test_without_pyproj_the_message_names_the_extra(monkeypatch):
    from curvetui.finder import projection

    circle = geodesic_circle(3.0, 45.0, 100.0)
    projection._resolve.cache_clear()
    monkeypatch.setitem(sys.modules, "pyproj", None)  # import pyproj raises ImportError
    with pytest.raises(CentrelineError, match=r"needs pyproj: pip install 'curvetui\[gis\]'"):
        to_plane(_feature(circle))
    line = np.array([[0.0, 0.0], [10.0, 0.0]])
    assert to_plane(_feature(line, crs=SourceCrs("plane-m", "--crs"))).lines[0].x[-1] == 10.0
    projection._resolve.cache_clear()


def test_vertices_without_coordinates_split_the_line():
    line = np.array([[0.0, 0.0], [10.0, 0.0], [np.nan, np.nan], [20.0, 0.0], [30.0, 0.0]])
    plane = to_plane(_feature(line, crs=SourceCrs("plane-m", "--crs")))
    assert [ln.x.tolist() for ln in plane.lines] == [[0.0, 10.0], [20.0, 30.0]]
    assert plane.lines[1].start_station == 10.0
    assert plane.notes and plane.notes[0].startswith("1 vertex/vertices without finite")
