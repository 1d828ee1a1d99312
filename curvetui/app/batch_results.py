"""The state behind the batch-results screen, with no Textual in it: the rows kept from a
batch run (failures first, a bounded number), their filter and order, and one row turned
back into the inputs of a one-bend check for its worksheet.

The batch engine (curvetui.batch.stream.run_batch) does the checking; this module only
picks columns out of its output tables and keeps some of its rows.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

from curvetui.batch import columns as cols
from curvetui.batch.header import HEAD_BYTES, BatchFileError, Header, read_header
from curvetui.batch.output import MESSAGE_ITEMS
from curvetui.batch.summary import Summary
from curvetui.bend.service import evaluate_bend
from curvetui.core.rail import RailLimits
from curvetui.core.road_table import RoadTable
from curvetui.core.units import UnitSystem
from curvetui.inputs import InputError

ROW_LIMIT = 5000  # rows held for the table; `curvetui batch` writes every row
STATUSES = ("fail", "error", "pass")  # the default order: failures first
STATUS_RANK = {s: i for i, s in enumerate(STATUSES)}

# result columns read from the batch output (by their result names in columns.RESULT_NAMES)
RESULT_KEYS = (
    "side_friction_demand",
    "side_friction_max",
    "min_radius",
    "cant_deficiency",
    "deficiency_limit",
    "safe_speed",
    "max_speed",
)

# CSV column (lower case) -> input name of curvetui.bend.fields, per kind
ROAD_INPUT_COLUMNS = {
    "speed": "speed",
    "radius": "radius",
    "superelevation": "superelevation",
    "emax": "emax",
    "friction": "friction",
    "deflection": "deflection",
    "spiral": "spiral_in",
}
RAIL_INPUT_COLUMNS = {
    "speed": "speed",
    "radius": "radius",
    "cant": "cant",
    "low_speed": "low_speed",
    "gauge": "gauge",
    "deflection": "deflection",
    "spiral": "spiral_in",
}


@dataclass(frozen=True)
class Column:
    """A column of the results table: its key, its header and how it sorts."""

    key: str
    label: str
    numeric: bool = True


def table_columns(units: UnitSystem) -> tuple[Column, ...]:
    """The columns shown, headers carrying the user's units."""
    v, length, cant = units.speed_label, units.length_label, units.cant_label
    return (
        Column("row", "Row"),
        Column("id", "Id", numeric=False),
        Column("kind", "Kind", numeric=False),
        Column("status", "Check", numeric=False),
        Column("speed", f"V {v}"),
        Column("radius", f"R {length}"),
        Column("f", "f"),
        Column("f_max", "f max"),
        Column("r_min", f"R min {length}"),
        Column("d", f"D {cant}"),
        Column("d_max", f"D max {cant}"),
        Column("v_safe", f"V safe {v}"),
        Column("reason", "First reason", numeric=False),
    )


@dataclass
class ResultRow:
    """One bend of the batch output as the table holds it."""

    row: int
    status: str
    ident: str
    kind: str
    cells: dict[str, str]  # known input column (lower case) -> cell text as read
    values: dict[str, float | None]  # RESULT_KEYS -> value (None where blank)
    messages: str  # the CSV cell, joined: searched by the filter, never split
    items: tuple[tuple[str, str], ...] = ()  # (severity, line) of each message, in order
    decimal_comma: bool = False  # the file writes 12,5 for 12.5 (semicolon-separated)
    _search: str = field(default="", repr=False)

    @property
    def message_list(self) -> list[str]:
        return [line for _, line in self.items]

    @property
    def first_message(self) -> str:
        """The first failure's line on a failing row, else the first line."""
        if self.status == "fail":
            fails = [line for sev, line in self.items if sev == "fail"]
            if fails:
                return fails[0]
        return self.items[0][1] if self.items else ""

    def matches(self, text: str) -> bool:
        """Filter text found (any case) in the id, the status or the messages."""
        if not self._search:
            self._search = f"{self.ident}\n{self.status}\n{self.messages}".casefold()
        return text.casefold() in self._search

    def value(self, key: str):
        """A shown column's value, for sorting: a number, text, or None when blank."""
        if key == "row":
            return self.row
        if key == "id":
            return self.ident
        if key == "kind":
            return self.kind
        if key == "status":
            return STATUS_RANK.get(self.status, len(STATUSES))
        if key == "reason":
            return self.first_message
        if key in ("speed", "radius"):
            return _number(self.cells.get(key, ""), self.decimal_comma)
        if key == "v_safe":
            safe = self.values.get("safe_speed")
            return safe if safe is not None else self.values.get("max_speed")
        source = {
            "f": "side_friction_demand",
            "f_max": "side_friction_max",
            "r_min": "min_radius",
            "d": "cant_deficiency",
            "d_max": "deficiency_limit",
        }[key]
        return self.values.get(source)


