"""Writes never go where the user did not point them (issue 14, item 6): a planted symlink is
replaced, never written through; a device or FIFO is written directly, never renamed over;
overlapping saves of one file take turns and leave whole files and no temporary files; a save
that cannot take its turn says so and changes nothing. File contents here are invented."""

from __future__ import annotations

import errno
import os
import stat
import threading
from pathlib import Path

import pytest

from curvetui.cli import main
from curvetui.storage import files
from curvetui.storage.files import atomic_binary, atomic_write_text

posix_only = pytest.mark.skipif(os.name != "posix", reason="needs POSIX files and flock")
GOOD_CSV = "id,kind,speed,radius,cant\nQV-01,road,100,400,\nQV-09,rail,120,800,100\n"


def leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name.endswith(".tmp"))


@pytest.fixture
def never_rename_over_devices(monkeypatch):
    """Fail the test (instead of replacing the device: tests may run as root) if anything
    renames onto a path that is not a regular file."""
    real = os.replace

    def guarded(src, dst, *args, **kwargs):
        try:
            mode = os.stat(dst).st_mode
        except FileNotFoundError:
            mode = stat.S_IFREG
        assert stat.S_ISREG(mode), f"renamed over a special file: {dst}"
        return real(src, dst, *args, **kwargs)

    monkeypatch.setattr(files.os, "replace", guarded)


# -- planted symlinks --------------------------------------------------------------------


@posix_only
@pytest.mark.parametrize("dangling", [True, False])
def test_a_planted_backup_temporary_symlink_is_never_written_through(tmp_path, dangling):
    project = tmp_path / "project"
    project.mkdir()
    outside = tmp_path / "outside.txt"
    if not dangling:
        outside.write_text("not yours\n", encoding="utf-8")
    target = project / "p.json"
    target.write_text("old\n", encoding="utf-8")
    (project / ".p.json.bak.tmp").symlink_to(outside)
    atomic_write_text(target, "new\n", backup=True)
    assert target.read_text() == "new\n"
    assert (project / "p.json.bak").read_text() == "old\n"
    if dangling:
        assert not outside.exists()
    else:
        assert outside.read_text() == "not yours\n"
    assert leftovers(project) == []


@posix_only
def test_a_planted_backup_symlink_is_replaced_not_followed(tmp_path):
    outside = tmp_path / "outside.txt"
    outside.write_text("not yours\n", encoding="utf-8")
    target = tmp_path / "p.json"
    target.write_text("old\n", encoding="utf-8")
    (tmp_path / "p.json.bak").symlink_to(outside)
    atomic_write_text(target, "new\n", backup=True)
    assert outside.read_text() == "not yours\n"
    bak = tmp_path / "p.json.bak"
    assert not bak.is_symlink() and bak.read_text() == "old\n"


def test_a_backup_that_cannot_be_made_leaves_the_old_file_and_no_temporary_file(
    tmp_path, monkeypatch
):
    target = tmp_path / "p.json"
    target.write_text("old\n", encoding="utf-8")

    def no_links(src, dst, *a, **k):
        raise OSError(errno.EPERM, "Operation not permitted")

    def disk_full(src, dst, *a, **k):
        raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(files.os, "link", no_links)
    monkeypatch.setattr(files.shutil, "copyfileobj", disk_full)
    with pytest.raises(OSError, match="No space"):
        atomic_write_text(target, "new\n", backup=True)
    assert target.read_text() == "old\n" and leftovers(tmp_path) == []
    assert not (tmp_path / "p.json.bak").exists()


def test_without_hard_links_the_backup_is_a_copy(tmp_path, monkeypatch):
    target = tmp_path / "p.json"
    target.write_text("old\n", encoding="utf-8")

    def no_links(src, dst, *a, **k):
        raise OSError(errno.EPERM, "Operation not permitted")

    monkeypatch.setattr(files.os, "link", no_links)
    atomic_write_text(target, "new\n", backup=True)
    assert (tmp_path / "p.json.bak").read_text() == "old\n" and target.read_text() == "new\n"
    assert leftovers(tmp_path) == []


