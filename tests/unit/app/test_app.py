"""The terminal app driven by key presses (Textual's run_test and Pilot, no real terminal).

All project data here is invented: the bundled demo project ("Quillmere Valley Road") is an
invented scenario, copied into a temporary folder for each test so the repository's file is
never touched. Only the app's behaviour is under test: what is on screen, what keys do,
that the caution and every failed check stay visible, and what is saved.
"""

from __future__ import annotations

import asyncio
import json
from pathlib import Path

import pytest
from app_screen import (
    DEMO,
    LARGE,
    SMALL,
    caution_on_screen,
    caution_widget_text,
    copy_demo,
    copy_demo_off_alignment,
    drive,
    flat,
    go_to,
    list_ids,
    palette_settles,
    ready,
    region_text,
    retype,
    row_cells,
    screen_text,
    set_box,
    show_view,
    status_word,
    working_text,
)
from textual.widgets import Input, Select, TabbedContent

from curvetui import CAUTION
from curvetui.app.app import build_app
from curvetui.app.dialogs.confirm import Confirm
from curvetui.app.dialogs.details import DetailsDialog
from curvetui.app.widgets.bend_list import BendList
from curvetui.inputs import InputError

pytestmark = pytest.mark.app  # starts Textual: `pytest -m "not app"` leaves it out


@pytest.fixture
def demo_path(tmp_path: Path) -> Path:
    return copy_demo(tmp_path)


# -- the caution ----------------------------------------------------------------------------------


def test_caution_on_screen_in_every_view_and_theme_f9_f6(demo_path):
    """At 80x24 (the snapshot tests check every view at 120x40 as well)."""

    async def steps(app, pilot):
        assert caution_widget_text(app) == CAUTION
        assert caution_on_screen(app)
        seen = []
        for _ in range(6):
            await pilot.press("f9")
            await pilot.pause()
            seen.append(app.query_one("#views", TabbedContent).active)
            assert caution_on_screen(app), seen[-1]
        assert seen == ["working", "plan", "chart", "crossfall", "alignment", "sheet"]
        # F6: light and dark, the caution in both
        assert app.theme == "textual-dark"
        await pilot.press("f6")
        await pilot.pause()
        assert app.theme == "textual-light"
        assert caution_on_screen(app)
        await pilot.press("f6")
        await pilot.pause()
        assert app.theme == "textual-dark"

    drive(demo_path, steps)


def test_caution_over_the_confirm_dialogs_and_the_palette_lists_save_project(demo_path):
    async def steps(app, pilot):
        await pilot.press("f8")
        await pilot.pause()
        assert isinstance(app.screen, Confirm)
        assert caution_on_screen(app)
        assert caution_widget_text(app) == CAUTION
        await pilot.press("escape")
        await pilot.pause()
        app.query_one("#in-radius", Input).value = "170"  # an unsaved change
        await pilot.pause()
        assert app.session.dirty
        await pilot.press("ctrl+q")
        await pilot.pause()
        assert isinstance(app.screen, Confirm)
        assert caution_on_screen(app)
        await pilot.press("escape")
        await pilot.pause()
        # the command palette finds the app's own commands
        await pilot.press("ctrl+p", *"save")
        await palette_settles(app, pilot, "Save project")
        assert type(app.screen).__name__ == "CommandPalette"
        text = screen_text(app)
        assert "Save project" in text
        assert "Save the project file (ctrl+s)" in text
        assert caution_on_screen(app)
        await pilot.press("escape")
        await pilot.pause()
        assert type(app.screen).__name__ != "CommandPalette"
        assert app.is_running

    drive(demo_path, steps)


@pytest.mark.xfail(
    strict=True,
    reason="The command palette (ctrl+p) before anything is typed lists every command and "
    "covers the whole caution at 80x24 (the palette is Textual's own screen; the app adds no "
    "caution to it and its command list is not limited in height).",
)
def test_caution_on_screen_over_the_open_command_palette_at_80x24(demo_path):
    async def steps(app, pilot):
        await pilot.press("ctrl+p")
        await palette_settles(app, pilot, "Copy bend")  # the first of the app's commands
        assert type(app.screen).__name__ == "CommandPalette"
        assert caution_on_screen(app)

    drive(demo_path, steps, SMALL)


