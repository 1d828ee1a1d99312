"""Start-up import boundaries: a command imports only the packages it needs.

`check road --json` and `check rail --json` need numpy and the engine, never pyarrow (batch),
jsonschema (project files), Textual (the app), Rich (tables on a terminal), scipy (Fresnel
integrals of a spiral) or fpdf (PDF worksheets). Each case runs `python -m curvetui ...` in a
fresh interpreter, through ``curvetui/__main__.py``, and reports ``sys.modules`` after the
command finished. This is a boundary test, not a timing test: timing is in
``benchmarks/startup.py``.

The controls show the probe sees a lazy import when one happens: a spiral loads scipy, a
project file with a problem loads jsonschema (a valid one passes the quick check of the
shipped schema without it).

Source of the expectations: none outside the project; these are the project's own import
boundaries (issue 12, item 7), no engineering value is checked here.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

import curvetui

ROOT = Path(curvetui.__file__).resolve().parents[1]
PROJECT = ROOT / "projects" / "quillmere-valley-road.json"

# Runs the command as `python -m curvetui ARGS` would, then prints one JSON line with the
# exit code, the command's own output and the top-level packages that were imported.
PROBE = """
import contextlib, io, json, runpy, sys
args = json.loads(sys.argv[1])
sys.argv = ["curvetui", *args]
out = io.StringIO()
code = None
with contextlib.redirect_stdout(out):
    try:
        runpy.run_module("curvetui", run_name="__main__", alter_sys=True)
    except SystemExit as exc:
        code = exc.code
loaded = sorted({name.split(".")[0] for name in sys.modules})
ours = sorted(name for name in sys.modules if name.startswith("curvetui."))
print(json.dumps({"code": code, "out": out.getvalue(), "loaded": loaded, "ours": ours}))
"""

NEVER_FOR_JSON = ("pyarrow", "jsonschema", "textual", "rich", "scipy", "fpdf")
# curvetui's own modules that a one-bend check has no use for: the other sub-commands, the
# batch, project files, the app, worksheets
NOT_OURS_FOR_CHECK = (
    "curvetui.cli.batch_cmd",
    "curvetui.cli.setout_cmd",
    "curvetui.cli.crossfall_cmd",
    "curvetui.cli.sheet_cmd",
    "curvetui.cli.tables_cmd",
    "curvetui.batch",
    "curvetui.storage.project",
    "curvetui.app",
    "curvetui.reports.sheet",
)


def probe(*args: str) -> dict:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    proc = subprocess.run(
        [sys.executable, "-c", PROBE, json.dumps(list(args))],
        capture_output=True,
        text=True,
        env=env,
        cwd=ROOT,
        check=False,
        timeout=60,
    )
    assert proc.returncode == 0, proc.stderr
    return json.loads(proc.stdout.strip().splitlines()[-1])


@pytest.mark.parametrize(
    ("args", "needed"),
    [
        (("check", "road", "--speed", "100", "--radius", "400", "--emax", "8", "--json"), "road"),
        (
            ("check", "rail", "--speed", "120", "--radius", "1000", "--cant", "100", "--json"),
            "rail",
        ),
    ],
)
def test_check_json_imports_no_heavy_package(args, needed):
    result = probe(*args)
    # the command really ran: exit code 0 and one JSON record of the right kind
    assert result["code"] == 0
    record = json.loads(result["out"])
    assert record["kind"] == needed
    assert record["status"] == "pass"
    assert "numpy" in result["loaded"]  # the engine ran (it is numpy throughout)
    heavy = sorted(set(NEVER_FOR_JSON) & set(result["loaded"]))
    assert heavy == [], f"`{' '.join(args)}` imported {heavy}"
    assert f"curvetui.cli.{needed}_cmd" in result["ours"]
    extra = [m for m in result["ours"] if m.startswith(NOT_OURS_FOR_CHECK)]
    assert extra == [], f"`{' '.join(args)}` imported {extra}"


def test_help_still_lists_every_sub_command(capsys):
    """Without a sub-command first, the parser is built whole: the help names them all."""
    from curvetui.cli import main

    with pytest.raises(SystemExit) as stop:
        main(["--help"])
    assert stop.value.code == 0
    text = capsys.readouterr().out
    # every sub-command, in the order they were always listed
    names = "check,tables,setout,open,new,sheet,batch,crossfall,design,landxml,realign,find-curves"
    assert "{" + names + "}" in text
    assert "check every bend of a CSV file" in text  # batch's own help line was built


def test_check_road_table_output_uses_rich_but_not_the_others():
    result = probe("check", "road", "--speed", "100", "--radius", "400", "--emax", "8")
    assert result["code"] == 0
    assert "Status: PASS" in result["out"]
    assert "rich" in result["loaded"]
    assert not {"pyarrow", "jsonschema", "textual", "scipy"} & set(result["loaded"])


def test_control_a_spiral_turning_more_than_a_radian_loads_scipy():
    # Ls / (2 R) = 240 / 200 = 1.2 rad: beyond the power series, scipy's Fresnel integrals
    result = probe(
        "check", "road", "--speed", "50", "--radius", "100", "--emax", "8",
        "--deflection", "170", "--spiral", "240", "--json",
    )  # fmt: skip
    assert result["code"] in (0, 1)
    assert "geometry" in json.loads(result["out"])
    assert "scipy" in result["loaded"]
    assert not {"pyarrow", "jsonschema", "textual"} & set(result["loaded"])


def test_a_usual_spiral_needs_no_scipy():
    # Ls / (2 R) = 70 / 800 rad: the clothoid by its power series
    result = probe(
        "check", "road", "--speed", "100", "--radius", "400", "--emax", "8",
        "--deflection", "40", "--spiral", "70", "--json",
    )  # fmt: skip
    assert result["code"] in (0, 1)
    assert json.loads(result["out"])["geometry"]["type"] == "spiral-curve-spiral"
    assert not {"scipy", "pyarrow", "jsonschema", "textual"} & set(result["loaded"])


def test_control_a_project_file_with_a_problem_loads_jsonschema(tmp_path):
    doc = json.loads(PROJECT.read_text(encoding="utf-8"))
    doc["bends"][0]["inputs"]["speed"] = 900  # above the schema's maximum of 400
    bad = tmp_path / PROJECT.name
    bad.write_text(json.dumps(doc), encoding="utf-8")
    result = probe("check", "--project", str(bad), "--json")
    assert result["code"] == 2
    assert "jsonschema" in result["loaded"]  # its messages name the field and range
    assert not {"pyarrow", "textual"} & set(result["loaded"])


def test_a_valid_project_file_is_checked_without_jsonschema():
    # the quick check (storage/project/quick_check.py) passes it; saving still uses jsonschema
    result = probe("check", "--project", str(PROJECT), "--json")
    assert result["code"] in (0, 1)
    assert json.loads(result["out"])["bends"]
    assert not {"jsonschema", "pyarrow", "textual"} & set(result["loaded"])


# `curvetui FILE` through the command line's main() as on a terminal, the app run headless;
# at its Ready event (its first frame is on screen) the packages loaded are noted, then the
# worksheet is built (the bend on screen evaluated) and they are noted again.
APP_PROBE = """
import asyncio, json, sys, types
from textual.app import App
from curvetui.app import app as app_mod
from curvetui.cli import main, project_cmd

