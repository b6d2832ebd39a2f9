"""Application set-up: QApplication, user settings location, start-up and the
offscreen screenshot used by ``droprig gui --screenshot`` and ``droprig demo``."""

from __future__ import annotations

import os
import sys
import tempfile
from pathlib import Path

from PySide6.QtCore import QSettings, Qt, QTimer
from PySide6.QtGui import QColor, QFont, QPalette
from PySide6.QtWidgets import QApplication

from droprig import __version__
from droprig.gui import style

SETTINGS_ENV = "DROPRIG_SETTINGS_DIR"
SCREENSHOT_SIZE = (1600, 1000)


def settings_dir() -> Path:
    """Folder for settings, recent files and autosaves: ``$DROPRIG_SETTINGS_DIR``
    if set (tests isolate themselves this way), else the platform's per-user
    configuration folder."""
    env = os.environ.get(SETTINGS_ENV)
    if env:
        return Path(env)
    if sys.platform.startswith("win"):
        base = Path(os.environ.get("APPDATA", Path.home() / "AppData" / "Roaming"))
    elif sys.platform == "darwin":
        base = Path.home() / "Library" / "Application Support"
    else:
        base = Path(os.environ.get("XDG_CONFIG_HOME") or Path.home() / ".config")
    return base / style.APP_NAME


def make_settings() -> QSettings:
    """The user's QSettings, an INI file inside :func:`settings_dir`."""
    d = settings_dir()
    d.mkdir(parents=True, exist_ok=True)
    return QSettings(str(d / "droprig.ini"), QSettings.Format.IniFormat)


def create_app(argv: list[str] | None = None) -> QApplication:
    """The QApplication (created once), with our names, style and palette."""
    app = QApplication.instance()
    if app is None:
        QApplication.setHighDpiScaleFactorRoundingPolicy(
            Qt.HighDpiScaleFactorRoundingPolicy.PassThrough)
        app = QApplication(argv if argv is not None else [sys.argv[0]])
    assert isinstance(app, QApplication)
    app.setOrganizationName(style.APP_ORGANISATION)
    app.setApplicationName(style.APP_NAME)
    app.setApplicationDisplayName("droprig")
    app.setApplicationVersion(__version__)
    app.setStyle("Fusion")
    from PySide6.QtCore import QLocale

    from droprig import units

    units.set_decimal_mark(QLocale().decimalPoint())  # the user's decimal mark
    pal = app.palette()
    pal.setColor(QPalette.ColorRole.Window, QColor("#F3F3EF"))
    pal.setColor(QPalette.ColorRole.Base, QColor("#FFFFFF"))
    pal.setColor(QPalette.ColorRole.AlternateBase, QColor("#F6F7F9"))
    pal.setColor(QPalette.ColorRole.Highlight, QColor("#2B4F85"))
    pal.setColor(QPalette.ColorRole.HighlightedText, QColor("#FFFFFF"))
    pal.setColor(QPalette.ColorRole.Button, QColor("#ECECE6"))
    app.setPalette(pal)
    f = QFont(app.font())
    if f.pointSizeF() < 9.5:
        f.setPointSizeF(9.5)
    app.setFont(f)
    app.setStyleSheet(
        "QDockWidget::title { background: #E2E4DE; padding: 4px 6px; font-weight: 600; }"
        "QWidget#viewBar { background: #ECEDE8; border-bottom: 1px solid #CFd1CA; }"
        "QHeaderView::section { background: #ECEDE8; padding: 3px; border: 0; "
        "border-right: 1px solid #D4D6CF; border-bottom: 1px solid #C4C6BF; }")
    return app


def run(path: str | None = None) -> int:
    """Open the main window (optionally on ``path``) and run the event loop."""
    from droprig.gui.main_window import MainWindow

    app = create_app()
    win = MainWindow()
    win.show()
    if path:
        win.open_path(path, ask=False)
    QTimer.singleShot(0, win.offer_recovery)
    return app.exec()


def _quiet_offscreen_plugin() -> None:
    """Drop the offscreen platform's harmless "does not support propagateSizeHints"
    line from a headless screenshot run; every other Qt message still reaches stderr."""
    from PySide6.QtCore import qInstallMessageHandler

    def handler(_mode: object, _context: object, message: str) -> None:
        if "propagateSizeHints" not in message:
            sys.stderr.write(message + "\n")

    qInstallMessageHandler(handler)


def screenshot(path: str | None, png: str, size: tuple[int, int] = SCREENSHOT_SIZE) -> int:
    """Open ``path``, analyse synchronously, render and save a grab of the main
    window to ``png``. Settings and autosaves are not touched."""
    from droprig.gui.document import Document
    from droprig.gui.main_window import MainWindow
    from droprig.model import Project

    app = create_app()
    _quiet_offscreen_plugin()
    doc = Document(Project())
    if path:
        from droprig.io.project_file import load_project

        doc = Document(load_project(Path(path)), Path(path))
    tmp = tempfile.TemporaryDirectory(prefix="droprig-shot-")
    scratch = QSettings(str(Path(tmp.name) / "scratch.ini"), QSettings.Format.IniFormat)
    win = MainWindow(doc, settings=scratch, settings_dir=Path(tmp.name), threaded=False,
                     autosave=False)
    win.resize(*size)
    win.show()
    app.processEvents()
    win.prepare_screenshot()
    for _ in range(3):
        app.processEvents()
    win.plan.fit()
    app.processEvents()
    image = win.grab()
    out = Path(png)
    out.parent.mkdir(parents=True, exist_ok=True)
    ok = image.save(str(out), "PNG")
    win._closing = True
    win.close()
    del scratch
    tmp.cleanup()
    return 0 if ok else 2
