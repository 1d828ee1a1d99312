"""Changing a project's units (no Textual): every stored speed, length, station and cant of
every bend converted, and the tables switched to ones made for the new units.

Conversion factors are exact (1 ft = 0.3048 m, 1 mph = 0.44704 m/s, 1 in = 25.4 mm:
``curvetui.core.units``); a converted value keeps 10 significant figures, so that a value
converted there and back reads as it did (100 km/h -> 62.13711922 mph -> 100 km/h).
Percentages, angles, factors and the gauge (always mm) do not change.
"""

from __future__ import annotations

from dataclasses import dataclass

from curvetui.bend.fields import BY_KEY, CANT, LENGTH, SPEED, STATION
from curvetui.core.units import UnitSystem, unit_system
from curvetui.stations import parse_station
from curvetui.storage.project.model import Bend, Project

SIGNIFICANT = 10


@dataclass(frozen=True)
class UnitChange:
    """What changing ``old`` to ``new`` does: the tables the project will then name (None:
    the default for the units) and the bends whose values are converted."""

    old: str
    new: str
    road_table: str | None
    rail_limits: str | None
    bends: int

    def question(self) -> str:
        """The question the app asks before converting."""
        old, new = unit_system(self.old), unit_system(self.new)
        example = convert(100.0, SPEED, old, new)
        from curvetui.storage.tables import DEFAULT_RAIL_LIMITS, DEFAULT_ROAD_TABLE

        road = self.road_table or f"{DEFAULT_ROAD_TABLE[new.name]} (the default)"
        rail = self.rail_limits or f"{DEFAULT_RAIL_LIMITS[new.name]} (the default)"
        return (
            f"Change the units from {_name(old)} to {_name(new)}?\n"
            f"The speeds, radii, lengths, stations and cants of all {self.bends} bends are "
            f"converted (100 {old.speed_label} becomes {example:.6g} {new.speed_label}); "
            f"the road table becomes {road} and the rail limits {rail}."
        )


def _name(units: UnitSystem) -> str:
    return {"metric": "metric (km/h, m, mm)", "us": "US customary (mph, ft, in)"}[units.name]


def convert(value: float, kind: str, old: UnitSystem, new: UnitSystem) -> float:
    """A value of unit ``kind`` (speed, length, station or cant) from ``old`` to ``new``."""
    factor = {
        SPEED: old.speed / new.speed,
        LENGTH: old.length / new.length,
        STATION: old.length / new.length,
        CANT: old.cant / new.cant,
    }[kind]
    return float(f"{value * factor:.{SIGNIFICANT}g}")


def convert_bend(bend: Bend, old: UnitSystem, new: UnitSystem) -> None:
    """Every stored value of ``bend`` that has a unit, from ``old`` to ``new`` units; a
    station written as text (2+710) is read first. Text that is no number stays as typed."""
    for key, value in list(bend.inputs.items()):
        field = BY_KEY.get(key)
        if field is None or field.unit not in (SPEED, LENGTH, STATION, CANT):
            continue
        if isinstance(value, str) and field.unit == STATION:
            try:
                value = parse_station(value, old.name)
            except ValueError:
                continue
        if isinstance(value, int | float) and not isinstance(value, bool):
            bend.inputs[key] = convert(value, field.unit, old, new)
    bend.station = convert(bend.station, STATION, old, new)


def matching_table(name: str | None, new: str, known: dict[str, str]) -> str | None:
    """The table to use in ``new`` units instead of ``name`` (``known``: name -> units):
    ``name`` itself when made for them, its twin (``...-metric`` / ``...-us``) when there is
    one, else None (the default table for the units)."""
    if name is None or known.get(name) == new:
        return name
    for old_word, new_word in (("-metric", "-us"), ("-us", "-metric")):
        if name.endswith(old_word):
            twin = name[: -len(old_word)] + new_word
            if known.get(twin) == new:
                return twin
    return None


def plan_change(
    project: Project, new: str, road_known: dict[str, str], rail_known: dict[str, str]
) -> UnitChange:
    d = project.details
    return UnitChange(
        d.units,
        new,
        matching_table(d.road_table, new, road_known),
        matching_table(d.rail_limits, new, rail_known),
        len(project.bends),
    )


def apply_change(project: Project, change: UnitChange) -> None:
    """Convert every bend and switch the units and tables of ``project``."""
    old, new = unit_system(change.old), unit_system(change.new)
    for bend in project.bends:
        convert_bend(bend, old, new)
    d = project.details
    d.units, d.road_table, d.rail_limits = change.new, change.road_table, change.rail_limits
