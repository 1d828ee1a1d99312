"""Benchmark of start-up: a one-bend check as a whole process, and one bend in-process.

Run by hand from the repository root:
    python benchmarks/startup.py                      # 30 runs of each command
    python benchmarks/startup.py --runs 50 --baseline /tmp/old-checkout

Goals (the start-up issue): `curvetui check road ... --json` as a whole process within 1.5x
of `python -c "import numpy"` (the engine needs numpy, so that is the floor), and one bend
through `curvetui.bend.service.evaluate_bend` in-process under 2 ms. The batch of a million bends is
timed by `benchmarks/batch_speed.py`.

Measured side by side, in this interpreter (sys.executable), with PYTHONPATH set to the
checkout being timed so that its own code runs:
(a) `python -c "import numpy"`;
(b) `python -m curvetui check road --speed 100 --radius 400 --emax 8 --json`, and the same
    through the installed `curvetui` console script when there is one beside the
    interpreter (it imports curvetui.cli directly instead of running curvetui/__main__.py);
(c) the ratio b / a, of the medians and of the minimums;
(d) in a fresh child process: one road bend and one rail bend through evaluate_bend, and the
    road bend through the command line's main() with --json (output to a string), each the
    median of repeated timeit batches (after a warm-up call, so first-call costs are out).
Commands are run in a shuffled order each round, so that load from other work on the machine
falls on all of them alike; the median and the minimum of --runs wall times are shown (on a
shared machine the minimum is the steadier figure). With --baseline DIR (another checkout of
curvetui, e.g. `git archive` of an older commit), its rows are timed in the same rounds.

Whole-process times are taken twice: with bytecode cached, as a pip install leaves a package
(PYTHONPYCACHEPREFIX = a temporary folder, so nothing is written into the checkout; the first
run fills it), and in the environment as given: with PYTHONDONTWRITEBYTECODE set and no
__pycache__ in the checkout, every start compiles curvetui's source while numpy's installed
bytecode is read, which costs curvetui some 30-50 ms more than an installed copy pays.
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import random
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
RATIO_GOAL = 1.5
BEND_GOAL_MS = 2.0
CHECK = ["check", "road", "--speed", "100", "--radius", "400", "--emax", "8", "--json"]

# Run in a child process with PYTHONPATH = the checkout; prints one JSON object of ms/call.
IN_PROCESS = """
import contextlib, io, json, statistics, timeit
from curvetui.bend.service import evaluate_bend
from curvetui.cli import main
from curvetui.core.units import unit_system
from curvetui.storage.tables import rail_limits, road_table

units = unit_system("metric")
table, limits = road_table(None, "metric"), rail_limits(None, "metric")
ROAD = {"speed": "100", "radius": "400", "emax": "8"}
RAIL = {"speed": "120", "radius": "1000", "cant": "100"}
ARGS = %r

def cli():
    with contextlib.redirect_stdout(io.StringIO()):
        assert main(ARGS) == 0

cases = {
    "road": lambda: evaluate_bend("road", ROAD, units, table, limits),
    "rail": lambda: evaluate_bend("rail", RAIL, units, table, limits),
    "cli": cli,
}
out = {}
for name, fn in cases.items():
    fn()  # warm-up: first-call costs (caches, lazy imports) are not a bend's time
    timer = timeit.Timer(fn)
    number, _ = timer.autorange()
    per_call = [t / number * 1e3 for t in timer.repeat(repeat=15, number=number)]
    out[name] = [statistics.median(per_call), min(per_call)]
