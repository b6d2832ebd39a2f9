"""The struck deck panel as a ductile reinforced-concrete member.

What this module adds to :mod:`droprig.solver.deck` (which checks a simply supported
one-way strip):

* **Ductility class** of the slab section from its neutral-axis depth x_u/d
  (EN 1992-1-1 §5.6.2(2), §5.6.3(2)): an under-reinforced slab may be taken to its
  yield-line resistance; an over-reinforced one stays brittle.
* **Continuity over the supports.** The deck is continuous over the beams and
  girders; an interior span of an equal-span continuous strip is a beam with a
  rotational spring K = 2√3·EI/L at each support (the far spans, derived below).
  Elastic moments, the support hogging and the deflection under the load follow.
  A load on a support line is carried by the steel beneath it: no sagging strip
  moment there.
* **Yield-line resistance** of the struck panel (upper-bound mechanisms, Johansen;
  Park & Gamble, *Reinforced Concrete Slabs* 2nd ed. 2000, ch. 9–10 — from memory):
  the conical fan under a concentrated load, the four-panel pattern of a panel
  supported on its four sides, the straight line across a one-way strip; the
  least is the resistance. Hogging capacities count only where top bars are.
* **Free edges and openings** shorten effective widths and punching control
  perimeters (EN 1992-1-1 §6.4.2(3), (4), Figs. 6.14, 6.15; §6.4.5(3)).
* **Composite decks**: punching and local flexure over the ribs use the concrete
  topping over the ribs (EN 1994-1-1 §9.7.6 — from memory of the clause number).
* **Series elastic–plastic springs**: slab and framing in series; the weaker one
  yields first and sets the plastic plateau (UFC 3-340-02 ch. 3–4 resistance
  functions, from memory).

Vectorised over drop points (numpy broadcasting). SI units: m, N, N·m, N·m/m
(moment per metre width), Pa, rad; compliances m/N.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "K_INTERIOR",
    "ROTATION_LIMIT_SLAB",
    "XU_D_PLASTIC",
    "XU_D_ROTATION",
    "continuous_strip_compliance",
    "continuous_strip_end_moments",
    "continuous_strip_sagging_moment",
    "control_perimeter_edges",
    "effective_width_with_edges",
    "fan_collapse_load",
    "is_ductile",
    "loaded_perimeter_edges",
    "neutral_axis_ratio",
    "one_way_strip_collapse_load",
    "opening_ineffective_length",
    "panel_pattern_collapse_load",
    "rigid_base_strip_compliance",
    "series_resistance",
    "slab_support_rotation",
    "strip_green",
    "topping_depth",
    "yield_line_resistance",
]

ROTATION_LIMIT_SLAB = math.radians(2.0)
"""Support-rotation limit of a reinforced-concrete slab without shear reinforcement
or tension-membrane detailing, rad: 2° (UFC 3-340-02 ch. 4, flexural response
limits of slabs — from memory; larger limits need laced or stirruped sections or a
proven tension membrane, which droprig does not credit)."""

XU_D_PLASTIC = (0.25, 0.15)
"""x_u/d limits for plastic analysis without a direct rotation check:
0.25 for fck ≤ 50 MPa, 0.15 above (EN 1992-1-1 §5.6.2(2) — from memory)."""

XU_D_ROTATION = (0.45, 0.35)
"""x_u/d limits of the simplified rotation-capacity check: 0.45 for fck ≤ 50 MPa,
0.35 above (EN 1992-1-1 §5.6.3(2) — from memory). A slab within them is ductile."""

K_INTERIOR = 2.0 * math.sqrt(3.0)
"""Rotational stiffness of the far spans at a support of an interior span of a
long equal-span continuous strip, in units of EI/L: K = 2√3·EI/L.

