"""Every limit a bay summary offers, confirmed by the forward chain before it is printed.

The inverse answers of :mod:`droprig.solver.chain` (allowable heights, the stiffest
mat) are derived point by point from the forward model, and the bay takes the least
of them over its drop points. Two things can still make a printed condition fail
when it is followed: a drop point between the sampled ones, and any part of the
forward model a closed form does not follow exactly. So each condition a bay offers
is *tried*: the forward chain is run with it applied — the load dropped from the
offered height, or the offered mat laid under it — at every drop point of the bay,
at points refined around the worst of them (as :mod:`droprig.solver.refine` does
for the analysis), at points a hair inside both ends of every member line of the bay
with lattices around them (:func:`_line_ends`: beside a member's end the load path
changes within centimetres, and the least answer can lie between the analysis points
in a panel whose analysis points are far from failing) and at cuts of the stretches
between neighbouring points whose
answers change steeply (:class:`_Stretches`: a limit that falls between two sample
points is looked for where it can hide). A condition that leaves the bay beyond its
limits steps back to the least of :data:`CONFIRM_STEP` × itself and
:data:`LIMIT_MARGIN` × the least inverse answer of the trial's own points, and is
tried again, up to
:data:`CONFIRM_ROUNDS` times; one that never works is withdrawn (the bay then reads
keep clear, or takes another option). Issue 13's closed loop, in the solver.

A bay's allowable mass (the heaviest load that keeps it elastic from the planned
height) is tried the same way: the load run at that mass, as hard as it is, so a
trial that perforates the deck fails (a hard load's mass is first held below the
mass that perforates bare deck, :func:`droprig.solver.local_damage.perforation_mass`);
a failed mass steps back to :data:`MASS_STEP` × itself, or lower where its worst
point's U asks for it (:func:`_mass_step_back`), and is left out after
:data:`CONFIRM_ROUNDS`.

Before the bays, each drop point's own plastic allowable height (printed on the
calculation sheets and in the per-point outputs) is tried the same way at
:data:`CONFIRM_FACTORS` × itself and falls back to the elastic one where it exceeds
(:func:`confirm_point_heights`). :func:`confirm_zone` runs both stages; they are the
only confirmation of a limit: a trial's own inverse answers (with dynamic
amplification, the elastic height re-run at that height,
:func:`droprig.solver.chain.confirm_amplified_height`) are not confirmed again
(``Drop.trial``) — they only guide the next trial value, which is itself tried.

All trials of a zone run together, one vectorised pass per round (each drop point
carries its own trial height and mat: :class:`droprig.solver.chain.Drop`), through
the chain's own :data:`~droprig.solver.chain.STEPS` with the project's settings
(dynamic amplification and tilted landing included). A trial at a drop point of the
analysis takes that point's load path and member actions from the analysis
(:func:`droprig.solver.geometry.take_geo`) rather than working them out again. The
trials judge the structural response alone (``hard=False``): the deck's local
damage by a hard load has its own allowable heights. SI units (m, N/m).
"""

from __future__ import annotations

import copy
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

import numpy as np

from droprig.model import Deck, LiftLoad, LiftZone, Project, Rect, bays
from droprig.solver import cancel, droppoints, evaluate
from droprig.solver.floor import FloorModel
from droprig.solver.geometry import (
    Geometry,
    concat_geo,
    point_geometry,
    take_geo,
)
from droprig.solver.loadpath import locate
from droprig.solver.local_damage import impact_speed, is_hard, perforation_mass
from droprig.solver.results import (
    ELASTIC,
    EXCEEDS,
    LIMIT_MARGIN,
    PLASTIC,
    RESPONSES,
    BaySummary,
    severity,
)
from droprig.solver.summary import bay_advice
from droprig.solver.unit_actions import unit_actions

__all__ = [
    "BISECT_LEVELS",
    "BISECT_RATIO",
    "BISECT_TOP",
    "CONFIRM_FACTORS",
    "CONFIRM_REFINE",
    "CONFIRM_REFINE_LAST",
    "CONFIRM_ROUNDS",
    "CONFIRM_SPAN",
    "CONFIRM_STEP",
    "CONFIRM_U",
    "LINE_END",
    "confirm_bay_limits",
    "confirm_point_heights",
    "confirm_zone",
]

CONFIRM_STEP = 0.8
"""A condition that fails its trial steps back to at most this fraction of itself."""
CONFIRM_ROUNDS = 6
"""Trials per condition before it is withdrawn (0.8⁶ ≈ 0.26 of the first offer)."""
CONFIRM_REFINE = (1, 1)
"""Points per deck panel of each trial around which each refinement pass lays a
5 × 5 lattice (spacing the zone's grid resolution ÷ 4, ÷ 16)."""

LINE_END = 1e-3
"""A hair, as a multiple of the grid resolution (0.5 mm on a 0.5 m grid): the first
trial run also drops the load this far inside both ends of every member line of the
bay (:func:`_line_ends`), whatever the answers of the analysis points around them,
and the panels' lattices (:func:`_refine`) centre on those points as on any other.
Why: a trial starts from the analysis points whose own answer is within
:data:`CONFIRM_SPAN` (:data:`MASS_SPAN`) of the condition, so a panel whose analysis
points are all far from failing gets no lattice — yet beside a member's end (a
column, the member it frames into) the load path changes within centimetres and the
answer can fall sharply between the grid points: the two-level demo's hook block
read U 1.14 at its printed allowable mass 9 cm along girder GA/2-3 from column 2/A
and 5 cm beside it (17 kg allowed there against ≥ 50 kg at the panel's analysis
points); and before the impulse bound a random floor with dynamic amplification read
U 0.20 over a column and 1.017 0.1 mm along the girder beside it."""

CONFIRM_REFINE_LAST = 1
"""Points of each trial (its worst over the whole bay, not per panel) around which a
third refinement pass lays a 5 × 5 lattice of spacing the grid resolution ÷ 64: a
peak a few centimetres wide beside a member's end reads lower at a lattice step of
÷ 16 (the two-level demo's hook block beside girder GA/2-3 near column 2/C: U 1.029
on a 1 cm lattice at a mass whose ÷ 16 lattice read at most 0.98)."""

CONFIRM_SPAN = 4.0
"""A trial starts from the bay's analysis points whose own inverse answer (allowable
height, stiffest mat) is at most this multiple of the condition tried: a point whose
answer is four times the condition is far from failing it (its utilisation at the
condition is about ½ or less; Gere §9.10, F ∝ √h for h ≫ δst). Refinement then
searches around the worst of them."""

CONFIRM_U = 0.98
"""An elastic condition (height or mat) is confirmed only where its trial keeps every
sampled point at U ≤ 0.98: the sampled points bracket the bay's maxima within a
lattice of the grid resolution ÷ 16, and a smooth U field can rise between them by a
small fraction (a footprint cut at a deck edge: 1.0001 between points when 1.0 was
the largest sampled value). Common practice, no source: a limit on a permit is kept
a little inside the value that just works."""

