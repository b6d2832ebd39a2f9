"""Plan view: geometry, outcome colours and labels, overlay raster, handles, clicks.

The floor, zone and loads are invented demo scenarios (geometry only). Where a
test builds a ``Results`` by hand it checks the view's plumbing — that the plan
shows what the result contract says — never an engineering value; the
end-to-end test with the real solver runs once ``droprig.solver.analysis`` exists.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from PySide6.QtCore import QEvent, QPoint, QPointF, Qt
from PySide6.QtGui import QColor, QFontMetricsF, QMouseEvent, QWheelEvent
from PySide6.QtWidgets import QApplication

from droprig.gui import style
from droprig.gui.plan_items import BayLabelsItem, colour_values, handle_positions, pixel_font
from droprig.gui.plan_view import MIN_BAND, MIN_SWEEP, PlanView, dragged_zone
from droprig.io.sections import get_grade, get_section
from droprig.model import (
    Deck,
    LiftLoad,
    LiftZone,
    Project,
    ProtectionArea,
    Rect,
    Settings,
    bays,
    generate_level,
)
from droprig.solver.results import RESPONSES, BaySummary, CaseResult, Results
from droprig.texts import CAUTION

pytestmark = pytest.mark.gui

LENGTH_TOL = 1e-9
"""m; geometry copied through the view unchanged."""
SNAP_TOL = 0.05 + 1e-9
"""m; radius handles snap to 50 mm in SI."""
COLOUR_TOL = 2
"""8-bit channel steps lost to alpha premultiplication."""
PIXEL_TOL_M = 0.25
"""m; a few screen pixels at the test zoom (~15–20 px/m)."""


@pytest.fixture
def warehouse_floor() -> Project:
    """Invented demo: 3 × 2 bays (7.5, 7.5, 9 m by 6, 8 m), girders along x,
    beams at ≤ 2.5 m, one deck opening, a crane north of the floor swinging
    over it, one timber mat."""
    level = generate_level(
        level_id="L2", name="Level 2", elevation=4.5,
        x_spacings=(7.5, 7.5, 9.0), y_spacings=(6.0, 8.0),
        girder_direction="x", beam_spacing=2.5,
        girder_section=get_section("W21X44"), beam_section=get_section("W16X26"),
        girder_grade=get_grade("A992"), beam_grade=get_grade("A992"),
        deck=Deck(openings=(Rect(18.0, 8.0, 20.0, 10.0),)),
    )
    zone = LiftZone("Z1", "North crane", "L2", crane=(12.0, 20.0), r_min=4.0, r_max=14.0,
                    slew_start=math.radians(200), slew_end=math.radians(340),
                    drift_margin=1.0, loads=(LiftLoad("Pump skid", 1800.0, drop_height=1.0),))
    mat = ProtectionArea("M1", "Timber mat", "L2", Rect(9.0, 7.0, 13.0, 10.0))
    return Project(settings=Settings(grid_resolution=0.5), levels=(level,),
                   lift_zones=(zone,), protection_areas=(mat,))


@pytest.fixture
def view(qtbot, warehouse_floor: Project) -> PlanView:
    v = PlanView()
    qtbot.addWidget(v)
    v.resize(900, 640)
    v.show()
    qtbot.waitExposed(v)
    v.set_project(warehouse_floor, "L2")
    return v


def _case(project: Project, pts: list[tuple[float, float, int, float, float]]) -> CaseResult:
    """A CaseResult for the view's plumbing: (x, y, response, U, allowable h)."""
    level = project.levels[0]
    bl = bays(level)
    x = np.array([p[0] for p in pts])
    y = np.array([p[1] for p in pts])
    n = len(pts)
    bay = np.array([next((i for i, b in enumerate(bl) if b.rect.contains(px, py)), -1)
                    for px, py in zip(x, y, strict=True)])
    zeros = np.zeros(n)
    h = np.array([p[4] for p in pts])
    return CaseResult(
        zone_id="Z1", load_name="Pump skid", level_id="L2", mass=1800.0, weight=1800 * 9.80665,
        planned_drop_height=1.0, x=x, y=y, bay=bay, protection=-np.ones(n, dtype=int),
        drop_height=zeros + 1.0, static_deflection=zeros, effective_mass=zeros,
        dynamic_factor=zeros, peak_force=zeros, max_deflection=zeros, deceleration_g=zeros,
        utilisation=np.array([p[3] for p in pts]), governing_member=np.zeros(n, dtype=int),
        governing_check=np.zeros(n, dtype=int),
        response=np.array([p[2] for p in pts], dtype=int), allowable_drop_height=h,
        allowable_drop_height_plastic=h * 2, allowable_mass=zeros, plastic_deflection=zeros,
        ductility=zeros, support_rotation=zeros, required_mat_stiffness=zeros,
        required_crush_stroke=zeros)


