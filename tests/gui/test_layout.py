"""Layout on small screens and at 150–200 % scaling: at 1280 × 720 logical
pixels (a 1280 × 720 screen at 100 %, 1920 × 1080 at 150 %, 2560 × 1440 at
200 %) the plan keeps most of the window, no panel title is cut, the results
show several rows, the legend covers none of the plan's content; the window
geometry is kept per screen scale.

Each scale runs in a fresh process (Qt reads QT_SCALE_FACTOR once, at start), on a
1280 × 720 px offscreen screen; the three run side by side, each window at both
sizes asked (1280 × 720 logical, and the whole screen at 150 and 200 %). The demos
are analysed once here and their results handed to the windows (a window's layout
does not depend on who analysed). Behaviour of the window only; the demo projects are
invented scenarios.
"""
# These tests check the window's behaviour asked for in issue 15, not engineering values:
# no published source applies (common practice, no source).

from __future__ import annotations

import json
import os
import pickle
import subprocess
import sys
from pathlib import Path

import pytest
from PySide6.QtCore import QSettings

from droprig.gui import main_window as mw

pytestmark = [pytest.mark.gui, pytest.mark.slow]

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"
TWO_LEVEL = ROOT / "demo_projects" / "two_level_rigging.droprig"

PROBE = r"""
import json, sys, tempfile
from pathlib import Path
from PySide6.QtCore import QPoint, QRectF, QSettings
from PySide6.QtGui import QFontMetrics
from droprig.gui.app import create_app
from droprig.gui.document import Document
from droprig.gui.main_window import MainWindow
from droprig.io.project_file import load_project

app = create_app()
tmp = tempfile.mkdtemp()
with open(sys.argv[3], "rb") as fh:  # each demo's results, analysed by the test
    analysed = __import__("pickle").load(fh)
runs = [(src, size) for size in sys.argv[2].split(";") for src in sys.argv[1].split(";")]
for src, size in runs:  # one process, several demos and sizes
    scratch = QSettings(str(Path(tempfile.mkdtemp()) / "s.ini"), QSettings.Format.IniFormat)
    w, h = (int(v) for v in size.split("x"))
    win = MainWindow(Document(load_project(src), Path(src)), settings=scratch,
                     settings_dir=Path(tmp), threaded=False, autosave=False,
                     analyse=lambda p, r=analysed[src]: r)
    if w <= 0:  # the whole of the screen (a 1280 x 720 screen at 150 or 200 %)
        avail = win.screen().availableGeometry()
        w, h = avail.width(), avail.height()
    win.resize(w, h)
    win.show()
    app.processEvents()
    win.prepare_screenshot()
    for _ in range(3):
        app.processEvents()
    win.plan.fit()
    app.processEvents()
    vp = win.plan.viewport()
    titles = {}
    for d in (win.tree_dock, win.inspector_dock, win.results_dock, win.trace_dock):
        f = d.font(); f.setBold(True)
        need = QFontMetrics(f).horizontalAdvance(d.windowTitle()) + 2 * d.fontMetrics().height()
        titles[d.windowTitle()] = [d.width(), need, d.isVisible()]
    t = win.results_table
    view = t.findChild(__import__("PySide6.QtWidgets", fromlist=["QTableView"]).QTableView)
    rows = view.viewport().height() / max(view.verticalHeader().defaultSectionSize(), 1)
    title = win.inspector._title
    legend = win.plan.legend_rect()
    covers = [o for o in win.plan.content_obstacles() if legend.intersects(o)]
    cl = win.caution_label
    right = cl.mapTo(win, QPoint(cl.width(), 0)).x()
    obst = win.plan._crane_obstacles()
    hits = [b.label for b in win.plan.grid_bubbles()
            if any(o.intersects(QRectF(b.centre.x() - 11, b.centre.y() - 11, 22, 22))
                   for o in obst)]
    tabs = []
    bar = getattr(win, "side_tab_bar", lambda: None)()
    if bar is not None:
        for i in range(bar.count()):
            r = bar.tabRect(i)
            need = bar.fontMetrics().horizontalAdvance(bar.tabText(i))
            inside = r.left() >= 0 and r.right() < bar.width()
            tabs.append([bar.tabText(i), r.width(), need, inside])
    current = getattr(win, "current_side_panel", lambda: None)()
    if current is not None:
        f = current.font(); f.setBold(True)
        titles = {current.windowTitle(): [current.width(), QFontMetrics(f).horizontalAdvance(
            current.windowTitle()) + 2 * current.fontMetrics().height(), True]}
    content = win.plan.content_viewport_rect().intersected(QRectF(vp.rect()))
    print(json.dumps({
        "demo": Path(src).name, "size": size,
        "compact": getattr(win, "compact", False), "tabs": tabs,
        "content": [content.width(), content.height()],
        "bar_rows": getattr(win, "view_bar", win.plan_heading).height(),
        "heading": win.plan_heading.height(),
        "caution": [cl.fits(), right, win.width(), cl.text(), cl.toolTip()],
        "bubble_hits": hits,
        "window": [win.width(), win.height()], "plan": [vp.width(), vp.height()],
        "min": [win.minimumSizeHint().width(), win.minimumSizeHint().height()],
        "dpr": win.devicePixelRatioF(), "titles": titles, "rows": rows,
        "inspector_title": [title.width(), title.sizeHint().width(), title.text()],
        "legend_collapsed": win.plan.legend_collapsed, "legend_covers": len(covers),
    }))
    win._closing = True
    win.close()
"""


