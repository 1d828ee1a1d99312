"""Setting out a bend: stations, chords and deflections from the TS (or PC), coordinates;
versines for track.

Local frame: origin at the TS (PC for a simple curve), x along the back tangent in the
direction of travel, y towards the inside of the bend. A point on

- the spiral in, a distance s from the TS, is clothoid_xy(s, Ls1, R);
- the arc, at heading phi = theta1 + (station - SC) / R, is O + R (sin phi, -cos phi) with the
  arc centre O = (k1, R + p1);
- the spiral out, a distance w before the ST, is the ST + x' b + y' n, (x', y') =
  clothoid_xy(w, Ls2, R), b = -(cos Delta, sin Delta) pointing back along the forward tangent
  and n = (-sin Delta, cos Delta) towards the inside; the ST is the PI + T2 (cos Delta, sin Delta);
- beyond the TS or ST, the tangents.

In the ground frame the back tangent has the whole-circle bearing beta (clockwise from north),
unit vector f = (sin beta, cos beta) as (easting, northing) and right normal
r = (cos beta, -sin beta); a point is TS + x f + direction y r with direction +1 for a bend to
the right and -1 to the left. Chord c = |(x, y)|; deflection from the back tangent at the TS
atan2(y, x), signed clockwise (positive right), so the bearing TS -> point is beta + deflection.

For a simple curve this is the tangent-chord angle l / (2R) and chord 2 R sin(l / (2R)).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from curvetui.core.circular import CircularCurve, GeometryError, check_radius, require
from curvetui.core.spiral import SpiralCurve, clothoid_xy, require_spirals_fit

SPIRAL_IN = "spiral in"
ARC = "arc"
SPIRAL_OUT = "spiral out"
TANGENT_POINT = "tangent point"
TANGENT = "tangent"  # beyond the TS/PC or the ST/PT (versines only)

MAX_STATIONS = 100_000  # refuse an interval that would list more stations than this
STATION_TOLERANCE = 1e-6  # [m] a round station this close to a key point is the key point


@dataclass(frozen=True)
class _Bend:
    """One bend, scalars, in the local frame."""

    radius: float
    deflection: float
    ls1: float
    ls2: float
    theta1: float
    p1: float
    k1: float
    t1: float
    t2: float
    start: float  # TS or PC station
    sc: float
    cs: float
    end: float  # ST or PT station
    spiralled: bool

    def key_points(self) -> list[tuple[str, float, str]]:
        if self.spiralled:
            return [
                ("TS", self.start, TANGENT_POINT),
                ("SC", self.sc, ARC),
                ("CS", self.cs, ARC),
                ("ST", self.end, TANGENT_POINT),
            ]
        return [("PC", self.start, TANGENT_POINT), ("PT", self.end, TANGENT_POINT)]


def _scalar(value) -> float:
    return float(np.asarray(value).reshape(()))


def _bend(curve) -> _Bend:
    """Check that ``curve`` is one buildable bend and put it in local-frame terms."""
    if not isinstance(curve, (CircularCurve, SpiralCurve)):
        raise GeometryError(f"expected a CircularCurve or SpiralCurve, got {type(curve).__name__}")
    size = np.asarray(curve.radius).size
    if size != 1:
        raise GeometryError(f"setting out takes one bend at a time; got {size} bends")
    if isinstance(curve, SpiralCurve):
        require_spirals_fit(curve)
        return _Bend(
            radius=_scalar(curve.radius),
            deflection=_scalar(curve.deflection),
            ls1=_scalar(curve.ls_in),
            ls2=_scalar(curve.ls_out),
            theta1=_scalar(curve.theta_in),
            p1=_scalar(curve.p_in),
            k1=_scalar(curve.k_in),
            t1=_scalar(curve.tangent_in),
            t2=_scalar(curve.tangent_out),
            start=_scalar(curve.ts),
            sc=_scalar(curve.sc),
            cs=_scalar(curve.cs),
            end=_scalar(curve.st),
            spiralled=True,
        )
    t = _scalar(curve.tangent)
    pc, pt = _scalar(curve.pc), _scalar(curve.pt)
    return _Bend(
        radius=_scalar(curve.radius),
        deflection=_scalar(curve.deflection),
        ls1=0.0,
        ls2=0.0,
        theta1=0.0,
        p1=0.0,
        k1=0.0,
        t1=t,
        t2=t,
        start=pc,
        sc=pc,
        cs=pt,
        end=pt,
        spiralled=False,
    )


def _local_xy(b: _Bend, station):
    """Local (x, y) [m] of the track at ``station`` (any station, tangents beyond the bend)."""
    s = np.asarray(station, dtype=float)
    r, d = b.radius, b.deflection
    cos_d, sin_d = math.cos(d), math.sin(d)
    st_x, st_y = b.t1 + b.t2 * cos_d, b.t2 * sin_d

    # spiral in (and the back tangent before the TS)
    u = np.clip(s - b.start, 0.0, b.ls1)
    xi, yi = clothoid_xy(u, b.ls1, r) if b.ls1 > 0 else (u, np.zeros_like(u))
    before = np.minimum(s - b.start, 0.0)

    # arc
    phi = b.theta1 + (np.clip(s, b.sc, b.cs) - b.sc) / r
    xa = b.k1 + r * np.sin(phi)
    ya = b.p1 + 2.0 * r * np.sin(phi / 2.0) ** 2  # R + p1 - R cos(phi)

    # spiral out (and the forward tangent after the ST)
    w = np.clip(b.end - s, 0.0, b.ls2)
    xo, yo = clothoid_xy(w, b.ls2, r) if b.ls2 > 0 else (w, np.zeros_like(w))
    after = np.maximum(s - b.end, 0.0)
    x_out = st_x - xo * cos_d - yo * sin_d + after * cos_d
    y_out = st_y - xo * sin_d + yo * cos_d + after * sin_d

    x = np.where(s <= b.sc, xi + before, np.where(s <= b.cs, xa, x_out))
    y = np.where(s <= b.sc, yi, np.where(s <= b.cs, ya, y_out))
    return x, y


def _element(b: _Bend, station) -> np.ndarray:
    """Element at each station between key points (a simple curve has no spirals)."""
    s = np.asarray(station, dtype=float)
    return np.select(
        [s < b.start, s < b.sc, s <= b.cs, s <= b.end],
        [TANGENT, SPIRAL_IN, ARC, SPIRAL_OUT],
        default=TANGENT,
    )


def _check_interval(b: _Bend, interval, name: str = "interval") -> float:
    step = float(interval)
    if not (math.isfinite(step) and step > 0):
        raise GeometryError(f"{name} must be a positive length in metres; got {step:g}")
    count = (b.end - b.start) / step
    if count > MAX_STATIONS:
        raise GeometryError(
            f"{name} {step:g} m gives {count:,.0f} stations on a {b.end - b.start:.3f} m bend; "
            f"use an interval of at least {(b.end - b.start) / MAX_STATIONS:.3g} m"
        )
    return step


def _stations(b: _Bend, step: float):
    """Key points and the round multiples of ``step`` between them, in order."""
    keys = b.key_points()
    key_st = np.array([k[1] for k in keys])
    first = math.ceil((b.start - STATION_TOLERANCE) / step)
    last = math.floor((b.end + STATION_TOLERANCE) / step)
    rounds = np.arange(first, last + 1, dtype=float) * step
    if rounds.size:
        near = np.min(np.abs(rounds[:, None] - key_st[None, :]), axis=1) <= STATION_TOLERANCE
        rounds = rounds[~near & (rounds > b.start) & (rounds < b.end)]
    stations = np.concatenate([key_st, rounds])
    names = np.array([k[0] for k in keys] + [""] * rounds.size)
    elements = np.concatenate([np.array([k[2] for k in keys]), _element(b, rounds)]).astype(str)
    order = np.argsort(stations, kind="stable")  # key points first on a tie (SC = CS)
    return stations[order], names[order], elements[order]


@dataclass(frozen=True)
class SetoutTable:
    """Setting-out points of one bend, ordered by station.

    ``point`` names the key points (TS, SC, CS, ST or PC, PT; "" between them).
    ``element``: "tangent point" (TS, ST, PC, PT), "spiral in", "arc" (SC and CS included:
    the arc's ends) or "spiral out". ``chord`` [m] and ``deflection`` [rad, clockwise
    positive] are measured at the TS/PC from the back tangent.
    """

    station: np.ndarray  # [m]
    point: np.ndarray
    element: np.ndarray
    chord: np.ndarray  # straight-line distance from the TS or PC [m]
    deflection: np.ndarray  # angle at the TS/PC from the back tangent to the point [rad]
    easting: np.ndarray  # [m]
    northing: np.ndarray  # [m]


def _direction(direction) -> int:
    if direction not in (1, -1):
        raise GeometryError(f"direction must be +1 (right-hand bend) or -1 (left); got {direction}")
    return int(direction)


def setout_points(
    curve, pi_easting, pi_northing, back_bearing, interval, direction=+1
) -> SetoutTable:
    """Setting-out table for one bend (CircularCurve or SpiralCurve).

    ``back_bearing`` [rad]: whole-circle bearing, clockwise from north, of the back tangent in
    the direction of travel (towards the PI). ``direction`` +1 for a right-hand bend, -1 for a
    left-hand one. Rows: the key points and every station that is a round multiple of
    ``interval`` [m] between them. Overlapping spirals are refused (GeometryError).
    """
    b = _bend(curve)
    sign = _direction(direction)
    e0, n0, beta = float(pi_easting), float(pi_northing), float(back_bearing)
    for value, name in ((e0, "PI easting"), (n0, "PI northing"), (beta, "back bearing")):
        if not math.isfinite(value):
            raise GeometryError(f"{name} must be finite; got {value:g}")
    step = _check_interval(b, interval)
    stations, names, elements = _stations(b, step)
    x, y = _local_xy(b, stations)
    fe, fn = math.sin(beta), math.cos(beta)  # forward along the back tangent
    re, rn = math.cos(beta), -math.sin(beta)  # right normal
    ts_e, ts_n = e0 - b.t1 * fe, n0 - b.t1 * fn
    offset = sign * y
    return SetoutTable(
        station=stations,
        point=names,
        element=elements,
        chord=np.hypot(x, y),
        deflection=sign * np.arctan2(y, x),
        easting=ts_e + x * fe + offset * re,
        northing=ts_n + x * fn + offset * rn,
    )


def versines(radius, chord):
    """Versine [m] of a chord [m] on a circle of ``radius`` [m]: v = R - sqrt(R^2 - (c/2)^2).

    Evaluated as (c/2)^2 / (R + sqrt(R^2 - (c/2)^2)) (the same, without cancellation);
    c^2 / (8R) is the usual approximation, low by about c^4 / (128 R^3).
    A chord longer than the diameter is refused.
    """
    r = np.asarray(radius, dtype=float)
    c = np.asarray(chord, dtype=float)
    check_radius(r)
    require(np.isfinite(c) & (c >= 0), "chord must be a length of 0 m or more", c)
    r, c = np.broadcast_arrays(r, c)
    require(c <= 2.0 * r, "chord must not be longer than the diameter 2R", c)
    half2 = (c / 2.0) ** 2
    return half2 / (r + np.sqrt(r**2 - half2))


@dataclass(frozen=True)
class VersineTable:
    """Versines along one bend: stations [m], element there, versine [m] on ``chord`` [m].

    The versine is the offset of the track at the station from the straight line joining
    the track points c/2 behind and c/2 ahead (measured along the track), positive where
    the track bows out from that chord, away from the bend's centre (as it does on a bend).
    """

    chord: float
    station: np.ndarray
    point: np.ndarray
    element: np.ndarray
    versine: np.ndarray


def versines_along(curve, chord, interval) -> VersineTable:
    """Versines on ``chord`` [m] at the key points and round stations every ``interval`` [m].

    From coordinates: the track points at station - c/2, station and station + c/2 (along
    the track, the tangents continuing beyond the TS and ST). On the arc this gives
    R (1 - cos(c / (2R))), within c^4 / (96 R^3) of versines(R, c); on a spiral it grows
    about linearly with the distance from the TS, as the curvature does.
    """
    b = _bend(curve)
    c = float(chord)
    if not (math.isfinite(c) and c > 0):
        raise GeometryError(f"chord must be a positive length in metres; got {c:g}")
    if c > 2.0 * b.radius:
        raise GeometryError(
            f"chord {c:g} m is longer than the diameter of the {b.radius:g} m radius"
        )
    step = _check_interval(b, interval)
    stations, names, elements = _stations(b, step)
    x0, y0 = _local_xy(b, stations)
    x1, y1 = _local_xy(b, stations - c / 2.0)
    x2, y2 = _local_xy(b, stations + c / 2.0)
    dx, dy = x2 - x1, y2 - y1
    # the bend turns towards +y, so the track at the middle lies to the right of P1 -> P2
    cross = dx * (y0 - y1) - dy * (x0 - x1)
    return VersineTable(
        chord=c,
        station=stations,
        point=names,
        element=elements,
        versine=-cross / np.hypot(dx, dy),
    )
