"""Calculation trace of one drop point: every step of :func:`droprig.solver.analysis.analyse`
at that point, with its symbol, formula, inputs (SI) and source.

Step titles hold names only (members, checks, span types), never a number: every
value a step depends on is one of its ``inputs`` (value SI, quantity), so the
edges write it in the user's units.

The numbers are the step results of the very same chain as the analysis
(:func:`droprig.solver.evaluate.evaluate_chain` on a one-point array,
:mod:`droprig.solver.chain`), the load path by its plain formulas
(:func:`droprig.solver.reference.path_reference`, which the fast kernel is tested
against), so the trace and the results agree to machine precision.
"""

from __future__ import annotations

import math

import numpy as np

from droprig.model import STRIKE_ORIENTATIONS, LiftLoad, Project
from droprig.solver import amplification, droppoints, limits, local_damage, pads, struck_mass
from droprig.solver.chain import (
    BRITTLE,
    CONTACT_CHECKS,
    BeyondYield,
    Chain,
    Checks,
    Compliance,
    Demands,
    DynamicAmplification,
    Impact,
    InverseAnswers,
    LoadInputs,
    LocalDamage,
    SlabResistance,
    StruckMass,
    crushing_parts,
    energy_fall,
    landing_tilt,
    outputs,
    residual_height,
    slab_rotation_limit,
)
from droprig.solver.crush_table import crush_groups, table_psi
from droprig.solver.drift import resolve_drift
from droprig.solver.evaluate import GoverningPoint, governing_point, point_case
from droprig.solver.floor import FloorModel
from droprig.solver.footprint import EDGE_CONTACT_WIDTH, tilted_contact_bound
from droprig.solver.geometry import Geometry
from droprig.solver.impact import G, crush_duration
from droprig.solver.loadpath import COND_NAMES
from droprig.solver.results import CHECKS, DECK, LIMIT_MARGIN, RESPONSES, Trace, TraceStep

__all__ = ["trace_point"]

_SRC_PATH = ("lever rule over the one-way deck strip (common practice, no source); "
             "statics of the member tree")
_SRC_GREEN = "AISC Manual 15th ed. Table 3-23; Roark 7th ed. Table 8.1; Maxwell–Betti"
_SRC_RAYLEIGH = "Rayleigh, static deflected shape (Timoshenko, Strength of Materials Part I)"
_SRC_GERE = "Gere, Mechanics of Materials 7th ed., §9.10, Eq. 9-94"
_SRC_ETA = "Timoshenko, Strength of Materials Part I (impact with the beam's mass)"
_SRC_CHECK = {
    "flexure": "AISC 360-16 F2.1 / EN 1993-1-1 Eq. 6.13 (droprig.solver.capacity)",
    "shear": "AISC 360-16 G2.1 / EN 1993-1-1 Eq. 6.18 (droprig.solver.capacity)",
    "web_yielding": "AISC 360-16 J10.2 / EN 1993-1-5 §6 (droprig.solver.capacity)",
    "web_crippling": "AISC 360-16 J10.3 (droprig.solver.capacity)",
    "deck_flexure": "ACI 318-19 §22.2 / EN 1992-1-1 §3.1.7 (droprig.solver.deck); strip "
                    "continuous over the beams, crossing strips share with the cross strip "
                    "to the girders (Rankine–Grashof; droprig.solver.chain.two_way_share)",
    "deck_punching": "ACI 318-19 §22.6 / EN 1992-1-1 §6.4.4, §6.4.2(3) at openings, "
                     "EN 1994-1-1 §9.7.6 over ribs; u = β = a_v/2d within 2d of a support "
                     "(EN 1992-1-1 §6.2.2(6)), 0 where the footprint bears on the steel "
                     "(droprig.solver.chain.punching_near_support)",
    "connection": "end shear against the connection capacity (Member.connection_capacity; "
                  "not entered: the web's plastic shear resistance, to be confirmed by "
                  "the engineer, droprig.solver.composite)",
}
_SRC_SERIES = ("springs in series, 1/k_eff = Σ 1/k_i (Gere, Mechanics of Materials 7th ed., "
               "§9.10 energy method)")
_SRC_HINGE = ("AISC 360-16 Appendix 1 §1.3.2b / EN 1993-1-1 §5.6 Class 1 "
              "(droprig.solver.capacity.plastic_hinge_capable)")
_SRC_PLASTIC = "Biggs, Introduction to Structural Dynamics (1964); UFC 3-340-02 ch. 3"


_SRC_TIP = ("energy bound W·(H − Δ), Δ = min over θ of θ·L/2 + P(θ)/W, inertia-free "
            "(derived from the energy balance; the plateau's least crush work: Gibson & "
            "Ashby, Cellular Solids 2nd ed. ch. 5, from memory; droprig.solver.pads."
            "tip_offset)")
_SRC_WORSE = "the worse of the two cases governs (common practice, no source)"


def _tip_off_steps(sheet: _Sheet, gp: GoverningPoint) -> None:
    """Where the load's footprint lies partly on a crushable pad: the two cases and
    the one that governs (:func:`droprig.solver.evaluate.governing_point`), and the
    tip-off's Δ with the turn and length it is found at — the same Δ the floor
    analysis uses (``LoadInputs.fall_offset`` of the tip-off run)."""
    if not gp.cases:
        return
    on, tip = gp.cases["on_pad"], gp.cases["tip_off"]
    U_on, U_tip = float(on["utilisation"][0]), float(tip["utilisation"][0])
    if gp.on_pad:
        sheet.add("Load partly on a crushable pad: checked landing on the pad and tipping "
                  "over its edge onto the bare deck; "
                  + ("the tip-off governs" if gp.tip_governs else "landing on the pad governs"),
                  "U", "the worse response, then the larger U",
                  {"U_pad": (U_on, "dimensionless"), "U_tip": (U_tip, "dimensionless")},
                  U_tip if gp.tip_governs else U_on, "dimensionless", _SRC_WORSE)
    else:
        sheet.add("Drop point beside a crushable pad: part of the footprint meets the pad "
                  "first and the load tips over its edge onto the bare deck (the point's "
                  "case; continuous with the bare deck as the footprint leaves the pad)",
                  "U", "U of the tip-off", {"U_tip": (U_tip, "dimensionless")}, U_tip,
                  "dimensionless", _SRC_WORSE)
    tt = gp.tip
    if tt is None:  # pragma: no cover - tip_off_case_rows found the case, so its turn exists
        return
    W = sheet.load.weight
    sheet.add(f"Height the tip-off takes off the fall: least over the turn θ of the load "
              f"about the pad's edge (tipping {tt.direction}, the load's length "
              f"{'along x' if tt.along_x else 'along y'})", "Δ",
              "Δ = min over θ of θ·L/2 + P(θ)/W (P: the pad's least crush work)",
              {"t": (tt.t, "length"), "L": (tt.length, "length"),
               "θ": (tt.theta, "angle"), "W": (W, "force")},
              tt.delta, "length", _SRC_TIP)


def _kept_height_steps(sheet: _Sheet, gp: GoverningPoint) -> None:
    """At a pad's edge, the allowable heights the floor analysis keeps for the point
    (:func:`droprig.solver.chain.merge_tip_off`): the lower of the two cases, none on
    the pad below the pad's top; where the drop height is at most the tip-off's Δ the
    ordinary case governs the point as planned and the heights are still the lower of
    the two (:func:`_unreached_height_steps`)."""
    if not gp.cases:
        _unreached_height_steps(sheet, gp)
        return
    on, tip, m = gp.cases["on_pad"], gp.cases["tip_off"], gp.merged
    for key, sym, what in (("allowable_drop_height", "h_allow", "elastic"),
                           ("allowable_drop_height_plastic", "h_allow,pl", "beyond yield")):
        ins = {"h_tip": (float(tip[key][0]), "length")}
        if gp.on_pad:
            ins["h_pad"] = (float(on[key][0]), "length")
        if gp.tip is not None:
            ins["Δ"] = (gp.tip.delta, "length")
        sheet.add(f"Allowable drop height on the datum kept for the point ({what}): the "
                  "lower of the two cases; on the pad none below the pad's top (NaN)"
                  if gp.on_pad else
                  f"Allowable drop height on the datum kept for the point ({what}): the "
                  "tip-off's", sym,
                  "h_tip = the tip-off's allowable fall + Δ; "
                  + ("h = min(h_pad, h_tip), none if below the pad's top" if gp.on_pad
                     else "h = h_tip"), ins, float(m[key][0]), "length", _SRC_WORSE)


