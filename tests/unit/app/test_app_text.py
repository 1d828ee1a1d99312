"""Text from a project file is shown as text (issue 14): markup in an id, a name or a note
does nothing (``[/]`` broke the screen, ``[@click=app.quit]`` quit the app, ``[link=...]``
hid a link) and control characters (ESC, BEL) never reach the terminal.

The project is the bundled demo (an invented scenario) with hostile text written into it.
"""

from __future__ import annotations

import json

import pytest
from app_screen import DEMO, drive, go_to, screen_text
from rich.text import Text
from textual.widgets import Input

from curvetui.app.dialogs.confirm import Confirm
from curvetui.app.dialogs.details import DetailsDialog

pytestmark = pytest.mark.app

CLICK = "[@click=app.quit]Q1[/]"
TITLE = "\x1b]0;TITLE2\x07B2\x07"  # would set the terminal's title
NAME = "Evil [@click=app.quit]click me[/] [link=https://example.invalid]L[/link] \x1b[31m end"
NOTE = "[link=https://example.invalid]x[/link] [/] \x1b[31mred"


@pytest.fixture
def hostile_path(tmp_path):
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    data["details"]["name"] = NAME
    data["details"]["job_number"] = "[/]"
    data["bends"][0]["id"] = CLICK
    data["bends"][1]["id"] = TITLE
    data["bends"][2]["id"] = "[/]"
    data["bends"][3]["notes"] = NOTE
    path = tmp_path / "hostile [b].json"
    path.write_text(json.dumps(data, indent=2), encoding="utf-8")
    return path


def no_control_codes(text: str) -> bool:
    return not any(ch in text for ch in "\x1b\x07\x9b")


def test_ids_names_and_notes_show_as_text_and_do_nothing(hostile_path):
    async def steps(app, pilot):
        text = screen_text(app)
        assert no_control_codes(text)
        top = text.splitlines()[0]
        assert "Evil [@click=app.quit]click me[/] [link=https://example.invalid]L[/link]" in top
        assert "hostile [b].json" in Text.from_markup(str(app.query_one("#topbar").content)).plain
        assert CLICK in text and "\ufffd]0;TITLE2\ufffdB2\ufffd" in text and " [/] " in text
        assert app.query_one("#in-bend_id", Input).value == CLICK
        # a click on the name's "click me" runs nothing: the app is still running
        await pilot.click("#topbar", offset=(top.index("click me") + 2, 0))
        await pilot.pause()
        assert app.is_running and app.return_code is None
        # the id with control characters, on the worksheet
        await go_to(app, pilot, TITLE)
        assert app.query_one("#in-bend_id", Input).value == "\ufffd]0;TITLE2\ufffdB2\ufffd"
        assert no_control_codes(screen_text(app))
        # a note with a link and a closing tag, in its field
        await go_to(app, pilot, "QV-04")
        assert app.query_one("#in-notes", Input).value == "[link=https://example.invalid]x" + (
            "[/link] [/] \ufffd[31mred"
        )
        assert no_control_codes(screen_text(app))
        assert not app.session.dirty  # shown, not changed
        assert app.session.project.bends[1].id == TITLE  # kept exactly as read

    drive(hostile_path, steps)


def test_a_question_and_a_note_name_the_bend_as_text(hostile_path):
    async def steps(app, pilot):
        await go_to(app, pilot, CLICK)
        await pilot.press("f8")
        await pilot.pause()
        assert isinstance(app.screen, Confirm)
        assert f"Delete bend {CLICK}?" in screen_text(app)
        await pilot.press("escape")
        await pilot.pause()
        await go_to(app, pilot, "[/]")
        await pilot.press("f4")  # "Copied as ..." then names the copy; the id copied is "[/]"
        await pilot.pause()
        assert app.is_running
        await pilot.press("f2")
        await pilot.pause()
        assert isinstance(app.screen, DetailsDialog)
        name = app.screen.query_one("#d-name", Input).value
        assert name == NAME.replace("\x1b", "\ufffd")
        assert no_control_codes(screen_text(app))
        await pilot.press("escape")
        await pilot.pause()
        assert app.session.project.details.name == NAME

    drive(hostile_path, steps)


def test_details_applied_unchanged_keep_the_stored_text(hostile_path):
    async def steps(app, pilot):
        await pilot.press("f2")
        await pilot.pause()
        await pilot.click("#apply")
        await pilot.pause()
        assert not isinstance(app.screen, DetailsDialog)
        assert app.session.project.details.name == NAME  # not the text as shown
        assert not app.session.dirty

    drive(hostile_path, steps)


def test_a_typed_value_quoted_in_a_message_is_shown_as_text_in_every_view(hostile_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        app.query_one("#in-deflection", Input).value = "9\x1b[31m[/]"
        await pilot.pause()
        assert "deflection" in (app.session.state(app.current).error or "")
        for view in ("sheet", "working", "plan", "chart"):
            app.query_one("#views").active = view
            await pilot.pause()
            await pilot.pause()
            assert no_control_codes(screen_text(app)), view
        assert app.is_running

    drive(hostile_path, steps)
