"""``curvetui find-curves IN -o REGISTER``: the curves of road or track centrelines.

Line features are read from GeoJSON, WKT in a CSV column, GeoPackage or Shapefile
(storage.centrelines), projected to a metric plane (finder.projection), searched for
curves (core.curve_finder) and written as a register (finder.register) that ``curvetui
batch`` checks. The summary goes to standard error."""

from __future__ import annotations

import argparse
import math
import os

from curvetui.cli.common import add_units_option
from curvetui.inputs import InputError

SPACING_RANGE = (0.1, 100.0)  # [m] resampling step the finder is asked for (no source)
DEFLECTION_RANGE = (0.0, 90.0)  # [degrees] a minimum deflection below 90 (no source)
MAX_JOBS = 256  # processes for --jobs


def add_parser(sub) -> None:
    p = sub.add_parser(
        "find-curves",
        help="find the curves of road or track centrelines (GeoJSON, WKT CSV, GeoPackage, "
        "Shapefile) and write a register for `batch`",
        description="Find the curves of the line features of IN (GeoJSON, .csv with a WKT "
        "column, GeoPackage .gpkg or Shapefile .shp) and write one register row per curve: "
        "stations, radius, deflection, direction, length, spirals, type and the fit's RMS "
        "offset. `curvetui batch REGISTER` then checks every curve. Longitude/latitude is "
        "projected to a transverse Mercator centred on each feature. Local road or rail "
        "authority standards govern; a qualified engineer must check every result.",
    )
    p.add_argument("input", help="the centreline file (read only, never changed)")
    p.add_argument(
        "-o",
        "--output",
        required=True,
        help="the register to write: .csv, or .parquet for Parquet (an existing file is "
        "kept as NAME.bak); - for CSV on standard output",
    )
    add_units_option(p)
    p.add_argument("--kind", choices=("road", "rail"), default="road", help="default road")
    g = p.add_argument_group("reading the file")
    g.add_argument("--id-field", metavar="PROP", help="the property that names each feature")
    g.add_argument("--layer", help="the GeoPackage layer to read (when it has several)")
    g.add_argument("--wkt-column", metavar="COLUMN", help="the CSV column holding the WKT")
    g.add_argument(
        "--crs",
        help="the coordinate system of the coordinates, when the file does not say it or "
        "says it wrongly: EPSG:4326, EPSG:27700, WKT or PROJ text, or plane-m, plane-ft, "
        "plane-usft for a local grid (metres, feet, US survey feet)",
    )
    f = p.add_argument_group("finding curves")
    f.add_argument(
        "--spacing",
        type=float,
        metavar="LENGTH",
        help="resampling step along each line, in the output length unit (default: the finder's)",
    )
    f.add_argument(
        "--min-deflection",
        type=float,
        metavar="DEGREES",
        help="curves turning less are dropped and counted (default: the finder's, 6 "
        "degrees: TxDOT's GPS method does not measure smaller ones reliably)",
    )
    s = p.add_argument_group("speeds for batch (in the output speed unit)")
    s.add_argument("--speed", type=float, help="one design speed for every curve")
    s.add_argument(
        "--speed-field",
        metavar="PROP",
        help="the property giving each feature's design speed (--speed where it is blank)",
    )
    s.add_argument(
        "--posted-field",
        metavar="PROP",
        help="the property giving the posted speed (road: for the signs); without --speed "
        "or --speed-field it is the speed checked too",
    )
    f.add_argument(
        "--jobs",
        type=int,
        default=1,
        metavar="N",
        help="search the features in N processes (default 1); the register is the same",
    )
    p.add_argument(
        "--keep",
        metavar="PROP,...",
        help="feature properties to carry into the register (comma-separated), e.g. a "
        "measured superelevation that batch then reads",
    )
    p.set_defaults(run=run)


def _keep_names(text: str | None) -> tuple[str, ...]:
    from curvetui.finder.register import COLUMNS

    if not text:
        return ()
    names = [n.strip() for n in text.split(",") if n.strip()]
    taken = {c.lower() for c in COLUMNS}
    clash = [n for n in names if n.lower() in taken]
    if clash:
        raise InputError(
            f"--keep: {', '.join(clash)} would clash with the register's own columns "
            f"({', '.join(COLUMNS)}); rename the property or leave it out"
        )
    if len({n.lower() for n in names}) != len(names):
        raise InputError("--keep: a property is named twice")
    return tuple(names)


