"""A Timoshenko beam on compliant end connections struck by a load on a compression-only
contact spring: the independent reference for the force an end connection carries
under a drop (issue 12, the end-shear spike).

Model (span L, the ends on vertical springs k_c to an immovable support, each end
carrying a lumped mass m_end — the connection's plates and bolts; the member or column
behind the connection taken as immovable, which passes the most force, the safe side):
a Ritz model, deflection w(x, t) = u₀(t)·(1 − x/L) + u_L(t)·x/L + Σ Wₙ(t)·sin(kₙx)
and section rotation ψ(x, t) = (u_L − u₀)/L + Σ Ψₙ(t)·cos(kₙx), kₙ = nπ/L: the ends'
rigid-body motion (no strain) plus the pinned Timoshenko beam's series
(``tests/solver/timoshenko_reference``; Han, Benaroya & Wei, J. Sound Vib. 225(5),
1999, §3, from memory). Strain energy ½∫EI·ψ'² + ½∫κGA·(w' − ψ)² + ½k_c·(u₀² + u_L²);
kinetic energy ½∫ρA·ẇ² + ½∫ρI·ψ̇² + ½m_end·(u̇₀² + u̇_L²) (Timoshenko 1921; Lagrange's
equations give a full mass matrix coupling the ends' motion with the series). The
connection force is k_c·u (N); as k_c → ∞ it tends to the pinned beam's end reaction.

Each phase (in contact / the load in flight) solved exactly by
:func:`tests.solver.timoshenko_reference.contact_drop` after the congruence
y = Cᵀx, M = C·Cᵀ (Cholesky), which makes the mass matrix the identity (Bathe,
*Finite Element Procedures* §10.2.5, from memory); the load's coordinate is uncoupled
in mass, so its speed and weight scale by √M. Undamped. SI units: m, N, kg, s.

Test helper and study tool only (scipy); droprig never imports it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.linalg import cholesky, eigh, solve_triangular

from tests.solver.timoshenko_reference import G, contact_drop


@dataclass(frozen=True)
class ConnectionPeaks:
    """Peaks of one drop on a member with compliant ends: the contact force (N), the
    larger end connection's force k_c·|u| (N), the struck point's deflection (m) and
    the lowest frequency of the contact-free member on its connections (rad/s)."""

    force: float
    connection: float
    deflection: float
    omega1: float


def _series_integrals(L: float, n_modes: int) -> tuple[np.ndarray, np.ndarray]:
    """∫₀ᴸ sin(kₙx)·(1 − x/L) dx = L/(nπ) and ∫₀ᴸ sin(kₙx)·x/L dx = −(−1)ⁿ·L/(nπ) (m),
    kₙ = nπ/L (integration by parts; the tests check them by quadrature)."""
    n = np.arange(1, n_modes + 1)
    return L / (n * math.pi), -((-1.0) ** n) * L / (n * math.pi)


def connection_drop(L: float, EI: float, mu: float, kGA: float, rhoI: float, a: float,
                    M: float, h: float, f_c: float, k_conn: float, *,
                    m_end: float = 0.0, n_modes: int = 40, duration: float = 1.25,
                    samples_per_period: int = 10, max_samples: int = 400_000
                    ) -> ConnectionPeaks:
    """Peaks of a load M (kg) dropped h (m) onto a Timoshenko member (L m, EI N·m²,
    ρA = ``mu`` kg/m, κGA N, ρI kg·m) at ``a`` (m) through f_c (m/N, > 0), its ends on
    connections of stiffness ``k_conn`` (N/m, > 0) carrying ``m_end`` (kg) each, over
    ``duration`` × the longer of the member's fundamental period and the loaded one."""
    if not (k_conn > 0.0 and math.isfinite(k_conn)):
        raise ValueError(f"k_conn: the connection's stiffness must be > 0 and finite "
                         f"N/m (got {k_conn!r})")
    N = n_modes
    k = np.arange(1, N + 1) * math.pi / L
    iW, iP = np.arange(3, 3 + N), np.arange(3 + N, 3 + 2 * N)
    nd = 3 + 2 * N  # load, u0, uL, W1..N, Ψ1..N
    Mm = np.zeros((nd, nd))
    Mm[0, 0] = M
    s0, sL = _series_integrals(L, N)
    Mm[1, 1] = Mm[2, 2] = mu * L / 3.0 + m_end + rhoI / L
    Mm[1, 2] = Mm[2, 1] = mu * L / 6.0 - rhoI / L
    Mm[iW, iW] = mu * L / 2.0
    Mm[1, iW] = Mm[iW, 1] = mu * s0
    Mm[2, iW] = Mm[iW, 2] = mu * sL
    Mm[iP, iP] = rhoI * L / 2.0  # ∫cos(kₙx)dx = 0: no coupling with the rigid rotation
    K = np.zeros((nd, nd))
    K[1, 1] = K[2, 2] = k_conn
    K[iW, iW] = L / 2.0 * kGA * k**2
    K[iW, iP] = K[iP, iW] = -L / 2.0 * kGA * k
    K[iP, iP] = L / 2.0 * (EI * k**2 + kGA)
    c = np.zeros(nd)  # the contact's closure u − w(a)
    c[0], c[1], c[2], c[iW] = 1.0, -(1.0 - a / L), -a / L, -np.sin(k * a)
    b = np.zeros(nd)
    b[0] = M * G
    r0, rL, rd = np.zeros(nd), np.zeros(nd), -c.copy()
    r0[1], rL[2], rd[0] = k_conn, k_conn, 0.0
    # y = Cᵀx with M = C·Cᵀ: identity mass; K' = C⁻¹KC⁻ᵀ, c' = C⁻¹c, b' = C⁻¹b
    C = cholesky(Mm, lower=True)

    def inv(v: np.ndarray) -> np.ndarray:
        return solve_triangular(C, v, lower=True)

    Kp = inv(inv(K).T).T
    Kp = 0.5 * (Kp + Kp.T)
    lam = eigh(K, Mm, eigvals_only=True)
    omega1 = math.sqrt(max(float(lam[lam > 1e-9 * lam.max()].min()), 0.0))
    g_aa = (a**2 * (L - a) ** 2 / (3.0 * EI * L) + a * (L - a) / (kGA * L)
            + ((1 - a / L) ** 2 + (a / L) ** 2) / k_conn)
    T_sys = 2.0 * math.pi * math.sqrt((M + 0.5 * mu * L) * (g_aa + f_c))
    t_end = duration * max(2.0 * math.pi / omega1, T_sys)
    sq = math.sqrt(M)  # C[0, 0]: the load's coordinate is y₀ = √M·x₀
    pk = contact_drop(np.ones(nd), Kp, inv(c), 1.0 / f_c, inv(b),
                      sq * math.sqrt(2.0 * G * h), t_end,
                      {"left": inv(r0), "right": inv(rL), "deflection": inv(rd)},
                      samples_per_period=samples_per_period, max_samples=max_samples)
    return ConnectionPeaks(force=pk["force"], connection=max(pk["left"], pk["right"]),
                           deflection=pk["deflection"], omega1=omega1)
