"""A bend's record: the typed result of one row, and its one JSON form.

The last step of the one path (parse -> evaluate -> record). ``BendRecord`` holds the
unrounded values, the typed checks and messages; ``to_json`` rounds as the output list
says (``curvetui.bend.outputs``) and nests the transition, geometry and sight objects.
Batch files write the same keys as columns (``curvetui.batch``).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from curvetui import CAUTION
from curvetui.bend import outputs as out
from curvetui.bend.evaluate import FAIL, NOT_APPLICABLE, STATUS_NAMES, Evaluation
from curvetui.bend.messages import Message, row_messages
from curvetui.results import fixed, rounded

HEAD_KEYS = ("speed", "radius", "e_max", "cant")  # written after the reference, as inputs


def written(key: str, value):
    """A value as JSON writes it: rounded by its output's rule; None for NaN/absent."""
    if value is None:
        return None
    rule = out.BY_KEY[key].rounding if key in out.BY_KEY else out.SIG
    if rule == out.TEXT:
        return value
    if rule == out.PLACES:
        return fixed(value)
    return rounded(value, {out.ANGLE: 9, out.INPUT: 12}.get(rule, 6))


@dataclass
class BendRecord:
    """One bend's results: kind, status, values (user units, unrounded) by output key,
    checks (name -> "pass"/"fail"), typed messages, and what it was checked against."""

    kind: str
    status: str
    values: dict[str, object]
    checks: dict[str, str]
    messages: list[Message]
    units: str
    reference: dict[str, str] = field(default_factory=dict)

    @property
    def failed(self) -> bool:
        return self.status == "fail"

    def value(self, key: str):
        return self.values.get(key)

    def to_json(self) -> dict:
        """The record of ``curvetui check --json`` (and a project file's stored results)."""
        main = {}
        parts: dict[str, dict] = {}
        for o in out.OUTPUTS:
            if self.kind not in o.kinds or o.key not in self.values:
                continue
            v = written(o.key, self.values[o.key])
            head, _, tail = o.key.partition(".")
            if tail:
                if v is not None or head == "transition":
                    parts.setdefault(head, {})[tail] = v
            elif o.key in HEAD_KEYS:
                continue
            else:
                main[o.key] = v
        record = dict(main)
        record["status"] = self.status
        record["messages"] = [m.to_json() for m in self.messages]
        record["kind"] = self.kind
        record["units"] = self.units
        record.update(self.reference)
        for key in HEAD_KEYS:
            if key in self.values and self.kind in out.BY_KEY[key].kinds:
                record[key] = written(key, self.values[key])
        record["checks"] = dict(self.checks)
        record["caution"] = CAUTION
        if "transition" in parts:
            record["transition"] = _ordered_transition(parts["transition"], self.kind)
        if "geometry" in parts:
            record["geometry"] = _ordered_geometry(parts["geometry"])
        if "sight" in parts:
            record["sight"] = parts["sight"]
        if "crash" in parts:
            record["crash"] = parts["crash"]
        if "superelevation_working" in parts:
            record["superelevation_working"] = parts["superelevation_working"]
        for head in ("advisory", "signs"):  # the curve as an existing one (road_advisory)
            if head in parts:
                record[head] = parts[head]
        return record


def _ordered_transition(t: dict, kind: str) -> dict:
    keys = out.ROAD_TRANSITION if kind == "road" else out.RAIL_TRANSITION
    first = {k: t.get(k) for k in keys[:2]} if kind == "road" else {"length": t.get("length")}
    rest = {k: t.get(k) for k in keys if k not in first}
    placed = {
        k: t[k]
        for k in (
            "runoff_on_tangent",
            *out.ROAD_TRANSITION_CONSTANTS,
            *out.RUNOFF_STATIONS,
            *out.RAIL_TRANSITION_LIMITS,
            "rotation_axis",
        )
        if k in t
    }
    return {**first, "governing": t.get("governing"), **rest, **placed, "status": t.get("status")}


def _ordered_geometry(g: dict) -> dict:
    keys = out.CIRCULAR_JSON if g.get("type") == "circular" else out.SPIRAL_JSON
    ordered = {k: g[k] for k in keys if k in g}
    ordered.update({k: g[k] for k in out.SPIRAL_OUT_JSON if k in g})
    return ordered


def record_at(ev: Evaluation, i: int, name, other=None, field_name=None) -> BendRecord:
    """Row ``i`` of an evaluation as a BendRecord (its messages named by ``name``)."""
    kind = "rail" if ev.parsed.is_rail[i] else "road"
    values: dict[str, object] = {}
    for key, arr in ev.values.items():
        x = float(arr[i])
        if np.isfinite(x) and kind in out.BY_KEY[key].kinds:
            values[key] = x
    for key, arr in ev.texts.items():
        if arr[i] is not None and kind in out.BY_KEY[key].kinds:
            values[key] = arr[i]
    for o in out.OUTPUTS:  # every main result of the kind is in the record, null if unknown
        if kind in o.kinds and "." not in o.key:
            values.setdefault(o.key, None)
    checks = {
        k: "fail" if c[i] == FAIL else "pass"
        for k, c in ev.checks.items()
        if c[i] != NOT_APPLICABLE
    }
    ctx = ev.ctx
    reference = (
        {"limits": ctx.limits.name, "limits_source": ctx.limits.source}
        if kind == "rail"
        else {
            "table": ctx.table.name,
            "table_source": ctx.table.source,
            "superelevation_step": round(100 * ctx.table.superelevation_step, 6),
        }
    )
    return BendRecord(
        kind=kind,
        status=STATUS_NAMES[int(ev.status[i])],
        values=values,
        checks=checks,
        messages=row_messages(ev, i, name, other, field_name),
        units=ctx.units.name,
        reference=reference,
    )
