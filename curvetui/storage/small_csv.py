"""Helpers for the small CSV files a user names (a chain of PIs, a versine survey): the
header and its delimiter, a cell as a number, a cell as a message quotes it, and the
error that lists every bad row at once."""

from __future__ import annotations

import csv
import math

from curvetui.inputs import InputError

MAX_PROBLEMS = 20  # problems listed in one message; the rest counted


class CsvFileError(InputError):
    """A file that cannot be used; ``problems`` names each row and column. ``what`` says
    what the file is ("survey", "points file")."""

    what = "file"

    def __init__(self, path: str, problems: list[str]):
        self.path = path
        self.problems = problems
        shown = problems[:MAX_PROBLEMS]
        more = len(problems) - len(shown)
        tail = f"; and {more} more" if more > 0 else ""
        super().__init__(f"{path}: cannot use this {self.what}: " + "; ".join(shown) + tail)


def cell_number(text: str, decimal_comma: bool) -> float | None:
    """A cell as a finite number (12,5 read as 12.5 in a semicolon file), else None."""
    t = text.strip()
    if decimal_comma and "," in t and "." not in t:
        t = t.replace(",", ".")
    try:
        x = float(t)
    except ValueError:
        return None
    return x if math.isfinite(x) else None


def quoted(text: str) -> str:
    """A cell as a message quotes it: control characters as escapes, at most 40 shown."""
    t = "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)
    return "'" + (t if len(t) <= 40 else t[:40] + "...") + "'"


def header_names(line: str) -> tuple[list[str], str]:
    """The header's column names (stripped, lower case) and the delimiter that splits it
    into the most columns: comma, semicolon or tab."""
    best: list[str] = []
    delimiter = ","
    for candidate in (",", ";", "\t"):
        names = next(csv.reader([line], delimiter=candidate))
        if len(names) > len(best):
            best, delimiter = names, candidate
    return [n.strip().lower() for n in best], delimiter
