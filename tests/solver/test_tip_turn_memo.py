"""The tip-off turn the floor analysis remembers (``chain._tip_turns``) is the one the
calculation trace would find afresh (``chain.tip_off_turn_reference``: each plan
orientation searched on its own), and the vectorised pick of each point's least case
(``pads.least_case``) is its plain loop's (``pads._least_case_reference``).

Sources: these are fast kernels compared with their plain references on the same
inputs (DEVELOPERS.md, "Fast kernels beside plain formulas"; common practice, no
source), compared exactly: the kernel reorders no arithmetic, it only picks. The
turn's own physics (the least of φ(θ) against the derived plateau wedge) is checked
against the energy balance in test_pad_edge_trace.py and test_pad_edge.py. The demo
project is an invented scenario; the random cases are invented data.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analyse, chain, pads
from droprig.solver.evaluate import point_case
from droprig.solver.floor import floor_model
from droprig.solver.geometry import point_geometry

ROOT = Path(__file__).resolve().parents[2]


def test_least_case_is_its_plain_loop():
    # ties (values drawn from a few levels), NaN, ∞ and points with no case at all
    rng = np.random.default_rng(30)
    for _ in range(40):
        n = int(rng.integers(1, 30))
        at = rng.integers(0, 8, n)
        d = rng.choice([0.1, 0.2, 0.2, 0.35, math.inf, math.nan], n)
        got = {int(at[j]): int(j) for j in pads.least_case(at, d)}
        assert got == pads._least_case_reference(at, d)


@pytest.fixture(scope="module")
def rooftop():
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    chain._TIP_MEMO.clear()
    chain._TURN_MEMO.clear()
    analyse(p)
    return p


def test_remembered_turns_are_the_fresh_search(rooftop):
    p = rooftop
    # the planned loads' points (the confirmation also tries other masses there)
    planned = {(z.level_id, ld.weight, ld.footprint_length, ld.footprint_width): (z, ld)
               for z in p.lift_zones for ld in z.loads}
    remembered = [(planned[(key[1], *pt[2:])], pt, turn) for key, m in chain._TURN_MEMO.items()
                  for pt, turn in ((tuple(np.frombuffer(k).tolist()), chain.TipOffTurn(*t))
                                   for k, t in m.items())
                  if key[0] == p.protection_areas and (key[1], *pt[2:]) in planned]
    assert len(remembered) > 100  # the demo's pads: thousands of points at their edges
    # a spread of them: every direction and both plan orientations where the demo has them
    rng = np.random.default_rng(7)
    picked = {(t.direction, t.along_x): (k, pt, t) for k, pt, t in remembered}
    sample = list(picked.values()) + [remembered[i] for i in
                                      rng.choice(len(remembered), 8, replace=False)]
    assert len({t.direction for _, _, t in sample}) >= 3
    for (zone, load), (x, y, W, fl, fw), turn in sample:
        case = point_case(p, zone.id, load.name, x, y, reference=True,
                          fields=("zone", "load", "point"))
        d = chain.Drop(case.fm, p, case.geo, (load,), np.zeros(1, dtype=np.int64))
        fresh = chain.tip_off_turn_reference(d, np.array([W]), np.array([fl]), np.array([fw]))
        assert fresh == turn
        assert chain.tip_off_turn(d) == turn  # the trace's read is the remembered one
        # a square footprint: both plan orientations are one rectangle, their Δ equal;
        # the reference keeps the first (along x), and so must the kernel
        sq = np.array([fl])
        on = chain.landing_pads(d, sq, sq)
        tt = chain._tip_turns(d, d.geo.x, d.geo.y, sq, sq, on, np.array([W]))
        ref = chain.tip_off_turn_reference(d, np.array([W]), sq, sq)
        if ref is None:
            assert math.isinf(float(tt.delta[0]))
        else:
            assert chain.TipOffTurn(*chain._turn_of(d, tt, int(on[0]), 0)) == ref
            assert ref.along_x


def test_a_moved_deck_edge_is_a_new_plan_for_the_memo(rooftop):
    # plane geometry (common practice, no source; the rule of test_pad_edge_trace.py's
    # deck-edge test): the rooftop's pads are laid to the deck's edge at y = 0, so a
    # unit at (5.0, 0.5) m whose footprint overhangs that edge cannot tip onto the deck
    # there (Δ = ∞). With the deck running on 3 m past y = 0 the same edge is free and
    # Δ is finite. The memo of the first plan must not answer for the second.
    p = rooftop
    zone = p.lift_zones[0]
    load = zone.loads[0]
    lv = p.level(zone.level_id)
    fm = floor_model(lv, p.settings)
    geo = point_geometry(fm, p, np.array([5.0]), np.array([0.5]))
    d = chain.Drop(fm, p, geo, (load,), np.zeros(1, dtype=np.int64))
    W, fl, fw = (np.array([v]) for v in (load.weight, load.footprint_length,
                                         load.footprint_width))
    assert lv.grid.y_lines[0] == 0.0
    before = chain._remembered_tip_offsets(d, W, fl, fw)
    wider = replace(lv, grid=replace(lv.grid, y_lines=(-3.0, *lv.grid.y_lines),
                                     y_labels=("Z", *lv.grid.y_labels)))
    d2 = replace(d, fm=replace(fm, level=wider))
    after = chain._remembered_tip_offsets(d2, W, fl, fw)
    fresh = chain.tip_offsets(d2, fl, fw, chain.landing_pads(d2, fl, fw), W)
    assert math.isinf(float(before[0])) and math.isfinite(float(fresh[0]))
    assert float(after[0]) == float(fresh[0])
