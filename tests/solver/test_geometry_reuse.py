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
