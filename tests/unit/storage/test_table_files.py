"""Table files are read safely (issue 14, item 6): only regular files of at most 1 MB, only
UTF-8 text; a bad file in the user-tables folder is reported and skipped, never fatal for
other commands; a project names tables only by name or inside its own folder (or a
user-tables folder). The tables used are the shipped AASHTO 2018 metric file, copied under an
invented name; no engineering value is checked here (those checks are in tests/validation)."""

from __future__ import annotations

import json
import os
import threading
from pathlib import Path

import pytest

from curvetui.cli import main
from curvetui.storage.project.files import load_project
from curvetui.storage.table_files import MAX_TABLE_BYTES, TableError, read_table_file
from curvetui.storage.tables import rail_limit_sets, road_table, road_tables

ROOT = Path(__file__).resolve().parents[3]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"
NAME = "fernhallow-shire"  # an invented authority
ROAD = ["check", "road", "--speed", "80", "--radius", "400", "--json"]


def shipped_text() -> str:
    """The shipped file, read directly (not through the table cache, which tests refill)."""
    path = ROOT / "curvetui" / "data" / "road" / "aashto-2018-metric.toml"
    return path.read_text(encoding="utf-8")


def user_text() -> str:
    text = shipped_text().replace('name = "aashto-2018-metric"', f'name = "{NAME}"')
    assert NAME in text
    return text


@pytest.fixture
def user_folder(tmp_path, monkeypatch):
    folder = tmp_path / "tables"
    folder.mkdir()
    monkeypatch.setenv("CURVETUI_TABLES", str(folder))
    road_tables.cache_clear()
    rail_limit_sets.cache_clear()
    yield folder
    road_tables.cache_clear()
    rail_limit_sets.cache_clear()


# -- reading one file --------------------------------------------------------------------


def test_utf16_and_latin1_tables_are_refused_with_save_as_utf8(tmp_path):
    text = user_text().replace("title = ", 'title = "Fernhallow Straße" \n_old_title = ', 1)
    for encoding, expect in (("utf-16", "UTF-16 text"), ("latin-1", "not UTF-8 text")):
        path = tmp_path / f"{encoding}.toml"
        path.write_bytes(text.encode(encoding))
        with pytest.raises(TableError, match=expect) as info:
            read_table_file(path)
        assert str(path) in str(info.value) and "save it as UTF-8" in str(info.value)


def test_a_utf8_byte_order_mark_is_accepted(tmp_path):
    path = tmp_path / "bom.toml"
    path.write_bytes(b"\xef\xbb\xbf" + user_text().encode("utf-8"))
    assert road_table(str(path)).name == NAME


def test_a_file_over_the_cap_is_refused_before_reading(tmp_path, monkeypatch):
    path = tmp_path / "big.toml"
    path.write_text(user_text() + "#" * MAX_TABLE_BYTES + "\n", encoding="utf-8")
    from curvetui.storage import table_files

    opened = []
    real_open = os.open
    monkeypatch.setattr(
        table_files.os, "open", lambda p, *a, **k: opened.append(p) or real_open(p, *a, **k)
    )
    with pytest.raises(TableError, match="at most 1,000,000"):
        read_table_file(path)
    assert opened == []  # refused on its size alone, never opened
    small = tmp_path / "small.toml"
    small.write_text(user_text(), encoding="utf-8")
    assert read_table_file(small)["table"]["name"] == NAME
    assert opened == [small]  # the probe does see an open


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="no /dev/zero")
@pytest.mark.parametrize("device", ["/dev/zero", "/dev/null"])
def test_a_device_is_never_read(device):
    with pytest.raises(TableError, match="not a regular file"):
        read_table_file(device)


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="no mkfifo on this platform")
def test_a_fifo_table_does_not_hang(tmp_path):
    fifo = tmp_path / "pipe.toml"
    os.mkfifo(fifo)
    outcome: list[object] = []

    def read() -> None:
        try:
            read_table_file(fifo)
        except TableError as exc:
            outcome.append(exc)

    reader = threading.Thread(target=read, daemon=True)
    reader.start()
    reader.join(5)
    if reader.is_alive():  # unblock the reader before failing
        with open(fifo, "wb"):
            pass
        pytest.fail("reading a FIFO as a table blocked")
    assert len(outcome) == 1 and "not a regular file" in str(outcome[0])


def test_cli_table_option_may_still_take_a_path_the_user_typed(tmp_path, capsys):
    path = tmp_path / "own.toml"
    path.write_text(user_text(), encoding="utf-8")
    assert main([*ROAD, "--table", str(path)]) == 0
    assert json.loads(capsys.readouterr().out)["table"] == NAME


# -- the user-tables folder ----------------------------------------------------------------


def test_a_bad_user_file_is_skipped_and_reported_and_check_road_still_works(user_folder, capsys):
    (user_folder / "good.toml").write_text(user_text(), encoding="utf-8")
    (user_folder / "wide.toml").write_bytes(user_text().encode("utf-16"))
    (user_folder / "broken.toml").write_text("[table\n", encoding="utf-8")
    (user_folder / "folder.toml").mkdir()
    (user_folder / "empty.toml").write_text("", encoding="utf-8")
    if hasattr(os, "mkfifo"):
        os.mkfifo(user_folder / "pipe.toml")

    assert main(ROAD) == 0
    captured = capsys.readouterr()
    assert json.loads(captured.out)["table"] == "aashto-2018-metric"
    warnings = [line for line in captured.err.splitlines() if "warning" in line]
    for name, why in (
        ("wide.toml", "UTF-16 text; save it as UTF-8"),
        ("broken.toml", "not valid TOML"),
        ("folder.toml", "cannot read: a folder, not a file"),
        ("empty.toml", "not a table file"),
    ):
        line = next(w for w in warnings if name in w)
        assert f"{user_folder / name}: skipped, " in line and why in line
    assert not any("good.toml" in w for w in warnings)
    if hasattr(os, "mkfifo"):
        assert any("pipe.toml" in w and "not a regular file" in w for w in warnings)

    assert main([*ROAD, "--table", NAME]) == 0  # the good user table still loads
    assert json.loads(capsys.readouterr().out)["table"] == NAME