def _unreached_height_steps(sheet: _Sheet, gp: GoverningPoint) -> None:
    """:func:`_kept_height_steps` where the planned drop does not reach the deck by
    tipping over the pad's edge (the drop height at most Δ): the point's response is
    the ordinary case's, and the allowable heights the floor analysis keeps are the
    lower of that case's and the tip-off's (:func:`droprig.solver.chain.
    merge_tip_off`), since a drop from above Δ would tip off onto the deck."""
    if not gp.unreached:
        return
    on, tip, m = gp.unreached["on_pad"], gp.unreached["tip_off"], gp.merged
    for key, sym, what in (("allowable_drop_height", "h_allow", "elastic"),
                           ("allowable_drop_height_plastic", "h_allow,pl", "beyond yield")):
        sheet.add(f"Allowable drop height on the datum kept for the point ({what}): the "
                  "lower of landing as planned and tipping over the pad's edge (the "
                  "planned drop is within the tip-off's Δ; a drop from higher would tip "
                  "off onto the deck)", sym, "h = min(h_case, h_tip)",
                  {"h_case": (float(on[key][0]), "length"),
                   "h_tip": (float(tip[key][0]), "length")},
                  float(m[key][0]), "length", _SRC_WORSE)


def _v(x: object) -> float:
    return float(np.asarray(x).reshape(-1)[0])


def _detail(a: np.ndarray | None) -> np.ndarray:
    """A value the chain keeps for the trace (run with ``detail``)."""
    assert a is not None, "the chain was run without detail"
    return a


def trace_point(project: Project, zone_id: str, load_name: str, x: float,
                y: float) -> Trace:
    """Every step of the analysis of ``load_name`` of zone ``zone_id`` at plan point
    (x, y) in m. Raises :class:`ModelError` for an unknown zone or load, or a point
    that is not over a deck panel of the zone's level."""
    project = resolve_drift(project)
    case = point_case(project, zone_id, load_name, x, y, reference=True,
                      fields=("trace.zone", "trace.load", "trace.point"))
    zone, load, fm, geo = case.zone, case.load, case.fm, case.geo
    xa, ya = geo.x, geo.y
    # both landings (droprig.solver.chain.LANDINGS) and, at a pad's edge, both cases
    # (landing on the pad, tipping over its edge); the trace follows the one that
    # governs the point's response, as the floor analysis merges them
    gp = governing_point(fm, project, load, geo, zone.hoist_speed)
    landing, chain = gp.landing, gp.chain
    sheet = _Sheet(project, fm, geo, load, chain)
    add = sheet.add
    inp = chain[LoadInputs]
    _tip_off_steps(sheet, gp)
    if project.settings.tilted_landing:
        add("Landing that governs: " + ("tilted, on the shorter edge of the footprint"
                                        if landing == "tilted" else "flat, on the footprint")
            + " (the tilted landing checked for any tilt up to the design tilt θ_d)",
            "A_c", "A_c = contact on the deck (footprint, or edge strip of width w_e)",
            {"w_e": (EDGE_CONTACT_WIDTH, "length"),
             "θ_d": (project.settings.design_tilt, "angle")},
            inp.foot_l[0] * inp.foot_w[0], "area",
            "both landings checked, the worse governs (common practice, no source)")
    in_zone = bool(droppoints.in_zone(zone, xa, ya)[0])
    if not in_zone:
        add("Point outside the lift zone (traced anyway)", "d_zone",
            "distance from the zone beyond its drift margin",
            {"margin": (zone.drift_margin, "length")},
            _v(droppoints.zone_distance(zone, xa, ya)), "length", "plan geometry")
    if geo.opening[0]:
        add("Deck opening: the load falls through", "U", "U = ∞ (no deck to strike)", {},
            math.inf, "dimensionless", "plan geometry")
        return Trace(zone.id, load.name, float(x), float(y), tuple(sheet.steps), "exceeds",
                     "deck", "opening", "opening")
    _path_steps(sheet)
    _impact_steps(sheet)
    _amplification_steps(sheet)
    _check_steps(sheet)
    _local_damage_steps(sheet)
    _kept_height_steps(sheet, gp)
    by = sheet.by
    gm = int(by.gov_member[0])
    return Trace(zone.id, load.name, float(x), float(y), tuple(sheet.steps),
                 RESPONSES[int(sheet.out["response"][0])], sheet.mname(gm),
                 CHECKS[int(by.gov_check[0])],
                 CHECKS[int(sheet.out["utilisation_check"][0])],
                 "" if not gp.cases else "tip_off" if gp.tip_governs else "on_pad")


class _Sheet:
    """The steps of one trace as they are written, and what they are written from."""

    def __init__(self, project: Project, fm: FloorModel, geo: Geometry, load: LiftLoad,
                 chain: Chain) -> None:
        self.project, self.load, self.geo = project, load, geo
        self.fr, self.members, self.path = fm.frame, fm.level.members, geo.path
        self.inp, self.comp = chain[LoadInputs], chain[Compliance]
        self.sm, self.imp = chain[StruckMass], chain[Impact]
        self.dem, self.ck = chain[Demands], chain[Checks]
        self.by, self.inv = chain[BeyondYield], chain[InverseAnswers]
        self.out = outputs(chain)
        self.chain, self.level = chain, fm.level
        self.steps: list[TraceStep] = []

    def add(self, title: str, symbol: str, formula: str,
            inputs: dict[str, tuple[float, str]], value: float, quantity: str,
            source: str) -> None:
        self.steps.append(TraceStep(title, symbol, formula,
                                    {k: (float(v), q) for k, (v, q) in inputs.items()},
                                    float(value), quantity, source))

    def mname(self, i: int) -> str:
        return "deck" if i == DECK else self.members[int(i)].id


