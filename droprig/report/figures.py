"""The plan figure of the annex, drawn as reportlab vector graphics.

Why reportlab.graphics and not matplotlib: the plan is lines, rectangles, arcs
and labels, which reportlab draws natively into the same PDF, so the figure
stays vector, its text stays searchable (a reviewer can find a bay id), it uses
the annex's embedded font and there is no second PDF to merge. matplotlib would
add ~0.5 s of import and a pypdf merge for no gain in a figure this simple.

The conditions plan shows what the permit asks for: the outcome fill (and its
tag in words) only over the part of each bay the load can reach; exclusion areas
hatched heavy black over white; pads and mats filled dark and labelled with their
specification; each bay labelled with its id, outcome, utilisation and the numbers
of the permit conditions that apply to it (hook caps among them). Girders heavy
solid, beams light solid, the reachable edge long-dashed with a halo, the drift
margin dotted, the corridor dash-dot, columns as filled squares; pick-up points
as open upright triangles (P1, P2 …), set-down points as filled inverted
triangles (S1, S2 …). Every text is at least 7 pt; nothing relies on colour
alone (greyscale-safe).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from reportlab.graphics.shapes import Circle, Drawing, Group, Line, Polygon, PolyLine, Rect, String
from reportlab.lib import colors
from reportlab.pdfbase.pdfmetrics import stringWidth

from droprig import outcomes, units
from droprig.model import Level, LiftZone, ProtectionArea, bays, lift_point_tags
from droprig.report import fonts
from droprig.report.content import NOT_ASSESSED, OUTCOMES, OutcomeStyle
from droprig.report.geometry import (
    clip_polygon,
    clip_polyline,
    drift_outlines,
    hatch_segments,
    swing_outlines,
)
from droprig.report.text import fmt_util, fmt_value
from droprig.units import UnitSystem

INK = colors.HexColor("#1A1A1A")
GRID_INK = colors.HexColor("#5A5A5A")
ZONE_INK = colors.HexColor("#101010")
MAT_INK = colors.HexColor("#1B6B4A")
LEGEND_HEIGHT = 112.0
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


MIN_PT = 7.0
"""Smallest text size on the plan, pt."""
PAD_FILL = colors.HexColor("#14261D")
"""Pads and mats: a near-black green ink (greyscale ≈ 12 %) for their outline,
studs and label box (white text)."""
PAD_STUD_STEP = 7.0
"""Spacing of a pad's studs on the plan, pt."""


def pad_symbol(x0: float, y0: float, x1: float, y1: float,
               step: float = PAD_STUD_STEP) -> Group:
    """A pad or mat on the plan (our own symbol): a heavy outline and a square
    grid of small studs, each ringed in white, over whatever lies below, so the
    bay's outcome fill still shows through (a solid pad fill hid it: on the rooftop
    demo's annex the padded bays read black, like "may go through")."""
    gr = Group()
    gr.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=None, strokeColor=colors.white,
                strokeWidth=3.4))
    gr.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=None, strokeColor=PAD_FILL,
                strokeWidth=1.6))
    nx, ny = max(int((x1 - x0) / step), 1), max(int((y1 - y0) / step), 1)
    dx, dy = (x1 - x0) / nx, (y1 - y0) / ny
    r = min(1.3, dx / 4, dy / 4)
    for i in range(nx):
        for j in range(ny):
            gr.add(Circle(x0 + (i + 0.5) * dx, y0 + (j + 0.5) * dy, r,
                          fillColor=PAD_FILL, strokeColor=colors.white, strokeWidth=0.6))
    return gr


def _overlap(a: tuple[float, float, float, float],
             b: tuple[float, float, float, float]) -> float:
    """Area (pt²) shared by two boxes (x, y, w, h)."""
    w = min(a[0] + a[2], b[0] + b[2]) - max(a[0], b[0])
    h = min(a[1] + a[3], b[1] + b[3]) - max(a[1], b[1])
    return max(w, 0.0) * max(h, 0.0)


