"""The superelevation diagram on a road bend's worksheet: a vector drawing of both edges'
cross slope against station with the key stations labelled, and the key stations'
slopes and edge elevations in a table (PDF); the same key stations as lines (text) or a
table (Markdown). The station-by-station table is the CSV's (`curvetui crossfall`): the
worksheet keeps to the key stations so a bend stays within its pages.

The block follows the bend's messages on the same page when it fits (a bend's second page
is mostly free), else it opens a page of its own, headed as the bend's continuation; the
footer (the caution) is on every page.
"""

from __future__ import annotations

import numpy as np

from curvetui.reports.sheet.layout import FONT, GREY, MARGIN, RED, headed_table, heading
from curvetui.reports.superelevation_diagram import Diagram, diagram_for_record, short_label
from curvetui.stations import format_station

PLOT_HEIGHT = 38.0  # mm, the drawing's plot area
# mm, heading, drawing, station labels and key-station table (measured 102.8 mm on the
# demo's bends; the block is kept whole on a page: tests/unit/reports/test_sheet_crossfall)
BLOCK_HEIGHT = 103.0
NOTE_HEIGHT = 3.4 * 2  # mm, a red note (up to two lines) below the table
CAPTION_HEIGHT = 2.8  # mm, the grey line naming the CSV command
BREAK_GAP = 8.0  # mm, the gap drawn where a long full-superelevation stretch is cut


def sheet_diagram(record: dict | None, kind: str) -> tuple[Diagram | None, str]:
    """(diagram, note): the diagram of a road bend's record, or why there is none (rail
    curves: no note, the block is left out)."""
    if kind != "road":
        return None, ""
    if record is None:
        return None, "No superelevation diagram: the inputs have an error."
    d = diagram_for_record(record)
    return (
        (None, f"No superelevation diagram: {d.split(': ', 1)[-1]}")
        if isinstance(d, str)
        else (d, "")
    )


def key_rows(d: Diagram) -> list[tuple[str, ...]]:
    """(point, station, out %, in %, out, centreline, in) per key point, as printed."""
    return [
        (
            p.label,
            format_station(p.station, d.units),
            f"{p.slope_out:.2f}",
            f"{p.slope_in:.2f}",
            f"{p.z_out:.3f}",
            f"{p.z_centreline:.3f}",
            f"{p.z_in:.3f}",
        )
        for p in d.keys
    ]


def summary_line(d: Diagram) -> str:
    return (
        f"e {d.e:.2f} %, normal crown {d.e_nc:g} %, axis of rotation: {d.axis}, half widths "
        f"{d.w_out:g} {d.length_label}; {d.placement}. Slopes + rise towards the outside "
        "edge; elevations relative to the profile grade line (the centreline's profile at "
        "normal crown)."
    )


def text_lines(d: Diagram | None, note: str) -> list[str]:
    """The text sheet's SUPERELEVATION lines."""
    if d is None:
        return [note] if note else []
    ln = d.length_label
    out = [summary_line(d), f"{'point':<44} {'station':>11} {'out %':>6} {'in %':>6} "
           f"{'out ' + ln:>8} {'CL ' + ln:>8} {'in ' + ln:>8}"]  # fmt: skip
    for r in key_rows(d):
        out.append(f"{r[0]:<44} {r[1]:>11} {r[2]:>6} {r[3]:>6} {r[4]:>8} {r[5]:>8} {r[6]:>8}")
    out += [f"NOTE: {n}" for n in d.notes]
    return out


def markdown_lines(d: Diagram | None, note: str) -> list[str]:
    """The Markdown sheet's section: a line of what it shows and a table of key points."""
    if d is None:
        return ["", "### Superelevation diagram", "", note] if note else []
    ln = d.length_label
    out = ["", "### Superelevation diagram (key stations)", "", summary_line(d), ""]
    out += [f"| Key point | Station | Out % | In % | Out {ln} | CL {ln} | In {ln} |"]
    out += ["|---|---|---|---|---|---|---|"]
    out += ["| " + " | ".join(r) + " |" for r in key_rows(d)]
    out += [f"\n**NOTE** {n}" for n in d.notes]
    return out