Derivation (slope–deflection, Hibbeler *Structural Analysis* ch. 11 / any text):
an unloaded span with near-end stiffness 4c and carry-over 2c (c = EI/L) whose far
end rests on a spring K of the same kind gives K = 4c − (2c)²/(4c + K), so
K² = 12c², K = 2√3·c ≈ 3.46·EI/L (between 3EI/L, far end pinned, and 4EI/L, far
end fixed). The support moments then decay by 2 − √3 ≈ 0.268 per span, the
classic ratio of the three-moment equation for equal spans."""


# ------------------------------------------------------------------ section ductility
def neutral_axis_ratio(As: ArrayLike, d: ArrayLike, fc: float, fy: float, basis: str,
                       *, gamma_c: float = 1.2, gamma_s: float = 1.0) -> np.ndarray:
    """Neutral-axis depth over effective depth, x_u/d, of a singly reinforced slab
    section (per metre width) with its bars yielding, dimensionless.

    EN 1992-1-1 §3.1.7(3): x = As·fyd/(λ·η·fcd·b), λ = 0.8, η = 1 (fck ≤ 50 MPa;
    otherwise the reduced values of §3.1.7(3)), fcd = fck/γc, fyd = fyk/γs.
    ACI 318-19 §22.2.2: c = As·fy/(0.85·f'c·β1·b), β1 of Table 22.2.2.4.3.
    As in m²/m, d in m, fc and fy in Pa, b = 1 m.
    """
    As, d = np.broadcast_arrays(np.asarray(As, float), np.asarray(d, float))
    f_mpa = fc / 1e6
    if basis == "en1993":
        lam = min(0.8, 0.8 - (f_mpa - 50.0) / 400.0)
        eta = min(1.0, 1.0 - (f_mpa - 50.0) / 200.0)
        x = As * (fy / gamma_s) / (lam * eta * fc / gamma_c)
    elif basis == "aisc360":
        beta1 = min(0.85, max(0.65, 0.85 - 0.05 * (f_mpa - 28.0) / 7.0))
        x = As * fy / (0.85 * fc * beta1)
    else:
        raise ValueError(f"design basis: {basis!r} is not allowed; allowed: aisc360, en1993")
    return x / d


def is_ductile(xu_d: ArrayLike, fc: float) -> np.ndarray:
    """True where the slab section may be taken past yield (yield lines, plastic
    energy): x_u/d ≤ 0.45 (fck ≤ 50 MPa) or ≤ 0.35 (higher strengths),
    EN 1992-1-1 §5.6.3(2) simplified rotation check — from memory. fc in Pa."""
    limit = XU_D_ROTATION[0] if fc <= 50e6 else XU_D_ROTATION[1]
    return np.asarray(xu_d, float) <= limit


# ------------------------------------------------------------------ continuous strip
def continuous_strip_end_moments(L: ArrayLike, a: ArrayLike, EI: ArrayLike,
                                 K_left: ArrayLike, K_right: ArrayLike
                                 ) -> tuple[np.ndarray, np.ndarray]:
    """Hogging support moments (positive = hogging, tension at the top) of a span L
    with rotational springs K_left, K_right (N·m/rad) at its supports under a unit
    load at ``a`` from the left support, N·m per N.

    Compatibility of rotations (flexibility method, Hibbeler *Structural Analysis*
    ch. 10): the simple-span end rotations θA0 = a·b(L + b)/(6EIL),
    θB0 = a·b(L + a)/(6EIL) (AISC Manual Table 3-23 case 8) are reduced by the end
    moments: θA = θA0 − MA·L/(3EI) − MB·L/(6EI), θB = θB0 − MA·L/(6EI) − MB·L/(3EI),
    with MA = K_left·θA, MB = K_right·θB. K = 0: pinned; K → ∞: fixed (then
    MA = a·b²/L², MB = a²·b/L², case 16). Solved in closed form (2 × 2).
    """
    L, a, EI, KL, KR = np.broadcast_arrays(*(np.asarray(v, float)
                                             for v in (L, a, EI, K_left, K_right)))
    x = np.clip(a, 0.0, L)
    b = L - x
    tA = x * b * (L + b) / (6.0 * EI * L)
    tB = x * b * (L + x) / (6.0 * EI * L)
    f11 = L / (3.0 * EI)
    f12 = L / (6.0 * EI)
    # MA/KL + f11·MA + f12·MB = tA ; MB/KR + f12·MA + f11·MB = tB
    with np.errstate(divide="ignore"):
        gA = np.where(KL > 0.0, 1.0 / np.where(KL > 0.0, KL, 1.0), np.inf)
        gB = np.where(KR > 0.0, 1.0 / np.where(KR > 0.0, KR, 1.0), np.inf)
    a11 = gA + f11
    a22 = gB + f11
    det = a11 * a22 - f12 * f12
    with np.errstate(invalid="ignore", divide="ignore"):
        MA = (tA * a22 - f12 * tB) / det
        MB = (a11 * tB - f12 * tA) / det
    MA = np.where(np.isinf(gA), 0.0, MA)
    MB = np.where(np.isinf(gB), 0.0, MB)
    # one end pinned: the other end moment is that of a propped span
    MA = np.where(np.isinf(gB) & ~np.isinf(gA), tA / a11, MA)
    MB = np.where(np.isinf(gA) & ~np.isinf(gB), tB / a22, MB)
    return MA, MB


def continuous_strip_sagging_moment(L: ArrayLike, a: ArrayLike, EI: ArrayLike,
                                    K_left: ArrayLike, K_right: ArrayLike) -> np.ndarray:
    """Sagging moment under a unit load at ``a`` of a span with end springs, N·m per N:
    M = a·b/L − (MA·b + MB·a)/L (statics; superposition of the simple-span moment
    and the end moments of :func:`continuous_strip_end_moments`). Zero on a
    support line (a = 0 or a = L): the load then goes straight into the support."""
    L, a = np.broadcast_arrays(np.asarray(L, float), np.asarray(a, float))
    x = np.clip(a, 0.0, L)
    b = L - x
    MA, MB = continuous_strip_end_moments(L, x, EI, K_left, K_right)
    return np.maximum(x * b / L - (MA * b + MB * x) / L, 0.0)


def continuous_strip_compliance(L: ArrayLike, a: ArrayLike, EI: ArrayLike,
                                K_left: ArrayLike, K_right: ArrayLike) -> np.ndarray:
    """Deflection under a unit load at ``a`` of a span with end springs, m/N.

    δ = a²b²/(3EIL) − MA·a·b(L + b)/(6EIL) − MB·a·b(L + a)/(6EIL): the simple-span
    value (AISC Manual Table 3-23 case 8) less the deflections of the end moments
    at x = a (Maxwell–Betti: deflection at a from an end moment equals the end
    rotation from a unit load at a): :func:`strip_green` at x = a, the springs over
    EI. EI per strip width in N·m².
    """
    EI = np.asarray(EI, float)
    return strip_green(L, a, a, np.asarray(K_left, float) / EI,
                       np.asarray(K_right, float) / EI) / EI


def strip_green(L: ArrayLike, x: ArrayLike, xi: ArrayLike, K_left: ArrayLike,
                K_right: ArrayLike) -> np.ndarray:
    """Deflection at ``x`` under a unit load at ``xi`` of a span L with rotational end
    springs, at EI = 1 (m³; divide by EI in N·m² for m/N); ``K_left``, ``K_right``
    are the springs over EI (1/m, 0 = pinned).

    G(x, ξ) = x₁·b·(L² − b² − x₁²)/(6L) − MA(ξ)·x(L − x)(2L − x)/(6L)
    − MB(ξ)·x(L² − x²)/(6L), with x₁ = min(x, ξ), b = L − max(x, ξ): the simple
    span's deflection (AISC Manual Table 3-23 case 8) less that of the end moments
    of :func:`continuous_strip_end_moments` (Table 3-23 cases 11–12 for a moment at
    one end); at x = ξ the point compliance (:func:`continuous_strip_compliance`);
    symmetric in x and ξ (Maxwell–Betti)."""
    L, x, xi = np.broadcast_arrays(*(np.asarray(v, float) for v in (L, x, xi)))
    xc, xic = np.clip(x, 0.0, L), np.clip(xi, 0.0, L)
    lo = np.minimum(xc, xic)
    b = L - np.maximum(xc, xic)
    MA, MB = continuous_strip_end_moments(L, xic, 1.0, K_left, K_right)
    with np.errstate(divide="ignore", invalid="ignore"):
        g = (lo * b * (L**2 - b**2 - lo**2)
             - MA * xc * (L - xc) * (2.0 * L - xc) - MB * xc * (L**2 - xc**2)) / (6.0 * L)
    return np.where(L > 0.0, np.maximum(g, 0.0), 0.0)


def rigid_base_strip_compliance(L: ArrayLike, pos: ArrayLike, extent: ArrayLike,
                                K_left: ArrayLike, K_right: ArrayLike) -> np.ndarray:
    """Deflection of a rigid base under a unit load at ``pos`` (its centre; the
    load's centre of mass over it), extent ``extent`` along a span L with rotational
    end springs (over EI, 1/m), at EI = 1: m³ (divide by EI for m/N).

    A straight rigid base on a sagging strip bears at its two ends, x₁ and x₂ (the
    strip's deflection under point loads lies below the chord between them: the
    simple span's curve is concave between a support and the load, AISC Manual
    Table 3-23 case 8), or on a support line where it reaches one (a support is
    rigid): x₁ = clip(pos − c/2, 0, L), x₂ = clip(pos + c/2, 0, L). The lever rule
    gives the end reactions t₁ = (x₂ − pos)/(x₂ − x₁), t₂ = 1 − t₁ and the base's
    deflection at the load (energy, Maxwell–Betti):

    g = t₁²·G(x₁, x₁) + 2·t₁·t₂·G(x₁, x₂) + t₂²·G(x₂, x₂)    (:func:`strip_green`).

    Continuous: c → 0 gives the point load G(pos, pos); a base over both support
    lines gives 0 (it rests on the members). Where end restraint makes the strip
    bear against the base between its ends as well, the base is stiffer than this
    (more contact): the two-point value is the upper estimate of the compliance
    (tests/solver/test_rigid_base_strip.py measures it against a many-point,
    compression-only contact solution: within 0.7 % for the interior restraint
    K = 2√3·EI/L)."""
    L, pos, c = np.broadcast_arrays(*(np.asarray(v, float) for v in (L, pos, extent)))
    p = np.clip(pos, 0.0, L)
    x1 = np.clip(p - 0.5 * c, 0.0, L)
    x2 = np.clip(p + 0.5 * c, 0.0, L)
    w = x2 - x1
    tiny = 1e-9 * np.maximum(L, 1.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        t1 = np.where(w > tiny, (x2 - p) / np.where(w > tiny, w, 1.0), 0.5)
    t2 = 1.0 - t1
    g = (t1**2 * strip_green(L, x1, x1, K_left, K_right)
         + 2.0 * t1 * t2 * strip_green(L, x1, x2, K_left, K_right)
         + t2**2 * strip_green(L, x2, x2, K_left, K_right))
    return np.where(w > tiny, np.maximum(g, 0.0), strip_green(L, p, p, K_left, K_right))


# ------------------------------------------------------------------ yield lines
def fan_collapse_load(m: ArrayLike, m_neg: ArrayLike, r_load: ArrayLike,
                      R_max: ArrayLike) -> np.ndarray:
    """Collapse load of the conical fan under a circular patch (radius r_load) with
    its hogging circle at radius R ≤ R_max (the nearest support line), N.

    Virtual work with the cone w = δ(1 − ρ/R): internal 2π(m + m′)·δ whatever R,
    external P·δ·(1 − 2r/(3R)) for the load spread over ρ ≤ r, hence
    P = 2π(m + m′)/(1 − 2r/(3R)), least at R = R_max (Johansen; Park & Gamble
    2nd ed. ch. 10, concentrated loads — from memory); a point load gives
    P = 2π(m + m′). m, m′ in N·m/m (sagging, hogging; an orthotropic slab takes
    m = √(mx·my), the affinity theorem). Where the support is inside the loaded
    circle (R_max ≤ r) no fan forms: inf.
    """
    m, mn, r, R = np.broadcast_arrays(*(np.asarray(v, float)
                                        for v in (m, m_neg, r_load, R_max)))
    with np.errstate(divide="ignore", invalid="ignore"):
        denom = 1.0 - 2.0 * r / (3.0 * R)
        P = 2.0 * math.pi * (m + mn) / denom
    return np.where((R > r) & (R > 0.0), P, np.inf)


def panel_pattern_collapse_load(Lx: ArrayLike, Ly: ArrayLike, x: ArrayLike, y: ArrayLike,
                                mx: ArrayLike, my: ArrayLike,
                                mneg_x0: ArrayLike = 0.0, mneg_x1: ArrayLike = 0.0,
                                mneg_y0: ArrayLike = 0.0, mneg_y1: ArrayLike = 0.0
                                ) -> np.ndarray:
    """Collapse load of a rectangular panel Lx × Ly supported on its four edges under
    a point load at (x, y), four triangular segments meeting under the load, N.

    Each segment turns about its edge; the work of the moments is the moment times
    the yield lines' projection on the axis of rotation (Johansen; Park & Gamble
    ch. 9): P = (mx + m′x0)·Ly/x + (mx + m′x1)·Ly/(Lx − x)
    + (my + m′y0)·Lx/y + (my + m′y1)·Lx/(Ly − y).
    mx bends the span along x (bars along x), my along y; m′ the hogging capacity
    along each edge (x = 0, x = Lx, y = 0, y = Ly), N·m/m. Check values: a square
    simply supported panel loaded at its centre gives 8m, a rectangle
    4m(Lx/Ly + Ly/Lx) (Park & Gamble). A load on an edge: inf.
    """
    Lx, Ly, x, y, mx, my, a0, a1, b0, b1 = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (Lx, Ly, x, y, mx, my, mneg_x0, mneg_x1,
                                         mneg_y0, mneg_y1)))
    inside = (x > 0.0) & (x < Lx) & (y > 0.0) & (y < Ly)
    with np.errstate(divide="ignore", invalid="ignore"):
        P = ((mx + a0) * Ly / x + (mx + a1) * Ly / (Lx - x)
             + (my + b0) * Lx / y + (my + b1) * Lx / (Ly - y))
    return np.where(inside, P, np.inf)


def one_way_strip_collapse_load(L: ArrayLike, a: ArrayLike, b_eff: ArrayLike, m: ArrayLike,
                                m_neg_left: ArrayLike = 0.0,
                                m_neg_right: ArrayLike = 0.0) -> np.ndarray:
    """Collapse load of a one-way strip of width b_eff under a load at ``a``: a
    sagging line under the load and hogging lines over the supports, N.

    P = b_eff·[(m + m′_l)/a + (m + m′_r)/(L − a)] (virtual work; at midspan with
    m′_l = m′_r = m′: P = 4·b_eff·(m + m′)/L, Park & Gamble — from memory; the
    beam form is AISC/Neal's plastic collapse load Mp·L/(a·b) for m′ = 0).
    m, m′ in N·m/m; a load on a support line: inf.
    """
    L, a, b, m, ml, mr = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (L, a, b_eff, m, m_neg_left, m_neg_right)))
    inside = (a > 0.0) & (a < L)
    with np.errstate(divide="ignore", invalid="ignore"):
        P = b * ((m + ml) / a + (m + mr) / (L - a))
    return np.where(inside, P, np.inf)


def yield_line_resistance(Lx: ArrayLike, Ly: ArrayLike, x: ArrayLike, y: ArrayLike,
                          mx: ArrayLike, my: ArrayLike, r_load: ArrayLike,
                          mneg_x: ArrayLike = 0.0, mneg_y: ArrayLike = 0.0,
                          m_top_field: ArrayLike = 0.0) -> np.ndarray:
    """Yield-line resistance of the struck panel (Lx × Ly, supported on all four
    sides by beams and girders, continuous over them), N: the least of

    * the fan, 2π·√((mx + m_t)(my + m_t))/(1 − 2r/(3R)), R = distance from the load
      to the nearest support line, m_t the hogging capacity of any top bars over
      the whole panel (``m_top_field``; 0 when the top bars stop near the
      supports) — :func:`fan_collapse_load`, orthotropic by the affinity theorem;
    * the four-segment pattern with hogging ``mneg_x`` over the edges x = 0, Lx
      (top bars over the beams) and ``mneg_y`` over y = 0, Ly —
      :func:`panel_pattern_collapse_load`.

    Both are upper bounds (Johansen; Park & Gamble ch. 9–10); the least is taken.
    A load on a support line: inf (it bears on the steel). Moments in N·m/m, m.
    """
    Lx, Ly, x, y = np.broadcast_arrays(*(np.asarray(v, float) for v in (Lx, Ly, x, y)))
    R = np.minimum(np.minimum(x, Lx - x), np.minimum(y, Ly - y))
    mx_a, my_a, mt = (np.asarray(v, float) for v in (mx, my, m_top_field))
    m_fan = np.sqrt((mx_a + mt) * (my_a + mt))
    fan = fan_collapse_load(m_fan, 0.0, r_load, R)
    pattern = panel_pattern_collapse_load(Lx, Ly, x, y, mx, my, mneg_x, mneg_x, mneg_y,
                                          mneg_y)
    return np.minimum(fan, pattern)


def slab_support_rotation(delta_m: ArrayLike, dist_support: ArrayLike) -> np.ndarray:
    """Support rotation of the yield-line mechanism, rad: θ = atan(δm/ℓ) with ℓ the
    distance from the load to the nearest support line (the segments turn about
    their supports; UFC 3-340-02 ch. 4 support rotation — from memory)."""
    d, ell = np.broadcast_arrays(np.asarray(delta_m, float), np.asarray(dist_support, float))
    with np.errstate(divide="ignore", invalid="ignore"):
        theta = np.arctan(d / ell)
    return np.where(ell > 0.0, theta, np.where(d > 0.0, math.pi / 2.0, 0.0))


def series_resistance(R1: ArrayLike, f1: ArrayLike, R2: ArrayLike, f2: ArrayLike
                      ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Two elastic–perfectly-plastic springs in series (slab on framing): the force
    is common, so the pair yields at R = min(R1, R2) with the yield deflection
    δy = R·(f1 + f2) of both springs; beyond it only the weaker one deforms.
    Returns ``(R, δy, first)`` with ``first`` = 1 where spring 1 yields first,
    2 otherwise (Biggs 1964 ch. 5 resistance functions; UFC 3-340-02 ch. 3 —
    from memory). R in N, f in m/N, δy in m."""
    R1, f1, R2, f2 = np.broadcast_arrays(*(np.asarray(v, float) for v in (R1, f1, R2, f2)))
    R = np.minimum(R1, R2)
    first = np.where(R1 <= R2, 1, 2)
    return R, R * (f1 + f2), first


# ------------------------------------------------------------------ free edges, openings
def effective_width_with_edges(b_e: ArrayLike, load_width: ArrayLike, e_left: ArrayLike,
                               e_right: ArrayLike) -> np.ndarray:
    """Effective width of a one-way strip next to free edges, m: each half of the
    width b_e spreads sideways from the load only as far as the slab goes,
    b = min(b_e/2, w/2 + e_l) + min(b_e/2, w/2 + e_r), with e the clear distance
    from the load's side to a free edge or opening (inf where none)
    (common practice, no source; BS 8110-1 cl. 3.5.2.2 limits the width near an
    unsupported edge in the same way — from memory)."""
    b, w, el, er = np.broadcast_arrays(*(np.asarray(v, float)
                                         for v in (b_e, load_width, e_left, e_right)))
    return (np.minimum(0.5 * b, 0.5 * w + np.maximum(el, 0.0))
            + np.minimum(0.5 * b, 0.5 * w + np.maximum(er, 0.0)))


def control_perimeter_edges(cx: ArrayLike, cy: ArrayLike, d: ArrayLike,
                            e_x0: ArrayLike = np.inf, e_x1: ArrayLike = np.inf,
                            e_y0: ArrayLike = np.inf, e_y1: ArrayLike = np.inf
                            ) -> np.ndarray:
    """Basic control perimeter u1 at 2d from a rectangular loaded area cx × cy,
    shortened at free edges, m.

    EN 1992-1-1 §6.4.2(1): u1 = 2(cx + cy) + 4π·d (straight faces at 2d joined by
    quarter circles of radius 2d). §6.4.2(4), Fig. 6.15 (loaded area near an edge
    or corner, used when shorter): a face closer than 2d to a free edge (clear
    distance e) loses its part of the perimeter, and the perimeter runs straight
    from the adjacent faces to the edge; so each corner contributes πd between two
    open faces, e (the edge distance of the closed face) between an open and a
    closed face, and 0 between two closed faces. e in m (inf: no free edge).
    """
    cx, cy, d, ex0, ex1, ey0, ey1 = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (cx, cy, d, e_x0, e_x1, e_y0, e_y1)))
    # faces: x0 and x1 run along y (length cy); y0 and y1 run along x (length cx)
    open_x0, open_x1 = ex0 >= 2.0 * d, ex1 >= 2.0 * d
    open_y0, open_y1 = ey0 >= 2.0 * d, ey1 >= 2.0 * d
    u = (np.where(open_x0, cy, 0.0) + np.where(open_x1, cy, 0.0)
         + np.where(open_y0, cx, 0.0) + np.where(open_y1, cx, 0.0))

    def corner(o1: np.ndarray, e1: np.ndarray, o2: np.ndarray, e2: np.ndarray) -> np.ndarray:
        return np.where(o1 & o2, math.pi * d,
                        np.where(o1 & ~o2, np.maximum(e2, 0.0),
                                 np.where(~o1 & o2, np.maximum(e1, 0.0), 0.0)))

    u = u + (corner(open_x0, ex0, open_y0, ey0) + corner(open_x0, ex0, open_y1, ey1)
             + corner(open_x1, ex1, open_y0, ey0) + corner(open_x1, ex1, open_y1, ey1))
    return u


