"""Single-member assessment (droprig check): the chain of checks against hand
calculations and the rules of the design notes §3.

Sources: AISC Manual 15th ed. Table 3-23 case 7 (simple beam, point load: δ = PL³/(48EI),
M = PL/4, V = P/2) and case 1 (UDL: wL²/8); Gere 7th ed. §9.10 Eq. 9-94; Timoshenko
Part I (17/35); AISC 360-16 F2-1; EN 1993-1-1 6.2.5; Biggs (1964) / UFC 3-340-02 (plastic
balance, from memory); NAVFAC DM-2.08 (μ = 6, θ = 2°); IBC Table 1604.3 (span/240,
serviceability only — the team's references, "Deflection").
Section values: references item 6 (AISC Shapes Database v16.0; steel-sections).
"""

from __future__ import annotations

import json
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from droprig.model import Grade, ModelError, Section
from droprig.solver import member
from droprig.solver.member import RESULT_KEYS


def assess_member(*args, **kw):  # type: ignore[no-untyped-def]
    """The hand calculations here are of the energy method (Gere 7th ed. §9.10):
    dynamic amplification (on by default) is tested in test_member_amplification.py."""
    kw.setdefault("dynamic_amplification", False)
    return member.assess_member(*args, **kw)

G = 9.80665
IN = 0.0254
FT = 0.3048
LB = 0.45359237
KSI = 6.894757293168361e6
REL = 1e-9
REL_SOLVE = 1e-6  # bisection and round trips


@pytest.fixture
def w16x26() -> Section:
    return Section("W16X26", "W", 15.7 * IN, 5.50 * IN, 0.250 * IN, 0.345 * IN,
                   (0.747 - 0.345) * IN, 7.68 * IN**2, 301 * IN**4, 38.4 * IN**3,
                   44.2 * IN**3, 9.59 * IN**4, 26 * LB / FT)


@pytest.fixture
def a992() -> Grade:
    return Grade("A992", "ASTM", ((1.0, 50 * KSI),), 65 * KSI, 29000 * KSI)


@pytest.fixture
def ipe300() -> Section:
    return Section("IPE 300", "IPE", 0.300, 0.150, 0.0071, 0.0107, 0.015, 53.8e-4, 8356e-8,
                   557e-6, 628e-6, 604e-8, 42.2)


@pytest.fixture
def s355() -> Grade:
    return Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, 210e9)


def test_keys_types_and_json(w16x26: Section, a992: Grade) -> None:
    r = assess_member(w16x26, a992, "simple", 24 * FT, 12 * FT, 1500 * LB, 6 * IN,
                      basis="aisc360")
    assert tuple(r) == RESULT_KEYS
    json.dumps(r, allow_nan=False)  # never NaN / inf
    assert r["response"] in ("elastic", "plastic", "exceeds")


def test_simple_midspan_hand(w16x26: Section, a992: Grade) -> None:
    """No self-weight, no member mass: AISC Table 3-23 case 7 and Gere Eq. 9-94 by hand."""
    L, M, h = 24 * FT, 1500 * LB, 6 * IN
    W = M * G
    EI = 29000 * KSI * 301 * IN**4
    d_st = W * L**3 / (48 * EI)
    K = 1 + math.sqrt(1 + 2 * h / d_st)
    r = assess_member(w16x26, a992, "simple", L, L / 2, M, h, basis="aisc360",
                      self_weight=False, beam_mass=False)
    assert r["static_deflection"] == pytest.approx(d_st, rel=REL)
    assert r["dynamic_factor"] == pytest.approx(K, rel=REL)
    assert r["peak_force"] == pytest.approx(K * W, rel=REL)
    assert r["max_moment"] == pytest.approx(K * W * L / 4, rel=REL)
    assert r["max_shear"] == pytest.approx(K * W / 2, rel=REL)
    assert r["max_deflection"] == pytest.approx(K * d_st, rel=REL)
    assert r["effective_mass"] == 0.0
    assert r["deceleration_g"] == pytest.approx(K - 1, rel=REL)
    # AISC 360-16 Eq. F2-1: Mp = Fy·Zx; utilisation = M/Mp (φ = 1)
    assert r["utilisation"] == pytest.approx(K * W * L / 4 / (50 * KSI * 44.2 * IN**3),
                                             rel=REL)
    assert r["governing_check"] == "flexure" and r["response"] == "elastic"


