"""The pictures and tables of a realignment (a reports.realign_sheet.RealignSheet) for the
app: braille charts of the measured and designed versines and of the slews against
station, with TS, SC, CS and ST marked, the slew limit and the hold points; the design
summary and the slew table as Rich renderables. Every text is shown as text (no markup).
"""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.widget import Widget

from curvetui.app.canvas import BrailleCanvas, nice_ticks, short_number
from curvetui.app.plain import visible
from curvetui.reports.realign_sheet import RealignSheet

MEASURED_STYLE = "white"
DESIGNED_STYLE = "cyan"
SLEW_STYLE = "yellow"
KEY_STYLE = "green"
LIMIT_STYLE = "red"
FAIL_STYLE = "bold red"


def _frame(canvas: BrailleCanvas, s: RealignSheet, values: list[float]) -> None:
    """Margins, window over the survey's stations and ``values`` (and 0), axes, key lines."""
    canvas.set_margins(left=6, right=1, top=2, bottom=2)
    lo, hi = min([*values, 0.0]), max([*values, 0.0])
    pad = 0.08 * ((hi - lo) or 1.0)
    xa, xb = s.stations[0], s.stations[-1]
    canvas.set_window(xa, xb, lo - pad, hi + pad)
    canvas.axes(nice_ticks(xa, xb, 6), nice_ticks(lo - pad, hi + pad, 3))
    for name, station in s.keys:
        canvas.vline(station, KEY_STYLE, (1, 2))
        cell = canvas.to_cell(station, hi + pad)
        if cell is not None:
            canvas.text_cell(cell[0], 1, name, KEY_STYLE, "center", clamp=True)


def draw_versines(s: RealignSheet, width: int, height: int) -> Text:
    """Measured (white) and designed (cyan, dashed) versines against station."""
    canvas = BrailleCanvas(max(width, 12), max(height, 5))
    if not s.has_design:
        canvas.text_cell(canvas.width // 2, canvas.height // 2, "no designed curve",
                         FAIL_STYLE, "center", clamp=True)  # fmt: skip
        return canvas.render()
    _frame(canvas, s, [*s.measured, *s.designed])
    canvas.polyline(s.stations, s.measured, MEASURED_STYLE)
    canvas.polyline(s.stations, s.designed, DESIGNED_STYLE, (3, 1))
    cl = s.units.cant_label
    canvas.text_cell(0, 0, f"v {cl}", "dim")
    canvas.text_cell(canvas.width - 1, 0, "measured ─", MEASURED_STYLE, "right")
    canvas.text_cell(canvas.width - 12, 0, "designed ┄", DESIGNED_STYLE, "right")
    return canvas.render()


def draw_slews(s: RealignSheet, width: int, height: int) -> Text:
    """Slews (+ out) against station, the limit either side (red), holds marked ▲."""
    canvas = BrailleCanvas(max(width, 12), max(height, 5))
    if not s.has_design:
        return canvas.render()
    lim = [] if s.slew_limit is None else [s.slew_limit, -s.slew_limit]
    _frame(canvas, s, [*s.slews, *lim])
    for v in lim:
        canvas.hline(v, LIMIT_STYLE, (1, 1))
    canvas.hline(0.0, "dim", (1, 3))
    canvas.polyline(s.stations, s.slews, SLEW_STYLE)
    for h in s.holds:
        i = min(range(len(s.stations)), key=lambda j: abs(s.stations[j] - h))
        canvas.text(s.stations[i], s.slews[i], "▲", "bold", align="center")
    cl = s.units.cant_label
    canvas.text_cell(0, 0, f"s {cl}", "dim")
    note = "slew + out" + (f", limit ±{short_number(s.slew_limit)}" if lim else "")
    canvas.text_cell(canvas.width - 1, 0, note, SLEW_STYLE, "right")
    return canvas.render()


class RealignChart(Widget):
    """One of the two charts (``which``: 'versines' or 'slews'), drawn at its size."""

    DEFAULT_CSS = "RealignChart { width: 1fr; height: 1fr; min-height: 8; }"

    def __init__(self, sheet: RealignSheet, which: str, **kwargs):
        super().__init__(**kwargs)
        self.sheet = sheet
        self.which = which

    def render(self) -> Text:
        draw = draw_versines if self.which == "versines" else draw_slews
        return draw(self.sheet, self.size.width, self.size.height)


def summary_text(s: RealignSheet) -> Text:
    """The status, the design and the rail lines; failing lines in bold red."""
    out = Text()
    out.append(f"Realignment: {s.status}\n", style=FAIL_STYLE if s.status == "FAIL" else
               "bold green")  # fmt: skip
    for title, lines in (("Design", s.design), ("Rail checks of the designed curve", s.rail)):
        out.append(f"{title}\n", style="bold underline")
        for x in lines:
            out.append(f"  {visible(x.label)}: ", style="bold")
            out.append(visible(x.value) + ("  FAIL" if x.fail else ""), FAIL_STYLE if x.fail
                       else "")  # fmt: skip
            out.append("\n")
    return out


def notes_text(s: RealignSheet) -> Text:
    """The rail check's notes (cant proposed, transitions) and the key stations."""
    out = Text()
    if s.keys:
        out.append("Key stations: " + "  ".join(f"{n} {v:.2f}" for n, v in s.keys) + "\n")
    for n in s.notes:
        out.append(f"note: {visible(n)}\n", style="dim")
    return out


def slew_table(s: RealignSheet) -> Table:
    """The slew table: station, measured, designed, slew, direction (all plain text)."""
    t = Table(title="Slews (+ out, away from the curve's centre)", title_justify="left")
    for i, name in enumerate(s.head):
        t.add_column(Text(name), justify="left" if i == 4 else "right")
    for r in s.table:
        t.add_row(*(Text(c) for c in r))
    if not s.table:
        t.add_row(Text("-"), Text("-"), Text("-"), Text("-"), Text("no designed curve"))
    return t
