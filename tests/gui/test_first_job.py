"""A first job from an empty project, as a new lift planner walks it: generated
framing, a lift zone, a load, the bay outcomes, a protection area, US units.
Each test pins one thing that read wrong or was cut off on screen.

Unit conversion: 1 in = 25.4 mm exactly (NIST SP 811, 2008 ed., Appendix B.8).
Everything else here is screen behaviour: ``# common practice, no source``.
The framing is a scenario.
"""

from __future__ import annotations

import re

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLineEdit

from droprig.gui import style
from droprig.gui.document import Selection
from droprig.gui.main_window import MainWindow
from droprig.gui.results_table import COL, COLUMNS
from droprig.io.sections import get_grade, get_section
from droprig.model import bays, generate_level

pytestmark = pytest.mark.gui

WAIT_MS = 20_000


def _level():
    """Three by two bays of 6 m × 5 m (scenario), as the generator makes them."""
    return generate_level(
        level_id="L1", name="Level 1", elevation=0.0, x_spacings=(6.0, 6.0, 6.0),
        y_spacings=(5.0, 5.0), girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("IPE 450"), beam_section=get_section("IPE 300"),
        girder_grade=get_grade("S355"), beam_grade=get_grade("S355"))


@pytest.fixture
def window(open_window) -> MainWindow:
    return open_window((1600, 1000))


def _framed_zone(window: MainWindow) -> None:
    from droprig.gui import edits as ed

    window.doc.edit(ed.add_level(window.doc.project, _level()), "Generate framing")
    window.actions["add_zone"].trigger()


# ------------------------------------------------------------------ inspector


def test_inspector_boxes_show_their_whole_text(qtbot, window: MainWindow) -> None:
    """A narrow inspector moves a box under its label instead of cutting its
    value ("360.00 deg") or its hint ("empty = rigid (highest contact force)")."""
    _framed_zone(window)
    window.resizeDocks([window.inspector_dock], [300], Qt.Orientation.Horizontal)
    for sel in (window.doc.selection,
                Selection("load", (window.doc.project.lift_zones[0].id, "Load 1"))):
        window.doc.select(sel)
        qtbot.wait(50)
        edits = [w for w in window.inspector.findChildren(QLineEdit) if w.isVisible()]
        assert edits
        for w in edits:
            text = w.text() or w.placeholderText()
            need = w.fontMetrics().horizontalAdvance(text)
            # common practice, no source: a value or hint is read whole, not guessed at
            assert need <= w.width() - 8 or w.width() >= 240, (text, w.width())


# ------------------------------------------------------------------ results


@pytest.mark.parametrize(("height", "system", "expected"), [
    (0.0114, "SI", "11.4 mm"),
    (0.0114, "US", "0.44 in"),  # 11.4 / 25.4 = 0.4488 in, rounded down (NIST SP 811 B.8)
    (2.5, "SI", "2.500 m"),
    (None, "US", "none"),
])
def test_short_allowable_drop_in_mm_or_in(height: float | None, system: str,
                                          expected: str) -> None:
    """An allowable drop of a few millimetres reads as such, not as "0.00 ft"
    (rounded down: it is a limit). Common practice, no source."""
    assert style.fmt_drop(height, system) == expected  # type: ignore[arg-type]


def test_allowable_drop_header_names_its_check() -> None:
    """The column gives the elastic allowable height and, in brackets, the check that
    sets it (each quantity with its own check); the height a yielding bay may be
    dropped from is a permit condition. Common practice, no source."""
    header = dict(COLUMNS)["allow"]
    assert "elastic" in header and "(check)" in header
    assert COL["allow"] == [k for k, _ in COLUMNS].index("allow")


# ------------------------------------------------------------------ protection


def test_new_protection_area_sits_under_the_crane(qtbot, window: MainWindow,
                                                  monkeypatch: pytest.MonkeyPatch) -> None:
    """With no bay selected, a new mat starts on the bay under the crane of the
    selected zone, not on the first bay of the grid. Common practice, no source."""
    from droprig.gui.inspector import FormDialog

    _framed_zone(window)
    zone = window.doc.project.lift_zones[0]
    monkeypatch.setattr(FormDialog, "exec", lambda self: 1)
    window.actions["add_protection"].trigger()
    (area,) = window.doc.project.protection_areas
    x, y = zone.crane
    r = area.area
    assert r.x0 <= x <= r.x1 and r.y0 <= y <= r.y1
    assert r in [b.rect for b in bays(window.doc.level)]


# ------------------------------------------------------------------ plan


