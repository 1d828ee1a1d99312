"""Alignments of several bends: a chain of PIs with a radius (and spirals) at each.

From the points of the chain (start, PI 1 ... PI n, end) this gives each bend's deflection
and direction, its spiral-curve-spiral geometry and stations, the tangent left between
consecutive bends, and warnings for overlapping bends, too-short tangents between reverse
curves and broken-back curves (two bends the same way with a short tangent between).

Stationing runs along the built alignment: TS1 = start + |start PI1| - T_in1,
ST = TS + total length, TS(i+1) = ST(i) + (|PI(i) PI(i+1)| - T_out(i) - T_in(i+1)).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from curvetui.core.spiral import SpiralCurve, spiral_curve

# Default tangent lengths below which a warning is given when the bends' speeds and runoffs
# are not known (a bare chain of points and radii). Common practice, no source: a reverse
# pair without spirals needs room for its superelevation runoffs; a broken-back pair reads
# badly to drivers below a few hundred metres. Both are settable by the caller; a project's
# alignment passes 0 for both and is checked by the sourced rules of
# curvetui.core.alignment_checks (runoff shares; 15 V, TxDOT) instead.
REVERSE_TANGENT_MIN = 60.0  # [m], between reverse curves when either lacks a spiral
BROKEN_BACK_TANGENT_MIN = 150.0  # [m], between two bends turning the same way

OVERLAP = "overlap"
SHORT_REVERSE = "short reverse tangent"
BROKEN_BACK = "broken-back"


class AlignmentError(ValueError):
    """A chain of points that cannot make an alignment."""


@dataclass(frozen=True)
class Bend:
    """One bend of an alignment; lengths and stations in metres, angles in radians."""

    index: int  # 1-based PI number
    direction: int  # +1 turns right, -1 left
    deflection: float
    geometry: SpiralCurve
    pi_station: float  # PI station by back-stationing from the TS (TS + T_in)


@dataclass(frozen=True)
class Alignment:
    """The bends in order, the tangent before each bend and after the last, and warnings."""

    bends: list[Bend]
    tangents: list[float]  # tangents[0] start->TS1, tangents[i] ST(i)->TS(i+1), last ST->end
    end_station: float
    warnings: list[tuple[int, str, str]] = field(default_factory=list)  # (between PI i, kind, text)

    @property
    def failed(self) -> bool:
        return any(kind == OVERLAP for _, kind, _ in self.warnings)


@dataclass(frozen=True)
class Chain:
    """An alignment as a designer gives it, in SI: start, PI 1 .. PI n, end as (easting,
    northing) [m]; each PI's radius and spiral lengths [m] (0 = no spiral); the start
    station [m]; a name. ``lay_out`` builds it; import and export of exchange files and the
    project's alignment both speak this."""

    points: tuple[tuple[float, float], ...]
    radii: tuple[float, ...]
    spirals_in: tuple[float, ...]
    spirals_out: tuple[float, ...]
    start_station: float = 0.0
    name: str = ""

    def lay_out(self, **limits: float) -> Alignment:
        """The built alignment (``build_alignment``); ``limits`` pass its tangent minimums."""
        return build_alignment(
            list(self.points),
            list(self.radii),
            list(self.spirals_in),
            list(self.spirals_out),
            start_station=self.start_station,
            **limits,
        )


def bearing(from_en, to_en) -> float:
    """Whole-circle bearing [rad] from one (easting, northing) to another, clockwise from north."""
    de = to_en[0] - from_en[0]
    dn = to_en[1] - from_en[1]
    return math.atan2(de, dn) % (2 * math.pi)


def deflection_between(back_bearing: float, ahead_bearing: float) -> float:
    """Signed deflection [rad] from the back to the ahead bearing, right positive, in (-pi, pi]."""
    d = (ahead_bearing - back_bearing + math.pi) % (2 * math.pi) - math.pi
    return math.pi if d == -math.pi else d


