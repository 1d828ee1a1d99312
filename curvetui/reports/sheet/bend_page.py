"""A bend's PDF page: title block, inputs beside the plan sketch, standard, working, messages."""

from __future__ import annotations

from curvetui.reports.sheet.content import BendSheet, SheetSet, check_word
from curvetui.reports.sheet.layout import (
    FONT,
    GREY,
    INPUTS_WIDTH,
    MARGIN,
    PLAN_X,
    RED,
    headed_table,
    heading,
    key_value_table,
    page_of,
    status_colour,
)
from curvetui.reports.sheet.plan_sketch import pdf_plan


def _title_block(pdf, s: SheetSet, b: BendSheet, page: int) -> None:
    """The page's title and status, the title block in three label-value pairs a row, and
    the bend's notes."""
    from fpdf.fonts import FontFace

    pdf.set_font(FONT, "B", 13)
    pdf.cell(120, 7, f"Bend worksheet {b.bend_id}")
    pdf.set_text_color(*status_colour(b.status))
    pdf.cell(0, 7, b.status, align="R", new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)
    pdf.set_font(FONT, "", 7.5)
    fields = [
        (k, page_of(pdf.page_no()) if k == "Sheet" else v) for k, v in s.title_fields(b, page)
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
                    row.cell(v, style=FontFace(emphasis="BOLD", color=status_colour(v)))
                else:
                    row.cell(v)
    if b.notes:
        pdf.set_font(FONT, "", 7)
        pdf.multi_cell(0, 3.6, f"Notes: {b.notes}", new_x="LMARGIN", new_y="NEXT")


def _numbers(lines: list[int]) -> str:
    """'1-3, 5' for lines 1, 2, 3 and 5."""
    parts, start = [], lines[0]
    for a, b in zip(lines, [*lines[1:], None], strict=True):
        if b != a + 1:
            parts.append(str(start) if start == a else f"{start}-{a}")
            start = b
    return ", ".join(parts)


def _working(pdf, b: BendSheet, compact: bool = False) -> None:
    """The working table: a row per step (formula, values substituted, answer, check) and
    its source below it; an input error in red above it."""
    from fpdf.fonts import FontFace

    heading(pdf, "Working (check each line by hand)")
    if b.error:
        pdf.set_text_color(*RED)
        pdf.set_font(FONT, "B", 8)
        pdf.multi_cell(0, 4, f"ERROR {b.error}", new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(0, 0, 0)
        pdf.set_font(FONT, "", 7.5)
    if not b.steps:
        return
    pdf.set_font(FONT, "", 6.2 if compact else 6.8)
    line = 2.8 if compact else 3.2
    with headed_table(pdf, (5, 30, 44, 56, 40, 11), line, 0.5) as table:
        table.row(("#", "Step", "Formula", "Values substituted", "Answer", "Check"))
        src = FontFace(color=GREY, size_pt=5.5 if compact else 6)
        for i, st in enumerate(b.steps, start=1):
            row = table.row()
            for c in (str(i), st.label, st.formula, st.substituted, st.result):
                row.cell(c)
            chk = check_word(st)
            row.cell(chk, style=FontFace(emphasis="BOLD", color=status_colour(chk)))
            if compact:
                continue  # a crowded page lists the sources once, below the table
            row = table.row()
            row.cell("")
            row.cell(f"source: {st.source}", colspan=5, style=src)
    if compact:
        lines: dict[str, list[int]] = {}
        for i, st in enumerate(b.steps, start=1):
            lines.setdefault(st.source, []).append(i)
        pdf.set_font(FONT, "", 5.5)
        pdf.set_text_color(*GREY)
        text = "; ".join(f"{_numbers(n)}: {source}" for source, n in lines.items())
        pdf.multi_cell(0, 2.5, f"Sources by line: {text}", new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(0, 0, 0)


def pdf_bend(
    pdf, s: SheetSet, b: BendSheet, page: int, plan_height: float, compact: bool = False
) -> None:
    """Add one bend's page; the plan sketch is at least ``plan_height`` mm high and as high
    as the inputs beside it; ``compact`` sets the messages closer (a page that overflows)."""
    pdf.add_page()
    _title_block(pdf, s, b, page)
    top = pdf.get_y() + 1.5
    # inputs on the left, the plan sketch on the right, the standard in use below both
    pdf.set_y(top)
    heading(pdf, "Inputs")
    with headed_table(pdf, (40, 34, 12), 3.6, 0.5, width=INPUTS_WIDTH, align="LEFT") as table:
        table.row(("Input", "Value", "Unit"))
        for n, v, u in b.inputs:
            table.row((n, v, u))
    if b.blanks:
        pdf.set_font(FONT, "", 6.5)
        pdf.multi_cell(
            INPUTS_WIDTH,
            3.2,
            f"Left blank, default used: {'; '.join(b.blanks)}",
            align="L",
            new_x="LMARGIN",
            new_y="NEXT",
        )
        pdf.set_font(FONT, "", 7.5)
    left_end = pdf.get_y()
    pdf.set_xy(PLAN_X, top)
    pdf.set_left_margin(PLAN_X)
    heading(pdf, "Plan sketch (not to a true bearing)")
    plan_top = pdf.get_y()
    pdf.set_left_margin(MARGIN)
    plan_h = max(left_end - plan_top, plan_height)
    pdf_plan(pdf, b, s.units, PLAN_X, plan_top, pdf.w - MARGIN - PLAN_X, plan_h)
    pdf.set_xy(MARGIN, max(left_end, plan_top + plan_h))
    heading(pdf, "Standard in use")
    key_value_table(pdf, b.standard, (36, 150), 3.5, 0.5)
    _working(pdf, b, compact)
    heading(pdf, "Messages")
    size, line = (6.5, 3.0) if compact else (7.5, 3.8)
    pdf.set_font(FONT, "", size)
    for m in b.messages or ["none"]:
        bad = m.startswith(("FAIL", "ERROR")) or ": FAIL " in m
        pdf.set_text_color(*(RED if bad else (0, 0, 0)))
        pdf.set_font(FONT, "B" if bad else "", size)
        pdf.multi_cell(0, line, m, new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)
