"""Graphics items and raster helpers of the plan view.

Scene coordinates are metres with the y axis flipped (scene y = −plan y) so
north (+y) is up on screen. Items that carry text or symbols of a fixed screen
size (bay labels, column squares, the crane symbol) draw those parts in device
pixels inside ``paint`` and ask the view for the current pixel size so their
bounding rectangles always cover what they draw.

Every item here is persistent: the view updates its data instead of deleting
and re-creating it, so a handle can never be deleted while it is handling its
own mouse event.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from PySide6.QtCore import QLineF, QPointF, QRectF, Qt
from PySide6.QtGui import (
    QBrush,
    QColor,
    QFont,
    QFontMetricsF,
    QImage,
    QPainter,
    QPainterPath,
    QPen,
    QPolygonF,
    QTransform,
)
from PySide6.QtWidgets import (
    QGraphicsItem,
    QGraphicsSceneMouseEvent,
    QStyleOptionGraphicsItem,
    QWidget,
)

from droprig.gui import style
from droprig.model import Bay, Level, LiftZone, ProtectionArea, Rect, lift_point_tags
from droprig.outcomes import fmt_utilisation

# ------------------------------------------------------------------ helpers


def to_scene(x: float, y: float) -> QPointF:
    """Plan (x, y) in m -> scene point (y flipped)."""
    return QPointF(x, -y)


def from_scene(p: QPointF) -> tuple[float, float]:
    """Scene point -> plan (x, y) in m."""
    return float(p.x()), float(-p.y())


def rect_to_scene(r: Rect) -> QRectF:
    return QRectF(r.x0, -r.y1, r.width, r.height)


def cosmetic_pen(color: str | QColor, width: float,
                 style_: Qt.PenStyle = Qt.PenStyle.SolidLine) -> QPen:
    pen = QPen(QColor(color))
    pen.setWidthF(width)
    pen.setCosmetic(True)
    pen.setStyle(style_)
    pen.setCapStyle(Qt.PenCapStyle.FlatCap)
    return pen


def pixel_font(px: float, bold: bool = False) -> QFont:
    f = QFont()
    f.setPixelSize(max(1, round(px)))
    f.setBold(bold)
    return f


class PixelSized:
    """Mixin: items that draw a fixed-pixel margin around their geometry.

    ``px`` is the scene length of one screen pixel, set by the view whenever it
    zooms; the bounding rectangle is grown by ``margin_px * px``.
    """

    margin_px: float = 0.0

    def __init__(self) -> None:
        self._px = 0.05

    def set_pixel_size(self, px: float) -> None:
        if px > 0 and abs(px - self._px) > 1e-12 * px:
            self.prepareGeometryChange()  # type: ignore[attr-defined]
            self._px = px

    def _grow(self, r: QRectF) -> QRectF:
        m = self.margin_px * self._px
        return r.adjusted(-m, -m, m, m)


# -------------------------------------------------------------- bay states


SHORT_WORDS = {"elastic": "ELASTIC", "plastic": "YIELDS", "exceeds": "EXCEEDS",
               "perforates": "GOES THROUGH", style.OUTCOME_NONE: "NOT ASSESSED"}
"""One-word bay labels when the full outcome words do not fit. A bay not assessed
reads as the legend does (it read "N/A", which a reader can take for "no check
needed"); where that does not fit, the legend's tag."""


@dataclass(frozen=True)
class BayState:
    """What the plan shows for one bay: worst outcome over the displayed
    cases, greatest utilisation and least allowable drop heights (SI, None when
    no summary exists or none is defined); ``scabbing``: a hard load of a displayed
    case may scab the soffit over the level below (the scabbing mark); ``u_load`` and
    ``h_load``: the loads that set the utilisation and the height."""

    bay: Bay
    key: str = style.OUTCOME_NONE
    max_utilisation: float | None = None
    allowable_drop_height: float | None = None
    allowable_drop_height_plastic: float | None = None
    n_points: int = 0
    scabbing: bool = False
    u_load: str = ""
    h_load: str = ""
    """Where the plan shows the worst of several loads: the load that sets the
    greatest utilisation and the one that sets the least allowable drop height
    (empty for one load), so a hover never mixes two loads' numbers unnamed."""

    def short_word(self) -> str:
        """One word for a small bay label."""
        return SHORT_WORDS.get(self.key, style.outcome(self.key).label.split()[0].upper())

    def label_lines(self, second: str) -> tuple[str, str]:
        """(outcome words, value line) drawn in the bay."""
        st = style.outcome(self.key)
        if self.key == style.OUTCOME_NONE:
            return st.label.upper(), ""
        return st.label.upper(), second


def fmt_ratio(u: float | None) -> str:
    """Utilisation as text everywhere in droprig (:func:`droprig.outcomes.fmt_utilisation`)."""
    return fmt_utilisation(u)


def utilisation_line(s: BayState) -> tuple[str, str]:
    """(line under the outcome words, its compact form) for the utilisation."""
    u = fmt_ratio(s.max_utilisation)
    return f"U {u}", u


class BaysItem(PixelSized, QGraphicsItem):
    """Bay panels filled with the outcome colour and hatch (z 0)."""

    def __init__(self) -> None:
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._states: list[BayState] = []
        self._rect = QRectF()
        self.fill_alpha = 255
        self.setZValue(0)

    def set_states(self, states: Sequence[BayState]) -> None:
        self.prepareGeometryChange()
        self._states = list(states)
        r = QRectF()
        for s in self._states:
            r = r.united(rect_to_scene(s.bay.rect))
        self._rect = r
        self.update()

    def set_fill_alpha(self, alpha: int) -> None:
        self.fill_alpha = alpha
        self.update()

    @property
    def states(self) -> list[BayState]:
        return self._states

    def boundingRect(self) -> QRectF:
        return self._grow(self._rect)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        painter.setPen(Qt.PenStyle.NoPen)
        for s in self._states:
            st = style.outcome(s.key)
            r = rect_to_scene(s.bay.rect)
            if self.fill_alpha > 0:
                painter.fillRect(r, st.fill_brush(self.fill_alpha))
            if st.hatch != Qt.BrushStyle.NoBrush:
                painter.fillRect(r, st.hatch_brush(150 if self.fill_alpha else 90))


class BayLabelsItem(PixelSized, QGraphicsItem):
    """Outcome words and a value in every bay, in screen pixels (z 8).

    The label shrinks with the bay on screen: two lines on a plate, then the
    outcome tag with the value, then the tag alone, so the verdict is always
    in text as well as in colour.
    """

    def __init__(self, bays_item: BaysItem) -> None:
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._bays = bays_item
        self.value_line: Callable[[BayState], tuple[str, str]] = utilisation_line
        self.avoid: Callable[[], list[QRectF]] = list
        """Device rectangles a bay tag must not cover (the zone's handles)."""
        self.setZValue(8)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)

    def boundingRect(self) -> QRectF:
        return self._bays.boundingRect()

    @staticmethod
    def place(plate: QRectF, bay: QRectF, avoid: list[QRectF]) -> QRectF:
        """``plate`` (centred in ``bay``) moved up or down, then sideways, inside
        the bay, in steps, until it covers none of ``avoid``; where no place is
        free it stays centred."""
        if not any(plate.intersects(a) for a in avoid):
            return plate
        # every place inside the bay on a 3 px lattice, nearest to the centre first
        free = []
        nx = int((bay.width() - plate.width()) / 3)
        ny = int((bay.height() - plate.height()) / 3)
        for i in range(nx + 1):
            for j in range(ny + 1):
                r = QRectF(bay.left() + 3 * i, bay.top() + 3 * j, plate.width(),
                           plate.height())
                if not any(r.intersects(a) for a in avoid):
                    d = (r.center().x() - plate.center().x()) ** 2 + \
                        (r.center().y() - plate.center().y()) ** 2
                    free.append((d, r))
        return min(free, key=lambda t: t[0])[1] if free else plate

    def plates(self, t: QTransform) -> list[tuple[BayState, list[str], QRectF]]:
        """Each labelled bay with its lines and its plate (device px), placed
        clear of :attr:`avoid`."""
        bold, plain = pixel_font(11, True), pixel_font(11)
        avoid = [a.adjusted(-2, -2, 2, 2) for a in self.avoid()]
        out = []
        for s in self._bays.states:
            dr = t.mapRect(rect_to_scene(s.bay.rect))
            lines = self.label_for(s, dr.width(), dr.height())
            if not lines:
                continue
            fms = [QFontMetricsF(bold if i == 0 else plain) for i in range(len(lines))]
            w = max(fm.horizontalAdvance(t_) for fm, t_ in zip(fms, lines, strict=True)) + 8
            h = 14.0 * len(lines) + 4
            plate = QRectF(dr.center().x() - w / 2, dr.center().y() - h / 2, w, h)
            placed = self.place(plate, dr, avoid)
            if any(placed.intersects(a) for a in avoid) and lines != [style.outcome(s.key).tag]:
                # no free place for the whole label: the outcome tag alone, placed
                tag = style.outcome(s.key).tag
                tw = QFontMetricsF(bold).horizontalAdvance(tag) + 8
                small = QRectF(dr.center().x() - tw / 2, dr.center().y() - 9, tw, 18)
                lines, placed = [tag], self.place(small, dr, avoid)
            out.append((s, lines, placed))
        return out

    def scabbing_marks(self, t: QTransform) -> list[QRectF]:
        """Device rectangles of the scabbing marks: the top-right corner of each bay
        that may scab, where the bay is at least 3 marks wide and tall on screen."""
        out = []
        for s in self._bays.states:
            if not s.scabbing:
                continue
            dr = t.mapRect(rect_to_scene(s.bay.rect))
            if dr.width() >= 3 * SCAB_MARK_PX and dr.height() >= 3 * SCAB_MARK_PX:
                out.append(QRectF(dr.right() - SCAB_MARK_PX - 3, dr.top() + 3,
                                  SCAB_MARK_PX, SCAB_MARK_PX))
        return out

    def label_for(self, s: BayState, width_px: float, height_px: float) -> list[str]:
        """The lines that fit a bay of the given screen size (for tests too)."""
        full, number = self.value_line(s)
        words, value = s.label_lines(full)
        st = style.outcome(s.key)
        fm_b = QFontMetricsF(pixel_font(11, True))
        fm = QFontMetricsF(pixel_font(11))
        lines = [words, value] if value else [words]
        need_w = max(fm_b.horizontalAdvance(words), fm.horizontalAdvance(value)) + 10
        if need_w <= width_px and 15 * len(lines) + 6 <= height_px:
            return lines
        number = number if value else ""
        for short in (f"{s.short_word()} {number}".strip(), f"{st.tag} {number}".strip()):
            if fm_b.horizontalAdvance(short) + 8 <= width_px and height_px >= 20:
                return [short]
        if width_px >= 14 and height_px >= 14:
            return [st.tag]
        return []

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        t = painter.worldTransform()
        painter.save()
        painter.resetTransform()
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        painter.setRenderHint(QPainter.RenderHint.TextAntialiasing, True)
        bold, plain = pixel_font(11, True), pixel_font(11)
        for rect in self.scabbing_marks(t):
            paint_scabbing_mark(painter, rect)
        for s, lines, plate in self.plates(t):
            st = style.outcome(s.key)
            w = plate.width()
            painter.setPen(cosmetic_pen(st.edge, 1.0))
            painter.setBrush(QColor(255, 255, 255, 225))
            painter.drawRoundedRect(plate, 3, 3)
            painter.setPen(QColor("#111111"))
            for i, line in enumerate(lines):
                painter.setFont(bold if i == 0 else plain)
                painter.drawText(QRectF(plate.left(), plate.top() + 2 + 14 * i, w, 14),
                                 Qt.AlignmentFlag.AlignCenter, line)
        painter.restore()


