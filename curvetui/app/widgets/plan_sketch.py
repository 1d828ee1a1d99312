"""The plan of one bend: tangents, spirals and arc, key points with their stations, the PI.

``draw_plan`` makes the picture (Rich Text) for any size; ``PlanSketch`` shows it and
redraws it at its own size.
"""

from __future__ import annotations

import math
from collections.abc import Mapping

from rich.text import Text
from textual.widget import Widget

from curvetui.app.canvas import BrailleCanvas, nice_step
from curvetui.app.plain import visible
from curvetui.app.session import Session
from curvetui.core.spiral import GeometryError
from curvetui.core.units import METRIC, UnitSystem
from curvetui.inputs import InputError
from curvetui.reports.plan import (
    ARC,
    SPIRAL_IN,
    SPIRAL_OUT,
    TANGENT,
    PlanShape,
    plan_for_inputs,
    station_texts,
)

NO_GEOMETRY = "give a deflection to see the plan"

# line styles: colour and a dash pattern, so the elements differ without colour too
STYLES = {
    TANGENT: ("dim", (1, 2)),
    SPIRAL_IN: ("magenta", (4, 2)),
    SPIRAL_OUT: ("magenta", (4, 2)),
    ARC: ("bold cyan", None),
}
KEY_STYLE = "bold"
PI_STYLE = "bold yellow"
LEGEND = (
    ("⠉⠈⠁", "tangent", TANGENT),
    ("⠉⠉⠁", "spiral", SPIRAL_IN),
    ("⠉⠉⠉", "arc", ARC),
)