def loaded_perimeter_edges(cx: ArrayLike, cy: ArrayLike, d: ArrayLike,
                           e_x0: ArrayLike = np.inf, e_x1: ArrayLike = np.inf,
                           e_y0: ArrayLike = np.inf, e_y1: ArrayLike = np.inf
                           ) -> np.ndarray:
    """Perimeter u0 of the loaded area for the crushing strut check, m.

    EN 1992-1-1 §6.4.5(3) (from memory of the clause): interior u0 = 2(cx + cy);
    at an edge u0 = c2 + 3d ≤ c2 + 2c1 (c2 along the edge); at a corner
    u0 = 3d ≤ c1 + c2. "At an edge" here: a clear distance to the free edge < d
    (common practice, no source: the clause is written for areas at the edge).
    """
    cx, cy, d, ex0, ex1, ey0, ey1 = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (cx, cy, d, e_x0, e_x1, e_y0, e_y1)))
    near_x = (ex0 < d) | (ex1 < d)
    near_y = (ey0 < d) | (ey1 < d)
    interior = 2.0 * (cx + cy)
    edge_x = np.minimum(cy + 3.0 * d, cy + 2.0 * cx)  # edge parallel to y
    edge_y = np.minimum(cx + 3.0 * d, cx + 2.0 * cy)
    corner = np.minimum(3.0 * d, cx + cy)
    return np.where(near_x & near_y, corner,
                    np.where(near_x, edge_x, np.where(near_y, edge_y, interior)))


