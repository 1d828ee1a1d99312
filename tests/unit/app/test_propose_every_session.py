"""Every bend's proposal through the session (no Textual): propose_every lists them with
the alignment as it would be, set_many applies them as one change and the values it
returns put every bend back exactly; a radius set on a bend on the alignment moves the
stations of the bends after it.

The project is the bundled demo (an invented scenario), copied; the proposals' numbers are
tested against published values in tests/unit/core and tests/unit/bend.
"""

from __future__ import annotations

import pytest
from demo_session import demo_session

from curvetui.app.proposals import propose_every


@pytest.fixture
def session(tmp_path):
    return demo_session(tmp_path)


def test_set_many_is_one_change_and_puts_back_exactly(session):
    before = {b.id: dict(b.inputs) for b in session.project.bends}
    _, items, report = propose_every(session)
    assert [i.bend.id for i in items] == list(before)
    assert report is not None and report.status == "pass"
    seen = []
    session.watch(lambda s: seen.append(s.change.what))
    old = session.set_many([(i.bend, i.changes) for i in items if i.changes])
    assert seen == ["inputs"]  # one change
    assert all(session.status(b) == "pass" for b in session.project.bends)
    session.set_many(old)
    assert {b.id: dict(b.inputs) for b in session.project.bends} == before


def test_a_radius_set_on_the_alignment_moves_the_next_bends_pi_station(session):
    first, second = session.project.bend("QV-01"), session.project.bend("QV-02")
    station = session.state(second).record["geometry"]["pi"]
    session.set_inputs(first, {"radius": 1500})
    # a longer tangent on QV-01 (T = R tan(delta/2) grows) moves QV-02's back-stationed PI
    assert session.state(second).record["geometry"]["pi"] != pytest.approx(station, abs=1e-6)