def block_height(d: Diagram | None) -> float:
    """The height [mm] the block needs: drawing and table, its notes and caption."""
    if d is None:
        return 12.0
    return BLOCK_HEIGHT + NOTE_HEIGHT * len(d.notes) + CAPTION_HEIGHT


def pdf_crossfall(pdf, d: Diagram | None, note: str, bend_id: str) -> None:
    """The block at the current position, or on a new page when it does not fit."""
    if d is None and not note:
        return
    # the whole block, its notes and caption included, stays on one page
    need = block_height(d)
    if pdf.get_y() + need > pdf.page_break_trigger:
        pdf.add_page()
        pdf.set_font(FONT, "B", 10)
        pdf.cell(0, 6, f"Bend {bend_id}, continued", new_x="LMARGIN", new_y="NEXT")
    heading(pdf, "Superelevation diagram" + (f" (axis: {d.axis})" if d else ""))
    if d is None:
        pdf.multi_cell(0, 3.8, note, new_x="LMARGIN", new_y="NEXT")
        return
    pdf.set_font(FONT, "", 6.5)
    pdf.multi_cell(0, 3.0, summary_line(d), new_x="LMARGIN", new_y="NEXT")
    top = pdf.get_y() + 3.0
    _drawing(pdf, d, MARGIN + 12, top, pdf.w - 2 * MARGIN - 14, PLOT_HEIGHT)
    pdf.set_xy(MARGIN, top + PLOT_HEIGHT + 16)
    ln = d.length_label
    pdf.set_font(FONT, "", 6.2)
    with headed_table(pdf, (62, 22, 14, 14, 16, 16, 16), 2.9, 0.4) as table:
        table.row(("Key point", "Station", "Out %", "In %", f"Out {ln}", f"CL {ln}", f"In {ln}"))
        for r in key_rows(d):
            table.row(r)
    if d.notes:
        pdf.set_text_color(*RED)
        pdf.set_font(FONT, "B", 7)
        for n in d.notes:
            pdf.multi_cell(0, 3.4, f"NOTE: {n}", new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(0, 0, 0)
    pdf.set_font(FONT, "", 6)
    pdf.set_text_color(*GREY)
    pdf.multi_cell(
        0,
        2.8,
        "Every station at an interval: curvetui crossfall --project FILE --bend ID (CSV).",
        new_x="LMARGIN",
        new_y="NEXT",
    )
    pdf.set_text_color(0, 0, 0)


def _x_map(d: Diagram, x0: float, w: float):
    """Station -> mm, with the full-superelevation stretch cut short (a break drawn) when
    it is longer than the two transitions together; returns (map, break mm or None)."""
    first, last = d.span
    pad = 0.03 * (last - first or 1.0)
    keys = {p.key: p.station for p in d.keys}
    a, b = keys.get("full_superelevation_in"), keys.get("full_superelevation_out")
    if a is not None and b is not None and (b - a) > 1.2 * ((a - first) + (last - b)):
        keep = 0.1 * ((a - first) + (last - b))  # of the full stretch shown each side
        s = np.array([first - pad, a + keep, b - keep, last + pad])
        live = (s[1] - s[0]) + (s[3] - s[2])
        scale = (w - BREAK_GAP) / live
        mm = np.array([0.0, (s[1] - s[0]) * scale, (s[1] - s[0]) * scale + BREAK_GAP, w]) + x0
        return (lambda x: np.interp(x, s, mm)), float(mm[1])
    s = np.array([first - pad, last + pad])
    return (lambda x: np.interp(x, s, np.array([x0, x0 + w]))), None


def _drawing(pdf, d: Diagram, x0: float, y0: float, w: float, h: float) -> None:
    """The plot: slope (%) up, station across; both edges' lines, key stations (dotted,
    labelled NC, LC, RC, e above and by station below, written upwards) and curve points."""
    xmap, cut = _x_map(d, x0, w)
    lo, hi = min(-d.e_nc, d.peak_slope) - 1.0, max(d.e, d.e_nc) + 1.0

    def y(v):
        return y0 + h - (np.asarray(v, dtype=float) - lo) / (hi - lo) * h

    pdf.set_draw_color(150, 150, 150)
    pdf.set_line_width(0.2)
    pdf.rect(x0, y0, w, h)
    pdf.set_font(FONT, "", 5.5)
    for level in sorted({0.0, d.e_nc, -d.e_nc, round(d.e, 2)}):
        yy = float(y(level))
        pdf.set_dash_pattern(dash=0.6, gap=0.8) if level else pdf.set_dash_pattern()
        pdf.set_draw_color(190, 190, 190)
        pdf.line(x0, yy, x0 + w, yy)
        text = f"{level:+.2f} %" if level else "0 %"
        pdf.text(x0 - pdf.get_string_width(text) - 1, yy + 0.8, text)
    pdf.set_dash_pattern()
    # curve points: green dashed, names inside the plot at its foot
    pdf.set_draw_color(0, 120, 60)
    for name, station in d.curve_points:
        xx = float(xmap(station))
        pdf.set_dash_pattern(dash=1.2, gap=0.8)
        pdf.line(xx, y0, xx, y0 + h)
        pdf.set_dash_pattern()
        pdf.set_text_color(0, 120, 60)
        pdf.text(xx + 0.6, y0 + h - 1.0, name)
    pdf.set_text_color(0, 0, 0)
    # key stations: grey dotted, short label above, station written upwards below
    pdf.set_draw_color(120, 120, 120)
    for p in d.keys:
        xx = float(xmap(p.station))
        pdf.set_dash_pattern(dash=0.3, gap=0.7)
        pdf.line(xx, y0, xx, y0 + h)
        pdf.set_dash_pattern()
        label = short_label(p.key)
        pdf.set_font(FONT, "B", 6)
        pdf.text(xx - pdf.get_string_width(label) / 2, y0 - 0.8, label)
        pdf.set_font(FONT, "", 5.5)
        text = format_station(p.station, d.units)
        with pdf.rotation(90, xx + 0.8, y0 + h + 1.0):
            pdf.text(xx + 0.8 - pdf.get_string_width(text), y0 + h + 1.0, text)
    # the edges: outside solid black, inside dashed blue
    xs = np.unique(np.concatenate([np.linspace(*d.span, 300), [p.station for p in d.keys]]))
    first, last = d.span
    pad = 0.03 * (last - first or 1.0)
    xs = np.concatenate([[first - pad], xs, [last + pad]])
    s_out, s_in, *_ = d.at(xs)
    for values, colour, width, dash in ((s_out, (0, 0, 0), 0.55, None),
                                        (s_in, (30, 60, 200), 0.45, (1.6, 0.9))):  # fmt: skip
        pdf.set_draw_color(*colour)
        pdf.set_line_width(width)
        pdf.set_dash_pattern(*(dash or ()))
        pdf.polyline(list(zip(xmap(xs).tolist(), y(values).tolist(), strict=True)))
    pdf.set_dash_pattern()
    pdf.set_line_width(0.2)
    if cut is not None:  # the break: two slanted strokes on white
        pdf.set_fill_color(255, 255, 255)
        pdf.rect(cut + 0.8, y0 + 0.2, BREAK_GAP - 1.6, h - 0.4, style="F")
        pdf.set_draw_color(0, 0, 0)
        for dx in (1.5, BREAK_GAP - 1.5):
            pdf.line(cut + dx - 1, y0 + h - 2, cut + dx + 1, y0 + 2)
        pdf.set_font(FONT, "", 5.5)
        pdf.text(cut + 0.5, y0 - 0.8, "cut")
    # legend
    pdf.set_font(FONT, "", 5.8)
    pdf.set_text_color(*GREY)
    pdf.text(
        x0,
        y0 + h + 14.5,
        "solid: outside edge · dashed blue: inside edge · NC normal crown, LC level crown, "
        "RC reverse crown, e full superelevation · green: curve points · stations written "
        "upwards",
    )
    pdf.set_text_color(0, 0, 0)
