"""The trace panel's "Verify by time history…" action, offscreen.

No engineering value is asserted against a published source here (the dialog
computes nothing — common practice, no source): the numbers it shows must be those of
droprig.solver.verify_point for the traced point (itself tested against Blevins 1979
Table 8-1 and Gere 7th ed. §9.10 in tests/solver/test_timehistory.py and
test_amplification_capped.py), with the three plots and the caution. The demo
project is an invented scenario used as input only.
"""

from __future__ import annotations

import pytest
from PySide6.QtWidgets import QMessageBox

from droprig import units
from droprig.commands.demo import demo_dir
from droprig.gui.verify_dialog import ROWS, VerifyDialog
from droprig.texts import CAUTION

pytestmark = pytest.mark.gui


def test_verify_action_shows_plots_table_and_caution(open_window, qtbot) -> None:
    from droprig.solver import analyse, verify_point

    win = open_window()
    assert win.open_path(demo_dir() / "steel_erection_floor.droprig", ask=False)
    p = win.doc.project
    from droprig.model import ModelError

    def verifiable(b) -> bool:  # a governing point off the supports
        try:
            verify_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
        except ModelError:
            return False
        return True

    bay = next(b for b in analyse(p).bays if verifiable(b))
    assert win.show_trace(bay.zone_id, bay.load_name, bay.governing_x, bay.governing_y)
    panel = win.trace_panel
    assert panel.verify_button.isEnabled()
    assert panel.verify_button.text() == "Verify by time history…"
    panel.verify_button.click()
    dlg = panel.last_dialog
    assert isinstance(dlg, VerifyDialog)
    qtbot.addWidget(dlg)
    assert dlg.isVisible()
    assert dlg.tabs.count() == 3  # force-, deflection- and moment-time
    assert [dlg.tabs.tabText(i) for i in range(3)] == ["Force", "Deflection", "Moment"]
    ref = verify_point(p, bay.zone_id, bay.load_name, bay.governing_x, bay.governing_y)
    system = p.settings.unit_system
    for i, (key, _, q) in enumerate(ROWS):
        assert dlg.table.item(i, 0).text() == units.fmt(ref.verification.energy[key], q,
                                                        system)
        assert dlg.table.item(i, 1).text() == units.fmt(
            ref.verification.time_history[key], q, system)
    assert CAUTION in dlg.caution.text().replace("&#x27;", "'")
    dlg.close()


def test_verify_action_off_without_a_trace(qtbot) -> None:
    from droprig.gui.trace_panel import TracePanel

    panel = TracePanel()
    qtbot.addWidget(panel)
    panel.set_project_source(lambda: None)
    assert not panel.verify_button.isEnabled()
    assert panel.open_verification() is None


def test_a_point_that_cannot_be_verified_gives_a_message(open_window, monkeypatch) -> None:
    from droprig.solver import analyse

    win = open_window()
    assert win.open_path(demo_dir() / "steel_erection_floor.droprig", ask=False)
    bay = analyse(win.doc.project).bays[0]
    assert win.show_trace(bay.zone_id, bay.load_name, bay.governing_x, bay.governing_y)
    seen: list[str] = []
    monkeypatch.setattr(QMessageBox, "warning",
                        lambda *a, **k: seen.append(str(a[2])))
    # the point moved off the deck (the trace kept, the project's zone renamed away)
    import droprig.report.verify_plots as vp

    def fail(*a, **k):
        from droprig.model import ModelError
        raise ModelError("verify.point", (0.0, 0.0), "a point over a deck panel")

    monkeypatch.setattr(vp, "point_verification_figures", fail)
    assert win.trace_panel.open_verification() is None
    assert seen and "verify.point" in seen[0]


def test_a_point_over_a_support_is_named_in_the_projects_units(open_window,
                                                                monkeypatch) -> None:
    # seen under Xvfb on the steel demo (US units): the welder's worst point in bay
    # 3-4/C-D on the edge girder line read "verify.point: (27.432000000000002,
    # 22.86) is not allowed; … 9.144 m along it": the point and the member in ft,
    # and what to do instead (common practice, no source)
    win = open_window()
    assert win.open_path(demo_dir() / "steel_erection_floor.droprig", ask=False)
    load = next(ld for ld in win.doc.project.lift_zones[0].loads
                if ld.name == "Engine-driven welder")
    zone = win.doc.project.lift_zones[0].id
    assert win.show_trace(zone, load.name, 90 * 0.3048, 75 * 0.3048)  # NIST SP 811 ft
    seen: list[str] = []
    monkeypatch.setattr(QMessageBox, "warning", lambda *a, **k: seen.append(str(a[2])))
    assert win.trace_panel.open_verification() is None
    assert seen, "no message"
    text = seen[0]
    assert "(90.00 ft, 75.00 ft)" in text and "over a support of member" in text
    assert " m " not in text and "verify.point" not in text and "0000" not in text


def _verify_dialog(open_window, qtbot) -> VerifyDialog:
    from droprig.model import ModelError
    from droprig.solver import analyse, verify_point

    win = open_window()
    assert win.open_path(demo_dir() / "steel_erection_floor.droprig", ask=False)
    p = win.doc.project

    def verifiable(b) -> bool:
        try:
            verify_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
        except ModelError:
            return False
        return True

    bay = next(b for b in analyse(p).bays if verifiable(b))
    assert win.show_trace(bay.zone_id, bay.load_name, bay.governing_x, bay.governing_y)
    win.trace_panel.verify_button.click()
    dlg = win.trace_panel.last_dialog
    qtbot.addWidget(dlg)
    return dlg


