"""Protection pads and mats by area: what a pad gives depends on how much of the
load's footprint lands on it.

A crushable layer (timber-and-foam pad, honeycomb, EPS) crushes at a stress, not
at a force: its crushing force is the crush stress times the area that is
actually pressed — the overlap of the load's footprint and the pad. A footprint
half on a pad gets half the credit, however its centre falls. A spring mat
(rubber, timber crane mat on a soft layer) has stiffness E_c·A/t over the same
overlap (a layer in uniaxial compression, Gere §2.3 with the constrained modulus
of the mat material).

Rectangles are axis-aligned, (x0, y0, x1, y1) in m; vectorised over drop points.
SI units: m, m², Pa, N, N/m.
"""

from __future__ import annotations

import itertools
from collections.abc import Callable, Sequence
from typing import NamedTuple

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "SPENT_LAYER_MODULUS",
    "SPENT_LAYER_STRENGTH",
    "crush_stress_from_force",
    "crushable_pad_force",
    "footprint_rect",
    "footprint_tip_offset",
    "rect_overlap_area",
    "spent_layer_compliance",
    "spring_mat_stiffness",
    "tilted_mat_stiffness",
    "tip_offset",
    "tip_offset_turn",
]

SPENT_LAYER_MODULUS = 370e6
"""Compression modulus of a crushable layer once its stroke is spent, Pa: softwood
across the grain, E_90,mean of strength class C24 (EN 338:2016 Table 1 — from
memory: E_0,mean/30 = 11 000/30 ≈ 370 MPa). The timber of a timber-and-foam pad is
its stiffest common constituent before the cells collapse (a densified foam is
softer); a stiffer spent layer gives the higher contact force. A hardwood bearer
(D40, E_90,mean ≈ 860 MPa) would be stiffer: a layer of that kind needs its own value
(README, limits)."""


def footprint_rect(x: ArrayLike, y: ArrayLike, length: ArrayLike, width: ArrayLike,
                   along_x: bool = True) -> tuple[np.ndarray, np.ndarray, np.ndarray,
                                                  np.ndarray]:
    """Footprint rectangle (x0, y0, x1, y1) of a load centred at (x, y), m; its
    ``length`` along x (``along_x``) or along y."""
    x, y, L, B = np.broadcast_arrays(*(np.asarray(v, float) for v in (x, y, length, width)))
    hx, hy = (0.5 * L, 0.5 * B) if along_x else (0.5 * B, 0.5 * L)
    return x - hx, y - hy, x + hx, y + hy


def rect_overlap_area(a: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike],
                      b: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike]) -> np.ndarray:
    """Area common to two axis-aligned rectangles, m²:
    max(0, min(x1) − max(x0))·max(0, min(y1) − max(y0)) (plane geometry)."""
    ax0, ay0, ax1, ay1 = (np.asarray(v, float) for v in a)
    bx0, by0, bx1, by1 = (np.asarray(v, float) for v in b)
    dx = np.maximum(0.0, np.minimum(ax1, bx1) - np.maximum(ax0, bx0))
    dy = np.maximum(0.0, np.minimum(ay1, by1) - np.maximum(ay0, by0))
    return dx * dy


def crushable_pad_force(crush_stress: ArrayLike, overlap_area: ArrayLike) -> np.ndarray:
    """Crushing force of a pad under the part of the footprint on it, N:
    F_c = σ_c·A_overlap (plateau stress of a crushable layer times the pressed
    area; Gibson & Ashby, *Cellular Solids* 2nd ed. 1997, ch. 5 plateau stress —
    from memory). No overlap: no credit (F_c = 0)."""
    return np.asarray(crush_stress, float) * np.asarray(overlap_area, float)


def spring_mat_stiffness(modulus: ArrayLike, thickness: ArrayLike,
                         overlap_area: ArrayLike) -> np.ndarray:
    """Stiffness of a mat layer under the pressed area, N/m: k = E_c·A/t (a layer in
    uniaxial compression, Gere §2.3; E_c the mat's compression modulus in Pa, t in
    m). No overlap: 0 (the mat does not act)."""
    E, t, A = np.broadcast_arrays(*(np.asarray(v, float) for v in (modulus, thickness,
                                                                   overlap_area)))
    if np.any(t <= 0.0):
        raise ValueError("protection thickness: must be > 0 m for a spring mat")
    return E * A / t


