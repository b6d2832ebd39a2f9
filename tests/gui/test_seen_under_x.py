"""Faults seen while using the real window under an X server (Xvfb, 1280 × 720,
driven by xdotool) as a lift planner and a safety officer would, each with the
offscreen test that failed before its fix: the window growing past the screen
when a project is opened, status-bar messages with no room to show, and others
named at each test. Behaviour of the window only; the demo is an invented scenario.
"""
# These tests check the window's behaviour asked for in issue 15, not engineering values:
# no published source applies (common practice, no source).

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtWidgets import QWidget

from droprig.gui.main_window import MainWindow
from droprig.io.project_file import load_project

pytestmark = pytest.mark.gui

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"
WAIT_MS = 30_000


@pytest.fixture
def window(open_window) -> MainWindow:
    return open_window((1280, 720))


def _open_demo(qtbot, win: MainWindow) -> None:
    win.doc.reset(load_project(DEMO))
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_current,
                    timeout=WAIT_MS)
    qtbot.wait(50)


def test_opening_a_project_keeps_the_window_on_a_1280_screen(qtbot, window) -> None:
    """The results summary (verdict and the count of each outcome) was one unbroken
    line 1,015 px wide: opening the rooftop demo pushed the window to 1,306 px and
    switching to US units to 1,391 px, past a 1280 × 720 screen, with the inspector,
    the trace and the status-bar caution cut at the right edge."""
    _open_demo(qtbot, window)
    s = window.results_table.summary
    # the line set the results panel's least width (the window's font decides by
    # how much the whole window then grew): it must not
    assert s.minimumSizeHint().width() <= 400, s.minimumSizeHint().width()
    assert window.width() <= 1280, window.width()
    # the demo's plan picks up and sets down in a bay the units must be kept off
    # (droprig.permit.plan_clashes): the verdict says so, with the points
    assert s.isVisible() and "Not acceptable</b> (P1, S2 in excluded bays)" in s.text()
    assert "set-down point S2 (new unit onto the plinth) of lift zone MC1 lie in bay " \
        "2-3/A-B" in s.toolTip()
    # the whole summary is on show (wrapped, not cut)
    assert s.heightForWidth(s.width()) <= s.height() + 1, (s.width(), s.height())


def _message_room(win: MainWindow) -> int:
    """px from the status bar's left edge to the first widget still on show: the
    room QStatusBar has to paint a temporary message."""
    sb = win.statusBar()
    xs = [w.x() for w in sb.findChildren(QWidget)
          if w.isVisible() and w.parent() is sb and w.width() > 0]
    return min(xs, default=sb.width())


def test_status_messages_have_room(qtbot, window) -> None:
    """Every status-bar widget was permanent, the caution stretched over the rest:
    'Annex written: … (N pages)', 'Project closed' and the trace's error messages
    were painted in a zero-width strip and never seen."""
    _open_demo(qtbot, window)
    msg = "Annex written: /tmp/site_annex.pdf (37 pages)"
    window.statusBar().showMessage(msg, 5000)
    qtbot.wait(50)
    need = window.statusBar().fontMetrics().horizontalAdvance(msg)
    assert _message_room(window) >= need, (_message_room(window), need)
    # the caution stays on show while a message is shown, whole
    assert window.caution_label.isVisible() and window.caution_label.fits()
    window.statusBar().clearMessage()
    qtbot.wait(50)
    assert window.state_label.isVisible() and window.units_label.isVisible()


def test_a_status_message_is_not_painted_over(qtbot, window) -> None:
    """Under Xvfb an undo re-ran the analysis while the pointer's position was on
    show in the status bar: the new analysis state shared the bar out again and
    showed the units and basis, painted over "x −10.59 m, y 23.83 m". While a
    message is shown no normal widget may be; when it ends they come back."""
    _open_demo(qtbot, window)
    sb = window.statusBar()
    sb.showMessage("x −10.59 m, y 23.83 m", 5000)
    qtbot.wait(50)
    # what a new analysis state does: its text changes and the bar is shared out
    window.state_label.setText("Up to date · a state text changed by the test")
    qtbot.wait(50)
    shown = [w.objectName() for w in (window.units_label, window.basis_label,
                                       window.state_label) if w.isVisible()]
    assert shown == [], shown
    sb.clearMessage()
    qtbot.wait(50)
    assert window.units_label.isVisible() and window.basis_label.isVisible()
    assert window.state_label.isVisible()


