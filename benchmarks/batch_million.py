"""Benchmark of the batch output (issue 16, item 5): 1,000,000 bends, side by side in one run.

Run by hand, on an idle machine: python benchmarks/batch_million.py
A quick try: python benchmarks/batch_million.py --rows 50000 --loop-rows 500 --memory-rows 0

The bends are the invented road-and-rail file of benchmarks/batch_speed.py (same generator,
same seed: about 70 % road, 30 % rail, half with a deflection). Every batch run is
``python -m curvetui batch IN -o OUT [--columns ...]`` in a subprocess, wall time with its
start-up; the pyarrow runs are timed in this process (no start-up: that favours them). Each
contender runs ``--repeat`` times, interleaved, and its best time is reported (this
machine's two cores are shared; the load average is printed at start and end).

Goals (issue 16, item 5), each printed with PASS or MISS:
- the batch with its default columns within 1.5x of pyarrow reading the input and writing
  the same output table as CSV, numbers as numbers (the batch's own output read back with
  types inferred, beforehand, untimed); the same for --columns all;
- the default output of the road-and-rail file at most a third of today's size: today's is
  the output of the tree at ``--today`` (default be38ab9, main before this work), taken
  with ``git archive`` into the temporary folder and run the same way;
- Parquet output (-o OUT.parquet, default columns) within 1.5x of pyarrow reading the input
  and writing that table as Parquet;
- at least 30x a per-row loop over the one-bend path (benchmarks/batch_speed.per_row_loop:
  csv.DictReader, evaluate_bend, csv.DictWriter), timed on the first --loop-rows rows and
  EXTRAPOLATED linearly to all rows;
- peak memory (sum of VmRSS over the batch's process tree, sampled every 50 ms) under
  500 MB for --memory-rows (default 10,000,000) rows, default columns, CSV out.
Beside them: the text floor (pyarrow reading the input with every column as text and
writing it back as CSV), and the survey that finds the kinds present (pyarrow reading the
kind column alone, the whole file: what a file of one kind costs).
"""

from __future__ import annotations

import argparse
import os
import platform
import shutil
import subprocess
import sys
import tarfile
import tempfile
import time
from pathlib import Path

import numpy as np
import pyarrow as pa
import pyarrow.csv as pcsv
import pyarrow.parquet as pq

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(HERE))
sys.path.insert(0, str(ROOT))

from batch_speed import TreeMemory, generate, per_row_loop, verdict  # noqa: E402

SPEED_GOAL = 1.5  # batch within this many times pyarrow writing the same table
SIZE_GOAL = 1 / 3  # default output at most this share of today's
LOOP_GOAL = 30.0
MEMORY_GOAL_MB = 500.0


def run_batch(tree: Path, src: Path, out: Path, *extra: str, memory: bool = False):
    """(wall seconds, peak MB or None) of ``python -m curvetui batch`` from ``tree``."""
    cmd = [sys.executable, "-m", "curvetui", "batch", str(src), "-o", str(out), *extra]
    env = {**os.environ, "PYTHONPATH": str(tree)}
    started = time.perf_counter()
    proc = subprocess.Popen(
        cmd, cwd=tree, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE
    )
    sampler = TreeMemory(proc.pid) if memory else None
    if sampler:
        sampler.start()
    _, err = proc.communicate()
    wall = time.perf_counter() - started
    if sampler:
        sampler.stop()
    if proc.returncode not in (0, 1):  # 1: some bends fail or have errors, as intended
        raise RuntimeError(f"{cmd} exited {proc.returncode}:\n{err.decode(errors='replace')}")
    return wall, (sampler.peak_mb if sampler else None)


def text_floor(src: Path, out: Path) -> float:
    """pyarrow reading the input, every column as text, and writing it back as CSV."""
    started = time.perf_counter()
    names = pcsv.read_csv(src, read_options=pcsv.ReadOptions(skip_rows_after_names=10**9))
    types = {n: pa.string() for n in names.column_names}
    table = pcsv.read_csv(src, convert_options=pcsv.ConvertOptions(column_types=types))
    pcsv.write_csv(table, out)
    return time.perf_counter() - started


def pyarrow_same_csv(src: Path, written: pa.Table, out: Path) -> float:
    """pyarrow reading the input (types inferred) and writing ``written`` as CSV."""
    started = time.perf_counter()
    pcsv.read_csv(src)
    pcsv.write_csv(written, out)
    return time.perf_counter() - started


