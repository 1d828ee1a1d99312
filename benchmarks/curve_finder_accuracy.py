"""Accuracy of the curve finder on generated alignments (run by hand, prints a table).

python benchmarks/curve_finder_accuracy.py [--alignments N] [--seed S]

Each alignment is a chain of bends built with the project's own geometry
(core/alignment.py lays it out, core/plan_elements.py turns it into lines, arcs and
clothoids, core/plan_points.py puts vertices along them): generated data, seeded, no
real road. Bends: radius log-uniform in [50, 2000] m, deflection uniform in [10, 90]
degrees, spirals (in about half the bends) of 20 to 120 m each where they fit; between
consecutive bends a long tangent (100 to 400 m), a reverse pair (opposite sense, 0 to
60 m), a broken-back pair (same sense, 30 to 150 m) or a compound curve (same sense, no
tangent, no spiral at the joint). Vertices every 1, 2, 3 or 5 m, then Gaussian noise of
0, 0.1, 0.25 or 0.5 m added to each coordinate.

For each spacing and noise: the share of the true curves' length covered by found curves
turning the same way; the radius error (found curve overlapping a true one most, its
radius against the true sharpest radius; median and 95th percentile); false curves (found
curves with less than half their length on a true curve); missed curves (true curves with
less than half their length found); shape: true curves whose most overlapping found curve
has their shape (simple, spiralled, compound). Found stations run along the noisy line; they are
taken back to true stations through the vertices (each vertex's station on both).
Goals (issue 16): at least 95 % of curve length found; median radius error under 2 %
without noise and under 5 % with 0.5 m noise.

--calibrate prints the curvature noise left on straight noisy lines after the finder's
smoothing (the constants of core/curve_regions.py).
"""

from __future__ import annotations

import argparse
import math
import time
from dataclasses import dataclass

import numpy as np

from curvetui.core.alignment import Chain
from curvetui.core.curve_finder import FinderSettings, find_curves
from curvetui.core.plan_elements import chain_elements
from curvetui.core.plan_points import points_along
from curvetui.core.spiral import spiral_curve

SPACINGS = (1.0, 2.0, 3.0, 5.0)
NOISES = (0.0, 0.1, 0.25, 0.5)
RADIUS_RANGE = (50.0, 2000.0)
DEFLECTION_RANGE = (10.0, 90.0)  # degrees
SPIRAL_RANGE = (20.0, 120.0)
END_TANGENT = 150.0


@dataclass(frozen=True)
class TrueCurve:
    begin: float
    end: float
    radius: float
    sense: int  # +1 right (clockwise), -1 left
    kind: str


def generate(rng: np.random.Generator, bends: int = 5):
    """A random chain (module doc) and its true curves."""
    radii, defl, senses, l_in, l_out, joins = [], [], [], [], [], []
    for i in range(bends):
        join = "start" if i == 0 else rng.choice(["tangent", "reverse", "broken", "compound"])
        sense = int(rng.choice([-1, 1])) if i == 0 else senses[-1]
        if join == "reverse":
            sense = -senses[-1]
        elif join == "tangent":
            sense = int(rng.choice([-1, 1]))
        r = float(math.exp(rng.uniform(*np.log(RADIUS_RANGE))))
        d = math.radians(rng.uniform(*DEFLECTION_RANGE))
        a, b = 0.0, 0.0
        if rng.random() < 0.5:
            a, b = (float(rng.uniform(*SPIRAL_RANGE)) for _ in range(2))
            if a + b > 1.4 * r * d:  # spirals that would (nearly) use up the bend: none
                a, b = 0.0, 0.0
        if join == "compound":
            l_out[-1] = 0.0
            a = 0.0
        radii.append(r)
        defl.append(d)
        senses.append(sense)
        l_in.append(a)
        l_out.append(b)
        joins.append(join)
    geoms = [spiral_curve(r, d, a, b) for r, d, a, b in zip(radii, defl, l_in, l_out, strict=True)]
    t_in = [float(g.tangent_in) for g in geoms]
    t_out = [float(g.tangent_out) for g in geoms]
    tangents = []
    for join in joins[1:]:
        tangents.append(
            {
                "tangent": rng.uniform(100, 400),
                "reverse": rng.uniform(0, 60),
                "broken": rng.uniform(30, 150),
                "compound": 0.0,
            }[join]
        )
    legs = [END_TANGENT + t_in[0]]
    legs += [t_out[i] + tangents[i] + t_in[i + 1] for i in range(bends - 1)]
    legs.append(t_out[-1] + END_TANGENT)
    bearing = rng.uniform(0, 2 * math.pi)
    pts = [(0.0, 0.0)]
    for i, leg in enumerate(legs):
        e, n = pts[-1]
        pts.append((e + leg * math.sin(bearing), n + leg * math.cos(bearing)))
        if i < bends:
            bearing += senses[i] * defl[i]
    chain = Chain(tuple(pts), tuple(radii), tuple(l_in), tuple(l_out))
    lay = chain.lay_out(reverse_tangent_min=0, broken_back_tangent_min=0)
    truth: list[TrueCurve] = []
    for i, bend in enumerate(lay.bends):
        g = bend.geometry
        shape = "spiralled" if l_in[i] > 0 or l_out[i] > 0 else "simple"
        curve = TrueCurve(float(g.ts), float(g.st), radii[i], senses[i], shape)
        if joins[i] == "compound":
            prev = truth.pop()
            r = min(prev.radius, curve.radius)
            curve = TrueCurve(prev.begin, curve.end, r, senses[i], "compound")
        truth.append(curve)
    return chain_elements(chain), truth


def overlap(a0, a1, b0, b1) -> float:
    return max(0.0, min(a1, b1) - max(a0, b0))


