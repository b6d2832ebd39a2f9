"""Deck contact compliance.

References
----------
- EN 1992-1-1:2004, Table 3.1 (Ecm) and §3.1.3(4) (ν = 0.2).
- ACI 318-19, §19.2.2.1 (Ec = 4700√f'c MPa).
- Sneddon (1965); Johnson, *Contact Mechanics* (1985) §3.8: rigid flat punch
  P = 2aE*δ (from memory).
- AISC Manual 15th ed., Table 3-23 case 8 (simple beam, concentrated load at any point).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.model import Concrete, Deck
from droprig.solver import contact

REL = 1e-3


@pytest.mark.parametrize(
    ("fck_mpa", "ecm_gpa"),
    [
        (20.0, 30.0),  # EN 1992-1-1 Table 3.1, C20/25: Ecm = 30 GPa
        (30.0, 33.0),  # EN 1992-1-1 Table 3.1, C30/37: Ecm = 33 GPa
        (40.0, 35.0),  # EN 1992-1-1 Table 3.1, C40/50: Ecm = 35 GPa
    ],
)
def test_ecm_matches_en1992_table_3_1(fck_mpa: float, ecm_gpa: float) -> None:
    # Table 3.1 prints Ecm rounded to whole GPa.
    assert contact.concrete_modulus(fck_mpa * 1e6, "en1993") == pytest.approx(ecm_gpa * 1e9,
                                                                              abs=0.5e9)


def test_ec_aci_4000_psi() -> None:
    # ACI 318-19 §19.2.2.1(b) in US units: Ec = 57 000√f'c psi = 3.605e6 psi at 4000 psi.
    # The SI (4700√f'c MPa) and US forms are rounded separately and differ by ~0.7 %.
    fc = 4000 * 6894.757
    assert contact.concrete_modulus(fc, "aisc360") == pytest.approx(3.605e6 * 6894.757,
                                                                    rel=1e-2)


def test_flat_punch_formula() -> None:
    # Johnson (1985) §3.8, rigid flat punch of radius a: k = 2aE/(1 − ν²) (from memory).
    a = 0.3
    k = contact.flat_punch_stiffness(30e9, 0.2, math.pi * a**2)
    assert float(k) == pytest.approx(2 * a * 30e9 / (1 - 0.04), rel=REL)


def test_strip_compliance_midspan() -> None:
    # AISC Manual Table 3-23 case 7: simple beam midspan deflection PL³/(48EI).
    deck = Deck(thickness=0.15, concrete=Concrete(fc=30e6))
    E = contact.concrete_modulus(30e6, "en1993")
    L, b = 3.0, 1.2
    EI = E * b * 0.15**3 / 12
    f = contact.deck_strip_compliance(deck, L, L / 2, b, "en1993")
    assert float(f) == pytest.approx(L**3 / (48 * EI), rel=REL)


def test_compliance_is_positive_over_a_support() -> None:
    # Over a beam line the strip adds nothing but the contact keeps f finite and > 0
    # (statics: a rigid path would give an unbounded force).
    deck = Deck()
    f = contact.deck_contact_compliance(deck, 3.0, np.array([0.0, 1.5, 3.0]), 1.0, 1.0, 1.0,
                                        "en1993")
    assert np.all(f > 0) and np.all(np.isfinite(f))
    assert f[1] > f[0] == pytest.approx(f[2])
