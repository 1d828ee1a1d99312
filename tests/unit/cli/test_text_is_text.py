"""Text from files and the command line is shown as text (issue 14, item 5).

Bend ids, project names, CSV cells, file names and a user table's name and source reach
the terminal with their brackets shown, never read as Rich markup (``[/]`` used to crash,
``[@click=...]`` is an action, ``[link=...]`` a hidden hyperlink), and with control
characters shown as ``?`` (an ESC ] 0 ; ... BEL sequence retitles a terminal: ECMA-48 /
xterm's OSC 0). No engineering value is checked here; the expectations are the strings
written in.
"""

from __future__ import annotations

import csv
import io
import json

import pytest

from curvetui.cli import main
from curvetui.screen_text import clean, markup

MARKUP = ("[/]", "[@click=app.quit]q", "[link=http://a.example]x[/link]", "[bold]b")
TITLE = "\x1b]0;pwned\x07t"  # sets the terminal's title where it is printed raw
SHOWN = "?]0;pwned?t"


def _no_controls(text: str) -> None:
    assert "\x1b" not in text and "\x07" not in text and "\x9b" not in text


def test_clean_and_markup():
    assert clean("a\tb\nc\x1b[2Jd\x00\x9b\u202e\ud800") == "a\tb\nc?[2Jd????"
    assert clean("a\nb", one_line=True) == "a?b"
    from rich.console import Console

    out = Console(file=io.StringIO(), width=200, highlight=False)
    for text in (*MARKUP, TITLE, "trailing\\"):
        out.print(markup(text))
    shown = out.file.getvalue()
    for text in MARKUP:
        assert text in shown
    assert SHOWN in shown and "trailing\\" in shown
    _no_controls(shown)


def _project(tmp_path, ids, name="[/]Quarry [bold]Lane", notes=""):
    data = {
        "curvetui_project_version": 2,
        "details": {"name": name, "units": "metric", "job_number": "[/]J"},
        "bends": [
            {"id": i, "kind": "road", "inputs": {"speed": 80, "radius": r}, "notes": notes}
            for i, r in zip(ids, [400, 100] * len(ids), strict=False)
        ],
    }
    path = tmp_path / "p.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    return path


def test_check_project_shows_ids_and_names_as_written(tmp_path, capsys):
    path = _project(tmp_path, [*MARKUP[:2], "[link=x]y", TITLE])
    assert main(["check", "--project", str(path)]) == 1  # the 100 m bends fail at 80 km/h
    out = capsys.readouterr().out
    for text in (*MARKUP[:2], "[link=x]y", SHOWN, "[/]Quarry [bold]Lane", "[/]J"):
        assert text in out
    _no_controls(out)


def test_tables_show_a_user_tables_name_and_source_as_written(tmp_path, monkeypatch, capsys):
    from curvetui.storage import tables

    shipped = (tables.resources.files("curvetui") / "data" / "road").joinpath(
        "aashto-2018-metric.toml"
    )
    text = shipped.read_text(encoding="utf-8")
    text = text.replace('name = "aashto-2018-metric"', 'name = "[/]x[@click=app.quit]"', 1)
    text = text.replace("source = ", f"source = {json.dumps(TITLE + ' [link=y]z')} #", 1)
    (tmp_path / "mine.toml").write_text(text, encoding="utf-8")
    monkeypatch.setenv("CURVETUI_TABLES", str(tmp_path))
    tables.road_tables.cache_clear()
    try:
        assert main(["tables"]) == 0
    finally:
        tables.road_tables.cache_clear()
    out = capsys.readouterr().out
    assert "[/]x[@click=app.quit]" in out and f"source: {SHOWN} [link=y]z" in out
    _no_controls(out)


def _csv(tmp_path, rows, header=("id", "kind", "speed", "radius", "note")) -> str:
    path = tmp_path / "in.csv"
    with path.open("w", encoding="utf-8", newline="") as fh:
        csv.writer(fh).writerows([header, *rows])
    return str(path)


