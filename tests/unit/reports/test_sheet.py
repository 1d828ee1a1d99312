"""Printable bend worksheets (curvetui.reports.sheet and `curvetui sheet`).

The project used here, projects/quillmere-valley-road.json, is an invented demonstration
scenario: its names and numbers are made up and only the worksheet's output is under test.
The one value checked against a published source is the minimum radius of QV-04 (80 km/h,
e_max 8 %): 229 m, from AASHTO Green Book 2018 Table 3-7, not from curvetui's own output.
"""

from __future__ import annotations

import io
import json
import re
import shutil
import subprocess
import types
from pathlib import Path

import pytest
from pypdf import PdfReader

from curvetui import CAUTION
from curvetui.cli import main
from curvetui.inputs import InputError
from curvetui.reports.sheet import (
    render_markdown,
    render_pdf,
    render_text,
    sheets_path,
    write_sheets,
)
from curvetui.storage.project.files import load_project
from curvetui.storage.project.model import Bend, Details, Project

DEMO = Path(__file__).resolve().parents[3] / "projects" / "quillmere-valley-road.json"
DEMO_IDS = ["QV-01", "QV-02", "QV-03", "QV-04", "QV-05", "QV-06", "QS-01", "QS-02"]
FAILING = {"QV-04", "QV-05"}

# with pytest-xdist (`--dist loadgroup`) this module's tests run on one worker, so the demo's
# sheets are rendered once, not once per worker; without xdist the mark does nothing
pytestmark = pytest.mark.xdist_group("demo_sheets")


def flat(text: str) -> str:
    return " ".join(text.split())


@pytest.fixture(scope="module")
def demo_pdf() -> bytes:
    return render_pdf(DEMO)


@pytest.fixture(scope="module")
def demo_reader(demo_pdf) -> PdfReader:
    """The demo's sheets, parsed once for the module; the tests only read it."""
    return PdfReader(io.BytesIO(demo_pdf))


@pytest.fixture(scope="module")
def pages(demo_reader) -> list[str]:
    return [flat(p.extract_text()) for p in demo_reader.pages]


def first_page(pages: list[str], bend_id: str) -> int:
    """The index of the page a bend's worksheet starts on (its heading, printed once)."""
    found = [i for i, p in enumerate(pages) if f"Bend worksheet {bend_id}" in p]
    assert len(found) == 1, f"{bend_id}: {len(found)} worksheet headings"
    return found[0]


def _pages_of(pages: list[str], bend_id: str) -> int:
    """How many pages a bend's worksheet takes in the demo's sheets."""
    start = first_page(pages, bend_id)
    starts = sorted(first_page(pages, b) for b in DEMO_IDS) + [len(pages)]
    return next(s for s in starts if s > start) - start


def page_of(pages: list[str], bend_id: str) -> str:
    """A bend's worksheet: its first page and those it runs on to, up to the next bend's."""
    start = first_page(pages, bend_id)
    end = start + 1
    while end < len(pages) and "Bend worksheet " not in pages[end]:
        end += 1
    return " ".join(pages[start:end])


def worksheet_order(pages: list[str]) -> list[str]:
    """The bends whose worksheets start on each page, in page order."""
    return [m.group(1) for p in pages for m in [re.search(r"Bend worksheet (\S+)", p)] if m]


def test_summary_then_each_bend_from_a_new_page(pages):
    # a long working runs on to a second page (curvetui.reports.sheet.pdf.make_pdf), the
    # longest (spirals, sight, the existing-curve lines) to a third
    # the demo holds an alignment: its page comes second
    assert 2 + len(DEMO_IDS) <= len(pages) <= 2 + 3 * len(DEMO_IDS)
    assert "project summary" in pages[0]
    assert "Alignment: Quillmere Valley Road centreline" in pages[1]
    assert worksheet_order(pages) == DEMO_IDS
    starts = [first_page(pages, bend_id) for bend_id in DEMO_IDS]
    assert starts[0] == 2 and starts == sorted(starts)
    for i, text in enumerate(pages, start=1):
        assert f"page {i} of {len(pages)}" in text


