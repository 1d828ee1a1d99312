"""A road bend as an existing curve: advisory speed, inferred design speed and signs.

Part of the evaluation step (curvetui.bend.evaluate). The engine is
``curvetui.core.advisory`` (design-method advisory speed with speed-banded friction, the
inferred design speed against the road table's f_max) and ``curvetui.core.signs`` (the sign
table's row by posted minus advisory speed). The superelevation is the one in use: the
built value where given (a measured e), else the table's design value, with a note.
Results go under ``advisory.*`` and, with a posted speed, ``signs.*`` (curvetui.bend.outputs).
"""

from __future__ import annotations

import numpy as np

from curvetui.core import advisory as adv
from curvetui.core.signs import select_signs

KIND_WORDS = {
    adv.ROW: "table row",
    adv.INTERPOLATED: "interpolated",
    adv.ABOVE_TABLE: "at least (the table's top speed)",
    adv.BELOW_TABLE: "below the table",
}


def road_advisory(ev, rows: np.ndarray, r, e, flags: dict[str, int]) -> None:
    """``advisory.*`` and ``signs.*`` of the road rows ``rows`` (radius ``r`` [m], ``e``
    the superelevation in use, fraction); bend flags from ``flags`` for the notes."""
    from curvetui.storage.sign_tables import sign_table

    units, table = ev.ctx.units, ev.ctx.table
    signs = getattr(ev.ctx, "signs", None) or sign_table()
    ev.parts["sign_table"] = signs
    put = ev.values
    su = signs.speed_unit
    v, band, capped = adv.advisory_speed(r, e, signs.friction_from * su, signs.friction, table.k_si)
    step, unit = signs.step_for(units.name)
    rounded = adv.round_speed(v / unit, step, capped, signs.rounding) * unit
    put["advisory.speed"][rows] = units.speed_from_si(rounded)
    f_band = np.where(band >= 0, signs.friction[np.clip(band, 0, None)], np.nan)
    with np.errstate(invalid="ignore"):
        v_band = np.sqrt(table.k_si * r * (e + f_band))  # before a gap's cap (the working)
    put["advisory.speed_calculated"][rows] = units.speed_from_si(v_band)
    put["advisory.friction"][rows] = f_band
    put["advisory.band_top"][rows] = units.speed_from_si(
        np.where(capped, np.append(signs.friction_from[1:], np.inf)[band] * su, np.nan)
    )
    put["advisory.superelevation"][rows] = 100 * e
    put["advisory.step"][rows] = step
    vd, kind, row_v = adv.inferred_design_speed(
        r, e, table.speeds_si, table.side_friction_max, table.k_si
    )
    put["advisory.design_speed_inferred"][rows] = units.speed_from_si(vd)
    put["advisory.design_speed_inferred_row"][rows] = units.speed_from_si(row_v)
    words = np.array([KIND_WORDS[k] for k in sorted(KIND_WORDS)], object)
    ev.texts["advisory.design_speed_inferred_kind"][rows] = words[np.asarray(kind, int)]
    ev.texts["advisory.capped"][rows] = np.where(capped, "yes", "no").astype(object)
    present = ev.parsed.present
    ev.bend_flags[rows[np.asarray(kind) == adv.BELOW_TABLE]] |= flags["below_table"]
    deflection = present["deflection"][rows]
    with np.errstate(invalid="ignore"):
        small = deflection & (ev.parsed.si["deflection"][rows] < signs.reliable_deflection_min)
    ev.bend_flags[rows[small]] |= flags["small_deflection"]

    posted = present["posted_speed"][rows]
    if not posted.any():
        return
    at = rows[posted]
    chosen = select_signs(signs, ev.parsed.si["posted_speed"][at], rounded[posted])
    put["signs.posted_speed"][at] = units.speed_from_si(ev.parsed.si["posted_speed"][at])
    put["signs.speed_difference"][at] = units.speed_from_si(
        ev.parsed.si["posted_speed"][at] - rounded[posted]
    )
    for key in ("sign", "warning_sign", "plaque", "chevrons"):
        ev.texts[f"signs.{key}"][at] = chosen[key]
    ev.texts["signs.table"][at] = signs.name
    ev.bend_flags[at] |= flags["consecutive"]
