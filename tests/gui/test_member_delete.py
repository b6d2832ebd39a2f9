"""Deleting a girder or beam: from the project tree (Delete key), the plan (a click
selects the member; right click offers Delete) and the Edit menu; one undo step that
brings the member back exactly; members that would rest on nothing are named and
deleted with it only when the user agrees; the level stays analysable.

Workflow tests compare the application with itself (before / after a deletion,
undone, redone); they assert no engineering values. Which members rest on a girder
follows droprig's framing convention (infill beams frame into girders, column-line
beams run column to column): common practice, no source. The framing and the crane
are an invented scenario.
"""

from __future__ import annotations

from dataclasses import replace

import pytest
from PySide6.QtCore import QPointF, Qt
from PySide6.QtGui import QContextMenuEvent
from PySide6.QtWidgets import QApplication, QMessageBox

from droprig.gui import edits as ed
from droprig.gui.document import Selection
from droprig.gui.main_window import MainWindow
from droprig.io.sections import get_grade, get_section
from droprig.model import ColumnGrid, Level, Member, generate_level

pytestmark = pytest.mark.gui

WAIT_MS = 20_000
BEAM = "B2.1/A-B"
"""An infill beam: nothing rests on it (scenario)."""
GIRDER = "GA/1-2"
"""A girder carrying the infill beams of bay 1-2/A-B (scenario)."""
CARRIED = ("B1.1/A-B", "B1.2/A-B")


def _level() -> Level:
    """Three by two bays of 6 m × 5 m, girders along x, beams ≤ 2.5 m apart (scenario)."""
    return generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0, 6.0),
        y_spacings=(5.0, 5.0), girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("IPE 450"), beam_section=get_section("IPE 270"),
        girder_grade=get_grade("S355"), beam_grade=get_grade("S355"))


@pytest.fixture
def window(qtbot, open_window) -> MainWindow:
    win = open_window((1280, 800))
    win.doc.edit(ed.add_level(win.doc.project, _level()), "Generate framing")
    win.actions["add_zone"].trigger()
    zone = win.doc.project.lift_zones[0]
    win.plan.zone_changed.emit(zone.id, replace(zone, crane=(-4.0, 5.0), r_min=0.0,
                                                r_max=30.0))
    _settle(qtbot, win)
    return win


def _settle(qtbot, win: MainWindow) -> None:
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_current, timeout=WAIT_MS)


def _ids(win: MainWindow) -> list[str]:
    return [m.id for m in win.doc.project.level("L1").members]


def _answer(monkeypatch: pytest.MonkeyPatch, button: QMessageBox.StandardButton) -> list[str]:
    asked: list[str] = []

    def question(parent: object, title: str, text: str, *args: object,
                 **kwargs: object) -> QMessageBox.StandardButton:
        asked.append(text)
        return button

    monkeypatch.setattr(QMessageBox, "question", question)
    return asked


def test_delete_key_in_the_tree_undo_and_redo(qtbot, window: MainWindow) -> None:
    before = window.doc.project.level("L1").members
    i = _ids(window).index(BEAM)
    window.doc.undo_stack.setClean()
    assert not window.isWindowModified()
    sel = Selection("member", ("L1", BEAM))
    window.tree.setCurrentItem(window.tree.item_for(sel))  # the user clicks the beam
    assert window.doc.selection == sel
    assert window.actions["delete"].isEnabled()
    window.tree.setFocus()
    qtbot.keyClick(window.tree, Qt.Key.Key_Delete)

    assert BEAM not in _ids(window)
    assert len(_ids(window)) == len(before) - 1
    assert window.doc.selection is None
    assert window.isWindowModified()  # unsaved changes, as for any edit
    assert window.doc.undo_stack.undoText() == f"Delete beam {BEAM}"
    assert window.tree.item_for(sel) is None
    assert not window.doc.results_current
    _settle(qtbot, window)  # re-analysed live
    assert window.doc.analysis_error == ""

    window.actions["undo"].trigger()
    after_undo = window.doc.project.level("L1").members
    assert after_undo == before  # same ids, order, sections, grades, end conditions
    assert after_undo[i] is before[i]
    assert not window.isWindowModified()
    _settle(qtbot, window)
    window.actions["redo"].trigger()
    assert BEAM not in _ids(window)
    assert window.isWindowModified()


def test_delete_from_the_edit_menu_and_the_inspector(window: MainWindow) -> None:
    edit = next(a.menu() for a in window.menuBar().actions() if a.text() == "&Edit")
    assert window.actions["delete"] in edit.actions()
    window.doc.select(Selection("member", ("L1", BEAM)))
    assert "delete" in window.inspector.form.buttons
    window.actions["delete"].trigger()
    assert BEAM not in _ids(window)


def test_a_girder_that_carries_beams_asks_first_cancel_changes_nothing(
        qtbot, window: MainWindow, monkeypatch: pytest.MonkeyPatch) -> None:
    asked = _answer(monkeypatch, QMessageBox.StandardButton.Cancel)
    before = window.doc.project
    depth = window.doc.undo_stack.count()
    window.doc.select(Selection("member", ("L1", GIRDER)))
    assert window.delete_selection() is False
    assert len(asked) == 1
    assert all(m in asked[0] for m in CARRIED) and GIRDER in asked[0]
    assert window.doc.project is before
    assert window.doc.undo_stack.count() == depth
    assert all(m in window.statusBar().currentMessage() for m in CARRIED)


