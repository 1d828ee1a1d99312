"""Proposals for one bend in the project's units: the inputs a designer would start from,
each with its rule and source as a text line, and the proposed bend evaluated through the
one path (parse -> evaluate -> record) so that its verdict is the check's own.

The inputs are read by ``curvetui.bend.parse`` (the field list's ranges; a speed outside
the table is refused with the table's range like every other input); the fields the
proposal replaces may be blank or wrong (road: radius, superelevation, spirals; rail:
cant, spirals, and a blank radius). The numbers come from curvetui.core.proposals_road
and curvetui.core.proposals_rail.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

from curvetui import CAUTION
from curvetui.bend.evaluate import DEFAULT_LANE_WIDTH
from curvetui.bend.fields import BY_KEY, cli_name
from curvetui.bend.parse import parse
from curvetui.bend.road_transition import DEFAULT_SHARE, SPIRAL_CONSTANTS
from curvetui.bend.service import Namer, check_bend, columns_from_values
from curvetui.core import proposals_road as pq
from curvetui.core.rail import RailLimits
from curvetui.core.road_table import RoadTable
from curvetui.core.superelevation import NORMAL_CROWN, REMOVE_CROWN
from curvetui.core.units import UnitSystem
from curvetui.inputs import InputError

# the inputs a proposal sets (None: left blank), and those it may replace when wrong
PROPOSED = {
    "road": ("radius", "superelevation", "spiral_in", "spiral_out"),
    "rail": ("radius", "cant", "spiral_in", "spiral_out"),
}
REPLACED = {
    "road": ("radius", "superelevation", "spiral_in", "spiral_out"),
    "rail": ("cant", "spiral_in", "spiral_out"),
}


@dataclass
class Proposal:
    """A bend's proposal: ``proposed`` input values in the project's units (None: blank),
    the ``current`` ones as given, the reasons (one line per rule, with its source), key
    figures, the proposed bend's inputs and its record (the check's verdict)."""

    kind: str
    units: str
    proposed: dict[str, float | None]
    current: dict[str, Any]
    reasons: list[str]
    figures: dict[str, Any]
    inputs: dict[str, Any]
    record: dict = field(default_factory=dict)

    @property
    def status(self) -> str:
        return str(self.record.get("status", "error"))

    def changes(self) -> dict[str, float | None]:
        """The proposed values that differ from the current ones."""
        return {k: v for k, v in self.proposed.items() if not _same(self.current.get(k), v)}

    def to_json(self) -> dict:
        return {
            "kind": self.kind,
            "units": self.units,
            "proposed": self.proposed,
            "current": self.current,
            "reasons": self.reasons,
            "figures": {k: _finite(v) for k, v in self.figures.items()},
            "inputs": self.inputs,
            "evaluation": self.record,
            "caution": CAUTION,
        }


def _same(old, new) -> bool:
    if old is None or (isinstance(old, str) and not old.strip()):
        return new is None
    if new is None:
        return False
    try:
        return math.isclose(float(old), float(new), rel_tol=1e-12, abs_tol=1e-12)
    except (TypeError, ValueError):
        return False


def _finite(v):
    return None if isinstance(v, float) and not math.isfinite(v) else v


def _clean(x: float) -> float:
    """A proposed value without float noise (395.00000000000006 -> 395.0)."""
    return float(f"{x:.10g}")


def _g(x: float) -> str:
    """A length or cant as the reasons quote it: whole numbers without decimals."""
    if math.isfinite(x) and abs(x - round(x)) < 1e-9 * max(1.0, abs(x)):
        return f"{x:,.0f}"
    return f"{x:,.1f}" if abs(x) >= 100 else f"{x:.3g}"


def propose(
    kind: str,
    raw: Mapping[str, Any],
    units: UnitSystem,
    table: RoadTable | None,
    limits: RailLimits | None,
    name: Namer = cli_name,
) -> Proposal:
    """The proposal for one bend's inputs ``raw`` (as a project file or the command line
    gives them); InputError naming each field and its range for input that cannot be used."""
    kind = str(kind).strip().lower()
    if kind not in PROPOSED:
        raise InputError(f"{name('kind')}: must be 'road' or 'rail', got {kind!r}")
    given = {k: v for k, v in raw.items() if k in BY_KEY}
    columns = columns_from_values({k: [v] for k, v in given.items()}, units)
    parsed = parse([kind], columns, units, table, limits)
    issues = [
        i
        for i in parsed.issues
        if i.field not in REPLACED[kind] and not (i.field == "radius" and i.text == "required")
    ]
    if issues:
        raise InputError("; ".join(i.format(name) for i in issues))
    si = {k: float(v[0]) for k, v in parsed.si.items() if parsed.present[k][0]}
    if kind == "road":
        p = _road(si, units, table)
        hi = BY_KEY["radius"].allowed("road", units)[1]
        if p.proposed["radius"] > hi:  # only a sight need gets there
            raise InputError(
                f"{name('obstruction_offset')}: too small for a proposal: the sight line "
                f"would need a radius of {p.proposed['radius']:g} {units.length_label}, "
                f"beyond the largest radius allowed ({hi:g} {units.length_label})"
            )
    else:
        from curvetui.bend.propose_rail import rail_proposal
        from curvetui.core.proposals_rail import NoRailProposal

        try:
            p = rail_proposal(si, units, limits)
        except NoRailProposal as exc:
            top = f"{BY_KEY['radius'].allowed('rail', units)[1]:g} {units.length_label}"
            if "deflection" not in si:
                raise InputError(
                    f"{name('speed')}: no radius up to {top} (the largest allowed) admits "
                    f"a cant for both trains"
                ) from exc
            raise InputError(
                f"{name('deflection')}: too small for a proposal: at every radius up to "
                f"{top} (the largest allowed) the transitions the cant needs are longer "
                f"than R x deflection allows (two spirals fit while L / R <= deflection)"
            ) from exc
    p.current = {k: given.get(k) for k in p.proposed}
    inputs = {k: v for k, v in given.items() if k not in p.proposed}
    inputs.update({k: v for k, v in p.proposed.items() if v is not None})
    p.inputs = inputs
    p.record = check_bend(kind, inputs, units, table, limits, name).to_json()
    return p


def _road(si: dict, units: UnitSystem, table: RoadTable) -> Proposal:
    ln, u = units.length_label, units.name
    v = si["speed"]
    e_max = si.get("emax", table.emax_default)
    friction = si.get("friction")
    width = si.get("lane_width", DEFAULT_LANE_WIDTH[u])
    n1 = si.get("lanes_rotated", 1.0)
    offset = si.get("obstruction_offset")
    grade = si.get("grade", 0.0)
    deflection = math.radians(si["deflection"]) if "deflection" in si else None
    p = pq.propose_road(
        table, v, e_max, friction, width, n1, SPIRAL_CONSTANTS[u], u, offset, grade, deflection
    )
    L = units.length_from_si  # noqa: N806 - a length in the user's unit

    def length(x: float) -> str:
        return f"{_g(float(L(x)))} {ln}"

    f_used = friction if friction is not None else float(table.f_max(v)[0])
    f_from = "the friction factor given" if friction is not None else f"table {table.name}"
    speed_txt = f"{float(units.speed_from_si(v)):g} {units.speed_label}"
    reasons = [
        f"minimum radius: R_min = V^2 / (C (e_max + f_max)) with C = "
        f"{table.point_mass_constant:g} in the table's units, V {speed_txt}, e_max "
        f"{100 * e_max:g} %, f_max {f_used:g} ({f_from}) = {length(p.min_radius)}; "
        f"{length(p.min_radius_rounded)} as the table rounds it (Green Book 2018 Eq. 3-10)",
        f"desirable radius: {length(p.desirable_radius)}, where the table's distribution "
        f"({table.distribution}) gives a design e of 2/3 of e_max, "
        f"{100 * pq.DESIRABLE_SHARE * e_max:.2f} % (common practice, no source)",
    ]
    if offset is not None:
        ssd = float(pq.sd.design_stopping_sight_distance(v, u, grade=grade))
        reasons.append(
            f"sight: {length(p.sight_radius)}: the sight line on the inside lane centre "
            f"(radius R - w/2, w {length(width)}) clears the obstruction offset "
            f"{length(offset)} for the design stopping sight distance {length(ssd)}: "
            f"R_lane (1 - cos(S / (2 R_lane))) = m solved with brentq (Green Book 2018 "
            f"Eq. 3-2 and Table 3-1; TxDOT Roadway Design Manual 4.7.9)"
        )
    step = pq.RADIUS_STEP[u]
    step_src = (
        "as the Ethiopian Roads Authority Geometric Design Manual 2002, ch. 8, rounds "
        "393.7 m to 395 m"
        if u == "metric"
        else "common practice, no source"
    )
    if p.governing == "friction":
        why = (
            f"the largest need rounded up to {length(step)} and raised in steps of "
            f"{length(step)} until the friction check with f = {f_used:g} passes"
        )
    else:
        why = f"the {p.governing} radius, the largest need, rounded up to {length(step)}"
    reasons.append(f"proposed radius {length(p.radius)}: {why} ({step_src})")
    step_pct = 100 * table.superelevation_step
    if p.cross_section == NORMAL_CROWN:
        reasons.append(
            f"superelevation: normal crown kept (left blank, the design value): the design e "
            f"{100 * p.e_design:.3f} % is below the table's normal-crown limit "
            f"{100 * table.normal_crown_limit:g} %"
        )
    elif p.cross_section == REMOVE_CROWN:
        reasons.append(
            f"superelevation {100 * p.e_proposed:g} %: remove the adverse crown and build the "
            f"normal cross slope (design e {100 * p.e_design:.3f} %, table {table.name})"
        )
    else:
        reasons.append(
            f"superelevation {_clean(100 * p.e_proposed):g} %: the design e at "
            f"{length(p.radius)}, {100 * p.e_design:.3f} % by the table's distribution, "
            f"rounded up to the table's step of {step_pct:g} %"
        )
    sp = p.spiral
    s_step = pq.SPIRAL_STEP[u]
    rng = f"{length(sp.length_min)} ({sp.governing}) to {length(sp.length_max)}"
    shift_src = "Green Book 2018 sec. 3.3.8, from memory"
    if sp.why == pq.SPIRAL_PROPOSED:
        reasons.append(
            f"spiral {length(sp.length)}: the minimum of the range {rng} rounded up to "
            f"{length(s_step)} ({shift_src}; the step common practice, no source); the "
            f"runoff {length(sp.runoff)} is run over the spiral"
        )
    else:
        if sp.why == pq.SPIRAL_NOT_NEEDED:
            reasons.append(
                f"no spiral: the radius is above the table's largest radius for a spiral at "
                f"{speed_txt}, {length(sp.spiral_radius_max)} (table {table.name}, from memory)"
            )
        else:
            reasons.append(
                f"no spiral: no length on the {length(s_step)} step fits the range {rng}"
                + (" (the maximum includes R x deflection)" if deflection is not None else "")
            )
        share = si.get("runoff_on_tangent", DEFAULT_SHARE)
        runout = f", after a tangent runout of {length(sp.runout)}" if sp.runout > 0 else ""
        reasons.append(
            f"runoff placement: {100 * share:.0f} % of the runoff {length(sp.runoff)} on the "
            f"tangent and the rest on the curve{runout} (AASHTO advises 60 to 90 %: Rosenow, "
            f"MnDOT 2015)"
        )
    proposed = {
        "radius": _clean(float(L(p.radius))),
        "superelevation": _clean(100 * p.e_proposed) if math.isfinite(p.e_proposed) else None,
        "spiral_in": _clean(float(L(sp.length))) if math.isfinite(sp.length) else None,
        "spiral_out": None,
    }
    figures = {
        "min_radius": float(L(p.min_radius)),
        "min_radius_rounded": float(L(p.min_radius_rounded)),
        "desirable_radius": float(L(p.desirable_radius)),
        "desirable_share": pq.DESIRABLE_SHARE,
        "sight_radius": float(L(p.sight_radius)),
        "radius_step": _clean(float(L(step))),
        "governing": p.governing,
        "superelevation_design": 100 * p.e_design,
        "superelevation_step": step_pct,
        "spiral_length_min": float(L(sp.length_min)),
        "spiral_length_max": float(L(sp.length_max)),
        "spiral_step": _clean(float(L(s_step))),
        "spiral": sp.why,
        "runoff": float(L(sp.runoff)),
        "runout": float(L(sp.runout)),
    }
    return Proposal("road", u, proposed, {}, reasons, figures, {})


def proposed_texts(p: Proposal) -> dict[str, str]:
    """Each proposed value as a form shows it ('' for blank), by input key."""
    return {k: "" if v is None else f"{v:g}" for k, v in p.proposed.items()}
