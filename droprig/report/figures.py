"""The plan figure of the annex, drawn as reportlab vector graphics.

Why reportlab.graphics and not matplotlib: the plan is lines, rectangles, arcs
and labels, which reportlab draws natively into the same PDF, so the figure
stays vector, its text stays searchable (a reviewer can find a bay id), it uses
the annex's embedded font and there is no second PDF to merge. matplotlib would
add ~0.5 s of import and a pypdf merge for no gain in a figure this simple.

Visual language (shared with the desktop plan): outcome fill + hatch + text in
every bay; girders heavy, beams light, grid lines dash-dot with label bubbles,
swing region solid, drift margin dashed, corridor dash-dot, protection areas
double-outlined and named. Everything is labelled, nothing relies on colour.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from reportlab.graphics.shapes import Circle, Drawing, Group, Line, Polygon, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from droprig import units
from droprig.model import Level, LiftZone, ProtectionArea, bays
from droprig.report import fonts
from droprig.report.content import NOT_ASSESSED, OUTCOMES, OutcomeStyle
from droprig.report.geometry import clip_polyline, drift_outlines, hatch_segments, swing_outlines
from droprig.report.text import fmt_util, fmt_value
from droprig.units import UnitSystem

INK = colors.HexColor("#1A1A1A")
GRID_INK = colors.HexColor("#5A5A5A")
ZONE_INK = colors.HexColor("#101010")
MAT_INK = colors.HexColor("#1B6B4A")
LEGEND_HEIGHT = 118.0
"""Height of the legend strip under the plan, pt."""
MARGIN = 26.0
"""Paper margin around the plan for grid bubbles, pt."""


def _hex(c: str) -> colors.Color:
    return colors.HexColor(c)


def _hatch(group: Group, style: OutcomeStyle, x0: float, y0: float, x1: float, y1: float,
           scale: float = 1.0) -> None:
    ink = _hex(style.edge)
    if style.hatch in ("diagonal", "cross"):
        spacing = (5.0 if style.hatch == "diagonal" else 4.0) * scale
        slopes = (1,) if style.hatch == "diagonal" else (1, -1)
        for slope in slopes:
            for xa, ya, xb, yb in hatch_segments(x0, y0, x1, y1, spacing, slope):
                group.add(Line(xa, ya, xb, yb, strokeColor=ink, strokeWidth=0.45 * scale))
    elif style.hatch == "grid":
        spacing = 3.5 * scale
        xs = x0 + spacing
        while xs < x1:
            group.add(Line(xs, y0, xs, y1, strokeColor=ink, strokeWidth=0.45 * scale))
            xs += spacing
        ys = y0 + spacing
        while ys < y1:
            group.add(Line(x0, ys, x1, ys, strokeColor=ink, strokeWidth=0.45 * scale))
            ys += spacing
    elif style.hatch == "dots":
        step = 6.0 * scale
        nx, ny = int((x1 - x0) / step), int((y1 - y0) / step)
        for i in range(nx):
            for j in range(ny):
                cx = x0 + (i + 0.5 + 0.5 * (j % 2)) * step
                if cx > x1:
                    continue
                cy = y0 + (j + 0.5) * step
                group.add(Line(cx - 0.4, cy, cx + 0.4, cy, strokeColor=ink, strokeWidth=0.8))


def swatch(style: OutcomeStyle, w: float = 22.0, h: float = 12.0) -> Drawing:
    """A small legend swatch (fill + hatch + tag) for tables."""
    d = Drawing(w, h)
    g = Group()
    g.add(Rect(0, 0, w, h, fillColor=_hex(style.fill), strokeColor=_hex(style.edge),
               strokeWidth=0.6))
    _hatch(g, style, 0, 0, w, h, 0.8)
    d.add(g)
    return d


def _text(x: float, y: float, text: str, size: float, *, anchor: str = "start",
          bold: bool = False, color: colors.Color = INK) -> String:
    return String(x, y, text, fontName=fonts.BOLD if bold else fonts.REGULAR,
                  fontSize=size, fillColor=color, textAnchor=anchor)


def _halo_line(d: Drawing, pts: list[float], color: colors.Color, width: float, *,
               dash: list[float] | None = None, halo: float = 1.6) -> None:
    """A line with a white halo under it, so it reads over any fill or hatch."""
    d.add(PolyLine(pts, strokeColor=colors.white, strokeWidth=width + halo,
                   strokeLineCap=1, strokeLineJoin=1))
    d.add(PolyLine(pts, strokeColor=color, strokeWidth=width, strokeDashArray=dash,
                   strokeLineJoin=1))


def _wrap(text: str, size: float, width: float) -> list[str]:
    """Greedy word wrap of ``text`` into lines of at most ``width`` pt."""
    lines: list[str] = []
    cur = ""
    for word in text.split():
        trial = f"{cur} {word}".strip()
        if cur and stringWidth(trial, fonts.REGULAR, size) > width:
            lines.append(cur)
            cur = word
        else:
            cur = trial
    if cur:
        lines.append(cur)
    return lines


def _fit(text: str, size: float, width: float, font: str = fonts.REGULAR) -> str:
    """``text`` shortened with an ellipsis to fit ``width`` pt."""
    if stringWidth(text, font, size) <= width:
        return text
    while text and stringWidth(text + "…", font, size) > width:
        text = text[:-1]
    return text + "…"


def plan_drawing(level: Level, zones: Sequence[LiftZone],
                 protections: Sequence[ProtectionArea],
                 outcomes: dict[str, tuple[str, float]], system: UnitSystem,
                 width: float, height: float) -> Drawing:
    """Plan of ``level`` with framing, bays by outcome, lift zones, protection and
    a legend, fitted in ``width`` × ``height`` pt.

    ``outcomes`` maps bay id -> (response, max utilisation) as from
    :func:`droprig.report.content.bay_outcomes`.
    """
    fonts.register()
    d = Drawing(width, height)
    g = level.grid
    ext = g.extent
    # World window: the framing, the cranes and the mats, with a margin; swing
    # outlines beyond it are clipped (a 40 m radius must not shrink the floor).
    xs = [ext.x0, ext.x1] + [z.crane[0] for z in zones]
    ys = [ext.y0, ext.y1] + [z.crane[1] for z in zones]
    for p in protections:
        xs += [p.area.x0, p.area.x1]
        ys += [p.area.y0, p.area.y1]
    for z in zones:
        for q in z.corridor:
            xs.append(q[0])
            ys.append(q[1])
    pad = max(1.0, 0.06 * max(max(xs) - min(xs), max(ys) - min(ys)))
    box = (min(xs) - pad, min(ys) - pad, max(xs) + pad, max(ys) + pad)
    plan_h = height - LEGEND_HEIGHT
    s = min((width - 2 * MARGIN) / (box[2] - box[0]), (plan_h - 2 * MARGIN) / (box[3] - box[1]))
    # Trim the drawing to what the plan needs, so it sits under the page text.
    height = LEGEND_HEIGHT + s * (box[3] - box[1]) + 2 * MARGIN
    d.height = height
    ox = (width - s * (box[2] - box[0])) / 2 - s * box[0]
    oy = LEGEND_HEIGHT + MARGIN - s * box[1]

    def P(x: float, y: float) -> tuple[float, float]:
        return (ox + s * x, oy + s * y)

    def flat(pts: Sequence[tuple[float, float]]) -> list[float]:
        out: list[float] = []
        for x, y in pts:
            out += list(P(x, y))
        return out

    # Bays by outcome
    labels = Group()
    for b in bays(level):
        resp, u = outcomes.get(b.id, (NOT_ASSESSED, math.nan))
        st = OUTCOMES.get(resp, OUTCOMES[NOT_ASSESSED])
        x0, y0 = P(b.rect.x0, b.rect.y0)
        x1, y1 = P(b.rect.x1, b.rect.y1)
        d.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=_hex(st.fill), strokeColor=None))
        hg = Group()
        _hatch(hg, st, x0, y0, x1, y1)
        d.add(hg)
        lines = [(b.id, True), (f"{st.tag} {st.label}", False)]
        if resp != NOT_ASSESSED:
            lines.append((f"U = {fmt_util(u)}", False))
        size = 6.5
        bw, bh = x1 - x0, y1 - y0
        while size > 4.0 and (max(stringWidth(t, fonts.BOLD, size) for t, _ in lines) + 6 > bw
                              or len(lines) * size * 1.25 + 4 > bh):
            size -= 0.5
        if len(lines) * size * 1.25 + 4 > bh or size * 2 + 6 > bw:
            lines = [(st.tag, True)]
            size = min(6.5, max(3.5, bh * 0.6))
        tw = max(stringWidth(t, fonts.BOLD if bold else fonts.REGULAR, size)
                 for t, bold in lines) + 4
        th = len(lines) * size * 1.25 + 2
        cx, cy = (x0 + x1) / 2, (y0 + y1) / 2
        labels.add(Rect(cx - tw / 2, cy - th / 2, tw, th, fillColor=colors.white,
                        strokeColor=_hex(st.edge), strokeWidth=0.5))
        for k, (t, bold) in enumerate(lines):
            labels.add(_text(cx, cy + th / 2 - (k + 1) * size * 1.25 + size * 0.3, t, size,
                             anchor="middle", bold=bold))

    # Deck openings
    for o in level.deck.openings:
        x0, y0 = P(o.x0, o.y0)
        x1, y1 = P(o.x1, o.y1)
        d.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=colors.white, strokeColor=INK,
                   strokeWidth=0.8))
        d.add(Line(x0, y0, x1, y1, strokeColor=INK, strokeWidth=0.6))
        d.add(Line(x0, y1, x1, y0, strokeColor=INK, strokeWidth=0.6))
        labels.add(_text((x0 + x1) / 2, y1 + 2, "opening", 5.5, anchor="middle"))

    # Grid lines with bubbles (top and left)
    gx0, gy0 = P(box[0], box[1])
    gx1, gy1 = P(box[2], box[3])
    r_b = 6.5
    for x, lab in zip(g.x_lines, g.x_labels, strict=True):
        px, _ = P(x, 0)
        d.add(Line(px, gy0 - 4, px, gy1 + 4, strokeColor=GRID_INK, strokeWidth=0.4,
                   strokeDashArray=[6, 2, 1, 2]))
        d.add(Circle(px, gy1 + 4 + r_b, r_b, fillColor=colors.white, strokeColor=INK,
                     strokeWidth=0.6))
        d.add(_text(px, gy1 + 4 + r_b - 2.3, _fit(lab, 6.0, 2 * r_b - 1), 6.0,
                    anchor="middle", bold=True))
    for y, lab in zip(g.y_lines, g.y_labels, strict=True):
        _, py = P(0, y)
        d.add(Line(gx0 - 4, py, gx1 + 4, py, strokeColor=GRID_INK, strokeWidth=0.4,
                   strokeDashArray=[6, 2, 1, 2]))
        d.add(Circle(gx0 - 4 - r_b, py, r_b, fillColor=colors.white, strokeColor=INK,
                     strokeWidth=0.6))
        d.add(_text(gx0 - 4 - r_b, py - 2.3, _fit(lab, 6.0, 2 * r_b - 1), 6.0,
                    anchor="middle", bold=True))

    # Framing
    for m in level.members:
        (ax, ay), (bx, by) = P(*m.start), P(*m.end)
        girder = m.role == "girder"
        _halo_line(d, [ax, ay, bx, by], INK, 1.6 if girder else 0.6, halo=0.9)
    for cx, cy in g.columns:
        px, py = P(cx, cy)
        d.add(Rect(px - 2.2, py - 2.2, 4.4, 4.4, fillColor=INK, strokeColor=None))

    # Protection areas: double outline and a name tag
    for p in protections:
        x0, y0 = P(p.area.x0, p.area.y0)
        x1, y1 = P(p.area.x1, p.area.y1)
        d.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=None, strokeColor=MAT_INK,
                   strokeWidth=2.2))
        d.add(Rect(x0 + 2.4, y0 + 2.4, max(x1 - x0 - 4.8, 0.1), max(y1 - y0 - 4.8, 0.1),
                   fillColor=None, strokeColor=MAT_INK, strokeWidth=0.6))
        tag = _fit(f"MAT {p.id}", 5.5, max(x1 - x0 - 6, 20))
        w = stringWidth(tag, fonts.BOLD, 5.5) + 4
        # name tag just above the mat's top-left corner, clear of the bay's own label
        labels.add(Rect(x0, y1 + 1.5, w, 8, fillColor=MAT_INK, strokeColor=None))
        labels.add(_text(x0 + 2, y1 + 3.5, tag, 5.5, bold=True, color=colors.white))

    # Lift zones
    for z in zones:
        for pts in drift_outlines(z):
            for part in clip_polyline(pts, box):
                _halo_line(d, flat(part), ZONE_INK, 0.7, dash=[3, 2])
        for pts in swing_outlines(z):
            for part in clip_polyline(pts, box):
                _halo_line(d, flat(part), ZONE_INK, 1.4)
        if z.corridor:
            ring = [*z.corridor, z.corridor[0]]
            for part in clip_polyline(ring, box):
                _halo_line(d, flat(part), ZONE_INK, 1.0, dash=[8, 2, 2, 2])
        cx, cy = P(*z.crane)
        d.add(Circle(cx, cy, 5.0, fillColor=colors.white, strokeColor=ZONE_INK,
                     strokeWidth=1.2))
        d.add(Line(cx - 7, cy, cx + 7, cy, strokeColor=ZONE_INK, strokeWidth=0.8))
        d.add(Line(cx, cy - 7, cx, cy + 7, strokeColor=ZONE_INK, strokeWidth=0.8))
        tag = _fit(f"CRANE {z.id}", 6.0, 120)
        w = stringWidth(tag, fonts.BOLD, 6.0) + 4
        labels.add(Rect(cx + 7, cy + 4, w, 9, fillColor=ZONE_INK, strokeColor=None))
        labels.add(_text(cx + 9, cy + 6.3, tag, 6.0, bold=True, color=colors.white))
        # zone id on the outer arc, at mid-slew if that point is in the window
        a_mid = z.slew_start + z.slew_sweep / 2
        mx = z.crane[0] + z.r_max * math.cos(a_mid)
        my = z.crane[1] + z.r_max * math.sin(a_mid)
        if box[0] <= mx <= box[2] and box[1] <= my <= box[3]:
            px, py = P(mx, my)
            t = _fit(f"{z.id} r ≤ {fmt_value(z.r_max, 'length', system)}", 5.5, 120)
            w = stringWidth(t, fonts.REGULAR, 5.5) + 4
            labels.add(Rect(px - w / 2, py - 4, w, 8, fillColor=colors.white,
                            strokeColor=ZONE_INK, strokeWidth=0.4))
            labels.add(_text(px, py - 2, t, 5.5, anchor="middle"))

    d.add(labels)
    _north_and_scale(d, s, system, width, LEGEND_HEIGHT + 8)
    _legend(d, width)
    return d


def _north_and_scale(d: Drawing, s: float, system: UnitSystem, width: float,
                     y: float) -> None:
    unit_m = 0.3048 if system == "US" else 1.0
    length = units.nice_length(80.0 / (s * unit_m)) * unit_m  # ≤ 80 pt long
    seg = length * s / 2
    x0 = width - 2 * seg - 40
    for k in range(2):
        d.add(Rect(x0 + k * seg, y, seg, 3.5, fillColor=INK if k == 0 else colors.white,
                   strokeColor=INK, strokeWidth=0.5))
    d.add(_text(x0, y + 6, "0", 5.5, anchor="middle"))
    d.add(_text(x0 + 2 * seg, y + 6, fmt_value(length, "length", system).replace(".000", "")
                .replace(".00", ""), 5.5, anchor="middle"))
    # North arrow: +y is plan north
    nx, ny = width - 18, y
    d.add(Polygon([nx, ny + 18, nx - 4, ny + 4, nx, ny + 7, nx + 4, ny + 4],
                  fillColor=INK, strokeColor=INK, strokeWidth=0.5))
    d.add(_text(nx, ny + 20, "N", 6.5, anchor="middle", bold=True))


def _legend(d: Drawing, width: float) -> None:
    top = LEGEND_HEIGHT - 6
    d.add(Line(0, top + 2, width, top + 2, strokeColor=GRID_INK, strokeWidth=0.4))
    d.add(_text(0, top - 8, "Legend", 7.0, bold=True))
    y = top - 22
    col_w = width / 2
    for k, key in enumerate(("elastic", "plastic", "exceeds", NOT_ASSESSED)):
        st = OUTCOMES[key]
        yy = y - k * 21
        g = Group()
        g.add(Rect(0, yy - 3, 22, 12, fillColor=_hex(st.fill), strokeColor=_hex(st.edge),
                   strokeWidth=0.6))
        _hatch(g, st, 0, yy - 3, 22, yy + 9, 0.8)
        d.add(g)
        d.add(_text(27, yy + 4, f"{st.tag}  {st.label}", 6.5, bold=True))
        for i, line in enumerate(_wrap(st.meaning, 5.0, col_w - 34)[:2]):
            d.add(_text(27, yy - 2.5 - 5.6 * i, line, 5.0))
    x = col_w + 6
    items = [
        ("girder", lambda yy: Line(x, yy + 3, x + 22, yy + 3, strokeColor=INK, strokeWidth=1.6)),
        ("beam", lambda yy: Line(x, yy + 3, x + 22, yy + 3, strokeColor=INK, strokeWidth=0.6)),
        ("grid line and label", lambda yy: Line(x, yy + 3, x + 22, yy + 3, strokeColor=GRID_INK,
                                                strokeWidth=0.4, strokeDashArray=[6, 2, 1, 2])),
        ("swing region (radius band × slew arc)",
         lambda yy: Line(x, yy + 3, x + 22, yy + 3, strokeColor=ZONE_INK, strokeWidth=1.4)),
        ("drift margin for load swing",
         lambda yy: Line(x, yy + 3, x + 22, yy + 3, strokeColor=ZONE_INK, strokeWidth=0.7,
                         strokeDashArray=[3, 2])),
        ("corridor", lambda yy: Line(x, yy + 3, x + 22, yy + 3, strokeColor=ZONE_INK,
                                     strokeWidth=1.0, strokeDashArray=[8, 2, 2, 2])),
        ("protection area (mat)", lambda yy: Rect(x, yy - 1, 22, 8, fillColor=None,
                                                  strokeColor=MAT_INK, strokeWidth=1.6)),
        ("crane position / column", lambda yy: Circle(x + 11, yy + 3, 4, fillColor=colors.white,
                                                      strokeColor=ZONE_INK, strokeWidth=1.0)),
    ]
    for k, (label, make) in enumerate(items):
        yy = top - 18 - k * 11.5
        d.add(make(yy))
        d.add(_text(x + 27, yy + 1, label, 6.0))
