"""A designed versine diagram for a curve in service, solved so that the slews close.

The diagram (point versines, i.e. c^2 / 8 times the point curvature, sampled at the
stations: the linear ramp of the point curvature, common practice, no source):

    0 before the TS, rising linearly to the central versine u at the SC (transition in),
    u from the SC to the CS, falling linearly to 0 at the ST (transition out), 0 after.

A linear versine ramp is a linear curvature ramp, i.e. a clothoid. The versine a chord
actually reads over a linear curvature ramp equals the point value wherever the chord lies
on one piece (the chord's versine is the curvature averaged under a triangle of the
chord's length: (1/2) int_{-c/2}^{c/2} (c/2 - |x|) k dx, derived from y'' = k); at a station
next to a breakpoint it differs by a sixth of the change of slope. The point value is used.

Search space: the two transitions are whole numbers n1, n2 >= 1 of station spacings (half
chords); the TS lies anywhere in a station interval [a, a+1] and the ST in [e, e+1]
(spacings from the first station). For such a cell the point versines are linear in
x = (u, w, z) with w = u t_TS and z = u t_ST:

    d_i = (u i - w) / n1 on a < i <= a+n1,  u on the central stations,  (z - u i) / n2 on
    e-n2 < i <= e,

and the cell itself is the linear constraints a u <= w <= (a+1) u, e u <= z <= (e+1) u,
u >= 0. The slews s = S (m - d) are linear in x (core.versine_realign). The closure
(sum e = 0, sum i e = 0) is two linear equations, leaving a one-parameter family
x = x_p + t n per cell; each hold point (station, slew) and a chosen radius are one more
equation, and a slew limit |s_i| <= L two inequalities per station. The objective, the
track engineer's usual aim, is the least sum of squared slews; on one cell it is a convex
quadratic in t on an interval, minimised exactly. The cells of every pair of transitions
up to ``max_transition`` spacings are searched (above 100 pairs: odd lengths first, then
every pair within 2 of the best), the ST's cell near the one that puts the diagram's
centroid on the survey's, and the best kept.

With the closure using two of three unknowns, a cell meets one hold point in general.
For two or three holds (or one hold and a chosen radius) the transitions may take any
length (core.versine_free: five unknowns per cell, the cells near the best design without
the holds); four or more holds are met only where the survey allows. With
``corrections=True``, when the smooth diagram cannot meet the holds (or the limit with them),
local versine corrections near the holds are added to the best smooth diagram without the
holds (core.versine_corrections, core.versine_holds). When no cell meets the holds and the limit,
the smallest limit that works is min over cells of min max |s_i|, a linear program
(scipy.optimize.linprog) solved on the best-ranked cells.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from curvetui.core.versine_cells import (
    DEFAULT_MAX_TRANSITION,
    SLEW_TOLERANCE,
    _Best,
    _columns,
    _lengths,
    _Problem,
    _search,
    _search_near_minimax,
    _smallest_limit,
)
from curvetui.core.versine_corrections import DEFAULT_WINDOW
from curvetui.core.versine_free import free_search, free_smallest_limit
from curvetui.core.versine_holds import corrected_result
from curvetui.core.versine_realign import radius_for_versine, slews_from_differences

__all__ = [
    "DEFAULT_MAX_TRANSITION",
    "SLEW_TOLERANCE",
    "RealignDesign",
    "RealignInputError",
    "design_realignment",
]


class RealignInputError(ValueError):
    """Input design_realignment cannot use (the message names it)."""


@dataclass(frozen=True)
class RealignDesign:
    """A realignment design. Lengths in metres, versines and slews in metres.

    ``feasible`` False: no design in the search space meets the holds and the limit;
    then the arrays hold the design with the smallest greatest slew that meets the holds
    (if any: else they are empty) and ``smallest_limit`` the limit that would work (None
    when the holds cannot be met at all). ``reason`` says why in words.
    """

    stations: np.ndarray
    chord: float
    measured: np.ndarray
    designed: np.ndarray
    slews: np.ndarray  # outward (away from the curve's centre) +
    central_versine: float
    radius: float
    ts: float  # breakpoints' stations [m]
    sc: float
    cs: float
    st: float
    transition_in: float  # [m]
    transition_out: float  # [m]
    sum_squared_slews: float  # [m^2]
    max_slew: float  # [m], greatest |s|
    feasible: bool
    holds: tuple[tuple[float, float], ...]  # (station [m], slew [m]) as given
    binding_holds: tuple[float, ...]  # stations of the holds that move the optimum
    binding_limit_stations: tuple[float, ...]  # where |s| reaches (infeasible: passes) it
    slew_limit: float | None
    smallest_limit: float | None
    reason: str
    cells_searched: int = 0
    notes: tuple[str, ...] = field(default_factory=tuple)
    # local versine corrections (core.versine_corrections): (station [m], correction [m])
    # at every station of the windows, the designed versines include them; () for none
    corrections: tuple[tuple[float, float], ...] = ()
    correction_window: int = 0  # stations either side of each hold (0: no corrections)


def design_realignment(
    stations,
    measured,
    chord: float,
    holds=None,
    slew_limit: float | None = None,
    central_versine: float | None = None,
    transitions: tuple[int, int] | None = None,
    max_transition: int | None = None,
    corrections: bool = False,
    correction_window: int = DEFAULT_WINDOW,
) -> RealignDesign:
    """Solve the designed versine diagram for a measured survey (SI metres).

    ``stations`` equally spaced at chord / 2; ``measured`` versines [m], positive on the
    curve; ``holds`` a mapping or pairs station [m] -> slew [m] (a station of the survey);
    ``slew_limit`` [m] bounds |s| at every station; ``central_versine`` [m] fixes the
    central versine (a chosen radius: c^2 / (8 R)); ``transitions`` fixes the two
    transition lengths in station spacings; ``max_transition`` bounds the search (spacings,
    default 20). ``corrections``: when the smooth diagram cannot meet the holds (or the
    limit with them), offer local versine corrections within ``correction_window``
    stations of each hold (core.versine_corrections); with four or more holds the smooth
    search is then cut to its coarse pass. Raises ValueError for input outside these terms.
    """
    st = np.asarray(stations, dtype=float)
    m = np.asarray(measured, dtype=float)
    c = float(chord)
    if not (math.isfinite(c) and c > 0):
        raise RealignInputError(f"chord must be a positive length; got {c:g}")
    if st.ndim != 1 or m.shape != st.shape:
        raise RealignInputError("stations and measured versines must be 1-D arrays of one length")
    if st.size < 7:
        raise RealignInputError(f"a survey needs at least 7 stations; got {st.size}")
    if not (np.all(np.isfinite(st)) and np.all(np.isfinite(m))):
        raise RealignInputError("stations and versines must be finite numbers")
    step = c / 2.0
    gaps = np.diff(st)
    bad = np.flatnonzero(np.abs(gaps - step) > 1e-6 * max(step, 1.0))
    if bad.size:
        i = int(bad[0]) + 1
        raise RealignInputError(
            f"stations must be equally spaced at half the chord ({step:g}); station {i} "
            f"is {gaps[i - 1]:g} from the one before"
        )
    if not m.sum() > 0:
        raise RealignInputError(
            "the measured versines must sum to more than 0 (versines are taken "
            "positive on the curve)"
        )
    hold_pairs = []
    for station, slew in dict(holds).items() if holds is not None else ():
        i = int(round((float(station) - st[0]) / step))
        off = abs(st[0] + i * step - float(station))
        if not (0 <= i < st.size and off <= 1e-6 * max(step, 1.0)):
            raise RealignInputError(
                f"hold point at {float(station):g} is not a station of the survey"
            )
        if not math.isfinite(float(slew)):
            raise RealignInputError(f"hold point at {float(station):g}: the slew must be a number")
        hold_pairs.append((i, float(slew)))
    hold_pairs = tuple(sorted(dict(hold_pairs).items()))
    if slew_limit is not None and not (math.isfinite(slew_limit) and slew_limit > 0):
        raise RealignInputError(f"slew limit must be a positive length; got {slew_limit:g}")
    if central_versine is not None and not (math.isfinite(central_versine) and central_versine > 0):
        raise RealignInputError(
            f"central versine must be a positive length; got {central_versine:g}"
        )
    if transitions is not None and (len(transitions) != 2 or min(transitions) < 1):
        raise RealignInputError(
            "transitions must be two whole numbers of station spacings, 1 or more"
        )
    lengths = _lengths(m.size, transitions, max_transition)
    p = _Problem(m, hold_pairs, slew_limit, central_versine, lengths)
    free_ok = transitions is None
    use = corrections and bool(hold_pairs)
    if use and not (isinstance(correction_window, int) and 1 <= correction_window <= 10):
        raise RealignInputError(
            "correction window must be a whole number of stations, 1 to 10; got "
            f"{correction_window!r}"
        )
    if use and len(hold_pairs) + (central_versine is not None) > 3:
        quick, count = _search(p, fallback=False)
        if quick is None:  # four or more equations: corrections without the full search
            got = _corrected(st, c, m, p, correction_window, count)
            if got is not None:
                return got
    smooth = _smooth(st, c, m, p, hold_pairs, slew_limit, central_versine, lengths, free_ok)
    if use and not smooth.feasible:
        got = _corrected(st, c, m, p, correction_window, smooth.cells_searched)
        inf = math.inf
        if got is not None and (
            got.feasible
            or smooth.designed.size == 0
            or (got.smallest_limit or inf) < (smooth.smallest_limit or inf)
        ):
            return got
    return smooth


def _smooth(st, c, m, p, hold_pairs, slew_limit, central_versine, lengths, free_ok):
    """The smooth diagram (no corrections): the search, its smallest limit, its reason."""
    step = c / 2.0
    best, count, got = _solve(p, free_ok)
    holds_out = tuple((float(st[0] + i * step), v) for i, v in hold_pairs)
    if best is not None:
        binding = []
        margin = max(1e-15, 1e-9 * best.objective)
        for i, _ in hold_pairs:  # a hold binds when dropping it lowers the optimum
            rest = tuple(h for h in hold_pairs if h[0] != i)
            other, _, _ = _solve(_Problem(m, rest, slew_limit, central_versine, p.lengths), free_ok)
            if other is not None and other.objective < best.objective - margin:
                binding.append(float(st[i]))
        return _result(st, c, m, best, p, count, True, tuple(binding), None, "")
    if got is None and _free_applies(p, free_ok):
        centre = _centre(p)
        tau = None if centre is None else free_smallest_limit(p, centre)
        if tau is not None:
            reason = (
                f"no design keeps every slew within {slew_limit:g} while meeting the hold "
                f"points; the smallest limit that works is {tau[0]:.6g}"
            )
            free = _Problem(m, hold_pairs, None, central_versine, lengths)
            b, more = free_search(free, centre)
            if b is not None:
                return _result(st, c, m, b, p, count + more, False, (), tau[0], reason)
    elif got is None:
        got = _smallest_limit(p)
    if got is None:
        reason = "no diagram in the search space closes and meets the hold points" + (
            " at the chosen radius" if central_versine is not None else ""
        )
        if len(hold_pairs) > 1:
            reason += (
                " (a transition - constant versine - transition diagram that closes meets up "
                "to three hold points in general; more, or holds that pull against each "
                "other, only where the survey allows)"
            )
        empty = np.array([])
        return RealignDesign(
            st,
            c,
            m,
            empty,
            empty,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            math.nan,
            False,
            holds_out,
            (),
            (),
            slew_limit,
            None,
            reason,
            count,
        )
    tau, n1, n2, a, e, x = got
    n = m.size
    cu, cw, cz = _columns(n, np.array([float(a)]), np.array([float(e)]), n1, n2)
    d = x[0] * cu[0] + x[1] * cw[0] + x[2] * cz[0]
    s = slews_from_differences(m - d)
    b = _Best(float(s @ s), n1, n2, a, e, x, s, d)
    reason = (
        f"no design keeps every slew within {slew_limit:g}; the smallest limit that "
        f"works is {tau:.6g}"
    )
    return _result(st, c, m, b, p, count, False, (), tau, reason)


def _corrected(st, c, m, p: _Problem, window: int, count: int):
    """The design with local corrections at the holds, on the breakpoints of the best
    smooth design without holds (within the limit if one is, else without); None when
    there is none."""
    base, more = _search(_Problem(m, (), None, p.u_fixed, p.lengths))
    if base is None:
        return None
    if p.limit is not None and float(np.max(np.abs(base.slews))) > p.limit:
        # the best smooth design within the limit instead, if the coarse pass finds one
        within, extra = _search(_Problem(m, (), p.limit, p.u_fixed, p.lengths), fallback=False)
        base, more = within or base, more + extra
    u, w, z = (float(v) for v in base.x)
    breaks = base.breaks or (w / u, w / u + base.n1, z / u - base.n2, z / u)
    return corrected_result(RealignDesign, st, c, m, p, breaks, window, count + more)


def _free_applies(p: _Problem, free_ok: bool) -> bool:
    """Two or three equations besides the closure (holds, a chosen radius): free lengths."""
    extra = len(p.holds) + (p.u_fixed is not None)
    return free_ok and 2 <= extra <= 3


def _centre(p: _Problem):
    """The cells (TS, SC, CS, ST) of the best whole-spacing design without holds or limit."""
    best, _ = _search(_Problem(p.m, (), None, p.u_fixed, p.lengths))
    if best is None:
        return None
    u, w, z = (float(v) for v in best.x)
    ts, st = w / u, z / u
    return tuple(math.floor(v) for v in (ts, ts + best.n1, st - best.n2, st))


def _solve(p: _Problem, free_ok: bool):
    """(best or None, cells searched, smallest-limit tuple or None)."""
    if _free_applies(p, free_ok):
        best, count = _search(p, fallback=False)
        if best is None:
            centre = _centre(p)
            if centre is not None:
                best, more = free_search(p, centre)
                count += more
        return best, count, None
    best, count = _search(p, fallback=p.limit is None)
    got = None
    if best is None and p.limit is not None:
        best, more, got = _search_near_minimax(p)
        count += more
    return best, count, got


def _result(st, c, m, b: _Best, p: _Problem, count, feasible, binding, smallest, reason):
    step = c / 2.0
    u, w, z = (float(v) for v in b.x)
    ts, sc, cs, stt = b.breaks or (w / u, w / u + b.n1, z / u - b.n2, z / u)
    s = b.slews
    hit = ()
    if p.limit is not None:
        hit = tuple(float(v) for v in st[np.abs(s) >= p.limit - SLEW_TOLERANCE])
    return RealignDesign(
        stations=st,
        chord=c,
        measured=m,
        designed=b.designed,
        slews=s,
        central_versine=u,
        radius=float(radius_for_versine(u, c)),
        ts=float(st[0] + ts * step),
        sc=float(st[0] + sc * step),
        cs=float(st[0] + cs * step),
        st=float(st[0] + stt * step),
        transition_in=b.n1 * step if b.breaks is None else (sc - ts) * step,
        transition_out=b.n2 * step if b.breaks is None else (stt - cs) * step,
        sum_squared_slews=float(s @ s),
        max_slew=float(np.max(np.abs(s))),
        feasible=feasible,
        holds=tuple((float(st[0] + i * step), v) for i, v in p.holds),
        binding_holds=binding,
        binding_limit_stations=hit,
        slew_limit=p.limit,
        smallest_limit=smallest,
        reason=reason,
        cells_searched=count,
    )
