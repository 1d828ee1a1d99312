"""The worksheets' content, shared by every format: one project evaluated into page data."""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field

from curvetui.bend.display import shown
from curvetui.bend.messages import message_line
from curvetui.bend.parse import to_number
from curvetui.core.circular import GeometryError
from curvetui.inputs import InputError
from curvetui.reports.sheet.labels import DEFAULTS, FIELD_NAMES, FIELD_ORDER, UNIT_KIND
from curvetui.reports.working import Step, rail_working, road_working
from curvetui.results import unit_label
from curvetui.screen_text import clean
from curvetui.stations import format_station
from curvetui.storage.project.alignment_report import alignment_report
from curvetui.storage.project.chain import direction_on, effective_inputs, lay_out_project
from curvetui.storage.project.checking import Context, Outcome, evaluate_project, project_context
from curvetui.storage.project.files import load_project
from curvetui.storage.project.model import Details, Project


@dataclass
class BendSheet:
    """What one bend's page prints, as text (the plan sketch as a plan.PlanShape)."""

    bend_id: str
    kind: str
    station: str
    status: str  # PASS, FAIL or ERROR
    speed: str
    radius: str
    notes: str
    inputs: list[tuple[str, str, str]]  # (name, value, unit)
    blanks: list[str]  # inputs left blank, with the default used
    standard: list[tuple[str, str]]  # (what, value and source)
    steps: list[Step]
    messages: list[str]
    error: str | None
    plan: object | None = None  # plan.PlanShape
    plan_note: str = ""
    stations: dict[str, str] = field(default_factory=dict)
    diagram: object | None = None  # superelevation_diagram.Diagram (road bends)
    diagram_note: str = ""  # why a road bend has no diagram


@dataclass
class SheetSet:
    """The project, its units and notes, and one BendSheet per printed bend. ``details`` are
    the project's details as printed: every text cleaned of control characters (see
    curvetui.screen_text), as every text of the bend sheets and notes is."""

    project: Project
    source: str
    units: object
    bends: list[BendSheet]
    notes: list[str]
    details: Details | None = None
    alignment: object | None = None  # storage.project.alignment_report.AlignmentReport

    @property
    def first_bend_page(self) -> int:
        """The page of the first bend: after the summary (and the alignment page)."""
        return 2 if self.alignment is None else 3

    def __post_init__(self) -> None:
        if self.details is None:
            self.details = cleaned(self.project.details)

    @property
    def pages(self) -> int:
        return self.first_bend_page - 1 + len(self.bends)

    def title_fields(self, sheet: BendSheet, page: int) -> list[tuple[str, str]]:
        """A bend page's title block as (label, value) pairs, in reading order."""
        d = self.details
        return [
            ("Project", d.name),
            ("Client", d.client or "-"),
            ("Job number", d.job_number or "-"),
            ("Drawing", d.drawing or "-"),
            ("Bend", f"{sheet.bend_id} ({sheet.kind})"),
            ("Station", sheet.station),
            ("Designer", d.designer or "-"),
            ("Checker", d.checker or "-"),
            ("Date", d.date or "-"),
            ("Revision", d.revision or "-"),
            ("Status", sheet.status),
            ("Sheet", f"page {page} of {self.pages}"),
        ]


def _status(outcome: Outcome) -> str:
    return {"pass": "PASS", "fail": "FAIL"}.get(outcome.status, "ERROR")


def _value_text(value) -> str:
    if isinstance(value, float) and value.is_integer():
        return f"{value:g}"
    return str(value)


def _inputs(bend, units, given: dict | None = None) -> list[tuple[str, str, str]]:
    """The inputs as printed; ``given`` the alignment's deflection and PI station for a bend
    on it (marked so)."""
    rows = []
    given = given or {}
    for key in FIELD_ORDER.get(bend.kind, ()):
        value = given.get(key, bend.inputs.get(key))
        kind = UNIT_KIND[key]
        unit = {"deg": "deg", "station": units.length_label}.get(kind, unit_label(kind, units))
        if value is None or value == "":
            continue
        if key == "pi_station" and math.isfinite(to_number(value)):
            text, unit = format_station(to_number(value), units.name), ""
        else:
            text = _value_text(round(value, 6) if key in given else value)
        if key in given:  # beside the value: the unit column is narrow on the PDF
            text = f"{text} (from the alignment)"
        rows.append((FIELD_NAMES[key], text, unit))
    return rows


