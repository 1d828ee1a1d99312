"""Asks for a versine survey's CSV file and its chord, for realigning the rail bend on
screen. The realignment is computed here when OK is pressed; a problem (the file, a row,
the chord) is shown in the dialog, naming the field and its range, and the dialog stays
open. Dismisses with the RealignSheet, or None (escape, Cancel)."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Input, Label, Static

from curvetui import CAUTION
from curvetui.app.plain import plain_text
from curvetui.inputs import InputError


class RealignSurveyDialog(ModalScreen):
    """The survey's path and chord for ``bend`` of ``session``."""

    BINDINGS = [Binding("escape", "dismiss(None)", "Cancel")]
    AUTO_FOCUS = "#rs-path"
    DEFAULT_CSS = """
    RealignSurveyDialog { align: center middle; }
    RealignSurveyDialog > Vertical { width: 80; height: auto; border: thick $accent;
                                     padding: 0 1; background: $surface; }
    RealignSurveyDialog .row { height: 3; }
    RealignSurveyDialog .row Label { width: 16; padding: 1 0 0 0; }
    RealignSurveyDialog .row Input { width: 1fr; }
    RealignSurveyDialog #rs-problem { color: $error; height: auto; }
    RealignSurveyDialog Horizontal.buttons { height: auto; margin: 1 0 0 0; }
    RealignSurveyDialog Button { margin: 0 1 0 0; }
    """

    def __init__(self, session, bend):
        super().__init__()
        self.session = session
        self.bend = bend

    def compose(self) -> ComposeResult:
        units = self.session.units
        with Vertical():
            yield Static(
                plain_text(f"Realign {self.bend.id} from a versine survey", "bold"),
            )
            yield Static(
                plain_text(
                    f"CSV with a header station,versine: stations {units.length_label} half "
                    f"a chord apart, versines {units.cant_label} (+ on the curve). The file "
                    "is only read. The bend's line speeds and the project's rail limits check "
                    "the designed curve.",
                    one_line=False,
                )
            )
            with Horizontal(classes="row"):
                yield Label("Survey file")
                yield Input(id="rs-path", placeholder="path/to/survey.csv")
            with Horizontal(classes="row"):
                yield Label(f"Chord ({units.length_label})")
                yield Input(id="rs-chord", placeholder="e.g. 20")
            yield Static("", id="rs-problem")
            with Horizontal(classes="buttons"):
                yield Button("Realign", id="ok", variant="primary")
                yield Button("Cancel", id="cancel")
            yield Static(CAUTION, classes="dialog-caution", markup=False)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        if event.input.id == "rs-path":
            self.query_one("#rs-chord", Input).focus()
        else:
            self.action_ok()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        if event.button.id == "ok":
            self.action_ok()
        else:
            self.dismiss(None)

    def action_ok(self) -> None:
        from curvetui.app.realign_flow import realign_bend

        path = self.query_one("#rs-path", Input).value
        chord = self.query_one("#rs-chord", Input).value
        try:
            sheet = realign_bend(self.session, self.bend, path, chord)
        except (InputError, OSError) as exc:
            self.query_one("#rs-problem", Static).update(plain_text(str(exc), one_line=False))
            return
        self.dismiss(sheet)
