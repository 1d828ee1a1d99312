"""``curvetui setout``: the setting-out table of one bend, printed or written as CSV."""

from __future__ import annotations

import argparse
import csv
import math
import sys
from typing import TYPE_CHECKING

from curvetui import CAUTION
from curvetui.cli import geometry_opts as geo
from curvetui.cli.common import add_units_option, console, print_caution
from curvetui.inputs import InputError, parse_number

if TYPE_CHECKING:
    from curvetui.core.units import UnitSystem

# The engine, file saving and Rich are imported in the functions that use them (see road_cmd).


def add_parser(sub) -> None:
    p = sub.add_parser("setout", help="setting-out table of one bend (print or CSV)")
    p.add_argument("--radius", required=True, help="radius (m or ft)")
    p.add_argument("--pi-easting", required=True, help="easting of the PI (m or ft)")
    p.add_argument("--pi-northing", required=True, help="northing of the PI (m or ft)")
    p.add_argument(
        "--bearing",
        required=True,
        help="whole-circle bearing of the back tangent towards the PI, degrees",
    )
    p.add_argument(
        "--turn",
        choices=("right", "left"),
        default="right",
        help="direction of the bend in the direction of travel (default right)",
    )
    p.add_argument("--interval", default=None, help="station interval (default 20 m or 50 ft)")
    p.add_argument("--versine-chord", help="also give track versines on this chord (m or ft)")
    p.add_argument("--csv", metavar="FILE", help="write the table as CSV to FILE ('-' stdout)")
    add_units_option(p)
    geo.add_field_options(p, "road", ("deflection", "pi_station", "spiral_in", "spiral_out"))
    p.set_defaults(run=run)


def run(args: argparse.Namespace) -> int:
    from curvetui.bend.fields import cli_name
    from curvetui.bend.service import GEOMETRY_KEYS, geometry_inputs
    from curvetui.core.circular import circular_curve
    from curvetui.core.setout import setout_points, versines_along
    from curvetui.core.spiral import GeometryError, spiral_curve
    from curvetui.core.units import unit_system

    units = unit_system(args.units)
    g = geometry_inputs(geo.raw_inputs(args, GEOMETRY_KEYS), units, cli_name)
    if g is None:  # not given, or given blank
        raise InputError("--deflection: needed for setting out (degrees, 0 to 179)")
    radius = units.length_to_si(parse_number("--radius", args.radius, 1, 1e5, units.length_label))
    big = 1e8
    e = units.length_to_si(parse_number("--pi-easting", args.pi_easting, -big, big))
    n = units.length_to_si(parse_number("--pi-northing", args.pi_northing, -big, big))
    bearing = math.radians(parse_number("--bearing", args.bearing, 0, 360, "degrees"))
    default_step = "20" if units.name == "metric" else "50"
    step = units.length_to_si(
        parse_number(
            "--interval",
            args.interval or default_step,
            0.01,
            10000,
            units.length_label,
            lo_open=False,
        )
    )
    if g["ls_in"] == 0 and g["ls_out"] == 0:
        curve = circular_curve(radius, g["deflection"], g["pi_station"])
    else:
        curve = spiral_curve(radius, g["deflection"], g["ls_in"], g["ls_out"], g["pi_station"])
    direction = 1 if args.turn == "right" else -1
    try:
        table = setout_points(curve, e, n, bearing, step, direction)
        vers = None
        if args.versine_chord is not None:
            chord = units.length_to_si(
                parse_number("--versine-chord", args.versine_chord, 0.1, 1000, units.length_label)
            )
            vers = versines_along(curve, chord, step)
    except GeometryError as exc:
        raise InputError(f"--spiral: {exc}" if "spiral" in str(exc) else str(exc)) from None
    rows = setout_rows(table, vers, units)
    if args.csv:
        write_csv(rows, args.csv)
    else:
        print_rows(rows, units, vers is not None)
    return 0


def setout_rows(table, vers, units: UnitSystem) -> list[dict]:
    """Rows in the user's units; the versine joined on station where asked for."""
    vmap = {}
    if vers is not None:
        vmap = {
            round(float(s), 6): float(v) for s, v in zip(vers.station, vers.versine, strict=True)
        }
    rows = []
    for i in range(len(table.station)):
        st = float(table.station[i])
        row = {
            "station": round(units.length_from_si(st), 4),
            "point": str(table.point[i]),
            "element": str(table.element[i]),
            "chord": round(units.length_from_si(float(table.chord[i])), 4),
            "deflection_deg": round(math.degrees(float(table.deflection[i])), 7),
            "easting": round(units.length_from_si(float(table.easting[i])), 4),
            "northing": round(units.length_from_si(float(table.northing[i])), 4),
        }
        if vers is not None:
            v = vmap.get(round(st, 6))
            row["versine"] = None if v is None else round(v / units.cant, 3)
        rows.append(row)
    return rows


def dms(deg: float) -> str:
    """Degrees as d°mm'ss.s" (sign kept), the way field books record deflections."""
    sign = "-" if deg < 0 else ""
    a = abs(deg)
    d = int(a)
    m = int((a - d) * 60)
    s = (a - d - m / 60) * 3600
    if s >= 59.95:
        s, m = 0.0, m + 1
    if m == 60:
        m, d = 0, d + 1
    return f"{sign}{d}\u00b0{m:02d}'{s:04.1f}\""


def write_csv(rows: list[dict], target: str) -> None:
    fields = list(rows[0].keys())
    if target == "-":
        w = csv.DictWriter(sys.stdout, fieldnames=fields, lineterminator="\n")
        w.writeheader()
        w.writerows(rows)
        return
    import io

    from curvetui.storage.files import atomic_write_text

    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=fields, lineterminator="\n")
    w.writeheader()
    w.writerows(rows)
    buf.write(f"# {CAUTION}\n")
    atomic_write_text(target, buf.getvalue())


ELEMENT_SHORT = {"tangent point": "tp", "spiral in": "sp-in", "arc": "arc", "spiral out": "sp-out"}


def print_rows(rows: list[dict], units: UnitSystem, with_versine: bool) -> None:
    from rich import box
    from rich.table import Table

    from curvetui.stations import format_station

    out = console()
    ln = units.length_label
    grid = Table(
        title="Setting-out from the TS / PC (deflection from the back tangent)",
        caption="tp = tangent point, sp-in / sp-out = spirals; CSV output has full names",
        box=box.SIMPLE_HEAD,
        pad_edge=False,
        show_edge=False,
        padding=(0, 1, 0, 0),
    )
    heads = ["Station", "Pt", "Elem", f"Chord {ln}", "Deflection", f"E {ln}", f"N {ln}"]
    if with_versine:
        heads.append(f"V {units.cant_label}")
    for col in heads:
        grid.add_column(col, justify="left" if col in ("Pt", "Elem") else "right", no_wrap=True)
    for r in rows:
        cells = [
            format_station(r["station"], units.name),
            r["point"],
            ELEMENT_SHORT.get(r["element"], r["element"]),
            f"{r['chord']:.3f}",
            dms(r["deflection_deg"]),
            f"{r['easting']:.3f}",
            f"{r['northing']:.3f}",
        ]
        if with_versine:
            cells.append("-" if r["versine"] is None else f"{r['versine']:.1f}")
        grid.add_row(*cells)
    out.print(grid)
    print_caution(out)
