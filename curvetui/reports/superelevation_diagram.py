"""A road bend's superelevation diagram from its record, in the user's units, for the faces
(the CSV command, the app's view, the worksheets). The arithmetic is the engine's
(``curvetui.core.superelevation_diagram``, which states the model, the placement rules and
the elevation convention); this module only reads the record, converts units and picks
the stations to list. numpy only.

Slopes are in percent, signed as the superelevation (+ rises towards the outside edge of
the curve); elevations are relative to the profile grade line, in m or ft. The record does
not know the direction of turn, so the edges are named inside and outside of the curve.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from curvetui.core import superelevation_diagram as sed
from curvetui.core.units import unit_system

DEFAULT_INTERVAL = {"metric": 10.0, "us": 25.0}  # m, ft: a table row every so often
MAX_ROWS = 5000  # an interval that would list more rows is refused
DEFAULT_SHARE = 2.0 / 3.0  # of the runoff on the tangent at an end without a spiral (the
# runoff_on_tangent field's default: Highway Engineering Handbook, two-thirds at the PC)

# key point -> (label, short label for drawings, the outside half's slope in units of
# (e_NC, e): the point is reached where the bend's highest slope reaches this)
KEY_LABELS = {
    "normal_crown_in": ("Normal crown (runout start)", "NC", (-1, 0)),
    "level_crown_in": ("Level crown (adverse crown removed)", "LC", (0, 0)),
    "reverse_crown_in": ("Reverse crown (both halves +e_NC)", "RC", (1, 0)),
    "full_superelevation_in": ("Full superelevation from", "e", (0, 1)),
    "full_superelevation_out": ("Full superelevation to", "e", (0, 1)),
    "reverse_crown_out": ("Reverse crown (both halves +e_NC)", "RC", (1, 0)),
    "level_crown_out": ("Level crown (adverse crown removed)", "LC", (0, 0)),
    "normal_crown_out": ("Normal crown (runout end)", "NC", (-1, 0)),
}
PEAK_LABEL = ("Highest superelevation reached (short curve)", "e max reached")


@dataclass(frozen=True)
class Point:
    """One listed station: its key (a KEY_LABELS key, ``peak``, a curve point such as
    ``pc`` or ``""`` for an interval row), label, element (tangent, spiral, curve), slopes
    [%] and elevations relative to the grade line [m or ft]."""

    key: str
    label: str
    station: float
    element: str
    slope_out: float
    slope_in: float
    z_out: float
    z_centreline: float
    z_in: float


@dataclass(frozen=True)
class Diagram:
    """A bend's superelevation diagram in the user's units (stations and widths m or ft,
    slopes %)."""

    units: str
    axis: str
    e: float  # superelevation in use [%]
    e_nc: float  # normal crown [%]
    w_out: float  # centreline to the outside edge
    w_in: float
    placement: str  # how the runoff is placed, in words
    ramps: tuple[float, float, float, float]  # LC_in, LC_out, L_in, L_out
    keys: tuple[Point, ...]  # the key points reached, in station order (and the peak)
    curve_points: tuple[tuple[str, float], ...]  # ("PC", station) ...
    too_short: bool
    peak_slope: float  # [%]
    notes: tuple[str, ...] = field(default=())

    @property
    def length_label(self) -> str:
        return unit_system(self.units).length_label

    @property
    def span(self) -> tuple[float, float]:
        """First and last station of the transition (normal crown in and out)."""
        return self.keys[0].station, self.keys[-1].station

    def at(self, stations) -> tuple[np.ndarray, ...]:
        """(slope_out %, slope_in %, z_out, z_centreline, z_in) at ``stations``."""
        u = unit_system(self.units)
        lc_in, lc_out, l_in, l_out = (u.length_to_si(x) for x in self.ramps)
        x = u.length_to_si(np.asarray(stations, dtype=float))
        e, e_nc = self.e / 100, self.e_nc / 100
        s_out, s_in = sed.edge_slopes(x, lc_in, lc_out, l_in, l_out, e, e_nc)
        code = sed.AXES.index(self.axis)
        z = sed.edge_elevations(
            s_out, s_in, u.length_to_si(self.w_out), u.length_to_si(self.w_in), e_nc, code
        )
        return (100 * s_out, 100 * s_in, *(u.length_from_si(v) for v in z))

    def rows(self, interval: float | None = None) -> list[Point]:
        """The table: every ``interval`` (default DEFAULT_INTERVAL) through each transition
        (normal crown to full superelevation; the whole span on a short curve), with every
        key station and curve point; the full superelevation between is constant."""
        step = interval or DEFAULT_INTERVAL[self.units]
        first, last = self.span
        reached = {p.key: p.station for p in self.keys}
        stretches = (
            [(first, last)]
            if self.too_short
            else [
                (first, reached["full_superelevation_in"]),
                (reached["full_superelevation_out"], last),
            ]
        )
        named: dict[float, tuple[str, str]] = {}
        for label, st in self.curve_points:
            named.setdefault(st, (label.lower(), label))
        for p in self.keys:
            at = [c for c, st in self.curve_points if abs(st - p.station) < 1e-6]
            named.pop(next((st for st in named if abs(st - p.station) < 1e-6), None), None)
            named[p.station] = (p.key, p.label + "".join(f", at the {c}" for c in at))
        stations = set(named)
        for a, b in stretches:
            k0, k1 = math.ceil(a / step - 1e-9), math.floor(b / step + 1e-9)
            if k1 - k0 > MAX_ROWS:
                raise ValueError(f"interval {step:g} would list more than {MAX_ROWS} rows")
            stations.update(k * step for k in range(k0, k1 + 1))
        xs = _dedupe(sorted(stations))
        values = self.at(xs)
        return [
            Point(
                *named.get(x, ("", "")),
                x,
                self.element(x),
                *(float(v[i]) for v in values),
            )
            for i, x in enumerate(xs)
        ]

    def element(self, station: float) -> str:
        """tangent, spiral or curve at ``station`` (the end a point sits on: the next)."""
        pts = dict(self.curve_points)
        if "TS" in pts:
            for name, element in (("TS", "tangent"), ("SC", "spiral"), ("CS", "curve")):
                if station < pts[name] - 1e-9:
                    return element
            return "spiral" if station < pts["ST"] - 1e-9 else "tangent"
        if station < pts["PC"] - 1e-9:
            return "tangent"
        return "curve" if station < pts["PT"] - 1e-9 else "tangent"


def _dedupe(xs: list[float]) -> list[float]:
    """Stations closer than 1e-6 are one (the key station kept)."""
    out: list[float] = []
    for x in xs:
        if out and abs(x - out[-1]) < 1e-6:
            continue
        out.append(x)
    return out


def _number(mapping: dict, key: str) -> float | None:
    v = mapping.get(key)
    return float(v) if isinstance(v, int | float) and math.isfinite(v) else None


MIN_DRAWN = 0.005  # [%] the least superelevation drawn: half the 0.01 % the diagram prints


def diagram_for_record(record: dict) -> Diagram | str:
    """The diagram of a road bend's record (``curvetui check --json``), or the reason in
    words why it has none."""
    if record.get("kind") != "road":
        return "a superelevation diagram is drawn for road bends only"
    t, g = record.get("transition") or {}, record.get("geometry") or {}
    units = unit_system(record.get("units", "metric"))
    e, e_nc = _number(record, "superelevation"), _number(t, "normal_crown")
    if not g or e is None or e_nc is None:
        return "no diagram: the bend needs a deflection angle for its stations"
    if e <= 0:
        return "no diagram: the normal crown is kept (no superelevation)"
    if e < MIN_DRAWN:  # e.g. 1e-320 %: the runoff underflows and the stations are not finite
        return (
            f"no diagram: superelevation {e:.3g} % is too small to draw "
            f"(less than {MIN_DRAWN:g} %, below the 0.01 % the diagram shows)"
        )
    width = _number(t, "lane_width")
    n1 = _number(t, "lanes_rotated") or 1.0
    axis = t.get("rotation_axis") or sed.AXES[0]
    if width is None or axis not in sed.AXES:
        return "no diagram: the record has no lane width or axis of rotation"
    half = width * n1 / (1.0 if axis == "centreline" else 2.0)
    notes = []
    if "ts" in g:
        ls_in = _number(g, "spiral_length")
        ls_out = _number(g, "spiral_length_out")
        ls_out = ls_in if ls_out is None else ls_out
        ts, st = _number(g, "ts"), _number(g, "st")
        lr = _number(t, "runoff")
        if None in (ls_in, ts, st):
            return "no diagram: the spiral stations are missing"
        if lr is None and 0 in (ls_in, ls_out):
            return "no diagram: no runoff length (no relative gradient at this speed)"
        share = DEFAULT_SHARE  # an end without a spiral: as a simple curve's, the default
        si = [units.length_to_si(v) for v in (ts, st, ls_in, ls_out)]
        lr_si = units.length_to_si(lr) if lr is not None else 0.0
        ends = [(si[0], si[2]), (si[1], si[3])]
        if ls_in == 0:
            ends[0] = (si[0] - share * lr_si, lr_si)
        if ls_out == 0:
            ends[1] = (si[1] + share * lr_si, lr_si)
        ramps = (ends[0][0], ends[1][0], ends[0][1], ends[1][1])
        curve = tuple((k.upper(), g[k]) for k in ("ts", "sc", "cs", "st"))
        placement = "runoff over each spiral: level crown at the TS and ST, full e at the SC and CS"
        if 0 in (ls_in, ls_out):
            placement += f"; the end without a spiral has {share:.3g} of the runoff on its tangent"
        shortest = min(x for x in (ls_in, ls_out) if x > 0) if max(ls_in, ls_out) > 0 else 0
        if lr is not None and 0 < shortest < lr * (1 - 1e-9):
            notes.append(
                f"a spiral is shorter than the runoff L_r {lr:.1f} {units.length_label}: the "
                "edges rise faster than the maximum relative gradient allows"
            )
    else:
        lr, share = _number(t, "runoff"), _number(t, "runoff_on_tangent")
        pc, pt = _number(g, "pc"), _number(g, "pt")
        if None in (lr, share, pc, pt):
            return "no diagram: no runoff length (no relative gradient at this speed)"
        ramps = sed.simple_placement(*(units.length_to_si(v) for v in (pc, pt, lr)), share)
        curve = (("PC", pc), ("PT", pt))
        placement = f"simple curve: {share:.3g} of the runoff on each tangent"
    lc_in, lc_out, l_in, l_out = (float(x) for x in ramps)
    k = sed.key_stations(lc_in, lc_out, l_in, l_out, e / 100, e_nc / 100)
    peak_slope = 100 * float(k["peak_slope"])
    too_short = bool(k["too_short"])
    if too_short:
        notes.insert(
            0,
            f"the curve is too short for its runoff: full superelevation {e:.2f} % is never "
            f"reached; the highest is {peak_slope:.2f} % at one station",
        )
    if e < e_nc:
        notes.append(
            f"e {e:.2f} % is below the normal crown {e_nc:g} %: the inside half keeps its crown "
            "and no reverse crown is reached"
        )
    if axis != "centreline" and n1 < 2:
        notes.append(
            "about an edge, n1 counts every lane rotated (a two-lane road is n1 = 2); with "
            f"n1 = {n1:g} each half is {half:g} {units.length_label} wide"
        )
    keys = []
    for key, (label, _, (a, b)) in KEY_LABELS.items():
        need = a * e_nc + b * e
        if need <= peak_slope * (1 + 1e-9) + 1e-9:
            keys.append((key, label, units.length_from_si(float(k[key]))))
    if too_short:
        keys.append(("peak", PEAK_LABEL[0], units.length_from_si(float(k["peak"]))))
    keys.sort(key=lambda p: p[2])
    back = tuple(units.length_from_si(v) for v in (lc_in, lc_out, l_in, l_out))
    d = Diagram(
        units.name,
        axis,
        e,
        e_nc,
        half,
        half,
        placement,
        back,
        (),
        curve,
        too_short,
        peak_slope,
        tuple(notes),
    )
    values = d.at([p[2] for p in keys])
    points = tuple(
        Point(key, label, st, d.element(st), *(float(v[i]) for v in values))
        for i, (key, label, st) in enumerate(keys)
    )
    return Diagram(**{**d.__dict__, "keys": points})


def short_label(key: str) -> str:
    """The drawing's short label of a key point (NC, LC, RC, e)."""
    return KEY_LABELS[key][1] if key in KEY_LABELS else PEAK_LABEL[1]
