"""Checking every bend of a project, and noticing when stored results no longer match."""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

from curvetui.bend.service import evaluate_bend, path_namer
from curvetui.core.units import UnitSystem, unit_system
from curvetui.inputs import InputError
from curvetui.storage.project.chain import Layout, effective_inputs, lay_out_project
from curvetui.storage.project.model import Bend, Project
from curvetui.storage.project.references import allowed_reference
from curvetui.storage.tables import TableError, rail_limits, road_table

# Results kept in a project file: everything but the long texts that every record repeats.
UNSTORED = ("caution", "table_source", "limits_source")
RELATIVE_TOLERANCE = 1e-6


@dataclass
class Outcome:
    """One bend's fresh record, or the input error that stopped it."""

    index: int
    bend: Bend
    record: dict | None
    error: str | None = None

    @property
    def status(self) -> str:
        return "error" if self.record is None else self.record["status"]


@dataclass
class Context:
    units: UnitSystem
    table: object
    limits: object


def project_context(project: Project, folder: Path | None = None) -> Context:
    """The units, road table and rail limits a project names; errors name the JSON path.
    A table named by path must lie in ``folder`` (default: the folder the project was
    loaded from) or a user-tables folder (see references.py)."""
    units = unit_system(project.details.units)
    folder = folder if folder is not None else project.folder
    d = project.details
    try:
        ref = allowed_reference(d.road_table, "$.details.road_table", folder)
        table = road_table(ref, units.name)
    except TableError as exc:
        raise InputError(f"$.details.road_table: {exc}".replace("--table: ", "")) from None
    try:
        ref = allowed_reference(d.rail_limits, "$.details.rail_limits", folder)
        limits = rail_limits(ref, units.name)
    except TableError as exc:
        raise InputError(f"$.details.rail_limits: {exc}".replace("--limits: ", "")) from None
    return Context(units, table, limits)


def evaluate(bend: Bend, index: int, ctx: Context, layout: Layout | None = None) -> Outcome:
    """One bend's record; on a laid-out alignment (``layout``) with the deflection and PI
    station the alignment gives it."""
    try:
        record = evaluate_bend(
            bend.kind,
            effective_inputs(bend.id, bend.inputs, layout),
            ctx.units,
            ctx.table,
            ctx.limits,
            path_namer(f"$.bends[{index}].inputs"),
        )
    except InputError as exc:
        return Outcome(index, bend, None, str(exc))
    return Outcome(index, bend, record)


def evaluate_project(project: Project, ctx: Context | None = None) -> list[Outcome]:
    ctx = ctx or project_context(project)
    layout = lay_out_project(project)
    return [evaluate(b, i, ctx, layout) for i, b in enumerate(project.bends)]


def stored_form(record: dict) -> dict:
    return {k: v for k, v in record.items() if k not in UNSTORED}


def differences(stored: dict, fresh: dict, prefix: str = "") -> list[str]:
    """Where stored results differ from freshly computed ones (numbers to 1e-6 relative)."""
    out: list[str] = []
    # "checks" is new in this format: files saved before it hold none
    for key in sorted(set(stored) | set(fresh)):
        if key in UNSTORED or key == "messages" or (key == "checks" and key not in stored):
            continue
        a, b = stored.get(key), fresh.get(key)
        name = f"{prefix}{key}"
        if isinstance(a, dict) and isinstance(b, dict):
            out += differences(a, b, f"{name}.")
        elif isinstance(a, int | float) and isinstance(b, int | float) and not isinstance(a, bool):
            if not math.isclose(a, b, rel_tol=RELATIVE_TOLERANCE, abs_tol=1e-9):
                out.append(f"{name}: stored {a:g}, now {b:g}")
        elif a != b:
            out.append(f"{name}: stored {a!r}, now {b!r}")
    return out


def stale_results(outcomes: list[Outcome]) -> list[str]:
    """A line per bend whose stored results differ from today's engine and tables."""
    lines = []
    for o in outcomes:
        if o.bend.results is None or o.record is None:
            continue
        diff = differences(o.bend.results, stored_form(o.record))
        if diff:
            shown = "; ".join(diff[:4]) + (f"; and {len(diff) - 4} more" if len(diff) > 4 else "")
            lines.append(
                f"{o.bend.id}: results differ from those stored at the last save "
                f"(a changed table or engine?): {shown}"
            )
    return lines


def refresh_results(project: Project, outcomes: list[Outcome]) -> None:
    """Store each bend's fresh results (done at save time); errors store none."""
    for o in outcomes:
        o.bend.results = None if o.record is None else stored_form(o.record)
