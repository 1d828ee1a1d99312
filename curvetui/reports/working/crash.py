"""The curve crash factor lines (rural two-lane roads): HSM 1st ed. 2010 Eq. 10-13 with the
arc length and radius converted to miles and feet in the line itself (1 mi = 5280 ft =
1609.344 m, 1 ft = 0.3048 m, exact), then the superelevation variance, its factor
(Eqs. 10-14..16) and the product (formulas and sources: curvetui.core.crash_factors).
Without a deflection the curve length is unknown: one line says so, without a number.
"""

from __future__ import annotations

from curvetui.core.units import UnitSystem
from curvetui.reports.working.text import Step, ans, missing, num, places

HSM = "rural two-lane roads; HSM 1st ed. 2010 Eq. 10-13"
SV_SOURCE = (
    "rural two-lane roads; HSM 1st ed. 2010 Eqs. 10-14..16 (read); SV = design e by the "
    "table's distribution - built e (from memory)"
)


def crash_steps(record: dict, units: UnitSystem) -> list[Step]:
    c = record.get("crash")
    if not c or missing(c.get("curvature_cmf")):
        return [
            Step(
                "Curve crash factor",
                "CMF = (1.55 Lc + 80.2 / R - 0.012 S) / (1.55 Lc)",
                "not computed: the curve length is unknown without a deflection",
                "none",
                HSM,
            )
        ]
    g = record["geometry"]
    arc = g["length"] if g.get("type") == "circular" else g["circular_length"]
    if units.name == "us":
        lc, r = f"{places(arc)} / 5280", num(record["radius"])
        conv = "Lc in mi = L / 5280, R in ft"
    else:
        lc, r = f"{places(arc)} / 1609.344", f"{num(record['radius'])} / 0.3048"
        conv = "Lc in mi = L / 1609.344, R in ft = R / 0.3048"
    validity = c.get("curvature_validity", "")
    note = "" if validity == "in range" else f"; outside the range: {validity} (from memory)"
    steps = [
        Step(
            "Curve crash factor, curvature",
            f"CMF = (1.55 Lc + 80.2 / R - 0.012 S) / (1.55 Lc), {conv}",
            f"CMF = (1.55 x {lc} + 80.2 / ({r}) - 0.012 x {num(c['spirals'])}) / (1.55 x {lc})",
            f"{ans(c['curvature_cmf'])}{note}",
            f"{HSM} (read in a public implementation); arc without spirals, S = 0.5 per end "
            "with a spiral",
            "",
        )
    ]
    sv = c.get("superelevation_variance")
    if missing(sv):
        return steps
    e, e_d = record["superelevation"], record["superelevation_design"]
    if sv < 0.01:
        band, sub = "CMF_SV = 1.00, as SV < 0.01", "CMF_SV = 1.00"
    elif sv < 0.02:
        band = "CMF_SV = 1 + 6 (SV - 0.01), as 0.01 <= SV < 0.02"
        sub = f"CMF_SV = 1 + 6 x ({num(sv)} - 0.01)"
    else:
        band = "CMF_SV = 1.06 + 3 (SV - 0.02), as SV >= 0.02"
        sub = f"CMF_SV = 1.06 + 3 x ({num(sv)} - 0.02)"
    steps += [
        Step(
            "Superelevation variance",
            "SV = (e_design - e) / 100, e in percent",
            f"SV = ({num(e_d)} - {num(e)}) / 100",
            ans(sv),
            SV_SOURCE,
        ),
        Step(
            "Curve crash factor, superelevation variance",
            band,
            sub,
            ans(c["superelevation_cmf"]),
            SV_SOURCE,
        ),
        Step(
            "Curve crash factor, combined",
            "CMF = CMF_curvature x CMF_SV",
            f"CMF = {num(c['curvature_cmf'])} x {num(c['superelevation_cmf'])}",
            ans(c["cmf"]),
            "HSM 1st ed. 2010: a site's CMFs multiply (Eq. 10-2, from memory)",
        ),
    ]
    return steps
