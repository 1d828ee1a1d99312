"""The lines round every screen of the app: the top bar and the caution (always shown:
local road or rail authority standards govern; a qualified engineer checks the results)."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from curvetui import CAUTION
from curvetui.app.plain import markup_safe
from curvetui.app.session import Session
from curvetui.inputs import InputError


def caution_line() -> Static:
    """The caution, in bold, for the foot of a screen."""
    return Static(Text(CAUTION, style="bold"), id="caution")


class ProjectBar(Static):
    """The word 'unsaved' while it is (first: a narrow terminal never cuts it off), then
    the project's name, job number, file, units and tables."""

    def show_session(self, session: Session, with_tables: bool = True) -> None:
        """The bar of ``session``; with ``with_tables`` False without the tables (the app's
        first frame, painted before the tables and the engine are loaded)."""
        d = session.project.details
        tables = ""
        if with_tables:
            try:
                ctx = session.context
                tables = f" | road table {ctx.table.name} | rail limits {ctx.limits.name}"
            except InputError as exc:
                tables = f" | TABLE PROBLEM: {exc}"
        mark = "[b reverse] unsaved [/] " if session.dirty else ""
        name = session.path.name if session.path else "(no file)"
        text = (
            f"{mark}[b]{markup_safe(d.name)}[/] {markup_safe(d.job_number)} | "
            f"{markup_safe(name)} | {markup_safe(d.units)}{markup_safe(tables)}"
        )
        if text != getattr(self, "_text", None):  # every update lays the screen out again
            self._text = text
            self.update(text)
