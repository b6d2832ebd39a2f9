"""Outcomes first, limits once confirmed (droprig.gui.analysis_runner's two stages).

After an edit the window paints the outcomes of the forward analysis at once
(:func:`droprig.solver.analyse_outcomes`) and confirms the limits on the worker
thread (:func:`droprig.solver.analyse` through the window's zone cache). These tests
drive the real window on the invented rooftop demo: the outcomes shown first equal
the confirmed ones (colours, tags, U — the reference is droprig's own confirmed
analysis, an implementation property, no engineering source); no panel shows a limit,
condition or verdict before it is confirmed; rapid edits cancel stale work and the
last thing installed is the confirmed result of the last edit; the annex never takes
unconfirmed results.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import pytest

from droprig.gui import style
from droprig.gui.document import Document, Selection
from droprig.gui.main_window import MainWindow
from droprig.gui.results_table import COL, UNCONFIRMED
from droprig.io.project_file import load_project
from droprig.permit import derive_conditions
from droprig.solver import analyse, analyse_outcomes
from tests.solver.test_zone_cache import _same

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def _window(qtbot, tmp_path: Path, *, threaded: bool = True) -> MainWindow:
    win = MainWindow(Document(load_project(DEMO), DEMO), settings_dir=tmp_path,
                     autosave=False, threaded=threaded, debounce_ms=30)
    qtbot.addWidget(win, before_close_func=lambda w: setattr(w, "_closing", True))
    win.resize(1400, 900)
    win.show()
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    return win


def _table_texts(win: MainWindow) -> list[dict[str, str]]:
    m = win.results_table.model
    return [{key: str(m.data(m.index(r, c)) or "") for key, c in COL.items()}
            for r in range(m.rowCount())]


def _bay_states(win: MainWindow) -> list[tuple]:
    return [(s.bay.id, s.key, s.max_utilisation, s.n_points, s.scabbing)
            for s in win.plan.bay_states()]


R_MAX = load_project(DEMO).lift_zones[0].r_max


def _new_radius(win: MainWindow, factor: float) -> None:
    """The demo's lift zone dragged to ``factor`` × its outer radius as opened."""
    z = win.doc.project.lift_zones[0]
    win.plan.zone_changed.emit(z.id, replace(z, r_max=R_MAX * factor))


def test_outcomes_first_then_confirmed_and_never_an_untried_limit(qtbot, tmp_path) -> None:
    win = _window(qtbot, tmp_path)
    bay = win.doc.results.bays[0]
    win.doc.select(Selection("bay", (bay.level_id, bay.bay_id)))
    seen: dict[str, object] = {}

    def on_outcomes(_s: float) -> None:  # the moment the outcomes are installed
        doc = win.doc
        assert doc.results_current and not doc.results_confirmed
        assert win.runner.busy  # the confirmation is still to come
        seen["states"] = _bay_states(win)
        seen["rows"] = _table_texts(win)
        seen["inspector"] = win.inspector._extra.text()
        seen["summary"] = win.results_table.summary.text()
        seen["heading"] = win.plan_heading_text()
        seen["state"] = win.state_label.text()
        seen["results"] = doc.results
        win.set_overlay("drop_height")
        seen["drop_labels"] = [win.plan._labels_item.value_line(s)
                               for s in win.plan.bay_states()]
        seen["raster"] = win.plan.overlay_visible
        seen["tip"] = win.plan.describe(bay.governing_x, bay.governing_y)
        win.set_overlay("outcome")

    win.runner.outcomes_shown.connect(on_outcomes)
    _new_radius(win, 0.77)  # a radius the window has not analysed
    qtbot.waitUntil(lambda: "states" in seen, timeout=60_000)
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)

    # the outcomes shown first are the confirmed ones: colours, tags, U
    assert seen["states"] == _bay_states(win)
    confirmed_rows = _table_texts(win)
    assert len(seen["rows"]) == len(confirmed_rows) > 0
    for early, final in zip(seen["rows"], confirmed_rows, strict=True):
        for key in ("bay", "zone", "load", "outcome", "util", "planned", "governing"):
            assert early[key] == final[key], key
        # and not one limit, condition or verdict before it was confirmed
        for key in UNCONFIRMED:
            assert early[key] == style.CONFIRMING, (key, early[key])
    assert style.CONFIRMING in seen["inspector"]
    assert "allowable drop " + style.CONFIRMING in seen["inspector"]
    assert "confirming" in seen["summary"] and "Acceptable" not in seen["summary"]
    assert "confirmed" in seen["heading"] and "confirming" in seen["state"]
    assert all(style.CONFIRMING in line[0] for line, s in
               zip(seen["drop_labels"], win.plan.bay_states(), strict=True)
               if s.key != style.OUTCOME_NONE)
    assert seen["raster"] is False  # no map of untried heights
    assert "allowable drop " + style.CONFIRMING in seen["tip"]
    # the confirmed results are droprig's full analysis, their limits shown
    _same(win.doc.results, analyse(win.doc.project))
    assert all(r["verdict"] != style.CONFIRMING for r in confirmed_rows)
    assert style.CONFIRMING not in win.inspector._extra.text()
    # every verdict screen keeps the caution
    assert "local codes" in win.inspector._extra.text()
    early = seen["results"]
    assert len(early.bays) == len(win.doc.results.bays)


