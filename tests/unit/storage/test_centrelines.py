"""storage.centrelines: each reader on small files built in tmp_path. Checks are against
the formats' own definitions (RFC 7946; OGC Simple Features WKT/WKB, ISO 19125-1;
GeoPackage 1.3 clause 2.1.3; the ESRI Shapefile description via pyshp's writer): what is
written is read back unchanged, non-lines are skipped and counted, bad files raise
CentrelineError naming the file."""

from __future__ import annotations

import json
import os

import numpy as np
import pytest
from centreline_samples import (
    gpkg_blob,
    line_wkt,
    wkb_linestring,
    wkb_multilinestring,
    wkb_point,
    write_geojson,
    write_geopackage,
    write_shapefile,
)

from curvetui.storage.centrelines import CentrelineError, read_centrelines
from curvetui.storage.centrelines.wkt import WktError, parse_wkt

LINE = np.array([[-1.5, 52.1], [-1.49, 52.1], [-1.48, 52.11]])
LINE2 = np.array([[-1.48, 52.11], [-1.47, 52.12]])


def _unchanged(path):
    """The file's bytes and times, to compare after reading (a read never changes it)."""
    st = os.stat(path)
    return path.read_bytes(), st.st_mtime_ns, sorted(os.listdir(path.parent))


# --- GeoJSON ------------------------------------------------------------------------


def test_geojson_lines_read_and_others_counted(tmp_path):
    path = write_geojson(
        tmp_path / "c.geojson",
        {"A": LINE},
        extra=[
            {"type": "Feature", "properties": {}, "geometry": {"type": "Point", "coordinates": [1, 2]}},  # noqa: E501
            {"type": "Feature", "properties": {}, "geometry": None},
            {
                "type": "Feature",
                "id": 7,
                "properties": {"road": "Harrowby Rd"},
                "geometry": {"type": "MultiLineString", "coordinates": [LINE.tolist(), LINE2.tolist()]},  # noqa: E501
            },
        ],
    )  # fmt: skip
    before = _unchanged(path)
    got = read_centrelines(str(path))
    assert [f.fid for f in got.features] == ["A", "7"]
    np.testing.assert_array_equal(got.features[0].parts[0], LINE)
    assert len(got.features[1].parts) == 2
    assert got.features[1].properties == {"road": "Harrowby Rd"}
    assert got.features[0].crs.text == "OGC:CRS84"  # RFC 7946 section 4
    assert got.skipped == {"a point (not a line)": 1, "no geometry": 1}
    assert _unchanged(path) == before


def test_geojson_bare_geometry_z_dropped_and_id_field(tmp_path):
    path = tmp_path / "g.json"
    coords = [[0.0, 50.0, 12.0], [0.001, 50.0, 13.0]]
    path.write_text(json.dumps({"type": "LineString", "coordinates": coords}))
    got = read_centrelines(str(path))
    assert got.features[0].fid == "1"  # its position: no id
    np.testing.assert_array_equal(got.features[0].parts[0], [[0.0, 50.0], [0.001, 50.0]])
    doc = {
        "type": "Feature",
        "id": "x",
        "properties": {"ref": "Q12"},
        "geometry": json.loads(path.read_text()),
    }
    path.write_text(json.dumps(doc))
    assert read_centrelines(str(path), id_field="ref").features[0].fid == "Q12"
    got = read_centrelines(str(path), id_field="code")
    assert got.features[0].fid == "1" and got.notes == [
        "1 feature(s) without a 'code' property: their position in the file is their id"
    ]


def test_geojson_crs_member_honoured_and_told(tmp_path):
    path = tmp_path / "old.geojson"
    doc = {
        "type": "FeatureCollection",
        "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::27700"}},
        "features": [{"type": "Feature", "properties": {}, "geometry": {"type": "LineString", "coordinates": [[0, 0], [10, 0]]}}],  # noqa: E501
    }  # fmt: skip
    path.write_text(json.dumps(doc))
    got = read_centrelines(str(path))
    assert got.features[0].crs.text == "urn:ogc:def:crs:EPSG::27700"
    assert any("not RFC 7946" in n for n in got.notes)
    assert read_centrelines(str(path), crs="EPSG:3857").features[0].crs.text == "EPSG:3857"


