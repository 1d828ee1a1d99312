"""Writing LandXML 1.2, and the round trip export -> import (within 1 mm and 1e-6 degree,
the issue's bar) in both unit systems, with spirals and without, turning both ways.

The written document is read with the standard library's ElementTree for its structure
(required attributes per the LandXML 1.2 schema, REFERENCES.md "Geometry data": Alignment
name, length, staStart; Curve rot; Spiral length, radiusStart, radiusEnd, rot, spiType;
points "northing easting"; INF radius)."""

from __future__ import annotations

import datetime as dt
import math
import xml.etree.ElementTree as ET

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from curvetui.core.alignment import Chain
from curvetui.storage.landxml.reader import alignment_from_root
from curvetui.storage.landxml.writer import landxml_text
from curvetui.storage.landxml.xmltree import parse_bytes

NS = "{http://www.landxml.org/schema/LandXML-1.2}"

# Invented demo chains (not checks of values: the round trip compares curvetui with itself
# through the file, which is what the issue asks of export and import).
RIGHT_LEFT_SPIRALS = Chain(
    ((1000, 2000), (1100, 2400), (1500, 2600), (1700, 3100), (1900, 3300)),
    (300.0, 200.0, 400.0),
    (50.0, 0.0, 60.0),
    (50.0, 0.0, 30.0),
    1000.0,
    "Kestrel Way",
)
RIGHT_LEFT_NO_SPIRALS = Chain(
    ((0, 0), (-300, 400), (-350, 900), (-800, 1300)),  # turns right, then left
    (250.0, 500.0),
    (0.0, 0.0),
    (0.0, 0.0),
    -20.0,
    "Otterburn Spur",
)


def roundtrip(chain: Chain, units: str) -> Chain:
    text = landxml_text(chain, units, "Demo")
    return alignment_from_root(parse_bytes(text.encode("utf-8")), "mem").chain


def assert_same(a: Chain, b: Chain) -> None:
    for p, q in zip(a.points, b.points, strict=True):
        assert math.dist(p, q) < 1e-3
    pairs = ((a.radii, b.radii), (a.spirals_in, b.spirals_in), (a.spirals_out, b.spirals_out))
    for xs, ys in pairs:
        assert all(abs(x - y) < 1e-3 for x, y in zip(xs, ys, strict=True))
    assert abs(a.start_station - b.start_station) < 1e-3 and a.name == b.name
    la, lb = a.lay_out(), b.lay_out()
    for x, y in zip(la.bends, lb.bends, strict=True):
        assert x.direction == y.direction
        assert abs(math.degrees(x.deflection - y.deflection)) < 1e-6
        assert abs(x.pi_station - y.pi_station) < 1e-3


@pytest.mark.parametrize("units", ["metric", "us"])
@pytest.mark.parametrize(
    "chain", [RIGHT_LEFT_SPIRALS, RIGHT_LEFT_NO_SPIRALS], ids=["spirals", "none"]
)
def test_round_trip(chain, units):
    assert [b.direction for b in chain.lay_out().bends][:2] == [1, -1]  # both ways
    assert_same(chain, roundtrip(chain, units))


@settings(max_examples=25, deadline=None)
@given(
    turns=st.lists(st.floats(-150, 150).filter(lambda d: abs(d) > 2), min_size=1, max_size=3),
    radius=st.floats(30, 3000),
    spiral_share=st.floats(0, 0.45),
    unequal=st.floats(0.2, 1.0),
    units=st.sampled_from(["metric", "us"]),
    station=st.floats(-1e5, 1e6),
)
def test_round_trip_property(turns, radius, spiral_share, unequal, units, station):
    """Legs long enough for every bend: each leg 3 (T + 10 m) of the bends at its ends."""
    heading, here = 0.0, (5000.0, -2000.0)
    points, radii, ls_in, ls_out = [here], [], [], []
    leg = 3 * (radius * math.tan(math.radians(75)) + 2 * radius + 10)
    for turn in turns:
        here = (here[0] + leg * math.sin(heading), here[1] + leg * math.cos(heading))
        points.append(here)
        # spirals sharing at most 45 % of the deflection each way: they fit
        ls = 2 * radius * math.radians(abs(turn)) * spiral_share
        radii.append(radius)
        ls_in.append(ls)
        ls_out.append(ls * unequal)
        heading += math.radians(turn)
    points.append((here[0] + leg * math.sin(heading), here[1] + leg * math.cos(heading)))
    chain = Chain(tuple(points), tuple(radii), tuple(ls_in), tuple(ls_out), station, "P")
    assert_same(chain, roundtrip(chain, units))


