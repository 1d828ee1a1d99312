"""A one-line field of the app's forms with an undo (ctrl+z) back through what was typed.

Textual's Input (8.2.8) has no undo, and by default selects its whole text when focused, so
one key typed after Tab replaces it. Here a text field (a note, a name) keeps its text and
puts the cursor at its end when focused; a number field still selects its value (a number typed then
replaces it, as a designer expects) and ctrl+z brings the old value back.
"""

from __future__ import annotations

from textual.binding import Binding
from textual.reactive import reactive
from textual.widgets import Input

from curvetui.app.plain import visible

UNDO_DEPTH = 200  # values kept per field
COMPACT = "-textual-compact"  # the class Input's `compact` sets


class FieldInput(Input):
    """An Input with ``load`` (the value from the model, undo history cleared) and ctrl+z."""

    BINDINGS = [Binding("ctrl+z", "undo", "Undo", show=False)]

    # Compact unless asked otherwise, its class given at construction: Input (8.2.8) sets
    # `compact` (a class toggled by a reactive whose default was False) after its own init,
    # and each change of that class applied the whole stylesheet to the new field at once,
    # before it was even mounted (where it is applied anyway)
    compact = reactive(True, toggle_class=COMPACT)

    def __init__(self, *args, select_on_focus: bool = False, compact: bool = True, **kwargs):
        self._history: list[str] = []
        self._undoing = True  # the value given here is not an edit
        if compact:
            kwargs["classes"] = " ".join(filter(None, (kwargs.get("classes"), COMPACT)))
        super().__init__(*args, select_on_focus=select_on_focus, compact=compact, **kwargs)
        self._undoing = False

    def load(self, text: str) -> None:
        """Show ``text`` from the model: not an edit, nothing to undo back to."""
        self._undoing = True
        try:
            self.value = text
        finally:
            self._undoing = False
        self._history.clear()
        self.cursor_position = 0  # its start in view (a long note shows how it begins)

    def on_focus(self) -> None:
        if not self.select_on_focus:
            self.cursor_position = len(self.value)  # typing adds to the text

    def validate_value(self, value: str) -> str:
        """What is typed or pasted is text: a control character (ESC, BEL) shows as U+FFFD
        and is never sent to the terminal."""
        return visible(value)

    def watch_value(self, old: str, new: str) -> None:
        if not self._undoing and old != new:
            self._history.append(old)
            del self._history[:-UNDO_DEPTH]

    def action_undo(self) -> None:
        """The value before the last change typed (nothing happens when there is none)."""
        if not self._history:
            self.app.bell()
            return
        self._undoing = True
        try:
            self.value = self._history.pop()
        finally:
            self._undoing = False
        self.cursor_position = len(self.value)
