"""The transition of a road bend: spiral lengths when a spiral is given, runoff placement
when there is none (part of the evaluation step, see curvetui.bend.evaluate).

Two cases (sources in curvetui.core.transitions):

- *with a spiral*: the runoff is run over the spiral; the spiral must reach the comfort,
  lateral-shift and runoff minimums and stay within the lateral-shift maximum, and a bend
  where no length does so fails;
- *without a spiral* (tangent to curve): the comfort rate and the lateral-shift limits
  describe a clothoid and do not apply; the runoff and runout are placed with a share of
  the runoff on the tangent (default two-thirds), and the bend is warned, never failed,
  when its curve is too short to reach full superelevation. Where no spiral length would
  fit, a note says a spiral is not suitable.

Either way, a radius above the table's largest radius for a spiral at the design speed
(``spiral_radius_max``; the Green Book 2018 values are from memory) gets a note that a
spiral is not needed; never a failure.

US customary bends use C = 4 ft/s^3 and p limits 0.66 / 3.3 ft (from memory, unconfirmed);
metric C = 1.2 m/s^3 and 0.20 / 1.0 m (Green Book 2018 sec. 3.3.8, from memory).
"""

from __future__ import annotations

import numpy as np

from curvetui.core import superelevation_diagram as sed
from curvetui.core import transitions as tr
from curvetui.core.rotation import AXES
from curvetui.core.units import FOOT

# (C [m/s^3], p_min [m], p_max [m]) by unit system
SPIRAL_CONSTANTS = {"metric": (1.2, 0.20, 1.0), "us": (4.0 * FOOT, 0.66 * FOOT, 3.3 * FOOT)}
DEFAULT_SHARE = 2.0 / 3.0
STATION_KEYS = (
    "runout_start",
    "level_crown_in",
    "full_superelevation_in",
    "full_superelevation_out",
    "level_crown_out",
    "runout_end",
)


def road_transition(ev, rows: np.ndarray, v, r, e, width, spiral_flags: dict) -> None:
    """Evaluate the transition of the road rows ``rows`` into ``ev`` (values, texts, the
    'transition' check and the bend flags named in ``spiral_flags``)."""
    units, table, si, present = ev.ctx.units, ev.ctx.table, ev.parsed.si, ev.parsed.present
    c, p_min, p_max = SPIRAL_CONSTANTS[units.name]
    n1 = np.where(present["lanes_rotated"][rows], si["lanes_rotated"][rows], 1.0)
    t = tr.road_transition(
        table, v, r, e, lane_width=width, lanes_rotated=n1, c=c, p_min=p_min, p_max=p_max
    )
    ev.parts["road_transition"], ev.part_rows["road_transition"] = t, rows
    for key in (
        "spiral_length_min",
        "spiral_length_max",
        "length_comfort",
        "length_shift_min",
        "length_shift_max",
        "runoff",
        "runout",
    ):
        ev.values[f"transition.{key}"][rows] = units.length_from_si(getattr(t, key))
    ev.values["transition.relative_gradient"][rows] = 100 * t.relative_gradient
    r_spiral = table.spiral_radius_max_si(v)  # a note above it: a spiral is not needed
    ev.values["transition.spiral_radius_max"][rows] = units.length_from_si(r_spiral)
    with np.errstate(invalid="ignore"):
        not_needed = r > r_spiral * (1 + 1e-12)
    ev.bend_flags[rows[not_needed]] |= spiral_flags["not_needed"]
    v = ev.values
    v["transition.comfort_rate"][rows] = units.length_from_si(c)
    v["transition.shift_min"][rows] = units.length_from_si(p_min)
    v["transition.shift_max"][rows] = units.length_from_si(p_max)
    v["transition.lane_width"][rows] = units.length_from_si(width)
    v["transition.lanes_rotated"][rows] = n1
    v["transition.width_factor"][rows] = tr.runoff_width_factor(n1)
    v["transition.normal_crown"][rows] = 100 * table.normal_crown
    ev.texts["transition.governing"][rows] = np.asarray(tr.ROAD_GOVERNING, object)[t.governing]

    spiralled = (ev.spiral_length("spiral_in", rows) > 0) | (
        ev.spiral_length("spiral_out", rows) > 0
    )
    no_fit = np.asarray(t.failed)
    ev.bend_flags[rows] |= np.where(no_fit & spiralled, spiral_flags["no_fit"], 0)
    ev.bend_flags[rows] |= np.where(no_fit & ~spiralled, spiral_flags["not_suitable"], 0)
    failed = (no_fit & spiralled) | _spiral_lengths(ev, rows, t, spiral_flags)
    _placement(ev, rows[~spiralled], spiral_flags["too_short"])
    _reverse_crown(ev, rows, e)
    given = present["rotation_axis"][rows]
    axis = np.where(given, np.nan_to_num(si["rotation_axis"][rows]), 0).astype(int)
    ev.texts["transition.rotation_axis"][rows] = np.asarray(AXES, object)[axis]
    ev.checks["transition"][rows] = failed.astype(np.int8)
    ev.texts["transition.status"][rows] = np.where(failed, "fail", "pass")


