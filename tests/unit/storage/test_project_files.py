"""Project files: loading, saving with a backup, validation, migration and the project CLI.

All project data here is invented: the bundled demo project ("Quillmere Valley Road") and
tests/fixtures/project-v1.json are invented scenarios, and hand-made faults are injected
into copies of them. Only the file handling (reading, validating, migrating, saving,
reporting) is under test; no engineering value is checked here.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from curvetui.cli import main
from curvetui.storage.project.checking import evaluate_project
from curvetui.storage.project.files import (
    ProjectError,
    load_project,
    migrate,
    project_text,
    save_project,
    validate,
)
from curvetui.storage.project.model import FORMAT_VERSION, PLAIN_VERSION, Bend

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"
V1 = ROOT / "tests" / "fixtures" / "project-v1.json"


def demo_data() -> dict:
    return json.loads(DEMO.read_text(encoding="utf-8"))


def write_json(path: Path, data) -> Path:
    path.write_text(json.dumps(data, indent=2), encoding="utf-8")
    return path


def problems_of(data) -> list[str]:
    with pytest.raises(ProjectError) as info:
        migrated, _ = migrate(data, "t.json")
        found = validate(migrated)
        if found:
            raise ProjectError("t.json", found)
    return info.value.problems


def only_problem(data, path: str) -> str:
    """The one problem reported, which must start with the JSON path given."""
    problems = problems_of(data)
    assert len(problems) == 1, problems
    assert problems[0].startswith(path + ":"), problems
    return problems[0]


@pytest.fixture
def demo_copy(tmp_path) -> Path:
    path = tmp_path / "quillmere.json"
    path.write_bytes(DEMO.read_bytes())
    return path


# -- 1. round trip and the backup ---------------------------------------------------------


def test_demo_round_trips_through_save(tmp_path):
    project, notes = load_project(DEMO)
    assert notes == []
    out = tmp_path / "again.json"
    save_project(project, out)
    again, notes = load_project(out)
    assert notes == []
    assert again.to_json() == project.to_json()
    assert again.to_json() == demo_data()  # nothing in the demo is lost or added by a save
    assert not (tmp_path / "again.json.bak").exists()  # no previous file: no backup


def test_save_keeps_the_previous_file_as_bak_byte_for_byte(demo_copy):
    original = demo_copy.read_bytes()
    bak = demo_copy.with_name(demo_copy.name + ".bak")
    project, _ = load_project(demo_copy)
    project.details.revision = "C"
    save_project(project, demo_copy)
    first = demo_copy.read_bytes()
    assert bak.read_bytes() == original
    assert first != original
    assert load_project(demo_copy)[0].details.revision == "C"

    project.bends[0].notes = "Second save: hedge line moved (invented)."
    save_project(project, demo_copy)
    assert bak.read_bytes() == first  # the second save's backup is the first save
    assert load_project(demo_copy)[0].bends[0].notes.startswith("Second save")


def test_text_outside_ascii_survives_a_round_trip(tmp_path):
    project, _ = load_project(DEMO)
    project.details.notes = "Crossing at Ørnholt: 12° skew, north–south (invented)"
    path = tmp_path / "utf8.json"
    save_project(project, path)
    assert "Ørnholt" in path.read_text(encoding="utf-8")
    assert load_project(path)[0].details.notes == project.details.notes


def test_empty_input_values_are_left_out_of_the_file(tmp_path):
    project, _ = load_project(DEMO)
    project.bends.append(
        Bend(
            id="QV-99", kind="road", inputs={"speed": 60, "radius": 300, "emax": None, "grade": ""}
        )
    )
    path = tmp_path / "p.json"
    save_project(project, path)
    stored = json.loads(path.read_text(encoding="utf-8"))["bends"][-1]["inputs"]
    assert stored == {"speed": 60, "radius": 300}
    assert load_project(path)[0].bend("QV-99").inputs == {"speed": 60, "radius": 300}


# -- 2. validation: every fault with its JSON path ----------------------------------------


def test_the_demo_and_a_saved_empty_project_are_valid(tmp_path):
    assert validate(demo_data()) == []
    assert main(["new", str(tmp_path / "e.json")]) == 0
    assert validate(json.loads((tmp_path / "e.json").read_text())) == []


def test_string_where_a_number_is_expected():
    d = demo_data()
    d["bends"][0]["inputs"]["speed"] = "fast"
    msg = only_problem(d, "$.bends[0].inputs.speed")
    assert "number" in msg and "fast" in msg


def test_string_where_a_number_is_expected_names_the_range():
    d = demo_data()
    d["bends"][0]["inputs"]["speed"] = "fast"
    # the widest speed range of the field list: road and rail, km/h and mph
    assert "from 1 to 400" in only_problem(d, "$.bends[0].inputs.speed")


def test_number_out_of_range_names_path_and_range():
    d = demo_data()
    d["bends"][1]["inputs"]["radius"] = -5
    msg = only_problem(d, "$.bends[1].inputs.radius")
    # the widest radius range of the field list: 1 m to 100 km, in feet 328084
    assert "from 1 to 328084" in msg and "-5" in msg


def test_number_above_an_inclusive_maximum_names_the_range():
    d = demo_data()
    d["bends"][2]["inputs"]["emax"] = 30
    msg = only_problem(d, "$.bends[2].inputs.emax")
    assert "from 0 to 20" in msg and "30" in msg


@pytest.mark.parametrize(
    ("where", "value", "path"),
    [
        (("bends", 2, "kind"), "tram", "$.bends[2].kind"),
        (("details", "units"), "imperial", "$.details.units"),
    ],
)
def test_bad_enum_lists_the_allowed_values(where, value, path):
    d = demo_data()
    target = d
    for key in where[:-1]:
        target = target[key]
    target[where[-1]] = value
    msg = only_problem(d, path)
    assert repr(value) in msg
    assert ("'road'" in msg and "'rail'" in msg) or ("'metric'" in msg and "'us'" in msg)


def test_missing_project_name():
    d = demo_data()
    del d["details"]["name"]
    assert "'name'" in only_problem(d, "$.details")


def test_empty_project_name():
    d = demo_data()
    d["details"]["name"] = ""
    assert "1 to 200" in only_problem(d, "$.details.name")


def test_missing_bend_id():
    d = demo_data()
    del d["bends"][3]["id"]
    assert "missing 'id'" in only_problem(d, "$.bends[3]")


def test_rail_bend_without_cant():
    d = demo_data()
    assert d["bends"][6]["kind"] == "rail"
    del d["bends"][6]["inputs"]["cant"]
    assert "missing 'cant'" in only_problem(d, "$.bends[6].inputs")


def test_road_bend_without_cant_is_fine():
    d = demo_data()
    assert d["bends"][0]["kind"] == "road" and "cant" not in d["bends"][0]["inputs"]
    assert validate(d) == []


@pytest.mark.parametrize(
    ("where", "path"),
    [
        ((), "$"),
        (("details",), "$.details"),
        (("bends", 4), "$.bends[4]"),
        (("bends", 4, "inputs"), "$.bends[4].inputs"),
    ],
)
def test_unknown_field(where, path):
    d = demo_data()
    target = d
    for key in where:
        target = target[key]
    target["colour"] = "red"
    msg = only_problem(d, path)
    assert "'colour'" in msg and "not a field of this format" in msg


def test_bad_date_pattern():
    d = demo_data()
    d["details"]["date"] = "20/11/2026"
    msg = only_problem(d, "$.details.date")
    assert "YYYY-MM-DD" in msg and "20/11/2026" in msg


def test_duplicate_bend_ids():
    d = demo_data()
    d["bends"][5]["id"] = d["bends"][0]["id"]
    msg = only_problem(d, "$.bends[5].id")
    assert "bends[0]" in msg and "unique" in msg


def test_bends_must_be_a_list():
    d = demo_data()
    d["bends"] = {"QV-01": {}}
    assert "array" in only_problem(d, "$.bends")


SEVERAL_FAULTS = {
    "$.bends[0].inputs.speed": lambda d: d["bends"][0]["inputs"].update(speed="fast"),
    "$.bends[1].inputs.radius": lambda d: d["bends"][1]["inputs"].update(radius=-5),
    "$.bends[2].kind": lambda d: d["bends"][2].update(kind="tram"),
    "$.details.units": lambda d: d["details"].update(units="imperial"),
    "$.details:": lambda d: d["details"].pop("name"),
    "$.bends[3]:": lambda d: d["bends"][3].pop("id"),
    "$.bends[6].inputs:": lambda d: d["bends"][6]["inputs"].pop("cant"),
    "$.bends[4]: Additional": lambda d: d["bends"][4].update(colour="red"),
    "$.details.date": lambda d: d["details"].update(date="2026/11/20"),
    "$.bends[5].id": lambda d: d["bends"][5].update(id="QV-01"),
}


def corrupted_demo() -> dict:
    d = demo_data()
    for fault in SEVERAL_FAULTS.values():
        fault(d)
    return d


def test_every_problem_is_reported_at_once(tmp_path):
    path = write_json(tmp_path / "bad.json", corrupted_demo())
    with pytest.raises(ProjectError) as info:
        load_project(path)
    problems = info.value.problems
    assert len(problems) == len(SEVERAL_FAULTS), problems
    for where in SEVERAL_FAULTS:
        assert sum(p.startswith(where) for p in problems) == 1, (where, problems)
    assert str(len(SEVERAL_FAULTS)) in str(info.value)
    assert info.value.path == str(path)


def test_cli_lists_every_problem_and_exits_2(tmp_path, capsys):
    path = write_json(tmp_path / "bad.json", corrupted_demo())
    before = path.read_bytes()
    assert main(["check", "--project", str(path)]) == 2
    captured = capsys.readouterr()
    lines = captured.err.splitlines()
    assert str(path) in lines[0]
    for where in SEVERAL_FAULTS:
        assert sum(line.strip().startswith(where) for line in lines) == 1, (where, lines)
    assert "QV-02" not in captured.out  # nothing is checked from a file that cannot be used
    assert path.read_bytes() == before


def test_cli_corrupted_file_shows_no_traceback(tmp_path):
    """The installed entry point, in a child process: stderr holds problems, not a trace."""
    path = write_json(tmp_path / "bad.json", corrupted_demo())
    run = subprocess.run(
        [sys.executable, "-m", "curvetui", "check", "--project", str(path)],
        capture_output=True,
        text=True,
        timeout=60,
    )
    assert run.returncode == 2, run.stderr
    assert "Traceback" not in run.stderr
    assert "$.bends[1].inputs.radius" in run.stderr and "from 1 to 328084" in run.stderr


# -- 3. files that are not projects at all -------------------------------------------------

NOT_PROJECTS = {
    "empty": (b"", "empty"),
    "whitespace": (b"  \n\t\r\n  ", "empty"),
    "truncated": (DEMO.read_bytes()[: len(DEMO.read_bytes()) // 2], "not valid JSON"),
    "binary": (bytes(range(256)) * 4, "not UTF-8"),
    "nul bytes": (b"\x00\x00\x01\x02", "not valid JSON"),
    "array": (b'[{"curvetui_project_version": 2}]', "must be a JSON object"),
    "number": (b"2", "must be a JSON object"),
    "object without version": (b'{"details": {}, "bends": []}', "not a curvetui project"),
}


@pytest.mark.parametrize("case", sorted(NOT_PROJECTS))
def test_not_a_project_is_a_clear_error(tmp_path, case, capsys):
    content, words = NOT_PROJECTS[case]
    path = tmp_path / "p.json"
    path.write_bytes(content)
    with pytest.raises(ProjectError) as info:
        load_project(path)
    assert len(info.value.problems) == 1
    assert words in info.value.problems[0]
    assert main(["check", "--project", str(path)]) == 2
    err = capsys.readouterr().err
    assert words in err and str(path) in err
    assert path.read_bytes() == content  # a failed load never touches the file


def test_truncated_file_message_names_the_place(tmp_path):
    path = tmp_path / "cut.json"
    path.write_bytes(DEMO.read_bytes()[:1000])
    with pytest.raises(ProjectError) as info:
        load_project(path)
    assert "line " in info.value.problems[0] and "truncated" in info.value.problems[0]


def test_a_folder_is_not_a_project(tmp_path):
    with pytest.raises(ProjectError) as info:
        load_project(tmp_path)
    assert "cannot read" in info.value.problems[0]


def test_deeply_nested_garbage_is_a_clear_error(tmp_path, capsys):
    path = tmp_path / "deep.json"
    path.write_text("[" * 100_000 + "]" * 100_000)
    assert main(["check", "--project", str(path)]) == 2
    assert str(path) in capsys.readouterr().err


@pytest.mark.parametrize("literal", ["NaN", "Infinity", "1e999"])
def test_non_finite_station_is_refused_at_load(tmp_path, capsys, literal):
    text = DEMO.read_text(encoding="utf-8").replace('"station": 420.0', f'"station": {literal}')
    assert literal in text
    path = tmp_path / "p.json"
    path.write_text(text, encoding="utf-8")
    assert main(["check", "--project", str(path)]) == 2
    assert "$.bends[0].station" in capsys.readouterr().err


# -- 4. format versions ---------------------------------------------------------------------


def test_newer_format_is_refused(tmp_path, capsys):
    d = demo_data()
    d["curvetui_project_version"] = FORMAT_VERSION + 1
    d["details"]["hover_mode"] = True  # a newer field: the version is what must be reported
    path = write_json(tmp_path / "new.json", d)
    with pytest.raises(ProjectError) as info:
        load_project(path)
    assert len(info.value.problems) == 1
    msg = info.value.problems[0]
    assert "newer curvetui" in msg and f"format {FORMAT_VERSION + 1}" in msg
    assert main(["check", "--project", str(path)]) == 2
    assert "newer curvetui" in capsys.readouterr().err
    assert json.loads(path.read_text())["curvetui_project_version"] == FORMAT_VERSION + 1


def test_format_1_migrates_with_a_note():
    project, notes = load_project(V1)
    assert any("migrated" in n and "format 1" in n for n in notes)
    assert project.details.name.startswith("Quillmere")
    assert [b.id for b in project.bends] == [f"QV-0{i}" for i in range(1, 7)]
    assert all(b.results is None for b in project.bends)
    assert project.to_json()["curvetui_project_version"] == PLAIN_VERSION  # no alignment


def format_2_from_v1_by_hand() -> dict:
    """The v1 fixture's content written out as format 2 without using migrate()."""
    v1 = json.loads(V1.read_text(encoding="utf-8"))
    return {
        "curvetui_project_version": 2,
        "details": dict(v1["project"]),
        "bends": [dict(b, results=None) for b in v1["bends"]],
    }