def pad_label_box(x0: float, y0: float, x1: float, y1: float, tw: float, th: float,
                  taken: Sequence[tuple[float, float, float, float]]
                  ) -> tuple[tuple[float, float, float, float], float]:
    """Where a pad's label box (``tw`` × ``th`` pt) goes: the first corner of the
    pad (top left, bottom left, top right, bottom right, then just outside its top
    and bottom edges) that covers none of the boxes already ``taken`` (bay labels,
    other pads' labels), else the corner that covers least. Returns the box
    (x, y, w, h) and the area it still covers (pt²)."""
    tries = [(x0, y1 - th - 1), (x0, y0 + 1), (x1 - tw, y1 - th - 1), (x1 - tw, y0 + 1),
             (x0, y1 + 1), (x0, y0 - th - 1)]
    best: tuple[tuple[float, float, float, float], float] | None = None
    for x, y in tries:
        box = (x, y, tw, th)
        cover = sum(_overlap(box, t) for t in taken)
        if best is None or cover < best[1] - 1e-9:
            best = (box, cover)
        if cover <= 0.0:
            break
    assert best is not None
    return best
EXCL_INK = colors.black
REACH_DASH = [7, 2.5]
DRIFT_DASH = [1, 2]


@dataclass(frozen=True)
class BayMark:
    """What the conditions plan writes in one bay: excluded (hatched), the labels
    of the permit conditions that apply (``"C3"``) and ``scabbing``: a hard load
    may scab the soffit over the level below (the scabbing mark,
    :data:`droprig.outcomes.SCABBING`)."""

    excluded: bool = False
    conditions: tuple[str, ...] = ()
    scabbing: bool = False


def reach_polygons(zone: LiftZone) -> tuple[list[list[tuple[float, float]]],
                                            list[list[tuple[float, float]]]]:
    """(outer, holes) polygons of the area a load of ``zone`` can reach: the
    corridor when one is drawn, else the swing region widened by the drift
    margin."""
    if zone.corridor:
        return [list(zone.corridor)], []
    outs = drift_outlines(zone)
    return outs[:1], outs[1:]


