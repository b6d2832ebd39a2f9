"""File › Export permit annex… (Ctrl+E): options, a worker thread behind a
progress dialog, cancel leaves no file, and the PDF is the one
``droprig report`` writes for the same project (same page count, same verdict
text; the fingerprint and date lines aside).

The comparison is of the window with the command line (both droprig); the
demo project is an invented scenario.
"""

from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import pytest
from pypdf import PdfReader
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication, QMessageBox

from droprig.gui import annex_export
from droprig.gui.annex_export import ExportDialog, ExportOptions

pytestmark = [pytest.mark.gui, pytest.mark.slow]

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"
WAIT_MS = 120_000


def _text(pdf: Path) -> str:
    return re.sub(r"\s+", " ", " ".join(p.extract_text() for p in PdfReader(str(pdf)).pages))


@pytest.fixture
def win(qtbot, open_window, monkeypatch):
    monkeypatch.setattr(annex_export, "reveal", lambda path: True)  # no desktop viewer
    w = open_window((1280, 720))
    assert w.open_path(DEMO, ask=False)
    return w


def test_export_matches_the_command_line(qtbot, win, tmp_path: Path) -> None:
    # the command line writes its annex beside the window's, at the same time
    cli_out = tmp_path / "from_cli.pdf"
    cli = subprocess.Popen([sys.executable, "-m", "droprig", "report", str(DEMO), "-o",
                            str(cli_out)], stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                           text=True)
    out = tmp_path / "from_window.pdf"
    job = win.export_annex(ExportOptions(out, None, "A4", open_after=False))
    assert job is not None
    assert job.progress.isVisible()  # a progress dialog while the worker writes
    qtbot.waitUntil(lambda: job.result is not None, timeout=WAIT_MS)
    pages, error = job.result
    assert error == "" and pages > 0 and out.is_file()
    assert f"{pages} pages" in win.statusBar().currentMessage()

    _, stderr = cli.communicate(timeout=300)
    assert cli.returncode == 0, stderr
    assert len(PdfReader(str(cli_out)).pages) == pages
    drop = re.compile(r"SHA-256 \S+|\d{4}-\d{2}-\d{2}[ T]\d{2}:\d{2}(:\d{2})?( UTC)?")
    text = _text(out)
    assert drop.sub("", text) == drop.sub("", _text(cli_out))
    # the annex carries the caution, as every verdict surface must
    assert "licensed engineer" in text.lower()


def test_one_lift_only(qtbot, win, tmp_path: Path) -> None:
    zone = win.doc.project.lift_zones[0]
    out = tmp_path / "one.pdf"
    job = win.export_annex(ExportOptions(out, zone.id, "A4", open_after=True))
    opened: list[Path] = []
    annex_export.reveal = opened.append  # type: ignore[assignment]  # monkeypatched back
    qtbot.waitUntil(lambda: job.result is not None, timeout=WAIT_MS)
    assert job.result[1] == "" and out.is_file()
    assert opened == [out]


def test_cancel_leaves_no_file(qtbot, win, tmp_path: Path) -> None:
    out = tmp_path / "cancelled.pdf"
    job = win.export_annex(ExportOptions(out, None, "A4", open_after=False))
    job.cancel()
    qtbot.waitUntil(lambda: job.result is not None, timeout=WAIT_MS)
    assert job.result == (0, "cancelled")
    assert not out.exists() and list(tmp_path.iterdir()) == []
    assert "cancelled" in win.statusBar().currentMessage()


def test_a_write_error_is_a_message_not_a_crash(qtbot, win, tmp_path: Path,
                                               monkeypatch) -> None:
    shown: list[str] = []
    monkeypatch.setattr(QMessageBox, "critical", lambda *a, **k: shown.append(a[2]))
    out = tmp_path / "gone" / "annex.pdf"  # the folder does not exist
    job = win.export_annex(ExportOptions(out, None, "A4", open_after=False))
    qtbot.waitUntil(lambda: job.result is not None, timeout=WAIT_MS)
    assert job.result[1] and shown and "No file was written" in shown[0]


def test_dialog_offers_lifts_and_paper_and_refuses_a_bad_path(qtbot, win,
                                                             tmp_path: Path) -> None:
    p = win.doc.project
    dlg = ExportDialog(p, tmp_path / "x_annex.pdf", win)
    qtbot.addWidget(dlg)
    assert dlg.lift.count() == 1 + len(p.lift_zones)
    assert dlg.paper.currentData() == annex_export.default_paper(p)
    dlg.path.setText(str(tmp_path))
    assert "folder" in dlg.problem()
    dlg.path.setText(str(tmp_path / "missing" / "a.pdf"))
    assert "does not exist" in dlg.problem()
    dlg.path.setText(str(tmp_path / "a.txt"))
    assert ".pdf" in dlg.problem()
    dlg.path.setText(str(tmp_path / "a.pdf"))
    assert dlg.problem() == ""
    opts = dlg.options()
    assert opts.path == tmp_path / "a.pdf" and opts.lift is None


def test_ctrl_e_opens_the_export_dialog(qtbot, win, monkeypatch) -> None:
    seen: list[int] = []
    monkeypatch.setattr(ExportDialog, "exec", lambda self: seen.append(1) or 0)
    win.activateWindow()
    qtbot.waitUntil(lambda: QApplication.activeWindow() is win)
    win.plan.setFocus()
    qtbot.keyClick(win.plan, Qt.Key.Key_E, Qt.KeyboardModifier.ControlModifier)
    assert seen == [1]
