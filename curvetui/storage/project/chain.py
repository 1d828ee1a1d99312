"""A project's alignment as a chain (``curvetui.core.alignment.Chain``, SI) and back.

``chain_of(project)`` reads the points (or start, bearing and legs) in the project's units
and each PI's bend radius and spiral lengths (the bend's own inputs); ``lay_out_project``
builds it and gives each bend on it the deflection and PI station the alignment makes
(they replace the bend's stored ones when it is evaluated: the alignment governs).
``alignment_from_chain`` is the way back (import of exchange files): the alignment object
of the project file and each bend's geometric inputs. A chain that cannot be laid out gets
``AlignmentProblem``, a message naming the point by its JSON path.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from typing import Any

from curvetui.core.alignment import Alignment, Chain
from curvetui.core.units import UnitSystem, unit_system
from curvetui.inputs import InputError
from curvetui.storage.project.model import Alignment as FileAlignment
from curvetui.storage.project.model import Project

# a PI whose tangents turn by less than this is in line with its neighbours (numerical:
# the deflection's own lower bound in bend/fields.py is 'greater than 0')
IN_LINE = 1e-9  # [rad]


class AlignmentProblem(InputError):
    """An alignment that cannot be laid out; the message names the point (JSON path)."""


@dataclass
class Layout:
    """A project's laid-out alignment: the chain (SI), the built alignment, the bend id at
    each PI and, by bend id, the inputs the alignment sets (deflection [deg], pi_station in
    the project's units); or the error that stopped it."""

    chain: Chain | None = None
    built: Alignment | None = None
    bend_ids: list[str] = field(default_factory=list)
    overrides: dict[str, dict[str, float]] = field(default_factory=dict)
    error: str | None = None


def _number(value: Any, where: str) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float) or not math.isfinite(value):
        raise AlignmentProblem(f"{where}: must be a number, got {value!r}")
    return float(value)


def _points(a: FileAlignment) -> tuple[list[tuple[float, float]], list[str | None], list[str]]:
    """Points (project units), the bend at each PI, and each point's JSON path."""
    if a.points is not None:
        where = [f"$.alignment.points[{i}]" for i in range(len(a.points))]
        xy = [
            (_number(p.easting, f"{w}.easting"), _number(p.northing, f"{w}.northing"))
            for p, w in zip(a.points, where, strict=True)
        ]
        ends = (a.points[0].bend, a.points[-1].bend) if a.points else (None, None)
        for end, w in zip(ends, (where[:1] or ["$"]) + (where[-1:] or ["$"]), strict=True):
            if end is not None:
                raise AlignmentProblem(
                    f"{w}.bend: the start and end points name no bend (only PIs do)"
                )
        return xy, a.bend_ids(), where
    legs = a.legs or []
    start = a.start
    if start is None:
        raise AlignmentProblem("$.alignment.start: missing")
    e = _number(start.easting, "$.alignment.start.easting")
    n = _number(start.northing, "$.alignment.start.northing")
    heading = math.radians(_number(a.start_bearing, "$.alignment.start_bearing"))
    xy, where = [(e, n)], ["$.alignment.start"]
    for i, leg in enumerate(legs):
        w = f"$.alignment.legs[{i}]"
        length = _number(leg.length, f"{w}.length")
        e, n = e + length * math.sin(heading), n + length * math.cos(heading)
        xy.append((e, n))
        where.append(w)
        last = i == len(legs) - 1
        if last and (leg.bend is not None or leg.deflection is not None):
            raise AlignmentProblem(f"{w}: the last leg ends at the end point: no bend there")
        if not last:
            if leg.deflection is None:
                raise AlignmentProblem(f"{w}.deflection: a PI needs its deflection")
            heading += math.radians(_number(leg.deflection, f"{w}.deflection"))
    return xy, a.bend_ids(), where


def chain_of(project: Project) -> Chain:
    """The project's alignment in SI, with each PI's radius and spirals from its bend."""
    a = project.alignment
    if a is None:
        raise AlignmentProblem("$.alignment: the project has no alignment")
    units = unit_system(project.details.units)
    xy, ids, where = _points(a)
    if len(xy) < 3:
        raise AlignmentProblem(
            f"$.alignment: {len(xy)} point(s); an alignment needs a start point, at least "
            "one PI and an end point"
        )
    bends = {b.id: (i, b) for i, b in enumerate(project.bends)}
    seen: dict[str, str] = {}
    radii, s_in, s_out = [], [], []
    for k, bend_id in enumerate(ids):
        w = where[k + 1]
        if bend_id is None:
            raise AlignmentProblem(f'{w}: PI {k + 1} names no bend (give "bend": an id)')
        if bend_id not in bends:
            raise AlignmentProblem(f"{w}.bend: {bend_id!r} is not a bend of this project")
        if bend_id in seen:
            raise AlignmentProblem(f"{w}.bend: {bend_id!r} is at {seen[bend_id]} already")
        seen[bend_id] = w
        index, bend = bends[bend_id]
        inputs = bend.inputs
        radius = inputs.get("radius")
        path = f"$.bends[{index}].inputs"
        if isinstance(radius, bool) or not isinstance(radius, int | float) or radius <= 0:
            raise AlignmentProblem(
                f"{path}.radius: {bend_id} at PI {k + 1} needs a radius greater than 0"
            )
        lin = inputs.get("spiral_in")
        lout = inputs.get("spiral_out", lin)
        lin, lout = (0.0 if v in (None, "") else _number(v, f"{path}.spiral") for v in (lin, lout))
        radii.append(float(units.length_to_si(radius)))
        s_in.append(float(units.length_to_si(lin)))
        s_out.append(float(units.length_to_si(lout)))
    for k in range(len(xy) - 1):
        if math.dist(xy[k], xy[k + 1]) <= 0:
            raise AlignmentProblem(f"{where[k + 1]}: coincides with {where[k]}")
    for k in range(1, len(xy) - 1):
        (e0, n0), (e1, n1), (e2, n2) = xy[k - 1], xy[k], xy[k + 1]
        turn = math.atan2(e2 - e1, n2 - n1) - math.atan2(e1 - e0, n1 - n0)
        turn = (turn + math.pi) % (2 * math.pi) - math.pi
        if abs(turn) < IN_LINE:
            raise AlignmentProblem(
                f"{where[k]}: PI {k} ({ids[k - 1]}) is in line with its neighbours: no deflection"
            )
        if abs(abs(turn) - math.pi) < IN_LINE:
            raise AlignmentProblem(f"{where[k]}: PI {k} ({ids[k - 1]}) turns straight back")
    points = tuple((float(units.length_to_si(e)), float(units.length_to_si(n))) for e, n in xy)
    start = _number(a.start_station, "$.alignment.start_station")
    return Chain(
        points,
        tuple(radii),
        tuple(s_in),
        tuple(s_out),
        float(units.length_to_si(start)),
        a.name,
    )


