"""Editing the project's details: names, job number, units and the tables in use.

``edit_details`` is F2: the dialog, then, when the units were changed on a project with
bends, a question (the safe answer first) before every bend's values are converted and
the tables switched to ones made for the new units (curvetui.app.units_change)."""

from __future__ import annotations

from dataclasses import replace

from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Label, Select, Static

from curvetui import CAUTION
from curvetui.app.dialogs.confirm import Confirm
from curvetui.app.plain import plain_text, visible
from curvetui.app.units_change import plan_change
from curvetui.app.widgets.field_input import FieldInput
from curvetui.storage.project.model import Details

TEXT_FIELDS = (
    "name",
    "client",
    "job_number",
    "designer",
    "checker",
    "date",
    "revision",
    "drawing",
    "notes",
)


def details_problems(values: dict) -> dict[str, str]:
    """Field -> why the project file cannot store it (its schema's details part), in the
    dialog's words: 'date: the project file takes a date written YYYY-MM-DD, got ...'."""
    from jsonschema import Draft202012Validator

    from curvetui.storage.project.files import _describe, project_schema

    schema = project_schema()["properties"]["details"]
    out: dict[str, str] = {}
    for error in Draft202012Validator(schema).iter_errors(values):
        key = str(error.absolute_path[0]) if error.absolute_path else ""
        why = _describe(error).split(": ", 1)[-1]
        why = why.replace("text length must be", "takes").replace("must be", "takes", 1)
        out.setdefault(key, f"{key.replace('_', ' ')}: the project file {why}")
    return out


class DetailsDialog(ModalScreen[dict | None]):
    """Returns the edited details as a dict, or None when cancelled. A field the project
    file cannot store is marked as it is typed, with its name and the allowed form, and
    Apply waits until it is put right."""

    AUTO_FOCUS = "#d-units"
    BINDINGS = [
        Binding("escape", "dismiss(None)", "Cancel"),
        Binding("ctrl+s", "apply", "Apply", priority=True),
    ]
    DEFAULT_CSS = """
    DetailsDialog { align: center middle; }
    DetailsDialog > Vertical { width: 76; height: 90%; border: thick $accent; padding: 0 1;
                               background: $surface; }
    DetailsDialog .row { height: 1; margin: 0 0 1 0; }
    DetailsDialog .row Label { width: 14; }
    DetailsDialog .row Input { width: 1fr; border: none; height: 1; }
    DetailsDialog .row Input.-invalid { background: $error 30%; }
    DetailsDialog .row.-invalid Label { color: $error; text-style: bold; }
    DetailsDialog #d-problems { color: $error; height: auto; }
    DetailsDialog Select { width: 1fr; }
    DetailsDialog #buttons { height: 3; }
    """

    def __init__(self, details: Details, road_tables: list[str], rail_limits: list[str]):
        super().__init__()
        self.details = details
        self.road_tables = road_tables
        self.rail_limits = rail_limits

    def compose(self) -> ComposeResult:
        d = self.details
        with Vertical():
            yield Static("[b]Project details[/]  (ctrl+s apply, escape cancel)")
            with VerticalScroll(can_focus=False):  # Tab goes from field to field
                # first, one line each: a list opened shows whole, over the fields below it
                with Horizontal(classes="row"):
                    yield Label("units")
                    yield Select(
                        [("metric (km/h, m, mm)", "metric"), ("US customary (mph, ft, in)", "us")],
                        value=d.units,
                        allow_blank=False,
                        id="d-units",
                        compact=True,
                    )
                with Horizontal(classes="row"):
                    yield Label("road table")
                    yield Select(
                        [(plain_text(n), n) for n in self.road_tables],
                        value=d.road_table or Select.NULL,
                        id="d-road_table",
                        prompt="default for the units",
                        compact=True,
                    )
                with Horizontal(classes="row"):
                    yield Label("rail limits")
                    yield Select(
                        [(plain_text(n), n) for n in self.rail_limits],
                        value=d.rail_limits or Select.NULL,
                        id="d-rail_limits",
                        prompt="default for the units",
                        compact=True,
                    )
                for key in TEXT_FIELDS:
                    with Horizontal(classes="row", id=f"d-row-{key}"):
                        yield Label(key.replace("_", " "))
                        yield FieldInput(self._shown(key), id=f"d-{key}", compact=True)
            yield Static("", id="d-problems")
            with Horizontal(id="buttons"):
                yield Button("Apply", id="apply", variant="primary")
                yield Button("Cancel", id="cancel")
            yield Static(CAUTION, classes="dialog-caution")

    def _shown(self, key: str) -> str:
        return visible(getattr(self.details, key) or "")  # control codes shown, not sent

    def values(self) -> dict:
        """The details as the dialog has them; a field left as shown keeps its stored text."""
        out: dict = {}
        for k in TEXT_FIELDS:
            typed = self.query_one(f"#d-{k}", FieldInput).value
            out[k] = getattr(self.details, k) if typed == self._shown(k) else typed
        for k in ("units", "road_table", "rail_limits"):
            v = self.query_one(f"#d-{k}", Select).value
            out[k] = None if v is Select.NULL else v
        return out

    def mark_problems(self) -> dict[str, str]:
        """Mark each field the file cannot store; returns them (field -> why)."""
        problems = details_problems(self.values())
        for k in TEXT_FIELDS:
            self.query_one(f"#d-{k}", FieldInput).set_class(k in problems, "-invalid")
            self.query_one(f"#d-row-{k}").set_class(k in problems, "-invalid")
        text = "\n".join(problems.values())
        self.query_one("#d-problems", Static).update(plain_text(text, "bold", one_line=False))
        return problems

    @on(Input.Changed)
    def typed(self, event: Input.Changed) -> None:
        self.mark_problems()

    def action_apply(self) -> None:
        if self.mark_problems():
            self.app.bell()  # the marked fields say why
            return
        self.dismiss(self.values())

    def on_button_pressed(self, event: Button.Pressed) -> None:
        if event.button.id == "apply":
            self.action_apply()
        else:
            self.dismiss(None)


def edit_details(app) -> None:
    """F2 on ``app`` (the project app): the dialog; a change of units asks first."""
    from curvetui.storage.tables import rail_limit_sets, road_tables

    session = app.session
    roads, rails = road_tables(), rail_limit_sets()

    def report(problems: list[str]) -> None:
        for problem in problems:
            app.notify(problem, severity="error")

    def done(result: dict | None) -> None:
        if not result:
            return
        d = session.project.details
        if result["units"] == d.units or result["units"] not in ("metric", "us"):
            report(session.set_details(result))
            return
        change = plan_change(
            session.project,
            result["units"],
            {n: t.units for n, t in roads.items()},
            {n: t.units for n, t in rails.items()},
        )
        # a table picked in the dialog is taken as picked
        picked = {k: result[k] for k in ("road_table", "rail_limits") if result[k] != getattr(d, k)}
        change = replace(change, **picked)
        rest = {k: v for k, v in result.items() if k not in ("units", "road_table", "rail_limits")}

        def answer(choice: str | None) -> None:
            if choice == "convert":
                session.change_units(change)
                report(session.set_details(rest))
            else:
                app.notify("The units were not changed; nothing else was either.")

        app.push_screen(
            Confirm(change.question(), [("cancel", "Keep the units"), ("convert", "Convert")]),
            answer,
        )

    app.push_screen(DetailsDialog(session.project.details, sorted(roads), sorted(rails)), done)
