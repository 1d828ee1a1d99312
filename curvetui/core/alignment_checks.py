"""Checks between consecutive bends of a laid-out alignment (``curvetui.core.alignment``).

Each pair of neighbouring bends, with the tangent ``t`` [m] left between them (ST of the
first to TS or PC of the second; negative when they overlap):

- overlap: ``t < 0`` (the first bend's ST after the second's TS; by more than
  ``COMPOUND_TOLERANCE``, below which the tangent counts as none) -> FAIL. A start or end
  point inside the first or last bend fails the same way.
- reverse bends (turning opposite ways): the tangent must hold the runoff each bend places
  on it, ``t >= share_out(a) + share_in(b)``; a bend without spirals places
  ``runoff_on_tangent x L_r`` there, a spiralled bend 0 (its runoff is in the spiral).
  Source: *Highway Engineering Handbook*, "Superelevation Position", and Rosenow (MnDOT
  2015) citing AASHTO, 60-90 % of the runoff on the tangent; the rule for the pair is
  derived from that placement (REFERENCES.md, "Transitions"). The runout (tangent runout)
  is not added: between reverse bends the cross slope turns from one side's
  superelevation through level straight to the other's, never back to normal crown, so
  no runout is needed there (derived from the same placement). -> WARNING.
- broken-back (same way, ``0 < t``): the tangent should be at least 15 V feet, V in mph
  (TxDOT Roadway Design Manual, read; REFERENCES.md). In SI: 15 ft/mph =
  15 x 0.3048 m / 0.44704 m/s = 10.227 s, so ``t_min = 10.227 s x V [m/s]``, which is
  2.841 m per km/h (derived). V is the higher of the two design speeds. -> WARNING.
- compound (same way, no tangent: ``|t| <= COMPOUND_TOLERANCE``): the larger radius should
  be at most 1.5 times the smaller (TxDOT Roadway Design Manual, read). -> WARNING.

Road bends only for the last three (they are road design rules); overlap for every kind.
"""

from __future__ import annotations

from dataclasses import dataclass

from curvetui.core.alignment import Alignment

FAIL = "fail"
WARNING = "warning"
OVERLAP = "overlap"
REVERSE_RUNOFF = "reverse_runoff"
BROKEN_BACK = "broken_back"
COMPOUND_RATIO = "compound_ratio"

# TxDOT Roadway Design Manual: broken-back tangent >= 15 V (ft, mph); 15 ft per mph in s
BROKEN_BACK_SECONDS = 15 * 0.3048 / 0.44704  # 10.227 s (exact conversion factors)
COMPOUND_RATIO_MAX = 1.5  # TxDOT Roadway Design Manual: larger / smaller radius
# A tangent this short (either sign) between two bends counts as none: a compound curve
# when they turn the same way; coordinates rounded to the millimetre leave such residues
# (numerical, no source)
COMPOUND_TOLERANCE = 0.001  # [m]


@dataclass(frozen=True)
class BendFacts:
    """What the checks need of one evaluated bend, SI: kind ('road'/'rail'), design speed
    [m/s], radius [m], runoff [m] placed on the tangent before and after the bend."""

    name: str
    kind: str
    speed: float
    radius: float
    runoff_tangent_in: float = 0.0
    runoff_tangent_out: float = 0.0


@dataclass(frozen=True)
class Verdict:
    """One finding between bends ``first`` and ``second`` (0-based; -1 = start or end point).
    ``value`` is what was found, ``limit`` what the rule asks (m, or a ratio)."""

    severity: str
    code: str
    first: int
    second: int
    value: float
    limit: float
    text: str


def broken_back_minimum(speed: float) -> float:
    """TxDOT's least tangent between broken-back bends [m] for a design speed [m/s]."""
    return BROKEN_BACK_SECONDS * speed


def check_consecutive(
    alignment: Alignment, facts: list[BendFacts], unit: tuple[str, float] = ("m", 1.0)
) -> list[Verdict]:
    """Every verdict between consecutive bends; ``facts`` in the alignment's order.
    ``unit`` (label, metres per unit) is only for the texts: lengths shown in it."""
    label, per = unit

    def show(x: float) -> str:
        return f"{x / per:.2f} {label}"

    out: list[Verdict] = []
    bends, tangents = alignment.bends, alignment.tangents
    n = len(bends)
    if tangents[0] < 0:
        out.append(
            Verdict(
                FAIL,
                OVERLAP,
                -1,
                0,
                tangents[0],
                0.0,
                f"FAIL {facts[0].name}: its tangent reaches back past the start point by "
                f"{show(-tangents[0])}",
            )
        )
    for i in range(n - 1):
        a, b, t = facts[i], facts[i + 1], tangents[i + 1]
        pair = f"{a.name} to {b.name}"
        if t < -COMPOUND_TOLERANCE:
            out.append(
                Verdict(
                    FAIL,
                    OVERLAP,
                    i,
                    i + 1,
                    t,
                    0.0,
                    f"FAIL {pair}: the bends overlap by {show(-t)} ({a.name}'s end is past "
                    f"{b.name}'s start)",
                )
            )
            continue
        if a.kind != "road" or b.kind != "road":
            continue
        if bends[i].direction != bends[i + 1].direction:
            need = a.runoff_tangent_out + b.runoff_tangent_in
            if t < need:
                out.append(
                    Verdict(
                        WARNING,
                        REVERSE_RUNOFF,
                        i,
                        i + 1,
                        t,
                        need,
                        f"WARNING {pair}: reverse bends with {show(t)} of tangent, less than "
                        f"the {show(need)} of runoff they place on it ({a.name} "
                        f"{show(a.runoff_tangent_out)}, {b.name} {show(b.runoff_tangent_in)})",
                    )
                )
        elif abs(t) <= COMPOUND_TOLERANCE:
            big, small = max(a.radius, b.radius), min(a.radius, b.radius)
            ratio = big / small
            if ratio > COMPOUND_RATIO_MAX:
                out.append(
                    Verdict(
                        WARNING,
                        COMPOUND_RATIO,
                        i,
                        i + 1,
                        ratio,
                        COMPOUND_RATIO_MAX,
                        f"WARNING {pair}: compound curve with radii {show(a.radius)} and "
                        f"{show(b.radius)}, ratio {ratio:.3f} above {COMPOUND_RATIO_MAX:g} "
                        "(TxDOT Roadway Design Manual)",
                    )
                )
        else:
            need = broken_back_minimum(max(a.speed, b.speed))
            if t < need:
                out.append(
                    Verdict(
                        WARNING,
                        BROKEN_BACK,
                        i,
                        i + 1,
                        t,
                        need,
                        f"WARNING {pair}: broken-back bends (both turn the same way) with "
                        f"{show(t)} of tangent, less than {show(need)} (15 V ft, V in mph: "
                        "TxDOT Roadway Design Manual); consider one bend or a compound curve",
                    )
                )
    if n and tangents[-1] < 0:
        out.append(
            Verdict(
                FAIL,
                OVERLAP,
                n - 1,
                -1,
                tangents[-1],
                0.0,
                f"FAIL {facts[-1].name}: its tangent runs past the end point by "
                f"{show(-tangents[-1])}",
            )
        )
    return out
