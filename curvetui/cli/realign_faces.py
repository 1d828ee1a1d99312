"""`curvetui realign ... --sheet FILE` and `--view`: the realignment's worksheet written
(PDF, text or Markdown by the file's suffix) and its screen opened in the terminal app.

Kept apart from cli/realign_cmd.py, which only adds the two options and calls here.
"""

from __future__ import annotations

import os
import sys

from curvetui.inputs import InputError

SHEET_SUFFIXES = {".pdf": "pdf", ".txt": "text", ".md": "md"}


def add_options(p) -> None:
    p.add_argument(
        "--sheet",
        metavar="FILE",
        help="write the realignment worksheet: FILE.pdf, FILE.txt or FILE.md (never over "
        "the survey; an existing file is replaced whole)",
    )
    p.add_argument("--view", action="store_true", help="show the realignment in the terminal app")


def check_options(args) -> None:
    """Refuse a --sheet FILE of another suffix, '-', or the survey itself; --view without a
    terminal or with --json. Called before any work is done."""
    sheet = getattr(args, "sheet", None)
    if sheet is not None:
        suffix = os.path.splitext(str(sheet))[1].lower()
        if sheet == "-" or suffix not in SHEET_SUFFIXES:
            raise InputError(f"--sheet: give a file name ending .pdf, .txt or .md; got {sheet!r}")
        try:
            same = os.path.exists(sheet) and os.path.samefile(sheet, args.survey)
        except OSError:
            same = False
        if same or os.path.abspath(sheet) == os.path.abspath(args.survey):
            raise InputError("--sheet: that is the survey file; the input is never written over")
        if args.output is not None and os.path.abspath(sheet) == os.path.abspath(args.output):
            raise InputError("--sheet: the same file as -o; give two names")
    if getattr(args, "view", False):
        if args.json:
            raise InputError("--view and --json: choose one")
        if not (sys.stdin.isatty() and sys.stdout.isatty()):
            raise InputError("--view: needs a terminal (standard input and output)")


def write_sheet(path: str, design, rail, units, survey: str) -> None:
    """The worksheet of the design in the form the suffix names, saved atomically."""
    from curvetui.reports.realign_sheet import build_sheet
    from curvetui.storage.files import atomic_binary

    sheet = build_sheet(design, rail, units, survey)
    kind = SHEET_SUFFIXES[os.path.splitext(path)[1].lower()]
    if kind == "pdf":
        from curvetui.reports.sheet.realign_page import render_pdf

        data = render_pdf(sheet)
    else:
        from curvetui.reports.sheet.realign_text import render_markdown, render_text

        data = (render_text(sheet) if kind == "text" else render_markdown(sheet)).encode()
    with atomic_binary(path) as fh:
        fh.write(data)


def run_view(design, rail, units, survey: str) -> int:
    """The realignment screen in its own app (escape or ctrl+q ends it). Exit code as the
    command's: 1 when the design is infeasible or a rail check fails, 3 after a crash."""
    from curvetui.app.realign_screen import RealignApp
    from curvetui.cli.project_cmd import run_app

    code = run_app(RealignApp(design, rail, units, survey))
    failed = not design.feasible or (rail is not None and rail.status == "fail")
    return code or (1 if failed else 0)


def say_written(path: str) -> None:
    from curvetui.cli.common import console
    from curvetui.screen_text import markup

    console().print(f"Worksheet written: {markup(path)}")
