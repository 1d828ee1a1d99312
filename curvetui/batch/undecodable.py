"""pyarrow's row handler failing on bytes that are not UTF-8, kept from the terminal.

A row with the wrong number of fields that is not UTF-8 makes pyarrow's call of a CSV
reader's ``invalid_row_handler`` fail on decoding the row's text; Python would print that
as "Exception ignored ... Traceback" on standard error (a traceback a user must never
see). While ``undecodable()`` is open such errors are kept in the list it yields instead;
pyarrow then stops with a parse error, which the caller reports in its own words.
"""

from __future__ import annotations

import contextlib
import sys
from collections.abc import Iterator


@contextlib.contextmanager
def undecodable() -> Iterator[list[BaseException]]:
    """The UnicodeDecodeErrors Python would report as unraisable, while open (module doc)."""
    seen: list[BaseException] = []
    previous = sys.unraisablehook

    def hook(info) -> None:
        if isinstance(info.exc_value, UnicodeDecodeError):
            seen.append(info.exc_value)
        else:
            previous(info)

    sys.unraisablehook = hook
    try:
        yield seen
    finally:
        sys.unraisablehook = previous
