"""The worst point names the check that sets its outcome, the same in the results
table, the inspector, the calculation trace and the annex's point sheet.

Seen under Xvfb on the rooftop demo: the spreader beam's bay 3-4/B-C read
"P May go through", "5.48 (deck flexure)" and, as its worst point,
"B3/B-C · web yielding": three reasons for one bay. A load that may go through the
deck has that outcome from the local-damage check (perforation), whatever framing
check the chain names at the point. Common practice, no source.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from droprig.gui.document import Document, Selection
from droprig.gui.main_window import MainWindow
from droprig.gui.results_table import COL
from droprig.gui.trace_panel import trace_html, trace_text
from droprig.io.project_file import load_project
from droprig.outcomes import fmt_worst_point, outcome_check
from droprig.solver import trace_point

pytestmark = pytest.mark.gui

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def test_words_of_the_outcome_check() -> None:
    assert outcome_check("web_yielding", "perforates") == "deck perforation (local damage)"
    assert outcome_check("web_yielding", "exceeds") == "web yielding"
    assert fmt_worst_point("B3/B-C", "shear", "plastic") == "B3/B-C · shear"
    # the deck as the worst point's member: its checks do not repeat "deck"
    assert fmt_worst_point("deck", "deck_flexure", "perforates") == \
        "deck · perforation (local damage)"
    assert fmt_worst_point("deck", "deck_flexure", "exceeds") == "deck · flexure"


def test_table_inspector_and_trace_name_perforation(qtbot, tmp_path: Path) -> None:
    win = MainWindow(Document(load_project(DEMO), DEMO), settings_dir=tmp_path,
                     autosave=False, threaded=False, debounce_ms=30)
    qtbot.addWidget(win, before_close_func=lambda w: setattr(w, "_closing", True))
    win.show()
    qtbot.waitUntil(lambda: not win.runner.busy and win.doc.results_confirmed,
                    timeout=60_000)
    through = [b for b in win.doc.results.bays if b.response == "perforates"]
    assert through, "the rooftop demo has bays the spreader may go through"
    m = win.results_table.model
    for b in through:
        row = next(r for r in range(m.rowCount()) if m.row(r) is b)
        cell = str(m.data(m.index(row, COL["governing"])))
        assert cell == fmt_worst_point(b.governing_member, "", "perforates"), cell
        assert cell.endswith("perforation (local damage)"), cell
    b = through[0]
    win.doc.select(Selection("bay", (b.level_id, b.bay_id)))
    assert "worst point: " + fmt_worst_point(b.governing_member, "", "perforates") in \
        win.inspector._extra.text()
    zone = next(z for z in win.doc.project.lift_zones if z.id == b.zone_id)
    tr = trace_point(win.doc.project, zone.id, b.load_name, b.governing_x, b.governing_y)
    assert tr.response == "perforates"
    assert "deck perforation (local damage)" in trace_html(tr, "SI")
    assert "check deck perforation (local damage)" in trace_text(tr, "SI")
