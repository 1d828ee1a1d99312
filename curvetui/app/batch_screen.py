"""A CSV file's checked results in a table: counts, failures first, sortable, filterable,
the highlighted row's reasons under it; Enter opens the row as its worksheet (RowScreen).

The file is checked in a thread worker (curvetui.app.batch_check) after the first paint.
"""

from __future__ import annotations

from rich.text import Text
from textual import on, work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.coordinate import Coordinate
from textual.screen import Screen
from textual.widgets import DataTable, Footer, Input, Label, Static
from textual.worker import get_current_worker

from curvetui.app.batch_check import Outcome, check_source
from curvetui.app.batch_results import (
    ROW_LIMIT,
    BatchSource,
    Held,
    ResultRow,
    ordered,
    table_columns,
    visible,
)
from curvetui.app.plain import markup_safe, plain_text
from curvetui.app.row_screen import RowScreen, status_word
from curvetui.app.widgets.batch_table import ResultTable
from curvetui.app.widgets.frame import caution_line

ONLY_WORDS = {None: "every status", "fail": "FAIL only", "error": "ERROR only"}
DETAIL_MESSAGES = 2  # messages of the highlighted row shown under the table
FILTER_PAUSE = 0.25  # seconds after the last key in the filter box


def topbar_text(source: BatchSource) -> str:
    return (
        f"[b]{markup_safe(source.path.name)}[/] | {source.units.name} | road table "
        f"{markup_safe(source.table.name)} | rail limits {markup_safe(source.limits.name)}"
    )


