"""Impact physics on the demo projects: hand calculation of the heavy unit over a
bay centre, no verdict from a rigid-punch spike, columns approached, pads by area,
support lines and deck flexure.

Sources: Gere, *Mechanics of Materials* 7th ed. §2.3 and §9.10 (Eq. 9-94); AISC
Manual 15th ed. Table 3-23 (cases 7, 8); EN 1993-1-1 Eq. 6.13 (Mc,Rd = Wpl·fy);
section properties IPE 360 (Iy 16 270 cm⁴, Wpl,y 1019 cm³, 57.1 kg/m) and HEB 400
(Iy 57 680 cm⁴) as in EN 10365 / the steel-sections package (from memory, checked
against droprig's catalogue below); EN 1992-1-1 §6.7 for the crushing bound. The demo
projects are invented scenarios: they supply the geometry, never an expected value.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model import ProtectionArea, Rect
from droprig.solver import CHECKS, analyse, analysis, deck, evaluate
from droprig.solver.chain import Compliance, Demands, Impact, LoadInputs, outputs
from droprig.solver.impact import G

ROOT = Path(__file__).resolve().parents[2]
HAND_TOL = 0.30
"""The issue asks for the allowable drop within 30 % of a hand calculation; the heavy
unit's hand calculation takes the floor's mass (the framing's share of the energy at
the collision), bracketed by the same balance without it (η = 1, a lower bound) and
with the perfectly inelastic share M/(M + m2) (an upper bound)."""


@pytest.fixture(scope="module")
def roof():
    return _energy_only(load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig"))


@pytest.fixture(scope="module")
def steel():
    return _energy_only(load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig"))


def _energy_only(p):
    """The hand calculations here are of the energy method (Gere 7th ed. §9.10);
    dynamic amplification (on by default) is tested in test_chain_amplification.py."""
    return replace(p, settings=replace(p.settings, dynamic_amplification=False))


def _chain(project, load, xs, ys):
    lv = project.level(project.lift_zones[0].level_id)
    fm = analysis.build_floor(lv, project.settings)
    geo = analysis.point_geometry(fm, project, np.asarray(xs, float), np.asarray(ys, float))
    return evaluate.evaluate_chain(fm, project, load, geo)


def test_heavy_unit_allowable_drop_over_a_bay_centre_by_hand(roof):
    """AHU-3 (new), 4200 kg on a 25 kN/mm skid, over the centre (11.25, 13.5) of bay
    2-3/B-C of the roof: between beams B2.1/B-C (x = 10) and B2.2/B-C (x = 12.5), both
    IPE 360 S355 over 9 m, at their midspans; the beams rest on HEB 400 girders GB/2-3
    and GC/2-3 (7.5 m) at 2.5 m and 5.0 m from column line 2.

    * lever rule: ½ to each beam; beam midspan, AISC case 7: g = L³/(48EI);
      f_beams = 2·(½)²·9³/(48·EI_b)
    * each beam end puts ¼ on its girder at a = 2.5 and 5.0 m (AISC case 8):
      G(a, a) = a²b²/(3EIL), G(2.5, 5.0) = b·x(L² − b² − x²)/(6EIL), x = 2.5, b = 2.5;
      per girder (¼)²·(G11 + G22 + 2·G12), two girders
    * the columns at the girder ends each take ¼: Σ R² = 4/16 → f_col = ¼·L/(EA),
      3 m / (210 GPa × 0.0171 m²) (droprig's stated defaults; Gere §2.3)
    * the skid 1/k = 1/25e6 m/N in series (Gere §9.10, springs in series)
    * allowable force from the beam bending: each beam carries F/2 at midspan,
      M = (F/2)·L/4 + w0·L²/8 ≤ Wpl·fy (EN 1993-1-1 Eq. 6.13), w0 = 57.1 kg/m·g +
      (0.13 m × 2400 kg/m³ × g + 1500 Pa) × 2.5 m
    * Gere Eq. 9-94 solved for h with η = 1: h = W·f·((F/W − 1)² − 1)/2 — the
      lower bound: the two-mass model credits the floor's mass
    * the floor's mass m2 by hand: two IPE 360 with the slab and finishes over
      2.5 m, (57.1 + (0.13·2400 + 1500/g)·2.5) kg/m, Rayleigh 17/35·μ·L each over
      9 m (Timoshenko Part I): 10.66 t (the girders' share left out)
    * the hand calculation with the floor's mass: the unit strikes the floor's mass
      through its skid, a linear spring that gives its energy back (no crushing at
      this force); the contact lasts half a period of the reduced mass on the skid,
      π·√(μ/k_c) = 0.034 s with μ = M·m2/(M + m2), against the framing's period
      2π·√(m2·f_s) = 0.32 s: the framing has barely moved when the skid lets go, so
      the collision is an elastic one between M and m2 (coefficient of restitution
      1): v2 = 2M·v/(M + m2) and the framing's share of the unit's energy is
      η_f = ½m2·v2² / (½M·v²) = 4·M·m2/(M + m2)² = 0.811 (Goldsmith, *Impact*, ch. 2,
      central impact of two bodies; Clough & Penzien for the framing's free
      vibration — from memory); with Gere Eq. 9-94 on that share,
      h = W·f·((F/W − 1)² − 1)/(2·η_f) = 0.122 m; the chain (the two-mass envelope,
      struck_mass.envelope_two_forces) reads 0.135 m, 1.10 × this
    * the bracket: η = 1 (no credit for the floor's mass, 0.099 m) below, and the
      perfectly inelastic share η = M/(M + m2) = 0.28 (the unit riding on with the
      floor: the plastic collision's share, a soft contact's limit; 0.35 m) above:
      the skid is elastic and short, so the share is the elastic collision's
    """
    load = roof.lift_zones[0].loads[0]
    assert load.name == "AHU-3 (new)"
    c = _chain(roof, load, [11.25], [13.5])
    lv = roof.levels[0]
    beam = next(m for m in lv.members if m.id == "B2.1/B-C")
    girder = next(m for m in lv.members if m.id == "GB/2-3")
    # the catalogue carries the published sections (EN 10365, from memory)
    assert beam.section.Ix == pytest.approx(16270e-8, rel=2e-3)
    assert beam.section.Zx == pytest.approx(1019e-6, rel=2e-3)
    assert girder.section.Ix == pytest.approx(57680e-8, rel=2e-3)
    E = 210e9
    EIb, EIg = E * 16270e-8, E * 57680e-8
    f_beams = 2 * 0.25 * 9.0**3 / (48 * EIb)
    Lg = 7.5
    G11 = 2.5**2 * 5.0**2 / (3 * EIg * Lg)
    G12 = 2.5 * 2.5 * (Lg**2 - 2.5**2 - 2.5**2) / (6 * EIg * Lg)
    f_girders = 2 * (0.25**2) * (2 * G11 + 2 * G12)
    f_col = 0.25 * 3.0 / (E * 0.0171)
    f = f_beams + f_girders + f_col + 1 / 25e6
    W = 4200.0 * G
    w0 = 57.1 * G + (0.13 * 2400.0 * G + 1500.0) * 2.5
    Mr = 1019e-6 * 355e6
    F_allow = (Mr - w0 * 9.0**2 / 8) / (0.5 * 9.0 / 4)
    h_hand = W * f * ((F_allow / W - 1) ** 2 - 1) / 2
    out = outputs(c)
    h = float(out["allowable_drop_height"][0])
    m2_hand = 2 * 17 / 35 * (57.1 + (0.13 * 2400.0 + 1500.0 / G) * 2.5) * 9.0
    assert m2_hand == pytest.approx(10.66e3, rel=1e-3)
    h_hi = h_hand * (4200.0 + m2_hand) / 4200.0
    assert h_hand <= h <= h_hi, (h, h_hand, h_hi)
    # the floor's mass: an elastic collision through the skid, short against the
    # framing's period (Goldsmith ch. 2; from memory)
    M, k_c = 4200.0, 25e6
    mu = M * m2_hand / (M + m2_hand)
    t_contact = math.pi * math.sqrt(mu / k_c)
    T_frame = 2 * math.pi * math.sqrt(m2_hand * (f - 1 / k_c))
    assert t_contact == pytest.approx(0.034, abs=1e-3)
    assert T_frame == pytest.approx(0.32, abs=0.01)
    assert t_contact < T_frame / 8
    eta_f = 4 * M * m2_hand / (M + m2_hand) ** 2
    assert eta_f == pytest.approx(0.811, abs=1e-3)
    h_floor = h_hand / eta_f
    assert h_floor == pytest.approx(0.122, abs=1e-3)
    assert abs(h / h_floor - 1) <= HAND_TOL, (h, h_floor)
    # the allowed force itself is the beam bending's, to within the hand rounding
    assert float(out["F_allow"][0]) == pytest.approx(F_allow, rel=0.02)


def test_no_peak_force_above_the_crushing_bound(roof, steel):
    # EN 1992-1-1 §6.7 (upper estimate): wherever the deck is struck directly the
    # contact force stays at or below the concrete's crushing force over the footprint,
    # unless the crushing passed the cover (then flagged); pads are their own bound
    for project in (roof, steel):
        zone = project.lift_zones[0]
        r = analyse(project)
        for case in r.cases:
            load = next(ld for ld in zone.loads if ld.name == case.load_name)
            c = _chain(project, load, case.x, case.y)
            imp, inp = c[Impact], c[LoadInputs]
            direct = ~inp.crushable & ~imp.deck_through
            assert np.all(imp.F[direct] <= imp.F_crush[direct] * (1 + 1e-12))


def _bay_worst(case, bay: int) -> float:  # as the bay summaries attribute points
    sel = (np.asarray(case.bay) == bay) & np.isfinite(case.utilisation)
    return float(np.max(case.utilisation[sel]))


@pytest.mark.parametrize("name, cx, cy", [
    ("steel", 9.144, 9.144), ("steel", 18.288, 18.288),
    ("roof", 7.5, 9.0), ("roof", 15.0, 9.0), ("roof", 7.5, 18.0),
])
def test_column_approach_changes_a_bays_worst_by_under_5_percent(name, cx, cy, roof,
                                                                steel):
    # points 1–45 mm from a column the lift zone reaches (steel 2/B, 3/C; roof 2/B,
    # 3/B and 2/C on the deck's edge), in every bay it supports; the worst utilisation
    # over the bay (its closed panel, so the column point at its corner counts in each
    # of the bays around it) must not jump (columns are axial springs, the contact
    # crushes): < 5 % (issue 10's test; common practice, no source for the 5 %)
    steel = steel if name == "steel" else roof
    r = analyse(steel)
    zone = steel.lift_zones[0]
    lv = steel.level(zone.level_id)
    fm = analysis.build_floor(lv, steel.settings)
    gx, gy = np.array(lv.grid.x_lines), np.array(lv.grid.y_lines)
    d = np.array([0.001, 0.005, 0.015, 0.03, 0.045])
    dirs = [(1, 0), (-1, 0), (0, 1), (0, -1), (1, 1), (-1, 1), (1, -1), (-1, -1)]
    xs = np.concatenate([cx + d * a / math.hypot(a, b) for a, b in dirs])
    ys = np.concatenate([cy + d * b / math.hypot(a, b) for a, b in dirs])
    geo = analysis.point_geometry(fm, steel, xs, ys)
    checked = 0
    for case in r.cases:
        load = next(ld for ld in zone.loads if ld.name == case.load_name)
        res = evaluate.evaluate_case(fm, steel, load, geo)
        X, Y, U = np.asarray(case.x), np.asarray(case.y), np.asarray(case.utilisation)
        for k in range(xs.size):
            if geo.path.pair[k] < 0:
                continue  # off the deck (beyond its edge): never a drop point of analyse
            i = int(np.clip(np.searchsorted(gx, xs[k]) - 1, 0, gx.size - 2))
            j = int(np.clip(np.searchsorted(gy, ys[k]) - 1, 0, gy.size - 2))
            tol = 1e-9
            inside = ((X >= gx[i] - tol) & (X <= gx[i + 1] + tol) & (Y >= gy[j] - tol)
                      & (Y <= gy[j + 1] + tol) & np.isfinite(U))
            if not inside.any():
                continue
            before = float(np.max(U[inside]))
            after = max(before, float(res["utilisation"][k]))
            assert after <= 1.05 * before, (case.load_name, xs[k], ys[k], before, after)
            checked += 1
    assert checked >= 40


def test_a_pad_on_one_bay_never_changes_another_bays_worst(roof):
    # a crushable pad inside bay 3-4/A-B (x 15–22.5, y 0–9), kept off its edges
    base = replace(roof, protection_areas=())
    pad = ProtectionArea("PX", "pad", "RF", Rect(15.3, 0.3, 22.2, 8.7), "crushable", 0.3,
                         None, crush_stroke=0.3, crush_stress=2e4)
    padded = replace(roof, protection_areas=(pad,))
    r0, r1 = analyse(base), analyse(padded)
    lv = roof.levels[0]
    bay_pad = None
    for c0, c1 in zip(r0.cases, r1.cases, strict=True):
        inside = (c1.x > 15.3) & (c1.x < 22.2) & (c1.y > 0.3) & (c1.y < 8.7)
        if inside.any():
            bay_pad = int(np.asarray(c1.bay)[inside][0])
        for bay in np.unique(c0.bay[c0.bay >= 0]):
            if bay == bay_pad:
                continue
            assert _bay_worst(c1, int(bay)) == _bay_worst(c0, int(bay))
    assert bay_pad is not None and lv.grid.extent.x1 == 22.5


def test_padded_bay_follows_the_pads_area(roof):
    # MAT1 was calibrated as 90 kN for the 6 m² unit: 15 kPa. The 4.0 × 0.3 m spreader
    # presses 1.2 m² → 18 kN, and with 0.35 m of stroke it bottoms out (Engineering
    # ToolBox "Impact Force": c = W·h/(F_c − W) = 0.84 m needed): the rest of the
    # energy reaches the structure elastically (Gere Eq. 9-94 with the bottomed layer's
    # work F_c·s taken out) — far above the 90 kN the force-calibrated pad promised
    spreader = next(ld for ld in roof.lift_zones[0].loads if ld.name.startswith("Spreader"))
    c = _chain(roof, spreader, [11.25], [4.5])
    inp, imp = c[LoadInputs], c[Impact]
    assert inp.crushable[0]
    assert inp.F_c[0] == pytest.approx(90e3 / 6.0 * 4.0 * 0.3, rel=1e-9)
    assert imp.bottomed[0] and imp.crush[0] == pytest.approx(0.35)
    W, h, s_c, Fc = spreader.weight, float(inp.h[0]), 0.35, float(inp.F_c[0])
    f = float(c[Compliance].f_struct[0])
    F_hand = W + math.sqrt(W**2 + 2 * (W * h - (Fc - W) * s_c) / f)
    # the deck's force (a hard load: the one-mass force of the rest, with the fall
    # under the pad's force, 2·F_c·f = 5 mm of 2.5 m, added: chain.residual_height)
    assert imp.F_deck is not None
    assert float(imp.F_deck[0]) == pytest.approx(F_hand, rel=2e-3)
    assert float(imp.F_deck[0]) > 3 * 90e3
    # the framing's: the two-mass stage of the rest against the floor's 12 t
    # (chain.after_bottoming; tests/solver/test_after_bottoming.py) — still above
    # what the force-calibrated pad promised
    assert 90e3 < float(imp.F[0]) < float(imp.F_deck[0])
    unit = roof.lift_zones[0].loads[0]
    cu = _chain(roof, unit, [11.25], [4.5])
    assert cu[LoadInputs].F_c[0] == pytest.approx(90e3, rel=1e-9)  # the unit keeps 90 kN


@pytest.mark.parametrize("name", ["roof", "steel"])
def test_girder_line_points_never_governed_by_deck_flexure(name, roof, steel):
    # a point on a girder (or beam) line bears on the steel: the continuous strip's
    # sagging moment there is zero (statics), so deck flexure cannot govern. That
    # holds for a rigid base (it tips onto the flange: chain.base_on_line); a
    # footprint pressing uniformly wider than the flange (a declared underside
    # stiffness, or a pad's 1:1 spread) also presses the slab beside the line, and
    # that part loads the slab (chain.uniform_on_line, by hand in
    # tests/solver/test_uniform_on_line.py). So: the demos' loads as rigid bases,
    # without their pads
    project = roof if name == "roof" else steel
    project = replace(project, protection_areas=(), lift_zones=tuple(
        replace(z, loads=tuple(replace(ld, contact_stiffness=None) for ld in z.loads))
        for z in project.lift_zones))
    lv = project.levels[0]
    r = analyse(project)
    girders = [m for m in lv.members if m.role == "girder"]
    on_line_total = 0
    for case in r.cases:
        x, y = np.asarray(case.x), np.asarray(case.y)
        on = np.zeros(x.shape, dtype=bool)
        for g in girders:
            (x0, y0), (x1, y1) = g.start, g.end
            if g.axis == "x":
                on |= (np.abs(y - y0) < 1e-6) & (x >= min(x0, x1)) & (x <= max(x0, x1))
            else:
                on |= (np.abs(x - x0) < 1e-6) & (y >= min(y0, y1)) & (y <= max(y0, y1))
        gov = np.asarray(case.governing_check)[on]
        assert not np.any(gov == CHECKS.index("deck_flexure"))
        on_line_total += int(on.sum())
    assert on_line_total > 0


def test_punching_beside_an_opening_and_over_ribs(roof):
    # EN 1992-1-1 §6.4.2(3), Fig. 6.14: a 0.2 × 0.2 m load at p, an opening from
    # x = p + 0.5 to p + 0.7 m, |y − p_y| ≤ 0.05 m: tangents at ±atan(0.05/0.5); they
    # cut the straight face of u1 at x = 0.1 + 2d over |y| ≤ (0.1 + 2d)·0.1, so
    # 2·(0.1 + 2d)·0.1 of u1 = 2(0.2 + 0.2) + 4πd is ineffective (d = 0.13 − 0.025
    # − 0.006 = 0.099 m, as test_deck)
    px, py = 11.25, 13.5
    lv = roof.levels[0]
    crate = replace(roof.lift_zones[0].loads[0], name="crate", footprint_length=0.2,
                    footprint_width=0.2, contact_stiffness=None)
    hole = Rect(px + 0.5, py - 0.05, px + 0.7, py + 0.05)
    with_hole = replace(roof, levels=(replace(lv, deck=replace(lv.deck, openings=(hole,))),),
                        protection_areas=())
    bare = replace(roof, protection_areas=())
    # two forces per point: a check's F_allow is stated on the framing force F; the
    # deck's own allowed force is F_allow·F_deck/F (Impact.deck_ratio)
    R0 = _deck_allowed(_chain(bare, crate, [px], [py]))
    R1 = _deck_allowed(_chain(with_hole, crate, [px], [py]))
    d = 0.099
    u1 = 2 * 0.4 + 4 * math.pi * d
    cut = 2 * (0.1 + 2 * d) * 0.1
    assert R1.F_allow[0] / R0.F_allow[0] == pytest.approx(1 - cut / u1, rel=5e-3)
    # EN 1994-1-1 §9.7.6 (from memory): over 60 mm ribs the depth is that of the
    # 70 mm topping: the resistance is that of a 70 mm slab (EN 1992-1-1 §6.4.4 as
    # checked in test_deck)
    ribbed = replace(bare, levels=(replace(lv, deck=replace(lv.deck, rib_height=0.06)),))
    R2 = _deck_allowed(_chain(ribbed, crate, [px], [py]))
    topping = replace(lv.deck, thickness=0.07, cover=0.025)
    R_top = deck.punching_resistance(topping, 0.2, 0.2, roof.settings.design_basis)
    assert R2.F_allow[0] == pytest.approx(float(R_top), rel=1e-9)
    assert R2.F_allow[0] < 0.6 * R0.F_allow[0]


class _Allowed:
    def __init__(self, F_allow: np.ndarray) -> None:
        self.F_allow = F_allow


def _deck_allowed(c) -> _Allowed:
    """The punching check's allowed force on the deck itself (N): F_allow on the
    framing's force times the deck's share F_deck/F."""
    return _Allowed(c[Demands].checks["deck_punching"].F_allow * c[Impact].deck_ratio)


def test_composite_beam_by_hand(roof):
    # EN 1994-1-1 §6.2.1.2 (full connection, PNA in the slab): IPE 360 (A = 72.7 cm²,
    # EN 10365, from memory), S355, under the 130 mm solid roof slab; b_eff = 2 × min(L/8,
    # half the 2.5 m spacing) = 2.25 m (§5.4.1.2); 0.85·fck/γc = 0.85 × 30/1.2 = 21.25 MPa
    # → C_c,max = 6.22 MN > A·fy = 2.58 MN, a = 2.58e6/(21.25e6 × 2.25) = 54 mm,
    # Mpl = A·fy·(h + d/2 − a/2)
    lv = roof.levels[0]
    k = next(i for i, m in enumerate(lv.members) if m.id == "B2.1/B-C")
    m = lv.members[k]
    assert m.section.A == pytest.approx(72.7e-4, rel=3e-3)
    members = tuple(replace(mm, composite=True) if i == k else mm
                    for i, mm in enumerate(lv.members))
    fm0 = analysis.build_floor(lv, roof.settings)
    fm1 = analysis.build_floor(replace(lv, members=members), roof.settings)
    Ts = m.section.A * 355e6
    a = Ts / (0.85 * 30e6 / 1.2 * 2.25)
    assert fm1.Mr[k] == pytest.approx(Ts * (0.13 + m.section.d / 2 - a / 2), rel=1e-9)
    assert fm1.Mr[k] > 1.9 * fm0.Mr[k]
    # stiffer with the slab (transformed section, E_a/E_cm; Gere §12.5): more force
    assert fm1.frame.EI[k] > 3 * fm0.frame.EI[k]
    # a fixed-ended member keeps steel alone, with a warning
    fixed = tuple(replace(mm, composite=True, end_condition="fixed") if i == k else mm
                  for i, mm in enumerate(lv.members))
    fm2 = analysis.build_floor(replace(lv, members=fixed), roof.settings)
    assert any("composite action" in w for w in fm2.warnings)


def test_connection_end_shear_by_hand(roof):
    # the unit over bay 2-3/B-C at (11.25, 13.5): beam B2.1/B-C takes F/2 at midspan, so
    # each end connection carries F/4 + w0·L/2 (AISC Manual Table 3-23 cases 1 and 7),
    # w0 = 57.1 kg/m·g + (0.13 × 2400 × g + 1500 Pa) × 2.5 m; against a 100 kN connection
    # (the other members given ample connections)
    lv = roof.levels[0]
    members = tuple(replace(m, connection_capacity=(1e5 if m.id == "B2.1/B-C" else 1e8))
                    for m in lv.members)
    p = replace(roof, levels=(replace(lv, members=members),))
    c = _chain(p, roof.lift_zones[0].loads[0], [11.25], [13.5])
    F = float(c[Impact].F[0])
    w0 = 57.1 * G + (0.13 * 2400.0 * G + 1500.0) * 2.5
    U = (F / 4 + w0 * 9.0 / 2) / 1e5
    chk = c[Demands].checks["connection"]
    assert chk.U[0] == pytest.approx(U, rel=1e-3)
    assert lv.members[int(chk.member[0])].id == "B2.1/B-C"
    # no capacity given: the web's plastic shear resistance (stated default, see
    # composite.CONNECTION_DEFAULT_FRACTION), so the check repeats the shear check
    c0 = _chain(roof, roof.lift_zones[0].loads[0], [11.25], [13.5])
    d0 = c0[Demands].checks
    assert d0["connection"].U[0] == pytest.approx(d0["shear"].U[0], rel=1e-9)
