"""The ``curvetui`` command line: one parser, a sub-command per job."""

from __future__ import annotations

import argparse
import sys

from curvetui import __version__
from curvetui.inputs import InputError

# Each sub-command's module imports what its run needs when it runs (the engine, Rich,
# pyarrow, jsonschema, Textual), so building the parser below stays light.


class _Parser(argparse.ArgumentParser):
    """An argument parser whose errors are one line and exit code 2."""

    def error(self, message: str):  # noqa: D401 - argparse hook
        sys.stderr.write(f"{self.prog}: error: {message}\n")
        raise SystemExit(2)


def build_parser() -> argparse.ArgumentParser:
    from curvetui.cli import (
        batch_cmd,
        project_cmd,
        rail_cmd,
        road_cmd,
        setout_cmd,
        sheet_cmd,
        tables_cmd,
    )

    parser = _Parser(
        prog="curvetui",
        description="Design and check horizontal road bends and railway-track curves. "
        "Local road or rail authority standards govern; a qualified engineer must check "
        "every result.",
    )
    parser.add_argument("--version", action="version", version=f"curvetui {__version__}")
    sub = parser.add_subparsers(dest="command", parser_class=_Parser)
    check = sub.add_parser("check", help="check one bend, or every bend of a project")
    check_sub = check.add_subparsers(dest="kind", parser_class=_Parser)
    road_cmd.add_parser(check_sub)
    rail_cmd.add_parser(check_sub)
    project_cmd.add_check_project(check)
    tables_cmd.add_parser(sub)
    setout_cmd.add_parser(sub)
    project_cmd.add_open_parser(sub)
    project_cmd.add_new_parser(sub)
    sheet_cmd.add_parser(sub)
    batch_cmd.add_parser(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 pass, 1 a check failed, 2 bad input)."""
    argv = list(sys.argv[1:] if argv is None else argv)
    from curvetui.cli import project_cmd

    # `curvetui FILE` opens a project: route it before argparse sees an unknown command.
    if argv and not argv[0].startswith("-") and argv[0] not in project_cmd.COMMANDS:
        argv = ["open", *argv]
    parser = build_parser()
    args = parser.parse_args(argv)
    if not getattr(args, "run", None):
        parser.print_help()
        return 0
    from curvetui.project.files import ProjectError
    from curvetui.tables import TableError

    try:
        return int(args.run(args))
    except ProjectError as exc:
        sys.stderr.write(f"curvetui: error: {exc.path}: cannot use this project file:\n")
        for problem in exc.problems:
            sys.stderr.write(f"  {problem}\n")
        return 2
    except (InputError, TableError) as exc:
        sys.stderr.write(f"curvetui: error: {exc}\n")
        return 2
    except BrokenPipeError:
        # the reader (e.g. `head`) closed the pipe: stop quietly, as shell tools do
        sys.stderr.close()
        return 0
    except OSError as exc:
        where = exc.filename or "file"
        sys.stderr.write(f"curvetui: error: {where}: {exc.strerror or exc}\n")
        return 2