def test_summary_lists_every_bend_with_its_status(pages):
    summary = pages[0]
    assert "8 bends: 6 PASS, 2 FAIL, 0 ERROR" in summary
    for bend_id in DEMO_IDS:
        status = "FAIL" if bend_id in FAILING else "PASS"
        assert re.search(rf"{bend_id} \w+ [\d+.]+ [\d.]+ km/h [\d.]+ m {status}", summary), bend_id
    assert "QV-04 road 2+710.000 80 km/h 160 m FAIL" in summary


def test_caution_on_every_page(pages):
    for i, text in enumerate(pages, start=1):
        assert flat(CAUTION) in text, f"page {i}"


def test_failing_bend_shows_fail_and_the_published_minimum_radius(pages):
    qv04 = page_of(pages, "QV-04")
    assert "Status FAIL" in qv04
    assert "FAIL radius 160.0 m is below the minimum radius 229.1 m" in qv04
    # Green Book 2018 Table 3-7: 80 km/h, e_max 8 % -> R_min 229 m
    assert "table rounds to 229 m" in qv04
    assert re.search(r"Minimum radius .*? FAIL", qv04)
    passing = page_of(pages, "QV-01")
    assert "Status PASS" in passing and "FAIL" not in passing


def test_title_block_fields_on_every_bend_page(pages):
    project, _ = load_project(DEMO)
    d = project.details
    for bend in project.bends:
        text = page_of(pages, bend.id)
        for value in (d.name, d.client, d.job_number, d.drawing, d.designer, d.checker):
            assert flat(value) in text, (bend.id, value)
        assert f"Date {d.date}" in text and f"Revision {d.revision}" in text
        assert f"Bend {bend.id} ({bend.kind})" in text


def test_inputs_standard_and_working_are_printed(pages):
    qv04 = page_of(pages, "QV-04")
    assert "Design speed 80 km/h" in qv04 and "Radius 160 m" in qv04
    assert "Green Book 2018" in qv04 and "Table 3-7" in qv04
    assert "R_min = 80^2 / (127 x (0.080 + 0.140))" in qv04
    assert "AASHTO Green Book 2018 Eq. 3-8" in qv04  # as "source: ..." or "Sources by line"
    rail = page_of(pages, "QS-01")
    assert "EN 13803" in rail and "Applied cant 60 mm" in rail
    assert "E = s v^2 / (g R)" in rail


def test_plan_sketch_labels_key_points_with_stations(pages):
    qv04 = page_of(pages, "QV-04")
    for label in ("PC 2+631.963", "PT 2+777.174", "PI 2+710.000"):
        assert label in qv04
    spiralled = page_of(pages, "QV-01")
    for name in ("TS", "SC", "CS", "ST"):
        assert re.search(rf"\b{name} \d\+\d{{3}}\.\d{{3}}", spiralled), name


def test_plan_is_drawn_in_vector_lines(demo_reader, pages):
    page = demo_reader.pages[first_page(pages, "QV-04")]
    stream = page.get_contents().get_data().decode("latin-1")
    lines = re.findall(r"-?[\d.]+ -?[\d.]+ l\b", stream)
    assert len(lines) > 100  # the arc alone is hundreds of short segments
    assert not page.images  # no bitmap


def test_fonts_are_embedded(demo_reader):
    page = demo_reader.pages[1]
    fonts = page["/Resources"]["/Font"]
    names = set()
    for ref in fonts.values():
        font = ref.get_object()
        names.add(str(font["/BaseFont"]))
        descriptor = font["/DescendantFonts"][0].get_object()["/FontDescriptor"]
        assert "/FontFile2" in descriptor.get_object()
    assert any("DejaVuSans" in n for n in names)


def test_chosen_bends_and_letter_paper():
    data = render_pdf(DEMO, ["QV-04", "QS-02"], paper="letter")
    reader = PdfReader(io.BytesIO(data))
    texts = [flat(p.extract_text()) for p in reader.pages]
    assert worksheet_order(texts) == ["QV-04", "QS-02"]
    # QV-04 is on the demo's alignment: its page (2) comes before the bends
    assert 4 <= len(reader.pages) <= 6 and first_page(texts, "QV-04") == 2
    box = reader.pages[0].mediabox
    assert (round(float(box.width)), round(float(box.height))) == (612, 792)
    text = flat(reader.pages[0].extract_text())
    assert "QV-04" in text and "QS-02" in text and "QV-01" not in text


