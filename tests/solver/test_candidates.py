"""Check candidates: support-member stations left out because another station of the
same member always has the larger demand change no result (a property of the
implementation; the dominance argument is in ``candidates._dominated_stations``)."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, candidates, floor
from droprig.solver.chain import FIELDS

ROOT = Path(__file__).resolve().parents[2]


def test_dominated_station_rule():
    # station 1 has the larger coefficient for every reaction and panel and the larger
    # existing demand: station 0 can never govern; 1 and 2 are not comparable
    coef = np.zeros((4, 3, 2))
    coef[0] = [[0.2, 0.1], [0.5, 0.4], [0.1, 0.6]]
    Et = np.array([[0.1, 0.1], [0.3, 0.2], [0.05, 0.4]])
    assert candidates._dominated_stations(coef, Et).tolist() == [True, False, False]
    # a larger |negative| coefficient is not dominated by a smaller positive one
    coef[0, 0] = [-0.6, 0.1]
    assert candidates._dominated_stations(coef, Et).tolist() == [False, False, False]
    # two equal stations: the first is kept
    same = np.ones((4, 2, 1))
    assert candidates._dominated_stations(same, np.zeros((2, 1))).tolist() == [False, True]


def _fixed_variant(project):
    level = project.levels[0]
    conds = {"girder": "fixed", "beam": "propped"}
    members = tuple(replace(m, end_condition=conds[m.role]) for m in level.members)
    return replace(project, levels=(replace(level, members=members), *project.levels[1:]))


@pytest.mark.parametrize("name", ["rooftop_plant_swap", "steel_erection_floor"])
@pytest.mark.parametrize("variant", ["as built", "fixed girders, propped beams"])
def test_leaving_out_dominated_stations_changes_nothing(monkeypatch, name, variant):
    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    if variant != "as built":
        project = _fixed_variant(project)
    floor._FLOORS.clear()
    pruned = analysis.analyse(project)
    assert any(k.size < analysis.floor_model(project.levels[0], project.settings).tables.S
               for k in analysis.floor_model(project.levels[0],
                                             project.settings).tables.m_keep)
    monkeypatch.setattr(candidates, "_dominated_stations",
                        lambda coef, Et: np.zeros(coef.shape[1], dtype=bool))
    floor._FLOORS.clear()
    full = analysis.analyse(project)
    assert pruned.bays == full.bays
    for a, b in zip(pruned.cases, full.cases, strict=True):
        for k in FIELDS:
            np.testing.assert_array_equal(getattr(a, k), getattr(b, k), err_msg=k)
    floor._FLOORS.clear()
