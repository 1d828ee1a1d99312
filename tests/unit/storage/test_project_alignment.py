"""A project's alignment: the file format (format 2 unchanged, format 3 with an alignment),
stations carried through to the bends, bad alignments refused with a message naming the
point, and the way back from a chain.

Stations are checked against the simple-curve worked example of REFERENCES.md (Delta 60
deg, R 150 ft: T = R tan(D/2) = 86.60 ft, L = R D = 157.08 ft; PC = PI - T, PT = PC + L,
Indiana DOT Design Manual Fig. 43-6D), written out by hand here.
"""

from __future__ import annotations

import json
import math
import re
from pathlib import Path

import pytest

from curvetui.cli import main
from curvetui.core.alignment import Chain
from curvetui.core.units import unit_system
from curvetui.storage.project.alignment_report import alignment_report
from curvetui.storage.project.chain import (
    AlignmentProblem,
    alignment_from_chain,
    chain_of,
    lay_out_project,
)
from curvetui.storage.project.checking import evaluate_project
from curvetui.storage.project.files import load_project, project_schema, save_project, validate
from curvetui.storage.project.quick_check import conforms
from curvetui.storage.project.schema import alignment_schema

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"

# the worked example, by hand (ft)
T1 = 150 * math.tan(math.radians(30))  # 86.603
L1 = 150 * math.radians(60)  # 157.080
# a second bend 600 ft on, R 300 ft, 30 deg left: T = 300 tan 15 deg = 80.385 ft
T2 = 300 * math.tan(math.radians(15))


def us_project(bends=("A", "B"), stored_deflection=10.0) -> dict:
    """Start 1000 ft south of PI 1 heading north; PI 1 turns 60 deg right; PI 2, 600 ft on,
    turns 30 deg left; the end 500 ft further. The bends' own deflection and PI station
    are wrong on purpose: the alignment replaces them."""
    s60, c60 = math.sin(math.radians(60)), math.cos(math.radians(60))
    pi2 = (600 * s60, 1000 + 600 * c60)
    end = (pi2[0] + 500 * math.sin(math.radians(30)), pi2[1] + 500 * math.cos(math.radians(30)))
    inputs = {"speed": 25, "emax": 8, "deflection": stored_deflection, "pi_station": 5.0}
    return {
        "curvetui_project_version": 3,
        "details": {"name": "Hand example", "units": "us"},
        "bends": [
            {"id": "A", "kind": "road", "inputs": {**inputs, "radius": 150}},
            {"id": "B", "kind": "road", "inputs": {**inputs, "radius": 300}},
        ],
        "alignment": {
            "name": "Hand line",
            "start_station": 0.0,
            "points": [
                {"easting": 0.0, "northing": 0.0},
                {"easting": 0.0, "northing": 1000.0, "bend": bends[0]},
                {"easting": pi2[0], "northing": pi2[1], "bend": bends[1]},
                {"easting": end[0], "northing": end[1]},
            ],
        },
    }


def write(tmp_path: Path, data: dict, name: str = "p.json") -> Path:
    path = tmp_path / name
    path.write_text(json.dumps(data, indent=2) + "\n", encoding="utf-8")
    return path


def test_stations_carried_through_against_the_hand_example(tmp_path):
    project, _ = load_project(write(tmp_path, us_project()))
    a, b = (o.record["geometry"] for o in evaluate_project(project))
    assert a["deflection"] == pytest.approx(60)  # not the stored 10
    assert a["tangent"] == pytest.approx(86.60, abs=0.005)
    assert a["length"] == pytest.approx(157.08, abs=0.005)
    assert a["pi"] == pytest.approx(1000.0)
    assert a["pc"] == pytest.approx(1000 - 86.60, abs=0.005)
    assert a["pt"] == pytest.approx(1000 - T1 + L1)
    # PI 2 along the built line: PT 1 + (600 - T1); PC 2 = PI 2 - T2
    pi2 = 1000 - T1 + L1 + 600 - T1
    assert b["deflection"] == pytest.approx(30)
    assert b["pi"] == pytest.approx(pi2)
    assert b["pc"] == pytest.approx(pi2 - T2)


def test_a_radius_changed_moves_the_stations_after_it(tmp_path):
    data = us_project()
    data["bends"][0]["inputs"]["radius"] = 200  # T = 200 tan 30, L = 200 pi / 3
    project, _ = load_project(write(tmp_path, data))
    b = evaluate_project(project)[1].record["geometry"]
    t, length = 200 * math.tan(math.radians(30)), 200 * math.pi / 3
    assert b["pi"] == pytest.approx(1000 - t + length + 600 - t)