def _blanks(bend) -> list[str]:
    """The inputs left blank whose defaults the check used."""
    return [
        f"{FIELD_NAMES[key]} ({DEFAULTS[key]})"
        for key in FIELD_ORDER.get(bend.kind, ())
        if key in DEFAULTS
        and bend.inputs.get(key) in (None, "")
        and (key != "spiral_out" or bend.inputs.get("spiral_in") not in (None, ""))
    ]


def _standard(outcome: Outcome, ctx: Context, units) -> list[tuple[str, str]]:
    rec = outcome.record
    if outcome.bend.kind == "road":
        t = ctx.table
        rows = [
            ("Design table", f"{getattr(t, 'title', t.name)} [{t.name}]"),
            ("Source", t.source),
        ]
        if rec:
            rows += [
                ("e_max in use", f"{rec['e_max']:g} %"),
                ("f_max in use", f"{rec['side_friction_max']:g}"),
                (
                    "R_min at this speed",
                    f"table rounds to {shown('min_radius', rec['min_radius'], table=t)} "
                    f"{units.length_label} ({rec['min_radius']:g} {units.length_label} "
                    "computed)",
                ),
            ]
        return rows
    lim = ctx.limits
    rows = [("Rail limits", f"{lim.title} [{lim.name}]"), ("Source", lim.source)]
    if rec:
        cl, u = units.cant_label, units.name
        excess = rec.get("excess_limit")
        rows += [
            ("Cant limit", f"{shown('cant_limit', rec['cant_limit'], u)} {cl}"),
            (
                "Cant deficiency limit",
                f"{shown('deficiency_limit', rec['deficiency_limit'], u)} {cl}",
            ),
            (
                "Cant excess limit",
                "none set" if excess is None else f"{shown('excess_limit', excess, u)} {cl}",
            ),
            ("Distance between rail centres s", f"{rec['rail_centres']:g} {cl}"),
        ]
    return rows


def _plan(outcome: Outcome, units, sheet: BendSheet, layout=None) -> None:
    from curvetui.reports.plan import plan_for_inputs, station_texts

    if outcome.record is None:
        sheet.plan_note = "No plan: the inputs have an error."
        return
    radius = units.length_to_si(outcome.record["radius"])
    try:
        bend = outcome.bend
        inputs = effective_inputs(bend.id, bend.inputs, layout)
        shape = plan_for_inputs(inputs, units, radius, direction_on(layout, bend.id))
    except (InputError, GeometryError) as exc:
        sheet.plan_note = f"No plan: {exc}"
        return
    if shape is None:
        sheet.plan_note = "No plan sketch: no deflection angle is given for this bend."
        return
    sheet.plan = shape
    sheet.stations = station_texts(shape, units)


