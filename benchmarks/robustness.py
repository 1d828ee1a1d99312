"""Robustness run (by hand, not a test): generated hostile input for every face that reads
user data, counting what must never happen.

    python benchmarks/robustness.py [--cases N] [--seed S] [--only cli,project,batch,table]

Counts, per kind of input:
  tracebacks      an exception escaped ``curvetui.cli.main`` (or an exit code outside 0/1/2)
  rows lost       batch input rows missing from the written output of a run that wrote one
  files changed   a project file whose bytes changed under a command that was not asked to save
Every run is in-process (``main(argv)``) with stdout/stderr captured; files live in a
temporary folder. The generator is this project's own (random choice among edge values:
huge and tiny floats, NaN, markup, control characters, lone surrogates, odd encodings and
line ends, wrong JSON types); demo inputs are the invented demo project.
"""

from __future__ import annotations

import argparse
import contextlib
import copy
import csv
import io
import json
import os
import random
import sys
import tempfile
import time
import traceback
from collections import Counter
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from curvetui.cli import main  # noqa: E402

DEMO = ROOT / "projects" / "quillmere-valley-road.json"

NUMBER_TEXT = [
    "0",
    "-0",
    "1",
    "80",
    "300",
    "2.5",
    "-45",
    "1e306",
    "-1e306",
    "1e-320",
    "5e-324",
    "nan",
    "inf",
    "-inf",
    "1e309",
    "",
    "  ",
    "abc",
    "1,5",
    "\u0663\u0660\u0660",
    "0x10",
    "1_000",
    "+5",
    "2+710.5",
    "0+500",
    "1e+400",
    "\udc80",
    "[/]",
    "=1+1",
    "9" * 400,
    "1" * 30,
    "-1e-320",
    "179.999999",
    "0.0000001",
    "\x1b]0;title\x07",
    "12\x00",
    "１２０",
]
TEXT = [
    "",
    "[/]",
    "[bold]x",
    "[@click=app.quit]q",
    "[link=http://a.example]x[/link]",
    "\x1b]0;pwned\x07",
    '=HYPERLINK("x")',
    "+1",
    "@SUM(1)",
    "-2+3",
    "\ud800",
    "\udc80x",
    "{nb}",
    "a" * 5000,
    "line\nbreak",
    "tab\tcell",
    "\r",
    "\u202e\u0647",
    "\x00",
]
JSON_VALUES = [
    10**400,
    -(10**400),
    1e308,
    -1e308,
    0,
    -1,
    1.5,
    "",
    "x",
    None,
    True,
    [],
    {},
    [1, 2],
    {"a": 1},
    "[/]",
    "\ud800",
    "1e306",
    1e-320,
    5e-324,
    "0+500",
    "a" * 20000,
]
EDGE_NUMBERS = [
    1e306,
    -1e306,
    1e-320,
    5e-324,
    10**400,
    -0.0,
    0,
    1e15,
    179.9999999,
    1e-9,
    0.5,
    1.8,
    2**63,
]
ROAD_OPTS = [
    "--speed",
    "--radius",
    "--deflection",
    "--pi-station",
    "--superelevation",
    "--emax",
    "--friction",
    "--spiral",
    "--spiral-out",
    "--lanes-rotated",
    "--runoff-on-tangent",
    "--obstruction-offset",
    "--grade",
    "--lane-width",
]
RAIL_OPTS = [
    "--speed",
    "--radius",
    "--cant",
    "--low-speed",
    "--gauge",
    "--deflection",
    "--pi-station",
    "--spiral",
    "--spiral-out",
]
BATCH_COLUMNS = [
    "id",
    "kind",
    "speed",
    "low_speed",
    "radius",
    "deflection",
    "pi_station",
    "superelevation",
    "emax",
    "friction",
    "cant",
    "gauge",
    "spiral_in",
    "spiral",
    "spiral_out",
    "lanes_rotated",
    "runoff_on_tangent",
    "obstruction_offset",
    "grade",
    "lane_width",
    "note",
]


