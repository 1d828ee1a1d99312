"""Options and JSON shared by `check road` and `check rail` for a bend's geometry and sight."""

from __future__ import annotations

import argparse


def add_geometry_options(p: argparse.ArgumentParser, sight: bool = True) -> None:
    g = p.add_argument_group("geometry")
    g.add_argument("--deflection", help="deflection angle at the PI, degrees (0 to 179)")
    g.add_argument("--pi-station", help="station of the PI (2+710.5 or 2710.5; default 0)")
    g.add_argument("--spiral", help="clothoid transition length, in and out (m or ft)")
    g.add_argument("--spiral-out", help="length of the outgoing spiral when unequal (m or ft)")
    if sight:
        g.add_argument(
            "--obstruction-offset",
            help="clear offset from the inside lane centre to the obstruction (m/ft)",
        )
        g.add_argument(
            "--grade",
            help="approach grade for stopping sight distance, percent (+ up, - down; default 0)",
        )


def add_sight_lane_option(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "--lane-width",
        help="lane width (m or ft; default 3.6 m / 12 ft): the sight "
        "line is taken on the centre of the inside lane, and runoff rotates one lane",
    )


def run_check(args: argparse.Namespace, keys, evaluate, printer) -> int:
    """Shared body of `check road` and `check rail`: evaluate, print, exit 1 on a failure."""
    from curvetui.cli.common import print_json

    record = evaluate(raw_inputs(args, keys))
    if args.json:
        print_json(record)
    else:
        printer(record)
    return 1 if record["status"] == "fail" else 0


def raw_inputs(args: argparse.Namespace, keys) -> dict:
    """The options given, under the project file's input names (spiral -> spiral_in)."""
    names = {"spiral_in": "spiral"}
    out = {}
    for key in keys:
        value = getattr(args, names.get(key, key), None)
        if value is not None:
            out[key] = value
    return out
