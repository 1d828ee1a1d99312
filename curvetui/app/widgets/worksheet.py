"""The bend worksheet: the inputs in the order a designer thinks, validated as typed, and
the results beside them. The last good result stays on screen while an input is invalid.

In the project it shows the session's bend on screen (``show_session``); a batch row shows
its cells read-only (``fill``, ``read_only``).
"""

from __future__ import annotations

from rich.console import Group
from rich.table import Table
from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal, VerticalScroll
from textual.widgets import Input, Select, Static

from curvetui.app.field_text import field_label
from curvetui.app.plain import plain_text, visible
from curvetui.app.session import FORM_FIELDS, Session
from curvetui.app.widgets.field_input import FieldInput
from curvetui.app.widgets.field_row import FieldRow
from curvetui.bend.display import shown
from curvetui.bend.fields import FIELDS, input_keys
from curvetui.bend.messages import message_line
from curvetui.bend.outputs import main_results
from curvetui.core.units import UnitSystem
from curvetui.results import RAIL_FIELDS, ROAD_FIELDS, unit_label

# Every input either kind can have, in the field list's order (curvetui.bend.fields).
ALL_FIELDS = tuple(f.key for f in FIELDS)
UNIT_KIND = {
    f.key: {"degrees": "deg", "percent": "%", "factor": "", "choice": "", "station": "length"}.get(
        f.unit, f.unit
    )
    for f in FIELDS
}
HINTS = {f.key: f.form_hint for f in FIELDS if f.form_hint}
# the inputs a bend on the project's alignment takes from it (read-only in the form)
ALIGNMENT_FIELDS = ("deflection", "pi_station")
ALIGNMENT_NOTE = (
    "On the project's alignment: deflection and PI station come from it (read-only here; "
    "a radius or spiral changed moves the stations after this bend). The Alignment view "
    "shows it whole."
)


# Short names for the results column (from curvetui.bend.outputs)
SHORT = {o.key: o.short for kind in ("road", "rail") for o in main_results(kind)}


def field_input(key: str, select_on_focus: bool) -> FieldInput:
    """The field of ``key`` in its row (``#row-KEY``), as ``#in-KEY``. Textual's own
    validation is off (none is set; the session checks what is typed): it would restyle
    every field whose value is loaded."""
    return FieldInput(id=f"in-{key}", compact=True, select_on_focus=select_on_focus, validate_on=())


def field_unit(key: str, units: UnitSystem) -> str:
    kind = UNIT_KIND[key]
    return {"deg": "deg"}.get(kind, unit_label(kind, units))