def test_zoom_to_fit_keeps_grid_bubbles_clear_of_the_scale_bar(qtbot,
                                                               window: MainWindow) -> None:
    """After Zoom to fit the bottom grid bubbles sit above the scale bar
    (geometry of PlanView._paint_grid and _paint_scale_bar). Common practice,
    no source."""
    _framed_zone(window)
    qtbot.waitUntil(lambda: not window.runner.busy and window.doc.results_current,
                    timeout=WAIT_MS)
    plan = window.plan
    qtbot.wait(50)  # no explicit Zoom to fit: the view stays fitted as results arrive
    lv = window.doc.level
    bubble_bottom = plan._vp(lv.grid.x_lines[0], lv.grid.y_lines[0]).y() + 46.0 + 11.0
    scale_top = plan.viewport().height() - plan._caution_height() - 26.0
    assert bubble_bottom < scale_top


def test_inspector_heading_does_not_repeat_the_kind(qtbot, window: MainWindow) -> None:
    """A load named "Load 2" is headed "Load 2", not "Load Load 2"; a level named
    "Roof" keeps its kind, "Level Roof". Common practice, no source."""
    from droprig.gui.inspector import titled

    _framed_zone(window)
    window.actions["add_load"].trigger()
    sel = window.doc.selection
    assert sel is not None and sel.kind == "load"
    assert window.inspector.form is not None
    assert window.inspector.form.title == sel.ids[1] == "Load 2"
    assert titled("Level", "Roof") == "Level Roof"
    assert titled("Level", "Level 1") == "Level 1"


def test_zone_outcome_counts_each_bay_once(qtbot, window: MainWindow) -> None:
    """A zone over 6 bays with 2 loads reports 6 bays (the worst of the loads in
    each), not 12. Common practice, no source."""
    _framed_zone(window)
    zid = window.doc.project.lift_zones[0].id
    window.actions["add_load"].trigger()
    qtbot.waitUntil(lambda: not window.runner.busy and window.doc.results_current,
                    timeout=WAIT_MS)
    res = window.doc.results
    assert res is not None
    n_bays = len({b.bay_id for b in res.bays if b.zone_id == zid})
    assert len([b for b in res.bays if b.zone_id == zid]) == 2 * n_bays
    window.doc.select(Selection("zone", (zid,)))
    qtbot.wait(50)
    text = window.inspector._extra.text()
    counted = sum(int(n) for n in re.findall(r"(\d+) bay\(s\)", text))
    assert counted == n_bays
    assert "worst of 2 loads" in text
    assert style.CAUTION_SHORT in text  # verdict panel keeps the caution


def test_results_headers_are_not_cut(qtbot, window: MainWindow) -> None:
    """Every sized column of the results table is wide enough for its bold title,
    the section padding and the sort arrow. Common practice, no source."""
    from PySide6.QtGui import QFontMetrics

    from droprig.gui.results_table import HEADER_PADDING_PX, header_font

    view = window.results_table.view
    hh = view.horizontalHeader()
    fm = QFontMetrics(header_font(hh))
    for key in ("bay", "zone", "load", "outcome", "util", "allow", "planned", "governing"):
        if view.isColumnHidden(COL[key]):  # Zone, with one lift zone: not shown at all
            assert key == "zone" and len(window.doc.project.lift_zones) <= 1
            continue
        title = COLUMNS[COL[key]][1]
        assert view.columnWidth(COL[key]) >= fm.horizontalAdvance(title) + HEADER_PADDING_PX


def test_settings_say_units_do_not_change_the_design_basis(qtbot, window: MainWindow) -> None:
    """Switching to US units keeps the EN 1993-1-1 checks; the dialog says so
    instead of leaving a planner to assume AISC 360. Common practice, no source."""
    dlg = window.show_settings()
    assert not dlg.basis_note.isVisible()  # SI with EN 1993-1-1: nothing to say
    dlg.units.setCurrentIndex(dlg.units.findData("US"))
    dlg.units.activated.emit(dlg.units.currentIndex())
    assert window.doc.project.settings.unit_system == "US"
    assert dlg.basis_note.isVisible() and "EN 1993-1-1" in dlg.basis_note.text()
    qtbot.wait(20)
    note = dlg.basis_note  # the whole note is shown, not clipped by the dialog
    assert note.height() >= note.heightForWidth(note.width())
    dlg.basis.setCurrentIndex(dlg.basis.findData("aisc360"))
    dlg.basis.activated.emit(dlg.basis.currentIndex())
    assert not dlg.basis_note.isVisible()
    dlg.close()


def test_guide_asks_for_the_real_load_until_it_is_entered(qtbot, window: MainWindow) -> None:
    """A new zone starts with a placeholder load (1 t, 1 m, rigid); until the
    planner changes it, the guide above the plan says so and its button opens
    that load. Common practice, no source: a verdict on invented numbers must
    not pass for one on the planned lift."""
    from dataclasses import replace

    from droprig.gui import edits as ed

    _framed_zone(window)
    zone = window.doc.project.lift_zones[0]
    assert window.guide.isVisible()
    text = window.guide_text.text()
    assert "Load 1" in text and "1,000 kg" in text and "footprint" in text
    window.doc.select(None)
    window.guide_button.click()
    assert window.doc.selection == Selection("load", (zone.id, "Load 1"))
    real = replace(zone.loads[0], mass=2400.0, drop_height=0.3)
    window.doc.edit(ed.with_zone(window.doc.project, zone.id,
                                 replace(zone, loads=(real,))), "Load 1: mass")
    assert not window.guide.isVisible()


