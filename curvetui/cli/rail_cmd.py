"""``curvetui check rail``: one rail curve against cant limits."""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_caution
from curvetui.screen_text import markup

if TYPE_CHECKING:
    from curvetui.core.units import UnitSystem

# The engine, the limits and Rich are imported in the functions that use them (see road_cmd).


def add_parser(check_sub) -> None:
    p = check_sub.add_parser("rail", help="check one rail-track curve")
    geo.add_field_options(p, "rail")
    p.add_argument("--limits", help="rail limits by name or .toml path (see `curvetui tables`)")
    add_units_option(p)
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from curvetui.bend.service import evaluate_bend
    from curvetui.core.units import unit_system
    from curvetui.storage.tables import rail_limits

    units = unit_system(args.units)
    limits = rail_limits(args.limits, units.name)
    return geo.run_check(
        args,
        "rail",
        lambda raw: evaluate_bend("rail", raw, units, None, limits),
        lambda r: print_rail(r, units),
    )


def print_rail(record: dict, units: UnitSystem) -> None:
    from rich.table import Table

    from curvetui.bend.display import shown as display
    from curvetui.results import RAIL_FIELDS, unit_label

    out = console()
    low = f", slow train {record['low_speed']:g}" if record.get("low_speed") else ""
    grid = Table(
        title=f"Rail curve: {record['speed']:g} {units.speed_label}{low}, R {record['radius']:g} "
        f"{units.length_label}, cant {record['cant']:g} {units.cant_label}",
        caption=f"limits: {markup(record['limits'])}"
        + (f", {markup(record['traffic'])} traffic" if record.get("traffic") else ""),
    )
    grid.add_column("Quantity")
    grid.add_column("Value", justify="right")
    grid.add_column("Unit")
    for key, (label, kind) in RAIL_FIELDS.items():
        value = record.get(key)
        shown = display(key, value, units.name)
        grid.add_row(label, shown, unit_label(kind, units))
    out.print(grid)
    from curvetui.cli.road_cmd import print_messages, print_parts

    print_parts(out, record, units)
    colour = "red" if record["status"] == "fail" else "green"
    out.print(f"Status: [bold {colour}]{record['status'].upper()}[/]")
    print_messages(out, record)
    print_caution(out)