@pytest.mark.parametrize("size", [SMALL, LARGE])
def test_caution_on_screen_with_the_details_dialog(demo_path, size):
    async def steps(app, pilot):
        await pilot.press("f2")
        await pilot.pause()
        assert isinstance(app.screen, DetailsDialog)
        assert caution_on_screen(app)

    drive(demo_path, steps, size)


# -- the list and the worksheet -------------------------------------------------------------------


def test_list_words_and_moving_down_the_list_shows_that_bend(demo_path):
    async def steps(app, pilot):
        assert list_ids(app) == [b.id for b in app.session.project.bends]
        words = {b.id: status_word(app, b.id) for b in app.session.project.bends}
        assert words["QV-04"] == "FAIL" and words["QV-05"] == "FAIL"
        assert words["QV-01"] == "pass" and words["QS-02"] == "pass"
        assert "QV-04  FAIL" in screen_text(app)
        assert app.query_one("#in-bend_id", Input).value == "QV-01"
        assert app.query_one("#in-speed", Input).value == "100"
        await pilot.press("down", "down", "down")
        await pilot.pause()
        assert app.current.id == "QV-04"
        assert app.query_one("#in-bend_id", Input).value == "QV-04"
        assert app.query_one("#in-speed", Input).value == "80"
        assert app.query_one("#in-radius", Input).value == "160"
        assert app.query_one("#in-deflection", Input).value == "52"
        assert app.query_one("#in-station", Input).value == "2+710.000"
        assert "FAIL   road bend, 80 km/h, R 160 m" in screen_text(app)
        await pilot.press("up")
        await pilot.pause()
        assert app.query_one("#in-bend_id", Input).value == "QV-03"
        assert app.query_one("#in-radius", Input).value == "2500"
        await pilot.press("enter")
        await pilot.pause()
        assert app.focused is app.query_one("#in-speed", Input)
        assert app.query_one("#views", TabbedContent).active == "sheet"

    drive(demo_path, steps)


