"""``curvetui check road``: one road bend against a design table."""

from __future__ import annotations

import argparse

from rich.table import Table

from curvetui import CAUTION
from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_caution, print_json
from curvetui.core.road import RoadCheck, check_road
from curvetui.core.road_messages import road_messages
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem, unit_system
from curvetui.inputs import parse_number
from curvetui.results import ROAD_FIELDS, road_record, unit_label
from curvetui.tables import road_table

# Allowed input ranges in SI, shown to the user in their units.
ROAD_SPEED_RANGE_KMH = (1.0, 200.0)
RADIUS_RANGE_M = (1.0, 100_000.0)
SUPERELEVATION_RANGE_PCT = (-10.0, 20.0)
FRICTION_RANGE = (0.01, 1.0)


def add_parser(check_sub) -> None:
    p = check_sub.add_parser("road", help="check one road bend")
    p.add_argument("--speed", required=True, help="design speed (km/h or mph)")
    p.add_argument("--radius", required=True, help="radius (m or ft)")
    p.add_argument("--superelevation", help="built superelevation, percent (default: design value)")
    p.add_argument("--emax", help="maximum superelevation, percent (default: the table's)")
    p.add_argument("--friction", help="side friction factor to use instead of the table's f_max")
    add_units_option(p)
    p.add_argument(
        "--table", help="road design table by name or .toml path (see `curvetui tables`)"
    )
    p.add_argument("--json", action="store_true", help="print one JSON object")
    geo.add_geometry_options(p)
    geo.add_sight_lane_option(p)
    p.set_defaults(run=run)


def speed_range(units: UnitSystem) -> tuple[float, float]:
    lo, hi = ROAD_SPEED_RANGE_KMH
    if units.name == "us":
        return 1.0, 125.0
    return lo, hi


def road_inputs(args: argparse.Namespace, table: RoadTable, units: UnitSystem) -> dict:
    """Parse and range-check the road options; values in SI (m/s, m, fractions)."""
    lo, hi = speed_range(units)
    speed = parse_number("--speed", args.speed, lo, hi, units.speed_label)
    r_lo, r_hi = (units.length_from_si(x) for x in RADIUS_RANGE_M)
    radius = parse_number("--radius", args.radius, round(r_lo, 1), round(r_hi), units.length_label)
    inputs = {"speed": units.speed_to_si(speed), "radius": units.length_to_si(radius)}
    if args.emax is not None:
        inputs["e_max"] = (
            parse_number(
                "--emax",
                args.emax,
                100 * table.emax_min,
                100 * table.emax_max,
                f"% (table {table.name})",
            )
            / 100.0
        )
    if args.superelevation is not None:
        inputs["superelevation"] = (
            parse_number("--superelevation", args.superelevation, *SUPERELEVATION_RANGE_PCT, "%")
            / 100.0
        )
    if args.friction is not None:
        inputs["friction"] = parse_number("--friction", args.friction, *FRICTION_RANGE)
    return inputs


def road_json(check: RoadCheck, table: RoadTable, units: UnitSystem) -> dict:
    record = road_record(check, (), units)
    record["messages"] = road_messages(check, (), table, units)
    record.update(
        kind="road",
        units=units.name,
        table=table.name,
        table_source=table.source,
        speed=float(units.speed_from_si(check.speed)),
        radius=float(units.length_from_si(check.radius)),
        e_max=round(100 * float(check.e_max), 6),
        caution=CAUTION,
    )
    return record


def add_bend_objects(
    record: dict, args, check: RoadCheck, table: RoadTable, units: UnitSystem
) -> None:
    """Add `transition`, and with the options `geometry` and `sight`, to a road record.

    A failed transition or sight check fails the bend: it is never left as a side note.
    """
    v, r = float(check.speed), float(check.radius)
    width = geo.lane_width(args, units)
    record["transition"] = geo.road_transition_json(
        table, v, r, float(check.superelevation), width, units
    )
    geometry = geo.geometry_inputs(args, units)
    curve_length = None
    if geometry is not None:
        record["geometry"] = geo.geometry_json(r, geometry, units)
        g = record["geometry"]
        curve_length = units.length_to_si(g.get("length", g.get("total_length")))
        geo.check_spiral_lengths(record["transition"], geometry, units)
    sight = geo.sight_inputs(args, units)
    if sight is not None:
        record["sight"] = geo.sight_json(v, r, sight, curve_length, width, units)
    for part in ("transition", "sight"):
        if part in record and record[part]["status"] == "fail":
            record["status"] = "fail"
            record["messages"] += [
                f"{part}: {m}" for m in record[part]["messages"] if m.startswith("FAIL")
            ]


def run(args: argparse.Namespace) -> int:
    units = unit_system(args.units)
    table = road_table(args.table, units.name)
    inputs = road_inputs(args, table, units)
    check = check_road(table, **inputs)
    record = road_json(check, table, units)
    add_bend_objects(record, args, check, table, units)
    if args.json:
        print_json(record)
    else:
        print_road(record, units)
    return 1 if record["status"] == "fail" else 0


def print_road(record: dict, units: UnitSystem) -> None:
    out = console()
    title = (
        f"Road bend: {record['speed']:g} {units.speed_label}, R {record['radius']:g} "
        f"{units.length_label}, e_max {record['e_max']:g} %"
    )
    grid = Table(title=title, caption=f"table: {record['table']}")
    grid.add_column("Quantity")
    grid.add_column("Value", justify="right")
    grid.add_column("Unit")
    for key, (label, kind) in ROAD_FIELDS.items():
        value = record[key]
        shown = "-" if value is None else f"{value:,.3f}" if abs(value) < 100 else f"{value:,.1f}"
        grid.add_row(label, shown, unit_label(kind, units))
    grid.add_row("Cross-section", record["cross_section"], "")
    out.print(grid)
    print_parts(out, record, units)
    colour = "red" if record["status"] == "fail" else "green"
    out.print(f"Status: [bold {colour}]{record['status'].upper()}[/]")
    for message in record["messages"]:
        out.print(f"  - {message}", markup=False)
    print_caution(out)


PART_TITLES = {
    "geometry": "Curve geometry",
    "transition": "Transition and runoff",
    "sight": "Sight distance round the bend",
}


def print_parts(out, record: dict, units: UnitSystem) -> None:
    """Print the geometry, transition and sight objects of a record as small tables."""
    from curvetui.stations import format_station

    for part, title in PART_TITLES.items():
        obj = record.get(part)
        if not obj:
            continue
        grid = Table(title=title, show_header=False)
        grid.add_column("Quantity")
        grid.add_column("Value", justify="right")
        for key, value in obj.items():
            if key == "messages" or value is None:
                continue
            if key in ("pi", "pc", "pt", "ts", "sc", "cs", "st"):
                value = format_station(value, units.name)
            elif isinstance(value, float):
                value = f"{value:,.3f}"
            grid.add_row(key.replace("_", " "), str(value))
        out.print(grid)
        for m in obj.get("messages", []):
            out.print(f"  - {m}", markup=False)
