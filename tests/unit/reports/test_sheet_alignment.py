"""The alignment page of the worksheets (PDF, text, Markdown) and the alignment's verdicts in
`check --project`: present, and a warning never hidden.

The warning case: two reverse simple curves, 80 km/h, R 300 m, D 20 deg, 6 % built, one
3.6 m lane rotated. By hand: L_r = w e / Delta = 3.6 x 0.06 / 0.005 = 43.2 m (runoff formula
read, REFERENCES.md "Transitions"; Delta 0.50 % at 80 km/h is the shipped table's value,
marked there from memory), 2/3 of it on the tangent (the default share, AASHTO 60-90 %):
28.8 m from each bend, 57.6 m together; T = 300 tan 10 deg = 52.898 m.
"""

from __future__ import annotations

import io
import json
import math
from pathlib import Path

from pypdf import PdfReader

from curvetui.cli import main
from curvetui.reports.sheet.pdf import render_pdf
from curvetui.reports.sheet.text import render_markdown, render_text

T = 300 * math.tan(math.radians(10))


def flat(text: str) -> str:
    return " ".join(text.split())


def reverse_pair(tmp_path: Path, tangent: float = 40.0) -> Path:
    pi1 = (0.0, 500.0)
    d = tangent + 2 * T
    pi2 = (d * math.sin(math.radians(20)), 500 + d * math.cos(math.radians(20)))
    inputs = {"speed": 80, "radius": 300, "superelevation": 6}
    data = {
        "curvetui_project_version": 3,
        "details": {"name": "Reverse pair (test)", "units": "metric"},
        "bends": [
            {"id": "R-1", "kind": "road", "inputs": dict(inputs)},
            {"id": "R-2", "kind": "road", "inputs": dict(inputs)},
        ],
        "alignment": {
            "name": "Test line",
            "points": [
                {"easting": 0.0, "northing": 0.0},
                {"easting": pi1[0], "northing": pi1[1], "bend": "R-1"},
                {"easting": pi2[0], "northing": pi2[1], "bend": "R-2"},
                {"easting": pi2[0], "northing": pi2[1] + 500},
            ],
        },
    }
    path = tmp_path / "pair.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    return path


WARNED = "WARNING R-1 to R-2: reverse bends with 40.00 m of tangent, less than the 57.60 m"


def test_a_warning_is_on_every_face(tmp_path, capsys):
    path = reverse_pair(tmp_path)
    pdf = PdfReader(io.BytesIO(render_pdf(path)))
    assert WARNED in flat(pdf.pages[0].extract_text())  # on the summary
    assert WARNED in flat(pdf.pages[1].extract_text())  # and on the alignment page
    assert "(R-1 28.80 m, R-2 28.80 m)" in flat(pdf.pages[1].extract_text())
    text = render_text(path)
    assert "ALIGNMENT Test line: WARNING" in text and WARNED in flat(text)
    assert WARNED in flat(render_markdown(path))
    assert main(["check", "--project", str(path)]) == 0  # a warning is no failure
    out = flat(capsys.readouterr().out)
    assert "Alignment Test line: WARNING" in out and WARNED in out


def test_a_longer_tangent_passes(tmp_path):
    text = render_text(reverse_pair(tmp_path, tangent=58.0))
    assert "ALIGNMENT Test line: PASS" in text and "PASS: no warnings" in text