def build(project_or_path, bend_ids=None) -> SheetSet:
    """Evaluate the project and gather what every format prints. Unknown bend ids raise
    InputError naming them."""
    if isinstance(project_or_path, Project):
        project, notes, source = project_or_path, [], ""
    else:
        project, notes = load_project(project_or_path)
        source = str(project_or_path)
    ids = [b.id for b in project.bends]
    if bend_ids:
        unknown = [i for i in bend_ids if i not in ids]
        if unknown:
            raise InputError(
                f"no bend {', '.join(unknown)} in this project (bends: {', '.join(ids) or 'none'})"
            )
    ctx = project_context(project)
    units = ctx.units
    sheets = []
    layout = lay_out_project(project)
    outcomes = evaluate_project(project, ctx)
    report = alignment_report(project, layout, {o.bend.id: o.record for o in outcomes}, units)
    for outcome in outcomes:
        bend = outcome.bend
        if bend_ids and bend.id not in bend_ids:
            continue
        rec = outcome.record
        if rec is None:
            steps: list[Step] = []
        elif bend.kind == "road":
            steps = road_working(rec, ctx.table, units)
        else:
            steps = rail_working(rec, ctx.limits, units)
        speed = bend.inputs.get("speed")
        radius = bend.inputs.get("radius")
        sheet = BendSheet(
            bend_id=bend.id,
            kind=bend.kind,
            station=_station_text(bend.station, units),
            status=_status(outcome),
            speed="-" if speed is None else f"{_value_text(speed)} {units.speed_label}",
            radius="-" if radius is None else f"{_value_text(radius)} {units.length_label}",
            notes=bend.notes,
            inputs=_inputs(bend, units, layout.overrides.get(bend.id) if layout else None),
            blanks=_blanks(bend),
            standard=_standard(outcome, ctx, units),
            steps=steps,
            messages=[message_line(m) for m in rec.get("messages", [])] if rec else [],
            error=outcome.error,
        )
        _plan(outcome, units, sheet, layout)
        from curvetui.reports.sheet.crossfall import sheet_diagram

        sheet.diagram, sheet.diagram_note = sheet_diagram(rec, bend.kind)
        sheets.append(cleaned(sheet))
    if bend_ids and layout is not None and not set(bend_ids) & set(layout.bend_ids):
        report = None  # none of the bends printed is on the alignment (or it has an error)
    return SheetSet(project, source, units, sheets, cleaned(list(notes)), alignment=report)


def _station_text(value, units) -> str:
    number = to_number(value)
    return format_station(number, units.name) if math.isfinite(number) else _value_text(value)


def cleaned(obj):
    """``obj`` with every text in it (lists, tuples, dicts, sheets, steps) cleaned of
    control characters, bidirectional overrides and lone surrogates: what the user wrote
    prints as text in every format, and never holds the PDF's page-count alias (which is
    made of control characters: see layout.PAGES)."""
    if isinstance(obj, str):
        return clean(obj)
    if isinstance(obj, list | tuple):
        return type(obj)(cleaned(v) for v in obj)
    if isinstance(obj, dict):
        return {k: cleaned(v) for k, v in obj.items()}
    if isinstance(obj, Details):  # one-line texts (title block, footer): no line breaks
        changes = {
            f.name: clean(getattr(obj, f.name), one_line=True)
            for f in dataclasses.fields(obj)
            if isinstance(getattr(obj, f.name), str)
        }
        return dataclasses.replace(obj, **changes)
    if isinstance(obj, BendSheet | Step):  # the plan's own names are not text read
        changes = {
            f.name: cleaned(getattr(obj, f.name))
            for f in dataclasses.fields(obj)
            if isinstance(getattr(obj, f.name), str | list | tuple | dict | Step)
        }
        return dataclasses.replace(obj, **changes)
    return obj


def check_word(step: Step) -> str:
    """A working step's check as printed: PASS, FAIL or - (nothing to check)."""
    return {"pass": "PASS", "fail": "FAIL"}.get(step.check, "-")


def counts_line(s: SheetSet) -> str:
    """The summary's count line, e.g. "8 bends: 6 PASS, 2 FAIL, 0 ERROR"."""
    n = {k: sum(b.status == k for b in s.bends) for k in ("PASS", "FAIL", "ERROR")}
    word = "bend" if len(s.bends) == 1 else "bends"
    return f"{len(s.bends)} {word}: {n['PASS']} PASS, {n['FAIL']} FAIL, {n['ERROR']} ERROR"


SUMMARY_HEAD = ("Bend", "Kind", "Station", "Speed", "Radius", "Status")


def summary_rows(s: SheetSet) -> list[tuple[str, ...]]:
    """One row per bend for the summary table, in the columns of SUMMARY_HEAD."""
    return [(b.bend_id, b.kind, b.station, b.speed, b.radius, b.status) for b in s.bends]


def plan_lines(b: BendSheet) -> list[str]:
    """The plan's key points by station ("PC at 2+631.963"), or why there is no plan."""
    if b.plan is None:
        return [b.plan_note]
    order = sorted(b.plan.key_points, key=lambda p: p.station)
    return [f"{p.name} at {b.stations.get(p.name, '')}" for p in order]
