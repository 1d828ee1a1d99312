"""The terminal app on a CSV file of bends, driven by key presses (Textual's run_test and
Pilot, no real terminal).

Every CSV here is written by the test with invented ids. What the screen shows is checked
against the batch engine's own output for the same file (curvetui.batch.stream.batch_bytes):
these are tests of the app's behaviour (order, counts, filter, sorting, the worksheet of a
row, the caution), not engineering checks; the engine's values are checked elsewhere against
published sources.
"""

from __future__ import annotations

import asyncio
import csv
import io
from collections.abc import Awaitable, Callable
from pathlib import Path

import pytest
from app_screen import LARGE, SMALL, caution_on_screen, flat, screen_text
from rich.console import Console
from textual.pilot import Pilot
from textual.widgets import Input, TabbedContent

from curvetui import CAUTION
from curvetui.app.batch_view import BatchApp, BatchScreen, RowScreen, build_batch_app
from curvetui.app.widgets.batch_table import ResultTable
from curvetui.app.widgets.worksheet import Worksheet
from curvetui.batch.header import BatchFileError
from curvetui.batch.stream import batch_bytes
from curvetui.cli import main
from curvetui.core.units import unit_system
from curvetui.storage.tables import rail_limits, road_table

pytestmark = pytest.mark.app  # starts Textual: `pytest -m "not app"` leaves it out

# Invented bends: road and rail rows, some failing, a bad number, a row with too few
# fields, and a rail row without its cant.
CSV = (
    "id,kind,speed,radius,cant,low_speed,deflection,spiral\n"
    "QX-R1,road,100,400,,,40,90\n"
    "QX-R2,road,100,300,,,,\n"
    "QX-T1,rail,120,800,100,60,,\n"
    "QX-T2,rail,160,600,150,,,\n"
    "QX-R3,road,fast,400,,,,\n"
    "QX-R4,road,60\n"
    "QX-T3,rail,100,1000,,,,\n"
    "QX-R5,road,80,250,,,,\n"
    "QX-T4,rail,80,1500,20,,30,40\n"
)
RANK = {"fail": 0, "error": 1, "pass": 2}


def context(units: str = "metric"):
    u = unit_system(units)
    return u, road_table(None, u.name), rail_limits(None, u.name)


def engine_rows(text: str, units: str = "metric") -> list[dict]:
    """The batch engine's output rows for the same file."""
    out, _ = batch_bytes(text, *context(units), workers=1)
    rows = list(csv.DictReader(io.StringIO(out.decode("utf-8"))))
    for r in rows:
        r["row"] = int(r["row"])
    return rows


def failures_first(rows: list[dict]) -> list[dict]:
    return sorted(rows, key=lambda r: (RANK[r["status"]], r["row"]))


@pytest.fixture
def bends_csv(tmp_path: Path) -> Path:
    path = tmp_path / "quillmere-bends.csv"
    path.write_text(CSV, encoding="utf-8")
    return path


@pytest.fixture(scope="module")
def expected() -> list[dict]:
    rows = engine_rows(CSV)
    statuses = {r["status"] for r in rows}
    assert statuses == {"pass", "fail", "error"}, "the fixture must hold every status"
    return rows


def drive(
    path: Path,
    steps: Callable[[BatchApp, Pilot], Awaitable[None]],
    size: tuple[int, int] = SMALL,
    units: str = "metric",
    limit: int | None = None,
) -> BatchApp:
    kw = {} if limit is None else {"limit": limit}
    app = build_batch_app(path, *context(units), **kw)

    async def run() -> None:
        async with app.run_test(size=size) as pilot:
            await loaded(app, pilot)
            await steps(app, pilot)

    asyncio.run(run())
    return app


async def loaded(app: BatchApp, pilot: Pilot) -> None:
    """Wait for the batch worker (the screen paints first, then the file is checked)."""
    for _ in range(100):
        await pilot.pause(0.02)
        screen = app.screen
        if isinstance(screen, BatchScreen) and (screen.held or screen.problem):
            await pilot.pause()
            return
    raise AssertionError("the file was never checked")


def rendered(renderable) -> str:
    console = Console(width=100, file=io.StringIO(), record=True, legacy_windows=False)
    console.print(renderable)
    return console.export_text()


