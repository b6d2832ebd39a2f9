"""Elastic–perfectly-plastic energy balance beyond yield.

Sources (team references, "Beyond yield"): Biggs, Introduction to Structural Dynamics
(1964) and UFC 3-340-02 ch. 3 (from memory): W(h + δm) = Ru(δm − δe/2) ⇒
δm = (Wh + Ru·δe/2)/(Ru − W); allowable height for a chosen μ: h = Ru·δe(μ − ½)/W − μ·δe;
support rotation at midspan θ = atan(2δm/L). droprig adds the struck-mass share η on
the kinetic energy (Timoshenko Part I); the references' forms are η = 1.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from droprig.solver import impact, plastic

REL = 1e-10


@pytest.fixture
def biggs_case() -> dict[str, float]:
    # inputs chosen for the check (any values satisfying Ru > W); the answer is Biggs' formula
    return {"W": 20e3, "h": 0.5, "Ru": 150e3, "de": 0.012}


def test_biggs_closed_form(biggs_case: dict[str, float]) -> None:
    W, h, Ru, de = biggs_case["W"], biggs_case["h"], biggs_case["Ru"], biggs_case["de"]
    dm, mu, collapsed = plastic.plastic_response(W, h, 1.0, Ru, de)
    expected = (W * h + Ru * de / 2) / (Ru - W)  # Biggs (1964) / UFC 3-340-02
    assert float(dm) == pytest.approx(expected, rel=REL)
    assert float(mu) == pytest.approx(expected / de, rel=REL)
    assert not bool(collapsed)
    # energy: W(h + δm) = Ru(δm − δe/2)
    assert W * (h + float(dm)) == pytest.approx(Ru * (float(dm) - de / 2), rel=REL)


def test_eta_scales_kinetic_energy(biggs_case: dict[str, float]) -> None:
    W, h, Ru, de = biggs_case["W"], biggs_case["h"], biggs_case["Ru"], biggs_case["de"]
    dm, _, _ = plastic.plastic_response(W, h, 0.6, Ru, de)
    dm1, _, _ = plastic.plastic_response(W, 0.6 * h, 1.0, Ru, de)
    assert float(dm) == pytest.approx(float(dm1), rel=REL)


def test_collapse_when_resistance_below_weight() -> None:
    # Ru ≤ W: the path cannot carry the load statically (design notes §3)
    dm, mu, collapsed = plastic.plastic_response(10e3, 0.1, 1.0, [10e3, 9e3], 0.01)
    assert np.all(collapsed) and np.all(np.isinf(dm)) and np.all(np.isinf(mu))


def test_elastic_branch_matches_gere() -> None:
    # elastic peak below Ru: Gere §9.10 with f = δe/Ru
    W, h, Ru, de = 1e3, 0.001, 1e6, 0.01
    dm, mu, _ = plastic.plastic_response(W, h, 1.0, Ru, de)
    _, F, d = impact.impact_elastic(W, h, de / Ru, 1.0)
    assert float(F) < Ru
    assert float(dm) == pytest.approx(float(d), rel=REL)
    assert float(mu) < 1.0


@settings(max_examples=60, deadline=None)
@given(st.floats(1e3, 1e5), st.floats(1.05, 20.0), st.floats(1e-3, 0.05),
       st.floats(0.1, 1.0))
def test_continuous_at_first_yield(W: float, ratio: float, de: float, eta: float) -> None:
    # at the height where the elastic peak just reaches Ru both branches give δm = δe (derived)
    Ru = ratio * W
    Ka = Ru / W
    if Ka < 2:
        return
    h = de * W / Ru * ((Ka - 1) ** 2 - 1) / (2 * eta)
    d_pl = (eta * W * h + Ru * de / 2) / (Ru - W)
    assert d_pl == pytest.approx(de, rel=1e-9)
    dm, _, _ = plastic.plastic_response(W, h, eta, Ru, de)
    assert float(dm) == pytest.approx(de, rel=1e-9)


def test_allowable_height_references_form() -> None:
    # references: h = Ru·δe(μ − ½)/W − μ·δe (η = 1)
    W, Ru, de, mu = 20e3, 150e3, 0.012, 6.0
    expected = Ru * de * (mu - 0.5) / W - mu * de
    assert float(plastic.allowable_height_plastic(W, 1.0, Ru, de, mu)) == pytest.approx(
        expected, rel=REL)


@settings(max_examples=60, deadline=None)
@given(st.floats(1e3, 1e5), st.floats(2.0, 30.0), st.floats(1e-3, 0.05),
       st.floats(0.1, 1.0), st.floats(1.0, 20.0))
def test_allowable_height_round_trip(W: float, ratio: float, de: float, eta: float,
                                     mu_limit: float) -> None:
    # inverse of the forward balance: dropping from h_allow gives μ = μ_limit
    Ru = ratio * W
    h = float(plastic.allowable_height_plastic(W, eta, Ru, de, mu_limit))
    if math.isnan(h):
        assert Ru * (mu_limit - 0.5) < W * mu_limit
        return
    _, mu, _ = plastic.plastic_response(W, h, eta, Ru, de)
    assert float(mu) == pytest.approx(mu_limit, rel=1e-8)


def test_allowable_height_none_when_collapsing() -> None:
    assert math.isnan(float(plastic.allowable_height_plastic(10e3, 1.0, 9e3, 0.01, 6.0)))


@pytest.mark.parametrize(
    ("cond", "L", "a", "dm", "expected"),
    [
        ("simple", 6.0, 3.0, 0.1, math.atan(2 * 0.1 / 6.0)),  # midspan: atan(2δm/L)
        ("fixed", 6.0, 1.5, 0.1, math.atan(0.1 / 1.5)),  # nearer support governs
        ("simple", 6.0, 4.0, 0.1, math.atan(0.1 / 2.0)),
        ("cantilever", 6.0, 4.0, 0.1, math.atan(0.1 / 4.0)),  # arm turns about the root
    ],
)
def test_support_rotation(cond: str, L: float, a: float, dm: float, expected: float) -> None:
    # Biggs / UFC 3-340-02 (from memory): rigid segments about the hinge under the load
    assert float(plastic.support_rotation(dm, L, a, cond)) == pytest.approx(expected, rel=REL)
