"""What is typed is kept: keys in order at any speed, nothing changed by opening a file,
undo, station text, unit changes, the list's widths, the unsaved mark, new bends, printing
unsaved work, the safe button of each question, the rail chart, scrolling the results.

The project is the bundled demo (an invented scenario), copied for each test.
"""

from __future__ import annotations

import pytest
from app_screen import copy_demo, drive, go_to
from textual import events
from textual.widgets import Input

pytestmark = pytest.mark.app


@pytest.fixture
def demo_path(tmp_path):
    return copy_demo(tmp_path)


def burst(app, *keys: str) -> None:
    """Post keys to the app all at once, as a terminal does when they come faster than the
    app handles them (each is queued before the first has acted)."""
    for key in keys:
        char = key if len(key) == 1 else None
        app.post_message(events.Key(key, char))


async def settle(pilot, rounds: int = 6) -> None:
    for _ in range(rounds):
        await pilot.pause()


def values(app, *keys: str) -> list[str]:
    return [app.query_one(f"#in-{k}", Input).value for k in keys]


# -- every key in the focused field, in order ------------------------------------------------


def test_keys_typed_faster_than_the_app_land_in_order_in_their_fields(demo_path):
    """Enter on the list opens the worksheet on the speed; Tab moves to the radius, then the
    deflection. Before the fix a key that came while Tab was still on its way through the
    app's queues went to the field before it."""

    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        burst(app, "enter", "6", "0", "tab", "3", "2", "0", "tab", "1", "2")
        await settle(pilot)
        assert values(app, "speed", "radius", "deflection") == ["60", "320", "12"]
        assert app.focused is app.query_one("#in-deflection")
        inputs = app.current.inputs
        assert (inputs["speed"], inputs["radius"], inputs["deflection"]) == (60, 320, 12)

    drive(demo_path, steps)


def test_backspace_typed_in_a_burst_deletes_the_key_before_it(demo_path):
    async def steps(app, pilot):
        await go_to(app, pilot, "QV-02")
        burst(app, "enter", "9", "8", "backspace", "5")
        await settle(pilot)
        assert values(app, "speed") == ["95"]

    drive(demo_path, steps)
