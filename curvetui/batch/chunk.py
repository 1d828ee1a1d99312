"""One chunk of a batch file through the engine: text columns in, result columns out.

Every row is checked with the same engine calls, ranges and words as ``curvetui check``
(see curvetui.bends); here they run on whole columns at once. A row with a bad cell gets
status ``error`` and a message naming its row and column; the other rows are unaffected.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

from curvetui import bend_parts
from curvetui.batch import columns as cols
from curvetui.batch.numbers import NumberColumn, round_places, round_significant
from curvetui.bends import (
    FRICTION,
    RADIUS_M,
    RAIL_RADIUS_M,
    RAIL_SPEED,
    ROAD_SPEED,
    SUPERELEVATION_PCT,
)
from curvetui.core import road as road_engine
from curvetui.core import transitions as tr
from curvetui.core.circular import circular_curve
from curvetui.core.rail import RailLimits, check_rail, rail_centres_for_gauge
from curvetui.core.rail_messages import RAIL_MESSAGES
from curvetui.core.road_messages import ROAD_MESSAGES
from curvetui.core.road_table import RoadTable
from curvetui.core.units import FOOT, UnitSystem
from curvetui.results import CROSS_SECTION_NAMES, rail_columns, road_columns

PASS, FAIL, ERROR = 0, 1, 2
STATUS_NAMES = ("pass", "fail", "error")
CROSS_SECTIONS = tuple(CROSS_SECTION_NAMES[k] for k in sorted(CROSS_SECTION_NAMES))
RAIL_GOVERNING = (*tr.RAIL_GOVERNING, "none evaluated")  # index -1 is "none evaluated"
GEOMETRY_TYPES = ("circular", "spiral-curve-spiral")
TRANSITION_STATUS = ("pass", "fail", "not evaluated")


@dataclass(frozen=True)
class BatchContext:
    """What every chunk of one file shares: units, table, limits and the file's headers."""

    units: UnitSystem
    table: RoadTable
    limits: RailLimits
    headers: Mapping[str, str]  # known column (lower case) -> its header in the file
    decimal_comma: bool = False

    def column(self, key: str) -> str:
        return self.headers.get(key, key)


@dataclass
class ChunkResult:
    """Result columns of one chunk (pyarrow arrays by result name) and per-row summaries."""

    columns: dict[str, pa.Array]
    status: np.ndarray  # PASS, FAIL or ERROR per row
    utilisation: np.ndarray  # largest demand / limit of the main check; NaN for errors
    is_rail: np.ndarray


class _Text:
    """A text column kept as codes into a short list of choices (null where unset)."""

    def __init__(self, n: int, choices: tuple[str, ...]):
        self.codes = np.full(n, -1, dtype=np.int32)
        self.choices = pa.array(choices, pa.string())

    def set(self, rows: np.ndarray, codes) -> None:
        self.codes[rows] = codes

    def array(self) -> pa.Array:
        return pc.take(self.choices, pa.array(self.codes, mask=self.codes < 0))


class _Messages:
    """Messages as columns of text, one per reason (null where a row lacks it), joined
    with "; " in the order they were added."""

    def __init__(self, n: int):
        self.n = n
        self.parts: list[pa.Array] = []

    def constant(self, mask: np.ndarray, text: str) -> None:
        if mask.any():
            self.parts.append(pc.if_else(pa.array(mask), text, pa.scalar(None, pa.string())))

    def per_row(self, rows: np.ndarray, texts: list[str]) -> None:
        """``texts[j]`` for row ``rows[j]`` (rows increasing, each at most once)."""
        if len(rows):
            mask = np.zeros(self.n, dtype=bool)
            mask[rows] = True
            self.parts.append(
                pc.replace_with_mask(
                    pa.nulls(self.n, pa.string()), pa.array(mask), pa.array(texts, pa.string())
                )
            )

    def lists(self, by_row: dict[int, list[str]]) -> None:
        rows = np.array(sorted(by_row), dtype=np.int64)
        self.per_row(rows, ["; ".join(by_row[int(i)]) for i in rows])

    def array(self) -> pa.Array:
        empty = pa.array(np.full(self.n, "", dtype=object), pa.string())
        if not self.parts:
            return empty
        if len(self.parts) == 1:
            return pc.fill_null(self.parts[0], "")
        # Join only the rows that have a message: pyarrow 26.0.1's null_handling="skip"
        # drops a row that is null in every part instead of giving "" (seen here).
        has = pc.is_valid(self.parts[0])
        for part in self.parts[1:]:
            has = pc.or_(has, pc.is_valid(part))
        subset = [pc.filter(part, has) for part in self.parts]
        joined = pc.binary_join_element_wise(*subset, "; ", null_handling="skip")
        if len(joined) != len(subset[0]):  # pragma: no cover - a pyarrow that differs again
            joined = subset[0]
            for part in subset[1:]:
                joined = pc.coalesce(pc.binary_join_element_wise(joined, part, "; "), joined, part)
        return pc.replace_with_mask(empty, has, joined)


