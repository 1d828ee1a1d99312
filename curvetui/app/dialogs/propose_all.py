"""Propose every bend (shift+F7, or the command palette): one row per bend with its
deflection, each proposed input beside the current one and the proposed bend's verdict,
then the alignment's verdicts as they would be with every proposal applied. Apply puts
them all in as one step (ctrl+r puts every bend back). Every text is plain text."""

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
from curvetui.core.units import UnitSystem

SHOWN = ("radius", "superelevation", "cant", "spiral_in", "spiral_out")
SHORT = {"radius": "R", "superelevation": "e", "cant": "cant", "spiral_in": "Ls in"}
SHORT["spiral_out"] = "Ls out"


def _value(v) -> str:
    if v is None or (isinstance(v, str) and not v.strip()):
        return "blank"
    return f"{v:g}" if isinstance(v, int | float) else visible(v, one_line=True)


def proposals_table(items, units: UnitSystem) -> Table:
    """Bend, kind, deflection, now -> proposed for each input, the proposed bend's check."""
    shown = [k for k in SHOWN if any(i.proposal and k in i.proposal.proposed for i in items)]
    grid = Table(box=None, pad_edge=False, show_edge=False)
    grid.add_column("Bend")
    grid.add_column("Kind")
    grid.add_column("Defl deg", justify="right")
    for k in shown:
        grid.add_column(f"{SHORT[k]} {BY_KEY[k].unit_label(units)}".strip(), justify="right")
    grid.add_column("Check")
    for i in items:
        ident = Text(visible(i.bend.id, one_line=True))
        if i.proposal is None:
            grid.add_row(ident, Text(i.bend.kind), Text(""), *[Text("")] * len(shown), Text("NONE"))
            continue
        p = i.proposal
        changes = p.changes()
        defl = p.inputs.get("deflection")
        cells = []
        for k in shown:
            if k not in p.proposed:
                cells.append(Text(""))
            elif k in changes:
                cells.append(Text(f"{_value(p.current.get(k))} -> {_value(p.proposed[k])}"))
            else:
                cells.append(Text(f"= {_value(p.proposed[k])}"))
        grid.add_row(
            ident,
            Text(i.bend.kind),
            Text("" if defl is None else f"{float(defl):.4f}"),
            *cells,
            Text(p.status.upper(), style="bold green" if p.status == "pass" else "bold red"),
        )
    return grid


def notes_text(items, report) -> Text:
    """Bends without a proposal, the proposed bends' fails and warnings, and the
    alignment's verdicts with the proposals applied (never hidden)."""
    from curvetui.bend.messages import message_line

    lines = []
    for i in items:
        if i.proposal is None:
            lines.append(f"{i.bend.id}: no proposal: {i.error}")
            continue
        lines += [
            f"{i.bend.id}: {message_line(m)}"
            for m in i.proposal.record.get("messages", [])
            if m.get("severity") in ("fail", "warning", "error")
        ]
    if report is not None:
        lines.append(f"The alignment with these proposals: {report.status.upper()}")
        lines += report.lines()
    return Text("\n".join(visible(f"- {line}", one_line=True) for line in lines))


class ProposeAllDialog(ModalScreen[str]):
    """Shows every bend's proposal; dismisses with 'apply' or 'cancel' (escape)."""

    BINDINGS = [Binding("escape", "dismiss('cancel')", "Cancel")]
    AUTO_FOCUS = "#cancel"
    DEFAULT_CSS = """
    ProposeAllDialog { align: center middle; }
    ProposeAllDialog > Vertical { width: 95%; max-width: 130; height: 90%;
                                  border: thick $accent; padding: 0 1; background: $surface; }
    ProposeAllDialog VerticalScroll { height: 1fr; }
    ProposeAllDialog Horizontal { height: auto; margin: 1 0 0 0; }
    ProposeAllDialog Button { margin: 0 1 0 0; }
    """

    def __init__(self, items, report, units: UnitSystem):
        super().__init__()
        self.items = items
        self.report = report
        self.units = units

    def compose(self) -> ComposeResult:
        changed = sum(1 for i in self.items if i.changes)
        with Vertical():
            yield Static(
                plain_text(
                    f"Proposals for every bend ({changed} of {len(self.items)} would change; "
                    "now -> proposed)",
                    "bold",
                ),
                id="pa-title",
            )
            with VerticalScroll(id="pa-body"):
                yield Static(proposals_table(self.items, self.units), id="pa-values")
                yield Static(notes_text(self.items, self.report), id="pa-notes")
                yield Static(
                    Text(
                        "F7 on a bend gives the reasons for its values (rule and source). "
                        "Apply changes every bend at once; ctrl+r puts them all back."
                    )
                )
            with Horizontal():
                yield Button("Apply to every bend", id="apply", disabled=not changed)
                yield Button("Cancel", id="cancel", variant="primary")
            yield Static(CAUTION, classes="dialog-caution", markup=False)

    def on_button_pressed(self, event: Button.Pressed) -> None:
        self.dismiss(event.button.id or "cancel")
