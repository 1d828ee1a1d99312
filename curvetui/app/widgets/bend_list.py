"""The list of bends: id, kind, station, speed, radius and a plain pass/fail word."""

from __future__ import annotations

from rich.text import Text
from textual.coordinate import Coordinate
from textual.widgets import DataTable

from curvetui.app.session import Session
from curvetui.stations import format_station

STATUS_STYLE = {"pass": "bold green", "fail": "bold red", "error": "bold magenta", "pending": "dim"}
STATUS_WORD = {"pass": "pass", "fail": "FAIL", "error": "ERROR", "pending": "..."}


class BendList(DataTable):
    """One row per bend; the words PASS/FAIL/ERROR carry the status, colour only helps."""

    DEFAULT_CSS = """
    BendList { width: 1fr; }
    """

    def on_mount(self) -> None:
        self.cursor_type = "row"
        self.zebra_stripes = True
        self.add_columns("Bend", "Check", "V", "R", "Kind", "Station")

    def refill(self, session: Session, keep_index: int | None = None) -> None:
        """Rebuild every row (after adding, deleting or moving bends); the cursor stays put
        and no highlight message is sent, so the worksheet is not reloaded underneath."""
        row = self.cursor_row if keep_index is None else keep_index
        with self.prevent(DataTable.RowHighlighted):
            self.clear()
            for b in session.project.bends:
                self.add_row(*row_cells(session, b))
            if self.row_count:
                self.move_cursor(row=max(0, min(row, self.row_count - 1)))

    def update_bend(self, session: Session, index: int) -> None:
        """Refresh one row in place (after an edit to that bend)."""
        if not 0 <= index < self.row_count:
            return
        with self.prevent(DataTable.RowHighlighted):
            for col, value in enumerate(row_cells(session, session.project.bends[index])):
                self.update_cell_at(Coordinate(index, col), value)


def row_cells(session: Session, b) -> tuple:
    units = session.project.details.units
    status = session.status(b)
    speed = b.inputs.get("speed", "")
    radius = b.inputs.get("radius", "")
    return (
        b.id,
        Text(STATUS_WORD[status], style=STATUS_STYLE[status]),
        f"{speed:g}" if isinstance(speed, int | float) else str(speed),
        f"{radius:g}" if isinstance(radius, int | float) else str(radius),
        b.kind,
        format_station(b.station, units, 1),
    )