def test_format_1_checks_like_the_same_inputs_in_format_2(tmp_path):
    old, _ = load_project(V1)
    new, notes = load_project(write_json(tmp_path / "v2.json", format_2_from_v1_by_hand()))
    assert notes == []
    assert old.to_json() == new.to_json()
    old_out, new_out = evaluate_project(old), evaluate_project(new)
    statuses = [o.status for o in old_out]
    assert statuses == [o.status for o in new_out]
    assert {"pass", "fail"} <= set(statuses)  # the comparison covers both outcomes
    assert [o.record for o in old_out] == [o.record for o in new_out]


def test_saving_a_format_1_file_writes_format_2_and_keeps_the_old_as_bak(tmp_path, capsys):
    path = tmp_path / "old.json"
    path.write_bytes(V1.read_bytes())
    code = main(["check", "--project", str(path), "--save"])
    assert code == 1  # the invented v1 scenario holds failing bends
    out = " ".join(capsys.readouterr().out.split())
    assert "migrated from format 1" in out
    assert json.loads(path.read_text())["curvetui_project_version"] == 2
    assert path.with_name("old.json.bak").read_bytes() == V1.read_bytes()
    project, notes = load_project(path)
    assert notes == []
    assert all(b.results is not None for b in project.bends)


@pytest.mark.parametrize("fault", ["bends not objects", "project not an object"])
def test_malformed_format_1_file_is_a_clear_error(tmp_path, capsys, fault):
    v1 = json.loads(V1.read_text(encoding="utf-8"))
    if fault == "bends not objects":
        v1["bends"] = [1, 2]
    else:
        v1["project"] = [1]
    path = write_json(tmp_path / "v1bad.json", v1)
    assert main(["check", "--project", str(path)]) == 2
    assert "$." in capsys.readouterr().err


