"""Standard shortcuts (Qt's platform key bindings, QKeySequence.StandardKey) and
File › Close; no stale panel after closing or switching units.

Behaviour of the window only; the framing is invented for the test.
"""
# These tests check the window's behaviour asked for in issue 15, not engineering values:
# no published source applies (common practice, no source).

from __future__ import annotations

from dataclasses import replace

import pytest
from PySide6.QtCore import Qt
from PySide6.QtGui import QKeySequence
from PySide6.QtWidgets import QApplication, QMessageBox

from droprig.gui import edits as ed
from droprig.gui.document import Selection
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftLoad, LiftZone, Project, generate_level

pytestmark = pytest.mark.gui


def _project() -> Project:
    level = generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0), y_spacings=(5.0,),
        girder_direction="x", beam_spacing=2.5, girder_section=get_section("IPE 400"),
        beam_section=get_section("IPE 240"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(id="Z1", name="Crane", level_id="L1", crane=(-3.0, 2.5), r_min=2.0,
                    r_max=9.0, loads=(LiftLoad(name="Skid", mass=1500.0, drop_height=0.8),))
    return Project(levels=(level,), lift_zones=(zone,))


@pytest.fixture
def win(qtbot, open_window):
    w = open_window((1280, 720))
    w.activateWindow()
    qtbot.waitUntil(lambda: QApplication.activeWindow() is w)
    w.doc.reset(_project())
    return w


def _bump(w) -> None:
    z = w.doc.project.zone("Z1")
    w.doc.edit(ed.with_zone(w.doc.project, "Z1", replace(z, r_max=z.r_max + 1.0)), "bump")


@pytest.mark.parametrize("keys", [
    (Qt.Key.Key_Y, Qt.KeyboardModifier.ControlModifier),
    (Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier | Qt.KeyboardModifier.ShiftModifier),
])
def test_ctrl_y_and_ctrl_shift_z_both_redo(qtbot, win, keys) -> None:
    _bump(win)
    after = win.doc.project
    win.plan.setFocus()
    qtbot.keyClick(win.plan, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier)
    assert win.doc.project.zone("Z1").r_max == 9.0
    qtbot.keyClick(win.plan, *keys)
    assert win.doc.project is after


def test_shortcuts_come_from_the_platform_bindings(win) -> None:
    a = win.actions
    K = QKeySequence.StandardKey
    for name, std in (("new", K.New), ("open", K.Open), ("save", K.Save), ("close", K.Close),
                      ("undo", K.Undo)):
        bound = QKeySequence.keyBindings(std)
        assert bound and a[name].shortcuts()[0] == bound[0], name
    redo = {s.toString() for s in a["redo"].shortcuts()}
    assert {"Ctrl+Y", "Ctrl+Shift+Z"} <= redo


def test_file_close_asks_then_leaves_an_empty_project(qtbot, win, monkeypatch) -> None:
    _bump(win)
    win.show_trace("Z1", "Skid", 3.0, 2.5)
    assert win.trace_panel.trace is not None
    asked = []

    def answer(*args: object, **kwargs: object) -> QMessageBox.StandardButton:
        asked.append(args[1])
        return QMessageBox.StandardButton.Cancel

    monkeypatch.setattr(QMessageBox, "warning", answer)
    assert win.close_project() is False  # cancelled: nothing changes
    assert win.doc.project.levels and asked == ["Unsaved changes"]
    monkeypatch.setattr(QMessageBox, "warning",
                        lambda *a, **k: QMessageBox.StandardButton.Discard)
    win.plan.setFocus()
    qtbot.keyClick(win.plan, Qt.Key.Key_W, Qt.KeyboardModifier.ControlModifier)  # File › Close
    assert win.doc.project == Project()
    assert win.trace_panel.trace is None  # no point of the closed project stays on show
    assert win.isVisible()
    file_menu = win.menuBar().actions()[0].menu()
    assert win.actions["close"] in file_menu.actions()


def test_trace_follows_the_unit_system(qtbot, win) -> None:
    win.show_trace("Z1", "Skid", 3.0, 2.5)
    assert win.trace_panel.unit_system == "SI"
    p = win.doc.project
    win.doc.edit(ed.with_settings(p, replace(p.settings, unit_system="US")), "US")
    assert win.trace_panel.unit_system == "US"
    assert " ft" in win.trace_panel.plain_text() or " in" in win.trace_panel.plain_text()
    win.doc.select(Selection("zone", ("Z1",)))


def test_trace_follows_edits_and_clears_when_its_load_goes(qtbot, win) -> None:
    win.runner.run_now()
    win.show_trace("Z1", "Skid", 3.0, 2.5)
    before = win.trace_panel.plain_text()
    z = win.doc.project.zone("Z1")
    heavier = replace(z.loads[0], mass=3000.0)
    win.doc.edit(ed.with_load(win.doc.project, "Z1", "Skid", heavier), "mass")
    win.runner.run_now()
    qtbot.waitUntil(lambda: win.doc.results_current)
    after = win.trace_panel.plain_text()
    assert after and after != before  # re-worked for the new mass
    renamed = replace(heavier, name="Skid B")
    win.doc.edit(ed.with_load(win.doc.project, "Z1", "Skid", renamed), "rename")
    win.runner.run_now()
    qtbot.waitUntil(lambda: win.doc.results_current)
    assert win.trace_panel.trace is None  # no trace of a load that no longer exists
