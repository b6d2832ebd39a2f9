"""Upper bounds of the point time history's peaks from the impulse and the peak force
of the contact: the light item's bound (a short, hard contact pulse).

Why: the rigid-base bound (:func:`droprig.solver.amplification.contact_force_bound`,
the load on its contact spring against an immovable point) grows as √(M·v²/f_c) as the
contact stiffens, and the member bounds built on it (B_X × that force, B_VS × its
static shear) grow with it. A light hard item's contact lasts far less than the
periods of the modes that carry a member's moment and shear: those modes respond to
the pulse's IMPULSE, not to its peak force (Biggs, *Introduction to Structural
Dynamics*, 1964, ch. 2, the impulsive asymptote of the shock spectrum; Clough &
Penzien, *Dynamics of Structures* 2nd ed. §5-3 — from memory). A 1 kg item dropped
0.48 m carries about 2·M·v = 6 N·s into the member however stiff the contact.

Model: that of the point time history (:mod:`droprig.solver.pointhistory`,
:mod:`droprig.solver.exacthistory`): the struck member's Euler–Bernoulli modes
(mass-normalised q̃ₙ, ωₙ, Blevins 1979 Table 8-1) kept up to ``cutoff`` × the contact
frequency ω_c = √(k_c·(1/M + 1/mₑ)) — or × the contact force's rise to its crushing
force where faster (:func:`droprig.solver.timehistory.rise_frequency`, stop 32) — and
at most ``n_modes``, the rest of the member as
its residual (static) flexibility f_res in series with the contact f_c; every output X
at a section x (deflection, moment, shear) is

    X(x, t) = Σₙ Wₙ(x)·q̃ₙ(t) + R(x)·F(t),

Wₙ per unit q̃ₙ, R(x) the static correction per unit contact force (the exact
unit-load field less the kept modes' static part), F(t) ≥ 0 the contact force
(push only). The truncation, stated: a mode faster than ``cutoff`` (8) × the pulse's
own frequency sees the pulse as slow — it follows F(t) statically (its dynamic part
is of the order ω_c/ωₙ ≤ 1/8 of its static part) and is carried by R; what Euler–
Bernoulli theory says about modes whose half-wavelength nears the depth is not
physics anyway (Timoshenko 1921: shear deformation and rotary inertia lower them,
and a support sees nothing before the shear wave reaches it). An Euler–Bernoulli
member hit by an ideal impulse has an end shear that diverges with the modes kept
(|Wᵥₙ·φ̃ₙ/ωₙ| grows as n); the cut-off keeps the modes the pulse can excite.

Bounds (each rigorous for that model, Duhamel's integral, Chopra 4th ed. §4.2):

* contact force: the spring 1/(f_c + f_res) can hold no more than the whole energy,
  F²·(f_c + f_res)/2 ≤ ½·M·v₀² + W·u_max, u_max the load's lowest travel
  (:func:`droprig.solver.amplification.member_energy_force`'s s + c); and no more
  than the crushing force where the crushing cannot pass its stroke;
* impulse over the window t_w of the history: ∫F dt = W·t + M·(v₀ − u̇(t)), the load's
  speed |u̇| ≤ √(v₀² + 2·g·u_max) (energy), so I ≤ W·t_w + M·v₀ + √(M²v₀² + 2·M·W·u_max);
* each mode: q̃ₙ(t) = (φ̃ₙ(a)/ωₙ)·∫F(τ)·sin ωₙ(t − τ) dτ, so |q̃ₙ| ≤ |φ̃ₙ(a)|·I/ωₙ
  (the impulsive bound, any pulse) and, for a pulse of one hump no larger than F_max,
  |q̃ₙ| ≤ |φ̃ₙ(a)|·2·F_max/ωₙ² (integration by parts: F(t) + the pulse's variation up
  to t ≤ 2·F_max — the dynamic load factor 2 of Biggs Fig. 2.6);
* X_max ≤ maxₓ [Σₙ |Wₙ(x)|·Qₙ + |R(x)|·F_max], Qₙ the lesser of the two.

The one-hump bound is the only part that is not general (a load chattering on a
vibrating member makes several humps): it is checked against the time history on
random members (tests/solver/test_amplification_impulse.py). SI units: m, N, kg, s.
"""

