"""`curvetui new FILE.json --points PIS.csv --speed V`: a road project on a chain of PIs,
each bend its proposal for the deflection the points give, the alignment's verdicts
printed at once.

Checks against hand calculation written out here:
- deflections from bearings (whole-circle, clockwise from north): bearing = atan2(dE, dN);
  deflection = bearing ahead - bearing back, right positive;
- R_min = V^2 / (127 (e_max + f_max)) (Green Book 2018 Eq. 3-10, metric) with f_max 0.14 at
  80 km/h and 0.12 at 100 km/h (Green Book 2018 Table 3-7, as the shipped table gives it);
- a simple curve's tangent length T = R tan(delta / 2) (checked below on REFERENCES.md's
  simple-curve example: delta 60 deg, R 150 ft, T 86.60 ft, read from a surveying reference).
The coordinates are invented (demo data).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest

from curvetui import CAUTION
from curvetui.cli import main
from curvetui.cli.new_points_cmd import OVERLAP_ADVICE


def write(tmp_path, text: str):
    path = tmp_path / "pis.csv"
    path.write_text(text, encoding="utf-8")
    return str(path)


def flat(text: str) -> str:
    return " ".join(text.split())


# start, PI 1..3, end (metres). Legs and bearings, by hand:
#   start (0,0)       -> PI1 (0,2000):    dE 0,    dN 2000: bearing 0 deg
#   PI1 (0,2000)      -> PI2 (2000,4000): dE 2000, dN 2000: bearing 45 deg, leg 2828.43 m
#   PI2 (2000,4000)   -> PI3 (2000,7000): dE 0,    dN 3000: bearing 0 deg
#   PI3 (2000,7000)   -> end (5000,7000): dE 3000, dN 0:    bearing 90 deg
# deflections: PI1 45 - 0 = +45 (right), PI2 0 - 45 = -45 (left), PI3 90 - 0 = +90 (right)
FAR = "id,easting,northing\nstart,0,0\nK-1,0,2000\nK-2,2000,4000\nK-3,2000,7000\nend,5000,7000\n"
HAND_DEFLECTIONS = {"K-1": 45.0, "K-2": 45.0, "K-3": 90.0}
HAND_DIRECTIONS = {"K-1": "R", "K-2": "L", "K-3": "R"}


def test_far_apart_pis_give_passing_bends_with_the_hand_deflections(tmp_path, capsys):
    project = tmp_path / "k.json"
    code = main(["new", str(project), "--points", write(tmp_path, FAR), "--speed", "80"])
    text = flat(capsys.readouterr().out)
    assert code == 0, text
    data = json.loads(project.read_text(encoding="utf-8"))
    bends = {b["id"]: b for b in data["bends"]}
    assert list(bends) == ["K-1", "K-2", "K-3"]
    r_min = 80**2 / (127 * (0.08 + 0.14))  # 229.06 m, e_max 8 % (the table's default)
    for bend_id, deflection in HAND_DEFLECTIONS.items():
        inputs = bends[bend_id]["inputs"]
        assert bends[bend_id]["kind"] == "road" and inputs["speed"] == 80
        assert inputs["deflection"] == pytest.approx(deflection, abs=1e-9)
        assert inputs["radius"] >= r_min
    # the points as given, the start and end naming no bend
    assert [p.get("bend") for p in data["alignment"]["points"]] == [None, "K-1", "K-2", "K-3", None]
    # room on every leg: T = R tan(delta / 2) each side (no spiral: R above the table's
    # largest radius for a spiral; with a spiral T only grows by about Ls / 2, still far less)
    t = {
        i: bends[i]["inputs"]["radius"] * math.tan(math.radians(d) / 2)
        for i, d in HAND_DEFLECTIONS.items()
    }
    assert t["K-1"] < 2000 and t["K-1"] + t["K-2"] < 2828.43 and t["K-2"] + t["K-3"] < 3000
    assert t["K-3"] < 3000
    # the same project checked: every bend and the alignment pass, directions as by hand
    main(["check", "--project", str(project), "--json"])
    out = json.loads(capsys.readouterr().out)
    assert [b["status"] for b in out["bends"]] == ["pass"] * 3
    assert out["alignment"]["status"] == "pass" and out["alignment"]["verdicts"] == []
    assert {r["bend"]: r["direction"] for r in out["alignment"]["pis"]} == HAND_DIRECTIONS
    assert "Created" in text and "Alignment k: PASS" in text and CAUTION in text


def test_the_tangent_formula_on_the_reference_example():
    # REFERENCES.md, curve geometry: delta 60 deg, R 150 ft -> T 86.60 ft (read)
    assert 150 * math.tan(math.radians(60) / 2) == pytest.approx(86.60, abs=0.005)


# Two PIs 300 m apart, deflections +60 and -60 (by hand: bearings 0, 60, 0 deg):
#   start (0,0) -> PI1 (0,1000): bearing 0; PI1 -> PI2 = PI1 + 300 (sin 60, cos 60)
#   = (259.807621135, 1150): bearing 60; PI2 -> end (259.807621135, 2150): bearing 0
CLOSE = "easting,northing\n0,0\n0,1000\n259.807621135,1150\n259.807621135,2150\n"


def test_pis_too_close_for_the_proposed_radii_fail_with_the_overlap_said_plainly(tmp_path, capsys):
    project = tmp_path / "close.json"
    code = main(["new", str(project), "--points", write(tmp_path, CLOSE), "--speed", "100"])
    text = flat(capsys.readouterr().out)
    assert code == 1  # the file is created, the overlap is a FAIL
    data = json.loads(project.read_text(encoding="utf-8"))
    b1, b2 = (b["inputs"] for b in data["bends"])
    # the proposal, not a radius shrunk to fit: the same as `design road` for 60 deg
    main(["design", "road", "--speed", "100", "--deflection", "60", "--json"])
    proposed = json.loads(capsys.readouterr().out)["proposed"]
    assert b1["radius"] == b2["radius"] == proposed["radius"]
    assert "spiral_in" not in b1 and "spiral_in" not in b2  # simple curves at this radius
    r = b1["radius"]
    assert r >= 100**2 / (127 * (0.08 + 0.12))  # R_min 393.70 m
    # by hand: T = R tan(60 / 2) on each side; the bends overlap by 2 T - 300
    overlap = 2 * r * math.tan(math.radians(30)) - 300
    assert overlap > 0
    main(["check", "--project", str(project), "--json"])
    verdicts = json.loads(capsys.readouterr().out)["alignment"]["verdicts"]
    found = [v for v in verdicts if v["code"] == "overlap" and v["between"] == ["B01", "B02"]]
    assert len(found) == 1 and found[0]["severity"] == "fail"
    assert found[0]["value"] == pytest.approx(-overlap, abs=0.01)  # the tangent left, < 0
    assert f"the bends overlap by {overlap:.2f} m" in text
    assert flat(OVERLAP_ADVICE) in text and "NOT reduced" in text
    assert text.index(flat(OVERLAP_ADVICE)) < text.index(CAUTION)  # the caution last


def test_never_overwrites_and_bad_options_name_the_option(tmp_path, capsys):
    pis = write(tmp_path, FAR)
    project = tmp_path / "k.json"
    project.write_text("keep", encoding="utf-8")
    assert main(["new", str(project), "--points", pis, "--speed", "80"]) == 2
    assert project.read_text(encoding="utf-8") == "keep"
    assert "already exists" in capsys.readouterr().err
    other = tmp_path / "o.json"
    assert main(["new", str(other), "--points", pis]) == 2
    assert "--speed: required with --points" in capsys.readouterr().err
    assert main(["new", str(other), "--points", pis, "--speed", "400"]) == 2
    err = capsys.readouterr().err
    assert "--speed" in err and "Traceback" not in err
    assert main(["new", str(other), "--speed", "80"]) == 2
    assert "only with --points" in capsys.readouterr().err
    assert main(["new", str(other), "--points", pis, "--speed", "80", "--start-station", "x"]) == 2
    assert "--start-station" in capsys.readouterr().err
    assert not other.exists()


def test_a_bad_points_file_names_its_rows_and_creates_nothing(tmp_path, capsys):
    pis = write(tmp_path, "easting,northing\n0,0\n1O0,5\n")
    project = tmp_path / "n.json"
    assert main(["new", str(project), "--points", pis, "--speed", "80"]) == 2
    err = capsys.readouterr().err
    assert "row 3, column easting: '1O0' is not a number" in err and "Traceback" not in err
    assert not project.exists()


def test_start_station_and_emax_and_us_units(tmp_path, capsys):
    project = tmp_path / "us.json"
    # the far chain scaled by 4 (feet now): legs 8000, 11313.7, 12000, 12000 ft
    far_us = "easting,northing\n0,0\n0,8000\n8000,16000\n8000,28000\n20000,28000\n"
    args = ["new", str(project), "--points", write(tmp_path, far_us), "--speed", "50"]
    args += ["--units", "us", "--emax", "6", "--start-station", "10+00"]
    assert main(args) == 0, capsys.readouterr().out
    data = json.loads(project.read_text(encoding="utf-8"))
    assert data["details"]["units"] == "us" and data["alignment"]["start_station"] == 1000
    first = data["bends"][0]["inputs"]
    assert first["emax"] == 6 and first["speed"] == 50
    # PI 1 is 8000 ft from the start point: its PI station is 1000 + 8000 (on the first
    # bend TS = start + 8000 - T and PI = TS + T)
    assert first["pi_station"] == pytest.approx(9000.0, abs=1e-6)


def test_the_shipped_example_file_starts_a_project(tmp_path, capsys):
    # the README's walk-through (invented data: only that the shipped file works is tested)
    example = Path(__file__).resolve().parents[3] / "projects" / "quillmere-east-link-pis.csv"
    project = tmp_path / "east-link.json"
    assert main(["new", str(project), "--points", str(example), "--speed", "80"]) == 0
    assert "Alignment east-link: PASS" in flat(capsys.readouterr().out)