@pytest.mark.parametrize(
    "text, says",
    [
        ("{not json", "not valid JSON"),
        ('{"type": "LineString", "coordinates": [[NaN, 1], [2, 3]]}', "not valid JSON"),
        ("[1, 2]", "not GeoJSON"),
        ('{"type": "FeatureCollection"}', "features"),
        ('{"type": "FeatureCollection", "crs": {"type": "link"}, "features": []}', "--crs"),
        ("[" * 100000 + "]" * 100000, "not valid JSON"),
    ],
)
def test_geojson_bad_files_named(tmp_path, text, says):
    path = tmp_path / "bad.geojson"
    path.write_text(text)
    with pytest.raises(CentrelineError) as err:
        read_centrelines(str(path))
    assert str(path) in str(err.value) and says in str(err.value)


def test_geojson_bad_geometry_is_skipped_with_a_note(tmp_path):
    path = tmp_path / "b.geojson"
    bad = {
        "type": "Feature",
        "properties": {},
        "geometry": {"type": "LineString", "coordinates": [[1, "a"]]},
    }
    path.write_text(json.dumps({"type": "FeatureCollection", "features": [bad]}))
    got = read_centrelines(str(path))
    assert got.features == [] and got.skipped == {"geometry not readable": 1}
    assert "position 1" in got.notes[0]


# --- WKT ----------------------------------------------------------------------------


def test_wkt_parser_forms():
    word, parts, srid = parse_wkt("SRID=4326;LINESTRING Z (1 2 3, 4 5 6)")
    assert (word, srid) == ("LINESTRING", 4326)
    np.testing.assert_array_equal(parts[0], [[1, 2], [4, 5]])
    word, parts, _ = parse_wkt("multilinestring ((0 0, 1 1), EMPTY, (2 2, 3 3.5))")
    assert len(parts) == 2 and parts[1][1, 1] == 3.5
    assert parse_wkt("LINESTRING ZM (1 2 3 4, 5 6 7 8)")[1][0].tolist() == [[1, 2], [5, 6]]
    assert parse_wkt("POINT (1 2)") == ("POINT", [], None)
    assert parse_wkt("LINESTRING EMPTY")[1] == []
    for bad in ("LINESTRING (1 2, 3)", "LINESTRING (1 2, 3 4", "FOO (1 2)", "", "LINESTRING (a b)"):
        with pytest.raises(WktError):
            parse_wkt(bad)


def test_wkt_csv(tmp_path):
    path = tmp_path / "lines.csv"
    rows = [
        "id;name;WKT",
        f'Q1;Quillmere Rd;"{line_wkt(LINE)}"',
        'Q2;Mill pond;"POINT (1 2)"',
        'Q3;broken;"LINESTRING (1 2,"',
        "Q4;short",
    ]
    path.write_text("\n".join(rows) + "\n")
    got = read_centrelines(str(path), crs="EPSG:4326")
    assert [f.fid for f in got.features] == ["Q1"]
    np.testing.assert_array_equal(got.features[0].parts[0], LINE)
    assert got.features[0].properties == {"id": "Q1", "name": "Quillmere Rd"}
    assert got.skipped == {
        "a point (not a line)": 1,
        "WKT not readable": 1,
        "row with the wrong number of cells": 1,
    }
    assert any(n.startswith("row 4, column WKT") for n in got.notes)


def test_wkt_csv_needs_a_crs_and_a_column(tmp_path):
    path = tmp_path / "lines.csv"
    path.write_text(f'name,shape\nA,"{line_wkt(LINE)}"\n')
    with pytest.raises(CentrelineError, match="no WKT column"):
        read_centrelines(str(path))
    with pytest.raises(CentrelineError, match="--crs"):
        read_centrelines(str(path), wkt_column="shape")
    got = read_centrelines(str(path), wkt_column="SHAPE", crs="plane-m")
    assert got.features[0].fid == "2"  # the row number: no id column
    path.write_text(f'wkt\n"SRID=27700;{line_wkt(LINE)}"\n')
    assert read_centrelines(str(path)).features[0].crs.text == "EPSG:27700"


# --- GeoPackage ---------------------------------------------------------------------


def test_geopackage_lines_points_and_z(tmp_path):
    path = write_geopackage(
        tmp_path / "c.gpkg",
        [
            ("Harrowby Rd", gpkg_blob(wkb_linestring(LINE), 4326)),
            ("stop", gpkg_blob(wkb_point(1.0, 2.0), 4326)),
            ("hill", gpkg_blob(wkb_linestring(LINE2, z=True), 4326, envelope=True)),
            ("two", gpkg_blob(wkb_multilinestring([LINE, LINE2]), 4326)),
            ("none", None),
        ],
    )
    before = _unchanged(path)
    got = read_centrelines(str(path))
    assert [f.fid for f in got.features] == ["1", "3", "4"]  # the primary key
    np.testing.assert_array_equal(got.features[0].parts[0], LINE)
    np.testing.assert_array_equal(got.features[1].parts[0], LINE2)
    assert len(got.features[2].parts) == 2
    assert got.features[0].properties == {"fid": 1, "name": "Harrowby Rd"}
    assert got.features[0].crs.text == "EPSG:4326"
    assert got.skipped == {"a point (not a line)": 1, "no geometry": 1}
    assert read_centrelines(str(path), id_field="name").features[0].fid == "Harrowby Rd"
    assert _unchanged(path) == before  # no journal, lock or -shm file beside it


