"""The intermediate values and constants a checker substitutes to redo the working by hand
(part of the evaluation step, see curvetui.bend.evaluate; shown by curvetui.reports.working).

Each is the engine's own number, in the user's units, put under a ``working`` output
(curvetui.bend.outputs): the JSON record keeps it, batch files leave it out.

- ``superelevation_working``: the point-mass constant K of e + f = V^2 / (K R) in the user's
  units (127 for km/h and m, 15 for mph and ft: the table's own when the units are the
  table's), and Method 5's intermediates (curvetui.core.superelevation.method5_terms);
- ``sight``: the stopping sight distance before Table 3-1's rounding up to 5 m or 5 ft;
- ``transition``: a rail curve's rate limits of the design speed's band.
"""

from __future__ import annotations

import numpy as np

from curvetui.core import sight as sd
from curvetui.core import superelevation as se
from curvetui.core.transitions import transition_limits

LEG_NAMES = {se.LEG_1: "1", se.LEG_2: "2", se.LEG_EMAX: "e_max"}


def road_terms(ev, rows: np.ndarray, check) -> None:
    """``superelevation_working.*`` of the road rows ``rows`` from their RoadCheck."""
    units, table = ev.ctx.units, ev.ctx.table
    v = ev.values
    v["superelevation_working.constant"][rows] = table.k_si * units.length / units.speed**2
    # the distribution runs on the table's f_max even where the user gave a friction factor
    # for the check (curvetui.core.road.check_road), and reaches e_max at its own R_min
    f_table = table.f_max(check.speed)[0]
    r_min_table = check.speed**2 / (table.k_si * (check.e_max + f_table))
    v["superelevation_working.friction_table"][rows] = f_table
    v["superelevation_working.min_radius_table"][rows] = units.length_from_si(r_min_table)
    at_emax = check.radius <= r_min_table
    if table.distribution != "aashto-method-5":
        other = "method 2" if table.distribution == "aashto-method-2" else "linear"
        leg = np.where(at_emax, "e_max", other)
        ev.texts["superelevation_working.leg"][rows] = leg.astype(object)
        return
    t = se.method5_terms(
        check.radius,
        check.speed,
        table.running_speed_si(check.speed),
        check.e_max,
        f_table,
        table.k_si,
    )
    per_length = units.length  # 1/m to 1/(user length)
    v["superelevation_working.running_speed"][rows] = units.speed_from_si(
        table.running_speed_si(check.speed)
    )
    v["superelevation_working.curvature_pi"][rows] = t["x_pi"] * per_length
    v["superelevation_working.curvature_min"][rows] = t["x_min"] * per_length
    v["superelevation_working.friction_at_pi"][rows] = t["h"]
    v["superelevation_working.slope_1"][rows] = t["s1"] / per_length
    v["superelevation_working.slope_2"][rows] = t["s2"] / per_length
    v["superelevation_working.middle_ordinate"][rows] = t["m0"]
    on_curve = t["leg"] != se.LEG_EMAX
    v["superelevation_working.side_friction"][rows] = np.where(on_curve, t["f"], np.nan)
    names = np.asarray([LEG_NAMES[k] for k in sorted(LEG_NAMES)], dtype=object)
    ev.texts["superelevation_working.leg"][rows] = names[np.asarray(t["leg"], int) - 1]


def sight_terms(ev, at: np.ndarray, v, grade) -> None:
    """``sight.grade`` (percent) and the stopping sight distance before rounding."""
    units = ev.ctx.units
    f = sd.FORMS[units.name]
    with np.errstate(all="ignore"):
        d = sd.stopping_sight_distance(v, 2.5, f.design_deceleration, grade, units.name)
    ev.values["sight.grade"][at] = 100.0 * grade
    ev.values["sight.stopping_sight_distance_calculated"][at] = units.length_from_si(d)


def rail_rate_limits(ev, rows: np.ndarray, speed) -> None:
    """The rate limits of each rail row's band: cant gradient (mm/m or in/ft), rates of
    change of cant and of cant deficiency (mm/s or in/s); NaN where the file sets none."""
    units = ev.ctx.units
    g_max, r_max, dr_max, _ = transition_limits(ev.ctx.limits, speed)
    v = ev.values
    v["transition.cant_gradient_max"][rows] = g_max * units.length / units.cant
    v["transition.cant_rate_max"][rows] = r_max / units.cant
    v["transition.deficiency_rate_max"][rows] = dr_max / units.cant
