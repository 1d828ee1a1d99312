"""A Chain as LandXML 1.2 text.

Written: the LandXML root (namespace LandXML 1.2, version, date, time), ``Units`` (Metric:
metres; US customary: the international foot; angles and directions in decimal degrees,
with the schema's required area, volume, temperature and pressure units),
``Project`` (name), ``Application`` (curvetui and its version), and one
``Alignments/Alignment`` (name, length, staStart) whose ``CoordGeom`` holds ``Line``,
``Spiral`` (spiType clothoid, radius INF at its tangent end, theta) and ``Curve`` (rot,
radius, length, delta, crvType arc; Start, Center, End, PI) elements, each with its
staStart; no Line for a zero tangent. Points are "northing easting" with six decimals (a
micrometre, or a millionth of a foot). Directions (optional in the schema) are left out:
every direction follows from the points. Names are XML-escaped; characters XML 1.0 cannot
hold (control characters) are written as '?'.
"""

from __future__ import annotations

import datetime as _dt
import math
import re
from xml.sax.saxutils import quoteattr

from curvetui import __version__
from curvetui.core.alignment import Chain
from curvetui.core.plan_elements import (
    ArcElement,
    LineElement,
    SpiralElement,
    arc_sweep,
    chain_elements,
    element_length,
)
from curvetui.core.units import FOOT
from curvetui.storage.landxml.xmltree import LANDXML_12

UNITS_XML = {
    "metric": (
        '<Metric areaUnit="squareMeter" linearUnit="meter" volumeUnit="cubicMeter" '
        'temperatureUnit="celsius" pressureUnit="milliBars" angularUnit="decimal degrees" '
        'directionUnit="decimal degrees"/>',
        1.0,
    ),
    "us": (
        '<Imperial areaUnit="squareFoot" linearUnit="foot" volumeUnit="cubicFeet" '
        'temperatureUnit="fahrenheit" pressureUnit="inHG" angularUnit="decimal degrees" '
        'directionUnit="decimal degrees"/>',
        FOOT,
    ),
}
_NOT_XML = re.compile("[^\t\n\r\x20-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")


def xml_text(text: str) -> str:
    """``text`` with the characters XML 1.0 cannot hold replaced by '?'."""
    return _NOT_XML.sub("?", text)


def _attr(value: str) -> str:
    return quoteattr(xml_text(value))


def landxml_text(
    chain: Chain, units: str = "metric", project_name: str = "", now: _dt.datetime | None = None
) -> str:
    """The LandXML 1.2 document of ``chain`` (SI) written in ``units`` ('metric' or 'us')."""
    units_xml, factor = UNITS_XML[units]
    now = now or _dt.datetime.now().replace(microsecond=0)

    def n(value: float) -> str:  # a length in file units
        return f"{value / factor:.6f}"

    def pt(tag: str, p) -> str:
        return f"<{tag}>{n(p[1])} {n(p[0])}</{tag}>"

    def deg(value: float) -> str:
        return f"{math.degrees(value):.10f}"

    elements = chain_elements(chain)
    total = sum(element_length(el) for el in elements)
    lines = [
        '<?xml version="1.0" encoding="UTF-8"?>',
        f'<LandXML xmlns="{LANDXML_12}" '
        'xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" '
        f'xsi:schemaLocation="{LANDXML_12} {LANDXML_12}/LandXML-1.2.xsd" version="1.2" '
        f'date="{now.date().isoformat()}" time="{now.time().isoformat()}" '
        'language="English" readOnly="false">',
        f"  <Units>{units_xml}</Units>",
        f"  <Project name={_attr(project_name or chain.name or 'curvetui project')}/>",
        f'  <Application name="curvetui" version={_attr(__version__)} '
        'desc="horizontal alignment exported by curvetui; local road or rail authority '
        'standards govern and a qualified engineer must check every result"/>',
        "  <Alignments>",
        f'    <Alignment name={_attr(chain.name or "alignment")} length="{n(total)}" '
        f'staStart="{n(chain.start_station)}">',
        "      <CoordGeom>",
    ]
    for el in elements:
        sta = f'staStart="{n(el.station)}"'
        length = f'length="{n(element_length(el))}"'
        if isinstance(el, LineElement):
            lines.append(
                f"        <Line {sta} {length}>{pt('Start', el.start)}{pt('End', el.end)}</Line>"
            )
        elif isinstance(el, ArcElement):
            rot = "cw" if el.rot > 0 else "ccw"
            lines.append(
                f'        <Curve rot="{rot}" crvType="arc" radius="{n(el.radius)}" {length} '
                f'delta="{deg(arc_sweep(el))}" {sta}>{pt("Start", el.start)}'
                f"{pt('Center', el.center)}{pt('End', el.end)}{pt('PI', el.pi)}</Curve>"
            )
        elif isinstance(el, SpiralElement):
            rot = "cw" if el.rot > 0 else "ccw"
            r = el.radius_end if math.isfinite(el.radius_end) else el.radius_start
            r0 = "INF" if math.isinf(el.radius_start) else n(el.radius_start)
            r1 = "INF" if math.isinf(el.radius_end) else n(el.radius_end)
            lines.append(
                f'        <Spiral rot="{rot}" spiType="clothoid" {length} radiusStart="{r0}" '
                f'radiusEnd="{r1}" theta="{deg(el.length / (2 * r))}" {sta}>'
                f"{pt('Start', el.start)}{pt('PI', el.pi)}{pt('End', el.end)}</Spiral>"
            )
    lines += ["      </CoordGeom>", "    </Alignment>", "  </Alignments>", "</LandXML>", ""]
    return "\n".join(lines)


__all__ = ["landxml_text", "xml_text"]
