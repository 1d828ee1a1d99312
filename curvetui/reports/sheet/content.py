"""Printable bend worksheets: a project summary page, then one page per bend with its title
block, inputs, the standard in use, the working step by step, the messages and a plan
sketch drawn in vector lines. The same content renders as PDF, plain text or Markdown.

Every page carries ``curvetui.CAUTION``; a failed check is printed as FAIL.
"""

from __future__ import annotations

import math
import os
import tempfile
from dataclasses import dataclass, field
from importlib import resources
from pathlib import Path

from curvetui import CAUTION, __version__
from curvetui.bends import RAIL_FIELD_ORDER, ROAD_FIELD_ORDER
from curvetui.core.circular import GeometryError
from curvetui.inputs import InputError
from curvetui.project.checking import Context, Outcome, evaluate_project, project_context
from curvetui.project.files import load_project
from curvetui.project.model import Project
from curvetui.results import unit_label
from curvetui.stations import format_station
from curvetui.working import Step, rail_working, road_working

PAPERS = ("a4", "letter")
FIELD_ORDER = {"road": ROAD_FIELD_ORDER, "rail": RAIL_FIELD_ORDER}
FIELD_NAMES = {
    "speed": "Design speed",
    "low_speed": "Slow train speed",
    "radius": "Radius",
    "deflection": "Deflection angle",
    "pi_station": "PI station",
    "superelevation": "Superelevation given",
    "emax": "Max. superelevation e_max",
    "friction": "Side friction f given",
    "cant": "Applied cant",
    "gauge": "Track gauge",
    "spiral_in": "Spiral / transition in",
    "spiral_out": "Spiral / transition out",
    "obstruction_offset": "Obstruction offset",
    "grade": "Grade",
    "lane_width": "Lane width",
}
UNIT_KIND = {
    "speed": "speed",
    "low_speed": "speed",
    "radius": "length",
    "deflection": "deg",
    "pi_station": "station",
    "superelevation": "%",
    "emax": "%",
    "friction": "",
    "cant": "cant",
    "gauge": "mm",
    "spiral_in": "length",
    "spiral_out": "length",
    "obstruction_offset": "length",
    "grade": "%",
    "lane_width": "length",
}
DEFAULTS = {
    "superelevation": "design value",
    "emax": "table default",
    "friction": "table f_max",
    "gauge": "1435 mm",
    "spiral_out": "= spiral in",
}


# -- the content, shared by every format ------------------------------------------------
@dataclass
class BendSheet:
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
    plan: object | None = None  # pictures.PlanShape
    plan_note: str = ""
    stations: dict[str, str] = field(default_factory=dict)


@dataclass
class SheetSet:
    project: Project
    source: str
    units: object
    bends: list[BendSheet]
    notes: list[str]

    @property
    def pages(self) -> int:
        return 1 + len(self.bends)

    def title_fields(self, sheet: BendSheet, page: int) -> list[tuple[str, str]]:
        d = self.project.details
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


def _inputs(bend, units) -> list[tuple[str, str, str]]:
    rows = []
    for key in FIELD_ORDER.get(bend.kind, ()):
        value = bend.inputs.get(key)
        kind = UNIT_KIND[key]
        unit = {"deg": "deg", "station": units.length_label}.get(kind, unit_label(kind, units))
        if value is None or value == "":
            continue
        if key == "pi_station" and isinstance(value, int | float):
            text, unit = format_station(float(value), units.name), ""
        else:
            text = _value_text(value)
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
                    f"{rec['min_radius']:.1f} {units.length_label} "
                    f"(table rounds to {rec['min_radius_rounded']:g} {units.length_label})",
                ),
            ]
        return rows
    lim = ctx.limits
    rows = [("Rail limits", f"{lim.title} [{lim.name}]"), ("Source", lim.source)]
    if rec:
        cl = units.cant_label
        excess = rec.get("excess_limit")
        rows += [
            ("Cant limit", f"{rec['cant_limit']:g} {cl}"),
            ("Cant deficiency limit", f"{rec['deficiency_limit']:g} {cl}"),
            ("Cant excess limit", "none set" if excess is None else f"{excess:g} {cl}"),
            ("Distance between rail centres s", f"{rec['rail_centres']:g} {cl}"),
        ]
    return rows