def test_the_table_never_needs_a_sideways_scroll(open_window, qtbot) -> None:
    """Issue 15: beside the plots the comparison table was narrower than its five
    columns and needed a sideways scroll. At a wide dialog it stands beside the plots,
    at a narrow one (a 1280 × 720 screen at 150–200 %) under them; every column is
    whole either way, and the caution stays in the dialog (common practice, no
    source)."""
    dlg = _verify_dialog(open_window, qtbot)
    seen = set()
    for size in ((1100, 600), (760, 460), (600, 330)):
        dlg.resize(*size)
        # a top-level resize arrives as an event, and in a long session the platform
        # may settle on another size than asked: judge the size the dialog has
        qtbot.wait(60)
        # beside the plots only where the table and a plot both fit (the table's
        # width follows the font the session has); stacked otherwise
        beside = dlg.side_by_side()
        if beside:
            assert dlg.tabs.width() >= 300, (size, dlg.tabs.width())
        seen.add(beside)
        t = dlg.table
        last = t.horizontalHeader().sectionViewportPosition(t.columnCount() - 1) \
            + t.columnWidth(t.columnCount() - 1)
        assert last <= t.viewport().width(), (size, last, t.viewport().width())
        assert t.horizontalScrollBar().maximum() == 0, size
        assert dlg.side_by_side() is beside, size
        # stacked, the table comes before the plots, and the caution is never
        # scrolled out of view (seen under Xvfb at 150 %: both below the fold)
        assert dlg.body.indexOf(dlg.side) == (1 if beside else 0), size
        assert dlg.caution.isVisible() and not dlg.scroll.isAncestorOf(dlg.caution)
        top = dlg.table.mapTo(dlg.scroll.viewport(), dlg.table.rect().topLeft()).y()
        assert 0 <= top < dlg.scroll.viewport().height(), (size, top)
        assert t.isVisibleTo(dlg) and dlg.caution.isVisibleTo(dlg)
        assert "licensed structural engineer" in dlg.caution.text()
    assert False in seen  # stacked at least once (a small screen)
    screen = dlg.screen().availableGeometry()
    assert dlg.width() <= screen.width() and dlg.height() <= screen.height()
    dlg.close()


def test_the_crushing_note_agrees_with_the_table() -> None:
    # seen under Xvfb on the rooftop demo (spreader on a pad, bay 1-2/A-B): the note
    # read "contact capped at 18.0 kN by crushing" beside a time-history contact force
    # of 1,647 kN; a cap the history passes is named as used up (common practice, no
    # source: a note must not contradict its table)
    from dataclasses import replace

    from droprig.commands.demo import demo_dir
    from droprig.gui.verify_dialog import crushing_note
    from droprig.io.project_file import load_project
    from droprig.model import ModelError
    from droprig.solver import analyse, verify_point

    p = load_project(demo_dir() / "steel_erection_floor.droprig")
    for b in analyse(p).bays:
        try:
            v = verify_point(p, b.zone_id, b.load_name, b.governing_x,
                             b.governing_y).verification
            break
        except ModelError:
            continue
    cap = 18.0e3
    held = replace(v, crushing_force=cap, time_history={**v.time_history, "force": cap})
    passed = replace(v, crushing_force=cap,
                     time_history={**v.time_history, "force": 90 * cap})
    assert "capped at 18.0 kN" in crushing_note(held, "SI")
    note = crushing_note(passed, "SI")
    assert "capped" not in note and "used up" in note
    assert units.fmt(90 * cap, "force", "SI") in note
    assert crushing_note(replace(v, crushing_force=float("inf")), "SI") == \
        "elastic contact (no crushing cap)"
    # steel demo, welder on bay 1-2/B-C under Xvfb: "contact capped at 12,555.95 kip by
    # crushing (crushed 0.00 in in the time history)" beside a 44.30 kip history
    never = replace(v, crushing_force=12_555.95 * 4448.2216, crush=0.0,
                    time_history={**v.time_history, "force": 44.3 * 4448.2216})
    assert crushing_note(never, "US") == ("elastic contact in the time history "
                                          "(crushing bound 12,556 kip not reached)")


def test_the_note_names_the_web_where_the_web_caps_the_contact() -> None:
    # seen under Xvfb on the two-level demo (spreader beam 4 m on the line of B2/B-C at
    # (7.5, 11.5) m): with the web's local yielding capping the contact (AISC 360-16
    # J10.2 at Fu, 1,705 kN: chain.web_contact_bound) the note read "capped at
    # 1,705.2 kN by crushing" — the deck's crushing bound there is 69 MN. The note
    # names what caps it (common practice, no source: a note must not misname its
    # mechanism)
    from droprig.gui.verify_dialog import crushing_note
    from droprig.io.project_file import load_project
    from droprig.solver import verify_point

    p = load_project(demo_dir() / "two_level_rigging.droprig")
    v = verify_point(p, "MC1", "Spreader beam 4 m", 7.5, 11.5).verification
    assert v.cap_by == "web"
    note = crushing_note(v, "SI")
    assert "web's local yielding" in note and "by crushing" not in note
    # off the beam line the deck's crushing bounds the contact
    v = verify_point(p, "MC1", "Spreader beam 4 m", 3.75, 13.5).verification
    assert v.cap_by == "crushing" and "crushing bound" in crushing_note(v, "SI")
