"""A realignment's worksheet as a PDF (fpdf2): page 1 the design summary, the designed
curve's rail verdicts and a vector diagram of measured and designed versines and of the
slews against station (TS, SC, CS, ST marked); then the slew table, running on to further
pages with its heading repeated. The footer (the caution, page n of N) is on every page,
as on the bend worksheets (reports.sheet.layout.new_pdf). A failed design or check is
printed in red, never left out."""

from __future__ import annotations

import math
from types import SimpleNamespace

from curvetui.reports.realign_sheet import RealignSheet, slew_note
from curvetui.reports.sheet.layout import (
    FONT,
    GREY,
    MARGIN,
    RED,
    headed_table,
    heading,
    page_of,
    status_colour,
)

PLOT_HEIGHT = 38.0  # mm, each of the two drawings
MEASURED = (0, 0, 0)
DESIGNED = (30, 60, 200)
SLEW = (170, 70, 0)
KEY = (0, 120, 60)


def _ticks(lo: float, hi: float, count: int = 5) -> list[float]:
    """Round values (1, 2 or 5 x 10^n apart) inside [lo, hi]."""
    if not (math.isfinite(lo) and math.isfinite(hi)) or hi <= lo:
        return []
    raw = (hi - lo) / count
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1, 2, 5, 10) if raw <= m * power * (1 + 1e-9))
    first, last = math.ceil(lo / step - 1e-9), math.floor(hi / step + 1e-9)
    return [round(i * step, 9) + 0.0 for i in range(first, last + 1)]


def _lines(pdf, items, col_widths=(48.0, 138.0)) -> None:
    """Label-value rows; a failing one in bold red."""
    from fpdf.fonts import FontFace

    with pdf.table(
        text_align="LEFT",
        col_widths=col_widths,
        first_row_as_headings=False,
        line_height=3.6,
        padding=0.5,
        width=sum(col_widths),
        align="LEFT",
    ) as table:
        for x in items:
            row = table.row()
            row.cell(x.label, style=FontFace(emphasis="BOLD"))
            if x.fail:
                row.cell(x.value, style=FontFace(emphasis="BOLD", color=RED))
            else:
                row.cell(x.value)


def _plot(pdf, s: RealignSheet, x0, y0, w, h, series, y_name, hlines=(), holds=()) -> None:
    """Lines of (values, colour, width, dash) against the survey's stations in the box."""
    xs = s.stations
    xa, xb = xs[0], xs[-1]
    values = [v for vs, *_ in series for v in vs] + [v for v, *_ in hlines] + [0.0]
    lo, hi = min(values), max(values)
    pad = 0.08 * ((hi - lo) or 1.0)
    lo, hi = lo - pad, hi + pad

    def px(x):
        return x0 + (x - xa) / ((xb - xa) or 1.0) * w

    def py(y):
        return y0 + h - (y - lo) / (hi - lo) * h

    pdf.set_draw_color(150, 150, 150)
    pdf.set_line_width(0.2)
    pdf.rect(x0, y0, w, h)
    pdf.set_font(FONT, "", 5.5)
    pdf.set_draw_color(215, 215, 215)
    for t in _ticks(lo, hi, 4):
        pdf.line(x0, py(t), x0 + w, py(t))
        text = f"{t:g}"
        pdf.text(x0 - pdf.get_string_width(text) - 1, py(t) + 0.8, text)
    for t in _ticks(xa, xb, 8):
        pdf.line(px(t), y0 + h, px(t), y0 + h + 1)
        text = f"{t:g}"
        pdf.text(px(t) - pdf.get_string_width(text) / 2, y0 + h + 3.4, text)
    pdf.text(x0 - 9, y0 - 1, y_name)
    for name, station in s.keys:  # key stations: green dashed, named at the top
        pdf.set_draw_color(*KEY)
        pdf.set_dash_pattern(dash=1.2, gap=0.8)
        pdf.line(px(station), y0, px(station), y0 + h)
        pdf.set_dash_pattern()
        pdf.set_text_color(*KEY)
        pdf.set_font(FONT, "B", 5.5)
        pdf.text(px(station) - pdf.get_string_width(name) / 2, y0 - 0.8, name)
        pdf.set_text_color(0, 0, 0)
        pdf.set_font(FONT, "", 5.5)
    for value, colour, text in hlines:  # limits: dashed
        pdf.set_draw_color(*colour)
        pdf.set_dash_pattern(dash=0.8, gap=0.8)
        pdf.line(x0, py(value), x0 + w, py(value))
        pdf.set_dash_pattern()
        pdf.set_text_color(*colour)
        pdf.text(x0 + w - pdf.get_string_width(text) - 0.5, py(value) - 0.6, text)
        pdf.set_text_color(0, 0, 0)
    for vs, colour, width, dash in series:
        pdf.set_draw_color(*colour)
        pdf.set_line_width(width)
        pdf.set_dash_pattern(*(dash or ()))
        pdf.polyline([(px(x), py(v)) for x, v in zip(xs, vs, strict=True)])
        pdf.set_dash_pattern()
    pdf.set_line_width(0.2)
    pdf.set_draw_color(0, 0, 0)
    for station, value in holds:  # hold points: small triangles
        x, y = px(station), py(value)
        pdf.polygon([(x, y - 1.2), (x - 1.0, y + 0.6), (x + 1.0, y + 0.6)], style="D")


