"""The struck slab panel's yield-line resistance in the beyond-yield energy balance, in
series with the framing (chain step ``slab_resistance``).

Sources: Park & Gamble, *Reinforced Concrete Slabs* 2nd ed. (2000) ch. 9–10 —
Johansen's four-segment pattern of a panel supported on four sides under a point
load, P = Σ (m + m′)·(projected length)/(lever), and the conical fan
P = 2π·m/(1 − 2r/(3R)) under a load spread over a circle of radius r (from memory);
Biggs, *Introduction to Structural Dynamics* (1964) ch. 5 / UFC 3-340-02 ch. 3 — the
elastic–perfectly-plastic energy balance R(δm − δy/2) = ηWh + Wδm and resistances
in series (the weaker yields, both deflect elastically to R); UFC 3-340-02 ch. 4 —
support rotation of a slab θ = atan(δ/ℓ) and the 2° limit for slabs without shear
reinforcement (from memory); EN 1992-1-1 §3.1.7(3) and §5.6.3(2) — x_u/d ≤ 0.45 for
a ductile section; §9.3.1.1(2) — distribution steel 20 % of the main bars; AISC
Manual Table 3-23 case 1 — the existing strip moment qL²/8. The demo project is an
invented scenario: it supplies the geometry, never an expected value.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate
from droprig.solver.chain import (
    H_TOL,
    BeyondYield,
    Checks,
    Compliance,
    Demands,
    Impact,
    InverseAnswers,
    LoadInputs,
    SlabResistance,
    StruckMass,
    impact_at,
    slab_ductile,
)
from droprig.solver.results import EXCEEDS, PLASTIC

ROOT = Path(__file__).resolve().parents[2]
REL = 1e-9  # closed forms re-evaluated: equal but for rounding
POINT = (5.705, 1.489)  # a drop point inside panel 1-2/A-B of the steel demo


@pytest.fixture(scope="module")
def steel():
    p = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    z = p.lift_zones[0]
    lv = p.level(z.level_id)
    fm = analysis.build_floor(lv, p.settings)
    load = next(ld for ld in z.loads if ld.name.startswith("Engine"))
    return p, fm, load


def _chain(p, fm, load, xs, ys):
    geo = analysis.point_geometry(fm, p, np.asarray(xs, float), np.asarray(ys, float))
    return evaluate.evaluate_chain(fm, p, load, geo)


def _hand_yield_line(Lx, x, Ly, y, mx, my, r):
    """Park & Gamble ch. 9–10: the least of the four-segment pattern (simply
    supported edges, no top bars) and the fan reaching the nearest support line."""
    pattern = mx * Ly / x + mx * Ly / (Lx - x) + my * Lx / y + my * Lx / (Ly - y)
    R = min(x, Lx - x, y, Ly - y)
    fan = 2 * math.pi * math.sqrt(mx * my) / (1 - 2 * r / (3 * R)) if R > r else math.inf
    return min(pattern, fan), R


def test_slab_section_is_ductile_by_hand(steel):
    _, fm, _ = steel
    dk = fm.level.deck
    # EN 1992-1-1 §3.1.7(3): x = As·fyd/(0.8·fcd), fcd = fck/1.2 (droprig's γc for an
    # accidental situation), d = h − cover − 6 mm (a 12 mm bar)
    d = dk.thickness - dk.cover - 0.006
    x = dk.rebar_area * dk.concrete.fy_rebar / (0.8 * dk.concrete.fc / 1.2)
    ductile = x / d <= 0.45
    assert ductile and slab_ductile(fm) == ductile


def test_yield_line_resistance_and_plastic_response_by_hand(steel):
    p, fm, load = steel
    load = replace(load, drop_height=1.5)
    c = _chain(p, fm, load, [POINT[0]], [POINT[1]])
    comp, sr, by = c[Compliance], c[SlabResistance], c[BeyondYield]
    inp, sm = c[LoadInputs], c[StruckMass]
    path = c.drop.geo.path
    Lx, x = float(comp.strip_span[0]), float(comp.strip_pos[0])
    Ly = float(fm.frame.L[path.members[0, 0]])
    y = float(path.a[0, 0])
    Mr = fm.deck_Mr
    mx = Mr - fm.q0 * Lx**2 / 8  # existing strip moment taken off (Table 3-23 case 1)
    my = 0.2 * Mr                # distribution steel, EN 1992-1-1 §9.3.1.1(2)
    r = math.sqrt(load.footprint_length * load.footprint_width / math.pi)
    P_hand, ell = _hand_yield_line(Lx, x, Ly, y, mx, my, r)
    assert float(sr.R_yl[0]) == pytest.approx(P_hand, rel=REL)
    assert float(sr.ell[0]) == pytest.approx(ell, rel=REL)
    R_frame = float(c[Demands].actions.R_p[0])
    assert P_hand < R_frame and bool(sr.slab_first[0])  # the slab yields first here
    R = min(P_hand, R_frame)                            # series: the weaker yields
    # Biggs: δm = (ηWh + R·δy/2)/(R − W), δy = R·f (every spring elastic up to R)
    W, h, f = float(inp.W[0]), 1.5, float(comp.f[0])
    # η: the framing's share of the energy that gives the two-mass framing force F_f
    # in the one-mass balance, ((F_f/W − 1)² − 1)·W·f/(2h) (Gere Eq. 9-94 solved for
    # η; with one force per point it is M/(M + m_e))
    imp = c[Impact]
    F_f = float(imp.F[0])
    eta = ((F_f / W - 1) ** 2 - 1) * W * f / (2 * h) if imp.two_mass is not None \
        and bool(imp.two_mass[0]) else float(sm.eta[0])
    dy = R * f
    dm = (eta * W * h + 0.5 * R * dy) / (R - W)
    assert float(by.d_m[0]) == pytest.approx(dm, rel=REL)
    theta = math.atan((dm - dy) / ell)  # UFC 3-340-02: the slab turns about ℓ
    assert float(by.theta[0]) == pytest.approx(theta, rel=REL)
    assert theta < math.radians(2.0)
    assert int(by.response[0]) == PLASTIC
    assert int(by.gov_member[0]) < 0  # the deck, not a steel member
    # the inverse answer: the height at which θ reaches 2°
    dlim = dy + math.tan(math.radians(2.0)) * ell
    h_pl = (R * (dlim - dy / 2) - W * dlim) / (eta * W)
    inv = c[InverseAnswers]
    assert h_pl > float(inv.h_el[0])
    got = float(inv.h_pl[0])
    if imp.two_mass is not None and bool(imp.two_mass[0]):
        # two forces: the framing's share η_f changes with the height; the height is
        # searched on the forward impact so that the framing takes the energy the
        # balance allows, η_f(h)·h = η·h_pl (within chain.H_TOL of the boundary,
        # below it)
        e_got = float(impact_at(c, np.array([got])).eta_frame[0]) * got
        assert e_got <= eta * h_pl * (1 + 1e-9)
        e_up = float(impact_at(c, np.array([got * (1 + 2 * H_TOL)])).eta_frame[0])
        assert e_up * got * (1 + 2 * H_TOL) > eta * h_pl
    else:
        assert got == pytest.approx(max(h_pl, float(inv.h_el[0])), rel=REL)


def test_plastic_height_reaches_the_rotation_limit_when_dropped_from(steel):
    # forward run at the plastic allowable height: θ = 2° (closed loop)
    p, fm, load = steel
    c = _chain(p, fm, replace(load, drop_height=1.5), [POINT[0]], [POINT[1]])
    h_pl = float(c[InverseAnswers].h_pl[0])
    for k, expect in ((0.99, PLASTIC), (1.01, EXCEEDS)):
        c2 = _chain(p, fm, replace(load, drop_height=k * h_pl), [POINT[0]], [POINT[1]])
        assert int(c2[BeyondYield].response[0]) == expect, k


def test_over_reinforced_slab_stays_brittle(steel):
    # As = 2000 mm²/m, fck 20 MPa, d ≈ 121 mm: x = As·fy/(0.8·fck/1.2) ≈ 67 mm,
    # x/d ≈ 0.55 > 0.45 (EN 1992-1-1 §5.6.3(2)): no yield-line credit, and deck
    # flexure beyond its resistance at the force the path passes on exceeds
    p, fm, load = steel
    lv = fm.level
    dk = lv.deck
    over = replace(lv, deck=replace(dk, rebar_area=2.0e-3,
                                    concrete=replace(dk.concrete, fc=20e6)))
    fm2 = analysis.build_floor(over, p.settings)
    d = dk.thickness - dk.cover - 0.006
    assert 2.0e-3 * dk.concrete.fy_rebar / (0.8 * 20e6 / 1.2) / d > 0.45
    assert not slab_ductile(fm2)
    xs, ys = np.meshgrid(np.linspace(0.3, 8.8, 12), np.linspace(0.3, 8.8, 12))
    heavy = replace(load, drop_height=3.0, mass=4 * load.mass)
    c = _chain(p, fm2, heavy, xs.ravel(), ys.ravel())
    sr, ck, by = c[SlabResistance], c[Checks], c[BeyondYield]
    assert not sr.ductile.any() and np.isinf(sr.R_yl).all()
    deck = c[Demands].checks["deck_flexure"]
    F = c[Impact].F
    # beyond the framing's yield the deck sees min(F_deck, R) — the one force in
    # series capped by the plastic resistance R; with two forces per point its check
    # is stated on the framing force scaled by A = F_deck/F, so at F_cap = min(F, R/A)
    # where A < 1 (the contact lies before the struck mass: the framing's yield does
    # not lower the deck's force below R; CEB Bulletin 187 two-mass — from memory)
    A = c[Impact].deck_ratio
    R_deck = np.where(A < 1.0, np.minimum(F, sr.R / A), sr.R)
    U_cap = np.where(F <= sr.R, deck.U, deck.U_at(R_deck))
    broken = U_cap > 1.0
    assert broken.any()
    assert (by.response[broken] == EXCEEDS).all()
    assert ck.brittle_fail[broken].all()


def test_series_resistance_never_above_either(steel):
    p, fm, load = steel
    xs, ys = np.meshgrid(np.linspace(0.05, 27.38, 25), np.linspace(0.05, 27.38, 25))
    c = _chain(p, fm, load, xs.ravel(), ys.ravel())
    sr, R_frame = c[SlabResistance], c[Demands].actions.R_p
    ok = np.isfinite(R_frame)
    assert (sr.R[ok] <= R_frame[ok]).all() and (sr.R[ok] <= sr.R_yl[ok]).all()
    assert (sr.R[sr.slab_first] == sr.R_yl[sr.slab_first]).all()
    # on a support line no yield-line credit: the load bears on the steel
    on_line = sr.ell <= 1e-9
    assert np.isinf(sr.R_yl[on_line]).all()
