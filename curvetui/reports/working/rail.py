"""A rail curve's working: equilibrium cant, deficiency, excess, the speed limits, the cants
serving both trains, then the transition and geometry lines.

E = s v^2 / (g R) (the EN 13803 form, from memory; 11.8 V^2 / R for s = 1500 mm, derived);
in US units s = 59.99 in makes it 49 CFR 213.57's E = 0.0007 D V^2 (derived). The speed
limits solve E(v) = E_a + D_lim and E(v) = E_a - X_lim in the band holding the speed:
v = sqrt(g R (E_a +- limit) / s), capped at the band's top (the limits say nothing above).
"""

from __future__ import annotations

import numpy as np

from curvetui.bend.display import shown
from curvetui.core.rail import RailLimits
from curvetui.core.units import UnitSystem
from curvetui.reports.working.geometry import geometry_steps
from curvetui.reports.working.text import (
    Step,
    ans,
    from_per_second,
    gravity,
    missing,
    num,
    per_second,
    verdict,
)
from curvetui.reports.working.transition import rail_transition_steps

CANT_FORM = (
    "E = s v^2 / (g R), the balanced curve (EN 13803's form, from memory); with s = 59.99 in "
    "it equals 49 CFR 213.57's 0.0007 D V^2 (derived)"
)


def _speed_for(cant_expr: str, record: dict, units: UnitSystem) -> str:
    """v = sqrt(g R E / s) in km/h or mph, for a cant expression in the record's units."""
    inner = f"sqrt({gravity(units)} x {num(record['radius'])} x ({cant_expr}) / "
    return from_per_second(inner + f"{num(record['rail_centres'])})", units)


def rail_working(record: dict, limits: RailLimits, units: UnitSystem) -> list[Step]:
    """The steps of a rail check, each with its constants substituted."""
    V, R = record["speed"], record["radius"]
    cl, ln = units.cant_label, units.length_label
    s, ea = record["rail_centres"], record["cant"]
    steps = []
    if limits.radius_min > 0:
        r_min = units.length_from_si(limits.radius_min)
        steps.append(
            Step(
                "Least radius",
                "R >= R_min of the limits",
                f"{num(R)} >= {num(r_min)}",
                f"R_min {num(r_min)} {ln}",
                f"{limits.name} (EN 13803-2, 7.3: 150 m where different vehicles operate)"
                if limits.name.startswith("en13803")
                else limits.name,
                verdict(record, "radius"),
            )
        )
    v_si = f"({num(V)} / 3.6)" if units.name == "metric" else f"({num(V)} x 0.44704)"
    r_si = num(R) if units.name == "metric" else f"({num(R)} x 0.3048)"
    steps += [
        Step(
            "Centripetal acceleration",
            "a = v^2 / R, in m/s^2",
            f"a = {v_si}^2 / {r_si}",
            f"{ans(record['centripetal_acceleration'])} m/s^2",
            "Newtonian circular motion; 1 mph = 0.44704 m/s, 1 ft = 0.3048 m",
        ),
        Step(
            "Equilibrium cant",
            "E = s v^2 / (g R)",
            f"E = {num(s)} x {per_second(V, units)}^2 / ({gravity(units)} x {num(R)})",
            f"{ans(record['equilibrium_cant'])} {cl}",
            CANT_FORM,
        ),
    ]
    low = record.get("equilibrium_cant_low")
    if not missing(low) and not missing(record.get("low_speed")):
        steps.append(
            Step(
                "Equilibrium cant, slow train",
                "E_low = s v_low^2 / (g R)",
                f"E_low = {num(s)} x {per_second(record['low_speed'], units)}^2 / "
                f"({gravity(units)} x {num(R)})",
                f"{ans(low)} {cl}",
                CANT_FORM,
            )
        )
    steps.append(
        Step(
            "Cant deficiency",
            "D = E - E_a",
            f"D = {num(record['equilibrium_cant'])} - {num(ea)}",
            f"{ans(record['cant_deficiency'])} {cl} against {num(record['deficiency_limit'])}",
            limits.name,
            verdict(record, "deficiency"),
        )
    )
    if not missing(record.get("cant_excess")):
        limit = record.get("excess_limit")
        steps.append(
            Step(
                "Cant excess",
                "X = E_a - E_low",
                f"X = {num(ea)} - {num(low)}",
                f"{ans(record['cant_excess'])} {cl}"
                + ("" if missing(limit) else f" against {num(limit)}"),
                limits.name,
                verdict(record, "excess"),
            )
        )
    steps += [
        Step(
            "Uncompensated lateral acceleration",
            "a_q = g D / s, in m/s^2",
            f"a_q = 9.80665 x {num(record['cant_deficiency'])} / {num(s)}",
            f"{ans(record['uncompensated_acceleration'])} m/s^2",
            "EN 13803 form (from memory); g = 9.80665 m/s^2",
        ),
        _max_speed(record, limits, units),
        Step(
            "Applied cant",
            "E_a <= E_max",
            f"{num(ea)} <= {num(record['cant_limit'])}",
            f"{ans(ea)} {cl}",
            limits.name,
            verdict(record, "cant"),
        ),
    ]
    if not missing(record.get("min_speed")):
        steps.append(_min_speed(record, limits, units))
    steps += _both_trains(record, limits, units)
    steps += rail_transition_steps(record, units, limits.name)
    steps += geometry_steps(record, units)
    return steps


