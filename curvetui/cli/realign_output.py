"""What `curvetui realign` writes: the text report, the JSON object and the slew CSV.

Lengths in the user's units: stations in m or ft, versines and slews in mm or in (the
cant unit). Numbers are rounded only here, for display; every verdict was taken before.
"""

from __future__ import annotations

import csv
import io
import math

from curvetui import CAUTION
from curvetui.screen_text import clean, markup

COLUMNS = ("station", "measured", "designed", "slew", "direction")


def _decimals(units) -> int:
    return 1 if units.name == "metric" else 3  # 0.1 mm, 0.001 in


def fixed(x: float, decimals: int) -> str:
    """``x`` to ``decimals`` places, a value that rounds to 0 as 0 (never -0.0)."""
    r = round(float(x), decimals)
    return f"{(r if r != 0 else 0.0):.{decimals}f}"


def direction(slew_shown: float, decimals: int) -> str:
    """'out' (away from the curve's centre) or 'in'; '' for a slew shown as 0."""
    if round(abs(slew_shown), decimals) == 0:
        return ""
    return "out" if slew_shown > 0 else "in"


def rows(design, units) -> list[tuple[float, float, float, float, str]]:
    """(station, measured, designed, slew, direction) in user units, unrounded numbers."""
    k = _decimals(units)
    out = []
    for st, m, d, s in zip(
        design.stations, design.measured, design.designed, design.slews, strict=False
    ):
        s_u = float(s) / units.cant
        out.append(
            (
                float(st) / units.length,
                float(m) / units.cant,
                float(d) / units.cant,
                s_u,
                direction(s_u, k),
            )
        )
    return out


def corrections_by_row(design, units) -> list[float] | None:
    """The local versine correction at every station (user units, 0 outside the windows);
    None when the design has none."""
    corr = getattr(design, "corrections", ())
    if not corr or not design.designed.size:
        return None
    by = {round(float(st), 9): float(v) for st, v in corr}
    return [by.get(round(float(st), 9), 0.0) / units.cant for st in design.stations]


def corrections_line(design, units) -> str:
    """One sentence: the designed versines include local corrections (largest, where)."""
    corr = getattr(design, "corrections", ())
    if not corr:
        return ""
    k = _decimals(units)
    st, v = max(corr, key=lambda q: abs(q[1]))
    return (
        "The designed versines include local versine corrections at the holds (the smooth "
        f"diagram alone cannot meet them): {len(corr)} stations within "
        f"{design.correction_window} of each hold, balanced so the slews elsewhere are the "
        f"smooth diagram's; largest {fixed(v / units.cant, k)} {units.cant_label} at "
        f"{st / units.length:g} {units.length_label} (common practice, no source)"
    )


def summary(design, units) -> dict:
    """The design's figures in user units (None where there is no design)."""
    ln, c = units.length, units.cant

    def f(x, per):
        return None if not math.isfinite(x) else float(x) / per

    return {
        "chord": design.chord / ln,
        "feasible": design.feasible,
        "radius": f(design.radius, ln),
        "central_versine": f(design.central_versine, c),
        "transition_in": f(design.transition_in, ln),
        "transition_out": f(design.transition_out, ln),
        "ts": f(design.ts, ln),
        "sc": f(design.sc, ln),
        "cs": f(design.cs, ln),
        "st": f(design.st, ln),
        "max_slew": f(design.max_slew, c),
        "sum_squared_slews": f(design.sum_squared_slews, c * c),
        "slew_limit": None if design.slew_limit is None else design.slew_limit / c,
        "smallest_limit": None if design.smallest_limit is None else design.smallest_limit / c,
        "holds": [{"station": s / ln, "slew": v / c} for s, v in design.holds],
        "binding_holds": [s / ln for s in design.binding_holds],
        "binding_limit_stations": [s / ln for s in design.binding_limit_stations],
        "reason": "" if design.feasible else infeasible_text(design, units),
        "corrections": [
            {"station": st_ / ln, "correction": v / c}
            for st_, v in getattr(design, "corrections", ())
        ],
        "correction_window": getattr(design, "correction_window", 0),
    }


def report_json(design, rail, units) -> dict:
    """One JSON object: units, the design, the table, the rail record, the caution."""
    table = [dict(zip(COLUMNS, r, strict=True)) for r in rows(design, units)]
    corr = corrections_by_row(design, units)
    if corr is not None:
        for row, v in zip(table, corr, strict=True):
            row["correction"] = v
    return {
        "units": {
            "station": units.length_label,
            "versine": units.cant_label,
            "slew": units.cant_label,
            "slew_positive": "out (away from the centre)",
        },
        "design": summary(design, units),
        "rail": None
        if rail is None
        else {
            "status": rail.status,
            "record": rail.record,
            "proposed_cant": rail.proposed_cant,
            "notes": list(rail.notes),
        },
        "slews": table,
        "status": "fail" if (not design.feasible or (rail and rail.status == "fail")) else "pass",
        "caution": CAUTION,
    }


def infeasible_text(design, units) -> str:
    """Why there is no design, in the user's units."""
    cl = units.cant_label
    if design.smallest_limit is None or design.slew_limit is None:
        return design.reason
    k = _decimals(units)
    holds = " while meeting the hold points" if design.holds else ""
    if getattr(design, "corrections", ()):
        holds += ", even with local versine corrections at the holds"
    return (
        f"no design keeps every slew within {design.slew_limit / units.cant:g} {cl}{holds}; "
        f"the smallest limit that works is {fixed(design.smallest_limit / units.cant, k)} {cl}"
        " (the design shown meets it)"
    )


