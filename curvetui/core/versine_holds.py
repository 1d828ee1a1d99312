"""A realignment design with local versine corrections at the hold points, as a
RealignDesign: core.versine_corrections solved, then every condition checked again on the
slews recomputed from the designed versines (holds and closure to 1e-9 m, the limit).

Local corrections at holds: common practice, no source (see core.versine_corrections).
"""

from __future__ import annotations

import numpy as np

from curvetui.core.versine_cells import SLEW_TOLERANCE
from curvetui.core.versine_corrections import DEFAULT_WEIGHT, corrected_design
from curvetui.core.versine_realign import hallade_slews, radius_for_versine


def _met(m, got, p) -> str:
    """'' when the holds, the closure and the limit are met on the recomputed slews; else
    what is not."""
    h = hallade_slews(m, got.designed)
    for i, v in p.holds:
        if abs(h.slews[i] - v) > SLEW_TOLERANCE:
            return f"a hold is missed by {abs(h.slews[i] - v):.3g} m"
    if not h.closes(SLEW_TOLERANCE):
        return "the slews do not close"
    return ""


def corrected_result(design_cls, st, c, m, p, breaks, window: int, count: int):
    """``design_cls`` (RealignDesign) for the corrected design, or None when the holds and
    the closure cannot be met even with corrections."""
    got = corrected_design(m, p.holds, breaks, p.u_fixed, p.limit, window)
    if got is None:
        return None
    missed = _met(m, got, p)
    if missed:
        return None
    step = c / 2.0
    s = got.slews
    feasible = got.feasible
    if p.limit is not None and feasible:
        feasible = float(np.max(np.abs(s))) <= p.limit + SLEW_TOLERANCE
    ts, sc, cs, stt = got.breaks
    corr = tuple((float(st[i]), float(got.corrections[i])) for i in got.window_stations)
    largest = max((abs(v) for _, v in corr), default=0.0)
    notes = (
        "the designed versines include local versine corrections at the hold points "
        f"(stations within {window} of each hold; largest {largest:.6g} m): the smooth "
        "diagram alone cannot meet the holds; corrections kept small by a penalty on "
        f"their squares (weight {DEFAULT_WEIGHT:g} against the squared slews); local "
        "corrections at holds: common practice, no source",
    )
    reason = ""
    hit = ()
    if p.limit is not None:
        hit = tuple(float(v) for v in st[np.abs(s) >= p.limit - SLEW_TOLERANCE])
    if not feasible:
        hit = ()
        reason = (
            f"no design keeps every slew within {p.limit:g} while meeting the hold points, "
            f"even with local versine corrections within {window} stations of each hold; "
            f"the smallest limit that works is {got.smallest_limit:.6g}"
        )
    return design_cls(
        stations=st,
        chord=c,
        measured=m,
        designed=got.designed,
        slews=s,
        central_versine=got.u,
        radius=float(radius_for_versine(got.u, c)),
        ts=float(st[0] + ts * step),
        sc=float(st[0] + sc * step),
        cs=float(st[0] + cs * step),
        st=float(st[0] + stt * step),
        transition_in=(sc - ts) * step,
        transition_out=(stt - cs) * step,
        sum_squared_slews=float(s @ s),
        max_slew=float(np.max(np.abs(s))),
        feasible=feasible,
        holds=tuple((float(st[0] + i * step), v) for i, v in p.holds),
        binding_holds=tuple(float(st[p.holds[j][0]]) for j in got.binding),
        binding_limit_stations=hit,
        slew_limit=p.limit,
        smallest_limit=None if feasible else got.smallest_limit,
        reason=reason,
        cells_searched=count + got.cells,
        notes=notes,
        corrections=corr,
        correction_window=window,
    )