def plan_drawing(level: Level, zones: Sequence[LiftZone],
                 protections: Sequence[ProtectionArea],
                 outcomes: dict[str, tuple[str, float]], system: UnitSystem,
                 width: float, height: float, *,
                 marks: dict[str, BayMark] | None = None,
                 pad_specs: dict[str, str] | None = None) -> Drawing:
    """Conditions plan of ``level`` fitted in ``width`` × ``height`` pt.

    ``outcomes``: bay id -> (response, max utilisation)
    (:func:`droprig.report.content.bay_outcomes`); ``marks``: bay id ->
    :class:`BayMark`; ``pad_specs``: protection id -> its specification in words.
    """
    fonts.register()
    marks = marks or {}
    pad_specs = pad_specs or {}
    d = Drawing(width, height)
    g = level.grid
    ext = g.extent
    xs = [ext.x0, ext.x1] + [z.crane[0] for z in zones]
    ys = [ext.y0, ext.y1] + [z.crane[1] for z in zones]
    for p in protections:
        xs += [p.area.x0, p.area.x1]
        ys += [p.area.y0, p.area.y1]
    for z in zones:
        for q in z.corridor:
            xs.append(q[0])
            ys.append(q[1])
        for lp in z.lift_points:
            xs.append(lp.at[0])
            ys.append(lp.at[1])
    pad = max(1.0, 0.06 * max(max(xs) - min(xs), max(ys) - min(ys)))
    box = (min(xs) - pad, min(ys) - pad, max(xs) + pad, max(ys) + pad)
    plan_h = height - LEGEND_HEIGHT
    s = min((width - 2 * MARGIN) / (box[2] - box[0]), (plan_h - 2 * MARGIN) / (box[3] - box[1]))
    height = LEGEND_HEIGHT + s * (box[3] - box[1]) + 2 * MARGIN
    d.height = height
    ox = (width - s * (box[2] - box[0])) / 2 - s * box[0]
    oy = LEGEND_HEIGHT + MARGIN - s * box[1]
    # plan (x, y) in m -> drawing (ox + s·x, oy + s·y) in pt, for tests and callers
    # (reportlab's Drawing refuses unknown attributes through setattr)
    d.__dict__["plan_transform"] = (s, ox, oy)

    def P(x: float, y: float) -> tuple[float, float]:
        return (ox + s * x, oy + s * y)

    def flat(pts: Sequence[tuple[float, float]]) -> list[float]:
        out: list[float] = []
        for x, y in pts:
            out += list(P(x, y))
        return out

    reach = [reach_polygons(z) for z in zones]
    labels = Group()
    bay_list = bays(level)
    # 1. bays: white, then the outcome fill over the reachable part only
    for b in bay_list:
        x0, y0 = P(b.rect.x0, b.rect.y0)
        x1, y1 = P(b.rect.x1, b.rect.y1)
        d.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=colors.white, strokeColor=None))
        resp, _ = outcomes.get(b.id, (NOT_ASSESSED, math.nan))
        st = OUTCOMES.get(resp, OUTCOMES[NOT_ASSESSED])
        if resp == NOT_ASSESSED:
            continue
        rb = (b.rect.x0, b.rect.y0, b.rect.x1, b.rect.y1)
        for outer, holes in reach:
            for poly in outer:
                part = clip_polygon(poly, rb)
                if part:
                    d.add(Polygon(flat(part), fillColor=_hex(st.fill), strokeColor=None))
            for poly in holes:
                part = clip_polygon(poly, rb)
                if part:
                    d.add(Polygon(flat(part), fillColor=colors.white, strokeColor=None))
    # 2. exclusion areas: white, heavy black hatch, heavy outline
    for b in bay_list:
        mk = marks.get(b.id)
        if mk is None or not mk.excluded:
            continue
        x0, y0 = P(b.rect.x0, b.rect.y0)
        x1, y1 = P(b.rect.x1, b.rect.y1)
        d.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=colors.white, strokeColor=None))
        for xa, ya, xb, yb in hatch_segments(x0, y0, x1, y1, 5.0, 1):
            d.add(Line(xa, ya, xb, yb, strokeColor=EXCL_INK, strokeWidth=1.3))
        d.add(Rect(x0 + 1, y0 + 1, x1 - x0 - 2, y1 - y0 - 2, fillColor=None,
                   strokeColor=EXCL_INK, strokeWidth=2.0))
    # 3. pads and mats: heavy outline and studs over the outcome fill
    for p in protections:
        x0, y0 = P(p.area.x0, p.area.y0)
        x1, y1 = P(p.area.x1, p.area.y1)
        d.add(pad_symbol(x0, y0, x1, y1))
    # deck openings
    for o in level.deck.openings:
        x0, y0 = P(o.x0, o.y0)
        x1, y1 = P(o.x1, o.y1)
        d.add(Rect(x0, y0, x1 - x0, y1 - y0, fillColor=colors.white, strokeColor=INK,
                   strokeWidth=0.8))
        d.add(Line(x0, y0, x1, y1, strokeColor=INK, strokeWidth=0.6))
        d.add(Line(x0, y1, x1, y0, strokeColor=INK, strokeWidth=0.6))
        labels.add(_text((x0 + x1) / 2, y1 + 2, "opening", MIN_PT, anchor="middle"))
    # grid lines with bubbles
    gx0, gy0 = P(box[0], box[1])
    gx1, gy1 = P(box[2], box[3])
    r_b = 7.5
    for x, lab in zip(g.x_lines, g.x_labels, strict=True):
        px, _ = P(x, 0)
        d.add(Line(px, gy0 - 4, px, gy1 + 4, strokeColor=GRID_INK, strokeWidth=0.4,
                   strokeDashArray=[6, 2, 1, 2]))
        d.add(Circle(px, gy1 + 4 + r_b, r_b, fillColor=colors.white, strokeColor=INK,
                     strokeWidth=0.6))
        d.add(_text(px, gy1 + 4 + r_b - 2.5, _fit(lab, MIN_PT, 2 * r_b - 1), MIN_PT,
                    anchor="middle", bold=True))
    for y, lab in zip(g.y_lines, g.y_labels, strict=True):
        _, py = P(0, y)
        d.add(Line(gx0 - 4, py, gx1 + 4, py, strokeColor=GRID_INK, strokeWidth=0.4,
                   strokeDashArray=[6, 2, 1, 2]))
        d.add(Circle(gx0 - 4 - r_b, py, r_b, fillColor=colors.white, strokeColor=INK,
                     strokeWidth=0.6))
        d.add(_text(gx0 - 4 - r_b, py - 2.5, _fit(lab, MIN_PT, 2 * r_b - 1), MIN_PT,
                    anchor="middle", bold=True))
    # framing: girders heavy, beams light, columns filled squares
    for m in level.members:
        (ax, ay), (bx, by) = P(*m.start), P(*m.end)
        girder = m.role == "girder"
        _halo_line(d, [ax, ay, bx, by], INK, 2.2 if girder else 0.6, halo=0.9)
    for cx, cy in g.columns:
        px, py = P(cx, cy)
        d.add(Rect(px - 3, py - 3, 6, 6, fillColor=INK, strokeColor=colors.white,
                   strokeWidth=0.6))
    # reachable edge (long dash), drift margin (dotted), corridor (dash-dot)
    for z in zones:
        if z.drift_margin > 0:
            for pts in drift_outlines(z):
                for part in clip_polyline(pts, box):
                    _halo_line(d, flat(part), ZONE_INK, 0.9, dash=DRIFT_DASH)
        for pts in swing_outlines(z):
            for part in clip_polyline(pts, box):
                _halo_line(d, flat(part), ZONE_INK, 1.2, dash=REACH_DASH)
        if z.corridor:
            ring = [*z.corridor, z.corridor[0]]
            for part in clip_polyline(ring, box):
                _halo_line(d, flat(part), ZONE_INK, 1.0, dash=[8, 2, 2, 2])
        cx, cy = P(*z.crane)
        d.add(Circle(cx, cy, 5.0, fillColor=colors.white, strokeColor=ZONE_INK,
                     strokeWidth=1.2))
        d.add(Line(cx - 7, cy, cx + 7, cy, strokeColor=ZONE_INK, strokeWidth=0.8))
        d.add(Line(cx, cy - 7, cx, cy + 7, strokeColor=ZONE_INK, strokeWidth=0.8))
        tag = _fit(f"CRANE {z.id}", MIN_PT, 140)
        w = stringWidth(tag, fonts.BOLD, MIN_PT) + 4
        labels.add(Rect(cx + 7, cy + 4, w, 10, fillColor=ZONE_INK, strokeColor=None))
        labels.add(_text(cx + 9, cy + 6.5, tag, MIN_PT, bold=True, color=colors.white))
    # bay labels (their boxes kept: a pad's label is placed clear of them)
    taken: list[tuple[float, float, float, float]] = []
    for b in bay_list:
        resp, u = outcomes.get(b.id, (NOT_ASSESSED, math.nan))
        st = OUTCOMES.get(resp, OUTCOMES[NOT_ASSESSED])
        mk = marks.get(b.id, BayMark())
        x0, y0 = P(b.rect.x0, b.rect.y0)
        x1, y1 = P(b.rect.x1, b.rect.y1)
        lines = [(b.id, True), (f"{st.tag} {st.label}" if resp != NOT_ASSESSED
                                else "not reached", False)]
        if resp != NOT_ASSESSED:
            lines.append((f"U = {fmt_util(u)}", False))
        if mk.excluded:
            lines.append(("EXCLUDED", True))
        if mk.conditions:
            lines.append((" ".join(mk.conditions), True))
        bw = x1 - x0 - 4
        lines = [(_fit(t, MIN_PT, bw, fonts.BOLD if bold else fonts.REGULAR), bold)
                 for t, bold in lines]
        size = MIN_PT
        while lines and len(lines) * size * 1.2 + 3 > (y1 - y0) - 4:
            lines.pop(2 if len(lines) > 2 else -1)
        if not lines:
            continue
        tw = max(stringWidth(t, fonts.BOLD if bold else fonts.REGULAR, size)
                 for t, bold in lines) + 4
        th = len(lines) * size * 1.2 + 3
        cx, cy = (x0 + x1) / 2, (y0 + y1) / 2
        taken.append((cx - tw / 2, cy - th / 2, tw, th))
        labels.add(Rect(cx - tw / 2, cy - th / 2, tw, th, fillColor=colors.white,
                        strokeColor=_hex(st.edge), strokeWidth=0.6))
        for k, (t, bold) in enumerate(lines):
            labels.add(_text(cx, cy + th / 2 - (k + 1) * size * 1.2 + size * 0.28, t, size,
                             anchor="middle", bold=bold))
    # scabbing marks in the top-right corner of each bay that may scab
    for b in bay_list:
        if marks.get(b.id, BayMark()).scabbing:
            x0, y0 = P(b.rect.x0, b.rect.y0)
            x1, y1 = P(b.rect.x1, b.rect.y1)
            r = min(SCAB_RADIUS, (x1 - x0) / 4, (y1 - y0) / 4)
            if r >= 2.5:
                labels.add(scabbing_mark(x1 - r - 2, y1 - r - 2, r))
    # pad labels: id and specification in a corner of the pad clear of the bay
    # labels (on the pad's top edge they hid the padded bays' ids and outcomes on
    # the rooftop demo's annex); where the whole text finds no clear corner, the id
    # alone (the specification is in the pad's permit condition)
    for p in protections:
        x0, y0 = P(p.area.x0, p.area.y0)
        x1, y1 = P(p.area.x1, p.area.y1)
        texts = [f"PAD {p.id}: {pad_specs.get(p.id, p.kind)}", f"PAD {p.id}"]
        for n, text in enumerate(texts):
            lines = _wrap(text, MIN_PT, max(x1 - x0 - 8, 60))[:6]
            tw = max(stringWidth(t, fonts.REGULAR, MIN_PT) for t in lines) + 6
            th = len(lines) * MIN_PT * 1.2 + 3
            (bx, by, _, _), cover = pad_label_box(x0, y0, x1, y1, tw, th, taken)
            if cover <= 0.0 or n == len(texts) - 1:
                break
        taken.append((bx, by, tw, th))
        labels.add(Rect(bx, by, tw, th, fillColor=PAD_FILL, strokeColor=colors.white,
                        strokeWidth=0.6))
        for k, t in enumerate(lines):
            labels.add(_text(bx + 3, by + th - (k + 1) * MIN_PT * 1.2 + 1, t, MIN_PT,
                             color=colors.white))
    d.add(labels)
    _lift_points(d, zones, P)  # above the labels: a point is never hidden
    _north_and_scale(d, s, system, width, LEGEND_HEIGHT + 8)
    _legend(d, width)
    return d