def _path_steps(sheet: _Sheet) -> None:
    """Load path, compliance and struck mass."""
    add, inp, comp, sm = sheet.add, sheet.inp, sheet.comp, sheet.sm
    load, fr, members, path = sheet.load, sheet.fr, sheet.members, sheet.path
    # ---- load path
    for k in range(2):
        m = int(path.members[0, k])
        add(f"Share of the unit load carried by {members[m].id}", f"w_{k + 1}",
            "w_1 = 1 − t, w_2 = t, t = s / S",
            {"s": (path.strip_pos[0], "length"), "S": (path.strip_span[0], "length")},
            path.share[0, k], "dimensionless", _SRC_PATH)
        add(f"Position of the load along {members[m].id} ({COND_NAMES[fr.cond[m]]} span)",
            f"a_{k + 1}",
            "a = distance from the member's start", {"L": (fr.L[m], "length")},
            path.a[0, k], "length", _SRC_PATH)
    g_own = path.g_own[0]
    add("Compliance of the framing at p", "f_s",
        "f_s = Σ_k w_k² g_k(a_k, a_k) + rᵀ D r + Σ_c R_c²·L_c/(E·A_c) (internal work of "
        "the unit-load system; the columns as axial springs)",
        {"w1·g1": (g_own[0], "compliance"), "w2·g2": (g_own[1], "compliance"),
         "rᵀDr": (float(path.r[0] @ path.u[0]), "compliance"),
         "f_col": (comp.f_col[0], "compliance")},
        comp.f_s[0], "compliance", _SRC_GREEN + "; Gere §2.3 (droprig.solver.columns)")
    if bool(comp.bridged[0]):
        # the rigid base covers both beams of its strip and rests on them
        add("Deck compliance: indentation under the footprint only (the rigid base "
            "covers both beams of its deck strip and rests on them: the strip does not "
            "bend under it)", "f_deck", "f_deck = 1/(2a·E/(1 − ν²))",
            {"s": (path.strip_pos[0], "length"), "S": (path.strip_span[0], "length")},
            comp.f_deck[0], "compliance",
            "Sneddon 1965 / Johnson, Contact Mechanics §3.8; statics of a rigid base on "
            "two supports (droprig.solver.footprint)")
    else:
        add("Deck compliance: indentation under the footprint + the strip between the "
            "beams, continuous over them, under the base as a rigid body bearing at "
            "its ends or on a beam it reaches (a flat landing)", "f_deck",
            "f_deck = 1/(2a·E/(1 − ν²)) + g/(E·I), g = t₁²G(x₁,x₁) + 2t₁t₂G(x₁,x₂) + "
            "t₂²G(x₂,x₂), x₁,₂ = s ∓ c/2 within the strip, t₁ = (x₂ − s)/(x₂ − x₁), "
            "G the strip restrained by K = 2√3·EI/S where the deck goes on beyond a "
            "support (the point load G(s, s) for a tilted landing)",
            {"s": (path.strip_pos[0], "length"), "S": (path.strip_span[0], "length"),
             "f_strip": (comp.f_deck[0] - comp.f_deck_local[0], "compliance")},
            comp.f_deck[0], "compliance",
            "Sneddon 1965 / Johnson, Contact Mechanics §3.8; AISC Manual Table 3-23 case "
            "8 with the end moments of the restrained span; rigid base on two supports, "
            "Maxwell–Betti (droprig.solver.slab.rigid_base_strip_compliance)")
    k_load = load.contact_stiffness
    add("Compliance of the load's underside (skid, base frame, dunnage)"
        + ("" if k_load is not None
           else ": none given, load taken as rigid (highest contact force)"),
        "1/k_load", "1/k_load (0 for a rigid load)",
        {"k_load": (k_load, "stiffness")} if k_load is not None else {},
        inp.f_load[0], "compliance", _SRC_SERIES)
    _spent_layer_step(sheet)
    _tilted_mat_step(sheet)
    add("Compliance of the struck point", "f",
        "f = f_s + f_deck + 1/k_load + f_layer + 1/k_mat",
        {"f_s": (comp.f_s[0], "compliance"), "f_deck": (comp.f_deck[0], "compliance"),
         "1/k_load": (inp.f_load[0], "compliance"),
         "f_layer": (inp.f_layer[0], "compliance"),
         "1/k_mat": (inp.f_mat[0], "compliance")},
        comp.f[0], "compliance", _SRC_SERIES + "; Engineering ToolBox, Impact Force")
    steel = ("m_e = ((f_s − f_col)/(f_s + f_deck + 1/k_load))²·Σ_m ∫ μ_m (w_m(x)/w_s(p))² "
             "dx")
    if _two(sheet):
        # the struck mass the analysis prints (outputs "effective_mass") is the two-mass
        # model's m₂; the steel's alone gives the one-mass balance's η (its lower bound)
        assert sm.m2 is not None
        add("Struck mass of the steel alone (the one-mass balance's share η, a lower "
            "bound of the framing force)", "m_s", steel, {}, sm.m_e[0], "mass",
            _SRC_RAYLEIGH)
        add("Effective struck mass: the floor with the slab and superimposed dead load "
            "(two-mass model; over a column with the floor the column's shortening "
            "moves)", "m_e",
            "m_e = m₂ = ((f_s − f_col)/f_s)²·Σ∫(μ_steel + (ρh + q_sd/g)·b)·(w/w_ref)² dx "
            "+ (f_col/f_s)²·m_col",
            {"m_s": (sm.m_e[0], "mass")}, sm.m2[0], "mass",
            _SRC_RAYLEIGH + "; Biggs 1964 ch. 5 (from memory)")
    else:
        add("Effective struck mass", "m_e", steel, {}, sm.m_e[0], "mass", _SRC_RAYLEIGH)


def _spent_layer_step(sheet: _Sheet) -> None:
    """The spent crushable layer's compliance in series (chain._spent_layer), where
    the point is on a crushable layer."""
    inp = sheet.inp
    if not bool(inp.crushable[0]):
        return
    t_r = max(float(inp.t_mat[0] - inp.s_c[0]), 0.0)
    sheet.add("Compliance of the crushable layer once its stroke is spent (its residual "
              "thickness under the contact, spread 1:1)", "f_layer",
              "f_layer = ∫₀^t_r dz/(E·(a + 2z)(b + 2z))",
              {"t_r": (t_r, "length"), "E": (pads.SPENT_LAYER_MODULUS, "stress")},
              inp.f_layer[0], "compliance",
              "Gere, Mechanics of Materials 7th ed., §2.3; EN 338:2016 Table 1 E_90,mean "
              "of C24 (from memory; droprig.solver.pads)")


def _tilted_mat_step(sheet: _Sheet) -> None:
    """A project's spring mat under a tilted landing: the whole base's stiffness
    (chain._tilted_mat_credit), or none where the base is not wholly on the mat."""
    d, inp = sheet.chain.drop, sheet.inp
    i = int(np.asarray(sheet.geo.protection)[0])
    if d.landing != "tilted" or d.mat_k is not None or i < 0:
        return
    pa = sheet.project.protection_areas[i]
    if pa.kind != "spring":
        return
    k = 1.0 / float(inp.f_mat[0]) if float(inp.f_mat[0]) > 0.0 else 0.0
    ins = {"a": (float(inp.fl[0]), "length"), "b": (float(inp.fw[0]), "length"),
           "t": (pa.thickness, "length")}
    if pa.modulus is not None:
        ins["E"] = (pa.modulus, "stress")
    sheet.add("Spring mat under the tilted landing: the whole base's stiffness, spread "
              "1:1 through the mat (the band under the sinking edge widens to the whole "
              "base, whose stiffness bounds its slope); none where the base is not "
              "wholly on the mat (it turns down onto the bare deck beside it)", "k_mat",
              "k_mat = 1/∫₀ᵗ dz/(E·(a + 2z)(b + 2z)) (0 off the mat)", ins, k, "stiffness",
              "Gere, Mechanics of Materials 7th ed., §2.3; EN 1994-1-1 §9.4.3(2) spread "
              "(from memory); droprig.solver.pads.tilted_mat_stiffness")


def _two(sheet: _Sheet) -> bool:
    """Whether the point has two forces (contact and framing, the two-mass model)."""
    two = sheet.imp.two_mass
    return two is not None and bool(two[0])


def _fall_step(sheet: _Sheet) -> None:
    """The free fall onto the struck surface: H less the pad or mat, or in the tip-off
    case H − Δ onto the bare deck (``LoadInputs.fall_offset``)."""
    add, inp = sheet.add, sheet.inp
    if inp.fall_offset is not None:
        add("Fall onto the bare deck beside the pad's edge: the energy the tip-off can "
            "bring onto the deck, as a fall", "h", "h = H − Δ",
            {"H": (inp.H[0], "length"), "Δ": (inp.fall_offset[0], "length")}, inp.h[0],
            "length", _SRC_TIP)
    else:
        add("Free fall onto the struck surface (drop height above the finished surface "
            "less the pad or mat thickness)", "h", "h = H − t_mat",
            {"H": (inp.H[0], "length"), "t_mat": (inp.t_mat[0], "length")}, inp.h[0],
            "length", "load data (droprig.solver.chain.planned_height)")


