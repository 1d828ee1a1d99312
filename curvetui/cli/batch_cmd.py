"""``curvetui batch``: check every bend of a CSV file and write the results beside them."""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path
from typing import TYPE_CHECKING

from curvetui import CAUTION
from curvetui.batch import columns as cols
from curvetui.cli.common import add_units_option
from curvetui.inputs import InputError
from curvetui.screen_text import clean, markup

if TYPE_CHECKING:
    from rich.console import Console

    from curvetui.batch.summary import Summary

# pyarrow (batch.stream), the tables and Rich are imported in the functions that use them:
# the parser of every sub-command is built on each start, and only `batch` needs them.


def add_parser(sub) -> None:
    p = sub.add_parser(
        "batch",
        help="check every bend of a CSV file",
        description="Check every road bend and rail curve of a CSV or Parquet (.parquet) "
        "file. Columns (any case, any order): " + ", ".join(cols.INPUTS) + "; other columns "
        "are carried through. Writes every input column, then the result columns chosen by "
        "--columns, row, status and the failure and warning lines; a text cell that a "
        "spreadsheet would run as a formula (not a number, starting with =, +, -, @, tab or "
        "CR) is written to CSV with a leading apostrophe unless --keep-formulas. Units, road "
        "table and rail limits are named in the summary (and in a Parquet file's metadata). "
        "Exit code 0 when every bend passes, 1 when any fails or has an error, 2 when the "
        "file cannot be used.",
    )
    p.add_argument(
        "input",
        help="CSV or .parquet file to check, or - for standard input (CSV). With the default "
        "columns, standard input is first copied to a temporary file so that its kinds of "
        "bend are known before the header is written (the same columns as for the file); "
        "--columns all or a list streams it without the copy",
    )
    p.add_argument(
        "-o",
        "--output",
        help="where to write the results, or - for standard output; a name ending .parquet "
        "writes Parquet (numbers as numbers) "
        "(default: INPUT.checked.csv beside the input; standard output for standard input)",
    )
    p.add_argument(
        "--columns",
        default=cols.DEFAULT,
        metavar="all|default|LIST",
        help="result columns: default (the headline results of the kinds present: road "
        "results only with road rows, rail only with rail rows, geometry only with a "
        "deflection column, signs only with a posted_speed column; then row, status and "
        "findings: the FAIL, WARNING and ERROR lines), all (every result, with units, table, "
        "limits and messages with the notes on every row), or a comma-separated list of "
        "result names (a group as geometry.*); row and status are always written, and "
        "findings unless messages is listed",
    )
    add_units_option(p)
    p.add_argument("--table", help="road design table by name or .toml path")
    p.add_argument("--limits", help="rail limits by name or .toml path")
    p.add_argument(
        "--keep-formulas",
        action="store_true",
        help="write text cells that start with =, +, -, @, tab or CR as they are (by default "
        "they get a leading apostrophe, so a spreadsheet shows them instead of running them)",
    )
    p.set_defaults(run=run)


def _output_path(args) -> str:
    if args.input != "-" and os.path.isdir(args.input):
        raise InputError(f"{args.input}: is a folder; name a CSV file to check (or - for stdin)")
    if args.output:
        return args.output
    if args.input == "-":
        return "-"
    path = Path(args.input)
    if not path.name:
        raise InputError(f"{args.input!r}: not a file name; name a CSV file to check")
    ending = ".parquet" if path.suffix.lower() == ".parquet" else ".csv"
    return str(path.with_name(path.stem + ".checked" + ending))


