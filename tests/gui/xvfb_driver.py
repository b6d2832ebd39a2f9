"""Drive the real main window under an X server with real X input (xdotool), finding
every target from the widgets' own geometry (``mapToGlobal``), never from pixel
coordinates of one layout. Run by ``test_xvfb_session.py`` in its own process with
``DISPLAY`` set (a crash kills this process, and the test sees it):

    python tests/gui/xvfb_driver.py SCENARIO PROJECT REPORT_JSON

The window runs in this process so the script can read where each widget is and
what the document holds; the keys and clicks still travel through the X server,
xcb and Qt's event loop as a user's do. Each step waits for the window (a quarter
of a second, longer while the machine is loaded). What was seen is written to
REPORT_JSON for the test to judge; the process exits with the window's own code.

Scenarios: ``edit`` (rename a load 12 times leaving the box by Tab, Shift+Tab or a
click; Tab through the inspector; Ctrl+Z / Ctrl+Y / Ctrl+Shift+Z; save; F1; Ctrl+E;
the caution's Limits of use; Ctrl+Q) and ``notice`` (a converted file's notice and
its Dismiss button). Behaviour only; the demo project is an invented scenario.
"""
# Window behaviour asked for in issue 15, no engineering value (common practice, no source).

from __future__ import annotations

import json
import os
import subprocess
import sys
import traceback
from collections.abc import Generator
from pathlib import Path
from typing import Any

from PySide6.QtCore import QPoint, QTimer
from PySide6.QtWidgets import QApplication, QWidget

from droprig.gui.app import create_app
from droprig.gui.main_window import MainWindow

Steps = Generator[int, None, None]
"""A scenario yields the ms to wait before its next action; a QTimer resumes it,
also inside a dialog's own event loop (Ctrl+E's dialog is modal: a script that
waited inside the key press would never get past it)."""


def pace_ms() -> int:
    """A quarter of a second between user actions, up to four times that while other
    work loads the machine (a user waits for the window; a script must too)."""
    busy = os.getloadavg()[0] / max(os.cpu_count() or 1, 1)
    return int(250 * min(max(busy, 1.0), 4.0))


def xdo(*args: str) -> str:
    r = subprocess.run(["xdotool", *args], capture_output=True, text=True, timeout=30)
    return r.stdout.strip()


class Driver:
    def __init__(self, app: QApplication, win: MainWindow, report: dict[str, Any]) -> None:
        self.app, self.win, self.report = app, win, report

    @staticmethod
    def pace(factor: float = 1.0) -> int:
        """ms to wait after an action (the scenario yields it)."""
        return int(pace_ms() * factor)

    def centre(self, w: QWidget, dx: int = 0, dy: int = 0) -> QPoint:
        """Global (screen) point of widget ``w``'s centre, offset by dx, dy."""
        r = w.rect()
        return w.mapToGlobal(QPoint(r.center().x() + dx, r.center().y() + dy))

    def click_at(self, p: QPoint) -> None:
        xdo("mousemove", str(p.x()), str(p.y()), "click", "1")

    def click(self, w: QWidget, dx: int = 0, dy: int = 0) -> None:
        assert w.isVisible(), f"{w.objectName() or type(w).__name__} is not on show"
        self.click_at(self.centre(w, dx, dy))

    def key(self, *keys: str) -> None:
        xdo("key", *keys)

    def type(self, text: str) -> None:
        xdo("type", "--delay", "5", text)

    @staticmethod
    def window_titled(part: str) -> QWidget | None:
        """The visible top-level window whose title holds ``part``."""
        for w in QApplication.topLevelWidgets():
            if w.isVisible() and part in w.windowTitle():
                return w
        return None

    def await_window(self, part: str, found: list[QWidget | None]) -> Steps:
        """Wait up to 10 s for the window titled ``part``; ``found[0]`` gets it."""
        for _ in range(100):
            w = self.window_titled(part)
            if w is not None:
                found[0] = w
                return
            yield 100
        found[0] = None


