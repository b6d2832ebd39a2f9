"""A Timoshenko beam struck by a load on a compression-only contact spring: the
independent reference for the members' end shear (support reactions) under a drop.

Model (simply supported, span L): deflection w(x, t) = Σ Wₙ(t)·sin(kₙx) and section
rotation ψ(x, t) = Σ Ψₙ(t)·cos(kₙx), kₙ = nπ/L, satisfy the pinned ends exactly
(w = 0, M = EI·ψ' = 0). Strain energy ½∫EI·ψ'² + ½∫κGA·(w' − ψ)², kinetic energy
½∫ρA·ẇ² + ½∫ρI·ψ̇² (Timoshenko 1921; the equations and the simply supported
frequency equation (κGA·k² − ρA·ω²)(EI·k² + κGA − ρI·ω²) = (κGA·k)² as in Han,
Benaroya & Wei, J. Sound Vib. 225(5), 1999, §3 — from memory). Per n:
mass diag(ρA·L/2, ρI·L/2), stiffness (L/2)·[[κGA·k², −κGA·k], [−κGA·k, EI·k² + κGA]].
The load (mass M, N·s²/m) meets the beam at ``a`` through a spring 1/f_c that pushes
only: F = (u − w(a))/f_c while positive, the generalised force on Wₙ is F·sin(kₙa).
End shear (the reaction at x = 0) V = κGA·(w' − ψ) = κGA·Σ(kₙWₙ − Ψₙ).

Each phase (in contact, or the load flying freely) is a linear system solved exactly
(``scipy.linalg.eigh``, modal superposition, Chopra 4th ed. §12; a zero frequency —
the free load — as uniform acceleration), sampled ``samples_per_period`` times a period
of its highest frequency; the phase ends (F = 0, the gap closing) are found by
bisection of the closed form. Undamped. SI units: m, N, kg, s.

:func:`contact_drop` is the same exact-phase solution for any linear structure (the
two-member history of ``tests/solver/test_shared_load.py``).

Test helper and study tool only (scipy); droprig never imports it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.linalg import eigh

G = 9.80665


@dataclass(frozen=True)
class TimoshenkoPeaks:
    """Peaks of one drop: contact force (N), end reaction |V(0)| (N), the struck
    point's deflection (m, downward +) and the beam's frequencies (rad/s, ascending,
    the contact-free beam)."""

    force: float
    reaction: float
    deflection: float
    omega: np.ndarray


def timoshenko_drop(L: float, EI: float, mu: float, kGA: float, rhoI: float, a: float,
                    M: float, h: float, f_c: float, *, n_modes: int = 40,
                    duration: float = 1.25, window: float | None = None,
                    samples_per_period: int = 10, max_samples: int = 200_000
                    ) -> TimoshenkoPeaks:
    """Peaks of a load M (kg) dropped h (m) onto a simply supported Timoshenko beam
    (L m, EI N·m², ρA = ``mu`` kg/m, κGA N, ρI kg·m) at ``a`` (m) through f_c (m/N,
    > 0), over ``window`` s (default ``duration`` × the longer of the beam's
    fundamental period and the loaded period, as droprig's time history)."""
    N = n_modes
    k = np.arange(1, N + 1) * math.pi / L
    nd = 1 + 2 * N
    iW, iP = np.arange(1, N + 1), np.arange(N + 1, 2 * N + 1)
    mass = np.empty(nd)
    mass[0], mass[iW], mass[iP] = M, mu * L / 2.0, rhoI * L / 2.0
    K = np.zeros((nd, nd))
    K[iW, iW] = L / 2.0 * kGA * k**2
    K[iW, iP] = K[iP, iW] = -L / 2.0 * kGA * k
    K[iP, iP] = L / 2.0 * (EI * k**2 + kGA)
    c = np.zeros(nd)
    c[0], c[iW] = 1.0, -np.sin(k * a)  # the contact's closure u − w(a)
    r_V = np.zeros(nd)
    r_V[iW], r_V[iP] = kGA * k, -kGA
    b = np.zeros(nd)
    b[0] = M * G
    lam_free = eigh(K, np.diag(mass), eigvals_only=True)
    omega = np.sqrt(np.clip(lam_free[lam_free > 1e-9 * lam_free.max()], 0.0, None))
    g_aa = L**3 / (48.0 * EI) if abs(a - L / 2) < 1e-12 else \
        a**2 * (L - a) ** 2 / (3.0 * EI * L)
    T_sys = 2.0 * math.pi * math.sqrt((M + 0.5 * mu * L) * (g_aa + f_c))
    t_end = window if window is not None else duration * max(2 * math.pi / omega[0], T_sys)
    r_d = -c.copy()
    r_d[0] = 0.0  # w(a)
    pk = contact_drop(mass, K, c, 1.0 / f_c, b, math.sqrt(2.0 * G * h), t_end,
                      {"reaction": r_V, "deflection": r_d},
                      samples_per_period=samples_per_period, max_samples=max_samples)
    return TimoshenkoPeaks(force=pk["force"], reaction=pk["reaction"],
                           deflection=pk["deflection"], omega=omega)


def contact_drop(mass: np.ndarray, K: np.ndarray, c: np.ndarray, kc: float, b: np.ndarray,
                 v0: float, t_end: float, outputs: dict[str, np.ndarray], *,
                 samples_per_period: int = 10, max_samples: int = 200_000
                 ) -> dict[str, float]:
    """Peaks of a linear structure (diagonal mass ``mass``, stiffness K; coordinate 0
    the load, starting at speed v0 m/s, every coordinate at 0) struck through a
    compression-only spring kc (N/m) on the closure c·x, under the constant forces b
    (N), over t_end s: the largest contact force ``force`` (N) and the largest
    |r·x| of each row r of ``outputs``. Each phase exact (module docstring)."""
    nd = mass.size
    phases = {True: eigh(K + kc * np.outer(c, c), np.diag(mass)),
              False: eigh(K, np.diag(mass))}

    def evolve(contact: bool, x0: np.ndarray, v0_: np.ndarray, ts: np.ndarray
               ) -> tuple[np.ndarray, np.ndarray]:
        lam, V = phases[contact]
        z0, zd0, fz = V.T @ (mass * x0), V.T @ (mass * v0_), V.T @ b
        rigid = lam <= 1e-9 * lam.max()
        w = np.sqrt(np.where(rigid, 1.0, lam))
        zs = np.where(rigid, 0.0, fz / np.where(rigid, 1.0, lam))
        T = ts[:, None]
        cs, sn = np.cos(w * T), np.sin(w * T)
        z = np.where(rigid, z0 + zd0 * T + 0.5 * fz * T**2,
                     zs + (z0 - zs) * cs + zd0 / w * sn)
        zd = np.where(rigid, zd0 + fz * T, -(z0 - zs) * w * sn + zd0 * cs)
        return z @ V.T, zd @ V.T

    x, v = np.zeros(nd), np.zeros(nd)
    v[0] = v0
    t, contact = 0.0, True
    pk = dict.fromkeys(["force", *outputs], 0.0)
    for _ in range(400):
        lam = phases[contact][0]
        dt = 2.0 * math.pi / math.sqrt(lam.max()) / samples_per_period
        ns = min(int((t_end - t) / dt) + 2, max_samples)
        ts = np.arange(ns) * dt
        X, _ = evolve(contact, x, v, ts)
        gap = X @ c
        ends = np.flatnonzero((gap < 0.0) if contact else (gap > 0.0))
        ends = ends[ends > 0]
        stop = int(ends[0]) if ends.size else ns
        for key, r in outputs.items():
            pk[key] = max(pk[key], float(np.abs(X[:stop] @ r).max()))
        if contact:
            pk["force"] = max(pk["force"], float(kc * gap[:stop].max()))
        if not ends.size:
            if ns == max_samples and t + ts[-1] < t_end:
                raise RuntimeError("contact_drop: window longer than max_samples")
            break
        lo, hi = float(ts[stop - 1]), float(ts[stop])
        for _ in range(40):
            mid = 0.5 * (lo + hi)
            gm = float(evolve(contact, x, v, np.array([mid]))[0][0] @ c)
            if (gm < 0.0) if contact else (gm > 0.0):
                hi = mid
            else:
                lo = mid
        Xe, Ve = evolve(contact, x, v, np.array([hi]))
        x, v = Xe[0], Ve[0]
        t += hi
        contact = not contact
        if t >= t_end:
            break
    return pk
