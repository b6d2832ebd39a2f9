"""A load landing out of level on one edge: the second case each drop point is checked
for when the project setting ``tilted_landing`` is on, the worse governing.

Sources: EN 1992-1-1 §6.4.2 and §6.4.4 — punching under a loaded area c1 × c2:
u1 = 2(c1 + c2) + 4πd, vRd,c = (0.18/γc)·k·(100ρl·fck)^(1/3) ≥ 0.035·k^1.5·fck^0.5,
k = 1 + √(200/d) ≤ 2, capped at the loaded area by 0.4·ν·fcd·u0·d, ν = 0.6(1 − fck/250)
(§6.4.5(3)); EN 1992-1-1 §6.7(2) Eq. (6.63) with f_cm = f_ck + 8 MPa (Table 3.1) and
droprig's stated strain-rate factor 1.25 (CEB-FIP MC90 §2.1.6) for the crushing bound;
the whole force through the leading edge and the 50 mm edge strip are common
practice, no source. The demo project is an invented scenario: it supplies the
geometry, never an expected value.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import dumps_project, load_project, loads_project
from droprig.solver import analyse, analysis, evaluate
from droprig.solver.chain import Demands, Impact, LoadInputs, merge_landings
from droprig.solver.deck import BAR_DIAMETER
from droprig.solver.footprint import EDGE_CONTACT_WIDTH

ROOT = Path(__file__).resolve().parents[2]
REL = 1e-9


@pytest.fixture(scope="module")
def roof():
    return load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")


def _chains(p, load, xs, ys):
    lv = p.level(p.lift_zones[0].level_id)
    fm = analysis.build_floor(lv, p.settings)
    geo = analysis.point_geometry(fm, p, np.asarray(xs, float), np.asarray(ys, float))
    return lv, {k: evaluate.evaluate_chain(fm, p, load, geo, landing=k)
                for k in ("flat", "tilted")}


def test_edge_strip_contact_by_hand(roof):
    # a 3.0 × 2.0 m base meeting the deck on its shorter edge: 2.0 × 0.05 m of contact
    assert roof.settings.design_basis == "en1993"
    load = replace(roof.lift_zones[0].loads[0], footprint_length=3.0, footprint_width=2.0)
    lv, ch = _chains(roof, load, [4.1], [11.3])
    inp = ch["tilted"][LoadInputs]
    assert sorted((float(inp.foot_l[0]), float(inp.foot_w[0]))) == \
        pytest.approx(sorted((2.0, EDGE_CONTACT_WIDTH)), rel=REL)
    assert EDGE_CONTACT_WIDTH == 0.05
    # crushing bound under the strip, EN 1992-1-1 Eq. (6.63): b_i = min(3c_i, c_i + h)
    fc, h = lv.deck.concrete.fc, lv.deck.thickness
    c1, c2 = 2.0, 0.05
    b1, b2 = min(3 * c1, c1 + h), min(3 * c2, c2 + h)
    F = 1.25 * (fc + 8e6) * min(math.sqrt(b1 * b2 / (c1 * c2)), 3.0) * c1 * c2
    assert float(ch["tilted"][Impact].F_crush[0]) == pytest.approx(F, rel=REL)
    # punching resistance under each contact, EN 1992-1-1 §6.4.4 over the topping of
    # the ribs (EN 1994-1-1 §9.7.6), γc = 1.2 (accidental), 20 % cross steel
    dk = lv.deck
    d = dk.thickness - dk.rib_height - dk.cover - BAR_DIAMETER / 2
    f = fc / 1e6
    k = min(1 + math.sqrt(200 / (d * 1000)), 2.0)
    rho = min(math.sqrt((dk.rebar_area / d) * 0.2 * (dk.rebar_area / d)), 0.02)
    v = max(0.18 / 1.2 * k * (100 * rho * f) ** (1 / 3), 0.035 * k**1.5 * math.sqrt(f))
    vmax = 0.4 * 0.6 * (1 - f / 250) * f / 1.2
    phi = roof.settings.resistance_factor
    # the point (4.1, 11.3) lies between the beams at x = 2.5 and 5.0 (0.9 m from the
    # nearer) and 2.3 m from the girder at y = 9.0. Flat, the 3.0 × 2.0 m base reaches
    # over the beam at x = 5.0 (0.9 < 2.0/2). The unit's declared underside stiffness
    # presses uniformly (chain.presses_uniformly): what lies over the flange
    # (half-width b) bears on the steel, the rest on this side's slab. With the 2.0 m
    # side across the beam, [0.9 − 1.0, 0.9 + 1.0] = [−0.1, 1.9]: (1.9 − b)/2.0 on the
    # slab, the 3.0 m side 2.3 − 1.5 = 0.8 m clear of the girder (1); turned, the 3.0 m
    # side across the beam, (2.4 − b)/3.0, the 2.0 m side clear: the larger of the two
    # (statics of a uniform pressure, common practice, no source); applied over the
    # support (a_v = 0.9 − 1.0 < 0.5d): β = 0.25 (EN 1992-1-1 §6.2.2(6), from memory).
    # On its edge the 2.0 × 0.05 m strip is 0.9 − 0.025 = 0.875 m clear of the beam,
    # beyond 2d, so all of the force punches (β = 1 for a_v ≥ 2d)
    assert 0.9 - 0.025 > 2 * d
    b = 0.5 * min(m.section.bf for m in lv.members)
    flat_share = 0.25 * max((1.9 - b) / 2.0, (2.4 - b) / 3.0)
    for name, (l, w), share in (("flat", (3.0, 2.0), flat_share),
                                ("tilted", (2.0, 0.05), 1.0)):
        V = phi * min(v * (2 * (l + w) + 4 * math.pi * d) * d,
                      vmax * 2 * (l + w) * d) * 1e6
        got = ch[name][Demands].checks["deck_punching"]
        # U = β·F_deck/V_R with one unit demand per N (no existing load on punching);
        # F_deck the deck's own force (two forces per point: the contact force under
        # the load's declared underside, Impact.F_deck; F where one force)
        imp = ch[name][Impact]
        F_deck = float((imp.F if imp.F_deck is None else imp.F_deck)[0])
        assert float(got.U[0]) == pytest.approx(share * F_deck / V, rel=1e-9, abs=1e-12)


def _out(**kw):
    base = dict(response=np.array([0, 2, 1, 0]), utilisation=np.array([0.5, 1.5, 1.2, np.nan]),
                allowable_drop_height=np.array([2.0, 0.5, 1.0, np.nan]),
                allowable_drop_height_plastic=np.array([2.0, 0.5, 1.5, np.nan]),
                allowable_mass=np.array([900.0, 100.0, 500.0, np.nan]),
                required_mat_stiffness=np.array([np.inf, 2e6, 3e6, np.nan]),
                required_crush_stroke=np.array([np.nan, 0.1, 0.2, np.nan]))
    base.update(kw)
    out = {k: np.asarray(v) for k, v in base.items()}
    n = 4
    for k in ("static_deflection", "effective_mass", "dynamic_factor", "peak_force",
              "max_deflection", "deceleration_g", "governing_member", "governing_check",
              "plastic_deflection", "ductility", "support_rotation", "structure_compliance",
              "allowable_height_check", "allowable_height_member", "F_allow",
              "allowable_height_plastic_check", "utilisation_check", "utilisation_member"):
        out.setdefault(k, np.zeros(n))
    return out


def test_merge_landings_worse_governs():
    flat = _out()
    tilted = _out(response=np.array([1, 2, 1, 0]), utilisation=np.array([1.1, 1.4, 1.3, 0.2]),
                  allowable_drop_height=np.array([3.0, 0.4, np.nan, 1.0]),
                  allowable_mass=np.array([800.0, 200.0, 400.0, 50.0]),
                  required_crush_stroke=np.array([0.3, 0.05, np.nan, 0.1]),
                  peak_force=np.full(4, 7.0))
    m = merge_landings(flat, tilted)
    # response: worse state, then larger U
    np.testing.assert_array_equal(m["response"], [1, 2, 1, 0])
    np.testing.assert_array_equal(m["utilisation"], [1.1, 1.5, 1.3, 0.2])
    np.testing.assert_array_equal(m["peak_force"], [7.0, 0.0, 7.0, 7.0])
    # heights: the lower, NaN (none allowed) the lowest
    np.testing.assert_array_equal(m["allowable_drop_height"], [2.0, 0.4, np.nan, np.nan])
    np.testing.assert_array_equal(m["allowable_mass"], [800.0, 100.0, 400.0, np.nan])
    np.testing.assert_array_equal(m["required_crush_stroke"], [np.nan, 0.1, np.nan, np.nan])


def test_setting_on_never_reads_better_than_flat(roof):
    flat = analyse(roof)
    on = replace(roof, settings=replace(roof.settings, tilted_landing=True))
    both = analyse(on)
    order = {"elastic": 0, "plastic": 1, "exceeds": 2, "perforates": 3}
    a = {(b.zone_id, b.load_name, b.bay_id): b for b in flat.bays}
    worse = 0
    for b in both.bays:
        f = a[(b.zone_id, b.load_name, b.bay_id)]
        assert order[b.response] >= order[f.response]
        if order[b.response] == order[f.response]:
            assert b.max_utilisation >= f.max_utilisation * (1 - 1e-9)
        worse += order[b.response] > order[f.response] or \
            b.max_utilisation > f.max_utilisation * (1 + 1e-9)
    assert worse > 0  # the edge contact governs somewhere on this floor


def test_setting_round_trips_through_the_file(roof):
    on = replace(roof, settings=replace(roof.settings, tilted_landing=True))
    text = dumps_project(on)
    assert '"tilted_landing": true' in text
    assert loads_project(text).settings.tilted_landing is True
    assert '"tilted_landing"' not in dumps_project(roof)  # off: files stay as they were
