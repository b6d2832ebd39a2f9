"""Trace step titles carry names only; every number is an input (value SI, quantity)
so the edges write it in the user's units (units at the edges, DEVELOPERS.md;
common practice, no source)."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.solver.analysis import analyse
from droprig.solver.trace import trace_point

DEMOS = sorted((Path(__file__).parents[2] / "demo_projects").glob("*.droprig"))
UNIT_WORD = re.compile(r"(?<![\w/])(m|mm|cm|ft|in|kN|N|kip|kg|lb|MPa|ksi)(?![\w/])")
NUMBER_WITH_EQUALS = re.compile(r"=\s*-?\d")


@pytest.mark.parametrize("path", DEMOS, ids=[p.stem for p in DEMOS])
def test_titles_hold_no_numbers_or_units(path: Path) -> None:
    project = load_project(path)
    res = analyse(project)
    assert res.bays
    for b in res.bays[:4]:
        tr = trace_point(project, b.zone_id, b.load_name, b.governing_x, b.governing_y)
        for step in tr.steps:
            assert not UNIT_WORD.search(step.title), step.title
            assert not NUMBER_WITH_EQUALS.search(step.title), step.title
            for _sym, (value, quantity) in step.inputs.items():
                assert isinstance(value, float) and isinstance(quantity, str)
        pos = [s for s in tr.steps if s.title.startswith("Position of the load")]
        assert pos and all(s.inputs["L"][1] == "length" for s in pos)
        limit = next(s for s in tr.steps if s.symbol == "δ_max/δ_lim")
        assert limit.inputs["N"][0] == project.settings.deflection_limit_ratio