def test_verify_dialog_text_has_no_html_entities(qtbot) -> None:
    """The time-history dialog escaped its text for HTML in labels Qt showed as plain
    text: "a ratio &#x27;verdict ÷ history&#x27;" on screen; and "r = M/mₑ 12.5"
    read as a product, not a value."""
    from PySide6.QtWidgets import QLabel

    from droprig.commands.demo import demo_dir
    from droprig.gui.verify_dialog import VerifyDialog
    from droprig.model import ModelError
    from droprig.solver import analyse, verify_point
    from droprig.texts import CAUTION

    p = load_project(demo_dir() / "steel_erection_floor.droprig")
    pv = None
    for b in analyse(p).bays:
        try:
            pv = verify_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
            break
        except ModelError:
            continue
    assert pv is not None
    dlg = VerifyDialog(pv, [], p.settings.unit_system)
    qtbot.addWidget(dlg)
    texts = [lab.text() for lab in dlg.findChildren(QLabel)]
    assert not [t for t in texts if "&#" in t or "&amp;" in t or "&quot;" in t], texts
    assert any("'verdict ÷ history'" in t for t in texts)
    assert any("r = M/mₑ = " in t and "κ = f_c/f_s = " in t for t in texts)
    assert dlg.caution.text() == CAUTION


def _planner_floor():
    """The floor a planner built under Xvfb (an invented scenario): 3 × 2 bays
    (7.5 m; 6 m and 8 m), a crane zone at the middle, a 4.2 t chiller dropped 0.3 m,
    a 350 kg spreader beam dropped 1 m, a spring mat on bay 2-3/B-C."""
    from droprig.io.sections import get_grade, get_section
    from droprig.model import (
        LiftLoad,
        LiftZone,
        Project,
        ProtectionArea,
        Rect,
        generate_level,
    )

    level = generate_level(
        level_id="L1", name="Level 1", elevation=0.0, x_spacings=(7.5, 7.5, 7.5),
        y_spacings=(6.0, 8.0), girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("IPE 450"), beam_section=get_section("IPE 300"),
        girder_grade=get_grade("S355"), beam_grade=get_grade("S355"))
    zone = LiftZone("Z1", "Lift 1", "L1", crane=(11.25, 7.0), r_min=0.0, r_max=4.9,
                    loads=(LiftLoad("Chiller CH-2", 4200.0, 2.4, 1.8, drop_height=0.3),
                           LiftLoad("Spreader beam", 350.0, drop_height=1.0,
                                    kind="rigging")))
    mat = ProtectionArea("P1", "Mat 1", "L1", Rect(7.5, 6.0, 15.0, 14.0))
    return Project(levels=(level,), lift_zones=(zone,), protection_areas=(mat,))


def test_bay_click_traces_the_load_of_the_selected_row(qtbot, window) -> None:
    """A click inside a bay selected the bay's worst row in the table (the spreader
    beam) while the trace showed the nearest point's worst case (the chiller): the
    trace named a load the highlighted row did not. Now the trace follows the
    selected row's load at the point nearest the click."""
    import numpy as np

    from droprig.gui import style
    from droprig.gui.plan_items import to_scene

    window.doc.reset(_planner_floor())
    qtbot.waitUntil(lambda: not window.runner.busy and window.doc.results_current,
                    timeout=WAIT_MS)
    plan, table = window.plan, window.results_table
    plan.fit()
    order = style.OUTCOME_ORDER

    def worst(bay_id: str) -> tuple[str, str]:
        rows = [b for b in window.doc.results.bays if b.bay_id == bay_id]
        b = max(rows, key=lambda b: (order.index(b.response) if b.response in order
                                     else -1, b.max_utilisation))
        return b.zone_id, b.load_name

    found = None
    for s in plan._bays_item.states:
        r = s.bay.rect
        for fx in np.linspace(0.05, 0.95, 19):
            for fy in np.linspace(0.05, 0.95, 19):
                x, y = r.x0 + fx * (r.x1 - r.x0), r.y0 + fy * (r.y1 - r.y0)
                if plan.member_at(x, y) is not None or plan.crane_at(
                        plan.mapFromScene(to_scene(x, y))) is not None:
                    continue
                hit = plan.nearest_point(x, y)
                if hit is not None and (hit[0].zone_id, hit[0].load_name) != worst(s.bay.id):
                    found = (x, y, s.bay.id)
                    break
            if found:
                break
        if found:
            break
    assert found is not None, "no point of the scenario where another load is worst"
    x, y, bay_id = found
    plan._click(to_scene(x, y))
    row = table.selected_row()
    assert row is not None and row.bay_id == bay_id
    assert (row.zone_id, row.load_name) == worst(bay_id)
    trace = window.trace_panel.trace
    assert trace is not None
    assert (trace.zone_id, trace.load_name) == (row.zone_id, row.load_name)


