"""A project file read and written back unchanged is the same file (issue 14): every key
the file holds, as it holds it (a whole number stays whole, a null stays null, a key left
out stays out). The data are invented (the bundled demo scenario and made-up bends)."""

from __future__ import annotations

import json
from pathlib import Path

from curvetui.storage.project.files import load_project, project_text

DEMO = Path(__file__).resolve().parents[3] / "projects" / "quillmere-valley-road.json"


def typed(value):
    """JSON with each number tagged by its type, so that 420 and 420.0 differ."""
    if isinstance(value, dict):
        return {k: typed(v) for k, v in value.items()}
    if isinstance(value, list):
        return [typed(v) for v in value]
    return (type(value).__name__, value)


def test_the_demo_written_back_is_the_same_bytes():
    project, _ = load_project(DEMO)
    assert project_text(project) == DEMO.read_text(encoding="utf-8")


def test_a_sparse_file_keeps_its_shape(tmp_path):
    data = {
        "curvetui_project_version": 2,
        "details": {"name": "Sparse (invented)", "units": "us"},
        "bends": [
            {
                "id": "S1",
                "kind": "road",
                "station": 1200,
                "inputs": {"speed": 50, "radius": 800, "spiral_in": None, "pi_station": "12+00"},
            },
            {"id": "S2", "kind": "rail", "inputs": {"speed": 40, "radius": 1500, "cant": 3}},
        ],
    }
    path = tmp_path / "sparse.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    project, _ = load_project(path)
    assert typed(json.loads(project_text(project))) == typed(data)


def test_a_key_left_out_is_written_once_it_is_given(tmp_path):
    data = {
        "curvetui_project_version": 2,
        "details": {"name": "Sparse (invented)", "units": "metric"},
        "bends": [{"id": "S1", "kind": "road", "inputs": {"speed": 50, "radius": 800}}],
    }
    path = tmp_path / "sparse.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    project, _ = load_project(path)
    project.details.client = "Hollow Lane Trust (invented)"
    project.bends[0].notes = "typed later"
    out = json.loads(project_text(project))
    assert out["details"]["client"] == "Hollow Lane Trust (invented)"
    assert out["bends"][0]["notes"] == "typed later"
    assert "station" not in out["bends"][0] and "results" not in out["bends"][0]
