"""Road bends by the point-mass model: lateral acceleration, side friction, R_min,
design superelevation, safe speed, and a status with reasons.

Point-mass model (AASHTO Green Book, 7th ed., 2018, Eq. 3-8 and 3-10):

    e + f = V^2 / (127 R)   (V km/h, R m)        e + f = V^2 / (15 R)   (V mph, R ft)
    R_min = V^2 / (127 (e_max + f_max))          R_min = V^2 / (15 (e_max + f_max))

Here everything is in SI with the table's constant k [m/s^2] (see RoadTable.k_si):
f = v^2/(k R) - e, R_min = v^2 / (k (e_max + f_max)).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from curvetui.core import superelevation as se
from curvetui.core.road_table import ABOVE_TABLE, BELOW_TABLE, INTERPOLATED, RoadTable
from curvetui.core.units import G0

# Status flags, one bit each; FAIL_* make a bend fail, the others are warnings or notes.
FAIL_RADIUS = 1 << 0  # radius below R_min
FAIL_FRICTION = 1 << 1  # side friction demand above f_max
FAIL_SUPERELEVATION = 1 << 2  # superelevation given above e_max
WARN_SPEED_BELOW_TABLE = 1 << 3
WARN_SPEED_ABOVE_TABLE = 1 << 4
WARN_INTERPOLATED = 1 << 5  # design speed between table rows
WARN_EMAX_NOT_TABULATED = 1 << 6
NOTE_NORMAL_CROWN = 1 << 7
NOTE_REMOVE_CROWN = 1 << 8
NOTE_SAFE_SPEED_AT_LEAST = 1 << 9  # the bend carries the table's top speed: "at least"
WARN_SAFE_SPEED_BELOW_TABLE = 1 << 12  # even the table's lowest speed needs more than f_max
NOTE_FRICTION_GIVEN = 1 << 10
WARN_BELOW_DESIGN_E = 1 << 11  # superelevation given below the distribution's value
FAIL_MASK = FAIL_RADIUS | FAIL_FRICTION | FAIL_SUPERELEVATION


def lateral_acceleration(speed, radius):
    """Centripetal (lateral) acceleration a = v^2 / R [m/s^2]; speed [m/s], radius [m]."""
    return np.asarray(speed, dtype=float) ** 2 / np.asarray(radius, dtype=float)


def side_friction_demand(speed, radius, superelevation, k):
    """Side friction demanded by the point-mass model, f = v^2 / (k R) - e.

    k is the point-mass constant in SI (9.799 m/s^2 for the metric 127); superelevation
    as a fraction.
    """
    return np.asarray(speed, dtype=float) ** 2 / (k * np.asarray(radius, dtype=float)) - (
        superelevation
    )


def minimum_radius(speed, e_max, f_max, k):
    """R_min = v^2 / (k (e_max + f_max)) [m] (Green Book 2018 Eq. 3-10, in SI)."""
    return np.asarray(speed, dtype=float) ** 2 / (k * (np.asarray(e_max) + f_max))


def safe_speed(table: RoadTable, radius, superelevation, friction=None):
    """Highest speed [m/s] at which f = v^2/(k R) - e stays within f_max(v).

    f_max falls with speed and is piecewise linear between table rows, so on the segment
    where the crossing lies, v^2/(k R) - e = f_i + b (v - v_i) is a quadratic in v, solved
    exactly. The table is never extended: where the bend could be driven faster than the
    table's last row, the answer is that row's speed and ``beyond`` says "at least" (+1);
    where even the first row's speed needs more friction than f_max, the answer is NaN and
    ``beyond`` is -1 ("below the table"). With a fixed ``friction`` the answer is
    v = sqrt(k R (e + f)) and ``beyond`` is 0.

    Returns (speed [m/s], beyond [int array: -1, 0 or +1]).
    """
    r = np.asarray(radius, dtype=float)
    e = np.asarray(superelevation, dtype=float)
    k = table.k_si
    if friction is not None:
        total = np.maximum(e + np.asarray(friction, dtype=float), 0.0)
        v = np.sqrt(k * r * total)
        return v, np.zeros(np.shape(v), dtype=int)
    return speed_within_table(r, e, table.speeds_si, table.side_friction_max, k)


def speed_within_table(radius, superelevation, speeds, f_max, k: float):
    """``safe_speed`` on a table given as its rows: ``speeds`` [m/s] ascending, ``f_max``
    (non-increasing) and ``k`` in SI. Returns (speed [m/s], beyond [-1, 0 or +1])."""
    xs = np.asarray(speeds, dtype=float)
    fs = np.asarray(f_max, dtype=float)
    r_, e_ = np.broadcast_arrays(np.asarray(radius, float), np.asarray(superelevation, float))
    # g(v) = v^2/(kR) - e - f_max(v) rises with v: count rows where it is still negative.
    with np.errstate(divide="ignore", invalid="ignore"):
        g_rows = xs**2 / (k * r_[..., None]) - e_[..., None] - fs
    count = np.sum(g_rows < 0, axis=-1)
    seg = np.clip(count - 1, 0, len(xs) - 2)
    slope = (fs[seg + 1] - fs[seg]) / (xs[seg + 1] - xs[seg])
    a = 1.0 / (k * r_)
    c = e_ + fs[seg] - slope * xs[seg]  # a v^2 - slope v - c = 0
    disc = slope**2 + 4.0 * a * c
    with np.errstate(invalid="ignore"):
        v = (slope + np.sqrt(np.maximum(disc, 0.0))) / (2.0 * a)
    v = np.where((disc < 0) | (v < 0), 0.0, v)
    beyond = np.where(count == 0, -1, np.where(count == len(xs), 1, 0))
    v = np.where(beyond == 1, xs[-1], np.where(beyond == -1, np.nan, v))
    return v, beyond


@dataclass(frozen=True)
class RoadCheck:
    """Results of a road-bend check, SI units, arrays broadcast from the inputs."""

    speed: np.ndarray  # design speed [m/s]
    radius: np.ndarray  # [m]
    e_max: np.ndarray  # fraction
    lateral_acceleration: np.ndarray  # [m/s^2]
    lateral_acceleration_g: np.ndarray
    side_friction_max: np.ndarray
    side_friction_demand: np.ndarray
    min_radius: np.ndarray  # [m]
    min_radius_rounded: np.ndarray  # [m], rounded as the source table rounds
    superelevation: np.ndarray  # in use, fraction
    superelevation_design: np.ndarray  # from the distribution, fraction
    cross_section: np.ndarray  # superelevation.NORMAL_CROWN ... AT_EMAX
    safe_speed: np.ndarray  # [m/s]
    flags: np.ndarray  # bit set of FAIL_* / WARN_* / NOTE_*

    @property
    def failed(self) -> np.ndarray:
        return (self.flags & FAIL_MASK) != 0


def design_superelevation(table: RoadTable, speed, radius, e_max, f_max=None):
    """Design superelevation [fraction] for ``radius`` by the table's distribution, with
    the table's f_max unless ``f_max`` is given."""
    if f_max is None:
        f_max, _ = table.f_max(speed)
    if table.distribution == "linear":
        return se.linear_superelevation(radius, speed, e_max, f_max, table.k_si)
    if table.distribution == "aashto-method-2":
        return se.method2_superelevation(radius, speed, e_max, f_max, table.k_si)
    return se.method5_superelevation(
        radius, speed, table.running_speed_si(speed), e_max, f_max, table.k_si
    )


