"""The app stopped by an unexpected error: the unsaved edits kept, one line, exit code 3.

A handler is made to raise (monkeypatch) while the app runs under Pilot, after an edit; and
through the command line (`curvetui FILE`, the app run headless in a fresh interpreter) to
see the one line on stderr, no traceback and the exit code. The project is the bundled demo,
an invented scenario, copied into a temporary folder; only the app's behaviour is checked.
"""

from __future__ import annotations

import asyncio
import json
import os
import re
import subprocess
import sys
from pathlib import Path

import pytest
from app_screen import copy_demo, ready

from curvetui.app.app import CurveApp, build_app
from curvetui.app.crash import crash_line
from curvetui.storage.project.files import load_project

pytestmark = pytest.mark.app  # starts Textual: `pytest -m "not app"` leaves it out

ROOT = Path(__file__).resolve().parents[3]
RECOVERED = r"quillmere-valley-road\.recovered-\d{8}-\d{6}\.json"


def test_an_error_in_a_handler_keeps_the_unsaved_edit_and_sets_exit_code_3(tmp_path, monkeypatch):
    path = copy_demo(tmp_path)
    before = path.read_bytes()

    def broken(self):
        raise RuntimeError("forced \x1b]0;title\x07 failure")

    monkeypatch.setattr(CurveApp, "action_toggle_theme", broken)  # F6
    app = build_app(path)

    async def steps():
        async with app.run_test(size=(120, 40)) as pilot:
            await ready(app, pilot)
            app.query_one("#in-radius").value = "650"  # QV-01's radius, as a paste
            await pilot.pause()
            assert app.session.dirty
            await pilot.press("f6")
            await pilot.pause()

    with pytest.raises(RuntimeError, match="forced"):  # run_test hands it on to the test
        asyncio.run(steps())
    assert app.return_code == 3
    saved = app.crash.saved
    assert saved is not None and saved.parent == path.parent
    assert re.fullmatch(RECOVERED, saved.name)
    assert path.read_bytes() == before  # the project file is not touched
    project, _ = load_project(saved)
    assert project.bends[0].inputs["radius"] == 650
    line = crash_line(app.crash)
    assert "RuntimeError: forced ?]0;title? failure" in line and str(saved) in line
    assert "\x1b" not in line


# `curvetui FILE` through main() as on a terminal, the app headless; once its worksheet is
# built, the given edit is made and a handler raises.
PROBE = """
import sys, types
from textual.app import App
from curvetui.app import app as app_mod
from curvetui.cli import main, project_cmd

class Tty:
    def isatty(self):
        return True

project_cmd.sys = types.SimpleNamespace(stdin=Tty(), stdout=Tty(), stderr=sys.stderr)
build = app_mod.CurveApp.on_ready
edit = sys.argv[2]

async def on_ready(self):
    await build(self)
    if edit:
        self.session.set_notes(self.session.project.bends[0], edit)
    self.call_later(self.action_toggle_theme)

def broken(self):
    raise ZeroDivisionError("division by zero")

app_mod.CurveApp.on_ready = on_ready
app_mod.CurveApp.action_toggle_theme = broken
app_mod.CurveApp.run = lambda self: App.run(self, headless=True, size=(80, 24))
sys.exit(main([sys.argv[1]]))
"""


@pytest.mark.parametrize("edit", ["a note typed before the crash", ""])
def test_the_command_line_prints_one_line_and_exits_3(tmp_path, edit):
    path = copy_demo(tmp_path)
    proc = subprocess.run(
        [sys.executable, "-c", PROBE, str(path), edit],
        capture_output=True,
        text=True,
        env=dict(os.environ, PYTHONPATH=str(ROOT)),
        cwd=tmp_path,
        check=False,
        timeout=60,
    )
    assert proc.returncode == 3, proc.stderr
    lines = proc.stderr.splitlines()
    assert len(lines) == 1, proc.stderr  # one line, no traceback
    assert "Traceback" not in proc.stderr
    head = "curvetui: error: the app stopped on an unexpected error "
    assert lines[0].startswith(head + "(ZeroDivisionError: division by zero); ")
    copies = [p for p in tmp_path.iterdir() if re.fullmatch(RECOVERED, p.name)]
    if edit:
        assert len(copies) == 1 and lines[0].endswith(f"unsaved changes saved to {copies[0]}")
        assert json.loads(copies[0].read_text())["bends"][0]["notes"] == edit
    else:
        assert copies == [] and lines[0].endswith("; there were no unsaved changes")
