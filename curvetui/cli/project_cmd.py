"""``curvetui FILE`` and ``curvetui check --project FILE``: every bend of a project."""

from __future__ import annotations

import argparse

from rich import box
from rich.table import Table

from curvetui.cli.common import console, print_caution
from curvetui.core.road import check_road
from curvetui.core.road_messages import road_messages
from curvetui.core.units import unit_system
from curvetui.project_file import load_project
from curvetui.results import road_record
from curvetui.stations import format_station
from curvetui.tables import road_table

COMMANDS = {"check", "tables", "open", "setout", "-h", "--help", "--version"}


def add_check_project(check: argparse.ArgumentParser) -> None:
    check.add_argument("--project", help="check every bend of this project file")
    check.set_defaults(run=_run_check_project)


def add_open_parser(sub) -> None:
    p = sub.add_parser("open", help="open a project file (prints its check results)")
    p.add_argument("file")
    p.set_defaults(run=_run_open)


def _run_open(args) -> int:
    """Opening shows the checks; a failing bend is news, not an error of the command."""
    check_project(args.file)
    return 0


def _run_check_project(args) -> int:
    if not args.project:
        raise SystemExit("curvetui: error: check needs `road` or --project FILE")
    return check_project(args.project)


def check_project(path: str) -> int:
    """Print a results table for every bend; 1 when any bend fails."""
    project = load_project(path)
    units = unit_system(project["project"]["units"])
    table = road_table(project["project"].get("road_table"), units.name)
    out = console()
    meta = project["project"]
    grid = Table(
        title=f"{meta['name']} - job {meta.get('job_number', '')}",
        caption=f"table: {table.name}; speeds {units.speed_label}, lengths {units.length_label}",
        box=box.SIMPLE_HEAD,
        padding=(0, 1, 0, 0),
        pad_edge=False,
        show_edge=False,
    )
    headers = ("Bend", "Station", "V", "R", "emax%", "e%", "f", "fmax", "Rmin", "Vsafe", "Status")
    for col in headers:
        left = col in ("Bend", "Status")
        grid.add_column(col, justify="left" if left else "right", no_wrap=True)
    any_fail = False
    notes = []
    for bend in project["bends"]:
        if bend.get("kind") != "road":
            continue
        i = bend["inputs"]
        check = check_road(
            table,
            units.speed_to_si(i["speed"]),
            units.length_to_si(i["radius"]),
            e_max=i.get("emax", 100 * table.emax_default) / 100,
            superelevation=i["superelevation"] / 100
            if i.get("superelevation") is not None
            else None,
            friction=i.get("friction"),
        )
        rec = road_record(check, (), units)
        any_fail |= rec["status"] == "fail"
        colour = "red" if rec["status"] == "fail" else "green"
        grid.add_row(
            bend["id"],
            format_station(bend.get("station", 0.0), units.name, 1),
            f"{i['speed']:g}",
            f"{i['radius']:g}",
            f"{float(check.e_max) * 100:g}",
            f"{rec['superelevation']:.1f}",
            f"{rec['side_friction_demand']:.3f}",
            f"{rec['side_friction_max']:.3f}",
            f"{rec['min_radius_rounded']:g}",
            f"{rec['safe_speed']:.1f}",
            f"[{colour}]{rec['status'].upper()}[/]",
        )
        for m in road_messages(check, (), table, units):
            notes.append(f"{bend['id']}: {m}")
    out.print(grid)
    for n in notes:
        out.print(f"  - {n}", markup=False)
    print_caution(out)
    return 1 if any_fail else 0
