"""Charts of the current bend: road superelevation and side friction against radius, rail
cant against speed.

``draw_road_chart`` and ``draw_rail_chart`` make the pictures (Rich Text) for any size;
``RoadChartView`` and ``RailChartView`` show them and redraw them at their own size.
A failing bend is marked by its symbol (✕ instead of ●) and a FAIL label beside it and in
the title line, never by colour alone.
"""

from __future__ import annotations

import math

import numpy as np
from rich.text import Text
from textual.widget import Widget

from curvetui.app.canvas import BrailleCanvas, log_ticks, nice_ticks, short_number
from curvetui.app.plain import visible
from curvetui.app.session import Session
from curvetui.core.rail import FAIL_EXCESS
from curvetui.core.units import METRIC, UnitSystem
from curvetui.inputs import InputError
from curvetui.reports.charts import (
    RailChart,
    RoadChart,
    rail_chart_for_inputs,
    road_chart_for_inputs,
)

NO_ROAD = "give a speed and a radius to see the chart"
NO_RAIL = "give a speed, a radius and a cant to see the chart"

OK_MARK, FAIL_MARK = "●", "✕"
OK_STYLE, FAIL_STYLE = "bold green", "bold red"
E_STYLE, F_STYLE = "cyan", "magenta"
LIMIT_STYLE = "red"
NOW_STYLE = "dim"
BAND_STYLE = "on #1e3a28"  # allowed speed band (its edges are lines and labels too)
LIMIT_PATTERN = (1, 1)
F_PATTERN = (3, 1)


