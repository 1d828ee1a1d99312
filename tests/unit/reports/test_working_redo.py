"""A checker can redo the transition lines of the working on a calculator: for 200 random
road bends, each line's substituted expression, evaluated here, gives the answer shown.

The expressions are evaluated independently of the engine (Python arithmetic on the printed
numbers); the tolerance allows for the four significant figures the lines print. The
reference is therefore the printed formula itself: L = v^3 / (C R) and L = sqrt(24 p R)
(Green Book 2018 sec. 3.3.8, from memory), L_r = (w n1) e b_w / Delta and L_t = e_NC L_r / e
(Green Book 2018, from memory; b_w read via a design sheet citing AASHTO, see
../shared/REFERENCES.md). Random bends span Table 3-7's speeds, radii from an e 8 % /
f 0.10 minimum (common practice choice of range, no source) to five times it.
"""

from __future__ import annotations

import math
import re

import numpy as np
import pytest

from curvetui.bend.service import check_bend
from curvetui.core.units import METRIC, US
from curvetui.reports.working import road_working
from curvetui.storage.tables import rail_limits, road_table

REDO = (
    "Spiral length, comfort",
    "Spiral length, least lateral shift",
    "Superelevation runoff",
    "Tangent runout",
)


def evaluate(expression: str) -> float:
    """The printed expression as arithmetic: 'x' multiplies, '^' raises, sqrt(...)."""
    text = expression.replace("^", "**").replace(" x ", " * ")
    assert re.fullmatch(r"[0-9eE.+\-*/() sqrt]+", text), text
    return float(eval(text, {"__builtins__": {}}, {"sqrt": math.sqrt}))  # noqa: S307


def bends(n: int, seed: int):
    rng = np.random.default_rng(seed)
    for _ in range(n):
        units = METRIC if rng.random() < 0.5 else US
        speeds = (20, 130) if units is METRIC else (15, 80)
        speed = float(rng.integers(*speeds))
        k = 127 if units is METRIC else 15
        r_min = speed**2 / (k * (0.08 + 0.10))
        radius = round(float(rng.uniform(r_min, 5 * r_min)), 1)
        yield (
            units,
            {
                "speed": speed,
                "radius": radius,
                "emax": 8,
                "lanes_rotated": float(rng.choice([1, 1.5, 2])),
            },
        )


@pytest.mark.parametrize("seed", [1, 2])
def test_transition_lines_redo_to_their_answers(seed):
    checked = 0
    for units, inputs in bends(100, seed):
        table = road_table(None, units.name)
        rec = check_bend("road", inputs, units, table, rail_limits(None, units.name))
        assert rec.status != "error", rec.messages
        for step in road_working(rec.to_json(), table, units):
            if step.label not in REDO:
                continue
            answer = float(step.result.split()[0])
            assert evaluate(step.substituted) == pytest.approx(answer, rel=2e-3, abs=0.01), (
                step.label,
                step.substituted,
                step.result,
            )
            checked += 1
    assert checked >= 300  # at least the two spiral lengths and the runoff of each bend
