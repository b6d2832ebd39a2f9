"""Floor-system analysis: every drop point of every load of every lift zone.

For each drop point p (vectorised; SI units) and each load (mass M, W = M·g):

1. Load path, framing compliance f_s(p) and Rayleigh effective mass m_e(p):
   :mod:`droprig.solver.loadpath`. The deck itself adds its local indentation under
   the footprint and the bending of the one-way strip between its two beams,
   f_deck (:mod:`droprig.solver.contact`), which keeps the force finite over a
   column or a beam line; a spring mat covering p adds 1/k (series springs,
   Engineering ToolBox "Impact Force"), and so does the load's own underside
   (skid, base frame, dunnage; ``LiftLoad.contact_stiffness``, 1/k_load; none =
   rigid): f = f_s + f_deck + 1/k_load + 1/k (springs in series, 1/k_eff = Σ 1/k_i;
   Gere §9.10 energy method). Under a mat or a crushable layer the framing's mass
   share is not taken (η = 1, conservative).
2. Free fall h(p) onto the struck surface (deck top, or mat top where a
   protection area covers p): ``LiftLoad.height_above``.
3. Impact: η = M/(M + m_e), K = 1 + √(1 + 2ηh/(W f)), F = K·W, δmax = K·W·f
   (Gere 7th ed. §9.10 Eq. 9-94 with Timoshenko's mass correction:
   :mod:`droprig.solver.impact`); through a crushable layer
   :func:`~droprig.solver.impact.impact_crushable`.
4. Member actions at the peak = F × the unit-load actions + the actions of the
   existing loads (member self-weight; deck self-weight, superimposed dead and the
   live load left in place, by tributary width). Checks on every member of the
   path: flexure, shear, web local yielding and crippling under the load (bearing
   length = the smaller footprint side + 2 × mat thickness, 1:1 spread through the
   mat, common practice, no source), deck flexure and punching
   (:mod:`droprig.solver.capacity`, :mod:`droprig.solver.deck`). Each check is
   linear in F: demand = F·unit + existing, so U = demand/resistance and the force
   that a check allows is F_allow = (resistance − existing)/unit.
5. Beyond yield (README, "What it computes"): if only flexure exceeds, and only on members
   whose sections can form a plastic hinge (``capacity.plastic_hinge_capable``:
   AISC 360-16 App. 1 / EN 1993-1-1 Class 1, as ``droprig check``), the path is taken as
   elastic–perfectly-plastic with R_p = the lowest collapse load of its members
   for a load at p (virtual work for fixed/propped members under the load; the
   first-hinge load, which is the collapse load of a determinate member, for the
   others — conservative) and δy = R_p·f; brittle checks are repeated at F = R_p;
   ductility and support rotation against the settings (:mod:`droprig.solver.plastic`).
6. Response, inverse answers (:mod:`droprig.solver.limits`), and a per-bay summary
   with structured advice (:func:`bay_advice`; the words are written at the edges by
   :mod:`droprig.advice`).

The drop points are the zone grid plus the points that can govern
(:mod:`droprig.solver.droppoints`), refined around the worst point of each bay.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from droprig.model import Level, LiftLoad, LiftZone, Project, Settings, bays, corridor_problem
from droprig.solver import (
    beam,
    capacity,
    contact,
    deck,
    droppoints,
    impact,
    limits,
    memory,
    plastic,
)
from droprig.solver.linear_checks import Check, Family, argmax0, argmin_axis, small_check
from droprig.solver.loadpath import (
    COND_NAMES,
    Frame,
    PathResult,
    build_frame,
    by_condition,
    locate,
    tributary_widths,
)
from droprig.solver.loadpath import evaluate as evaluate_path
from droprig.solver.parallel import for_blocks
from droprig.solver.results import (
    ADVICE_KINDS,
    CHECKS,
    DECK,
    ELASTIC,
    EXCEEDS,
    LIMIT_MARGIN,
    PLASTIC,
    RESPONSES,
    AdviceKind,
    BaySummary,
    CaseResult,
    Results,
)

__all__ = [
    "ADVICE_KINDS",
    "MAX_MAT_TRAVEL",
    "MIN_USEFUL_HEIGHT",
    "REFINE_PASSES",
    "Advice",
    "FloorModel",
    "analyse",
    "analyse_zone",
    "bay_advice",
    "build_floor",
    "evaluate_case",
    "evaluate_points",
    "floor_model",
    "zone_points",
]

CHECK = {name: i for i, name in enumerate(CHECKS)}
BRITTLE = ("shear", "web_yielding", "web_crippling", "deck_flexure", "deck_punching")
"""Checks with no plastic reserve (DNV-RP-C204 accidental limit state, from memory)."""

REFINE_PASSES = 3
"""Local refinement passes around the worst points of each bay (spacing ÷4 each)."""
REFINE_TOP = (2, 1, 1)
"""Points per bay and load around which each pass refines."""
MIN_USEFUL_HEIGHT = 0.05
"""A drop height below this (m) is not offered as advice: it cannot be controlled on
site (common practice, no source)."""
CACHE_MAX_POINTS = 200_000
"""Up to this many drop points the load-independent member actions are kept between
the loads of a zone (about 40 doubles per point); beyond, they are recomputed per
load so that memory stays bounded."""
MAX_MAT_TRAVEL = 0.3
"""A spring mat is only offered when it need not compress more than this (m): the
thickness of a stack of timber crane mats (common practice, no source)."""
_TINY = 1e-300


# --------------------------------------------------------------------------- floor model
@dataclass(frozen=True, eq=False)
class FloorModel:
    """A level prepared for analysis under one set of settings (see :func:`build_floor`).

    Per member: flexural and shear resistance ``Mr`` (N·m), ``Vr`` (N), existing
    uniform load ``w0`` (N/m) and end reactions ``V0`` (N); existing loads at the
    nodes ``P0`` (N); existing moments at the support-member stations of each
    panel ``M0_sup`` (N·m). Deck: existing pressure ``q0`` (Pa) and moment
    resistance per width ``deck_Mr`` (N·m/m). ``hinge``: per member, can its section
    form a plastic hinge (AISC 360-16 App. 1 / EN 1993-1-1 Class 1)?
    """

    level: Level
    settings: Settings
    frame: Frame
    Mr: np.ndarray
    Vr: np.ndarray
    w0: np.ndarray
    V0: np.ndarray
    P0: np.ndarray
    M0_sup: np.ndarray
    q0: float
    deck_Mr: float
    group: np.ndarray
    groups: tuple[tuple[object, object], ...]
    warnings: tuple[str, ...] = field(default=())
    hinge: np.ndarray | None = None
    tables: CandidateTables | None = None
    _mass: float | None = field(default=None, repr=False)
    _memo: dict = field(default_factory=dict, repr=False)
    """Small load-independent tables computed on first use (web resistances per
    bearing length)."""

    @property
    def frame_mass(self) -> float:
        """Mass of all members of the level, kg (an upper bound of any Rayleigh
        effective mass of a load path)."""
        if self._mass is None:
            object.__setattr__(self, "_mass", float(sum(
                m.section.mass_per_length * m.span for m in self.level.members)))
        return self._mass  # type: ignore[return-value]


def build_floor(level: Level, settings: Settings) -> FloorModel:
    """Load path, resistances and existing-load actions of ``level``."""
    frame = build_frame(level, include_member_mass=settings.include_member_mass)
    basis = settings.design_basis
    phi, dif = settings.resistance_factor, settings.dynamic_increase_factor
    n_m = frame.n_members
    groups: list[tuple[object, object]] = []
    gidx = np.zeros(n_m, dtype=np.int64)
    Mr = np.zeros(n_m)
    Vr = np.zeros(n_m)
    hinge = np.ones(n_m, dtype=bool)
    cache: dict[tuple[object, object], tuple[float, float, int, bool]] = {}
    for k, m in enumerate(level.members):
        key = (m.section, m.grade)
        if key not in cache:
            try:
                mr = capacity.flexural_resistance(m.section, m.grade, basis, phi, dif)
                vr = capacity.shear_resistance(m.section, m.grade, basis, phi, dif)
                hk = capacity.plastic_hinge_capable(m.section, m.grade, basis)
            except ValueError as exc:
                from droprig.model import ModelError

                raise ModelError(f"level {level.id}.members[{m.id}].section", m.section.name,
                                 f"a section droprig can check ({exc})") from exc
            cache[key] = (mr, vr, len(groups), hk)
            groups.append(key)
        Mr[k], Vr[k], gidx[k], hinge[k] = cache[key]
    # existing loads
    warnings: list[str] = []
    g = impact.G
    q0 = 0.0
    w0 = np.zeros(n_m)
    if settings.include_existing_loads:
        q0 = level.deck.self_weight_pressure + level.superimposed_dead + level.live_in_place
        w0 = np.array([m.section.mass_per_length * g for m in level.members])
        w0 = w0 + q0 * tributary_widths(frame)
    n_n = frame.n_nodes
    b = np.zeros(n_n + 1)
    udl_R = np.zeros((n_m, 2))
    for k in range(n_m):
        R0, RL = beam.udl_reactions(COND_NAMES[frame.cond[k]], frame.L[k], w0[k])
        udl_R[k] = (R0, RL)
        for e in range(2):
            b[frame.end_node[k, e]] += udl_R[k, e]
    b[n_n] = 0.0
    P0 = frame.T @ b
    V0 = udl_R.copy()
    for k in range(n_m):
        on = frame.nodes_on[k]
        if on.size:
            R0, RL = beam.unit_reactions(COND_NAMES[frame.cond[k]], frame.L[k], frame.node_pos[on])
            V0[k, 0] += R0 @ P0[on]
            V0[k, 1] += RL @ P0[on]
    M0_sup = np.zeros(frame.pair_sup_x.shape)
    for ip in range(frame.n_pairs):
        for jp, mm in enumerate(frame.pair_sup_member[ip]):
            if mm < 0:
                continue
            M0_sup[ip, jp] = existing_moment(frame, w0, P0, int(mm), frame.pair_sup_x[ip, jp])
    # members already over capacity under the existing loads alone
    for k, m in enumerate(level.members):
        xs = np.linspace(0.0, frame.L[k], 21)
        M_ex = np.max(np.abs(existing_moment(frame, w0, P0, k, xs)))
        if M_ex > Mr[k] or np.max(V0[k]) > Vr[k]:
            warnings.append(f"level {level.id}: member {m.id} is over capacity under the "
                            "existing loads alone; every drop on its load path exceeds")
    deck_Mr = deck.deck_flexure_resistance(level.deck, basis, phi)
    return FloorModel(level=level, settings=settings, frame=frame, Mr=Mr, Vr=Vr, w0=w0,
                      V0=V0, P0=P0, M0_sup=M0_sup, q0=q0, deck_Mr=deck_Mr, group=gidx,
                      groups=tuple(groups), warnings=tuple(warnings), hinge=hinge,
                      tables=candidate_tables(frame, Mr, Vr, V0, M0_sup))


def existing_moment(frame: Frame, w0: np.ndarray, P0: np.ndarray, k: int,
                    x: np.ndarray) -> np.ndarray:
    """Moment (N·m, sagging +) at ``x`` of member ``k`` under its existing uniform load
    and the existing loads of the members resting on it (statics, AISC Manual
    Table 3-23 by superposition)."""
    c = COND_NAMES[frame.cond[k]]
    x = np.asarray(x, float)
    M = beam.udl_moment(c, frame.L[k], w0[k], x)
    on = frame.nodes_on[k]
    if on.size:
        M = M + beam.unit_moment(c, frame.L[k], x[..., None], frame.node_pos[on]) @ P0[on]
    return M


# --------------------------------------------------------------------------- checks
@dataclass(frozen=True, eq=False)
class CandidateTables:
    """Load-independent tables of the check candidates of a prepared floor.

    Support members of each panel (``P`` per panel, ``S`` moment stations each):
    flexure rows (support p, station s) and shear rows (p, end e), each a linear
    combination of the four local reactions r_i of the panel's deck members
    (``m_coef``: per support (4, stations kept, panels); ``v_coef`` (P, 4, 2, panels);
    zero for a panel with fewer supports; ``m_terms``/``v_terms``: per support, the
    reactions that ever enter), existing demand over resistance (``m_Et``: per support
    (stations kept, panels); ``v_Et`` (P·2, panels)) and resistance per support
    (``m_R``/``v_R``, (P, panels)); ``member``/``valid`` (P, panels). ``m_keep``: per
    support, the stations kept — a station whose demand can never exceed another's
    is left out (:func:`_dominated_stations`). Deck members: existing end shear over
    shear resistance ``V_Et`` (2, members).
    """

    P: int
    S: int
    m_coef: tuple[np.ndarray, ...]
    m_terms: tuple[tuple[int, ...], ...]
    m_Et: tuple[np.ndarray, ...]
    m_R: np.ndarray
    v_coef: np.ndarray
    v_terms: tuple[tuple[int, ...], ...]
    v_Et: np.ndarray
    v_R: np.ndarray
    member: np.ndarray
    valid: np.ndarray
    V_Et: np.ndarray
    m_keep: tuple[np.ndarray, ...] = ()


def _dominated_stations(coef: np.ndarray, Et: np.ndarray) -> np.ndarray:
    """Stations of one support member that never govern, (S,) bool.

    The local reactions r_i of a panel are never negative (a downward load between
    the supports of a deck member; AISC Manual Table 3-23), so where station s'
    has coefficients c'_i ≥ |c_i| of station s for every reaction and every panel and
    an existing demand E' ≥ |E|, then |F·Σc_i·r_i + E| ≤ F·Σc'_i·r_i + E' for every
    F ≥ 0: s never has the larger utilisation nor the smaller allowed force (the
    same holds for the rounded values: rounding is monotonic). Of two stations that
    dominate each other the first is kept. ``coef`` (4, S, panels), ``Et`` (S,
    panels)."""
    S = coef.shape[1]
    out = np.zeros(S, dtype=bool)

    def dom(s2: int, s: int) -> bool:
        return bool(np.all(coef[:, s2, :] >= np.abs(coef[:, s, :]))
                    and np.all(Et[s2] >= np.abs(Et[s])))

    for s in range(S):
        out[s] = any(s2 != s and dom(s2, s) and (s2 < s or not dom(s, s2))
                     for s2 in range(S))
    return out


def candidate_tables(frame: Frame, Mr: np.ndarray, Vr: np.ndarray, V0: np.ndarray,
                     M0_sup: np.ndarray) -> CandidateTables:
    """:class:`CandidateTables` of a frame with its resistances and existing actions."""
    sup = frame.pair_sup_member
    n_p, P = sup.shape
    S = frame.pair_sup_mcoef.shape[2]
    supm = np.maximum(sup, 0)
    valid = sup >= 0
    vf = valid.astype(float)
    mc = frame.pair_sup_mcoef * vf[:, :, None, None]  # (panels, P, S, 4)
    vc = frame.pair_sup_rcoef * vf[:, :, None, None]  # (panels, P, 2, 4)

    def terms(c: np.ndarray) -> tuple[tuple[int, ...], ...]:
        return tuple(tuple(i for i in range(4) if np.any(c[:, p, :, i] != 0.0))
                     for p in range(P))

    with np.errstate(divide="ignore", invalid="ignore"):
        m_Et = (M0_sup * vf[:, :, None]) / Mr[supm][:, :, None]
        v_Et = (V0[supm] * vf[:, :, None]) / Vr[supm][:, :, None]
        V_Et = (V0 / Vr[:, None]).T
    coef_all = np.ascontiguousarray(mc.transpose(1, 3, 2, 0))  # (P, 4, S, panels)
    Et_all = np.ascontiguousarray(m_Et.transpose(1, 2, 0))  # (P, S, panels)
    keep = tuple(np.flatnonzero(~_dominated_stations(coef_all[p], Et_all[p]))
                 for p in range(P))
    return CandidateTables(
        P=P, S=S, m_keep=keep,
        m_coef=tuple(np.ascontiguousarray(coef_all[p][:, k]) for p, k in enumerate(keep)),
        m_terms=terms(mc),
        m_Et=tuple(np.ascontiguousarray(Et_all[p][k]) for p, k in enumerate(keep)),
        m_R=np.ascontiguousarray(Mr[supm].T),
        v_coef=np.ascontiguousarray(vc.transpose(1, 3, 2, 0)),
        v_terms=terms(vc), v_Et=np.ascontiguousarray(v_Et.transpose(1, 2, 0)).reshape(
            P * 2, n_p),
        v_R=np.ascontiguousarray(Vr[supm].T), member=np.ascontiguousarray(supm.T),
        valid=np.ascontiguousarray(valid.T), V_Et=np.ascontiguousarray(V_Et))


def _combine(out: np.ndarray, coef: np.ndarray, terms: tuple[int, ...], pair: np.ndarray,
             rT: np.ndarray) -> None:
    """out (rows, n) = Σ_i coef[i][:, pair]·r_i over ``terms`` (in order; the reactions
    whose coefficients are all zero add exactly nothing and are skipped)."""
    if not terms:
        out[...] = 0.0
        return
    i0, *rest = terms
    np.multiply(np.take(coef[i0], pair, axis=1), rT[i0], out=out)
    for i in rest:
        term = np.take(coef[i], pair, axis=1)
        term *= rT[i]
        out += term


def _unit_actions(fm: FloorModel, geo: Geometry) -> dict[str, object]:
    """Everything per drop point that does not depend on the load: the flexure and
    shear candidates of every path member (:class:`~droprig.solver.linear_checks.Family`)
    and the plastic reserve R_p of the path (cached on ``geo``).

    Flexure: at the stations of each deck member (:func:`_loaded_stations`) the unit
    moment share·M(x; a) and the existing moment; at the stations of each support
    member Σ_i coef_i·r_i and its existing moment. Shear: the end reactions of each
    deck member share·R(a) and of each support member Σ_i coef_i·r_i, with the
    existing end shears (AISC Manual Table 3-23 by superposition)."""
    ua = geo.cache.get("ua")
    if ua is not None:
        return ua
    fr = fm.frame
    tb = fm.tables
    path = geo.path
    n = geo.x.size
    memT = np.ascontiguousarray(path.members.T)  # (2, n)
    shareT = np.ascontiguousarray(path.share.T)
    aT = np.ascontiguousarray(path.a.T)
    LT = fr.L[memT]
    condT = fr.cond[memT]
    pair = np.maximum(path.pair, 0)
    rT = np.ascontiguousarray(path.r.T)  # (4, n)
    P, S = tb.P, tb.S
    supm = np.take(tb.member, pair, axis=1) if P else np.zeros((0, n), dtype=np.int64)
    members = np.concatenate([memT, supm])  # (K, n): the source members
    cols = np.arange(n)
    # ---- flexure: deck members (2, S_l stations) then support members (P, S)
    xs = _loaded_stations(aT[:, None, :], LT[:, None, :], bool(np.any(fr.cond != 0)))
    S_l = xs.shape[1]
    S_p = [k.size for k in tb.m_keep]  # stations kept per support member
    C = 2 * S_l + sum(S_p)
    ut = np.empty((C, n))
    Et = np.empty((C, n))
    u = by_condition(beam.unit_moment, condT[:, None, :], LT[:, None, :], xs,
                     aT[:, None, :])
    u *= shareT[:, None, :]
    Rd = fm.Mr[memT][:, None, :]
    np.divide(u, Rd, out=ut[:2 * S_l].reshape(2, S_l, n))
    # existing moment: at the stations that move with the load per point, at the
    # fixed ones (quarter points, ends) from a table per member
    M0 = _loaded_existing_moment(fm, memT, xs[:, _MOVING, :])  # (2, 2, n)
    E3 = Et[:2 * S_l].reshape(2, S_l, n)
    for i, st in enumerate(_MOVING):
        np.divide(M0[:, i, :], Rd[:, 0, :], out=E3[:, st, :])
    tab = _fixed_station_table(fm, S_l)
    for st in range(S_l):
        if st not in _MOVING:
            np.take(tab[st], memT, out=E3[:, st, :])
    m_R = np.take(tb.m_R, pair, axis=1)  # (P, n)
    runs = _runs([S_l, S_l, *S_p])
    for p in range(P):
        a0, a1 = runs[2 + p]
        _combine(ut[a0:a1], tb.m_coef[p], tb.m_terms[p], pair, rT)
        ut[a0:a1] /= m_R[p]
        np.take(tb.m_Et[p], pair, axis=1, out=Et[a0:a1])
    flex = Family(ut, Et, members, np.concatenate([fm.Mr[memT], m_R]),
                  np.repeat(np.arange(2 + P), [S_l, S_l, *S_p]), runs)
    # ---- shear: deck member ends (rows m0·R0, m1·R0, m0·RL, m1·RL), support ends
    R0, RL = by_condition(beam.unit_reactions, condT, LT, aT)
    Vd = fm.Vr[memT]
    C = 4 + 2 * P
    vt = np.empty((C, n))
    vE = np.empty((C, n))
    np.multiply(shareT, R0, out=vt[0:2])
    np.multiply(shareT, RL, out=vt[2:4])
    vt[0:2] /= Vd
    vt[2:4] /= Vd
    np.take(tb.V_Et[0], memT, out=vE[0:2])
    np.take(tb.V_Et[1], memT, out=vE[2:4])
    v_R = np.take(tb.v_R, pair, axis=1)
    for p in range(P):
        rows = vt[4 + 2 * p:6 + 2 * p]
        _combine(rows, tb.v_coef[p], tb.v_terms[p], pair, rT)
        rows /= v_R[p]
    np.take(tb.v_Et, pair, axis=1, out=vE[4:])
    shear = Family(vt, vE, members, np.concatenate([Vd, v_R]),
                   np.array([0, 1, 0, 1] + [2 + p for p in range(P) for _ in range(2)]))
    # ---- plastic reserve: R_p of the path for a load at p. Deck members: virtual-work
    # collapse load for fixed/propped, first hinge (= collapse of a determinate
    # member) otherwise; support members: first hinge (conservative)
    assert flex.gmin is not None
    fa_l = flex.gmin[:2]  # (2, n)
    Mp_eff = np.maximum(fm.Mr[memT] - np.abs(M0[:, 0, :]), 0.0)  # under the load
    Pc = by_condition(beam.plastic_collapse_load, condT, LT, aT, Mp_eff)
    with np.errstate(divide="ignore", invalid="ignore"):
        Pc = np.where(shareT > 0, Pc / np.where(shareT > 0, shareT, 1.0), np.inf)
    indeterminate = (condT == COND_NAMES.index("fixed")) | (condT == COND_NAMES.index(
        "propped"))
    Rp_all = np.empty((2 + P, n))
    Rp_all[:2] = np.where(indeterminate, np.maximum(fa_l, Pc), fa_l)
    arm = np.empty((2 + P, n))
    cant = condT == COND_NAMES.index("cantilever")
    arm[:2] = np.where(cant, aT, np.minimum(aT, LT - aT))  # hinge arm (root for a cantilever)
    rp_cond = np.concatenate([condT, fr.cond[supm]])
    for p in range(P):
        a0, a1 = runs[2 + p]
        fa_p = flex.gmin[2 + p]
        j = tb.m_keep[p][argmin_axis(flex.fa[a0:a1], fa_p, 0)]
        Rp_all[2 + p] = np.where(np.take(tb.valid[p], pair), fa_p, np.inf)
        # station of the governing section: pair_sup_x[pair, p, j] by flat index
        xst = np.take(fr.pair_sup_x.reshape(-1), (pair * P + p) * S + j)
        Ls = fr.L[supm[p]]
        arm[2 + p] = np.where(rp_cond[2 + p] == COND_NAMES.index("cantilever"), xst,
                              np.minimum(xst, Ls - xst))
    jr = argmin_axis(Rp_all, Rp_all.min(axis=0), 0)
    # members that cannot form a plastic hinge: the least force that takes one of
    # them to its flexural resistance (inf where the path has none)
    nh_fa = np.full(n, np.inf)
    nh_member = np.full(n, -1, dtype=np.int64)
    hinge = fm.hinge
    if hinge is not None and not bool(np.all(hinge)):
        g_nh = np.where(hinge[members], np.inf, flex.gmin)  # (K, n)
        jn = np.argmin(g_nh, axis=0)
        nh_fa = g_nh[jn, cols]
        nh_member = members[jn, cols]
    ua = {
        "flexure": flex, "shear": shear,
        "R_p": np.maximum(Rp_all[jr, cols], 0.0),
        "rp_member": members[jr, cols],
        "rp_arm": arm[jr, cols],
        "rp_cond": rp_cond[jr, cols],
        "nh_fa": nh_fa, "nh_member": nh_member,
    }
    geo.cache["ua"] = ua
    return ua


def _runs(lens: Sequence[int]) -> tuple[tuple[int, int], ...]:
    """(start, stop) of consecutive runs of rows of the given lengths (the flexure
    rows of each source: two deck members, then the support members)."""
    ends = np.cumsum(lens).tolist()
    return tuple((e - k, e) for e, k in zip(ends, lens, strict=True))


def _loaded_stations(a: np.ndarray, L: np.ndarray, ends: bool) -> np.ndarray:
    """Stations along a deck-supporting member where the moment can peak under a
    point load at a plus a uniform load: under the load, the quarter points, halfway
    between the load and midspan, and the ends when a member has a fixed end; stacked
    along the second axis of ``a`` (shape (2, 1, n) → (2, 5 or 7, n)), m."""
    cols = [a, 0.25 * L, 0.5 * L, 0.75 * L, 0.5 * (a + 0.5 * L)]
    if ends:
        cols += [0.0 * a, L + 0.0 * a]
    return np.concatenate(np.broadcast_arrays(*cols), axis=1)


_MOVING = (0, 4)
"""The stations of :func:`_loaded_stations` that move with the load (under it, and
halfway between it and midspan); the others are fixed on the member."""


def _fixed_station_table(fm: FloorModel, S_l: int) -> np.ndarray:
    """Existing moment over flexural resistance at the fixed stations of every member
    (S_l, members); rows of the moving stations unused (kept on the floor)."""
    key = ("fixed_stations", S_l)
    tab = fm._memo.get(key)
    if tab is None:
        fr = fm.frame
        tab = np.zeros((S_l, fr.n_members))
        for k in range(fr.n_members):
            L = np.array([fr.L[k]])
            x = _loaded_stations(np.zeros((1, 1, 1)), L[:, None, None], S_l > 5)[0, :, 0]
            tab[:, k] = existing_moment(fr, fm.w0, fm.P0, k, x) / fm.Mr[k]
        fm._memo[key] = tab
    return tab


def _loaded_existing_moment(fm: FloorModel, memT: np.ndarray, xs: np.ndarray) -> np.ndarray:
    """Existing moment (N·m) at the stations ``xs`` (2, S, n) of the deck members
    ``memT`` (2, n)."""
    fr = fm.frame
    M = by_condition(beam.udl_moment, fr.cond[memT][:, None, :], fr.L[memT][:, None, :],
                     fm.w0[memT][:, None, :], xs)
    carries = fm._memo.get("carries")
    if carries is None:
        carries = fm._memo["carries"] = np.flatnonzero(
            [fr.nodes_on[k].size > 0 for k in range(fr.n_members)])
    carrying = [k for k in carries if np.any(memT == k)] if carries.size else []
    if carrying:
        Mv = np.moveaxis(M, 1, -1)  # (2, n, S) view
        xv = np.moveaxis(xs, 1, -1)
        for k in carrying:
            sel = memT == k
            Mv[sel] = existing_moment(fr, fm.w0, fm.P0, int(k), xv[sel])
    return M


def _argmax_nan_low(D: np.ndarray) -> np.ndarray:
    """Row of the largest entry of each column of ``D`` (k, n), a NaN counting as
    lowest (first of equal maxima)."""
    if np.isnan(D).any():
        return np.argmax(np.where(np.isnan(D), -np.inf, D), axis=0)
    return argmax0(D, D.max(axis=0))


def _web_resistance(fm: FloorModel, fn: Callable[..., np.ndarray], mem: np.ndarray,
                    bearing: np.ndarray, dist: np.ndarray) -> np.ndarray:
    """Web resistance of each deck member under the load (N) by the clause function
    ``fn`` (see :func:`_web_resistances`)."""
    return _web_resistances(fm, (fn,), mem, bearing, dist)[0]


def _web_resistances(fm: FloorModel, fns: Sequence[Callable[..., np.ndarray]],
                     mem: np.ndarray, bearing: np.ndarray, dist: np.ndarray,
                     ) -> list[np.ndarray]:
    """Web resistance of each deck member under the load (N), one array per clause
    function in ``fns``. More than the section depth d from an end every clause used
    gives its interior value (AISC 360-16 J10.2 beyond d, J10.3 beyond d/2;
    EN 1993-1-5 §6 type (c) only within c < 2h_w/3 − s_s < d), so that value is
    computed once per (section, bearing) — a small table gathered for every point —
    and the clause is evaluated point by point only near the ends."""
    s = fm.settings
    mem, bearing, dist = np.broadcast_arrays(mem, bearing, dist)
    if bearing.ndim == 2 and bearing.strides[0] == 0:  # one bearing per point
        ub, inv = _distinct(bearing[0])
        inv = np.broadcast_to(inv, mem.shape)
    else:
        ub, inv = _distinct(bearing.ravel())
        inv = inv.reshape(mem.shape)
    ng = len(fm.groups)
    grp = fm.group[mem] if ng > 1 else np.zeros(mem.shape, dtype=np.int64)
    d_int = np.full(ub.shape, 1e3)
    depth = np.array([sec.d for sec, _ in fm.groups])  # type: ignore[attr-defined]
    near = dist <= depth[grp]
    idx = np.flatnonzero(near) if near.any() else None
    if idx is not None:
        g_near = grp.ravel()[idx]
        b_near, d_near = bearing.ravel()[idx], dist.ravel()[idx]
        sels = [(gi, g_near == gi) for gi in range(ng)] if ng > 1 else [(0, slice(None))]
    outs = []
    for fn in fns:
        key = ("web", fn, ub.tobytes())
        table = fm._memo.get(key)
        if table is None:
            table = np.concatenate([np.broadcast_to(np.asarray(
                fn(sec, grd, s.design_basis, ub, d_int, s.resistance_factor,
                   s.dynamic_increase_factor), float), ub.shape) for sec, grd in fm.groups])
            if len(fm._memo) < 256:
                fm._memo[key] = table
        r = np.take(table, grp * ub.size + inv)
        if idx is not None:
            rv = r.reshape(-1)
            for gi, sel in sels:
                ii = idx[sel]
                if ii.size:
                    sec, grd = fm.groups[gi]
                    rv[ii] = fn(sec, grd, s.design_basis, b_near[sel], d_near[sel],
                                s.resistance_factor, s.dynamic_increase_factor)
        outs.append(r)
    return outs


def _distinct(b: np.ndarray, limit: int = 16) -> tuple[np.ndarray, np.ndarray]:
    """``np.unique(b, return_inverse=True)`` for a 1-D array holding few distinct
    values (a bearing length per load and mat thickness): the values are found in
    ascending order by repeated masked minima instead of a sort of every point."""
    if b.size == 0:
        return np.unique(b, return_inverse=True)
    v = b.min()
    vals = [v]
    while np.isfinite(v):
        v = np.min(b, where=b > v, initial=np.inf)
        if not np.isfinite(v):
            break
        vals.append(v)
        if len(vals) > limit:
            break
    u = np.array(vals)
    if len(vals) > limit or not np.isfinite(u[-1]) or b.max() > u[-1]:
        return np.unique(b, return_inverse=True)
    return u, np.searchsorted(u, b)


# --------------------------------------------------------------------------- one case
@dataclass(frozen=True, eq=False)
class Geometry:
    """Load-independent data of a set of drop points."""

    x: np.ndarray
    y: np.ndarray
    path: PathResult
    bay: np.ndarray
    protection: np.ndarray
    opening: np.ndarray
    cache: dict = field(default_factory=dict, repr=False)


def point_geometry(fm: FloorModel, project: Project, x: np.ndarray, y: np.ndarray) -> Geometry:
    """Load path and plan attributes of drop points (bay, protection area, opening)."""
    memory.keep_freed_memory()
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    path = evaluate_path(fm.frame, x, y, with_mass=fm.settings.include_member_mass)
    bay = droppoints.bay_index(fm.level, x, y)
    prot = -np.ones(x.shape, dtype=np.int64)
    for i in range(len(project.protection_areas) - 1, -1, -1):
        pa = project.protection_areas[i]
        if pa.level_id != fm.level.id:
            continue
        r = pa.area
        inside = (x >= r.x0) & (x <= r.x1) & (y >= r.y0) & (y <= r.y1)
        prot[inside] = i
    opening = droppoints.in_openings(fm.level, x, y)
    return Geometry(x, y, path, bay, prot, opening)


def evaluate_case(fm: FloorModel, project: Project, load: LiftLoad | Sequence[LiftLoad],
                  geo: Geometry, load_index: np.ndarray | None = None, *,
                  detail: bool = False) -> dict[str, np.ndarray]:
    """Every quantity of the analysis of ``load`` at the points of ``geo``.

    ``load`` may be a sequence of loads with ``load_index`` naming the load of each
    point (several cases in one vectorised pass). Returns the :class:`CaseResult`
    arrays under their field names and ``_F_allow`` (N); with ``detail`` also the
    intermediate values the calculation trace shows (other keys starting with ``_``).
    """
    n = geo.x.size
    memory.keep_freed_memory()
    if n == 0:
        ints = {"bay", "protection", "governing_member", "governing_check", "response"}
        return {k: np.zeros(0, dtype=np.int64 if k in ints else float)
                for k in (*_FIELDS, "_F_allow")}
    chunk = loadpath_chunk()
    keep = None if detail else {*_FIELDS, "_F_allow"}
    with np.errstate(all="ignore"):
        if n <= chunk:
            return _select(_evaluate_case(fm, project, load, geo, load_index, detail),
                           keep)

        def block(s: int, e: int) -> list[dict[str, np.ndarray]]:
            sl = slice(s, e)
            li = None if load_index is None else load_index[sl]
            sub = geo.cache.get(("slice", s))
            if sub is None:
                sub = _slice_geo(geo, sl)
                if n <= CACHE_MAX_POINTS:  # keep per-point actions for the next load
                    geo.cache[("slice", s)] = sub
            with np.errstate(all="ignore"):
                return [_select(_evaluate_case(fm, project, load, sub, li, detail), keep)]

        li0 = None if load_index is None else load_index[:1]
        probe = _select(_evaluate_case(fm, project, load, _slice_geo(geo, slice(0, 1)),
                                       li0, detail), keep)
        return _blockwise(n, 1, chunk, block, probe)


def _blockwise(n: int, n_sets: int, chunk: int,
               block: Callable[[int, int], list[dict[str, np.ndarray]]],
               probe: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """Outputs of ``n_sets`` sets of ``n`` rows (set-major) computed block by block on
    all cores: ``block(s, e)`` returns each set's arrays for rows s..e. The outputs are
    allocated by the calling thread, their fields and types taken from ``probe`` (its
    heap is reused from one large job to the next; memory first touched in a worker's
    heap is not)."""
    out = {k: np.empty((n_sets * n, *v.shape[1:]), dtype=v.dtype) for k, v in probe.items()}

    def run(s: int, e: int) -> None:
        for j, part in enumerate(block(s, e)):
            for k, v in part.items():
                out[k][j * n + s:j * n + e] = v

    for_blocks(run, n, chunk)
    return out


def _select(d: dict[str, np.ndarray], keep: set[str] | None) -> dict[str, np.ndarray]:
    return d if keep is None else {k: v for k, v in d.items() if k in keep}


def loadpath_chunk() -> int:
    """Points per block of the vectorised evaluation (cache-sized)."""
    from droprig.solver import loadpath

    return int(loadpath.CHUNK)


def _slice_geo(geo: Geometry, sl: slice) -> Geometry:
    p = geo.path
    path = PathResult(**{f: getattr(p, f)[sl] for f in p.__dataclass_fields__})
    return Geometry(geo.x[sl], geo.y[sl], path, geo.bay[sl], geo.protection[sl],
                    geo.opening[sl])


def _evaluate_case(fm: FloorModel, project: Project, load: LiftLoad | Sequence[LiftLoad],
                   geo: Geometry, load_index: np.ndarray | None,
                   detail: bool = True) -> dict[str, np.ndarray]:
    s = fm.settings
    fr = fm.frame
    path = geo.path
    n = geo.x.size
    loads = [load] if isinstance(load, LiftLoad) else list(load)
    li = np.zeros(n, dtype=np.int64) if load_index is None else np.asarray(load_index)

    def per_point(values: list[float]) -> np.ndarray:
        return np.full(n, values[0]) if len(values) == 1 else np.array(values)[li]

    W = per_point([ld.weight for ld in loads])
    M = per_point([ld.mass for ld in loads])
    fl = per_point([ld.footprint_length for ld in loads])
    fw = per_point([ld.footprint_width for ld in loads])
    # the load's own underside (skid, base frame, dunnage) in series: 1/k_load, 0 = rigid
    f_load = per_point([0.0 if ld.contact_stiffness is None else 1.0 / ld.contact_stiffness
                        for ld in loads])
    lv = fm.level
    # ---- protection: thickness, spring compliance, crushable layer
    t_mat = np.zeros(n)
    f_mat = np.zeros(n)
    F_c = np.full(n, np.inf)
    s_c = np.zeros(n)
    crushable = np.zeros(n, dtype=bool)
    any_mat = bool(np.any(geo.protection >= 0))
    for i, pa in enumerate(project.protection_areas):
        if not any_mat or pa.level_id != lv.id:
            continue
        sel = geo.protection == i
        if not sel.any():
            continue
        t_mat[sel] = pa.thickness
        if pa.kind == "spring":
            f_mat[sel] = 1.0 / float(pa.stiffness)  # type: ignore[arg-type]
        else:
            crushable[sel] = True
            F_c[sel] = float(pa.crush_force)  # type: ignore[arg-type]
            s_c[sel] = float(pa.crush_stroke)  # type: ignore[arg-type]
    # ---- drop height: one datum, the load's underside above the finished surface
    # of the level (``drop_height``, or hook elevation − hang length − level
    # elevation); the free fall onto a pad or mat is that less its thickness
    H = np.empty(n)
    for j, ld in enumerate(loads):
        sel = li == j if len(loads) > 1 else slice(None)
        H[sel] = planned_height(ld, lv)
    h = H - t_mat
    if n and float(np.min(h)) < 0.0:
        _refuse_below_pad(loads, li, lv, t_mat, H)
    # ---- footprint on the deck (spread 1:1 through a mat) and bearing on a flange
    spread = 2.0 * t_mat
    lb = np.minimum(fl, fw) + spread
    foot_l, foot_w = fl + spread, fw + spread
    # ---- compliance: framing + deck (indentation and strip bending) + the load's
    # underside + spring mat, all in series (1/k_eff = Σ 1/k_i; Gere §9.10)
    f_s = path.f
    span = path.strip_span
    pos = path.strip_pos
    width = deck.deck_effective_width(span, pos, np.maximum(foot_l, foot_w),
                                      lv.deck.thickness)
    f_deck = contact.deck_contact_compliance(lv.deck, span, pos, width, foot_l, foot_w,
                                             s.design_basis)
    f_struct = f_s + f_deck + f_load  # everything in series with a mat
    f_series = f_deck + f_load + f_mat  # elastic springs in series with the yielding framing
    f = f_struct + f_mat
    m_e = path.m_e if s.include_member_mass else np.zeros(n)
    # A Rayleigh mass Σ∫μ(w/w_ref)² dx with |w| ≤ w_ref cannot be negative nor exceed
    # the mass of the members (Timoshenko Part I). loadpath keeps it finite and
    # continuous up to a column (factored end tables); should a value outside that
    # bound ever appear, the framing's mass share is not taken (η = 1, conservative)
    m_bound = fm.frame_mass
    m_e = np.where(np.isfinite(m_e) & (m_e >= 0.0) & (m_e <= m_bound), m_e, 0.0)
    # The Rayleigh shape is scaled to 1 at the point the load strikes. The load's
    # displacement is W·f with f = f_s + f_deck + 1/k_load (springs in series) while
    # the framing under it moves only W·f_s, so the framing's share is
    # m_e·(f_s/f)² (Rayleigh with the struck point's own deflection; Timoshenko
    # Part I, from memory). Near a column f_s → 0 and the framing mass drops out
    # (η → 1, conservative) instead of being credited for framing that barely moves.
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(f_struct > 0.0, f_s / f_struct, 0.0)
    m_e = m_e * share**2
    # under a mat or a crushable layer the hit on the framing is no longer perfectly
    # inelastic: its mass share is not taken (η = 1, conservative; as droprig check)
    m_e = np.where(geo.protection >= 0, 0.0, m_e)
    eta = impact.mass_efficiency(M, m_e)
    K, F_el, d_max = impact.impact_elastic(W, h, f, eta)
    F = F_el.copy()
    crush = np.zeros(n)
    bottomed = np.zeros(n, dtype=bool)
    if crushable.any():
        Fcr, dep, bot = impact.impact_crushable(W[crushable], h[crushable],
                                                f_struct[crushable], eta[crushable],
                                                F_c[crushable], s_c[crushable])
        F[crushable] = Fcr
        crush[crushable] = dep
        bottomed[crushable] = bot
        K = np.where(crushable, F / W, K)
        d_max = np.where(crushable, F * f_struct + crush, d_max)
    d_st = W * f
    # ---- path members: flexure and shear (load-independent candidates)
    ua = _unit_actions(fm, geo)
    memT = np.ascontiguousarray(path.members.T)
    shareT = np.ascontiguousarray(path.share.T)
    aT = np.ascontiguousarray(path.a.T)
    LT = fr.L[memT]
    checks: dict[str, Check] = {}
    checks["flexure"] = ua["flexure"].check("flexure", F, detail)  # type: ignore[attr-defined]
    checks["shear"] = ua["shear"].check("shear", F, detail)  # type: ignore[attr-defined]
    # ---- web checks under the load (each deck-supporting member, its share)
    dist = np.maximum(np.minimum(aT, LT - aT) - 0.5 * lb, 0.0)
    lb_pts = np.broadcast_to(lb, memT.shape)
    Rwy, Rwc = _web_resistances(fm, (capacity.web_local_yielding, capacity.web_crippling),
                                memT, lb_pts, dist)
    checks["web_yielding"] = small_check("web_yielding", F, shareT, None, Rwy, memT, detail)
    checks["web_crippling"] = small_check("web_crippling", F, shareT, None, Rwc, memT,
                                          detail)
    # ---- deck flexure (worse of the two footprint orientations) and punching
    thick = lv.deck.thickness
    mu1 = deck.deck_unit_moment_per_width(span, pos, fl + spread, fw + spread, thick)
    mu2 = deck.deck_unit_moment_per_width(span, pos, fw + spread, fl + spread, thick)
    m_deck = np.maximum(mu1, mu2)
    M0_deck = deck.deck_existing_moment_per_width(span, fm.q0)
    deckm = np.full((1, n), DECK)
    checks["deck_flexure"] = small_check("deck_flexure", F, m_deck[None, :],
                                         np.broadcast_to(M0_deck, (n,))[None, :],
                                         np.full((1, n), fm.deck_Mr), deckm, detail)
    R_punch = deck.punching_resistance(lv.deck, fl + spread, fw + spread, s.design_basis,
                                       s.resistance_factor)
    checks["deck_punching"] = small_check("deck_punching", F, np.ones((1, n)), None,
                                          np.broadcast_to(R_punch, (n,))[None, :], deckm,
                                          detail)
    # ---- overall elastic verdict
    names = list(checks)
    Ustack = np.stack([checks[c].U for c in names])
    rows = np.arange(n)
    gi = _argmax_nan_low(Ustack)
    U = Ustack[gi, rows]
    F_allow = checks[names[0]].F_allow
    for c in names[1:]:
        F_allow = np.minimum(F_allow, checks[c].F_allow)
    gov_check = np.array([CHECK[names[i]] for i in range(len(names))])[gi]
    gov_member = np.stack([checks[c].member for c in names])[gi, rows]
    # ---- plastic reserve: R_p of the path for a load at p
    R_p = ua["R_p"]
    rp_member = ua["rp_member"]
    rp_arm = ua["rp_arm"]
    rp_cond = ua["rp_cond"]
    # brittle checks at the force the yielding path can pass on
    # U at F_cap = min(F, R_p) is U at F where F_cap is F (F ≤ R_p or F is NaN) and
    # U at R_p elsewhere: each brittle family is evaluated at R_p once, for this and
    # for the plastic inverse answer below (same values as evaluating at F_cap)
    Ub_at_Rp = [checks[c].U_at(R_p) for c in BRITTLE]
    at_F = (F <= R_p) | np.isnan(F)
    Ub = np.stack([np.where(at_F, checks[c].U, u)
                   for c, u in zip(BRITTLE, Ub_at_Rp, strict=True)])
    jb = _argmax_nan_low(Ub)
    Ub_max = Ub[jb, rows]
    brittle_member = np.stack([checks[c].member for c in BRITTLE])[jb, rows]
    brittle_check = np.array([CHECK[c] for c in BRITTLE])[jb]
    # energy beyond yield: structure alone (mat compliance and crushed stroke removed)
    h_struct = h.copy()
    crush_ok = crushable & (F_c < R_p) & bottomed
    with np.errstate(divide="ignore", invalid="ignore"):
        h_struct = np.where(crush_ok, np.maximum(h - (F_c - W) * s_c / (eta * W), 0.0),
                            h_struct)
    # ---- response
    flex_exceeded = checks["flexure"].U > 1.0
    response = np.full(n, ELASTIC, dtype=np.int64)
    over = U > 1.0
    brittle_fail = over & (~flex_exceeded | (Ub_max > 1.0))
    response[over] = EXCEEDS
    pl = over & ~brittle_fail
    gov_check = np.where(brittle_fail & flex_exceeded, brittle_check, gov_check)
    gov_member = np.where(brittle_fail & flex_exceeded, brittle_member, gov_member)
    # ---- beyond yield: the energy balance where the path yields (every point for the
    # calculation trace)
    sub = slice(None) if detail or bool(pl.all()) else np.flatnonzero(pl)
    R_ps, f_s_s = R_p[sub], f_s[sub]
    d_m_s, _mu_tot, coll_s = plastic.plastic_response(W[sub], h_struct[sub], eta[sub],
                                                      R_ps, R_ps * f[sub])
    with np.errstate(invalid="ignore"):
        d_struct = np.maximum(d_m_s - R_ps * f_series[sub], 0.0)
        d_struct = np.where(np.isfinite(d_m_s), d_struct, np.inf)
        d_y_s = R_ps * f_s_s
        duct_s = np.where(d_y_s > 0, d_struct / np.where(d_y_s > 0, d_y_s, 1.0), np.inf)
    theta_s = np.zeros(d_struct.shape)
    cond_s, arm_s = rp_cond[sub], rp_arm[sub]
    one = not cond_s.size or cond_s.min() == cond_s.max()
    for c in cond_s[:1] if one else np.unique(cond_s):
        sel = slice(None) if one else cond_s == c
        Lsel = arm_s[sel] if COND_NAMES[int(c)] == "cantilever" else 2 * arm_s[sel]
        theta_s[sel] = plastic.support_rotation(d_struct[sel], Lsel, arm_s[sel],
                                                COND_NAMES[int(c)])
    if isinstance(sub, slice):
        d_m, collapsed, ductility, theta = d_m_s, coll_s, duct_s, theta_s
    else:
        d_m, ductility, theta = (np.full(n, np.nan) for _ in range(3))
        collapsed = np.zeros(n, dtype=bool)
        d_m[sub], collapsed[sub], ductility[sub], theta[sub] = d_m_s, coll_s, duct_s, theta_s
    col = pl & collapsed
    duct = pl & ~collapsed & (ductility > s.ductility_limit)
    rot = pl & ~collapsed & ~duct & (theta > s.rotation_limit)
    ok_pl = pl & ~collapsed & ~duct & ~rot
    # flexure beyond the resistance of a member that cannot form a plastic hinge
    # (AISC 360-16 App. 1 / EN 1993-1-1 Class 1): no plastic reserve, exceeds (as in
    # droprig check, droprig.solver.member)
    nh_fa = ua["nh_fa"]
    no_hinge = ok_pl & (F > nh_fa)
    ok_pl = ok_pl & ~no_hinge
    response[ok_pl] = PLASTIC
    gov_check = np.where(col, CHECK["collapse"], gov_check)
    gov_check = np.where(duct, CHECK["ductility"], gov_check)
    gov_check = np.where(rot, CHECK["rotation"], gov_check)
    gov_check = np.where(ok_pl, CHECK["flexure"], gov_check)
    gov_member = np.where(pl, rp_member, gov_member)
    gov_check = np.where(no_hinge, CHECK["flexure"], gov_check)
    gov_member = np.where(no_hinge, ua["nh_member"], gov_member)
    plastic_defl = np.where(pl, d_m, np.nan)
    ductility_out = np.where(pl, ductility, np.nan)
    rotation_out = np.where(pl, theta, np.nan)
    # ---- inverse answers
    Fa_pos = np.where(F_allow > 0, F_allow, np.nan)
    h_el = limits.allowable_drop_height_elastic(W, Fa_pos, d_st, eta)
    crush_bonus = np.where(crushable & (F_c <= F_allow) & (F_c > W),
                           (F_c - W) * s_c / (eta * W), 0.0)
    h_el = h_el + crush_bonus
    # plastic: ductility and rotation limits, brittle checks at R_p
    Ub_Rp = Ub_at_Rp[0]
    for u in Ub_at_Rp[1:]:
        Ub_Rp = np.maximum(Ub_Rp, u)
    with np.errstate(divide="ignore", invalid="ignore"):
        d_rot = np.tan(s.rotation_limit) * np.where(rp_cond == COND_NAMES.index("cantilever"),
                                                   rp_arm, rp_arm)
        d_lim_s = np.minimum(s.ductility_limit * R_p * f_s, d_rot)
        mu_tot = (d_lim_s + R_p * f_series) / (R_p * f)
    h_pl = plastic.allowable_height_plastic(W, eta, R_p, R_p * f, mu_tot)
    h_pl = h_pl + np.where(crushable & (F_c < R_p) & (F_c > W),
                           (F_c - W) * s_c / (eta * W), 0.0)
    # beyond yield only where the mechanism forms before a member without hinge
    # capacity reaches its flexural resistance
    h_pl = np.where((Ub_Rp <= 1.0) & (F_allow > 0) & (nh_fa > R_p), h_pl, np.nan)
    # what sets the plastic height: the ductility or the rotation limit, or the
    # elastic height where that is larger
    with np.errstate(invalid="ignore"):
        hp_check = np.where(s.ductility_limit * R_p * f_s <= d_rot, CHECK["ductility"],
                            CHECK["rotation"])
    hp_check = np.where(np.isnan(h_pl) | (h_el >= h_pl), -1, hp_check)
    h_pl = np.fmax(h_pl, h_el)
    m_allow = limits.allowable_mass(Fa_pos, h, f, m_e)
    if crushable.any():
        # through the crushable layer that lies there (η = 1 under a layer)
        m_allow[crushable] = limits.allowable_mass_crushable(
            Fa_pos[crushable], h[crushable], f_struct[crushable], F_c[crushable],
            s_c[crushable])
    # a mat or layer laid over the point takes the framing's mass share away (η = 1,
    # as the forward model does under protection), so the mat or stroke that keeps
    # the point elastic is found with η = 1; inf where the structure alone suffices
    # (a mat laid on the finished surface: the fall is the datum height H)
    k_req = limits.required_mat_stiffness(W, H, 1.0, Fa_pos, f_struct)
    k_req = np.where(np.isnan(Fa_pos), np.nan, k_req)
    s_req = limits.required_crush_stroke(W, H, 1.0, Fa_pos, f_struct)
    s_req = np.where(np.isfinite(s_req), s_req, np.nan)
    # the check that sets the allowable height: the least allowed force
    Fa_stack = np.stack([checks[c].F_allow for c in names])
    ai = np.argmin(np.where(np.isnan(Fa_stack), np.inf, Fa_stack), axis=0)
    h_check = np.array([CHECK[c] for c in names])[ai]
    h_member = np.stack([checks[c].member for c in names])[ai, rows]
    # ---- openings: the load falls through
    op = geo.opening
    out = {
        "x": geo.x, "y": geo.y, "bay": geo.bay, "protection": geo.protection,
        "drop_height": H, "fall_height": h, "structure_compliance": f_struct,
        "static_deflection": d_st,
        "effective_mass": m_e,
        "dynamic_factor": K, "peak_force": F, "max_deflection": d_max,
        "deceleration_g": impact.deceleration_g(F, W), "utilisation": U,
        "governing_member": gov_member.astype(np.int64),
        "governing_check": gov_check.astype(np.int64), "response": response,
        # allowable heights on the datum: the fall they allow plus the pad's thickness
        "allowable_drop_height": h_el + t_mat, "allowable_drop_height_plastic": h_pl + t_mat,
        "allowable_height_check": h_check.astype(np.int64),
        "allowable_height_member": h_member.astype(np.int64),
        # -1: the elastic check (allowable_height_check) sets the plastic height too
        "allowable_height_plastic_check": hp_check.astype(np.int64),
        "allowable_mass": m_allow, "plastic_deflection": plastic_defl,
        "ductility": ductility_out, "support_rotation": rotation_out,
        "required_mat_stiffness": k_req, "required_crush_stroke": s_req,
    }
    if op.any():
        for k in ("static_deflection", "effective_mass", "dynamic_factor", "peak_force",
                  "max_deflection", "deceleration_g", "allowable_drop_height",
                  "allowable_drop_height_plastic", "allowable_mass", "plastic_deflection",
                  "ductility", "support_rotation", "required_mat_stiffness",
                  "required_crush_stroke"):
            out[k] = np.where(op, np.nan, out[k])
        out["utilisation"] = np.where(op, np.inf, out["utilisation"])
        out["response"] = np.where(op, EXCEEDS, out["response"])
        out["governing_check"] = np.where(op, CHECK["opening"], out["governing_check"])
        out["governing_member"] = np.where(op, DECK, out["governing_member"])
        out["allowable_height_check"] = np.where(op, CHECK["opening"],
                                                 out["allowable_height_check"])
        out["allowable_height_member"] = np.where(op, DECK, out["allowable_height_member"])
    # intermediates for the trace
    out.update({
        "_f_s": f_s, "_f_deck": f_deck, "_f_load": f_load, "_f_mat": f_mat, "_f": f,
        "_eta": eta, "_W": W, "_h_allow_fall": h_el, "_no_hinge": no_hinge, "_nh_fa": nh_fa,
        "_t_mat": t_mat, "_lb": lb, "_F_allow": F_allow, "_R_p": R_p,
        "_rp_member": rp_member, "_crush": crush, "_bottomed": bottomed,
        "_h_struct": h_struct, "_d_m": d_m, "_theta": theta, "_ductility": ductility,
        "_Ub_Rp": Ub_Rp, "_Ub_cap": Ub_max,
    })
    for c, chk in checks.items():
        out[f"_{c}_U"] = chk.U
        out[f"_{c}_Fa"] = chk.F_allow
        out[f"_{c}_member"] = chk.member
        if detail:
            out[f"_{c}_unit"] = chk.unit  # type: ignore[assignment]
            out[f"_{c}_exist"] = chk.exist  # type: ignore[assignment]
            out[f"_{c}_R"] = chk.resist  # type: ignore[assignment]
    return out


# --------------------------------------------------------------------------- cases
_FIELDS = ("x", "y", "bay", "protection", "drop_height", "fall_height",
           "structure_compliance", "static_deflection",
           "effective_mass", "dynamic_factor", "peak_force", "max_deflection",
           "deceleration_g", "utilisation", "governing_member", "governing_check",
           "response", "allowable_drop_height", "allowable_drop_height_plastic",
           "allowable_mass", "plastic_deflection", "ductility", "support_rotation",
           "required_mat_stiffness", "required_crush_stroke", "allowable_height_check",
           "allowable_height_member", "allowable_height_plastic_check")


def _severity(res: dict[str, np.ndarray]) -> np.ndarray:
    """Sort key, larger = worse: response state, then utilisation."""
    U = res["utilisation"]
    U = np.where(np.isnan(U), 0.0, U)
    return res["response"] * 1e6 + np.minimum(U, 1e5)


def _refine(fm: FloorModel, zone: LiftZone, res: dict[str, np.ndarray],
            step: float, n_top: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Points on a 5 × 5 lattice of spacing ``step`` around the worst points of
    each bay for each load, moved into the zone where they fall outside it, kept
    where they lie over a deck panel. Returns x, y and the load index of each."""
    sev = _severity(res)
    finite = np.isfinite(res["utilisation"])
    bay = res["bay"]
    li = res["_load"]
    # worst n_top points per (load, bay): sort by group then severity
    group = li * (int(bay.max(initial=0)) + 2) + (bay + 1)
    cand = np.flatnonzero(finite)
    if cand.size == 0:
        return np.zeros(0), np.zeros(0), np.zeros(0, dtype=np.int64)
    cand = cand[_top_candidates(sev[cand], group[cand], n_top)]
    order = cand[np.lexsort((-sev[cand], group[cand]))]
    g = group[order]
    first = np.r_[True, g[1:] != g[:-1]]
    start = np.maximum.accumulate(np.where(first, np.arange(g.size), 0))
    top = order[(np.arange(g.size) - start) < n_top]
    off = np.arange(-2, 3) * step
    OX, OY = np.meshgrid(off, off)
    x = (res["x"][top][:, None] + OX.ravel()[None, :]).ravel()
    y = (res["y"][top][:, None] + OY.ravel()[None, :]).ravel()
    lj = np.repeat(li[top], OX.size)
    # lattice points beyond the zone edge move onto it: the worst point often lies
    # on the edge nearest a stiff support
    x, y = droppoints.project_into_zone(zone, x, y)
    keep = droppoints.in_zone(zone, x, y) & (locate(fm.frame, x, y) >= 0)
    return x[keep], y[keep], lj[keep]


