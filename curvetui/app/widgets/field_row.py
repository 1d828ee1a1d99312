"""One row of the worksheet's form: a label, the field and its unit, in two widgets.

The row draws its label (left) and unit (right) itself and holds the field (a FieldInput) in
between, instead of a container holding a Label, the field and a Static: the worksheet's
twenty-odd rows then mount, lay out and paint as 42 widgets instead of 84, a good part of
the app's time from its first frame to the first results (benchmarks/app_startup.py).
A unit changed is a repaint of the row, never a new layout of the screen.
"""

from __future__ import annotations

from rich.segment import Segment
from textual.strip import Strip
from textual.widget import Widget

LABEL_WIDTH = 15  # cells: the label and the space after it
UNIT_WIDTH = 5  # cells: a space and the unit
LABEL, UNIT = "field-row--label", "field-row--unit"  # their styles (component classes)


def first_line(text: str, width: int) -> str:
    """The words of ``text`` that fit on a line of ``width`` cells (a label too long is cut
    at a word, as the wrapped label of a one-line row always was; a single word too long
    is cut to the width)."""
    line = ""
    for word in text.split():
        candidate = f"{line} {word}" if line else word
        if len(candidate) > width:
            return line or word[:width]
        line = candidate
    return line


class FieldRow(Widget):
    """A label, its field (the one child, composed inside this row) and a unit."""

    COMPONENT_CLASSES = {"field-row--label", "field-row--unit"}
    DEFAULT_CSS = f"""
    FieldRow {{ height: 1; layout: horizontal; }}
    FieldRow > FieldInput {{ margin: 0 {UNIT_WIDTH} 0 {LABEL_WIDTH}; }}
    FieldRow > .field-row--unit {{ color: $text-muted; }}
    FieldRow.-invalid > .field-row--label {{ color: $error; text-style: bold; }}
    """

    def __init__(self, label: str, *children: Widget, **kwargs) -> None:
        super().__init__(*children, **kwargs)
        self._label = label
        self._unit = ""

    @property
    def unit(self) -> str:
        return self._unit

    @unit.setter
    def unit(self, unit: str) -> None:
        if unit != self._unit:
            self._unit = unit
            self.refresh()  # same size: no layout

    @property
    def label(self) -> str:
        return self._label

    def render_line(self, y: int) -> Strip:
        """The label, blank under the field, the unit: drawn as a Label and a Static of
        those widths would draw them (blank cells carry only the background)."""
        width = self.size.width
        base = self.visual_style
        blank = base.background_style.rich_style
        label = first_line(self._label, LABEL_WIDTH - 1)
        unit = self._unit[: UNIT_WIDTH - 1]
        unit_at = max(len(label), width - (UNIT_WIDTH - 1))
        segments = [
            Segment(label, self.get_visual_style(LABEL).rich_style),
            Segment(" " * (unit_at - len(label)), blank),
            Segment(unit, self.get_visual_style(UNIT).rich_style),
            Segment(" " * (width - unit_at - len(unit)), blank),
        ]
        return Strip([s for s in segments if s.text], unit_at + len(unit)).crop_extend(
            0, width, blank
        )
