"""The superelevation diagram of a road bend: the cross slope of each edge against station,
the key stations of the transition and the edge elevations about the axis of rotation.

Model (SI: stations and widths in m, slopes as fractions). A two-lane crowned road, crown
on the centreline, each half ``w_in`` / ``w_out`` wide (centreline to the inside / outside
edge). Slopes are signed as the superelevation: positive where the lane rises towards the
OUTSIDE edge of the curve, so the normal crown is ``-e_NC`` on the outside half (adverse)
and ``+e_NC`` on the inside half, and a plane section at e is ``+e`` on both.

The outside half turns at one rate through the tangent runout and the runoff (the runout
L_t = e_NC L_r / e of Green Book 2018 makes the two rates equal, from memory):

    ramp_in(x)  = e (x - LC_in) / L_in        ramp_out(x) = e (LC_out - x) / L_out
    s_out(x)    = clip(min(ramp_in, ramp_out), -e_NC, e)
    s_in(x)     = max(s_out(x), e_NC)         (the inside half keeps its crown until the
                                               outside half reaches it: reverse crown)

Key stations, each end: normal crown LC -/+ (e_NC / e) L (runout start / end), level crown
LC (adverse crown removed, outside half flat), reverse crown LC +/- (e_NC / e) L (both
halves at +e_NC), full superelevation LC +/- L. Placement: a simple curve has a share s of
the runoff L_r on the tangent, LC_in = PC - s L_r, L = L_r (AASHTO: 60 to 90 % on the
tangent, Rosenow 2015; two-thirds of e at the PC, Highway Engineering Handbook, both read);
a spiralled bend runs the runoff over the spiral, LC_in = TS, L_in = L_s,in, LC_out = ST,
L_out = L_s,out (Highway Engineering Handbook, "spiral length = runoff length", read).
Where the two ends overlap (a short curve), ``min`` caps the slope at the crossing of the
ramps: full superelevation is never reached and ``too_short`` says so.

Elevations relative to the profile grade line (PGL). Convention (common practice, no
source; the Green Book's figure of the methods of rotation shows the three axes, from
memory): the PGL is the centreline's profile on the tangent, where the section has its
normal crown. Relative to the centreline the outside edge is at ``s_out w_out`` and the
inside edge at ``-s_in w_in``. The axis of rotation keeps the elevation it has at normal
crown: the centreline axis keeps 0; the inside edge keeps ``-e_NC w_in``; the outside edge
keeps ``-e_NC w_out``; the centreline moves by what the axis would otherwise move:

    z_cl = z_axis,NC - z_axis(x)      z_out = z_cl + s_out w_out      z_in = z_cl - s_in w_in
"""

from __future__ import annotations

import numpy as np

from curvetui.core.rotation import AXES  # noqa: F401 - the axes, re-exported

CENTRELINE, INSIDE, OUTSIDE = 0, 1, 2

# key points in station order along a bend that reaches full superelevation
KEY_POINTS = (
    "normal_crown_in",
    "level_crown_in",
    "reverse_crown_in",
    "full_superelevation_in",
    "full_superelevation_out",
    "reverse_crown_out",
    "level_crown_out",
    "normal_crown_out",
)


def simple_placement(pc, pt, runoff, share_on_tangent):
    """(LC_in, LC_out, L_in, L_out) [m] of a simple curve: a share s of L_r on each tangent,
    LC_in = PC - s L_r, LC_out = PT + s L_r, L_in = L_out = L_r."""
    lr = np.asarray(runoff, dtype=float)
    s = np.asarray(share_on_tangent, dtype=float)
    return np.asarray(pc) - s * lr, np.asarray(pt) + s * lr, lr, lr


def spiral_placement(ts, st, spiral_in, spiral_out):
    """(LC_in, LC_out, L_in, L_out) [m] of a spiralled bend: level crown at the TS and ST,
    full superelevation at the SC and CS (the runoff over each spiral)."""
    return (
        np.asarray(ts, dtype=float),
        np.asarray(st, dtype=float),
        np.asarray(spiral_in, dtype=float),
        np.asarray(spiral_out, dtype=float),
    )


