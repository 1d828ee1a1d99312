"""Mutated LandXML files (bounded): the reader either gives a chain or refuses with
LandXMLError; no other exception escapes (no traceback can reach a user)."""

from __future__ import annotations

from pathlib import Path

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from curvetui.storage.landxml.reader import alignment_from_root
from curvetui.storage.landxml.xmltree import LandXMLError, parse_bytes

DATA = Path(__file__).resolve().parents[2] / "data" / "landxml"
SOURCES = [(DATA / n).read_bytes() for n in ("two-bends-metric.xml", "two-bends-feet.xml")]
NOISE = [
    b"",
    b"0",
    b"-1",
    b"INF",
    b"nan",
    b"1e999",
    b"<",
    b"&",
    b'"',
    b" ",
    b"cw",
    b"ccw",
    b"clothoid",
    b"<Line>",
    b"</Curve>",
    b"9" * 400,
    b"\xff",
    b"\x00",
]


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    source=st.sampled_from(SOURCES),
    edits=st.lists(
        st.tuples(st.floats(0, 1), st.integers(0, 40), st.sampled_from(NOISE)),
        min_size=1,
        max_size=4,
    ),
)
def test_mutated_files_are_read_or_refused(source, edits):
    data = source
    for where, cut, insert in edits:
        i = int(where * len(data))
        data = data[:i] + insert + data[i + cut :]
    try:
        alignment_from_root(parse_bytes(data, "fuzz.xml"), "fuzz.xml")
    except LandXMLError as exc:
        assert str(exc).startswith("fuzz.xml: ")