def test_bay_not_assessed_reads_as_the_legend(qtbot, window) -> None:
    """Before any lift zone, every bay was tagged "N/A" while the legend reads
    "– Not assessed": a third wording, and one a reader can take for "not
    applicable". At every bay size the tag is the legend's words or its symbol."""
    from droprig.gui import edits as ed
    from droprig.gui import style

    level = _planner_floor().levels[0]
    window.doc.edit(ed.add_level(window.doc.project, level), "Generate framing")
    qtbot.wait(100)
    item = window.plan._labels_item
    states = window.plan._bays_item.states
    assert states and all(s.key == style.OUTCOME_NONE for s in states)
    st = style.outcome(style.OUTCOME_NONE)
    allowed = {st.label.upper(), st.tag}
    for w in (20, 40, 60, 76, 90, 120, 200):
        for h in (20, 40, 80):
            lines = item.label_for(states[0], w, h)
            assert set(lines) <= allowed, (w, h, lines)


def test_settings_inspector_names_the_basis_as_the_status_bar(qtbot, window) -> None:
    """The settings inspector showed the file's key 'en1993' under Design basis
    while the status bar read 'Basis: EN 1993-1-1'."""
    from droprig.gui.document import Selection

    _open_demo(qtbot, window)
    window.doc.select(Selection("settings"))
    qtbot.wait(50)
    basis = window.inspector.editor("b").text()
    assert window.basis_label.text() == f"Basis: {basis}", basis
    assert window.units_label.text() == f"Units: {window.inspector.editor('u').text()}"


def test_generator_rows_are_never_drawn_short(qtbot) -> None:
    """Under X the 'Generate floor framing' dialog opened 3 px shorter than its
    layout needed and the framing rows (girder direction, sections) were cut at the
    bottom. Made as short as the window system allows, every box keeps its height."""
    from droprig.gui.generator_dialog import GeneratorDialog

    d = GeneratorDialog()
    qtbot.addWidget(d)
    d.show()
    qtbot.waitExposed(d)
    d.x_spacings.setText("3@7.5")  # the summary line changes as in the session
    d.resize(d.width(), 10)
    qtbot.wait(50)
    short = {k: (f.widget.height(), f.widget.sizeHint().height())
             for k, f in d._fields.items()
             if f.widget.parentWidget().height() < f.widget.sizeHint().height()}
    assert not short, short


def test_guide_button_holds_one_step(qtbot, window) -> None:
    """The guide bar's button took each next step's action on top of the last: from
    the second step on it drew a menu arrow over 'Add lift zone' and a long press
    offered the steps already done."""
    import dataclasses

    from PySide6.QtWidgets import QStyleOptionToolButton

    p = load_project(DEMO)
    window.doc.reset(dataclasses.replace(p, levels=(), lift_zones=(),
                                         protection_areas=()))
    qtbot.wait(50)
    window.doc.reset(dataclasses.replace(p, lift_zones=()))
    qtbot.wait(50)
    b = window.guide_button
    assert b.isVisible() and b.defaultAction() is window.actions["add_zone"]
    assert b.actions() == [window.actions["add_zone"]]
    opt = QStyleOptionToolButton()
    b.initStyleOption(opt)
    assert not opt.features & QStyleOptionToolButton.ToolButtonFeature.HasMenu


def test_crane_covers_no_bay_tag_or_mat_name(qtbot, window) -> None:
    """On the planner's floor the crane at the middle was drawn over the name of the
    mat under it ('Mat 1 (spring mat)') and its label over a bay's tag."""
    window.doc.reset(_planner_floor())
    qtbot.waitUntil(lambda: not window.runner.busy and window.doc.results_current,
                    timeout=WAIT_MS)
    plan = window.plan
    for size in ((1280, 720), (1600, 1000), (1100, 700)):
        window.resize(*size)
        qtbot.wait(50)
        plan.fit()
        qtbot.wait(50)
        cranes = plan._crane_obstacles()
        assert cranes
        t = plan.viewportTransform()
        names = plan._protection_labels.label_plates(t)
        assert names
        for text, r in names:
            assert not [c for c in cranes if c.intersects(r)], (size, text, r, cranes)
        for r in plan.bay_tag_rects():
            assert not [c for c in cranes if c.intersects(r)], (size, r, cranes)


