"""The floor deck as a one-way reinforced-concrete slab (or a steel plate or grating,
:func:`steel_deck_flexure_resistance`, :func:`steel_deck_punching_resistance`)
spanning between two adjacent parallel beams, struck by a load with a rectangular
footprint.

Only the bottom bars (``Deck.rebar_area`` per metre) are counted; the steel deck
of a composite slab is ignored (conservative). The strip is simply supported on
the two beams (conservative for sagging). Design bases ``"en1993"`` (steelwork to
EN 1993, so the slab to EN 1992-1-1:2004) and ``"aisc360"`` (slab to ACI 318-19).
EN partial factors default to the accidental design situation (γc = 1.2,
γs = 1.0, EN 1992-1-1 Table 2.1N); ``phi`` multiplies every resistance in
addition (ACI φ; 1.0 by default for the accidental situation, common practice,
no source). SI units: m, N, N·m, Pa; moments per metre width in N·m/m.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

from droprig.model import Deck

__all__ = [
    "BAR_DIAMETER",
    "deck_effective_width",
    "deck_existing_moment_per_width",
    "deck_flexure_resistance",
    "deck_unit_moment_per_width",
    "effective_depth",
    "punching_resistance",
    "steel_deck_flexure_resistance",
    "steel_deck_punching_resistance",
]

BAR_DIAMETER = 0.012
"""Bottom bar diameter assumed for the effective depth, m (common practice, no
source: the model stores the cover and the steel area, not the bar size)."""

E_REBAR = 200e9
"""Modulus of reinforcing steel, Pa (EN 1992-1-1 §3.2.7(4); ACI 318-19 20.2.2.2)."""


def _basis(basis: str) -> None:
    if basis not in ("aisc360", "en1993"):
        raise ValueError(f"design basis: {basis!r} is not allowed; allowed: aisc360, en1993")


def effective_depth(deck: Deck, bar_diameter: float = BAR_DIAMETER) -> float:
    """d = h − cover − φbar/2, m (definition; EN 1992-1-1 Fig. 6.3 / ACI 318-19 §2.2)."""
    return deck.thickness - deck.cover - 0.5 * bar_diameter


def deck_flexure_resistance(deck: Deck, basis: str, phi: float = 1.0, *,
                            gamma_c: float = 1.2, gamma_s: float = 1.0,
                            bar_diameter: float = BAR_DIAMETER) -> float:
    """Sagging moment resistance per metre width of the slab, N·m/m.

    Rectangular stress block, strain compatibility with the concrete at its
    ultimate strain; the bar stress is fy where the bars yield, Es·εs otherwise:
    EN 1992-1-1 §3.1.7(3): stress η·fcd over depth λ·x, λ = 0.8 − (fck − 50)/400 ≤ 0.8,
    η = 1 − (fck − 50)/200 ≤ 1, εcu3 = 3.5 ‰ (Table 3.1, fck ≤ 50), fcd = αcc·fck/γc
    with αcc = 1.0 (§3.1.6(1)), fyd = fyk/γs.
    ACI 318-19 §22.2.2: stress 0.85·f'c over a = β1·c, β1 = 0.85 − 0.05(f'c − 28 MPa)/7,
    0.65 ≤ β1 ≤ 0.85 (Table 22.2.2.4.3), εcu = 0.003 (§22.2.2.1).
    M = As·σs·(d − depth/2) per metre, times ``phi``. A steel plate or grating deck:
    :func:`steel_deck_flexure_resistance`.
    """
    _basis(basis)
    if deck.is_steel:
        return steel_deck_flexure_resistance(deck, phi)
    fck = deck.concrete.fc
    As = deck.rebar_area
    d = effective_depth(deck, bar_diameter)
    if basis == "en1993":
        f_mpa = fck / 1e6
        lam = min(0.8, 0.8 - (f_mpa - 50.0) / 400.0)
        eta = min(1.0, 1.0 - (f_mpa - 50.0) / 200.0)
        stress = eta * fck / gamma_c
        eps_cu = 3.5e-3 if f_mpa <= 50.0 else (2.6 + 35.0 * ((90.0 - f_mpa) / 100.0) ** 4) * 1e-3
        fy = deck.concrete.fy_rebar / gamma_s
    else:
        f_mpa = fck / 1e6
        lam = min(0.85, max(0.65, 0.85 - 0.05 * (f_mpa - 28.0) / 7.0))
        stress = 0.85 * fck
        eps_cu = 3.0e-3
        fy = deck.concrete.fy_rebar
    b = 1.0
    x = As * fy / (stress * lam * b)  # neutral-axis depth if the bars yield
    eps_s = eps_cu * (d - x) / x
    if eps_s < fy / E_REBAR:
        # bars elastic: stress·λ·b·x² + As·Es·εcu·x − As·Es·εcu·d = 0
        p, q = stress * lam * b, As * E_REBAR * eps_cu
        x = (-q + math.sqrt(q * q + 4.0 * p * q * d)) / (2.0 * p)
        sigma = E_REBAR * eps_cu * (d - x) / x
    else:
        sigma = fy
    return phi * As * sigma * (d - 0.5 * lam * x)


def deck_effective_width(span: ArrayLike, a: ArrayLike, footprint_across: ArrayLike,
                         thickness: ArrayLike) -> np.ndarray:
    """Width of one-way slab (m) carrying a concentrated load at ``a`` from a support.

    b_e = (load width + h) + 2.4·a·(1 − a/span): the load width spread at 1:1 to the
    slab mid-plane (common practice, no source) plus the BS 8110-1:1997 cl. 3.5.2.2
    allowance for a simply supported solid slab (from memory). m.
    """
    span, a, w, h = np.broadcast_arrays(*(np.asarray(v, float)
                                          for v in (span, a, footprint_across, thickness)))
    x = np.clip(a, 0.0, span)
    return w + h + 2.4 * x * (1.0 - x / span)


def deck_unit_moment_per_width(span: ArrayLike, a: ArrayLike, footprint_along: ArrayLike,
                               footprint_across: ArrayLike, thickness: ArrayLike) -> np.ndarray:
    """Sagging moment per metre width under the load, per newton of load, N·m/m per N.

    The load is spread over c = footprint_along + h along the span (1:1 to the
    mid-plane, common practice, no source), shortened where needed to stay inside
    the span (c ≤ 2a, c ≤ 2(span − a); conservative), and over the effective width
    of :func:`deck_effective_width`. A simply supported strip under a patch load
    of length c centred at a: M(a) = a(span − a)/span − c/8 (statics; AISC Manual
    Table 3-23 case 7 with the patch spread), divided by b_e.
    """
    span, a, cl, cw, h = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (span, a, footprint_along, footprint_across, thickness)))
    x = np.clip(a, 0.0, span)
    c = np.minimum(cl + h, np.minimum(2.0 * x, 2.0 * (span - x)))
    M = x * (span - x) / span - c / 8.0
    return np.maximum(M, 0.0) / deck_effective_width(span, x, cw, h)


def deck_existing_moment_per_width(span: ArrayLike, pressure: ArrayLike) -> np.ndarray:
    """Midspan sagging moment per metre width of the simply supported strip under the
    existing uniform pressure q (Pa): q·span²/8, N·m/m (AISC Manual Table 3-23 case 1)."""
    span, q = np.asarray(span, float), np.asarray(pressure, float)
    return q * span**2 / 8.0


def punching_resistance(deck: Deck, footprint_l: ArrayLike, footprint_w: ArrayLike,
                        basis: str, phi: float = 1.0, *, gamma_c: float = 1.2,
                        bar_diameter: float = BAR_DIAMETER) -> np.ndarray:
    """Punching-shear resistance of the slab under a rectangular loaded area, N.

    EN 1992-1-1 §6.4.4: vRd,c = (0.18/γc)·k·(100·ρl·fck)^(1/3) ≥ vmin = 0.035·k^1.5·fck^0.5
    (Eqs. 6.47, 6.3N; MPa), k = 1 + √(200/d[mm]) ≤ 2, ρl = √(ρly·ρlz) ≤ 0.02 with the
    distribution steel taken as 20 % of the main steel (the minimum of §9.3.1.1(2)),
    control perimeter u1 = 2(l + w) + 4π·d at 2d (§6.4.2); VRd = vRd,c·u1·d, capped by
    vRd,max·u0·d at the loaded area, vRd,max = 0.4·ν·fcd, ν = 0.6(1 − fck/250)
    (§6.4.5(3), Eq. 6.6N).
    ACI 318-19 §22.6.5.2: vc = λs·√f'c·min(0.33, 0.17(1 + 2/β), 0.083(2 + αs·d/bo)) (MPa),
    λs = √(2/(1 + 0.004·d[mm])) ≤ 1 (§22.5.5.1.3), αs = 40 (interior), β = long/short
    side, bo = 2(l + w) + 4d at d/2 (§22.6.4.1), √f'c ≤ 8.3 MPa (§22.5.3.1);
    Vc = vc·bo·d, times ``phi``. Footprints in m, vectorised. A steel plate or
    grating deck: :func:`steel_deck_punching_resistance`.
    """
    _basis(basis)
    if deck.is_steel:
        return steel_deck_punching_resistance(deck, footprint_l, footprint_w, phi)
    l, w = np.broadcast_arrays(np.asarray(footprint_l, float), np.asarray(footprint_w, float))
    d = effective_depth(deck, bar_diameter)
    d_mm = d * 1000.0
    f_mpa = deck.concrete.fc / 1e6
    if basis == "en1993":
        k = min(1.0 + math.sqrt(200.0 / d_mm), 2.0)
        rho = deck.rebar_area / d
        rho_l = min(math.sqrt(rho * 0.2 * rho), 0.02)
        v = max(0.18 / gamma_c * k * (100.0 * rho_l * f_mpa) ** (1.0 / 3.0),
                0.035 * k**1.5 * math.sqrt(f_mpa))
        u1 = 2.0 * (l + w) + 4.0 * math.pi * d
        nu = 0.6 * (1.0 - f_mpa / 250.0)
        v_max = 0.4 * nu * f_mpa / gamma_c
        u0 = 2.0 * (l + w)
        V = np.minimum(v * u1 * d, v_max * u0 * d) * 1e6
        return phi * V
    lam_s = min(math.sqrt(2.0 / (1.0 + 0.004 * d_mm)), 1.0)
    root = min(math.sqrt(f_mpa), 8.3)
    bo = 2.0 * (l + w) + 4.0 * d
    beta = np.maximum(l, w) / np.minimum(l, w)
    coef = np.minimum(np.minimum(0.33, 0.17 * (1.0 + 2.0 / beta)), 0.083 * (2.0 + 40.0 * d / bo))
    return phi * lam_s * root * coef * bo * d * 1e6


def steel_deck_flexure_resistance(deck: Deck, phi: float = 1.0) -> float:
    """Plastic moment resistance per metre width of a steel plate or grating deck,
    N·m/m.

    Plate of thickness t: m_p = f_y·t²/4 (plastic modulus of a rectangle b·t²/4 per
    unit width; EN 1993-1-1 §6.2.5 Eq. 6.13 with W_pl, γ_M0 = 1.0; AISC 360-16 F11.1
    M_p = F_y·Z for a rectangular bar, Z ≤ 1.6·S is met, Z/S = 1.5).
    Grating of bearing bars (depth h, thickness t_b, pitch p) spanning between the
    beams: m_p = f_y·t_b·h²/(4·p) (each bar a rectangle, p apart; cross bars and
    the lateral stability of a deep thin bar are left out — a bar with h/t_b > 20
    may buckle sideways first: common practice, no source). Times ``phi``.
    """
    if deck.kind == "steel_plate":
        return phi * deck.steel_fy * deck.thickness**2 / 4.0
    if deck.kind == "grating":
        return phi * deck.steel_fy * deck.bar_thickness * deck.thickness**2 / (
            4.0 * deck.bar_pitch)
    raise ValueError(f"deck.kind: {deck.kind!r} is not a steel deck")


def steel_deck_punching_resistance(deck: Deck, footprint_l: ArrayLike,
                                   footprint_w: ArrayLike, phi: float = 1.0) -> np.ndarray:
    """Shear (punching) resistance of a steel plate or grating deck around the
    footprint l × w, N.

    Plate of thickness t: the plate sheared through on the footprint's perimeter,
    V = 2(l + w)·t·f_y/√3 (shear yield, von Mises; EN 1993-1-1 §6.2.6 Eq. 6.18 with
    A_v the sheared section, γ_M0 = 1.0).
    Grating: the bearing bars under the footprint sheared at both its ends,
    V = 2·n·h·t_b·f_y/√3 with n = ⌊b/p⌋ + 1 bars under the footprint's width
    b = min(l, w) (the bars run either way: the narrower side is taken,
    conservative; common practice, no source). Times ``phi``; vectorised.
    """
    l, w = np.broadcast_arrays(np.asarray(footprint_l, float), np.asarray(footprint_w, float))
    tau = deck.steel_fy / math.sqrt(3.0)
    if deck.kind == "steel_plate":
        return phi * 2.0 * (l + w) * deck.thickness * tau
    if deck.kind == "grating":
        n = np.floor(np.minimum(l, w) / deck.bar_pitch) + 1.0
        return phi * 2.0 * n * deck.thickness * deck.bar_thickness * tau
    raise ValueError(f"deck.kind: {deck.kind!r} is not a steel deck")