class Tally:
    def __init__(self) -> None:
        self.runs = Counter()
        self.tracebacks = Counter()
        self.causes: dict[str, Counter] = {}
        self.rows_in = Counter()
        self.rows_lost = Counter()
        self.files_changed = Counter()
        self.exit_codes: dict[str, Counter] = {}
        self.refusals = Counter()

    def run(self, kind: str, argv: list[str]) -> tuple[int | None, str, str]:
        """Run main(argv) in-process; a traceback is any exception escaping it."""
        self.runs[kind] += 1
        out, err = io.StringIO(), io.StringIO()
        code: int | None
        try:
            with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
                code = main(argv)
        except SystemExit as exc:
            code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 2)
        except BaseException as exc:  # noqa: BLE001 - counting exactly these
            if isinstance(exc, KeyboardInterrupt):
                raise
            self.tracebacks[kind] += 1
            tb = traceback.extract_tb(exc.__traceback__)[-1]
            where = f"{type(exc).__name__} at {Path(tb.filename).name}:{tb.lineno}"
            self.causes.setdefault(kind, Counter())[where] += 1
            return None, out.getvalue(), err.getvalue()
        if code not in (0, 1, 2):
            self.tracebacks[kind] += 1
            self.causes.setdefault(kind, Counter())[f"exit code {code}"] += 1
        if "Traceback (most recent call last)" in err.getvalue():
            self.tracebacks[kind] += 1
            self.causes.setdefault(kind, Counter())["traceback printed"] += 1
        self.exit_codes.setdefault(kind, Counter())[code] += 1
        return code, out.getvalue(), err.getvalue()


def number(rng: random.Random) -> str:
    if rng.random() < 0.5:
        return rng.choice(NUMBER_TEXT)
    return f"{rng.choice([1, -1]) * 10 ** rng.uniform(-3, 5):.6g}"


