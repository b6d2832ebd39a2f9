"""Impact of a falling load on an elastic structure (energy method).

Vectorised over drop points; SI units (N, m, m/N, kg). The load of weight W falls
freely through h onto the struck point, whose flexibility (compliance) is f (m/N,
structure plus any spring mat in series). A share η of the load's kinetic energy
is left after the perfectly inelastic contact with the struck member's effective
mass (Rayleigh). Sources: Gere, *Mechanics of Materials* 7th ed., §9.10,
Eq. 9-94 (dynamic factor); Timoshenko, *Strength of Materials* Part I (mass
correction); Engineering ToolBox, "Impact Force" (average force over a stopping
distance).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "G",
    "crush_depth",
    "crush_duration",
    "deceleration_g",
    "dynamic_factor",
    "framing_under_crush",
    "impact_crushable",
    "impact_elastic",
    "mass_efficiency",
]

G = 9.80665
"""Standard gravity, m/s² (CGPM 1901; ISO 80000-3)."""


def mass_efficiency(M: ArrayLike, m_e: ArrayLike) -> np.ndarray:
    """Share of the load's kinetic energy left after a perfectly inelastic contact
    with the struck member's effective mass: η = M/(M + m_e) (dimensionless; M, m_e
    in kg). Momentum conservation M·v = (M + m_e)·v'; Timoshenko, *Strength of
    Materials* Part I, impact with the mass of the beam considered. m_e = 0 gives 1.
    """
    M, m_e = np.asarray(M, float), np.asarray(m_e, float)
    return M / (M + m_e)


def struck_point_mass(m_rayleigh: ArrayLike, f_s: ArrayLike, f_struct: ArrayLike,
                      ) -> np.ndarray:
    """Mass of the framing struck by the load, kg: m_e·(f_s/f)².

    The Rayleigh mass m_e (kg) of the framing is taken with its static deflected shape
    scaled to 1 at the struck point of the framing, which moves W·f_s, while the load
    moves W·f with f = f_s + the springs in series between them (deck, the load's
    underside; m/N). With the shape scaled to the load's displacement the framing's
    share is m_e·(f_s/f)² (Rayleigh's method, Timoshenko, *Strength of Materials*
    Part I, impact with the mass of the beam considered — from memory). Near a
    support f_s → 0 and the framing mass drops out (η → 1, conservative). Zero where
    f ≤ 0 (a rigid point)."""
    m_rayleigh = np.asarray(m_rayleigh, float)
    f_s, f_struct = np.asarray(f_s, float), np.asarray(f_struct, float)
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(f_struct > 0.0, f_s / f_struct, 0.0)
    return m_rayleigh * share**2


def dynamic_factor(h: ArrayLike, delta_st: ArrayLike, eta: ArrayLike = 1.0) -> np.ndarray:
    """Dynamic (impact) factor K = 1 + √(1 + 2ηh/δst), dimensionless.

    Gere 7th ed., §9.10, Eq. 9-94 (η = 1), with the struck-mass correction η of
    Timoshenko Part I. h: free-fall height, m; δst = W·f: static deflection of the
    struck point, m. h = 0 gives K = 2 (suddenly applied load). A rigid struck point
    (δst = 0) gives K = ∞ when ηh > 0.
    """
    h, d, eta = np.broadcast_arrays(*(np.asarray(v, float) for v in (h, delta_st, eta)))
    e = eta * h
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.where(d > 0.0, 2.0 * e / np.where(d > 0.0, d, 1.0), np.inf)
    ratio = np.where(e <= 0.0, 0.0, ratio)
    return 1.0 + np.sqrt(1.0 + ratio)


def impact_elastic(W: ArrayLike, h: ArrayLike, f: ArrayLike,
                   eta: ArrayLike = 1.0) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Elastic impact of weight W (N) falling h (m) onto compliance f (m/N).

    Energy balance ηWh + Wδ = δ²/(2f) gives (Gere §9.10, Eq. 9-94 with η):
    δst = W·f; K = 1 + √(1 + 2ηh/δst); F_peak = K·W (N); δmax = K·δst (m).
    Returns ``(K, F_peak, delta_max)``; δmax is the travel of the load after contact
    (structure plus any series mat).
    """
    W, h, f, eta = (np.asarray(v, float) for v in (W, h, f, eta))
    d_st = W * f
    K = dynamic_factor(h, d_st, eta)
    # δmax = δst + √(δst² + 2ηhδst) (same balance; finite for a rigid point, f = 0)
    d_max = d_st + np.sqrt(d_st**2 + 2.0 * np.maximum(eta * h, 0.0) * d_st)
    return K, K * W, d_max


