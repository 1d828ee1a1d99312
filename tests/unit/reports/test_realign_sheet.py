"""The realignment worksheet (reports.realign_sheet and its PDF, text and Markdown forms).

Only the face is under test: its table must show the RealignDesign's own arrays as the
command rounds them (0.1 mm), a failed design must be shown failed, the caution must be on
every page, and the diagram must be vector lines. The design values themselves are
checked against the worked example and hand calculations in tests/unit/core and
tests/unit/cli/test_cli_realign.py. The survey here is invented (a ramp, a constant
versine with bumps, a ramp down) and checks nothing about the engine.
"""

from __future__ import annotations

import io
import re

import numpy as np
import pytest
from pypdf import PdfReader

from curvetui import CAUTION
from curvetui.core.units import unit_system
from curvetui.core.versine_design import design_realignment
from curvetui.reports.realign_sheet import build_sheet
from curvetui.reports.sheet.realign_page import render_pdf
from curvetui.reports.sheet.realign_text import ROWS_PER_PAGE, render_markdown, render_text

METRIC = unit_system("metric")
CHORD = 20.0  # m


def survey(n_body: int = 10):
    """Stations every 10 m, versines in m: 0, ramp, body with bumps, ramp, 0."""
    v = [0.0] * 4 + [0.01, 0.02, 0.03] + [0.04 + 0.002 * ((i % 3) - 1) for i in range(n_body)]
    v += [0.03, 0.02, 0.01] + [0.0] * 4
    st = 1000.0 + 10.0 * np.arange(len(v))
    return st, np.array(v)


@pytest.fixture(scope="module")
def good():
    st, m = survey()
    return design_realignment(st, m, CHORD, max_transition=4)


@pytest.fixture(scope="module")
def infeasible():
    st, m = survey()
    return design_realignment(st, m, CHORD, slew_limit=1e-5, max_transition=4)


def shown(x_m: float) -> str:
    """A length in m shown in mm to 0.1, as the command prints it (no -0.0)."""
    r = round(x_m * 1000.0, 1)
    return f"{(r if r != 0 else 0.0):.1f}"


def test_every_row_shows_the_designs_arrays(good):
    s = build_sheet(good, None, METRIC, "survey.csv")
    assert good.feasible and len(s.table) == good.stations.size
    for i, row in enumerate(s.table):
        assert row[0] == f"{good.stations[i]:.2f}"
        assert row[1] == shown(good.measured[i])
        assert row[2] == shown(good.designed[i])
        assert row[3] == shown(good.slews[i])
        slew = float(row[3])
        assert row[4] == ("out" if slew > 0 else "in" if slew < 0 else "")
    assert [n for n, _ in s.keys] == ["TS", "SC", "CS", "ST"]
    assert s.keys[0][1] == pytest.approx(good.ts) and s.keys[3][1] == pytest.approx(good.st)
    assert s.status == "PASS"
    labels = {x.label: x for x in s.design}
    assert labels["Radius"].value == f"{good.radius:.1f} m"
    assert labels["Greatest slew"].value == f"{shown(good.max_slew)} mm"


def test_a_failed_design_shows_its_failure_and_the_smallest_limit(infeasible):
    assert not infeasible.feasible and infeasible.smallest_limit is not None
    s = build_sheet(infeasible, None, METRIC, "survey.csv")
    assert s.status == "FAIL"
    failed = {x.label: x.value for x in s.design if x.fail}
    assert failed["Design"] == "INFEASIBLE"
    assert "NOT MET" in failed["Slew limit"]
    assert failed["Smallest limit that works"] == f"{shown(infeasible.smallest_limit)} mm"
    assert "Why infeasible" in failed
    text = render_text(s)
    assert "INFEASIBLE  <-- FAIL" in text and "Smallest limit that works" in text
    assert "**FAIL: INFEASIBLE**" in render_markdown(s)
    pages = [p.extract_text() for p in PdfReader(io.BytesIO(render_pdf(s))).pages]
    assert "INFEASIBLE" in pages[0] and "NOT MET" in pages[0]


def test_text_pages_each_end_with_the_caution_and_the_table_runs_on():
    st, m = survey(n_body=150)
    d = design_realignment(st, m, CHORD, max_transition=3)
    s = build_sheet(d, None, METRIC, "long.csv")
    pages = render_text(s).split("\f")
    want = 1 + -(-len(s.table) // ROWS_PER_PAGE)
    assert len(pages) == want >= 3
    assert all(p.strip().endswith(CAUTION) for p in pages)
    body = [line for p in pages[1:] for line in p.splitlines() if re.match(r"\s+\d+\.\d\d ", line)]
    assert len(body) == len(s.table)
    pdf = PdfReader(io.BytesIO(render_pdf(s)))
    assert len(pdf.pages) >= 3  # the slew table runs on
    for page in pdf.pages:
        assert "qualified engineer" in re.sub(r"\s+", " ", page.extract_text())


def test_markdown_has_a_row_per_station_and_the_caution(good):
    md = render_markdown(build_sheet(good, None, METRIC, "a|b.csv"))
    rows = [line for line in md.splitlines() if re.match(r"\| \d+\.\d\d \|", line)]
    assert len(rows) == good.stations.size
    assert md.count(f"> {CAUTION}") == 2
    assert "a\\|b.csv" in md  # a pipe in a file name cannot break the table


def test_the_diagram_is_vector_lines(good):
    page = PdfReader(io.BytesIO(render_pdf(build_sheet(good, None, METRIC, "s.csv")))).pages[0]
    stream = page.get_contents().get_data().decode("latin-1")
    # a polyline through every station: a move then n - 1 line segments in a row (measured,
    # designed, slews); table borders are single segments
    n = good.stations.size
    segment = r"-?[\d.]+ -?[\d.]+ l\s+"
    runs = re.findall(f"(?:{segment}){{{n - 1},}}", stream)
    assert len(runs) >= 3
    assert not page.images


def test_control_characters_in_the_file_name_are_cleaned(good):
    s = build_sheet(good, None, METRIC, "bad\x1b]0;x\x07.csv")
    assert "\x1b" not in render_text(s) and "\x07" not in render_markdown(s)


def test_local_corrections_are_on_the_sheet_station_by_station():
    """A run of held stations met with local versine corrections: each hold says so, and
    every correction the design carries is listed at its station, rounded as shown (the
    designed versines are then not the smooth diagram: a checker must see it)."""
    st, m = survey(16)
    holds = [(float(st[i]), 0.0) for i in (10, 11, 12, 13)]
    design = design_realignment(st, m, CHORD, holds=holds, max_transition=4, corrections=True)
    assert design.corrections  # four held stations in a row: the smooth diagram cannot
    sheet = build_sheet(design, None, METRIC, "s.csv")
    lines = {line.label: line.value for line in sheet.design}
    for station, _ in holds:
        assert "met with local corrections" in lines[f"Hold at {station:.2f} m"]
    listed = lines["Corrections (m: mm)"]
    for station, value in design.corrections:
        assert f"{station:.2f} {value * 1000:.1f}" in listed
    assert "local versine corrections" in lines["Local corrections"]