def test_struck_mass_scaled_to_the_struck_point_with_a_soft_load(w16x26: Section,
                                                                  a992: Grade) -> None:
    """A load with a soft underside (k_load) strikes the midspan of a simple beam: the
    load moves W·(f_s + 1/k_load), the beam under it only W·f_s, so the beam's struck
    mass is the Rayleigh mass 17/35·μL (Timoshenko Part I) times (f_s/f)², the same
    rule as the floor analysis (droprig.solver.chain.struck_mass). By hand:
    f_s = L³/(48EI) (AISC Manual Table 3-23 case 7), f = f_s + 1/k_load,
    η = M/(M + m_e), K = 1 + √(1 + 2ηh/(W·f)) (Gere 7th ed. §9.10 Eq. 9-94), F = K·W."""
    L, M, h, k_load = 20 * FT, 2000 * LB, 4 * IN, 2e7
    mu = 26 * LB / FT
    r = assess_member(w16x26, a992, "simple", L, L / 2, M, h, basis="aisc360",
                      load_stiffness=k_load, self_weight=False)
    EI = 29000 * KSI * 301 * IN**4  # AISC 360-16 E = 29 000 ksi
    f_s = L**3 / (48 * EI)
    f = f_s + 1 / k_load
    m_e = 17 / 35 * mu * L * (f_s / f) ** 2
    W = M * G
    K = 1 + math.sqrt(1 + 2 * (M / (M + m_e)) * h / (W * f))
    assert r["effective_mass"] == pytest.approx(m_e, rel=REL)
    assert r["static_deflection"] == pytest.approx(W * f, rel=REL)
    assert r["dynamic_factor"] == pytest.approx(K, rel=REL)
    assert r["peak_force"] == pytest.approx(K * W, rel=REL)
    # the scaling matters here: the unscaled mass would give a different force
    K_unscaled = 1 + math.sqrt(1 + 2 * (M / (M + 17 / 35 * mu * L)) * h / (W * f))
    assert abs(K_unscaled - K) > 1e-3 * K


def test_no_plastic_reserve_left_by_the_existing_load_is_collapse() -> None:
    """A simple Class 1 beam whose existing UDL alone already exceeds its plastic
    moment (wL²/8 > Mp: AISC Manual Table 3-23 case 1; Mp = Wpl·fy, EN 1993-1-1
    Eq. 6.13), struck off midspan: no plastic reserve is left (R_p = 0), the beam
    exceeds — a verdict, not a division by zero."""
    # EN 10025-2 Table 7: S355 355 MPa (t ≤ 16 mm); properties close to an IPE 300
    s355 = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=210e9)
    ipe = Section("B300", "custom", d=0.3, bf=0.15, tw=0.0071, tf=0.0107, r=0.015,
                  A=5.381e-3, Ix=8.356e-5, Sx=5.57e-4, Zx=6.28e-4, Iy=6.04e-6,
                  mass_per_length=42.2)
    L = 6.0
    w = 8 * 6.28e-4 * 355e6 / L**2 * 1.05
    r = assess_member(ipe, s355, "simple", L, 0.66 * L, 500.0, 0.3, basis="en1993",
                      udl=w, self_weight=False)
    assert r["response"] == "exceeds"
    assert r["governing_check"] == "collapse"


def test_member_mass_and_existing_load(w16x26: Section, a992: Grade) -> None:
    L, M, h = 24 * FT, 1500 * LB, 6 * IN
    mu = 26 * LB / FT
    r = assess_member(w16x26, a992, "simple", L, L / 2, M, h, basis="aisc360", udl=2000.0)
    # Timoshenko Part I: 17/35 of the member mass at midspan; η = M/(M + m_e)
    m_e = 17 / 35 * mu * L
    assert r["effective_mass"] == pytest.approx(m_e, rel=1e-9)
    W = M * G
    d_st = r["static_deflection"]
    K = 1 + math.sqrt(1 + 2 * (M / (M + m_e)) * h / d_st)
    assert r["dynamic_factor"] == pytest.approx(K, rel=REL)
    # AISC Table 3-23 cases 7 + 1 superposed at midspan: PL/4 + wL²/8
    w = mu * G + 2000.0
    assert r["max_moment"] == pytest.approx(K * W * L / 4 + w * L**2 / 8, rel=REL)
    assert r["max_shear"] == pytest.approx(K * W / 2 + w * L / 2, rel=REL)