def pyarrow_same_parquet(src: Path, written: pa.Table, out: Path) -> float:
    """pyarrow reading the input and writing ``written`` as Parquet (default options)."""
    started = time.perf_counter()
    pcsv.read_csv(src)
    pq.write_table(written, out)
    return time.perf_counter() - started


def survey_time(src: Path) -> float:
    """The kind column alone, read over the whole file as the survey reads it."""
    from curvetui.batch.header import HEAD_BYTES, read_header
    from curvetui.batch.survey import SURVEY_BLOCK, _found

    started = time.perf_counter()
    with open(src, "rb") as fh:
        header = read_header(fh.read(HEAD_BYTES))
    names = [f"c{i}" for i in range(len(header.names))]
    kind = names[header.known["kind"]]
    reader = pcsv.open_csv(
        src,
        read_options=pcsv.ReadOptions(column_names=names, skip_rows=1, block_size=SURVEY_BLOCK),
        convert_options=pcsv.ConvertOptions(
            include_columns=[kind], column_types={kind: pa.string()}
        ),
    )
    found: set[str] = set()
    for batch in reader:  # to the end, as for a file of one kind
        found |= _found(batch.column(0))
    return time.perf_counter() - started


def today_tree(folder: Path, rev: str) -> Path | None:
    """The tree at ``rev`` (git archive, read only), or None when it cannot be had."""
    dest = folder / "today"
    archive = folder / "today.tar"
    with open(archive, "wb") as fh:
        done = subprocess.run(["git", "-C", str(ROOT), "archive", rev], stdout=fh)
    if done.returncode != 0:
        return None
    with tarfile.open(archive) as tar:
        tar.extractall(dest, filter="data")
    archive.unlink()
    return dest


