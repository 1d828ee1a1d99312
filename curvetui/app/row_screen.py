"""One row of a CSV file as its worksheet: the inputs as read (read-only) and its working,
in the same tabs as a project's bend, or the row's messages when it cannot be checked."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import Screen
from textual.widgets import Footer, Static, TabbedContent

from curvetui.app.batch_results import BatchSource, ResultRow, RowSheet, evaluate_row
from curvetui.app.plain import markup_safe, visible
from curvetui.app.widgets.bend_list import STATUS_WORD
from curvetui.app.widgets.bend_views import bend_views, next_view
from curvetui.app.widgets.frame import caution_line
from curvetui.app.widgets.working_view import WorkingView, working_steps
from curvetui.app.widgets.worksheet import Worksheet

# worksheet rows a batch file has no column for (see curvetui.batch.columns.INPUTS)
NOT_IN_BATCH = ("station", "notes", "pi_station", "obstruction_offset", "grade", "lane_width")


def status_word(status: str) -> str:
    return STATUS_WORD.get(status, status.upper())


class RowScreen(Screen):
    """One row of the file as its worksheet (inputs as read, read-only) and its working."""

    DEFAULT_CSS = """
    RowScreen #sheet-note { height: auto; padding: 0 1; }
    RowScreen #row-error { padding: 1 2; }
    RowScreen #views { height: 1fr; }
    """

    BINDINGS = [
        Binding("escape", "back", "Back to table"),
        Binding("f9", "next_view", "Next view"),
    ]

    def __init__(self, source: BatchSource, row: ResultRow):
        super().__init__()
        self.source = source
        self.row = row
        self.sheet: RowSheet = evaluate_row(row, source)

    def compose(self) -> ComposeResult:
        r, s = self.row, self.source
        yield Static(
            f"[b]row {r.row}[/] {markup_safe(r.ident)} | {markup_safe(r.kind or '?')} | batch: "
            f"[b]{status_word(r.status)}[/] | {markup_safe(s.path.name)} | {s.units.name} | "
            f"road table {markup_safe(s.table.name)} | rail limits {markup_safe(s.limits.name)}",
            id="topbar",
        )
        yield Static(self._note(), id="sheet-note")
        if self.sheet.record is None:
            with VerticalScroll(id="row-error-scroll"):
                yield Static(self._error_text(), id="row-error")
        else:
            yield from bend_views(pictures=False, lazy=False)
        yield caution_line()
        yield Footer()

    def _note(self) -> Text:
        text = Text(
            f"Inputs as read from row {self.row.row} (read-only). Esc: back to the table.",
            style="italic",
        )
        record = self.sheet.record
        if record is not None and record["status"] != self.row.status:
            text.append(
                f"\nThe one-bend check gives {status_word(record['status'])} where the batch "
                f"gave {status_word(self.row.status)}: treat the row as doubtful and report it.",
                style="bold red",
            )
        return text

    def _error_text(self) -> Text:
        r = self.row
        text = Text()
        if r.status == "error":
            text.append(f" ERROR  row {r.row} was not checked:\n", style="bold magenta")
            messages = r.message_list
        else:
            text.append(
                f" ERROR  the one-bend check refused row {r.row} (the batch gave "
                f"{status_word(r.status)}):\n",
                style="bold magenta",
            )
            messages = [self.sheet.error or ""]
        for m in messages:
            text.append(f"- {visible(m, one_line=False)}\n", style="bold")
        text.append("\nCells as read:\n", style="bold")
        for key, value in r.cells.items():
            text.append(f"  {self.source.column_name(key)}: {value!r}\n")
        return text

    def on_mount(self) -> None:
        record = self.sheet.record
        if record is None:
            return
        s = self.source
        sheet = self.query_one(Worksheet)
        texts = {"bend_id": self.row.ident or f"row {self.row.row}", **self.sheet.inputs}
        sheet.fill(self.sheet.kind, s.units, texts)
        sheet.read_only(hidden=NOT_IN_BATCH)  # a batch file has no column for these
        sheet.show_results(record, None, s.units, stale=False)
        steps = working_steps(self.sheet.kind, record, s.table, s.limits, s.units)
        self.query_one(WorkingView).show(steps)

    def check_action(self, action: str, parameters: tuple) -> bool | None:
        if action == "next_view" and self.sheet.record is None:
            return False  # an error row has no worksheet views
        return True

    def action_back(self) -> None:
        self.app.pop_screen()

    def action_next_view(self) -> None:
        if self.sheet.record is not None:
            next_view(self.query_one("#views", TabbedContent))