def test_typing_a_radius_updates_results_and_the_list_row(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        assert status_word(app, "QV-04") == "FAIL"
        await retype(pilot, app, "radius", "260")
        st = app.session.state(app.current)
        assert st.error is None
        assert st.record["radius"] == 260.0
        assert st.record["status"] == "pass"
        assert status_word(app, "QV-04") == "pass"
        assert row_cells(app, "QV-04")[3] == "260"
        assert "PASS   road bend, 80 km/h, R 260 m" in screen_text(app)
        # the handler's own time for the edit is kept (the limit is in the benchmark)
        assert isinstance(app.last_recompute_ms, float)
        assert app.last_recompute_ms > 0
        await set_box(pilot, app, "radius", "160")
        assert app.session.state(app.current).record["status"] == "fail"
        assert status_word(app, "QV-04") == "FAIL"
        assert "FAIL   road bend, 80 km/h, R 160 m" in screen_text(app)
        assert "unsaved" in str(app.query_one("#topbar").content)

    drive(demo_path, steps)


def test_bad_speed_names_field_and_range_marks_input_and_keeps_last_good(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        box = app.query_one("#in-speed", Input)
        box.focus()
        await pilot.pause()
        box.value = ""  # as a select-all and delete would leave it
        await pilot.pause()
        await pilot.press(*"abc")
        await pilot.pause()
        st = app.session.state(app.current)
        message = str(app.query_one("#field-error").content)
        assert message.startswith(
            "speed: must be a number from 15 to 130 km/h (table aashto-2018-metric)"  # noqa: E501
        ), message
        assert "'abc'" in message
        assert box.has_class("-invalid")
        assert not app.query_one("#in-radius", Input).has_class("-invalid")
        assert st.error_field == "speed"
        assert st.record["speed"] == 80.0 and st.record["radius"] == 160.0
        assert st.record["status"] == "fail"
        assert status_word(app, "QV-04") == "ERROR"
        text = screen_text(app)
        assert "showing the last valid inputs' results" in text
        assert "FAIL   road bend, 80 km/h, R 160 m" in text  # the failed check is not hidden
        await pilot.press("backspace", "backspace", "backspace", *"80")
        await pilot.pause()
        assert not box.has_class("-invalid")
        assert str(app.query_one("#field-error").content) == ""
        assert status_word(app, "QV-04") == "FAIL"

    drive(demo_path, steps)


def test_bad_speed_message_is_on_screen_at_120x40(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await retype(pilot, app, "speed", "abc")
        assert "speed: must be a number from 15 to 130" in flat(screen_text(app))

    drive(demo_path, steps, LARGE)


def test_bad_speed_message_is_on_screen_at_80x24(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "speed", "abc")
        assert "speed: must be a number from 15 to 130" in flat(screen_text(app))

    drive(demo_path, steps, SMALL)


def test_switching_to_rail_shows_cant_and_hides_superelevation(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-03")
        assert app.query_one("#row-superelevation").display
        assert not app.query_one("#row-cant").display
        kind = app.query_one("#kind", Select)
        kind.focus()
        await pilot.pause()
        await pilot.press("enter")
        await pilot.pause()
        await pilot.press("down", "enter")
        await pilot.pause()
        assert kind.value == "rail"
        assert app.current.kind == "rail"
        assert app.query_one("#row-cant").display
        assert app.query_one("#row-low_speed").display
        assert not app.query_one("#row-superelevation").display
        assert not app.query_one("#row-emax").display
        # issue 14: no made-up cant; the field is marked until one is typed
        st = app.session.state(app.current)
        assert st.error == "cant: required"
        assert app.query_one("#in-cant", Input).has_class("-invalid")
        await set_box(pilot, app, "cant", "40")
        st = app.session.state(app.current)
        assert st.error is None and st.record["kind"] == "rail"
        assert row_cells(app, "QV-03")[4] == "rail"
        assert "rail bend, 80 km/h, R 2500 m" in screen_text(app)

    drive(demo_path, steps)


def test_a_taken_bend_id_or_a_bad_station_says_why_until_it_is_fixed(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "bend_id", "QV-01")  # another bend's id
        assert app.current.id == "QV-04"
        message = str(app.query_one("#field-error").content)
        assert message == "bend id: must be 1 to 40 characters and not used by another bend"
        await set_box(pilot, app, "bend_id", "QV-04b")
        assert app.current.id == "QV-04b"
        assert str(app.query_one("#field-error").content) == ""
        assert list_ids(app)[3] == "QV-04b"
        await set_box(pilot, app, "station", "2+7x0")
        message = str(app.query_one("#field-error").content)
        assert message == "station: must be a station such as 2+710.5 or a number"
        assert row_cells(app, "QV-04b")[5] == "2+710.0"  # the station kept
        await set_box(pilot, app, "station", "2+720")
        assert str(app.query_one("#field-error").content) == ""
        assert row_cells(app, "QV-04b")[5] == "2+720.0"
        assert "unsaved" in str(app.query_one("#topbar").content)

    drive(demo_path, steps)


# -- saving and quitting --------------------------------------------------------------------------


def test_ctrl_q_cancel_goes_back_ctrl_s_saves_then_ctrl_q_exits_at_once(demo_path):
    original = demo_path.read_bytes()

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "radius", "260")
        assert app.session.dirty
        await pilot.press("ctrl+q")
        await pilot.pause()
        assert isinstance(app.screen, Confirm)
        assert [b.id for b in app.screen.query("Button")] == ["save", "discard", "cancel"]
        assert "There are unsaved changes." in screen_text(app)
        await pilot.click("#cancel")
        await pilot.pause()
        assert app.is_running
        assert not isinstance(app.screen, Confirm)
        assert app.session.dirty
        assert app.current.inputs["radius"] == 260
        assert not demo_path.with_name(demo_path.name + ".bak").exists()

        await pilot.press("ctrl+s")
        await pilot.pause()
        assert not app.session.dirty
        assert "unsaved" not in str(app.query_one("#topbar").content)

        await pilot.press("ctrl+q")  # nothing unsaved: no question
        await pilot.pause()
        assert not isinstance(app.screen, Confirm)
        assert not app.is_running

    app = drive(demo_path, steps)
    assert app.return_code == 0
    saved = json.loads(demo_path.read_text(encoding="utf-8"))
    qv04 = next(b for b in saved["bends"] if b["id"] == "QV-04")
    assert qv04["inputs"]["radius"] == 260
    assert qv04["results"]["status"] == "pass"
    assert demo_path.with_name(demo_path.name + ".bak").read_bytes() == original


def test_ctrl_s_with_a_bad_input_refuses_and_keeps_running(demo_path):
    original = demo_path.read_bytes()

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "speed", "abc")
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert app.is_running
        assert app.session.dirty
        assert "speed" in flat(screen_text(app))

    drive(demo_path, steps)
    assert demo_path.read_bytes() == original


def test_ctrl_q_discard_exits_without_saving(demo_path):
    original = demo_path.read_bytes()

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "radius", "170")
        await pilot.press("ctrl+q")
        await pilot.pause()
        await pilot.click("#discard")
        await pilot.pause()
        assert not app.is_running

    drive(demo_path, steps)
    assert demo_path.read_bytes() == original
    assert not demo_path.with_name(demo_path.name + ".bak").exists()


def test_ctrl_q_save_saves_then_exits(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "radius", "170")
        await pilot.press("ctrl+q")
        await pilot.pause()
        await pilot.click("#save")
        await pilot.pause()
        assert not app.is_running

    drive(demo_path, steps)
    saved = json.loads(demo_path.read_text(encoding="utf-8"))
    assert next(b for b in saved["bends"] if b["id"] == "QV-04")["inputs"]["radius"] == 170
    assert demo_path.with_name(demo_path.name + ".bak").exists()


# -- adding, copying, deleting, moving ------------------------------------------------------------


def test_f3_adds_f4_copies_f8_deletes_ctrl_down_moves(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        await pilot.press("f3")
        await pilot.pause()
        added = app.current.id
        assert list_ids(app)[2] == added
        assert app.query_one(BendList).cursor_row == 2
        assert app.query_one("#in-bend_id", Input).value == added
        # issue 14: a new bend starts empty, not with made-up values that PASS
        assert app.query_one("#in-speed", Input).value == ""
        assert app.query_one("#in-radius", Input).value == ""
        assert status_word(app, added) == "ERROR"

        await go_to(app, pilot, "QV-04")
        await pilot.press("f4")
        await pilot.pause()
        copied = app.current.id
        ids = list_ids(app)
        assert copied not in ("QV-04", added)
        assert ids[ids.index("QV-04") + 1] == copied
        assert app.query_one("#in-bend_id", Input).value == copied
        assert app.query_one("#in-radius", Input).value == "160"
        assert status_word(app, copied) == "FAIL"

        await pilot.press("f8")
        await pilot.pause()
        assert isinstance(app.screen, Confirm)
        assert f"Delete bend {copied}?" in screen_text(app)
        await pilot.click("#cancel")  # "Keep it"
        await pilot.pause()
        assert copied in list_ids(app)

        await pilot.press("f8")
        await pilot.pause()
        await pilot.click("#delete")
        await pilot.pause()
        assert copied not in list_ids(app)
        assert copied not in [b.id for b in app.session.project.bends]
        assert app.current.id == list_ids(app)[app.query_one(BendList).cursor_row]
        assert app.query_one("#in-bend_id", Input).value == app.current.id
        assert len(app.session.project.bends) == 9

        # ctrl+down and ctrl+up move the bend; the cursor and the worksheet go with it
        await go_to(app, pilot, "QV-02")
        await pilot.press("ctrl+down")
        await pilot.pause()
        assert list_ids(app)[:4] == ["QV-01", added, "QV-02", "QV-03"]
        assert [b.id for b in app.session.project.bends] == list_ids(app)
        assert app.query_one(BendList).cursor_row == 2
        assert app.current.id == "QV-02"
        assert app.query_one("#in-bend_id", Input).value == "QV-02"
        await pilot.press("ctrl+up", "ctrl+up", "ctrl+up", "ctrl+up")  # past the top
        await pilot.pause()
        assert list_ids(app)[:3] == ["QV-02", "QV-01", added]
        assert app.query_one(BendList).cursor_row == 0
        assert app.query_one("#in-bend_id", Input).value == "QV-02"

    drive(demo_path, steps)


# -- the details dialog, the palette, the theme ---------------------------------------------------


def test_f2_details_escape_changes_nothing_apply_changes_the_name(demo_path):
    async def steps(app, pilot):
        await pilot.press("f2")
        await pilot.pause()
        assert isinstance(app.screen, DetailsDialog)
        app.screen.query_one("#d-name", Input).value = "Not kept"
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, DetailsDialog)
        assert app.session.project.details.name == "Quillmere Valley Road realignment (demo)"
        assert not app.session.dirty

        await pilot.press("f2")
        await pilot.pause()
        name = app.screen.query_one("#d-name", Input)
        assert name.value == "Quillmere Valley Road realignment (demo)"
        name.focus()
        await pilot.pause()
        name.value = ""
        await pilot.press(*"Hollow Lane")
        await pilot.click("#apply")
        await pilot.pause()
        assert not isinstance(app.screen, DetailsDialog)
        assert app.session.project.details.name == "Hollow Lane"
        top = str(app.query_one("#topbar").content)
        assert "Hollow Lane" in top and "unsaved" in top
        assert screen_text(app).splitlines()[0].strip().startswith("unsaved  Hollow Lane FSH-0427")

    drive(demo_path, steps)


def test_ctrl_s_in_the_details_dialog_applies(demo_path):
    original = demo_path.read_bytes()

    async def steps(app, pilot):
        await pilot.press("f2")
        await pilot.pause()
        name = app.screen.query_one("#d-name", Input)
        name.focus()
        name.value = ""
        await pilot.press(*"Hollow Lane", "ctrl+s")
        await pilot.pause()
        assert not isinstance(app.screen, DetailsDialog)
        assert app.session.project.details.name == "Hollow Lane"
        assert demo_path.read_bytes() == original  # applying is not saving

    drive(demo_path, steps)


# -- the plan and the chart -----------------------------------------------------------------------


def test_plan_view_spiralled_bend_labels_and_a_bend_without_deflection(tmp_path):
    demo_path = copy_demo_off_alignment(tmp_path)  # deflection and PI station typed

    async def steps(app, pilot):
        await show_view(app, pilot, "plan")
        assert app.current.id == "QV-01"
        plan = region_text(app, "#plan-view")
        assert "spiralled bend, R 700 m" in plan
        for label in ("TS 0+227.937", "SC 0+307.937", "CS 0+527.261", "ST 0+607.261", "PI"):
            assert label in plan, label
        await go_to(app, pilot, "QV-04")  # the plan follows the list while shown
        assert "PC 2+631.963" in region_text(app, "#plan-view")
        # no deflection (and so no PI station): the plan says what to give
        await set_box(pilot, app, "pi_station", "")
        await set_box(pilot, app, "deflection", "")
        assert app.session.state(app.current).error is None
        plan = flat(region_text(app, "#plan-view"))
        assert "give a deflection to see the plan" in plan
        assert "PC 2+" not in plan

    drive(demo_path, steps, LARGE)


def test_plan_view_message_uses_the_app_field_names(tmp_path):
    demo_path = copy_demo_off_alignment(tmp_path)  # deflection and PI station typed

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "deflection", "200")
        assert app.session.state(app.current).error == (
            "deflection: must be a number greater than 0 to 179 degrees, got 200"
        )
        await show_view(app, pilot, "plan")
        text = flat(screen_text(app))
        assert "179" in text and "deflection" in text
        assert "--" not in text

    drive(demo_path, steps, LARGE)


