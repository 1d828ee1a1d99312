"""The terminal app: a project's bends on the left, the chosen bend's worksheet on the right.

`build_app(path)` is the one way to make the app, shared by the command line and the tests.
"""

from __future__ import annotations

import time
from collections.abc import Iterable
from pathlib import Path

from rich.markup import escape
from rich.text import Text
from textual import on
from textual.app import App, ComposeResult, SystemCommand
from textual.binding import Binding
from textual.containers import Horizontal, ScrollableContainer, Vertical, VerticalScroll
from textual.screen import Screen
from textual.widgets import DataTable, Footer, Input, Select, Static, TabbedContent, TabPane

from curvetui import CAUTION
from curvetui.app.dialogs.confirm import Confirm
from curvetui.app.dialogs.details import DetailsDialog
from curvetui.app.session import Session
from curvetui.app.widgets.bend_list import BendList
from curvetui.app.widgets.charts import RailChartView, RoadChartView
from curvetui.app.widgets.plan_sketch import PlanSketch
from curvetui.app.widgets.working_view import WorkingView
from curvetui.app.widgets.worksheet import ALL_FIELDS, Worksheet
from curvetui.core.units import unit_system
from curvetui.inputs import InputError
from curvetui.project.files import ProjectError
from curvetui.project.model import Bend
from curvetui.stations import format_station, parse_station

VIEWS = ("sheet", "working", "plan", "chart")


