"""A proposal applied through the session (no Textual): several inputs in one change, and
the values they replaced, which put back restore the bend exactly.

The project is the bundled demo (an invented scenario), copied; the proposal's numbers are
tested against published values in tests/unit/core and tests/unit/bend.
"""

from __future__ import annotations

import pytest
from demo_session import demo_session

from curvetui.app.proposals import propose_for
from curvetui.inputs import InputError


@pytest.fixture
def session(tmp_path):
    return demo_session(tmp_path)


def test_apply_is_one_change_and_putting_back_restores_every_field(session):
    bend = next(b for b in session.project.bends if b.id == "QV-04")
    before = dict(bend.inputs)
    seen = []
    session.watch(lambda s: seen.append(s.change.what))
    _, proposal = propose_for(session, bend)
    old = session.set_inputs(bend, proposal.changes())
    assert seen == ["inputs"]  # one change, one recompute
    assert session.status(bend) == "pass" and session.dirty
    assert set(old) == set(proposal.changes())
    session.set_inputs(bend, old)
    assert bend.inputs == before and session.status(bend) == "fail"


def test_a_bend_without_a_speed_gets_a_message_naming_the_field(session):
    bend = session.add_bend("road")
    with pytest.raises(InputError, match=r"speed: required"):
        propose_for(session, bend)
