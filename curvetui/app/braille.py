"""The dot grid of the braille canvas (numpy and Rich Text only, no Textual): dots, lines
and background shading in data coordinates, and the grid rendered as Rich Text. Text and
axes on top of it are in curvetui.app.canvas.

Each character cell holds 2 x 4 dots (Unicode braille, U+2800 to U+28FF). Drawing is in
data coordinates once ``set_window`` has mapped a data window onto the plot area (the
canvas less its margins); y runs up. Lines are clipped to the plot area. A cell shows the
style of the last dot drawn in it; a label replaces the cells it covers; a background
style (``shade_x``) sits behind either.

Terminal cells are about twice as tall as they are wide, which makes a braille dot about
square: ``set_window(..., equal_aspect=True)`` widens one range so that a unit is the same
length across and up the screen (``cell_aspect``: cell height over width, 2 by default).
"""

from __future__ import annotations

import math

import numpy as np
from rich.text import Text

BRAILLE_BASE = 0x2800
# dot (row, column) in a cell -> bit of the braille character
DOT_BITS = np.array([[0x01, 0x08], [0x02, 0x10], [0x04, 0x20], [0x40, 0x80]], dtype=np.int32)


class BrailleGrid:
    """``width`` x ``height`` character cells of braille dots and shading; ``labels``
    holds the characters written over them (see BrailleCanvas)."""

    def __init__(self, width: int, height: int, cell_aspect: float = 2.0) -> None:
        self.width = max(0, int(width))
        self.height = max(0, int(height))
        self.cell_aspect = float(cell_aspect)
        self.dots = np.zeros((4 * self.height, 2 * self.width), dtype=bool)
        self.cell_style = np.zeros((self.height, self.width), dtype=np.int32)
        self.cell_bg = np.zeros((self.height, self.width), dtype=np.int32)
        self.labels: dict[tuple[int, int], tuple[str, int]] = {}
        self._inked: np.ndarray | None = None
        self._styles: list[str] = [""]
        self._style_ids: dict[str, int] = {"": 0}
        self.set_margins()
        self.set_window(0.0, 1.0, 0.0, 1.0)

    # ------------------------------------------------------------------ set-up
    def _style(self, style: str | None) -> int:
        style = style or ""
        index = self._style_ids.get(style)
        if index is None:
            index = self._style_ids[style] = len(self._styles)
            self._styles.append(style)
        return index

    def set_margins(self, left: int = 0, right: int = 0, top: int = 0, bottom: int = 0) -> None:
        """Keep cells free around the plot area (for tick labels, legends); call before
        ``set_window``."""
        left, right, top, bottom = (max(0, int(v)) for v in (left, right, top, bottom))
        # a canvas too small for its margins keeps at least one plot cell
        right = min(right, max(self.width - 1, 0))
        left = min(left, max(self.width - 1 - right, 0))
        bottom = min(bottom, max(self.height - 1, 0))
        top = min(top, max(self.height - 1 - bottom, 0))
        self.left, self.right, self.top, self.bottom = left, right, top, bottom
        self.ax0 = 2 * self.left
        self.ax1 = max(self.ax0, 2 * (self.width - self.right) - 1)
        self.ay0 = 4 * self.top
        self.ay1 = max(self.ay0, 4 * (self.height - self.bottom) - 1)

    @property
    def plot_cells(self) -> tuple[int, int, int, int]:
        """(first column, first row, last column, last row) of the plot area, inclusive."""
        return self.ax0 // 2, self.ay0 // 4, self.ax1 // 2, self.ay1 // 4

    def set_window(
        self,
        xmin: float,
        xmax: float,
        ymin: float,
        ymax: float,
        equal_aspect: bool = False,
        xlog: bool = False,
        ylog: bool = False,
    ) -> tuple[float, float, float, float]:
        """Map the data window onto the plot area; returns the window in use (widened for
        ``equal_aspect``). Log axes take the window in data units (positive)."""
        self.xlog, self.ylog = xlog, ylog
        x0, x1 = self._tx(xmin), self._tx(xmax)
        y0, y1 = self._ty(ymin), self._ty(ymax)
        if not x1 > x0:
            x0, x1 = x0 - 0.5, x0 + 0.5
        if not y1 > y0:
            y0, y1 = y0 - 0.5, y0 + 0.5
        nx = max(self.ax1 - self.ax0, 1)
        ny = max(self.ay1 - self.ay0, 1)
        if equal_aspect:
            dot_ratio = self.cell_aspect / 2.0  # dot height over dot width on screen
            per_dot = max((x1 - x0) / nx, (y1 - y0) / ny / dot_ratio)
            cx, cy = (x0 + x1) / 2, (y0 + y1) / 2
            half_x, half_y = per_dot * nx / 2, per_dot * dot_ratio * ny / 2
            x0, x1, y0, y1 = cx - half_x, cx + half_x, cy - half_y, cy + half_y
        self.wx0, self.wx1, self.wy0, self.wy1 = x0, x1, y0, y1
        self._sx = nx / (x1 - x0)
        self._sy = ny / (y1 - y0)
        window = (x0, x1, y0, y1)
        if xlog:
            window = (10**x0, 10**x1) + window[2:]
        if ylog:
            window = window[:2] + (10**y0, 10**y1)
        return window

    def _tx(self, x):
        x = np.asarray(x, dtype=float)
        if not self.xlog:
            return x
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(x > 0, np.log10(np.where(x > 0, x, 1.0)), np.nan)

    def _ty(self, y):
        y = np.asarray(y, dtype=float)
        if not self.ylog:
            return y
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(y > 0, np.log10(np.where(y > 0, y, 1.0)), np.nan)

    def to_dots(self, x, y) -> tuple[np.ndarray, np.ndarray]:
        """Data coordinates to fractional dot coordinates (column, row; row 0 at the top)."""
        px = self.ax0 + (self._tx(x) - self.wx0) * self._sx
        py = self.ay1 - (self._ty(y) - self.wy0) * self._sy
        return px, py

    def to_cell(self, x, y) -> tuple[int, int] | None:
        """(column, row) of the cell holding data point (x, y), None if off the canvas."""
        px, py = self.to_dots(x, y)
        px, py = float(px), float(py)
        if not (math.isfinite(px) and math.isfinite(py)):
            return None
        col, row = int(math.floor(px + 0.5)) // 2, int(math.floor(py + 0.5)) // 4
        if 0 <= col < self.width and 0 <= row < self.height:
            return col, row
        return None

    # ------------------------------------------------------------------ dots
    def _set_dots(self, px: np.ndarray, py: np.ndarray, style: str | None) -> None:
        if px.size == 0 or self.dots.size == 0:
            return
        ix = np.floor(px + 0.5).astype(np.int64)
        iy = np.floor(py + 0.5).astype(np.int64)
        keep = (ix >= self.ax0) & (ix <= self.ax1) & (iy >= self.ay0) & (iy <= self.ay1)
        ix, iy = ix[keep], iy[keep]
        self.dots[iy, ix] = True
        self.cell_style[iy // 4, ix // 2] = self._style(style)
        self._inked = None

    def polyline(
        self, xs, ys, style: str | None = None, pattern: tuple[int, int] | None = None
    ) -> None:
        """Join the points (xs, ys) with straight lines; NaN breaks the line.

        ``pattern`` (on, off) in dots dashes the line, counted along its whole length.
        """
        px, py = self.to_dots(xs, ys)
        self._polyline_dots(np.atleast_1d(px), np.atleast_1d(py), style, pattern)

    def _polyline_dots(self, px, py, style, pattern) -> None:
        """``polyline`` in fractional dot coordinates."""
        if px.size == 1:
            if np.isfinite(px[0]) and np.isfinite(py[0]):
                self._set_dots(px, py, style)
            return
        ax, ay, bx, by = px[:-1], py[:-1], px[1:], py[1:]
        seg_len = np.hypot(bx - ax, by - ay)
        start = np.concatenate([[0.0], np.cumsum(np.where(np.isfinite(seg_len), seg_len, 0))])
        ok = np.isfinite(ax) & np.isfinite(ay) & np.isfinite(bx) & np.isfinite(by)
        ax, ay, bx, by, seg_len, start = (a[ok] for a in (ax, ay, bx, by, seg_len, start[:-1]))
        # Liang-Barsky clipping to the plot area (half a dot beyond its outer dots)
        dx, dy = bx - ax, by - ay
        t0 = np.zeros_like(ax)
        t1 = np.ones_like(ax)
        lo_x, hi_x = self.ax0 - 0.5, self.ax1 + 0.5
        lo_y, hi_y = self.ay0 - 0.5, self.ay1 + 0.5
        with np.errstate(divide="ignore", invalid="ignore"):
            for p, q in ((-dx, ax - lo_x), (dx, hi_x - ax), (-dy, ay - lo_y), (dy, hi_y - ay)):
                r = q / p
                parallel = p == 0
                t0 = np.where(~parallel & (p < 0), np.maximum(t0, r), t0)
                t1 = np.where(~parallel & (p > 0), np.minimum(t1, r), t1)
                t1 = np.where(parallel & (q < 0), -1.0, t1)  # parallel and outside
        visible = t0 <= t1
        if not visible.any():
            return
        ax, ay, dx, dy, t0, t1, seg_len, start = (
            a[visible] for a in (ax, ay, dx, dy, t0, t1, seg_len, start)
        )
        part = t1 - t0
        n = np.ceil(np.maximum(np.abs(dx), np.abs(dy)) * part).astype(np.int64) + 1
        seg = np.repeat(np.arange(n.size), n)
        first = np.concatenate([[0], np.cumsum(n)[:-1]])
        k = np.arange(int(n.sum())) - first[seg]
        t = t0[seg] + part[seg] * k / np.maximum(n[seg] - 1, 1)
        gx = ax[seg] + t * dx[seg]
        gy = ay[seg] + t * dy[seg]
        if pattern is not None:
            on, off = (max(int(v), 0) for v in pattern)
            if on > 0 and off > 0:
                along = start[seg] + t * seg_len[seg]
                keep = np.floor(along + 1e-9).astype(np.int64) % (on + off) < on
                gx, gy = gx[keep], gy[keep]
        self._set_dots(gx, gy, style)

    def line(self, x0, y0, x1, y1, style: str | None = None, pattern=None) -> None:
        """A straight line from (x0, y0) to (x1, y1), data coordinates."""
        self.polyline([x0, x1], [y0, y1], style, pattern)

    def _dot_col(self, x) -> float:
        return float(self.ax0 + (self._tx(x) - self.wx0) * self._sx)

    def _dot_row(self, y) -> float:
        return float(self.ay1 - (self._ty(y) - self.wy0) * self._sy)

    def hline(self, y, style: str | None = None, pattern=None) -> None:
        """A line across the whole window at height ``y``."""
        py = self._dot_row(y)
        if math.isfinite(py):
            xs = np.array([self.ax0, self.ax1], dtype=float)
            self._polyline_dots(xs, np.array([py, py]), style, pattern)

    def vline(self, x, style: str | None = None, pattern=None) -> None:
        """A line up the whole window at ``x``."""
        px = self._dot_col(x)
        if math.isfinite(px):
            ys = np.array([self.ay1, self.ay0], dtype=float)
            self._polyline_dots(np.array([px, px]), ys, style, pattern)

    def point(self, x, y, style: str | None = None, size: int = 0) -> None:
        """One dot at (x, y); ``size`` 1 draws a 3 x 3 dot cross there instead."""
        px, py = self.to_dots(x, y)
        px, py = np.atleast_1d(px), np.atleast_1d(py)
        ok = np.isfinite(px) & np.isfinite(py)
        px, py = px[ok], py[ok]
        if size > 0:
            offsets = [(0, 0)] + [(d, 0) for d in (-size, size)] + [(0, d) for d in (-size, size)]
            px = np.concatenate([px + ox for ox, _ in offsets])
            py = np.concatenate([py + oy for _, oy in offsets])
        self._set_dots(px, py, style)

    def shade_x(self, x0, x1, style: str) -> None:
        """Background ``style`` (e.g. "on grey15") on the plot-area cells whose middle lies
        between x0 and x1."""
        p0, p1 = sorted((self._dot_col(x0), self._dot_col(x1)))
        c0, r0, c1, r1 = self.plot_cells
        cols = np.arange(c0, c1 + 1)
        mid = 2 * cols + 0.5
        chosen = cols[(mid >= p0 - 1e-9) & (mid <= p1 + 1e-9)]
        if chosen.size and self.cell_bg.size:
            self.cell_bg[r0 : r1 + 1, chosen] = self._style(style)

    # ------------------------------------------------------------------ output
    def inked_cells(self) -> np.ndarray:
        """True for every cell holding at least one dot."""
        if self._inked is None:
            self._inked = self.dots.reshape(self.height, 4, self.width, 2).any(axis=(1, 3))
        return self._inked

    def cell_chars(self) -> np.ndarray:
        """The braille code point of every cell (0x2800 for an empty one), labels aside."""
        h, w = self.height, self.width
        blocks = self.dots.reshape(h, 4, w, 2)
        bits = np.einsum("rywx,yx->rw", blocks.astype(np.int32), DOT_BITS)
        return BRAILLE_BASE + bits

    def render(self) -> Text:
        """The picture as Rich Text: ``height`` lines of exactly ``width`` cells."""
        codes = self.cell_chars()
        inked = codes != BRAILLE_BASE
        fg_ids = np.where(inked, self.cell_style, 0).tolist()
        chars = np.where(inked, codes, 0x20).tolist()
        bg_ids = self.cell_bg.tolist()
        by_row: dict[int, list[tuple[int, str, int]]] = {}
        for (r, c), (ch, fg) in self.labels.items():
            by_row.setdefault(r, []).append((c, ch, fg))
        styles = self._styles
        combined: dict[tuple[int, int], str] = {}
        pieces: list[tuple[str, str | None]] = []
        width = self.width
        blank = (~inked & (self.cell_bg == 0)).tolist()
        for row in range(self.height):
            row_chars = list(map(chr, chars[row]))
            row_fg = fg_ids[row]
            row_blank = blank[row]
            for c, ch, fg in by_row.get(row, ()):
                row_chars[c] = ch
                row_fg[c] = fg
                row_blank[c] = False
            # a plain blank looks the same in any foreground style: let it join the run on
            # its left, so that a line of dots with gaps stays one styled piece
            for c in range(1, width):
                if row_blank[c]:
                    row_fg[c] = row_fg[c - 1]
            row_bg = bg_ids[row]
            start = 0
            key = (row_fg[0], row_bg[0]) if width else (0, 0)
            for col in range(1, width + 1):
                if col < width:
                    here = (row_fg[col], row_bg[col])
                    if here == key:
                        continue
                style = combined.get(key)
                if style is None:
                    style = " ".join(s for s in (styles[key[0]], styles[key[1]]) if s)
                    combined[key] = style
                pieces.append(("".join(row_chars[start:col]), style or None))
                start = col
                if col < width:
                    key = here
            if row < self.height - 1:
                pieces.append(("\n", None))
        text = Text(no_wrap=True, overflow="crop", end="")
        text.append_tokens(pieces)
        return text
