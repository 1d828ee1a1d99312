"""The superelevation diagram on the worksheets: a vector drawing with the key stations on
the PDF, their lines in the text and Markdown sheets, a short curve flagged in words.

Expected stations are hand arithmetic of the placement rule (Highway Engineering Handbook:
two-thirds of e at the PC, read; runout L_t = e_NC L_r / e, Green Book 2018 from memory):
for a simple curve, level crown = PC - 2/3 L_r and reverse crown = level crown + L_t, with
the PC, L_r and L_t read from the bend's own record."""

from __future__ import annotations

import io
import re
from pathlib import Path

import pytest
from pypdf import PdfReader

from curvetui import CAUTION
from curvetui.bend.service import evaluate_bend
from curvetui.core.units import METRIC
from curvetui.reports.sheet import render_markdown, render_pdf, render_text
from curvetui.stations import format_station
from curvetui.storage.project.model import Bend, Details, Project
from curvetui.storage.tables import road_table

INPUTS = {"speed": 80, "radius": 300, "deflection": 40, "pi_station": 1200}


def flat(text: str) -> str:
    return " ".join(text.split())


def project(inputs: dict, kind: str = "road") -> Project:
    return Project(Details(name="Scratch", client="Nobody", job_number="J-1"),
                   [Bend("B01", kind, inputs, station=1200.0)])  # fmt: skip


def hand_stations(inputs: dict) -> tuple[str, str]:
    rec = evaluate_bend("road", inputs, METRIC, road_table("aashto-2018-metric"), None)
    t, pc = rec["transition"], rec["geometry"]["pc"]
    level = pc - 2 / 3 * t["runoff"]
    return format_station(level, "metric"), format_station(level + t["runout"], "metric")


SHORT = {**INPUTS, "deflection": 5}  # the curve is shorter than the runoff's two shares


@pytest.fixture(scope="module")
def two_bends() -> tuple[list[str], PdfReader]:
    """One PDF (rendering costs): B01 as INPUTS, B02 the short curve; a text per page."""
    p = Project(
        Details(name="Scratch", client="Nobody", job_number="J-1"),
        [Bend("B01", "road", INPUTS, station=1200.0), Bend("B02", "road", SHORT, station=0.0)],
    )
    reader = PdfReader(io.BytesIO(render_pdf(p)))
    return [flat(page.extract_text()) for page in reader.pages], reader


def test_pdf_draws_the_diagram_in_lines_with_key_stations(two_bends):
    texts, reader = two_bends
    level, reverse = hand_stations(INPUTS)
    at = [i for i, t in enumerate(texts) if "Superelevation diagram (axis: centreline)" in t]
    assert len(at) == 2  # one block per bend
    page_text = texts[at[0]]
    assert level in page_text and reverse in page_text
    for word in ("Level crown", "Reverse crown", "Full superelevation from", "PC", "PT"):
        assert word in page_text, word
    page = reader.pages[at[0]]
    assert not page.images  # lines, not a bitmap
    stream = page.get_contents().get_data().decode("latin-1")
    assert len(re.findall(r"-?[\d.]+ -?[\d.]+ l\b", stream)) > 300  # two edges of 300 points
    for t in texts:
        assert flat(CAUTION) in t


def test_short_curve_is_said_on_every_face(two_bends):
    texts, _ = two_bends
    joined = " ".join(texts).split("Bend worksheet B02")[1]
    block = joined.split("Superelevation diagram (axis")[1]
    assert "NOTE: the curve is too short for its runoff" in block
    assert "Highest superelevation reached (short curve)" in block
    assert "Full superelevation from" not in block
    assert "never reached" in render_text(project(SHORT))
    assert "**NOTE** the curve is too short" in render_markdown(project(SHORT))


def test_text_and_markdown_list_the_key_stations():
    outside = {**INPUTS, "rotation_axis": "outside", "lanes_rotated": 2}
    level, _ = hand_stations(outside)
    text = render_text(project(outside))
    section = text.split("SUPERELEVATION DIAGRAM (key stations)")[1]
    assert "axis of rotation: outside" in section
    line = next(x for x in section.splitlines() if "Level crown" in x)
    # about the outside edge (n1 = 2: two 3.6 m lanes, crown between): at level crown the
    # outside edge stays at -0.02 x 3.6 = -0.072 m, the centreline too, the inside edge
    # -0.072 - 0.02 x 3.6 = -0.144 m
    assert level in line and line.split()[-3:] == ["-0.072", "-0.072", "-0.144"]
    _, reverse = hand_stations(INPUTS)
    md = render_markdown(project(INPUTS))
    assert "### Superelevation diagram (key stations)" in md
    assert f"| {reverse} |" in md


def test_no_diagram_is_said_and_rail_has_none():
    out = render_text(project({"speed": 60, "radius": 300}))
    assert "No superelevation diagram: the bend needs a deflection angle" in out
    rail = render_text(project({"speed": 100, "radius": 1000, "cant": 80, "deflection": 20},
                               "rail"))  # fmt: skip
    assert "SUPERELEVATION" not in rail


def test_the_block_fits_the_room_it_asks_for():
    """Drawn on a fresh page, each demo bend's diagram block (drawing, table, notes,
    caption) takes no more height than ``block_height`` reserves, so it is never split
    with its last line alone on a page (seen once: page 5 of the demo held one line)."""
    from curvetui.reports.sheet.content import build
    from curvetui.reports.sheet.crossfall import block_height, pdf_crossfall
    from curvetui.reports.sheet.layout import new_pdf

    demo = Path(__file__).parents[3] / "projects" / "quillmere-valley-road.json"
    s = build(demo)
    drawn = [b for b in s.bends if b.diagram is not None]
    assert drawn
    for b in drawn:
        pdf = new_pdf(s, "a4")
        pdf.add_page()
        top, page = pdf.get_y(), pdf.page
        pdf_crossfall(pdf, b.diagram, b.diagram_note, b.bend_id)
        assert pdf.page == page and pdf.get_y() - top <= block_height(b.diagram)