def _length(x: float) -> str:
    """A length as the report gives it: to 0.01, no trailing zeros."""
    return f"{round(x, 2):g}"


def _design_lines(design, units) -> list[str]:
    s = summary(design, units)
    ln, cl = units.length_label, units.cant_label
    k = _decimals(units)
    lines = []
    if s["radius"] is not None:
        lines.append(
            f"Designed curve: R {s['radius']:.1f} {ln} (central versine "
            f"{s['central_versine']:.{k}f} {cl} on a {s['chord']:g} {ln} chord), transitions "
            f"{_length(s['transition_in'])} and {_length(s['transition_out'])} {ln}"
        )
        lines.append(
            f"Breakpoints: TS {fixed(s['ts'], 2)}, SC {fixed(s['sc'], 2)}, "
            f"CS {fixed(s['cs'], 2)}, ST {fixed(s['st'], 2)} {ln}"
        )
        lines.append(
            f"Greatest slew {s['max_slew']:.{k}f} {cl}; sum of squared slews "
            f"{s['sum_squared_slews']:.{k}f} {cl}^2"
        )
    if s["slew_limit"] is not None:
        reached = ", ".join(f"{x:g}" for x in s["binding_limit_stations"])
        if not design.feasible:
            reached = " (not met)"
        elif reached:
            reached = f": reached at {reached} {ln}"
        else:
            reached = " (not reached)"
        lines.append(f"Slew limit {s['slew_limit']:g} {cl}{reached}")
    for h in s["holds"]:
        binds = h["station"] in s["binding_holds"]
        if not design.feasible:
            state = "(not met)" if s["radius"] is None else "(met by the design below)"
        elif getattr(design, "corrections", ()):
            state = "(met with local corrections)"
        else:
            state = "(binds: the optimum moves without it)" if binds else "(does not bind)"
        lines.append(f"Hold at {h['station']:g} {ln}: slew {h['slew']:g} {cl} {state}")
    if corrections_line(design, units):
        lines.append(corrections_line(design, units))
    return lines


def print_report(design, rail, units, output) -> None:
    from rich.table import Table

    from curvetui.cli.common import console, print_caution

    out = console()
    k = _decimals(units)
    for line in _design_lines(design, units):
        out.print(markup(line))
    if not design.feasible:
        out.print(f"[bold red]INFEASIBLE:[/] {markup(infeasible_text(design, units))}")
    if rail is not None:
        out.print(
            f"Rail checks: [bold {'red' if rail.status == 'fail' else 'green'}]"
            f"{rail.status.upper()}[/]"
        )
        rec = rail.record or {}
        if rec:
            excess = rec.get("cant_excess")
            out.print(
                markup(
                    f"  cant {fixed(rec['cant'], k)} {units.cant_label}, deficiency "
                    f"{fixed(rec['cant_deficiency'], k)}, excess "
                    + (fixed(excess, k) if excess is not None else "-")
                    + f" {units.cant_label} (limits {rec['limits']}); checks: "
                    + ", ".join(f"{c} {v}" for c, v in rec["checks"].items())
                )
            )
            for m in rec.get("messages", []):
                if m.get("severity") in ("fail", "warning"):
                    out.print("  " + markup(f"{m['severity']}: {m['text']}"))
        for note in rail.notes:
            out.print("  " + markup(note))
    if design.designed.size:
        t = Table(title=f"Slews (+ out, away from the curve's centre; {units.cant_label})")
        for c, j in zip(COLUMNS, ("right", "right", "right", "right", "left"), strict=True):
            unit = {"station": units.length_label, "direction": ""}.get(c, units.cant_label)
            t.add_column(f"{c} {unit}".strip(), justify=j)
        corr = corrections_by_row(design, units)
        if corr is not None:
            t.add_column(f"correction {units.cant_label}", justify="right")
        for j, (st, m, d, s, dr) in enumerate(rows(design, units)):
            extra = () if corr is None else (fixed(corr[j], k),)
            t.add_row(f"{st:g}", fixed(m, k), fixed(d, k), fixed(s, k), dr, *extra)
        out.print(t)
    if output is not None:
        out.print(f"Slew table written: {markup(output)}")
    print_caution(out)


def csv_text(design, units, survey_path: str) -> str:
    """The slew table as CSV: a header, a row per station, then comment lines (#)."""
    from curvetui.batch.formulas import neutral_text

    k = _decimals(units)
    ln, cl = units.length_label, units.cant_label
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    corr = corrections_by_row(design, units)  # a column only when there are corrections
    head = [f"station_{ln}", f"measured_{cl}", f"designed_{cl}", f"slew_{cl}", "direction"]
    w.writerow(head + ([] if corr is None else [f"correction_{cl}"]))
    for j, (st, m, d, s, dr) in enumerate(rows(design, units)):
        extra = [] if corr is None else [fixed(corr[j], k + 1)]
        w.writerow([f"{st:.4f}", fixed(m, k + 1), fixed(d, k + 1), fixed(s, k + 1), dr, *extra])
    name = neutral_text(clean(survey_path, one_line=True))
    buf.write(
        f"# survey {name}; chord {design.chord / units.length:g} {ln}; stations in "
        f"{ln}, versines and slews in {cl}; slew + out (away from the curve's centre)\n"
    )
    for line in _design_lines(design, units):
        buf.write(f"# {line}\n")
    if not design.feasible:
        buf.write(f"# INFEASIBLE: {infeasible_text(design, units)}\n")
    buf.write(f"# {CAUTION}\n")
    return buf.getvalue()