class Worksheet(Horizontal):
    """Inputs on the left, results on the right (stacked when the terminal is narrow)."""

    DEFAULT_CSS = """
    Worksheet { height: 1fr; }
    Worksheet #form { width: 42; height: 1fr; }
    Worksheet .row FieldInput { width: 1fr; border: none; height: 1; padding: 0 1; }
    Worksheet .row FieldInput.-invalid { background: $error 30%; }
    Worksheet #kind { width: 30; margin: 0 0 1 0; }
    Worksheet #field-error { color: $error; height: auto; }
    Worksheet #results { width: 1fr; height: 1fr; padding: 0 1; }
    Worksheet #results:focus { background: $boost; border-left: thick $accent; }
    """

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="form"):
            yield Select(
                [("Road bend", "road"), ("Rail curve", "rail")],
                id="kind",
                allow_blank=False,
                value="road",
                compact=True,
            )
            for key in ("bend_id", "station", "notes"):
                label = {"bend_id": "bend id", "station": "station", "notes": "notes"}[key]
                # a number (or a station) typed after Tab replaces it; text is kept
                field = field_input(key, select_on_focus=key == "station")
                yield FieldRow(label, field, id=f"row-{key}", classes="row")
            for key in ALL_FIELDS:
                field = field_input(key, select_on_focus=True)
                yield FieldRow(field_label(key), field, id=f"row-{key}", classes="row")
            yield Static("", id="field-error")
            yield Static("", id="alignment-note")
        with VerticalScroll(id="results"):
            yield Static("", id="results-body")

    def show_fields(self, kind: str, units: UnitSystem) -> None:
        """The rows of ``kind``'s fields, with their units and hints."""
        if (kind, units.name) == getattr(self, "_fields", None):
            return  # every unit label updated would lay the screen out again
        self._fields = (kind, units.name)
        wanted = set(input_keys(kind))
        for key in ALL_FIELDS:
            row = self.query_one(f"#row-{key}", FieldRow)
            row.display = key in wanted
            row.unit = field_unit(key, units)
            self.query_one(f"#in-{key}", FieldInput).placeholder = HINTS.get(key, "")
        self.query_one("#row-station", FieldRow).unit = units.length_label

    @property
    def bend(self):
        """The bend whose fields the form shows (None before the first)."""
        return getattr(self, "_bend", None)

    def show_session(self, session: Session) -> None:
        """The bend on screen: its fields filled from the model when another bend, kind or
        units comes on screen (not while a field of it is typed in), the invalid field
        marked, the message for it, and the results."""
        bend = session.current
        self.display = bend is not None
        if bend is None:
            return
        units = session.units
        if bend is not getattr(self, "_bend", None) or session.change.what in (
            "open",
            "kind",
            "details",
            "inputs",
        ):
            self._bend = bend
            texts = {key: session.field_text(bend, key) for key in FORM_FIELDS + ALL_FIELDS}
            self.fill(bend.kind, units, texts)
        self.show_alignment_fields(session, bend)
        st = session.state(bend)
        marked, named = st.field_errors(), st.engine_fields()
        for key in FORM_FIELDS + ALL_FIELDS:
            bad = key in named or key in marked
            self.query_one(f"#in-{key}", FieldInput).set_class(bad, "-invalid")
            self.query_one(f"#row-{key}").set_class(bad, "-invalid")
        messages = ([st.error] if st.error else []) + list(marked.values())
        self.show_field_error("\n".join(messages))
        self.show_results(st.record, "\n".join(messages) or None, units, stale=st.error is not None)

    def show_alignment_fields(self, session: Session, bend) -> None:
        """On the project's alignment a bend's deflection and PI station are the
        alignment's: shown read-only, with a note under the form saying so. Off it, the
        bend's own, typed as usual."""
        given = session.alignment_texts(bend)
        note = self.query_one("#alignment-note", Static)
        text = ALIGNMENT_NOTE if given else ""
        if getattr(self, "_note", "") != text:
            self._note = text
            note.update(plain_text(text, "italic", one_line=False))
        for key in ALIGNMENT_FIELDS:
            box = self.query_one(f"#in-{key}", FieldInput)
            row = self.query_one(f"#row-{key}", FieldRow)
            on = key in given
            text = given[key] if on else visible(session.field_text(bend, key))
            if on or box.disabled:
                with self.prevent(Input.Changed):
                    box.load(text)
            box.disabled = on
            unit = field_unit(key, session.units)
            if row.unit != unit:
                row.unit = unit

    def fill(self, kind: str, units: UnitSystem, texts: dict[str, str]) -> None:
        """Put a bend's kind and field texts (by key; absent: blank) in the form."""
        with self.prevent(Input.Changed, Select.Changed):
            self.query_one("#kind", Select).value = kind
            self.show_fields(kind, units)
            for key in FORM_FIELDS + ALL_FIELDS:
                box = self.query_one(f"#in-{key}", FieldInput)
                box.load(visible(texts.get(key, "")))  # shown as text, control codes too
                box.remove_class("-invalid")

    def read_only(self, hidden: tuple[str, ...] = ()) -> None:
        """No field can be typed in; the rows of ``hidden`` are left out."""
        for key in hidden:
            self.query_one(f"#row-{key}").display = False
        self.query_one("#form").disabled = True

    def show_field_error(self, message: str) -> None:
        """The message under the form for the fields as typed ('' for none)."""
        if message != getattr(self, "_error", ""):
            self._error = message
            self.query_one("#field-error", Static).update(
                plain_text(message, "bold", one_line=False) if message else ""
            )

    def show_results(
        self, record: dict | None, error: str | None, units: UnitSystem, stale: bool
    ) -> None:
        # Skip unchanged content: every update of a Static re-lays the screen out. The record
        # is compared by value (an id could be reused once the record it named is gone).
        shown = (error, record, stale, units.name)
        if shown == getattr(self, "_shown", None):
            return
        self._shown = shown
        # Same number of lines as before: no new layout needed (it costs more than the
        # engine); a record's line count follows its keys and messages.
        lines = (
            None
            if record is None
            else (tuple(sorted(record)), len(record["messages"]), stale, error)
        )
        same = lines is not None and lines == getattr(self, "_lines", None)
        self._lines = lines
        self.query_one("#results-body", Static).update(
            results_renderable(record, units, stale, error), layout=not same
        )


