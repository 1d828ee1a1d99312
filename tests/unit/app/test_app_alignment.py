"""The project's alignment in the app: the Alignment view (to bearing, the chosen bend
highlighted with its key stations, the verdicts under it), the read-only deflection and
PI station of a bend on it, and the session keeping stations carried through.

Values: the demo's PIs are placed (projects/quillmere-valley-road.json) so that each
bend's PI station is the one it had before the alignment; QV-04's PC and PT are then
PI - T and PC + L with T = 160 tan 26 deg = 78.037 m, L = 160 x 52 pi / 180 = 145.211 m
(simple-curve formulas, REFERENCES.md), 2+631.963 and 2+777.174.
"""

from __future__ import annotations

import math

import pytest
from app_screen import LARGE, copy_demo, drive, flat, go_to, region_text, show_view
from textual.widgets import Input

from curvetui.app.session import Session

T4 = 160 * math.tan(math.radians(26))
L4 = 160 * math.radians(52)


def test_alignment_view_to_bearing_with_the_chosen_bend(tmp_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        await show_view(app, pilot, "alignment")
        text = region_text(app, "#alignment-view")
        assert "Alignment Quillmere Valley Road centreline: PASS" in text
        assert "N" in text and "↑" in text  # the north arrow
        assert "to bearing, north up, one scale both ways" in flat(text)
        for label in ("PI4 QV-04", "PI1 QV-01", "PI6 QV-06"):
            assert label in text, label
        # the chosen bend's key stations (one decimal on screen)
        assert (
            f"PC 2+{2710 - T4 - 2000:.1f}" in text and f"PT 2+{2710 - T4 + L4 - 2000:.1f}" in text
        )
        assert "alignment: PASS, no warnings between bends" in text
        # the form: deflection and PI station from the alignment, read-only, with the note
        await show_view(app, pilot, "sheet")
        assert app.query_one("#in-deflection", Input).disabled
        assert app.query_one("#in-pi_station", Input).value == "2+710.000"
        assert "deflection and PI station come from it" in flat(region_text(app, "#alignment-note"))
        await go_to(app, pilot, "QS-01")  # a rail curve off the alignment: its own, typed
        assert not app.query_one("#in-deflection", Input).disabled

    drive(copy_demo(tmp_path), steps, LARGE)


pytestmark = pytest.mark.app


@pytest.fixture
def session(tmp_path) -> Session:
    return Session.open(copy_demo(tmp_path))


def test_a_radius_edit_moves_the_stations_after_it(session):
    qv03 = session.project.bend("QV-03")
    qv04 = session.project.bend("QV-04")
    before = session.state(qv04).record["geometry"]["pi"]
    assert before == pytest.approx(2710.0)
    # QV-03: R 2500 m, D 6 deg, no spiral; at R 2000 m its 2T - L shrinks by
    # 500 (2 tan 3 deg - 6 pi / 180) = 0.0137 m, and every station after it moves by that
    session.set_input(qv03, "radius", "2000")
    shift = 500 * (2 * math.tan(math.radians(3)) - math.radians(6))
    assert session.state(qv04).record["geometry"]["pi"] == pytest.approx(2710.0 + shift)


def test_renaming_a_bend_keeps_its_pi(session):
    qv02 = session.project.bend("QV-02")
    session.rename(qv02, "QV-02a")
    assert session.project.alignment.points[2].bend == "QV-02a"
    assert session.layout.error is None
    assert session.alignment_texts(qv02)["pi_station"] == "1+185.000"
