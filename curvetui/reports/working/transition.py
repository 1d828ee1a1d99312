"""Transition lines with every constant substituted.

Road (Green Book 2018 sec. 3.3.8, from memory; b_w read via a design sheet citing AASHTO):
L = v^3 / (C R), L = sqrt(24 p R) for p_min and p_max, L_r = (w n1) e b_w / Delta,
b_w = (1 + 0.5 (n1 - 1)) / n1, L_t = e_NC L_r / e; without a spiral a share s of L_r lies
on the tangent. Rail (a linear cant ramp run at v; the rate limits from the limits file):
L1 = E_a / (dE/ds)max, L2 = E_a v / (dE/dt)max, L3 = |D| v / (dD/dt)max.
"""

from __future__ import annotations

from curvetui.core.units import UnitSystem
from curvetui.reports.working.text import Step, ans, missing, num, per_second

ROAD_SOURCE = "Green Book 2018 section 3.3.8 (from memory)"


def _status(t: dict) -> str:
    return {"fail": "fail", "pass": "pass"}.get(t.get("status"), "")


def road_transition_steps(record: dict, units: UnitSystem) -> list[Step]:
    t = record.get("transition")
    if not t or "spiral_length_min" not in t:
        return []
    ln = units.length_label
    steps = _road_lengths(record, units)
    spiralled = "runoff_on_tangent" not in t  # placed on the tangent only without one
    parts = [t.get(k) for k in ("length_comfort", "length_shift_min", "runoff")]
    lo, hi = t["spiral_length_min"], t["spiral_length_max"]
    if not missing(lo):
        steps.append(
            Step(
                "Spiral length",
                "from max(v^3/(C R), sqrt(24 p_min R), L_r) to sqrt(24 p_max R)",
                f"L_min = max({', '.join(num(x) for x in parts if not missing(x))})",
                f"{ans(lo)} {ln} to {ans(hi)} {ln} ({t['governing']} governs)",
                ROAD_SOURCE,
                _status(t) if spiralled else "",  # without a spiral: a range to design to
            )
        )
    if not spiralled and not missing(t.get("runoff")):
        share = t["runoff_on_tangent"]
        runout = "-" if missing(t.get("runout")) else f"{ans(t['runout'])} {ln}"
        steps.append(
            Step(
                "Runoff placement (no spiral)",
                "share s of L_r on the tangent; full e from PC + (1 - s) L_r",
                f"{num(share)} x {num(t['runoff'])}",
                f"{ans(share * t['runoff'])} {ln} on each tangent (runout L_t {runout})",
                "AASHTO via Rosenow 2015 (60 to 90 % on the tangent); Highway Engineering "
                "Handbook (two-thirds)",
                _status(t),
            )
        )
        steps += _runoff_station_steps(record, units)
        steps += _reverse_crown_steps(record, units)
    return steps


def _reverse_crown_steps(record: dict, units: UnitSystem) -> list[Step]:
    """Reverse crown (both halves at +e_NC): the level crown moved on by the runout L_t,
    the outside half turning at one rate (curvetui.core.superelevation_diagram)."""
    from curvetui.stations import format_station

    t, g = record["transition"], record.get("geometry") or {}
    s, lr, lt = t.get("runoff_on_tangent"), t.get("runoff"), t.get("runout")
    steps = []
    for label, formula, key, end, sign in (
        ("Reverse crown, in", "PC - s L_r + L_t", "reverse_crown_in", "pc", ("-", "+")),
        ("Reverse crown, out", "PT + s L_r - L_t", "reverse_crown_out", "pt", ("+", "-")),
    ):
        value, base = t.get(key), g.get(end)
        if any(missing(x) for x in (value, base, s, lr, lt)):
            continue
        steps.append(
            Step(
                label,
                formula,
                f"{num(base)} {sign[0]} {num(s)} x {num(lr)} {sign[1]} {num(lt)}",
                f"{ans(value)} {units.length_label} ({format_station(value, units.name)})",
                "the outside half turns at one rate through runout and runoff: e_NC / e x L_r "
                "= L_t past level crown (common practice, no source)",
            )
        )
    return steps


# (label, formula, record key, on PC or PT, + or - the share, with the runout)
RUNOFF_STATION_LINES = (
    ("Runout start", "PC - s L_r - L_t", "runout_start", "pc", "-", True),
    ("Level crown, in", "PC - s L_r", "level_crown_in", "pc", "-", False),
    ("Full superelevation from", "PC + (1 - s) L_r", "full_superelevation_in", "pc", "+", False),
    ("Full superelevation to", "PT - (1 - s) L_r", "full_superelevation_out", "pt", "-", False),
    ("Level crown, out", "PT + s L_r", "level_crown_out", "pt", "+", False),
    ("Runout end", "PT + s L_r + L_t", "runout_end", "pt", "+", True),
)


