"""The cycle collector is paused while the app starts and runs again once the first
results are on screen (curvetui.app.collector).

Only the app's behaviour is under test (no engineering value); the app runs on a copy of
the bundled demo project, an invented scenario. The time it saves is measured by hand
(benchmarks/app_startup.py), never in a test.
"""

from __future__ import annotations

import asyncio
import gc
import weakref

import pytest
from app_screen import copy_demo, ready, screen_text

from curvetui.app import collector
from curvetui.app.app import build_app


class Node:
    me: object = None


@pytest.fixture
def collector_state():
    """Leave the interpreter's collector as it was (running, nothing frozen)."""
    was = gc.isenabled()
    yield
    collector._paused = False
    gc.unfreeze()
    if was:
        gc.enable()


def test_pause_then_resume(collector_state):
    gc.enable()
    collector.pause()
    assert not gc.isenabled() and collector.paused()
    garbage = Node()
    garbage.me = garbage  # a cycle: only the collector frees it
    gone = weakref.ref(garbage)
    del garbage
    assert gone() is not None  # paused: not freed
    collector.resume()
    assert gc.isenabled() and not collector.paused()
    assert gone() is None  # freed by the collection in resume, not frozen
    assert gc.get_freeze_count() > 0  # what start-up left alive is frozen


def test_resume_without_pause_does_nothing(collector_state):
    gc.disable()  # e.g. a caller that turned it off itself: left off, nothing frozen
    collector.resume()
    assert not gc.isenabled() and gc.get_freeze_count() == 0


def test_pause_leaves_a_stopped_collector_alone(collector_state):
    gc.disable()
    collector.pause()
    assert not collector.paused()  # so resume will not switch it on
    collector.resume()
    assert not gc.isenabled()


@pytest.mark.app
def test_the_app_resumes_the_collector_after_the_first_results(collector_state, tmp_path):
    gc.enable()
    app = build_app(copy_demo(tmp_path))

    async def run() -> None:
        collector.pause()  # as the command line does before it builds the app
        async with app.run_test(size=(120, 40)) as pilot:
            await ready(app, pilot)
            assert "road bend, " in screen_text(app)  # the first bend's results
            for _ in range(5):
                if not collector.paused():
                    break
                await pilot.pause()
            assert not collector.paused() and gc.isenabled()

    asyncio.run(run())
