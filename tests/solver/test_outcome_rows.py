"""The outcome stage's rows remembered from one edit to the next
(droprig.solver.outcome_rows, used by ``analyse_outcomes`` with a ``ZoneCache``,
and the forward rows of ``ZoneCache.analyse``):
after edits of a zone's region the outcomes equal those worked out afresh, bit for
bit, while rows are taken from the memory; an edit to what a point's answer is made
of (its load, a pad given by its crush force and the loads of the level) takes none.

A property of the implementation, no engineering source: the reference is droprig's
own outcome stage without the memory (:func:`droprig.solver.analyse_outcomes`, itself
compared with the confirmed :func:`droprig.solver.analyse` in
``test_analyse_outcomes.py``). Projects: the three invented demos and random small
projects of ``tests/permit_projects.py`` (invented inputs, never expected values).
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import pytest

from droprig.io.project_file import load_project
from droprig.model import Project, ProtectionArea, Rect
from droprig.solver import Results, ZoneCache, analyse, analyse_outcomes
from droprig.solver.analysis import zone_key
from droprig.solver.outcome_rows import rows_key
from tests.builders import same_results
from tests.permit_projects import random_project

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


def _same(a: Results, b: Results) -> None:
    """Every case array and bay summary equal, bit for bit (NaN equal NaN), and the
    falls to the levels below (the warnings are not compared here)."""
    same_results(a, b, warnings=False)


def _with_zone(p: Project, **change: object) -> Project:
    return replace(p, lift_zones=(replace(p.lift_zones[0], **change), *p.lift_zones[1:]))


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_region_edits_take_rows_and_equal_a_fresh_outcome_stage(path: Path) -> None:
    p = load_project(path)
    z = p.lift_zones[0]
    cache = ZoneCache()
    assert analyse_outcomes(p, cache) is not None
    assert cache.rows.hits == 0 and cache.rows.misses > 0  # nothing held at first
    for change in ({"r_max": z.r_max * 0.93}, {"drift_margin": z.drift_margin + 0.07}):
        edited = _with_zone(p, **change)
        before = cache.rows.hits
        got = analyse_outcomes(edited, cache)
        assert got is not None
        _same(got, analyse_outcomes(edited))  # afresh, no memory
        assert cache.rows.hits > before  # most points stayed where they were
    if got.cascade:  # (the two-level demo) the falls' rows are taken too
        assert cache.forward_rows.hits > 0


@pytest.mark.parametrize("seed", (1, 2, 4))
def test_random_corridor_edit_equals_a_fresh_outcome_stage(seed: int) -> None:
    p = random_project(seed)
    z = p.lift_zones[0]
    cache = ZoneCache()
    analyse_outcomes(p, cache)
    (x0, y0), (x1, _), (_, y2), _ = z.corridor
    edited = _with_zone(p, corridor=((x0 + 0.37, y0), (x1, y0), (x1, y2), (x0 + 0.37, y2)))
    got = analyse_outcomes(edited, cache)
    assert got is not None
    _same(got, analyse_outcomes(edited))
    assert cache.rows.hits > 0


@pytest.mark.parametrize("which", ("rooftop", "random"))
def test_confirmed_analysis_after_a_region_edit_equals_a_full_analysis(which: str) -> None:
    """The window's confirmed stage (``ZoneCache.analyse``) starts from the forward
    rows it remembers (``ZoneCache.forward_rows``): after an edit of the region its
    results — limits confirmed, warnings, falls — equal :func:`analyse`'s bit for bit."""
    p = load_project(DEMOS[0]) if which == "rooftop" else random_project(2)
    z = p.lift_zones[0]
    cache = ZoneCache()
    cache.analyse(p)
    assert cache.forward_rows.hits == 0
    edited = _with_zone(p, r_max=z.r_max * 0.91)
    got = cache.analyse(edited)
    want = analyse(edited)
    _same(got, want)
    assert got.warnings == want.warnings
    assert cache.forward_rows.hits > 0


def test_load_edit_takes_only_the_other_loads_rows() -> None:
    """A row's answer is made of its own load, not the zone's others: after an edit of
    one load every row of that load is worked out again, the other loads' rows are
    taken (also when the loads change places)."""
    p = load_project(DEMOS[0])
    z = p.lift_zones[0]
    assert len(z.loads) > 1
    cache = ZoneCache()
    analyse_outcomes(p, cache)
    heavier = replace(z.loads[0], mass=z.loads[0].mass * 1.1)
    edited = _with_zone(p, loads=(*z.loads[1:], heavier))
    h0, m0 = cache.rows.hits, cache.rows.misses
    got = analyse_outcomes(edited, cache)
    assert got is not None
    _same(got, analyse_outcomes(edited))
    n_edited = sum(c.x.size for c in got.cases if c.load_name == heavier.name)
    n_all = sum(c.x.size for c in got.cases)
    assert cache.rows.misses - m0 >= n_edited  # none of the edited load's rows taken
    assert cache.rows.hits - h0 > 0.5 * (n_all - n_edited)  # the others' mostly taken


def test_key_holds_the_level_loads_where_a_pad_is_given_by_its_force() -> None:
    """A crushable pad given by its crush force alone reads the largest footprint of
    the loads on its level (chain.pad_crush_stress): another zone's loads then feed
    every point's answer, and the key must change with them; with a crush stress
    given they do not."""
    p = random_project(1, pads=False)
    z = p.lift_zones[0]
    other = replace(z, id="Z2", loads=(replace(z.loads[0], footprint_length=3.0),))
    bigger = replace(other, loads=(replace(z.loads[0], footprint_length=4.0),))
    rect = Rect(0.0, 0.0, 2.0, 2.0)
    by_force = ProtectionArea("PAD", "pad", "L1", rect, "crushable", 0.1, None,
                              crush_force=1e5, crush_stroke=0.1)
    by_stress = replace(by_force, crush_force=None, crush_stress=2e5)
    for pad, changes in ((by_force, True), (by_stress, False)):
        a = replace(p, lift_zones=(z, other), protection_areas=(pad,))
        b = replace(p, lift_zones=(z, bigger), protection_areas=(pad,))
        assert (rows_key(a, z.level_id, z.hoist_speed)
                != rows_key(b, z.level_id, z.hoist_speed)) is changes
        # the window's zone cache too (before, an edit of another zone's loads left
        # this zone's results in the cache)
        assert (zone_key(a, z) != zone_key(b, z)) is changes


def test_no_rows_kept_where_a_row_depends_on_the_others(monkeypatch: pytest.MonkeyPatch
                                                        ) -> None:
    """Points chosen for their own time history by their group of bay and load
    (``chain.FLOOR_POINT_HISTORY`` with dynamic amplification) make a row's answer
    depend on the rows worked out with it: then nothing is remembered."""
    from droprig.solver import chain
    from droprig.solver.analysis import floor_model
    from droprig.solver.outcome_rows import OutcomeRows

    p = random_project(2, pads=False)
    on = replace(p.settings, dynamic_amplification=True)
    off = replace(p.settings, dynamic_amplification=False)
    level = p.levels[-1]
    assert OutcomeRows.serves(floor_model(level, on))  # as shipped: off for floors
    monkeypatch.setattr(chain, "FLOOR_POINT_HISTORY", True)
    assert not OutcomeRows.serves(floor_model(level, on))
    assert OutcomeRows.serves(floor_model(level, off))
    cache = ZoneCache()
    q = replace(p, settings=on)
    analyse_outcomes(q, cache)
    assert (cache.rows.hits, cache.rows.misses) == (0, 0)
