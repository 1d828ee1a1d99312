"""A bend's calculation written out step by step: formula, substituted values, answer and
source, so a checker can follow it by hand. Shared by the terminal app and the worksheet.

Pure text from a bend's record (curvetui.bend.record); no computation of its own
beyond the arithmetic a checker would write beside each line.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from curvetui.core.rail import RailLimits
from curvetui.core.road_table import ROW, RoadTable
from curvetui.core.units import G0, UnitSystem


@dataclass(frozen=True)
class Step:
    """One line of working."""

    label: str
    formula: str
    substituted: str
    result: str
    source: str
    check: str = ""  # "pass", "fail" or "" (no check on this line)


def _verdict(record: dict, check: str) -> str:
    """A line's pass/fail, read from the record's checks (decided once, on unrounded values,
    by curvetui.bend.evaluate); "" where the check does not apply."""
    return record.get("checks", {}).get(check, "")


def _f(x, digits=4) -> str:
    return f"{x:.{digits}g}" if abs(x) < 10**digits else f"{x:,.0f}"


def table_row_text(table: RoadTable, speed_display: float, units: UnitSystem) -> str:
    """Which table row(s) gave f_max: the row itself, or the two rows interpolated."""
    v_si = units.speed_to_si(speed_display)
    _, kind = table.f_max(v_si)
    tv = v_si / table.speed_unit
    sp = table.speeds
    tu = "km/h" if table.units == "metric" else "mph"
    if int(kind) == ROW:
        i = int(np.argmin(abs(sp - tv)))
        return (
            f"{table.name} row {sp[i]:g} {tu}: f_max {table.side_friction_max[i]:g} "
            f"({table.row_sources[i]})"
        )
    i = int(np.clip(np.searchsorted(sp, tv) - 1, 0, len(sp) - 2))
    how = "interpolated" if sp[0] <= tv <= sp[-1] else "EXTRAPOLATED"
    return (
        f"{table.name}: {how} between rows {sp[i]:g} {tu} (f_max "
        f"{table.side_friction_max[i]:g}) and {sp[i + 1]:g} {tu} (f_max "
        f"{table.side_friction_max[i + 1]:g})"
    )


def road_working(record: dict, table: RoadTable, units: UnitSystem) -> list[Step]:
    """The steps of a road check, in the table's own form of the point-mass equation."""
    V, R = record["speed"], record["radius"]
    C = table.point_mass_constant
    sp, ln = units.speed_label, units.length_label
    # the standard's equation is written in its own units; show it in the project's units
    # when they agree with the table (the usual case), else in SI
    native = units.name == table.units
    e = record["superelevation"] / 100
    emax = record["e_max"] / 100
    fmax = record["side_friction_max"]
    v_ms = units.speed_to_si(V)
    r_m = units.length_to_si(R)
    src = "AASHTO Green Book 2018 Eq. 3-8 (point-mass model)"
    steps = [
        Step(
            "Lateral acceleration",
            "a = v^2 / R",
            f"a = ({_f(v_ms)} m/s)^2 / {_f(r_m)} m",
            f"{_f(v_ms**2 / r_m)} m/s^2 = {_f(record['lateral_acceleration_g'])} g",
            "Newtonian circular motion; g = 9.80665 m/s^2",
        ),
        Step(
            "Maximum side friction",
            "f_max from the design table",
            f"V = {V:g} {sp}",
            f"f_max = {fmax:g}",
            table_row_text(table, V, units),
        ),
    ]
    if native:
        rmin = V**2 / (C * (emax + fmax))
        steps.append(
            Step(
                "Minimum radius",
                f"R_min = V^2 / ({C:g} (e_max + f_max))",
                f"R_min = {V:g}^2 / ({C:g} x ({emax:.3f} + {fmax:.3f}))",
                f"{_f(rmin, 5)} {ln}, as the table rounds {record['min_radius_rounded']:g} {ln}",
                f"{table.source.split(':')[0]}; Eq. 3-10",
                _verdict(record, "radius"),
            )
        )
        demand = V**2 / (C * R) - e
        friction_formula = f"f = V^2 / ({C:g} R) - e"
        friction_sub = f"f = {V:g}^2 / ({C:g} x {R:g}) - {e:.4f}"
    else:
        steps.append(
            Step(
                "Minimum radius",
                "R_min = v^2 / (k (e_max + f_max))",
                f"k = {table.k_si:.4f} m/s^2 from the table's constant {C:g}",
                f"{record['min_radius']:.5g} {ln}",
                src,
                _verdict(record, "radius"),
            )
        )
        demand = record["side_friction_demand"]
        friction_formula = "f = v^2 / (k R) - e"
        friction_sub = f"k = {table.k_si:.4f} m/s^2, v = {_f(v_ms)} m/s, R = {_f(r_m)} m"
    steps.append(
        Step(
            "Design superelevation",
            "Method 5 (parabolic f distribution on the running speed)"
            if table.distribution == "aashto-method-5"
            else "e = e_max R_min / R (linear distribution)",
            f"V = {V:g} {sp}, R = {R:g} {ln}, e_max = {record['e_max']:g} %",
            f"e = {record['superelevation_design']:.2f} % ({record['cross_section']})",
            "Green Book 2018 section 3.3.5 (Method 5)"
            if table.distribution == "aashto-method-5"
            else "linear distribution (AASHTO Method 1)",
        )
    )
    steps.append(
        Step(
            "Side friction demand",
            friction_formula,
            friction_sub,
            f"f = {demand:.4f} against f_max {fmax:g}",
            src,
            _verdict(record, "friction"),
        )
    )
    steps.append(
        Step(
            "Safe speed",
            "largest V with V^2/(C R) - e <= f_max(V)",
            "solved exactly on the table's piecewise-linear f_max",
            f"{record['safe_speed']:.1f} {sp}"
            if record["safe_speed"] is not None
            else f"below the table's lowest speed, "
            f"{float(units.speed_from_si(table.speeds_si[0])):g} {sp} (none found)",
            src,
            _verdict(record, "friction"),
        )
    )
    steps += _transition_steps(record, units) + _sight_steps(record, units)
    return steps