def key_stations(lc_in, lc_out, l_in, l_out, e, e_nc) -> dict:
    """Stations [m] of KEY_POINTS, plus ``peak`` (the station of the highest slope, the
    middle of the full-superelevation stretch or the crossing of the ramps), ``peak_slope``
    (the highest superelevation reached) and ``too_short`` (full superelevation never
    reached). Needs e > 0: NaN elsewhere."""
    e = np.asarray(e, dtype=float)
    e_nc = np.asarray(e_nc, dtype=float)
    l_in, l_out = np.asarray(l_in, dtype=float), np.asarray(l_out, dtype=float)
    lc_in, lc_out = np.asarray(lc_in, dtype=float), np.asarray(lc_out, dtype=float)
    ok = e > 0
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        k = np.where(ok, e_nc / np.where(ok, e, 1.0), np.nan)  # share of L per e_NC of turn
        # a subnormal e overflows k: no finite stations, so no diagram (NaN, as for e <= 0)
        ok = ok & np.isfinite(k * l_in) & np.isfinite(k * l_out)
        k = np.where(ok, k, np.nan)
    out = {
        "normal_crown_in": lc_in - k * l_in,
        "level_crown_in": lc_in + 0 * k,
        "reverse_crown_in": lc_in + k * l_in,
        "full_superelevation_in": lc_in + l_in + 0 * k,
        "full_superelevation_out": lc_out - l_out + 0 * k,
        "reverse_crown_out": lc_out - k * l_out,
        "level_crown_out": lc_out + 0 * k,
        "normal_crown_out": lc_out + k * l_out,
    }
    full_in, full_out = out["full_superelevation_in"], out["full_superelevation_out"]
    with np.errstate(invalid="ignore"):
        too_short = full_in > full_out
        # the ramps cross where e (x - LC_in) / L_in = e (LC_out - x) / L_out
        cross = (lc_in * l_out + lc_out * l_in) / (l_in + l_out)
    peak = np.where(too_short, cross, 0.5 * (full_in + full_out))
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):  # where not too_short
        peak_slope = np.where(too_short, e * (cross - lc_in) / l_in, e)
    out["peak"] = np.where(ok, peak, np.nan)
    out["peak_slope"] = np.where(ok, peak_slope, np.nan)
    out["too_short"] = np.asarray(too_short & ok)
    return out


def edge_slopes(station, lc_in, lc_out, l_in, l_out, e, e_nc):
    """(s_out, s_in): the cross slope [fraction] of the outside and inside halves at
    ``station`` [m], signed as the superelevation (+ rises towards the outside edge)."""
    x = np.asarray(station, dtype=float)
    e = np.asarray(e, dtype=float)
    e_nc = np.asarray(e_nc, dtype=float)
    # a ramp of (nearly) no length overflows to +-inf, which the clip below takes to its
    # ends: a step from normal crown to full superelevation
    with np.errstate(divide="ignore", over="ignore", invalid="ignore"):
        ramp_in = e * (x - lc_in) / np.asarray(l_in, dtype=float)
        ramp_out = e * (np.asarray(lc_out) - x) / np.asarray(l_out, dtype=float)
    s_out = np.clip(np.minimum(ramp_in, ramp_out), -e_nc, e)
    s_in = np.maximum(s_out, e_nc)
    return s_out, s_in


def edge_elevations(s_out, s_in, w_out, w_in, e_nc, axis):
    """(z_out, z_cl, z_in): elevations [m] of the outside edge, centreline and inside edge
    relative to the profile grade line, for ``axis`` (CENTRELINE, INSIDE or OUTSIDE; an
    array of codes broadcasts). See the module's convention."""
    s_out, s_in = np.asarray(s_out, dtype=float), np.asarray(s_in, dtype=float)
    w_out, w_in = np.asarray(w_out, dtype=float), np.asarray(w_in, dtype=float)
    e_nc = np.asarray(e_nc, dtype=float)
    axis = np.asarray(axis)
    out_rel, in_rel = s_out * w_out, -s_in * w_in  # relative to the centreline
    z_cl = np.where(
        axis == INSIDE,
        -e_nc * w_in - in_rel,
        np.where(axis == OUTSIDE, -e_nc * w_out - out_rel, 0.0),
    )
    return z_cl + out_rel, z_cl + 0.0 * out_rel, z_cl + in_rel
