"""Checked inputs of n bends through the engine, and the verdict decided once.

The second step of the one path (parse -> evaluate -> record). Every result is kept
unrounded, in the user's units, under its key from ``curvetui.bend.outputs``; each check
a bend must pass is a typed flag in ``checks`` (PASS, FAIL or NOT_APPLICABLE per row),
decided here on the unrounded numbers. Rounding happens only when a record is written.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from curvetui.bend import working_values
from curvetui.bend.crash import road_crash_factors
from curvetui.bend.fields import BY_KEY
from curvetui.bend.geometry import bend_geometry
from curvetui.bend.outputs import OUTPUTS, TEXT
from curvetui.bend.parse import Issue, Parsed
from curvetui.bend.road_advisory import road_advisory
from curvetui.bend.road_sight import road_sight
from curvetui.bend.road_transition import road_transition
from curvetui.core import transitions as tr
from curvetui.core.rail import RailLimits, check_rail, rail_centres_for_gauge
from curvetui.core.road import check_road
from curvetui.core.road_table import RoadTable
from curvetui.core.units import FOOT, UnitSystem
from curvetui.results import CROSS_SECTION_NAMES, rail_columns, road_columns

PASS, FAIL, ERROR = 0, 1, 2
STATUS_NAMES = ("pass", "fail", "error")
NOT_APPLICABLE = -1

# flags the bend layer adds to the engine's own
SPIRAL_IN_SHORT = 1 << 0  # given spiral in below the minimum (road) or the needed length (rail)
SPIRAL_IN_LONG = 1 << 1  # given spiral in above the lateral-shift maximum (road)
SPIRAL_OUT_SHORT = 1 << 2
SPIRAL_OUT_LONG = 1 << 3
GEOMETRY_SKIPPED = 1 << 4  # spiral or PI station given without a deflection
NO_SPIRAL_FITS = 1 << 5  # a spiral is given, but no length meets minimum and maximum
SPIRAL_NOT_SUITABLE = 1 << 6  # no spiral given, and none would fit: a note
CURVE_TOO_SHORT = 1 << 7  # no spiral: the curve is too short to reach full superelevation
GAUGE_NOT_COVERED = 1 << 8  # the curve's gauge is not the one the rail limits are set for
TRAFFIC_NOT_USED = 1 << 9  # traffic given, but the rail limits set no speed by traffic
SPIRAL_NOT_NEEDED = 1 << 10  # radius above the table's largest that uses a spiral: a note
CRASH_OUTSIDE_RANGE = 1 << 11  # R or arc below HSM Eq. 10-13's 100 ft, or its CMF below 1
ADVISORY_BELOW_TABLE = 1 << 12  # the curve fails the table's f_max at its lowest speed
SMALL_DEFLECTION = 1 << 13  # deflection under the sign table's reliable minimum: a note
SIGNS_SINGLE_BEND = 1 << 14  # signs chosen for one bend: Reverse/Winding not available
# a register's curves in series (curvetui.bend.series_signs, batch only)
SIGNS_SERIES = 1 << 15  # signs chosen with the curve's neighbours (replaces the one above)
SERIES_NOT_PLACED = 1 << 16  # no stations or direction: not placed in a series
SERIES_OUT_OF_ORDER = 1 << 17  # begins before the previous curve of its feature ends
SERIES_ENDS_BEFORE_BEGIN = 1 << 18  # end station before begin station
SERIES_FEATURE_AGAIN = 1 << 19  # its feature came earlier in the file, others between
ADVISORY_FLAGS = {
    "below_table": ADVISORY_BELOW_TABLE,
    "small_deflection": SMALL_DEFLECTION,
    "consecutive": SIGNS_SINGLE_BEND,
}
ROAD_SPIRAL_FLAGS = {
    "spiral_in_short": SPIRAL_IN_SHORT,
    "spiral_in_long": SPIRAL_IN_LONG,
    "spiral_out_short": SPIRAL_OUT_SHORT,
    "spiral_out_long": SPIRAL_OUT_LONG,
    "no_fit": NO_SPIRAL_FITS,
    "not_suitable": SPIRAL_NOT_SUITABLE,
    "too_short": CURVE_TOO_SHORT,
    "not_needed": SPIRAL_NOT_NEEDED,
}

ROAD_CHECKS = ("radius", "friction", "superelevation", "transition", "sight")
RAIL_CHECKS = ("cant", "deficiency", "excess", "balance", "transition")
DEFAULT_LANE_WIDTH = {"metric": 3.6, "us": 12.0 * FOOT}  # [m], the Green Book's usual lane


class _Columns(dict):
    """Result columns made on first use (NaN until set): a file of road bends never pays
    for the rail columns. A key that was never set reads as all NaN."""

    def __init__(self, n: int):
        super().__init__()
        self.n = n

    def __missing__(self, key: str) -> np.ndarray:
        if key not in _FLOAT_KEYS:
            raise KeyError(key)
        column = np.full(self.n, np.nan)
        self[key] = column
        return column


_FLOAT_KEYS = frozenset(o.key for o in OUTPUTS if o.rounding != TEXT)


@dataclass(frozen=True)
class Context:
    """What every bend of one evaluation shares."""

    units: UnitSystem
    table: RoadTable
    limits: RailLimits
    signs: object = None  # a curvetui.core.signs.SignTable; None: the shipped default


@dataclass
class Evaluation:
    """Results of n bends: unrounded values by output key, typed checks, status per row.

    ``road``/``rail`` hold the engine's checks of the road and rail rows (positions
    ``road_rows``/``rail_rows``); the message builders read them.
    """

    parsed: Parsed
    ctx: Context
    values: dict[str, np.ndarray]
    texts: dict[str, np.ndarray]
    checks: dict[str, np.ndarray]
    status: np.ndarray
    bend_flags: np.ndarray
    issues: list[Issue]
    road_rows: np.ndarray
    rail_rows: np.ndarray
    parts: dict[str, object] = field(default_factory=dict)  # engine results by name
    part_rows: dict[str, np.ndarray] = field(default_factory=dict)

    @property
    def n(self) -> int:
        return self.parsed.n

    def spiral_length(self, key: str, rows) -> np.ndarray:
        """Spiral length [m] of each row, 0 without one; spiral out defaults to in."""
        return _spiral(self, key, rows)

    def utilisation(self) -> np.ndarray:
        """Largest demand / limit of each row's main check (NaN for errors): for ranking."""
        v = self.values
        with np.errstate(invalid="ignore", divide="ignore"):
            road = np.fmax(
                np.fmax(
                    v["min_radius"] / v["radius"],
                    v["side_friction_demand"] / v["side_friction_max"],
                ),
                np.where(
                    self.parsed.present["superelevation"], v["superelevation"] / v["e_max"], np.nan
                ),
            )
            rail = np.fmax(
                np.fmax(v["cant_deficiency"] / v["deficiency_limit"], v["cant"] / v["cant_limit"]),
                v["cant_excess"] / v["excess_limit"],
            )
        out = np.where(self.parsed.is_rail, rail, road)
        out[self.status == ERROR] = np.nan
        return out


