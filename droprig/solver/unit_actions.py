"""The load-independent actions of the path members at each drop point: the flexure
and shear candidates of every member of the load path (a
:class:`~droprig.solver.linear_checks.Family` each) and the plastic reserve R_p of the
path, plus the web resistances under the load. Written for speed (in-place ufuncs,
candidate-first (C, n) layout, small tables per floor); the formulas are those of
:mod:`droprig.solver.beam` (AISC Manual Table 3-23 by superposition) and
:mod:`droprig.solver.capacity`.

SI units (N, N·m, m)."""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from droprig.solver import beam
from droprig.solver.candidates import CandidateTables
from droprig.solver.floor import FloorModel, existing_moment
from droprig.solver.linear_checks import Family, argmax0
from droprig.solver.loadpath import COND_NAMES, by_condition

if TYPE_CHECKING:
    from droprig.solver.geometry import Geometry

__all__ = ["TIE_REL", "UnitActions", "argmax_nan_low", "peak_station", "tie_pick",
           "unit_actions", "web_resistances"]


@dataclass(frozen=True, eq=False)
class UnitActions:
    """Per drop point, independent of the load: the check families ``flexure`` and
    ``shear`` of the path members; the plastic reserve of the path ``R_p`` (N), the
    member that sets it ``rp_member``, its hinge arm ``rp_arm`` (m) and end
    condition ``rp_cond``; the least force that takes a member unable to form a
    hinge to its flexural resistance ``nh_fa`` (N, ∞ none) and that member
    ``nh_member`` (-1 none). ``derived``: further load-independent check families
    built from these by the chain (the end connections from ``shear``), kept by
    name and taken, tiled and joined along with them."""

    flexure: Family
    shear: Family
    R_p: np.ndarray
    rp_member: np.ndarray
    rp_arm: np.ndarray
    rp_cond: np.ndarray
    nh_fa: np.ndarray
    nh_member: np.ndarray
    derived: dict[str, Family] = field(default_factory=dict, compare=False, repr=False)

    def family(self, name: str, build: Callable[[], Family]) -> Family:
        """The derived family ``name``: ``build()`` the first time it is asked for,
        then kept (it depends on the points, not on the load)."""
        fam = self.derived.get(name)
        if fam is None:
            fam = self.derived[name] = build()
        return fam

    def tiled(self, k: int) -> UnitActions:
        """These actions repeated ``k`` times along the points (one copy per load)."""
        return _made(self.flexure.tiled(k), self.shear.tiled(k),
                     [np.tile(getattr(self, f), k) for f in _PER_POINT],
                     {n: f.tiled(k) for n, f in self.derived.items()})

    def take(self, idx: np.ndarray) -> UnitActions:
        """These actions at the points ``idx`` only (the same values as the actions
        computed at those points: every quantity is per point)."""
        return _made(self.flexure.take(idx), self.shear.take(idx),
                     [getattr(self, f)[idx] for f in _PER_POINT],
                     {n: f.take(idx) for n, f in self.derived.items()})

    @staticmethod
    def concat(parts: Sequence[UnitActions]) -> UnitActions | None:
        """The actions of several sets of points one after the other (``None`` where
        their candidate layouts differ)."""
        flex = Family.concat([p.flexure for p in parts])
        shear = Family.concat([p.shear for p in parts])
        if flex is None or shear is None:
            return None
        derived = {}
        for name in parts[0].derived:
            if all(name in p.derived for p in parts):
                fam = Family.concat([p.derived[name] for p in parts])
                if fam is not None:
                    derived[name] = fam
        return _made(flex, shear, [np.concatenate([getattr(p, f) for p in parts])
                                   for f in _PER_POINT], derived)


_PER_POINT = ("R_p", "rp_member", "rp_arm", "rp_cond", "nh_fa", "nh_member")
"""The plain per-point arrays of :class:`UnitActions`."""


def _made(flexure: Family, shear: Family, per_point: list[np.ndarray],
          derived: dict[str, Family]) -> UnitActions:
    """:class:`UnitActions` from its families and the arrays of :data:`_PER_POINT`
    in that order."""
    R_p, rp_member, rp_arm, rp_cond, nh_fa, nh_member = per_point
    return UnitActions(flexure=flexure, shear=shear, R_p=R_p, rp_member=rp_member,
                       rp_arm=rp_arm, rp_cond=rp_cond, nh_fa=nh_fa, nh_member=nh_member,
                       derived=derived)


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