def build_alignment(
    points: list[tuple[float, float]],
    radii: list[float],
    spirals_in: list[float] | None = None,
    spirals_out: list[float] | None = None,
    start_station: float = 0.0,
    reverse_tangent_min: float = REVERSE_TANGENT_MIN,
    broken_back_tangent_min: float = BROKEN_BACK_TANGENT_MIN,
) -> Alignment:
    """Lay out an alignment: ``points`` = start, PI 1 .. PI n, end (easting, northing) [m];
    ``radii`` and the spiral lengths [m] for each PI (0 for none)."""
    n = len(points) - 2
    if n < 1:
        raise AlignmentError("an alignment needs a start point, at least one PI and an end point")
    if len(radii) != n:
        raise AlignmentError(f"{n} PIs need {n} radii, got {len(radii)}")
    ls_in = list(spirals_in) if spirals_in is not None else [0.0] * n
    ls_out = list(spirals_out) if spirals_out is not None else list(ls_in)
    if len(ls_in) != n or len(ls_out) != n:
        raise AlignmentError(f"{n} PIs need {n} spiral lengths")
    legs = [math.dist(points[i], points[i + 1]) for i in range(n + 1)]
    if min(legs) <= 0:
        raise AlignmentError("two consecutive points coincide")
    bearings = [bearing(points[i], points[i + 1]) for i in range(n + 1)]

    bends: list[Bend] = []
    tangents: list[float] = []
    warnings: list[tuple[int, str, str]] = []
    station = start_station  # station reached so far along the built alignment
    previous_out = 0.0  # T_out of the previous bend
    for i in range(n):
        signed = deflection_between(bearings[i], bearings[i + 1])
        if abs(signed) < 1e-12:
            raise AlignmentError(f"PI {i + 1}: the tangents are in line (no deflection)")
        t_in_guess = spiral_curve(radii[i], abs(signed), ls_in[i], ls_out[i])
        if bool(np.any(t_in_guess.overlap)):
            raise AlignmentError(
                f"PI {i + 1}: spirals overlap (spiral angles exceed the deflection "
                f"{math.degrees(abs(signed)):.4f} deg); shorten the spirals"
            )
        tangent = legs[i] - previous_out - float(t_in_guess.tangent_in)
        tangents.append(tangent)
        ts = station + tangent
        geometry = spiral_curve(
            radii[i], abs(signed), ls_in[i], ls_out[i], pi_station=ts + float(t_in_guess.tangent_in)
        )
        direction = 1 if signed > 0 else -1
        bends.append(Bend(i + 1, direction, abs(signed), geometry, float(geometry.pi)))
        if i > 0:
            _tangent_warnings(
                bends[-2],
                bends[-1],
                tangent,
                reverse_tangent_min,
                broken_back_tangent_min,
                warnings,
            )
        station = float(geometry.st)
        previous_out = float(geometry.tangent_out)
    last = legs[n] - previous_out
    tangents.append(last)
    if tangents[0] < 0:
        warnings.append(
            (
                1,
                OVERLAP,
                "PI 1: the bend's tangent is longer than the leg from the "
                f"start point, by {-tangents[0]:.2f} m",
            )
        )
    if last < 0:
        warnings.append(
            (n, OVERLAP, f"PI {n}: the bend's tangent runs past the end point, by {-last:.2f} m")
        )
    return Alignment(bends, tangents, station + last, warnings)


def _tangent_warnings(
    a: Bend, b: Bend, tangent: float, reverse_min: float, broken_min: float, warnings: list
) -> None:
    label = f"PI {a.index} to PI {b.index}"
    if tangent < -1e-9:
        warnings.append(
            (
                a.index,
                OVERLAP,
                f"FAIL {label}: the bends overlap by {-tangent:.2f} m "
                "(their tangents add up to more than the distance between the PIs)",
            )
        )
        return
    if a.direction != b.direction:
        spiralled = float(a.geometry.ls_out) > 0 and float(b.geometry.ls_in) > 0
        need = 0.0 if spiralled else reverse_min
        if tangent < need:
            warnings.append(
                (
                    a.index,
                    SHORT_REVERSE,
                    f"WARNING {label}: reverse curves with "
                    f"{tangent:.2f} m of tangent, less than {need:.0f} m for the "
                    "superelevation to change over",
                )
            )
    elif tangent < broken_min:
        warnings.append(
            (
                a.index,
                BROKEN_BACK,
                f"WARNING {label}: broken-back curves, both "
                f"turning the same way with {tangent:.2f} m of tangent (less than "
                f"{broken_min:.0f} m); consider one compound or longer bend",
            )
        )
