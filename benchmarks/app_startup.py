"""Benchmark of the app's start-up against a minimal Textual app, side by side.

Run by hand from the repository root:
    python benchmarks/app_startup.py                     # 7 rounds
    python benchmarks/app_startup.py --runs 9 --baseline /tmp/old-checkout

Goals (issue 14): the first screen within 2x a minimal Textual app started the same way on
the same machine, and the first bend's results on screen within 3x.

Each command runs in a pseudo-terminal of 120 x 40 and the clock stops when its output holds
a marker:
(a) a minimal Textual app (one Static, `python -c ...`): its Static's text painted;
(b) `python -m curvetui projects/quillmere-valley-road.json` (a copy in a temporary folder):
    first paint = the caution line painted; results = the first bend's result head
    ("road bend, ...") painted.
The ratios are b / a of the medians, of the minimums (steadier on a shared machine) and the
median of each round's ratio (the load drifts between rounds less than over a whole run);
wall time first, then the CPU time each process had used when its marker was seen (all its
threads, from /proc: far less disturbed by other work on a shared machine, though it leaves
out waiting for the disk and includes the few ms the reader takes to notice the marker).
Rounds run the commands alternately, in a shuffled order each round, so that load from other
work falls on all alike. Bytecode: as an installed package has it (PYTHONPYCACHEPREFIX = a
temporary folder, filled by an untimed first run), and, with --as-given, also in the
environment as given (PYTHONDONTWRITEBYTECODE=1 makes every start compile curvetui's source).
"""

from __future__ import annotations

import argparse
import fcntl
import json
import os
import platform
import pty
import random
import select
import shutil
import statistics
import struct
import subprocess
import sys
import tempfile
import termios
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"
SIZE = (40, 120)  # rows, columns
MINIMAL_MARK = b"MINIMAL-APP-READY"
MINIMAL = f"""
from textual.app import App
from textual.widgets import Static

class Minimal(App):
    def compose(self):
        yield Static({MINIMAL_MARK.decode()!r})

Minimal().run()
"""
FIRST_PAINT_GOAL, RESULTS_GOAL = 2.0, 3.0


def cpu_seconds(pid: int) -> float:
    """CPU time a process has used so far, all its threads (Linux /proc schedstat, ns)."""
    total = 0
    for task in Path(f"/proc/{pid}/task").iterdir():
        try:
            total += int((task / "schedstat").read_text().split()[0])
        except (OSError, IndexError, ValueError):
            pass  # a thread that ended meanwhile
    return total / 1e9


def timed_run(argv: list[str], env: dict, cwd: Path, marks: dict[str, bytes]) -> dict:
    """Seconds from start until each of ``marks`` (name -> bytes) is in the output, and
    (as NAME_cpu) the CPU seconds the process had used when it was seen."""
    master, slave = pty.openpty()
    fcntl.ioctl(slave, termios.TIOCSWINSZ, struct.pack("HHHH", SIZE[0], SIZE[1], 0, 0))
    started = time.perf_counter()
    proc = subprocess.Popen(
        argv, stdin=slave, stdout=slave, stderr=slave, env=env, cwd=cwd, close_fds=True
    )
    os.close(slave)
    seen, got = b"", {}
    try:
        while len(got) < 2 * len(marks) and time.perf_counter() - started < 30:
            ready, _, _ = select.select([master], [], [], 0.02)
            if not ready:
                continue
            try:
                seen += os.read(master, 1 << 16)
            except OSError:
                break
            now = time.perf_counter() - started
            for name, mark in marks.items():
                if name not in got and mark in seen:
                    got[name] = now
                    got[name + "_cpu"] = cpu_seconds(proc.pid)
        missing = set(marks) - {name for name in got if name in marks}
        if missing:
            raise RuntimeError(f"{argv[-1]}: never painted {sorted(missing)}")
        return got
    finally:
        proc.kill()
        proc.wait()
        os.close(master)


def env_for(checkout: Path, cache: Path | None) -> dict:
    env = dict(os.environ, PYTHONPATH=str(checkout), TERM="xterm-256color")
    env.pop("TEXTUAL", None)
    if cache is not None:
        env.pop("PYTHONDONTWRITEBYTECODE", None)
        env["PYTHONPYCACHEPREFIX"] = str(cache)
    return env


