"""Layout on small screens and at 150–200 % scaling: at 1280 × 720 logical
pixels (a 1280 × 720 screen at 100 %, 1920 × 1080 at 150 %, 2560 × 1440 at
200 %) the plan keeps most of the window, no panel title is cut, the results
show several rows, the legend covers none of the plan's content; the window
geometry is kept per screen scale.

Each scale runs in a fresh process (Qt reads QT_SCALE_FACTOR once, at start).
Behaviour of the window only; the demo project is an invented scenario.
"""
# These tests check the window's behaviour asked for in issue 15, not engineering values:
# no published source applies (common practice, no source).

from __future__ import annotations

import json
import os
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
scratch = QSettings(str(Path(tmp) / "s.ini"), QSettings.Format.IniFormat)
for src in sys.argv[1].split(";"):  # one process, several demos
    scratch = QSettings(str(Path(tempfile.mkdtemp()) / "s.ini"), QSettings.Format.IniFormat)
    w, h = int(sys.argv[2]), int(sys.argv[3])
    win = MainWindow(Document(load_project(src), Path(src)), settings=scratch,
                     settings_dir=Path(tmp), threaded=False, autosave=False)
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


def _probe(scale: str, size: tuple[int, int], *demos: Path,
           screen: Path | None = None) -> list[dict]:
    """The probe of each demo (default: the rooftop one) in one fresh process;
    ``screen``: an offscreen screen description (JSON), else Qt's default
    offscreen screen."""
    platform = f"offscreen:configfile={screen}" if screen else "offscreen"
    env = dict(os.environ, QT_QPA_PLATFORM=platform, QT_SCALE_FACTOR=scale)
    r = subprocess.run([sys.executable, "-c", PROBE, ";".join(str(d) for d in demos or (DEMO,)),
                        str(size[0]), str(size[1])],
                       capture_output=True, text=True, env=env, timeout=300)
    assert r.returncode == 0, r.stderr
    return [json.loads(line) for line in r.stdout.strip().splitlines()
            if line.startswith("{")]


@pytest.mark.parametrize("scale", ["1", "1.5", "2"])
def test_1280x720_logical_at_each_scale(scale: str) -> None:
    m, two_level = _probe(scale, (1280, 720), DEMO, TWO_LEVEL)
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
    assert m["rows"] >= 4, m  # several result rows, not two
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


@pytest.fixture(scope="module")
def screen_720p(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """A 1280 × 720 px offscreen screen (Qt's offscreen platform reads its screens
    from a JSON file): at QT_SCALE_FACTOR 1.5 it is 853 × 480 logical px, at 2
    640 × 360."""
    path = tmp_path_factory.mktemp("screen") / "screen_720p.json"
    path.write_text(json.dumps({"screens": [
        {"name": "720p", "x": 0, "y": 0, "width": 1280, "height": 720,
         "logicalDpi": 96, "logicalBaseDpi": 96, "dpr": 1}]}))
    return path


@pytest.mark.parametrize("scale, logical", [("1.5", (853, 480)), ("2", (640, 360))])
def test_a_1280x720_screen_at_150_and_200_percent(scale: str, logical: tuple[int, int],
                                                  screen_720p: Path) -> None:
    """Issue 15: at 150 % the window's least width was 1,078–1,144 px against the
    screen's 853, at 200 % against 640: the window could not fit. Now the panels
    share one tabbed side panel, the view bar wraps, and the plan keeps over half
    the window each way with its content in view; no tab or title is cut."""
    for m in _probe(scale, (0, 0), DEMO, TWO_LEVEL, screen=screen_720p):
        _fits_small_screen(m, scale, logical)


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

