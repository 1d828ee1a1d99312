"""`curvetui find-curves` end to end on GeoJSON generated here, then `curvetui batch` on
the register it wrote. The centrelines are laid out on the WGS 84 ellipsoid with
pyproj.Geod (tangent, circular arc of known radius and deflection, tangent), so the
expected radius and deflection are the ones laid out; the tolerances (2 % radius, 1 degree)
are the finder's accuracy goals from issue 16 (no external source). Road names are
invented."""

from __future__ import annotations

import csv
import json
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).parents[1] / "storage"))
from centreline_samples import geodesic_alignment, write_geojson  # noqa: E402

from curvetui import CAUTION  # noqa: E402
from curvetui.cli import main  # noqa: E402

FOOT = 0.3048  # international foot, exact (1959 agreement)


def _centrelines(tmp_path: Path, extra=None) -> Path:
    lines = {
        "QM-1": geodesic_alignment(-2.31, 53.71, 40.0, 300.0, 40.0, turn="right"),
        "QM-2": geodesic_alignment(-2.30, 53.70, 120.0, 150.0, 60.0, turn="left"),
    }
    return write_geojson(tmp_path / "quillmere.geojson", lines, extra)


def _rows(path: Path) -> list[dict]:
    with open(path, newline="") as fh:
        return list(csv.DictReader(fh))


DEGENERATE = [
    {"type": "Feature", "id": "two", "properties": {},
     "geometry": {"type": "LineString", "coordinates": [[-2.3, 53.7], [-2.299, 53.7]]}},
    {"type": "Feature", "id": "zero", "properties": {},
     "geometry": {"type": "LineString", "coordinates": [[-2.3, 53.7]] * 4}},
    {"type": "Feature", "id": "stop", "properties": {},
     "geometry": {"type": "Point", "coordinates": [-2.3, 53.7]}},
]  # fmt: skip


def test_register_then_batch(tmp_path, capsys):
    src = _centrelines(tmp_path, DEGENERATE)
    before = src.read_bytes()
    reg = tmp_path / "register.csv"
    assert main(["find-curves", str(src), "-o", str(reg), "--speed", "60"]) == 0
    assert src.read_bytes() == before
    rows = _rows(reg)
    assert list(rows[0])[:16] == [
        "id", "kind", "feature", "begin_station", "end_station", "radius", "deflection",
        "direction", "curve_length", "spiral_in", "spiral_out", "curve_type", "relation",
        "tangent_before", "fit_rms", "speed",
    ]  # fmt: skip
    assert [(r["id"], r["feature"], r["direction"]) for r in rows] == [
        ("QM-1-1", "QM-1", "right"),
        ("QM-2-1", "QM-2", "left"),
    ]
    for row, radius, deflection in zip(rows, (300.0, 150.0), (40.0, 60.0), strict=True):
        assert float(row["radius"]) == pytest.approx(radius, rel=0.02)
        assert float(row["deflection"]) == pytest.approx(deflection, abs=1.0)
        # laid out: the arc starts 200 m from the first vertex (within 5 % of the arc)
        arc = radius * deflection * 3.141592653589793 / 180
        assert float(row["begin_station"]) == pytest.approx(200.0, abs=0.05 * arc)
        assert float(row["end_station"]) - float(row["begin_station"]) == pytest.approx(
            float(row["curve_length"]), abs=0.01
        )
        assert row["kind"] == "road" and row["speed"] == "60"
    err = " ".join(capsys.readouterr().err.split())
    assert "4 line feature(s), 1 other feature(s) skipped" in err
    assert "skipped 1: a point (not a line)" in err
    assert "feature two:" in err and "feature zero:" in err  # degenerate: told, not raised
    assert "Curves found: 2" in err and "lengths and stations in m" in err
    assert f"Next: curvetui batch {reg} --units metric" in err
    assert " ".join(CAUTION.split()) in err

    out = tmp_path / "checked.csv"
    code = main(["batch", str(reg), "-o", str(out), "--units", "metric"])
    checked = _rows(out)
    assert code in (0, 1)
    assert [r["id"] for r in checked] == ["QM-1-1", "QM-2-1"]
    assert all(r["status"] in ("pass", "fail") for r in checked), [r["messages"] for r in checked]
    assert checked[0]["curve_type"] == "simple"  # the register's columns carried through


