"""Time the realignment design solve on a 200-station survey (run by hand).

python benchmarks/realign_speed.py [--stations N]

The survey is generated (demo data): a trapezoid diagram on a 20 m chord with smooth
closing slews added, as tests/unit/core/test_versine_design.py builds them. Prints the
median of 5 runs for: no constraints, one hold, a slew limit that binds, and an infeasible
limit (the min-max linear programs included), and ten holds (a platform of five stations
and five single holds) met with local versine corrections, free, under a 16 mm limit and
under a 2 mm limit.
"""

from __future__ import annotations

import argparse
import statistics
import time

import numpy as np

from curvetui.core.versine_design import design_realignment


def survey(n: int):
    i = np.arange(n, dtype=float)
    a, n1, n2, e = 0.2 * n, 12, 15, 0.75 * n
    d = 0.05 * np.clip(np.minimum((i - a) / n1, (e - i) / n2), 0, 1)
    s = np.zeros(n)
    k = (i > 5) & (i < n - 6)
    s[k] = 0.03 * np.sin(np.pi * (i[k] - 5) / (n - 11)) ** 2 * np.sin(3 * np.pi * i[k] / n)
    m = d + (np.concatenate(([0], s[:-1])) - 2 * s + np.concatenate((s[1:], [0]))) / 2
    return i * 10.0, m


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--stations", type=int, default=200)
    n = ap.parse_args().stations
    st, m = survey(n)
    free = design_realignment(st, m, 20.0)
    # a platform (5 stations) and 5 single holds at 0, with local versine corrections
    ten = {st[int(f * n)]: 0.0 for f in (0.15, 0.25, 0.35, 0.6, 0.75)}
    ten.update({st[n // 2 + k]: 0.0 for k in range(5)})
    cases = {
        "free": {},
        "one hold": {"holds": {st[n // 2]: 0.0}},
        "two holds": {"holds": {st[n // 2]: 0.0, st[2 * n // 3]: 0.0}},
        "limit binds": {"slew_limit": 0.97 * free.max_slew},
        "infeasible limit": {"slew_limit": 0.2 * free.max_slew},
        "10 holds, corr.": {"holds": ten, "corrections": True},
        "10 holds, 16 mm": {"holds": ten, "corrections": True, "slew_limit": 0.016},
        "10 holds, tight": {"holds": ten, "corrections": True, "slew_limit": 0.002},
    }
    for name, kw in cases.items():
        times = []
        for _ in range(5):
            t0 = time.perf_counter()
            r = design_realignment(st, m, 20.0, **kw)
            times.append(time.perf_counter() - t0)
        print(
            f"{n} stations, {name:17s}: {statistics.median(times) * 1000:7.1f} ms "
            f"(feasible {r.feasible}, max slew {r.max_slew * 1000:.2f} mm, "
            f"cells {r.cells_searched})"
        )


if __name__ == "__main__":
    main()