def test_elastic_allowable_height_round_trip(w16x26: Section, a992: Grade) -> None:
    # at the allowable height the governing utilisation is exactly 1 (inverse of Gere §9.10)
    L, M = 24 * FT, 1500 * LB
    r = assess_member(w16x26, a992, "simple", L, 0.4 * L, M, 0.1, basis="aisc360")
    h = r["allowable_drop_height"]
    r2 = assess_member(w16x26, a992, "simple", L, 0.4 * L, M, h, basis="aisc360")
    assert r2["utilisation"] == pytest.approx(1.0, rel=REL_SOLVE)


def test_deflection_is_information_only(w16x26: Section, a992: Grade) -> None:
    # IBC Table 1604.3's span/240 is a serviceability limit: beyond it the response stays
    # elastic while the strength checks pass (design decision, team references)
    L = 24 * FT
    r = assess_member(w16x26, a992, "simple", L, L / 2, 1500 * LB, 0.4, basis="aisc360")
    assert r["max_deflection"] > L / 240
    assert r["utilisation"] < 1.0 and r["response"] == "elastic"


def test_non_hinge_section_exceeds(w16x26: Section, a992: Grade) -> None:
    # W16X26 at 50 ksi fails AISC 360-16 App. 1 λpd (see test_capacity): no plastic reserve
    r = assess_member(w16x26, a992, "simple", 24 * FT, 12 * FT, 1500 * LB, 5 * FT,
                      basis="aisc360")
    assert r["utilisation"] > 1 and r["response"] == "exceeds"
    assert r["governing_check"] == "flexure"
    assert r["allowable_drop_height_plastic"] is None


def test_plastic_response_and_biggs(ipe300: Section, s355: Grade) -> None:
    """IPE 300 S355 (Class 1) struck at midspan, no existing load and no member mass, so
    the plastic balance is Biggs' closed form with Ru = 4Mp/L, δe = Ru·L³/(48EI)."""
    L, M, h = 6.0, 2000.0, 0.5
    W = M * G
    Mp = 628e-6 * 355e6
    Ru = 4 * Mp / L
    de = Ru * L**3 / (48 * 210e9 * 8356e-8)
    r = assess_member(ipe300, s355, "simple", L, L / 2, M, h, basis="en1993",
                      self_weight=False, beam_mass=False)
    dm = (W * h + Ru * de / 2) / (Ru - W)  # Biggs (1964) / UFC 3-340-02
    assert r["response"] == "plastic" and r["governing_check"] == "flexure"
    assert r["plastic_deflection"] == pytest.approx(dm, rel=1e-6)
    assert r["ductility"] == pytest.approx(dm / de, rel=1e-6)
    assert r["support_rotation"] == pytest.approx(math.atan(2 * dm / L), rel=1e-6)
    assert r["peak_force"] == pytest.approx(Ru, rel=1e-6)
    assert r["utilisation"] > 1.0


def test_plastic_allowable_height_round_trip(ipe300: Section, s355: Grade) -> None:
    # at the plastic allowable height the ductility (or rotation) sits on its limit
    # (NAVFAC DM-2.08 defaults μ = 6, θ = 2°)
    L, M = 6.0, 2000.0
    r = assess_member(ipe300, s355, "simple", L, 2.0, M, 0.5, basis="en1993")
    h = r["allowable_drop_height_plastic"]
    assert h is not None and h > r["allowable_drop_height"]
    r2 = assess_member(ipe300, s355, "simple", L, 2.0, M, h, basis="en1993")
    assert r2["response"] == "plastic"
    on_limit = (math.isclose(r2["ductility"], 6.0, rel_tol=REL_SOLVE)
                or math.isclose(r2["support_rotation"], math.radians(2.0), rel_tol=REL_SOLVE))
    assert on_limit
    r3 = assess_member(ipe300, s355, "simple", L, 2.0, M, 1.01 * h, basis="en1993")
    assert r3["response"] == "exceeds"
    assert r3["governing_check"] in ("ductility", "rotation")


def test_collapse(ipe300: Section, s355: Grade) -> None:
    # a load heavier than the plastic collapse load 4Mp/L = 148.6 kN cannot be held
    r = assess_member(ipe300, s355, "simple", 6.0, 3.0, 20_000.0, 0.1, basis="en1993")
    assert r["response"] == "exceeds" and r["governing_check"] == "collapse"
    assert r["plastic_deflection"] is None and r["ductility"] is None


