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

from collections.abc import Callable

import numpy as np

from droprig.model import Level, LiftLoad, LiftZone, Project, corridor_problem
from droprig.solver import droppoints, evaluate, memory, refine
from droprig.solver.chain import FIELDS
from droprig.solver.floor import FloorModel, build_floor, floor_cache, floor_model
from droprig.solver.geometry import Geometry, point_geometry
from droprig.solver.results import BaySummary, CaseResult, Results
from droprig.solver.summary import Advice, bay_advice, summarise

__all__ = [
    "Advice",
    "FloorModel",
    "Geometry",
    "analyse",
    "analyse_zone",
    "bay_advice",
    "build_floor",
    "floor_model",
    "point_geometry",
]


def _planned_height(load: LiftLoad, level: Level) -> float:
    if load.drop_height is not None:
        return float(load.drop_height)
    return load.height_above(level.elevation)


def _case_result(zone: LiftZone, load: LiftLoad, level: Level,
                 res: dict[str, np.ndarray]) -> CaseResult:
    arrays = {k: np.ascontiguousarray(res[k]) for k in FIELDS}
    for k in ("bay", "protection", "governing_member", "governing_check", "response"):
        arrays[k] = arrays[k].astype(np.int64)
    return CaseResult(zone_id=zone.id, load_name=load.name, level_id=level.id,
                      mass=load.mass, weight=load.weight,
                      planned_drop_height=_planned_height(load, level), **arrays)



def analyse_zone(project: Project, zone_id: str,
                 floor: Callable[[str], FloorModel] | None = None) -> Results:
    """Every load of one lift zone (see :func:`analyse`)."""
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
    x, y = droppoints.base_points(fm.frame, zone, project.settings.grid_resolution)
    if x.size == 0:
        warnings.append(f"zone {zone.id}: no drop point over the deck of level {level.id}")
    elif droppoints.reaches_off_deck(fm.frame, zone, project.settings.grid_resolution):
        warnings.append(f"zone {zone.id}: part of the zone lies beyond the deck of level "
                        f"{level.id}; drops there are not assessed by droprig")
    cases = []
    summaries: list[BaySummary] = []
    allres = refine.zone_points(fm, project, zone, (x, y)) if zone.loads else {}
    for j, load in enumerate(zone.loads):
        sel = allres["load_index"] == j
        res = {k: v[sel] for k, v in allres.items()}
        case = _case_result(zone, load, level, res)
        cases.append(case)
        summaries.extend(summarise(level, zone, load, case, res["F_allow"]))
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
    floor = floor_cache(project)
    cases: list[CaseResult] = []
    summaries: list[BaySummary] = []
    warnings: list[str] = []
    for zone in project.lift_zones:
        r = analyse_zone(project, zone.id, floor)
        cases.extend(r.cases)
        summaries.extend(r.bays)
        warnings.extend(w for w in r.warnings if w not in warnings)
    if sum(c.x.size for c in cases) > evaluate.CACHE_MAX_POINTS:
        memory.release_memory()  # hand the temporaries of a large job back
    return Results(tuple(cases), tuple(summaries), tuple(warnings))