def _spread(n: int, rows: np.ndarray, hit: np.ndarray) -> np.ndarray:
    """A chunk-long mask, True at ``rows[hit]``."""
    out = np.zeros(n, dtype=bool)
    out[rows[hit]] = True
    return out


class _Errors:
    """Error messages by row index; the first column's message first."""

    def __init__(self, ctx: BatchContext, row_numbers: np.ndarray):
        self.ctx = ctx
        self.rows = row_numbers
        self.by_row: dict[int, list[str]] = {}

    def name(self, i: int, key: str) -> str:
        return f"ERROR row {int(self.rows[i])}, column {self.ctx.column(key)}"

    def add(self, i: int, text: str) -> None:
        self.by_row.setdefault(int(i), []).append(text)

    def mask(self, n: int) -> np.ndarray:
        out = np.zeros(n, dtype=bool)
        if self.by_row:
            out[list(self.by_row)] = True
        return out


def _check_range(errors: _Errors, col: NumberColumn, key: str, rows, lo, hi, unit, lo_open=False):
    """Report cells of ``rows`` that are not numbers or lie outside [lo, hi]."""
    lo_at = np.broadcast_to(np.asarray(lo, dtype=float), rows.shape)
    hi_at = np.broadcast_to(np.asarray(hi, dtype=float), rows.shape)
    wrong = (rows & col.bad) | col.outside(rows, lo, hi, lo_open)
    for i in np.nonzero(wrong)[0]:
        errors.add(
            i,
            col.message(i, errors.name(i, key), float(lo_at[i]), float(hi_at[i]), unit, lo_open),
        )


def _require(errors: _Errors, col: NumberColumn, key: str, rows, why: str = "required"):
    for i in np.nonzero(rows & ~col.present)[0]:
        errors.add(i, f"{errors.name(i, key)}: {why}")


def _length_range(units: UnitSystem, lo_m: float, hi_m: float) -> tuple[float, float]:
    return round(units.length_from_si(lo_m), 1), round(units.length_from_si(hi_m))