SCAB_MARK_PX = 15.0
"""Diameter of the scabbing mark on the screen plan, px."""


def paint_scabbing_mark(painter: QPainter, rect: QRectF) -> None:
    """The scabbing mark (:data:`droprig.outcomes.SCABBING`, our own symbol) in
    ``rect`` (device px): a burnt-orange disc ringed in white with the white tag
    letter, as on the annex plan."""
    from droprig.outcomes import SCABBING

    painter.save()
    painter.setPen(cosmetic_pen("#FFFFFF", 1.5))
    painter.setBrush(QColor(SCABBING.ink))
    painter.drawEllipse(rect)
    painter.setPen(QColor("#FFFFFF"))
    painter.setFont(pixel_font(max(8.0, rect.height() * 0.75), True))
    painter.drawText(rect, Qt.AlignmentFlag.AlignCenter, SCABBING.tag)
    painter.restore()


# ---------------------------------------------------------------- framing


class FramingItem(PixelSized, QGraphicsItem):
    """Girders (heavy), beams (light) and columns (small squares) (z 3)."""

    margin_px = 6.0

    def __init__(self) -> None:
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._girders: list[tuple[QPointF, QPointF]] = []
        self._beams: list[tuple[QPointF, QPointF]] = []
        self._columns: list[QPointF] = []
        self._rect = QRectF()
        self.setZValue(3)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)

    def set_level(self, level: Level | None) -> None:
        self.prepareGeometryChange()
        self._girders, self._beams, self._columns = [], [], []
        r = QRectF()
        if level is not None:
            for m in level.members:
                seg = (to_scene(*m.start), to_scene(*m.end))
                (self._girders if m.role == "girder" else self._beams).append(seg)
            self._columns = [to_scene(x, y) for x, y in level.grid.columns]
            r = rect_to_scene(level.grid.extent)
            for a, b in self._girders + self._beams:
                r = r.united(QRectF(a, b).normalized())
        self._rect = r
        self.update()

    @property
    def counts(self) -> tuple[int, int, int]:
        """(girders, beams, columns) drawn."""
        return len(self._girders), len(self._beams), len(self._columns)

    def boundingRect(self) -> QRectF:
        return self._grow(self._rect)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        painter.setPen(cosmetic_pen(style.PLAN["beam"], 1.2))
        painter.drawLines([QLineF(a, b) for a, b in self._beams])
        painter.setPen(cosmetic_pen(style.PLAN["girder"], 3.0))
        painter.drawLines([QLineF(a, b) for a, b in self._girders])
        t = painter.worldTransform()
        painter.save()
        painter.resetTransform()
        painter.setPen(Qt.PenStyle.NoPen)
        painter.setBrush(QColor(style.PLAN["column"]))
        size = 8.0 if t.m11() * 0.4 > 8 else 6.0
        for c in self._columns:
            p = t.map(c)
            painter.drawRect(QRectF(p.x() - size / 2, p.y() - size / 2, size, size))
        painter.restore()


