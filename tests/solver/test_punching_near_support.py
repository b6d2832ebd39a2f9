"""Punching of the deck by a load close to, or over, a supporting beam.

Sources: EN 1992-1-1 §6.2.2(6) — a load applied within 0.5d ≤ a_v ≤ 2d of the edge
of a support contributes β = a_v/(2d) of itself to the shear force (applied here to
punching as to one-way shear, from memory); the part of the force a footprint
covering a flange passes to it by direct compression does not punch (statics of a
rigid base on a knife edge and springs, Hetényi 1946 ch. 1 — from memory). d over
the ribs of a composite deck: EN 1994-1-1 §9.7.6 (from memory). The demo project
is an invented scenario: it supplies the geometry (beams every 2.5 m in x, girders
every 9 m in y), never an expected value.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate
from droprig.solver.chain import Demands, Impact
from droprig.solver.deck import BAR_DIAMETER

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def roof():
    return load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")


def test_share_of_the_force_that_punches_by_hand(roof):
    # without the demo's pads and mats: the points lie under a 0.5 m mat, whose 1:1
    # spread made the contact 1.1 m square and every share 0 (the check compared
    # zeros with zeros before)
    roof = replace(roof, protection_areas=())
    lv = roof.level(roof.lift_zones[0].level_id)
    dk = lv.deck
    d = dk.thickness - max(dk.rib_height, 0.0) - dk.cover - BAR_DIAMETER / 2
    a = 0.1  # a 0.1 × 0.1 m footprint: half-side 0.05 m
    # a rigid underside (the rigid-base statics below; a declared underside stiffness
    # keeps the earlier rule, chain.presses_uniformly)
    load = replace(roof.lift_zones[0].loads[0], footprint_length=a, footprint_width=a,
                   contact_stiffness=None)
    # beam line at x = 2.5 m, mid-way between the girders at y = 0 and 9 m (4.5 m off)
    a_v = np.array([-0.02, 0.25 * d, 0.5 * d, d, 1.5 * d, 2.0 * d, 3.0 * d])
    beta = np.array([0.0, 0.25, 0.25, 0.5, 0.75, 1.0, 1.0])
    xs = 2.5 + a / 2 + a_v
    ys = np.full(xs.size, 4.5)
    fm = analysis.build_floor(lv, roof.settings)
    geo = analysis.point_geometry(fm, roof, xs, ys)
    ch = evaluate.evaluate_chain(fm, roof, load, geo, landing="flat")
    got = ch[Demands].checks["deck_punching"]
    # the force on the deck (the contact checks' force; the framing's F where the
    # chain gives one force, chain.TWO_FORCES off)
    imp = ch[Impact]
    F = imp.F if imp.F_deck is None else imp.F_deck
    far = got.U[-1] / F[-1]  # 1/V_R: the same footprint, so the same resistance
    assert far > 0.0
    # where the footprint covers part of the beam's flange (half-width b, its near
    # edge s0 = a_v from the line, s0 < b) the rigid footprint bears on the flange:
    # engaged by λ = 3t² − 2t³, t = (b − s0)/b the part of the flange's half it
    # covers, it tips about the flange's edge p = max(b, s0) and
    # the slab under [p, s1] takes 3(e − p)/(2(s1 − p)) of the force, none once its
    # centre e is over the flange (statics of a rigid base on a knife edge and
    # uniform springs, Hetényi 1946 ch. 1 — from memory); share = 1 − λ + λ·that.
    # Before: 0 once the footprint reached the line, 0.25 just short of it (a step).
    b = 0.5 * min(m.section.bf for m in lv.members)
    s0, s1, e = a_v, a_v + a, a_v + a / 2
    t = np.clip((b - s0) / b, 0.0, 1.0)
    lam = t * t * (3.0 - 2.0 * t)  # the flange engaged smoothly (chain.base_on_line)
    p = np.clip(b, s0, s1)
    run = s1 - p
    piv = np.where(run > 0.0, np.clip(1.5 * (e - p) / np.where(run > 0.0, run, 1.0), 0.0, 1.0),
                   0.0)
    sigma = 1.0 - lam + lam * piv
    assert sigma[0] == 0.0 and 0.0 < sigma[1] < 1.0  # over the flange; partly on it
    np.testing.assert_allclose(got.U / F, sigma * beta * far, rtol=1e-9, atol=1e-15)


def test_over_a_girder_line_no_punching(roof):
    # on the girder at y = 9 m, 1.25 m from the beams on either side: a rigid base
    # centred over the flange bears on the girder (share 0); without the demo's pads
    # (a pad presses uniformly: the next test)
    roof = replace(roof, protection_areas=())
    lv = roof.level(roof.lift_zones[0].level_id)
    rigid = replace(roof.lift_zones[0].loads[0], footprint_length=0.3, footprint_width=0.3,
                    contact_stiffness=None)
    fm = analysis.build_floor(lv, roof.settings)
    geo = analysis.point_geometry(fm, roof, np.array([3.75, 3.75]), np.array([9.0, 4.5]))
    ch = evaluate.evaluate_chain(fm, roof, rigid, geo, landing="flat")
    U = ch[Demands].checks["deck_punching"].U
    assert U[0] == 0.0
    assert U[1] > 0.0


def test_a_soft_footprint_over_a_girder_punches_with_what_lies_beyond_the_flange(roof):
    # the same 0.3 m square footprint with the demo unit's declared underside
    # stiffness presses uniformly: over the flange (half-width b, the level's least)
    # it bears on the steel; the 0.15 − b beyond the flange's edge on this side lies
    # on the slab: share (0.15 − b)/0.3 (statics of a uniform pressure, common
    # practice, no source), 1.25 m clear of the beams (share 1 that way); the load
    # applied over the support, a_v < 0.5d: β = 0.25 (EN 1992-1-1 §6.2.2(6), from
    # memory). Before, any footprint reaching a line was taken whole on the steel.
    # Without the demo's pads (their 1:1 spread would widen the footprint).
    roof = replace(roof, protection_areas=())
    lv = roof.level(roof.lift_zones[0].level_id)
    soft = replace(roof.lift_zones[0].loads[0], footprint_length=0.3, footprint_width=0.3)
    assert soft.contact_stiffness is not None and soft.contact_stiffness > 0
    b = 0.5 * min(m.section.bf for m in lv.members)
    assert 0.0 < b < 0.15
    fm = analysis.build_floor(lv, roof.settings)
    xs, ys = np.array([3.75, 3.75]), np.array([9.0, 4.5])
    geo = analysis.point_geometry(fm, roof, xs, ys)
    ch = evaluate.evaluate_chain(fm, roof, soft, geo, landing="flat")
    U = ch[Demands].checks["deck_punching"].U
    imp = ch[Impact]
    F = imp.F if imp.F_deck is None else imp.F_deck
    # mid-bay (4.5 m from the girders, 1.25 m from the beams): all of it punches
    # (β = 1, 1.25 m > 2d), so U/F there is 1/V_R of the same footprint
    per_newton = U[1] / F[1]
    share = (0.15 - b) / 0.3
    assert U[0] / F[0] == pytest.approx(share * 0.25 * per_newton, rel=1e-9)