def _impact_steps(sheet: _Sheet) -> None:
    """Energy balance of the impact: η, h, K, F, deflections."""
    add, inp, comp, sm = sheet.add, sheet.inp, sheet.comp, sheet.sm
    imp, load = sheet.imp, sheet.load
    M = load.mass
    add("Share of kinetic energy left after contact", "η", "η = M / (M + m_e)",
        {"M": (M, "mass"), "m_e": (sm.m_e[0], "mass")}, sm.eta[0],
        "dimensionless", _SRC_ETA)
    _fall_step(sheet)
    W = load.weight
    v_h = sheet.chain.drop.v_hoist
    h_e = float(energy_fall(sheet.chain, inp.h[:1])[0])
    if v_h > 0.0:
        add("Energy height: the fall plus the head of the hoist's lowering speed (the "
            "load strikes at V = √(v_h² + 2gh))", "h_e", "h_e = h + v_h²/(2g)",
            {"h": (inp.h[0], "length"), "v_h": (v_h, "speed")}, h_e, "length",
            "uniform acceleration (any dynamics text); kinetic energy ½·M·V²")
    add("Static deflection", "δ_st", "δ_st = W·f",
        {"W": (W, "force"), "f": (comp.f[0], "compliance")}, imp.d_st[0],
        "length", _SRC_GERE)
    hk = "h_e" if v_h > 0.0 else "h"
    two = _two(sheet)
    # a crushable layer that bottoms out: the rest by the two-mass stage
    after = (imp.searched is not None and bool(imp.searched[0]) and not two
             and bool(imp.bottomed[0]))
    # ... that crushes and does not bottom out: the framing's response to the crush
    crushing = (imp.searched is not None and bool(imp.searched[0]) and not two
                and not after and float(imp.crush[0]) > 0.0)
    if crushing:
        _crushing_steps(sheet, W, h_e)
    if after or crushing:
        add("Dynamic factor of the force on the framing", "K", "K = F / W",
            {"F": (imp.F[0], "force"), "W": (W, "force")}, imp.K[0], "dimensionless",
            _SRC_TWO_MASS)
    elif two:
        # the framing force comes from the two-mass model: K is that force over W
        _two_force_steps(sheet, W, h_e)
        add("Dynamic factor of the force on the framing", "K", "K = F_f / W",
            {"F_f": (imp.F[0], "force"), "W": (W, "force")}, imp.K[0], "dimensionless",
            _SRC_TWO_MASS)
    else:
        add("Dynamic factor", "K",
            f"K = 1 + √(1 + 2η{hk}/δ_st)" if inp.f_mat[0] >= 0 else "",
            {"η": (sm.eta[0], "dimensionless"), hk: (h_e, "length"),
             "δ_st": (imp.d_st[0], "length")}, imp.K[0],
            "dimensionless", _SRC_GERE)
    if after:
        # the energy the layer leaves and the force of the rest of the fall
        F_c, s_c = float(inp.F_c[0]), float(inp.s_c[0])
        add("Energy height left when the pad bottoms out (its crush work taken off, "
            "the fall under its force added)", "h_r",
            f"h_r = {hk} − (F_c/W − 1)·s_c + 2·F_c·f",
            {hk: (h_e, "length"), "F_c": (F_c, "force"), "W": (W, "force"),
             "s_c": (s_c, "length"), "f": (comp.f[0], "compliance")},
            float(residual_height(np.array([W]), np.array([h_e]), np.array([F_c]),
                                  np.array([s_c]), comp.f[:1])[0]),
            "length", "energy balance (common practice, no source); Biggs 1964 ch. 2 "
            "(dynamic load factor 2, from memory)")
    add("Peak impact force" + (" on the framing" if two or after or crushing else ""),
        "F", "F = K·W" if imp.crush[0] == 0 else
        ("F = min(two-mass envelope at h_r (≤ 2·max(F_crush, F_1)) + 2·F_c, energy "
         "bound of h − (F_c/W − 1)·s_c), at least min(2·F_c, energy bound of h) "
         "(droprig.solver.chain.after_bottoming)" if after else
         "F = φ_crush·F_chain (droprig.solver.chain.framing_while_crushing)"
         if crushing else
         "F = crush force, or elastic after bottoming "
         "(droprig.solver.impact.impact_crushable)"),
        {"K": (imp.K[0], "dimensionless"), "W": (W, "force")},
        imp.F[0], "force", _SRC_CRUSH if crushing else
        _SRC_TWO_MASS if two or after else _SRC_GERE)
    _crushing_step(sheet)
    _deflection_steps(sheet, W, two)


def _crushing_step(sheet: _Sheet) -> None:
    """The deck's crushing force under the footprint, the bound on the contact."""
    inp, imp = sheet.inp, sheet.imp
    sheet.add("Crushing force of the deck concrete under the footprint (bound on the "
              "contact force)", "F_crush",
              "F_crush = DIF·f_cm·√(A_c1/A_c0)·A_c0 ≤ 3·DIF·f_cm·A_c0",
              {"A_c0": (inp.foot_l[0] * inp.foot_w[0], "area"),
               "crushed depth": (imp.deck_crush[0], "length")},
              imp.F_crush[0], "force",
              "EN 1992-1-1 §6.7 / ACI 318-19 §22.8.3.2, upper estimate "
              "(droprig.solver.crushing)")


def _deflection_steps(sheet: _Sheet, W: float, two: bool) -> None:
    """The struck point's peak deflection (and against span/N, for information) and
    the load's deceleration."""
    add, imp, out, project = sheet.add, sheet.imp, sheet.out, sheet.project
    fr, members, path = sheet.fr, sheet.members, sheet.path
    add("Peak deflection of the struck point", "δ_max", "δ_max = K·δ_st",
        {"K": (imp.K[0], "dimensionless"),
         "δ_st": (imp.d_st[0], "length")}, imp.d_max[0], "length",
        _SRC_GERE)
    m1 = int(path.members[0, 0]) if path.share[0, 0] >= path.share[0, 1] else \
        int(path.members[0, 1])
    limit = fr.L[m1] / project.settings.deflection_limit_ratio
    add(f"Deflection against the limit span/N of {members[m1].id} "
        "(information only, not a pass criterion)", "δ_max/δ_lim",
        "δ_max / (L/N)", {"δ_max": (imp.d_max[0], "length"),
                          "L/N": (limit, "length"),
                          "N": (project.settings.deflection_limit_ratio, "dimensionless")},
        imp.d_max[0] / limit, "dimensionless",
        "IBC Table 1604.3 (serviceability; information for an accidental impact)")
    add("Deceleration of the load", "a/g",
        "a/g = F_c/W − 1 (the contact force decelerates the load)" if two
        else "a/g = F/W − 1",
        {("F_c" if two else "F"): (imp.contact[0], "force"), "W": (W, "force")},
        out["deceleration_g"][0], "dimensionless", "Newton's second law")


_SRC_CRUSH = ("Biggs 1964 ch. 2, rectangular pulse (from memory); Clough & Penzien ch. 2 "
              "(free vibration); droprig.solver.impact.framing_under_crush")
_SRC_CRUSH_TABLE = ("exact piecewise-linear two-mass history, Biggs 1964 ch. 2 and 5, "
                    "Clough & Penzien ch. 2-4 and 9-12 (from memory; "
                    "droprig.solver.crushhistory), tabulated by "
                    "droprig.solver.crush_table (scripts/build_crush_table.py)")