from __future__ import annotations

import math
from typing import cast

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import beam, impact, timehistory
from droprig.solver.beam import EndCondition

__all__ = ["GRID", "ONE_HUMP_DLF", "impulse_peak_bounds", "tabulated_bounds",
           "unit_deflection", "window"]

ONE_HUMP_DLF = 2.0
"""Largest dynamic load factor of one hump of force (rising then falling, never
negative) on an undamped mode: Biggs 1964 Fig. 2.6 (from memory); by parts,
ω²·|q| ≤ F(t) + total variation of F up to t ≤ 2·F_max."""


def window(T1: ArrayLike, M: ArrayLike, m_e: ArrayLike, mu_L: ArrayLike, f_s: ArrayLike,
           f_c: ArrayLike, v0: ArrayLike, F_y: ArrayLike, W: ArrayLike,
           duration: float = 1.25) -> np.ndarray:
    """The time history's window, s (:func:`droprig.solver.exacthistory.
    exact_time_history`): ``duration`` × (the longer of the member's fundamental
    period T1 (s) and the loaded period 2π·√((M + min(mₑ, μL))·(f_s + f_c)), plus the
    crushing time M·v₀/(F_y − W) where the contact crushes)."""
    T1, M, m_e, mu_L, f_s, f_c, v0, F_y, W = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (T1, M, m_e, mu_L, f_s, f_c, v0, F_y, W)))
    T_sys = 2.0 * math.pi * np.sqrt((M + np.minimum(m_e, mu_L)) * (f_s + f_c))
    with np.errstate(divide="ignore", invalid="ignore"):
        t_crush = np.where(np.isfinite(F_y), M * v0 / (F_y - W), 0.0)
    return duration * (np.maximum(T1, T_sys) + t_crush)


