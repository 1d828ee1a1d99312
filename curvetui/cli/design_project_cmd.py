"""``curvetui design --project FILE [--bend ID ...] [--apply]``: the proposal for every
bend of a project (or those named), proposed beside current, each proposed bend's check,
and the alignment's verdicts as they would be with the proposals applied. Only with
``--apply`` is the file written (an atomic save keeping FILE.bak); bends on the alignment
are proposed for the deflection the alignment gives them
(curvetui.storage.project.proposing)."""

from __future__ import annotations

import copy

from curvetui.inputs import InputError
from curvetui.screen_text import clean, markup

# the inputs shown, in order (a rail curve's cant in the superelevation's column)
SHOWN = ("radius", "superelevation", "cant", "spiral_in", "spiral_out")
SHORT = {
    "radius": "R",
    "superelevation": "e",
    "cant": "cant",
    "spiral_in": "Ls in",
    "spiral_out": "Ls out",
}  # column heads (the field list's labels are long)


def add_options(design) -> None:
    design.add_argument(
        "--project",
        metavar="FILE.json",
        help="propose every bend of this project (road and rail) instead of one bend",
    )
    design.add_argument(
        "--bend",
        action="append",
        metavar="ID",
        help="with --project: only this bend (give it again for more)",
    )
    design.add_argument(
        "--apply",
        action="store_true",
        help="with --project: write the proposals into the file (FILE.bak keeps the old one)",
    )
    design.add_argument("--json", action="store_true", help="with --project: print JSON")
    design.set_defaults(run=run)


def _value(v) -> str:
    if v is None or (isinstance(v, str) and not v.strip()):
        return "blank"
    return f"{v:g}" if isinstance(v, int | float) else markup(clean(str(v), one_line=True))


def run(args) -> int:
    """Propose, show, and with --apply save; exit 1 when a bend has no proposal, a
    proposed bend fails, or the alignment would fail."""
    if not args.project:
        if args.bend or args.apply or args.json:
            raise InputError("--bend, --apply, --json: only with --project FILE.json")
        raise InputError("design: needs `road`, `rail` or --project FILE.json")
    from curvetui.cli.project_cmd import project_alignment
    from curvetui.storage.project.checking import evaluate_project, project_context, stored_form
    from curvetui.storage.project.files import load_project, save_project
    from curvetui.storage.project.proposing import apply_changes, propose_bends

    project, notes = load_project(args.project)
    ctx = project_context(project)
    try:
        items = propose_bends(project, ctx, args.bend)
    except KeyError as exc:
        ids = ", ".join(b.id for b in project.bends) or "none"
        raise InputError(
            f"--bend: {clean(exc.args[0], one_line=True)!r} is not a bend of "
            f"{args.project} (bends: {clean(ids, one_line=True)})"
        ) from None
    # the project as it would be with the proposals: a copy, saved only with --apply
    after = copy.deepcopy(project)
    for item in items:
        if item.changes:
            apply_changes(after.bend(item.bend.id), item.changes)
    outcomes = evaluate_project(after, ctx)
    report = project_alignment(after, outcomes, ctx)
    changed = [i for i in items if i.changes]
    for o in outcomes:  # results a bend stores are kept current (as `check --save` does)
        if o.bend.results is not None and o.record is not None:
            o.bend.results = stored_form(o.record)
    if args.apply and changed:
        save_project(after, args.project)
        notes.append(
            f"{len(changed)} bend(s) changed in {args.project} (previous file kept as "
            f"{args.project}.bak)"
        )
    elif args.apply:
        notes.append(f"{args.project} not written: every bend already has its proposal")
    else:
        notes.append(f"{args.project} not written (--apply writes the proposals into it)")
    bad = any(i.proposal is None or i.proposal.status != "pass" for i in items)
    bad = bad or (report is not None and report.status in ("fail", "error"))
    if args.json:
        from curvetui.cli.common import print_json

        print_json(
            {
                "project": args.project,
                "applied": bool(args.apply and changed),
                "bends": [
                    {"id": i.bend.id, "kind": i.bend.kind, "error": i.error}
                    | ({"proposal": i.proposal.to_json()} if i.proposal else {})
                    for i in items
                ],
                "alignment": None if report is None else report.to_json(),
                "notes": notes,
            }
        )
    else:
        print_table(items, ctx.units, report, notes, args.apply)
    return 1 if bad else 0


def print_table(items, units, report, notes, applied: bool) -> None:
    """One row per bend: the deflection proposed for, each input now and proposed, the
    proposed bend's check; then the alignment with the proposals, notes, the caution."""
    from rich import box
    from rich.table import Table

    from curvetui.bend.fields import BY_KEY
    from curvetui.bend.messages import message_line
    from curvetui.cli.common import console, print_caution
    from curvetui.cli.project_cmd import print_alignment

    out = console()
    shown = [k for k in SHOWN if any(i.proposal and k in i.proposal.proposed for i in items)]
    grid = Table(
        title="Proposals " + ("applied" if applied else "(not applied)"),
        caption="now -> proposed; = where the bend has it already",
        box=box.SIMPLE_HEAD,
        padding=(0, 1, 0, 0),
        pad_edge=False,
        show_edge=False,
    )
    grid.add_column("Bend", no_wrap=True)
    grid.add_column("Kind")
    grid.add_column("Defl deg", justify="right", no_wrap=True)
    for k in shown:
        head = f"{SHORT[k]} {BY_KEY[k].unit_label(units)}".strip()
        grid.add_column(head, justify="right", no_wrap=True)
    grid.add_column("Check")
    lines = []
    for i in items:
        ident = markup(clean(i.bend.id, one_line=True))
        if i.proposal is None:
            grid.add_row(ident, i.bend.kind, "", *([""] * len(shown)), "[bold magenta]NONE[/]")
            lines.append(f"{i.bend.id}: no proposal: {i.error}")
            continue
        p = i.proposal
        defl = p.inputs.get("deflection")
        cells = []
        for k in shown:
            if k not in p.proposed:
                cells.append("")
                continue
            now, new = _value(p.current.get(k)), _value(p.proposed[k])
            cells.append(f"= {new}" if k not in p.changes() else f"{now} -> {new}")
        colour = "green" if p.status == "pass" else "red"
        grid.add_row(
            ident,
            i.bend.kind,
            "" if defl is None else f"{float(defl):.4f}",
            *cells,
            f"[bold {colour}]{p.status.upper()}[/]",
        )
        lines += [
            f"{i.bend.id}: {message_line(m)}"
            for m in p.record.get("messages", [])
            if m.get("severity") in ("fail", "warning", "error")
        ]
    out.print(grid)
    for line in lines + notes:
        out.print(clean(f"  - {line}"), markup=False)
    out.print(
        clean(
            "  The reasons for each value: `curvetui design --project FILE --json`, or F7 in "
            "the app on the bend."
        ),
        markup=False,
    )
    if report is not None:
        out.print("[b]The alignment with these proposals[/]")
        print_alignment(out, report)
    print_caution(out)
