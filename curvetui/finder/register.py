"""The register: one row per curve found, in the columns ``curvetui batch`` reads.

Columns (the interface with batch; lengths in the output units, m or ft):
id (``<feature>-<n>``), kind, feature, begin_station, end_station, radius (the sharpest
arc), deflection (degrees, unsigned), direction (left/right travelling from the first
vertex), curve_length (spirals included), spiral_in, spiral_out, curve_type (simple,
spiralled, compound), relation (with the previous curve: "", reverse, broken-back),
tangent_before (from the previous curve's end; blank for the first), fit_rms (RMS offset of
the resampled points from the fit), speed and posted_speed (speed units), then the feature
properties the user keeps.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from curvetui.core.units import KMH, MPH, UnitSystem

COLUMNS = (
    "id", "kind", "feature", "begin_station", "end_station", "radius", "deflection",
    "direction", "curve_length", "spiral_in", "spiral_out", "curve_type", "relation",
    "tangent_before", "fit_rms", "speed", "posted_speed",
)  # fmt: skip
LENGTHS = (
    "begin_station", "end_station", "radius", "curve_length", "spiral_in", "spiral_out",
    "tangent_before", "fit_rms",
)  # fmt: skip
TEXT = ("id", "kind", "feature", "direction", "curve_type", "relation")
# decimals written: lengths to a millimetre (or a thousandth of a foot), angles to
# 0.0001 degree, speeds as given (a choice of presentation, no source)
DECIMALS = {**dict.fromkeys(LENGTHS, 3), "deflection": 4, "speed": 3, "posted_speed": 3}

_SPEED_TEXT = re.compile(r"^\s*([0-9]+(?:\.[0-9]*)?|\.[0-9]+)\s*(km/h|kmh|kph|mph)?\s*$", re.I)
_SPEED_UNIT = {"km/h": KMH, "kmh": KMH, "kph": KMH, "mph": MPH}


def speed_value(value: object, units: UnitSystem) -> float | None:
    """A property as a speed in ``units``: a number, or text such as "50", "50 km/h" or
    "30 mph" (a unit other than the output's converted); None when it is none of these."""
    if isinstance(value, bool) or value is None:
        return None
    if isinstance(value, (int, float)):
        x = float(value)
        return x if math.isfinite(x) and x > 0 else None
    m = _SPEED_TEXT.match(str(value))
    if m is None:
        return None
    x = float(m.group(1))
    if m.group(2):
        x = x * _SPEED_UNIT[m.group(2).lower()] / units.speed
    return x if x > 0 else None


@dataclass(frozen=True)
class SpeedSource:
    """Where a row's speed and posted speed come from: a value for every curve
    (``speed``, output units), a feature property for each (``speed_field``,
    ``posted_field``); without a design speed, the posted speed stands in when given
    (``posted_as_speed``)."""

    speed: float | None = None
    speed_field: str | None = None
    posted_field: str | None = None

    @property
    def posted_as_speed(self) -> bool:
        return self.speed is None and self.speed_field is None and self.posted_field is not None

    @property
    def any(self) -> bool:
        return self.speed is not None or self.speed_field is not None or self.posted_as_speed


def feature_speeds(
    properties: dict, source: SpeedSource, units: UnitSystem, problems: list[str], fid: str
) -> tuple[float | None, float | None]:
    """(speed, posted speed) of a feature's curves, in ``units``; a property that is not a
    speed is told in ``problems`` and left blank."""

    def read(name: str, fallback: float | None = None) -> float | None:
        instead = "left blank" if fallback is None else f"--speed {fallback:g} used"
        if name not in properties or properties[name] in (None, ""):
            problems.append(f"feature {fid}: no {name!r} value; {instead}")
            return fallback
        got = speed_value(properties[name], units)
        if got is None:
            shown = str(properties[name])[:40]
            problems.append(f"feature {fid}: {name!r} is {shown!r}, not a speed; {instead}")
            return fallback
        return got

    posted = read(source.posted_field) if source.posted_field else None
    if source.speed_field:
        speed = read(source.speed_field, source.speed)
    else:
        speed = source.speed
    if source.posted_as_speed:
        speed = posted
    return speed, posted


def curve_row(
    curve, n: int, fid: str, kind: str, offset: float, units: UnitSystem
) -> dict[str, object]:
    """One curve (a core FoundCurve, SI) as register cells in ``units``, its stations
    moved on by ``offset`` [m] (the station of its line's first vertex)."""

    def length(metres):
        return None if metres is None else units.length_from_si(metres)

    return {
        "id": f"{fid}-{n}",
        "kind": kind,
        "feature": fid,
        "begin_station": length(curve.begin + offset),
        "end_station": length(curve.end + offset),
        "radius": length(curve.radius),
        "deflection": math.degrees(abs(curve.deflection)),
        "direction": curve.direction,
        "curve_length": length(curve.length),
        "spiral_in": length(curve.spiral_in),
        "spiral_out": length(curve.spiral_out),
        "curve_type": curve.shape,
        "relation": curve.relation or "",
        "tangent_before": length(curve.tangent_before),
        "fit_rms": length(curve.fit_rms),
    }


def cell_text(name: str, value: object) -> str:
    """A cell as the CSV register writes it: numbers to DECIMALS places (trailing zeros
    dropped), blanks for None and non-finite numbers."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        x = float(value)
        if not math.isfinite(x):
            return ""
        places = DECIMALS.get(name)
        if places is None:
            return repr(value) if isinstance(value, float) else str(value)
        text = f"{x:.{places}f}".rstrip("0").rstrip(".")
        return "0" if text in ("-0", "") else text
    return str(value)
