"""The realigned curve's cant verdicts through the one rail-bend path.

The designed radius and transition lengths (core.versine_design) are given to
``bend.service.evaluate_bend`` as a rail bend's radius, spiral in and spiral out, with the
line speeds, cant, gauge and traffic as the field list names them; a cant not given is
proposed (``bend.propose``, the cant on the step inside the limits). Every verdict is the
bend record's: cant, deficiency, excess, balance, and whether the transitions are long
enough for the cant's gradient and rates.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from curvetui.core.rail import RailLimits
from curvetui.core.units import UnitSystem
from curvetui.core.versine_design import RealignDesign
from curvetui.inputs import InputError

RAIL_KEYS = ("speed", "low_speed", "cant", "gauge", "traffic")  # inputs the realign takes


@dataclass(frozen=True)
class RealignRail:
    """The rail record of the designed curve (None when it could not be checked), the
    cant proposed when none was given (user units), and what was done, in words."""

    record: dict | None
    proposed_cant: float | None
    notes: tuple[str, ...] = field(default_factory=tuple)

    @property
    def status(self) -> str:
        return "fail" if self.record is None else str(self.record["status"])


def _round(x: float) -> float:
    """A length as given to the bend path: 6 significant figures (the record rounds it)."""
    return float(f"{x:.6g}")


def rail_verdict(
    design: RealignDesign, raw: dict[str, Any], units: UnitSystem, limits: RailLimits
) -> RealignRail:
    """Check the designed curve for the rail inputs ``raw`` (user units; ``speed`` needed)."""
    from curvetui.bend.propose import propose
    from curvetui.bend.service import evaluate_bend

    ln = units.length_label
    bend = {k: raw[k] for k in RAIL_KEYS if raw.get(k) is not None}
    bend["radius"] = _round(float(units.length_from_si(design.radius)))
    bend["spiral_in"] = _round(float(units.length_from_si(design.transition_in)))
    bend["spiral_out"] = _round(float(units.length_from_si(design.transition_out)))
    notes = []
    proposed = None
    if "cant" not in bend:
        try:
            p = propose("rail", {k: v for k, v in bend.items() if k != "cant"}, units, None, limits)
        except InputError as exc:
            return RealignRail(None, None, (f"no cant could be proposed: {exc}",))
        radius = p.proposed.get("radius")
        if radius is not None and abs(float(radius) - bend["radius"]) > 1e-9 * bend["radius"]:
            return RealignRail(
                None,
                None,
                (
                    f"no cant serves both trains at the designed R {bend['radius']:g} {ln}: "
                    f"the proposal needs R {float(radius):g} {ln} ("
                    + "; ".join(p.reasons)
                    + "); give --cant to check one",
                ),
            )
        proposed = float(p.proposed["cant"])
        bend["cant"] = proposed
        notes.append(
            f"cant proposed: {proposed:g} {units.cant_label} (" + "; ".join(p.reasons) + ")"
        )
    try:
        record = evaluate_bend("rail", bend, units, None, limits)
    except InputError as exc:
        return RealignRail(
            None, proposed, (*notes, f"the designed curve could not be checked: {exc}")
        )
    t = record.get("transition") or {}
    need = t.get("length")
    if need is not None:
        ok = t.get("status") == "pass"
        notes.append(
            f"transitions {bend['spiral_in']:g} and {bend['spiral_out']:g} {ln}: "
            f"{'long enough' if ok else 'TOO SHORT'} for the {need:g} {ln} the "
            f"{t.get('governing', 'cant')} needs"
        )
    return RealignRail(record, proposed, tuple(notes))
