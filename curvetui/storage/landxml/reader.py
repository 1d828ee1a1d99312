"""LandXML 1.2 horizontal alignments to Chains.

What is read (LandXML 1.2 schema; REFERENCES.md "Geometry data"): ``Units`` (Metric or
Imperial: lengths and angles, units.py), ``Project`` name, and ``Alignments/Alignment``
(name, length and staStart required) whose ``CoordGeom`` holds, in order, ``Line`` (Start,
End), ``Curve`` (rot cw|ccw required; Start, Center, End, optional PI; radius optional,
else |Start - Center|) and ``Spiral`` (length, radiusStart, radiusEnd, rot and spiType
required; only spiType clothoid, from a tangent (radius INF) to a curve or back; Start, PI,
End). Points are "northing easting [elevation]". Everything else inside CoordGeom, a
station equation, a point given by reference (pntRef) and any other spiral type is
refused with the element's name and line. Profiles, cross-sections and other parts of an
Alignment are left out with a note (horizontal alignments only).

The elements become a Chain through core/plan_elements.py (PIs where the tangents cross;
gaps, kinks and mismatches beyond its tolerances refused). The element stations and the
Alignment length are compared with the rebuilt alignment; a difference is a note.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

from curvetui.core.alignment import Chain
from curvetui.core.plan_elements import (
    POSITION_TOL,
    ArcElement,
    Element,
    ElementError,
    LineElement,
    SpiralElement,
    arc_sweep,
    chain_elements,
    element_length,
)
from curvetui.storage.landxml.units import FileUnits, units_of
from curvetui.storage.landxml.xmltree import LandXMLError, Node, read_file

MAX_LENGTH = 1e9  # [m] a million kilometres: no coordinate, length or radius is larger
UNIT_SYMBOLS = {
    "millimeter": "mm",
    "centimeter": "cm",
    "meter": "m",
    "kilometer": "km",
    "foot": "ft",
    "USSurveyFoot": "US survey ft",
    "inch": "in",
    "mile": "mi",
}


@dataclass(frozen=True)
class ImportedAlignment:
    """One alignment read: its chain (SI), the file's units, and notes for the user."""

    chain: Chain
    units: FileUnits
    project_name: str
    notes: list[str] = field(default_factory=list)


def alignment_nodes(root: Node) -> list[Node]:
    return [a for group in root.find_all("Alignments") for a in group.find_all("Alignment")]


def read_landxml(path: str | Path, name: str | None = None) -> ImportedAlignment:
    """The alignment called ``name`` in the LandXML file ``path`` (the only one when
    ``name`` is None). LandXMLError for anything that cannot be used."""
    root = read_file(path)
    return alignment_from_root(root, str(path), name)


def alignment_from_root(root: Node, source: str, name: str | None = None) -> ImportedAlignment:
    try:
        units = units_of(root.find("Units"), source)
    except ValueError as exc:
        raise LandXMLError(f"{source}: {exc}") from None
    nodes = alignment_nodes(root)
    if not nodes:
        raise LandXMLError(f"{source}: no Alignments/Alignment element")
    names = [n.attrs.get("name", "") for n in nodes]
    if name is None:
        if len(nodes) > 1:
            raise LandXMLError(
                f"{source}: {len(nodes)} alignments ({', '.join(repr(n) for n in names)}); "
                "choose one with --alignment NAME"
            )
        node = nodes[0]
    else:
        chosen = [n for n in nodes if n.attrs.get("name") == name]
        if not chosen:
            raise LandXMLError(
                f"{source}: no alignment named {name!r} (the file has "
                f"{', '.join(repr(n) for n in names)})"
            )
        node = chosen[0]
    project = root.find("Project")
    project_name = project.attrs.get("name", "") if project is not None else ""
    try:
        return _alignment(node, units, project_name)
    except (ElementError, ValueError) as exc:
        raise LandXMLError(f"{source}: {exc}") from None