def _crushing_steps(sheet: _Sheet, W: float, h_e: float) -> None:
    """The crush's duration against the floor's period (a crushable layer that
    crushes and does not bottom out; :func:`droprig.solver.impact.crush_duration`)."""
    c, add = sheet.chain, sheet.add
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    assert sm.m2 is not None
    M, F_c = W / G, float(inp.F_c[0])
    m2, k2 = float(sm.m2[0]), 1.0 / float(comp.f_s[0])
    v0 = math.sqrt(2.0 * G * max(h_e, 0.0))
    T = 2.0 * math.pi * math.sqrt(m2 / k2)
    add("Duration of the crush (until the load's speed is down to the floor's) over "
        "the floor's period T = 2π·√(m2/k2); at most ½", "t_c/T",
        "v0 − (F_c − W)/M·t_c = F_c/(m2·ω)·sin(ω·t_c), ω = 2π/T",
        {"v0": (v0, "speed"), "F_c": (F_c, "force"), "W": (W, "force"),
         "m2": (m2, "mass"), "k2": (k2, "stiffness")},
        float(crush_duration(M, v0, F_c, m2, k2)) / T, "dimensionless", _SRC_CRUSH)
    f_series = float(comp.f_series[0])
    F_chain, phi = crushing_parts(np.array([W]), np.array([h_e]), np.array([F_c]),
                                  comp.f_series[:1], comp.f_s[:1], sm.m2[:1])
    add("Force on the framing by the pulse model (the layer's force for the crush, "
        "then the load riding on the floor; at least F_c, at most the energy bound)",
        "F_chain", "F_chain = max(F_c, min(F_pulse(t_c, T), W(1 + √(1 + 2h_e/(W·f₂) "
        "+ f_c/f₂))))",
        {"F_c": (F_c, "force"), "W": (W, "force"), "h_e": (h_e, "length"),
         "f₂": (float(comp.f_s[0]), "compliance"), "f_c": (f_series, "compliance")},
        float(F_chain[0]), "force", _SRC_CRUSH)
    mu, kappa, rho, theta = crush_groups(M, v0, F_c, 1.0 / f_series, m2, k2)
    psi, _ = table_psi(mu, kappa, rho, theta)
    _, B_f = struck_mass.energy_bounds(W, h_e, f_series, float(comp.f_s[0]))
    add("Correction for the exact history of the load bouncing and re-crushing on "
        "its contact: the table of the exact two-mass history's framing peak over F_c "
        "at the groups (θ = M·v0·√(k2/m2)/F_c), never below 1", "φ_crush",
        "φ_crush = max(1, min(F_c·ψ, B_f)/F_chain), ψ = table(m2/M, k_c/k2, F_c/W, θ)",
        {"F_c": (F_c, "force"), "ψ": (float(psi), "dimensionless"),
         "m2/M": (float(mu), "dimensionless"), "k_c/k2": (float(kappa), "dimensionless"),
         "F_c/W": (float(rho), "dimensionless"), "θ": (float(theta), "dimensionless"),
         "B_f": (float(B_f), "force"), "F_chain": (float(F_chain[0]), "force")},
        float(phi[0]), "dimensionless", _SRC_CRUSH_TABLE)


_SRC_TWO_MASS = ("CEB Bulletin 187 (1988) two-mass model (from memory); Clough & "
                 "Penzien, Dynamics of Structures, 2-DOF free vibration; envelope over "
                 "lower drops (droprig.solver.struck_mass.envelope_two_forces)")


def _two_force_steps(sheet: _Sheet, W: float, h_e: float) -> None:
    """The two forces of the two-mass impact: struck mass with the slab, contact
    force, force on the framing and the framing's energy share."""
    add, comp, sm, imp, inp = sheet.add, sheet.comp, sheet.sm, sheet.imp, sheet.inp
    assert sm.m2 is not None and imp.F_contact is not None and imp.eta_frame is not None
    M = float(inp.M[0])
    m2 = float(sm.m2[0])  # the struck mass m_e of the path steps
    if sheet.chain.drop.landing == "tilted":
        b_e = max(float(inp.fl[0]), float(inp.fw[0]))
        tilt = landing_tilt(sheet.chain.drop)
        add("Tilted landing: the least contact force, the energy bound of either edge's "
            f"strike for a tilt up to {math.degrees(tilt):g}° (the project's design tilt; "
            "the far edge falls b·tan θ further and may meet the floor on its rebound)",
            "F_edge",
            "F_edge = W/2 + √(W²/4 + 2W·H'/f_c), H' = h_e + b·tan θ/2 + W·f_c/8 + W·f₂/2",
            {"W": (W, "force"), "h_e": (h_e, "length"), "b": (b_e, "length"),
             "θ": (tilt, "angle"), "f_c": (comp.f_series[0], "compliance"),
             "f₂": (comp.f_s[0], "compliance")},
            float(tilted_contact_bound(W, h_e, comp.f_series[0], comp.f_s[0], b_e,
                                       tilt)[()]),
            "force", "energy method of impact, Gere 7th ed. §9.10 (from memory); "
            "droprig.solver.footprint.tilted_contact_bound")
    add("Contact force between load and struck surface (largest for any fall up to "
        "h_e; bounded by the crushing of the surface)", "F_c",
        "max over h' ≤ h_e of the two-mass peak k_c·max⟨x₁ − x₂⟩, "
        "M·x₁'' = M·g − k_c⟨x₁ − x₂⟩, m₂·x₂'' = k_c⟨x₁ − x₂⟩ − k₂·x₂"
        + (", and at least F_edge" if sheet.chain.drop.landing == "tilted" else ""),
        {"M": (M, "mass"), "m₂": (m2, "mass"), "k_c": (1.0 / comp.f_series[0], "stiffness"),
         "k₂": (1.0 / comp.f_s[0], "stiffness"), "h_e": (h_e, "length")},
        imp.F_contact[0], "force", _SRC_TWO_MASS)
    add("Force on the framing (two-mass peak k₂·max x₂, largest for any fall up to "
        "h_e; at least the one-mass balance with the floor's mass, at most the energy "
        "bound and twice the contact force the surface passes)", "F_f",
        f"F_f = min(max({struck_mass.ENVELOPE_MARGIN[0]:g}·k₂·max x₂, "
        "W(1 + √(1 + 2ηh_e/(W·f)))), "
        "W(1 + √(1 + 2h_e/(W·f₂) + f_c/f₂)), 2·max(F_crush, F_1)), η = M/(M + m₂)",
        {"W": (W, "force"), "f": (comp.f[0], "compliance"),
         "f₂": (comp.f_s[0], "compliance"), "f_c": (comp.f_series[0], "compliance"),
         "η": (M / (M + m2), "dimensionless"), "F_crush": (imp.F_crush[0], "force")},
        imp.F[0], "force", _SRC_TWO_MASS + "; " + _SRC_GERE)
    add("Share of the energy that gives the framing force by the one-mass balance "
        "(used beyond yield and by the allowable heights)", "η_f",
        "η_f = ((F_f/W − 1)² − 1)·W·f/(2h_e)",
        {"F_f": (imp.F[0], "force"), "W": (W, "force"), "f": (comp.f[0], "compliance"),
         "h_e": (h_e, "length")}, imp.eta_frame[0], "dimensionless",
        _SRC_GERE + " solved for η")
    if imp.F_deck is not None:
        add("Force the deck's checks take (the contact force under a declared "
            "underside; a hard load's contact spike is the local-damage checks', the "
            "deck takes the one-mass force)", "F_deck", "F_deck = F_c (soft) or F_1",
            {}, imp.F_deck[0], "force", "CEB Bulletin 187 soft/hard impact (from memory)")


