"""`curvetui find-curves --jobs 2`: the register is the same, byte for byte, as with one
process. Needs the real core.curve_finder (the processes import it afresh, so the test
stand-in cannot serve them). No engineering value is checked: the check is that two runs
agree byte for byte (the lines are the invented demo centrelines)."""

from __future__ import annotations

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).parents[1] / "storage"))
from centreline_samples import geodesic_alignment, write_geojson  # noqa: E402

from curvetui.cli import main  # noqa: E402


def test_jobs_give_the_same_register(tmp_path):
    lines = {
        f"J{i}": geodesic_alignment(-2.3 + i / 100, 53.7, 30.0 * i, 200.0 + 50 * i, 30.0 + 5 * i)
        for i in range(3)
    }
    src = write_geojson(tmp_path / "j.geojson", lines)
    one, two = tmp_path / "one.csv", tmp_path / "two.csv"
    assert main(["find-curves", str(src), "-o", str(one), "--speed", "60"]) == 0
    assert main(["find-curves", str(src), "-o", str(two), "--speed", "60", "--jobs", "2"]) == 0
    assert one.read_bytes() == two.read_bytes()
    assert len(one.read_text().splitlines()) == 4  # the header and a curve per feature
