"""The table of a batch run's results: one row per bend, PASS/FAIL/ERROR in words.

A table may hold thousands of rows, refilled on every change of the filter. Each cell is a
`Cell`: one line of plain text, drawn as a Rich Text but with no measuring method of its own,
so the table does not measure every cell again (that took seconds for 5,000 rows); the
column widths are set here from the lengths of the texts instead. Sorting reorders the rows
in place, without refilling.
"""

from __future__ import annotations

from rich.text import Text
from textual.binding import Binding
from textual.widgets import DataTable
from textual.widgets.data_table import RowDoesNotExist

from curvetui.app.batch_results import Column, ResultRow
from curvetui.app.plain import visible
from curvetui.app.widgets.bend_list import STATUS_STYLE, STATUS_WORD

REASON_WIDTH = 60


class Cell:
    """One line of text with a style: a renderable without ``__rich_measure__``."""

    __slots__ = ("style", "text")

    def __init__(self, text: str, style: str = ""):
        self.text = visible(text)  # a cell is text: control characters shown, never sent
        self.style = style

    def __rich_console__(self, console, options):
        yield Text(self.text, style=self.style, no_wrap=True, overflow="ellipsis", end="")

    def __str__(self) -> str:
        return self.text


def _fmt(value: float | None, places: int) -> str:
    return "" if value is None else f"{value:,.{places}f}"


def row_cells(r: ResultRow) -> tuple[Cell, ...]:
    """The cells of one row, in the order of batch_results.table_columns."""
    status = r.status if r.status in STATUS_WORD else "error"
    reason = r.first_message
    if len(reason) > REASON_WIDTH:
        reason = reason[: REASON_WIDTH - 1] + "…"
    return (
        Cell(str(r.row)),
        Cell(r.ident),
        Cell(r.kind),
        Cell(STATUS_WORD[status], STATUS_STYLE[status]),
        Cell(r.cells.get("speed", "").strip()),
        Cell(r.cells.get("radius", "").strip()),
        Cell(_fmt(r.value("f"), 3)),
        Cell(_fmt(r.value("f_max"), 3)),
        Cell(_fmt(r.value("r_min"), 1)),
        Cell(_fmt(r.value("d"), 1)),
        Cell(_fmt(r.value("d_max"), 1)),
        Cell(_fmt(r.value("v_safe"), 1)),
        Cell(reason, "red" if r.status == "fail" else ""),
    )


def _label(col: Column, sort_key: str | None, reverse: bool) -> str:
    if col.key != sort_key:
        return col.label
    return col.label + (" ▼" if reverse else " ▲")


class ResultTable(DataTable):
    """The batch results; the row key of each row is its spreadsheet row number."""

    DEFAULT_CSS = """
    ResultTable { height: 1fr; }
    """
    BINDINGS = [Binding("enter", "select_cursor", "Worksheet")]  # shown in the footer

    def on_mount(self) -> None:
        self.cursor_type = "row"
        self.zebra_stripes = True

    def fill(
        self,
        rows: list[ResultRow],
        columns: tuple[Column, ...],
        sort_key: str | None,
        reverse: bool,
        keep_row: int | None = None,
    ) -> None:
        """Rebuild the table with ``rows`` in their order; the cursor goes back to the bend
        of row ``keep_row`` when it is still shown, else to the top."""
        cells = [row_cells(r) for r in rows]
        self.clear(columns=True)
        for i, col in enumerate(columns):
            label = _label(col, sort_key, reverse)
            width = max([len(label), *(len(c[i].text) for c in cells)])
            self.add_column(label, key=col.key, width=width)
        for r, row in zip(rows, cells, strict=True):
            self.add_row(*row, key=str(r.row))
        self._put_cursor(keep_row)

    def reorder(
        self,
        rows: list[ResultRow],
        columns: tuple[Column, ...],
        sort_key: str | None,
        reverse: bool,
        keep_row: int | None = None,
    ) -> None:
        """Put the rows already in the table into the order of ``rows`` (the same rows, as
        after a change of order only); refilled instead when a header's arrow would not fit."""
        labels = {col.key: _label(col, sort_key, reverse) for col in columns}
        if len(rows) != self.row_count or any(
            len(text) > self.columns[key].width for key, text in labels.items()
        ):
            self.fill(rows, columns, sort_key, reverse, keep_row)
            return
        place = {str(r.row): i for i, r in enumerate(rows)}
        for key, text in labels.items():
            self.columns[key].label = Text(text)
        self.sort("row", key=lambda cell: place[cell.text])
        self._put_cursor(keep_row)

    def _put_cursor(self, keep_row: int | None) -> None:
        if keep_row is None or not self.row_count:
            return
        try:
            index = self.get_row_index(str(keep_row))
        except RowDoesNotExist:  # the row is filtered out now
            index = 0
        self.move_cursor(row=index)