def _top_candidates(sev: np.ndarray, group: np.ndarray, n_top: int) -> np.ndarray:
    """Positions (ascending) of the points that can be among the ``n_top`` worst of
    their group: severity at least the group's ``n_top``-th distinct largest value
    (a superset of the top points, in the original order, so that sorting it gives the
    same top points as sorting everything)."""
    if sev.size <= 64:
        return np.arange(sev.size)
    G = int(group.max()) + 1
    floor = np.full(G, np.inf)
    keep = np.zeros(sev.size, dtype=bool)
    for _ in range(n_top):
        below = sev < floor[group]
        if not below.any():
            break
        gmax = np.full(G, -np.inf)
        np.maximum.at(gmax, group[below], sev[below])
        floor = np.where(gmax > -np.inf, gmax, floor)
        keep |= below & (sev >= floor[group])
    return np.flatnonzero(keep)


def _keys(x: np.ndarray, y: np.ndarray, li: np.ndarray) -> np.ndarray:
    """One complex key per (point, load), equal to 1e-7 m."""
    return (np.round(x, 7) + 1e5 * li) + 1j * np.round(y, 7)


_REFINE_KEYS = ("x", "y", "bay", "utilisation", "response", "_load")
"""The fields :func:`_refine` reads (merged after every pass; the others once)."""


