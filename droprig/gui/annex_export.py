"""File › Export annex…: the lift-permit annex PDF from the window.

The dialog asks which lift (all, or one lift zone), the paper size and where to
write; the work runs on a worker thread behind a progress dialog that can be
cancelled; afterwards the PDF is opened (or its folder shown). The PDF itself is
written by :func:`write_annex_pdf`, the same report code ``droprig report``
calls (atomic write: a failed or cancelled export leaves no file behind).
"""

from __future__ import annotations

import inspect
import os
import threading
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QObject, QThread, QUrl, Signal
from PySide6.QtGui import QDesktopServices
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QFileDialog,
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QProgressDialog,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from droprig.gui import style
from droprig.model import Project
from droprig.solver import Results

PAPERS = (("A4", "A4 (210 × 297 mm)"), ("Letter", "US Letter (8.5 × 11 in)"))
Progress = Callable[[float, str], None]


class ExportCancelledError(Exception):
    """Raised inside the worker when the user cancels; nothing is written."""


def default_paper(project: Project) -> str:
    """Letter for a project in US units, A4 otherwise (the report's own default)."""
    return "Letter" if project.settings.unit_system == "US" else "A4"


def write_annex_pdf(project: Project, results: Results | None, path: str | os.PathLike[str],
                    *, lift: str | None = None, paper: str | None = None,
                    project_path: str | os.PathLike[str] | None = None,
                    progress: Progress | None = None) -> int:
    """Analyse (unless ``results`` are given for ``project``) and write the annex
    with the report package's ``write_annex`` — the code ``droprig report`` runs.
    ``paper`` is passed on when the report code takes it. Returns the page count."""
    from droprig.io.atomic import check_output, keep_backup
    from droprig.report.annex import write_annex

    # never over the project (links resolved) nor any .droprig file (issue 16)
    check_output(path, (project_path,) if project_path else (), option="Annex file")
    if results is None:
        from droprig.solver import analyse

        if progress is not None:
            progress(0.0, "Analysing every drop point")
        results = analyse(project)
    kwargs: dict[str, object] = {"project_path": project_path, "lift": lift,
                                 "progress": progress}
    if paper is not None and "paper" in inspect.signature(write_annex).parameters:
        kwargs["paper"] = paper
    keep_backup(path)  # the annex it replaces is kept as .bak
    return write_annex(project, results, path, **kwargs)  # type: ignore[arg-type]


@dataclass(frozen=True)
class ExportOptions:
    path: Path
    lift: str | None
    paper: str
    open_after: bool


class ExportDialog(QDialog):
    """Options of the annex: lift, paper size, file, open afterwards."""

    def __init__(self, project: Project, suggested: Path, parent: QWidget | None = None
                 ) -> None:
        super().__init__(parent)
        self.setWindowTitle("Export permit annex")
        self.lift = QComboBox()
        self.lift.addItem("All lift zones", None)
        for z in project.lift_zones:
            self.lift.addItem(f"Lift zone {z.id}" + (f" — {z.name}" if z.name else ""), z.id)
        self.paper = QComboBox()
        for key, label in PAPERS:
            self.paper.addItem(label, key)
        self.paper.setCurrentIndex(self.paper.findData(default_paper(project)))
        self.path = QLineEdit(str(suggested))
        browse = QPushButton("Browse…")
        browse.clicked.connect(self._browse)
        row = QHBoxLayout()
        row.addWidget(self.path, 1)
        row.addWidget(browse)
        self.open_after = QCheckBox("Open the PDF when it is written")
        self.open_after.setChecked(True)
        self.message = QLabel()
        self.message.setWordWrap(True)
        self.message.setStyleSheet("color: #6B0F24;")
        self.message.hide()
        form = QFormLayout()
        form.addRow("Lift", self.lift)
        form.addRow("Paper", self.paper)
        form.addRow("File", row)
        caution = QLabel(f"⚠ {style.CAUTION_SHORT}.")
        caution.setWordWrap(True)
        caution.setStyleSheet("color: #6B4E00;")
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok
                                   | QDialogButtonBox.StandardButton.Cancel)
        buttons.button(QDialogButtonBox.StandardButton.Ok).setText("Export")
        buttons.accepted.connect(self._accept)
        buttons.rejected.connect(self.reject)
        v = QVBoxLayout(self)
        v.addLayout(form)
        v.addWidget(self.open_after)
        v.addWidget(self.message)
        v.addWidget(caution)
        v.addWidget(buttons)
        self.setMinimumWidth(520)

    def _browse(self) -> None:
        path, _ = QFileDialog.getSaveFileName(self, "Export permit annex", self.path.text(),
                                              "PDF files (*.pdf)")
        if path:
            self.path.setText(path if path.lower().endswith(".pdf") else path + ".pdf")

    def problem(self) -> str:
        """Why the chosen file cannot be written ('' when it can)."""
        text = self.path.text().strip()
        if not text:
            return "File: give the path of the PDF to write, e.g. annex.pdf."
        p = Path(text).expanduser()
        if p.is_dir():
            return f"File: {p} is a folder; give a file name such as annex.pdf."
        if not p.parent.is_dir():
            return f"File: the folder {p.parent} does not exist."
        if p.suffix.lower() != ".pdf":
            return "File: the annex is a PDF; give a name ending in .pdf."
        return ""

    def _accept(self) -> None:
        msg = self.problem()
        if msg:
            self.message.setText(msg)
            self.message.show()
            return
        self.accept()

    def options(self) -> ExportOptions:
        return ExportOptions(Path(self.path.text().strip()).expanduser(),
                             self.lift.currentData(), str(self.paper.currentData()),
                             self.open_after.isChecked())


