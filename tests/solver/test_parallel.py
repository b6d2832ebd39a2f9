"""Blocks of drop points on several threads, and the allocator setting: results must
not depend on either (properties of the implementation, no engineering source)."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate, floor, loadpath, memory, parallel
from droprig.solver.chain import FIELDS

ROOT = Path(__file__).resolve().parents[2]


def test_blocks_cover_the_range_once_and_keep_errstate():
    seen = np.zeros(1000, dtype=int)
    out = np.empty(1000)

    def fn(s: int, e: int) -> None:
        seen[s:e] += 1
        out[s:e] = np.log(np.zeros(e - s))  # would warn (an error under pytest) outside

    with np.errstate(divide="ignore"):
        parallel.for_blocks(fn, 1000, 64)
    assert np.all(seen == 1)
    assert np.all(out == -np.inf)


def test_an_error_in_a_block_reaches_the_caller():
    def fn(s: int, e: int) -> None:
        if s >= 500:
            raise ValueError("block failed")

    with pytest.raises(ValueError, match="block failed"):
        parallel.for_blocks(fn, 1000, 50)


def test_thread_count_from_the_environment(monkeypatch):
    monkeypatch.setenv("DROPRIG_THREADS", "1")
    assert parallel.workers() == 1
    monkeypatch.setenv("DROPRIG_THREADS", "3")
    assert parallel.workers() == 3
    monkeypatch.setenv("DROPRIG_THREADS", "many")
    assert 1 <= parallel.workers() <= 8


@pytest.mark.parametrize("name", ["rooftop_plant_swap", "steel_erection_floor"])
def test_results_do_not_depend_on_threads_or_block_size(monkeypatch, name):
    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    zone = project.lift_zones[0]
    fm = analysis.build_floor(project.level(zone.level_id), project.settings)
    ext = fm.level.grid.extent
    rng = np.random.default_rng(11)
    x = rng.uniform(ext.x0, ext.x1, 6000)
    y = rng.uniform(ext.y0, ext.y1, 6000)
    li = rng.integers(0, len(zone.loads), x.size)

    def run(threads: str, block: int) -> dict[str, np.ndarray]:
        monkeypatch.setenv("DROPRIG_THREADS", threads)
        monkeypatch.setattr(loadpath, "CHUNK", block)
        geo = analysis.point_geometry(fm, project, x, y)
        return evaluate.evaluate_case(fm, project, list(zone.loads), geo, li)

    ref = run("1", 1 << 14)  # one block
    for threads, block in (("1", 700), ("2", 700), ("4", 512)):
        got = run(threads, block)
        for k, v in ref.items():
            np.testing.assert_array_equal(got[k], v, err_msg=f"{k} {threads} {block}")


def test_allocator_setting_is_idempotent_and_harmless():
    first = memory.keep_freed_memory()
    assert memory.keep_freed_memory() is first
    memory.release_memory()
    a = np.ones(1 << 20)
    assert a.sum() == float(1 << 20)


@pytest.mark.parametrize("name", ["rooftop_plant_swap", "steel_erection_floor"])
def test_block_path_for_large_zones_gives_the_same_results(monkeypatch, name):
    # zones above CACHE_MAX_POINTS go block by block (load path per block, shared by
    # the loads): the results equal the tiled path of smaller zones bit for bit
    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    ref = analysis.analyse(project)
    monkeypatch.setattr(evaluate, "CACHE_MAX_POINTS", 100)
    monkeypatch.setattr(loadpath, "CHUNK", 1000)
    monkeypatch.setenv("DROPRIG_THREADS", "2")
    floor._FLOORS.clear()
    got = analysis.analyse(project)
    assert got.bays == ref.bays
    for c_ref, c_got in zip(ref.cases, got.cases, strict=True):
        for k in FIELDS:
            np.testing.assert_array_equal(getattr(c_got, k), getattr(c_ref, k), err_msg=k)


@pytest.mark.parametrize("name", ["rooftop_plant_swap", "steel_erection_floor"])
def test_per_point_heights_equal_a_load_per_point(monkeypatch, name):
    # the plastic-height confirmation drops each point from its own trial height: given
    # as an array beside one load per zone load (Drop.H), the outputs equal those
    # of a load object per point (the earlier way) bit for bit, in one block or many
    from dataclasses import replace

    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    zone = project.lift_zones[0]
    fm = analysis.build_floor(project.level(zone.level_id), project.settings)
    ext = fm.level.grid.extent
    rng = np.random.default_rng(5)
    n = 300
    x = rng.uniform(ext.x0, ext.x1, n)
    y = rng.uniform(ext.y0, ext.y1, n)
    li = rng.integers(0, len(zone.loads), n)
    heights = rng.uniform(0.5, 6.0, n)
    geo = analysis.point_geometry(fm, project, x, y)
    per_point = [replace(zone.loads[int(j)], drop_height=float(h), hook_elevation=None,
                         hang_length=0.0, hard=False) for j, h in zip(li, heights, strict=True)]
    ref = evaluate.evaluate_case(fm, project, per_point, geo, np.arange(n))
    trial = [replace(ld, drop_height=1.0, hook_elevation=None, hang_length=0.0, hard=False)
             for ld in zone.loads]
    for block in (1 << 14, 64):
        monkeypatch.setattr(loadpath, "CHUNK", block)
        got = evaluate.evaluate_case(fm, project, trial, geo, li, H=heights)
        for k, v in ref.items():
            np.testing.assert_array_equal(got[k], v, err_msg=f"{k} block {block}")
    np.testing.assert_array_equal(got["drop_height"], heights)
