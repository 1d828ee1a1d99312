"""The worksheets as plain text (pages split by form feeds) and as Markdown."""

from __future__ import annotations

from curvetui import CAUTION
from curvetui.reports.sheet.content import (
    SUMMARY_HEAD,
    build,
    check_word,
    counts_line,
    plan_lines,
    summary_rows,
)
from curvetui.reports.sheet.crossfall import markdown_lines, text_lines


def render_text(project_or_path, bend_ids=None, paper: str = "a4") -> str:
    """The worksheets as plain text, pages separated by form feeds."""
    s = build(project_or_path, bend_ids)
    d = s.details
    pages = []
    out = [
        f"BEND WORKSHEETS - {d.name}",
        f"Client: {d.client or '-'}   Job: {d.job_number or '-'}   Drawing: {d.drawing or '-'}",
        f"Designer: {d.designer or '-'}   Checker: {d.checker or '-'}   Date: {d.date or '-'}"
        f"   Revision: {d.revision or '-'}   Units: {s.units.name}",
        f"page 1 of {s.pages}",
        "",
        counts_line(s),
        "",
    ]
    rows = [SUMMARY_HEAD, *summary_rows(s)]
    widths = [max(len(r[i]) for r in rows) for i in range(len(SUMMARY_HEAD))]
    for r in rows:
        out.append("  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)).rstrip())
    out += [f"NOTE {n}" for n in s.notes]
    out += ["", CAUTION]
    pages.append("\n".join(out))
    if s.alignment is not None:
        pages.append("\n".join([*alignment_text(s, 2), "", CAUTION]))
    for page, b in enumerate(s.bends, start=s.first_bend_page):
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
                f"  {i}. {st.label}  [{check_word(st)}]",
                f"     {st.formula}",
                f"     {st.substituted}",
                f"     = {st.result}",
                f"     source: {st.source}",
            ]
        out += ["", "MESSAGES"]
        out += [f"  {m}" for m in b.messages] or ["  none"]
        out += ["", "PLAN"]
        out += [f"  {line}" for line in plan_lines(b)]
        if b.diagram is not None or b.diagram_note:
            out += ["", "SUPERELEVATION DIAGRAM (key stations)"]
            out += [f"  {line}" for line in text_lines(b.diagram, b.diagram_note)]
        out += ["", CAUTION]
        pages.append("\n".join(out))
    return "\n\f\n".join(pages) + "\n"


def alignment_text(s, page: int) -> list[str]:
    """The alignment page as text lines: the table of PIs, tangents, verdicts, rules."""
    from curvetui.reports.sheet.alignment_page import RULES

    rep = s.alignment
    out = [f"ALIGNMENT {rep.name}: {rep.status.upper()}", f"page {page} of {s.pages}", ""]
    if rep.error:
        return [*out, f"ERROR {rep.error}"]
    head, rows = rep.table()
    rows = [head, *rows]
    widths = [max(len(r[i]) for r in rows) for i in range(len(head))]
    for r in rows:
        out.append("  ".join(c.rjust(w) for c, w in zip(r, widths, strict=True)).rstrip())
    u = s.units.length_label
    out += [
        "",
        f"Lengths and stations in {u}, deflections in degrees (R right, L left). Start "
        f"station {rep.start_station:.2f}, first tangent {rep.tangents[0]:.2f}, end station "
        f"{rep.end_station:.2f}. The bends' deflection and PI station come from the alignment.",
        "",
        "BETWEEN CONSECUTIVE BENDS",
    ]
    out += [f"  {v.text}" for v in rep.verdicts] or ["  PASS: no warnings"]
    return [*out, "", RULES]


def alignment_markdown(s, page: int) -> list[str]:
    """The alignment page in Markdown."""
    from curvetui.reports.sheet.alignment_page import RULES

    rep = s.alignment
    out = ["---", "", f"## Alignment {_md(rep.name)}: **{rep.status.upper()}**", ""]
    if rep.error:
        return [*out, f"**ERROR** {_md(rep.error)}", "", f"> {CAUTION}", ""]
    head, rows = rep.table()
    out += ["| " + " | ".join(head) + " |", "|" + "---|" * len(head)]
    out += ["| " + " | ".join(_md(c) for c in r) + " |" for r in rows]
    u = s.units.length_label
    out += [
        "",
        f"Lengths and stations in {u}, deflections in degrees (R right, L left); end station "
        f"{rep.end_station:.2f}. The bends' deflection and PI station come from the alignment.",
        "",
        "### Between consecutive bends",
        "",
    ]
    out += [f"- {_md(v.text)}" for v in rep.verdicts] or ["- PASS: no warnings"]
    return [*out, "", _md(RULES), "", f"> {CAUTION}", ""]


def _md(text: str) -> str:
    """Text made safe for a Markdown table cell: pipes escaped, line breaks folded."""
    return str(text).replace("|", "\\|").replace("\n", " ")


def render_markdown(project_or_path, bend_ids=None, paper: str = "a4") -> str:
    """The worksheets as Markdown: a heading per page, tables for the summary and working."""
    s = build(project_or_path, bend_ids)
    d = s.details
    out = [
        f"# Bend worksheets: {_md(d.name)}",
        "",
        f"Client: {_md(d.client or '-')} · Job: {_md(d.job_number or '-')} · "
        f"Drawing: {_md(d.drawing or '-')} · Designer: {_md(d.designer or '-')} · "
        f"Checker: {_md(d.checker or '-')} · Date: {_md(d.date or '-')} · "
        f"Revision: {_md(d.revision or '-')} · Units: {s.units.name} · page 1 of {s.pages}",
        "",
        f"**{counts_line(s)}**",
        "",
        "| " + " | ".join(SUMMARY_HEAD) + " |",
        "|" + "---|" * len(SUMMARY_HEAD),
    ]
    for r in summary_rows(s):
        cells = [*r[:-1], f"**{r[-1]}**" if r[-1] != "PASS" else r[-1]]
        out.append("| " + " | ".join(_md(c) for c in cells) + " |")
    out += [f"\n> NOTE {_md(n)}" for n in s.notes]
    out += ["", f"> {CAUTION}", ""]
    if s.alignment is not None:
        out += alignment_markdown(s, 2)
    for page, b in enumerate(s.bends, start=s.first_bend_page):
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
                chk = check_word(st)
                out.append(
                    f"| {i} | {_md(st.label)} | `{_md(st.formula)}` | `{_md(st.substituted)}` | "
                    f"{_md(st.result)} | {_md(st.source)} | "
                    f"{'**FAIL**' if chk == 'FAIL' else chk} |"
                )
        out += ["", "### Messages", ""]
        out += [f"- {_md(m)}" for m in b.messages] or ["- none"]
        out += ["", "### Plan key points", ""]
        out += [f"- {_md(line)}" for line in plan_lines(b)]
        out += markdown_lines(b.diagram, b.diagram_note)
        out += ["", f"> {CAUTION}", ""]
    return "\n".join(out)
