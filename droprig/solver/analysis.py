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
2. Drop height on one datum, the load's underside above the finished surface of the
   level (:func:`planned_height`); the free fall h(p) onto the struck surface is
   that less the thickness of a pad or mat covering p.
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

import threading
from collections import OrderedDict
from collections.abc import Callable, Sequence
from dataclasses import fields, replace

import numpy as np

from droprig.model import Level, LiftLoad, LiftZone, Project, bays, corridor_problem
from droprig.solver import (
    cancel,
    cascade,
    droppoints,
    evaluate,
    local_damage,
    memory,
    refine,
)
from droprig.solver.chain import FIELDS, planned_height
from droprig.solver.confirm import confirm_zone
from droprig.solver.drift import resolve_drift
from droprig.solver.floor import FloorModel, build_floor, floor_cache, floor_model
from droprig.solver.geometry import Geometry, point_geometry
from droprig.solver.outcome_rows import OutcomeRows, pad_loads
from droprig.solver.results import PERFORATES, BaySummary, Cascade, CaseResult, Results
from droprig.solver.summary import (
    Advice,
    bay_advice,
    summarise,
    without_hook_limit,
    without_limit_under_pads,
)

__all__ = [
    "Advice",
    "FloorModel",
    "Geometry",
    "ZoneCache",
    "analyse",
    "analyse_zone",
    "bay_advice",
    "build_floor",
    "floor_model",
    "planned_height",
    "point_geometry",
    "zone_key",
]


def _case_result(zone: LiftZone, load: LiftLoad, level: Level,
                 res: dict[str, np.ndarray]) -> CaseResult:
    arrays = {k: np.ascontiguousarray(res[k]) for k in FIELDS}
    for k in ("bay", "protection", "governing_member", "governing_check", "response",
              "allowable_height_check", "allowable_height_member",
              "allowable_height_plastic_check", "strike_orientation", "utilisation_check",
              "utilisation_member"):
        arrays[k] = arrays[k].astype(np.int64)
    for k in ("scabbing", "local_extrapolated"):
        arrays[k] = arrays[k].astype(bool)
    return CaseResult(zone_id=zone.id, load_name=load.name, level_id=level.id,
                      mass=load.mass, weight=load.weight,
                      planned_drop_height=planned_height(load, level), **arrays)



