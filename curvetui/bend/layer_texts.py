"""Texts of the bend layer's own messages (spiral lengths, sight, gauge, traffic, the
spiral that is not needed): ``build(evaluation, row, reference, units) -> str``, in the
user's units. The registry that gives each its severity and code is
``curvetui.bend.messages.RULES``.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from curvetui.bend.display import shown
from curvetui.bend.evaluate import Evaluation


def spiral_short(which: str, key: str) -> Callable:
    def build(ev: Evaluation, i, ref, units) -> str:
        given = float(ev.spiral_length(key, np.array([i]))[0]) / units.length
        label = units.length_label
        gov = ev.texts["transition.governing"][i]
        if ev.parsed.is_rail[i]:
            need = float(ev.values["transition.length"][i])
            return (
                f"{which} {given:g} {label} is shorter than the {need:.1f} {label} the {gov} needs"
            )
        lo = float(ev.values["transition.spiral_length_min"][i])
        return (
            f"{which} {given:g} {label} is shorter than the minimum {lo:.1f} {label} "
            f"({gov} governs)"
        )

    return build


def spiral_long(which: str, key: str) -> Callable:
    def build(ev: Evaluation, i, ref, units) -> str:
        given = float(ev.spiral_length(key, np.array([i]))[0]) / units.length
        hi = float(ev.values["transition.spiral_length_max"][i])
        label = units.length_label
        return (
            f"{which} {given:g} {label} is longer than the lateral-shift maximum {hi:.1f} {label}"
        )

    return build


def sight_offset(ev: Evaluation, i, ref, units) -> str:
    v = ev.values
    lab = units.length_label
    return (
        f"sightline offset {float(v['sight.offset_available'][i]):g} {lab} is less than the "
        f"{float(v['sight.sightline_offset_required'][i]):.2f} {lab} needed; clear to that "
        f"offset or design for "
        f"{shown('safe_speed', float(v['sight.speed_that_passes'][i]), units.name)} "
        f"{units.speed_label}"
    )


def sight_lane(ev: Evaluation, i, ref, units) -> str:
    half = units.length_from_si(float(ev.parts["lane_width"][i])) / 2
    return f"sight line on the inside lane centre, radius R - {half:g} {units.length_label}"


def gauge_text(ev: Evaluation, i, ref, units) -> str:
    lim = ev.ctx.limits
    return (
        f"the limits {lim.name} are set for a {lim.gauge * 1000:.0f} mm gauge, this curve's is "
        f"{float(ev.parsed.si['gauge'][i]):g} mm: check them against the rules for that gauge"
    )


def spiral_not_needed(ev: Evaluation, i, ref, units) -> str:
    lab = units.length_label
    r_max = float(ev.values["transition.spiral_radius_max"][i])
    return (
        f"a spiral is not needed here (R {float(ev.values['radius'][i]):g} {lab} is above the "
        f"table's {r_max:.0f} {lab} at {float(ev.values['speed'][i]):g} {units.speed_label})"
    )


def traffic_text(ev: Evaluation, i, ref, units) -> str:
    return (
        f"the limits {ev.ctx.limits.name} set no top speed by traffic: the traffic given is "
        "not used"
    )
