"""A table as CSV text, each cell quoted only when it must be (RFC 4180).

pyarrow's CSV writer quotes every text cell (its "needed" style quotes all strings), which
costs two bytes a cell: on a register of text columns, a third of the output. Here a cell
is quoted only when it holds the separator, a double quote or a line break (quotes inside
doubled), as Python's csv module does by default; a reader gets the same cells. Numbers are
written as pyarrow writes them (its cast to text: shortest form that reads back the same);
a null is an empty cell, as an empty text is. Whole columns at a time (pyarrow compute),
the lines joined at once.
"""

from __future__ import annotations

import numpy as np
import pyarrow as pa
import pyarrow.compute as pc

_STRUCTURAL = ('"', "\n", "\r")


def _needs_quotes_somewhere(column: pa.Array, delimiter: str) -> bool:
    """Whether any cell may need quoting: a look at the column's bytes (cheap), before the
    cell-by-cell test."""
    data = column.buffers()[2]
    if data is None or not len(column):
        return False
    raw = np.frombuffer(data, dtype=np.uint8)
    return any(bool((raw == ord(ch)).any()) for ch in (delimiter, *_STRUCTURAL))


_ESCAPED = {",": ",", ";": ";", "\t": "\\t"}


def cell_text(column: pa.Array, delimiter: str) -> pa.Array:
    """One column's cells as CSV text."""
    if pa.types.is_string(column.type) or pa.types.is_large_string(column.type):
        text = column  # nulls stay null: the join writes them as empty cells
        if _needs_quotes_somewhere(text, delimiter):
            special = "[" + _ESCAPED[delimiter] + '"\\n\\r]'
            need = pc.match_substring_regex(text, special)
            doubled = pc.replace_substring(text, '"', '""')
            quoted = pc.binary_join_element_wise('"', doubled, '"', "")
            text = pc.if_else(need, quoted, text)
        return text
    return pc.cast(column, pa.string())


def csv_lines(table: pa.Table, delimiter: str = ",") -> bytes:
    """The rows of ``table`` as CSV lines (each ended by LF), no header."""
    if not table.num_rows:
        return b""
    cells = [cell_text(c.combine_chunks(), delimiter) for c in table.columns]
    # the line end joined to the last cell (one short column, not every whole line again)
    cells[-1] = pc.binary_join_element_wise(
        cells[-1], "\n", "", null_handling="replace", null_replacement=""
    )
    lines = pc.binary_join_element_wise(
        *cells, delimiter, null_handling="replace", null_replacement=""
    )
    offsets = np.frombuffer(lines.buffers()[1], dtype=np.int32)
    start, end = offsets[lines.offset], offsets[lines.offset + len(lines)]
    return memoryview(lines.buffers()[2])[start:end].tobytes()


def csv_header(names: list[str], delimiter: str = ",") -> bytes:
    """The header row of ``names``, quoted as the cells are."""
    return csv_lines(pa.table({f"c{i}": [n] for i, n in enumerate(names)}), delimiter)
