"""Screenshots of the user guide (docs/guide/*.png), taken from the real window.

Usage: ``QT_QPA_PLATFORM=offscreen .venv/bin/python scripts/guide_screenshots.py``
(or under Xvfb). Opens the rooftop demo at 1280 × 720, analyses it on the UI
thread, selects the worst bay and its trace, and saves the whole window and the
plan. Settings and autosaves are not touched (a scratch settings file).
"""

from __future__ import annotations

import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"
OUT = ROOT / "docs" / "guide"
SIZE = (1280, 720)


def main() -> int:
    from PySide6.QtCore import QSettings

    from droprig.gui.app import _quiet_offscreen_plugin, create_app
    from droprig.gui.document import Document
    from droprig.gui.main_window import MainWindow
    from droprig.io.project_file import load_project

    app = create_app()
    _quiet_offscreen_plugin()
    with tempfile.TemporaryDirectory(prefix="droprig-guide-") as tmp:
        scratch = QSettings(str(Path(tmp) / "scratch.ini"), QSettings.Format.IniFormat)
        win = MainWindow(Document(load_project(DEMO), DEMO), settings=scratch,
                         settings_dir=Path(tmp), threaded=False, autosave=False)
        win.resize(*SIZE)
        win.show()
        app.processEvents()
        win.prepare_screenshot()
        for _ in range(3):
            app.processEvents()
        win.plan.fit()
        app.processEvents()
        OUT.mkdir(parents=True, exist_ok=True)
        shots = {"window.png": win.grab(), "plan.png": win.plan.grab()}
        ok = all(img.save(str(OUT / name), "PNG") for name, img in shots.items())
        win._closing = True
        win.close()
        del scratch
    for name in shots:
        print(OUT / name)
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