def unit_actions(fm: FloorModel, geo: Geometry) -> UnitActions:
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
    tb = fm.tables
    assert tb is not None, "a floor prepared by build_floor has its candidate tables"
    pv = _path_view(fm, tb, geo)
    flex, M0, runs = _flexure(fm, tb, pv)
    shear = _shear(fm, tb, pv)
    R_p, rp_member, rp_arm, rp_cond = _plastic_reserve(fm, tb, pv, flex, M0, runs)
    nh_fa, nh_member = _no_hinge(fm, pv, flex)
    ua = UnitActions(flexure=flex, shear=shear, R_p=R_p, rp_member=rp_member,
                     rp_arm=rp_arm, rp_cond=rp_cond, nh_fa=nh_fa, nh_member=nh_member)
    geo.cache["ua"] = ua
    return ua


@dataclass(frozen=True, eq=False)
class _PathView:
    """The path of each point laid out member-first for the kernels: deck members
    ``memT`` (2, n) with their shares, positions a (m), spans L (m) and end
    conditions; the panel of each point ``pair`` (0 off the deck), local reactions
    ``rT`` (4, n); support members ``supm`` (P, n); all source members ``members``
    (2 + P, n)."""

    n: int
    memT: np.ndarray
    shareT: np.ndarray
    aT: np.ndarray
    LT: np.ndarray
    condT: np.ndarray
    pair: np.ndarray
    rT: np.ndarray
    supm: np.ndarray
    members: np.ndarray
    cols: np.ndarray
    R0: np.ndarray
    RL: np.ndarray


def _path_view(fm: FloorModel, tb: CandidateTables, geo: Geometry) -> _PathView:
    fr = fm.frame
    path = geo.path
    n = geo.x.size
    memT = np.ascontiguousarray(path.members.T)  # (2, n)
    pair = np.maximum(path.pair, 0)
    supm = np.take(tb.member, pair, axis=1) if tb.P else np.zeros((0, n), dtype=np.int64)
    aT, LT, condT = np.ascontiguousarray(path.a.T), fr.L[memT], fr.cond[memT]
    R0, RL = by_condition(beam.unit_reactions, condT, LT, aT)
    return _PathView(n=n, memT=memT, shareT=np.ascontiguousarray(path.share.T),
                     aT=aT, LT=LT, condT=condT,
                     pair=pair, rT=np.ascontiguousarray(path.r.T), supm=supm,
                     members=np.concatenate([memT, supm]), cols=np.arange(n), R0=R0, RL=RL)


def _udl_ends(fm: FloorModel) -> tuple[np.ndarray, np.ndarray]:
    """Left reaction (N) and left end moment (N·m) of every member under its existing
    UDL (AISC Manual Table 3-23), kept on the prepared floor."""
    got = fm._memo.get("udl_ends")
    if got is None:
        fr = fm.frame
        r_w, _ = by_condition(beam.udl_reactions, fr.cond, fr.L, fm.w0)
        m_w, _ = by_condition(beam.udl_end_moments, fr.cond, fr.L, fm.w0)
        got = fm._memo["udl_ends"] = (np.asarray(r_w, float), np.asarray(m_w, float))
    return got


def _flexure(fm: FloorModel, tb: CandidateTables, pv: _PathView,
             ) -> tuple[Family, np.ndarray, tuple[tuple[int, int], ...]]:
    """Flexure candidates: deck members (2, S_l stations) then support members (P,
    S kept); the existing moment under the load of each deck member (2, 2, n) and the
    row runs of each source."""
    fr = fm.frame
    n, memT, aT, LT, condT, pair = pv.n, pv.memT, pv.aT, pv.LT, pv.condT, pv.pair
    P = tb.P
    r_w, m_w = _udl_ends(fm)
    x_pk = peak_station(condT, LT, aT, fm.w0[memT], fm.Mr[memT], pv.shareT,
                        _carries_others(fm)[memT], r_u=pv.R0, r_w=r_w[memT],
                        m_w=m_w[memT])
    xs = _loaded_stations(aT[:, None, :], LT[:, None, :], bool(np.any(fr.cond != 0)),
                          x_pk[:, None, :])
    S_l = xs.shape[1]
    S_p = [k.size for k in tb.m_keep]  # stations kept per support member
    C = 2 * S_l + sum(S_p)
    ut = np.empty((C, n))
    Et = np.empty((C, n))
    u = by_condition(beam.unit_moment, condT[:, None, :], LT[:, None, :], xs,
                     aT[:, None, :])
    u *= pv.shareT[:, None, :]
    Rd = fm.Mr[memT][:, None, :]
    np.divide(u, Rd, out=ut[:2 * S_l].reshape(2, S_l, n))
    # existing moment: at the stations that move with the load per point, at the
    # fixed ones (quarter points, ends) from a table per member
    M0 = _loaded_existing_moment(fm, memT, xs[:, _MOVING, :])  # (2, 3, n)
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
        _combine(ut[a0:a1], tb.m_coef[p], tb.m_terms[p], pair, pv.rT)
        ut[a0:a1] /= m_R[p]
        np.take(tb.m_Et[p], pair, axis=1, out=Et[a0:a1])
    flex = Family(ut, Et, pv.members, np.concatenate([fm.Mr[memT], m_R]),
                  np.repeat(np.arange(2 + P), [S_l, S_l, *S_p]), runs)
    return flex, M0, runs


