"""A crash of the app keeps the unsaved edits (curvetui.app.crash), with no Textual running.

The project is the bundled demo, an invented scenario, copied into a temporary folder; only
the app's behaviour is under test (the recovery copy's name, that it is new and exclusive,
that it holds what the project's serialiser writes, and the one line printed), no
engineering value. The app driven by Pilot is in test_app_crash.py.
"""

from __future__ import annotations

import json
import os
import shutil
from datetime import datetime
from pathlib import Path

import pytest

from curvetui.app.crash import (
    CRASH_EXIT,
    Crash,
    crash_line,
    recover,
    recovery_path,
    short_reason,
    write_new,
)
from curvetui.app.session import Session
from curvetui.storage.project.files import load_project, project_text

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"
WHEN = datetime(2026, 12, 2, 9, 41, 7)


@pytest.fixture
def demo_path(tmp_path: Path) -> Path:
    target = tmp_path / "quillmere-valley-road.json"
    shutil.copyfile(DEMO, target)
    return target


def test_exit_code_is_three_apart_from_pass_fail_and_bad_input():
    assert CRASH_EXIT == 3


def test_recovery_name_sits_beside_the_project_with_the_time():
    p = recovery_path(Path("/work/job/quillmere-valley-road.json"), WHEN)
    assert p == Path("/work/job/quillmere-valley-road.recovered-20261202-094107.json")
    assert recovery_path(Path("a/b.json"), WHEN, 2).name == "b.recovered-20261202-094107-3.json"


def test_a_copy_of_unsaved_edits_is_what_the_serialiser_writes_and_the_file_is_untouched(
    demo_path,
):
    before = demo_path.read_bytes()
    s = Session.open(demo_path)
    s.set_input(s.project.bends[0], "radius", "650")
    crash = recover(s, RuntimeError("forced"), WHEN)
    name = "quillmere-valley-road.recovered-20261202-094107.json"
    assert crash.saved == demo_path.parent / name
    assert crash.saved.read_text(encoding="utf-8") == project_text(s.project)
    assert demo_path.read_bytes() == before
    project, _ = load_project(crash.saved)  # the copy opens as a project
    assert project.bends[0].inputs["radius"] == 650
    line = crash_line(crash)
    assert line.startswith("curvetui: error: the app stopped on an unexpected error")
    assert "(RuntimeError: forced)" in line and str(crash.saved) in line
    assert "\n" not in line


def test_a_second_crash_in_the_same_second_takes_the_next_name(demo_path):
    s = Session.open(demo_path)
    s.set_notes(s.project.bends[0], "changed")
    first = recover(s, RuntimeError("one"), WHEN).saved
    second = recover(s, RuntimeError("two"), WHEN).saved
    assert first.name.endswith("094107.json") and second.name.endswith("094107-2.json")
    assert first.read_text() == second.read_text()


def test_no_unsaved_edits_no_copy(demo_path):
    s = Session.open(demo_path)
    crash = recover(s, KeyError("x"), WHEN)
    assert crash.saved is None and not crash.unsaved
    assert list(demo_path.parent.iterdir()) == [demo_path]
    assert crash_line(crash).endswith("; there were no unsaved changes")


def test_a_planted_symlink_is_never_written_through(demo_path, tmp_path):
    outside = tmp_path / "outside.txt"
    outside.write_text("keep")
    os.symlink(outside, recovery_path(demo_path, WHEN))
    with pytest.raises(FileExistsError):
        write_new(recovery_path(demo_path, WHEN), "x")
    s = Session.open(demo_path)
    s.set_notes(s.project.bends[0], "changed")
    crash = recover(s, RuntimeError("forced"), WHEN)
    assert crash.saved.name.endswith("-2.json") and not crash.saved.is_symlink()
    assert outside.read_text() == "keep"


def test_a_folder_that_cannot_be_written_falls_back_to_the_temporary_folder(demo_path, monkeypatch):
    spare = demo_path.parent / "spare"
    spare.mkdir()
    monkeypatch.setattr("tempfile.gettempdir", lambda: str(spare))
    s = Session.open(demo_path)
    s.set_notes(s.project.bends[0], "changed")
    s.path = demo_path.parent / "removed-meanwhile" / demo_path.name  # (even root cannot)
    crash = recover(s, RuntimeError("forced"), WHEN)
    assert crash.saved.parent == spare
    assert crash.saved.read_text(encoding="utf-8") == project_text(s.project)


def test_text_a_project_file_cannot_hold_is_kept_as_json_escapes(demo_path):
    s = Session.open(demo_path)
    s.set_notes(s.project.bends[0], "lone \ud800 surrogate")
    crash = recover(s, RuntimeError("forced"), WHEN)
    assert json.loads(crash.saved.read_text(encoding="utf-8"))["bends"][0]["notes"] == (
        "lone \ud800 surrogate"
    )


def test_the_line_cannot_carry_escape_sequences():
    reason = short_reason(ValueError("bad id \x1b]0;owned\x07 here\nsecond line"))
    assert reason == "ValueError: bad id ?]0;owned? here"
    line = crash_line(Crash(reason, saved=Path("/tmp/a\x1b[2Jb.json")))
    assert "\x1b" not in line and "a?[2Jb.json" in line
    assert len(short_reason(RuntimeError("x" * 500))) == 160
    assert short_reason(RuntimeError()) == "RuntimeError"
