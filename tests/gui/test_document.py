"""Document: undoable project swaps, selection that survives edits, atomic save
and reopen, autosave / crash recovery, and the analysis runner's generation
counter (stale results are never installed).

These are behaviour tests of the editing machinery; they compare a project
with itself before and after an operation and use no expected numbers (the
framing below is a scenario, not a check value).
"""

from __future__ import annotations

import math
import threading
from dataclasses import replace
from pathlib import Path

import pytest

from droprig.gui import edits as ed
from droprig.gui.analysis_runner import AnalysisRunner
from droprig.gui.document import (
    Autosaver,
    Document,
    Selection,
    discard_recoverable,
    find_recoverable,
)
from droprig.io.project_file import load_project
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftLoad, LiftZone, ModelError, Project, generate_level
from droprig.solver.results import Results

pytestmark = pytest.mark.gui


def _two_bay_roof() -> Project:
    """A 2 × 1 bay roof with one lift zone (a scenario for editing, not a check)."""
    level = generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0, 6.0), y_spacings=(5.0,),
        girder_direction="x", beam_spacing=2.0, girder_section=get_section("IPE 400"),
        beam_section=get_section("IPE 240"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(id="Z1", name="Mobile crane", level_id="L1", crane=(-3.0, 2.5),
                    r_min=2.0, r_max=9.0, slew_start=math.radians(-60),
                    slew_end=math.radians(60),
                    loads=(LiftLoad(name="Pump skid", mass=1500.0, drop_height=0.8),))
    return Project(levels=(level,), lift_zones=(zone,))


@pytest.fixture
def two_bay_roof() -> Project:
    return _two_bay_roof()


@pytest.fixture
def doc(qtbot, two_bay_roof: Project) -> Document:  # qtbot: the QApplication
    return Document(two_bay_roof)


# ------------------------------------------------------------------ undo / redo


def test_edit_undo_redo_swaps_whole_projects(doc: Document) -> None:
    before = doc.project
    zone = replace(before.zone("Z1"), r_max=11.0)
    seen: list[Project] = []
    doc.project_changed.connect(seen.append)

    assert doc.edit(ed.with_zone(before, "Z1", zone), "Reshape Z1")
    assert doc.project.zone("Z1").r_max == 11.0
    assert doc.is_dirty
    assert doc.undo_stack.undoText() == "Reshape Z1"

    doc.undo_stack.undo()
    assert doc.project is before
    assert not doc.is_dirty
    doc.undo_stack.redo()
    assert doc.project.zone("Z1").r_max == 11.0
    assert [p.zone("Z1").r_max for p in seen] == [11.0, 9.0, 11.0]


def test_edit_to_an_equal_project_pushes_nothing(doc: Document) -> None:
    assert not doc.edit(replace(doc.project), "nothing")
    assert doc.undo_stack.count() == 0
    assert not doc.is_dirty


def test_model_refuses_an_invalid_edit_before_it_reaches_the_stack(doc: Document) -> None:
    with pytest.raises(ModelError, match="r_max"):
        ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_max=1.0))
    assert doc.undo_stack.count() == 0


def test_selection_is_dropped_when_undo_removes_its_object(doc: Document) -> None:
    load = LiftLoad(name="Spreader", mass=200.0, drop_height=2.0)
    doc.edit(ed.add_load(doc.project, "Z1", load), "Add load")
    doc.select(Selection("load", ("Z1", "Spreader")))
    assert doc.selection is not None
    doc.undo_stack.undo()
    assert doc.selection is None


def test_selecting_an_unknown_object_selects_nothing(doc: Document) -> None:
    doc.select(Selection("zone", ("Z9",)))
    assert doc.selection is None


def test_removing_a_level_removes_its_zones(doc: Document) -> None:
    after = ed.remove_level(doc.project, "L1")
    assert after.levels == () and after.lift_zones == ()


@pytest.mark.parametrize(("base", "taken", "expected"), [
    ("Z", [], "Z1"), ("Z", ["Z1", "Z2"], "Z3"), ("Z", ["Z2"], "Z1"),
])
def test_unique_id(base: str, taken: list[str], expected: str) -> None:
    assert ed.unique_id(base, taken) == expected


# ------------------------------------------------------------------ files


