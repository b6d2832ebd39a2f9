"""Closed-form statics and elastic deflections of a single prismatic beam.

Every function is vectorised: ``L``, ``EI``, ``x``, ``a``, ``w``, ``Mp`` may be
scalars or numpy arrays and broadcast together (one entry per drop point, or a
grid of sections × drop points). SI units: m, N, N·m, N/m, m/N.

Coordinates and signs (used by every function here):

* ``x`` and ``a`` are measured from the member's origin end (x = 0) towards
  x = L; ``b = L − a``.
* Loads act downward; deflection is positive downward; reactions are positive
  upward; bending moment is positive when sagging (tension at the bottom);
  shear is ``V = dM/dx`` (the upward resultant of the forces left of the cut).
* End conditions: ``simple`` (pinned both ends), ``fixed`` (both ends fixed),
  ``propped`` (fixed at x = 0, pinned at x = L), ``cantilever`` (fixed at
  x = 0, free at x = L).

Closed forms: AISC *Steel Construction Manual* 15th ed., Table 3-23 (shears,
moments and deflections), and Roark's *Formulas for Stress and Strain* 7th ed.,
Table 8.1 (the propped and fixed cases). The published propped-cantilever case
has its simple support at x = 0; here the fixed end is at x = 0, so the published
formula is used with a ↔ L − a and x ↔ L − x. The propped and fixed Green's
functions are written as the simple-beam function plus the deflections caused by
the end moments (superposition; identical to the tabulated closed forms).
"""

from __future__ import annotations

from typing import Literal

import numpy as np
from numpy.typing import ArrayLike

EndCondition = Literal["simple", "fixed", "propped", "cantilever"]
END_CONDITIONS: tuple[str, ...] = ("simple", "fixed", "propped", "cantilever")

__all__ = [
    "END_CONDITIONS",
    "green",
    "max_abs_moment",
    "max_abs_shear",
    "plastic_collapse_load",
    "plastic_collapse_load_udl",
    "rayleigh_mass_factor",
    "udl_deflection",
    "udl_end_moments",
    "udl_moment",
    "udl_reactions",
    "udl_shear",
    "unit_end_moments",
    "unit_moment",
    "unit_reactions",
    "unit_shear",
]


def _check(cond: str) -> None:
    if cond not in END_CONDITIONS:
        raise ValueError(f"end condition: {cond!r} is not allowed; allowed: "
                         + ", ".join(END_CONDITIONS))


def _arr(*vals: ArrayLike) -> list[np.ndarray]:
    return [np.asarray(v, dtype=float) for v in vals]


# --------------------------------------------------------------------------- statics
def unit_end_moments(cond: EndCondition, L: ArrayLike, a: ArrayLike) -> tuple[np.ndarray,
                                                                             np.ndarray]:
    """End moments (M0, ML) from a unit downward load at ``a``, N·m per N (sagging +,
    so a fixed end's hogging moment is negative).

    simple: 0, 0. fixed: M0 = −ab²/L², ML = −a²b/L² (AISC Manual Table 3-23 case 18;
    Roark Table 8.1 case 1d). propped (fixed at 0): M0 = −ab(2L − a)/(2L²), the
    published fixed-end moment P·a'b'(a' + L)/(2L²) with a' = L − a measured from the
    simple support (AISC Table 3-23 case 14; Roark Table 8.1 case 1c). cantilever
    (fixed at 0): M0 = −a (AISC Table 3-23 case 22).
    """
    _check(cond)
    L, a = _arr(L, a)
    b = L - a
    zero = np.zeros(np.broadcast(L, a).shape)
    if cond == "simple":
        return zero, zero.copy()
    if cond == "fixed":
        return -a * b**2 / L**2, -(a**2) * b / L**2
    if cond == "propped":
        return -a * b * (2.0 * L - a) / (2.0 * L**2), zero
    return -a + zero, zero