def _required(node: Node, key: str) -> str:
    value = node.attrs.get(key)
    if value is None or not value.strip():
        raise ValueError(f"{node.where()}: the required attribute {key!r} is missing")
    return value


def _number(node: Node, key: str, text: str | None = None, allow_inf: bool = False) -> float:
    text = _required(node, key) if text is None else text
    try:
        value = float(text)
    except ValueError:
        raise ValueError(f"{node.where()}: {key} must be a number, got {text!r}") from None
    if math.isnan(value) or (math.isinf(value) and not allow_inf):
        raise ValueError(f"{node.where()}: {key} must be a finite number, got {text!r}")
    return value


def _length(node: Node, key: str, units: FileUnits, text: str | None = None) -> float:
    """A length or coordinate in metres, within +/-MAX_LENGTH (larger values are no
    alignment on Earth, and would overflow the clothoid's A^2 = R L)."""
    value = units.length(_number(node, key, text))
    if abs(value) > MAX_LENGTH:
        given = text if text is not None else node.attrs.get(key)
        raise ValueError(f"{node.where()}: {key} must be within +/-{MAX_LENGTH:g} m, got {given!r}")
    return value


def _point(parent: Node, tag: str, units: FileUnits, required: bool = True):
    node = parent.find(tag)
    if node is None:
        if required:
            raise ValueError(f"{parent.where()}: the required point <{tag}> is missing")
        return None
    if "pntRef" in node.attrs and not node.text.strip():
        raise ValueError(
            f"{node.where()}: points given by reference (pntRef) are not supported; "
            "write the coordinates in the element"
        )
    words = node.text.split()
    if len(words) not in (2, 3):
        raise ValueError(
            f"{node.where()}: must hold 'northing easting' (and an optional elevation), "
            f"got {node.text.strip()[:60]!r}"
        )
    northing = _length(node, "northing", units, words[0])
    easting = _length(node, "easting", units, words[1])
    return (easting, northing)


def _rot(node: Node) -> int:
    rot = _required(node, "rot")
    if rot not in ("cw", "ccw"):
        raise ValueError(f"{node.where()}: rot must be 'cw' or 'ccw', got {rot!r}")
    return 1 if rot == "cw" else -1


def _station(node: Node, units: FileUnits) -> float | None:
    if "staStart" not in node.attrs:
        return None
    return _length(node, "staStart", units)


def _radius(node: Node, key: str, units: FileUnits) -> float:
    text = _required(node, key).strip()
    value = _number(node, key, "inf" if text.upper() == "INF" else text, allow_inf=True)
    if math.isinf(value) and text.upper() != "INF":
        raise ValueError(f"{node.where()}: {key}: write an infinite radius as INF")
    if not value > 0:
        raise ValueError(f"{node.where()}: {key} must be a positive length or INF, got {text!r}")
    return _length(node, key, units, text) if math.isfinite(value) else math.inf


def _element(node: Node, units: FileUnits, notes: list[str]) -> Element:
    label = node.where()
    if node.tag == "Line":
        start, end = _point(node, "Start", units), _point(node, "End", units)
        return LineElement(start, end, _station(node, units), label)
    if node.tag == "Curve":
        rot = _rot(node)
        start, centre, end = (_point(node, t, units) for t in ("Start", "Center", "End"))
        if "radius" in node.attrs:
            radius = _length(node, "radius", units)
            if not radius > 0:
                raise ValueError(f"{label}: radius must be positive")
        else:
            radius = math.dist(start, centre)
        el = ArcElement(
            start,
            centre,
            end,
            rot,
            radius,
            _point(node, "PI", units, False),
            _station(node, units),
            label,
        )
        _attribute_notes(node, el, units, notes)
        return el
    if node.tag == "Spiral":
        kind = _required(node, "spiType")
        if kind != "clothoid":
            raise ValueError(
                f"{label}: spiType {kind!r} is not supported; only clothoid spirals are read"
            )
        rot = _rot(node)
        length = _length(node, "length", units)
        r0 = _radius(node, "radiusStart", units)
        r1 = _radius(node, "radiusEnd", units)
        start, pi, end = (_point(node, t, units) for t in ("Start", "PI", "End"))
        return SpiralElement(start, pi, end, length, r0, r1, rot, _station(node, units), label)
    raise ValueError(
        f"{label}: <{node.tag}> is not supported in CoordGeom; only Line, Curve and Spiral "
        "(clothoid) elements are read"
    )


