"""Dynamic amplification table against the time history on random members.

Sources: the time history of droprig.solver.timehistory, itself checked against
Blevins (1979) Table 8-1, Clough & Penzien 2nd ed. §18-2 and Gere 7th ed. §9.10 in
tests/solver/test_timehistory.py; Timoshenko, *Strength of Materials* Part I (the
Rayleigh struck-mass method is exact for a heavy load, so the factor tends to 1).
The random cases here use a seed the calibration script never used.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import amplification, beam, impact, timehistory

N_CASES = 200  # brief: never lower than the time history on 200 random member cases
CONDS = ("simple", "fixed", "propped", "cantilever")


def _random_case(rng: np.random.Generator) -> tuple[str, float, float, float, float,
                                                   float, float, float]:
    cond = CONDS[int(rng.integers(4))]
    L = rng.uniform(2.0, 15.0)
    EI = 2e11 * math.exp(rng.uniform(math.log(1e-6), math.log(1e-3)))
    mu = math.exp(rng.uniform(math.log(10.0), math.log(300.0)))
    a = L * (rng.uniform(0.3, 1.0) if cond == "cantilever" else rng.uniform(0.08, 0.92))
    r = math.exp(rng.uniform(math.log(0.02), math.log(300.0)))
    kappa = math.exp(rng.uniform(math.log(0.001), math.log(10.0)))
    h = math.exp(rng.uniform(math.log(0.02), math.log(3.0)))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
    f_c = kappa * float(beam.green(cond, L, EI, a, a))
    return cond, L, EI, mu, a, r * m_e, h, f_c


@pytest.mark.parametrize(("struck_mass", "n_cases", "seed"), [
    (True, N_CASES, 20261203),  # the energy method with η = M/(M + mₑ)
    (False, N_CASES // 2, 20261204),  # η = 1, droprig's rule under mats
])
def test_amplified_demand_never_below_time_history(struck_mass: bool, n_cases: int,
                                                   seed: int) -> None:
    rng = np.random.default_rng(seed)
    worst = {"force": 0.0, "moment": 0.0, "shear": 0.0, "deflection": 0.0}
    for _ in range(n_cases):
        cond, L, EI, mu, a, M, h, f_c = _random_case(rng)
        e = timehistory.energy_method_peaks(cond, L, EI, mu, a, M, h, f_c,
                                            struck_mass=struck_mass)
        t = timehistory.time_history(cond, L, EI, mu, a, M, h, f_c)
        amp = amplification.amplification(M, e.effective_mass, f_c,
                                          beam.green(cond, L, EI, a, a),
                                          struck_mass=struck_mass)
        bound = float(amplification.contact_force_bound(M * impact.G, h, f_c))
        for key in worst:
            demand = float(getattr(amp, key)) * float(getattr(e, key))
            if key == "force":  # the tighter of the two upper bounds
                demand = min(demand, bound)
            th = float(getattr(t, key)[0])
            worst[key] = max(worst[key], th / demand)
            assert demand >= th, (key, cond, L, EI, mu, a, M, h, f_c)
    # and the table is not loose everywhere: each quantity comes within 40 % of the
    # time history on some case (cell maxima + neighbours + 10–15 % margin)
    assert min(worst.values()) > 0.6, worst


def test_heavy_load_factors_are_the_least() -> None:
    # Timoshenko Part I: the struck-mass method is exact for a heavy load, so the
    # heaviest row holds the least factors of every column, and (a soft contact)
    # stays within the calibration's margin and neighbour spread (+30 %) of 1
    for table in ("_FORCE", "_MOMENT", "_SHEAR", "_DEFLECTION"):
        t = np.asarray(getattr(amplification, table))
        assert np.all(t[-1] <= t.min(axis=0) + 1e-12), table
    amp = amplification.amplification(1e4, 1.0, 10.0, 1.0)
    for key in ("force", "moment", "deflection"):
        assert 1.0 <= float(getattr(amp, key)) <= 1.30


def test_light_loads_amplified_more_than_heavy() -> None:
    # the under-reading grows as the load gets lighter (time history, test_timehistory)
    light = amplification.amplification(0.05, 1.0, 0.05, 1.0)
    heavy = amplification.amplification(50.0, 1.0, 0.05, 1.0)
    assert float(light.moment) > float(heavy.moment) >= 1.0
    assert float(light.deflection) > float(heavy.deflection) >= 1.0


def test_degenerate_paths_take_one() -> None:
    # no struck mass (mₑ = 0) or a rigid point (f_s = 0): the energy method is exact
    amp = amplification.amplification([10.0, 10.0], [0.0, 1.0], [1e-6, 1e-6], [1e-3, 0.0])
    np.testing.assert_array_equal(amp.moment, [1.0, 1.0])
    np.testing.assert_array_equal(amp.force, [1.0, 1.0])


def test_rigid_contact_is_flagged() -> None:
    amp = amplification.amplification(10.0, 1.0, 0.0, 1e-3)
    assert bool(amp.beyond_table)
    assert float(amp.moment) >= 1.0


@pytest.mark.parametrize("table", ["_FORCE", "_MOMENT", "_SHEAR", "_DEFLECTION"])
def test_table_shape_and_floor(table: str) -> None:
    t = np.asarray(getattr(amplification, table))
    assert t.shape == (len(amplification.MASS_RATIO_EDGES) + 1,
                       len(amplification.COMPLIANCE_RATIO_EDGES) + 1)
    assert np.all(t >= 1.0)


def test_contact_force_bound_gere() -> None:
    # Gere §9.10 Eq. 9-94 with η = 1: W(1 + √(1 + 2h/δst)), δst = W·f_c; a rigid
    # contact has no bound
    W, h, f_c = 1000.0, 0.5, 1e-6
    expect = W * (1.0 + math.sqrt(1.0 + 2.0 * h / (W * f_c)))
    b = amplification.contact_force_bound(W, h, [f_c, 0.0])
    assert b[0] == pytest.approx(amplification.RIGID_BASE_MARGIN * expect, rel=1e-12)
    assert math.isinf(b[1])
