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

import pyarrow as pa
import pyarrow.compute as pc

RISKY_START = r"^[=+\-@\t\r]"
# a plain number, with a decimal point or comma, optionally an exponent and blanks after
NUMBER = r"^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?\s*$"
PREFIX = "'"


def neutral_text(text: str) -> str:
    """One cell (or header name) as written: with an apostrophe when it would run."""
    import re

    if re.match(RISKY_START, text) and not re.match(NUMBER, text):
        return PREFIX + text
    return text


def neutralise(table: pa.Table) -> pa.Table:
    """``table`` with every text cell that would run as a formula prefixed by ``'``."""
    columns = []
    changed = False
    for column in table.columns:
        if pa.types.is_string(column.type) or pa.types.is_large_string(column.type):
            risky = pc.match_substring_regex(column, RISKY_START)
            if pc.any(risky).as_py():
                risky = pc.and_(risky, pc.invert(pc.match_substring_regex(column, NUMBER)))
                column = pc.if_else(risky, pc.binary_join_element_wise(PREFIX, column, ""), column)
                changed = True
        columns.append(column)
    if not changed:
        return table
    return pa.Table.from_arrays(columns, schema=table.schema)