def evaluate_chunk(
    cells: Mapping[str, pa.Array], row_numbers: np.ndarray, ctx: BatchContext
) -> ChunkResult:
    """Check one chunk. ``cells`` maps known input names (lower case) to text columns;
    ``row_numbers`` are the rows as a spreadsheet numbers them (the header is row 1)."""
    n = len(row_numbers)
    units, table = ctx.units, ctx.table
    num = {key: NumberColumn(cells.get(key), n, ctx.decimal_comma) for key in cols.NUMERIC}
    errors = _Errors(ctx, row_numbers)
    notes = _Messages(n)

    kind_text = pc.utf8_lower(pc.utf8_trim_whitespace(cells["kind"]))
    is_road = pc.equal(kind_text, "road").to_numpy(zero_copy_only=False)
    is_rail = pc.equal(kind_text, "rail").to_numpy(zero_copy_only=False)
    for i in np.nonzero(~is_road & ~is_rail)[0]:
        raw = cells["kind"][i].as_py().strip()
        why = (
            "required ('road' or 'rail')"
            if raw == ""
            else (f"must be 'road' or 'rail', got {raw!r}")
        )
        errors.add(i, f"{errors.name(i, 'kind')}: {why}")

    # ---- ranges, as curvetui.bends.parse_road / parse_rail / parse_geometry check them
    speed, radius = num["speed"], num["radius"]
    for rows, speeds, radii in (
        (is_road, ROAD_SPEED[units.name], _length_range(units, *RADIUS_M)),
        (is_rail, RAIL_SPEED[units.name], _length_range(units, *RAIL_RADIUS_M)),
    ):
        if rows is is_rail:
            radii = (round(radii[0]), radii[1])
        _require(errors, speed, "speed", rows)
        _require(errors, radius, "radius", rows)
        _check_range(errors, speed, "speed", rows, *speeds, units.speed_label)
        _check_range(errors, radius, "radius", rows, *radii, units.length_label)
    _check_range(
        errors,
        num["emax"],
        "emax",
        is_road,
        100 * table.emax_min,
        100 * table.emax_max,
        f"% (table {table.name})",
    )
    _check_range(errors, num["superelevation"], "superelevation", is_road, *SUPERELEVATION_PCT, "%")
    _check_range(errors, num["friction"], "friction", is_road, *FRICTION, "")
    cant = num["cant"]
    _require(errors, cant, "cant", is_rail, "required for a rail bend")
    _check_range(
        errors,
        cant,
        "cant",
        is_rail,
        0.0,
        300.0 if units.name == "metric" else 12.0,
        units.cant_label,
    )
    low = num["low_speed"]
    speed_ok = speed.present & ~speed.bad
    low_rows = is_rail & speed_ok
    _check_range(errors, low, "low_speed", low_rows, 0.0, speed.value, units.speed_label)
    _check_range(errors, num["gauge"], "gauge", is_rail, 600.0, 1700.0, "mm")
    deflection, spiral = num["deflection"], num["spiral"]
    known = is_road | is_rail
    _check_range(errors, deflection, "deflection", known, 0.0, 179.0, "degrees", lo_open=True)
    spiral_hi = round(units.length_from_si(5000.0))
    _check_range(errors, spiral, "spiral", known, 0.0, spiral_hi, units.length_label)
    for i in np.nonzero(known & spiral.present & ~deflection.present)[0]:
        errors.add(
            i, f"{errors.name(i, 'spiral')}: needs column {ctx.column('deflection')} as well"
        )
    for key in cols.RAIL_ONLY:
        notes.constant(
            is_road & num[key].present,
            f"NOTE column {ctx.column(key)} does not apply to a road bend: ignored",
        )
    for key in cols.ROAD_ONLY:
        notes.constant(
            is_rail & num[key].present,
            f"NOTE column {ctx.column(key)} does not apply to a rail bend: ignored",
        )

    out = _Outputs(n, ctx)
    bad = errors.mask(n)
    road_rows = np.nonzero(is_road & ~bad)[0]
    rail_rows = np.nonzero(is_rail & ~bad)[0]
    status = np.full(n, PASS, dtype=np.int8)
    util = np.full(n, np.nan)
    messages = _Messages(n)
    later = _Messages(n)  # transition notes after the folded failures
    if len(road_rows):
        _road(road_rows, num, ctx, out, status, util, messages, later, errors)
    if len(rail_rows):
        _rail(rail_rows, num, ctx, out, status, util, messages, later, errors)

    bad = errors.mask(n)
    status[bad] = ERROR
    util[bad] = np.nan
    out.clear(bad)
    final = _Messages(n)
    final.parts = [*messages.parts, *later.parts, *notes.parts]
    joined = final.array()
    if errors.by_row:
        rows = np.array(sorted(errors.by_row), dtype=np.int64)
        mask = np.zeros(n, dtype=bool)
        mask[rows] = True
        texts = pa.array(["; ".join(errors.by_row[int(i)]) for i in rows], pa.string())
        joined = pc.replace_with_mask(joined, pa.array(mask), texts)
    result = out.arrays()
    result["row"] = pa.array(np.asarray(row_numbers, dtype=np.int64))
    result["status"] = pc.take(pa.array(STATUS_NAMES), pa.array(status.astype(np.int32)))
    result["messages"] = joined
    return ChunkResult(columns=result, status=status, utilisation=util, is_rail=is_rail)


