"""What is typed is kept: keys in order at any speed, nothing changed by opening a file,
undo, station text, unit changes, the list's widths, the unsaved mark, new bends, printing
unsaved work, the safe button of each question, the rail chart, scrolling the results.

The project is the bundled demo (an invented scenario), copied for each test.
"""

from __future__ import annotations

import asyncio
import json
from pathlib import Path

import pytest
from app_screen import (
    DEMO,
    SMALL,
    copy_demo,
    copy_demo_off_alignment,
    drive,
    flat,
    go_to,
    ready,
    region_text,
    row_cells,
    screen_text,
    set_box,
    settle,
    show_view,
)
from textual import events
from textual.widgets import Input, Select

from curvetui.app.app import build_app
from curvetui.app.dialogs.confirm import Confirm
from curvetui.app.dialogs.details import DetailsDialog
from curvetui.bend.fields import fields_for

pytestmark = pytest.mark.app


@pytest.fixture
def demo_path(tmp_path):
    return copy_demo(tmp_path)


def burst(app, *keys: str) -> None:
    """Post keys to the app all at once, as a terminal does when they come faster than the
    app handles them (each is queued before the first has acted)."""
    for key in keys:
        char = key if len(key) == 1 else None
        app.post_message(events.Key(key, char))


def values(app, *keys: str) -> list[str]:
    return [app.query_one(f"#in-{k}", Input).value for k in keys]


# -- every key in the focused field, in order ------------------------------------------------


def test_keys_typed_faster_than_the_app_land_in_order_in_their_fields(tmp_path):
    demo_path = copy_demo_off_alignment(tmp_path)  # deflection and PI station typed

    """Enter on the list opens the worksheet on the speed; Tab moves to the radius, then the
    deflection. Before the fix a key that came while Tab was still on its way through the
    app's queues went to the field before it."""

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        burst(app, "enter", "6", "0", "tab", "3", "2", "0", "tab", "1", "2")
        await settle(pilot)
        assert values(app, "speed", "radius", "deflection") == ["60", "320", "12"]
        assert app.focused is app.query_one("#in-deflection")
        inputs = app.current.inputs
        assert (inputs["speed"], inputs["radius"], inputs["deflection"]) == (60, 320, 12)

    drive(demo_path, steps)