def unit_reactions(cond: EndCondition, L: ArrayLike, a: ArrayLike) -> tuple[np.ndarray,
                                                                           np.ndarray]:
    """Vertical reactions (R0, RL) from a unit downward load at ``a``, N per N (up +).

    simple: R0 = b/L, RL = a/L. fixed: R0 = b²(3a + b)/L³, RL = a²(a + 3b)/L³.
    propped (fixed at 0, pinned at L): RL = a²(3L − a)/(2L³) — the published
    R1 = Pb'²(a' + 2L)/(2L³) at the simple support with a' = L − a, b' = a — and
    R0 = 1 − RL. cantilever: R0 = 1, RL = 0. Sources: AISC Manual 15th ed.,
    Table 3-23 cases 7, 14, 18, 22; Roark 7th ed., Table 8.1.
    """
    _check(cond)
    L, a = _arr(L, a)
    b = L - a
    if cond == "simple":
        return b / L, a / L
    if cond == "fixed":
        return b**2 * (3.0 * a + b) / L**3, a**2 * (a + 3.0 * b) / L**3
    if cond == "propped":
        RL = a**2 * (3.0 * L - a) / (2.0 * L**3)
        return 1.0 - RL, RL
    one = np.ones(np.broadcast(L, a).shape)
    return one, 0.0 * one


def unit_moment(cond: EndCondition, L: ArrayLike, x: ArrayLike, a: ArrayLike) -> np.ndarray:
    """Bending moment at ``x`` from a unit downward load at ``a``, N·m per N (sagging +).

    M(x) = M0 + R0·x − ⟨x − a⟩, with (R0, M0) from :func:`unit_reactions` and
    :func:`unit_end_moments` (equilibrium of the free body left of x; AISC Manual
    Table 3-23 / Roark Table 8.1).
    """
    L, x, a = _arr(L, x, a)
    R0, _ = unit_reactions(cond, L, a)
    if cond == "simple":  # M0 = 0
        M = R0 * x
    else:
        M0, _ = unit_end_moments(cond, L, a)
        M = M0 + R0 * x
    M -= np.maximum(x - a, 0.0)
    return M


def unit_shear(cond: EndCondition, L: ArrayLike, x: ArrayLike, a: ArrayLike) -> np.ndarray:
    """Shear V = dM/dx at ``x`` from a unit downward load at ``a``, N per N.

    V = R0 for x ≤ a, R0 − 1 = −RL for x > a (AISC Manual Table 3-23). At x = a
    the value just left of the load is returned.
    """
    L, x, a = _arr(L, x, a)
    R0, _ = unit_reactions(cond, L, a)
    return R0 - (x > a).astype(float)


def udl_end_moments(cond: EndCondition, L: ArrayLike, w: ArrayLike) -> tuple[np.ndarray,
                                                                             np.ndarray]:
    """End moments (M0, ML) from a full-length downward UDL ``w`` (N/m), N·m (sagging +).

    simple 0, 0; fixed −wL²/12 both; propped (fixed at 0) M0 = −wL²/8; cantilever
    M0 = −wL²/2 (AISC Manual Table 3-23 cases 1, 12, 15, 19).
    """
    _check(cond)
    L, w = _arr(L, w)
    zero = np.zeros(np.broadcast(L, w).shape)
    k = {"simple": 0.0, "fixed": 1.0 / 12.0, "propped": 1.0 / 8.0, "cantilever": 0.5}[cond]
    M0 = -k * w * L**2 + zero
    ML = M0.copy() if cond == "fixed" else zero
    return M0, ML


def udl_reactions(cond: EndCondition, L: ArrayLike, w: ArrayLike) -> tuple[np.ndarray,
                                                                           np.ndarray]:
    """Reactions (R0, RL) from a full-length downward UDL ``w`` (N/m), N (up +).

    simple and fixed wL/2 each; propped (fixed at 0) R0 = 5wL/8, RL = 3wL/8;
    cantilever R0 = wL (AISC Manual Table 3-23 cases 1, 12, 15, 19).
    """
    _check(cond)
    L, w = _arr(L, w)
    k0 = {"simple": 0.5, "fixed": 0.5, "propped": 5.0 / 8.0, "cantilever": 1.0}[cond]
    return k0 * w * L, (1.0 - k0) * w * L


def udl_moment(cond: EndCondition, L: ArrayLike, w: ArrayLike, x: ArrayLike) -> np.ndarray:
    """Bending moment at ``x`` from a full-length UDL ``w`` (N/m), N·m (sagging +).

    M(x) = M0 + R0·x − w·x²/2 (equilibrium; AISC Manual Table 3-23).
    """
    L, w, x = _arr(L, w, x)
    R0, _ = udl_reactions(cond, L, w)
    M0, _ = udl_end_moments(cond, L, w)
    return M0 + R0 * x - 0.5 * w * x**2


