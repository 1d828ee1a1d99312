"""Checking numbers typed by a user: one clear message naming the field and its range."""

from __future__ import annotations

import math


class InputError(ValueError):
    """A value a user gave that cannot be used; the message names the field and range."""


def parse_number(
    field: str, text, lo: float, hi: float, unit: str = "", *, lo_open: bool = False
) -> float:
    """Parse ``text`` as a finite number within [lo, hi] (or (lo, hi] with ``lo_open``).

    Raises InputError whose message reads like "--speed: must be a number from 1 to 200
    km/h, got 'fast'".
    """
    unit_txt = f" {unit}" if unit else ""
    lo_txt = f"greater than {lo:g}" if lo_open else f"from {lo:g}"
    allowed = f"must be a number {lo_txt} to {hi:g}{unit_txt}"
    try:
        value = float(text)
    except (TypeError, ValueError):
        raise InputError(f"{field}: {allowed}, got {text!r}") from None
    if not math.isfinite(value):
        raise InputError(f"{field}: {allowed}, got {text!r}")
    if value > hi or value < lo or (lo_open and value == lo):
        raise InputError(f"{field}: {allowed}, got {value:g}")
    return value