def _merge(parts: list[dict[str, np.ndarray]], keys: Sequence[str] | None = None,
           ) -> dict[str, np.ndarray]:
    """Rows of ``parts`` one after the other (all fields, or only ``keys``)."""
    if len(parts) == 1:
        return dict(parts[0]) if keys is None else {k: parts[0][k] for k in keys}
    return {k: np.concatenate([p[k] for p in parts]) for k in (keys or parts[0])}


def evaluate_points(fm: FloorModel, project: Project, loads: Sequence[LiftLoad],
                    x: np.ndarray, y: np.ndarray) -> dict[str, np.ndarray]:
    """Every load at every point, load by load ((len(loads)·n) rows, load-major):
    :func:`point_geometry` and :func:`evaluate_case` block by block on all cores,
    each block's load path and load-independent member actions shared by the loads.
    The path for large sets of points: nothing of the size of all points is kept
    but the results. Same values as the two functions called on all points."""
    memory.keep_freed_memory()
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    n, nl = x.size, len(loads)
    keep = {*_FIELDS, "_F_allow"}
    if n == 0 or nl == 0:
        return evaluate_case(fm, project, list(loads), point_geometry(fm, project, x, y),
                             np.zeros(0, dtype=np.int64))

    def block(s: int, e: int) -> list[dict[str, np.ndarray]]:
        geo = point_geometry(fm, project, x[s:e], y[s:e])
        with np.errstate(all="ignore"):
            return [_select(_evaluate_case(fm, project, ld, geo, None, False), keep)
                    for ld in loads]

    with np.errstate(all="ignore"):
        probe = _select(_evaluate_case(fm, project, loads[0],
                                       point_geometry(fm, project, x[:1], y[:1]), None,
                                       False), keep)
    return _blockwise(n, nl, loadpath_chunk(), block, probe)