# -- 8. the project commands ----------------------------------------------------------------


def test_new_creates_a_loadable_empty_project(tmp_path, capsys):
    path = tmp_path / "hollin-beck.json"
    assert main(["new", str(path), "--units", "us"]) == 0
    assert "Created" in capsys.readouterr().out
    project, notes = load_project(path)
    assert notes == [] and project.bends == []
    assert project.details.name == "hollin-beck" and project.details.units == "us"
    assert path.read_text(encoding="utf-8") == project_text(project)


def test_new_refuses_to_overwrite(tmp_path, capsys):
    path = tmp_path / "p.json"
    path.write_bytes(DEMO.read_bytes())
    assert main(["new", str(path)]) == 2
    assert "already exists" in capsys.readouterr().err
    assert path.read_bytes() == DEMO.read_bytes()
    assert not path.with_name("p.json.bak").exists()


def test_new_in_a_missing_folder_is_a_clear_error(tmp_path, capsys):
    assert main(["new", str(tmp_path / "no-such-dir" / "p.json")]) == 2
    assert "no-such-dir" in capsys.readouterr().err


def test_new_never_writes_a_file_it_cannot_read(tmp_path, capsys):
    path = tmp_path / "long.json"
    code = main(["new", str(path), "--name", "N" * 201])
    if code == 0:
        load_project(path)
    else:
        assert code == 2 and not path.exists()