def run(args: argparse.Namespace) -> int:
    from rich.console import Console
    from rich.progress import BarColumn, Progress, TextColumn, TimeElapsedColumn

    from curvetui.batch.header import BatchFileError
    from curvetui.batch.parquet_io import is_parquet
    from curvetui.batch.stream import run_batch
    from curvetui.core.units import unit_system
    from curvetui.storage.files import atomic_binary
    from curvetui.storage.tables import rail_limits, road_table

    units = unit_system(args.units)
    table = road_table(args.table, units.name)
    limits = rail_limits(args.limits, units.name)
    from curvetui.storage.sign_tables import sign_table

    sign_table()  # a bad CURVETUI_SIGNS is a usage error here, not an error on every row
    err = Console(stderr=True, highlight=False)
    out_path = _output_path(args)
    try:
        choice = cols.parse_columns(args.columns)
    except cols.ColumnsError as exc:
        err.print(clean(f"curvetui: error: {exc}"), markup=False)
        return 2
    parquet_out = is_parquet(out_path)
    if parquet_out and out_path == "-":  # pragma: no cover - "-" never ends .parquet
        return 2
    if args.input != "-" and out_path != "-":
        if os.path.exists(out_path) and os.path.samefile(args.input, out_path):
            err.print(
                clean(f"curvetui: error: {out_path}: the output would overwrite the input"),
                markup=False,
            )
            return 2
    source = sys.stdin.buffer if args.input == "-" else args.input
    progress = Progress(
        TextColumn("checking"),
        BarColumn(),
        TextColumn("{task.percentage:>3.0f} %  {task.fields[rows]:,} rows"),
        TimeElapsedColumn(),
        console=err,
        transient=True,
        disable=not err.is_terminal,
    )
    task = progress.add_task("batch", total=None, rows=0)
    keep = args.keep_formulas
    how = dict(keep_formulas=keep, columns=choice, parquet_out=parquet_out)

    def tick(done: int, total: int | None, rows: int) -> None:
        progress.update(task, completed=done, total=total, rows=rows)

    try:
        with progress:
            if out_path == "-":
                summary = run_batch(source, sys.stdout.buffer, units, table, limits, tick, **how)
                if summary.output_closed:
                    _quiet_stdout()  # nothing more can reach the reader; no error at exit
                else:
                    sys.stdout.buffer.flush()
            else:
                with atomic_binary(out_path) as sink:
                    summary = run_batch(source, sink, units, table, limits, tick, **how)
    except BatchFileError as exc:
        name = "standard input" if args.input == "-" else args.input
        err.print(clean(f"curvetui: error: {name}: {exc}"), markup=False)
        return 2
    if summary.output_closed:
        err.print(
            f"[yellow]The output's reader closed it early (after about "
            f"{summary.written_rows:,} rows); every one of the {summary.rows:,} rows was "
            "still checked, and the counts and exit code are theirs.[/]"
        )
    print_summary(err, summary, out_path, table, limits)
    return summary.exit_code


def _quiet_stdout() -> None:
    """Point standard output at the null device, so Python's final flush to the closed
    pipe raises nothing (the recipe of the Python docs, "Note on SIGPIPE")."""
    devnull = os.open(os.devnull, os.O_WRONLY)
    os.dup2(devnull, sys.stdout.fileno())
    os.close(devnull)


REASONS_SHOWN = 20  # rules listed; the rest counted in the title
RESULTS_LISTED = 30  # result column names listed in the summary; the rest counted


def print_summary(err: Console, s: Summary, out_path: str, table, limits) -> None:
    """Counts, the worst bends, the first errors, what was used, and the caution."""
    from rich.table import Table

    grid = Table(title="Batch check", show_header=False)
    grid.add_column("what")
    grid.add_column("count", justify="right")
    grid.add_row("bends", f"{s.rows:,}")
    grid.add_row("[green]pass[/]", f"{s.passed:,}")
    grid.add_row("[bold red]fail[/]", f"{s.failed:,}")
    grid.add_row("[bold magenta]error[/]", f"{s.errors:,}")
    if s.blank:
        grid.add_row("blank rows skipped", f"{s.blank:,}")
    err.print(grid)
    if s.rows == 0:
        err.print("[yellow]The file has a header but no bends.[/]")
    if s.reasons:
        # grouped by the first failed rule (numbers as #): ten near-identical rows told
        # a reader less than one line per rule with its count and its worst bend
        shown = s.reasons[:REASONS_SHOWN]
        more = len(s.reasons) - len(shown)
        title = f"Failing bends by reason ({s.failed:,} bends, {len(s.reasons):,} reasons)"
        worst = Table(title=title + (f"; first {len(shown)} shown" if more > 0 else ""))
        for name in ("bends", "first failed rule", "worst: row", "id", "demand / limit"):
            worst.add_column(name, overflow="fold")
        for r in shown:
            w = r.worst
            ratio = f"{100 * w.utilisation:.0f} %" if w.utilisation > 0 else "-"
            worst.add_row(f"{r.count:,}", markup(r.rule), str(w.row), markup(w.id, True), ratio)
        err.print(worst)
    if s.first_errors:
        errors = Table(title=f"Rows with errors (first {len(s.first_errors)} of {s.errors:,})")
        errors.add_column("row")
        errors.add_column("id")
        errors.add_column("message", overflow="fold")
        for w in s.first_errors:
            errors.add_row(str(w.row), markup(w.id, True), markup(w.message))
        err.print(errors)
    err.print(clean(f"units: {s.units}"), markup=False)
    err.print(clean(f"road table: {table.name} ({table.source})"), markup=False)
    err.print(clean(f"rail limits: {limits.name} ({limits.source})"), markup=False)
    said = ", ".join(s.results[:RESULTS_LISTED])
    if len(s.results) > RESULTS_LISTED:
        said += f" and {len(s.results) - RESULTS_LISTED} more"
    err.print(clean(f"result columns ({len(s.results)}): {said}"), markup=False)
    if out_path != "-":
        err.print(clean(f"results written to {out_path}"), markup=False)
    err.print(f"[bold yellow]{CAUTION}[/]")