def test_web_failure_is_brittle(ipe300: Section, s355: Grade) -> None:
    # a point contact at the end region: EN 1993-1-5 patch loading governs before flexure,
    # and a web failure has no plastic reserve (design notes §3)
    r = assess_member(ipe300, s355, "simple", 6.0, 0.05, 3000.0, 0.3, basis="en1993")
    assert r["governing_check"] == "web_yielding"
    assert r["response"] == "exceeds"


def test_cushion_softens_and_sets_eta_one(w16x26: Section, a992: Grade) -> None:
    L = 24 * FT
    bare = assess_member(w16x26, a992, "simple", L, L / 2, 1500 * LB, 6 * IN,
                         basis="aisc360", beam_mass=False)
    mat = assess_member(w16x26, a992, "simple", L, L / 2, 1500 * LB, 6 * IN,
                        basis="aisc360", cushion_stiffness=1e6)
    # series springs (Engineering ToolBox "Impact Force"): δst grows by W/k
    assert mat["static_deflection"] == pytest.approx(
        bare["static_deflection"] + 1500 * LB * G / 1e6, rel=REL)
    assert mat["peak_force"] < bare["peak_force"]


def test_crushable_layer_caps_force(w16x26: Section, a992: Grade) -> None:
    L = 24 * FT
    r = assess_member(w16x26, a992, "simple", L, L / 2, 1500 * LB, 1.0, basis="aisc360",
                      crush_force=30e3, crush_stroke=0.3)
    assert r["peak_force"] == pytest.approx(30e3, rel=REL)


def test_support_point_needs_cushion(w16x26: Section, a992: Grade) -> None:
    with pytest.raises(ModelError, match=r"^at:"):
        assess_member(w16x26, a992, "simple", 6.0, 0.0, 500.0, 0.3, basis="aisc360")
    r = assess_member(w16x26, a992, "simple", 6.0, 0.0, 500.0, 0.3, basis="aisc360",
                      cushion_stiffness=2e6)
    # all of the force goes into the support: shear = F (+ self-weight reaction)
    assert r["max_shear"] == pytest.approx(r["peak_force"] + 26 * LB / FT * G * 3.0, rel=REL)


@pytest.mark.parametrize(
    ("name", "value"),
    [("span", -1.0), ("at", 99.0), ("mass", 0.0), ("drop", -0.1), ("bearing", -0.01)],
)
def test_bad_inputs_name_the_field(w16x26: Section, a992: Grade, name: str,
                                   value: float) -> None:
    kw = {"L": 6.0, "a": 3.0, "mass": 500.0, "h": 0.3}
    key = {"span": "L", "at": "a", "drop": "h"}.get(name, name)
    args = {**kw, key: value} if key in kw else kw
    extra = {} if key in kw else {name: value}
    with pytest.raises(ModelError, match=f"^{name}:"):
        assess_member(w16x26, a992, "simple", args["L"], args["a"], args["mass"], args["h"],
                      basis="aisc360", **extra)


@pytest.mark.parametrize("cond", ["simple", "fixed", "propped", "cantilever"])
def test_all_end_conditions_run(cond: str, ipe300: Section, s355: Grade) -> None:
    r = assess_member(ipe300, s355, cond, 5.0, 2.0, 800.0, 0.2, basis="en1993")
    json.dumps(r, allow_nan=False)
    assert r["peak_force"] > 2 * 800.0 * G * 0.999


def test_checks_listed() -> None:
    assert set(member.BRITTLE_CHECKS) < set(member.MEMBER_CHECKS)


def test_crushable_layer_then_plastic_energy_balance(ipe300: Section, s355: Grade) -> None:
    """Layer crushing at 100 kN over 50 mm bottoms out, then the IPE 300 yields
    (Ru = 4Mp/L = 148.6 kN). Conservation of energy (design notes §3, Biggs 1964):
    W(h + s_c + δm) = F_c·s_c + Ru(δm − δe/2)."""
    L, M, h, F_c, s_c = 6.0, 2000.0, 1.0, 100e3, 0.05
    W = M * G
    Ru = 4 * 628e-6 * 355e6 / L
    de = Ru * L**3 / (48 * 210e9 * 8356e-8)
    r = assess_member(ipe300, s355, "simple", L, L / 2, M, h, basis="en1993",
                      crush_force=F_c, crush_stroke=s_c, self_weight=False, beam_mass=False)
    dm = r["plastic_deflection"]
    assert r["response"] in ("plastic", "exceeds") and dm is not None
    assert W * (h + s_c + dm) == pytest.approx(F_c * s_c + Ru * (dm - de / 2), rel=1e-6)


