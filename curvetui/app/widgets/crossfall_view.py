"""The superelevation diagram of the current road bend: both edges' cross slope against
station with the key stations marked, and the table of edge elevations below it
(``curvetui.reports.superelevation_diagram``, from the bend's record).

A short curve (full superelevation never reached) is said in the title and in a note line
in words, never by colour alone.
"""

from __future__ import annotations

import numpy as np
from rich import box
from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Vertical, VerticalScroll
from textual.widget import Widget
from textual.widgets import Static

from curvetui.app.canvas import BrailleCanvas, nice_ticks
from curvetui.app.plain import visible
from curvetui.app.session import Session
from curvetui.reports.superelevation_diagram import Diagram, diagram_for_record, short_label
from curvetui.stations import format_station

OUT_STYLE, IN_STYLE = "cyan", "magenta"
IN_PATTERN = (3, 1)
KEY_STYLE, CURVE_STYLE, WARN_STYLE = "dim", "green", "bold yellow"
NO_DIAGRAM = "choose a road bend with a deflection to see its superelevation diagram"


def draw_crossfall(d: Diagram | None, width: int, height: int, message: str = "") -> Text:
    """Cross slope (%) of the outside and inside edges against station; key stations as
    dotted verticals labelled NC, LC, RC, e above the plot, curve points (PC, PT or TS, SC,
    CS, ST) below it."""
    canvas = BrailleCanvas(width, height)
    if d is None:
        canvas.text_cell(width // 2, height // 2, visible(message or NO_DIAGRAM)[:width],
                         "italic", "center", clamp=True)  # fmt: skip
        return canvas.render()
    roomy = height >= 10
    canvas.set_margins(left=6, right=1, top=2 if roomy else 1, bottom=4 if roomy else 2)
    first, last = d.span
    pad = 0.05 * (last - first or 1.0)
    xs = np.linspace(first - pad, last + pad, 600)
    s_out, s_in, *_ = d.at(xs)
    lo, hi = min(-d.e_nc, float(s_out.min())), max(d.e, d.e_nc)
    span = hi - lo or 1.0
    lo, hi = lo - 0.1 * span, hi + 0.1 * span
    canvas.set_window(float(xs[0]), float(xs[-1]), lo, hi)
    canvas.axes(nice_ticks(float(xs[0]), float(xs[-1]), 5), nice_ticks(lo, hi, 4))
    canvas.hline(0.0, "dim", (1, 3))
    c0, r0, c1, r1 = canvas.plot_cells
    for p in d.keys:
        canvas.vline(p.station, KEY_STYLE, (1, 2))
        cell = canvas.to_cell(p.station, hi)
        if cell is not None:
            _put(canvas, cell[0], max(r0 - 1, 0), short_label(p.key), "bold", "center")
    for name, station in d.curve_points:
        canvas.vline(station, CURVE_STYLE, (1, 1))
        cell = canvas.to_cell(station, lo)
        if cell is not None and roomy:
            _put(canvas, cell[0], r1 + 3, name, CURVE_STYLE, "center")
    canvas.polyline(xs, s_out, OUT_STYLE)
    canvas.polyline(xs, s_in, IN_STYLE, IN_PATTERN)
    if c0 >= 2:
        canvas.text_cell(c0 - 2, r0, "%", "dim", "right")
    title = f"Cross slope against station, e {d.e:.2f} %, axis: {d.axis}" + (
        f"  SHORT CURVE: e reaches {d.peak_slope:.2f} % only" if d.too_short else ""
    )
    canvas.text_cell(0, 0, title[:width], WARN_STYLE if d.too_short else "bold")
    if roomy:
        row, col = height - 1, 0
        for sample, style, label in (
            ("⠉⠉⠉", OUT_STYLE, "outside edge"),
            ("⠉⠉⠁", IN_STYLE, "inside edge"),
            ("⠁⠁⠁", KEY_STYLE, "NC/LC/RC normal, level, reverse crown; e full"),
        ):
            if col + len(sample) + 1 + len(label) > width:
                break
            canvas.text_cell(col, row, sample, style)
            canvas.text_cell(col + len(sample) + 1, row, label)
            col += len(sample) + len(label) + 3
    return canvas.render()


