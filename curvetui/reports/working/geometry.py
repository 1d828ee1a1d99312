"""The geometry lines of a bend with a deflection, and its stations.

Simple curve (a surveying reference, "Horizontal Curves", read): T = R tan(Delta/2),
L = R Delta, E = R (1/cos(Delta/2) - 1), M = R (1 - cos(Delta/2)), LC = 2 R sin(Delta/2);
stations PC = PI - T, PT = PC + L (Indiana DOT Design Manual Fig. 43-6D, read).

Spiral - arc - spiral (textbook clothoid formulas, from memory; the engine integrates the
Fresnel integrals, curvetui.core.spiral): theta = Ls / (2 R); Xs and Ys by the series of
the Fresnel integrals (derived: cos and sin of t^2 / (2 R Ls) integrated term by term),
Xs = Ls sum (-1)^n theta^2n / ((4n+1)(2n)!), Ys = Ls sum (-1)^n theta^(2n+1) /
((4n+3)(2n+1)!), as many terms as change the answer; p = Ys - R (1 - cos theta),
k = Xs - R sin theta; Ts = (R + p) tan(Delta/2) + k (unequal spirals:
T1 = k1 + (R + p1) tan(Delta/2) + (p2 - p1) / sin Delta, T2 likewise with the signs
changed); Es = (R + p) / cos(Delta/2) - R (unequal: the distance from the PI to the arc
centre, less R); Lc = R (Delta - theta1 - theta2); TS = PI - T1, SC = TS + Ls1,
CS = SC + Lc, ST = CS + Ls2.
"""

from __future__ import annotations

import math

from curvetui.core.units import UnitSystem
from curvetui.reports.working.text import Step, decimals, fixed, num, places
from curvetui.stations import format_station

SIMPLE = "simple-curve formulas (a surveying reference, 'Horizontal Curves', read)"
STATIONS = "Indiana DOT Design Manual Fig. 43-6D (read): PC = PI - T, PT = PC + L"
SPIRAL = "clothoid formulas (textbook, from memory); series of the Fresnel integrals (derived)"

X_DENOMINATORS = [(4 * n + 1) * math.factorial(2 * n) for n in range(12)]
Y_DENOMINATORS = [(4 * n + 3) * math.factorial(2 * n + 1) for n in range(12)]


def geometry_steps(record: dict, units: UnitSystem) -> list[Step]:
    g = record.get("geometry")
    if not g:
        return []
    if g.get("type") == "circular":
        return _circular(record, g, units)
    return _spiral(record, g, units)


def _len(x: float, units: UnitSystem) -> str:
    """A length or station as an answer: to the mm (metric) or 0.01 ft."""
    return fixed(x, decimals(units)).strip("()")


def _station(label: str, formula: str, sub: str, value: float, units: UnitSystem) -> Step:
    text = format_station(value, units.name, decimals(units))
    return Step(label, formula, sub, f"{_len(value, units)} ({text})", STATIONS)


def _circular(record: dict, g: dict, units: UnitSystem) -> list[Step]:
    ln = units.length_label
    r, d = num(record["radius"]), num(g["deflection"])
    half = f"{d} / 2 deg"

    def line(label, formula, sub, key):
        return Step(label, formula, sub, f"{_len(g[key], units)} {ln}", SIMPLE)

    return [
        line("Tangent length", "T = R tan(Delta / 2)", f"T = {r} x tan({half})", "tangent"),
        line("Curve length", "L = R Delta (Delta in rad)", f"L = {r} x {d} x pi / 180", "length"),
        line(
            "External distance",
            "E = R (1 / cos(Delta / 2) - 1)",
            f"E = {r} x (1 / cos({half}) - 1)",
            "external",
        ),
        line(
            "Middle ordinate",
            "M = R (1 - cos(Delta / 2))",
            f"M = {r} x (1 - cos({half}))",
            "middle_ordinate",
        ),
        line("Long chord", "LC = 2 R sin(Delta / 2)", f"LC = 2 x {r} x sin({half})", "long_chord"),
        _station(
            "Station of the PC",
            "PC = PI - T",
            f"PC = {places(g['pi'])} - {places(g['tangent'])}",
            g["pc"],
            units,
        ),
        _station(
            "Station of the PT",
            "PT = PC + L",
            f"PT = {places(g['pc'])} + {places(g['length'])}",
            g["pt"],
            units,
        ),
    ]


def _series(theta: str, value: float, ls: str, length: float, odd: bool) -> str:
    """Ls (sum of the Fresnel series' terms) with the terms that reach 1e-9 of the unit."""
    denominators = Y_DENOMINATORS if odd else X_DENOMINATORS
    terms = []
    for n, den in enumerate(denominators):
        power = 2 * n + 1 if odd else 2 * n
        size = length * value**power / den
        if n > 0 and size < 1e-9:
            break
        sign = "-" if n % 2 else "+"
        if power == 0:
            text = "1"
        elif power == 1:
            text = f"{theta} / {den}"
        else:
            text = f"{theta}^{power} / {den}"
        terms.append(text if n == 0 else f"{sign} {text}")
    return f"{ls} x ({' '.join(terms)})"


