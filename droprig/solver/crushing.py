"""Contact force bounded by local crushing of what is struck (or of the load itself).

A hard load meeting bare concrete cannot push harder than the concrete under its
footprint can bear before it crushes; the crushed depth then absorbs energy at that
force. The same holds for a steel flange struck directly (plastic indentation) and
for the load's own underside when it is the softer part. This replaces the rigid
punch, whose force v·√(k·M) grows without limit as the struck point stiffens.

The bound is an *upper* estimate of the crushing force (mean strengths, a strain-
rate increase, the full confinement factor), so the force handed on to the checks
is never understated. Columns under a struck point are axial springs EA/L from the
level below, not rigid supports.

Vectorised over drop points. SI units: m, m², N, Pa, J; compliances in m/N.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import impact_crushable

__all__ = [
    "CONCRETE_DIF",
    "DEFAULT_COLUMN_AREA",
    "DEFAULT_COLUMN_HEIGHT",
    "TABOR_CONSTRAINT",
    "column_axial_compliance",
    "concrete_bearing_pressure",
    "crushing_energy",
    "crushing_limited_impact",
    "flat_punch_pressure",
    "steel_indentation_pressure",
]

TABOR_CONSTRAINT = 3.0
"""Mean pressure of fully plastic indentation over the yield stress, p_m/Y ≈ 3
(Tabor 1951; Johnson, *Contact Mechanics* 1985, §6.2 and §6.4 — from memory:
2.8–3.0 for spheres, cones and flat punches; the round value is the upper one)."""

CONCRETE_DIF = 1.25
"""Strain-rate increase of the concrete compressive strength for a dropped load,
dimensionless: CEB-FIP Model Code 1990 §2.1.6.2 (from memory),
f_c,imp/f_cm = (ε̇/ε̇₀)^(1.026·α_s), α_s = 1/(5 + 9·f_cm/10 MPa), ε̇₀ = 30·10⁻⁶ s⁻¹;
at ε̇ ≈ 1 s⁻¹ and f_cm = 38 MPa this is 1.31; 1.25 is taken as a round figure for
the lower strain rates of a dropped load (from memory). It raises the crushing
bound, so it errs towards a higher force."""

DEFAULT_COLUMN_AREA = 1.71e-2
"""Default cross-section area of a column under the struck level, m²: a W14×90
(26.5 in², AISC Shapes Database v16.0) — heavier than most columns that carry a
roof or a light floor, so the spring is stiff and the force high (common practice,
no source)."""

DEFAULT_COLUMN_HEIGHT = 3.0
"""Default storey height of that column, m (short: stiff; common practice, no source)."""


def flat_punch_pressure(Y: ArrayLike, shape: str = "strip",
                        criterion: str = "mises") -> np.ndarray:
    """Limit mean pressure under a rigid flat punch on a rigid–plastic half-space, Pa.

    Plane strain (a long strip): Prandtl (1920) p = 2k(1 + π/2) = (2 + π)·k
    (Johnson *Contact Mechanics* §6.4, slip-line field — from memory). Axisymmetric
    (a circular punch): Shield (1955) p_m = 5.69·k (Johnson §6.4 — from memory).
    Shear yield stress k = Y/2 (Tresca) or Y/√3 (von Mises). Y in Pa.
    """
    Y = np.asarray(Y, float)
    if criterion == "tresca":
        k = Y / 2.0
    elif criterion == "mises":
        k = Y / math.sqrt(3.0)
    else:
        raise ValueError(f"yield criterion: {criterion!r} is not allowed; allowed: mises, tresca")
    if shape == "strip":
        return (2.0 + math.pi) * k
    if shape == "circle":
        return 5.69 * k
    raise ValueError(f"punch shape: {shape!r} is not allowed; allowed: circle, strip")


def steel_indentation_pressure(fy: ArrayLike) -> np.ndarray:
    """Pressure at which a steel flange (or a steel load underside) yields under a
    flat contact, Pa: p = 3·fy (:data:`TABOR_CONSTRAINT`; Johnson §6.2)."""
    return TABOR_CONSTRAINT * np.asarray(fy, float)


def concrete_bearing_pressure(fc: float, c1: ArrayLike, c2: ArrayLike, depth: ArrayLike,
                              basis: str, dif: float = CONCRETE_DIF) -> np.ndarray:
    """Pressure at which the concrete under a rectangular loaded area c1 × c2 crushes,
    Pa, as an upper estimate of the contact pressure.

    EN 1992-1-1 §6.7(2), Eq. (6.63): F_Rdu = A_c0·f_cd·√(A_c1/A_c0) ≤ 3.0·f_cd·A_c0,
    with the distribution area A_c1 similar to A_c0, its sides b2 ≤ 3·b1 and reached
    over a depth h ≥ (b2 − b1) (Fig. 6.29) — here b2 = min(3·b1, b1 + depth).
    ACI 318-19 §22.8.3.2: Bn = 0.85·f'c·A1·√(A2/A1), √(A2/A1) ≤ 2, A2 spread at 1:2
    (here over the same ``depth``).
    Upper estimate: the mean strength f_cm = f_ck + 8 MPa (EN 1992-1-1 Table 3.1) or
    f'c + 8.3 MPa (ACI 318-19 §26.12.3.1, f'c ≤ 35 MPa — from memory), γc = 1, times
    the strain-rate factor ``dif``. fc in Pa; c1, c2, depth in m.
    """
    c1, c2, h = np.broadcast_arrays(*(np.asarray(v, float) for v in (c1, c2, depth)))
    if basis == "en1993":
        fm = fc + 8e6
        b1, b2 = np.minimum(3.0 * c1, c1 + h), np.minimum(3.0 * c2, c2 + h)
        ratio = np.minimum(np.sqrt(b1 * b2 / (c1 * c2)), 3.0)
        return dif * fm * ratio
    if basis == "aisc360":
        fm = fc + 8.3e6
        b1, b2 = c1 + 4.0 * h, c2 + 4.0 * h  # 1 vertical : 2 horizontal each side
        ratio = np.minimum(np.sqrt(b1 * b2 / (c1 * c2)), 2.0)
        return dif * 0.85 * fm * ratio
    raise ValueError(f"design basis: {basis!r} is not allowed; allowed: aisc360, en1993")


def crushing_limited_impact(W: ArrayLike, h: ArrayLike, f_s: ArrayLike, eta: ArrayLike,
                            F_crush: ArrayLike, depth_available: ArrayLike
                            ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Impact with the contact force capped by local crushing, ``(F, c, through)``.

    The contact behaves as a rigid–plastic element of crushing force F_crush (N) in
    series with the elastic struck path (compliance f_s, m/N); energy balance
    ηWh + W(F·f_s + c) = F²·f_s/2 + F_crush·c (the crushable-layer balance of
    :func:`droprig.solver.impact.impact_crushable`, Engineering ToolBox "Impact
    Force" for its rigid limit). F = K·W (Gere §9.10) while K·W ≤ F_crush, else
    F = F_crush with crushed depth c. ``through`` flags c > depth_available (m:
    the concrete over the ribs or the flange thickness): the load would go through,
    and the force after that is the elastic rest of the energy (conservative).
    """
    return impact_crushable(W, h, f_s, eta, F_crush, depth_available)


def crushing_energy(F_crush: ArrayLike, depth: ArrayLike) -> np.ndarray:
    """Energy absorbed by local crushing, J: E = F_crush·c (rigid–plastic contact,
    Johnson §6.6 work of plastic indentation at constant mean pressure — from
    memory)."""
    return np.asarray(F_crush, float) * np.asarray(depth, float)


def column_axial_compliance(area: ArrayLike = DEFAULT_COLUMN_AREA,
                            height: ArrayLike = DEFAULT_COLUMN_HEIGHT,
                            E: float = 200e9) -> np.ndarray:
    """Axial compliance of the column below a struck point, m/N: f = L/(E·A)
    (axial bar, Gere §2.3). Defaults: :data:`DEFAULT_COLUMN_AREA`,
    :data:`DEFAULT_COLUMN_HEIGHT`, E = 200 GPa (AISC 360-16 §B4 rounds 29 000 ksi)."""
    A, L = np.broadcast_arrays(np.asarray(area, float), np.asarray(height, float))
    if np.any(A <= 0.0) or np.any(L <= 0.0):
        raise ValueError("column: area and height must be > 0")
    return L / (E * A)