def test_the_report_table_and_json_in_project_units(tmp_path):
    project, _ = load_project(write(tmp_path, us_project()))
    outcomes = evaluate_project(project)
    rep = alignment_report(
        project,
        lay_out_project(project),
        {o.bend.id: o.record for o in outcomes},
        unit_system("us"),
    )
    assert rep.status in ("pass", "warning")
    row = rep.rows[0]
    assert (row["bend"], row["direction"]) == ("A", "R")
    assert row["ts"] == pytest.approx(1000 - T1) and row["st"] == pytest.approx(1000 - T1 + L1)
    assert rep.rows[1]["direction"] == "L"
    assert rep.tangents[1] == pytest.approx(600 - T1 - T2)
    head, cells = rep.table()
    assert cells[0][head.index("TS/PC")] == "9+13.40"  # US stations of 100 ft
    assert json.dumps(rep.to_json())  # plain JSON


def test_format_2_file_loads_and_saves_byte_for_byte(tmp_path):
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    data.pop("alignment")
    data["curvetui_project_version"] = 2
    path = write(tmp_path, data)
    before = path.read_bytes()
    project, notes = load_project(path)
    assert project.alignment is None and notes == []
    save_project(project, path)
    assert path.read_bytes() == before
    assert json.loads(before)["curvetui_project_version"] == 2


def test_alignment_file_loads_and_saves_unchanged(tmp_path):
    path = tmp_path / "demo.json"
    path.write_bytes(DEMO.read_bytes())
    project, _ = load_project(path)
    assert project.alignment is not None and project.alignment.points[1].bend == "QV-01"
    save_project(project, path)
    assert path.read_bytes() == DEMO.read_bytes()


def test_the_legs_form_is_written_back_as_given_and_lays_out_the_same(tmp_path):
    data = us_project()
    data["alignment"] = {
        "name": "Hand line",
        "start_station": 0.0,
        "start": {"easting": 0.0, "northing": 0.0},
        "start_bearing": 0.0,
        "legs": [
            {"length": 1000.0, "deflection": 60.0, "bend": "A"},
            {"length": 600.0, "deflection": -30.0, "bend": "B"},
            {"length": 500.0},
        ],
    }
    path = write(tmp_path, data)
    before = path.read_bytes()
    project, _ = load_project(path)
    save_project(project, path)
    assert path.read_bytes() == before
    legs = chain_of(project)
    points, _ = load_project(write(tmp_path, us_project(), "q.json"))
    for p, q in zip(legs.points, chain_of(points).points, strict=True):
        assert p == pytest.approx(q, abs=1e-9)


def test_alignment_schema_is_the_shipped_one_and_quick_check_agrees():
    assert project_schema()["$defs"]["alignment"] == alignment_schema()
    good = us_project()
    assert conforms(good, project_schema()) and validate(good) == []
    for bad, fragment in (
        ({**good, "curvetui_project_version": 2}, "curvetui_project_version"),
        ({**good, "alignment": {**good["alignment"], "start_bearing": 5}}, "either"),
        ({**good, "alignment": {"points": [{"easting": "x", "northing": 0}]}}, "easting"),
    ):
        assert not conforms(bad, project_schema())
        assert any(fragment in p for p in validate(bad)), validate(bad)


def _moved(data, index, easting, northing):
    data["alignment"]["points"][index].update(easting=easting, northing=northing)
    return data


@pytest.mark.parametrize(
    ("change", "message"),
    [
        (lambda d: us_project(("A", "Z")), "$.alignment.points[2].bend: 'Z' is not a bend"),
        (lambda d: us_project(("A", "A")), "$.alignment.points[2].bend: 'A' is at"),
        (lambda d: _moved(d, 2, 0.0, 1000.0), "$.alignment.points[2]: coincides with"),
        (lambda d: _moved(d, 2, 0.0, 1600.0), "PI 1 (A) is in line with its neighbours"),
        (
            lambda d: {**d, "alignment": {"points": d["alignment"]["points"][::3]}},
            "2 point(s); an alignment needs a start point, at least one PI and an end point",
        ),
    ],
)
def test_bad_alignments_are_refused_naming_the_point(tmp_path, capsys, change, message):
    path = write(tmp_path, change(us_project()))
    project, _ = load_project(path)
    layout = lay_out_project(project)
    assert message in layout.error
    with pytest.raises(AlignmentProblem, match=re.escape(message)):
        chain_of(project)
    assert main(["check", "--project", str(path)]) == 1
    out = capsys.readouterr()
    assert "Traceback" not in out.out + out.err
    assert "ERROR" in out.out and message in " ".join(out.out.split())