def _amplification_steps(sheet: _Sheet) -> None:
    """The dynamic amplification factors (project setting; nothing when off)."""
    if not sheet.project.settings.dynamic_amplification:
        return
    add, comp, imp = sheet.add, sheet.comp, sheet.imp
    amp = sheet.chain[DynamicAmplification]
    src_amp = ("time-history calibration, droprig.solver.amplification (Euler–Bernoulli "
               "modes, Blevins 1979 Table 8-1; Newmark, Chopra §5.4)")
    add("Load mass over the path's struck mass", "r", "r = M / m_e,path",
        {"M": (sheet.load.mass, "mass")}, amp.mass_ratio[0], "dimensionless", src_amp)
    add("Contact over framing compliance", "κ", "κ = (f − f_s) / f_s",
        {"f": (comp.f[0], "compliance"), "f_s": (comp.f_s[0], "compliance")},
        amp.compliance_ratio[0], "dimensionless", src_amp)
    by = {k: amplification.SET_BY[int(v[0])] for k, v in amp.set_by.items()}
    src_cap = (src_amp + "; member response per unit peak contact force B_M = "
               f"{amplification.B_MOMENT}, B_V = {amplification.B_SHEAR}, B_δ = "
               f"{amplification.B_DEFLECTION} (time history with an elastic–perfectly "
               "plastic contact, scripts/calibrate_contact_bound.py)")
    add(f"Amplification of the contact force (web and deck checks), set by the "
        f"{by['local']}", "A_F",
        "A_F = max(1, min(table(r, κ)·F_el, F_rigid, F_crush, F_imp)/F), "
        "F_rigid = 1.05·W(1 + √(1 + 2h/(W(f − f_s))))",
        {"F_bound": (amp.F_bound[0], "force"), "F": (imp.F[0], "force")},
        amp.factor["web_yielding"][0], "dimensionless",
        src_amp + "; Gere §9.10; crushing force as the impact step, held where the "
        "crushed depth cannot pass the cover with all the energy in it; where r ≤ 1 also "
        "the impulse bound's contact force (droprig.solver.amplification_impulse: the "
        "energy a spring of the contact and the member's residual flexibility can hold)")
    src_en = (src_cap + "; member energy bound B_E,M = "
              f"{amplification.B_ENERGY_MOMENT}, B_E,δ = "
              f"{amplification.B_ENERGY_DEFLECTION} (energy conservation, minimum "
              "potential energy; scripts/calibrate_energy_bound.py)")
    # light loads (r < chain.IMPULSE_MASS_RATIO, fading out from IMPULSE_FADE_MASS_RATIO):
    # the impulse bound of the point's own time history where it is less
    # (chain._with_impulse_bounds)
    src_imp = ("; where r < 1 also the impulse bound of the point's time history "
               "(fading into the other bounds by ln(2r)/ln 2 for 0.5 < r < 1, chain.impulse_fade) "
               "(droprig.solver.amplification_impulse: Duhamel's integral on the struck "
               "member's kept modes with the contact's impulse and peak force; Biggs 1964 "
               "ch. 2, Chopra §4.2)")
    src_cap, src_en = src_cap + src_imp, src_en + src_imp
    if amp.F_energy is not None:
        add("Member energy force: the most energy the drop can put into the framing, "
            "as a static force at the struck point", "F_E",
            "F_E = √(2W(h + s + c)/f_s), s = W·f(1 + √(1 + 2h/(W·f))), "
            "c = min(stroke, (W·h + W²f/2)/(F_crush − W))",
            {"f_s": (comp.f_s[0], "compliance"), "f": (comp.f[0], "compliance")},
            amp.F_energy[0], "force", src_en)
    add(f"Amplification of the member moment, set by the {by['moment']}", "A_M",
        "A_M = max(1, min(table(r, κ)·F_el, B_M·A_F·F, B_E,M·F_E, M_imp)/F)", {},
        amp.A_moment[0], "dimensionless", src_en)
    add(f"Amplification of the member shear, set by the {by['shear']}", "A_V",
        "A_V = max(1, min(table(r, κ)·F_el, B_V·A_F·F, V_imp)/F)", {},
        amp.A_shear[0], "dimensionless", src_cap)
    add("Amplification of the energy beyond yield", "A_δ²",
        "A_δ = max(1, min(table(r, κ)·F_el, B_δ·A_F·F, B_E,δ·F_E, δ_imp)/F)", {},
        amp.A_deflection[0] ** 2, "dimensionless", src_en)


def _check_steps(sheet: _Sheet) -> None:
    """Checks, verdict, beyond yield and the inverse answers."""
    _utilisation_steps(sheet)
    _elastic_height_steps(sheet)
    _plastic_steps(sheet)
    _mass_and_mat_steps(sheet)


def _utilisation_steps(sheet: _Sheet) -> None:
    """Each check family's U at the point, the largest, and the allowed force."""
    add, mname, imp, dem, ck = sheet.add, sheet.mname, sheet.imp, sheet.dem, sheet.ck
    amp = sheet.chain[DynamicAmplification]
    on = sheet.project.settings.dynamic_amplification
    # ---- checks
    qty = {"flexure": "moment", "shear": "force", "web_yielding": "force",
           "web_crippling": "force", "deck_flexure": "moment", "deck_punching": "force",
           "connection": "force"}
    for c in ("flexure", "shear", "connection", "web_yielding", "web_crippling",
              "deck_flexure", "deck_punching"):
        q = qty[c]
        unit_q = "length" if q == "moment" else "dimensionless"
        # the deck's checks take the deck's force where the impact gives two
        # (chain.on_contact): printed as such, so that the line's own numbers give
        # its U (it printed the framing force beside a U worked from F_deck)
        deck_force = c in CONTACT_CHECKS and imp.F_deck is not None
        f_sym, f_val = ("F_deck", imp.F_deck[0]) if deck_force and imp.F_deck is not None \
            else ("F", imp.F[0])
        add(f"{c.replace('_', ' ').capitalize()} — {mname(dem.checks[c].member[0])}", f"U_{c}",
            f"U = |A·{f_sym}·u + E| / R" if on else f"U = |{f_sym}·u + E| / R",
            {**({"A": (amp.factor.get(c, amp.A_shear)[0], "dimensionless")} if on
               else {}),
             f_sym: (f_val, "force"), "u": (_detail(dem.checks[c].unit)[0], unit_q),
             "E": (_detail(dem.checks[c].exist)[0], q), "R": (_detail(dem.checks[c].resist)[0], q)},
            dem.checks[c].U[0], "dimensionless", _SRC_CHECK[c])
    add(f"Utilisation ({CHECKS[int(sheet.out['utilisation_check'][0])].replace('_', ' ')})",
        "U", "U = max over the checks", {}, ck.U[0],
        "dimensionless", "largest demand/resistance ratio (common practice, no source)")
    add("Largest force the checks allow", "F_allow", "F_allow = min (R − E)/u",
        {}, ck.F_allow[0], "force", "linear checks")