def table_column(app: BatchApp, index: int) -> list[str]:
    table = app.screen.query_one(ResultTable)
    return [str(table.get_row_at(i)[index]) for i in range(table.row_count)]


def table_ids(app: BatchApp) -> list[str]:
    return table_column(app, 1)


def ids(rows: list[dict]) -> list[str]:
    return [r["id"] for r in rows]


def counts_line(rows: list[dict], shown: int) -> str:
    n = len(rows)
    p, f, e = (sum(r["status"] == s for r in rows) for s in ("pass", "fail", "error"))
    return f"{n} bends: {p} pass | {f} FAIL | {e} ERROR | showing {shown} of {n}"


async def filter_by(app: BatchApp, pilot: Pilot, text: str, enter: bool = True) -> None:
    """Type into the filter box (after '/'); Enter applies it at once and goes back to the
    table, else wait for the pause after the last key that refills the table."""
    await pilot.press("slash")
    box = app.screen.query_one("#filter", Input)
    assert box.has_focus
    box.value = ""
    if text:
        await pilot.press(*text)
    if enter:
        await pilot.press("enter")
        await pilot.pause()
        assert app.screen.query_one(ResultTable).has_focus
    else:
        await pilot.pause(0.4)
        await pilot.pause()


# -- the table ------------------------------------------------------------------------------


@pytest.mark.parametrize("size", [SMALL, LARGE], ids=["80x24", "120x40"])
def test_failures_first_counts_top_bar_and_caution(bends_csv, expected, size):
    async def steps(app, pilot):
        assert table_ids(app) == ids(failures_first(expected))
        assert table_column(app, 3)[:2] == ["FAIL", "FAIL"]
        text = screen_text(app)
        assert counts_line(expected, len(expected)) in text
        top = flat(text)
        for words in ("quillmere-bends.csv", "metric", "aashto-2018-metric", "en13803-2010"):
            assert words in top, words
        assert caution_on_screen(app)
        assert str(app.screen.query_one("#caution").content) == CAUTION

    drive(bends_csv, steps, size)


def test_the_highlighted_rows_reasons_are_shown_under_the_table(bends_csv, expected):
    first = failures_first(expected)[0]

    async def steps(app, pilot):
        detail = flat(str(app.screen.query_one("#row-detail").content))
        assert f"row {first['row']} {first['id']}" in detail
        assert first["messages"].split("; ")[0] in detail

    drive(bends_csv, steps, LARGE)


def test_typing_a_filter_narrows_the_rows_and_letters_stay_in_the_box(bends_csv, expected):
    async def steps(app, pilot):
        await filter_by(app, pilot, "CANT", enter=False)
        assert app.screen.query_one("#filter", Input).has_focus
        want = [
            r
            for r in failures_first(expected)
            if "cant" in f"{r['id']} {r['status']} {r['messages']}".lower()
        ]
        assert 0 < len(want) < len(expected)
        assert table_ids(app) == ids(want)
        assert counts_line(expected, len(want)) in screen_text(app)
        # the status keys are letters: in the box they are typed, not obeyed
        await filter_by(app, pilot, "fail", enter=False)
        assert app.screen.query_one("#filter", Input).value == "fail"
        assert app.screen.only is None
        assert table_ids(app) == ids(
            [
                r
                for r in failures_first(expected)
                if "fail" in (f"{r['id']} {r['status']} {r['messages']}".lower())
            ]
        )
        await pilot.press("escape")  # back to the table, the filter kept
        await pilot.pause()
        assert app.screen.query_one(ResultTable).has_focus
        assert app.screen.query_one("#filter", Input).value == "fail"
        await filter_by(app, pilot, "zzz")
        assert table_ids(app) == []
        assert "No rows match the filter." in screen_text(app)
        assert caution_on_screen(app)

    drive(bends_csv, steps)


def test_f_e_a_show_only_fails_only_errors_and_all(bends_csv, expected):
    async def steps(app, pilot):
        order = failures_first(expected)
        for key, status in (("f", "fail"), ("e", "error")):
            await pilot.press(key)
            await pilot.pause()
            want = [r for r in order if r["status"] == status]
            assert table_ids(app) == ids(want)
            assert counts_line(expected, len(want)) in screen_text(app)
        await pilot.press("a")
        await pilot.pause()
        assert table_ids(app) == ids(order)

    drive(bends_csv, steps)