def test_check_json_carries_the_alignment_and_its_verdicts(tmp_path, capsys):
    data = us_project()
    # squeeze the legs: PI 2 only 120 ft on, less than T1 + T2 = 166.99 ft: overlap, FAIL
    s60, c60 = math.sin(math.radians(60)), math.cos(math.radians(60))
    pi2 = (120 * s60, 1000 + 120 * c60)
    _moved(data, 2, *pi2)  # and the end point with it: PI 2 still turns 30 deg left
    _moved(
        data,
        3,
        pi2[0] + 500 * math.sin(math.radians(30)),
        pi2[1] + 500 * math.cos(math.radians(30)),
    )
    path = write(tmp_path, data)
    assert main(["check", "--project", str(path), "--json"]) == 1
    out = json.loads(capsys.readouterr().out)
    al = out["alignment"]
    assert al["status"] == "fail"
    assert al["verdicts"][0]["code"] == "overlap" and al["verdicts"][0]["between"] == ["A", "B"]
    assert al["verdicts"][0]["value"] == pytest.approx(120 - T1 - T2)


def test_alignment_from_chain_builds_the_file_object_and_bend_inputs():
    chain = Chain(
        ((0.0, 0.0), (0.0, 304.8), (304.8, 609.6)), (45.72,), (0.0,), (0.0,), 30.48, "Back"
    )
    alignment, inputs = alignment_from_chain(chain, unit_system("us"), ["A"])
    assert alignment["points"][1] == {"easting": 0.0, "northing": 1000.0, "bend": "A"}
    assert alignment["start_station"] == 100.0
    assert inputs["A"]["radius"] == 150.0
    assert inputs["A"]["deflection"] == pytest.approx(45.0)  # north, then north-east
    assert inputs["A"]["pi_station"] == pytest.approx(1100.0)
    assert "spiral_in" not in inputs["A"]


def test_a_chain_goes_into_a_project_and_comes_back(tmp_path):
    """The importer's path: chain -> alignment object and bend inputs -> file -> chain_of.
    Spiralled and simple bends, both ways round, unequal spirals (a hand-made chain)."""
    chain = Chain(
        ((100.0, 200.0), (400.0, 650.0), (900.0, 700.0), (1300.0, 1200.0), (1500.0, 2000.0)),
        (600.0, 450.0, 900.0),
        (60.0, 0.0, 80.0),
        (60.0, 0.0, 50.0),
        1000.0,
        "Imported",
    )
    alignment, inputs = alignment_from_chain(chain, unit_system("metric"), ["X1", "X2", "X3"])
    bends = [
        {"id": i, "kind": "road", "inputs": {"speed": 80, **inputs[i]}} for i in ("X1", "X2", "X3")
    ]
    data = {
        "curvetui_project_version": 3,
        "details": {"name": "Import", "units": "metric"},
        "bends": bends,
        "alignment": alignment,
    }
    project, _ = load_project(write(tmp_path, data))
    back = chain_of(project)
    assert back.name == "Imported" and back.start_station == pytest.approx(1000.0)
    for p, q in zip(back.points, chain.points, strict=True):
        assert p == pytest.approx(q, abs=1e-6)
    assert back.radii == chain.radii
    assert back.spirals_in == chain.spirals_in and back.spirals_out == chain.spirals_out
    # the stored deflection and PI station agree with what the alignment gives
    layout = lay_out_project(project)
    for bend_id in ("X1", "X2", "X3"):
        given = layout.overrides[bend_id]
        assert given["deflection"] == pytest.approx(inputs[bend_id]["deflection"], abs=1e-9)
        assert given["pi_station"] == pytest.approx(inputs[bend_id]["pi_station"], abs=1e-6)


def test_spirals_overlapping_at_a_pi_name_the_point_and_bend(tmp_path):
    data = us_project()
    data["bends"][0]["inputs"]["spiral_in"] = 400  # at R 150 ft: 2 x 400 / 300 rad > 60 deg
    project, _ = load_project(write(tmp_path, data))
    error = lay_out_project(project).error
    assert error.startswith("$.alignment.points[1] (PI 1, bend A): spirals overlap")
