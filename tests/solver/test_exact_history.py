"""The phase-exact time history (droprig.solver.exacthistory) against closed forms and
against the Newmark reference (droprig.solver.timehistory).

Sources:
* Gere, *Mechanics of Materials* 7th ed., §9.10, Eq. 9-94: a mass dropped on a
  massless linear spring, K = 1 + √(1 + 2h/δst); h = 0 (suddenly applied load) K = 2.
* Chopra, *Dynamics of Structures* 4th ed., §3.1 (a suddenly applied constant force on
  an undamped SDF system: u(t) = u_st(1 − cos ωt), peak 2·u_st) and §12.4 (modal
  superposition); Clough & Penzien 2nd ed. §18-2 (simple beam ωₙ = n²π²√(EI/m̄L⁴)).
* Timoshenko, *Strength of Materials* Part I (impact with the beam's mass): the
  Rayleigh energy method is exact in the limit of a heavy load.
* Chopra 4th ed. §5.5 (Fig. 5.5.2 / Table 5.5.x, from memory): Newmark's average
  acceleration has no amplitude decay but a period elongation of about
  (ωΔt)²/12; at 8 steps per period of the highest kept mode (the reference's step)
  that is ~5 % of a period per period, so over a run of many periods the reference's
  high-mode phases drift and single peaks differ case by case (the exact phases are
  checked against a finer Newmark run below).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import beam, exacthistory, impact, timehistory

G = impact.G
# sampling of a peak: 8 samples a period, refined by a parabola through the largest and
# its neighbours — on a pure cosine at most 0.85 % low (hand calculation: samples at
# ±π/8 and 3π/8 from the crest give a vertex of 0.9916); the margin's study covers it
REL_CLOSED = 0.0085
REL_HEAVY = 0.02  # issue 12: the heavy-load limit reproduces the energy method within 2 %
# against the Newmark reference on 100 random cases: medians within 1 %, 90 % of the
# cases within 10 %, none beyond [0.75, 1.5] (Newmark's period error, module docstring)
REL_MEDIAN = 0.01
REL_P90 = 0.10
BAND = (0.75, 1.5)

# a W-shape-like member: E = 200 GPa, I = 1e-4 m⁴, 50 kg/m, 6 m (invented demo values)
L, EI, MU = 6.0, 2e11 * 1e-4, 50.0
CONDS = ("simple", "fixed", "propped", "cantilever")


@pytest.mark.parametrize("h_over_dst", [0.0, 1.0, 10.0, 300.0])
@pytest.mark.parametrize("cond", ["simple", "cantilever"])
def test_mass_on_massless_spring_gere(cond: str, h_over_dst: float) -> None:
    # Gere §9.10 Eq. 9-94 (no member modes in time: a massless spring)
    a = 2.5 if cond == "simple" else L
    f_s = float(beam.green(cond, L, EI, a, a))
    M = 500.0
    h = h_over_dst * M * G * 2.0 * f_s
    # 64 sections as the reference (the verdict's 16 find the largest deflection,
    # which lies between the load and midspan, within 0.5 %)
    res = exacthistory.exact_time_history(cond, L, EI, MU, a, M, h, f_s, n_modes=0,
                                          sections=64)
    K = 1.0 + math.sqrt(1.0 + 2.0 * h_over_dst)
    assert res.force[0] == pytest.approx(K * M * G, rel=REL_CLOSED)
    e = timehistory.energy_method_peaks(cond, L, EI, 0.0, a, M, h, f_s)
    assert res.deflection[0] == pytest.approx(float(e.deflection), rel=REL_CLOSED)
    assert res.moment[0] == pytest.approx(float(e.moment), rel=REL_CLOSED)


def test_crushing_contact_holds_its_force() -> None:
    # an elastic–perfectly plastic contact on a massless spring (Gere §9.10's energy
    # balance with a plastic plateau): the force never passes F_y, and the load stops
    # after a travel δ with W·(h + δ) = ½F_y·δ_y + F_y·(δ − δ_y), δ_y = F_y·f, so
    # δ = (W·h + ½F_y²·f)/(F_y − W) and the permanent set is δ − δ_y
    a = 2.5
    f_s = float(beam.green("simple", L, EI, a, a))
    M, h = 500.0, 0.5
    W = M * G
    F_y = 5.0 * W
    res = exacthistory.exact_time_history("simple", L, EI, MU, a, M, h, f_s, n_modes=0,
                                          F_yield=F_y)
    assert float(res.force[0]) == pytest.approx(F_y, rel=1e-9)
    f = 2.0 * f_s
    delta = (W * h + 0.5 * F_y**2 * f) / (F_y - W)
    assert res.crush is not None
    assert float(res.crush[0]) == pytest.approx(delta - F_y * f, rel=REL_CLOSED)


@pytest.mark.parametrize("cond", CONDS)
def test_heavy_load_reproduces_energy_method(cond: str) -> None:
    # Timoshenko Part I: load mass ≫ beam mass — within 2 % (issue 12)
    a = 0.4 * L if cond != "cantilever" else L
    f_s = float(beam.green(cond, L, EI, a, a))
    m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * MU * L
    M, h = 1000.0 * m_e, 0.05
    e = timehistory.energy_method_peaks(cond, L, EI, MU, a, M, h, f_s)
    t = exacthistory.exact_time_history(cond, L, EI, MU, a, M, h, f_s)
    for q in ("force", "moment", "shear", "deflection"):
        assert float(getattr(t, q)[0]) == pytest.approx(float(getattr(e, q)), rel=REL_HEAVY)


def _random_cases(rng: np.random.Generator, n: int) -> dict[str, np.ndarray]:
    """Random members and contacts (ranges of scripts/calibrate_contact_bound.py, the
    contact no stiffer than 1 % of the member's so that the reference stays cheap),
    a third with a crushing contact. Invented inputs, compared method to method."""
    rows = []
    for _ in range(n):
        cond = CONDS[int(rng.integers(4))]
        Lr = rng.uniform(2.0, 15.0)
        EIr = 2e11 * math.exp(rng.uniform(math.log(1e-6), math.log(1e-3)))
        mu = math.exp(rng.uniform(math.log(10.0), math.log(300.0)))
        a = Lr * (rng.uniform(0.3, 1.0) if cond == "cantilever" else rng.uniform(0.08, 0.92))
        f_s = float(beam.green(cond, Lr, EIr, a, a))
        m_e = float(beam.rayleigh_mass_factor(cond, Lr, a)) * mu * Lr
        M = m_e * math.exp(rng.uniform(math.log(0.03), math.log(100.0)))
        f_c = f_s * math.exp(rng.uniform(math.log(0.01), math.log(3.0)))
        h = math.exp(rng.uniform(math.log(0.02), math.log(2.0)))
        F_el = float(timehistory.energy_method_peaks(cond, Lr, EIr, mu, a, M, h, f_c).force)
        F_y = max(1.5 * M * G, 0.4 * F_el) if rng.uniform() < 1.0 / 3.0 else math.inf
        rows.append((cond, Lr, EIr, mu, a, M, h, f_c, F_y))
    cols = list(zip(*rows, strict=True))
    out = {"cond": np.array(cols[0], dtype=object)}
    for i, k in enumerate(("L", "EI", "mu", "a", "M", "h", "f_c", "F_y"), start=1):
        out[k] = np.array(cols[i], float)
    return out


@pytest.fixture(scope="module")
def against_newmark():
    c = _random_cases(np.random.default_rng(20261204), 100)
    args = (c["cond"], c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    ex = exacthistory.exact_time_history(*args, F_yield=c["F_y"])
    ref = timehistory.time_history_batched(*args, F_yield=c["F_y"])
    return c, ex, ref


@pytest.mark.parametrize("q", ["force", "moment", "shear", "deflection"])
def test_agrees_with_newmark_on_random_cases(against_newmark, q: str) -> None:
    _, ex, ref = against_newmark
    r = getattr(ex, q) / getattr(ref, q)
    assert abs(float(np.median(r)) - 1.0) < REL_MEDIAN
    assert float(np.mean(np.abs(r - 1.0) <= REL_P90)) >= 0.9
    assert np.all((r >= BAND[0]) & (r <= BAND[1])), (float(r.min()), float(r.max()))


def test_differences_are_newmarks_time_step(against_newmark) -> None:
    # where the two differ most, a Newmark run with 4 × finer steps moves toward the
    # exact phases (Chopra §5.5: the reference's period error falls as Δt²)
    c, ex, ref = against_newmark
    r = ex.force / ref.force
    i = int(np.argmax(np.abs(np.log(r))))
    args = [c[k][i] for k in ("cond", "L", "EI", "mu", "a", "M", "h", "f_c")]
    fine = timehistory.time_history(*args, F_yield=c["F_y"][i], steps_per_period=160)
    assert abs(float(fine.force[0]) - float(ex.force[i])) < abs(float(ref.force[i])
                                                                - float(ex.force[i]))


def test_recorded_history_matches_its_peaks() -> None:
    # one recorded case: the history's largest contact force and moment are the peaks
    a = 0.5 * L
    f_s = float(beam.green("simple", L, EI, a, a))
    t = exacthistory.exact_time_history("simple", L, EI, MU, a, 0.1 * MU * L, 1.0,
                                        0.1 * f_s, record=True)
    hist = t.history
    assert hist is not None
    assert np.all(np.diff(hist.t) >= -1e-15)
    assert np.all(hist.contact_force >= -1e-6 * float(t.force[0]))
    assert float(hist.contact_force.max()) == pytest.approx(float(t.force[0]), rel=0.02)
    assert float(hist.moment.max()) == pytest.approx(float(t.moment[0]), rel=0.02)
    assert math.isfinite(t.t_separation[0])  # a light load bounces off


def test_bad_input_is_refused() -> None:
    with pytest.raises(ValueError, match="F_yield"):
        exacthistory.exact_time_history("simple", L, EI, MU, 3.0, 100.0, 1.0, 1e-8,
                                        F_yield=0.5 * 100.0 * G)
    with pytest.raises(ValueError, match="h:"):
        exacthistory.exact_time_history("simple", L, EI, MU, 3.0, 100.0, math.nan, 1e-8)
