"""The realignment screen: alone (`curvetui realign ... --view`) and from a rail bend of a
project (F10, the palette's "Realign from a versine survey"). Only the app's behaviour is
under test: the slew table, the caution, messages for bad input, escape going back. The
survey is the worked example's measured versines (REFERENCES.md "Track realignment from
versines (Hallade)"); the project is the bundled demo (an invented scenario), copied.
"""

from __future__ import annotations

import asyncio
import io

import numpy as np
import pytest
from app_screen import LARGE, caution_on_screen, copy_demo, drive, flat, go_to, screen_text
from rich.console import Console
from textual.widgets import Input

from curvetui.app.dialogs.realign_survey import RealignSurveyDialog
from curvetui.app.realign_screen import RealignApp, RealignScreen
from curvetui.core.units import unit_system
from curvetui.core.versine_design import design_realignment

pytestmark = pytest.mark.app

MEASURED = [0, 2, 9, 20, 28, 29, 30, 31, 32, 31, 19, 7, 2, 0]  # mm, 6 m apart, chord 12 m


def test_standalone_view_shows_the_table_and_the_caution():
    st = 6.0 * np.arange(len(MEASURED))
    design = design_realignment(st, np.array(MEASURED) / 1000.0, 12.0, slew_limit=1e-4)
    assert not design.feasible
    app = RealignApp(design, None, unit_system("metric"), "survey.csv")

    async def run() -> None:
        async with app.run_test(size=LARGE) as pilot:
            await pilot.pause()
            assert isinstance(app.screen, RealignScreen)
            text = flat(screen_text(app))
            assert "INFEASIBLE" in text and "Smallest limit that works" in text
            assert caution_on_screen(app)
            console = Console(width=100, file=io.StringIO(), record=True)
            console.print(app.query_one("#realign-table").content)
            rows = console.export_text()
            body = [r.split("│")[1:6] for r in rows.splitlines() if r.count("│") == 6]
            body = [[c.strip() for c in r] for r in body if r[0].strip()[:1].isdigit()]
            assert [r[0] for r in body] == [f"{6 * i:.2f}" for i in range(len(MEASURED))]
            assert [r[1] for r in body] == [f"{v:.1f}" for v in MEASURED]
            assert [r[3] for r in body] == [r[3] for r in app.sheet.table]
            await pilot.press("escape")
            await pilot.pause()
            assert not app.is_running or app.return_code is not None

    asyncio.run(run())


def test_palette_action_on_a_rail_bend_with_a_survey_file(tmp_path):
    path = copy_demo(tmp_path)
    survey = tmp_path / "survey.csv"
    rows = "".join(f"{6 * i},{v}\n" for i, v in enumerate(MEASURED))
    survey.write_text("station,versine\n" + rows, encoding="utf-8")
    before = survey.read_bytes()

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-01")
        app.action_realign()  # a road bend: refused with a note
        await pilot.pause()
        assert not isinstance(app.screen, RealignSurveyDialog)
        await go_to(app, pilot, "QS-01")
        titles = [c.title for c in app.get_system_commands(app.screen)]
        assert "Realign from a versine survey" in titles
        await pilot.press("f10")
        await pilot.pause()
        dialog = app.screen
        assert isinstance(dialog, RealignSurveyDialog)
        dialog.query_one("#rs-path", Input).value = str(survey)
        dialog.query_one("#rs-chord", Input).value = "0"
        dialog.action_ok()
        await pilot.pause()
        assert "chord: a number more than 0 and at most 1000 m" in flat(screen_text(app))
        dialog.query_one("#rs-chord", Input).value = "12"
        dialog.action_ok()
        for _ in range(4):
            await pilot.pause()
        screen = app.screen
        assert isinstance(screen, RealignScreen)
        assert screen.sheet.status in ("PASS", "FAIL")
        rail = {x.label: x.value for x in screen.sheet.rail}
        assert "Cant" in rail  # checked with the bend's speeds and the project's limits
        text = flat(screen_text(app))
        assert "Realignment of QS-01" in text and caution_on_screen(app)
        await pilot.press("escape")
        await pilot.pause()
        assert not isinstance(app.screen, RealignScreen)
        assert not app.session.dirty  # nothing of the project changed

    drive(path, steps, LARGE)
    assert survey.read_bytes() == before
