"""Helpers shared by the sub-commands: unit options, rich output, the caution line."""

from __future__ import annotations

import json
import sys
from typing import TYPE_CHECKING

from curvetui import CAUTION

if TYPE_CHECKING:
    from rich.console import Console


def add_units_option(parser) -> None:
    parser.add_argument(
        "--units",
        choices=("metric", "us"),
        default="metric",
        help="metric (km/h, m) or us customary (mph, ft); default metric",
    )


def console() -> Console:
    from rich.console import Console  # here, not at the top: `--json` output needs no Rich

    return Console(highlight=False)


def print_json(obj) -> None:
    json.dump(obj, sys.stdout, indent=2, allow_nan=False)
    sys.stdout.write("\n")


def print_caution(out: Console) -> None:
    out.print(f"[bold yellow]{CAUTION}[/]")


def printable(text: str) -> str:
    """``text`` with control characters (escape sequences, line ends) shown as Python escapes,
    for one-line messages written straight to the terminal."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)