SCAB_RADIUS = 5.0
"""Radius of the scabbing mark on the plan, pt."""


def scabbing_mark(x: float, y: float, r: float = SCAB_RADIUS) -> Group:
    """The scabbing mark (:data:`droprig.outcomes.SCABBING`, our own symbol): a
    burnt-orange disc of radius ``r`` (pt) centred at (x, y) with a white
    lower-case tag letter, ringed in white so it reads over any bay fill."""
    gr = Group()
    ink = _hex(outcomes.SCABBING.ink)
    gr.add(Circle(x, y, r, fillColor=ink, strokeColor=colors.white, strokeWidth=0.8))
    size = max(MIN_PT, 1.5 * r)
    gr.add(_text(x, y - 0.35 * size, outcomes.SCABBING.tag, size, anchor="middle",
                 bold=True, color=colors.white))
    return gr


POINT_SIZE = 6.5
"""Half-height of the pick-up and set-down triangles, pt."""


def lift_point_symbol(kind: str, x: float, y: float, size: float = POINT_SIZE) -> Group:
    """Pick-up: an open upright triangle with a heavy outline; set-down: a filled
    inverted triangle. Told apart by shape and by fill, so also in greyscale."""
    gr = Group()
    if kind == "pick_up":
        pts = [x - size, y - size * 0.8, x + size, y - size * 0.8, x, y + size * 1.1]
        gr.add(Polygon(pts, fillColor=colors.white, strokeColor=colors.white,
                       strokeWidth=3.2, strokeLineJoin=1))
        gr.add(Polygon(pts, fillColor=colors.white, strokeColor=INK, strokeWidth=1.6,
                       strokeLineJoin=1))
    else:
        pts = [x - size, y + size * 0.8, x + size, y + size * 0.8, x, y - size * 1.1]
        gr.add(Polygon(pts, fillColor=INK, strokeColor=colors.white, strokeWidth=1.8,
                       strokeLineJoin=1))
    return gr