def mb(size: int) -> str:
    return f"{size / 1e6:,.1f} MB"


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--rows", type=int, default=1_000_000)
    ap.add_argument("--loop-rows", type=int, default=5_000, help="rows the loop is timed on")
    ap.add_argument("--memory-rows", type=int, default=10_000_000, help="0: no memory run")
    ap.add_argument("--repeat", type=int, default=3, help="runs of each; the best is shown")
    ap.add_argument("--today", default="be38ab9", help="git revision of today's batch")
    ap.add_argument("--seed", type=int, default=20261120)
    ap.add_argument("--folder", help="where the temporary files go (default: system temp)")
    args = ap.parse_args()

    import curvetui  # noqa: F401 - the loop's imports, outside its clock

    print(
        f"machine: {os.cpu_count()} cpus, python {platform.python_version()}, numpy "
        f"{np.__version__}, pyarrow {pa.__version__}; load average {os.getloadavg()[0]:.2f} "
        "at start"
    )
    folder = Path(tempfile.mkdtemp(prefix="curvetui-million-", dir=args.folder))
    try:
        src = folder / "bends.csv"
        generate(src, args.rows, args.seed)
        src.read_bytes()  # into the page cache
        size_in = src.stat().st_size
        print(f"input: {args.rows:,} invented bends, {mb(size_in)} (seed {args.seed})")
        today = today_tree(folder, args.today)

        outs = {
            "default": folder / "out.default.csv",
            "all": folder / "out.all.csv",
            "parquet": folder / "out.default.parquet",
            "today": folder / "out.today.csv",
        }
        extra = {"default": (), "all": ("--columns", "all"), "parquet": ()}
        # the tables pyarrow writes: the batch's own outputs, read back once, untimed
        run_batch(ROOT, src, outs["default"])
        run_batch(ROOT, src, outs["all"], "--columns", "all")
        run_batch(ROOT, src, outs["parquet"])
        written = {
            "default": pcsv.read_csv(outs["default"]),
            "all": pcsv.read_csv(outs["all"]),
            "parquet": pq.read_table(outs["parquet"]),
        }
        sizes = {k: p.stat().st_size for k, p in outs.items() if p.exists()}

        best: dict[str, float] = {}

        def keep(name: str, seconds: float) -> None:
            best[name] = min(best.get(name, float("inf")), seconds)

        scratch = folder / "scratch"
        for _ in range(args.repeat):
            keep("floor", text_floor(src, scratch))
            for name in ("default", "all", "parquet"):
                out = outs[name]
                keep(f"batch {name}", run_batch(ROOT, src, out, *extra[name])[0])
                if name == "parquet":
                    keep("pyarrow parquet", pyarrow_same_parquet(src, written[name], scratch))
                else:
                    keep(f"pyarrow {name}", pyarrow_same_csv(src, written[name], scratch))
            if today is not None:
                keep("today", run_batch(today, src, outs["today"])[0])
            keep("survey", survey_time(src))
        if today is not None:
            sizes["today"] = outs["today"].stat().st_size
        one = folder / "one.csv"
        generate(one, 1, args.seed)
        startup = min(run_batch(ROOT, one, folder / "one.out.csv")[0] for _ in range(3))

        loop_s, loop_n, _ = per_row_loop(src, folder / "loop.csv", args.loop_rows)
        loop_full = loop_s * args.rows / loop_n

        print(f"\nbest of {args.repeat} runs each; batch = subprocess wall with start-up")
        print(f"{'':58} {'seconds':>8} {'rows/s':>11}")
        lines = [
            ("text floor: pyarrow read (all text) + write CSV", best["floor"]),
            ("batch, default columns (CSV)", best["batch default"]),
            ("  pyarrow: read input + write the same table (CSV)", best["pyarrow default"]),
            ("batch --columns all (CSV)", best["batch all"]),
            ("  pyarrow: read input + write the same table (CSV)", best["pyarrow all"]),
            ("batch, default columns, -o .parquet", best["batch parquet"]),
            ("  pyarrow: read input + write the same table (Parquet)", best["pyarrow parquet"]),
            ("survey of the kinds (kind column, whole file)", best["survey"]),
            ("batch start-up (one-bend file)", startup),
        ]
        if "today" in best:
            lines.append((f"today's batch ({args.today}, its default)", best["today"]))
        lines.append((f"per-row loop, EXTRAPOLATED from {loop_n:,} rows", loop_full))
        for name, secs in lines:
            print(f"{name:58} {secs:8.2f} {args.rows / secs:11,.0f}")

        print("\noutput sizes:")
        for name in ("today", "all", "default", "parquet"):
            if name in sizes:
                print(f"  {name:8} {mb(sizes[name]):>12}  ({sizes[name] / size_in:.2f}x the input)")

        print("\ngoals:")
        r = best["batch default"] / best["pyarrow default"]
        print(
            f"  default CSV vs pyarrow same table: {r:5.2f}x (<= {SPEED_GOAL}) "
            + verdict(r <= SPEED_GOAL)
        )
        r = best["batch all"] / best["pyarrow all"]
        print(
            f"  all CSV vs pyarrow same table:     {r:5.2f}x (<= {SPEED_GOAL}) "
            + verdict(r <= SPEED_GOAL)
        )
        r = best["batch parquet"] / best["pyarrow parquet"]
        print(
            f"  Parquet vs pyarrow same table:     {r:5.2f}x (<= {SPEED_GOAL}) "
            + verdict(r <= SPEED_GOAL)
        )
        if "today" in sizes:
            share = sizes["default"] / sizes["today"]
            print(
                f"  default size / today's:            {share:5.3f}  (<= 0.333) "
                f"{verdict(share <= SIZE_GOAL)}"
            )
        r = loop_full / best["batch default"]
        print(
            f"  vs the per-row loop:               {r:5.0f}x faster (>= {LOOP_GOAL:.0f}) "
            f"{verdict(r >= LOOP_GOAL)}  [loop extrapolated]"
        )
        if args.memory_rows:
            big = folder / "memory.csv"
            for p in folder.glob("out.*"):
                p.unlink()
            generate(big, args.memory_rows, args.seed + 1)
            wall, peak = run_batch(ROOT, big, folder / "memory.out.csv", memory=True)
            print(
                f"  peak memory, {args.memory_rows:,} rows (default, CSV; {wall:.0f} s): "
                f"{peak:,.0f} MB (< {MEMORY_GOAL_MB:.0f}) {verdict(peak < MEMORY_GOAL_MB)}"
            )
            wall, peak = run_batch(ROOT, big, folder / "memory.out.parquet", memory=True)
            print(
                f"  peak memory, {args.memory_rows:,} rows (default, Parquet; {wall:.0f} s): "
                f"{peak:,.0f} MB (< {MEMORY_GOAL_MB:.0f}) {verdict(peak < MEMORY_GOAL_MB)}"
            )
        print(f"load average {os.getloadavg()[0]:.2f} at the end")
    finally:
        shutil.rmtree(folder, ignore_errors=True)


if __name__ == "__main__":
    main()