def _shear(fm: FloorModel, tb: CandidateTables, pv: _PathView) -> Family:
    """Shear candidates: deck member ends (rows m0·R0, m1·R0, m0·RL, m1·RL), then
    the two ends of each support member."""
    n, memT, shareT, pair, P = pv.n, pv.memT, pv.shareT, pv.pair, tb.P
    R0, RL = pv.R0, pv.RL
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
        _combine(rows, tb.v_coef[p], tb.v_terms[p], pair, pv.rT)
        rows /= v_R[p]
    np.take(tb.v_Et, pair, axis=1, out=vE[4:])
    return Family(vt, vE, pv.members, np.concatenate([Vd, v_R]),
                  np.array([0, 1, 0, 1] + [2 + p for p in range(P) for _ in range(2)]))


def _plastic_reserve(fm: FloorModel, tb: CandidateTables, pv: _PathView, flex: Family,
                     M0: np.ndarray, runs: tuple[tuple[int, int], ...],
                     ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """R_p of the path for a load at p (N), the member that sets it, its hinge arm (m)
    and end condition. Deck members that carry no other member: the virtual-work
    collapse load of the point load with the member's existing UDL
    (:func:`droprig.solver.beam.plastic_collapse_load_udl`, exact); deck members
    carrying others: the collapse load with M_p − |M_0(a)| for fixed/propped, first
    hinge (= collapse of a determinate member) otherwise; support members: first
    hinge (conservative)."""
    fr = fm.frame
    n, aT, LT, condT, shareT, pair, cols = pv.n, pv.aT, pv.LT, pv.condT, pv.shareT, \
        pv.pair, pv.cols
    P, S = tb.P, tb.S
    assert flex.gmin is not None
    fa_l = flex.gmin[:2]  # (2, n)
    Mp_eff = np.maximum(fm.Mr[pv.memT] - np.abs(M0[:, 0, :]), 0.0)  # under the load
    Pc = by_condition(beam.plastic_collapse_load, condT, LT, aT, Mp_eff)
    with np.errstate(divide="ignore", invalid="ignore"):
        Pc = np.where(shareT > 0, Pc / np.where(shareT > 0, shareT, 1.0), np.inf)
    indeterminate = (condT == COND_NAMES.index("fixed")) | (condT == COND_NAMES.index(
        "propped"))
    Rp_all = np.empty((2 + P, n))
    Rp_all[:2] = np.where(indeterminate, np.maximum(fa_l, Pc), fa_l)
    own = ~_carries_others(fm)[pv.memT]  # existing load: the member's own UDL alone
    if own.any():
        Pu = by_condition(beam.plastic_collapse_load_udl, condT, LT, aT, fm.Mr[pv.memT],
                          fm.w0[pv.memT])
        with np.errstate(divide="ignore", invalid="ignore"):
            Pu = np.where(shareT > 0, Pu / np.where(shareT > 0, shareT, 1.0), np.inf)
        np.copyto(Rp_all[:2], Pu, where=own)
    arm = np.empty((2 + P, n))
    cant = condT == COND_NAMES.index("cantilever")
    arm[:2] = np.where(cant, aT, np.minimum(aT, LT - aT))  # hinge arm (root for a cantilever)
    rp_cond = np.concatenate([condT, fr.cond[pv.supm]])
    for p in range(P):
        a0, a1 = runs[2 + p]
        fa_p = flex.gmin[2 + p]
        Rp_all[2 + p] = np.where(np.take(tb.valid[p], pair), fa_p, np.inf)
        # the governing section among the kept stations pair_sup_x[pair, p, keep]
        # (flat index), ties broken by the shortest arm (tie_pick)
        xst = np.take(fr.pair_sup_x.reshape(-1),
                      (pair * P + p)[None, :] * S + tb.m_keep[p][:, None])  # (K, n)
        Ls = fr.L[pv.supm[p]]
        arms = np.where(rp_cond[2 + p] == COND_NAMES.index("cantilever"), xst,
                        np.minimum(xst, Ls - xst))
        j = tie_pick(flex.fa[a0:a1], fa_p, arms)
        arm[2 + p] = arms[j, cols]
    R_min = Rp_all.min(axis=0)
    jr = tie_pick(Rp_all, R_min, arm)
    return (np.maximum(R_min, 0.0), pv.members[jr, cols], arm[jr, cols],
            rp_cond[jr, cols])


TIE_REL = 1e-9
"""Plastic-reserve candidates (members, stations) whose collapse force lies within
this fraction of the least are taken as tied (the fast kernel and the plain reference
compute them in a different order, a few ulp apart)."""


def tie_pick(V: np.ndarray, V_min: np.ndarray, arm: np.ndarray) -> np.ndarray:
    """Row of each column of ``V`` (k, n) that sets the plastic reserve: of the rows
    within :data:`TIE_REL` of the least ``V_min``, the one with the shortest hinge
    arm ``arm`` (k, n; m) — the larger support rotation for a given deflection,
    conservative — and of equal arms the first (common practice, no source). The
    same rule in :func:`droprig.solver.reference.unit_actions_reference`."""
    tied = V <= V_min + TIE_REL * np.abs(V_min)
    tied |= V == V_min  # (∞ and NaN-free equality where V_min is ∞)
    return np.argmin(np.where(tied, arm, np.inf), axis=0)


def _carries_others(fm: FloorModel) -> np.ndarray:
    """Per member: do other members rest on it (existing loads at its nodes)?"""
    got = fm._memo.get("carries_mask")
    if got is None:
        fr = fm.frame
        got = fm._memo["carries_mask"] = np.array(
            [fr.nodes_on[k].size > 0 for k in range(fr.n_members)], dtype=bool)
    return got


def _no_hinge(fm: FloorModel, pv: _PathView, flex: Family) -> tuple[np.ndarray, np.ndarray]:
    """Members that cannot form a plastic hinge: the least force that takes one of
    them to its flexural resistance (N; ∞ where the path has none) and that member
    (-1 none)."""
    nh_fa = np.full(pv.n, np.inf)
    nh_member = np.full(pv.n, -1, dtype=np.int64)
    hinge = fm.hinge
    if hinge is not None and not bool(np.all(hinge)):
        assert flex.gmin is not None
        g_nh = np.where(hinge[pv.members], np.inf, flex.gmin)  # (K, n)
        jn = np.argmin(g_nh, axis=0)
        nh_fa = g_nh[jn, pv.cols]
        nh_member = pv.members[jn, pv.cols]
    return nh_fa, nh_member


def _runs(lens: Sequence[int]) -> tuple[tuple[int, int], ...]:
    """(start, stop) of consecutive runs of rows of the given lengths (the flexure
    rows of each source: two deck members, then the support members)."""
    ends = np.cumsum(lens).tolist()
    return tuple((e - k, e) for e, k in zip(ends, lens, strict=True))


def _loaded_stations(a: np.ndarray, L: np.ndarray, ends: bool,
                     peak: np.ndarray | None = None) -> np.ndarray:
    """Stations along a deck-supporting member where the moment can peak under a
    point load at a plus a uniform load: under the load, the quarter points, halfway
    between the load and midspan, the peak station ``peak`` (:func:`peak_station`;
    under the load where not given), and the ends when a member has a fixed end;
    stacked along the second axis of ``a`` (shape (2, 1, n) → (2, 6 or 8, n)), m."""
    cols = [a, 0.25 * L, 0.5 * L, 0.75 * L, 0.5 * (a + 0.5 * L),
            a if peak is None else peak]
    if ends:
        cols += [0.0 * a, L + 0.0 * a]
    return np.concatenate(np.broadcast_arrays(*cols), axis=1)


_MOVING = (0, 4, 5)
"""The stations of :func:`_loaded_stations` that move with the load (under it,
halfway between it and midspan, and the peak station); the others are fixed on the
member."""

_S_PLAIN = 6
"""Stations of :func:`_loaded_stations` without the ends."""


def peak_station(cond: np.ndarray, L: np.ndarray, a: np.ndarray, w: np.ndarray,
                 Mr: np.ndarray, share: np.ndarray, carries: np.ndarray, *,
                 r_u: np.ndarray | None = None, r_w: np.ndarray | None = None,
                 m_w: np.ndarray | None = None) -> np.ndarray:
    """Where the sagging moment of a deck member peaks at the point load that just
    takes it to its flexural resistance, m: the station at which the linear check
    (demand = F·u(x) + E(x)) allows exactly the force of the exact peak, so that the
    flexure check's allowed force is never above the exact one.

    Under a point load P at a plus the member's existing UDL w (N/m), on every end
    condition M(x) = c0 + c1·x − w·x²/2 on each side of the load (AISC Manual
    15th ed. Table 3-23 by superposition; Roark 7th ed. Table 8.1): left of a
    c0 = P·M0u + M0w, c1 = P·R0u + R0w; right of a c0 = P·(M0u + a) + M0w,
    c1 = P·(R0u − 1) + R0w, with (R0u, M0u) the unit load's and (R0w, M0w) the
    UDL's left reaction and end moment. Inside a side M peaks where V = 0, at
    x* = c1/w, with M* = c0 + c1²/(2w) (statics). M* = Mr is a quadratic in P,
    (β²/2w)·P² + (α + β·R0w/w)·P + (M0w + R0w²/2w − Mr) = 0 (α, β: c0's and c1's
    coefficients of P), whose larger root is the least P ≥ 0 at which the side's
    peak reaches Mr; a side whose x* then lies outside it peaks at its ends (the
    other stations). The side with the lesser such P gives x*; under the load (a)
    where no side qualifies, where w ≤ 0, on a cantilever (hogging, its peak at the
    root) and on members that carry others (their existing moment is not a
    parabola; the other stations stand). ``share``: the member's share of the
    force (only its sign is used: a member without a share keeps a). ``r_u``, ``r_w``,
    ``m_w``: R0u, R0w, M0w where already known. Arrays broadcast; SI units (m, N/m,
    N·m)."""
    if r_u is None:
        r_u, _ = by_condition(beam.unit_reactions, cond, L, a)
    m_u, _ = by_condition(beam.unit_end_moments, cond, L, a)
    if r_w is None:
        r_w, _ = by_condition(beam.udl_reactions, cond, L, w)
    if m_w is None:
        m_w, _ = by_condition(beam.udl_end_moments, cond, L, w)
    ok = (w > 0.0) & (share > 0.0) & ~carries & (cond != COND_NAMES.index("cantilever"))
    ws = np.where(ok, w, 1.0)
    best_P = np.full(np.shape(a), np.inf)
    x_best = np.array(a, dtype=float, copy=True)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        for alpha, beta, lo, hi in ((m_u, r_u, 0.0 * a, a), (m_u + a, r_u - 1.0, a, L)):
            qa = beta * beta / (2.0 * ws)
            qb = alpha + beta * r_w / ws
            qc = m_w + r_w * r_w / (2.0 * ws) - Mr
            root = np.sqrt(np.maximum(qb * qb - 4.0 * qa * qc, 0.0))
            # the larger root, in the form that keeps its digits (qa may be 0)
            P = np.where(qb > 0.0, -2.0 * qc / (qb + root), (root - qb) / (2.0 * qa))
            x = (beta * P + r_w) / ws
            use = ok & (qc <= 0.0) & np.isfinite(P) & (P >= 0.0) & (x >= lo) & (x <= hi) \
                & (P < best_P)
            best_P = np.where(use, P, best_P)
            x_best = np.where(use, x, x_best)
    return x_best


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
            x = _loaded_stations(np.zeros((1, 1, 1)), L[:, None, None],
                                 S_l > _S_PLAIN)[0, :, 0]
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


def argmax_nan_low(D: np.ndarray) -> np.ndarray:
    """Row of the largest entry of each column of ``D`` (k, n), a NaN counting as
    lowest (first of equal maxima)."""
    if np.isnan(D).any():
        return np.argmax(np.where(np.isnan(D), -np.inf, D), axis=0)
    return argmax0(D, D.max(axis=0))


def web_resistances(fm: FloorModel, fns: Sequence[Callable[..., np.ndarray]],
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
    values (a bearing length per load and mat thickness): the distinct values of a
    sample of ``b`` (every k-th value), each value of ``b`` looked up among them by
    bisection and the lookup verified exactly; where a value is missing from the
    sample (or there are more than ``limit``), ``np.unique`` of every point."""
    if b.size == 0 or np.isnan(b).any():
        return np.unique(b, return_inverse=True)
    u = np.unique(b[::max(1, b.size // 64)])
    if u.size <= limit:
        inv = np.minimum(np.searchsorted(u, b), u.size - 1)
        if np.array_equal(u[inv], b):
            return u, inv
    return np.unique(b, return_inverse=True)
