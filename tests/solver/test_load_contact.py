"""The load's own contact stiffness (skid, base frame, dunnage) in series with the
deck and the framing, and the plastic-hinge gate shared by ``droprig check`` and the
floor analysis.

Sources: Gere, *Mechanics of Materials* 7th ed., §9.10, Eq. 9-94 (energy method,
K = 1 + √(1 + 2h/δst)) and springs in series, 1/k_eff = Σ 1/k_i (any mechanics text;
Gere §9.10 uses the struck system's total flexibility); AISC Manual 15th ed. Table
3-23 case 7 (simple beam, midspan point load: δ = PL³/(48EI), M = PL/4); AISC 360-16
Appendix 1 §1.3.2b (λpd = 0.32√(E/Fy) for the flange of a member that must form a
plastic hinge, from memory); W16X26 section properties from the AISC Shapes Database
v16.0 (bf/2tf = 7.97 > 0.32√(29000/50) = 7.71: no assured hinge rotation in A992).
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from droprig.cli import main
from droprig.io.sections import get_grade, get_section
from droprig.model import (
    LiftLoad,
    LiftZone,
    ModelError,
    Project,
    Settings,
    generate_level,
)
from droprig.solver import analysis, capacity
from droprig.solver.chain import (
    Compliance,
    Demands,
    LoadInputs,
    StruckMass,
)
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.member import assess_member
from droprig.solver.results import CHECKS, RESPONSES
from droprig.solver.trace import trace_point
from tests.builders import AtPoints

G = 9.80665  # standard gravity (CGPM 1901)
REL = 1e-9  # closed forms in floating point
SPAN = 6.0  # m, infill beam span of the test floor
K_SKID = 5e7  # N/m: a stiffness in the range of a steel skid (input only)


_AtPoints = AtPoints


@pytest.fixture(scope="module")
def single_beam_floor():
    """One 6 m × 6 m bay: W36X302 girders (very stiff) carry W16X26 infill beams at
    3 m; the drop point is the midspan of the middle beam, on its line."""
    a992 = get_grade("A992")
    return generate_level(
        level_id="L1", name="test", elevation=10.0, x_spacings=(SPAN,), y_spacings=(SPAN,),
        girder_direction="x", beam_spacing=3.0, girder_section=get_section("W36X302"),
        beam_section=get_section("W16X26"), girder_grade=a992, beam_grade=a992,
        superimposed_dead=0.0)


def _evaluate(level, load, **settings):
    st = dict(unit_system="US", design_basis="aisc360", include_existing_loads=False,
              include_member_mass=False)
    st.update(settings)
    proj = Project(settings=Settings(**st), levels=(level,), lift_zones=(
        LiftZone("Z", "zone", level.id, (3.0, 3.0), 0.0, 10.0, loads=(load,)),))
    fm = analysis.build_floor(level, proj.settings)
    geo = analysis.point_geometry(fm, proj, np.array([3.0]), np.array([3.0]))
    return proj, _AtPoints(evaluate_chain(fm, proj, load, geo))


# --------------------------------------------------------------------------- model
@pytest.mark.parametrize("k", [1e3, 9.99e3, 1.01e12, math.inf, math.nan, -5e7])
def test_contact_stiffness_outside_its_range_is_refused(k: float) -> None:
    with pytest.raises(ModelError) as info:
        LiftLoad("AHU", 4000.0, 3.0, 2.0, drop_height=0.5, contact_stiffness=k)
    assert info.value.field == "load AHU.contact_stiffness"


def test_contact_stiffness_range_is_named_in_the_message() -> None:
    with pytest.raises(ModelError) as info:
        LiftLoad("AHU", 4000.0, 3.0, 2.0, drop_height=0.5, contact_stiffness=5e3)
    assert "10000 N/m" in str(info.value) and "1e+12 N/m" in str(info.value)


# --------------------------------------------------------------------------- analysis
def test_load_spring_adds_its_compliance_in_series(single_beam_floor) -> None:
    """f = f_s + f_deck + 1/k_load (springs in series, Gere §9.10) and the dynamic
    factor of Gere Eq. 9-94 with that f."""
    rigid = LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.1)
    soft = LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.1, contact_stiffness=K_SKID)
    _, r0 = _evaluate(single_beam_floor, rigid)
    _, r1 = _evaluate(single_beam_floor, soft)
    assert r0.chain[LoadInputs].f_load[0] == 0.0
    c0 = r0.chain[Compliance]
    assert c0.f[0] == pytest.approx(c0.f_s[0] + c0.f_deck[0], rel=REL)
    f = r0.chain[Compliance].f[0] + 1.0 / K_SKID
    assert r1.chain[Compliance].f[0] == pytest.approx(f, rel=REL)
    W = 2000.0 * G
    K = 1.0 + math.sqrt(1.0 + 2.0 * 0.1 / (W * f))
    assert r1["dynamic_factor"][0] == pytest.approx(K, rel=REL)
    assert r1["peak_force"][0] == pytest.approx(K * W, rel=REL)


def test_rigid_default_keeps_the_beam_hand_check(single_beam_floor) -> None:
    """No contact stiffness: the framing compliance at the beam's midspan is the AISC
    Table 3-23 case 7 value L³/(48EI) (girders nearly rigid; 1 % covers them) and the
    load adds nothing."""
    w16 = get_section("W16X26")
    _, r = _evaluate(single_beam_floor, LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.1))
    assert r.chain[Compliance].f_s[0] == pytest.approx(SPAN**3 / (48 * 200e9 * w16.Ix), rel=0.01)
    assert r.chain[LoadInputs].f_load[0] == 0.0


@pytest.mark.parametrize("k", [1e10, 1e9, 1e8, 1e7, 1e6])
def test_softer_load_gives_a_smaller_dynamic_factor(single_beam_floor, k: float) -> None:
    # Gere Eq. 9-94: K decreases as δst = W·f grows
    rigid = LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.3)
    _, r0 = _evaluate(single_beam_floor, rigid)
    _, r1 = _evaluate(single_beam_floor, LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.3,
                                                  contact_stiffness=k))
    _, r2 = _evaluate(single_beam_floor, LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.3,
                                                  contact_stiffness=k / 10))
    assert r2["dynamic_factor"][0] < r1["dynamic_factor"][0] < r0["dynamic_factor"][0]
    assert r2["peak_force"][0] < r1["peak_force"][0] < r0["peak_force"][0]


def test_trace_shows_the_load_spring_with_its_source(single_beam_floor) -> None:
    load = LiftLoad("skid", 2000.0, 0.5, 0.5, drop_height=0.1, contact_stiffness=K_SKID)
    proj, r = _evaluate(single_beam_floor, load)
    tr = trace_point(proj, "Z", "skid", 3.0, 3.0)
    step = next(s for s in tr.steps if s.symbol == "1/k_load")
    assert step.value == pytest.approx(1.0 / K_SKID, rel=REL)
    assert step.inputs["k_load"][0] == K_SKID
    assert "series" in step.source and "Gere" in step.source
    f_step = next(s for s in tr.steps if s.symbol == "f")
    assert f_step.value == pytest.approx(r.chain[Compliance].f[0], rel=REL)


# --------------------------------------------------------------------------- droprig check
def test_check_load_stiffness_is_a_series_spring() -> None:
    """assess_member: a simple beam struck at midspan, member mass left out (η = 1):
    f = L³/(48EI) + 1/k_load; K from Gere Eq. 9-94."""
    w16, a992 = get_section("W16X26"), get_grade("A992")
    r = assess_member(w16, a992, "simple", SPAN, SPAN / 2, 1000.0, 0.2, basis="aisc360",
                      beam_mass=False, load_stiffness=K_SKID)
    f = SPAN**3 / (48 * a992.E * w16.Ix) + 1.0 / K_SKID
    W = 1000.0 * G
    assert r["static_deflection"] == pytest.approx(W * f, rel=REL)
    assert r["dynamic_factor"] == pytest.approx(1 + math.sqrt(1 + 2 * 0.2 / (W * f)), rel=REL)
    rigid = assess_member(w16, a992, "simple", SPAN, SPAN / 2, 1000.0, 0.2, basis="aisc360",
                          beam_mass=False)
    assert rigid["dynamic_factor"] > r["dynamic_factor"]


def test_cli_check_load_stiffness_reaches_the_solver(capsys: pytest.CaptureFixture[str]
                                                     ) -> None:
    argv = ["check", "--section", "W16X26", "--grade", "A992", "--span", "20ft", "--at",
            "10ft", "--mass", "2000lb", "--drop", "6in", "--json"]
    assert main([*argv, "--load-stiffness", "50 kN/mm"]) == 0
    soft = json.loads(capsys.readouterr().out)
    assert main(argv) == 0
    rigid = json.loads(capsys.readouterr().out)
    assert soft["peak_force"] < rigid["peak_force"]
    # 50 kN/mm = 5e7 N/m in series with the beam (Gere §9.10)
    w16, a992 = get_section("W16X26"), get_grade("A992")
    L = 20 * 0.3048
    f = L**3 / (48 * a992.E * w16.Ix) + 1 / 5e7
    assert soft["static_deflection"] == pytest.approx(2000 * 0.45359237 * G * f, rel=REL)


def test_cli_check_load_stiffness_out_of_range_exits_2(capsys: pytest.CaptureFixture[str]
                                                       ) -> None:
    rc = main(["check", "--section", "W16X26", "--grade", "A992", "--span", "20ft", "--at",
               "10ft", "--mass", "2000lb", "--drop", "6in", "--load-stiffness", "1 N/m"])
    err = capsys.readouterr().err
    assert rc == 2 and "--load-stiffness" in err


# --------------------------------------------------------------------------- hinge gate
@pytest.mark.parametrize("gate", [True, False])
def test_check_and_analyse_agree_on_a_section_without_hinge_capacity(
        single_beam_floor, monkeypatch: pytest.MonkeyPatch, gate: bool) -> None:
    """2000 kg dropped 0.2 m on the midspan of a W16X26 (A992): flexure over its
    resistance (U ≈ 1.4). W16X26 cannot form a plastic hinge (AISC 360-16 App. 1), so
    both ``droprig check`` and the floor analysis say ``exceeds`` on flexure. With the
    gate lifted (the section taken as hinge-capable) both say ``plastic``: the gate,
    not the numbers, decides."""
    if not gate:
        monkeypatch.setattr(capacity, "plastic_hinge_capable", lambda *a, **k: True)
    load = LiftLoad("crate", 2000.0, 0.5, 0.5, drop_height=0.2)
    _, r = _evaluate(single_beam_floor, load)
    chk = assess_member(get_section("W16X26"), get_grade("A992"), "simple", SPAN, SPAN / 2,
                        2000.0, 0.2, basis="aisc360", bearing=0.5, self_weight=False,
                        beam_mass=False)
    assert r.chain[Demands].checks["flexure"].U[0] > 1.0 and chk["utilisation"] > 1.0
    want = "exceeds" if gate else "plastic"
    assert chk["response"] == want
    assert RESPONSES[r["response"][0]] == want
    assert CHECKS[r["governing_check"][0]] == chk["governing_check"] == "flexure"
    assert single_beam_floor.members[r["governing_member"][0]].id == "B1.1/A-B"
    if gate:  # no plastic height offered beyond the elastic one
        assert r["allowable_drop_height_plastic"][0] == pytest.approx(
            r["allowable_drop_height"][0], rel=REL)


# --------------------------------------------------------------------------- struck mass
def test_struck_mass_a_rounding_error_from_a_column_stays_physical() -> None:
    """Rayleigh: m_e = Σ∫μ(w/w_ref)² dx with |w| ≤ w_ref, so 0 ≤ m_e ≤ the members'
    mass (Timoshenko, Strength of Materials Part I). A drop point 4e-15 m from a
    column (a grid line written in feet) must not give a negative or astronomical
    mass, which would make η ≈ 0 and K ≈ 2 (an unconservative force)."""
    ft = 0.3048
    a992 = get_grade("A992")
    level = generate_level(
        level_id="L1", name="test", elevation=0.0, x_spacings=(30 * ft, 30 * ft),
        y_spacings=(30 * ft, 30 * ft), girder_direction="y", beam_spacing=10 * ft,
        girder_section=get_section("W24X55"), beam_section=get_section("W21X44"),
        girder_grade=a992, beam_grade=a992)
    load = LiftLoad("welder", 520.0, 1.5, 0.75, drop_height=0.9, contact_stiffness=1e7)
    proj = Project(settings=Settings(unit_system="US", design_basis="aisc360"),
                   levels=(level,), lift_zones=(
        LiftZone("Z", "zone", "L1", (0.0, 0.0), 0.0, 40.0, loads=(load,)),))
    fm = analysis.build_floor(level, proj.settings)
    xs = np.array([30 * ft, 30 * ft, 0.0])
    ys = np.array([30 * ft + 4e-15, 30 * ft - 4e-15, 30 * ft + 4e-15])
    r = _AtPoints(evaluate_chain(fm, proj, load, analysis.point_geometry(fm, proj, xs, ys)))
    total = sum(m.section.mass_per_length * m.span for m in level.members)
    sm = r.chain[StruckMass]
    assert np.all(sm.m_e >= 0.0) and np.all(sm.m_e <= total)
    # two forces per point: the struck mass printed is the two-mass model's m2, the
    # steel with the slab and superimposed dead load (none given here: the deck's own
    # weight, ρ·h over the 60 × 60 ft floor, common practice, no source) — physical
    # too, within the floor's whole mass and finite; the two points 8e-15 m apart
    # read the same
    dk = level.deck
    slab = dk.self_weight_pressure / G * (60 * ft) ** 2
    assert sm.m2 is not None
    assert np.all(r["effective_mass"] == sm.m2)
    assert np.all(sm.m2 > 0.0) and np.all(sm.m2 <= total + slab)
    assert sm.m2[0] == pytest.approx(sm.m2[1], rel=1e-9)
    # the steel's η gives the one-mass force, the two-mass framing force's lower bound
    # with η2 = M/(M + m2) (Gere Eq. 9-94: K = 1 + √(1 + 2ηh/δst))
    K_steel = 1 + np.sqrt(1 + 2 * sm.eta * 0.9 / r["static_deflection"])
    eta2 = 520.0 / (520.0 + sm.m2)
    K2 = 1 + np.sqrt(1 + 2 * eta2 * 0.9 / r["static_deflection"])
    assert np.all(r["dynamic_factor"] >= K2 * (1 - REL))
    assert np.all(K_steel > 10.0)  # a hard landing near a column, not K ≈ 2
    assert np.all(r["dynamic_factor"] > 10.0)