def _energy_budget(W: np.ndarray, M: np.ndarray, v0: np.ndarray, f: np.ndarray,
                   F_y: np.ndarray, s_y: np.ndarray
                   ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The most energy any spring or mode can hold (J), where the crushing holds
    within its stroke (bool), where the contact crushes at all (bool) and the load's
    lowest travel u_max (m). That travel is the elastic one (Gere 7th ed.
    §9.10 Eq. 9-94, η = 1, on the series compliance f, m/N) plus what crushing at
    F_y (N) can take, at most the stroke s_y (m; the energy balance of
    :func:`droprig.solver.amplification.member_energy_force`); the energy is the
    strike's ½·M·v0² plus the weight W (N) over that travel. The crushing holds even
    with all the energy in it where :func:`droprig.solver.amplification.
    crush_depth_bound` stays within the stroke: the contact force is then at most F_y.
    M in kg, v0 in m/s."""
    s = W * f * (1.0 + np.sqrt(1.0 + M * v0**2 / (W * W * f)))
    crush = np.isfinite(F_y) & (F_y > W)
    with np.errstate(divide="ignore", invalid="ignore"):
        c = np.where(crush, (0.5 * M * v0**2 + 0.5 * W**2 * f) / (F_y - W), 0.0)
        c_all = 1.05 * W * (0.5 * M * v0**2 / W + F_y * f) / (F_y - W)
    u_max = s + np.minimum(c, np.where(crush, s_y, 0.0))
    return 0.5 * M * v0**2 + W * u_max, crush & (c_all <= s_y), crush, u_max


def impulse_peak_bounds(cond: EndCondition | ArrayLike, L: ArrayLike, EI: ArrayLike,
                        mu: ArrayLike, a: ArrayLike, M: ArrayLike, h: ArrayLike,
                        f_c: ArrayLike, *, F_yield: ArrayLike = math.inf,
                        stroke: ArrayLike = math.inf, weight: ArrayLike | None = None,
                        n_modes: int = timehistory.DEFAULT_MODES,
                        cutoff: float = timehistory.DEFAULT_CUTOFF,
                        sections: int = 16, one_hump: bool = True
                        ) -> dict[str, np.ndarray]:
    """Upper bounds of the peaks of :func:`droprig.solver.exacthistory.
    exact_time_history` with the same arguments (the member: end condition ``cond``,
    span L m, EI N·m², μ kg/m, struck at ``a`` m; the load: mass M kg, falling h m,
    through f_c m/N, crushing at ``F_yield`` N over ``stroke`` m; ``weight`` N,
    default M·g; the modes kept, ``n_modes`` and ``cutoff``): ``force`` (N),
    ``moment`` (N·m), ``shear`` (N), ``deflection`` (m), and the impulse bound
    ``impulse`` (N·s), the contact-force bound ``F_max`` (N). Formulas and sources in
    the module docstring. ``one_hump`` false: the impulsive bound alone on every mode
    (general, looser). Vectorised over cases."""
    (L, EI, mu, a, M, h, f_c, F_y, s_y), f_s, W = timehistory.checked_case(
        cond, (L, EI, mu, a, M, h, f_c, F_yield, stroke), False, weight)
    P = L.size
    conds = np.broadcast_to(np.asarray(cond, dtype=object), L.shape)
    v0 = np.sqrt(2.0 * impact.G * h)
    f = f_s + f_c
    energy, holds, crush, u_max = _energy_budget(W, M, v0, f, F_y, s_y)
    out = {k: np.zeros(P) for k in ("force", "moment", "shear", "deflection",
                                    "impulse", "F_max")}
    for cnd in dict.fromkeys(conds.tolist()):
        ic = np.flatnonzero(conds == cnd)
        su = timehistory._setup(cast(EndCondition, cnd), L[ic], EI[ic], mu[ic], a[ic],
                                M[ic], f_c[ic], f_s[ic], n_modes, cutoff, sections,
                                v0=v0[ic], F_yield=F_y[ic])
        F_max = np.sqrt(2.0 * energy[ic] / su["f_k"])
        F_max = np.where(holds[ic], np.minimum(F_max, F_y[ic]), F_max)
        t_w = window(su["T1"], M[ic], su["m_e"], mu[ic] * L[ic], f_s[ic], f_c[ic],
                     v0[ic], np.where(crush[ic], F_y[ic], np.inf), W[ic])
        I = W[ic] * t_w + M[ic] * v0[ic] + np.sqrt(
            (M[ic] * v0[ic]) ** 2 + 2.0 * M[ic] * W[ic] * u_max[ic])
        om = su["omega"]
        with np.errstate(divide="ignore", invalid="ignore"):
            Q = I[:, None] / om
            if one_hump:
                Q = np.minimum(Q, ONE_HUMP_DLF * F_max[:, None] / om**2)
        Q = np.where(su["kept"], np.abs(su["pt"]) * Q, 0.0)  # (P, N)
        for key, Wk, Rk in (("deflection", "Wd", "Rd"), ("moment", "Wm", "Rm"),
                            ("shear", "Wv", "Rv")):
            X = np.einsum("pns,pn->ps", np.abs(su[Wk]), Q) + np.abs(su[Rk]) * F_max[:, None]
            out[key][ic] = X.max(axis=1)
        out["force"][ic] = F_max
        out["F_max"][ic] = F_max
        out["impulse"][ic] = I
    return out


# --------------------------------------------------------------------------- tabulated
GRID = 512
"""Intervals of the struck position ξ = a/L in the tables of :func:`tabulated_bounds`
(:func:`grid_xi`)."""
TABLE_SECTIONS = 64
"""Equal intervals of the member at whose ends (and both sides of the load) the tables
take their largest value: the refined history's (``scripts/convergence_point_history.
py``), four times the verdict's 16."""
K_STEPS: tuple[int, ...] = (0, 1, 2, 3, 4, 5, 6, 7, 8, 10, 12, 14, 16, 20, 24, 28, 32, 36, 40)
"""Numbers of kept modes at which the peak-force table ``P`` is stored; a case with K
kept modes reads the next stored number at or above K (``P`` grows with K: it is a
sum of terms ≥ 0), so the table stays on the safe side."""
_TABLES: dict[tuple[str, int], dict[str, np.ndarray]] = {}