def zone_points(fm: FloorModel, project: Project, zone: LiftZone,
                base: Geometry | tuple[np.ndarray, np.ndarray]) -> dict[str, np.ndarray]:
    """Evaluate every load of ``zone`` at the base points (a :class:`Geometry`, or x
    and y), then refine around each bay's worst points of each load
    (:data:`REFINE_PASSES` passes, spacing resolution/4, /16, …). ``_load`` names the
    load of each row."""
    loads = list(zone.loads)
    nl = len(loads)
    bx, by = (base.x, base.y) if isinstance(base, Geometry) else base
    nb = bx.size
    li = np.repeat(np.arange(nl), nb)
    if nb <= CACHE_MAX_POINTS:
        # all loads in one pass over the base points repeated once per load; the
        # load-independent actions are computed once and repeated with them
        geo = base if isinstance(base, Geometry) else point_geometry(fm, project, bx, by)
        res = evaluate_case(fm, project, loads, _tile(fm, geo, nl), li)
    else:  # block by block, each block's path shared by the loads
        res = evaluate_points(fm, project, loads, bx, by)
    res["_load"] = li
    step = fm.settings.grid_resolution
    known = np.sort(_keys(res["x"], res["y"], li))  # sorted: membership by bisection
    parts = [res]
    for k in range(REFINE_PASSES):
        step /= 4.0
        x, y, lj = _refine(fm, zone, res, step, REFINE_TOP[min(k, len(REFINE_TOP) - 1)])
        if x.size == 0:
            break
        k, first = np.unique(_keys(x, y, lj), return_index=True)
        fresh = ~_in_sorted(known, k)
        new = first[fresh]
        if new.size == 0:
            continue
        x, y, lj = x[new], y[new], lj[new]
        # merged into the sorted known keys (k is sorted: no sort of the whole again)
        known = np.insert(known, np.searchsorted(known, k[fresh]), k[fresh])
        geo = point_geometry(fm, project, x, y)
        r2 = evaluate_case(fm, project, loads, geo, lj)
        r2["_load"] = lj
        parts.append(r2)
        res = _merge(parts, _REFINE_KEYS)
    return _merge(parts)


