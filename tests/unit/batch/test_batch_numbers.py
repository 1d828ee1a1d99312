"""Whole-column rounding and number parsing of batch mode, against Python's own decimal
formatting and float() (the language's correctly rounded conversions are the reference).

Source of the expected values: the Python 3 standard library itself, not this project:
``format(x, ".6g")`` (Format Specification Mini-Language, correctly rounded per IEEE 754),
built-in ``round(x, 6)`` and ``float(text)`` (Python docs, Built-in Functions).
"""

from __future__ import annotations

import re

import numpy as np
import pyarrow as pa
from hypothesis import given, settings
from hypothesis import strategies as st

from curvetui.batch.numbers import NumberColumn, round_places, round_significant

finite = st.floats(allow_nan=False, allow_infinity=False, min_value=-1e12, max_value=1e12)


@settings(max_examples=400, deadline=None)
@given(st.lists(finite, min_size=1, max_size=50))
def test_round_significant_equals_python_g_format(values):
    got = round_significant(np.array(values))
    want = [float(f"{v:.6g}") for v in values]
    assert got.tolist() == want


@settings(max_examples=200, deadline=None)
@given(st.lists(st.floats(min_value=-1e6, max_value=1e6, allow_nan=False), min_size=1))
def test_round_places_equals_python_round(values):
    assert round_places(np.array(values)).tolist() == [round(v, 6) for v in values]


def test_round_significant_keeps_nan_and_zero():
    out = round_significant(np.array([np.nan, 0.0, -0.0, np.inf]))
    assert np.isnan(out[0]) and out[1] == 0.0 and out[3] == np.inf


def test_number_column_reads_what_float_reads():
    cells = ["12", " 12.5 ", "+3", "-.5", "1e3", "", "  ", "fast", "nan", "inf", "1,5", "5."]
    col = NumberColumn(pa.array(cells), len(cells))
    for i, cell in enumerate(cells):
        text = cell.strip()
        if not text:
            assert not col.present[i] and np.isnan(col.value[i])
            continue
        try:
            want = float(text)
        except ValueError:
            want = None
        if want is None or not np.isfinite(want):
            assert col.bad[i], cell
        else:
            assert not col.bad[i] and col.value[i] == want, cell


def test_decimal_comma():
    col = NumberColumn(pa.array(["250,5", "7"]), 2, decimal_comma=True)
    assert col.value.tolist() == [250.5, 7.0] and not col.bad.any()


@settings(max_examples=150, deadline=None, derandomize=True)
@given(st.lists(st.one_of(st.none(), st.text(max_size=12), st.floats().map(repr)), max_size=12))
def test_any_text_column_casts_without_an_error(cells):
    """Every text cell becomes a float or NaN, never an exception: the batch reader gives each
    column as text, and a cell pyarrow cannot read sends the column the careful way. Each
    finite value equals Python's float() of the cell (the reference), others are NaN."""
    from curvetui.batch.numbers import _NUMBER, _to_float

    got = _to_float(pa.array(cells, pa.string()))
    assert got.shape == (len(cells),)
    for cell, value in zip(cells, got, strict=True):
        if cell is not None and re.match(_NUMBER, cell) and np.isfinite(float(cell)):
            assert value == float(cell)