def test_opening_an_absent_file_creates_nothing_and_new_then_open_works(tmp_path, capsys):
    path = tmp_path / "saltry-top.json"
    assert main([str(path)]) == 2
    assert f"`curvetui new {path}` starts a project" in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []
    assert main(["new", str(path)]) == 0
    assert "Created" in capsys.readouterr().out
    project, _ = load_project(path)
    assert project.bends == [] and project.details.name == "saltry-top"
    assert main([str(path)]) == 0  # pytest's stdin is not a terminal: prints the checks
    assert list(tmp_path.iterdir()) == [path]  # a new file has no backup


def test_check_json_gives_one_object_per_bend(demo_copy, capsys):
    before = demo_copy.read_bytes()
    assert main(["check", "--project", str(demo_copy), "--json"]) == 1
    doc = json.loads(capsys.readouterr().out)
    ids = [b["id"] for b in demo_data()["bends"]]
    assert [b["id"] for b in doc["bends"]] == ids
    for b in doc["bends"]:
        assert b["status"] in ("pass", "fail", "error")
        assert b["status"] == ("error" if b["results"] is None else b["results"]["status"])
    assert "fail" in {b["status"] for b in doc["bends"]}
    assert doc["project"]["name"] == demo_data()["details"]["name"]
    assert demo_copy.read_bytes() == before  # checking without --save writes nothing