def tilted_mat_stiffness(modulus: ArrayLike, thickness: ArrayLike, length: ArrayLike,
                         width: ArrayLike) -> np.ndarray:
    """Stiffness credited to a spring mat of compression modulus ``modulus`` (Pa) and
    ``thickness`` t (m) under a base ``length`` × ``width`` (m) that lands tilted on
    one edge, N/m: the whole base's, the pressure spread 1:1 through the mat,

        k = 1 / ∫₀ᵗ dz / (E·(a + 2z)(b + 2z))        (:func:`spent_layer_compliance`)

    Why the whole base and not the edge strip: the band of mat under a tilted base
    widens as its edge sinks (x = w₀ + δ/tan θ, a plane pressed in at θ), so the mat's
    force grows faster than linearly, dF/dδ = k(x) (each slice in uniaxial compression,
    Gere §2.3; on a column bed k(x) = E·ℓ·x/t). Its slope never exceeds the whole
    base's k, so at any force F the mat holds the energy ∫F dδ ≥ F²/(2k): a linear
    spring of the whole base's stiffness reads the force of a given energy at least as
    high, whatever the tilt, the fall or the floor (an upper bound on the tangent
    stiffness; the strip's own E·w₀·ℓ/t is the least slope and read the force of a
    2-DOF body on a column bed at 0.27–0.56 ×, the whole base at 1.6–3.0 ×,
    ``tests/solver/test_tilted_mat.py``). The 1:1
    spread through the mat's thickness, as the footprint spreads to the deck
    (EN 1994-1-1 §9.4.3(2) — from memory), makes it stiffer than E·a·b/t (the higher
    force). Vectorised; SI units."""
    E, t, a, b = np.broadcast_arrays(*(np.asarray(v, float) for v in (modulus, thickness,
                                                                     length, width)))
    if np.any(~(t > 0.0)):
        raise ValueError("protection thickness: must be > 0 m for a spring mat")
    return 1.0 / spent_layer_compliance(a, b, t, E)


def crush_stress_from_force(crush_force: float, footprint_area: float) -> float:
    """Crush stress of a pad described by a crush force, Pa: σ_c = F_c/A, with A the
    declared load footprint the force was meant for (used to read older project
    files; the reader warns that the stress was derived)."""
    if footprint_area <= 0.0:
        raise ValueError("footprint area: must be > 0 m² to turn a crush force into a stress")
    return crush_force / footprint_area


def spent_layer_compliance(length: ArrayLike, width: ArrayLike, residual: ArrayLike,
                           modulus: ArrayLike = SPENT_LAYER_MODULUS) -> np.ndarray:
    """Compliance of what is left of a crushable layer once its stroke is spent, m/N:
    the residual thickness t_r = thickness − stroke (m) under the contact
    ``length`` × ``width`` (a, b in m), the pressure spreading at 1:1 through it (as
    through every layer, common practice, no source), each slice dz in uniaxial
    compression (Gere §2.3: dδ = F·dz/(E·A(z))), A(z) = (a + 2z)(b + 2z):

        f = ∫₀^t_r dz / (E·(a + 2z)(b + 2z))
          = ln[(a + 2t_r)·b / (a·(b + 2t_r))] / (2E·(b − a))      (a ≠ b)
          = t_r / (E·a·(a + 2t_r))                               (a = b)

    E = ``modulus`` (Pa, :data:`SPENT_LAYER_MODULUS`). The spread makes the layer
    stiffer than a column of the contact's own area (t_r/(E·a·b)): the higher
    contact force. t_r = 0 (a layer crushed through): 0. Vectorised."""
    a, b, t, E = np.broadcast_arrays(*(np.asarray(v, float) for v in (length, width,
                                                                     residual, modulus)))
    if np.any(~(a > 0.0)) or np.any(~(b > 0.0)):
        raise ValueError("contact sides: must be > 0 m for a spent layer's compliance")
    if np.any(~(E > 0.0)):
        raise ValueError("spent layer modulus: must be > 0 Pa")
    t = np.maximum(t, 0.0)
    near = np.abs(b - a) <= 1e-9 * np.maximum(a, b)
    with np.errstate(divide="ignore", invalid="ignore"):
        diff = np.log((a + 2.0 * t) * b / (a * (b + 2.0 * t))) / (2.0 * E * (b - a))
    same = t / (E * a * (a + 2.0 * t))
    return np.where(t > 0.0, np.where(near, same, diff), 0.0)


