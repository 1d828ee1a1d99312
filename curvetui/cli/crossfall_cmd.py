"""``curvetui crossfall``: a road bend's superelevation diagram as CSV - each station's
inside and outside cross slope and edge elevations relative to the profile grade line."""

from __future__ import annotations

import argparse
import csv
import io
import sys

from curvetui import CAUTION
from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option
from curvetui.inputs import InputError, parse_number
from curvetui.screen_text import clean

# The engine, the tables and file saving are imported in the functions that use them.

COLUMNS = (
    "station",
    "point",
    "element",
    "outside_slope_pct",
    "inside_slope_pct",
    "outside_elevation",
    "centreline_elevation",
    "inside_elevation",
)


def add_parser(sub) -> None:
    p = sub.add_parser(
        "crossfall",
        help="a road bend's superelevation diagram as CSV (edge cross slopes and elevations)",
        description="The cross slope of the inside and outside edges of a road bend, station "
        "by station through the runout, runoff and full superelevation, and the edge "
        "elevations relative to the profile grade line for the axis of rotation "
        "(--rotation-axis). Give the bend's inputs as `check road` takes them, or "
        "--project FILE --bend ID. Slopes in percent, + rising towards the outside edge.",
    )
    p.add_argument("--project", help="take the bend from this project file (with --bend)")
    p.add_argument("--bend", metavar="ID", help="the bend's id in --project")
    p.add_argument("--interval", help="station interval of the table (default 10 m or 25 ft)")
    p.add_argument("-o", "--output", help="CSV file to write (default: standard output)")
    geo.add_field_options(p, "road", tuple(f.key for f in _road_fields()))
    add_units_option(p)
    p.add_argument("--table", help="road design table by name or .toml path")
    p.set_defaults(run=run)


def _road_fields():
    from curvetui.bend.fields import fields_for

    return fields_for("road")


def run(args: argparse.Namespace) -> int:
    from curvetui.reports.superelevation_diagram import diagram_for_record

    record = _record(args)
    d = diagram_for_record(record)
    if isinstance(d, str):
        raise InputError(d)
    step = None
    if args.interval is not None:
        step = parse_number("--interval", args.interval, 0.1, 1000, d.length_label)
    try:
        rows = d.rows(step)
    except ValueError as exc:
        raise InputError(f"--interval: {exc}") from None
    text = csv_text(d, rows)
    for note in d.notes:
        sys.stderr.write(clean(f"curvetui: warning: {note}") + "\n")
    failed = record.get("status") == "fail"
    if failed:
        sys.stderr.write("curvetui: warning: this bend FAILS its checks (see `check road`)\n")
    if args.output in (None, "-"):
        sys.stdout.write(text)
    else:
        from curvetui.storage.files import atomic_write_text

        atomic_write_text(args.output, text)
        sys.stderr.write(clean(f"Superelevation diagram written: {args.output}") + "\n")
    return 1 if failed else 0


def _record(args: argparse.Namespace) -> dict:
    """The bend's record: from --project and --bend, else from the options."""
    from curvetui.bend.service import evaluate_bend
    from curvetui.core.units import unit_system

    given = geo.raw_inputs(args, "road")
    if args.project is None:
        if args.bend is not None:
            raise InputError("--bend: needs --project FILE")
        from curvetui.storage.tables import road_table

        units = unit_system(args.units)
        return evaluate_bend("road", given, units, road_table(args.table, units.name), None)
    if args.bend is None:
        raise InputError("--bend: give the bend's id with --project")
    if given:
        raise InputError(f"{geo_name(next(iter(given)))}: not with --project (edit the project)")
    from curvetui.storage.project.checking import evaluate, project_context
    from curvetui.storage.project.files import load_project

    project, _ = load_project(args.project)
    ids = [b.id for b in project.bends]
    if args.bend not in ids:
        raise InputError(f"--bend: no bend {args.bend!r} in the project (bends: {', '.join(ids)})")
    index = ids.index(args.bend)
    outcome = evaluate(project.bends[index], index, project_context(project))
    if outcome.record is None:
        raise InputError(outcome.error or "the bend could not be checked")
    return outcome.record


def geo_name(key: str) -> str:
    from curvetui.bend.fields import cli_name

    return cli_name(key)


def csv_text(d, rows) -> str:
    """The table as CSV: a header, a row per station, then comment lines (#) giving the
    units, the axis, the convention, any note and the caution."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    ln = d.length_label
    w.writerow([f"{c}_{ln}" if c.endswith("_elevation") else c for c in COLUMNS])
    for p in rows:
        w.writerow(
            [
                f"{p.station:.4f}",
                p.key,
                p.element,
                f"{p.slope_out:.3f}",
                f"{p.slope_in:.3f}",
                f"{p.z_out:.4f}",
                f"{p.z_centreline:.4f}",
                f"{p.z_in:.4f}",
            ]
        )
    buf.write(
        f"# superelevation e {d.e:.3f} %, normal crown {d.e_nc:g} %; axis of rotation: "
        f"{d.axis}; half widths {d.w_out:g} {ln} (outside) and {d.w_in:g} {ln} (inside); "
        f"{d.placement}\n"
        "# slopes + rise towards the outside edge of the curve; elevations relative to the "
        "profile grade line (the centreline's profile at normal crown)\n"
    )
    for note in d.notes:
        buf.write(f"# NOTE: {note}\n")
    buf.write(f"# {CAUTION}\n")
    return buf.getvalue()
