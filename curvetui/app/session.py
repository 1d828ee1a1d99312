"""The state behind the terminal app, with no Textual in it: the project, its file, the
last good result of every bend, and the edits a designer makes."""

from __future__ import annotations

import copy
from dataclasses import dataclass, field
from pathlib import Path

from curvetui.bend.fields import FIELDS, cli_name
from curvetui.inputs import InputError
from curvetui.project.checking import (
    Context,
    evaluate,
    project_context,
    refresh_results,
    stale_results,
)
from curvetui.project.files import load_project, save_project
from curvetui.project.model import Bend, Details, Project


def field_label(key: str) -> str:
    """A field's name as shown in the app (the project-file key in words)."""
    names = {
        "emax": "e max",
        "pi_station": "PI station",
        "spiral_in": "spiral in",
        "spiral_out": "spiral out",
        "low_speed": "slow train speed",
    }
    return names.get(key, key.replace("_", " "))


@dataclass
class BendState:
    """What the app knows of one bend: its last good record and the current error, if any."""

    record: dict | None = None
    error: str | None = None  # the message for the inputs as typed
    error_field: str | None = None


@dataclass
class Session:
    project: Project
    path: Path | None = None
    dirty: bool = False
    notes: list[str] = field(default_factory=list)
    states: dict[int, BendState] = field(default_factory=dict)  # by id() of the Bend

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

    def compute_all(self) -> None:
        """Evaluate every bend and note any whose stored results differ."""
        self.recompute_all()
        self.notes += stale_results([_Outcome(b, self.state(b).record) for b in self.project.bends])

    # -- context and evaluation --------------------------------------------------------
    @property
    def context(self) -> Context:
        return project_context(self.project)

    def state(self, bend: Bend) -> BendState:
        return self.states.setdefault(id(bend), BendState())

    def recompute(self, bend: Bend, ctx: Context | None = None) -> BendState:
        """Evaluate a bend; on bad input keep the last good record and note the error."""
        st = self.state(bend)
        index = self.project.bends.index(bend)
        if ctx is None:
            try:
                ctx = self.context
            except InputError as exc:  # e.g. the project names an unknown table
                st.error, st.error_field = str(exc), None
                return st
        outcome = evaluate(bend, index, ctx)
        if outcome.record is None:
            st.error = (outcome.error or "").replace(f"$.bends[{index}].inputs.", "")
            st.error_field = _field_of(st.error)
        else:
            st.record, st.error, st.error_field = outcome.record, None, None
        return st

    def recompute_all(self) -> None:
        try:
            ctx = self.context
        except InputError:
            ctx = None  # each bend then carries the message
        for b in self.project.bends:
            self.recompute(b, ctx)

    # -- edits --------------------------------------------------------------------------
    def set_input(self, bend: Bend, key: str, text: str) -> BendState:
        """Set one input from typed text ('' clears it) and recompute."""
        text = text.strip()
        if text == "":
            bend.inputs.pop(key, None)
        else:
            try:
                value: float | str = float(text)
            except ValueError:
                value = text  # kept as typed, so the engine's message names the field
            bend.inputs[key] = value
        self.dirty = True
        return self.recompute(bend)

    def set_kind(self, bend: Bend, kind: str) -> BendState:
        if kind not in ("road", "rail"):
            raise InputError(f"kind: must be 'road' or 'rail', got {kind!r}")
        bend.kind = kind
        self.dirty = True
        return self.recompute(bend)

    def add_bend(self, kind: str = "road", after: Bend | None = None) -> Bend:
        inputs = (
            {"speed": 80.0, "radius": 400.0}
            if kind == "road"
            else {"speed": 100.0, "radius": 1000.0, "cant": 60.0}
        )
        bend = Bend(self.project.new_bend_id(), kind, inputs)
        pos = len(self.project.bends) if after is None else self.project.bends.index(after) + 1
        if after is not None:
            bend.station = after.station
        self.project.bends.insert(pos, bend)
        self.dirty = True
        self.recompute(bend)
        return bend

    def duplicate_bend(self, bend: Bend) -> Bend:
        twin = copy.deepcopy(bend)
        twin.id = self.project.new_bend_id()
        twin.results = None
        self.project.bends.insert(self.project.bends.index(bend) + 1, twin)
        self.dirty = True
        self.recompute(twin)
        return twin

    def delete_bend(self, bend: Bend) -> None:
        self.project.bends.remove(bend)
        self.states.pop(id(bend), None)
        self.dirty = True

    def move_bend(self, bend: Bend, step: int) -> None:
        bends = self.project.bends
        i = bends.index(bend)
        j = max(0, min(len(bends) - 1, i + step))
        if i != j:
            bends.insert(j, bends.pop(i))
            self.dirty = True

    def set_detail(self, key: str, value: str) -> None:
        if key == "units" and value not in ("metric", "us"):
            raise InputError("units: must be 'metric' or 'us'")
        setattr(
            self.project.details,
            key,
            value or (None if key in ("road_table", "rail_limits") else ""),
        )
        self.dirty = True
        self.recompute_all()

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
        refresh_results(self.project, outcomes)
        save_project(self.project, target)
        self.path, self.dirty = target, False
        return target

    # -- summary ------------------------------------------------------------------------
    def status(self, bend: Bend) -> str:
        """'pass', 'fail', 'error' (inputs cannot be used) or 'pending' (not computed yet)."""
        st = self.state(bend)
        if st.error is not None:
            return "error"
        return st.record["status"] if st.record else "pending"


@dataclass
class _Outcome:
    """The part of project.checking.Outcome that stale_results and refresh_results read."""

    bend: Bend
    record: dict | None


def _field_of(message: str) -> str | None:
    """The input named at the start of an engine message ('speed: ...' or '--speed: ...')."""
    head = message.split(":", 1)[0].strip()
    for key in (f.key for f in FIELDS):
        if head in (key, cli_name(key)) or head.endswith("." + key):
            return key
    return None
