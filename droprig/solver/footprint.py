"""How a load's footprint hands its force to the framing.

* **Flat landing on a rigid base.** A skid or base frame that bridges several
  beams rests on all of them: a rigid body on elastic supports, so the supports
  take F_i = k_i·(w + θ·(s_i − s̄)) with w, θ from vertical and moment
  equilibrium (rigid beam on springs; Hetényi, *Beams on Elastic Foundation*,
  1946, ch. 1 — from memory). Supports that would pull are dropped and the rest
  solved again (a base can only push).
* **Tilted landing on one edge.** A load landing out of level meets the deck with
  one edge first; the whole force goes through that edge (common practice, no
  source). Every drop point is checked for both cases.
* **Tilted landing, both edges' strikes.** The far edge falls further and may meet a
  floor on its rebound: :func:`tilted_contact_bound`.
* **Tilted base on a crushable pad.** The crushed band under the edge widens as the
  edge sinks: :func:`wedge_crush_work`.
* **Web bearing under the load.** The force on the deck's top reaches a member's top
  flange spread through the slab: :func:`web_bearing_length`.
* **Clipping at deck edges.** A footprint overhanging the edge of the deck is cut
  to the part over the deck; its force acts at the centroid of that part.

Vectorised over drop points. SI units: m, m², N, N/m.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "EDGE_CONTACT_WIDTH",
    "PAD_TILT",
    "bridges_strip",
    "clip_footprint",
    "footprint_on_deck",
    "rigid_base_shares",
    "tilted_contact_bound",
    "tilted_edges",
    "web_bearing_length",
]

EDGE_CONTACT_WIDTH = 0.05
"""Width of the strip along a tilted load's leading edge that bears at first
contact, m (a base rail or skid flange; common practice, no source). Small: the
contact pressure and the crushing bound are then high."""


PAD_TILT = math.radians(5.0)
"""Default tilt of a load landing on one edge, rad (5°: a load hung for a lift is levelled
within a few degrees; common practice, no source), the default of the project's
``Settings.design_tilt`` (the tilt the lift plan states; the chain reads the project's,
``chain.landing_tilt``): the tilted landing is checked for every tilt up to it. A pad's
credit falls as the tilt grows
(:func:`wedge_crush_work`) and the far edge's strike grows with it
(:func:`tilted_contact_bound`): a load rigged or hanging further out of level needs
the engineer's own look."""


