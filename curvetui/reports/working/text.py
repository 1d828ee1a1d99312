"""The line of working and how its numbers are written.

A line's ``substituted`` text is arithmetic a checker can key into a calculator: numbers,
+ - x / ^, parentheses, sqrt, max, min, pi and sin, cos, tan whose argument ends with its
unit, "deg" or "rad"; optionally led by the symbol it gives ("T = ..."). Where a quantity is
solved rather than computed, the line states a comparison (<=, >=, <, >) that must hold.
A line's ``result`` starts with the answer, to the digits the record keeps, so that
evaluating ``substituted`` gives it; a design value follows as the trade shows it
(curvetui.bend.display).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from decimal import Decimal

from curvetui.core.units import UnitSystem


@dataclass(frozen=True)
class Step:
    """One line of working."""

    label: str
    formula: str
    substituted: str
    result: str
    source: str
    check: str = ""  # "pass", "fail" or "" (no check on this line)


def verdict(record: dict, check: str) -> str:
    """A line's pass/fail, read from the record's checks (decided once, on unrounded values,
    by curvetui.bend.evaluate); "" where the check does not apply."""
    return record.get("checks", {}).get(check, "")


def missing(x) -> bool:
    return x is None or (isinstance(x, float) and not math.isfinite(x))


def num(x: float, digits: int = 12) -> str:
    """A record's number as written in an expression: every digit the record keeps (it is
    rounded already; ``digits`` significant figures at most), in fixed notation, negative
    numbers in parentheses."""
    text = format(Decimal(f"{float(x):.{digits}g}"), "f")
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return f"({text})" if text.startswith("-") else text


def ans(x: float) -> str:
    """A record's number as an answer: like ``num`` without parentheses."""
    return num(x).strip("()")


def fixed(x: float, decimals: int) -> str:
    """A length to a fixed number of decimals, rounded as station texts are (negative in
    parentheses)."""
    scale = 10**decimals
    text = f"{round(float(x) * scale) / scale:.{decimals}f}"
    return f"({text})" if text.startswith("-") else text


def places(x: float) -> str:
    """A geometry length or station as the record keeps it: six decimals, trailing zeros
    kept (they say how precise the number is)."""
    return fixed(x, 6)


def at_least(x: float, decimals: int) -> str:
    """A factor written with at least ``decimals`` decimals but every digit it has
    (0.08 -> 0.080, 0.0725 -> 0.0725)."""
    text = num(x)
    head, _, tail = text.partition(".")
    return f"{head}.{tail.ljust(decimals, '0')}"


def per_second(speed: float, units: UnitSystem) -> str:
    """A speed in km/h or mph written as m/s or ft/s: (V / 3.6) or (V x 5280 / 3600)."""
    return f"({num(speed)} / 3.6)" if units.name == "metric" else f"({num(speed)} x 5280 / 3600)"


def from_per_second(expression: str, units: UnitSystem) -> str:
    """An expression in m/s or ft/s turned into km/h or mph."""
    return f"3.6 x {expression}" if units.name == "metric" else f"3600 / 5280 x {expression}"


def gravity(units: UnitSystem) -> str:
    """Standard gravity in m/s^2 or ft/s^2 (9.80665 m/s^2, CGPM 1901; 1 ft = 0.3048 m)."""
    return "9.80665" if units.name == "metric" else "(9.80665 / 0.3048)"


def decimals(units: UnitSystem) -> int:
    """Decimals of geometry lengths and stations: mm in metric, 0.01 ft in US units."""
    return 3 if units.name == "metric" else 2
