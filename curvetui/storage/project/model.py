"""The project model: details and an ordered list of bends, each with its inputs.

What a file holds is written back as it was read: inputs as stored (100 stays 100, a null
the file holds stays null: ``nulls``), and a key the file left out (``absent``) stays out
while it keeps its default. An input left empty in memory (None or '') is left out.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from pathlib import Path
from typing import Any

FORMAT_VERSION = 2
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
class Project:
    details: Details
    bends: list[Bend] = field(default_factory=list)
    # the folder of the file it was loaded from (tables named by path are looked up there)
    folder: Path | None = field(default=None, compare=False, repr=False)

    def to_json(self) -> dict[str, Any]:
        return {
            "curvetui_project_version": FORMAT_VERSION,
            "details": self.details.to_json(),
            "bends": [b.to_json() for b in self.bends],
        }

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