SPENT_LAYER_STRENGTH = 2.5e6
"""Crushing stress of what is left of a crushable layer once its stroke is spent, Pa:
softwood across the grain, f_c,90,k of strength class C24 (EN 338:2016 Table 1 — from
memory: 2.5 MPa), the same spent layer as :data:`SPENT_LAYER_MODULUS`. It enters only
the tip-off bound (:func:`tip_offset`) as the least stress at which the spent layer
yields under a load's edge, and only away from the layer's free edges
(:func:`footprint_tip_offset`); a weaker residual (a layer with no timber in it)
needs its own value (README, limits)."""

Segment = tuple[ArrayLike, ArrayLike, ArrayLike, float, float, ArrayLike, ArrayLike, float]
"""(s0, s1, b, σ_c, s_c, r0, r1, σ_2) of :func:`tip_offset`."""


def _plateau_work(u: np.ndarray, sigma: float, stroke: float) -> np.ndarray:
    """Ω(u) = ∫₀ᵘ σ_c·min(v, s_c) dv, J/m (Pa·m²): the antiderivative in u of the
    plateau's least work per unit area σ_c·min(u, s_c) of a layer crushed by u (m;
    0 for u ≤ 0), so that ∫ σ_c·min(t − θs, s_c) ds = [Ω(t − θs0) − Ω(t − θs1)]/θ.
    The spent part is :func:`_spent_integral`'s."""
    u = np.maximum(u, 0.0)
    a = np.minimum(u, stroke)
    return sigma * (0.5 * a * a + stroke * (u - a))


def _spent_integral(th: np.ndarray, t: float, stroke: float, lo: np.ndarray,
                    hi: np.ndarray, r0: np.ndarray, r1: np.ndarray) -> np.ndarray:
    """∫ from lo to hi of ρ(s)·clip(t − θs − s_c, 0, t − s_c) ds, m² (times σ_2: the
    spent part's work, J/m): ρ(s) = clip((s − r0)/(r1 − r0), 0, 1) the share of its
    strength the spent layer has at s (r1 ≤ r0: all of it). Both factors are linear
    between the breakpoints r0, r1 and s = (t − s_c)/θ, so Simpson's rule on each
    piece between them is exact (the product of two linear functions)."""
    t_r = max(t - stroke, 0.0)
    kink = np.where(th > 0.0, t_r / np.where(th > 0.0, th, 1.0), np.inf)
    ramp = r1 > r0
    span = np.where(ramp, r1 - r0, 1.0)

    def f(s: np.ndarray) -> np.ndarray:
        rho = np.where(ramp, np.minimum(np.maximum((s - r0) / span, 0.0), 1.0), 1.0)
        return rho * np.minimum(np.maximum(t - th * s - stroke, 0.0), t_r)

    cuts = np.sort(np.stack([lo, hi, np.clip(r0, lo, hi), np.clip(r1, lo, hi),
                             np.clip(kink, lo, hi)]), axis=0)
    total = np.zeros(lo.shape)
    for a, b in itertools.pairwise(cuts):
        total = total + (b - a) / 6.0 * (f(a) + 4.0 * f(0.5 * (a + b)) + f(b))
    return total


class _Seg(NamedTuple):
    s0: np.ndarray
    s1: np.ndarray
    b: np.ndarray
    sig: float
    sc: float
    r0: np.ndarray
    r1: np.ndarray
    spent: float


def tip_offset(L: ArrayLike, weight: ArrayLike, t: float, segments: Sequence[Segment],
               iterations: int = 40, turn: bool = False) -> np.ndarray:
    """:func:`tip_offset_turn`'s Δ (m), or with ``turn`` its θ (rad)."""
    delta, theta = tip_offset_turn(L, weight, t, segments, iterations)
    return theta if turn else delta


