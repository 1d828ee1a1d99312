"""The PDF's alignment page: the alignment drawn to bearing (north up, one scale both ways,
north arrow, scale bar, stations, PIs), the table of PIs and the verdicts between bends."""

from __future__ import annotations

import math

from curvetui.reports.alignment_plan import alignment_plan, nice_interval
from curvetui.reports.sheet.layout import FONT, GREY, RED, headed_table, heading, page_of
from curvetui.reports.sheet.plan_sketch import _nice_step, _overlap

RULES = (
    "Checked between consecutive bends: overlap (a bend's end past the next one's start) "
    "FAIL; reverse bends: the tangent at least the runoff each bend without spirals places "
    "on it (runoff on the tangent x L_r; derived from the runoff placement, Highway "
    "Engineering Handbook and AASHTO as cited by MnDOT 2015); broken-back bends: tangent "
    "at least 15 V ft, V in mph (10.2 s x V, 2.84 m per km/h; TxDOT Roadway Design Manual); "
    "compound curves: larger / smaller radius at most 1.5 (TxDOT Roadway Design Manual)."
)


def pdf_alignment(pdf, s, page: int) -> None:
    """Add the alignment page of a SheetSet whose ``alignment`` is set."""
    rep = s.alignment
    pdf.add_page()
    pdf.set_font(FONT, "B", 13)
    word = rep.status.upper()
    pdf.cell(0, 7, f"Alignment: {rep.name or '(unnamed)'}", new_x="LMARGIN", new_y="NEXT")
    pdf.set_font(FONT, "B", 10)
    pdf.set_text_color(*(RED if word in ("FAIL", "ERROR") else (0, 0, 0)))
    pdf.cell(0, 5, f"Status {word} · {page_of(page)}", new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)
    if rep.error:
        pdf.set_font(FONT, "", 9)
        pdf.set_text_color(*RED)
        pdf.multi_cell(0, 4.5, f"ERROR {rep.error}", new_x="LMARGIN", new_y="NEXT")
        pdf.set_text_color(0, 0, 0)
        return
    x0, y0, w, h = pdf.l_margin, pdf.get_y() + 1, pdf.w - pdf.l_margin - pdf.r_margin, 100.0
    draw_plan(pdf, rep, s.units, x0, y0, w, h)
    pdf.set_fill_color(255, 255, 255)
    pdf.set_draw_color(0, 0, 0)
    pdf.set_line_width(0.2)
    pdf.set_y(y0 + h + 2)
    heading(pdf, "Points of intersection", 9.5)
    head, rows = rep.table()
    u = s.units.length_label
    units = {"Easting": u, "Northing": u, "Deflection": "deg", "R": u, "Ls in": u, "Ls out": u}
    titles = tuple(f"{c} ({units[c]})" if c in units else c for c in head)
    pdf.set_font(FONT, "", 6.2)
    widths = (6, 13, 17, 17, 16, 10, 9, 9, 14, 14, 14, 14, 14, 15)
    with headed_table(pdf, widths, 3.4, 0.6) as table:
        table.row(titles)
        for r in rows:
            table.row(r)
    pdf.set_font(FONT, "", 7.5)
    pdf.ln(1)
    pdf.multi_cell(
        0,
        3.8,
        f"Start station {rep.start_station:.2f} {u}, tangent to the first bend "
        f"{rep.tangents[0]:.2f} {u}; end station {rep.end_station:.2f} {u}. Deflections: "
        "R right, L left. The bends' deflection and PI station come from the alignment; "
        "stations run along the built centreline.",
        new_x="LMARGIN",
        new_y="NEXT",
    )
    heading(pdf, "Between consecutive bends", 9.5)
    if not rep.verdicts:
        pdf.multi_cell(0, 4, "PASS: no warnings.", new_x="LMARGIN", new_y="NEXT")
    for v in rep.verdicts:
        pdf.set_text_color(*(RED if v.severity == "fail" else (0, 0, 0)))
        pdf.set_font(FONT, "B" if v.severity == "fail" else "", 7.5)
        pdf.multi_cell(0, 4, v.text, new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(*GREY)
    pdf.set_font(FONT, "", 6.8)
    pdf.ln(1)
    pdf.multi_cell(0, 3.4, RULES, new_x="LMARGIN", new_y="NEXT")
    pdf.set_text_color(0, 0, 0)


def draw_plan(pdf, rep, units, x0: float, y0: float, w: float, h: float) -> None:
    """The alignment to bearing in the box (mm): north up, equal scales in x and y."""
    lay = rep.layout
    unit_m = float(units.length_to_si(1.0))
    span = lay.built.end_station - lay.chain.start_station
    plan = alignment_plan(lay.chain, lay.built, lay.bend_ids, nice_interval(span, 10, unit_m))
    e0, e1, n0, n1 = plan.bounds()
    pad = 14.0
    scale = min((w - 2 * pad) / max(e1 - e0, 1e-9), (h - 2 * pad) / max(n1 - n0, 1e-9))
    ce, cn = (e0 + e1) / 2, (n0 + n1) / 2

    def at(e, n):
        return x0 + w / 2 + (e - ce) * scale, y0 + h / 2 - (n - cn) * scale

    pdf.set_draw_color(150, 150, 150)
    pdf.set_line_width(0.2)
    pdf.rect(x0, y0, w, h)
    # the lines between the PIs, thin and dashed
    pts = [at(*p) for p in lay.chain.points]
    pdf.set_draw_color(*GREY)
    pdf.set_line_width(0.15)
    pdf.set_dash_pattern(dash=1, gap=1)
    pdf.polyline(pts)
    pdf.set_dash_pattern()
    for bend, es, ns in plan.pieces:
        pdf.set_draw_color(*((0, 0, 0) if bend < 0 else (30, 60, 160)))
        pdf.set_line_width(0.35 if bend < 0 else 0.6)
        pdf.polyline([at(e, n) for e, n in zip(es, ns, strict=True)])
    placed: list[tuple[float, float, float, float]] = []

    def label(px, py, text, dx, dy, size=5.5, colour=(0, 0, 0)) -> None:
        pdf.set_font(FONT, "", size)
        tw = pdf.get_string_width(text)
        for k in range(6):
            lx = px + dx * (1 + k) - (tw if dx < 0 else 0)
            ly = py + dy * (1 + k)
            lx = min(max(lx, x0 + 1), x0 + w - tw - 1)
            ly = min(max(ly, y0 + 4), y0 + h - 2)
            box = (lx, ly - 2.2, lx + tw, ly + 0.3)
            if not any(_overlap(box, o) for o in placed):
                placed.append(box)
                pdf.set_text_color(*colour)
                pdf.text(lx, ly, text)
                pdf.set_text_color(0, 0, 0)
                return

    for p, (px, py) in zip(plan.pis, pts[1:-1], strict=True):
        pdf.set_fill_color(255, 255, 255)
        pdf.set_draw_color(0, 0, 0)
        pdf.set_line_width(0.2)
        pdf.rect(px - 0.9, py - 0.9, 1.8, 1.8, style="DF")
        label(px, py, f"PI {p.bend + 1} {p.name}", 1.5, -1.5, 6.5)
    for k in plan.key_points:
        px, py = at(k.east, k.north)
        pdf.set_fill_color(30, 60, 160)
        pdf.ellipse(px - 0.5, py - 0.5, 1.0, 1.0, style="F")
        text = f"{k.name} {format_station_m(k.station, units)}"
        label(px, py, text, -1.2 if k.name in ("TS", "PC") else 1.2, 2.4, 4.8, (30, 60, 160))
    for t in plan.ticks:
        px, py = at(t.east, t.north)
        pdf.set_draw_color(0, 0, 0)
        pdf.line(px, py - 1.2, px, py + 1.2)
        label(px, py, format_station_m(t.station, units, 0), 0.8, 3.0, 5.2)
    # north arrow, top right
    ax, ay = x0 + w - 8, y0 + 5
    pdf.set_draw_color(0, 0, 0)
    pdf.set_line_width(0.3)
    pdf.line(ax, ay + 10, ax, ay)
    pdf.polygon([(ax, ay), (ax - 1.6, ay + 3.5), (ax + 1.6, ay + 3.5)], style="F")
    pdf.set_font(FONT, "B", 8)
    pdf.text(ax - 1.3, ay + 13.5, "N")
    # scale bar and note, bottom left
    total_units = (e1 - e0) / unit_m
    bar = _nice_step(total_units)
    bar_mm = bar * unit_m * scale
    bx, by = x0 + 4, y0 + h - 4
    pdf.set_line_width(0.4)
    pdf.line(bx, by, bx + bar_mm, by)
    pdf.line(bx, by - 1, bx, by + 1)
    pdf.line(bx + bar_mm, by - 1, bx + bar_mm, by + 1)
    pdf.set_font(FONT, "", 6)
    pdf.text(bx, by - 1.5, f"{bar:g} {units.length_label}")
    pdf.set_text_color(*GREY)
    ratio = 1000.0 / scale  # metres of ground per metre of paper
    pdf.text(
        x0 + 2,
        y0 + 3,
        f"To bearing, north up, one scale both ways (about 1:{_round_ratio(ratio)} as "
        f"printed). Stations every {plan.interval / unit_m:g} {units.length_label}; blue: "
        "bends, black: tangents, dashed: lines between PIs.",
    )
    pdf.set_text_color(0, 0, 0)


def _round_ratio(ratio: float) -> str:
    mag = 10 ** max(math.floor(math.log10(ratio)) - 1, 0)
    return f"{round(ratio / mag) * mag:,.0f}"


def format_station_m(metres: float, units, decimals: int = 2) -> str:
    from curvetui.stations import format_station

    return format_station(float(units.length_from_si(metres)), units.name, decimals)