class OpeningsItem(PixelSized, QGraphicsItem):
    """Deck openings: white, orthogonal cross-hatch, heavy outline and the two
    diagonals (z 2, above the overlay so a hole never reads as a result)."""

    def __init__(self) -> None:
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._rects: list[QRectF] = []
        self._rect = QRectF()
        self.setZValue(2)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)

    def set_openings(self, rects: Sequence[Rect]) -> None:
        self.prepareGeometryChange()
        self._rects = [rect_to_scene(r) for r in rects]
        r = QRectF()
        for q in self._rects:
            r = r.united(q)
        self._rect = r
        self.update()

    @property
    def count(self) -> int:
        return len(self._rects)

    def boundingRect(self) -> QRectF:
        return self._grow(self._rect)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        for r in self._rects:
            painter.fillRect(r, QColor(style.PLAN["opening"]))
            painter.fillRect(r, QBrush(QColor("#7A7A7A"), Qt.BrushStyle.CrossPattern))
            painter.setPen(cosmetic_pen("#1A1A1A", 1.0))
            painter.drawLine(r.topLeft(), r.bottomRight())
            painter.drawLine(r.bottomLeft(), r.topRight())
            painter.setPen(cosmetic_pen("#1A1A1A", 2.4))
            painter.setBrush(Qt.BrushStyle.NoBrush)
            painter.drawRect(r)
        t = painter.worldTransform()
        painter.save()
        painter.resetTransform()
        painter.setFont(pixel_font(10, True))
        for r in self._rects:
            dr = t.mapRect(r)
            if dr.width() > 70 and dr.height() > 18:
                plate = QRectF(dr.center().x() - 30, dr.top() + 3, 60, 14)
                painter.fillRect(plate, QColor(255, 255, 255, 230))
                painter.setPen(QColor("#1A1A1A"))
                painter.drawText(plate, Qt.AlignmentFlag.AlignCenter, "OPENING")
        painter.restore()


def paint_lift_point(painter: QPainter, kind: str, x: float, y: float, s: float) -> None:
    """One lift-plan point's symbol at device (x, y), ``s`` px: pick-up an open
    triangle pointing up, set-down a filled one pointing down (the annex's symbols,
    :func:`droprig.report.figures.lift_point_symbol`)."""
    if kind == "pick_up":  # apex up (device y runs down)
        tri = QPolygonF([QPointF(x - s, y + 0.8 * s), QPointF(x + s, y + 0.8 * s),
                         QPointF(x, y - 1.1 * s)])
        painter.setPen(cosmetic_pen("#FFFFFF", 4.0))
        painter.setBrush(QColor("#FFFFFF"))
        painter.drawPolygon(tri)
        painter.setPen(cosmetic_pen("#1A1A1A", 2.0))
        painter.drawPolygon(tri)
    else:
        tri = QPolygonF([QPointF(x - s, y - 0.8 * s), QPointF(x + s, y - 0.8 * s),
                         QPointF(x, y + 1.1 * s)])
        painter.setPen(cosmetic_pen("#FFFFFF", 2.0))
        painter.setBrush(QColor("#1A1A1A"))
        painter.drawPolygon(tri)


class LiftPointsItem(PixelSized, QGraphicsItem):
    """The lift plan's pick-up and set-down points with their tags (``P1``, ``S2``:
    :func:`droprig.model.lift_point_tags`), the symbols of the annex's conditions plan
    (:func:`droprig.report.figures.lift_point_symbol`): pick-up an open triangle
    pointing up, set-down a filled triangle pointing down, told apart by shape and
    fill. The window's verdict names points by tag when one lies in a bay a load must
    not be carried over (:func:`droprig.permit.plan_clashes`); they were drawn only
    in the annex, so the window named points it did not show (seen under Xvfb on the
    rooftop demo). Fixed pixel size, z 8.8: above bays, pads, zones and their labels
    (the rooftop demo's P1 and S2 sit under a pad's label)."""

    margin_px = 60.0
    SIZE_PX = 7.0

    def __init__(self) -> None:
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._points: list[tuple[str, str, QPointF]] = []
        self._zones: list[LiftZone] = []
        self._rect = QRectF()
        self.setZValue(8.8)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)

    def set_zones(self, zones: Sequence[LiftZone]) -> None:
        self.prepareGeometryChange()
        several = len(zones) > 1
        self._points = [(p.kind, f"{z.id} {tag}" if several else tag, to_scene(*p.at))
                        for z in zones
                        for tag, p in zip(lift_point_tags(z), z.lift_points, strict=True)]
        self._zones = list(zones)
        r = QRectF()
        for _, _, q in self._points:
            r = r.united(QRectF(q.x() - 1e-3, q.y() - 1e-3, 2e-3, 2e-3))
        self._rect = r
        self.update()

    def obstacles(self, t: QTransform) -> list[QRectF]:
        """Device rectangles a name on the plan keeps clear of where it can: each
        point's symbol with room for its tag on any side (the rooftop demo's pad name
        sat under P1's and S2's tags)."""
        s = self.SIZE_PX
        return [lift_point_box(t.map(q), s).adjusted(-26, -18, 26, 18)
                for _, _, q in self._points]

    @property
    def tags(self) -> list[str]:
        return [t for _, t, _ in self._points]

    @property
    def kinds(self) -> set[str]:
        return {k for k, _, _ in self._points}

    def boundingRect(self) -> QRectF:
        return self._grow(self._rect)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        t = painter.worldTransform()
        painter.save()
        painter.resetTransform()
        painter.setRenderHint(QPainter.RenderHint.Antialiasing)
        painter.setFont(pixel_font(10, True))
        fm = painter.fontMetrics()
        s = self.SIZE_PX
        ink = QColor("#1A1A1A")
        centres = [t.map(q) for _, _, q in self._points]
        # every symbol's box is taken first; each tag then goes right, left, above or
        # below its symbol, the first place clear of symbols and earlier tags (the
        # rooftop demo's S2 tag sat on P1, 2 m away)
        taken = [lift_point_box(c, s) for c in centres]
        # and each crane with its label (the two-level demo's S1 tag sat on it)
        for z in self._zones:
            cp = t.map(to_scene(*z.crane))
            taken += [QRectF(cp.x() - 19, cp.y() - 19, 38, 38),
                      crane_label_rect(cp, z, px_per_m(t))]
        for (kind, tag, _), c in zip(self._points, centres, strict=True):
            x, y = c.x(), c.y()
            paint_lift_point(painter, kind, x, y, s)
            w = fm.horizontalAdvance(tag) + 6
            options = [QRectF(x + s + 2, y - 7, w, 14), QRectF(x - s - 2 - w, y - 7, w, 14),
                       QRectF(x - w / 2, y - 1.1 * s - 17, w, 14),
                       QRectF(x - w / 2, y + 1.1 * s + 3, w, 14)]
            own = lift_point_box(c, s)
            plate = next((o for o in options
                          if not any(o.intersects(r) for r in taken if r != own)),
                         options[0])
            taken.append(plate)
            painter.setPen(cosmetic_pen("#1A1A1A", 1.0))
            painter.setBrush(QColor(255, 255, 255, 235))
            painter.drawRect(plate)
            painter.setPen(ink)
            painter.drawText(plate, Qt.AlignmentFlag.AlignCenter, tag)
        painter.restore()


