"""The clothoid as written to LandXML, against values from outside the project.

REFERENCES.md, "Geometry data: centrelines and LandXML" (derived from the clothoid's
definition): L 50 m to R 200 m ends at x 49.92193 m, y 2.08101 m, turned 7.16197 degrees.
Other lengths and radii against scipy.special.fresnel: x = A sqrt(pi) C(L / (A sqrt(pi))),
y = A sqrt(pi) S(...), A^2 = R L (the clothoid's definition, curvature s / A^2).

The coordinates are read from the written text with the standard library's ElementTree,
not with curvetui's reader.
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ET

import pytest
from scipy.special import fresnel

from curvetui.core.alignment import Chain
from curvetui.storage.landxml.writer import landxml_text

NS = {"lx": "http://www.landxml.org/schema/LandXML-1.2"}


def first_spiral_local(chain: Chain, units: str = "metric"):
    """(x, y, turn in degrees, length) of the first Spiral written, in its local frame:
    x along its start tangent (Start -> PI), y across it; in metres."""
    factor = 0.3048 if units == "us" else 1.0
    root = ET.fromstring(landxml_text(chain, units, "check"))
    spiral = root.find(".//lx:Spiral", NS)
    assert spiral.get("spiType") == "clothoid" and spiral.get("radiusStart") == "INF"

    def en(tag):
        n, e = (float(v) * factor for v in spiral.find(f"lx:{tag}", NS).text.split())
        return e, n

    (e0, n0), (ep, np_), (e1, n1) = en("Start"), en("PI"), en("End")
    u = (ep - e0, np_ - n0)
    lu = math.hypot(*u)
    u = (u[0] / lu, u[1] / lu)
    d = (e1 - e0, n1 - n0)
    x = d[0] * u[0] + d[1] * u[1]
    y = abs(d[0] * u[1] - d[1] * u[0])
    v = (e1 - ep, n1 - np_)
    turn = math.degrees(abs(math.atan2(u[0] * v[1] - u[1] * v[0], u[0] * v[0] + u[1] * v[1])))
    return x, y, turn, float(spiral.get("length")) * factor


@pytest.mark.parametrize("direction", [1, -1])  # a bend to the right, and its mirror
def test_references_clothoid_50_m_to_200_m(direction):
    chain = Chain(((0, 0), (0, 500), (direction * 250, 933.0127)), (200.0,), (50.0,), (50.0,))
    x, y, turn, length = first_spiral_local(chain)
    assert length == 50.0
    assert x == pytest.approx(49.92193, abs=1e-5)  # REFERENCES.md (derived)
    assert y == pytest.approx(2.08101, abs=1e-5)
    assert turn == pytest.approx(7.16197, abs=1e-5)


@pytest.mark.parametrize(
    ("ls", "radius", "units"), [(80.0, 150.0, "metric"), (300.0, 1000.0, "us"), (120, 90, "us")]
)
def test_clothoid_against_scipy_fresnel(ls, radius, units):
    ft = 0.3048 if units == "us" else 1.0
    ls_si, r_si = ls * ft, radius * ft
    # a 100 deg bend leaves room for both spirals (each turns Ls / 2R)
    far = 5000 * ft
    end = (far * math.sin(math.radians(100)), far + far * math.cos(math.radians(100)))
    chain = Chain(((0, 0), (0, far), end), (r_si,), (ls_si,), (ls_si,))
    x, y, turn, length = first_spiral_local(chain, units)
    scale = math.sqrt(math.pi * r_si * ls_si)
    s, c = fresnel(ls_si / scale)
    assert length == pytest.approx(ls_si, abs=1e-6)
    assert x == pytest.approx(scale * c, abs=2e-6)
    assert y == pytest.approx(scale * s, abs=2e-6)
    assert turn == pytest.approx(math.degrees(ls_si / (2 * r_si)), abs=1e-6)
