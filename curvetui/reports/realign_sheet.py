"""A realignment's worksheet content, shared by the PDF, text and Markdown forms and the app.

Built from the engine's public results only: a ``core.versine_design.RealignDesign`` and,
when line speeds were given, the ``bend.realign_rail.RealignRail`` verdict of the designed
curve. Figures come through ``cli.realign_output`` (``summary`` and ``rows``, the user's
units) so every face shows the numbers the command prints; they are rounded only here, as
text. Stations in m (ft), versines and slews in mm (in); slew + out, away from the curve's
centre. A failed design or check is a line marked ``fail`` (printed in red), never left out.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from curvetui import CAUTION
from curvetui.cli.realign_output import corrections_line, fixed, rows, summary
from curvetui.screen_text import clean

HEAD = ("Station", "Measured", "Designed", "Slew", "Direction")
KEY_NAMES = ("TS", "SC", "CS", "ST")


def decimals(units) -> int:
    """Places a versine or slew is shown to: 0.1 mm, 0.001 in (as the command prints)."""
    return 1 if units.name == "metric" else 3


@dataclass(frozen=True)
class Line:
    """One labelled figure of the sheet; ``fail`` marks it to be shown in red."""

    label: str
    value: str
    fail: bool = False


@dataclass
class RealignSheet:
    """What every face of the realignment shows, as text (plus the numbers to draw)."""

    survey: str  # the survey file's name, cleaned of control characters
    units: object
    status: str  # PASS or FAIL (the design infeasible or a rail check failed)
    design: list[Line]
    rail: list[Line]
    notes: list[str]  # the rail check's notes (cant proposed, transitions)
    head: tuple[str, ...]
    table: list[tuple[str, str, str, str, str]]
    keys: list[tuple[str, float]]  # (TS..ST, station in user units); empty without a design
    stations: list[float] = field(default_factory=list)  # user units, for the drawings
    measured: list[float] = field(default_factory=list)
    designed: list[float] = field(default_factory=list)
    slews: list[float] = field(default_factory=list)
    slew_limit: float | None = None
    holds: list[float] = field(default_factory=list)  # hold stations, user units
    caution: str = CAUTION

    @property
    def has_design(self) -> bool:
        return bool(self.table) and bool(self.designed)


def _station(x: float) -> str:
    return f"{x:.2f}"


def design_lines(design, units) -> list[Line]:
    """The design summary: chord, radius, central versine, breakpoints, transitions, slews,
    the limit and whether it is met, each hold and whether it binds, the reason it failed."""
    s = summary(design, units)
    ln, cl = units.length_label, units.cant_label
    k = decimals(units)
    out = [Line("Chord", f"{s['chord']:g} {ln} (stations every {s['chord'] / 2:g} {ln})")]
    out.append(
        Line("Design", "found" if design.feasible else "INFEASIBLE", fail=not design.feasible)
    )
    if s["radius"] is not None:
        out += [
            Line("Radius", f"{s['radius']:.1f} {ln}"),
            Line("Central versine", f"{fixed(s['central_versine'], k)} {cl}"),
            Line(
                "Transitions",
                f"in {s['transition_in']:g} {ln}, out {s['transition_out']:g} {ln}",
            ),
        ]
        out += [Line(name, f"{s[name.lower()]:.2f} {ln}") for name in KEY_NAMES]
        out += [
            Line("Sum of squared slews", f"{fixed(s['sum_squared_slews'], k)} {cl}^2"),
            Line("Greatest slew", f"{fixed(s['max_slew'], k)} {cl}"),
        ]
    else:
        out.append(Line("Designed curve", "none: no diagram meets the hold points", fail=True))
    if s["slew_limit"] is not None:
        if not design.feasible:
            text, bad = f"{s['slew_limit']:g} {cl}: NOT MET", True
        elif s["binding_limit_stations"]:
            where = ", ".join(_station(x) for x in s["binding_limit_stations"])
            text, bad = f"{s['slew_limit']:g} {cl}: met, reached at {where} {ln}", False
        else:
            text, bad = f"{s['slew_limit']:g} {cl}: met (not reached)", False
        out.append(Line("Slew limit", text, fail=bad))
    else:
        out.append(Line("Slew limit", "none given"))
    if s["smallest_limit"] is not None:
        out.append(Line("Smallest limit that works", f"{fixed(s['smallest_limit'], k)} {cl}", True))
    binding = set(s["binding_holds"])
    for h in s["holds"]:
        if not design.feasible:
            state, bad = ("not met" if s["radius"] is None else "met by the design shown"), True
        elif getattr(design, "corrections", ()):
            state, bad = "met with local corrections", False
        elif h["station"] in binding:
            state, bad = "binds (the optimum moves without it)", False
        else:
            state, bad = "does not bind", False
        out.append(
            Line(f"Hold at {_station(h['station'])} {ln}", f"slew {h['slew']:g} {cl}: {state}", bad)
        )
    if not s["holds"]:
        out.append(Line("Hold points", "none"))
    if corrections_line(design, units):  # the designed versines are not the smooth diagram
        out.append(Line("Local corrections", corrections_line(design, units)))
        listed = ", ".join(
            f"{_station(st / units.length)} {fixed(v / units.cant, k)}"
            for st, v in design.corrections
        )
        out.append(Line(f"Corrections ({units.length_label}: {units.cant_label})", listed))
    if not design.feasible and s["smallest_limit"] is not None:
        why = (
            f"no design keeps every slew within {s['slew_limit']:g} {cl}; the smallest "
            f"limit that works is {fixed(s['smallest_limit'], k)} {cl}"
        )
        out.append(Line("Why infeasible", why, fail=True))
    elif not design.feasible and s["reason"]:
        out.append(Line("Why infeasible", clean(s["reason"]), fail=True))
    return out


def rail_lines(rail, units) -> tuple[list[Line], list[str]]:
    """The designed curve's rail verdicts as the command takes them (status, cant,
    deficiency, excess, each check, fails and warnings) and its notes."""
    if rail is None:
        return [Line("Rail checks", "not made: no line speed given")], []
    k = decimals(units)
    cl = units.cant_label
    out = [Line("Rail checks", rail.status.upper(), fail=rail.status == "fail")]
    rec = rail.record or {}
    if rec:
        excess = rec.get("cant_excess")
        out += [
            Line("Cant", f"{fixed(rec['cant'], k)} {cl}"
                 + (" (proposed)" if rail.proposed_cant is not None else "")),
            Line("Cant deficiency", f"{fixed(rec['cant_deficiency'], k)} {cl}"),
            Line("Cant excess", "-" if excess is None else f"{fixed(excess, k)} {cl}"),
            Line("Rail limits", clean(rec.get("limits", ""))),
        ]  # fmt: skip
        checks = {name: str(v).upper() for name, v in rec.get("checks", {}).items()}
        bad = [n for n, w in checks.items() if w in ("FAIL", "ERROR")]
        out.append(
            Line(
                "Checks" + (f" ({', '.join(bad)} FAIL)" if bad else ""),
                ", ".join(f"{n} {w}" for n, w in checks.items()),
                fail=bool(bad),
            )
        )
        for m in rec.get("messages", []):
            sev = m.get("severity")
            if sev in ("fail", "warning", "error"):
                out.append(Line(sev.upper(), clean(m.get("text", "")), fail=sev != "warning"))
    return out, [clean(n) for n in rail.notes]


def build_sheet(design, rail, units, survey: str) -> RealignSheet:
    """The sheet of ``design`` (and ``rail``, None without line speeds) in ``units``."""
    k = decimals(units)
    table = [
        (_station(st), fixed(m, k), fixed(d, k), fixed(s, k), dr)
        for st, m, d, s, dr in rows(design, units)
    ]
    failed = not design.feasible or (rail is not None and rail.status == "fail")
    keys = []
    if math.isfinite(design.ts):
        keys = [(n, getattr(design, n.lower()) / units.length) for n in KEY_NAMES]
    rl, notes = rail_lines(rail, units)
    return RealignSheet(
        survey=clean(survey, one_line=True),
        units=units,
        status="FAIL" if failed else "PASS",
        design=design_lines(design, units),
        rail=rl,
        notes=notes,
        head=(
            f"Station {units.length_label}",
            f"Measured {units.cant_label}",
            f"Designed {units.cant_label}",
            f"Slew {units.cant_label}",
            "Direction",
        ),
        table=table,
        keys=keys,
        stations=[float(x) / units.length for x in design.stations],
        measured=[float(x) / units.cant for x in design.measured],
        designed=[float(x) / units.cant for x in design.designed],
        slews=[float(x) / units.cant for x in design.slews],
        slew_limit=None if design.slew_limit is None else design.slew_limit / units.cant,
        holds=[float(st) / units.length for st, _ in design.holds],
    )


def slew_note(units) -> str:
    return (
        f"Stations in {units.length_label}; versines and slews in {units.cant_label}; slew + "
        "out (away from the curve's centre), - in; a slew shown as 0 has no direction. "
        "Slews by the versine (Hallade) method, closing at both ends."
    )