class ProtectionItem(PixelSized, QGraphicsItem):
    """Mats and crushable layers: outlined rectangles with their name (z 4)."""

    margin_px = 4.0

    def __init__(self, part: str = "area") -> None:
        """``part``: "area" draws the rectangles (z 4), "label" the names (z 7.9,
        above the overlay and framing but under the bay verdict labels, which
        matter more where the two meet)."""
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._areas: list[ProtectionArea] = []
        self._rect = QRectF()
        self.part = part
        self.avoid: Callable[[], list[QRectF]] = list
        """Device rectangles the name keeps clear of where it can (set by the view)."""
        self.setZValue(4 if part == "area" else 7.9)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)

    def set_areas(self, areas: Sequence[ProtectionArea]) -> None:
        self.prepareGeometryChange()
        self._areas = list(areas)
        r = QRectF()
        for a in self._areas:
            r = r.united(rect_to_scene(a.area))
        self._rect = r
        self.update()

    @property
    def areas(self) -> list[ProtectionArea]:
        return self._areas

    def boundingRect(self) -> QRectF:
        return self._grow(self._rect)

    @staticmethod
    def caption(a: ProtectionArea) -> str:
        kind = "spring mat" if a.kind == "spring" else "crush layer"
        return f"{a.name or a.id} ({kind})"

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        if self.part == "area":
            fill = QColor(style.PLAN["protection_fill"][:7])
            fill.setAlpha(int(style.PLAN["protection_fill"][7:9], 16))
            for a in self._areas:
                r = rect_to_scene(a.area)
                painter.fillRect(r, fill)
                painter.setPen(cosmetic_pen(style.PLAN["protection_edge"], 2.0,
                                            Qt.PenStyle.DashLine))
                painter.setBrush(Qt.BrushStyle.NoBrush)
                painter.drawRect(r)
            return
        t = painter.worldTransform()
        painter.save()
        painter.resetTransform()
        painter.setFont(pixel_font(10, True))
        for text, plate in self.label_plates(t):
            painter.fillRect(plate, QColor(255, 255, 255, 220))
            painter.setPen(QColor(style.PLAN["protection_edge"]))
            painter.drawText(plate, Qt.AlignmentFlag.AlignCenter, text)
        painter.restore()

    def label_plates(self, t: QTransform) -> list[tuple[str, QRectF]]:
        """(caption, device rectangle) of each area's name: in a bottom corner of the
        area, clear of the bay centres, and of :attr:`avoid` (the crane symbols and
        labels) where a corner allows — the crane was drawn over a mat's name."""
        fm = QFontMetricsF(pixel_font(10, True))
        avoid = [a.adjusted(-2, -2, 2, 2) for a in self.avoid()]
        out = []
        for a in self._areas:
            dr = t.mapRect(rect_to_scene(a.area))
            text = self.caption(a)
            if fm.horizontalAdvance(text) > dr.width() - 8:
                text = fm.elidedText(a.name or a.id, Qt.TextElideMode.ElideRight,
                                     max(0.0, dr.width() - 8))
            if dr.width() < 30 or dr.height() < 18:
                continue
            w = fm.horizontalAdvance(text) + 6
            corners = [QRectF(dr.left() + 3, dr.bottom() - 17, w, 14),
                       QRectF(dr.right() - 3 - w, dr.bottom() - 17, w, 14),
                       QRectF(dr.left() + 3, dr.top() + 3, w, 14),
                       QRectF(dr.right() - 3 - w, dr.top() + 3, w, 14)]
            plate = next((c for c in corners if not any(c.intersects(o) for o in avoid)),
                         None)
            if plate is None:
                # no corner is clear: the name shortened beside what it would cover, in
                # the corner that leaves it longest (the rooftop demo's mat names ran
                # under the scabbing marks, "Timber" and an "s" on top of each other)
                short, plate = max((self._trimmed(a, c, i % 2 == 0, avoid, fm)
                                    for i, c in enumerate(corners)),
                                   key=lambda tp: tp[1].width())
                if plate.width() > 0.0:
                    text = short
                else:
                    plate = corners[0]
            out.append((text, plate))
        return out

    @staticmethod
    def _trimmed(a: ProtectionArea, plate: QRectF, from_left: bool, avoid: list[QRectF],
                 fm: QFontMetricsF) -> tuple[str, QRectF]:
        """``plate`` (anchored at its left edge when ``from_left``, else its right)
        cut short of every rectangle of ``avoid`` on its row, with the name elided to
        fit; an empty plate where less than :data:`MIN_NAME_PX` would be left."""
        row = [o for o in avoid if o.intersects(plate)]
        r = QRectF(plate)
        if from_left:
            r.setRight(min([r.right()] + [o.left() for o in row]))
        else:
            r.setLeft(max([r.left()] + [o.right() for o in row]))
        if r.width() < MIN_NAME_PX or any(r.intersects(o) for o in avoid):
            return "", QRectF()
        text = fm.elidedText(a.name or a.id, Qt.TextElideMode.ElideRight, r.width() - 6)
        return text, r


