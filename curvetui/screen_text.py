"""Text from files and the command line made safe to show: no control characters, no markup.

Every string a user supplied (bend ids, names, notes, CSV cells, file names, a user table's
name and source) reaches the screen through ``clean`` (plain output) or ``markup`` (Rich
markup strings). ``clean`` replaces with ``?``:

- C0 controls other than tab and line feed (ESC starts terminal escape sequences that set
  the title or move the cursor; BEL rings; CR overwrites the line), DEL and C1 controls
  (U+0080-U+009F, of which U+009B is a one-character escape introducer on some terminals);
- the bidirectional embedding, override and isolate marks (U+202A-U+202E, U+2066-U+2069),
  which reorder what is displayed (Unicode Standard Annex #9);
- lone surrogates (an undecodable byte of a file name, or a ``\\ud800`` escape in JSON),
  which no output encoding can write.

``markup`` then escapes square brackets that Rich would read as a tag (``[/]``,
``[@click=...]``, ``[link=...]``) with ``rich.markup.escape``.
"""

from __future__ import annotations

import re

_UNSAFE = re.compile(r"[\x00-\x08\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069\ud800-\udfff]")
_UNSAFE_ONE_LINE = re.compile(
    r"[\x00-\x08\x0a-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069\ud800-\udfff]"
)
REPLACEMENT = "?"


def clean(text: object, one_line: bool = False) -> str:
    """``text`` (any object, as str()) with control characters, bidirectional overrides
    and lone surrogates replaced by ``?``; tabs kept, and line feeds unless ``one_line``."""
    pattern = _UNSAFE_ONE_LINE if one_line else _UNSAFE
    return pattern.sub(REPLACEMENT, str(text))


def markup(text: object, one_line: bool = False) -> str:
    """``clean(text)`` escaped for Rich markup: it prints as written, never as a tag."""
    from rich.markup import escape

    return escape(clean(text, one_line))
