"""Floor-system analysis: hand check of one bay, symmetry, result contract, mats,
openings, beyond-yield response, grid refinement and the calculation trace.

Sources: AISC *Steel Construction Manual* 15th ed., Table 3-23 (cases 7 and 8:
simple beam, concentrated load at midspan / at any point); Gere, *Mechanics of
Materials* 7th ed., §9.10, Eq. 9-94 (energy method); EN 1993-1-1 Eq. 6.13
(Mc,Rd = Wpl·fy/γM0 for a Class 1 section), EN 10025-2 Table 7 (S355: 355 MPa up to
16 mm); Engineering ToolBox "Impact Force" (series cushion 1/k_eff = 1/k_s + 1/k_c;
average force over a stopping distance); Biggs, *Introduction to Structural
Dynamics* (1964) energy balance beyond yield (from memory, as in references.md).
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from droprig.model import (
    Deck,
    LiftLoad,
    LiftZone,
    Project,
    ProtectionArea,
    Rect,
    Settings,
    generate_level,
)
from droprig.solver import analysis, droppoints, summary, unit_actions
from droprig.solver.chain import (
    BeyondYield,
    Compliance,
    Demands,
    Impact,
    StruckMass,
)
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.results import (
    ADVICE_KINDS,
    CHECKS,
    ELASTIC,
    EXCEEDS,
    LIMIT_MARGIN,
    PERFORATES,
    PLASTIC,
    RESPONSES,
)
from droprig.solver.trace import trace_point
from tests.builders import BEAM, GIRDER, S355, AtPoints

REL = 1e-9  # closed forms in floating point
G = 9.80665  # standard gravity (CGPM 1901)



_AtPoints = AtPoints

def _indentation(area: float, fck: float = 30e6) -> float:
    """Deck indentation compliance under a rigid flat footprint of ``area`` (m/N):
    P = 2aE*δ, a = √(A/π), E* = E/(1 − ν²) (Sneddon 1965; Johnson, Contact Mechanics
    §3.8 — from memory), E = Ecm = 22·((fck + 8)/10)^0.3 GPa (EN 1992-1-1 Table 3.1),
    ν = 0.2 (EN 1992-1-1 §3.1.3(4))."""
    E = 22e9 * ((fck / 1e6 + 8.0) / 10.0) ** 0.3
    return 1.0 / (2.0 * math.sqrt(area / math.pi) * E / (1 - 0.2**2))

# S355 (EN 10025-2 Table 7) and sections close to IPE 300 / IPE 450: tests/builders.py


def _one_bay_level(**kw):
    """9 m (x) × 6 m (y) bay: girders along x on y = 0 and 6, beams along y at
    x = 0, 3, 6, 9 (beam spacing 3 m), 130 mm composite deck, 1 kPa superimposed dead."""
    args = dict(level_id="L1", name="hand", elevation=10.0, x_spacings=(9.0,),
                y_spacings=(6.0,), girder_direction="x", beam_spacing=3.0,
                girder_section=GIRDER, beam_section=BEAM, girder_grade=S355,
                beam_grade=S355, superimposed_dead=1000.0, live_in_place=0.0)
    args.update(kw)
    return generate_level(**args)


def _project(level, zones, protection=(), **settings):
    # these tests check the energy method (Gere 7th ed. §9.10) by hand: dynamic
    # amplification (on by default) is tested in test_chain_amplification.py and
    # test_amplification_capped.py
    settings.setdefault("dynamic_amplification", False)
    return Project(settings=Settings(**settings), levels=(level,), lift_zones=tuple(zones),
                   protection_areas=tuple(protection))


def _zone(loads, level_id="L1", centre=(4.5, 3.0), r_max=30.0, **kw):
    return LiftZone("Z1", "zone", level_id, centre, 0.0, r_max, loads=tuple(loads), **kw)


def _at(fm, project, load, xs, ys):
    geo = analysis.point_geometry(fm, project, np.asarray(xs, float), np.asarray(ys, float))
    return _AtPoints(evaluate_chain(fm, project, load, geo))


# --------------------------------------------------------------------------- hand check
def test_hand_check_one_bay():
    """1000 kg dropped 0.1 m onto the midspan of the infill beam at x = 3 m.

    By hand (η = 1: member mass left out, as a hand calculation would):
    * beam, AISC Table 3-23 case 7: δ = PL³/(48EI) → f_b = 6³/(48·EI_b) = 4.5/EI_b
    * the beam puts ½ on each girder at a = 3 m of a 9 m span; AISC case 8, under the
      load δ = Pa²b²/(3EIL) → per girder (½)²·3²·6²/(3·EI_g·9) = 3/EI_g; two girders
      6/EI_g
    * framing f_s = 4.5/EI_b + 6/EI_g + f_col; the columns are axial springs
      L/(EA) = 3 m/(210 GPa × 0.0171 m², the stated defaults; Gere §2.3): each girder
      takes ½ at a third of its span, so the columns take 1/3, 1/6, 1/3, 1/6 and
      f_col = Σ R²·L/(EA) = (5/18)·L/(EA) (unit-load method, Gere §9.10); the deck
      adds its indentation under the 1 m² footprint (the point lies on the beam line:
      no strip bending), f = f_s + f_ind
    * Gere Eq. 9-94: K = 1 + √(1 + 2h/(W·f)), F = K·W
    * beam moment at midspan: F·L/4 + w0·L²/8 (case 7 and case 1), w0 = beam
      self-weight + (deck 0.13 m × 2400 kg/m³ × g + 1 kPa) × 3 m tributary width
    * Mc,Rd = Wpl·fy = 6.28e-4 m³ × 355 MPa (EN 1993-1-1 Eq. 6.13, Class 1)
    """
    level = _one_bay_level()
    load = LiftLoad("crate", 1000.0, 1.0, 1.0, drop_height=0.1)
    proj = _project(level, [_zone([load])], include_member_mass=False)
    fm = analysis.build_floor(level, proj.settings)
    r = _at(fm, proj, load, [3.0], [3.0])

    EI_b = 210e9 * 8.356e-5
    EI_g = 210e9 * 3.374e-4
    f_col = 5.0 / 18.0 * 3.0 / (210e9 * 0.0171)  # columns as springs (was rigid)
    f_s = 4.5 / EI_b + 6.0 / EI_g + f_col
    f = f_s + _indentation(1.0)
    W = 1000.0 * G
    K = 1.0 + math.sqrt(1.0 + 2 * 0.1 / (W * f))
    F = K * W
    w0 = 42.2 * G + (0.13 * 2400.0 * G + 1000.0) * 3.0
    M = F * 6.0 / 4.0 + w0 * 6.0**2 / 8.0
    Mr = 6.28e-4 * 355e6
    assert r.chain[Compliance].f_s[0] == pytest.approx(f_s, rel=REL)
    assert r.chain[Compliance].f[0] == pytest.approx(f, rel=REL)
    assert r["dynamic_factor"][0] == pytest.approx(K, rel=REL)
    assert r["peak_force"][0] == pytest.approx(F, rel=REL)
    assert r.chain[Demands].checks["flexure"].U[0] == pytest.approx(M / Mr, rel=REL)
    # the beam's bending governs this point; the response is elastic
    assert r["utilisation"][0] == pytest.approx(M / Mr, rel=REL)
    assert CHECKS[r["governing_check"][0]] == "flexure"
    assert level.members[r["governing_member"][0]].id == "B1.1/A-B"
    assert r["response"][0] == ELASTIC
    # allowable drop height: Gere Eq. 9-94 solved for h with F_allow = (Mr − M0)/(L/4)
    Fa = (Mr - w0 * 6.0**2 / 8.0) / 1.5
    h_allow = W * f * ((Fa / W - 1) ** 2 - 1) / 2
    assert r["allowable_drop_height"][0] == pytest.approx(h_allow, rel=1e-7)


def test_hand_check_spring_mat_in_series():
    """Same point under a spring mat 0.2 m thick, k = 2 kN/mm: f = f_s + f_ind + 1/k
    (series springs, Engineering ToolBox "Impact Force"; the footprint spreads 1:1
    through the mat to 1.4 m × 1.4 m on the deck), free fall shortened by the mat
    thickness (the load is given by hook elevation)."""
    level = _one_bay_level()
    load = LiftLoad("crate", 1000.0, 1.0, 1.0, drop_height=None, hook_elevation=13.0,
                    hang_length=2.5)
    mat = ProtectionArea("M1", "mat", "L1", Rect(2.0, 2.0, 4.0, 4.0), "spring", 0.2, 2e6)
    proj = _project(level, [_zone([load])], [mat], include_member_mass=False)
    fm = analysis.build_floor(level, proj.settings)
    r = _at(fm, proj, load, [3.0, 3.0], [3.0, 5.0])
    # + the columns' axial springs (5/18)·L/(EA), as in test_hand_check_one_bay
    f_s = 4.5 / (210e9 * 8.356e-5) + 6.0 / (210e9 * 3.374e-4) \
        + 5.0 / 18.0 * 3.0 / (210e9 * 0.0171)
    h = 13.0 - 2.5 - (10.0 + 0.2)
    W = 1000.0 * G
    K = 1.0 + math.sqrt(1.0 + 2 * h / (W * (f_s + _indentation(1.4**2) + 1 / 2e6)))
    assert r["fall_height"][0] == pytest.approx(h, rel=REL)
    assert r["fall_height"][1] == pytest.approx(0.5, rel=REL)  # bare deck
    # the drop height is on one datum, the finished surface, on and off the mat
    assert r["drop_height"][0] == pytest.approx(0.5, rel=REL)
    assert r["drop_height"][1] == pytest.approx(0.5, rel=REL)
    assert r["protection"][0] == 0 and r["protection"][1] == -1
    assert r["peak_force"][0] == pytest.approx(K * W, rel=REL)


@pytest.mark.parametrize("stroke", [0.25, 0.05])
def test_crushable_layer(stroke):
    """A crushable layer that does not bottom out passes on its crush force
    (Engineering ToolBox "Impact Force": force over the stopping distance); one that
    bottoms out leaves the energy ηWh − (F_c − W)s_c to the structure (energy balance
    of design notes §3: ηWh + W(δ + s_c) = δ²/(2f) + F_c·s_c)."""
    level = _one_bay_level()
    load = LiftLoad("crate", 1000.0, 1.0, 1.0, drop_height=0.5)
    pad = ProtectionArea("C1", "pad", "L1", Rect(2.0, 2.0, 4.0, 4.0), "crushable", 0.1,
                         None, crush_force=40e3, crush_stroke=stroke)
    proj = _project(level, [_zone([load])], [pad], include_member_mass=False)
    fm = analysis.build_floor(level, proj.settings)
    r = _at(fm, proj, load, [3.0], [3.0])
    W, Fc = 1000.0 * G, 40e3
    comp = r.chain[Compliance]
    # framing and deck behind the layer, and what is left of the layer once its stroke
    # is spent: t_r = 0.1 m − stroke under the 1 × 1 m footprint spread 1:1 through
    # it, t_r/(E·1·(1 + 2·t_r)) at E = 370 MPa (Gere §2.3; EN 338 C24 E_90,mean, from
    # memory; none once the stroke passes the thickness)
    t_r = max(0.1 - stroke, 0.0)
    f_s = comp.f_s[0] + comp.f_deck[0] + t_r / (370e6 * 1.0 * (1.0 + 2.0 * t_r))
    # crush depth from ηWh + W(F_c·f + c) = F_c²f/2 + F_c·c (η = 1)
    # the 0.5 m drop height is above the finished surface: the fall onto the
    # 0.1 m layer is 0.4 m
    h = 0.5 - 0.1
    assert r["fall_height"][0] == pytest.approx(h, rel=REL)
    c = (W * h + W * Fc * f_s - 0.5 * Fc**2 * f_s) / (Fc - W)
    if c <= stroke:
        assert r["peak_force"][0] == pytest.approx(Fc, rel=REL)
    else:
        F = W + math.sqrt(W**2 + 2 * (W * h - (Fc - W) * stroke) / f_s)
        assert r["peak_force"][0] == pytest.approx(F, rel=REL)
    assert (c <= stroke) == (stroke == 0.25)


# --------------------------------------------------------------------------- response states
def test_opening_lets_the_load_fall_through():
    level = _one_bay_level(deck=Deck(openings=(Rect(4.0, 2.0, 5.0, 3.0),)))
    load = LiftLoad("crate", 500.0, 0.5, 0.5, drop_height=1.0)
    proj = _project(level, [_zone([load])])
    res = analysis.analyse(proj)
    case = res.cases[0]
    inside = (case.x >= 4.0) & (case.x <= 5.0) & (case.y >= 2.0) & (case.y <= 3.0)
    assert inside.any()
    assert np.all(case.response[inside] == EXCEEDS)
    assert np.all(case.governing_check[inside] == CHECKS.index("opening"))
    assert np.all(np.isnan(case.allowable_drop_height[inside]))  # none exists


def test_beyond_yield_energy_balance():
    """Find a point that yields in flexure only; its peak deflection follows the
    elastic–perfectly-plastic balance R_p(δm − δy/2) = ηWh + Wδm (Biggs 1964)."""
    level = _one_bay_level(superimposed_dead=0.0)
    load = LiftLoad("block", 3000.0, 1.0, 1.0, drop_height=0.3)
    proj = _project(level, [_zone([load])], include_member_mass=True,
                    ductility_limit=30.0, rotation_limit=math.radians(15.0))
    fm = analysis.build_floor(level, proj.settings)
    r = _at(fm, proj, load, [3.0, 6.0], [3.0, 3.0])
    assert np.all(r.chain[Demands].checks["flexure"].U > 1.0)
    pl = r["response"] == PLASTIC
    assert pl.any()
    W = load.weight
    # two forces per point: η is the framing's share of the energy that gives the
    # two-mass framing force F_f in the one-mass balance, η_f = ((F_f/W − 1)² − 1)·
    # W·f/(2h) (Gere Eq. 9-94 solved for η; Biggs 1964 ch. 5: the elastic–plastic
    # balance with the energy the elastic response puts into the framing)
    imp = r.chain[Impact]
    assert imp.eta_frame is not None
    F_f, f_all = imp.F[pl], r.chain[Compliance].f[pl]
    eta = ((F_f / W - 1.0) ** 2 - 1.0) * W * f_all / (2.0 * 0.3)
    assert imp.eta_frame[pl] == pytest.approx(eta, rel=1e-9)
    Rp = r.chain[BeyondYield].R_p[pl]
    dy = Rp * r.chain[Compliance].f[pl]
    dm = (eta * W * 0.3 + Rp * dy / 2) / (Rp - W)
    assert r["plastic_deflection"][pl] == pytest.approx(dm, rel=REL)
    # ductility of the framing: the deck's elastic travel R_p·f_deck is taken out
    f_s, f = r.chain[Compliance].f_s[pl], r.chain[Compliance].f[pl]
    assert r["ductility"][pl] == pytest.approx((dm - Rp * (f - f_s)) / (Rp * f_s), rel=REL)
    # a simple beam struck at midspan by itself: R_p = (Mp − M0)/(L/4) (first hinge)
    assert np.all(Rp <= (6.28e-4 * 355e6) / 1.5 + 1e-6)


def test_drop_over_a_column_is_finite():
    """Over a column the members do not deflect; the column is an axial spring
    L/(EA) = 3 m/(210 GPa × 0.0171 m²) (the stated defaults; Gere §2.3) carrying the
    whole load, in series with the deck's indentation under the footprint
    (Gere Eq. 9-94 with f = L/(EA) + f_ind). Before the columns were springs the
    framing was rigid here (f_s = 0) and the force several times higher. With two
    forces per point the column takes the two-mass framing force (the floor around
    the column is the struck mass) and the deck the one-mass force."""
    level = _one_bay_level()
    load = LiftLoad("crate", 1000.0, 1.0, 1.0, drop_height=0.5)
    proj = _project(level, [_zone([load])])
    fm = analysis.build_floor(level, proj.settings)
    r = _at(fm, proj, load, [0.0], [0.0])
    f_col = 3.0 / (210e9 * 0.0171)
    assert r.chain[Compliance].f_s[0] == pytest.approx(f_col, rel=REL)
    W = 1000.0 * G
    # (0, 0) is the deck's corner: a quarter of the 1 m × 1 m footprint, 0.5 m × 0.5 m,
    # bears on the deck (plane geometry; droprig.solver.footprint.footprint_on_deck)
    f_ind = _indentation(0.25)
    f = f_col + f_ind
    K = 1.0 + math.sqrt(1.0 + 2 * 0.5 / (W * f))
    imp = r.chain[Impact]
    # two forces per point: the deck's checks of a hard load take the one-mass force of
    # the load on the deck and column in series (Gere Eq. 9-94, η = 1: no member
    # bends over a column, m_e = 0)
    assert imp.F_deck is not None and imp.F_contact is not None
    assert imp.F_deck[0] == pytest.approx(K * W, rel=REL)
    # the force on the column (the framing): the two-mass model with the floor mass
    # the column's shortening moves (m2 > 0), never above the energy bound on the
    # column spring alone, W(1 + √(1 + 2h/(W·f_col) + f_ind/f_col)) (the whole energy
    # W·h + the contact's share in the column: Clough & Penzien, energy of a 2-DOF
    # system; hand formula) — finite and set by the column, 3.44 MN here
    m2 = r.chain[StruckMass].m2
    assert m2 is not None and m2[0] > 0.0
    B_f = W * (1.0 + math.sqrt(1.0 + 2 * 0.5 / (W * f_col) + f_ind / f_col))
    F_f = r["peak_force"][0]
    assert F_f <= B_f * (1 + REL)
    # and never below the two-mass time history (scipy solve_ivp of M on k_c = 1/f_ind,
    # m2 on k2 = 1/f_col, contact only in compression; independent integrator): the
    # envelope over lower drops × 1.10 lies above it (3.34 MN), by at most the margin
    kc, k2, M, v0 = 1.0 / f_ind, 1.0 / f_col, 1000.0, math.sqrt(2 * G * 0.5)

    def rhs(_t, y):
        Fc = kc * max(y[0] - y[2], 0.0)
        return [y[1], G - Fc / M, y[3], (Fc - k2 * y[2]) / m2[0]]

    T = 2 * math.pi * math.sqrt((M + m2[0]) / k2)
    sol = solve_ivp(rhs, (0.0, 3 * T), [0.0, v0, 0.0, 0.0], max_step=T / 4000,
                    rtol=1e-10, atol=1e-14)
    F_ivp = float((k2 * sol.y[2]).max())
    Fc_ivp = float((kc * np.maximum(sol.y[0] - sol.y[2], 0.0)).max())
    assert F_ivp <= F_f <= 1.10 * F_ivp
    # the contact force: at least the time history's, at most the crushing bound of
    # the deck concrete under the footprint (EN 1992-1-1 §6.7, droprig.solver.crushing)
    assert Fc_ivp <= imp.F_contact[0] <= imp.F_crush[0] * (1 + REL)
    assert np.isfinite(r["utilisation"][0])


# --------------------------------------------------------------------------- contract
MUST_EXIST = ("x", "y", "drop_height", "utilisation", "dynamic_factor", "peak_force",
              "static_deflection", "effective_mass", "max_deflection", "deceleration_g")


@pytest.fixture(scope="module")
def busy_project():
    """Two bays each way, a mat, a crushable pad, an opening, a hook-height load and
    a corridor zone, US/AISC basis."""
    w16 = replace(BEAM, name="B1")
    level = _one_bay_level(x_spacings=(9.0, 7.5), y_spacings=(6.0, 8.0),
                           deck=Deck(openings=(Rect(12.0, 8.0, 13.0, 9.0),)),
                           beam_section=w16, live_in_place=500.0)
    loads = (LiftLoad("pump", 1800.0, 1.2, 0.8, drop_height=1.5),
             LiftLoad("sling", 60.0, 0.2, 0.2, drop_height=None, hook_elevation=20.0,
                      hang_length=4.0, kind="rigging"))
    zones = [LiftZone("Z1", "ring", "L1", (-3.0, 7.0), 2.0, 18.0, math.radians(-60),
                      math.radians(70), 0.5, loads=loads),
             LiftZone("Z2", "corridor", "L1", (8.0, -10.0), 5.0, 40.0, drift_margin=1.0,
                      corridor=((2.0, 1.0), (14.0, 1.0), (14.0, 4.0), (2.0, 4.0)),
                      loads=loads[:1])]
    prot = (ProtectionArea("M", "mat", "L1", Rect(1.0, 1.0, 5.0, 5.0), "spring", 0.15, 5e6),
            ProtectionArea("P", "pad", "L1", Rect(10.0, 1.0, 14.0, 5.0), "crushable", 0.1,
                           None, crush_force=60e3, crush_stroke=0.1))
    return _project(level, zones, prot, design_basis="aisc360", unit_system="US")


def test_no_nan_where_a_value_must_exist(busy_project):
    res = analysis.analyse(busy_project)
    assert len(res.cases) == 3
    for case in res.cases:
        assert case.n > 0
        opening = case.governing_check == CHECKS.index("opening")
        for name in MUST_EXIST:
            arr = getattr(case, name)
            ok = ~np.isnan(arr) if name in ("x", "y", "drop_height", "utilisation") \
                else ~np.isnan(arr) | opening
            assert ok.all(), name
        assert np.all(case.response >= 0) and np.all(case.response <= 3)
        # perforates exactly where a hard load's perforation starts at or below its fall
        hit = case.perforation_height <= case.drop_height
        assert np.array_equal(case.response == PERFORATES, hit)
        assert np.all(case.scabbing[hit])
        assert np.all(case.bay >= 0)
        # allowable heights: nan only as "none exists", never negative
        h = case.allowable_drop_height
        assert np.all(np.isnan(h) | (h >= 0))
    for b in res.bays:
        assert not math.isnan(b.max_utilisation)
        assert b.response in RESPONSES
        assert b.advice_kind in ADVICE_KINDS
        assert b.allowable_drop_height is None or b.allowable_drop_height >= 0


M = LIMIT_MARGIN  # limits offered are this share of the least value found


@pytest.mark.parametrize("resp, n_open, h, k, travel, h_el, want", [
    (ELASTIC, 0, 2.0, None, None, 2.0, analysis.Advice("none")),
    (EXCEEDS, 0, 0.4, None, None, 0.4, analysis.Advice("limit_height", M * 0.4)),
    (EXCEEDS, 0, 0.6, None, None, 0.4, analysis.Advice("limit_height", M * 0.6, True)),
    (EXCEEDS, 0, 0.4, None, None, None, analysis.Advice("limit_height", M * 0.4, True)),
    (EXCEEDS, 0, None, 3e6, 0.05, None, analysis.Advice("mat", None, False, M * 3e6, 0.05)),
    (EXCEEDS, 0, 0.4, 3e6, 0.05, 0.4,
     analysis.Advice("limit_or_mat", M * 0.4, False, M * 3e6, 0.05)),
    (EXCEEDS, 0, None, 3e6, 2.0, None, analysis.Advice("keep_clear")),  # mat bottoms out
    (EXCEEDS, 0, 0.01, None, None, None, analysis.Advice("keep_clear")),  # uncontrollable h
    (EXCEEDS, 2, 1.0, 3e6, 0.05, 1.0, analysis.Advice("opening")),
    (PLASTIC, 0, 0.5, 3e6, 0.05, 0.5,
     analysis.Advice("plastic_mat", None, False, M * 3e6, 0.05)),
    (PLASTIC, 0, 0.5, None, None, 0.5, analysis.Advice("plastic_accept")),
])
def test_bay_advice_kind(resp, n_open, h, k, travel, h_el, want):
    # what a bay needs, as data (DEVELOPERS.md; common practice, no source for the
    # 0.05 m and 0.3 m practicality thresholds and the 1 % elastic-height margin)
    assert analysis.bay_advice(resp, n_open, h, k, travel, h_el) == want
    assert want.kind in ADVICE_KINDS


@pytest.mark.parametrize("h_local, h_plastic, want", [
    # the framing's elastic height (0.4 m) is the lower: 90 % of it
    (0.8, None, analysis.Advice("level_below", M * 0.4)),
    # the deck's local damage starts lower: 90 % of its start height
    (0.3, None, analysis.Advice("level_below", M * 0.3)),
    # beyond yield up to 0.6 m: the limit lets members yield (above 1.01 × 0.4 m)
    (0.8, 0.6, analysis.Advice("level_below", M * 0.6, True)),
    # the plastic height barely above the elastic one: the margin stays on the elastic
    (0.8, 0.403, analysis.Advice("level_below", M * 0.4)),
    (0.01, None, analysis.Advice("level_below")), (None, None, analysis.Advice("level_below"))])
def test_perforating_bay_names_the_level_below(h_local, h_plastic, want):
    # a perforating hard load: the level below is an exclusion zone whatever the
    # framing needs; the hook limit keeps the deck whole and the framing within its
    # limits, offered when controllable (0.05 m, common practice, no source); an
    # opening still comes first
    got = analysis.bay_advice(PERFORATES, 0, 0.4, 3e6, 0.05, 0.4, h_local, h_plastic)
    assert got.kind == want.kind and got.height_limit_yields == want.height_limit_yields
    assert got.height_limit == pytest.approx(want.height_limit, rel=1e-12, abs=0) \
        if want.height_limit is not None else got.height_limit is None
    assert analysis.bay_advice(PERFORATES, 1, 0.4, 3e6, 0.05, 0.4, 0.8).kind == "opening"


def test_bay_summaries_carry_advice_numbers(busy_project):
    res = analysis.analyse(busy_project)
    for b in res.bays:
        case = next(c for c in res.cases if (c.zone_id, c.load_name) == (b.zone_id,
                                                                           b.load_name))
        assert b.planned_drop_height == case.planned_drop_height
        if b.advice_kind in ("limit_height", "limit_or_mat"):
            assert b.height_limit is not None
            assert b.height_limit >= summary.MIN_USEFUL_HEIGHT
        elif b.advice_kind == "level_below":
            # the drop under which neither perforation nor scabbing starts and the
            # framing stays within its limits (summary.perforation_limit)
            assert b.response == "perforates" and b.perforation_height is not None
            assert b.height_limit is None or b.height_limit >= summary.MIN_USEFUL_HEIGHT
            assert b.height_limit is None or b.height_limit <= b.perforation_height
            struct = (b.allowable_drop_height_plastic
                      if b.allowable_drop_height_plastic is not None
                      else b.allowable_drop_height)
            assert b.height_limit is None or (
                struct is not None and b.height_limit <= LIMIT_MARGIN * struct)
        else:
            assert b.height_limit is None
        if b.advice_kind in ("mat", "limit_or_mat", "plastic_mat"):
            assert b.mat_stiffness_max is not None and b.mat_stiffness_max > 0
            assert b.mat_travel is None or b.mat_travel <= summary.MAX_MAT_TRAVEL
        else:
            assert b.mat_stiffness_max is None
        assert (b.advice_kind == "none") == (b.response == "elastic")


@pytest.mark.parametrize("basis", ["aisc360", "en1993"])
def test_web_resistance_shortcut_equals_the_clause(basis):
    # away from the ends AISC 360-16 J10.2/J10.3 and EN 1993-1-5 §6 give their
    # interior values; the shortcut must reproduce the clause everywhere
    from droprig.solver import capacity

    level = _one_bay_level()
    fm = analysis.build_floor(level, Settings(design_basis=basis))
    rng = np.random.default_rng(5)
    n = 400
    mem = rng.integers(0, len(level.members), (n, 2))
    lb = np.repeat(rng.choice([0.1, 0.5, 1.2], n)[:, None], 2, axis=1)
    dist = rng.uniform(0.0, 3.0, (n, 2))
    for fn in (capacity.web_local_yielding, capacity.web_crippling):
        (got,) = unit_actions.web_resistances(fm, (fn,), mem, lb, dist)
        for i in range(0, n, 37):
            for k in range(2):
                m = level.members[mem[i, k]]
                want = fn(m.section, m.grade, basis, lb[i, k], dist[i, k])
                assert got[i, k] == pytest.approx(float(want), rel=1e-12)


def test_nothing_to_assess_gives_empty_results_with_a_warning():
    level = _one_bay_level()
    assert analysis.analyse(_project(level, [])).cases == ()
    res = analysis.analyse(_project(level, [_zone([])]))
    assert res.cases == () and any("no loads" in w for w in res.warnings)
    far = LiftZone("Z1", "far", "L1", (500.0, 500.0), 0.0, 5.0,
                   loads=(LiftLoad("crate", 100.0),))
    res = analysis.analyse(_project(level, [far]))
    assert res.cases[0].n == 0 and res.bays == ()
    assert any("no drop point" in w for w in res.warnings)


def test_bay_summary_is_the_worst_point(busy_project):
    res = analysis.analyse(busy_project)
    for case in res.cases:
        for b in (s for s in res.bays if s.zone_id == case.zone_id
                  and s.load_name == case.load_name):
            # a bay owns the points inside it and on its edges
            sel = _closed_bay(busy_project, case, b.bay_id)
            U = case.utilisation[sel]
            assert b.n_points == sel.sum()
            assert b.max_utilisation == np.max(U)
            worst = RESPONSES[int(case.response[sel].max())]
            assert b.response == worst


def _closed_bay(project, case, bay_id):
    from droprig.model import bays

    r = next(b.rect for b in bays(project.level(case.level_id)) if b.id == bay_id)
    tol = 1e-7
    return ((case.x >= r.x0 - tol) & (case.x <= r.x1 + tol) & (case.y >= r.y0 - tol)
            & (case.y <= r.y1 + tol))


def test_symmetric_floor_gives_symmetric_results():
    # a floor symmetric about x = 9 with a zone centred on it: mirrored drop points
    # carry equal results (symmetry of the statics)
    level = _one_bay_level(x_spacings=(9.0, 9.0), y_spacings=(6.0,))
    load = LiftLoad("crate", 2000.0, 1.0, 1.0, drop_height=0.5)
    proj = _project(level, [_zone([load], centre=(9.0, 3.0), r_max=20.0)])
    fm = analysis.build_floor(level, proj.settings)
    rng = np.random.default_rng(7)
    xs, ys = rng.uniform(0.1, 8.9, 50), rng.uniform(0.1, 5.9, 50)
    a = _at(fm, proj, load, xs, ys)
    b = _at(fm, proj, load, 18.0 - xs, ys)
    for k in ("utilisation", "peak_force", "effective_mass", "allowable_drop_height"):
        assert np.allclose(a[k], b[k], rtol=1e-9, equal_nan=True), k
    res = analysis.analyse(proj)
    by_bay = {s.bay_id: s for s in res.bays}
    assert by_bay["1-2/A-B"].max_utilisation == pytest.approx(
        by_bay["2-3/A-B"].max_utilisation, rel=1e-9)


# --------------------------------------------------------------------------- refinement
HALVING_TOL = 0.01  # brief: halving the grid never finds a point > 1 % worse


def _demo_like(kind: str):
    """Two invented floors whose zones pass close to columns without containing one
    (the worst points then sit on the zone edge nearest a column)."""
    if kind == "SI":
        level = _one_bay_level(x_spacings=(7.5, 7.5, 7.5), y_spacings=(9.0, 9.0),
                               beam_spacing=2.5, girder_direction="y")
        loads = (LiftLoad("unit", 1500.0, 2.0, 1.2, drop_height=0.6),)
        zone = LiftZone("Z1", "band", "L1", (11.0, -30.0), 0.0, 60.0, drift_margin=0.5,
                        corridor=((1.0, 2.0), (21.5, 2.0), (21.5, 7.0), (1.0, 7.0)),
                        loads=loads)
        return _project(level, [zone], grid_resolution=1.0)
    level = _one_bay_level(x_spacings=(9.144, 9.144), y_spacings=(7.62, 7.62, 7.62),
                           beam_spacing=3.05)
    loads = (LiftLoad("bundle", 900.0, 3.0, 0.6, drop_height=0.9),)
    zone = LiftZone("Z1", "ring", "L1", (-5.0, 11.0), 7.3, 11.0, drift_margin=0.6,
                    loads=loads)
    return _project(level, [zone], design_basis="aisc360", unit_system="US",
                    grid_resolution=1.2)


@pytest.mark.parametrize("kind", ["SI", "US"])
def test_halving_the_grid_finds_nothing_worse(kind):
    coarse = _demo_like(kind)
    fine = replace(coarse, settings=replace(coarse.settings,
                                            grid_resolution=coarse.settings.grid_resolution / 2))
    rc, rf = analysis.analyse(coarse), analysis.analyse(fine)
    worst_c = {(b.bay_id, b.load_name): b for b in rc.bays}
    assert len(worst_c) >= 3
    assert all(math.isfinite(b.max_utilisation) for b in rf.bays)
    for b in rf.bays:
        c = worst_c[(b.bay_id, b.load_name)]
        assert b.max_utilisation <= c.max_utilisation * (1 + HALVING_TOL), b.bay_id


def test_points_lie_in_the_zone_and_over_the_deck(busy_project):
    res = analysis.analyse(busy_project)
    level = busy_project.levels[0]
    ext = level.grid.extent
    for case in res.cases:
        zone = busy_project.zone(case.zone_id)
        assert np.all(droppoints.in_zone(zone, case.x, case.y))
        assert np.all((case.x >= ext.x0 - 1e-9) & (case.x <= ext.x1 + 1e-9))
        assert np.all((case.y >= ext.y0 - 1e-9) & (case.y <= ext.y1 + 1e-9))


# --------------------------------------------------------------------------- trace
def test_trace_agrees_with_analyse(busy_project):
    res = analysis.analyse(busy_project)
    case = res.cases[0]
    rng = np.random.default_rng(3)
    two_seen = 0
    for i in rng.choice(case.n, 8, replace=False):
        t = trace_point(busy_project, case.zone_id, case.load_name, case.x[i], case.y[i])
        steps = {s.symbol: s.value for s in t.steps}
        assert t.response == RESPONSES[case.response[i]]
        assert t.governing_check == CHECKS[case.governing_check[i]]
        if t.governing_check == "opening":
            continue
        # one truth: every number the results print is the trace's (with two forces
        # per point too: the struck mass with the slab, the framing force and its K,
        # the deceleration by the contact force, the searched allowable height)
        for sym, field in (("U", "utilisation"), ("F", "peak_force"), ("K", "dynamic_factor"),
                           ("m_e", "effective_mass"), ("δ_st", "static_deflection"),
                           ("a/g", "deceleration_g"), ("H_allow", "allowable_drop_height"),
                           ("δ_max", "max_deflection")):
            v = getattr(case, field)[i]
            assert steps[sym] == pytest.approx(v, rel=1e-12, nan_ok=True), sym
        two_seen += "F_c" in steps
        for s in t.steps:
            assert s.source and s.formula is not None
            for _, (val, qty) in s.inputs.items():
                assert isinstance(val, float) and isinstance(qty, str)
    assert two_seen > 0  # points with two forces were among those traced


def test_trace_refuses_a_point_off_the_deck(busy_project):
    from droprig.model import ModelError

    with pytest.raises(ModelError, match="deck"):
        trace_point(busy_project, "Z1", "pump", -50.0, -50.0)
    with pytest.raises(ModelError, match="load"):
        trace_point(busy_project, "Z1", "nothing", 3.0, 3.0)


def test_self_crossing_corridor_is_reported():
    # a bow-tie corridor (edges 1-2 and 3-4 cross) is not a simple polygon: the
    # analysis still runs (files that hold one keep opening) and says so
    # (common practice, no source)
    level = _one_bay_level()
    load = LiftLoad("unit", 500.0, 0.5, 0.5, drop_height=0.3)
    bow = ((1.0, 1.0), (8.0, 5.0), (8.0, 1.0), (1.0, 5.0))
    zone = LiftZone("Z1", "bow", "L1", (4.5, -10.0), 0.0, 40.0, corridor=bow, loads=(load,))
    res = analysis.analyse(_project(level, [zone]))
    assert any("not a simple polygon" in w for w in res.warnings)
    plain = replace(zone, corridor=((1.0, 1.0), (8.0, 1.0), (8.0, 5.0), (1.0, 5.0)))
    res = analysis.analyse(_project(level, [plain]))
    assert not any("not a simple polygon" in w for w in res.warnings)
