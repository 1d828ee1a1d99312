"""The Crossfall view (the superelevation diagram) as a user sees it on the demo project:
key stations marked, the elevation table below, a short curve said in words, rail curves
and normal-crown bends given a reason instead of a picture."""

from __future__ import annotations

from pathlib import Path

import pytest
from app_screen import (
    LARGE,
    copy_demo_off_alignment,
    drive,
    flat,
    go_to,
    region_text,
    set_box,
    show_view,
)

pytestmark = pytest.mark.app  # starts Textual: `pytest -m "not app"` leaves it out


@pytest.fixture
def demo_path(tmp_path: Path) -> Path:
    return copy_demo_off_alignment(tmp_path)  # deflections typed in the form


def test_crossfall_view_follows_the_bend(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")  # spiralled: level crown at the TS
        await show_view(app, pilot, "crossfall")
        view = region_text(app, "#crossfall-view")
        assert "Cross slope against station, e 7.86 %, axis: centreline" in view
        for label in (" NC ", " LC ", " RC ", "TS", "SC", "CS", "ST", "outside edge"):
            assert label in view, label
        assert "Level crown, TS" in flat(view)
        await set_box(pilot, app, "rotation_axis", "Inside")  # the form's field, any case
        view = flat(region_text(app, "#crossfall-view"))
        assert "axis: inside" in view
        await go_to(app, pilot, "QV-04")  # simple curve; shorten it: full e never reached
        await set_box(pilot, app, "deflection", "4")
        view = flat(region_text(app, "#crossfall-view"))
        assert "SHORT CURVE" in view and "never reached" in view
        assert "FAILS a check" in view  # QV-04 fails its radius check: said here too
        await go_to(app, pilot, "QV-03")  # normal crown kept
        assert "normal crown is kept" in flat(region_text(app, "#crossfall-view"))
        await go_to(app, pilot, "QS-01")
        assert "road bends only" in flat(region_text(app, "#crossfall-view"))

    drive(demo_path, steps, LARGE)
