"""Proposals for many bends of a project at once, and a road project started from a speed
and a chain of PIs. One path for every face (``new --points``, ``design --project``, the
app's "Propose every bend"): each bend's proposal is ``curvetui.bend.propose.propose`` on
its inputs as evaluated, so a bend on the project's alignment is proposed for the
deflection the alignment gives it (its stored deflection and PI station are not used and
never written by a proposal: a proposal sets only radius, superelevation or cant, spirals).

A radius is never reduced to make bends fit between their PIs: where the proposed
tangents overlap, the alignment's verdicts say so and the designer moves the PIs, lowers
the speed or types another radius.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass
from typing import Any

from curvetui.bend.propose import Proposal, propose
from curvetui.core.alignment import bearing, deflection_between
from curvetui.inputs import InputError
from curvetui.storage.project.chain import Layout, _points, effective_inputs, lay_out_project
from curvetui.storage.project.checking import Context
from curvetui.storage.project.model import (
    FORMAT_VERSION,
    Alignment,
    AlignmentPoint,
    Bend,
    Details,
    Project,
)


@dataclass
class BendProposal:
    """One bend's proposal, or the message why there is none."""

    bend: Bend
    proposal: Proposal | None = None
    error: str | None = None

    @property
    def changes(self) -> dict[str, float | None]:
        return {} if self.proposal is None else self.proposal.changes()


def signed_deflections(points: Iterable[tuple[float, float]]) -> list[float]:
    """Each PI's signed deflection [deg, + right] from the points (start, PIs, end): the
    turn from the bearing of the leg before to the bearing of the leg after."""
    pts = list(points)
    bearings = [bearing(pts[i], pts[i + 1]) for i in range(len(pts) - 1)]
    return [
        math.degrees(deflection_between(bearings[i], bearings[i + 1]))
        for i in range(len(bearings) - 1)
    ]


def alignment_deflections(project: Project) -> dict[str, float]:
    """By bend id, the deflection [deg, unsigned] the alignment gives each bend on it,
    from its points alone (radii not needed); {} without an alignment or when its points
    cannot be read."""
    if project.alignment is None:
        return {}
    try:
        xy, ids, _ = _points(project.alignment)
    except InputError:
        return {}
    if len(xy) < 3 or any(math.dist(xy[k], xy[k + 1]) <= 0 for k in range(len(xy) - 1)):
        return {}
    return {i: abs(d) for i, d in zip(ids, signed_deflections(xy), strict=True) if i is not None}


def proposal_inputs(bend: Bend, layout: Layout | None, deflections: dict[str, float]) -> dict:
    """The inputs a bend is proposed for: as evaluated (on a laid-out alignment its
    deflection and PI station are the alignment's); on an alignment that cannot be laid
    out yet (e.g. a bend without a radius) the deflection its points give."""
    inputs = effective_inputs(bend.id, bend.inputs, layout)
    if inputs is bend.inputs and bend.id in deflections:
        inputs = {**bend.inputs, "deflection": deflections[bend.id]}
    return inputs


def propose_bends(
    project: Project, ctx: Context, ids: Iterable[str] | None = None, name=lambda key: key
) -> list[BendProposal]:
    """The proposal for every bend (or those named by ``ids``, in the project's order);
    KeyError naming an id that is no bend of the project."""
    wanted = None if ids is None else list(dict.fromkeys(ids))
    known = {b.id for b in project.bends}
    for i in wanted or []:
        if i not in known:
            raise KeyError(i)
    layout = lay_out_project(project)
    deflections = alignment_deflections(project)
    out = []
    for bend in project.bends:
        if wanted is not None and bend.id not in wanted:
            continue
        inputs = proposal_inputs(bend, layout, deflections)
        try:
            p = propose(bend.kind, inputs, ctx.units, ctx.table, ctx.limits, name=name)
        except InputError as exc:
            out.append(BendProposal(bend, error=str(exc)))
            continue
        p.current = {k: bend.inputs.get(k) for k in p.proposed}
        out.append(BendProposal(bend, p))
    return out


def apply_changes(bend: Bend, values: dict[str, Any]) -> dict[str, Any]:
    """Put ``values`` in the bend's inputs (None clears); returns what they replaced."""
    old = {k: bend.inputs.get(k) for k in values}
    for k, v in values.items():
        if v is None:
            bend.inputs.pop(k, None)
        else:
            bend.inputs[k] = v
    return old


def project_from_points(
    points: tuple[tuple[float, float], ...],
    ids: tuple[str, ...],
    details: Details,
    ctx: Context,
    speed: Any,
    emax: Any = None,
    start_station: float = 0.0,
    alignment_name: str = "",
) -> tuple[Project, list[BendProposal]]:
    """A road project on a chain of PIs (points in the project's units): each PI a road
    bend with ``speed`` (and ``emax``) whose radius, superelevation and spirals are its
    proposal for the deflection the points give. InputError (the option named) when the
    speed or e_max cannot be used; the alignment's verdicts are left to the caller."""
    deflections = [abs(d) for d in signed_deflections(points)]
    bends, proposals = [], []
    for bend_id, deflection in zip(ids, deflections, strict=True):
        raw: dict[str, Any] = {"speed": speed, "deflection": deflection}
        if emax is not None:
            raw["emax"] = emax
        p = propose("road", raw, ctx.units, ctx.table, None)  # named as options (--speed)
        inputs: dict[str, Any] = {"speed": _as_number(speed)}
        if emax is not None:
            inputs["emax"] = _as_number(emax)
        inputs.update({k: v for k, v in p.proposed.items() if v is not None})
        inputs["deflection"] = round(deflection, 9)
        bend = Bend(bend_id, "road", inputs)
        p.current = {k: None for k in p.proposed}
        bends.append(bend)
        proposals.append(BendProposal(bend, p))
    alignment = Alignment(
        name=alignment_name,
        start_station=start_station,
        points=[
            AlignmentPoint(e, n, None if k in (0, len(points) - 1) else ids[k - 1])
            for k, (e, n) in enumerate(points)
        ],
    )
    project = Project(details, bends, alignment=alignment, version=FORMAT_VERSION)
    layout = lay_out_project(project)
    if layout is not None and layout.error is None:
        for bend in bends:  # as an imported alignment stores them (chain.alignment_from_chain)
            pi = layout.overrides[bend.id]["pi_station"]
            bend.inputs["pi_station"] = round(pi, 6)
            bend.station = round(pi, 3)
    return project, proposals


def _as_number(value: Any) -> Any:
    """An option's text as the number a project file stores (100 stays 100)."""
    if isinstance(value, str):
        x = float(value)
        return int(x) if x.is_integer() and abs(x) < 1e15 else x
    return value