def _attribute_notes(node: Node, el: ArcElement, units: FileUnits, notes: list[str]) -> None:
    """Optional length and delta compared with the arc's coordinates (a note if they differ)."""
    if "length" in node.attrs:
        given = _length(node, "length", units)
        measured = element_length(el)
        if abs(given - measured) > POSITION_TOL:
            notes.append(
                f"{el.label}: length {given:.4f} m differs from the arc's "
                f"{measured:.4f} m by its coordinates; the coordinates were used"
            )
    if "delta" in node.attrs:
        given = abs(units.angle(_number(node, "delta")))
        sweep = arc_sweep(el)
        if abs(given - sweep) > 1e-6 * max(1.0, sweep):
            notes.append(
                f"{el.label}: delta {math.degrees(given):.6f} deg (angular unit "
                f"{units.angular}) differs from the arc's {math.degrees(sweep):.6f} deg by "
                "its coordinates; the coordinates were used"
            )


def _alignment(node: Node, units: FileUnits, project_name: str) -> ImportedAlignment:
    from curvetui.core.plan_chain import chain_from_elements

    name = _required(node, "name")
    length = _length(node, "length", units)
    start_station = _length(node, "staStart", units)
    notes: list[str] = []
    geometry = node.find_all("CoordGeom")
    if len(geometry) != 1:
        raise ValueError(
            f"{node.where()}: must hold one CoordGeom (the horizontal geometry), "
            f"found {len(geometry)}"
        )
    for child in node.children:
        if child.tag == "StaEquation":
            raise ValueError(
                f"{child.where()}: station equations are not supported (the alignment's "
                "stations would change along it)"
            )
        if child.tag != "CoordGeom":
            notes.append(f"{child.where()}: left out (horizontal alignment only)")
    elements = [
        _element(child, units, notes) for child in geometry[0].children if child.tag != "Feature"
    ]
    chain = chain_from_elements(elements, start_station, name)
    _station_notes(chain, elements, length, units, notes)
    if units.linear_name == "USSurveyFoot":
        notes.append(
            "lengths in US survey feet were converted exactly (1200/3937 m); the project "
            "uses the international foot (0.3048 m), so its numbers are 2 parts per million "
            "larger than the file's"
        )
    return ImportedAlignment(chain, units, project_name, notes)


def _station_notes(
    chain: Chain, elements: list[Element], length: float, units: FileUnits, notes: list[str]
) -> None:
    """Notes where the file's Alignment length or an element's staStart differs from the
    rebuilt alignment by more than POSITION_TOL (shown in the file's length unit)."""
    unit = UNIT_SYMBOLS.get(units.linear_name, units.linear_name)
    rebuilt = [el for el in chain_elements(chain) if element_length(el) > POSITION_TOL]
    total = sum(element_length(el) for el in rebuilt)
    if abs(total - length) > POSITION_TOL:
        notes.append(
            f"the Alignment's length {length / units.linear:.4f} {unit} differs from its "
            f"elements' {total / units.linear:.4f} {unit}; the elements were used"
        )
    given = [el for el in elements if element_length(el) > POSITION_TOL]
    for el, new in zip(given, rebuilt, strict=False):
        if el.station is not None and new.station is not None:
            if abs(el.station - new.station) > POSITION_TOL:
                notes.append(
                    f"{el.label}: staStart {el.station / units.linear:.4f} {unit} differs "
                    f"from the station along the alignment, {new.station / units.linear:.4f}"
                    f" {unit}; stations run from the Alignment's staStart"
                )
