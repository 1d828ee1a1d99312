"""``curvetui check rail``: one rail curve against cant limits."""

from __future__ import annotations

import argparse

from rich.table import Table

from curvetui import CAUTION
from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_caution, print_json
from curvetui.core.rail import RailCheck, RailLimits, check_rail, rail_centres_for_gauge
from curvetui.core.rail_messages import rail_messages
from curvetui.core.units import FOOT, UnitSystem, unit_system
from curvetui.inputs import parse_number
from curvetui.results import rail_record
from curvetui.tables import rail_limits

RAIL_SPEED_RANGE_KMH = (1.0, 400.0)
RAIL_SPEED_RANGE_MPH = (1.0, 250.0)
RAIL_RADIUS_RANGE_M = (20.0, 100_000.0)


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


def rail_inputs(args: argparse.Namespace, limits: RailLimits, units: UnitSystem) -> dict:
    """Parse and range-check the rail options; values in SI."""
    lo, hi = RAIL_SPEED_RANGE_MPH if units.name == "us" else RAIL_SPEED_RANGE_KMH
    speed = parse_number("--speed", args.speed, lo, hi, units.speed_label)
    r_lo, r_hi = (units.length_from_si(x) for x in RAIL_RADIUS_RANGE_M)
    radius = parse_number("--radius", args.radius, round(r_lo), round(r_hi), units.length_label)
    cant_hi = 300.0 if units.name == "metric" else 12.0
    cant = parse_number("--cant", args.cant, 0.0, cant_hi, units.cant_label)
    inputs = {
        "speed": units.speed_to_si(speed),
        "radius": units.length_to_si(radius),
        "cant": cant * units.cant,
    }
    if args.low_speed is not None:
        inputs["low_speed"] = units.speed_to_si(
            parse_number("--low-speed", args.low_speed, 0.0, speed, units.speed_label)
        )
    if args.gauge is not None:
        gauge = parse_number("--gauge", args.gauge, 600.0, 1700.0, "mm")
        inputs["rail_centres"] = rail_centres_for_gauge(gauge)
    return inputs


def rail_json(check: RailCheck, limits: RailLimits, units: UnitSystem) -> dict:
    record = rail_record(check, (), units)
    record["messages"] = rail_messages(check, (), limits, units)
    record.update(
        kind="rail",
        units=units.name,
        limits=limits.name,
        limits_source=limits.source,
        speed=float(units.speed_from_si(check.speed)),
        radius=float(units.length_from_si(check.radius)),
        cant=round(float(check.cant) / units.cant, 6),
        caution=CAUTION,
    )
    if units.name == "us":
        import math

        r_ft = float(check.radius) / FOOT
        record["degree_of_curve_arc"] = round(5729.5779513 / r_ft, 6)
        record["degree_of_curve_chord"] = round(2 * math.degrees(math.asin(50.0 / r_ft)), 6)
    return record


def add_bend_objects(
    record: dict, args, check: RailCheck, limits: RailLimits, units: UnitSystem
) -> None:
    """Add `transition` and, with --deflection, `geometry` to a rail record; a failed
    transition fails the curve."""
    record["transition"] = geo.rail_transition_json(
        limits, float(check.cant), float(check.cant_deficiency), float(check.speed), units
    )
    geometry = geo.geometry_inputs(args, units)
    if geometry is not None:
        record["geometry"] = geo.geometry_json(float(check.radius), geometry, units)
        t = record["transition"]
        for name, ls in (("spiral in", geometry["ls_in"]), ("spiral out", geometry["ls_out"])):
            need = t["length"]
            given = units.length_from_si(ls)
            if ls > 0 and need is not None and given < need - 1e-9:
                t["status"] = "fail"
                t["messages"].append(
                    f"FAIL {name} {given:g} {units.length_label} is shorter "
                    f"than the {need:.1f} {units.length_label} the "
                    f"{t['governing']} needs"
                )
    if record["transition"]["status"] == "fail":
        record["status"] = "fail"
        record["messages"] += [
            f"transition: {m}" for m in record["transition"]["messages"] if m.startswith("FAIL")
        ]


def run(args: argparse.Namespace) -> int:
    units = unit_system(args.units)
    limits = rail_limits(args.limits, units.name)
    check = check_rail(limits, **rail_inputs(args, limits, units))
    record = rail_json(check, limits, units)
    add_bend_objects(record, args, check, limits, units)
    if args.json:
        print_json(record)
    else:
        print_rail(record, units)
    return 1 if record["status"] == "fail" else 0


def print_rail(record: dict, units: UnitSystem) -> None:
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
