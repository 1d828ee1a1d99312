"""``curvetui check road``: one road bend against a design table."""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_caution
from curvetui.screen_text import clean, markup

if TYPE_CHECKING:
    from curvetui.core.units import UnitSystem

# The engine, the tables and Rich are imported in the functions that use them, so that
# building the command line's parser (every sub-command's options) stays light.


def add_parser(check_sub) -> None:
    p = check_sub.add_parser("road", help="check one road bend")
    geo.add_field_options(p, "road")
    add_units_option(p)
    p.add_argument(
        "--table", help="road design table by name or .toml path (see `curvetui tables`)"
    )
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from curvetui.bend.service import evaluate_bend
    from curvetui.core.units import unit_system
    from curvetui.storage.tables import road_table

    units = unit_system(args.units)
    table = road_table(args.table, units.name)
    return geo.run_check(
        args,
        "road",
        lambda raw: evaluate_bend("road", raw, units, table, None),
        lambda r: print_road(r, units),
    )


def print_road(record: dict, units: UnitSystem) -> None:
    from rich.table import Table

    from curvetui.bend.display import shown as display
    from curvetui.results import ROAD_FIELDS, unit_label

    out = console()
    title = (
        f"Road bend: {record['speed']:g} {units.speed_label}, R {record['radius']:g} "
        f"{units.length_label}, e_max {record['e_max']:g} %"
    )
    grid = Table(title=title, caption=f"table: {markup(record['table'])}")
    grid.add_column("Quantity")
    grid.add_column("Value", justify="right")
    grid.add_column("Unit")
    for key, (label, kind) in ROAD_FIELDS.items():
        value = record[key]
        shown = display(key, value, units.name, record.get("superelevation_step", 0.1))
        grid.add_row(label, shown, unit_label(kind, units))
    grid.add_row("Cross-section", record["cross_section"], "")
    out.print(grid)
    print_parts(out, record, units)
    if "crash" not in record:
        out.print("Curve crash factors: none (they need the curve length: give a deflection)")
    colour = "red" if record["status"] == "fail" else "green"
    out.print(f"Status: [bold {colour}]{record['status'].upper()}[/]")
    print_messages(out, record)
    print_caution(out)


PART_TITLES = {
    "geometry": "Curve geometry",
    "transition": "Transition and runoff",
    "sight": "Sight distance round the bend",
    "crash": "Curve crash factors (rural two-lane roads; HSM 1st ed. 2010)",
    "advisory": "Existing curve: advisory speed and inferred design speed",
    "signs": "Warning signs (posted speed given)",
}


def print_parts(out, record: dict, units: UnitSystem) -> None:
    """Print the geometry, transition and sight objects of a record as small tables."""
    from rich.table import Table

    from curvetui.bend.display import DOWN, shown
    from curvetui.stations import format_station

    for part, title in PART_TITLES.items():
        obj = record.get(part)
        if not obj:
            continue
        grid = Table(title=title, show_header=False)
        grid.add_column("Quantity")
        grid.add_column("Value", justify="right")
        for key, value in obj.items():
            if value is None:
                continue
            if key in ("pi", "pc", "pt", "ts", "sc", "cs", "st"):
                value = format_station(value, units.name)
            elif isinstance(value, float) and f"{part}.{key}" in DOWN:
                value = shown(f"{part}.{key}", value, units.name)  # whole speeds, safe side
            elif isinstance(value, float):
                value = f"{value:,.3f}"
            else:  # words, some from a user's table file (a sign table's name): as text
                value = markup(str(value))
            grid.add_row(key.replace("_", " "), str(value))
        out.print(grid)


def print_messages(out, record: dict) -> None:
    from curvetui.bend.messages import message_line

    for m in record["messages"]:
        out.print(f"  - {clean(message_line(m))}", markup=False)
