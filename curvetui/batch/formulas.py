"""Cells a spreadsheet would run as formulas, written as text instead.

A spreadsheet opening a CSV file reads a cell that starts with ``=``, ``+``, ``-`` or ``@``
(and, in some programs, a tab or carriage return before one) as a formula, which can
fetch data or run commands (OWASP, "CSV Injection"). The batch output carries the input's
cells through and names user tables, so such cells are written with a leading apostrophe
(``'=1+1``), which spreadsheets show as the text itself. Numbers stay as they are: ``-5``,
``+3``, ``-2.5e3`` and, in a semicolon-separated file, ``-250,5``. ``curvetui batch
--keep-formulas`` writes every cell verbatim instead.
"""

from __future__ import annotations

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

RISKY_START = r"^[=+\-@\t\r]"
# a plain number, with a decimal point or comma, optionally an exponent and blanks after
NUMBER = r"^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?\s*$"
PREFIX = "'"
_RISKY_BYTES = np.frombuffer(b"=+-@\t\r", dtype=np.uint8)


def neutral_text(text: str) -> str:
    """One cell (or header name) as written: with an apostrophe when it would run."""
    import re

    if re.match(RISKY_START, text) and not re.match(NUMBER, text):
        return PREFIX + text
    return text


def _may_run(column: pa.ChunkedArray) -> bool:
    """Whether any cell of a text column starts with a byte of RISKY_START: a look at each
    cell's first byte (about a third of the regex's cost on a chunk of 15,000 rows); only
    a column with one is then matched cell by cell. An empty cell has no first byte; a null
    cell may look risky (its bytes are not defined), which only costs the regex."""
    for chunk in column.chunks:
        offsets_buf, data_buf = chunk.buffers()[1:3]
        if data_buf is None or not len(chunk):
            continue
        kind = np.int64 if pa.types.is_large_string(chunk.type) else np.int32
        offsets = np.frombuffer(offsets_buf, dtype=kind)[
            chunk.offset : chunk.offset + len(chunk) + 1
        ]
        starts = offsets[:-1][offsets[1:] > offsets[:-1]]
        if np.isin(np.frombuffer(data_buf, dtype=np.uint8)[starts], _RISKY_BYTES).any():
            return True
    return False


def neutralise(table: pa.Table) -> pa.Table:
    """``table`` with every text cell that would run as a formula prefixed by ``'``."""
    columns = []
    changed = False
    for column in table.columns:
        text = pa.types.is_string(column.type) or pa.types.is_large_string(column.type)
        if text and _may_run(column):
            risky = pc.match_substring_regex(column, RISKY_START)
            if pc.any(risky).as_py():
                risky = pc.and_(risky, pc.invert(pc.match_substring_regex(column, NUMBER)))
                column = pc.if_else(
                    risky,
                    pc.binary_join_element_wise(
                        pa.scalar(PREFIX, column.type), column, pa.scalar("", column.type)
                    ),
                    column,
                )
                changed = True
        columns.append(column)
    if not changed:
        return table
    return pa.Table.from_arrays(columns, schema=table.schema)
