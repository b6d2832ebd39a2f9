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

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import G

__all__ = [
    "LOAD_MASS_FACTORS",
    "TwoMassPeaks",
    "distributed_mass_per_length",
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
GAP_SAMPLES = 48
"""Samples of the free flight between contacts (the first sign change of the gap is
refined by the secant method)."""
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
    time by angle addition (one cos/sin per mode and window, not one per sample)."""
    w_lo, w_hi, p_lo, p_hi, w2_lo, w2_hi = modes
    y1, v1, y2, v2 = state
    det = p_hi - p_lo
    qa_lo, qa_hi = (p_hi * y1 - y2) / det, (y2 - p_lo * y1) / det
    qb_lo, qb_hi = (p_hi * v1 - v2) / det / w_lo, (v2 - p_lo * v1) / det / w_hi
    # F = W + M·ω_lo²·q_lo + M·ω_hi²·q_hi (k_c·(1 − p) = M·ω²);
    # k2·x2 = W + k2·(p_lo·q_lo + p_hi·q_hi): coefficients of cos and sin per mode
    FA_lo, FB_lo = M * w2_lo * qa_lo, M * w2_lo * qb_lo
    FA_hi, FB_hi = M * w2_hi * qa_hi, M * w2_hi * qb_hi
    XA_lo, XB_lo = p_lo * qa_lo, p_lo * qb_lo
    XA_hi, XB_hi = p_hi * qa_hi, p_hi * qb_hi
    n = M.shape[0]
    F0 = W + FA_lo + FA_hi
    X0 = XA_lo + XA_hi
    F_pk, X_pk = F0.copy(), X0.copy()
    tF, tX = np.zeros(n), np.zeros(n)
    alive = np.ones(n, dtype=bool)  # still in contact
    t_a, F_a = np.zeros(n), F0.copy()  # last sample in contact
    t_b, F_b = np.full(n, np.inf), np.full(n, -1.0)  # first sample apart
    # fast window: 1½ periods of the fast mode, sampled and refined
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
        leave = alive & (F < 0.0)
        if leave.any():
            t_b = np.where(leave, t, t_b)
            F_b = np.where(leave, F, F_b)
            alive &= ~leave
        up = alive & (F > F_pk)
        F_pk = np.where(up, F, F_pk)
        tF = np.where(up, t, tF)
        up = alive & (X > X_pk)
        X_pk = np.where(up, X, X_pk)
        tX = np.where(up, t, tX)
        t_a = np.where(alive, t, t_a)
        F_a = np.where(alive, F, F_a)
    t_fast = FAST_SAMPLES * dt
    ws = (w_lo, w_hi)
    hi_t = np.minimum(t_fast, t_b)
    Fr = _refine_max(W, (FA_lo, FB_lo, FA_hi, FB_hi), ws, tF, np.zeros(n), hi_t)
    Xr = _refine_max(np.zeros(n), (XA_lo, XB_lo, XA_hi, XB_hi), ws, tX, np.zeros(n), hi_t)
    F_pk = np.maximum(F_pk, Fr)
    X_pk = np.maximum(X_pk, Xr)
    # slow window: one period of the slow mode after the fast window, the slow part
    # sampled and refined, the fast mode's ripple added at its amplitude (upper bound)
    R_F = np.hypot(FA_hi, FB_hi)
    R_X = np.hypot(XA_hi, XB_hi)
    slow = alive.copy()
    if slow.any():
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
            leave = alive & (F < 0.0)
            if leave.any():
                t_b = np.where(leave, t, t_b)
                F_b = np.where(leave, F, F_b)
                alive &= ~leave
            Fb_ = F_slow + R_F
            Xb_ = XA_lo * cl + XB_lo * sl + R_X
            up = alive & (Fb_ > sF_pk)
            sF_pk = np.where(up, Fb_, sF_pk)
            tsF = np.where(up, t, tsF)
            up = alive & (Xb_ > sX_pk)
            sX_pk = np.where(up, Xb_, sX_pk)
            tsX = np.where(up, t, tsX)
            t_a = np.where(alive, t, t_a)
            F_a = np.where(alive, F, F_a)
        hi_s = np.minimum(t_fast + SLOW_SAMPLES * dts, t_b)
        Fs_r = _refine_max(W + R_F, (FA_lo, FB_lo), (w_lo,), tsF, t_fast, hi_s)
        Xs_r = _refine_max(R_X, (XA_lo, XB_lo), (w_lo,), tsX, t_fast, hi_s)
        got = np.isfinite(sF_pk)
        F_pk = np.where(got, np.maximum(F_pk, np.maximum(sF_pk, Fs_r)), F_pk)
        X_pk = np.where(got, np.maximum(X_pk, np.maximum(sX_pk, Xs_r)), X_pk)
    sep = np.isfinite(t_b)
    # the separation time: secant steps on F(t) = 0 within [t_a, t_b]
    ta, Fa = t_a, F_a
    tb, Fb = np.where(sep, t_b, 0.0), F_b
    for _ in range(3):
        with np.errstate(divide="ignore", invalid="ignore"):
            tm = np.where(Fa > Fb, ta + (tb - ta) * Fa / (Fa - Fb), tb)
        tm = np.clip(np.where(np.isfinite(tm), tm, tb), np.minimum(ta, tb), tb)
        Fm = (W + FA_lo * np.cos(w_lo * tm) + FB_lo * np.sin(w_lo * tm)
              + FA_hi * np.cos(w_hi * tm) + FB_hi * np.sin(w_hi * tm))
        pos = Fm >= 0.0
        ta, Fa = np.where(pos, tm, ta), np.where(pos, Fm, Fa)
        tb, Fb = np.where(pos, tb, tm), np.where(pos, Fb, Fm)
    ts = np.where(sep, 0.5 * (ta + tb), 0.0)
    # the state at separation
    cl, sl = np.cos(w_lo * ts), np.sin(w_lo * ts)
    ch, sh = np.cos(w_hi * ts), np.sin(w_hi * ts)
    ql = qa_lo * cl + qb_lo * sl
    qh = qa_hi * ch + qb_hi * sh
    qld = w_lo * (qb_lo * cl - qa_lo * sl)
    qhd = w_hi * (qb_hi * ch - qa_hi * sh)
    out = (ql + qh, qld + qhd, p_lo * ql + p_hi * qh, p_lo * qld + p_hi * qhd)
    return F_pk, X_pk, sep, ts, out


def _catch_up(x1: np.ndarray, v1: np.ndarray, x2: np.ndarray, v2: np.ndarray,
              wf: np.ndarray, left: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """First time τ in (0, left] (s) at which the falling load x1 + v1·τ + g·τ²/2
    reaches the freely vibrating structure x2·cos(ωτ) + (v2/ω)·sin(ωτ) (m, m/s,
    rad/s): sampled at :data:`GAP_SAMPLES` points (angle addition), then secant
    steps. Returns (found, τ)."""
    n = x1.shape[0]
    dt = left / GAP_SAMPLES
    cd, sd = np.cos(wf * dt), np.sin(wf * dt)
    c, s = np.ones(n), np.zeros(n)
    b2 = v2 / wf
    found = np.zeros(n, dtype=bool)
    ta, ga = np.zeros(n), x1 - x2
    tb, gb = left.copy(), np.zeros(n)
    for k in range(1, GAP_SAMPLES + 1):
        c, s = _rotate(c, s, cd, sd)
        t = k * dt
        g = x1 + v1 * t + 0.5 * G * t * t - (x2 * c + b2 * s)
        hit = ~found & (g >= 0.0)
        tb = np.where(hit, t, tb)
        gb = np.where(hit, g, gb)
        found |= hit
        ta = np.where(found, ta, t)
        ga = np.where(found, ga, g)
    for _ in range(3):
        with np.errstate(divide="ignore", invalid="ignore"):
            tm = np.where(gb > ga, ta + (tb - ta) * (-ga) / (gb - ga), tb)
        tm = np.clip(np.where(np.isfinite(tm), tm, tb), ta, tb)
        gm = x1 + v1 * tm + 0.5 * G * tm * tm - (x2 * np.cos(wf * tm) + b2 * np.sin(wf * tm))
        neg = gm < 0.0
        ta, ga = np.where(neg, tm, ta), np.where(neg, gm, ga)
        tb, gb = np.where(neg, tb, tm), np.where(neg, gb, gm)
    return found, tb


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
