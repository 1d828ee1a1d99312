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

from dataclasses import dataclass

from curvetui.inputs import InputError
from curvetui.storage.small_csv import CsvFileError, bounded_numbers, data_rows, read_layout

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
    layout = read_layout(
        lines, COLUMNS, COLUMNS, SurveyFileError, path,
        empty="the file is empty: it needs a header row station,versine",
        listing="columns: station, versine",
        header="a survey's header is station,versine",
    )  # fmt: skip
    problems: list[str] = []
    stations: list[float] = []
    versines: list[float] = []
    rows: list[int] = []
    bounds = (("station", MAX_STATION), ("versine", MAX_VERSINE))
    for row, cells in data_rows(lines, layout, problems):
        got = bounded_numbers(cells, row, layout, bounds, problems)
        if got is not None:
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
