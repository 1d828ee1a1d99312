"""Helpers shared by the app's tests: run it, read what is on the terminal, move about.

The project they run on is the bundled demo, an invented scenario, copied first; only the
app's behaviour is under test.

Starting the app (mounting its hundred-odd widgets) costs about as much as a whole test, so
``drive`` keeps one running app per terminal size and hands it from test to test, put back
first to what a fresh start shows (``start_afresh``: the test's own copy of the file opened
anew, no dialog, the worksheet, the list focused, the dark theme);
``test_app.py::test_a_shared_app_starts_as_a_fresh_one`` checks that. A test that closes the
app, or fails, leaves the next one a new app.
"""

from __future__ import annotations

import asyncio
import io
import re
import shutil
from collections.abc import Awaitable, Callable
from pathlib import Path

from rich.console import Console
from textual.pilot import Pilot
from textual.widgets import Input, TabbedContent

from curvetui import CAUTION
from curvetui.app.app import CurveApp, build_app
from curvetui.app.session import Session
from curvetui.app.widgets.bend_list import BendList

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"
SMALL, LARGE = (80, 24), (120, 40)


def copy_demo(folder: Path) -> Path:
    """A copy of the demo under its own name (the top bar shows the file name)."""
    target = folder / "quillmere-valley-road.json"
    shutil.copyfile(DEMO, target)
    return target


def copy_demo_off_alignment(folder: Path) -> Path:
    """A copy of the demo without its alignment (format 2): its bends' deflection and PI
    station are then their own, typed in the form."""
    import json

    target = folder / "quillmere-valley-road.json"
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    data.pop("alignment")
    data["curvetui_project_version"] = 2
    target.write_text(json.dumps(data, indent=2, ensure_ascii=False) + "\n", encoding="utf-8")
    return target


def drive(
    path: Path,
    steps: Callable[[CurveApp, Pilot], Awaitable[None]],
    size: tuple[int, int] = SMALL,
) -> CurveApp:
    """Run the app on ``path`` at ``size`` and let ``steps`` press keys and check."""
    if size not in _SHARED:
        _SHARED[size] = SharedApp(size)
    return _SHARED[size].run(path, steps)


class SharedApp:
    """A running app at one terminal size, handed from test to test."""

    def __init__(self, size: tuple[int, int]):
        self.size = size
        self.loop = asyncio.new_event_loop()
        self.jobs: asyncio.Queue | None = None
        self.host: asyncio.Task | None = None

    def run(self, path: Path, steps: Callable[[CurveApp, Pilot], Awaitable[None]]) -> CurveApp:
        if self.host is None or self.host.done():
            self.jobs = asyncio.Queue()
            self.host = self.loop.create_task(self._serve(path))
        done = self.loop.create_future()
        self.jobs.put_nowait((path, steps, done))
        self.loop.run_until_complete(
            asyncio.wait([done, self.host], return_when=asyncio.FIRST_COMPLETED)
        )
        if not done.done():  # the app itself broke down
            self.host.result()
            raise AssertionError("the app stopped before the test's steps ran")
        return done.result()

    async def _serve(self, path: Path) -> None:
        app = build_app(path)
        last: tuple[asyncio.Future, BaseException | None] | None = None
        async with app.run_test(size=self.size) as pilot:
            await ready(app, pilot)
            theme = app.theme  # as a fresh start has it
            while True:
                path, steps, done = await self.jobs.get()
                if steps is None:
                    return
                try:
                    await start_afresh(app, pilot, path, theme)
                    await steps(app, pilot)
                except asyncio.CancelledError:
                    raise
                except BaseException as exc:  # a failed check: the next test gets a new app
                    last = (done, exc)
                    break
                if not app.is_running or app.return_code is not None:
                    # the test closed it, or a handler raised (run_test raises that on leaving)
                    last = (done, None)
                    break
                done.set_result(app)
        done, exc = last
        if exc is None:
            done.set_result(app)
        else:
            done.set_exception(exc)

    def close(self) -> None:
        if self.host is not None and not self.host.done():
            self.jobs.put_nowait((None, None, None))
            self.loop.run_until_complete(self.host)
        self.loop.close()


_SHARED: dict[tuple[int, int], SharedApp] = {}


def close_shared_apps() -> None:
    """Shut the shared apps down (tests/conftest.py calls this at the end of the session)."""
    while _SHARED:
        _SHARED.popitem()[1].close()


async def start_afresh(app: CurveApp, pilot: Pilot, path: Path, theme: str) -> None:
    """Put a running app back to what a fresh start on ``path`` shows."""
    while len(app.screen_stack) > 1:
        await app.pop_screen()
    app.theme = theme
    app.clear_notifications()
    app.open_session(Session.open(path))
    await ready(app, pilot)
    await pilot.wait_for_scheduled_animations()  # e.g. the tab underline sliding back