def crush_depth(W: ArrayLike, h: ArrayLike, f_s: ArrayLike, eta: ArrayLike,
                F_c: ArrayLike) -> np.ndarray:
    """Crush depth of an unlimited crushable layer of constant crush force F_c (N),
    m; 0 where the elastic peak stays below F_c; ``inf`` where F_c ≤ W.

    The layer is rigid until the force reaches F_c; the structure (compliance f_s,
    m/N) then holds F_c while the layer crushes c. Energy balance:
    ηWh + W(F_c·f_s + c) = F_c²·f_s/2 + F_c·c ⇒ c = (ηWh + W·F_c·f_s − F_c²f_s/2)/(F_c − W).
    With f_s → 0: (F_c − W)·c = ηWh, i.e. the net decelerating force is the
    kinetic energy over the stopping distance (Engineering ToolBox, "Impact Force").
    """
    W, h, f_s, eta, F_c = np.broadcast_arrays(*(np.asarray(v, float)
                                                for v in (W, h, f_s, eta, F_c)))
    num = eta * W * h + W * F_c * f_s - 0.5 * F_c**2 * f_s
    with np.errstate(divide="ignore", invalid="ignore"):
        c = num / (F_c - W)
    c = np.where(F_c <= W, np.inf, c)
    return np.maximum(c, 0.0)


def impact_crushable(W: ArrayLike, h: ArrayLike, f_s: ArrayLike, eta: ArrayLike,
                     F_c: ArrayLike, s_c: ArrayLike) -> tuple[np.ndarray, np.ndarray,
                                                              np.ndarray]:
    """Impact through a crushable layer (crush force F_c, N; stroke s_c, m) over a
    structure of compliance f_s (m/N). Returns ``(F_peak, crush_depth, bottomed)``.

    1. Elastic peak ≤ F_c (crush depth c ≤ 0, see :func:`crush_depth`): the layer
       stays rigid; F_peak = K·W with K = 1 + √(1 + 2ηh/(W·f_s)) (Gere §9.10).
    2. 0 < c ≤ s_c: F_peak = F_c, crush depth c (energy balance above).
    3. c > s_c (or F_c ≤ W): the layer bottoms out after absorbing F_c·s_c; the rest
       is taken elastically: ηWh + W(δ + s_c) = δ²/(2f_s) + F_c·s_c, δ = F·f_s ⇒
       F_peak = W + √(W² + 2(ηWh − (F_c − W)·s_c)/f_s), crush depth s_c, bottomed.
    With f_s → 0 and no bottoming this is the average force over the stopping
    distance (Engineering ToolBox, "Impact Force"). N, m.
    """
    W, h, f_s, eta, F_c, s_c = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (W, h, f_s, eta, F_c, s_c)))
    c = crush_depth(W, h, f_s, eta, F_c)
    _, F_el, _ = impact_elastic(W, h, f_s, eta)
    bottomed = c > s_c
    residual = eta * W * h - (F_c - W) * s_c
    with np.errstate(divide="ignore", invalid="ignore"):
        # bottoming (c > s_c) makes the discriminant positive even when residual < 0
        F_bottom = W + np.sqrt(np.maximum(W**2 + 2.0 * residual
                                          / np.where(f_s > 0.0, f_s, 1.0), 0.0))
    F_bottom = np.where(f_s > 0.0, F_bottom, np.inf)
    # elastic when the layer's crush force is never reached (equivalently c ≤ 0; the
    # force test also covers the degenerate rigid, h = 0 case)
    elastic = F_el <= F_c
    bottomed = bottomed & ~elastic
    F = np.where(elastic, F_el, np.where(bottomed, np.maximum(F_bottom, F_c), F_c))
    depth = np.where(elastic, 0.0, np.where(bottomed, s_c, c))
    return F, depth, bottomed