def test_a_user_file_that_breaks_the_parser_is_skipped(user_folder, capsys):
    """Whatever fault a user file triggers, the other commands run (the reason is shown)."""
    huge = "1" + "0" * 400  # an integer no float holds
    odd = user_text().replace("speed = 15\n", f"speed = {huge}\n", 1)
    assert huge in odd
    (user_folder / "odd.toml").write_text(odd, encoding="utf-8")
    (user_folder / "odd-head.toml").write_text("table = 5\n", encoding="utf-8")
    assert main(ROAD) == 0
    err = capsys.readouterr().err
    assert "odd.toml: skipped, " in err and "odd-head.toml: skipped, " in err
    assert "Traceback" not in err


def test_tables_lists_skipped_files(user_folder, capsys):
    (user_folder / "wide.toml").write_bytes(user_text().encode("utf-16"))
    assert main(["tables"]) == 0
    out = " ".join(capsys.readouterr().out.split())
    assert "Skipped (1)" in out and "wide.toml: UTF-16 text; save it as UTF-8" in out
    assert main(["tables", "--json"]) == 0
    captured = capsys.readouterr()
    assert "aashto-2018-metric" in {r["name"] for r in json.loads(captured.out)}
    assert "wide.toml: skipped, UTF-16 text" in captured.err


@pytest.mark.skipif(os.name != "posix" or os.geteuid() == 0, reason="root reads any file")
def test_an_unreadable_user_file_is_skipped(user_folder, capsys):
    path = user_folder / "locked.toml"
    path.write_text(user_text(), encoding="utf-8")
    path.chmod(0)
    assert main(ROAD) == 0
    assert "locked.toml: skipped, cannot read" in capsys.readouterr().err


# -- what a project file may name --------------------------------------------------------


def project_naming(folder: Path, road_table_ref: str) -> Path:
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    data["details"]["road_table"] = road_table_ref
    data["bends"] = [b for b in data["bends"] if b["kind"] == "road"][:1]
    path = folder / "project.json"
    path.write_text(json.dumps(data), encoding="utf-8")
    return path


def hostile_refs(tmp_path: Path) -> list[str]:
    outside = tmp_path / "outside.toml"
    outside.write_text(user_text(), encoding="utf-8")
    refs = [
        "/etc/passwd",
        "/proc/self/environ",
        "/dev/zero",
        str(outside),
        "../outside.toml",
        "sub/../../outside.toml",
        "link.toml",
    ]
    if hasattr(os, "mkfifo"):
        os.mkfifo(tmp_path / "fifo.toml")
        refs.append(str(tmp_path / "fifo.toml"))
    return refs


@pytest.mark.skipif(os.name != "posix", reason="POSIX paths")
def test_a_project_cannot_name_files_outside_its_folder(tmp_path, capsys, user_folder):
    folder = tmp_path / "job"
    folder.mkdir()
    refs = hostile_refs(tmp_path)
    (folder / "link.toml").symlink_to(tmp_path / "outside.toml")  # a symlink leading out
    for ref in refs:
        path = project_naming(folder, ref)
        assert main(["check", "--project", str(path)]) == 2, ref
        err = capsys.readouterr().err
        assert f"$.details.road_table: {ref!r} is outside the project's folder" in err, ref
        assert "Traceback" not in err


def test_a_project_may_name_a_table_in_its_folder_or_the_user_folder(
    tmp_path, capsys, user_folder, monkeypatch
):
    folder = tmp_path / "job"
    (folder / "tables").mkdir(parents=True)
    (folder / "tables" / "local.toml").write_text(user_text(), encoding="utf-8")
    (user_folder / "shire.toml").write_text(user_text(), encoding="utf-8")
    monkeypatch.chdir(tmp_path)  # relative paths are taken from the project, not from here
    for ref in (
        "tables/local.toml",
        str(folder / "tables" / "local.toml"),
        str(user_folder / "shire.toml"),
        NAME,
    ):
        path = project_naming(folder, ref)
        assert main(["check", "--project", str(path), "--json"]) in (0, 1), ref
        doc = json.loads(capsys.readouterr().out)
        assert doc["bends"][0]["results"]["table"] == NAME, ref
    project, _ = load_project(project_naming(folder, "tables/local.toml"))
    assert project.folder == folder


def test_a_project_naming_a_bad_file_in_its_folder_names_the_field(tmp_path, capsys):
    (tmp_path / "wide.toml").write_bytes(user_text().encode("utf-16"))
    path = project_naming(tmp_path, "wide.toml")
    assert main(["check", "--project", str(path)]) == 2
    err = capsys.readouterr().err
    assert "$.details.road_table: " in err and "UTF-16 text; save it as UTF-8" in err


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="no /dev/zero")
def test_a_device_or_fifo_given_as_a_project_is_refused_without_reading(tmp_path, capsys):
    names = ["/dev/zero"]
    if hasattr(os, "mkfifo"):
        os.mkfifo(tmp_path / "pipe.json")
        names.append(str(tmp_path / "pipe.json"))
    for name in names:
        for argv in ([name], ["check", "--project", name], ["sheet", name, "--format", "text"]):
            assert main(argv) == 2, argv
            err = capsys.readouterr().err
            assert f"{name}: cannot use this project file:" in err, argv
            assert "not a regular file" in err and "Traceback" not in err
