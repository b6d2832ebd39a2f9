"""Main window workflows with the real analysis: framing, a crane and its zone,
reshaping the zone as a handle drag does, undo, save and reopen, selection
between table and plan, unsaved-changes prompt, crash recovery, settings kept
in the isolated settings folder, and the ``droprig gui`` command.

Workflow tests compare the application with itself (before / after an edit,
saved / reopened); they use no expected numbers. The framing is a scenario.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import pytest
from PySide6.QtWidgets import QMessageBox

from droprig.gui import edits as ed
from droprig.gui import style
from droprig.gui.document import Document, Selection, find_recoverable
from droprig.gui.main_window import MainWindow
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftZone, Project, bays, generate_level

pytestmark = pytest.mark.gui

DEMO_DIR = Path(__file__).resolve().parents[2] / "demo_projects"
WAIT_MS = 20_000


def _level():
    """Three by two bays of 6 m × 5 m (scenario)."""
    return generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0, 6.0),
        y_spacings=(5.0, 5.0), girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("IPE 450"), beam_section=get_section("IPE 270"),
        girder_grade=get_grade("S355"), beam_grade=get_grade("S355"))


def _no_prompt(win: MainWindow) -> None:
    win._closing = True  # tests answer the unsaved-changes prompt themselves


def _window(qtbot, **kwargs: object) -> MainWindow:
    win = MainWindow(**kwargs)  # type: ignore[arg-type]
    qtbot.addWidget(win, before_close_func=_no_prompt)
    return win


@pytest.fixture
def window(qtbot) -> MainWindow:
    win = _window(qtbot, debounce_ms=30)
    win.show()
    return win


def _settle(qtbot, win: MainWindow) -> None:
    """Wait until the results on screen belong to the current project."""
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_current, timeout=WAIT_MS)


def _outcomes(win: MainWindow) -> dict[tuple[str, str, str], str]:
    res = win.doc.results
    assert res is not None
    return {(b.bay_id, b.zone_id, b.load_name): b.response for b in res.bays}


def _plan_outcomes(win: MainWindow) -> dict[str, str]:
    return {s.bay.id: s.key for s in win.plan.bay_states()}


def _framed_with_crane(qtbot, win: MainWindow) -> LiftZone:
    """Framing as the generator makes it, then a lift zone from the Lift menu."""
    win.doc.edit(ed.add_level(win.doc.project, _level()), "Generate framing")
    win.actions["add_zone"].trigger()
    zone = win.doc.project.lift_zones[0]
    # Crane west of the roof, reaching only the first column of bays (scenario).
    small = replace(zone, crane=(-4.0, 5.0), r_min=0.0, r_max=7.0)
    win.plan.zone_changed.emit(zone.id, small)
    _settle(qtbot, win)
    return win.doc.project.zone(zone.id)


# ------------------------------------------------------------------ workflow


def test_generate_add_zone_reshape_undo(qtbot, window: MainWindow) -> None:
    zone = _framed_with_crane(qtbot, window)
    assert window.doc.project.levels[0].id == "L1"
    assert window.doc.selection == Selection("zone", (zone.id,))
    small = _outcomes(window)
    assert small, "the zone reaches some bays"
    assert set(_plan_outcomes(window).values()) - {style.OUTCOME_NONE}

    # A finished handle drag: the plan emits the reshaped zone.
    window.plan.zone_changed.emit(zone.id, replace(zone, r_max=30.0))
    _settle(qtbot, window)
    large = _outcomes(window)
    assert {k[0] for k in large} > {k[0] for k in small}, "more bays are reached"
    assert large != small
    assert window.results_table.model.rowCount() == len(large)
    assert "Reshape" in window.doc.undo_stack.undoText()

    window.actions["undo"].trigger()
    _settle(qtbot, window)
    assert window.doc.project.zone(zone.id) == zone
    assert _outcomes(window) == small

    window.actions["redo"].trigger()
    _settle(qtbot, window)
    assert _outcomes(window) == large


def test_every_bay_in_the_plan_matches_the_table(qtbot, window: MainWindow) -> None:
    _framed_with_crane(qtbot, window)
    order = {k: i for i, k in enumerate(style.OUTCOME_ORDER)}
    worst: dict[str, str] = {}
    for (bay, _z, _ld), resp in _outcomes(window).items():
        if bay not in worst or order[resp] > order[worst[bay]]:
            worst[bay] = resp
    plan = _plan_outcomes(window)
    for bay in bays(window.doc.project.levels[0]):
        assert plan[bay.id] == worst.get(bay.id, style.OUTCOME_NONE)


def test_table_row_and_plan_bay_select_each_other(qtbot, window: MainWindow) -> None:
    _framed_with_crane(qtbot, window)
    table = window.results_table
    table.select_row(0)
    row = table.selected_row()
    assert row is not None
    assert window.doc.selection == Selection("bay", (row.level_id, row.bay_id))
    assert window.plan.selected_bay == row.bay_id

    other = next(b.id for b in bays(window.doc.project.levels[0])
                 if b.id != row.bay_id and any(r.bay_id == b.id
                                               for r in window.doc.results.bays))
    window.plan.bay_clicked.emit(other)
    assert window.doc.selection == Selection("bay", ("L1", other))
    assert table.selected_row().bay_id == other


def test_inspector_refusal_keeps_model_and_results(qtbot, window: MainWindow) -> None:
    zone = _framed_with_crane(qtbot, window)
    before_project, before_results = window.doc.project, window.doc.results
    window.doc.select(Selection("zone", (zone.id,)))
    edit = window.inspector.editor("r_max")
    edit.setText("-5 m")
    edit.editingFinished.emit()
    assert window.doc.project is before_project
    assert window.doc.results is before_results
    assert "Allowed" in window.inspector.message


def test_save_and_reopen_give_the_same_model_and_results(qtbot, window: MainWindow,
                                                         tmp_path: Path) -> None:
    _framed_with_crane(qtbot, window)
    path = tmp_path / "roof.droprig"
    assert window._save_to(path)
    assert not window.doc.is_dirty and not window.isWindowModified()
    saved_project, saved = window.doc.project, _outcomes(window)
    saved_bays = window.doc.results.bays

    other = _window(qtbot, debounce_ms=30)
    assert other.open_path(path, ask=False)
    _settle(qtbot, other)
    assert other.doc.project == saved_project
    assert _outcomes(other) == saved
    for a, b in zip(saved_bays, other.doc.results.bays, strict=True):
        assert a.bay_id == b.bay_id and a.response == b.response
        assert a.max_utilisation == b.max_utilisation or (
            math.isnan(a.max_utilisation) and math.isnan(b.max_utilisation))
    assert str(path.resolve()) in other.recent_files()
    other._closing = True
    other.close()


def test_open_a_broken_file_shows_a_message_and_keeps_the_project(
        qtbot, window: MainWindow, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    bad = tmp_path / "broken.droprig"
    bad.write_text('{"format_version": 1}', encoding="utf-8")
    shown: list[str] = []
    monkeypatch.setattr(QMessageBox, "critical",
                        lambda *a, **k: shown.append(a[2]) or QMessageBox.StandardButton.Ok)
    before = window.doc.project
    assert not window.open_path(bad, ask=False)
    assert window.doc.project is before
    assert shown and "broken.droprig" in shown[0]


def test_generator_dialog_adds_then_replaces_framing(qtbot, window: MainWindow,
                                                     monkeypatch: pytest.MonkeyPatch) -> None:
    from droprig.gui.generator_dialog import GeneratorDialog

    monkeypatch.setattr(GeneratorDialog, "exec", lambda self: 1)  # OK with its defaults
    window.actions["generate"].trigger()
    assert len(window.doc.project.levels) == 1
    first = window.doc.project.levels[0]
    window.actions["add_zone"].trigger()
    zone = window.doc.project.lift_zones[0]

    monkeypatch.setattr(MainWindow, "ask_replace_or_add", lambda self, name: "replace")
    window.actions["generate"].trigger()
    assert len(window.doc.project.levels) == 1
    assert window.doc.project.zone(zone.id) == zone  # the zone stays on the level
    monkeypatch.setattr(MainWindow, "ask_replace_or_add", lambda self, name: "add")
    window.actions["generate"].trigger()
    ids = [lv.id for lv in window.doc.project.levels]
    assert len(ids) == 2 and len(set(ids)) == 2 and ids[0] == first.id
    assert window.doc.level_id == ids[1]  # the plan shows the new level
    assert window.level_combo.isVisible()


def test_drawn_protection_area_goes_through_the_dialog(qtbot, window: MainWindow,
                                                       monkeypatch: pytest.MonkeyPatch) -> None:
    from droprig.gui.inspector import FormDialog
    from droprig.model import Rect

    _framed_with_crane(qtbot, window)
    window.actions["draw_protection"].trigger()
    assert window.plan.mode == "draw_protection"
    monkeypatch.setattr(FormDialog, "exec", lambda self: 1)
    window.plan.protection_drawn.emit(Rect(1.0, 1.0, 4.0, 3.0))
    assert window.plan.mode == "select"
    (area,) = window.doc.project.protection_areas
    assert area.area == Rect(1.0, 1.0, 4.0, 3.0) and area.level_id == "L1"
    assert window.doc.selection == Selection("protection", (area.id,))
    _settle(qtbot, window)
    window.actions["undo"].trigger()
    assert window.doc.project.protection_areas == ()


def test_clicked_point_shows_its_trace(qtbot, window: MainWindow) -> None:
    _framed_with_crane(qtbot, window)
    b = max(window.doc.results.bays, key=lambda r: r.max_utilisation)
    window.plan.point_clicked.emit(b.zone_id, b.load_name, b.governing_x, b.governing_y)
    trace = window.trace_panel.trace
    assert trace is not None
    assert (trace.zone_id, trace.load_name) == (b.zone_id, b.load_name)
    assert trace.steps


def test_selecting_a_row_traces_its_governing_point(qtbot, window: MainWindow) -> None:
    _framed_with_crane(qtbot, window)
    window.results_table.select_row(0)
    row = window.results_table.selected_row()
    trace = window.trace_panel.trace
    assert trace is not None
    assert (trace.x, trace.y) == (row.governing_x, row.governing_y)
    # The trace of the governing point reaches the bay's verdict (same solver).
    assert trace.response == row.response


def test_utilisation_column_sorts_by_number(qtbot, window: MainWindow) -> None:
    from PySide6.QtCore import Qt

    from droprig.gui.results_table import COL

    zone = _framed_with_crane(qtbot, window)
    window.plan.zone_changed.emit(zone.id, replace(zone, r_max=30.0))
    _settle(qtbot, window)
    view = window.results_table.view
    view.sortByColumn(COL["util"], Qt.SortOrder.AscendingOrder)
    table = window.results_table
    us = [table.model.row(table.proxy.mapToSource(table.proxy.index(r, 0)).row())
          .max_utilisation for r in range(table.proxy.rowCount())]
    assert len(us) > 2
    assert us == sorted(us)


def test_lift_choice_filters_the_table_and_the_plan(qtbot, window: MainWindow) -> None:
    _framed_with_crane(qtbot, window)
    window.actions["add_load"].trigger()
    _settle(qtbot, window)
    combo = window.case_combo
    assert combo.count() == 3  # all, and one per load
    combo.setCurrentIndex(2)
    combo.activated.emit(2)
    zid, name = combo.currentData()
    rows = [window.results_table.model.row(
        window.results_table.proxy.mapToSource(window.results_table.proxy.index(r, 0)).row())
        for r in range(window.results_table.proxy.rowCount())]
    assert rows and all((r.zone_id, r.load_name) == (zid, name) for r in rows)
    assert window.plan.case_caption().endswith(name)


# ------------------------------------------------------------------ unsaved changes


@pytest.mark.parametrize(("answer", "closes"), [
    (QMessageBox.StandardButton.Cancel, False),
    (QMessageBox.StandardButton.Discard, True),
])
def test_unsaved_changes_prompt_on_close(qtbot, monkeypatch: pytest.MonkeyPatch,
                                         answer: QMessageBox.StandardButton,
                                         closes: bool) -> None:
    win = _window(qtbot, debounce_ms=30)
    win.show()
    win.doc.edit(ed.add_level(win.doc.project, _level()), "Generate framing")
    asked: list[str] = []
    monkeypatch.setattr(QMessageBox, "warning",
                        lambda *a, **k: asked.append(a[1]) or answer)
    assert win.close() is closes
    assert asked == ["Unsaved changes"]
    if not closes:
        assert win.isVisible() and win.doc.project.levels
        win._closing = True
        win.close()


def test_unsaved_changes_save_answer_saves(qtbot, monkeypatch: pytest.MonkeyPatch,
                                           tmp_path: Path) -> None:
    path = tmp_path / "kept.droprig"
    win = _window(qtbot, debounce_ms=30)
    win.doc.edit(ed.add_level(win.doc.project, _level()), "Generate framing")
    monkeypatch.setattr(QMessageBox, "warning",
                        lambda *a, **k: QMessageBox.StandardButton.Save)
    monkeypatch.setattr("droprig.gui.window_files.QFileDialog.getSaveFileName",
                        lambda *a, **k: (str(path), ""))
    win.actions["new"].trigger()
    assert path.is_file()
    assert win.doc.project == Project() and win.doc.path is None
    win._closing = True
    win.close()


def test_no_prompt_when_nothing_changed(qtbot, monkeypatch: pytest.MonkeyPatch) -> None:
    win = MainWindow()
    qtbot.addWidget(win)
    monkeypatch.setattr(QMessageBox, "warning", lambda *a, **k: pytest.fail("asked"))
    assert win.close()


# ------------------------------------------------------------------ recovery


def test_autosave_recovery_after_a_crash(qtbot, monkeypatch: pytest.MonkeyPatch) -> None:
    crashed = _window(qtbot, debounce_ms=30)
    crashed.doc.edit(ed.add_level(crashed.doc.project, _level()), "Generate framing")
    crashed.actions["add_zone"].trigger()
    assert crashed.autosaver is not None and crashed.autosaver.write()
    lost = crashed.doc.project
    crashed.autosaver.abandon()  # the process dies here: no clean-up
    crashed.runner.shutdown()

    monkeypatch.setattr(QMessageBox, "question",
                        lambda *a, **k: QMessageBox.StandardButton.Yes)
    fresh = _window(qtbot, debounce_ms=30)
    assert fresh.offer_recovery()
    assert fresh.doc.project == lost
    assert fresh.doc.is_dirty and fresh.isWindowModified()
    _settle(qtbot, fresh)
    assert fresh.doc.results is not None and fresh.doc.results.bays
    assert [c for c in find_recoverable(fresh.settings_dir)
            if c.project_file != fresh.autosaver.project_file] == []
    fresh._closing = True
    fresh.close()


def test_declined_recovery_deletes_the_autosave(qtbot, monkeypatch: pytest.MonkeyPatch) -> None:
    crashed = _window(qtbot)
    crashed.doc.edit(ed.add_level(crashed.doc.project, _level()), "Generate framing")
    crashed.autosaver.write()
    crashed.autosaver.abandon()
    crashed.runner.shutdown()
    monkeypatch.setattr(QMessageBox, "question",
                        lambda *a, **k: QMessageBox.StandardButton.No)
    fresh = _window(qtbot)
    assert not fresh.offer_recovery()
    assert fresh.doc.project == Project()
    assert find_recoverable(fresh.settings_dir) == []


# ------------------------------------------------------------------ chrome


def test_analysis_warnings_are_said_in_the_status_bar(qtbot, window: MainWindow) -> None:
    # the crane of this scenario swings partly beyond the roof's edge: drops there are
    # not assessed, and the window must say so, not only the annex
    _framed_with_crane(qtbot, window)
    res = window.doc.results
    assert res is not None and any("beyond the deck" in w for w in res.warnings)
    assert "warning" in window.state_label.text()
    assert "beyond the deck" in window.state_label.toolTip()


def test_status_bar_shows_units_basis_state_and_caution(qtbot, window: MainWindow) -> None:
    _framed_with_crane(qtbot, window)
    assert "SI" in window.units_label.text()
    assert "EN 1993" in window.basis_label.text()
    assert window.state_label.text().startswith("Up to date")
    assert window.caution_label.isVisible()
    assert "licensed engineer" in window.caution_label.text()
    assert not window.busy.isVisible()
    window.doc.edit(ed.with_settings(window.doc.project,
                                     replace(window.doc.project.settings, unit_system="US",
                                             design_basis="aisc360")), "US")
    assert window.busy.isVisible() or window.doc.results_current
    assert "US" in window.units_label.text() and "AISC" in window.basis_label.text()
    _settle(qtbot, window)
    assert not window.busy.isVisible()


def test_standard_shortcuts(window: MainWindow) -> None:
    from PySide6.QtGui import QKeySequence

    K = QKeySequence.StandardKey
    for name, key in (("new", K.New), ("open", K.Open), ("save", K.Save),
                      ("save_as", K.SaveAs), ("undo", K.Undo), ("redo", K.Redo),
                      ("delete", K.Delete)):
        assert window.actions[name].shortcut() in QKeySequence.keyBindings(key), name
    assert window.actions["fit"].shortcut().toString()


def test_delete_action_removes_the_selected_zone_undoably(qtbot, window: MainWindow) -> None:
    zone = _framed_with_crane(qtbot, window)
    window.doc.select(Selection("zone", (zone.id,)))
    window.actions["delete"].trigger()
    assert window.doc.project.lift_zones == ()
    window.actions["undo"].trigger()
    assert window.doc.project.zone(zone.id) == zone


def test_window_geometry_is_kept_in_the_isolated_settings(qtbot) -> None:
    import os

    from PySide6.QtGui import QGuiApplication

    screen = QGuiApplication.primaryScreen().availableGeometry()
    height = screen.height() * 2 // 3  # fits the offscreen screen, differs from the default
    win = MainWindow()
    qtbot.addWidget(win)
    win.resize(win.width(), height)
    win.show()
    win.trace_dock.hide()
    win.set_overlay("utilisation")
    win.close()
    assert Path(os.environ["DROPRIG_SETTINGS_DIR"], "droprig.ini").is_file()
    again = MainWindow()
    qtbot.addWidget(again)
    again.show()
    assert again.height() == height
    assert not again.trace_dock.isVisible() and again.results_dock.isVisible()
    assert again.plan.overlay == "utilisation"
    again.close()


# ------------------------------------------------------------------ command line


def test_gui_screenshot_command(qtbot, tmp_path: Path, capsys) -> None:
    from PySide6.QtGui import QImage

    from droprig.cli import main

    png = tmp_path / "window.png"
    assert main(["gui", str(DEMO_DIR / "rooftop_plant_swap.droprig"),
                 "--screenshot", str(png)]) == 0
    img = QImage(str(png))
    assert (img.width(), img.height()) == (1600, 1000)
    assert "window saved" in capsys.readouterr().out


def test_gui_without_display_explains(monkeypatch: pytest.MonkeyPatch, capsys) -> None:
    from droprig.cli import main

    monkeypatch.setenv("QT_QPA_PLATFORM", "offscreen")
    assert main(["gui"]) == 2
    err = capsys.readouterr().err
    assert "no display" in err and "--screenshot" in err


def test_gui_missing_file(capsys, tmp_path: Path) -> None:
    from droprig.cli import main

    assert main(["gui", str(tmp_path / "nope.droprig"), "--screenshot",
                 str(tmp_path / "x.png")]) == 2
    assert "file not found" in capsys.readouterr().err


def test_document_passed_in_is_shown(qtbot) -> None:
    doc = Document(Project(levels=(_level(),)))
    win = MainWindow(doc)
    qtbot.addWidget(win)
    assert win.plan.level is not None and win.plan.level.id == "L1"
    assert win.tree.item_for(Selection("level", ("L1",))) is not None
    win.close()


def test_guide_bar_leads_a_new_user_to_an_assessable_project(qtbot, window: MainWindow) -> None:
    assert window.guide.isVisible()
    assert window.guide_button.defaultAction() is window.actions["generate"]
    window.doc.edit(ed.add_level(window.doc.project, _level()), "Generate framing")
    assert window.guide_button.defaultAction() is window.actions["add_zone"]
    window.guide_button.click()
    assert window.doc.project.lift_zones
    # the new zone's load still has its starting values: enter the real one
    assert window.guide_button.defaultAction() is window.actions["edit_load"]
    window.guide_button.click()
    assert window.doc.selection is not None and window.doc.selection.kind == "load"


def test_failed_analysis_shows_no_verdict_until_fixed(qtbot, window: MainWindow) -> None:
    zone = _framed_with_crane(qtbot, window)
    load = zone.loads[0]
    # Hook below the roof: the model refuses the drop height (load underside under the deck).
    bad = replace(load, drop_height=None, hook_elevation=5.0, hang_length=1.0)
    window.doc.edit(ed.with_load(window.doc.project, zone.id, load.name, bad), "Hook below")
    qtbot.waitUntil(lambda: not window.runner.busy, timeout=WAIT_MS)
    assert window.doc.results is None and "hook_elevation" in window.doc.analysis_error
    assert "failed" in window.state_label.text()
    assert "failed" in window.results_table.summary.text()
    assert window.results_table.model.rowCount() == 0
    assert set(_plan_outcomes(window).values()) == {style.OUTCOME_NONE}
    window.actions["undo"].trigger()
    _settle(qtbot, window)
    assert window.doc.analysis_error == "" and window.doc.results.bays


def test_project_tree_and_selection_follow_each_other(qtbot, window: MainWindow) -> None:
    zone = _framed_with_crane(qtbot, window)
    tree = window.tree
    item = tree.item_for(Selection("load", (zone.id, zone.loads[0].name)))
    assert item is not None
    tree.setCurrentItem(item)  # the user clicks the load
    assert window.doc.selection == Selection("load", (zone.id, zone.loads[0].name))
    assert window.inspector.form is not None and "Load" in window.inspector.form.title
    member = window.doc.project.levels[0].members[3]
    window.doc.select(Selection("member", ("L1", member.id)))  # e.g. from the plan
    assert tree.currentItem() is tree.item_for(Selection("member", ("L1", member.id)))
    assert tree.currentItem().parent().isExpanded()


def test_every_status_bar_caution_defers_to_a_licensed_engineer() -> None:
    # however narrow the window, the status bar's caution still names who reviews the
    # result (the user's rule for every verdict screen; its shortest form was "Caution:
    # aid only" and showed on a 768 px window)
    from droprig.gui.window_panels import CAUTION_VARIANTS

    assert all("licensed engineer" in v for v in CAUTION_VARIANTS), CAUTION_VARIANTS
