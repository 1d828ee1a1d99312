"""A rail bend of the project realigned from a versine survey (no Textual): the survey file
read (only that file, through storage.versine_survey, as `curvetui realign` reads it), the
design solved in the project's units, and the designed curve checked with the bend's line
speeds, gauge and traffic against the project's rail limits. The bend's own cant is for its
present radius, so a cant is proposed for the designed curve (as the command does without
--cant). Every problem is an InputError naming the field and its range."""

from __future__ import annotations

import math

from curvetui.inputs import InputError

MAX_CHORD = 1000.0  # [m or ft], as `curvetui realign --chord`
SPEED_KEYS = ("speed", "low_speed", "gauge", "traffic")


def chord_value(text: str, units) -> float:
    """The chord typed, in the user's units; InputError naming the field and range."""
    try:
        x = float(str(text).strip())
    except ValueError:
        x = math.nan
    if not (math.isfinite(x) and 0 < x <= MAX_CHORD):
        raise InputError(
            f"chord: a number more than 0 and at most {MAX_CHORD:g} {units.length_label}; "
            f"got {text!r}"
        )
    return x


def realign_bend(session, bend, survey_path: str, chord_text: str):
    """The RealignSheet of ``bend`` (a rail bend) for the survey at ``survey_path``."""
    import numpy as np

    from curvetui.core.versine_design import design_realignment
    from curvetui.reports.realign_sheet import build_sheet
    from curvetui.storage.versine_survey import read_survey

    if bend.kind != "rail":
        raise InputError(f"{bend.id}: realignment is for a rail bend; this is a {bend.kind} bend")
    path = str(survey_path).strip()
    if not path:
        raise InputError("survey file: give the path of a CSV file (header station,versine)")
    ctx = session.context  # InputError when the project names unknown limits
    units = ctx.units
    chord = chord_value(chord_text, units)
    survey = read_survey(path, chord / 2.0)
    try:
        design = design_realignment(
            np.asarray(survey.stations) * units.length,
            np.asarray(survey.versines) * units.cant,
            chord * units.length,
        )
    except ValueError as exc:
        raise InputError(f"survey: {exc}") from None
    rail = None
    raw = {k: bend.inputs.get(k) for k in SPEED_KEYS}
    raw = {k: v for k, v in raw.items() if v is not None and str(v).strip() != ""}
    if "speed" in raw and math.isfinite(design.radius):
        from curvetui.bend.realign_rail import rail_verdict

        rail = rail_verdict(design, raw, units, ctx.limits)
    return build_sheet(design, rail, units, path)