class Tty:
    def isatty(self):
        return True

project_cmd.sys = types.SimpleNamespace(stdin=Tty(), stdout=Tty(), stderr=sys.stderr)
seen = {}
build = app_mod.CurveApp.on_ready

def loaded():
    return sorted({name.split(".")[0] for name in sys.modules})

async def on_ready(self):
    seen["first_frame"] = loaded()
    seen["sheet_then"] = bool(self.project_screen.query("#worksheet"))
    await build(self)
    first = self.session.project.bends[0]
    seen["first_bend"] = self.session.status(first)
    seen["sheet_after"] = bool(self.project_screen.query("#worksheet"))
    seen["after"] = loaded()
    self.exit()

app_mod.CurveApp.on_ready = on_ready
app_mod.CurveApp.run = lambda self: App.run(self, headless=True, size=(120, 40))
code = main([sys.argv[1]])
print(json.dumps({"code": code, **seen}))
"""


@pytest.mark.app
def test_app_first_frame_needs_no_engine_and_first_results_no_scipy(tmp_path):
    project = tmp_path / PROJECT.name
    project.write_bytes(PROJECT.read_bytes())
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    proc = subprocess.run(
        [sys.executable, "-c", APP_PROBE, str(project)],
        capture_output=True,
        text=True,
        env=env,
        cwd=ROOT,
        check=False,
        timeout=60,
    )
    assert proc.returncode == 0, proc.stderr
    seen = json.loads(proc.stdout.strip().splitlines()[-1])
    assert seen["code"] == 0
    # the first frame: the project file read and validated (by the quick check, so without
    # jsonschema: storage/project/quick_check.py), no engine, no worksheet yet
    assert "textual" in seen["first_frame"] and "jsonschema" not in seen["first_frame"]
    heavy = {"numpy", "scipy", "pyarrow", "fpdf"} & set(seen["first_frame"])
    assert heavy == set(), f"loaded before the first frame: {sorted(heavy)}"
    assert seen["sheet_then"] is False
    # then the worksheet, with the first bend evaluated (QV-01: a spiral of 80 m on R 700 m)
    assert seen["sheet_after"] is True
    assert seen["first_bend"] in ("pass", "fail")
    assert "numpy" in seen["after"]
    assert not {"scipy", "pyarrow", "fpdf", "jsonschema"} & set(seen["after"])
