"""A bend's geometry in the evaluation step (see curvetui.bend.evaluate): the simple curve
(curvetui.core.circular) or the spiral - arc - spiral (curvetui.core.spiral) of the rows
with a deflection, in the user's units, with the spiral lengths used (for the working)."""

from __future__ import annotations

import numpy as np

from curvetui.bend.parse import Issue
from curvetui.core.circular import circular_curve


def bend_geometry(ev, rows, r, flag_skipped: int) -> np.ndarray:
    """Circular or spiral geometry of the rows with a deflection; the curve length [m]
    (NaN without). Spirals that overlap are an input issue of the row."""
    from curvetui.core.spiral import overlap_message, spiral_curve

    units, si, present = ev.ctx.units, ev.parsed.si, ev.parsed.present
    length = np.full(len(rows), np.nan)
    has_d = present["deflection"][rows]
    given = present["spiral_in"][rows] | present["spiral_out"][rows] | present["pi_station"][rows]
    ev.bend_flags[rows[~has_d & given]] |= flag_skipped
    d = si["deflection"][rows]
    pi = np.where(present["pi_station"][rows], si["pi_station"][rows], 0.0)
    l1, l2 = ev.spiral_length("spiral_in", rows), ev.spiral_length("spiral_out", rows)

    def put(key, at, values, angle=False):
        ev.values[f"geometry.{key}"][rows[at]] = (
            np.degrees(values) if angle else units.length_from_si(np.asarray(values))
        )

    circ = np.nonzero(has_d & (l1 <= 0) & (l2 <= 0))[0]
    if len(circ):
        c = circular_curve(r[circ], np.radians(d[circ]), pi[circ])
        ev.texts["geometry.type"][rows[circ]] = "circular"
        put("deflection", circ, np.radians(d[circ]), angle=True)
        for key in ("tangent", "length", "external", "middle_ordinate", "long_chord"):
            put(key, circ, getattr(c, key))
        for key in ("pi", "pc", "pt"):
            put(key, circ, getattr(c, key))
        length[circ] = c.length
    spir = np.nonzero(has_d & ((l1 > 0) | (l2 > 0)))[0]
    if len(spir):
        with np.errstate(all="ignore"):
            s = spiral_curve(r[spir], np.radians(d[spir]), l1[spir], l2[spir], pi[spir])
        overlap = np.asarray(s.overlap) | ~np.isfinite(s.total_length)
        for j in np.nonzero(overlap)[0]:
            k = spir[j]
            text = overlap_message(float(r[k]), float(np.radians(d[k])), float(l1[k]), float(l2[k]))
            ev.issues.append(Issue(int(rows[k]), "spiral_in", text))
        ok = np.nonzero(~overlap)[0]
        at = spir[ok]
        ev.texts["geometry.type"][rows[at]] = "spiral-curve-spiral"
        put("deflection", at, np.radians(d[at]), angle=True)
        put("spiral_length", at, l1[at])
        put("spiral_angle", at, s.theta_in[ok], angle=True)
        for key, name in (
            ("xs", "xs_in"),
            ("ys", "ys_in"),
            ("p", "p_in"),
            ("k", "k_in"),
            ("total_tangent", "tangent_in"),
            ("external", "external"),
            ("circular_length", "circular_length"),
            ("total_length", "total_length"),
        ):
            put(key, at, np.asarray(getattr(s, name))[ok])
        unequal = ok[l1[at] != l2[at]]
        if len(unequal):
            put("spiral_length_out", spir[unequal], l2[spir[unequal]])
            put("spiral_angle_out", spir[unequal], s.theta_out[unequal], angle=True)
            for key, name in (
                ("xs_out", "xs_out"),
                ("ys_out", "ys_out"),
                ("p_out", "p_out"),
                ("k_out", "k_out"),
                ("total_tangent_out", "tangent_out"),
            ):
                put(key, spir[unequal], np.asarray(getattr(s, name))[unequal])
        for key in ("pi", "ts", "sc", "cs", "st"):
            put(key, at, np.asarray(getattr(s, key))[ok])
        length[at] = np.asarray(s.total_length)[ok]
    return length
