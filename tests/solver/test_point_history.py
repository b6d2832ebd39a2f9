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


# the case that set the margin before stop 32 (scripts/convergence_point_history.py
# 240 20261203, case 214: a 1.7 kg load on a soft contact of a propped member that
# crushes at 1.2 × its weight — the study's random inputs, compared method to method)
CASE_214 = ("propped", 8.406425067083124, 2708699.054211443, 15.65907740482114,
            5.941669872831323, 1.7233727372480083, 0.4588112429335479,
            2.6392068142580973e-06)
CASE_214_KW = {"F_yield": 20.280615904479816, "stroke": 0.0028777081910122265}
# the case that sets it now (... 240 11, case 137: a 75 kg load on a very stiff
# contact near the end of a 14.9 m fixed-ended member, elastic; the verdict's run keeps
# the 40-mode cap, the refined run 80: its shear)
CASE_137 = ("fixed", 14.94561605351173, 1853422.1230706107, 24.017699903784447,
            2.15519563799051, 75.29981804725445, 0.06988495568187361,
            1.4328846624247379e-09)


def _need(case: tuple, kw: dict, rise: bool = True) -> float:
    """Refined ÷ verdict-setting run, the largest over the peaks."""
    run = exacthistory.exact_time_history(*case, **kw, **pointhistory.TH_OPTIONS, rise=rise)
    ref = exacthistory.exact_time_history(*case, **kw, **REFINED, rise=rise)
    return max(float(getattr(ref, q)[0] / getattr(run, q)[0])
               for q in ("force", "moment", "shear", "deflection"))


def test_margin_is_not_loose() -> None:
    # the margin is the study's largest shortfall + 5 % rounded up to 5 % (three seeds
    # of scripts/convergence_point_history.py, 720 cases): the case that sets it needs
    # it within 10 %, and gets it
    need = _need(CASE_137, {})
    assert need == pytest.approx(1.0 + pointhistory.CONVERGENCE_SHORTFALL, abs=2e-3)
    assert need <= pointhistory.TH_MARGIN <= 1.1 * need
    assert pointhistory.TH_MARGIN == math.ceil(
        (1.0 + pointhistory.CONVERGENCE_SHORTFALL + 0.05) * 20.0 - 1e-9) / 20.0


def test_the_rise_to_the_crushing_force_sets_the_cut_off() -> None:
    # the cause of the old 1.75, removed: with the cut-off set by the contact frequency
    # alone the verdict's run read this case's moment, shear and deflection 61-66 %
    # below the refined run (modes between 8 and 32 × the contact frequency respond
    # dynamically to the force's near-step rise to 1.2 W — ramp load, Chopra 4th ed.
    # §4.5); with the rise's own frequency (timehistory.rise_frequency) it reads
    # within 3 % (the refined runs of each model agree to 1 %: the same structure)
    before, now = _need(CASE_214, CASE_214_KW, rise=False), _need(CASE_214, CASE_214_KW)
    assert before > 1.6
    assert now < 1.03
    old = exacthistory.exact_time_history(*CASE_214, **CASE_214_KW, **REFINED, rise=False)
    new = exacthistory.exact_time_history(*CASE_214, **CASE_214_KW, **REFINED)
    for q in ("force", "moment", "shear", "deflection"):
        assert float(getattr(new, q)[0]) == pytest.approx(float(getattr(old, q)[0]), rel=0.01)


def test_rise_frequency_by_hand() -> None:
    # timehistory.rise_frequency: w_r = w_c·(π/2)/arcsin(min(1, F_y/F_el)),
    # F_el = v0/(f_c·w_c) (hand calculation): no crushing (F_y ≥ F_el) → w_c; F_y = F_el/2
    # → arcsin(1/2) = π/6, 3·w_c; F_y ≪ F_el → π·v0/(2·F_y·f_c); no cap, no speed or a
    # rigid contact → w_c
    w_c, f_c, v0 = 200.0, 1e-6, 2.0
    F_el = v0 / (f_c * w_c)  # 10 kN
    got = timehistory.rise_frequency(np.full(6, w_c), np.array([f_c, f_c, f_c, f_c, 0.0, f_c]),
                                     np.array([v0, v0, v0, v0, v0, 0.0]),
                                     np.array([2 * F_el, F_el / 2, 1e-4 * F_el, np.inf,
                                               100.0, 100.0]))
    assert got[0] == pytest.approx(w_c)
    assert got[1] == pytest.approx(3.0 * w_c)
    assert got[2] == pytest.approx(math.pi * v0 / (2.0 * 1e-4 * F_el * f_c), rel=1e-6)
    assert np.all(got[3:] == w_c)


