"""``curvetui realign SURVEY.csv --chord C``: a curve in service realigned from its measured
versines - the designed diagram, the slew at every station, the cant verdicts.

Stations in m (ft with --units us), versines, slews and limits in mm (in). Exit 0 when the
design meets the holds and the limit and every rail check passes, 1 when it does not (the
smallest limit that works is given), 2 for bad input.
"""

from __future__ import annotations

import argparse
import math
import os

from curvetui.cli import geometry_opts as geo
from curvetui.cli import realign_faces
from curvetui.cli.common import add_units_option
from curvetui.inputs import InputError

# The engine, the limits, Rich and file saving are imported in the functions that use them.

RAIL_OPTIONS = ("speed", "low_speed", "cant", "gauge", "traffic", "radius")
MAX_HOLDS = 50


def add_parser(sub) -> None:
    p = sub.add_parser(
        "realign",
        help="realign a curve in service from measured versines (slews, radius, cant)",
        description="Read a survey CSV (header station,versine; stations half a chord "
        "apart, in m or ft; versines in mm or in, positive on the curve), design a "
        "transition - constant versine - transition diagram whose slews close (zero at both "
        "ends) with the least sum of squared slews, meeting --hold points and --slew-limit "
        "(where the smooth diagram cannot meet the holds, with local versine corrections "
        "within 2 stations of each hold, balanced so the slews elsewhere are the smooth "
        "diagram's; --no-corrections refuses them), "
        "and give the slew at every station (+ out, away from the curve's centre). With "
        "--speed, the designed curve's cant, deficiency and excess and its transitions are "
        "checked against the rail limits.",
    )
    p.add_argument("survey", metavar="SURVEY.csv", help="the measured versines (read only)")
    p.add_argument("--chord", required=True, help="chord length (m or ft)")
    p.add_argument(
        "--hold",
        action="append",
        default=[],
        metavar="STATION[=SLEW]",
        help="a station whose slew is fixed: 0 (default) or SLEW (mm or in); repeat it",
    )
    p.add_argument("--slew-limit", help="largest slew allowed either way (mm or in)")
    p.add_argument(
        "--no-corrections",
        action="store_true",
        help="never add local versine corrections at the holds (by default they are added "
        "only when the smooth diagram cannot meet the holds or the limit with them)",
    )
    p.add_argument(
        "--transition",
        metavar="L1[,L2]",
        help="transition lengths (m or ft; whole multiples of half the chord); L2 = L1 if "
        "not given (default: searched)",
    )
    p.add_argument(
        "--max-transition",
        help="longest transition searched (m or ft; default 20 spacings of half the chord)",
    )
    geo.add_field_options(p, "rail", RAIL_OPTIONS)
    p.add_argument("--limits", help="rail limits by name or .toml path (see `curvetui tables`)")
    add_units_option(p)
    p.add_argument("-o", "--output", help="write the slew table as CSV to this file")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    realign_faces.add_options(p)
    p.set_defaults(run=run)


def _number(option: str, text: str, lo: float, hi: float, unit: str, lo_open=True) -> float:
    try:
        x = float(str(text).strip())
    except ValueError:
        x = math.nan
    if not math.isfinite(x) or x > hi or x < lo or (lo_open and x == lo):
        bound = f"more than {lo:g}" if lo_open else f"{lo:g} or more"
        raise InputError(
            f"{option}: must be a number {bound} and at most {hi:g} {unit}; got {text!r}"
        )
    return x


def _holds(items, stations, units) -> dict:
    """--hold STATION[=SLEW] texts as {station [m]: slew [m]}; each must be a station."""
    if len(items) > MAX_HOLDS:
        raise InputError(f"--hold: at most {MAX_HOLDS} hold points")
    out = {}
    ln, cl = units.length_label, units.cant_label
    for item in items:
        station_text, _, slew_text = str(item).partition("=")
        st = _number("--hold", station_text, -1e7, 1e7, ln, lo_open=False)
        slew = 0.0
        if slew_text.strip():
            slew = _number("--hold", slew_text, -1e4, 1e4, cl, lo_open=False)
        near = min(stations, key=lambda s: abs(s - st))
        if abs(near - st) > 1e-6 * max(1.0, abs(st)):
            raise InputError(
                f"--hold: {st:g} {ln} is not a station of the survey (stations "
                f"{stations[0]:g} to {stations[-1]:g} {ln}, every {stations[1] - stations[0]:g})"
            )
        out[float(units.length_to_si(near))] = float(slew * units.cant)
    return out


