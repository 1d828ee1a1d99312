"""The parts of a bend's record beyond the basic check: geometry, transition and sight.

Builders take SI numbers (already validated) and return JSON-ready dicts in the user's
units; the command line, batch mode, the terminal app and the worksheet all use them.
"""

from __future__ import annotations

import math

from curvetui.core import transitions as tr
from curvetui.core.units import UnitSystem
from curvetui.inputs import InputError
from curvetui.results import fixed, rounded

# (flag bits, text) of the transition objects, in the order they are listed
ROAD_TRANSITION_NOTES: tuple[tuple[int, str], ...] = (
    (
        tr.FAIL_NO_SPIRAL_LENGTH,
        "FAIL no spiral length satisfies both the minimum and the lateral-shift maximum",
    ),
    (tr.WARN_GRADIENT_INTERPOLATED, "NOTE relative gradient interpolated between table rows"),
    (
        tr.WARN_SPEED_BELOW_TABLE | tr.WARN_SPEED_ABOVE_TABLE,
        "WARNING relative gradient extrapolated beyond the table",
    ),
    (tr.NOTE_NO_SUPERELEVATION, "NOTE no superelevation: no runoff"),
)
RAIL_TRANSITION_NOTES: tuple[tuple[int, str], ...] = (
    *(
        (bit, f"WARNING {name}: the limits set no value, not evaluated")
        for bit, name in (
            (tr.WARN_CANT_GRADIENT_NOT_EVALUATED, "cant gradient"),
            (tr.WARN_CANT_RATE_NOT_EVALUATED, "rate of change of cant"),
            (tr.WARN_DEFICIENCY_RATE_NOT_EVALUATED, "rate of change of cant deficiency"),
        )
    ),
    (
        tr.FAIL_NONE_EVALUATED,
        "WARNING no transition criterion could be evaluated: the limits "
        "file sets no cant gradient or rates; size the transition by the "
        "authority's rules",
    ),
)


def geometry_json(
    radius: float, geo: dict, units: UnitSystem, spiral_name: str = "--spiral"
) -> dict:
    """The `geometry` object: simple-curve keys, or spiral keys when a spiral is given."""
    from curvetui.core.circular import circular_curve
    from curvetui.core.spiral import require_spirals_fit, spiral_curve

    def length(x):
        return fixed(units.length_from_si(float(x)))

    if geo["ls_in"] == 0 and geo["ls_out"] == 0:
        c = circular_curve(radius, geo["deflection"], geo["pi_station"])
        return {
            "type": "circular",
            "deflection": rounded(math.degrees(geo["deflection"]), 9),
            "tangent": length(c.tangent),
            "length": length(c.length),
            "external": length(c.external),
            "middle_ordinate": length(c.middle_ordinate),
            "long_chord": length(c.long_chord),
            "pi": length(c.pi),
            "pc": length(c.pc),
            "pt": length(c.pt),
        }
    s = spiral_curve(radius, geo["deflection"], geo["ls_in"], geo["ls_out"], geo["pi_station"])
    try:
        require_spirals_fit(s)
    except ValueError as exc:
        raise InputError(f"{spiral_name}: {exc}") from None
    out = {
        "type": "spiral-curve-spiral",
        "deflection": rounded(math.degrees(geo["deflection"]), 9),
        "spiral_angle": rounded(math.degrees(float(s.theta_in)), 9),
        "xs": length(s.xs_in),
        "ys": length(s.ys_in),
        "p": length(s.p_in),
        "k": length(s.k_in),
        "total_tangent": length(s.tangent_in),
        "external": length(s.external),
        "circular_length": length(s.circular_length),
        "total_length": length(s.total_length),
        "pi": length(s.pi),
        "ts": length(s.ts),
        "sc": length(s.sc),
        "cs": length(s.cs),
        "st": length(s.st),
    }
    if geo["ls_out"] != geo["ls_in"]:
        out.update(
            spiral_angle_out=rounded(math.degrees(float(s.theta_out)), 9),
            xs_out=length(s.xs_out),
            ys_out=length(s.ys_out),
            p_out=length(s.p_out),
            k_out=length(s.k_out),
            total_tangent_out=length(s.tangent_out),
        )
    return out


def road_transition_json(table, speed, radius, superelevation, width, units) -> dict:
    """The `transition` object of a road check: each criterion's length and the governing one."""
    t = tr.road_transition(table, speed, radius, superelevation, lane_width=width)

    def length(x):
        return rounded(units.length_from_si(float(x)))

    out = {
        "spiral_length_min": length(t.spiral_length_min),
        "spiral_length_max": length(t.spiral_length_max),
        "governing": str(t.governing_name),
        "length_comfort": length(t.length_comfort),
        "length_shift_min": length(t.length_shift_min),
        "length_shift_max": length(t.length_shift_max),
        "relative_gradient": rounded(100 * float(t.relative_gradient)),
        "runoff": length(t.runoff),
        "runout": length(t.runout),
        "status": "fail" if bool(t.failed) else "pass",
        "messages": [],
    }
    flags = int(t.flags)
    out["messages"] = [text for bit, text in ROAD_TRANSITION_NOTES if flags & bit]
    return out