def _runoff_station_steps(record: dict, units: UnitSystem) -> list[Step]:
    """The stations of a simple curve's superelevation transition (no spiral), each from the
    PC or PT, the share s on the tangent, the runoff L_r and the runout L_t (runout lines
    only where the record has a runout)."""
    from curvetui.stations import format_station

    t, g = record["transition"], record.get("geometry") or {}
    s, lr, lt = t.get("runoff_on_tangent"), t.get("runoff"), t.get("runout")
    ln = units.length_label
    steps = []
    for label, formula, key, end, sign, with_runout in RUNOFF_STATION_LINES:
        value, base = t.get(key), g.get(end)
        if missing(value) or missing(base) or missing(s) or missing(lr):
            continue
        if with_runout and missing(lt):
            continue
        share = f"(1 - {num(s)})" if "(1 - s)" in formula else num(s)
        sub = f"{num(base)} {sign} {share} x {num(lr)}"
        if with_runout:
            sub += f" {sign} {num(lt)}"
        steps.append(
            Step(
                label,
                formula,
                sub,
                f"{ans(value)} {ln} ({format_station(value, units.name)})",
                "placement rule as the runoff line above (stations: Indiana DOT Design Manual "
                "Fig. 43-6D for PC and PT)",
            )
        )
    return steps


def _road_lengths(record: dict, units: UnitSystem) -> list[Step]:
    """Comfort, both lateral-shift lengths, b_w, runoff and runout."""
    t = record["transition"]
    if t.get("comfort_rate") is None:
        return []
    ln = units.length_label
    r, e = record["radius"], record["superelevation"]
    steps = [
        Step(
            "Spiral length, comfort",
            "L = v^3 / (C R)",
            f"L = {per_second(record['speed'], units)}^3 / ({num(t['comfort_rate'])} x {num(r)})",
            f"{ans(t['length_comfort'])} {ln}",
            ROAD_SOURCE,
        ),
        Step(
            "Spiral length, least lateral shift",
            "L = sqrt(24 p_min R)",
            f"L = sqrt(24 x {num(t['shift_min'])} x {num(r)})",
            f"{ans(t['length_shift_min'])} {ln}",
            ROAD_SOURCE,
        ),
        Step(
            "Spiral length, most lateral shift",
            "L = sqrt(24 p_max R)",
            f"L = sqrt(24 x {num(t['shift_max'])} x {num(r)})",
            f"{ans(t['length_shift_max'])} {ln}",
            ROAD_SOURCE,
        ),
    ]
    if missing(t.get("runoff")) or e is None or e <= 0:
        return steps
    n1 = t["lanes_rotated"]
    if n1 != 1:
        steps.append(
            Step(
                "Adjustment for lanes rotated",
                "b_w = (1 + 0.5 (n1 - 1)) / n1",
                f"b_w = (1 + 0.5 x ({num(n1)} - 1)) / {num(n1)}",
                ans(t["width_factor"]),
                "Green Book 2018 Table 3-16 (b_w read via a design sheet citing AASHTO)",
            )
        )
    steps.append(
        Step(
            "Superelevation runoff",
            "L_r = (w n1) e b_w / Delta",
            f"L_r = ({num(t['lane_width'])} x {num(n1)}) x {num(e)} x "
            f"{num(t['width_factor'])} / {num(t['relative_gradient'])}",
            f"{ans(t['runoff'])} {ln}",
            "Green Book 2018 (from memory); e and Delta both in percent",
        )
    )
    if not missing(t.get("runout")):
        steps.append(
            Step(
                "Tangent runout",
                "L_t = e_NC L_r / e",
                f"L_t = {num(t['normal_crown'])} x {num(t['runoff'])} / {num(e)}",
                f"{ans(t['runout'])} {ln}",
                "Green Book 2018 (from memory); e_NC and e both in percent",
            )
        )
    return steps


RAIL_LINES = (
    ("length_cant_gradient", "cant_gradient_max", "cant gradient", "L1 = E_a / (dE/ds)max"),
    ("length_cant_rate", "cant_rate_max", "rate of change of cant", "L2 = E_a v / (dE/dt)max"),
    (
        "length_deficiency_rate",
        "deficiency_rate_max",
        "rate of change of cant deficiency",
        "L3 = |D| v / (dD/dt)max",
    ),
)


def rail_transition_steps(record: dict, units: UnitSystem, limits_name: str) -> list[Step]:
    t = record.get("transition")
    if not t or "length" not in t:
        return []
    ln, cl = units.length_label, units.cant_label
    v = per_second(record["speed"], units)
    gradient_unit = f"{cl}/{ln}"
    source = f"{limits_name}: the band's rate limits (see the limits file's source)"
    amounts = {
        "length_cant_gradient": num(record["cant"]),
        "length_cant_rate": f"{num(record['cant'])} x {v}",
        "length_deficiency_rate": f"{num(abs(record['cant_deficiency']))} x {v}",
    }
    steps, lengths = [], []
    for key, limit, words, formula in RAIL_LINES:
        if missing(t.get(limit)) or missing(t.get(key)):
            continue
        unit = gradient_unit if limit == "cant_gradient_max" else f"{cl}/s"
        steps.append(
            Step(
                f"Transition length, {words}",
                formula,
                f"{formula.split(' =')[0]} = {amounts[key]} / {num(t[limit])}",
                f"{ans(t[key])} {ln} (limit {num(t[limit])} {unit})",
                source,
            )
        )
        lengths.append(num(t[key]))
    if not lengths:
        return [
            Step(
                "Transition length",
                "max(L1, L2, L3)",
                "no rate limit in the limits file's band",
                "not evaluated",
                limits_name,
                _status(t),
            )
        ]
    steps.append(
        Step(
            "Transition length",
            "the longest of the lengths evaluated",
            f"L = max({', '.join(lengths)})",
            f"{ans(t['length'])} {ln} ({t['governing']} governs)",
            source,
            _status(t),
        )
    )
    return steps
