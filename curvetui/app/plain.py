"""Text from files and from the user shown as text: never read as Rich/Textual markup
(``[/]`` would break the screen, ``[@click=app.quit]`` would quit, ``[link=...]`` would hide
a link) and never sent to the terminal as control characters (ESC and BEL could retitle
the terminal or redraw it). Every id, name, note, cell and file name the app shows goes
through here.
"""

from __future__ import annotations

import re

from rich.markup import escape
from rich.text import Text

# C0 and C1 control characters and DEL; a line break and a tab are handled apart
_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\ud800-\udfff]")
_BREAKS = re.compile("[\t\n\u2028\u2029]")
SHOWN_FOR_CONTROL = "\ufffd"  # the replacement character: something was there


def visible(text: object, one_line: bool = True) -> str:
    """``text`` with each control character shown as U+FFFD (line breaks and tabs as a
    space when ``one_line``); lone surrogates (not text) as U+FFFD too."""
    s = str(text)
    if one_line:
        s = _BREAKS.sub(" ", s)
    else:
        s = s.replace("\t", " ")
    return _CONTROL.sub(SHOWN_FOR_CONTROL, s)


def markup_safe(text: object, one_line: bool = True) -> str:
    """``text`` ready to sit inside the app's own markup: visible and escaped."""
    return escape(visible(text, one_line))


def plain_text(text: object, style: str = "", one_line: bool = True) -> Text:
    """``text`` as a Rich Text (never parsed as markup), visible."""
    return Text(visible(text, one_line), style=style)
