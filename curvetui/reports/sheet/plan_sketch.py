"""The plan sketch on a bend's PDF page: the bend in vector lines, key points, scale bar."""

from __future__ import annotations

import math

from curvetui.reports.sheet.content import BendSheet
from curvetui.reports.sheet.layout import FONT, GREY


def _overlap(a, b) -> bool:
    """Whether two boxes (x0, y0, x1, y1) overlap."""
    return a[0] < b[2] and b[0] < a[2] and a[1] < b[3] and b[1] < a[3]


def _nice_step(length: float) -> float:
    """A round scale-bar length near a fifth of ``length``."""
    raw = max(length / 5, 1e-9)
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 5, 10):
        if m * mag >= raw:
            return m * mag
    return 10 * mag


def pdf_plan(pdf, b: BendSheet, units, x0: float, y0: float, w: float, h: float) -> None:
    """The bend in plan (metres) scaled to the box (x0, y0, w, h) [mm], in vector lines;
    the scale bar and radius are given in the project's length unit."""
    from curvetui.reports.plan import ARC, TANGENT

    if b.plan is None:
        pdf.set_font(FONT, "", 7.5)
        pdf.set_xy(x0, y0)
        pdf.multi_cell(w, 3.8, b.plan_note, new_x="LEFT", new_y="NEXT")
        return
    shape = b.plan
    pdf.set_draw_color(150, 150, 150)
    pdf.set_line_width(0.2)
    pdf.rect(x0, y0, w, h)
    xmin, xmax, ymin, ymax = shape.bounds()
    pad_x, pad_y = 16.0, 9.0  # mm kept clear for labels
    span_x, span_y = max(xmax - xmin, 1e-9), max(ymax - ymin, 1e-9)
    scale = min((w - 2 * pad_x) / span_x, (h - 2 * pad_y) / span_y)
    cx, cy = (xmin + xmax) / 2, (ymin + ymax) / 2

    def at(x, y):  # plan metres to page mm; plan +y is drawn upwards
        return x0 + w / 2 + (x - cx) * scale, y0 + h / 2 - (y - cy) * scale

    for part in shape.parts:
        pts = [at(x, y) for x, y in zip(part.x, part.y, strict=True)]
        if len(pts) < 2:
            continue
        if part.kind == TANGENT:
            pdf.set_draw_color(90, 90, 90)
            pdf.set_line_width(0.3)
            pdf.set_dash_pattern(dash=1.5, gap=1)
        elif part.kind == ARC:
            pdf.set_draw_color(0, 0, 0)
            pdf.set_line_width(0.6)
            pdf.set_dash_pattern()
        else:
            pdf.set_draw_color(30, 60, 160)
            pdf.set_line_width(0.45)
            pdf.set_dash_pattern()
        pdf.polyline(pts)
    pdf.set_dash_pattern()
    # key points, labelled outward from the arc centre
    ccx, ccy = at(*shape.centre)
    pdf.set_font(FONT, "", 6.5)
    pdf.set_draw_color(0, 0, 0)
    pdf.set_line_width(0.2)
    placed: list[tuple[float, float, float, float]] = []
    for p in sorted(shape.key_points, key=lambda p: p.station):
        px, py = at(p.x, p.y)
        pdf.set_fill_color(255, 255, 255)
        pdf.ellipse(px - 0.8, py - 0.8, 1.6, 1.6, style="DF")
        dx, dy = px - ccx, py - ccy
        n = math.hypot(dx, dy) or 1.0
        ux, uy = dx / n, dy / n
        text = f"{p.name} {b.stations.get(p.name, '')}"
        tw = pdf.get_string_width(text)
        lx = px + ux * 3 - (tw if ux < -0.3 else (tw / 2 if abs(ux) <= 0.3 else 0))
        ly = py + uy * 3 + (1.2 if uy > 0 else -0.2)
        lx = min(max(lx, x0 + 1), x0 + w - tw - 1)
        base = ly
        for shift in (0, 2.8, -2.8, 5.6, -5.6, 8.4, -8.4):
            ly = min(max(base + shift, y0 + 7), y0 + h - 7)
            box = (lx, ly - 2.4, lx + tw, ly + 0.4)
            if not any(_overlap(box, other) for other in placed):
                break
        placed.append(box)
        pdf.text(lx, ly, text)
    # scale bar and legend
    ln = units.length_label
    bar = _nice_step(float(units.length_from_si(span_x)))  # in the project's unit
    bar_mm = float(units.length_to_si(bar)) * scale
    bx, by = x0 + 4, y0 + h - 4
    pdf.set_line_width(0.4)
    pdf.line(bx, by, bx + bar_mm, by)
    pdf.line(bx, by - 1, bx, by + 1)
    pdf.line(bx + bar_mm, by - 1, bx + bar_mm, by + 1)
    pdf.text(bx, by - 1.5, f"{bar:g} {ln}")
    radius = float(units.length_from_si(shape.radius))
    hand = "right-hand" if shape.direction > 0 else "left-hand"
    pdf.set_text_color(*GREY)
    pdf.set_font(FONT, "", 6)
    pdf.text(
        x0 + 2,
        y0 + 3,
        f"{hand} bend, R {radius:g} {ln}, deflection {math.degrees(shape.deflection):.3f} deg",
    )
    pdf.text(x0 + 2, y0 + 5.6, "thick: arc · blue: spirals · dashed: tangents")
    pdf.set_text_color(0, 0, 0)
