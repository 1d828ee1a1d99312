"""batch.formulas: cells a spreadsheet would run as formulas get a leading apostrophe.

The rule (a cell starting with =, +, -, @, a tab or a carriage return, unless it is a plain
number) follows OWASP's "CSV Injection" page; the check here is that the whole-column path
(a first-byte look, then pyarrow's regex) writes each cell exactly as Python's ``re`` does
one cell at a time (``neutral_text``), whatever the arrays' slicing, chunking and nulls.
Source: OWASP, "CSV Injection" (common practice, no standard); the reference for each cell
is Python's ``re`` module; no engineering value is checked here.
"""

from __future__ import annotations

import pyarrow as pa
from hypothesis import given, settings
from hypothesis import strategies as st

from curvetui.batch.formulas import neutral_text, neutralise

CELLS = st.lists(
    st.one_of(
        st.none(),
        st.text(alphabet="=+-@\t\r0123456789.,eE ab'\"", max_size=6),
        st.text(max_size=4),
    ),
    max_size=30,
)


@settings(max_examples=150, deadline=None)
@given(cells=CELLS, cut=st.integers(0, 30), large=st.booleans())
def test_whole_columns_agree_with_one_cell_at_a_time(cells, cut, large):
    kind = pa.large_string() if large else pa.string()
    head, tail = cells[:cut], cells[cut:]
    # a sliced chunk (offset not zero) and a second chunk, as a chunked column can be
    first = pa.array(["pad", *head], kind).slice(1)
    column = pa.chunked_array([first, pa.array(tail, kind)], kind)
    table = pa.table({"cell": column, "n": pa.array(range(len(cells)), pa.int64())})
    got = neutralise(table)
    want = [None if c is None else neutral_text(c) for c in cells]
    assert got.column("cell").to_pylist() == want
    assert got.column("n").to_pylist() == list(range(len(cells)))


def test_examples_from_the_rule():
    table = pa.table({"c": ["=1+1", "@SUM(A1)", "-5", "+3", "-2.5e3", "-250,5", "\t=x", "ok", ""]})
    assert neutralise(table).column("c").to_pylist() == [
        "'=1+1",
        "'@SUM(A1)",
        "-5",
        "+3",
        "-2.5e3",
        "-250,5",
        "'\t=x",
        "ok",
        "",
    ]


def test_a_table_without_risky_cells_is_returned_as_it_is():
    table = pa.table({"c": ["a", "b", None, ""]})
    assert neutralise(table) is table