def udl_shear(cond: EndCondition, L: ArrayLike, w: ArrayLike, x: ArrayLike) -> np.ndarray:
    """Shear V = dM/dx = R0 − w·x from a full-length UDL ``w`` (N/m), N."""
    L, w, x = _arr(L, w, x)
    R0, _ = udl_reactions(cond, L, w)
    return R0 - w * x


# --------------------------------------------------------------------------- deflection
def green(cond: EndCondition, L: ArrayLike, EI: ArrayLike, x: ArrayLike,
          a: ArrayLike) -> np.ndarray:
    """Deflection at ``x`` (downward +) from a unit downward load at ``a``, m/N.

    Published forms (x ≤ a; the other side follows from Maxwell–Betti symmetry
    green(x, a) = green(a, x)):
    simple: b·x(L² − b² − x²)/(6EIL); under the load a²b²/(3EIL) (AISC Manual
    Table 3-23 case 8). fixed: b²x²(3aL − 3ax − bx)/(6EIL³); under the load
    a³b³/(3EIL³) (case 18; Roark Table 8.1 case 1d). propped (fixed at 0): the
    simple-beam value plus the end moment's M0·x(L − x)(2L − x)/(6EIL), which
    simplifies to b·x²[a(2L − a)(3L − x) − 2L²x]/(12EIL³); under the load
    a³b²(4L − a)/(12EIL³), the published Pa'²b'³(3L + a')/(12EIL³) with a' = L − a
    (case 14; Roark 1c). cantilever (fixed at 0): x²(3a − x)/(6EI); a³/(3EI) under
    the load (case 22).
    Evaluated with lo = min(x, a), hi = max(x, a), β = L − hi, λ = L − lo, and the
    brackets rearranged into sums of non-negative terms (no cancellation next to
    the supports): simple L² − b² − x² = (hi − lo)(hi + lo) + 2·hi·β; fixed
    3aL − 3ax − bx = 3·hi·λ − β·lo; propped bracket = 3L²λ − 2Lβ² − β²λ (used for
    hi > L/2) or hi(2L − hi)(3L − lo) − 2L²·lo (hi ≤ L/2).
    """
    _check(cond)
    L, EI, x, a = _arr(L, EI, x, a)
    lo = np.minimum(x, a)
    hi = np.maximum(x, a)
    beta = L - hi
    if cond == "cantilever":
        return lo**2 * (3.0 * hi - lo) / (6.0 * EI)
    if cond == "simple":
        return lo * beta * ((hi - lo) * (hi + lo) + 2.0 * hi * beta) / (6.0 * L * EI)
    lam = L - lo
    if cond == "fixed":
        return beta**2 * lo**2 * (3.0 * hi * lam - beta * lo) / (6.0 * L**3 * EI)
    bracket = np.where(hi > 0.5 * L,
                       3.0 * L**2 * lam - 2.0 * L * beta**2 - beta**2 * lam,
                       hi * (2.0 * L - hi) * (3.0 * L - lo) - 2.0 * L**2 * lo)
    return beta * lo**2 * bracket / (12.0 * L**3 * EI)


def udl_deflection(cond: EndCondition, L: ArrayLike, EI: ArrayLike, w: ArrayLike,
                   x: ArrayLike) -> np.ndarray:
    """Deflection at ``x`` (downward +) from a full-length UDL ``w`` (N/m), m.

    simple: w·x(L³ − 2Lx² + x³)/(24EI) = w·x(L − x)(L² + Lx − x²)/(24EI) (AISC Manual
    Table 3-23 case 1); fixed: w·x²(L − x)²/(24EI) (case 15); propped (fixed at 0):
    w·ξ(L³ − 3Lξ² + 2ξ³)/(48EI) with ξ = L − x from the pinned end (case 12),
    = w·(L − x)·x²·(3L − 2x)/(48EI); cantilever (fixed at 0):
    w·x²(6L² − 4Lx + x²)/(24EI) (case 19). Factored forms avoid cancellation.
    """
    _check(cond)
    L, EI, w, x = _arr(L, EI, w, x)
    if cond == "cantilever":
        return w * x**2 * (6.0 * L**2 - 4.0 * L * x + x**2) / (24.0 * EI)
    if cond == "fixed":
        return w * x**2 * (L - x) ** 2 / (24.0 * EI)
    if cond == "propped":
        return w * (L - x) * x**2 * (3.0 * L - 2.0 * x) / (48.0 * EI)
    return w * x * (L - x) * (L**2 + L * x - x**2) / (24.0 * EI)


