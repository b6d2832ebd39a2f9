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

import functools
from dataclasses import dataclass
from pathlib import Path

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import G

__all__ = [
    "LOAD_MASS_FACTORS",
    "EnvelopeLookup",
    "TwoMassPeaks",
    "build_envelope",
    "distributed_mass_per_length",
    "energy_bounds",
    "envelope_two_forces",
    "slab_mass_per_area",
    "two_mass_impact",
    "two_mass_peaks",
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


@dataclass(frozen=True, eq=False)
class TwoMassPeaks:
    """Peaks of the two-mass impact (:func:`two_mass_peaks`), per point: contact force
    ``F_contact`` = max k_c·⟨x1 − x2⟩ (N), force on the framing ``F_frame`` = k2·max x2
    (N), peak framing displacement ``x2`` (m) and the number of contacts followed
    ``contacts``."""

    F_contact: np.ndarray
    F_frame: np.ndarray
    x2: np.ndarray
    contacts: np.ndarray


FAST_SAMPLES = 16
"""Samples of a contact over 1½ periods of the fast mode (then refined by Newton's
method on the sampled peak)."""
SLOW_SAMPLES = 16
"""Samples of a contact over one period of the slow mode (the fast mode's ripple there
is added as its amplitude: an upper bound)."""
EPISODES = 8
"""Contacts followed at most (each later one only for the points whose load catches
the struck structure again within two periods of the slow mode)."""


def _modes(M: np.ndarray, kc: np.ndarray, m2: np.ndarray, k2: np.ndarray
           ) -> tuple[np.ndarray, ...]:
    """ω_lo, ω_hi (rad/s) and the mode shapes p = X2/X1 = (k_c − ω²M)/k_c of the
    two-mass system in contact (Clough & Penzien, 2-DOF free vibration)."""
    b = kc * m2 + (kc + k2) * M
    disc = np.sqrt(np.maximum(b * b - 4.0 * M * m2 * kc * k2, 0.0))
    w2_lo = 2.0 * kc * k2 / (b + disc)  # stable form of the small root
    w2_hi = (b + disc) / (2.0 * M * m2)
    return (np.sqrt(w2_lo), np.sqrt(w2_hi), 1.0 - w2_lo * M / kc, 1.0 - w2_hi * M / kc,
            w2_lo, w2_hi)


def _refine_max(c: np.ndarray, A: tuple[np.ndarray, ...], w: tuple[np.ndarray, ...],
                t: np.ndarray, lo: np.ndarray, hi: np.ndarray) -> np.ndarray:
    """Two Newton steps on y'(t) = 0 for y(t) = c + Σ A_c·cos(ωt) + A_s·sin(ωt) from
    ``t`` (kept within [lo, hi]); returns y at the refined time (the caller keeps the
    larger of this and the sampled peak)."""
    for _ in range(2):
        d1 = np.zeros_like(t)
        d2 = np.zeros_like(t)
        for (ac, as_), wk in zip(zip(A[0::2], A[1::2], strict=True), w, strict=True):
            cw, sw = np.cos(wk * t), np.sin(wk * t)
            d1 += wk * (as_ * cw - ac * sw)
            d2 -= wk * wk * (ac * cw + as_ * sw)
        with np.errstate(divide="ignore", invalid="ignore"):
            step = np.where(d2 < 0.0, d1 / d2, 0.0)
        t = np.clip(t - np.where(np.isfinite(step), step, 0.0), lo, hi)
    y = c.copy()
    for (ac, as_), wk in zip(zip(A[0::2], A[1::2], strict=True), w, strict=True):
        y += ac * np.cos(wk * t) + as_ * np.sin(wk * t)
    return y


def _rotate(c: np.ndarray, s: np.ndarray, cd: np.ndarray, sd: np.ndarray
            ) -> tuple[np.ndarray, np.ndarray]:
    """cos and sin of (θ + δ) from those of θ and δ (angle addition)."""
    return c * cd - s * sd, s * cd + c * sd


def _episode(M, kc, m2, k2, W, modes, state):
    """One contact from ``state`` = (y1, v1, y2, v2) (displacements from the static
    position in contact, m; velocities, m/s; (n,) each): peaks of the contact force
    and of x2 − x_st2 while in contact, whether and when the load leaves the
    structure (``sep``, ``t_sep``, s), and the state then. The samples step through
    time by angle addition (one cos/sin per mode and window, not one per sample):
    a fast window (:func:`_fast_window`), a slow one (:func:`_slow_window`), then the
    separation (:func:`_separation`)."""
    w_lo, w_hi, p_lo, p_hi, w2_lo, w2_hi = modes
    y1, v1, y2, v2 = state
    det = p_hi - p_lo
    q = ((p_hi * y1 - y2) / det, (y2 - p_lo * y1) / det,
         (p_hi * v1 - v2) / det / w_lo, (v2 - p_lo * v1) / det / w_hi)
    qa_lo, qa_hi, qb_lo, qb_hi = q
    # F = W + M·ω_lo²·q_lo + M·ω_hi²·q_hi (k_c·(1 − p) = M·ω²);
    # k2·x2 = W + k2·(p_lo·q_lo + p_hi·q_hi): coefficients of cos and sin per mode
    co = _Coeffs(W=W, w_lo=w_lo, w_hi=w_hi,
                 FA_lo=M * w2_lo * qa_lo, FB_lo=M * w2_lo * qb_lo,
                 FA_hi=M * w2_hi * qa_hi, FB_hi=M * w2_hi * qb_hi,
                 XA_lo=p_lo * qa_lo, XB_lo=p_lo * qb_lo,
                 XA_hi=p_hi * qa_hi, XB_hi=p_hi * qb_hi)
    tr = _fast_window(co, M.shape[0])
    _slow_window(co, tr)
    ts = _separation(co, tr)
    # the state at separation
    cl, sl = np.cos(w_lo * ts), np.sin(w_lo * ts)
    ch, sh = np.cos(w_hi * ts), np.sin(w_hi * ts)
    ql = qa_lo * cl + qb_lo * sl
    qh = qa_hi * ch + qb_hi * sh
    qld = w_lo * (qb_lo * cl - qa_lo * sl)
    qhd = w_hi * (qb_hi * ch - qa_hi * sh)
    out = (ql + qh, qld + qhd, p_lo * ql + p_hi * qh, p_lo * qld + p_hi * qhd)
    return tr.F_pk, tr.X_pk, np.isfinite(tr.t_b), ts, out


@dataclass(frozen=True, eq=False)
class _Coeffs:
    """One contact in closed form (arrays over points): F(t) = W + Σ FA·cos ωt +
    FB·sin ωt (N) and x2 − x_st2 = Σ XA·cos ωt + XB·sin ωt (m) over the slow (lo) and
    fast (hi) modes ω (rad/s)."""

    W: np.ndarray
    w_lo: np.ndarray
    w_hi: np.ndarray
    FA_lo: np.ndarray
    FB_lo: np.ndarray
    FA_hi: np.ndarray
    FB_hi: np.ndarray
    XA_lo: np.ndarray
    XB_lo: np.ndarray
    XA_hi: np.ndarray
    XB_hi: np.ndarray


class _Track:
    """What the windows follow of one contact (mutable, per point): peaks ``F_pk``
    (N), ``X_pk`` (m) and their times; ``alive`` (still in contact); the last sample
    in contact (``t_a``, ``F_a``) and the first apart (``t_b`` inf none, ``F_b``); the
    fast window's end ``t_fast`` (s)."""

    def __init__(self, F0: np.ndarray, X0: np.ndarray, n: int) -> None:
        self.F_pk, self.X_pk = F0.copy(), X0.copy()
        self.tF, self.tX = np.zeros(n), np.zeros(n)
        self.alive = np.ones(n, dtype=bool)
        self.t_a, self.F_a = np.zeros(n), F0.copy()
        self.t_b, self.F_b = np.full(n, np.inf), np.full(n, -1.0)
        self.t_fast = np.zeros(n)


def _fast_window(co: _Coeffs, n: int) -> _Track:
    """1½ periods of the fast mode, sampled (:data:`FAST_SAMPLES`) and the peaks
    refined (:func:`_refine_max`)."""
    W, w_lo, w_hi = co.W, co.w_lo, co.w_hi
    FA_lo, FB_lo, FA_hi, FB_hi = co.FA_lo, co.FB_lo, co.FA_hi, co.FB_hi
    XA_lo, XB_lo, XA_hi, XB_hi = co.XA_lo, co.XB_lo, co.XA_hi, co.XB_hi
    tr = _Track(W + FA_lo + FA_hi, XA_lo + XA_hi, n)
    dt = 3.0 * np.pi / w_hi / FAST_SAMPLES
    cdl, sdl = np.cos(w_lo * dt), np.sin(w_lo * dt)
    cdh, sdh = np.cos(w_hi * dt), np.sin(w_hi * dt)
    cl, sl, ch, sh = np.ones(n), np.zeros(n), np.ones(n), np.zeros(n)
    for k in range(1, FAST_SAMPLES + 1):
        cl, sl = _rotate(cl, sl, cdl, sdl)
        ch, sh = _rotate(ch, sh, cdh, sdh)
        t = k * dt
        F = W + FA_lo * cl + FB_lo * sl + FA_hi * ch + FB_hi * sh
        X = XA_lo * cl + XB_lo * sl + XA_hi * ch + XB_hi * sh
        leave = tr.alive & (F < 0.0)
        if leave.any():
            tr.t_b = np.where(leave, t, tr.t_b)
            tr.F_b = np.where(leave, F, tr.F_b)
            tr.alive &= ~leave
        up = tr.alive & (F > tr.F_pk)
        tr.F_pk = np.where(up, F, tr.F_pk)
        tr.tF = np.where(up, t, tr.tF)
        up = tr.alive & (X > tr.X_pk)
        tr.X_pk = np.where(up, X, tr.X_pk)
        tr.tX = np.where(up, t, tr.tX)
        tr.t_a = np.where(tr.alive, t, tr.t_a)
        tr.F_a = np.where(tr.alive, F, tr.F_a)
    t_fast = FAST_SAMPLES * dt
    tr.t_fast = t_fast
    ws = (w_lo, w_hi)
    hi_t = np.minimum(t_fast, tr.t_b)
    Fr = _refine_max(W, (FA_lo, FB_lo, FA_hi, FB_hi), ws, tr.tF, np.zeros(n), hi_t)
    Xr = _refine_max(np.zeros(n), (XA_lo, XB_lo, XA_hi, XB_hi), ws, tr.tX, np.zeros(n),
                     hi_t)
    tr.F_pk = np.maximum(tr.F_pk, Fr)
    tr.X_pk = np.maximum(tr.X_pk, Xr)
    return tr


def _slow_window(co: _Coeffs, tr: _Track) -> None:
    """One period of the slow mode after the fast window (points still in contact),
    the slow part sampled (:data:`SLOW_SAMPLES`) and refined, the fast mode's ripple
    added at its amplitude (upper bound); folds into ``tr``."""
    if not tr.alive.any():
        return
    W, w_lo, w_hi = co.W, co.w_lo, co.w_hi
    FA_lo, FB_lo, FA_hi, FB_hi = co.FA_lo, co.FB_lo, co.FA_hi, co.FB_hi
    XA_lo, XB_lo = co.XA_lo, co.XB_lo
    n = tr.alive.size
    t_fast = tr.t_fast
    R_F = np.hypot(FA_hi, FB_hi)
    R_X = np.hypot(co.XA_hi, co.XB_hi)
    dts = np.maximum(2.0 * np.pi / w_lo / SLOW_SAMPLES, 1e-300)
    cdl, sdl = np.cos(w_lo * dts), np.sin(w_lo * dts)
    cdh, sdh = np.cos(w_hi * dts), np.sin(w_hi * dts)
    cl, sl = np.cos(w_lo * t_fast), np.sin(w_lo * t_fast)
    ch, sh = np.cos(w_hi * t_fast), np.sin(w_hi * t_fast)
    sF_pk, sX_pk = np.full(n, -np.inf), np.full(n, -np.inf)
    tsF, tsX = t_fast.copy(), t_fast.copy()
    for k in range(1, SLOW_SAMPLES + 1):
        cl, sl = _rotate(cl, sl, cdl, sdl)
        ch, sh = _rotate(ch, sh, cdh, sdh)
        t = t_fast + k * dts
        F_slow = W + FA_lo * cl + FB_lo * sl
        F = F_slow + FA_hi * ch + FB_hi * sh
        leave = tr.alive & (F < 0.0)
        if leave.any():
            tr.t_b = np.where(leave, t, tr.t_b)
            tr.F_b = np.where(leave, F, tr.F_b)
            tr.alive &= ~leave
        Fb_ = F_slow + R_F
        Xb_ = XA_lo * cl + XB_lo * sl + R_X
        up = tr.alive & (Fb_ > sF_pk)
        sF_pk = np.where(up, Fb_, sF_pk)
        tsF = np.where(up, t, tsF)
        up = tr.alive & (Xb_ > sX_pk)
        sX_pk = np.where(up, Xb_, sX_pk)
        tsX = np.where(up, t, tsX)
        tr.t_a = np.where(tr.alive, t, tr.t_a)
        tr.F_a = np.where(tr.alive, F, tr.F_a)
    hi_s = np.minimum(t_fast + SLOW_SAMPLES * dts, tr.t_b)
    Fs_r = _refine_max(W + R_F, (FA_lo, FB_lo), (w_lo,), tsF, t_fast, hi_s)
    Xs_r = _refine_max(R_X, (XA_lo, XB_lo), (w_lo,), tsX, t_fast, hi_s)
    got = np.isfinite(sF_pk)
    tr.F_pk = np.where(got, np.maximum(tr.F_pk, np.maximum(sF_pk, Fs_r)), tr.F_pk)
    tr.X_pk = np.where(got, np.maximum(tr.X_pk, np.maximum(sX_pk, Xs_r)), tr.X_pk)


def _separation(co: _Coeffs, tr: _Track) -> np.ndarray:
    """The separation time (s; 0 where the load stays): secant steps on F(t) = 0
    within [t_a, t_b]."""
    W, w_lo, w_hi = co.W, co.w_lo, co.w_hi
    sep = np.isfinite(tr.t_b)
    ta, Fa = tr.t_a, tr.F_a
    tb, Fb = np.where(sep, tr.t_b, 0.0), tr.F_b
    for _ in range(3):
        with np.errstate(divide="ignore", invalid="ignore"):
            tm = np.where(Fa > Fb, ta + (tb - ta) * Fa / (Fa - Fb), tb)
        tm = np.clip(np.where(np.isfinite(tm), tm, tb), np.minimum(ta, tb), tb)
        Fm = (W + co.FA_lo * np.cos(w_lo * tm) + co.FB_lo * np.sin(w_lo * tm)
              + co.FA_hi * np.cos(w_hi * tm) + co.FB_hi * np.sin(w_hi * tm))
        pos = Fm >= 0.0
        ta, Fa = np.where(pos, tm, ta), np.where(pos, Fm, Fa)
        tb, Fb = np.where(pos, tb, tm), np.where(pos, Fb, Fm)
    return np.where(sep, 0.5 * (ta + tb), 0.0)


CATCH_STEPS = 400
"""Steps at most of :func:`_catch_up`'s safe advance (a point not caught by then is
taken as not caught within the horizon)."""


def _catch_up(x1: np.ndarray, v1: np.ndarray, x2: np.ndarray, v2: np.ndarray,
              wf: np.ndarray, left: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """First time τ in (0, left] (s) at which the falling load x1 + v1·τ + g·τ²/2
    reaches the freely vibrating structure x2·cos(ωτ) + (v2/ω)·sin(ωτ) (m, m/s,
    rad/s), starting from the separation (gap ≈ 0, opening). Returns (found, τ).

    Safe advance: the gap g(τ) = x2(τ) − x1(τ) has |g''| ≤ K = g + ω²·A (the load's
    fall and the structure's largest acceleration, A = √(x2² + (v2/ω)²)), so
    g(τ + Δ) ≥ g + g'·Δ − K·Δ²/2 and the step Δ = (g' + √(g'² + 2K·g))/K cannot pass
    the first contact; near it the step is Newton's. A contact missed between
    samples would let the load fall through the structure and gain energy it does
    not have (the peaks then stay within :func:`energy_bounds`)."""
    n = x1.shape[0]
    A = np.sqrt(x2 * x2 + (v2 / wf) ** 2)
    b2 = v2 / wf
    K = G + wf * wf * A
    t = np.zeros(n)
    found = np.zeros(n, dtype=bool)
    live = np.arange(n)
    tol = 1e-12 * (np.abs(x1) + A + 1e-12)
    first = True
    for _ in range(CATCH_STEPS):
        if not live.size:
            break
        tl, w = t[live], wf[live]
        cw, sw = np.cos(w * tl), np.sin(w * tl)
        g = x2[live] * cw + b2[live] * sw - (x1[live] + v1[live] * tl + 0.5 * G * tl * tl)
        gd = w * (b2[live] * cw - x2[live] * sw) - (v1[live] + G * tl)
        Kl = K[live]
        gp = np.maximum(g, 0.0)
        step = (gd + np.sqrt(gd * gd + 2.0 * Kl * gp)) / Kl
        # caught: the gap closed (after the start), or closing with no room to step
        if first:  # at the separation: caught only if not opening
            hit = (g <= tol[live]) & (gd <= 0.0)
        else:
            hit = (g <= tol[live]) | (step <= 1e-12 * (1.0 + tl))
        first = False
        found[live[hit]] = True
        tn = tl + np.maximum(step, 0.0)
        out = tn > left[live]
        t[live] = np.where(hit, tl, tn)
        live = live[~hit & ~out]
    found &= t <= left
    return found, t


def energy_bounds(W: ArrayLike, h: ArrayLike, f_contact: ArrayLike,
                  f_frame: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    """Upper bounds (N) of the contact force and of the force on the framing of the
    two-mass impact (:func:`two_mass_peaks`) from the conservation of energy: with
    x from the position at first contact, ½M·v1² + ½m2·v2² + ½k_c·⟨x1 − x2⟩² +
    ½k2·x2² − W·x1 = W·h, and W·x2 − ½k2·x2² ≤ W²/(2k2) (its largest value), so
    ½k_c·δ² − W·δ ≤ W·h + W²·f_frame/2 for the contact's compression δ:
    F_c ≤ W·(1 + √(1 + 2h/(W·f_c) + f_frame/f_c)), and likewise
    F_f ≤ W·(1 + √(1 + 2h/(W·f_frame) + f_c/f_frame)) (Gere 7th ed. §9.10's balance
    on either spring alone, η = 1; Clough & Penzien, energy of a 2-DOF system).
    W in N, h (energy height) in m, compliances in m/N; non-decreasing in h."""
    W, h, fc, ff = np.broadcast_arrays(*(np.asarray(v, float)
                                         for v in (W, h, f_contact, f_frame)))
    hp = np.maximum(h, 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        Bc = W * (1.0 + np.sqrt(1.0 + 2.0 * hp / (W * fc) + ff / fc))
        Bf = W * (1.0 + np.sqrt(1.0 + 2.0 * hp / (W * ff) + fc / ff))
    return (np.where(np.isnan(Bc), np.inf, Bc), np.where(np.isnan(Bf), np.inf, Bf))


def two_mass_peaks(M: ArrayLike, v0: ArrayLike, k_c: ArrayLike, m2: ArrayLike,
                   k2: ArrayLike, episodes: int = EPISODES) -> TwoMassPeaks:
    """Peak contact force, force on the framing and framing displacement when a load
    of mass M (kg) strikes at v0 (m/s) through a contact spring k_c (N/m) a structure
    of equivalent mass m2 (kg) and stiffness k2 (N/m); vectorised, SI units.

    Two-mass idealisation (CEB Bulletin 187, 1988, two-mass model — from memory;
    Biggs, *Introduction to Structural Dynamics*, 1964, ch. 5 for the equivalent mass
    m2 = K_M·m): M·x1'' = M·g − k_c·⟨x1 − x2⟩, m2·x2'' = k_c·⟨x1 − x2⟩ − k2·x2 (x
    downward, the contact spring only pushes), x(0) = 0, x1'(0) = v0, x2'(0) = 0.
    In contact, the closed-form modal solution about the static position
    (M·g/k2)·[1 + k2/k_c, 1] with ω² from M·m2·ω⁴ − (k_c·m2 + (k_c + k2)·M)·ω² +
    k_c·k2 = 0 (Clough & Penzien, *Dynamics of Structures*, 2-DOF free vibration);
    the contact force is F = M·g + M·ω_lo²·q_lo + M·ω_hi²·q_hi in the modal
    coordinates q. Each contact is sampled (:data:`FAST_SAMPLES` over 1½ periods of
    the fast mode, refined by Newton's method; :data:`SLOW_SAMPLES` over one period
    of the slow mode, where the fast mode's ripple is added at its amplitude, an
    upper bound), the separation found by the secant method. Apart, the structure
    vibrates freely (its peak √(x2² + (v2/ω)²), ω = √(k2/m2), exact) and the load
    falls; where it catches the structure again within two periods of the slow mode
    the next contact is followed (up to ``episodes``). m2 → 0 is the series-spring
    one-mass limit (Gere 7th ed. §9.10, η = 1).
    """
    arrs = np.broadcast_arrays(*(np.asarray(v, float) for v in (M, v0, k_c, m2, k2)))
    shape = arrs[0].shape
    Mv, v0v, kc, m2v, k2v = (np.ascontiguousarray(a.ravel()) for a in arrs)
    n = Mv.size
    m2v = np.maximum(m2v, 1e-9 * Mv)  # a massless structure: the series-spring limit
    W = Mv * G
    x_st2 = W / k2v
    x_st1 = x_st2 + W / kc
    F_pk = np.zeros(n)
    X_pk = np.zeros(n)
    contacts = np.zeros(n, dtype=np.int64)
    idx = np.arange(n)
    state = (-x_st1, v0v.copy(), -x_st2, np.zeros(n))
    clock = np.zeros(n)
    w_free = np.sqrt(k2v / m2v)
    modes_all = _modes(Mv, kc, m2v, k2v)
    horizon = 4.0 * np.pi / modes_all[0]
    for _ in range(max(int(episodes), 1)):
        sub = (Mv[idx], kc[idx], m2v[idx], k2v[idx], W[idx])
        modes = tuple(m[idx] for m in modes_all)
        Fp, Xp, sep, ts, st = _episode(*sub, modes, state)
        F_pk[idx] = np.maximum(F_pk[idx], Fp)
        X_pk[idx] = np.maximum(X_pk[idx], Xp + x_st2[idx])
        contacts[idx] += 1
        # apart: the structure's free vibration about its own rest position
        x1 = st[0] + x_st1[idx]
        v1 = st[1]
        x2 = st[2] + x_st2[idx]
        v2 = st[3]
        wf = w_free[idx]
        amp = np.sqrt(x2**2 + (v2 / wf) ** 2)
        X_pk[idx] = np.where(sep, np.maximum(X_pk[idx], amp), X_pk[idx])
        clock_i = clock[idx] + ts
        left = horizon[idx] - clock_i
        go = sep & (left > 0.0)
        if not go.any():
            break
        # the load catches the structure again (the gap x1 − x2 reaches 0)
        j = np.flatnonzero(go)
        got, tj = _catch_up(x1[j], v1[j], x2[j], v2[j], wf[j], left[j])
        j, tj = j[got], tj[got]
        if not j.size:
            break
        wfj = wf[j]
        nx1 = x1[j] + v1[j] * tj + 0.5 * G * tj**2
        nv1 = v1[j] + G * tj
        nx2 = x2[j] * np.cos(wfj * tj) + v2[j] / wfj * np.sin(wfj * tj)
        nv2 = -x2[j] * wfj * np.sin(wfj * tj) + v2[j] * np.cos(wfj * tj)
        clock[idx[j]] = clock_i[j] + tj
        idx = idx[j]
        # the next contact starts where the load meets the structure (x1 = x2)
        state = (nx2 - x_st1[idx], nv1, nx2 - x_st2[idx], nv2)
        del nx1
    F_frame = k2v * X_pk
    return TwoMassPeaks(F_contact=F_pk.reshape(shape), F_frame=F_frame.reshape(shape),
                        x2=X_pk.reshape(shape), contacts=contacts.reshape(shape))


def two_mass_impact(M: ArrayLike, v0: ArrayLike, k_c: ArrayLike, m2: ArrayLike,
                    k2: ArrayLike, n_time: int = 400,
                    episodes: int = 6) -> tuple[np.ndarray, np.ndarray]:
    """Peak contact force (N) and peak framing displacement (m) of
    :func:`two_mass_peaks` (``n_time`` is not used any more: the contacts are solved
    in closed form; kept for the scripts that pass it)."""
    del n_time
    pk = two_mass_peaks(M, v0, k_c, m2, k2, episodes=episodes)
    return pk.F_contact, pk.x2


def impact_two_forces(W: ArrayLike, h: ArrayLike, f_contact: ArrayLike,
                      f_frame: ArrayLike, m2: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    """Contact force F_c and force on the framing F_f (N) of a load of weight W (N)
    falling h (m, the energy height) onto the framing (compliance f_frame, m/N; its
    struck mass m2, kg, referred to the framing point) through the contact springs
    (f_contact, m/N: the load's underside, the deck's indentation and strip).

    Each is the larger of the two-mass model (:func:`two_mass_peaks`, CEB Bulletin
    187 — from memory) and the one-mass energy balance with the struck mass's share
    η = M/(M + m2) on the springs in series, F = W·(1 + √(1 + 2ηh/(W·f))),
    f = f_contact + f_frame (Gere 7th ed. §9.10 Eq. 9-94; Timoshenko, *Strength of
    Materials* Part I). The one-mass balance is the right model for a load heavy
    against the struck mass (the two-mass contacts then chatter many times before
    the framing peaks; measured against scipy ``solve_ivp`` in
    tests/solver/test_two_forces.py); the two-mass model for a load light against it
    (the short contact gives the framing up to four times the energy share η of a
    perfectly inelastic hit, an elastic collision). m2 = 0: both are the series
    springs' single force."""
    W, h, fc, ff, m2 = np.broadcast_arrays(*(np.asarray(v, float)
                                             for v in (W, h, f_contact, f_frame, m2)))
    M = W / G
    f = fc + ff
    eta = M / (M + m2)
    d_st = W * f
    with np.errstate(divide="ignore", invalid="ignore"):
        F1 = W * (1.0 + np.sqrt(1.0 + 2.0 * np.maximum(eta * h, 0.0)
                                / np.where(d_st > 0.0, d_st, np.inf)))
    v0 = np.sqrt(2.0 * G * np.maximum(h, 0.0))
    with np.errstate(divide="ignore"):
        pk = two_mass_peaks(M, v0, 1.0 / fc, m2, 1.0 / ff)
    return np.fmax(pk.F_contact, F1), np.fmax(pk.F_frame, F1)


def equivalent_eta(W: ArrayLike, h: ArrayLike, f: ArrayLike, F: ArrayLike,
                   eta_at_rest: ArrayLike) -> np.ndarray:
    """The share η of the energy W·h that, in the one-mass balance on compliance f
    (m/N), gives the peak force F (N): F = W·(1 + √(1 + 2ηh/(W·f))) solved for η,
    η = ((F/W − 1)² − 1)·W·f/(2h) (Gere 7th ed. §9.10 Eq. 9-94 inverted;
    dimensionless, may exceed 1 where the framing takes more than the one-mass
    share, ≥ 0). Where h ≤ 0 or the result is not finite: ``eta_at_rest``. Used to
    carry the framing force of the two-mass model into the energy balances beyond
    yield and the inverse answers (Biggs 1964 ch. 5: the elastic–plastic balance
    with the energy the elastic response puts into the framing)."""
    W, h, f, F, e0 = np.broadcast_arrays(*(np.asarray(v, float)
                                           for v in (W, h, f, F, eta_at_rest)))
    with np.errstate(divide="ignore", invalid="ignore"):
        eta = ((F / W - 1.0) ** 2 - 1.0) * W * f / (2.0 * h)
    ok = np.isfinite(eta) & (h > 0.0)
    return np.where(ok, np.maximum(eta, 0.0), e0)


# --------------------------------------------------------------------------- envelope
ENVELOPE_FILE = Path(__file__).with_name("data") / "two_mass_envelope.npz"
"""The tabulated envelope of the two-mass peaks (:func:`build_envelope`; written by
``scripts/build_two_mass_envelope.py``)."""

ENVELOPE_GRID = ((-3.0, 5.0, 0.25), (-2.0, 7.0, 0.25), (-2.0, 8.0, 0.02))
"""(start, stop, step) of log₁₀ μ = m2/M, log₁₀ κ = k_c/k2 and log₁₀ ĥ = h·k2/W (the
energy height over the framing's static deflection under the load's weight)."""


ENVELOPE_MARGIN = (1.03, 1.03)
"""Factors on the tabulated envelope (framing, contact) for the peaks between the
table's samples, where a contact starts or stops between two sampled heights or
masses (measured against the pointwise solution and scipy time histories:
tests/solver/test_two_force_envelope.py; 1.10 before the nodes covered the
samples by :func:`covering_nodes`)."""


def envelope_grid() -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The nodes of log₁₀ μ, log₁₀ κ and log₁₀ ĥ (:data:`ENVELOPE_GRID`)."""
    return tuple(np.round(np.arange(a, b + 0.5 * d, d), 10)  # type: ignore[return-value]
                 for a, b, d in ENVELOPE_GRID)


def build_envelope(lg_mu: np.ndarray, lg_kappa: np.ndarray, lg_h: np.ndarray,
                   chunk: int = 60_000) -> tuple[np.ndarray, np.ndarray]:
    """The two-mass peaks' envelope in units of the load's weight at the nodes of the
    grid (μ, κ, ĥ), shape (len each): the framing force and the contact force:
    :func:`covering_nodes` of :func:`two_mass_peaks`/W (M = 1 kg, k2 = 1 N/m,
    m2 = μ kg, k_c = κ N/m, v0 = √(2g·ĥ·W/k2)) sampled on a grid twice as fine in
    each log (:func:`fine_samples`), so that the interpolation between the nodes is
    at least every sample's running maximum over lower drops.

    The two-mass equations with gravity (:func:`two_mass_peaks`) in units of the
    load's weight W and the framing's static deflection W/k2 depend on μ, κ and ĥ
    alone (dimensional analysis; Clough & Penzien, 2-DOF free vibration), so one
    table serves every load and point. The peaks are not monotone in ĥ (a lower
    drop can give the larger peak: the load's later contacts start and stop with
    the height and meet the framing in or out of phase; Biggs 1964 ch. 5 — from
    memory) nor smooth in μ and κ: the running maximum is the monotone envelope.
    Each peak is first bounded by :func:`energy_bounds` (the slow window's ripple
    bound of :func:`two_mass_peaks` can lie above them).    can lie above them)."""
    Ff, Fc = fine_samples(lg_mu, lg_kappa, lg_h, chunk)
    return covering_nodes(Ff), covering_nodes(Fc)


def fine_samples(lg_mu: np.ndarray, lg_kappa: np.ndarray, lg_h: np.ndarray,
                 chunk: int = 60_000) -> tuple[np.ndarray, np.ndarray]:
    """The two-mass peaks (framing, contact) in units of the load's weight at the
    grid twice as fine as the nodes (:func:`build_envelope`), each within its
    energy bound (:func:`energy_bounds`; the slow window's ripple bound of
    :func:`two_mass_peaks` can lie above them), shape (2·nodes − 1) per axis."""
    def fine(g: np.ndarray) -> np.ndarray:
        out = np.empty(2 * g.size - 1)
        out[0::2] = g
        out[1::2] = 0.5 * (g[:-1] + g[1:])
        return out

    MU, KA, HH = np.meshgrid(10.0 ** fine(lg_mu), 10.0 ** fine(lg_kappa),
                             10.0 ** fine(lg_h), indexing="ij")
    mu, ka, hh = MU.ravel(), KA.ravel(), HH.ravel()
    Ff = np.empty(mu.size)
    Fc = np.empty(mu.size)
    for a in range(0, mu.size, chunk):
        b = slice(a, a + chunk)
        v0 = np.sqrt(2.0 * G * hh[b] * G)  # h = ĥ·W/k2 with W = g, k2 = 1
        pk = two_mass_peaks(1.0, v0, ka[b], mu[b], 1.0)
        # never above the energy bounds (the slow window's ripple bound can be)
        Bc, Bf = energy_bounds(G, hh[b] * G, 1.0 / ka[b], 1.0)
        Ff[b] = np.minimum(pk.F_frame, Bf) / G
        Fc[b] = np.minimum(pk.F_contact, Bc) / G

    return Ff.reshape(MU.shape), Fc.reshape(MU.shape)


def _upsample(L: np.ndarray) -> np.ndarray:
    """Trilinear interpolation of the node values ``L`` at the grid twice as fine
    (the nodes and the midpoints between them along each axis)."""
    for ax in range(3):
        n = L.shape[ax]
        shape = list(L.shape)
        shape[ax] = 2 * n - 1
        out = np.empty(shape)
        idx = [slice(None)] * 3
        idx[ax] = slice(0, None, 2)
        out[tuple(idx)] = L
        lo = np.take(L, np.arange(n - 1), axis=ax)
        hi = np.take(L, np.arange(1, n), axis=ax)
        idx[ax] = slice(1, None, 2)
        out[tuple(idx)] = 0.5 * (lo + hi)
        L = out
    return L


def _pool_nodes(R: np.ndarray) -> np.ndarray:
    """Largest value of the fine samples within one fine step of each node along
    every axis (its 3 × 3 × 3 fine neighbourhood, cut at the grid's edges): the fine
    samples whose interpolation gives that node a weight."""
    for ax in range(3):
        n = R.shape[ax]
        mid = np.take(R, np.arange(0, n, 2), axis=ax)
        lo = np.take(R, np.concatenate([[0], np.arange(1, n - 1, 2)]), axis=ax)
        hi = np.take(R, np.concatenate([np.arange(1, n - 1, 2), [n - 1]]), axis=ax)
        R = np.maximum(np.maximum(lo, mid), hi)
    return R


def covering_nodes(fine: np.ndarray) -> np.ndarray:
    """Node values (every second fine sample on each axis) whose trilinear
    interpolation in the logarithms covers every fine sample's running maximum over
    the drop height (axis 2), and that are non-decreasing in it.

    1. The running maximum over ĥ of the fine samples (the envelope over lower drops).
    2. The nodes' own values and their interpolation at the fine samples; the
       shortfall s = ln(run) − ln(interp) ≥ 0 at each fine sample.
    3. Each node raised by the largest shortfall of the fine samples within one fine
       step of it (those whose interpolation gives it a weight): at every fine
       sample the interpolation then rises by a weighted mean of raises each at
       least that sample's shortfall, so it covers the sample.
    4. The running maximum over ĥ of the raised nodes (the lookup with fixed weights
       in μ and κ stays non-decreasing in ĥ).

    Where the peaks are smooth the raise is a fraction of a per cent (the
    interpolation of a power law in the logs is exact); where a contact starts or
    stops with the height (the peak jumps) the raise is what the samples show.
    Before, each node took the largest sample within half a step in μ and κ, which
    read 1.05–1.3 × the pointwise peak where the peaks are steep in μ or κ.
    Dimensionless (units of the load's weight)."""
    run = np.maximum.accumulate(fine, axis=2)
    L = np.log(run[0::2, 0::2, 0::2])
    short = np.maximum(np.log(run) - _upsample(L), 0.0)
    return np.exp(np.maximum.accumulate(L + _pool_nodes(short), axis=2))


def round_up_f32(a: np.ndarray) -> np.ndarray:
    """``a`` as float32, never below ``a`` (the next float32 up where the cast went
    down): a stored envelope stays an upper bound."""
    b = a.astype(np.float32)
    low = b.astype(float) < a
    b[low] = np.nextafter(b[low], np.float32(np.inf))
    return b


@functools.lru_cache(maxsize=1)
def _envelope() -> tuple[np.ndarray, np.ndarray]:
    """The stored envelope (framing, contact), float64, checked against the grid."""
    try:
        with np.load(ENVELOPE_FILE) as z:
            grid = tuple(np.asarray(z[k], float) for k in ("lg_mu", "lg_kappa", "lg_h"))
            Ff, Fc = np.asarray(z["frame"], float), np.asarray(z["contact"], float)
    except (OSError, KeyError, ValueError) as exc:
        raise RuntimeError(f"the two-mass envelope table {ENVELOPE_FILE} is missing or "
                           "unreadable; rebuild it with "
                           "scripts/build_two_mass_envelope.py") from exc
    want = envelope_grid()
    same = all(g.shape == w.shape and np.allclose(g, w)
               for g, w in zip(grid, want, strict=True))
    if not same or Ff.shape != tuple(w.size for w in want):
        raise RuntimeError(f"{ENVELOPE_FILE} was built on another grid than "
                           "ENVELOPE_GRID; rebuild it with "
                           "scripts/build_two_mass_envelope.py")
    return Ff, Fc


@functools.lru_cache(maxsize=1)
def _log_envelope() -> tuple[np.ndarray, np.ndarray]:
    """ln of the stored envelope (framing, contact), flattened."""
    Ff, Fc = _envelope()
    return np.log(Ff).ravel(), np.log(Fc).ravel()


@functools.lru_cache(maxsize=1)
def _log_envelope_pair() -> np.ndarray:
    """ln of the stored envelope, (framing, contact) side by side per node, (N, 2)."""
    LF, LC = _log_envelope()
    return np.ascontiguousarray(np.stack([LF, LC], axis=1))


def _cell(lg: np.ndarray, start: float, step: float, n: int
          ) -> tuple[np.ndarray, np.ndarray]:
    """Lower node (of ``n``, clamped to the table's edge cells) and the position in
    the cell (0–1, clamped: the edge node's value outside) of the log values ``lg``
    on a grid from ``start`` by ``step``."""
    t = (lg - start) / step
    # np.minimum(np.maximum(·)) is np.clip (NaN kept alike) at a fraction of the call cost
    i = np.minimum(np.maximum(np.floor(t), 0.0), float(n - 2)).astype(np.int64)
    return i, np.minimum(np.maximum(t - i, 0.0), 1.0)


def _trilinear(tables: tuple[np.ndarray, np.ndarray],
               corners: list[tuple[np.ndarray, np.ndarray]], k: np.ndarray,
               wk: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The logs of the envelope's (framing, contact) forces, trilinear: Σ over the
    four (μ, κ) corners (base index at ĥ's node 0, weight w_ab; in order) of
    w0·L[b] + w1·L[b + 1] with b = base + k, w1 = w_ab·w_k, w0 = w_ab − w1, for each
    flat node table L of ``tables``. One contiguous row per point (the fastest for
    many rows)."""
    LF, LC = tables
    lf = np.zeros(k.shape)
    lc = np.zeros(k.shape)
    for base, wab in corners:
        b = base + k
        b1 = b + 1
        w1 = wab * wk
        w0 = wab - w1
        lf += w0 * np.take(LF, b) + w1 * np.take(LF, b1)
        lc += w0 * np.take(LC, b) + w1 * np.take(LC, b1)
    return lf, lc


def _bounded(W: np.ndarray, h: np.ndarray, hp: np.ndarray, Ff: np.ndarray,
             Fc: np.ndarray, eta: np.ndarray, d_pos: np.ndarray, Wfc: np.ndarray,
             Wff: np.ndarray, ff_fc: np.ndarray, fc_ff: np.ndarray
             ) -> tuple[np.ndarray, np.ndarray]:
    """The envelope's forces ``Ff``, ``Fc`` (N, written in place) × the margin, at
    least the one-mass balance F1 = W·(1 + √(1 + 2·max(ηh, 0)/(W·f))) (Gere §9.10,
    ``d_pos`` = W·f, ∞ where not positive) and at most the energy bounds
    (:func:`energy_bounds`: ``Wfc`` = W·f_contact, ``Wff`` = W·f_frame, ``ff_fc`` and
    ``fc_ff`` their ratios, ``hp`` = max(h, 0)); where the table gives no finite
    force, the bounds. Returns (F_c, F_f). Shared by :func:`envelope_two_forces` and
    :class:`EnvelopeLookup` (the same arithmetic)."""
    F1 = W * (1.0 + np.sqrt(1.0 + 2.0 * np.maximum(eta * h, 0.0) / d_pos))
    Bc = W * (1.0 + np.sqrt(1.0 + 2.0 * hp / Wfc + ff_fc))
    Bf = W * (1.0 + np.sqrt(1.0 + 2.0 * hp / Wff + fc_ff))
    Bc[np.isnan(Bc)] = np.inf
    Bf[np.isnan(Bf)] = np.inf
    bad = ~(np.isfinite(Ff) & np.isfinite(Fc))
    if bad.any():  # outside any table (a massless load, a rigid framing): the bounds
        Ff[bad], Fc[bad] = Bf[bad], Bc[bad]
    Fc *= ENVELOPE_MARGIN[1]
    Ff *= ENVELOPE_MARGIN[0]
    Fc = np.minimum(np.fmax(Fc, F1, out=Fc), Bc, out=Fc)
    Ff = np.minimum(np.fmax(Ff, F1, out=Ff), Bf, out=Ff)
    return Fc, Ff


def envelope_two_forces(W: ArrayLike, h: ArrayLike, f_contact: ArrayLike,
                        f_frame: ArrayLike, m2: ArrayLike
                        ) -> tuple[np.ndarray, np.ndarray]:
    """Contact force F_c and force on the framing F_f (N): the largest that any drop
    from h' ≤ h (m, energy height) gives — the monotone envelope of
    :func:`impact_two_forces` in the drop height. W (N), f_contact and f_frame (m/N),
    m2 (kg) as there.

    Why an envelope: a lower drop can give a two-mass system the larger peak (the
    load's later contacts meet the framing in or out of phase; Biggs 1964 ch. 5 —
    from memory), and a load being lowered can fall from any height below the
    planned one. The envelope is conservative (never below the pointwise peak at the
    table's sampled nodes) and non-decreasing in h, so the inverse answers found by
    bisection on it are exact: every height below an allowable height passes.

    Lookup (:func:`build_envelope`, dimensionless in μ = m2/M, κ = f_frame/f_contact,
    ĥ = h/(W·f_frame)): trilinear in the logs of μ, κ, ĥ and of the nodes' values
    (the peaks go as powers of them, e.g. F ∝ √ĥ and, for a light load,
    ∝ 1/√μ); with fixed weights in μ and κ it is non-decreasing in ĥ, as every
    node's running maximum is. Outside the
    table: μ and κ take the edge node's value (above the largest μ, a lighter load
    on a heavier structure, and below the smallest κ, a softer contact, the forces
    are lower: the edge is the upper side; below the smallest μ, a load 1000 × the
    struck mass, the one-mass balance below governs — common practice, no source),
    the contact force above the
    stiffest κ scaled by √(κ/κ_max) (a rigid-wall hit, F = v0·√(k_c·m), Gere §9.10),
    ĥ below the table at its first node, above it scaled by √(ĥ/ĥ_max) (an upper
    bound for F/W = 1 + a·√ĥ). Then × :data:`ENVELOPE_MARGIN`, the larger of that
    and the one-mass balance with η = M/(M + m2) on the springs in series, and at
    most the energy bounds (:func:`energy_bounds`): each non-decreasing in h, so the
    result is."""
    W, h, fc, ff, m2 = np.broadcast_arrays(*(np.asarray(v, float)
                                             for v in (W, h, f_contact, f_frame, m2)))
    shape = W.shape
    W, h, fc, ff, m2 = (np.ravel(a) for a in (W, h, fc, ff, m2))  # row by row, flat
    (m0, _, dm), (k0, _, dk), (h0, _, dh) = ENVELOPE_GRID
    nm, nk, nh = _envelope()[0].shape  # nodes
    M = W / G
    f = fc + ff
    hp = np.maximum(h, 0.0)
    Wff = W * ff
    Wfc = W * fc
    with np.errstate(divide="ignore", invalid="ignore"):
        mu = np.where(M > 0.0, m2 / M, np.inf)
        ka = np.where(fc > 0.0, ff / fc, np.inf)
        hh = np.where(Wff > 0.0, hp / Wff, np.inf)
        # log₁₀ of each clipped to [1e-300, 1e300] (np.clip's values)
        lmu = np.log10(np.minimum(np.maximum(mu, 1e-300), 1e300))
        lka = np.log10(np.minimum(np.maximum(ka, 1e-300), 1e300))
        lhh = np.log10(np.minimum(np.maximum(hh, 1e-300), 1e300))
    i, wi = _cell(lmu, m0, dm, nm)
    j, wj = _cell(lka, k0, dk, nk)
    k, wk = _cell(lhh, h0, dh, nh)
    top = h0 + (nh - 1) * dh
    # √(10^(max(lĥ, top) − top)): 1 at and below the table's top (the power only above
    # it, and for NaN, where it differs from 1)
    over = np.ones(lhh.shape)
    up = ~(lhh <= top)
    if up.any():
        over[up] = np.sqrt(np.maximum(10.0 ** (np.maximum(lhh[up], top) - top), 1.0))
    ka_top = 10.0 ** (k0 + (nk - 1) * dk)
    c_scale = np.sqrt(np.maximum(ka / ka_top, 1.0))
    lf, lc = _trilinear(_log_envelope(), [(((i + a) * nk + (j + b)) * nh, wa * wb)
                                          for a, wa in ((0, 1.0 - wi), (1, wi))
                                          for b, wb in ((0, 1.0 - wj), (1, wj))], k, wk)
    d_st = W * f
    with np.errstate(divide="ignore", invalid="ignore"):
        Fc, Ff = _bounded(W, h, hp, np.exp(lf) * over * W, np.exp(lc) * over * c_scale * W,
                          M / (M + m2), np.where(d_st > 0.0, d_st, np.inf), Wfc, Wff,
                          ff / fc, fc / ff)
    Fc, Ff = Fc.reshape(shape), Ff.reshape(shape)
    if not shape:  # numpy scalars for scalar inputs, as the arithmetic on 0-d gives
        return Fc[()], Ff[()]
    return Fc, Ff


class EnvelopeLookup:
    """:func:`envelope_two_forces` for fixed points (W, f_contact, f_frame, m2) at
    many drop heights: the fast kernel of the allowable-height searches
    (``droprig.solver.chain.TwoForceKernel``). The cell and weights in μ = m2/M and
    κ = f_frame/f_contact, the contact's stiff-side scale and the one-mass share η
    do not depend on the height: they are worked out once here, and :meth:`at`
    does only the ĥ = h/(W·f_frame) part. The same arithmetic as
    :func:`envelope_two_forces` in the same order, so both give the same forces
    (compared at 1e-12 in tests/solver/test_two_force_kernel.py). SI units: W in N,
    compliances in m/N, m2 in kg; heights in m (energy heights).

    Speed (the searches run it on a few rows many times, so the cost is numpy's per
    call): the height-free per-point values sit side by side in one table
    (``_cols``, ``base``, ``wab``) gathered by one ``np.take`` per table, and the
    four corners in (μ, κ) are read in one pass where the rows are few."""

    _FUSED_ROWS = 1024
    """Up to this many rows :meth:`at` reads the four corners in one pass (fewer numpy
    calls); beyond, one corner at a time on flat rows (:func:`_trilinear`). The two
    add the corners in the same order: the same values."""

    def __init__(self, W: ArrayLike, f_contact: ArrayLike, f_frame: ArrayLike,
                 m2: ArrayLike) -> None:
        W, fc, ff, m2 = np.broadcast_arrays(*(np.asarray(v, float)
                                              for v in (W, f_contact, f_frame, m2)))
        W, fc, ff, m2 = (np.ascontiguousarray(a.ravel()) for a in (W, fc, ff, m2))
        (m0, _, dm), (k0, _, dk), _ = ENVELOPE_GRID
        nm, nk, nh = _envelope()[0].shape
        M = W / G
        with np.errstate(divide="ignore", invalid="ignore"):
            mu = np.where(M > 0.0, m2 / M, np.inf)
            ka = np.where(fc > 0.0, ff / fc, np.inf)
            lmu = np.log10(np.clip(mu, 1e-300, 1e300))
            lka = np.log10(np.clip(ka, 1e-300, 1e300))
        i, wi = _cell(lmu, m0, dm, nm)
        j, wj = _cell(lka, k0, dk, nk)
        ka_top = 10.0 ** (k0 + (nk - 1) * dk)
        # the four corners in (μ, κ): base index of ĥ = 0 and weight
        self.base = np.stack([((i + a) * nk + (j + b)) * nh
                              for a in (0, 1) for b in (0, 1)])
        self.wab = np.stack([wa * wb for wa in (1.0 - wi, wi) for wb in (1.0 - wj, wj)])
        d_st = W * (fc + ff)
        # the table of the gathered rows (one row per quantity): W, W·f_frame, the
        # contact's stiff-side scale, η, the static deflection W·f (∞ where not
        # positive), W·f_contact, f_frame/f_contact, f_contact/f_frame
        with np.errstate(divide="ignore", invalid="ignore"):
            self._cols = np.stack(
                [W, W * ff, np.sqrt(np.maximum(ka / ka_top, 1.0)), M / (M + m2),
                 np.where(d_st > 0.0, d_st, np.inf), W * fc, ff / fc, fc / ff])
        (self.W, self.Wff, self.c_scale, self.eta, self.d_pos, self.Wfc, self.ff_fc,
         self.fc_ff) = self._cols

    def at(self, h: ArrayLike, rows: np.ndarray | None = None
           ) -> tuple[np.ndarray, np.ndarray]:
        """Contact force F_c and force on the framing F_f (N) at the energy heights
        ``h`` (m) of the points ``rows`` (indices into the points given; all where
        None), as :func:`envelope_two_forces`."""
        if rows is None:
            cols, base, wab = self._cols, self.base, self.wab
        else:
            cols = np.take(self._cols, rows, axis=1)
            base = np.take(self.base, rows, axis=1)
            wab = np.take(self.wab, rows, axis=1)
        W, Wff, c_scale, eta, d_pos, Wfc, ff_fc, fc_ff = cols
        m = W.size
        h = np.broadcast_to(np.asarray(h, float), W.shape)
        _, _, (h0, _, dh) = ENVELOPE_GRID
        nh = _envelope()[0].shape[2]
        hp = np.maximum(h, 0.0)
        with np.errstate(divide="ignore", invalid="ignore"):
            hh = np.where(Wff > 0.0, hp / Wff, np.inf)
            # log₁₀ of ĥ clipped to [1e-300, 1e300] (np.clip's values)
            lhh = np.log10(np.minimum(np.maximum(hh, 1e-300), 1e300))
        k, wk = _cell(lhh, h0, dh, nh)
        top = h0 + (nh - 1) * dh
        # √(10^(max(lĥ, top) − top)), 1 at and below the table's top: the power is
        # taken only above it (and for NaN), where it differs from 1
        over = np.ones(m)
        up = ~(lhh <= top)
        if up.any():
            over[up] = np.sqrt(np.maximum(10.0 ** (np.maximum(lhh[up], top) - top), 1.0))
        LFC = _log_envelope_pair()
        # trilinear in the logs: Σ over the corners (in order) of w0·L[b] + w1·L[b + 1]
        if m <= self._FUSED_ROWS:
            b = base + k
            w1 = wab * wk
            w0 = wab - w1
            t = (w0[:, :, None] * np.take(LFC, b, axis=0)
                 + w1[:, :, None] * np.take(LFC, b + 1, axis=0))
            acc = t[0] + t[1]
            acc += t[2]
            acc += t[3]
            e = np.exp(acc)
            ef, ec = e[:, 0], e[:, 1]
        else:
            lf, lc = _trilinear(_log_envelope(), [(base[q], wab[q]) for q in range(4)],
                                k, wk)
            ef, ec = np.exp(lf), np.exp(lc)
        with np.errstate(divide="ignore", invalid="ignore"):
            return _bounded(W, h, hp, ef * over * W, ec * over * c_scale * W,
                            eta, d_pos, Wfc, Wff, ff_fc, fc_ff)