def analyse_zone(project: Project, zone_id: str,
                 floor: Callable[[str], FloorModel] | None = None, *,
                 confirm: bool = True, rows: OutcomeRows | None = None,
                 fall_rows: OutcomeRows | None = None) -> Results:
    """Every load of one lift zone (see :func:`analyse`). ``confirm=False``: the
    forward analysis only, its limits untried (:func:`droprig.solver.analyse_outcomes`
    — never to be printed as final), its points' plastic heights and allowable masses
    not worked out (NaN: ``Drop.outcomes_only``). ``rows``: its points' rows
    remembered from earlier edits (:class:`~droprig.solver.outcome_rows.OutcomeRows`
    of the stage's kind, ``outcomes_only`` for ``confirm=False``; the same values);
    ``fall_rows``: likewise, full forward rows, for the falls to the levels below."""
    cancel.check()
    project = resolve_drift(project)
    floor = floor or floor_cache(project)
    zone = project.zone(zone_id)
    fm = floor(zone.level_id)
    level = fm.level
    warnings = list(fm.warnings)
    if zone.corridor and (problem := corridor_problem(zone.corridor)) is not None:
        warnings.append(f"zone {zone.id}: the lift corridor is not a simple polygon "
                        f"({problem}); check the drop points it covers")
    for pa in project.protection_areas:
        if pa.level_id == level.id and pa.kind == "crushable" and pa.crush_stress is None:
            w = (f"protection {pa.id}: its crush force is read as a crush stress over the "
                 f"largest load footprint on level {level.id}; a pad acts over the part of "
                 "a footprint that lands on it — enter the pad's crush stress")
            if w not in warnings:
                warnings.append(w)
    for load in zone.loads:  # a load smaller than a grating's gap passes through it
        local_damage.check_load_on_grating(load, level.deck)
    x, y = droppoints.base_points(fm.frame, zone, project.settings.grid_resolution)
    if x.size == 0:
        warnings.append(f"zone {zone.id}: no drop point over the deck of level {level.id}")
    elif droppoints.reaches_off_deck(fm.frame, zone, project.settings.grid_resolution):
        warnings.append(f"zone {zone.id}: part of the zone lies beyond the deck of level "
                        f"{level.id}; drops there are not assessed by droprig")
    summaries: list[BaySummary] = []
    falls: list[Cascade] = []
    below = cascade.level_below(project, level.id)
    zone_cases: list[CaseResult] = []

    def cases_and_bays(rows: dict[str, np.ndarray]) -> list[BaySummary]:
        """The case of each load from the zone's (confirmed) rows, and its bays."""
        out: list[BaySummary] = []
        for j, load in enumerate(zone.loads):
            sel = rows["load_index"] == j
            res = {k: v[sel] for k, v in rows.items()}
            case = _case_result(zone, load, level, res)
            zone_cases.append(case)
            out.extend(summarise(level, zone, load, case, res["F_allow"],
                                 below.id if below is not None else None,
                                 [p.id for p in project.protection_areas]))
        return out

    if zone.loads:
        allres, geo = refine.zone_points_geometry(fm, project, zone, (x, y),
                                                  outcomes_only=not confirm, rows=rows)
        # each point's plastic height, then every limit a bay offers, tried by the
        # forward chain before it is printed
        summaries = (confirm_zone(fm, project, zone, allres, geo, cases_and_bays)
                     if confirm else cases_and_bays(allres))
        pads = [pa for pa in project.protection_areas if pa.level_id == level.id]
        rects = {b.id: b.rect for b in bays(level)}
        summaries = [without_limit_under_pads(s, pads, rects[s.bay_id]) for s in summaries]
    cases = list(zone_cases)
    if below is not None and zone_cases:
        # (the falls are worked out in full in either stage: their rows are the
        # forward rows of the levels below)
        falls.extend(cascade_down(project, zone, zone_cases, below, floor,
                                  rows=fall_rows))
    if not zone.loads:
        warnings.append(f"zone {zone.id}: no loads to assess")
    warnings.extend(useless_layers(project, zone))
    return Results(tuple(cases), tuple(summaries), tuple(warnings), tuple(falls))


def cascade_down(project: Project, zone: LiftZone, cases: Sequence[CaseResult],
                 below: Level, floor: Callable[[str], FloorModel], *,
                 rows: OutcomeRows | None = None) -> list[Cascade]:
    """The falls of every perforating drop of the zone's loads (``cases``: one per load
    of ``zone.loads``, on the zone's level) level by level: the level below is struck
    (:func:`_cascade`); where that level is perforated too and the project has a
    level under it, the object goes on with its residual speed there, and so on
    while it still perforates. Bounded by the project's levels: each step goes to a
    strictly lower level (:func:`droprig.solver.cascade.level_below`), so at most
    one fall per load and level. Each fall is one :class:`Cascade` (from the level it
    came through to the level it strikes); the list holds them load by load, each
    load's from the top down. The loads falling onto one level are worked out in one
    run. ``rows``: full forward rows remembered from earlier edits
    (:class:`~droprig.solver.outcome_rows.OutcomeRows`, the same values)."""
    per_load: list[list[Cascade]] = [[] for _ in cases]
    current = list(cases)
    active = list(range(len(cases)))
    seen = {case.level_id for case in cases}
    lower: Level | None = below
    steps = 0
    while active and lower is not None and lower.id not in seen \
            and steps < len(project.levels):
        cancel.check()
        got = _cascade(project, zone, [zone.loads[j] for j in active],
                       [current[j] for j in active], lower, floor, rows)
        still = []
        for j, fall in zip(active, got, strict=True):
            if fall is not None:
                per_load[j].append(fall)
                current[j] = fall.case
                still.append(j)
        active = still
        seen.add(lower.id)
        steps += 1
        lower = cascade.level_below(project, lower.id)
    return [fall for falls in per_load for fall in falls]


