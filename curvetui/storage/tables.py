"""Loading design tables from data files: the package's own and the user's.

Tables are TOML files. The package ships its own under ``curvetui/data/road`` (and
``data/rail`` for rail limits); a user adds an authority's table by dropping a file into
a folder named by the environment variable ``CURVETUI_TABLES`` (several folders joined
with the path separator) or ``~/.config/curvetui/tables``, or by passing a file path
where a table name is asked for. Files are read once per process.
"""

from __future__ import annotations

import math
import os
from functools import cache
from importlib import resources
from pathlib import Path

import numpy as np

from curvetui.core.road_table import DISTRIBUTIONS, RadiusRounding, RoadTable
from curvetui.storage.table_files import (
    TableError,
    load_user_files,
    read_table_file,
    skipped_files,
    user_table_dirs,
)

__all__ = [
    "TableError",
    "rail_limit_sets",
    "rail_limits",
    "read_table_file",
    "road_table",
    "road_tables",
    "skipped_files",
    "user_table_dirs",
]

DEFAULT_ROAD_TABLE = {"metric": "aashto-2018-metric", "us": "aashto-2018-us"}


def _need(mapping: dict, key: str, where: str, kind: type | tuple[type, ...]):
    if key not in mapping:
        raise TableError(f"{where}: missing '{key}'")
    value = mapping[key]
    if isinstance(value, bool) or not isinstance(value, kind):
        names = kind.__name__ if isinstance(kind, type) else " or ".join(k.__name__ for k in kind)
        raise TableError(f"{where}: '{key}' must be {names}, got {value!r}")
    return value


def _number(mapping: dict, key: str, where: str, lo: float, hi: float) -> float:
    given = _need(mapping, key, where, (int, float))
    try:
        value = float(given)
    except OverflowError:  # an integer beyond any float
        value = math.inf if given > 0 else -math.inf
    if not (lo <= value <= hi):
        raise TableError(
            f"{where}: '{key}' = {value:g} is outside the allowed range {lo:g} to {hi:g}"
        )
    return value


def _optional(mapping: dict, key: str, where: str, lo: float, hi: float, default: float) -> float:
    """_number where the key may be left out (``default`` then)."""
    return _number(mapping, key, where, lo, hi) if key in mapping else default


def _numbers(mapping: dict, key: str, where: str, lo: float, hi: float) -> list[float]:
    """An optional list of numbers, each within [lo, hi]."""
    values = mapping.get(key, [])
    if not isinstance(values, list):
        raise TableError(f"{where}: '{key}' must be a list of numbers, got {values!r}")
    return [_number({key: v}, key, where, lo, hi) for v in values]