def _plan(outcome: Outcome, units, sheet: BendSheet) -> None:
    from curvetui import pictures

    if outcome.record is None:
        sheet.plan_note = "No plan: the inputs have an error."
        return
    radius = units.length_to_si(outcome.record["radius"])
    try:
        shape = pictures.plan_for_inputs(outcome.bend.inputs, units, radius)
    except (InputError, GeometryError) as exc:
        sheet.plan_note = f"No plan: {exc}"
        return
    if shape is None:
        sheet.plan_note = "No plan sketch: no deflection angle is given for this bend."
        return
    sheet.plan = shape
    sheet.stations = pictures.station_texts(shape, units)


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
    for outcome in evaluate_project(project, ctx):
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
            station=format_station(float(bend.station), units.name),
            status=_status(outcome),
            speed="-" if speed is None else f"{_value_text(speed)} {units.speed_label}",
            radius="-" if radius is None else f"{_value_text(radius)} {units.length_label}",
            notes=bend.notes,
            inputs=_inputs(bend, units),
            blanks=_blanks(bend),
            standard=_standard(outcome, ctx, units),
            steps=steps,
            messages=list(rec.get("messages", [])) if rec else [],
            error=outcome.error,
        )
        _plan(outcome, units, sheet)
        sheets.append(sheet)
    return SheetSet(project, source, units, sheets, list(notes))


def _check(step: Step) -> str:
    return {"pass": "PASS", "fail": "FAIL"}.get(step.check, "-")


def _counts(s: SheetSet) -> str:
    n = {k: sum(b.status == k for b in s.bends) for k in ("PASS", "FAIL", "ERROR")}
    word = "bend" if len(s.bends) == 1 else "bends"
    return f"{len(s.bends)} {word}: {n['PASS']} PASS, {n['FAIL']} FAIL, {n['ERROR']} ERROR"


SUMMARY_HEAD = ("Bend", "Kind", "Station", "Speed", "Radius", "Status")


def _summary_rows(s: SheetSet) -> list[tuple[str, ...]]:
    return [(b.bend_id, b.kind, b.station, b.speed, b.radius, b.status) for b in s.bends]


def _plan_lines(b: BendSheet) -> list[str]:
    if b.plan is None:
        return [b.plan_note]
    order = sorted(b.plan.key_points, key=lambda p: p.station)
    return [f"{p.name} at {b.stations.get(p.name, '')}" for p in order]