class _Outputs:
    """The result columns of a chunk as they fill, then as pyarrow arrays."""

    def __init__(self, n: int, ctx: BatchContext):
        self.n = n
        self.floats = {
            name: np.full(n, np.nan) for name, kind in cols.RESULTS if kind == cols.FLOAT
        }
        self.texts = {
            "units": _Text(n, ("metric", "us")),
            "table": _Text(n, (ctx.table.name,)),
            "limits": _Text(n, (ctx.limits.name,)),
            "cross_section": _Text(n, CROSS_SECTIONS),
            "transition.governing": _Text(n, (*tr.ROAD_GOVERNING, *RAIL_GOVERNING)),
            "transition.status": _Text(n, TRANSITION_STATUS),
            "geometry.type": _Text(n, GEOMETRY_TYPES),
        }
        self.units_code = 0 if ctx.units.name == "metric" else 1

    def put(self, name: str, rows: np.ndarray, values) -> None:
        self.floats[name][rows] = values

    def clear(self, rows: np.ndarray) -> None:
        for values in self.floats.values():
            values[rows] = np.nan
        for text in self.texts.values():
            text.codes[rows] = -1

    def arrays(self) -> dict[str, pa.Array]:
        out: dict[str, pa.Array] = {}
        for name, kind in cols.RESULTS:
            if kind == cols.FLOAT:
                values = self.floats[name]
                out[name] = pa.array(values, mask=np.isnan(values))
            elif name in self.texts:
                out[name] = self.texts[name].array()
        return out


def _flag_messages(builders, check, flags, rows, n, ctx_obj, units, msgs: _Messages) -> None:
    """Each flag's message for the rows (positions in ``check``) that carry it."""
    for bit, build, constant in builders:
        hit = (flags & bit) != 0
        if not hit.any():
            continue
        if constant:
            msgs.constant(_spread(n, rows, hit), build(check, int(np.argmax(hit)), ctx_obj, units))
        else:
            where = np.nonzero(hit)[0]
            view = _ListView(check, where)
            msgs.per_row(rows[where], [build(view, j, ctx_obj, units) for j in range(len(where))])


class _ListView:
    """The check's arrays at some rows, as Python lists (fast to index one by one)."""

    def __init__(self, check, where: np.ndarray):
        self._check = check
        self._where = where

    def __getattr__(self, name: str):
        values = np.asarray(getattr(self._check, name))[self._where].tolist()
        setattr(self, name, values)
        return values


