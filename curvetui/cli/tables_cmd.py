"""``curvetui tables``: list the design tables loaded, with their sources."""

from __future__ import annotations

from rich.table import Table

from curvetui.cli.common import console, print_caution, print_json
from curvetui.tables import road_tables, user_table_dirs


def add_parser(sub) -> None:
    p = sub.add_parser("tables", help="list the design tables loaded, with their sources")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run)


def run(args) -> int:
    tables = road_tables()
    rows = [
        {
            "name": t.name,
            "kind": "road",
            "units": t.units,
            "title": t.title,
            "source": t.source,
            "distribution": t.distribution,
            "speeds": [float(t.speeds[0]), float(t.speeds[-1])],
            "file": t.path,
        }
        for t in tables.values()
    ]
    if args.json:
        print_json(rows)
        return 0
    out = console()
    grid = Table(title="Design tables loaded")
    for col in ("Name", "Kind", "Units", "Speeds", "Distribution", "Source"):
        grid.add_column(col, overflow="fold")
    for r in rows:
        unit = "km/h" if r["units"] == "metric" else "mph"
        grid.add_row(
            r["name"],
            r["kind"],
            r["units"],
            f"{r['speeds'][0]:g}-{r['speeds'][1]:g} {unit}",
            r["distribution"],
            r["source"],
        )
    out.print(grid)
    out.print(
        "User tables are read from: " + ", ".join(str(d) for d in user_table_dirs()), markup=False
    )
    print_caution(out)
    return 0
