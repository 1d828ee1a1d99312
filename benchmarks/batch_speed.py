"""Benchmark of the batch check (issue 7): speed against two baselines, and peak memory.

Run by hand: python benchmarks/batch_speed.py  (defaults: 1,000,000 bends, the per-row loop
timed on the first 50,000 rows, memory measured on 10,000,000 rows). A quick try:
python benchmarks/batch_speed.py --rows 20000 --loop-rows 2000 --memory-rows 200000

Goals (issue 7): the batch at least 30x faster than a plain per-row loop, within 3x of only
parsing and writing the same CSV with pyarrow, and under 500 MB peak memory for 10 million
rows.

The bends are invented (seeded numpy): about 70 % road and 30 % rail, most radii above the
minimum so that most pass, about 10 % failing, 0.5 % with a bad cell, about half with a
deflection and a quarter of those with a spiral, plus two carried-through text columns (an
invented district and a survey note, some notes with a comma). They exercise the code; they
are not an engineering check of anything.

Measured in one run, side by side:
- batch: ``python -m curvetui batch IN -o OUT --columns all`` in a subprocess, wall time including
  start-up (the start-up alone is shown too, on a one-bend file);
- (a) loop: csv.DictReader, curvetui.bend.service.evaluate_bend per row (InputError = error row),
  the record flattened to the batch's output columns, csv.DictWriter; timed in this process
  (imports excluded) on the first --loop-rows rows and extrapolated linearly to all rows;
  its statuses are compared with the batch's for the same rows;
- (b) floor: pyarrow.csv.read_csv + write_csv of the input file in this process, with types
  inferred and with every column read as text; the faster of the two is the floor.
Peak memory is the sum of VmRSS over the batch process and all its descendants, sampled
from /proc every 50 ms (a page shared by two processes counts in both, so the sum errs high).
"""

from __future__ import annotations

import argparse
import csv
import os
import platform
import shutil
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

import numpy as np
import pyarrow as pa
import pyarrow.csv as pcsv

ROOT = Path(__file__).resolve().parents[1]
MEMORY_GOAL_MB = 500.0
LOOP_GOAL = 30.0  # batch at least this many times faster than the per-row loop
FLOOR_GOAL = 3.0  # batch within this many times the pyarrow read + write floor

HEADER = (
    "id", "kind", "district", "speed", "radius", "emax", "superelevation", "friction",
    "cant", "low_speed", "gauge", "deflection", "spiral", "survey_note",
)  # fmt: skip
DISTRICTS = np.array(
    ["Harrowmere", "Colvenford", "Pellworth Vale", "Saltgrave", "Upper Tarnley", "Mossbeck",
     "Eldham Cross", "Quenby Fen", "Ashcombe Ridge", "Wrayholt"]
)  # fmt: skip
NOTES = np.array(
    ["", "", "", "resurfaced", "kerb renewed, verge cut back", "sign faded",
     "sightline partly blocked by hedge, review", "drainage clear", "ballast cleaned",
     "rail wear noted, monitor", "survey by drone", "no change since last visit"]
)  # fmt: skip


def _road_f_max(speeds: np.ndarray) -> np.ndarray:
    """f_max of the road table the batch uses by default, to aim radii near the minimum."""
    from curvetui.core.units import unit_system
    from curvetui.storage.tables import road_table

    table = road_table(None, "metric")
    f, _ = table.f_max(unit_system("metric").speed_to_si(speeds.astype(float)))
    return np.asarray(f, dtype=float)


def _text(values: np.ndarray, decimals: int) -> np.ndarray:
    return (
        np.round(values, decimals).astype(str) if decimals else values.astype(np.int64).astype(str)
    )