def _in_sorted(sorted_keys: np.ndarray, keys: np.ndarray) -> np.ndarray:
    """``np.isin(keys, sorted_keys)`` for an already sorted ``sorted_keys`` (one
    bisection per key instead of sorting both arrays)."""
    if sorted_keys.size == 0:
        return np.zeros(keys.shape, dtype=bool)
    i = np.minimum(np.searchsorted(sorted_keys, keys), sorted_keys.size - 1)
    return sorted_keys[i] == keys


def _tile(fm: FloorModel, geo: Geometry, k: int) -> Geometry:
    """``geo`` repeated ``k`` times (one copy per load), with its load-independent
    member actions computed once and repeated alongside."""
    if k == 1:
        return geo
    ua = _unit_actions(fm, geo)
    p = geo.path
    path = PathResult(**{f: np.concatenate([getattr(p, f)] * k)
                         for f in p.__dataclass_fields__})
    out = Geometry(np.tile(geo.x, k), np.tile(geo.y, k), path, np.tile(geo.bay, k),
                   np.tile(geo.protection, k), np.tile(geo.opening, k))
    tiled: dict[str, object] = {}
    for key, v in ua.items():
        if isinstance(v, Family):
            tiled[key] = v.tiled(k)
        else:
            tiled[key] = np.tile(v, k)  # type: ignore[arg-type]
    out.cache["ua"] = tiled
    return out