def _lift_points(d: Drawing, zones: Sequence[LiftZone], P: object) -> None:
    """Each zone's pick-up and set-down points with their tags (zone id added
    when the level carries more than one zone)."""
    several = len(zones) > 1
    for z in zones:
        for tag, lp in zip(lift_point_tags(z), z.lift_points, strict=True):
            x, y = P(*lp.at)  # type: ignore[operator]
            d.add(lift_point_symbol(lp.kind, x, y))
            text = f"{z.id} {tag}" if several else tag
            w = stringWidth(text, fonts.BOLD, MIN_PT) + 4
            d.add(Rect(x + POINT_SIZE + 1, y - 4, w, 9.5, fillColor=colors.white,
                       strokeColor=INK, strokeWidth=0.5))
            d.add(_text(x + POINT_SIZE + 3, y - 1.5, text, MIN_PT, bold=True))


def _north_and_scale(d: Drawing, s: float, system: UnitSystem, width: float,
                     y: float) -> None:
    unit_m = 0.3048 if system == "US" else 1.0
    length = units.nice_length(80.0 / (s * unit_m)) * unit_m  # ≤ 80 pt long
    seg = length * s / 2
    x0 = width - 2 * seg - 40
    for k in range(2):
        d.add(Rect(x0 + k * seg, y, seg, 3.5, fillColor=INK if k == 0 else colors.white,
                   strokeColor=INK, strokeWidth=0.5))
    d.add(_text(x0, y + 6, "0", MIN_PT, anchor="middle"))
    d.add(_text(x0 + 2 * seg, y + 6, fmt_value(length, "length", system).replace(".000", "")
                .replace(".00", ""), MIN_PT, anchor="middle"))
    nx, ny = width - 18, y
    d.add(Polygon([nx, ny + 18, nx - 4, ny + 4, nx, ny + 7, nx + 4, ny + 4],
                  fillColor=INK, strokeColor=INK, strokeWidth=0.5))
    d.add(_text(nx, ny + 20, "N", 8.0, anchor="middle", bold=True))


