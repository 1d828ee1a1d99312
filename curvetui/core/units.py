"""Unit systems and conversion factors to SI.

Conversion factors are exact by definition: 1 ft = 0.3048 m (international foot,
1959), 1 mi = 1609.344 m, so 1 mph = 0.44704 m/s; 1 km/h = 1/3.6 m/s.
Standard gravity g0 = 9.80665 m/s^2 (CGPM 1901).
"""

from __future__ import annotations

from dataclasses import dataclass

G0 = 9.80665  # standard gravity [m/s^2]
FOOT = 0.3048  # [m]
INCH = 0.0254  # [m]
MPH = 0.44704  # [m/s]
KMH = 1.0 / 3.6  # [m/s]


@dataclass(frozen=True)
class UnitSystem:
    """How one unit system shows speeds, lengths and accelerations.

    Values are converted *to* SI by multiplying by the factor and *from* SI by dividing.
    """

    name: str
    speed: float  # m/s per display unit
    speed_label: str
    length: float  # m per display unit
    length_label: str
    cant: float  # m per display unit of cant
    cant_label: str
    acceleration_label: str

    def speed_to_si(self, value):
        return value * self.speed

    def speed_from_si(self, value):
        return value / self.speed

    def length_to_si(self, value):
        return value * self.length

    def length_from_si(self, value):
        return value / self.length

    def acceleration_from_si(self, value):
        """Accelerations show as length unit per s^2 (m/s^2 or ft/s^2)."""
        return value / self.length


METRIC = UnitSystem("metric", KMH, "km/h", 1.0, "m", 0.001, "mm", "m/s^2")
US = UnitSystem("us", MPH, "mph", FOOT, "ft", INCH, "in", "ft/s^2")
UNIT_SYSTEMS: dict[str, UnitSystem] = {"metric": METRIC, "us": US}


def unit_system(name: str) -> UnitSystem:
    """Return the unit system called ``name`` ('metric' or 'us')."""
    try:
        return UNIT_SYSTEMS[name]
    except KeyError:
        raise ValueError(f"unknown unit system {name!r}; use 'metric' or 'us'") from None
