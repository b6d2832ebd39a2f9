"""The web's bearing length under a load landing tilted on one edge: the edge strip
spread at 45° through the slab to the member's top flange
(:func:`droprig.solver.footprint.web_bearing_length`, ``chain._web_bearing``).

Sources: the spread of a concentrated load through a composite slab,
b_m = b_p + 2(h_c + h_f) — EN 1994-1-1 §9.4.3(2), Eq. 9.12 (from memory); web local
yielding Rn = Fyw·tw·(5k + lb) beyond d from the end — AISC 360-16 J10.2 Eq. J10-2; web
crippling Rn = 0.80·tw²[1 + 3(lb/d)(tw/tf)^1.5]·√(E·Fyw·tf/tw) beyond d/2 — AISC 360-16
J10.3 Eq. J10-4; the stress under a line load and a strip on an elastic half-plane
(Flamant) — Timoshenko & Goodier, *Theory of Elasticity* (3rd ed. 1970) §33 and §36
(from memory), integrated here with scipy ``quad`` as the independent method.
"""

from __future__ import annotations

import math
from pathlib import Path
from types import SimpleNamespace
from typing import Any, cast

import numpy as np
import pytest
from scipy.integrate import quad

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, evaluate
from droprig.solver.chain import Demands, Impact, LoadInputs
from droprig.solver.footprint import EDGE_CONTACT_WIDTH, web_bearing_length

ROOT = Path(__file__).resolve().parents[2]


def test_bearing_length_hand_check():
    # EN 1994-1-1 §9.4.3(2): b_m = b_p + 2·h_c. The 50 mm edge strip of a 3 × 2 m base
    # through the 130 mm of concrete over a beam: 0.05 + 2 × 0.13 = 0.31 m; the smaller
    # side is taken along the member (the orientation is not known: the lower web
    # resistance). h_s = 0: the contact's own side.
    assert float(web_bearing_length(2.0, 0.05, 0.13)) == pytest.approx(0.31, rel=1e-12)
    assert float(web_bearing_length(0.05, 2.0, 0.13)) == pytest.approx(0.31, rel=1e-12)
    assert float(web_bearing_length(3.0, 2.0)) == pytest.approx(2.0, rel=1e-12)
    lb = web_bearing_length(np.array([0.05, 1.2]), np.array([2.0, 0.8]), np.array([0.1, 0.0]))
    assert np.allclose(lb, [0.25, 0.8], rtol=1e-12)


def test_bearing_length_refuses_a_bad_depth():
    # bad input: the message names the field and the allowed range
    with pytest.raises(ValueError, match=r"spread_depth.*at least 0 m"):
        web_bearing_length(0.05, 2.0, -0.01)
    with pytest.raises(ValueError, match="spread_depth"):
        web_bearing_length(0.05, 2.0, math.nan)


def _share_within_spread(a: float, h: float) -> float:
    """Share of a uniform strip load of width ``a`` (m; 0: a line load) on an elastic
    half-plane that passes within its 45° width a + 2h at depth ``h`` (m). A line load
    P at ξ puts σz = 2P·z³/(π((x − ξ)² + z²)²) at depth z (Flamant; Timoshenko &
    Goodier §33); its integral from −∞ to x is P·(½ + (atan u + u/(1 + u²))/π),
    u = (x − ξ)/z; the strip is the line loads over its width (§36)."""

    def cum(u: float) -> float:
        return 0.5 + (math.atan(u) + u / (1.0 + u * u)) / math.pi

    half = a / 2.0 + h
    if a == 0.0:
        return cum(half / h) - cum(-half / h)
    val, _ = quad(lambda xi: cum((half - xi) / h) - cum((-half - xi) / h), -a / 2, a / 2)
    return val / a


@pytest.mark.parametrize(("a_over_h", "lo"), [(0.0, 0.818), (0.4, 0.86), (5.0, 0.97)])
def test_the_45_degree_width_carries_the_elastic_force(a_over_h, lo):
    # Timoshenko & Goodier §33: through ±h at depth h under a line load passes
    # (2/π)(π/4 + ½) = ½ + 1/π = 0.818 of it (closed form); under a strip more, the
    # wider the strip (the docstring's 87 % at a/h = 0.4, 97 % at 5): most of the force
    # reaches the flange within the width the bearing length is given
    share = _share_within_spread(a_over_h * 0.13, 0.13)
    if a_over_h == 0.0:
        assert share == pytest.approx(0.5 + 1.0 / math.pi, rel=1e-12)
    assert lo <= share < 1.0
    assert share > _share_within_spread(0.0, 0.13) - 1e-12