def test_a_girder_with_its_beams_in_one_undo_step(qtbot, window: MainWindow,
                                                  monkeypatch: pytest.MonkeyPatch) -> None:
    _answer(monkeypatch, QMessageBox.StandardButton.Yes)
    before = window.doc.project.level("L1").members
    depth = window.doc.undo_stack.count()
    window.doc.select(Selection("member", ("L1", GIRDER)))
    assert window.delete_selection() is True
    assert not {GIRDER, *CARRIED} & set(_ids(window))
    assert len(_ids(window)) == len(before) - 3
    assert window.doc.undo_stack.count() == depth + 1
    assert "2 member(s) resting on it" in window.doc.undo_stack.undoText()
    _settle(qtbot, window)
    assert window.doc.analysis_error == ""  # the level is still analysable
    assert window.doc.results is not None and window.doc.results.bays

    window.actions["undo"].trigger()
    assert window.doc.project.level("L1").members == before
    _settle(qtbot, window)
    assert window.doc.analysis_error == ""


def test_the_last_member_is_refused_with_a_message(qtbot, open_window,
                                                   monkeypatch: pytest.MonkeyPatch) -> None:
    """A level of one girder between two columns (scenario)."""
    win = open_window((1000, 700))
    grid = ColumnGrid((0.0, 6.0), (0.0, 5.0), ("1", "2"), ("A", "B"))
    g = Member("G1", "girder", (0.0, 0.0), (6.0, 0.0), get_section("IPE 450"),
               get_grade("S355"))
    win.doc.edit(ed.add_level(win.doc.project, Level("L1", "Roof", 10.0, grid, (g,))),
                 "Add level")
    warned: list[str] = []
    monkeypatch.setattr(QMessageBox, "warning",
                        lambda parent, title, text, *a, **k: warned.append(text))
    before = win.doc.project
    win.doc.select(Selection("member", ("L1", "G1")))
    assert win.delete_selection() is False
    assert win.doc.project is before
    assert len(warned) == 1 and "at least one member" in warned[0]
    assert "Nothing was changed" in warned[0]


# ------------------------------------------------------------------ in the plan


def _member_midpoint(win: MainWindow, member_id: str) -> tuple[float, float]:
    m = win.doc.project.level("L1").member(member_id)
    return (m.start[0] + m.end[0]) / 2, (m.start[1] + m.end[1]) / 2


def test_click_on_a_member_in_the_plan_selects_and_outlines_it(qtbot,
                                                               window: MainWindow) -> None:
    window.plan.zoom_at(QPointF(window.plan.view_pos(3.0, 5.0)), 4.0)  # closer in
    x, y = _member_midpoint(window, BEAM)
    with qtbot.waitSignal(window.plan.member_clicked, timeout=1000) as sig:
        qtbot.mouseClick(window.plan.viewport(), Qt.MouseButton.LeftButton,
                         pos=window.plan.view_pos(x, y + 0.3))  # on the line, off its middle
    assert sig.args == [BEAM]
    assert window.doc.selection == Selection("member", ("L1", BEAM))
    assert window.plan.selected_member == BEAM
    assert window.plan.selected_bay is None
    assert "Beam" in window.inspector.form.title
    assert BEAM in window.plan.describe(x, y)  # hover names it

    # a click in the middle of a bay, away from every member, still selects the bay
    qtbot.mouseClick(window.plan.viewport(), Qt.MouseButton.LeftButton,
                     pos=window.plan.view_pos(1.0, 2.5))
    assert window.doc.selection is not None and window.doc.selection.kind == "bay"
    assert window.plan.selected_member is None


def test_right_click_on_a_member_offers_delete(qtbot, window: MainWindow) -> None:
    def right_click(x: float, y: float) -> None:
        pos = window.plan.view_pos(x, y)
        QApplication.sendEvent(window.plan.viewport(), QContextMenuEvent(
            QContextMenuEvent.Reason.Mouse, pos, window.plan.viewport().mapToGlobal(pos)))

    right_click(1.0, 2.5)  # away from members: no menu
    assert window.plan_menu is None
    right_click(*_member_midpoint(window, BEAM))
    assert window.doc.selection == Selection("member", ("L1", BEAM))
    menu = window.plan_menu
    assert menu is not None and menu.isVisible()
    assert [a.objectName() for a in menu.actions()] == ["action_delete", "action_apply_like"]
    menu.actions()[0].trigger()
    menu.close()
    assert BEAM not in _ids(window)


def test_delete_key_in_the_plan(qtbot, window: MainWindow) -> None:
    x, y = _member_midpoint(window, BEAM)
    qtbot.mouseClick(window.plan.viewport(), Qt.MouseButton.LeftButton,
                     pos=window.plan.view_pos(x, y))
    assert window.doc.selection == Selection("member", ("L1", BEAM))
    qtbot.keyClick(window.plan, Qt.Key.Key_Delete)
    assert BEAM not in _ids(window)
    assert not window.plan.selected_member
