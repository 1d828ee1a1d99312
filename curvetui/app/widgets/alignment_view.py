"""The project's whole alignment in plan, to bearing (north up, one scale both ways, a north
arrow and a scale bar), with stations at round intervals and at the bends' key points, the
PIs labelled, the bend on screen highlighted; under it the verdicts between bends.

``draw_alignment`` makes the picture (Rich Text) for any size; ``AlignmentView`` shows it
and the verdicts, from the session.
"""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Vertical
from textual.widget import Widget
from textual.widgets import Static

from curvetui.app.canvas import BrailleCanvas
from curvetui.app.plain import plain_text, visible
from curvetui.app.session import Session
from curvetui.app.widgets.plan_sketch import _message, _scale_bar
from curvetui.core.units import METRIC, UnitSystem
from curvetui.stations import format_station

NO_ALIGNMENT = (
    'This project has no alignment. Add an "alignment" to the project file (see the '
    "README: points by easting and northing, each PI naming a bend) to see it here."
)
TANGENT_STYLE = ("dim", None)
BEND_STYLE = ("cyan", None)
CHOSEN_STYLE = ("bold yellow", None)
PI_STYLE = "bold yellow"


def draw_alignment(
    plan, width: int, height: int, chosen: int = -1, units: UnitSystem | None = None, title=""
) -> Text:
    """The alignment (reports.alignment_plan.AlignmentPlan) in ``width`` x ``height``
    cells; bend ``chosen`` (0-based; -1 none) highlighted with its key stations."""
    units = units or METRIC
    canvas = BrailleCanvas(width, height)
    canvas.set_margins(left=1, right=1, top=1, bottom=1)
    e0, e1, n0, n1 = plan.bounds()
    pad = 0.06 * max(e1 - e0, n1 - n0, 1e-9)
    window = canvas.set_window(e0 - pad, e1 + pad, n0 - pad, n1 + pad, equal_aspect=True)
    for bend, es, ns in plan.pieces:
        style = TANGENT_STYLE if bend < 0 else (CHOSEN_STYLE if bend == chosen else BEND_STYLE)
        canvas.polyline(es, ns, style[0], style[1])
    for p in plan.pis:
        cell = canvas.to_cell(p.east, p.north)
        if cell is not None:
            canvas.text_cell(cell[0], cell[1], "△", PI_STYLE)

    # labels, most wanted first: the chosen bend's key points, the PIs, round stations,
    # then the other key points where there is room
    def station(metres: float, decimals: int) -> str:
        return format_station(float(units.length_from_si(metres)), units.name, decimals)

    for k in plan.key_points:
        if k.bend == chosen:
            canvas.point(k.east, k.north, "bold", size=1)
            canvas.text_near(k.east, k.north, f"{k.name} {station(k.station, 1)}", "bold yellow")
    for p in plan.pis:
        label = f"PI{p.bend + 1} {p.name}"
        canvas.text_near(p.east, p.north, label, PI_STYLE, ("above-right", "above-left", "right"))
    for t in plan.ticks:
        canvas.point(t.east, t.north, "", size=0)
        canvas.text_near(t.east, t.north, station(t.station, 0), "", ("below", "right", "left"))
    for k in plan.key_points:
        if k.bend != chosen:
            canvas.point(k.east, k.north, "", size=0)
            canvas.text_near(k.east, k.north, k.name, "dim", ("right", "left"))
    canvas.text_cell(0, 0, title[:width], "bold")
    canvas.text_cell(width - 2, 1, "N", "bold", clamp=True)
    canvas.text_cell(width - 2, 2, "↑", "bold", clamp=True)
    nx = max(canvas.ax1 - canvas.ax0, 1)
    bar, label = _scale_bar(2.0 * (window[1] - window[0]) / nx, units)
    every = (
        f"stations every {plan.interval / float(units.length_to_si(1.0)):g} {units.length_label}"
    )
    note = f"{bar} {label} · to bearing, north up, one scale both ways · {every}"
    canvas.text_cell(0, height - 1, note[:width], "")
    return canvas.render()


class AlignmentPicture(Widget):
    """The plan picture, redrawn at the widget's size."""

    DEFAULT_CSS = """
    AlignmentPicture { width: 1fr; height: 1fr; min-height: 6; }
    """

    def __init__(self, **kwargs) -> None:
        super().__init__(**kwargs)
        self.plan = None
        self.chosen = -1
        self.units: UnitSystem | None = None
        self.title = ""
        self.message = NO_ALIGNMENT

    def render(self) -> Text:
        size = self.size
        if self.plan is None:
            return _message(size.width, size.height, self.message)
        return draw_alignment(
            self.plan, size.width, size.height, self.chosen, self.units, self.title
        )


class AlignmentView(Vertical):
    """The alignment picture and, under it, its verdicts (never hidden)."""

    DEFAULT_CSS = """
    AlignmentView { height: 1fr; }
    AlignmentView #alignment-verdicts { height: auto; max-height: 8; }
    """

    def compose(self) -> ComposeResult:
        yield AlignmentPicture(id="alignment-picture")
        yield Static("", id="alignment-verdicts")

    def show_session(self, session: Session) -> None:
        from curvetui.reports.alignment_plan import alignment_plan, nice_interval

        picture = self.query_one(AlignmentPicture)
        verdicts = self.query_one("#alignment-verdicts", Static)
        report = session.alignment_report() if session.project.alignment else None
        picture.plan, picture.units = None, session.units
        if report is None:
            picture.message = NO_ALIGNMENT
            verdicts.update("")
        elif report.error:
            picture.message = "The alignment cannot be laid out (the error is below)."
            verdicts.update(plain_text(f"ERROR {report.error}", "bold red", one_line=False))
        else:
            lay = report.layout
            unit_m = float(session.units.length_to_si(1.0))
            span = lay.built.end_station - lay.chain.start_station
            picture.plan = alignment_plan(
                lay.chain, lay.built, lay.bend_ids, nice_interval(span, 10, unit_m)
            )
            current = session.current
            ids = lay.bend_ids
            picture.chosen = ids.index(current.id) if current and current.id in ids else -1
            picture.title = visible(f"Alignment {report.name}: {report.status.upper()}")
            lines = report.lines() or ["alignment: PASS, no warnings between bends"]
            style = {"pass": "green", "warning": "yellow"}.get(report.status, "bold red")
            verdicts.update(plain_text("\n".join(lines), style, one_line=False))
        picture.refresh()
