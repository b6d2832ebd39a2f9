"""The main window's panels: the plan with its view bar, heading and guide, the
docked project tree, inspector, results and trace, the status bar, the one
lift / load filter, and the window geometry stored per screen scale.

A part of :class:`droprig.gui.main_window.MainWindow` (a mixin)."""

from __future__ import annotations

import html

from PySide6.QtCore import QSize, Qt, Signal
from PySide6.QtGui import QMouseEvent, QPainter, QPaintEvent, QResizeEvent, QShowEvent
from PySide6.QtWidgets import (
    QComboBox,
    QDockWidget,
    QFrame,
    QHBoxLayout,
    QLabel,
    QProgressBar,
    QScrollArea,
    QTabBar,
    QTabWidget,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from droprig import outcomes, units
from droprig.gui import style
from droprig.gui.document import Selection
from droprig.gui.flow_layout import FlowLayout
from droprig.gui.inspector import Inspector
from droprig.gui.project_tree import ProjectTree
from droprig.gui.results_table import ResultsTable
from droprig.gui.window_base import WindowParts
from droprig.gui.window_edits import is_placeholder
from droprig.model import LiftLoad
from droprig.texts import CAUTION

BASIS_LABELS = style.BASIS_LABELS
UNIT_LABELS = style.UNIT_LABELS


def screen_scale_tag(screen: object) -> str:
    """``"scale150"`` for a screen at 150 % (device pixel ratio 1.5); ``"scale100"``
    when there is no screen."""
    dpr = float(screen.devicePixelRatio()) if screen is not None else 1.0  # type: ignore[attr-defined]
    return f"scale{round(dpr * 100)}"


CAUTION_VARIANTS: tuple[str, ...] = (
    "An aid only — review against local codes with the appointed lifting person and a "
    "licensed engineer",
    "An aid only — review with the appointed lifting person and a licensed engineer",
    "Aid only — review with the lifting person and a licensed engineer",
    "Aid only — review with a licensed engineer",
    "Aid only — licensed engineer to review",
    "Aid only — licensed engineer",
)
"""The status bar's caution, longest first: the label shows the longest that fits
its width (never cut at the window's edge); the whole caution is its tooltip and a
click opens Help › Limits of use. Even the shortest defers to a licensed engineer
(the full caution is also under the plan)."""


class CautionLabel(QLabel):
    """The caution in the status bar, as long as the room allows
    (:data:`CAUTION_VARIANTS`); ``clicked`` when pressed."""

    clicked = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(f"⚠ {CAUTION_VARIANTS[0]}", parent)
        self.setObjectName("cautionLabel")
        self.setToolTip(f"{CAUTION}\n\nClick for Help › Limits of use.")
        self.setCursor(Qt.CursorShape.PointingHandCursor)
        self.setStyleSheet(
            "QLabel#cautionLabel { background: #FFF1CC; color: #3D2800; "
            "border: 1px solid #C9A23A; border-radius: 3px; padding: 1px 6px; "
            "font-weight: 600; }")

    @staticmethod
    def variants() -> list[str]:
        return [f"⚠ {v}" for v in CAUTION_VARIANTS]

    def _need(self, text: str) -> int:
        """Width (px) the label needs to show ``text`` whole."""
        frame = self.width() - self.contentsRect().width()
        return self.fontMetrics().horizontalAdvance(text) + max(frame, 0) + 2

    def fits(self) -> bool:
        """True when the text on show fits the label's width."""
        return self.fontMetrics().horizontalAdvance(self.text()) <= \
            self.contentsRect().width()

    def sizeHint(self) -> QSize:
        hint = super().sizeHint()
        return QSize(self._need(self.variants()[0]), hint.height())

    def minimumSizeHint(self) -> QSize:
        hint = super().minimumSizeHint()
        return QSize(self._need(self.variants()[-1]), hint.height())

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        room = self.contentsRect().width()
        fm = self.fontMetrics()
        texts = self.variants()
        text = next((t for t in texts if fm.horizontalAdvance(t) <= room), texts[-1])
        if text != self.text():
            self.setText(text)

    def mousePressEvent(self, event: QMouseEvent) -> None:
        if event.button() == Qt.MouseButton.LeftButton:
            self.clicked.emit()
        super().mousePressEvent(event)


class ElidingLabel(QLabel):
    """A one-line label that, when narrower than its text, draws the text cut
    with "…" and keeps the whole text as ``text()`` and in its tooltip (the
    analysis state in the status bar: its least width once set the window's)."""

    changed = Signal()
    """The text changed (the window then shares the status bar out again)."""

    def setText(self, text: str) -> None:
        changed = text != self.text()
        super().setText(text)
        if changed:
            self.changed.emit()

    def need(self) -> int:
        """Width (px) that shows the whole text."""
        return self.fontMetrics().horizontalAdvance(self.text()) + 8

    def minimumSizeHint(self) -> QSize:
        return QSize(max(self.fontMetrics().horizontalAdvance("Analysing…") + 4,
                         self.minimumWidth()), super().minimumSizeHint().height())

    def elided(self) -> bool:
        """True when the text on show is cut."""
        return self.fontMetrics().horizontalAdvance(self.text()) > self.contentsRect().width()

    def paintEvent(self, event: QPaintEvent) -> None:
        if not self.elided():
            super().paintEvent(event)
            return
        painter = QPainter(self)
        rect = self.contentsRect()
        text = self.fontMetrics().elidedText(self.text(), Qt.TextElideMode.ElideRight,
                                             rect.width())
        painter.setPen(self.palette().color(self.foregroundRole()))
        painter.drawText(rect, int(Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter),
                         text)


COMPACT_BELOW = (760, 600)
"""Window width and height (logical px) below either of which the panels go to one
tabbed side panel (:meth:`PanelsMixin.set_compact`): 1280 × 720 at 150 % is
853 × 480 logical and at 200 % 640 × 360 (common practice, no source)."""

SHORT_HEADING_BELOW = 800
"""Window height (logical px) below which the plan's heading takes its short form
(:attr:`PanelsMixin.short_heading`; common practice, no source)."""
SHORT_TITLES = {"results": "Results", "trace": "Trace"}
"""Panel titles in the compact layout, where the four share one row of tabs."""


class PanelsMixin(WindowParts):
    """The main window's panels."""

    def _make_central(self) -> None:
        from droprig.gui.plan_view import PlanView

        self.plan = PlanView(self.doc)
        self.plan.setObjectName("planView")

        self.level_combo = QComboBox()
        self.level_combo.setToolTip("Level shown in the plan")
        self.overlay_combo = QComboBox()
        for mode, label in style.OVERLAYS.items():
            self.overlay_combo.addItem(label, mode)
        self.overlay_combo.setToolTip("What the bays and drop points are coloured by")
        self.case_combo = QComboBox()
        self.case_combo.setToolTip("Which lift and load the plan shows")
        # the combos size to a set number of characters, not to their longest item
        # (the list opens at full width): with a level chooser, names as long as the
        # two-level demo's set the bar, and so the window, past a 1280 px screen
        for combo in (self.level_combo, self.overlay_combo, self.case_combo):
            combo.setSizeAdjustPolicy(
                QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self._size_combos(compact=False)
        draw_btn = QToolButton()
        draw_btn.setDefaultAction(self.actions["draw_protection"])
        fit_btn = QToolButton()
        fit_btn.setDefaultAction(self.actions["fit"])

        # the view bar: each label with its chooser, then the two buttons; on a
        # narrow window (1280 × 720 at 150–200 %) it wraps onto a second row rather
        # than set a window wider than the screen
        bar = QWidget()
        bar.setObjectName("viewBar")
        self.view_bar = bar
        flow = FlowLayout(bar, spacing=10)
        flow.setContentsMargins(6, 4, 6, 4)

        def pair(label: QLabel, combo: QComboBox) -> QWidget:
            w = QWidget()
            lay = QHBoxLayout(w)
            lay.setContentsMargins(0, 0, 0, 0)
            lay.setSpacing(4)
            lay.addWidget(label)
            lay.addWidget(combo)
            flow.addWidget(w)
            return w

        self._level_label = QLabel("Level:")
        self._level_pair = pair(self._level_label, self.level_combo)
        self._colour_label = QLabel("Colour by:")
        pair(self._colour_label, self.overlay_combo)
        pair(QLabel("Lift:"), self.case_combo)
        self.view_buttons = (draw_btn, fit_btn)
        flow.addWidget(draw_btn)
        flow.addWidget(fit_btn)

        self.guide = QWidget()
        self.guide.setObjectName("guideBar")
        self.guide.setStyleSheet("QWidget#guideBar { background: #E3EEF7; "
                                 "border-bottom: 1px solid #9CB8D3; }")
        g = QHBoxLayout(self.guide)
        g.setContentsMargins(8, 5, 8, 5)
        self.guide_text = QLabel()
        self.guide_text.setObjectName("guideText")
        self.guide_text.setStyleSheet("color: #0B2E4F;")
        self.guide_text.setWordWrap(True)  # a long hint wraps, never widens the window
        self.guide_button = QToolButton()
        g.addWidget(self.guide_text, 1)
        g.addWidget(self.guide_button)

        self.plan_heading = QLabel()
        self.plan_heading.setObjectName("planHeading")
        self.plan_heading.setWordWrap(True)
        self.plan_heading.setTextFormat(Qt.TextFormat.RichText)
        self.plan_heading.setStyleSheet("QLabel#planHeading { background: #F4F4F0; "
                                        "color: #1E1E1E; padding: 3px 8px; "
                                        "border-bottom: 1px solid #CFCFC8; }")

        # a notice the user dismisses (a file converted from an older format)
        self.notice = QWidget()
        self.notice.setObjectName("noticeBar")
        self.notice.setStyleSheet("QWidget#noticeBar { background: #FFF1CC; "
                                  "border-bottom: 1px solid #C9A23A; }")
        nb = QHBoxLayout(self.notice)
        nb.setContentsMargins(8, 5, 8, 5)
        self.notice_text = QLabel()
        self.notice_text.setObjectName("noticeText")
        self.notice_text.setStyleSheet("color: #3D2800;")
        self.notice_text.setWordWrap(True)
        self.notice_text.setTextFormat(Qt.TextFormat.RichText)
        self.notice_text.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.notice_dismiss = QToolButton()
        self.notice_dismiss.setObjectName("noticeDismiss")
        self.notice_dismiss.setText("Dismiss")
        self.notice_dismiss.setToolTip("Hide this notice")
        self.notice_dismiss.clicked.connect(self.dismiss_notice)
        # at most NOTICE_LINES lines high: a long list scrolls, the plan keeps its room
        scroll = QScrollArea()
        scroll.setObjectName("noticeScroll")
        scroll.setWidget(self.notice_text)
        scroll.setWidgetResizable(True)
        scroll.setFrameShape(QFrame.Shape.NoFrame)
        scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        scroll.setStyleSheet("QScrollArea#noticeScroll, QScrollArea#noticeScroll > QWidget "
                             "> QWidget { background: transparent; }")
        scroll.setMaximumHeight(self.fontMetrics().lineSpacing() * self.NOTICE_LINES + 6)
        self.notice_scroll = scroll
        nb.addWidget(scroll, 1)
        nb.addWidget(self.notice_dismiss, 0, Qt.AlignmentFlag.AlignTop)
        self.notice.hide()

        central = QWidget()
        v = QVBoxLayout(central)
        v.setContentsMargins(0, 0, 0, 0)
        v.setSpacing(0)
        v.addWidget(bar)
        v.addWidget(self.notice)
        v.addWidget(self.plan_heading)
        v.addWidget(self.guide)
        v.addWidget(self.plan, 1)
        self.setCentralWidget(central)

    def _size_combos(self, *, compact: bool) -> None:
        """The view bar's choosers at a set number of characters (fewer on a small
        window, where the bar would otherwise take three rows of a 360 px plan)."""
        for combo, chars, small in ((self.level_combo, 10, 5), (self.overlay_combo, 10, 6),
                                    (self.case_combo, 16, 10)):
            combo.setMinimumContentsLength(small if compact else chars)
        if hasattr(self, "_colour_label"):
            self._colour_label.setText("Colour:" if compact else "Colour by:")

    NOTICE_ITEMS = 3
    """Notes listed in the notice bar; the rest are counted and listed on hover."""
    NOTICE_LINES = 5
    """Text lines the notice bar shows at most (more scroll inside it)."""

    def show_notice(self, heading: str, items: tuple[str, ...] | list[str] = ()) -> None:
        """A notice above the plan (plain ``heading`` and ``items``) until the user
        dismisses it or the project changes by new / open / close."""
        e = html.escape
        shown = list(items)[:self.NOTICE_ITEMS]
        more = len(items) - len(shown)
        body = "".join(f"<li>{e(t)}</li>" for t in shown)
        if more:
            body += f"<li>… and {more} more (hover to read them all)</li>"
        self.notice_text.setText(f"<b>⚠ {e(heading)}</b>"
                                 + (f"<ul style='margin:2px 0 0 -20px'>{body}</ul>"
                                    if body else ""))
        self.notice_text.setToolTip("\n\n".join(items) if more else "")
        self.notice.show()

    def dismiss_notice(self) -> None:
        """Hide the notice bar."""
        self.notice.hide()
        self.notice_text.clear()

    def _dock(self, name: str, title: str, widget: QWidget,
              area: Qt.DockWidgetArea) -> QDockWidget:
        d = QDockWidget(title, self)
        d.setObjectName(f"dock_{name}")
        d.setWidget(widget)
        d.setFeatures(QDockWidget.DockWidgetFeature.DockWidgetMovable
                      | QDockWidget.DockWidgetFeature.DockWidgetFloatable
                      | QDockWidget.DockWidgetFeature.DockWidgetClosable)
        self.addDockWidget(area, d)
        return d

    def _make_docks(self) -> None:
        from droprig.gui.trace_panel import TracePanel

        self.tree = ProjectTree(self.doc, self.actions)
        self.inspector = Inspector(self.doc, self.actions)
        self.results_table = ResultsTable(self.doc)
        self.trace_panel = TracePanel()
        self.trace_panel.set_project_source(lambda: self.doc.project)
        self.tree_dock = self._dock("project", "Project", self.tree,
                                    Qt.DockWidgetArea.LeftDockWidgetArea)
        self.inspector_dock = self._dock("inspector", "Inspector", self.inspector,
                                         Qt.DockWidgetArea.RightDockWidgetArea)
        self.results_dock = self._dock("results", "Results by bay", self.results_table,
                                       Qt.DockWidgetArea.BottomDockWidgetArea)
        self.trace_dock = self._dock("trace", "Calculation trace", self.trace_panel,
                                     Qt.DockWidgetArea.BottomDockWidgetArea)
        self.splitDockWidget(self.results_dock, self.trace_dock, Qt.Orientation.Horizontal)
        self._full_titles = {"results": self.results_dock.windowTitle(),
                             "trace": self.trace_dock.windowTitle()}
        self._set_dock_minimums()
        self._default_layout_pending = True

    def _apply_default_dock_sizes(self) -> None:
        """First start at this screen scale (no saved layout): side panels wide
        enough for their titles and a form, the results a third of the height
        (on a short window, 1280 × 720 or a large screen at 150–200 %, the heading
        is short, which leaves the plan its half), the rest to the plan."""
        w = max(self.width(), 800)
        h = max(self.height(), 480)
        tree_w = max(int(w * 0.15), self.tree_dock.minimumWidth())
        insp_w = max(int(w * 0.23), self.inspector_dock.minimumWidth())
        self.resizeDocks([self.tree_dock, self.inspector_dock], [tree_w, insp_w],
                         Qt.Orientation.Horizontal)
        self.resizeDocks([self.results_dock], [int(h * 0.32)],
                         Qt.Orientation.Vertical)
        self.resizeDocks([self.results_dock, self.trace_dock], [int(w * 0.62), int(w * 0.38)],
                         Qt.Orientation.Horizontal)

    def _set_dock_minimums(self) -> None:
        """No panel narrower than its title and buttons (titles are never cut to
        "…"), and the side forms wide enough for a label and a value."""
        for d in (self.tree_dock, self.inspector_dock, self.results_dock, self.trace_dock):
            fm = d.fontMetrics()
            bold = d.font()
            bold.setBold(True)
            from PySide6.QtGui import QFontMetrics

            title = QFontMetrics(bold).horizontalAdvance(d.windowTitle())
            d.setMinimumWidth(title + 2 * fm.height() + 40)  # float + close buttons
        em = self.fontMetrics().averageCharWidth()
        self.tree_dock.setMinimumWidth(max(self.tree_dock.minimumWidth(), 18 * em))
        self.inspector_dock.setMinimumWidth(max(self.inspector_dock.minimumWidth(),
                                                (26 if self.compact else 30) * em))

    def showEvent(self, event: QShowEvent) -> None:
        super().showEvent(event)
        if self._default_layout_pending:
            self._default_layout_pending = False
            if self.compact:
                self._size_side_panel()
            else:
                self._apply_default_dock_sizes()

    compact = False
    """True while the panels share one tabbed side panel (a small window)."""

    def resizeEvent(self, event: QResizeEvent) -> None:
        super().resizeEvent(event)
        self.set_compact(self._wants_compact(self.width(), self.height()))
        self._fit_status_bar()
        if self.short_heading != getattr(self, "_heading_short", None):
            self._heading_short = self.short_heading
            self._update_heading()

    @staticmethod
    def _wants_compact(width: int, height: int) -> bool:
        return width < COMPACT_BELOW[0] or height < COMPACT_BELOW[1]

    def _docks(self) -> tuple[QDockWidget, ...]:
        """The panels in their tab order of the compact layout (the results first:
        what a reader opens the window for)."""
        return (self.results_dock, self.inspector_dock, self.tree_dock, self.trace_dock)

    def set_compact(self, compact: bool) -> None:
        """On a small window (below :data:`COMPACT_BELOW`: 1280 × 720 at 150 % or
        200 % scaling) the four panels become tabs of one panel at the right and the
        plan keeps the rest; the view bar's two buttons (also in the Lift and View
        menus) and the status bar's units and basis (also in Settings) step aside.
        On a larger window the panels go back to their places: project left,
        inspector right, results and trace below. Each panel keeps whether the
        user closed it (View menu)."""
        if compact == self.compact:
            return
        self.compact = compact
        shown = {d: not d.isHidden() for d in self._docks()}
        for d in self._docks():
            d.setFloating(False)
        if compact:
            self.setTabPosition(Qt.DockWidgetArea.RightDockWidgetArea,
                                QTabWidget.TabPosition.North)
            first, *rest = self._docks()
            self.addDockWidget(Qt.DockWidgetArea.RightDockWidgetArea, first)
            for d in rest:
                self.addDockWidget(Qt.DockWidgetArea.RightDockWidgetArea, d)
                self.tabifyDockWidget(first, d)
        else:
            self.addDockWidget(Qt.DockWidgetArea.LeftDockWidgetArea, self.tree_dock)
            self.addDockWidget(Qt.DockWidgetArea.RightDockWidgetArea, self.inspector_dock)
            self.addDockWidget(Qt.DockWidgetArea.BottomDockWidgetArea, self.results_dock)
            self.addDockWidget(Qt.DockWidgetArea.BottomDockWidgetArea, self.trace_dock)
            self.splitDockWidget(self.results_dock, self.trace_dock, Qt.Orientation.Horizontal)
        for key, d in (("results", self.results_dock), ("trace", self.trace_dock)):
            d.setWindowTitle(SHORT_TITLES[key] if compact else self._full_titles[key])
        for d, was in shown.items():
            d.setVisible(was)
        self._set_dock_minimums()
        for b in self.view_buttons:
            b.setVisible(not compact)
        self._size_combos(compact=compact)
        self._fit_status_bar()
        self._update_heading()
        if compact:
            self.results_dock.raise_()
        if self.isVisible():
            if compact:
                self._size_side_panel()
            else:
                self._apply_default_dock_sizes()

    def side_tab_bar(self) -> QTabBar | None:
        """The tab bar of the compact layout's side panel (None when not compact)."""
        if not self.compact:
            return None
        titles = {d.windowTitle() for d in self._docks()}
        for bar in self.findChildren(QTabBar):
            if bar.parent() is self and bar.isVisible() and bar.count() > 1 and \
                    {bar.tabText(i) for i in range(bar.count())} <= titles:
                return bar
        return None

    def current_side_panel(self) -> QDockWidget | None:
        """The panel whose tab is raised in the compact layout."""
        bar = self.side_tab_bar()
        if bar is None:
            return None
        title = bar.tabText(bar.currentIndex())
        return next((d for d in self._docks() if d.windowTitle() == title), None)

    def _size_side_panel(self) -> None:
        """The side panel as wide as its row of tabs (no tab scrolled away or cut),
        and at least 36 % of the window; the plan keeps the rest."""
        fm = self.fontMetrics()
        tabs = sum(fm.horizontalAdvance(d.windowTitle()) + 2 * fm.height()
                   for d in self._docks() if not d.isHidden())
        want = max(tabs, int(self.width() * 0.36), self.inspector_dock.minimumWidth())
        self.resizeDocks([self.results_dock], [want], Qt.Orientation.Horizontal)

    def _make_status_bar(self) -> None:
        sb = self.statusBar()
        sb.setObjectName("statusBar")
        self.units_label = QLabel()
        self.units_label.setObjectName("unitsLabel")
        self.basis_label = QLabel()
        self.basis_label.setObjectName("basisLabel")
        self.state_label = ElidingLabel()
        self.state_label.setObjectName("analysisState")
        self.busy = QProgressBar()
        self.busy.setObjectName("busyIndicator")
        self.busy.setRange(0, 0)
        self.busy.setFixedWidth(70)
        self.busy.setFixedHeight(12)
        self.busy.setTextVisible(False)
        self.busy.hide()
        self.caution_label = CautionLabel()
        self.caution_label.clicked.connect(self.actions["caution"].trigger)
        # units, basis and the analysis state give way to a temporary message
        # ('Annex written: …'); only the caution is permanent. (All were permanent,
        # the caution stretched: messages had no room and were never seen.)
        for w in (self.units_label, self.basis_label, self.busy):
            sb.addWidget(w)
        sb.addWidget(self.state_label, 1)
        sb.addPermanentWidget(self.caution_label)
        self.state_label.changed.connect(self._fit_status_bar)
        # a message ends: QStatusBar shows its normal widgets again, share them out
        sb.messageChanged.connect(self._fit_status_bar)

    def _fit_status_bar(self) -> None:
        """Share the status bar out: the analysis state whole first (whether the
        results are current, and their warnings: at 1280 × 720 it read "Up to dat…"
        and its "⚠ 1 warning" was cut away, seen under Xvfb), the caution at least
        its shortest form (it names the licensed engineer; the full one is under the
        plan and in its tooltip), then units and basis if room is left (they are
        also in Settings).

        While a temporary message is on show, QStatusBar has hidden the normal
        widgets to paint it; showing units and basis then draws them over the
        message (seen under Xvfb: the pointer's "x −10.59 m, y 23.83 m" painted on
        top of "Units: SI …" after an undo re-ran the analysis). They are shared
        out again when the message ends (``messageChanged``)."""
        if not hasattr(self, "caution_label"):
            return
        if self.statusBar().currentMessage():
            return
        room = self.statusBar().width() - 40
        caution = self.caution_label.minimumSizeHint().width()
        state = self.state_label.need()
        extra = (self.units_label.sizeHint().width() + self.basis_label.sizeHint().width()
                 + 24)
        show = not self.compact and room >= state + caution + extra
        self.units_label.setVisible(show)
        self.basis_label.setVisible(show)
        self.state_label.setMinimumWidth(max(min(state, room - caution), 0))

    def _update_guide(self) -> None:
        """Tell a new user the next step until the project can be assessed."""
        p = self.doc.project
        if not p.levels:
            text, action = ("<b>Start here:</b> build the floor from its column grid and "
                            "sections, or open a saved project (File › Open).", "generate")
        elif not any(z.level_id == self.doc.level_id for z in p.lift_zones):
            text, action = ("<b>Next:</b> place the crane and the region its load swings "
                            "over this level.", "add_zone")
        elif not any(z.loads for z in p.lift_zones):
            text, action = ("<b>Next:</b> give the lift zone the load (and rigging) that "
                            "could drop.", "add_load")
        elif self._placeholder() is not None:
            zid, ld = self._placeholder()  # type: ignore[misc]
            s = p.settings.unit_system
            text, action = (
                f"<b>Next:</b> {html.escape(ld.name)} (zone {html.escape(zid)}) still has "
                f"its starting values: {units.fmt(ld.mass, 'mass', s)}, "
                f"{units.fmt(ld.drop_height, 'length', s)} fall, rigid, "
                f"{units.fmt(ld.footprint_length, 'length', s)} × "
                f"{units.fmt(ld.footprint_width, 'length', s)} footprint. Enter the "
                "planned load.", "edit_load")
        else:
            self.guide.hide()
            return
        self.guide_text.setText(text)
        # one action only: setDefaultAction adds to the button's actions, and with
        # more than one the button drew a menu arrow over its text and a long press
        # offered the steps already done (seen under Xvfb)
        for old in self.guide_button.actions():
            if old is not self.actions[action]:
                self.guide_button.removeAction(old)
        self.guide_button.setDefaultAction(self.actions[action])
        self.guide.show()

    def _placeholder(self) -> tuple[str, LiftLoad] | None:
        """(zone id, load) of the first load on the level shown that still has
        the starting values of :func:`placeholder_load`."""
        for z in self.doc.project.lift_zones:
            if z.level_id == self.doc.level_id:
                for ld in z.loads:
                    if is_placeholder(ld):
                        return z.id, ld
        return None

    def edit_placeholder_load(self) -> None:
        """Select the load that still has its starting values, for the inspector."""
        found = self._placeholder()
        if found is not None:
            self.doc.select(Selection("load", (found[0], found[1].name)))
            self.inspector_dock.show()
            self.inspector_dock.raise_()

    def _fill_level_combo(self) -> None:
        p = self.doc.project
        self.level_combo.blockSignals(True)
        self.level_combo.clear()
        for lv in p.levels:
            self.level_combo.addItem(lv.name, lv.id)
        self.level_combo.setCurrentIndex(self.level_combo.findData(self.doc.level_id))
        self.level_combo.blockSignals(False)
        self._level_pair.setVisible(len(p.levels) > 1)

    def _fill_case_combo(self) -> None:
        current = self.doc.case
        self.case_combo.blockSignals(True)
        self.case_combo.clear()
        self.case_combo.addItem("All lifts — worst per bay", None)
        for z in self.doc.project.lift_zones:
            for ld in z.loads:
                label = f"{z.id} {z.name} · {ld.name}".replace("  ", " ")
                self.case_combo.addItem(label, (z.id, ld.name))
        # QComboBox.findData compares Python tuples by identity: match by value
        keep = next((i for i in range(self.case_combo.count())
                     if self.case_combo.itemData(i) == current), 0)
        self.case_combo.setCurrentIndex(keep)
        self.case_combo.blockSignals(False)
        if self.case_combo.currentData() != current:
            self._on_case_chosen(self.case_combo.currentIndex())

    def _on_case_chosen(self, _index: int) -> None:
        data = self.case_combo.currentData()
        self.doc.set_case(None if data is None else (data[0], data[1]))

    def _on_case_changed(self, case: tuple[str, str] | None) -> None:
        """The one lift / load filter changed: the combo and the heading follow
        (the plan and the table follow the document themselves)."""
        i = next((k for k in range(self.case_combo.count())
                  if self.case_combo.itemData(k) == case), 0)
        if i != self.case_combo.currentIndex():
            self.case_combo.blockSignals(True)
            self.case_combo.setCurrentIndex(i)
            self.case_combo.blockSignals(False)
        self._update_heading()

    def set_overlay(self, mode: str) -> None:
        self.plan.set_overlay(mode)
        self.overlay_combo.setCurrentIndex(self.overlay_combo.findData(mode))
        for m in style.OVERLAYS:
            self.actions[f"overlay_{m}"].setChecked(m == mode)
        self._update_heading()

    def plan_heading_text(self) -> str:
        """One line over the plan saying what it shows, in plain words: the level,
        what the colours stand for, which lift and load, and where the key and the
        caution are (for a first-time reader). Plain text."""
        p = self.doc.project
        lv = self.doc.level
        if lv is None:
            return "No level yet: build the floor framing first."
        # every tag the plan can show is named (the P of "may go through" and the
        # scabbing mark were not, while the plan showed "P 9.75": seen under Xvfb)
        tags = ", ".join(f"{o.tag} {o.label.lower().replace(',', '')}"
                         for o in (outcomes.OUTCOMES[k] for k in outcomes.ORDER))
        mark = f"{outcomes.SCABBING.tag}: {outcomes.SCABBING.label.lower()}"
        shown = {"outcome": f"bays coloured by outcome ({tags}; {mark})",
                 "utilisation": "drop points coloured by utilisation U = demand / "
                                "resistance (above 1.00 a check is exceeded)",
                 "drop_height": "drop points coloured by the allowable drop height"
                 }.get(self.plan.overlay, self.plan.overlay)
        data = self.case_combo.currentData()
        if data is None:
            n = sum(len(z.loads) for z in p.lift_zones if z.level_id == lv.id)
            which = (f"worst of all {n} load(s) of every lift zone on this level"
                     if n else "no lift zone with a load on this level yet")
        else:
            zid, load_name = data
            which = f"lift {zid}, load {load_name}"
            try:
                z = p.zone(zid)
                ld = next(x for x in z.loads if x.name == load_name)
                which = (f"lift {z.id} ({z.name}), load {ld.name}: "
                         f"{units.fmt(ld.mass, 'mass', p.settings.unit_system)}")
                case = next((c for c in (self.doc.results.cases if self.doc.results else ())
                             if (c.zone_id, c.load_name) == data), None)
                if case is not None:
                    which += (", planned drop "
                              + units.fmt(case.planned_drop_height, "length",
                                          p.settings.unit_system))
            except (KeyError, StopIteration):
                pass
        state = "" if self.doc.results_current else " Results are being updated."
        if self.doc.results_current and not self.doc.results_confirmed:
            state = " Limits are being confirmed."
        name = lv.name if lv.name.lower().startswith("level") else f"Level {lv.name}"
        if self.short_heading:  # a small window: the heading in a line or two, not five
            # each tag with one or two words (the full words are in the key): the
            # long form took four of a 360 px window's lines (seen under Xvfb)
            few = {"elastic": "elastic", "plastic": "yields", "exceeds": "exceeds",
                   "perforates": "may go through"}
            brief = ", ".join(f"{outcomes.OUTCOMES[k].tag} {few.get(k, k)}"
                              for k in outcomes.ORDER)
            short = {"outcome": f"{brief}, {outcomes.SCABBING.tag} scabs",
                     "utilisation": "utilisation U = demand / resistance",
                     "drop_height": "allowable drop height"}.get(self.plan.overlay, shown)
            if data is None:
                which = "all lifts, worst per bay" if "no lift" not in which else which
            # no state here: its second line moved the plan down on every edit (seen
            # under Xvfb at 1280 × 720); the status bar and the table say it
            return f"{lv.name} · {short} · {which}."
        return (f"{name}: {shown}; {which}. Key in a corner of the plan; "
                f"the caution is under the plan.{state}")

    @property
    def short_heading(self) -> bool:
        """The plan's heading in its short form: in the compact layout, and on a
        window below :data:`SHORT_HEADING_BELOW` px tall (at 1280 × 720 the long
        form took three lines, and the results table kept four rows; the key in the
        plan's corner gives every tag in full)."""
        return self.compact or self.height() < SHORT_HEADING_BELOW

    def _update_heading(self) -> None:
        if hasattr(self, "plan_heading"):
            self.plan_heading.setText(html.escape(self.plan_heading_text()))
