"""What the annex says, as plain data (no PDF): verdicts, tables and the list of
calculation sheets. :mod:`droprig.report.annex` lays this out on pages.

Kept separate from the layout so the choices a reviewer relies on — which bays
are worst, which drop points get a calculation sheet, which overall verdict is
printed — can be read and tested without parsing a PDF.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass

from droprig import outcomes
from droprig.model import Level, LiftZone, ModelError, Project, bays
from droprig.solver import RESPONSES, BaySummary, CaseResult, Results, resolve_drift

NOT_ASSESSED = outcomes.NOT_ASSESSED

OutcomeStyle = outcomes.Outcome
"""How an outcome is named and drawn in print: :class:`droprig.outcomes.Outcome`,
the same visual language as the desktop plan."""

OUTCOMES: dict[str, OutcomeStyle] = outcomes.OUTCOMES


def rank(response: str) -> int:
    """Severity of a response: elastic 0, plastic 1, exceeds 2; unknown -1."""
    return RESPONSES.index(response) if response in RESPONSES else -1


def worst_response(responses: Iterable[str]) -> str:
    """The worst of several responses (``"none"`` when there are none)."""
    ranked = [r for r in responses if r in RESPONSES]
    return max(ranked, key=rank) if ranked else NOT_ASSESSED


def _finite(v: float | None) -> float | None:
    return None if v is None or (isinstance(v, float) and math.isnan(v)) else float(v)


def severity_key(b: BaySummary) -> tuple[int, float]:
    """Sort key, worst first: response rank, then maximum utilisation."""
    u = b.max_utilisation
    return (-rank(b.response), -(u if math.isfinite(u) else math.inf))


def least_allowable(values: Iterable[float | None]) -> float | None:
    """The least allowable drop height of several bays.

    A bay with no allowable height (``None``: not even a load set down at
    h = 0 stays within the limit) makes the least ``None`` — the blunt answer.
    An empty set gives ``nan``-free ``None`` as well.
    """
    vals = list(values)
    if not vals:
        return None
    out = math.inf
    for v in vals:
        f = _finite(v)
        if f is None:
            return None
        out = min(out, f)
    return out


@dataclass(frozen=True)
class CaseVerdict:
    """Verdict for one load of one lift zone."""

    zone_id: str
    load_name: str
    mass: float
    planned_drop_height: float
    response: str
    max_utilisation: float
    least_allowable_drop_height: float | None
    n_bays: int
    n_plastic: int
    n_exceeds: int
    worst_bay: BaySummary | None

    @property
    def advice(self) -> str:
        return case_advice(self)


@dataclass(frozen=True)
class ZoneVerdict:
    zone: LiftZone
    response: str
    cases: tuple[CaseVerdict, ...]


def case_advice(c: CaseVerdict) -> str:
    """Plain words for one load of one zone (what the lift planner must do)."""
    h = c.least_allowable_drop_height
    if c.response == NOT_ASSESSED:
        return ("No drop point of this load falls on the framing of this level: nothing "
                "assessed. Confirm the swing zone and the level.")
    if c.response == "elastic":
        return ("Framing stays elastic for the planned drop everywhere in the zone. "
                "People must still be kept out from under the load path.")
    if c.response == "plastic":
        return (f"{c.n_plastic} bay(s) yield (within limits): protect them with mats or "
                "lower the drop height, and inspect the framing after any drop.")
    msg = (f"NOT ACCEPTABLE AS PLANNED: {c.n_exceeds} bay(s) exceed limits. Protect them "
           "(mats) or exclude them from the swing zone")
    if h is None:
        msg += "; no drop height is safe over the worst bay."
    else:
        msg += "; or limit the drop height as shown."
    return msg


def _case_summaries(results: Results, zone_id: str, load_name: str) -> list[BaySummary]:
    return [b for b in results.bays if b.zone_id == zone_id and b.load_name == load_name]


def _case(results: Results, zone_id: str, load_name: str) -> CaseResult | None:
    for c in results.cases:
        if c.zone_id == zone_id and c.load_name == load_name:
            return c
    return None


def select_zones(project: Project, lift: str | None) -> tuple[LiftZone, ...]:
    """The lift zones the annex covers: all, or the one named ``lift``, each with the
    drift margin the analysis used (a ``computed`` zone's margin from its slew, hoist,
    radial speed and swing: :func:`droprig.solver.resolve_drift`), so the plan and the
    inputs print the band the drop points were spread over, never a stale stored
    value."""
    zones = resolve_drift(project).lift_zones
    if lift is None:
        return zones
    for z in zones:
        if z.id == lift:
            return (z,)
    ids = ", ".join(z.id for z in project.lift_zones) or "(the project has no lift zones)"
    raise ModelError("--lift", lift, f"the id of a lift zone: {ids}")


def case_verdict(project: Project, results: Results, zone: LiftZone,
                 load_name: str) -> CaseVerdict:
    load = next(ld for ld in zone.loads if ld.name == load_name)
    sums = _case_summaries(results, zone.id, load_name)
    case = _case(results, zone.id, load_name)
    if case is not None:
        planned = case.planned_drop_height
    else:
        planned = load.height_above(project.level(zone.level_id).elevation)
    worst = min(sums, key=severity_key) if sums else None
    return CaseVerdict(
        zone_id=zone.id,
        load_name=load_name,
        mass=load.mass,
        planned_drop_height=planned,
        response=worst_response(b.response for b in sums),
        max_utilisation=max((b.max_utilisation for b in sums), default=math.nan),
        least_allowable_drop_height=least_allowable(b.allowable_drop_height for b in sums),
        n_bays=len(sums),
        n_plastic=sum(b.response == "plastic" for b in sums),
        n_exceeds=sum(b.response == "exceeds" for b in sums),
        worst_bay=worst,
    )


def zone_verdicts(project: Project, results: Results,
                  zones: tuple[LiftZone, ...]) -> tuple[ZoneVerdict, ...]:
    out = []
    for z in zones:
        cases = tuple(case_verdict(project, results, z, ld.name) for ld in z.loads)
        out.append(ZoneVerdict(z, worst_response(c.response for c in cases
                                                 if c.response != NOT_ASSESSED), cases))
    return tuple(out)


def overall_response(verdicts: Iterable[ZoneVerdict]) -> str:
    return worst_response(v.response for v in verdicts)


def bay_rows(results: Results, zones: tuple[LiftZone, ...]) -> list[BaySummary]:
    """Per-bay rows for the summary: zone by zone, load by load, worst bay first."""
    rows: list[BaySummary] = []
    for z in zones:
        for ld in z.loads:
            rows.extend(sorted(_case_summaries(results, z.id, ld.name),
                               key=lambda b: (*severity_key(b), b.bay_id)))
    return rows


@dataclass(frozen=True)
class SheetRef:
    """One calculation sheet: the governing drop point of a bay for one load."""

    zone_id: str
    load_name: str
    bay_id: str
    x: float
    y: float
    reasons: tuple[str, ...]
    summary: BaySummary


def calc_sheets(results: Results, zones: tuple[LiftZone, ...]) -> list[SheetRef]:
    """The drop points that get a calculation sheet.

    Per zone × load: the governing point of the worst bay, then the governing
    point of every other bay that is not elastic (worst first). A point shared
    by two of these is printed once.
    """
    out: list[SheetRef] = []
    for z in zones:
        for ld in z.loads:
            sums = sorted(_case_summaries(results, z.id, ld.name),
                          key=lambda b: (*severity_key(b), b.bay_id))
            if not sums:
                continue
            seen: dict[tuple[str, float, float], int] = {}
            for k, b in enumerate(sums):
                reasons = []
                if k == 0:
                    reasons.append("worst bay of this load")
                if b.response != "elastic":
                    reasons.append(f"governing point of a bay that {b.response}"
                                   if b.response == "exceeds" else
                                   "governing point of a bay that yields")
                if not reasons:
                    continue
                key = (b.bay_id, round(b.governing_x, 6), round(b.governing_y, 6))
                if key in seen:
                    continue
                seen[key] = len(out)
                out.append(SheetRef(z.id, ld.name, b.bay_id, b.governing_x, b.governing_y,
                                    tuple(reasons), b))
    return out


def levels_of(project: Project, zones: tuple[LiftZone, ...]) -> tuple[Level, ...]:
    """Levels that carry at least one of ``zones``, in project order."""
    ids = {z.level_id for z in zones}
    return tuple(lv for lv in project.levels if lv.id in ids)


def bay_outcomes(results: Results, level: Level,
                 zones: tuple[LiftZone, ...]) -> dict[str, tuple[str, float]]:
    """Worst response and highest utilisation per bay id of ``level`` over
    ``zones`` and their loads; bays no zone reaches are ``("none", nan)``."""
    zone_ids = {z.id for z in zones}
    out: dict[str, tuple[str, float]] = {b.id: (NOT_ASSESSED, math.nan) for b in bays(level)}
    for s in results.bays:
        if s.level_id != level.id or s.zone_id not in zone_ids or s.bay_id not in out:
            continue
        r0, u0 = out[s.bay_id]
        u = s.max_utilisation
        response = s.response if rank(s.response) > rank(r0) else r0
        out[s.bay_id] = (response, u if math.isnan(u0) or u > u0 else u0)
    return out


def scabbing_bays(results: Results, level: Level, zones: tuple[LiftZone, ...]) -> set[str]:
    """Ids of the bays of ``level`` where some load of ``zones`` may scab the soffit
    (``BaySummary.scabbing``, hard loads: :mod:`droprig.solver.local_damage`). The
    space under a deck is taken as occupied unless the permit keeps it clear, so each
    such bay carries the scabbing mark (:data:`droprig.outcomes.SCABBING`)."""
    zone_ids = {z.id for z in zones}
    return {s.bay_id for s in results.bays
            if s.level_id == level.id and s.zone_id in zone_ids and s.scabbing}


# ------------------------------------------------------- de-duplicated sheets


@dataclass(frozen=True)
class Covered:
    """One (load, bay, reason) a calculation sheet stands for."""

    zone_id: str
    load_name: str
    bay_id: str
    x: float
    y: float
    reason: str
    level_id: str = ""


@dataclass(frozen=True)
class SheetGroup:
    """One calculation sheet of appendix B: a representative drop point and every
    (load, bay, reason) whose governing case prints the same numbers."""

    zone_id: str
    load_name: str
    bay_id: str
    x: float
    y: float
    response: str
    utilisation: float
    covers: tuple[Covered, ...]


def _sig(v: float, n: int = 4) -> float | str:
    f = float(v)
    if math.isnan(f):
        return "nan"
    if math.isinf(f) or f == 0:
        return f
    return float(f"{f:.{n - 1}e}")


def case_key(case: CaseResult, i: int, project: Project | None = None) -> tuple:
    """What makes two drop points the same calculation as printed: 4 significant
    figures of every result a sheet prints, the check, the response, the surface.

    With ``project`` the key holds no place (lift zone, level, bay) but what the
    sheet prints about the load (name, mass, footprint, underside stiffness,
    kind), the governing member (role, section, grade, span, end condition), the
    deck of the level and the pad or mat struck: equal calculations on several
    levels and zones share a sheet, which lists where it applies. Without
    ``project`` the lift zone stands for all of these (one zone's sheets only).
    """
    arrays = (case.drop_height, case.static_deflection, case.effective_mass,
              case.dynamic_factor, case.peak_force, case.max_deflection, case.utilisation,
              case.allowable_drop_height, case.allowable_drop_height_plastic,
              case.allowable_mass, case.ductility)
    results = (case.load_name, int(case.governing_check[i]), int(case.response[i]),
               *(_sig(a[i]) for a in arrays))
    if project is None:
        return (case.zone_id, int(case.protection[i]), *results)
    return (*_printed_inputs(project, case, i), *results)


def _printed_inputs(project: Project, case: CaseResult, i: int) -> tuple:
    """The inputs a calculation sheet prints besides the place (see :func:`case_key`)."""
    zone = project.zone(case.zone_id)
    load = next(ld for ld in zone.loads if ld.name == case.load_name)
    level = project.level(case.level_id)
    load_key = (load.name, _sig(load.mass), _sig(load.footprint_length),
                _sig(load.footprint_width), load.kind,
                None if load.contact_stiffness is None else _sig(load.contact_stiffness),
                load.strike_orientations, load.edge_width)
    gm = int(case.governing_member[i])
    if 0 <= gm < len(level.members):
        m = level.members[gm]
        member_key: tuple = (m.role, m.section.name, m.grade.name, _sig(m.span),
                             m.end_condition)
    else:
        member_key = ("deck",)
    prot = int(case.protection[i])
    pad_key: tuple = ()
    if 0 <= prot < len(project.protection_areas):
        pa = project.protection_areas[prot]
        pad_key = (pa.kind, pa.thickness, pa.stiffness, pa.crush_force,
                   pa.crush_stroke, pa.area.x1 - pa.area.x0, pa.area.y1 - pa.area.y0)
    return (load_key, member_key, repr(level.deck), prot >= 0, pad_key)


def sheet_groups(project: Project, results: Results,
                 zones: tuple[LiftZone, ...]) -> list[SheetGroup]:
    """The calculation sheets of appendix B, de-duplicated.

    Candidates, per zone × load: every bay's governing point (highest U), every
    bay's point of least allowable drop height, and for every pad or mat the
    point on it with the highest U (the pad's acceptance). Candidates whose
    printed results agree to 4 significant figures (:func:`case_key`) share one
    sheet, which lists them all. Worst first.
    """
    import numpy as np

    from droprig.model import bays as level_bays

    groups: dict[tuple, list[Covered]] = {}
    reps: dict[tuple, tuple[CaseResult, int, str]] = {}
    order: list[tuple] = []
    seen: dict[tuple, set[tuple[str, str, str, str]]] = {}

    def add(case: CaseResult, i: int, bay_id: str, reason: str) -> None:
        key = case_key(case, i, project)
        cov = Covered(case.zone_id, case.load_name, bay_id, float(case.x[i]),
                      float(case.y[i]), reason, case.level_id)
        if key not in groups:
            groups[key] = []
            seen[key] = set()
            reps[key] = (case, i, bay_id)
            order.append(key)
        # a set, not a scan of the group: a sheet can cover hundreds of bays
        tag = (cov.zone_id, cov.load_name, cov.bay_id, cov.reason)
        if tag not in seen[key]:
            seen[key].add(tag)
            groups[key].append(cov)

    zone_ids = {z.id for z in zones}
    for case in results.cases:
        if case.zone_id not in zone_ids or case.n == 0:
            continue
        level = project.level(case.level_id)
        ids = [b.id for b in level_bays(level)]
        index_of = {bay_id: k for k, bay_id in enumerate(ids)}
        sums = sorted(_case_summaries(results, case.zone_id, case.load_name),
                      key=lambda b: (*severity_key(b), b.bay_id))
        for b in sums:
            d2 = (case.x - b.governing_x) ** 2 + (case.y - b.governing_y) ** 2
            i = int(np.argmin(d2))
            if d2[i] <= 1e-12:
                add(case, i, b.bay_id, "highest utilisation")
            if b.bay_id in index_of:
                sel = np.flatnonzero(case.bay == index_of[b.bay_id])
                if sel.size:
                    h = np.where(np.isnan(case.allowable_drop_height[sel]), -np.inf,
                                 case.allowable_drop_height[sel])
                    j = int(sel[int(np.argmin(h))])
                    add(case, j, b.bay_id, "least allowable drop height")
        for p in range(len(project.protection_areas)):
            sel = np.flatnonzero(case.protection == p)
            if sel.size:
                j = int(sel[int(np.argmax(case.utilisation[sel]))])
                bay_k = int(case.bay[j])
                bay_id = ids[bay_k] if 0 <= bay_k < len(ids) else "?"
                add(case, j, bay_id, f"acceptance of pad {project.protection_areas[p].id}")
    out = []
    for key in order:
        case, i, bay_id = reps[key]
        out.append(SheetGroup(case.zone_id, case.load_name, bay_id, float(case.x[i]),
                              float(case.y[i]), RESPONSES[int(case.response[i])],
                              float(case.utilisation[i]), tuple(groups[key])))
    out.sort(key=lambda g: (-rank(g.response), -(g.utilisation if math.isfinite(g.utilisation)
                                                 else 1e300)))
    return out
