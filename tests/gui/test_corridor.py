"""Lift zone corridor edited in the GUI: drawn on the plan with the mouse
(click the corners, Enter or double-click to finish, Backspace, Esc), its corners
dragged by their handles, typed in the inspector in the user's units, cleared from
the Lift menu; every change is one undo step and the bays are re-analysed; a polygon
that crosses or touches itself or encloses no area is refused however it is entered.

Workflow tests compare the application with itself (before / after an edit,
undone); they use no expected engineering numbers. The framing and the crane
are an invented scenario. Unit conversion: 1 ft = 0.3048 m exactly
(International Yard and Pound Agreement, 1959).
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest
from PySide6.QtCore import QEvent, QPoint, QPointF, Qt
from PySide6.QtGui import QMouseEvent
from PySide6.QtWidgets import QApplication, QLineEdit, QMessageBox

from droprig.gui import edits as ed
from droprig.gui.document import Document, Selection
from droprig.gui.inspector import Inspector, corridor_text, parse_corridor
from droprig.gui.main_window import MainWindow
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftZone, Project, Settings, bays, generate_level

pytestmark = pytest.mark.gui

WAIT_MS = 20_000
SNAP_M = 0.05
"""m; drawn corners snap to 50 mm in SI, as the protection rubber band does."""
PIXEL_TOL_M = 0.25
"""m; a few screen pixels at the window's fitted zoom."""
FT = 0.3048
"""m per ft, exact (International Yard and Pound Agreement, 1959)."""
CORNERS = ((1.0, 1.0), (4.0, 1.0), (4.0, 3.5), (1.0, 3.5))
"""m; a corridor inside the south-west bay (0..6 m × 0..5 m) even when widened
by the 0.5 m drift margin (scenario)."""


def _level():
    """Three by two bays of 6 m × 5 m (scenario)."""
    return generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0, 6.0),
        y_spacings=(5.0, 5.0), girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("IPE 450"), beam_section=get_section("IPE 270"),
        girder_grade=get_grade("S355"), beam_grade=get_grade("S355"))


@pytest.fixture
def window(open_window) -> MainWindow:
    return open_window((1280, 800))


def _settle(qtbot, win: MainWindow) -> None:
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_current, timeout=WAIT_MS)


def _reached_bays(win: MainWindow) -> set[str]:
    res = win.doc.results
    assert res is not None
    return {b.bay_id for b in res.bays}


def _with_crane(qtbot, win: MainWindow) -> LiftZone:
    """Framing, then a zone from the Lift menu reaching every bay (scenario)."""
    win.doc.edit(ed.add_level(win.doc.project, _level()), "Generate framing")
    win.actions["add_zone"].trigger()
    zone = win.doc.project.lift_zones[0]
    win.plan.zone_changed.emit(zone.id, replace(zone, crane=(-4.0, 5.0), r_min=0.0,
                                                r_max=30.0))
    _settle(qtbot, win)
    assert win.doc.selection == Selection("zone", (zone.id,))
    return win.doc.project.zone(zone.id)


def _click(qtbot, win: MainWindow, x: float, y: float) -> None:
    qtbot.mouseClick(win.plan.viewport(), Qt.MouseButton.LeftButton,
                     pos=win.plan.view_pos(x, y))


def _south_west_bay(win: MainWindow) -> str:
    return next(b.id for b in bays(win.doc.project.levels[0]) if b.rect.contains(2.5, 2.0))


# ------------------------------------------------------------------ drawn on the plan


