"""The sight lines: stopping sight distance with t, a and the grade substituted, and the
horizontal sightline offset with its angle in radians.

SSD (Green Book 2018 Eq. 3-2, read via TxDOT Roadway Design Manual 4.11.1; t = 2.5 s,
a = 3.4 m/s^2 or 11.2 ft/s^2, read via the FHWA summary of the Green Book ch. 3):
0.278 V t + 0.039 V^2 / a (m, km/h) or 1.47 V t + 1.075 V^2 / a (ft, mph); on a grade G the
braking part is 0.039 V^2 / (a + 9.81 G) or 1.075 V^2 / (a + 32.2 G) (the form of Eq. 3-3,
from memory); the design value is rounded up to 5 m or 5 ft (Table 3-1).
HSO = R (1 - cos(S / (2 R))) with the angle in radians (TxDOT RDM 4.7.9, read); where the
sight line runs past the curve (S > L): R (1 - cos(L / (2 R))) + (S - L) / 2 sin(L / (2 R))
(geometry of that position, from memory).
"""

from __future__ import annotations

from curvetui.core import sight as sd
from curvetui.core.units import UnitSystem
from curvetui.reports.working.text import Step, ans, missing, num, places


def sight_steps(record: dict, units: UnitSystem) -> list[Step]:
    s = record.get("sight")
    if not s:
        return []
    ln = units.length_label
    f = sd.FORMS[units.name]
    a = num(f.design_deceleration / f.acceleration_unit)
    g = num(f.gravity)
    V = num(record["speed"])
    grade = s.get("grade") or 0.0
    braking = a if grade == 0 else f"({a} + {g} x {num(grade)} / 100)"
    calc, design = s.get("stopping_sight_distance_calculated"), s["stopping_sight_distance"]
    steps = [
        Step(
            "Stopping sight distance",
            f"SSD = {num(f.reaction_coefficient)} V t + {num(f.braking_coefficient)} V^2 / "
            f"(a + {g} G), design rounded up to 5 {ln}",
            f"SSD = {num(f.reaction_coefficient)} x {V} x 2.5 + "
            f"{num(f.braking_coefficient)} x {V}^2 / {braking}",
            (f"{ans(calc)} {ln}; " if not missing(calc) else "")
            + f"design {num(design)} {ln} (rounded up to 5 {ln})",
            "Green Book 2018 Eq. 3-2 (read via TxDOT RDM 4.11.1), t = 2.5 s and a read via "
            "the FHWA summary; grade as Eq. 3-3 (from memory); Table 3-1 rounding",
        )
    ]
    r = num(s["sightline_radius"])
    S = num(design)
    g_obj = record.get("geometry") or {}
    length = g_obj.get("length", g_obj.get("total_length"))
    if not missing(length) and design > length:
        L = places(length)
        formula = "HSO = R (1 - cos(L / (2 R))) + (S - L) / 2 sin(L / (2 R)), angles in rad"
        sub = (
            f"HSO = {r} x (1 - cos({L} / (2 x {r}) rad)) + ({S} - {L}) / 2 x "
            f"sin({L} / (2 x {r}) rad)"
        )
        source = "sight line past the curve's ends: geometry of that position (from memory)"
    else:
        formula = "HSO = R (1 - cos(S / (2 R))), angle in rad"
        sub = f"HSO = {r} x (1 - cos({S} / (2 x {r}) rad))"
        source = "TxDOT Roadway Design Manual 4.7.9 (read), 28.65 S / R degrees = S / (2 R) rad"
    need = s.get("sightline_offset_required")
    steps.append(
        Step(
            "Sightline offset",
            formula,
            sub,
            f"{'-' if missing(need) else ans(need)} {ln} needed, "
            f"{num(s['offset_available'])} {ln} clear",
            source,
            s["status"],
        )
    )
    return steps