def _diagrams(pdf, s: RealignSheet) -> None:
    ln, cl = s.units.length_label, s.units.cant_label
    heading(pdf, "Measured and designed versines; slews")
    x0, w = MARGIN + 10, pdf.w - 2 * MARGIN - 12
    top = pdf.get_y() + 4
    _plot(
        pdf,
        s,
        x0,
        top,
        w,
        PLOT_HEIGHT,
        [(s.measured, MEASURED, 0.35, None), (s.designed, DESIGNED, 0.5, (1.6, 0.9))],
        f"versine {cl}",
    )
    top2 = top + PLOT_HEIGHT + 10
    hl = []
    if s.slew_limit is not None:
        hl = [(s.slew_limit, RED, "limit"), (-s.slew_limit, RED, "limit")]
    holds = []
    for h in s.holds:
        i = min(range(len(s.stations)), key=lambda j: abs(s.stations[j] - h))
        holds.append((s.stations[i], s.slews[i]))
    _plot(pdf, s, x0, top2, w, PLOT_HEIGHT, [(s.slews, SLEW, 0.5, None)], f"slew {cl}", hl, holds)
    pdf.set_xy(MARGIN, top2 + PLOT_HEIGHT + 5)
    pdf.set_font(FONT, "", 5.8)
    pdf.set_text_color(*GREY)
    pdf.multi_cell(
        0,
        2.8,
        f"Top: measured versines (solid black) and designed (dashed blue). Bottom: slew (+ out, "
        f"away from the centre), red dashed: the slew limit, triangles: hold points. Green "
        f"dashed: TS, SC, CS, ST. Station in {ln} across.",
        new_x="LMARGIN",
        new_y="NEXT",
    )
    pdf.set_text_color(0, 0, 0)


def make_pdf(s: RealignSheet, paper: str = "a4", details=None):
    """The FPDF document of the sheet; ``details`` (a project's, cleaned) for the footer,
    else one naming the survey."""
    from curvetui.reports.sheet.layout import new_pdf
    from curvetui.storage.project.model import Details

    d = details or Details(name=f"Realignment of survey {s.survey}", units=s.units.name)
    pdf = new_pdf(SimpleNamespace(details=d), paper)
    pdf.set_title(f"Realignment worksheet - {s.survey}")
    pdf.add_page()
    pdf.set_font(FONT, "B", 13)
    pdf.cell(130, 7, "Realignment worksheet")
    pdf.set_text_color(*status_colour(s.status))
    pdf.cell(0, 7, s.status, align="R", new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)
    pdf.set_font(FONT, "", 7.5)
    pdf.multi_cell(
        0,
        3.8,
        f"Survey {s.survey} · units {s.units.name} · {page_of(1)}",
        new_x="LMARGIN",
        new_y="NEXT",
    )
    heading(pdf, "Design")
    _lines(pdf, s.design)
    heading(pdf, "Rail checks of the designed curve")
    _lines(pdf, s.rail)
    if s.notes:
        pdf.set_font(FONT, "", 6.5)
        for n in s.notes:
            pdf.multi_cell(0, 3.0, f"Note: {n}", new_x="LMARGIN", new_y="NEXT")
        pdf.set_font(FONT, "", 7.5)
    if s.has_design:
        if pdf.get_y() + 2 * PLOT_HEIGHT + 32 > pdf.page_break_trigger:
            pdf.add_page()
        _diagrams(pdf, s)
        pdf.add_page()
        heading(pdf, f"Slew table · survey {s.survey}")
        pdf.set_font(FONT, "", 6.5)
        pdf.multi_cell(0, 3.2, slew_note(s.units), new_x="LMARGIN", new_y="NEXT")
        pdf.ln(1)
        pdf.set_font(FONT, "", 7)
        with headed_table(pdf, (30, 30, 30, 30, 30), 3.6, 0.5, width=150, align="LEFT") as t:
            t.row(s.head)
            for r in s.table:
                t.row(r)
    else:
        pdf.set_font(FONT, "B", 8)
        pdf.set_text_color(*RED)
        pdf.multi_cell(0, 4, "No designed curve: no slew table.", new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(0, 0, 0)
    return pdf


def render_pdf(s: RealignSheet, paper: str = "a4", details=None) -> bytes:
    """The sheet as PDF bytes (fonts embedded)."""
    return bytes(make_pdf(s, paper, details).output())