SCALES = {"1": ("1280x720",), "1.5": ("1280x720", "0x0"), "2": ("1280x720", "0x0")}
"""The sizes probed at each scale: 1280 × 720 logical px, and the whole of a
1280 × 720 px screen ("0x0": 853 × 480 logical at 150 %, 640 × 360 at 200 %)."""


@pytest.fixture(scope="module")
def probes(tmp_path_factory: pytest.TempPathFactory) -> dict[tuple[str, str, str], dict]:
    """The probe of both demos at every size of :data:`SCALES`, keyed by (scale, size,
    demo file name): one fresh process per scale, the three side by side, on a
    1280 × 720 px offscreen screen (Qt's offscreen platform reads its screens from a
    JSON file); the demos analysed here, once."""
    from droprig.io.project_file import load_project
    from droprig.solver import analyse

    folder = tmp_path_factory.mktemp("layout")
    screen = folder / "screen_720p.json"
    screen.write_text(json.dumps({"screens": [
        {"name": "720p", "x": 0, "y": 0, "width": 1280, "height": 720,
         "logicalDpi": 96, "logicalBaseDpi": 96, "dpr": 1}]}))
    results = folder / "results.pickle"
    results.write_bytes(pickle.dumps({str(d): analyse(load_project(d)) for d in (DEMO, TWO_LEVEL)}))
    procs = {}
    for scale, sizes in SCALES.items():
        env = dict(os.environ, QT_QPA_PLATFORM=f"offscreen:configfile={screen}",
                   QT_SCALE_FACTOR=scale)
        procs[scale] = subprocess.Popen(
            [sys.executable, "-c", PROBE, f"{DEMO};{TWO_LEVEL}", ";".join(sizes), str(results)],
            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=env)
    out: dict[tuple[str, str, str], dict] = {}
    for scale, proc in procs.items():
        stdout, stderr = proc.communicate(timeout=300)
        assert proc.returncode == 0, stderr
        for line in stdout.splitlines():
            if line.startswith("{"):
                m = json.loads(line)
                out[(scale, m["size"], m["demo"])] = m
    return out


@pytest.mark.parametrize("scale", list(SCALES))
def test_1280x720_logical_at_each_scale(scale: str, probes: dict) -> None:
    m, two_level = (probes[(scale, "1280x720", d.name)] for d in (DEMO, TWO_LEVEL))
    # with two levels the view bar gains a level chooser; its combos sized to their
    # longest item set a window wider than a 1280 px screen (seen under Xvfb with the
    # two-level demo: the inspector and the caution ran off the right edge)
    assert two_level["window"] == [1280, 720] and two_level["min"][0] <= 1280, two_level
    assert m["dpr"] == pytest.approx(float(scale))
    W, H = m["window"]
    pw, ph = m["plan"]
    # the window fits the screen: no panel's least size pushes it wider (the results
    # summary line once set a 1,306 px window under Xvfb at 1280 × 720)
    assert (W, H) == (1280, 720) and m["min"][0] <= 1280 and m["min"][1] <= 720, m
    # the plan keeps over half of the window each way (it was ~240 px tall)
    assert ph >= 0.5 * H and pw >= 0.55 * W, m
    for name, (width, need, visible) in m["titles"].items():
        assert visible and width >= need, f"{name!r} cut: {width} px < {need} px"
    assert m["rows"] >= 5, m  # several result rows, not two (four at 100 % before)
    iw, ineed, text = m["inspector_title"]
    assert iw >= ineed, f"inspector title {text!r} cut"
    assert m["legend_covers"] == 0 or m["legend_collapsed"], m
    # the status bar's caution is whole, inside the window, and still names the
    # licensed engineer; the full caution is its tooltip (issue 15: it was cut)
    fits, right, width, text, tip = m["caution"]
    assert fits and right <= width, m["caution"]
    assert "licensed engineer" in text and text.startswith("⚠")
    assert "local codes" in tip and "appointed lifting person" in tip
    assert m["bubble_hits"] == [], m  # no grid bubble under the crane (issue 15)


@pytest.mark.parametrize("scale, logical", [("1.5", (853, 480)), ("2", (640, 360))])
def test_a_1280x720_screen_at_150_and_200_percent(scale: str, logical: tuple[int, int],
                                                  probes: dict) -> None:
    """Issue 15: at 150 % the window's least width was 1,078–1,144 px against the
    screen's 853, at 200 % against 640: the window could not fit. Now the panels
    share one tabbed side panel, the view bar wraps, and the plan keeps over half
    the window each way with its content in view; no tab or title is cut."""
    for demo in (DEMO, TWO_LEVEL):
        _fits_small_screen(probes[(scale, "0x0", demo.name)], scale, logical)