def _summaries(project: Project, case: CaseResult) -> tuple[BaySummary, ...]:
    out = []
    for i, b in enumerate(bays(project.levels[0])):
        k = case.bay == i
        if not k.any():
            continue
        j = int(np.argmax(case.utilisation[k]))
        h = case.allowable_drop_height[k]
        out.append(BaySummary(
            "L2", b.id, case.zone_id, case.load_name, int(k.sum()),
            float(case.utilisation[k].max()), RESPONSES[int(case.response[k].max())],
            None if np.isnan(h).any() else float(h.min()), None,
            float(case.x[k][j]), float(case.y[k][j]), "B1/A-B", "flexure", "none"))
    return tuple(out)


@pytest.fixture
def three_outcomes(warehouse_floor: Project) -> Results:
    """One point per bay of the top row: elastic, plastic, exceeds (plumbing only)."""
    case = _case(warehouse_floor, [(4.0, 10.0, 0, 0.61, 2.0), (11.0, 11.0, 1, 1.2, 0.6),
                                   (19.0, 12.0, 2, 1.42, float("nan"))])
    return Results((case,), _summaries(warehouse_floor, case))


def _mouse(widget, etype: QEvent.Type, pos: QPoint, button: Qt.MouseButton,
           buttons: Qt.MouseButton) -> None:
    ev = QMouseEvent(etype, QPointF(pos), QPointF(widget.mapToGlobal(pos)), button, buttons,
                     Qt.KeyboardModifier.NoModifier)
    QApplication.sendEvent(widget, ev)


def _drag(view: PlanView, a: QPoint, b: QPoint, steps: int = 6) -> None:
    vp = view.viewport()
    left = Qt.MouseButton.LeftButton
    _mouse(vp, QEvent.Type.MouseButtonPress, a, left, left)
    for k in range(1, steps + 1):
        p = a + (b - a) * (k / steps)
        _mouse(vp, QEvent.Type.MouseMove, p, Qt.MouseButton.NoButton, left)
    _mouse(vp, QEvent.Type.MouseButtonRelease, b, left, Qt.MouseButton.NoButton)


def _click(view: PlanView, pos: QPoint) -> None:
    _drag(view, pos, pos, steps=0)


# ---------------------------------------------------------------- geometry


def test_framing_grid_and_bays_drawn(view: PlanView, warehouse_floor: Project) -> None:
    level = warehouse_floor.levels[0]
    girders, beams_, columns = view._framing_item.counts
    assert girders == sum(m.role == "girder" for m in level.members)
    assert beams_ == sum(m.role == "beam" for m in level.members)
    assert columns == 4 * 3  # 4 x-lines × 3 y-lines: one column per intersection
    assert [s.bay.id for s in view.bay_states()] == [b.id for b in bays(level)]
    assert view._openings_item.count == 1
    assert [a.id for a in view._protection_item.areas] == ["M1"]


def test_without_results_every_bay_says_not_assessed(view: PlanView) -> None:
    for s in view.bay_states():
        assert s.key == style.OUTCOME_NONE
        lines = view._labels_item.label_for(s, 200, 80)
        assert lines == [style.outcome(None).label.upper()]


