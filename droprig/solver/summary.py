"""Per-bay summaries of a case: the worst point of each column bay and what the bay
needs, as data (:class:`Advice`; the words are written at the edges by
:mod:`droprig.advice`).

SI units (m, N/m)."""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, replace

import numpy as np

from droprig.model import (
    STRIKE_ORIENTATIONS,
    Level,
    LiftLoad,
    LiftZone,
    ProtectionArea,
    Rect,
    bays,
    limit_is_practical,
)
from droprig.solver import droppoints, impact
from droprig.solver.floor import remember
from droprig.solver.results import (
    CHECKS,
    DECK,
    ELASTIC,
    EXCEEDS,
    LIMIT_MARGIN,
    PERFORATES,
    PLASTIC,
    RESPONSES,
    AdviceKind,
    BaySummary,
    CaseResult,
    severity,
)

__all__ = ["MAX_MAT_TRAVEL", "MIN_USEFUL_HEIGHT", "Advice", "bay_advice",
           "perforation_limit", "summarise", "without_hook_limit",
           "without_limit_under_pads"]

MIN_USEFUL_HEIGHT = 0.05
"""A drop height below this (m) is not offered as advice: it cannot be controlled on
site (common practice, no source)."""
MAX_MAT_TRAVEL = 0.3
"""A spring mat is only offered when it need not compress more than this (m): the
thickness of a stack of timber crane mats (common practice, no source)."""


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


def offered_limit(h: float, h_elastic: float | None) -> tuple[float, bool]:
    """A height limit ``h`` (m) as the permit offers it, and whether it lets members
    yield (then it needs the engineer's sign-off): it yields where it is more than 1 %
    above the elastic allowable height ``h_elastic`` (m; ``None``: no elastic height).
    Offered as elastic, it keeps the margin on the elastic height, at most
    :data:`LIMIT_MARGIN` × ``h_elastic`` — never up to 1 % above it (a limit 0.9 × the
    plastic height read 0.151 m beside an elastic 0.1499 m on the two-level demo,
    with no margin left for the places between the drop points; common practice, no
    source). The one rule of :func:`bay_advice` and of the permit's limit over a deck
    the load may go through."""
    if h_elastic is None or h > 1.01 * h_elastic:
        return h, True
    return min(h, LIMIT_MARGIN * float(h_elastic)), False


def without_limit_under_pads(s: BaySummary, pads: Sequence[ProtectionArea],
                             rect: Rect) -> BaySummary:
    """The bay summary ``s`` (of the bay ``rect``) with a drop-height limit dropped
    where no hook limit is practical: the pads and mats of ``pads`` the bay's drop
    points lie on (``s.protections``) whose top stands at or above the limit cover
    the whole bay (:func:`droprig.model.limit_is_practical`), so the load would have
    to pass every part of it with its underside below a pad's top. Where they cover
    part of it, the limit stays: the load is kept off those pads there (the permit
    says so, :func:`droprig.permit.derive_conditions`; the confirmation's trials
    already leave out the places on such a pad, :mod:`droprig.solver.confirm`).
    ``limit_or_mat`` becomes ``mat``, ``limit_height`` ``keep_clear``; a deck the load
    may go through keeps its advice without a limit (the permit then excludes the
    bay). Common practice, no source. Until stop 33 any such pad on the bay took the
    limit away: the steel demo's plywood pad over 3-4/B-C, reaching 0.3 m into the
    five bays around it, kept the joist bundle and the spreader bar off them."""
    if s.height_limit is None:
        return s
    mine = [pa for pa in pads if pa.id in s.protections]
    if limit_is_practical(mine, rect, s.height_limit):
        return s
    return _without_limit(s)


def without_hook_limit(s: BaySummary) -> BaySummary:
    """The summary ``s`` of a bay of the level below a perforated deck (the load comes
    through the deck above, :func:`droprig.solver.analysis.cascade_down`) without a
    drop-height limit: the object strikes this level at the speed the perforation above
    leaves it (its equivalent height is that fall's, not a planned one), so no hook
    limit controls it — "limit the drop height to 0.104 m" there read as a condition
    nobody can keep (the two-level demo's level L3). ``limit_or_mat`` becomes ``mat`` (a
    mat or catch deck laid on this level still works), ``limit_height`` ``keep_clear``;
    a deck the object may go through keeps its advice without a limit. Common
    practice, no source."""
    return s if s.height_limit is None else _without_limit(s)


