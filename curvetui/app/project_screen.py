"""The project's screen: its bends on the left, the bend on screen in its views on the right.

The screen watches the session: after every change each view redraws itself from the
session (``session_changed``), the views of hidden tabs when they are shown (typing stays
quick). What is typed or chosen here goes to the session's methods, never to the model.
"""

from __future__ import annotations

import time

from textual import on
from textual.app import ComposeResult
from textual.containers import Horizontal, ScrollableContainer, Vertical
from textual.screen import Screen
from textual.widgets import DataTable, Footer, Input, Select, Static, TabbedContent

from curvetui.app import collector
from curvetui.app.session import Session
from curvetui.app.widgets.bend_list import BendList
from curvetui.app.widgets.bend_views import bend_views, build_view, next_view
from curvetui.app.widgets.frame import ProjectBar, caution_line

# the views drawn from the session when their tab is shown (built on first showing)
VIEW_WIDGETS = {
    "working": ("#working-view",),
    "plan": ("#plan-view",),
    "chart": ("#road-chart", "#rail-chart"),
    "crossfall": ("#crossfall-view",),
    "alignment": ("#alignment-view",),
}


class ProjectScreen(Screen):
    """Work through an alignment bend by bend."""

    def __init__(self, session: Session):
        super().__init__()
        self.session = session
        self._stop_watching = None
        self._sheet_built = False
        self._focus_when_built: str | None = None  # a field asked for before the worksheet

    def compose(self) -> ComposeResult:
        yield ProjectBar("", id="topbar")
        with Horizontal(id="main"):
            with Vertical(id="left"):
                yield Static("[b]Bends[/] (F3 new, F4 copy, F8 delete)", id="left-title")
                yield BendList(id="bends")
            yield from bend_views(pictures=True)
        yield caution_line()
        # the keys' footer comes with the worksheet (build_sheet): Textual's Footer shows no
        # keys in a first frame anyway, and recomposes at every change of focus until then
        space = Static("", id="footer-space")
        space.styles.dock = "bottom"
        space.styles.height = 1
        yield space

    def on_mount(self) -> None:
        self.show(self.session)

    def show(self, session: Session) -> None:
        """Show ``session`` from its start: the first bend on the worksheet, the list
        focused, every view scrolled to its top; its changes redrawn from now on.

        On the first showing the bends and the caution are painted first; the worksheet is
        built once that frame is on screen (the app's Ready event calls ``build_sheet``), with
        the bend on screen evaluated, and the other bends after the next paint
        (``first_compute``)."""
        if self._stop_watching is not None:
            self._stop_watching()
        self.session = session
        self._stop_watching = session.watch(self.session_changed)
        self.query_one("#views", TabbedContent).active = "sheet"
        for kind in self.query("#kind").results(Select):
            kind.expanded = False
        for scroll in self.query(ScrollableContainer):
            scroll.scroll_home(animate=False, immediate=True)
        bends = self.query_one(BendList)
        bends.scroll_home(animate=False, immediate=True)
        bends.focus()
        if not self._sheet_built:
            self.session_changed(session)
            self.call_after_refresh(self.build_sheet)  # unless the Ready event came first
            return
        if not session.compute_current():  # when it evaluates, the views are redrawn
            self.session_changed(session)
        self.call_after_refresh(self.first_compute)

    async def build_sheet(self) -> None:
        """Build the worksheet (after the first paint) and show the bend on screen in it,
        evaluated; the other bends are evaluated after the next paint. Once only."""
        if self._sheet_built:
            return
        self._sheet_built = True
        with self.app.batch_update():  # one layout and paint when all is in, not one per await
            await build_view(self.query_one("#views", TabbedContent), "sheet")
            if not self.session.compute_current():
                self.session_changed(self.session)
            await self.query_one("#footer-space").remove()
            await self.mount(Footer())
        self.refresh_bindings()  # the footer shows its keys from the next paint
        if self._focus_when_built:
            self.query_one(self._focus_when_built).focus()
            self._focus_when_built = None
        self.call_after_refresh(self.first_compute)

    def on_unmount(self) -> None:
        if self._stop_watching is not None:
            self._stop_watching()

    def first_compute(self) -> None:
        """Evaluate the bends not evaluated yet, and show the notes of opening the file."""
        session = self.session
        if any(session.status(b) == "pending" for b in session.project.bends):
            session.compute_all()
        for note in session.notes:
            self.notify(note, severity="warning" if "differ" in note else "information", timeout=8)
        if self.focused is None:
            self.query_one(BendList).focus()
        self.call_after_refresh(collector.resume)  # start-up is over (curvetui.app.collector)

    # -- the views ------------------------------------------------------------------------
    def session_changed(self, session: Session) -> None:
        """The one refresh after a change: each view shown redraws itself."""
        self.query_one(ProjectBar).show_session(session, with_tables=self._sheet_built)
        self.query_one(BendList).show_session(session)
        for sheet in self.query("#worksheet"):  # once it is built
            sheet.show_session(session)
        self.show_view_content()

    def show_view_content(self) -> None:
        """Draw the working, plan or chart when its tab is the one shown (and built)."""
        active = self.query_one("#views", TabbedContent).active
        for selector in VIEW_WIDGETS.get(active, ()):
            for view in self.query(selector):
                view.show_session(self.session)

    def show_view(self, view: str) -> None:
        self.query_one("#views", TabbedContent).active = view

    def next_view(self) -> None:
        next_view(self.query_one("#views", TabbedContent))

    def take_typed(self) -> None:
        """What the focused field shows, taken now: its change may still be on its way
        (ctrl+s, ctrl+q and F5 act at once, before the queued changes are handled)."""
        box, bend = self.focused, self.session.current
        if not isinstance(box, Input) or not (box.id or "").startswith("in-"):
            return
        if bend is None or bend is not self._sheet_bend():
            return
        key = box.id.removeprefix("in-")
        if box.value != self.session.field_text(bend, key):
            self.session.edit_field(bend, key, box.value)

    def focus_list(self) -> None:
        self.set_focus(self.query_one(BendList))  # now: the next key typed goes to the list

    @on(TabbedContent.TabActivated, "#views")
    async def view_changed(self, event: TabbedContent.TabActivated) -> None:
        tabs = self.query_one("#views", TabbedContent)
        if tabs.active != "sheet":  # the worksheet is built after the first frame
            await build_view(tabs, tabs.active)
        self.show_view_content()

    # -- what is typed and chosen ------------------------------------------------------------
    @on(DataTable.RowHighlighted, "#bends")
    def bend_highlighted(self, event: DataTable.RowHighlighted) -> None:
        bends = self.session.project.bends
        if 0 <= event.cursor_row < len(bends):
            self.session.select(bends[event.cursor_row])

    @on(DataTable.RowSelected, "#bends")
    def bend_selected(self, event: DataTable.RowSelected) -> None:
        self.action_open_bend()

    def action_open_bend(self) -> None:
        """The bend under the list's cursor on the worksheet, its speed focused."""
        bends = self.session.project.bends
        row = self.query_one(BendList).cursor_row
        if 0 <= row < len(bends):
            self.session.select(bends[row])
        self.show_view("sheet")
        if self.query("#in-speed"):
            self.set_focus(self.query_one("#in-speed", Input))  # now, not after the queue
        else:  # Enter before the worksheet is built: the field is focused once it is
            self._focus_when_built = "#in-speed"

    def _sheet_bend(self):
        """The bend the worksheet shows; None before the worksheet is built."""
        for sheet in self.query("#worksheet"):
            return sheet.bend
        return None

    @on(Input.Changed)
    def input_changed(self, event: Input.Changed) -> None:
        bend = self.session.current
        if bend is None or not event.input.id or bend is not self._sheet_bend():
            return
        if event.value != event.input.value:
            return  # a later change of the box is on its way: only the last one counts
        key = event.input.id.removeprefix("in-")
        if event.value == self.session.field_text(bend, key):
            return  # the echo of the worksheet filling the box, not an edit
        started = time.perf_counter()
        self.session.edit_field(bend, key, event.value)
        self.app.last_recompute_ms = 1000 * (time.perf_counter() - started)

    @on(Select.Changed, "#kind")
    def kind_changed(self, event: Select.Changed) -> None:
        """The kind chosen. A change the box no longer shows is not the user's: the box
        announces its first value when mounted, after the worksheet has put the bend's kind
        in it (a project whose first bend is rail was opened as road)."""
        bend = self.session.current
        if event.value != event.select.value or bend is not self._sheet_bend():
            return
        if bend is not None and event.value != bend.kind:
            self.session.switch_kind(bend, str(event.value))
