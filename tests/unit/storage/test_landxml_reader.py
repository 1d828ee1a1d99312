"""Reading LandXML 1.2 alignments: hand-written files with lines, arcs and clothoids turning
both ways, in metres and in feet, read to the Chain whose PIs are worked out by hand below;
units; and everything refused with the element and its line.

Hand calculation for tests/data/landxml/two-bends-metric.xml (see its comment):
- bend 1, a 90 deg curve turning right: back tangent E = 0 (northwards from E 0, N 0),
  ahead tangent N = 150 (eastwards from the curve's end E 50, N 150): PI 1 = (E 0, N 150),
  tangent length R tan 45 deg = 50 m.
- bend 2, clothoid 50 m to R 200 m (REFERENCES.md, "Geometry data", derived: p 0.52054 m,
  k 24.98698 m), 30 deg to the left from the TS at (E 150, N 150) heading east:
  T = (R + p) tan(15 deg) + k = 200.52054 x 0.2679492 + 24.98698 = 78.71630 m, so
  PI 2 = (E 228.71630, N 150).

Sources of the check values: LandXML 1.2 schema (read; REFERENCES.md "Geometry data"):
points written "northing easting", an infinite radius as INF, rot cw|ccw, angles in radians
by default; the clothoid's p and k derived from the Fresnel integrals (REFERENCES.md);
T = R tan(D/2) for a simple curve (REFERENCES.md "Curve geometry", a surveying reference,
read); 1 ft = 0.3048 m exactly and the US survey foot 1200/3937 m (NIST SP 811, from
memory). Every PI below is the hand arithmetic written out.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from curvetui.storage.landxml.reader import read_landxml
from curvetui.storage.landxml.units import angle_to_radians
from curvetui.storage.landxml.xmltree import LandXMLError, parse_bytes

DATA = Path(__file__).resolve().parents[2] / "data" / "landxml"
PI2_E = 150 + 200.52054 * math.tan(math.radians(15)) + 24.98698  # 228.71630 (see above)


def close(a, b, tol):
    return all(math.dist(p, q) <= tol for p, q in zip(a, b, strict=True))


def test_metric_file_reads_to_the_hand_worked_chain():
    imported = read_landxml(DATA / "two-bends-metric.xml")
    chain = imported.chain
    assert chain.name == "Fen Lane" and chain.start_station == 1000.0
    expected = [(0, 0), (0, 150), (PI2_E, 150), (383.48916, 239.35815)]
    assert close(chain.points, expected, 2e-4)  # the file's coordinates carry 5 decimals
    assert chain.radii == pytest.approx((50, 200))
    assert chain.spirals_in == (0, 50) and chain.spirals_out == (0, 50)
    laid = chain.lay_out()
    # bend 1 turns right (+1) 90 deg, bend 2 left (-1) 30 deg
    assert [b.direction for b in laid.bends] == [1, -1]
    assert [math.degrees(b.deflection) for b in laid.bends] == pytest.approx([90, 30], abs=1e-4)
    assert imported.units.system == "metric" and imported.project_name.startswith("Harrowgate")
    # the Profile is left out with a note naming its line; nothing else is noted
    assert imported.notes == ["Profile at line 52: left out (horizontal alignment only)"]


def test_feet_file_without_namespace_mirrored():
    """The same numbers read as international feet (1 ft = 0.3048 m exactly), eastings
    negated: the rotations swap (curve ccw, clothoids cw)."""
    imported = read_landxml(DATA / "two-bends-feet.xml")
    chain = imported.chain
    ft = 0.3048
    expected = [(0, 0), (0, 150 * ft), (-PI2_E * ft, 150 * ft), (-383.48916 * ft, 239.35815 * ft)]
    assert close(chain.points, expected, 1e-4)
    assert chain.radii == pytest.approx((50 * ft, 200 * ft))
    assert chain.spirals_in == pytest.approx((0, 50 * ft))
    assert [b.direction for b in chain.lay_out().bends] == [-1, 1]
    assert imported.units.system == "us" and imported.notes == []


METRES = (
    '<Metric linearUnit="meter" areaUnit="squareMeter" volumeUnit="cubicMeter" '
    'temperatureUnit="celsius" pressureUnit="milliBars"/>'
)


def wrap(coord_geom: str, units: str = METRES, alignment: str = "") -> bytes:
    """A LandXML document around ``coord_geom`` (one Alignment): Units on line 3, the
    Alignment on line 5, the first element of ``coord_geom`` on line 7."""
    attrs = alignment or 'name="A" length="1" staStart="0"'
    lines = [
        '<?xml version="1.0"?>',
        '<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2">',
        f"<Units>{units}</Units>",
        "<Alignments>",
        f"<Alignment {attrs}>",
        "<CoordGeom>",
        coord_geom.strip(),
        "</CoordGeom>",
        "</Alignment>",
        "</Alignments>",
        "</LandXML>",
    ]
    return "\n".join(lines).encode()


# a simple curve R 100 m, 90 deg right: start (E 0, N 0) north to the PC (E 0, N 100),
# centre (E 100, N 100), PT (E 100, N 200), on to (E 300, N 200); PI (E 0, N 200) by hand
SIMPLE = """
<Line><Start>0 0</Start><End>100 0</End></Line>
<Curve rot="cw" radius="100"><Start>100 0</Start><Center>100 100</Center><End>200 100</End></Curve>
<Line><Start>200 100</Start><End>200 300</End></Line>
"""


def read_bytes(data: bytes, tmp_path, name=None):
    path = tmp_path / "a.xml"
    path.write_bytes(data)
    return read_landxml(path, name)


def test_simple_curve_and_the_us_survey_foot(tmp_path):
    chain = read_bytes(wrap(SIMPLE), tmp_path).chain
    assert close(chain.points, [(0, 0), (0, 200), (300, 200)], 1e-9)
    units = (
        '<Imperial linearUnit="USSurveyFoot" areaUnit="squareFoot" volumeUnit="cubicFeet" '
        'temperatureUnit="fahrenheit" pressureUnit="inHG"/>'
    )
    imported = read_bytes(wrap(SIMPLE, units), tmp_path)
    survey_foot = 1200 / 3937  # m, exactly (US Metric Law of 1866)
    assert imported.chain.radii[0] == pytest.approx(100 * survey_foot, rel=1e-15)
    assert imported.chain.points[2] == pytest.approx((300 * survey_foot, 200 * survey_foot))
    assert any("survey feet" in n for n in imported.notes)


def test_angle_units():
    assert angle_to_radians(100.0, "grads") == pytest.approx(math.pi / 2)
    assert angle_to_radians(45.0, "decimal degrees") == pytest.approx(math.pi / 4)
    # 45.3025 = 45 deg 30 min 25 s (the schema's own example of decimal dd.mm.ss)
    assert angle_to_radians(45.3025, "decimal dd.mm.ss") == pytest.approx(
        math.radians(45 + 30 / 60 + 25 / 3600), abs=1e-12
    )
    assert angle_to_radians(1.25, "radians") == 1.25


def test_delta_in_the_wrong_unit_is_noted(tmp_path):
    geom = SIMPLE.replace('radius="100"', 'radius="100" delta="90"')  # degrees, units radians
    notes = read_bytes(wrap(geom), tmp_path).notes
    assert any("delta" in n and "line 8" in n for n in notes), notes


def test_several_alignments_pick_by_name(tmp_path):
    doc = wrap(SIMPLE).replace(
        b"</Alignments>",
        b'<Alignment name="B" length="1" staStart="5"><CoordGeom>'
        + SIMPLE.encode()
        + b"</CoordGeom></Alignment></Alignments>",
    )
    with pytest.raises(LandXMLError, match=r"2 alignments \('A', 'B'\); choose one"):
        read_bytes(doc, tmp_path)
    assert read_bytes(doc, tmp_path, "B").chain.start_station == 5
    with pytest.raises(LandXMLError, match="no alignment named 'C'"):
        read_bytes(doc, tmp_path, "C")


# --- refused, with the element and its line ----------------------------------------


@pytest.mark.parametrize(
    ("geom", "message"),
    [
        (
            SIMPLE.replace('rot="cw"', 'rot="left"'),
            r"Curve at line 8: rot must be 'cw' or 'ccw'",
        ),
        (SIMPLE.replace('rot="cw" ', ""), r"Curve at line 8: the required attribute 'rot'"),
        (
            SIMPLE.replace("<Center>100 100</Center>", ""),
            r"Curve at line 8: the required point <Center> is missing",
        ),
        (
            "<IrregularLine><Start>0 0</Start><End>1 1</End></IrregularLine>" + SIMPLE,
            r"IrregularLine at line 7: <IrregularLine> is not supported in CoordGeom",
        ),
        (
            "<Chain>1 2</Chain>" + SIMPLE,
            r"Chain at line 7: <Chain> is not supported",
        ),
        (
            SIMPLE.replace("<End>200 300</End>", "<End>200 300 5 7</End>"),
            r"End at line 9: must hold 'northing easting'",
        ),
        (
            SIMPLE.replace("<Start>200 100</Start>", "<Start>200.5 100</Start>"),
            r"a gap of 0\.5000 m between Curve at line 8 and Line at line 9",
        ),
        (
            SIMPLE.replace("<End>200 300</End>", "<End>210 300</End>"),
            r"a kink of .* deg between Curve at line 8 and Line at line 9",
        ),
        (
            SIMPLE.replace('radius="100"', 'radius="120"'),
            r"Curve at line 8: its start lies 20\.0000 m off the circle",
        ),
        (
            SIMPLE.replace("<Start>0 0</Start>", '<Start pntRef="P1"/>'),
            r"Start at line 7: points given by reference \(pntRef\) are not supported",
        ),
        (
            SIMPLE.replace("<End>100 0</End>", "<End>north 0</End>"),
            r"End at line 7: northing must be a number, got 'north'",
        ),
        (
            SIMPLE.replace('radius="100"', 'radius="1e300"'),
            r"Curve at line 8: radius must be within \+/-1e\+09 m, got '1e300'",
        ),
        (
            SIMPLE.replace("<End>100 0</End>", "<End>nan 0</End>"),
            r"End at line 7: northing must be a finite number",
        ),
    ],
)
def test_refused_elements_name_their_line(tmp_path, geom, message):
    with pytest.raises(LandXMLError, match=message):
        read_bytes(wrap(geom), tmp_path)


SPIRAL = """
<Line><Start>0 0</Start><End>100 0</End></Line>
<Spiral rot="cw" spiType="{kind}" length="50" radiusStart="{r0}" radiusEnd="{r1}">\
<Start>100 0</Start><PI>133.36066 0</PI><End>149.92193 2.08101</End></Spiral>
"""


@pytest.mark.parametrize(
    ("kind", "r0", "r1", "message"),
    [
        ("bloss", "INF", "200", r"Spiral at line 8: spiType 'bloss' is not supported"),
        ("cubic", "INF", "200", r"Spiral at line 8: spiType 'cubic' is not supported"),
        ("clothoid", "400", "200", r"Spiral at line 8: only a full clothoid .* two finite radii"),
        ("clothoid", "INF", "INF", r"Spiral at line 8: only a full clothoid .* two infinite"),
        ("clothoid", "INF", "0", r"Spiral at line 8: radiusEnd must be a positive length or INF"),
        ("clothoid", "INF", "1e999", r"Spiral at line 8: radiusEnd: write an infinite radius"),
        ("clothoid", "INF", "190", r"Spiral at line 8: not a clothoid of length 50\.0000 m to"),
    ],
)
def test_spirals_refused(tmp_path, kind, r0, r1, message):
    geom = SPIRAL.format(kind=kind, r0=r0, r1=r1)
    with pytest.raises(LandXMLError, match=message):
        read_bytes(wrap(geom), tmp_path)


def test_a_spiral_into_a_curve_that_never_comes(tmp_path):
    with pytest.raises(LandXMLError, match=r"Spiral at line 8: a spiral into a curve must be"):
        read_bytes(wrap(SPIRAL.format(kind="clothoid", r0="INF", r1="200")), tmp_path)


def test_missing_spiral_type_and_alignment_attributes(tmp_path):
    geom = SPIRAL.format(kind="clothoid", r0="INF", r1="200").replace('spiType="clothoid" ', "")
    with pytest.raises(LandXMLError, match=r"Spiral at line 8: the required attribute 'spiType'"):
        read_bytes(wrap(geom), tmp_path)
    for missing in ("name", "length", "staStart"):
        attrs = {"name": 'name="A"', "length": 'length="1"', "staStart": 'staStart="0"'}
        del attrs[missing]
        with pytest.raises(LandXMLError, match=rf"Alignment at line 5: .*'{missing}' is missing"):
            read_bytes(wrap(SIMPLE, alignment=" ".join(attrs.values())), tmp_path)


def test_compound_curve_and_station_equation_refused(tmp_path):
    # R 100 m then R 50 m turning the same way (clockwise), tangent at N 200, E 100
    compound = SIMPLE.replace(
        "<Line><Start>200 100</Start><End>200 300</End></Line>",
        '<Curve rot="cw" radius="50"><Start>200 100</Start><Center>150 100</Center>'
        "<End>150 150</End></Curve>\n<Line><Start>150 150</Start><End>0 150</End></Line>",
    )
    with pytest.raises(LandXMLError, match=r"Curve at line 9: radius 50\.0000 m after Curve at"):
        read_bytes(wrap(compound), tmp_path)
    doc = wrap(SIMPLE).replace(b"</CoordGeom>", b'</CoordGeom><StaEquation staAhead="5"/>')
    with pytest.raises(LandXMLError, match=r"StaEquation at line \d+: station equations"):
        read_bytes(doc, tmp_path)


def test_units_refused(tmp_path):
    bad = '<Metric linearUnit="furlong" areaUnit="squareMeter"/>'
    with pytest.raises(LandXMLError, match=r"Metric at line 3: linearUnit must be one of"):
        read_bytes(wrap(SIMPLE, bad), tmp_path)
    bad = '<Metric linearUnit="meter" angularUnit="turns"/>'
    with pytest.raises(LandXMLError, match=r"angularUnit must be one of radians, grads"):
        read_bytes(wrap(SIMPLE, bad), tmp_path)


def test_no_alignment_and_only_lines(tmp_path):
    with pytest.raises(LandXMLError, match="no Alignments/Alignment element"):
        read_bytes(b'<LandXML version="1.2"><Units/></LandXML>', tmp_path)
    lines = "<Line><Start>0 0</Start><End>100 0</End></Line>"
    with pytest.raises(LandXMLError, match="only straight lines"):
        read_bytes(wrap(lines), tmp_path)


def test_wrong_root_and_namespace():
    with pytest.raises(LandXMLError, match=r"the root element is <kml> \(line 1\)"):
        parse_bytes(b"<kml><Document/></kml>")
    with pytest.raises(LandXMLError, match=r"namespace .*LandXML-1\.1.* is not LandXML 1\.2"):
        parse_bytes(b'<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.1"/>')


def test_stations_and_length_that_disagree_are_noted(tmp_path):
    """SIMPLE from station 0: the curve starts at 100 m; its arc is 50 pi = 157.0796 m."""
    geom = SIMPLE.replace('<Curve rot="cw"', '<Curve staStart="99" rot="cw"')
    notes = read_bytes(wrap(geom), tmp_path).notes
    assert notes[0].startswith("the Alignment's length 1.0000 m differs from its elements' ")
    assert "457.0796 m" in notes[0]  # 100 + 157.0796 + 200
    assert notes[1] == (
        "Curve at line 8: staStart 99.0000 m differs from the station along the alignment, "
        "100.0000 m; stations run from the Alignment's staStart"
    )


def test_an_alignment_that_is_one_curve(tmp_path):
    """No Line at all: the start is the PC and the end the PT; the PI where the tangents
    at both cross, (E 0, N 200) for a quarter circle about (E 100, N 100)."""
    geom = '<Curve rot="cw"><Start>100 0</Start><Center>100 100</Center><End>200 100</End></Curve>'
    chain = read_bytes(wrap(geom), tmp_path).chain
    assert close(chain.points, [(0, 100), (0, 200), (100, 200)], 1e-9)
    assert chain.radii == (100.0,)  # |Start - Center| when the radius is not given
