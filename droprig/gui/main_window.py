"""The droprig main window: plan in the middle, project tree on the left,
inspector on the right, results by bay and the calculation trace below.

The window owns the document (project + undo stack + selection + results), the
analysis runner and the autosaver; every panel takes the document and listens
to it. Menus hold the file, edit, framing and lift actions with the standard
shortcuts.
"""

from __future__ import annotations

import datetime as _dt
import html
import math
from dataclasses import replace
from pathlib import Path
from typing import TYPE_CHECKING

from PySide6.QtCore import QByteArray, QPoint, QSettings, Qt, QTimer
from PySide6.QtGui import QAction, QCloseEvent, QKeySequence, QShowEvent
from PySide6.QtWidgets import (
    QComboBox,
    QDockWidget,
    QFileDialog,
    QHBoxLayout,
    QLabel,
    QMainWindow,
    QMenu,
    QMessageBox,
    QProgressBar,
    QToolButton,
    QVBoxLayout,
    QWidget,
)

from droprig import __version__, units
from droprig.gui import edits as ed
from droprig.gui import style
from droprig.gui.analysis_runner import AnalyseFn, AnalysisRunner
from droprig.gui.document import (
    Autosaver,
    Document,
    Selection,
    discard_recoverable,
    find_recoverable,
)
from droprig.gui.inspector import (
    FormDialog,
    Inspector,
    describe_refusal,
    opening_form,
    protection_form,
)
from droprig.texts import CAUTION

if TYPE_CHECKING:
    from droprig.gui.generator_dialog import GeneratorDialog
from droprig.gui.project_tree import ProjectTree
from droprig.gui.results_table import ResultsTable
from droprig.gui.settings_dialog import SettingsDialog
from droprig.model import (
    LiftLoad,
    LiftZone,
    ModelError,
    Project,
    ProtectionArea,
    Rect,
    bays,
    resting_on,
)
from droprig.solver import Results

FILE_FILTER = "droprig projects (*.droprig);;All files (*)"
MAX_RECENT = 8
BASIS_LABELS = {"en1993": "EN 1993-1-1", "aisc360": "AISC 360-16"}
UNIT_LABELS = {"SI": "SI (m · kN · kg · MPa)", "US": "US (ft · kip · lb · ksi)"}


def placeholder_load(name: str) -> LiftLoad:
    """The load a new zone or "Add load" starts with: 1 t falling 1 m, rigid,
    1 m × 1 m footprint. Round numbers to be replaced, never a recommendation."""
    return LiftLoad(name=name, mass=1000.0, drop_height=1.0)


def is_placeholder(load: LiftLoad) -> bool:
    """True while ``load`` still has every value of :func:`placeholder_load`."""
    return load == placeholder_load(load.name)


MAX_LISTED = 12
"""Members named one by one in the delete question; the rest are counted."""


def _check_framing(before: Project, after: Project, level_id: str) -> None:
    """Raise the solver's ModelError if level ``level_id`` could be analysed in
    ``before`` but not in ``after`` (a framing the load path cannot follow)."""
    from droprig.solver import check_framing

    try:
        check_framing(before.level(level_id))
    except ModelError:
        return  # not analysable before this edit either: not this edit's doing
    check_framing(after.level(level_id))


def screen_scale_tag(screen: object) -> str:
    """``"scale150"`` for a screen at 150 % (device pixel ratio 1.5); ``"scale100"``
    when there is no screen."""
    dpr = float(screen.devicePixelRatio()) if screen is not None else 1.0  # type: ignore[attr-defined]
    return f"scale{round(dpr * 100)}"


def redo_keys() -> list[QKeySequence]:
    """The platform's redo keys plus the other common one: Ctrl+Y and
    Ctrl+Shift+Z both redo on Linux and Windows (macOS: Cmd+Shift+Z)."""
    keys = QKeySequence.keyBindings(QKeySequence.StandardKey.Redo)
    for extra in ("Ctrl+Y", "Ctrl+Shift+Z"):
        k = QKeySequence(extra)
        if k not in keys:
            keys.append(k)
    return keys


def quit_keys() -> list[QKeySequence]:
    """The platform's quit keys, with Ctrl+Q where the platform has none (Windows)."""
    keys = QKeySequence.keyBindings(QKeySequence.StandardKey.Quit)
    return keys or [QKeySequence("Ctrl+Q")]


def _describe(exc: BaseException) -> str:
    from droprig.texts import describe_error

    return describe_error(exc)