def run(args: argparse.Namespace) -> int:
    from curvetui.core.units import unit_system
    from curvetui.storage.versine_survey import read_survey

    units = unit_system(args.units)
    ln, cl = units.length_label, units.cant_label
    chord = _number("--chord", args.chord, 0.0, 1000.0, ln)
    spacing = chord / 2.0
    survey = read_survey(args.survey, spacing)
    holds = _holds(args.hold, survey.stations, units)
    limit = None
    if args.slew_limit is not None:
        least = 0.01 if units.name == "metric" else 0.0005  # 0.01 mm, 0.0005 in
        limit = _number("--slew-limit", args.slew_limit, least, 1e4, cl, lo_open=False)
        limit *= units.cant
    transitions = _transitions(args.transition, spacing, ln)
    radius = None
    if args.radius is not None:
        radius = _number("--radius", args.radius, 0.0, 1e6, ln)
        if radius <= chord / 2:
            raise InputError(f"--radius: must be more than half the chord ({chord / 2:g} {ln})")
    max_t = None
    if args.max_transition is not None:
        max_t = int(_number("--max-transition", args.max_transition, 0.0, 1e5, ln) // spacing)
        if max_t < 1:
            raise InputError(f"--max-transition: at least half the chord ({spacing:g} {ln})")
    out_path = _output_path(args.output, args.survey)
    realign_faces.check_options(args)
    design = _solve(
        survey, units, chord, holds, limit, radius, transitions, max_t, not args.no_corrections
    )
    rail = _rail(args, design, units)
    from curvetui.cli.realign_output import csv_text, print_report, report_json

    if args.output is not None:
        from curvetui.storage.files import atomic_write_text

        atomic_write_text(out_path, csv_text(design, units, args.survey))
    if args.sheet is not None:
        realign_faces.write_sheet(args.sheet, design, rail, units, args.survey)
    if args.view:
        return realign_faces.run_view(design, rail, units, args.survey)
    refused = args.no_corrections and bool(holds) and not design.feasible
    if args.json:
        from curvetui.cli.common import print_json

        got = report_json(design, rail, units)
        got["design"]["corrections_allowed"] = not args.no_corrections
        print_json(got)
    else:
        if refused:
            from curvetui.cli.common import console

            console().print(
                "Local versine corrections at the holds were not tried (--no-corrections)."
            )
        print_report(design, rail, units, args.output)
        if args.sheet is not None:
            realign_faces.say_written(args.sheet)
    failed = not design.feasible or (rail is not None and rail.status == "fail")
    return 1 if failed else 0


def _transitions(text, spacing: float, ln: str):
    """--transition L1[,L2] as whole numbers of spacings."""
    if text is None:
        return None
    parts = [t for t in str(text).split(",")]
    if len(parts) > 2:
        raise InputError("--transition: one length, or two separated by a comma")
    got = []
    for t in parts:
        x = _number("--transition", t, 0.0, 1e5, ln)
        k = round(x / spacing)
        if k < 1 or abs(k * spacing - x) > 1e-6 * max(1.0, x):
            raise InputError(
                f"--transition: {x:g} {ln} is not a whole number of station spacings "
                f"({spacing:g} {ln}, half the chord)"
            )
        got.append(int(k))
    return (got[0], got[-1])


def _output_path(output, survey: str):
    if output is None:
        return None
    if output == "-":
        raise InputError("-o: give a file name (the report goes to standard output)")
    try:
        same = os.path.exists(output) and os.path.samefile(output, survey)
    except OSError:
        same = False
    if same or os.path.abspath(output) == os.path.abspath(survey):
        raise InputError("-o: that is the survey file; the input is never written over")
    return output


def _solve(survey, units, chord, holds, limit, radius, transitions, max_t, corrections=False):
    import numpy as np

    from curvetui.core.versine_design import RealignInputError, design_realignment

    st = np.asarray(survey.stations) * units.length
    m = np.asarray(survey.versines) * units.cant
    c = chord * units.length
    v_c = None if radius is None else c**2 / (8.0 * radius * units.length)
    try:
        return design_realignment(
            st, m, c, holds, limit, v_c, transitions, max_t, corrections=corrections
        )
    except RealignInputError as exc:
        raise InputError(f"survey: {exc}") from None


def _rail(args, design, units):
    """The rail verdicts when --speed is given and a design exists; None otherwise."""
    if args.speed is None:
        given = [k for k in ("low_speed", "cant", "gauge", "traffic") if getattr(args, k)]
        if given or args.limits:
            from curvetui.bend.fields import cli_name

            what = cli_name(given[0]) if given else "--limits"
            raise InputError(f"{what}: needs --speed (the rail checks need the line speed)")
        return None
    if not math.isfinite(design.radius):
        return None
    from curvetui.bend.realign_rail import RAIL_KEYS, rail_verdict
    from curvetui.storage.tables import rail_limits

    limits = rail_limits(args.limits, units.name)
    raw = geo.raw_inputs(args, RAIL_KEYS)
    _check_rail_options(raw, units, limits)
    return rail_verdict(design, raw, units, limits)


def _check_rail_options(raw: dict, units, limits) -> None:
    """The rail options given, checked on a curve of the largest radius allowed (so only
    they can be at fault): InputError naming the option, exit code 2."""
    from curvetui.bend.fields import BY_KEY
    from curvetui.bend.service import evaluate_bend

    trial = {**raw, "radius": BY_KEY["radius"].allowed("rail", units)[1]}
    trial.setdefault("cant", 0)
    evaluate_bend("rail", trial, units, None, limits)