def _tables(cond: str, n_modes: int) -> dict[str, np.ndarray]:
    """Dimensionless tables of one end condition on the ξ grid (GRID + 1 values),
    per quantity q (deflection, moment, shear) and m = 0…n_modes modes (a member of
    unit L, EI and μ: ωₙ = λₙ², Blevins 1979 Table 8-1, :func:`droprig.solver.
    timehistory.mode_shapes`; sections as :data:`TABLE_SECTIONS`):
    ``A`` maxₓ Σ_{n≤m} |Wₙ(x)·φ̃ₙ(a)|/ωₙ (impulsive modes); ``P`` maxₓ
    Σ_{m<n≤K} |Wₙ(x)·φ̃ₙ(a)|/ωₙ² (the kept modes above m, driven by the peak force;
    K of :data:`K_STEPS`); ``R`` maxₓ |unit field − Σ_{n≤m} Wₙ(x)·φ̃ₙ(a)/ωₙ²| (the static
    correction with m modes kept); ``D`` Σ_{n≤m} φ̃ₙ(a)²/ωₙ² over G(a, a) (the kept
    modes' share of the flexibility at the point) and ``g`` G(a, a); ξ on the grid of
    :func:`grid_xi`. Scaled to a member by
    :func:`tabulated_bounds`."""
    key = (cond, n_modes)
    if key in _TABLES:
        return _TABLES[key]
    xi_all = np.clip(grid_xi(np.arange(GRID + 1)), 1e-6, 1.0 - 1e-6)
    parts: list[dict[str, np.ndarray]] = []
    for lo in range(0, xi_all.size, 128):  # in chunks: (points, modes, sections) arrays
        parts.append(_table_rows(cond, xi_all[lo:lo + 128], n_modes))
    out = {k: np.concatenate([pt[k] for pt in parts]) for k in parts[0]}
    out["lam2"] = parts[0]["lam2"][0]
    _TABLES[key] = out
    return out


def _table_rows(cond: str, xi: np.ndarray, n_modes: int) -> dict[str, np.ndarray]:
    """The rows of :func:`_tables` at the struck positions ``xi``."""
    P = xi.size
    one = np.ones(P)
    cc = cast(EndCondition, cond)
    g = np.asarray(beam.green(cc, one, one, xi, xi))
    su = timehistory._setup(cc, one, one, one, xi, one, one, g, n_modes, np.inf,
                            TABLE_SECTIONS)
    om, pt = su["omega"], su["pt"]  # every mode kept (cut-off ∞)
    out: dict[str, np.ndarray] = {"g": g, "lam2": om}
    zero = np.zeros((P, 1))
    for q, Wk, Rk in (("deflection", "Wd", "Rd"), ("moment", "Wm", "Rm"),
                      ("shear", "Wv", "Rv")):
        Wp = su[Wk] * pt[:, :, None]  # (P, N, S)
        b_ = Wp / om[:, :, None] ** 2
        unit = su[Rk] + b_.sum(axis=1)  # the exact unit-load field at the sections
        cum_a = np.cumsum(np.abs(Wp) / om[:, :, None], axis=1)
        cum_b = np.cumsum(np.abs(b_), axis=1)
        cum_g = np.cumsum(b_, axis=1)
        out["A_" + q] = np.concatenate([zero, cum_a.max(axis=2)], axis=1)  # m = 0…N
        cb = np.concatenate([np.zeros((P, 1, cum_b.shape[2])), cum_b], axis=1)
        ks = [min(k, cb.shape[1] - 1) for k in K_STEPS]
        # Σ_{m<n≤K} per (m, K of K_STEPS): cb[K] − cb[m] where m < K, else 0
        out["P_" + q] = np.stack([np.maximum(cb[:, k:k + 1, :] - cb, 0.0).max(axis=2)
                                  for k in ks], axis=2)  # (P, m, K step)
        out["R_" + q] = np.concatenate([np.abs(unit).max(axis=1)[:, None],
                                        np.abs(unit[:, None, :] - cum_g).max(axis=2)],
                                       axis=1)
    # the kept modes' share of the point's flexibility (a share: smooth where G(a, a)
    # itself goes to 0 at a support)
    out["D"] = np.concatenate([zero, np.cumsum(pt**2 / om**2, axis=1)], axis=1) / g[:, None]
    # the largest unit-load deflection along the member, G(x, a) sampled at 200 equal
    # intervals and at a (the point history's energy-method deflection per N, L³/EI)
    x = np.linspace(0.0, 1.0, 201)
    out["dmax"] = np.maximum(np.max(beam.green(cc, one[:, None], one[:, None], x[None, :],
                                               xi[:, None]), axis=1), g)
    return out