MIN_NAME_PX = 30.0
"""Narrowest plate (px) a shortened pad name is drawn in where no corner of its pad
is clear (below it the name is drawn in its first corner whatever it covers)."""


# -------------------------------------------------------------- lift zones


def sector_path(cx: float, cy: float, r0: float, r1: float, a0: float, sweep: float
                ) -> QPainterPath:
    """Annular sector in scene coordinates: plan centre (cx, cy), radii r0 < r1
    (m), counter-clockwise in plan from angle a0 over ``sweep`` (rad)."""
    path = QPainterPath()
    path.setFillRule(Qt.FillRule.OddEvenFill)
    c = to_scene(cx, cy)
    full = sweep >= 2 * math.pi - 1e-9
    if full:
        path.addEllipse(c, r1, r1)
        if r0 > 0:
            path.addEllipse(c, r0, r0)
        return path
    # Qt angles are degrees counter-clockwise on screen; with y flipped a plan
    # counter-clockwise angle is also counter-clockwise on screen.
    d0, ds = math.degrees(a0), math.degrees(sweep)
    outer = QRectF(c.x() - r1, c.y() - r1, 2 * r1, 2 * r1)
    path.arcMoveTo(outer, d0)
    path.arcTo(outer, d0, ds)
    if r0 > 0:
        inner = QRectF(c.x() - r0, c.y() - r0, 2 * r0, 2 * r0)
        path.arcTo(inner, d0 + ds, -ds)
    else:
        path.lineTo(c)
    path.closeSubpath()
    return path


def arc_path(cx: float, cy: float, r: float, a0: float, sweep: float) -> QPainterPath:
    c = to_scene(cx, cy)
    path = QPainterPath()
    if r <= 0:
        return path
    rect = QRectF(c.x() - r, c.y() - r, 2 * r, 2 * r)
    if sweep >= 2 * math.pi - 1e-9:
        path.addEllipse(rect)
        return path
    path.arcMoveTo(rect, math.degrees(a0))
    path.arcTo(rect, math.degrees(a0), math.degrees(sweep))
    return path


def drift_band(z: LiftZone, margin: float | None = None) -> QPainterPath:
    """The region swept by the drift margin around the zone's sector: ``margin`` (m)
    when given (the margin the analysis uses, :func:`shown_drift_margin`), else the
    zone's stored ``drift_margin``."""
    d = z.drift_margin if margin is None else margin
    if d <= 0:
        return QPainterPath()
    sweep = z.slew_sweep
    cx, cy = z.crane
    if sweep >= 2 * math.pi - 1e-9:
        widened = sector_path(cx, cy, max(0.0, z.r_min - d), z.r_max + d, 0.0, 2 * math.pi)
    else:
        da = min(d / max(z.r_max, 1e-6), (2 * math.pi - sweep) / 2)
        widened = sector_path(cx, cy, max(0.0, z.r_min - d), z.r_max + d,
                              z.slew_start - da, sweep + 2 * da)
    return widened.subtracted(sector_path(cx, cy, z.r_min, z.r_max, z.slew_start, sweep))


def shown_drift_margin(z: LiftZone, surface_elevation: float) -> float:
    """The drift margin the plan draws for ``z``, m: the one the analysis uses — for a
    zone in ``computed`` mode :func:`droprig.solver.zone_drift_margin` from its slew,
    hoist and radial speeds and swing over each load's fall onto the surface at
    ``surface_elevation`` (m); the stored ``drift_margin`` otherwise, or where the
    computation refuses the zone's data (the analysis then names the field)."""
    if z.drift_mode != "computed":
        return z.drift_margin
    from droprig.solver import zone_drift_margin

    try:
        return zone_drift_margin(z, surface_elevation)
    except ValueError:  # ModelError too: the analysis reports it with the field
        return z.drift_margin


def zone_bounds(z: LiftZone, margin: float | None = None) -> QRectF:
    """Scene rectangle of a zone's sector, drift band (``margin`` as in
    :func:`drift_band`), corridor and crane."""
    cx, cy = z.crane
    sweep = z.slew_sweep
    r = sector_path(cx, cy, z.r_min, z.r_max, z.slew_start, sweep).boundingRect()
    r = r.united(drift_band(z, margin).boundingRect())
    c = to_scene(cx, cy)
    r = r.united(QRectF(c.x() - 0.5, c.y() - 0.5, 1.0, 1.0))
    for p in z.corridor:
        q = to_scene(*p)
        r = r.united(QRectF(q.x() - 0.01, q.y() - 0.01, 0.02, 0.02))
    return r


