"""Hostile values the fuzz tests draw from (issue 14): edge numbers, markup, control
characters, lone surrogates, text of every kind. Invented for these tests; no source."""

from __future__ import annotations

import contextlib
import io

from hypothesis import strategies as st

from curvetui.cli import _main

NUMBER_TEXT = (
    "0", "-0", "1", "80", "400", "2.5", "-45", "1e306", "-1e306", "1e-320", "5e-324", "nan",
    "inf", "-inf", "1e309", "", "  ", "abc", "1,5", "0x10", "1_000", "+5", "2+710.5",
    "0+500", "9e305+0", "1e+400", "\udc80", "[/]", "=1+1", "9" * 400, "179.999999",
    "\x1b]0;t\x07", "12\x00", "\uff11\uff12",
)  # fmt: skip
TEXT = (
    "", "[/]", "[bold]x", "[@click=app.quit]q", "[link=http://a.example]x[/link]",
    "\x1b]0;pwned\x07", '=HYPERLINK("x")', "+1", "@SUM(1)", "-2+3", "{nb}", "a" * 3000,
    "line\nbreak", "tab\tcell", "\r", "\u202e\u0647", "\x00", "\x9b2J",
)  # fmt: skip
EDGE_NUMBERS = (
    1e306, -1e306, 1e-320, 5e-324, 10**400, -(10**400), -0.0, 0, 1e15, 179.9999999, 1e-9,
    0.5, 1.8, 2**63, 80, 400, 3.6,
)  # fmt: skip

numbers_as_text = st.one_of(
    st.sampled_from(NUMBER_TEXT),
    st.floats(allow_nan=True, allow_infinity=True).map(repr),
    st.integers(-(10**30), 10**30).map(str),
)
any_text = st.one_of(st.sampled_from(TEXT), st.text(max_size=40))
json_values = st.one_of(
    st.sampled_from(EDGE_NUMBERS),
    st.sampled_from(TEXT),
    st.text(max_size=20),
    st.none(),
    st.booleans(),
    st.floats(allow_nan=False, allow_infinity=False),
    st.lists(st.integers(), max_size=2),
)


def run(argv: list[str]) -> tuple[int, str, str]:
    """``curvetui ARGV`` in-process, below the last-resort guard of ``main``, so that an
    exception fails the test with its traceback: (exit code, stdout, stderr)."""
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = _main(argv)
        except SystemExit as exc:  # argparse: usage errors exit 2
            code = exc.code if isinstance(exc.code, int) else 2
    assert "Traceback" not in err.getvalue()
    return code, out.getvalue(), err.getvalue()
