"""A rigid base that bridges the deck strip rests on the beams it covers.

Sources: statics of a rigid beam on two supports (a rigid body on two springs is
statically determinate: the lever rule whatever the springs; Hetényi, *Beams on
Elastic Foundation*, 1946, ch. 1 — from memory); the rooftop demo supplies the
geometry only (beams B2.1/B-C at x = 10 m and B2.2/B-C at x = 12.5 m, 2.5 m apart,
the deck strip spanning x between them; an invented scenario, never an expected
value).
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import CHECKS, footprint
from droprig.solver.chain import Compliance, Demands, SlabResistance
from tests.solver.test_impact_physics import _chain, _energy_only

ROOT = Path(__file__).resolve().parents[2]
REL = 1e-12


@pytest.fixture(scope="module")
def roof():
    p = _energy_only(load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig"))
    return replace(p, protection_areas=())


def _base(roof, length, width):
    return replace(roof.lift_zones[0].loads[0], name="base", footprint_length=length,
                   footprint_width=width)


@pytest.mark.parametrize("pos, extent, expected", [
    (1.25, 3.0, True),    # 1.25 − 1.5 ≤ 0 and 1.25 + 1.5 = 2.75 ≥ 2.5: both lines
    (1.25, 2.0, False),   # 1.25 − 1.0 = 0.25 > 0: the 2 m side reaches neither line
    (1.0, 3.0, True),     # 1.0 + 1.5 = 2.5: just reaches the second line
    (0.75, 3.0, False),   # 0.75 + 1.5 = 2.25 < 2.5: covers the first line only
    (0.0, 3.0, False),    # on a support line: no strip to bridge (span 2.5, pos 0)
])
def test_bridges_strip_by_hand(pos, extent, expected):
    # hand: the base covers [pos − e/2, pos + e/2]; bridged iff it holds 0 and 2.5
    got = footprint.bridges_strip(2.5, pos, extent)
    assert bool(got) is expected


def test_three_by_two_base_over_beams_2_5_m_apart(roof):
    """A 3 × 2 m base at x = 11.0 m (1.0 m from B2.1/B-C, 1.5 m from B2.2/B-C),
    y = 13.5 m: with its 3 m side across the beams it covers x = 9.5 … 12.5, both
    beam lines; with its 2 m side across, x = 10.0 … 12.0: the first line only
    (12.0 < 12.5), so not both.

    Hand: rigid base on the two beams (statics): F₁ = F·1.5/2.5 = 0.6·F on B2.1/B-C,
    F₂ = F·1.0/2.5 = 0.4·F on B2.2/B-C; the deck strip between them bends no more
    (its compliance leaves the series), and the deck checks stay for the 2 m
    orientation, which does not bridge."""
    c = _chain(roof, _base(roof, 3.0, 2.0), [11.0], [13.5])
    comp = c[Compliance]
    assert comp.strip_span[0] == pytest.approx(2.5, rel=1e-9)
    assert comp.strip_pos[0] == pytest.approx(1.0, rel=1e-9)
    assert bool(comp.bridged[0]) and not bool(comp.bridged_both[0])
    # lever rule of the rigid base: 0.6 / 0.4 (order of the pair as the path gives it)
    share = np.sort(c.drop.geo.path.share[0])
    assert share == pytest.approx([0.4, 0.6], rel=1e-9)
    # the strip's bending is out of the series: only the local indentation is left
    assert comp.f_deck[0] == pytest.approx(comp.f_deck_local[0], rel=REL)
    # a 2 × 2 m base at the same point bridges nothing: the strip bends in series
    c2 = _chain(roof, _base(roof, 2.0, 2.0), [11.0], [13.5])
    assert not bool(c2[Compliance].bridged[0])
    assert c2[Compliance].f_deck[0] > 1.5 * c2[Compliance].f_deck_local[0]


def test_base_bridging_both_ways_loads_no_deck_strip(roof):
    """A rigid 3 × 2.6 m base (no declared underside) at the strip's middle
    (x = 11.25): 1.25 − 1.3 ≤ 0 and 1.25 + 1.3 ≥ 2.5 in both orientations — it rests
    on both beams whichever way it lands: no deck flexure demand and no slab
    mechanism (the slab between the beams is not loaded), the lever rule ½ / ½ to
    the beams."""
    c = _chain(roof, replace(_base(roof, 3.0, 2.6), contact_stiffness=None), [11.25], [13.5])
    comp = c[Compliance]
    assert bool(comp.bridged_both[0])
    chk = c[Demands].checks["deck_flexure"]
    # the deck keeps only its existing (self-weight and finishes) moment: the same
    # utilisation as with no impact at all
    assert chk.U[0] == pytest.approx(float(chk.U_at(np.zeros(1))[0]), rel=REL)
    assert not np.isfinite(chk.F_allow[0]) or chk.F_allow[0] > 1e12
    assert np.isinf(c[SlabResistance].R_yl[0])
    assert c.drop.geo.path.share[0] == pytest.approx([0.5, 0.5], rel=1e-9)
    # the members still take the whole force: flexure is checked as before
    assert c[Demands].checks["flexure"].U[0] > 0.0
    assert "deck_flexure" in CHECKS


def test_soft_base_bridging_both_ways_still_loads_the_strip(roof):
    """The same 3 × 2.6 m base on its declared 25 kN/mm skid presses the deck
    uniformly (chain.presses_uniformly): the pressure between the beams loads the
    strip whichever way the base lands (found at stop 28, the strip's moment was
    zeroed as for a rigid base). Statics, a lower bound whatever the strip's end
    restraint: the part of the force over the 2.5 m strip, F·2.5/3.0 in the 3 m
    orientation, spread over the 2.6 m width, sags the strip at least w·L²/24 (both
    ends fixed; AISC Manual Table 3-23 case 15, from memory); the check takes the
    whole force on the strip's patch (conservative)."""
    load = _base(roof, 3.0, 2.6)
    assert load.contact_stiffness
    c = _chain(roof, load, [11.25], [13.5])
    assert bool(c[Compliance].bridged_both[0])
    chk = c[Demands].checks["deck_flexure"]
    F = 1.0e5  # N, any force: the demand is linear in it
    L, fl, fw = 2.5, 3.0, 2.6
    m_lower = F * L / fl / fw * L**2 / 24.0  # N·m per m of width
    added = float(chk.U_at(np.array([F]))[0] - chk.U_at(np.zeros(1))[0])
    assert added * c.drop.fm.deck_Mr >= m_lower
    assert np.isfinite(chk.F_allow[0])


