"""Pads and mats by area; footprint sharing, tilted landing, clipping at deck edges.

Sources: Gere, *Mechanics of Materials* 7th ed. §2.3 (layer in compression) and
§9.10 (energy method); Engineering ToolBox, "Impact Force" (average force over a
stopping distance); Gibson & Ashby, *Cellular Solids* 2nd ed. ch. 5 (plateau
stress, from memory); Hetényi, *Beams on Elastic Foundation* (1946) ch. 1 (rigid
beam on springs, from memory) and plain statics; scipy ``solve_ivp`` as the
reference integrator of the pad energy balance.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import footprint, pads
from droprig.solver.impact import G, impact_crushable

REL = 1e-9
REL_ODE = 2e-3
"""Time history against the closed energy balance (state switches inside a step)."""


def test_overlap_area_cases():
    pad = (0.0, 0.0, 4.0, 4.0)
    # fully on, half on, a corner quarter, off
    fp = pads.footprint_rect(np.array([2.0, 4.0, 4.0, 6.0]), np.array([2.0, 2.0, 4.0, 2.0]),
                             3.0, 2.0)
    A = pads.rect_overlap_area(fp, pad)
    np.testing.assert_allclose(A, [6.0, 3.0, 1.5, 0.0], rtol=REL)


def test_spring_mat_by_area():
    # Gere §2.3: k = E·A/t; 2 MPa foam-rubber, 50 mm thick, 6 m² vs 3 m² pressed
    np.testing.assert_allclose(pads.spring_mat_stiffness(2e6, 0.05, [6.0, 3.0]),
                               [2.4e8, 1.2e8], rtol=REL)
    with pytest.raises(ValueError, match="thickness"):
        pads.spring_mat_stiffness(2e6, 0.0, 6.0)


def test_force_calibrated_pad_bottoms_under_a_narrow_spreader():
    # A pad described as 90 kN for a 3 × 2 m unit is σ = 90e3/6 = 15 kPa. A 4.0 × 0.3 m
    # spreader (300 kg) falling 4.3 m presses 1.2 m²: F_c = 18 kN; Engineering ToolBox
    # "Impact Force" with gravity during the stroke: (F_c − W)·c = W·h →
    # c = 2942 × 4.3/(18000 − 2942) = 0.84 m, beyond a 0.35 m stroke.
    sigma = pads.crush_stress_from_force(90e3, 6.0)
    assert sigma == pytest.approx(15e3, rel=REL)
    Fc = pads.crushable_pad_force(sigma, 4.0 * 0.3)
    W = 300.0 * G
    c_needed = W * 4.3 / (Fc - W)
    assert c_needed == pytest.approx(0.84, abs=0.005)
    F, depth, bottomed = impact_crushable(W, 4.3, 1e-9, 1.0, Fc, 0.35)
    assert bottomed and depth == pytest.approx(0.35)
    assert F > 10 * Fc  # the bottomed pad hands the rest of the energy to the structure
    with pytest.raises(ValueError, match="footprint area"):
        pads.crush_stress_from_force(90e3, 0.0)


def _pad_history(M: float, h: float, f_s: float, F_c: float, s_c: float):
    """Mass M dropped h onto a crushable pad (force F_c, stroke s_c) over an elastic
    structure of compliance f_s: peak force, crushed depth (solve_ivp)."""
    from scipy.integrate import solve_ivp

    k = 1.0 / f_s

    def rhs(t, y):
        u, v, c = y
        F = k * (u - c)
        dc = 0.0
        if F >= F_c and v > 0.0 and c < s_c:
            F, dc = F_c, v
        return [v, G - F / M, dc]

    stop = lambda t, y: y[1]  # noqa: E731 — the load comes to rest
    stop.terminal, stop.direction = True, -1
    sol = solve_ivp(rhs, (0, 10.0), [0.0, math.sqrt(2 * G * h), 0.0], events=stop,
                    rtol=1e-10, atol=1e-13, max_step=2e-4)
    u, c = sol.y[0], sol.y[2]
    return float(np.max(k * (u - c))), float(min(c[-1], s_c))


@pytest.mark.parametrize("centre_x, on_pad", [(2.0, 6.0), (4.0, 3.0)])
def test_pad_energy_balance_for_two_footprints(centre_x, on_pad):
    # a 4200 kg unit, 3 × 2 m base, falling 0.8 m onto a 15 kPa pad (x ≤ 4 m) with
    # 0.35 m of stroke over a floor of compliance 1/(4e7) m/N; the footprint wholly on
    # the pad and then half on it (its centre on the pad's edge)
    pad = (0.0, 0.0, 4.0, 4.0)
    fp = pads.footprint_rect(centre_x, 2.0, 3.0, 2.0)
    A = pads.rect_overlap_area(fp, pad)
    assert A == pytest.approx(on_pad)
    Fc = pads.crushable_pad_force(15e3, A)
    M, h, f_s = 4200.0, 0.8, 1.0 / 4e7
    F_ref, c_ref = _pad_history(M, h, f_s, float(Fc), 0.35)  # scipy solve_ivp
    F, c, bottomed = impact_crushable(M * G, h, f_s, 1.0, Fc, 0.35)
    assert F == pytest.approx(F_ref, rel=REL_ODE)
    assert c == pytest.approx(c_ref, rel=REL_ODE)
    # energy balance (Gere §9.10 with the layer): W(h + c + F·f) = Fc·c + F²f/2
    if not bottomed:
        lhs = M * G * (h + c + F * f_s)
        assert lhs == pytest.approx(Fc * c + 0.5 * F**2 * f_s, rel=1e-9)


def test_half_on_the_pad_gets_half_the_credit():
    pad = (0.0, 0.0, 4.0, 4.0)
    full = pads.crushable_pad_force(15e3, pads.rect_overlap_area(
        pads.footprint_rect(2.0, 2.0, 3.0, 2.0), pad))
    half = pads.crushable_pad_force(15e3, pads.rect_overlap_area(
        pads.footprint_rect(4.0, 2.0, 3.0, 2.0), pad))
    assert half == pytest.approx(0.5 * full, rel=REL)


# ------------------------------------------------------------------ footprint
def test_clip_at_deck_edge():
    area, xc, yc, share = footprint.clip_footprint(-1.0, 0.0, 2.0, 2.0, (0.0, 0.0, 10.0, 10.0))
    assert area == pytest.approx(4.0) and share == pytest.approx(2.0 / 3.0)
    assert (xc, yc) == pytest.approx((1.0, 1.0))
    area, xc, _, _ = footprint.clip_footprint(-5.0, 0.0, -1.0, 2.0, (0.0, 0.0, 10.0, 10.0))
    assert area == 0.0 and np.isnan(xc)


def test_rigid_base_equal_springs_is_lever_rule():
    # statics: two equal supports 2.5 m apart, load 0.5 m from the first → 0.8 / 0.2
    sh = footprint.rigid_base_shares([[0.0, 2.5]], [[1.0, 1.0]], [0.5])
    np.testing.assert_allclose(sh, [[0.8, 0.2]], rtol=REL)


def test_rigid_base_three_springs_equilibrium():
    # Hetényi ch. 1 (from memory): shares linear in s, Σ = 1, Σ share·s = s_load
    s = np.array([[0.0, 1.2, 3.0]])
    k = np.array([[2e7, 5e7, 1e7]])
    sh = footprint.rigid_base_shares(s, k, [1.4])
    assert sh.sum() == pytest.approx(1.0, rel=REL)
    assert float(sh[0] @ s[0]) == pytest.approx(1.4, rel=REL)
    disp = sh / k  # base displacement at each support: a straight line
    slope1 = (disp[0, 1] - disp[0, 0]) / 1.2
    slope2 = (disp[0, 2] - disp[0, 1]) / 1.8
    assert slope1 == pytest.approx(slope2, rel=1e-9)


def test_rigid_base_lift_off():
    # load beyond the last support: statics puts it all on that support (the base tips)
    sh = footprint.rigid_base_shares([[0.0, 2.5, 5.0]], [[1.0, 1.0, 1.0]], [5.0])
    np.testing.assert_allclose(sh, [[0.0, 0.0, 1.0]], atol=1e-12)
    # empty slots (k = 0) take nothing; one support takes all
    sh = footprint.rigid_base_shares([[1.0, 0.0]], [[3e7, 0.0]], [1.7])
    np.testing.assert_allclose(sh, [[1.0, 0.0]])


def test_tilted_edges():
    cx, cy, length, width, area = footprint.tilted_edges(0.0, 0.0, 3.0, 2.0)
    np.testing.assert_allclose(cx, [0.025, 2.975, 1.5, 1.5])
    np.testing.assert_allclose(cy, [1.0, 1.0, 0.025, 1.975])
    np.testing.assert_allclose(length, [2.0, 2.0, 3.0, 3.0])
    np.testing.assert_allclose(width, 0.05)
    np.testing.assert_allclose(area, [0.1, 0.1, 0.15, 0.15])
