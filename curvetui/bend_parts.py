"""The parts of a bend's record beyond the basic check: geometry, transition and sight.

Builders take SI numbers (already validated) and return JSON-ready dicts in the user's
units; the command line, batch mode, the terminal app and the worksheet all use them.
"""

from __future__ import annotations

import math

from curvetui.core.units import UnitSystem
from curvetui.inputs import InputError
from curvetui.results import fixed, rounded


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
    from curvetui.core import transitions as tr

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
    if flags & tr.FAIL_NO_SPIRAL_LENGTH:
        out["messages"].append(
            "FAIL no spiral length satisfies both the minimum and the lateral-shift maximum"
        )
    if flags & tr.WARN_GRADIENT_INTERPOLATED:
        out["messages"].append("NOTE relative gradient interpolated between table rows")
    if flags & (tr.WARN_SPEED_BELOW_TABLE | tr.WARN_SPEED_ABOVE_TABLE):
        out["messages"].append("WARNING relative gradient extrapolated beyond the table")
    if flags & tr.NOTE_NO_SUPERELEVATION:
        out["messages"].append("NOTE no superelevation: no runoff")
    return out


def rail_transition_json(limits, cant, deficiency, speed, units) -> dict:
    """The `transition` object of a rail check."""
    from curvetui.core import transitions as tr

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
    for bit, name in (
        (tr.WARN_CANT_GRADIENT_NOT_EVALUATED, "cant gradient"),
        (tr.WARN_CANT_RATE_NOT_EVALUATED, "rate of change of cant"),
        (tr.WARN_DEFICIENCY_RATE_NOT_EVALUATED, "rate of change of cant deficiency"),
    ):
        if flags & bit:
            out["messages"].append(f"WARNING {name}: the limits set no value, not evaluated")
    if flags & tr.FAIL_NONE_EVALUATED:
        # The limits file sets no transition limits (49 CFR 213 does not): say so, loudly,
        # but an unknown is not a failed check of the curve.
        out["status"] = "not evaluated"
        out["messages"].append(
            "WARNING no transition criterion could be evaluated: the limits "
            "file sets no cant gradient or rates; size the transition by the "
            "authority's rules"
        )
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


def check_spiral_lengths(transition: dict, geometry: dict, units: UnitSystem) -> None:
    """Fail a transition whose given spiral is shorter than the governing minimum or longer
    than the lateral-shift maximum (a road check)."""
    lo, hi = transition["spiral_length_min"], transition["spiral_length_max"]
    for name, ls in (("spiral in", geometry["ls_in"]), ("spiral out", geometry["ls_out"])):
        if ls <= 0:
            continue
        given = units.length_from_si(ls)
        if lo is not None and given < lo - 1e-9:
            transition["status"] = "fail"
            transition["messages"].append(
                f"FAIL {name} {given:g} {units.length_label} is shorter than the minimum "
                f"{lo:.1f} {units.length_label} ({transition['governing']} governs)"
            )
        if hi is not None and given > hi + 1e-9:
            transition["status"] = "fail"
            transition["messages"].append(
                f"FAIL {name} {given:g} {units.length_label} is longer than the lateral-shift "
                f"maximum {hi:.1f} {units.length_label}"
            )
