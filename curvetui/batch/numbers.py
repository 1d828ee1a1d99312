"""Text columns to checked numbers, a whole column at a time, and numbers rounded for output.

A column arrives as text (pyarrow strings). Blank cells are absent; other cells must be a
finite number (with a decimal comma too in a semicolon-separated file). Cells that are not
numbers or lie outside the allowed range are reported with the same words as the command
line's ``parse_number`` gives, built only for the cells at fault.
"""

from __future__ import annotations

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

from curvetui.inputs import InputError, parse_number

_NUMBER = r"^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$"


# what pyarrow's text-to-float cast raises on a cell it does not read as a number (the
# batch reader gives every column as text, so no other cast error can arise)
_CAST_ERRORS = (pa.ArrowInvalid,)


def _to_float(text: pa.Array) -> np.ndarray:
    """Float values of a text column (nulls and non-numbers become NaN): pyarrow's own
    cast first (the usual, fast case); a cell that spoils it sends the column the careful
    way (``_careful_float``)."""
    try:
        return pc.cast(text, pa.float64()).to_numpy(zero_copy_only=False)
    except _CAST_ERRORS:
        return _careful_float(text)


def _careful_float(text: pa.Array) -> np.ndarray:
    """Only cells of the number pattern cast (a leading + dropped, others NaN); should one
    still spoil the cast (e.g. 1e999, beyond a float), cell by cell as Python reads it."""
    ok = pc.match_substring_regex(text, _NUMBER)
    plain = pc.replace_substring_regex(pc.if_else(ok, text, None), r"^\+", "")
    try:
        return pc.cast(plain, pa.float64()).to_numpy(zero_copy_only=False)
    except _CAST_ERRORS:
        return np.array([np.nan if c is None else float(c) for c in plain.to_pylist()])


class NumberColumn:
    """One input column as numbers: ``value`` (NaN where blank or bad), ``present`` (a cell
    holds text), ``text`` (the trimmed cells) and ``bad`` (text that is not a finite number)."""

    def __init__(self, cells: pa.Array | None, n: int, decimal_comma: bool = False):
        if cells is None:
            self.text = None
            self.value = np.full(n, np.nan)
            self.present = np.zeros(n, dtype=bool)
            self.bad = np.zeros(n, dtype=bool)
            return
        text = pc.utf8_trim_whitespace(cells)
        if decimal_comma:
            text = pc.replace_substring(text, ",", ".")
        present = pc.not_equal(text, "")
        self.text = text
        self.present = present.to_numpy(zero_copy_only=False)
        value = _to_float(pc.if_else(present, text, None))
        with np.errstate(invalid="ignore"):
            finite = np.isfinite(value)
        self.bad = self.present & ~finite
        self.value = np.where(finite, value, np.nan)

    def cell(self, i: int) -> str:
        return "" if self.text is None else self.text[i].as_py()

    def outside(self, rows: np.ndarray, lo, hi, lo_open: bool = False) -> np.ndarray:
        """Mask of ``rows`` whose number lies outside [lo, hi] ((lo, hi] with lo_open);
        lo and hi may be arrays over all rows."""
        v = self.value
        lo = np.broadcast_to(np.asarray(lo, dtype=float), v.shape)
        hi = np.broadcast_to(np.asarray(hi, dtype=float), v.shape)
        with np.errstate(invalid="ignore"):
            out = (v < lo) | (v > hi) | ((v == lo) if lo_open else False)
        return rows & self.present & ~self.bad & out

    def message(self, i: int, field: str, lo: float, hi: float, unit: str, lo_open=False) -> str:
        """The command line's words for cell ``i`` (not a number, or out of range)."""
        try:
            parse_number(field, self.cell(i), lo, hi, unit, lo_open=lo_open)
        except InputError as exc:
            return str(exc)
        return f"{field}: cannot be used, got {self.cell(i)!r}"  # pragma: no cover


def _near_half(y: np.ndarray) -> np.ndarray:
    """Where a scaled value sits so close to a rounding tie (x.5) that the error of the
    scaling product may have moved it across: such cells are rounded by Python instead."""
    with np.errstate(invalid="ignore"):
        frac = y - np.floor(y)
        return np.abs(frac - 0.5) <= 4e-16 * np.maximum(np.abs(y), 1.0)


_POW10 = np.array([10.0**i for i in range(23)])  # 1e0 .. 1e22, each exact in a double


def round_significant(x, digits: int = 6) -> np.ndarray:
    """Each value rounded to ``digits`` significant figures, as float(f"{x:.{digits}g}") does
    (what a one-bend check prints); NaN and infinities pass through.

    Scaled by an exact power of ten and rounded to an integer m, the value is m / 10**k,
    which IEEE division rounds correctly; cells near a tie, or beyond 10**22 (no exact
    power of ten), are formatted one by one by Python, the reference.
    """
    x = np.asarray(x, dtype=float)
    out = x.copy()
    with np.errstate(invalid="ignore"):
        keep = np.isfinite(x) & (x != 0)
    a = np.abs(x[keep])
    e = np.floor(np.log10(a)).astype(np.int64)
    k = digits - 1 - e
    with np.errstate(over="ignore", invalid="ignore"):  # far cells are redone below
        scale = _POW10[np.minimum(np.abs(k), 22)]  # exact powers of ten, by look-up
        up = k >= 0
        y = np.where(up, a * scale, a / scale)
        m = np.rint(y)
        values = np.copysign(np.where(up, m / scale, m * scale), x[keep])
    slow = (np.abs(k) > 22) | _near_half(y)
    if slow.any():
        values[slow] = [float(f"{v:.{digits}g}") for v in x[keep][slow]]
    out[keep] = values
    return out


def round_places(x, places: int = 6) -> np.ndarray:
    """Values rounded to ``places`` decimals as Python's round(x, places) does (lengths and
    stations in a check's geometry); cells near a tie are rounded by Python itself."""
    x = np.asarray(x, dtype=float)
    scale = 10.0**places
    with np.errstate(invalid="ignore"):
        y = np.abs(x) * scale
        out = np.copysign(np.rint(y) / scale, x)
        slow = np.isfinite(x) & (_near_half(y) | (y > 2.0**52))
    if slow.any():
        out[slow] = [round(float(v), places) for v in x[slow]]
    return out