def planned_height(load: LiftLoad, level: Level) -> float:
    """The load's planned drop height H (m) on droprig's one datum: its underside
    above the finished surface (top of deck) of ``level``. Given directly
    (``drop_height``) or as hook elevation − hang length − level elevation; both
    input modes mean the same physical height. The free fall onto a pad or mat of
    thickness t is H − t."""
    if load.drop_height is not None:
        return float(load.drop_height)
    return load.height_above(level.elevation)


def _refuse_below_pad(loads: Sequence[LiftLoad], li: np.ndarray, level: Level,
                      t_mat: np.ndarray, H: np.ndarray) -> None:
    """A planned height below the top of a pad or mat the load can pass over is not a
    drop: name the load's field and the height it must reach."""
    from droprig.model import ModelError

    bad = int(np.argmin(H - t_mat))
    ld = loads[int(li[bad])] if len(loads) > 1 else loads[0]
    need = float(t_mat[bad])
    if ld.drop_height is not None:
        raise ModelError(f"load {ld.name}.drop_height", ld.drop_height,
                         f"≥ {need:g} m (the load's underside above the top of a pad or "
                         f"mat on level {level.id})", "m")
    raise ModelError(f"load {ld.name}.hook_elevation", ld.hook_elevation,
                     f"≥ {level.elevation + ld.hang_length + need:g} m (the load's "
                     f"underside above the top of a pad or mat on level {level.id})", "m")


