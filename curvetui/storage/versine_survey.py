"""Reading a versine survey from a CSV file: one row per station, stations half a chord
apart, the versine measured there.

The file is read safely as table files are (``storage.table_files.read_limited``: a regular
file of at most MAX_SURVEY_BYTES, UTF-8 only). A header row is required; its columns are
``station`` and ``versine`` (any case, any order; other columns are refused). Stations in
metres (feet with US units), versines in millimetres (inches). Columns are separated by
commas, semicolons (then 12,5 may be written for 12.5) or tabs. Every bad row is named by
its row number (the header is row 1) and column; all problems are given at once
(``SurveyFileError``), never a traceback.
"""

from __future__ import annotations

import csv
from dataclasses import dataclass

from curvetui.inputs import InputError
from curvetui.storage.small_csv import CsvFileError, cell_number, header_names, quoted

MAX_SURVEY_BYTES = 1_000_000
MAX_STATIONS = 1000  # the design search grows with the square of the stations
MIN_STATIONS = 7
COLUMNS = ("station", "versine")
SPACING_TOLERANCE = 1e-3  # of the spacing: a station this far off its place is refused
MAX_STATION = 1e7  # [m or ft]
MAX_VERSINE = 10_000.0  # [mm or in]: far beyond any track's versine


class SurveyFileError(CsvFileError):
    """A survey file that cannot be used; ``problems`` names each row and column."""

    what = "survey"


@dataclass(frozen=True)
class Survey:
    """Stations and versines in the file's units (m or ft; mm or in), with each file row."""

    stations: tuple[float, ...]
    versines: tuple[float, ...]
    rows: tuple[int, ...]


def parse_survey(text: str, spacing: float, path: str = "survey") -> Survey:
    """The survey from the file's text; stations must be ``spacing`` (half the chord) apart.
    SurveyFileError listing every problem."""
    lines = text.splitlines()
    first = next((i for i, line in enumerate(lines) if line.strip()), None)
    if first is None:
        raise SurveyFileError(path, ["the file is empty: it needs a header row station,versine"])
    names, delimiter = header_names(lines[first])
    problems: list[str] = []
    where: dict[str, int] = {}
    for pos, name in enumerate(names):
        if name not in COLUMNS:
            problems.append(
                f"row {first + 1}, column {pos + 1}: {quoted(name)} is not a column of a survey "
                f"(columns: station, versine)"
            )
        elif name in where:
            problems.append(f"row {first + 1}: column {name!r} appears twice; keep one")
        else:
            where[name] = pos
    missing = [c for c in COLUMNS if c not in where]
    if missing:
        problems.append(
            f"row {first + 1} (the header): column{'s' if len(missing) > 1 else ''} "
            f"{', '.join(missing)} missing; a survey's header is station,versine"
        )
    if problems:
        raise SurveyFileError(path, problems)
    decimal_comma = delimiter == ";"
    stations: list[float] = []
    versines: list[float] = []
    rows: list[int] = []
    for offset, cells in enumerate(csv.reader(lines[first + 1 :], delimiter=delimiter)):
        row = first + 2 + offset
        if not any(c.strip() for c in cells):
            continue
        if len(cells) != len(names):
            problems.append(f"row {row}: {len(cells)} value(s), the header has {len(names)}")
            continue
        got = []
        for col, top in (("station", MAX_STATION), ("versine", MAX_VERSINE)):
            cell = cells[where[col]]
            x = cell_number(cell, decimal_comma)
            if x is None:
                problems.append(f"row {row}, column {col}: {quoted(cell)} is not a number")
            elif abs(x) > top:
                problems.append(f"row {row}, column {col}: {x:g} is outside -{top:g} to {top:g}")
            else:
                got.append(x)
        if len(got) == 2:
            stations.append(got[0])
            versines.append(got[1])
            rows.append(row)
    if len(rows) > MAX_STATIONS:
        problems.append(f"{len(rows)} stations: at most {MAX_STATIONS} (split the survey)")
    if not problems:
        problems += _spacing_problems(stations, rows, spacing)
    if not problems and len(rows) < MIN_STATIONS:
        problems.append(f"{len(rows)} station(s): a survey needs at least {MIN_STATIONS}")
    if problems:
        raise SurveyFileError(path, problems)
    return Survey(tuple(stations), tuple(versines), tuple(rows))


def _spacing_problems(stations, rows, spacing: float) -> list[str]:
    """Each row whose station is not the first plus a whole number of spacings, in order."""
    out = []
    if not stations:
        return out
    for k in range(1, len(stations)):
        want = stations[0] + k * spacing
        if abs(stations[k] - want) > SPACING_TOLERANCE * spacing:
            out.append(
                f"row {rows[k]}, column station: {stations[k]:g} where {want:g} was expected "
                f"(stations must follow each other at half the chord, {spacing:g} apart)"
            )
            break  # one place is enough: every later station would be off too
    return out


def read_survey(path: str, spacing: float) -> Survey:
    """Read and parse the survey file at ``path`` (read only; never changed)."""
    from curvetui.storage.table_files import TableError, decode_utf8, read_limited

    try:
        text = decode_utf8(read_limited(path, MAX_SURVEY_BYTES, "survey file"), path)
    except TableError as exc:
        raise InputError(str(exc)) from None
    return parse_survey(text, spacing, str(path))