@settings(max_examples=40, deadline=None)
@given(st.sampled_from(["simple", "fixed", "propped", "cantilever"]), st.floats(1.0, 15.0),
       st.floats(0.02, 1.0), st.floats(10.0, 20_000.0), st.floats(0.0, 5.0),
       st.sampled_from([None, 5e5, 5e7]), st.booleans(), st.floats(0.0, 0.3))
def test_never_nan_and_states_consistent(cond: str, L: float, ra: float, M: float, h: float,
                                         k: float | None, crush: bool, lb: float) -> None:
    """Result contract (droprig/solver/results.py): no NaN/inf, a known state, and the
    plastic-only quantities present exactly for plastic-energy outcomes."""
    sec = Section("IPE 300", "IPE", 0.300, 0.150, 0.0071, 0.0107, 0.015, 53.8e-4, 8356e-8,
                  557e-6, 628e-6, 604e-8, 42.2)
    gr = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, 210e9)
    extra = {"crush_force": 60e3, "crush_stroke": 0.05} if crush else {}
    on_support = ra * L >= L and cond != "cantilever"
    if on_support and k is None and not crush:
        with pytest.raises(ModelError, match=r"^at:"):
            assess_member(sec, gr, cond, L, L, M, h, basis="en1993", bearing=min(lb, L))
        return
    r = assess_member(sec, gr, cond, L, ra * L, M, h, basis="en1993", cushion_stiffness=k,
                      bearing=min(lb, L), **extra)
    json.dumps(r, allow_nan=False)
    assert r["response"] in ("elastic", "plastic", "exceeds")
    assert r["governing_check"] in (*member.MEMBER_CHECKS, "collapse", "ductility", "rotation")
    if r["response"] == "elastic":
        assert r["utilisation"] <= 1.0 and r["ductility"] is None
    if r["response"] == "plastic":
        assert r["ductility"] is not None and r["ductility"] <= 6.0
        assert r["support_rotation"] <= math.radians(2.0)
    if r["allowable_drop_height"] is not None and r["response"] == "elastic":
        assert r["allowable_drop_height"] >= h * (1 - 1e-6)


def test_bottomed_layer_on_rigid_support_is_unbounded(ipe300: Section, s355: Grade) -> None:
    # a crushable layer on a support point (rigid, f = 0): below bottoming the force is the
    # crush force; once it bottoms out the force is unbounded (design notes §3) → exceeds
    kw = {"basis": "en1993", "crush_force": 60e3, "crush_stroke": 0.05}
    soft = assess_member(ipe300, s355, "simple", 6.0, 0.0, 2000.0, 0.01, **kw)
    assert soft["peak_force"] == pytest.approx(60e3) and soft["response"] == "elastic"
    # allowable height: the layer's net work (F_c − W)·s_c over W, rigid point
    assert soft["allowable_drop_height"] == pytest.approx((60e3 - 2000 * G) * 0.05
                                                          / (2000 * G), rel=REL)
    hard = assess_member(ipe300, s355, "simple", 6.0, 0.0, 2000.0, 3.0, **kw)
    assert hard["response"] == "exceeds" and hard["peak_force"] is None
    assert hard["max_moment"] is not None  # a support point adds no moment
    json.dumps(hard, allow_nan=False)


def _simple_green(L: float, EI: float, x: float, a: float) -> float:
    """Deflection at x under a unit load at a of a simply supported beam, m/N: AISC
    Manual 15th ed. Table 3-23 case 8 (x < a: P·b·x(L² − b² − x²)/(6EIL), b = L − a),
    the other side by symmetry (Maxwell–Betti)."""
    if x > a:
        x, a = L - x, L - a
    b = L - a
    return b * x * (L**2 - b**2 - x**2) / (6 * EI * L)


