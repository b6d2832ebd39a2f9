"""Hand calculations of the governing bay of each demo project (issue 10): the point
and check that set each demo's worst utilisation, worked through by hand.

Sources: Gere, *Mechanics of Materials* 7th ed. §2.3 (axial bar δ = PL/EA) and §9.10
Eq. 9-94 (dynamic factor, springs in series); Sneddon (1965) / Johnson, *Contact
Mechanics* §3.8 (rigid flat punch P = 2aE*δ — from memory); EN 1992-1-1 Table 3.1
(E_cm = 22(f_cm/10)^0.3 GPa), §3.1.3(4) (ν = 0.2), §6.7 (the crushing bound);
EN 1993-1-5 §6 (patch loading, Eqs. 6.1–6.13; IPE 360 dimensions EN 10365, from
memory); ACI 318-19 §19.2.2.1(b) (E_c = 4700√f'c MPa); AISC 360-16 J10.3 Eq. J10-5b (web
crippling within d/2 of a member end, l_b/d > 0.2). The demo projects are invented
scenarios: they give the geometry and inputs, never an expected value.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from droprig.io.project_file import load_project
from droprig.solver import analyse, analysis, evaluate
from droprig.solver.chain import Compliance, Demands, Impact, LoadInputs, StruckMass
from droprig.solver.impact import G

ROOT = Path(__file__).resolve().parents[2]
TOL = 5e-3
"""Hand rounding: the governing point lies a few mm off the column (refined points),
which the hand calculation ignores (Σ R² within 0.1 % of 1, the deck strip's bending
there under 1 % of the deck's compliance)."""


def _demo(name: str):
    p = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    # the energy method and the flat landing: the hand calculations below are of those
    return replace(p, settings=replace(p.settings, dynamic_amplification=False,
                                       tilted_landing=False))


def _at(p, bay_id: str, load_name: str, x: float, y: float):
    """The bay × load of the analysis, its load and the chain at (x, y)."""
    r = analyse(p)
    bay = next(b for b in r.bays if b.bay_id == bay_id and b.load_name == load_name)
    zone = next(z for z in p.lift_zones if z.id == bay.zone_id)
    load = next(ld for ld in zone.loads if ld.name == bay.load_name)
    fm = analysis.build_floor(p.level(bay.level_id), p.settings)
    geo = analysis.point_geometry(fm, p, np.array([x]), np.array([y]))
    return bay, load, fm, evaluate.evaluate_chain(fm, p, load, geo), (x, y)


def _two_mass_history(M: float, k_c: float, m2: float, k2: float, h: float,
                      drops: int = 12) -> tuple[float, float]:
    """Peak framing force k2·max x2 and contact force k_c·max⟨x1 − x2⟩ (N) of the
    two-mass impact M·x1'' = M·g − k_c⟨x1 − x2⟩, m2·x2'' = k_c⟨x1 − x2⟩ − k2·x2 from
    x = 0, x1' = √(2gh') (CEB Bulletin 187 two-mass model — from memory; Clough &
    Penzien 2-DOF), integrated by scipy ``solve_ivp`` (an independent integrator),
    the largest over the drops h' = h·j/drops, j = 1..drops (the envelope over lower
    drops that droprig states)."""
    T = 2 * math.pi * (math.sqrt((M + m2) / k2) + math.sqrt(M / k_c))

    def rhs(_t, y):
        Fc = k_c * max(y[0] - y[2], 0.0)
        return [y[1], G - Fc / M, y[3], (Fc - k2 * y[2]) / m2]

    Ff = Fc = 0.0
    for j in range(1, drops + 1):
        v0 = math.sqrt(2 * G * h * j / drops)
        sol = solve_ivp(rhs, (0.0, 3 * T), [0.0, v0, 0.0, 0.0], max_step=T / 3000,
                        rtol=1e-9, atol=1e-14)
        Ff = max(Ff, float((k2 * sol.y[2]).max()))
        Fc = max(Fc, float((k_c * np.maximum(sol.y[0] - sol.y[2], 0.0)).max()))
    return Ff, Fc


ENVELOPE_OVER_HISTORY = 1.30
"""How far droprig's framing force may lie above the two-mass time history's largest
over lower drops at these column points: its table's ×1.10 margin and the nodes'
neighbours in μ and κ (droprig.solver.struck_mass.build_envelope) — measured 1.25 and
1.27 here, on the safe side."""


def _two_forces_by_hand(c, M: float, h: float, f_c: float, f_col: float,
                        F_one: float) -> float:
    """The two forces at a column point (two-mass model): the contact spring k_c =
    1/f_c (the deck's indentation; a rigid underside) against the column's axial
    spring k2 = 1/f_col carrying the mass m2 of the floor its shortening moves
    (droprig.solver.columns.column_rigid_mass, the chain's). Checks, and returns, the
    chain's force on the framing F_f:

    * the deck's force of a hard load is the one-mass force on the springs in series,
      F_one = W + √(W² + 2Wh/f) (Gere Eq. 9-94, η = 1 at a column);
    * F_f lies between the one-mass balance with η2 = M/(M + m2) and the energy
      bound of the column spring alone, W(1 + √(1 + 2h/(W·f_col) + f_c/f_col))
      (Clough & Penzien, energy of a 2-DOF system);
    * F_f is at least the scipy time history's largest over lower drops, and within
      :data:`ENVELOPE_OVER_HISTORY` of it; the contact force is at least the history's
      and at most the crushing bound F_crush.
    A 300 kg item at a column then reads a framing force of a few MN (its momentum
    passed to some tonnes of floor and an elastic bounce, v2 ≈ 2Mv/(M + m2),
    F ≈ v2·√(k2·m2)), never the rigid punch of the load on the column alone."""
    W = M * G
    imp, sm = c[Impact], c[StruckMass]
    assert imp.two_mass is not None and bool(imp.two_mass[0])
    assert imp.F_deck is not None and imp.F_contact is not None and sm.m2 is not None
    assert float(imp.F_deck[0]) == pytest.approx(F_one, rel=TOL)
    m2 = float(sm.m2[0])
    F_f = float(imp.F[0])
    F_1 = W * (1 + math.sqrt(1 + 2 * M / (M + m2) * h / (W * (f_c + f_col))))
    B_f = W * (1 + math.sqrt(1 + 2 * h / (W * f_col) + f_c / f_col))
    assert F_1 * (1 - TOL) <= F_f <= B_f * (1 + TOL)
    Ff_ivp, Fc_ivp = _two_mass_history(M, 1 / f_c, m2, 1 / f_col, h)
    assert Ff_ivp * (1 - TOL) <= F_f <= ENVELOPE_OVER_HISTORY * Ff_ivp
    assert Fc_ivp * (1 - TOL) <= float(imp.F_contact[0]) <= float(imp.F_crush[0]) * (1 + TOL)
    # the momentum check, by hand: an elastic bounce passes at most 2Mv/(M + m2)
    v = math.sqrt(2 * G * h)
    assert Ff_ivp <= 2 * M * v / (M + m2) * math.sqrt(m2 / f_col) * 1.05
    return F_f


def test_rooftop_governing_bay_by_hand():
    """Rooftop demo: the 300 kg, 4.0 × 0.3 m spreader beam (rigid underside) dropped
    4.8 m at column 2/C (x = 7.5, y = 18 m), on the deck's edge y = 18, over the end
    of beam B2/B-C (IPE 360, S355, 9 m along grid line 2).

    * the footprint is cut at the edge: either way round half of it bears,
      A = 1.2/2 = 0.6 m², a 4/√2 × 0.3/√2 m rectangle; bearing length on the flange
      s_s = its smaller side, 0.3/√2 m, at the member's end (c = 0);
    * springs in series (Gere §9.10): the column below, 3 m / (E·A) with droprig's
      stated default column (A = 0.0171 m², 3 m) and the grade's E = 210 GPa
      (EN 1993-1-1 §3.2.6), and the deck's indentation 1/(2aE*), a = √(A/π),
      E* = E_cm/(1 − ν²), E_cm = 22·(38/10)^0.3 GPa; at the column the beams do not
      bend, so their mass is not struck (η = 1);
    * F = W + √(W² + 2Wh/f) (Gere Eq. 9-94), below the crushing bound (§6.7);
    * the web under the load (EN 1993-1-5 §6, patch loading, γ_M1 = 1 as the
      project's resistance factor): IPE 360 h = 360, b = 170, t_w = 8.0, t_f = 12.7 mm
      (EN 10365, from memory), h_w = h − 2t_f; type (c) at the end:
      k_F = 2 + 6(s_s + c)/h_w, ℓ_e = min(k_F·E·t_w²/(2f_y·h_w), s_s + c),
      m1 = f_yf·b/(f_yw·t_w), m2 = 0.02(h_w/t_f)² (λ_F > 0.5),
      ℓ_y = min(ℓ_e + t_f√(m1/2 + (ℓ_e/t_f)² + m2), ℓ_e + t_f√(m1 + m2)),
      F_cr = 0.9·k_F·E·t_w³/h_w, λ_F = √(ℓ_y·t_w·f_y/F_cr), χ_F = 0.5/λ_F,
      F_Rd = f_y·χ_F·ℓ_y·t_w — less than type (a) (k_F = 6,
      ℓ_y = s_s + 2t_f(1 + √(m1 + m2)));
    * U = F/F_Rd. (Deck punching is not checked where the footprint bears on the
      steel: EN 1992-1-1 §6.2.2(6), test_punching_near_support.py.)"""
    p = _demo("rooftop_plant_swap")
    # the point that governed with one force per point (9.75): with two it is checked
    # here at the column itself; the bay prints at least its U
    bay, load, _fm, c, _xy = _at(p, "2-3/B-C", "Spreader beam 4 m", 7.5, 18.0)
    assert load.name.startswith("Spreader") and load.contact_stiffness is None
    W, h = load.mass * G, 4.8
    assert float(c[LoadInputs].h[0]) == pytest.approx(h, rel=1e-12)
    A = 4.0 * 0.3 / 2
    l, w = 4.0 / math.sqrt(2), 0.3 / math.sqrt(2)
    inp = c[LoadInputs]
    assert float(inp.foot_l[0] * inp.foot_w[0]) == pytest.approx(A, rel=1e-9)
    f_col = 3.0 / (210e9 * 0.0171)
    E_cm = 22e9 * (38.0 / 10.0) ** 0.3
    f_deck = 1.0 / (2.0 * math.sqrt(A / math.pi) * E_cm / (1 - 0.2**2))
    f = f_col + f_deck
    F_one = W + math.sqrt(W**2 + 2 * W * h / f)
    assert float(c[StruckMass].eta[0]) == pytest.approx(1.0, abs=1e-6)
    F = _two_forces_by_hand(c, load.mass, h, f_deck, f_col, F_one)
    # EN 1992-1-1 §6.7 (upper estimate, × 1.25 strain rate): far above F — no cap here
    b1, b2 = min(3 * l, l + 0.13), min(3 * w, w + 0.13)
    F_crush = 1.25 * 38e6 * min(math.sqrt(b1 * b2 / (l * w)), 3.0) * A
    assert float(c[Impact].F_crush[0]) == pytest.approx(F_crush, rel=1e-9)
    assert F_one < F_crush
    E, fy = 210e9, 355e6
    hh, b, tw, tf = 0.360, 0.170, 0.0080, 0.0127
    hw = hh - 2 * tf
    ss, cc = w, 0.0
    m1 = fy * b / (fy * tw)
    m2 = 0.02 * (hw / tf) ** 2

    def resist(kF, ly):
        Fcr = 0.9 * kF * E * tw**3 / hw
        lam = math.sqrt(ly * tw * fy / Fcr)
        assert lam > 0.5  # m2 as taken
        return fy * min(0.5 / lam, 1.0) * ly * tw

    kF = 2 + 6 * (ss + cc) / hw
    assert kF < 6.0
    le = min(kF * E * tw**2 / (2 * fy * hw), ss + cc)
    ly = min(le + tf * math.sqrt(m1 / 2 + (le / tf) ** 2 + m2), le + tf * math.sqrt(m1 + m2))
    F_Rd = min(resist(kF, ly), resist(6.0, ss + 2 * tf * (1 + math.sqrt(m1 + m2))))
    chk = c[Demands].checks["web_yielding"]
    assert float(chk.F_allow[0]) == pytest.approx(F_Rd, rel=TOL)
    assert float(chk.U[0]) == pytest.approx(F / F_Rd, rel=2 * TOL)
    assert bay.max_utilisation >= F / F_Rd * (1 - 2 * TOL)
    checks = c[Demands].checks
    assert max(checks, key=lambda k: float(checks[k].U[0])) == "web_yielding"


def test_steel_demo_governing_bay_by_hand():
    """Steel demo (AISC basis): the 113.4 kg (250 lb), 12 ft × 6 in spreader bar
    (rigid) dropped 13 ft at column 1/B (x = 0, y = 30 ft), on the deck's edge x = 0,
    over the end of girder BB/1-2 (W21X44, A992).

    * half the footprint bears (cut at x = 0): A = 3.6576 × 0.1524/2 m², a rectangle
      of the footprint's proportions, sides × 1/√2; bearing length on the flange
      l_b = its smaller side;
    * f = 3 m/(E·0.0171 m²) (the column, E of the grade) + 1/(2aE*) (the deck,
      E_c = 4700√f'c, ν = 0.2); η = 1 at the column;
    * F = W + √(W² + 2Wh/f);
    * web crippling at the girder's end (distance < d/2, l_b/d > 0.2):
      R_n = 0.40·t_w²·[1 + (4l_b/d − 0.2)(t_w/t_f)^1.5]·√(E·F_y·t_f/t_w)
      (AISC 360-16 Eq. J10-5b, resistance factor 1 as the project sets);
    * U = F/R_n."""
    p = _demo("steel_erection_floor")
    # the point that governed with one force per point (7.21), at column 1/B itself
    bay, load, fm, c, _xy = _at(p, "1-2/A-B", "Spreader bar 12 ft", 0.0, 9.144)
    assert load.name.startswith("Spreader") and load.contact_stiffness is None
    # with two forces the bay's largest U need not be this point's web crippling any
    # more (it is deck flexure on the merged tree); the hand check below is of the
    # web crippling at the column point, which the bay's worst U covers
    assert bay.max_utilisation >= float(c[Demands].checks["web_crippling"].U[0]) - 1e-9
    assert p.settings.resistance_factor == 1.0
    W, h = load.mass * G, 13 * 0.3048
    A = 12 * 0.3048 * 6 * 0.0254 / 2
    s = 1 / math.sqrt(2)
    lb = 6 * 0.0254 * s
    inp = c[LoadInputs]
    assert float(inp.lb[0]) == pytest.approx(lb, rel=1e-9)
    girder = next(m for m in fm.level.members if m.id == "BB/1-2")
    sec, E = girder.section, girder.grade.E
    f_col = 3.0 / (E * 0.0171)
    fc = float(fm.level.deck.concrete.fc)
    E_c = 4700e6 * math.sqrt(fc / 1e6)
    f_deck = 1.0 / (2.0 * math.sqrt(A / math.pi) * E_c / (1 - 0.2**2))
    f = f_col + f_deck
    assert float(c[Compliance].f[0]) == pytest.approx(f, rel=TOL)
    F_one = W + math.sqrt(W**2 + 2 * W * h / f)
    F = _two_forces_by_hand(c, load.mass, h, f_deck, f_col, F_one)
    tw, tf, dd = sec.tw, sec.tf, sec.d
    assert lb / dd > 0.2
    Fy = girder.grade.yield_strength(tw)
    Rn = 0.40 * tw**2 * (1 + (4 * lb / dd - 0.2) * (tw / tf) ** 1.5) * math.sqrt(
        E * Fy * tf / tw)
    assert float(c[Demands].checks["web_crippling"].F_allow[0]) == pytest.approx(Rn, rel=1e-9)
    assert float(c[Demands].checks["web_crippling"].U[0]) == pytest.approx(F / Rn, rel=TOL)
    assert bay.max_utilisation >= F / Rn * (1 - TOL)