# -- plain text ---------------------------------------------------------------------------
def render_text(project_or_path, bend_ids=None, paper: str = "a4") -> str:
    """The worksheets as plain text, pages separated by form feeds."""
    s = build(project_or_path, bend_ids)
    d = s.project.details
    pages = []
    out = [
        f"BEND WORKSHEETS - {d.name}",
        f"Client: {d.client or '-'}   Job: {d.job_number or '-'}   Drawing: {d.drawing or '-'}",
        f"Designer: {d.designer or '-'}   Checker: {d.checker or '-'}   Date: {d.date or '-'}"
        f"   Revision: {d.revision or '-'}   Units: {s.units.name}",
        f"page 1 of {s.pages}",
        "",
        _counts(s),
        "",
    ]
    rows = [SUMMARY_HEAD, *_summary_rows(s)]
    widths = [max(len(r[i]) for r in rows) for i in range(len(SUMMARY_HEAD))]
    for r in rows:
        out.append("  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)).rstrip())
    out += [f"NOTE {n}" for n in s.notes]
    out += ["", CAUTION]
    pages.append("\n".join(out))
    for page, b in enumerate(s.bends, start=2):
        out = [f"BEND WORKSHEET {b.bend_id}", ""]
        for k, v in s.title_fields(b, page):
            out.append(f"{k + ':':<12} {v}")
        if b.notes:
            out.append(f"{'Notes:':<12} {b.notes}")
        out += ["", "INPUTS"]
        out += [f"  {n}: {v} {u}".rstrip() for n, v, u in b.inputs]
        if b.blanks:
            out.append(f"  Left blank, default used: {'; '.join(b.blanks)}")
        out += ["", "STANDARD IN USE"]
        out += [f"  {k}: {v}" for k, v in b.standard]
        out += ["", "WORKING"]
        if b.error:
            out.append(f"  ERROR {b.error}")
        for i, st in enumerate(b.steps, start=1):
            out += [
                f"  {i}. {st.label}  [{_check(st)}]",
                f"     {st.formula}",
                f"     {st.substituted}",
                f"     = {st.result}",
                f"     source: {st.source}",
            ]
        out += ["", "MESSAGES"]
        out += [f"  {m}" for m in b.messages] or ["  none"]
        out += ["", "PLAN"]
        out += [f"  {line}" for line in _plan_lines(b)]
        out += ["", CAUTION]
        pages.append("\n".join(out))
    return "\n\f\n".join(pages) + "\n"


# -- Markdown -----------------------------------------------------------------------------
def _md(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def render_markdown(project_or_path, bend_ids=None, paper: str = "a4") -> str:
    """The worksheets as Markdown: a heading per page, tables for the summary and working."""
    s = build(project_or_path, bend_ids)
    d = s.project.details
    out = [
        f"# Bend worksheets: {_md(d.name)}",
        "",
        f"Client: {_md(d.client or '-')} · Job: {_md(d.job_number or '-')} · "
        f"Drawing: {_md(d.drawing or '-')} · Designer: {_md(d.designer or '-')} · "
        f"Checker: {_md(d.checker or '-')} · Date: {_md(d.date or '-')} · "
        f"Revision: {_md(d.revision or '-')} · Units: {s.units.name} · page 1 of {s.pages}",
        "",
        f"**{_counts(s)}**",
        "",
        "| " + " | ".join(SUMMARY_HEAD) + " |",
        "|" + "---|" * len(SUMMARY_HEAD),
    ]
    for r in _summary_rows(s):
        cells = [*r[:-1], f"**{r[-1]}**" if r[-1] != "PASS" else r[-1]]
        out.append("| " + " | ".join(_md(c) for c in cells) + " |")
    out += [f"\n> NOTE {_md(n)}" for n in s.notes]
    out += ["", f"> {CAUTION}", ""]
    for page, b in enumerate(s.bends, start=2):
        out += ["---", "", f"## Bend {_md(b.bend_id)}: **{b.status}**", ""]
        out += ["| Field | Value |", "|---|---|"]
        out += [f"| {k} | {_md(v)} |" for k, v in s.title_fields(b, page)]
        if b.notes:
            out.append(f"| Notes | {_md(b.notes)} |")
        out += ["", "### Inputs", "", "| Input | Value | Unit |", "|---|---|---|"]
        out += [f"| {_md(n)} | {_md(v)} | {_md(u)} |" for n, v, u in b.inputs]
        if b.blanks:
            out += ["", f"Left blank, default used: {_md('; '.join(b.blanks))}"]
        out += ["", "### Standard in use", ""]
        out += [f"- **{_md(k)}:** {_md(v)}" for k, v in b.standard]
        out += ["", "### Working", ""]
        if b.error:
            out += [f"**ERROR** {_md(b.error)}", ""]
        if b.steps:
            out += [
                "| # | Step | Formula | Substituted | Answer | Source | Check |",
                "|---|---|---|---|---|---|---|",
            ]
            for i, st in enumerate(b.steps, start=1):
                chk = _check(st)
                out.append(
                    f"| {i} | {_md(st.label)} | `{_md(st.formula)}` | `{_md(st.substituted)}` | "
                    f"{_md(st.result)} | {_md(st.source)} | "
                    f"{'**FAIL**' if chk == 'FAIL' else chk} |"
                )
        out += ["", "### Messages", ""]
        out += [f"- {_md(m)}" for m in b.messages] or ["- none"]
        out += ["", "### Plan key points", ""]
        out += [f"- {_md(line)}" for line in _plan_lines(b)]
        out += ["", f"> {CAUTION}", ""]
    return "\n".join(out)


# -- PDF ----------------------------------------------------------------------------------
FONT = "DejaVu"
RED = (180, 0, 0)
GREEN = (0, 110, 40)
GREY = (110, 110, 110)
PLAN_HEIGHTS = (62.0, 52.0, 42.0)  # mm, the plan sketch's least height, tried in turn


def _fonts_dir():
    return resources.files("curvetui") / "data" / "fonts"


def _new_pdf(s: SheetSet, paper: str):
    from fpdf import FPDF

    if paper not in PAPERS:
        raise InputError(f"--paper must be one of {', '.join(PAPERS)}; got {paper!r}")
    d = s.project.details

    class _PDF(FPDF):
        def footer(self):
            self.set_y(-17)
            self.set_draw_color(*GREY)
            self.line(self.l_margin, self.get_y(), self.w - self.r_margin, self.get_y())
            self.set_font(FONT, "B", 7.5)
            self.set_text_color(0, 0, 0)
            self.multi_cell(0, 3.6, CAUTION, align="L", new_x="LMARGIN", new_y="NEXT")
            self.set_font(FONT, "", 6.5)
            self.set_text_color(*GREY)
            self.cell(
                0,
                3.4,
                f"{d.name} · {d.job_number or '-'} · rev {d.revision or '-'} · "
                f"curvetui {__version__}",
            )
            self.set_x(self.l_margin)
            self.cell(0, 3.4, f"page {self.page_no()} of {{nb}}", align="R")
            self.set_text_color(0, 0, 0)

    pdf = _PDF(orientation="P", unit="mm", format=paper.upper() if paper == "a4" else "Letter")
    fonts = _fonts_dir()
    with resources.as_file(fonts / "DejaVuSans.ttf") as regular:
        pdf.add_font(FONT, "", str(regular))
    with resources.as_file(fonts / "DejaVuSans-Bold.ttf") as bold:
        pdf.add_font(FONT, "B", str(bold))
    pdf.set_title(f"Bend worksheets - {d.name}")
    pdf.set_author(d.designer or "")
    pdf.set_creator(f"curvetui {__version__}")
    pdf.set_margins(12, 12, 12)
    pdf.set_auto_page_break(True, margin=20)
    return pdf


def _make_pdf(s: SheetSet, paper: str):
    """The summary, then each bend on one page: a bend whose page overflows is drawn again
    with a shorter plan sketch (down to the least of PLAN_HEIGHTS)."""
    choice = [0] * len(s.bends)
    while True:
        pdf = _new_pdf(s, paper)
        _pdf_summary(pdf, s)
        overflowed = False
        for i, b in enumerate(s.bends):
            before = pdf.page
            _pdf_bend(pdf, s, b, i + 2, PLAN_HEIGHTS[choice[i]])
            if pdf.page > before + 1 and choice[i] + 1 < len(PLAN_HEIGHTS):
                choice[i] += 1
                overflowed = True
        if not overflowed:
            return pdf


def _heading(pdf, text: str, size: float = 9.5) -> None:
    pdf.ln(1.5)
    pdf.set_font(FONT, "B", size)
    pdf.cell(0, 5, text, new_x="LMARGIN", new_y="NEXT")
    pdf.set_font(FONT, "", 7.5)


def _status_colour(text: str):
    return RED if text in ("FAIL", "ERROR") else (GREEN if text == "PASS" else (0, 0, 0))


def _pdf_summary(pdf, s: SheetSet) -> None:
    from fpdf.fonts import FontFace

    d = s.project.details
    pdf.add_page()
    pdf.set_font(FONT, "B", 15)
    pdf.cell(0, 8, "Bend worksheets: project summary", new_x="LMARGIN", new_y="NEXT")
    pdf.set_font(FONT, "B", 11)
    pdf.multi_cell(0, 5.5, d.name, new_x="LMARGIN", new_y="NEXT")
    pdf.ln(1)
    pdf.set_font(FONT, "", 8)
    info = [
        ("Client", d.client),
        ("Job number", d.job_number),
        ("Drawing", d.drawing),
        ("Designer", d.designer),
        ("Checker", d.checker),
        ("Date", d.date),
        ("Revision", d.revision),
        ("Units", s.units.name),
        ("Sheet", "page 1 of {nb}"),
    ]
    with pdf.table(
        text_align="LEFT",
        col_widths=(30, 156),
        first_row_as_headings=False,
        line_height=4.6,
        padding=1,
    ) as table:
        for k, v in info:
            row = table.row()
            row.cell(k, style=FontFace(emphasis="BOLD"))
            row.cell(v or "-")
    _heading(pdf, _counts(s), 10)
    pdf.set_font(FONT, "", 8.5)
    with pdf.table(
        text_align="LEFT",
        col_widths=(26, 18, 30, 30, 30, 22),
        line_height=5,
        padding=1,
        headings_style=FontFace(emphasis="BOLD", fill_color=(225, 225, 225)),
    ) as table:
        table.row(SUMMARY_HEAD)
        for r in _summary_rows(s):
            row = table.row()
            for c in r[:-1]:
                row.cell(c)
            row.cell(r[-1], style=FontFace(emphasis="BOLD", color=_status_colour(r[-1])))
    for n in s.notes:
        pdf.ln(1)
        pdf.multi_cell(0, 4, f"NOTE {n}", new_x="LMARGIN", new_y="NEXT")
    pdf.ln(2)
    pdf.set_font(FONT, "", 7.5)
    pdf.set_text_color(*GREY)
    pdf.multi_cell(
        0,
        3.8,
        "Each following page is one bend's worksheet: its inputs, the standard in use, the "
        "working line by line (formula, values substituted, answer, source and check) for "
        "checking by hand, its messages and a plan sketch.",
        new_x="LMARGIN",
        new_y="NEXT",
    )
    pdf.set_text_color(0, 0, 0)


def _pdf_title_block(pdf, s: SheetSet, b: BendSheet, page: int) -> None:
    from fpdf.fonts import FontFace

    pdf.set_font(FONT, "B", 13)
    pdf.cell(120, 7, f"Bend worksheet {b.bend_id}")
    pdf.set_text_color(*_status_colour(b.status))
    pdf.cell(0, 7, b.status, align="R", new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)
    pdf.set_font(FONT, "", 7.5)
    fields = [
        (k, f"page {pdf.page_no()} of {{nb}}" if k == "Sheet" else v)
        for k, v in s.title_fields(b, page)
    ]
    label = FontFace(emphasis="BOLD", fill_color=(235, 235, 235))
    with pdf.table(
        text_align="LEFT",
        col_widths=(20, 42, 20, 42, 20, 42),
        first_row_as_headings=False,
        line_height=4.2,
        padding=0.8,
    ) as table:
        for i in range(0, len(fields), 3):
            row = table.row()
            for k, v in fields[i : i + 3]:
                row.cell(k, style=label)
                if k == "Status":
                    row.cell(v, style=FontFace(emphasis="BOLD", color=_status_colour(v)))
                else:
                    row.cell(v)
    if b.notes:
        pdf.set_font(FONT, "", 7)
        pdf.multi_cell(0, 3.6, f"Notes: {b.notes}", new_x="LMARGIN", new_y="NEXT")


def _pdf_bend(pdf, s: SheetSet, b: BendSheet, page: int, plan_height: float) -> None:
    from fpdf.fonts import FontFace

    pdf.add_page()
    _pdf_title_block(pdf, s, b, page)
    head = FontFace(emphasis="BOLD", fill_color=(225, 225, 225))
    top = pdf.get_y() + 1.5
    # inputs on the left, the plan sketch on the right, the standard in use below both
    pdf.set_y(top)
    _heading(pdf, "Inputs")
    with pdf.table(
        text_align="LEFT",
        col_widths=(40, 34, 12),
        width=86,
        align="LEFT",
        line_height=3.6,
        padding=0.5,
        headings_style=head,
    ) as table:
        table.row(("Input", "Value", "Unit"))
        for n, v, u in b.inputs:
            table.row((n, v, u))
    if b.blanks:
        pdf.set_font(FONT, "", 6.5)
        pdf.multi_cell(
            86,
            3.2,
            f"Left blank, default used: {'; '.join(b.blanks)}",
            align="L",
            new_x="LMARGIN",
            new_y="NEXT",
        )
        pdf.set_font(FONT, "", 7.5)
    left_end = pdf.get_y()
    pdf.set_xy(102, top)
    pdf.set_left_margin(102)
    _heading(pdf, "Plan sketch (not to a true bearing)")
    plan_top = pdf.get_y()
    pdf.set_left_margin(12)
    plan_h = max(left_end - plan_top, plan_height)
    _pdf_plan(pdf, b, s.units, 102, plan_top, pdf.w - 12 - 102, plan_h)
    pdf.set_xy(12, max(left_end, plan_top + plan_h))
    _heading(pdf, "Standard in use")
    with pdf.table(
        text_align="LEFT",
        col_widths=(36, 150),
        first_row_as_headings=False,
        line_height=3.5,
        padding=0.5,
    ) as table:
        for k, v in b.standard:
            row = table.row()
            row.cell(k, style=FontFace(emphasis="BOLD"))
            row.cell(v)
    _heading(pdf, "Working (check each line by hand)")
    if b.error:
        pdf.set_text_color(*RED)
        pdf.set_font(FONT, "B", 8)
        pdf.multi_cell(0, 4, f"ERROR {b.error}", new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(0, 0, 0)
        pdf.set_font(FONT, "", 7.5)
    if b.steps:
        pdf.set_font(FONT, "", 6.8)
        with pdf.table(
            text_align="LEFT",
            col_widths=(5, 30, 44, 56, 40, 11),
            line_height=3.2,
            padding=0.5,
            headings_style=head,
        ) as table:
            table.row(("#", "Step", "Formula", "Values substituted", "Answer", "Check"))
            src = FontFace(color=GREY, size_pt=6)
            for i, st in enumerate(b.steps, start=1):
                row = table.row()
                for c in (str(i), st.label, st.formula, st.substituted, st.result):
                    row.cell(c)
                chk = _check(st)
                row.cell(chk, style=FontFace(emphasis="BOLD", color=_status_colour(chk)))
                row = table.row()
                row.cell("")
                row.cell(f"source: {st.source}", colspan=5, style=src)
    _heading(pdf, "Messages")
    pdf.set_font(FONT, "", 7.5)
    for m in b.messages or ["none"]:
        bad = m.startswith(("FAIL", "ERROR"))
        pdf.set_text_color(*(RED if bad else (0, 0, 0)))
        pdf.set_font(FONT, "B" if bad else "", 7.5)
        pdf.multi_cell(0, 3.8, m, new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)


def _overlap(a, b) -> bool:
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def _nice_step(length: float) -> float:
    """A round scale-bar length near a fifth of ``length``."""
    raw = max(length / 5, 1e-9)
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 5, 10):
        if m * mag >= raw:
            return m * mag
    return 10 * mag


def _pdf_plan(pdf, b: BendSheet, units, x0: float, y0: float, w: float, h: float) -> None:
    """The bend in plan (metres) scaled to the box (x0, y0, w, h) [mm], in vector lines;
    the scale bar and radius are given in the project's length unit."""
    from curvetui.pictures import ARC, TANGENT

    if b.plan is None:
        pdf.set_font(FONT, "", 7.5)
        pdf.set_xy(x0, y0)
        pdf.multi_cell(w, 3.8, b.plan_note, new_x="LEFT", new_y="NEXT")
        return
    shape = b.plan
    pdf.set_draw_color(150, 150, 150)
    pdf.set_line_width(0.2)
    pdf.rect(x0, y0, w, h)
    xmin, xmax, ymin, ymax = shape.bounds()
    pad_x, pad_y = 16.0, 9.0  # mm kept clear for labels
    span_x, span_y = max(xmax - xmin, 1e-9), max(ymax - ymin, 1e-9)
    scale = min((w - 2 * pad_x) / span_x, (h - 2 * pad_y) / span_y)
    cx, cy = (xmin + xmax) / 2, (ymin + ymax) / 2

    def at(x, y):  # plan metres to page mm; plan +y is drawn upwards
        return x0 + w / 2 + (x - cx) * scale, y0 + h / 2 - (y - cy) * scale

    for part in shape.parts:
        pts = [at(x, y) for x, y in zip(part.x, part.y, strict=True)]
        if len(pts) < 2:
            continue
        if part.kind == TANGENT:
            pdf.set_draw_color(90, 90, 90)
            pdf.set_line_width(0.3)
            pdf.set_dash_pattern(dash=1.5, gap=1)
        elif part.kind == ARC:
            pdf.set_draw_color(0, 0, 0)
            pdf.set_line_width(0.6)
            pdf.set_dash_pattern()
        else:
            pdf.set_draw_color(30, 60, 160)
            pdf.set_line_width(0.45)
            pdf.set_dash_pattern()
        pdf.polyline(pts)
    pdf.set_dash_pattern()
    # key points, labelled outward from the arc centre
    ccx, ccy = at(*shape.centre)
    pdf.set_font(FONT, "", 6.5)
    pdf.set_draw_color(0, 0, 0)
    pdf.set_line_width(0.2)
    placed: list[tuple[float, float, float, float]] = []
    for p in sorted(shape.key_points, key=lambda p: p.station):
        px, py = at(p.x, p.y)
        pdf.set_fill_color(255, 255, 255)
        pdf.ellipse(px - 0.8, py - 0.8, 1.6, 1.6, style="DF")
        dx, dy = px - ccx, py - ccy
        n = math.hypot(dx, dy) or 1.0
        ux, uy = dx / n, dy / n
        text = f"{p.name} {b.stations.get(p.name, '')}"
        tw = pdf.get_string_width(text)
        lx = px + ux * 3 - (tw if ux < -0.3 else (tw / 2 if abs(ux) <= 0.3 else 0))
        ly = py + uy * 3 + (1.2 if uy > 0 else -0.2)
        lx = min(max(lx, x0 + 1), x0 + w - tw - 1)
        base = ly
        for shift in (0, 2.8, -2.8, 5.6, -5.6, 8.4, -8.4):
            ly = min(max(base + shift, y0 + 7), y0 + h - 7)
            box = (lx, ly - 2.4, lx + tw, ly + 0.4)
            if not any(_overlap(box, other) for other in placed):
                break
        placed.append(box)
        pdf.text(lx, ly, text)
    # scale bar and legend
    ln = units.length_label
    bar = _nice_step(float(units.length_from_si(span_x)))  # in the project's unit
    bar_mm = float(units.length_to_si(bar)) * scale
    bx, by = x0 + 4, y0 + h - 4
    pdf.set_line_width(0.4)
    pdf.line(bx, by, bx + bar_mm, by)
    pdf.line(bx, by - 1, bx, by + 1)
    pdf.line(bx + bar_mm, by - 1, bx + bar_mm, by + 1)
    pdf.text(bx, by - 1.5, f"{bar:g} {ln}")
    radius = float(units.length_from_si(shape.radius))
    hand = "right-hand" if shape.direction > 0 else "left-hand"
    pdf.set_text_color(*GREY)
    pdf.set_font(FONT, "", 6)
    pdf.text(
        x0 + 2,
        y0 + 3,
        f"{hand} bend, R {radius:g} {ln}, deflection {math.degrees(shape.deflection):.3f} deg",
    )
    pdf.text(x0 + 2, y0 + 5.6, "thick: arc · blue: spirals · dashed: tangents")
    pdf.set_text_color(0, 0, 0)


def render_pdf(project_or_path, bend_ids=None, paper: str = "a4") -> bytes:
    """The worksheets as a PDF (fonts embedded): a summary page, then a page per bend."""
    s = build(project_or_path, bend_ids)
    return bytes(_make_pdf(s, paper).output())


RENDERERS = {"pdf": render_pdf, "text": render_text, "md": render_markdown}


def atomic_write_bytes(path: str | Path, data: bytes) -> None:
    """Replace ``path`` with ``data`` via a temporary file beside it, fsync and rename."""
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    fd, tmp = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=folder)
    try:
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, target)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def sheets_path(project_path: str | Path) -> Path:
    """PROJECT.sheets.pdf beside PROJECT.json."""
    p = Path(project_path)
    return p.with_name(f"{p.stem if p.suffix == '.json' else p.name}.sheets.pdf")


def write_sheets(session, current=None) -> Path:
    """Write the worksheets of every bend of the session's project (as edited, saved or not)
    beside its file and return the path. ``current`` (the bend on screen) is accepted for the
    app's call; every bend is printed."""
    if session.path is None:
        raise InputError("save the project first: its worksheets are written beside its file")
    out = sheets_path(session.path)
    atomic_write_bytes(out, render_pdf(session.project))
    return out