def by_number(rows: list[dict], key: str, reverse: bool = False) -> list[dict]:
    """Numbers in order, then cells that are not numbers, then blank cells (stable)."""

    def number(r):
        try:
            return float(r[key])
        except ValueError:
            return None

    numbers = [r for r in rows if number(r) is not None]
    texts = [r for r in rows if number(r) is None and r[key].strip()]
    blank = [r for r in rows if not r[key].strip()]
    return sorted(numbers, key=number, reverse=reverse) + texts + blank


def test_s_sorts_by_the_next_column_r_reverses_o_restores(bends_csv, expected):
    async def steps(app, pilot):
        order = failures_first(expected)
        screen = app.screen
        for _ in range(6):  # failures first -> Row -> Id -> Kind -> Check -> V -> R
            await pilot.press("s")
            await pilot.pause()
        assert screen.sort_key == "radius"
        assert "order: R m ascending" in screen_text(app)
        assert table_ids(app) == ids(by_number(order, "radius"))
        assert table_ids(app) != ids(order)
        await pilot.press("r")
        await pilot.pause()
        assert table_ids(app) == ids(by_number(order, "radius", reverse=True))
        assert "order: R m descending" in screen_text(app)
        await pilot.press("o")
        await pilot.pause()
        assert table_ids(app) == ids(order)

    drive(bends_csv, steps, LARGE)


def test_clicking_a_header_sorts_by_it_and_again_reverses(bends_csv, expected):
    """Speed holds a cell that is not a number (row QX-R3): it sorts after the numbers
    either way."""

    async def steps(app, pilot):
        table = app.screen.query_one(ResultTable)
        columns = table.ordered_columns
        x = sum(c.get_render_width(table) for c in columns[:4]) + 1  # the "V km/h" header
        order = failures_first(expected)

        await pilot.click(ResultTable, offset=(x, 0))
        await pilot.pause()
        assert app.screen.sort_key == "speed"
        assert "V km/h ▲" in screen_text(app)
        assert table_ids(app) == ids(by_number(order, "speed"))
        await pilot.click(ResultTable, offset=(x, 0))
        await pilot.pause()
        assert app.screen.reverse
        assert "V km/h ▼" in screen_text(app)
        assert table_ids(app) == ids(by_number(order, "speed", reverse=True))
        assert table_ids(app)[-1] == "QX-R3"  # the cell "fast" comes after the numbers

    drive(bends_csv, steps, LARGE)


# -- a row as its worksheet ---------------------------------------------------------------------


def test_enter_opens_rows_as_their_worksheets_with_the_batch_status(bends_csv, expected):
    """A road and a rail row of each status the batch checked: the worksheet's status is the
    batch output's status."""

    async def steps(app, pilot):
        table = app.screen.query_one(ResultTable)
        order = failures_first(expected)
        seen = set()
        for index, row in enumerate(order):
            if row["status"] == "error" or (row["kind"], row["status"]) in seen:
                continue
            seen.add((row["kind"], row["status"]))
            table.move_cursor(row=index)
            await pilot.pause()
            await pilot.press("enter")
            await pilot.pause()
            screen = app.screen
            assert isinstance(screen, RowScreen), row["id"]
            assert screen.sheet.record is not None
            assert screen.sheet.record["status"] == row["status"], row["id"]
            text = screen_text(app)
            assert f" {row['status'].upper()} " in text
            assert f"row {row['row']} {row['id']}" in text
            assert "The one-bend check gives" not in text  # no disagreement with the batch
            sheet = screen.query_one(Worksheet)
            assert sheet.query_one("#in-radius", Input).value == row["radius"]
            assert caution_on_screen(app)
            await pilot.press("escape")
            await pilot.pause()
            assert isinstance(app.screen, BatchScreen)
            assert app.screen.query_one(ResultTable).cursor_row == index
        assert len(seen) == 4  # road and rail, pass and fail

    drive(bends_csv, steps, LARGE)