def rail_working(record: dict, limits: RailLimits, units: UnitSystem) -> list[Step]:
    """The steps of a rail check: E = s v^2/(g R), D, X, a_q, speed limits."""
    V, R = record["speed"], record["radius"]
    cl, sp = units.cant_label, units.speed_label
    s = record["rail_centres"]
    v = units.speed_to_si(V)
    r = units.length_to_si(R)
    s_m = s * units.cant
    src = "EN 13803 form E = s v^2 / (g R)"
    steps = []
    if limits.radius_min > 0:
        r_min = units.length_from_si(limits.radius_min)
        ln = units.length_label
        steps.append(
            Step(
                "Least radius",
                "R >= R_min of the limits",
                f"{R:g} >= {r_min:g} {ln}",
                f"R_min {r_min:g} {ln}",
                f"{limits.name} (EN 13803-2, 7.3: 150 m where different vehicles operate)"
                if limits.name.startswith("en13803")
                else limits.name,
                _verdict(record, "radius"),
            )
        )
    steps += [
        Step(
            "Equilibrium cant",
            "E = s v^2 / (g R)",
            f"E = {_f(s_m)} m x ({_f(v)} m/s)^2 / ({G0} x {_f(r)} m)",
            f"{record['equilibrium_cant']:.1f} {cl}",
            src,
        ),
        Step(
            "Cant deficiency",
            "D = E - E_a",
            f"D = {record['equilibrium_cant']:.1f} - {record['cant']:g}",
            f"{record['cant_deficiency']:.1f} {cl} against {record['deficiency_limit']:g}",
            f"{limits.name}",
            _verdict(record, "deficiency"),
        ),
    ]
    if record.get("cant_excess") is not None:
        steps.append(
            Step(
                "Cant excess",
                "X = E_a - E(v_low)",
                f"X = {record['cant']:g} - {record['equilibrium_cant_low']:.1f}",
                f"{record['cant_excess']:.1f} {cl}"
                + (
                    f" against {record['excess_limit']:g}"
                    if record.get("excess_limit") is not None
                    else ""
                ),
                limits.name,
                _verdict(record, "excess"),
            )
        )
    steps += [
        Step(
            "Uncompensated lateral acceleration",
            "a_q = g D / s",
            f"a_q = {G0} x {record['cant_deficiency']:.1f} / {s:g}",
            f"{record['uncompensated_acceleration']:.3f} m/s^2",
            src,
        ),
        Step(
            "Maximum speed",
            "V_max = sqrt(g R (E_a + D_lim) / s)",
            f"sqrt({G0} x {_f(r)} x ({record['cant']:g} + {record['deficiency_limit']:g}) / {s:g})",
            f"{record['max_speed']:.1f} {sp}",
            limits.name,
            _verdict(record, "deficiency"),
        ),
        Step(
            "Applied cant",
            "E_a <= E_max",
            f"{record['cant']:g} <= {record['cant_limit']:g}",
            f"{record['cant']:g} {cl}",
            limits.name,
            _verdict(record, "cant"),
        ),
    ]
    if record.get("min_speed") is not None:
        steps.append(
            Step(
                "Minimum speed",
                "V_min = sqrt(g R (E_a - X_lim) / s)",
                "0 where E_a <= X_lim",
                f"{record['min_speed']:.1f} {sp}",
                limits.name,
            )
        )
    if record.get("cant_allowed_min") is not None:
        lo, hi = record["cant_allowed_min"], record["cant_allowed_max"]
        steps.append(
            Step(
                "Cants serving both trains",
                "max(E - D_lim, 0) <= E_a <= min(E_low + X_lim, E_max)",
                f"max({record['equilibrium_cant']:.1f} - {record['deficiency_limit']:g}, 0) to "
                + (
                    f"min({record['equilibrium_cant_low']:.1f} + {record['excess_limit']:g}, "
                    f"{record['cant_limit']:g})"
                    if record["excess_limit"] is not None
                    else f"{record['cant_limit']:g} (these limits set no cant excess)"
                ),
                f"{lo:.1f} to {hi:.1f} {cl}" if lo <= hi else f"none ({lo:.1f} > {hi:.1f})",
                limits.name,
                _verdict(record, "balance"),
            )
        )
    if record.get("balancing_cant") is not None:
        e, e_low = record["equilibrium_cant"], record["equilibrium_cant_low"]
        d_lim, x_lim = record["deficiency_limit"], record["excess_limit"]
        steps.append(
            Step(
                "Cant balancing both trains",
                "E_a = (X_lim E + D_lim E_low) / (D_lim + X_lim)",
                f"({x_lim:g} x {e:.2f} + {d_lim:g} x {e_low:.2f}) / ({d_lim:g} + {x_lim:g})",
                f"{record['balancing_cant']:.1f} {cl}",
                "same share of each limit: common practice, no source",
            )
        )
    steps += _transition_steps(record, units)
    return steps


