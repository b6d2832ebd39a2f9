"""The permit of installed results is derived once and read by every panel that shows
it (``Document.permit``): the results table and the inspector of a selected bay read
the same :class:`droprig.permit.PermitConditions` object, worked out by
:func:`droprig.permit.derive_conditions` once per results installed.

A property of the implementation, no engineering source (the permit's words and
figures are checked against their sources in ``tests/test_permit*.py``). The project
is the invented rooftop demo.
"""

from __future__ import annotations

from pathlib import Path

import pytest

import droprig.permit
from droprig.gui import inspector, results_table
from droprig.gui.document import Document, Selection
from droprig.gui.main_window import MainWindow
from droprig.io.project_file import load_project

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_projects" / "rooftop_plant_swap.droprig"


def test_table_and_inspector_read_one_permit(qtbot, tmp_path: Path,
                                             monkeypatch: pytest.MonkeyPatch) -> None:
    win = MainWindow(Document(load_project(DEMO), DEMO), settings_dir=tmp_path,
                     autosave=False, threaded=False, debounce_ms=30)
    qtbot.addWidget(win, before_close_func=lambda w: setattr(w, "_closing", True))
    win.show()
    win.runner.run_now()
    doc = win.doc
    res = doc.results
    assert res is not None and res.bays and doc.results_confirmed
    worst = max(res.bays, key=lambda b: b.max_utilisation)
    doc.select(Selection("bay", (worst.level_id, worst.bay_id)))
    calls: list[int] = []
    real = droprig.permit.derive_conditions

    def counted(*a: object, **k: object) -> object:
        calls.append(1)
        return real(*a, **k)  # type: ignore[arg-type]

    monkeypatch.setattr(droprig.permit, "derive_conditions", counted)
    monkeypatch.setattr(results_table, "derive_conditions", counted)
    # (a panel that derived its own copy imported the function by name)
    monkeypatch.setattr(inspector, "derive_conditions", counted, raising=False)
    win.runner.run_now()  # new results with the bay selected: table and inspector
    assert doc.results is not res
    assert len(calls) == 1  # one derivation for both panels
    permit = doc.permit(doc.project, doc.results)
    assert win.results_table.model.permit is permit
    assert len(calls) == 1
    # the inspector shows the permit's verdict of the selected bay
    v = next(v for v in permit.bays if (v.zone_id, v.load_name, v.bay_id)
             == (worst.zone_id, worst.load_name, worst.bay_id))
    assert v.cells(doc.project.settings.unit_system)["verdict"] in win.inspector._extra.text()