def results_renderable(
    record: dict | None, units: UnitSystem, stale: bool, error: str | None = None
):
    """The results of a record as a Rich renderable: status first, then values, then reasons."""
    if record is None:
        return plain_text(
            "No result yet: give valid inputs." + (f"\n{error}" if error else ""),
            "italic",
            one_line=False,
        )
    status = record["status"]
    word = "PASS" if status == "pass" else "FAIL"
    head = Text()
    head.append(
        f" {word} ", style="bold white on green" if status == "pass" else "bold white on red"
    )
    head.append(
        f"  {record['kind']} bend, {record['speed']:g} {units.speed_label}, "
        f"R {record['radius']:g} {units.length_label}"
    )
    if stale:
        head.append("\nshowing the last valid inputs' results", style="bold yellow")
    if error:
        head.append(f"\n{visible(error, one_line=False)}", style="bold red")
    grid = Table(show_header=False, box=None, padding=(0, 1), expand=False)
    grid.add_column("q", no_wrap=True, overflow="ellipsis", max_width=20)
    grid.add_column("v", justify="right", no_wrap=True, min_width=9)
    grid.add_column("u", no_wrap=True, overflow="ellipsis")
    fields = ROAD_FIELDS if record["kind"] == "road" else RAIL_FIELDS
    for key, (label, kind) in fields.items():
        value = record.get(key)
        if value is None:
            continue
        label = SHORT.get(key, label)
        step = record.get("superelevation_step", 0.1)
        grid.add_row(label, shown(key, value, units.name, step), unit_label(kind, units))
    if record["kind"] == "road":
        grid.add_row("section", record["cross_section"], "")
    t = record.get("transition") or {}
    if "spiral_length_min" in t and t.get("spiral_length_min") is not None:
        grid.add_row(
            "spiral length",
            f"{t['spiral_length_min']:.1f}-{t['spiral_length_max']:.1f}",
            f"{units.length_label} ({t['governing']})",
        )
    elif t.get("length") is not None:
        grid.add_row("transition", f"{t['length']:.1f}", f"{units.length_label} ({t['governing']})")
    s = record.get("sight")
    if s:
        grid.add_row(
            "sight offset need",
            f"{s['sightline_offset_required']:.2f}",
            f"{units.length_label} ({s['status']})",
        )
    g = record.get("geometry")
    if g:
        key = "tangent" if g["type"] == "circular" else "total_tangent"
        grid.add_row("tangent", f"{g[key]:,.2f}", units.length_label)
        grid.add_row(
            "curve length", f"{g.get('length', g.get('total_length')):,.2f}", units.length_label
        )
    a = record.get("advisory") or {}
    if a.get("speed") is not None:
        grid.add_row("advisory speed", f"{a['speed']:g}", units.speed_label)
    if a.get("design_speed_inferred") is not None:
        grid.add_row(
            "inferred V",
            shown("safe_speed", a["design_speed_inferred"]),
            f"{units.speed_label} ({a['design_speed_inferred_kind']})",
        )
    sg = record.get("signs")
    if sg:
        grid.add_row("sign", visible(str(sg["sign"])), f"chevrons {sg['chevrons']}")
    msgs = Text()
    for m in record["messages"]:
        style = {"fail": "bold red", "error": "bold red", "warning": "yellow"}
        style = style.get(m["severity"], "")
        msgs.append(f"- {visible(message_line(m))}\n", style=style)
    return Group(head, Text(""), grid, Text(""), msgs)