def test_struck_mass_off_midspan_is_the_floors_rule(ipe300: Section, s355: Grade) -> None:
    """droprig check runs the floor's chain (a floor of one member), so a member struck
    off midspan takes the floor's struck mass: Rayleigh's kinetic energy of the static
    shape, μ∫y²dx, over the largest deflection squared (Timoshenko, Strength of
    Materials Part I; droprig normalises by the largest deflection of the path,
    droprig.solver.loadpath). The shape and its largest deflection by hand from AISC
    Manual Table 3-23 case 8 (Δmax = P·a·b(a + 2b)·√(3a(a + 2b))/(27·EI·L) at
    x = √(a(a + 2b)/3), a > b), integrated by scipy.integrate.quad; the force by Gere
    7th ed. §9.10 Eq. 9-94 with η = M/(M + m_e).

    Before this change droprig check normalised by the struck point's deflection,
    which grows without bound near a support (at L/4 of this beam 1.6× the floor's
    mass): a heavier struck mass, a smaller force — not conservative. Hand values:
    no self-weight or UDL (no existing load), a drop that stays elastic."""
    from scipy.integrate import quad

    L, a, M, h = 6.0, 4.5, 800.0, 0.01  # load at 3L/4 (a > b)
    EI = s355.E * ipe300.Ix
    mu = ipe300.mass_per_length
    b = L - a
    y_max = a * b * (a + 2 * b) * math.sqrt(3 * a * (a + 2 * b)) / (27 * EI * L)
    x_max = math.sqrt(a * (a + 2 * b) / 3)
    assert _simple_green(L, EI, x_max, a) == pytest.approx(y_max, rel=1e-12)
    kin = quad(lambda x: _simple_green(L, EI, x, a) ** 2, 0.0, L, points=[a],
               epsabs=0.0, epsrel=1e-13)[0]
    m_e = mu * kin / y_max**2
    m_old = mu * kin / _simple_green(L, EI, a, a) ** 2
    assert m_old > 1.05 * m_e  # the struck point moves less than the largest deflection
    f = _simple_green(L, EI, a, a)
    W = M * G
    eta = M / (M + m_e)
    K = 1 + math.sqrt(1 + 2 * eta * h / (W * f))
    r = assess_member(ipe300, s355, "simple", L, a, M, h, basis="en1993",
                      self_weight=False)
    assert r["response"] == "elastic"
    # the floor's mass table is interpolated in ξ = a/L (loadpath._XI): 1e-7
    assert r["effective_mass"] == pytest.approx(m_e, rel=1e-6)
    assert r["dynamic_factor"] == pytest.approx(K, rel=1e-6)
    assert r["peak_force"] == pytest.approx(K * W, rel=1e-6)
    K_old = 1 + math.sqrt(1 + 2 * M / (M + m_old) * h / (W * f))
    assert r["peak_force"] > K_old * W


def test_droprig_check_is_the_floor_chain(ipe300: Section, s355: Grade) -> None:
    """droprig check is the floor's chain in its deck-less mode: the chain it runs has
    every step of droprig.solver.chain.STEPS, and its force is the chain's Impact step
    (same object, not a copy of the formulas)."""
    from droprig.solver.chain import STEPS, Impact

    c = member.member_chain(member.MemberDrop(ipe300, s355, "fixed", 5.0, 1.7, 900.0, 0.2,
                                              basis="en1993"))
    assert len(c.history) == len(STEPS)
    r = assess_member(ipe300, s355, "fixed", 5.0, 1.7, 900.0, 0.2, basis="en1993")
    assert r["dynamic_factor"] * 900.0 * G == pytest.approx(float(c[Impact].F[0]), rel=REL)
    assert set(c[member.Demands].checks) == set(member.MEMBER_CHECKS)


@pytest.mark.parametrize(("kw", "name"), [({"ductility_limit": 0.5}, "ductility-limit"),
                                          ({"rotation_limit": 0.0}, "rotation-limit"),
                                          ({"phi": 1.2}, "phi"), ({"L": 70.0}, "span")])
def test_settings_ranges_name_the_option(ipe300: Section, s355: Grade, kw: dict,
                                         name: str) -> None:
    # the chain's settings take the project's ranges (droprig.model.Settings, Member.span)
    args = {"L": 6.0, **kw}
    L = args.pop("L")
    with pytest.raises(ModelError, match=f"^{name}:"):
        assess_member(ipe300, s355, "simple", L, 3.0, 500.0, 0.3, basis="en1993", **args)