def _without_limit(s: BaySummary) -> BaySummary:
    """``s`` with its drop-height limit taken away: ``limit_or_mat`` becomes ``mat``,
    ``limit_height`` ``keep_clear``, any other advice stays (without a limit)."""
    kind: AdviceKind = ("mat" if s.advice_kind == "limit_or_mat" else "keep_clear"
                        if s.advice_kind == "limit_height" else s.advice_kind)
    return replace(s, advice_kind=kind, height_limit=None, height_limit_yields=False,
                   height_limit_x=None, height_limit_y=None, height_limit_check="")


def perforation_limit(h_local: float | None, h_plastic: float | None,
                      h_elastic: float | None) -> tuple[float | None, bool]:
    """The hook limit offered over a bay where a hard load, dropped as planned, may
    go through the deck (m on the datum; ``None``: no practical limit, the bay is kept
    clear), and whether members may yield under it.

    h_lim = :func:`offered_limit`\\ (:data:`LIMIT_MARGIN` · min(h_local, h_struct),
    h_elastic), offered from :data:`MIN_USEFUL_HEIGHT` up, where ``h_local`` is the
    least drop height at which scabbing or perforation starts in the bay and
    ``h_struct`` the framing's allowable height beyond yield (``h_plastic``), else its
    elastic one (``h_elastic``); either missing: no limit. Below it the deck stays
    whole and the framing within its limits. One meaning for ``height_limit`` on
    every advice: the limit the permit prints (:func:`droprig.permit.
    derive_conditions`); until stop 30 this bay's field held 0.9 · h_local alone and
    the permit took the framing's part on top (the steel demo's spreader bar in
    3-4/B-C: 1.552 m in the results against the 0.547 m printed). The 90 % margin:
    :data:`LIMIT_MARGIN` (common practice, no source)."""
    h_struct = h_plastic if h_plastic is not None else h_elastic
    if h_local is None or h_struct is None:
        return None, False
    h, yields = offered_limit(LIMIT_MARGIN * min(float(h_local), float(h_struct)),
                              h_elastic)
    return (h, yields) if h >= MIN_USEFUL_HEIGHT else (None, False)


def bay_advice(resp: int, n_opening: int, h_allow: float | None, k_mat: float | None,
               mat_travel: float | None = None, h_elastic: float | None = None,
               h_local: float | None = None, h_plastic: float | None = None) -> Advice:
    """What one bay needs: no protection, a drop-height limit of :data:`LIMIT_MARGIN`
    × ``h_allow`` (offered from :data:`MIN_USEFUL_HEIGHT` up, and only when the bay
    exceeds its limits), a spring mat no stiffer than :data:`LIMIT_MARGIN` × ``k_mat``
    (offered while it need not compress more than :data:`MAX_MAT_TRAVEL`; ``mat_travel``
    is its compression), acceptance of yielding with the engineer's
    approval, or an exclusion zone (deck opening, or no option found).
    ``height_limit_yields``: the height limit lets members yield (it exceeds the
    elastic height ``h_elastic`` by more than 1 %). A hard load that perforates the
    deck makes the level below an exclusion zone (``level_below``); its hook limit is
    :func:`perforation_limit` (the deck stays whole *and* the framing within its
    limits). SI units (m, N/m)."""
    if n_opening:
        return Advice("opening")
    if resp == PERFORATES:
        hl, yields = perforation_limit(h_local, h_plastic, h_elastic)
        return Advice("level_below", height_limit=hl, height_limit_yields=yields)
    if resp == ELASTIC:
        return Advice("none")
    h: float | None = None
    yields = False
    if h_allow is not None and LIMIT_MARGIN * h_allow >= MIN_USEFUL_HEIGHT and \
            resp == EXCEEDS:
        h, yields = offered_limit(LIMIT_MARGIN * float(h_allow), h_elastic)
        if h < MIN_USEFUL_HEIGHT:
            h = None
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