def tip_offset_turn(L: ArrayLike, weight: ArrayLike, t: float, segments: Sequence[Segment],
                    iterations: int = 40) -> tuple[np.ndarray, np.ndarray]:
    """The height Δ (m) by which a load whose footprint lies partly on a crushable
    layer of thickness ``t`` (m) and tips over the layer's edge onto the deck falls
    less than its drop height H: the kinetic energy it can bring onto the deck with
    its lowest edge is at most W·(H − Δ). Vectorised over points.

    The footprint is ``L`` (m) long in the direction it tips, the edge it tips onto
    at s = 0; the layer lies under it in ``segments`` (s0, s1, b, σ_c, s_c, r0, r1,
    σ_2): from s0 to s1 (m from that edge), ``b`` (m) wide, crushing at its plateau
    σ_c (Pa) over its stroke s_c (m), then — what is left of it — at σ_2 (Pa) times
    ρ(s), the share of that strength it has at s (0 up to r0, rising linearly to 1 at
    r1: near the layer's free edge the spent layer is not relied on,
    :func:`footprint_tip_offset`). The load (weight W, N; its centre of mass over the
    footprint's centre) meets the layer's top, turns by θ and sinks until its edge
    reaches the deck (the edge has then fallen t below the layer's top): the layer
    under it is crushed by u(s) = t − θ·s, and the centre of mass has fallen
    H − θ·L/2 in all. Energy at the edge's contact — the work of gravity less the
    least work of the crushed layer (it gives none back):

        E_kin ≤ W·(H − θ·L/2) − P(θ) = W·(H − φ(θ)),   φ(θ) = θ·L/2 + P(θ)/W,
        P(θ) = Σ b·∫ [σ_c·min(u, s_c) + σ_2·ρ(s)·clip(u − s_c, 0, t − s_c)] ds,

    whatever turn θ ≥ 0 the motion takes, so Δ = min over θ of φ(θ) (derived; φ is
    convex — the integrand is convex in u, u linear in θ — and found by golden
    section; the least work of a plateau layer: Gibson & Ashby, *Cellular Solids* 2nd
    ed. 1997, ch. 5 — from memory — the stress never falls below the plateau). The
    bound needs no rotational inertia (a body of any mass distribution): the whole
    E_kin then meets the deck as the chain's whole mass does — for the edge's point
    m*·v_E² ≤ M·v² + I_G·ω² (Cauchy–Schwarz, m* = M/(1 + M·r²/I_G) of Goldsmith,
    *Impact* 1960 ch. 2 — from memory). No layer under the footprint: Δ = 0 (the bare
    deck from H). SI units. Returns Δ and the turn θ (rad) at which φ is least (the
    calculation trace shows it), from one search.
    """
    L, W = np.broadcast_arrays(np.asarray(L, float), np.asarray(weight, float))
    if np.any(~(L > 0.0)) or np.any(~(W > 0.0)):
        raise ValueError("tip-off: the footprint's length and the weight must be > 0")
    if not t > 0.0:
        raise ValueError(f"protection thickness: {t!r} m is not allowed; allowed: > 0 m")
    def arr(v: ArrayLike) -> np.ndarray:
        return np.broadcast_to(np.asarray(v, float), L.shape)

    segs = [_Seg(arr(sg[0]), arr(sg[1]), arr(sg[2]), float(sg[3]), float(sg[4]), arr(sg[5]),
                 arr(sg[6]), float(sg[7])) for sg in segments]
    for sg in segs:
        if not (sg.sig >= 0.0 and sg.sc >= 0.0 and sg.spent >= 0.0):
            raise ValueError("tip-off: crush stress, stroke and spent strength must be ≥ 0")

    def phi(th: np.ndarray) -> np.ndarray:
        P = np.zeros(L.shape)
        small = th <= 1e-12
        ths = np.where(small, 1.0, th)
        for s0, s1, b, sig, sc, r0, r1, sp in segs:
            sc_ = min(sc, t)
            # ∫ σ_c·min(u, s_c) ds over the segment, u = t − θ·s (ds = −du/θ); θ → 0:
            # the whole segment crushed through its stroke
            plat = np.where(small, sig * sc_ * (s1 - s0),
                            (_plateau_work(t - ths * s0, sig, sc_)
                             - _plateau_work(t - ths * s1, sig, sc_)) / ths)
            spent = sp * _spent_integral(np.where(small, 0.0, th), t, sc_, s0, s1, r0, r1) \
                if sp > 0.0 else 0.0
            P = P + b * (plat + spent)
        return th * L / 2.0 + P / W

    # the least φ lies below θ_hi: beyond t/s0 of the nearest segment nothing is
    # crushed (φ' = L/2 > 0); beyond t·√(σ_max·B/(W·L)) a crushed wedge's work falls
    # off faster than the centre of mass rises
    s_near = np.full(L.shape, np.inf)
    b_sum = np.zeros(L.shape)
    sig_max = 1.0
    for s0, _s1, b, sig, _sc, _r0, _r1, sp in segs:
        s_near = np.where(b > 0.0, np.minimum(s_near, s0), s_near)
        b_sum = b_sum + b
        sig_max = max(sig_max, sig + sp)
    wedge = t * np.sqrt(sig_max * np.maximum(b_sum, 1e-12) / (W * L)) + t / L
    hi = np.minimum(np.where(s_near > 0.0, t / np.where(s_near > 0.0, s_near, 1.0), np.inf),
                    wedge) * 1.01 + 1e-9
    return _least(phi, hi, iterations)