def _bands(limits: RailLimits, units: UnitSystem, key: str):
    """(bottom, top, limit) of each band in the user's units; limit NaN where none is set."""
    tops = units.speed_from_si(np.asarray(limits.speed_max, dtype=float))
    bottoms = np.concatenate([[0.0], tops[:-1]])
    values = np.asarray(getattr(limits, key), dtype=float) / units.cant
    return [(float(b), float(t), float(x)) for b, t, x in zip(bottoms, tops, values, strict=True)]


def _band_of(speed: float, bands) -> int:
    for i, (_, top, _) in enumerate(bands):
        if speed <= top * (1 + 1e-5):  # the record keeps six figures
            return i
    return len(bands) - 1


def _max_speed(record: dict, limits: RailLimits, units: UnitSystem) -> Step:
    """V_max = sqrt(g R (E_a + D_lim) / s) with the D_lim of the band holding V_max; at a
    band's top where that speed lies above it."""
    sp, cl = units.speed_label, units.cant_label
    vmax, ea = record["max_speed"], num(record["cant"])
    bands = _bands(limits, units, "deficiency_max")
    i = _band_of(vmax, bands)
    bottom, top, d_lim = bands[i]
    speed = _speed_for(f"{ea} + {num(d_lim)}", record, units)
    band = f"band {num(bottom)} to {num(top)} {sp}: D_lim {num(d_lim)} {cl}"
    design = f"shown {shown('max_speed', vmax)} {sp} (rounded down)"
    if vmax > 0 and abs(vmax - top) <= 1e-5 * top:  # the record keeps 6 figures
        return Step(
            "Maximum speed",
            "sqrt(g R (E_a + D_lim) / s) >= the band's top speed",
            f"{speed} >= {num(top)}",
            f"{ans(vmax)} {sp}, the band's top (no limits above it); {design}",
            f"{limits.name}, {band}",
            verdict(record, "deficiency"),
        )
    if vmax <= 0:
        return Step(
            "Maximum speed",
            "sqrt(g R (E_a + D_lim) / s) <= 0 in the first band",
            f"{speed} <= 0",
            f"0 {sp}",
            f"{limits.name}, {band}",
            verdict(record, "deficiency"),
        )
    return Step(
        "Maximum speed",
        "V_max = sqrt(g R (E_a + D_lim) / s), D_lim of the band holding V_max",
        f"V_max = {speed}",
        f"{ans(vmax)} {sp}; {design}",
        f"{limits.name}, {band}",
        verdict(record, "deficiency"),
    )


