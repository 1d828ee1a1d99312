"""Helpers for the small CSV files a user names (a chain of PIs, a versine survey): the
header and its delimiter, a cell as a number, a cell as a message quotes it, and the
error that lists every bad row at once."""

from __future__ import annotations

import csv
import math
from dataclasses import dataclass

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


@dataclass(frozen=True)
class Layout:
    """A small CSV file's header: its column names, the position of each known one, the
    delimiter, and the index of the header line (blank lines before it skipped)."""

    names: list[str]
    where: dict[str, int]
    delimiter: str
    first: int

    @property
    def decimal_comma(self) -> bool:
        """A semicolon file may write 12,5 for 12.5."""
        return self.delimiter == ";"


def read_layout(
    lines: list[str], columns, required, error: type[CsvFileError], path: str, empty: str,
    listing: str, header: str,
) -> Layout:  # fmt: skip
    """The header of ``lines``: every column one of ``columns``, none twice, every one of
    ``required`` present; else ``error`` listing each problem by row and column. ``empty``,
    ``listing`` and ``header`` are the file kind's words: the empty-file message, the
    columns it takes, and what its header must name."""
    first = next((i for i, line in enumerate(lines) if line.strip()), None)
    if first is None:
        raise error(path, [empty])
    names, delimiter = header_names(lines[first])
    problems: list[str] = []
    where: dict[str, int] = {}
    for pos, name in enumerate(names):
        if name not in columns:
            problems.append(
                f"row {first + 1}, column {pos + 1}: {quoted(name)} is not a column of a "
                f"{error.what} ({listing})"
            )
        elif name in where:
            problems.append(f"row {first + 1}: column {name!r} appears twice; keep one")
        else:
            where[name] = pos
    missing = [c for c in required if c not in where]
    if missing:
        problems.append(
            f"row {first + 1} (the header): column{'s' if len(missing) > 1 else ''} "
            f"{', '.join(missing)} missing; {header}"
        )
    if problems:
        raise error(path, problems)
    return Layout(names, where, delimiter, first)


def data_rows(lines: list[str], layout: Layout, problems: list[str]):
    """(row number, cells) of each line after the header (the file's line number, one record
    a line); blank lines skipped, a line of the wrong width named in ``problems``."""
    reader = csv.reader(lines[layout.first + 1 :], delimiter=layout.delimiter)
    for offset, cells in enumerate(reader):
        row = layout.first + 2 + offset
        if not any(c.strip() for c in cells):
            continue
        if len(cells) != len(layout.names):
            problems.append(
                f"row {row}: {len(cells)} value(s), the header has {len(layout.names)} column(s)"
            )
            continue
        yield row, cells


def bounded_numbers(cells, row: int, layout: Layout, bounds, problems: list[str]):
    """The cells of the columns in ``bounds`` ((column, largest magnitude), ...) as numbers,
    or None with each bad cell named in ``problems``."""
    got = []
    for col, top in bounds:
        cell = cells[layout.where[col]]
        x = cell_number(cell, layout.decimal_comma)
        if x is None:
            problems.append(f"row {row}, column {col}: {quoted(cell)} is not a number")
        elif abs(x) > top:
            problems.append(f"row {row}, column {col}: {x:g} is outside -{top:g} to {top:g}")
        else:
            got.append(x)
    return got if len(got) == len(bounds) else None
