"""The realignment screen: the design summary and rail verdicts, braille charts of the
versines and slews (TS, SC, CS, ST marked) and the slew table, the caution always shown.
Escape goes back (or, opened alone from `curvetui realign ... --view`, ends the app).

``RealignApp`` shows it alone; the project app pushes it for a rail bend
(curvetui.app.realign_flow).
"""

from __future__ import annotations

from textual.app import App, ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import Screen
from textual.widgets import Footer, Static

from curvetui.app.crash import StopsCleanly
from curvetui.app.plain import markup_safe
from curvetui.app.widgets.frame import caution_line
from curvetui.app.widgets.realign_view import (
    RealignChart,
    notes_text,
    slew_table,
    summary_text,
)
from curvetui.reports.realign_sheet import RealignSheet, build_sheet


class RealignScreen(Screen):
    """One realignment, read-only."""

    DEFAULT_CSS = """
    RealignScreen #realign-top { height: auto; padding: 0 1; }
    RealignScreen #realign-body { height: 1fr; }
    RealignScreen #realign-head { height: auto; }
    RealignScreen #realign-summary { width: 60; height: auto; padding: 0 1; }
    RealignScreen #realign-charts { width: 1fr; height: 26; }
    RealignScreen #realign-notes, RealignScreen #realign-table { height: auto; padding: 0 1; }
    RealignScreen #caution { height: auto; }
    """
    BINDINGS = [Binding("escape", "back", "Back")]

    def __init__(self, sheet: RealignSheet, where: str = ""):
        super().__init__()
        self.sheet = sheet
        self.where = where

    def compose(self) -> ComposeResult:
        s = self.sheet
        colour = "red" if s.status == "FAIL" else "green"
        yield Static(
            f"[b]Realignment[/] {markup_safe(self.where)} | survey {markup_safe(s.survey)} | "
            f"{markup_safe(s.units.name)} | [b {colour}]{s.status}[/] | Esc: back",
            id="realign-top",
        )
        with VerticalScroll(id="realign-body"):
            with Horizontal(id="realign-head"):
                yield Static(summary_text(s), id="realign-summary")
                with Vertical(id="realign-charts"):
                    yield RealignChart(s, "versines", id="realign-versines")
                    yield RealignChart(s, "slews", id="realign-slews")
            yield Static(notes_text(s), id="realign-notes")
            yield Static(slew_table(s), id="realign-table")
        yield caution_line()
        yield Footer()

    def action_back(self) -> None:
        if len(self.app.screen_stack) > 1:
            self.app.pop_screen()
        else:
            self.app.exit()


class RealignApp(StopsCleanly, App):
    """A realignment on its own (`curvetui realign ... --view`)."""

    CSS_PATH = "app.tcss"
    TITLE = "curvetui"
    BINDINGS = [Binding("ctrl+q", "quit", "Quit", priority=True)]

    def __init__(self, design, rail, units, survey: str):
        super().__init__()
        self.sheet = build_sheet(design, rail, units, survey)

    def get_default_screen(self) -> Screen:
        return RealignScreen(self.sheet)
