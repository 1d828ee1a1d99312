"""Inputs of n bends to checked SI arrays, with every problem typed by row and field.

The first step of the one path (parse -> evaluate -> record): a single bend is n = 1, a
batch chunk is n rows. Each field's range comes from ``curvetui.bend.fields``; a problem
is an ``Issue`` (row, field, text) and the face names the field its own way
(``--speed``, ``$.bends[2].inputs.speed``, ``row 14, column speed``).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from curvetui.bend.fields import BY_KEY, FIELDS, RAIL, ROAD, STATION, Field, choice_text
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem
from curvetui.stations import parse_station


def range_text(lo: float, hi: float, unit: str, lo_open: bool = False) -> str:
    """'must be a number from 1 to 200 km/h' (or 'greater than 0 to 179 degrees')."""
    unit_txt = f" {unit}" if unit else ""
    lo_txt = f"greater than {_bound(lo)}" if lo_open else f"from {_bound(lo)}"
    return f"must be a number {lo_txt} to {_bound(hi)}{unit_txt}"


def _bound(x: float) -> str:
    """A range's end with the digits that tell it from a refused value (a table's 80 mph
    is 128.74752 km/h: '128.748' would name a value the check refuses)."""
    return f"{x:.10g}"


def _shown(text: str) -> str:
    """A cell as a message quotes it: printable characters only, at most 40 of them."""
    clean = "".join(c if c.isprintable() else "?" for c in str(text))
    return repr(clean if len(clean) <= 40 else clean[:37] + "...")


@dataclass
class Column:
    """One input over n rows: ``value`` (NaN where blank or bad), ``present`` (something was
    given), ``bad`` (given but not a finite number) and ``cell(i)`` (the text as given)."""

    value: np.ndarray
    present: np.ndarray
    bad: np.ndarray
    cell: Callable[[int], str]

    @classmethod
    def absent(cls, n: int) -> Column:
        return cls(np.full(n, np.nan), np.zeros(n, bool), np.zeros(n, bool), lambda i: "")

    @classmethod
    def from_values(
        cls,
        values: Sequence,
        station: bool = False,
        units: str = "metric",
        choices: tuple[str, ...] = (),
    ):
        """From Python values (numbers, text or None/blank) as a project file or the
        command line gives them; stations may be written 2+710.5; with ``choices`` a
        word of them (any case) becomes its position, anything else is bad."""
        n = len(values)
        value = np.full(n, np.nan)
        present = np.zeros(n, bool)
        codes = {c: float(j) for j, c in enumerate(choices)}
        for i, v in enumerate(values):
            if v is None or (isinstance(v, str) and v.strip() == "") or isinstance(v, bool):
                present[i] = v is not None and not (isinstance(v, str) and v.strip() == "")
                continue
            present[i] = True
            if choices:
                word = v.strip().lower() if isinstance(v, str) else None
                value[i] = codes.get(word, math.nan)
                continue
            value[i] = to_number(v, station, units)
        texts = [str(v) for v in values]
        with np.errstate(invalid="ignore"):
            bad = present & ~np.isfinite(value)
        return cls(value, present, bad, lambda i: texts[i])


def column_for(key: str, values: Sequence, units: str = "metric") -> Column:
    """A column of Python values for the input ``key``, read as its field says."""
    f = BY_KEY[key]
    return Column.from_values(values, f.unit == STATION, units, f.choices)


def to_number(v, station: bool = False, units: str = "metric") -> float:
    """A finite float, or NaN for anything that is not one (never raises)."""
    try:
        if isinstance(v, int | float) and not isinstance(v, bool):
            x = float(v)
        elif station:
            x = parse_station(str(v), units)
        else:
            x = float(str(v).strip())
    except (ValueError, OverflowError, TypeError):
        return math.nan
    return x if math.isfinite(x) else math.nan


@dataclass(frozen=True)
class Issue:
    """A problem with one row's input; ``other`` names a second field the text refers to
    (``needs`` it as well), so each face can name both its own way."""

    row: int
    field: str
    text: str
    other: str = ""

    def format(self, name: Callable[[str], str], other: Callable[[str], str] | None = None):
        """'--grade: needs --obstruction-offset as well' with the face's names."""
        text = f"{self.text} {(other or name)(self.other)} as well" if self.other else self.text
        return f"{name(self.field)}: {text}"


@dataclass
class Parsed:
    """Checked inputs of n bends: SI values (NaN where absent), road/rail masks, issues."""

    n: int
    is_road: np.ndarray
    is_rail: np.ndarray
    si: dict[str, np.ndarray]
    present: dict[str, np.ndarray]
    issues: list[Issue] = field(default_factory=list)
    ignored: dict[str, np.ndarray] = field(default_factory=dict)  # given, wrong kind

    def error_mask(self) -> np.ndarray:
        out = np.zeros(self.n, bool)
        if self.issues:
            out[[i.row for i in self.issues]] = True
        return out


@dataclass
class Kinds:
    """The kind of each row: masks of road and rail rows, and ``text(i)`` as given."""

    is_road: np.ndarray
    is_rail: np.ndarray
    text: Callable[[int], str]

    @classmethod
    def of(cls, kinds: Sequence[str] | np.ndarray) -> Kinds:
        """From text (any case, blanks trimmed)."""
        raw = np.asarray(kinds, dtype=str)
        k = np.char.lower(np.char.strip(raw))
        return cls(k == ROAD, k == RAIL, lambda i: str(raw[i]))