def _least(phi: Callable[[np.ndarray], np.ndarray], hi: np.ndarray,
           iterations: int) -> tuple[np.ndarray, np.ndarray]:
    """The least value of a convex ``phi`` over [0, ``hi``] per point and where it
    lies: golden section (one new value per step), and φ(0)."""
    r = (np.sqrt(5.0) - 1.0) / 2.0
    a, b_ = np.zeros(hi.shape), hi
    c, e = b_ - r * (b_ - a), a + r * (b_ - a)
    fc, fe = phi(c), phi(e)
    for _ in range(iterations):
        left = fc <= fe
        a, b_ = np.where(left, a, c), np.where(left, e, b_)
        x = np.where(left, b_ - r * (b_ - a), a + r * (b_ - a))
        fx = phi(x)
        c, e = np.where(left, x, e), np.where(left, c, x)
        fc, fe = np.where(left, fx, fe), np.where(left, fc, fx)
    f0 = phi(np.zeros(hi.shape))
    at = np.where(fc <= fe, c, e)
    least = np.minimum(fc, fe)
    return np.minimum(least, f0), np.where(f0 < least, 0.0, at)


_EDGE_COVERED = 1e-6
"""A footprint's edge counts as wholly on the layer where the deck under it is less
than this wide, m (rounding of the plan's coordinates)."""

_ABUTS = 1e-3
"""A layer's edge is not free where another layer of the group begins within this of
it, m (two pads laid edge to edge: the shared edge is no edge)."""


def footprint_tip_offset(rect: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike],
                         weight: ArrayLike, t: float,
                         layers: list[tuple[tuple[float, float, float, float], float, float]],
                         spent: float = SPENT_LAYER_STRENGTH,
                         deck: tuple[float, float, float, float] | None = None) -> np.ndarray:
    """:func:`tip_offset` of an axis-aligned footprint ``rect`` (x0, y0, x1, y1; m)
    over crushable ``layers`` of one thickness ``t`` (m), each ((x0, y0, x1, y1),
    crush stress Pa, stroke m), for a load of ``weight`` (N): the least Δ (m) over
    the four directions the load can tip in; ∞ where it can reach the deck in none
    (the footprint on the layers with a margin of at least 2·t beyond each of its
    edges); 0 where no layer lies under the footprint. Vectorised over points.

    What is left of a layer once its stroke is spent (stress ``spent``) is not relied
    on within t of its free edge, and gains its strength linearly over the next t
    (the 1:1 spread through a layer cut off at its edge; common practice, no source):
    a load's edge near a pad's edge may crush through it to the deck. A direction
    counts where the footprint's edge lies over the deck or within 2·t of the layer's
    free edge beyond it. Continuous as the footprint crosses the edge; the bound
    steepens where the spent part under the far end of the footprint takes hold.

    ``deck`` (x0, y0, x1, y1; m): the deck's plan extent. A layer's edge on the deck's
    edge is no free edge and the footprint beyond it counts as on the layer: a load
    tipping over it leaves the floor rather than striking the deck beside the pad (a
    fall off the floor's edge is not a drop onto its framing; README, limits)."""
    shape = np.broadcast_shapes(*(np.shape(v) for v in rect), np.shape(weight))
    return footprint_tip_turn(rect, weight, t, layers, spent, deck).delta.reshape(shape)


TIP_DIRECTIONS = ("+x", "−x", "+y", "−y")
"""The directions a footprint tips in (:func:`footprint_tip_turn`): its edge at the
larger x, the smaller x, the larger y, the smaller y."""