class _Worker(QObject):
    progressed = Signal(int, str)
    finished = Signal(int, str)  # pages, error ('' when written; 'cancelled')

    def __init__(self, project: Project, results: Results | None, opts: ExportOptions,
                 project_path: Path | None) -> None:
        super().__init__()
        self._project, self._results, self._opts = project, results, opts
        self._project_path = project_path
        self.cancel = threading.Event()

    def _progress(self, fraction: float, text: str) -> None:
        if self.cancel.is_set():
            raise ExportCancelledError
        self.progressed.emit(round(fraction * 1000), text)

    def run(self) -> None:
        from droprig.texts import describe_error

        try:
            pages = write_annex_pdf(self._project, self._results, self._opts.path,
                                    lift=self._opts.lift, paper=self._opts.paper,
                                    project_path=self._project_path,
                                    progress=self._progress)
        except ExportCancelledError:
            self.finished.emit(0, "cancelled")
            return
        except Exception as exc:  # a message in the window, never a crash
            self.finished.emit(0, describe_error(exc))
            return
        self.finished.emit(pages, "")


class AnnexExport(QObject):
    """One export run: worker thread + progress dialog. ``done(path, pages,
    error)`` when it ends (error '' on success, 'cancelled' when cancelled)."""

    done = Signal(object, int, str)

    def __init__(self, project: Project, results: Results | None, opts: ExportOptions,
                 project_path: Path | None, parent: QWidget) -> None:
        super().__init__(parent)
        self.opts = opts
        self.progress = QProgressDialog("Preparing the annex…", "Cancel", 0, 1000, parent)
        self.progress.setWindowTitle("Exporting the permit annex")
        self.progress.setMinimumDuration(0)
        self.progress.setAutoClose(False)
        self.progress.setAutoReset(False)
        self.progress.setValue(0)
        self._thread = QThread(self)
        self._worker = _Worker(project, results, opts, project_path)
        self._worker.moveToThread(self._thread)
        self._thread.started.connect(self._worker.run)
        self._worker.progressed.connect(self._on_progress)
        self._worker.finished.connect(self._on_finished)
        self.progress.canceled.connect(self._worker.cancel.set)
        self.result: tuple[int, str] | None = None

    def start(self) -> None:
        self.progress.show()
        self._thread.start()

    @property
    def running(self) -> bool:
        return self._thread.isRunning()

    def cancel(self) -> None:
        self._worker.cancel.set()

    def _on_progress(self, value: int, text: str) -> None:
        self.progress.setValue(value)
        self.progress.setLabelText(text)

    def _on_finished(self, pages: int, error: str) -> None:
        self._thread.quit()
        self._thread.wait()
        self.progress.close()
        self.result = (pages, error)
        if not error and self.opts.open_after:
            reveal(self.opts.path)
        self.done.emit(self.opts.path, pages, error)


def reveal(path: Path) -> bool:
    """Open the PDF in the desktop's viewer; if none, show its folder."""
    if QDesktopServices.openUrl(QUrl.fromLocalFile(str(path))):
        return True
    return QDesktopServices.openUrl(QUrl.fromLocalFile(str(path.parent)))


__all__ = ["AnnexExport", "ExportDialog", "ExportOptions", "default_paper", "reveal",
           "write_annex_pdf"]
