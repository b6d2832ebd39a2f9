"""The allowable-height searches' fast kernel against its plain reference.

``chain.TwoForceKernel`` gathers the height-free inputs of the impact step at the
points with two forces and on crushable pads (``Impact.searched``) once and redoes
only the height's arithmetic;
``struck_mass.EnvelopeLookup`` keeps the envelope's cell in μ and κ. Their plain
references are the chain's own impact step (``chain.impact_at``: Gere, *Mechanics of
Materials* 7th ed. §9.10 Eq. 9-94, the crushing-limited impact, the two-mass
envelope of CEB Bulletin 187 — from memory) and ``struck_mass.envelope_two_forces``.
Both do the same arithmetic in the same order: compared at 1e-12 (floating-point
noise only; common practice, no source). Points are random over the invented demo
projects.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, struck_mass
from droprig.solver.chain import Impact, LoadInputs, TwoForceKernel, impact_at
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.impact import G

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))
TOL = 1e-12


def _chains(demo: Path, seed: int, n: int = 80):
    p = load_project(demo)
    rng = np.random.default_rng(seed)
    for zone in p.lift_zones:
        lv = p.level(zone.level_id)
        fm = analysis.build_floor(lv, p.settings)
        ext = lv.grid.extent
        xs = rng.uniform(ext.x0, ext.x1, n)
        ys = rng.uniform(ext.y0, ext.y1, n)
        geo = analysis.point_geometry(fm, p, xs, ys)
        for load in zone.loads:
            yield evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed), rng


@pytest.mark.parametrize("demo", DEMOS, ids=lambda p: p.stem)
def test_kernel_gives_the_impact_steps_forces(demo):
    seen = pads = 0
    for c, rng in _chains(demo, 4):
        # the searched points: those with two forces and those on a crushable pad
        # (chain.after_bottoming where a drop bottoms it out)
        two = c[Impact].searched
        assert two is not None
        pads += int((two & c[LoadInputs].crushable).sum())
        if not two.any():
            continue
        idx = np.flatnonzero(two)
        kern = TwoForceKernel(c, idx)
        # heights from a hair above zero to well past any allowable fall (m)
        for h_try in (np.zeros(c.drop.n), 10 ** rng.uniform(-5, 1.5, c.drop.n)):
            ref = impact_at(c, h_try)
            F, F_deck, eta_f = kern.forces(h_try[idx])
            assert ref.F_deck is not None and ref.eta_frame is not None
            np.testing.assert_allclose(F, ref.F[idx], rtol=TOL)
            np.testing.assert_allclose(F_deck, ref.F_deck[idx], rtol=TOL)
            np.testing.assert_allclose(eta_f, ref.eta_frame[idx], rtol=TOL)
            # rows: any subset, repeated, in any order
            rows = rng.integers(0, idx.size, 3 * idx.size)
            Fr, Fdr, er = kern.forces(h_try[idx][rows], rows)
            np.testing.assert_allclose(Fr, F[rows], rtol=TOL)
            np.testing.assert_allclose(Fdr, F_deck[rows], rtol=TOL)
            np.testing.assert_allclose(er, eta_f[rows], rtol=TOL)
        seen += idx.size
    assert seen > 50
    # the rooftop and steel demos have crushable pads under part of the floor
    assert (pads > 20) == (demo.stem != "two_level_rigging")


def _random_systems(rng: np.random.Generator, n: int):  # type: ignore[no-untyped-def]
    """n random two-mass systems over and beyond the envelope's table (μ 10⁻⁴–10⁵,
    κ 10⁻³–10⁸, ĥ 10⁻⁵–10⁹): weight W (N), fall h (m), contact and framing
    stiffnesses kc, k2 (N/m), floor mass m2 (kg)."""
    M = 10 ** rng.uniform(0, 4.5, n)
    m2 = M * 10 ** rng.uniform(-4, 5, n)
    k2 = 10 ** rng.uniform(5, 9, n)
    kc = k2 * 10 ** rng.uniform(-3, 8, n)
    W = M * G
    h = W / k2 * 10 ** rng.uniform(-5, 9, n)
    return W, h, kc, k2, m2


def test_envelope_lookup_is_the_envelope():
    # random systems over and beyond the table (μ 10⁻⁴–10⁵, κ 10⁻³–10⁸, ĥ 10⁻⁵–10⁹)
    rng = np.random.default_rng(11)
    n = 20_000
    W, h, kc, k2, m2 = _random_systems(rng, n)
    ref = struck_mass.envelope_two_forces(W, h, 1 / kc, 1 / k2, m2)
    look = struck_mass.EnvelopeLookup(W, 1 / kc, 1 / k2, m2)
    got = look.at(h)
    for a, b in zip(got, ref, strict=True):
        np.testing.assert_allclose(a, b, rtol=TOL)
    rows = rng.integers(0, n, 4000)
    got = look.at(1.7 * h[rows], rows)
    ref = struck_mass.envelope_two_forces(W[rows], 1.7 * h[rows], 1 / kc[rows],
                                          1 / k2[rows], m2[rows])
    for a, b in zip(got, ref, strict=True):
        np.testing.assert_allclose(a, b, rtol=TOL)


def test_envelope_lookup_reads_the_corners_alike_in_one_pass_or_one_by_one(monkeypatch):
    # few rows: the four (μ, κ) corners are read in one pass (EnvelopeLookup._FUSED_ROWS),
    # many: one at a time; both add them in the same order, so they agree bit for bit
    # (a property of the implementation), and both are the plain envelope at 1e-12
    rng = np.random.default_rng(12)
    n = 3000
    W, h, kc, k2, m2 = _random_systems(rng, n)
    h[:20] = 0.0  # no fall
    look = struck_mass.EnvelopeLookup(W, 1 / kc, 1 / k2, m2)
    rows = rng.integers(0, n, 700)
    assert rows.size <= look._FUSED_ROWS
    fused = look.at(h[rows], rows)
    monkeypatch.setattr(struck_mass.EnvelopeLookup, "_FUSED_ROWS", 0)
    by_corner = look.at(h[rows], rows)
    ref = struck_mass.envelope_two_forces(W[rows], h[rows], 1 / kc[rows], 1 / k2[rows],
                                          m2[rows])
    for a, b, r in zip(fused, by_corner, ref, strict=True):
        assert np.array_equal(a, b)
        np.testing.assert_allclose(a, r, rtol=TOL)


@pytest.mark.parametrize("demo", DEMOS, ids=lambda p: p.stem)
def test_kernel_at_another_mass_is_that_loads_impact_step(demo):
    # the allowable-mass search (chain.two_force_mass) runs the kernel at trial masses:
    # its forces are those of the chain run with a load of that mass (same underside
    # and footprint), at 1e-12
    p = load_project(demo)
    rng = np.random.default_rng(5)
    seen = 0
    for zone in p.lift_zones:
        lv = p.level(zone.level_id)
        fm = analysis.build_floor(lv, p.settings)
        ext = lv.grid.extent
        geo = analysis.point_geometry(fm, p, rng.uniform(ext.x0, ext.x1, 60),
                                      rng.uniform(ext.y0, ext.y1, 60))
        for load in zone.loads:
            c = evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)
            two = c[Impact].searched
            assert two is not None
            k = float(rng.uniform(0.1, 3.0))
            c2 = evaluate_chain(fm, p, replace(load, mass=k * load.mass), geo,
                                v_hoist=zone.hoist_speed)
            both = two & c2[Impact].searched
            if not both.any():
                continue
            idx = np.flatnonzero(two)
            kern = TwoForceKernel(c, idx)
            rows = np.flatnonzero(both[idx])
            pts = idx[rows]
            h = c[LoadInputs].h[pts]
            F, F_deck, eta_f = kern.forces_at_mass(h, np.full(rows.size, k * load.mass), rows)
            ref = c2[Impact]
            assert ref.F_deck is not None and ref.eta_frame is not None
            np.testing.assert_allclose(F, ref.F[pts], rtol=TOL)
            np.testing.assert_allclose(F_deck, ref.F_deck[pts], rtol=TOL)
            np.testing.assert_allclose(eta_f, ref.eta_frame[pts], rtol=TOL)
            seen += rows.size
    assert seen > 20


def test_searches_answer_alike_whatever_rows_a_forward_run_takes(monkeypatch):
    # chain.two_force_height runs its forward runs EXCESS_ROWS rows at a time (memory
    # of a large block); every row's arithmetic is its own, so the answers are the
    # same bit for bit with any number (a property of the implementation)
    from droprig.solver import chain
    from droprig.solver.chain import InverseAnswers

    p = load_project(DEMOS[0])
    zone = p.lift_zones[0]
    fm = analysis.build_floor(p.level(zone.level_id), p.settings)
    ext = fm.level.grid.extent
    rng = np.random.default_rng(8)
    geo = analysis.point_geometry(fm, p, rng.uniform(ext.x0, ext.x1, 400),
                                  rng.uniform(ext.y0, ext.y1, 400))
    ref = evaluate_chain(fm, p, zone.loads, geo, rng.integers(0, len(zone.loads), 400),
                         v_hoist=zone.hoist_speed)
    assert ref[Impact].two_mass is not None and ref[Impact].two_mass.sum() > 50
    monkeypatch.setattr(chain, "EXCESS_ROWS", 7)
    got = evaluate_chain(fm, p, zone.loads, geo, ref.drop.li, v_hoist=zone.hoist_speed)
    for f in ("h_el", "h_pl", "m_allow"):
        assert np.array_equal(getattr(got[InverseAnswers], f),
                              getattr(ref[InverseAnswers], f), equal_nan=True), f