class ZonesItem(PixelSized, QGraphicsItem):
    """Every lift zone of the level: swing sector (dashed arcs), drift band,
    corridor, and the crane symbol with its label (z 5).

    The crane symbol is our own: a ring for the slew bearing, four outrigger
    legs ending in square pads, and a short jib stroke pointing to the middle
    of the slew arc.
    """

    margin_px = 160.0

    def __init__(self, part: str = "area") -> None:
        """``part``: "area" draws sectors, bands and corridors (z 5); "crane"
        the crane symbols and labels (z 8.7, above the bay labels)."""
        QGraphicsItem.__init__(self)
        PixelSized.__init__(self)
        self._zones: list[LiftZone] = []
        self._preview: LiftZone | None = None
        self._selected: str | None = None
        self._rect = QRectF()
        self.part = part
        self.margin_of: Callable[[LiftZone], float] = lambda z: z.drift_margin
        """The drift margin drawn for a zone, m (the plan view gives the computed
        one for a zone in ``computed`` mode: :func:`shown_drift_margin`)."""
        self.setZValue(5 if part == "area" else 8.7)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)

    def set_zones(self, zones: Sequence[LiftZone]) -> None:
        self.prepareGeometryChange()
        self._zones = list(zones)
        self._preview = None
        self._recompute()

    def set_selected(self, zone_id: str | None) -> None:
        self._selected = zone_id
        self.update()

    def set_preview(self, zone: LiftZone | None) -> None:
        """Draw ``zone`` in place of the zone with the same id (drag preview)."""
        self.prepareGeometryChange()
        self._preview = zone
        self._recompute()

    def shown_zones(self) -> list[LiftZone]:
        if self._preview is None:
            return self._zones
        return [self._preview if z.id == self._preview.id else z for z in self._zones]

    def _recompute(self) -> None:
        r = QRectF()
        for z in self.shown_zones():
            r = r.united(zone_bounds(z, self.margin_of(z)))
        self._rect = r
        self.update()

    def boundingRect(self) -> QRectF:
        return self._grow(self._rect)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        if self.part == "crane":
            t = painter.worldTransform()
            bounds = QRectF(widget.rect()) if widget is not None else None
            painter.save()
            painter.resetTransform()
            for z in self.shown_zones():
                self._paint_crane(painter, t.map(to_scene(*z.crane)),
                                  z.slew_start + z.slew_sweep / 2, z, z.id == self._selected,
                                  bounds, px_per_m(t))
            painter.restore()
            return
        teal = QColor(style.PLAN["zone_edge"])
        wash = QColor(teal)
        wash.setAlpha(0x22)
        band = QColor(teal)
        band.setAlpha(0x12)
        for z in self.shown_zones():
            sel = z.id == self._selected
            w = 2.6 if sel else 1.6
            cx, cy = z.crane
            sweep = z.slew_sweep
            dband = drift_band(z, self.margin_of(z))
            painter.setPen(Qt.PenStyle.NoPen)
            painter.setBrush(band)
            painter.drawPath(dband)
            painter.setPen(cosmetic_pen(teal.lighter(130), 1.0, Qt.PenStyle.DotLine))
            painter.setBrush(Qt.BrushStyle.NoBrush)
            painter.drawPath(dband)
            painter.setPen(Qt.PenStyle.NoPen)
            painter.setBrush(wash)
            painter.drawPath(sector_path(cx, cy, z.r_min, z.r_max, z.slew_start, sweep))
            painter.setBrush(Qt.BrushStyle.NoBrush)
            painter.setPen(cosmetic_pen(teal, w, Qt.PenStyle.DashLine))
            painter.drawPath(arc_path(cx, cy, z.r_max, z.slew_start, sweep))
            painter.drawPath(arc_path(cx, cy, z.r_min, z.slew_start, sweep))
            if sweep < 2 * math.pi - 1e-9:
                painter.setPen(cosmetic_pen(teal, w))
                for a in (z.slew_start, z.slew_start + sweep):
                    painter.drawLine(to_scene(cx + z.r_min * math.cos(a),
                                              cy + z.r_min * math.sin(a)),
                                     to_scene(cx + z.r_max * math.cos(a),
                                              cy + z.r_max * math.sin(a)))
            if z.corridor:
                poly = QPolygonF([to_scene(*p) for p in z.corridor])
                painter.setPen(cosmetic_pen("#FFFFFF", w + 2.5))  # halo over dark bay fills
                painter.drawPolygon(poly)
                painter.setPen(cosmetic_pen(teal, w + 0.6, Qt.PenStyle.DashDotLine))
                painter.drawPolygon(poly)

    @staticmethod
    def crane_label(z: LiftZone) -> str:
        name = z.name if len(z.name) <= CRANE_LABEL_CHARS else \
            z.name[:CRANE_LABEL_CHARS - 1].rstrip() + "…"
        return f"CRANE {z.id}" + (f" · {name}" if name and z.name != z.id else "")

    def _paint_crane(self, painter: QPainter, p: QPointF, mid: float, z: LiftZone,
                     selected: bool, bounds: QRectF | None = None,
                     scale: float = 0.0) -> None:
        teal = QColor(style.PLAN["crane"])
        painter.setPen(cosmetic_pen(teal, 2.0))
        painter.setBrush(QColor(255, 255, 255, 235))
        for k in range(4):
            a = math.radians(45 + 90 * k)
            tip = QPointF(p.x() + 15 * math.cos(a), p.y() - 15 * math.sin(a))
            painter.drawLine(p, tip)
            painter.drawRect(QRectF(tip.x() - 3.5, tip.y() - 3.5, 7, 7))
        painter.drawEllipse(p, 8, 8)
        painter.setBrush(teal)
        painter.drawEllipse(p, 2.5, 2.5)
        painter.setPen(cosmetic_pen(teal, 3.0))
        painter.drawLine(p, QPointF(p.x() + 24 * math.cos(mid), p.y() - 24 * math.sin(mid)))
        painter.setFont(pixel_font(11, True))
        plate = keep_inside(crane_label_rect(p, z, scale), bounds)
        text = QFontMetricsF(pixel_font(11, True)).elidedText(
            self.crane_label(z), Qt.TextElideMode.ElideRight, plate.width() - 6)
        painter.setPen(cosmetic_pen(teal, 1.4 if selected else 1.0))
        painter.setBrush(QColor(255, 255, 255, 230))
        painter.drawRect(plate)
        painter.setPen(teal.darker(130))
        painter.drawText(plate, Qt.AlignmentFlag.AlignCenter, text)


CRANE_LABEL_CHARS = 30
"""Longest zone name shown beside a crane (the rest elided; the full name is in
the project tree and the hover text)."""


CRANE_LABEL_SIDE_COS = 0.5
"""A jib within 60° of east or west puts the crane label on the far side of the crane."""
CRANE_LABEL_OVERHANG_PX = 18.0
"""How far such a label reaches past the crane centre, towards the jib (pixels)."""


def crane_label_rect(p: QPointF, z: LiftZone, scale: float = 0.0) -> QRectF:
    """Device rectangle of a crane's label for the crane drawn at pixel ``p``:
    under (or over) the crane, on the side away from the jib's vertical direction,
    so it never covers the arc; when the jib points mostly east or west the label
    runs from the crane away from the jib (so it stays off the floor the crane
    swings over), otherwise it is centred.

    With the plan's ``scale`` (device pixels per metre, > 0) the label also keeps
    clear of the zone's own pick-up and set-down symbols (:func:`lift_point_box`):
    the first of its places that covers none of them (its own run under or over
    the crane, one or two lines further out, then the other runs); the first place
    if none is clear. On the
    two-level demo the set-down point S1 sat on the label's text."""
    text = ZonesItem.crane_label(z)
    tw = QFontMetricsF(pixel_font(11, True)).horizontalAdvance(text) + 8
    full = z.slew_sweep >= 2 * math.pi - 1e-9
    mid = z.slew_start + z.slew_sweep / 2
    below = full or math.sin(mid) >= -0.2
    east = 0.0 if full else math.cos(mid)
    if east > CRANE_LABEL_SIDE_COS:
        run = "west"
    elif east < -CRANE_LABEL_SIDE_COS:
        run = "east"
    else:
        run = "centre"

    def place(below: bool, run: str, step: int = 0) -> QRectF:
        # plan +y is screen up: a jib pointing north (sin > 0) puts the label below
        top = p.y() + 22 + 16 * step if below else p.y() - 22 - 15 - 16 * step
        left = {"west": p.x() + CRANE_LABEL_OVERHANG_PX - tw,
                "east": p.x() - CRANE_LABEL_OVERHANG_PX,
                "centre": p.x() - tw / 2}[run]
        return QRectF(left, top, tw, 15)

    first = place(below, run)
    if scale <= 0.0 or not z.lift_points:
        return first
    cx, cy = z.crane
    boxes = [lift_point_box(QPointF(p.x() + (x - cx) * scale, p.y() - (y - cy) * scale))
             for x, y in (lp.at for lp in z.lift_points)]
    # its own run first (it keeps the label off the floor the jib swings over), one
    # or two lines further out, then the other runs
    runs = [run] + [r for r in ("centre", "east", "west") if r != run]
    for r in runs:
        for b in (below, not below):
            for step in (0, 1, 2):
                rect = place(b, r, step)
                if not any(rect.intersects(box) for box in boxes):
                    return rect
    return first


