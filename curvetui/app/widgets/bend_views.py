"""The views of one bend in tabs, shared by the project screen and a batch row's screen:
the worksheet and its working, and (for a project's bend) its plan and chart. F9 goes to
the next view.

On a project's screen the views are built after the first paint (``build_view``): the
worksheet at once, the working, plan and chart (and their modules) when their tab is first
shown, so that the first screen (the bends and the caution) paints sooner.
"""

from __future__ import annotations

from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.widget import Widget
from textual.widgets import TabbedContent, TabPane

VIEWS = ("sheet", "working", "plan", "chart", "crossfall", "alignment")


def bend_views(pictures: bool = True, lazy: bool = True) -> ComposeResult:
    """The tabs (compose them inside a screen's ``compose``): ``#views`` holding the
    worksheet ``#worksheet`` and ``#working-view``, with ``pictures`` also ``#plan-view``,
    ``#road-chart`` and ``#rail-chart``. With ``lazy`` the tabs are left empty for
    ``build_view``."""
    titles = {
        "sheet": "Worksheet",
        "working": "Working",
        "plan": "Plan",
        "chart": "Chart",
        "alignment": "Alignment",
    }
    titles["crossfall"] = "Crossfall"  # the superelevation diagram
    with TabbedContent(id="views", initial="sheet"):
        for view in VIEWS if pictures else VIEWS[:2]:
            pane = TabPane(titles[view], id=view)
            pane.styles.layout = "vertical"  # a container: blank while empty, not its name
            with pane:
                if not lazy:
                    yield from view_widgets(view)


def view_widgets(view: str) -> list[Widget]:
    """The widgets of a view (sheet, working, plan or chart)."""
    if view == "sheet":
        from curvetui.app.widgets.worksheet import Worksheet

        return [Worksheet(id="worksheet")]
    if view == "working":
        from curvetui.app.widgets.working_view import WorkingView

        return [VerticalScroll(WorkingView(id="working-view"))]
    if view == "plan":
        from curvetui.app.widgets.plan_sketch import PlanSketch

        return [PlanSketch(id="plan-view")]
    if view == "chart":
        from curvetui.app.widgets.charts import RailChartView, RoadChartView

        return [RoadChartView(id="road-chart"), RailChartView(id="rail-chart")]
    if view == "crossfall":
        from curvetui.app.widgets.crossfall_view import CrossfallView

        return [CrossfallView(id="crossfall-view")]
    if view == "alignment":  # the project's whole alignment, to bearing
        from curvetui.app.widgets.alignment_view import AlignmentView

        return [AlignmentView(id="alignment-view")]
    return []


async def build_view(tabs: TabbedContent, view: str) -> None:
    """Build the view ``view`` in its pane, once (await it before drawing the view)."""
    pane = tabs.get_pane(view)
    if not getattr(pane, "built", False) and not pane.children:
        pane.built = True  # before the await: a second call meanwhile builds nothing
        await pane.mount_all(view_widgets(view))


def next_view(tabs: TabbedContent) -> None:
    """Show the view after the one shown (after the last: the worksheet)."""
    names = [pane.id for pane in tabs.query(TabPane)]
    tabs.active = names[(names.index(tabs.active) + 1) % len(names)]