def test_us_units_parquet_and_posted_speed(tmp_path, capsys):
    import pyarrow.parquet as pq

    lines = {"H-7": geodesic_alignment(-2.3, 53.7, 10.0, 300.0, 40.0)}
    src = tmp_path / "harrowby.geojson"
    write_geojson(src, lines)
    doc = json.loads(src.read_text())
    doc["features"][0]["properties"]["limit"] = "50 km/h"
    src.write_text(json.dumps(doc))
    reg = tmp_path / "register.parquet"
    args = ["find-curves", str(src), "-o", str(reg), "--units", "us", "--posted-field", "limit"]
    assert main([*args, "--keep", "name"]) == 0
    table = pq.read_table(reg).to_pylist()
    assert table[0]["radius"] == pytest.approx(300.0 / FOOT, rel=0.02)
    # 50 km/h in mph: 50 / 3.6 / 0.44704 (the mile is 1609.344 m exactly)
    assert table[0]["posted_speed"] == pytest.approx(50 / 3.6 / 0.44704, abs=1e-3)
    assert table[0]["speed"] == table[0]["posted_speed"]
    assert table[0]["name"] == "Quillmere lane H-7"
    err = " ".join(capsys.readouterr().err.split())
    assert "speed column is the posted speed" in err and "lengths and stations in ft" in err


def test_an_existing_register_is_kept_as_bak(tmp_path, capsys):
    src = _centrelines(tmp_path)
    reg = tmp_path / "register.csv"
    reg.write_text("earlier register\n")
    assert main(["find-curves", str(src), "-o", str(reg)]) == 0
    assert (tmp_path / "register.csv.bak").read_text() == "earlier register\n"
    assert all(r["speed"] == "" for r in _rows(reg))
    assert "speed column is blank" in " ".join(capsys.readouterr().err.split())


@pytest.mark.parametrize(
    "extra, says",
    [
        (["--keep", "radius"], "--keep: radius would clash"),
        (["--speed", "0"], "--speed: must be above"),
        (["--spacing", "1000"], "--spacing: must be"),
        (["--kind", "rail", "--posted-field", "x"], "--posted-field"),
        (["--layer", "a"], "--layer: only a GeoPackage"),
        (["--jobs", "0"], "--jobs: must be 1 to 256"),
    ],
)
def test_bad_options_exit_2_with_a_message(tmp_path, capsys, extra, says):
    src = _centrelines(tmp_path)
    reg = tmp_path / "r.csv"
    assert main(["find-curves", str(src), "-o", str(reg), *extra]) == 2
    assert says in " ".join(capsys.readouterr().err.split())
    assert not reg.exists()


def test_bad_files_exit_2_without_a_traceback(tmp_path, capsys):
    reg = tmp_path / "r.csv"
    assert main(["find-curves", str(tmp_path / "none.geojson"), "-o", str(reg)]) == 2
    assert "no such file" in capsys.readouterr().err
    points = tmp_path / "p.geojson"
    points.write_text('{"type": "Point", "coordinates": [1, 2]}')
    assert main(["find-curves", str(points), "-o", str(reg)]) == 2
    err = capsys.readouterr().err
    assert "holds no line features" in err and "Traceback" not in err
    src = _centrelines(tmp_path)
    assert main(["find-curves", str(src), "-o", str(src)]) == 2
    assert "would overwrite the input" in capsys.readouterr().err


def _plane_alignment(radius: float, deflection: float, tangent: float = 200.0, step: float = 2.0):
    """Tangent, arc, tangent in a plane (exact analytic geometry), turning left, in m."""
    import numpy as np

    t = np.arange(0.0, tangent + step / 2, step)
    first = np.column_stack([t, np.zeros_like(t)])
    theta = np.radians(deflection)
    a = np.linspace(0.0, theta, max(int(radius * theta / step), 2) + 1)[1:]
    arc = np.column_stack([tangent + radius * np.sin(a), radius * (1 - np.cos(a))])
    end = arc[-1]
    last = end + np.column_stack([t[1:] * np.cos(theta), t[1:] * np.sin(theta)])
    return np.vstack([first, arc, last])


