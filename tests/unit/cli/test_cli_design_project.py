"""`curvetui design --project FILE [--bend ID ...] [--apply]`: every bend's proposal beside
its current values; the file is written only with --apply (FILE.bak keeps the previous
one), and each proposed bend is checked through the one path (its record is the check's).

The project is the bundled demo (an invented scenario), copied. The proposals' numbers are
tested against published values in tests/unit/core and tests/unit/bend; here the command's
behaviour is under test. "The one path": the applied file checked by `check --project`
gives each bend the record the proposal showed.
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from curvetui import CAUTION
from curvetui.cli import main

DEMO = Path(__file__).resolve().parents[3] / "projects" / "quillmere-valley-road.json"


@pytest.fixture
def demo(tmp_path):
    path = tmp_path / "demo.json"
    shutil.copyfile(DEMO, path)
    return path


def run_json(capsys, *args):
    code = main(["design", *args, "--json"])
    return code, json.loads(capsys.readouterr().out)


def test_without_apply_nothing_is_written(demo, capsys):
    before = demo.read_bytes()
    code = main(["design", "--project", str(demo)])
    text = " ".join(capsys.readouterr().out.split())
    assert code == 0
    assert demo.read_bytes() == before and not Path(f"{demo}.bak").exists()
    assert "Proposals (not applied)" in text and "160 -> " in text  # QV-04's radius
    assert "not written (--apply writes" in text and CAUTION in text
    assert "The alignment with these proposals" in text


def test_apply_writes_every_proposal_keeps_the_backup_and_checks_through_the_one_path(demo, capsys):
    before = demo.read_bytes()
    code, out = run_json(capsys, "--project", str(demo), "--apply")
    assert code == 0 and out["applied"] is True
    assert Path(f"{demo}.bak").read_bytes() == before  # the previous file kept
    data = json.loads(demo.read_text(encoding="utf-8"))
    old = {b["id"]: b["inputs"] for b in json.loads(before)["bends"]}
    new = {b["id"]: b["inputs"] for b in data["bends"]}
    proposals = {b["id"]: b["proposal"] for b in out["bends"]}
    assert set(proposals) == set(new)
    for bend_id, p in proposals.items():
        assert p["evaluation"]["status"] == "pass"
        for key, value in p["proposed"].items():
            assert new[bend_id].get(key) == value  # None: left out (blank)
        # the alignment's fields are the alignment's: never written by a proposal
        for key in ("deflection", "pi_station", "speed"):
            assert new[bend_id].get(key) == old[bend_id].get(key)
    main(["check", "--project", str(demo), "--json"])
    checked = {b["id"]: b for b in json.loads(capsys.readouterr().out)["bends"]}
    for bend_id, p in proposals.items():
        record = checked[bend_id]["results"]
        assert record["status"] == "pass"
        for key in ("radius", "side_friction_demand", "cant_deficiency", "status"):
            if key in record:
                assert record[key] == p["evaluation"][key], (bend_id, key)


def test_named_bends_only_and_an_unknown_id_is_refused(demo, capsys):
    code, out = run_json(capsys, "--project", str(demo), "--bend", "QV-04", "--apply")
    assert code == 0 and [b["id"] for b in out["bends"]] == ["QV-04"]
    data = {b["id"]: b["inputs"] for b in json.loads(demo.read_text(encoding="utf-8"))["bends"]}
    kept = {b["id"]: b["inputs"] for b in json.loads(DEMO.read_text(encoding="utf-8"))["bends"]}
    assert data["QV-04"] != kept["QV-04"]
    assert all(data[i] == kept[i] for i in kept if i != "QV-04")
    after = demo.read_bytes()
    assert main(["design", "--project", str(demo), "--bend", "[b]QV-99\x1b"]) == 2
    err = capsys.readouterr().err
    assert "--bend: '[b]QV-99?' is not a bend" in err and "\x1b" not in err
    assert demo.read_bytes() == after


def test_a_bend_on_the_alignment_is_proposed_for_the_alignments_deflection(demo, capsys):
    data = json.loads(demo.read_text(encoding="utf-8"))
    data["bends"][1]["inputs"]["deflection"] = 5.0  # stale: the alignment gives QV-02 38 deg
    demo.write_text(json.dumps(data), encoding="utf-8")
    main(["check", "--project", str(demo), "--json"])
    given = json.loads(capsys.readouterr().out)["alignment"]["pis"][1]["deflection"]
    code, out = run_json(capsys, "--project", str(demo), "--bend", "QV-02")
    assert out["bends"][0]["proposal"]["inputs"]["deflection"] == pytest.approx(given)
    assert given == pytest.approx(38.0, abs=1e-6)


def test_options_without_project_are_refused(capsys):
    assert main(["design", "--apply"]) == 2
    assert "only with --project" in capsys.readouterr().err
    assert main(["design"]) == 2
    assert "needs `road`, `rail` or --project" in capsys.readouterr().err
