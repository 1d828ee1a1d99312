"""Project commands: ``curvetui new FILE``, ``curvetui check --project FILE``, ``curvetui FILE``."""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path
from typing import TYPE_CHECKING

from curvetui.cli.common import console, print_caution, print_json
from curvetui.inputs import InputError
from curvetui.screen_text import clean, markup

if TYPE_CHECKING:
    from curvetui.storage.project.files import ProjectError

# The project modules (the engine, the JSON Schema check) and Rich are imported in the
# functions that use them: this module is imported on every start to build the parser.

COMMANDS = {
    "check",
    "tables",
    "open",
    "setout",
    "new",
    "sheet",
    "batch",
    "crossfall",
    "design",
    "landxml",
    "realign",
    "find-curves",
    "-h",
    "--help",
    "--version",
}


def add_check_project(check: argparse.ArgumentParser) -> None:
    check.add_argument("--project", help="check every bend of this project file")
    check.add_argument(
        "--save",
        action="store_true",
        help="with --project: store the fresh results in the file (atomic save)",
    )
    check.add_argument("--json", action="store_true", help="with --project: print JSON")
    check.set_defaults(run=_run_check_project)


def add_new_parser(sub) -> None:
    p = sub.add_parser(
        "new",
        help="start a project file (FILE.json; never overwrites)",
        description="Start a project file: empty, or with --points and --speed a road "
        "project on a chain of PIs, each bend the proposal for its deflection. The name "
        "must end in .json; an existing "
        "file is never overwritten.",
    )
    p.add_argument("file", help="the project file to create (FILE.json)")
    p.add_argument("--name", help="project name (default: the file name)")
    p.add_argument("--units", choices=("metric", "us"), default="metric")
    from curvetui.cli import new_points_cmd

    new_points_cmd.add_options(p)
    p.set_defaults(run=_run_new)


CSV_SUFFIXES = (".csv", ".tsv")
PROJECT_SUFFIX = ".json"


def looks_like_file(word: str) -> bool:
    """Whether ``curvetui WORD`` opens a file: WORD is an existing path or ends in .json,
    .csv or .tsv (any case). Any other first word is an unknown command."""
    if word.lower().endswith((PROJECT_SUFFIX, *CSV_SUFFIXES)):
        return True
    try:
        return os.path.lexists(word)
    except (OSError, ValueError):  # e.g. an embedded NUL
        return False


def missing_project(path: Path) -> InputError:
    """Opening a project file that is not there: nothing is created."""
    return InputError(
        f"{path}: no such file; `curvetui new {path}` starts a project "
        "(opening a file never creates one)"
    )


def add_open_parser(sub) -> None:
    p = sub.add_parser(
        "open",
        help="open a project file or a CSV file of bends",
        description="Open a project file (.json) in the terminal app, or a CSV file of "
        "bends (.csv or .tsv, the columns of `curvetui batch`) on its checked results. "
        "Without a terminal, or with --print, print the checks instead. Opening never "
        "creates a file: `curvetui new FILE.json` starts a project.",
    )
    p.add_argument("file")
    p.add_argument("--print", action="store_true", help="print the checks instead of the app")
    p.add_argument(
        "--units",
        choices=("metric", "us"),
        help="CSV files only: metric (km/h, m) or us customary (mph, ft); default metric "
        "(a project file names its own units)",
    )
    p.add_argument("--table", help="CSV files only: road design table by name or .toml path")
    p.add_argument("--limits", help="CSV files only: rail limits by name or .toml path")
    p.set_defaults(run=_run_open)


def report_problems(exc: ProjectError) -> int:
    sys.stderr.write(clean(f"curvetui: error: {exc.path}: cannot use this project file:\n"))
    for p in exc.problems:
        sys.stderr.write(clean(f"  {p}", one_line=True) + "\n")
    return 2


def _run_new(args) -> int:
    from curvetui.storage.project.files import save_project
    from curvetui.storage.project.model import Details, Project

    path = Path(args.file)
    if path.suffix.lower() != PROJECT_SUFFIX:
        raise InputError(f"{path}: a project file's name must end in .json")
    if os.path.lexists(path):
        raise InputError(f"{path}: already exists; choose another name")
    from curvetui.cli import new_points_cmd

    if getattr(args, "points", None):
        return new_points_cmd.run(args, path)
    alone = new_points_cmd.given_without_points(args)
    if alone:
        raise InputError(f"{', '.join(alone)}: only with --points PIS.csv (a chain of PIs)")
    project = Project(Details(name=args.name or path.stem, units=args.units))
    save_project(project, path, exclusive=True)
    console().print(clean(f"Created {path} ({args.units} units)."), markup=False)
    return 0