def _road(rows, num, ctx: BatchContext, out: _Outputs, status, util, msgs, later, errors) -> None:
    units, table, n = ctx.units, ctx.table, out.n
    v = units.speed_to_si(num["speed"].value[rows])
    r = units.length_to_si(num["radius"].value[rows])
    emax = num["emax"]
    e_max = np.where(emax.present[rows], emax.value[rows] / 100.0, table.emax_default)
    sup = num["superelevation"].value[rows] / 100.0
    fric = num["friction"].value[rows]
    check = road_engine.check_road(table, v, r, e_max, sup, fric)

    out.texts["units"].set(rows, out.units_code)
    out.texts["table"].set(rows, 0)
    out.put("e_max", rows, np.round(100 * check.e_max, 6))
    for key, values in road_columns(check, units).items():
        out.put(key, rows, round_significant(values))
    out.texts["cross_section"].set(rows, np.asarray(check.cross_section, dtype=np.int32))
    failed = np.asarray(check.failed)

    width = 3.6 if units.name == "metric" else units.length_to_si(12.0)
    t = tr.road_transition(table, v, r, check.superelevation, lane_width=width)
    t_values = {
        "spiral_length_min": t.spiral_length_min,
        "spiral_length_max": t.spiral_length_max,
        "length_comfort": t.length_comfort,
        "length_shift_min": t.length_shift_min,
        "length_shift_max": t.length_shift_max,
        "runoff": t.runoff,
        "runout": t.runout,
    }
    rounded = {k: round_significant(units.length_from_si(x)) for k, x in t_values.items()}
    rounded["relative_gradient"] = round_significant(100 * t.relative_gradient)
    for key, values in rounded.items():
        out.put(f"transition.{key}", rows, values)
    out.texts["transition.governing"].set(rows, np.asarray(t.governing, dtype=np.int32))
    t_failed = np.asarray(t.failed).copy()

    # geometry and the given spiral against the transition's range
    spiral_lines: dict[int, list[str]] = {}
    has_defl = num["deflection"].present[rows]
    ls = np.where(num["spiral"].present[rows], num["spiral"].value[rows], 0.0)
    _geometry(rows, has_defl, ls, num, ctx, out, errors, r)
    with_spiral = np.nonzero(has_defl & (ls > 0))[0]
    if len(with_spiral):
        given = units.length_from_si(units.length_to_si(ls[with_spiral]))
        lo = rounded["spiral_length_min"][with_spiral]
        hi = rounded["spiral_length_max"][with_spiral]
        with np.errstate(invalid="ignore"):
            off = np.nonzero((given < lo - 1e-9) | (given > hi + 1e-9))[0]
        positions = with_spiral[off]
        for pos, g, lo_j, hi_j, gov in zip(
            positions.tolist(),
            given[off].tolist(),
            lo[off].tolist(),
            hi[off].tolist(),
            np.asarray(t.governing)[positions].tolist(),
            strict=True,
        ):
            lo_j = None if math.isnan(lo_j) else lo_j
            hi_j = None if math.isnan(hi_j) else hi_j
            name = tr.ROAD_GOVERNING[gov]
            lines = bend_parts.road_spiral_messages("spiral in", g, lo_j, hi_j, name, units)
            lines += bend_parts.road_spiral_messages("spiral out", g, lo_j, hi_j, name, units)
            if lines:
                spiral_lines[int(rows[pos])] = lines
                t_failed[pos] = True
    out.texts["transition.status"].set(rows, np.where(t_failed, 1, 0))
    status[rows] = np.where(failed | t_failed, FAIL, PASS)

    f_ratio = check.side_friction_demand / check.side_friction_max
    with np.errstate(invalid="ignore", divide="ignore"):
        e_ratio = np.where(np.isnan(sup), np.nan, check.superelevation / check.e_max)
        util[rows] = np.fmax(np.fmax(check.min_radius / check.radius, f_ratio), e_ratio)

    flags = np.asarray(check.flags)
    _flag_messages(ROAD_MESSAGES, check, flags, rows, n, table, units, msgs)
    t_flags = np.asarray(t.flags)
    for bit, text in bend_parts.ROAD_TRANSITION_NOTES:
        target = msgs if text.startswith("FAIL") else later
        target.constant(_spread(n, rows, (t_flags & bit) != 0), f"transition: {text}")
    if spiral_lines:
        msgs.lists({i: [f"transition: {m}" for m in v] for i, v in spiral_lines.items()})


def _geometry(rows, has_defl, ls, num, ctx: BatchContext, out: _Outputs, errors, r_si) -> None:
    """Circular or spiral geometry for the rows that give a deflection."""
    units = ctx.units
    d_all = np.radians(num["deflection"].value[rows])

    def length(x):
        return round_places(units.length_from_si(np.asarray(x)))

    circ = np.nonzero(has_defl & (ls <= 0))[0]
    if len(circ):
        c = circular_curve(r_si[circ], d_all[circ])
        at = rows[circ]
        out.texts["geometry.type"].set(at, 0)
        for key in cols.CIRCULAR_KEYS:
            out.put(f"geometry.{key}", at, length(getattr(c, key)))
    spir = np.nonzero(has_defl & (ls > 0))[0]
    if len(spir):
        from curvetui.core.spiral import overlap_message, spiral_curve

        ls_si = units.length_to_si(ls[spir])
        s = spiral_curve(r_si[spir], d_all[spir], ls_si, ls_si)
        overlap = np.asarray(s.overlap)
        at = rows[spir]
        for j in np.nonzero(overlap)[0]:
            i, k = int(at[j]), spir[j]
            text = overlap_message(float(r_si[k]), float(d_all[k]), ls_si[j], ls_si[j])
            errors.add(i, f"{errors.name(i, 'spiral')}: {text}")
        ok = ~overlap
        at = at[ok]
        out.texts["geometry.type"].set(at, 1)
        out.put("geometry.spiral_angle", at, round_significant(np.degrees(s.theta_in[ok]), 9))
        for key, field in (
            ("xs", "xs_in"),
            ("ys", "ys_in"),
            ("p", "p_in"),
            ("k", "k_in"),
            ("total_tangent", "tangent_in"),
            ("external", "external"),
            ("circular_length", "circular_length"),
            ("total_length", "total_length"),
        ):
            out.put(f"geometry.{key}", at, length(np.asarray(getattr(s, field))[ok]))