def evaluate(parsed: Parsed, ctx: Context) -> Evaluation:
    """Evaluate every row of ``parsed`` without an input issue; decide each verdict."""
    n = parsed.n
    ev = Evaluation(
        parsed=parsed,
        ctx=ctx,
        values=_Columns(n),
        texts={o.key: np.full(n, None, dtype=object) for o in OUTPUTS if o.rounding == TEXT},
        checks={k: np.full(n, NOT_APPLICABLE, np.int8) for k in (*ROAD_CHECKS, *RAIL_CHECKS)},
        status=np.full(n, PASS, np.int8),
        bend_flags=np.zeros(n, np.int64),
        issues=list(parsed.issues),
        road_rows=np.zeros(0, np.int64),
        rail_rows=np.zeros(0, np.int64),
    )
    bad = parsed.error_mask()
    ev.road_rows = np.nonzero(parsed.is_road & ~bad)[0]
    ev.rail_rows = np.nonzero(parsed.is_rail & ~bad)[0]
    if len(ev.road_rows):
        _road(ev, ev.road_rows)
    if len(ev.rail_rows):
        _rail(ev, ev.rail_rows)
    _verdict(ev)
    return ev


def _put(ev: Evaluation, key: str, rows, values) -> None:
    ev.values[key][rows] = values