def test_steel_deck_spreads_nothing():
    # a steel plate or grating deck: no spread credited (common practice, no source)
    fm = cast(Any, SimpleNamespace(level=SimpleNamespace(deck=SimpleNamespace(
        is_steel=True, over_ribs=lambda: None))))
    assert chain.slab_spread_depth(fm) == 0.0


@pytest.fixture(scope="module")
def steel_edge():
    """The steel demo (AISC 360-16) with its welder landing tilted at (4.6, 9.144), on
    girder line B at mid-span of bay 1-2: the chain's tilted landing with the slab's
    spread and with the strip alone (``slab_spread_depth`` → 0), and the flat one."""
    p = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    zone = p.lift_zones[0]
    load = next(ld for ld in zone.loads if ld.name == "Engine-driven welder")
    lv = p.level(zone.level_id)
    fm = analysis.build_floor(lv, p.settings)
    geo = analysis.point_geometry(fm, p, np.array([4.6]), np.array([9.144]))
    spread = evaluate.evaluate_chain(fm, p, load, geo, landing="tilted")
    mp = pytest.MonkeyPatch()
    mp.setattr(chain, "slab_spread_depth", lambda _fm: 0.0)
    try:
        strip = evaluate.evaluate_chain(fm, p, load, geo, landing="tilted")
    finally:
        mp.undo()
    flat = evaluate.evaluate_chain(fm, p, load, geo, landing="flat")
    return p, lv, fm, spread, strip, flat


def test_chain_takes_the_edge_spread_through_the_slab(steel_edge):
    # the tilted landing's bearing: the 50 mm strip + 2 × the concrete over the ribs;
    # the flat landing's: the footprint's smaller side (no slab spread, as before)
    p, lv, _fm, spread, strip, flat = steel_edge
    h_c = lv.deck.over_ribs().thickness
    assert float(spread[LoadInputs].lb[0]) == pytest.approx(EDGE_CONTACT_WIDTH + 2 * h_c,
                                                            rel=1e-12)
    assert float(strip[LoadInputs].lb[0]) == pytest.approx(EDGE_CONTACT_WIDTH, rel=1e-12)
    fi = flat[LoadInputs]
    assert float(fi.lb[0]) == float(min(fi.foot_l[0], fi.foot_w[0]))
    # the bearing changes the web's resistance only: same force on the framing
    assert float(spread[Impact].F[0]) == float(strip[Impact].F[0])
    assert p.settings.design_basis == "aisc360"


def test_web_resistances_follow_aisc_j10_with_the_spread(steel_edge):
    # hand check of the governing member's resistances, AISC 360-16 Eq. J10-2 and J10-4
    # (interior: the point is at mid-span): the ratio of the spread to the strip alone
    # is (5k + lb₁)/(5k + lb₀) and [1 + 3(lb₁/d)(tw/tf)^1.5]/[1 + 3(lb₀/d)(tw/tf)^1.5]
    # (φ, Fyw and the dynamic increase cancel); U falls by the same ratio
    _p, lv, fm, spread, strip, _flat = steel_edge
    lb1, lb0 = float(spread[LoadInputs].lb[0]), float(strip[LoadInputs].lb[0])
    cy1, cy0 = spread[Demands].checks["web_yielding"], strip[Demands].checks["web_yielding"]
    cc1, cc0 = spread[Demands].checks["web_crippling"], strip[Demands].checks["web_crippling"]
    mem = int(cy1.member[0])
    assert mem == int(cy0.member[0])
    sec = lv.members[mem].section
    assert cy1.resist is not None and cy0.resist is not None
    ry = float(cy1.resist[0]) / float(cy0.resist[0])
    assert ry == pytest.approx((5 * sec.k_des + lb1) / (5 * sec.k_des + lb0), rel=1e-9)
    r = (sec.tw / sec.tf) ** 1.5
    assert cc1.resist is not None and cc0.resist is not None
    rc = float(cc1.resist[0]) / float(cc0.resist[0])
    assert rc == pytest.approx((1 + 3 * lb1 / sec.d * r) / (1 + 3 * lb0 / sec.d * r),
                               rel=1e-9)
    assert float(cy1.U[0]) == pytest.approx(float(cy0.U[0]) / ry, rel=1e-9)
    assert fm.settings.design_basis == "aisc360"

