"""The worksheets as a PDF: the summary page, then a page per bend, each fitted to one page."""

from __future__ import annotations

from curvetui.reports.sheet.bend_page import pdf_bend
from curvetui.reports.sheet.content import SheetSet, build
from curvetui.reports.sheet.layout import PLAN_HEIGHTS, new_pdf
from curvetui.reports.sheet.summary_page import pdf_summary


def make_pdf(s: SheetSet, paper: str):
    """The summary, then each bend starting on a new page: a bend whose page overflows is
    drawn again with a shorter plan sketch (down to the least of PLAN_HEIGHTS), then with
    its working set closer; a bend that overflows even so (a long working) runs on to a
    following page with the full plan sketch and the working set closer, footer and
    caution on each page."""
    tries = len(PLAN_HEIGHTS) + 1
    choice = [0] * len(s.bends)
    spills = [False] * len(s.bends)
    while True:
        pdf = new_pdf(s, paper)
        pdf_summary(pdf, s)
        overflowed = False
        for i, b in enumerate(s.bends):
            before = pdf.page
            height = PLAN_HEIGHTS[min(choice[i], len(PLAN_HEIGHTS) - 1)]
            compact = choice[i] >= len(PLAN_HEIGHTS) or spills[i]
            pdf_bend(pdf, s, b, i + 2, height, compact=compact)
            if pdf.page > before + 1 and not spills[i]:
                overflowed = True
                choice[i] += 1
                if choice[i] >= tries:  # no layout fits one page: the full plan, spilling
                    choice[i], spills[i] = 0, True
        if not overflowed:
            return pdf


def render_pdf(project_or_path, bend_ids=None, paper: str = "a4") -> bytes:
    """The worksheets as a PDF (fonts embedded): a summary page, then a page per bend."""
    s = build(project_or_path, bend_ids)
    return bytes(make_pdf(s, paper).output())
