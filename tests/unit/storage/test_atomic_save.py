"""Saving survives being killed, and a failed write leaves the old file whole.

The projects saved here are invented: many copies of the bends of the bundled demo
("Quillmere Valley Road", an invented scenario) under made-up ids. Only the file handling
(atomic replace, the .bak copy, temporary files) is under test.
"""

from __future__ import annotations

import json
import os
import random
import signal
import stat
import subprocess
import sys
import time
from pathlib import Path

import pytest

import curvetui.storage.files
from curvetui.storage.files import atomic_write_text
from curvetui.storage.project.files import load_project, project_text, save_project
from curvetui.storage.project.model import Bend, Project

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"

posix_only = pytest.mark.skipif(os.name != "posix", reason="needs POSIX signals and modes")


def big_project(tag: str, count: int) -> Project:
    """``count`` bends cycling through the demo's inputs; notes make each save some 1 MB."""
    demo, _ = load_project(DEMO)
    bends = []
    for i in range(count):
        src = demo.bends[i % len(demo.bends)]
        bends.append(
            Bend(
                id=f"{tag}{i:04d}",
                kind=src.kind,
                inputs=dict(src.inputs),
                station=float(10 * i),
                notes=f"{tag} invented bend {i} " + tag.lower() * 6000,
            )
        )
    demo.details.revision = tag
    return Project(demo.details, bends)


def temp_files(folder: Path, name: str) -> list[Path]:
    return [
        p for p in folder.iterdir() if p.name.startswith(f".{name}.") and p.name.endswith(".tmp")
    ]


CHILD = r"""
import json, sys
from curvetui.storage.project.files import parse_project, save_project, validate
a = parse_project(json.load(open(sys.argv[1], encoding="utf-8")))
b = parse_project(json.load(open(sys.argv[2], encoding="utf-8")))
target = sys.argv[3]
validate(a.to_json())  # warm up (imports, schema) so a save here takes as long as the parent's
print("ready", flush=True)
i = 0
while True:
    save_project(b if i % 2 == 0 else a, target)
    i += 1
"""


@posix_only
def test_a_save_killed_at_any_moment_leaves_one_whole_version(tmp_path):
    a, b = big_project("A", 150), big_project("B", 150)
    text = {"A": project_text(a), "B": project_text(b)}
    assert text["A"] != text["B"]
    json_of = {"A": a.to_json(), "B": b.to_json()}
    sources = tmp_path / "sources"
    sources.mkdir()
    for tag in text:
        (sources / f"{tag}.json").write_text(text[tag], encoding="utf-8")
    folder = tmp_path / "work"
    folder.mkdir()
    target = folder / "valley.json"
    bak = folder / "valley.json.bak"

    # one save's duration here, to spread the kills over a few saves on any machine
    started = time.perf_counter()
    save_project(b, folder / "timing.json")
    one_save = time.perf_counter() - started
    (folder / "timing.json").unlink()

    save_project(a, target)
    rng = random.Random(20261120)
    seen: list[str] = []
    rounds = 8
    # at least `rounds` kills, more (up to 40) until both versions have been seen, so a
    # loaded machine slows the test rather than failing it
    for round_no in range(40):
        child = subprocess.Popen(
            [
                sys.executable,
                "-c",
                CHILD,
                str(sources / "A.json"),
                str(sources / "B.json"),
                str(target),
            ],
            stdout=subprocess.PIPE,
            stderr=subprocess.PIPE,
        )
        try:
            ready = child.stdout.readline()
            assert ready == b"ready\n", child.stderr.read().decode()
            time.sleep(rng.uniform(0.0, 4.0 * one_save))
        finally:
            child.send_signal(signal.SIGKILL)
            child.wait(timeout=30)
            child.stdout.close()
            child.stderr.close()
        assert child.returncode == -signal.SIGKILL

        now = target.read_text(encoding="utf-8")
        version = next((tag for tag in text if text[tag] == now), None)
        assert version is not None, f"torn file after kill: {len(now)} characters"
        loaded, _ = load_project(target)
        assert loaded.to_json() == json_of[version]
        seen.append(version)
        if bak.exists():
            assert bak.read_text(encoding="utf-8") in text.values()
        if round_no + 1 >= rounds and set(seen) == {"A", "B"}:
            break

    # both versions were seen, so the kills did land among saves that had completed
    assert set(seen) == {"A", "B"}, seen

    # leftovers are hidden .NAME.*.tmp files, never the project or its backup
    leftovers = temp_files(folder, target.name)
    others = {p.name for p in folder.iterdir()} - {p.name for p in leftovers}
    assert others == {"valley.json", "valley.json.bak"}
    assert len(leftovers) <= rounds
    assert all(p.name.startswith(".") and p.name != target.name for p in leftovers)
    assert load_project(target)[0].to_json() in json_of.values()

    # a later ordinary save is not disturbed by them
    save_project(b, target)
    assert target.read_text(encoding="utf-8") == text["B"]
    assert not (folder / ".valley.json.bak.tmp").exists()