def _transition_steps(record: dict, units: UnitSystem) -> list[Step]:
    t = record.get("transition")
    if not t:
        return []
    ln = units.length_label
    status = "fail" if t["status"] == "fail" else ("" if t["status"] != "pass" else "pass")
    if "spiral_length_min" in t:
        lo, hi = t["spiral_length_min"], t["spiral_length_max"]
        spiralled = "runoff_on_tangent" not in t  # placed on the tangent only without one
        steps = _road_transition_lengths(record, units) + [
            Step(
                "Spiral length",
                "max(v^3/(C R), sqrt(24 p_min R), runoff) ... sqrt(24 p_max R)",
                f"comfort {_num(t['length_comfort'])}, shift "
                f"{_num(t['length_shift_min'])}, runoff {_num(t['runoff'])} {ln}; max "
                + (
                    f"sqrt(24 x {t['shift_max']:.4g} x {record['radius']:g})"
                    if t.get("shift_max") is not None
                    else "sqrt(24 p_max R)"
                ),
                f"{_num(lo)} to {_num(hi)} {ln} ({t['governing']} governs)",
                "Green Book 2018 section 3.3.8 (from memory)",
                status if spiralled else "",  # without a spiral: a range to design to
            )
        ]
        if not spiralled:
            share = t["runoff_on_tangent"]
            steps.append(
                Step(
                    "Runoff placement (no spiral)",
                    "share s of L_r on the tangent; full e from PC + (1 - s) L_r",
                    f"s = {share:.3g}, L_r = {_num(t['runoff'])} {ln}, "
                    f"L_t = {_num(t['runout']) if t['runout'] is not None else '-'} {ln}",
                    f"{_num(share * t['runoff'])} {ln} on each tangent",
                    "AASHTO via Rosenow 2015 (60 to 90 % on the tangent); Highway Engineering "
                    "Handbook (two-thirds)",
                    status,
                )
            )
        return steps
    return [
        Step(
            "Transition length",
            "max(E/(dE/ds), E v/(dE/dt), D v/(dD/dt))",
            f"gradient {_num(t['length_cant_gradient'])}, cant rate "
            f"{_num(t['length_cant_rate'])}, deficiency rate "
            f"{_num(t['length_deficiency_rate'])} {ln}",
            f"{_num(t['length'])} {ln} ({t['governing']})",
            "rail limits file",
            status,
        )
    ]