def test_unknown_bend_is_refused():
    with pytest.raises(InputError, match="no bend QV-99"):
        render_pdf(DEMO, ["QV-99"])


def test_text_and_markdown_carry_the_same_key_values(pages):
    text, md = render_text(DEMO), render_markdown(DEMO)
    for out in (text, md):
        assert out.count(CAUTION) == 2 + len(DEMO_IDS)  # summary, alignment, bends
        assert "8 bends: 6 PASS, 2 FAIL, 0 ERROR" in out
        # QV-04's rounded R_min, its safe speed and that speed as shown (rounded down)
        assert "229 m" in out and "68.7379 km/h; shown 68 km/h" in out
        assert "FAIL radius 160.0 m is below the minimum radius 229.1 m" in out
        assert "page 10 of 10" in out
        for bend_id in DEMO_IDS:
            assert bend_id in out
    assert "68.7379 km/h; shown 68 km/h" in page_of(pages, "QV-04")
    assert text.count("\f") == 1 + len(DEMO_IDS)
    assert "## Bend QV-04: **FAIL**" in md and "| 4 | Minimum radius |" in md


def _project_with(inputs: dict) -> Project:
    return Project(
        Details(name="Scratch", client="Nobody", job_number="J-1"),
        [Bend("B01", "road", inputs, station=100.0)],
    )


def test_bend_without_deflection_gets_a_note_not_a_sketch():
    out = render_text(_project_with({"speed": 60, "radius": 300}))
    assert "No plan sketch: no deflection angle is given for this bend." in out
    text = flat(
        PdfReader(io.BytesIO(render_pdf(_project_with({"speed": 60, "radius": 300}))))
        .pages[1]
        .extract_text()
    )
    assert "no deflection angle" in text


def test_bend_with_bad_inputs_is_printed_as_error():
    project = _project_with({"speed": 60, "radius": -5})
    out = render_text(project)
    assert "1 bend: 0 PASS, 0 FAIL, 1 ERROR" in out
    assert "Status:      ERROR" in out and "ERROR $.bends[0].inputs.radius" in out
    pdf_text = flat(PdfReader(io.BytesIO(render_pdf(project))).pages[1].extract_text())
    assert "Status ERROR" in pdf_text


def test_write_sheets_beside_the_project(tmp_path, pages):
    path = tmp_path / "road.json"
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    data["bends"] = [b for b in data["bends"] if b["id"] == "QV-04"]  # one bend: fast
    data.pop("alignment")  # it names the bends left out
    path.write_text(json.dumps(data), encoding="utf-8")
    project, _ = load_project(path)
    session = types.SimpleNamespace(project=project, path=path)
    out = write_sheets(session, project.bends[0])
    assert out == tmp_path / "road.sheets.pdf" == sheets_path(path)
    # the summary, then QV-04's worksheet as the demo's sheets print it
    assert len(PdfReader(out).pages) == 1 + _pages_of(pages, "QV-04")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["road.json", "road.sheets.pdf"]


def test_write_sheets_needs_a_saved_project():
    session = types.SimpleNamespace(project=_project_with({"speed": 60, "radius": 300}), path=None)
    with pytest.raises(InputError, match="save the project first"):
        write_sheets(session)


def test_cli_writes_pdf_and_exits_0_with_failing_bends(tmp_path, capsys, pages):
    out = tmp_path / "sheets.pdf"
    assert main(["sheet", str(DEMO), "--bend", "QV-04", "-o", str(out)]) == 0  # QV-04 fails
    reader = PdfReader(out)
    assert len(reader.pages) == 2 + _pages_of(pages, "QV-04")  # summary, alignment, QV-04
    assert "FAIL" in reader.pages[0].extract_text()


