"""A register's curves placed in series across chunks, on the batch's main thread.

A curve's place (``curvetui.core.curve_series``) depends on the two curves after it, which
may lie in the next chunk: the reader hands each chunk here, and gets back, in order, the
chunks whose every row has its place (``put``); the last ones come at the end of the file
(``rest``). Only the register's four columns are read here (pyarrow, whole columns); the
chunk is then checked on a worker thread as usual, with its places.
"""

from __future__ import annotations

import collections
from dataclasses import dataclass, field

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

from curvetui.batch.numbers import NumberColumn
from curvetui.bend.fields import DIRECTIONS, REGISTER_BY_KEY
from curvetui.bend.parse import to_number
from curvetui.core.curve_series import FEATURE_AGAIN, SeriesScanner


@dataclass
class _Held:
    batch: pa.RecordBatch
    rows: np.ndarray
    bad: list
    missing: int
    again: np.ndarray | None = None  # rows whose feature came earlier, others between
    parts: list = field(default_factory=list)


class SeriesHold:
    """Chunks held until their rows' places are known (see the module's docstring)."""

    def __init__(self, header, ctx, limit_si: float):
        self.known = header.known
        self.ctx = ctx
        self.scanner = SeriesScanner(limit_si)
        self.queue: collections.deque[_Held] = collections.deque()
        self._run = 0  # feature run number of the last row read
        self._last: str | None = None  # its feature's text
        self._seen: set[str] = set()  # every feature read so far

    @classmethod
    def for_file(cls, header, ctx) -> SeriesHold | None:
        """A hold for a file with a begin_station column (a register), else None."""
        if "begin_station" not in header.known:
            return None
        from curvetui.storage.sign_tables import sign_table

        return cls(header, ctx, sign_table().series_tangent_si)

    def put(self, batch: pa.RecordBatch, rows: np.ndarray, bad: list) -> list[tuple]:
        """Hold this chunk; (batch, rows, bad, places) of every chunk now complete."""
        held = _Held(batch, rows, bad, batch.num_rows)
        self.queue.append(held)
        if batch.num_rows:
            runs, begin, end, direction, held.again = self._register(batch)
            self._give(self.scanner.push(runs, begin, end, direction))
        return self._ready()

    def rest(self) -> list[tuple]:
        """Every chunk still held, with its places (the file has ended)."""
        self._give(self.scanner.finish())
        return self._ready()

    def _give(self, places: np.ndarray) -> None:
        at = 0
        for held in self.queue:
            if at >= len(places):
                break
            if held.missing:
                take = places[at : at + held.missing]
                held.parts.append(take)
                held.missing -= len(take)
                at += len(take)

    def _ready(self) -> list[tuple]:
        out = []
        while self.queue and self.queue[0].missing == 0:
            h = self.queue.popleft()
            places = np.concatenate(h.parts) if h.parts else np.zeros(0, np.int8)
            if h.again is not None and h.again.any():
                places = places | np.where(h.again, FEATURE_AGAIN, 0).astype(np.int8)
            out.append((h.batch, h.rows, h.bad, places))
        return out

    def _register(self, batch: pa.RecordBatch):
        """(feature run numbers, begin [m], end [m], direction code, feature again) of a
        chunk's rows; NaN where a value is missing or bad, and on rows that are not road
        curves."""
        n = batch.num_rows
        kind = pc.utf8_lower(pc.utf8_trim_whitespace(batch.column(self.known["kind"])))
        road = pc.equal(kind, "road").to_numpy(zero_copy_only=False).astype(bool)
        begin = np.where(road, self._station("begin_station", batch), np.nan)
        end = self._station("end_station", batch)
        direction = np.full(n, np.nan)
        if "direction" in self.known:
            text = pc.utf8_lower(pc.utf8_trim_whitespace(batch.column(self.known["direction"])))
            codes = pc.index_in(text, value_set=pa.array(DIRECTIONS, pa.string()))
            direction = codes.to_numpy(zero_copy_only=False).astype(float)
        runs, again = self._feature_runs(batch)
        return runs, begin, end, direction, again

    def _feature_runs(self, batch: pa.RecordBatch) -> tuple[np.ndarray, np.ndarray]:
        """Run numbers of the feature column: neighbours of one feature share a number,
        across chunks too (no column: every row one feature); and the rows where a feature
        read before comes again after others."""
        n = batch.num_rows
        again = np.zeros(n, bool)
        if "feature" not in self.known:
            return np.zeros(n, np.int64), again
        text = pc.utf8_trim_whitespace(batch.column(self.known["feature"]))
        change = np.ones(n, bool)
        change[0] = self._last is None or text[0].as_py() != self._last
        if n > 1:
            same = pc.equal(text.slice(1), text.slice(0, n - 1))
            change[1:] = ~same.to_numpy(zero_copy_only=False).astype(bool)
        runs = self._run + np.cumsum(change)
        for i in np.nonzero(change)[0]:  # one look-up per run of a feature
            name = text[int(i)].as_py()
            again[i] = name in self._seen
            self._seen.add(name)
        self._run, self._last = int(runs[-1]), text[n - 1].as_py()
        return runs, again

    def _station(self, key: str, batch: pa.RecordBatch) -> np.ndarray:
        """A station column [m] (2+710.5 read cell by cell); NaN where blank, bad or
        outside the field's range."""
        pos = self.known.get(key)
        n = batch.num_rows
        if pos is None:
            return np.full(n, np.nan)
        units = self.ctx.units
        num = NumberColumn(batch.column(pos), n, self.ctx.decimal_comma)
        value = num.value.copy()
        for i in np.nonzero(num.bad)[0]:
            value[i] = to_number(num.cell(int(i)), True, units.name)
        f = REGISTER_BY_KEY[key]
        lo, hi = f.ranges["road"]
        si = f.to_si(value, units)
        with np.errstate(invalid="ignore"):
            return np.where((si >= lo) & (si <= hi), si, np.nan)
