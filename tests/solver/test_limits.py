"""Inverse answers: allowable height, allowable mass, required mat.

Each inverts the forward model of droprig.solver.impact (Gere, Mechanics of Materials
7th ed., §9.10, Eq. 9-94 with the struck-mass share η); the round-trip property tests
check that. Published anchors: Gere Prob. 9.10-4 (read backwards) and Engineering
ToolBox "Impact Force" (team references, check values 2 and 4).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from droprig.solver import beam, impact, limits

G = 9.80665
REL_ROUND_TRIP = 1e-8
TOOLBOX_REL = 2e-3  # ToolBox prints 557 kN
GERE_DIGITS = 1e-2  # d printed as 0.2804 m; h moves 0.3 % per 0.00005 m of d

forces = st.floats(100.0, 1e6)
compliances = st.floats(1e-9, 1e-4)
etas = st.floats(0.05, 1.0)


def test_gere_prob_9_10_4_backwards() -> None:
    """Gere Prob. 9.10-4: W = 20 kN, simple span 3 m, E = 12 GPa, σallow = 10 MPa; the
    square side d = 0.2804 m is the answer for h = 1.0 mm, so the allowable height of
    that beam is 1.0 mm (to the book's 4 digits)."""
    W, L, E, d = 20e3, 3.0, 12e9, 0.2804
    f = float(beam.green("simple", L, E * d**4 / 12, L / 2, L / 2))
    F_allow = 10e6 * d**3 / 6 / float(beam.unit_moment("simple", L, L / 2, L / 2))
    h = float(limits.allowable_drop_height_elastic(W, F_allow, W * f, 1.0))
    assert h == pytest.approx(1.0e-3, rel=GERE_DIGITS)


@settings(max_examples=60, deadline=None)
@given(forces, st.floats(2.0, 50.0), compliances, etas)
def test_allowable_height_round_trip(W: float, Ka: float, f: float, eta: float) -> None:
    h = float(limits.allowable_drop_height_elastic(W, Ka * W, W * f, eta))
    _, F, _ = impact.impact_elastic(W, h, f, eta)
    assert float(F) == pytest.approx(Ka * W, rel=REL_ROUND_TRIP)


def test_allowable_height_none_below_twice_weight() -> None:
    # Gere §9.10: K ≥ 2 for any h ≥ 0, so F_allow < 2W has no allowable height
    assert math.isnan(float(limits.allowable_drop_height_elastic(1e3, 1.9e3, 1e-3)))
    assert float(limits.allowable_drop_height_elastic(1e3, 2e3, 1e-3)) == 0.0


@settings(max_examples=60, deadline=None)
@given(forces, st.floats(0.0, 20.0), compliances, st.floats(0.0, 5e3))
def test_allowable_mass_round_trip(F_allow: float, h: float, f: float, m_e: float) -> None:
    M = float(limits.allowable_mass(F_allow, h, f, m_e))
    eta = impact.mass_efficiency(M, m_e)
    _, F, _ = impact.impact_elastic(M * G, h, f, eta)
    assert float(F) == pytest.approx(F_allow, rel=1e-7)


def test_allowable_mass_zero_height() -> None:
    # h = 0: K = 2 (Gere §9.10) → M = F_allow/(2g)
    assert float(limits.allowable_mass(2e4, 0.0, 1e-6, 300.0)) == pytest.approx(2e4 / (2 * G))


@settings(max_examples=60, deadline=None)
@given(forces, st.floats(0.01, 10.0), etas, st.floats(2.05, 40.0), compliances)
def test_required_mat_round_trip(W: float, h: float, eta: float, Ka: float,
                                 f_s: float) -> None:
    k = float(limits.required_mat_stiffness(W, h, eta, Ka * W, f_s))
    _, F_bare, _ = impact.impact_elastic(W, h, f_s, eta)
    if math.isinf(k):
        assert float(F_bare) <= Ka * W * (1 + 1e-9)
        return
    _, F, _ = impact.impact_elastic(W, h, f_s + 1.0 / k, eta)
    assert float(F) == pytest.approx(Ka * W, rel=REL_ROUND_TRIP)


def test_required_mat_impossible() -> None:
    # a mat cannot bring the force below 2W (Gere §9.10, h = 0 limit)
    assert math.isnan(float(limits.required_mat_stiffness(1e3, 0.5, 1.0, 1.5e3, 1e-6)))


@settings(max_examples=60, deadline=None)
@given(forces, st.floats(0.01, 10.0), etas, st.floats(1.1, 40.0), compliances)
def test_required_crush_stroke_round_trip(W: float, h: float, eta: float, ratio: float,
                                          f_s: float) -> None:
    F_allow = ratio * W
    s = float(limits.required_crush_stroke(W, h, eta, F_allow, f_s))
    if s == 0.0:
        _, F_el, _ = impact.impact_elastic(W, h, f_s, eta)
        assert float(F_el) <= F_allow * (1 + 1e-9)
        return
    F, depth, bottomed = impact.impact_crushable(W, h, f_s, eta, F_allow, s * (1 + 1e-9))
    assert float(F) == pytest.approx(F_allow, rel=1e-9)
    assert float(depth) == pytest.approx(s, rel=1e-8)
    assert not bool(bottomed)


def test_required_crush_stroke_toolbox() -> None:
    # Engineering ToolBox "Impact Force": 2000 kg, 14.2 m, average force 557 kN over 0.5 m;
    # a rigid structure and a net crush force F_c − W = 557 kN need a 0.5 m stroke
    W = 2000 * G
    s = float(limits.required_crush_stroke(W, 14.2, 1.0, W + 557e3, 0.0))
    assert s == pytest.approx(0.5, rel=TOOLBOX_REL)
    assert math.isnan(float(limits.required_crush_stroke(W, 1.0, 1.0, 0.9 * W, 0.0)))


def test_vectorised() -> None:
    h = limits.allowable_drop_height_elastic(1e3, np.array([1.5e3, 3e3, 1e4]), 1e-3)
    assert h.shape == (3,) and math.isnan(h[0]) and h[2] > h[1] > 0