CONFIRM_FACTORS = (0.99, 1.0)
"""Fractions of a drop point's plastic allowable height at which the forward chain
must not exceed before the height is reported (issue 16: evaluated at 0.99 × the
height)."""

_FIELD = {"elastic": "allowable_drop_height", "plastic": "allowable_drop_height_plastic",
          "mat": "required_mat_stiffness", "mass": "allowable_mass"}
"""The inverse answer of each kind of condition, per drop point."""

BISECT_RATIO = 1.5
"""Two neighbouring points whose answers to a condition differ by more than this
factor mark a steep stretch (:class:`_Stretches`): half again over one lattice step
is steep for the smooth part of the response (U ∝ √h for h ≫ δst, Gere §9.10: a
factor 1.5 in height is 1.22 in U) and marks an edge, a switch of check or of
branch. Common practice, no source."""
BISECT_NEAR = 1.5
"""A steep stretch is cut only where its lower answer is below this multiple of the
trial value (:func:`_danger`): elsewhere a dip would have to fall by more than a
third below the lower end within one lattice step to fail the trial."""
BISECT_RHO_MAX = 4.0
"""The change across a stretch that :func:`_danger` carries on past its lower end
is taken at most this factor (a point with no limit beside one with a limit)."""
BISECT_TOP = 4
"""Stretches of each trial cut at each level after the first (:class:`_Stretches`):
its most dangerous ones (a cost bound, stated in the class docstring)."""
BISECT_PIECES = 4
"""Pieces a dangerous stretch is cut into at each level after the first."""
BISECT_LEVELS = 3
"""Levels of cutting after the first (:class:`_Stretches`), each with a refinement
pass of :func:`_run` or, after the last, a pass of its own."""
BISECT_REACH = 1.05
"""Neighbours of a point for :class:`_Stretches`: every point no farther than this
multiple of the grid resolution (the lattice's step, not its diagonal)."""
BISECT_SHORT = 0.3
"""Stretches no longer than this multiple of the grid resolution are left to the
refinement lattices (grid ÷ 4 and ÷ 16 around the worst points, run whole by each
trial): :class:`_Stretches` cuts the longer ones."""
BISECT_THIN = 0.125
"""The stretches of :class:`_Stretches` join analysis points at least about this
multiple of the grid resolution apart (one point per square of that side)."""

MASS_STEP = 0.95
"""An allowable mass that fails its trial steps back to at most this fraction of
itself (and to m·(CONFIRM_U / U_max)², :func:`_mass_step_back`)."""

MASS_SPAN = 1.5
"""A mass trial starts from the bay's analysis points whose own allowable mass is at
most this multiple of the mass tried: U grows at least as √M (Gere §9.10), so a point
allowing 1.5 × the trial mass is at U ≤ 0.82 under it; refinement then searches
around the worst of them."""

_ELASTIC = frozenset({ELASTIC})
_WITHIN = frozenset({ELASTIC, PLASTIC})


@dataclass
class _Trial:
    """One condition of one bay summary: ``kind`` ``elastic`` / ``plastic`` (a drop
    height on the datum, m), ``mat`` (a spring mat's stiffness, N/m, dropped from
    the planned height ``H``) or ``mass`` (the bay's allowable mass, kg, dropped from
    ``H``: the load is run with that mass, ``eval_load`` its index among the loads
    evaluated); ``value`` the condition as it would be printed."""

    s: int
    kind: str
    load: int
    rect: Rect
    value: float
    H: float
    allowed: frozenset[int]
    ok: bool = False
    failed: bool = False
    peak: float = 0.0
    eval_load: int = -1


