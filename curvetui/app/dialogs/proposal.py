"""The proposal for the bend on screen (F7): each proposed value beside the current one,
the reasons (rule and source), and the proposed bend's verdict as the check gives it.
Apply puts the values in the bend's fields; the app keeps what they replaced so that one
key (ctrl+r) puts them all back. Every text is shown as text, never as markup."""

from __future__ import annotations

from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Button, Static

from curvetui import CAUTION
from curvetui.app.plain import plain_text, visible
from curvetui.bend.fields import BY_KEY
from curvetui.bend.propose import Proposal
from curvetui.core.units import UnitSystem


def proposal_table(p: Proposal, units: UnitSystem) -> Table:
    """Input, proposed, current and unit, one row per proposed input (all plain text)."""
    grid = Table(box=None, pad_edge=False, show_edge=False)
    for name, justify in (("Input", "left"), ("Proposed", "right"), ("Now", "right"), ("", "left")):
        grid.add_column(name, justify=justify)
    for key, value in p.proposed.items():
        f = BY_KEY[key]
        now = p.current.get(key)
        grid.add_row(
            Text(f.label),
            Text("blank" if value is None else f"{value:g}"),
            Text("blank" if now is None or str(now).strip() == "" else visible(now)),
            Text(f.unit_label(units)),
        )
    return grid


def verdict_text(p: Proposal) -> Text:
    """'The proposed bend, checked: PASS' and its fails and warnings, as plain text."""
    from curvetui.bend.messages import message_line

    status = p.status.upper()
    out = Text(f"The proposed bend, checked: {status}", style="bold")
    for m in p.record.get("messages", []):
        if m.get("severity") in ("fail", "warning", "error"):
            out.append("\n  - " + visible(message_line(m), one_line=True))
    return out


class ProposalDialog(ModalScreen[str]):
    """Shows a proposal; dismisses with 'apply' or 'cancel' (escape; the button focused)."""

    BINDINGS = [Binding("escape", "dismiss('cancel')", "Cancel")]
    AUTO_FOCUS = "#cancel"
    DEFAULT_CSS = """
    ProposalDialog { align: center middle; }
    ProposalDialog > Vertical { width: 90%; max-width: 110; height: 90%; border: thick $accent;
                                padding: 0 1; background: $surface; }
    ProposalDialog VerticalScroll { height: 1fr; }
    ProposalDialog Horizontal { height: auto; margin: 1 0 0 0; }
    ProposalDialog Button { margin: 0 1 0 0; }
    """

    def __init__(self, bend_id: str, proposal: Proposal, units: UnitSystem):
        super().__init__()
        self.bend_id = bend_id
        self.proposal = proposal
        self.units = units

    def compose(self) -> ComposeResult:
        p = self.proposal
        with Vertical():
            yield Static(plain_text(f"Proposal for bend {self.bend_id}", "bold"), id="p-title")
            with VerticalScroll(id="p-body"):
                yield Static(proposal_table(p, self.units), id="p-values")
                yield Static(verdict_text(p), id="p-verdict")  # before the reasons: in view
                yield Static(Text("Why", style="bold"))
                reasons = "\n".join(f"- {line}" for line in p.reasons)
                yield Static(plain_text(reasons, one_line=False), id="p-reasons")
            with Horizontal():
                yield Button("Apply to the bend", id="apply")
                yield Button("Cancel", id="cancel", variant="primary")
            yield Static(CAUTION, classes="dialog-caution", markup=False)

    def on_button_pressed(self, event: Button.Pressed) -> None:
        self.dismiss(event.button.id or "cancel")
