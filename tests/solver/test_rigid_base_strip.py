"""The deck strip under a flat landing's base (``slab.rigid_base_strip_compliance``).

Before, the strip's compliance was that of a point load at the base's centre until
the base covered both beams of its strip, and then zero: a step. On the rooftop demo
a 4 m spreader beam on girder line B stepped from U 1.38 to 1.96 within 1 mm at
x = 0.7385 m, where its footprint, cut at the deck's edge and scaled to keep its
proportions, reached the second beam; and the point load overstated the compliance
of every long base (the force understated). A straight rigid base bears at its ends
or on the support lines it reaches; the strip's Green's function gives its
deflection (Maxwell–Betti).

Sources: AISC Steel Construction Manual 15th ed. Table 3-23 cases 8 (one
concentrated load at any point) and 9 (two equal loads symmetrically placed);
Maxwell–Betti reciprocity (any structural analysis text, e.g. Hibbeler, *Structural
Analysis*, ch. 9); the contact of a rigid punch on an elastic beam solved as a
compression-only linear complementarity (Johnson, *Contact Mechanics* 1985, ch. 5 —
from memory), here by active-set iteration in the test as the independent method.
The demo project supplies geometry only, never an expected value.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate, slab

ROOT = Path(__file__).resolve().parents[2]
L = 2.5
K = slab.K_INTERIOR / L  # interior restraint over EI, 1/m


@pytest.mark.parametrize("kl,kr", [(0.0, 0.0), (K, K), (K, 0.0)])
def test_green_function_is_symmetric_and_matches_the_point_compliance(kl, kr):
    x = np.linspace(0.0, L, 11)
    G = slab.strip_green(L, x[:, None], x[None, :], kl, kr)
    np.testing.assert_allclose(G, G.T, rtol=0.0, atol=1e-15)  # Maxwell–Betti
    np.testing.assert_allclose(np.diag(G),
                               slab.continuous_strip_compliance(L, x, 1.0, kl, kr),
                               rtol=1e-12, atol=1e-16)


def test_green_function_of_the_simple_span_is_aisc_case_8():
    # AISC Table 3-23 case 8: Δx (x < a) = P·b·x·(l² − b² − x²)/(6EIl), b = l − a
    a, x = 1.7, 0.6
    b = L - a
    assert slab.strip_green(L, x, a, 0.0, 0.0) == pytest.approx(
        b * x * (L**2 - b**2 - x**2) / (6.0 * L), rel=1e-12)


@pytest.mark.parametrize("c", [0.4, 1.0, 1.8])
def test_centred_base_on_a_simple_span_is_aisc_case_9(c):
    # a rigid base centred on the span bears at its ends: two loads P/2 at
    # a = (l − c)/2 from the supports; AISC Table 3-23 case 9 at the loads:
    # Δ = (P/2)·a²·(3l − 4a)/(6EI)
    a = 0.5 * (L - c)
    want = 0.5 * a**2 * (3.0 * L - 4.0 * a) / 6.0
    assert slab.rigid_base_strip_compliance(L, L / 2, c, 0.0, 0.0) == pytest.approx(
        want, rel=1e-12)


def test_limits_point_load_and_a_base_on_both_beams():
    for pos in (0.3, 1.1, 2.2):
        assert slab.rigid_base_strip_compliance(L, pos, 0.0, K, K) == pytest.approx(
            slab.continuous_strip_compliance(L, pos, 1.0, K, K), rel=1e-12)
    # over both support lines it rests on the members
    assert slab.rigid_base_strip_compliance(L, 1.0, 3.0, K, K) == pytest.approx(0.0, abs=1e-15)


def test_continuous_as_the_base_reaches_a_support():
    # the base's right end crosses the second support at pos = L − c/2: a 1 mm move
    # changes the compliance by a small fraction of its value, not a step to zero
    c = 1.6
    pos = np.linspace(L - c / 2 - 0.01, L - c / 2 + 0.01, 21)
    g = slab.rigid_base_strip_compliance(L, pos, c, K, K)
    assert np.all(np.abs(np.diff(g)) <= 0.02 * g.max())
    # and it falls as the base grows (more of it over the stiff supports)
    cs = np.linspace(0.0, 3.0, 31)
    gs = slab.rigid_base_strip_compliance(L, 0.9, cs, K, K)
    assert np.all(np.diff(gs) <= 1e-15)


def _many_point_contact(pos: float, c: float, kl: float, kr: float, n: int = 41) -> float:
    """A rigid base on the strip, contact forces at n points over it, compression
    only (active set), rigid body (w0, θ) about the load: the base's deflection."""
    x1, x2 = max(pos - c / 2, 0.0), min(pos + c / 2, L)
    xs = np.linspace(x1, x2, n)
    active = np.ones(n, dtype=bool)
    for _ in range(4 * n):
        idx = np.flatnonzero(active)
        m = idx.size
        A = np.zeros((m + 2, m + 2))
        rhs = np.zeros(m + 2)
        A[:m, :m] = slab.strip_green(L, xs[idx][:, None], xs[idx][None, :], kl, kr)
        A[:m, m], A[:m, m + 1] = -1.0, -(xs[idx] - pos)
        A[m, :m], rhs[m] = 1.0, 1.0
        A[m + 1, :m] = xs[idx] - pos
        sol = np.linalg.lstsq(A, rhs, rcond=None)[0]
        p, w0, th = sol[:m], sol[m], sol[m + 1]
        gap = slab.strip_green(L, xs[:, None], xs[idx][None, :], kl, kr) @ p \
            - (w0 + th * (xs - pos))
        if p.min() >= -1e-12 and gap[~active].min(initial=0.0) >= -1e-15:
            return float(w0)
        if p.min() < -1e-12:
            active[idx[np.argmin(p)]] = False
        else:
            active[np.argmin(np.where(active, np.inf, gap))] = True
    raise AssertionError("contact did not converge")


@pytest.mark.parametrize("kl,kr", [(0.0, 0.0), (K, K), (K, 0.0)])
def test_two_point_base_against_a_many_point_contact_solution(kl, kr):
    # independent method: many contact points, compression only. The two-point base
    # is the upper estimate of the compliance (fewer contacts) and within 1 %
    worst = 1.0
    for pos in (0.2, 0.74, 1.25, 1.9, 2.3):
        for c in (0.3, 1.0, 2.0, 3.0):
            g2 = float(slab.rigid_base_strip_compliance(L, pos, c, kl, kr))
            gm = _many_point_contact(pos, c, kl, kr)
            if g2 < 1e-12:
                assert abs(gm) < 1e-12
                continue
            assert gm <= g2 * (1 + 1e-9)
            worst = min(worst, gm / g2)
    assert worst >= 0.99


@pytest.fixture(scope="module")
def roof():
    return load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")


def test_spreader_beam_on_a_girder_line_has_no_step(roof):
    # the 4 m spreader beam along girder line B near the deck's edge: U stepped
    # 1.385 → 1.957 between x = 0.738 and 0.739 m (its cut, scaled footprint reached
    # the second beam); now continuous at 1 mm
    z = roof.lift_zones[0]
    load = next(ld for ld in z.loads if ld.name == "Spreader beam 4 m")
    fm = analysis.build_floor(roof.level(z.level_id), roof.settings)
    x = np.linspace(0.730, 0.746, 17)
    geo = analysis.point_geometry(fm, roof, x, np.full_like(x, 9.0))
    U = evaluate.evaluate_case(fm, roof, load, geo, v_hoist=z.hoist_speed)["utilisation"]
    assert np.max(np.abs(np.diff(U)) / U[1:]) < 0.005