def _one_spiral(record, g, units, ls: float, end: str, suffix: str) -> tuple[list, str, str]:
    """theta, Xs, Ys, p and k of one spiral; returns the lines and the texts of p and k."""
    ln = units.length_label
    r = num(record["radius"])
    th_deg = g[f"spiral_angle{suffix}"]
    th = math.radians(th_deg)
    th_text = num(th, 9)
    xs, ys = g[f"xs{suffix}"], g[f"ys{suffix}"]
    p, k = g[f"p{suffix}"], g[f"k{suffix}"]
    tag = f" {end}" if end else ""
    n = "2" if suffix else ("1" if end else "")
    steps = [
        Step(
            f"Spiral angle{tag}",
            f"theta{n} = Ls{n} / (2 R)",
            f"theta{n} = {num(ls)} / (2 x {r})",
            f"{th_text} rad = {th_deg:.6f} deg",
            SPIRAL,
        ),
        Step(
            f"Spiral end, along the tangent{tag}",
            f"Xs{n} = Ls (1 - theta^2/10 + theta^4/216 - ...)",
            f"Xs{n} = " + _series(th_text, th, num(ls), ls, odd=False),
            f"{_len(xs, units)} {ln}",
            SPIRAL,
        ),
        Step(
            f"Spiral end, offset{tag}",
            f"Ys{n} = Ls (theta/3 - theta^3/42 + theta^5/1320 - ...)",
            f"Ys{n} = " + _series(th_text, th, num(ls), ls, odd=True),
            f"{_len(ys, units)} {ln}",
            SPIRAL,
        ),
        Step(
            f"Shift of the arc{tag}",
            f"p{n} = Ys - R (1 - cos theta)",
            f"p{n} = {places(ys)} - {r} x (1 - cos({th_text} rad))",
            f"{_len(p, units)} {ln}",
            SPIRAL,
        ),
        Step(
            f"Spiral start to the arc centre's foot{tag}",
            f"k{n} = Xs - R sin theta",
            f"k{n} = {places(xs)} - {r} x sin({th_text} rad)",
            f"{_len(k, units)} {ln}",
            SPIRAL,
        ),
    ]
    return steps, places(p), places(k)


def _spiral(record: dict, g: dict, units: UnitSystem) -> list[Step]:
    ln = units.length_label
    r, d = num(record["radius"]), num(g["deflection"])
    half = f"{d} / 2 deg"
    l1 = g["spiral_length"]
    unequal = "spiral_length_out" in g
    l2 = g.get("spiral_length_out", l1)
    first, p1, k1 = _one_spiral(record, g, units, l1, "in" if unequal else "", "")
    steps = list(first)
    t1 = places(g["total_tangent"])
    if unequal:
        second, p2, k2 = _one_spiral(record, g, units, l2, "out", "_out")
        steps += second
        steps += [
            Step(
                "Total tangent, in",
                "T1 = k1 + (R + p1) tan(Delta/2) + (p2 - p1) / sin Delta",
                f"T1 = {k1} + ({r} + {p1}) x tan({half}) + ({p2} - {p1}) / sin({d} deg)",
                f"{_len(g['total_tangent'], units)} {ln}",
                SPIRAL,
            ),
            Step(
                "Total tangent, out",
                "T2 = k2 + (R + p2) tan(Delta/2) - (p2 - p1) / sin Delta",
                f"T2 = {k2} + ({r} + {p2}) x tan({half}) - ({p2} - {p1}) / sin({d} deg)",
                f"{_len(g['total_tangent_out'], units)} {ln}",
                SPIRAL,
            ),
            Step(
                "External distance",
                "Es = sqrt((T1 - k1)^2 + (R + p1)^2) - R",
                f"Es = sqrt(({t1} - {k1})^2 + ({r} + {p1})^2) - {r}",
                f"{_len(g['external'], units)} {ln}",
                SPIRAL + "; PI to the arc centre (derived)",
            ),
        ]
        th2 = num(math.radians(g["spiral_angle_out"]), 9)
    else:
        steps += [
            Step(
                "Total tangent",
                "Ts = (R + p) tan(Delta/2) + k",
                f"Ts = ({r} + {p1}) x tan({half}) + {k1}",
                f"{_len(g['total_tangent'], units)} {ln}",
                SPIRAL,
            ),
            Step(
                "External distance",
                "Es = (R + p) / cos(Delta/2) - R",
                f"Es = ({r} + {p1}) / cos({half}) - {r}",
                f"{_len(g['external'], units)} {ln}",
                SPIRAL,
            ),
        ]
        th2 = num(math.radians(g["spiral_angle"]), 9)
    th1 = num(math.radians(g["spiral_angle"]), 9)
    lc = places(g["circular_length"])
    steps += [
        Step(
            "Circular arc length",
            "Lc = R (Delta - theta1 - theta2), in rad",
            f"Lc = {r} x ({d} x pi / 180 - {th1} - {th2})",
            f"{_len(g['circular_length'], units)} {ln}",
            SPIRAL,
        ),
        Step(
            "Total length",
            "L = Ls1 + Lc + Ls2",
            f"L = {num(l1)} + {lc} + {num(l2)}",
            f"{_len(g['total_length'], units)} {ln}",
            SPIRAL,
        ),
        _station(
            "Station of the TS",
            "TS = PI - T1",
            f"TS = {places(g['pi'])} - {t1}",
            g["ts"],
            units,
        ),
        _station(
            "Station of the SC",
            "SC = TS + Ls1",
            f"SC = {places(g['ts'])} + {num(l1)}",
            g["sc"],
            units,
        ),
        _station(
            "Station of the CS",
            "CS = SC + Lc",
            f"CS = {places(g['sc'])} + {lc}",
            g["cs"],
            units,
        ),
        _station(
            "Station of the ST",
            "ST = CS + Ls2",
            f"ST = {places(g['cs'])} + {num(l2)}",
            g["st"],
            units,
        ),
    ]
    return steps
