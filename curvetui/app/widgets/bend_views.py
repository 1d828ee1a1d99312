"""The views of one bend in tabs, shared by the project screen and a batch row's screen:
the worksheet and its working, and (for a project's bend) its plan and chart. F9 goes to
the next view."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.widgets import TabbedContent, TabPane

from curvetui.app.widgets.charts import RailChartView, RoadChartView
from curvetui.app.widgets.plan_sketch import PlanSketch
from curvetui.app.widgets.working_view import WorkingView
from curvetui.app.widgets.worksheet import Worksheet

VIEWS = ("sheet", "working", "plan", "chart")


def bend_views(pictures: bool = True) -> ComposeResult:
    """The tabs (compose them inside a screen's ``compose``): ``#views`` holding the
    worksheet ``#worksheet`` and ``#working-view``, with ``pictures`` also ``#plan-view``,
    ``#road-chart`` and ``#rail-chart``."""
    with TabbedContent(id="views", initial="sheet"):
        with TabPane("Worksheet", id="sheet"):
            yield Worksheet(id="worksheet")
        with TabPane("Working", id="working"):
            with VerticalScroll():
                yield WorkingView(id="working-view")
        if pictures:
            with TabPane("Plan", id="plan"):
                yield PlanSketch(id="plan-view")
            with TabPane("Chart", id="chart"):
                yield RoadChartView(id="road-chart")
                yield RailChartView(id="rail-chart")


def next_view(tabs: TabbedContent) -> None:
    """Show the view after the one shown (after the last: the worksheet)."""
    names = [pane.id for pane in tabs.query(TabPane)]
    tabs.active = names[(names.index(tabs.active) + 1) % len(names)]