def summarise(level: Level, zone: LiftZone, load: LiftLoad, case: CaseResult,
              allowed_force: np.ndarray, level_below: str | None = None,
              protection_ids: Sequence[str] = ()) -> list[BaySummary]:
    """One :class:`BaySummary` per bay that holds drop points of ``case``
    (``allowed_force``: the elastic F_allow of each point, N; ``level_below``: id of
    the level under this one, if the project holds it; ``protection_ids``: the ids of
    ``project.protection_areas``). A point on a shared grid line or at a column counts
    for every bay it touches (closed bays). All bays are reduced at once over a (bay,
    point) membership matrix (:func:`_membership`, :func:`_bay_stats`). Each quantity
    is reported with the point and the check that set it (the least allowable height
    need not come from the point of largest utilisation)."""
    all_bays = _bays(level)
    if case.x.size == 0 or not all_bays:
        return []
    M = _membership(level, case)
    st = _bay_stats(M, case)
    return [_bay_summary(level, all_bays[b].id, zone, load, case, M, st, int(b), level_below,
                         protection_ids)
            for b in np.flatnonzero(st.count)]


def _membership(level: Level, case: CaseResult) -> np.ndarray:
    """(bays, n) bool: point i lies in bay b (closed, within
    :data:`droppoints.EDGE_TOL` of its grid lines; b = j·nx + i, as
    :func:`droprig.model.bays` numbers them)."""
    g = level.grid
    xl, yl = np.asarray(g.x_lines, float), np.asarray(g.y_lines, float)
    tol = droppoints.EDGE_TOL
    x, y = case.x, case.y
    Mx = (x >= xl[:-1, None] - tol) & (x <= xl[1:, None] + tol)  # (nx, n)
    My = (y >= yl[:-1, None] - tol) & (y <= yl[1:, None] + tol)  # (ny, n)
    return (My[:, None, :] & Mx[None, :, :]).reshape(-1, x.size)  # (bays, n)


