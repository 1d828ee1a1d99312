"""A yes/no question asked before something that cannot be undone."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Static

from curvetui import CAUTION


class Confirm(ModalScreen[str]):
    """Ask a question; dismisses with the id of the button chosen (escape: 'cancel')."""

    BINDINGS = [Binding("escape", "dismiss('cancel')", "Cancel")]
    DEFAULT_CSS = """
    Confirm { align: center middle; }
    Confirm > Vertical { width: 64; height: auto; border: thick $warning; padding: 1 2;
                         background: $surface; }
    Confirm Horizontal { height: auto; margin: 1 0 0 0; }
    Confirm Button { margin: 0 1 0 0; }
    """

    def __init__(self, question: str, choices: list[tuple[str, str]]):
        super().__init__()
        self.question = question
        self.choices = choices  # (id, label)

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(self.question)
            with Horizontal():
                for i, (key, label) in enumerate(self.choices):
                    yield Button(label, id=key, variant="primary" if i == 0 else "default")
            yield Static(CAUTION, classes="dialog-caution")

    def on_button_pressed(self, event: Button.Pressed) -> None:
        self.dismiss(event.button.id or "cancel")