def test_geopackage_layers_and_refusals(tmp_path):
    path = write_geopackage(
        tmp_path / "two.gpkg", [("a", gpkg_blob(wkb_linestring(LINE), 4326))],
        extra_layers=("rail",),
    )  # fmt: skip
    with pytest.raises(CentrelineError, match="choose one with --layer: centrelines, rail"):
        read_centrelines(str(path))
    assert read_centrelines(str(path), layer="centrelines").layer == "centrelines"
    with pytest.raises(CentrelineError, match="no features layer named 'x'"):
        read_centrelines(str(path), layer="x")
    undefined = write_geopackage(
        tmp_path / "u.gpkg", [("a", gpkg_blob(wkb_linestring(LINE), -1))], srs_id=-1,
        organization="NONE", code=-1,
    )  # fmt: skip
    with pytest.raises(CentrelineError, match="undefined"):
        read_centrelines(str(undefined))
    notdb = tmp_path / "x.gpkg"
    notdb.write_bytes(b"hello, this is not sqlite" * 50)
    with pytest.raises(CentrelineError, match="not a GeoPackage"):
        read_centrelines(str(notdb))
    wal = tmp_path / "w.gpkg"
    wal.write_bytes(path.read_bytes())
    (tmp_path / "w.gpkg-wal").write_bytes(b"")
    with pytest.raises(CentrelineError, match="write-ahead log"):
        read_centrelines(str(wal))


def test_geopackage_bad_blob_is_skipped(tmp_path):
    path = write_geopackage(
        tmp_path / "b.gpkg",
        [("cut", gpkg_blob(wkb_linestring(LINE)[:-8], 4326)), ("junk", b"XX1234567")],
    )
    got = read_centrelines(str(path))
    assert got.features == [] and got.skipped == {"geometry not readable": 2}
    assert "runs past the end" in got.notes[0] and "'GP'" in got.notes[1]


# --- Shapefile ----------------------------------------------------------------------


def test_shapefile_lines_attributes_and_prj(tmp_path):
    path = write_shapefile(tmp_path / "roads.shp", {"Quillmere Rd": [LINE], "Loop": [LINE, LINE2]})
    before = _unchanged(path)
    got = read_centrelines(str(path), id_field="name")
    assert [f.fid for f in got.features] == ["Quillmere Rd", "Loop"]
    np.testing.assert_allclose(got.features[0].parts[0], LINE)
    assert len(got.features[1].parts) == 2
    assert got.features[0].crs.origin == "the .prj file" and "WGS" in got.features[0].crs.text
    assert _unchanged(path) == before


def test_shapefile_without_prj_or_broken(tmp_path):
    path = write_shapefile(tmp_path / "noprj.shp", {"a": [LINE]}, epsg=None)
    with pytest.raises(CentrelineError, match="no .prj"):
        read_centrelines(str(path))
    assert read_centrelines(str(path), crs="EPSG:4326").features[0].fid == "1"
    path.write_bytes(b"\x00" * 40)
    with pytest.raises(CentrelineError, match="not a readable Shapefile"):
        read_centrelines(str(path), crs="EPSG:4326")


def test_unknown_ending_and_missing_file(tmp_path):
    with pytest.raises(CentrelineError, match="unknown kind of file '.kml'"):
        read_centrelines(str(tmp_path / "a.kml"))
    with pytest.raises(CentrelineError, match="no such file"):
        read_centrelines(str(tmp_path / "a.geojson"))
    with pytest.raises(CentrelineError, match="--layer: only a GeoPackage"):
        read_centrelines(str(tmp_path / "a.geojson"), layer="x")


def test_the_bundled_demo_reads():
    from pathlib import Path

    demo = Path(__file__).parents[3] / "projects" / "quillmere-centrelines.geojson"
    got = read_centrelines(str(demo))
    assert [f.fid for f in got.features] == ["QVR", "HBL", "QEL"]
    assert [len(f.parts) for f in got.features] == [1, 1, 2]
    assert got.skipped == {"a point (not a line)": 1}