def test_tilted_landing_never_bridges(roof):
    # a load landing on one edge bears on that edge strip only (common practice, no
    # source): the strip between the beams stays in series
    from droprig.solver import analysis, evaluate

    lv = roof.level(roof.lift_zones[0].level_id)
    fm = analysis.build_floor(lv, roof.settings)
    geo = analysis.point_geometry(fm, roof, np.array([11.25]), np.array([13.5]))
    c = evaluate.evaluate_chain(fm, roof, _base(roof, 3.0, 2.6), geo, landing="tilted")
    assert not bool(c[Compliance].bridged[0])


def test_trace_says_the_base_rests_on_the_beams(roof):
    # the calculation trace of a bridged point states the strip does not bend, and
    # its deck compliance is the indentation alone (Sneddon 1965 / Johnson §3.8:
    # 1/(2a·E*), a = √(A/π)), as the chain computes it
    from droprig.solver.trace import trace_point

    zone = roof.lift_zones[0]
    unit = zone.loads[0]
    assert (unit.footprint_length, unit.footprint_width) in ((3.0, 2.0), (2.0, 3.0))
    tr = trace_point(roof, zone.id, unit.name, 11.0, 13.5)
    step = next(s for s in tr.steps if s.symbol == "f_deck")
    assert "rests on them" in step.title
    c = _chain(roof, unit, [11.0], [13.5])
    assert step.value == pytest.approx(float(c[Compliance].f_deck_local[0]), rel=1e-12)
