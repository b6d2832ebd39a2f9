"""The exact history of a load on a crushable layer over a floor with mass, phase by
phase in closed form (``crushhistory.crush_history``), checked against an independent
integration and by hand in its limits.

Sources: Biggs, *Introduction to Structural Dynamics* (1964) ch. 2 (a suddenly
applied constant force on an undamped oscillator: dynamic load factor 2) and
Clough & Penzien, *Dynamics of Structures*, ch. 2–4 and 9–12 (free vibration of one
and two degrees of freedom, modal superposition) — from memory. The independent
method is the scipy ``solve_ivp`` time history of the same system
(tests/solver/test_after_bottoming.py ``_history``: load – contact spring – layer
rigid–plastic at F_c to its stroke – floor mass – framing), run to the same window's
end, and scipy.linalg.eigh for the two modes. The systems are random (invented
numbers; the expected values are the history's), drawn from the ranges of the
240-system sweep of the stop that found the soft-contact shortfall: contacts from
0.05 × to 1000 × the framing's stiffness, crush forces 1.5–12 × the load's weight.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg

from droprig.solver import struck_mass
from droprig.solver.crushhistory import _modes, crush_history
from droprig.solver.impact import G, framing_under_crush
from tests.solver.test_after_bottoming import _history

TH_TOL = 2e-3
"""The closed form may read this much below the history: the integrator's tolerance
(rtol 1e-7, 12 steps a period of the fast mode) at the phase changes; measured
0.9998 at the lowest."""
TH_OVER = 1.01
"""... and this much above it (the same model over the same window; the peaks'
sampling refined by Newton's method; measured 0.9997–1.0015 on 240 systems of the
sweep's ranges)."""
N_CASES = 12


def _sweep(rng: np.random.Generator, n: int) -> np.ndarray:
    """n random systems (M, v0, F_c, s_c, k_c, m2, k2) in the sweep's ranges; a third
    with a stroke short enough to be spent (bottoming out)."""
    rows = []
    for i in range(n):
        M = 10 ** rng.uniform(1.5, 3.5)
        m2, k2 = 10 ** rng.uniform(2.5, 4.2), 10 ** rng.uniform(6.3, 7.7)
        kc = k2 * 10 ** rng.uniform(-1.3, 2.0)
        W = M * G
        F_c, h = W * rng.uniform(1.5, 12.0), rng.uniform(0.05, 2.0)
        s_c = 3.0 * W * h / (F_c - W) + 0.05  # never spent
        if i % 3 == 2:
            s_c = 0.3 * W * h / (F_c - W)  # a tenth of that: spent
        rows.append((M, math.sqrt(2.0 * G * h), F_c, s_c, kc, m2, k2))
    return np.array(rows).T


@pytest.fixture(scope="module")
def sweep() -> dict[str, np.ndarray]:
    a = _sweep(np.random.default_rng(28), N_CASES)
    r = crush_history(*a)
    hist = np.array([_history(*a[:, j], math.inf, 0.0, t_end=float(r.t_end[j]))[:2]
                     for j in range(a.shape[1])])
    return {"a": a, "F_frame": r.F_frame, "F_contact": r.F_contact, "F_all": r.F_all,
            "bottomed": r.bottomed, "bounded": r.bounded, "phases": r.phases,
            "h_contact": hist[:, 0], "h_frame": hist[:, 1]}


def test_framing_peak_follows_the_time_history(sweep):
    ratio = sweep["F_frame"] / sweep["h_frame"]
    assert ratio.min() >= 1.0 - TH_TOL, ratio
    assert ratio.max() <= TH_OVER, ratio
    assert np.median(ratio) <= 1.002, ratio  # exact but for the supremum
    # the connector's peak likewise (F_c while crushing; the contact's rise, and the
    # spent layer's elastic contact once bottomed)
    rc = sweep["F_contact"] / sweep["h_contact"]
    assert rc.min() >= 1.0 - TH_TOL and rc.max() <= TH_OVER, rc
    assert not sweep["bounded"].any()  # every case ended by rules 1 and 2 or the window


def test_the_sweep_covers_soft_and_stiff_contacts_and_bottoming(sweep):
    a = sweep["a"]
    kappa = a[4] / a[6]
    assert (kappa < 1.0).sum() >= 3 and (kappa > 10.0).sum() >= 3, kappa
    assert sweep["bottomed"].sum() >= 3
    # a soft contact bounces: the load leaves the floor and lands again
    assert sweep["phases"][kappa < 1.0].max() >= 6
    # and the framing passes twice the layer's force where the old one-mass ride
    # capped it (histories up to 2.24·F_c on the 240-system sweep)
    nb = ~sweep["bottomed"]
    assert (sweep["h_frame"][nb] / a[2][nb]).max() > 1.2


def test_stiff_contact_limit_is_the_rigid_contact_crush():
    # k_c → ∞ (10³ × the framing): a crush lasting half the floor's period or more
    # gives the framing 2·F_c (Biggs 1964 ch. 2: a suddenly applied force), the value
    # impact.framing_under_crush is exact at; a heavy load on a stiff light floor
    M, m2, k2, F_c, v0 = 2000.0, 800.0, 1e8, 50e3, 4.0
    r = crush_history(M, v0, F_c, math.inf, 1e3 * k2, m2, k2)
    assert float(framing_under_crush(M, v0, F_c, m2, k2)) == pytest.approx(2 * F_c)
    assert float(r.F_frame[0]) == pytest.approx(2.0 * F_c, rel=2e-3)
    # a light load's short crush on a heavy floor, the load riding after it: the
    # one-mass ride of framing_under_crush is exact when the load neither leaves the
    # floor nor crushes the layer again (Clough & Penzien ch. 2 free vibration)
    M, m2, k2, F_c, v0 = 300.0, 15000.0, 3e6, 9e3, 0.5
    r = crush_history(M, v0, F_c, math.inf, 1e3 * k2, m2, k2)
    F_ride = float(framing_under_crush(M, v0, F_c, m2, k2))
    assert F_ride < 1.5 * F_c
    assert float(r.F_frame[0]) == pytest.approx(F_ride, rel=1e-2)


def test_unbreakable_layer_is_the_elastic_two_mass_system():
    # F_c → ∞: the connector stays elastic, the two-mass system of Clough & Penzien
    # ch. 9–12. Its modes by the closed-form quadratic equal scipy.linalg.eigh's of K
    # against the mass matrix (eigenvalues; shapes as x2 per unit x1)
    M = np.array([3000.0, 300.0])
    m2, k2, kc = np.array([1000.0, 9000.0]), np.array([2e7, 4e6]), np.array([5e6, 4e8])
    w, r, _ = _modes(M, m2, kc, k2)
    for j in range(2):
        K = np.array([[kc[j], -kc[j]], [-kc[j], kc[j] + k2[j]]])
        lam, phi = scipy.linalg.eigh(K, np.diag([M[j], m2[j]]))
        np.testing.assert_allclose(w[j] ** 2, lam, rtol=1e-10)
        np.testing.assert_allclose(r[j], phi[1] / phi[0], rtol=1e-9)
    # and the history of the elastic impact (the load may leave the floor and land
    # again) is the time history's, a heavy load on a soft contact and a light one
    # on a stiff contact
    v0 = np.array([0.8, 3.0])
    res = crush_history(M, v0, 1e15, math.inf, kc, m2, k2)
    assert np.all(res.crush == 0.0)
    for j in range(2):
        Fc_h, Ff_h, _ = _history(M[j], v0[j], 1e15, math.inf, kc[j], m2[j], k2[j],
                                 math.inf, 0.0, t_end=float(res.t_end[j]))
        assert 1.0 - TH_TOL <= res.F_frame[j] / Ff_h <= TH_OVER
        assert 1.0 - TH_TOL <= res.F_contact[j] / Fc_h <= TH_OVER


def test_never_above_the_energy_bound(sweep):
    # the layer only takes energy away: the framing's peak is at most the energy
    # bound of the whole fall on the framing with the layer rigid
    # (struck_mass.energy_bounds; Gere 7th ed. §9.10's balance) where it is not spent
    a = sweep["a"]
    W, h = a[0] * G, a[1] ** 2 / (2.0 * G)
    _, Bf = struck_mass.energy_bounds(W, h, 1.0 / a[4], 1.0 / a[6])
    nb = ~sweep["bottomed"]
    assert np.all(sweep["F_frame"][nb] <= Bf[nb] * (1 + 1e-9))
    # the bound over all later time (stopping rules 1 and 2) lies between the two
    assert np.all(sweep["F_all"] >= sweep["F_frame"])
    assert np.all(sweep["F_all"][nb] <= Bf[nb] * (1 + 1e-9))


@pytest.mark.parametrize("field, kwargs, words", [
    ("M", {"M": 0.0}, "M: the load's mass"),
    ("k_c", {"k_c": math.inf}, "k_c: the contact stiffness"),
    ("m2", {"m2": -1.0}, "m2: the floor's mass"),
    ("k2", {"k2": math.nan}, "k2: the framing's stiffness"),
    ("v0", {"v0": -1.0}, "v0: the strike speed"),
    ("s_c", {"s_c": -0.1}, "s_c: the layer's stroke"),
    ("F_c", {"F_c": 100.0}, "F_c: a layer that crushes under the load's weight"),
])
def test_bad_input_names_the_field(field, kwargs, words):
    # common practice, no source: a clear message naming the field and its range
    args = {"M": 1000.0, "v0": 2.0, "F_c": 3e4, "s_c": math.inf, "k_c": 1e7,
            "m2": 5000.0, "k2": 1e7} | kwargs
    with pytest.raises(ValueError, match=words):
        crush_history(**args)
