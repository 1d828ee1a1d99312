"""Screenshots of the terminal app compared with accepted ones (pytest-textual-snapshot).

All project data here is invented: the app runs on a copy of the bundled demo project
("Quillmere Valley Road", an invented scenario), always saved under the demo's own file name
so the top bar reads the same on every machine. Only the app's behaviour (what it draws) is
under test. Before each screenshot the test also checks, in words, that the whole caution is
on screen and, for the failing bend QV-04, that FAIL is.

After a deliberate change to the screens: `pytest tests/unit/app/test_app_snapshots.py
--snapshot-update`, then look at the new SVGs in __snapshots__/ before committing them.
"""

from __future__ import annotations

import pytest
from app_screen import (
    LARGE,
    SMALL,
    caution_on_screen,
    copy_demo,
    go_to,
    ready,
    screen_text,
    show_view,
)

from curvetui.app.app import build_app

pytestmark = pytest.mark.app  # starts Textual: `pytest -m "not app"` leaves it out

SIZES = pytest.mark.parametrize("size", [SMALL, LARGE], ids=["80x24", "120x40"])


def shoot(snap_compare, tmp_path, size, bend_id=None, view=None, must_show=()):
    app = build_app(copy_demo(tmp_path))

    async def run_before(pilot) -> None:
        await ready(app, pilot)
        if bend_id is not None:
            await go_to(app, pilot, bend_id)
        if view is not None:
            await show_view(app, pilot, view)
        await pilot.pause()
        assert caution_on_screen(app)
        text = screen_text(app)
        for words in must_show:
            assert words in text, words

    return snap_compare(app, terminal_size=size, run_before=run_before)


@SIZES
def test_start_screen(snap_compare, tmp_path, size):
    assert shoot(snap_compare, tmp_path, size, must_show=("QV-04  FAIL", "PASS   road bend"))


@SIZES
def test_worksheet_of_failing_bend(snap_compare, tmp_path, size):
    assert shoot(
        snap_compare,
        tmp_path,
        size,
        "QV-04",
        "sheet",
        must_show=("QV-04  FAIL", "FAIL   road bend, 80 km/h, R 160 m"),
    )


@SIZES
def test_plan_view(snap_compare, tmp_path, size):
    assert shoot(
        snap_compare,
        tmp_path,
        size,
        "QV-04",
        "plan",
        must_show=("QV-04  FAIL", "PC 2+631.963", "PT 2+777.174"),
    )


@SIZES
def test_chart_view(snap_compare, tmp_path, size):
    assert shoot(
        snap_compare, tmp_path, size, "QV-04", "chart", must_show=("QV-04  FAIL", "✕ FAIL")
    )
