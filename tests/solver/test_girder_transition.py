"""A load's footprint reaching a girder line (issue 10, finding 1): the slab's cross
strip and punching change continuously as the base comes to bear on the girder."""

from __future__ import annotations

import numpy as np
import pytest

from droprig.solver import chain, evaluate, floor, geometry
from tests.permit_projects import random_project


def test_a_footprint_clear_of_the_girder_keeps_the_patch_moment() -> None:
    # far from the girder lines the base's strips share nearly equally: the cross
    # strip's moment is the patch at the load's centre (AISC Manual Table 3-23,
    # statics of the simply supported strip, deck.deck_unit_moment_per_width)
    from droprig.solver import deck

    m = chain.cross_strip_moment(np.array([6.42]), np.array([3.0]), np.array([0.53]),
                                 np.array([1.23]), 0.15, 0.075, 0.15)
    ref = deck.deck_unit_moment_per_width(6.42, 3.0, 0.53, 1.23, 0.15)
    assert float(m[0]) == pytest.approx(float(ref), rel=1e-12)
    # centred on the girder line the base rests on the girder (its centre over the
    # flange: statics of a rigid body): no cross-strip moment
    on = chain.cross_strip_moment(np.array([6.42]), np.array([6.42]), np.array([0.53]),
                                  np.array([1.23]), 0.15, 0.075, 0.15)
    assert float(on[0]) == 0.0


@pytest.mark.parametrize("x", [0.9, 2.6, 4.4, 6.2])
def test_utilisation_is_continuous_as_the_footprint_reaches_a_girder_line(x: float) -> None:
    """Random floor seed 31 (girder at y = 6.42 m, a 1.23 × 0.53 m rigid base): the
    0.53 m side's edge reaches the girder line at y = 6.155 m, where U stepped
    10.4 -> 4.1 (finding 1) while the base was taken to bear on the girder
    outright. A move of 1–20 mm across it now changes U by less than 5 %
    (common practice, no source: a point's result follows the structure, not a rule
    switching on)."""
    p = random_project(31)
    fm = floor.floor_cache(p)("L1")
    z = p.lift_zones[0]
    edge = 6.42 - 0.53 / 2
    d = np.array([0.0005, 0.001, 0.005, 0.01])
    ys = np.concatenate([edge - d, edge + d])
    geo = geometry.point_geometry(fm, p, np.full(ys.size, x), ys)
    r = evaluate.evaluate_case(fm, p, z.loads, geo, np.zeros(ys.size, np.int64),
                               v_hoist=z.hoist_speed)
    U = r["utilisation"]
    assert np.all(np.isfinite(U)) and np.all(U > 0.0)
    k = d.size
    assert np.all(np.abs(U[k:] / U[:k] - 1.0) < 0.05), U


@pytest.mark.parametrize(("e", "ext"), [(0.4, 0.53), (0.3, 1.23), (0.2, 0.9), (0.12, 2.0)])
def test_base_on_a_flange_against_a_direct_energy_minimum(e: float, ext: float) -> None:
    """chain.base_on_line with the flange fully engaged (λ = 1) against an independent
    solution: the base as 400 compression-only uniform springs and a rigid knife
    edge at the flange's edge b, its total potential ½Σk·max(w + θ(s − e), 0)² − w
    minimised over (w, θ) by scipy with the knife edge as the constraint
    w + θ(b − e) = 0 (Hetényi 1946 ch. 1, rigid beam on springs — from memory). The
    slab's share, its resultant and the hand check of a base whose edge sits on the
    flange's edge (3/4 on the slab: triangle of pressure, moments about the edge,
    F·ext/2 = (3/4 F)·(2 ext/3)) agree."""
    from scipy.optimize import minimize

    b, h = 0.0675, 0.15
    share, pos, _ = chain.base_on_line(np.array([e]), np.array([ext]), b, h)
    s0 = e - ext / 2
    assert s0 - h <= 0.0  # the spread covers the flange's near half: λ = 1
    p = float(np.clip(b, s0, e + ext / 2))
    s = s0 + (np.arange(400) + 0.5) * ext / 400
    slab = s > p
    k = np.where(slab, 1.0, 0.0)

    def energy(th: np.ndarray) -> float:
        w = -th[0] * (p - e)  # the knife edge does not move
        d = np.maximum(w + th[0] * (s - e), 0.0)
        return 0.5 * float(np.sum(k * d * d)) - w

    res = minimize(energy, np.array([0.1]), method="Nelder-Mead",
                   options={"xatol": 1e-12, "fatol": 1e-14, "maxiter": 4000})
    th = float(res.x[0])
    w = -th * (p - e)
    f = k * np.maximum(w + th * (s - e), 0.0)
    # scale the spring forces so that moments about the knife edge balance the load
    f = f * (e - p) / float(np.sum(f * (s - p))) if e > p else f * 0.0
    assert float(share[0]) == pytest.approx(float(np.sum(f)), rel=0.01, abs=1e-6)
    if float(np.sum(f)) > 0.0:
        assert float(pos[0]) == pytest.approx(float(np.sum(f * s) / np.sum(f)), rel=0.01)
    # hand check: a base whose near edge sits on the flange's edge
    sh, at, _ = chain.base_on_line(np.array([b + 0.25]), np.array([0.5]), b, h)
    assert float(sh[0]) == pytest.approx(0.75, rel=1e-9)
    assert float(at[0]) == pytest.approx(b + 2 * 0.5 / 3, rel=1e-9)


def test_clear_of_the_girders_the_crossing_strips_share_is_at_the_centre() -> None:
    # Rankine–Grashof crossing strips (Reynolds, Reinforced Concrete Designer's
    # Handbook, two-way slabs — from memory): the cross strip takes
    # 1 − g_y/(g_x + g_y) with g_y = y²(Ly − y)²/(3·Ly) at the load, here its centre,
    # 3 m from the girder line (the base clear of the flange: the whole force on the
    # slab at its centre)
    from droprig.solver import deck

    Ly, y, gx = 6.42, 3.0, 0.5
    m = chain.cross_strip_moment(np.array([Ly]), np.array([y]), np.array([0.53]),
                                 np.array([1.23]), 0.15, 0.075, 0.15, np.array([gx]))
    gy = y**2 * (Ly - y) ** 2 / (3 * Ly)
    ref = deck.deck_unit_moment_per_width(Ly, y, 0.53, 1.23, 0.15) * (1 - gy / (gx + gy))
    assert float(m[0]) == pytest.approx(float(ref), rel=1e-12)


def test_a_soft_underside_is_continuous_too() -> None:
    """The same floor and load with a declared underside stiffness: U should change
    by less than 5 % for moves of 1–20 mm across the footprint's edge reaching the
    girder line (common practice, no source)."""
    y_edge = 6.42 - 0.53 / 2
    from dataclasses import replace

    p = random_project(31)
    fm = floor.floor_cache(p)("L1")
    z = p.lift_zones[0]
    load = replace(z.loads[0], contact_stiffness=2e7)
    d = np.array([0.0005, 0.001, 0.005, 0.01])
    ys = np.concatenate([y_edge - d, y_edge + d])
    geo = geometry.point_geometry(fm, p, np.full(ys.size, 6.2), ys)
    r = evaluate.evaluate_case(fm, p, (load,), geo, np.zeros(ys.size, np.int64),
                               v_hoist=z.hoist_speed)
    U = r["utilisation"]
    assert np.all(np.isfinite(U)) and np.all(U > 0.0)
    assert np.all(np.abs(U[d.size:] / U[:d.size] - 1.0) < 0.05), U