def _case_result(zone: LiftZone, load: LiftLoad, level: Level,
                 res: dict[str, np.ndarray]) -> CaseResult:
    arrays = {k: np.ascontiguousarray(res[k]) for k in _FIELDS}
    for k in ("bay", "protection", "governing_member", "governing_check", "response",
              "allowable_height_check", "allowable_height_member",
              "allowable_height_plastic_check"):
        arrays[k] = arrays[k].astype(np.int64)
    return CaseResult(zone_id=zone.id, load_name=load.name, level_id=level.id,
                      mass=load.mass, weight=load.weight,
                      planned_drop_height=planned_height(load, level), **arrays)


# --------------------------------------------------------------------------- bay summaries
@dataclass(frozen=True)
class Advice:
    """What a bay needs, as data (the words are written at the edges,
    :mod:`droprig.advice`). ``kind`` is one of :data:`ADVICE_KINDS`; lengths in m,
    stiffness in N/m; ``None`` where the option is not offered."""

    kind: AdviceKind
    height_limit: float | None = None
    height_limit_yields: bool = False
    mat_stiffness_max: float | None = None
    mat_travel: float | None = None


def bay_advice(resp: int, n_opening: int, h_allow: float | None, k_mat: float | None,
               mat_travel: float | None = None, h_elastic: float | None = None) -> Advice:
    """What one bay needs: no protection, a drop-height limit of :data:`LIMIT_MARGIN`
    × ``h_allow`` (offered from :data:`MIN_USEFUL_HEIGHT` up, and only when the bay
    exceeds its limits), a spring mat no stiffer than :data:`LIMIT_MARGIN` × ``k_mat``
    (offered while it need not compress more than :data:`MAX_MAT_TRAVEL`; ``mat_travel``
    is its compression), acceptance of yielding with the engineer's
    approval, or an exclusion zone (deck opening, or no option found).
    ``height_limit_yields``: the height limit lets members yield (it exceeds the
    elastic height ``h_elastic`` by more than 1 %). SI units (m, N/m)."""
    if n_opening:
        return Advice("opening")
    if resp == ELASTIC:
        return Advice("none")
    h: float | None = None
    yields = False
    if h_allow is not None and LIMIT_MARGIN * h_allow >= MIN_USEFUL_HEIGHT and \
            resp == EXCEEDS:
        h = LIMIT_MARGIN * float(h_allow)
        yields = h_elastic is None or h > 1.01 * h_elastic
    k: float | None = None
    travel: float | None = None
    if (k_mat is not None and math.isfinite(k_mat) and k_mat > 0
            and (mat_travel is None or mat_travel <= MAX_MAT_TRAVEL)):
        k = LIMIT_MARGIN * float(k_mat)
        travel = float(mat_travel) if mat_travel is not None and math.isfinite(mat_travel) \
            else None
    if resp == PLASTIC:
        return Advice("plastic_mat", mat_stiffness_max=k, mat_travel=travel) if k \
            else Advice("plastic_accept")
    if h is not None and k is not None:
        kind: AdviceKind = "limit_or_mat"
    elif h is not None:
        kind = "limit_height"
    elif k is not None:
        kind = "mat"
    else:
        return Advice("keep_clear")
    return Advice(kind, h, yields, k, travel)


def _least(v: np.ndarray) -> float | None:
    """Smallest value, or None when any point has none (nan)."""
    if v.size == 0 or np.any(np.isnan(v)):
        return None
    return float(np.min(v))


