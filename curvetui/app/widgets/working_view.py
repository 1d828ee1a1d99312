"""The working: each result with its formula, the substituted values and the source."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.widgets import Static

from curvetui.app.plain import plain_text
from curvetui.app.session import Session
from curvetui.inputs import InputError
from curvetui.reports.working import Step, rail_working, road_working


def working_steps(kind: str, record: dict | None, table, limits, units) -> list[Step] | None:
    """The steps of a bend's record: road working against ``table``, rail against ``limits``."""
    if record is None:
        return None
    if kind == "road":
        return road_working(record, table, units)
    return rail_working(record, limits, units)


class WorkingView(Static):
    def show_session(self, session: Session) -> None:
        """The working of the bend on screen, from its last good record."""
        bend = session.current
        record = session.state(bend).record if bend is not None else None
        try:
            ctx = session.context
        except InputError:
            self.show(None)
            return
        kind = bend.kind if bend is not None else "road"
        self.show(working_steps(kind, record, ctx.table, ctx.limits, session.units))

    def show(self, steps: list[Step] | None) -> None:
        if not steps:
            self.update(Text("No working: the bend has no valid result yet.", style="italic"))
            return
        grid = Table(show_header=True, header_style="bold", expand=True, show_lines=True)
        grid.add_column("Step", ratio=2)
        grid.add_column("Formula / substituted", ratio=5)
        grid.add_column("Answer", ratio=3)
        grid.add_column("Check", width=5)
        for s in steps:
            mark = {"pass": Text("ok", style="green"), "fail": Text("FAIL", style="bold red")}
            grid.add_row(  # table names and sources come from files: shown as text
                plain_text(s.label),
                plain_text(f"{s.formula}\n{s.substituted}\n", one_line=False)
                + plain_text(s.source, "dim italic", one_line=False),
                plain_text(s.result, one_line=False),
                mark.get(s.check, Text("")),
            )
        self.update(grid)
