"""Plan interaction in the whole window: a click inside a bay selects the bay
(a member only when the click is on its line), the crane and the swing zone
are selectable, the crane can be dragged (one undo step), and drawing shows
its instruction on the plan.

Behaviour of the window only; the framing is invented for the test.
"""
# These tests check the window's behaviour asked for in issue 15, not engineering values:
# no published source applies (common practice, no source).

from __future__ import annotations

import pytest
from PySide6.QtCore import QEvent, QPoint, QPointF, Qt
from PySide6.QtGui import QMouseEvent
from PySide6.QtWidgets import QApplication

from droprig.gui.document import Selection
from droprig.gui.plan_view import MEMBER_PICK_PX
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftLoad, LiftZone, Project, generate_level

pytestmark = pytest.mark.gui


def _project() -> Project:
    level = generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0), y_spacings=(5.0,),
        girder_direction="x", beam_spacing=2.5, girder_section=get_section("IPE 400"),
        beam_section=get_section("IPE 240"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(id="Z1", name="Crane", level_id="L1", crane=(-6.0, 2.5), r_min=1.0,
                    r_max=14.0, slew_start=-1.2, slew_end=1.2,
                    loads=(LiftLoad(name="Skid", mass=1500.0, drop_height=0.8),))
    return Project(levels=(level,), lift_zones=(zone,))


@pytest.fixture
def win(qtbot, open_window):
    w = open_window((1280, 720))
    w.doc.reset(_project())
    w.plan.fit()
    QApplication.processEvents()
    return w


def _send(win, kind: QEvent.Type, p: QPoint, button: Qt.MouseButton,
          buttons: Qt.MouseButton) -> None:
    vp = win.plan.viewport()
    pf = QPointF(p)
    QApplication.sendEvent(vp, QMouseEvent(kind, pf, QPointF(vp.mapToGlobal(p)), button,
                                           buttons, Qt.KeyboardModifier.NoModifier))


def _click(win, x: float, y: float) -> None:
    p = win.plan.view_pos(x, y)
    left = Qt.MouseButton.LeftButton
    _send(win, QEvent.Type.MouseButtonPress, p, left, left)
    _send(win, QEvent.Type.MouseButtonRelease, p, left, Qt.MouseButton.NoButton)
    QApplication.processEvents()


def _beams_near(win, x: float, y: float) -> float:
    """Pixels from (x, y) to the nearest member line."""
    lv = win.doc.project.level("L1")
    ppm = win.plan.pixels_per_metre()
    best = 1e9
    for m in lv.members:
        (x0, y0), (x1, y1) = m.start, m.end
        if x0 == x1:
            d = abs(x - x0) if min(y0, y1) <= y <= max(y0, y1) else 1e9
        else:
            d = abs(y - y0) if min(x0, x1) <= x <= max(x0, x1) else 1e9
        best = min(best, d * ppm)
    return best


def test_a_click_inside_a_bay_selects_the_bay(win) -> None:
    # a quarter of the way into bay 1-2/A-B: inside the bay, off every member line
    x, y = 1.5, 1.25
    assert _beams_near(win, x, y) > MEMBER_PICK_PX + 1
    _click(win, x, y)
    sel = win.doc.selection
    assert sel is not None and sel.kind == "bay" and sel.ids[0] == "L1"
    assert win.plan.selected_bay == sel.ids[1]


def test_a_click_on_a_member_line_selects_the_member(win) -> None:
    lv = win.doc.project.level("L1")
    beam = next(m for m in lv.members if m.role == "beam")
    (x0, y0), (x1, y1) = beam.start, beam.end
    _click(win, (x0 + x1) / 2, (y0 + y1) / 2)
    assert win.doc.selection == Selection("member", ("L1", beam.id))


def test_a_click_on_the_crane_selects_its_zone(win) -> None:
    win.doc.select(None)
    _click(win, -6.0, 2.5)
    assert win.doc.selection == Selection("zone", ("Z1",))


def test_a_click_in_the_swing_zone_off_the_floor_selects_the_zone(win) -> None:
    win.doc.select(None)
    _click(win, -3.0, 8.0)  # west of the floor (x ≥ 0), 6.3 m from the crane, in the arc
    assert win.doc.selection == Selection("zone", ("Z1",))


def test_dragging_the_crane_moves_it_in_one_undo_step(qtbot, win) -> None:
    before = win.doc.project
    n = win.doc.undo_stack.count()
    a = win.plan.view_pos(-6.0, 2.5)
    b = win.plan.view_pos(-4.0, 1.0)
    left = Qt.MouseButton.LeftButton
    _send(win, QEvent.Type.MouseButtonPress, a, left, left)
    for t in (0.2, 0.5, 0.8, 1.0):
        p = QPoint(round(a.x() + (b.x() - a.x()) * t), round(a.y() + (b.y() - a.y()) * t))
        _send(win, QEvent.Type.MouseMove, p, Qt.MouseButton.NoButton, left)
    assert "crane Z1 at" in win.plan.note
    _send(win, QEvent.Type.MouseButtonRelease, b, left, Qt.MouseButton.NoButton)
    QApplication.processEvents()
    cx, cy = win.doc.project.zone("Z1").crane
    tol = 0.05 + 1.0 / win.plan.pixels_per_metre()  # snap step + one pixel
    assert abs(cx - -4.0) <= tol and abs(cy - 1.0) <= tol
    assert win.doc.undo_stack.count() == n + 1
    win.doc.undo_stack.undo()
    assert win.doc.project == before


def test_drawing_shows_its_instruction_on_the_plan(win) -> None:
    assert win.plan.instruction() == ""
    win.actions["draw_protection"].trigger()
    assert "drag out" in win.plan.instruction()
    win.actions["draw_protection"].trigger()
    win.doc.select(Selection("zone", ("Z1",)))
    win.actions["draw_corridor"].trigger()
    assert "first corner" in win.plan.instruction()
    _click(win, 0.0, 0.0)
    assert "corner 2" in win.plan.instruction()
    win.plan.set_mode("select")
    assert win.plan.instruction() == ""


def test_the_plan_follows_the_document_without_the_window(qtbot) -> None:
    """PlanView(document) subscribes like the other panels: no relay needed."""
    from droprig.gui.document import Document
    from droprig.gui.plan_view import PlanView
    from droprig.model import bays

    doc = Document(_project())
    plan = PlanView(doc)
    qtbot.addWidget(plan)
    plan.resize(800, 600)
    plan.show()
    qtbot.waitExposed(plan)
    plan.fit()
    bay = bays(doc.project.level("L1"))[1]
    doc.select(Selection("bay", ("L1", bay.id)))
    assert plan.selected_bay == bay.id
    doc.select(Selection("zone", ("Z1",)))
    assert plan.selected_bay is None and plan.handle("r_max").isVisible()
    doc.set_case(("Z1", "Skid"))
    assert "Skid" in plan.case_caption() or plan._case == ("Z1", "Skid")
    first = bays(doc.project.level("L1"))[0]
    cx, cy = (first.rect.x0 + first.rect.x1) / 2, first.rect.y0 + 0.25 * first.rect.height
    p = plan.view_pos(cx, cy)
    left = Qt.MouseButton.LeftButton
    vp = plan.viewport()
    for kind, b, bs in ((QEvent.Type.MouseButtonPress, left, left),
                        (QEvent.Type.MouseButtonRelease, left, Qt.MouseButton.NoButton)):
        QApplication.sendEvent(vp, QMouseEvent(kind, QPointF(p), QPointF(vp.mapToGlobal(p)),
                                               b, bs, Qt.KeyboardModifier.NoModifier))
    assert doc.selection == Selection("bay", ("L1", first.id))


def test_bay_tags_keep_clear_of_the_zone_handles(win) -> None:
    """A selected zone's handles sit on the floor (here the outer-radius handle
    in bay 1-2); no bay tag is drawn under a handle."""
    win.doc.select(Selection("zone", ("Z1",)))
    QApplication.processEvents()
    assert win.plan.handle_rects()

    def check() -> int:
        """Tags clear of every handle; where a bay has no free place for its
        label, only the one-letter outcome tag is drawn. Returns the clear count."""
        handles = win.plan.handle_rects()
        clear = 0
        for s, lines, tag in win.plan._labels_item.plates(win.plan.viewportTransform()):
            if any(tag.intersects(h) for h in handles):
                assert len(lines) == 1 and len(lines[0]) == 1, (s.bay.id, lines, tag, handles)
            else:
                clear += 1
        return clear

    assert check() >= 1
    win.plan.zoom_by(0.6)  # smaller bays
    QApplication.processEvents()
    check()


def test_place_moves_a_plate_off_an_obstacle_inside_its_bay() -> None:
    from PySide6.QtCore import QRectF

    from droprig.gui.plan_items import BayLabelsItem

    bay = QRectF(0, 0, 100, 100)
    plate = QRectF(30, 43, 40, 14)
    handle = QRectF(45, 45, 10, 10)
    moved = BayLabelsItem.place(plate, bay, [handle])
    assert not moved.intersects(handle) and bay.contains(moved)
    assert moved.width() == plate.width()
    # the nearest free place: the plate moves no further than the handle needs
    assert abs(moved.center().y() - plate.center().y()) <= handle.height() + plate.height()