def test_drawn_corridor_reanalyses_and_undo_restores(qtbot, window: MainWindow,
                                                     tmp_path: Path) -> None:
    zone = _with_crane(qtbot, window)
    before = window.doc.results
    all_bays = _reached_bays(window)
    assert len(all_bays) == 6  # common practice, no source: the scenario reaches every bay

    window.actions["draw_corridor"].trigger()
    assert window.plan.mode == "draw_corridor"
    for x, y in CORNERS:
        _click(qtbot, window, x, y)
    assert len(window.plan.corridor_points) == 4
    window.plan.viewport().grab().save(str(tmp_path / "drawing.png"))
    with qtbot.waitSignal(window.plan.corridor_drawn, timeout=1000):
        qtbot.keyClick(window.plan, Qt.Key.Key_Return)
    assert window.plan.mode == "select"
    assert not window.actions["draw_corridor"].isChecked()

    drawn = window.doc.project.zone(zone.id).corridor
    assert len(drawn) == 4
    for (x, y), (ex, ey) in zip(drawn, CORNERS, strict=True):
        assert (x, y) == pytest.approx((ex, ey), abs=PIXEL_TOL_M)
        for v in (x, y):  # snapped like the protection rubber band (50 mm in SI)
            assert v / SNAP_M == pytest.approx(round(v / SNAP_M), abs=1e-6)
    assert "corridor" in window.doc.undo_stack.undoText()

    _settle(qtbot, window)
    # common practice, no source: the region is the sector within the corridor,
    # so only the bay holding the (widened) corridor is reached.
    assert _reached_bays(window) == {_south_west_bay(window)}
    assert window.results_table.model.rowCount() == len(window.doc.results.bays)
    window.grab().save(str(tmp_path / "corridor.png"))

    window.actions["undo"].trigger()
    _settle(qtbot, window)
    assert window.doc.project.zone(zone.id) == zone
    assert _reached_bays(window) == all_bays
    assert {(b.bay_id, b.response) for b in window.doc.results.bays} == \
        {(b.bay_id, b.response) for b in before.bays}


def test_backspace_double_click_and_escape(qtbot, window: MainWindow) -> None:
    zone = _with_crane(qtbot, window)
    window.actions["draw_corridor"].trigger()
    _click(qtbot, window, 1.0, 1.0)
    _click(qtbot, window, 4.0, 1.0)
    _click(qtbot, window, 9.0, 9.0)  # a wrong corner
    qtbot.keyClick(window.plan, Qt.Key.Key_Backspace)
    assert len(window.plan.corridor_points) == 2
    with qtbot.assertNotEmitted(window.plan.corridor_drawn):
        qtbot.keyClick(window.plan, Qt.Key.Key_Return)  # two corners: keeps drawing
    assert window.plan.mode == "draw_corridor"
    with qtbot.waitSignal(window.plan.corridor_drawn, timeout=1000):
        qtbot.mouseDClick(window.plan.viewport(), Qt.MouseButton.LeftButton,
                          pos=window.plan.view_pos(4.0, 3.5))
    assert len(window.doc.project.zone(zone.id).corridor) == 3

    drawn = window.doc.project
    window.actions["draw_corridor"].trigger()
    _click(qtbot, window, 10.0, 1.0)
    _click(qtbot, window, 12.0, 1.0)
    _click(qtbot, window, 12.0, 4.0)
    with qtbot.assertNotEmitted(window.plan.corridor_drawn):
        qtbot.keyClick(window.plan, Qt.Key.Key_Escape)
    assert window.plan.mode == "select"
    assert not window.actions["draw_corridor"].isChecked()
    assert window.doc.project is drawn  # Esc cancels: model unchanged


def test_draw_needs_a_selected_zone(qtbot, window: MainWindow) -> None:
    _with_crane(qtbot, window)
    window.doc.select(None)
    assert not window.actions["draw_corridor"].isEnabled()
    window.actions["draw_corridor"].setEnabled(True)  # e.g. a stale menu
    window.actions["draw_corridor"].trigger()
    assert window.plan.mode == "select"
    assert not window.actions["draw_corridor"].isChecked()
    assert "select a lift zone" in window.statusBar().currentMessage()


def test_lift_menu_has_draw_and_clear(window: MainWindow) -> None:
    lift = next(a.menu() for a in window.menuBar().actions() if a.text() == "&Lift")
    names = {a.objectName() for a in lift.actions()}
    assert {"action_draw_corridor", "action_clear_corridor"} <= names


