"""Struck mass of the floor: steel, slab and superimposed dead load, and the two-mass
(load / struck structure) idealisation of a hard or soft impact.

The energy method with a struck-mass efficiency η = M/(M + m_e) assumes the contact
is instantaneous and the struck structure then moves in its static shape. Where a
hard load meets a heavy slab this is not so: the contact lasts a fraction of the
structure's period. The two-mass model keeps both masses and both springs — the
load M on the contact spring k_c (the load's underside, the local indentation and
the slab strip in series) and the struck structure m2 on its global spring k2 —
and solves the contact pulse in closed form (CEB Bulletin 187, *Concrete
Structures under Impact and Impulsive Loading*, 1988, two-mass model — from
memory; Biggs, *Introduction to Structural Dynamics*, 1964, ch. 5 for the
equivalent mass m2 = K_M·m_total with the load–mass factors).

Vectorised over drop points. SI units: kg, kg/m, kg/m², m, N, N/m, s, Pa.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import G

__all__ = [
    "LOAD_MASS_FACTORS",
    "distributed_mass_per_length",
    "slab_mass_per_area",
    "two_mass_impact",
]

LOAD_MASS_FACTORS: dict[tuple[str, str, str], tuple[float, float]] = {
    ("simple", "point", "elastic"): (1.0, 0.49),
    ("simple", "point", "plastic"): (1.0, 0.33),
    ("simple", "uniform", "elastic"): (0.64, 0.50),
    ("simple", "uniform", "plastic"): (0.50, 0.33),
}
"""Biggs (1964) Table 5.1, simply supported beam: (K_L, K_M) — from memory. The
point-load elastic K_M = 0.49 is Rayleigh's 17/35 = 0.486 for a beam struck at
midspan (Timoshenko, *Strength of Materials* Part I)."""


def slab_mass_per_area(thickness: ArrayLike, density: ArrayLike,
                       superimposed_dead: ArrayLike = 0.0) -> np.ndarray:
    """Mass of the deck per plan area, kg/m²: ρ·h + q_sd/g (the superimposed dead
    load q_sd in Pa moves with the slab: finishes, services, plant bases — common
    practice, no source; g from :data:`droprig.solver.impact.G`)."""
    h, rho, q = np.broadcast_arrays(*(np.asarray(v, float)
                                      for v in (thickness, density, superimposed_dead)))
    return rho * h + q / G


def distributed_mass_per_length(steel_mass_per_length: ArrayLike, mass_per_area: ArrayLike,
                                tributary_width: ArrayLike) -> np.ndarray:
    """Mass per length that moves with a member, kg/m: its own steel plus the slab
    and superimposed dead load over its tributary width (half the spacing to the
    members on each side; lever rule for the one-way deck, common practice, no
    source). The Rayleigh struck mass is then β·μ·L with the member's β."""
    mu, ma, b = np.broadcast_arrays(*(np.asarray(v, float)
                                      for v in (steel_mass_per_length, mass_per_area,
                                                tributary_width)))
    return mu + ma * b


def _contact_phase(M: np.ndarray, kc: np.ndarray, m2: np.ndarray, k2: np.ndarray,
                   state: tuple[np.ndarray, ...], t: np.ndarray
                   ) -> tuple[np.ndarray, ...]:
    """Closed-form 2-DOF response in contact from ``state`` = (x1, v1, x2, v2) at the
    sample times ``t`` (n, k): returns (x1, v1, x2, v2) arrays (n, k)."""
    a = M * m2
    b = kc * m2 + (kc + k2) * M
    c = kc * k2
    disc = np.sqrt(np.maximum(b * b - 4.0 * a * c, 0.0))
    w2_lo = 2.0 * c / (b + disc)  # stable form of the small root
    w2_hi = (b + disc) / (2.0 * a)
    w_lo, w_hi = np.sqrt(w2_lo), np.sqrt(w2_hi)
    x_st1 = M * G / k2 + M * G / kc
    x_st2 = M * G / k2
    p_lo = (kc - w2_lo * M) / kc
    p_hi = (kc - w2_hi * M) / kc
    det = p_hi - p_lo
    x1, v1, x2, v2 = state
    y1, y2 = x1 - x_st1, x2 - x_st2
    q_lo0, q_hi0 = (p_hi * y1 - y2) / det, (y2 - p_lo * y1) / det
    qd_lo0, qd_hi0 = (p_hi * v1 - v2) / det, (v2 - p_lo * v1) / det
    cl, sl = np.cos(w_lo * t), np.sin(w_lo * t)
    ch, sh = np.cos(w_hi * t), np.sin(w_hi * t)
    ql = q_lo0 * cl + qd_lo0 / w_lo * sl
    qh = q_hi0 * ch + qd_hi0 / w_hi * sh
    qld = -q_lo0 * w_lo * sl + qd_lo0 * cl
    qhd = -q_hi0 * w_hi * sh + qd_hi0 * ch
    return (x_st1 + ql + qh, qld + qhd, x_st2 + p_lo * ql + p_hi * qh,
            p_lo * qld + p_hi * qhd)


def _first(mask: np.ndarray) -> np.ndarray:
    """Index of the first True per row, or the row length where none."""
    return np.where(mask.any(axis=1), mask.argmax(axis=1), mask.shape[1])


