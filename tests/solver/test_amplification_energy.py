"""The member energy bound of dynamic amplification, against the time history.

:func:`droprig.solver.amplification.member_energy_force` bounds the energy the drop
puts into the member (energy conservation, less what crushing dissipates) and turns
it into the static force at the struck point that stores it (minimum potential
energy: the static shape under a point force stores least strain energy for a given
deflection there). The deflection at the struck point is then bounded exactly; the
member's largest moment and deflection through the calibrated factors
``B_ENERGY_MOMENT`` / ``B_ENERGY_DEFLECTION`` (scripts/calibrate_energy_bound.py,
seed 11). The time history is :mod:`droprig.solver.timehistory` (Euler–Bernoulli
modes, Blevins 1979 Table 8-1; Newmark, Chopra 4th ed. §5.4), checked in
tests/solver/test_timehistory.py. Random cases use a seed the calibration never used,
with contacts down to κ = 1e-4 (a steel item on a concrete deck).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import amplification, beam, impact, timehistory

N_CASES = 120
CONDS = ("simple", "fixed", "propped", "cantilever")


def _cases(seed: int, n: int) -> dict[str, np.ndarray]:
    rng = np.random.default_rng(seed)
    cond = np.array([CONDS[i] for i in rng.integers(4, size=n)], dtype=object)
    L = rng.uniform(2.0, 15.0, n)
    EI = 2e11 * np.exp(rng.uniform(math.log(1e-6), math.log(1e-3), n))
    mu = np.exp(rng.uniform(math.log(10.0), math.log(300.0), n))
    cant = cond == "cantilever"
    a = L * np.where(cant, rng.uniform(0.3, 1.0, n), rng.uniform(0.08, 0.92, n))
    r = np.exp(rng.uniform(math.log(0.02), math.log(300.0), n))
    kappa = np.exp(rng.uniform(math.log(1e-4), math.log(10.0), n))
    h = np.exp(rng.uniform(math.log(0.02), math.log(3.0), n))
    f_s = np.array([float(beam.green(c, l, ei, x, x))
                    for c, l, ei, x in zip(cond, L, EI, a, strict=True)])
    m_e = np.array([float(beam.rayleigh_mass_factor(c, l, x))
                    for c, l, x in zip(cond, L, a, strict=True)]) * mu * L
    M, f_c = r * m_e, kappa * f_s
    W = M * impact.G
    _, F_el, _ = impact.impact_elastic(W, h, f_s + f_c, 1.0)
    capped = rng.uniform(size=n) < 0.7
    F_y = np.where(capped, np.maximum(1.2 * W, F_el * np.exp(rng.uniform(
        math.log(0.02), math.log(2.0), n))), np.inf)
    s_y = np.where(capped & (rng.uniform(size=n) < 1.0 / 3.0),
                   np.exp(rng.uniform(math.log(1e-3), math.log(0.1), n)), np.inf)
    return {"cond": cond, "L": L, "EI": EI, "mu": mu, "a": a, "M": M, "h": h, "f_c": f_c,
            "f_s": f_s, "W": W, "F_y": F_y, "s_y": s_y, "kappa": kappa}


@pytest.fixture(scope="module")
def runs() -> tuple[dict[str, np.ndarray], timehistory.TimeHistoryPeaks, np.ndarray]:
    c = _cases(20261204, N_CASES)
    t = timehistory.time_history_batched(c["cond"], c["L"], c["EI"], c["mu"], c["a"],
                                         c["M"], c["h"], c["f_c"], F_yield=c["F_y"],
                                         stroke=c["s_y"])
    F_E = amplification.member_energy_force(c["W"], c["h"], c["f_s"], c["f_c"], c["F_y"],
                                            c["s_y"])
    return c, t, F_E


def _unit(c: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray]:
    xi = np.linspace(0.0, 1.0, 401)
    m1 = np.array([float(beam.max_abs_moment(cd, L, 1.0, a))
                   for cd, L, a in zip(c["cond"], c["L"], c["a"], strict=True)])
    d1 = np.array([max(float(np.max(beam.green(cd, L, EI, L * xi, a))),
                       float(beam.green(cd, L, EI, a, a)))
                   for cd, L, EI, a in zip(c["cond"], c["L"], c["EI"], c["a"], strict=True)])
    return m1, d1


def test_energy_bound_holds_the_time_history(runs) -> None:
    c, t, F_E = runs
    m1, d1 = _unit(c)
    q_m = t.moment / (amplification.B_ENERGY_MOMENT * F_E * m1)
    q_d = t.deflection / (amplification.B_ENERGY_DEFLECTION * F_E * d1)
    assert np.all(q_m <= 1.0), np.sort(q_m)[-5:]
    assert np.all(q_d <= 1.0), np.sort(q_d)[-5:]
    # not loose everywhere: the worst cases come within 2 of the bound
    assert q_m.max() > 0.5 and q_d.max() > 0.5, (q_m.max(), q_d.max())
    # the stiff contacts, where the contact-force bound grows without limit, are there
    assert int(np.sum(c["kappa"] < 1e-2)) > N_CASES // 4


def test_heavy_load_reaches_the_energy_bound() -> None:
    # a load 300 × the member's effective mass on an elastic contact: the member is
    # quasi-static and takes nearly all the energy, so its deflection at the struck
    # point (mid-span: the largest) is the energy method's with η = 1 (Gere 7th ed.
    # §9.10 Eq. 9-94 on f_s + f_c) and stays at or below F_E·f_s (the static shape
    # stores least strain energy for a given deflection at the struck point: the
    # bound is exact there)
    cond, L, EI, mu, a = "simple", 6.0, 2e7, 60.0, 3.0
    f_s = float(beam.green(cond, L, EI, a, a))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
    M, h, f_c = 300.0 * m_e, 0.3, 0.2 * f_s
    W = M * impact.G
    t = timehistory.time_history(cond, L, EI, mu, a, M, h, f_c)
    F_E = float(amplification.member_energy_force(W, h, f_s, f_c)[()])
    _, F_g, _ = impact.impact_elastic(W, h, f_s + f_c, 1.0)
    assert float(t.deflection[0]) <= F_E * f_s
    assert float(t.deflection[0]) == pytest.approx(float(F_g) * f_s, rel=0.03)
    assert F_E >= float(F_g)


def test_member_energy_force_hand_check() -> None:
    # a 100 kg load falling 0.5 m onto a member of 1e-6 m/N through a rigid contact:
    # s = W·f·(1 + √(1 + 2h/(W·f))) (Gere 7th ed. §9.10 Eq. 9-94, η = 1), E = W·(h + s),
    # F_E = √(2E/f_s) = W·(1 + √(1 + 2h/(W·f))) when f_c = 0 (the same equation)
    W, h, f = 100.0 * impact.G, 0.5, 1e-6
    K = 1.0 + math.sqrt(1.0 + 2.0 * h / (W * f))
    assert float(amplification.member_energy_force(W, h, f, 0.0)) == pytest.approx(
        W * K, rel=1e-12)
    # crushing at F_y = 5W with no stroke limit adds c = (W·h + W²f/2)/(F_y − W)
    F_y = 5.0 * W
    c = (W * h + 0.5 * W**2 * f) / (F_y - W)
    s = W * f * K
    expect = math.sqrt(2.0 * W * (h + s + c) / f)
    assert float(amplification.member_energy_force(W, h, f, 0.0, F_y)) == pytest.approx(
        expect, rel=1e-12)
    # a stroke shorter than that takes the stroke
    got = float(amplification.member_energy_force(W, h, f, 0.0, F_y, 0.1 * c))
    assert got == pytest.approx(math.sqrt(2.0 * W * (h + s + 0.1 * c) / f), rel=1e-12)
    # a rigid member (f_s = 0) is not bounded this way
    assert math.isinf(float(amplification.member_energy_force(W, h, 0.0, 1e-7)))


def test_energy_bound_lowers_a_stiff_contacts_moment_factor() -> None:
    # a light hard load (r = 0.3, κ = 1e-4) on a simple member: the contact-force
    # bound (rigid base) reads far above the energy bound, and amplified_forces takes
    # the lesser for the member moment (set by "member energy bound")
    cond, L, EI, mu, a = "simple", 8.0, 5e7, 80.0, 4.0
    f_s = float(beam.green(cond, L, EI, a, a))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
    M, h, f_c = 0.3 * m_e, 1.0, 1e-4 * f_s
    W = M * impact.G
    eta = impact.mass_efficiency(M, m_e * (f_s / (f_s + f_c)) ** 2)
    _, F, _ = impact.impact_elastic(W, h, f_s + f_c, eta)
    amp = amplification.amplification(M, m_e, f_c, f_s, cond=cond, xi=a / L)
    rigid = amplification.contact_force_bound(W, h, f_c)
    F_E = amplification.member_energy_force(W, h, f_s, f_c)
    with_e = amplification.amplified_forces(amp, F, F, rigid, np.inf, False, F_energy=F_E)
    without = amplification.amplified_forces(amp, F, F, rigid, np.inf, False)
    assert float(with_e.moment) <= float(without.moment)
    assert float(with_e.moment) <= amplification.B_ENERGY_MOMENT * float(F_E)
    t = timehistory.time_history(cond, L, EI, mu, a, M, h, f_c)
    # still above the time history (Newmark, 40 modes)
    m1 = float(beam.max_abs_moment(cond, L, 1.0, a))
    assert float(with_e.moment) * m1 >= float(t.moment[0])


def test_a_missing_energy_force_drops_its_term_only() -> None:
    # a NaN energy force must not turn the member's demands into NaN (rule: no silent
    # NaN); the other bounds stand as without it (common practice, no source)
    amp = amplification.amplification(10.0, 100.0, 1e-9, 1e-7, cond="simple", xi=0.5)
    W, h = 10.0 * impact.G, 0.5
    rigid = amplification.contact_force_bound(W, h, 1e-9)
    F = 5e3
    got = amplification.amplified_forces(amp, F, F, rigid, np.inf, False, F_energy=np.nan)
    ref = amplification.amplified_forces(amp, F, F, rigid, np.inf, False)
    for key in ("local", "moment", "shear", "deflection"):
        assert np.isfinite(getattr(got, key))
        assert float(getattr(got, key)) == float(getattr(ref, key))
