"""The terminal app on a CSV file of bends: the batch results in a table (failures first,
sortable, filterable; curvetui.app.batch_screen) and any row opened as its worksheet
(curvetui.app.row_screen).

`build_batch_app(path, units, table, limits)` is the one way to make it, shared by the
command line and the tests. The batch engine runs in a thread worker after the first paint;
the table holds at most ``limit`` rows (failures first), and says so when the file has more.
"""

from __future__ import annotations

from pathlib import Path

from textual.app import App
from textual.binding import Binding
from textual.screen import Screen

from curvetui.app.batch_results import ROW_LIMIT, BatchSource, open_source
from curvetui.app.batch_screen import BatchScreen
from curvetui.app.crash import StopsCleanly
from curvetui.app.row_screen import RowScreen

__all__ = ["BatchApp", "BatchScreen", "RowScreen", "build_batch_app"]


class BatchApp(StopsCleanly, App):
    """A CSV file of bends: its checked results, and any row as a worksheet. An unexpected
    error ends it with exit code 3 and one line (nothing is edited here, so nothing to keep)."""

    CSS_PATH = "app.tcss"
    CSS = """
    BatchScreen #topbar, RowScreen #topbar { height: auto; }
    """
    TITLE = "curvetui"
    HORIZONTAL_BREAKPOINTS = [(0, "-narrow"), (110, "-wide")]
    BINDINGS = [
        Binding("f6", "toggle_theme", "Light/dark"),
        Binding("ctrl+q", "quit", "Quit", priority=True),
    ]

    def __init__(self, source: BatchSource, limit: int = ROW_LIMIT):
        super().__init__()
        self.source = source
        self.limit = limit

    def get_default_screen(self) -> Screen:
        return BatchScreen(self.source, self.limit)

    def action_toggle_theme(self) -> None:
        self.theme = "textual-light" if self.theme == "textual-dark" else "textual-dark"


def build_batch_app(path: str | Path, units, table, limits, limit: int = ROW_LIMIT) -> BatchApp:
    """The app on a CSV file; BatchFileError when its header cannot be used, OSError when it
    cannot be read."""
    return BatchApp(open_source(path, units, table, limits), limit)
