"""One chunk of a batch file through the one bend path: text columns in, result columns out.

The chunk's text cells become number columns here (pyarrow, whole columns at once); the
checking itself is ``curvetui.bend.service.check_columns``, the same path a single bend
takes. Values are rounded as the JSON record rounds them, only here where they are written.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from functools import cached_property

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

from curvetui.batch import columns as cols
from curvetui.batch.numbers import NumberColumn, round_places, round_significant
from curvetui.bend import outputs as out
from curvetui.bend.evaluate import ERROR, FAIL, PASS, STATUS_NAMES  # noqa: F401 (re-exported)
from curvetui.bend.fields import BY_KEY, STATION
from curvetui.bend.messages import message_parts
from curvetui.bend.parse import Column, Kinds, to_number
from curvetui.bend.series_signs import series_signs
from curvetui.bend.service import check_columns
from curvetui.core.rail import RailLimits
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem


@dataclass(frozen=True)
class BatchContext:
    """What every chunk of one file shares: units, table, limits and the file's headers."""

    units: UnitSystem
    table: RoadTable
    limits: RailLimits
    headers: Mapping[str, str]  # known column (lower case) -> its header in the file
    decimal_comma: bool = False

    @cached_property
    def written(self) -> frozenset[str]:
        """The result columns this file gets (see columns.results_for)."""
        return frozenset(cols.result_names(list(self.headers)))

    def column(self, key: str) -> str:
        """The file's header for a field (or the column name itself)."""
        for name, field_key in cols.FIELD_OF_COLUMN.items():
            if field_key == key and name in self.headers:
                return self.headers[name]
        return self.headers.get(key, key)


MESSAGE_ITEM = pa.struct([("severity", pa.string()), ("line", pa.string())])


@dataclass
class ChunkResult:
    """Result columns of one chunk (pyarrow arrays by result name) and per-row summaries;
    ``items`` holds each row's messages as a list of (severity, line), for readers that
    want them one by one (the app) rather than joined in the CSV cell."""

    columns: dict[str, pa.Array]
    status: np.ndarray  # PASS, FAIL or ERROR per row
    utilisation: np.ndarray  # largest demand / limit of the main check; NaN for errors
    is_rail: np.ndarray
    items: pa.Array | None = None


def _items(n: int, pieces: list[tuple[np.ndarray, str, list[str] | str]]) -> pa.Array:
    """Per-row lists of (severity, line) from (rows, severity, texts) pieces, in piece order."""
    if not pieces:
        return pa.array([[] for _ in range(n)], pa.list_(MESSAGE_ITEM))
    rows = np.concatenate([p[0] for p in pieces])
    order_in = np.concatenate([np.full(len(p[0]), k) for k, p in enumerate(pieces)])
    sev = np.concatenate([np.full(len(p[0]), p[1], dtype=object) for p in pieces])
    text = np.concatenate(
        [
            np.full(len(p[0]), p[2], dtype=object)
            if isinstance(p[2], str)
            else np.asarray(p[2], dtype=object)
            for p in pieces
        ]
    )
    order = np.lexsort((order_in, rows))
    offsets = np.concatenate([[0], np.cumsum(np.bincount(rows, minlength=n))]).astype(np.int32)
    values = pa.StructArray.from_arrays(
        [pa.array(sev[order], pa.string()), pa.array(text[order], pa.string())],
        fields=list(MESSAGE_ITEM),
    )
    return pa.ListArray.from_arrays(pa.array(offsets), values)


def _column(cells: pa.Array | None, n: int, key: str, ctx: BatchContext) -> Column:
    choices = BY_KEY[key].choices
    if choices and cells is not None:  # a word of the field's choices, any case: its code
        text = pc.utf8_lower(pc.utf8_trim_whitespace(cells))
        present = pc.fill_null(pc.not_equal(text, ""), False).to_numpy(zero_copy_only=False)
        codes = pc.index_in(text, value_set=pa.array(choices, pa.string()))
        value = codes.to_numpy(zero_copy_only=False).astype(float)  # null: NaN
        bad = present & np.isnan(value)
        return Column(value, present, bad, lambda i: cells[i].as_py() or "")
    num = NumberColumn(cells, n, ctx.decimal_comma)
    if BY_KEY[key].unit == STATION and num.bad.any():  # 2+710.5: read cell by cell
        for i in np.nonzero(num.bad)[0]:
            num.value[i] = to_number(num.cell(int(i)), True, ctx.units.name)
        with np.errstate(invalid="ignore"):
            num.bad = num.present & ~np.isfinite(num.value)
    return Column(num.value, num.present, num.bad, num.cell)


class _Messages:
    """Messages as columns of text, one per reason (null where a row lacks it), joined
    with "; " in the order they were added."""

    def __init__(self, n: int):
        self.n = n
        self.parts: list[pa.Array] = []

    def add(self, rows: np.ndarray, texts: list[str] | str) -> None:
        mask = np.zeros(self.n, dtype=bool)
        mask[rows] = True
        if isinstance(texts, str):
            self.parts.append(pc.if_else(pa.array(mask), texts, pa.scalar(None, pa.string())))
        else:
            self.parts.append(
                pc.replace_with_mask(
                    pa.nulls(self.n, pa.string()), pa.array(mask), pa.array(texts, pa.string())
                )
            )

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


