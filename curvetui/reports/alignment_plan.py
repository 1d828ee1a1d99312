"""The whole alignment in plan, to bearing: easting and northing [m] of the centreline, its
key points (TS, SC, CS, ST or PC, PT) and round stations, and the PIs; numpy only, for the
app's plan view and the worksheet's alignment page.

Each bend is set out by ``curvetui.core.setout.setout_points`` from its PI, the bearing of
the leg before it and its direction; a tangent between bends is the straight line from one
bend's ST to the next one's TS, stationed linearly.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from curvetui.core.alignment import bearing
from curvetui.core.circular import circular_curve
from curvetui.core.setout import setout_points

DRAW_POINTS_PER_BEND = 64  # enough for a smooth curve at page and terminal sizes


@dataclass(frozen=True)
class PlanPoint:
    """A named point: a key point ('TS', 'PC'...), a round station ('') or a PI."""

    name: str
    station: float  # [m]; NaN for a PI
    east: float
    north: float
    bend: int  # 0-based bend index; -1 on a tangent


@dataclass
class AlignmentPlan:
    """The centreline in pieces (one per tangent and per bend, in order, metres), the key
    points, the round stations every ``interval`` [m], and the PIs with their bend ids."""

    pieces: list[tuple[int, np.ndarray, np.ndarray]] = field(
        default_factory=list
    )  # (bend|-1, E, N)
    key_points: list[PlanPoint] = field(default_factory=list)
    ticks: list[PlanPoint] = field(default_factory=list)
    pis: list[PlanPoint] = field(default_factory=list)
    interval: float = 0.0

    def bounds(self) -> tuple[float, float, float, float]:
        es = np.concatenate([p[1] for p in self.pieces] + [np.array([q.east for q in self.pis])])
        ns = np.concatenate([p[2] for p in self.pieces] + [np.array([q.north for q in self.pis])])
        return float(es.min()), float(es.max()), float(ns.min()), float(ns.max())


def nice_interval(length: float, count: int = 10, unit: float = 1.0) -> float:
    """A round station interval [m] near ``length / count``, round in the user's unit
    (``unit`` metres each): 1, 2 or 5 times a power of ten."""
    raw = max(length / unit / count, 1e-9)
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 5, 10) if m * mag >= raw)
    return step * unit


def alignment_plan(chain, built, bend_ids: list[str], interval: float) -> AlignmentPlan:
    """The plan of a laid-out alignment (``chain``: core.alignment.Chain, ``built``: its
    Alignment), round stations every ``interval`` [m]."""
    plan = AlignmentPlan(interval=interval)
    pts = chain.points
    legs = [bearing(pts[i], pts[i + 1]) for i in range(len(pts) - 1)]
    here, station = pts[0], chain.start_station  # where the last piece ended

    def tangent(to_station: float, heading: float, bend: int) -> tuple[float, float]:
        e0, n0 = here
        fe, fn = math.sin(heading), math.cos(heading)
        length = to_station - station
        end = (e0 + length * fe, n0 + length * fn)
        if length > 0:
            plan.pieces.append((-1, np.array([e0, end[0]]), np.array([n0, end[1]])))
            first = math.floor(station / interval) + 1
            for k in range(first, math.ceil(to_station / interval)):
                s = k * interval
                d = s - station
                plan.ticks.append(PlanPoint("", s, e0 + d * fe, n0 + d * fn, bend))
        return end

    for i, b in enumerate(built.bends):
        g = b.geometry
        ts = float(g.ts)  # = PC for a simple curve
        if ts > station:
            here = tangent(ts, legs[i], -1)
            station = ts
        e, n = pts[i + 1]
        if float(g.ls_in) <= 0 and float(g.ls_out) <= 0:  # a simple curve: PC and PT
            g = circular_curve(float(g.radius), float(g.deflection), float(g.pi))
        length = float(fine_length(g))
        fine = setout_points(g, e, n, legs[i], length / DRAW_POINTS_PER_BEND, b.direction)
        plan.pieces.append((i, fine.easting, fine.northing))
        ticks = setout_points(g, e, n, legs[i], interval, b.direction)
        for name, s, pe, pn in zip(
            ticks.point, ticks.station, ticks.easting, ticks.northing, strict=True
        ):
            point = PlanPoint(str(name), float(s), float(pe), float(pn), i)
            (plan.key_points if name else plan.ticks).append(point)
        plan.pis.append(PlanPoint(bend_ids[i], math.nan, e, n, i))
        here, station = (float(fine.easting[-1]), float(fine.northing[-1])), float(fine.station[-1])
    tangent(built.end_station, legs[-1], -1)
    return plan


def fine_length(curve) -> float:
    """A bend's length [m], spiralled (total length) or simple (arc length)."""
    return float(getattr(curve, "total_length", getattr(curve, "length", 0.0)))
