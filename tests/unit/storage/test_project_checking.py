"""Stored versus recomputed results, and bad bend inputs inside an otherwise valid file.

The projects are copies of the bundled demo ("Quillmere Valley Road"), an invented
scenario, and the user road table is the shipped metric table under an invented name with
one value changed by hand. Only the file handling is under test: that stored results
are compared with fresh ones and differences reported (never silently replaced), and that
a bad input stops only its own bend. No engineering value is checked here.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from curvetui.cli import main
from curvetui.storage.project.checking import (
    differences,
    evaluate_project,
    refresh_results,
    stale_results,
    stored_form,
)
from curvetui.storage.project.files import load_project, save_project
from curvetui.storage.tables import rail_limit_sets, road_tables

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"
METRIC_TABLE = ROOT / "curvetui" / "data" / "road" / "aashto-2018-metric.toml"
USER_TABLE = "fennick-shire-trial"  # invented table name


def flat(text: str) -> str:
    """Console text with the line wrapping undone."""
    return " ".join(text.split())


def saved_with_results(path: Path) -> Path:
    """The demo with freshly computed results, saved to ``path``."""
    project, _ = load_project(DEMO)
    refresh_results(project, evaluate_project(project))
    save_project(project, path)
    return path


def edit(path: Path, change) -> None:
    data = json.loads(path.read_text(encoding="utf-8"))
    change(data)
    path.write_text(json.dumps(data, indent=2), encoding="utf-8")


def stale_of(path: Path) -> list[str]:
    project, _ = load_project(path)
    return stale_results(evaluate_project(project))


@pytest.fixture
def saved(tmp_path) -> Path:
    return saved_with_results(tmp_path / "quillmere.json")


# -- 5. stored versus recomputed ------------------------------------------------------------


def test_freshly_saved_results_are_not_stale(saved):
    project, _ = load_project(saved)
    assert all(b.results is not None for b in project.bends)
    assert stale_results(evaluate_project(project)) == []


def test_the_demo_as_shipped_is_not_stale():
    assert stale_of(DEMO) == []


def test_edited_stored_number_is_reported(saved):
    edit(saved, lambda d: d["bends"][0]["results"].update(side_friction_demand=0.2))
    stale = stale_of(saved)
    assert len(stale) == 1
    assert stale[0].startswith("QV-01:")
    assert "side_friction_demand: stored 0.2, now" in stale[0]


def test_edited_nested_stored_number_is_reported(saved):
    edit(saved, lambda d: d["bends"][1]["results"]["transition"].update(runoff=1.0))
    stale = stale_of(saved)
    assert len(stale) == 1
    assert stale[0].startswith("QV-02:") and "transition.runoff: stored 1" in stale[0]


def test_edited_stored_status_is_reported(saved):
    def flip(d):
        assert d["bends"][3]["results"]["status"] == "fail"
        d["bends"][3]["results"]["status"] = "pass"

    edit(saved, flip)
    stale = stale_of(saved)
    assert len(stale) == 1
    assert stale[0].startswith("QV-04:")
    assert "status: stored 'pass', now 'fail'" in stale[0]


def test_input_edited_without_recomputing_is_reported(saved):
    """A hand-edited input makes the stored results (and their status) stale."""
    statuses = {b["id"]: b["results"]["status"] for b in json.loads(saved.read_text())["bends"]}
    assert statuses["QV-02"] == "pass"
    edit(saved, lambda d: d["bends"][1]["inputs"].update(radius=160))
    project, _ = load_project(saved)
    outcomes = evaluate_project(project)
    stale = stale_results(outcomes)
    # QV-02 is on the demo's alignment: its new radius moves the stations of the bends
    # after it too (the alignment carries stations through), so they are stale as well
    assert [line.split(":")[0] for line in stale] == ["QV-02", "QV-03", "QV-04", "QV-05", "QV-06"]
    assert all("geometry.pi: stored" in line for line in stale[1:])
    assert outcomes[1].status == "fail"
    found = differences(project.bends[1].results, stored_form(outcomes[1].record))
    assert "radius: stored 450, now 160" in found
    assert "status: stored 'pass', now 'fail'" in found
    assert f"and {len(found) - 4} more" in stale[0]  # a long list is cut, with its count


def test_a_difference_within_the_tolerance_is_not_reported(saved):
    def nudge(d):
        r = d["bends"][0]["results"]
        r["side_friction_demand"] *= 1 + 1e-9

    edit(saved, nudge)
    assert stale_of(saved) == []


def test_differences_lists_every_changed_field():
    project, _ = load_project(DEMO)
    fresh = stored_form(evaluate_project(project)[0].record)
    stored = json.loads(json.dumps(fresh))
    assert differences(stored, fresh) == []
    stored["safe_speed"] = 1.0
    stored["cross_section"] = "normal crown"
    stored["geometry"]["external"] = 0.5
    del stored["sight"]
    stored["messages"] = ["edited by hand"]  # messages are not compared
    found = differences(stored, fresh)
    assert [line.split(":")[0] for line in found] == [
        "cross_section",
        "geometry.external",
        "safe_speed",
        "sight",
    ]


def test_cli_reports_stale_results_and_leaves_the_file_alone(saved, capsys):
    edit(saved, lambda d: d["bends"][0]["results"].update(side_friction_demand=0.2))
    before = saved.read_bytes()
    assert main(["check", "--project", str(saved)]) == 1  # the demo fails on purpose
    out = flat(capsys.readouterr().out)
    assert "QV-01: results differ from those stored at the last save" in out
    assert "side_friction_demand: stored 0.2" in out
    assert saved.read_bytes() == before

    assert main(["check", "--project", str(saved), "--json"]) == 1
    doc = json.loads(capsys.readouterr().out)
    assert any(n.startswith("QV-01: results differ") for n in doc["notes"])
    assert saved.read_bytes() == before


def test_cli_save_stores_fresh_results_and_keeps_the_old_as_bak(saved, capsys):
    edit(saved, lambda d: d["bends"][0]["results"].update(side_friction_demand=0.2))
    edited = saved.read_bytes()
    assert main(["check", "--project", str(saved), "--save"]) == 1
    out = flat(capsys.readouterr().out)
    assert "QV-01: results differ" in out  # reported even while being replaced
    assert "results stored in" in out
    assert saved.with_name(saved.name + ".bak").read_bytes() == edited
    assert stale_of(saved) == []
    stored = json.loads(saved.read_text())["bends"][0]["results"]["side_friction_demand"]
    assert stored != 0.2


def test_cli_save_on_a_file_without_results_stores_them(tmp_path, capsys):
    path = tmp_path / "bare.json"
    data = json.loads(DEMO.read_text())
    for b in data["bends"]:
        b["results"] = None
    path.write_text(json.dumps(data))
    assert main(["check", "--project", str(path), "--save"]) == 1
    project, _ = load_project(path)
    assert all(b.results is not None for b in project.bends)
    assert [b.results["status"] for b in project.bends] == [
        o.status for o in evaluate_project(project)
    ]


# -- 5b. a changed road table ---------------------------------------------------------------


def user_table_text(f_max_at_100: str) -> str:
    text = METRIC_TABLE.read_text(encoding="utf-8")
    text = text.replace('name = "aashto-2018-metric"', f'name = "{USER_TABLE}"')
    row = "speed = 100\nside_friction_max = 0.12\n"
    assert text.count(row) == 1 and USER_TABLE in text
    return text.replace(row, f"speed = 100\nside_friction_max = {f_max_at_100}\n")


@pytest.fixture
def user_tables(tmp_path, monkeypatch):
    """A CURVETUI_TABLES folder; write(text) puts the user table there and drops the cache."""
    folder = tmp_path / "tables"
    folder.mkdir()
    monkeypatch.setenv("CURVETUI_TABLES", str(folder))

    def write(text: str) -> None:
        (folder / f"{USER_TABLE}.toml").write_text(text, encoding="utf-8")
        road_tables.cache_clear()
        rail_limit_sets.cache_clear()

    yield write
    road_tables.cache_clear()
    rail_limit_sets.cache_clear()


def test_a_changed_table_is_reported_and_never_silently_replaced(tmp_path, user_tables, capsys):
    user_tables(user_table_text("0.12"))
    path = tmp_path / "p.json"
    data = json.loads(DEMO.read_text())
    data["details"]["road_table"] = USER_TABLE
    path.write_text(json.dumps(data))
    assert main(["check", "--project", str(path), "--save"]) == 1
    capsys.readouterr()
    assert stale_of(path) == []
    saved = path.read_bytes()
    assert json.loads(saved)["bends"][0]["results"]["table"] == USER_TABLE

    user_tables(user_table_text("0.10"))  # the user edits f_max at 100 km/h
    project, _ = load_project(path)
    outcomes = evaluate_project(project)
    flagged = {line.split(":")[0] for line in stale_results(outcomes)}
    assert {"QV-01", "QV-02"} <= flagged  # the two 100 km/h bends
    assert not flagged & {"QS-01", "QS-02"}  # rail bends do not use a road table
    found = differences(project.bends[0].results, stored_form(outcomes[0].record))
    assert "side_friction_max: stored 0.12, now 0.1" in found

    assert main(["check", "--project", str(path)]) == 1
    out = flat(capsys.readouterr().out)
    assert "QV-01: results differ from those stored at the last save" in out
    assert path.read_bytes() == saved  # stored results stay as they were

    assert main(["check", "--project", str(path), "--json"]) == 1
    doc = json.loads(capsys.readouterr().out)
    fresh = {b["id"]: b["results"] for b in doc["bends"]}
    assert fresh["QV-01"]["side_friction_max"] == pytest.approx(0.10)
    assert json.loads(path.read_text())["bends"][0]["results"]["side_friction_max"] == 0.12
    assert path.read_bytes() == saved

    assert main(["check", "--project", str(path), "--save"]) == 1
    capsys.readouterr()
    assert json.loads(path.read_text())["bends"][0]["results"]["side_friction_max"] == 0.1
    assert path.with_name("p.json.bak").read_bytes() == saved
    assert stale_of(path) == []


# -- 6. a bad bend input inside a valid file ------------------------------------------------


def with_bad_input(path: Path, index: int, **inputs) -> Path:
    data = json.loads(DEMO.read_text())
    data["bends"][index]["inputs"].update(inputs)
    path.write_text(json.dumps(data))
    return checked_by_schema(path)


def checked_by_schema(path: Path) -> Path:
    load_project(path)  # the schema accepts it: the engine's range is the tighter one
    return path


@pytest.mark.parametrize(
    ("inputs", "field", "allowed"),
    [
        (
            {"speed": 300},
            "speed",
            "must be a number from 15 to 130 km/h (table aashto-2018-metric), got 300",  # noqa: E501
        ),
        ({"emax": 15}, "emax", "must be a number from 4 to 12 %"),
    ],
)
def test_bad_road_input_is_an_error_for_that_bend_only(tmp_path, capsys, inputs, field, allowed):
    path = with_bad_input(tmp_path / "p.json", 1, **inputs)
    before = path.read_bytes()
    assert main(["check", "--project", str(path)]) == 1
    out = flat(capsys.readouterr().out)
    assert f"QV-02: ERROR $.bends[1].inputs.{field}: {allowed}" in out
    for other in ("QV-01", "QV-03", "QV-04", "QS-01", "QS-02"):
        assert other in out
    assert path.read_bytes() == before

    assert main(["check", "--project", str(path), "--json"]) == 1
    doc = json.loads(capsys.readouterr().out)
    by_id = {b["id"]: b for b in doc["bends"]}
    assert len(by_id) == 8
    assert by_id["QV-02"]["status"] == "error" and by_id["QV-02"]["results"] is None
    assert by_id["QV-02"]["error"].startswith(f"$.bends[1].inputs.{field}: {allowed}")
    assert by_id["QV-01"]["status"] == "pass" and by_id["QV-04"]["status"] == "fail"


def test_bad_rail_input_names_its_path(tmp_path, capsys):
    path = with_bad_input(tmp_path / "p.json", 7, radius=10)
    assert main(["check", "--project", str(path), "--json"]) == 1
    doc = json.loads(capsys.readouterr().out)
    bad = doc["bends"][7]
    assert bad["id"] == "QS-02" and bad["status"] == "error"
    assert bad["error"].startswith("$.bends[7].inputs.radius: must be a number from 20 to")
    assert doc["bends"][6]["status"] == "pass"


def test_an_input_error_alone_makes_the_exit_code_1(tmp_path, capsys):
    data = json.loads(DEMO.read_text())
    project, _ = load_project(DEMO)
    passing = {o.bend.id for o in evaluate_project(project) if o.status == "pass"}
    data["bends"] = [b for b in data["bends"] if b["id"] in passing]
    data.pop("alignment")  # it names bends left out here
    path = tmp_path / "p.json"
    path.write_text(json.dumps(data))
    assert main(["check", "--project", str(path)]) == 0
    data["bends"][0]["inputs"]["speed"] = 300
    path.write_text(json.dumps(data))
    assert main(["check", "--project", str(path)]) == 1
    assert "ERROR $.bends[0].inputs.speed" in flat(capsys.readouterr().out)


def test_save_stores_no_results_for_a_bend_in_error(tmp_path, capsys):
    path = saved_with_results(tmp_path / "p.json")
    edit(path, lambda d: d["bends"][1]["inputs"].update(speed=300))
    checked_by_schema(path)
    assert json.loads(path.read_text())["bends"][1]["results"] is not None
    assert main(["check", "--project", str(path), "--save"]) == 1
    stored = json.loads(path.read_text())["bends"]
    assert stored[1]["results"] is None
    assert stored[1]["inputs"]["speed"] == 300  # the input itself is kept for the user to fix
    assert stored[0]["results"] is not None
