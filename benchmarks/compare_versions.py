"""Old and new engine side by side on the same batch file: the refactor's parity check.

Run by hand: ``python benchmarks/compare_versions.py OLD_CHECKOUT FILE.csv [--units us]``.
Runs ``curvetui batch`` from OLD_CHECKOUT (another git worktree) and from this checkout on
FILE.csv and compares, row by row: the status, every result column both write, and the FAIL
lines of the messages. Prints the differences found (the first few of each kind).
"""

from __future__ import annotations

import csv
import os
import subprocess
import sys
import tempfile
from collections import Counter
from pathlib import Path

HERE = Path(__file__).resolve().parents[1]


def batch(checkout: Path, src: Path, out: Path, extra: list[str]) -> None:
    env = {**os.environ, "PYTHONPATH": str(checkout)}
    subprocess.run(
        [sys.executable, "-m", "curvetui", "batch", str(src), "-o", str(out), *extra],
        cwd=tempfile.gettempdir(), env=env, capture_output=True, check=False,
    )


def fails(messages: str) -> set[str]:
    return {m.strip() for m in messages.split("; ") if "FAIL" in m}


def main() -> None:
    old, src, extra = Path(sys.argv[1]).resolve(), Path(sys.argv[2]).resolve(), sys.argv[3:]
    with tempfile.TemporaryDirectory() as tmp:
        a, b = Path(tmp) / "old.csv", Path(tmp) / "new.csv"
        batch(old, src, a, extra)
        batch(HERE, src, b, extra)
        rows_a = list(csv.DictReader(a.open(encoding="utf-8")))
        rows_b = list(csv.DictReader(b.open(encoding="utf-8")))
    common = [c for c in rows_a[0] if c in rows_b[0] and c not in ("messages",)]
    seen: Counter = Counter()
    shown: Counter = Counter()
    assert len(rows_a) == len(rows_b), (len(rows_a), len(rows_b))
    for ra, rb in zip(rows_a, rows_b, strict=True):
        for c in common:
            if ra[c] != rb[c]:
                seen[c] += 1
                if shown[c] < 3:
                    shown[c] += 1
                    print(f"row {ra['row']} {c}: old {ra[c]!r} new {rb[c]!r}")
        if fails(ra["messages"]) != fails(rb["messages"]):
            seen["FAIL lines"] += 1
            if shown["FAIL lines"] < 3:
                shown["FAIL lines"] += 1
                print(f"row {ra['row']} FAIL lines: old {fails(ra['messages'])} "
                      f"new {fails(rb['messages'])}")
    statuses = Counter(r["status"] for r in rows_b)
    print(f"{len(rows_b)} rows, {len(common)} common columns; new statuses {dict(statuses)}")
    print("differences by column:", dict(seen) or "none")


if __name__ == "__main__":
    main()