def _message(width: int, height: int, message: str) -> Text:
    canvas = BrailleCanvas(width, height)
    message = visible(message)  # it may quote what was typed
    lines = [message[i : i + max(width, 1)] for i in range(0, len(message), max(width, 1))]
    top = max((height - len(lines)) // 2, 0)
    for i, line in enumerate(lines):
        canvas.text_cell(width // 2, top + i, line, "italic", align="center", clamp=True)
    return canvas.render()


def _scale_bar(metres_per_cell: float, units: UnitSystem) -> tuple[str, str]:
    """A bar of a round length (user units) about 8 cells long: (bar, label)."""
    per_cell = metres_per_cell / units.length
    length = nice_step(8 * per_cell, 1)
    cells = max(int(round(length / per_cell)), 2)
    return "├" + "─" * (cells - 2) + "┤", f"{length:g} {units.length_label}"


def draw_plan(
    shape: PlanShape | None,
    width: int,
    height: int,
    stations: Mapping[str, str] | None = None,
    units: UnitSystem | None = None,
    message: str = "",
) -> Text:
    """The plan picture of ``shape`` in ``width`` x ``height`` cells (``message`` alone
    when there is no shape). ``stations``: text beside each key point's name."""
    units = units or METRIC
    if shape is None:
        return _message(width, height, message or NO_GEOMETRY)
    stations = stations or {}
    canvas = BrailleCanvas(width, height)
    top, bottom = (1, 1) if height >= 6 else (0, 0)
    canvas.set_margins(left=1, right=1, top=top, bottom=bottom)
    xmin, xmax, ymin, ymax = shape.bounds()
    pad = 0.12 * max(xmax - xmin, ymax - ymin, 1e-9)
    window = canvas.set_window(xmin - pad, xmax + pad, ymin - pad, ymax + pad, equal_aspect=True)

    for part in shape.parts:
        style, pattern = STYLES[part.kind]
        canvas.polyline(part.x, part.y, style, pattern)
    for point in shape.key_points:
        if point.name != "PI":
            canvas.point(point.x, point.y, KEY_STYLE, size=1)

    # labels: PI first, then the key points, each pushed away from the arc centre
    cx, cy = shape.centre
    merged: dict[tuple[int, int] | None, list] = {}
    for point in shape.key_points:
        merged.setdefault(canvas.to_cell(point.x, point.y), []).append(point)
    ordered = sorted(merged.items(), key=lambda item: item[1][0].name != "PI")
    for cell, points in ordered:
        if cell is None:
            continue
        first = points[0]
        names = "=".join(p.name for p in points)
        station = stations.get(first.name, "")
        full = f"{names} {station}".strip()
        ox, oy = first.x - cx, first.y - cy
        if first.name == "PI":
            canvas.text_cell(cell[0], cell[1], "△", PI_STYLE)
        across = "right" if ox >= 0 else "left"
        up = "above" if oy >= 0 else "below"
        if abs(oy) >= abs(ox):
            order = (up, f"{up}-{across}", across, f"{up}-{_other(across)}", _other(up))
        else:
            order = (across, f"{up}-{across}", up, _other(up), _other(across))
        style = PI_STYLE if first.name == "PI" else KEY_STYLE
        if canvas.text_near(first.x, first.y, full, style, order) is None:
            canvas.text_near(first.x, first.y, names, style, order)

    if top:
        hand = "right-hand" if shape.direction > 0 else "left-hand"
        kind = "spiralled" if shape.spiralled else "circular"
        radius = units.length_from_si(shape.radius)
        title = (
            f"Plan sketch, not to bearing: {hand} {kind} bend, R {radius:.6g} "
            f"{units.length_label}, Δ {math.degrees(shape.deflection):.4g}°"
        )
        canvas.text_cell(0, 0, title[:width], "bold")
    if bottom:
        col = 0
        row = height - 1
        for sample, label, kind in LEGEND:
            canvas.text_cell(col, row, sample, STYLES[kind][0])
            canvas.text_cell(col + 4, row, label)
            col += 5 + len(label) + 1
        canvas.text_cell(col, row, "⠺", KEY_STYLE)
        canvas.text_cell(col + 2, row, "key point", "")
        col += 12
        canvas.text_cell(col, row, "△", PI_STYLE)
        canvas.text_cell(col + 2, row, "PI", "")
        col += 6
        nx = max(canvas.ax1 - canvas.ax0, 1)
        metres_per_cell = 2.0 * (window[1] - window[0]) / nx
        bar, label = _scale_bar(metres_per_cell, units)
        if col + len(bar) + len(label) + 1 <= width:
            canvas.text_cell(col, row, bar, "")
            canvas.text_cell(col + len(bar) + 1, row, label, "")
    return canvas.render()


def _other(side: str) -> str:
    return {"right": "left", "left": "right", "above": "below", "below": "above"}[side]


class PlanSketch(Widget):
    """The plan of the current bend, redrawn at the widget's size."""

    DEFAULT_CSS = """
    PlanSketch {
        width: 1fr;
        height: 1fr;
        min-height: 4;
    }
    """

    def __init__(self, *, name: str | None = None, id: str | None = None, classes=None):
        super().__init__(name=name, id=id, classes=classes)
        self._shape: PlanShape | None = None
        self._message = NO_GEOMETRY
        self._stations: dict[str, str] = {}
        self._units: UnitSystem | None = None

    def show(
        self,
        shape: PlanShape | None,
        message: str = "",
        stations: Mapping[str, str] | None = None,
        units: UnitSystem | None = None,
    ) -> None:
        """Show ``shape`` (None: ``message``, by default how to get a plan); ``stations``
        maps key point names (TS, SC, CS, ST, PC, PT, PI) to their station text."""
        self._shape = shape
        self._message = message or NO_GEOMETRY
        self._stations = dict(stations or {})
        self._units = units
        self.refresh()

    def show_session(self, session: Session) -> None:
        """The plan of the bend on screen, from its inputs and its last good radius."""
        bend = session.current
        if bend is None:
            self.show(None, "No bend: F3 adds one.")
            return
        record = session.state(bend).record
        if record is None:
            self.show(None, "no valid inputs yet")
            return
        units = session.units
        radius = units.length_to_si(record["radius"])
        from curvetui.storage.project.chain import direction_on, effective_inputs

        layout = session.layout  # on the alignment: its deflection, PI station, direction
        inputs = effective_inputs(bend.id, bend.inputs, layout)
        try:
            shape = plan_for_inputs(
                inputs, units, radius, direction_on(layout, bend.id), name=lambda k: k
            )
        except (InputError, GeometryError) as exc:
            self.show(None, str(exc))
            return
        self.show(
            shape,
            "" if shape else NO_GEOMETRY,
            stations=station_texts(shape, units) if shape else None,
            units=units,
        )

    def render(self) -> Text:
        size = self.size
        return draw_plan(
            self._shape, size.width, size.height, self._stations, self._units, self._message
        )
