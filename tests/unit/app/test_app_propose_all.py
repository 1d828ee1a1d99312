"""Propose every bend (shift+F7): the list of proposals, Apply as one step, ctrl+r puts
every bend back; and F7 on a bend on the alignment writes none of the fields the alignment
gives (deflection, PI station).

The project is the bundled demo (an invented scenario), copied for the test. The numbers
are the proposals' own (tested against published values in tests/unit/core and
tests/unit/bend); here only the app's behaviour is under test.
"""

from __future__ import annotations

import pytest
from app_screen import caution_on_screen, copy_demo, drive, flat, go_to, screen_text, settle
from textual.widgets import Button, Static

from curvetui.app.dialogs.proposal import ProposalDialog
from curvetui.app.dialogs.propose_all import ProposeAllDialog

pytestmark = pytest.mark.app


@pytest.fixture
def demo_path(tmp_path):
    return copy_demo(tmp_path)


def test_propose_every_bend_applies_as_one_step_and_ctrl_r_puts_all_back(demo_path):
    async def steps(app, pilot):
        session = app.session
        before = {b.id: dict(b.inputs) for b in session.project.bends}
        assert session.status(session.project.bend("QV-04")) == "fail"
        await pilot.press("shift+f7")
        await settle(pilot)
        dialog = app.screen
        assert isinstance(dialog, ProposeAllDialog)
        text = flat(screen_text(app))
        assert "Proposals for every bend" in text and "160 -> " in text  # QV-04's radius
        notes = str(dialog.query_one("#pa-notes", Static).content)
        assert "The alignment with these proposals: PASS" in notes
        assert caution_on_screen(app)
        changed = {i.bend.id: i.changes for i in dialog.items if i.changes}
        assert {"QV-04", "QS-01"} <= set(changed)
        dialog.query_one("#apply", Button).press()
        await settle(pilot)
        assert not isinstance(app.screen, ProposeAllDialog)
        for bend in session.project.bends:
            for key, value in changed.get(bend.id, {}).items():
                assert bend.inputs.get(key) == value
            # the alignment's fields are never written by a proposal
            assert bend.inputs.get("deflection") == before[bend.id].get("deflection")
            assert bend.inputs.get("pi_station") == before[bend.id].get("pi_station")
        assert session.status(session.project.bend("QV-04")) == "pass" and session.dirty
        await pilot.press("ctrl+r")
        await settle(pilot)
        assert {b.id: dict(b.inputs) for b in session.project.bends} == before
        assert session.status(session.project.bend("QV-04")) == "fail"

    drive(demo_path, steps)


def test_f7_on_a_bend_on_the_alignment_leaves_its_deflection_and_pi_station(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        bend = app.current
        bend.inputs["deflection"] = 10.0  # a stale stored value: the alignment's governs
        given = app.session.alignment_texts(bend)
        await pilot.press("f7")
        await settle(pilot)
        dialog = app.screen
        assert isinstance(dialog, ProposalDialog)
        assert dialog.proposal.inputs["deflection"] == pytest.approx(float(given["deflection"]))
        dialog.query_one("#apply", Button).press()
        await settle(pilot)
        assert bend.inputs["deflection"] == 10.0  # not written
        assert bend.inputs["radius"] == dialog.proposal.proposed["radius"]

    drive(demo_path, steps)
