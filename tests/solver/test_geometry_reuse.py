"""Trials of solver/confirm.py take their points' load path and member actions from
the analysis (geometry.take_geo / concat_geo, Family and UnitActions take / concat)
instead of working them out again: the values must be those worked out at the points
afresh, bit for bit. A property of the implementation, no engineering source: the
reference is droprig's own point_geometry and unit_actions. Floors are the invented
demo projects; points are random."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import floor, geometry
from droprig.solver.unit_actions import UnitActions, unit_actions

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


def _same_actions(a: UnitActions, b: UnitActions) -> None:
    for fam_a, fam_b in ((a.flexure, b.flexure), (a.shear, b.shear)):
        for attr in ("ut", "Et", "members", "resist", "fa", "F_allow", "src"):
            assert np.array_equal(getattr(fam_a, attr), getattr(fam_b, attr),
                                  equal_nan=True), attr
        assert fam_a.groups == fam_b.groups
        assert (fam_a.gmin is None) == (fam_b.gmin is None)
        if fam_a.gmin is not None:
            assert np.array_equal(fam_a.gmin, fam_b.gmin, equal_nan=True)
    for f in ("R_p", "rp_member", "rp_arm", "rp_cond", "nh_fa", "nh_member"):
        assert np.array_equal(getattr(a, f), getattr(b, f), equal_nan=True), f


def _same_geo(a: geometry.Geometry, b: geometry.Geometry) -> None:
    for f in ("x", "y", "bay", "protection", "opening"):
        assert np.array_equal(getattr(a, f), getattr(b, f)), f
    for f in a.path.__dataclass_fields__:
        assert np.array_equal(getattr(a.path, f), getattr(b.path, f), equal_nan=True), f


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_taken_and_joined_points_equal_points_worked_out_afresh(path: Path) -> None:
    p = load_project(path)
    fm = floor.floor_cache(p)(p.lift_zones[0].level_id)
    e = fm.level.grid.extent
    rng = np.random.default_rng(7)
    parts = []
    for n in (400, 37):
        g = geometry.point_geometry(fm, p, rng.uniform(e.x0, e.x1, n),
                                    rng.uniform(e.y0, e.y1, n))
        unit_actions(fm, g)
        parts.append(g)
    joined = geometry.concat_geo(parts)
    idx = rng.integers(0, joined.x.size, 300)  # repeats and any order, as trials take
    taken = geometry.take_geo(joined, idx)
    fresh = geometry.point_geometry(fm, p, joined.x[idx], joined.y[idx])
    _same_geo(taken, fresh)
    assert "ua" in taken.cache
    _same_actions(taken.cache["ua"], unit_actions(fm, fresh))


def _same_outputs(a: dict[str, np.ndarray], b: dict[str, np.ndarray]) -> None:
    assert set(a) == set(b)
    for k in a:
        assert np.array_equal(a[k], b[k], equal_nan=True), k


@pytest.mark.parametrize("tilted", [False, True], ids=["flat", "flat+tilted"])
@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_kept_height_free_steps_give_the_run_worked_out_afresh(path: Path,
                                                               tilted: bool) -> None:
    # the analysis keeps compliance, struck mass and slab resistance with its points
    # (evaluate_case keep=True); a trial at those points at other heights, with its
    # loads made not hard, takes them (chain.HEIGHT_FREE): every output equals the run
    # that works them out afresh, bit for bit
    from dataclasses import replace

    from droprig.solver import chain, evaluate

    p = load_project(path)
    p = replace(p, settings=replace(p.settings, tilted_landing=tilted))
    zone = p.lift_zones[0]
    fm = floor.floor_cache(p)(zone.level_id)
    e = fm.level.grid.extent
    rng = np.random.default_rng(11)
    loads = list(zone.loads)
    parts, lis = [], []
    for n in (300, 41):
        g = geometry.point_geometry(fm, p, rng.uniform(e.x0, e.x1, n),
                                    rng.uniform(e.y0, e.y1, n))
        li = rng.integers(0, len(loads), n)
        evaluate.evaluate_case(fm, p, loads, g, li, v_hoist=zone.hoist_speed, keep=True)
        assert isinstance(g.cache.get("steps"), geometry.KeptSteps)
        parts.append(g)
        lis.append(li)
    joined = geometry.concat_geo(parts)
    li_all = np.concatenate(lis)
    idx = rng.integers(0, joined.x.size, 250)
    taken = geometry.take_geo(joined, idx)
    trial_loads = [replace(ld, hard=False) for ld in loads]
    H = rng.uniform(0.05, 8.0, idx.size)
    assert taken.cache["steps"].given(trial_loads, li_all[idx], "flat", None) is not None
    fresh = geometry.point_geometry(fm, p, joined.x[idx], joined.y[idx])
    assert "steps" not in fresh.cache
    with np.errstate(all="ignore"):
        got = evaluate.evaluate_case(fm, p, trial_loads, taken, li_all[idx], H=H,
                                     trial=True, v_hoist=zone.hoist_speed)
        ref = evaluate.evaluate_case(fm, p, trial_loads, fresh, li_all[idx], H=H,
                                     trial=True, v_hoist=zone.hoist_speed)
    _same_outputs(got, ref)
    # and the kept results are those a fresh run works out
    d = chain.Drop(fm, p, fresh, tuple(trial_loads), li_all[idx], H=H, trial=True)
    with np.errstate(all="ignore"):
        c = chain.run_chain(d)
    kept = taken.cache["steps"].by_landing["flat"]
    for t in chain.HEIGHT_FREE.values():
        for f in t.__dataclass_fields__:
            a, b = getattr(kept[t], f), getattr(c[t], f)
            assert (a is None and b is None) or np.array_equal(a, b, equal_nan=True), f


def test_kept_steps_are_not_given_to_another_run() -> None:
    # a trial mat changes the compliance and the struck mass; other loads or rows
    # are another run
    from dataclasses import replace

    from droprig.solver import evaluate

    p = load_project(DEMOS[0])
    zone = p.lift_zones[0]
    fm = floor.floor_cache(p)(zone.level_id)
    e = fm.level.grid.extent
    rng = np.random.default_rng(3)
    g = geometry.point_geometry(fm, p, rng.uniform(e.x0, e.x1, 50),
                                rng.uniform(e.y0, e.y1, 50))
    li = np.zeros(50, dtype=np.int64)
    evaluate.evaluate_case(fm, p, list(zone.loads), g, li, keep=True)
    kept = g.cache["steps"]
    assert kept.given(zone.loads, li, "flat", None) is not None
    assert kept.given(zone.loads, li, "flat", np.full(50, 1e6)) is None
    assert kept.given(zone.loads, li, "tilted", None) is None
    assert kept.given(zone.loads, li[:49], "flat", None) is None
    heavier = [replace(ld, mass=ld.mass * 2) for ld in zone.loads]
    assert kept.given(heavier, li, "flat", None) is None
    # a mat trial keeps nothing either
    g2 = geometry.point_geometry(fm, p, g.x, g.y)
    evaluate.evaluate_case(fm, p, list(zone.loads), g2, li, mat_k=np.full(50, 1e6),
                           keep=True)
    assert "steps" not in g2.cache


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_analysis_with_kept_steps_equals_the_analysis_without(path: Path,
                                                              monkeypatch) -> None:
    from dataclasses import fields

    from droprig.solver import analysis, chain

    p = load_project(path)
    got = analysis.analyse(p)
    monkeypatch.setattr(chain, "HEIGHT_FREE", {})
    ref = analysis.analyse(p)
    assert len(got.cases) == len(ref.cases)
    for a, b in zip(got.cases, ref.cases, strict=True):
        for f in fields(a):
            va, vb = getattr(a, f.name), getattr(b, f.name)
            if isinstance(va, np.ndarray):
                assert np.array_equal(va, vb, equal_nan=True), f.name
            else:
                assert va == vb, f.name
    assert got.bays == ref.bays


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_repeated_points_take_the_geometry_of_their_first(path: Path) -> None:
    # trials refine around the same worst points: each distinct point's path and
    # member actions are worked out once and taken for its repeats, bit for bit those
    # worked out at every row
    p = load_project(path)
    fm = floor.floor_cache(p)(p.lift_zones[0].level_id)
    e = fm.level.grid.extent
    rng = np.random.default_rng(5)
    x0, y0 = rng.uniform(e.x0, e.x1, 60), rng.uniform(e.y0, e.y1, 60)
    pick = rng.integers(0, 60, 200)
    x, y = x0[pick], y0[pick]
    got = geometry.distinct_point_geometry(fm, p, x, y)
    fresh = geometry.point_geometry(fm, p, x, y)
    _same_geo(got, fresh)
    _same_actions(got.cache["ua"], unit_actions(fm, fresh))
    # no repeats: the plain geometry
    once = geometry.distinct_point_geometry(fm, p, x0, y0)
    _same_geo(once, geometry.point_geometry(fm, p, x0, y0))


def _fresh_floor(p):
    floor._FLOORS.clear()
    return floor.floor_cache(p)(p.lift_zones[0].level_id)


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_remembered_point_sets_equal_points_worked_out_afresh(path: Path) -> None:
    """The prepared floor remembers the geometry and member actions of a point set
    (geometry.point_geometry, KEPT_POINTS): asked again for the same points it gives
    what a floor prepared afresh works out, bit for bit; the caller's arrays changed
    afterwards change nothing kept; the chain's kept steps are not carried over; other
    protection areas are another set."""
    from dataclasses import replace

    p = load_project(path)
    fm = _fresh_floor(p)
    e = fm.level.grid.extent
    rng = np.random.default_rng(11)
    x, y = rng.uniform(e.x0, e.x1, 500), rng.uniform(e.y0, e.y1, 500)
    first = geometry.point_geometry(fm, p, x, y)
    unit_actions(fm, first)
    first.cache["steps"] = object()  # load-dependent: stays with this geometry
    x0 = x.copy()
    x[:] = -1.0  # the caller's own array, changed
    again = geometry.point_geometry(fm, p, x0, y)
    assert again is not first
    assert "ua" in again.cache and "steps" not in again.cache
    assert again.cache["ua"] is first.cache["ua"]  # taken, not worked out again
    fresh = geometry.point_geometry(_fresh_floor(p), p, x0, y)
    _same_geo(again, fresh)
    _same_actions(again.cache["ua"], unit_actions(floor.floor_cache(p)(fm.level.id), fresh))
    # a pad laid over the whole level: the same points are another set
    from droprig.model import ProtectionArea, Rect

    pad = ProtectionArea("pad", "pad", fm.level.id, Rect(e.x0, e.y0, e.x1, e.y1),
                         kind="spring", thickness=0.05, stiffness=1e7)
    q = replace(p, protection_areas=(pad, *p.protection_areas))  # the first one counts
    under = geometry.point_geometry(fm, q, x0, y)
    assert "ua" not in under.cache
    assert np.all(under.protection == 0)


def test_large_point_sets_are_not_remembered() -> None:
    """A set of more than half of KEPT_POINTS (a large job's block) is worked out
    every time and leaves nothing kept."""
    p = load_project(DEMOS[0])
    fm = _fresh_floor(p)
    e = fm.level.grid.extent
    n = geometry.KEPT_POINTS // 2 + 1
    rng = np.random.default_rng(3)
    x, y = rng.uniform(e.x0, e.x1, n), rng.uniform(e.y0, e.y1, n)
    geometry.point_geometry(fm, p, x, y)
    assert not fm._memo.get("point_geometry")


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_carried_point_masses_equal_masses_worked_out_afresh(path: Path) -> None:
    """The path's mass with the slab and the column-moved mass (chain.slab_path_mass,
    column_path_mass; geometry.PER_POINT_MASSES) are worked out once per point set and
    carried by evaluate.tile, take_geo, concat_geo and evaluate.distinct_geometry, and
    kept with a remembered point set: every carried value equals the one worked out at
    the same points afresh, bit for bit."""
    from droprig.solver import chain, evaluate

    p = load_project(path)
    fm = _fresh_floor(p)
    e = fm.level.grid.extent
    rng = np.random.default_rng(13)

    def fresh_masses(g: geometry.Geometry) -> tuple[np.ndarray, np.ndarray]:
        f = geometry.point_geometry(fm, p, g.x.copy() + 0.0, g.y.copy())
        f.cache.clear()
        return chain.slab_path_mass_at(fm, f), chain.column_path_mass_at(fm, f)

    def same(g: geometry.Geometry) -> None:
        want = fresh_masses(g)
        for key, w in zip(geometry.PER_POINT_MASSES, want, strict=True):
            assert key in g.cache, key
            assert np.array_equal(g.cache[key], w, equal_nan=True), key

    x, y = rng.uniform(e.x0, e.x1, 120), rng.uniform(e.y0, e.y1, 120)
    base = geometry.point_geometry(fm, p, x, y)
    tiled = evaluate.tile(fm, base, 3)
    same(tiled)
    # the remembered set keeps them: asked again, the arrays are the ones worked out
    again = geometry.point_geometry(fm, p, x, y)
    assert again.cache["slab_path_mass"] is base.cache["slab_path_mass"]
    pick = rng.integers(0, 120, 90)
    rep = evaluate.distinct_geometry(fm, p, x[pick], y[pick])
    same(rep)
    joined = geometry.concat_geo([tiled, rep])
    same(joined)
    same(geometry.take_geo(joined, rng.integers(0, joined.x.size, 200)))
    # a part without them: the join carries none (the chain works them out)
    bare = geometry.point_geometry(fm, p, x[:7] + 0.01, y[:7])
    assert "slab_path_mass" not in geometry.concat_geo([tiled, bare]).cache