def _road_transition_lengths(record: dict, units: UnitSystem) -> list[Step]:
    """Each transition length with its constants substituted (a line a checker can redo):
    comfort, lateral shift (both limits), runoff and runout."""
    t = record["transition"]
    if t.get("comfort_rate") is None:
        return []
    ln = units.length_label
    v = units.length_from_si(units.speed_to_si(record["speed"]))  # m/s or ft/s
    r, e = record["radius"], record["superelevation"]
    src = "Green Book 2018 section 3.3.8 (from memory)"
    steps = [
        Step(
            "Spiral length, comfort",
            "L = v^3 / (C R)",
            f"{v:.4g}^3 / ({t['comfort_rate']:g} x {r:g})",
            f"{t['length_comfort']:.2f} {ln}",
            src,
        ),
        Step(
            "Spiral length, least lateral shift",
            "L = sqrt(24 p_min R)",
            f"sqrt(24 x {t['shift_min']:.4g} x {r:g})",
            f"{t['length_shift_min']:.2f} {ln}",
            src,
        ),
    ]
    if t.get("runoff") is not None and e is not None and e > 0:
        steps.append(
            Step(
                "Superelevation runoff",
                "L_r = (w n1) e b_w / Delta",
                f"({t['lane_width']:.4g} x {t['lanes_rotated']:g}) x {e:.4g} x "
                f"{t['width_factor']:.4g} / {t['relative_gradient']:.4g}",
                f"{t['runoff']:.2f} {ln}",
                "Green Book 2018 (from memory); b_w read via a design sheet citing AASHTO",
            )
        )
        if t.get("runout") is not None:
            steps.append(
                Step(
                    "Tangent runout",
                    "L_t = e_NC L_r / e",
                    f"{t['normal_crown']:.4g} x {t['runoff']:.6g} / {e:.4g}",
                    f"{t['runout']:.2f} {ln}",
                    "Green Book 2018 (from memory)",
                )
            )
    return steps


def _sight_steps(record: dict, units: UnitSystem) -> list[Step]:
    s = record.get("sight")
    if not s:
        return []
    ln = units.length_label
    return [
        Step(
            "Stopping sight distance",
            "SSD = v t + v^2 / (2 a), rounded up to 5",
            "t = 2.5 s, a = " + ("3.4 m/s^2" if units.name == "metric" else "11.2 ft/s^2"),
            f"{_num(s['stopping_sight_distance'])} {ln}",
            "Green Book 2018 Eq. 3-2, Table 3-1",
        ),
        Step(
            "Sightline offset",
            "HSO = R (1 - cos(S / (2 R)))",
            f"R = {_num(s['sightline_radius'])}, S = {_num(s['stopping_sight_distance'])}",
            f"{_num(s['sightline_offset_required'])} {ln} needed, "
            f"{_num(s['offset_available'])} {ln} clear",
            "TxDOT Roadway Design Manual 4.7.9 form (read)",
            s["status"],
        ),
    ]


def _num(x) -> str:
    return "-" if x is None or (isinstance(x, float) and math.isnan(x)) else f"{x:.1f}"
