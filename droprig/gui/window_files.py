"""The main window's file handling: new, open, save, close, the unsaved-changes
question, recent files, crash recovery and the permit annex export.

A part of :class:`droprig.gui.main_window.MainWindow` (a mixin)."""

from __future__ import annotations

import datetime as _dt
import logging
from pathlib import Path

from PySide6.QtWidgets import (
    QFileDialog,
    QMessageBox,
)

from droprig.gui.document import (
    discard_recoverable,
    find_recoverable,
)
from droprig.gui.window_base import WindowParts, describe
from droprig.model import Project

log = logging.getLogger("droprig.gui")
"""Where the window records what the user was told in passing (format conversions)."""

FILE_FILTER = "droprig projects (*.droprig);;All files (*)"
MAX_RECENT = 8


class FilesMixin(WindowParts):
    """The main window's file handling."""

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
        # only confirmed results: outcomes still being confirmed are analysed afresh
        results = self.doc.results if self.doc.results_confirmed else None
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
        self.dismiss_notice()

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
            QMessageBox.critical(self, "Cannot open project", describe(exc))
            return False
        if self.autosaver:
            self.autosaver.discard()
        self._forget_views()
        if self.doc.lock_warning:  # a second window on the same file (file_guard)
            self.statusBar().showMessage(self.doc.lock_warning, 30_000)
        if self.doc.open_notes:  # converted from an older format: what changed
            self.report_conversion(Path(path).name, self.doc.open_notes)
        self.plan.fit()
        return True

    def report_conversion(self, name: str, notes: tuple[str, ...]) -> None:
        """Tell the user what the conversion of ``name`` from an older file format
        changed in meaning (which loads' drop heights were re-based to the one
        datum): a notice above the plan until dismissed, the status bar and the log."""
        n = len(notes)
        self.show_notice(
            f"{name} was converted from an older droprig file format: check "
            f"{'these values' if n > 1 else 'this value'}, then save to keep the "
            "converted file.", notes)
        self.statusBar().showMessage(
            f"{name}: converted from an older file format — {n} note{'s' if n > 1 else ''} "
            "to check, in the notice above the plan", 30_000)
        for note in notes:
            log.warning("%s, converted from an older format: %s", name, note)

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
                                 f"{describe(exc)}\nThe file on disk was not changed.")
            return False
        if self.autosaver:
            self.autosaver.discard()
        self.statusBar().showMessage(f"Saved {path}", 5000)
        return True

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
            QMessageBox.critical(self, "Cannot recover", describe(exc))
            return False
        self.doc.reset(project, c.original_path, dirty=True)
        discard_recoverable(c)
        if self.autosaver:
            self.autosaver.write(force=True)
        self.statusBar().showMessage("Recovered from autosave — save to keep it", 10_000)
        return True
