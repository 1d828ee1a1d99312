"""The state behind the terminal app, with no Textual in it: the project, its file, the
last good result of every bend, the bend on screen, and the edits a designer makes.

Every change goes through a method here; each one ends by telling the watchers (``watch``)
what it touched (a ``Change``), and the app's views redraw themselves from the session.
"""

from __future__ import annotations

import copy
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

from curvetui.app.field_text import (
    field_of,
    field_text,
    input_value,
    labelled,
    same_value,
)
from curvetui.app.storable import file_problems, readable_problems, same_results
from curvetui.app.units_change import UnitChange, apply_change
from curvetui.core.units import UnitSystem, unit_system
from curvetui.inputs import InputError
from curvetui.stations import parse_station
from curvetui.storage.project.files import ProjectError, load_project, save_project
from curvetui.storage.project.model import Bend, Details, Project

if TYPE_CHECKING:
    from curvetui.storage.project.chain import Layout
    from curvetui.storage.project.checking import Context

# The engine (curvetui.storage.project.checking and what it imports: numpy, the bend layer)
# is imported where a bend is evaluated, not with this module: the app paints its first
# frame (the bends and the caution) before it needs the engine.

# the worksheet's fields that are not engine inputs
FORM_FIELDS = ("bend_id", "station", "notes")
ID_RULE = "bend id: must be 1 to 40 characters and not used by another bend"
STATION_RULE = "station: must be a station such as 2+710.5 or a number"
# the inputs of a bend on the alignment that move the stations of the bends after it
GEOMETRY_INPUTS = ("radius", "spiral_in", "spiral_out")


@dataclass
class BendState:
    """What the app knows of one bend: its last good record and the current error, if any."""

    record: dict | None = None
    error: str | None = None  # the message for the inputs as typed
    error_field: str | None = None
    # bend id or station typed but not taken (the bend keeps the old one): field -> why
    form_errors: dict[str, str] = field(default_factory=dict)
    # fields the project file cannot store as they are: field -> why (see app.storable)
    file_errors: dict[str, str] = field(default_factory=dict)

    def engine_fields(self) -> set[str]:
        """Every field the engine's message names ('speed: required; radius: required')."""
        if not self.error:
            return set()
        return {k for k in map(field_of, self.error.split("; ")) if k is not None}

    def field_errors(self) -> dict[str, str]:
        """Every field marked on the form, with the first reason for each."""
        out = dict(self.form_errors)
        for key, why in self.file_errors.items():
            if key not in self.engine_fields():  # the engine's message already names it
                out.setdefault(key, why)
        return out


@dataclass(frozen=True)
class Change:
    """What the last change of a session touched: ``what`` is 'open', 'computed' (every
    bend evaluated, or with ``bend`` that one), 'select' (another bend on screen), 'field'
    (one field of ``bend``, ``key``), 'kind', 'bends' (added, copied, deleted or moved),
    'details' (names, units, tables), 'inputs' (several inputs of ``bend`` at once) or
    'saved'."""

    what: str
    bend: Bend | None = None
    key: str | None = None