def _inside(rect: Rect, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    tol = droppoints.EDGE_TOL
    return ((x >= rect.x0 - tol) & (x <= rect.x1 + tol)
            & (y >= rect.y0 - tol) & (y <= rect.y1 + tol))


def _trials(summaries: Sequence[BaySummary], zone: LiftZone,
            rects: dict[str, Rect], deck: Deck) -> list[_Trial]:
    """The conditions each summary may offer, and its allowable mass (see the module
    docstring); ``deck`` the level's (a hard load's perforation limits the mass)."""
    names = [ld.name for ld in zone.loads]
    out: list[_Trial] = []
    for k, s in enumerate(summaries):
        if s.advice_kind == "opening" or s.bay_id not in rects:
            continue
        j = names.index(s.load_name)
        H = float(s.planned_drop_height or 0.0)
        he, hp = s.allowable_drop_height, s.allowable_drop_height_plastic
        rect = rects[s.bay_id]
        if he is not None and math.isfinite(he) and he > 0.0 and (
                s.response != RESPONSES[ELASTIC] or LIMIT_MARGIN * he > H):
            out.append(_Trial(k, "elastic", j, rect, LIMIT_MARGIN * he,
                              LIMIT_MARGIN * he, _ELASTIC))
        if hp is not None and math.isfinite(hp) and hp > 0.0 and (
                he is None or hp > he * (1.0 + 1e-9)):
            out.append(_Trial(k, "plastic", j, rect, LIMIT_MARGIN * hp,
                              LIMIT_MARGIN * hp, _WITHIN))
        if s.mat_stiffness_max is not None and s.mat_stiffness_max > 0.0:
            out.append(_Trial(k, "mat", j, rect, float(s.mat_stiffness_max), H, _ELASTIC))
        m = s.allowable_mass
        if m is not None and math.isfinite(m) and m > 0.0:
            load = zone.loads[j]
            if is_hard(load) and s.perforation_height is not None:
                # the mass that does not perforate from the planned height where the
                # bay has bare deck (a perforation height of its own; the forward
                # trial then checks the bay as it lies)
                v = float(impact_speed(H, zone.hoist_speed))
                m = perforation_mass(load, deck, v, m)
            if m > 0.0:
                # first tried at LIMIT_MARGIN of itself, as every limit a bay offers:
                # U grows as M^a, ½ ≤ a ≤ 1 (Gere §9.10: F ∝ √M for h ≫ δst, ∝ M for
                # h → 0), so U ≈ 0.90–0.95 at the point that set it, and the margin
                # covers a maximum between the points tried (a 0.25 m lattice found
                # U 1.06 at CONFIRM_U² × the closed form on a random floor)
                out.append(_Trial(k, "mass", j, rect, LIMIT_MARGIN * m, H, _ELASTIC))
            else:
                out.append(_Trial(k, "mass", j, rect, 0.0, H, _ELASTIC, failed=True))
    return out


def _with_mass(load: LiftLoad, mass: float) -> LiftLoad:
    """``load`` with the trial ``mass`` (kg). A copy with the field set directly: a
    trial may go below the least mass a project may declare (1 kg, an input range,
    not physics), which the model's validation would refuse."""
    trial = copy.copy(load)
    object.__setattr__(trial, "mass", float(mass))
    return trial


def _run(fm: FloorModel, project: Project, zone: LiftZone, loads: tuple,
         trials: list[_Trial], res: dict[str, np.ndarray], geo: Geometry | None,
         known: dict[object, tuple[np.ndarray, np.ndarray]]) -> None:
    """One round: every trial of ``trials`` at the analysis points of its bay and at
    points refined around its worst ones; sets ``ok`` and, where it fails, the next
    value to try (``value``) or ``failed``. ``geo``: the geometry of ``res``'s rows
    (``None``: worked out afresh); ``known``: the neighbours of the bays' analysis
    points found so far (:meth:`_Stretches.first`)."""
    li_all = res["load_index"]
    amplified = fm.settings.dynamic_amplification
    rows, owner, bay = [], [], []
    for t, tr in enumerate(trials):
        v = res[_FIELD[tr.kind]]
        # points whose own answer is far above the condition cannot fail it (they
        # still end the stretches _Stretches examines)
        near = ~(v > _span(tr, amplified) * tr.value)
        in_bay = (li_all == tr.load) & _inside(tr.rect, res["x"], res["y"])
        sel = np.flatnonzero(in_bay & near)
        rows.append(sel)
        owner.append(np.full(sel.size, t, dtype=np.int64))
        bay.append(np.flatnonzero(in_bay))
    row, own = np.concatenate(rows), np.concatenate(owner)
    x, y = res["x"][row], res["y"][row]
    ex, ey, eown = _edge_kinks(fm, zone, loads, trials, x, y, own)
    nx, ny, nown = _line_ends(fm, zone, trials)
    ex, ey, eown = np.r_[ex, nx], np.r_[ey, ny], np.r_[eown, nown]
    # the first level of the steep stretches' splitting (_Stretches) rides with the
    # analysis points, each further level with a refinement pass
    st = _Stretches.first(fm, trials, res, bay, known)
    sx, sy, sown = st.split(fm, zone, trials)
    ex, ey, eown = np.r_[ex, sx], np.r_[ey, sy], np.r_[eown, sown]
    g = None
    if geo is not None:
        # the analysis points' path and member actions, and the other points' own
        eg = evaluate.distinct_geometry(fm, project, ex, ey)
        unit_actions(fm, eg)
        g = concat_geo([take_geo(geo, row, steps=False), eg])
    x, y, own = np.r_[x, ex], np.r_[y, ey], np.r_[own, eown]
    first = _evaluate(fm, project, zone, loads, trials, x, y, own, g)
    parts = [st.take(fm, project, trials, first, sx.size)]
    step = fm.settings.grid_resolution
    for level in range(BISECT_LEVELS):
        step /= 4.0
        cur = _cat(parts)
        rx, ry, rown = _pass_points(fm, zone, trials, cur, step, level)
        st.stop_failing(trials, cur)
        sx, sy, sown = st.split(fm, zone, trials)
        if rx.size + sx.size == 0:
            break
        ev = _evaluate(fm, project, zone, loads, trials, np.r_[rx, sx], np.r_[ry, sy],
                       np.r_[rown, sown])
        parts.append(st.take(fm, project, trials, ev, sx.size))
    _settle(trials, _cat(parts))


def _settle(trials: list[_Trial], r: dict[str, np.ndarray]) -> None:
    """After a round's passes (rows ``r`` with their ``owner`` trial): per trial,
    ``ok``, its peak force, or the next value to try (``value``; ``failed`` where
    none is left) — :func:`_run`'s last step."""
    own = r["owner"]
    # per trial at once: whether it has rows, holds (_holds_all) and its peak force
    # (np.nanmax over its rows: NaN left out, NaN where all are)
    has = np.zeros(len(trials), dtype=bool)
    has[own] = True
    holds = _holds_all(trials, r)
    peak = np.full(len(trials), np.nan)
    np.fmax.at(peak, own, r["peak_force"])
    for t, tr in enumerate(trials):
        if not has[t]:
            tr.ok = True
            continue
        tr.peak = float(peak[t])
        if holds[t]:
            tr.ok = True
            continue
        sel = own == t
        v = r[_FIELD[tr.kind]][sel]
        v = v[np.isfinite(v)]
        nxt = CONFIRM_STEP * tr.value
        if v.size:
            nxt = min(nxt, LIMIT_MARGIN * float(np.min(v)))
        if tr.kind == "mass":
            nxt = _mass_step_back(tr.value, r["utilisation"][sel])
        if not (nxt > 0.0) or (tr.kind in ("elastic", "plastic") and nxt < 1e-4):
            tr.failed = True
        else:
            tr.value = nxt
            if tr.kind in ("elastic", "plastic"):
                tr.H = nxt


def _mass_step_back(m: float, U: np.ndarray) -> float:
    """The next mass to try (kg) after the trial mass ``m`` failed with the
    utilisations ``U`` at its points: the least of :data:`MASS_STEP` × m and
    m·(CONFIRM_U / U_max)², U_max the largest finite U above :data:`CONFIRM_U`. Where
    U grows with the load's mass at least as √M (Gere 7th ed. §9.10 Eq. 9-94:
    F → √(2·M·g·h/f) for h ≫ δ_st, faster for a lower fall; the two-mass framing
    force of a light load on a heavy floor grows as M) that is at or below the mass
    at which that point reaches CONFIRM_U; where it grows slower (a contact force held
    by the deck's crushing) the next trial fails again and steps on, and the mass is
    withdrawn after :data:`CONFIRM_ROUNDS`. The trial's own inverse answers are not
    used: a trial does not run the two-force searches (``Drop.trial``), and its
    closed-form one-mass masses read far below what the forward chain allows (the
    rooftop demo's spreader beam 3 cm from column 2/C: 1.46 kg against the forward
    chain's 17 kg there), so a step to them printed an allowable mass no point of
    the analysis gave."""
    u = U[np.isfinite(U) & (U > CONFIRM_U)]
    nxt = MASS_STEP * m
    if u.size:
        nxt = min(nxt, m * (CONFIRM_U / float(u.max())) ** 2)
    return nxt


def _span(tr: _Trial, amplified: bool = False) -> float:
    """The multiple of a trial's value above which a point's own answer is far from
    failing it (:data:`CONFIRM_SPAN`, :data:`MASS_SPAN`).

    With dynamic amplification on (``amplified``) a mass trial has no such multiple
    (∞: every point of the bay is tried): a point's own allowable mass is Gere's
    Eq. 9-94 solved for M with the factors read at the load's own mass, and the
    factors grow as the mass falls (the load over the struck mass r = M/mₑ keys the
    tables; below r = 0.03 the bounds alone apply), so U need not grow as √M and a
    point whose own answer is many times the trial mass can fail it (random projects
    31, 41, 45 of tests/permit_projects.py: points left out as answering more than
    1.5 × the printed mass read U 1.02-1.65 at it on a 0.25 m lattice)."""
    if tr.kind == "mass":
        return np.inf if amplified else MASS_SPAN
    return CONFIRM_SPAN


def _holds(tr: _Trial, r: dict[str, np.ndarray], sel: np.ndarray) -> bool:
    """Whether the trial's rows ``sel`` of ``r`` keep the bay within the condition's
    limits: responses among ``tr.allowed`` and, for an elastic condition, every
    U ≤ :data:`CONFIRM_U`. The plain form of :func:`_holds_all` (one trial)."""
    worst = set(np.unique(r["response"][sel]).tolist())
    u_max = float(np.nanmax(r["utilisation"][sel], initial=0.0))
    return worst <= tr.allowed and (tr.allowed != _ELASTIC or u_max <= CONFIRM_U)


def _holds_all(trials: list[_Trial], r: dict[str, np.ndarray]) -> np.ndarray:
    """:func:`_holds` of every trial on its rows of ``r`` (``r["owner"]``), bool per
    trial (a trial with no rows holds), in one pass over the rows: per trial the set
    of responses met (a bit per response) and the largest U (NaN left out, at least
    0, as ``np.nanmax(..., initial=0)``). The same answers as :func:`_holds` trial by
    trial (``tests/solver/test_confirm_orchestration.py``)."""
    nt = len(trials)
    own = r["owner"]
    resp = np.asarray(r["response"], dtype=np.int64)
    if resp.size and not (0 <= resp.min() and resp.max() < len(RESPONSES)):
        raise ValueError(f"a trial's response outside 0…{len(RESPONSES) - 1}")
    met = np.zeros((nt, len(RESPONSES)), dtype=bool)
    met[own, resp] = True
    u = np.asarray(r["utilisation"], float)
    u_max = np.zeros(nt)
    np.maximum.at(u_max, own, np.where(np.isnan(u), 0.0, u))
    allowed = np.zeros((nt, len(RESPONSES)), dtype=bool)
    elastic = np.zeros(nt, dtype=bool)
    for t, tr in enumerate(trials):
        allowed[t, list(tr.allowed)] = True
        elastic[t] = tr.allowed == _ELASTIC
    return ~(met & ~allowed).any(axis=1) & (~elastic | (u_max <= CONFIRM_U))


def _pad_top(fm: FloorModel, project: Project, prot: np.ndarray) -> np.ndarray:
    """The thickness (m) of the pad or mat at each point (its index among the
    project's protection areas, -1 none: 0)."""
    t = np.array([pa.thickness if pa.level_id == fm.level.id else 0.0
                  for pa in project.protection_areas] + [0.0])
    return t[np.where(prot >= 0, prot, -1)]


def _neighbours(x: np.ndarray, y: np.ndarray, reach: float
                ) -> tuple[np.ndarray, np.ndarray]:
    """The pairs (i, j) of points no farther apart than ``reach`` (m), each once:
    exact distances between the points of neighbouring square cells of side
    ``reach`` (a cell hash, O(n) for a lattice)."""
    n = x.size
    e = np.zeros(0, dtype=np.int64)
    if n < 2:
        return e, e
    cx = np.floor((x - x.min()) / reach).astype(np.int64) + 1
    cy = np.floor((y - y.min()) / reach).astype(np.int64) + 1
    M = int(cy.max()) + 2
    key = cx * M + cy
    order = np.argsort(key, kind="stable")
    ks = key[order]
    ii, jj = [], []
    # each pair once: the own cell (j after i) and four of the eight around it
    for dx, dy in ((0, 0), (1, -1), (1, 0), (1, 1), (0, 1)):
        tk = (cx + dx) * M + (cy + dy)
        lo = np.searchsorted(ks, tk, "left")
        cnt = np.searchsorted(ks, tk, "right") - lo
        tot = int(cnt.sum())
        if tot == 0:
            continue
        rep = np.repeat(np.arange(n), cnt)
        start = np.cumsum(cnt) - cnt
        j = order[lo[rep] + np.arange(tot) - start[rep]]
        keep = (j > rep) if (dx, dy) == (0, 0) else np.ones(tot, dtype=bool)
        keep &= np.hypot(x[rep] - x[j], y[rep] - y[j]) <= reach
        ii.append(rep[keep])
        jj.append(j[keep])
    if not ii:
        return e, e
    return np.concatenate(ii), np.concatenate(jj)


def _danger(value: float | np.ndarray, va: np.ndarray, vb: np.ndarray) -> np.ndarray:
    """How low the answer to the condition (allowable height, stiffest mat, allowable
    mass; nan read as nothing allowed, as the chain's inverse answers give it where
    even a zero fall fails) may reach between two neighbouring points with answers
    ``va``, ``vb``, as a fraction of the trial value ``value`` (one, or one per
    stretch): lo/ρ, the lower answer divided
    by the change across the stretch ρ = hi/lo (at most :data:`BISECT_RHO_MAX`) — the
    change carried on past the lower end within the stretch, as at a kink between
    the points. Where ρ ≤ :data:`BISECT_RATIO` (a smooth stretch) inf. A stretch with
    a value below 1 is dangerous (:class:`_Stretches`); smaller is more dangerous."""
    a = np.where(np.isnan(va), 0.0, va)
    b = np.where(np.isnan(vb), 0.0, vb)
    lo, hi = np.minimum(a, b), np.maximum(a, b)
    with np.errstate(divide="ignore", invalid="ignore"):
        rho = np.where(lo > 0.0, hi / lo, np.inf)
        d = np.where((rho > BISECT_RATIO) & (lo < BISECT_NEAR * value),
                     lo / np.minimum(rho, BISECT_RHO_MAX) / value, np.inf)
    return np.where(np.isnan(d), np.inf, d)


def _most_dangerous(d: np.ndarray, own: np.ndarray, k: int) -> np.ndarray:
    """Positions of the (at most ``k``) stretches of least danger ``d`` (< 1) of each
    trial ``own``."""
    cand = np.flatnonzero(d < 1.0)
    if cand.size == 0:
        return cand
    order = cand[np.lexsort((d[cand], own[cand]))]
    o = own[order]
    first = np.r_[True, o[1:] != o[:-1]]
    start = np.maximum.accumulate(np.where(first, np.arange(o.size), 0))
    return order[(np.arange(o.size) - start) < k]


def _cell_keys(cx: np.ndarray, cy: np.ndarray) -> np.ndarray:
    """One int64 per cell (``cx``, ``cy``: whole-numbered cell indices as floats):
    equal for equal pairs, distinct for distinct ones, in the order of the pairs
    (x first, then y), as ``np.unique(np.c_[cx, cy], axis=0)`` orders its rows.
    The cells of a floor plan span at most some 10⁶ indices a side."""
    if cx.size == 0:
        return np.zeros(0, dtype=np.int64)
    ix = (cx - cx.min()).astype(np.int64)
    iy = (cy - cy.min()).astype(np.int64)
    return ix * (int(iy.max()) + 1) + iy


@dataclass
class _Stretches:
    """The steep stretches of a round's trials: straight lines between neighbouring
    points (ends x0, y0 and x1, y1, m) with each end's answer to the trial's
    condition (v0, v1) and the trial they belong to (``own``).

    Why: a bay's limit is the least inverse answer over its drop points, and the
    answer is not smooth everywhere: where the load's footprint meets a deck edge,
    a check takes over from another, or the plastic branch opens or closes, a point's
    allowable height can fall from 0.45 m to 0.18 m within 0.1 m (a random floor,
    issue 10) — a dip wholly between two sample points, which the refinement around
    the worst sampled point never reaches. A steep change between neighbours is the
    sign of such a place.

    How: the first stretches join the analysis points of each trial's bay (one per
    square of :data:`BISECT_THIN` × the grid resolution) to every such point within
    :data:`BISECT_REACH` × the grid resolution, longer than :data:`BISECT_SHORT` ×
    it, with the analysis' answers (:meth:`first`). A stretch is dangerous where its
    answers differ by more than :data:`BISECT_RATIO`, its lower answer is within
    :data:`BISECT_NEAR` of the trial value and, carried on past the lower end by that
    change, would fall below the trial value (:func:`_danger`). The first level
    halves every dangerous stretch; each of the :data:`BISECT_LEVELS` further levels
    cuts the :data:`BISECT_TOP` most dangerous stretches of each trial still holding
    into :data:`BISECT_PIECES` pieces. The cuts run with the trial (:meth:`split`; a
    level rides with the analysis points or a refinement pass of :func:`_run`), and
    each piece becomes a stretch with the trial run's answers at its ends
    (:meth:`take`). A trial that fails at a cut stops being cut (it steps back with
    the least answer found and is cut again in the next round).

    The tolerance: every dangerous stretch is looked into at its middle; the most
    dangerous are resolved to 1/(2·4³) = 1/128 of their length (4 mm on a 0.5 m
    grid), finer than the refinement lattices (grid ÷ 16).

    What it cannot see: a dip between two neighbours with nearly the same answer (a
    smooth field: :data:`LIMIT_MARGIN` and :data:`CONFIRM_U` are the allowance for
    that), a dip more than a third below the lower end of a stretch whose lower
    answer is more than :data:`BISECT_NEAR` × the trial value, a dip that the middle
    of a dangerous stretch does not reach while more dangerous ones take the deeper
    levels, and stretches of the diagonal (the orthogonal ones around them are
    cut). The answer field of a floor is rough — a beam line beside mid-panel
    changes it threefold — and cutting every steep stretch to the end would cost as
    much as the analysis again."""

    x0: np.ndarray
    y0: np.ndarray
    v0: np.ndarray
    x1: np.ndarray
    y1: np.ndarray
    v1: np.ndarray
    own: np.ndarray
    stopped: set[int]
    cut: tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, int] | None = None
    level: int = 0

    @classmethod
    def first(cls, fm: FloorModel, trials: list[_Trial], res: dict[str, np.ndarray],
              bay: list[np.ndarray], known: dict[object, tuple[np.ndarray, np.ndarray]]
              ) -> _Stretches:
        """The stretches between neighbouring analysis points of each trial's bay
        (``bay``: their rows of ``res``), with the analysis' answers; ``known``: the
        neighbours found so far among each load's analysis points (rows of ``res``; the
        same for every trial and round of a zone), by load, and those within a bay, by
        (load, bay rectangle)."""
        reach = BISECT_REACH * fm.settings.grid_resolution
        cols: list[list[np.ndarray]] = [[] for _ in range(7)]
        in_bay = np.zeros(res["x"].size, dtype=bool)
        for t, tr in enumerate(trials):
            f = _FIELD[tr.kind]
            if tr.load not in known:
                # every analysis point of the load in the zone (rows of res)
                rows = np.flatnonzero(res["load_index"] == tr.load)
                # one point per square of BISECT_THIN (a stretch shorter than that
                # lies within a refinement lattice, which the trial runs whole)
                cell = BISECT_THIN * fm.settings.grid_resolution
                _, one = np.unique(_cell_keys(np.round(res["x"][rows] / cell),
                                              np.round(res["y"][rows] / cell)),
                                   return_index=True)
                rows = rows[np.sort(one)]
                a, b = _neighbours(res["x"][rows], res["y"][rows], reach)
                # stretches within a refinement lattice are sampled densely already
                long = (np.hypot(res["x"][rows[a]] - res["x"][rows[b]],
                                 res["y"][rows[a]] - res["y"][rows[b]])
                        > BISECT_SHORT * fm.settings.grid_resolution)
                a, b = a[long], b[long]
                known[tr.load] = (rows[a], rows[b])
            # the stretches of the load within the bay: the same for every trial of
            # the bay and round of the zone (``bay[t]``: the load's analysis points
            # in the bay), kept in ``known`` under (load, bay)
            got = known.get((tr.load, tr.rect))
            if got is None:
                a, b = known[tr.load]
                in_bay[bay[t]] = True
                w = in_bay[a] & in_bay[b]
                in_bay[bay[t]] = False
                got = known[(tr.load, tr.rect)] = (a[w], b[w])
            i, j = got
            x, y, v = res["x"], res["y"], res[f]
            for c, a in zip(cols, (x[i], y[i], v[i], x[j], y[j], v[j],
                                   np.full(i.size, t, dtype=np.int64)), strict=True):
                c.append(a)
        if not cols[0]:
            e = np.zeros(0)
            return cls(e, e, e, e, e, e, np.zeros(0, dtype=np.int64), set())
        x0, y0, v0, x1, y1, v1, own = (np.concatenate(c) for c in cols)
        return cls(x0, y0, v0, x1, y1, v1, own, set())

    def stop_failing(self, trials: list[_Trial], r: dict[str, np.ndarray]) -> None:
        """No more cuts for the trials that fail on the rows ``r`` so far."""
        holds = _holds_all(trials, r)
        for t in np.unique(r["owner"]).tolist():
            if t not in self.stopped and not holds[t]:
                self.stopped.add(t)

    def split(self, fm: FloorModel, zone: LiftZone, trials: list[_Trial]
              ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """The cut points (x, y, trial) of this level's most dangerous stretches that
        lie in the zone and over the deck."""
        own = self.own
        # every stretch's danger at once, each with its trial's value (_danger is
        # elementwise); the stopped trials' stretches none (inf)
        value = np.array([tr.value for tr in trials], float)
        live = np.ones(len(trials), dtype=bool)
        live[list(self.stopped)] = False
        d = np.where(live[own], _danger(value[own], self.v0, self.v1), np.inf)
        # the first level halves every dangerous stretch, each further one cuts the
        # most dangerous of each trial into BISECT_PIECES
        first = self.level == 0
        top = _most_dangerous(d, own, own.size if first else BISECT_TOP)
        n = 2 if first else BISECT_PIECES
        self.level += 1
        s = np.arange(1, n) / n
        x = self.x0[top, None] + s[None, :] * (self.x1 - self.x0)[top, None]
        y = self.y0[top, None] + s[None, :] * (self.y1 - self.y0)[top, None]
        ok = (droppoints.in_zone(zone, x.ravel(), y.ravel())
              & (locate(fm.frame, x.ravel(), y.ravel()) >= 0)).reshape(x.shape)
        self.cut = (top, x, y, ok, n)
        return x[ok], y[ok], np.repeat(own[top, None], n - 1, axis=1)[ok]

    def take(self, fm: FloorModel, project: Project, trials: list[_Trial],
             ev: dict[str, np.ndarray], n_cut: int) -> dict[str, np.ndarray]:
        """``ev`` (a trial run whose last ``n_cut`` rows are this level's cuts, in
        :meth:`split`'s order) without the cuts no capped load reaches; the pieces
        of the cut stretches become the stretches of the next level."""
        assert self.cut is not None
        top, cx, cy, ok, n = self.cut
        m = top.size
        own = self.own[top]
        assert n_cut == int(ok.sum())
        base = ev["owner"].size - n_cut
        keep = np.ones(ev["owner"].size, dtype=bool)
        vals = np.full((m, n - 1), np.nan)
        if n_cut:
            # a height limit below the top of a pad keeps the load off that pad (the
            # permit reads no practical hook limit there, droprig.permit): a cut on
            # such a pad is no place the capped load reaches
            h_cap = np.array([tr.H if tr.kind in ("elastic", "plastic") else np.inf
                              for tr in trials])
            ro = ev["owner"][base:]
            reach = ~(_pad_top(fm, project, ev["protection"][base:]) > h_cap[ro])
            keep[base:] = reach
            v = np.full(n_cut, np.nan)
            names = sorted(set(_FIELD.values()))
            fi = np.array([names.index(_FIELD[tr.kind]) for tr in trials])[ro]
            for q in np.unique(fi).tolist():
                w = fi == q
                v[w] = ev[names[q]][base:][w]
            ok = ok.copy()
            pos = np.flatnonzero(ok.ravel())
            ok.ravel()[pos[~reach]] = False
            vals.ravel()[pos] = v
        # the nodes of each cut stretch: its ends and its cuts
        X = np.c_[self.x0[top], cx, self.x1[top]]
        Y = np.c_[self.y0[top], cy, self.y1[top]]
        V = np.c_[self.v0[top], vals, self.v1[top]]
        live = np.c_[np.ones(m, dtype=bool), ok, np.ones(m, dtype=bool)]
        piece = live[:, :-1] & live[:, 1:]
        O = np.repeat(own[:, None], n, axis=1)
        self.x0, self.y0, self.v0 = X[:, :-1][piece], Y[:, :-1][piece], V[:, :-1][piece]
        self.x1, self.y1, self.v1 = X[:, 1:][piece], Y[:, 1:][piece], V[:, 1:][piece]
        self.own = O[piece]
        self.cut = None
        return ev if keep.all() else {k: a[keep] for k, a in ev.items()}


def _edge_kinks(fm: FloorModel, zone: LiftZone, loads: tuple, trials: list[_Trial],
                x: np.ndarray, y: np.ndarray, own: np.ndarray
                ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The points of each trial moved, within one grid step, onto the lines where the
    load's footprint (either way round) just meets a deck edge: the footprint is cut
    beyond them (:func:`droprig.solver.footprint.footprint_on_deck`), so the response
    has a kink and often its largest value there — a maximum the lattice of the
    analysis can step over. Kept inside the trial's bay and the zone."""
    ext = fm.level.grid.extent
    step = fm.settings.grid_resolution
    li = np.array([tr.load for tr in trials], dtype=np.int64)[own]
    fl = np.array([ld.footprint_length for ld in loads])[li]
    fw = np.array([ld.footprint_width for ld in loads])[li]
    xs, ys, os_ = [x[:0]], [y[:0]], [own[:0]]
    for half in (fl / 2.0, fw / 2.0):
        for line_x in (ext.x0 + half, ext.x1 - half):
            near = np.abs(x - line_x) <= step
            xs.append(line_x[near]); ys.append(y[near]); os_.append(own[near])  # noqa: E702
        for line_y in (ext.y0 + half, ext.y1 - half):
            near = np.abs(y - line_y) <= step
            xs.append(x[near]); ys.append(line_y[near]); os_.append(own[near])  # noqa: E702
    ex, ey, eo = np.concatenate(xs), np.concatenate(ys), np.concatenate(os_)
    if ex.size == 0:
        return ex, ey, eo
    keep = droppoints.in_zone(zone, ex, ey) & (locate(fm.frame, ex, ey) >= 0)
    tol = droppoints.EDGE_TOL
    for name, lo, hi in (("x", "x0", "x1"), ("y", "y0", "y1")):
        v = ex if name == "x" else ey
        a = np.array([getattr(t.rect, lo) for t in trials])[eo]
        b = np.array([getattr(t.rect, hi) for t in trials])[eo]
        keep &= (v >= a - tol) & (v <= b + tol)
    return ex[keep], ey[keep], eo[keep]


def _cat(parts: list[dict[str, np.ndarray]]) -> dict[str, np.ndarray]:
    return parts[0] if len(parts) == 1 else {
        k: np.concatenate([p[k] for p in parts]) for k in parts[0]}


def _forward(fm: FloorModel, project: Project, zone: LiftZone, loads: Sequence[LiftLoad],
             geo: Geometry, li: np.ndarray, H: np.ndarray,
             mat_k: np.ndarray | None = None) -> dict[str, np.ndarray]:
    """The forward chain of a trial (``Drop.trial``) of ``zone``: ``loads[li]`` dropped
    from the trial heights ``H`` (m, on the datum) at the points of ``geo``, on the
    trial mats ``mat_k`` (N/m, nan none) where given. The one place the trials are
    run: their drops strike as the planned ones do, with the zone's hoist lowering
    speed (``Drop.v_hoist`` = ``zone.hoist_speed``, m/s)."""
    return evaluate.evaluate_case(fm, project, loads, geo, li, H=H, mat_k=mat_k,
                                  trial=True, v_hoist=zone.hoist_speed)


def _evaluate(fm: FloorModel, project: Project, zone: LiftZone, loads: tuple,
              trials: list[_Trial], x: np.ndarray, y: np.ndarray, own: np.ndarray,
              geo: Geometry | None = None) -> dict[str, np.ndarray]:
    """The forward chain of each trial at its points (``geo``: their geometry where
    known, row for row with x, y; :func:`_forward`)."""
    cancel.check()
    li = np.array([tr.eval_load if tr.eval_load >= 0 else tr.load for tr in trials],
                  dtype=np.int64)[own]
    H = np.array([tr.H for tr in trials])[own]
    mk = np.array([tr.value if tr.kind == "mat" else np.nan for tr in trials])[own]
    if geo is None:  # trials of one bay often refine around the same points
        geo = evaluate.distinct_geometry(fm, project, x, y)
    r = _forward(fm, project, zone, loads, geo, li, H,
                 mk if np.isfinite(mk).any() else None)
    keep = ("x", "y", "protection", "response", "utilisation", "peak_force",
            "allowable_drop_height",
            "allowable_drop_height_plastic", "required_mat_stiffness", "allowable_mass")
    out = {k: r[k] for k in keep}
    out["owner"] = own
    return out


def _pass_points(fm: FloorModel, zone: LiftZone, trials: list[_Trial],
                 r: dict[str, np.ndarray], step: float, level: int
                 ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The refinement pass ``level`` (0, 1, ...) of :func:`_run` at spacing ``step``
    (m) on the trials' rows ``r`` so far: lattices around each panel's worst
    (:data:`CONFIRM_REFINE`), then one pass around each trial's worst over its bay
    (:data:`CONFIRM_REFINE_LAST`), then none."""
    if level < len(CONFIRM_REFINE) and CONFIRM_REFINE[level]:
        return _refine(fm, zone, trials, r, step, CONFIRM_REFINE[level])
    if level == len(CONFIRM_REFINE):
        return _refine(fm, zone, trials, r, step, CONFIRM_REFINE_LAST, per_panel=False)
    return np.zeros(0), np.zeros(0), np.zeros(0, dtype=np.int64)


def _refine(fm: FloorModel, zone: LiftZone, trials: list[_Trial],
            r: dict[str, np.ndarray], step: float, n_top: int, per_panel: bool = True
            ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A 5 × 5 lattice of spacing ``step`` around the ``n_top`` worst points of each
    deck panel of each trial (each panel between its beams has its own worst point:
    the deck strip's and the members' maxima lie in every panel), or of each trial
    over its whole bay (``per_panel`` false), kept inside the trial's bay, the zone
    and the deck."""
    sev = severity(r["utilisation"], r["response"])
    own = r["owner"]
    cell = locate(fm.frame, r["x"], r["y"])
    group = (own * (int(cell.max(initial=0)) + 2) + (cell + 1)) if per_panel else own
    order = np.lexsort((-sev, group))
    o = group[order]
    first = np.r_[True, o[1:] != o[:-1]]
    start = np.maximum.accumulate(np.where(first, np.arange(o.size), 0))
    top = order[(np.arange(o.size) - start) < n_top]
    off = np.arange(-2, 3) * step
    OX, OY = np.meshgrid(off, off)
    x = (r["x"][top][:, None] + OX.ravel()[None, :]).ravel()
    y = (r["y"][top][:, None] + OY.ravel()[None, :]).ravel()
    ow = np.repeat(own[top], OX.size)
    x, y, keep = droppoints.into_zone_over_deck(fm.frame, zone, x, y)
    rx0 = np.array([t.rect.x0 for t in trials])[ow]
    rx1 = np.array([t.rect.x1 for t in trials])[ow]
    ry0 = np.array([t.rect.y0 for t in trials])[ow]
    ry1 = np.array([t.rect.y1 for t in trials])[ow]
    tol = droppoints.EDGE_TOL
    keep &= (x >= rx0 - tol) & (x <= rx1 + tol) & (y >= ry0 - tol) & (y <= ry1 + tol)
    return x[keep], y[keep], ow[keep]


def _member_lines(fm: FloorModel) -> tuple[np.ndarray, ...]:
    """The level's members as straight lines: start x0, y0 (m), unit direction ux,
    uy and length L (m), one entry per member."""
    mem = fm.level.members
    x0 = np.array([m.start[0] for m in mem], float)
    y0 = np.array([m.start[1] for m in mem], float)
    dx = np.array([m.end[0] for m in mem], float) - x0
    dy = np.array([m.end[1] for m in mem], float) - y0
    L = np.hypot(dx, dy)
    ok = L > 0.0
    Ls = np.where(ok, L, 1.0)
    return x0[ok], y0[ok], (dx / Ls)[ok], (dy / Ls)[ok], L[ok]


def _in_trial_bays(fm: FloorModel, zone: LiftZone, trials: list[_Trial], x: np.ndarray,
                   y: np.ndarray, ow: np.ndarray) -> np.ndarray:
    """Which points (x, y in m, of the trials ``ow``) lie inside their trial's bay, the
    zone and over the deck."""
    tol = droppoints.EDGE_TOL
    keep = droppoints.in_zone(zone, x, y) & (locate(fm.frame, x, y) >= 0)
    rx0 = np.array([t.rect.x0 for t in trials])[ow]
    rx1 = np.array([t.rect.x1 for t in trials])[ow]
    ry0 = np.array([t.rect.y0 for t in trials])[ow]
    ry1 = np.array([t.rect.y1 for t in trials])[ow]
    keep &= (x >= rx0 - tol) & (x <= rx1 + tol) & (y >= ry0 - tol) & (y <= ry1 + tol)
    return np.asarray(keep, dtype=bool)


def _lines_near(lines: tuple[np.ndarray, ...], rect: Rect, reach: float) -> np.ndarray:
    """Indices of the member ``lines`` (:func:`_member_lines`) whose bounding box comes
    within ``reach`` (m) of ``rect``."""
    x0, y0, ux, uy, L = lines
    x1, y1 = x0 + ux * L, y0 + uy * L
    return np.flatnonzero((np.minimum(x0, x1) <= rect.x1 + reach)
                          & (np.maximum(x0, x1) >= rect.x0 - reach)
                          & (np.minimum(y0, y1) <= rect.y1 + reach)
                          & (np.maximum(y0, y1) >= rect.y0 - reach))


def _line_ends(fm: FloorModel, zone: LiftZone, trials: list[_Trial]
               ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """For each trial, the points :data:`LINE_END` × the grid resolution inside both
    ends of every member line that touches its bay, on the line; kept inside the bay,
    the zone and the deck."""
    lines = _member_lines(fm)
    x0, y0, ux, uy, L = lines
    e = LINE_END * fm.settings.grid_resolution
    xs, ys, os_ = [], [], []
    for t, tr in enumerate(trials):
        m = _lines_near(lines, tr.rect, e)
        m = m[L[m] > 2.0 * e]
        if m.size == 0:
            continue
        a = np.c_[np.full(m.size, e), L[m] - e]            # along: both ends
        xs.append((x0[m, None] + ux[m, None] * a).ravel())
        ys.append((y0[m, None] + uy[m, None] * a).ravel())
        os_.append(np.full(a.size, t, dtype=np.int64))
    if not xs:
        return np.zeros(0), np.zeros(0), np.zeros(0, dtype=np.int64)
    x, y, ow = np.concatenate(xs), np.concatenate(ys), np.concatenate(os_)
    keep = _in_trial_bays(fm, zone, trials, x, y, ow)
    return x[keep], y[keep], ow[keep]


def confirm_zone(fm: FloorModel, project: Project, zone: LiftZone,
                 res: dict[str, np.ndarray], geo: Geometry | None,
                 summarise: Callable[[dict[str, np.ndarray]], list[BaySummary]],
                 ) -> list[BaySummary]:
    """The one confirmation of a zone's limits: each drop point's plastic allowable
    height (:func:`confirm_point_heights`, in place on ``res``), then the bay
    summaries made of the confirmed rows by ``summarise`` with every limit they
    offer (:func:`confirm_bay_limits`). ``res``: the zone's analysis rows and
    ``geo`` their geometry (:func:`droprig.solver.refine.zone_points_geometry`)."""
    confirm_point_heights(fm, project, zone, res, geo)
    summaries = summarise(res)
    if not summaries:
        return summaries
    return confirm_bay_limits(fm, project, zone, res, summaries, geo)


def confirm_point_heights(fm: FloorModel, project: Project, zone: LiftZone,
                          res: dict[str, np.ndarray], geo: Geometry | None = None) -> None:
    """Keep a drop point's plastic allowable height only where the forward chain
    confirms it.

    The plastic inverse (:func:`droprig.solver.plastic.allowable_height_plastic` with
    the brittle checks at R_p) is an energy estimate; a height it gives above the
    elastic one is tried by running each such point again with the load dropped from
    :data:`CONFIRM_FACTORS` × that height (both factors in one pass). Where any trial
    exceeds, the height falls back to the elastic allowable height (closed form, Gere
    §9.10), so no reported height claims a margin the forward analysis does not give
    (issue 16). In place on ``res`` (the rows of
    :func:`droprig.solver.refine.zone_points`; ``geo`` their geometry, or ``None``)."""
    h_pl = res["allowable_drop_height_plastic"]
    h_el = res["allowable_drop_height"]
    idx = np.flatnonzero(np.isfinite(h_pl) & ~(h_pl <= h_el))
    if idx.size == 0:
        return
    # the structural response alone (hard=False: no local-damage step), so a trial
    # that exceeds is never reported as 'perforates' and let through; the deck's local
    # damage has its own allowable heights. Every point and factor in one pass, each
    # row with its own trial height (Drop.H)
    loads = [replace(ld, hard=False) for ld in zone.loads]
    cancel.check()
    k = len(CONFIRM_FACTORS)
    rows = np.tile(idx, k)
    g = (take_geo(geo, rows) if geo is not None
         else point_geometry(fm, project, res["x"][rows], res["y"][rows]))
    # heights are above the finished surface; the factor applies to the fall onto a
    # pad (t + factor·(h − t), issue 13)
    t_pad = res["drop_height"][rows] - res["fall_height"][rows]
    factor = np.repeat(np.asarray(CONFIRM_FACTORS, float), idx.size)
    H = np.minimum(t_pad + factor * (h_pl[rows] - t_pad), 200.0)
    r = _forward(fm, project, zone, loads, g, res["load_index"][rows], H)
    ok = (r["response"] != EXCEEDS).reshape(k, idx.size).all(axis=0)
    bad = idx[~ok]
    if bad.size:
        h_pl = h_pl.copy()
        h_pl[bad] = h_el[bad]
        res["allowable_drop_height_plastic"] = h_pl


def confirm_bay_limits(fm: FloorModel, project: Project, zone: LiftZone,
                       res: dict[str, np.ndarray], summaries: Sequence[BaySummary],
                       geo: Geometry | None = None) -> list[BaySummary]:
    """``summaries`` (one zone's, every load) with each offered limit confirmed by a
    forward run, stepped back or withdrawn (module docstring); the advice of a bay
    whose limits changed is derived again (:func:`droprig.solver.summary.bay_advice`).
    ``res``: the zone's analysis rows (:func:`droprig.solver.refine.zone_points`),
    ``geo`` their geometry (``None``: worked out afresh)."""
    rects = {b.id: b.rect for b in bays(fm.level)}
    trials = _trials(summaries, zone, rects, fm.level.deck)
    if not trials:
        return list(summaries)
    # the structural response alone: a hard load's local damage has its own heights;
    # a mass trial runs the load at its trial mass, as hard as it is (the allowable
    # mass keeps the bay elastic: no perforation either)
    base = tuple(replace(ld, hard=False) for ld in zone.loads)
    pending = [t for t in trials if not t.failed]
    known: dict[object, tuple[np.ndarray, np.ndarray]] = {}
    for _ in range(CONFIRM_ROUNDS):
        if not pending:
            break
        extra: list[LiftLoad] = []
        for t in pending:
            if t.kind == "mass":
                t.eval_load = len(base) + len(extra)
                extra.append(_with_mass(zone.loads[t.load], t.value))
        loads = base + tuple(extra)
        _run(fm, project, zone, loads, pending, res, geo, known)
        pending = [t for t in pending if not t.ok and not t.failed]
        if not pending:
            break
    for t in pending:
        t.failed = True
    return [_rewrite(s, [t for t in trials if t.s == k]) for k, s in enumerate(summaries)]


def _rewrite(s: BaySummary, trials: list[_Trial]) -> BaySummary:
    """The summary with its confirmed limits and the advice derived from them."""
    if not trials:
        return s
    by = {t.kind: t for t in trials}
    he0 = s.allowable_drop_height
    he, hp = he0, s.allowable_drop_height_plastic
    if "elastic" in by:
        t = by["elastic"]
        he = None if t.failed else min(he0 or math.inf, t.value / LIMIT_MARGIN)
    if "plastic" in by:
        t = by["plastic"]
        hp = he if t.failed else t.value / LIMIT_MARGIN
    elif hp is not None and he0 is not None and hp <= he0 * (1.0 + 1e-9):
        hp = he  # the plastic height was the elastic one
    if he is not None and hp is not None:
        hp = max(hp, he)
    k_mat: float | None = None
    travel: float | None = None
    if "mat" in by and not by["mat"].failed:
        t = by["mat"]
        k_mat = t.value / LIMIT_MARGIN  # bay_advice offers LIMIT_MARGIN × k_mat
        travel = t.peak / t.value
    m_al, m_x, m_y = s.allowable_mass, s.allowable_mass_x, s.allowable_mass_y
    if "mass" in by:
        t = by["mass"]
        if t.failed:
            m_al = m_x = m_y = None
        else:
            m_al = t.value
    wst = RESPONSES.index(s.response)
    h_local = min((v for v in (s.scabbing_height, s.perforation_height) if v is not None),
                  default=None)
    adv = bay_advice(wst, 0, hp if wst == EXCEEDS else he, k_mat, travel, he, h_local, hp)
    limit = adv.height_limit is not None
    return replace(s, allowable_drop_height=he, allowable_drop_height_plastic=hp,
                   allowable_mass=m_al, allowable_mass_x=m_x, allowable_mass_y=m_y,
                   advice_kind=adv.kind, height_limit=adv.height_limit,
                   height_limit_yields=adv.height_limit_yields,
                   mat_stiffness_max=adv.mat_stiffness_max, mat_travel=adv.mat_travel,
                   height_limit_check=s.height_limit_check if limit else "",
                   height_limit_x=s.height_limit_x if limit else None,
                   height_limit_y=s.height_limit_y if limit else None)