def test_worksheet_at_80x24_f9_working_and_escape_keeps_filter_and_row(bends_csv, expected):
    async def steps(app, pilot):
        await filter_by(app, pilot, "QX-T")
        want = [r for r in failures_first(expected) if r["id"].startswith("QX-T")]
        assert table_ids(app) == ids(want)
        target = next(i for i, r in enumerate(want) if r["status"] == "fail")
        app.screen.query_one(ResultTable).move_cursor(row=target)
        await pilot.pause()
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, RowScreen)
        assert " FAIL " in screen_text(app)
        assert caution_on_screen(app)
        await pilot.press("f9")
        await pilot.pause()
        assert app.screen.query_one("#views", TabbedContent).active == "working"
        working = flat(rendered(app.screen.query_one("#working-view").content))
        assert "Cant deficiency" in working and "FAIL" in working
        assert caution_on_screen(app)
        await pilot.press("escape")
        await pilot.pause()
        screen = app.screen
        assert isinstance(screen, BatchScreen)
        assert screen.query_one("#filter", Input).value == "QX-T"
        assert table_ids(app) == ids(want)
        assert screen.query_one(ResultTable).cursor_row == target

    drive(bends_csv, steps)


def test_an_error_row_shows_its_messages_not_a_worksheet(bends_csv, expected):
    async def steps(app, pilot):
        order = failures_first(expected)
        table = app.screen.query_one(ResultTable)
        for index, row in enumerate(order):
            if row["status"] != "error":
                continue
            table.move_cursor(row=index)
            await pilot.pause()
            await pilot.press("enter")
            await pilot.pause()
            screen = app.screen
            assert isinstance(screen, RowScreen)
            assert not screen.query(Worksheet)
            text = flat(screen_text(app))
            assert f"ERROR row {row['row']} was not checked" in text
            for message in row["messages"].split("; "):
                assert flat(message) in text
            assert caution_on_screen(app)
            await pilot.press("escape")
            await pilot.pause()
            assert isinstance(app.screen, BatchScreen)

    drive(bends_csv, steps, LARGE)


# -- long files, units, files that cannot be used --------------------------------------------------


def test_a_long_file_holds_a_bounded_number_of_rows_failures_kept(tmp_path):
    lines = ["id,kind,speed,radius"]
    for i in range(40):
        radius = 250 if i % 9 == 4 else 900  # every ninth bend too tight at 100 km/h
        speed = "x" if i == 33 else "100"
        lines.append(f"QL-{i:02d},road,{speed},{radius}")
    text = "\n".join(lines) + "\n"
    path = tmp_path / "long.csv"
    path.write_text(text)
    rows = engine_rows(text)
    fails = [r for r in rows if r["status"] == "fail"]
    errors = [r for r in rows if r["status"] == "error"]
    passes = [r for r in rows if r["status"] == "pass"]
    assert len(fails) >= 4 and len(errors) == 1
    limit = len(fails) + len(errors) + 3

    async def steps(app, pilot):
        assert table_ids(app) == ids(fails) + ids(errors) + ids(passes[:3])
        text = flat(screen_text(app))
        assert counts_line(rows, limit) in text
        assert f"The table holds {limit} rows, failures first" in text
        assert f"{len(fails)} of {len(fails)} FAIL" in text
        assert f"3 of {len(passes)} pass" in text
        assert "`curvetui batch long.csv` writes every row" in text

    drive(path, steps, LARGE, limit=limit)


def test_us_units_name_the_columns_and_the_top_bar(tmp_path):
    text = "kind,speed,radius,cant\nroad,60,1200,\nrail,60,2864.789,3\n"
    path = tmp_path / "us.csv"
    path.write_text(text)

    async def steps(app, pilot):
        screen = flat(screen_text(app))
        assert "| us |" in screen and "aashto-2018-us" in screen
        assert "V mph" in screen and "R ft" in screen
        assert table_column(app, 3) == [
            r["status"].upper() if r["status"] != "pass" else "pass"
            for r in failures_first(engine_rows(text, "us"))
        ]

    drive(path, steps, LARGE, units="us")


