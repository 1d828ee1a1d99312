"""`curvetui FILE` on the bundled demo project (an invented scenario, used here only to
check that the command runs, reports failures and exits 1; the values are checked
elsewhere against published tables)."""

from pathlib import Path

from curvetui.cli import main

DEMO = Path(__file__).resolve().parents[3] / "projects" / "quillmere-valley-road.json"


def test_demo_project_prints_every_bend_and_fails(capsys):
    code = main(["check", "--project", str(DEMO)])
    out = capsys.readouterr().out
    assert code == 1  # the demo holds failing bends on purpose
    for bend in ("QV-01", "QV-04", "QV-06"):
        assert bend in out
    assert "FAIL radius" in out
    assert "qualified engineer" in out.replace("\n", " ")


def test_opening_an_absent_file_is_an_error_and_creates_nothing(tmp_path, capsys):
    path = tmp_path / "absent.json"
    assert main([str(path)]) == 2
    err = capsys.readouterr().err
    assert "no such file" in err and "curvetui new" in err and "Traceback" not in err
    assert main(["open", str(path), "--print"]) == 2
    assert "no such file" in capsys.readouterr().err
    assert not path.exists() and list(tmp_path.iterdir()) == []


def test_checking_a_missing_file_exits_2(tmp_path, capsys):
    assert main(["check", "--project", str(tmp_path / "absent.json")]) == 2
    assert "no such file" in capsys.readouterr().err


def test_corrupt_project_file(tmp_path, capsys):
    bad = tmp_path / "bad.json"
    bad.write_text('{"project": ')
    assert main([str(bad)]) == 2
    assert "not valid JSON" in capsys.readouterr().err


def test_opening_the_demo_exits_0(capsys):
    assert main([str(DEMO)]) == 0
    assert "QV-05" in capsys.readouterr().out


def test_demo_holds_road_and_rail_bends(capsys):
    main(["check", "--project", str(DEMO)])
    out = capsys.readouterr().out
    assert "QS-01" in out and "QS-02" in out and "rail" in out
