"""The plan draws the lift plan's pick-up and set-down points with their tags, as
the annex's conditions plan does, and the key names the two symbols: the window's
verdict names points by tag (droprig.permit.plan_clashes), and before this the window
did not show them (seen under Xvfb on the rooftop demo). Common practice, no source:
a plan names only what it shows."""

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtGui import QImage, QPainter

from droprig.gui.document import Document
from droprig.gui.main_window import MainWindow
from droprig.io.project_file import load_project
from droprig.model import Project, lift_point_tags

pytestmark = pytest.mark.gui

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def _demo_window(qtbot, tmp_path: Path) -> tuple[Project, MainWindow]:
    """The rooftop demo in a 1280 x 720 window, analysed and confirmed."""
    project = load_project(DEMO)
    win = MainWindow(Document(project, DEMO), settings_dir=tmp_path, autosave=False,
                     threaded=False, debounce_ms=30)
    qtbot.addWidget(win, before_close_func=lambda w: setattr(w, "_closing", True))
    win.resize(1280, 720)
    win.show()
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    return project, win


def test_points_drawn_with_tags_and_in_the_key(qtbot, tmp_path: Path) -> None:
    project, win = _demo_window(qtbot, tmp_path)
    item = win.plan._lift_points_item
    zone = project.lift_zones[0]
    assert item.tags == lift_point_tags(zone) == ["P1", "S1", "P2", "S2"]
    assert item.kinds == {"pick_up", "set_down"}
    rows = win.plan._legend_rows()
    assert ("sym", "pick_up") in rows and ("sym", "set_down") in rows
    # the symbols are painted: the item's own paint on a blank image leaves ink at
    # each point's place
    img = QImage(win.plan.viewport().size(), QImage.Format.Format_ARGB32)
    img.fill(0)
    p = QPainter(img)
    win.plan.render(p)
    p.end()
    for lp in zone.lift_points:
        c = win.plan.mapFromScene(lp.at[0], -lp.at[1])
        dark = [img.pixelColor(c.x() + dx, c.y() + dy).lightness()
                for dx in range(-4, 5) for dy in range(-4, 5)
                if 0 <= c.x() + dx < img.width() and 0 <= c.y() + dy < img.height()]
        assert dark and min(dark) < 60, (lp, min(dark, default=None))


def test_pad_names_keep_clear_of_the_points(qtbot, tmp_path: Path) -> None:
    """On the rooftop demo at 1280 x 720 under Xvfb the timber mat's name sat under the
    tags of P1 and S2 ("Timbe S2 ▼ △ P1"). A pad's name now takes a corner of its pad
    clear of every point's symbol and tag room where one is free (common practice, no
    source: a drawing's labels never hide its symbols)."""
    project, win = _demo_window(qtbot, tmp_path)
    t = win.plan.viewportTransform()
    points = win.plan._lift_points_item.obstacles(t)
    assert len(points) == len(project.lift_zones[0].lift_points)
    plates = win.plan._protection_labels.label_plates(t)
    assert plates, "the demo's pads are named on the plan"
    for text, plate in plates:
        assert not any(plate.intersects(b) for b in points), (text, plate)


def test_pad_names_keep_clear_of_the_scabbing_marks(qtbot, tmp_path: Path) -> None:
    """Seen under Xvfb at 1280 x 720 on the rooftop demo: with both bottom corners of
    each timber mat taken by P1 and S2, its name went to a top corner and ran under the
    bay's scabbing mark ("Timber" with an "s" drawn over it). A pad's name keeps clear
    of the scabbing marks too, shortened beside them where no corner of its pad is
    free (common practice, no source: a drawing's labels never hide its symbols)."""
    _, win = _demo_window(qtbot, tmp_path)
    t = win.plan.viewportTransform()
    marks = win.plan._labels_item.scabbing_marks(t)
    assert marks, "the demo's bays may scab: the marks are drawn"
    plates = win.plan._protection_labels.label_plates(t)
    assert len(plates) == 2
    points = win.plan._lift_points_item.obstacles(t)
    for text, plate in plates:
        assert text and plate.width() > 0.0
        assert not any(plate.intersects(m) for m in marks), (text, plate)
        assert not any(plate.intersects(b) for b in points), (text, plate)
