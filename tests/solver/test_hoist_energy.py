"""The hoist's lowering speed in the framing's energy: a load let go while lowering at
v_h strikes at V = √(v_h² + 2gh) and brings ½·M·V² = M·g·(h + v_h²/2g) (uniform
acceleration and kinetic energy, any dynamics text, e.g. Meriam & Kraige, Dynamics,
§3/6 — from memory). The framing's energy balance (Gere 7th ed. §9.10, Eq. 9-94) must
use that strike speed, the same as the local-damage step, and an allowable height
with a lowering speed is lower by v_h²/2g."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain
from droprig.solver.chain import Drop, Impact, InverseAnswers, LoadInputs, LocalDamage, run_chain

ROOT = Path(__file__).resolve().parents[2]
G = 9.80665  # standard gravity, m/s² (CGPM 1901)


@pytest.fixture(scope="module")
def demo():
    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = project.lift_zones[0]
    fm = analysis.build_floor(project.level(zone.level_id), project.settings)
    ext = fm.level.grid.extent
    rng = np.random.default_rng(11)
    x = rng.uniform(ext.x0, ext.x1, 200)
    y = rng.uniform(ext.y0, ext.y1, 200)
    geo = analysis.point_geometry(fm, project, x, y)
    return project, zone, fm, geo


def _chains(demo, v_h, load_index=0):
    project, zone, fm, geo = demo
    li = np.zeros(geo.x.size, dtype=np.int64)
    load = zone.loads[load_index]
    with np.errstate(all="ignore"):
        still = run_chain(Drop(fm, project, geo, (load,), li))
        moving = run_chain(Drop(fm, project, geo, (load,), li, v_hoist=v_h))
    return still, moving


def test_hoist_head_is_v_squared_over_2g():
    # hand calculation: 0.3² / (2 × 9.80665) = 0.0045888 m (4.6 mm)
    assert chain.hoist_head(0.3) == pytest.approx(0.3**2 / (2 * G), rel=1e-12)
    assert chain.hoist_head(0.3) == pytest.approx(4.5888e-3, rel=1e-4)
    assert chain.hoist_head(0.0) == 0.0


def test_framing_impact_uses_the_strike_speed_of_the_local_damage_step(demo):
    v_h = 0.3
    still, moving = _chains(demo, v_h)
    h = still[LoadInputs].h
    head = v_h**2 / (2 * G)
    # the same impact as a load let go at rest from h + v_h²/2g
    ref = chain.impact_at(still, h + head)
    np.testing.assert_allclose(moving[Impact].F, ref.F, rtol=1e-12)
    assert np.all(moving[Impact].F >= still[Impact].F)
    assert np.any(moving[Impact].F > still[Impact].F * (1 + 1e-6))
    # one strike speed: the local-damage step's V equals √(2g·(h + head))
    ld = moving[LocalDamage]
    a = ld.assessed
    if a.any():
        np.testing.assert_allclose(ld.v_strike[a], np.sqrt(2 * G * (h[a] + head)),
                                   rtol=1e-12)


def test_allowable_height_with_lowering_speed_is_lower_by_the_head(demo):
    v_h = 0.3
    head = v_h**2 / (2 * G)
    for k in range(len(demo[1].loads)):
        still, moving = _chains(demo, v_h, k)
        if still.drop.fm.settings.dynamic_amplification:
            pytest.skip("amplified heights are confirmed iteratively")
        h0 = still[InverseAnswers].h_el
        h1 = moving[InverseAnswers].h_el
        ok = np.isfinite(h0) & (h0 > head)
        assert ok.any()
        # the closed forms exactly; with two forces per point the heights are
        # searched on the forward chain, each within chain.H_TOL below its exact
        # boundary (chain.two_force_height): the two then agree within that (the
        # searched points: two forces, and crushable pads, chain.after_bottoming)
        two = still[Impact].searched
        tol = np.where(two if two is not None else False, chain.H_TOL, 1e-9)
        ok1 = ok & np.isfinite(h1)
        assert np.all(np.abs(h1[ok1] - (h0[ok1] - head))
                      <= tol[ok1] * np.maximum(h0[ok1], head) + 1e-12)
        # an allowed energy height below the head: no fall allowed at all (NaN)
        low = np.isfinite(h0) & (h0 < head) & (tol == 1e-9)
        assert np.all(np.isnan(h1[low]))
        p0, p1 = still[InverseAnswers].h_pl, moving[InverseAnswers].h_pl
        okp = np.isfinite(p0) & (p0 > head) & np.isfinite(p1)
        assert np.all(np.abs(p1[okp] - (p0[okp] - head))
                      <= tol[okp] * np.maximum(p0[okp], head) + 1e-12)


def test_the_allowable_height_holds_when_dropped_with_the_lowering_speed(demo):
    # closed loop: the forward chain at the printed fall with v_h stays at U ≤ 1
    project, zone, fm, geo = demo
    v_h = 0.5
    load = zone.loads[0]
    li = np.zeros(geo.x.size, dtype=np.int64)
    with np.errstate(all="ignore"):
        c = run_chain(Drop(fm, project, geo, (load,), li, v_hoist=v_h))
        h_el = c[InverseAnswers].h_el
        inp = c[LoadInputs]
        ok = np.isfinite(h_el)
        H = np.where(ok, h_el + inp.t_mat, 0.0)
        trial = run_chain(Drop(fm, project, geo, (load,), li, H=H, v_hoist=v_h))
    assert ok.any()
    U = chain.outputs(trial)["utilisation"]
    assert np.all(U[ok] <= 1.0 + 1e-6)
