"""Hostile centreline input: mutated GeoJSON documents, random WKT text and random WKB
bytes. A reader returns features or raises CentrelineError naming the file; the WKT and WKB
parsers raise only their own errors; `find-curves` ends with exit code 0 or 2, never an
internal error (3). Bounded as tests/unit/cli/test_fuzz_files.py is; no engineering value
is checked here. Sources for the formats fuzzed: GeoJSON RFC 7946; WKT and WKB as in OGC
Simple Features (ISO 19125-1, cited from memory)."""

from __future__ import annotations

import json
import struct

import numpy as np
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from curvetui.cli import main  # noqa: E402
from curvetui.storage.centrelines import CentrelineError, read_centrelines  # noqa: E402
from curvetui.storage.centrelines.wkb import WkbError, parse_wkb  # noqa: E402
from curvetui.storage.centrelines.wkt import WktError, parse_wkt  # noqa: E402

FUZZ = settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
BASE = {
    "type": "FeatureCollection",
    "features": [
        {"type": "Feature", "id": "Q", "properties": {"name": "Quillmere Rd"},
         "geometry": {"type": "LineString",
                      "coordinates": [[-2.3, 53.7], [-2.299, 53.7005], [-2.298, 53.7015]]}},
    ],
}  # fmt: skip
values = st.recursive(
    st.none() | st.booleans() | st.integers() | st.floats(allow_nan=False) | st.text(max_size=8),
    lambda inner: st.lists(inner, max_size=4)
    | st.dictionaries(st.text(max_size=6), inner, max_size=3),
    max_leaves=8,
)  # fmt: skip
PLACES = (
    ("type",), ("features",), ("crs",), ("features", 0), ("features", 0, "type"),
    ("features", 0, "id"), ("features", 0, "properties"), ("features", 0, "geometry"),
    ("features", 0, "geometry", "type"), ("features", 0, "geometry", "coordinates"),
    ("features", 0, "geometry", "coordinates", 1), ("features", 0, "geometry", "coordinates", 1, 0),
)  # fmt: skip


def _mutated(place, value):
    doc = json.loads(json.dumps(BASE))
    target = doc
    for key in place[:-1]:
        target = target[key]
    target[place[-1]] = value
    return doc


@FUZZ
@given(st.sampled_from(PLACES), values)
def test_mutated_geojson_reads_or_is_refused(tmp_path_factory, place, value):
    folder = tmp_path_factory.mktemp("fz")
    path = folder / "c.geojson"
    path.write_text(json.dumps(_mutated(place, value)))
    try:
        got = read_centrelines(str(path))
    except CentrelineError as exc:
        assert str(path) in str(exc) or "--crs" in str(exc) or "crs" in str(exc)
    else:
        assert all(p.ndim == 2 and p.shape[1] == 2 for f in got.features for p in f.parts)
    assert main(["find-curves", str(path), "-o", str(folder / "r.csv")]) in (0, 2)


@FUZZ
@given(st.text(alphabet="LINESTRMULZ()EPY,.-0123456789 e;SRID=", max_size=60))
def test_wkt_text_parses_or_is_refused(text):
    try:
        word, parts, _ = parse_wkt(text)
    except WktError:
        return
    assert all(p.ndim == 2 and p.shape[1] == 2 for p in parts)


@FUZZ
@given(st.binary(max_size=80), st.integers(0, 40))
def test_wkb_bytes_parse_or_are_refused(blob, cut):
    good = struct.pack("<BII", 1, 5, 1) + struct.pack("<BII", 1, 2, 2) + np.zeros(4).tobytes()
    for data in (blob, good[:cut] + blob[:8], good[:cut]):
        try:
            parse_wkb(data)
        except WkbError:
            pass