def test_save_then_reopen_gives_the_same_model(doc: Document, tmp_path: Path) -> None:
    doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_max=10.5)),
             "Reshape")
    target = tmp_path / "roof.droprig"
    doc.save(target)
    assert not doc.is_dirty and doc.path == target

    other = Document()
    other.open(target)
    assert other.project == doc.project
    assert other.path == target and not other.is_dirty


def test_open_failure_leaves_the_document_unchanged(doc: Document, tmp_path: Path) -> None:
    from droprig.io.project_file import ProjectFileError

    bad = tmp_path / "bad.droprig"
    bad.write_text("{ not json", encoding="utf-8")
    before = doc.project
    with pytest.raises(ProjectFileError):
        doc.open(bad)
    assert doc.project is before


# ------------------------------------------------------------------ autosave


def test_autosave_writes_only_changed_unsaved_work(doc: Document, tmp_path: Path) -> None:
    saver = Autosaver(doc, tmp_path)
    assert not saver.write()  # nothing to save yet
    doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_min=1.0)), "e")
    assert saver.write()
    assert not saver.write()  # unchanged since
    assert load_project(saver.project_file) == doc.project
    assert saver.timer.interval() == 120_000
    saver.close()
    assert not saver.project_file.exists()


def test_live_session_autosave_is_not_offered_for_recovery(doc: Document,
                                                           tmp_path: Path) -> None:
    saver = Autosaver(doc, tmp_path)
    doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_min=1.0)), "e")
    saver.write()
    assert find_recoverable(tmp_path) == []
    saver.close()


def test_crashed_session_autosave_is_offered_and_can_be_discarded(doc: Document,
                                                                  tmp_path: Path) -> None:
    saver = Autosaver(doc, tmp_path)
    doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_min=1.0)), "e")
    saver.write()
    saver.abandon()  # as a crash would leave it
    found = find_recoverable(tmp_path)
    assert len(found) == 1
    assert load_project(found[0].project_file) == doc.project
    assert found[0].original_path is None
    discard_recoverable(found[0])
    assert find_recoverable(tmp_path) == []


# ------------------------------------------------------------------ analysis runner


def test_runner_installs_results_of_the_latest_edit_only(qtbot, doc: Document) -> None:
    """Edits made while an analysis runs make its results stale: they are
    discarded and the newest project is analysed."""
    release = threading.Event()
    analysed: list[Project] = []

    def gated(project: Project) -> Results:
        analysed.append(project)
        if len(analysed) == 1:
            release.wait(10)
        return Results(warnings=(f"r_max={project.zone('Z1').r_max}",))

    runner = AnalysisRunner(doc, analyse=gated, debounce_ms=20)
    installed: list[object] = []
    doc.results_changed.connect(installed.append)
    runner.request()
    qtbot.waitUntil(lambda: len(analysed) == 1, timeout=5000)
    for r in (9.5, 10.0, 10.5):
        doc.edit(ed.with_zone(doc.project, "Z1", replace(doc.project.zone("Z1"), r_max=r)), "e")
    assert runner.busy
    release.set()
    qtbot.waitUntil(lambda: not runner.busy, timeout=10_000)
    assert doc.results_current
    assert doc.results is not None and doc.results.warnings == ("r_max=10.5",)
    assert all(isinstance(r, Results) and r.warnings == ("r_max=10.5",) for r in installed)
    assert len(analysed) == 2  # the three quick edits were coalesced into one run
    runner.shutdown()


def test_runner_reports_an_analysis_error_instead_of_results(qtbot, doc: Document) -> None:
    def refuses(project: Project) -> Results:
        raise ModelError("load Pump skid.hook_elevation", 3.0, "≥ 10 m", "m")

    runner = AnalysisRunner(doc, analyse=refuses, debounce_ms=10)
    runner.request()
    qtbot.waitUntil(lambda: not runner.busy, timeout=5000)
    assert doc.results is None
    assert "hook_elevation" in doc.analysis_error
    runner.shutdown()


def test_project_without_zones_gives_empty_results_without_analysis(qtbot) -> None:
    calls: list[Project] = []
    d = Document(Project())
    runner = AnalysisRunner(d, analyse=lambda p: calls.append(p) or Results())
    runner.request()
    assert not runner.busy and calls == []
    assert d.results is not None and d.results.bays == ()
    runner.shutdown()