def test_clear_corridor_action_and_undo(qtbot, window: MainWindow) -> None:
    zone = _with_crane(qtbot, window)
    assert not window.actions["clear_corridor"].isEnabled()
    window.doc.edit(ed.with_corridor(window.doc.project, zone.id, CORNERS), "corridor")
    assert window.actions["clear_corridor"].isEnabled()
    window.actions["clear_corridor"].trigger()
    assert window.doc.project.zone(zone.id).corridor == ()
    assert "Clear corridor" in window.doc.undo_stack.undoText()
    window.actions["undo"].trigger()
    assert window.doc.project.zone(zone.id).corridor == CORNERS


# ------------------------------------------------------------------ typed in the inspector


def _project(system: str = "SI") -> Project:
    zone = LiftZone("Z1", "West crane", "L1", crane=(-4.0, 5.0), r_min=0.0, r_max=30.0)
    return Project(settings=Settings(unit_system=system), levels=(_level(),),
                   lift_zones=(zone,))


@pytest.fixture
def inspector(qtbot) -> Inspector:
    doc = Document(_project())
    w = Inspector(doc)
    qtbot.addWidget(w)
    doc.select(Selection("zone", ("Z1",)))
    return w


def _enter(w: QLineEdit, text: str) -> None:
    w.setText(text)
    w.editingFinished.emit()


def test_inspector_text_sets_the_corridor_and_shows_it(inspector: Inspector) -> None:
    doc = inspector._doc
    edit = inspector.editor("corridor")
    assert isinstance(edit, QLineEdit)
    assert edit.text() == ""
    assert "(m)" in inspector.form.fields[-1].label  # common practice, no source: unit shown
    _enter(edit, "1,1; 4,1; 4,3.5; 1,3.5")
    assert doc.project.zone("Z1").corridor == CORNERS
    assert edit.text() == "1,1; 4,1; 4,3.5; 1,3.5"
    assert inspector.message == ""
    doc.undo_stack.undo()
    assert doc.project.zone("Z1").corridor == ()
    assert edit.text() == ""


@pytest.mark.parametrize("text, says", [
    ("1,1; 4,1", "2 point(s) refused"),
    ("1,1; a,b; 4,3.5", "cannot read 'a,b'"),
    ("1,1,1; 4,1; 4,3.5", "cannot read '1,1,1'"),
    ("1,1; 4,1; 4 kg,3.5", "cannot read '4 kg,3.5'"),
])
def test_bad_corridor_text_is_refused(inspector: Inspector, text: str, says: str) -> None:
    doc = inspector._doc
    doc.edit(ed.with_corridor(doc.project, "Z1", CORNERS), "corridor")
    before = doc.project
    _enter(inspector.editor("corridor"), text)
    assert doc.project is before  # model unchanged
    msg = inspector.message
    assert says in msg
    assert "at least 3 corner points" in msg and "Nothing was changed" in msg
    assert inspector.editor("corridor").text() == "1,1; 4,1; 4,3.5; 1,3.5"  # shows the model


def test_empty_text_clears_the_corridor(inspector: Inspector) -> None:
    doc = inspector._doc
    doc.edit(ed.with_corridor(doc.project, "Z1", CORNERS), "corridor")
    _enter(inspector.editor("corridor"), "")
    assert doc.project.zone("Z1").corridor == ()


def test_corridor_text_in_feet() -> None:
    pts = parse_corridor("0,0; 40,0; 40 ft,20; 3 m,20", "US")
    # 1 ft = 0.3048 m exactly (International Yard and Pound Agreement, 1959)
    flat = [v for p in pts for v in p]
    assert flat == pytest.approx([0.0, 0.0, 40 * FT, 0.0, 40 * FT, 20 * FT, 3.0, 20 * FT],
                                 abs=1e-12)
    assert corridor_text(pts[:3], "US") == "0,0; 40,0; 40,20"


# ------------------------------------------------------------------ corner handles


def _mouse(widget, etype: QEvent.Type, pos: QPoint, button: Qt.MouseButton,
           buttons: Qt.MouseButton) -> None:
    ev = QMouseEvent(etype, QPointF(pos), QPointF(widget.mapToGlobal(pos)), button, buttons,
                     Qt.KeyboardModifier.NoModifier)
    QApplication.sendEvent(widget, ev)


