"""The window refuses an edit that breaks a work budget with the same message as
``droprig validate`` and keeps the model unchanged (issue 16, item 1).

Source: the limits are droprig's own (droprig/model/bounds.py, common practice, no
source); the project is an invented input.
"""

from __future__ import annotations

from droprig.gui.document import Document
from droprig.gui.settings_dialog import SettingsDialog
from droprig.model import ColumnGrid, Level, LiftZone, Project, bounds
from droprig.model.bounds import BudgetError


def _big_floor() -> Project:
    lines = tuple(8.0 * i for i in range(60))
    grid = ColumnGrid(lines, lines, tuple(f"X{i}" for i in range(60)),
                      tuple(f"Y{i}" for i in range(60)))
    level = Level("L1", "big floor", 0.0, grid, ())
    zone = LiftZone("Z1", "", "L1", (236.0, 236.0), 0.0, 200.0)
    return Project(levels=(level,), lift_zones=(zone,))


def test_a_fine_grid_on_a_huge_zone_is_refused_in_the_settings(qtbot) -> None:
    doc = Document(_big_floor())
    dialog = SettingsDialog(doc)
    qtbot.addWidget(dialog)
    before = doc.project
    e = dialog.edits["grid_resolution"]
    e.setText("0.05 m")
    e.editingFinished.emit()
    assert doc.project is before
    assert doc.undo_stack.count() == 0
    text = dialog.message.text()
    assert "needs" in text and "drop points" in text
    assert f"the limit is {bounds.MAX_DROP_POINTS_PER_ZONE:,}" in text
    assert "coarsen the grid resolution or split the zone" in text
    assert "Nothing was changed" in text


def test_the_model_refuses_the_same_project_with_the_same_words() -> None:
    from dataclasses import replace

    p = _big_floor()
    try:
        replace(p, settings=replace(p.settings, grid_resolution=0.05))
    except BudgetError as exc:
        assert "coarsen the grid resolution or split the zone" in str(exc)
    else:  # pragma: no cover - the budget must refuse
        raise AssertionError("no refusal")