def two_mass_impact(M: ArrayLike, v0: ArrayLike, k_c: ArrayLike, m2: ArrayLike,
                    k2: ArrayLike, n_time: int = 400,
                    episodes: int = 6) -> tuple[np.ndarray, np.ndarray]:
    """Peak contact force (N) and peak displacement of the struck structure (m) when
    a load of mass M (kg) strikes at speed v0 (m/s) through a contact spring k_c
    (N/m) a structure of equivalent mass m2 (kg) and stiffness k2 (N/m).

    Equations of motion (x1 load, x2 structure, downward +; the spring pushes only):
    M·x1'' = M·g − k_c·⟨x1 − x2⟩, m2·x2'' = k_c·⟨x1 − x2⟩ − k2·x2, x(0) = 0,
    x1'(0) = v0, x2'(0) = 0 (CEB Bulletin 187 two-mass model — from memory).
    In contact: closed-form modal solution about the static position
    x_st = (M·g/k2)·[1 + k2/k_c, 1], ω² from
    M·m2·ω⁴ − (k_c·m2 + (k_c + k2)·M)·ω² + k_c·k2 = 0 (Clough & Penzien, *Dynamics
    of Structures*, 2-DOF free vibration). Apart: the load falls freely and the
    structure vibrates at ω = √(k2/m2). Up to ``episodes`` contacts are followed,
    each sampled at ``n_time`` points (half over 1½ half-periods of the fast mode,
    half over one period of the slow one), within a horizon of two periods of
    the slow mode; the peaks are taken over all of them.
    """
    arrs = np.broadcast_arrays(*(np.asarray(v, float) for v in (M, v0, k_c, m2, k2)))
    shape = arrs[0].shape
    Mc, v0c, kc, m2c, k2c = (a.reshape(-1, 1) for a in arrs)
    return _two_mass(Mc, v0c, kc, m2c, k2c, n_time, episodes, shape)


def _two_mass(M: np.ndarray, v0: np.ndarray, kc: np.ndarray, m2: np.ndarray,
              k2: np.ndarray, n_time: int, episodes: int,
              shape: tuple[int, ...]) -> tuple[np.ndarray, np.ndarray]:
    """:func:`two_mass_impact` on (n, 1) arrays."""
    m2 = np.maximum(m2, 1e-9 * M)  # a massless structure: the series-spring limit
    b = kc * m2 + (kc + k2) * M
    disc = np.sqrt(np.maximum(b * b - 4.0 * M * m2 * kc * k2, 0.0))
    w_lo = np.sqrt(2.0 * kc * k2 / (b + disc))
    w_hi = np.sqrt((b + disc) / (2.0 * M * m2))
    w_free = np.sqrt(k2 / m2)
    horizon = 4.0 * np.pi / w_lo
    half = n_time // 2
    s = np.linspace(0.0, 1.0, half + 1)[None, 1:]
    t_c = np.sort(np.concatenate([s * 1.5 * np.pi / w_hi, s * 2.0 * np.pi / w_lo], axis=1),
                  axis=1)
    zero = np.zeros_like(M)
    state = (zero, v0, zero, zero)
    clock = zero.copy()
    active = np.ones_like(M, dtype=bool)
    F_peak = np.zeros(M.shape[0])
    x2_peak = np.zeros(M.shape[0])
    rows = np.arange(M.shape[0])
    for _ in range(episodes):
        x1, _, x2, _ = _contact_phase(M, kc, m2, k2, state, t_c)
        F = kc * (x1 - x2)
        sep = _first((F < 0.0) & (t_c > 0.0) & (clock + t_c <= horizon))
        live = np.arange(t_c.shape[1])[None, :] < sep[:, None]
        live &= active
        F_peak = np.maximum(F_peak, np.max(np.where(live, F, 0.0), axis=1))
        x2_peak = np.maximum(x2_peak, np.max(np.where(live, x2, 0.0), axis=1))
        separated = (sep < t_c.shape[1]) & active[:, 0]
        k = np.minimum(sep, t_c.shape[1] - 1)
        # separation time by linear interpolation of the contact force
        kp = np.maximum(k - 1, 0)
        Fa, Fb = F[rows, kp], F[rows, k]
        ta, tb = t_c[rows, kp], t_c[rows, k]
        with np.errstate(divide="ignore", invalid="ignore"):
            ts = np.where(Fa > Fb, ta + (tb - ta) * Fa / (Fa - Fb), tb)[:, None]
        st = _contact_phase(M, kc, m2, k2, state, ts)
        clock = clock + ts
        # apart: free flight of the load, free vibration of the structure
        rest = np.maximum(horizon - clock, 0.0)
        tau = s * rest
        fx1 = st[0] + st[1] * tau + 0.5 * G * tau**2
        fx2 = st[2] * np.cos(w_free * tau) + st[3] / w_free * np.sin(w_free * tau)
        amp = np.sqrt(st[2] ** 2 + (st[3] / w_free) ** 2)[:, 0]
        x2_peak = np.where(separated, np.maximum(x2_peak, amp), x2_peak)
        gap = fx1 - fx2
        back = _first(gap >= 0.0)
        again = separated & (back < tau.shape[1])
        j = np.minimum(back, tau.shape[1] - 1)
        jp = np.maximum(j - 1, 0)
        ga, gb = gap[rows, jp], gap[rows, j]
        ta, tb = tau[rows, jp], tau[rows, j]
        with np.errstate(divide="ignore", invalid="ignore"):
            tj = np.where(gb > ga, ta + (tb - ta) * (-ga) / (gb - ga), tb)[:, None]
        fx1 = st[0] + st[1] * tj + 0.5 * G * tj**2
        fx2 = st[2] * np.cos(w_free * tj) + st[3] / w_free * np.sin(w_free * tj)
        state = (fx1, st[1] + G * tj, fx2,
                 -st[2] * w_free * np.sin(w_free * tj) + st[3] * np.cos(w_free * tj))
        clock = clock + tj
        active = again[:, None]
        if not active.any():
            break
    return F_peak.reshape(shape), x2_peak.reshape(shape)
