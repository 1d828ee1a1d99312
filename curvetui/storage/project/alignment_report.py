"""The project's alignment checked as a whole: the table of PIs and the verdicts between
consecutive bends, for every face (check --project text and JSON, the app, the worksheet).

The verdicts are decided in ``curvetui.core.alignment_checks`` from the laid-out
alignment and each bend's evaluated record (speed, radius, the runoff a bend without
spirals places on the tangent: ``runoff_on_tangent x L_r``; a spiralled bend: 0).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from curvetui.core.alignment_checks import FAIL, BendFacts, Verdict, check_consecutive
from curvetui.core.units import UnitSystem
from curvetui.stations import format_station
from curvetui.storage.project.chain import Layout

PASS, WARNING, ERROR = "pass", "warning", "error"
COLUMNS = (
    "PI",
    "Bend",
    "Easting",
    "Northing",
    "Deflection",
    "R",
    "Ls in",
    "Ls out",
    "TS/PC",
    "SC",
    "PI station",
    "CS",
    "ST/PT",
    "Tangent after",
)

NARROW_OUT = ("Easting", "Northing", "SC", "CS", "Ls out")


@dataclass
class AlignmentReport:
    """Rows (one per PI, numbers in the project's units), tangents (start->first bend,
    between bends, last bend->end), end station, verdicts, or the error that stopped it."""

    name: str
    units: UnitSystem
    rows: list[dict[str, Any]] = field(default_factory=list)
    tangents: list[float] = field(default_factory=list)
    start_station: float = 0.0
    end_station: float = 0.0
    verdicts: list[Verdict] = field(default_factory=list)
    error: str | None = None
    layout: Layout | None = None

    @property
    def status(self) -> str:
        if self.error:
            return ERROR
        if any(v.severity == FAIL for v in self.verdicts):
            return "fail"
        return WARNING if self.verdicts else PASS

    def lines(self) -> list[str]:
        """The verdicts (or the error) as lines of text."""
        if self.error:
            return [f"alignment: ERROR {self.error}"]
        return [f"alignment: {v.text}" for v in self.verdicts]

    def to_json(self) -> dict[str, Any]:
        ids = [r["bend"] for r in self.rows]
        return {
            "name": self.name,
            "status": self.status,
            "error": self.error,
            "start_station": self.start_station,
            "end_station": self.end_station,
            "pis": self.rows,
            "tangents": self.tangents,
            "verdicts": [
                {
                    "severity": v.severity,
                    "code": v.code,
                    "between": [
                        ids[v.first] if v.first >= 0 else "start",
                        ids[v.second] if v.second >= 0 else "end",
                    ],
                    "value": v.value if v.code == "compound_ratio" else self._len(v.value),
                    "limit": v.limit if v.code == "compound_ratio" else self._len(v.limit),
                    "text": v.text,
                }
                for v in self.verdicts
            ],
        }

    def _len(self, metres: float) -> float:
        return float(self.units.length_from_si(metres))

    def table(self, compact: bool = False) -> tuple[tuple[str, ...], list[tuple[str, ...]]]:
        """The table of PIs as text cells (stations written 1+234.56), for every face;
        ``compact`` leaves out the coordinates, SC and CS (a narrow terminal)."""
        u = self.units.name

        def st(x):
            return "-" if x is None else format_station(x, u, 2)

        out = []
        for r in self.rows:
            spiral = r["spiral_in"] > 0 or r["spiral_out"] > 0
            out.append(
                (
                    str(r["pi"]),
                    r["bend"],
                    f"{r['easting']:.3f}",
                    f"{r['northing']:.3f}",
                    f"{r['deflection']:.4f} {r['direction']}",
                    f"{r['radius']:g}",
                    f"{r['spiral_in']:g}" if spiral else "-",
                    f"{r['spiral_out']:g}" if spiral else "-",
                    st(r["ts"]),
                    st(r["sc"]) if spiral else "-",
                    st(r["pi_station"]),
                    st(r["cs"]) if spiral else "-",
                    st(r["st"]),
                    f"{r['tangent_after']:.2f}",
                )
            )
        if compact:
            keep = [i for i, c in enumerate(COLUMNS) if c not in NARROW_OUT]
            return tuple(COLUMNS[i] for i in keep), [tuple(row[i] for i in keep) for row in out]
        return COLUMNS, out


def bend_facts(bend_id: str, kind: str, record: dict | None, units: UnitSystem) -> BendFacts:
    """What the checks between bends need of one evaluated bend, in SI. A bend whose
    record is missing (an input error) counts as kind 'error': only overlap is checked."""
    if record is None:
        return BendFacts(bend_id, "error", math.nan, math.nan)
    speed = float(units.speed_to_si(record["speed"]))
    radius = float(units.length_to_si(record["radius"]))
    share = 0.0
    transition = record.get("transition") or {}
    geometry = record.get("geometry") or {}
    if geometry.get("type") == "circular" and transition.get("runoff") is not None:
        fraction = transition.get("runoff_on_tangent")
        if fraction is not None:
            share = float(units.length_to_si(fraction * transition["runoff"]))
    return BendFacts(bend_id, kind, speed, radius, share, share)


def alignment_report(
    project, layout: Layout | None, records: dict[str, dict | None], units: UnitSystem
) -> AlignmentReport | None:
    """The report for a project's alignment (None without one); ``records`` by bend id."""
    a = project.alignment
    if a is None or layout is None:
        return None
    rep = AlignmentReport(a.name, units, layout=layout)
    if layout.error or layout.built is None or layout.chain is None:
        rep.error = layout.error
        return rep
    built, chain = layout.built, layout.chain
    kinds = {b.id: b.kind for b in project.bends}
    facts = [bend_facts(i, kinds[i], records.get(i), units) for i in layout.bend_ids]

    def length(x: float) -> float:
        return float(units.length_from_si(x))

    per_unit = float(units.length_to_si(1.0))  # metres in one of the project's length units
    rep.verdicts = check_consecutive(built, facts, (units.length_label, per_unit))
    rep.tangents = [length(t) for t in built.tangents]
    rep.start_station = length(chain.start_station)
    rep.end_station = length(built.end_station)
    for k, (bend_id, b) in enumerate(zip(layout.bend_ids, built.bends, strict=True)):
        g = b.geometry
        spiral = float(g.ls_in) > 0 or float(g.ls_out) > 0
        e, n = chain.points[k + 1]
        rep.rows.append(
            {
                "pi": k + 1,
                "bend": bend_id,
                "easting": length(e),
                "northing": length(n),
                "deflection": math.degrees(b.deflection),
                "direction": "R" if b.direction > 0 else "L",
                "radius": length(chain.radii[k]),
                "spiral_in": length(float(g.ls_in)),
                "spiral_out": length(float(g.ls_out)),
                "ts": length(float(g.ts)),
                "sc": length(float(g.sc)) if spiral else None,
                "pi_station": length(b.pi_station),
                "cs": length(float(g.cs)) if spiral else None,
                "st": length(float(g.st)),
                "tangent_before": length(built.tangents[k]),
                "tangent_after": length(built.tangents[k + 1]),
            }
        )
    return rep
