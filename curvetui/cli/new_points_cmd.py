"""``curvetui new FILE.json --points PIS.csv --speed V``: a road project started from a
speed and a chain of PIs. Each PI becomes a road bend whose radius, superelevation and
spirals are its proposal (curvetui.bend.propose) for the deflection the points give; the
alignment is laid out and the created project printed as ``check --project`` prints it,
with the verdicts between bends, so that PIs too close for the proposed radii show at once.
A radius is never reduced below its proposal to make bends fit: the overlap is a FAIL, the
file is still created (exit code 1) and the output says what to change."""

from __future__ import annotations

import argparse
import math
from pathlib import Path

from curvetui.inputs import InputError
from curvetui.screen_text import clean

OVERLAP_ADVICE = (
    "The proposed bends do not fit between some PIs (the overlaps above): the radii were "
    "NOT reduced below their proposals. Move those PIs apart, lower the speed, or type a "
    "smaller radius in the app (F7 shows the minimum radius); the project is saved as "
    "proposed."
)
# the options of this form of `new` (besides FILE, --name and --units)
POINTS_OPTIONS = ("points", "speed", "emax", "table", "start_station")


def add_options(p: argparse.ArgumentParser) -> None:
    """--points, --start-station, --table; --speed and --emax from the field list."""
    from curvetui.cli import geometry_opts as geo

    g = p.add_argument_group(
        "start from a chain of PIs",
        "a road project whose bends are the proposals for a speed at each PI of PIS.csv",
    )
    g.add_argument(
        "--points",
        metavar="PIS.csv",
        help="CSV file: a header row (easting,northing and optionally id) and one row per "
        "point in order: the start, PI 1 .. PI n, the end, in the project's length unit",
    )
    geo.add_field_options(g, "road", ("speed", "emax"))
    g.add_argument(
        "--table", help="road design table by name or .toml path (see `curvetui tables`)"
    )
    g.add_argument(
        "--start-station",
        default="0",
        help="station of the start point (e.g. 0+000 or 1+250.5); default 0",
    )


def given_without_points(args) -> list[str]:
    """The chain's options given without --points (refused: they need the chain)."""
    opts = {"speed": "--speed", "emax": "--emax", "table": "--table"}
    out = [o for k, o in opts.items() if getattr(args, k, None) is not None]
    if getattr(args, "start_station", "0") != "0":
        out.append("--start-station")
    return out


def _start_station(text: str, units: str) -> float:
    from curvetui.stations import parse_station

    try:
        x = parse_station(text, units)
    except (ValueError, TypeError):
        x = math.nan
    if not math.isfinite(x) or abs(x) > 1e9:
        raise InputError(
            f"--start-station: must be a station such as 0+000 or 1+250.5 or a number from "
            f"-1e9 to 1e9, got {clean(text, one_line=True)!r}"
        )
    return x


def run(args, path: Path) -> int:
    """Create the project from the chain (exclusive: never overwrites), then print it."""
    from curvetui.cli.common import console
    from curvetui.cli.project_cmd import print_outcomes, project_alignment
    from curvetui.storage.pi_points import read_points
    from curvetui.storage.project.checking import evaluate_project, project_context
    from curvetui.storage.project.files import save_project
    from curvetui.storage.project.model import Details
    from curvetui.storage.project.proposing import project_from_points

    if args.speed is None:
        raise InputError("--speed: required with --points (the design speed of every bend)")
    chain = read_points(args.points)  # only this file is read
    start = _start_station(args.start_station, args.units)
    details = Details(name=args.name or path.stem, units=args.units, road_table=args.table)
    ctx = project_context(details_only(details))
    project, _ = project_from_points(
        chain.points,
        chain.ids,
        details,
        ctx,
        args.speed,
        args.emax,
        start,
        alignment_name=args.name or path.stem,
    )
    save_project(project, path, exclusive=True)
    outcomes = evaluate_project(project, ctx)
    report = project_alignment(project, outcomes, ctx)
    n = len(project.bends)
    out = console()
    out.print(
        clean(
            f"Created {path} ({args.units} units): {n} road bend{'s' if n != 1 else ''} on the "
            f"chain of {args.points}, each the proposal for its deflection at "
            f"{args.speed} {ctx.units.speed_label} (`curvetui design --project {path}` "
            "shows why)."
        ),
        markup=False,
    )
    overlap = report is not None and any(v.code == "overlap" for v in report.verdicts)
    after = [OVERLAP_ADVICE] if overlap else []
    print_outcomes(project, ctx, outcomes, [], report, after)
    bad = any(o.status != "pass" for o in outcomes)
    bad = bad or (report is not None and report.status in ("fail", "error"))
    return 1 if bad else 0


def details_only(details):
    """A project of these details alone (for its context: units and table)."""
    from curvetui.storage.project.model import Project

    return Project(details)