def _elastic_height_steps(sheet: _Sheet) -> None:
    """The elastic allowable free fall (closed form, or the two-force search), with
    a crushing layer's or the deck concrete's work, and the height on the datum."""
    add, sm, imp, ck, inv = sheet.add, sheet.sm, sheet.imp, sheet.ck, sheet.inv
    W = sheet.load.weight
    two = _two(sheet)
    # the share of the energy the closed form takes: the framing's (two-mass model,
    # at the planned height) where two forces, as inverse_answers
    eta = float(imp.eta_frame[0]) if two and imp.eta_frame is not None else float(sm.eta[0])
    h_gere = float(limits.allowable_drop_height_elastic(W, ck.F_allow[0], imp.d_st[0], eta))
    if two:
        add("Start of the search for the allowable free fall: the closed form with the "
            "framing's share of the energy at the planned height", "h_0",
            "h = δ_st((K_a − 1)² − 1)/(2η_f), K_a = F_allow/W",
            {"F_allow": (ck.F_allow[0], "force"), "W": (W, "force"),
             "δ_st": (imp.d_st[0], "length"), "η_f": (eta, "dimensionless")},
            h_gere if math.isfinite(h_gere) else math.nan, "length",
            _SRC_GERE + " solved for h")
        add("Allowable free fall with two forces: the largest fall at which the forward "
            "two-mass impact (its envelope over lower falls, non-decreasing) keeps every "
            "check within its resistance, found by bisection", "h_allow",
            "max h: U(F_f(h), F_deck(h)) ≤ 1", {}, inv.h_el[0], "length",
            "bisection on the forward chain (droprig.solver.chain.two_force_height)")
    else:
        add("Allowable free fall (elastic)", "h_allow",
            "h = δ_st((K_a − 1)² − 1)/(2η), K_a = F_allow/W",
            {"F_allow": (ck.F_allow[0], "force"), "W": (W, "force"),
             "δ_st": (imp.d_st[0], "length"), "η": (eta, "dimensionless")},
            h_gere if math.isfinite(h_gere) else inv.h_el[0], "length",
            _SRC_GERE + " solved for h")
    if not two and math.isfinite(h_gere) and math.isfinite(inv.h_el[0]) and \
            abs(inv.h_el[0] - h_gere) > 1e-12 * max(1.0, abs(h_gere)):
        # the force passes a crushable layer's or the deck concrete's crushing force
        # before it reaches F_allow: the crushing work is added (chain.with_crush_energy)
        layer = bool(sheet.inp.crushable[0])
        Fc = float(sheet.inp.F_c[0]) if layer else float(imp.F_crush[0])
        sc = float(sheet.inp.s_c[0]) if layer else float(sheet.level.deck.cover)
        h_cr = h_gere + (Fc - W) * sc / (float(sm.eta[0]) * W)
        if layer and imp.searched is not None and bool(imp.searched[0]) and \
                abs(inv.h_el[0] - h_cr) > 1e-9 * max(1.0, abs(h_cr)):
            # the pad's points are searched on the forward impact through the pad
            # (the framing while it crushes, or after it bottoms out)
            add("Allowable free fall onto the pad: the largest fall at which the "
                "forward impact through the pad (the framing's response while it "
                "crushes, the two-mass stage after it bottoms out) keeps every check "
                "within its resistance, found by search", "h_allow",
                "max h: U(F_f(h), F_deck(h)) ≤ 1", {}, inv.h_el[0], "length",
                "search on the forward chain (droprig.solver.chain.two_force_height)")
            add("Allowable drop height above the finished surface (elastic)", "H_allow",
                "H_allow = h_allow + t_mat",
                {"h_allow": (inv.h_el[0], "length"),
                 "t_mat": (sheet.inp.t_mat[0], "length")},
                inv.h_el[0] + sheet.inp.t_mat[0], "length",
                "datum of droprig (finished surface)")
            return
        add("Allowable free fall with the crushing work "
            + ("of the pad" if layer else "of the deck concrete through its cover"),
            "h_cr", "h_cr = h_el + (F_c − W)·s/(η·W)",
            {"h_el": (h_gere, "length"), "F_c": (Fc, "force"), "W": (W, "force"),
             "s": (sc, "length"), "η": (sm.eta[0], "dimensionless")},
            inv.h_el[0], "length", "energy balance with a constant crushing force, "
            + _SRC_GERE)
    add("Allowable drop height above the finished surface (elastic)", "H_allow",
        "H_allow = h_allow + t_mat",
        {"h_allow": (inv.h_el[0], "length"), "t_mat": (sheet.inp.t_mat[0], "length")},
        inv.h_el[0] + sheet.inp.t_mat[0], "length", "datum of droprig (finished surface)")


def _plastic_steps(sheet: _Sheet) -> None:
    """Resistances beyond yield, the plastic response and the allowable height beyond
    yield."""
    add, mname, comp, imp, ck, by = (sheet.add, sheet.mname, sheet.comp, sheet.imp,
                                     sheet.ck, sheet.by)
    inv, project = sheet.inv, sheet.project
    sr = sheet.chain[SlabResistance]
    R_frame = sheet.chain[Demands].actions.R_p[0]
    add("Plastic collapse resistance of the framing", "R_frame",
        "R_frame = min over path members of the collapse load for a load at p",
        {}, R_frame, "force", "virtual work (Neal); droprig.solver.beam")
    if np.isfinite(sr.R_yl[0]):
        add("Yield-line resistance of the struck slab panel", "R_yl",
            "R_yl = min(fan 2π√(m_x·m_y)/(1 − 2r/3ℓ), Σ (m + m')·(projected length)/lever)",
            {"ℓ": (sr.ell[0], "length")}, sr.R_yl[0], "force",
            "Johansen; Park & Gamble, Reinforced Concrete Slabs 2nd ed. ch. 9–10 "
            "(from memory); EN 1992-1-1 §5.6.3(2) ductile section")
    add("Series resistance of slab and framing", "R_p", "R_p = min(R_frame, R_yl)",
        {"R_frame": (R_frame, "force")}, by.R_p[0], "force",
        "elements in series (UFC 3-340-02 ch. 3, from memory)")
    if by.no_hinge[0]:
        add("Flexure beyond the resistance of a section that cannot form a plastic hinge "
            f"({mname(by.gov_member[0])}): no plastic reserve, exceeds",
            "F/F_allow,nh", "F / F_allow of the members without hinge capacity",
            {"F": (imp.F[0], "force"), "F_allow,nh": (by.nh_fa[0], "force")},
            imp.F[0] / by.nh_fa[0], "dimensionless", _SRC_HINGE)
    if by.response[0] != 0 and ck.flex_exceeded[0]:
        add("Brittle checks at the plastic force", "U_brittle", "U at F = min(F, R_p)",
            {"R_p": (by.R_p[0], "force")}, ck.Ub_cap[0], "dimensionless",
            "no plastic reserve in " + ", ".join(BRITTLE)
            + " (DNV-RP-C204 accidental limit state, from memory)")
        add("Plastic deflection", "δ_m", "R_p(δ_m − δ_y/2) = ηWh + Wδ_m",
            {"R_p": (by.R_p[0], "force"), "δ_y": (by.R_p[0] * comp.f[0], "length"),
             "h": (by.h_struct[0], "length")}, by.d_m[0], "length", _SRC_PLASTIC)
        # below 1 the framing stays below its plastic resistance: what yields is the
        # deck's flexure or the slab's mechanism (a bare "μ = 0" read as a contradiction)
        elastic = " of the framing: below 1, it stays elastic; what yields is the deck or " \
            "the slab" if by.ductility[0] < 1.0 else ""
        add("Ductility" + elastic, "μ", "μ = δ_m / δ_y",
            {"μ_lim": (project.settings.ductility_limit, "dimensionless")},
            by.ductility[0], "dimensionless", _SRC_PLASTIC)
        if sr.slab_first[0]:
            add("Support rotation of the slab", "θ", "θ = atan((δ_m − δ_y) / ℓ)",
                {"ℓ": (sr.ell[0], "length"),
                 "θ_lim": (slab_rotation_limit(project.settings.rotation_limit), "angle")},
                by.theta[0], "angle", "UFC 3-340-02 ch. 4 slab support rotation (from memory)")
        else:
            add("Support rotation", "θ", "θ = atan(δ_m / arm)",
                {"θ_lim": (project.settings.rotation_limit, "angle")}, by.theta[0], "angle",
                _SRC_PLASTIC)
    add("Allowable drop height (beyond yield)", "h_allow,pl",
        "h = δ_y(R_p(μ − ½) − Wμ)/(ηW)", {"R_p": (by.R_p[0], "force")},
        inv.h_pl[0], "length", _SRC_PLASTIC)