class TipTurn(NamedTuple):
    """:func:`footprint_tip_turn`'s answer per point: Δ (m), the turn θ (rad) at which
    φ(θ) is least, the footprint's length L in that direction (m) and the direction
    (index into :data:`TIP_DIRECTIONS`, −1 none)."""

    delta: np.ndarray
    theta: np.ndarray
    length: np.ndarray
    direction: np.ndarray


def footprint_tip_turn(rect: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike],
                       weight: ArrayLike, t: float,
                       layers: list[tuple[tuple[float, float, float, float], float, float]],
                       spent: float = SPENT_LAYER_STRENGTH,
                       deck: tuple[float, float, float, float] | None = None) -> TipTurn:
    """:func:`footprint_tip_offset` with the direction the least Δ is found in, the
    turn θ there and the length tipped over (:class:`TipTurn`): the numbers the
    calculation trace shows. Same arguments and units; flat arrays."""
    n = int(np.prod(np.broadcast_shapes(*(np.shape(v) for v in rect), np.shape(weight))))
    out = TipTurn(np.full(n, np.inf), np.full(n, np.nan), np.full(n, np.nan),
                  np.full(n, -1, dtype=np.int64))
    cases = _tip_cases(rect, weight, t, layers, spent, deck)
    if cases is None:
        return out
    at, L, W, segments, dirs = cases
    d, th = tip_offset_turn(L, W, t, segments)
    j = least_case(at, d)
    i = at[j]
    out.delta[i], out.theta[i] = d[j], th[j]
    out.length[i], out.direction[i] = L[j], dirs[j]
    return out


def least_case(at: np.ndarray, d: np.ndarray) -> np.ndarray:
    """The case each point keeps of the cases ``at`` (the point of each case) with
    values ``d``: the least d of the point, of equal ones the last in the cases' order
    (a NaN never). Indices into the cases, one per point that has a case with a
    number. Sorting, vectorised; :func:`_least_case_reference` is the plain loop it
    equals (the descending walk that keeps every value at most the kept one)."""
    j = np.flatnonzero(~np.isnan(d))
    if j.size == 0:
        return j
    # by point, then d ascending, then the later case first
    order = j[np.lexsort((-j, d[j], at[j]))]
    first = np.ones(order.size, dtype=bool)
    first[1:] = at[order[1:]] != at[order[:-1]]
    return order[first]


def _least_case_reference(at: np.ndarray, d: np.ndarray) -> dict[int, int]:
    """:func:`least_case` as the plain loop (point -> case): the cases walked by
    descending d, each that is at most the point's kept value kept — the least stays,
    of equal ones the last."""
    kept: dict[int, int] = {}
    best: dict[int, float] = {}
    for j in np.argsort(-d, kind="stable"):
        i = int(at[j])
        if d[j] <= best.get(i, np.inf):
            kept[i], best[i] = int(j), float(d[j])
    return kept