def _least(M: np.ndarray, v: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Smallest value per bay of ``v`` (per point), the point that has it, and whether
    any point of the bay has none (nan)."""
    vm = np.where(M, np.where(np.isnan(v), np.inf, v), np.inf)
    return vm.min(axis=1), vm.argmin(axis=1), (M & np.isnan(v)).any(axis=1)


def _bay_min(M: np.ndarray, v: np.ndarray) -> np.ndarray:
    """Least of ``v`` over each bay's points, NaN left out (inf where none)."""
    return np.where(M, np.where(np.isnan(v), np.inf, v), np.inf).min(axis=1)


@dataclass(frozen=True, eq=False)
class _BayStats:
    """Per-bay reductions of a case over the membership matrix (arrays over bays):
    points ``count``; the first worst point ``gov`` (by severity) and worst response
    ``worst``; the largest utilisation ``U_max`` (−inf none) and its point ``u_at``;
    the least elastic / plastic allowable height and allowable mass (value, point,
    any none: ``h_el*``, ``h_pl*``, ``m_al*``); the stiffest mat for the whole bay
    ``k_min`` (N/m), whether it is offered ``k_ok`` and its compression ``travel``
    (m, −inf none); openings ``n_open``; ``scab``, ``extrap``; least scabbing and
    perforation heights (m, inf none); deepest dent (m, −inf none) and least dent
    height (m, inf none)."""

    count: np.ndarray
    gov: np.ndarray
    worst: np.ndarray
    U_max: np.ndarray
    u_at: np.ndarray
    h_el: tuple[np.ndarray, np.ndarray, np.ndarray]
    h_pl: tuple[np.ndarray, np.ndarray, np.ndarray]
    m_al: tuple[np.ndarray, np.ndarray, np.ndarray]
    k_ok: np.ndarray
    k_min: np.ndarray
    travel: np.ndarray
    n_open: np.ndarray
    scab: np.ndarray
    extrap: np.ndarray
    h_scab: np.ndarray
    h_perf: np.ndarray
    dent: np.ndarray
    h_dent: np.ndarray


def _bay_stats(M: np.ndarray, case: CaseResult) -> _BayStats:
    """:class:`_BayStats` of ``case`` over the (bays, n) membership ``M``."""
    sev = severity(case.utilisation, case.response)
    U = case.utilisation
    U_m = np.where(M, np.where(np.isnan(U), -np.inf, U), -np.inf)
    # the stiffest mat laid over the whole bay that keeps every point of it elastic
    # (η = 1 under a mat, so points that stay elastic on bare deck count as well)
    # (offered where no pad lies: a mat does not replace a pad's design)
    kv = case.required_mat_stiffness
    k_ok = ~(M & (np.isnan(kv) | (case.protection >= 0))).any(axis=1)
    k_min = np.where(M, kv, np.inf).min(axis=1)
    return _BayStats(
        count=M.sum(axis=1),
        gov=np.argmax(np.where(M, sev, -np.inf), axis=1),  # first worst point per bay
        worst=np.where(M, case.response, -1).max(axis=1),
        U_max=U_m.max(axis=1), u_at=U_m.argmax(axis=1),
        h_el=_least(M, case.allowable_drop_height),
        h_pl=_least(M, case.allowable_drop_height_plastic),
        m_al=_least(M, case.allowable_mass),
        k_ok=k_ok, k_min=k_min, travel=_mat_travel(M, case, k_ok, k_min),
        n_open=(M & (case.governing_check == CHECKS.index("opening"))).sum(axis=1),
        scab=(M & case.scabbing).any(axis=1),
        extrap=(M & case.local_extrapolated).any(axis=1),
        h_scab=_bay_min(M, case.scabbing_height),
        h_perf=_bay_min(M, case.perforation_height),
        # steel plate decks: the deepest dent and the least height of the dent limit
        dent=np.where(M, np.where(np.isnan(case.dent_depth), -np.inf, case.dent_depth),
                      -np.inf).max(axis=1),
        h_dent=_bay_min(M, case.dent_height))


def _mat_travel(M: np.ndarray, case: CaseResult, k_ok: np.ndarray,
                k_min: np.ndarray) -> np.ndarray:
    """How far the mat offered to each bay (:data:`LIMIT_MARGIN` × ``k_min``, N/m)
    compresses: F/k at each point with the mat in series (Gere §9.10, η = 1 under a
    mat), the largest over the bay (m; −inf where no mat is offered)."""
    travel_all = np.full(k_min.shape, -np.inf)
    fs_pts = case.structure_compliance
    for b in np.flatnonzero(k_ok & np.isfinite(k_min) & (k_min > 0)):
        sel = M[b]
        k_adv = LIMIT_MARGIN * k_min[b]  # the mat offered (bay_advice)
        f_pts = (fs_pts[sel] if fs_pts is not None else 0.0) + 1.0 / k_adv
        _, F_pts, _ = impact.impact_elastic(case.weight, case.drop_height[sel], f_pts, 1.0)
        travel_all[b] = float(np.max(F_pts)) / k_adv
    return travel_all


def _local_damage_start(m: np.ndarray, case: CaseResult) -> tuple[str, int]:
    """Which local damage starts at the least drop height among the points ``m`` of a
    bay (``"perforation"`` or ``"scabbing"``; the perforation where both start at the
    same height, the worse of the two) and the point where it does."""
    hs = np.where(m & ~np.isnan(case.scabbing_height), case.scabbing_height, np.inf)
    hp = np.where(m & ~np.isnan(case.perforation_height), case.perforation_height, np.inf)
    i_s, i_p = int(np.argmin(hs)), int(np.argmin(hp))
    return ("perforation", i_p) if hp[i_p] <= hs[i_s] else ("scabbing", i_s)


def _limit_source(adv: Advice, wst: int, h_local: float | None, he: float | None,
                  hp: float | None, ih: int, ihp: int, m: np.ndarray,
                  case: CaseResult) -> tuple[str, int]:
    """The check and point (index into ``case``) that set the limit ``adv`` offers
    over a bay (``""`` where none): for a perforating load the deck's local damage
    (where it starts lowest, :func:`_local_damage_start`), the framing's height
    beyond yield (``hp`` at ``ihp``), or — the margin kept on it,
    :func:`offered_limit` — its elastic height (``he`` at ``ih``), whichever the
    limit came from; ``m`` the bay's points."""
    h_chk = case.allowable_height_check
    hp_chk = case.allowable_height_plastic_check
    by_plastic = wst == EXCEEDS or (wst == PERFORATES and hp is not None)
    if wst == PERFORATES and adv.height_limit is not None and he is not None and \
            adv.height_limit < LIMIT_MARGIN * min(h_local or math.inf, hp or math.inf):
        by_plastic = False  # the margin on the elastic height set it
    lim_at = ihp if by_plastic else ih
    if adv.height_limit is None:
        return "", lim_at
    if wst == PERFORATES and h_local is not None and \
            adv.height_limit == LIMIT_MARGIN * h_local:
        return _local_damage_start(m, case)
    if by_plastic and hp_chk is not None and int(hp_chk[ihp]) >= 0:
        return CHECKS[int(hp_chk[ihp])], lim_at
    return (CHECKS[int(h_chk[lim_at])] if h_chk is not None else ""), lim_at


def _bay_summary(level: Level, bay_id: str, zone: LiftZone, load: LiftLoad,
                 case: CaseResult, M: np.ndarray, st: _BayStats, b: int,
                 level_below: str | None, protection_ids: Sequence[str]) -> BaySummary:
    """The :class:`BaySummary` of bay ``b`` (row of ``M`` and ``st``)."""
    members = level.members

    def mname(gm: int) -> str:
        return "deck" if gm == DECK else members[gm].id

    h_el, h_el_at, h_el_none = st.h_el
    h_pl, h_pl_at, h_pl_none = st.h_pl
    m_al, m_al_at, m_al_none = st.m_al
    h_chk = case.allowable_height_check
    h_mem = case.allowable_height_member
    prot = case.protection
    i = int(st.gov[b])
    wst = int(st.worst[b])
    u_b = float(st.U_max[b])
    u_b = u_b if u_b > -np.inf else float("inf")
    iu = int(st.u_at[b])
    he = None if h_el_none[b] else float(h_el[b])
    hp = None if h_pl_none[b] else float(h_pl[b])
    ih, ihp = int(h_el_at[b]), int(h_pl_at[b])
    k_mat = float(st.k_min[b]) if st.k_ok[b] and wst != ELASTIC else None
    travel = float(st.travel[b]) if k_mat is not None and \
        math.isfinite(float(st.travel[b])) and st.travel[b] > 0 else None
    gm = int(case.governing_member[i])
    hs = float(st.h_scab[b]) if np.isfinite(st.h_scab[b]) else None
    hpf = float(st.h_perf[b]) if np.isfinite(st.h_perf[b]) else None
    h_local = min((v for v in (hs, hpf) if v is not None), default=None)
    adv = bay_advice(wst, int(st.n_open[b]), hp if wst == EXCEEDS else he, k_mat, travel, he,
                     h_local, hp)
    so = int(case.strike_orientation[i])
    lim_chk, lim_at = _limit_source(adv, wst, h_local, he, hp, ih, ihp, M[b], case)
    pads = [int(p) for p in np.unique(prot[M[b] & (prot >= 0)])]  # sorted
    return BaySummary(
        level_id=level.id, bay_id=bay_id, zone_id=zone.id,
        load_name=load.name, n_points=int(st.count[b]), max_utilisation=u_b,
        response=RESPONSES[wst], allowable_drop_height=he,
        allowable_drop_height_plastic=hp, governing_x=float(case.x[i]),
        governing_y=float(case.y[i]),
        governing_member=mname(gm),
        governing_check=CHECKS[int(case.governing_check[i])], advice_kind=adv.kind,
        height_limit=adv.height_limit, height_limit_yields=adv.height_limit_yields,
        mat_stiffness_max=adv.mat_stiffness_max, mat_travel=adv.mat_travel,
        planned_drop_height=case.planned_drop_height,
        utilisation_x=float(case.x[iu]), utilisation_y=float(case.y[iu]),
        utilisation_member=mname(int(case.utilisation_member[iu])),
        utilisation_check=CHECKS[int(case.utilisation_check[iu])],
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
        allowable_mass_y=None if m_al_none[b] else float(case.y[int(m_al_at[b])]),
        scabbing=bool(st.scab[b]), scabbing_height=hs, perforation_height=hpf,
        local_extrapolated=bool(st.extrap[b]),
        strike_orientation=STRIKE_ORIENTATIONS[so] if so >= 0 else None,
        level_below=level_below,
        dent_depth=float(st.dent[b]) if np.isfinite(st.dent[b]) else None,
        dent_height=float(st.h_dent[b]) if np.isfinite(st.h_dent[b]) else None)


_BAYS: dict[Level, tuple] = {}


def _bays(level: Level) -> tuple:
    """:func:`droprig.model.bays`, remembered for the last few levels."""
    return remember(_BAYS, level, lambda: bays(level))


