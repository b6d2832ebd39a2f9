"""The outcomes before the confirmation (droprig.solver.analyse_outcomes): what the
window paints at once after an edit, while the limits are still being tried.

A property of the implementation, no engineering source: the reference is droprig's
own full analysis (:func:`droprig.solver.analyse`, whose limits are confirmed by
``solver/confirm.py``). Everything the confirmation does not change must equal it bit
for bit — every point's response and utilisation (the plan's colours and its U) and
each bay's response, greatest utilisation and the point and check that set it — and
the function must say when a zone cache already holds every confirmed zone. Projects:
the three invented demos, the rooftop demo with a second zone of our own, and random
small projects of ``tests/permit_projects.py`` (invented inputs, never expected
values).
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model import Project
from droprig.solver import Results, ZoneCache, analyse, analyse_outcomes
from tests.builders import same_arrays
from tests.permit_projects import random_project

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))

CHANGED_BY_CONFIRMATION = frozenset({"allowable_drop_height_plastic"})
"""The per-point arrays the confirmation may change (``confirm_point_heights``)."""
NOT_WORKED_OUT = frozenset({"allowable_drop_height_plastic", "allowable_height_plastic_check",
                            "allowable_mass"})
"""The per-point arrays the outcome stage leaves out (``Drop.outcomes_only``: read by
the confirmation and the printed limits only): NaN, the check −1, at every point."""

BAY_OUTCOME_FIELDS = ("level_id", "bay_id", "zone_id", "load_name", "n_points",
                      "max_utilisation", "response", "governing_x", "governing_y",
                      "governing_member", "governing_check", "utilisation_x",
                      "utilisation_y", "utilisation_member", "utilisation_check",
                      "scabbing", "planned_drop_height", "level_below", "protections")
"""What a bay shows before its limits are confirmed (the plan's colour, tag and U,
the table's outcome and U)."""


def _same_outcomes(o: Results, a: Results, fresh: frozenset[str] | None = None) -> None:
    """``o`` (the outcome stage) against ``a`` (the full analysis); ``fresh``: the zones
    the outcome stage analysed (all where None; the others came from a cache)."""
    if fresh is None:
        fresh = frozenset(c.zone_id for c in o.cases)
    assert len(o.cases) == len(a.cases) and len(o.bays) == len(a.bays)
    for co, ca in zip(o.cases, a.cases, strict=True):
        if co.zone_id not in fresh:  # taken from the cache: confirmed, whole
            same_arrays(co, ca)
            continue
        same_arrays(co, ca, CHANGED_BY_CONFIRMATION | NOT_WORKED_OUT)
        # never a number that could pass for a limit
        assert np.isnan(co.allowable_drop_height_plastic).all()
        assert np.isnan(co.allowable_mass).all()
        assert (co.allowable_height_plastic_check == -1).all()
    for bo, ba in zip(o.bays, a.bays, strict=True):
        for name in BAY_OUTCOME_FIELDS:
            vo, va = getattr(bo, name), getattr(ba, name)
            assert vo == va or (vo != vo and va != va), (bo.bay_id, name, vo, va)
        if bo.zone_id in fresh:  # a zone the outcome stage analysed: no mass offered
            assert bo.allowable_mass is None and bo.allowable_drop_height_plastic is None
    assert len(o.cascade) == len(a.cascade)
    for fo, fa in zip(o.cascade, a.cascade, strict=True):
        assert (fo.zone_id, fo.load_name, fo.from_level, fo.level_id, fo.equivalent_height) == \
            (fa.zone_id, fa.load_name, fa.from_level, fa.level_id, fa.equivalent_height)
        same_arrays(fo.case, fa.case)
        assert fo.bays == fa.bays


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_demo_outcomes_equal_the_confirmed_ones(path: Path) -> None:
    p = load_project(path)
    o = analyse_outcomes(p)
    assert o is not None
    _same_outcomes(o, analyse(p))


@pytest.mark.parametrize("seed", range(6))
def test_random_project_outcomes_equal_the_confirmed_ones(seed: int) -> None:
    p = random_project(seed)
    o = analyse_outcomes(p)
    assert o is not None
    _same_outcomes(o, analyse(p))


def _two_zones() -> Project:
    """The rooftop demo (invented) with a second zone of our own inside the first's ring."""
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    z = p.lift_zones[0]
    second = replace(z, id="MC2", r_min=0.0, r_max=0.5 * z.r_min, loads=z.loads[:2])
    return replace(p, lift_zones=(z, second))


def test_cache_gives_confirmed_zones_and_none_when_it_holds_all() -> None:
    p = _two_zones()
    cache = ZoneCache()
    full = cache.analyse(p)
    assert analyse_outcomes(p, cache) is None  # the confirmed results are at hand
    assert (cache.misses, cache.hits) == (2, 0)  # a look is neither a hit nor a miss
    z2 = p.lift_zones[1]
    edited = replace(p, lift_zones=(p.lift_zones[0], replace(z2, r_max=z2.r_max * 0.8)))
    o = analyse_outcomes(edited, cache)
    assert o is not None
    _same_outcomes(o, analyse(edited), fresh=frozenset({z2.id}))
    # the zone not edited comes from the cache whole, its confirmed limits with it
    first = [b for b in o.bays if b.zone_id == p.lift_zones[0].id]
    assert first == [b for b in full.bays if b.zone_id == p.lift_zones[0].id]
    assert (cache.misses, cache.hits) == (2, 0)
