"""Two forces per point on the invented demo projects, judged as an engineer would.

* A heavy load on a soft underside (mass at least a fifth of the struck floor's,
  m2 ≤ 5·M) never gets a lighter framing force than the energy method of the framing
  alone: the one-mass balance with the steel's share of the mass, F = W(1 + √(1 +
  2ηh/(W·f))), η = M/(M + m_e) (Gere, *Mechanics of Materials* 7th ed. §9.10 Eq. 9-94;
  Timoshenko, *Strength of Materials* Part I). Its contact pulse is long against the
  framing's period, so the framing follows it with a dynamic load factor ≥ 1 (Biggs,
  *Introduction to Structural Dynamics*, 1964, ch. 2, half-sine pulse — from memory).
* A light hard item (contact spring at least ten times as stiff as the framing) does
  not read an absurd framing force: its contact lasts a fraction of the framing's
  period, so the framing takes an impulse — at most 2·M·v for an elastic bounce of the
  load — and then F ≤ v2·√(k2·m2) + W with v2 = 2Mv/(M + m2) (impulse–momentum and
  the free vibration of the struck mass; Biggs 1964 ch. 2, impulsive loading — from
  memory). droprig's envelope over lower drops may lie above the pointwise two-mass
  peak by its table's margin (×1.03) and the raise of its covering nodes (together
  up to ×1.03 for these points; ×1.27 before the nodes covered only the samples);
  :data:`MOMENTUM_MARGIN` allows that and no more.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis
from droprig.solver.chain import Compliance, Impact, LoadInputs, StruckMass, energy_fall
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.impact import G

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))
MOMENTUM_MARGIN = 1.05


def _chains(demo: Path, seed: int, n: int = 300):
    p = load_project(demo)
    rng = np.random.default_rng(seed)
    for zone in p.lift_zones:
        lv = p.level(zone.level_id)
        fm = analysis.build_floor(lv, p.settings)
        ext = lv.grid.extent
        geo = analysis.point_geometry(fm, p, rng.uniform(ext.x0, ext.x1, n),
                                      rng.uniform(ext.y0, ext.y1, n))
        for load in zone.loads:
            yield load, evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)


@pytest.mark.parametrize("demo", DEMOS, ids=lambda p: p.stem)
def test_heavy_soft_units_never_lighter_than_the_framing_alone(demo):
    seen = 0
    for load, c in _chains(demo, 2):
        if load.contact_stiffness is None:
            continue
        imp, sm, comp, inp = c[Impact], c[StruckMass], c[Compliance], c[LoadInputs]
        assert imp.two_mass is not None and sm.m2 is not None
        W, h = inp.W, energy_fall(c, inp.h)
        heavy = imp.two_mass & (sm.m2 <= 5.0 * inp.M)
        F_steel = W * (1.0 + np.sqrt(1.0 + 2.0 * sm.eta * h / (W * comp.f)))
        assert np.all(imp.F[heavy] >= F_steel[heavy] * (1 - 1e-9))
        seen += int(heavy.sum())
    if demo.stem == "two_level_rigging":
        assert seen == 0  # no soft load there
    else:
        assert seen > 20


@pytest.mark.parametrize("demo", DEMOS, ids=lambda p: p.stem)
def test_light_hard_items_bounded_by_their_momentum(demo):
    seen = 0
    for load, c in _chains(demo, 3):
        if load.contact_stiffness is not None:
            continue
        imp, sm, comp, inp = c[Impact], c[StruckMass], c[Compliance], c[LoadInputs]
        assert imp.two_mass is not None and sm.m2 is not None
        hard = imp.two_mass & (comp.f_s >= 10.0 * comp.f_series) & (sm.m2 > inp.M)
        M, W, m2 = inp.M, inp.W, sm.m2
        v = np.sqrt(2.0 * G * energy_fall(c, inp.h))
        F_mom = 2.0 * M * v / (M + m2) * np.sqrt(m2 / comp.f_s) + W
        assert np.all(imp.F[hard] <= MOMENTUM_MARGIN * F_mom[hard])
        seen += int(hard.sum())
    assert seen > 50