def test_fsync_failure_leaves_the_old_file_and_no_temporary_file(tmp_path, monkeypatch):
    target = tmp_path / "p.json"
    target.write_text("old contents\n", encoding="utf-8")

    def broken_fsync(fd):
        raise OSError(5, "Input/output error")

    monkeypatch.setattr(curvetui.storage.files.os, "fsync", broken_fsync)
    with pytest.raises(OSError, match="Input/output"):
        atomic_write_text(target, "new contents\n", backup=True)
    assert target.read_text(encoding="utf-8") == "old contents\n"
    assert temp_files(tmp_path, target.name) == []
    assert not target.with_name("p.json.bak").exists()  # nothing was replaced


def test_replace_failure_leaves_the_old_file_and_removes_the_new_text(tmp_path, monkeypatch):
    target = tmp_path / "p.json"
    target.write_text("old contents\n", encoding="utf-8")

    def broken_replace(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(curvetui.storage.files.os, "replace", broken_replace)
    with pytest.raises(OSError, match="No space"):
        atomic_write_text(target, "new contents\n", backup=True)
    assert target.read_text(encoding="utf-8") == "old contents\n"
    for leftover in temp_files(tmp_path, target.name):
        assert leftover.read_text(encoding="utf-8") != "new contents\n"


def test_replace_failure_on_a_first_save_leaves_nothing(tmp_path, monkeypatch):
    target = tmp_path / "p.json"

    def broken_replace(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(curvetui.storage.files.os, "replace", broken_replace)
    with pytest.raises(OSError):
        save_project(big_project("A", 3), target)
    assert list(tmp_path.iterdir()) == []


def test_replace_failure_leaves_no_temporary_file_at_all(tmp_path, monkeypatch):
    target = tmp_path / "p.json"
    target.write_text("old contents\n", encoding="utf-8")

    def broken_replace(src, dst):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(curvetui.storage.files.os, "replace", broken_replace)
    with pytest.raises(OSError):
        atomic_write_text(target, "new contents\n", backup=True)
    assert temp_files(tmp_path, target.name) == []


def test_failed_final_rename_keeps_old_file_and_backup(tmp_path, monkeypatch):
    """The .bak is replaced first; if the final rename then fails both hold the old text."""
    target = tmp_path / "p.json"
    target.write_text("first\n", encoding="utf-8")
    atomic_write_text(target, "second\n", backup=True)
    real_replace = os.replace

    def replace_but_not_the_target(src, dst):
        if Path(dst) == target:
            raise OSError(28, "No space left on device")
        real_replace(src, dst)

    monkeypatch.setattr(curvetui.storage.files.os, "replace", replace_but_not_the_target)
    with pytest.raises(OSError):
        atomic_write_text(target, "third\n", backup=True)
    assert target.read_text(encoding="utf-8") == "second\n"
    assert target.with_name("p.json.bak").read_text(encoding="utf-8") == "second\n"
    assert temp_files(tmp_path, target.name) == []


def test_a_leftover_backup_link_is_cleared_by_the_next_save(tmp_path):
    target = tmp_path / "p.json"
    target.write_text("old\n", encoding="utf-8")
    (tmp_path / ".p.json.bak.tmp").write_text("stale link from a killed save\n")
    atomic_write_text(target, "new\n", backup=True)
    assert target.read_text() == "new\n"
    assert target.with_name("p.json.bak").read_text() == "old\n"
    assert temp_files(tmp_path, target.name) == []


@posix_only
def test_a_save_keeps_the_file_mode(tmp_path):
    target = tmp_path / "p.json"
    target.write_text(json.dumps({"invented": True}), encoding="utf-8")
    os.chmod(target, 0o644)
    atomic_write_text(target, "{}\n", backup=True)
    assert stat.S_IMODE(os.stat(target).st_mode) == 0o644
