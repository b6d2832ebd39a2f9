"""Occupancy of the level below (``Level.occupied_below``): model and file validation
naming the field, the safe-side default, and what the permit asks for. The rule —
scabbing over an occupied level below keeps it clear (or a catch deck under the
soffit), over an unoccupied one a note; perforation always an exclusion area — is
common practice, no source (DOE-STD-3014 App. C treats scabbing as a hazard to what
lies behind the barrier and perforation as its loss)."""

from __future__ import annotations

import json
from dataclasses import replace
from pathlib import Path

import pytest

from droprig.io.project_file import ProjectFileError, dumps_project, load_project, loads_project
from droprig.model import ModelError
from droprig.permit import derive_conditions
from droprig.solver.results import BaySummary, Results

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "demo_projects" / "two_level_rigging.droprig"


@pytest.fixture(scope="module")
def demo():
    return load_project(DEMO)


def _with_rf(project, occupied: bool):
    levels = tuple(replace(lv, occupied_below=occupied) if lv.id == "RF" else lv
                   for lv in project.levels)
    return replace(project, levels=levels)


def _summary(project, response: str, scab: bool) -> BaySummary:
    zone = project.lift_zones[0]
    load = zone.loads[0]
    from droprig.model import bays
    bay = bays(project.level("RF"))[0].id
    return BaySummary("RF", bay, zone.id, load.name, 3, 0.5, response, 2.0, None, 1.0, 1.0,
                      "B1", "flexure", "none", scabbing=scab, level_below="L3")


def _conditions(project, response: str, scab: bool):
    res = Results((), (_summary(project, response, scab),))
    return [c for c in derive_conditions(project, res).conditions
            if c.kind in ("exclude_level_below", "note_level_below")]


def test_default_is_occupied_the_safe_side(demo):
    assert all(lv.occupied_below is True for lv in demo.levels)
    doc = json.loads(dumps_project(demo))
    assert all("occupied_below" not in lv for lv in doc["levels"])  # old files unchanged


def test_scabbing_over_an_occupied_level_keeps_it_clear_or_a_catch_deck(demo):
    conds = _conditions(_with_rf(demo, True), "elastic", True)
    assert [c.kind for c in conds] == ["exclude_level_below"]
    s = conds[0].sentence()
    assert "level L3" in s and "catch deck" in s and "scabbing" in s


def test_scabbing_over_an_unoccupied_level_is_a_note(demo):
    p = _with_rf(demo, False)
    conds = _conditions(p, "elastic", True)
    assert [c.kind for c in conds] == ["note_level_below"]
    s = conds[0].sentence()
    assert "recorded as unoccupied" in s and "level L3" in s
    # the permit relies on that record: still a condition, not a clean pass
    res = Results((), (_summary(p, "elastic", True),))
    assert derive_conditions(p, res).verdict == "acceptable_with_conditions"


@pytest.mark.parametrize("occupied", [True, False])
def test_perforation_always_excludes_the_level_below(demo, occupied):
    conds = _conditions(_with_rf(demo, occupied), "perforates", True)
    assert [c.kind for c in conds] == ["exclude_level_below"]
    assert "perforation" in conds[0].sentence() and "level L3" in conds[0].sentence()


def test_no_scabbing_no_level_below_condition(demo):
    assert _conditions(_with_rf(demo, True), "elastic", False) == []


def test_model_refuses_a_non_boolean_naming_the_field(demo):
    lv = demo.level("RF")
    with pytest.raises(ModelError) as info:
        replace(lv, occupied_below="no")
    assert "occupied_below" in str(info.value)


def test_file_round_trip_and_a_bad_value_named(demo, tmp_path):
    p = _with_rf(demo, False)
    text = dumps_project(p)
    doc = json.loads(text)
    rf = next(lv for lv in doc["levels"] if lv["id"] == "RF")
    assert rf["occupied_below"] is False
    back = loads_project(text)
    assert back.level("RF").occupied_below is False
    assert back.level("L3").occupied_below is True
    rf["occupied_below"] = "yes"
    with pytest.raises(ProjectFileError) as info:
        loads_project(json.dumps(doc))
    assert any("occupied_below" in q for q in info.value.problems)


def test_level_form_has_the_field_and_it_commits(demo):
    # the window's level form (Qt-free part): the box reads the model and its
    # setter gives a level with the new value
    from droprig.gui.document import Selection
    from droprig.gui.inspector import build_form
    form = build_form(demo, Selection("level", ("RF",)))
    spec = next(f for f in form.fields if f.key == "occupied_below")
    assert spec.kind == "bool" and spec.get(form.obj) is True
    lv = spec.set(form.obj, False)
    assert lv.occupied_below is False
    new = form.commit(demo, lv)
    assert new.level("RF").occupied_below is False
