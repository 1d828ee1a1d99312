"""The summary ``curvetui find-curves`` prints to standard error: what was read and
skipped, the curves found by type, those dropped, units, speeds, the plane used, the next
command and the caution. File text is escaped before Rich shows it."""

from __future__ import annotations

import math
import shlex

from curvetui import CAUTION
from curvetui.screen_text import markup

NOTES_SHOWN = 8  # notes listed; the rest counted


def _listed(out, title: str, notes: list[str]) -> None:
    if not notes:
        return
    out.print(f"{title} ({len(notes)}):")
    for note in notes[:NOTES_SHOWN]:
        out.print(f"  - {markup(note, one_line=True)}")
    if len(notes) > NOTES_SHOWN:
        out.print(f"  ... and {len(notes) - NOTES_SHOWN} more")


def next_command(args) -> str:
    """The batch command to run on the register just written (piped for standard output)."""
    if args.output == "-":
        return "... | " + shlex.join(["curvetui", "batch", "-", "--units", args.units])
    return shlex.join(["curvetui", "batch", args.output, "--units", args.units])


def print_summary(args, source, result, settings, units, speeds) -> None:
    from rich.console import Console

    out = Console(stderr=True, highlight=False)
    layer = f", layer {source.layer}" if source.layer else ""
    n_skipped = sum(source.skipped.values())
    out.print(
        f"[bold]Read[/] {markup(args.input, True)}{markup(layer, True)}: "
        f"{len(source.features)} line feature(s), {n_skipped} other feature(s) skipped"
    )
    for reason, n in sorted(source.skipped.items()):
        out.print(f"  skipped {n}: {markup(reason, True)}")
    _listed(out, "Reading notes", source.notes)
    _listed(out, "[yellow]Features not projected[/]", result.not_projected)
    planes = ", ".join(f"{p} ({n})" for p, n in sorted(result.planes.items()))
    if planes:
        ppm = result.scale_error * 1e6
        shown = "unknown" if math.isnan(ppm) else f"{ppm:+.1f} ppm"
        out.print(
            f"Plane: {markup(planes, True)}; largest scale error (k - 1) {shown}: stations "
            "and radii are plane distances"
        )
    total = len(result.rows)
    by_type = ", ".join(f"{n} {t}" for t, n in sorted(result.types.items())) or "none"
    out.print(
        f"[bold]Curves found: {total}[/] in {result.searched} feature(s) ({by_type})"
        + (
            "; " + ", ".join(f"{n} {r}" for r, n in sorted(result.relations.items()))
            if result.relations
            else ""
        )
    )
    min_def = math.degrees(settings.min_deflection)
    out.print(f"Dropped below the minimum deflection ({min_def:g} degrees): {result.dropped}")
    _listed(out, "Finder notes", result.feature_notes)
    _listed(out, "[bold red]Finder failures (defects)[/]", result.finder_failures)
    if result.deflection_over:
        out.print(
            f"[yellow]{result.deflection_over} curve(s) turn by more than 179 degrees: batch "
            "reports those rows as errors (its deflection range)[/]"
        )
    out.print(
        f"Units: lengths and stations in {units.length_label}, deflections in degrees, "
        f"speeds in {units.speed_label} ({args.units})"
    )
    _speed_lines(out, args, speeds, result, units)
    if args.kind == "rail" and "cant" not in [k.lower() for k in (args.keep or "").split(",")]:
        out.print(
            "[yellow]Rail: batch checks a rail curve with its cant: keep a property named "
            "cant (--keep cant) or add a cant column, else batch reports every row[/]"
        )
    where = "standard output" if args.output == "-" else args.output
    out.print(f"Register written: {markup(where, True)} ({total} row(s))")
    _listed(out, "[yellow]Register notes[/]", result.register_notes)
    out.print(f"Next: {markup(next_command(args), True)}")
    out.print(f"[bold yellow]{CAUTION}[/]")


def _speed_lines(out, args, speeds, result, units) -> None:
    if speeds.posted_as_speed:
        out.print(
            f"[yellow]Speed: no design speed given, so the speed column is the posted speed "
            f"({markup(args.posted_field, True)}): batch checks each curve at its posted "
            "speed[/]"
        )
    elif not speeds.any:
        out.print(
            "[yellow]Speed: none given (--speed, --speed-field or --posted-field): the speed "
            "column is blank and batch reports every row as missing its speed; fill it or "
            "run again with a speed[/]"
        )
    elif speeds.speed_field:
        fallback = f", else {speeds.speed:g}" if speeds.speed is not None else ""
        out.print(f"Speed: from {markup(speeds.speed_field, True)}{fallback} ({units.speed_label})")
    else:
        out.print(f"Speed: {speeds.speed:g} {units.speed_label} for every curve")
    blank = sum(1 for r in result.rows if r.get("speed") is None)
    if speeds.any and blank:
        out.print(f"[yellow]{blank} row(s) have no speed: batch reports them as errors[/]")
    _listed(out, "[yellow]Speed problems[/]", result.speed_problems)