def _run_open(args) -> int:
    """Open a project in the terminal app. Without a terminal (a pipe, CI), print its checks
    instead. A missing file is an error (nothing is created)."""
    from curvetui.storage.project.files import ProjectError

    path = Path(args.file)
    if path.suffix.lower() in CSV_SUFFIXES:
        return _open_csv(path, args)
    given = [f"--{k}" for k in ("units", "table", "limits") if getattr(args, k, None)]
    if given:
        raise InputError(
            f"{', '.join(given)}: for CSV files only; a project file names its own units, "
            "road table and rail limits (F2 in the app)"
        )
    if not os.path.lexists(path):
        raise missing_project(path)
    if args.print or not (sys.stdin.isatty() and sys.stdout.isatty()):
        try:
            check_project(str(path))
        except ProjectError as exc:
            return report_problems(exc)
        return 0
    from curvetui.app import collector

    collector.pause()  # until the first results are on screen (ProjectScreen.first_compute)
    from curvetui.app.app import build_app

    try:
        app = build_app(path)
    except ProjectError as exc:
        return report_problems(exc)
    return run_app(app)


def run_app(app) -> int:
    """Run a terminal app; after an unexpected error in it, one line naming the error and
    the recovery copy of unsaved changes (curvetui.app.crash), exit code 3."""
    from curvetui.app.crash import CRASH_EXIT, crash_line, recover

    try:
        app.run()
    except Exception as exc:  # the app could not even start or stop; no traceback either
        if app.crash is None:
            app.crash = recover(app.recovery_session(), exc)
    if app.crash is not None:
        sys.stderr.write(crash_line(app.crash) + "\n")
        return CRASH_EXIT
    return 0


def _open_csv(path: Path, args) -> int:
    """A CSV file of bends: its checked results in the app, or (without a terminal, or with
    --print) the batch summary. A file that cannot be used is refused before the app starts
    (exit code 2), as a bad project file is."""
    from curvetui.app.batch_results import open_source
    from curvetui.batch.header import BatchFileError
    from curvetui.batch.stream import run_batch
    from curvetui.cli.batch_cmd import print_summary
    from curvetui.core.units import unit_system
    from curvetui.storage.tables import rail_limits, road_table

    units = unit_system(args.units or "metric")
    table = road_table(args.table, units.name)
    limits = rail_limits(args.limits, units.name)
    if not path.exists():
        raise InputError(f"{path}: no such file (a CSV file is never created by opening it)")
    try:
        source = open_source(path, units, table, limits)
        if args.print or not (sys.stdin.isatty() and sys.stdout.isatty()):
            summary = run_batch(path, None, units, table, limits, workers=1)
            out = console()
            out.print(
                clean(
                    f"{path}: checked (`curvetui batch {path}` writes every row with its results)"
                ),
                markup=False,
            )
            print_summary(out, summary, "-", table, limits)
            return 0
    except BatchFileError as exc:
        sys.stderr.write(clean(f"curvetui: error: {path}: cannot use this CSV file: {exc}") + "\n")
        return 2
    from curvetui.app.batch_view import BatchApp

    return run_app(BatchApp(source))


def _run_check_project(args) -> int:
    from curvetui.storage.project.files import ProjectError

    if not args.project:
        raise InputError("check: needs `road`, `rail` or --project FILE")
    try:
        return check_project(args.project, save=args.save, as_json=args.json)
    except ProjectError as exc:
        return report_problems(exc)


def check_project(path: str, save: bool = False, as_json: bool = False) -> int:
    """Check every bend; 1 when any fails or cannot be computed."""
    from curvetui.storage.project.checking import (
        evaluate_project,
        project_context,
        refresh_results,
        stale_results,
    )
    from curvetui.storage.project.files import load_project, save_project

    project, notes = load_project(path)
    ctx = project_context(project)
    outcomes = evaluate_project(project, ctx)
    notes += stale_results(outcomes)
    report = project_alignment(project, outcomes, ctx)
    bad = any(o.status != "pass" for o in outcomes)
    bad = bad or (report is not None and report.status in ("fail", "error"))
    if save:
        refresh_results(project, outcomes)
        save_project(project, path)
        notes.append(f"results stored in {path} (previous file kept as {path}.bak)")
    if as_json:
        print_json(
            {
                "project": project.details.to_json(),
                "bends": [
                    {
                        "id": o.bend.id,
                        "kind": o.bend.kind,
                        "status": o.status,
                        "error": o.error,
                        "results": o.record,
                    }
                    for o in outcomes
                ],
                "alignment": None if report is None else report.to_json(),
                "notes": notes,
            }
        )
        return 1 if bad else 0
    print_outcomes(project, ctx, outcomes, notes, report)
    return 1 if bad else 0


