"""The per-point chain as named steps: the runner, step replacement and the outputs
(properties of the implementation, no engineering source; the physics of each step is
checked against published sources in test_analysis.py, test_impact.py, …)."""

from __future__ import annotations

from dataclasses import dataclass, replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, evaluate
from droprig.solver.chain import Chain, Compliance, Drop, Impact, outputs, run_chain
from droprig.solver.geometry import take_geo

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def demo():
    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = project.lift_zones[0]
    fm = analysis.build_floor(project.level(zone.level_id), project.settings)
    ext = fm.level.grid.extent
    rng = np.random.default_rng(2)
    x = rng.uniform(ext.x0, ext.x1, 300)
    y = rng.uniform(ext.y0, ext.y1, 300)
    geo = analysis.point_geometry(fm, project, x, y)
    return project, zone, fm, geo


def test_steps_run_in_order_and_each_returns_its_dataclass(demo):
    project, zone, fm, geo = demo
    c = evaluate.evaluate_chain(fm, project, zone.loads[0], geo)
    names = [type(r).__name__ for r in c.history]
    assert len(names) == len(chain.STEPS)
    core = ["LoadInputs", "Compliance", "StruckMass", "Impact", "Demands", "Checks",
            "BeyondYield", "InverseAnswers"]
    # the core steps in their order (physics steps may sit between them; a step may
    # return an earlier type to replace it, e.g. the amplified Demands)
    assert [n for i, n in enumerate(names) if n in core and n not in names[:i]] == core
    assert names.index("DynamicAmplification") == names.index("Demands") + 1
    for r in c.history:
        assert type(r).__dataclass_params__.frozen, type(r).__name__


def test_outputs_equal_the_vectorised_evaluation(demo):
    # the vectorised evaluation is the chain's run, and where a footprint lies partly on
    # a crushable pad the worse of it and the tip-off's run (chain.merge_tip_off; the
    # rooftop's pads: 57 of the 300 points), where the drop height is at most the
    # tip-off's Δ (9 of them) the lower of the two cases' allowable heights only
    project, zone, fm, geo = demo
    c = evaluate.evaluate_chain(fm, project, zone.loads[0], geo, detail=False)
    got = outputs(c)
    rows, delta, top, reach = chain.tip_off_case_rows(c.drop)
    assert rows.size > 0 and not reach.all()
    sub = take_geo(geo, rows, steps=False)
    tip = outputs(evaluate.evaluate_chain(fm, project, zone.loads[0], sub, detail=False,
                                          tip_off=delta))
    merged = chain.merge_tip_off({k: v[rows] for k, v in got.items()}, tip, top, reach)
    for k, v in merged.items():
        got[k] = got[k].copy()
        got[k][rows] = v
    ref = evaluate.evaluate_case(fm, project, zone.loads[0], geo)
    assert set(got) == set(ref) == set(evaluate.OUTPUTS)
    for k, v in ref.items():
        np.testing.assert_array_equal(got[k], v, err_msg=k)


def test_a_step_that_returns_an_earlier_type_replaces_it(demo, monkeypatch):
    # a step inserted after compliance that doubles the deck's compliance: the
    # impact step must read the replaced Compliance (how a physics step plugs in)
    project, zone, fm, geo = demo

    def softer_deck(c: Chain) -> Compliance:
        comp = c[Compliance]
        return replace(comp, f_deck=2 * comp.f_deck, f_struct=comp.f_struct + comp.f_deck,
                       f_series=comp.f_series + comp.f_deck, f=comp.f + comp.f_deck)

    li = np.zeros(geo.x.size, dtype=np.int64)
    drop = Drop(fm, project, geo, (zone.loads[0],), li)
    with np.errstate(all="ignore"):
        base = run_chain(drop)
        steps = list(chain.STEPS)
        steps.insert(steps.index(chain.compliance) + 1, softer_deck)
        monkeypatch.setattr(chain, "STEPS", tuple(steps))
        soft = run_chain(drop)
    assert len(soft.history) == len(base.history) + 1
    f_new = soft[Compliance].f
    np.testing.assert_array_equal(f_new, base[Compliance].f + base[Compliance].f_deck)
    np.testing.assert_array_equal(soft[Impact].d_st, soft.drop.per_point(
        [zone.loads[0].weight]) * f_new)
    # a softer path never raises the one-mass force (Gere Eq. 9-94 decreases in f):
    # the deck's force of a hard load, and the force wherever there is one force
    # (the two-mass framing force is not monotone in the contact spring: a softer
    # contact can meet the framing's period, Clough & Penzien 2-DOF; its own bounds
    # are tested in test_two_force_envelope.py)
    imp_s, imp_b = soft[Impact], base[Impact]
    one = imp_s.F_deck if imp_s.F_deck is not None else imp_s.F
    one_b = imp_b.F_deck if imp_b.F_deck is not None else imp_b.F
    hard = (zone.loads[0].contact_stiffness is None) | (imp_s.two_mass is None)
    if hard:
        assert np.all(one <= one_b * (1 + 1e-12))
    two = imp_s.two_mass if imp_s.two_mass is not None else np.zeros(one.shape, bool)
    # (a crushable pad that bottoms out: the rest of the fall by the two-mass model)
    pad_two = (imp_s.searched & imp_s.bottomed if imp_s.searched is not None
               else np.zeros(one.shape, bool))
    one_f = ~two & ~pad_two
    assert np.all(imp_s.F[one_f] <= imp_b.F[one_f] * (1 + 1e-12))
    # the softer contact spring is read by the two-mass step: its contact force stays
    # within the energy bound on the new contact spring, W(1 + √(1 + 2h/(W·f_c) +
    # f_s/f_c)) (Clough & Penzien, energy of a 2-DOF system)
    if two.any():
        comp = soft[Compliance]
        W = soft.drop.per_point([zone.loads[0].weight])
        h = chain.energy_fall(soft, soft[chain.LoadInputs].h)
        Bc = W * (1 + np.sqrt(1 + 2 * h / (W * comp.f_series) + comp.f_s / comp.f_series))
        assert imp_s.F_contact is not None
        Fc = np.minimum(imp_s.F_contact, np.maximum(imp_s.F_crush, imp_s.F))
        assert np.all(Fc[two] <= Bc[two] * (1 + 1e-9))


@dataclass(frozen=True, eq=False)
class _Extra:
    F_over_W: np.ndarray


def test_a_new_step_is_read_by_type(demo, monkeypatch):
    project, zone, fm, geo = demo

    def extra(c: Chain) -> _Extra:
        return _Extra(c[Impact].F / c.drop.per_point([zone.loads[0].weight]))

    monkeypatch.setattr(chain, "STEPS", (*chain.STEPS, extra))
    c = evaluate.evaluate_chain(fm, project, zone.loads[0], geo)
    assert _Extra in c
    np.testing.assert_allclose(c[_Extra].F_over_W, c[Impact].K, rtol=1e-12)