class BatchScreen(Screen):
    """The results table with its counts, filter box and the highlighted row's reasons."""

    DEFAULT_CSS = """
    BatchScreen #counts { height: auto; padding: 0 1; }
    BatchScreen #counts.-problem { color: $error; text-style: bold; }
    BatchScreen #filter-row { height: 1; padding: 0 1; }
    BatchScreen #filter-row Label { width: auto; padding: 0 1 0 0; }
    BatchScreen #filter { width: 1fr; max-width: 40; height: 1; border: none; padding: 0 1; }
    BatchScreen #scope { width: auto; padding: 0 0 0 1; color: $text-muted; }
    BatchScreen #row-detail { height: auto; max-height: 7; padding: 0 1;
                              border-top: solid $primary; }
    """

    BINDINGS = [
        Binding("slash", "focus_filter", "Filter"),
        Binding("f", "only('fail')", "Fails"),
        Binding("e", "only('error')", "Errors"),
        Binding("a", "only('')", "All"),
        Binding("s", "next_sort", "Sort"),
        Binding("r", "reverse", "Reverse"),
        Binding("o", "default_order", "Fails first"),
        Binding("escape", "leave_filter", "Table", show=False),
    ]

    def __init__(self, source: BatchSource, limit: int = ROW_LIMIT):
        super().__init__()
        self.source = source
        self.limit = limit
        self.columns = table_columns(source.units)
        self.held: Held | None = None
        self.problem: str | None = None
        self.filter_text = ""
        self.only: str | None = None
        self.sort_key: str | None = None  # None: failures first, then by row
        self.reverse = False
        self.shown: list[ResultRow] = []
        self.by_row: dict[int, ResultRow] = {}
        self.progress_text = f"Checking {source.path.name}…"
        self._filter_timer = None

    def compose(self) -> ComposeResult:
        yield Static(topbar_text(self.source), id="topbar")
        yield Static(markup_safe(self.progress_text), id="counts")
        with Horizontal(id="filter-row"):
            yield Label("Filter (/)")
            yield Input(
                placeholder="id, status, message", id="filter", compact=True, select_on_focus=False
            )
            yield Static("", id="scope")
        yield ResultTable(id="results")
        yield Static("", id="row-detail")
        yield caution_line()
        yield Footer()

    def on_mount(self) -> None:
        self.update_scope()
        self.query_one(ResultTable).focus()
        self.call_after_refresh(self.check_file)  # paint first, then run the engine

    # -- the run ---------------------------------------------------------------------------
    @work(thread=True, exclusive=True, group="batch", name="batch check")
    def check_file(self) -> None:
        worker = get_current_worker()
        check_source(
            self.source,
            self.limit,
            Outcome(self.show_progress, self.show_problem, self.loaded),
            self.app.call_from_thread,
            lambda: worker.is_cancelled,
        )

    def show_progress(self, done: int, total: int | None, rows: int) -> None:
        if self.held is not None:
            return
        pct = f" {100 * done / total:.0f} %" if total else ""
        self.query_one("#counts", Static).update(
            markup_safe(f"Checking {self.source.path.name}…{pct} ({rows:,} rows)")
        )

    def show_problem(self, message: str) -> None:
        self.problem = message
        counts = self.query_one("#counts", Static)
        counts.add_class("-problem")
        counts.update(
            markup_safe(f"Cannot use {self.source.path.name}: {message}")
            + "\nNo results are shown: fix the file and open it again."
        )
        self.query_one("#row-detail", Static).update("")

    def loaded(self, held: Held) -> None:
        self.held = held
        self.by_row = {r.row: r for r in held.rows}
        self.refill()

    # -- the table ---------------------------------------------------------------------------
    def current_row(self) -> ResultRow | None:
        table = self.query_one(ResultTable)
        if not table.row_count:
            return None
        key = table.coordinate_to_cell_key(Coordinate(table.cursor_row, 0)).row_key
        return self.by_row.get(int(key.value)) if key.value is not None else None

    def refill(self, order_only: bool = False) -> None:
        """Show the held rows that pass the filter, in the chosen order (``order_only``: the
        same rows as now, only the order changed, which is quicker)."""
        if self.held is None:
            self.update_scope()
            return
        keep = self.current_row()
        if order_only:
            self.shown = ordered(self.shown, self.sort_key, self.reverse)
        else:
            self.shown = ordered(
                visible(self.held.rows, self.filter_text, self.only), self.sort_key, self.reverse
            )
        table = self.query_one(ResultTable)
        (table.reorder if order_only else table.fill)(
            self.shown,
            self.columns,
            self.sort_key,
            self.reverse,
            keep_row=keep.row if keep else None,
        )
        self.update_counts()
        self.update_scope()
        self.update_detail()

    def update_counts(self) -> None:
        held = self.held
        if held is None:
            return
        s = held.summary
        text = Text()
        text.append(f"{s.rows:,} bends: ")
        text.append(f"{s.passed:,} pass", style="bold green")
        text.append(" | ")
        text.append(f"{s.failed:,} FAIL", style="bold red")
        text.append(" | ")
        text.append(f"{s.errors:,} ERROR", style="bold magenta")
        if s.blank:
            text.append(f" | {s.blank:,} blank rows skipped")
        text.append(f" | showing {len(self.shown):,} of {s.rows:,}", style="bold")
        if s.rows == 0:
            text.append("\nThe file has a header but no bends.", style="yellow")
        if not held.complete:
            parts = ", ".join(
                f"{held.held(st):,} of {held.total(st):,} {status_word(st)}"
                for st in ("fail", "error", "pass")
            )
            text.append(
                f"\nThe table holds {len(held.rows):,} rows, failures first ({parts}); "
                f"`curvetui batch {self.source.path.name}` writes every row with its results.",
                style="bold yellow",
            )
        self.query_one("#counts", Static).update(text)

    def update_scope(self) -> None:
        if self.sort_key is None:
            order = "failures first" if not self.reverse else "passes first"
        else:
            label = next(c.label for c in self.columns if c.key == self.sort_key)
            order = f"{label} {'descending' if self.reverse else 'ascending'}"
        self.query_one("#scope", Static).update(
            markup_safe(f"showing {ONLY_WORDS[self.only]} | order: {order}")
        )

    def update_detail(self) -> None:
        detail = self.query_one("#row-detail", Static)
        r = self.current_row()
        if r is None:
            detail.update(Text("No rows match the filter." if self.held and self.held.rows else ""))
            return
        text = Text()
        text.append(plain_text(f"row {r.row} {r.ident} {r.kind} ", "bold"))
        word = status_word(r.status)
        text.append(
            f" {word} ",
            style="bold reverse " + {"fail": "red", "error": "magenta"}.get(r.status, "green"),
        )
        msgs = r.items
        if not msgs:
            text.append("  no messages")
        for severity, m in msgs[:DETAIL_MESSAGES]:
            style = {"fail": "red", "error": "magenta"}.get(severity, "")
            text.append(plain_text("\n" + m, style, one_line=False))
        if len(msgs) > DETAIL_MESSAGES:
            text.append(
                f"\n… {len(msgs) - DETAIL_MESSAGES} more: Enter opens the worksheet",
                style="italic",
            )
        detail.update(text)

    @on(DataTable.RowHighlighted, "#results")
    def row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        self.update_detail()

    @on(DataTable.RowSelected, "#results")
    def row_selected(self, event: DataTable.RowSelected) -> None:
        self.action_open_row()

    @on(DataTable.HeaderSelected, "#results")
    def header_selected(self, event: DataTable.HeaderSelected) -> None:
        key = event.column_key.value
        if key == self.sort_key:
            self.reverse = not self.reverse
        else:
            self.sort_key, self.reverse = key, False
        self.refill(order_only=True)

    @on(Input.Changed, "#filter")
    def filter_changed(self, event: Input.Changed) -> None:
        # typing stays quick: the table is refilled once the keys pause (Enter: at once)
        if self._filter_timer is not None:
            self._filter_timer.stop()
        self._filter_timer = self.set_timer(FILTER_PAUSE, self.apply_filter)

    def apply_filter(self) -> None:
        if self._filter_timer is not None:
            self._filter_timer.stop()
            self._filter_timer = None
        text = self.query_one("#filter", Input).value
        if text != self.filter_text:
            self.filter_text = text
            self.refill()

    @on(Input.Submitted, "#filter")
    def filter_submitted(self, event: Input.Submitted) -> None:
        self.apply_filter()
        self.set_focus(self.query_one(ResultTable))

    # -- actions -----------------------------------------------------------------------------
    def action_open_row(self) -> None:
        r = self.current_row()
        if r is not None:
            self.app.push_screen(RowScreen(self.source, r))

    def action_focus_filter(self) -> None:
        # at once (focus() waits for the next turn): keys typed right after '/' go to the box
        self.set_focus(self.query_one("#filter", Input))

    def action_leave_filter(self) -> None:
        self.apply_filter()
        self.set_focus(self.query_one(ResultTable))

    def action_only(self, status: str) -> None:
        self.only = status or None
        self.refill()

    def action_next_sort(self) -> None:
        keys = [None, *(c.key for c in self.columns)]
        self.sort_key = keys[(keys.index(self.sort_key) + 1) % len(keys)]
        self.reverse = False
        self.refill(order_only=True)

    def action_reverse(self) -> None:
        self.reverse = not self.reverse
        self.refill(order_only=True)

    def action_default_order(self) -> None:
        self.sort_key, self.reverse = None, False
        self.refill(order_only=True)