def _min_speed(record: dict, limits: RailLimits, units: UnitSystem) -> Step:
    """V_min = sqrt(g R (E_a - X_lim) / s) with the X_lim of the band holding V_min; a band's
    bottom where that speed lies below it; 0 where E_a <= X_lim of the first band."""
    sp, cl = units.speed_label, units.cant_label
    vmin, ea = record["min_speed"], record["cant"]
    bands = _bands(limits, units, "excess_max")
    design = f"shown {shown('min_speed', vmin)} {sp} (rounded up)"
    at_bottom = [j for j, b in enumerate(bands) if abs(vmin - b[0]) <= 1e-5 * max(b[0], 1e-9)]
    i = at_bottom[0] if at_bottom else _band_of(vmin, bands)
    bottom, top, x_lim = bands[i]
    band = f"band {num(bottom)} to {num(top)} {sp}: X_lim {num(x_lim)} {cl}"
    if np.isnan(x_lim):
        return Step(
            "Minimum speed",
            "the band sets no excess limit: its bottom speed",
            f"no excess limit from {num(bottom)} {sp}",
            f"{ans(vmin)} {sp}; {design}",
            limits.name,
        )
    if at_bottom or vmin <= 0:
        if ea <= x_lim:
            sub = f"{num(ea)} - {num(x_lim)} <= 0"
        else:
            sub = f"{_speed_for(f'{num(ea)} - {num(x_lim)}', record, units)} <= {num(bottom)}"
        return Step(
            "Minimum speed",
            "sqrt(g R (E_a - X_lim) / s) <= the band's bottom speed (0 where E_a <= X_lim)",
            sub,
            f"{ans(vmin)} {sp}, the band's bottom; {design}",
            f"{limits.name}, {band}",
        )
    return Step(
        "Minimum speed",
        "V_min = sqrt(g R (E_a - X_lim) / s), X_lim of the band holding V_min",
        f"V_min = {_speed_for(f'{num(ea)} - {num(x_lim)}', record, units)}",
        f"{ans(vmin)} {sp}; {design}",
        f"{limits.name}, {band}",
    )


def _both_trains(record: dict, limits: RailLimits, units: UnitSystem) -> list[Step]:
    cl = units.cant_label
    lo, hi = record.get("cant_allowed_min"), record.get("cant_allowed_max")
    if missing(lo) or missing(hi):
        return []
    e, e_low = num(record["equilibrium_cant"]), num(record["equilibrium_cant_low"])
    d_lim, x_lim = record["deficiency_limit"], record.get("excess_limit")
    c_max = num(record["cant_limit"])
    u = units.name

    def cant(key, x):
        return f"shown {shown(key, x, u)} {cl}"

    steps = [
        Step(
            "Least cant serving both trains",
            "max(E - D_lim, 0)",
            f"max({e} - {num(d_lim)}, 0)",
            f"{ans(lo)} {cl}; {cant('cant_allowed_min', lo)}",
            limits.name,
        ),
        Step(
            "Most cant serving both trains",
            "min(E_low + X_lim, E_max)" if not missing(x_lim) else "E_max (no excess limit)",
            f"min({e_low} + {num(x_lim)}, {c_max})" if not missing(x_lim) else c_max,
            f"{ans(hi)} {cl}; {cant('cant_allowed_max', hi)}; "
            + (f"range {ans(lo)} to {ans(hi)} {cl}" if lo <= hi else "no cant serves both"),
            limits.name,
            verdict(record, "balance"),
        ),
    ]
    bal = record.get("balancing_cant")
    if not missing(bal) and not missing(x_lim):
        steps.append(
            Step(
                "Cant balancing both trains",
                "E_a = (X_lim E + D_lim E_low) / (D_lim + X_lim)",
                f"E_a = ({num(x_lim)} x {e} + {num(d_lim)} x {e_low}) / "
                f"({num(d_lim)} + {num(x_lim)})",
                f"{ans(bal)} {cl}; {cant('balancing_cant', bal)}",
                "same share of each limit: common practice, no source",
            )
        )
    return steps