def _rail(rows, num, ctx: BatchContext, out: _Outputs, status, util, msgs, later, errors) -> None:
    units, limits, n = ctx.units, ctx.limits, out.n
    v = units.speed_to_si(num["speed"].value[rows])
    r = units.length_to_si(num["radius"].value[rows])
    ea = num["cant"].value[rows] * units.cant
    low = units.speed_to_si(num["low_speed"].value[rows])
    gauge = num["gauge"]
    s = np.full(len(rows), limits.rail_centres)
    given = gauge.present[rows]
    if given.any():
        g = gauge.value[rows][given]
        uniq, inverse = np.unique(g, return_inverse=True)
        s[given] = np.array([rail_centres_for_gauge(float(x)) for x in uniq])[inverse]
    check = check_rail(limits, v, r, ea, low, s)

    out.texts["units"].set(rows, out.units_code)
    out.texts["limits"].set(rows, 0)
    values = rail_columns(check, units)
    for key in cols.RAIL_FIELDS:
        out.put(key, rows, round_significant(values[key]))
    if units.name == "us":
        r_ft = check.radius / FOOT
        out.put("degree_of_curve_arc", rows, np.round(5729.5779513 / r_ft, 6))
        out.put("degree_of_curve_chord", rows, np.round(2 * np.degrees(np.arcsin(50.0 / r_ft)), 6))
    failed = np.asarray(check.failed)

    t = tr.rail_transition_for(limits, check.cant, check.cant_deficiency, check.speed)
    lengths = {
        "length": t.length,
        "length_cant_gradient": t.length_cant_gradient,
        "length_cant_rate": t.length_cant_rate,
        "length_deficiency_rate": t.length_deficiency_rate,
    }
    rounded = {k: round_significant(units.length_from_si(x)) for k, x in lengths.items()}
    for key, vals in rounded.items():
        out.put(f"transition.{key}", rows, vals)
    gov = np.asarray(t.governing, dtype=np.int32)
    road_n = len(tr.ROAD_GOVERNING)
    out.texts["transition.governing"].set(
        rows, np.where(gov < 0, road_n + len(RAIL_GOVERNING) - 1, road_n + gov)
    )
    t_flags = np.asarray(t.flags)
    none = (t_flags & tr.FAIL_NONE_EVALUATED) != 0
    t_failed = np.zeros(len(rows), dtype=bool)

    has_defl = num["deflection"].present[rows]
    ls = np.where(num["spiral"].present[rows], num["spiral"].value[rows], 0.0)
    _geometry(rows, has_defl, ls, num, ctx, out, errors, np.asarray(check.radius))
    spiral_lines: dict[int, list[str]] = {}
    with_spiral = np.nonzero(has_defl & (ls > 0))[0]
    if len(with_spiral):
        given_ls = units.length_from_si(units.length_to_si(ls[with_spiral]))
        need = rounded["length"][with_spiral]
        with np.errstate(invalid="ignore"):
            short = given_ls < need - 1e-9
        for j in np.nonzero(short)[0]:
            pos = with_spiral[j]
            name_gov = RAIL_GOVERNING[int(gov[pos])]
            spiral_lines[int(rows[pos])] = [
                "transition: "
                + bend_parts.rail_spiral_message(
                    name, float(given_ls[j]), float(need[j]), name_gov, units.length_label
                )
                for name in ("spiral in", "spiral out")
            ]
            t_failed[pos] = True
    out.texts["transition.status"].set(rows, np.where(t_failed, 1, np.where(none, 2, 0)))
    status[rows] = np.where(failed | t_failed, FAIL, PASS)

    with np.errstate(invalid="ignore", divide="ignore"):
        util[rows] = np.fmax(
            np.fmax(check.cant_deficiency / check.deficiency_limit, check.cant / check.cant_limit),
            check.cant_excess / check.excess_limit,
        )

    _flag_messages(RAIL_MESSAGES, check, np.asarray(check.flags), rows, n, limits, units, msgs)
    if spiral_lines:
        msgs.lists(spiral_lines)
    for bit, text in bend_parts.RAIL_TRANSITION_NOTES:
        later.constant(_spread(n, rows, (t_flags & bit) != 0), f"transition: {text}")