def _number(text: str, decimal_comma: bool) -> float | str | None:
    t = text.strip()
    if not t:
        return None
    try:
        x = float(t.replace(",", ".") if decimal_comma else t)
    except ValueError:
        return t
    return x if math.isfinite(x) else t


@dataclass(frozen=True)
class BatchSource:
    """A CSV file and what it is checked with."""

    path: Path
    units: UnitSystem
    table: RoadTable
    limits: RailLimits
    header: Header

    @property
    def decimal_comma(self) -> bool:
        return self.header.decimal_comma

    def column_name(self, key: str) -> str:
        """The header of a known input column as the file writes it."""
        pos = self.header.known.get(key)
        return key if pos is None else self.header.names[pos].strip()


def open_source(path: str | Path, units, table, limits) -> BatchSource:
    """Read the header of a CSV file; BatchFileError if it cannot be used, OSError if it
    cannot be read (missing, a folder, no permission)."""
    p = Path(path)
    with open(p, "rb") as fh:
        head = fh.read(HEAD_BYTES) or b""
    return BatchSource(p, units, table, limits, read_header(head))


class RowKeeper:
    """The ``on_table`` callback of run_batch: keeps, of each status, the ``limit`` rows with
    the lowest row numbers, so memory stays bounded whatever the file's length."""

    def __init__(self, source: BatchSource, limit: int = ROW_LIMIT):
        self.source = source
        self.limit = limit
        self.kept: dict[str, list[ResultRow]] = {s: [] for s in STATUSES}
        width = len(source.header.names)
        names = cols.result_names(list(source.header.names))
        self._at = {name: width + i for i, name in enumerate(names)}

    def __call__(self, table: pa.Table) -> None:
        if table.num_rows == 0:
            return
        status = table.column(self._at["status"])
        rows = table.column(self._at["row"]).to_numpy()
        for name in STATUSES:
            mask = pc.equal(status, name).to_numpy(zero_copy_only=False)
            kept = self.kept[name]
            if len(kept) >= self.limit:
                mask &= rows < kept[-1].row  # only rows before the last kept can enter
            where = np.nonzero(mask)[0]
            if not len(where):
                continue
            where = where[np.argsort(rows[where], kind="stable")][: self.limit]
            kept += self._rows(table.take(pa.array(where)))
            kept.sort(key=lambda r: r.row)
            del kept[self.limit :]

    def _rows(self, part: pa.Table) -> list[ResultRow]:
        known = self.source.header.known
        cells = {key: part.column(pos).to_pylist() for key, pos in known.items()}
        values = {key: part.column(self._at[key]).to_pylist() for key in RESULT_KEYS}
        rows = part.column(self._at["row"]).to_pylist()
        status = part.column(self._at["status"]).to_pylist()
        messages = part.column(self._at["messages"]).to_pylist()
        names = part.column_names
        items = (
            part.column(MESSAGE_ITEMS).to_pylist()
            if MESSAGE_ITEMS in names
            else [[] for _ in range(part.num_rows)]
        )
        out = []
        for i in range(part.num_rows):
            row_cells = {key: (cells[key][i] or "") for key in known}
            kind = row_cells.get("kind", "").strip()
            out.append(
                ResultRow(
                    row=int(rows[i]),
                    status=status[i],
                    ident=row_cells.get("id", "").strip(),
                    kind=kind.lower() if kind.lower() in ("road", "rail") else kind,
                    cells=row_cells,
                    values={key: values[key][i] for key in RESULT_KEYS},
                    messages=messages[i] or "",
                    items=tuple((m["severity"], m["line"]) for m in items[i] or ()),
                    decimal_comma=self.source.decimal_comma,
                )
            )
        return out

    def rows(self) -> list[ResultRow]:
        """At most ``limit`` rows: failures, then errors, then passes, each by row number."""
        out: list[ResultRow] = []
        for name in STATUSES:
            out += self.kept[name][: self.limit - len(out)]
        return out