def make_piece(rng: np.random.Generator, start: int, n: int) -> str:
    """``n`` invented bends as CSV lines (no header), ids numbered from ``start``."""
    road = rng.random(n) < 0.70
    rail = ~road
    fails = rng.random(n) < 0.07  # aimed past a limit; transitions add a few more

    speed = np.where(road, rng.integers(3, 13, n) * 10, rng.integers(8, 41, n) * 5).astype(float)
    # road: radius from the point-mass minimum R = V^2 / (127 (e + f))
    emax_given = road & (rng.random(n) < 0.4)
    emax = np.where(emax_given, rng.choice([4.0, 6.0, 8.0, 10.0, 12.0], n), 8.0)
    sup_given = road & (rng.random(n) < 0.10)
    sup = np.round(rng.uniform(0.3, 1.0, n) * emax, 1)
    e_used = np.where(sup_given, sup, emax) / 100.0
    fric_given = road & (rng.random(n) < 0.03)
    fric = np.round(rng.uniform(0.09, 0.16, n), 2)
    f_max = np.where(fric_given, fric, _road_f_max(np.clip(speed, 30, 120)))
    r_min_road = speed**2 / (127.0 * (e_used + f_max))
    factor = np.where(fails, rng.uniform(0.70, 0.97, n), np.exp(rng.uniform(0.15, 1.8, n)))
    radius_road = r_min_road * factor
    # rail: equilibrium cant E = s v^2 / (g R) (s = 1500 mm); deficiency D = E - cant
    cant = np.round(rng.uniform(20.0, 150.0, n), 0)
    d_max = np.where(speed <= 160, 160.0, 150.0)
    deficiency = np.where(fails, rng.uniform(1.05, 1.4, n), rng.uniform(0.1, 0.85, n)) * d_max
    radius_rail = 1500.0 * (speed / 3.6) ** 2 / (9.80665 * (cant + deficiency))
    radius = np.round(np.where(road, np.maximum(radius_road, 15.0), radius_rail), 0)
    low_given = rail & (rng.random(n) < 0.6)
    low = np.round(speed * rng.uniform(0.4, 0.7, n), 0)
    gauge_given = rail & (rng.random(n) < 0.05)

    # geometry: half with a deflection, a quarter of those with a spiral of plausible length
    has_defl = rng.random(n) < 0.5
    has_spiral = has_defl & (rng.random(n) < 0.25)
    v = speed / 3.6
    ls_road = np.sqrt(24.0 * radius) * rng.uniform(0.85, 0.98, n)  # in the shift range
    need_rail = np.maximum.reduce([cant / 2.5, cant * v / 60.0, deficiency * v / 70.0])
    ls_rail = need_rail * rng.uniform(1.1, 1.6, n)
    spiral = np.round(np.where(road, ls_road, ls_rail), 0)
    defl = rng.uniform(8.0, 75.0, n)
    # room for both spirals: their angles (Ls / R each half) must leave an arc
    defl = np.where(has_spiral, np.maximum(defl, np.degrees(spiral / radius) * 1.5 + 4.0), defl)
    defl = np.round(np.minimum(defl, 170.0), 2)

    columns = {
        "id": np.char.add(
            np.where(road, "RD-", "TK-"),
            np.char.zfill(np.arange(start + 1, start + n + 1).astype(str), 7),
        ),
        "kind": np.where(road, "road", "rail"),
        "district": DISTRICTS[rng.integers(0, len(DISTRICTS), n)],
        "speed": _text(speed, 0),
        "radius": _text(radius, 0),
        "emax": np.where(emax_given, _text(emax, 0), ""),
        "superelevation": np.where(sup_given, _text(sup, 1), ""),
        "friction": np.where(fric_given, _text(fric, 2), ""),
        "cant": np.where(rail, _text(cant, 0), ""),
        "low_speed": np.where(low_given, _text(low, 0), ""),
        "gauge": np.where(gauge_given, "1435", ""),
        "deflection": np.where(has_defl, _text(defl, 2), ""),
        "spiral": np.where(has_spiral, _text(spiral, 0), ""),
        "survey_note": NOTES[rng.integers(0, len(NOTES), n)],
    }
    # 0.5 % with a bad cell: an empty required value, text in a number, or a mistyped kind
    bad = np.nonzero(rng.random(n) < 0.005)[0]
    how = rng.integers(0, 4, len(bad))
    columns["speed"][bad[how == 0]] = ""
    columns["radius"][bad[how == 1]] = "n/a"
    columns["speed"][bad[how == 2]] = "8O"
    columns["kind"][bad[how == 3]] = "raod"
    note = columns["survey_note"]
    columns["survey_note"] = np.where(
        np.char.find(note, ",") >= 0, np.char.add(np.char.add('"', note), '"'), note
    )
    lines = [",".join(row) for row in zip(*(columns[c].tolist() for c in HEADER), strict=True)]
    return "\n".join(lines) + "\n"


def generate(path: Path, rows: int, seed: int, piece: int = 50_000) -> None:
    """Write ``rows`` invented bends to ``path`` in pieces (the generator stays small)."""
    rng = np.random.default_rng(seed)
    with open(path, "w", encoding="utf-8", newline="") as fh:
        fh.write(",".join(HEADER) + "\n")
        for start in range(0, rows, piece):
            fh.write(make_piece(rng, start, min(piece, rows - start)))


# ---------------------------------------------------------------- the batch command