def _put(canvas: BrailleCanvas, col: int, row: int, text: str, style: str, align="left"):
    """A label only where it covers no other label."""
    n = len(text)
    first = col - (n // 2 if align == "center" else 0)
    first = min(max(first, 0), max(canvas.width - n, 0))
    if canvas.is_free(row, first, first + n - 1):
        canvas.text_cell(first, row, text, style)


def elevation_table(d: Diagram, interval: float | None = None) -> Table:
    """The key stations and interval rows: slopes (%) and elevations relative to the grade."""
    ln = d.length_label
    grid = Table(
        title=f"Edge elevations relative to the profile grade line ({ln}), axis: {d.axis}",
        caption="slopes + rise towards the outside edge; " + d.placement,
        expand=False,
        box=box.SIMPLE_HEAD,  # light rules: the numbers keep their width in a narrow view
        pad_edge=False,
        collapse_padding=True,
    )
    # numbers never wrap; in a narrow view the point's name wraps first (Rich narrows the
    # columns that may wrap before it cuts one that may not)
    grid.add_column("Station", justify="right", no_wrap=True)
    grid.add_column("Point", justify="left")
    grid.add_column("Element", justify="left", no_wrap=True)
    for head in ("Out %", "In %", f"Out {ln}", f"CL {ln}", f"In {ln}"):
        grid.add_column(head, justify="right", no_wrap=True)
    for p in d.rows(interval):
        grid.add_row(
            format_station(p.station, d.units),
            table_label(p.label),
            p.element,
            f"{p.slope_out:.2f}",
            f"{p.slope_in:.2f}",
            f"{p.z_out:.3f}",
            f"{p.z_centreline:.3f}",
            f"{p.z_in:.3f}",
        )
    return grid


def table_label(label: str) -> str:
    """'Level crown (adverse crown removed), at the TS' -> 'Level crown, TS'."""
    head, _, at = label.partition(", at the ")
    return head.split(" (")[0] + (f", {at}" if at else "")


class CrossfallChart(Widget):
    DEFAULT_CSS = """
    CrossfallChart { width: 1fr; height: 16; min-height: 6; }
    """

    def __init__(self, *, id: str | None = None):
        super().__init__(id=id)
        self.diagram: Diagram | None = None
        self.message = ""

    def render(self) -> Text:
        return draw_crossfall(self.diagram, self.size.width, self.size.height, self.message)


class CrossfallView(Vertical):
    """The diagram above, the table below (scrolls)."""

    DEFAULT_CSS = """
    CrossfallView { width: 1fr; height: 1fr; }
    CrossfallView > VerticalScroll { height: 1fr; }
    """

    def compose(self) -> ComposeResult:
        yield CrossfallChart(id="crossfall-chart")
        with VerticalScroll():
            yield Static(id="crossfall-notes")
            yield Static(id="crossfall-table")

    def show_session(self, session: Session) -> None:
        """The current bend's diagram from its last good record (kept while an input is
        being corrected); a reason in words where a bend has none."""
        bend = session.current
        if bend is None:
            return
        record = session.state(bend).record
        chart = self.query_one(CrossfallChart)
        notes, table = (
            self.query_one("#crossfall-notes", Static),
            self.query_one("#crossfall-table", Static),
        )
        d = diagram_for_record(record) if record is not None else NO_DIAGRAM
        if isinstance(d, str):
            chart.diagram, chart.message = None, d
            notes.update("")
            table.update("")
        else:
            chart.diagram, chart.message = d, ""
            lines = [f"NOTE: {n}" for n in d.notes]
            if record.get("status") == "fail":
                lines.insert(0, "This bend FAILS a check: see the worksheet.")
            notes.update(Text("\n".join(lines), style=WARN_STYLE))
            table.update(elevation_table(d))
        chart.refresh()
