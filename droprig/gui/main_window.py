"""The droprig main window: plan in the middle, project tree on the left,
inspector on the right, results by bay and the calculation trace below.

The window owns the document (project + undo stack + selection + results), the
analysis runner and the autosaver; every panel takes the document and listens
to it. Menus hold the file, edit, framing and lift actions with the standard
shortcuts.

The class is assembled from parts by responsibility (each a mixin over the one
window's state, :class:`~droprig.gui.window_base.WindowParts`):
:mod:`~droprig.gui.window_actions` (actions and menus),
:mod:`~droprig.gui.window_files` (new, open, save, close, recent files, recovery,
annex export), :mod:`~droprig.gui.window_analysis` (the runner's status, results
and the calculation trace), :mod:`~droprig.gui.window_panels` (plan, docks, status
bar, lift / load filter, geometry) and :mod:`~droprig.gui.window_edits` (editing
commands). This module builds the window, wires the document's signals and keeps
the help and closing.
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QByteArray, QSettings, QSize, Qt
from PySide6.QtGui import QCloseEvent
from PySide6.QtWidgets import QMainWindow, QMenu, QMessageBox, QWidget

from droprig import __version__
from droprig.gui import style
from droprig.gui.analysis_runner import AnalyseFn, AnalysisRunner
from droprig.gui.document import Autosaver, Document, Selection
from droprig.gui.settings_dialog import SettingsDialog
from droprig.gui.window_actions import ActionsMixin, quit_keys, redo_keys
from droprig.gui.window_analysis import AnalysisMixin
from droprig.gui.window_edits import (
    MAX_LISTED,
    EditsMixin,
    is_placeholder,
    placeholder_load,
)
from droprig.gui.window_files import FILE_FILTER, MAX_RECENT, FilesMixin
from droprig.gui.window_panels import (
    BASIS_LABELS,
    UNIT_LABELS,
    PanelsMixin,
    screen_scale_tag,
)
from droprig.model import Project
from droprig.texts import CAUTION

__all__ = [
    "BASIS_LABELS",
    "FILE_FILTER",
    "MAX_LISTED",
    "MAX_RECENT",
    "UNIT_LABELS",
    "MainWindow",
    "is_placeholder",
    "placeholder_load",
    "quit_keys",
    "redo_keys",
    "screen_scale_tag",
]


class MainWindow(FilesMixin, EditsMixin, AnalysisMixin, PanelsMixin, ActionsMixin,
                 QMainWindow):
    """The application window.

    ``settings``: where geometry, state and recent files are kept (tests pass
    an isolated one). ``settings_dir``: folder of the autosave / recovery files.
    ``analyse``: the analysis function (default: ``analyse_live``, the solver's
    ``analyse`` with each zone's results remembered, its outcomes shown first by
    ``analyse_live_outcomes`` while the limits are confirmed).
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
        self.runner = AnalysisRunner(self.doc, analyse=analyse or self.analyse_live,
                                     outcomes=None if analyse else self.analyse_live_outcomes,
                                     threaded=threaded,
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
        self.runner.outcomes_shown.connect(self._on_analysis_finished)
        self.plan.zone_changed.connect(self._on_zone_changed)
        self.plan.protection_drawn.connect(self._on_protection_drawn)
        self.plan.corridor_drawn.connect(self._on_corridor_drawn)
        self.plan.corridor_changed.connect(self._on_corridor_dragged)
        self.plan.context_requested.connect(self._on_plan_context)
        self.plan.mode_changed.connect(self._on_plan_mode_changed)
        self.plan.point_clicked.connect(self._on_plan_point)
        self.plan.hover_text.connect(self._on_hover_text)
        self.results_table.trace_requested.connect(self._trace_from_table)
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

    def _on_plan_point(self, zone_id: str, load_name: str, x: float, y: float) -> None:
        """A click on the plan: trace the point clicked. When the click selected a
        bay, the trace follows the load of the table row it selected (the bay's
        worst); the nearest point alone could be another load's, and the trace then
        named a load the highlighted row did not (seen under Xvfb)."""
        row = self.results_table.selected_row()
        sel = self.doc.selection
        if (row is not None and sel is not None and sel.kind == "bay"
                and (row.level_id, row.bay_id) == tuple(sel.ids)
                and (row.zone_id, row.load_name) != (zone_id, load_name)):
            hit = self.plan.nearest_point(x, y, case=(row.zone_id, row.load_name))
            if hit is not None:
                case, i = hit
                zone_id, load_name = case.zone_id, case.load_name
                x, y = float(case.x[i]), float(case.y[i])
        keep = self.current_side_panel() if self.compact else None
        self._on_point_clicked(zone_id, load_name, x, y)
        if keep is not None and keep is not self.trace_dock:
            keep.raise_()  # see _trace_from_table

    def _trace_from_table(self, zone_id: str, load_name: str, x: float, y: float) -> None:
        """A results row chosen: trace its governing point. In the compact layout
        the tab on top stays (the trace waits behind its tab): raising the trace
        hid the table the reader was going down, or, after a click on a bay in the
        plan, the inspector's outcome and conditions of that bay (seen under Xvfb
        at 150 %)."""
        keep = self.current_side_panel() if self.compact else None
        self.show_trace(zone_id, load_name, x, y)
        if keep is not None and keep is not self.trace_dock:
            keep.raise_()

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
            self._fit_to_screen()
            self._restore_size(self.qsettings.value(f"{key}/size"))
        else:  # 1600 × 1000, or what the screen has room for
            avail = self.screen().availableGeometry() if self.screen() else None
            w = min(1600, int(avail.width() * 0.96)) if avail else 1600
            h = min(1000, int(avail.height() * 0.94)) if avail else 1000
            self.resize(max(w, 640), max(h, 360))
        self.set_compact(self._wants_compact(self.width(), self.height()))
        if isinstance(state, QByteArray | bytes) and state and \
                self.restoreState(QByteArray(state)):
            self._default_layout_pending = False
        overlay = self.qsettings.value("view/overlay", "outcome")
        if overlay in style.OVERLAYS:
            self.set_overlay(str(overlay))

    def _fit_to_screen(self) -> None:
        """A size saved on a larger screen (or by another display) is cut to the
        screen's available area and moved onto it: never a window wider or taller
        than the screen, or off it."""
        scr = self.screen()
        if scr is None:
            return
        avail = scr.availableGeometry()
        w = min(self.width(), avail.width())
        h = min(self.height(), avail.height())
        if (w, h) != (self.width(), self.height()):
            self.resize(max(w, 640), max(h, 360))
        x = min(max(self.x(), avail.x()), avail.x() + max(avail.width() - self.width(), 0))
        y = min(max(self.y(), avail.y()), avail.y() + max(avail.height() - self.height(), 0))
        if (x, y) != (self.x(), self.y()):
            self.move(x, y)

    def _restore_size(self, saved: object) -> None:
        """The saved window size, cut to the screen: Qt's restoreGeometry shrinks a
        window saved larger than the screen to two thirds of it (a 1600 × 1000
        window reopened on a 1280 × 720 screen came back 853 × 480), so the size is
        kept apart and taken up to what the screen has room for."""
        scr = self.screen()
        if scr is None or not isinstance(saved, QSize) or not saved.isValid():
            return
        avail = scr.availableGeometry()
        w = min(saved.width(), avail.width())
        h = min(saved.height(), avail.height())
        if (w, h) != (self.width(), self.height()):
            self.resize(max(w, 640), max(h, 360))
            self._fit_to_screen()

    def save_window_state(self) -> None:
        key = self._geometry_key()
        self.qsettings.setValue(f"{key}/geometry", self.saveGeometry())
        self.qsettings.setValue(f"{key}/size", self.size())
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
