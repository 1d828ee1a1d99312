"""The terminal app on a project file: its bindings, actions and commands. What is on screen
is the project screen (curvetui.app.project_screen), drawn from the session.

`build_app(path)` is the one way to make the app, shared by the command line and the tests.
"""

from __future__ import annotations

from collections.abc import Iterable
from pathlib import Path

from textual.app import SystemCommand
from textual.binding import Binding
from textual.screen import Screen

from curvetui.app.crash import StopsCleanly
from curvetui.app.dialogs.confirm import Confirm
from curvetui.app.dialogs.details import DetailsDialog, edit_details
from curvetui.app.key_order import KeyOrder
from curvetui.app.plain import visible
from curvetui.app.project_screen import ProjectScreen
from curvetui.app.session import Session
from curvetui.inputs import InputError
from curvetui.storage.project.files import ProjectError
from curvetui.storage.project.model import Bend


class CurveApp(StopsCleanly, KeyOrder):
    """Work through an alignment bend by bend. An unexpected error ends it with a recovery
    copy of the unsaved changes (curvetui.app.crash)."""

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
        Binding("f7", "propose", "Propose"),
        Binding("ctrl+r", "undo_proposal", "Undo proposal", show=False),
        Binding("shift+f7", "propose_all", "Propose every bend", show=False),
        Binding("f9", "next_view", "Next view"),
        Binding("escape", "focus_list", "Bend list", show=False),
        Binding("f10", "realign", "Realign (rail)", show=False),
        Binding("ctrl+q", "request_quit", "Quit", priority=True),
    ]

    def __init__(self, session: Session):
        super().__init__()
        self.session = session
        self.last_recompute_ms = 0.0  # the last edit's handling, engine and redraw (ms)
        self.project_screen = ProjectScreen(session)
        # the bends and what the last applied proposal (F7, or every bend's) replaced
        self.proposal_undo: list[tuple[Bend, dict]] | None = None

    def notify(self, message: str, *, title: str = "", markup: bool = False, **kwargs) -> None:
        """A note on screen; its text (ids, file names, values typed) is never markup."""
        super().notify(
            visible(message, one_line=False), title=visible(title), markup=markup, **kwargs
        )

    def get_default_screen(self) -> Screen:
        return self.project_screen

    def recovery_session(self) -> Session:
        return self.session

    @property
    def current(self) -> Bend | None:
        """The bend on screen."""
        return self.session.current

    def open_session(self, session: Session) -> None:
        """Show another session (a project opened anew) from its start."""
        self.session = session
        self.last_recompute_ms = 0.0
        self.proposal_undo = None
        self.project_screen.show(session)

    async def on_ready(self) -> None:
        """The first frame (the bends and the caution) is on screen: build the worksheet."""
        await self.project_screen.build_sheet()

    # -- actions -----------------------------------------------------------------------------
    def action_focus_list(self) -> None:
        self.project_screen.focus_list()

    def action_next_view(self) -> None:
        self.project_screen.next_view()

    def action_toggle_theme(self) -> None:
        self.theme = "textual-light" if self.theme == "textual-dark" else "textual-dark"

    def action_add_bend(self) -> None:
        bend = self.session.add_bend("road", after=self.current)
        self.notify(f"Added {bend.id}: set its inputs on the worksheet.")

    def _add_rail(self) -> None:
        self.session.add_bend("rail", after=self.current)

    def action_duplicate_bend(self) -> None:
        if self.current is not None:
            twin = self.session.duplicate_bend(self.current)
            self.notify(f"Copied as {twin.id}.")

    def action_delete_bend(self) -> None:
        bend = self.current
        if bend is None:
            return

        def done(answer: str | None) -> None:
            if answer == "delete":
                self.session.delete_bend(bend)
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

    def action_details(self) -> None:
        edit_details(self)

    def action_save(self) -> None:
        if isinstance(self.screen, DetailsDialog):
            self.screen.action_apply()  # ctrl+s in the dialog applies it, as it says
            return
        self.project_screen.take_typed()
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
        self.notify(f"Saved {path} (previous version kept as {path.name}.bak).")

    def action_print_sheet(self) -> None:
        """Write the worksheets of the project next to its file (see curvetui.reports.sheet);
        unsaved work is saved first, when the user says so, never printed as the saved one."""
        self.project_screen.take_typed()
        if self.session.dirty:

            def done(answer: str | None) -> None:
                if answer == "save":
                    self.action_save()
                    if not self.session.dirty:
                        self._print_sheet()

            self.push_screen(
                Confirm(
                    "There are unsaved changes: a worksheet printed now would show work that "
                    "is not in the saved file. Save first?",
                    [("cancel", "Go back"), ("save", "Save, then print")],
                ),
                done,
            )
            return
        self._print_sheet()

    def _print_sheet(self) -> None:
        try:
            from curvetui.reports.sheet import write_sheets
        except ImportError:
            self.notify("Printing worksheets is not available in this build.", severity="error")
            return
        try:
            out = write_sheets(self.session, self.current)
        except (InputError, OSError) as exc:
            self.notify(f"Not printed: {exc}", severity="error", timeout=10)
            return
        self.notify(f"Worksheet written: {out}", timeout=10)

    def action_propose(self) -> None:
        """F7: the proposal for the bend on screen; Apply sets its fields (ctrl+r puts back
        every field the apply changed, as one step)."""
        from curvetui.app.proposals import propose_for

        bend = self.current
        if bend is None:
            return
        self.project_screen.take_typed()
        try:
            units, proposal = propose_for(self.session, bend)
        except InputError as exc:
            self.notify(f"No proposal for {bend.id}: {exc}", severity="error", timeout=10)
            return

        def done(answer: str | None) -> None:
            if answer != "apply" or not any(b is bend for b in self.session.project.bends):
                return
            changes = proposal.changes()
            if not changes:
                self.notify(f"{bend.id} already has the proposed values.")
                return
            old = self.session.set_inputs(bend, changes)
            self.proposal_undo = [(bend, old)]
            names = ", ".join(k.replace("_", " ") for k in changes)
            self.notify(f"Proposal applied to {bend.id} ({names}); ctrl+r puts them back.")

        from curvetui.app.dialogs.proposal import ProposalDialog

        self.push_screen(ProposalDialog(bend.id, proposal, units), done)

    def action_undo_proposal(self) -> None:
        """ctrl+r: every field the last applied proposal changed (on one bend, or on every
        bend), back as it was, as one step."""
        undo, self.proposal_undo = self.proposal_undo, None
        bends = self.session.project.bends
        if not undo or not all(any(b is bend for b in bends) for bend, _ in undo):
            self.bell()
            self.notify("No applied proposal to put back.")
            return
        if len(undo) == 1:
            bend, old = undo[0]
            self.session.select(bend)
            self.session.set_inputs(bend, old)
            self.notify(f"{bend.id}: the fields the proposal changed are back as they were.")
            return
        self.session.set_many(undo)
        self.notify(f"{len(undo)} bends: the fields the proposals changed are back as they were.")

    def action_propose_all(self) -> None:
        """shift+F7: every bend's proposal in one list; Apply sets them all as one step
        (ctrl+r puts every bend back)."""
        from curvetui.app.proposals import propose_every

        self.project_screen.take_typed()
        if not self.session.project.bends:
            self.notify("No bends to propose for.")
            return
        try:
            units, items, report = propose_every(self.session)
        except InputError as exc:
            self.notify(f"No proposals: {exc}", severity="error", timeout=10)
            return

        def done(answer: str | None) -> None:
            bends = self.session.project.bends
            changes = [
                (i.bend, i.changes) for i in items if i.changes and any(b is i.bend for b in bends)
            ]
            if answer != "apply" or not changes:
                return
            self.proposal_undo = self.session.set_many(changes)
            self.notify(
                f"Proposals applied to {len(changes)} bends "
                f"({', '.join(b.id for b, _ in changes)}); ctrl+r puts them all back."
            )

        from curvetui.app.dialogs.propose_all import ProposeAllDialog

        self.push_screen(ProposeAllDialog(items, report, units), done)

    def action_realign(self) -> None:
        """F10: a rail bend realigned from a versine survey (curvetui.app.realign_flow)."""
        bend = self.current
        if bend is None or bend.kind != "rail":
            self.notify("Realignment is for a rail bend: select one first.", severity="warning")
            return
        from curvetui.app.dialogs.realign_survey import RealignSurveyDialog
        from curvetui.app.realign_screen import RealignScreen

        def done(sheet) -> None:
            if sheet is not None:
                self.push_screen(RealignScreen(sheet, f"of {bend.id}"))

        self.project_screen.take_typed()
        self.push_screen(RealignSurveyDialog(self.session, bend), done)

    def action_request_quit(self) -> None:
        self.project_screen.take_typed()
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
        show = self.project_screen.show_view
        yield SystemCommand(
            "Show working", "Formulas and substituted values", lambda: show("working")
        )
        yield SystemCommand("Show plan", "Plan sketch of the bend", lambda: show("plan"))
        yield SystemCommand(
            "Show chart", "Superelevation/friction or cant chart", lambda: show("chart")
        )
        yield SystemCommand(
            "Show crossfall",
            "Superelevation diagram: edge cross slopes and elevations",
            lambda: show("crossfall"),
        )
        yield SystemCommand("Light or dark", "Switch the theme (F6)", self.action_toggle_theme)
        yield SystemCommand(
            "Propose", "Radius, superelevation or cant for this bend (F7)", self.action_propose
        )
        yield SystemCommand(
            "Propose every bend",
            "Every bend's proposal in one list, applied as one step (shift+F7)",
            self.action_propose_all,
        )
        yield SystemCommand(
            "Realign from a versine survey",
            "A rail bend: slews, radius and cant from measured versines (F10)",
            self.action_realign,
        )
        yield SystemCommand(
            "Undo proposal",
            "Put back the fields the last proposal changed (ctrl+r)",
            self.action_undo_proposal,
        )


def build_app(path: str | Path) -> CurveApp:
    """The app on a project file (created in memory when absent)."""
    return CurveApp(Session.open(path, compute=False))