def _check(ev: Evaluation, name: str, rows, failed) -> None:
    ev.checks[name][rows] = np.where(failed, FAIL, PASS)


def _road(ev: Evaluation, rows: np.ndarray) -> None:
    units, table, si = ev.ctx.units, ev.ctx.table, ev.parsed.si
    v, r = si["speed"][rows], si["radius"][rows]
    e_max = np.where(ev.parsed.present["emax"][rows], si["emax"][rows], table.emax_default)
    check = check_road(table, v, r, e_max, si["superelevation"][rows], si["friction"][rows])
    ev.parts["road"], ev.part_rows["road"] = check, rows
    for key, values in road_columns(check, units).items():
        _put(ev, key, rows, values)
    working_values.road_terms(ev, rows, check)
    _put(ev, "speed", rows, units.speed_from_si(v))
    _put(ev, "radius", rows, units.length_from_si(r))
    _put(ev, "e_max", rows, 100 * check.e_max)
    names = np.array([CROSS_SECTION_NAMES[k] for k in sorted(CROSS_SECTION_NAMES)], object)
    ev.texts["cross_section"][rows] = names[np.asarray(check.cross_section, int)]
    flags = np.asarray(check.flags)
    from curvetui.core import road as road_engine

    _check(ev, "radius", rows, (flags & road_engine.FAIL_RADIUS) != 0)
    _check(ev, "friction", rows, (flags & road_engine.FAIL_FRICTION) != 0)
    given_e = ev.parsed.present["superelevation"][rows]
    over_e = (flags[given_e] & road_engine.FAIL_SUPERELEVATION) != 0
    _check(ev, "superelevation", rows[given_e], over_e)

    width = np.where(
        ev.parsed.present["lane_width"][rows],
        si["lane_width"][rows],
        DEFAULT_LANE_WIDTH[units.name],
    )
    curve_length = bend_geometry(ev, rows, r, GEOMETRY_SKIPPED)
    road_transition(ev, rows, v, r, check.superelevation, width, ROAD_SPIRAL_FLAGS)
    road_sight(ev, rows, v, r, width, curve_length)
    road_crash_factors(ev, rows, check, CRASH_OUTSIDE_RANGE)
    road_advisory(ev, rows, r, check.superelevation, ADVISORY_FLAGS)


def _spiral(ev: Evaluation, key: str, rows) -> np.ndarray:
    """Spiral length [m] of each row, 0 without one; spiral out defaults to spiral in."""
    si, present = ev.parsed.si, ev.parsed.present
    ls_in = np.where(present["spiral_in"][rows], si["spiral_in"][rows], 0.0)
    if key == "spiral_in":
        return ls_in
    return np.where(present["spiral_out"][rows], si["spiral_out"][rows], ls_in)


