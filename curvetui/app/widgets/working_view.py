"""The working: each result with its formula, the substituted values and the source."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.widgets import Static

from curvetui.reports.working import Step


class WorkingView(Static):
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
            grid.add_row(
                Text(s.label),
                Text(f"{s.formula}\n{s.substituted}\n", style="")
                + Text(s.source, style="dim italic"),
                Text(s.result),
                mark.get(s.check, Text("")),
            )
        self.update(grid)