def parse_road_table(data: dict, path: str = "") -> RoadTable:
    """Build a RoadTable from a parsed TOML document, with a clear error for any fault."""
    label = path or "road table"
    head = _need(data, "table", label, dict)
    where = f"{label} [table]"
    name = _need(head, "name", where, str)
    units = _need(head, "units", where, str)
    if units not in ("metric", "us"):
        raise TableError(f"{where}: 'units' must be 'metric' or 'us', got {units!r}")
    distribution = head.get("distribution", "aashto-method-5")
    if distribution not in DISTRIBUTIONS:
        raise TableError(f"{where}: 'distribution' must be one of {', '.join(DISTRIBUTIONS)}")
    emax = _need(head, "emax", where, dict)
    emin = _number(emax, "min", f"{where} emax", 0, 20)
    emx = _number(emax, "max", f"{where} emax", emin, 20)
    edef = _number(emax, "default", f"{where} emax", emin, emx)
    tabulated = _numbers(emax, "tabulated", f"{where} emax", 0, 20)
    rounding = head.get("radius_rounding", {})
    if not isinstance(rounding, dict):
        raise TableError(f"{where}: 'radius_rounding' must be a table of values")
    rw = f"{where} radius_rounding"
    sig = _optional(rounding, "significant_figures", rw, 1, 15, 3)
    if sig != int(sig):
        raise TableError(f"{rw}: 'significant_figures' must be a whole number, got {sig:g}")
    rows = _need(data, "rows", label, list)
    if len(rows) < 2:
        raise TableError(f"{label}: needs at least two [[rows]]")
    cols: dict[str, list[float]] = {
        "speed": [],
        "side_friction_max": [],
        "running_speed": [],
        "relative_gradient": [],
        "spiral_radius_max": [],
    }
    sources = []
    for i, row in enumerate(rows, start=1):
        rw = f"{label} row {i}"
        if not isinstance(row, dict):
            raise TableError(f"{rw}: must be a table of values")
        cols["speed"].append(_number(row, "speed", rw, 1, 400))
        cols["side_friction_max"].append(_number(row, "side_friction_max", rw, 0.01, 1.0))
        if distribution == "aashto-method-5":
            vr = _number(row, "running_speed", rw, 1, 400)
        else:
            vr = _optional(row, "running_speed", rw, 1, 400, cols["speed"][-1])
        cols["running_speed"].append(vr)
        cols["relative_gradient"].append(_number(row, "relative_gradient", rw, 0.01, 5.0))
        cols["spiral_radius_max"].append(
            _number(row, "spiral_radius_max", rw, 1, 1e6) if "spiral_radius_max" in row else np.nan
        )
        src = row.get("source")
        if not isinstance(src, str) or not src.strip():
            raise TableError(f"{rw}: every row needs a 'source' naming where its values come from")
        sources.append(src)
    speeds = np.array(cols["speed"])
    if np.any(np.diff(speeds) <= 0):
        raise TableError(f"{label}: row speeds must rise strictly from row to row")
    constant = _number(head, "point_mass_constant", where, 1, 1000)
    spiral_max = np.array(cols["spiral_radius_max"])
    spiral_source = head.get("spiral_radius_max_source", "")
    if np.isfinite(spiral_max).any() and not (
        isinstance(spiral_source, str) and spiral_source.strip()
    ):
        raise TableError(
            f"{where}: rows give spiral_radius_max, so 'spiral_radius_max_source' must say "
            "where those values come from"
        )
    return RoadTable(
        name=name,
        title=str(head.get("title", name)),
        source=_need(head, "source", where, str),
        units=units,
        point_mass_constant=constant,
        distribution=distribution,
        speeds=speeds,
        side_friction_max=np.array(cols["side_friction_max"]),
        running_speeds=np.array(cols["running_speed"]),
        relative_gradient=np.array(cols["relative_gradient"]) / 100.0,
        row_sources=tuple(sources),
        emax_default=edef / 100.0,
        emax_min=emin / 100.0,
        emax_max=emx / 100.0,
        emax_tabulated=tuple(t / 100.0 for t in tabulated),
        normal_crown=_number(head, "normal_crown", where, 0, 10) / 100.0
        if "normal_crown" in head
        else 0.02,
        superelevation_step=_number(head, "superelevation_step", where, 0.01, 1) / 100.0
        if "superelevation_step" in head
        else 0.001,
        normal_crown_limit=_number(head, "normal_crown_limit", where, 0, 10) / 100.0
        if "normal_crown_limit" in head
        else 0.015,
        radius_rounding=RadiusRounding(
            whole_below=_optional(rounding, "whole_below", rw, 0, 1e6, 1000),
            step=_optional(rounding, "step", rw, 1e-3, 1e3, 1),
            significant_figures=int(sig),
        ),
        path=path,
        spiral_radius_max=spiral_max if np.isfinite(spiral_max).any() else None,
        spiral_radius_max_source=spiral_source if np.isfinite(spiral_max).any() else "",
    )


def _packaged_files(kind: str) -> list[tuple[str, Path]]:
    folder = resources.files("curvetui") / "data" / kind
    return sorted(
        (entry.name, Path(str(entry))) for entry in folder.iterdir() if entry.name.endswith(".toml")
    )


