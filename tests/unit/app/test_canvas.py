"""The braille canvas (curvetui.app.canvas).

Check values (source: the Unicode Standard, Braille Patterns block (U+2800-U+28FF)): a
cell's character is U+2800 plus the sum of its raised dots, dot 1 (top left) 0x01, 2 0x02,
3 0x04 (down the left column), 4 0x08, 5 0x10, 6 0x20 (down the right), 7 0x40 and 8 0x80
(the bottom row, left and right). So a full top row is U+2809, a full bottom row U+28C0, a
full left column U+2847. Geometry of a circle: x^2 + y^2 = 1.
"""

from __future__ import annotations

import numpy as np
import pytest
from rich.cells import cell_len

from curvetui.app.canvas import BrailleCanvas, log_ticks, nice_ticks


def lines(text):
    return text.plain.split("\n")


def unit_canvas(width=4, height=2):
    """A canvas whose data coordinates are its dot coordinates, y up (no margins)."""
    c = BrailleCanvas(width, height)
    c.set_window(0, 2 * width - 1, 0, 4 * height - 1)
    return c


@pytest.mark.parametrize("size", [(80, 24), (1, 1), (37, 5), (120, 40)])
def test_render_is_exactly_width_by_height(size):
    w, h = size
    c = BrailleCanvas(w, h)
    c.set_margins(left=min(6, w - 1), bottom=min(2, h - 1))
    c.set_window(0, 10, 0, 10)
    c.line(-5, -5, 15, 15, "red")  # runs off both ends of the window
    c.text(5, 5, "a label longer than some canvases", "bold")
    c.axes(nice_ticks(0, 10), nice_ticks(0, 10))
    out = lines(c.render())
    assert len(out) == h
    assert all(cell_len(line) == w for line in out)


def test_horizontal_line_sets_the_top_and_bottom_dot_rows():
    c = unit_canvas()
    c.line(0, 7, 7, 7)  # the top row of dots
    c.line(0, 4, 7, 4)  # the bottom dot row of the first cell row
    out = lines(c.render())
    assert out[0] == "\u28c9" * 4  # dots 1, 4, 7, 8: 0x01 + 0x08 + 0x40 + 0x80
    assert out[1] == "    "


def test_short_horizontal_line_fills_only_its_cells():
    c = unit_canvas()
    c.line(2, 0, 5, 0)  # bottom dot row, dots 2..5: cells 1 and 2 of the second row
    out = lines(c.render())
    assert out[0] == "    "
    assert out[1] == " \u28c0\u28c0 "


def test_vertical_line_sets_the_left_dot_column():
    c = unit_canvas()
    c.line(0, 0, 0, 7)
    out = lines(c.render())
    assert out == ["\u2847   ", "\u2847   "]  # dots 1, 2, 3, 7


def test_single_point_and_its_bit():
    c = unit_canvas(1, 1)
    c.point(1, 0)  # bottom right dot: dot 8
    assert lines(c.render()) == ["\u2880"]


def test_dash_pattern_counts_along_the_line():
    c = unit_canvas(4, 1)
    c.line(0, 3, 7, 3, pattern=(2, 2))  # top row: dots 0, 1 on, 2, 3 off, 4, 5 on ...
    assert lines(c.render()) == ["\u2809 \u2809 "]


def test_lines_are_clipped_to_the_plot_area():
    c = BrailleCanvas(10, 4)
    c.set_margins(left=2, bottom=1)
    c.set_window(0, 1, 0, 1)
    c.line(-1e9, 0.5, 1e9, 0.5, "red")  # huge, clipped quickly
    c.line(5, 5, 6, 6)  # wholly outside: nothing
    out = lines(c.render())
    dots = [i for i, ch in enumerate(out[1]) if ch != " "]
    assert dots and min(dots) == 2  # nothing in the left margin
    assert out[3] == " " * 10  # nor in the bottom margin
    assert c.dots[:, :4].sum() == 0


def test_later_items_overwrite_style_and_labels_overwrite_cells():
    c = unit_canvas()
    c.line(0, 7, 7, 7, "red")
    c.line(0, 7, 3, 7, "blue")
    c.text_cell(3, 0, "X", "bold")
    text = c.render()
    assert lines(text)[0] == "\u2809\u2809\u2809X"  # dots 1 and 4
    styles = {str(span.style): text.plain[span.start : span.end] for span in text.spans}
    assert styles["blue"] == "\u2809\u2809"
    assert styles["red"] == "\u2809"
    assert styles["bold"] == "X"


def test_background_shading_sits_behind_dots():
    c = unit_canvas()
    c.shade_x(0, 3, "on green")
    c.line(0, 7, 7, 7, "red")
    text = c.render()
    styles = [(str(s.style), s.end - s.start) for s in text.spans if s.start < 4]
    assert ("red on green", 2) in styles


def _round_extent(canvas):
    t = np.linspace(0, 2 * np.pi, 720)
    canvas.polyline(np.cos(t), np.sin(t))
    rows, cols = np.nonzero(canvas.dots)
    return cols.max() - cols.min() + 1, rows.max() - rows.min() + 1


def test_equal_aspect_keeps_a_circle_round():
    # cells twice as tall as wide make braille dots square: a round circle spans as many
    # dots across as up
    c = BrailleCanvas(80, 24)
    c.set_window(-1, 1, -1, 1, equal_aspect=True)
    across, up = _round_extent(c)
    assert up == 96  # the window's short side is the height: all of it
    assert across == pytest.approx(up, abs=2)
    # taller cells (2.4 : 1) make taller dots: fewer dots up for the same length
    tall = BrailleCanvas(80, 24, cell_aspect=2.4)
    tall.set_window(-1, 1, -1, 1, equal_aspect=True)
    across, up = _round_extent(tall)
    assert across / up == pytest.approx(1.2, rel=0.03)


def test_without_equal_aspect_the_circle_is_stretched():
    c = BrailleCanvas(80, 24)
    c.set_window(-1, 1, -1, 1)
    across, up = _round_extent(c)
    assert across / up == pytest.approx(160 / 96, rel=0.02)


def test_window_corners_map_to_corner_cells_and_log_axis():
    c = BrailleCanvas(20, 5)
    c.set_window(10, 1000, 0, 1, xlog=True)
    assert c.to_cell(10, 0) == (0, 4)
    assert c.to_cell(1000, 1) == (19, 0)
    assert c.to_cell(100, 0)[0] == pytest.approx(10, abs=1)  # a decade is half the width
    assert c.to_cell(-5, 0) is None  # no log of a negative radius


def test_text_near_keeps_clear_of_labels():
    c = unit_canvas(20, 3)
    c.text_cell(5, 1, "####", "")
    placed = c.text_near(4.0 * 2, 6.0, "ok", "", ("right", "left"))  # cell (4, 1)
    assert placed == (1, 2, 3)  # right was taken, so to the left


def test_ticks():
    assert nice_ticks(0, 1, 5) == [0.0, 0.2, 0.4, 0.6, 0.8, 1.0]
    assert nice_ticks(-0.03, 0.27, 4) == [0.0, 0.1, 0.2]
    assert log_ticks(100, 10_000, count=7) == [100, 200, 500, 1000, 2000, 5000, 10_000]
    assert log_ticks(150, 60_000) == [300, 1000, 3000, 10_000, 30_000]  # fewer when crowded
    assert log_ticks(210, 290) == [220, 240, 260, 280]  # within a decade: linear steps