def test_unconfirmed_cells_read_as_the_permit_writes_them(qtbot, tmp_path) -> None:
    """The utilisation and planned-height cells shown before the confirmation are the
    permit's own cells of the confirmed results (droprig.permit.BayVerdict.cells)."""
    win = _window(qtbot, tmp_path, threaded=False)
    p = win.doc.project
    early = analyse_outcomes(p)
    m = win.results_table.model
    m.set_data(early, p, confirmed=False)
    permit = derive_conditions(p, analyse(p))
    cells = {(v.zone_id, v.load_name, v.bay_id): v.cells(p.settings.unit_system)
             for v in permit.bays}
    assert m.permit is None and m.rowCount() == len(cells)
    for r in range(m.rowCount()):
        b = m.row(r)
        want = cells[(b.zone_id, b.load_name, b.bay_id)]
        assert m.cell(b, "util") == want["utilisation"]
        assert m.cell(b, "planned") == want["planned"]
        assert m.verdict(b) is None and m.cell(b, "advice") == style.CONFIRMING


def test_undo_redo_install_confirmed_results_at_once(qtbot, tmp_path) -> None:
    """An edit the zone cache holds (undo, redo) has no unconfirmed stage."""
    win = _window(qtbot, tmp_path)
    _new_radius(win, 0.83)
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    stages: list[bool] = []
    win.doc.results_changed.connect(lambda _r: stages.append(win.doc.results_confirmed))
    win.doc.undo_stack.undo()
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    win.doc.undo_stack.redo()
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    assert stages == [True, True]


@pytest.mark.parametrize("gap_ms", [0, 40])
def test_rapid_edits_cancel_stale_work(qtbot, tmp_path, gap_ms: int) -> None:
    """Edits in quick succession, some landing while an earlier edit is being
    confirmed: no crash, nothing of an overtaken edit is installed, and the last
    thing installed is the confirmed result of the last edit."""
    win = _window(qtbot, tmp_path)
    installed: list[tuple[bool, bool]] = []  # (for the project on show, confirmed)
    win.doc.results_changed.connect(lambda _r: installed.append(
        (win.doc.results_current, win.doc.results_confirmed)))
    for i in range(8):
        _new_radius(win, 0.97 - 0.011 * i)
        if gap_ms:
            qtbot.wait(gap_ms)
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    qtbot.wait(100)  # anything still queued from a stale run would land now
    assert installed and all(current for current, _ in installed)
    assert installed[-1] == (True, True)
    assert win.doc.results_confirmed
    _same(win.doc.results, analyse(win.doc.project))
    assert math.isclose(win.doc.project.lift_zones[0].r_max, R_MAX * (0.97 - 0.011 * 7))


def test_annex_waits_for_confirmed_results(qtbot, tmp_path, monkeypatch) -> None:
    """Export while the limits are being confirmed: the export analyses afresh
    (confirmed) rather than print the outcomes' untried limits."""
    from droprig.gui import annex_export

    win = _window(qtbot, tmp_path, threaded=False)
    p = win.doc.project
    win.doc.set_results(analyse_outcomes(p), "", p, confirmed=False)
    taken: list[object] = []
    monkeypatch.setattr(annex_export.AnnexExport, "start", lambda self: None)
    real_init = annex_export.AnnexExport.__init__

    def init(self, project, results, *a, **k) -> None:
        taken.append(results)
        real_init(self, project, results, *a, **k)

    monkeypatch.setattr(annex_export.AnnexExport, "__init__", init)
    opts = annex_export.ExportOptions(tmp_path / "annex.pdf", None, "A4", False)
    win.export_annex(opts)
    assert taken == [None]
    win.doc.set_results(analyse(p), "", p)
    win.export_annex(opts)
    assert taken[-1] is win.doc.results


def test_an_edit_does_not_move_the_plan_or_the_table(qtbot, tmp_path) -> None:
    """At 1280 × 720 the heading and the table's summary gained a second line while an
    edit was analysed ("Results are being updated.", "(updating…)"), moving the plan
    and the table down on every edit (seen under Xvfb). The short heading carries no
    state; the summary says "Updating…" in place of the verdict of the project before
    the edit."""
    win = _window(qtbot, tmp_path)
    win.resize(1280, 720)
    qtbot.waitUntil(lambda: win.short_heading)
    before = win.plan_heading_text()
    verdict = win.results_table.model.permit.verdict_words
    win.runner._stopped = True  # hold the edit's analysis: the stale state stays on show
    _new_radius(win, 0.9)
    assert not win.doc.results_current
    assert win.plan_heading_text() == before
    summary = win.results_table.summary.text()
    assert summary.startswith("<b>Updating…</b>") and verdict not in summary
