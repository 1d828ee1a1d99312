"""A sign-selection table for existing curves, and the signs it asks for (pure, vectorised).

The table is read from a data file by :mod:`curvetui.storage.sign_tables` (shipped:
MUTCD 2009 Table 2C-5, ``curvetui/data/signs``); this module holds the numbers and the
choice. By the difference between the posted speed and the advisory speed the table's row
gives the warning sign, the advisory speed plaque and the chevrons or large arrow as
"required", "recommended", "optional" or "not required"; the sign itself is Turn where the
advisory speed is at most the table's Turn speed, else Curve. Reverse and Winding Road
signs need consecutive curves and are never chosen for one bend: the table's series
rule (a tangent limit and the signs' names) is applied to a register's consecutive curves
by :mod:`curvetui.core.curve_series` and :mod:`curvetui.bend.series_signs`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from curvetui.core.units import FOOT, KMH, MPH

LEVELS = ("required", "recommended", "optional", "not required")
NOT_REQUIRED = "not required"
PARTS = ("warning_sign", "plaque", "chevrons")


@dataclass(frozen=True)
class SignTable:
    """One authority's sign-selection table and advisory speed method (table units)."""

    name: str
    title: str
    edition: str
    applies_to: str
    units: str  # "us" (mph) or "metric" (km/h): the units of every speed below
    turn_max_advisory: float
    turn_max_advisory_source: str
    reliable_deflection_min: float  # degrees
    reliable_deflection_min_source: str
    consecutive_note: str
    method: str
    method_source: str
    step: float  # advisory speed step in the table's units
    step_source: str
    metric_step: float  # km/h, used on metric projects when the table is in mph
    metric_step_source: str
    rounding: str  # "down" or "nearest"
    rounding_source: str
    friction_from: np.ndarray  # band lower speeds, table units, ascending from 0
    friction: np.ndarray
    friction_sources: tuple[str, ...]
    differences: np.ndarray  # each row's lower difference, table units, ascending
    rows: tuple[dict[str, str], ...]  # per row: part -> level, part_source -> status
    series_tangent: float  # curves closer than this are in series (ft on "us", else m)
    series_tangent_source: str
    reverse_turn: str  # the signs' names
    reverse_curve: str
    winding_road: str
    series_names_source: str
    series_rule_source: str
    same_direction_note: str
    path: str = ""

    @property
    def series_tangent_si(self) -> float:
        """The series tangent limit [m] (600 ft = 182.88 m exactly)."""
        return self.series_tangent * (FOOT if self.units == "us" else 1.0)

    @property
    def length_label(self) -> str:
        return "ft" if self.units == "us" else "m"

    @property
    def speed_unit(self) -> float:
        """m/s per table speed unit."""
        return MPH if self.units == "us" else KMH

    def step_for(self, project_units: str) -> tuple[float, float]:
        """(step in the project's speed unit, m/s per that unit) for the rounding."""
        if project_units == self.units:
            return self.step, self.speed_unit
        if project_units == "metric":
            return self.metric_step, KMH
        return 5.0, MPH  # a metric table on a US project: 5 mph (MUTCD 2C.08, read)


def is_turn(table: SignTable, advisory_si) -> np.ndarray:
    """Whether each curve's sign takes the Turn form (advisory speed [m/s] at most the
    table's Turn speed, 30 mph in MUTCD 2009) rather than the Curve form."""
    with np.errstate(invalid="ignore"):
        return np.asarray(advisory_si, float) / table.speed_unit <= table.turn_max_advisory + 1e-9


def select_signs(table: SignTable, posted_si, advisory_si) -> dict[str, np.ndarray]:
    """The signs of each curve from its posted and advisory speeds [m/s].

    Returns arrays: ``row`` (the table row, -1 below the first difference or without a
    posted speed), ``difference`` [table units], ``sign`` ("Turn"/"Curve"/None) and one
    level word per part (``warning_sign``, ``plaque``, ``chevrons``; None without a
    posted speed). A tiny allowance keeps a difference of exactly 10 mph in the 10 mph
    column despite unit conversion.
    """
    posted = np.asarray(posted_si, dtype=float)
    adv = np.asarray(advisory_si, dtype=float)
    diff = (posted - adv) / table.speed_unit
    known = np.isfinite(diff)
    with np.errstate(invalid="ignore"):
        row = np.searchsorted(table.differences, np.where(known, diff, -np.inf) + 1e-6, "right")
    row = np.where(known, row - 1, -1)
    out: dict[str, np.ndarray] = {"row": row, "difference": diff}
    out["sign"] = np.where(np.isfinite(adv), np.where(is_turn(table, adv), "Turn", "Curve"), None)
    out["sign"] = out["sign"].astype(object)
    for part in PARTS:
        words = np.array([*(r[part] for r in table.rows), NOT_REQUIRED], dtype=object)
        level = words[np.where(row < 0, len(table.rows), row)]
        out[part] = np.where(known, level, None).astype(object)
    return out