# --------------------------------------------------------------------------- envelopes
def max_abs_shear(cond: EndCondition, L: ArrayLike, P: ArrayLike, a: ArrayLike,
                  w: ArrayLike = 0.0) -> np.ndarray:
    """Largest |V| along the member under a point load ``P`` (N) at ``a`` plus a
    full-length UDL ``w`` (N/m), N.

    V(x) = R0 − w·x − P·[x > a] never increases along x, so its extremes are the end
    values: max(|V(0)|, |V(L)|) = max(|R0|, |RL|) of the combined load (statics).
    """
    L, P, a, w = _arr(L, P, a, w)
    r0, rl = unit_reactions(cond, L, a)
    q0, ql = udl_reactions(cond, L, w)
    return np.maximum(np.abs(P * r0 + q0), np.abs(P * rl + ql))


def max_abs_moment(cond: EndCondition, L: ArrayLike, P: ArrayLike, a: ArrayLike,
                   w: ArrayLike = 0.0) -> np.ndarray:
    """Largest |M| along the member under a point load ``P`` (N) at ``a`` plus a
    full-length UDL ``w`` (N/m), N·m.

    M(x) is piecewise quadratic, so |M| peaks at an end, under the load, or where
    V = 0 inside a segment: x = R0/w (left of a) or (R0 − P)/w (right of a). These
    candidates are evaluated exactly (statics; no sampling).
    """
    L, P, a, w = _arr(L, P, a, w)

    def m_at(x: np.ndarray) -> np.ndarray:
        return P * unit_moment(cond, L, x, a) + udl_moment(cond, L, w, x)

    r0 = P * unit_reactions(cond, L, a)[0] + udl_reactions(cond, L, w)[0]
    safe_w = np.where(w > 0, w, 1.0)
    x1 = np.clip(np.where(w > 0, r0 / safe_w, 0.0), 0.0, a)
    x2 = np.clip(np.where(w > 0, (r0 - P) / safe_w, L), a, L)
    cands = [m_at(0.0 * a), m_at(L + 0.0 * a), m_at(a + 0.0 * L), m_at(x1), m_at(x2)]
    return np.max(np.abs(np.stack(np.broadcast_arrays(*cands))), axis=0)


# --------------------------------------------------------------------------- plastic
def plastic_collapse_load(cond: EndCondition, L: ArrayLike, a: ArrayLike,
                          Mp: ArrayLike) -> np.ndarray:
    """Plastic collapse load of a point load at ``a``, N (rigid-plastic, virtual work).

    Mechanism with hinges at the load and at each fixed end; load P moves δ, the
    segments rotate δ/a and δ/b; P·δ = Σ Mp·θ:
    simple P = Mp·L/(a·b); fixed P = 2·Mp·L/(a·b);
    propped (fixed at 0) P = Mp(1/b + 2/a) = Mp(2L − a)/(a·b) — the published
    Mp(b' + 2a')/(a'b') with a' = b measured from the simple support;
    cantilever (fixed at 0) P = Mp/a (one hinge at the root).
    Derived by virtual work (e.g. Neal, *The Plastic Methods of Structural
    Analysis*; any plastic-analysis text). A load at a support gives ``inf``.
    """
    _check(cond)
    L, a, Mp = _arr(L, a, Mp)
    b = L - a
    with np.errstate(divide="ignore", invalid="ignore"):
        if cond == "simple":
            P = Mp * L / (a * b)
        elif cond == "fixed":
            P = 2.0 * Mp * L / (a * b)
        elif cond == "propped":
            P = Mp * (2.0 * L - a) / (a * b)
        else:
            P = Mp / a
    at_support = (a <= 0.0) | ((b <= 0.0) & (cond != "cantilever"))
    return np.where(at_support, np.inf, P)


_HINGE_WORK: dict[str, tuple[float, float]] = {
    "simple": (1.0, 1.0), "fixed": (2.0, 2.0), "propped": (2.0, 1.0)}
"""Hinges turning with the left and the right segment of a span mechanism: the span
hinge, plus the fixed end on that side (propped: fixed at x = 0)."""