def _tree_item(win: MainWindow, starts: str) -> Any:
    from PySide6.QtWidgets import QTreeWidgetItemIterator

    it = QTreeWidgetItemIterator(win.tree)
    while it.value() is not None:
        if it.value().text(0).startswith(starts):
            return it.value()
        it += 1
    raise AssertionError(f"no project-tree row starting {starts!r}")


def _tab_chain(form: QWidget) -> list[QWidget]:
    """The form's editors that take Tab focus, top to bottom (the order a user reads)."""
    from PySide6.QtCore import Qt

    out = [w for w in form.findChildren(QWidget)
           if w.isVisible() and w.isEnabled()
           and w.focusPolicy() & Qt.FocusPolicy.TabFocus
           and w.focusProxy() is None]
    return sorted(out, key=lambda w: (w.mapTo(form, QPoint(0, 0)).y(),
                                      w.mapTo(form, QPoint(0, 0)).x()))


def scenario_edit(d: Driver) -> Steps:
    win, rep = d.win, d.report
    P = d.pace()
    zone = win.doc.project.lift_zones[0]
    # the project tree: the lift zone's row, open it, its first load (keyboard)
    tree = win.tree
    item = _tree_item(win, zone.id)
    tree.scrollToItem(item)
    yield P
    rep["window"] = [win.width(), win.height()]
    # on the row's visible part: the tree's column is as wide as its longest row
    # and scrolls sideways, so a row's centre can lie past the panel's edge
    row = tree.visualItemRect(item).intersected(tree.viewport().rect())
    d.click_at(tree.viewport().mapToGlobal(row.center()))
    yield P
    d.key("Right")
    yield P
    d.key("Down")
    yield P
    sel = win.doc.selection
    rep["selected"] = [sel.kind, list(sel.ids)] if sel is not None else None
    assert sel is not None and sel.kind == "load", rep["selected"]

    def load_names() -> list[str]:
        return [ld.name for z in win.doc.project.lift_zones for ld in z.loads]

    for i in range(1, 13):
        d.click(win.inspector.editor("name"))
        yield P
        d.key("ctrl+a")
        d.type(f"Unit {i}")
        yield P
        if i % 3 == 0:
            d.key("Tab")
        elif i % 3 == 1:
            d.key("shift+Tab")
        else:
            d.click(win.inspector.editor("mass"))  # another box of the form
        yield P
    rep["names_after_renames"] = load_names()
    # Tab through the inspector after a rename: focus goes down the form in order
    d.click(win.inspector.editor("name"))
    yield P
    d.key("ctrl+a")
    d.type("Unit 12")  # the same name: no new edit
    yield P
    chain = _tab_chain(win.inspector.form_editor)
    start = chain.index(win.inspector.editor("name"))
    rep["tab_same"], rep["tab_seen"], rep["tab_expected"] = [], [], []
    for step in range(1, min(6, len(chain) - start)):
        d.key("Tab")
        yield P
        fw = QApplication.focusWidget()
        target = chain[start + step]
        rep["tab_seen"].append(type(fw).__name__ if fw is not None else None)
        rep["tab_expected"].append(type(target).__name__)
        rep["tab_same"].append(fw is target)
    # undo / redo by both redo keys, read from the document
    plan_left = (win.plan.viewport(), -win.plan.viewport().width() // 3, 0)
    d.click(*plan_left)
    yield P
    rep["undo_redo"] = []
    for keys in ("ctrl+z", "ctrl+y", "ctrl+z", "ctrl+shift+z"):
        d.key(keys)
        yield P
        rep["undo_redo"].append([keys, load_names()])
    d.key("ctrl+s")
    yield P
    # F1 with the focus in the inspector: the guide at the inspector's section
    d.click(win.inspector.editor("mass"))
    yield P
    panel = win.focused_panel()
    d.key("F1")
    found: list[QWidget | None] = [None]
    yield from d.await_window("user guide", found)
    help_win = found[0]
    rep["help"] = [help_win is not None, getattr(help_win, "section", None), panel]
    if help_win is not None:
        help_win.close()
        yield P
    # Ctrl+E: the export dialog (modal); Escape leaves it
    d.click(*plan_left)
    yield P
    d.key("ctrl+e")
    yield from d.await_window("Export permit annex", found)
    dlg = found[0]
    rep["export_dialog"] = dlg is not None
    if dlg is not None:
        c = d.centre(dlg)
        xdo("mousemove", str(c.x()), str(c.y()))  # no window manager: keys follow the pointer
        yield P
        d.key("Escape")
        yield P
        rep["export_dialog_closed"] = not dlg.isVisible()
    # the status-bar caution is whole; a click opens the limits of use
    cl = win.caution_label
    rep["caution_fits"] = [cl.fits(), cl.mapTo(win, QPoint(cl.width(), 0)).x() <= win.width()]
    d.click(cl)
    yield from d.await_window("Limits of use", found)
    lim = found[0]
    rep["limits"] = lim is not None
    if lim is not None:
        from PySide6.QtWidgets import QDialogButtonBox

        yield P
        d.click(lim.findChild(QDialogButtonBox).buttons()[0])
        yield P
        rep["limits_closed"] = not lim.isVisible()
    d.click(*plan_left)
    yield P
    d.key("ctrl+s")
    yield 2 * P
    rep["alive_before_quit"] = True
    d.key("ctrl+q")
    yield 10_000  # the window closes and the application quits meanwhile


def scenario_notice(d: Driver) -> Steps:
    win, rep = d.win, d.report
    P = d.pace()
    yield 4 * P
    rep["window"] = [win.width(), win.height()]
    bar = win.notice
    rep["notice_shown"] = bar.isVisible()
    if bar.isVisible():
        # the notice's colour beside its text, grabbed from the X screen
        from PIL import ImageGrab

        p = d.centre(bar, -bar.width() // 4, bar.height() // 2 - 3)
        shot = ImageGrab.grab(xdisplay=os.environ["DISPLAY"]).convert("RGB")
        rep["notice_pixel"] = list(shot.getpixel((p.x(), p.y())))
        d.click(win.notice_dismiss)
        yield 2 * P
        rep["notice_after_dismiss"] = bar.isVisible()
    d.click(win.plan.viewport(), -win.plan.viewport().width() // 3, 0)
    yield P
    d.key("ctrl+q")
    yield 10_000


def main() -> int:
    scenario, project, out = sys.argv[1], Path(sys.argv[2]), Path(sys.argv[3])
    app = create_app()
    win = MainWindow()
    win.show()
    win.open_path(project, ask=False)
    report: dict[str, Any] = {"scenario": scenario}

    def save() -> None:
        out.write_text(json.dumps(report), encoding="utf-8")

    def fail() -> None:
        report["error"] = traceback.format_exc()
        save()
        win._closing = True
        win.close()
        app.exit(3)

    def pump(steps: Steps) -> None:
        try:
            delay = next(steps)
        except StopIteration:
            save()
            return
        except BaseException:
            fail()
            return
        save()
        QTimer.singleShot(delay, lambda: pump(steps))

    def start() -> None:
        try:
            ids = xdo("search", "--name", project.name).split()
            if ids:  # no window manager: place and size the window as a maximised one
                xdo("windowmove", ids[0], "0", "0")
                xdo("windowsize", ids[0], "1280", "720")
            d = Driver(app, win, report)
            pump({"edit": scenario_edit, "notice": scenario_notice}[scenario](d))
        except BaseException:
            fail()

    app.aboutToQuit.connect(save)
    QTimer.singleShot(1500, start)
    return app.exec()


if __name__ == "__main__":
    sys.exit(main())
