"""Typed messages of an evaluation: severity, code, text and the numbers it quotes.

Each message comes from one rule: an engine flag (road, rail, transition, sight) or a flag
of the bend layer, with one builder for its text. ``message_parts`` yields, rule by rule,
the rows that carry it and their texts, so one bend and a million rows say the same
words; batch joins the texts for its CSV cell, the record keeps ``Message`` objects.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from dataclasses import dataclass, field

import numpy as np

from curvetui.bend import evaluate as ev_mod
from curvetui.bend.crash import outside_text as crash_outside_text
from curvetui.bend.evaluate import Evaluation
from curvetui.bend.layer_texts import (
    gauge_text,
    sight_lane,
    sight_offset,
    spiral_long,
    spiral_not_needed,
    spiral_short,
    traffic_text,
)
from curvetui.bend.rail_messages import RAIL_MESSAGES
from curvetui.bend.road_messages import ROAD_MESSAGES
from curvetui.bend.series_signs import series_note
from curvetui.core import sight as sd
from curvetui.core import transitions as tr

SEVERITY_WORDS = {"fail": "FAIL", "warning": "WARNING", "note": "NOTE", "error": "ERROR"}
Namer = Callable[[str], str]


@dataclass(frozen=True)
class Message:
    """One reason: ``severity`` (fail, warning, note, error), a stable ``code``, the text
    without the severity word, the part of the record it belongs to, and the numbers it
    quotes (in the user's units, by record key)."""

    severity: str
    code: str
    text: str
    part: str = ""
    values: dict = field(default_factory=dict)

    def __str__(self) -> str:
        line = f"{SEVERITY_WORDS[self.severity]} {self.text}"
        return f"{self.part}: {line}" if self.part else line

    def to_json(self) -> dict:
        out = {"severity": self.severity, "code": self.code, "text": self.text}
        if self.part:
            out["part"] = self.part
        if self.values:
            out["values"] = self.values
        return out


def message_line(m: dict | Message) -> str:
    """A message (typed, or its JSON form) as one line: 'transition: FAIL ...'."""
    if isinstance(m, Message):
        return str(m)
    line = f"{SEVERITY_WORDS[m['severity']]} {m['text']}"
    return f"{m['part']}: {line}" if m.get("part") else line


@dataclass(frozen=True)
class Rule:
    """Where a message comes from: ``source`` names the engine result whose ``flags`` carry
    ``bit`` ("bend" for the bend layer's own flags); ``build(obj, j, ref, units)``."""

    source: str
    bit: int
    severity: str
    code: str
    build: Callable
    constant: bool = False
    part: str = ""
    keys: tuple[str, ...] = ()
    by_row: bool = False  # build(evaluation, row, ...) rather than build(result, position, ...)


def _const(text: str) -> Callable:
    return lambda obj, j, ref, units: text


_RAIL_NOT_EVALUATED = tuple(
    Rule(
        "rail_transition",
        bit,
        "warning",
        f"{code}_not_evaluated",
        _const(f"{name}: the limits set no value, not evaluated"),
        True,
        "transition",
    )
    for bit, code, name in (
        (tr.WARN_CANT_GRADIENT_NOT_EVALUATED, "cant_gradient", "cant gradient"),
        (tr.WARN_CANT_RATE_NOT_EVALUATED, "cant_rate", "rate of change of cant"),
        (
            tr.WARN_DEFICIENCY_RATE_NOT_EVALUATED,
            "deficiency_rate",
            "rate of change of cant deficiency",
        ),
    )
)


def _signs_of(ev: Evaluation):
    return ev.parts["sign_table"]


# the existing-curve notes (curvetui.bend.road_advisory); sources in the sign table's file
ADVISORY_RULES = (
    Rule(
        "bend",
        ev_mod.ADVISORY_BELOW_TABLE,
        "note",
        "inferred_design_speed_below_table",
        lambda ev, i, ref, units: (
            "inferred design speed: the curve's friction demand exceeds the table's f_max "
            f"even at its lowest speed {float(ev.ctx.table.speeds[0]):g} "
            f"{'km/h' if ev.ctx.table.units == 'metric' else 'mph'} (not extrapolated)"
        ),
        True,
        "advisory",
    ),
    Rule(
        "bend",
        ev_mod.SMALL_DEFLECTION,
        "note",
        "deflection_not_reliable",
        lambda ev, i, ref, units: (
            f"deflection under {_signs_of(ev).reliable_deflection_min:g} degrees: such curves "
            f"are not reliably measured ({_signs_of(ev).reliable_deflection_min_source})"
        ),
        True,
        "advisory",
    ),
    Rule(
        "bend",
        ev_mod.SIGNS_SERIES,
        "note",
        "signs_series",
        lambda ev, i, ref, units: series_note(_signs_of(ev)),
        True,
        "signs",
    ),
    Rule(
        "bend",
        ev_mod.SERIES_NOT_PLACED,
        "note",
        "series_not_placed",
        _const(
            "not placed in a series: begin_station, end_station and direction are needed "
            "(a station such as 2+710.5 or a number; 'left' or 'right'), so Reverse and "
            "Winding Road are not checked for this curve"
        ),
        True,
        "signs",
    ),
    Rule(
        "bend",
        ev_mod.SERIES_OUT_OF_ORDER,
        "warning",
        "series_out_of_order",
        _const(
            "begins before the previous curve of its feature ends: the register is not in "
            "station order here, so this curve is left out of any series (sort the curves "
            "by feature and station)"
        ),
        True,
        "signs",
    ),
    Rule(
        "bend",
        ev_mod.SERIES_FEATURE_AGAIN,
        "warning",
        "series_feature_again",
        _const(
            "its feature came earlier in the file, other features between: the register is "
            "not grouped by feature, so curves on either side of the gap are not placed "
            "together (sort the curves by feature and station)"
        ),
        True,
        "signs",
    ),
    Rule(
        "bend",
        ev_mod.SERIES_ENDS_BEFORE_BEGIN,
        "warning",
        "series_ends_before_begin",
        _const("end_station is before begin_station: this curve is left out of any series"),
        True,
        "signs",
    ),
    Rule(
        "bend",
        ev_mod.SIGNS_SINGLE_BEND,
        "note",
        "signs_single_bend",
        lambda ev, i, ref, units: (
            f"signs by {_signs_of(ev).title}; {_signs_of(ev).consecutive_note}; the table "
            f"applies to {_signs_of(ev).applies_to}"
        ),
        True,
        "signs",
    ),
)

RULES: tuple[Rule, ...] = (
    *(Rule("road", bit, sev, code, b, c, "", keys) for bit, sev, code, b, c, keys in ROAD_MESSAGES),
    *(Rule("rail", bit, sev, code, b, c, "", keys) for bit, sev, code, b, c, keys in RAIL_MESSAGES),
    Rule(
        "bend",
        ev_mod.NO_SPIRAL_FITS,
        "fail",
        "no_spiral_length_fits",
        _const("no spiral length satisfies both the minimum and the lateral-shift maximum"),
        True,
        "transition",
        ("transition.spiral_length_min", "transition.spiral_length_max"),
    ),
    Rule(
        "bend",
        ev_mod.SPIRAL_NOT_SUITABLE,
        "note",
        "spiral_not_suitable",
        _const(
            "a spiral is not suitable here: no length meets both the minimum and the "
            "lateral-shift maximum (the bend has none, so this is not checked)"
        ),
        True,
        "transition",
        ("transition.spiral_length_min", "transition.spiral_length_max"),
    ),
    Rule(
        "bend",
        ev_mod.SPIRAL_NOT_NEEDED,
        "note",
        "spiral_not_needed",
        spiral_not_needed,
        False,
        "transition",
        ("radius", "transition.spiral_radius_max"),
    ),
    Rule(
        "bend",
        ev_mod.CURVE_TOO_SHORT,
        "warning",
        "curve_too_short_for_full_superelevation",
        _const(
            "the curve is too short to reach full superelevation with this share of the "
            "runoff on the tangents"
        ),
        True,
        "transition",
        ("transition.full_superelevation_in", "transition.full_superelevation_out"),
    ),
    Rule(
        "bend",
        ev_mod.SPIRAL_IN_SHORT,
        "fail",
        "spiral_in_too_short",
        spiral_short("spiral in", "spiral_in"),
        False,
        "transition",
    ),
    Rule(
        "bend",
        ev_mod.SPIRAL_OUT_SHORT,
        "fail",
        "spiral_out_too_short",
        spiral_short("spiral out", "spiral_out"),
        False,
        "transition",
    ),
    Rule(
        "bend",
        ev_mod.SPIRAL_IN_LONG,
        "fail",
        "spiral_in_too_long",
        spiral_long("spiral in", "spiral_in"),
        False,
        "transition",
    ),
    Rule(
        "bend",
        ev_mod.SPIRAL_OUT_LONG,
        "fail",
        "spiral_out_too_long",
        spiral_long("spiral out", "spiral_out"),
        False,
        "transition",
    ),
    Rule(
        "road_transition",
        tr.WARN_GRADIENT_INTERPOLATED,
        "note",
        "gradient_interpolated",
        _const("relative gradient interpolated between table rows"),
        True,
        "transition",
    ),
    Rule(
        "road_transition",
        tr.WARN_SPEED_BELOW_TABLE | tr.WARN_SPEED_ABOVE_TABLE,
        "warning",
        "gradient_outside_table",
        _const("design speed outside the table: no relative gradient, no runoff"),
        True,
        "transition",
    ),
    Rule(
        "road_transition",
        tr.NOTE_NO_SUPERELEVATION,
        "note",
        "no_runoff",
        _const("no superelevation: no runoff"),
        True,
        "transition",
    ),
    *_RAIL_NOT_EVALUATED,
    Rule(
        "rail_transition",
        tr.FAIL_NONE_EVALUATED,
        "warning",
        "transition_not_evaluated",
        _const(
            "no transition criterion could be evaluated: the limits file sets no cant "
            "gradient or rates; size the transition by the authority's rules"
        ),
        True,
        "transition",
    ),
    Rule(
        "sight",
        sd.FAIL_OFFSET,
        "fail",
        "sightline_offset_short",
        sight_offset,
        False,
        "sight",
        ("sight.offset_available", "sight.sightline_offset_required", "sight.speed_that_passes"),
        True,
    ),
    Rule(
        "sight",
        sd.FAIL_NO_STOP,
        "fail",
        "downgrade_too_steep",
        _const("the downgrade is too steep for the deceleration assumed"),
        True,
        "sight",
    ),
    Rule(
        "sight",
        sd.WARN_BEYOND_FORMULA,
        "warning",
        "sight_beyond_formula",
        _const("the sight line wraps beyond the formula's range"),
        True,
        "sight",
    ),
    Rule(
        "sight",
        sd.NOTE_SIGHT_LINE_ON_TANGENTS,
        "note",
        "sight_line_on_tangents",
        _const("the sight distance exceeds the curve: line runs onto tangents"),
        True,
        "sight",
    ),
    Rule(
        "sight",
        sd.NOTE_CURVE_LENGTH_UNKNOWN,
        "note",
        "curve_length_unknown",
        _const("no deflection given: curve assumed longer than the sight distance (conservative)"),
        True,
        "sight",
    ),
    Rule("sight", -1, "note", "sight_line_position", sight_lane, False, "sight", (), True),
    Rule(
        "bend",
        ev_mod.GAUGE_NOT_COVERED,
        "warning",
        "gauge_not_covered",
        gauge_text,
        False,
    ),
    Rule("bend", ev_mod.TRAFFIC_NOT_USED, "note", "traffic_not_used", traffic_text, True),
    Rule(
        "bend",
        ev_mod.CRASH_OUTSIDE_RANGE,
        "warning",
        "crash_factor_outside_range",
        crash_outside_text,
        False,
        "crash",
        ("crash.curvature_cmf",),
        True,
    ),
    Rule(
        "bend",
        ev_mod.GEOMETRY_SKIPPED,
        "note",
        "geometry_needs_deflection",
        _const(
            "spiral or PI station given without a deflection: curve geometry not "
            "computed (the spiral lengths are still checked)"
        ),
        True,
        "geometry",
    ),
    *ADVISORY_RULES,
)


def _source(ev: Evaluation, name: str):
    """(object the builder reads, flags by position, rows of those positions, reference)."""
    if name == "bend":
        rows = np.nonzero(ev.status != ev_mod.ERROR)[0]
        return ev, ev.bend_flags[rows], rows, None, True
    obj = ev.parts.get(name)
    if obj is None:
        return None
    rows = ev.part_rows[name]
    ref = ev.ctx.limits if name.startswith("rail") else ev.ctx.table
    keep = ev.status[rows] != ev_mod.ERROR
    return obj, np.asarray(obj.flags), rows, ref, keep


class _ListView:
    """An engine result's arrays at some positions, as Python lists (fast one by one)."""

    def __init__(self, obj, where: np.ndarray):
        self._obj, self._where = obj, where

    def __getattr__(self, name: str):
        values = np.asarray(getattr(self._obj, name))[self._where].tolist()
        setattr(self, name, values)
        return values


@dataclass
class PartTexts:
    """One rule's message over the rows that carry it: one text for all, or one per row."""

    rule: Rule
    rows: np.ndarray
    texts: list[str] | str


def message_parts(ev: Evaluation, field_name: Namer) -> Iterator[PartTexts]:
    """Each rule's rows and texts, in the order messages are listed (errors excluded)."""
    units = ev.ctx.units
    for rule in RULES:
        src = _source(ev, rule.source)
        if src is None:
            continue
        obj, flags, rows, ref, keep = src
        hit = (flags & rule.bit) != 0 if rule.bit >= 0 else np.ones(len(rows), bool)
        if keep is not True:
            hit &= keep
        where = np.nonzero(hit)[0]
        if not len(where):
            continue
        if rule.source == "bend" or rule.by_row:
            at = rows[where]
            texts = (
                rule.build(ev, int(at[0]), ref, units)
                if rule.constant
                else [rule.build(ev, int(i), ref, units) for i in at]
            )
            yield PartTexts(rule, at, texts)
        elif rule.constant:
            yield PartTexts(rule, rows[where], rule.build(obj, int(where[0]), ref, units))
        else:
            view = _ListView(obj, where)
            yield PartTexts(
                rule, rows[where], [rule.build(view, j, ref, units) for j in range(len(where))]
            )
    for key, mask in ev.parsed.ignored.items():
        rows = np.nonzero(mask & (ev.status != ev_mod.ERROR))[0]
        for kind, is_kind in (("road", ev.parsed.is_road), ("rail", ev.parsed.is_rail)):
            at = rows[is_kind[rows]]
            if len(at):
                rule = Rule("input", 0, "note", "input_ignored", _const(""), True, "")
                yield PartTexts(
                    rule, at, f"{field_name(key)} does not apply to a {kind} bend: ignored"
                )


def row_messages(
    ev: Evaluation, i: int, name: Namer, other: Namer | None = None, field_name: Namer | None = None
) -> list[Message]:
    """The messages of row ``i``: its input errors, or the reasons of its checks."""
    errors = [x for x in ev.issues if x.row == i]
    if errors:
        return [Message("error", "input", x.format(name, other)) for x in errors]
    out = []
    for part in message_parts(ev, field_name or name):
        hit = np.nonzero(part.rows == i)[0]
        if not len(hit):
            continue
        text = part.texts if isinstance(part.texts, str) else part.texts[int(hit[0])]
        values = {k: _number(ev.values[k][i]) for k in part.rule.keys if k in ev.values}
        out.append(Message(part.rule.severity, part.rule.code, text, part.rule.part, values))
    return out


def _number(x) -> float | None:
    x = float(x)
    return float(f"{x:.6g}") if np.isfinite(x) else None
