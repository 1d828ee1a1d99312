"""A register's road curves in series: the Reverse or Winding Road sign on a series' first
curve, ``signs.series`` on every curve placed (batch only: one bend has no neighbours).

Each curve's place comes from ``curvetui.core.curve_series`` (computed by the batch on its
main thread, across chunks: ``curvetui.batch.series``); here it becomes words and notes.
The Reverse sign takes its Turn or Curve form from the first curve's advisory speed, as
the one-bend sign does (``curvetui.core.signs.is_turn``; MUTCD 2009 2C.07, from memory).
"""

from __future__ import annotations

import numpy as np

from curvetui.core import curve_series as cs
from curvetui.core.signs import SignTable, is_turn

WORDS = {  # the project's words; the signs' names come from the sign table
    cs.SINGLE: "single",
    cs.IN_SERIES: "in series",
    cs.SAME_DIRECTION: "same direction",
}


def series_note(t: SignTable) -> str:
    """The note of a curve whose signs were chosen with its neighbours: short, as it is on
    every such row of a batch file; the rules' sources are in the sign table's file (and the
    README)."""
    return (
        f"signs by {t.title}, with the curve's neighbours: curves of a feature less than "
        f"{t.series_tangent:g} {t.length_label} apart are in series (each rule's source: "
        f"[signs.series] of {t.name}); the table applies to {t.applies_to}"
    )


def series_signs(ev, places: np.ndarray) -> None:
    """``signs.series`` and the series notes of the road rows of ``ev`` from each row's
    place (``places``: one code of curvetui.core.curve_series per row of the chunk)."""
    from curvetui.bend import evaluate as ev_mod
    from curvetui.storage.sign_tables import sign_table

    rows = ev.road_rows[ev.status[ev.road_rows] != ev_mod.ERROR]
    if not len(rows):
        return
    signs = ev.parts.get("sign_table") or ev.ctx.signs or sign_table()
    p = np.asarray(places)[rows]
    again = (p & cs.FEATURE_AGAIN) != 0
    p = p & ~np.int8(cs.FEATURE_AGAIN)
    advisory = ev.ctx.units.speed_to_si(ev.values["advisory.speed"][rows])
    words = np.full(len(rows), None, dtype=object)
    for code, word in WORDS.items():
        words[p == code] = word
    words[p == cs.WINDING] = signs.winding_road
    reverse = (p == cs.REVERSE) & np.isfinite(advisory)
    turn = is_turn(signs, advisory)
    words[reverse & turn] = signs.reverse_turn
    words[reverse & ~turn] = signs.reverse_curve
    ev.texts["signs.series"][rows] = words

    flags = ev.bend_flags
    placed = rows[p <= cs.IN_SERIES]
    chosen = placed[(flags[placed] & ev_mod.SIGNS_SINGLE_BEND) != 0]  # with a posted speed
    flags[chosen] = (flags[chosen] & ~ev_mod.SIGNS_SINGLE_BEND) | ev_mod.SIGNS_SERIES
    flags[rows[p == cs.NOT_PLACED]] |= ev_mod.SERIES_NOT_PLACED
    flags[rows[p == cs.OUT_OF_ORDER]] |= ev_mod.SERIES_OUT_OF_ORDER
    flags[rows[p == cs.ENDS_BEFORE_BEGIN]] |= ev_mod.SERIES_ENDS_BEFORE_BEGIN
    flags[rows[again]] |= ev_mod.SERIES_FEATURE_AGAIN
