"""What the parts of the main window share.

:class:`droprig.gui.main_window.MainWindow` is split by responsibility into mixins
(:mod:`~droprig.gui.window_actions` menus and actions, :mod:`~droprig.gui.window_files`
file handling, :mod:`~droprig.gui.window_analysis` the analysis runner's side,
:mod:`~droprig.gui.window_panels` the panels and layout, :mod:`~droprig.gui.window_edits`
the editing commands). Each mixin is a :class:`WindowParts`: the window's state lives
on the one window object (built by ``MainWindow.__init__``), declared here so that
every part names what it reads. No part has an ``__init__`` of its own.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from PySide6.QtCore import QSettings
    from PySide6.QtGui import QAction
    from PySide6.QtWidgets import (
        QComboBox,
        QDockWidget,
        QLabel,
        QMenu,
        QProgressBar,
        QToolButton,
        QWidget,
    )

    from droprig.gui.analysis_runner import AnalysisRunner
    from droprig.gui.document import Autosaver, Document
    from droprig.gui.file_guard import AutosaveNudge
    from droprig.gui.inspector import Inspector
    from droprig.gui.plan_view import PlanView
    from droprig.gui.project_tree import ProjectTree
    from droprig.gui.results_table import ResultsTable
    from droprig.gui.settings_dialog import SettingsDialog
    from droprig.gui.trace_panel import TracePanel


def describe(exc: BaseException) -> str:
    """One line for a message box or the status bar (:func:`droprig.texts.describe_error`)."""
    from droprig.texts import describe_error

    return describe_error(exc)


class WindowParts:
    """The main window's state, as its parts see it (set by ``MainWindow.__init__``
    and the ``_make_*`` builders)."""

    # the document and the machinery around it
    doc: Document
    qsettings: QSettings
    settings_dir: Path
    runner: AnalysisRunner
    autosaver: Autosaver | None
    autosave_nudge: AutosaveNudge | None
    actions: dict[str, QAction]
    _closing: bool
    _annex_job: object
    _settings_dialog: SettingsDialog | None
    help_window: QWidget | None
    limits_dialog: QWidget | None
    plan_menu: QMenu | None
    _default_layout_pending: bool
    # panels
    plan: PlanView
    tree: ProjectTree
    inspector: Inspector
    results_table: ResultsTable
    trace_panel: TracePanel
    tree_dock: QDockWidget
    inspector_dock: QDockWidget
    results_dock: QDockWidget
    trace_dock: QDockWidget
    recent_menu: QMenu
    # view bar, heading, guide and status bar
    level_combo: QComboBox
    overlay_combo: QComboBox
    case_combo: QComboBox
    guide: QWidget
    guide_text: QLabel
    guide_button: QToolButton
    plan_heading: QLabel
    notice: QWidget
    notice_text: QLabel
    notice_dismiss: QToolButton
    units_label: QLabel
    basis_label: QLabel
    state_label: QLabel
    busy: QProgressBar
    caution_label: QLabel
