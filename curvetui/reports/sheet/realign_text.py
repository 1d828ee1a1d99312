"""A realignment's worksheet as plain text (pages split by form feeds, the slew table running
on at ROWS_PER_PAGE rows a page, its heading repeated) and as Markdown (one table). The
caution closes every page. Content from curvetui.reports.realign_sheet."""

from __future__ import annotations

from curvetui.reports.realign_sheet import RealignSheet, slew_note

ROWS_PER_PAGE = 60


def _mark(line) -> str:
    return "  <-- FAIL" if line.fail else ""


def _table_lines(s: RealignSheet, rows) -> list[str]:
    widths = [max(len(r[i]) for r in [s.head, *s.table]) for i in range(len(s.head))]
    out = ["  ".join(c.rjust(w) for c, w in zip(s.head, widths, strict=True)).rstrip()]
    out += ["  ".join(c.rjust(w) for c, w in zip(r, widths, strict=True)).rstrip() for r in rows]
    return out


def render_text(s: RealignSheet) -> str:
    """Page 1: summary, rail verdicts, key stations; then the slew table's pages."""
    chunks = [s.table[i : i + ROWS_PER_PAGE] for i in range(0, len(s.table), ROWS_PER_PAGE)]
    pages_n = 1 + len(chunks)
    first = [
        f"REALIGNMENT WORKSHEET - survey {s.survey}",
        f"Status: {s.status}   Units: {s.units.name}   page 1 of {pages_n}",
        "",
        "DESIGN",
    ]
    w = max(len(x.label) for x in [*s.design, *s.rail]) + 1
    first += [f"  {(x.label + ':'):<{w}} {x.value}{_mark(x)}" for x in s.design]
    first += ["", "RAIL CHECKS OF THE DESIGNED CURVE"]
    first += [f"  {(x.label + ':'):<{w}} {x.value}{_mark(x)}" for x in s.rail]
    first += [f"  NOTE {n}" for n in s.notes]
    if s.keys:
        first += ["", "KEY STATIONS  " + "   ".join(f"{n} {v:.2f}" for n, v in s.keys)]
    first += ["", s.caution]
    pages = ["\n".join(first)]
    for i, rows in enumerate(chunks, start=2):
        body = [
            f"SLEW TABLE - survey {s.survey}   page {i} of {pages_n}",
            slew_note(s.units),
            "",
            *_table_lines(s, rows),
            "",
            s.caution,
        ]
        pages.append("\n".join(body))
    return "\n\f\n".join(pages) + "\n"


def _md(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def _md_row(x) -> str:
    """A label-value row; a failing value in bold with FAIL before it."""
    value = f"**FAIL: {_md(x.value)}**" if x.fail else _md(x.value)
    return f"| {_md(x.label)} | {value} |"


def render_markdown(s: RealignSheet) -> str:
    """The sheet in Markdown: the summary and rail tables, the slew table, the caution."""
    out = [
        f"# Realignment worksheet: survey {_md(s.survey)}",
        "",
        f"Status: **{s.status}** · Units: {s.units.name}",
        "",
        f"> {s.caution}",
        "",
        "## Design",
        "",
        "| Item | Value |",
        "|---|---|",
    ]
    out += [_md_row(x) for x in s.design]
    out += ["", "## Rail checks of the designed curve", "", "| Item | Value |", "|---|---|"]
    out += [_md_row(x) for x in s.rail]
    out += [f"\n- {_md(n)}" for n in s.notes]
    if s.keys:
        out += ["", "Key stations: " + ", ".join(f"{n} {v:.2f}" for n, v in s.keys)]
    out += ["", "## Slew table", "", _md(slew_note(s.units)), ""]
    out += ["| " + " | ".join(s.head) + " |", "|---:|---:|---:|---:|---|"]
    out += ["| " + " | ".join(_md(c) for c in r) + " |" for r in s.table]
    if not s.table:
        out.append("| - | - | - | - | no designed curve |")
    out += ["", f"> {s.caution}", ""]
    return "\n".join(out)
