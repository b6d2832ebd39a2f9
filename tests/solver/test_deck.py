"""Deck slab: flexure, punching, concentrated-load moment — hand calculations from the
clauses (steps in each test).

Sources: EN 1992-1-1:2004 §3.1.6, §3.1.7, Table 2.1N, §6.4 (Eqs. 6.47, 6.3N, 6.6N);
ACI 318-19 §22.2, §22.5.5.1.3, §22.6.4.1, §22.6.5.2; BS 8110-1:1997 cl. 3.5.2.2
(effective width, from memory); AISC Manual Table 3-23 (simple-span statics).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest

from droprig.model import Concrete, Deck
from droprig.solver import beam, deck

REL_HAND = 1e-3
REL = 1e-9


@pytest.fixture
def slab130() -> Deck:
    # h = 130 mm, cover 25 mm, bottom bars 250 mm²/m, fck 30 MPa, fyk 500 MPa
    return Deck("solid_slab", 0.130, Concrete(30e6, 2400.0, 500e6), 0.025, 2.5e-4)


def test_effective_depth(slab130: Deck) -> None:
    # d = h − c − φ/2 = 130 − 25 − 6 = 99 mm (12 mm bar assumed, common practice, no source)
    assert deck.effective_depth(slab130) == pytest.approx(0.099, rel=REL)


def test_flexure_en1992_hand(slab130: Deck) -> None:
    # EN 1992-1-1 §3.1.7(3), accidental γc = 1.2, γs = 1.0 (Table 2.1N), αcc = 1.0:
    # fcd = 30/1.2 = 25 MPa; λx = As·fyd/(η·fcd·b) = 250 × 500/(25 × 1000) = 5.0 mm
    # εs = 3.5‰ × (99 − 6.25)/6.25 = 51.9‰ > fyd/Es: bars yield
    # MRd = As·fyd·(d − λx/2) = 250 × 500 × (99 − 2.5) = 12.06 kN·m/m
    expected = 250 * 500 * (99 - 2.5) * 1e-3  # N·m/m
    assert deck.deck_flexure_resistance(slab130, "en1993") == pytest.approx(expected,
                                                                            rel=REL_HAND)


def test_flexure_aci318_hand(slab130: Deck) -> None:
    # ACI 318-19 §22.2.2.4.1: a = As·fy/(0.85·f'c·b) = 250 × 500/(0.85 × 30 × 1000) = 4.902 mm
    # Mn = As·fy·(d − a/2) = 250 × 500 × (99 − 2.451) = 12.07 kN·m/m
    a = 250 * 500 / (0.85 * 30 * 1000)
    expected = 250 * 500 * (99 - a / 2) * 1e-3
    assert deck.deck_flexure_resistance(slab130, "aisc360") == pytest.approx(expected,
                                                                             rel=REL_HAND)


def test_flexure_over_reinforced_compatibility(slab130: Deck) -> None:
    # heavy steel: the bars stay elastic; check equilibrium and strain compatibility
    # (EN 1992-1-1 §3.1.7 / §6.1, derived) on the returned moment
    heavy = replace(slab130, rebar_area=4.5e-3)
    M = deck.deck_flexure_resistance(heavy, "en1993")
    d, As, fcd, Es = 0.099, 4.5e-3, 25e6, 200e9
    # solve 0.8·fcd·x = As·Es·εcu(d − x)/x for x (quadratic) and rebuild M by hand
    p, q = 0.8 * fcd, As * Es * 3.5e-3
    x = (-q + math.sqrt(q * q + 4 * p * q * d)) / (2 * p)
    sigma = Es * 3.5e-3 * (d - x) / x
    assert sigma < 500e6
    assert M == pytest.approx(As * sigma * (d - 0.4 * x), rel=REL_HAND)


def test_punching_en1992_hand(slab130: Deck) -> None:
    # EN 1992-1-1 §6.4.4, 300 × 300 mm load, d = 99 mm, γc = 1.2:
    # k = 1 + √(200/99) = 2.42 → 2.0; ρ = 250/(1000 × 99) = 0.002525;
    # ρl = √(ρ × 0.2ρ) = 0.001129 (20 % distribution steel, §9.3.1.1(2))
    # vRd,c = 0.18/1.2 × 2 × (100 × 0.001129 × 30)^(1/3) = 0.4507 MPa
    # vmin = 0.035 × 2^1.5 × √30 = 0.5422 MPa governs (Eq. 6.3N)
    # u1 = 2(0.3 + 0.3) + 4π × 0.099 = 2.4441 m; VRd = 0.5422 × 2.4441 × 0.099 = 131.2 kN
    v = max(0.18 / 1.2 * 2 * (100 * math.sqrt(0.2) * 0.25 / 99 * 30) ** (1 / 3),
            0.035 * 2**1.5 * math.sqrt(30))
    expected = v * (1.2 + 4 * math.pi * 0.099) * 0.099 * 1e6
    assert expected == pytest.approx(131.2e3, rel=REL_HAND)
    assert float(deck.punching_resistance(slab130, 0.3, 0.3, "en1993")) == pytest.approx(
        expected, rel=REL_HAND)


def test_punching_aci318_hand(slab130: Deck) -> None:
    # ACI 318-19 §22.6.5.2, 300 × 300 mm, d = 99 mm: λs = √(2/(1 + 0.004 × 99)) = 1.197 → 1.0
    # bo = 4 × (300 + 99) = 1596 mm; β = 1: 0.17(1 + 2) = 0.51; 0.083(2 + 40 × 99/1596) = 0.372
    # vc = 0.33√30 = 1.807 MPa; Vc = 1.807 × 1596 × 99 = 285.6 kN
    expected = 0.33 * math.sqrt(30) * 1.596 * 0.099 * 1e6
    assert float(deck.punching_resistance(slab130, 0.3, 0.3, "aisc360")) == pytest.approx(
        expected, rel=REL_HAND)


def test_punching_vectorised_and_growing(slab130: Deck) -> None:
    fp = np.array([0.1, 0.3, 1.0])
    V = deck.punching_resistance(slab130, fp, fp, "en1993")
    assert V.shape == (3,) and np.all(np.diff(V) > 0)


def test_effective_width_bs8110() -> None:
    # BS 8110-1:1997 cl. 3.5.2.2 (from memory): load width + 2.4x(1 − x/l); plus the
    # 1:1 spread to the mid-plane (+h, common practice, no source)
    # 3 m span, x = 1.5 m, width 0.5 m, h = 0.13 m: 0.63 + 2.4 × 1.5 × 0.5 = 2.43 m
    assert float(deck.deck_effective_width(3.0, 1.5, 0.5, 0.13)) == pytest.approx(2.43)


def test_unit_moment_patch_load_by_superposition() -> None:
    # patch of length c centred at a on a simple strip: M(a) = a(L − a)/L − c/8 (statics),
    # checked by superposing point-load moments (AISC Manual Table 3-23 case 7)
    L, a, along, across, h = 3.0, 1.2, 0.4, 0.5, 0.13
    c = along + h
    xs = np.linspace(a - c / 2, a + c / 2, 200001)
    M_sup = np.trapezoid(beam.unit_moment("simple", L, a, xs), xs) / c
    b_e = float(deck.deck_effective_width(L, a, across, h))
    m = float(deck.deck_unit_moment_per_width(L, a, along, across, h))
    assert m * b_e == pytest.approx(M_sup, rel=1e-7)
    assert m * b_e == pytest.approx(a * (L - a) / L - c / 8, rel=REL)


def test_unit_moment_zero_at_supports() -> None:
    m = deck.deck_unit_moment_per_width(3.0, np.array([0.0, 3.0]), 0.4, 0.5, 0.13)
    assert np.allclose(m, 0.0)


def test_existing_moment() -> None:
    # AISC Manual Table 3-23 case 1: qL²/8
    assert float(deck.deck_existing_moment_per_width(3.0, 4e3)) == pytest.approx(4e3 * 9 / 8)
