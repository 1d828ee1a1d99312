"""``curvetui design road|rail``: propose a bend's radius, superelevation or cant and
transition (curvetui.bend.propose), then show the proposed bend checked through the one
path, with its verdict, messages and the caution."""

from __future__ import annotations

import argparse

from curvetui.bend.fields import input_keys
from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_json
from curvetui.screen_text import clean, markup

# The engine, the tables and Rich are imported in the functions that use them (see road_cmd).


def add_parser(sub) -> None:
    design = sub.add_parser(
        "design",
        help="propose a radius, superelevation or cant and transition for one bend, or "
        "every bend of a project (--project)",
    )
    from curvetui.cli import (
        _Parser,  # the one-line errors of every sub-command
        design_project_cmd,
    )

    design_project_cmd.add_options(design)
    kinds = design.add_subparsers(dest="kind", parser_class=_Parser)
    road = kinds.add_parser(
        "road", help="propose a road bend (radius, superelevation, spiral) from its speed"
    )
    # the check's options, from the field list; none required here: the proposal sets the
    # radius and superelevation, and a missing speed is refused with its range by the parse
    geo.add_field_options(road, "road", input_keys("road"))
    add_units_option(road)
    road.add_argument(
        "--table", help="road design table by name or .toml path (see `curvetui tables`)"
    )
    road.add_argument(
        "--json", action="store_true", default=argparse.SUPPRESS, help="print one JSON object"
    )
    road.set_defaults(run=run)
    rail = kinds.add_parser(
        "rail", help="propose a rail curve's cant and transition (or the least radius)"
    )
    geo.add_field_options(rail, "rail", input_keys("rail"))
    rail.add_argument("--limits", help="rail limits by name or .toml path (see `curvetui tables`)")
    add_units_option(rail)
    rail.add_argument(
        "--json", action="store_true", default=argparse.SUPPRESS, help="print one JSON object"
    )
    rail.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    """Propose, print, and exit 0 when the proposed bend passes, 1 when it does not."""
    from curvetui.bend.propose import propose
    from curvetui.core.units import unit_system
    from curvetui.storage.tables import rail_limits, road_table

    units = unit_system(args.units)
    if args.kind == "road":
        table, limits = road_table(args.table, units.name), None
    else:
        table, limits = None, rail_limits(args.limits, units.name)
    p = propose(args.kind, geo.raw_inputs(args, args.kind), units, table, limits)
    if args.json:
        print_json(p.to_json())
    else:
        print_proposal(p, units)
    return 0 if p.status == "pass" else 1


def print_proposal(p, units) -> None:
    """The proposal as a table (proposed beside current), its reasons, then the proposed
    bend's check as `check` prints it."""
    from rich.table import Table

    from curvetui.bend.fields import BY_KEY
    from curvetui.cli.rail_cmd import print_rail
    from curvetui.cli.road_cmd import print_road

    out = console()
    grid = Table(title=f"Proposal for a {p.kind} bend")
    grid.add_column("Input")
    grid.add_column("Proposed", justify="right")
    grid.add_column("Current", justify="right")
    grid.add_column("Unit")
    for key, value in p.proposed.items():
        f = BY_KEY[key]
        current = p.current.get(key)
        grid.add_row(
            f.label,
            "blank" if value is None else f"{value:g}",
            "blank" if current is None else markup(clean(str(current), one_line=True)),
            f.unit_label(units),
        )
    out.print(grid)
    out.print("[b]Why[/]")
    for line in p.reasons:
        out.print(f"  - {clean(line)}", markup=False)
    out.print("[b]The proposed bend, checked[/]")
    if p.kind == "road":
        print_road(p.record, units)
    else:
        print_rail(p.record, units)  # its caution line too
