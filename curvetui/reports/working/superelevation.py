"""The design superelevation's lines: AASHTO Method 5 step by step (running speed, the
curvatures 1/R_PI and 1/R_min, h, S1, S2, M0, the side friction on the leg used, e), or
the linear distribution; each with the record's intermediate values substituted.

Formulas as in curvetui.core.superelevation, in the user's units with the point-mass
constant K: 1/R_PI = e_max K / V_R^2, 1/R_min = (e_max + f_max) K / V^2,
h = e_max (V^2 / V_R^2 - 1), S1 = h R_PI, S2 = (f_max - h) / (1/R_min - 1/R_PI),
M0 = (1/R_PI)(1/R_min - 1/R_PI)(S2 - S1) / (2 / R_min), f on leg 1 = M0 (x R_PI)^2 + S1 x,
on leg 2 = M0 ((1/R_min - x) / (1/R_min - 1/R_PI))^2 + h + S2 (x - 1/R_PI), x = 1/R;
e = V^2 x / K - f.
"""

from __future__ import annotations

from curvetui.bend.display import shown
from curvetui.core.road_table import RoadTable
from curvetui.core.superelevation import DISTRIBUTION_TEXT
from curvetui.core.units import UnitSystem
from curvetui.reports.working.table import interpolation, on_row, table_row_text, user_speed
from curvetui.reports.working.text import Step, ans, missing, num

METHOD_5 = (
    "Green Book 2018 sec. 3.3.5, Method 5: the usual formulation (its text not read), which "
    "reproduces published e tables (Highway Engineering Handbook Table 2.11; Iowa DOT)"
)
LINEAR = "linear distribution (AASHTO Method 1)"
METHOD_2 = DISTRIBUTION_TEXT["aashto-method-2"][1]


def superelevation_steps(record: dict, table: RoadTable, units: UnitSystem, K: float) -> list:
    sw = record.get("superelevation_working") or {}
    if table.distribution == "aashto-method-2":
        return [_method2(record, units, sw, K)]
    if table.distribution != "aashto-method-5":
        return [_linear(record, units, sw)]
    if sw.get("leg") == "e_max":
        return [_at_emax(record, units, METHOD_5)]
    V, R = record["speed"], record["radius"]
    per = f"per {units.length_label}"
    e_max, f_max = num(record["e_max"]), num(_f_table(record, sw))
    x_pi, x_min = sw["curvature_pi"], sw["curvature_min"]
    h, s1, s2, m0 = (sw[k] for k in ("friction_at_pi", "slope_1", "slope_2", "middle_ordinate"))
    if on_row(table, V, units):
        vr_sub = f"row {num(V)} {units.speed_label} of {table.name}"
    else:
        vr = interpolation(table, table.running_speeds, V, units)
        vr_sub = f"V_R = {user_speed(vr, table, units)}"
    vr = sw["running_speed"]
    steps = [
        Step(
            "Average running speed",
            "V_R from the design table",
            vr_sub,
            f"{ans(vr)} {units.speed_label}",
            table_row_text(table, V, units, "V_R"),
        ),
        Step(
            "Curvature at the PI of the f curve",
            f"1/R_PI = e_max {num(K)} / V_R^2",
            f"1/R_PI = {e_max} / 100 x {num(K)} / {num(vr)}^2",
            f"{ans(x_pi)} {per}",
            METHOD_5,
        ),
        Step(
            "Curvature at R_min",
            f"1/R_min = (e_max + f_max) {num(K)} / V^2",
            f"1/R_min = ({e_max} / 100 + {f_max}) x {num(K)} / {num(V)}^2",
            f"{ans(x_min)} {per}",
            METHOD_5,
        ),
        Step(
            "Side friction at the PI",
            "h = e_max (V^2 / V_R^2 - 1)",
            f"h = {e_max} / 100 x ({num(V)}^2 / {num(vr)}^2 - 1)",
            ans(h),
            METHOD_5,
        ),
        Step(
            "Slope of leg 1",
            "S1 = h / (1/R_PI)",
            f"S1 = {num(h)} / {num(x_pi)}",
            f"{ans(s1)} {units.length_label}",
            METHOD_5,
        ),
        Step(
            "Slope of leg 2",
            "S2 = (f_max - h) / (1/R_min - 1/R_PI)",
            f"S2 = ({f_max} - {num(h)}) / ({num(x_min)} - {num(x_pi)})",
            f"{ans(s2)} {units.length_label}",
            METHOD_5,
        ),
        Step(
            "Middle ordinate of the f curve",
            "M0 = (1/R_PI) (1/R_min - 1/R_PI) (S2 - S1) / (2 (1/R_min))",
            f"M0 = {num(x_pi)} x ({num(x_min)} - {num(x_pi)}) x ({num(s2)} - {num(s1)}) / "
            f"(2 x {num(x_min)})",
            ans(m0),
            METHOD_5,
        ),
    ]
    x = f"(1 / {num(R)})"
    if sw.get("leg") == "1":
        formula = "leg 1 (R >= R_PI): f = M0 (x R_PI)^2 + S1 x, x = 1/R"
        sub = f"f = {num(m0)} x ({x} / {num(x_pi)})^2 + {num(s1)} x {x}"
    else:
        formula = (
            "leg 2 (R < R_PI): f = M0 ((1/R_min - x) / (1/R_min - 1/R_PI))^2 + h "
            "+ S2 (x - 1/R_PI), x = 1/R"
        )
        sub = (
            f"f = {num(m0)} x (({num(x_min)} - {x}) / ({num(x_min)} - {num(x_pi)}))^2 + "
            f"{num(h)} + {num(s2)} x ({x} - {num(x_pi)})"
        )
    f = sw["side_friction"]
    steps.append(Step("Side friction by Method 5", formula, sub, ans(f), METHOD_5))
    e_sub = f"e = 100 x ({num(V)}^2 / ({num(K)} x {num(R)}) - {num(f)})"
    steps.append(
        Step(
            "Design superelevation",
            f"e = V^2 / ({num(K)} R) - f",
            e_sub,
            _design_e(record, units),
            METHOD_5,
        )
    )
    return steps