@dataclass
class Held:
    """What the table holds of a finished run: the rows and the run's summary."""

    rows: list[ResultRow]
    summary: Summary
    limit: int

    def held(self, status: str) -> int:
        return sum(1 for r in self.rows if r.status == status)

    @property
    def complete(self) -> bool:
        return len(self.rows) >= self.summary.rows

    def total(self, status: str) -> int:
        s = self.summary
        return {"pass": s.passed, "fail": s.failed, "error": s.errors}[status]


def visible(rows: list[ResultRow], text: str = "", only: str | None = None) -> list[ResultRow]:
    """The rows that pass the filter text and the status filter (None: every status)."""
    text = text.strip()
    return [r for r in rows if (only is None or r.status == only) and (not text or r.matches(text))]


def ordered(rows: list[ResultRow], key: str | None, reverse: bool = False) -> list[ResultRow]:
    """Rows sorted by a shown column (None: failures first, then by row). In a column of
    numbers, cells that are not numbers come after them and blank cells last, either way;
    ties keep the failures-first order."""
    base = sorted(rows, key=lambda r: (STATUS_RANK.get(r.status, 9), r.row))
    if key is None:
        return base[::-1] if reverse else base
    numbers, texts, blank = [], [], []
    for r in base:
        v = r.value(key)
        (blank if v is None else texts if isinstance(v, str) else numbers).append(r)
    numbers.sort(key=lambda r: r.value(key), reverse=reverse)
    texts.sort(key=lambda r: r.value(key).casefold(), reverse=reverse)
    return numbers + texts + blank


# -- one row back to a one-bend check --------------------------------------------------------


@dataclass
class RowSheet:
    """A row checked again as one bend: its record, or the reason it cannot be."""

    kind: str
    inputs: dict[str, str]  # input name of curvetui.bend.fields -> text
    record: dict | None = None
    error: str | None = None


def bend_inputs(row: ResultRow, source: BatchSource) -> tuple[str, dict[str, str]]:
    """The kind and the inputs of a row, as curvetui.bend.fields names them (blank cells left out;
    a decimal comma read as a point in a semicolon-separated file, as the batch does)."""
    kind = row.kind
    mapping = RAIL_INPUT_COLUMNS if kind == "rail" else ROAD_INPUT_COLUMNS
    raw: dict[str, str] = {}
    for column, name in mapping.items():
        text = row.cells.get(column, "").strip()
        if source.decimal_comma:
            text = text.replace(",", ".")
        if text:
            raw[name] = text
    return kind, raw


def evaluate_row(row: ResultRow, source: BatchSource) -> RowSheet:
    """The row's full record from curvetui.bend.service.evaluate_bend; messages name the file's
    columns. A row the batch marked as an error is not evaluated: its messages stand."""
    kind, raw = bend_inputs(row, source)
    sheet = RowSheet(kind, raw)
    if row.status == "error":
        sheet.error = row.messages
        return sheet
    by_input = {v: k for k, v in {**ROAD_INPUT_COLUMNS, **RAIL_INPUT_COLUMNS}.items()}

    def name(key: str) -> str:
        column = by_input.get(key)
        return f"column {source.column_name(column)}" if column else key

    try:
        sheet.record = evaluate_bend(kind, raw, source.units, source.table, source.limits, name)
    except InputError as exc:
        sheet.error = str(exc)
    return sheet


__all__ = [
    "BatchFileError",
    "BatchSource",
    "Held",
    "ROW_LIMIT",
    "ResultRow",
    "RowKeeper",
    "RowSheet",
    "bend_inputs",
    "evaluate_row",
    "open_source",
    "ordered",
    "table_columns",
    "visible",
]
