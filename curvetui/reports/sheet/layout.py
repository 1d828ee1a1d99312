"""The PDF's page geometry, fonts, colours, footer and the small drawing helpers shared by pages."""

from __future__ import annotations

from importlib import resources

from curvetui import CAUTION, __version__
from curvetui.inputs import InputError
from curvetui.reports.sheet.content import SheetSet

PAPERS = ("a4", "letter")
FONT = "DejaVu"
RED = (180, 0, 0)
GREEN = (0, 110, 40)
GREY = (110, 110, 110)
HEADING_FILL = (225, 225, 225)  # a table's heading row
MARGIN = 12  # mm, left, top and right
INPUTS_WIDTH = 86  # mm, the inputs column on a bend page
PLAN_X = 102  # mm from the page's left edge, the plan sketch column on a bend page
PLAN_HEIGHTS = (62.0, 52.0, 42.0)  # mm, the plan sketch's least height, tried in turn
# The PDF library puts the page count where a text holds its alias (by default "{nb}"). This
# alias is made of control characters, which every text the user wrote is cleaned of
# (content.cleaned), so a "{nb}" in a note or a name prints as written.
PAGES = "\x1bnb\x1b"


def page_of(page: int) -> str:
    """'page 2 of N', N filled in by the PDF library when the document is closed."""
    return f"page {page} of {PAGES}"


def _fonts_dir():
    return resources.files("curvetui") / "data" / "fonts"


def new_pdf(s: SheetSet, paper: str):
    """An empty FPDF document (mm) on ``paper`` with the fonts embedded, the document
    details set and a footer on every page: the caution, the project and the page number.
    A paper not in PAPERS raises InputError."""
    from fpdf import FPDF

    if paper not in PAPERS:
        raise InputError(f"--paper must be one of {', '.join(PAPERS)}; got {paper!r}")
    d = s.details

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
            self.cell(0, 3.4, page_of(self.page_no()), align="R")
            self.set_text_color(0, 0, 0)

    pdf = _PDF(orientation="P", unit="mm", format=paper.upper() if paper == "a4" else "Letter")
    pdf.alias_nb_pages(PAGES)
    fonts = _fonts_dir()
    with resources.as_file(fonts / "DejaVuSans.ttf") as regular:
        pdf.add_font(FONT, "", str(regular))
    with resources.as_file(fonts / "DejaVuSans-Bold.ttf") as bold:
        pdf.add_font(FONT, "B", str(bold))
    pdf.set_title(f"Bend worksheets - {d.name}")
    pdf.set_author(d.designer or "")
    pdf.set_creator(f"curvetui {__version__}")
    pdf.set_margins(MARGIN, MARGIN, MARGIN)
    pdf.set_auto_page_break(True, margin=20)
    return pdf


def heading(pdf, text: str, size: float = 9.5) -> None:
    """A bold section heading on its own line; the body font (7.5 pt) is set after it."""
    pdf.ln(1.5)
    pdf.set_font(FONT, "B", size)
    pdf.cell(0, 5, text, new_x="LMARGIN", new_y="NEXT")
    pdf.set_font(FONT, "", 7.5)


def status_colour(text: str) -> tuple[int, int, int]:
    """Red for FAIL and ERROR, green for PASS, black for anything else."""
    return RED if text in ("FAIL", "ERROR") else (GREEN if text == "PASS" else (0, 0, 0))


def key_value_table(
    pdf,
    rows: list[tuple[str, str]],
    col_widths: tuple[float, float],
    line_height: float,
    padding: float,
) -> None:
    """A two-column table with no heading row: each label in bold, its value as given."""
    from fpdf.fonts import FontFace

    with pdf.table(
        text_align="LEFT",
        col_widths=col_widths,
        first_row_as_headings=False,
        line_height=line_height,
        padding=padding,
    ) as table:
        for k, v in rows:
            row = table.row()
            row.cell(k, style=FontFace(emphasis="BOLD"))
            row.cell(v)


def headed_table(pdf, col_widths: tuple[float, ...], line_height: float, padding: float, **more):
    """A table (the context manager of ``pdf.table``) whose first row is its heading, bold on
    light grey, text left-aligned; ``more`` goes to ``pdf.table`` as it is."""
    from fpdf.fonts import FontFace

    return pdf.table(
        text_align="LEFT",
        col_widths=col_widths,
        line_height=line_height,
        padding=padding,
        headings_style=FontFace(emphasis="BOLD", fill_color=HEADING_FILL),
        **more,
    )