def _settings(args, units):
    from curvetui.core.curve_finder import FinderSettings

    kwargs = {}
    if args.spacing is not None:
        lo, hi = (units.length_from_si(v) for v in SPACING_RANGE)
        if not (math.isfinite(args.spacing) and lo <= args.spacing <= hi):
            raise InputError(
                f"--spacing: must be {lo:g} to {hi:g} {units.length_label}, got {args.spacing}"
            )
        kwargs["spacing"] = units.length_to_si(args.spacing)
    if args.min_deflection is not None:
        lo, hi = DEFLECTION_RANGE
        if not (math.isfinite(args.min_deflection) and lo <= args.min_deflection < hi):
            raise InputError(
                f"--min-deflection: must be {lo:g} to under {hi:g} degrees, got "
                f"{args.min_deflection}"
            )
        kwargs["min_deflection"] = math.radians(args.min_deflection)
    return FinderSettings(**kwargs)


def _speeds(args, units):
    from curvetui.bend.fields import BY_KEY
    from curvetui.finder.register import SpeedSource

    if args.speed is not None:
        # a road's range is its design table's (batch checks it on every row)
        lo, hi = BY_KEY["speed"].allowed(args.kind, units) or (0.0, math.inf)
        if not (math.isfinite(args.speed) and lo < args.speed <= hi):
            top = f" and at most {hi:g} {units.speed_label}" if math.isfinite(hi) else ""
            raise InputError(
                f"--speed: must be above {lo:g}{top} for a {args.kind} curve, got {args.speed}"
            )
    if args.posted_field and args.kind == "rail":
        raise InputError("--posted-field: a posted speed is a road's (for its signs)")
    return SpeedSource(args.speed, args.speed_field, args.posted_field)


def _search(source, settings, kind, units, speeds, keep, jobs):
    """find_in_file with a progress bar on standard error when it is a terminal."""
    from rich.console import Console
    from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn

    from curvetui.finder.run import find_in_file

    err = Console(stderr=True, highlight=False)
    progress = Progress(
        TextColumn("finding curves"),
        BarColumn(),
        MofNCompleteColumn(),
        TimeElapsedColumn(),
        console=err,
        transient=True,
        disable=not err.is_terminal,
    )
    task = progress.add_task("features", total=len(source.features))
    with progress:
        return find_in_file(
            source, settings, kind, units, speeds, keep,
            tick=lambda n: progress.update(task, completed=n), jobs=jobs,
        )  # fmt: skip


def run(args: argparse.Namespace) -> int:
    from curvetui.core.units import unit_system
    from curvetui.finder.register import COLUMNS
    from curvetui.storage.centrelines import read_centrelines
    from curvetui.storage.curve_register import write_register

    units = unit_system(args.units)
    speeds = _speeds(args, units)
    keep = _keep_names(args.keep)
    settings = _settings(args, units)
    if not 1 <= args.jobs <= MAX_JOBS:
        raise InputError(f"--jobs: must be 1 to {MAX_JOBS}, got {args.jobs}")
    if args.output != "-" and os.path.exists(args.output) and os.path.exists(args.input):
        if os.path.samefile(args.input, args.output):
            raise InputError(f"{args.output}: the register would overwrite the input")
    source = read_centrelines(
        args.input,
        layer=args.layer,
        wkt_column=args.wkt_column,
        id_field=args.id_field,
        crs=args.crs,
    )
    if not source.features:
        why = "; ".join(f"{n} {reason}" for reason, n in source.skipped.items()) or "none"
        raise InputError(f"{args.input}: holds no line features (skipped: {why}); nothing written")
    result = _search(source, settings, args.kind, units, speeds, keep, args.jobs)
    columns = [c for c in COLUMNS if c != "posted_speed" or speeds.posted_field] + list(keep)
    if args.output == "-":
        import sys

        from curvetui.storage.curve_register import csv_bytes

        sys.stdout.buffer.write(csv_bytes(columns, result.rows))
        sys.stdout.buffer.flush()
    else:
        write_register(args.output, columns, result.rows)
    from curvetui.cli.find_curves_summary import print_summary

    print_summary(args, source, result, settings, units, speeds)
    from curvetui.cli import INTERNAL_ERROR

    return INTERNAL_ERROR if result.finder_failures else 0
