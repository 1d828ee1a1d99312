"""Transition (spiral) lengths for road bends and railway curves, with the superelevation
runoff and tangent runout of a road bend.

Road (AASHTO Green Book, 7th ed., 2018, section 3.3.8 spiral curve transitions and
section 3.3.8.5 / Table 3-16 runoff; equation numbers from memory):

    comfort        L = v^3 / (C R)           metric form 0.0214 V^3 / (R C) (V km/h, C m/s^3),
                                             US 3.15 V^3 / (R C); C up to 1.2 m/s^3 (4 ft/s^3)
    lateral shift  L_min = sqrt(24 p_min R), L_max = sqrt(24 p_max R), p = L^2 / (24 R),
                   p_min = 0.20 m, p_max = 1.0 m
    runoff         L_r = (w n1) e_d b_w / Delta,   b_w = (1 + 0.5 (n1 - 1)) / n1
    runout         L_t = e_NC L_r / e_d

w lane width, n1 lanes rotated, Delta the maximum relative gradient of the road table at
the design speed. The spiral length must reach every minimum (the runoff being run over
the spiral) and stay within the lateral-shift maximum.

Rail (rates along a linear cant ramp run at speed v; EN 13803-1:2010 limits, from memory):

    L1 = E / (dE/ds)max      L2 = E v / (dE/dt)max      L3 = |D| v / (dD/dt)max
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from curvetui.core.rail import RailLimits
from curvetui.core.road_table import ABOVE_TABLE, BELOW_TABLE, INTERPOLATED, RoadTable

# ---- road ------------------------------------------------------------------------------

ROAD_GOVERNING = ("comfort", "lateral shift", "runoff")  # codes 0, 1, 2 of `governing`
COMFORT, LATERAL_SHIFT, RUNOFF = 0, 1, 2

# Road transition flags, one bit each.
FAIL_NO_SPIRAL_LENGTH = 1 << 0  # minimum above maximum (or not computable): no length fits
WARN_GRADIENT_INTERPOLATED = 1 << 1  # design speed between table rows
WARN_SPEED_BELOW_TABLE = 1 << 2  # speed below the first row: no relative gradient
WARN_SPEED_ABOVE_TABLE = 1 << 3  # speed above the last row: no relative gradient
WARN_GRADIENT_NOT_POSITIVE = 1 << 4  # no gradient above 0 (outside the table): no runoff
NOTE_NO_SUPERELEVATION = 1 << 5  # e <= 0: no runoff, runout not defined
ROAD_FAIL_MASK = FAIL_NO_SPIRAL_LENGTH


def comfort_length(speed, radius, c=1.2):
    """Spiral length [m] for a rate of change of lateral acceleration C [m/s^3]:
    L = v^3 / (C R) (Green Book 2018 sec. 3.3.8; 0.0214 V^3 / (R C) metric, 0.0214 = 1/3.6^3
    rounded). speed [m/s], radius [m]."""
    return np.asarray(speed, dtype=float) ** 3 / (np.asarray(c, dtype=float) * np.asarray(radius))


def shift_length(radius, shift):
    """Spiral length [m] whose lateral shift of the circular arc is ``shift`` [m]:
    L = sqrt(24 p R) (Green Book 2018 sec. 3.3.8, from memory)."""
    return np.sqrt(24.0 * np.asarray(shift, dtype=float) * np.asarray(radius, dtype=float))


def lateral_shift(length, radius):
    """Lateral shift [m] of the arc by a spiral of ``length`` [m]: p = L^2 / (24 R)."""
    return np.asarray(length, dtype=float) ** 2 / (24.0 * np.asarray(radius, dtype=float))


def runoff_width_factor(lanes_rotated):
    """Adjustment factor for the number of lanes rotated, b_w = (1 + 0.5 (n1 - 1)) / n1
    (Green Book Table 3-16 / its formula, read via a design sheet)."""
    n1 = np.asarray(lanes_rotated, dtype=float)
    return (1.0 + 0.5 * (n1 - 1.0)) / n1


def superelevation_runoff(superelevation, relative_gradient, lane_width=3.6, lanes_rotated=1):
    """Superelevation runoff [m]: L_r = (w n1) e_d b_w / Delta (Green Book 2018, from memory).

    superelevation e_d and relative_gradient Delta as fractions, lane_width w [m]. A gradient
    that is not positive gives inf.
    """
    e = np.asarray(superelevation, dtype=float)
    delta = np.asarray(relative_gradient, dtype=float)
    n1 = np.asarray(lanes_rotated, dtype=float)
    rise = np.asarray(lane_width, dtype=float) * n1 * e * runoff_width_factor(n1)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(delta > 0, rise / np.where(delta > 0, delta, 1.0), np.inf)


def tangent_runout(runoff, superelevation, normal_crown=0.02):
    """Tangent runout [m]: L_t = e_NC L_r / e_d (Green Book 2018, from memory); NaN for e <= 0."""
    e = np.asarray(superelevation, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        lt = np.asarray(normal_crown, dtype=float) * np.asarray(runoff, dtype=float) / e
    return np.where(e > 0, lt, np.nan)


@dataclass(frozen=True)
class RoadTransition:
    """Spiral lengths and runoff of road bends, SI (m, m/s, fractions), arrays broadcast."""

    speed: np.ndarray  # design speed [m/s]
    radius: np.ndarray  # [m]
    superelevation: np.ndarray  # e_d, fraction
    relative_gradient: np.ndarray  # Delta from the table, fraction
    length_comfort: np.ndarray  # v^3 / (C R) [m]
    length_shift_min: np.ndarray  # sqrt(24 p_min R) [m]
    length_shift_max: np.ndarray  # sqrt(24 p_max R) [m]
    runoff: np.ndarray  # L_r [m]
    runout: np.ndarray  # L_t [m], NaN where e <= 0
    spiral_length_min: np.ndarray  # the governing minimum [m]
    spiral_length_max: np.ndarray  # [m]
    governing: np.ndarray  # index into ROAD_GOVERNING of the criterion giving the minimum
    flags: np.ndarray  # bit set of FAIL_* / WARN_* / NOTE_*

    @property
    def failed(self) -> np.ndarray:
        return (self.flags & ROAD_FAIL_MASK) != 0

    @property
    def governing_name(self) -> np.ndarray:
        return np.asarray(ROAD_GOVERNING, dtype=object)[self.governing]


def road_transition(
    table: RoadTable,
    speed,
    radius,
    superelevation,
    lane_width=3.6,
    lanes_rotated=1,
    normal_crown=None,
    c=1.2,
    p_min=0.2,
    p_max=1.0,
) -> RoadTransition:
    """Spiral length range, runoff and runout for road bends. SI inputs; any may be arrays.

    The maximum relative gradient is looked up in ``table`` at the design speed (flagged
    when interpolated, or NaN outside the table); ``normal_crown`` [fraction] defaults to
    the table's.
    The minimum spiral length is the largest of the comfort, lateral-shift and runoff
    lengths (ties go to the first in ROAD_GOVERNING); the maximum is the lateral-shift one.
    """
    crown = table.normal_crown if normal_crown is None else normal_crown
    v, r, e, w, n1, e_nc, cc, pn, px = np.broadcast_arrays(
        *(
            np.asarray(x, dtype=float)
            for x in (
                speed,
                radius,
                superelevation,
                lane_width,
                lanes_rotated,
                crown,
                c,
                p_min,
                p_max,
            )
        )
    )
    delta, kind = table.lookup(table.relative_gradient, v)
    l_comfort = comfort_length(v, r, cc)
    l_min_shift = shift_length(r, pn)
    l_max_shift = shift_length(r, px)
    l_runoff = superelevation_runoff(np.maximum(e, 0.0), delta, w, n1)
    l_runout = tangent_runout(l_runoff, e, e_nc)

    stack = np.stack([l_comfort, l_min_shift, l_runoff])
    l_min = np.max(stack, axis=0)
    governing = np.argmax(stack, axis=0)
    with np.errstate(invalid="ignore"):
        fits = l_min <= l_max_shift * (1 + 1e-12)

    flags = np.zeros(v.shape, dtype=np.int64)
    flags |= np.where(fits, 0, FAIL_NO_SPIRAL_LENGTH)
    flags |= np.where(kind == INTERPOLATED, WARN_GRADIENT_INTERPOLATED, 0)
    flags |= np.where(kind == BELOW_TABLE, WARN_SPEED_BELOW_TABLE, 0)
    flags |= np.where(kind == ABOVE_TABLE, WARN_SPEED_ABOVE_TABLE, 0)
    flags |= np.where(delta > 0, 0, WARN_GRADIENT_NOT_POSITIVE)
    flags |= np.where(e > 0, 0, NOTE_NO_SUPERELEVATION)
    return RoadTransition(
        speed=v,
        radius=r,
        superelevation=e,
        relative_gradient=delta,
        length_comfort=l_comfort,
        length_shift_min=l_min_shift,
        length_shift_max=l_max_shift,
        runoff=l_runoff,
        runout=l_runout,
        spiral_length_min=l_min,
        spiral_length_max=l_max_shift,
        governing=governing,
        flags=flags,
    )


# ---- rail ------------------------------------------------------------------------------

RAIL_GOVERNING = ("cant gradient", "rate of change of cant", "rate of change of cant deficiency")
CANT_GRADIENT, CANT_RATE, DEFICIENCY_RATE = 0, 1, 2
NONE_EVALUATED = -1  # `governing` where no criterion had a limit

# Rail transition flags, one bit each. A criterion without a limit is not evaluated.
WARN_CANT_GRADIENT_NOT_EVALUATED = 1 << 0
WARN_CANT_RATE_NOT_EVALUATED = 1 << 1
WARN_DEFICIENCY_RATE_NOT_EVALUATED = 1 << 2
FAIL_NONE_EVALUATED = 1 << 3  # no criterion had a limit: no length found
NOTE_NEGATIVE_DEFICIENCY = 1 << 4  # train below equilibrium: |D| used
WARN_SPEED_OUTSIDE_LIMITS = 1 << 5  # speed above the limits file's last band
RAIL_FAIL_MASK = FAIL_NONE_EVALUATED


@dataclass(frozen=True)
class RailTransition:
    """Transition lengths of railway curves by each criterion, SI (m, m/s), arrays broadcast.

    A length is NaN where its limit is missing (that criterion was not evaluated).
    """

    cant: np.ndarray  # E [m]
    cant_deficiency: np.ndarray  # D [m]
    speed: np.ndarray  # [m/s]
    length_cant_gradient: np.ndarray  # E / (dE/ds)max [m]
    length_cant_rate: np.ndarray  # E v / (dE/dt)max [m]
    length_deficiency_rate: np.ndarray  # |D| v / (dD/dt)max [m]
    length: np.ndarray  # the governing (largest) evaluated length [m], NaN if none
    governing: np.ndarray  # index into RAIL_GOVERNING, NONE_EVALUATED (-1) if none
    flags: np.ndarray

    @property
    def failed(self) -> np.ndarray:
        return (self.flags & RAIL_FAIL_MASK) != 0

    @property
    def governing_name(self) -> np.ndarray:
        names = np.asarray((*RAIL_GOVERNING, "none evaluated"), dtype=object)
        return names[self.governing]


def rail_transition(
    cant, cant_deficiency, speed, cant_gradient_max, cant_rate_max, deficiency_rate_max
) -> RailTransition:
    """Transition length of a linear cant ramp. SI: cant and deficiency [m], speed [m/s],
    cant gradient [m/m], rates [m/s]; NaN limits leave their criterion unevaluated.

    L1 = E / (dE/ds)max, L2 = E v / (dE/dt)max, L3 = |D| v / (dD/dt)max: along a ramp of
    length L run at v, dE/ds = E / L, dE/dt = E v / L and dD/dt = D v / L. A negative
    deficiency (excess) changes at the same rate, so |D| is used (common practice, no source).
    """
    e, d, v, g_max, r_max, dr_max = np.broadcast_arrays(
        *(
            np.asarray(x, dtype=float)
            for x in (
                cant,
                cant_deficiency,
                speed,
                cant_gradient_max,
                cant_rate_max,
                deficiency_rate_max,
            )
        )
    )
    with np.errstate(divide="ignore", invalid="ignore"):
        l1 = e / g_max
        l2 = e * v / r_max
        l3 = np.abs(d) * v / dr_max
    stack = np.stack([l1, l2, l3])
    evaluated = ~np.isnan(np.stack([g_max, r_max, dr_max]))
    any_eval = evaluated.any(axis=0)
    masked = np.where(evaluated, stack, -np.inf)
    governing = np.where(any_eval, np.argmax(masked, axis=0), NONE_EVALUATED)
    length = np.where(any_eval, np.max(masked, axis=0), np.nan)

    flags = np.zeros(e.shape, dtype=np.int64)
    flags |= np.where(evaluated[0], 0, WARN_CANT_GRADIENT_NOT_EVALUATED)
    flags |= np.where(evaluated[1], 0, WARN_CANT_RATE_NOT_EVALUATED)
    flags |= np.where(evaluated[2], 0, WARN_DEFICIENCY_RATE_NOT_EVALUATED)
    flags |= np.where(any_eval, 0, FAIL_NONE_EVALUATED)
    flags |= np.where(d < 0, NOTE_NEGATIVE_DEFICIENCY, 0)
    return RailTransition(
        cant=e,
        cant_deficiency=d,
        speed=v,
        length_cant_gradient=l1,
        length_cant_rate=l2,
        length_deficiency_rate=l3,
        length=length,
        governing=governing,
        flags=flags,
    )


def transition_limits(limits: RailLimits, speed):
    """The band's (cant_gradient_max, cant_rate_max, deficiency_rate_max) at ``speed`` [m/s]
    and whether the speed lies above the last band. NaN where the file sets none."""
    band, above = limits.band(speed)
    n = len(limits.speed_max)
    out = tuple(
        np.broadcast_to(np.asarray(getattr(limits, key), dtype=float), (n,))[band]
        for key in ("cant_gradient_max", "cant_rate_max", "deficiency_rate_max")
    )
    return (*out, above)


def rail_transition_for(limits: RailLimits, cant, cant_deficiency, speed) -> RailTransition:
    """rail_transition with the limits of ``limits``' speed band (flagged above the last)."""
    g_max, r_max, dr_max, above = transition_limits(limits, speed)
    result = rail_transition(cant, cant_deficiency, speed, g_max, r_max, dr_max)
    flags = result.flags | np.where(above, WARN_SPEED_OUTSIDE_LIMITS, 0)
    return replace(result, flags=np.asarray(flags, dtype=np.int64))


