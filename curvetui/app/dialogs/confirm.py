"""A question asked before something that cannot be undone. The safe answer (keep, go
back) is the one focused, so Enter or a stray key never deletes or discards."""

from __future__ import annotations

from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Static

from curvetui import CAUTION
from curvetui.app.plain import plain_text


class Confirm(ModalScreen[str]):
    """Ask a question; dismisses with the id of the button chosen (escape: 'cancel').
    ``safe`` is the id of the button focused at first (default 'cancel')."""

    BINDINGS = [Binding("escape", "dismiss('cancel')", "Cancel")]
    DEFAULT_CSS = """
    Confirm { align: center middle; }
    Confirm > Vertical { width: 64; height: auto; border: thick $warning; padding: 1 2;
                         background: $surface; }
    Confirm Horizontal { height: auto; margin: 1 0 0 0; }
    Confirm Button { margin: 0 1 0 0; }
    """

    def __init__(self, question: str, choices: list[tuple[str, str]], safe: str = "cancel"):
        super().__init__()
        self.question = question
        self.choices = choices  # (id, label)
        self.safe = safe if safe in {key for key, _ in choices} else choices[-1][0]
        self.AUTO_FOCUS = f"#{self.safe}"

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(plain_text(self.question, one_line=False))  # ids in it are text
            with Horizontal():
                for key, label in self.choices:
                    yield Button(
                        label, id=key, variant="primary" if key == self.safe else "default"
                    )
            yield Static(CAUTION, classes="dialog-caution")

    def on_button_pressed(self, event: Button.Pressed) -> None:
        self.dismiss(event.button.id or "cancel")