def _rail(ev: Evaluation, rows: np.ndarray) -> None:
    units, limits, si, present = ev.ctx.units, ev.ctx.limits, ev.parsed.si, ev.parsed.present
    v, r, ea, low = si["speed"][rows], si["radius"][rows], si["cant"][rows], si["low_speed"][rows]
    s = np.full(len(rows), limits.rail_centres)
    gauge_mm = si["gauge"][rows]
    own = np.abs(gauge_mm / 1000.0 - limits.gauge) < 0.0005  # the file's gauge: its own s
    given = present["gauge"][rows] & ~own
    if given.any():
        uniq, inverse = np.unique(gauge_mm[given], return_inverse=True)
        s[given] = np.array([rail_centres_for_gauge(float(g)) for g in uniq])[inverse]
    ev.bend_flags[rows[given & np.isfinite(limits.gauge)]] |= GAUGE_NOT_COVERED
    traffic = _traffic(ev, rows)
    check = check_rail(limits, v, r, ea, low, s, limits.top_speeds()[traffic])
    ev.parts["rail"], ev.part_rows["rail"] = check, rows
    for key, values in rail_columns(check, units).items():
        _put(ev, key, rows, values)
    _put(ev, "speed", rows, units.speed_from_si(v))
    _put(ev, "radius", rows, units.length_from_si(r))
    _put(ev, "cant", rows, ea / units.cant)
    if units.name == "us":
        r_ft = r / FOOT
        _put(ev, "degree_of_curve_arc", rows, 5729.5779513 / r_ft)
        with np.errstate(invalid="ignore"):
            _put(ev, "degree_of_curve_chord", rows, 2 * np.degrees(np.arcsin(50.0 / r_ft)))
    from curvetui.core import rail as rail_engine

    flags = np.asarray(check.flags)
    has_low = present["low_speed"][rows]
    _check(ev, "cant", rows, (flags & rail_engine.FAIL_CANT) != 0)
    _check(ev, "radius", rows, (flags & rail_engine.FAIL_RADIUS_BELOW_MIN) != 0)
    _check(ev, "deficiency", rows, (flags & rail_engine.FAIL_DEFICIENCY) != 0)
    excess_known = has_low & np.isfinite(check.excess_limit)
    _check(ev, "excess", rows[excess_known], (flags[excess_known] & rail_engine.FAIL_EXCESS) != 0)
    _check(ev, "balance", rows[has_low], (flags[has_low] & rail_engine.FAIL_NO_BALANCE) != 0)

    t = tr.rail_transition_for(limits, check.cant, check.cant_deficiency, check.speed)
    ev.parts["rail_transition"], ev.part_rows["rail_transition"] = t, rows
    for key in ("length", "length_cant_gradient", "length_cant_rate", "length_deficiency_rate"):
        _put(ev, f"transition.{key}", rows, units.length_from_si(getattr(t, key)))
    working_values.rail_rate_limits(ev, rows, check.speed)
    gov = np.asarray(t.governing)
    names = np.asarray((*tr.RAIL_GOVERNING, "none evaluated"), object)
    ev.texts["transition.governing"][rows] = names[np.where(gov < 0, -1, gov)]
    bend_geometry(ev, rows, r, GEOMETRY_SKIPPED)
    need = np.asarray(t.length)
    t_failed = np.zeros(len(rows), bool)
    for key, short in (("spiral_in", SPIRAL_IN_SHORT), ("spiral_out", SPIRAL_OUT_SHORT)):
        ls = _spiral(ev, key, rows)
        with np.errstate(invalid="ignore"):
            is_short = (ls > 0) & (ls < need * (1 - 1e-12))
        ev.bend_flags[rows] |= np.where(is_short, short, 0)
        t_failed |= is_short
    none = (np.asarray(t.flags) & tr.FAIL_NONE_EVALUATED) != 0
    _check(ev, "transition", rows[~none | t_failed], t_failed[~none | t_failed])
    ev.texts["transition.status"][rows] = np.where(
        t_failed, "fail", np.where(none, "not evaluated", "pass")
    )


def _traffic(ev: Evaluation, rows) -> np.ndarray:
    """Each rail row's traffic code (the field's default where blank); the record names it
    where the limits set a top speed by traffic, and a note says it is unused elsewhere."""
    field = BY_KEY["traffic"]
    given = ev.parsed.present["traffic"][rows]
    code = np.where(given, ev.parsed.si["traffic"][rows], field.choices.index(field.default))
    code = code.astype(int)
    if ev.ctx.limits.traffic_top_speeds:
        ev.texts["traffic"][rows] = np.asarray(field.choices, object)[code]
    else:
        ev.bend_flags[rows[given]] |= TRAFFIC_NOT_USED
    return code


def _verdict(ev: Evaluation) -> None:
    """Fail a row on any failed check; an input issue makes it an error (results cleared)."""
    failed = np.zeros(ev.n, bool)
    for values in ev.checks.values():
        failed |= values == FAIL
    ev.status[:] = np.where(failed, FAIL, PASS)
    bad = np.zeros(ev.n, bool)
    if ev.issues:
        ev.issues.sort(key=lambda x: x.row)
        bad[[i.row for i in ev.issues]] = True
    ev.status[bad] = ERROR
    for values in ev.values.values():
        values[bad] = np.nan
    for texts in ev.texts.values():
        texts[bad] = None
    for values in ev.checks.values():
        values[bad] = NOT_APPLICABLE