def _tip_cases(rect: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike], weight: ArrayLike,
               t: float, layers: list[tuple[tuple[float, float, float, float], float, float]],
               spent: float, deck: tuple[float, float, float, float] | None = None
               ) -> tuple[np.ndarray, np.ndarray, np.ndarray, list[Segment],
                          np.ndarray] | None:
    """The tip-off cases of :func:`footprint_tip_offset` in one set of arrays: the
    point each belongs to, the length L (m) tipped over, the weight (N), the
    :func:`tip_offset` segments and the direction (index into
    :data:`TIP_DIRECTIONS`); ``None`` where no direction counts. ``deck``: as
    :func:`footprint_tip_offset`."""
    xs = np.broadcast_arrays(*(np.asarray(v, float) for v in rect), np.asarray(weight, float))
    x0, y0, x1, y1, W = (np.ravel(v) for v in xs)
    # every direction's points in one vectorised call (the per-call cost dominates)
    rows: list[np.ndarray] = []
    lengths: list[np.ndarray] = []
    parts: list[list[tuple[np.ndarray, ...]]] = []
    dirs: list[np.ndarray] = []
    for axis in ("x", "y"):
        for sign in (1.0, -1.0):
            L, B = (y1 - y0, x1 - x0) if axis == "y" else (x1 - x0, y1 - y0)
            edge = (y1 if sign > 0 else y0) if axis == "y" else (x1 if sign > 0 else x0)
            segs: list[tuple[np.ndarray, ...]] = []
            covered = np.zeros(x0.shape)
            reach = np.zeros(x0.shape, dtype=bool)
            for k, ((a0, b0, a1, b1), _sig, _sc) in enumerate(layers):
                ox0, oy0 = np.maximum(x0, a0), np.maximum(y0, b0)
                ox1, oy1 = np.minimum(x1, a1), np.minimum(y1, b1)
                on = (ox1 > ox0) & (oy1 > oy0)
                lo, hi = (oy0, oy1) if axis == "y" else (ox0, ox1)
                wid = np.where(on, (ox1 - ox0) if axis == "y" else (oy1 - oy0), 0.0)
                s0 = np.clip(np.where(on, (edge - hi) if sign > 0 else (lo - edge), 0.0), 0.0, L)
                s1 = np.clip(np.where(on, (edge - lo) if sign > 0 else (hi - edge), 0.0), 0.0, L)
                # the layer's own edge on the tipping side, as s (< 0: beyond the footprint)
                own = (b1 if sign > 0 else b0) if axis == "y" else (a1 if sign > 0 else a0)
                # a layer's edge on the deck's edge: beyond it is no deck to strike
                at_deck = deck is not None and _on_deck_edge(deck, own, axis, sign)
                free = not at_deck and not any(j != k and _abuts(lay[0], own, axis, sign)
                                               for j, lay in enumerate(layers))
                s_edge = (edge - own) if sign > 0 else (own - edge)
                if free:
                    r0 = np.broadcast_to(s_edge + t, x0.shape)
                    r1 = np.broadcast_to(s_edge + 2.0 * t, x0.shape)
                    reach = reach | (on & (r1 > _EDGE_COVERED))
                else:
                    r0 = r1 = np.full(x0.shape, -1e30)  # all of its strength everywhere
                segs.append((s0, s1, wid, r0, r1))
                # the footprint's edge over the layer, or past the deck's edge beyond it
                covered = covered + np.where((s0 <= _EDGE_COVERED) | (at_deck & on), wid, 0.0)
            if deck is not None:
                # the footprint's edge over the deck only: beside the deck nothing is struck
                p0, p1 = (x0, x1) if axis == "y" else (y0, y1)
                d0, d1 = (deck[0], deck[2]) if axis == "y" else (deck[1], deck[3])
                B = np.clip(np.minimum(p1, d1) - np.maximum(p0, d0), 0.0, B)
            idx = np.flatnonzero((covered < B - _EDGE_COVERED) | reach)
            if idx.size:
                rows.append(idx)
                lengths.append(L[idx])
                parts.append([tuple(a[idx] for a in sg) for sg in segs])
                dirs.append(np.full(idx.size, (0 if axis == "x" else 2) + (sign < 0)))
    if not rows:
        return None
    cat = np.concatenate
    segments: list[Segment] = [
        (cat([p[k][0] for p in parts]), cat([p[k][1] for p in parts]),
         cat([p[k][2] for p in parts]), float(layers[k][1]), float(layers[k][2]),
         cat([p[k][3] for p in parts]), cat([p[k][4] for p in parts]), spent)
        for k in range(len(layers))]
    at = cat(rows)
    return at, cat(lengths), W[at], segments, cat(dirs)


def _on_deck_edge(deck: tuple[float, float, float, float], own: float, axis: str,
                  sign: float) -> bool:
    """Whether a layer's edge at ``own`` on the ``axis`` in direction ``sign`` lies on
    (within :data:`_ABUTS`) or past the deck's edge ``deck`` (x0, y0, x1, y1) there."""
    d0, d1 = (deck[1], deck[3]) if axis == "y" else (deck[0], deck[2])
    return own >= d1 - _ABUTS if sign > 0 else own <= d0 + _ABUTS


def _abuts(r: tuple[float, float, float, float], own: float, axis: str, sign: float) -> bool:
    """Whether layer ``r`` (x0, y0, x1, y1) begins at the coordinate ``own`` on the
    ``axis`` going in direction ``sign`` (within :data:`_ABUTS`): another layer laid
    against an edge, so that edge is not free."""
    a0, b0, a1, b1 = r
    lo, hi = (b0, b1) if axis == "y" else (a0, a1)
    start = lo if sign > 0 else hi
    return abs(start - own) <= _ABUTS