def unit_deflection(cond: str, L: ArrayLike, EI: ArrayLike, a: ArrayLike,
                    n_modes: int = timehistory.DEFAULT_MODES) -> np.ndarray:
    """A lower bound of the largest deflection along a member (end condition ``cond``,
    span L m, EI N·m²) under a unit force at ``a`` (m), m/N: L³/EI × the lesser of the
    tables' values (200 equal intervals and a, :func:`_tables`) at the two grid points
    about a/L (the largest deflection grows monotonically from a support to its peak,
    so the lesser of two neighbours is no larger than the value between them). A
    factor on the energy method's deflection read with it is no smaller than with the
    exact value (the safe side)."""
    L, EI, a = np.broadcast_arrays(*(np.asarray(v, float) for v in (L, EI, a)))
    tb = _tables(cond, n_modes)
    u = grid_index(np.clip(a / L, 0.0, 1.0))
    i0 = np.clip(np.floor(u).astype(int), 0, GRID - 1)
    d = np.minimum(tb["dmax"][i0], tb["dmax"][i0 + 1])
    return L**3 / EI * d


def grid_xi(u: ArrayLike) -> np.ndarray:
    """ξ of grid index u (0…GRID, may be fractional): ξ = (1 − cos(π·u/GRID))/2, dense
    near the supports, where the tables change fastest with ξ (a mode's amplitude at a
    fixed end grows as ξ²)."""
    return 0.5 * (1.0 - np.cos(math.pi * np.asarray(u, float) / GRID))


def grid_index(xi: ArrayLike) -> np.ndarray:
    """The fractional grid index of ξ (the inverse of :func:`grid_xi`)."""
    return np.arccos(np.clip(1.0 - 2.0 * np.asarray(xi, float), -1.0, 1.0)) / math.pi * GRID


_SCALES = {  # (impulse term, force term) per unit of the tables (module docstring)
    "deflection": (lambda L, EI, mu, c: L / (mu * c), lambda L, EI, mu, c: L**3 / EI),
    "moment": (lambda L, EI, mu, c: c / L, lambda L, EI, mu, c: L),
    "shear": (lambda L, EI, mu, c: c / L**2, lambda L, EI, mu, c: np.ones_like(L)),
}


