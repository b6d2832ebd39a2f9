"""The window's live analysis re-analyses only the zone an edit changes
(droprig.gui.window_analysis.AnalysisMixin.analyse_live), and the results it installs
equal a full analysis of the edited project bit for bit. A property of the
implementation, no engineering source: the reference is droprig's own full analysis.
The project is the invented rooftop demo with a second lift zone of our own."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

from droprig.gui.document import Document
from droprig.gui.main_window import MainWindow
from droprig.io.project_file import load_project
from droprig.model import Project
from droprig.solver import ZoneCache, analyse
from tests.solver.test_zone_cache import _same

ROOT = Path(__file__).resolve().parents[2]


def _two_zones() -> Project:
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    z = p.lift_zones[0]
    return replace(p, lift_zones=(z, replace(z, id="MC2", r_min=0.0, r_max=0.5 * z.r_min,
                                            loads=z.loads[:2])))


def test_zone_edit_in_the_window_reanalyses_that_zone_only(qtbot, tmp_path) -> None:
    win = MainWindow(Document(_two_zones()), settings_dir=tmp_path, autosave=False,
                     threaded=False, debounce_ms=60_000)
    qtbot.addWidget(win, before_close_func=lambda w: setattr(w, "_closing", True))
    win.runner.run_now()
    cache = win._zone_cache
    assert isinstance(cache, ZoneCache) and cache.misses == 2
    p = win.doc.project
    z2 = p.zone("MC2")
    edited = replace(p, lift_zones=(p.lift_zones[0], replace(z2, r_max=z2.r_max * 0.8)))
    assert win.doc.edit(edited, "Resize zone MC2")
    win.runner.run_now()
    # the window may analyse more than once per edit (the edit's own request, then
    # run_now): the edited zone runs once, the other comes from the cache
    assert cache.misses == 3 and cache.hits >= 1
    assert win.doc.results is not None
    _same(win.doc.results, analyse(win.doc.project))
