"""Plan view of one level: framing, bays by outcome, lift zones and drop-point maps.

Drawing language (our own, colours from :mod:`droprig.gui.style`):

* column grid: thin dash-dot lines ending in round bubbles with the grid label
  at both ends, dimension strings between adjacent lines (bottom and left);
* columns small black squares, girders heavy lines, beams light lines, deck
  openings white with an orthogonal cross-hatch, a heavy edge and both
  diagonals;
* bays filled by outcome **and** hatched **and** labelled in words with a
  value (utilisation, or the allowable drop height in that overlay), so the
  plan reads in greyscale and without colour vision;
* overlay maps (utilisation / allowable drop height) as one raster image of
  the drop points, worst value per cell, with its own ramp legend;
* lift zone in teal: swing sector with dashed outer and inner arcs, the drift
  margin as a fainter dotted band, corridor dash-dot; the crane as a ring with
  four outrigger pads and a jib stroke towards the middle of the slew arc;
* protection areas dashed violet rectangles with their name and kind;
* the selected girder or beam outlined in the selection colour (a click on a member
  selects it, a click between members the bay; a right click offers its actions);
* drag handles of the selected zone: squares for the radii, diamonds for the slew
  ends, discs on the corridor corners;
* a corridor being drawn as a heavy teal polyline through the clicked corners,
  a thin line on to the pointer and a dotted closing edge back to the first
  corner (drawn over the plan, fixed-size corner squares);
* north arrow (top left), legend (top right), scale bar (bottom left) and the
  caution strip (bottom, whenever results are shown) fixed to the view.

Scene coordinates are metres with y flipped (north up). All values shown are
formatted with :func:`droprig.units.fmt` in the project's unit system.
"""

from __future__ import annotations

import dataclasses
import itertools
import math
from dataclasses import dataclass

import numpy as np
from PySide6.QtCore import QEvent, QLineF, QPoint, QPointF, QRectF, Qt, QTimer, Signal
from PySide6.QtGui import (
    QBrush,
    QColor,
    QContextMenuEvent,
    QFocusEvent,
    QFontMetricsF,
    QKeyEvent,
    QLinearGradient,
    QMouseEvent,
    QPainter,
    QPen,
    QPixmap,
    QPolygonF,
    QResizeEvent,
    QTransform,
    QWheelEvent,
)
from PySide6.QtWidgets import (
    QGraphicsLineItem,
    QGraphicsPixmapItem,
    QGraphicsRectItem,
    QGraphicsScene,
    QGraphicsView,
    QWidget,
)

from droprig import units
from droprig.gui import style
from droprig.gui.document import Document, Selection
from droprig.gui.plan_items import (
    DROP_RANGE,
    HANDLE_KINDS,
    UTIL_RANGE,
    BayLabelsItem,
    BaysItem,
    BayState,
    FramingItem,
    HandleItem,
    LiftPointsItem,
    OpeningsItem,
    ProtectionItem,
    TagItem,
    ZonesItem,
    colour_values,
    corner_index,
    corner_kind,
    cosmetic_pen,
    crane_label_rect,
    fmt_ratio,
    from_scene,
    handle_positions,
    keep_inside,
    paint_lift_point,
    paint_scabbing_mark,
    pixel_font,
    px_per_m,
    raster_transform,
    rasterise,
    rect_to_scene,
    sector_path,
    shown_drift_margin,
    to_scene,
    utilisation_line,
    zone_bounds,
)
from droprig.model import Level, LiftZone, Member, ModelError, Project, Rect, bays, corridor_problem
from droprig.solver import RESPONSES, CaseResult, Results
from droprig.texts import CAUTION

STALE_GRACE_MS = 300
"""How long the plan may keep showing the previous results after an edit."""


def _cases(p: Project) -> tuple[tuple[str, str, str], ...]:
    return tuple((z.id, z.level_id, ld.name) for z in p.lift_zones for ld in z.loads)


OVERLAY_MODES: tuple[str, ...] = ("outcome", "utilisation", "drop_height")
EDIT_MODES: tuple[str, ...] = ("select", "draw_protection", "draw_corridor")

MIN_BAND = 0.1
"""Least radial width r_max − r_min a handle drag may leave, m."""
MIN_SWEEP = math.radians(2.0)
"""Least slew arc a handle drag may leave, rad."""
ANGLE_SNAP = math.radians(1.0)
"""Slew handles snap to whole degrees."""
RADIUS_SNAP = {"SI": 0.05, "US": 0.1 * 0.3048}
"""Radius handles and drawn mats snap to 50 mm (SI) or 0.1 ft (US), m."""
R_LIMIT = 200.0
"""Largest radius the model accepts, m (LiftZone validation)."""
CLICK_SLOP_PX = 5
"""A press and release closer than this are a click, not a drag."""
PICK_PX = 14.0
"""A click picks the nearest drop point within this many pixels (or 1.5 cells)."""
MEMBER_PICK_PX = 3.0
"""A click this close (pixels) to a girder or beam selects the member, not the bay…"""
MEMBER_PICK_M = 0.3
"""… but never farther than this, m: zoomed out, where members are a few pixels
apart, a click between them still picks the bay."""
CRANE_PICK_PX = 17.0
"""px: a press this close to a crane's centre picks the crane (its symbol is ~30 px)."""

NOTE_MS = 6000
"""How long a refusal note stays beside a released corridor corner, ms."""
BUBBLE_OFFSET_PX = 46.0
"""Distance of a grid bubble's centre beyond the end of its grid line (pixels)."""
BUBBLE_RADIUS_PX = 11.0
BUBBLE_MIN_RADIUS_PX = 7.0
"""The smallest a grid bubble is drawn when its grid lines lie close on screen."""
BUBBLE_GAP_PX = 3.0
"""Least gap between a grid bubble and a crane symbol or label (pixels)."""
BUBBLE_STEP_PX = 4.0
BUBBLE_MAX_SHIFT_PX = 400.0
"""A bubble moves out along its grid line at most this far to clear a crane."""
CRANE_SYMBOL_RADIUS_PX = 26.0
"""Half the width of the painted crane symbol with its jib (outriggers reach ~20 px,
the jib 24 px plus its pen)."""


@dataclass(frozen=True)
class GridBubble:
    """A grid bubble as painted: ``axis`` "x" for a bubble of an x-line (a vertical
    line, lettered along x), its ``label`` and ``centre`` (viewport px)."""

    axis: str
    label: str
    centre: QPointF
    radius: float = 11.0


LEGEND_WIDTH = 196.0
"""px; the legend box in the top right corner."""
MIN_ZOOM, MAX_ZOOM = 0.2, 4000.0
"""Pixels per metre."""


def _wrap(a: float) -> float:
    """Angle wrapped into (−π, π]."""
    return math.atan2(math.sin(a), math.cos(a))


@dataclass
class _Drag:
    kind: str
    origin: LiftZone
    candidate: LiftZone
    last_angle: float = 0.0
    accum: float = 0.0


def dragged_zone(zone: LiftZone, kind: str, x: float, y: float, *,
                 accum_angle: float = 0.0, system: str = "SI") -> LiftZone:
    """The zone after dragging handle ``kind`` to plan point (x, y), m.

    Radius handles take the distance from the crane, snapped (RADIUS_SNAP) and
    clamped so r_min ≥ 0, r_max ≤ 200 m and r_max − r_min ≥ MIN_BAND. Slew
    handles take ``accum_angle``, the unwrapped angle (rad) the handle has
    turned since the drag started (counter-clockwise positive): the start
    handle shortens the arc as it turns counter-clockwise, the end handle
    lengthens it; the sweep is kept within [MIN_SWEEP, 2π]. A result the model
    refuses returns ``zone`` unchanged — never an exception.
    """
    cx, cy = zone.crane
    try:
        if kind in ("r_min", "r_max"):
            snap = RADIUS_SNAP.get(system, 0.05)
            r = round(math.hypot(x - cx, y - cy) / snap) * snap
            if kind == "r_max":
                r = min(max(r, zone.r_min + MIN_BAND, 0.5), R_LIMIT)
                return dataclasses.replace(zone, r_max=r)
            r = min(max(r, 0.0), zone.r_max - MIN_BAND)
            return dataclasses.replace(zone, r_min=max(r, 0.0))
        if kind in ("slew_start", "slew_end"):
            sweep0 = zone.slew_sweep
            d = round(accum_angle / ANGLE_SNAP) * ANGLE_SNAP
            if kind == "slew_end":
                sweep = min(max(sweep0 + d, MIN_SWEEP), 2 * math.pi)
                start = zone.slew_start
            else:
                sweep = min(max(sweep0 - d, MIN_SWEEP), 2 * math.pi)
                start = zone.slew_start + (sweep0 - sweep)
            start = start % (2 * math.pi)
            if sweep >= 2 * math.pi - 1e-9:
                return dataclasses.replace(zone, slew_start=start, slew_end=start + 2 * math.pi)
            return dataclasses.replace(zone, slew_start=start,
                                       slew_end=(start + sweep) % (2 * math.pi))
    except ModelError:
        return zone
    return zone


