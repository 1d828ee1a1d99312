"""The PDF's first page: the project's details and every bend with its status."""

from __future__ import annotations

from curvetui.reports.sheet.content import SUMMARY_HEAD, SheetSet, counts_line, summary_rows
from curvetui.reports.sheet.layout import (
    FONT,
    GREY,
    headed_table,
    heading,
    key_value_table,
    page_of,
    status_colour,
)


def pdf_summary(pdf, s: SheetSet) -> None:
    """Add the summary page: title, project details, the count line, one row per bend
    (status in colour), the project file's notes and what the following pages hold."""
    from fpdf.fonts import FontFace

    d = s.details
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
        ("Sheet", page_of(1)),
    ]
    key_value_table(pdf, [(k, v or "-") for k, v in info], (30, 156), 4.6, 1)
    heading(pdf, counts_line(s), 10)
    pdf.set_font(FONT, "", 8.5)
    with headed_table(pdf, (26, 18, 30, 30, 30, 22), 5, 1) as table:
        table.row(SUMMARY_HEAD)
        for r in summary_rows(s):
            row = table.row()
            for c in r[:-1]:
                row.cell(c)
            row.cell(r[-1], style=FontFace(emphasis="BOLD", color=status_colour(r[-1])))
    if s.alignment is not None:
        rep = s.alignment
        heading(pdf, f"Alignment {rep.name}: {rep.status.upper()} (page 2)", 10)
        pdf.set_font(FONT, "", 8)
        for line in rep.lines():
            pdf.multi_cell(0, 4, line, new_x="LMARGIN", new_y="NEXT")
    for n in s.notes:
        pdf.ln(1)
        pdf.multi_cell(0, 4, f"NOTE {n}", new_x="LMARGIN", new_y="NEXT")
    pdf.ln(2)
    pdf.set_font(FONT, "", 7.5)
    pdf.set_text_color(*GREY)
    pdf.multi_cell(
        0,
        3.8,
        "Each bend's worksheet follows on a new page (a long working runs on to the next): "
        "its inputs, the standard in use, the working line by line (formula, values "
        "substituted, answer, source and check) for checking by hand, its messages and a "
        "plan sketch.",
        new_x="LMARGIN",
        new_y="NEXT",
    )
    pdf.set_text_color(0, 0, 0)