def test_other_formats_end_to_end(tmp_path, capsys):
    from centreline_samples import (
        gpkg_blob,
        line_wkt,
        wkb_linestring,
        write_geopackage,
        write_shapefile,
    )

    lonlat = geodesic_alignment(-2.3, 53.7, 75.0, 250.0, 35.0)
    gpkg = write_geopackage(
        tmp_path / "c.gpkg", [("Mill Lane", gpkg_blob(wkb_linestring(lonlat), 4326))]
    )
    shp = write_shapefile(tmp_path / "c.shp", {"Mill Lane": [lonlat]})
    wkt = tmp_path / "c.csv"
    wkt.write_text(f'id,wkt\nML,"{line_wkt(_plane_alignment(250.0, 35.0) / FOOT)}"\n')
    runs = [
        (gpkg, ["--id-field", "name"], "Mill Lane-1"),
        (shp, ["--id-field", "name"], "Mill Lane-1"),
        (wkt, ["--crs", "plane-ft"], "ML-1"),
    ]
    for path, extra, ident in runs:
        reg = tmp_path / f"{path.suffix[1:]}.csv"
        assert main(["find-curves", str(path), "-o", str(reg), *extra]) == 0, capsys.readouterr()
        (row,) = _rows(reg)
        assert row["id"] == ident
        assert float(row["radius"]) == pytest.approx(250.0, rel=0.02)
        assert float(row["deflection"]) == pytest.approx(35.0, abs=1.0)
    assert row["direction"] == "left"


def test_without_pyproj_the_extra_is_named(tmp_path, capsys, monkeypatch):
    from curvetui.finder import projection

    src = _centrelines(tmp_path)
    projection._resolve.cache_clear()
    monkeypatch.setitem(sys.modules, "pyproj", None)
    assert main(["find-curves", str(src), "-o", str(tmp_path / "r.csv")]) == 2
    err = capsys.readouterr().err
    assert "pip install 'curvetui[gis]'" in err and "Traceback" not in err
    projection._resolve.cache_clear()


def test_standard_output_and_register_notes(tmp_path, capsys):
    lines = {"R": geodesic_alignment(-2.3, 53.7, 10.0, 300.0, 40.0)}
    src = write_geojson(tmp_path / "dup.geojson", lines)
    doc = json.loads(src.read_text())
    doc["features"].append(doc["features"][0])  # the same id twice
    src.write_text(json.dumps(doc))
    assert main(["find-curves", str(src), "-o", "-", "--keep", "colour", "--speed", "50"]) == 0
    captured = capsys.readouterr()
    rows = list(csv.DictReader(captured.out.splitlines()))
    assert [r["id"] for r in rows] == ["R-1", "R-1"] and rows[0]["colour"] == ""
    err = " ".join(captured.err.split())
    assert "1 feature id(s) occur more than once (R)" in err
    assert "--keep colour: no feature has it" in err
    assert "Next: ... | curvetui batch - --units metric" in err
    assert not (tmp_path / "-").exists()


def test_a_finder_defect_is_told_and_the_rest_still_run(tmp_path, capsys, monkeypatch):
    import curvetui.core.curve_finder as finder_module

    real = finder_module.find_curves
    calls = []

    def flaky(x, y, settings=None):
        calls.append(1)
        if len(calls) == 1:
            raise ZeroDivisionError("a defect")
        return real(x, y, settings) if settings is not None else real(x, y)

    monkeypatch.setattr(finder_module, "find_curves", flaky)
    reg = tmp_path / "r.csv"
    assert main(["find-curves", str(_centrelines(tmp_path)), "-o", str(reg)]) == 3
    assert [r["feature"] for r in _rows(reg)] == ["QM-2"]
    err = " ".join(capsys.readouterr().err.split())
    assert "feature QM-1: not searched: the curve finder failed (ZeroDivisionError)" in err


def test_zone_edge_and_repeated_vertices_through_the_finder(tmp_path, capsys):
    import numpy as np

    # the same alignment laid out across the UTM 31/32 zone edge (6 degrees east) and in
    # mid-zone (3 degrees east); and the mid-zone one with every vertex written twice
    edge = geodesic_alignment(5.999, 50.0, 90.0, 300.0, 40.0)
    mid = geodesic_alignment(2.999, 50.0, 90.0, 300.0, 40.0)
    doubled = np.repeat(mid, 2, axis=0)
    src = write_geojson(tmp_path / "e.geojson", {"edge": edge, "mid": mid, "dup": doubled})
    reg = tmp_path / "r.csv"
    assert main(["find-curves", str(src), "-o", str(reg), "--speed", "60"]) == 0
    radius = {r["feature"]: float(r["radius"]) for r in _rows(reg)}
    assert radius["edge"] == pytest.approx(300.0, rel=0.02)
    assert radius["edge"] == pytest.approx(radius["mid"], rel=1e-4)
    assert radius["dup"] == pytest.approx(radius["mid"], rel=1e-4)