def _cascade(project: Project, zone: LiftZone, loads: Sequence[LiftLoad],
             cases: Sequence[CaseResult], below: Level,
             floor: Callable[[str], FloorModel],
             rows: OutcomeRows | None = None) -> list[Cascade | None]:
    """The level below a perforated deck, struck at the perforating points of each
    load's case by the same load from the equivalent height h_eq = V_r²/(2g) + Δ (the
    largest over those points; :mod:`droprig.solver.cascade`), assessed in the same
    run with its own bay outcomes: one :class:`Cascade` per load, ``None`` where
    nothing perforates. Every load's points in one vectorised run, each point with
    its own load."""
    falling: list[LiftLoad] = []
    owner: list[int] = []
    xs: list[np.ndarray] = []
    ys: list[np.ndarray] = []
    for k, (load, case) in enumerate(zip(loads, cases, strict=True)):
        hit = case.response == PERFORATES
        if not hit.any():
            continue
        level = project.level(case.level_id)
        h_eq = float(np.nanmax(cascade.equivalent_drop_height_below(
            case.residual_velocity[hit], level, below)))
        h_eq = min(max(h_eq, 0.0), 200.0)  # LiftLoad's drop-height range
        # the height stands for the whole strike speed (the hoist's lowering speed is
        # in the residual speed already); the evaluation below adds no lowering speed
        falling.append(replace(load, drop_height=h_eq, hook_elevation=None,
                               hang_length=0.0))
        owner.append(k)
        xs.append(case.x[hit])
        ys.append(case.y[hit])
    out: list[Cascade | None] = [None] * len(cases)
    if not falling:
        return out
    fm = floor(below.id)
    li = np.repeat(np.arange(len(falling)), [x.size for x in xs])
    fx, fy = np.concatenate(xs), np.concatenate(ys)
    if rows is not None and not rows.outcomes_only and rows.serves(fm) \
            and fx.size <= rows.max_rows // 2:
        res_all = rows.evaluate(fm, project, falling, fx, fy, li)
    else:
        res_all = evaluate.evaluate_points(fm, project, falling, fx, fy, load_index=li)
    lv = cascade.level_below(project, below.id)
    for j, k in enumerate(owner):
        case = cases[k]
        sel = (li == j) & (res_all["bay"] >= 0)
        res = {key: v[sel] for key, v in res_all.items()}
        lower = _case_result(zone, falling[j], below, res)
        bays_below = summarise(below, zone, falling[j], lower, res["F_allow"],
                               lv.id if lv is not None else None)
        # no hook limit controls a fall through the deck above (without_hook_limit)
        out[k] = Cascade(zone.id, loads[k].name, case.level_id, below.id,
                         float(falling[j].drop_height or 0.0), lower,
                         tuple(without_hook_limit(b) for b in bays_below))
    return out


def useless_layers(project: Project, zone: LiftZone) -> list[str]:
    """Warnings for crushable layers on the zone's level whose crush force is at most
    a load's weight: the layer crushes under the load's own weight and protects
    nothing (its stroke adds to the fall; common practice, no source)."""
    out = []
    for pa in project.protection_areas:
        if pa.level_id != zone.level_id or pa.kind != "crushable" or pa.crush_force is None:
            continue
        for ld in zone.loads:
            if pa.crush_force <= ld.weight:
                out.append(f"protection {pa.id}: its crush force ({pa.crush_force:g} N) is "
                           f"not above the weight of {ld.name} in zone {zone.id} "
                           f"({ld.weight:.0f} N); the layer crushes under the load alone "
                           "and gives no protection from it")
    return out


def analyse(project: Project) -> Results:
    """Analyse every load of every lift zone of ``project``.

    Returns one :class:`CaseResult` per (zone, load) with the arrays of the result
    contract and one :class:`BaySummary` per (bay, zone, load). SI units. Raises
    :class:`~droprig.model.ModelError` for framing the method cannot assess (a member
    end resting on nothing, members resting on each other in a loop).
    """
    return _analyse(project, None)


_NOT_ANALYSED = ("info", "lift_zones")
"""Fields of :class:`~droprig.model.Project` that feed no zone's analysis (the
project's description and permit fields; the other zones)."""


