"""Dynamic amplification with the crushing-limited contact, against the time history.

The verdict's demands (:func:`droprig.solver.amplification.amplified_forces`: the
calibrated tables, the rigid-base bound, the crushing force and the member's response
per unit peak contact force) must never read lower than the time history of
:mod:`droprig.solver.timehistory` with the same cap — an elastic–perfectly plastic
contact spring (crushing force, stroke). The time history itself is checked against
Blevins (1979) Table 8-1, Clough & Penzien 2nd ed. §18-2 and Gere 7th ed. §9.10 in
tests/solver/test_timehistory.py; the plastic contact here against the energy
balance of a mass on an elastic–perfectly plastic spring (Biggs, *Introduction to
Structural Dynamics* 1964, §2.5, from memory). Random cases use seeds the
calibration scripts never used; all cases run vectorised in one batched call.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import amplification, beam, crushing, impact, timehistory

N_CASES = 240  # brief: at least 200 random cases
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
    kappa = np.exp(rng.uniform(math.log(0.001), math.log(10.0), n))
    h = np.exp(rng.uniform(math.log(0.02), math.log(3.0), n))
    f_s = np.array([float(beam.green(c, l, ei, x, x))
                    for c, l, ei, x in zip(cond, L, EI, a, strict=True)])
    m_e = np.array([float(beam.rayleigh_mass_factor(c, l, x))
                    for c, l, x in zip(cond, L, a, strict=True)]) * mu * L
    M, f_c = r * m_e, kappa * f_s
    # η = M/(M + mₑ·(f_s/(f_s + f_c))²), the chain's struck-mass rule; else η = 1
    # (under mats)
    struck = rng.uniform(size=n) < 0.6
    W = M * impact.G
    eta = np.where(struck, impact.mass_efficiency(M, m_e * (f_s / (f_s + f_c)) ** 2), 1.0)
    _, F_el, _ = impact.impact_elastic(W, h, f_s + f_c, eta)
    capped = rng.uniform(size=n) < 0.75
    F_y = np.where(capped, np.maximum(3.0 * W, F_el * np.exp(rng.uniform(
        math.log(0.05), math.log(3.0), n))), np.inf)
    s_y = np.where(capped & (rng.uniform(size=n) < 1.0 / 3.0),
                   np.exp(rng.uniform(math.log(1e-3), math.log(0.1), n)), np.inf)
    return {"cond": cond, "L": L, "EI": EI, "mu": mu, "a": a, "M": M, "h": h, "f_c": f_c,
            "f_s": f_s, "m_e": m_e, "struck": struck, "W": W, "eta": eta, "F_el": F_el,
            "F_y": F_y, "s_y": s_y}


def _verdict_forces(c: dict[str, np.ndarray]) -> amplification.AmplifiedForces:
    """The chain's rule (droprig.solver.chain.dynamic_amplification) for one member."""
    W, h, f = c["W"], c["h"], c["f_s"] + c["f_c"]
    # the energy method as the chain gives it: capped by crushing where it crushes
    F = c["F_el"].copy()
    bottomed = np.zeros(F.size, bool)
    cap = np.isfinite(c["F_y"])
    F[cap], _, bottomed[cap] = crushing.crushing_limited_impact(
        W[cap], h[cap], f[cap], c["eta"][cap], c["F_y"][cap], c["s_y"][cap])
    amp = amplification.amplification(c["M"], c["m_e"], c["f_c"], c["f_s"],
                                      struck_mass=c["struck"], cond=c["cond"],
                                      xi=c["a"] / c["L"])
    rigid = amplification.contact_force_bound(W, h, c["f_c"])
    holds = amplification.crush_depth_bound(W, h, f, c["F_y"]) <= c["s_y"]
    # the most energy the drop puts into the member (the chain's energy bound)
    F_E = amplification.member_energy_force(W, h, c["f_s"], c["f_c"], c["F_y"], c["s_y"])
    return amplification.amplified_forces(amp, F, c["F_el"], rigid, c["F_y"], holds,
                                          bottomed, F_energy=F_E)


