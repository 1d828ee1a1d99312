"""The command line refuses what it does not know: an unknown first word is an error with the
closest command (exit code 2) and creates nothing; `new` creates only .json files, never over
an existing one; opening never creates a file. (Issue 14, item 3.)

No engineering value is checked here. The expectations are the project's own exit codes (the
README's table: 2 for input that cannot be used) and the closest command by difflib's ratio,
a "did you mean" that is common practice for command lines, no source.
"""

from __future__ import annotations

import os

import pytest

from curvetui.cli import main
from curvetui.storage.project.files import load_project


@pytest.fixture
def in_empty_folder(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    return tmp_path


@pytest.mark.parametrize(
    ("word", "suggestion"),
    [("tabels", "tables"), ("chek", "check"), ("sheeet", "sheet"), ("batsh", "batch")],
)
def test_a_mistyped_command_suggests_the_command_and_creates_nothing(
    in_empty_folder, capsys, word, suggestion
):
    assert main([word]) == 2
    err = capsys.readouterr().err
    assert f"unknown command '{word}'; did you mean '{suggestion}'?" in err
    assert err.count("\n") == 1 and "Traceback" not in err
    assert list(in_empty_folder.iterdir()) == []


def test_an_unknown_word_with_no_close_command_lists_the_commands(in_empty_folder, capsys):
    assert main(["zzzz", "--print"]) == 2
    err = capsys.readouterr().err
    assert "unknown command 'zzzz'" in err and "did you mean" not in err
    for command in ("batch", "check", "new", "open", "setout", "sheet", "tables"):
        assert command in err
    assert list(in_empty_folder.iterdir()) == []


def test_control_characters_in_an_unknown_word_are_not_sent_to_the_terminal(
    in_empty_folder, capsys
):
    assert main(["x\x1b]0;title\x07"]) == 2
    err = capsys.readouterr().err
    assert "\x1b" not in err and "\x07" not in err and "\\x1b" in err


def test_an_existing_path_without_a_suffix_is_opened_not_refused(in_empty_folder, capsys):
    (in_empty_folder / "tabels").write_text("not a project\n", encoding="utf-8")
    assert main(["tabels"]) == 2  # opened, and refused as a project file
    err = capsys.readouterr().err
    assert "cannot use this project file" in err and "unknown command" not in err
    assert sorted(p.name for p in in_empty_folder.iterdir()) == ["tabels"]


def test_a_json_name_is_opened_and_a_missing_one_is_not_created(in_empty_folder, capsys):
    assert main(["tabels.json"]) == 2
    err = capsys.readouterr().err
    assert "tabels.json: no such file; `curvetui new tabels.json` starts a project" in err
    assert list(in_empty_folder.iterdir()) == []


@pytest.mark.parametrize("name", ["plan", "plan.txt", "plan.csv", "plan.json.bak"])
def test_new_creates_only_json_files(in_empty_folder, capsys, name):
    assert main(["new", name]) == 2
    assert "must end in .json" in capsys.readouterr().err
    assert list(in_empty_folder.iterdir()) == []


def test_new_accepts_any_case_of_json_and_writes_no_backup(in_empty_folder, capsys):
    assert main(["new", "Brackenfold.JSON"]) == 0
    assert load_project(in_empty_folder / "Brackenfold.JSON")[0].bends == []
    assert [p.name for p in in_empty_folder.iterdir()] == ["Brackenfold.JSON"]


def test_new_never_replaces_a_dangling_symlink(in_empty_folder, capsys):
    if not hasattr(os, "symlink"):
        pytest.skip("no symlinks here")
    outside = in_empty_folder / "elsewhere.txt"
    (in_empty_folder / "p.json").symlink_to(outside)
    assert main(["new", "p.json"]) == 2
    assert "already exists" in capsys.readouterr().err
    assert not outside.exists() and os.path.islink(in_empty_folder / "p.json")


def test_new_loses_a_race_plainly(in_empty_folder, monkeypatch, capsys):
    """A file that appears between the check and the save is kept, and the save says so."""
    from curvetui.storage import files

    real = files._create_new

    def someone_else_first(tmp, target):
        target.write_text("another program's file\n", encoding="utf-8")
        real(tmp, target)

    monkeypatch.setattr(files, "_create_new", someone_else_first)
    assert main(["new", "p.json"]) == 2
    assert "already exists" in capsys.readouterr().err
    assert (in_empty_folder / "p.json").read_text() == "another program's file\n"
    assert [p.name for p in in_empty_folder.iterdir()] == ["p.json"]  # no temporary file
