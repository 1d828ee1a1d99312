"""The sight check of a road bend (part of the evaluation step, see curvetui.bend.evaluate):
stopping sight distance against the clear offset to an obstruction, with the sight line on
the inside lane's centre (sources in curvetui.core.sight).
"""

from __future__ import annotations

import numpy as np

from curvetui.bend import working_values


def road_sight(ev, rows: np.ndarray, v, r, width, curve_length) -> None:
    """Sight check of the road rows with an obstruction offset into ``ev`` (values, texts
    and the 'sight' check; 0 pass, 1 fail), on the inside lane's centre line."""
    from curvetui.core import sight as sd

    units, si, present = ev.ctx.units, ev.parsed.si, ev.parsed.present
    has = np.nonzero(present["obstruction_offset"][rows])[0]
    if not len(has):
        return
    at = rows[has]
    r_lane = r[has] - width[has] / 2.0
    grade = np.where(present["grade"][at], si["grade"][at], 0.0)
    with np.errstate(all="ignore"):
        c = sd.sight_check(
            v[has],
            r_lane,
            si["obstruction_offset"][at],
            curve_length=curve_length[has],
            units=units.name,
            grade=grade,
        )
    ev.parts["sight"], ev.part_rows["sight"] = c, at
    lane = np.full(ev.n, np.nan)
    lane[at] = width[has]
    ev.parts["lane_width"] = lane
    for key in (
        "stopping_sight_distance",
        "sightline_offset_required",
        "offset_available",
        "sight_distance_available",
        "offset_that_passes",
    ):
        ev.values[f"sight.{key}"][at] = units.length_from_si(getattr(c, key))
    ev.values["sight.sightline_radius"][at] = units.length_from_si(r_lane)
    ev.values["sight.speed_that_passes"][at] = units.speed_from_si(c.speed_that_passes)
    failed = ~np.asarray(c.status, bool)
    ev.texts["sight.status"][at] = np.where(failed, "fail", "pass")
    ev.checks["sight"][at] = failed.astype(np.int8)
    working_values.sight_terms(ev, at, v[has], grade)
