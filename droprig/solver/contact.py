"""Compliance of the struck deck itself: local indentation under the load's
footprint and bending of the one-way slab strip between its two supporting beams.

Without these the framing alone is rigid wherever a drop point sits over a
column or a beam line, and the energy method returns an unbounded force. With
them the dropped object is still taken as rigid (conservative: its own crushing
is ignored), so a hard drop onto bare concrete gives a very large but finite
force that the deck punching and member checks then judge.

SI units: m, N, Pa; compliances in m/N.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

from droprig.model import E_STEEL, Deck

__all__ = [
    "POISSON_CONCRETE",
    "concrete_modulus",
    "deck_contact_compliance",
    "deck_local_compliance",
    "deck_strip_compliance",
    "flat_punch_stiffness",
]

POISSON_CONCRETE = 0.2
"""Poisson's ratio of uncracked concrete (EN 1992-1-1 §3.1.3(4))."""

POISSON_STEEL = 0.3
"""Poisson's ratio of steel (EN 1993-1-1 §3.2.6(1))."""


def concrete_modulus(fc: float, basis: str) -> float:
    """Secant modulus of the deck concrete, Pa.

    EN 1992-1-1 Table 3.1: Ecm = 22·(fcm/10)^0.3 GPa with fcm = fck + 8 MPa.
    ACI 318-19 §19.2.2.1(b): Ec = 4700·√f'c MPa (normal-weight concrete).
    """
    f_mpa = fc / 1e6
    if basis == "en1993":
        return 22e9 * ((f_mpa + 8.0) / 10.0) ** 0.3
    if basis == "aisc360":
        return 4700e6 * math.sqrt(f_mpa)
    raise ValueError(f"design basis: {basis!r} is not allowed; allowed: aisc360, en1993")


def flat_punch_stiffness(E: ArrayLike, nu: float, area: ArrayLike) -> np.ndarray:
    """Stiffness of a rigid flat circular punch of the same area pressed into an
    elastic half-space, N/m.

    P = 2·a·E*·δ with E* = E/(1 − ν²) and a = √(A/π) (Sneddon 1965, Int. J. Engng
    Sci. 3, 47–57; Johnson, *Contact Mechanics* 1985, §3.8 — from memory). The
    half-space is softer than a slab resting on a steel flange, so this is
    taken only together with the strip bending below.
    """
    E_star = np.asarray(E, float) / (1.0 - nu**2)
    a = np.sqrt(np.asarray(area, float) / math.pi)
    return 2.0 * a * E_star


def deck_local_compliance(deck: Deck, footprint_l: ArrayLike, footprint_w: ArrayLike,
                          basis: str) -> np.ndarray:
    """Local indentation compliance of the deck under the footprint, m/N:
    1 / :func:`flat_punch_stiffness` with the deck concrete's modulus; a steel plate
    or grating with the modulus of steel (E = 200 GPa, ν = 0.3; the half-space is
    stiff, so the plate's bending in :func:`deck_strip_compliance` governs)."""
    area = np.asarray(footprint_l, float) * np.asarray(footprint_w, float)
    if deck.is_steel:
        return 1.0 / flat_punch_stiffness(E_STEEL, POISSON_STEEL, area)
    E = concrete_modulus(deck.concrete.fc, basis)
    return 1.0 / flat_punch_stiffness(E, POISSON_CONCRETE, area)


def deck_strip_EI(deck: Deck, width: ArrayLike, basis: str) -> np.ndarray:
    """Bending stiffness of a deck strip of ``width`` (m), N·m²: the gross uncracked
    concrete section E_c·width·h³/12 (E_c by the design basis, stiffer than the cracked
    slab: a higher, conservative impact force); a steel plate E_s·width·t³/12; a
    grating its bearing bars E_s·width·t_b·h³/(12·p) (bars p apart, cross bars left
    out). Gere 7th ed. §5.5 (I of a rectangle)."""
    width = np.asarray(width, float)
    if deck.kind == "steel_plate":
        return E_STEEL * width * deck.thickness**3 / 12.0
    if deck.kind == "grating":
        return E_STEEL * width * deck.bar_thickness * deck.thickness**3 / (12.0 * deck.bar_pitch)
    return concrete_modulus(deck.concrete.fc, basis) * width * deck.thickness**3 / 12.0


def deck_strip_compliance(deck: Deck, span: ArrayLike, a: ArrayLike, width: ArrayLike,
                          basis: str) -> np.ndarray:
    """Deflection under a unit load at ``a`` of the one-way slab strip (simply
    supported on the two beams, span ``span``, effective width ``width``), m/N.

    δ = a²·b²/(3·E·I·L) with b = L − a (AISC Manual Table 3-23 case 8;
    Roark 7th ed. Table 8.1 case 1e) and I = width·h³/12 of the gross
    uncracked section (stiffer than the cracked slab: a higher, conservative
    impact force). A steel plate: E_s·width·t³/12; a grating: the bearing bars,
    E_s·width·t_b·h³/(12·p) (bars p apart, cross bars left out).
    """
    span, a, width = np.broadcast_arrays(*(np.asarray(v, float) for v in (span, a, width)))
    EI = deck_strip_EI(deck, width, basis)
    x = np.clip(a, 0.0, span)
    with np.errstate(divide="ignore", invalid="ignore"):
        f = np.where(span > 0.0, x**2 * (span - x) ** 2 / (3.0 * EI * span), 0.0)
    return f


def deck_contact_compliance(deck: Deck, span: ArrayLike, a: ArrayLike, width: ArrayLike,
                            footprint_l: ArrayLike, footprint_w: ArrayLike,
                            basis: str) -> np.ndarray:
    """Total compliance of the deck at the struck point, m/N: local indentation
    plus strip bending (springs in series; energy method, Gere §9.10)."""
    return (deck_local_compliance(deck, footprint_l, footprint_w, basis)
            + deck_strip_compliance(deck, span, a, width, basis))