def test_backspace_typed_in_a_burst_deletes_the_key_before_it(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        burst(app, "enter", "9", "8", "backspace", "5")
        await settle(pilot)
        assert values(app, "speed") == ["95"]

    drive(demo_path, steps)


def test_ctrl_s_straight_after_typing_saves_what_was_typed(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        burst(app, "enter", "7", "0", "ctrl+s")
        await settle(pilot)
        assert not app.session.dirty
        saved = json.loads(demo_path.read_text(encoding="utf-8"))
        assert saved["bends"][1]["inputs"]["speed"] == 70

    drive(demo_path, steps)


# -- opening changes nothing --------------------------------------------------------------------


def write(path: Path, data: dict) -> Path:
    path.write_text(json.dumps(data, indent=2, ensure_ascii=False) + "\n", encoding="utf-8")
    return path


def demo_data() -> dict:
    return json.loads(DEMO.read_text(encoding="utf-8"))


def rail_first(tmp_path: Path) -> Path:
    data = demo_data()
    data["bends"] = data["bends"][6:] + data["bends"][:6]
    return write(tmp_path / "rail-first.json", data)


def all_rail(tmp_path: Path) -> Path:
    data = demo_data()
    data["bends"] = data["bends"][6:]
    return write(tmp_path / "all-rail.json", data)


def sparse_us(tmp_path: Path) -> Path:
    """Written by hand: only the keys the format requires, a whole-number station, a null
    input, a station as text; no stored results (invented values)."""
    data = {
        "curvetui_project_version": 2,
        "details": {"name": "Sparse US (invented)", "units": "us"},
        "bends": [
            {"id": "S1", "kind": "rail", "inputs": {"speed": 40, "radius": 1500, "cant": 3}},
            {
                "id": "S2",
                "kind": "road",
                "station": 1200,
                "inputs": {"speed": 50, "radius": 800, "spiral_in": None, "pi_station": "12+00"},
            },
        ],
    }
    return write(tmp_path / "sparse-us.json", data)


def typed(value):
    """JSON with each number tagged by its type, so that 420 and 420.0 differ."""
    if isinstance(value, dict):
        return {k: typed(v) for k, v in value.items()}
    if isinstance(value, list):
        return [typed(v) for v in value]
    return (type(value).__name__, value)


async def fresh_app(path: Path, steps) -> None:
    """A new app on ``path`` (the kind box announces its first value as it is mounted: a
    shared, already mounted app would not show what opening does)."""
    app = build_app(path)
    async with app.run_test(size=SMALL) as pilot:
        await ready(app, pilot)
        await settle(pilot)
        await steps(app, pilot)


@pytest.mark.parametrize("shape", [copy_demo, rail_first, all_rail, sparse_us])
def test_opening_changes_nothing_and_saving_unchanged_writes_the_file_as_read(tmp_path, shape):
    path = shape(tmp_path)
    before = path.read_text(encoding="utf-8")
    kinds = [b["kind"] for b in json.loads(before)["bends"]]

    async def steps(app, pilot):
        assert [b.kind for b in app.session.project.bends] == kinds
        assert app.query_one("#kind").value == kinds[0]
        assert not app.session.dirty
        assert "unsaved" not in screen_text(app)
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert not app.session.dirty

    asyncio.run(fresh_app(path, steps))
    after = path.read_text(encoding="utf-8")
    if shape is sparse_us:  # the save stores results where the file had none; nothing else
        saved = json.loads(after)
        assert all(b.pop("results")["status"] for b in saved["bends"])
        assert typed(saved) == typed(json.loads(before))
    else:
        assert after == before


# -- fields: undo, widths, stations, what the file cannot store -----------------------------


def test_tab_into_a_note_keeps_it_and_ctrl_z_undoes(demo_path):
    async def steps(app, pilot):
        note = app.current.notes
        await pilot.press("enter")  # the speed
        await pilot.press("shift+tab")  # back to the notes
        assert app.focused is app.query_one("#in-notes")
        await pilot.press("x")
        await settle(pilot)
        assert values(app, "notes") == [note + "x"]
        assert app.current.notes == note + "x"
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert values(app, "notes") == [note] and app.current.notes == note
        # a number is replaced by what is typed, and ctrl+z brings it back
        await pilot.press("tab", "7")
        await settle(pilot)
        assert values(app, "speed") == ["7"]
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert values(app, "speed") == ["100"] and app.current.inputs["speed"] == 100

    drive(demo_path, steps)


def test_fields_are_wide_enough_to_show_their_values_at_80x24(demo_path):
    async def steps(app, pilot):
        for key in ("bend_id", "station", "notes", "speed", "pi_station"):
            assert app.query_one(f"#in-{key}").region.width >= 24, key
        text = screen_text(app)
        assert "QV-01" in text and "0+420.000" in text
        assert "Long sweeping bend past" in text

    drive(demo_path, steps)


def test_a_pi_station_typed_as_a_station_is_stored_and_saved(tmp_path):
    demo_path = copy_demo_off_alignment(tmp_path)  # deflection and PI station typed

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        app.query_one("#in-pi_station", Input).value = "1+190.5"
        await settle(pilot)
        assert app.current.inputs["pi_station"] == 1190.5
        assert app.session.state(app.current).error is None
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert not app.session.dirty
        await go_to(app, pilot, "QV-01")
        await go_to(app, pilot, "QV-02")
        assert values(app, "pi_station") == ["1+190.500"]

    drive(demo_path, steps)
    saved = json.loads(demo_path.read_text(encoding="utf-8"))
    assert saved["bends"][1]["inputs"]["pi_station"] == 1190.5


def test_a_new_bend_starts_empty_marked_and_without_a_result(demo_path):
    async def steps(app, pilot):
        await pilot.press("f3")
        await settle(pilot)
        new = app.current
        assert new.inputs == {}
        assert values(app, "speed", "radius", "deflection") == ["", "", ""]
        for key in ("speed", "radius"):
            assert app.query_one(f"#in-{key}").has_class("-invalid"), key
            assert app.query_one(f"#row-{key}").has_class("-invalid"), key
        assert row_cells(app, new.id)[1] == "ERROR"
        results = region_text(app, "#results")
        assert "PASS" not in results and "speed: required" in flat(results)
        # saving names the bend and its fields, no JSON path
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert app.session.dirty
        notes = " ".join(str(n.message) for n in app._notifications)
        assert f"bend {new.id}, speed: required by the project file" in notes
        assert "$." not in notes

    drive(demo_path, steps)


def test_a_details_field_the_file_cannot_store_is_marked_as_typed(demo_path):
    async def steps(app, pilot):
        await pilot.press("f2")
        await settle(pilot)
        date = app.screen.query_one("#d-date", Input)
        date.value = "20 Nov 2026"
        await settle(pilot)
        assert date.has_class("-invalid")
        problem = str(app.screen.query_one("#d-problems").content)
        assert problem.startswith("date: the project file takes a date written YYYY-MM-DD")
        await pilot.click("#apply")  # refused while the date is not one
        await settle(pilot)
        assert isinstance(app.screen, DetailsDialog)
        date.value = "2026-11-21"
        await settle(pilot)
        assert not date.has_class("-invalid")
        await pilot.press("ctrl+s")  # applies (the button is still showing its last press)
        await settle(pilot)
        assert not isinstance(app.screen, DetailsDialog)
        assert app.session.project.details.date == "2026-11-21"

    drive(demo_path, steps)


# -- units, the list, the unsaved mark ----------------------------------------------------------


async def choose_units(app, pilot, units: str) -> None:
    await pilot.press("f2")
    await settle(pilot)
    app.screen.query_one("#d-units", Select).value = units
    await pilot.click("#apply")
    await settle(pilot)


def test_changing_units_asks_first_then_converts_every_value_and_the_tables(demo_path):
    async def steps(app, pilot):
        await choose_units(app, pilot, "us")
        assert isinstance(app.screen, Confirm)
        assert app.focused.id == "cancel"  # the safe answer
        assert "100 km/h becomes 62.1371 mph" in flat(screen_text(app))
        await pilot.press("enter")
        await settle(pilot)
        assert app.session.project.details.units == "metric"
        assert app.session.project.bends[0].inputs["speed"] == 100
        assert not app.session.dirty

        await choose_units(app, pilot, "us")
        await pilot.click("#convert")
        await settle(pilot)
        d = app.session.project.details
        assert (d.units, d.road_table, d.rail_limits) == ("us", "aashto-2018-us", None)
        qv01, qs01 = app.session.project.bends[0], app.session.project.bends[6]
        # exact factors: 1 mph = 1.609344 km/h, 1 ft = 0.3048 m, 1 in = 25.4 mm (definitions)
        assert qv01.inputs["speed"] == pytest.approx(100 / 1.609344, rel=1e-9)
        assert qv01.inputs["radius"] == pytest.approx(700 / 0.3048, rel=1e-9)
        assert qv01.station == pytest.approx(420 / 0.3048, rel=1e-9)
        assert qv01.inputs["emax"] == 8 and qv01.inputs["deflection"] == 24.5  # no unit
        assert qs01.inputs["cant"] == pytest.approx(60 / 25.4, rel=1e-9)
        assert values(app, "speed") == ["62.13711922"]
        assert "mph" in screen_text(app) and app.session.dirty

    drive(demo_path, steps)


def test_list_columns_widen_to_their_values(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await set_box(pilot, app, "radius", "12500")  # wider than any radius shown before
        await set_box(pilot, app, "speed", "100")
        row = region_text(app, "#bends").splitlines()[
            [b.id for b in app.session.project.bends].index("QV-04") + 1
        ]
        assert " 100 " in row and " 12500 " in row, row

    drive(demo_path, steps)


def test_the_unsaved_mark_is_on_screen_at_80_columns(demo_path):
    async def steps(app, pilot):
        assert "unsaved" not in screen_text(app).splitlines()[0]
        await set_box(pilot, app, "radius", "710")
        assert "unsaved" in screen_text(app).splitlines()[0]

    drive(demo_path, steps)


# -- printing, questions ------------------------------------------------------------------------


def test_f5_on_unsaved_work_asks_and_the_safe_answer_prints_nothing(demo_path):
    sheets = demo_path.with_name(demo_path.stem + ".sheets.pdf")

    async def steps(app, pilot):
        await set_box(pilot, app, "radius", "710")
        await pilot.press("f5")
        await settle(pilot)
        assert isinstance(app.screen, Confirm)
        assert app.focused.id == "cancel"
        assert "not in the saved file" in flat(screen_text(app))
        await pilot.press("enter")
        await settle(pilot)
        assert not sheets.exists() and app.session.dirty

    drive(demo_path, steps)


def test_every_question_starts_on_the_safe_answer(demo_path):
    async def steps(app, pilot):
        await pilot.press("f8", "enter")  # delete? Enter: keep it
        await settle(pilot)
        assert len(app.session.project.bends) == 8
        await set_box(pilot, app, "radius", "710")
        await pilot.press("ctrl+q", "enter")  # quit? Enter: go back
        await settle(pilot)
        assert app.is_running and app.session.dirty

    drive(demo_path, steps)


# -- the views ---------------------------------------------------------------------------------


def test_the_rail_chart_draws_cant_against_speed_with_the_allowed_band(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QS-01")
        await show_view(app, pilot, "chart")
        chart = app.query_one("#rail-chart")
        assert chart.region.height >= 10
        text = region_text(app, "#rail-chart")
        assert "Cant against speed" in text and "V_max" in text and "E(V)" in text
        assert "allowed" in text

    drive(demo_path, steps)


def test_the_results_scroll_by_keyboard_at_80x24_and_show_their_focus(demo_path):
    async def steps(app, pilot):
        results = app.query_one("#results")
        assert results.max_scroll_y > 0  # more than fits at 80x24
        last = fields_for("road")[-1].key  # the last field of a road bend
        app.query_one(f"#in-{last}").focus()
        await settle(pilot)
        before = region_text(app, "#results")
        await pilot.press("tab")
        await settle(pilot)
        assert app.focused is results
        assert region_text(app, "#results") != before  # the focus is drawn
        await pilot.press("down", "down", "pagedown")
        await settle(pilot)
        assert results.scroll_y > 2

    drive(demo_path, steps)
