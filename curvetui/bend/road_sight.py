"""The sight check of a road bend round its inside lane (part of the evaluation step, see
curvetui.bend.evaluate): stopping sight distance, the sightline offset it needs at the
sight line's radius R - w/2 (w the lane width), and the speed or offset that would pass
(formulas and sources in curvetui.core.sight).
"""

from __future__ import annotations

import numpy as np

from curvetui.bend import working_values
from curvetui.bend.parse import Issue


def put(ev, key: str, rows, values) -> None:
    ev.values[key][rows] = values


def check(ev, name: str, rows, failed) -> None:
    from curvetui.bend.evaluate import FAIL, PASS

    ev.checks[name][rows] = np.where(failed, FAIL, PASS)


def road_sight(ev, rows, v, r, width, curve_length) -> None:
    """The sight check of the road rows that give an obstruction offset: values, verdict;
    a bend whose inside lane centre is no radius gets an input issue instead."""
    from curvetui.core import sight as sd

    units, si, present = ev.ctx.units, ev.parsed.si, ev.parsed.present
    has = np.nonzero(present["obstruction_offset"][rows])[0]
    # the sight line runs on the inside lane's centre, radius R - w/2: it must be a radius
    inside_out = has[r[has] - width[has] / 2.0 <= 0.0]
    for j in inside_out:
        ev.issues.append(_lane_issue(ev, int(rows[j]), float(r[j]), float(width[j])))
    has = np.setdiff1d(has, inside_out)
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
        put(ev, f"sight.{key}", at, units.length_from_si(getattr(c, key)))
    put(ev, "sight.sightline_radius", at, units.length_from_si(r_lane))
    put(ev, "sight.speed_that_passes", at, units.speed_from_si(c.speed_that_passes))
    failed = ~np.asarray(c.status, bool)
    ev.texts["sight.status"][at] = np.where(failed, "fail", "pass")
    check(ev, "sight", at, failed)
    working_values.sight_terms(ev, at, v[has], grade)


def _lane_issue(ev, row: int, r: float, width: float) -> Issue:
    """The sight check of a bend whose inside lane centre (R - w/2) is no radius at all."""
    units = ev.ctx.units
    ln = units.length_label
    r_u, w_u = float(units.length_from_si(r)), float(units.length_from_si(width))
    if ev.parsed.present["lane_width"][row]:
        text = (
            f"must be less than twice the radius ({2 * r_u:g} {ln}) for the sight check, "
            f"whose sight line runs on the inside lane centre (R - w/2), got {w_u:g}"
        )
        return Issue(row, "lane_width", text)
    text = (
        f"must be more than half the lane width ({w_u / 2:g} {ln}, lane {w_u:g} {ln} by "
        f"default) for the sight check, whose sight line runs on the inside lane centre "
        f"(R - w/2), got {r_u:g}"
    )
    return Issue(row, "radius", text)