def test_ramp_load_factor_behind_the_cut_off() -> None:
    # the premise of rise_frequency: an undamped one-degree system under a force ramped
    # to a constant over t_r peaks at 1 + |sin(ω·t_r/2)|/(ω·t_r/2) × static (Chopra,
    # Dynamics of Structures 4th ed. §4.5 — from memory), at most 1 + 2/(ω·t_r), so a
    # mode ω ≥ cut-off 8 × the rise's frequency π/(2·t_r) left to the static
    # correction is off by at most 2/(4π) = 16 % of its own (small) part; checked with
    # scipy's solve_ivp (an independent integration)
    from scipy.integrate import solve_ivp

    w = 2.0 * math.pi
    for wt in (0.5, 3.0, 8.0, 4.0 * math.pi, 40.0):
        t_r = wt / w

        def f(t: float, y: np.ndarray, t_r: float = t_r) -> list[float]:
            return [y[1], min(t / t_r, 1.0) - w**2 * y[0]]

        sol = solve_ivp(f, (0.0, t_r + 2.0), [0.0, 0.0], max_step=min(t_r, 1.0) / 200.0,
                        rtol=1e-10, atol=1e-12)
        dlf = float(np.max(sol.y[0])) * w**2
        assert dlf == pytest.approx(1.0 + abs(math.sin(wt / 2.0)) / (wt / 2.0), rel=2e-4)
        assert dlf <= 1.0 + 2.0 / wt + 1e-6
    assert 2.0 / (pointhistory.TH_OPTIONS["cutoff"] * math.pi / 2.0) < 0.16


def test_reference_keeps_the_same_modes() -> None:
    # the Newmark reference (timehistory.time_history) and the phase-exact run keep the
    # same modes (one model, two integrations; Chopra 4th ed. §5.4 / §10-12); the
    # reference's plan (its modes and steps, nothing integrated: a full Newmark run of
    # this case takes seconds)
    ex = exacthistory.exact_time_history(*CASE_214, **CASE_214_KW)
    nm = timehistory.time_history(*CASE_214, **CASE_214_KW, _plan=True)
    old = exacthistory.exact_time_history(*CASE_214, **CASE_214_KW, rise=False)
    assert int(ex.modes[0]) == int(nm.modes[0]) > int(old.modes[0])


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


def test_deck_checks_take_the_history_over_the_deck_force() -> None:
    # the deck's flexure and punching take the factor on the deck's force F_deck
    # (chain._utilisation: A·F·F_deck/F), so from the point's own history their factor
    # is TH_MARGIN × the history's contact force over F_deck (hand calculation; the
    # history's contact force is the force through the contact on the deck). Invented
    # numbers of the steel demo's joist-bundle point (stop 32): framing force F 640 kN,
    # deck force 378.7 kN, history 379.6 kN — before, the deck took
    # max(1, 1.35·379.6/640) = 1 and read 378.7 kN, below the history.
    from droprig.solver import chain

    F, F_deck, th = 640e3, 378.7e3, 379.6e3
    one = np.ones(1)
    ph = pointhistory.PointHistory(
        member=np.zeros(1, int), cond=np.array(["simple"], dtype=object), L=one, a=one,
        EI=one, mu=one, f_c=one, F_yield=one, stroke=one,
        th={q: np.array([th]) for q in pointhistory.QUANTITIES},
        energy={q: np.array([F]) for q in pointhistory.QUANTITIES},
        factor={q: np.array([pointhistory.TH_MARGIN * th / F])
                for q in pointhistory.QUANTITIES})
    got = chain._th_factors(ph, np.array([F_deck / F]))
    for name in ("deck_flexure", "deck_punching"):
        assert float(got[name][0]) * F_deck == pytest.approx(pointhistory.TH_MARGIN * th)
    assert float(got["web_yielding"][0]) == 1.0  # the webs take F itself: 1.35·th/F < 1
    assert float(chain._th_factors(ph)["deck_punching"][0]) == 1.0  # no ratio: as before