def lay_out_project(project: Project) -> Layout | None:
    """The project's alignment laid out (None without one); a problem goes in ``error``."""
    if project.alignment is None:
        return None
    units = unit_system(project.details.units)
    try:
        chain = chain_of(project)
        # the sourced checks between bends are curvetui.core.alignment_checks'
        built = chain.lay_out(reverse_tangent_min=0.0, broken_back_tangent_min=0.0)
    except InputError as exc:
        return Layout(error=str(exc))
    except ValueError as exc:  # AlignmentError, or the engine's GeometryError
        return Layout(error=_named(str(exc), project.alignment))
    ids = [i for i in project.alignment.bend_ids() if i is not None]
    overrides = {
        bend_id: {
            "deflection": math.degrees(b.deflection),
            "pi_station": float(units.length_from_si(b.pi_station)),
        }
        for bend_id, b in zip(ids, built.bends, strict=True)
    }
    return Layout(chain, built, ids, overrides)


def _named(text: str, a: FileAlignment) -> str:
    """The engine's "PI k: ..." as "$.alignment.points[k] (PI k, bend ID): ..."."""
    match = re.match(r"PI (\d+): ", text)
    ids = a.bend_ids()
    if match and 1 <= int(match.group(1)) <= len(ids):
        k = int(match.group(1))
        part = "points" if a.points is not None else "legs"
        index = k if a.points is not None else k - 1
        where = f"$.alignment.{part}[{index}] (PI {k}, bend {ids[k - 1]})"
        return f"{where}: {text[match.end() :]}"
    return f"$.alignment: {text}"


def alignment_from_chain(
    chain: Chain, units: UnitSystem, bend_ids: list[str] | None = None, places: int = 6
) -> tuple[dict[str, Any], dict[str, dict[str, float]]]:
    """The project file's ``alignment`` object (points form, the project's units) and, by
    bend id, each PI bend's geometric inputs: radius, spiral_in, spiral_out (when unequal),
    deflection [deg] and pi_station as the chain lays them out. Ids default to B01, B02...
    Raises AlignmentProblem when the chain cannot be laid out."""
    n = len(chain.points) - 2
    ids = list(bend_ids) if bend_ids is not None else [f"B{i + 1:02d}" for i in range(n)]
    if len(ids) != n or len(set(ids)) != n:
        raise AlignmentProblem(f"{n} PIs need {n} different bend ids, got {ids!r}")
    try:
        built = chain.lay_out(reverse_tangent_min=0.0, broken_back_tangent_min=0.0)
    except ValueError as exc:  # AlignmentError, or the engine's GeometryError
        raise AlignmentProblem(f"$.alignment: {exc}") from None

    def length(x: float) -> float:
        return round(float(units.length_from_si(x)), places)

    points: list[dict[str, Any]] = []
    for k, (e, n_) in enumerate(chain.points):
        p: dict[str, Any] = {"easting": length(e), "northing": length(n_)}
        if 0 < k <= n:
            p["bend"] = ids[k - 1]
        points.append(p)
    alignment = {"name": chain.name, "start_station": length(chain.start_station), "points": points}
    inputs: dict[str, dict[str, float]] = {}
    for k, b in enumerate(built.bends):
        one = {
            "radius": length(chain.radii[k]),
            "deflection": round(math.degrees(b.deflection), 9),
            "pi_station": length(b.pi_station),
        }
        if chain.spirals_in[k] > 0 or chain.spirals_out[k] > 0:
            one["spiral_in"] = length(chain.spirals_in[k])
            if chain.spirals_out[k] != chain.spirals_in[k]:
                one["spiral_out"] = length(chain.spirals_out[k])
        inputs[ids[k]] = one
    return alignment, inputs


def effective_inputs(bend_id: str, inputs: dict[str, Any], layout: Layout | None) -> dict:
    """A bend's inputs for evaluation: on a laid-out alignment its deflection and PI
    station are the alignment's."""
    if layout is None or bend_id not in layout.overrides:
        return inputs
    return {**inputs, **layout.overrides[bend_id]}


def direction_on(layout: Layout | None, bend_id: str) -> int:
    """+1 for a bend turning right on the alignment, -1 left; +1 off it (the plan of a
    bend alone is drawn turning right)."""
    if layout is None or layout.built is None or bend_id not in layout.bend_ids:
        return 1
    return layout.built.bends[layout.bend_ids.index(bend_id)].direction
