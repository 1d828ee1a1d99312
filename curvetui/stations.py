"""Station (chainage) text: metric km+metres (2+710.000), US 100-ft stations (27+10.00)."""

from __future__ import annotations

import math

STATION_MAX = 1e12  # beyond this, value * 10**decimals leaves the exact integers of a double


def format_station(value: float, units: str = "metric", decimals: int | None = None) -> str:
    """Format a station given in the project's length unit ('metric' m or 'us' ft).

    A value too large to split into whole steps (beyond 1e12 units, or not finite) is
    written as a plain number instead: such a station is an input error, shown as given."""
    step, width = (1000.0, 3) if units == "metric" else (100.0, 2)
    decimals = (3 if units == "metric" else 2) if decimals is None else decimals
    if not math.isfinite(value) or abs(value) > STATION_MAX:
        return f"{value:g}"
    sign = "-" if value < 0 else ""
    value = abs(value)
    scale = 10**decimals
    total = round(value * scale)  # round once, so 999.9996 becomes 1+000.000
    whole, rest = divmod(total, int(step * scale))
    rest_txt = f"{rest / scale:0{width + (decimals + 1 if decimals else 0)}.{decimals}f}"
    return f"{sign}{whole}+{rest_txt}"


def parse_station(text: str, units: str = "metric") -> float:
    """Parse '2+710.5' (or a plain number) into a length in the project's unit."""
    text = text.strip()
    step = 1000.0 if units == "metric" else 100.0
    if "+" in text[1:]:
        sign = -1.0 if text.startswith("-") else 1.0
        head, tail = text.lstrip("-").split("+", 1)
        value = sign * (float(head) * step + float(tail))
    else:
        value = float(text)
    if not math.isfinite(value):
        raise ValueError(f"station {text!r} is not a finite number")
    return value