def test_a_row_that_is_not_utf8_is_an_error_row_in_the_app(tmp_path):
    """Bytes that are not UTF-8 cost their row (shown as ?), the other rows are checked."""
    path = tmp_path / "latin.csv"
    path.write_bytes(b"id,kind,speed,radius\nQX-1,road,100,400\nQX-2,r\xf6ad,100,400\n")

    async def steps(app, pilot):
        text = flat(screen_text(app))
        assert "1 pass | 0 FAIL | 1 ERROR" in text
        assert "QX-2 r?ad ERROR" in text and "row 3: not UTF-8 text" in text
        assert "QX-1 road pass" in text
        assert "Cannot use latin.csv" not in text
        assert caution_on_screen(app)

    drive(path, steps)


def test_missing_columns_are_refused_before_the_app(tmp_path):
    path = tmp_path / "short.csv"
    path.write_text("id,speed\nQX-1,100\n")
    with pytest.raises(BatchFileError, match="required columns missing: kind, radius"):
        build_batch_app(path, *context())


# -- the command line ------------------------------------------------------------------------------


def test_open_csv_print_and_without_a_terminal_print_the_summary(bends_csv, expected, capsys):
    for argv in (["open", str(bends_csv), "--print"], [str(bends_csv)]):
        assert main(argv) == 0
        out = flat(capsys.readouterr().out)
        assert "Batch check" in out
        for status in ("pass", "fail", "error"):
            n = sum(r["status"] == status for r in expected)
            assert f"{status} │ {n} │" in out
        assert "QX-R2" in out  # a failing bend among the worst
        assert flat(CAUTION) in out
        assert not (bends_csv.parent / "quillmere-bends.checked.csv").exists()


def test_open_csv_with_us_units_and_named_tables(bends_csv, capsys):
    argv = ["open", str(bends_csv), "--print", "--units", "us", "--limits", "49cfr213-class3-5"]
    assert main(argv) == 0
    out = flat(capsys.readouterr().out)
    assert "road table: aashto-2018-us" in out and "rail limits: 49cfr213-class3-5" in out


def test_open_bad_csv_missing_csv_and_csv_options_on_a_project(tmp_path, capsys):
    bad = tmp_path / "short.csv"
    bad.write_text("id,speed\nQX-1,100\n")
    assert main([str(bad)]) == 2
    err = capsys.readouterr().err
    assert "cannot use this CSV file: required columns missing: kind, radius" in err
    assert "Traceback" not in err
    assert main([str(tmp_path / "absent.csv")]) == 2
    assert "no such file" in capsys.readouterr().err
    assert not (tmp_path / "absent.csv").exists()
    assert main([str(tmp_path / "p.json"), "--units", "us"]) == 2
    assert "for CSV files only" in capsys.readouterr().err
    assert not (tmp_path / "p.json").exists()


def test_semicolon_file_with_decimal_commas_and_a_status_column_of_its_own(tmp_path):
    """The file's own "Status" column pushes the result to "check.status"; the table and
    each row's worksheet still follow the batch output (decimal commas read as points)."""
    text = (
        "ID;Kind;Speed;Radius;Superelevation;Cant;Status\n"
        "QX-S1;road;100;400,5;6,5;;built\n"
        "QX-S2;road;90;250;;;planned\n"
        "QX-S3;rail;120;812,5;;97,5;built\n"
    )
    path = tmp_path / "semicolon.csv"
    path.write_text(text)
    out, _ = batch_bytes(text, *context(), workers=1)
    rows = list(csv.DictReader(io.StringIO(out.decode("utf-8")), delimiter=";"))
    want = sorted(rows, key=lambda r: (RANK[r["check.status"]], int(r["row"])))
    assert {r["check.status"] for r in rows} == {"pass", "fail"}

    async def steps(app, pilot):
        assert table_ids(app) == [r["ID"] for r in want]
        for index, row in enumerate(want):
            app.screen.query_one(ResultTable).move_cursor(row=index)
            await pilot.pause()
            await pilot.press("enter")
            await pilot.pause()
            assert app.screen.sheet.record["status"] == row["check.status"], row["ID"]
            await pilot.press("escape")
            await pilot.pause()
        for _ in range(6):  # to the radius column
            await pilot.press("s")
        await pilot.pause()
        assert app.screen.sort_key == "radius"
        assert table_ids(app) == ["QX-S2", "QX-S1", "QX-S3"]  # 250, 400,5 and 812,5 m

    drive(path, steps, LARGE)