def score(truth, found, s_true, s_line):
    """Per true curve: (length, covered, radius error or nan, shape found right); count of
    false curves."""
    mapped = []
    for c in found:
        b, e = np.interp([c.begin, c.end], s_line, s_true)
        sense = 1 if c.direction == "right" else -1
        mapped.append((float(b), float(e), sense, c.radius, c.shape))
    rows = []
    for t in truth:
        length = t.end - t.begin
        covered = sum(overlap(t.begin, t.end, m[0], m[1]) for m in mapped if m[2] == t.sense)
        best = max(mapped, key=lambda m: overlap(t.begin, t.end, m[0], m[1]), default=None)
        err = math.nan
        shape_ok = False
        if best is not None and overlap(t.begin, t.end, best[0], best[1]) > 0:
            err = abs(best[3] - t.radius) / t.radius
            shape_ok = best[4] == t.kind
        rows.append((length, min(covered, length), err, shape_ok))
    false = 0
    for b, e, s, *_ in mapped:
        on = sum(overlap(t.begin, t.end, b, e) for t in truth if t.sense == s)
        if on < 0.5 * (e - b):
            false += 1
    return rows, false


def run(alignments: int, seed: int) -> None:
    rng = np.random.default_rng(seed)
    cases = [generate(rng) for _ in range(alignments)]
    settings = FinderSettings()
    print(
        f"{alignments} alignments x 5 bends (seed {seed}); radius {RADIUS_RANGE[0]:g}-"
        f"{RADIUS_RANGE[1]:g} m, deflection {DEFLECTION_RANGE[0]:g}-{DEFLECTION_RANGE[1]:g} "
        f"deg, spirals {SPIRAL_RANGE[0]:g}-{SPIRAL_RANGE[1]:g} m; resampling "
        f"{settings.spacing:g} m"
    )
    head = (
        f"{'spacing':>7} {'noise':>5} {'curves':>6} {'found %':>7} {'R err med %':>11} "
        f"{'R err p95 %':>11} {'false':>5} {'missed':>6} {'shape %':>7} {'s/line':>6}"
    )
    print(head)
    print("-" * len(head))
    table = []
    for spacing in SPACINGS:
        for noise in NOISES:
            noise_rng = np.random.default_rng(seed + int(spacing * 100 + noise * 1000))
            rows, false, t0 = [], 0, time.perf_counter()
            for elements, truth in cases:
                s, e, n = points_along(elements, spacing)
                if noise:
                    e = e + noise_rng.normal(0, noise, e.size)
                    n = n + noise_rng.normal(0, noise, n.size)
                line = np.concatenate(([0.0], np.cumsum(np.hypot(np.diff(e), np.diff(n)))))
                result = find_curves(e, n, settings)
                r, f = score(truth, result.curves, s, line)
                rows += r
                false += f
            dt = (time.perf_counter() - t0) / len(cases)
            lengths = np.array([r[0] for r in rows])
            covered = np.array([r[1] for r in rows])
            errs = np.array([r[2] for r in rows])
            missed = int(np.sum(covered < 0.5 * lengths))
            shapes = 100 * np.mean([r[3] for r in rows])
            ok = errs[np.isfinite(errs)] * 100
            share = 100 * covered.sum() / lengths.sum()
            table.append((noise, share, float(np.median(ok))))
            print(
                f"{spacing:7g} {noise:5g} {len(rows):6d} {share:7.1f} "
                f"{np.median(ok):11.2f} {np.percentile(ok, 95):11.2f} {false:5d} {missed:6d} "
                f"{shapes:7.1f} {dt:6.2f}"
            )
    print(
        "curves: true curves (a compound pair of bends counts once); s/line: seconds per "
        "alignment (about 2 to 7 km)"
    )
    shares = [share for _, share, _ in table]
    clean = [med for noise, _, med in table if noise == 0]
    noisy = [med for noise, _, med in table if noise == max(NOISES)]
    for goal, ok in (
        (f"curve length found >= 95 % in every row (least {min(shares):.1f} %)", min(shares) >= 95),
        (f"median radius error < 2 % without noise (worst {max(clean):.2f} %)", max(clean) < 2),
        (
            f"median radius error < 5 % with {max(NOISES):g} m noise (worst {max(noisy):.2f} %)",
            max(noisy) < 5,
        ),
    ):
        print(f"{'met' if ok else 'NOT MET':>7}: {goal}")


def calibrate() -> None:
    """Curvature noise on straight noisy lines (core/curve_regions.py's constants)."""
    from scipy.ndimage import gaussian_filter1d

    from curvetui.core.centreline import prepare_centreline
    from curvetui.core.curve_regions import NOISE_KAPPA, NOISE_POWER

    rng = np.random.default_rng(1)
    print(f"{'noise':>5} {'vertex':>6} {'W m':>4} {'s_kappa':>9} {'model':>9}")
    for noise in (0.1, 0.25, 0.5):
        for spacing in (1.0, 3.0, 5.0):
            s = np.arange(0.0, 4000.0, spacing)
            x = s + rng.normal(0, noise, s.size)
            y = rng.normal(0, noise, s.size)
            line = prepare_centreline(x, y, 1.0)
            for width in (10.0, 20.0, 40.0):
                k = gaussian_filter1d(line.curvature, width / line.step)[300:-300]
                model = NOISE_KAPPA * line.noise / width**NOISE_POWER
                print(f"{noise:5g} {spacing:6g} {width:4g} {k.std():9.2e} {model:9.2e}")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--alignments", type=int, default=40)
    ap.add_argument("--seed", type=int, default=16)
    ap.add_argument("--calibrate", action="store_true")
    args = ap.parse_args()
    if args.calibrate:
        calibrate()
    else:
        run(args.alignments, args.seed)


if __name__ == "__main__":
    main()