class CurveApp(App):
    """Work through an alignment bend by bend."""

    CSS_PATH = "app.tcss"
    TITLE = "curvetui"
    HORIZONTAL_BREAKPOINTS = [(0, "-narrow"), (110, "-wide")]
    BINDINGS = [
        Binding("ctrl+s", "save", "Save", priority=True),
        Binding("f2", "details", "Details"),
        Binding("f3", "add_bend", "New bend"),
        Binding("f4", "duplicate_bend", "Copy bend"),
        Binding("f8", "delete_bend", "Delete"),
        Binding("ctrl+up", "move_bend(-1)", "Move up", show=False),
        Binding("ctrl+down", "move_bend(1)", "Move down", show=False),
        Binding("f5", "print_sheet", "Print"),
        Binding("f6", "toggle_theme", "Light/dark"),
        Binding("f9", "next_view", "Next view"),
        Binding("escape", "focus_list", "Bend list", show=False),
        Binding("ctrl+q", "request_quit", "Quit", priority=True),
    ]

    def __init__(self, session: Session):
        super().__init__()
        self.session = session
        self.current: Bend | None = session.project.bends[0] if session.project.bends else None
        self.last_recompute_ms = 0.0

    # -- layout ---------------------------------------------------------------------------
    def compose(self) -> ComposeResult:
        yield Static("", id="topbar")
        with Horizontal(id="main"):
            with Vertical(id="left"):
                yield Static("[b]Bends[/] (F3 new, F4 copy, F8 delete)", id="left-title")
                yield BendList(id="bends")
            with TabbedContent(id="views", initial="sheet"):
                with TabPane("Worksheet", id="sheet"):
                    yield Worksheet(id="worksheet")
                with TabPane("Working", id="working"):
                    with VerticalScroll():
                        yield WorkingView(id="working-view")
                with TabPane("Plan", id="plan"):
                    yield PlanSketch(id="plan-view")
                with TabPane("Chart", id="chart"):
                    yield RoadChartView(id="road-chart")
                    yield RailChartView(id="rail-chart")
        yield Static(Text(CAUTION, style="bold"), id="caution")
        yield Footer()

    def on_mount(self) -> None:
        self.open_session(self.session)

    def open_session(self, session: Session) -> None:
        """Show ``session`` from its start: the first bend on the worksheet, the list
        focused, every view scrolled to its top."""
        self.session = session
        self.current = session.project.bends[0] if session.project.bends else None
        self.last_recompute_ms = 0.0
        self.query_one("#views", TabbedContent).active = "sheet"
        self.query_one("#kind", Select).expanded = False
        for scroll in self.query(ScrollableContainer):
            scroll.scroll_home(animate=False, immediate=True)
        self.refresh_all()
        bends = self.query_one(BendList)
        bends.scroll_home(animate=False, immediate=True)
        bends.focus()
        # paint first, then run the engine (its first run imports scipy)
        self.call_after_refresh(self.first_compute)

    def first_compute(self) -> None:
        if not any(self.session.state(b).record for b in self.session.project.bends):
            self.session.compute_all()
        self.refresh_all()
        for note in self.session.notes:
            self.notify(note, severity="warning" if "differ" in note else "information", timeout=8)
        self.query_one(BendList).focus()

    # -- refreshing -------------------------------------------------------------------------
    @property
    def units(self):
        return unit_system(self.session.project.details.units)

    def refresh_topbar(self) -> None:
        d = self.session.project.details
        try:
            ctx = self.session.context
            tables = f"road table {ctx.table.name} | rail limits {ctx.limits.name}"
        except InputError as exc:
            tables = f"TABLE PROBLEM: {exc}"
        mark = " | [b reverse] unsaved [/]" if self.session.dirty else ""
        name = self.session.path.name if self.session.path else "(no file)"
        self._set_topbar(
            f"[b]{escape(d.name)}[/] {escape(d.job_number)} | {escape(name)} | {d.units} | "
            f"{escape(tables)}{mark}"
        )

    def _set_topbar(self, text: str) -> None:
        if text != getattr(self, "_topbar_text", None):
            self._topbar_text = text
            self.query_one("#topbar", Static).update(text)

    def refresh_all(self) -> None:
        self.query_one(BendList).refill(self.session, self._index())
        self.refresh_topbar()
        self.fill_form()
        self.refresh_results()

    def _index(self) -> int:
        if self.current is None or self.current not in self.session.project.bends:
            return 0
        return self.session.project.bends.index(self.current)

    def fill_form(self) -> None:
        sheet = self.query_one(Worksheet)
        bend = self.current
        sheet.display = bend is not None
        if bend is None:
            return
        with self.prevent(Input.Changed, Select.Changed):
            sheet.query_one("#kind", Select).value = bend.kind
            sheet.show_fields(bend.kind, self.units)
            sheet.query_one("#in-bend_id", Input).value = bend.id
            sheet.query_one("#in-station", Input).value = format_station(
                bend.station, self.units.name
            )
            sheet.query_one("#in-notes", Input).value = bend.notes
            for key in ALL_FIELDS:
                value = bend.inputs.get(key)
                text = (
                    ""
                    if value is None
                    else (f"{value:g}" if isinstance(value, int | float) else str(value))
                )
                box = sheet.query_one(f"#in-{key}", Input)
                box.value = text
                box.remove_class("-invalid")

    def refresh_results(self) -> None:
        bend = self.current
        sheet = self.query_one(Worksheet)
        working = self.query_one("#working-view", WorkingView)
        if bend is None:
            working.show(None)
            self.query_one(PlanSketch).show(None, "No bend: F3 adds one.")
            return
        st = self.session.state(bend)
        for key in ALL_FIELDS:
            box = sheet.query_one(f"#in-{key}", Input)
            box.set_class(st.error_field == key, "-invalid")
        sheet.show_results(st.record, st.error, self.units, stale=st.error is not None)
        if self.query_one("#views", TabbedContent).active == "working":
            working.show(self._working_steps(bend, st.record))
        self.refresh_pictures(bend, st.record)

    def _working_steps(self, bend: Bend, record: dict | None):
        from curvetui.working import rail_working, road_working

        if record is None:
            return None
        try:
            ctx = self.session.context
        except InputError:
            return None
        if bend.kind == "road":
            return road_working(record, ctx.table, self.units)
        return rail_working(record, ctx.limits, self.units)

    def refresh_pictures(self, bend: Bend, record: dict | None) -> None:
        """Plan sketch and chart of the current bend, drawn from its valid inputs."""
        from curvetui import pictures
        from curvetui.core.spiral import GeometryError

        if self.query_one("#views", TabbedContent).active not in ("plan", "chart"):
            return  # drawn when the view is shown: typing stays quick
        plan = self.query_one(PlanSketch)
        road, rail = self.query_one(RoadChartView), self.query_one(RailChartView)
        road.display, rail.display = bend.kind == "road", bend.kind == "rail"
        if record is None:
            plan.show(None, "no valid inputs yet")
            return
        units = self.units
        failed = record["status"] == "fail"
        radius = units.length_to_si(record["radius"])
        try:
            shape = pictures.plan_for_inputs(bend.inputs, units, radius, name=lambda k: k)
            plan.show(
                shape,
                "" if shape else "give a deflection to see the plan",
                stations=pictures.station_texts(shape, units) if shape else None,
                units=units,
            )
        except (InputError, GeometryError) as exc:
            plan.show(None, str(exc))
        try:
            ctx = self.session.context
            if bend.kind == "road":
                road.show(
                    pictures.road_chart_for_inputs(bend.inputs, units, ctx.table),
                    units=units,
                    bend_failed=failed,
                )
            else:
                rail.show(
                    pictures.rail_chart_for_inputs(bend.inputs, units, ctx.limits),
                    units=units,
                    bend_failed=failed,
                )
        except InputError as exc:
            (road if bend.kind == "road" else rail).show(None, units=units, message=str(exc))

    @on(TabbedContent.TabActivated, "#views")
    def view_changed(self, event: TabbedContent.TabActivated) -> None:
        if self.current is not None:
            record = self.session.state(self.current).record
            if event.pane.id == "working":
                self.query_one("#working-view", WorkingView).show(
                    self._working_steps(self.current, record)
                )
            self.refresh_pictures(self.current, record)

    def refresh_bend_row(self) -> None:
        self.query_one(BendList).update_bend(self.session, self._index())
        self.refresh_topbar()

    # -- events ------------------------------------------------------------------------------
    @on(DataTable.RowHighlighted, "#bends")
    def bend_highlighted(self, event: DataTable.RowHighlighted) -> None:
        bends = self.session.project.bends
        if 0 <= event.cursor_row < len(bends) and bends[event.cursor_row] is not self.current:
            self.current = bends[event.cursor_row]
            self.fill_form()
            self.refresh_results()

    @on(DataTable.RowSelected, "#bends")
    def bend_selected(self, event: DataTable.RowSelected) -> None:
        self.query_one("#views", TabbedContent).active = "sheet"
        self.query_one("#in-speed", Input).focus()

    @on(Input.Changed)
    def input_changed(self, event: Input.Changed) -> None:
        if self.current is None or not event.input.id:
            return
        key = event.input.id.removeprefix("in-")
        bend = self.current
        if event.value == self._model_text(bend, key):
            return  # the echo of fill_form setting the box, not an edit
        started = time.perf_counter()
        if key in ALL_FIELDS:
            self.session.set_input(bend, key, event.value)
        elif key == "bend_id":
            self._rename(bend, event.value.strip())
        elif key == "station":
            try:
                bend.station = parse_station(event.value or "0", self.units.name)
                self.session.dirty = True
            except ValueError:
                self.query_one("#field-error", Static).update(
                    "station: must be a station such as 2+710.5 or a number"
                )
                return
        elif key == "notes":
            bend.notes = event.value
            self.session.dirty = True
        else:
            return
        self.refresh_results()
        self.refresh_bend_row()
        self.last_recompute_ms = 1000 * (time.perf_counter() - started)

    def _model_text(self, bend: Bend, key: str) -> str:
        """The text the form shows for a field of the model."""
        if key == "bend_id":
            return bend.id
        if key == "station":
            return format_station(bend.station, self.units.name)
        if key == "notes":
            return bend.notes
        value = bend.inputs.get(key)
        if value is None:
            return ""
        return f"{value:g}" if isinstance(value, int | float) else str(value)

    def _rename(self, bend: Bend, new_id: str) -> None:
        taken = {b.id for b in self.session.project.bends if b is not bend}
        if not new_id or new_id in taken or len(new_id) > 40:
            self.query_one("#field-error", Static).update(
                "bend id: must be 1 to 40 characters and not used by another bend"
            )
            return
        bend.id = new_id
        self.session.dirty = True

    @on(Select.Changed, "#kind")
    def kind_changed(self, event: Select.Changed) -> None:
        if self.current is None or event.value == self.current.kind:
            return
        bend = self.current
        if event.value == "rail" and "cant" not in bend.inputs:
            bend.inputs["cant"] = 0.0
        self.session.set_kind(bend, str(event.value))
        self.fill_form()
        self.refresh_results()
        self.refresh_bend_row()

    # -- actions -----------------------------------------------------------------------------
    def action_focus_list(self) -> None:
        self.query_one(BendList).focus()

    def action_next_view(self) -> None:
        tabs = self.query_one("#views", TabbedContent)
        tabs.active = VIEWS[(VIEWS.index(tabs.active) + 1) % len(VIEWS)]

    def action_toggle_theme(self) -> None:
        self.theme = "textual-light" if self.theme == "textual-dark" else "textual-dark"

    def action_add_bend(self) -> None:
        self.current = self.session.add_bend("road", after=self.current)
        self.refresh_all()
        self.notify(f"Added {self.current.id}: set its inputs on the worksheet.")

    def action_duplicate_bend(self) -> None:
        if self.current is None:
            return
        self.current = self.session.duplicate_bend(self.current)
        self.refresh_all()
        self.notify(f"Copied as {self.current.id}.")

    def action_delete_bend(self) -> None:
        bend = self.current
        if bend is None:
            return

        def done(answer: str | None) -> None:
            if answer != "delete":
                return
            i = self.session.project.bends.index(bend)
            self.session.delete_bend(bend)
            bends = self.session.project.bends
            self.current = bends[min(i, len(bends) - 1)] if bends else None
            self.refresh_all()
            self.notify(f"Deleted {bend.id} (not saved yet).")

        self.push_screen(
            Confirm(
                f"Delete bend {bend.id}? This cannot be undone except by closing without saving.",
                [("delete", "Delete"), ("cancel", "Keep it")],
            ),
            done,
        )

    def action_move_bend(self, step: int) -> None:
        if self.current is not None:
            self.session.move_bend(self.current, step)
            self.query_one(BendList).refill(self.session, self._index())
            self.refresh_topbar()

    def action_details(self) -> None:
        from curvetui.tables import rail_limit_sets, road_tables

        def done(result: dict | None) -> None:
            if not result:
                return
            for key, value in result.items():
                try:
                    self.session.set_detail(key, value)
                except InputError as exc:
                    self.notify(str(exc), severity="error")
            self.refresh_all()

        self.push_screen(
            DetailsDialog(
                self.session.project.details, sorted(road_tables()), sorted(rail_limit_sets())
            ),
            done,
        )

    def action_save(self) -> None:
        if isinstance(self.screen, DetailsDialog):
            self.screen.action_apply()  # ctrl+s in the dialog applies it, as it says
            return
        try:
            path = self.session.save()
        except ProjectError as exc:
            self.notify(
                "Not saved: fix the fields first: " + "; ".join(exc.problems[:3]),
                severity="error",
                timeout=10,
            )
            return
        except (InputError, OSError) as exc:
            self.notify(f"Not saved: {exc}", severity="error", timeout=10)
            return
        self.refresh_topbar()
        self.notify(f"Saved {path} (previous version kept as {path.name}.bak).")

    def action_print_sheet(self) -> None:
        """Write the worksheets of the project next to its file (see curvetui.sheet)."""
        try:
            from curvetui.sheet import write_sheets
        except ImportError:
            self.notify("Printing worksheets is not available in this build.", severity="error")
            return
        try:
            out = write_sheets(self.session, self.current)
        except (InputError, OSError) as exc:
            self.notify(f"Not printed: {exc}", severity="error", timeout=10)
            return
        self.notify(f"Worksheet written: {out}", timeout=10)

    def action_request_quit(self) -> None:
        if not self.session.dirty:
            self.exit()
            return

        def done(answer: str | None) -> None:
            if answer == "save":
                self.action_save()
                if not self.session.dirty:
                    self.exit()
            elif answer == "discard":
                self.exit()

        self.push_screen(
            Confirm(
                "There are unsaved changes.",
                [
                    ("save", "Save and quit"),
                    ("discard", "Quit without saving"),
                    ("cancel", "Go back"),
                ],
            ),
            done,
        )

    # -- command palette ---------------------------------------------------------------------
    def get_system_commands(self, screen: Screen) -> Iterable[SystemCommand]:
        yield from super().get_system_commands(screen)
        yield SystemCommand("Save project", "Save the project file (ctrl+s)", self.action_save)
        yield SystemCommand("New bend", "Add a road bend after this one (F3)", self.action_add_bend)
        yield SystemCommand("New rail curve", "Add a rail curve after this one", self._add_rail)
        yield SystemCommand(
            "Copy bend", "Duplicate the current bend (F4)", self.action_duplicate_bend
        )
        yield SystemCommand("Delete bend", "Delete the current bend (F8)", self.action_delete_bend)
        yield SystemCommand("Move bend up", "ctrl+up", lambda: self.action_move_bend(-1))
        yield SystemCommand("Move bend down", "ctrl+down", lambda: self.action_move_bend(1))
        yield SystemCommand("Project details", "Names, units, tables (F2)", self.action_details)
        yield SystemCommand(
            "Print worksheets", "Write the PDF worksheets (F5)", self.action_print_sheet
        )
        yield SystemCommand(
            "Show working",
            "Formulas and substituted values",
            lambda: setattr(self.query_one("#views", TabbedContent), "active", "working"),
        )
        yield SystemCommand(
            "Show plan",
            "Plan sketch of the bend",
            lambda: setattr(self.query_one("#views", TabbedContent), "active", "plan"),
        )
        yield SystemCommand(
            "Show chart",
            "Superelevation/friction or cant chart",
            lambda: setattr(self.query_one("#views", TabbedContent), "active", "chart"),
        )
        yield SystemCommand("Light or dark", "Switch the theme (F6)", self.action_toggle_theme)

    def _add_rail(self) -> None:
        self.current = self.session.add_bend("rail", after=self.current)
        self.refresh_all()


def build_app(path: str | Path) -> CurveApp:
    """The app on a project file (created in memory when absent)."""
    return CurveApp(Session.open(path, compute=False))
