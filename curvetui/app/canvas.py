"""A braille-dot canvas for line pictures in the terminal (Rich Text only, no Textual): the
dot grid of curvetui.app.braille with text, tick marks and axes written over it, and the
round tick values for axes.

A label replaces the cells it covers; ``text_near`` looks for a free place beside a point.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

from curvetui.app.braille import BRAILLE_BASE, DOT_BITS, BrailleGrid

__all__ = [
    "BRAILLE_BASE",
    "DOT_BITS",
    "BrailleCanvas",
    "log_ticks",
    "nice_step",
    "nice_ticks",
    "short_number",
]


def nice_step(span: float, count: int = 5) -> float:
    """A 1, 2 or 5 x 10^n step giving about ``count`` intervals over ``span``."""
    if not (span > 0 and math.isfinite(span)):
        return 1.0
    raw = span / max(count, 1)
    power = 10.0 ** math.floor(math.log10(raw))
    for m in (1.0, 2.0, 5.0, 10.0):
        if raw <= m * power * (1 + 1e-9):
            return m * power
    return 10.0 * power


def nice_ticks(lo: float, hi: float, count: int = 5) -> list[float]:
    """Round tick values (steps of 1, 2 or 5 x 10^n) inside [lo, hi]."""
    if not (math.isfinite(lo) and math.isfinite(hi)) or hi <= lo:
        return []
    step = nice_step(hi - lo, count)
    first = math.ceil(lo / step - 1e-9)
    last = math.floor(hi / step + 1e-9)
    return [round(i * step, 12) + 0.0 for i in range(first, last + 1)]


def log_ticks(lo: float, hi: float, count: int = 6) -> list[float]:
    """Ticks for a log axis over [lo, hi] (lo > 0): 1 x 10^n, adding 2 and 5 while few."""
    if not (lo > 0 and hi > lo and math.isfinite(hi)):
        return []
    a, b = math.floor(math.log10(lo)), math.ceil(math.log10(hi))
    for mantissas in ((1, 2, 5), (1, 3), (1,)):
        ticks = [
            m * 10.0**p
            for p in range(a, b + 1)
            for m in mantissas
            if lo * (1 - 1e-9) <= m * 10.0**p <= hi * (1 + 1e-9)
        ]
        if len(ticks) <= count:
            break
    if len(ticks) < 2:  # less than a decade: linear steps shown on the log scale
        ticks = [t for t in nice_ticks(lo, hi, 4) if t > 0]
    return ticks


def short_number(value: float) -> str:
    """Compact tick text: 0.05, 2, 150, 1.5k, 20k."""
    if value == 0:
        return "0"
    a = abs(value)
    if a >= 10000:
        return f"{value / 1000:g}k"
    if a >= 1:
        return f"{value:.4g}"
    return f"{value:.3g}"


class BrailleCanvas(BrailleGrid):
    """``width`` x ``height`` character cells of braille dots, labels and shading."""

    # ------------------------------------------------------------------ labels
    def text_cell(
        self,
        col: int,
        row: int,
        label: str,
        style: str | None = None,
        align: str = "left",
        clamp: bool = False,
    ) -> tuple[int, int, int] | None:
        """Write ``label`` in row ``row`` from column ``col`` (``align`` "left", "center",
        "right": the column is its first, middle or last cell). ``clamp`` shifts it inside
        the canvas; otherwise the part off the canvas is cut. Returns (row, first, last)
        columns written, or None."""
        if not label or not 0 <= row < self.height:
            return None
        n = len(label)
        if align == "center":
            col -= n // 2
        elif align == "right":
            col -= n - 1
        if clamp:
            col = min(max(col, 0), max(self.width - n, 0))
        index = self._style(style)
        written = [c for c in range(col, col + n) if 0 <= c < self.width]
        for c in written:
            self.labels[(row, c)] = (label[c - col], index)
        return (row, written[0], written[-1]) if written else None

    def text(
        self,
        x,
        y,
        label: str,
        style: str | None = None,
        align: str = "left",
        dx: int = 0,
        dy: int = 0,
        clamp: bool = True,
    ) -> tuple[int, int, int] | None:
        """Write ``label`` at the cell holding data point (x, y), moved ``dx`` columns right
        and ``dy`` rows down; see ``text_cell``. Nothing is written for a point off the
        canvas."""
        cell = self.to_cell(x, y)
        if cell is None:
            return None
        return self.text_cell(cell[0] + dx, cell[1] + dy, label, style, align, clamp)

    def text_near(
        self,
        x,
        y,
        label: str,
        style: str | None = None,
        order: Sequence[str] = ("right", "above", "left", "below"),
    ) -> tuple[int, int, int] | None:
        """Write ``label`` beside the cell holding (x, y), leaving that cell itself free:
        the first place in ``order`` ("right", "left", "above", "below", "above-right",
        "above-left", "below-right", "below-left") that fits on the canvas over no label
        and no dots, else the first over no label; None when nothing fits."""
        cell = self.to_cell(x, y)
        if cell is None or not label:
            return None
        col, row = cell
        n = len(label)
        spots = {
            "right": (row, col + 1),
            "left": (row, col - n),
            "above": (row - 1, col - n // 2),
            "below": (row + 1, col - n // 2),
            "above-right": (row - 1, col + 1),
            "above-left": (row - 1, col - n),
            "below-right": (row + 1, col + 1),
            "below-left": (row + 1, col - n),
        }
        fallback = None
        inked = self.inked_cells()
        for name in order:
            r, c = spots[name]
            if not self.is_free(r, c, c + n - 1):
                continue
            if not inked[r, c : c + n].any():
                return self.text_cell(c, r, label, style)
            if fallback is None:
                fallback = (r, c)
        if fallback is None:
            return None
        return self.text_cell(fallback[1], fallback[0], label, style)

    def is_free(self, row: int, first: int, last: int) -> bool:
        """True when no label covers cells first..last of ``row`` (and they are on the
        canvas)."""
        if not (0 <= row < self.height and 0 <= first and last < self.width):
            return False
        return all((row, c) not in self.labels for c in range(first, last + 1))

    # ------------------------------------------------------------------ axes
    def axes(
        self,
        xticks: Sequence[float] = (),
        yticks: Sequence[float] = (),
        xfmt: Callable[[float], str] = short_number,
        yfmt: Callable[[float], str] = short_number,
        style: str | None = "dim",
    ) -> None:
        """Axis lines just left of and below the plot area (needs margins left >= 1 and
        bottom >= 1), ticks at ``xticks`` / ``yticks`` (data units), tick labels in the
        margins (left of the axis; below it when the bottom margin has two rows)."""
        c0, r0, c1, r1 = self.plot_cells
        axis_col, axis_row = c0 - 1, r1 + 1
        if axis_col < 0 or axis_row >= self.height:
            return
        for r in range(r0, r1 + 1):
            self.text_cell(axis_col, r, "│", style)
        self.text_cell(axis_col, axis_row, "└" + "─" * (c1 - c0 + 1), style)
        for value in yticks:
            py = self._dot_row(value)
            if not math.isfinite(py):
                continue
            row = int(math.floor(py + 0.5)) // 4
            if not r0 <= row <= r1:
                continue
            self.text_cell(axis_col, row, "┤", style)
            if axis_col >= 2:
                text = yfmt(value)[-(axis_col - 1) :]
                self.text_cell(axis_col - 1, row, text, style, align="right")
        last_end = -2
        for value in xticks:
            px = self._dot_col(value)
            if not math.isfinite(px):
                continue
            col = int(math.floor(px + 0.5)) // 2
            if not c0 <= col <= c1:
                continue
            self.text_cell(col, axis_row, "┬", style)
            if axis_row + 1 < self.height:
                text = xfmt(value)
                start = min(max(col - len(text) // 2, 0), self.width - len(text))
                if start > last_end + 1:
                    self.text_cell(start, axis_row + 1, text, style)
                    last_end = start + len(text) - 1
