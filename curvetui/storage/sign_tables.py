"""Sign-selection tables from TOML files (``[signs]`` plus ``[[rows]]``): the package's
(curvetui/data/signs) and the user's (the table folders, CURVETUI_TABLES), read safely
through :mod:`curvetui.storage.table_files`. Every value's source status is required, so a
table without provenance is refused."""

from __future__ import annotations

import os
from functools import cache
from importlib import resources
from pathlib import Path

import numpy as np

from curvetui.core.signs import LEVELS, PARTS, SignTable
from curvetui.storage.table_files import TableError, load_user_files, read_table_file
from curvetui.storage.tables import _need, _number

DEFAULT_SIGNS = "mutcd-2009-table-2c-5"


def _text(mapping: dict, key: str, where: str) -> str:
    value = _need(mapping, key, where, str)
    if not value.strip():
        raise TableError(f"{where}: '{key}' is empty")
    return value


def parse_sign_table(data: dict, path: str = "") -> SignTable:
    """A SignTable from a parsed TOML document; TableError naming the fault otherwise."""
    where = path or "sign table"
    head = _need(data, "signs", where, dict)
    units = _text(head, "units", f"{where} [signs]")
    if units not in ("us", "metric"):
        raise TableError(f"{where} [signs]: 'units' must be 'us' or 'metric', got {units!r}")
    w = f"{where} [signs]"
    adv = _need(head, "advisory", w, dict)
    wa = f"{where} [signs.advisory]"
    rounding = _text(adv, "rounding", wa)
    if rounding not in ("down", "nearest"):
        raise TableError(f"{wa}: 'rounding' must be 'down' or 'nearest', got {rounding!r}")
    bands = _need(adv, "friction", wa, list)
    if not bands:
        raise TableError(f"{wa}: no [[signs.advisory.friction]] bands")
    lower, fric, fsrc = [], [], []
    for i, band in enumerate(bands, 1):
        wb = f"{wa} friction band {i}"
        if not isinstance(band, dict):
            raise TableError(f"{wb}: must be a table")
        lower.append(_number(band, "speed_from", wb, 0.0, 300.0))
        fric.append(_number(band, "f", wb, 0.0, 1.0))
        fsrc.append(_text(band, "source", wb))
    if lower[0] != 0 or any(b <= a for a, b in zip(lower, lower[1:], strict=False)):
        raise TableError(f"{wa}: band speeds must start at 0 and rise")
    if any(b > a for a, b in zip(fric, fric[1:], strict=False)):
        raise TableError(f"{wa}: f must not rise with speed")
    rows_in = _need(data, "rows", where, list)
    if not rows_in:
        raise TableError(f"{where}: no [[rows]]")
    diffs, rows = [], []
    for i, r in enumerate(rows_in, 1):
        wr = f"{where} row {i}"
        if not isinstance(r, dict):
            raise TableError(f"{wr}: must be a table")
        diffs.append(_number(r, "difference", wr, 0.0, 300.0))
        row = {}
        for part in PARTS:
            level = _text(r, part, wr)
            if level not in LEVELS:
                raise TableError(f"{wr}: '{part}' must be one of {', '.join(LEVELS)}")
            row[part] = level
            row[f"{part}_source"] = _text(r, f"{part}_source", wr)
        rows.append(row)
    if any(b <= a for a, b in zip(diffs, diffs[1:], strict=False)):
        raise TableError(f"{where}: row differences must rise")
    series = _need(head, "series", w, dict)
    ws = f"{where} [signs.series]"
    return SignTable(
        name=_text(head, "name", w),
        title=_text(head, "title", w),
        edition=_text(head, "edition", w),
        applies_to=_text(head, "applies_to", w),
        units=units,
        turn_max_advisory=_number(head, "turn_max_advisory", w, 0.0, 300.0),
        turn_max_advisory_source=_text(head, "turn_max_advisory_source", w),
        reliable_deflection_min=_number(head, "reliable_deflection_min", w, 0.0, 90.0),
        reliable_deflection_min_source=_text(head, "reliable_deflection_min_source", w),
        consecutive_note=_text(head, "consecutive_note", w),
        method=_text(adv, "method", wa),
        method_source=_text(adv, "method_source", wa),
        step=_number(adv, "step", wa, 0.1, 50.0),
        step_source=_text(adv, "step_source", wa),
        metric_step=_number(adv, "metric_step", wa, 0.1, 50.0),
        metric_step_source=_text(adv, "metric_step_source", wa),
        rounding=rounding,
        rounding_source=_text(adv, "rounding_source", wa),
        friction_from=np.array(lower),
        friction=np.array(fric),
        friction_sources=tuple(fsrc),
        differences=np.array(diffs),
        rows=tuple(rows),
        series_tangent=_number(series, "tangent_less_than", ws, 1.0, 10_000.0),
        series_tangent_source=_text(series, "tangent_less_than_source", ws),
        reverse_turn=_text(series, "reverse_turn", ws),
        reverse_curve=_text(series, "reverse_curve", ws),
        winding_road=_text(series, "winding_road", ws),
        series_names_source=_text(series, "names_source", ws),
        series_rule_source=_text(series, "rule_source", ws),
        same_direction_note=_text(series, "same_direction_note", ws),
        path=path,
    )


@cache
def sign_tables() -> dict[str, SignTable]:
    """Every sign table: the package's, then the user's (a user file may replace one)."""
    tables: dict[str, SignTable] = {}
    folder = resources.files("curvetui") / "data" / "signs"
    for entry in sorted(folder.iterdir(), key=lambda e: e.name):
        if entry.name.endswith(".toml"):
            t = parse_sign_table(read_table_file(Path(str(entry))), str(entry))
            tables[t.name] = t
    for t in load_user_files("signs", "signs", parse_sign_table):
        tables[t.name] = t
    return tables


def sign_table(name: str | None = None) -> SignTable:
    """The sign table called ``name`` (or a path to a .toml file); without a name the one
    the CURVETUI_SIGNS environment variable names, else MUTCD 2009 Table 2C-5."""
    name = name or os.environ.get("CURVETUI_SIGNS") or None
    if name and (name.endswith(".toml") or os.sep in name):
        return parse_sign_table(read_table_file(Path(name)), name)
    tables = sign_tables()
    key = name or DEFAULT_SIGNS
    if key not in tables:
        known = ", ".join(sorted(tables))
        raise TableError(f"CURVETUI_SIGNS: unknown sign table {key!r}; known: {known}")
    return tables[key]