def _fits_small_screen(m: dict, scale: str, logical: tuple[int, int]) -> None:
    assert m["dpr"] == pytest.approx(float(scale))
    W, H = m["window"]
    assert (W, H) == logical, m  # the window fits the screen
    assert m["min"][0] <= W and m["min"][1] <= H, m
    assert m["compact"], m
    pw, ph = m["plan"]
    assert pw >= 0.5 * W and ph >= 0.5 * H, m
    # the floor itself is drawn large enough to read: it was squeezed to the least
    # zoom once the margins for bubbles, labels and the caution passed the view's size
    cw, ch = m["content"]
    assert cw * ch >= 0.15 * pw * ph, m
    names = [t[0] for t in m["tabs"]]
    assert names == ["Results", "Inspector", "Project", "Trace"], m
    for name, width, need, inside in m["tabs"]:
        assert inside and width >= need, f"tab {name!r} cut or scrolled away: {m['tabs']}"
    for name, (width, need, visible) in m["titles"].items():
        assert visible and width >= need, f"{name!r} cut: {width} px < {need} px"
    fits, right, width, text, tip = m["caution"]
    assert fits and right <= width and "licensed engineer" in text, m["caution"]
    assert "local codes" in tip and "appointed lifting person" in tip


def test_geometry_is_kept_per_screen_scale(qtbot, tmp_path: Path, monkeypatch) -> None:
    settings = QSettings(str(tmp_path / "s.ini"), QSettings.Format.IniFormat)

    def window() -> mw.MainWindow:
        w = mw.MainWindow(settings=settings, settings_dir=tmp_path, autosave=False)
        qtbot.addWidget(w, before_close_func=lambda x: setattr(x, "_closing", True))
        return w

    monkeypatch.setattr(mw, "screen_scale_tag", lambda screen: "scale150")
    a = window()
    a.resize(700, 500)
    a.save_window_state()
    a._closing = True
    a.close()
    b = window()  # same scale: the saved size comes back
    assert (b.width(), b.height()) == (700, 500)
    b._closing = True
    b.close()
    monkeypatch.setattr(mw, "screen_scale_tag", lambda screen: "scale100")
    c = window()  # another scale: not the size saved at 150 %
    assert (c.width(), c.height()) != (700, 500)
    assert settings.value("window/scale150/geometry") is not None


def test_a_saved_size_larger_than_the_screen_is_cut_to_it(qtbot, tmp_path: Path) -> None:
    # a geometry saved on a bigger display (or one Qt restores as saved because the
    # screen it was saved on had the same size) must not leave a window wider or taller
    # than this screen, or off it: seen under Xvfb at 1280 × 720, where a restored
    # 1306 px wide window ran off the right edge (common practice, no source: a window
    # fits its screen). Qt's own restoreGeometry clamps only some cases, so the window
    # is cut to the screen after it, by _fit_to_screen.
    settings = QSettings(str(tmp_path / "s.ini"), QSettings.Format.IniFormat)
    a = mw.MainWindow(settings=settings, settings_dir=tmp_path, autosave=False)
    qtbot.addWidget(a, before_close_func=lambda x: setattr(x, "_closing", True))
    avail = a.screen().availableGeometry()
    a.resize(avail.width() + 300, avail.height() + 200)
    a.move(avail.x() + 400, avail.y() + 300)
    assert a.width() > avail.width()
    a._fit_to_screen()
    assert a.width() <= avail.width() and a.height() <= avail.height()
    assert avail.contains(a.geometry().topLeft()) and a.x() + a.width() <= avail.right() + 1



def test_a_window_saved_larger_than_the_screen_reopens_filling_it(qtbot,
                                                                  tmp_path: Path) -> None:
    # seen under Xvfb at 1280 × 720: a window saved at 1604 × 1026 on a larger display
    # came back 853 × 480 — Qt's restoreGeometry shrinks an oversized geometry to two
    # thirds of the screen — so the plan was a postage stamp. The size saved beside
    # the geometry brings it back as large as the screen allows (common practice, no
    # source: a reopened window keeps the size the user gave it, within the screen).
    settings = QSettings(str(tmp_path / "s.ini"), QSettings.Format.IniFormat)
    a = mw.MainWindow(settings=settings, settings_dir=tmp_path, autosave=False)
    qtbot.addWidget(a, before_close_func=lambda x: setattr(x, "_closing", True))
    avail = a.screen().availableGeometry()
    # as saved on a larger display: the geometry and size of a bigger window
    a.setMaximumSize(16777215, 16777215)
    a.resize(avail.width() + 324, avail.height() + 306)
    a.save_window_state()
    a._closing = True
    a.close()
    b = mw.MainWindow(settings=settings, settings_dir=tmp_path, autosave=False)
    qtbot.addWidget(b, before_close_func=lambda x: setattr(x, "_closing", True))
    assert b.width() == avail.width() and b.height() == avail.height(), (
        (b.width(), b.height()), (avail.width(), avail.height()))