async def ready(app: CurveApp, pilot: Pilot) -> None:
    """Wait for the first computation (the app paints first, then runs the engine)."""
    for _ in range(50):
        await pilot.pause()
        bends = app.session.project.bends
        if all(app.session.status(b) != "pending" for b in bends):
            return
    raise AssertionError("the bends were never computed")


def screen_text(app: CurveApp) -> str:
    """The characters on the terminal now, the top screen over those beneath it."""
    width, height = app.size
    console = Console(
        width=width,
        height=height,
        file=io.StringIO(),
        record=True,
        force_terminal=True,
        legacy_windows=False,
        safe_box=False,
    )
    console.print(
        app.screen._compositor.render_update(full=True, screen_stack=app._background_screens)
    )
    return console.export_text()


def region_text(app: CurveApp, selector: str) -> str:
    """The characters on screen inside one widget's region."""
    region = app.query_one(selector).region
    lines = screen_text(app).splitlines()[region.y : region.y + region.height]
    return "\n".join(line[region.x : region.x + region.width] for line in lines)


def working_text(app: CurveApp) -> str:
    """All the rows of the working view (it scrolls), as plain text."""
    console = Console(width=100, file=io.StringIO(), record=True, legacy_windows=False)
    console.print(app.query_one("#working-view").content)
    return console.export_text()


def flat(text: str) -> str:
    return re.sub(r"\s+", " ", text)


# characters that draw the edge of a panel or a dialog: a wrapped line of text ends there
EDGES = "█▌▐│┃▎▊▏"


def caution_on_screen(app: CurveApp) -> bool:
    """The whole caution is visible somewhere: it may wrap over a few lines, inside the main
    screen or inside a dialog, but nothing may cover any part of it."""
    lines = screen_text(app).splitlines()
    for row, line in enumerate(lines):
        col = line.find("CAUTION:")
        while col >= 0:
            parts = []
            for text in lines[row : row + 5]:
                piece = text[col:]
                cut = min((i for i, ch in enumerate(piece) if ch in EDGES), default=len(piece))
                parts.append(piece[:cut])
            if CAUTION in flat(" ".join(parts)):
                return True
            col = line.find("CAUTION:", col + 1)
    return False


def caution_widget_text(app: CurveApp) -> str:
    base = app.screen_stack[0]
    return str(base.query_one("#caution").content)


def row_cells(app: CurveApp, bend_id: str) -> list[str]:
    table = app.query_one(BendList)
    index = [b.id for b in app.session.project.bends].index(bend_id)
    return [str(c) for c in table.get_row_at(index)]


def status_word(app: CurveApp, bend_id: str) -> str:
    return row_cells(app, bend_id)[1]


def list_ids(app: CurveApp) -> list[str]:
    table = app.query_one(BendList)
    return [str(table.get_row_at(i)[0]) for i in range(table.row_count)]


async def settle(pilot: Pilot, rounds: int = 6) -> None:
    """Let a few rounds of messages run (a dialog opening, a recompute landing)."""
    for _ in range(rounds):
        await pilot.pause()


async def go_to(app: CurveApp, pilot: Pilot, bend_id: str) -> None:
    """Put the list cursor on ``bend_id`` (as the arrow keys do; those are tested once)."""
    table = app.query_one(BendList)
    table.focus()
    table.move_cursor(row=[b.id for b in app.session.project.bends].index(bend_id))
    await pilot.pause()
    assert app.current is not None and app.current.id == bend_id


async def retype(pilot: Pilot, app: CurveApp, key: str, text: str) -> None:
    """Focus an input, empty it (as select-all and delete would), type ``text``."""
    box = app.query_one(f"#in-{key}", Input)
    box.focus()
    await pilot.pause()
    box.value = ""
    await pilot.pause()
    if text:
        await pilot.press(*text)
        await pilot.pause()


async def set_box(pilot: Pilot, app: CurveApp, key: str, text: str) -> None:
    """Put ``text`` in an input at once (one change, as a paste would)."""
    app.query_one(f"#in-{key}", Input).value = text
    await pilot.pause()


async def show_view(app: CurveApp, pilot: Pilot, view: str) -> None:
    """Show a view (as F9 does; F9 itself is tested with the caution)."""
    app.query_one("#views", TabbedContent).active = view
    await pilot.pause()
    await pilot.pause()


async def palette_settles(app: CurveApp, pilot: Pilot, expected: str) -> None:
    """Wait for the command palette's search (it runs in the background) to show a hit."""
    for _ in range(40):
        await pilot.pause(0.05)
        if expected in screen_text(app):
            return