def _message(width: int, height: int, message: str) -> Text:
    canvas = BrailleCanvas(width, height)
    message = visible(message)  # it may quote what was typed
    canvas.text_cell(width // 2, height // 2, message[:width], "italic", "center", clamp=True)
    return canvas.render()


def _layout(canvas: BrailleCanvas, height: int, left: int) -> tuple[bool, bool]:
    """Margins: a title row and a legend row when there is room; axis and tick labels."""
    roomy = height >= 10
    canvas.set_margins(left=left, right=1, top=1 if roomy else 0, bottom=3 if roomy else 2)
    return roomy, roomy


def _title(canvas: BrailleCanvas, text: str, failed: bool, note: str = "") -> None:
    """Title on row 0 with the status at its right end: '✕ FAIL' or '● ok'. Without room
    for a title (``text`` empty) the status alone overwrites the top right corner."""
    status = f"{FAIL_MARK} FAIL{note}" if failed else f"{OK_MARK} ok"
    if len(status) > canvas.width:
        status = f"{FAIL_MARK} FAIL" if failed else OK_MARK
    room = canvas.width - len(status) - 1
    if text:
        canvas.text_cell(0, 0, text[: max(room, 0)], "bold")
    canvas.text_cell(canvas.width - 1, 0, status, FAIL_STYLE if failed else OK_STYLE, "right")


def _legend(canvas: BrailleCanvas, items: list[tuple[str, str, str]]) -> None:
    col, row = 0, canvas.height - 1
    for sample, style, label in items:
        need = len(sample) + 1 + len(label)
        if col + need > canvas.width:
            break
        canvas.text_cell(col, row, sample, style)
        canvas.text_cell(col + len(sample) + 1, row, label)
        col += need + 2


def _axis_units(canvas: BrailleCanvas, x_name: str, y_name: str) -> None:
    """The x quantity at the right end of the tick-label row, the y one at the top left."""
    c0, r0, c1, r1 = canvas.plot_cells
    row = r1 + 2
    first = canvas.width - len(x_name)
    if row < canvas.height and canvas.is_free(row, first - 1, canvas.width - 1):
        canvas.text_cell(canvas.width - 1, row, x_name, "dim", "right")
    if c0 >= 2 and canvas.is_free(r0, 0, c0 - 2):
        canvas.text_cell(c0 - 2, r0, y_name[: c0 - 1], "dim", "right")


def _put(canvas: BrailleCanvas, col: int, row: int, text: str, style: str, align="left"):
    """Write a secondary label only where it covers no other label (a mark or a status)."""
    n = len(text)
    first = col - (n // 2 if align == "center" else n - 1 if align == "right" else 0)
    first = min(max(first, 0), max(canvas.width - n, 0))
    if canvas.is_free(row, first, first + n - 1):
        canvas.text_cell(first, row, text, style)


def _window_y(values, include_zero: bool = True) -> tuple[float, float]:
    v = np.asarray([x for x in values if math.isfinite(x)], dtype=float)
    lo, hi = float(v.min()), float(v.max())
    if include_zero:
        lo, hi = min(lo, 0.0), max(hi, 0.0)
    pad = 0.08 * (hi - lo if hi > lo else 1.0)
    return lo - (pad if lo < 0 else 0.0), hi + pad


def draw_road_chart(
    chart: RoadChart | None,
    width: int,
    height: int,
    units: UnitSystem | None = None,
    message: str = "",
    bend_failed: bool = False,
) -> Text:
    """e(R) and f(R) at the design speed against radius (log scale), f_max and R_min, the
    current bend marked. ``bend_failed``: the bend fails another check (transition, sight),
    shown in the title's status."""
    units = units or METRIC
    if chart is None:
        return _message(width, height, message or NO_ROAD)
    canvas = BrailleCanvas(width, height)
    title, legend = _layout(canvas, height, left=6)
    scale = units.length
    radius = chart.radius / scale
    r_min, r_now = chart.min_radius / scale, chart.radius_now / scale
    ylo, yhi = _window_y([*chart.e_design, *chart.friction, chart.f_max, chart.e_now, chart.f_now])
    canvas.set_window(float(radius[0]), float(radius[-1]), ylo, yhi, xlog=True)
    canvas.axes(log_ticks(radius[0], radius[-1]), nice_ticks(ylo, yhi, 4))
    _axis_units(canvas, f"R {units.length_label}", "e, f")

    if ylo < 0:
        canvas.hline(0.0, "dim", (1, 3))
    canvas.vline(r_min, LIMIT_STYLE, LIMIT_PATTERN)
    canvas.hline(chart.f_max, LIMIT_STYLE, LIMIT_PATTERN)
    canvas.vline(r_now, NOW_STYLE, (1, 3))
    canvas.polyline(radius, chart.e_design, E_STYLE)
    canvas.polyline(radius, chart.friction, F_STYLE, F_PATTERN)

    failed = chart.failed
    mark, style = (FAIL_MARK, FAIL_STYLE) if failed else (OK_MARK, OK_STYLE)
    together = canvas.to_cell(r_now, chart.e_now) == canvas.to_cell(r_now, chart.f_now)
    if not together:
        canvas.text(r_now, chart.e_now, "◆", E_STYLE, align="center")
    canvas.text(r_now, chart.f_now, mark, style, align="center")
    status = "FAIL " + ", ".join(chart.reasons) if failed else "ok"
    if together:
        status = "e,f " + status
    order = ("right", "above-right", "below-right", "left", "above", "below")
    if canvas.text_near(r_now, chart.f_now, status, style, order) is None and failed:
        canvas.text_near(r_now, chart.f_now, "FAIL", style, order)
    if not together:
        canvas.text_near(r_now, chart.e_now, "e", E_STYLE, ("right", "left", "below", "above"))

    c0, r0, c1, _ = canvas.plot_cells
    col = canvas.to_cell(r_min, chart.f_max)
    if col is not None:
        _put(canvas, col[0] + 1, r0, f"R_min {short_number(r_min)}", LIMIT_STYLE)
    fcell = canvas.to_cell(float(radius[-1]), chart.f_max)
    if fcell is not None and fcell[1] - 1 >= r0:
        _put(canvas, c1, fcell[1] - 1, f"f_max {chart.f_max:.3g}", LIMIT_STYLE, "right")
    for values, name, sty in ((chart.e_design, "e", E_STYLE), (chart.friction, "f", F_STYLE)):
        spots = ("above", "below", "above-left", "left", "below-left")
        canvas.text_near(float(radius[-1]), float(values[-1]), name, sty, spots)

    v = units.speed_from_si(chart.speed)
    note = " (other check)" if bend_failed and not failed else ""
    _title(
        canvas,
        f"e and f against radius, V {v:.4g} {units.speed_label}, "
        f"e_max {100 * chart.e_max:.4g} %, R_min {r_min:.4g} {units.length_label}"
        if title
        else "",
        failed or bend_failed,
        note,
    )
    if legend:
        _legend(
            canvas,
            [
                ("⠉⠉⠉", E_STYLE, "e design"),
                ("⠉⠉⠁", F_STYLE, "f at V"),
                ("⠁⠁⠁", LIMIT_STYLE, "f_max, R_min"),
                ("◆", E_STYLE, "bend e"),
                (OK_MARK, OK_STYLE, "bend f, ok"),
                (FAIL_MARK, FAIL_STYLE, "FAIL"),
            ],
        )
    return canvas.render()


def draw_rail_chart(
    chart: RailChart | None,
    width: int,
    height: int,
    units: UnitSystem | None = None,
    message: str = "",
    bend_failed: bool = False,
) -> Text:
    """Equilibrium cant E(V) against speed, the applied cant, the deficiency and excess
    limits about it, the allowed speed band (shaded, its edges drawn and labelled) and the
    current speeds marked."""
    units = units or METRIC
    if chart is None:
        return _message(width, height, message or NO_RAIL)
    canvas = BrailleCanvas(width, height)
    title, legend = _layout(canvas, height, left=5)
    vs, cs = units.speed, units.cant
    speed = chart.speed / vs
    e = chart.equilibrium / cs
    ea = chart.cant / cs
    upper = (chart.cant + chart.deficiency_limit) / cs
    lower = (chart.cant - chart.excess_limit) / cs if math.isfinite(chart.excess_limit) else None
    ylo, yhi = _window_y([*e, ea, upper, chart.cant_now / cs])
    canvas.set_window(0.0, float(speed[-1]), ylo, yhi)
    v_min = chart.min_speed / vs if math.isfinite(chart.min_speed) else 0.0
    v_max = chart.max_speed / vs
    canvas.shade_x(v_min, v_max, BAND_STYLE)
    canvas.axes(nice_ticks(0.0, float(speed[-1]), 6), nice_ticks(ylo, yhi, 4))
    _axis_units(canvas, f"V {units.speed_label}", units.cant_label)

    for edge in (v_min, v_max):
        if edge > 0:
            canvas.vline(edge, "green", (1, 1))
    canvas.hline(upper, LIMIT_STYLE, LIMIT_PATTERN)
    if lower is not None and lower > ylo:
        canvas.hline(lower, LIMIT_STYLE, LIMIT_PATTERN)
    canvas.hline(ea, "bold yellow")
    canvas.polyline(speed, e, E_STYLE)

    c0, r0, c1, r1 = canvas.plot_cells
    v_now, e_now = chart.speed_now / vs, chart.cant_now / cs
    canvas.line(v_now, ea, v_now, e_now, NOW_STYLE, (1, 1))  # the deficiency at this speed
    failed = chart.failed
    mark, style = (FAIL_MARK, FAIL_STYLE) if failed else (OK_MARK, OK_STYLE)
    canvas.text(v_now, e_now, mark, style, align="center")
    status = "FAIL " + ", ".join(chart.reasons) if failed else "ok"
    label = f"V {v_now:.4g} {status}"
    order = ("left", "above-left", "below-left", "right", "above", "below")
    if canvas.text_near(v_now, e_now, label, style, order) is None:
        canvas.text_near(v_now, e_now, "FAIL" if failed else "ok", style, order)
    if math.isfinite(chart.low_speed):
        # the slow train: its own mark fails on the excess
        slow_failed = bool(chart.flags & FAIL_EXCESS)
        slow_style = FAIL_STYLE if slow_failed else OK_STYLE
        v_low, e_low = chart.low_speed / vs, chart.cant_low / cs
        canvas.text(v_low, e_low, FAIL_MARK if slow_failed else "▼", slow_style, align="center")
        text = f"V_low {v_low:.4g}" + (" FAIL excess" if slow_failed else "")
        if canvas.text_near(v_low, e_low, text, slow_style, ("above", "right", "left")) is None:
            if slow_failed:
                canvas.text_near(v_low, e_low, "FAIL", slow_style, order)

    for edge, name in ((v_min, "V_min"), (v_max, "V_max")):
        cell = canvas.to_cell(edge, yhi)
        if cell is not None and (edge > 0 or name == "V_max"):
            text = f"{name} {edge:.4g}"
            if name == "V_min":
                _put(canvas, cell[0] - 1, r0, text, "green", "right")
            else:
                _put(canvas, cell[0] + 1, r0, text, "green")
    for level, text in ((ea, f"E_a {ea:.4g}"), (upper, "E_a + I_lim")):
        cell = canvas.to_cell(0.0, level)
        if cell is not None and r0 <= cell[1] - 1 <= r1:
            _put(canvas, c0 + 1, cell[1] - 1, text, "bold yellow" if level == ea else LIMIT_STYLE)
    if lower is not None and lower > ylo:
        cell = canvas.to_cell(0.0, lower)
        if cell is not None:
            row = cell[1] + 1 if cell[1] + 1 <= r1 else cell[1] - 1
            if r0 <= row <= r1:
                _put(canvas, c0 + 1, row, "E_a - X_lim", LIMIT_STYLE)
    canvas.text_near(float(speed[-1]), float(e[-1]), "E(V)", E_STYLE, ("left", "below"))

    note = " (other check)" if bend_failed and not failed else ""
    _title(
        canvas,
        f"Cant against speed, R {chart.radius / units.length:.6g} {units.length_label}, "
        f"E_a {ea:.4g} {units.cant_label}, allowed {v_min:.4g}-{v_max:.4g} "
        f"{units.speed_label}"
        if title
        else "",
        failed or bend_failed,
        note,
    )
    if legend:
        _legend(
            canvas,
            [
                ("⠉⠉⠉", E_STYLE, "E(V) equilibrium"),
                ("⠉⠉⠉", "bold yellow", "E_a applied"),
                ("⠁⠁⠁", LIMIT_STYLE, "limits"),
                ("  ", BAND_STYLE, "allowed"),
                (f"{OK_MARK} ▼", OK_STYLE, "V, V_low"),
                (FAIL_MARK, FAIL_STYLE, "FAIL"),
            ],
        )
    return canvas.render()


class _ChartView(Widget):
    DEFAULT_CSS = """
    RoadChartView, RailChartView {
        width: 1fr;
        height: 1fr;
        min-height: 6;
    }
    """
    EMPTY = ""
    KIND = ""

    def __init__(self, *, name: str | None = None, id: str | None = None, classes=None):
        super().__init__(name=name, id=id, classes=classes)
        self._chart = None
        self._units: UnitSystem | None = None
        self._message = self.EMPTY
        self._bend_failed = False

    def show(
        self,
        chart,
        units: UnitSystem | None = None,
        message: str = "",
        bend_failed: bool = False,
    ) -> None:
        """Show ``chart`` (None: ``message``) in ``units``; ``bend_failed`` when the bend
        fails a check the chart does not draw (its title then says FAIL)."""
        self._chart = chart
        self._units = units
        self._message = message or self.EMPTY
        self._bend_failed = bend_failed
        self.refresh()

    def show_session(self, session: Session) -> None:
        """The chart of the bend on screen when it is of this chart's kind (hidden when
        not), drawn from its inputs; kept as it is while the bend has no valid result."""
        bend = session.current
        if bend is None:
            return
        self.display = bend.kind == self.KIND
        record = session.state(bend).record
        if not self.display or record is None:
            return
        units = session.units
        try:
            chart = self.chart_for(bend.inputs, units, session.context)
        except InputError as exc:
            self.show(None, units=units, message=str(exc))
            return
        self.show(chart, units=units, bend_failed=record["status"] == "fail")

    def chart_for(self, inputs: dict, units: UnitSystem, ctx):
        """The chart of this view's kind for a bend's inputs (road: against the table)."""
        if self.KIND == "road":
            return road_chart_for_inputs(inputs, units, ctx.table)
        return rail_chart_for_inputs(inputs, units, ctx.limits)

    def render(self) -> Text:
        draw = draw_road_chart if self.KIND == "road" else draw_rail_chart
        size = self.size
        return draw(
            self._chart, size.width, size.height, self._units, self._message, self._bend_failed
        )


class RoadChartView(_ChartView):
    """Superelevation and side friction against radius for the current road bend."""

    EMPTY = NO_ROAD
    KIND = "road"


class RailChartView(_ChartView):
    """Cant against speed for the current rail curve."""

    EMPTY = NO_RAIL
    KIND = "rail"
