"""Benchmark of the terminal app: start-up (command to first screen painted) and the
latency of a live recompute after an edit. Run by hand: python benchmarks/app_speed.py

Goals (issue 6): start-up under 1 s, recompute under 50 ms.
Start-up runs `python -m curvetui FILE` in a pseudo-terminal and stops the clock when the
caution line (always on screen) has been painted. Recompute times the app's own handler
for an edited field (engine + results + list row) and, separately, a key press through
Textual to the next idle moment (Pilot).
"""

from __future__ import annotations

import asyncio
import os
import pty
import select
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "projects" / "quillmere-valley-road.json"


def startup_once(path: Path) -> float:
    master, slave = pty.openpty()
    env = dict(os.environ, TERM="xterm-256color", COLUMNS="120", LINES="40")
    started = time.perf_counter()
    proc = subprocess.Popen([sys.executable, "-m", "curvetui", str(path)], stdin=slave,
                            stdout=slave, stderr=slave, env=env, close_fds=True)
    os.close(slave)
    seen = b""
    try:
        while time.perf_counter() - started < 20:
            ready, _, _ = select.select([master], [], [], 0.05)
            if ready:
                try:
                    seen += os.read(master, 65536)
                except OSError:
                    break
                if b"CAUTION" in seen:
                    return time.perf_counter() - started
        raise RuntimeError("the app never painted its caution line")
    finally:
        proc.kill()
        proc.wait()
        os.close(master)


async def recompute(path: Path, rounds: int = 40) -> tuple[list[float], list[float]]:
    from curvetui.app.app import build_app

    app = build_app(path)
    handler, end_to_end = [], []
    async with app.run_test(size=(120, 40)) as pilot:
        await pilot.press("down", "down", "down", "enter")  # QV-04, speed field focused
        await pilot.pause()
        box = app.query_one("#in-radius")
        box.focus()
        for i in range(rounds):
            box.value = ""
            await pilot.pause()
            started = time.perf_counter()
            await pilot.press(*str(150 + 10 * i))
            await pilot.pause()
            end_to_end.append(1000 * (time.perf_counter() - started))
            handler.append(app.last_recompute_ms)
    return handler, end_to_end


def main() -> None:
    folder = Path(tempfile.mkdtemp())
    path = folder / DEMO.name
    shutil.copy(DEMO, path)
    startup_once(path)  # warm the file cache
    starts = [startup_once(path) for _ in range(5)]
    print(f"start-up to first paint: median {statistics.median(starts):.3f} s, "
          f"max {max(starts):.3f} s over {len(starts)} runs (goal < 1 s)")
    handler, e2e = asyncio.run(recompute(path))
    print(f"recompute in the app's handler: median {statistics.median(handler):.1f} ms, "
          f"max {max(handler):.1f} ms (goal < 50 ms)")
    print(f"key press to idle through Textual (3 keys typed, each recomputing): median "
          f"{statistics.median(e2e):.1f} ms, max {max(e2e):.1f} ms")
    shutil.rmtree(folder)


if __name__ == "__main__":
    main()
