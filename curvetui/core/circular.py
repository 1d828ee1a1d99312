"""Simple circular curves: tangent length, length, external, middle ordinate, long chord,
stations of PC and PT; degree of curve by the arc and chord definitions.

For a radius R and a deflection Delta (the angle between the tangents, 0 < Delta < pi):

    T  = R tan(Delta/2)              L = R Delta
    E  = R (sec(Delta/2) - 1)        M = R (1 - cos(Delta/2))
    LC = 2 R sin(Delta/2)
    PC = PI - T                      PT = PC + L   (never PI + T)

Stations as in the Indiana DOT Design Manual, Fig. 43-6D. E and M are evaluated as
2 R sin^2(Delta/4) / cos(Delta/2) and 2 R sin^2(Delta/4): the same quantities without the
cancellation in 1 - cos(Delta/2) on flat bends.

Degree of curve (US practice, degrees per 100 ft; the radius is taken in metres here):
arc definition, a 100 ft arc subtends D: D = (100 ft / R_ft) (180/pi) = 5729.578 / R_ft;
chord definition (US railways), a 100 ft chord subtends D: R_ft = 50 / sin(D/2).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from curvetui.core.units import FOOT

STATION_FOOT = 100.0 * FOOT  # the 100 ft length a degree of curve refers to [m]
ARC_DEGREE_CONSTANT = 18000.0 / np.pi  # D R_ft for the arc definition, 5729.5779513...


class GeometryError(ValueError):
    """Bend geometry that cannot be built (bad inputs, overlapping spirals...)."""


def _where(bad) -> str:
    """' (element i)' for the first bad element of an array, '' for a scalar."""
    bad = np.asarray(bad)
    if bad.ndim == 0:
        return ""
    index = tuple(int(i) for i in np.argwhere(bad)[0])
    return f" (element {index[0] if len(index) == 1 else index})"


def require(ok, message: str, values) -> None:
    """Raise GeometryError(message, first offending value) unless ``ok`` holds everywhere.

    ``ok`` is a boolean array (NaN compares False, so NaN is refused too).
    """
    ok = np.asarray(ok)
    if not ok.all():
        bad = ~ok
        first = np.asarray(values)[bad].flat[0] if np.ndim(values) else values
        raise GeometryError(f"{message}; got {float(first):g}{_where(bad)}")


def check_radius(radius) -> None:
    r = np.asarray(radius)
    require(np.isfinite(r) & (r > 0), "radius must be a positive length in metres", r)


def check_deflection(deflection) -> None:
    d = np.asarray(deflection)
    require(
        np.isfinite(d) & (d > 0) & (d < np.pi),
        "deflection must lie between 0 and pi radians (0 and 180 degrees), exclusive",
        d,
    )


def check_station(station, name: str = "PI station") -> None:
    s = np.asarray(station)
    require(np.isfinite(s), f"{name} must be a finite distance in metres", s)


def versed_half(deflection):
    """1 - cos(Delta/2) = 2 sin^2(Delta/4), free of cancellation for small Delta."""
    return 2.0 * np.sin(deflection / 4.0) ** 2


def exsec_half(deflection):
    """sec(Delta/2) - 1 = 2 sin^2(Delta/4) / cos(Delta/2), free of cancellation."""
    return versed_half(deflection) / np.cos(deflection / 2.0)


@dataclass(frozen=True)
class CircularCurve:
    """A simple circular curve, SI (m, rad), arrays broadcast from the inputs.

    pi, pc and pt are stations (chainages) in metres.
    """

    radius: np.ndarray
    deflection: np.ndarray
    tangent: np.ndarray  # T, PI to PC and PI to PT
    length: np.ndarray  # L, PC to PT along the arc
    external: np.ndarray  # E, PI to the midpoint of the arc
    middle_ordinate: np.ndarray  # M, midpoint of the arc to the midpoint of the long chord
    long_chord: np.ndarray  # LC, PC to PT in a straight line
    pi: np.ndarray
    pc: np.ndarray
    pt: np.ndarray


def circular_curve(radius, deflection, pi_station=0.0) -> CircularCurve:
    """Simple curve of ``radius`` [m] turning through ``deflection`` [rad] at the PI.

    T = R tan(D/2), L = R D, E = R (sec(D/2) - 1), M = R (1 - cos(D/2)),
    LC = 2 R sin(D/2); PC = PI - T, PT = PC + L (Indiana DOT Design Manual Fig. 43-6D).
    Refuses (GeometryError) a radius that is not positive or a deflection outside (0, pi).
    """
    r, d, pi = np.broadcast_arrays(
        np.asarray(radius, dtype=float),
        np.asarray(deflection, dtype=float),
        np.asarray(pi_station, dtype=float),
    )
    check_radius(r)
    check_deflection(d)
    check_station(pi)
    tangent = r * np.tan(d / 2.0)
    length = r * d
    pc = pi - tangent
    return CircularCurve(
        radius=np.array(r),
        deflection=np.array(d),
        tangent=np.asarray(tangent),
        length=np.asarray(length),
        external=np.asarray(r * exsec_half(d)),
        middle_ordinate=np.asarray(r * versed_half(d)),
        long_chord=np.asarray(2.0 * r * np.sin(d / 2.0)),
        pi=np.array(pi),
        pc=np.asarray(pc),
        pt=np.asarray(pc + length),
    )


def degree_of_curve_arc(radius):
    """Degree of curve [deg per 100 ft], arc definition, for a radius in metres.

    D = 5729.578 / R_ft: the angle subtended by a 100 ft arc, (100 / R_ft) (180 / pi).
    """
    r = np.asarray(radius, dtype=float)
    check_radius(r)
    return ARC_DEGREE_CONSTANT / (r / FOOT)


def radius_from_degree_arc(degree):
    """Radius [m] from a degree of curve [deg per 100 ft], arc definition: R_ft = 5729.578 / D."""
    d = np.asarray(degree, dtype=float)
    require(np.isfinite(d) & (d > 0), "degree of curve must be positive", d)
    return ARC_DEGREE_CONSTANT / d * FOOT


def degree_of_curve_chord(radius):
    """Degree of curve [deg per 100 ft], chord definition, for a radius in metres.

    R_ft = 50 / sin(D/2), so D = 2 asin(50 / R_ft); a radius under 50 ft has no 100 ft chord
    and is refused.
    """
    r = np.asarray(radius, dtype=float)
    check_radius(r)
    r_ft = r / FOOT
    require(r_ft >= 50.0, "the chord definition needs a radius of at least 50 ft (15.24 m)", r)
    return np.degrees(2.0 * np.arcsin(50.0 / r_ft))


def radius_from_degree_chord(degree):
    """Radius [m] from a degree of curve [deg per 100 ft], chord definition.

    R_ft = 50 / sin(D/2), 0 < D <= 180.
    """
    d = np.asarray(degree, dtype=float)
    require(
        np.isfinite(d) & (d > 0) & (d <= 180.0),
        "chord degree of curve must lie in (0, 180] degrees",
        d,
    )
    return 50.0 / np.sin(np.radians(d) / 2.0) * FOOT