def test_batch_summary_shows_cells_as_written(tmp_path, capsys):
    rows = [
        ["[/]", "road", "80", "100", ""],  # fails: among the worst bends
        [TITLE, "boat", "80", "400", ""],  # an error: kind unknown
        ["[link=http://a.example]x", "road", "80", "abc[/]", ""],
    ]
    out = tmp_path / "out.csv"
    assert main(["batch", _csv(tmp_path, rows), "-o", str(out)]) == 1
    err = capsys.readouterr().err
    assert "[/]" in err and SHOWN in err and "[link=http://a.example]x" in err
    assert "'abc[/]'" in err  # the cell quoted in the radius message
    _no_controls(err)


def test_error_lines_show_file_names_as_text(tmp_path, capsys):
    missing = str(tmp_path / f"{TITLE}.json")
    assert main(["check", "--project", missing]) == 2
    assert main(["batch", str(tmp_path / f"{TITLE}.csv")]) == 2
    err = capsys.readouterr().err
    assert err.count(SHOWN) == 2
    _no_controls(err)


@pytest.mark.parametrize("fmt", ["text", "md"])
def test_sheets_print_ids_notes_and_placeholders_as_written(tmp_path, capsys, fmt):
    path = _project(tmp_path, [TITLE, "[/]"], notes="see {nb} and [bold]x")
    assert main(["sheet", str(path), "--format", fmt, "-o", "-"]) == 0
    out = capsys.readouterr().out
    assert SHOWN in out and "{nb}" in out and "[bold]x" in out and "page 3 of 3" in out
    _no_controls(out)


def test_pdf_prints_nb_placeholders_literally(tmp_path):
    from pypdf import PdfReader

    from curvetui.reports.sheet import render_pdf

    path = _project(tmp_path, ["B{nb}"], name="Lane {nb}", notes="{nb} pages")
    pages = [p.extract_text() for p in PdfReader(io.BytesIO(render_pdf(str(path)))).pages]
    total = len(pages)  # a summary page, then the bend's worksheet (it may run on a page)
    assert total in (2, 3)
    assert "Lane {nb}" in pages[0] and f"page 1 of {total}" in pages[0]
    bend = "\n".join(pages[1:])
    assert "{nb} pages" in bend and "B{nb}" in bend and f"page {total} of {total}" in bend


def _written(path) -> list[dict]:
    with open(path, encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(fh))


def test_batch_output_neutralises_formulas_unless_kept(tmp_path, capsys):
    header = ("id", "kind", "speed", "radius", "note", "=cmd")
    rows = [
        ['=HYPERLINK("http://a.example","x")', "road", "80", "400", "-2+3", "+1"],
        ["@SUM(A1)", "road", "+80", "400", "-5", "-2.5e3"],
        ["\tB", "road", "80", "400", "\r=1", "+3"],
        ["B-4", "road", "80", "400", "'quoted", "-250"],
    ]
    src = _csv(tmp_path, rows, header)
    out = tmp_path / "out.csv"
    assert main(["batch", src, "-o", str(out)]) == 0
    got = _written(out)
    assert "'=cmd" in got[0]  # a column name too
    assert [r["id"] for r in got] == ["'" + rows[0][0], "'@SUM(A1)", "'\tB", "B-4"]
    assert [r["note"] for r in got] == ["'-2+3", "-5", "'\r=1", "'quoted"]
    assert [r["'=cmd"] for r in got] == ["+1", "-2.5e3", "+3", "-250"]  # numbers kept
    assert [r["speed"] for r in got] == ["80", "+80", "80", "80"]
    assert main(["batch", src, "-o", str(out), "--keep-formulas"]) == 0
    kept = _written(out)
    assert [r["id"] for r in kept] == [r[0] for r in rows]
    assert [r["note"] for r in kept] == [r[4] for r in rows]
    assert "=cmd" in kept[0]
    capsys.readouterr()
