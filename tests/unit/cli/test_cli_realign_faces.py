"""`curvetui realign ... --sheet FILE` and `--view`: the options' checks and the files
written. The survey is the worked example's measured versines (REFERENCES.md "Track
realignment from versines (Hallade)"); only the faces are under test here.

Sources of the check values: the worked example of REFERENCES.md "Track realignment from
versines (Hallade)" (derived, exact; US Army TR 0671 3.18-3.28 read in outline); the
caution text is the project's (every face must show it).
"""

from __future__ import annotations

import os

import pytest

from curvetui import CAUTION
from curvetui.cli import main

MEASURED = [0, 2, 9, 20, 28, 29, 30, 31, 32, 31, 19, 7, 2, 0]  # mm, 6 m apart


@pytest.fixture
def survey(tmp_path):
    path = tmp_path / "survey.csv"
    rows = "".join(f"{6 * i},{v}\n" for i, v in enumerate(MEASURED))
    path.write_text("station,versine\n" + rows, encoding="utf-8")
    return path


def run(survey, *more):
    return main(["realign", str(survey), "--chord", "12", "--max-transition", "18", *more])


@pytest.mark.parametrize("suffix", [".txt", ".md", ".pdf"])
def test_sheet_is_written_in_the_form_its_suffix_names(tmp_path, survey, capsys, suffix):
    out = tmp_path / f"sheet{suffix}"
    assert run(survey, "--sheet", str(out)) == 0
    assert f"Worksheet written: {out}" in capsys.readouterr().out.replace("\n", "")
    data = out.read_bytes()
    if suffix == ".pdf":
        assert data.startswith(b"%PDF")
    else:
        text = data.decode("utf-8")
        assert CAUTION in text and "Slew" in text
        assert text.count("\n| 0.00 |" if suffix == ".md" else "\n     0.00 ") == 1


def test_an_existing_sheet_is_replaced_whole(tmp_path, survey, capsys):
    out = tmp_path / "sheet.txt"
    out.write_text("stale line\n" * 10000, encoding="utf-8")
    assert run(survey, "--sheet", str(out)) == 0
    assert "stale line" not in out.read_text(encoding="utf-8")
    assert [p for p in os.listdir(tmp_path) if p.endswith(".tmp")] == []


@pytest.mark.parametrize(
    ("value", "words"),
    [
        ("sheet.docx", "--sheet: give a file name ending .pdf, .txt or .md"),
        ("-", "--sheet: give a file name ending"),
    ],
)
def test_sheet_name_is_checked_before_any_work(tmp_path, survey, capsys, value, words):
    assert run(survey, "--sheet", str(tmp_path / value) if value != "-" else value) == 2
    err = capsys.readouterr().err
    assert words in err and err.count("\n") == 1
    assert not (tmp_path / value).exists()


def test_sheet_never_over_the_survey_or_the_csv(tmp_path, survey, capsys):
    before = survey.read_bytes()
    linked = tmp_path / "survey.md"
    os.symlink(survey, linked)
    assert run(survey, "--sheet", str(linked)) == 2
    assert "that is the survey file" in capsys.readouterr().err
    assert survey.read_bytes() == before
    out = tmp_path / "x.txt"
    assert run(survey, "--sheet", str(out), "-o", str(out)) == 2
    assert "the same file as -o" in capsys.readouterr().err
    assert not out.exists()


def test_view_needs_a_terminal_and_not_json(survey, capsys):
    assert run(survey, "--view", "--json") == 2
    assert "--view and --json: choose one" in capsys.readouterr().err
    assert run(survey, "--view") == 2  # pytest's standard input and output are no terminal
    assert "--view: needs a terminal" in capsys.readouterr().err
