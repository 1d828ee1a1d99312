"""F7 shows the proposal for the bend on screen; Apply sets its fields, and ctrl+r puts
back every field the apply changed, as one step.

The project is the bundled demo (an invented scenario), copied for the test. The numbers
are the proposal's own (tested against published values in tests/unit/core and
tests/unit/bend); here only the app's behaviour is under test.
"""

from __future__ import annotations

import pytest
from app_screen import caution_on_screen, copy_demo, drive, flat, go_to, screen_text, settle
from textual.widgets import Button, Input

from curvetui.app.dialogs.proposal import ProposalDialog

pytestmark = pytest.mark.app


@pytest.fixture
def demo_path(tmp_path):
    return copy_demo(tmp_path)


def test_f7_shows_applies_and_ctrl_r_puts_back_the_proposal(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-04")
        bend = app.current
        before = dict(bend.inputs)
        assert app.session.status(bend) == "fail"
        await pilot.press("f7")
        await settle(pilot)
        dialog = app.screen
        assert isinstance(dialog, ProposalDialog)
        text = flat(screen_text(app))
        assert "Proposal for bend QV-04" in text and "checked: PASS" in text
        assert caution_on_screen(app)
        proposed = dialog.proposal.proposed
        assert app.focused.id == "cancel"  # the safe answer first
        dialog.query_one("#apply", Button).press()
        await settle(pilot)
        assert not isinstance(app.screen, ProposalDialog)
        assert bend.inputs["radius"] == proposed["radius"] != before["radius"]
        assert bend.inputs["superelevation"] == proposed["superelevation"]
        assert app.session.status(bend) == "pass" and app.session.dirty
        radius_box = app.query_one("#in-radius", Input)
        assert radius_box.value == f"{proposed['radius']:g}"  # the form filled again
        await pilot.press("ctrl+r")
        await settle(pilot)
        assert bend.inputs == before  # every field back, in one step
        assert radius_box.value == f"{before['radius']:g}"
        assert app.session.status(bend) == "fail"

    drive(demo_path, steps)


def test_escape_leaves_the_bend_as_it_was(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QS-01")
        before = dict(app.current.inputs)
        await pilot.press("f7")
        await settle(pilot)
        assert isinstance(app.screen, ProposalDialog)
        assert "Applied cant" in screen_text(app)
        await pilot.press("escape")
        await settle(pilot)
        assert app.current.inputs == before and not app.session.dirty

    drive(demo_path, steps)