def test_qv04_in_the_plan_chart_and_working_views(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await show_view(app, pilot, "plan")
        plan = region_text(app, "#plan-view")
        assert "left-hand circular" in plan  # QV-04 turns left on the demo's alignment
        for label in ("PC 2+631.963", "PI 2+710.000", "PT 2+777.174"):
            assert label in plan, label
        await show_view(app, pilot, "chart")
        chart = region_text(app, "#road-chart")
        assert "✕ FAIL" in chart
        assert "FAIL R < R_min" in chart
        await go_to(app, pilot, "QV-03")  # the chart follows the list while shown
        chart = region_text(app, "#road-chart")
        assert "● ok" in chart
        assert "FAIL" not in chart
        await go_to(app, pilot, "QV-04")
        await show_view(app, pilot, "working")
        assert "FAIL" in working_text(app)  # a failed step is marked (scroll to see it)
        await go_to(app, pilot, "QV-03")
        assert "FAIL" not in working_text(app)

    drive(demo_path, steps)


# -- the tests' own set-up ------------------------------------------------------------------------


def start_state(app) -> dict:
    """What a user sees of an app just started: the screen, the focus, the view, the bend."""
    return {
        "screen": screen_text(app),
        "screens": len(app.screen_stack),
        "focused": app.focused.id if app.focused else None,
        "view": app.query_one("#views", TabbedContent).active,
        "theme": app.theme,
        "bend": app.current.id,
        "cursor": app.query_one(BendList).cursor_row,
        "dirty": app.session.dirty,
    }


def test_a_shared_app_starts_as_a_fresh_one(tmp_path):
    """``drive`` hands each test a running app put back to its start (app_screen.py): after a
    test that left a dialog open, another view, the light theme, a bad input and the form
    scrolled down, the next test sees what a newly started app shows. At 80x24, where the
    form scrolls (each size has its app, put back the same way)."""
    size = SMALL
    paths = []
    for name in ("fresh", "used", "next"):  # the same file name: the top bar shows it
        (tmp_path / name).mkdir()
        paths.append(copy_demo(tmp_path / name))
    fresh = build_app(paths[0])

    async def run() -> dict:
        async with fresh.run_test(size=size) as pilot:
            await ready(fresh, pilot)
            return start_state(fresh)

    expected = asyncio.run(run())
    assert expected["focused"] == "bends" and expected["bend"] == "QV-01"

    async def mess(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "speed", "abc")
        app.query_one("#in-lane_width", Input).focus()  # scrolls the form down at 80x24
        await pilot.pause()
        await show_view(app, pilot, "plan")
        await pilot.press("f6", "f2")
        await pilot.pause()
        assert isinstance(app.screen, DetailsDialog)
        assert start_state(app) != expected

    seen = {}

    async def look(app, pilot):
        seen.update(start_state(app))

    drive(paths[1], mess, size)
    drive(paths[2], look, size)
    assert seen["screen"].splitlines() == expected["screen"].splitlines()
    assert seen == expected


# -- a project the app cannot compute -------------------------------------------------------------


def test_unknown_road_table_gives_a_message_not_a_traceback(tmp_path):
    """Either build_app refuses with the message (the command line prints it and exits 2)
    or the app starts and shows the message with the caution."""
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    data["details"]["road_table"] = "no-such-table"
    path = tmp_path / "unknown-table.json"
    path.write_text(json.dumps(data, indent=2), encoding="utf-8")
    try:
        app = build_app(path)
    except InputError as exc:
        assert "unknown road table 'no-such-table'" in str(exc)
        return

    async def run() -> None:
        async with app.run_test(size=LARGE) as pilot:
            for _ in range(5):
                await pilot.pause()
            assert app.is_running
            text = flat(screen_text(app))
            # the top bar flags it (the long message wraps on screen); each bend holds it whole
            assert "TABLE PROBLEM" in text
            bend = app.session.project.bends[0]
            assert "unknown road table 'no-such-table'" in app.session.state(bend).error
            assert all(status_word(app, b.id) == "ERROR" for b in app.session.project.bends)
            # readable on screen under the form
            assert "unknown road table 'no-such-table'" in flat(region_text(app, "#field-error"))
            assert caution_on_screen(app)

    asyncio.run(run())
