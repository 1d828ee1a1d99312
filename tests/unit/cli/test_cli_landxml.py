"""`curvetui landxml import` and `landxml export` as a user runs them: the project made from
the hand-written file (see tests/unit/storage/test_landxml_reader.py for its hand-worked
PIs), files created exclusively, never written over the input, messages without
tracebacks, the caution line."""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest

from curvetui.cli import main
from curvetui.storage.landxml.reader import read_landxml

DATA = Path(__file__).resolve().parents[2] / "data" / "landxml"
PI2_E = 150 + 200.52054 * math.tan(math.radians(15)) + 24.98698  # by hand, as in the file


def run(args, capsys):
    code = main(args)
    out, err = capsys.readouterr()
    assert "Traceback" not in out + err
    return code, " ".join(out.split()), err  # Rich wraps long lines


def test_import_makes_the_project(tmp_path, capsys):
    project = tmp_path / "fen.json"
    code, out, _ = run(
        [
            "landxml",
            "import",
            str(DATA / "two-bends-metric.xml"),
            "-o",
            str(project),
            "--speed",
            "60",
        ],
        capsys,
    )
    assert code == 0
    assert "qualified engineer" in out
    assert "Profile at line 52: left out" in out
    data = json.loads(project.read_text())
    assert data["details"] == {
        "name": "Harrowgate Fen access road (invented)",
        "units": "metric",
        "notes": "Alignment 'Fen Lane' imported from LandXML.",
    }
    a = data["alignment"]
    assert a["name"] == "Fen Lane" and a["start_station"] == 1000
    assert [p.get("bend") for p in a["points"]] == [None, "PI-01", "PI-02", None]
    assert a["points"][2]["easting"] == pytest.approx(PI2_E, abs=2e-4)
    one, two = (b["inputs"] for b in data["bends"])
    assert one == {
        "speed": 60,
        "radius": 50,
        "deflection": pytest.approx(90, abs=1e-4),
        "pi_station": pytest.approx(1150, abs=1e-3),
    }  # 1000 + 100 + T 50
    assert two["radius"] == 200 and two["spiral_in"] == 50 and "spiral_out" not in two
    # bend 2's PI station: ST of bend 1 (1000 + 100 + 25 pi) + 100 m of line + T 78.71630
    assert two["pi_station"] == pytest.approx(1000 + 100 + 25 * math.pi + 100 + 78.71630, abs=1e-3)
    assert [b["notes"].split(";")[0] for b in data["bends"]] == ["turns right", "turns left"]


def test_import_never_overwrites_and_checks_speed(tmp_path, capsys):
    project = tmp_path / "fen.json"
    project.write_text("keep")
    src = str(DATA / "two-bends-metric.xml")
    code, _, err = run(["landxml", "import", src, "-o", str(project), "--speed", "60"], capsys)
    assert code == 2 and "already exists" in err and project.read_text() == "keep"
    other = tmp_path / "other.json"
    code, _, err = run(["landxml", "import", src, "-o", str(other), "--speed", "900"], capsys)
    assert code == 2 and "speed" in err and "400" in err and not other.exists()
    code, _, err = run(
        ["landxml", "import", src, "-o", str(tmp_path / "x.txt"), "--speed", "9"], capsys
    )
    assert code == 2 and "must end in .json" in err


def test_export_and_import_back_in_feet(tmp_path, capsys):
    project = tmp_path / "fen.json"
    src = DATA / "two-bends-feet.xml"
    assert run(["landxml", "import", str(src), "-o", str(project), "--speed", "40"], capsys)[0] == 0
    xml = tmp_path / "fen.xml"
    code, out, _ = run(["landxml", "export", str(project), "-o", str(xml)], capsys)
    assert code == 0 and "2 Spiral (clothoid) and 2 Curve elements, us units" in out
    assert "qualified engineer" in out
    again = read_landxml(xml).chain
    first = read_landxml(src).chain
    for p, q in zip(first.points, again.points, strict=True):
        assert math.dist(p, q) < 1e-3
    assert again.radii == pytest.approx(first.radii, abs=1e-6)
    assert again.spirals_in == pytest.approx(first.spirals_in, abs=1e-6)
    assert 'linearUnit="foot"' in xml.read_text()


def test_export_refuses_to_write_over_files(tmp_path, capsys):
    project = tmp_path / "fen.json"
    src = str(DATA / "two-bends-metric.xml")
    assert run(["landxml", "import", src, "-o", str(project), "--speed", "60"], capsys)[0] == 0
    before = project.read_bytes()
    link = tmp_path / "fen-link.xml"
    link.symlink_to(project)
    code, _, err = run(["landxml", "export", str(project), "-o", str(link), "--overwrite"], capsys)
    assert code == 2 and "is the project file itself" in err
    assert project.read_bytes() == before
    xml = tmp_path / "out.xml"
    xml.write_text("old")
    code, _, err = run(["landxml", "export", str(project), "-o", str(xml)], capsys)
    assert code == 2 and "--overwrite" in err and xml.read_text() == "old"
    code, _, _ = run(["landxml", "export", str(project), "-o", str(xml), "--overwrite"], capsys)
    assert code == 0 and "<LandXML" in xml.read_text()
    assert (tmp_path / "out.xml.bak").read_text() == "old"
    assert project.read_bytes() == before


