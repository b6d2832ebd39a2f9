"""The single-point paths at a crushable pad's edge (issue 10): the calculation trace,
the time-history verification and the numbers they show are the floor analysis's own
where a load's footprint lies partly on a pad — whether the tip-off over the pad's
edge governs the point or landing on the pad does — and the turn the trace shows
is the one at which the tip-off's bound is least.

Sources: the trace and the floor analysis are two paths through the same chain, so
their agreement is a consistency check (common practice, no source: a signer must
read in the trace the numbers the verdict used); the least of the plateau wedge's
φ(θ) and where it lies are derived in the test from the energy balance (Gere,
*Mechanics of Materials* 7th ed. §9.10's method; the plateau stress of Gibson & Ashby,
*Cellular Solids* 2nd ed. 1997 ch. 5 — from memory), as in test_pad_edge.py. Demo
projects are invented scenarios; the points were found by a scan of both demos' pads.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analyse, pads, trace_point, verify_point
from droprig.solver.results import RESPONSES

ROOT = Path(__file__).resolve().parents[2]
STRONG = -1e30  # the spent layer's whole strength everywhere (test_pad_edge.py)


def test_turn_at_the_least_bound_hand_check():
    # derived (test_pad_edge.py's plateau wedge): φ(θ) = θ·(L + k·d²)/2 + k·t²/(2θ) −
    # k·t·d, k = σ_c·b/W, is least at θ* = t·√(k/(L + k·d²)); the drained unit's numbers
    W, L, b, d, t, sig = 35.8e3, 1.9, 2.8, 1.0, 0.5, 15e3
    k = sig * b / W
    hand = t * math.sqrt(k / (L + k * d * d))
    got = pads.tip_offset(L, W, t, [(d, L, b, sig, t, STRONG, STRONG, 0.0)], turn=True)
    assert float(got) == pytest.approx(hand, rel=1e-6)
    # a footprint 1 m long in x whose far edge lies 0.1 m inside a pad's free edge at
    # x = 10 (plane geometry, common practice, no source): it tips towards +x over
    # its 1 m length; the answer's Δ is footprint_tip_offset's
    layer = [((0.0, 0.0, 10.0, 10.0), 15e3, 0.35)]
    turn = pads.footprint_tip_turn((8.9, 4.0, 9.9, 6.0), W, t, layer)
    assert pads.TIP_DIRECTIONS[int(turn.direction[0])] == "+x"
    assert float(turn.length[0]) == pytest.approx(1.0)
    assert float(turn.delta[0]) == float(pads.footprint_tip_offset((8.9, 4.0, 9.9, 6.0), W, t,
                                                                   layer))
    assert 0.0 < float(turn.theta[0]) < math.pi / 2
    none = pads.footprint_tip_turn((4.0, 4.0, 6.0, 6.0), W, t, layer)
    assert math.isinf(float(none.delta[0])) and int(none.direction[0]) == -1


def test_a_pad_on_the_deck_edge_is_no_edge_to_tip_onto_the_deck():
    # plane geometry (common practice, no source): a pad laid to the deck's edge at
    # y = 0 and a footprint overhanging both — tipping over that edge leaves the floor,
    # no deck beside the pad is struck there, so no direction counts; with the deck
    # running on past the pad the same footprint tips onto it; a pad ending 1 m short
    # of the deck's edge leaves bare deck to strike
    W, t = 35.8e3, 0.5
    layer = [((0.0, 0.0, 10.0, 10.0), 15e3, 0.35)]
    foot = (4.0, -0.1, 6.0, 1.9)
    assert math.isinf(float(pads.footprint_tip_offset(foot, W, t, layer,
                                                      deck=(0.0, 0.0, 20.0, 20.0))))
    assert 0.0 < float(pads.footprint_tip_offset(foot, W, t, layer,
                                                 deck=(0.0, -5.0, 20.0, 20.0))) < math.inf
    short = [((0.0, 1.0, 10.0, 10.0), 15e3, 0.35)]
    assert float(pads.footprint_tip_offset((4.0, 0.9, 6.0, 2.9), W, t, short,
                                           deck=(0.0, 0.0, 20.0, 20.0))) < math.inf


@pytest.fixture(scope="module")
def rooftop():
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    return p, analyse(p)


def _at(results, zone_id: str, load_name: str, x: float, y: float):
    c = next(c for c in results.cases if c.zone_id == zone_id and c.load_name == load_name)
    k = int(np.argmin((c.x - x) ** 2 + (c.y - y) ** 2))
    assert (c.x[k] - x) ** 2 + (c.y[k] - y) ** 2 <= 1e-12
    return c, k


def _step(tr, symbol: str, start: str = ""):
    return next(s for s in tr.steps if s.symbol == symbol and s.title.startswith(start))


def _same(a: float, b: float) -> bool:
    return (math.isnan(a) and math.isnan(b)) or a == pytest.approx(b, rel=1e-9, abs=1e-12)


def test_trace_is_the_floor_where_the_tip_off_governs(rooftop):
    # consistency (common practice, no source): the padded bay 1-2/A-B of the drained
    # unit is governed at a drop point whose load tips over MAT2's edge; the trace's
    # case, U, response, force, fall H − Δ and kept heights are the floor's numbers
    p, r = rooftop
    b = next(b for b in r.bays if b.load_name.startswith("AHU-3 (old")
             and b.bay_id == "1-2/A-B")
    c, k = _at(r, b.zone_id, b.load_name, b.governing_x, b.governing_y)
    assert c.protection[k] >= 0
    tr = trace_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
    assert tr.pad_edge == "tip_off"
    assert tr.response == RESPONSES[int(c.response[k])]
    assert tr.steps[0].value == pytest.approx(float(c.utilisation[k]), rel=1e-9)
    fall = _step(tr, "h", "Fall onto the bare deck")
    delta = _step(tr, "Δ")
    assert fall.inputs["Δ"][0] == pytest.approx(delta.value, rel=1e-12)
    assert fall.value == pytest.approx(fall.inputs["H"][0] - delta.value, rel=1e-12)
    assert 0.0 < delta.value < float(p.protection_areas[int(c.protection[k])].thickness) * 2
    assert delta.inputs["θ"][0] > 0.0 and delta.inputs["L"][0] > 0.0
    force = _step(tr, "F")
    assert force.value == pytest.approx(float(c.peak_force[k]), rel=1e-9)
    assert _same(_step(tr, "h_allow", "Allowable drop height on the datum").value,
                 float(c.allowable_drop_height[k]))
    assert _same(_step(tr, "h_allow,pl", "Allowable drop height on the datum").value,
                 float(c.allowable_drop_height_plastic[k]))


def test_verify_point_names_the_tip_off_it_verifies(rooftop):
    # consistency (common practice, no source): the bay's governing point above lies on
    # girder line A, over a support of the member the verification models, so the
    # drained unit is verified at (4.1, 9.25) m on MAT2 near its edge at y = 9.3, where
    # the tip-off governs too (test_pad_edge.py's line across the edge): what it
    # verifies is that case's deck contact, a landing from H − Δ, and it says so
    p, _r = rooftop
    z = p.lift_zones[0]
    name = next(ld.name for ld in z.loads if ld.name.startswith("AHU-3 (old"))
    tr = trace_point(p, z.id, name, 4.1, 9.25)
    assert tr.pad_edge == "tip_off"
    pv = verify_point(p, z.id, name, 4.1, 9.25)
    assert pv.pad_edge == "tip_off"
    fall, delta = _step(tr, "h", "Fall onto the bare deck"), _step(tr, "Δ")
    assert pv.fall == pytest.approx(fall.value, rel=1e-12)
    assert pv.tip_delta == pytest.approx(delta.value, rel=1e-12)
    assert pv.chain_peak_force == pytest.approx(_step(tr, "F").value, rel=1e-12)
    from droprig.report.verification import pad_edge_words

    words = pad_edge_words(pv, "SI")
    assert "H − Δ" in words and "not in the time history" in words


def test_trace_is_the_floor_where_landing_on_the_pad_governs():
    # consistency (common practice, no source): the steel demo's 12 ft spreader bar at
    # (20.3224, 11.2673) m lies on PAD1 within reach of its free edge at y = 8.8392 m;
    # landing on the pad is the worse case there (U 0.74 against 0.69 tipping off,
    # found by a scan of the pads)
    p = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    z = p.lift_zones[0]
    from droprig.solver import analysis, evaluate

    x, y = 20.322433333333333, 11.267333333333333
    fm = analysis.build_floor(p.level(z.level_id), p.settings)
    geo = analysis.point_geometry(fm, p, np.array([x]), np.array([y]))
    load = next(ld for ld in z.loads if ld.name == "Spreader bar 12 ft")
    floor = evaluate.evaluate_case(fm, p, load, geo)
    tr = trace_point(p, z.id, load.name, x, y)
    assert tr.pad_edge == "on_pad"
    first = tr.steps[0]
    assert first.inputs["U_pad"][0] > first.inputs["U_tip"][0]
    assert first.value == pytest.approx(float(floor["utilisation"][0]), rel=1e-9)
    assert tr.response == RESPONSES[int(floor["response"][0])]
    assert _step(tr, "F").value == pytest.approx(float(floor["peak_force"][0]), rel=1e-9)
    # the pad's fall h = H − t, and the kept heights the lower of the two cases
    assert _step(tr, "h").formula == "h = H − t_mat"
    for key, sym in (("allowable_drop_height", "h_allow"),
                     ("allowable_drop_height_plastic", "h_allow,pl")):
        kept = _step(tr, sym, "Allowable drop height on the datum")
        assert _same(kept.value, float(floor[key][0]))
        lower = min(kept.inputs["h_pad"][0], kept.inputs["h_tip"][0])
        assert math.isnan(kept.value) or kept.value == pytest.approx(lower, rel=1e-12)