def test_cli_text_and_md_to_stdout(capsys):
    assert main(["sheet", str(DEMO), "--bend", "QV-04", "--format", "text"]) == 0
    out = capsys.readouterr().out
    worksheets = out.split("\f")[2:]  # after the summary and the alignment page
    assert "ALIGNMENT Quillmere" in out.split("\f")[1]
    assert "BEND WORKSHEET QV-04" in out and "QV-01" not in "".join(worksheets)
    assert main(["sheet", str(DEMO), "--bend", "QV-04", "--format", "md", "-o", "-"]) == 0
    assert "## Bend QV-04: **FAIL**" in capsys.readouterr().out


def test_cli_unknown_bend_is_a_one_line_error(tmp_path, capsys):
    code = main(["sheet", str(DEMO), "--bend", "QV-99", "-o", str(tmp_path / "x.pdf")])
    err = capsys.readouterr().err
    assert code == 2
    assert err.count("\n") == 1 and "no bend QV-99" in err
    assert not (tmp_path / "x.pdf").exists()


def _read_pgm(path: Path) -> tuple[int, int, bytes]:
    data = path.read_bytes()
    fields = re.match(rb"P5\s+(\d+)\s+(\d+)\s+(\d+)\s", data)
    assert fields, "not a binary PGM"
    w, h = int(fields.group(1)), int(fields.group(2))
    return w, h, data[fields.end() : fields.end() + w * h]


@pytest.mark.skipif(not shutil.which("pdftoppm"), reason="pdftoppm (poppler-utils) not installed")
@pytest.mark.parametrize("page", [1, 5])
def test_rendered_page_is_not_blank(tmp_path, demo_pdf, page):
    pdf = tmp_path / "in.pdf"
    pdf.write_bytes(demo_pdf)
    subprocess.run(
        [
            "pdftoppm",
            "-r",
            "40",
            "-gray",
            "-f",
            str(page),
            "-l",
            str(page),
            str(pdf),
            str(tmp_path / "out"),
        ],
        check=True,
    )
    (pgm,) = tmp_path.glob("out-*.pgm")
    w, h, pixels = _read_pgm(pgm)
    assert len(pixels) == w * h
    dark = sum(1 for p in pixels if p < 128)
    assert dark > 0.01 * w * h  # text, tables and lines, not an empty page
    # the footer's caution is drawn near the bottom of the page
    bottom = pixels[int(h * 0.9) * w :]
    assert any(p < 128 for p in bottom)


def test_us_project_prints_its_own_units():
    project = Project(
        Details(name="US scratch", units="us"),
        [Bend("B1", "road", {"speed": 50, "radius": 800, "deflection": 30}, station=1200)],
    )
    page = flat(PdfReader(io.BytesIO(render_pdf(project))).pages[1].extract_text())
    assert "Design speed 50 mph" in page and "Radius 800 ft" in page
    assert "R 800 ft, deflection 30.000 deg" in page  # the plan sketch's legend
    assert "Station 12+00.00" in page
    assert " km/h" not in page


def test_road_bends_carry_their_superelevation_diagram(pages):
    # after the bend's messages, on its pages (tests/unit/reports/test_sheet_crossfall.py)
    drawn = [b for b in DEMO_IDS if "Superelevation diagram (axis" in page_of(pages, b)]
    assert drawn == ["QV-01", "QV-02", "QV-04", "QV-05", "QV-06"]
    assert "the normal crown is kept" in page_of(pages, "QV-03")


def test_the_alignment_page_to_bearing_with_its_table(pages):
    """The demo's alignment page (rules and sources: tests/unit/core/test_alignment_checks)."""
    page = pages[1]
    assert "Alignment: Quillmere Valley Road centreline" in page
    assert "Points of intersection" in page and "PASS: no warnings" in page
    assert "To bearing, north up, one scale both ways" in page
    # QV-04 by the alignment: PI 2+710, PC = PI - T = 2710 - 160 tan 26 deg = 2631.96
    assert "2+631.96" in page and "2+710.00" in page and "52.0000 L" in page
    assert "TxDOT Roadway Design Manual" in page
    assert flat(CAUTION) in page