def _mass_and_mat_steps(sheet: _Sheet) -> None:
    """The allowable mass at the planned height and the spring mat that keeps the
    point elastic."""
    add, inv = sheet.add, sheet.inv
    two = _two(sheet)
    if two:
        add("Allowable mass at the planned height with two forces: the heaviest load of "
            "the same underside whose forward two-mass impact keeps every check within "
            "its resistance", "M_allow",
            "max M: U(F_f(M), F_deck(M)) ≤ 1, searched from the one-mass closed form "
            "F_allow = M·g·(1 + √(1 + 2h/(g·f·(M + m_e))))", {}, inv.m_allow[0], "mass",
            "search on the forward chain (droprig.solver.chain.two_force_mass); "
            + _SRC_TWO_MASS)
    else:
        add("Allowable mass at the planned height", "M_allow",
            "F_allow = M·g·(1 + √(1 + 2h/(g·f·(M + m_e)))), through crushing where the "
            "force passes the crushing force first (bisection on the forward model)", {},
            inv.m_allow[0], "mass", _SRC_GERE + " solved for M")
    add("Spring mat that keeps the point elastic", "k_req", "k = 1/(f_req − f_s)", {},
        inv.k_req[0], "stiffness", "series springs; " + _SRC_GERE)


def _plate_damage_steps(sheet: _Sheet) -> None:
    """Perforation of a steel plate or grating deck by a hard item (BRL)."""
    add, dk, inp = sheet.add, sheet.level.deck, sheet.inp
    ld = sheet.chain[LocalDamage]
    so = STRIKE_ORIENTATIONS[int(ld.orientation[0])]
    src = ("BRL formula; Li et al. 2005; DOE-STD-3014 App. C"
           + ("; extrapolated below the test speeds" if ld.extrapolated[0] else ""))
    add("Strike speed (free fall from the hoist's lowering speed)", "V",
        "V = √(v_h² + 2gh)",
        {"v_h": (sheet.chain.drop.v_hoist, "speed"), "h": (inp.h[0], "length")},
        ld.v_strike[0], "speed", "uniform acceleration (any dynamics text)")
    if dk.kind == "grating":
        add("Steel of the grating per plan area (bearing bars smeared)", "t_s",
            "t_s = h·t_b/p",
            {"h": (dk.thickness, "small_length"), "t_b": (dk.bar_thickness, "small_length"),
             "p": (dk.bar_pitch, "small_length")},
            dk.steel_depth, "small_length", "common practice, no source")
    add(f"Drop height at which the load perforates the steel deck ({so} strike governs)",
        "h_p", "t_s = 1.25·e(V), e^1.5 = 0.5·M·V²/(1.4396·10⁹·d^1.5), V = √(v_h² + 2gh)",
        {"t_s": (dk.steel_depth, "small_length"), "M": (inp.M[0], "mass")},
        ld.h_perf[0], "length", src)
    if dk.kind == "steel_plate" and np.isfinite(ld.dent[0]):
        src_d = ("Jones, Structural Impact (1989) ch. 7, rigid-plastic mode method, "
                 "membrane only (from memory); clamped at half the strip span"
                 + ("" if ld.dent_valid[0] else
                    "; outside its validity (dent under the plate thickness, membrane "
                    "strain over 10 % or the load through the plate: see perforation)"))
        add("Plastic dent of the plate (deepest strike orientation)", "W",
            "M·g·(h + v_h²/2g + W) = k·W², k = π·f_y·t·(R + a)/(2(R − a))",
            {"t": (dk.thickness, "small_length"), "f_y": (dk.steel_fy, "stress"),
             "M": (inp.M[0], "mass")}, ld.dent[0], "small_length", src_d)
        add(f"Drop height at which the dent reaches "
            f"{local_damage.DENT_LIMIT * 1000:.0f} mm (a serviceability limit)", "h_W",
            "h = (k·W_lim² − M·g·W_lim)/(M·g) − v_h²/2g",
            {"M": (inp.M[0], "mass")}, ld.h_dent[0], "length", src_d)


_FAMILY_ROWS: tuple[tuple[str, str], ...] = (
    ("h_p,NDRC", "t/1.2 = e: e/d = 3.19·x/d − 0.718·(x/d)² or 1.32 + 1.24·x/d"),
    ("h_p,Degen", "t/1.2 = e: e/d = 2.2·x/d − 0.3·(x/d)² or 0.69 + 1.29·x/d"),
    ("h_p,Barr", "V_p = 1.3·ρ^(1/6)·f_c^(1/2)·(p·(t/1.2)²/(πM))^(2/3)·(r + 0.3)^(1/2)"),
    ("h_p,Chang", "t/1.2 = e: e/d = (u/V)^0.25·(M·V²/(d³f_c))^0.5"))
_FAMILY_SOURCES: dict[str, str] = {
    "modified NDRC + Kennedy": "DOE-STD-3014 App. C §C.6.3.2.1.2; Kennedy 1976",
    "Degen": "DOE-STD-3014 App. C Eqs. C-613, C-614 (Degen 1980)",
    "UKAEA / Barr": "Barr 1990; Li et al. 2005 (from memory)",
    "Chang": "Chang 1981; Li et al. 2005 (from memory)"}


def _local_damage_steps(sheet: _Sheet) -> None:
    """Penetration, scabbing and perforation of the deck by a hard item."""
    add, lv, inp = sheet.add, sheet.level, sheet.inp
    ld = sheet.chain[LocalDamage]
    if ld.assessed[0] and lv.deck.is_steel:
        _plate_damage_steps(sheet)
        return
    if ld.assessed[0]:
        so = STRIKE_ORIENTATIONS[int(ld.orientation[0])]
        src = ("Kennedy 1976; Li et al. 2005; DOE-STD-3014 App. C"
               + ("; extrapolated below the test speeds" if ld.extrapolated[0] else ""))
        add("Strike speed (free fall from the hoist's lowering speed)", "V",
            "V = √(v_h² + 2gh)",
            {"v_h": (sheet.chain.drop.v_hoist, "speed"), "h": (inp.h[0], "length")},
            ld.v_strike[0], "speed", "uniform acceleration (any dynamics text)")
        add(f"Local damage: penetration of the deck ({so} strike governs)", "x",
            "x/d = 2√G or G + 1, G = 3.8·10⁻⁵·N*·M/(d√f_c)·(V/d)^1.8; UKAEA",
            {"t": (lv.deck.thickness, "length"), "h": (inp.h[0], "length")},
            ld.penetration[0], "length", src)
        add("Drop height at which the soffit starts to scab", "h_s",
            "t = 1.1·t_s(V), V = √(v_h² + 2gh) (Kennedy, Chang)",
            {"t": (lv.deck.thickness, "length")},
            ld.h_scab[0], "length", src)
        add("Drop height at which the load perforates the deck (the most onerous "
            "family governs)", "h_p",
            "t = 1.2·t_p(V), V = √(v_h² + 2gh) (Kennedy/ACE, Degen, Barr, Chang)",
            {"t": (lv.deck.thickness, "length")}, ld.h_perf[0], "length", src)
        # the spread between the independent families for the governing orientation
        spread = local_damage.load_family_heights(sheet.load, lv.deck,
                                                  sheet.chain.drop.v_hoist).get(so, {})
        for fam, (sym, eq) in zip(local_damage.PERFORATION_FAMILIES, _FAMILY_ROWS, strict=True):
            if fam in spread:
                add(f"Perforation height by {fam} ({so} strike; spread between the "
                    "families, the lowest governs)", sym, eq,
                    {"t": (lv.deck.thickness, "length")}, spread[fam], "length",
                    _FAMILY_SOURCES[fam])
        # the point's allowable mass held below the one that perforates (the bay's
        # printed mass is this, tried by the forward chain: droprig.solver.confirm)
        m_el = float(sheet.inv.m_allow[0])
        if math.isfinite(m_el) and m_el > 0.0:
            add("Allowable mass at the planned height, the load not perforating the deck",
                "M_allow,p", "largest M ≤ M_allow with V below the ballistic limit "
                "V_bl(M) of every family and strike (bisection on log M); a bay prints "
                f"{LIMIT_MARGIN:g} × the least over its points, tried by the forward chain",
                {"V": (ld.v_strike[0], "speed"), "M_allow": (m_el, "mass")},
                local_damage.perforation_mass_reference(
                    sheet.load, lv.deck, float(ld.v_strike[0]), m_el), "mass", src)