CRUSH_NEWTON = 60
"""Newton steps of :func:`crush_duration` (from t = 0 on a convex, decreasing
function: the steps rise monotonically to the first root; 60 is far more than the
convergence needs, a fixed count so that the arithmetic is vectorised)."""


def crush_duration(M: ArrayLike, v0: ArrayLike, F_c: ArrayLike, m2: ArrayLike,
                   k2: ArrayLike) -> np.ndarray:
    """How long a crushable layer crushes under a falling load on a floor with mass,
    s: the first t_c > 0 at which the load's speed comes down to the floor's,
    v0 − a·t = (F_c/(m2·ω))·sin ωt, with a = (F_c − M·g)/M the load's deceleration
    while the layer crushes at its force F_c (N), and the floor (mass m2, kg, on the
    framing's stiffness k2, N/m; ω = √(k2/m2)) at rest at first contact, pushed by
    F_c from t = 0: u(t) = (F_c/k2)·(1 − cos ωt) (a suddenly applied constant force
    on an undamped oscillator, Biggs 1964 ch. 2 — from memory). M in kg, v0 (the
    strike speed) in m/s. The contact between the layer and the floor is taken
    rigid, so the layer's force is on the floor at once (no rise time: the framing's
    response to the plateau is then the largest, Biggs 1964 ch. 2's ramped step —
    from memory). Where the crush lasts past half the floor's period (ωt ≥ π) the
    answer is π/ω (the framing has then reached 2·F_c, :func:`framing_under_crush`
    needs no more); ``inf`` where F_c ≤ M·g (the layer never stops the load).

    g(t) = v0 − a·t − (F_c/(m2·ω))·sin ωt is convex on [0, π/ω] (g'' =
    (F_c·ω/m2)·sin ωt ≥ 0), g(0) = v0 > 0 and g'(0) = −a − F_c/m2 < 0: Newton's
    method from t = 0 rises monotonically to the first root, or finds g' ≥ 0 (no
    root before π/ω)."""
    M, v0, F_c, m2, k2 = np.broadcast_arrays(*(np.asarray(v, float)
                                               for v in (M, v0, F_c, m2, k2)))
    with np.errstate(divide="ignore", invalid="ignore"):
        a = (F_c - M * G) / M
        w = np.sqrt(k2 / m2)
        A = F_c / (m2 * w)
        t_half = np.pi / w
        t = np.zeros(M.shape)
        # the steps on the cases still converging only (each case's arithmetic is
        # that of the whole-array iteration)
        i = np.flatnonzero((a > 0.0) & (v0 > 0.0) & np.isfinite(w) & (w > 0.0))
        ai, v0i, Ai, wi, bi, thi = (x.ravel()[i] for x in (a, v0, A, w, F_c / m2, t_half))
        ti = np.zeros(i.size)
        for _ in range(CRUSH_NEWTON):
            if i.size == 0:
                break
            wt = wi * ti
            g = v0i - ai * ti - Ai * np.sin(wt)
            gp = -ai - bi * np.cos(wt)
            step = np.where(gp < 0.0, -g / np.where(gp < 0.0, gp, -1.0), 0.0)
            # g' ≥ 0 before the root: the crush outlasts half the period
            past = gp >= 0.0
            ti = np.where(past, thi, ti + step)
            past = past | (ti >= thi)
            ti = np.where(past, thi, ti)
            t.ravel()[i] = ti
            keep = ~past & (np.abs(step) > 1e-13 * np.maximum(ti, 1e-300))
            i, ai, v0i, Ai, wi, bi, thi, ti = (x[keep] for x in
                                               (i, ai, v0i, Ai, wi, bi, thi, ti))
    t = np.where(a > 0.0, t, np.inf)
    return np.where(v0 > 0.0, t, 0.0)


