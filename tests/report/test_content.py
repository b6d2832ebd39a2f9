"""What the annex says, before layout: verdict ranking, least allowable drop
height, the choice of calculation sheets and the lift filter.

The rules checked here are droprig's own specification of the annex (issue 5
and design.md §7: one sheet per zone × load for the governing point of the
worst bay and of every bay that is not elastic; the response order
elastic < plastic < exceeds of ``droprig.solver.results.RESPONSES``); there is
no published source for them (common practice, no source).
"""

from __future__ import annotations

import math

import pytest

from droprig.model import Level, LiftLoad, LiftZone, ModelError, Project
from droprig.report import content
from droprig.solver.results import BaySummary, Results


def _bay(bay: str, response: str, u: float, *, zone: str = "Z1", load: str = "L",
         x: float = 1.0, y: float = 1.0, h: float | None = 1.0) -> BaySummary:
    return BaySummary("L1", bay, zone, load, 5, u, response, h, None, x, y, "B1", "flexure",
                      "none")


@pytest.mark.parametrize(("responses", "expected"), [
    (["elastic", "plastic", "elastic"], "plastic"),
    (["plastic", "exceeds"], "exceeds"),
    (["elastic"], "elastic"),
    ([], "none"),
])
def test_worst_response(responses: list[str], expected: str) -> None:
    # RESPONSES order: elastic < plastic < exceeds (solver contract, no source)
    assert content.worst_response(responses) == expected


@pytest.mark.parametrize(("values", "expected"), [
    ([1.2, 0.4, 3.0], 0.4),
    ([1.2, None, 3.0], None),        # a bay with no safe height makes the least "none"
    ([1.2, math.nan], None),
    ([], None),
])
def test_least_allowable(values: list[float | None], expected: float | None) -> None:
    # the least of the allowable heights governs the lift (common practice, no source)
    assert content.least_allowable(values) == expected


def test_calc_sheets_worst_bay_and_every_non_elastic_bay() -> None:
    zone = LiftZone("Z1", "z", "L1", (0.0, 0.0), 0.0, 30.0,
                    loads=(LiftLoad("L", 1000.0), LiftLoad("M", 500.0)))
    sums = (
        _bay("1-2/A-B", "elastic", 0.8, x=1.0),
        _bay("2-3/A-B", "plastic", 1.2, x=2.0),
        _bay("3-4/A-B", "exceeds", 1.1, x=3.0),
        _bay("4-5/A-B", "elastic", 0.9, x=4.0),
        _bay("1-2/A-B", "elastic", 0.3, load="M", x=5.0),
        _bay("2-3/A-B", "elastic", 0.6, load="M", x=6.0),
    )
    refs = content.calc_sheets(Results((), sums), (zone,))
    # load L: worst bay (exceeds, even at a lower U than the plastic bay) + the plastic
    # bay; load M: only its worst bay (all elastic)
    assert [(r.load_name, r.bay_id) for r in refs] == [
        ("L", "3-4/A-B"), ("L", "2-3/A-B"), ("M", "2-3/A-B")]
    assert refs[0].x == 3.0 and "worst bay of this load" in refs[0].reasons


def test_select_zones_names_the_ids_when_the_lift_is_unknown(small_level: Level) -> None:
    z = LiftZone("Z1", "z", "R", (0.0, 0.0), 0.0, 10.0)
    p = Project(levels=(small_level,), lift_zones=(z,))
    assert content.select_zones(p, None) == (z,)
    assert content.select_zones(p, "Z1") == (z,)
    with pytest.raises(ModelError, match=r"--lift.*Z1"):
        content.select_zones(p, "nope")