def _rounded(key: str, values: np.ndarray) -> np.ndarray:
    """The column rounded as JSON rounds it."""
    if np.isnan(values).all():  # a column no row of this chunk has (rail in a road chunk)
        return values
    rule = out.BY_KEY[key].rounding
    if rule == out.PLACES:
        return round_places(values)
    return round_significant(values, 9 if rule == out.ANGLE else 6)


def _without(piece, mask: np.ndarray):
    """A message piece less the rows of ``mask``."""
    rows, severity, texts = piece
    keep = ~mask[rows]
    if not isinstance(texts, str):
        texts = list(np.asarray(texts, dtype=object)[keep])
    return rows[keep], severity, texts


def evaluate_chunk(
    cells: Mapping[str, pa.Array],
    row_numbers: np.ndarray,
    ctx: BatchContext,
    items: bool = False,
    series: np.ndarray | None = None,
) -> ChunkResult:
    """Check one chunk. ``cells`` maps known column names (lower case) to text columns;
    ``row_numbers`` are the rows as a spreadsheet numbers them (the header is row 1);
    ``series`` each row's place among its neighbours in a register (curvetui.batch.series)."""
    n = len(row_numbers)
    columns = {}
    for name, array in cells.items():
        key = cols.FIELD_OF_COLUMN.get(name)
        if key is not None and key not in columns:
            columns[key] = _column(array, n, key, ctx)
    kind_cells = cells["kind"]
    kind_text = pc.utf8_lower(pc.utf8_trim_whitespace(kind_cells))
    kinds = Kinds(
        pc.equal(kind_text, "road").to_numpy(zero_copy_only=False).astype(bool),
        pc.equal(kind_text, "rail").to_numpy(zero_copy_only=False).astype(bool),
        lambda i: kind_cells[i].as_py() or "",
    )
    ev = check_columns(kinds, columns, ctx.units, ctx.table, ctx.limits)
    if series is not None:
        series_signs(ev, series)

    result: dict[str, pa.Array] = {}
    known = ev.status != ERROR
    for name in ("units", "table", "limits"):
        text = {"units": ctx.units.name, "table": ctx.table.name, "limits": ctx.limits.name}[name]
        applies = known & (
            ev.parsed.is_rail
            if name == "limits"
            else ev.parsed.is_road
            if name == "table"
            else True
        )
        result[name] = pc.if_else(pa.array(applies), text, pa.scalar(None, pa.string()))
    for name, _kind in cols.RESULTS:
        if name not in ctx.written:
            continue
        if name in ev.texts:
            result[name] = pa.array(ev.texts[name], pa.string())
        elif name in ev.values:
            values = _rounded(name, ev.values[name])
            result[name] = pa.array(values, mask=np.isnan(values))
        elif _kind == cols.FLOAT:  # no row of this chunk has it
            result[name] = pa.nulls(n, pa.float64())

    def column_name(key: str) -> str:
        return f"column {ctx.column(key)}"

    messages = _Messages(n)
    pieces: list[tuple[np.ndarray, str, list[str] | str]] = []
    for part in message_parts(ev, column_name):
        prefix = f"{part.rule.part}: " if part.rule.part else ""
        word = {"fail": "FAIL", "warning": "WARNING", "note": "NOTE"}[part.rule.severity]
        if isinstance(part.texts, str):
            lines: list[str] | str = f"{prefix}{word} {part.texts}"
        else:
            lines = [f"{prefix}{word} {t}" for t in part.texts]
        messages.add(part.rows, lines)
        pieces.append((part.rows, part.rule.severity, lines))
    joined = messages.array()
    if ev.issues:
        by_row: dict[int, list[str]] = {}
        for issue in ev.issues:
            row = int(row_numbers[issue.row])
            by_row.setdefault(issue.row, []).append(
                issue.format(lambda k, r=row: f"ERROR row {r}, column {ctx.column(k)}", column_name)
            )
        rows = np.array(sorted(by_row), dtype=np.int64)
        mask = np.zeros(n, dtype=bool)
        mask[rows] = True
        texts = pa.array(["; ".join(by_row[int(i)]) for i in rows], pa.string())
        joined = pc.replace_with_mask(joined, pa.array(mask), texts)
        # an error row lists its input problems only
        pieces = [
            (r[~mask[r]], s, t if isinstance(t, str) else list(np.asarray(t, object)[~mask[r]]))
            for r, s, t in pieces
        ]
        for i in rows:
            pieces.append((np.full(len(by_row[int(i)]), i), "error", by_row[int(i)]))
    result["row"] = pa.array(np.asarray(row_numbers, dtype=np.int64))
    result["status"] = pc.take(pa.array(STATUS_NAMES), pa.array(ev.status.astype(np.int32)))
    result["messages"] = joined
    return ChunkResult(
        columns=result,
        status=ev.status,
        utilisation=ev.utilisation(),
        is_rail=ev.parsed.is_rail,
        items=_items(n, pieces) if items else None,
    )
