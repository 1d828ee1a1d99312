"""Fuzzing the files curvetui reads (issue 14, item 4): project files, table files and batch
rows. Every file gets results or a message naming the file and field, with exit code 0, 1
or 2; a command that was not asked to save leaves a project file's bytes as they were; a
batch writes one row per input row, in order. Bounded: few examples, no deadline,
derandomised in CI (tests/conftest.py). The expectations are the project's own exit codes
and row counts; no engineering value is checked here.
"""

from __future__ import annotations

import csv
import io
import json
import tempfile
import tomllib
from pathlib import Path

import pytest
from fuzz_values import EDGE_NUMBERS, NUMBER_TEXT, TEXT, any_text, json_values, run
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

import curvetui
from curvetui.storage import tables

ROOT = Path(curvetui.__file__).resolve().parent
DEMO = json.loads((ROOT.parent / "projects" / "quillmere-valley-road.json").read_text("utf-8"))
FUZZ = settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
INPUT_KEYS = ("speed", "radius", "deflection", "spiral_in", "spiral_out", "pi_station", "cant",
              "low_speed", "obstruction_offset", "lane_width", "superelevation")  # fmt: skip


@st.composite
def projects(draw) -> dict:
    data = json.loads(json.dumps(DEMO))
    for _ in range(draw(st.integers(1, 3))):
        bend = data["bends"][draw(st.integers(0, len(data["bends"]) - 1))]
        where = draw(st.sampled_from(["inputs", "bend", "details"]))
        if where == "inputs":
            bend["inputs"][draw(st.sampled_from(INPUT_KEYS))] = draw(json_values)
        elif where == "bend":
            bend[draw(st.sampled_from(["id", "notes", "kind", "station"]))] = draw(json_values)
        else:
            key = draw(st.sampled_from(["name", "job_number", "notes", "revision", "units"]))
            data["details"][key] = draw(st.one_of(any_text, json_values))
    return data


def _tiny_deflection(spiral: float = 60) -> dict:
    data = json.loads(json.dumps(DEMO))
    data["bends"][0]["inputs"].update(deflection=1e-320, spiral_in=spiral, spiral_out=20)
    data["bends"][1]["station"] = 10**400
    data["bends"][2]["inputs"]["pi_station"] = 1e306
    return data


@settings(FUZZ, max_examples=15)  # five commands per file
@given(projects())
@example(_tiny_deflection())
def test_project_files(data):
    text = json.dumps(data, ensure_ascii=False)
    raw = text.encode("utf-8", "surrogatepass")  # lone surrogates written as they are
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "p.json"
        path.write_bytes(raw)
        for argv in (
            ["check", "--project", str(path)],
            ["check", "--project", str(path), "--json"],
            ["open", "--print", str(path)],
            ["sheet", str(path), "--format", "text", "-o", "-"],
            ["sheet", str(path), "--format", "md", "-o", "-"],
        ):
            code, _, err = run(argv)
            assert code in (0, 1, 2), argv
            assert path.read_bytes() == raw, argv
            if code == 2:
                assert str(path) in err or "curvetui: error" in err


def _toml_value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int | float):
        return {"inf": "inf", "-inf": "-inf", "nan": "nan"}.get(repr(value), repr(value))
    if isinstance(value, list):
        return "[" + ", ".join(_toml_value(v) for v in value) + "]"
    return json.dumps(str(value), ensure_ascii=True)


def _set_value(text: str, key: str, value) -> str:
    """The TOML text with the first ``key = ...`` line's value replaced."""
    lines = text.splitlines()
    for i, line in enumerate(lines):
        if line.split("=", 1)[0].strip() == key:
            lines[i] = f"{key} = {_toml_value(value)}"
            break
    return "\n".join(lines) + "\n"


TABLE_FILES = sorted((ROOT / "data").glob("*/*.toml"))
TABLE_VALUES = st.one_of(
    st.sampled_from(EDGE_NUMBERS[:4] + EDGE_NUMBERS[5:]),  # 10**400 is no TOML integer
    st.sampled_from(TEXT).filter(lambda t: "\ud800" not in t),
    st.floats(),
    st.lists(st.sampled_from([0, 4, "x", 1e306]), max_size=3),
)


@st.composite
def table_texts(draw) -> tuple[str, str]:
    path = draw(st.sampled_from(TABLE_FILES))
    text = path.read_text(encoding="utf-8")
    keys = sorted({line.split("=", 1)[0].strip() for line in text.splitlines() if "=" in line})
    for _ in range(draw(st.integers(1, 3))):
        text = _set_value(text, draw(st.sampled_from(keys)), draw(TABLE_VALUES))
    return path.parent.name, text


