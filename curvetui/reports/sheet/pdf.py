"""The worksheets as a PDF: the summary page, the alignment page (a project with one), then
a page per bend, each fitted to one page."""

from __future__ import annotations

from curvetui.reports.sheet.alignment_page import pdf_alignment
from curvetui.reports.sheet.bend_page import pdf_bend
from curvetui.reports.sheet.content import SheetSet, build
from curvetui.reports.sheet.crossfall import pdf_crossfall
from curvetui.reports.sheet.layout import PLAN_HEIGHTS, new_pdf
from curvetui.reports.sheet.summary_page import pdf_summary


def make_pdf(s: SheetSet, paper: str):
    """The summary, then each bend starting on a new page. Each bend's layout is chosen
    alone (a bend's pages depend on it only): if even the most compact layout (the least of
    PLAN_HEIGHTS, the working set closer) overflows (a long working), the full plan sketch
    with the working set closer, running on to a following page; else the tallest plan of
    PLAN_HEIGHTS that fits with the working at full size, else the most compact.
    Footer and caution on each page."""
    scratch = new_pdf(s, paper)  # one scratch document for every trial (fonts loaded once)
    first = s.first_bend_page
    layouts = [pick_layout(scratch, s, b, i + first) for i, b in enumerate(s.bends)]
    pdf = new_pdf(s, paper)
    pdf_summary(pdf, s)
    if s.alignment is not None:
        pdf_alignment(pdf, s, 2)
    for i, (b, (height, compact)) in enumerate(zip(s.bends, layouts, strict=True)):
        pdf_bend(pdf, s, b, i + first, height, compact=compact)
        pdf_crossfall(pdf, b.diagram, b.diagram_note, b.bend_id)  # after the page it fits
    return pdf


def pick_layout(scratch, s: SheetSet, b, page: int) -> tuple[float, bool]:
    """(plan height, compact) for one bend, tried on new pages of a scratch document."""

    def fits(height: float, compact: bool) -> bool:
        before = scratch.page
        pdf_bend(scratch, s, b, page, height, compact=compact)
        return scratch.page == before + 1

    # the most compact layout first: with today's working most bends overflow even so, and
    # one trial settles them (the choice is the same as trying the full layout first)
    if not fits(PLAN_HEIGHTS[-1], True):
        return PLAN_HEIGHTS[0], True  # runs on to a second page, the plan at full size
    for height in PLAN_HEIGHTS:
        if fits(height, False):
            return height, False
    return PLAN_HEIGHTS[-1], True


def render_pdf(project_or_path, bend_ids=None, paper: str = "a4") -> bytes:
    """The worksheets as a PDF (fonts embedded): a summary page, then a page per bend."""
    s = build(project_or_path, bend_ids)
    return bytes(make_pdf(s, paper).output())