def test_export_without_alignment_and_bad_projects(tmp_path, capsys):
    plain = tmp_path / "plain.json"
    assert run(["new", str(plain)], capsys)[0] == 0
    code, _, err = run(["landxml", "export", str(plain), "-o", str(tmp_path / "a.xml")], capsys)
    assert code == 2 and "the project has no alignment" in err
    broken = tmp_path / "broken.json"
    broken.write_text("{")
    code, _, err = run(["landxml", "export", str(broken), "-o", str(tmp_path / "a.xml")], capsys)
    assert code == 2 and "not valid JSON" in err
    assert not (tmp_path / "a.xml").exists()


def test_us_project_exports_in_feet_and_a_bad_reference_is_named(tmp_path, capsys):
    """A US project's alignment (ft) goes out as the chain in metres: 1 ft = 0.3048 m
    exactly (international foot, NIST SP 811)."""
    data = {
        "curvetui_project_version": 3,
        "details": {"units": "us", "name": "x"},
        "bends": [
            {"id": "B1", "kind": "road", "inputs": {"speed": 40, "radius": 500, "spiral_in": 100}}
        ],
        "alignment": {
            "name": "n",
            "start_station": 100,
            "points": [
                {"easting": 0, "northing": 0},
                {"easting": 0, "northing": 1000, "bend": "B1"},
                {"easting": 1000, "northing": 1000},
            ],
        },
    }
    from curvetui.storage.landxml.project_glue import laid_out_chain
    from curvetui.storage.project.files import parse_project

    chain, _ = laid_out_chain(parse_project(data))
    assert chain.radii == (500 * 0.3048,) and chain.spirals_out == (100 * 0.3048,)
    assert chain.points[1] == (0, 1000 * 0.3048) and chain.start_station == 100 * 0.3048
    data["alignment"]["points"][1]["bend"] = "B9"
    path = tmp_path / "bad.json"
    path.write_text(json.dumps(data))
    code, _, err = run(["landxml", "export", str(path), "-o", str(tmp_path / "a.xml")], capsys)
    assert code == 2 and "points[1].bend: 'B9' is not a bend of this project" in err
    assert not (tmp_path / "a.xml").exists()


def test_help(capsys):
    with pytest.raises(SystemExit) as exit_:
        main(["landxml", "import", "--help"])
    assert exit_.value.code == 0
    assert "never overwritten" in capsys.readouterr().out


def test_export_checks_the_bends_and_points(tmp_path, capsys):
    project = tmp_path / "fen.json"
    src = str(DATA / "two-bends-metric.xml")
    assert run(["landxml", "import", src, "-o", str(project), "--speed", "60"], capsys)[0] == 0
    data = json.loads(project.read_text())
    data["bends"][0]["inputs"]["radius"] = 1e-300  # below the field's 1 m
    project.write_text(json.dumps(data))
    code, _, err = run(["landxml", "export", str(project), "-o", str(tmp_path / "a.xml")], capsys)
    assert code == 2 and "$.bends[0].inputs.radius" in err
    data["bends"][0]["inputs"]["radius"] = 50
    data["alignment"]["points"][1]["bend"] = ["PI-01"]
    project.write_text(json.dumps(data))
    code, _, err = run(["landxml", "export", str(project), "-o", str(tmp_path / "a.xml")], capsys)
    assert code == 2 and "$.alignment.points[1].bend: must be string" in err
    data["alignment"]["points"][1] = {"easting": 1e300, "northing": 0, "bend": "PI-01"}
    project.write_text(json.dumps(data))
    code, _, err = run(["landxml", "export", str(project), "-o", str(tmp_path / "a.xml")], capsys)
    assert code == 2 and "points[1].easting: must be a number from -1e+09 to 1e+09" in err
    assert not (tmp_path / "a.xml").exists()


def test_the_demo_project_goes_out_and_comes_back_unchanged(tmp_path, capsys):
    """Project -> LandXML -> new project: every point within 1 mm, every deflection within
    1e-6 degree, radii, spirals and PI stations as the demo's (issue 15's round-trip
    tolerances; the demo is invented data, used here only as a shape to carry through)."""
    demo = Path(__file__).parents[3] / "projects" / "quillmere-valley-road.json"
    xml, back = tmp_path / "qv.xml", tmp_path / "qv.json"
    assert run(["landxml", "export", str(demo), "-o", str(xml)], capsys)[0] == 0
    assert run(["landxml", "import", str(xml), "-o", str(back), "--speed", "80"], capsys)[0] == 0
    before, after = json.loads(demo.read_text()), json.loads(back.read_text())
    a, b = before["alignment"], after["alignment"]
    assert a["name"] == b["name"] and abs(a["start_station"] - b["start_station"]) < 1e-3
    assert len(a["points"]) == len(b["points"])
    for p, q in zip(a["points"], b["points"], strict=True):
        assert abs(p["easting"] - q["easting"]) < 1e-3
        assert abs(p["northing"] - q["northing"]) < 1e-3
    demo_bends = {x["id"]: x["inputs"] for x in before["bends"]}
    for p, q in zip(a["points"][1:-1], after["bends"], strict=True):
        mine, theirs = demo_bends[p["bend"]], q["inputs"]
        assert abs(mine["radius"] - theirs["radius"]) < 1e-3
        assert abs(mine.get("spiral_in", 0) - theirs.get("spiral_in", 0)) < 1e-3
        assert abs(mine["pi_station"] - theirs["pi_station"]) < 1e-3
        assert abs(abs(mine["deflection"]) - theirs["deflection"]) < 1e-6
