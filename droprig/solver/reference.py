"""The load path of a unit load written plainly, one quantity at a time in the order of
the formulas: the reference the fast point kernel (:func:`droprig.solver.loadpath.evaluate`:
blocks on all cores, per-panel tables, in-place ufuncs) is tested against
(``tests/solver/test_point_kernels.py``, named tolerance) and what the calculation trace
uses (:func:`droprig.solver.trace.trace_point`).

For a unit load at p over the deck panel between members 1 and 2 (SI: m, N, kg):

* lever rule over the one-way deck strip (common practice, no source): t = s/S,
  shares w = (1 − t, t), positions a_k along the members;
* own bending of each deck member, g_k(a_k, a_k) (AISC Manual 15th ed. Table 3-23,
  Roark 7th ed. Table 8.1), end reactions r = (w_1·R_0(a_1), w_1·R_L(a_1),
  w_2·R_0(a_2), w_2·R_L(a_2)) passed to the local nodes, node deflections u = D·r
  (D: node flexibility of the member tree, Maxwell–Betti);
* compliance f = Σ_k w_k² g_k(a_k, a_k) + rᵀ u (internal work of the unit-load system);
* Rayleigh effective mass m_e = Σ_m ∫ μ_m w_m(x)² dx / w_ref², with the exact
  integrals of the member shapes tabulated over ξ = a/L
  (:func:`droprig.solver.loadpath._mass_tables`; Timoshenko, Strength of Materials
  Part I) and w_ref the largest deflection of the path (≥ f).

The member actions per unit force and the check families
(:func:`unit_actions_reference`, :func:`check_reference`) are the plain forms of the
fast kernels of :mod:`droprig.solver.unit_actions` and
:mod:`droprig.solver.linear_checks` (``tests/solver/test_action_kernels.py``):

* flexure candidates of each deck member k at the stations x (under the load, the
  quarter points, halfway between the load and midspan, the peak station of
  :func:`peak_station_reference`, the ends when a member of the floor has a fixed
  end): demand per N w_k·M(x; a_k), existing demand M_0(x)
  (AISC Manual Table 3-23 by superposition, :func:`droprig.solver.floor.existing_moment`);
  of each support member at its stations Σ_i c_i·r_i (the frame's coefficients on
  the local reactions r) with its existing moment;
* shear candidates: deck member ends w_k·R_e(a_k) and support member ends Σ_i c_i·r_i,
  existing end shears V_0;
* a check family at a force F: U = max_c |F·u_c + E_c|/R_c and
  F_allow = min_c (R_c − sign(u_c)·E_c)/|u_c| (∞ where u_c = 0, −1 where |E_c| > R_c;
  common practice, no source);
* plastic reserve of the path R_p: per deck member carrying no other member the
  virtual-work collapse load of the point load with its existing UDL over its share
  (:func:`droprig.solver.beam.plastic_collapse_load_udl`); per deck member carrying
  others the first-yield force (least F_allow of its flexure rows), for a fixed or
  propped member at least the collapse load with M_p − |M_0(a)|; per support member
  its first-yield force; R_p the least (≥ 0);
* web resistances under the load per point (:func:`droprig.solver.capacity.web_local_yielding`,
  :func:`~droprig.solver.capacity.web_crippling`; AISC 360-16 J10.2/J10.3,
  EN 1993-1-5 §6) at the distance max(min(a, L − a) − l_b/2, 0) from the nearer end.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, cast

import numpy as np

from droprig.model.project import GEOMETRY_TOL
from droprig.solver import beam, capacity, loadpath
from droprig.solver.loadpath import COND_NAMES, Frame, PathResult, by_condition

TIE_REL = 1e-9
"""Plastic-reserve candidates within this fraction of the least are tied (as
:data:`droprig.solver.unit_actions.TIE_REL`)."""

if TYPE_CHECKING:
    from droprig.solver.floor import FloorModel
    from droprig.solver.unit_actions import UnitActions

__all__ = ["ActionsReference", "CandidatesReference", "check_reference", "path_reference",
           "reference_unit_actions", "unit_actions_reference", "web_reference"]


def path_reference(frame: Frame, x: np.ndarray, y: np.ndarray, *,
                   with_mass: bool = True) -> PathResult:
    """:class:`~droprig.solver.loadpath.PathResult` of a unit load at each point (x, y),
    by the formulas of the module docstring. Points off every deck panel get the fill
    values of :func:`droprig.solver.loadpath.evaluate` (``pair`` −1, NaN compliance
    and mass); without ``with_mass`` the mass and ``w_ref`` are NaN."""
    x = np.atleast_1d(np.asarray(x, float))
    y = np.atleast_1d(np.asarray(y, float))
    n = x.size
    # the deck panel of each point (cells of the panel grid; the last break closed)
    pair = np.full(n, -1, dtype=np.int64)
    u, v = (y, x) if frame.deck_axis == "x" else (x, y)
    ub, vb = frame.u_breaks, frame.v_breaks
    iu = np.searchsorted(ub, u, side="right") - 1
    iv = np.searchsorted(vb, v, side="right") - 1
    iu = np.where(np.abs(u - ub[-1]) <= GEOMETRY_TOL, ub.size - 2, iu)
    iv = np.where(np.abs(v - vb[-1]) <= GEOMETRY_TOL, vb.size - 2, iv)
    inside = (iu >= 0) & (iu < ub.size - 1) & (iv >= 0) & (iv < vb.size - 1)
    pair[inside] = frame.cell_pair[iu[inside], iv[inside]]
    s = pair >= 0
    p, u, v = pair[s], u[s], v[s]
    # lever rule over the strip
    mem = frame.pair_members.T[:, p]
    c0 = frame.pair_c[p, 0]
    span = frame.pair_c[p, 1] - c0
    pos = np.clip(u - c0, 0.0, span)
    t = pos / span
    share = np.stack([1.0 - t, t])
    L = frame.L[mem]
    a = np.clip((v - frame.vs[mem]) * frame.vdir[mem], 0.0, L)
    cond = frame.cond[mem]
    EI = frame.EI[mem]
    # own bending, end reactions, node deflections
    g = by_condition(beam.green, cond, L, EI, a, a)
    R0, RL = by_condition(beam.unit_reactions, cond, L, a)
    r = np.stack([share[0] * R0[0], share[0] * RL[0], share[1] * R0[1], share[1] * RL[1]])
    D = frame.pair_D16[:, p]
    un = np.stack([D[4 * i] * r[0] + D[4 * i + 1] * r[1] + D[4 * i + 2] * r[2]
                   + D[4 * i + 3] * r[3] for i in range(4)])
    # compliance
    gs = share * g
    f = share[0] * gs[0] + share[1] * gs[1] + (r * un).sum(axis=0)
    out = {
        "members": (mem.T, -1), "share": (share.T, 0.0), "a": (a.T, 0.0),
        "strip_span": (span, np.nan), "strip_pos": (pos, np.nan), "r": (r.T, 0.0),
        "u": (un.T, 0.0), "f": (f, np.nan), "g_own": (gs.T, 0.0),
    }
    if with_mass:
        m_e, w_ref = _rayleigh_mass(frame, p, mem, share, a, L, EI, cond, r, un, f)
    else:
        m_e = w_ref = np.full(f.shape, np.nan)
    out["m_e"] = (m_e, np.nan)
    out["w_ref"] = (w_ref, np.nan)
    full: dict[str, np.ndarray] = {}
    for k, (val, fill) in out.items():
        arr = np.full((n, *val.shape[1:]), fill, dtype=val.dtype)
        arr[s] = val
        full[k] = arr
    return PathResult(pair=pair, **full)


def _rayleigh_mass(frame: Frame, p: np.ndarray, mem: np.ndarray, share: np.ndarray,
                   a: np.ndarray, L: np.ndarray, EI: np.ndarray, cond: np.ndarray,
                   r: np.ndarray, un: np.ndarray, f: np.ndarray,
                   ) -> tuple[np.ndarray, np.ndarray]:
    """Rayleigh mass m_e (kg) and the reference deflection w_ref (m/N) of the path:
    kinetic energy of the deck members (own bending and end movements) and of the
    support members (quadratic form in r), over w_ref²."""
    I_gg, J0, J1, Gmax = by_condition(loadpath._mass_tables, cond, a / L)
    L3EI = L**3 / EI
    I_gg = I_gg * (L * L3EI**2)
    J0 = J0 * (L * L3EI)
    J1 = J1 * (L * L3EI)
    mu = frame.mu[mem]
    ue0, ue1 = un[0::2], un[1::2]
    NR = frame.N_R16[:, mem]
    kin = (mu * (share * share * I_gg + 2.0 * share * (ue0 * J0 + ue1 * J1))
           + ue0 * ue0 * NR[0] + 2.0 * ue0 * ue1 * NR[1] + ue1 * ue1 * NR[3]).sum(axis=0)
    M = frame.pair_M16[:, p]
    for i in range(4):
        kin = kin + r[i] * (M[4 * i] * r[0] + M[4 * i + 1] * r[1] + M[4 * i + 2] * r[2]
                            + M[4 * i + 3] * r[3])
    w_deck = share * Gmax * L3EI + np.maximum(np.abs(ue0), np.abs(ue1))
    w_sup = (frame.pair_wmax[:, p] * r).sum(axis=0)
    w_ref = np.maximum(np.maximum(f, w_sup), np.maximum(w_deck[0], w_deck[1]))
    with np.errstate(divide="ignore", invalid="ignore"):
        m_e = np.where(w_ref > 0.0, kin / np.where(w_ref > 0.0, w_ref, 1.0) ** 2, 0.0)
    return m_e, w_ref


# --------------------------------------------------------------------------- actions
@dataclass(frozen=True)
class CandidatesReference:
    """The candidates of one check family, (C, n): demand per N of impact force
    ``unit`` (N·m/N or N/N), existing demand ``exist`` (N·m or N), resistance
    ``resist`` (N·m or N), ``member`` (index into the level's members) and ``source``
    (0, 1: the two deck members; 2 + p: support member slot p)."""

    unit: np.ndarray
    exist: np.ndarray
    resist: np.ndarray
    member: np.ndarray
    source: np.ndarray


@dataclass(frozen=True)
class ActionsReference:
    """Plain-formula counterpart of :class:`droprig.solver.unit_actions.UnitActions`:
    the flexure and shear candidates, the plastic reserve ``R_p`` (N), the member that
    sets it, its hinge arm (m) and end condition ``rp_cond``, the least force taking a
    member unable to form a hinge to its flexural resistance ``nh_fa`` (N, ∞ none)
    and that member."""

    flexure: CandidatesReference
    shear: CandidatesReference
    R_p: np.ndarray
    rp_member: np.ndarray
    rp_arm: np.ndarray
    nh_fa: np.ndarray
    nh_member: np.ndarray
    rp_cond: np.ndarray


def check_reference(c: CandidatesReference, F: np.ndarray,
                    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A check family at the forces F (n,): U = max_c |F·u_c + E_c|/R_c, the allowed
    force F_allow = min_c (R_c − sign(u_c)·E_c)/|u_c| (N; ∞ where u_c = 0, −1 where
    the existing demand alone exceeds R_c) and the member of the candidate with the
    largest U (first of equals)."""
    U_c = np.abs(F * c.unit + c.exist) / c.resist
    with np.errstate(divide="ignore", invalid="ignore"):
        fa = (c.resist - np.sign(c.unit) * c.exist) / np.abs(c.unit)
    fa = np.where(c.unit == 0.0, np.inf, fa)
    fa = np.where(np.abs(c.exist) > c.resist, -1.0, fa)
    j = np.argmax(U_c, axis=0)
    cols = np.arange(F.size)
    return U_c.max(axis=0), fa.min(axis=0), c.member[j, cols]


def _allowed(c: CandidatesReference) -> np.ndarray:
    """F_allow of every candidate, (C, n) (as :func:`check_reference`)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        fa = (c.resist - np.sign(c.unit) * c.exist) / np.abs(c.unit)
    fa = np.where(c.unit == 0.0, np.inf, fa)
    return np.where(np.abs(c.exist) > c.resist, -1.0, fa)


def peak_station_reference(cond: str, L: float, a: float, w: float, Mr: float) -> float:
    """Where the sagging moment of a member under a point load P at ``a`` plus its UDL
    ``w`` peaks at the least P that takes the peak to ``Mr`` (m), one member at a time.

    On each side of the load M(x) = c0 + c1·x − w·x²/2 (AISC Manual 15th ed. Table
    3-23 by superposition; Roark 7th ed. Table 8.1), c0 and c1 linear in P; the peak
    of a side is at V = 0, x* = c1/w, M* = c0 + c1²/(2w) (statics). Each side: the
    least P ≥ 0 with M* = Mr (a quadratic in P) whose x* lies on that side; the side
    with the lesser P gives x*. ``a`` where none does, where w ≤ 0 or on a cantilever
    (the caller also keeps ``a`` for members carrying others, and members without a
    share of the load)."""
    if w <= 0.0 or cond == "cantilever":
        return a
    c = cast(beam.EndCondition, cond)
    r_u = float(beam.unit_reactions(c, L, a)[0])
    m_u = float(beam.unit_end_moments(c, L, a)[0])
    r_w = float(beam.udl_reactions(c, L, w)[0])
    m_w = float(beam.udl_end_moments(c, L, w)[0])
    best_P, best_x = math.inf, a
    for c0_P, c1_P, lo, hi in ((m_u, r_u, 0.0, a), (m_u + a, r_u - 1.0, a, L)):
        # M* = (c0_P·P + m_w) + (c1_P·P + r_w)²/(2w) = Mr: q_a·P² + q_b·P + q_c = 0
        q_a = c1_P * c1_P / (2.0 * w)
        q_b = c0_P + c1_P * r_w / w
        q_c = m_w + r_w * r_w / (2.0 * w) - Mr
        if q_c > 0.0:  # the UDL alone already exceeds Mr
            continue
        disc = math.sqrt(max(q_b * q_b - 4.0 * q_a * q_c, 0.0))
        if q_b > 0.0:
            P = -2.0 * q_c / (q_b + disc)
        elif q_a > 0.0:
            P = (disc - q_b) / (2.0 * q_a)
        else:
            continue
        x = (c1_P * P + r_w) / w
        if P >= 0.0 and lo <= x <= hi and P < best_P:
            best_P, best_x = P, x
    return best_x


def deck_member_stations(a: np.ndarray, L: np.ndarray, ends: bool,
                         peak: np.ndarray | None = None) -> list[np.ndarray]:
    """Stations (m) along a deck member where the moment under a point load at a plus
    a uniform load can peak: under the load, the quarter points, halfway between the
    load and midspan, the peak station ``peak`` (:func:`peak_station_reference`; under
    the load where not given), and both ends when the floor has a member with a fixed
    end."""
    st = [a, 0.25 * L, 0.5 * L, 0.75 * L, 0.5 * (a + 0.5 * L), a if peak is None else peak]
    if ends:
        st += [0.0 * a, L + 0.0 * a]
    return st


def unit_actions_reference(fm: FloorModel, path: PathResult) -> ActionsReference:
    """The member actions of the load path of each point per unit force, the existing
    actions and the plastic reserve (module docstring), point by point in plain
    numpy."""
    from droprig.solver.floor import existing_moment

    fr = fm.frame
    n = path.f.size
    pair = np.maximum(path.pair, 0)
    mem = path.members.T  # (2, n)
    share, a = path.share.T, path.a.T
    L = fr.L[mem]
    cond = fr.cond[mem]
    r = path.r.T  # (4, n)
    ends = bool(np.any(fr.cond != 0))
    # flexure: deck members at their stations
    rows_u, rows_e, rows_r, rows_m, rows_s = [], [], [], [], []
    M0_under = np.zeros((2, n))
    carries = np.array([fr.nodes_on[m].size > 0 for m in range(fr.n_members)], dtype=bool)
    for k in range(2):
        peak = np.array([
            a[k, i] if share[k, i] <= 0.0 or carries[mem[k, i]] else
            peak_station_reference(COND_NAMES[int(cond[k, i])], float(L[k, i]),
                                   float(a[k, i]), float(fm.w0[mem[k, i]]),
                                   float(fm.Mr[mem[k, i]])) for i in range(n)])
        for si, x in enumerate(deck_member_stations(a[k], L[k], ends, peak)):
            M = by_condition(beam.unit_moment, cond[k], L[k], x, a[k])
            M0 = np.empty(n)
            for m in np.unique(mem[k]):
                on = mem[k] == m
                M0[on] = existing_moment(fr, fm.w0, fm.P0, int(m), x[on])
            if si == 0:
                M0_under[k] = M0
            rows_u.append(share[k] * M)
            rows_e.append(M0)
            rows_r.append(fm.Mr[mem[k]])
            rows_m.append(mem[k])
            rows_s.append(np.full(n, k))
    # flexure: support members at their stations, Σ_i c_i·r_i
    sup = fr.pair_sup_member[pair]  # (n, P)
    P = sup.shape[1]
    valid = sup >= 0
    supm = np.maximum(sup, 0)
    for p in range(P):
        for st in range(fr.pair_sup_x.shape[2]):
            coef = fr.pair_sup_mcoef[pair, p, st, :]  # (n, 4)
            rows_u.append(np.where(valid[:, p], (coef * r.T).sum(axis=1), 0.0))
            rows_e.append(np.where(valid[:, p], fm.M0_sup[pair, p, st], 0.0))
            rows_r.append(fm.Mr[supm[:, p]])
            rows_m.append(supm[:, p])
            rows_s.append(np.full(n, 2 + p))
    flexure = CandidatesReference(*(np.array(v) for v in (rows_u, rows_e, rows_r, rows_m,
                                                          rows_s)))
    # shear: deck member ends, then support member ends
    R0, RL = by_condition(beam.unit_reactions, cond, L, a)
    s_u = [share[0] * R0[0], share[1] * R0[1], share[0] * RL[0], share[1] * RL[1]]
    s_e = [fm.V0[mem[0], 0], fm.V0[mem[1], 0], fm.V0[mem[0], 1], fm.V0[mem[1], 1]]
    s_r = [fm.Vr[mem[0]], fm.Vr[mem[1]], fm.Vr[mem[0]], fm.Vr[mem[1]]]
    s_m = [mem[0], mem[1], mem[0], mem[1]]
    s_s = [np.zeros(n), np.ones(n), np.zeros(n), np.ones(n)]
    for p in range(P):
        for e in range(2):
            coef = fr.pair_sup_rcoef[pair, p, e, :]
            s_u.append(np.where(valid[:, p], (coef * r.T).sum(axis=1), 0.0))
            s_e.append(np.where(valid[:, p], fm.V0[supm[:, p], e], 0.0))
            s_r.append(fm.Vr[supm[:, p]])
            s_m.append(supm[:, p])
            s_s.append(np.full(n, 2 + p))
    shear = CandidatesReference(*(np.array(v) for v in (s_u, s_e, s_r, s_m, s_s)))
    R_p, rp_member, rp_arm, rp_cond = _plastic_reserve_reference(
        fm, flexure, mem, share, a, L, cond, M0_under, valid, pair)
    nh_fa, nh_member = _no_hinge_reference(fm, flexure)
    return ActionsReference(flexure=flexure, shear=shear, R_p=R_p, rp_member=rp_member,
                            rp_arm=rp_arm, nh_fa=nh_fa, nh_member=nh_member,
                            rp_cond=rp_cond)


def reference_unit_actions(fm: FloorModel, path: PathResult) -> UnitActions:
    """:func:`unit_actions_reference` in the form the chain reads
    (:class:`droprig.solver.unit_actions.UnitActions`: every candidate a row of its
    own, no table or dominated station left out), for the calculation trace: its
    member actions are the plain formulas, not the fast kernel."""
    from droprig.solver.linear_checks import Family
    from droprig.solver.unit_actions import UnitActions

    ref = unit_actions_reference(fm, path)

    def family(c: CandidatesReference) -> Family:
        return Family.from_candidates(c.unit, c.exist, c.resist, c.member)

    return UnitActions(flexure=family(ref.flexure), shear=family(ref.shear), R_p=ref.R_p,
                       rp_member=ref.rp_member, rp_arm=ref.rp_arm, rp_cond=ref.rp_cond,
                       nh_fa=ref.nh_fa, nh_member=ref.nh_member)


def _tie_pick_reference(values: list[float], arms: list[float]) -> int:
    """The candidate that sets the plastic reserve, point by point: of those whose
    collapse force lies within TIE_REL (1e-9) of the least, the shortest hinge arm
    (the larger support rotation: conservative), and of equal arms the first (common
    practice, no source; the kernel's :func:`droprig.solver.unit_actions.tie_pick`)."""
    v_min = min(values)
    best = -1
    for i, (v, arm) in enumerate(zip(values, arms, strict=True)):
        if (v == v_min or v <= v_min + TIE_REL * abs(v_min)) and (
                best < 0 or arm < arms[best]):
            best = i
    return best


def _plastic_reserve_reference(fm: FloorModel, flexure: CandidatesReference,
                               mem: np.ndarray, share: np.ndarray, a: np.ndarray,
                               L: np.ndarray, cond: np.ndarray, M0_under: np.ndarray,
                               valid: np.ndarray, pair: np.ndarray,
                               ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """R_p (N), its member, hinge arm (m) and end condition (module docstring)."""
    fa = _allowed(flexure)
    fr = fm.frame
    n = mem.shape[1]
    P = valid.shape[1]
    Rp = np.full((2 + P, n), np.inf)
    member = np.zeros((2 + P, n), dtype=np.int64)
    arm = np.zeros((2 + P, n))
    rcond = np.zeros((2 + P, n), dtype=np.int64)
    for src in range(2 + P):
        rows = flexure.source[:, 0] == src
        first_yield = fa[rows].min(axis=0)
        member[src] = flexure.member[rows][0]
        if src < 2:
            k = src
            Mp_eff = np.maximum(fm.Mr[mem[k]] - np.abs(M0_under[k]), 0.0)
            Pc = by_condition(beam.plastic_collapse_load, cond[k], L[k], a[k], Mp_eff)
            with np.errstate(divide="ignore", invalid="ignore"):
                Pc = np.where(share[k] > 0, Pc / share[k], np.inf)
            indeterminate = (cond[k] == COND_NAMES.index("fixed")) | (
                cond[k] == COND_NAMES.index("propped"))
            Rp[src] = np.where(indeterminate, np.maximum(first_yield, Pc), first_yield)
            # a member carrying no other: its own UDL in the mechanism (exact)
            carries = np.array([fm.frame.nodes_on[int(m)].size > 0 for m in mem[k]])
            Pu = by_condition(beam.plastic_collapse_load_udl, cond[k], L[k], a[k],
                              fm.Mr[mem[k]], fm.w0[mem[k]])
            with np.errstate(divide="ignore", invalid="ignore"):
                Pu = np.where(share[k] > 0, Pu / share[k], np.inf)
            Rp[src] = np.where(carries, Rp[src], Pu)
            arm[src] = np.where(cond[k] == COND_NAMES.index("cantilever"), a[k],
                                np.minimum(a[k], L[k] - a[k]))
            rcond[src] = cond[k]
        else:
            p = src - 2
            Rp[src] = np.where(valid[:, p], first_yield, np.inf)
            # the hinge at the governing station x of the support member (its stations
            # in order), arm min(x, L − x), x from the root of a cantilever
            fa_st = fa[rows]
            for i in range(n):
                m = int(flexure.member[rows][0][i])
                c = int(fr.cond[m])
                xs = [float(fr.pair_sup_x[pair[i], p, st]) for st in range(fa_st.shape[0])]
                arms = [x if COND_NAMES[c] == "cantilever" else min(x, float(fr.L[m]) - x)
                        for x in xs]
                st = _tie_pick_reference([float(v) for v in fa_st[:, i]], arms)
                arm[src, i] = arms[st]
                rcond[src, i] = c
    cols = np.arange(n)
    j = np.array([_tie_pick_reference([float(v) for v in Rp[:, i]],
                                      [float(v) for v in arm[:, i]]) for i in range(n)],
                 dtype=np.int64)
    return np.maximum(Rp.min(axis=0), 0.0), member[j, cols], arm[j, cols], rcond[j, cols]


def _no_hinge_reference(fm: FloorModel, flexure: CandidatesReference,
                        ) -> tuple[np.ndarray, np.ndarray]:
    """Least first-yield force of a member that cannot form a plastic hinge (N, ∞
    none) and that member (−1 none)."""
    n = flexure.unit.shape[1]
    hinge = fm.hinge if fm.hinge is not None else np.ones(fm.frame.n_members, dtype=bool)
    fa = np.where(hinge[flexure.member], np.inf, _allowed(flexure))
    j = np.argmin(fa, axis=0)
    cols = np.arange(n)
    nh_fa = fa[j, cols]
    return nh_fa, np.where(np.isfinite(nh_fa), flexure.member[j, cols], -1)


def web_reference(fm: FloorModel, path: PathResult, bearing: np.ndarray,
                  ) -> tuple[np.ndarray, np.ndarray]:
    """Web local yielding and web crippling resistance (N) of each deck member under
    the load, (2, n) each: the clause functions of :mod:`droprig.solver.capacity`
    point by point, bearing length ``bearing`` (m) at the distance
    max(min(a, L − a) − l_b/2, 0) from the nearer end."""
    s = fm.settings
    mem, a = path.members.T, path.a.T
    L = fm.frame.L[mem]
    dist = np.maximum(np.minimum(a, L - a) - 0.5 * bearing, 0.0)
    out = np.empty((2, *mem.shape))
    lb = np.broadcast_to(bearing, mem.shape)
    for fi, fn in enumerate((capacity.web_local_yielding, capacity.web_crippling)):
        for m in np.unique(mem):
            on = mem == m
            mb = fm.level.members[int(m)]
            out[fi][on] = fn(mb.section, mb.grade, s.design_basis, lb[on], dist[on],
                             s.resistance_factor, s.dynamic_increase_factor)
    return out[0], out[1]
