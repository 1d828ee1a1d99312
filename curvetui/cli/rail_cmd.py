"""``curvetui check rail``: one rail curve against cant limits."""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_caution

if TYPE_CHECKING:
    from curvetui.core.units import UnitSystem

# The engine, the limits and Rich are imported in the functions that use them (see road_cmd).


def add_parser(check_sub) -> None:
    p = check_sub.add_parser("rail", help="check one rail-track curve")
    p.add_argument("--speed", required=True, help="speed of the fastest train (km/h or mph)")
    p.add_argument("--radius", required=True, help="radius (m or ft)")
    p.add_argument("--cant", required=True, help="applied cant (mm, or in with --units us)")
    p.add_argument("--low-speed", help="speed of the slowest train, for cant excess")
    p.add_argument("--gauge", help="track gauge in mm (1435, 1520, 1600, 1668, 1067, 1000 ...)")
    p.add_argument("--limits", help="rail limits by name or .toml path (see `curvetui tables`)")
    add_units_option(p)
    p.add_argument("--json", action="store_true", help="print one JSON object")
    geo.add_geometry_options(p, sight=False)
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from curvetui.bends import RAIL_INPUTS, evaluate_rail
    from curvetui.core.units import unit_system
    from curvetui.tables import rail_limits

    units = unit_system(args.units)
    limits = rail_limits(args.limits, units.name)
    return geo.run_check(
        args,
        RAIL_INPUTS,
        lambda raw: evaluate_rail(raw, units, limits),
        lambda r: print_rail(r, units),
    )


def print_rail(record: dict, units: UnitSystem) -> None:
    from rich.table import Table

    from curvetui.results import RAIL_FIELDS, unit_label

    out = console()
    low = f", slow train {record['low_speed']:g}" if record.get("low_speed") else ""
    grid = Table(
        title=f"Rail curve: {record['speed']:g} {units.speed_label}{low}, R {record['radius']:g} "
        f"{units.length_label}, cant {record['cant']:g} {units.cant_label}",
        caption=f"limits: {record['limits']}",
    )
    grid.add_column("Quantity")
    grid.add_column("Value", justify="right")
    grid.add_column("Unit")
    for key, (label, kind) in RAIL_FIELDS.items():
        value = record.get(key)
        shown = "-" if value is None else f"{value:,.2f}" if abs(value) < 100 else f"{value:,.1f}"
        grid.add_row(label, shown, unit_label(kind, units))
    out.print(grid)
    from curvetui.cli.road_cmd import print_parts

    print_parts(out, record, units)
    colour = "red" if record["status"] == "fail" else "green"
    out.print(f"Status: [bold {colour}]{record['status'].upper()}[/]")
    for message in record["messages"]:
        out.print(f"  - {message}", markup=False)
    print_caution(out)