def opening_ineffective_length(px: ArrayLike, py: ArrayLike, cx: ArrayLike, cy: ArrayLike,
                               d: ArrayLike, opening: tuple[float, float, float, float],
                               samples: int = 720) -> np.ndarray:
    """Length of the basic control perimeter u1 made ineffective by a rectangular
    opening (x0, y0, x1, y1), m.

    EN 1992-1-1 §6.4.2(3), Fig. 6.14: where the opening is no farther than 6d from
    the loaded area's periphery, the part of u1 between the two tangents drawn from
    the loaded area's centre to the opening's outline is ineffective (the √(l1·l2)
    relief of the figure for long openings is not taken: conservative). The
    perimeter (rounded rectangle at 2d around the cx × cy area centred at
    (px, py)) is sampled at ``samples`` points; vectorised over drop points.
    """
    arrs = np.broadcast_arrays(*(np.asarray(v, float) for v in (px, py, cx, cy, d)))
    shape = arrs[0].shape
    px, py, cx, cy, d = (v.reshape(-1) for v in arrs)
    x0, y0, x1, y1 = opening
    # clear gap from the loaded area to the opening (rectangle–rectangle distance)
    gx = np.maximum(0.0, np.maximum(x0 - (px + cx / 2), (px - cx / 2) - x1))
    gy = np.maximum(0.0, np.maximum(y0 - (py + cy / 2), (py - cy / 2) - y1))
    gap = np.hypot(gx, gy)
    inside = (px >= x0) & (px <= x1) & (py >= y0) & (py <= y1)
    # angular window of the opening seen from the centre (relative to its centre)
    ocx, ocy = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
    ref = np.arctan2(ocy - py, ocx - px)
    corners = np.stack([np.arctan2(cyy - py, cxx - px)
                        for cxx, cyy in ((x0, y0), (x0, y1), (x1, y0), (x1, y1))], axis=-1)
    rel = (corners - ref[..., None] + math.pi) % (2.0 * math.pi) - math.pi
    lo, hi = rel.min(axis=-1), rel.max(axis=-1)
    # sample the rounded rectangle: parameter t along its length
    t = (np.arange(samples) + 0.5) / samples
    r = 2.0 * d[..., None]
    hx, hy = cx[..., None] / 2.0, cy[..., None] / 2.0
    u1 = 2.0 * (cx + cy)[..., None] + 2.0 * math.pi * r
    s = t * u1
    # walk: right face (x = hx + r, y from −hy to hy), arc, top face, arc, left, arc,
    # bottom, arc
    quarter = math.pi * d  # a quarter circle of radius 2d
    bounds = np.cumsum(np.stack([cy, quarter, cx, quarter, cy, quarter, cx, quarter],
                                axis=-1), axis=-1)
    X = np.zeros_like(s)
    Y = np.zeros_like(s)
    start = np.zeros_like(s)
    centres = [(+1, -1), (+1, +1), (-1, +1), (-1, -1)]
    for k in range(8):
        end = bounds[..., k:k + 1]
        sel = (s >= start) & (s < end)
        q = s - start
        if k % 2 == 0:  # straight faces
            if k == 0:
                xs, ys = hx + r, -hy + q
            elif k == 2:
                xs, ys = hx - q, hy + r
            elif k == 4:
                xs, ys = -hx - r, hy - q
            else:
                xs, ys = -hx + q, -hy - r
        else:
            sx, sy = centres[(k + 1) // 2 % 4]
            ang0 = (k // 2) * 0.5 * math.pi
            with np.errstate(invalid="ignore", divide="ignore"):
                ang = ang0 + q / np.where(r > 0.0, r, 1.0)
            xs = sx * hx + r * np.cos(ang)
            ys = sy * hy + r * np.sin(ang)
        X = np.where(sel, xs, X)
        Y = np.where(sel, ys, Y)
        start = np.broadcast_to(end, s.shape).copy()
    ang = np.arctan2(Y, X)
    rel_s = (ang - ref[..., None] + math.pi) % (2.0 * math.pi) - math.pi
    within = (rel_s >= lo[..., None]) & (rel_s <= hi[..., None])
    length = np.sum(within, axis=-1) * (u1[..., 0] / samples)
    near = gap <= 6.0 * d
    return np.where(inside, u1[..., 0], np.where(near, length, 0.0)).reshape(shape)


# ------------------------------------------------------------------ composite decks
def topping_depth(thickness: ArrayLike, rib_height: ArrayLike) -> np.ndarray:
    """Depth of concrete over the ribs of a profiled-sheet composite slab, m:
    h_c = h − h_p. EN 1994-1-1 §9.7.6 takes the punching perimeter and depth over
    the ribs with h_c, and the local slab flexure between ribs is that of the
    topping (from memory of the clause). A solid slab has h_p = 0."""
    h, hp = np.broadcast_arrays(np.asarray(thickness, float), np.asarray(rib_height, float))
    if np.any(hp < 0.0) or np.any(hp >= h):
        raise ValueError("deck.rib_height: must be ≥ 0 and less than the slab thickness")
    return h - hp