def rail_transition_json(limits, cant, deficiency, speed, units) -> dict:
    """The `transition` object of a rail check."""
    t = tr.rail_transition_for(limits, cant, deficiency, speed)

    def length(x):
        return rounded(units.length_from_si(float(x)))

    out = {
        "length": length(t.length),
        "governing": str(t.governing_name),
        "length_cant_gradient": length(t.length_cant_gradient),
        "length_cant_rate": length(t.length_cant_rate),
        "length_deficiency_rate": length(t.length_deficiency_rate),
        "status": "fail" if bool(t.failed) else "pass",
        "messages": [],
    }
    flags = int(t.flags)
    out["messages"] = [text for bit, text in RAIL_TRANSITION_NOTES if flags & bit]
    if flags & tr.FAIL_NONE_EVALUATED:
        # The limits file sets no transition limits (49 CFR 213 does not): say so, loudly,
        # but an unknown is not a failed check of the curve.
        out["status"] = "not evaluated"
    return out


def sight_json(speed, radius, sight: dict, curve_length, width, units) -> dict:
    """The `sight` object: SSD, required offset on the inside lane's centre, pass/fail and the
    speed or offset that would pass."""
    from curvetui.core import sight as sd

    r_lane = radius - width / 2.0
    c = sd.sight_check(
        speed,
        r_lane,
        sight["offset"],
        curve_length=curve_length,
        units=units.name,
        grade=sight["grade"],
    )

    def length(x):
        return rounded(units.length_from_si(float(x)))

    passed = bool(c.status)
    out = {
        "stopping_sight_distance": length(c.stopping_sight_distance),
        "sightline_offset_required": length(c.sightline_offset_required),
        "offset_available": length(c.offset_available),
        "sight_distance_available": length(c.sight_distance_available),
        "sightline_radius": length(r_lane),
        "speed_that_passes": rounded(units.speed_from_si(float(c.speed_that_passes))),
        "offset_that_passes": length(c.offset_that_passes),
        "status": "pass" if passed else "fail",
        "messages": [],
    }
    flags = int(c.flags)
    if not passed:
        out["messages"].append(
            f"FAIL sightline offset {out['offset_available']:g} {units.length_label} is less "
            f"than the {out['sightline_offset_required']:.2f} {units.length_label} needed; "
            f"clear to that offset or design for {out['speed_that_passes']:.1f} "
            f"{units.speed_label}"
        )
    if flags & sd.FAIL_NO_STOP:
        out["messages"].append("FAIL the downgrade is too steep for the deceleration assumed")
    if flags & sd.WARN_BEYOND_FORMULA:
        out["messages"].append("WARNING the sight line wraps beyond the formula's range")
    if flags & sd.NOTE_SIGHT_LINE_ON_TANGENTS:
        out["messages"].append("NOTE the sight distance exceeds the curve: line runs onto tangents")
    if flags & sd.NOTE_CURVE_LENGTH_UNKNOWN:
        out["messages"].append(
            "NOTE no deflection given: curve assumed longer than the sight distance (conservative)"
        )
    out["messages"].append(
        f"NOTE sight line on the inside lane centre, radius R - "
        f"{units.length_from_si(width) / 2:g} {units.length_label}"
    )
    return out


def road_spiral_messages(
    name: str, given: float, lo, hi, governing: str, units: UnitSystem
) -> list[str]:
    """FAIL lines for a road spiral of ``given`` length (user units) outside [lo, hi]."""
    out = []
    label = units.length_label
    if lo is not None and given < lo - 1e-9:
        out.append(
            f"FAIL {name} {given:g} {label} is shorter than the minimum "
            f"{lo:.1f} {label} ({governing} governs)"
        )
    if hi is not None and given > hi + 1e-9:
        out.append(
            f"FAIL {name} {given:g} {label} is longer than the lateral-shift "
            f"maximum {hi:.1f} {label}"
        )
    return out


def rail_spiral_message(name: str, given: float, need: float, governing: str, label: str) -> str:
    """The FAIL line for a rail transition of ``given`` length shorter than ``need``."""
    return (
        f"FAIL {name} {given:g} {label} is shorter than the {need:.1f} {label} the "
        f"{governing} needs"
    )


def check_spiral_lengths(transition: dict, geometry: dict, units: UnitSystem) -> None:
    """Fail a transition whose given spiral is shorter than the governing minimum or longer
    than the lateral-shift maximum (a road check)."""
    lo, hi = transition["spiral_length_min"], transition["spiral_length_max"]
    for name, ls in (("spiral in", geometry["ls_in"]), ("spiral out", geometry["ls_out"])):
        if ls <= 0:
            continue
        lines = road_spiral_messages(
            name, units.length_from_si(ls), lo, hi, transition["governing"], units
        )
        if lines:
            transition["status"] = "fail"
            transition["messages"] += lines


def check_rail_spiral_lengths(transition: dict, geometry: dict, units: UnitSystem) -> None:
    """Fail a rail transition whose given spiral is shorter than the governing length."""
    need = transition["length"]
    for name, ls in (("spiral in", geometry["ls_in"]), ("spiral out", geometry["ls_out"])):
        given = units.length_from_si(ls)
        if ls > 0 and need is not None and given < need - 1e-9:
            transition["status"] = "fail"
            transition["messages"].append(
                rail_spiral_message(name, given, need, transition["governing"], units.length_label)
            )
