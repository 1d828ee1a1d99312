"""Smoke tests of the picture widgets: each mounted alone in a small App at 80 x 24, what
Textual renders for it holds the key point labels, the legend and the status.

Check values: the station texts follow from PC = PI - T, T = R tan(D/2) (Indiana DOT Design
Manual Fig. 43-6D, REFERENCES.md): R 300 m, D 50 degrees, PI 1+000 give T = 139.892 m
(300 x tan 25 degrees = 300 x 0.466308 by hand), PC 0+860.108. R_min for 80 km/h, e_max 8 %,
f_max 0.14 (Green Book Eq. 3-10): 6400 / (127 x 0.22) = 229.06 m, so R 200 m fails.
"""

from __future__ import annotations

import asyncio
import math

import pytest
from textual.app import App, ComposeResult
from textual.geometry import Region

from curvetui.app.widgets.charts import RailChartView, RoadChartView
from curvetui.app.widgets.plan_sketch import NO_GEOMETRY, PlanSketch
from curvetui.core.units import KMH, METRIC
from curvetui.reports.charts import rail_chart, road_chart
from curvetui.reports.plan import plan_points, station_texts
from curvetui.storage.tables import rail_limits, road_table

pytestmark = pytest.mark.app  # starts Textual: `pytest -m "not app"` leaves it out


class Host(App):
    """One widget filling the screen."""

    def __init__(self, widget):
        super().__init__()
        self.widget = widget

    def compose(self) -> ComposeResult:
        yield self.widget


def screen_text(widget) -> list[str]:
    """The lines Textual renders for ``widget``."""
    w, h = widget.size
    return [strip.text for strip in widget.render_lines(Region(0, 0, w, h))]


def mounted(widget, fill):
    """Mount ``widget`` in an 80 x 24 app, call ``fill(widget)``, return its screen lines
    before and after a resize to 60 x 20."""

    async def run():
        app = Host(widget)
        async with app.run_test(size=(80, 24)) as pilot:
            fill(widget)
            await pilot.pause()
            first = screen_text(widget)
            await pilot.resize_terminal(60, 20)
            await pilot.pause()
            return first, screen_text(widget)

    return asyncio.run(run())


def test_plan_sketch_shows_key_points_stations_and_legend():
    shape = plan_points(300.0, math.radians(50), pi_station=1000.0)
    texts = station_texts(shape, METRIC)
    assert texts["PC"] == "0+860.108"  # by hand, see the module docstring
    lines, small = mounted(PlanSketch(), lambda w: w.show(shape, stations=texts, units=METRIC))
    assert len(lines) == 24 and all(len(line) == 80 for line in lines)
    screen = "\n".join(lines)
    for label in ("PC 0+860.108", "PT", "PI 1+000.000", "△", "tangent", "arc", "key point"):
        assert label in screen, label
    assert "right-hand circular bend, R 300 m" in lines[0]
    assert len(small) == 20 and all(len(line) == 60 for line in small)  # redrawn on resize
    assert "PC" in "\n".join(small)


def test_plan_sketch_spiral_labels_and_empty_message():
    shape = plan_points(250.0, math.radians(40), 60.0, 60.0, direction=-1, pi_station=1200.0)
    lines, _ = mounted(PlanSketch(), lambda w: w.show(shape, stations=station_texts(shape, METRIC)))
    screen = "\n".join(lines)
    for name in ("TS", "SC", "CS", "ST", "PI", "spiral"):
        assert name in screen, name
    empty, _ = mounted(PlanSketch(), lambda w: w.show(None))
    assert NO_GEOMETRY in "\n".join(empty)


def test_road_chart_view_marks_a_failing_bend():
    table = road_table("aashto-2018-metric")
    chart = road_chart(table, 80 * KMH, 0.08, 200.0)
    lines, _ = mounted(RoadChartView(), lambda w: w.show(chart, METRIC))
    screen = "\n".join(lines)
    assert "✕ FAIL" in lines[0]  # the title's status, a symbol and a word
    assert "FAIL R < R_min" in screen  # beside the bend's point
    for label in ("R_min 229.1", "f_max 0.14", "e design", "f at V", "R m"):
        assert label in screen, label
    good = road_chart(table, 80 * KMH, 0.08, 400.0)
    ok_lines, _ = mounted(RoadChartView(), lambda w: w.show(good, METRIC))
    assert "● ok" in ok_lines[0] and "FAIL" not in ok_lines[0]
    other, _ = mounted(RoadChartView(), lambda w: w.show(good, METRIC, bend_failed=True))
    assert "FAIL (other check)" in other[0]


def test_rail_chart_view_shows_band_and_speeds():
    chart = rail_chart(rail_limits("en13803-2010"), 800.0, 0.100, None, 120 * KMH, 60 * KMH)
    lines, small = mounted(RailChartView(), lambda w: w.show(chart, METRIC))
    screen = "\n".join(lines)
    for label in ("V 120 ok", "V_low 60", "V_max 132.8", "E_a 100", "E(V)", "allowed", "● ok"):
        assert label in screen, label
    assert len(small) == 20 and all(len(line) == 60 for line in small)
    empty, _ = mounted(RailChartView(), lambda w: w.show(None))
    assert "to see the chart" in "\n".join(empty)


def test_rail_chart_view_marks_a_failing_slow_train():
    # E_low = 11.8 x 20^2 / 600 = 7.9 mm (EN 13803 form), excess 142 mm over a 130 mm limit
    chart = rail_chart(rail_limits("en13803-2010"), 600.0, 0.150, None, 100 * KMH, 20 * KMH)
    lines, _ = mounted(RailChartView(), lambda w: w.show(chart, METRIC))
    screen = "\n".join(lines)
    assert "✕ FAIL" in lines[0]
    assert "V_low 20 FAIL excess" in screen
    assert "●" not in screen.split("\n", 1)[1].rsplit("\n", 1)[0]  # no ok mark in the plot