def test_check_exits_0_when_every_bend_passes(demo_copy, capsys):
    d = demo_data()
    statuses = {o.bend.id: o.status for o in evaluate_project(load_project(DEMO)[0])}
    d["bends"] = [b for b in d["bends"] if statuses[b["id"]] == "pass"]
    d.pop("alignment")  # it names bends left out here
    assert d["bends"]
    write_json(demo_copy, d)
    assert main(["check", "--project", str(demo_copy)]) == 0
    assert main(["check", "--project", str(demo_copy), "--json"]) == 0


def test_check_without_project_or_kind_is_exit_2(capsys):
    assert main(["check"]) == 2
    assert "--project" in capsys.readouterr().err


def test_unknown_road_table_in_a_project_is_exit_2(demo_copy, capsys):
    d = demo_data()
    d["details"]["road_table"] = "fennick-shire-1999"  # invented, not a known table
    write_json(demo_copy, d)
    assert main(["check", "--project", str(demo_copy)]) == 2
    err = capsys.readouterr().err
    assert "$.details.road_table" in err and "fennick-shire-1999" in err


def test_shipped_schema_inputs_are_made_from_the_field_list():
    # one declaration of the inputs: the schema file's inputs equal what the field list
    # makes (rewrite with `python -m curvetui.storage.project.schema` after changing a field)
    from curvetui.storage.project.files import project_schema
    from curvetui.storage.project.schema import inputs_schema, rail_required

    schema = project_schema()
    assert schema["$defs"]["inputs"] == inputs_schema()
    then = schema["$defs"]["bend"]["allOf"][0]["then"]["properties"]["inputs"]
    assert then["required"] == rail_required() == ["speed", "radius", "cant"]
