"""Results table layout: one lift / load filter shared by the plan and the
table (set from either, both follow), Bay and Load columns frozen while the
table scrolls sideways, the whole advice of the selected row readable.

Behaviour of the window only; the demo project is an invented scenario.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtWidgets import QApplication, QTableView

from droprig.advice import advice_text
from droprig.gui.results_table import COL

pytestmark = pytest.mark.gui

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "rooftop_plant_swap.droprig"
WAIT_MS = 30_000


@pytest.fixture
def win(qtbot, open_window):
    w = open_window((1600, 1000))
    assert w.open_path(DEMO, ask=False)
    w.runner.run_now()
    qtbot.waitUntil(lambda: w.doc.results_current, timeout=WAIT_MS)
    return w


def _case_of_plan_combo(win) -> object:
    return win.case_combo.currentData()


def test_one_filter_for_plan_and_table(qtbot, win) -> None:
    z = win.doc.project.lift_zones[0]
    case = (z.id, z.loads[0].name)
    i = next(k for k in range(win.case_combo.count()) if win.case_combo.itemData(k) == case)
    win.case_combo.setCurrentIndex(i)
    win.case_combo.activated.emit(i)  # as a user's pick above the plan
    assert win.doc.case == case
    t = win.results_table
    rows = {(t.model.row(t.proxy.mapToSource(t.proxy.index(r, 0)).row()).zone_id,
             t.model.row(t.proxy.mapToSource(t.proxy.index(r, 0)).row()).load_name)
            for r in range(t.proxy.rowCount())}
    assert rows == {case}
    assert f"lift {case[0]} · {case[1]}" in t.summary.text()
    win.doc.set_case(None)  # from anywhere else: the plan's combo follows
    assert _case_of_plan_combo(win) is None
    assert t.proxy.rowCount() == len(win.doc.results.bays)


def test_a_filtered_load_that_is_deleted_falls_back_to_all(qtbot, win) -> None:
    z = win.doc.project.lift_zones[0]
    case = (z.id, z.loads[-1].name)
    win.doc.set_case(case)
    win.doc.select(None)
    from droprig.gui import edits as ed

    win.doc.edit(ed.remove_load(win.doc.project, *case), "delete")
    assert win.doc.case is None and _case_of_plan_combo(win) is None


def test_bay_and_load_stay_in_view_when_scrolled_sideways(qtbot, win) -> None:
    t = win.results_table
    frozen = t.findChild(QTableView, "frozenColumns")
    assert frozen is not None and frozen.isVisible()
    shown = [c for c in range(t.model.columnCount()) if not frozen.isColumnHidden(c)]
    assert sorted(shown) == sorted([COL["bay"], COL["load"]])
    hh = t.view.horizontalHeader()
    assert hh.visualIndex(COL["bay"]) == 0 and hh.visualIndex(COL["load"]) == 1
    t.view.horizontalScrollBar().setValue(t.view.horizontalScrollBar().maximum())
    QApplication.processEvents()
    assert frozen.geometry().left() <= t.view.frameWidth()
    assert frozen.width() == t.view.columnWidth(COL["bay"]) + t.view.columnWidth(COL["load"])


def test_the_whole_advice_of_the_selected_row_is_shown(qtbot, win) -> None:
    t = win.results_table
    t.select_row(0)
    QApplication.processEvents()
    b = t.selected_row()
    assert b is not None
    text = t.detail.text()
    system = win.doc.project.settings.unit_system
    from html import escape

    assert escape(advice_text(b, system)) in text and t.detail.isVisible()
    assert t.detail.wordWrap()
