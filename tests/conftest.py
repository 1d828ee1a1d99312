"""Shared fixtures: the two shipped Green Book road tables; the `app` marker's upkeep.

Tests that start Textual carry the marker `app` (``pytestmark = pytest.mark.app`` in each such
module); a module that starts Textual without it is marked here all the same, so that
``pytest -m "not app"`` stays the quick part of the suite.
"""

from __future__ import annotations

import os
import sys
from functools import cache
from pathlib import Path

import pytest
from hypothesis import settings

from curvetui.storage.tables import road_table

# In CI the property tests run the same examples every time (a red CI must be repeatable);
# on a developer's machine they search afresh each run.
settings.register_profile("ci", derandomize=True)
if os.environ.get("CI"):
    settings.load_profile("ci")

# what a test module says when it starts Textual
STARTS_TEXTUAL = ("run_test(", "snap_compare", "app_screen import")

# Pilot waits for the app to be idle by sleeping in steps of 20 ms (textual._wait, Textual
# 8.2.8) until a step passes with under 1/20 of it spent on the CPU; every key press waits two
# such steps and every pause one, some 900 steps in test_app.py alone. Steps of 5 ms keep
# the same test (the messages already queued are still processed first, and the app must
# still be seen idle for a whole step) and leave most of that sleeping out.
IDLE_STEP = 0.005


@cache
def _starts_textual(path: Path) -> bool:
    text = path.read_text(encoding="utf-8")
    return any(words in text for words in STARTS_TEXTUAL)


def pytest_collection_modifyitems(items: list[pytest.Item]) -> None:
    for item in items:
        path = Path(str(item.fspath))
        if item.get_closest_marker("app") is None and _starts_textual(path):
            item.add_marker(pytest.mark.app)


@pytest.fixture(autouse=True)
def _quick_idle_steps(request: pytest.FixtureRequest, monkeypatch: pytest.MonkeyPatch):
    """Shorter idle steps for the tests that drive Textual (see IDLE_STEP)."""
    if request.node.get_closest_marker("app") is not None:
        from textual import _wait

        monkeypatch.setattr(_wait, "SLEEP_GRANULARITY", IDLE_STEP)
        monkeypatch.setattr(_wait, "SLEEP_IDLE", IDLE_STEP / 20)
    yield


@pytest.fixture(scope="session", autouse=True)
def _close_shared_apps():
    """Shut down the apps the app tests share (tests/unit/app/app_screen.py), if they ran."""
    yield
    screen = sys.modules.get("app_screen")
    if screen is not None:
        screen.close_shared_apps()


@pytest.fixture(scope="session")
def us():
    """AASHTO Green Book 2018 table, US customary (mph, ft)."""
    return road_table("aashto-2018-us")


@pytest.fixture(scope="session")
def metric():
    """AASHTO Green Book 2018 table, metric (km/h, m)."""
    return road_table("aashto-2018-metric")
