"""``curvetui tables``: list the design tables loaded, with their sources."""

from __future__ import annotations

from curvetui.cli.common import console, print_caution, print_json
from curvetui.screen_text import clean, markup


def add_parser(sub) -> None:
    p = sub.add_parser("tables", help="list the design tables loaded, with their sources")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run)


def run(args) -> int:
    from curvetui.storage.tables import (
        rail_limit_sets,
        road_tables,
        skipped_files,
        user_table_dirs,
    )

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
    for lim in rail_limit_sets().values():
        rows.append(
            {
                "name": lim.name,
                "kind": "rail",
                "units": lim.units,
                "title": lim.title,
                "source": lim.source,
                "distribution": "",
                "speeds": [
                    0.0,
                    float(lim.speed_max[-1] / (1 / 3.6 if lim.units == "metric" else 0.44704)),
                ],
                "file": lim.path,
            }
        )
    if args.json:
        print_json(rows)
        return 0
    out = console()
    out.print("[bold]Design tables loaded[/]\n")
    for r in rows:
        unit = "km/h" if r["units"] == "metric" else "mph"
        lo, hi = r["speeds"]
        how = f", {r['distribution']}" if r["distribution"] else ""
        span = f"{lo:g}-{hi:g}" if lo else f"up to {hi:g}"
        out.print(
            f"[bold]{markup(r['name'], True)}[/]  {r['kind']}, {r['units']}, {span} {unit}"
            + markup(how, True)
        )
        out.print(clean(f"  {r['title']}"), markup=False)
        out.print(clean(f"  source: {r['source']}"), markup=False)
        out.print(clean(f"  file: {r['file']}\n"), markup=False)
    skipped = skipped_files()
    if skipped:
        out.print(f"[bold red]Skipped ({len(skipped)}): these user files were not loaded[/]")
        for path, why in skipped.items():
            out.print(clean(f"  {path}: {why}"), markup=False, soft_wrap=True)
        out.print()
    out.print(
        clean("User tables are read from: " + ", ".join(str(d) for d in user_table_dirs())),
        markup=False,
    )
    print_caution(out)
    return 0