def plastic_collapse_load_udl(cond: EndCondition, L: ArrayLike, a: ArrayLike, Mp: ArrayLike,
                              w: ArrayLike) -> np.ndarray:
    """Plastic collapse value of a point load at ``a`` on a member already carrying a
    full-length UDL ``w`` (N/m), N (0 where the UDL alone is a mechanism).

    Kinematic theorem (the least mechanism load is the collapse load): a span hinge
    at ξ moving Δ = 1, segments rotating 1/ξ and 1/(L − ξ), hinges also at each
    fixed end (k_l, k_r hinges turning with each segment); the point load moves
    δa = a/ξ (a ≤ ξ) or (L − a)/(L − ξ); the UDL does w·L/2:
    P(ξ) = (Mp·(k_l/ξ + k_r/(L − ξ)) − w·L/2)/δa. On each side of the load P(ξ) is
    convex with its least value at (L − ξ)² = 2·k_r·Mp/w (ξ ≥ a) or ξ² = 2·k_l·Mp/w
    (ξ ≤ a), clipped to the side — so the minimum is found exactly in closed form.
    Cantilever (fixed at 0): root hinge, P = (Mp − w·L²/2)/a (a hinge between root
    and load gives more: P(u) with u = a − ξ has a maximum, not a minimum, inside).
    Derived by virtual work (e.g. Neal, *The Plastic Methods of Structural Analysis*;
    fixed beam, load at midspan: P = 8Mp/L − wL/2); equals :func:`plastic_collapse_load`
    for w = 0. A load at a support gives ``inf``. Vectorised.
    """
    _check(cond)
    L, a, Mp, w = np.broadcast_arrays(*_arr(L, a, Mp, w))
    b = L - a
    with np.errstate(divide="ignore", invalid="ignore"):
        if cond == "cantilever":
            P = np.maximum((Mp - 0.5 * w * L**2) / a, 0.0)
            return np.where(a <= 0.0, np.inf, P)
        k_l, k_r = _HINGE_WORK[cond]
        wpos = w > 0.0
        ws = np.where(wpos, w, 1.0)
        xi_r = np.where(wpos, np.maximum(a, L - np.sqrt(2.0 * k_r * Mp / ws)), a)
        xi_l = np.where(wpos, np.minimum(a, np.sqrt(2.0 * k_l * Mp / ws)), a)
        P_r = (Mp * (k_l + k_r * xi_r / (L - xi_r)) - 0.5 * w * L * xi_r) / a
        P_l = (Mp * (k_l * L / xi_l - k_l + k_r) - 0.5 * w * L * (L - xi_l)) / b
        P = np.maximum(np.minimum(P_l, P_r), 0.0)
    P = np.where(Mp <= 0.0, 0.0, P)
    return np.where((a <= 0.0) | (b <= 0.0), np.inf, P)


# --------------------------------------------------------------------------- mass
# Gauss–Legendre nodes: the Green's function is cubic on each side of the load, so
# its square (degree 6) is integrated exactly by 4 points per segment.
def rayleigh_mass_factor(cond: EndCondition, L: ArrayLike, a: ArrayLike,
                         n: int = 4) -> np.ndarray:
    """Effective-mass factor β = ∫₀ᴸ (y(x)/y(a))² dx / L of a member struck at ``a``
    (dimensionless; effective mass m_e = β·μ·L for mass per length μ).

    y(x) = green(cond, L, 1, x, a) is the static deflected shape (Rayleigh's method:
    kinetic energy of the member moving in its static shape, Timoshenko, *Strength of
    Materials* Part I; Roark's dynamic-loading chapter). Known values: 17/35 simple
    at midspan, 13/35 fixed at midspan, 33/140 cantilever at the tip (Rao, *Mechanical
    Vibrations*). Integrated with ``n``-point Gauss–Legendre on [0, a] and [a, L]
    (exact for n ≥ 4). Where the struck point does not move (a load on a support)
    the member is not set in motion and β = 0.
    """
    _check(cond)
    L, a = _arr(L, a)
    L, a = np.broadcast_arrays(L, a)
    t, wt = np.polynomial.legendre.leggauss(n)
    s = 0.5 * (t + 1.0)  # nodes on [0, 1]
    ws = 0.5 * wt
    La = L[..., None]
    aa = a[..., None]
    x_left = aa * s
    x_right = aa + (La - aa) * s
    ya = green(cond, L, 1.0, a, a)
    y_left = green(cond, La, 1.0, x_left, aa)
    y_right = green(cond, La, 1.0, x_right, aa)
    integral = (aa[..., 0] * np.sum(ws * y_left**2, axis=-1)
                + (L - a) * np.sum(ws * y_right**2, axis=-1))
    moving = ya > 0.0
    with np.errstate(divide="ignore", invalid="ignore"):
        beta = integral / (np.where(moving, ya, 1.0) ** 2 * L)
    return np.where(moving, beta, 0.0)
