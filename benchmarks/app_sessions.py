"""Scripted app sessions (by hand, not a test): random keys on hostile project files,
counting what must never happen.

    python benchmarks/app_sessions.py [--sessions N] [--keys K] [--seed S]

Each session copies the invented demo project, puts hostile text in a bend's id, name or
notes (markup, escape sequences, lone surrogates) or an edge number in an input, opens it
in the app (Textual's headless run_test, 80x24 or 120x40), presses K keys drawn from the
app's keys, digits, letters and editing keys, then closes without saving. Counts:
  refused at open a file the app refuses with its problems (not run further)
  crashes         an exception raised out of the app (run_test re-raises it), or the app's
                  crash guard ending it
  files changed   the project file's bytes differ after a session that never saved (no .bak)
  not reloadable  after a session that saved (a .bak beside it), the file no longer loads
"""

from __future__ import annotations

import argparse
import asyncio
import json
import random
import sys
import tempfile
import time
import traceback
from collections import Counter
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from curvetui.app.app import build_app  # noqa: E402
from curvetui.storage.project.files import ProjectError, load_project  # noqa: E402

DEMO = ROOT / "projects" / "quillmere-valley-road.json"
TEXTS = [
    "[/]",
    "[@click=app.quit]x",
    "[link=http://a.example]l[/link]",
    "\x1b]0;t\x07",
    "\ud800",
    "{nb}",
    "=1+1",
    "a" * 300,
    "[bold]b",
    "\r\n",
]
NUMBERS = [1e306, 1e-320, 10**30, 0.5, 179.999, -0.0, 2.5e-7]
KEYS = (
    ["tab", "shift+tab", "enter", "escape", "up", "down", "pageup", "pagedown", "backspace"]
    + ["f2", "f3", "f4", "f5", "f6", "f8", "f9", "ctrl+z", "ctrl+s", "delete", "home", "end"]
    + list("0123456789.+-e")
    + list("abcxyz")
    + ["space", "left", "right", "ctrl+down"]
)


def hostile_project(rng: random.Random, folder: Path, i: int) -> Path:
    data = json.loads(DEMO.read_text(encoding="utf-8"))
    bend = rng.choice(data["bends"])
    what = rng.random()
    if what < 0.4:
        bend[rng.choice(["id", "notes"])] = rng.choice(TEXTS)
    elif what < 0.6:
        data["details"]["name"] = rng.choice(TEXTS)
    else:
        key = rng.choice(sorted(bend["inputs"]))
        bend["inputs"][key] = rng.choice(NUMBERS)
    if rng.random() < 0.3:  # a rail bend first (issue 14: opened as road)
        rail = {"id": "R-1", "kind": "rail", "inputs": {"speed": 120, "radius": 1200, "cant": 90}}
        data["bends"].insert(0, rail)
    path = folder / f"s{i}.json"
    path.write_bytes(json.dumps(data).encode("utf-8", "surrogatepass"))
    return path


async def session(app, keys: list[str], size) -> int | None:
    async with app.run_test(size=size) as pilot:
        await pilot.pause()
        for key in keys:
            if not app.is_running:
                break
            await pilot.press(key)
        if app.is_running:
            app.exit()
    return app.return_code


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sessions", type=int, default=60)
    ap.add_argument("--keys", type=int, default=40)
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args()
    rng = random.Random(args.seed)
    counts: Counter = Counter()
    causes: Counter = Counter()
    started = time.perf_counter()
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        for i in range(args.sessions):
            path = hostile_project(rng, folder, i)
            before = path.read_bytes()
            keys = [rng.choice(KEYS) for _ in range(args.keys)]
            size = rng.choice([(80, 24), (120, 40)])
            counts["sessions"] += 1
            try:
                app = build_app(path)
            except ProjectError:  # refused with its problems (the command line: exit 2)
                counts["refused at open"] += 1
                continue
            try:
                code = asyncio.run(session(app, keys, size))
                if code not in (0, None):  # the app's crash guard ended it (exit 3)
                    counts["crashes"] += 1
                    causes[f"app ended with exit code {code}"] += 1
            except Exception as exc:  # noqa: BLE001 - counting exactly these
                counts["crashes"] += 1
                tb = traceback.extract_tb(exc.__traceback__)[-1]
                causes[f"{type(exc).__name__} at {Path(tb.filename).name}:{tb.lineno}"] += 1
            # a save keeps the previous file as NAME.json.bak (ctrl+s, or a question's answer
            # after F5 or a quit)
            saved = path.with_name(path.name + ".bak").exists()
            if not saved and path.read_bytes() != before:
                counts["files changed"] += 1
            if saved:
                counts["sessions that saved"] += 1
                try:
                    load_project(path)
                except ProjectError:
                    counts["not reloadable"] += 1
            for extra in folder.glob(f"s{i}.*"):
                if extra != path and extra.suffix == ".json" and "recovered" in extra.name:
                    counts["recovery copies"] += 1
    print(f"seed {args.seed}, {args.keys} keys a session, {time.perf_counter() - started:.0f} s")
    for key in (
        "sessions",
        "refused at open",
        "crashes",
        "files changed",
        "sessions that saved",
        "not reloadable",
        "recovery copies",
    ):
        print(f"  {key}: {counts[key]}")
    for cause, n in causes.most_common(10):
        print(f"  crash {n}: {cause}")


if __name__ == "__main__":
    main()