def run_batch_command(src: Path, out: Path, sample_memory: bool = False):
    """(wall seconds, the memory sampler or None, stderr text)."""
    # every result column, as the per-row loop writes them (issue 16's default is narrower:
    # benchmarks/batch_million.py measures it)
    cmd = [sys.executable, "-m", "curvetui", "batch", str(src.resolve()), "-o", str(out.resolve())]
    cmd += ["--columns", "all"]
    started = time.perf_counter()
    proc = subprocess.Popen(cmd, cwd=ROOT, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    sampler = TreeMemory(proc.pid) if sample_memory else None
    if sampler:
        sampler.start()
    stdout, stderr = proc.communicate()
    wall = time.perf_counter() - started
    if sampler:
        sampler.stop()
    text = stderr.decode("utf-8", "replace")
    if proc.returncode not in (0, 1):  # 1 = some bends fail or have errors, expected here
        raise RuntimeError(f"the batch exited with {proc.returncode}:\n{text}")
    return wall, sampler, text


class TreeMemory(threading.Thread):
    """Peak of the summed VmRSS of a process and all its descendants, from /proc."""

    def __init__(self, pid: int, interval: float = 0.05):
        super().__init__(daemon=True)
        self.pid, self.interval = pid, interval
        self.peak_kb = 0
        self.peak_processes = 0
        self.samples = 0
        self._halt = threading.Event()

    @property
    def peak_mb(self) -> float:
        return self.peak_kb / 1024.0

    def stop(self) -> None:
        self._halt.set()
        self.join()

    def _tree(self) -> list[int]:
        parents: dict[int, list[int]] = {}
        for entry in os.listdir("/proc"):
            if not entry.isdigit():
                continue
            try:
                with open(f"/proc/{entry}/stat", "rb") as fh:
                    stat = fh.read()
            except OSError:
                continue
            ppid = int(stat[stat.rfind(b")") + 2 :].split()[1])
            parents.setdefault(ppid, []).append(int(entry))
        tree, todo = [], [self.pid]
        while todo:
            pid = todo.pop()
            tree.append(pid)
            todo += parents.get(pid, [])
        return tree

    @staticmethod
    def _rss_kb(pid: int) -> int:
        try:
            with open(f"/proc/{pid}/status", "rb") as fh:
                for line in fh:
                    if line.startswith(b"VmRSS:"):
                        return int(line.split()[1])
        except OSError:
            pass
        return 0  # gone, or a zombie without memory

    def run(self) -> None:
        while not self._halt.is_set():
            tree = self._tree()
            total = sum(self._rss_kb(pid) for pid in tree)
            self.samples += 1
            if total > self.peak_kb:
                self.peak_kb, self.peak_processes = total, len(tree)
            self._halt.wait(self.interval)


def status_counts(out: Path) -> dict[str, int]:
    """pass / fail / error as the batch wrote them in its output file."""
    table = pcsv.read_csv(
        out,
        convert_options=pcsv.ConvertOptions(
            include_columns=["status"], column_types={"status": pa.string()}
        ),
    )
    counts = table.column("status").value_counts().to_pylist()
    return {c["values"]: c["counts"] for c in counts}


def first_line(path: Path) -> bytes:
    with open(path, "rb") as fh:
        return fh.readline().rstrip(b"\r\n").replace(b'"', b"")


def first_statuses(out: Path, rows: int) -> list[str]:
    """The status of the first ``rows`` rows of the batch's output, read in blocks."""
    reader = pcsv.open_csv(
        out,
        convert_options=pcsv.ConvertOptions(
            include_columns=["status"], column_types={"status": pa.string()}
        ),
    )
    got: list[str] = []
    for batch in reader:
        got += batch.column(0).to_pylist()
        if len(got) >= rows:
            break
    return got[:rows]


# ---------------------------------------------------------------- (a) the per-row loop

INPUT_KEYS = {"speed": "speed", "radius": "radius", "superelevation": "superelevation",
              "emax": "emax", "friction": "friction", "cant": "cant", "low_speed": "low_speed",
              "gauge": "gauge", "deflection": "deflection", "spiral": "spiral_in"}  # fmt: skip


COLUMN_OF = {key: col for col, key in INPUT_KEYS.items()}


def per_row_loop(src: Path, out: Path, limit: int) -> tuple[float, int, list[str]]:
    """(seconds, rows done, statuses) for the first ``limit`` rows (0 = all)."""
    from curvetui.batch import columns as cols
    from curvetui.bend.messages import message_line
    from curvetui.bend.service import evaluate_bend
    from curvetui.core.units import unit_system
    from curvetui.inputs import InputError
    from curvetui.storage.tables import rail_limits, road_table

    units = unit_system("metric")
    table, limits = road_table(None, "metric"), rail_limits(None, "metric")
    statuses: list[str] = []
    started = time.perf_counter()
    with (
        open(src, newline="", encoding="utf-8") as fin,
        open(out, "w", newline="", encoding="utf-8") as fout,
    ):
        reader = csv.DictReader(fin)
        names = list(reader.fieldnames or [])
        result_names = cols.output_names(names)
        writer = csv.DictWriter(fout, fieldnames=names + result_names)
        writer.writeheader()
        for number, row in enumerate(reader, start=2):
            raw = {key: row[col] for col, key in INPUT_KEYS.items() if row.get(col)}

            def name(key: str, number: int = number) -> str:
                return f"ERROR row {number}, column {COLUMN_OF.get(key, key)}"

            try:
                kind = row["kind"].strip().lower()
                record = evaluate_bend(kind, raw, units, table, limits, name)
            except InputError as exc:
                record = {"status": "error", "messages": [str(exc)]}
            flat = dict(row)
            for out_name, column in zip(result_names, cols.result_names(names), strict=True):
                part, _, key = column.partition(".")
                value = record.get(part, {}).get(key) if key else record.get(column)
                flat[out_name] = "" if value is None else value
            flat[result_names[cols.result_names(names).index("row")]] = number
            # a record's messages are objects (severity, part, text): one line each
            messages = [m if isinstance(m, str) else message_line(m) for m in record["messages"]]
            flat[result_names[cols.result_names(names).index("messages")]] = "; ".join(messages)
            writer.writerow(flat)
            statuses.append(record["status"])
            if limit and len(statuses) >= limit:
                break
    return time.perf_counter() - started, len(statuses), statuses


# ---------------------------------------------------------------- (b) the floor


def floor(src: Path, out: Path, as_text: bool) -> float:
    started = time.perf_counter()
    convert = None
    if as_text:
        with open(src, encoding="utf-8") as fh:
            names = next(csv.reader(fh))
        convert = pcsv.ConvertOptions(column_types={n: pa.string() for n in names})
    table = pcsv.read_csv(src, convert_options=convert)
    pcsv.write_csv(table, out)
    return time.perf_counter() - started


def floor_same_output(src: Path, batch_out: Path, out: Path) -> float:
    """Not the goal's floor, shown beside it: pyarrow reading the input and writing a table
    with the batch's own output rows and columns (read back from the batch's file beforehand,
    untimed), so the cost of writing six times the input's bytes is seen on its own."""
    wide = pcsv.read_csv(batch_out)
    started = time.perf_counter()
    pcsv.read_csv(src)
    pcsv.write_csv(wide, out)
    return time.perf_counter() - started


# ---------------------------------------------------------------- report


def verdict(ok: bool) -> str:
    return "PASS" if ok else "MISS"


def mb(path: Path) -> str:
    return f"{path.stat().st_size / 1e6:,.0f} MB"


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--rows", type=int, default=1_000_000, help="bends to time (default 1e6)")
    ap.add_argument(
        "--loop-rows",
        type=int,
        default=50_000,
        help="rows the per-row loop is timed on, then extrapolated (0 = all)",
    )
    ap.add_argument(
        "--memory-rows",
        type=int,
        default=10_000_000,
        help="bends for the peak-memory run (default 1e7)",
    )
    ap.add_argument("--skip-memory", action="store_true", help="skip the peak-memory run")
    ap.add_argument("--seed", type=int, default=20261120, help="seed of the invented bends")
    ap.add_argument("--folder", help="where to put the temporary files (default: system temp)")
    args = ap.parse_args()

    import curvetui  # noqa: F401 - warm the import for the loop, outside its clock

    print(
        "machine: "
        f"{os.cpu_count()} cpus, python {platform.python_version()}, numpy {np.__version__}, "
        f"pyarrow {pa.__version__}, load average {os.getloadavg()[0]:.2f} at start"
    )
    folder = Path(tempfile.mkdtemp(prefix="curvetui-bench-", dir=args.folder))
    try:
        src = folder / "bends.csv"
        t0 = time.perf_counter()
        generate(src, args.rows, args.seed)
        print(
            f"generated {args.rows:,} invented bends in {time.perf_counter() - t0:.1f} s "
            f"({mb(src)}, seed {args.seed})"
        )
        src.read_bytes()  # into the page cache, so no run pays the first read from disk

        one = folder / "one.csv"
        generate(one, 1, args.seed)
        startup, _, _ = run_batch_command(one, folder / "one.out.csv")

        floor_typed = floor(src, folder / "floor-typed.csv", as_text=False)
        floor_text = floor(src, folder / "floor-text.csv", as_text=True)
        for name in ("floor-typed.csv", "floor-text.csv"):
            (folder / name).unlink()

        out = folder / "bends.checked.csv"
        batch_s, _, _ = run_batch_command(src, out)
        counts = status_counts(out)
        batch_rows = sum(counts.values())

        loop_out = folder / "loop.csv"
        loop_s, loop_n, loop_status = per_row_loop(src, loop_out, args.loop_rows)
        same_columns = first_line(loop_out) == first_line(out)
        loop_out.unlink()
        agree = sum(a == b for a, b in zip(loop_status, first_statuses(out, loop_n), strict=True))
        loop_full = loop_s * args.rows / loop_n
        print(
            f"batch output {mb(out)}; it found: pass {counts.get('pass', 0):,}, "
            f"fail {counts.get('fail', 0):,}, error {counts.get('error', 0):,} "
            f"({batch_rows:,} rows of {args.rows:,})"
        )
        print(
            f"per-row loop: status equal to the batch's on {agree:,} of its {loop_n:,} rows; "
            f"same output columns as the batch: {'yes' if same_columns else 'NO'}"
        )
        floor_wide = floor_same_output(src, out, folder / "floor-wide.csv")
        (folder / "floor-wide.csv").unlink()
        out.unlink()

        extrap = loop_n < args.rows
        rows = [
            ("batch: python -m curvetui batch (subprocess, wall)", batch_s, ""),
            ("  of which start-up (same command, one-bend file)", startup, ""),
            (
                "(a) per-row loop: csv + evaluate_bend",
                loop_full,
                f"EXTRAPOLATED from {loop_n:,} rows ({loop_s:.2f} s)" if extrap else "measured",
            ),
            ("(b) pyarrow read_csv + write_csv, types inferred", floor_typed, ""),
            ("(b) pyarrow read_csv + write_csv, all text", floor_text, ""),
            ("(b') pyarrow: read input, write the batch's output", floor_wide, "not the goal"),
        ]
        print()
        print(f"{'':52} {'seconds':>9} {'rows/s':>12}")
        for name, secs, note in rows:
            rate = f"{args.rows / secs:12,.0f}" if not name.startswith("  ") else f"{'':12}"
            print(f"{name:52} {secs:9.2f} {rate} {note}")
        best = min(floor_typed, floor_text)
        which = "types inferred" if floor_typed <= floor_text else "all text"
        vs_loop, vs_floor = loop_full / batch_s, batch_s / best
        print()
        print(
            f"batch vs (a) loop:  {vs_loop:6.1f}x faster  (goal >= {LOOP_GOAL:.0f}x)  "
            f"{verdict(vs_loop >= LOOP_GOAL)}" + ("  [loop extrapolated]" if extrap else "")
        )
        print(
            f"batch vs (b) floor: {vs_floor:6.2f}x the floor  (goal <= {FLOOR_GOAL:.0f}x)  "
            f"{verdict(vs_floor <= FLOOR_GOAL)}  [floor = the faster, {which}]"
        )
        print(
            f"batch vs (b') pyarrow writing the same output: {batch_s / floor_wide:5.2f}x "
            "(for reference: the goal is against (b))"
        )

        if not args.skip_memory:
            big = folder / "memory.csv"
            t0 = time.perf_counter()
            generate(big, args.memory_rows, args.seed + 1)
            gen_s = time.perf_counter() - t0
            big_out = folder / "memory.checked.csv"
            wall, sampler, _ = run_batch_command(big, big_out, sample_memory=True)
            peak = sampler.peak_mb
            big_counts = status_counts(big_out)
            size_in, size_out = mb(big), mb(big_out)
            big.unlink()
            big_out.unlink()
            print()
            print(
                f"memory run: {args.memory_rows:,} bends (generated in {gen_s:.0f} s, "
                f"{size_in} in, {size_out} out), batch wall {wall:.1f} s "
                f"({args.memory_rows / wall:,.0f} rows/s), rows written "
                f"{sum(big_counts.values()):,}"
            )
            print(
                f"peak memory (sum of VmRSS over the process tree, every 50 ms): "
                f"{peak:,.0f} MB  (goal < {MEMORY_GOAL_MB:.0f} MB)  "
                f"{verdict(peak < MEMORY_GOAL_MB)}"
            )
            print(
                f"  ({sampler.samples:,} samples; {sampler.peak_processes} processes in the "
                "tree at the peak)"
            )
        print(f"load average {os.getloadavg()[0]:.2f} at the end")
    finally:
        shutil.rmtree(folder, ignore_errors=True)


if __name__ == "__main__":
    main()