def summarise(level: Level, zone: LiftZone, load: LiftLoad, case: CaseResult,
              allowed_force: np.ndarray,
              protection_ids: Sequence[str] = ()) -> list[BaySummary]:
    """One :class:`BaySummary` per bay that holds drop points of ``case``
    (``allowed_force``: the elastic F_allow of each point, N; ``protection_ids``: the
    ids of ``project.protection_areas``). A point on a shared grid line or at a column
    counts for every bay it touches (closed bays). All bays are reduced at once over
    a (bay, point) membership matrix. Each quantity is reported with the point and
    the check that set it (the least allowable height need not come from the point
    of largest utilisation)."""
    out: list[BaySummary] = []
    all_bays = _bays(level)
    members = level.members
    n = case.x.size
    if n == 0 or not all_bays:
        return out
    g = level.grid
    xl, yl = np.asarray(g.x_lines, float), np.asarray(g.y_lines, float)
    tol = droppoints.EDGE_TOL
    x, y = case.x, case.y
    Mx = (x >= xl[:-1, None] - tol) & (x <= xl[1:, None] + tol)  # (nx, n)
    My = (y >= yl[:-1, None] - tol) & (y <= yl[1:, None] + tol)  # (ny, n)
    M = (My[:, None, :] & Mx[None, :, :]).reshape(-1, n)  # (bays, n), b = j·nx + i
    count = M.sum(axis=1)
    sev = _severity({"utilisation": case.utilisation, "response": case.response})
    resp = case.response
    gov = np.argmax(np.where(M, sev, -np.inf), axis=1)  # first worst point per bay
    worst = np.where(M, resp, -1).max(axis=1)
    U = case.utilisation
    U_m = np.where(M, np.where(np.isnan(U), -np.inf, U), -np.inf)
    U_max = U_m.max(axis=1)
    u_at = U_m.argmax(axis=1)

    def least(v: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Smallest value per bay, the point that has it, and whether any point of the
        bay has none (nan)."""
        vm = np.where(M, np.where(np.isnan(v), np.inf, v), np.inf)
        return vm.min(axis=1), vm.argmin(axis=1), (M & np.isnan(v)).any(axis=1)

    h_el, h_el_at, h_el_none = least(case.allowable_drop_height)
    h_pl, h_pl_at, h_pl_none = least(case.allowable_drop_height_plastic)
    m_al, m_al_at, m_al_none = least(case.allowable_mass)
    # the stiffest mat laid over the whole bay that keeps every point of it elastic
    # (η = 1 under a mat, so points that stay elastic on bare deck count as well)
    # (offered where no pad lies: a mat does not replace a pad's design)
    kv = case.required_mat_stiffness
    k_ok = ~(M & (np.isnan(kv) | (case.protection >= 0))).any(axis=1)
    k_min = np.where(M, kv, np.inf).min(axis=1)
    travel_all = np.full(k_min.shape, -np.inf)
    fs_pts = case.structure_compliance
    for b in np.flatnonzero(k_ok & np.isfinite(k_min) & (k_min > 0)):
        # how far the mat compresses: F/k at each point with the mat in series
        # (Gere §9.10, η = 1 under a mat), the largest over the bay
        sel = M[b]
        k_adv = LIMIT_MARGIN * k_min[b]  # the mat offered (bay_advice)
        f_pts = (fs_pts[sel] if fs_pts is not None else 0.0) + 1.0 / k_adv
        _, F_pts, _ = impact.impact_elastic(case.weight, case.drop_height[sel], f_pts, 1.0)
        travel_all[b] = float(np.max(F_pts)) / k_adv
    n_open = (M & (case.governing_check == CHECK["opening"])).sum(axis=1)
    h_chk = case.allowable_height_check
    h_mem = case.allowable_height_member
    hp_chk = case.allowable_height_plastic_check
    prot = case.protection

    def mname(gm: int) -> str:
        return "deck" if gm == DECK else members[gm].id

    for b in np.flatnonzero(count):
        i = int(gov[b])
        wst = int(worst[b])
        u_b = float(U_max[b])
        u_b = u_b if u_b > -np.inf else float("inf")
        iu = int(u_at[b])
        he = None if h_el_none[b] else float(h_el[b])
        hp = None if h_pl_none[b] else float(h_pl[b])
        ih, ihp = int(h_el_at[b]), int(h_pl_at[b])
        k_mat = float(k_min[b]) if k_ok[b] and wst != ELASTIC else None
        travel = float(travel_all[b]) if k_mat is not None and \
            math.isfinite(float(travel_all[b])) and travel_all[b] > 0 else None
        gm = int(case.governing_member[i])
        adv = bay_advice(wst, int(n_open[b]), hp if wst == EXCEEDS else he, k_mat, travel, he)
        lim_at = ihp if wst == EXCEEDS else ih
        if adv.height_limit is None:
            lim_chk = ""
        elif wst == EXCEEDS and hp_chk is not None and int(hp_chk[ihp]) >= 0:
            lim_chk = CHECKS[int(hp_chk[ihp])]
        else:
            lim_chk = CHECKS[int(h_chk[lim_at])] if h_chk is not None else ""
        pads = sorted({int(p) for p in prot[M[b]] if p >= 0})
        out.append(BaySummary(
            level_id=level.id, bay_id=all_bays[b].id, zone_id=zone.id,
            load_name=load.name, n_points=int(count[b]), max_utilisation=u_b,
            response=RESPONSES[wst], allowable_drop_height=he,
            allowable_drop_height_plastic=hp, governing_x=float(case.x[i]),
            governing_y=float(case.y[i]),
            governing_member=mname(gm),
            governing_check=CHECKS[int(case.governing_check[i])], advice_kind=adv.kind,
            height_limit=adv.height_limit, height_limit_yields=adv.height_limit_yields,
            mat_stiffness_max=adv.mat_stiffness_max, mat_travel=adv.mat_travel,
            planned_drop_height=case.planned_drop_height,
            utilisation_x=float(case.x[iu]), utilisation_y=float(case.y[iu]),
            utilisation_member=mname(int(case.governing_member[iu])),
            utilisation_check=CHECKS[int(case.governing_check[iu])],
            height_x=None if he is None else float(case.x[ih]),
            height_y=None if he is None else float(case.y[ih]),
            height_member="" if he is None or h_mem is None else mname(int(h_mem[ih])),
            height_check="" if he is None or h_chk is None else CHECKS[int(h_chk[ih])],
            height_limit_x=None if not lim_chk else float(case.x[lim_at]),
            height_limit_y=None if not lim_chk else float(case.y[lim_at]),
            height_limit_check=lim_chk,
            protections=tuple(protection_ids[p] for p in pads if p < len(protection_ids)),
            allowable_mass=None if m_al_none[b] else float(m_al[b]),
            allowable_mass_x=None if m_al_none[b] else float(case.x[int(m_al_at[b])]),
            allowable_mass_y=None if m_al_none[b] else float(case.y[int(m_al_at[b])])))
    return out


_BAYS: dict[Level, tuple] = {}


def _bays(level: Level) -> tuple:
    """:func:`droprig.model.bays`, remembered for the last few levels."""
    return _remember(_BAYS, level, lambda: bays(level))


# --------------------------------------------------------------------------- entry points
_FLOORS: dict[tuple[Level, Settings], FloorModel] = {}
_FLOORS_MAX = 8
"""Prepared floors kept between analyses (keyed by value: an edited level or changed
settings builds afresh). Live re-analysis after a zone or load edit reuses them."""


def floor_model(level: Level, settings: Settings) -> FloorModel:
    """:func:`build_floor`, remembered for the last few (level, settings) pairs."""
    return _remember(_FLOORS, (level, settings), lambda: build_floor(level, settings))


def _remember(cache: dict, key: object, make: Callable[[], object]) -> Any:
    """``cache[key]``, made by ``make()`` when missing; the oldest of more than
    :data:`_FLOORS_MAX` entries is dropped."""
    got = cache.get(key)
    if got is None:
        got = make()
        if len(cache) >= _FLOORS_MAX:
            cache.pop(next(iter(cache)))
        cache[key] = got
    return got


def _floor_cache(project: Project) -> Callable[[str], FloorModel]:
    def get(level_id: str) -> FloorModel:
        return floor_model(project.level(level_id), project.settings)

    return get


def analyse_zone(project: Project, zone_id: str,
                 floor: Callable[[str], FloorModel] | None = None) -> Results:
    """Every load of one lift zone (see :func:`analyse`)."""
    floor = floor or _floor_cache(project)
    zone = project.zone(zone_id)
    fm = floor(zone.level_id)
    level = fm.level
    warnings = list(fm.warnings)
    if zone.corridor and (problem := corridor_problem(zone.corridor)) is not None:
        warnings.append(f"zone {zone.id}: the lift corridor is not a simple polygon "
                        f"({problem}); check the drop points it covers")
    x, y = droppoints.base_points(fm.frame, zone, project.settings.grid_resolution)
    if x.size == 0:
        warnings.append(f"zone {zone.id}: no drop point over the deck of level {level.id}")
    elif droppoints.reaches_off_deck(fm.frame, zone, project.settings.grid_resolution):
        warnings.append(f"zone {zone.id}: part of the zone lies beyond the deck of level "
                        f"{level.id}; drops there are not assessed by droprig")
    cases = []
    summaries: list[BaySummary] = []
    allres = zone_points(fm, project, zone, (x, y)) if zone.loads else {}
    for j, load in enumerate(zone.loads):
        sel = allres["_load"] == j
        res = {k: v[sel] for k, v in allres.items()}
        case = _case_result(zone, load, level, res)
        cases.append(case)
        summaries.extend(summarise(level, zone, load, case, res["_F_allow"],
                                   [p.id for p in project.protection_areas]))
    if not zone.loads:
        warnings.append(f"zone {zone.id}: no loads to assess")
    return Results(tuple(cases), tuple(summaries), tuple(warnings))


def analyse(project: Project) -> Results:
    """Analyse every load of every lift zone of ``project``.

    Returns one :class:`CaseResult` per (zone, load) with the arrays of the result
    contract and one :class:`BaySummary` per (bay, zone, load). SI units. Raises
    :class:`~droprig.model.ModelError` for framing the method cannot assess (a member
    end resting on nothing, members resting on each other in a loop).
    """
    floor = _floor_cache(project)
    cases: list[CaseResult] = []
    summaries: list[BaySummary] = []
    warnings: list[str] = []
    for zone in project.lift_zones:
        r = analyse_zone(project, zone.id, floor)
        cases.extend(r.cases)
        summaries.extend(r.bays)
        warnings.extend(w for w in r.warnings if w not in warnings)
    if sum(c.x.size for c in cases) > CACHE_MAX_POINTS:
        memory.release_memory()  # hand the temporaries of a large job back
    return Results(tuple(cases), tuple(summaries), tuple(warnings))