def _spiral_lengths(ev, rows, t, flags: dict) -> np.ndarray:
    """Flag given spirals outside [minimum, lateral-shift maximum], on unrounded lengths."""
    failed = np.zeros(len(rows), bool)
    lo, hi = t.spiral_length_min, t.spiral_length_max
    for key in ("spiral_in", "spiral_out"):
        ls = ev.spiral_length(key, rows)
        with np.errstate(invalid="ignore"):
            short = (ls > 0) & (ls < lo * (1 - 1e-12))
            long = (ls > 0) & (ls > hi * (1 + 1e-12))
        ev.bend_flags[rows] |= np.where(short, flags[f"{key}_short"], 0)
        ev.bend_flags[rows] |= np.where(long, flags[f"{key}_long"], 0)
        failed |= short | long
    return failed


def _placement(ev, rows: np.ndarray, too_short_flag: int) -> None:
    """Runoff and runout stations of simple curves (rows with a circular geometry)."""
    si, present = ev.parsed.si, ev.parsed.present
    circular = rows[ev.texts["geometry.type"][rows] == "circular"]
    share = np.where(
        present["runoff_on_tangent"][circular], si["runoff_on_tangent"][circular], DEFAULT_SHARE
    )
    ev.values["transition.runoff_on_tangent"][rows] = np.where(
        present["runoff_on_tangent"][rows], si["runoff_on_tangent"][rows], DEFAULT_SHARE
    )
    if not len(circular):
        return
    v = ev.values
    runout = np.nan_to_num(v["transition.runout"][circular], nan=0.0)
    st = tr.runoff_stations(
        v["geometry.pc"][circular],
        v["geometry.pt"][circular],
        v["transition.runoff"][circular],
        runout,
        share,
    )
    for key in STATION_KEYS:
        v[f"transition.{key}"][circular] = st[key]
    ev.bend_flags[circular] |= np.where(st["too_short"], too_short_flag, 0)


def _reverse_crown(ev, rows: np.ndarray, e: np.ndarray) -> None:
    """Reverse crown stations of simple curves (both halves at +e_NC), where reached:
    level crown +/- (e_NC / e) L_r (curvetui.core.superelevation_diagram)."""
    v = ev.values
    circular = ev.texts["geometry.type"][rows] == "circular"
    at = rows[circular]
    if not len(at):
        return
    e_nc = ev.ctx.table.normal_crown
    lr = v["transition.runoff"][at]
    lc_in, lc_out = v["transition.level_crown_in"][at], v["transition.level_crown_out"][at]
    k = sed.key_stations(lc_in, lc_out, lr, lr, e[circular], e_nc)
    with np.errstate(invalid="ignore"):
        reached = k["peak_slope"] >= e_nc * (1 - 1e-12)
    v["transition.reverse_crown_in"][at] = np.where(reached, k["reverse_crown_in"], np.nan)
    v["transition.reverse_crown_out"][at] = np.where(reached, k["reverse_crown_out"], np.nan)