def test_inspector_labels_do_not_widen_the_form(qtbot, window) -> None:
    """At 1280 × 720 under X the lift-zone form was wider than the inspector (its
    label 'Slew from (anticlockwise, from east)' on one line set the width): the
    boxes ran under the panel's edge behind a horizontal scroll bar. No label may
    ask for more width than the widest box is allowed."""
    from PySide6.QtWidgets import QLabel

    from droprig.gui.document import Selection
    from droprig.gui.inspector import FIELD_MIN_WIDTH_CAP

    _open_demo(qtbot, window)
    # the font the window had under X (9.5 pt and up, app.create_app) is larger than
    # the offscreen default: a third larger here
    font = window.inspector.font()
    font.setPointSizeF(font.pointSizeF() * 1.35)
    window.inspector.setFont(font)
    p = window.doc.project
    z = p.lift_zones[0]
    for sel in (Selection("zone", (z.id,)), Selection("load", (z.id, z.loads[0].name)),
                Selection("protection", (p.protection_areas[0].id,)), Selection("info"),
                Selection("level", (p.levels[0].id,))):
        window.doc.select(sel)
        qtbot.wait(20)
        form = window.inspector.form_editor
        wide = [(lab.text(), lab.minimumSizeHint().width())
                for lab in form.findChildren(QLabel) if lab.isVisible()
                and lab.minimumSizeHint().width() > FIELD_MIN_WIDTH_CAP]
        assert not wide, (sel.kind, wide)


def test_inspector_boxes_stay_inside_a_narrow_panel(qtbot, window) -> None:
    """At 1280 × 720 under X the lift zone's boxes beside their labels ran past the
    inspector's right edge (cut, no border): at any panel width every box of the
    form stays inside it (labels go above the boxes when both do not fit)."""
    from droprig.gui.document import Selection

    _open_demo(qtbot, window)
    font = window.inspector.font()
    font.setPointSizeF(font.pointSizeF() * 1.35)  # the X session's larger font
    window.inspector.setFont(font)
    z = window.doc.project.lift_zones[0]
    window.doc.select(Selection("zone", (z.id,)))
    qtbot.wait(20)
    form = window.inspector.form_editor
    tried = 0
    for width in range(150, 420, 7):
        form.resize(width, form.height())
        qtbot.wait(1)
        form.layout().activate()
        if width < form.minimumSizeHint().width():
            continue  # the panel scrolls sideways below the form's least width
        tried += 1
        out = [(k, w.geometry().right(), width) for k, w in form._editors.items()
               if w.isVisible() and w.geometry().right() > width]
        assert not out, out
    assert tried > 10


def test_tab_through_the_results_table_keeps_the_selected_bay(qtbot, window) -> None:
    """Seen under Xvfb (two-level demo, keyboard): a bay clicked in the plan, then Tab
    through the window; on reaching the results table Tab walked the cells of the
    table's FIRST row, selected that row's bay and re-pointed the inspector and the
    trace to a bay the user never chose. Tab now leaves the table (arrow keys move
    between its rows), and its current row follows the selected bay."""
    from PySide6.QtCore import Qt
    from PySide6.QtTest import QTest

    from droprig.gui.document import Selection

    _open_demo(qtbot, window)
    table = window.results_table
    view = table.view
    # a bay that is not the table's first row, selected as a plan click selects it
    first = table.model.row(table.proxy.mapToSource(table.proxy.index(0, 0)).row())
    other = next(table.model.row(r) for r in range(table.model.rowCount())
                 if table.model.row(r).bay_id != first.bay_id)
    chosen = Selection("bay", (other.level_id, other.bay_id))
    window.doc.select(chosen)
    qtbot.wait(20)
    assert view.currentIndex().isValid()
    current = table.model.row(table.proxy.mapToSource(view.currentIndex()).row())
    assert current.bay_id == other.bay_id  # the current row follows the selection
    view.setFocus(Qt.FocusReason.TabFocusReason)
    qtbot.waitUntil(view.hasFocus, timeout=2_000)
    for _ in range(3):
        QTest.keyClick(view, Qt.Key.Key_Tab)
        qtbot.wait(20)
    assert window.doc.selection == chosen
    assert not view.hasFocus()  # Tab moved on to the next panel
    # arrow keys still walk the rows, starting from the selected bay's row
    view.setFocus(Qt.FocusReason.MouseFocusReason)
    row = view.currentIndex().row()
    QTest.keyClick(view, Qt.Key.Key_Down if row + 1 < table.proxy.rowCount() else Qt.Key.Key_Up)
    qtbot.wait(20)
    moved = table.selected_row()
    assert moved is not None and view.currentIndex().row() != row
    assert window.doc.selection == Selection("bay", (moved.level_id, moved.bay_id))
