"""The window's incremental re-analysis (droprig.solver.ZoneCache): an edit re-analyses
only the zones it changes, and its results equal a full analysis of the edited project
bit for bit. A property of the implementation, no engineering source: the reference is
droprig's own full analysis (:func:`droprig.solver.analyse`). Projects are the
invented demo with a second lift zone of our own.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

from droprig.io.project_file import load_project
from droprig.model import Project
from droprig.solver import Results, ZoneCache, analyse
from tests.builders import same_results

ROOT = Path(__file__).resolve().parents[2]


def _two_zones() -> Project:
    """The rooftop demo (invented) with a second lift zone of our own inside the first's ring."""
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    z = p.lift_zones[0]
    second = replace(z, id="MC2", r_min=0.0, r_max=0.5 * z.r_min, loads=z.loads[:2])
    return replace(p, lift_zones=(z, second))


def _same(a: Results, b: Results) -> None:
    """Every case array, bay summary, warning and fall equal, bit for bit (NaN
    equal NaN)."""
    same_results(a, b)


def test_zone_edit_equals_full_analysis_bit_for_bit() -> None:
    p = _two_zones()
    cache = ZoneCache()
    _same(cache.analyse(p), analyse(p))
    assert (cache.misses, cache.hits) == (2, 0)
    z2 = p.lift_zones[1]
    edited = replace(p, lift_zones=(p.lift_zones[0], replace(z2, r_max=z2.r_max * 0.8)))
    _same(cache.analyse(edited), analyse(edited))
    # only the edited zone ran again
    assert (cache.misses, cache.hits) == (3, 1)


def test_load_edit_reanalyses_its_zone_only() -> None:
    p = _two_zones()
    cache = ZoneCache()
    cache.analyse(p)
    z1 = p.lift_zones[0]
    heavier = replace(z1.loads[0], mass=z1.loads[0].mass * 1.1)
    edited = replace(p, lift_zones=(replace(z1, loads=(heavier, *z1.loads[1:])),
                                    p.lift_zones[1]))
    _same(cache.analyse(edited), analyse(edited))
    assert (cache.misses, cache.hits) == (3, 1)


def test_settings_or_pad_edit_reanalyses_every_zone() -> None:
    p = _two_zones()
    cache = ZoneCache()
    cache.analyse(p)
    finer = replace(p, settings=replace(p.settings,
                                        ductility_limit=p.settings.ductility_limit * 0.9))
    _same(cache.analyse(finer), analyse(finer))
    assert (cache.misses, cache.hits) == (4, 0)
    pa = p.protection_areas[0]
    thicker = replace(p, protection_areas=(replace(pa, thickness=pa.thickness * 1.2),
                                           *p.protection_areas[1:]))
    _same(cache.analyse(thicker), analyse(thicker))
    assert (cache.misses, cache.hits) == (6, 0)


def test_undo_is_a_cache_hit_with_the_first_results() -> None:
    p = _two_zones()
    cache = ZoneCache()
    first = cache.analyse(p)
    z2 = p.lift_zones[1]
    cache.analyse(replace(p, lift_zones=(p.lift_zones[0], replace(z2, r_max=3.0))))
    again = cache.analyse(p)
    assert (cache.misses, cache.hits) == (3, 3)
    _same(again, first)


def test_the_cache_stays_bounded() -> None:
    p = _two_zones()
    cache = ZoneCache(size=2)
    z2 = p.lift_zones[1]
    for r in (2.0, 2.5, 3.0):
        cache.analyse(replace(p, lift_zones=(p.lift_zones[0], replace(z2, r_max=r))))
    assert len(cache._zones) == 2


def test_the_cache_holds_a_bounded_number_of_points() -> None:
    p = _two_zones()
    probe = ZoneCache()
    probe.analyse(p)
    one = max(r.n_points for r in probe._zones.values())
    cache = ZoneCache(max_points=one)  # room for about one zone's results
    z2 = p.lift_zones[1]
    for r in (2.0, 2.5):
        cache.analyse(replace(p, lift_zones=(p.lift_zones[0], replace(z2, r_max=r))))
        assert cache._points <= one or len(cache._zones) == 1
    assert cache._points == sum(r.n_points for r in cache._zones.values())
