"""`curvetui FILE` on the bundled demo project (an invented scenario, used here only to
check that the command runs, reports failures and exits 1; the values are checked
elsewhere against published tables)."""

from pathlib import Path

from curvetui.cli import main

DEMO = Path(__file__).resolve().parents[2] / "projects" / "quillmere-valley-road.json"


def test_demo_project_prints_every_bend_and_fails(capsys):
    code = main(["check", "--project", str(DEMO)])
    out = capsys.readouterr().out
    assert code == 1  # the demo holds failing bends on purpose
    for bend in ("QV-01", "QV-04", "QV-06"):
        assert bend in out
    assert "FAIL radius" in out
    assert "qualified engineer" in out.replace("\n", " ")


def test_missing_project_file_is_one_line(tmp_path, capsys):
    code = main([str(tmp_path / "absent.json")])
    assert code == 2
    assert "cannot read" in capsys.readouterr().err


def test_corrupt_project_file(tmp_path, capsys):
    bad = tmp_path / "bad.json"
    bad.write_text('{"project": ')
    assert main([str(bad)]) == 2
    assert "not valid JSON" in capsys.readouterr().err


def test_opening_the_demo_exits_0(capsys):
    assert main([str(DEMO)]) == 0
    assert "QV-05" in capsys.readouterr().out