def lift_point_box(c: QPointF, size: float = 7.0) -> QRectF:
    """Device box of a pick-up or set-down symbol of half-size ``size`` (px) drawn at
    ``c`` (:func:`paint_lift_point`), with a 2 px gap."""
    return QRectF(c.x() - size - 2, c.y() - 1.1 * size - 2, 2 * size + 4, 1.9 * size + 4)


def px_per_m(t: QTransform) -> float:
    """Device pixels per metre of plan under the painter's world transform ``t``."""
    a, b = t.map(to_scene(0.0, 0.0)), t.map(to_scene(1.0, 0.0))
    return math.hypot(b.x() - a.x(), b.y() - a.y())


LABEL_MARGIN_PX = 4.0
"""Least gap between a fixed-size label and the edge of the view (pixels)."""


def keep_inside(rect: QRectF, bounds: QRectF | None,
                margin: float = LABEL_MARGIN_PX) -> QRectF:
    """``rect`` moved (and, if wider or taller than ``bounds``, shrunk) so that it lies
    inside ``bounds`` less ``margin`` on every side; unchanged when ``bounds`` is
    None. Device pixels. Keeps crane labels readable when the crane stands near or
    beyond the edge of the view."""
    if bounds is None or bounds.isEmpty():
        return QRectF(rect)
    inner = bounds.adjusted(margin, margin, -margin, -margin)
    w = min(rect.width(), max(inner.width(), 1.0))
    h = min(rect.height(), max(inner.height(), 1.0))
    x = min(max(rect.left(), inner.left()), inner.right() - w)
    y = min(max(rect.top(), inner.top()), inner.bottom() - h)
    return QRectF(x, y, w, h)


# ------------------------------------------------------------------ handles

HANDLE_KINDS: tuple[str, ...] = ("r_min", "r_max", "slew_start", "slew_end")
CORNER_PREFIX = "corner_"
"""Kind of a corridor-corner handle: ``corner_0``, ``corner_1`` … (corner index)."""


def corner_kind(i: int) -> str:
    return f"{CORNER_PREFIX}{i}"


def corner_index(kind: str) -> int:
    """The corner index of a ``corner_<i>`` handle kind, −1 for any other kind."""
    if kind.startswith(CORNER_PREFIX) and kind[len(CORNER_PREFIX):].isdigit():
        return int(kind[len(CORNER_PREFIX):])
    return -1


class HandleItem(QGraphicsItem):
    """A drag handle of the selected lift zone, a fixed-size square (radius
    handles), diamond (slew handles) or disc (corridor corners, kind
    ``corner_<i>``) in screen pixels (z 10).

    The item reports drags to ``on_drag(kind, x, y)`` and ``on_release(kind)``
    in plan metres; the view turns them into a validated LiftZone.
    """

    def __init__(self, kind: str, on_drag: Callable[[str, float, float], None],
                 on_release: Callable[[str], None]) -> None:
        super().__init__()
        self.kind = kind
        self._on_drag = on_drag
        self._on_release = on_release
        self.dragging = False
        self.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
        self.setAcceptedMouseButtons(Qt.MouseButton.LeftButton)
        self.setAcceptHoverEvents(True)
        self.setCursor(Qt.CursorShape.SizeAllCursor)
        self.setZValue(10)
        self.setVisible(False)
        tips = {"r_min": "Drag: inner radius of the swing zone",
                "r_max": "Drag: outer radius of the swing zone",
                "slew_start": "Drag: start of the slew arc",
                "slew_end": "Drag: end of the slew arc"}
        corner = corner_index(kind)
        self.setToolTip(tips.get(kind, f"Drag: corner {corner + 1} of the lift corridor"))

    def boundingRect(self) -> QRectF:
        h = style.HANDLE_SIZE_PX / 2 + 3
        return QRectF(-h, -h, 2 * h, 2 * h)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        h = style.HANDLE_SIZE_PX / 2
        painter.setPen(cosmetic_pen("#FFFFFF", 1.5))
        painter.setBrush(QColor(style.PLAN["selection"] if self.dragging
                                else style.PLAN["handle"]))
        if self.kind.startswith("r_"):
            painter.drawRect(QRectF(-h, -h, 2 * h, 2 * h))
        elif self.kind.startswith(CORNER_PREFIX):
            painter.drawEllipse(QPointF(0, 0), h, h)
        else:
            painter.drawPolygon(QPolygonF([QPointF(0, -h - 1.5), QPointF(h + 1.5, 0),
                                           QPointF(0, h + 1.5), QPointF(-h - 1.5, 0)]))

    def mousePressEvent(self, event: QGraphicsSceneMouseEvent) -> None:
        if event.button() != Qt.MouseButton.LeftButton:
            event.ignore()
            return
        self.dragging = True
        self.update()
        event.accept()

    def mouseMoveEvent(self, event: QGraphicsSceneMouseEvent) -> None:
        if self.dragging:
            x, y = from_scene(event.scenePos())
            self._on_drag(self.kind, x, y)
        event.accept()

    def mouseReleaseEvent(self, event: QGraphicsSceneMouseEvent) -> None:
        if self.dragging:
            self.dragging = False
            self.update()
            self._on_release(self.kind)
        event.accept()


def handle_positions(z: LiftZone) -> dict[str, tuple[float, float]]:
    """Plan positions (m) of the four handles of a zone.

    Radius handles sit on the middle of the slew arc at r_min and r_max; the
    slew handles at mid-radius on the two end rays.
    """
    cx, cy = z.crane
    sweep = z.slew_sweep
    mid = z.slew_start + sweep / 2
    rm = (z.r_min + z.r_max) / 2

    def at(r: float, a: float) -> tuple[float, float]:
        return cx + r * math.cos(a), cy + r * math.sin(a)

    return {"r_min": at(z.r_min, mid), "r_max": at(z.r_max, mid),
            "slew_start": at(rm, z.slew_start), "slew_end": at(rm, z.slew_start + sweep)}


