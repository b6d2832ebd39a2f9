"""The time histories' members as Timoshenko beams (shear deformation and rotary
inertia: droprig.solver.timehistory.timoshenko_modes, used by the fast exacthistory
and the Newmark reference alike).

Sources:
* Timoshenko's frequency equation of the simply supported beam,
  (κGA·k² − ρA·ω²)(EI·k² + κGA − ρI·ω²) = (κGA·k)², k = nπ/L (Timoshenko 1921; Han,
  Benaroya & Wei, J. Sound Vib. 225 (1999) 935–988, §3 — from memory), solved here as
  a polynomial (numpy.roots), not as droprig writes it;
* its first-order form for a slender member, ω/ω_EB ≈ 1 − ½·(nπr/L)²·(1 + E/(κG))
  (shear and rotary-inertia correction; Blevins 1979 ch. 8, Timoshenko, Young &
  Weaver, *Vibration Problems in Engineering* §5.12 — from memory);
* the Euler–Bernoulli frequencies of Blevins 1979 Table 8-1 (the limit κGA → ∞,
  ρI → 0);
* an independent method: a Timoshenko finite-element model (two-node elements, linear
  w and ψ, one-point shear integration, consistent mass; Hughes, *The Finite Element
  Method* §5.4 — from memory) for the end conditions without a closed form, and the
  two-branch modal solution of tests/solver/timoshenko_reference.py (scipy) for a drop;
* Cowper, J. Appl. Mech. 33 (1966) 335–340, the shear coefficient of an I-section
  (from memory), for the web's shear area κA ≈ d·t_w;
* wave travel: a Timoshenko member carries shear at c_s = √(κGA/ρA), so a support a
  distance d from a short blow feels nothing before ~d/c_s (common practice, no
  source; Graff, *Wave Motion in Elastic Solids* §3.4 — from memory).
Section: IPE 300 (EN 10365 tables, from memory); steel E = 200 GPa, ν = 0.3.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.linalg import eigh

from droprig.io.sections import get_grade, get_section
from droprig.model import Grade, Section
from droprig.solver import beam, exacthistory, pointhistory, timehistory
from tests.solver.timoshenko_reference import timoshenko_drop

E = 200e9
G = E / 2.6  # ν = 0.3
D, TW, A, IX, MU = 0.300, 0.0071, 53.8e-4, 8356e-8, 42.2  # IPE 300
KGA = G * D * TW
RHOI = MU / A * IX
EI = E * IX


def _one(*v: float) -> list[np.ndarray]:
    return [np.array([float(x)]) for x in v]


def _modes(cond: str, L: float, n: int, kGA: float = KGA, rhoI: float = RHOI,
           EI_: float = EI, mu: float = MU) -> tuple[np.ndarray, ...]:
    md = timehistory._modal(cond, n)
    om, rot, m_n = timehistory.timoshenko_modes(md.lam, md.norm, md.norm1,
                                                *_one(L, EI_, mu, kGA, rhoI))
    return om[0], rot[0], m_n[0]


def _fe_frequencies(cond: str, L: float, n: int, n_el: int = 400) -> np.ndarray:
    """The lowest n circular frequencies (rad/s) of the IPE 300 as a Timoshenko
    finite-element model (module docstring): the independent method."""
    le = L / n_el
    nd = 2 * (n_el + 1)  # (w, ψ) per node
    K = np.zeros((nd, nd))
    Mm = np.zeros((nd, nd))
    B = np.array([-1.0 / le, -0.5, 1.0 / le, -0.5])  # shear strain w' − ψ at mid-element
    Ke = EI / le * np.array([[0, 0, 0, 0], [0, 1, 0, -1], [0, 0, 0, 0], [0, -1, 0, 1.0]])
    Ke = Ke + KGA * le * np.outer(B, B)
    c = np.array([[2.0, 1.0], [1.0, 2.0]]) * le / 6.0
    Me = np.zeros((4, 4))
    Me[np.ix_([0, 2], [0, 2])] = MU * c
    Me[np.ix_([1, 3], [1, 3])] = RHOI * c
    for e in range(n_el):
        i = np.arange(2 * e, 2 * e + 4)
        K[np.ix_(i, i)] += Ke
        Mm[np.ix_(i, i)] += Me
    fixed = {"simple": [0, nd - 2], "fixed": [0, 1, nd - 2, nd - 1],
             "propped": [0, 1, nd - 2], "cantilever": [0, 1]}[cond]
    keep = np.setdiff1d(np.arange(nd), fixed)
    lam = eigh(K[np.ix_(keep, keep)], Mm[np.ix_(keep, keep)], eigvals_only=True,
               subset_by_index=[0, n - 1])
    return np.sqrt(lam)


# ------------------------------------------------------------------ frequencies
@pytest.mark.parametrize("L", [1.5, 3.0, 6.0])
def test_simply_supported_frequencies_are_timoshenkos_closed_form(L: float) -> None:
    """Deep (L/d = 5) to ordinary (L/d = 20): the lower root of Timoshenko's frequency
    equation, mode by mode, to 1e-9 (Han et al. 1999 §3)."""
    om = _modes("simple", L, 12)[0]
    for n in range(1, 13):
        k = n * math.pi / L
        # μ·ρI·ω⁴ − (μ(EIk² + κGA) + ρI·κGA·k²)·ω² + κGA·EI·k⁴ = 0
        w2 = np.roots([MU * RHOI, -(MU * (EI * k**2 + KGA) + RHOI * KGA * k**2),
                       KGA * EI * k**4]).real
        assert om[n - 1] == pytest.approx(math.sqrt(w2.min()), rel=1e-9)
    # and shear deformation matters for the deep member: its 6th mode at < 0.3 × EB
    eb = timehistory.natural_frequencies("simple", L, EI, MU, 12)
    assert np.all(om < eb)
    if L == 1.5:
        assert om[5] < 0.3 * eb[5]


def test_slender_member_first_order_correction() -> None:
    """A slender member (L/d = 80): ω/ω_EB = 1 − ½(nπr/L)²(1 + E/(κG)) to first order
    (Blevins 1979 ch. 8, from memory) — within 5 % of the correction itself."""
    L = 24.0
    om = _modes("simple", L, 3)[0]
    eb = timehistory.natural_frequencies("simple", L, EI, MU, 3)
    r2 = RHOI / MU  # r² = I/A
    kappa_G = KGA / A
    for n in range(1, 4):
        corr = 0.5 * (n * math.pi) ** 2 * r2 / L**2 * (1.0 + E / kappa_G)
        assert 1.0 - om[n - 1] / eb[n - 1] == pytest.approx(corr, rel=0.05)


@pytest.mark.parametrize("cond", ["simple", "fixed", "propped", "cantilever"])
def test_frequencies_against_a_timoshenko_finite_element_model(cond: str) -> None:
    """The other end conditions have no closed form: droprig takes the Rayleigh
    quotient of the Euler–Bernoulli shape with its rotation field (an upper bound of
    the lowest). Against the finite-element model of the IPE 300 at 6 m: exact for the
    simply supported member (the FE's discretisation error is 1e-4), and within
    +0 … +6 % for the first five modes of the others (measured: fixed ≤ 4.3 %, propped
    ≤ 2.2 %, cantilever ≤ 4.7 %); always below Euler–Bernoulli."""
    L = 6.0
    om = _modes(cond, L, 5)[0]
    fe = _fe_frequencies(cond, L, 5)
    ratio = om / fe
    if cond == "simple":
        np.testing.assert_allclose(ratio, 1.0, atol=3e-4)
    else:
        assert np.all(ratio > 0.999) and np.all(ratio < 1.06), ratio
    assert np.all(om < timehistory.natural_frequencies(cond, L, EI, MU, 5))


@pytest.mark.parametrize("cond", ["simple", "fixed", "propped", "cantilever"])
def test_euler_bernoulli_limit(cond: str) -> None:
    """κGA = ∞, ρI = 0 give Blevins' Table 8-1 frequencies exactly and the rotation
    ratio 1; a very slender member (L/d = 100) comes within 0.3 % on its first mode
    and 1 % on its third (the correction grows as n², test above)."""
    om, rot, _ = _modes(cond, 6.0, 8, kGA=math.inf, rhoI=0.0)
    np.testing.assert_allclose(om, timehistory.natural_frequencies(cond, 6.0, EI, MU, 8),
                               rtol=1e-12)
    np.testing.assert_allclose(rot, 1.0)
    om = _modes(cond, 30.0, 3)[0]
    eb = timehistory.natural_frequencies(cond, 30.0, EI, MU, 3)
    assert om[0] == pytest.approx(eb[0], rel=3e-3)
    np.testing.assert_allclose(om, eb, rtol=1e-2)


def test_drop_history_tends_to_the_euler_bernoulli_one() -> None:
    """The same drop (a light load on a stiff contact, many modes kept) with κGA and
    1/ρI a million times the IPE 300's: the peaks of both integrators come within
    0.1 % of the Euler–Bernoulli member's (no jump at the limit); with the IPE 300's own
    terms they differ (its high modes are set by shear: the moment by more than 2 %,
    measured 4 %)."""
    args = ("fixed", 6.0, EI, MU, 2.0, 20.0, 0.3, 1e-8)
    for run in (exacthistory.exact_time_history, timehistory.time_history):
        eb = run(*args)
        near = run(*args, kGA=1e6 * KGA, rhoI=1e-6 * RHOI)
        t = run(*args, kGA=KGA, rhoI=RHOI)
        for q in ("force", "moment", "shear", "deflection"):
            assert float(getattr(near, q)[0]) == pytest.approx(float(getattr(eb, q)[0]),
                                                               rel=1e-3), (run, q)
        assert abs(float(t.moment[0]) / float(eb.moment[0]) - 1.0) > 0.02


# ------------------------------------------------------------------ shear
def test_shear_is_kappa_GA_times_the_shear_strain() -> None:
    """The shear per unit modal coordinate, read from the mode's moment equation
    (−(Θ/W)(EIφ''' + ρIω²φ')), is κGA·(w' − ψ) = κGA·(1 − Θ/W)·φ' for the simply
    supported member's exact modes (Timoshenko 1921), at every section."""
    L, a = 3.0, 1.1
    n = 30
    su = timehistory._setup("simple", *_one(L, EI, MU, a, 50.0, 1e-8), _one(
        float(beam.green("simple", L, EI, a, a)))[0], n, math.inf, 16,
        kGA=np.array([KGA]), rhoI=np.array([RHOI]))
    _, rot, m_n = _modes("simple", L, n)
    xi = np.linspace(0.0, 1.0, 17)
    k = np.arange(1, n + 1) * math.pi / L
    slope = k[:, None] * np.cos(k[:, None] * L * xi[None, :])  # φ' of sin(kx)
    strain = KGA * (1.0 - rot)[:, None] * slope / np.sqrt(m_n)[:, None]
    np.testing.assert_allclose(su["Wv"][0][:, :17], strain, rtol=1e-9,
                               atol=1e-9 * np.abs(strain).max())


def test_timoshenko_drop_matches_the_two_branch_reference() -> None:
    """A 20 kg load dropped 1 m at mid-span of a 6 m IPE 300 through a stiff contact
    (1 % of the member's compliance): contact force and end reaction of the Newmark
    reference and the fast integrator against tests/solver/timoshenko_reference.py
    (both spectra, solved with scipy; 40 modes each) within 6 %, and the end reaction
    converged in modes (40 → 80 within 4 %)."""
    L, a, M, h = 6.0, 3.0, 20.0, 1.0
    f_c = 0.01 * float(beam.green("simple", L, EI, a, a))
    ref = timoshenko_drop(L, EI, MU, KGA, RHOI, a, M, h, f_c, n_modes=40)
    kw = {"kGA": KGA, "rhoI": RHOI, "cutoff": 1e9}
    nm40 = timehistory.time_history("simple", L, EI, MU, a, M, h, f_c, n_modes=40, **kw)
    nm80 = timehistory.time_history("simple", L, EI, MU, a, M, h, f_c, n_modes=80, **kw)
    ex = exacthistory.exact_time_history("simple", L, EI, MU, a, M, h, f_c, n_modes=40,
                                         **kw)
    assert float(nm40.force[0]) == pytest.approx(ref.force, rel=0.06)
    assert float(ex.force[0]) == pytest.approx(ref.force, rel=0.06)
    assert nm40.reaction is not None and nm80.reaction is not None
    assert float(nm40.reaction[0]) == pytest.approx(ref.reaction, rel=0.06)
    assert float(nm80.reaction[0]) == pytest.approx(float(nm40.reaction[0]), rel=0.04)


def _support_shear(kGA: float | None, rhoI: float | None, n: int, L: float, a: float,
                   t: np.ndarray, F: np.ndarray) -> np.ndarray:
    """The shear at x = 0 under the contact force F(t) (N) at a, by Duhamel's integral
    per mode (Chopra 4th ed. §4.2) on the time histories' own modal data plus their
    static correction."""
    f_s = float(beam.green("simple", L, EI, a, a))
    su = timehistory._setup("simple", *_one(L, EI, MU, a, 1.0, 1e-9), np.array([f_s]), n,
                            math.inf, 16,
                            kGA=None if kGA is None else np.array([kGA]),
                            rhoI=None if rhoI is None else np.array([rhoI]))
    om, pt, Wv0, Rv0 = su["omega"][0], su["pt"][0], su["Wv"][0][:, 0], su["Rv"][0][0]
    dt = t[1] - t[0]
    wt = om[:, None] * t[None, :]
    C = np.cumsum(F * np.cos(wt), axis=1) * dt
    S = np.cumsum(F * np.sin(wt), axis=1) * dt
    q = (pt / om)[:, None] * (np.sin(wt) * C - np.cos(wt) * S)
    return np.asarray(Wv0 @ q + Rv0 * F)


def test_support_shear_waits_for_the_shear_wave() -> None:
    """Causality: a half-sine blow of 0.3 ms at mid-span of a 6 m IPE 300 reaches the
    support 3 m away no sooner than the shear wave can carry it, d/c_s = 1.5 ms
    (c_s = √(κGA/ρA) ≈ 1970 m/s): before half that time the support shear stays below
    2 % of its peak. The Euler–Bernoulli member's shear travels at no finite speed: it
    reads most of its peak at once. The Timoshenko peak is converged in modes
    (40 → 80 within 5 %)."""
    L, a = 6.0, 3.0
    c_s = math.sqrt(KGA / MU)
    t_w = a / c_s
    t = np.linspace(0.0, 3.0 * t_w, 3001)
    tau = 0.2 * t_w
    F = np.where(t < tau, np.sin(math.pi * t / tau), 0.0)
    early = t < 0.5 * t_w
    r40 = _support_shear(KGA, RHOI, 40, L, a, t, F)
    r80 = _support_shear(KGA, RHOI, 80, L, a, t, F)
    assert np.abs(r80[early]).max() < 0.02 * np.abs(r80).max()
    assert np.abs(r80).max() == pytest.approx(np.abs(r40).max(), rel=0.05)
    eb = _support_shear(None, None, 40, L, a, t, F)
    assert np.abs(eb[early]).max() > 0.5 * np.abs(eb).max()


# ------------------------------------------------------------------ section terms
@pytest.mark.parametrize("name", ["IPE 300", "HEB 200", "W16X26", "W14X90"])
def test_web_shear_area_is_near_cowpers(name: str) -> None:
    """κA = d·t_w against Cowper's (1966) κ·A of the I-section (from memory):
    κ = 10(1+ν)(1+3m)² / [(12+72m+150m²+90m³) + ν(11+66m+135m²+90m³)
    + 30n²(m+m²) + 5νn²(8m+9m²)], m = 2b·t_f/(h·t_w), n = b/h, h = d − t_f: within
    −5 … +17 % (d·t_w a little stiffer; measured 0.86–0.96)."""
    sec = get_section(name)
    gr = get_grade("A992")
    kGA, rhoI = pointhistory.timoshenko_terms(sec, gr)
    nu = pointhistory.POISSON_STEEL
    h = sec.d - sec.tf
    m = 2.0 * sec.bf * sec.tf / (h * sec.tw)
    n = sec.bf / h
    kappa = 10.0 * (1 + nu) * (1 + 3 * m) ** 2 / (
        (12 + 72 * m + 150 * m**2 + 90 * m**3) + nu * (11 + 66 * m + 135 * m**2 + 90 * m**3)
        + 30 * n**2 * (m + m**2) + 5 * nu * n**2 * (8 * m + 9 * m**2))
    G_ = gr.E / (2.0 * (1.0 + nu))
    assert 0.85 <= kappa * G_ * sec.A / kGA <= 1.05
    assert rhoI == pytest.approx(sec.mass_per_length / sec.A * sec.Ix, rel=1e-12)


def test_timoshenko_terms_by_hand() -> None:
    """IPE 300 in S355 (E = 210 GPa): G = E/2.6 = 80.77 GPa, A_v = 300 × 7.1 mm² =
    2130 mm², κGA = 172.0 MN; ρI = 42.2/53.8e-4 × 8356e-8 = 0.6554 kg·m."""
    sec = Section("IPE 300", "IPE", 0.300, 0.150, 0.0071, 0.0107, 0.015, 53.8e-4,
                  8356e-8, 557e-6, 628e-6, 604e-8, 42.2)
    gr = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, 210e9)
    kGA, rhoI = pointhistory.timoshenko_terms(sec, gr)
    assert kGA == pytest.approx(172.04e6, rel=1e-3)
    assert rhoI == pytest.approx(0.6554, rel=1e-3)


@pytest.mark.parametrize(("field", "kw"), [("kGA", {"kGA": 0.0}), ("kGA", {"kGA": -1.0}),
                                           ("kGA", {"kGA": math.nan}),
                                           ("rhoI", {"rhoI": -0.1}),
                                           ("rhoI", {"rhoI": math.inf})])
def test_bad_section_terms_are_refused_by_name(field: str, kw: dict) -> None:
    for run in (exacthistory.exact_time_history, timehistory.time_history):
        with pytest.raises(ValueError, match=field):
            run("simple", 6.0, EI, MU, 3.0, 10.0, 0.5, 1e-8, **kw)