def _drag(win: MainWindow, a: tuple[float, float], b: tuple[float, float],
          steps: int = 6, release: bool = True) -> None:
    vp = win.plan.viewport()
    left = Qt.MouseButton.LeftButton
    pa, pb = win.plan.view_pos(*a), win.plan.view_pos(*b)
    _mouse(vp, QEvent.Type.MouseButtonPress, pa, left, left)
    for k in range(1, steps + 1):
        _mouse(vp, QEvent.Type.MouseMove, pa + (pb - pa) * (k / steps),
               Qt.MouseButton.NoButton, left)
    if release:
        _mouse(vp, QEvent.Type.MouseButtonRelease, pb, left, Qt.MouseButton.NoButton)


def _with_corridor(qtbot, win: MainWindow) -> LiftZone:
    zone = _with_crane(qtbot, win)
    win.doc.edit(ed.with_corridor(win.doc.project, zone.id, CORNERS), "corridor")
    _settle(qtbot, win)
    return win.doc.project.zone(zone.id)


def test_corner_handles_sit_on_the_corners(qtbot, window: MainWindow) -> None:
    zone = _with_corridor(qtbot, window)
    for i, (x, y) in enumerate(CORNERS):
        h = window.plan.handle(f"corner_{i}")
        assert h.isVisible()
        assert (h.pos().x(), -h.pos().y()) == pytest.approx((x, y), abs=1e-9)
        assert f"corner {i + 1}" in h.toolTip()
    with pytest.raises(KeyError):
        window.plan.handle("corner_4")
    window.doc.select(None)  # handles belong to the selected zone only
    assert not window.plan.handle("r_max").isVisible()
    with pytest.raises(KeyError):
        window.plan.handle("corner_0")
    window.doc.select(Selection("zone", (zone.id,)))
    assert window.plan.handle("corner_0").isVisible()


def test_corner_drag_is_one_undo_step_and_reanalyses(qtbot, window: MainWindow) -> None:
    zone = _with_corridor(qtbot, window)
    before = window.doc.results
    depth = window.doc.undo_stack.count()
    window.doc.undo_stack.setClean()
    # corner 3 out of the south-west bay, into the bay north of it (scenario)
    _drag(window, CORNERS[2], (4.0, 7.0))
    corridor = window.doc.project.zone(zone.id).corridor
    assert window.doc.undo_stack.count() == depth + 1
    assert window.doc.undo_stack.undoText() == f"Move corridor corner of lift zone {zone.id}"
    assert window.isWindowModified()
    assert corridor[2] == pytest.approx((4.0, 7.0), abs=PIXEL_TOL_M)
    for v in corridor[2]:  # snapped like drawn corners (50 mm in SI)
        assert v / SNAP_M == pytest.approx(round(v / SNAP_M), abs=1e-6)
    assert corridor[:2] == CORNERS[:2] and corridor[3] == CORNERS[3]
    h = window.plan.handle("corner_2")
    assert (h.pos().x(), -h.pos().y()) == pytest.approx(corridor[2], abs=1e-9)
    _settle(qtbot, window)
    # common practice, no source: a corridor reaching into the next bay north adds it
    assert _south_west_bay(window) in _reached_bays(window)
    assert len(_reached_bays(window)) == 2

    window.actions["undo"].trigger()
    assert window.doc.project.zone(zone.id) == zone
    _settle(qtbot, window)
    assert {(b.bay_id, b.response) for b in window.doc.results.bays} == \
        {(b.bay_id, b.response) for b in before.bays}
    window.actions["redo"].trigger()
    assert window.doc.project.zone(zone.id).corridor == corridor


