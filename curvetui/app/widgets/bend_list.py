"""The list of bends: id, kind, station, speed, radius and a plain pass/fail word. Every
cell is plain text (an id is never read as markup); a column widens to its longest value."""

from __future__ import annotations

from rich.text import Text
from textual.binding import Binding
from textual.coordinate import Coordinate
from textual.widgets import DataTable

from curvetui.app.plain import plain_text
from curvetui.app.session import Session
from curvetui.stations import format_station

STATUS_STYLE = {"pass": "bold green", "fail": "bold red", "error": "bold magenta", "pending": "dim"}
COLUMNS = ("Bend", "Check", "V", "R", "Kind", "Station")
STATUS_WORD = {"pass": "pass", "fail": "FAIL", "error": "ERROR", "pending": "..."}


class BendList(DataTable):
    """One row per bend; the words PASS/FAIL/ERROR carry the status, colour only helps."""

    # Enter opens the bend's worksheet at once (not through a message, which would let the
    # next key typed reach the list before the worksheet is focused)
    BINDINGS = [Binding("enter", "screen.open_bend", "Open", show=False)]
    DEFAULT_CSS = """
    BendList { width: 1fr; }
    """

    def on_mount(self) -> None:
        self.cursor_type = "row"
        self.zebra_stripes = True
        self.add_columns(*COLUMNS)
        self._bends: list[int] = []  # id() of the bends shown, in order
        self._rows: list[tuple] = []

    def show_session(self, session: Session) -> None:
        """Show every bend of the session, the cursor on the bend on screen. Rows are
        rebuilt when bends were added, deleted or moved, else only changed cells are
        redrawn; no highlight message is sent, so the worksheet is not reloaded underneath."""
        bends = session.project.bends
        rows = [row_cells(session, b) for b in bends]
        order = [id(b) for b in bends]
        with self.prevent(DataTable.RowHighlighted):
            if order != self._bends:
                self.clear(columns=True)  # the widths start again from these values
                self.add_columns(*COLUMNS)
                for cells in rows:
                    self.add_row(*cells)
            else:
                for index, (now, before) in enumerate(zip(rows, self._rows, strict=True)):
                    for col, (cell, old) in enumerate(zip(now, before, strict=True)):
                        if _key(cell) != _key(old):
                            self.update_cell_at(Coordinate(index, col), cell, update_width=True)
            self._bends, self._rows = order, rows
            current = session.current
            if current is not None and self.row_count:
                row = bends.index(current)
                if row != self.cursor_row:
                    self.move_cursor(row=row)


def _key(cell) -> tuple:
    """What a cell shows (Rich Text compares its words only, not its style)."""
    return (str(cell), str(getattr(cell, "style", "")))


def row_cells(session: Session, b) -> tuple:
    units = session.project.details.units
    status = session.status(b)
    return (
        plain_text(b.id),
        Text(STATUS_WORD[status], style=STATUS_STYLE[status]),
        plain_text(_number(b.inputs.get("speed"))),
        plain_text(_number(b.inputs.get("radius"))),
        plain_text(b.kind),
        plain_text(format_station(b.station, units, 1)),
    )


def _number(value) -> str:
    """An input as the list shows it: a number to 6 figures (1500, not 1.5e+03), else as
    typed."""
    if value is None:
        return ""
    if isinstance(value, int | float) and not isinstance(value, bool):
        return f"{value:.6g}"  # the list is an overview; the worksheet shows all digits
    return str(value)