def test_utilisation_is_the_largest_elastic_ratio(ipe300: Section, s355: Grade) -> None:
    """Beyond the flexural resistance the reported utilisation is the largest elastic
    demand over resistance (as the floor analysis), here web local yielding: droprig
    check used to report flexure's 4.6 beside a governing web check of 6.2. Hand
    values at the elastic force F = K·W: fixed-end beam with a point load at a, AISC
    Manual 15th ed. Table 3-23 case 16 (M = 2Pa²b²/L³ under the load, Pab²/L² and
    Pa²b/L² at the ends; R1 = Pb²(3a + b)/L³, R2 = Pa²(a + 3b)/L³); resistances by
    droprig.solver.capacity (EN 1993-1-1 6.2.5/6.2.6, EN 1993-1-5 §6: tested in
    test_capacity.py)."""
    from droprig.solver import capacity

    L, a, M, h = 3.0, 1.0, 3000.0, 0.5
    b = L - a
    r = assess_member(ipe300, s355, "fixed", L, a, M, h, basis="en1993", self_weight=False)
    F = r["dynamic_factor"] * M * G
    Mmax = max(2 * F * a**2 * b**2 / L**3, F * a * b**2 / L**2, F * a**2 * b / L**2)
    V = max(F * b**2 * (3 * a + b) / L**3, F * a**2 * (a + 3 * b) / L**3)
    ratios = {
        "flexure": Mmax / capacity.flexural_resistance(ipe300, s355, "en1993"),
        "shear": V / capacity.shear_resistance(ipe300, s355, "en1993"),
        "web_yielding": F / float(capacity.web_local_yielding(ipe300, s355, "en1993", 0.0,
                                                              min(a, b))),
    }
    assert ratios["web_yielding"] > ratios["flexure"] > 1.0
    assert r["utilisation"] == pytest.approx(max(ratios.values()), rel=1e-9)
    assert r["governing_check"] == "web_yielding" and r["response"] == "exceeds"


def test_plastic_reserve_with_existing_udl_is_the_mechanism(ipe300: Section,
                                                            s355: Grade) -> None:
    """A fixed beam struck at midspan while carrying a UDL w yields at the collapse load
    of the mechanism with hinges at the ends and under the load, P·δ + w·L·δ/2 =
    4·Mp·(2δ/L): R_p = 8Mp/L − wL/2 (virtual work; Neal, The Plastic Methods of
    Structural Analysis). Beyond yield the member passes on R_p, so that is the peak
    force. (The floor chain used to take 8(Mp − wL²/24)/L, wL/6 too high, before it
    took the member's own UDL into the mechanism.)"""
    from droprig.solver import capacity

    L, w = 6.0, 20e3
    Mp = capacity.flexural_resistance(ipe300, s355, "en1993")
    r = assess_member(ipe300, s355, "fixed", L, L / 2, 1500.0, 0.3, basis="en1993",
                      self_weight=False, udl=w, bearing=0.2)
    assert r["response"] == "plastic" and r["governing_check"] == "flexure"
    assert r["peak_force"] == pytest.approx(8 * Mp / L - w * L / 2, rel=1e-12)


def test_one_parameter_object_for_assess_and_chain(ipe300: Section, s355: Grade) -> None:
    """assess_member and member_chain share one frozen MemberDrop (issue 9): the same
    inputs give the same result through either door, an unknown option is refused by
    name, a bad value names its droprig check option, and the object cannot change.
    (A property of the interface; the physics is checked against Gere and AISC above.)"""
    import dataclasses

    kw = {"bearing": 0.1, "udl": 2000.0, "cushion_stiffness": 5e7}
    drop = member.MemberDrop(ipe300, s355, "propped", 6.0, 2.0, 1200.0, 0.4,
                             basis="en1993", **kw)
    assert member.assess(drop) == assess_member(ipe300, s355, "propped", 6.0, 2.0, 1200.0,
                                                0.4, basis="en1993", **kw)
    with pytest.raises(TypeError):
        assess_member(ipe300, s355, "propped", 6.0, 2.0, 1200.0, 0.4, basis="en1993",
                      bearings=0.1)
    with pytest.raises(ModelError, match="bearing"):
        member.MemberDrop(ipe300, s355, "propped", 6.0, 2.0, 1200.0, 0.4, basis="en1993",
                          bearing=-1.0)
    with pytest.raises(dataclasses.FrozenInstanceError):
        drop.h = 1.0  # type: ignore[misc]