def framing_under_crush(M: ArrayLike, v0: ArrayLike, F_c: ArrayLike, m2: ArrayLike,
                        k2: ArrayLike) -> np.ndarray:
    """Peak force on the framing (N, k2 times the floor's peak deflection) while and
    after a crushable layer crushes under a falling load, the layer not bottoming
    out: the layer puts F_c (N) on the floor (mass m2, kg; framing stiffness k2, N/m;
    period T = 2π·√(m2/k2)) for the crush's duration t_c (:func:`crush_duration`),
    a rectangular pulse; then the load (M, kg) rides on the floor.

    1. While it crushes: F₁ = F_c·(1 − cos ωt_c), at most 2·F_c, reached where
       t_c ≥ T/2 (the rectangular pulse's dynamic load factor 2·sin(π·t_d/T) for
       t_d ≤ T/2, else 2: Biggs 1964 ch. 2 — from memory; during the pulse).
    2. After it: load and floor move together (M + m2 on k2, the load's weight W on
       it) from the deflection u_c = (F_c/k2)·(1 − cos ωt_c) and the common speed
       v_c = v0 − a·t_c: the peak of the free vibration about W/k2,
       F₂ = W + √((k2·u_c − W)² + k2·(M + m2)·v_c²) (energy of an undamped
       oscillator, Clough & Penzien ch. 2 — from memory). Where this would press
       the layer past F_c it crushes again and passes less: F₂ is then an upper
       estimate.

    F = max(F₁, F₂) where t_c < T/2, else 2·F_c; at most 2·F_c. The cap is the
    Duhamel integral of a force in 0…F_c over one half period of the oscillator
    (Clough & Penzien ch. 4 — from memory); it is **not** a bound over several
    cycles: a load bouncing on a soft contact (contact stiffness under a few times
    the framing's) can push the floor in phase and pass 2·F_c (scipy histories
    reach 2.24·F_c; KNOWN SHORTFALL, tests/solver/test_layer_framing_soft_contact.py
    and README limits). Checked against a scipy time history of load – layer –
    contact spring – floor mass – framing (tests/solver/test_layer_framing.py:
    1.00–1.01 × its framing peak on random systems with a stiff contact, short and
    long crushes; up to 1.14 × where a heavy load on a light floor presses the layer
    again after the crush). M, m2 in kg, v0 in m/s, F_c in N, k2 in N/m."""
    M, v0, F_c, m2, k2 = np.broadcast_arrays(*(np.asarray(v, float)
                                               for v in (M, v0, F_c, m2, k2)))
    t_c = crush_duration(M, v0, F_c, m2, k2)
    W = M * G
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        w = np.sqrt(k2 / m2)
        wt = w * t_c
        long = ~(wt < np.pi)
        wt = np.where(long, np.pi, wt)
        F1 = F_c * (1.0 - np.cos(wt))
        v_c = np.maximum(v0 - (F_c - W) / M * t_c, 0.0)
        F2 = W + np.sqrt((F1 - W) ** 2 + k2 * (M + m2) * v_c ** 2)
        F = np.where(long, 2.0 * F_c, np.maximum(F1, F2))
    return np.minimum(np.where(np.isfinite(F), F, 2.0 * F_c), 2.0 * F_c)


def deceleration_g(F: ArrayLike, W: ArrayLike) -> np.ndarray:
    """Peak deceleration of the load in g: a/g = F/W − 1 (Newton's second law,
    M·a = F − W, with W = M·g), dimensionless."""
    return np.asarray(F, float) / np.asarray(W, float) - 1.0
