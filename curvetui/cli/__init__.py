"""The ``curvetui`` command line: one parser, a sub-command per job."""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

from curvetui import __version__
from curvetui.inputs import InputError
from curvetui.screen_text import clean

# Each sub-command's module imports what its run needs when it runs (the engine, Rich,
# pyarrow, jsonschema, Textual), and main() builds only the sub-command given, so a start
# imports that sub-command's module and not the others.


class _Parser(argparse.ArgumentParser):
    """An argument parser whose errors are one line and exit code 2."""

    def error(self, message: str):  # noqa: D401 - argparse hook
        sys.stderr.write(clean(f"{self.prog}: error: {message}", one_line=True) + "\n")
        raise SystemExit(2)


def build_parser(command: str | None = None) -> argparse.ArgumentParser:
    """The parser of every sub-command; with ``command`` (a sub-command's name) only that
    one's, so that only its module is imported."""
    from curvetui.cli import project_cmd

    def wanted(name: str) -> bool:
        return command is None or command == name

    parser = _Parser(
        prog="curvetui",
        description="Design and check horizontal road bends and railway-track curves. "
        "Local road or rail authority standards govern; a qualified engineer must check "
        "every result.",
        epilog="`curvetui FILE` opens FILE, a project (.json) or a CSV file of bends (.csv, "
        ".tsv), as `curvetui open FILE` does; opening never creates a file: `curvetui new "
        "FILE.json` starts a project. Any other unknown first word is an error.",
    )
    parser.add_argument("--version", action="version", version=f"curvetui {__version__}")
    sub = parser.add_subparsers(dest="command", parser_class=_Parser)
    if wanted("check"):
        from curvetui.cli import rail_cmd, road_cmd

        check = sub.add_parser("check", help="check one bend, or every bend of a project")
        check_sub = check.add_subparsers(dest="kind", parser_class=_Parser)
        road_cmd.add_parser(check_sub)
        rail_cmd.add_parser(check_sub)
        project_cmd.add_check_project(check)
    if wanted("tables"):
        from curvetui.cli import tables_cmd

        tables_cmd.add_parser(sub)
    if wanted("setout"):
        from curvetui.cli import setout_cmd

        setout_cmd.add_parser(sub)
    if wanted("open"):
        project_cmd.add_open_parser(sub)
    if wanted("new"):
        project_cmd.add_new_parser(sub)
    if wanted("sheet"):
        from curvetui.cli import sheet_cmd

        sheet_cmd.add_parser(sub)
    if wanted("batch"):
        from curvetui.cli import batch_cmd

        batch_cmd.add_parser(sub)
    if wanted("crossfall"):
        from curvetui.cli import crossfall_cmd

        crossfall_cmd.add_parser(sub)
    if wanted("design"):
        from curvetui.cli import design_cmd

        design_cmd.add_parser(sub)
    if wanted("landxml"):
        from curvetui.cli import landxml_cmd

        landxml_cmd.add_parser(sub)
    if wanted("realign"):
        from curvetui.cli import realign_cmd

        realign_cmd.add_parser(sub)
    if wanted("find-curves"):
        from curvetui.cli import find_curves_cmd

        find_curves_cmd.add_parser(sub)
    return parser


def _project_error() -> type[Exception]:
    """ProjectError. An except clause's class is looked up only when an exception reaches
    it, so a command that reads no project file never imports the project modules."""
    from curvetui.storage.project.files import ProjectError

    return ProjectError


def _unknown_command(word: str, commands) -> int:
    """An unknown first word: one line naming the closest command, exit code 2."""
    import difflib

    from curvetui.cli.common import printable

    names = sorted(c for c in commands if not c.startswith("-"))
    close = difflib.get_close_matches(word, names, n=1, cutoff=0.6)
    hint = f"; did you mean '{close[0]}'?" if close else ""
    sys.stderr.write(
        f"curvetui: error: unknown command '{printable(word)}'{hint} (commands: "
        f"{', '.join(names)}; to open a file, give its path: FILE.json or FILE.csv)\n"
    )
    return 2


def _table_error() -> type[Exception]:
    """TableError, looked up as ProjectError is (its module imports numpy)."""
    from curvetui.storage.tables import TableError

    return TableError


INTERNAL_ERROR = 3  # a defect in curvetui, never bad input nor a failed check


def main(argv: list[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 pass, 1 a check failed, 2 bad input,
    3 an internal error: a defect, reported in one line instead of a traceback)."""
    # The engine's numpy work is elementwise and never calls BLAS, yet OpenBLAS starts a
    # thread per core when numpy is imported, and those threads spin: measured with
    # benchmarks/app_startup.py, the app's CPU time to its first results fell from 3.2x to
    # 2.5x a minimal Textual app with one BLAS thread. A value the user set is kept.
    os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")
    try:
        return _main(argv)
    except KeyboardInterrupt:
        sys.stderr.write("curvetui: interrupted\n")
        return 130
    except Exception as exc:  # noqa: BLE001 - the last resort: every cause is fixed where it arises
        tb = exc.__traceback__
        while tb is not None and tb.tb_next is not None:
            tb = tb.tb_next
        where = f" at {Path(tb.tb_frame.f_code.co_filename).name}:{tb.tb_lineno}" if tb else ""
        sys.stderr.write(
            f"curvetui: internal error ({type(exc).__name__}{where}); this is a defect in "
            "curvetui, not in your input: please report it with the command that caused it\n"
        )
        return INTERNAL_ERROR


def _main(argv: list[str] | None) -> int:
    argv = list(sys.argv[1:] if argv is None else argv)
    from curvetui.cli import project_cmd

    # `curvetui FILE` opens a file: route it before argparse sees an unknown command. Any
    # other first word is a mistyped command: refused, nothing created.
    if argv and not argv[0].startswith("-") and argv[0] not in project_cmd.COMMANDS:
        if not project_cmd.looks_like_file(argv[0]):
            return _unknown_command(argv[0], project_cmd.COMMANDS)
        argv = ["open", *argv]
    # the sub-command named first is the only one built; with none (an option such as
    # --help or --version first, or no words) every sub-command is, for the help and errors
    command = argv[0] if argv and not argv[0].startswith("-") else None
    parser = build_parser(command)
    args = parser.parse_args(argv)
    if not getattr(args, "run", None):
        parser.print_help()
        return 0
    try:
        return _run(args)
    finally:
        if command != "tables" or getattr(args, "json", False):
            _warn_skipped()


def _warn_skipped() -> None:
    """A warning line for each user table file left out (`curvetui tables` lists them)."""
    files = sys.modules.get("curvetui.storage.table_files")
    if files is None or sys.stderr is None or sys.stderr.closed:
        return  # no table was loaded, or the reader went away (a closed pipe)
    from curvetui.cli.common import printable

    for path, why in files.skipped_files().items():
        sys.stderr.write(f"curvetui: warning: {printable(path)}: skipped, {printable(why)}\n")


def _run(args) -> int:
    """The sub-command's run, its errors as one line and exit code 2."""
    try:
        return int(args.run(args))
    except _project_error() as exc:
        from curvetui.cli.project_cmd import report_problems

        return report_problems(exc)
    except (InputError, _table_error()) as exc:
        sys.stderr.write(clean(f"curvetui: error: {exc}") + "\n")
        return 2
    except BrokenPipeError:
        # the reader (e.g. `head`) closed the pipe: stop quietly, as shell tools do
        sys.stderr.close()
        return 0
    except OSError as exc:
        where = exc.filename or "file"
        sys.stderr.write(clean(f"curvetui: error: {where}: {exc.strerror or exc}") + "\n")
        return 2