def tabulated_bounds(cond: EndCondition | ArrayLike, L: ArrayLike, EI: ArrayLike,
                     mu: ArrayLike, a: ArrayLike, M: ArrayLike, h: ArrayLike,
                     f_c: ArrayLike, *, F_yield: ArrayLike = math.inf,
                     stroke: ArrayLike = math.inf, weight: ArrayLike | None = None,
                     n_modes: int = timehistory.DEFAULT_MODES,
                     cutoff: float = timehistory.DEFAULT_CUTOFF,
                     beta: ArrayLike | None = None) -> dict[str, np.ndarray]:
    """:func:`impulse_peak_bounds` from the dimensionless tables of :func:`_tables`
    (the fast form the chain uses; same arguments, same keys): each term's largest
    value along the member taken on its own (maxₓ(a + b) ≤ maxₓ a + maxₓ b), the
    peak-force part over the kept modes above the impulsive ones up to the next
    number of :data:`K_STEPS` (modes beyond the kept ones so counted twice: once so,
    once in the static correction), and at the struck position the larger of the two bracketing grid
    values (the smaller for the point's flexibility kept, so the residual
    flexibility and the contact-force bound are on the safe side). Scaling of a
    member of span L, EI and μ (c = √(EI/μ), m²/s): ωₙ = λₙ²·c/L²; per unit of the
    tables the impulsive term of the deflection L/(μ·c), moment c/L, shear c/L²,
    the peak-force term L³/EI, L, 1 (Euler–Bernoulli modes mass-normalised by μ·L,
    from the mode shapes in ξ = x/L). ``beta``: the member's Rayleigh mass factor at
    the point where known (:func:`droprig.solver.beam.rayleigh_mass_factor`)."""
    (L, EI, mu, a, M, h, f_c, F_y, s_y), f_s, W = timehistory.checked_case(
        cond, (L, EI, mu, a, M, h, f_c, F_yield, stroke), False, weight)
    P = L.size
    conds = np.broadcast_to(np.asarray(cond, dtype=object), L.shape)
    v0 = np.sqrt(2.0 * impact.G * h)
    f = f_s + f_c
    energy, holds, crush, u_max = _energy_budget(W, M, v0, f, F_y, s_y)
    out = {k: np.zeros(P) for k in ("force", "moment", "shear", "deflection",
                                    "impulse", "F_max")}
    c = np.sqrt(EI / mu)
    for cnd in dict.fromkeys(conds.tolist()):
        ic = np.flatnonzero(conds == cnd)
        cc = cast(EndCondition, cnd)
        tb = _tables(str(cnd), n_modes)
        Li, EIi, mui, ci = L[ic], EI[ic], mu[ic], c[ic]
        u = grid_index(np.clip(a[ic] / Li, 0.0, 1.0))
        i0 = np.clip(np.floor(u).astype(int), 0, GRID - 1)
        i1 = i0 + 1
        om_unit = ci / Li**2  # ωₙ = λₙ²·c/L²
        bt = (beam.rayleigh_mass_factor(cc, Li, a[ic]) if beta is None
              else np.broadcast_to(np.asarray(beta, float), L.shape)[ic])
        m_e = bt * mui * Li
        with np.errstate(divide="ignore"):
            inv_m = 1.0 / M[ic] + np.where(m_e > 0.0, 1.0 / np.where(m_e > 0.0, m_e, 1.0),
                                           0.0)
            w_c = np.where(f_c[ic] > 0.0, np.sqrt(inv_m / np.where(f_c[ic] > 0.0, f_c[ic],
                                                                    1.0)), np.inf)
        # kept modes: ωₙ ≤ cut-off × ω_c, or × the contact force's rise to its crushing
        # force where faster (timehistory._setup, rise_frequency), a prefix of the modes
        w_c = timehistory.rise_frequency(w_c, f_c[ic], v0[ic], F_y[ic])
        K = np.searchsorted(tb["lam2"], cutoff * w_c / om_unit, side="right")
        K = np.minimum(K, n_modes)
        D = np.maximum(tb["D"][i0, K], tb["D"][i1, K])
        f_res = np.maximum(f_s[ic] * (1.0 - D), 0.0)
        F_max = np.sqrt(2.0 * energy[ic] / (f_c[ic] + f_res))
        F_max = np.where(holds[ic], np.minimum(F_max, F_y[ic]), F_max)
        T1 = 2.0 * math.pi / (tb["lam2"][0] * om_unit)
        t_w = window(T1, M[ic], m_e, mui * Li, f_s[ic], f_c[ic], v0[ic],
                     np.where(crush[ic], F_y[ic], np.inf), W[ic])
        I = W[ic] * t_w + M[ic] * v0[ic] + np.sqrt(
            (M[ic] * v0[ic]) ** 2 + 2.0 * M[ic] * W[ic] * u_max[ic])
        # impulsive modes: ωₙ < 2·F_max/I (there I/ωₙ < 2·F_max/ωₙ²)
        m = np.minimum(np.searchsorted(tb["lam2"], ONE_HUMP_DLF * F_max / I / om_unit,
                                       side="left"), K)
        kq = np.searchsorted(K_STEPS, K, side="left")  # the next stored K at or above
        for q, (sa, sb) in _SCALES.items():
            A = np.maximum(tb["A_" + q][i0, m], tb["A_" + q][i1, m])
            Pm = np.maximum(tb["P_" + q][i0, m, kq], tb["P_" + q][i1, m, kq])
            R = np.maximum(tb["R_" + q][i0, K], tb["R_" + q][i1, K])
            force_part = np.where(m < K, ONE_HUMP_DLF * Pm, 0.0) + R
            out[q][ic] = I * sa(Li, EIi, mui, ci) * A + F_max * sb(Li, EIi, mui, ci) * force_part
        out["force"][ic] = F_max
        out["F_max"][ic] = F_max
        out["impulse"][ic] = I
    return out