@cache
def road_tables() -> dict[str, RoadTable]:
    """Every road table: the package's, then the user's (a user file may replace one). A user
    file that cannot be used is left out and listed by ``skipped_files()``."""
    tables: dict[str, RoadTable] = {}
    for _, path in _packaged_files("road"):
        data = read_table_file(path)
        if not isinstance(data.get("table"), dict) or data["table"].get("kind", "road") != "road":
            continue
        table = parse_road_table(data, str(path))
        tables[table.name] = table
    for table in load_user_files("road", "table", parse_road_table):
        tables[table.name] = table
    return tables


def road_table(name: str | None, units: str = "metric") -> RoadTable:
    """The road table called ``name`` (or a path to a .toml file); default per unit system."""
    if name and (name.endswith(".toml") or os.sep in name):
        return parse_road_table(read_table_file(Path(name)), name)
    tables = road_tables()
    key = name or DEFAULT_ROAD_TABLE[units]
    if key not in tables:
        known = ", ".join(sorted(tables))
        raise TableError(f"--table: unknown road table {key!r}; known tables: {known}")
    return tables[key]


DEFAULT_RAIL_LIMITS = {"metric": "en13803-2010", "us": "49cfr213-class3-5"}


def parse_rail_limits(data: dict, path: str = ""):
    """Build RailLimits from a parsed TOML document (cant in mm metric, inches US).

    Optional per band: cant_gradient_max (mm/m or in/ft), cant_rate_max and
    deficiency_rate_max (mm/s or in/s); NaN where a band leaves one out.
    """
    from curvetui.core.rail import RailLimits, rail_centres_for_coefficient
    from curvetui.core.units import FOOT, INCH, KMH, MPH

    label = path or "rail limits"
    head = _need(data, "limits", label, dict)
    where = f"{label} [limits]"
    name = _need(head, "name", where, str)
    units = _need(head, "units", where, str)
    if units not in ("metric", "us"):
        raise TableError(f"{where}: 'units' must be 'metric' or 'us', got {units!r}")
    cant_unit = 0.001 if units == "metric" else INCH
    speed_unit = KMH if units == "metric" else MPH
    cant_hi = 300 if units == "metric" else 12
    # transition limits: cant gradient in mm/m (metric) or in/ft (US), rates in mm/s or in/s
    gradient_unit = 0.001 if units == "metric" else INCH / FOOT
    gradient_hi = 20 if units == "metric" else 0.24
    rate_hi = 500 if units == "metric" else 20
    if "rail_centres" in head:
        centres = _number(head, "rail_centres", where, 500, 2500) * cant_unit
    elif "cant_coefficient" in head:
        centres = rail_centres_for_coefficient(_number(head, "cant_coefficient", where, 1e-5, 0.01))
    else:
        raise TableError(f"{where}: needs 'rail_centres' (mm or in) or 'cant_coefficient'")
    bands = _need(data, "bands", label, list)
    if not bands:
        raise TableError(f"{label}: needs at least one [[bands]]")
    cols: dict[str, list[float]] = {
        k: []
        for k in (
            "speed_max",
            "cant_recommended",
            "cant_max",
            "deficiency_recommended",
            "deficiency_max",
            "excess_recommended",
            "excess_max",
        )
    }
    transition: dict[str, list[float]] = {
        "cant_gradient_max": [],
        "cant_rate_max": [],
        "deficiency_rate_max": [],
    }
    sources = []
    for i, band in enumerate(bands, start=1):
        bw = f"{label} band {i}"
        if not isinstance(band, dict):
            raise TableError(f"{bw}: must be a table of values")
        cols["speed_max"].append(_number(band, "speed_max", bw, 1, 600) * speed_unit)
        for key in ("cant_recommended", "cant_max", "deficiency_recommended", "deficiency_max"):
            cols[key].append(_number(band, key, bw, 0, cant_hi) * cant_unit)
        for key in ("excess_recommended", "excess_max"):
            cols[key].append(
                _number(band, key, bw, 0, cant_hi) * cant_unit if key in band else float("nan")
            )
        for key, unit, hi in (
            ("cant_gradient_max", gradient_unit, gradient_hi),
            ("cant_rate_max", cant_unit, rate_hi),
            ("deficiency_rate_max", cant_unit, rate_hi),
        ):
            transition[key].append(
                _number(band, key, bw, hi * 1e-6, hi) * unit if key in band else float("nan")
            )
        src = band.get("source")
        if not isinstance(src, str) or not src.strip():
            raise TableError(f"{bw}: every band needs a 'source' naming where its values come from")
        sources.append(src)
    if np.any(np.diff(cols["speed_max"]) <= 0):
        raise TableError(f"{label}: band speed_max must rise strictly from band to band")
    tops, traffic_source = _traffic_top_speeds(head, where, speed_unit, cols["speed_max"][-1])
    return RailLimits(
        name=name,
        title=str(head.get("title", name)),
        source=_need(head, "source", where, str),
        units=units,
        rail_centres=centres,
        **{k: np.array(v) for k, v in cols.items()},
        band_sources=tuple(sources),
        cant_min=_optional(head, "cant_min", where, 0, cant_hi, 0) * cant_unit,
        path=path,
        radius_min=_number(head, "radius_min", where, 0, 10000)
        * (1.0 if units == "metric" else FOOT)
        if "radius_min" in head
        else 0.0,
        scope_min=_number(head, "speed_min", where, 0, 600) * speed_unit
        if "speed_min" in head
        else 0.0,
        gauge=_number(head, "gauge", where, 20, 2000) * (0.001 if units == "metric" else INCH)
        if "gauge" in head
        else float("nan"),
        **{k: np.array(v) for k, v in transition.items()},
        traffic_top_speeds=tops,
        traffic_source=traffic_source,
    )