def design_section(table: RoadTable, speed, radius, e_design, e_max, f_max, at_emax):
    """The cross-section code of a design e (normal crown ... e_max), as the table's
    distribution decides it: Method 2 by the demand with the adverse crown against f_max,
    the others by the design e against the normal-crown limit."""
    if table.distribution == "aashto-method-2":
        demand = np.asarray(speed, dtype=float) ** 2 / (table.k_si * np.asarray(radius))
        return se.method2_cross_section(demand, f_max, e_design, table.normal_crown, at_emax)
    return se.cross_section(e_design, e_max, table.normal_crown, table.normal_crown_limit, at_emax)


def check_road(
    table: RoadTable,
    speed,
    radius,
    e_max=None,
    superelevation=None,
    friction=None,
) -> RoadCheck:
    """Check road bends against ``table``. Inputs in SI (m/s, m, fractions); any may be arrays.

    ``superelevation`` (NaN where absent) is the built value; without it the design value
    from the distribution is used. ``friction`` (NaN where absent) replaces f_max in the
    check only (R_min, the friction limit, the safe speed): the design superelevation keeps
    the table's distribution with the table's own f_max, so it stays the one its printed
    tables give.
    """
    v = np.asarray(speed, dtype=float)
    r = np.asarray(radius, dtype=float)
    emax = np.asarray(table.emax_default if e_max is None else e_max, dtype=float)
    e_given = np.asarray(np.nan if superelevation is None else superelevation, dtype=float)
    f_given = np.asarray(np.nan if friction is None else friction, dtype=float)
    v, r, emax, e_given, f_given = np.broadcast_arrays(v, r, emax, e_given, f_given)
    k = table.k_si

    f_table, kind = table.f_max(v)
    has_f = ~np.isnan(f_given)
    f_max = np.where(has_f, f_given, f_table)
    r_min = minimum_radius(v, emax, f_max, k)
    below_min = r < r_min * (1 - 1e-12)

    e_design = design_superelevation(table, v, r, emax, f_table)
    r_min_table = minimum_radius(v, emax, f_table, k)  # where the distribution reaches e_max
    section = design_section(table, v, r, e_design, emax, f_table, r <= r_min_table)
    has_e = ~np.isnan(e_given)
    e_use = np.where(
        has_e, e_given, se.applied_superelevation(e_design, section, table.normal_crown)
    )
    demand = side_friction_demand(v, r, e_use, k)

    # safe speed: by f_max(v) from the table, or by the fixed friction the user gave
    v_safe_table, beyond = safe_speed(table, r, e_use)
    v_safe_fixed, _ = safe_speed(table, r, e_use, np.where(has_f, f_given, 0.0))
    v_safe = np.where(has_f, v_safe_fixed, v_safe_table)

    tabulated = np.isin(np.round(emax, 6), np.round(np.array(table.emax_tabulated), 6))
    flags = np.zeros(v.shape, dtype=np.int64)
    flags |= np.where(below_min, FAIL_RADIUS, 0)
    flags |= np.where(demand > f_max + 1e-12, FAIL_FRICTION, 0)
    flags |= np.where(has_e & (e_given > emax + 1e-12), FAIL_SUPERELEVATION, 0)
    flags |= np.where(kind == BELOW_TABLE, WARN_SPEED_BELOW_TABLE, 0)
    flags |= np.where(kind == ABOVE_TABLE, WARN_SPEED_ABOVE_TABLE, 0)
    flags |= np.where((kind == INTERPOLATED) & ~has_f, WARN_INTERPOLATED, 0)
    flags |= np.where(tabulated, 0, WARN_EMAX_NOT_TABULATED)
    flags |= np.where(~has_e & (section == se.NORMAL_CROWN), NOTE_NORMAL_CROWN, 0)
    flags |= np.where(~has_e & (section == se.REMOVE_CROWN), NOTE_REMOVE_CROWN, 0)
    flags |= np.where((beyond == 1) & ~has_f, NOTE_SAFE_SPEED_AT_LEAST, 0)
    flags |= np.where((beyond == -1) & ~has_f, WARN_SAFE_SPEED_BELOW_TABLE, 0)
    flags |= np.where(has_f, NOTE_FRICTION_GIVEN, 0)
    flags |= np.where(has_e & (e_given < e_design - 5e-5), WARN_BELOW_DESIGN_E, 0)

    a = lateral_acceleration(v, r)
    return RoadCheck(
        speed=v,
        radius=r,
        e_max=emax,
        lateral_acceleration=a,
        lateral_acceleration_g=a / G0,
        side_friction_max=f_max,
        side_friction_demand=demand,
        min_radius=r_min,
        min_radius_rounded=table.round_radius_si(r_min),
        superelevation=e_use,
        superelevation_design=e_design,
        cross_section=section,
        safe_speed=v_safe,
        flags=flags,
    )