@dataclass(eq=False)
class Session:
    project: Project
    path: Path | None = None
    dirty: bool = False
    notes: list[str] = field(default_factory=list)
    states: dict[int, BendState] = field(default_factory=dict)  # by id() of the Bend
    current: Bend | None = None  # the bend on screen (the first one to start with)
    revision: int = 0  # counts the changes
    change: Change = field(default_factory=lambda: Change("open"))
    _watchers: list[Callable[[Session], None]] = field(default_factory=list, repr=False)

    def __post_init__(self) -> None:
        if self.current is None and self.project.bends:
            self.current = self.project.bends[0]

    @classmethod
    def open(cls, path: str | Path, compute: bool = True) -> Session:
        """Open a project file (created in memory when absent; saved on the first save).

        With ``compute`` False the bends are left for ``compute_all`` (the app paints its
        first screen before the engine's first, slower, run)."""
        p = Path(path)
        if p.exists():
            project, notes = load_project(p)
            s = cls(project, p, notes=list(notes))
        else:
            s = cls(
                Project(Details(name=p.stem)),
                p,
                dirty=True,
                notes=[f"{p.name} is new: save to create it"],
            )
        if compute:
            s.compute_all()
        return s

    def compute_current(self) -> bool:
        """Evaluate the bend on screen if it has no result yet (the app shows it before it
        evaluates the others); True when it did (the watchers were told)."""
        if self.current is None or self.status(self.current) != "pending":
            return False
        self.recompute(self.current)
        self._changed("computed", self.current)
        return True

    def compute_all(self) -> None:
        """Evaluate every bend and note any whose stored results differ."""
        self.recompute_all()
        from curvetui.storage.project.checking import stale_results

        self.notes += stale_results([_Outcome(b, self.state(b).record) for b in self.project.bends])
        self._changed("computed")

    # -- watchers -----------------------------------------------------------------------
    def watch(self, watcher: Callable[[Session], None]) -> Callable[[], None]:
        """Call ``watcher(session)`` after every change; returns the call that stops it."""
        self._watchers.append(watcher)
        return lambda: self._watchers.remove(watcher) if watcher in self._watchers else None

    def _changed(self, what: str, bend: Bend | None = None, key: str | None = None) -> None:
        self.revision += 1
        self.change = Change(what, bend, key)
        for watcher in list(self._watchers):
            watcher(self)

    # -- context and evaluation --------------------------------------------------------
    @property
    def context(self) -> Context:
        from curvetui.storage.project.checking import project_context

        return project_context(self.project, self.path.parent if self.path else None)

    @property
    def units(self) -> UnitSystem:
        return unit_system(self.project.details.units)

    def state(self, bend: Bend) -> BendState:
        return self.states.setdefault(id(bend), BendState())

    @property
    def layout(self) -> Layout | None:
        """The project's alignment laid out from the bends as they are now (None without
        one); its bends' deflection and PI station come from it."""
        from curvetui.storage.project.chain import lay_out_project

        return lay_out_project(self.project)

    def alignment_texts(self, bend: Bend) -> dict[str, str]:
        """The deflection and PI station the alignment gives ``bend`` as the form shows
        them ({} off the alignment): curvetui.app.alignment_state."""
        from curvetui.app.alignment_state import alignment_texts

        return alignment_texts(self, bend)

    def alignment_report(self):
        """The alignment checked as a whole (None without one)."""
        from curvetui.app.alignment_state import alignment_report

        return alignment_report(self)

    def recompute(
        self, bend: Bend, ctx: Context | None = None, layout: Layout | None = None
    ) -> BendState:
        """Evaluate a bend; on bad input keep the last good record and note the error. On
        the project's alignment it takes the deflection and PI station the alignment
        gives it (``layout``, laid out afresh when not given)."""
        st = self.state(bend)
        index = self.project.bends.index(bend)
        st.file_errors = file_problems(bend)
        if ctx is None:
            try:
                ctx = self.context
            except InputError as exc:  # e.g. the project names an unknown table
                st.error, st.error_field = str(exc), None
                return st
        from curvetui.storage.project.checking import evaluate

        outcome = evaluate(bend, index, ctx, layout if layout is not None else self.layout)
        if outcome.record is None:
            st.error = labelled((outcome.error or "").replace(f"$.bends[{index}].inputs.", ""))
            st.error_field = field_of(st.error)
        else:
            st.record, st.error, st.error_field = outcome.record, None, None
        return st

    def recompute_all(self) -> None:
        try:
            ctx = self.context
        except InputError:
            ctx = None  # each bend then carries the message
        layout = self.layout
        for b in self.project.bends:
            self.recompute(b, ctx, layout)

    def recompute_alignment(self, bend: Bend) -> None:
        """After an edit of a bend on the alignment: the others on it too (a radius or a
        spiral moves every station after it)."""
        layout = self.layout
        if layout is None or bend.id not in layout.bend_ids:
            return
        try:
            ctx = self.context
        except InputError:
            return
        for b in self.project.bends:
            if b is not bend and b.id in layout.bend_ids:
                self.recompute(b, ctx, layout)

    # -- the bend on screen ---------------------------------------------------------------
    def select(self, bend: Bend | None) -> None:
        """Put ``bend`` on screen (its worksheet is filled from the model again)."""
        if bend is not self.current:
            self.current = bend
            self._clear_form_errors()
            self._changed("select", bend)

    def _clear_form_errors(self) -> None:
        for st in self.states.values():
            st.form_errors.clear()

    # -- edits --------------------------------------------------------------------------
    def set_input(self, bend: Bend, key: str, text: str) -> BendState:
        """Set one input from typed text ('' clears it; a station may be written 2+710.5)
        and recompute. A value equal to the stored one leaves it as stored (100 stays 100,
        not 100.0) and changes nothing."""
        value = input_value(text, key, self.units.name)
        old = bend.inputs.get(key)
        if value is None:
            if bend.inputs.pop(key, None) is not None:
                self.dirty = True
        elif not same_value(old, value):
            bend.inputs[key] = value  # text that is no number is kept as typed: the
            # engine's message then names the field
            self.dirty = True
        st = self.recompute(bend)
        if key in GEOMETRY_INPUTS:
            self.recompute_alignment(bend)
        self._changed("field", bend, key)
        return st

    def set_inputs(self, bend: Bend, values: Mapping[str, object]) -> dict[str, object]:
        """Several inputs at once (a proposal applied, or put back): numbers, None to clear;
        one recompute and one change ('inputs': the worksheet is filled again). Returns
        the values they replaced (None where absent), to put back as one step."""
        old = {key: bend.inputs.get(key) for key in values}
        for key, value in values.items():
            if value is None:
                if bend.inputs.pop(key, None) is not None:
                    self.dirty = True
            elif not same_value(bend.inputs.get(key), value):
                bend.inputs[key] = value
                self.dirty = True
        self.recompute(bend)
        if any(key in GEOMETRY_INPUTS for key in values):
            self.recompute_alignment(bend)  # a radius or spiral moves the stations after it
        self._changed("inputs", bend)
        return old

    def set_many(self, changes: list[tuple[Bend, Mapping[str, object]]]) -> list[tuple[Bend, dict]]:
        """Inputs of several bends at once (every bend's proposal applied, or put back):
        one recompute of every bend and one change ('inputs', the bend on screen). Returns,
        bend by bend, the values they replaced (None where absent): one step to put back."""
        olds = []
        for bend, values in changes:
            olds.append((bend, {key: bend.inputs.get(key) for key in values}))
            for key, value in values.items():
                if value is None:
                    if bend.inputs.pop(key, None) is not None:
                        self.dirty = True
                elif not same_value(bend.inputs.get(key), value):
                    bend.inputs[key] = value
                    self.dirty = True
        self.recompute_all()
        self._changed("inputs", self.current)
        return olds

    def edit_field(self, bend: Bend, key: str, text: str) -> BendState:
        """One worksheet field as typed: an engine input, the bend id, station or notes."""
        if key == "bend_id":
            return self.rename(bend, text)
        if key == "station":
            return self.set_station(bend, text)
        if key == "notes":
            return self.set_notes(bend, text)
        return self.set_input(bend, key, text)

    def rename(self, bend: Bend, new_id: str) -> BendState:
        """A new id (1 to 40 characters, not another bend's); refused: the old one stays."""
        new_id = new_id.strip()
        taken = {b.id for b in self.project.bends if b is not bend}
        st = self.state(bend)
        if not new_id or new_id in taken or len(new_id) > 40:
            st.form_errors["bend_id"] = ID_RULE
        else:
            st.form_errors.pop("bend_id", None)
            if new_id != bend.id:
                if self.project.alignment is not None:  # its PI keeps naming this bend
                    self.project.alignment.rename_bend(bend.id, new_id)
                bend.id = new_id
                self.dirty = True
        self._changed("field", bend, "bend_id")
        return st

    def set_station(self, bend: Bend, text: str) -> BendState:
        """The PI station from text such as 2+710.5 (blank: 0); refused: the old one stays."""
        st = self.state(bend)
        try:
            station = parse_station(text or "0", self.units.name)
        except ValueError:
            st.form_errors["station"] = STATION_RULE
        else:
            st.form_errors.pop("station", None)
            if station != bend.station:
                bend.station = station
                self.dirty = True
        self._changed("field", bend, "station")
        return st

    def set_notes(self, bend: Bend, text: str) -> BendState:
        if text != bend.notes:
            bend.notes = text
            self.dirty = True
        self._changed("field", bend, "notes")
        return self.state(bend)

    def set_kind(self, bend: Bend, kind: str) -> BendState:
        if kind not in ("road", "rail"):
            raise InputError(f"kind: must be 'road' or 'rail', got {kind!r}")
        if kind != bend.kind:
            bend.kind = kind
            self.dirty = True
        st = self.recompute(bend)
        self._changed("kind", bend)
        return st

    def switch_kind(self, bend: Bend, kind: str) -> BendState:
        """``set_kind`` as the worksheet's kind box does it. Nothing is made up: a rail
        curve without a cant waits for one (its field is marked as required)."""
        return self.set_kind(bend, kind)

    def add_bend(self, kind: str = "road", after: Bend | None = None) -> Bend:
        """A new bend after ``after`` (default: at the end), put on screen. It starts with no
        inputs: nothing is made up, and it shows no result until its required fields are
        typed (the station is the one of the bend before it)."""
        bend = Bend(self.project.new_bend_id(), kind, {})
        pos = len(self.project.bends) if after is None else self.project.bends.index(after) + 1
        if after is not None:
            bend.station = after.station
        self.project.bends.insert(pos, bend)
        self.dirty = True
        self.recompute(bend)
        self._put_on_screen(bend)
        return bend

    def duplicate_bend(self, bend: Bend) -> Bend:
        """A copy of ``bend`` (a new id, no stored results) after it, put on screen."""
        twin = copy.deepcopy(bend)
        twin.id = self.project.new_bend_id()
        twin.results = None
        self.project.bends.insert(self.project.bends.index(bend) + 1, twin)
        self.dirty = True
        self.recompute(twin)
        self._put_on_screen(twin)
        return twin

    def _put_on_screen(self, bend: Bend) -> None:
        self.current = bend
        self._clear_form_errors()
        self._changed("bends", bend)

    def delete_bend(self, bend: Bend) -> None:
        """Delete ``bend``; when it was on screen, the one now in its place is."""
        bends = self.project.bends
        i = bends.index(bend)
        bends.remove(bend)
        self.states.pop(id(bend), None)
        self.dirty = True
        if bend is self.current:
            self.current = bends[min(i, len(bends) - 1)] if bends else None
            self._clear_form_errors()
        self._changed("bends", bend)

    def move_bend(self, bend: Bend, step: int) -> None:
        bends = self.project.bends
        i = bends.index(bend)
        j = max(0, min(len(bends) - 1, i + step))
        if i != j:
            bends.insert(j, bends.pop(i))
            self.dirty = True
            self._changed("bends", bend)

    def set_detail(self, key: str, value: str) -> None:
        """One project detail (the units: 'metric' or 'us'); every bend is recomputed."""
        problems = self.set_details({key: value})
        if problems:
            raise InputError(problems[0])

    def set_details(self, values: Mapping[str, str | None]) -> list[str]:
        """Project details (as the details dialog gives them), every bend recomputed once;
        returns the messages of the values refused (the others are taken)."""
        problems = []
        d = self.project.details
        for key, value in values.items():
            if key == "units" and value not in ("metric", "us"):
                problems.append("units: must be 'metric' or 'us'")
                continue
            if key == "units" and value != d.units and self.project.bends:
                problems.append("units: the bends' values must be converted (change_units)")
                continue
            value = value or (None if key in ("road_table", "rail_limits") else "")
            if getattr(d, key) != value:
                setattr(d, key, value)
                self.dirty = True
        self.recompute_all()
        self._clear_form_errors()
        self._changed("details")
        return problems

    def change_units(self, change: UnitChange) -> None:
        """Convert every bend's values to ``change.new`` units and switch the tables as
        ``change`` says (curvetui.app.units_change); every bend is recomputed."""
        apply_change(self.project, change)
        self.dirty = True
        self.recompute_all()
        self._clear_form_errors()
        self._changed("details")

    # -- files --------------------------------------------------------------------------
    def save(self, path: str | Path | None = None) -> Path:
        """Save atomically (the previous file kept as .bak), storing fresh results."""
        target = Path(path) if path is not None else self.path
        if target is None:
            raise InputError("save: no file name")
        outcomes = [
            _Outcome(b, self.state(b).record if self.state(b).error is None else None)
            for b in self.project.bends
        ]
        from curvetui.storage.project.checking import refresh_results

        kept = [b.results for b in self.project.bends]
        refresh_results(self.project, outcomes)
        for b, stored in zip(self.project.bends, kept, strict=True):
            if same_results(stored, b.results):
                b.results = stored  # the same results: written as they were read
        try:
            save_project(self.project, target)
        except BaseException as exc:  # nothing written: the bends keep what they had
            for b, results in zip(self.project.bends, kept, strict=True):
                b.results = results
            if isinstance(exc, ProjectError):
                problems = readable_problems(exc.problems, self.project.bends)
                raise ProjectError(exc.path, problems) from None
            raise
        self.path, self.dirty = target, False
        self._changed("saved")
        return target

    # -- summary ------------------------------------------------------------------------
    def status(self, bend: Bend) -> str:
        """'pass', 'fail', 'error' (inputs cannot be used) or 'pending' (not computed yet)."""
        st = self.state(bend)
        if st.error is not None:
            return "error"
        return st.record["status"] if st.record else "pending"

    def field_text(self, bend: Bend, key: str) -> str:
        """The text the worksheet shows for a field of the model."""
        return field_text(bend, key, self.units.name)


@dataclass
class _Outcome:
    """The part of project.checking.Outcome that stale_results and refresh_results read."""

    bend: Bend
    record: dict | None