def project_alignment(project, outcomes, ctx):
    """The alignment checked as a whole (None when the project has none)."""
    from curvetui.storage.project.alignment_report import alignment_report
    from curvetui.storage.project.chain import lay_out_project

    records = {o.bend.id: o.record for o in outcomes}
    return alignment_report(project, lay_out_project(project), records, ctx.units)


def print_alignment(out, report) -> None:
    """The alignment's table of PIs and its verdicts (never hidden)."""
    from rich import box
    from rich.table import Table

    colour = {"pass": "green", "warning": "yellow"}.get(report.status, "red")
    title = f"Alignment {markup(report.name, True)}: [bold {colour}]{report.status.upper()}[/]"
    if report.error:
        out.print(title)
    else:
        head, rows = report.table(compact=True)
        short = {"Deflection": "Defl deg", "PI station": "PI sta", "Tangent after": "Tangent"}
        grid = Table(
            title=title,
            box=box.SIMPLE_HEAD,
            padding=(0, 1, 0, 0),
            pad_edge=False,
            show_edge=False,
        )
        for col in (short.get(c, c) for c in head):
            grid.add_column(col, justify="left" if col == "Bend" else "right", no_wrap=True)
        for row in rows:
            grid.add_row(*(markup(c, True) for c in row))
        out.print(grid)
        u = report.units.length_label
        out.print(
            clean(
                f"  start tangent {report.tangents[0]:.2f} {u}; end station "
                f"{report.end_station:.2f}; deflections in degrees (R right, L left); the "
                "bends' deflection and PI station come from the alignment (the worksheet "
                "and --json give the coordinates and all stations)"
            ),
            markup=False,
        )
    for line in report.lines():
        out.print(clean(f"  - {line}"), markup=False)


def print_outcomes(project, ctx, outcomes, notes, report=None, after=()) -> None:
    """The bends' table, their messages and notes, the alignment, ``after`` (lines of
    advice), then the caution."""
    from rich import box
    from rich.table import Table

    from curvetui.bend.messages import message_line
    from curvetui.stations import format_station

    units = ctx.units
    out = console()
    d = project.details
    grid = Table(
        title=markup(d.name, True)
        + (f" - job {markup(d.job_number, True)}" if d.job_number.strip() else ""),
        caption=f"road table {markup(ctx.table.name, True)}; rail limits "
        f"{markup(ctx.limits.name, True)}; speeds {units.speed_label}, lengths "
        f"{units.length_label}, cant {units.cant_label}",
        box=box.SIMPLE_HEAD,
        padding=(0, 1, 0, 0),
        pad_edge=False,
        show_edge=False,
    )
    for col in ("Bend", "Kind", "Station", "V", "R", "Key result", "Limit", "Vsafe", "Status"):
        grid.add_column(
            col,
            justify="left" if col in ("Bend", "Kind", "Status", "Key result") else "right",
            no_wrap=True,
        )
    lines = []
    for o in outcomes:
        b, r = o.bend, o.record
        station = format_station(b.station, units.name, 1)
        ident, kind = markup(b.id, True), markup(b.kind, True)
        if r is None:
            grid.add_row(ident, kind, station, "", "", "", "", "", "[bold magenta]ERROR[/]")
            lines.append(f"{b.id}: ERROR {o.error}")
            continue
        if b.kind == "road":
            key = f"f {_num(r['side_friction_demand'], '.3f')}"
            limit = _num(r["side_friction_max"], ".3f")
            safe = _num(r["safe_speed"], ".1f")
        else:
            key = f"D {_num(r['cant_deficiency'], '.1f')}"
            limit = _num(r["deficiency_limit"], ".1f")
            safe = _num(r["max_speed"], ".1f")
        colour = "red" if r["status"] == "fail" else "green"
        grid.add_row(
            ident,
            kind,
            station,
            _num(r["speed"], "g"),
            _num(r["radius"], "g"),
            key,
            limit,
            safe,
            f"[bold {colour}]{r['status'].upper()}[/]",
        )
        lines += [f"{b.id}: {message_line(m)}" for m in r["messages"]]
    out.print(grid)
    for line in lines + notes:
        out.print(clean(f"  - {line}"), markup=False)
    if report is not None:
        print_alignment(out, report)
    for line in after:
        out.print(clean(line), markup=False)
    print_caution(out)


def _num(value, spec: str) -> str:
    """A number of a record as the table shows it; "-" where the record has none (null)."""
    return "-" if value is None else format(value, spec)