def test_bays_follow_results_and_carry_words(view: PlanView, three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    by_id = {s.bay.id: s for s in view.bay_states()}
    assert by_id["1-2/B-C"].key == "elastic"
    assert by_id["2-3/B-C"].key == "plastic"
    assert by_id["3-4/B-C"].key == "exceeds"
    assert by_id["1-2/A-B"].key == style.OUTCOME_NONE
    assert by_id["3-4/B-C"].max_utilisation == pytest.approx(1.42)
    assert by_id["3-4/B-C"].allowable_drop_height is None  # nan point: none exists
    lines = view._labels_item.label_for(by_id["3-4/B-C"], 300, 100)
    assert lines == [style.outcome("exceeds").label.upper(), "U 1.42"]
    lines = view._labels_item.label_for(by_id["1-2/B-C"], 300, 100)
    assert lines == [style.outcome("elastic").label.upper(), "U 0.61"]


@pytest.mark.parametrize(("lines", "height"), [
    (["EXCEEDS LIMITS", "U 1.42"], 100),
    (["EXCEEDS 1.42"], 40),
    (["X 1.42"], 30),
    (["X"], 20),
])
def test_bay_label_shrinks_but_keeps_words(view: PlanView, three_outcomes: Results,
                                           lines: list[str], height: float) -> None:
    """The widest line that fits is used; the words go first, the tag last."""
    view.set_results(three_outcomes)
    s = next(s for s in view.bay_states() if s.key == "exceeds")
    labels: BayLabelsItem = view._labels_item
    width = QFontMetricsF(pixel_font(11, True)).horizontalAdvance(lines[0]) + 12
    assert labels.label_for(s, width, height) == lines
    assert labels.label_for(s, 6, 6) == []


def test_rendered_bay_pixel_has_outcome_fill(view: PlanView, three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    img = view.grab().toImage()
    # a point inside bay 1-2/B-C away from the label plate, beams and zone wash:
    p = view.view_pos(0.6, 13.4)
    got = QColor(img.pixel(p))
    want = QColor(style.outcome("elastic").fill)
    assert abs(got.red() - want.red()) + abs(got.green() - want.green()) + \
        abs(got.blue() - want.blue()) < 40


def test_case_filter_and_reset(view: PlanView, three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    view.set_case("Z1", "Other load")
    assert all(s.key == style.OUTCOME_NONE for s in view.bay_states())
    view.set_case(None)
    assert {s.key for s in view.bay_states()} == {"elastic", "plastic", "exceeds", "none"}


def test_results_none_while_analysing(view: PlanView, three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    view.set_results(None)
    assert all(s.key == style.OUTCOME_NONE for s in view.bay_states())
    assert not view.overlay_visible


# ----------------------------------------------------------------- overlay


def test_overlay_raster_uses_style_ramp(view: PlanView, three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    view.set_overlay("utilisation")
    assert view.overlay_visible
    img = view.overlay_image().toImage()
    # three points 0.5 m cells apart at least: three coloured cells, the rest clear
    opaque = [(i, j) for i in range(img.width()) for j in range(img.height())
              if QColor(img.pixelColor(i, j)).alpha() > 0]
    assert len(opaque) == 3
    got = sorted(QColor(img.pixelColor(i, j)).getRgb()[:3] for i, j in opaque)
    want = sorted(QColor(int(c) & 0xFFFFFF).getRgb()[:3]
                  for c in colour_values("utilisation", np.array([0.61, 1.2, 1.42])))
    for g, w in zip(got, want, strict=True):  # alpha premultiplication rounds by 1
        assert max(abs(a - b) for a, b in zip(g, w, strict=True)) <= COLOUR_TOL
    for u in (0.0, 0.61, 1.0, 1.42):  # the raster ramp is the style.py ramp (LUT-quantised)
        a = QColor(style.utilisation_color(u)).getRgb()[:3]
        b = QColor(int(colour_values("utilisation", np.array([u]))[0]) & 0xFFFFFF).getRgb()[:3]
        assert max(abs(p - q) for p, q in zip(a, b, strict=True)) <= COLOUR_TOL
    view.set_overlay("outcome")
    assert not view.overlay_visible
    with pytest.raises(ValueError, match="allowed"):
        view.set_overlay("rainbow")


def test_overlay_handles_ten_thousand_points(view: PlanView, warehouse_floor: Project) -> None:
    xs, ys = np.meshgrid(np.arange(0.0, 24.0, 0.25), np.arange(0.0, 14.0, 0.14))
    pts = [(float(x), float(y), 0, float(x) / 24.0, 1.0)
           for x, y in zip(xs.ravel(), ys.ravel(), strict=True)]
    assert len(pts) >= 9000
    case = _case(warehouse_floor, pts)
    view.set_results(Results((case,), _summaries(warehouse_floor, case)))
    view.set_overlay("drop_height")
    assert view.overlay_visible
    assert view._scene.items().__len__() < 30  # one raster item, not one item per point
    assert not view.grab().isNull()


# ----------------------------------------------------------------- handles


def test_handle_drag_sets_outer_radius(view: PlanView, qtbot) -> None:
    view.set_selected_zone("Z1")
    zone = view.project.zone("Z1")
    hx, hy = handle_positions(zone)["r_max"]
    assert view.handle("r_max").isVisible()
    mid = zone.slew_start + zone.slew_sweep / 2
    target = (zone.crane[0] + 16.0 * math.cos(mid), zone.crane[1] + 16.0 * math.sin(mid))
    with qtbot.waitSignal(view.zone_changed, timeout=1000) as sig:
        _drag(view, view.view_pos(hx, hy), view.view_pos(*target))
    zone_id, new = sig.args
    assert zone_id == "Z1"
    assert isinstance(new, LiftZone)
    assert new.r_max == pytest.approx(16.0, abs=PIXEL_TOL_M)
    assert new.r_min == zone.r_min
    assert (new.slew_start, new.slew_end) == (zone.slew_start, zone.slew_end)


def test_handle_drag_inside_inner_radius_is_clamped(view: PlanView, qtbot) -> None:
    view.set_selected_zone("Z1")
    zone = view.project.zone("Z1")
    hx, hy = handle_positions(zone)["r_max"]
    with qtbot.waitSignal(view.zone_changed, timeout=1000) as sig:
        _drag(view, view.view_pos(hx, hy), view.view_pos(*zone.crane))
    new = sig.args[1]
    assert new.r_max == pytest.approx(zone.r_min + MIN_BAND, abs=SNAP_TOL)
    assert new.r_max > new.r_min


def test_click_without_move_on_handle_emits_nothing(view: PlanView, qtbot) -> None:
    view.set_selected_zone("Z1")
    zone = view.project.zone("Z1")
    with qtbot.assertNotEmitted(view.zone_changed):
        _click(view, view.view_pos(*handle_positions(zone)["r_min"]))


@pytest.mark.parametrize(("kind", "turn_deg", "sweep_deg"), [
    ("slew_end", 30.0, 170.0),    # end handle counter-clockwise lengthens the arc
    ("slew_end", -30.0, 110.0),
    ("slew_start", 30.0, 110.0),  # start handle counter-clockwise shortens it
    ("slew_end", 400.0, 360.0),   # never more than a full circle
    ("slew_start", 400.0, math.degrees(MIN_SWEEP)),  # never less than the minimum
])
def test_slew_drag_math(warehouse_floor: Project, kind: str, turn_deg: float,
                        sweep_deg: float) -> None:
    zone = warehouse_floor.zone("Z1")  # 200° → 340°, 140° of arc
    new = dragged_zone(zone, kind, 0.0, 0.0, accum_angle=math.radians(turn_deg))
    assert math.degrees(new.slew_sweep) == pytest.approx(sweep_deg, abs=1e-6)
    if kind == "slew_end":
        assert new.slew_start == pytest.approx(zone.slew_start)


@pytest.mark.parametrize(("kind", "radius", "expected"), [
    ("r_min", 20.0, 14.0 - MIN_BAND),
    ("r_min", 2.03, 2.05),
    ("r_max", 500.0, 200.0),
    ("r_max", 1.0, 4.0 + MIN_BAND),
])
def test_radius_drag_math(warehouse_floor: Project, kind: str, radius: float,
                          expected: float) -> None:
    zone = warehouse_floor.zone("Z1")
    new = dragged_zone(zone, kind, zone.crane[0] + radius, zone.crane[1])
    assert getattr(new, kind) == pytest.approx(expected, abs=LENGTH_TOL)
    assert new.r_max > new.r_min


def test_slew_handle_drag_with_mouse(view: PlanView, qtbot) -> None:
    view.set_selected_zone("Z1")
    zone = view.project.zone("Z1")
    hx, hy = handle_positions(zone)["slew_end"]
    rm = (zone.r_min + zone.r_max) / 2
    a = zone.slew_start + zone.slew_sweep - math.radians(40)
    with qtbot.waitSignal(view.zone_changed, timeout=1000) as sig:
        _drag(view, view.view_pos(hx, hy),
              view.view_pos(zone.crane[0] + rm * math.cos(a), zone.crane[1] + rm * math.sin(a)))
    assert math.degrees(sig.args[1].slew_sweep) == pytest.approx(100.0, abs=1.01)


def test_set_project_during_zone_changed_is_safe(view: PlanView, qtbot,
                                                 warehouse_floor: Project) -> None:
    """The main window re-sets the project from inside the signal."""
    import dataclasses

    def apply(zone_id: str, zone: LiftZone) -> None:
        p = dataclasses.replace(warehouse_floor, lift_zones=(zone,))
        view.set_project(p, "L2")

    view.zone_changed.connect(apply)
    view.set_selected_zone("Z1")
    zone = view.project.zone("Z1")
    hx, hy = handle_positions(zone)["r_min"]
    _drag(view, view.view_pos(hx, hy), view.view_pos(hx, hy + 2.0))
    assert view.project.zone("Z1").r_min != zone.r_min
    assert view.handle("r_min").isVisible()


# ----------------------------------------------------------- clicks & hover


def test_click_emits_bay_and_nearest_point(view: PlanView, qtbot,
                                           three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    points: list[tuple] = []
    view.point_clicked.connect(lambda *a: points.append(a))
    with qtbot.waitSignal(view.bay_clicked, timeout=1000) as sig:
        _click(view, view.view_pos(11.2, 10.9))
    assert sig.args == ["2-3/B-C"]
    assert points == [("Z1", "Pump skid", 11.0, 11.0)]
    assert view.selected_bay == "2-3/B-C"


def test_click_far_from_points_picks_no_point(view: PlanView, qtbot,
                                              three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    with qtbot.assertNotEmitted(view.point_clicked):
        _click(view, view.view_pos(3.0, 2.0))


def test_hover_text_in_project_units(view: PlanView, three_outcomes: Results,
                                     warehouse_floor: Project) -> None:
    view.set_results(three_outcomes)
    text = view.describe(11.0, 11.0)
    assert "2-3/B-C" in text and "1.20" in text and "0.600 m" in text
    import dataclasses

    us = dataclasses.replace(warehouse_floor, settings=Settings(unit_system="US"))
    view.set_project(us, "L2")
    text = view.describe(11.0, 11.0)
    assert "1.96 ft" in text  # 0.6 m = 1.9685 ft; an allowable height is rounded down


def test_hover_over_several_loads_names_the_load_behind_each_number(
        view: PlanView, warehouse_floor: Project) -> None:
    # the worst of several loads: the greatest U (the light hard item) and the least
    # allowable height (the heavy unit) come from different loads; the hover names
    # each, never one sentence mixing two loads' numbers unnamed (common practice,
    # no source: a reading must say what it is of)
    import dataclasses

    heavy = _case(warehouse_floor, [(11.0, 11.0, 2, 2.8, 0.013)])
    light = dataclasses.replace(_case(warehouse_floor, [(11.0, 11.0, 2, 9.75, 0.05)]),
                                load_name="Spreader")
    both = Results((heavy, light), _summaries(warehouse_floor, heavy)
                   + _summaries(warehouse_floor, light))
    view.set_results(both)
    text = view.describe(11.0, 11.0)
    assert "max U 9.75 (Spreader)" in text
    assert "least allowable drop 13.0 mm for Pump skid" in text
    view.set_case("Z1", "Spreader")
    text = view.describe(11.0, 11.0)
    assert "max U 9.75," in text and "allowable drop 50.0 mm (" in text
    assert "least" not in text


# ------------------------------------------------------------- protection


def test_rubber_band_draws_protection(view: PlanView, qtbot) -> None:
    view.set_mode("draw_protection")
    with qtbot.waitSignal(view.protection_drawn, timeout=1000) as sig:
        _drag(view, view.view_pos(2.0, 3.0), view.view_pos(6.0, 1.0))
    r = sig.args[0]
    assert isinstance(r, Rect)
    assert (r.x0, r.y0, r.x1, r.y1) == pytest.approx((2.0, 1.0, 6.0, 3.0), abs=PIXEL_TOL_M)
    for v in (r.x0, r.y0, r.x1, r.y1):  # corners snap to 50 mm in SI
        assert v / 0.05 == pytest.approx(round(v / 0.05), abs=1e-6)


def test_tiny_rubber_band_is_refused(view: PlanView, qtbot) -> None:
    view.set_mode("draw_protection")
    with qtbot.assertNotEmitted(view.protection_drawn):
        _drag(view, view.view_pos(2.0, 3.0), view.view_pos(2.05, 3.0))


# ----------------------------------------------------------- view chrome


def test_fit_zoom_and_caution(view: PlanView, qtbot, three_outcomes: Results) -> None:
    view.fit()
    s0 = view.pixels_per_metre()
    view.zoom_by(2.0)
    assert view.pixels_per_metre() == pytest.approx(2 * s0)
    view.fit()
    assert view.pixels_per_metre() == pytest.approx(s0)
    qtbot.keyClick(view, Qt.Key.Key_Plus)
    assert view.pixels_per_metre() == pytest.approx(1.25 * s0)
    qtbot.keyClick(view, Qt.Key.Key_Minus)
    assert view.pixels_per_metre() == pytest.approx(s0)
    assert view._caution_lines() == []  # no verdict shown, no caution strip
    view.set_results(three_outcomes)
    assert " ".join(view._caution_lines()) == CAUTION


def test_wheel_zoom_keeps_point_under_mouse(view: PlanView) -> None:
    pos = view.view_pos(20.0, 4.0)
    before = view.mapToScene(pos)
    s0 = view.pixels_per_metre()
    ev = QWheelEvent(QPointF(pos), QPointF(view.viewport().mapToGlobal(pos)), QPoint(0, 0),
                     QPoint(0, 240), Qt.MouseButton.NoButton, Qt.KeyboardModifier.NoModifier,
                     Qt.ScrollPhase.NoScrollPhase, False)
    QApplication.sendEvent(view.viewport(), ev)
    assert view.pixels_per_metre() == pytest.approx(s0 * 1.0015 ** 240)
    after = view.mapToScene(pos)
    assert (after.x(), after.y()) == pytest.approx((before.x(), before.y()),
                                                   abs=2 / view.pixels_per_metre())


@pytest.mark.parametrize("how", ["middle", "space"])
def test_pan_by_dragging(view: PlanView, qtbot, how: str) -> None:
    a = view.view_pos(10.0, 5.0)
    b = a + QPoint(60, -40)
    before = view.mapToScene(a)
    vp = view.viewport()
    if how == "middle":
        btn = Qt.MouseButton.MiddleButton
    else:
        btn = Qt.MouseButton.LeftButton
        qtbot.keyPress(view, Qt.Key.Key_Space)
    with qtbot.assertNotEmitted(view.bay_clicked):
        _mouse(vp, QEvent.Type.MouseButtonPress, a, btn, btn)
        _mouse(vp, QEvent.Type.MouseMove, b, Qt.MouseButton.NoButton, btn)
        _mouse(vp, QEvent.Type.MouseButtonRelease, b, btn, Qt.MouseButton.NoButton)
    if how == "space":
        qtbot.keyRelease(view, Qt.Key.Key_Space)
    after = view.mapToScene(b)
    assert (after.x(), after.y()) == pytest.approx((before.x(), before.y()),
                                                   abs=1.5 / view.pixels_per_metre())


def test_hover_signal_on_mouse_move(view: PlanView, qtbot, three_outcomes: Results) -> None:
    view.set_results(three_outcomes)
    with qtbot.waitSignal(view.hover_text, timeout=1000) as sig:
        _mouse(view.viewport(), QEvent.Type.MouseMove, view.view_pos(19.1, 12.1),
               Qt.MouseButton.NoButton, Qt.MouseButton.NoButton)
    assert "3-4/B-C" in sig.args[0] and "exceeds limits" in sig.args[0]
    assert "allowable drop none" in sig.args[0]  # nan shown as a word, never "nan"


def test_escape_cancels_handle_drag(view: PlanView, qtbot) -> None:
    view.set_selected_zone("Z1")
    zone = view.project.zone("Z1")
    hx, hy = handle_positions(zone)["r_max"]
    vp = view.viewport()
    left = Qt.MouseButton.LeftButton
    with qtbot.assertNotEmitted(view.zone_changed):
        _mouse(vp, QEvent.Type.MouseButtonPress, view.view_pos(hx, hy), left, left)
        _mouse(vp, QEvent.Type.MouseMove, view.view_pos(hx, hy - 3.0),
               Qt.MouseButton.NoButton, left)
        qtbot.keyPress(view, Qt.Key.Key_Escape)
        _mouse(vp, QEvent.Type.MouseMove, view.view_pos(hx, hy - 4.0),
               Qt.MouseButton.NoButton, left)
        _mouse(vp, QEvent.Type.MouseButtonRelease, view.view_pos(hx, hy - 4.0), left,
               Qt.MouseButton.NoButton)
    p = view.handle("r_max").pos()
    assert (p.x(), -p.y()) == pytest.approx((hx, hy), abs=LENGTH_TOL)


def test_empty_and_odd_inputs_never_raise(qtbot, warehouse_floor: Project) -> None:
    v = PlanView()
    qtbot.addWidget(v)
    v.resize(500, 400)
    for project, level in ((None, None), (Project(), None), (warehouse_floor, "no-such")):
        v.set_project(project, level)
        v.set_results(Results())
        v.set_overlay("utilisation")
        v.set_case("Z9", "nothing")
        v.select_bay("9-9/Z-Z")
        v.set_selected_zone("Z9")
        v.fit()
        assert not v.grab().isNull()
        _click(v, QPoint(100, 100))
        v.set_overlay("outcome")
    assert v.level is not None and v.level.id == "L2"  # unknown id: the first level
    assert not any(v.handle(k).isVisible() for k in ("r_min", "r_max"))


# ------------------------------------------------------- with the real solver


def _nearest_outcome(c: QColor) -> str:
    def dist(key: str) -> int:
        f = QColor(style.outcome(key).fill)
        return abs(f.red() - c.red()) + abs(f.green() - c.green()) + abs(f.blue() - c.blue())

    return min((*style.OUTCOME_ORDER, style.OUTCOME_NONE), key=dist)


@pytest.mark.parametrize("case", [None, ("Z1", "Pump skid"), ("Z1", "Hand tools")])
def test_plan_follows_the_solver(view: PlanView, qtbot, warehouse_floor: Project,
                                 case: tuple[str, str] | None) -> None:
    """Bays show the worst BaySummary response of droprig.solver.analysis.analyse for
    the chosen case (or over all cases), in words and in paint; a click returns a
    drop point the solver analysed."""
    import dataclasses

    from droprig.solver.analysis import analyse

    zone = warehouse_floor.zone("Z1")
    zone = dataclasses.replace(zone, loads=(*zone.loads,
                                            LiftLoad("Hand tools", 20.0, drop_height=0.25)))
    project = dataclasses.replace(warehouse_floor, lift_zones=(zone,))
    results = analyse(project)
    assert results.cases and results.bays
    view.set_project(project, "L2")
    view.set_results(results)
    view.set_case(*(case or (None,)))
    worst: dict[str, str] = {}
    for s in results.bays:
        if case is None or (s.zone_id, s.load_name) == case:
            worst[s.bay_id] = style.worst([worst.get(s.bay_id, "none"), s.response])
    img = view.grab().toImage()
    labels = view._labels_item
    for state in view.bay_states():
        assert state.key == worst.get(state.bay.id, style.OUTCOME_NONE)
        # most pixels of a patch near the bay's corner read as that outcome's colour
        # (a majority, as hatch strokes, zone arcs and beams cross the patch)
        r = state.bay.rect
        p = view.view_pos(r.x0 + 0.1 * r.width, r.y0 + 0.2 * r.height)
        votes = [_nearest_outcome(QColor(img.pixel(p.x() + i, p.y() + j)))
                 for i in range(-4, 5) for j in range(-4, 5)]
        assert max(set(votes), key=votes.count) == state.key
        words = labels.label_for(state, 400, 100)
        assert words[0] == style.outcome(state.key).label.upper()
    shown = [c for c in results.cases if case is None or (c.zone_id, c.load_name) == case]
    c0 = shown[-1]
    k = int(np.argmax(np.nan_to_num(c0.utilisation, posinf=1e9)))
    with qtbot.waitSignal(view.point_clicked, timeout=1000) as sig:
        _click(view, view.view_pos(float(c0.x[k]), float(c0.y[k])))
    zone_id, load, x, y = sig.args
    hit = next(c for c in shown if (c.zone_id, c.load_name) == (zone_id, load))
    assert any(math.isclose(x, float(a)) and math.isclose(y, float(b))
               for a, b in zip(hit.x, hit.y, strict=True))
    view.set_overlay("drop_height")
    assert view.overlay_visible


def test_drift_band_is_the_computed_margin(view: PlanView, warehouse_floor: Project) -> None:
    # Plain kinematics (v = ωR over the fall time √(2h/g); Meriam & Kraige — from
    # memory): a zone in computed mode draws the margin the analysis uses, not the
    # stored value. Hand calculation: ω = 0.1 rad/s at r_max = 14 m, a 1 m fall from
    # rest, t = √(2·1/9.80665) = 0.4516 s, drift 0.1·14·0.4516 = 0.6322 m.
    import dataclasses

    from droprig.gui.plan_items import drift_band

    z = dataclasses.replace(warehouse_floor.lift_zones[0], drift_mode="computed",
                            slew_speed=0.1, drift_margin=3.0)
    view.set_project(dataclasses.replace(warehouse_floor, lift_zones=(z,)), "L2")
    item = view._zones_item
    shown = item.margin_of(item.shown_zones()[0])
    assert shown == pytest.approx(0.1 * 14.0 * math.sqrt(2.0 / 9.80665), rel=1e-4)
    outer = drift_band(z, shown).boundingRect()
    stale = drift_band(z).boundingRect()  # the stored 3 m band is wider
    assert outer.width() < stale.width()
    # a zone in given mode draws what was entered
    view.set_project(warehouse_floor, "L2")
    assert view._zones_item.margin_of(view._zones_item.shown_zones()[0]) == 1.0


def test_scabbing_mark_on_bays_that_may_scab(view: PlanView, warehouse_floor: Project,
                                             three_outcomes: Results) -> None:
    # plumbing only: a summary flagged scabbing puts the mark in its bay and the key
    import dataclasses

    bays_ = tuple(dataclasses.replace(b, scabbing=(b.bay_id == "2-3/B-C"))
                  for b in three_outcomes.bays)
    view.set_results(Results(three_outcomes.cases, bays_))
    by_id = {s.bay.id: s for s in view.bay_states()}
    assert by_id["2-3/B-C"].scabbing and not by_id["1-2/B-C"].scabbing
    t = view.viewportTransform()
    marks = view._labels_item.scabbing_marks(t)
    assert len(marks) == 1
    bay = t.mapRect(rect_to_scene_of(by_id["2-3/B-C"]))
    assert bay.contains(marks[0])
    assert ("sym", "scabbing") in view._legend_rows()
    view.set_results(three_outcomes)
    assert ("sym", "scabbing") not in view._legend_rows()


def rect_to_scene_of(state):  # type: ignore[no-untyped-def]
    from droprig.gui.plan_items import rect_to_scene

    return rect_to_scene(state.bay.rect)


def _bubble_box(c: QPointF, r: float = 11.0):
    from PySide6.QtCore import QRectF

    return QRectF(c.x() - r, c.y() - r, 2 * r, 2 * r)


@pytest.mark.parametrize("where", ["west_of_B", "north_of_2", "corner", "inside"])
def test_grid_bubbles_keep_clear_of_the_crane(view: PlanView, warehouse_floor: Project,
                                              where: str) -> None:
    """Issue 15 at 1280 × 720: the crane symbol covered a grid bubble. A bubble in
    the way moves out along its own grid line (the crane stays where it stands)."""
    from dataclasses import replace

    from droprig.gui.plan_view import BUBBLE_OFFSET_PX, CRANE_SYMBOL_RADIUS_PX

    g = warehouse_floor.level("L2").grid
    view.fit()
    scale = view.transform().m11()  # px per m
    off_m = BUBBLE_OFFSET_PX / scale
    crane = {"west_of_B": (g.x_lines[0] - off_m, g.y_lines[1]),  # on bubble B, west
             "north_of_2": (g.x_lines[1], g.y_lines[-1] + off_m),  # on bubble 2, north
             "corner": (g.x_lines[0] - off_m * 0.8, g.y_lines[0] - off_m * 0.9),
             "inside": (10.0, 5.0)}[where]
    zone = replace(warehouse_floor.lift_zones[0], crane=crane)
    view.set_project(replace(warehouse_floor, lift_zones=(zone,)), "L2")
    bubbles = view.grid_bubbles()
    assert len(bubbles) == 2 * (len(g.x_lines) + len(g.y_lines))
    c = view._vp(*crane)
    k = CRANE_SYMBOL_RADIUS_PX
    from PySide6.QtCore import QRectF

    symbol = QRectF(c.x() - k, c.y() - k, 2 * k, 2 * k)
    obstacles = view._crane_obstacles()
    assert any(o.contains(c) for o in obstacles)
    for b in bubbles:
        box = _bubble_box(b.centre)
        assert not box.intersects(symbol), (b, where)
        assert not any(box.intersects(o) for o in obstacles), (b, where)
    # each bubble stays on its own grid line, outside the framing
    for x, lab in zip(g.x_lines, g.x_labels, strict=True):
        on = [b for b in bubbles if b.axis == "x" and b.label == lab]
        assert [round(b.centre.x(), 6) for b in on] == [round(view._vp(x, 0).x(), 6)] * 2
        top, bot = view._vp(x, g.y_lines[-1]).y(), view._vp(x, g.y_lines[0]).y()
        assert on[0].centre.y() <= top - BUBBLE_OFFSET_PX + 1e-6
        assert on[1].centre.y() >= bot + BUBBLE_OFFSET_PX - 1e-6
    for y, lab in zip(g.y_lines, g.y_labels, strict=True):
        on = [b for b in bubbles if b.axis == "y" and b.label == lab]
        assert [round(b.centre.y(), 6) for b in on] == [round(view._vp(0, y).y(), 6)] * 2
    if where == "west_of_B":  # that bubble did have to move
        b = next(b for b in bubbles if b.axis == "y" and b.label == g.y_labels[1])
        assert b.centre.x() < view._vp(g.x_lines[0], 0).x() - BUBBLE_OFFSET_PX - 20
    view.viewport().grab()  # paints without error


@pytest.mark.parametrize("size", [(900, 640), (326, 191)])
def test_grid_bubbles_never_overlap_each_other(view: PlanView, size) -> None:
    """Seen under Xvfb at 200 % (a 326 × 191 px plan): the bubbles of 1, 2, 3, 4
    overlapped. Close on screen they shrink, then each line is labelled at one end,
    the ends alternating; every line keeps a bubble, on its own grid line (common
    practice, no source: a grid label is read whole)."""
    import itertools
    import math

    from droprig.gui.plan_view import BUBBLE_MIN_RADIUS_PX, BUBBLE_RADIUS_PX

    view.resize(*size)
    view.fit()
    if size[0] < 400:
        view.zoom_by(0.25)  # a floor drawn small, as beside a crane far off
    bubbles = view.grid_bubbles()
    assert bubbles
    for a, b in itertools.combinations(bubbles, 2):
        d = math.dist((a.centre.x(), a.centre.y()), (b.centre.x(), b.centre.y()))
        assert d >= a.radius + b.radius, (a, b)
    assert all(BUBBLE_MIN_RADIUS_PX <= b.radius <= BUBBLE_RADIUS_PX for b in bubbles)
    g = view._level.grid
    for x, lab in zip(g.x_lines, g.x_labels, strict=True):
        on = [b for b in bubbles if b.axis == "x" and b.label == lab]
        assert on and all(abs(b.centre.x() - view._vp(x, 0).x()) < 1e-6 for b in on)
    for y, lab in zip(g.y_lines, g.y_labels, strict=True):
        on = [b for b in bubbles if b.axis == "y" and b.label == lab]
        assert on and all(abs(b.centre.y() - view._vp(0, y).y()) < 1e-6 for b in on)
    if size[0] < 400:
        assert len(bubbles) < 2 * (len(g.x_lines) + len(g.y_lines))  # one end each
