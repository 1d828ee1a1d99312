"""The project model: details and an ordered list of bends, each with its inputs.

What a file holds is written back as it was read: inputs as stored (100 stays 100, a null
the file holds stays null: ``nulls``), and a key the file left out (``absent``) stays out
while it keeps its default. An input left empty in memory (None or '') is left out.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from pathlib import Path
from typing import Any

FORMAT_VERSION = 3  # the newest format read
PLAIN_VERSION = 2  # written when the project holds no alignment: such files stay format 2
DETAIL_FIELDS = (
    "name",
    "client",
    "job_number",
    "designer",
    "checker",
    "date",
    "revision",
    "drawing",
    "units",
    "road_table",
    "rail_limits",
    "notes",
)


@dataclass
class Details:
    """Project metadata; units are 'metric' or 'us'."""

    name: str
    units: str = "metric"
    client: str = ""
    job_number: str = ""
    designer: str = ""
    checker: str = ""
    date: str = ""
    revision: str = ""
    drawing: str = ""
    road_table: str | None = None
    rail_limits: str | None = None
    notes: str = ""
    absent: frozenset[str] = field(default=frozenset(), repr=False, compare=False)

    def to_json(self) -> dict[str, Any]:
        default = {f.name: f.default for f in fields(self)}
        return {
            k: getattr(self, k)
            for k in DETAIL_FIELDS
            if not (k in self.absent and getattr(self, k) == default[k])
        }


@dataclass
class Bend:
    """One bend: its inputs in the project's units, notes, and the results stored at save."""

    id: str
    kind: str  # "road" or "rail"
    inputs: dict[str, Any]
    station: float = 0.0
    notes: str = ""
    results: dict[str, Any] | None = None
    absent: frozenset[str] = field(default=frozenset(), repr=False, compare=False)
    nulls: frozenset[str] = field(default=frozenset(), repr=False, compare=False)

    def to_json(self) -> dict[str, Any]:
        inputs = {
            k: v for k, v in self.inputs.items() if v != "" and (v is not None or k in self.nulls)
        }
        out = {
            "id": self.id,
            "kind": self.kind,
            "station": self.station,
            "inputs": inputs,
            "notes": self.notes,
            "results": self.results,
        }
        default = {"station": 0.0, "notes": "", "results": None}
        return {k: v for k, v in out.items() if not (k in self.absent and v == default.get(k))}


@dataclass
class AlignmentPoint:
    """A point of the alignment in the project's units; interior points (PIs) name a bend."""

    easting: Any
    northing: Any
    bend: str | None = None

    def to_json(self) -> dict[str, Any]:
        out = {"easting": self.easting, "northing": self.northing}
        return out if self.bend is None else {**out, "bend": self.bend}


@dataclass
class AlignmentLeg:
    """The stations-and-deflections form: the distance from the previous point to this PI
    (or to the end point), and at a PI its bend and signed deflection [deg, + right]."""

    length: Any
    bend: str | None = None
    deflection: Any = None

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {"length": self.length}
        if self.deflection is not None:
            out["deflection"] = self.deflection
        return out if self.bend is None else {**out, "bend": self.bend}


@dataclass
class Alignment:
    """The project's alignment as the file gives it (numbers as stored, project units).

    Either ``points`` (start, PI 1 .. PI n, end by easting and northing) or ``start``,
    ``start_bearing`` [deg, clockwise from north] and ``legs``; written back in the form
    read. The geometry is laid out by ``curvetui.storage.project.chain``."""

    name: str = ""
    start_station: Any = 0.0
    points: list[AlignmentPoint] | None = None
    start: AlignmentPoint | None = None
    start_bearing: Any = None
    legs: list[AlignmentLeg] | None = None
    absent: frozenset[str] = field(default=frozenset(), repr=False, compare=False)

    def bend_ids(self) -> list[str | None]:
        """The bend named at each PI, in order (None where a PI names none)."""
        if self.points is not None:
            return [p.bend for p in self.points[1:-1]]
        return [leg.bend for leg in (self.legs or [])[:-1]]

    def rename_bend(self, old: str, new: str) -> None:
        for each in [*(self.points or []), *(self.legs or [])]:
            if each.bend == old:
                each.bend = new

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {"name": self.name, "start_station": self.start_station}
        out = {k: v for k, v in out.items() if not (k in self.absent and v in ("", 0.0))}
        if self.points is not None:
            out["points"] = [p.to_json() for p in self.points]
        else:
            out["start"] = self.start.to_json() if self.start else None
            out["start_bearing"] = self.start_bearing
            out["legs"] = [leg.to_json() for leg in self.legs or []]
        return out


@dataclass
class Project:
    details: Details
    bends: list[Bend] = field(default_factory=list)
    # the folder of the file it was loaded from (tables named by path are looked up there)
    folder: Path | None = field(default=None, compare=False, repr=False)
    alignment: Alignment | None = None
    # the format version the file had (a format 3 file without an alignment stays 3)
    version: int = field(default=PLAIN_VERSION, compare=False, repr=False)

    def to_json(self) -> dict[str, Any]:
        version = FORMAT_VERSION if self.alignment is not None else self.version
        out: dict[str, Any] = {
            "curvetui_project_version": version,
            "details": self.details.to_json(),
            "bends": [b.to_json() for b in self.bends],
        }
        if self.alignment is not None:
            out["alignment"] = self.alignment.to_json()
        return out

    def bend(self, bend_id: str) -> Bend:
        for b in self.bends:
            if b.id == bend_id:
                return b
        raise KeyError(bend_id)

    def new_bend_id(self, prefix: str = "B") -> str:
        taken = {b.id for b in self.bends}
        n = len(self.bends) + 1
        while f"{prefix}{n:02d}" in taken:
            n += 1
        return f"{prefix}{n:02d}"