def _dynamic_range(f: Field, kind: str, units: UnitSystem, table: RoadTable, cols, n, limits=None):
    """(lo, hi, unit) arrays for the two ranges that depend on something else."""
    if f.key == "emax":
        return 100 * table.emax_min, 100 * table.emax_max, f"% (table {table.name})"
    if f.key == "low_speed":
        return 0.0, cols["speed"].value, units.speed_label
    if f.key == "speed" and kind == RAIL and limits is not None:  # the top for the traffic
        traffic = BY_KEY["traffic"]
        code = cols["traffic"].value
        code = np.where(np.isfinite(code), code, traffic.choices.index(traffic.default))
        code = code.astype(int)
        hi = units.speed_from_si(limits.top_speeds()[code])
        if not limits.traffic_top_speeds:
            return 1.0, hi, f"{units.speed_label} (limits {limits.name})"
        label = [f"{units.speed_label} (limits {limits.name}, {t})" for t in traffic.choices]
        return 1.0, hi, np.array(label, object)[code]
    if f.key == "speed" and kind == ROAD:  # never beyond the table's first or last row
        lo, hi = (float(units.speed_from_si(x)) for x in table.speeds_si[[0, -1]])
        return lo, hi, f"{units.speed_label} (table {table.name})"
    return None


def parse(
    kinds: Sequence[str] | np.ndarray | Kinds,
    columns: Mapping[str, Column],
    units: UnitSystem,
    table: RoadTable,
    limits=None,
) -> Parsed:
    """Check every field of n bends against its range; the field list says which."""
    kinds = kinds if isinstance(kinds, Kinds) else Kinds.of(kinds)
    is_road, is_rail = kinds.is_road, kinds.is_rail
    n = len(is_road)
    cols = {f.key: columns.get(f.key) or Column.absent(n) for f in FIELDS}
    issues: list[Issue] = []
    for i in np.nonzero(~is_road & ~is_rail)[0]:
        raw = kinds.text(int(i)).strip()
        why = (
            "required ('road' or 'rail')"
            if raw == ""
            else (f"must be 'road' or 'rail', got {_shown(raw)}")
        )
        issues.append(Issue(int(i), "kind", why))

    si: dict[str, np.ndarray] = {}
    present: dict[str, np.ndarray] = {}
    ignored: dict[str, np.ndarray] = {}
    for f in FIELDS:
        col = cols[f.key]
        applies = np.zeros(n, bool)
        for kind, rows in ((ROAD, is_road), (RAIL, is_rail)):
            if kind not in f.kinds or not rows.any():
                continue
            applies |= rows
            if kind in f.required:
                for i in np.nonzero(rows & ~col.present)[0]:
                    issues.append(Issue(int(i), f.key, "required"))
            issues += _range_issues(f, kind, rows, col, units, table, cols, n, limits)
        if f.needs:
            other = cols[f.needs].present
            for i in np.nonzero(applies & col.present & ~other)[0]:
                issues.append(Issue(int(i), f.key, "needs", f.needs))
        ignored[f.key] = col.present & ~applies & (is_road | is_rail)
        use = applies & col.present & ~col.bad
        present[f.key] = use
        si[f.key] = np.where(use, f.to_si(col.value, units), np.nan)
    issues.sort(key=lambda x: x.row)
    return Parsed(n, is_road, is_rail, si, present, issues, ignored)


def _choice_issues(f: Field, rows, col: Column) -> list[Issue]:
    """A word that is none of the field's choices."""
    return [
        Issue(int(i), f.key, f"must be {choice_text(f)}, got {_shown(col.cell(int(i)))}")
        for i in np.nonzero(rows & col.present & col.bad)[0]
    ]


def _range_issues(f: Field, kind, rows, col: Column, units, table, cols, n, limits=None):
    if f.choices:
        return _choice_issues(f, rows, col)
    allowed = f.allowed(kind, units)
    dynamic = _dynamic_range(f, kind, units, table, cols, n, limits)
    if allowed is None and dynamic is None:
        return []
    lo, hi, unit = dynamic if dynamic is not None else (*allowed, f.unit_label(units))
    lo_a = np.broadcast_to(np.asarray(lo, float), (n,))
    hi_a = np.broadcast_to(np.asarray(hi, float), (n,))
    v = col.value
    if dynamic is not None:
        # a table's range converted to the other unit system: the look-up's own tolerance
        # (curvetui.core.road_table.lookup), so that the table's end typed in full passes
        lo_a, hi_a = lo_a - 1e-12 * np.abs(lo_a), hi_a + 1e-12 * np.abs(hi_a)
    with np.errstate(invalid="ignore"):
        out = (v < lo_a) | (v > hi_a) | ((v == lo_a) if f.lo_open else False)
        tiny = ~out & (v < f.least) if f.least else np.zeros(n, bool)
    out |= tiny
    if f.key == "low_speed":  # no range to check against while the speed itself is bad
        out &= np.isfinite(hi_a)
    wrong = rows & col.present & (col.bad | out)
    found = []
    for i in np.nonzero(wrong)[0]:
        unit_i = unit if isinstance(unit, str) else str(unit[i])
        allowed_txt = range_text(float(lo_a[i]), float(hi_a[i]), unit_i, f.lo_open)
        if tiny[i] and not col.bad[i]:  # above lo, yet too small to compute with
            allowed_txt = range_text(f.least, float(hi_a[i]), unit_i)
        if col.bad[i]:
            if f.unit == STATION:
                allowed_txt = "must be a station such as 2+710.5 or a number"
            got = _shown(col.cell(int(i)))
        else:  # a subnormal number in shortest form (1e-320, not 9.99989e-321)
            x = float(v[i])
            got = _bound(x) if x == 0 or abs(x) >= 1e-300 else repr(x)
        found.append(Issue(int(i), f.key, f"{allowed_txt}, got {got}"))
    return found