def _unit(c: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    xi = np.linspace(0.0, 1.0, 401)
    rows = [(float(beam.max_abs_moment(cd, L, 1.0, a)),
             float(beam.max_abs_shear(cd, L, 1.0, a)),
             max(float(np.max(beam.green(cd, L, EI, L * xi, a))),
                 float(beam.green(cd, L, EI, a, a))))
            for cd, L, EI, a in zip(c["cond"], c["L"], c["EI"], c["a"], strict=True)]
    m1, v1, d1 = (np.array(col) for col in zip(*rows, strict=True))
    return m1, v1, d1


@pytest.fixture(scope="module")
def runs() -> tuple[dict[str, np.ndarray], timehistory.TimeHistoryPeaks]:
    c = _cases(20261205, N_CASES)
    t = timehistory.time_history_batched(c["cond"], c["L"], c["EI"], c["mu"], c["a"],
                                         c["M"], c["h"], c["f_c"], F_yield=c["F_y"],
                                         stroke=c["s_y"])
    return c, t


def test_verdict_never_below_the_capped_time_history(runs) -> None:
    c, t = runs
    fo = _verdict_forces(c)
    m1, v1, d1 = _unit(c)
    worst = {}
    for key, demand, th in (("force", fo.local, t.force), ("moment", fo.moment * m1, t.moment),
                            ("shear", fo.shear * v1, t.shear),
                            ("deflection", fo.deflection * d1, t.deflection)):
        bad = np.flatnonzero(demand < th * (1.0 - 1e-9))
        assert bad.size == 0, (key, [(c["cond"][i], c["M"][i], c["h"][i], c["F_y"][i],
                                      th[i] / demand[i]) for i in bad[:5]])
        worst[key] = float(np.max(th / demand))
    # the capped contact is really exercised, and the bound is not loose everywhere
    assert int(np.sum(fo.capped)) > N_CASES // 3
    assert min(worst.values()) > 0.5, worst


def test_capped_contact_never_passes_the_crushing_force(runs) -> None:
    # elastic–perfectly plastic contact (Johnson, Contact Mechanics §6.2): while the
    # stroke is not used up the contact force never exceeds the crushing force
    c, t = runs
    held = np.isfinite(c["F_y"]) & ~np.isfinite(c["s_y"])
    assert held.sum() > 100
    assert np.all(t.force[held] <= c["F_y"][held] * (1 + 1e-9))
    # and the crushed depth stays within its energy bound (the "holds" test)
    bound = amplification.crush_depth_bound(c["W"], c["h"], c["f_s"] + c["f_c"], c["F_y"])
    crushed = held & (t.crush > 0.0)
    assert crushed.sum() > 50
    assert np.all(t.crush[crushed] <= bound[crushed])


def test_heavy_load_crush_depth_matches_energy_balance() -> None:
    # a heavy load (r = 300) on a light member through an elastic–perfectly plastic
    # spring: the member is quasi-static, so the crushed depth follows the energy
    # balance W(h + c + δ) = F_y·c + F_y²f/2 (Biggs 1964 §2.5, from memory; Gere 7th ed.
    # §9.10 with η = 1), i.e. droprig.solver.impact.impact_crushable
    cond, L, EI, mu, a = "simple", 6.0, 1e7, 50.0, 3.0
    f_s = float(beam.green(cond, L, EI, a, a))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
    M, h, f_c = 300.0 * m_e, 0.5, 0.05 * f_s
    W = M * impact.G
    F_el = float(impact.impact_elastic(W, h, f_s + f_c, 1.0)[1])
    F_y = 0.5 * F_el
    t = timehistory.time_history(cond, L, EI, mu, a, M, h, f_c, F_yield=F_y)
    _, c_energy, _ = impact.impact_crushable(W, h, f_s + f_c, 1.0, F_y, math.inf)
    assert float(t.force[0]) == pytest.approx(F_y, rel=1e-9)
    assert float(t.crush[0]) == pytest.approx(float(c_energy), rel=0.03)


def test_stroke_used_up_the_force_rises_again() -> None:
    # past its stroke the contact is elastic and uncapped (bottomed out): the peak
    # force passes F_y, as droprig.solver.impact.impact_crushable case 3
    cond, L, EI, mu, a = "simple", 6.0, 1e7, 50.0, 3.0
    f_s = float(beam.green(cond, L, EI, a, a))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
    M, h, f_c = 300.0 * m_e, 0.5, 0.05 * f_s
    W = M * impact.G
    F_y = 0.5 * float(impact.impact_elastic(W, h, f_s + f_c, 1.0)[1])
    # the first landing only (duration 0.5: the run ends before the load, which
    # bounces off at ~0.6 s, lands again at ~1.2 s; on the member's six kept modes,
    # swinging up to meet it, that second landing reads ~30 % more — with no member
    # modes in time it repeats the first, energy being conserved)
    t = timehistory.time_history(cond, L, EI, mu, a, M, h, f_c, F_yield=F_y, stroke=0.01,
                                 duration=0.5)
    F_b, _, bottomed = impact.impact_crushable(W, h, f_s + f_c, 1.0, F_y, 0.01)
    assert bool(bottomed)
    assert float(t.force[0]) > F_y
    assert float(t.force[0]) == pytest.approx(float(F_b), rel=0.05)
    # the set passes the stroke by at most the last time step's crushing
    assert float(t.crush[0]) == pytest.approx(0.01, rel=0.01)


def test_crushing_force_must_exceed_the_weight() -> None:
    with pytest.raises(ValueError, match="F_yield"):
        timehistory.time_history("simple", 6.0, 1e7, 50.0, 3.0, 1000.0, 0.5, 1e-8,
                                 F_yield=100.0)