def test_a_folder_as_the_target_is_refused_and_nothing_is_left(tmp_path):
    (tmp_path / "out.csv").mkdir()
    with pytest.raises(IsADirectoryError):
        atomic_write_text(tmp_path / "out.csv", "x\n")
    assert leftovers(tmp_path) == [] and (tmp_path / "out.csv").is_dir()


def test_an_error_while_writing_removes_the_temporary_file(tmp_path):
    target = tmp_path / "out.csv"
    target.write_text("old\n", encoding="utf-8")
    with pytest.raises(KeyboardInterrupt), atomic_binary(target) as fh:
        fh.write(b"half")
        raise KeyboardInterrupt
    assert target.read_text() == "old\n" and leftovers(tmp_path) == []


# -- devices and FIFOs -------------------------------------------------------------------


@posix_only
@pytest.mark.skipif(not os.path.exists("/dev/null"), reason="no /dev/null")
def test_dev_null_is_written_directly(never_rename_over_devices, tmp_path, capsys):
    atomic_write_text("/dev/null", "discarded\n", backup=True)
    link = tmp_path / "sink"
    link.symlink_to("/dev/null")
    atomic_write_text(link, "discarded\n")
    assert link.is_symlink()  # the link still names the device
    assert stat.S_ISCHR(os.stat("/dev/null").st_mode)
    assert leftovers(tmp_path) == []

    src = tmp_path / "bends.csv"
    src.write_text(GOOD_CSV, encoding="utf-8")
    assert main(["batch", str(src), "-o", "/dev/null"]) == 0
    assert "results written to /dev/null" in capsys.readouterr().err
    assert stat.S_ISCHR(os.stat("/dev/null").st_mode)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bends.csv", "sink"]


@posix_only
@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="no mkfifo on this platform")
def test_a_fifo_is_written_directly(never_rename_over_devices, tmp_path):
    fifo = tmp_path / "pipe"
    os.mkfifo(fifo)
    got: list[bytes] = []
    reader = threading.Thread(target=lambda: got.append(fifo.read_bytes()), daemon=True)
    reader.start()
    atomic_write_text(fifo, "through the pipe\n", backup=True)
    reader.join(10)
    assert got == [b"through the pipe\n"]
    assert stat.S_ISFIFO(os.stat(fifo).st_mode)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["pipe"]


def test_dash_writes_to_standard_output(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    src = tmp_path / "bends.csv"
    src.write_text(GOOD_CSV, encoding="utf-8")
    assert main(["batch", str(src), "-o", "-"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("id,kind,speed,radius,cant,") and "QV-09" in out  # quoted if need be
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bends.csv"]


# -- overlapping saves -------------------------------------------------------------------


@posix_only
def test_overlapping_saves_of_one_file_take_turns(tmp_path):
    target = tmp_path / "p.json"
    versions = {f"{tag} {'x' * 20000}\n" for tag in ("first", "second")}
    atomic_write_text(target, "start\n")
    errors: list[BaseException] = []
    start = threading.Barrier(2)

    def saver(text: str) -> None:
        start.wait()
        for _ in range(40):
            try:
                atomic_write_text(target, text, backup=True)
            except BaseException as exc:  # noqa: BLE001 - collected for the assertion
                errors.append(exc)

    threads = [threading.Thread(target=saver, args=(v,)) for v in versions]
    for t in threads:
        t.start()
    for t in threads:
        t.join(60)
    assert errors == []
    assert target.read_text() in versions
    assert (tmp_path / "p.json.bak").read_text() in versions  # a whole earlier save
    assert leftovers(tmp_path) == []


@posix_only
def test_a_save_that_cannot_take_its_turn_is_told_and_changes_nothing(tmp_path, monkeypatch):
    import fcntl

    target = tmp_path / "p.json"
    target.write_text("old\n", encoding="utf-8")
    monkeypatch.setattr(files, "LOCK_WAIT", 0.2)
    holder = os.open(tmp_path, os.O_RDONLY)  # another save, stuck mid-commit
    try:
        fcntl.flock(holder, fcntl.LOCK_EX)
        with pytest.raises(OSError, match="another save in this folder did not finish"):
            atomic_write_text(target, "new\n", backup=True)
    finally:
        os.close(holder)
    assert target.read_text() == "old\n" and leftovers(tmp_path) == []
    assert not (tmp_path / "p.json.bak").exists()
