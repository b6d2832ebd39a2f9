"""The point's own time history in the verdict (``droprig.solver.pointhistory``, the
chain's ``dynamic_amplification`` step) and the bare-flange bound on the contact force.

Sources:
* AISC 360-16 §J10.2, Eq. J10-2 and J10-3 (web local yielding: Fyw·tw·(5k + lb) in
  the interior, Fyw·tw·(2.5k + lb) within d of the end), here at the tensile strength
  Fu as an upper estimate; W16X26 dimensions of the AISC Steel Construction Manual
  15th ed. Table 1-1 (d = 15.7 in, tw = 0.250 in, tf = 0.345 in, k_des = 0.747 in) and
  ASTM A992 Fu = 65 ksi, from memory.
* The time history of droprig.solver.timehistory (Blevins 1979 Table 8-1 modes,
  Newmark average acceleration — Chopra 4th ed. §5.4; checked in test_timehistory.py
  against Gere 7th ed. §9.10 and Clough & Penzien 2nd ed. §18-2) and the phase-exact
  one the verdict uses (droprig.solver.exacthistory, test_exact_history.py), refined in modes and
  time step (80 modes, cut-off 32, 160 steps per period) as the converged reference.
* Unit-load envelopes of AISC Manual Table 3-23 (via droprig.solver.beam).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.io.sections import get_grade, get_section
from droprig.solver import beam, capacity, exacthistory, impact, pointhistory, timehistory
from droprig.solver.chain import DynamicAmplification, Impact
from droprig.solver.member import MemberDrop, assess_member, member_chain

KIP = 4448.2216152605  # N per kip (NIST SP 811 App. B.8)
INCH = 0.0254  # m per inch (NIST SP 811 App. B.8)
KSI = KIP / INCH**2
REFINED = {"n_modes": 80, "cutoff": 32.0, "samples_per_period": 16, "sections": 64}
CONDS = ("simple", "fixed", "propped", "cantilever")
N_MARGIN_CASES = 20


@pytest.mark.parametrize(("dist", "lb", "expected_kip"), [
    # interior (more than d from the end), point contact: 65 × 0.250 × 5 × 0.747
    (3.0, 0.0, 65.0 * 0.250 * 5.0 * 0.747),
    # within d of the end, bearing 0.1 m = 3.937 in: 65 × 0.250 × (2.5 × 0.747 + 3.937)
    (0.1, 0.1, 65.0 * 0.250 * (2.5 * 0.747 + 0.1 / INCH)),
])
def test_flange_bound_by_hand(dist: float, lb: float, expected_kip: float) -> None:
    # AISC 360-16 Eq. J10-2 / J10-3 at Fu (hand calculation); W16X26 Table 1-1
    sec, gr = get_section("W16X26"), get_grade("A992")
    assert sec.tw == pytest.approx(0.250 * INCH, rel=1e-3)
    assert sec.k_des == pytest.approx(0.747 * INCH, rel=1e-3)
    assert gr.fu == pytest.approx(65.0 * KSI, rel=1e-3)
    F = float(capacity.flange_contact_force_bound(sec, gr, lb, dist))
    assert F == pytest.approx(expected_kip * KIP, rel=2e-3)


def test_rigid_load_on_a_bare_flange_has_a_physical_cap() -> None:
    # the W16X26 example (27 kg from 0.9 m, rigid, at midspan of 7.3 m): before the
    # bound the table gave ×16.8 on the contact force; now the contact force of the
    # time history cannot pass the flange's local yield force (269.98 kN by hand,
    # above), and the verdict's contact force is at most TH_MARGIN times that
    sec, gr = get_section("W16X26"), get_grade("A992")
    c = member_chain(MemberDrop(sec, gr, "simple", 7.3, 3.65, 27.0, 0.9, basis="aisc360",
                                dynamic_amplification=True))
    imp, da = c[Impact], c[DynamicAmplification]
    F_cap = 65.0 * 0.250 * 5.0 * 0.747 * KIP
    assert float(imp.F_crush[0]) == pytest.approx(F_cap, rel=2e-3)
    assert da.th is not None and bool(da.th[0])
    assert da.history is not None
    assert float(da.history.th["force"][0]) <= F_cap * (1 + 2e-3)
    verdict_force = float(da.A_force[0] * imp.F[0])
    # the lesser of the upper bounds: the cap itself (the time history never passes
    # it), below 1.5 × the history's own peak
    assert verdict_force == pytest.approx(F_cap, rel=2e-3)
    assert verdict_force >= float(da.history.th["force"][0]) * (1 - 1e-12)
    # the web then yields locally under the load: U = Fu/Fy = 65/50 = 1.30 at Fy
    r = assess_member(sec, gr, "simple", 7.3, 3.65, 27.0, 0.9, basis="aisc360",
                      dynamic_amplification=True)
    assert r["governing_check"] == "web_yielding"
    assert r["utilisation"] == pytest.approx(65.0 / 50.0, rel=5e-3)
    assert r["amplification"]["set_by"]["local"] == "crushing force"
    # the member's moment from the point's own history, far below the old ×16.8
    assert r["amplification"]["set_by"]["moment"] == "point time history"
    assert r["amplification"]["moment"] < 16.8


def _random_cases(rng: np.random.Generator, n: int) -> dict[str, np.ndarray]:
    """Random members and contacts: the ranges of scripts/calibrate_contact_bound.py,
    30 % with a capped (elastic–perfectly plastic) contact."""
    rows = []
    for _ in range(n):
        cond = CONDS[int(rng.integers(4))]
        L = rng.uniform(2.0, 15.0)
        EI = 2e11 * math.exp(rng.uniform(math.log(1e-6), math.log(1e-3)))
        mu = math.exp(rng.uniform(math.log(10.0), math.log(300.0)))
        a = L * (rng.uniform(0.3, 1.0) if cond == "cantilever" else rng.uniform(0.08, 0.92))
        f_s = float(beam.green(cond, L, EI, a, a))
        m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
        M = m_e * math.exp(rng.uniform(math.log(0.03), math.log(100.0)))
        f_c = f_s * math.exp(rng.uniform(math.log(0.003), math.log(3.0)))
        h = math.exp(rng.uniform(math.log(0.02), math.log(2.0)))
        W = M * impact.G
        F_el = float(timehistory.energy_method_peaks(cond, L, EI, mu, a, M, h, f_c).force)
        F_y = max(1.2 * W, 0.3 * F_el) if rng.uniform() < 0.3 else math.inf
        rows.append((cond, L, EI, mu, a, M, h, f_c, F_y))
    cols = list(zip(*rows, strict=True))
    out = {"cond": np.array(cols[0], dtype=object)}
    for i, k in enumerate(("L", "EI", "mu", "a", "M", "h", "f_c", "F_y"), start=1):
        out[k] = np.array(cols[i], float)
    return out


@pytest.fixture(scope="module")
def histories():
    # a quick part of the study (scripts/convergence_point_history.py runs 120-240)
    c = _random_cases(np.random.default_rng(20261203 + 7), N_MARGIN_CASES)
    args = (c["cond"], c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    run = exacthistory.exact_time_history(*args, F_yield=c["F_y"],
                                          **pointhistory.TH_OPTIONS)
    ref = exacthistory.exact_time_history(*args, F_yield=c["F_y"], **REFINED)
    return c, run, ref


@pytest.mark.slow
@pytest.mark.parametrize("q", ["force", "moment", "shear", "deflection"])
def test_margin_covers_the_converged_history(histories, q: str) -> None:
    # on 20 random members (not the convergence study's seed) the verdict's run
    # times TH_MARGIN is never below the refined, converged run: a demand
    # A·E = TH_MARGIN·run ≥ converged (the verdict at a point with its own history)
    _, run, ref = histories
    got, conv = getattr(run, q), getattr(ref, q)
    assert np.all(pointhistory.TH_MARGIN * got >= conv * (1 - 1e-9)), \
        float(np.max(conv / got))


def test_margin_is_not_loose() -> None:
    # the margin is the study's largest shortfall + 5 %: the case that set it
    # (scripts/convergence_point_history.py 240 20261203, case 214: a 1.7 kg load on
    # a soft, crushing contact of a propped member — the study's random inputs,
    # compared method to method) needs it within 10 %, and gets it
    case = ("propped", 8.406425067083124, 2708699.054211443, 15.65907740482114,
            5.941669872831323, 1.7233727372480083, 0.4588112429335479,
            2.6392068142580973e-06)
    kw = {"F_yield": 20.280615904479816, "stroke": 0.0028777081910122265}
    run = exacthistory.exact_time_history(*case, **kw, **pointhistory.TH_OPTIONS)
    ref = exacthistory.exact_time_history(*case, **kw, **REFINED)
    need = max(float(getattr(ref, q)[0] / getattr(run, q)[0])
               for q in ("force", "moment", "shear", "deflection"))
    assert need <= pointhistory.TH_MARGIN <= 1.1 * need


SECTIONS = ("W16X26", "W10X33", "W21X44")


def _timoshenko(sec, gr) -> dict[str, float]:
    kGA, rhoI = pointhistory.timoshenko_terms(sec, gr)
    return {"kGA": kGA, "rhoI": rhoI}


def _member_cases(seed: int, n: int) -> list[dict]:
    rng = np.random.default_rng(seed)
    out = []
    for _ in range(n):
        sec = get_section(SECTIONS[int(rng.integers(len(SECTIONS)))])
        cond = CONDS[int(rng.integers(4))]
        L = rng.uniform(3.0, 9.0)
        a = L * (rng.uniform(0.4, 1.0) if cond == "cantilever" else rng.uniform(0.15, 0.85))
        gr = get_grade("A992")
        EI = gr.E * sec.Ix
        m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * sec.mass_per_length * L
        M = m_e * math.exp(rng.uniform(math.log(0.05), math.log(1.0)))
        h = math.exp(rng.uniform(math.log(0.01), math.log(0.3)))
        f_s = float(beam.green(cond, L, EI, a, a))
        k_load = 1.0 / (f_s * math.exp(rng.uniform(math.log(0.01), math.log(1.0))))
        out.append({"sec": sec, "gr": gr, "cond": cond, "L": L, "a": a, "M": M, "h": h,
                    "k_load": k_load, "EI": EI})
    return out


def test_check_at_its_own_history_never_below_the_converged_history() -> None:
    # droprig check with amplification: where the chain ran the point's own time
    # history, the verdict's contact force, moment and shear are never below the
    # refined (converged) time history of the same member and contact — with the
    # same physical cap, the flange's local yield force, and the same Timoshenko
    # member (its web's shear stiffness and rotary inertia)
    cs = _member_cases(20261204, 16)
    seen = 0
    for c in cs:
        ch = member_chain(MemberDrop(c["sec"], c["gr"], c["cond"], c["L"], c["a"], c["M"],
                                     c["h"], basis="aisc360", load_stiffness=c["k_load"],
                                     self_weight=False, dynamic_amplification=True))
        da, imp = ch[DynamicAmplification], ch[Impact]
        if da.th is None or not bool(da.th[0]):
            continue
        seen += 1
        ref = exacthistory.exact_time_history(c["cond"], c["L"], c["EI"],
                                              c["sec"].mass_per_length, c["a"], c["M"],
                                              c["h"], 1.0 / c["k_load"],
                                              F_yield=float(imp.F_crush[0]),
                                              stroke=float(c["sec"].tf), **REFINED,
                                              **_timoshenko(c["sec"], c["gr"]))
        F = float(imp.F[0])
        assert da.A_force[0] * F >= ref.force[0] * (1 - 1e-9)
        unit_m = float(beam.max_abs_moment(c["cond"], c["L"], 1.0, c["a"]))
        unit_v = float(beam.max_abs_shear(c["cond"], c["L"], 1.0, c["a"]))
        assert da.A_moment[0] * F * unit_m >= ref.moment[0] * (1 - 1e-9)
        assert da.A_shear[0] * F * unit_v >= ref.shear[0] * (1 - 1e-9)
    assert seen >= 4


@pytest.mark.parametrize("run", [timehistory.time_history, exacthistory.exact_time_history])
@pytest.mark.parametrize("frac", [0.99, 0.9999, 1.0 - 1e-6])
def test_history_near_a_support_keeps_to_the_rigid_base_force(frac: float, run) -> None:
    # a point next to a support barely moves: the load on its contact spring against
    # an immovable point is the most it can pass, F = W(1 + √(1 + 2h/(W·f)))
    # (Gere 7th ed. §9.10, Eq. 9-94, η = 1, f the contact and member compliance in
    # series). The run used to take the struck point's Rayleigh mass (unbounded
    # there) into its length, was cut to its step limit and read 1.9 × this.
    L, EI, mu, M, h, f_c = 9.144, 7.0158e7, 65.48, 1814.0, 0.9144, 3.12e-7
    a = L * frac
    f = f_c + float(beam.green("simple", L, EI, a, a))
    W = M * impact.G
    F_rigid = W * (1.0 + math.sqrt(1.0 + 2.0 * h / (W * f)))
    t = run("simple", L, EI, mu, a, M, h, f_c)
    assert float(t.force[0]) <= F_rigid * 1.011  # RIGID_BASE_MARGIN's measured 1.011
    assert float(t.force[0]) >= 0.9 * F_rigid