def clip_footprint(x0: ArrayLike, y0: ArrayLike, x1: ArrayLike, y1: ArrayLike,
                   extent: tuple[float, float, float, float]
                   ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Part of the footprint (x0, y0, x1, y1) over the deck ``extent``:
    returns (area m², centroid x, centroid y, share of the footprint over the
    deck). Off the deck entirely: area 0, centroid NaN ("none exists")."""
    ex0, ey0, ex1, ey1 = extent
    x0, y0, x1, y1 = np.broadcast_arrays(*(np.asarray(v, float) for v in (x0, y0, x1, y1)))
    cx0, cy0 = np.maximum(x0, ex0), np.maximum(y0, ey0)
    cx1, cy1 = np.minimum(x1, ex1), np.minimum(y1, ey1)
    dx, dy = np.maximum(cx1 - cx0, 0.0), np.maximum(cy1 - cy0, 0.0)
    area = dx * dy
    full = (x1 - x0) * (y1 - y0)
    on = area > 0.0
    xc = np.where(on, 0.5 * (cx0 + cx1), np.nan)
    yc = np.where(on, 0.5 * (cy0 + cy1), np.nan)
    return area, xc, yc, area / full


def footprint_on_deck(x: ArrayLike, y: ArrayLike, length: ArrayLike, width: ArrayLike,
                      extent: tuple[float, float, float, float],
                      openings: tuple[tuple[float, float, float, float], ...] = ()
                      ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The part of a footprint length × width centred at (x, y) that bears on the deck:
    returns (length, width) of a rectangle of that area and the footprint's shape, and
    the share of the footprint on the deck, m, m, dimensionless.

    Both plan orientations of the footprint (length along x or along y) are cut to the
    deck ``extent`` (:func:`clip_footprint`) and the area over each opening
    (x0, y0, x1, y1) is taken off; the lesser area of the two orientations is kept
    (higher contact pressure: the lower punching and crushing resistance, the higher
    deck moment; conservative for the contact checks), and both sides are scaled by
    √share so that the area is exact and the sides change continuously with the
    point (a rectangle of the footprint's proportions stands for the cut shape —
    common practice, no source). A footprint wholly on the deck is returned unchanged.
    """
    x, y, ln, wd = np.broadcast_arrays(*(np.asarray(v, float) for v in (x, y, length, width)))
    least = np.full(x.shape, np.inf)
    ex0, ey0, ex1, ey1 = extent
    for lx, ly in ((ln, wd), (wd, ln)):
        x0, x1, y0, y1 = x - lx / 2, x + lx / 2, y - ly / 2, y + ly / 2
        net, _, _, _ = clip_footprint(x0, y0, x1, y1, extent)
        for op in openings:
            cut, _, _, _ = clip_footprint(np.maximum(x0, ex0), np.maximum(y0, ey0),
                                          np.minimum(x1, ex1), np.minimum(y1, ey1), op)
            net = net - cut
        least = np.minimum(least, np.maximum(net, 0.0))
    share = np.minimum(least / (ln * wd), 1.0)
    root = np.sqrt(share)
    return ln * root, wd * root, share


def bridges_strip(span: ArrayLike, pos: ArrayLike, extent: ArrayLike) -> np.ndarray:
    """Whether a rigid base bridges the deck strip it lands on: its extent across the
    strip ``extent`` (m), centred ``pos`` (m) from the strip's first support line,
    covers both support lines of the strip of span ``span`` (m):
    pos − extent/2 ≤ 0 and pos + extent/2 ≥ span. The base then rests on the two
    members and the strip between them carries nothing: the force goes to the two
    members by the statics of a rigid beam on two supports, the lever rule
    F₁ = F·(span − pos)/span, F₂ = F·pos/span, whatever their stiffness (two
    supports are statically determinate; Hetényi 1946 ch. 1, rigid beam on springs —
    from memory), and the deck strip's bending is neither a spring in series nor a
    check. False where the strip has no span (on a support line the load bears on
    the member already)."""
    span, pos, ext = np.broadcast_arrays(*(np.asarray(v, float) for v in (span, pos, extent)))
    tol = 1e-9
    return (span > 0.0) & (pos - 0.5 * ext <= tol) & (pos + 0.5 * ext >= span - tol)


def rigid_base_shares(s: ArrayLike, k: ArrayLike, s_load: ArrayLike,
                      iterations: int = 3) -> np.ndarray:
    """Shares of a unit load at ``s_load`` carried by supports at ``s`` (n, K) of
    stiffness ``k`` (n, K; 0 where a slot is empty) under a rigid base, (n, K).

    Equilibrium of the rigid base: Σk·(w + θ·(s − s̄)) = 1 and
    Σk·(w + θ·(s − s̄))·(s − s̄) = (s_load − s̄), s̄ = Σk·s/Σk (Hetényi 1946 ch. 1,
    rigid beam on springs — from memory) ⇒ w = 1/Σk,
    θ = (s_load − s̄)/Σk·(s − s̄)². One support: it takes all. Supports with a
    negative share are dropped and the rest solved again (``iterations`` times);
    a load beyond the last support is then carried by it alone (statics of a
    base tipping about its outermost support). Equal stiffness gives the lever
    rule between two supports.
    """
    s, k = np.broadcast_arrays(np.asarray(s, float), np.asarray(k, float))
    s_load = np.asarray(s_load, float)[..., None]
    k = np.where(k > 0.0, k, 0.0)
    for _ in range(iterations + 1):
        K = np.sum(k, axis=-1, keepdims=True)
        with np.errstate(divide="ignore", invalid="ignore"):
            sbar = np.sum(k * s, axis=-1, keepdims=True) / K
            J = np.sum(k * (s - sbar) ** 2, axis=-1, keepdims=True)
            w = 1.0 / K
            theta = np.where(J > 0.0, (s_load - sbar) / np.where(J > 0.0, J, 1.0), 0.0)
            share = k * (w + theta * (s - sbar))
        negative = share < -1e-12
        if not negative.any():
            break
        k = np.where(negative, 0.0, k)
    share = np.where(np.isfinite(share), np.maximum(share, 0.0), 0.0)
    tot = np.sum(share, axis=-1, keepdims=True)
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(tot > 0.0, share / tot, 0.0)


def tilted_edges(x0: ArrayLike, y0: ArrayLike, x1: ArrayLike, y1: ArrayLike,
                 contact_width: float = EDGE_CONTACT_WIDTH
                 ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The four ways a footprint can land tilted on one edge: centre x, centre y,
    length along the edge, contact width and contact area of each edge strip,
    each (n, 4) in the order x0-side, x1-side, y0-side, y1-side (m, m²)."""
    x0, y0, x1, y1 = np.broadcast_arrays(*(np.asarray(v, float) for v in (x0, y0, x1, y1)))
    w = contact_width
    xm, ym = 0.5 * (x0 + x1), 0.5 * (y0 + y1)
    cx = np.stack([x0 + w / 2, x1 - w / 2, xm, xm], axis=-1)
    cy = np.stack([ym, ym, y0 + w / 2, y1 - w / 2], axis=-1)
    length = np.stack([y1 - y0, y1 - y0, x1 - x0, x1 - x0], axis=-1)
    width = np.minimum(w, np.stack([x1 - x0, x1 - x0, y1 - y0, y1 - y0], axis=-1))
    return cx, cy, length, width, length * width


def web_bearing_length(foot_l: ArrayLike, foot_w: ArrayLike,
                       spread_depth: ArrayLike = 0.0) -> np.ndarray:
    """Bearing length lb on a member's top flange (m) of a contact ``foot_l`` ×
    ``foot_w`` (m) on the deck's top, spread through the depth ``spread_depth`` (m)
    of slab between the contact and the flange:

        lb = min(foot_l, foot_w) + 2·h_s

    The load spreads at 45° through the concrete to the flange, as a concentrated load
    on a composite slab spreads to b_m = b_p + 2(h_c + h_f) (EN 1994-1-1 §9.4.3(2),
    Eq. 9.12 — from memory), h_c the concrete over the ribs (the least depth the load
    crosses at a member: conservative). The smaller side of the contact is taken along
    the member (its orientation on the member is not known: the shorter bearing, the
    lower web resistance of AISC 360-16 J10.2/J10.3 and EN 1993-1-5 §6). h_s = 0 gives
    the contact's own side: the flat landing's bearing (no slab spread credited there;
    conservative). Against the elastic solution, under a line load on an elastic
    half-plane (Flamant; Timoshenko & Goodier, *Theory of Elasticity*, §33 — from
    memory) 82 % of the force passes within ±h_s at depth h_s, and under a strip of
    width a within its 45° width a + 2h_s more (87 % at a/h_s = 0.4, 97 % at 5;
    ``tests/solver/test_tilted_edge_bearing.py`` integrates it): the 45° width is where
    the force goes, not a bound on its peak. Vectorised; SI units (m)."""
    fl, fw, hs = np.broadcast_arrays(*(np.asarray(v, float) for v in (foot_l, foot_w,
                                                                      spread_depth)))
    if np.any(hs < 0.0) or not np.all(np.isfinite(hs)):
        raise ValueError("spread_depth: the slab depth the load spreads through must be "
                         "finite and at least 0 m")
    return np.minimum(fl, fw) + 2.0 * hs


def wedge_crush_work(lead: ArrayLike, w0: ArrayLike, b: ArrayLike, s: ArrayLike,
                     tilt: float, p0: ArrayLike, p1: ArrayLike
                     ) -> tuple[np.ndarray, np.ndarray]:
    """A rigid base tilted by ``tilt`` (rad) sinking edge first into a crushable layer:
    across the edge, the crushed band runs from the edge at ``lead`` (m) to
    x(δ) = min(w0 + δ/tan θ, b) beyond it, δ the crush under the edge (m), w0 the edge
    strip's width and b the base's width across the edge (m); the layer lies over
    [``p0``, ``p1``] (m) across the edge. Returns, up to a crush ``s`` (m) under the
    edge, the work per unit crush stress and unit length along the edge
    ∫₀ˢ o(δ) dδ (m²) and the band's overlap with the layer at the end o(s) (m), where
    o(δ) = |[lead, lead + x(δ)] ∩ [p0, p1]|.

    The base keeps its tilt (a wedge pressed in): the layer under it crushes at its
    plateau stress σ_c wherever the base has reached it, so the force is
    σ_c·(length along the edge)·o(δ) (Gibson & Ashby, *Cellular Solids* 2nd ed.
    1997, ch. 5, plateau stress — from memory; geometry of a plane pressed in at θ).
    The base lies flat after δ_f = (b − w0)·tan θ; beyond that the band is the whole
    base. Exact in closed form: with u = lead + x, o = clip(u − q0, 0, c),
    q0 = max(lead, p0), c = max(p1 − q0, 0), its antiderivative
    G(u) = r²/2 + c·max(u − q0 − c, 0), r = clip(u − q0, 0, c), and dδ = tan θ·du
    while the band widens. Hand check: a layer under the whole base gives
    w0·δ_f + δ_f²/(2 tan θ) + b·(s − δ_f) for s ≥ δ_f. A body that turns flat under
    the eccentric crush force widens the band faster (more work at a given edge crush):
    the wedge at fixed tilt is the lower bound on the work, checked against a 2-DOF
    history in ``tests/solver/test_tilted_pad.py``. At no tilt (θ = 0, the limit) the
    base lands flat: the band is the whole base from the first crush, ∫o dδ = o(b)·s.
    Vectorised; SI units."""
    if not (0.0 <= tilt < 0.5 * math.pi):
        raise ValueError(f"tilt: {tilt!r} rad is not allowed; allowed: at least 0 and "
                         f"less than pi/2 rad")
    ld, w, bb, ss, a0, a1 = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (lead, w0, b, s, p0, p1)))
    t = math.tan(tilt)
    q0 = np.maximum(ld, a0)
    c = np.maximum(a1 - q0, 0.0)

    def G(u: np.ndarray) -> np.ndarray:
        r = np.clip(u - q0, 0.0, c)
        return 0.5 * r * r + c * np.maximum(u - q0 - c, 0.0)

    def o(u: np.ndarray) -> np.ndarray:
        return np.clip(u - q0, 0.0, c)

    w = np.minimum(w, bb)
    ss = np.maximum(ss, 0.0)
    if t == 0.0:  # lands flat: the whole base from the first crush
        return o(ld + bb) * ss, o(ld + bb)
    d_flat = (bb - w) * t
    d1 = np.minimum(ss, d_flat)
    u0 = ld + w
    work = t * (G(u0 + d1 / t) - G(u0)) + o(ld + bb) * np.maximum(ss - d_flat, 0.0)
    x_end = np.minimum(w + ss / t, bb)
    return work, o(ld + x_end)


def tilted_contact_bound(W: ArrayLike, h: ArrayLike, f_c: ArrayLike, f_s: ArrayLike,
                         b: ArrayLike, tilt: float) -> np.ndarray:
    """Upper bound on the force at either edge of a load of weight ``W`` (N) landing
    tilted by up to ``tilt`` (rad) with its lowest edge falling ``h`` (m, the energy
    height), its edges ``b`` (m) apart, each on a contact spring of compliance ``f_c``
    (m/N) over a floor of static compliance ``f_s`` (m/N) at the point, N:

        F ≤ W/2 + √(W²/4 + 2·W·H'/f_c),  H' = h + b·tan θ/2 + W·f_c/8 + W·f_s/2

    Energy balance of the undamped body and floor (Gere 7th ed. §9.10, the energy
    method of impact — from memory): released at rest, the body's centre of mass has
    fallen z = h + b·tan θ/2 + (δ_A + δ_B)/2 + w when the contacts are compressed δ_A,
    δ_B and the floor deflected w under them (small rotation; the centre over the
    middle of the edges), and W·z holds every spring's energy and the kinetic energy.
    So δ_B²/(2f_c) ≤ W·z − δ_A²/(2f_c) − (the floor's strain energy ≥ w²/(2f_s), its
    least for a given w under a point load) and W·δ_A/2 − δ_A²/(2f_c) ≤ W·f_c/8,
    W·w − w²/(2f_s) ≤ W·f_s/2 — whatever the floor's mass, its rebound or the body's
    inertia. The far edge's strike (falling b·tan θ further, meeting a floor that may
    be moving up) is what the whole-mass two-mass envelope at the lowest edge's fall
    misses (down to 0.76 × a 2-DOF history, ``tests/solver/test_tilted_edge_history.py``,
    ``scripts/tilted_edge_sweep.py``); this bound is never below the history there.
    Vectorised; SI units."""
    W, h, f_c, f_s, b = np.broadcast_arrays(*(np.asarray(v, float) for v in (W, h, f_c,
                                                                              f_s, b)))
    Hp = h + 0.5 * b * math.tan(tilt) + W * f_c / 8.0 + W * f_s / 2.0
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.where(f_c > 0.0, 0.5 * W + np.sqrt(0.25 * W * W + 2.0 * W * Hp
                                                     / np.where(f_c > 0.0, f_c, 1.0)),
                        np.inf)
