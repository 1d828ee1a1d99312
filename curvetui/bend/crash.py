"""A road bend's curve crash modification factors (part of the evaluation step, see
curvetui.bend.evaluate; formulas, sources and validity in curvetui.core.crash_factors).

For road bends with a deflection (the curve length is known): the horizontal curvature
factor (HSM 1st ed. 2010 Eq. 10-13) from the circular arc's length (spirals left out), the
radius and S (0.5 for each end with a spiral); with a built superelevation also the
superelevation variance SV = design e (the table's distribution) - built e and its factor
(Eqs. 10-14..16), and the product of the two. Without a deflection there is none. A bend
outside Eq. 10-13's range carries the flag CRASH_OUTSIDE_RANGE (a warning) and the words in
``crash.curvature_validity``; the factor is never clamped. The HSM's factors are for rural
two-lane, two-way roads.
"""

from __future__ import annotations

import numpy as np

from curvetui.core import crash_factors as cf

IN_RANGE = "in range"


def road_crash_factors(ev, rows: np.ndarray, check, flag_outside: int) -> None:
    """``crash.*`` of the road rows ``rows`` (their RoadCheck ``check``)."""
    units, si, present = ev.ctx.units, ev.parsed.si, ev.parsed.present
    values = ev.values
    arc = np.where(
        np.isfinite(values["geometry.length"][rows]),
        values["geometry.length"][rows],
        values["geometry.circular_length"][rows],
    )
    known = np.isfinite(arc)
    if not known.any():
        return
    at = rows[known]
    spirals = cf.spiral_presence(
        ev.spiral_length("spiral_in", at), ev.spiral_length("spiral_out", at)
    )
    radius = si["radius"][at]
    c = cf.curvature_cmf(units.length_to_si(arc[known]), radius, spirals)
    values["crash.curvature_cmf"][at] = c.cmf
    values["crash.curve_length_mi"][at] = c.length_mi
    values["crash.radius_ft"][at] = c.radius_ft
    values["crash.spirals"][at] = c.spirals
    flags = np.asarray(c.flags)
    # the words of each distinct flag value once (a few), not of every row (a million)
    distinct, which = np.unique(flags, return_inverse=True)
    words = np.array([cf.flag_text(int(f)) or IN_RANGE for f in distinct], dtype=object)
    ev.texts["crash.curvature_validity"][at] = words[which.reshape(-1)]
    ev.bend_flags[at[flags != 0]] |= flag_outside

    built = present["superelevation"][at]
    if built.any():
        e_rows = at[built]
        design = np.asarray(check.superelevation_design)[known][built]
        sv = design - si["superelevation"][e_rows]
        sv_cmf = cf.superelevation_variance_cmf(sv)
        values["crash.superelevation_variance"][e_rows] = sv
        values["crash.superelevation_cmf"][e_rows] = sv_cmf
        values["crash.cmf"][e_rows] = c.cmf[built] * sv_cmf


def outside_text(ev, i, ref, units) -> str:
    """The message of a bend outside Eq. 10-13's range (row ``i`` of the evaluation)."""
    return (
        f"curve crash factor outside the HSM's range: {ev.texts['crash.curvature_validity'][i]}"
        " (limits from memory); the value is the equation's, not clamped"
    )
