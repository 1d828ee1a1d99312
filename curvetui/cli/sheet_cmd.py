"""``curvetui sheet FILE``: print a project's bend worksheets as PDF, plain text or Markdown."""

from __future__ import annotations

import sys

from curvetui.screen_text import clean


def add_parser(sub) -> None:
    p = sub.add_parser(
        "sheet",
        help="print the project's bend worksheets (PDF, text or Markdown)",
        description="A summary page, then one worksheet per bend: title block, inputs, the "
        "standard in use, the working line by line, messages and a plan sketch. A failing "
        "bend is printed as FAIL; the command still succeeds.",
    )
    p.add_argument("file", help="project file (.json)")
    p.add_argument(
        "--bend",
        action="append",
        metavar="ID",
        help="print only this bend (repeat for more); default: every bend",
    )
    p.add_argument(
        "-o",
        "--output",
        help="file to write; '-' for standard output (default: PROJECT.sheets.pdf beside the "
        "project for pdf, standard output for text and md)",
    )
    p.add_argument("--paper", choices=("a4", "letter"), default="a4")
    p.add_argument("--format", choices=("pdf", "text", "md"), default=None)
    p.set_defaults(run=_run_sheet)


def _run_sheet(args) -> int:
    from curvetui.reports.sheet import RENDERERS, atomic_write_bytes, sheets_path
    from curvetui.storage.files import atomic_write_text

    fmt = args.format
    if fmt is None:  # from the output's name, else PDF
        out = (args.output or "").lower()
        fmt = "md" if out.endswith(".md") else ("text" if out.endswith(".txt") else "pdf")
    result = RENDERERS[fmt](args.file, args.bend, args.paper)
    target = args.output
    if target is None and fmt == "pdf":
        target = str(sheets_path(args.file))
    if target in (None, "-"):
        if isinstance(result, bytes):
            sys.stdout.buffer.write(result)
            sys.stdout.buffer.flush()
        else:
            sys.stdout.write(result)
        return 0
    if isinstance(result, bytes):
        atomic_write_bytes(target, result)
    else:
        atomic_write_text(target, result)
    sys.stderr.write(clean(f"Worksheets written: {target}") + "\n")
    return 0