def _legend(d: Drawing, width: float) -> None:
    top = LEGEND_HEIGHT - 6
    d.add(Line(0, top + 2, width, top + 2, strokeColor=GRID_INK, strokeWidth=0.4))
    d.add(_text(0, top - 9, "Legend", 8.0, bold=True))
    col_w = width / 3
    row = 12.5

    def sw_rect(x: float, yy: float, fill: colors.Color) -> Rect:
        return Rect(x, yy - 2, 22, 9, fillColor=fill, strokeColor=INK, strokeWidth=0.5)

    def excl(x: float, yy: float) -> Group:
        gr = Group()
        gr.add(Rect(x, yy - 2, 22, 9, fillColor=colors.white, strokeColor=EXCL_INK,
                    strokeWidth=1.2))
        for xa, ya, xb, yb in hatch_segments(x, yy - 2, x + 22, yy + 7, 4.0, 1):
            gr.add(Line(xa, ya, xb, yb, strokeColor=EXCL_INK, strokeWidth=1.0))
        return gr

    def line(x: float, yy: float, w: float, dash: list[float] | None,
             ink: colors.Color = INK) -> Line:
        return Line(x, yy + 2.5, x + 22, yy + 2.5, strokeColor=ink, strokeWidth=w,
                    strokeDashArray=dash)

    cols: list[list[tuple[str, object]]] = [
        [(f"{OUTCOMES[k].tag} {OUTCOMES[k].label} (reachable part)",
          lambda x, yy, k=k: sw_rect(x, yy, _hex(OUTCOMES[k].fill)))
         for k in ("elastic", "plastic", "exceeds", "perforates")]
        + [("not reached by the load", lambda x, yy: sw_rect(x, yy, colors.white)),
           (f"{outcomes.SCABBING.label.lower()}: clear level below",
            lambda x, yy: scabbing_mark(x + 11, yy + 2.5, 4.5))],
        [("exclusion area: keep the load off", excl),
         ("pad or mat to lay (see its label)",
          lambda x, yy: pad_symbol(x, yy - 2, x + 22, yy + 7, 5.0)),
         ("C3: permit condition no. 3 applies", lambda x, yy: _text(x + 2, yy, "C3", MIN_PT,
                                                                    bold=True)),
         ("column", lambda x, yy: Rect(x + 8, yy - 0.5, 6, 6, fillColor=INK,
                                       strokeColor=None)),
         ("P1: pick-up point (inputs, section 4)",
          lambda x, yy: lift_point_symbol("pick_up", x + 11, yy + 2.5, 4.5)),
         ("S1: set-down point (inputs, section 4)",
          lambda x, yy: lift_point_symbol("set_down", x + 11, yy + 2.5, 4.5))],
        [("girder", lambda x, yy: line(x, yy, 2.2, None)),
         ("beam", lambda x, yy: line(x, yy, 0.6, None)),
         ("edge of the swing region", lambda x, yy: line(x, yy, 1.2, REACH_DASH, ZONE_INK)),
         ("drift margin (load swing)", lambda x, yy: line(x, yy, 0.9, DRIFT_DASH, ZONE_INK)),
         ("corridor", lambda x, yy: line(x, yy, 1.0, [8, 2, 2, 2], ZONE_INK)),
         ("crane position", lambda x, yy: Circle(x + 11, yy + 2.5, 4, fillColor=colors.white,
                                                 strokeColor=ZONE_INK, strokeWidth=1.0))],
    ]
    for c, items in enumerate(cols):
        x = c * col_w
        for k, (label, make) in enumerate(items):
            yy = top - 24 - k * row
            d.add(make(x, yy))  # type: ignore[operator]
            for i, t in enumerate(_wrap(label, MIN_PT, col_w - 32)[:1]):
                d.add(_text(x + 27, yy - i * 8, t, MIN_PT))