def first_bend_mark(project: Path) -> bytes:
    """The start of the first bend's result head on the worksheet ('road bend, ')."""
    kind = json.loads(project.read_text(encoding="utf-8"))["bends"][0]["kind"]
    return f"{kind} bend, ".encode()


def run_rounds(
    checkouts: dict[str, Path], project: Path, runs: int, cache: Path | None, seed: int
) -> dict[str, list[dict]]:
    py = sys.executable
    cmds = {"minimal": ([py, "-c", MINIMAL], env_for(ROOT, cache), ROOT, {"paint": MINIMAL_MARK})}
    marks = {"paint": b"CAUTION", "results": first_bend_mark(project)}
    for label, path in checkouts.items():
        cmds[label] = ([py, "-m", "curvetui", str(project)], env_for(path, cache), path, marks)
    for argv, env, cwd, mk in cmds.values():  # untimed: warms file caches and bytecode
        timed_run(argv, env, cwd, mk)
    out: dict[str, list[dict]] = {name: [] for name in cmds}
    order = list(cmds)
    rng = random.Random(seed)
    for _ in range(runs):
        rng.shuffle(order)
        for name in order:
            argv, env, cwd, mk = cmds[name]
            out[name].append(timed_run(argv, env, cwd, mk))
    return out


def report(title: str, got: dict[str, list[dict]], clock: str = "") -> None:
    """The table of one clock: wall time ("") or the process's CPU time ("_cpu")."""
    base = [r["paint" + clock] for r in got["minimal"]]
    bmed, bmin = statistics.median(base), min(base)
    print(f"\n{title}")
    head = f"{'':44} {'median s':>9} {'min s':>7} {'ratio med':>10} {'ratio min':>10}"
    print(head + f" {'per round':>10}")
    print(f"{'(a) minimal Textual app, first paint':44} {bmed:9.3f} {bmin:7.3f}")
    for name, rows in got.items():
        if name == "minimal":
            continue
        for key, goal in (("paint", FIRST_PAINT_GOAL), ("results", RESULTS_GOAL)):
            ts = [r[key + clock] for r in rows]
            med, low = statistics.median(ts), min(ts)
            # each round's time over the minimal app's in the same round (load drifts)
            rounds = statistics.median(t / b for t, b in zip(ts, base, strict=True))
            verdict = "meets" if med / bmed <= goal else "MISSES"
            what = "first paint (caution)" if key == "paint" else "first bend's results"
            print(
                f"{'(b) ' + name + ': ' + what:44} {med:9.3f} {low:7.3f} "
                f"{med / bmed:10.2f} {low / bmin:10.2f} {rounds:10.2f}  {verdict} (goal <= "
                f"{goal:g}x, ratio of medians)"
            )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--runs", type=int, default=7, help="timed rounds (7; at least 5)")
    ap.add_argument("--baseline", type=Path, help="another curvetui checkout to time alongside")
    ap.add_argument(
        "--as-given", action="store_true", help="also time with the environment's bytecode setting"
    )
    ap.add_argument("--seed", type=int, default=1, help="seed of the run order")
    args = ap.parse_args()
    checkouts = {"this": ROOT}
    if args.baseline:
        checkouts["baseline"] = args.baseline.resolve()
    print(
        f"machine: {os.cpu_count()} cpus, python {platform.python_version()}, load average "
        f"{os.getloadavg()[0]:.2f} at start; {args.runs} runs each; pty {SIZE[1]}x{SIZE[0]}"
    )
    for label, path in checkouts.items():
        print(f"{label}: {path}")
    folder = Path(tempfile.mkdtemp(prefix="curvetui-start-"))
    try:
        project = folder / DEMO.name
        shutil.copy(DEMO, project)
        with tempfile.TemporaryDirectory(prefix="curvetui-pyc-") as cache:
            got = run_rounds(checkouts, project, args.runs, Path(cache), args.seed)
        report("bytecode cached (as installed), wall time:", got)
        report("bytecode cached (as installed), CPU time of the process:", got, "_cpu")
        if args.as_given:
            got = run_rounds(checkouts, project, args.runs, None, args.seed)
            given = os.environ.get("PYTHONDONTWRITEBYTECODE", "(unset)")
            report(f"environment as given (PYTHONDONTWRITEBYTECODE={given}), wall time:", got)
            report("environment as given, CPU time of the process:", got, "_cpu")
    finally:
        shutil.rmtree(folder)
    print(f"load average {os.getloadavg()[0]:.2f} at the end")


if __name__ == "__main__":
    main()