class MainWindow(QMainWindow):
    """The application window.

    ``settings``: where geometry, state and recent files are kept (tests pass
    an isolated one). ``settings_dir``: folder of the autosave / recovery files.
    ``analyse``: the analysis function (default ``droprig.solver.analysis.analyse``).
    ``threaded=False`` analyses on the UI thread (screenshots, benchmarks).
    """

    def __init__(self, document: Document | None = None, *,
                 settings: QSettings | None = None, settings_dir: Path | None = None,
                 analyse: AnalyseFn | None = None, threaded: bool = True,
                 autosave: bool = True, debounce_ms: int = 150) -> None:
        super().__init__()
        from droprig.gui.app import make_settings
        from droprig.gui.app import settings_dir as default_dir

        self.doc = document or Document(Project())
        self.doc.setParent(self)
        self.qsettings = settings or make_settings()
        self.settings_dir = settings_dir or default_dir()
        self.runner = AnalysisRunner(self.doc, analyse=analyse, threaded=threaded,
                                     debounce_ms=debounce_ms, parent=self)
        self.autosaver = Autosaver(self.doc, self.settings_dir, parent=self) \
            if autosave else None
        self.autosave_nudge = None
        if self.autosaver is not None:  # soon after the first edit, then each minute
            from droprig.gui.file_guard import AutosaveNudge

            saver = self.autosaver
            self.autosave_nudge = AutosaveNudge(
                self.doc.project_changed, saver.write, lambda: saver.last_error,
                lambda msg: self.statusBar().showMessage(msg, 15_000), parent=self)
        self._settings_dialog: SettingsDialog | None = None
        self._annex_job: object = None
        self.help_window: QWidget | None = None
        self.limits_dialog: QWidget | None = None
        self._closing = False
        self.plan_menu: QMenu | None = None
        """The right-click menu of the plan (made on first use)."""

        self.setObjectName("droprigMainWindow")
        self.setDockNestingEnabled(True)
        self._make_actions()
        self._make_central()
        self._make_docks()
        self._make_menus()
        self._make_status_bar()
        self._connect()
        self._restore_geometry()
        self._on_project_changed(self.doc.project)
        self._on_path_changed(self.doc.path)
        self._on_results_changed(self.doc.results)
        self.runner.request()

    # ================================================================ building

    def _act(self, name: str, text: str, slot: object, shortcut: object = None,
             tip: str = "") -> QAction:
        a = QAction(text, self)
        a.setObjectName(f"action_{name}")
        if isinstance(shortcut, QKeySequence.StandardKey):
            a.setShortcuts(shortcut)  # every platform binding (Close: Ctrl+F4 and Ctrl+W)
        elif shortcut is not None:
            a.setShortcut(shortcut)  # type: ignore[arg-type]
        if tip:
            a.setToolTip(tip)
            a.setStatusTip(tip)
        a.triggered.connect(slot)  # type: ignore[arg-type]
        self.actions[name] = a
        return a

    def _make_actions(self) -> None:
        self.actions: dict[str, QAction] = {}
        K = QKeySequence.StandardKey
        self._act("new", "&New", self._on_new, K.New, "Start a new, empty project")
        self._act("open", "&Open…", self._on_open, K.Open, "Open a .droprig project")
        self._act("save", "&Save", self.save, K.Save, "Save the project")
        self._act("save_as", "Save &As…", self.save_as, K.SaveAs,
                  "Save the project under a new name")
        self._act("export_annex", "&Export permit annex…", self.export_annex, "Ctrl+E",
                  "Write the lift-permit annex PDF (the same as 'droprig report')")
        self._act("close", "&Close", self.close_project, K.Close,
                  "Close this project (asks first if it has unsaved changes)")
        self._act("quit", "&Quit", self.close, K.Quit)
        self.actions["quit"].setShortcuts(quit_keys())
        undo = self.doc.undo_stack.createUndoAction(self, "&Undo")
        undo.setShortcuts(K.Undo)
        redo = self.doc.undo_stack.createRedoAction(self, "&Redo")
        redo.setShortcuts(redo_keys())
        self.actions["undo"], self.actions["redo"] = undo, redo
        self._act("delete", "&Delete", self.delete_selection, K.Delete,
                  "Delete the selected girder or beam, lift zone, load, protection area, "
                  "opening or level")
        self._act("settings", "Analysis &settings…", self.show_settings, "Ctrl+,",
                  "Units, design basis, factors and limits")
        self._act("info", "Project &title block…", lambda: self.doc.select(Selection("info")))
        self._act("generate", "&Generate framing…", self.generate_framing, "Ctrl+G",
                  "Build a level's grid, girders, beams and deck from a few numbers")
        self._act("apply_like", "Use this section for all like members", self.apply_like,
                  tip="Give every member of the same role on this level the selected "
                      "member's section, grade and end conditions")
        self._act("add_opening", "Add deck &opening…", self.add_opening,
                  tip="A hole in the deck: a load over it falls to the level below")
        self._act("add_zone", "Add lift &zone", self.add_zone, "Ctrl+L",
                  "A crane position and the region its load swings over")
        self._act("add_load", "Add &load to zone", self.add_load, "Ctrl+Shift+L",
                  "A load or rigging item that could drop inside the zone")
        self._act("edit_load", "Enter the load", self.edit_placeholder_load,
                  tip="Show the load that still has its starting values in the inspector")
        self._act("add_protection", "Add &protection area…", self.add_protection,
                  tip="A crane mat or crushable layer over a rectangle")
        draw = self._act("draw_protection", "&Draw protection area", self._on_draw_toggled,
                         "Ctrl+D", "Drag a rectangle on the plan to lay a mat there")
        draw.setCheckable(True)
        corr = self._act("draw_corridor", "Draw lift &corridor", self._on_corridor_toggled,
                         "Ctrl+Shift+D",
                         "Click the corners of the selected zone's corridor on the plan; "
                         "double-click or Enter to finish")
        corr.setCheckable(True)
        self._act("clear_corridor", "Clear lift co&rridor", self.clear_corridor,
                  tip="Remove the selected zone's corridor (the whole swing sector counts)")
        self._act("fit", "Zoom to &fit", lambda: self.plan.fit(), "Ctrl+0",
                  "Show the whole level")
        for mode, label in style.OVERLAYS.items():
            a = self._act(f"overlay_{mode}", f"Colour by {label.lower()}",
                          lambda _c=False, m=mode: self.set_overlay(m))
            a.setCheckable(True)
        self._act("about", "&About droprig", self._on_about)
        self._act("caution", "&Limits of use", self._on_caution)
        self._act("help", "droprig &user guide", self.show_help, K.HelpContents,
                  "The user guide, at the section of the panel you are in")
        # F1 also in the settings and generator dialogs
        self.actions["help"].setShortcutContext(Qt.ShortcutContext.ApplicationShortcut)

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
        self.case_combo.setMinimumContentsLength(22)
        draw_btn = QToolButton()
        draw_btn.setDefaultAction(self.actions["draw_protection"])
        fit_btn = QToolButton()
        fit_btn.setDefaultAction(self.actions["fit"])

        bar = QWidget()
        bar.setObjectName("viewBar")
        h = QHBoxLayout(bar)
        h.setContentsMargins(6, 4, 6, 4)
        self._level_label = QLabel("Level:")
        h.addWidget(self._level_label)
        h.addWidget(self.level_combo)
        h.addSpacing(10)
        h.addWidget(QLabel("Colour by:"))
        h.addWidget(self.overlay_combo)
        h.addSpacing(10)
        h.addWidget(QLabel("Lift:"))
        h.addWidget(self.case_combo)
        h.addStretch(1)
        h.addWidget(draw_btn)
        h.addWidget(fit_btn)

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

        central = QWidget()
        v = QVBoxLayout(central)
        v.setContentsMargins(0, 0, 0, 0)
        v.setSpacing(0)
        v.addWidget(bar)
        v.addWidget(self.plan_heading)
        v.addWidget(self.guide)
        v.addWidget(self.plan, 1)
        self.setCentralWidget(central)

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
        self._set_dock_minimums()
        self._default_layout_pending = True

    def _apply_default_dock_sizes(self) -> None:
        """First start at this screen scale (no saved layout): side panels wide
        enough for their titles and a form, the results a third of the height on
        a tall window and 27 % on a short one (1280 × 720, or a large screen
        at 150–200 %), the rest to the plan."""
        w = max(self.width(), 800)
        h = max(self.height(), 480)
        tree_w = max(int(w * 0.15), self.tree_dock.minimumWidth())
        insp_w = max(int(w * 0.23), self.inspector_dock.minimumWidth())
        self.resizeDocks([self.tree_dock, self.inspector_dock], [tree_w, insp_w],
                         Qt.Orientation.Horizontal)
        self.resizeDocks([self.results_dock], [int(h * (0.32 if h >= 900 else 0.27))],
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
        self.inspector_dock.setMinimumWidth(max(self.inspector_dock.minimumWidth(), 30 * em))

    def showEvent(self, event: QShowEvent) -> None:
        super().showEvent(event)
        if self._default_layout_pending:
            self._default_layout_pending = False
            self._apply_default_dock_sizes()

    def _make_menus(self) -> None:
        a = self.actions
        mb = self.menuBar()
        m = mb.addMenu("&File")
        m.addActions([a["new"], a["open"]])
        self.recent_menu = m.addMenu("Open &recent")
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)
        m.addSeparator()
        m.addActions([a["save"], a["save_as"]])
        m.addSeparator()
        m.addAction(a["info"])
        m.addAction(a["export_annex"])
        m.addSeparator()
        m.addActions([a["close"], a["quit"]])
        m = mb.addMenu("&Edit")
        m.addActions([a["undo"], a["redo"]])
        m.addSeparator()
        m.addAction(a["delete"])
        m.addSeparator()
        m.addAction(a["settings"])
        m = mb.addMenu("F&raming")
        m.addActions([a["generate"], a["add_opening"], a["apply_like"]])
        m = mb.addMenu("&Lift")
        m.addActions([a["add_zone"], a["add_load"]])
        m.addSeparator()
        m.addActions([a["draw_corridor"], a["clear_corridor"]])
        m.addSeparator()
        m.addActions([a["add_protection"], a["draw_protection"]])
        m = mb.addMenu("&View")
        m.addAction(a["fit"])
        m.addSeparator()
        for mode in style.OVERLAYS:
            m.addAction(a[f"overlay_{mode}"])
        m.addSeparator()
        for d in (self.tree_dock, self.inspector_dock, self.results_dock, self.trace_dock):
            m.addAction(d.toggleViewAction())
        m = mb.addMenu("&Help")
        m.addActions([a["help"], a["caution"], a["about"]])

    def _make_status_bar(self) -> None:
        sb = self.statusBar()
        sb.setObjectName("statusBar")
        self.units_label = QLabel()
        self.units_label.setObjectName("unitsLabel")
        self.basis_label = QLabel()
        self.basis_label.setObjectName("basisLabel")
        self.state_label = QLabel()
        self.state_label.setObjectName("analysisState")
        self.busy = QProgressBar()
        self.busy.setObjectName("busyIndicator")
        self.busy.setRange(0, 0)
        self.busy.setFixedWidth(70)
        self.busy.setFixedHeight(12)
        self.busy.setTextVisible(False)
        self.busy.hide()
        self.caution_label = QLabel(f"⚠ {style.CAUTION_SHORT}")
        self.caution_label.setObjectName("cautionLabel")
        self.caution_label.setToolTip(CAUTION)
        self.caution_label.setStyleSheet(
            "QLabel#cautionLabel { background: #FFF1CC; color: #3D2800; "
            "border: 1px solid #C9A23A; border-radius: 3px; padding: 1px 6px; "
            "font-weight: 600; }")
        for w in (self.units_label, self.basis_label, self.busy, self.state_label):
            sb.addPermanentWidget(w)
        sb.addPermanentWidget(self.caution_label, 1)

    def _connect(self) -> None:
        d = self.doc
        d.project_changed.connect(self._on_project_changed)
        d.results_changed.connect(self._on_results_changed)
        d.selection_changed.connect(self._on_selection_changed)
        d.level_changed.connect(self._on_level_changed)
        d.path_changed.connect(self._on_path_changed)
        d.dirty_changed.connect(self._on_dirty_changed)
        self.runner.busy_changed.connect(self._on_busy_changed)
        self.runner.finished.connect(self._on_analysis_finished)
        self.plan.zone_changed.connect(self._on_zone_changed)
        self.plan.protection_drawn.connect(self._on_protection_drawn)
        self.plan.corridor_drawn.connect(self._on_corridor_drawn)
        self.plan.corridor_changed.connect(self._on_corridor_dragged)
        self.plan.context_requested.connect(self._on_plan_context)
        self.plan.mode_changed.connect(self._on_plan_mode_changed)
        self.plan.point_clicked.connect(self._on_point_clicked)
        self.plan.hover_text.connect(self._on_hover_text)
        self.results_table.trace_requested.connect(self.show_trace)
        self.inspector.refused.connect(lambda msg: self.statusBar().showMessage(msg, 10_000))
        self.level_combo.activated.connect(
            lambda _i: self.doc.set_level(self.level_combo.currentData()))
        self.overlay_combo.activated.connect(
            lambda _i: self.set_overlay(self.overlay_combo.currentData()))
        self.case_combo.activated.connect(self._on_case_chosen)
        d.case_changed.connect(self._on_case_changed)

    # ================================================================ document events

    def _on_project_changed(self, project: Project) -> None:
        self._fill_level_combo()
        self._fill_case_combo()
        self._update_guide()
        self._update_heading()
        s = project.settings
        self.units_label.setText(f"Units: {UNIT_LABELS.get(s.unit_system, s.unit_system)}")
        tp = self.trace_panel
        if tp.trace is not None and tp.unit_system != s.unit_system:
            tp.show_trace(tp.trace, s.unit_system)  # the same point in the new units
        self.basis_label.setText(f"Basis: {BASIS_LABELS.get(s.design_basis, s.design_basis)}")
        self._update_actions()

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

    def _refresh_trace(self) -> None:
        """The trace on show follows the project: re-worked for the same point once
        new results are in, cleared when its lift or load is gone."""
        t = self.trace_panel.trace
        if t is None or not self.doc.results_current:
            return
        p = self.doc.project
        if not any(z.id == t.zone_id and any(ld.name == t.load_name for ld in z.loads)
                   for z in p.lift_zones):
            self.trace_panel.show_trace(None)
            return
        try:
            from droprig.solver import trace_point

            new = trace_point(p, t.zone_id, t.load_name, t.x, t.y)
        except Exception:  # the point may have left the zone: nothing stale stays
            self.trace_panel.show_trace(None)
            return
        self.trace_panel.show_trace(new, p.settings.unit_system)

    def _on_results_changed(self, results: Results | None) -> None:
        self._refresh_trace()
        self._fill_case_combo()
        self._update_state_label()
        self._update_heading()

    def _on_selection_changed(self, sel: Selection | None) -> None:
        self._update_actions()  # the plan follows the selection itself

    def _on_level_changed(self, level_id: str) -> None:
        self._update_guide()
        i = self.level_combo.findData(level_id)
        if i >= 0:
            self.level_combo.setCurrentIndex(i)
        self._update_heading()

    def _on_path_changed(self, path: Path | None) -> None:
        self.setWindowTitle(f"{self.doc.title}[*] — droprig")
        if path is not None:
            self._add_recent(path)

    def _on_dirty_changed(self, dirty: bool) -> None:
        self.setWindowModified(dirty)

    def _on_busy_changed(self, busy: bool) -> None:
        self.busy.setVisible(busy)
        self._update_state_label()

    def _on_analysis_finished(self, seconds: float) -> None:
        self._update_state_label()

    def _update_state_label(self) -> None:
        if self.runner.busy:
            self.state_label.setText("Analysing…")
            self.state_label.setStyleSheet("color: #173F66;")
            return
        if self.doc.analysis_error:
            self.state_label.setText("Analysis failed — see the results panel")
            self.state_label.setToolTip(self.doc.analysis_error)
            self.state_label.setStyleSheet("color: #6B0F24; font-weight: 600;")
            return
        res = self.doc.results
        self.state_label.setStyleSheet("")
        self.state_label.setToolTip("")
        if res is None:
            self.state_label.setText("Not analysed")
        elif not res.cases:
            self.state_label.setText("Nothing to analyse")
        else:
            secs = self.runner.last_seconds
            t = f" in {secs:.2f} s" if math.isfinite(secs) else ""
            text = f"Up to date · {res.n_points:,} drop points{t}"
            if res.warnings:
                # what the analysis could not assess or found already over capacity:
                # said on screen, listed on hover (also in the annex and the CLI)
                n = len(res.warnings)
                text += f" · ⚠ {n} warning{'s' if n > 1 else ''}"
                self.state_label.setStyleSheet("color: #6B4A00; font-weight: 600;")
                self.state_label.setToolTip("\n".join(f"• {w}" for w in res.warnings))
            self.state_label.setText(text)

    def _fill_level_combo(self) -> None:
        p = self.doc.project
        self.level_combo.blockSignals(True)
        self.level_combo.clear()
        for lv in p.levels:
            self.level_combo.addItem(lv.name, lv.id)
        self.level_combo.setCurrentIndex(self.level_combo.findData(self.doc.level_id))
        self.level_combo.blockSignals(False)
        multi = len(p.levels) > 1
        self.level_combo.setVisible(multi)
        self._level_label.setVisible(multi)

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
        shown = {"outcome": "bays coloured by outcome (E stays elastic, Y yields within "
                            "limits, X exceeds limits)",
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
        name = lv.name if lv.name.lower().startswith("level") else f"Level {lv.name}"
        return (f"{name}: {shown}; {which}. Key in a corner of the plan; "
                f"the caution is under the plan.{state}")

    def _update_heading(self) -> None:
        if hasattr(self, "plan_heading"):
            self.plan_heading.setText(html.escape(self.plan_heading_text()))

    def _update_actions(self) -> None:
        sel = self.doc.selection
        kind = sel.kind if sel else ""
        self.actions["delete"].setEnabled(kind in ("member", "zone", "load", "protection",
                                                   "opening", "level"))
        self.actions["apply_like"].setEnabled(kind == "member")
        has_level = bool(self.doc.project.levels)
        for n in ("add_zone", "add_opening", "add_protection", "draw_protection"):
            self.actions[n].setEnabled(has_level)
        self.actions["add_load"].setEnabled(bool(self.doc.project.lift_zones))
        zone = self._selected_zone()
        self.actions["draw_corridor"].setEnabled(zone is not None)
        self.actions["clear_corridor"].setEnabled(zone is not None and bool(zone.corridor))
        self.actions["overlay_" + self.plan.overlay].setChecked(True)

    # ================================================================ plan events

    def _on_zone_changed(self, zone_id: str, new_zone: LiftZone) -> None:
        try:
            after = ed.with_zone(self.doc.project, zone_id, new_zone)
        except ModelError as exc:
            self.statusBar().showMessage(f"Zone change refused: {exc}", 10_000)
            self.plan.set_project(self.doc.project, self.doc.level_id)
            return
        self.doc.edit(after, f"Reshape lift zone {zone_id}")

    def plan_context_actions(self) -> list[QAction]:
        """What a right click on the plan offers for the current selection."""
        sel = self.doc.selection
        names = ["delete", "apply_like"] if sel is not None and sel.kind == "member" else []
        return [self.actions[n] for n in names]

    def _on_plan_context(self, global_pos: QPoint, member_id: str) -> None:
        acts = self.plan_context_actions() if member_id else []
        if not acts:
            return
        if self.plan_menu is None:
            self.plan_menu = QMenu(self)
        self.plan_menu.clear()
        self.plan_menu.addActions(acts)
        self.plan_menu.popup(global_pos)

    def _on_point_clicked(self, zone_id: str, load_name: str, x: float, y: float) -> None:
        self.show_trace(zone_id, load_name, x, y)

    def _on_hover_text(self, text: str) -> None:
        if text:
            self.statusBar().showMessage(text)
        else:
            self.statusBar().clearMessage()

    def _on_protection_drawn(self, rect: Rect) -> None:
        self.actions["draw_protection"].setChecked(False)
        self.plan.set_mode("select")
        self.add_protection(rect)

    def _on_draw_toggled(self, on: bool) -> None:
        self.plan.set_mode("draw_protection" if on else "select")
        if on:
            self.plan.setFocus()  # so Esc reaches the plan at once
            self.statusBar().showMessage("Drag a rectangle on the plan where the mat goes "
                                         "(Esc, or Draw protection area again, to stop)", 8000)

    def _on_plan_mode_changed(self, mode: str) -> None:
        for name in ("draw_protection", "draw_corridor"):
            act = self.actions[name]
            if act.isChecked() != (mode == name):
                act.blockSignals(True)
                act.setChecked(mode == name)
                act.blockSignals(False)

    def _selected_zone(self) -> LiftZone | None:
        sel = self.doc.selection
        if sel is None or sel.kind not in ("zone", "load"):
            return None
        try:
            return self.doc.project.zone(sel.ids[0])
        except KeyError:
            return None

    def _on_corridor_toggled(self, on: bool) -> None:
        if not on:
            self.plan.set_mode("select")
            return
        zone = self._selected_zone()
        if zone is not None and zone.level_id != self.doc.level_id:
            self.doc.set_level(zone.level_id)
        try:
            self.plan.set_mode("draw_corridor")
        except ValueError as exc:
            self._on_plan_mode_changed(self.plan.mode)
            self.statusBar().showMessage(f"Draw lift corridor: {exc}", 8000)
            return
        self.plan.setFocus()  # so Enter, Backspace and Esc reach the plan at once
        self.statusBar().showMessage(
            f"Click the corners of zone {zone.id if zone else ''}'s corridor on the plan; "
            "double-click or Enter to finish, Backspace removes the last corner, "
            "Esc cancels", 10_000)

    def _on_corridor_drawn(self, zone_id: str, points: tuple) -> None:
        self._edit(lambda p: ed.with_corridor(p, zone_id, points),
                   f"Draw corridor of lift zone {zone_id}")

    def _on_corridor_dragged(self, zone_id: str, points: tuple) -> bool:
        """A corridor corner dragged on the plan: one undo step, validated as the
        typed corridor is; a refusal leaves the corridor as it was and says why in the
        status bar and beside the corner."""
        p = self.doc.project
        try:
            after = ed.with_corridor(p, zone_id, points)
        except (ModelError, KeyError) as exc:
            msg = describe_refusal(exc, "Corridor corner", p.settings.unit_system, "length") \
                if isinstance(exc, ModelError) else f"Corridor corner: {exc}"
            self.statusBar().showMessage(msg, 15_000)
            try:
                old = p.zone(zone_id).corridor
                moved = next((q for q, o in zip(points, old, strict=False) if q != o),
                             points[0])
                problem = exc.value if isinstance(exc, ModelError) else str(exc)
                self.plan.show_note(f"refused: {problem}", *moved)
            except (KeyError, IndexError):
                pass
            return False
        return self.doc.edit(after, f"Move corridor corner of lift zone {zone_id}")

    def clear_corridor(self) -> bool:
        """Remove the selected zone's corridor (one undo step)."""
        zone = self._selected_zone()
        if zone is None or not zone.corridor:
            self.statusBar().showMessage("Select a lift zone with a corridor first", 5000)
            return False
        return self._edit(lambda p: ed.with_corridor(p, zone.id, ()),
                          f"Clear corridor of lift zone {zone.id}")

    # ================================================================ trace

    def show_trace(self, zone_id: str, load_name: str, x: float, y: float) -> bool:
        """Compute and show the calculation trace of one drop point."""
        try:
            from droprig.solver import trace_point

            trace = trace_point(self.doc.project, zone_id, load_name, x, y)
        except Exception as exc:  # a message in the status bar, never a crash
            self.statusBar().showMessage(f"Calculation trace: {_describe(exc)}", 10_000)
            return False
        self.trace_panel.show_trace(trace, self.doc.project.settings.unit_system)
        self.trace_dock.show()
        self.trace_dock.raise_()
        return True

    # ================================================================ editing actions

    def _current_level_id(self) -> str | None:
        return self.doc.level_id or None

    def _selected_bay_rect(self) -> Rect | None:
        sel = self.doc.selection
        lv = self.doc.level
        if lv is None:
            return None
        if sel is not None and sel.kind == "bay" and sel.ids[0] == lv.id:
            for b in bays(lv):
                if b.id == sel.ids[1]:
                    return b.rect
        return None

    def _zone_bay_rect(self) -> Rect | None:
        """The bay under the crane of the selected lift zone (or of the first
        zone on the level shown): where a new mat is most likely needed."""
        lv = self.doc.level
        if lv is None:
            return None
        sel = self.doc.selection
        zones = [z for z in self.doc.project.lift_zones if z.level_id == lv.id]
        if sel is not None and sel.kind in ("zone", "load"):
            zones = [z for z in zones if z.id == sel.ids[0]] or zones
        for z in zones:
            x, y = z.crane
            for b in bays(lv):
                r = b.rect
                if r.x0 <= x <= r.x1 and r.y0 <= y <= r.y1:
                    return r
        return None

    def generate_framing(self) -> None:
        """Generate floor framing. With a level on the plan, first ask whether to
        replace its framing (the dialog then opens filled from that level) or to
        add a new level; the dialog works in the project's unit system."""
        p = self.doc.project
        ids = [lv.id for lv in p.levels]
        current = self.doc.level_id
        choice = "add"
        if current:
            choice = self.ask_replace_or_add(p.level(current).name) or ""
            if choice not in ("replace", "add"):
                return
        dlg = self.generator_dialog(replace_level=current if choice == "replace" else None)
        if not dlg.exec():
            return
        level = dlg.level()
        if level is None:
            return
        if choice == "replace" and current:
            self.replace_level_framing(current, level)
            return
        if level.id in ids:
            level = replace(level, id=ed.unique_id("L", ids))
        self._edit(lambda p: ed.add_level(p, level), f"Add level {level.name}")
        self.doc.set_level(level.id)

    def generator_dialog(self, replace_level: str | None = None) -> GeneratorDialog:
        """The framing generator in the project's unit system: filled from level
        ``replace_level`` (to regenerate it), or for a new level with a free id."""
        from droprig.gui.generator_dialog import GeneratorDialog

        p = self.doc.project
        ids = [lv.id for lv in p.levels]
        if replace_level is not None:
            cur = p.level(replace_level)
            dlg = GeneratorDialog(self, unit_system=p.settings.unit_system, level_id=cur.id,
                                  level_name=cur.name,
                                  existing_level_ids=tuple(i for i in ids if i != cur.id))
            dlg.prefill(cur)
            return dlg
        return GeneratorDialog(self, unit_system=p.settings.unit_system,
                               level_id=ed.unique_id("L", ids),
                               level_name=f"Level {len(ids) + 1}",
                               existing_level_ids=tuple(ids))

    def ask_replace_or_add(self, level_name: str) -> str | None:
        """"replace", "add" or None (cancelled)."""
        box = QMessageBox(QMessageBox.Icon.Question, "Generated framing",
                          f"Replace the framing of level {level_name} (its lift zones and "
                          "protection areas stay), or add the generated framing as a new "
                          "level?", parent=self)
        rep = box.addButton("Replace this level", QMessageBox.ButtonRole.AcceptRole)
        add = box.addButton("Add a new level", QMessageBox.ButtonRole.ActionRole)
        box.addButton(QMessageBox.StandardButton.Cancel)
        box.exec()
        clicked = box.clickedButton()
        return "replace" if clicked is rep else "add" if clicked is add else None

    def replace_level_framing(self, level_id: str, level: object) -> bool:
        """Swap in generated framing for ``level_id`` (zones and mats stay)."""
        new = replace(level, id=level_id)  # type: ignore[type-var]
        return self._edit(lambda p: ed.with_level(p, level_id, new),
                          f"Regenerate framing of level {level_id}")

    def _edit(self, fn: object, text: str) -> bool:
        try:
            after = fn(self.doc.project)  # type: ignore[operator]
        except (ModelError, ValueError, KeyError) as exc:
            QMessageBox.warning(self, "droprig", f"{text}: {_describe(exc)}")
            return False
        return self.doc.edit(after, text)

    def add_zone(self) -> LiftZone | None:
        lv = self.doc.level
        if lv is None:
            return None
        p = self.doc.project
        ext = lv.grid.extent
        zid = ed.unique_id("Z", [z.id for z in p.lift_zones])
        r = max(1.0, round(min(ext.width, ext.height) * 0.35, 1))
        zone = LiftZone(id=zid, name=f"Lift {zid[1:]}", level_id=lv.id,
                        crane=(ext.x0 + ext.width / 2, ext.y0 + ext.height / 2),
                        r_min=0.0, r_max=r,
                        loads=(placeholder_load("Load 1"),))
        if self._edit(lambda p: ed.add_zone(p, zone), f"Add lift zone {zid}"):
            self.doc.select(Selection("zone", (zid,)))
            return zone
        return None

    def add_load(self) -> LiftLoad | None:
        p = self.doc.project
        sel = self.doc.selection
        zid = None
        if sel is not None and sel.kind in ("zone", "load"):
            zid = sel.ids[0]
        elif p.lift_zones:
            here = [z for z in p.lift_zones if z.level_id == self.doc.level_id]
            zid = (here or list(p.lift_zones))[0].id
        if zid is None:
            self.statusBar().showMessage("Add a lift zone first", 5000)
            return None
        name = ed.unique_name("Load 1", [ld.name for ld in p.zone(zid).loads])
        load = placeholder_load(name)
        if self._edit(lambda p: ed.add_load(p, zid, load), f"Add load to zone {zid}"):
            self.doc.select(Selection("load", (zid, name)))
            return load
        return None

    def add_protection(self, rect: Rect | None = None) -> ProtectionArea | None:
        lv = self.doc.level
        if lv is None:
            return None
        p = self.doc.project
        if not isinstance(rect, Rect):
            rect = self._selected_bay_rect() or self._zone_bay_rect() or bays(lv)[0].rect
        pid = ed.unique_id("P", [a.id for a in p.protection_areas])
        area = ProtectionArea(id=pid, name=f"Mat {pid[1:]}", level_id=lv.id, area=rect)
        dlg = FormDialog("New protection area", area,
                         lambda a: protection_form(a, self.doc.project, None),
                         p.settings.unit_system,
                         "A crane mat (elastic) or a crushable layer laid on the deck. "
                         "Edit the rectangle and the mat properties, then OK.", self)
        if not dlg.exec():
            return None
        area = dlg.value()
        if self._edit(lambda p: ed.add_protection(p, area), f"Add protection area {pid}"):
            self.doc.select(Selection("protection", (pid,)))
            return area
        return None

    def add_opening(self) -> Rect | None:
        lv = self.doc.level
        if lv is None:
            return None
        b = self._selected_bay_rect() or bays(lv)[0].rect
        w, h = b.width / 3, b.height / 3
        rect = Rect(b.x0 + w, b.y0 + h, b.x1 - w, b.y1 - h)
        dlg = FormDialog("New deck opening", rect,
                         lambda r: opening_form(r, lv.id, None, None),
                         self.doc.project.settings.unit_system,
                         "A hole in the deck (shaft, hatch, removed panel). A load over it "
                         "falls through: those points are reported as exceeding.", self)
        if not dlg.exec():
            return None
        rect = dlg.value()
        n = len(lv.deck.openings)
        if self._edit(lambda p: ed.add_opening(p, lv.id, rect), "Add deck opening"):
            self.doc.select(Selection("opening", (lv.id, str(n))))
            return rect
        return None

    def apply_like(self) -> bool:
        sel = self.doc.selection
        if sel is None or sel.kind != "member":
            return False
        lv = self.doc.project.level(sel.ids[0])
        m = lv.member(sel.ids[1])
        changed = {o.id: replace(o, section=m.section, grade=m.grade,
                                 end_condition=m.end_condition)
                   for o in lv.members if o.role == m.role and o.id != m.id}
        return self._edit(lambda p: ed.with_members(p, lv.id, changed),
                          f"{m.section.name} {m.grade.name} for every {m.role} on {lv.name}")

    def delete_selection(self) -> bool:
        sel = self.doc.selection
        if sel is None:
            return False
        k, ids = sel.kind, sel.ids
        p = self.doc.project
        if k == "zone":
            return self._edit(lambda p: ed.remove_zone(p, ids[0]), f"Delete lift zone {ids[0]}")
        if k == "load":
            return self._edit(lambda p: ed.remove_load(p, ids[0], ids[1]),
                              f"Delete load {ids[1]}")
        if k == "protection":
            return self._edit(lambda p: ed.remove_protection(p, ids[0]),
                              f"Delete protection area {ids[0]}")
        if k == "opening":
            return self._edit(lambda p: ed.remove_opening(p, ids[0], int(ids[1])),
                              "Delete deck opening")
        if k == "level":
            n = sum(z.level_id == ids[0] for z in p.lift_zones)
            if n and QMessageBox.question(
                    self, "Delete level", f"Delete level {p.level(ids[0]).name} and the {n} "
                    "lift zone(s) and protection areas on it?") != \
                    QMessageBox.StandardButton.Yes:
                return False
            return self._edit(lambda p: ed.remove_level(p, ids[0]), f"Delete level {ids[0]}")
        if k == "member":
            return self.delete_member(ids[0], ids[1])
        return False

    def delete_member(self, level_id: str, member_id: str) -> bool:
        """Delete a girder or beam (one undo step). Members that rest on it (their
        ends on nothing once it is gone) are named, and deleted with it only if the
        user agrees; otherwise nothing changes. A deletion that would leave the level
        unanalysable is refused with the solver's reason."""
        p = self.doc.project
        try:
            lv = p.level(level_id)
            m = lv.member(member_id)
            carried = resting_on(lv, [member_id])
        except (KeyError, ModelError) as exc:
            self.statusBar().showMessage(f"Delete member: {_describe(exc)}", 8000)
            return False
        what = f"{m.role} {m.id}"
        text = f"Delete {what}"
        if carried:
            n = len(carried)
            shown = ", ".join(carried[:MAX_LISTED]) + (
                f" and {n - MAX_LISTED} more" if n > MAX_LISTED else "")
            ans = QMessageBox.question(
                self, "Delete member",
                f"{n} member(s) rest on {what}: {shown}.\n\nWithout {m.id} their ends "
                "would rest on nothing, so droprig cannot keep them. Delete "
                f"{m.id} and these {n} member(s) together? (One step: Edit › Undo "
                "brings them all back.)\n\nCancel leaves the framing as it is.",
                QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.Cancel,
                QMessageBox.StandardButton.Cancel)
            if ans != QMessageBox.StandardButton.Yes:
                self.statusBar().showMessage(f"Nothing deleted: {shown} rest on {m.id}", 8000)
                return False
            text += f" and the {n} member(s) resting on it"
        try:
            after = ed.remove_members(p, level_id, [member_id, *carried])
            _check_framing(p, after, level_id)
        except ModelError as exc:
            QMessageBox.warning(self, "Delete member",
                                f"{text}: refused. {_describe(exc)}\nNothing was changed.")
            return False
        if not self.doc.edit(after, text):
            return False
        self.statusBar().showMessage(f"{text} (Edit › Undo restores)", 8000)
        return True

    def show_settings(self) -> SettingsDialog:
        if self._settings_dialog is None:
            self._settings_dialog = SettingsDialog(self.doc, self)
        self._settings_dialog.show()
        self._settings_dialog.raise_()
        return self._settings_dialog

    # ================================================================ files

    def maybe_save(self) -> bool:
        """Ask what to do with unsaved changes. True: go ahead (saved or
        discarded); False: the user cancelled (or the save failed)."""
        if not self.doc.is_dirty:
            return True
        ans = QMessageBox.warning(
            self, "Unsaved changes",
            f"{self.doc.title} has changes that are not saved.\nSave them first?",
            QMessageBox.StandardButton.Save | QMessageBox.StandardButton.Discard
            | QMessageBox.StandardButton.Cancel, QMessageBox.StandardButton.Save)
        if ans == QMessageBox.StandardButton.Save:
            return self.save()
        return ans == QMessageBox.StandardButton.Discard

    def _on_new(self) -> None:
        if self.maybe_save():
            self.doc.reset(Project())
            self._forget_views()
            if self.autosaver:
                self.autosaver.discard()

    def export_annex(self, options: object = None) -> object:
        """File › Export permit annex…: ask for the options (unless ``options``, an
        :class:`~droprig.gui.annex_export.ExportOptions`, are given), then write
        the PDF on a worker thread behind a progress dialog. Returns the running
        :class:`~droprig.gui.annex_export.AnnexExport` (None if not started)."""
        from droprig.gui.annex_export import AnnexExport, ExportDialog, ExportOptions

        p = self.doc.project
        if not p.lift_zones:
            QMessageBox.information(self, "Export permit annex",
                                    "The project has no lift zone to report on yet: add a "
                                    "lift zone and its load first (Lift menu).")
            return None
        if not isinstance(options, ExportOptions):
            base = self.doc.path or Path.home() / "droprig"
            suggested = base.with_name(base.stem + "_annex.pdf")
            dlg = ExportDialog(p, suggested, self)
            if not dlg.exec():
                return None
            options = dlg.options()
        results = self.doc.results if self.doc.results_current else None
        src = self.doc.path if self.doc.path is not None and not self.doc.is_dirty else None
        job = AnnexExport(p, results, options, src, self)
        job.done.connect(self._on_annex_done)
        self._annex_job = job
        job.start()
        return job

    def _on_annex_done(self, path: Path, pages: int, error: str) -> None:
        if error == "cancelled":
            self.statusBar().showMessage("Annex export cancelled; no file was written", 8000)
        elif error:
            QMessageBox.critical(self, "Cannot export the annex",
                                 f"{error}\n\nNo file was written.")
        else:
            self.statusBar().showMessage(f"Annex written: {path} ({pages} pages)", 15_000)

    def close_project(self) -> bool:
        """File › Close: after the unsaved-changes question, an empty project
        (the window stays open, the guide shows the first step)."""
        if not self.maybe_save():
            return False
        self.doc.reset(Project())
        self._forget_views()
        if self.autosaver:
            self.autosaver.discard()
        self.statusBar().showMessage("Project closed", 4000)
        return True

    def _forget_views(self) -> None:
        """After new / open / close: nothing of the previous project stays on show."""
        self.trace_panel.show_trace(None)

    def _on_open(self) -> None:
        if not self.maybe_save():
            return
        start = str(self.doc.path.parent) if self.doc.path else ""
        path, _ = QFileDialog.getOpenFileName(self, "Open project", start, FILE_FILTER)
        if path:
            self.open_path(path, ask=False)

    def open_path(self, path: str | Path, *, ask: bool = True) -> bool:
        """Open ``path`` (after the unsaved-changes prompt when ``ask``)."""
        if ask and not self.maybe_save():
            return False
        try:
            self.doc.open(path)
        except Exception as exc:  # ProjectFileError, OSError: a message, never a crash
            QMessageBox.critical(self, "Cannot open project", _describe(exc))
            return False
        if self.autosaver:
            self.autosaver.discard()
        self._forget_views()
        if self.doc.lock_warning:  # a second window on the same file (file_guard)
            self.statusBar().showMessage(self.doc.lock_warning, 30_000)
        self.plan.fit()
        return True

    def save(self) -> bool:
        if self.doc.path is None:
            return self.save_as()
        return self._save_to(self.doc.path)

    def save_as(self) -> bool:
        start = str(self.doc.path) if self.doc.path else "untitled.droprig"
        path, _ = QFileDialog.getSaveFileName(self, "Save project as", start, FILE_FILTER)
        if not path:
            return False
        if not path.endswith(".droprig"):
            path += ".droprig"
        return self._save_to(Path(path))

    def _save_to(self, path: Path) -> bool:
        try:
            self.doc.save(path)
        except Exception as exc:  # the old file stays as it was (atomic save)
            QMessageBox.critical(self, "Cannot save project",
                                 f"{_describe(exc)}\nThe file on disk was not changed.")
            return False
        if self.autosaver:
            self.autosaver.discard()
        self.statusBar().showMessage(f"Saved {path}", 5000)
        return True

    # ---------------------------------------------------------------- recent files

    def recent_files(self) -> list[str]:
        v = self.qsettings.value("recent_files", [])
        if isinstance(v, str):
            v = [v]
        return [str(x) for x in (v or [])]

    def _add_recent(self, path: Path) -> None:
        p = str(Path(path).resolve())
        items = [p, *[x for x in self.recent_files() if x != p]][:MAX_RECENT]
        self.qsettings.setValue("recent_files", items)

    def _fill_recent_menu(self) -> None:
        self.recent_menu.clear()
        items = self.recent_files()
        if not items:
            a = self.recent_menu.addAction("(none)")
            a.setEnabled(False)
            return
        for i, p in enumerate(items, 1):
            a = self.recent_menu.addAction(f"&{i} {Path(p).name}")
            a.setToolTip(p)
            a.setEnabled(Path(p).is_file())
            a.triggered.connect(lambda _c=False, p=p: self.open_path(p))
        self.recent_menu.addSeparator()
        clear = self.recent_menu.addAction("Clear list")
        clear.triggered.connect(lambda: self.qsettings.setValue("recent_files", []))

    # ---------------------------------------------------------------- recovery

    def offer_recovery(self) -> bool:
        """If a previous session crashed, offer its autosave. True if recovered."""
        from droprig.io.project_file import load_project

        found = find_recoverable(self.settings_dir)
        if not found:
            return False
        c = found[0]
        when = _dt.datetime.fromtimestamp(c.saved_at).strftime("%Y-%m-%d %H:%M")
        name = c.original_path.name if c.original_path else "an unsaved project"
        ans = QMessageBox.question(
            self, "Recover unsaved work?",
            f"droprig did not close normally last time. An autosave of {name} from "
            f"{when} is available.\n\nRecover it? (No deletes the autosave.)",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No,
            QMessageBox.StandardButton.Yes)
        if ans != QMessageBox.StandardButton.Yes:
            discard_recoverable(c)
            return False
        try:
            project = load_project(c.project_file)
        except Exception as exc:
            QMessageBox.critical(self, "Cannot recover", _describe(exc))
            return False
        self.doc.reset(project, c.original_path, dirty=True)
        discard_recoverable(c)
        if self.autosaver:
            self.autosaver.write(force=True)
        self.statusBar().showMessage("Recovered from autosave — save to keep it", 10_000)
        return True

    # ================================================================ window state

    def _geometry_key(self) -> str:
        """Settings group of the window geometry for the screen's scale: a size
        saved at 150 % is not reused at 100 %."""
        return f"window/{screen_scale_tag(self.screen())}"

    def _restore_geometry(self) -> None:
        key = self._geometry_key()
        geo = self.qsettings.value(f"{key}/geometry")
        state = self.qsettings.value(f"{key}/state")
        if isinstance(geo, QByteArray | bytes) and geo:
            self.restoreGeometry(QByteArray(geo))
        else:  # 1600 × 1000, or what the screen has room for
            avail = self.screen().availableGeometry() if self.screen() else None
            w = min(1600, int(avail.width() * 0.96)) if avail else 1600
            h = min(1000, int(avail.height() * 0.94)) if avail else 1000
            self.resize(max(w, 640), max(h, 480))
        if isinstance(state, QByteArray | bytes) and state and \
                self.restoreState(QByteArray(state)):
            self._default_layout_pending = False
        overlay = self.qsettings.value("view/overlay", "outcome")
        if overlay in style.OVERLAYS:
            self.set_overlay(str(overlay))

    def save_window_state(self) -> None:
        key = self._geometry_key()
        self.qsettings.setValue(f"{key}/geometry", self.saveGeometry())
        self.qsettings.setValue(f"{key}/state", self.saveState())
        self.qsettings.setValue("view/overlay", self.plan.overlay)
        self.qsettings.sync()

    def closeEvent(self, event: QCloseEvent) -> None:
        if not self._closing and not self.maybe_save():
            event.ignore()
            return
        self._closing = True
        self.save_window_state()
        self.runner.shutdown()
        if self.autosave_nudge is not None:
            self.autosave_nudge.stop()
        if self.autosaver:
            self.autosaver.close()
        self.doc.release_lock()
        if self._settings_dialog is not None:
            self._settings_dialog.close()
        if self.help_window is not None:
            self.help_window.close()
        event.accept()

    # ================================================================ screenshots

    def prepare_screenshot(self) -> None:
        """Synchronous analysis, select the worst bay and show its governing
        point's trace (so a grab shows every panel filled)."""
        self.runner.run_now()
        res = self.doc.results
        if res is not None and res.bays:
            order = {k: i for i, k in enumerate(style.OUTCOME_ORDER)}
            worst = max(res.bays, key=lambda b: (order.get(b.response, -1),
                                                 b.max_utilisation))
            self.doc.select(Selection("bay", (worst.level_id, worst.bay_id)))
            if math.isfinite(worst.governing_x):
                self.show_trace(worst.zone_id, worst.load_name, worst.governing_x,
                                worst.governing_y)
        QTimer.singleShot(0, self.plan.fit)

    # ================================================================ help

    def _on_about(self) -> None:
        QMessageBox.about(self, "About droprig",
                          f"<b>droprig {__version__}</b><br>Dropped-load assessment of floor "
                          "framing under crane swing zones.<br><br>" + CAUTION)

    def _on_caution(self) -> None:
        from droprig.gui.help_window import LimitsDialog

        self.limits_dialog = LimitsDialog(self)
        self.limits_dialog.show()

    def focused_panel(self) -> str:
        """The guide section of the panel holding the keyboard focus ('start' if none)."""
        from PySide6.QtWidgets import QApplication

        from droprig.gui.generator_dialog import GeneratorDialog

        w = QApplication.focusWidget() or QApplication.activeWindow()
        panels = (("plan", self.plan), ("project", self.tree), ("inspector", self.inspector),
                  ("results", self.results_table), ("trace", self.trace_panel))
        while w is not None:
            for key, panel in panels:
                if w is panel:
                    return key
            if isinstance(w, SettingsDialog):
                return "settings"
            if isinstance(w, GeneratorDialog):
                return "generator"
            w = w.parentWidget()
        return "start"

    def show_help(self, section: object = None) -> object:
        """F1: the user guide at the section of the focused panel (or ``section``)."""
        from droprig.gui.help_window import HelpWindow

        key = section if isinstance(section, str) else self.focused_panel()
        if not isinstance(self.help_window, HelpWindow):
            self.help_window = HelpWindow()
            self.help_window.setAttribute(Qt.WidgetAttribute.WA_QuitOnClose, False)
        hw = self.help_window
        hw.show()
        hw.raise_()
        hw.show_section(key)
        return hw