def zone_key(project: Project, zone: LiftZone) -> tuple:
    """What one zone's analysis is made of, as frozen model objects: the zone (its
    loads, corridor and drift margin as resolved), and every other input of the
    project — the levels (the zone's framing, and the levels below it that a
    perforating drop falls to), the protection areas (their order numbers the
    results' ``protection``) and the settings — and, where a crushable pad of the
    zone's level is given by its crush force alone, the loads of the level's zones
    (its crush stress is that force over their largest footprint:
    :func:`droprig.solver.outcome_rows.rows_key`). Equal keys, equal results."""
    return (zone, pad_loads(project, zone.level_id),
            *(getattr(project, f.name) for f in fields(project)
              if f.name not in _NOT_ANALYSED))


class ZoneCache:
    """The results of each lift zone remembered by :func:`zone_key` (the last
    ``size`` zone analyses, holding at most ``max_points`` drop points × loads
    together — some 40 numbers each — beyond the newest), so that an edit
    re-analyses only the zones it changes: an edit to one zone or its loads re-runs
    that zone, an edit to framing, pads or settings every zone. Same results as
    :func:`analyse`, bit for bit (``tests/solver/test_zone_cache.py``). Within a
    zone it re-runs, the drop points an earlier run worked out (the same inputs but
    the zone's region: a radius, a corridor moved) are taken from :attr:`forward_rows`
    for the confirmed analysis and :attr:`rows` for the outcome stage
    (:class:`~droprig.solver.outcome_rows.OutcomeRows`, at most 100,000 rows each;
    ``tests/solver/test_outcome_rows.py``). Safe to share between threads."""

    def __init__(self, size: int = 32, max_points: int = 400_000) -> None:
        self.size = size
        self.max_points = max_points
        self._points = 0
        self._zones: OrderedDict[tuple, Results] = OrderedDict()
        self._lock = threading.Lock()
        self.hits = 0
        self.misses = 0
        self.rows = OutcomeRows()
        """The outcome stage's rows of the zones' points, from one edit to the next
        (:func:`droprig.solver.analyse_outcomes`)."""
        self.forward_rows = OutcomeRows(outcomes_only=False)
        """The confirmed analysis's forward rows (before the confirmation), likewise."""

    def peek(self, project: Project, zone: LiftZone) -> Results | None:
        """The zone's results if the cache holds them, else None; a look only (no
        hit or miss counted, nothing moved)."""
        with self._lock:
            return self._zones.get(zone_key(project, zone))

    def analyse(self, project: Project) -> Results:
        """:func:`analyse`, each zone's results taken from the cache where its
        :func:`zone_key` is known."""
        return _analyse(project, self)

    def zone(self, project: Project, zone: LiftZone,
             floor: Callable[[str], FloorModel]) -> Results:
        """One zone's results (``project`` with its drift margins resolved)."""
        key = zone_key(project, zone)
        with self._lock:
            hit = self._zones.get(key)
            if hit is not None:
                self._zones.move_to_end(key)
                self.hits += 1
                return hit
        r = analyse_zone(project, zone.id, floor, rows=self.forward_rows,
                         fall_rows=self.forward_rows)
        with self._lock:
            self.misses += 1
            if key not in self._zones:
                self._zones[key] = r
                self._points += r.n_points
            while len(self._zones) > 1 and (len(self._zones) > self.size
                                            or self._points > self.max_points):
                self._points -= self._zones.popitem(last=False)[1].n_points
        return r


def _analyse(project: Project, cache: ZoneCache | None) -> Results:
    """:func:`analyse`, with the zones' results from ``cache`` where it has them."""
    project = resolve_drift(project)
    floor = floor_cache(project)
    cases: list[CaseResult] = []
    summaries: list[BaySummary] = []
    warnings: list[str] = []
    falls: list[Cascade] = []
    for zone in project.lift_zones:
        r = (analyse_zone(project, zone.id, floor) if cache is None
             else cache.zone(project, zone, floor))
        cases.extend(r.cases)
        summaries.extend(r.bays)
        falls.extend(r.cascade)
        warnings.extend(w for w in r.warnings if w not in warnings)
    if sum(c.x.size for c in cases) > evaluate.CACHE_MAX_POINTS:
        memory.release_memory()  # hand the temporaries of a large job back
    return Results(tuple(cases), tuple(summaries), tuple(warnings), tuple(falls))