def cli_cases(rng: random.Random, tally: Tally, n: int) -> None:
    for _ in range(n):
        kind = rng.choice(["road", "rail"])
        opts = ROAD_OPTS if kind == "road" else RAIL_OPTS
        argv = ["check", kind]
        for opt in rng.sample(opts, rng.randint(1, len(opts))):
            argv += [opt, number(rng)]
        if rng.random() < 0.3:
            argv += ["--units", "us"]
        if rng.random() < 0.3:
            argv.append("--json")
        tally.run("cli", argv)
    for _ in range(n // 5):
        argv = ["setout"]
        for opt in ("--radius", "--pi-easting", "--pi-northing", "--bearing", "--deflection"):
            argv += [opt, number(rng) if rng.random() < 0.4 else rng.choice(["300", "20", "0"])]
        for opt in rng.sample(SETOUT_OPTS, rng.randint(0, len(SETOUT_OPTS))):
            argv += [opt, number(rng)]
        if rng.random() < 0.3:
            argv += ["--units", "us"]
        tally.run("cli", argv)
    for argv in NAMED_CLI:
        tally.run("cli", list(argv))


# what issue 14 names, each run once per run of the generator
NAMED_CLI = (
    ["tabels"],
    ["batch", "."],
    ["batch", "\udcff.csv"],
    ["check"],
    ["check", "--project", "\udc80.json"],
    ["check", "--project", "."],
    ["sheet", "."],
    ["sheet", "\udc80.json", "--format", "md"],
    ["open", "--print", "."],
    ["open", "--print", "\udc80"],
    [
        "check",
        "road",
        "--speed",
        "80",
        "--radius",
        "400",
        "--deflection",
        "1e-320",
        "--spiral",
        "60",
    ],
    [
        "check",
        "road",
        "--speed",
        "80",
        "--radius",
        "400",
        "--deflection",
        "5e-324",
        "--spiral",
        "60",
        "--spiral-out",
        "20",
    ],
    [
        "check",
        "rail",
        "--speed",
        "80",
        "--radius",
        "400",
        "--cant",
        "50",
        "--deflection",
        "5e-324",
        "--spiral",
        "60",
    ],
    ["check", "road", "--speed", "80", "--radius", "400", "--deflection", "5e-324"],
    ["check", "road", "--speed", "30", "--radius", "1.8", "--obstruction-offset", "2"],
    [
        "check",
        "road",
        "--speed",
        "30",
        "--radius",
        "2",
        "--obstruction-offset",
        "2",
        "--lane-width",
        "4",
    ],
    [
        "check",
        "road",
        "--speed",
        "80",
        "--radius",
        "400",
        "--pi-station",
        "1e306",
        "--deflection",
        "20",
    ],
    [
        "check",
        "road",
        "--speed",
        "80",
        "--radius",
        "400",
        "--pi-station",
        "9e305+0",
        "--deflection",
        "20",
    ],
    [
        "setout",
        "--radius",
        "400",
        "--pi-easting",
        "0",
        "--pi-northing",
        "0",
        "--bearing",
        "0",
        "--deflection",
        "5e-324",
    ],
    [
        "setout",
        "--radius",
        "400",
        "--pi-easting",
        "0",
        "--pi-northing",
        "0",
        "--bearing",
        "0",
        "--deflection",
        "1e-320",
        "--spiral",
        "50",
    ],
)
SETOUT_OPTS = ["--pi-station", "--spiral", "--spiral-out", "--interval", "--versine-chord"]


def _mutate(rng: random.Random, data, depth: int = 0):
    """A copy of the JSON value with one random change somewhere inside."""
    if isinstance(data, dict) and data and rng.random() < 0.85:
        key = rng.choice(list(data))
        out = dict(data)
        if rng.random() < 0.15:
            del out[key]
        else:
            out[key] = _mutate(rng, data[key], depth + 1)
        return out
    if isinstance(data, list) and data and rng.random() < 0.85:
        out = list(data)
        i = rng.randrange(len(out))
        out[i] = _mutate(rng, out[i], depth + 1)
        return out
    return rng.choice(JSON_VALUES + TEXT)


def project_cases(rng: random.Random, tally: Tally, n: int, folder: Path) -> None:
    base = json.loads(DEMO.read_text(encoding="utf-8"))
    for i in range(n):
        data = copy.deepcopy(base)
        if rng.random() < 0.7:
            # a value the schema accepts but the engine may not: an edge number or text in
            # one bend's inputs or texts
            bend = rng.choice(data["bends"])
            target = bend.get("inputs", bend)
            key = rng.choice(list(target) + ["deflection", "spiral_in", "pi_station"])
            target[key] = rng.choice(EDGE_NUMBERS) if rng.random() < 0.7 else rng.choice(TEXT)
            if rng.random() < 0.2:  # what issue 14 names: a tiny deflection with a spiral
                target.update(deflection=rng.choice([1e-320, 5e-324]), spiral_in=60)
            if rng.random() < 0.1:
                bend["station"] = rng.choice(EDGE_NUMBERS)
            if rng.random() < 0.5:
                bend[rng.choice(["id", "notes", "kind"])] = rng.choice(TEXT)
            if rng.random() < 0.3:
                key = rng.choice(["name", "client", "designer", "revision", "notes", "drawing"])
                data["details"][key] = rng.choice(TEXT)
        else:
            for _ in range(rng.randint(1, 4)):
                data = _mutate(rng, data)
        path = folder / f"p{i}.json"
        try:
            text = json.dumps(data, ensure_ascii=rng.random() < 0.5)
        except (ValueError, TypeError):
            continue
        raw = text.encode("utf-8", "surrogatepass")
        if rng.random() < 0.05:
            raw = raw[: rng.randrange(len(raw))]  # truncated file
        path.write_bytes(raw)
        for argv in (
            ["check", "--project", str(path)],
            ["check", "--project", str(path), "--json"],
            ["open", "--print", str(path)],
            ["sheet", str(path), "--format", "text", "-o", "-"],
            ["sheet", str(path), "--format", "md", "-o", "-"],
        ) + ((["sheet", str(path), "-o", str(folder / "sheet.pdf")],) if i % 5 == 0 else ()):
            tally.run("project", argv)
            if path.read_bytes() != raw:
                tally.files_changed["project"] += 1
                path.write_bytes(raw)


def _cell(rng: random.Random, column: str) -> str:
    if column == "kind":
        return rng.choice(["road", "rail", "ROAD", "", "boat", "[/]"])
    if column in ("id", "note"):
        return rng.choice(TEXT + ["B-1", "c2"])
    if rng.random() < 0.8:
        good = {"speed": "80", "radius": "400", "low_speed": "40", "cant": "100"}
        if column in good and rng.random() < 0.7:
            return good[column]
        return f"{10 ** rng.uniform(-1, 4):.4g}"
    return rng.choice(NUMBER_TEXT)


NAMED_ROW = [
    "kind",
    "speed",
    "radius",
    "deflection",
    "spiral",
    "obstruction_offset",
    "lane_width",
    "pi_station",
]
NAMED_ROWS = [
    {
        "kind": "road",
        "speed": "80",
        "radius": "400",
        "deflection": "1e-320",
        "spiral": "60",
        "obstruction_offset": "",
        "lane_width": "",
        "pi_station": "",
    },
    {
        "kind": "rail",
        "speed": "80",
        "radius": "400",
        "deflection": "5e-324",
        "spiral": "60",
        "obstruction_offset": "",
        "lane_width": "",
        "pi_station": "",
        "cant": "50",
    },
    {
        "kind": "road",
        "speed": "30",
        "radius": "1.8",
        "deflection": "",
        "spiral": "",
        "obstruction_offset": "3",
        "lane_width": "3.6",
        "pi_station": "",
    },
    {
        "kind": "road",
        "speed": "80",
        "radius": "400",
        "deflection": "20",
        "spiral": "",
        "obstruction_offset": "",
        "lane_width": "",
        "pi_station": "1e306",
    },
    {
        "kind": "road",
        "speed": "80",
        "radius": "400",
        "deflection": "5e-324",
        "spiral": "",
        "obstruction_offset": "",
        "lane_width": "",
        "pi_station": "9e305+0",
    },
]


def batch_cases(rng: random.Random, tally: Tally, n: int, folder: Path) -> None:
    for i in range(n):
        cols = ["kind", "speed", "radius"] + rng.sample(BATCH_COLUMNS, rng.randint(0, 8))
        cols = list(dict.fromkeys(cols))
        if rng.random() < 0.3:
            cols += [c for c in NAMED_ROW if c not in cols]
        rows = [[_cell(rng, c) for c in cols] for _ in range(rng.randint(1, 60))]
        if rng.random() < 0.3:  # one named hostile row (issue 14) among the rest
            named = rng.choice(NAMED_ROWS)
            row = [named.get(c, _cell(rng, c)) for c in cols]
            rows.insert(rng.randrange(len(rows) + 1), row)
        end = rng.choice(["\n", "\r\n", "\r"])
        buf = io.StringIO()
        writer = csv.writer(buf, lineterminator=end)
        writer.writerow(cols)
        writer.writerows(rows)
        text = buf.getvalue()
        encoding = rng.choice(["utf-8"] * 6 + ["utf-8-sig", "utf-16", "latin-1"])
        raw = text.encode(encoding, "surrogatepass" if encoding.startswith("utf-8") else "replace")
        src, out = folder / f"b{i}.csv", folder / f"b{i}.out.csv"
        src.write_bytes(raw)
        if out.exists():
            out.unlink()
        argv = ["batch", str(src), "-o", str(out)]
        if rng.random() < 0.2:
            argv.append(rng.choice(["--units=us", "--keep-formulas"]))
        code, _, err = tally.run("batch", argv)
        if code == 2:
            tally.refusals[err.strip().splitlines()[-1][:90] if err.strip() else "?"] += 1
        tally.rows_in["batch"] += len(rows)
        if code != 2:  # a run that ended in a traceback lost every row
            try:
                with out.open(encoding="utf-8", newline="") as fh:
                    written = sum(1 for _ in csv.reader(fh)) - 1
            except (OSError, UnicodeDecodeError):
                written = 0
            tally.rows_lost["batch"] += max(0, len(rows) - written)


def table_cases(rng: random.Random, tally: Tally, n: int, folder: Path) -> None:
    import tomllib

    sources = sorted((ROOT / "curvetui" / "data").glob("*/*.toml"))
    for i in range(n):
        src = rng.choice(sources)
        data = tomllib.loads(src.read_text(encoding="utf-8"))
        for _ in range(rng.randint(1, 3)):
            mutated = _mutate(rng, data)
            data = mutated if isinstance(mutated, dict) else data
        path = folder / f"t{i}.toml"
        path.write_bytes(_toml(data).encode(rng.choice(["utf-8", "utf-16", "latin-1"]), "replace"))
        kind = src.parent.name
        if kind == "road":
            argv = ["check", "road", "--speed", "80", "--radius", "400", "--table", str(path)]
        else:
            argv = [
                "check",
                "rail",
                "--speed",
                "100",
                "--radius",
                "1500",
                "--cant",
                "80",
                "--limits",
                str(path),
            ]
        tally.run("table", argv)
        env = os.environ.get("CURVETUI_TABLES")
        os.environ["CURVETUI_TABLES"] = str(folder)
        tally.run("table", ["tables"])
        tally.run("table", ["check", "road", "--speed", "80", "--radius", "400"])
        if env is None:
            del os.environ["CURVETUI_TABLES"]
        else:
            os.environ["CURVETUI_TABLES"] = env
        path.unlink()


def _toml(data: dict, prefix: str = "") -> str:
    """A small TOML writer for the mutated tables (tables and arrays of tables)."""
    lines, subs = [], []
    for key, value in data.items():
        if isinstance(value, dict):
            subs.append((key, value))
        elif isinstance(value, list) and value and all(isinstance(v, dict) for v in value):
            for item in value:
                lines.append(f"\n[[{prefix}{key}]]")
                lines.append(_toml(item, f"{prefix}{key}.").strip())
        else:
            lines.append(f"{key} = {_value(value)}")
    for key, value in subs:
        lines.append(f"\n[{prefix}{key}]")
        lines.append(_toml(value, f"{prefix}{key}.").strip())
    return "\n".join(lines) + "\n"


def _value(value) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if value is None:
        return '""'
    if isinstance(value, (int, float)):
        text = repr(value)
        return {"inf": "inf", "-inf": "-inf", "nan": "nan"}.get(text, text)
    if isinstance(value, list):
        return "[" + ", ".join(_value(v) for v in value if not isinstance(v, dict)) + "]"
    if isinstance(value, dict):
        return "{}"
    return json.dumps(str(value), ensure_ascii=True)


def main_run() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--cases", type=int, default=300)
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--only", default="cli,project,batch,table")
    args = parser.parse_args()
    rng = random.Random(args.seed)
    tally = Tally()
    start = time.perf_counter()
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        only = set(args.only.split(","))
        if "cli" in only:
            cli_cases(rng, tally, args.cases * 10)
        if "project" in only:
            project_cases(rng, tally, args.cases, folder)
        if "batch" in only:
            batch_cases(rng, tally, args.cases, folder)
        if "table" in only:
            table_cases(rng, tally, args.cases, folder)
    print(f"seed {args.seed}, {time.perf_counter() - start:.0f} s")
    print("| input | runs | tracebacks | rows in | rows lost | files changed |")
    print("|---|---|---|---|---|---|")
    for kind in tally.runs:
        print(
            f"| {kind} | {tally.runs[kind]} | {tally.tracebacks[kind]} | "
            f"{tally.rows_in[kind] or '-'} | "
            f"{tally.rows_lost[kind] if tally.rows_in[kind] else '-'}"
            f" | {tally.files_changed[kind] if kind == 'project' else '-'} |"
        )
    for kind, causes in tally.causes.items():
        print(f"\n{kind}: causes")
        for cause, count in causes.most_common(15):
            print(f"  {count:5d}  {cause}")
    for why, count in tally.refusals.most_common(8):
        print(f"  batch refused {count:4d}: {why}")
    for kind, codes in tally.exit_codes.items():
        print(f"{kind} exit codes: {dict(codes)}")


if __name__ == "__main__":
    main_run()