class TagItem(QGraphicsItem):
    """A short text on a white plate at a plan point, fixed size on screen, offset
    down-right of the point (drag read-outs: radius, slew angle, mat size)."""

    def __init__(self) -> None:
        super().__init__()
        self._text = ""
        self.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
        self.setAcceptedMouseButtons(Qt.MouseButton.NoButton)
        self.setZValue(12)
        self.setVisible(False)

    def text(self) -> str:
        return self._text

    def setText(self, text: str) -> None:
        self.prepareGeometryChange()
        self._text = text

    def boundingRect(self) -> QRectF:
        w = QFontMetricsF(pixel_font(12, True)).horizontalAdvance(self._text) + 12
        return QRectF(12, 10, w, 20)

    def paint(self, painter: QPainter, option: QStyleOptionGraphicsItem,
              widget: QWidget | None = None) -> None:
        r = self.boundingRect()
        painter.setPen(cosmetic_pen(style.PLAN["selection"], 1.2))
        painter.setBrush(QColor(255, 255, 255, 240))
        painter.drawRect(r)
        painter.setFont(pixel_font(12, True))
        painter.setPen(QColor(style.PLAN["selection"]).darker(140))
        painter.drawText(r, Qt.AlignmentFlag.AlignCenter, self._text)


# --------------------------------------------------------------- overlay ramps

_LUT_SIZE = 256
UTIL_RANGE = (0.0, 1.0)
"""Utilisation ramp range; above 1.0 the "exceeds" colour (style.utilisation_color)."""
DROP_RANGE = (0.0, 4.0)
"""Allowable drop height ramp range, m (the stops of style.drop_height_color)."""


def _lut(func: Callable[[float], QColor], lo: float, hi: float) -> np.ndarray:
    vals = np.linspace(lo, hi, _LUT_SIZE)
    out = np.empty(_LUT_SIZE, dtype=np.uint32)
    for i, v in enumerate(vals):
        c = func(float(v))
        out[i] = (c.red() << 16) | (c.green() << 8) | c.blue()
    return out


def colour_values(mode: str, values: np.ndarray, alpha: int = 235) -> np.ndarray:
    """ARGB32 colours (uint32) for overlay values with the style.py ramps.

    ``utilisation``: 0…1 on the utilisation ramp, > 1 (and +inf) the "exceeds"
    colour, nan treated as exceeding (no valid number means no assurance).
    ``drop_height``: 0…4 m on the drop-height ramp, nan ("no height is safe")
    the darkest stop, above 4 m (and +inf) the palest.
    """
    v = np.asarray(values, dtype=float)
    a = np.uint32(alpha) << np.uint32(24)
    if mode == "utilisation":
        lut = _lut(style.utilisation_color, *UTIL_RANGE)
        exceeds = style.utilisation_color(2.0)
        exc = np.uint32((exceeds.red() << 16) | (exceeds.green() << 8) | exceeds.blue())
        t = np.clip(np.nan_to_num(v, nan=0.0, posinf=1.0), *UTIL_RANGE)
        idx = np.round((t - UTIL_RANGE[0]) / (UTIL_RANGE[1] - UTIL_RANGE[0])
                       * (_LUT_SIZE - 1)).astype(int)
        rgb = lut[idx]
        rgb = np.where((v > UTIL_RANGE[1]) | np.isnan(v), exc, rgb)
    elif mode == "drop_height":
        lut = _lut(style.drop_height_color, *DROP_RANGE)
        t = np.clip(np.nan_to_num(v, nan=0.0, posinf=DROP_RANGE[1]), *DROP_RANGE)
        idx = np.round((t - DROP_RANGE[0]) / (DROP_RANGE[1] - DROP_RANGE[0])
                       * (_LUT_SIZE - 1)).astype(int)
        rgb = lut[idx]
    else:
        raise ValueError(f"overlay mode {mode!r}; allowed: utilisation, drop_height")
    return (rgb.astype(np.uint32) | a).astype(np.uint32)


@dataclass(frozen=True)
class Raster:
    """An overlay image and where it sits: cell (0, 0) is the top-left cell,
    with its top-left corner at plan (x0, y_top); ``cell`` m per pixel."""

    image: QImage
    x0: float
    y_top: float
    cell: float


MAX_RASTER_CELLS = 1200
"""Largest overlay image side, px; coarser cells beyond (keeps memory small)."""


def rasterise(x: np.ndarray, y: np.ndarray, values: np.ndarray, mode: str,
              cell: float) -> Raster | None:
    """Splat drop-point values on a grid of ``cell`` m, keeping the worst
    value per cell (largest utilisation, least allowable drop height); cells
    without points stay transparent. Returns None when there are no points."""
    x = np.asarray(x, dtype=float)
    y = np.asarray(y, dtype=float)
    v = np.asarray(values, dtype=float)
    ok = np.isfinite(x) & np.isfinite(y)
    x, y, v = x[ok], y[ok], v[ok]
    if x.size == 0:
        return None
    span = max(float(x.max() - x.min()), float(y.max() - y.min()), cell)
    cell = max(cell, span / MAX_RASTER_CELLS)
    x0 = float(x.min()) - cell / 2
    y_top = float(y.max()) + cell / 2
    ix = np.floor((x - x0) / cell).astype(np.int64)
    iy = np.floor((y_top - y) / cell).astype(np.int64)
    w = int(ix.max()) + 1
    h = int(iy.max()) + 1
    flat = iy * w + ix
    if mode == "utilisation":
        key = np.where(np.isnan(v), np.inf, v)
        best = np.full(w * h, -np.inf)
        np.maximum.at(best, flat, key)
    else:
        key = np.where(np.isnan(v), -1.0, v)  # nan = "no height is safe": the worst
        best = np.full(w * h, np.inf)
        np.minimum.at(best, flat, key)
        best = np.where(best < 0, np.nan, best)
    has = np.zeros(w * h, dtype=bool)
    has[flat] = True
    rgba = np.zeros(w * h, dtype=np.uint32)
    rgba[has] = colour_values(mode, best[has])
    arr = np.ascontiguousarray(rgba.reshape(h, w))
    img = QImage(arr.data, w, h, 4 * w, QImage.Format.Format_ARGB32).copy()
    return Raster(img, x0, y_top, cell)


def raster_transform(r: Raster) -> QTransform:
    """Pixmap-item transform mapping image pixels to scene metres."""
    return QTransform.fromScale(r.cell, r.cell) * QTransform.fromTranslate(r.x0, -r.y_top)