def _traffic_top_speeds(head: dict, where: str, speed_unit: float, last: float):
    """The optional ``[limits.top_speed]`` table: a top speed (km/h or mph) per kind of
    traffic (``passenger``, ``freight``) and its ``source``; none may pass the last band."""
    from curvetui.core.rail import TRAFFIC

    if "top_speed" not in head:
        return (), ""
    table = _need(head, "top_speed", where, dict)
    at = f"{where} top_speed"
    source = _need(table, "source", at, str)
    if not source.strip():
        raise TableError(f"{at}: 'source' must name where the speeds come from")
    unknown = sorted(set(table) - {"source", *TRAFFIC})
    if unknown:
        raise TableError(f"{at}: unknown key {unknown[0]!r}; keys: {', '.join(TRAFFIC)}, source")
    tops = []
    for traffic in TRAFFIC:
        if traffic in table:
            top = _number(table, traffic, at, 1, 600) * speed_unit
            if top > last * (1 + 1e-12):
                raise TableError(f"{at}: '{traffic}' is above the last band's speed_max")
            tops.append((traffic, top))
    return tuple(tops), source


@cache
def rail_limit_sets() -> dict:
    """Every rail limits file: the package's, then the user's (a user file that cannot be used
    is left out and listed by ``skipped_files()``)."""
    found = {}
    for _, path in _packaged_files("rail"):
        data = read_table_file(path)
        if "limits" not in data:
            continue
        limits = parse_rail_limits(data, str(path))
        found[limits.name] = limits
    for limits in load_user_files("rail", "limits", parse_rail_limits):
        found[limits.name] = limits
    return found


def rail_limits(name: str | None, units: str = "metric"):
    """The rail limits called ``name`` (or a .toml path); default per unit system."""
    if name and (name.endswith(".toml") or os.sep in name):
        return parse_rail_limits(read_table_file(Path(name)), name)
    found = rail_limit_sets()
    key = name or DEFAULT_RAIL_LIMITS[units]
    if key not in found:
        raise TableError(
            f"--limits: unknown rail limits {key!r}; known: {', '.join(sorted(found))}"
        )
    return found[key]