def test_document_structure_and_required_attributes():
    now = dt.datetime(2026, 12, 2, 9, 30, 0)
    text = landxml_text(RIGHT_LEFT_SPIRALS, "us", 'Kestrel <Way> & "co"', now=now)
    root = ET.fromstring(text)
    assert root.tag == f"{NS}LandXML"
    assert (root.get("version"), root.get("date"), root.get("time")) == (
        "1.2",
        "2026-12-02",
        "09:30:00",
    )
    imperial = root.find(f"{NS}Units/{NS}Imperial")
    assert imperial.get("linearUnit") == "foot"
    for key in ("areaUnit", "volumeUnit", "temperatureUnit", "pressureUnit"):
        assert imperial.get(key)
    assert root.find(f"{NS}Project").get("name") == 'Kestrel <Way> & "co"'  # escaped, read back
    assert root.find(f"{NS}Application").get("name") == "curvetui"
    alignment = root.find(f"{NS}Alignments/{NS}Alignment")
    assert alignment.get("name") == "Kestrel Way"
    assert float(alignment.get("staStart")) == pytest.approx(1000 / 0.3048, abs=1e-6)
    total_ft = float(alignment.get("length"))
    geom = alignment.find(f"{NS}CoordGeom")
    tags = [child.tag.removeprefix(NS) for child in geom]
    # bend 1: spiral, curve, spiral; bend 2 a simple curve; bend 3: spiral, curve, spiral
    assert tags == [
        "Line",
        "Spiral",
        "Curve",
        "Spiral",
        "Line",
        "Curve",
        "Line",
        "Spiral",
        "Curve",
        "Spiral",
        "Line",
    ]
    assert sum(float(c.get("length")) for c in geom) == pytest.approx(total_ft, abs=1e-5)
    for spiral in geom.iter(f"{NS}Spiral"):
        for key in ("length", "radiusStart", "radiusEnd", "rot", "spiType"):
            assert spiral.get(key), key
        assert "INF" in (spiral.get("radiusStart"), spiral.get("radiusEnd"))
        assert [c.tag.removeprefix(NS) for c in spiral] == ["Start", "PI", "End"]
    rots = [c.get("rot") for c in geom.iter(f"{NS}Curve")]
    assert rots == ["cw", "ccw", "cw"]
    # the first Line starts at the chain's start (E 1000, N 2000 m): "northing easting", ft
    start = geom.find(f"{NS}Line/{NS}Start").text.split()
    assert [float(v) for v in start] == pytest.approx([2000 / 0.3048, 1000 / 0.3048], abs=1e-6)


def test_no_line_for_a_zero_tangent_and_control_characters():
    # a 90 deg right bend, R 100 m: T = R tan 45 deg = 100 m, exactly the leg from the start
    chain = Chain(((0, 0), (0, 100), (300, 100)), (100.0,), (0.0,), (0.0,), 0.0, "a\x01b")
    root = ET.fromstring(landxml_text(chain))
    geom = root.find(f"{NS}Alignments/{NS}Alignment/{NS}CoordGeom")
    assert [c.tag.removeprefix(NS) for c in geom] == ["Curve", "Line"]
    assert root.find(f"{NS}Alignments/{NS}Alignment").get("name") == "a?b"


@pytest.mark.parametrize("units", ["metric", "us"])
def test_a_spiral_too_short_to_write_is_left_out(units):
    """Found by the property test above (turn 20 degrees, R 1433 m, spiral share 1e-9: a
    spiral of 0.5 micrometres): written to six decimals its PI fell on its start and the file
    could not be read back. Spirals under a millimetre are now written as none; the bend
    reads back within the round trip's tolerances (assert_same: 1 mm)."""
    leg = 3 * (1433.0 * math.tan(math.radians(75)) + 2 * 1433.0 + 10)
    turn = math.radians(20.0)
    points = ((0.0, 0.0), (0.0, leg), (leg * math.sin(turn), leg + leg * math.cos(turn)))
    ls = 2 * 1433.0 * turn * 1e-9
    chain = Chain(points, (1433.0,), (ls,), (ls,), 0.0, "P")
    back = roundtrip(chain, units)
    assert back.spirals_in == (0.0,) and back.spirals_out == (0.0,)
    assert_same(chain, back)
