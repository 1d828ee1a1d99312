"""Editing the project's details: names, job number, units and the tables in use."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Label, Select, Static

from curvetui import CAUTION
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


class DetailsDialog(ModalScreen[dict | None]):
    """Returns the edited details as a dict, or None when cancelled."""

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
            with VerticalScroll():
                for key in TEXT_FIELDS:
                    with Horizontal(classes="row"):
                        yield Label(key.replace("_", " "))
                        yield Input(str(getattr(d, key) or ""), id=f"d-{key}", compact=True)
                yield Label("units")
                yield Select(
                    [("metric (km/h, m, mm)", "metric"), ("US customary (mph, ft, in)", "us")],
                    value=d.units,
                    allow_blank=False,
                    id="d-units",
                )
                yield Label("road design table")
                yield Select(
                    [(n, n) for n in self.road_tables],
                    value=d.road_table or Select.NULL,
                    id="d-road_table",
                    prompt="default for the units",
                )
                yield Label("rail limits")
                yield Select(
                    [(n, n) for n in self.rail_limits],
                    value=d.rail_limits or Select.NULL,
                    id="d-rail_limits",
                    prompt="default for the units",
                )
            with Horizontal(id="buttons"):
                yield Button("Apply", id="apply", variant="primary")
                yield Button("Cancel", id="cancel")
            yield Static(CAUTION, classes="dialog-caution")

    def action_apply(self) -> None:
        out: dict = {k: self.query_one(f"#d-{k}", Input).value for k in TEXT_FIELDS}
        for k in ("units", "road_table", "rail_limits"):
            v = self.query_one(f"#d-{k}", Select).value
            out[k] = None if v is Select.NULL else v
        self.dismiss(out)

    def on_button_pressed(self, event: Button.Pressed) -> None:
        if event.button.id == "apply":
            self.action_apply()
        else:
            self.dismiss(None)