def _f_table(record: dict, sw: dict) -> float:
    """The f_max the distribution runs on: the table's, also where the user gave a friction
    factor for the check (the record's side_friction_max is then the user's)."""
    f = sw.get("friction_table")
    return record["side_friction_max"] if missing(f) else f


def _r_min_table(record: dict) -> float:
    """R_min on the table's f_max, where the distribution reaches e_max."""
    r = (record.get("superelevation_working") or {}).get("min_radius_table")
    return record["min_radius"] if missing(r) else r


def _design_e(record: dict, units: UnitSystem) -> str:
    """The design e to the record's digits, then as the table shows it (rounded up to its
    step), and the cross-section built."""
    e, step = record["superelevation_design"], record.get("superelevation_step", 0.1)
    text = (
        f"{ans(e)} %; design {shown('superelevation_design', e, units.name, step)} % "
        f"(rounded up to the table's {step:g} % step); {record['cross_section']}"
    )
    if record["cross_section"] in ("normal crown", "remove adverse crown"):
        text += f", e in use {num(record['superelevation'])} %"
    return text


def _at_emax(record: dict, units: UnitSystem, source: str) -> Step:
    return Step(
        "Design superelevation",
        "R <= R_min: e = e_max",
        f"{num(record['radius'])} <= {num(_r_min_table(record))}",
        _design_e(record, units),
        source,
    )


def _method2(record: dict, units: UnitSystem, sw: dict, K: float) -> Step:
    """Method 2: friction carries V^2/(K R) up to f_max, superelevation the rest."""
    if sw.get("leg") == "e_max" or missing(record.get("min_radius")):
        return _at_emax(record, units, METHOD_2)
    f_table = _f_table(record, sw)
    V, R, f_max = num(record["speed"]), num(record["radius"]), num(f_table)
    demand = record["speed"] ** 2 / (K * record["radius"])
    if demand <= f_table:
        return Step(
            "Design superelevation",
            "e = 0 while V^2 / (K R) <= f_max",
            f"{V}^2 / ({num(K)} x {R}) = {num(demand)} <= {f_max}",
            _design_e(record, units),
            METHOD_2,
        )
    return Step(
        "Design superelevation",
        "e = V^2 / (K R) - f_max",
        f"e = 100 x ({V}^2 / ({num(K)} x {R}) - {f_max})",
        _design_e(record, units),
        METHOD_2,
    )


def _linear(record: dict, units: UnitSystem, sw: dict) -> Step:
    if sw.get("leg") == "e_max" or missing(record.get("min_radius")):
        return _at_emax(record, units, LINEAR)
    return Step(
        "Design superelevation",
        "e = e_max R_min / R",
        f"e = {num(record['e_max'])} x {num(_r_min_table(record))} / {num(record['radius'])}",
        _design_e(record, units),
        LINEAR,
    )