@FUZZ
@given(table_texts())
@example(("rail", _set_value(TABLE_FILES[0].read_text("utf-8"), "cant_min", "-2+3")))
def test_table_files(monkeypatch_session, kind_text):
    kind, text = kind_text
    try:
        tomllib.loads(text)
    except tomllib.TOMLDecodeError:
        pass  # a file that is not TOML is refused as such, tried all the same
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "mine.toml"
        path.write_text(text, encoding="utf-8")
        if kind == "road":
            argv = ["check", "road", "--speed", "80", "--radius", "400", "--table", str(path)]
        else:
            argv = ["check", "rail", "--speed", "100", "--radius", "1500", "--cant", "80"]
            argv += ["--limits", str(path)]
        assert run(argv)[0] in (0, 1, 2)
        monkeypatch_session.setenv("CURVETUI_TABLES", folder)
        tables.road_tables.cache_clear()
        tables.rail_limit_sets.cache_clear()
        try:
            assert run(["tables"])[0] in (0, 2)
            assert run(["tables", "--json"])[0] in (0, 2)
        finally:
            monkeypatch_session.delenv("CURVETUI_TABLES")
            tables.road_tables.cache_clear()
            tables.rail_limit_sets.cache_clear()


@pytest.fixture(scope="module")
def monkeypatch_session():
    with pytest.MonkeyPatch.context() as mp:
        yield mp


COLUMNS = ("kind", "speed", "radius", "deflection", "spiral", "spiral_out", "pi_station",
           "cant", "low_speed", "obstruction_offset", "lane_width", "superelevation", "note",
           "=cmd")  # fmt: skip
CELLS = st.one_of(
    st.sampled_from(NUMBER_TEXT).filter(lambda t: "\udc80" not in t),
    st.sampled_from(["road", "rail", "ROAD", "", "boat", "[/]", "80", "400", "60", "1.8"]),
    st.sampled_from(TEXT).filter(lambda t: "\ud800" not in t),
    st.text(max_size=12),
)


@st.composite
def batch_files(draw) -> tuple[list[str], list[list[str]], str]:
    columns = ["id", *draw(st.lists(st.sampled_from(COLUMNS), min_size=3, unique=True))]
    for need in ("kind", "speed", "radius"):
        if need not in columns:
            columns.append(need)
    n = draw(st.integers(1, 25))
    rows = [[f"r{i}", *(draw(CELLS) for _ in columns[1:])] for i in range(n)]
    return columns, rows, draw(st.sampled_from(["\n", "\r\n", "\r"]))


NAMED_ROWS = [
    ["a", "road", "80", "400", "1e-320", "60", "", ""],
    ["b", "rail", "80", "400", "5e-324", "60", "20", "50"],
    ["c", "road", "30", "1.8", "", "", "", "", "3", "3.6"],
    ["d", "road", "80", "400", "20", "", "", "1e306"],
]
NAMED_COLUMNS = ["id", "kind", "speed", "radius", "deflection", "spiral", "spiral_out", "cant",
                 "obstruction_offset", "lane_width", "pi_station"]  # fmt: skip


def _quoted(cell: str) -> str:
    if any(c in cell for c in ',"\r\n'):
        return '"' + cell.replace('"', '""') + '"'
    return cell


@FUZZ
@given(batch_files())
@example((NAMED_COLUMNS, [(r + [""] * 11)[:11] for r in NAMED_ROWS], "\r"))
def test_batch_rows(columns_rows_end):
    columns, rows, end = columns_rows_end
    buf = io.StringIO()
    # quoted where a cell holds a separator, quote or line end (of any kind: Python's
    # csv.writer quotes only the characters of its own line ending)
    buf.write(end.join(",".join(_quoted(c) for c in r) for r in [columns, *rows]) + end)
    with tempfile.TemporaryDirectory() as folder:
        src, out = Path(folder) / "in.csv", Path(folder) / "out.csv"
        src.write_text(buf.getvalue(), encoding="utf-8", newline="")
        code, _, err = run(["batch", str(src), "-o", str(out)])
        assert code in (0, 1), err
        with out.open(encoding="utf-8", newline="") as fh:
            written = list(csv.DictReader(fh))
    assert [r["id"] for r in written] == [r[0] for r in rows]  # one row per row, in order
    assert [int(r["row"]) for r in written] == list(range(2, len(rows) + 2))
    assert all(r["status"] in ("pass", "fail", "error") for r in written)
