"""The Python API: check bends on scalars, numpy arrays, pyarrow Tables or pandas DataFrames.

Every function runs the one path (parse -> evaluate -> record) of ``curvetui.bend``;
results are unrounded, in the user's units, under the JSON keys of ``curvetui check``.

>>> from curvetui.api import check_road
>>> r = check_road(speed=100, radius=400, emax=8)     # km/h, m, percent
>>> r["status"][0], round(float(r["min_radius"][0]), 1)
('pass', 393.7)

``check_table`` is the function a dataframe engine wraps to check its own partitions
(neither engine is a dependency of curvetui)::

    # Spark
    df.mapInArrow(lambda batches: (check_table(b) for b in batches), schema=...)
    # Dask
    ddf.map_partitions(check_table)

CAUTION: local road or rail authority standards govern; results must be checked by a
qualified engineer before use (``curvetui.CAUTION``).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np

from curvetui.bend.evaluate import STATUS_NAMES, Evaluation
from curvetui.bend.fields import BY_KEY
from curvetui.bend.messages import SEVERITY_WORDS, message_parts
from curvetui.bend.outputs import OUTPUTS, TEXT
from curvetui.bend.parse import Column, column_for
from curvetui.bend.service import check_columns
from curvetui.core.units import unit_system


def _column(values: Any, n: int, key: str, units: str) -> Column:
    """A column of numbers (NaN or None = blank) or text, broadcast to n rows."""
    arr = np.asarray(values)
    if arr.ndim == 0:
        arr = np.full(n, arr.item(), dtype=arr.dtype)
    if arr.dtype.kind in "fiu" and not BY_KEY[key].choices:
        value = arr.astype(float)
        present = ~np.isnan(value)
        bad = present & ~np.isfinite(value)
        texts = arr
        return Column(np.where(bad, np.nan, value), present, bad, lambda i: str(texts[i]))
    return column_for(key, list(arr), units)


def _context(units: str, table, limits):
    from curvetui.storage.tables import rail_limits, road_table

    u = unit_system(units)
    t = table if table is not None and not isinstance(table, str) else road_table(table, u.name)
    lim = (
        limits
        if limits is not None and not isinstance(limits, str)
        else rail_limits(limits, u.name)
    )
    return u, t, lim


def _results(ev: Evaluation) -> dict[str, np.ndarray]:
    """Unrounded result columns, then status and the messages joined with "; "."""
    out: dict[str, np.ndarray] = {}
    for o in OUTPUTS:  # every key, so each batch of a table gets the same columns
        out[o.key] = ev.texts[o.key] if o.rounding == TEXT else ev.values[o.key]
    words = np.asarray(["pass", "fail", None], dtype=object)  # index -1: does not apply
    for name, verdict in ev.checks.items():
        out[f"checks.{name}"] = words[verdict]
    out["status"] = np.asarray(STATUS_NAMES, dtype=object)[ev.status]
    lines = np.full(ev.n, "", dtype=object)
    for part in message_parts(ev, lambda key: key):
        prefix = f"{part.rule.part}: " if part.rule.part else ""
        word = SEVERITY_WORDS[part.rule.severity]
        texts = part.texts if not isinstance(part.texts, str) else [part.texts] * len(part.rows)
        for i, text in zip(part.rows.tolist(), texts, strict=True):
            line = f"{prefix}{word} {text}"
            lines[i] = line if not lines[i] else f"{lines[i]}; {line}"
    for issue in ev.issues:
        line = "ERROR " + issue.format(lambda key: key)
        lines[issue.row] = line if not lines[issue.row] else f"{lines[issue.row]}; {line}"
    out["messages"] = lines
    return out


def check_bends(
    kind: Any,
    inputs: Mapping[str, Any],
    units: str = "metric",
    table=None,
    limits=None,
) -> dict[str, np.ndarray]:
    """Check n bends given as columns by input name (``curvetui.bend.fields``); ``kind``
    is "road", "rail" or a column of them. Returns result columns by JSON key."""
    lengths = [np.size(v) for v in inputs.values() if np.ndim(v) > 0]
    lengths += [np.size(kind)] if np.ndim(kind) > 0 else []
    n = max(lengths, default=1)
    u, t, lim = _context(units, table, limits)
    kinds = np.broadcast_to(np.asarray(kind, dtype=str), (n,))
    columns = {k: _column(v, n, k, u.name) for k, v in inputs.items() if k in BY_KEY}
    return _results(check_columns(kinds, columns, u, t, lim))


def check_road(units: str = "metric", table=None, **inputs) -> dict[str, np.ndarray]:
    """Road bends: ``speed``, ``radius`` and any other road input, scalars or arrays."""
    return check_bends("road", inputs, units, table, None)


def check_rail(units: str = "metric", limits=None, **inputs) -> dict[str, np.ndarray]:
    """Rail curves: ``speed``, ``radius``, ``cant`` and any other rail input."""
    return check_bends("rail", inputs, units, None, limits)


def check_table(data, units: str = "metric", table=None, limits=None):
    """A pyarrow Table (or RecordBatch) or pandas DataFrame of bends, returned with the
    result columns added (same type). Columns are found by input name, any case; ``kind``
    is required. Result names an input already uses get the prefix ``check.``."""
    names = list(data.column_names if hasattr(data, "column_names") else data.columns)
    lower = {str(c).strip().lower(): c for c in names}
    from curvetui.batch.columns import FIELD_OF_COLUMN

    def values(name):
        col = data[name] if not hasattr(data, "column") else data.column(name)
        if hasattr(col, "to_numpy"):
            try:
                return col.to_numpy(zero_copy_only=False)
            except TypeError:
                return col.to_numpy()
        return np.asarray(col)

    if "kind" not in lower:
        raise ValueError("check_table: a column named 'kind' (road or rail) is required")
    inputs = {FIELD_OF_COLUMN[k]: values(c) for k, c in lower.items() if k in FIELD_OF_COLUMN}
    kinds = np.array([str(x) if x is not None else "" for x in values(lower["kind"])])
    results = check_bends(kinds, inputs, units, table, limits)
    taken = set(lower)
    named = {(f"check.{k}" if k in taken else k): v for k, v in results.items()}
    if hasattr(data, "column_names"):
        import pyarrow as pa

        arrays = [data.column(c) for c in names]
        for v in named.values():
            mask = None if v.dtype == object else np.isnan(v)
            arrays.append(pa.array(v, mask=mask) if mask is not None else pa.array(list(v)))
        return pa.Table.from_arrays(arrays, names=[*names, *named])
    import pandas as pd

    # one concat, not a column at a time (pandas warns of a fragmented frame past 100)
    kept = data.drop(columns=[c for c in named if c in data.columns])
    return pd.concat([kept, pd.DataFrame(named, index=data.index)], axis=1)
