"""Proposals for a road bend: the radius, superelevation and spiral a designer would start
from, each with the rule it follows. Pure: SI in and out (m, m/s, fractions), no text.

Needs on the radius (the proposal is the largest, rounded up to ``radius_step``):

- minimum radius R_min = v^2 / (k (e_max + f_max))        (Green Book 2018 Eq. 3-10)
- desirable radius: the radius at which the table's distribution gives a design e of
  ``share`` x e_max (``DESIRABLE_SHARE`` = 2/3; common practice, no source), found by
  bisection on the distribution (curvetui.core.superelevation.radius_for_superelevation)
- sight: the radius whose inside-lane sight line (radius R - w/2) clears the obstruction
  offset m for the design stopping sight distance S: R_lane (1 - cos(S / (2 R_lane))) = m
  (the relation of curvetui.core.sight, TxDOT RDM 4.7.9), solved with scipy's brentq on
  the arc form (sight distance within the curve; with the curve length known the check's
  offset needed is never larger, see ``sight_radius``).

The design superelevation at the proposed radius is rounded UP to the table's step; the
spiral length is the minimum of the transition rules (curvetui.core.transitions) rounded up
to ``spiral_step`` when that length stays within the maximum (lateral shift, and R Delta
with a deflection: two equal spirals fit while Ls / R <= Delta), else no spiral; no spiral
either above the table's largest radius for a spiral.

The radius step is 5 m in metric (the Ethiopian Roads Authority's worked example rounds
R = 393.7 m to 395 m, Geometric Design Manual 2002 ch. 8, read) and 10 ft in US customary
(common practice, no source); spiral lengths 5 m / 10 ft (common practice, no source).
Scalar inputs (the root finding is scalar); ``propose_road`` is for one bend.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from curvetui.core import road as road_engine
from curvetui.core import sight as sd
from curvetui.core import transitions as tr
from curvetui.core.road_table import RoadTable
from curvetui.core.superelevation import (
    NORMAL_CROWN,
    REMOVE_CROWN,
    radius_for_superelevation,
)
from curvetui.core.units import FOOT

DESIRABLE_SHARE = 2.0 / 3.0  # design e = 2/3 e_max at the desirable radius: common practice
RADIUS_STEP = {"metric": 5.0, "us": 10.0 * FOOT}  # [m]
SPIRAL_STEP = {"metric": 5.0, "us": 10.0 * FOOT}  # [m]
MAX_STEPS = 100_000  # a radius search never walks further than this many steps

# why a spiral is proposed or not
SPIRAL_PROPOSED, SPIRAL_NOT_NEEDED, SPIRAL_NO_FIT = "proposed", "not needed", "no fit"


def ceil_to(x: float, step: float) -> float:
    """x rounded up to a multiple of ``step``; a value within 1e-12 (relative) above a
    multiple is that multiple (the checks' own tolerance)."""
    q = x / step
    return math.ceil(q - 1e-12 * abs(q)) * step


def minimum_radius(table: RoadTable, speed: float, e_max: float, f_max: float) -> float:
    """R_min = v^2 / (k (e_max + f_max)) [m] (Green Book 2018 Eq. 3-10, SI with k_si)."""
    return float(road_engine.minimum_radius(speed, e_max, f_max, table.k_si))


def design_e(table: RoadTable, speed: float, radius: float, e_max: float) -> float:
    """Design superelevation [fraction] at ``radius`` by the table's distribution."""
    return float(road_engine.design_superelevation(table, speed, radius, e_max))


def desirable_radius(
    table: RoadTable, speed: float, e_max: float, share: float = DESIRABLE_SHARE
) -> float:
    """The radius [m] at which the distribution's design e is ``share`` x e_max (common
    practice, no source): bisection between R_min (e = e_max) and 1000 R_min."""
    f_table = float(table.f_max(speed)[0])
    r_min = minimum_radius(table, speed, e_max, f_table)
    return float(
        radius_for_superelevation(
            share * e_max,
            lambda r: road_engine.design_superelevation(table, speed, r, e_max),
            r_min,
            1000.0 * r_min,
        )
    )


def sight_radius(
    speed: float, offset: float, lane_width: float, units: str, grade: float = 0.0
) -> float:
    """The least radius [m] of the bend whose inside lane (radius R - w/2) sees the design
    stopping sight distance S past an obstruction ``offset`` [m] from the lane centre:
    R_lane (1 - cos(S / (2 R_lane))) = m solved by brentq, R = R_lane + w/2.

    S is the design SSD the sight check uses (Green Book 2018 Eq. 3-2 / 3-3, Table 3-1
    rounding; ``units`` "metric" or "us"). The arc form assumes S within the curve; where
    the curve is shorter the check's sight line runs onto the tangents and needs less
    offset (for S > L, R(1 - cos(L/2R)) + (S - L)/2 sin(L/2R) <= R(1 - cos(S/2R))), so the
    radius found passes either way. The offset R (1 - cos(S / (2R))) falls as R grows only
    while the half angle x = S / (2R) is below x* = 2.3311 rad, the root of
    1 - cos x = x sin x (where its derivative in R is zero); below R = S / (2 x*) the formula
    folds back. Where even that radius clears the offset it is returned (every larger one
    clears it too). NaN where braking cannot stop.
    """
    from scipy.optimize import brentq

    ssd = float(sd.design_stopping_sight_distance(speed, units, grade=grade))
    if not math.isfinite(ssd):
        return math.nan

    def gap(r_lane: float) -> float:
        return float(sd.sightline_offset(r_lane, ssd)) - offset

    x_star = brentq(lambda x: 1.0 - math.cos(x) - x * math.sin(x), 2.0, 3.0, xtol=1e-15)
    lo = ssd / (2.0 * x_star)
    if gap(lo) <= 0.0:
        return lo + lane_width / 2.0
    hi = 2.0 * lo
    while gap(hi) > 0.0:
        hi *= 2.0
    r_lane = brentq(gap, lo, hi, xtol=1e-10, rtol=1e-13, maxiter=200)
    while gap(r_lane) > 0.0:  # the root's last bit on the safe side
        r_lane = math.nextafter(r_lane, math.inf)
    return r_lane + lane_width / 2.0


def rounded_superelevation(e: float, step: float, e_max: float) -> float:
    """Design e rounded up to the table's ``step`` [fractions], never above e_max."""
    return min(ceil_to(e, step), e_max)


@dataclass(frozen=True)
class SpiralChoice:
    """A spiral length [m] (NaN for none), why, and the range it was chosen in [m]."""

    length: float
    why: str  # SPIRAL_PROPOSED, SPIRAL_NOT_NEEDED or SPIRAL_NO_FIT
    length_min: float
    length_max: float  # the lateral-shift maximum, or R Delta where that is less
    governing: str  # the rule giving the minimum
    spiral_radius_max: float  # the table's largest radius for a spiral [m], NaN if none
    runoff: float  # L_r [m]
    runout: float  # L_t [m], NaN for e <= 0


def spiral_choice(
    table: RoadTable,
    speed: float,
    radius: float,
    e: float,
    lane_width: float,
    lanes_rotated: float,
    c: float,
    p_min: float,
    p_max: float,
    step: float,
    deflection: float | None = None,
) -> SpiralChoice:
    """The spiral for a bend (curvetui.core.transitions.road_transition's range), its
    minimum rounded up to ``step``; none above the table's spiral radius or when the
    rounded length passes the maximum. ``deflection`` [rad] adds Ls <= R Delta."""
    t = tr.road_transition(
        table,
        speed,
        radius,
        e,
        lane_width=lane_width,
        lanes_rotated=lanes_rotated,
        c=c,
        p_min=p_min,
        p_max=p_max,
    )
    lo, hi = float(t.spiral_length_min), float(t.spiral_length_max)
    if deflection is not None:
        hi = min(hi, radius * deflection * (1 - 1e-9))
    r_sp = float(table.spiral_radius_max_si(speed))
    common = dict(
        length_min=lo,
        length_max=hi,
        governing=str(t.governing_name),
        spiral_radius_max=r_sp,
        runoff=float(t.runoff),
        runout=float(t.runout),
    )
    if math.isfinite(r_sp) and radius > r_sp * (1 + 1e-12):
        return SpiralChoice(math.nan, SPIRAL_NOT_NEEDED, **common)
    length = ceil_to(lo, step) if math.isfinite(lo) else math.nan
    if not (math.isfinite(length) and length <= hi * (1 + 1e-12)):
        return SpiralChoice(math.nan, SPIRAL_NO_FIT, **common)
    return SpiralChoice(length, SPIRAL_PROPOSED, **common)


@dataclass(frozen=True)
class RoadProposal:
    """A road bend's proposal, SI: each need on the radius, the radius proposed, its design
    e as the distribution gives it and rounded up, the cross-section, and the spiral."""

    min_radius: float  # [m], with the f_max the check uses
    min_radius_rounded: float  # [m], as the table rounds it
    desirable_radius: float  # [m]
    sight_radius: float  # [m], NaN without an obstruction offset
    friction_radius: float  # [m], the least radius on the step whose friction check passes
    radius: float  # proposed [m]
    governing: str  # "minimum", "desirable", "sight" or "friction"
    e_design: float  # at the proposed radius, fraction
    e_proposed: float  # rounded up to the table's step, NaN where the crown is kept
    cross_section: int  # curvetui.core.superelevation code
    spiral: SpiralChoice


def propose_road(
    table: RoadTable,
    speed: float,
    e_max: float,
    friction: float | None,
    lane_width: float,
    lanes_rotated: float,
    spiral_constants: tuple[float, float, float],
    units: str,
    offset: float | None = None,
    grade: float = 0.0,
    deflection: float | None = None,
    share: float = DESIRABLE_SHARE,
) -> RoadProposal:
    """Propose a radius, superelevation and spiral for one road bend (SI scalars).

    ``friction`` (None: the table's f_max) is the factor the check holds the bend to;
    ``spiral_constants`` (C [m/s^3], p_min [m], p_max [m]); ``units`` picks the steps and
    the sight-distance form. The radius is the largest need rounded up to RADIUS_STEP, then
    walked up the step until the engine's radius, friction and superelevation checks pass
    with the rounded e (only a friction factor below the table's needs that).
    """
    f_table = float(table.f_max(speed)[0])
    f_check = f_table if friction is None else friction
    r_min = minimum_radius(table, speed, e_max, f_check)
    r_des = desirable_radius(table, speed, e_max, share)
    r_sight = (
        sight_radius(speed, offset, lane_width, units, grade) if offset is not None else math.nan
    )
    needs = {"minimum": r_min, "desirable": r_des, "sight": r_sight}
    governing = max((k for k in needs if math.isfinite(needs[k])), key=lambda k: needs[k])
    step = RADIUS_STEP[units]
    r0 = ceil_to(needs[governing], step)
    e_step = table.superelevation_step

    def section_at(r: float) -> tuple[float, float, int]:
        e_d = design_e(table, speed, r, e_max)
        at_emax = r <= minimum_radius(table, speed, e_max, f_table)
        code = int(road_engine.design_section(table, speed, r, e_d, e_max, f_table, at_emax))
        if code == NORMAL_CROWN:
            return e_d, math.nan, code
        e_p = table.normal_crown if code == REMOVE_CROWN else e_d
        return e_d, rounded_superelevation(e_p, e_step, e_max), code

    radius = r0
    for i in range(MAX_STEPS):
        radius = r0 + i * step
        e_d, e_p, code = section_at(radius)
        check = road_engine.check_road(
            table, speed, radius, e_max, e_p, np.nan if friction is None else friction
        )
        if not (int(check.flags) & road_engine.FAIL_MASK):
            break
    if radius > r0:
        governing = "friction"
    c, p_min, p_max = spiral_constants
    e_use = e_p if math.isfinite(e_p) else -table.normal_crown
    spiral = spiral_choice(
        table,
        speed,
        radius,
        e_use,
        lane_width,
        lanes_rotated,
        c,
        p_min,
        p_max,
        SPIRAL_STEP[units],
        deflection,
    )
    return RoadProposal(
        min_radius=r_min,
        min_radius_rounded=float(table.round_radius_si(r_min)),
        desirable_radius=r_des,
        sight_radius=r_sight,
        friction_radius=radius if governing == "friction" else math.nan,
        radius=radius,
        governing=governing,
        e_design=e_d,
        e_proposed=e_p,
        cross_section=code,
        spiral=spiral,
    )