def test_long_guide_text_wraps_instead_of_widening_the_window(qtbot,
                                                              window: MainWindow) -> None:
    """The guide above the plan wraps; the docks keep their width. Common
    practice, no source."""
    _framed_zone(window)
    qtbot.wait(50)
    assert window.guide.isVisible() and window.guide_text.wordWrap()
    assert window.inspector_dock.width() > 200


def _dark_pixels_in_scale_bar_band(window: MainWindow) -> int:
    plan = window.plan
    img = plan.viewport().grab().toImage()
    vh = plan.viewport().height()
    y0 = int(vh - plan._caution_height() - 26.0)  # PlanView._paint_scale_bar geometry
    return sum(1 for x in range(16, 150, 2) for y in range(y0, y0 + 6)
               if img.pixelColor(x, y).lightness() < 80)


def test_empty_plan_has_no_scale_bar(qtbot, window: MainWindow) -> None:
    """A new, empty project shows no scale bar ("0 — 100 m" of nothing); the
    framed plan does. Common practice, no source."""
    qtbot.wait(50)
    assert _dark_pixels_in_scale_bar_band(window) == 0
    _framed_zone(window)
    qtbot.waitUntil(lambda: not window.runner.busy and window.doc.results_current,
                    timeout=WAIT_MS)
    qtbot.wait(50)
    assert _dark_pixels_in_scale_bar_band(window) > 0


@pytest.mark.parametrize(("system", "unit"), [("SI", "kN/mm"), ("US", "kip/in")])
def test_empty_underside_stiffness_names_its_unit(qtbot, window: MainWindow, system: str,
                                                  unit: str) -> None:
    """The underside stiffness box is empty by default (rigid load); its hint says
    what empty means and which unit a value is typed in. Common practice, no
    source."""
    from dataclasses import replace

    from droprig.gui import edits as ed

    _framed_zone(window)
    p = window.doc.project
    window.doc.edit(ed.with_settings(p, replace(p.settings, unit_system=system)), "Units")
    zid = window.doc.project.lift_zones[0].id
    window.doc.select(Selection("load", (zid, "Load 1")))
    qtbot.wait(20)
    box = window.inspector.editor("contact_stiffness")
    assert isinstance(box, QLineEdit) and box.text() == ""
    assert "rigid" in box.placeholderText() and unit in box.placeholderText()


def test_mat_stiffness_label_says_where_it_acts(qtbot, window: MainWindow) -> None:
    """A mat's stiffness is the spring under the load's footprint (model:
    ProtectionArea.stiffness); the label says so, not only the tooltip. Common
    practice, no source."""
    from droprig.gui.inspector import protection_form
    from droprig.model import ProtectionArea

    _framed_zone(window)

    lv = window.doc.level
    area = ProtectionArea(id="P1", name="Mat 1", level_id=lv.id, area=bays(lv)[0].rect)
    form = protection_form(area, window.doc.project, None)
    (spec,) = [f for f in form.fields if f.key == "stiffness"]
    assert "under the load" in spec.label


def test_every_result_cell_gives_the_advice_on_hover(qtbot, window: MainWindow) -> None:
    """The advice column sits at the far right, often out of view: hovering any
    other cell of the row (except Max U, which explains U) shows it. Common
    practice, no source."""
    _framed_zone(window)
    qtbot.waitUntil(lambda: not window.runner.busy and window.doc.results_current,
                    timeout=WAIT_MS)
    model = window.results_table.model
    assert model.rowCount() > 0
    for key in ("bay", "zone", "load", "outcome", "allow", "planned", "governing"):
        tip = model.data(model.index(0, COL[key]), Qt.ItemDataRole.ToolTipRole)
        advice = model.data(model.index(0, COL["advice"]), Qt.ItemDataRole.DisplayRole)
        assert advice and advice in tip, key


def test_cut_load_line_in_the_tree_has_the_whole_text_as_tip(qtbot,
                                                              window: MainWindow) -> None:
    """The project tree cuts "Load 1 · 1,000 kg · drop 1.000 m" in its narrow
    dock; the tip gives the whole line and the footprint. Common practice, no
    source."""
    _framed_zone(window)
    zid = window.doc.project.lift_zones[0].id
    item = window.tree.item_for(Selection("load", (zid, "Load 1")))
    assert item is not None
    tip = item.toolTip(0)
    assert item.text(0) in tip and "1,000 kg" in tip and "footprint 1.000 m × 1.000 m" in tip