class PlanView(QGraphicsView):
    """The plan of one level with its results (see the module docstring).

    Signals: ``zone_changed(zone_id, LiftZone)`` once per released handle drag;
    ``protection_drawn(Rect)`` after a rubber band in "draw_protection" mode;
    ``bay_clicked(bay_id)``; ``point_clicked(zone_id, load_name, x, y)`` for the
    nearest analysed drop point of the displayed case(s); ``hover_text(str)``;
    ``mode_changed(mode)`` when the edit mode changes (also when Esc leaves the
    draw-protection mode); ``corridor_drawn(zone_id, points)`` with the corner
    points (m) of a corridor finished in "draw_corridor" mode;
    ``corridor_changed(zone_id, points)`` once per released corridor-corner drag (the
    receiver validates: the view only says in the drag read-out what will be refused);
    ``member_clicked(member_id)`` for a click on a girder or beam (instead of
    ``bay_clicked``); ``context_requested(global QPoint, member_id)`` for a right click
    (member id "" when not on a member).
    """

    zone_changed = Signal(str, object)
    protection_drawn = Signal(object)
    bay_clicked = Signal(str)
    point_clicked = Signal(str, str, float, float)
    hover_text = Signal(str)
    mode_changed = Signal(str)
    corridor_drawn = Signal(str, object)
    corridor_changed = Signal(str, object)
    member_clicked = Signal(str)
    zone_clicked = Signal(str)
    context_requested = Signal(object, str)

    def __init__(self, document: Document | None = None,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._scene = QGraphicsScene(self)
        self.setScene(self._scene)
        self.setRenderHints(QPainter.RenderHint.Antialiasing
                            | QPainter.RenderHint.TextAntialiasing)
        self.setViewportUpdateMode(QGraphicsView.ViewportUpdateMode.FullViewportUpdate)
        self.setTransformationAnchor(QGraphicsView.ViewportAnchor.NoAnchor)
        self.setResizeAnchor(QGraphicsView.ViewportAnchor.AnchorViewCenter)
        self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.setVerticalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.setBackgroundBrush(QColor(style.PLAN["background"]))
        self.setMouseTracking(True)
        self.viewport().setMouseTracking(True)
        self.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
        self.setMinimumSize(240, 150)

        self._project: Project | None = None
        self._level: Level | None = None
        self._results: Results | None = None
        self._confirmed = True
        self._overlay = "outcome"
        self._mode = "select"
        self._case: tuple[str, str] | None = None
        self._selected_bay: str | None = None
        self._selected_zone: str | None = None
        self._selected_member: str | None = None
        self._user_view = False
        self._drag: _Drag | None = None
        self._press: QPoint | None = None
        self._crane_press: str | None = None
        self._legend_open = False
        self.legend_collapsed = False
        self._pan_last: QPoint | None = None
        self._space = False
        self._band_origin: QPointF | None = None
        self._corridor_zone: str | None = None
        self._corridor_pts: list[QPointF] = []
        self._corridor_cursor: QPointF | None = None
        self._last_hover = ""
        self._raster_ok = False
        self._cases: list[CaseResult] = []
        self._px = np.zeros(0)
        self._py = np.zeros(0)
        self._pcase = np.zeros(0, dtype=np.int64)
        self._pidx = np.zeros(0, dtype=np.int64)
        self._pscore = np.zeros(0)

        self._bays_item = BaysItem()
        self._labels_item = BayLabelsItem(self._bays_item)
        self._framing_item = FramingItem()
        self._openings_item = OpeningsItem()
        self._protection_item = ProtectionItem()
        self._zones_item = ZonesItem()
        self._cranes_item = ZonesItem("crane")
        self._protection_labels = ProtectionItem("label")
        self._lift_points_item = LiftPointsItem()
        self._overlay_item = QGraphicsPixmapItem()
        self._overlay_item.setZValue(1)
        self._overlay_item.setOpacity(0.9)
        self._overlay_item.setTransformationMode(Qt.TransformationMode.FastTransformation)
        self._overlay_item.setAcceptedMouseButtons(Qt.MouseButton.NoButton)
        self._selection_item = QGraphicsRectItem()
        self._selection_item.setPen(cosmetic_pen(style.PLAN["selection"],
                                                 style.SELECTION_WIDTH_PX))
        self._selection_item.setZValue(9)
        self._selection_item.setVisible(False)
        self._selection_item.setAcceptedMouseButtons(Qt.MouseButton.NoButton)
        self._hover_item = QGraphicsRectItem()
        hover_pen = cosmetic_pen(style.PLAN["hover"][:7], 2.0)
        c = QColor(style.PLAN["hover"][:7])
        c.setAlpha(int(style.PLAN["hover"][7:9] or "ff", 16))
        hover_pen.setColor(c)
        self._hover_item.setPen(hover_pen)
        self._hover_item.setZValue(8.5)
        self._hover_item.setVisible(False)
        self._hover_item.setAcceptedMouseButtons(Qt.MouseButton.NoButton)
        self._band_item = QGraphicsRectItem()
        band_pen = cosmetic_pen(style.PLAN["protection_edge"], 1.5, Qt.PenStyle.DashLine)
        self._band_item.setPen(band_pen)
        fill = QColor(style.PLAN["protection_edge"])
        fill.setAlpha(0x30)
        self._band_item.setBrush(fill)
        self._band_item.setZValue(11)
        self._band_item.setVisible(False)
        self._member_item = QGraphicsLineItem()
        self._member_item.setPen(cosmetic_pen(style.PLAN["selection"], 6.0))
        self._member_item.setZValue(9)
        self._member_item.setVisible(False)
        self._member_item.setAcceptedMouseButtons(Qt.MouseButton.NoButton)
        self._drag_label = TagItem()
        self._note_timer = QTimer(self)
        self._note_timer.setSingleShot(True)
        self._note_timer.setInterval(NOTE_MS)
        self._note_timer.timeout.connect(self._hide_note)
        self._handles = {k: HandleItem(k, self._on_handle_drag, self._on_handle_release)
                         for k in HANDLE_KINDS}
        self._corner_handles: list[HandleItem] = []
        """Corridor-corner handles, grown on demand and only ever hidden (never
        deleted: a handle may be handling its own mouse event)."""
        for item in (self._bays_item, self._overlay_item, self._openings_item,
                     self._framing_item, self._protection_item, self._zones_item,
                     self._labels_item, self._cranes_item, self._protection_labels,
                     self._lift_points_item, self._selection_item, self._hover_item,
                     self._member_item, self._band_item,
                     self._drag_label, *self._handles.values()):
            self._scene.addItem(item)
        # bay tags and mat names keep clear of the handles and the crane symbols and
        # labels (the crane label was drawn over a bay's tag, the crane over a mat's name)
        self._labels_item.avoid = lambda: self.handle_rects() + self._crane_obstacles()
        self._protection_labels.avoid = lambda: (
            self._crane_obstacles()
            + self._lift_points_item.obstacles(self.viewportTransform())
            + self._labels_item.scabbing_marks(self.viewportTransform()))
        self._dim_plate = QColor(style.PLAN["background"])
        self._doc: Document | None = None
        self._stale_timer = QTimer(self)
        self._stale_timer.setSingleShot(True)
        self._stale_timer.setInterval(STALE_GRACE_MS)
        self._stale_timer.timeout.connect(self._on_stale_timeout)
        if document is not None:
            self.bind(document)

    # ------------------------------------------------------------- the document

    def bind(self, document: Document) -> None:
        """Follow ``document`` as the other panels do: its project, level,
        results, selection and lift filter; a click selects through it."""
        self._doc = document
        document.project_changed.connect(self._on_project_changed)
        document.level_changed.connect(self._on_level_changed)
        document.results_changed.connect(self._on_results_changed)
        document.selection_changed.connect(self._on_selection_changed)
        document.case_changed.connect(self._on_case_changed)
        self.bay_clicked.connect(self._on_bay_clicked)
        self.member_clicked.connect(self._on_member_clicked)
        self.zone_clicked.connect(
            lambda zid: document.select(Selection("zone", (zid,))))
        self.set_project(document.project, document.level_id or None)
        self.set_results(self.shown_results())
        self._on_selection_changed(document.selection)

    def shown_results(self) -> Results | None:
        """Results the plan may show: current ones; or, for at most
        STALE_GRACE_MS after an edit, the previous ones if the level's framing
        and the set of zones and loads are unchanged (so bays and cases still
        match) — this avoids a grey flash on every edit; after that the plan
        shows "not assessed" until the new results arrive."""
        doc = self._doc
        if doc is None:
            return self._results
        res = doc.results
        if res is None:
            return None
        if doc.results_current:
            return res
        if not self._stale_timer.isActive():
            return None
        old, new = doc.results_project, doc.project
        try:
            same = old is not None and old.level(doc.level_id) is \
                new.level(doc.level_id) and _cases(old) == _cases(new)
        except KeyError:
            same = False
        return res if same else None

    def _on_project_changed(self, project: Project) -> None:
        assert self._doc is not None
        self._stale_timer.start()
        self.set_project(project, self._doc.level_id or None)
        self.set_results(self.shown_results())

    def _on_level_changed(self, level_id: str) -> None:
        assert self._doc is not None
        self.set_project(self._doc.project, level_id or None)
        self.set_results(self.shown_results())

    def _on_results_changed(self, _results: object) -> None:
        self.set_results(self.shown_results())

    def _on_stale_timeout(self) -> None:
        if self._doc is not None and not self._doc.results_current:
            self.set_results(None)

    def _on_selection_changed(self, sel: Selection | None) -> None:
        assert self._doc is not None
        self.select_bay(sel.ids[1] if sel is not None and sel.kind == "bay" else None)
        self.set_selected_zone(sel.ids[0] if sel is not None and sel.kind in ("zone", "load")
                               else None)
        self.set_selected_member(sel.ids[1] if sel is not None and sel.kind == "member"
                                 and sel.ids[0] == self._doc.level_id else None)

    def _on_case_changed(self, case: tuple[str, str] | None) -> None:
        if case is None:
            self.set_case(None)
        else:
            self.set_case(case[0], case[1])

    def _on_bay_clicked(self, bay_id: str) -> None:
        if self._doc is not None and self._doc.level_id:
            self._doc.select(Selection("bay", (self._doc.level_id, bay_id)))

    def _on_member_clicked(self, member_id: str) -> None:
        if self._doc is not None and self._doc.level_id:
            self._doc.select(Selection("member", (self._doc.level_id, member_id)))

    # ------------------------------------------------------------- public API

    @property
    def project(self) -> Project | None:
        return self._project

    @property
    def level(self) -> Level | None:
        return self._level

    @property
    def overlay(self) -> str:
        return self._overlay

    @property
    def mode(self) -> str:
        return self._mode

    @property
    def unit_system(self) -> str:
        return self._project.settings.unit_system if self._project else "SI"

    def set_project(self, project: Project | None, level_id: str | None = None) -> None:
        """Show ``level_id`` of ``project`` (first level if None or unknown).

        The zoom is kept while the same level is re-shown after an edit and
        fitted when the level changes.
        """
        old_level = self._level.id if self._level else None
        self._project = project
        level = None
        if project is not None and project.levels:
            try:
                level = project.level(level_id) if level_id else project.levels[0]
            except KeyError:
                level = project.levels[0]
        self._level = level
        if self._drag is not None:
            self._end_drag_visuals()
        self._framing_item.set_level(level)
        self._openings_item.set_openings(level.deck.openings if level else ())
        lid = level.id if level else None
        areas = [p for p in project.protection_areas if p.level_id == lid] if project else []
        zones = [z for z in project.lift_zones if z.level_id == lid] if project else []
        for pitem in (self._protection_item, self._protection_labels):
            pitem.set_areas(areas)
        # the drift band drawn is the margin the analysis uses (computed from the
        # crane's motion for a zone in computed mode), never a stale stored value
        elevation = level.elevation if level is not None else 0.0
        for zitem in (self._zones_item, self._cranes_item):
            zitem.margin_of = lambda z, e=elevation: shown_drift_margin(z, e)
            zitem.set_zones(zones)
        self._lift_points_item.set_zones(zones)
        if self._selected_zone and not self._zone(self._selected_zone):
            self._selected_zone = None
        if self._mode == "draw_corridor" and self._selected_zone != self._corridor_zone:
            self.set_mode("select")
        self._zones_item.set_selected(self._selected_zone)
        self._cranes_item.set_selected(self._selected_zone)
        self.set_selected_member(self._selected_member)
        self._update_scene_rect()
        self._refresh_results()
        self._place_handles()
        if lid != old_level or not self._user_view:
            self.fit()
        self.viewport().update()

    def set_results(self, results: Results | None, confirmed: bool | None = None) -> None:
        """Colour the plan by ``results`` (None while analysing: "not assessed").
        ``confirmed=False``: outcomes whose limits are still being confirmed — the
        bays' colours, tags and U are shown, allowable drop heights read
        "confirming…" (default: as the document says, else confirmed).
        The caution strip comes and goes with the results: a fitted view is
        fitted again so the grid keeps clear of it and of the scale bar."""
        if confirmed is None:
            confirmed = self._doc is None or not self._doc.limits_pending
        self._confirmed = confirmed
        self._results = results
        self._refresh_results()
        if not self._user_view:
            self.fit()
        self.viewport().update()

    def set_overlay(self, mode: str) -> None:
        """"outcome" (bays only), "utilisation" or "drop_height" (point map)."""
        if mode not in OVERLAY_MODES:
            raise ValueError(f"overlay mode {mode!r}; allowed: {', '.join(OVERLAY_MODES)}")
        self._overlay = mode
        self._refresh_overlay()
        self.viewport().update()

    def set_mode(self, mode: str) -> None:
        """"select" (click, hover, handles), "draw_protection" (rubber band) or
        "draw_corridor" (click the corners of the selected zone's corridor;
        ValueError if no zone is selected)."""
        if mode not in EDIT_MODES:
            raise ValueError(f"edit mode {mode!r}; allowed: {', '.join(EDIT_MODES)}")
        if mode == "draw_corridor" and self._selected_zone is None:
            raise ValueError("select a lift zone on this level first")
        changed = mode != getattr(self, "_mode", mode)
        self._mode = mode
        self._band_origin = None
        self._band_item.setVisible(False)
        if changed:
            self._corridor_zone = self._selected_zone if mode == "draw_corridor" else None
            self._corridor_pts = []
            self._corridor_cursor = None
            self.viewport().update()
        if self._drag is None:
            self._drag_label.setVisible(False)
        self._place_handles()
        self.viewport().setCursor(Qt.CursorShape.CrossCursor if mode.startswith("draw_")
                                  else Qt.CursorShape.ArrowCursor)
        if changed:
            self.mode_changed.emit(mode)

    @property
    def corridor_points(self) -> list[tuple[float, float]]:
        """Corners (m) clicked so far in "draw_corridor" mode."""
        return [from_scene(q) for q in self._corridor_pts]

    def set_case(self, zone_id: str | None, load_name: str | None = None) -> None:
        """Colour the plan by one analysed case; ``None`` = worst per bay over all."""
        self._case = (zone_id, load_name or "") if zone_id is not None else None
        self._refresh_results()
        self.viewport().update()

    def select_bay(self, bay_id: str | None) -> None:
        self._selected_bay = None
        self._selection_item.setVisible(False)
        if bay_id is None or self._level is None:
            return
        for b in bays(self._level):
            if b.id == bay_id:
                self._selected_bay = bay_id
                self._selection_item.setRect(rect_to_scene(b.rect))
                self._selection_item.setVisible(True)
                return

    @property
    def selected_bay(self) -> str | None:
        return self._selected_bay

    def set_selected_zone(self, zone_id: str | None) -> None:
        """Show the drag handles of ``zone_id`` (None hides them). Another zone
        ends a corridor being drawn."""
        self._selected_zone = zone_id if zone_id and self._zone(zone_id) else None
        if self._mode == "draw_corridor" and self._selected_zone != self._corridor_zone:
            self.set_mode("select")
        self._zones_item.set_selected(self._selected_zone)
        self._cranes_item.set_selected(self._selected_zone)
        self._place_handles()

    def handle(self, kind: str) -> HandleItem:
        """The handle item ``r_min``, ``r_max``, ``slew_start``, ``slew_end`` or
        ``corner_<i>`` (corner i of the selected zone's corridor; KeyError if the
        corridor has no such corner)."""
        i = corner_index(kind)
        if i < 0:
            return self._handles[kind]
        if i >= len(self._corner_handles) or not self._corner_handles[i].isVisible():
            raise KeyError(kind)
        return self._corner_handles[i]

    def handle_rects(self) -> list[QRectF]:
        """Viewport rectangles of the visible handles (bay tags keep clear of them)."""
        out = []
        for h in self._all_handles():
            if h.isVisible():
                c = QPointF(self.mapFromScene(h.pos()))
                r = style.HANDLE_SIZE_PX
                out.append(QRectF(c.x() - r, c.y() - r, 2 * r, 2 * r))
        return out

    def bay_tag_rects(self) -> list[QRectF]:
        """Where the bay tags are drawn (viewport px; tests)."""
        return [r for _s, _l, r in self._labels_item.plates(self.viewportTransform())]

    def _all_handles(self) -> list[HandleItem]:
        return [*self._handles.values(), *self._corner_handles]

    def set_selected_member(self, member_id: str | None) -> None:
        """Outline member ``member_id`` of the level shown (None, or a member not on
        it, hides the outline)."""
        m = self._member(member_id) if member_id else None
        self._selected_member = m.id if m is not None else None
        self._member_item.setVisible(m is not None)
        if m is not None:
            self._member_item.setLine(QLineF(to_scene(*m.start), to_scene(*m.end)))

    @property
    def selected_member(self) -> str | None:
        return self._selected_member

    def _member(self, member_id: str) -> Member | None:
        if self._level is None:
            return None
        return next((m for m in self._level.members if m.id == member_id), None)

    def member_at(self, x: float, y: float) -> Member | None:
        """The girder or beam nearest plan point (x, y), m, within MEMBER_PICK_PX
        pixels and MEMBER_PICK_M (girders win a tie: they are drawn on top)."""
        if self._level is None:
            return None
        tol = min(MEMBER_PICK_PX / max(self.pixels_per_metre(), 1e-9), MEMBER_PICK_M)
        best: tuple[float, int, Member] | None = None
        for m in self._level.members:
            (x0, y0), (x1, y1) = m.start, m.end
            dx, dy = x1 - x0, y1 - y0
            t = min(max(((x - x0) * dx + (y - y0) * dy) / (dx * dx + dy * dy), 0.0), 1.0)
            d = math.hypot(x - (x0 + t * dx), y - (y0 + t * dy))
            key = (d, 0 if m.role == "girder" else 1, m)
            if d <= tol and (best is None or key[:2] < best[:2]):
                best = key
        return best[2] if best is not None else None

    def fit(self) -> None:
        """Zoom and centre so the grid, zones and protection fill the view."""
        r = self._content_rect()
        self._user_view = False
        if r.isEmpty():
            return
        vw, vh = self.viewport().width(), self.viewport().height()
        # the legend gets its own strip only where the plan stays wide; otherwise it
        # finds a free corner or folds to a tab (legend_rect)
        legend = LEGEND_WIDTH + 14.0 if vw > 1000 else 0.0
        g = rect_to_scene(self._level.grid.extent) if self._level is not None else None
        caution = self._caution_height()

        def margins(s: float) -> tuple[float, float, float, float]:
            """Left, top, right, bottom px: the grid's bubbles and dimensions (about
            60 px outside the grid; the bottom ones clear the 26 px scale-bar band)
            only where the zones do not already leave that room."""
            need = (72.0, 64.0, 72.0, 96.0)
            base = (16.0, 16.0, 16.0, 40.0)
            if g is None:
                gaps = (0.0, 0.0, 0.0, 0.0)
                need = base
            else:
                gaps = (g.left() - r.left(), g.top() - r.top(), r.right() - g.right(),
                        r.bottom() - g.bottom())
            ml, mt, mr, mb = (max(b, n - gap * s) for b, n, gap in zip(base, need, gaps,
                                                                        strict=True))
            return ml, mt, mr + legend, mb + caution

        def scale() -> float:
            # the content keeps at least 40 % of the view each way: on a small plan
            # (1280 × 720 at 200 %) the margins for bubbles, crane labels and the
            # caution came to more than the view, and the fit fell to the least zoom
            s = min(max(vw - ml - mr, 0.4 * vw) / max(r.width(), 1e-6),
                    max(vh - mt - mb, 0.4 * vh) / max(r.height(), 1e-6))
            return min(max(s, MIN_ZOOM), MAX_ZOOM)

        ml, mt, mr, mb = 72.0, 64.0, 72.0 + legend, 96.0 + caution
        s = scale()
        for _ in range(3):  # the margins depend on the scale: settle them
            ml, mt, mr, mb = margins(s)
            s = scale()
        # crane labels are fixed-size text: widen the margins so none is cut off
        for z in self._cranes_item.shown_zones():
            c = to_scene(*z.crane)
            lab = crane_label_rect(QPointF((c.x() - r.left()) * s, (c.y() - r.top()) * s),
                                   z, s)
            ml = max(ml, -lab.left() + 8)
            mt = max(mt, -lab.top() + 8)
            mr = max(mr, lab.right() - r.width() * s + 8)
            mb = max(mb, lab.bottom() - r.height() * s + 8 + self._caution_height())
        s = scale()
        self.setTransform(QTransform.fromScale(s, s))
        c = r.center()
        self.centerOn(QPointF(c.x() + (mr - ml) / 2 / s, c.y() + (mb - mt) / 2 / s))
        self._on_zoom()

    def pixels_per_metre(self) -> float:
        return float(self.transform().m11())

    def view_pos(self, x: float, y: float) -> QPoint:
        """Viewport pixel of plan point (x, y) in m (for tests and tools)."""
        return self.mapFromScene(to_scene(x, y))

    def bay_states(self) -> list[BayState]:
        """What each bay currently shows (outcome, values)."""
        return list(self._bays_item.states)

    # ------------------------------------------------------------ internals

    def _zone(self, zone_id: str) -> LiftZone | None:
        for z in self._zones_item.shown_zones():
            if z.id == zone_id:
                return z
        return None

    def _content_rect(self) -> QRectF:
        r = QRectF()
        if self._level is not None:
            r = rect_to_scene(self._level.grid.extent)
        for z in self._zones_item.shown_zones():
            r = r.united(zone_bounds(z, self._zones_item.margin_of(z)))
        for a in self._protection_item.areas:
            r = r.united(rect_to_scene(a.area))
        return r

    def _update_scene_rect(self) -> None:
        r = self._content_rect()
        if r.isEmpty():
            r = QRectF(-10, -10, 20, 20)
        pad = max(r.width(), r.height()) * 4 + 50
        self._scene.setSceneRect(r.adjusted(-pad, -pad, pad, pad))

    def _on_zoom(self) -> None:
        px = 1.0 / max(self.pixels_per_metre(), 1e-9)
        for item in (self._bays_item, self._labels_item, self._framing_item,
                     self._openings_item, self._protection_item, self._zones_item,
                     self._cranes_item, self._protection_labels, self._lift_points_item):
            item.set_pixel_size(px)
        self.viewport().update()

    def _displayed_cases(self) -> list[CaseResult]:
        if self._results is None or self._level is None:
            return []
        out = []
        for c in self._results.cases:
            if c.level_id != self._level.id:
                continue
            if self._case is not None and (c.zone_id, c.load_name) != self._case:
                continue
            out.append(c)
        return out

    def _refresh_results(self) -> None:
        level = self._level
        states: list[BayState] = []
        if level is not None:
            agg: dict[str, dict] = {}
            if self._results is not None:
                for s in self._results.bays:
                    if s.level_id != level.id:
                        continue
                    if self._case is not None and (s.zone_id, s.load_name) != self._case:
                        continue
                    a = agg.setdefault(s.bay_id, {"keys": [], "u": [], "h": [], "hp": [],
                                                  "n": 0, "scab": False, "loads": []})
                    a["scab"] = a["scab"] or bool(s.scabbing)
                    a["keys"].append(s.response)
                    a["u"].append(s.max_utilisation)
                    a["loads"].append(s.load_name)
                    if s.allowable_drop_height is not None:
                        a["h"].append((s.allowable_drop_height, s.load_name))
                    if s.allowable_drop_height_plastic is not None:
                        a["hp"].append(s.allowable_drop_height_plastic)
                    a["n"] += s.n_points
            for b in bays(level):
                a = agg.get(b.id)
                if a is None:
                    states.append(BayState(b))
                    continue
                us = [(u, ld) for u, ld in zip(a["u"], a["loads"], strict=True)
                      if u is not None and not math.isnan(u)]
                many = len(set(a["loads"])) > 1
                u_max = max(us, key=lambda t: t[0]) if us else (math.nan, "")
                h_min = min(a["h"], key=lambda t: t[0]) if a["h"] else (None, "")
                states.append(BayState(
                    b, style.worst(a["keys"]),
                    u_max[0],
                    h_min[0],
                    min(a["hp"]) if a["hp"] else None,
                    a["n"], a["scab"],
                    u_load=u_max[1] if many else "",
                    h_load=h_min[1] if many else ""))
        self._bays_item.set_states(states)
        self._cases = self._displayed_cases()
        self._build_point_index()
        self._refresh_overlay()
        self.select_bay(self._selected_bay)

    def _build_point_index(self) -> None:
        cs = self._cases
        if not cs:
            self._px = self._py = self._pscore = np.zeros(0)
            self._pcase = self._pidx = np.zeros(0, dtype=np.int64)
            return
        self._px = np.concatenate([c.x for c in cs]).astype(float)
        self._py = np.concatenate([c.y for c in cs]).astype(float)
        self._pcase = np.concatenate([np.full(c.n, i, dtype=np.int64) for i, c in enumerate(cs)])
        self._pidx = np.concatenate([np.arange(c.n, dtype=np.int64) for c in cs])
        resp = np.concatenate([np.asarray(c.response, dtype=float) for c in cs])
        u = np.concatenate([np.asarray(c.utilisation, dtype=float) for c in cs])
        self._pscore = resp * 1e6 + np.clip(np.nan_to_num(u, nan=1e5, posinf=1e5), 0, 1e5)

    def _refresh_overlay(self) -> None:
        mode = self._overlay
        self._bays_item.set_fill_alpha(255 if mode == "outcome" else 0)
        if mode == "drop_height":
            sysm = self.unit_system

            def drop_line(s: BayState) -> tuple[str, str]:
                if not self._confirmed and s.key != style.OUTCOME_NONE:
                    return f"drop {style.CONFIRMING}", "…"
                if s.allowable_drop_height is None:
                    return "no safe drop", "none"
                h = style.fmt_drop(s.allowable_drop_height, sysm)
                return f"drop ≤ {h}", h

            self._labels_item.value_line = drop_line
        else:
            self._labels_item.value_line = utilisation_line
        self._labels_item.update()
        self._raster_ok = False
        self._overlay_item.setVisible(False)
        if mode == "outcome" or not self._cases or self._project is None:
            return
        if mode == "drop_height" and not self._confirmed:
            return  # no map of allowable heights until they are confirmed
        field = "utilisation" if mode == "utilisation" else "allowable_drop_height"
        values = np.concatenate([np.asarray(getattr(c, field), dtype=float)
                                 for c in self._cases])
        raster = rasterise(self._px, self._py, values, mode,
                           self._project.settings.grid_resolution)
        if raster is None:
            return
        self._overlay_item.setPixmap(QPixmap.fromImage(raster.image))
        self._overlay_item.setTransform(raster_transform(raster))
        self._overlay_item.setVisible(True)
        self._raster_ok = True

    @property
    def overlay_visible(self) -> bool:
        return self._overlay_item.isVisible()

    def overlay_image(self) -> QPixmap:
        return self._overlay_item.pixmap()

    # --------------------------------------------------------------- handles

    def _place_handles(self) -> None:
        z = self._zone(self._selected_zone) if self._selected_zone else None
        if self._drag is not None:
            z = self._drag.candidate
        for k, h in self._handles.items():
            if z is None:
                h.setVisible(False)
                continue
            h.setPos(to_scene(*handle_positions(z)[k]))
            h.setVisible(True)
        corners = z.corridor if z is not None and self._mode != "draw_corridor" else ()
        while len(self._corner_handles) < len(corners):
            h = HandleItem(corner_kind(len(self._corner_handles)), self._on_handle_drag,
                           self._on_handle_release)
            self._scene.addItem(h)
            self._corner_handles.append(h)
        for i, h in enumerate(self._corner_handles):
            if i < len(corners):
                h.setPos(to_scene(*corners[i]))
                h.setVisible(True)
            elif not h.dragging:
                h.setVisible(False)

    def _on_corner_drag(self, zone: LiftZone, kind: str, x: float, y: float) -> None:
        i = corner_index(kind)
        if self._drag is None or self._drag.kind != kind:
            if not 0 <= i < len(zone.corridor):
                return
            self._drag = _Drag(kind, zone, zone)
        d = self._drag
        step = RADIUS_SNAP.get(self.unit_system, 0.05)
        q = (round(round(x / step) * step, 6), round(round(y / step) * step, 6))
        pts = list(d.origin.corridor)
        pts[i] = q
        try:
            d.candidate = dataclasses.replace(d.origin, corridor=tuple(pts))
        except ModelError:
            pass  # out of the model's range: keep the last candidate
        self._zones_item.set_preview(d.candidate)
        self._place_handles()
        s = self.unit_system
        cx, cy = d.candidate.corridor[i]
        text = (f"corner {i + 1}: ({units.fmt(cx, 'length', s, decimals=2)}, "
                f"{units.fmt(cy, 'length', s, decimals=2)})")
        problem = corridor_problem(d.candidate.corridor)
        self._note_timer.stop()
        # the tag beside the corner stays short; the status line says why
        self._drag_label.setText(text + (" — will be refused" if problem else ""))
        self._drag_label.setPos(to_scene(cx, cy))
        self._drag_label.setVisible(True)
        self.hover_text.emit(text + (f" — {problem}: will be refused" if problem else ""))

    def show_note(self, text: str, x: float, y: float) -> None:
        """A short note (a refused drag) beside plan point (x, y) for NOTE_MS."""
        self._drag_label.setText(text)
        self._drag_label.setPos(to_scene(x, y))
        self._drag_label.setVisible(True)
        self._note_timer.start()

    def _hide_note(self) -> None:
        if self._drag is None:
            self._drag_label.setVisible(False)

    @property
    def note(self) -> str:
        """The note or drag read-out shown on the plan ('' when none)."""
        return self._drag_label.text() if self._drag_label.isVisible() else ""

    def _on_handle_drag(self, kind: str, x: float, y: float) -> None:
        zone = self._zone(self._selected_zone) if self._selected_zone else None
        if zone is None:
            return
        if corner_index(kind) >= 0:
            self._on_corner_drag(zone, kind, x, y)
            return
        if self._drag is None or self._drag.kind != kind:
            hx, hy = handle_positions(zone)[kind]
            a0 = math.atan2(hy - zone.crane[1], hx - zone.crane[0])
            self._drag = _Drag(kind, zone, zone, last_angle=a0)
        d = self._drag
        cx, cy = d.origin.crane
        if kind.startswith("slew"):
            a = math.atan2(y - cy, x - cx)
            d.accum += _wrap(a - d.last_angle)
            d.last_angle = a
            cand = dragged_zone(d.origin, kind, x, y, accum_angle=d.accum,
                                system=self.unit_system)
            # keep the accumulated turn inside the clamped range so reversing
            # direction responds at once
            if kind == "slew_end":
                d.accum = max(min(d.accum, 2 * math.pi - d.origin.slew_sweep),
                              MIN_SWEEP - d.origin.slew_sweep)
            else:
                d.accum = max(min(d.accum, d.origin.slew_sweep - MIN_SWEEP),
                              d.origin.slew_sweep - 2 * math.pi)
        else:
            cand = dragged_zone(d.origin, kind, x, y, system=self.unit_system)
        d.candidate = cand
        self._zones_item.set_preview(cand)
        self._cranes_item.set_preview(cand)
        self._place_handles()
        text = self._drag_text(kind, cand)
        self._drag_label.setText(text)
        self._drag_label.setPos(self._handles[kind].pos())
        self._drag_label.setVisible(True)
        self.hover_text.emit(text)

    def _drag_text(self, kind: str, z: LiftZone) -> str:
        s = self.unit_system
        if kind == "r_min":
            return f"inner radius {units.fmt(z.r_min, 'length', s, decimals=2)}"
        if kind == "r_max":
            return f"outer radius {units.fmt(z.r_max, 'length', s, decimals=2)}"
        a = z.slew_start if kind == "slew_start" else z.slew_start + z.slew_sweep
        return (f"slew {'start' if kind == 'slew_start' else 'end'} "
                f"{math.degrees(a) % 360:.0f}° from east, arc {math.degrees(z.slew_sweep):.0f}°")

    def _end_drag_visuals(self) -> None:
        self._drag = None
        self._zones_item.set_preview(None)
        self._cranes_item.set_preview(None)
        self._drag_label.setVisible(False)
        self._place_handles()

    def _on_handle_release(self, kind: str) -> None:
        d = self._drag
        self._end_drag_visuals()
        if d is None:
            return
        new = d.candidate
        if new == d.origin:
            return
        if corner_index(kind) >= 0:
            self.corridor_changed.emit(new.id, new.corridor)
            return
        self.zone_changed.emit(new.id, new)

    # ----------------------------------------------------------- mouse & keys

    def wheelEvent(self, event: QWheelEvent) -> None:
        dy = event.angleDelta().y()
        if dy == 0:
            return
        self.zoom_at(event.position(), 1.0015 ** dy)
        event.accept()

    def zoom_at(self, pos: QPointF, factor: float) -> None:
        """Zoom by ``factor`` keeping the plan point under viewport pixel ``pos``
        where it is (the wheel's anchor), within MIN_ZOOM…MAX_ZOOM px/m."""
        s = self.pixels_per_metre()
        f = min(max(s * factor, MIN_ZOOM), MAX_ZOOM) / s
        anchor = self.mapToScene(pos.toPoint())
        self.setTransformationAnchor(QGraphicsView.ViewportAnchor.NoAnchor)
        self.scale(f, f)
        moved = self.viewportTransform().map(anchor) - pos
        self.horizontalScrollBar().setValue(self.horizontalScrollBar().value()
                                            + round(moved.x()))
        self.verticalScrollBar().setValue(self.verticalScrollBar().value() + round(moved.y()))
        self._user_view = True
        self._on_zoom()

    def zoom_by(self, factor: float) -> None:
        """Zoom about the view centre (menu and keyboard)."""
        self.zoom_at(QPointF(self.viewport().rect().center()), factor)

    def keyPressEvent(self, event: QKeyEvent) -> None:
        if event.key() == Qt.Key.Key_Space and not event.isAutoRepeat():
            self._space = True
            self.viewport().setCursor(Qt.CursorShape.OpenHandCursor)
            event.accept()
            return
        if event.key() in (Qt.Key.Key_Plus, Qt.Key.Key_Equal):
            self.zoom_by(1.25)
            event.accept()
            return
        if event.key() in (Qt.Key.Key_Minus, Qt.Key.Key_Underscore):
            self.zoom_by(0.8)
            event.accept()
            return
        if self._mode == "draw_corridor" and event.key() in (
                Qt.Key.Key_Return, Qt.Key.Key_Enter, Qt.Key.Key_Backspace):
            if event.key() == Qt.Key.Key_Backspace:
                if self._corridor_pts:
                    self._corridor_pts.pop()
                    self.viewport().update()
                self.hover_text.emit(self._corridor_hint())
            else:
                self.finish_corridor()
            event.accept()
            return
        if event.key() == Qt.Key.Key_Escape:
            if self._mode == "draw_corridor":
                self.set_mode("select")
                self.hover_text.emit("drawing the corridor cancelled; nothing was changed")
            elif self._band_origin is not None:
                self._band_origin = None
                self._band_item.setVisible(False)
                self._drag_label.setVisible(False)
            elif self._drag is not None or any(h.dragging for h in self._all_handles()):
                for h in self._all_handles():
                    if h.dragging:
                        h.dragging = False
                        h.ungrabMouse()
                        h.update()
                self._end_drag_visuals()
                self.hover_text.emit("drag cancelled")
            elif self._mode == "draw_protection":
                self.set_mode("select")
                self.hover_text.emit("drawing a protection area ended")
            event.accept()
            return
        super().keyPressEvent(event)

    def keyReleaseEvent(self, event: QKeyEvent) -> None:
        if event.key() == Qt.Key.Key_Space and not event.isAutoRepeat():
            self._space = False
            self.set_mode(self._mode)
            event.accept()
            return
        super().keyReleaseEvent(event)

    def focusOutEvent(self, event: QFocusEvent) -> None:
        self._space = False
        super().focusOutEvent(event)

    def mousePressEvent(self, event: QMouseEvent) -> None:
        pos = event.position().toPoint()
        self.setFocus(Qt.FocusReason.MouseFocusReason)  # so Space and Esc reach the view
        if event.button() == Qt.MouseButton.LeftButton and (
                self.legend_collapsed or self._legend_open) and \
                self.legend_rect().contains(QPointF(pos)):
            self._legend_open = not self._legend_open  # the Key tab opens / closes it
            self.viewport().update()
            event.accept()
            return
        if event.button() == Qt.MouseButton.MiddleButton or (
                event.button() == Qt.MouseButton.LeftButton and self._space):
            self._pan_last = pos
            self.viewport().setCursor(Qt.CursorShape.ClosedHandCursor)
            event.accept()
            return
        if event.button() != Qt.MouseButton.LeftButton:
            super().mousePressEvent(event)
            return
        if self._mode == "draw_corridor":
            q = self._snap(self.mapToScene(pos))
            if not self._corridor_pts or self._corridor_pts[-1] != q:
                self._corridor_pts.append(q)
            self._corridor_cursor = q
            self.viewport().update()
            self.hover_text.emit(self._corridor_hint())
            event.accept()
            return
        if self._mode == "draw_protection":
            self._band_origin = self._snap(self.mapToScene(pos))
            self._band_item.setRect(QRectF(self._band_origin, self._band_origin))
            self._band_item.setVisible(True)
            event.accept()
            return
        if isinstance(self.itemAt(pos), HandleItem):
            super().mousePressEvent(event)
            return
        self._press = pos
        self._crane_press = self.crane_at(pos)
        event.accept()

    def mouseMoveEvent(self, event: QMouseEvent) -> None:
        pos = event.position().toPoint()
        if self._pan_last is not None:
            delta = pos - self._pan_last
            self._pan_last = pos
            self.horizontalScrollBar().setValue(self.horizontalScrollBar().value() - delta.x())
            self.verticalScrollBar().setValue(self.verticalScrollBar().value() - delta.y())
            self._user_view = True
            event.accept()
            return
        if self._mode == "draw_corridor":
            self._corridor_cursor = self._snap(self.mapToScene(pos))
            self.viewport().update()
            event.accept()
            return
        if self._band_origin is not None:
            self._band_item.setRect(QRectF(self._band_origin,
                                           self._snap(self.mapToScene(pos))).normalized())
            r = self._band_item.rect()
            s = self.unit_system
            text = (f"mat {units.fmt(r.width(), 'length', s, decimals=2)}"
                    f" × {units.fmt(r.height(), 'length', s, decimals=2)}")
            self._drag_label.setText(text)
            self._drag_label.setPos(self.mapToScene(pos))
            self._drag_label.setVisible(True)
            self.hover_text.emit(text)
            event.accept()
            return
        if (self._crane_press is not None and self._press is not None
                and event.buttons() & Qt.MouseButton.LeftButton
                and (self._drag is not None
                     or (pos - self._press).manhattanLength() > CLICK_SLOP_PX)):
            self._on_crane_drag(self._crane_press, self._snap(self.mapToScene(pos)))
            event.accept()
            return
        super().mouseMoveEvent(event)
        if self._drag is None and not any(h.dragging for h in self._all_handles()):
            self._emit_hover(self.mapToScene(pos))

    def mouseReleaseEvent(self, event: QMouseEvent) -> None:
        pos = event.position().toPoint()
        if self._pan_last is not None and event.button() in (
                Qt.MouseButton.MiddleButton, Qt.MouseButton.LeftButton):
            self._pan_last = None
            if self._space:
                self.viewport().setCursor(Qt.CursorShape.OpenHandCursor)
            else:
                self.set_mode(self._mode)  # restores the mode's cursor
            event.accept()
            return
        if self._mode == "draw_corridor" and event.button() == Qt.MouseButton.LeftButton:
            event.accept()
            return
        if self._band_origin is not None and event.button() == Qt.MouseButton.LeftButton:
            self._finish_band(self._band_origin, self._snap(self.mapToScene(pos)))
            event.accept()
            return
        if any(h.dragging for h in self._all_handles()):
            super().mouseReleaseEvent(event)
            return
        crane, self._crane_press = self._crane_press, None
        if crane is not None and self._drag is not None and self._drag.kind == "crane":
            self._press = None
            self._on_handle_release("crane")
            event.accept()
            return
        press, self._press = self._press, None
        if (press is not None and event.button() == Qt.MouseButton.LeftButton
                and (pos - press).manhattanLength() <= CLICK_SLOP_PX):
            self._click(self.mapToScene(pos))
            event.accept()
            return
        super().mouseReleaseEvent(event)

    def mouseDoubleClickEvent(self, event: QMouseEvent) -> None:
        if self._mode == "draw_corridor" and event.button() == Qt.MouseButton.LeftButton:
            q = self._snap(self.mapToScene(event.position().toPoint()))
            if not self._corridor_pts or self._corridor_pts[-1] != q:
                self._corridor_pts.append(q)
            self.finish_corridor()
            event.accept()
            return
        super().mouseDoubleClickEvent(event)

    def _corridor_hint(self) -> str:
        n = len(self._corridor_pts)
        s = self.unit_system
        last = ""
        if n:
            x, y = from_scene(self._corridor_pts[-1])
            last = (f", last ({units.fmt(x, 'length', s, decimals=2)}, "
                    f"{units.fmt(y, 'length', s, decimals=2)})")
        more = "" if n >= 3 else f"; {3 - n} more to make a polygon"
        return (f"corridor of zone {self._corridor_zone}: {n} corner(s){last}{more} · "
                "double-click or Enter to finish, Backspace removes the last corner, "
                "Esc cancels")

    def finish_corridor(self) -> bool:
        """End "draw_corridor" mode with the clicked corners: emits
        ``corridor_drawn`` and returns True if there are at least 3; otherwise
        keeps drawing and says so."""
        if self._mode != "draw_corridor" or self._corridor_zone is None:
            return False
        pts = [(round(x, 6), round(y, 6)) for x, y in self.corridor_points]
        if len(pts) < 3:
            self.hover_text.emit(f"corridor not finished: {len(pts)} corner(s) clicked, "
                                 "at least 3 needed (Esc cancels)")
            return False
        zone_id = self._corridor_zone
        self.set_mode("select")
        self.corridor_drawn.emit(zone_id, tuple(pts))
        return True

    def _snap(self, scene_pos: QPointF) -> QPointF:
        """Snap a scene point to the radius snap step (50 mm SI, 0.1 ft US)."""
        step = RADIUS_SNAP.get(self.unit_system, 0.05)
        return QPointF(round(scene_pos.x() / step) * step, round(scene_pos.y() / step) * step)

    def _finish_band(self, a: QPointF, b: QPointF) -> None:
        self._band_origin = None
        self._band_item.setVisible(False)
        self._drag_label.setVisible(False)
        (x0, y0), (x1, y1) = from_scene(a), from_scene(b)
        x0, x1 = sorted((x0, x1))
        y0, y1 = sorted((y0, y1))
        min_m = 4.0 / max(self.pixels_per_metre(), 1e-9)
        if x1 - x0 < max(min_m, 0.05) or y1 - y0 < max(min_m, 0.05):
            self.hover_text.emit("protection not drawn: drag out a rectangle")
            return
        try:
            rect = Rect(round(x0, 6), round(y0, 6), round(x1, 6), round(y1, 6))
        except ModelError as exc:
            self.hover_text.emit(f"protection not drawn: {exc}")
            return
        self.protection_drawn.emit(rect)

    def _bay_at(self, x: float, y: float) -> BayState | None:
        for s in self._bays_item.states:
            if s.bay.rect.contains(x, y):
                return s
        return None

    def nearest_point(self, x: float, y: float, case: tuple[str, str] | None = None
                      ) -> tuple[CaseResult, int] | None:
        """The analysed drop point of the displayed case(s) nearest to (x, y), m,
        within PICK_PX pixels or 1.5 grid cells; ties (the same point in several
        cases) go to the worst outcome, then the highest utilisation. ``case``
        (zone id, load name): that case's points only."""
        if self._px.size == 0:
            return None
        d2 = (self._px - x) ** 2 + (self._py - y) ** 2
        if case is not None:
            keep = np.array([(c.zone_id, c.load_name) == case for c in self._cases])
            d2 = np.where(keep[self._pcase], d2, np.inf)
            if not np.isfinite(d2).any():
                return None
        dmin = float(d2.min())
        cell = self._project.settings.grid_resolution if self._project else 0.5
        tol = max(PICK_PX / max(self.pixels_per_metre(), 1e-9), 1.5 * cell)
        if dmin > tol * tol:
            return None
        near = np.flatnonzero(d2 <= dmin + 1e-9)
        k = int(near[np.argmax(self._pscore[near])])
        return self._cases[int(self._pcase[k])], int(self._pidx[k])

    def crane_at(self, pos: QPoint) -> str | None:
        """The lift zone whose crane symbol or crane label is under viewport pixel
        ``pos`` (the nearest crane wins), or None."""
        best: tuple[float, str] | None = None
        for z in self._cranes_item.shown_zones():
            c = QPointF(self.mapFromScene(to_scene(*z.crane)))
            d = math.hypot(pos.x() - c.x(), pos.y() - c.y())
            on_label = crane_label_rect(c, z, self._px_per_m()).contains(QPointF(pos))
            if (d <= CRANE_PICK_PX or on_label) and (best is None or d < best[0]):
                best = (d, z.id)
        return best[1] if best is not None else None

    def zone_at(self, x: float, y: float) -> str | None:
        """The lift zone whose swing region (sector, corridor and margin aside)
        holds plan point (x, y), m; the selected zone first."""
        zones = sorted(self._zones_item.shown_zones(),
                       key=lambda z: z.id != self._selected_zone)
        for z in zones:
            path = sector_path(z.crane[0], z.crane[1], z.r_min, z.r_max, z.slew_start,
                               z.slew_sweep)
            if path.contains(to_scene(x, y)):
                return z.id
        return None

    def _on_crane_drag(self, zone_id: str, scene_pos: QPointF) -> None:
        zone = self._zone(zone_id)
        if zone is None:
            return
        if self._drag is None or self._drag.kind != "crane":
            self._drag = _Drag("crane", zone, zone)
            self.set_selected_zone(zone_id)
            self.zone_clicked.emit(zone_id)
        d = self._drag
        x, y = from_scene(scene_pos)
        try:
            d.candidate = dataclasses.replace(d.origin, crane=(round(x, 6), round(y, 6)))
        except ModelError:
            pass  # out of the model's range: keep the last candidate
        self._zones_item.set_preview(d.candidate)
        self._cranes_item.set_preview(d.candidate)
        self._place_handles()
        s = self.unit_system
        text = (f"crane {zone_id} at ({units.fmt(d.candidate.crane[0], 'length', s, decimals=2)}"
                f", {units.fmt(d.candidate.crane[1], 'length', s, decimals=2)})")
        self._drag_label.setText(text)
        self._drag_label.setPos(to_scene(*d.candidate.crane))
        self._drag_label.setVisible(True)
        self.hover_text.emit(text)

    def _click(self, scene_pos: QPointF) -> None:
        x, y = from_scene(scene_pos)
        crane = self.crane_at(self.mapFromScene(scene_pos))
        m = self.member_at(x, y) if crane is None else None
        s = self._bay_at(x, y) if m is None and crane is None else None
        zone = self.zone_at(x, y) if crane is None and m is None and s is None else crane
        if m is not None:
            self.select_bay(None)
            self.set_selected_member(m.id)
            self.member_clicked.emit(m.id)
        elif s is not None:
            self.select_bay(s.bay.id)
            self.bay_clicked.emit(s.bay.id)
        elif zone is not None:
            self.select_bay(None)
            self.set_selected_member(None)
            self.set_selected_zone(zone)
            self.zone_clicked.emit(zone)
            return
        hit = self.nearest_point(x, y)
        if hit is not None:
            case, i = hit
            self.point_clicked.emit(case.zone_id, case.load_name, float(case.x[i]),
                                    float(case.y[i]))

    def contextMenuEvent(self, event: QContextMenuEvent) -> None:
        """Right click: select the member under the pointer (if any) and ask the
        window for a menu (``context_requested``)."""
        if self._mode != "select" or self._level is None:
            event.ignore()
            return
        m = self.member_at(*from_scene(self.mapToScene(event.pos())))
        if m is not None:
            self.set_selected_member(m.id)
            self.member_clicked.emit(m.id)
        self.context_requested.emit(event.globalPos(), m.id if m is not None else "")
        event.accept()

    def describe(self, x: float, y: float) -> str:
        """The hover text for plan point (x, y), m."""
        sysm = self.unit_system
        parts: list[str] = []
        m = self.member_at(x, y)
        if m is not None:
            parts.append(f"{m.role.capitalize()} {m.id} {m.section.name} {m.grade.name} "
                         "(click to select)")
        s = self._bay_at(x, y)
        if s is not None:
            st = style.outcome(s.key)
            if s.key == style.OUTCOME_NONE:
                parts.append(f"Bay {s.bay.id}: {st.label.lower()}")
            else:
                # over several loads, name the load behind each number: the greatest U
                # and the least height may come from different loads
                u_of = f" ({s.u_load})" if s.u_load else ""
                u_txt = f"Bay {s.bay.id}: {st.label.lower()}, max U " \
                        f"{fmt_ratio(s.max_utilisation)}{u_of}, "
                if not self._confirmed:
                    parts.append(f"{u_txt}allowable drop {style.CONFIRMING}")
                else:
                    h_el = style.fmt_drop(s.allowable_drop_height, sysm)
                    h_pl = style.fmt_drop(s.allowable_drop_height_plastic, sysm)
                    h_of = f" for {s.h_load}" if s.h_load else ""
                    least = "least " if s.h_load else ""
                    parts.append(f"{u_txt}{least}allowable drop {h_el}{h_of} "
                                 f"(yielding {h_pl})")
        hit = self.nearest_point(x, y)
        if hit is not None:
            c, i = hit
            r = int(c.response[i])
            resp = style.outcome(RESPONSES[r] if 0 <= r < len(RESPONSES) else None).label
            parts.append(
                f"point ({units.fmt(float(c.x[i]), 'length', sysm, decimals=2)}, "
                f"{units.fmt(float(c.y[i]), 'length', sysm, decimals=2)}) "
                f"{c.load_name} in {c.zone_id}: {resp.lower()}, "
                f"U {fmt_ratio(float(c.utilisation[i]))}, "
                f"allowable drop "
                + (style.CONFIRMING if not self._confirmed else
                   style.fmt_drop(float(c.allowable_drop_height[i]), sysm)))
        else:
            parts.append(f"x {units.fmt(x, 'length', sysm, decimals=2)}, "
                         f"y {units.fmt(y, 'length', sysm, decimals=2)}")
        return " · ".join(parts)

    def _emit_hover(self, scene_pos: QPointF) -> None:
        if self._level is None:
            return
        bay = self._bay_at(*from_scene(scene_pos))
        self._hover_item.setVisible(bay is not None)
        if bay is not None:
            self._hover_item.setRect(rect_to_scene(bay.bay.rect))
        text = self.describe(*from_scene(scene_pos))
        if text != self._last_hover:
            self._last_hover = text
            self.hover_text.emit(text)

    def leaveEvent(self, event: QEvent) -> None:  # type: ignore[override]
        self._hover_item.setVisible(False)
        super().leaveEvent(event)

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        if not self._user_view:
            self.fit()

    # ------------------------------------------------------------- foreground

    def drawForeground(self, painter: QPainter, rect: QRectF) -> None:
        painter.save()
        painter.resetTransform()
        painter.setRenderHint(QPainter.RenderHint.Antialiasing, True)
        painter.setRenderHint(QPainter.RenderHint.TextAntialiasing, True)
        if self._level is not None:
            self._paint_grid(painter)
        self._paint_corridor_preview(painter)
        self._paint_north(painter)
        if self._level is not None:  # an empty plan has nothing to measure
            self._paint_scale_bar(painter)
        self._paint_legend(painter)
        self._paint_caution(painter)
        self._paint_instruction(painter)
        painter.restore()

    def instruction(self) -> str:
        """What the next click does while drawing ('' in select mode); painted on
        the plan itself, where the eye is."""
        if self._mode == "draw_protection":
            if self._band_origin is None:
                return ("Drawing a protection area: press and drag out the mat's rectangle "
                        "· Esc ends")
            return "Release to lay the mat here · Esc cancels"
        if self._mode == "draw_corridor":
            n = len(self._corridor_pts)
            if n == 0:
                return (f"Corridor of zone {self._corridor_zone}: click its first corner "
                        "· Esc cancels")
            if n < 3:
                return (f"Click corner {n + 1} ({3 - n} more needed) · Backspace removes "
                        "the last · Esc cancels")
            return (f"Click corner {n + 1}, or double-click / Enter to finish with {n} "
                    "· Backspace removes the last · Esc cancels")
        return ""

    def _paint_instruction(self, p: QPainter) -> None:
        text = self.instruction()
        if not text:
            return
        font = pixel_font(12, True)
        fm = QFontMetricsF(font)
        vw = self.viewport().width()
        text = fm.elidedText(text, Qt.TextElideMode.ElideRight, vw - 40)
        w = fm.horizontalAdvance(text) + 24
        r = QRectF((vw - w) / 2, 8, w, fm.height() + 10)
        p.setPen(cosmetic_pen("#0B2E4F", 1.0))
        p.setBrush(QColor(227, 238, 247, 240))
        p.drawRoundedRect(r, 5, 5)
        p.setFont(font)
        p.setPen(QColor("#0B2E4F"))
        p.drawText(r, Qt.AlignmentFlag.AlignCenter, text)

    def _vp(self, x: float, y: float) -> QPointF:
        return self.viewportTransform().map(to_scene(x, y))

    def grid_bubbles(self) -> list[GridBubble]:
        """The grid bubbles of the level shown (viewport px): each at
        :data:`BUBBLE_OFFSET_PX` beyond the end of its grid line, or pushed further out
        along the line until it is clear of every crane symbol and crane label (a crane
        standing just off the grid used to cover a bubble); a moved bubble stays on its
        grid line. Top / left bubble first for each line.

        Where the lines of one direction lie closer on screen than two bubbles, the
        bubbles of that direction shrink (down to :data:`BUBBLE_MIN_RADIUS_PX`); if
        they still would touch, each line of that direction is labelled at one end
        only, the ends alternating (first line top / left, the next bottom / right),
        and where even that is too close, every other bubble also stands a bubble
        further out (staggered): on a small plan at 200 % they overlapped."""
        if self._level is None:
            return []
        g = self._level.grid
        x0, x1, y0, y1 = g.x_lines[0], g.x_lines[-1], g.y_lines[0], g.y_lines[-1]
        off = BUBBLE_OFFSET_PX
        avoid = self._crane_obstacles()

        def sizing(along: list[float]) -> tuple[float, bool, float]:
            """(radius, one end only, stagger step) of the bubbles on lines at
            screen positions ``along`` (px)."""
            gaps = [abs(b - a) for a, b in itertools.pairwise(along)]
            least = min(gaps, default=math.inf)
            pairs = [abs(b - a) for a, b in zip(along[:-2], along[2:], strict=True)]
            # two bubbles side by side keep BUBBLE_GAP_PX between them (and a little)
            r = max(BUBBLE_MIN_RADIUS_PX,
                    min(BUBBLE_RADIUS_PX, (least - BUBBLE_GAP_PX) / 2 - 0.5))
            if 2 * r + BUBBLE_GAP_PX < least:
                return r, False, 0.0
            every_other = min(pairs, default=math.inf)
            return r, True, (0.0 if 2 * r + BUBBLE_GAP_PX < every_other
                             else 2 * r + 2 * BUBBLE_GAP_PX)

        rx, one_x, sx = sizing([self._vp(x, y0).x() for x in g.x_lines])
        ry, one_y, sy = sizing([self._vp(x0, y).y() for y in g.y_lines])

        placed: list[QRectF] = []

        def clear(c: QPointF, dx: float, dy: float, r: float) -> QPointF:
            """``c`` moved out along its line (dx, dy) until clear of the cranes and of
            the bubbles placed before it (one a crane moved must not land on its
            staggered neighbour)."""
            box = QRectF(c.x() - r - BUBBLE_GAP_PX, c.y() - r - BUBBLE_GAP_PX,
                         2 * (r + BUBBLE_GAP_PX), 2 * (r + BUBBLE_GAP_PX))
            moved = 0.0
            while any(box.intersects(o) for o in (*avoid, *placed)) and \
                    moved < BUBBLE_MAX_SHIFT_PX:
                box.translate(dx * BUBBLE_STEP_PX, dy * BUBBLE_STEP_PX)
                moved += BUBBLE_STEP_PX
            centre = box.center()
            placed.append(QRectF(centre.x() - r, centre.y() - r, 2 * r, 2 * r))
            return centre

        out: list[GridBubble] = []
        for i, (x, lab) in enumerate(zip(g.x_lines, g.x_labels, strict=True)):
            top, bot = self._vp(x, y1), self._vp(x, y0)
            o = off + (sx if i % 4 >= 2 else 0.0)
            if not one_x or i % 2 == 0:
                out.append(GridBubble("x", lab, clear(QPointF(top.x(), top.y() - o), 0, -1,
                                                      rx), rx))
            if not one_x or i % 2 == 1:
                out.append(GridBubble("x", lab, clear(QPointF(bot.x(), bot.y() + o), 0, 1,
                                                      rx), rx))
        for i, (y, lab) in enumerate(zip(g.y_lines, g.y_labels, strict=True)):
            lft, rgt = self._vp(x0, y), self._vp(x1, y)
            o = off + (sy if i % 4 >= 2 else 0.0)
            if not one_y or i % 2 == 0:
                out.append(GridBubble("y", lab, clear(QPointF(lft.x() - o, lft.y()), -1, 0,
                                                      ry), ry))
            if not one_y or i % 2 == 1:
                out.append(GridBubble("y", lab, clear(QPointF(rgt.x() + o, rgt.y()), 1, 0,
                                                      ry), ry))
        return out

    def _crane_obstacles(self) -> list[QRectF]:
        """Viewport rectangles of every crane symbol (jib included) and crane label
        shown, as painted."""
        bounds = QRectF(self.viewport().rect())
        out = []
        for z in self._cranes_item.shown_zones():
            c = QPointF(self.mapFromScene(to_scene(*z.crane)))
            k = CRANE_SYMBOL_RADIUS_PX
            out.append(QRectF(c.x() - k, c.y() - k, 2 * k, 2 * k))
            out.append(keep_inside(crane_label_rect(c, z, self._px_per_m()), bounds))
        return out

    def _paint_grid(self, p: QPainter) -> None:
        assert self._level is not None
        g = self._level.grid
        sysm = self.unit_system
        x0, y0 = g.x_lines[0], g.y_lines[0]
        bub_r, dim_off = BUBBLE_RADIUS_PX, 24.0
        line_pen = cosmetic_pen(style.PLAN["grid_line"], 1.0, Qt.PenStyle.DashDotLine)
        bub_pen = cosmetic_pen(style.PLAN["grid_label"], 1.4)
        font = pixel_font(11, True)
        dim_font = pixel_font(10)
        fm = QFontMetricsF(dim_font)

        def bubble(c: QPointF, text: str, r: float) -> None:
            p.setPen(bub_pen)
            p.setBrush(QColor("#FFFFFF"))
            p.drawEllipse(c, r, r)
            p.setFont(font if r >= bub_r else pixel_font(11 * r / bub_r + 0.5, True))
            p.setPen(QColor(style.PLAN["grid_label"]))
            p.drawText(QRectF(c.x() - r, c.y() - r, 2 * r, 2 * r),
                       Qt.AlignmentFlag.AlignCenter, text)

        # each grid line runs from bubble to bubble (a bubble moved off a crane
        # takes its line with it)
        bubbles = self.grid_bubbles()
        ends: dict[tuple[str, str], list[GridBubble]] = {}
        for b in bubbles:
            ends.setdefault((b.axis, b.label), []).append(b)
        p.setPen(line_pen)
        top_y, bot_y = self._vp(x0, g.y_lines[-1]).y(), self._vp(x0, y0).y()
        left_x, right_x = self._vp(x0, y0).x(), self._vp(g.x_lines[-1], y0).x()
        for (axis, _lab), pair in ends.items():
            r = pair[0].radius
            if axis == "x":  # a vertical line, bubbles above and below (or at one end)
                ys = sorted(b.centre.y() for b in pair)
                ya = ys[0] + r if ys[0] < top_y else top_y - 8
                yb = ys[-1] - r if ys[-1] > bot_y else bot_y + 8
                p.drawLine(QPointF(pair[0].centre.x(), ya), QPointF(pair[0].centre.x(), yb))
            else:
                xs = sorted(b.centre.x() for b in pair)
                xa = xs[0] + r if xs[0] < left_x else left_x - 8
                xb = xs[-1] - r if xs[-1] > right_x else right_x + 8
                p.drawLine(QPointF(xa, pair[0].centre.y()), QPointF(xb, pair[0].centre.y()))
        for b in bubbles:
            bubble(b.centre, b.label, b.radius)
        # dimension strings: x below the grid, y left of it
        dim_pen = cosmetic_pen("#3A3A3A", 1.0)
        p.setFont(dim_font)
        base = self._vp(x0, y0).y() + dim_off
        for xa, xb in zip(g.x_lines[:-1], g.x_lines[1:], strict=True):
            a, b = self._vp(xa, y0).x(), self._vp(xb, y0).x()
            p.setPen(dim_pen)
            p.drawLine(QPointF(a, base), QPointF(b, base))
            for t in (a, b):
                p.drawLine(QPointF(t - 3, base + 3), QPointF(t + 3, base - 3))
            text = units.fmt(xb - xa, "length", sysm, decimals=2)
            if fm.horizontalAdvance(text) + 6 < b - a:
                # on a plate of the background colour: the drift band never crosses it
                tw = fm.horizontalAdvance(text) + 6
                p.fillRect(QRectF((a + b - tw) / 2, base - 14, tw, 13), self._dim_plate)
                p.setPen(QColor("#222222"))
                p.drawText(QRectF(a, base - 14, b - a, 13), Qt.AlignmentFlag.AlignCenter, text)
        left = self._vp(x0, y0).x() - dim_off
        for ya, yb in zip(g.y_lines[:-1], g.y_lines[1:], strict=True):
            a, b = self._vp(x0, ya).y(), self._vp(x0, yb).y()
            p.setPen(dim_pen)
            p.drawLine(QPointF(left, a), QPointF(left, b))
            for t in (a, b):
                p.drawLine(QPointF(left - 3, t + 3), QPointF(left + 3, t - 3))
            text = units.fmt(yb - ya, "length", sysm, decimals=2)
            if fm.horizontalAdvance(text) + 6 < a - b:
                p.save()
                p.translate(left + 1, (a + b) / 2)
                p.rotate(-90)
                tw = fm.horizontalAdvance(text) + 6
                p.fillRect(QRectF(-tw / 2, 0, tw, 13), self._dim_plate)
                p.setPen(QColor("#222222"))
                p.drawText(QRectF(-(a - b) / 2, 0, a - b, 13), Qt.AlignmentFlag.AlignCenter,
                           text)
                p.restore()

    def _paint_corridor_preview(self, p: QPainter) -> None:
        if self._mode != "draw_corridor" or not self._corridor_pts:
            return
        vt = self.viewportTransform()
        pts = [vt.map(q) for q in self._corridor_pts]
        teal = QColor(style.PLAN["zone_edge"])
        p.setBrush(Qt.BrushStyle.NoBrush)
        if self._corridor_cursor is not None:
            cur = vt.map(self._corridor_cursor)
            p.setPen(cosmetic_pen(teal, 1.2))
            p.drawLine(pts[-1], cur)
            if len(pts) >= 2:
                p.setPen(cosmetic_pen(teal, 1.0, Qt.PenStyle.DotLine))
                p.drawLine(cur, pts[0])
        elif len(pts) >= 3:
            p.setPen(cosmetic_pen(teal, 1.0, Qt.PenStyle.DotLine))
            p.drawLine(pts[-1], pts[0])
        p.setPen(cosmetic_pen("#FFFFFF", 5.0))  # halo: readable over any bay fill
        p.drawPolyline(QPolygonF(pts))
        p.setPen(cosmetic_pen(teal, 2.6, Qt.PenStyle.DashDotLine))
        p.drawPolyline(QPolygonF(pts))
        p.setPen(cosmetic_pen(teal, 1.4))
        for i, q in enumerate(pts):
            p.setBrush(teal if i == 0 else QColor("#FFFFFF"))
            p.drawRect(QRectF(q.x() - 4, q.y() - 4, 8, 8))

    def _paint_north(self, p: QPainter) -> None:
        c = QPointF(34, 44)
        p.setPen(cosmetic_pen("#222222", 1.2))
        p.setBrush(QColor(255, 255, 255, 220))
        p.drawEllipse(c, 17, 17)
        tip, tail = QPointF(c.x(), c.y() - 15), QPointF(c.x(), c.y() + 11)
        p.setBrush(QColor("#222222"))
        p.drawPolygon(QPolygonF([tip, QPointF(c.x() - 6, c.y() + 6), tail]))
        p.setBrush(QColor("#FFFFFF"))
        p.drawPolygon(QPolygonF([tip, QPointF(c.x() + 6, c.y() + 6), tail]))
        p.setFont(pixel_font(12, True))
        p.setPen(QColor("#222222"))
        p.drawText(QRectF(c.x() - 10, c.y() - 36, 20, 16), Qt.AlignmentFlag.AlignCenter, "N")

    def _paint_scale_bar(self, p: QPainter) -> None:
        ppm = self.pixels_per_metre()
        sysm = self.unit_system
        unit_m = 1.0 if sysm == "SI" else 0.3048
        length_u = units.nice_length(140.0 / (ppm * unit_m))
        length_px = length_u * unit_m * ppm
        x0 = 16.0
        y0 = self.viewport().height() - self._caution_height() - 26.0
        seg = length_px / 4
        p.setPen(cosmetic_pen("#222222", 1.0))
        for k in range(4):
            p.setBrush(QColor("#222222") if k % 2 == 0 else QColor("#FFFFFF"))
            p.drawRect(QRectF(x0 + k * seg, y0, seg, 6))
        p.setFont(pixel_font(10))
        p.setPen(QColor("#222222"))
        p.drawText(QRectF(x0 - 10, y0 + 7, 20, 13), Qt.AlignmentFlag.AlignCenter, "0")
        unit = units.display_unit("length", sysm)  # type: ignore[arg-type]
        label = f"{length_u:g} {unit}"
        p.drawText(QRectF(x0 + length_px - 40, y0 + 7, 80, 13), Qt.AlignmentFlag.AlignCenter,
                   label)

    def _caution_lines(self) -> list[str]:
        if self._results is None:
            return []
        width = max(self.viewport().width() - 16, 100)
        cached = getattr(self, "_caution_wrap", None)
        key = (width, self.viewport().height())
        if cached is not None and cached[0] == key:
            return cached[1]
        lines = self._wrap_caution(width)
        if 13.0 * len(lines) + 8 > 0.18 * self.viewport().height():
            # a small plan: the short caution, not a strip over a third of the plan
            lines = self._wrap_caution(width, style.CAUTION_PLAN_SHORT)
        self._caution_wrap = (key, lines)  # asked several times per paint
        return lines

    @staticmethod
    def _wrap_caution(width: float, text: str = CAUTION) -> list[str]:
        """The caution broken into lines of at most ``width`` pixels at word ends."""
        fm = QFontMetricsF(pixel_font(10))
        words, lines, cur = text.split(), [], ""
        for w in words:
            trial = f"{cur} {w}".strip()
            if fm.horizontalAdvance(trial) > width and cur:
                lines.append(cur)
                cur = w
            else:
                cur = trial
        if cur:
            lines.append(cur)
        return lines

    def _caution_height(self) -> float:
        n = len(self._caution_lines())
        return 13.0 * n + 8 if n else 0.0

    def _paint_caution(self, p: QPainter) -> None:
        lines = self._caution_lines()
        if not lines:
            return
        h = self._caution_height()
        vw, vh = self.viewport().width(), self.viewport().height()
        p.fillRect(QRectF(0, vh - h, vw, h), QColor("#FFF6D6"))
        p.setPen(cosmetic_pen("#8A5A00", 1.0))
        p.drawLine(QPointF(0, vh - h), QPointF(vw, vh - h))
        p.setFont(pixel_font(10))
        p.setPen(QColor("#3D2800"))
        for i, line in enumerate(lines):
            p.drawText(QRectF(8, vh - h + 4 + 13 * i, vw - 16, 13),
                       Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, line)

    def case_caption(self) -> str:
        if self._results is None:
            return "No results (analysis not run or running)"
        if self._case is None:
            return "Worst of every load and zone"
        return f"Zone {self._case[0]}, load {self._case[1]}"

    def _px_per_m(self) -> float:
        """Viewport pixels per metre of plan at the current zoom."""
        return px_per_m(self.viewportTransform())

    def content_viewport_rect(self) -> QRectF:
        """Viewport rectangle of the plan's content: the grid with its bubbles
        and dimension lines, the swing zones and the protection areas."""
        r = self._content_rect()
        if r.isEmpty():
            return QRectF()
        v = self.mapFromScene(r).boundingRect()
        pad = 60.0 if self._level is not None else 8.0  # grid bubbles and dimensions
        return QRectF(v).adjusted(-pad, -pad, pad, pad)

    def content_obstacles(self) -> list[QRectF]:
        """Viewport rectangles the legend must not cover: the plan's content
        (:meth:`content_viewport_rect`), each crane with its label."""
        out = [self.content_viewport_rect()]
        for z in self._cranes_item.shown_zones():
            c = QPointF(self.mapFromScene(to_scene(*z.crane)))
            out.append(QRectF(c.x() - 30, c.y() - 30, 60, 60))
            out.append(crane_label_rect(c, z, self._px_per_m()))
        return [r for r in out if not r.isEmpty()]

    def _legend_size(self) -> tuple[float, float]:
        rows = self._legend_rows()
        heights = {"outcome": 18.0, "ramp": 58.0, "sym": 16.0}
        return LEGEND_WIDTH, 40.0 + sum(heights[k] for k, _ in rows)

    def legend_rect(self) -> QRectF:
        """Where the legend is drawn (viewport px): the first free corner — top
        right, bottom right, top left, bottom left — that covers none of the plan's
        content, the north arrow, the scale bar or the caution; when no corner is
        free, a small "Key" tab at the top right that opens the legend on a click
        (:attr:`legend_collapsed`)."""
        vw, vh = self.viewport().width(), self.viewport().height()
        w, h = self._legend_size()
        bottom = vh - self._caution_height() - 40.0  # above the scale bar
        corners = [QRectF(vw - w - 10, 10, w, h), QRectF(vw - w - 10, bottom - h, w, h),
                   QRectF(70, 10, w, h), QRectF(10, bottom - 40 - h, w, h)]
        content = self.content_obstacles()
        self.legend_collapsed = False
        if self._legend_open:
            return corners[0]
        for r in corners:
            if r.top() >= 0 and r.left() >= 0 and r.bottom() <= bottom and \
                    r.right() <= vw and not any(r.intersects(c) for c in content):
                return r
        self.legend_collapsed = True
        # the Key tab itself in the first corner free of content (top right, bottom
        # right, top left beside the north arrow): at top right it covered grid
        # bubble 4 of the rooftop demo at 150 % (seen under Xvfb)
        tabs = [QRectF(vw - 64, 10, 54, 20), QRectF(vw - 64, bottom - 20, 54, 20),
                QRectF(80, 10, 54, 20)]
        return next((r for r in tabs if r.left() >= 0 and r.top() >= 0
                     and not any(r.intersects(c) for c in content)), tabs[0])

    def _legend_rows(self) -> list[tuple[str, object]]:
        rows: list[tuple[str, object]] = []
        mode = self._overlay
        if mode != "outcome":
            rows.append(("ramp", mode))
        for key in (*style.OUTCOME_ORDER, style.OUTCOME_NONE):
            rows.append(("outcome", key))
        rows += [("sym", "girder"), ("sym", "beam"), ("sym", "zone"), ("sym", "drift"),
                 ("sym", "crane")]
        if any(z.corridor for z in self._zones_item.shown_zones()) or (
                self._mode == "draw_corridor"):
            rows.append(("sym", "corridor"))
        if self._protection_item.areas:
            rows.append(("sym", "protection"))
        if self._openings_item.count:
            rows.append(("sym", "opening"))
        rows += [("sym", k) for k in ("pick_up", "set_down")
                 if k in self._lift_points_item.kinds]
        if any(st.scabbing for st in self._bays_item.states):
            rows.append(("sym", "scabbing"))
        return rows

    def _paint_legend(self, p: QPainter) -> None:
        r = self.legend_rect()
        mode = self._overlay
        if self.legend_collapsed:
            p.setPen(cosmetic_pen("#9A9A94", 1.0))
            p.setBrush(QColor(255, 255, 255, 235))
            p.drawRoundedRect(r, 4, 4)
            p.setFont(pixel_font(11, True))
            p.setPen(QColor("#222222"))
            p.drawText(r, Qt.AlignmentFlag.AlignCenter, "Key ▾")
            return
        x, y, w, h = r.x(), r.y(), r.width(), r.height()
        rows = self._legend_rows()
        heights = {"outcome": 18.0, "ramp": 58.0, "sym": 16.0}
        p.setPen(cosmetic_pen("#9A9A94", 1.0))
        p.setBrush(QColor(255, 255, 255, 235))
        p.drawRoundedRect(QRectF(x, y, w, h), 4, 4)
        p.setFont(pixel_font(11, True))
        p.setPen(QColor("#222222"))
        p.drawText(QRectF(x + 8, y + 5, w - 16, 14), Qt.AlignmentFlag.AlignLeft,
                   style.OVERLAYS.get(mode, mode))
        p.setFont(pixel_font(9))
        p.setPen(QColor("#555555"))
        p.drawText(QRectF(x + 8, y + 20, w - 16, 12), Qt.AlignmentFlag.AlignLeft,
                   QFontMetricsF(pixel_font(9)).elidedText(
                       self.case_caption(), Qt.TextElideMode.ElideRight, w - 16))
        cy = y + 38
        for kind, val in rows:
            if kind == "outcome":
                st = style.outcome(str(val))
                sw = QRectF(x + 8, cy + 2, 26, 13)
                p.fillRect(sw, st.fill_brush())
                if st.hatch != Qt.BrushStyle.NoBrush:
                    p.fillRect(sw, st.hatch_brush())
                p.setPen(cosmetic_pen(st.edge, 1.0))
                p.setBrush(Qt.BrushStyle.NoBrush)
                p.drawRect(sw)
                p.setFont(pixel_font(10))
                p.setPen(QColor("#222222"))
                p.drawText(QRectF(x + 40, cy + 1, w - 46, 15),
                           Qt.AlignmentFlag.AlignVCenter, f"{st.tag}  {st.label}")
            elif kind == "ramp":
                self._paint_ramp(p, QRectF(x + 8, cy, w - 16, heights["ramp"]), str(val))
            else:
                self._paint_symbol_row(p, QRectF(x + 8, cy, w - 16, 16), str(val))
            cy += heights[kind]

    def _paint_ramp(self, p: QPainter, r: QRectF, mode: str) -> None:
        sysm = self.unit_system
        bar = QRectF(r.left() + 4, r.top() + 2, r.width() - 72, 12)
        lo, hi = UTIL_RANGE if mode == "utilisation" else DROP_RANGE
        grad = QLinearGradient(bar.topLeft(), bar.topRight())
        for k in range(11):
            v = lo + (hi - lo) * k / 10
            c = int(colour_values(mode, np.array([v]))[0])
            grad.setColorAt(k / 10, QColor((c >> 16) & 255, (c >> 8) & 255, c & 255))
        p.fillRect(bar, QBrush(grad))
        p.setPen(cosmetic_pen("#555555", 1.0))
        p.setBrush(Qt.BrushStyle.NoBrush)
        p.drawRect(bar)
        extra = QRectF(bar.right() + 30, bar.top(), 34, 12)
        if mode == "utilisation":
            st = style.outcome("exceeds")
            p.fillRect(extra, st.fill_brush())
            extra_text = "> 1"
            ticks = [(0.0, "0"), (0.5, "0.5"), (1.0, "1.0")]
            note = "utilisation, worst per cell"
        else:
            c = int(colour_values(mode, np.array([np.nan]))[0])
            p.fillRect(extra, QColor((c >> 16) & 255, (c >> 8) & 255, c & 255))
            extra_text = "none"
            ticks = [(v, units.fmt(v, "length", sysm, decimals=1)) for v in (0.0, 2.0, 4.0)]
            note = "elastic, least per cell; none = no safe height"
        p.drawRect(extra)
        p.setFont(pixel_font(9))
        p.setPen(QColor("#222222"))
        for k, (v, t) in enumerate(ticks):
            tx = bar.left() + (v - lo) / (hi - lo) * bar.width()
            p.drawLine(QPointF(tx, bar.bottom()), QPointF(tx, bar.bottom() + 3))
            if k == 0:
                box, align = QRectF(tx - 3, bar.bottom() + 3, 48, 12), Qt.AlignmentFlag.AlignLeft
            elif k == len(ticks) - 1:
                t = f"≥ {t}" if mode == "drop_height" else t
                box, align = QRectF(tx - 45, bar.bottom() + 3, 48, 12), Qt.AlignmentFlag.AlignRight
            else:
                box, align = QRectF(tx - 24, bar.bottom() + 3, 48, 12), Qt.AlignmentFlag.AlignCenter
            p.drawText(box, align, t)
        p.drawText(QRectF(extra.left() - 7, extra.bottom() + 3, 48, 12),
                   Qt.AlignmentFlag.AlignCenter, extra_text)
        p.setPen(QColor("#555555"))
        p.drawText(QRectF(r.left(), bar.bottom() + 17, r.width(), 24),
                   Qt.AlignmentFlag.AlignLeft | Qt.TextFlag.TextWordWrap, note)

    def _paint_symbol_row(self, p: QPainter, r: QRectF, kind: str) -> None:
        a = QPointF(r.left(), r.center().y())
        b = QPointF(r.left() + 26, r.center().y())
        teal = QColor(style.PLAN["zone_edge"])
        label = kind
        if kind == "girder":
            p.setPen(cosmetic_pen(style.PLAN["girder"], 3.0))
            p.drawLine(a, b)
            label = "Girder"
        elif kind == "beam":
            p.setPen(cosmetic_pen(style.PLAN["beam"], 1.2))
            p.drawLine(a, b)
            label = "Beam"
        elif kind == "zone":
            p.setPen(cosmetic_pen(teal, 1.6, Qt.PenStyle.DashLine))
            p.drawLine(a, b)
            label = "Swing zone edge"
        elif kind == "drift":
            band = QColor(teal)
            band.setAlpha(0x30)
            p.fillRect(QRectF(a.x(), a.y() - 4, 26, 8), band)
            p.setPen(cosmetic_pen(teal.lighter(130), 1.0, Qt.PenStyle.DotLine))
            p.setBrush(Qt.BrushStyle.NoBrush)
            p.drawRect(QRectF(a.x(), a.y() - 4, 26, 8))
            label = "Drift margin"
        elif kind == "corridor":
            p.setPen(cosmetic_pen("#FFFFFF", 4.0))
            p.drawLine(a, b)
            p.setPen(cosmetic_pen(teal, 2.0, Qt.PenStyle.DashDotLine))
            p.drawLine(a, b)
            label = "Lift corridor"
        elif kind == "crane":
            c = QPointF(a.x() + 13, a.y())
            p.setPen(cosmetic_pen(teal, 1.4))
            p.setBrush(QColor("#FFFFFF"))
            for k in range(4):
                ang = math.radians(45 + 90 * k)
                tip = QPointF(c.x() + 7 * math.cos(ang), c.y() - 7 * math.sin(ang))
                p.drawLine(c, tip)
                p.drawRect(QRectF(tip.x() - 2, tip.y() - 2, 4, 4))
            p.drawEllipse(c, 4, 4)
            label = "Crane position"
        elif kind == "protection":
            p.setPen(cosmetic_pen(style.PLAN["protection_edge"], 2.0, Qt.PenStyle.DashLine))
            p.setBrush(Qt.BrushStyle.NoBrush)
            p.drawRect(QRectF(a.x(), a.y() - 5, 26, 10))
            label = "Mat / crush layer"
        elif kind == "opening":
            box = QRectF(a.x(), a.y() - 5, 26, 10)
            p.fillRect(box, QColor("#FFFFFF"))
            p.setPen(cosmetic_pen("#1A1A1A", 1.0))
            p.drawLine(box.topLeft(), box.bottomRight())
            p.drawLine(box.bottomLeft(), box.topRight())
            p.setPen(QPen(QColor("#1A1A1A"), 2.0))
            p.setBrush(Qt.BrushStyle.NoBrush)
            p.drawRect(box)
            label = "Deck opening"
        elif kind in ("pick_up", "set_down"):
            paint_lift_point(p, kind, a.x() + 13, a.y(), 5.0)
            label = "Pick-up point" if kind == "pick_up" else "Set-down point"
        elif kind == "scabbing":
            from droprig.outcomes import SCABBING

            paint_scabbing_mark(p, QRectF(a.x() + 6, a.y() - 7, 14, 14))
            label = f"{SCABBING.label}: clear below"  # fits the 196 px key
        p.setFont(pixel_font(10))
        p.setPen(QColor("#222222"))
        p.drawText(QRectF(r.left() + 32, r.top(), r.width() - 32, r.height()),
                   Qt.AlignmentFlag.AlignVCenter, label)
