"""LandXML 1.2 units: linear units to metres and angular units to radians, exactly.

The unit names are the schema's enumerations (LandXML 1.2 schema, from memory except where
/work/shared/REFERENCES.md notes them read): Metric linearUnit millimeter, centimeter,
meter, kilometer; Imperial linearUnit foot, USSurveyFoot, inch, mile; angularUnit and
directionUnit radians (the default), grads, decimal degrees, decimal dd.mm.ss.

Factors: 1 ft = 0.3048 m and 1 in = 0.0254 m exactly (international yard and pound, 1959);
1 US survey foot = 1200/3937 m (US Metric Law of 1866, the definition the survey foot kept);
1 mile = 5280 ft = 1609.344 m (international). "decimal dd.mm.ss" writes 45.3025 for
45 deg 30 min 25 s (schema annotation, read in a public copy of the schema).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

METRIC_LINEAR = {"millimeter": 0.001, "centimeter": 0.01, "meter": 1.0, "kilometer": 1000.0}
IMPERIAL_LINEAR = {
    "foot": 0.3048,
    "USSurveyFoot": 1200.0 / 3937.0,
    "inch": 0.0254,
    "mile": 1609.344,
}
ANGULAR = ("radians", "grads", "decimal degrees", "decimal dd.mm.ss")


@dataclass(frozen=True)
class FileUnits:
    """How a file writes lengths and angles, and the project units it maps to."""

    system: str  # "metric" or "us"
    linear_name: str
    linear: float  # metres per file unit
    angular: str
    direction: str

    def length(self, value: float) -> float:
        """A file length in metres."""
        return value * self.linear

    def angle(self, value: float) -> float:
        """A file angle in radians."""
        return angle_to_radians(value, self.angular)


DEFAULT_UNITS = FileUnits("metric", "meter", 1.0, "radians", "radians")


def angle_to_radians(value: float, unit: str) -> float:
    """``value`` in ``unit`` (one of ANGULAR) as radians."""
    if unit == "radians":
        return value
    if unit == "grads":
        return value * math.pi / 200.0
    if unit == "decimal degrees":
        return math.radians(value)
    # decimal dd.mm.ss: 45.3025 = 45 deg 30 min 25 s
    sign = -1.0 if value < 0 else 1.0
    text = f"{abs(value):.10f}"
    whole, _, frac = text.partition(".")
    frac = (frac + "0000")[:10]
    degrees = int(whole) + int(frac[:2]) / 60.0 + float(f"{frac[2:4]}.{frac[4:]}") / 3600.0
    return sign * math.radians(degrees)


def units_of(node, where: str) -> FileUnits:
    """The FileUnits of a ``Units`` node (None: metres and radians). ValueError with a
    message naming the element and the allowed values otherwise."""
    if node is None:
        return DEFAULT_UNITS
    metric, imperial = node.find("Metric"), node.find("Imperial")
    chosen = metric or imperial
    if chosen is None:
        return DEFAULT_UNITS
    table = METRIC_LINEAR if chosen is metric else IMPERIAL_LINEAR
    linear = chosen.attrs.get("linearUnit")
    if linear not in table:
        raise ValueError(
            f"{chosen.where()}: linearUnit must be one of {', '.join(table)}, got {linear!r}"
        )
    angles = {}
    for key in ("angularUnit", "directionUnit"):
        value = chosen.attrs.get(key, "radians")
        if value not in ANGULAR:
            raise ValueError(
                f"{chosen.where()}: {key} must be one of {', '.join(ANGULAR)}, got {value!r}"
            )
        angles[key] = value
    return FileUnits(
        "metric" if chosen is metric else "us",
        linear,
        table[linear],
        angles["angularUnit"],
        angles["directionUnit"],
    )
