"""A road design table (side friction, running speeds, runoff gradients) held in SI.

The table is built from a data file by :mod:`curvetui.storage.tables`; this module holds
only the numbers and the look-ups, so it stays free of file I/O.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from curvetui.core.units import FOOT, KMH, MPH

# Look-up kinds, per element: where a speed fell relative to the table's rows.
ROW = 0
INTERPOLATED = 1
BELOW_TABLE = 2
ABOVE_TABLE = 3

DISTRIBUTIONS = ("aashto-method-5", "linear", "aashto-method-2")


@dataclass(frozen=True)
class RadiusRounding:
    """How a source table rounds radii: to ``step`` below ``whole_below``, else to
    ``significant_figures`` significant figures (the Green Book prints e.g. 926 ft but 1190 ft)."""

    whole_below: float = 1000.0
    step: float = 1.0
    significant_figures: int = 3

    def apply(self, value):
        """Round half up, as printed tables do (common practice, no source). The tiny
        allowance keeps 37.49999999999999 (float noise on an exact 37.5) a tie."""
        value = np.asarray(value, dtype=float)

        def half_up(x):
            return np.floor(x + 0.5 + 1e-9)

        with np.errstate(divide="ignore", invalid="ignore"):
            small = half_up(value / self.step) * self.step
            exponent = np.floor(np.log10(np.where(value > 0, value, 1.0)))
            scale = 10.0 ** (exponent - self.significant_figures + 1)
            large = half_up(value / scale) * scale
        return np.where(value < self.whole_below, small, large)


@dataclass(frozen=True)
class RoadTable:
    """One authority's road-bend design table.

    Speeds and lengths are kept in the table's own units (``units``) for display and
    rounding, and in SI (``speeds_si``) for the engine.
    """

    name: str
    title: str
    source: str
    units: str  # "metric" (km/h, m) or "us" (mph, ft)
    point_mass_constant: float  # 127 (km/h, m) or 15 (mph, ft) in V^2 / (C R)
    distribution: str
    speeds: np.ndarray  # design speeds, table units
    side_friction_max: np.ndarray
    running_speeds: np.ndarray  # table units
    relative_gradient: np.ndarray  # maximum relative gradient, fraction
    row_sources: tuple[str, ...]
    emax_default: float  # fraction
    emax_min: float
    emax_max: float
    emax_tabulated: tuple[float, ...]
    normal_crown: float = 0.02  # normal cross slope, fraction
    normal_crown_limit: float = 0.015  # below this design e the crown is kept
    superelevation_step: float = 0.001  # design e is shown rounded up to this (fraction)
    radius_rounding: RadiusRounding = field(default_factory=RadiusRounding)
    path: str = ""
    # the largest radius on which a spiral transition is used, table length units, per row
    # (NaN where a row gives none), and where those values come from
    spiral_radius_max: np.ndarray | None = None
    spiral_radius_max_source: str = ""

    @property
    def speed_unit(self) -> float:
        """m/s per table speed unit."""
        return KMH if self.units == "metric" else MPH

    @property
    def length_unit(self) -> float:
        """m per table length unit."""
        return 1.0 if self.units == "metric" else FOOT

    @property
    def speeds_si(self) -> np.ndarray:
        return self.speeds * self.speed_unit

    @property
    def k_si(self) -> float:
        """The point-mass constant in SI: f + e = v^2 / (k R), v in m/s, R in m.

        The standards write V^2/(127 R) (km/h, m) and V^2/(15 R) (mph, ft); 127 is a rounded
        3.6^2 g = 127.1 and 15 a rounded g / (5280/3600)^2 = 14.96 (g in ft/s^2). Keeping the
        standard's own constant reproduces its printed tables; k = C (speed unit)^2 / (length
        unit), so k = 9.799 m/s^2 for 127 and 9.835 m/s^2 for 15.
        """
        return self.point_mass_constant * self.speed_unit**2 / self.length_unit

    def lookup(self, column: np.ndarray, speed_si) -> tuple[np.ndarray, np.ndarray]:
        """Linear interpolation of ``column`` at ``speed_si`` [m/s], with the look-up kind.

        Outside the table there is no value (NaN, flagged BELOW_TABLE / ABOVE_TABLE): a
        friction factor, gradient or running speed is never extrapolated past the first or
        last row; the bend layer refuses such speeds before they get here.
        """
        v = np.asarray(speed_si, dtype=float)
        xs = self.speeds_si
        lo = v < xs[0] * (1 - 1e-12)
        hi = v > xs[-1] * (1 + 1e-12)
        value = np.where(lo | hi, np.nan, np.interp(v, xs, column))
        at = np.clip(np.searchsorted(xs, v), 1, len(xs) - 1)  # the nearest rows either side
        with np.errstate(invalid="ignore"):
            on_row = (np.abs(v - xs[at]) <= 1e-9) | (np.abs(v - xs[at - 1]) <= 1e-9)
        kind = np.where(on_row, ROW, INTERPOLATED)
        kind = np.where(lo, BELOW_TABLE, np.where(hi, ABOVE_TABLE, kind))
        return value, kind

    def f_max(self, speed_si) -> tuple[np.ndarray, np.ndarray]:
        """Maximum side friction factor at ``speed_si`` and the look-up kind."""
        return self.lookup(self.side_friction_max, speed_si)

    def running_speed_si(self, speed_si) -> np.ndarray:
        """Average running speed [m/s] for a design speed [m/s]."""
        value, _ = self.lookup(self.running_speeds, speed_si)
        return value * self.speed_unit

    def spiral_radius_max_si(self, speed_si) -> np.ndarray:
        """Largest radius [m] that uses a spiral at ``speed_si`` [m/s], interpolated between
        rows (linear in R: a little above v^2/a between rows, so a note is never early);
        NaN outside the table or where a neighbouring row gives none."""
        if self.spiral_radius_max is None:
            return np.full(np.shape(speed_si), np.nan)
        value, _ = self.lookup(self.spiral_radius_max, speed_si)
        return value * self.length_unit

    def round_radius_si(self, radius_si) -> np.ndarray:
        """Round a radius [m] the way the source table prints it, in its own units."""
        return self.radius_rounding.apply(np.asarray(radius_si) / self.length_unit) * (
            self.length_unit
        )
