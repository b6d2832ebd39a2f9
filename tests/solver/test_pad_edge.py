"""A load landing at a crushable pad's edge: the tip-off bound (droprig.solver.pads.
tip_offset) against a hand calculation and against a time history of a rigid block
that lands with part of its base on a crushing layer raised t above the deck and tips
over the layer's edge; and the analysis continuous as the load moves across the edge.

Sources: the energy method of impact (Gere, *Mechanics of Materials* 7th ed. §9.10,
Eq. 9-94: F = W·(1 + √(1 + 2h/δst)) for the whole mass on a spring); the plateau stress
of a crushable layer (Gibson & Ashby, *Cellular Solids* 2nd ed. 1997, ch. 5 — from
memory); the eccentric-impact effective mass m* = M/(1 + M·r²/I_G) (Goldsmith, *Impact*
1960 ch. 2 — from memory); a uniform plate's I_G = M·L²/12 (any dynamics text — from
memory). The independent method is a time history integrated here with scipy
``solve_ivp``: the block's drop and rotation (small rotation), the layer as slices of
elastic-perfectly-plastic crush elements (plateau stress over the stroke, then the spent
layer's), one contact spring under the overhanging edge on a rigid deck. Invented
numbers; the expected values are the hand calculation's and the history's.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate, pads
from droprig.solver.impact import G

ROOT = Path(__file__).resolve().parents[2]
STRONG = -1e30  # r0 = r1 far below 0: the spent layer's whole strength everywhere


def test_tip_offset_hand_check():
    # derived here (energy balance, Gere §9.10's method): a plateau layer with its
    # stroke equal to its thickness (w(u) = σ_c·u, no spent part) under the part of a
    # footprint from s = d to L; turning by θ between t/L and t/d crushes a wedge:
    # φ(θ) = θ·(L + k·d²)/2 + k·t²/(2θ) − k·t·d, k = σ_c·b/W, whose least value is
    # Δ = t·(√(k·(L + k·d²)) − k·d) at θ* = t·√(k/(L + k·d²)). Rooftop-like numbers:
    # the drained unit (W = 35.8 kN, 1.9 m across the edge, 2.8 m along it) with its
    # centre of mass 0.05 m off a 15 kPa pad 0.5 m thick
    W, L, b, d, t, sig = 35.8e3, 1.9, 2.8, 1.0, 0.5, 15e3
    k = sig * b / W
    th = t * math.sqrt(k / (L + k * d * d))
    assert t / L < th < t / d  # the wedge branch holds
    assert L / 2 - k * (L * L - d * d) / 2 < 0  # φ falls over θ < t/L: the least is there
    hand = t * (math.sqrt(k * (L + k * d * d)) - k * d)
    got = pads.tip_offset(L, W, t, [(d, L, b, sig, t, STRONG, STRONG, 0.0)])
    assert float(got) == pytest.approx(hand, rel=1e-7)
    assert 0.0 < hand < t  # between the bare deck (0) and a fall onto the pad (t)
    # the turn about the pad's edge with nothing crushed (θ = t/d) is one of the motions
    # bounded: its φ = t·L/(2d) lies above the least
    assert float(got) < t * L / (2 * d)


def test_tip_offset_limits_and_bad_input():
    # common practice, no source (plane geometry of the footprint over the pad): no pad
    # under the footprint is the bare deck (Δ = 0); a footprint on the pad with a margin
    # of 2t on every side cannot tip onto the deck (∞); the shared edge of two pads laid
    # edge to edge is no edge
    layer = [((0.0, 0.0, 10.0, 10.0), 15e3, 0.35)]
    W, t = 35.8e3, 0.5
    off = pads.footprint_tip_offset((11.0, 4.0, 13.0, 6.0), W, t, layer)
    inside = pads.footprint_tip_offset((4.0, 4.0, 6.0, 6.0), W, t, layer)
    near = pads.footprint_tip_offset((8.9, 4.0, 9.9, 6.0), W, t, layer)
    assert float(off) == 0.0 and math.isinf(float(inside))
    assert 0.0 < float(near) < math.inf
    two = [((0.0, 0.0, 5.0, 10.0), 15e3, 0.35), ((5.0, 0.0, 10.0, 10.0), 15e3, 0.35)]
    across = pads.footprint_tip_offset((4.0, 4.0, 6.0, 6.0), W, t, two)
    assert math.isinf(float(across))
    with pytest.raises(ValueError, match="length and the weight"):
        pads.tip_offset(0.0, W, t, [])
    with pytest.raises(ValueError, match="protection thickness"):
        pads.tip_offset(1.0, W, 0.0, [])


def _history(M: float, I_G: float, L: float, b: float, d: float, H: float, t: float,
             sig: float, s_c: float, sig2: float, k_c: float, n: int = 12
             ) -> tuple[float, float]:
    """Kinetic energy (J) of the block when its overhanging edge first meets the deck,
    and the peak force (N) of the deck's contact spring k_c under that edge, for a
    rigid block of mass M (kg), inertia I_G (kg·m²), L (m) long across the pad's edge,
    its centre of mass at L/2, the pad (t thick, b wide) under s = d..L from the edge,
    the block's underside released H (m) above the deck, level. The pad in n slices,
    each an elastic-perfectly-plastic element yielding at σ_c (Pa) over the stroke s_c,
    then σ_2; elastic stiffness such that the spent layer yields 2 mm in."""
    s = d + (np.arange(n) + 0.5) * (L - d) / n
    area = b * (L - d) / n
    k_e = sig2 * area / 2e-3
    v0 = math.sqrt(2.0 * G * (H - t))
    arm = L / 2.0 - s  # the slices' lever from the centre of mass, + towards the edge:
    # an upward force there turns the edge up (θ̈ = −Σ f·arm / I_G)

    def forces(y: np.ndarray) -> tuple[np.ndarray, float, np.ndarray]:
        z, th, vz, w = y[:4]
        c = y[4:]
        u = z + th * arm
        udot = vz + w * arm
        Y = np.where(c < s_c, sig, sig2) * area
        fe = np.clip(k_e * (u - c), 0.0, None)
        f = np.minimum(fe, Y)
        cdot = np.where((fe >= Y) & (udot > 0.0), udot, 0.0)
        edge = z + th * L / 2.0 - t  # the edge's travel below the deck level
        return f, (k_c * edge if edge > 0.0 else 0.0), cdot

    def rhs(_t: float, y: np.ndarray) -> np.ndarray:
        f, fd, cdot = forces(y)
        return np.concatenate(([y[2], y[3], G - (f.sum() + fd) / M,
                                -(fd * L / 2.0 + (f * arm).sum()) / I_G], cdot))

    def touch(_t: float, y: np.ndarray) -> float:
        return y[0] + y[1] * L / 2.0 - t

    touch.terminal = False  # type: ignore[attr-defined]
    touch.direction = 1.0  # type: ignore[attr-defined]
    y0 = np.concatenate(([0.0, 0.0, v0, 0.0], np.zeros(n)))
    sol = solve_ivp(rhs, (0.0, 0.35), y0, max_step=4e-4, rtol=1e-5, atol=1e-8,
                    events=touch, dense_output=False)
    if not sol.t_events[0].size:  # the pad held the edge off the deck
        return 0.0, 0.0
    ye = sol.y_events[0][0]
    e_kin = 0.5 * M * ye[2] ** 2 + 0.5 * I_G * ye[3] ** 2
    fd = k_c * np.clip(sol.y[0] + sol.y[1] * L / 2.0 - t, 0.0, None)
    return float(e_kin), float(fd.max())


CASES = [
    # centre of mass 0.3 m off the pad; at its edge; 0.2 m on it (d = L/2 + offset)
    pytest.param(1.25, id="centre-0.3m-off"),
    pytest.param(0.95, id="centre-at-edge"),
    pytest.param(0.75, id="centre-0.2m-on"),
]


@pytest.mark.parametrize("d", CASES)
def test_tip_off_bound_against_the_history(d):
    # the rooftop's drained unit (3650 kg, 1.9 m across the edge, 2.8 m along it, its
    # declared underside 20 MN/m) released 0.8 m above the deck over a 0.5 m pad of
    # 15 kPa with a 0.35 m stroke, its spent part at C24's 2.5 MPa; inertia from a
    # point-like core (M·L²/40) through a thin plate (M·L²/12) to a block 1.5 m high
    # (M·(L² + 1.5²)/12). The bound (every inertia: none enters it) must hold the
    # history's kinetic energy at the edge's deck contact, and the whole mass from
    # H − Δ on the edge's spring (Gere Eq. 9-94, the chain's tip-off impact) the
    # history's deck force; measured against the worst inertia 1.02-1.10 x (energy) and
    # 1.29-1.51 x (force; the point-like core comes closest, the tall block stays off
    # the deck longest)
    M, L, b, H, t, sig, s_c, sig2, k_c = 3650.0, 1.9, 2.8, 0.8, 0.5, 15e3, 0.35, 2.5e6, 2e7
    W = M * G
    delta = float(pads.tip_offset(L, W, t, [(d, L, b, sig, s_c, STRONG, STRONG, sig2)]))
    assert 0.0 <= delta < H
    E_bound = W * (H - delta)
    F_bound = W * (1.0 + math.sqrt(1.0 + 2.0 * (H - delta) * k_c / W))
    worst_E = worst_F = 0.0
    for I_G in (M * L * L / 40.0, M * L * L / 12.0, M * (L * L + 1.5**2) / 12.0):
        E, F = _history(M, I_G, L, b, d, H, t, sig, s_c, sig2, k_c)
        worst_E, worst_F = max(worst_E, E), max(worst_F, F)
    assert worst_E <= E_bound
    assert worst_F <= F_bound
    assert E_bound / worst_E < 3.0 and F_bound / worst_F < 2.0  # a bound, not a wall


@pytest.fixture(scope="module")
def across_edge():
    """The rooftop demo's drained unit at x = 4.1 m across the pad's edge at y = 9.3 m
    (both pads end there), every 1 cm from 9.20 to 9.40 m and from 9.66 to 9.80 m
    (where the spent part of the pad under the unit's far end takes hold)."""
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    z = p.lift_zones[0]
    load = next(ld for ld in z.loads if ld.name.startswith("AHU-3 (old"))
    fm = analysis.build_floor(p.level(z.level_id), p.settings)
    ys = np.round(np.concatenate([np.arange(9.20, 9.405, 0.01), np.arange(9.66, 9.805, 0.01)]),
                  4)
    geo = analysis.point_geometry(fm, p, np.full(ys.size, 4.1), ys)
    return ys, evaluate.evaluate_case(fm, p, load, geo)


def test_no_step_across_the_pads_edge(across_edge):
    # issue 10 (common practice, no source: a verdict a signer reads must not jump where
    # the physics does not): before, the drained unit's plastic allowable height stepped
    # 1.96 -> 0.41 m between y 9.30 and 9.31 (the centre on or off the pad) and the
    # force 620 -> 1026 kN. Now each 1 cm moves the force, the utilisation and the
    # allowable heights by a few per cent at most (measured: 4.3 %, 1.5 %, 8 % where
    # the spent part takes hold at 9.70-9.71)
    ys, out = across_edge
    for k, most in (("peak_force", 0.05), ("utilisation", 0.05),
                    ("allowable_drop_height", 0.10)):
        v = out[k]
        assert np.all(np.isfinite(v)), k
        step = np.abs(np.diff(v)) / np.minimum(v[:-1], v[1:])
        near = np.diff(ys) < 0.015
        assert float(step[near].max()) <= most, (k, ys[:-1][near][np.argmax(step[near])])
    # the drop points just off the pad take the pad (the permit lays it) and a fall
    # between the pad's top and the bare deck's
    off = ys > 9.3 + 1e-6
    assert np.all(out["protection"][off] >= 0)
    assert np.all((out["fall_height"][off] > 0.3) & (out["fall_height"][off] < 0.8))