print(json.dumps(out))
"""


def env_for(checkout: Path, cache: Path | None = None) -> dict:
    """The environment of a run: PYTHONPATH = the checkout; with `cache`, bytecode is written
    to and read from that folder (as an installed package's __pycache__ is)."""
    env = dict(os.environ, PYTHONPATH=str(checkout))
    if cache is not None:
        env.pop("PYTHONDONTWRITEBYTECODE", None)
        env["PYTHONPYCACHEPREFIX"] = str(cache)
    return env


def commands(checkouts: dict[str, Path], cache: Path | None) -> dict:
    """Name -> (argv, environment, working folder) of every command to time."""
    py = sys.executable
    script = Path(py).parent / "curvetui"
    first = next(iter(checkouts.values()))
    numpy_env = env_for(first, cache)
    cmds = {"(a) python -c 'import numpy'": ([py, "-c", "import numpy"], numpy_env, first)}
    for label, path in checkouts.items():
        env = env_for(path, cache)
        cmds[f"(b) {label}: python -m curvetui check road --json"] = (
            [py, "-m", "curvetui", *CHECK],
            env,
            path,
        )
        if script.exists():
            cmds[f"(b) {label}: curvetui check road --json (script)"] = (
                [str(script), *CHECK],
                env,
                path,
            )
    return cmds


def wall_times(cmds: dict, runs: int, warmup: int, seed: int) -> dict[str, list[float]]:
    """Wall seconds of each command, `runs` times, in a shuffled order each round."""
    for name, (argv, env, cwd) in cmds.items():  # once, to check it works (and warm caches)
        proc = subprocess.run(argv, env=env, cwd=cwd, capture_output=True, text=True)
        if proc.returncode != 0:
            sys.exit(f"{name} exited with {proc.returncode}:\n{proc.stderr}")
        if "check road" in name:
            assert json.loads(proc.stdout)["status"] == "pass", name
    times: dict[str, list[float]] = {name: [] for name in cmds}
    order = list(cmds)
    rng = random.Random(seed)
    for i in range(warmup + runs):
        rng.shuffle(order)
        for name in order:
            argv, env, cwd = cmds[name]
            t0 = time.perf_counter()
            subprocess.run(argv, env=env, cwd=cwd, stdout=subprocess.DEVNULL, check=True)
            if i >= warmup:
                times[name].append(time.perf_counter() - t0)
    return times


def in_process(checkout: Path) -> dict[str, list[float]]:
    proc = subprocess.run(
        [sys.executable, "-c", IN_PROCESS % (CHECK,)],
        env=env_for(checkout),
        cwd=checkout,
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(proc.stdout)


def report(title: str, times: dict[str, list[float]]) -> None:
    print(f"\n{title}\n{'whole process, wall time':58} {'median ms':>10} {'min ms':>8}")
    for name, ts in times.items():
        print(f"{name:58} {1e3 * statistics.median(ts):10.1f} {1e3 * min(ts):8.1f}")
    base = times["(a) python -c 'import numpy'"]
    print(f"{'(c) ratio b / a (goal <= ' + str(RATIO_GOAL) + ')':58} {'median':>10} {'min':>8}")
    for name, ts in times.items():
        if name.startswith("(b)"):
            med = statistics.median(ts) / statistics.median(base)
            low = min(ts) / min(base)
            verdict = "meets" if med <= RATIO_GOAL else "MISSES"
            print(f"{name[4:]:58} {med:10.2f} {low:8.2f}  {verdict} (median)")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--runs", type=int, default=30, help="timed runs of each command (30)")
    ap.add_argument("--warmup", type=int, default=3, help="untimed rounds first (3)")
    ap.add_argument("--baseline", type=Path, help="another curvetui checkout to time alongside")
    ap.add_argument("--seed", type=int, default=1, help="seed of the run order")
    args = ap.parse_args()
    checkouts = {"this": ROOT}
    if args.baseline:
        checkouts["baseline"] = args.baseline.resolve()
    print(
        f"machine: {os.cpu_count()} cpus, python {platform.python_version()}, "
        f"load average {os.getloadavg()[0]:.2f} at start; {args.runs} runs each"
    )
    for label, path in checkouts.items():
        print(f"{label}: {path}")
    with tempfile.TemporaryDirectory(prefix="curvetui-pyc-") as cache:
        times = wall_times(commands(checkouts, Path(cache)), args.runs, args.warmup, args.seed)
    report("bytecode cached (as installed):", times)
    given = "PYTHONDONTWRITEBYTECODE=" + os.environ.get("PYTHONDONTWRITEBYTECODE", "(unset)")
    for label, path in checkouts.items():
        given += f"; {label} __pycache__: {(path / 'curvetui' / '__pycache__').is_dir()}"
    times = wall_times(commands(checkouts, None), args.runs, args.warmup, args.seed)
    report(f"environment as given ({given}):", times)

    print(f"\n{'(d) in-process, one bend (goal < 2 ms)':58} {'median ms':>10} {'min ms':>8}")
    for label, path in checkouts.items():
        got = in_process(path)
        for key, what in (
            ("road", "evaluate_bend('road', 100 km/h, R 400 m)"),
            ("rail", "evaluate_bend('rail', 120 km/h, R 1000 m, 100 mm)"),
            ("cli", "main(check road ... --json), output to a string"),
        ):
            med, low = got[key]
            verdict = ("meets" if med < BEND_GOAL_MS else "MISSES") if key != "cli" else ""
            print(f"{label + ': ' + what:58} {med:10.3f} {low:8.3f}  {verdict}")


if __name__ == "__main__":
    main()