def test_a_crossing_drag_is_refused_and_the_corridor_stays(qtbot, window: MainWindow) -> None:
    zone = _with_corridor(qtbot, window)
    before = window.doc.project
    depth = window.doc.undo_stack.count()
    # corner 4 dragged east past edge 2–3: a bow tie
    _drag(window, CORNERS[3], (5.0, 2.0), release=False)
    assert "will be refused" in window.plan.note  # said while dragging
    _mouse(window.plan.viewport(), QEvent.Type.MouseButtonRelease,
           window.plan.view_pos(5.0, 2.0), Qt.MouseButton.LeftButton, Qt.MouseButton.NoButton)
    assert window.doc.project is before
    assert window.doc.undo_stack.count() == depth
    msg = window.statusBar().currentMessage()
    assert "Corridor corner" in msg and "crosses or touches" in msg
    assert "simple polygon" in msg and "Nothing was changed" in msg
    assert "refused" in window.plan.note  # and beside the corner
    h = window.plan.handle("corner_3")
    assert (h.pos().x(), -h.pos().y()) == pytest.approx(CORNERS[3], abs=1e-9)
    assert window.doc.project.zone(zone.id).corridor == CORNERS


def test_corner_onto_its_neighbour_is_refused(qtbot, window: MainWindow) -> None:
    zone = _with_corridor(qtbot, window)
    before = window.doc.project
    plan = window.plan  # close in: one pixel well under the 50 mm snap
    plan.zoom_at(QPointF(plan.view_pos(2.5, 2.0)), 40.0 / plan.pixels_per_metre())
    _drag(window, CORNERS[1], CORNERS[2])
    assert window.doc.project is before
    assert "same place" in window.statusBar().currentMessage()
    assert window.doc.project.zone(zone.id).corridor == CORNERS


def test_escape_cancels_a_corner_drag(qtbot, window: MainWindow) -> None:
    zone = _with_corridor(qtbot, window)
    before = window.doc.project
    _drag(window, CORNERS[0], (0.0, 0.0), release=False)
    qtbot.keyPress(window.plan, Qt.Key.Key_Escape)
    _mouse(window.plan.viewport(), QEvent.Type.MouseButtonRelease,
           window.plan.view_pos(0.0, 0.0), Qt.MouseButton.LeftButton, Qt.MouseButton.NoButton)
    assert window.doc.project is before
    assert window.doc.project.zone(zone.id).corridor == CORNERS


def test_no_corner_handles_while_drawing(qtbot, window: MainWindow) -> None:
    _with_corridor(qtbot, window)
    window.actions["draw_corridor"].trigger()
    with pytest.raises(KeyError):
        window.plan.handle("corner_0")
    qtbot.keyClick(window.plan, Qt.Key.Key_Escape)
    assert window.plan.handle("corner_0").isVisible()


@pytest.mark.parametrize(("text", "says"), [
    ("1,1; 4,1; 4,3.5; 5,2", "edge 2–3 crosses or touches edge 4–1"),
    ("1,1; 4,1; 4,1; 1,3.5", "corners 2 and 3 are at the same place"),
    ("0,0; 2,0; 4,0", "folds back"),
])
def test_typed_self_crossing_corridor_is_refused(inspector: Inspector, text: str,
                                                 says: str) -> None:
    doc = inspector._doc
    doc.edit(ed.with_corridor(doc.project, "Z1", CORNERS), "corridor")
    before = doc.project
    _enter(inspector.editor("corridor"), text)
    assert doc.project is before
    assert says in inspector.message and "simple polygon" in inspector.message
    assert "Nothing was changed" in inspector.message


def test_drawn_self_crossing_corridor_is_refused(qtbot, window: MainWindow,
                                                 monkeypatch: pytest.MonkeyPatch) -> None:
    zone = _with_crane(qtbot, window)
    warned: list[str] = []
    monkeypatch.setattr(QMessageBox, "warning",
                        lambda parent, title, text, *a, **k: warned.append(text))
    before = window.doc.project
    window.actions["draw_corridor"].trigger()
    for x, y in ((1.0, 1.0), (4.0, 1.0), (1.0, 3.5), (4.0, 3.5)):  # a bow tie
        _click(qtbot, window, x, y)
    qtbot.keyClick(window.plan, Qt.Key.Key_Return)
    assert window.doc.project is before
    assert window.doc.project.zone(zone.id).corridor == ()
    assert len(warned) == 1 and "crosses or touches" in warned[0]