def runoff_stations(pc, pt, runoff, runout, share_on_tangent=2.0 / 3.0) -> dict:
    """Stations [m] of the superelevation transition of a simple curve (no spiral).

    A share ``share_on_tangent`` of the runoff L_r lies on the tangent before the PC (and
    after the PT), the rest on the curve; the tangent runout L_t precedes the runoff:
    runout start = PC - s L_r - L_t, level crown = PC - s L_r, full superelevation from
    PC + (1 - s) L_r to PT - (1 - s) L_r, then level crown at PT + s L_r and the runout end
    at PT + s L_r + L_t. AASHTO advises 60 to 90 % of the runoff on the tangent (Rosenow,
    MnDOT 2015, abstract, read); the *Highway Engineering Handbook* places two-thirds of
    full superelevation at the PC and PT (read). ``too_short`` is True where the curve is
    shorter than the two shares of the runoff it must carry, so full superelevation is
    never reached.
    """
    s = np.asarray(share_on_tangent, dtype=float)
    lr = np.asarray(runoff, dtype=float)
    lt = np.asarray(runout, dtype=float)
    pc, pt = np.asarray(pc, dtype=float), np.asarray(pt, dtype=float)
    full_in = pc + (1.0 - s) * lr
    full_out = pt - (1.0 - s) * lr
    return {
        "runout_start": pc - s * lr - lt,
        "level_crown_in": pc - s * lr,
        "full_superelevation_in": full_in,
        "full_superelevation_out": full_out,
        "level_crown_out": pt + s * lr,
        "runout_end": pt + s * lr + lt,
        "too_short": full_in > full_out,
    }
