"""Permit conditions derived once from the results (an edge module, Qt-free).

The analysis says, per bay, load and lift zone, how the framing responds and what
the bay needs (:class:`droprig.solver.results.BaySummary`). A person signing a lift
permit needs the same facts as *conditions*: which pads or mats to lay, which areas
the load must not be carried over, the highest hook elevation per area, which level
below to keep clear, and what droprig did not check. :func:`derive_conditions`
turns the results into those conditions and one verdict:

* ``acceptable`` — every assessed bay stays elastic on bare deck;
* ``acceptable_with_conditions`` — acceptable when every listed condition is kept;
* ``not_acceptable`` — no practical condition makes the lift acceptable.

Every sentence with a number is written here (:meth:`Condition.sentence`); the
desktop app, the command line and the annex print these objects and compose no
such sentence of their own.

Drop-height datum (one everywhere): the height of the load's underside above the
finished surface of the level (top of deck); a fall onto a pad or mat is that height
less the pad's thickness. A maximum hook elevation is that height plus the level's
elevation plus the load's hang length (hook to load underside).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from droprig import units
from droprig.model import Project, bays
from droprig.outcomes import fmt_utilisation
from droprig.solver import BaySummary, CaseResult, Results
from droprig.units import UnitSystem

__all__ = [
    "CONDITION_KINDS",
    "VERDICTS",
    "VERDICT_WORDS",
    "Condition",
    "ConditionKind",
    "LoadVerdict",
    "PermitConditions",
    "Verdict",
    "derive_conditions",
    "worst_verdict",
]

Verdict = Literal["acceptable", "acceptable_with_conditions", "not_acceptable"]
VERDICTS: tuple[Verdict, ...] = ("acceptable", "acceptable_with_conditions",
                                 "not_acceptable")
"""Verdicts, best first."""

VERDICT_WORDS: dict[Verdict, str] = {
    "acceptable": "Acceptable",
    "acceptable_with_conditions": "Acceptable with conditions",
    "not_acceptable": "Not acceptable",
}
"""How a verdict is written, on every surface."""

ConditionKind = Literal["lay_protection", "exclude_area", "exclude_level_below",
                        "cap_hook", "not_assessed", "separate_signoff"]
CONDITION_KINDS: tuple[ConditionKind, ...] = (
    "lay_protection", "cap_hook", "exclude_area", "exclude_level_below",
    "not_assessed", "separate_signoff")
"""Condition kinds in reading order."""

NOT_CHECKED: tuple[str, ...] = (
    "The crane, its foundations or outrigger support, the rigging and the lifting "
    "accessories are not checked by droprig.",
    "Columns, connections, walls and foundations below the struck framing are not "
    "checked; the columns are taken as rigid supports.",
    "Secondary effects of a drop (a load toppling or sliding after impact, debris, "
    "fire or spill) are not checked.",
)
"""What droprig never checks, printed on every permit (common practice, no source)."""


def _length(value: float, system: UnitSystem, rounding: units.Rounding) -> str:
    return units.fmt(value, "length", system, rounding=rounding)


@dataclass(frozen=True)
class Condition:
    """One permit condition for one lift zone, load and level.

    ``kind``: one of :data:`CONDITION_KINDS`. ``bays``: the bay names it applies to
    (empty = the whole zone). ``protection_id``: the pad or mat to lay
    (``lay_protection``). ``max_hook_elevation`` (m, the project's elevation datum)
    and ``max_drop_height`` (m, load underside above the finished surface of the
    level) for ``cap_hook``. ``region``: plan polygon (m) where the condition
    applies, if any. ``detail``: words for ``not_assessed`` / ``separate_signoff``
    that carry no number. ``spec`` (for ``lay_protection`` of a mat not yet in the
    project): the stiffest acceptable spring mat, N/m, and the travel it must allow,
    m.
    """

    kind: ConditionKind
    zone_id: str
    load_name: str | None
    level_id: str
    bays: tuple[str, ...] = ()
    protection_id: str | None = None
    max_hook_elevation: float | None = None
    max_drop_height: float | None = None
    region: tuple[tuple[float, float], ...] | None = None
    detail: str = ""
    mat_stiffness_max: float | None = None
    mat_travel: float | None = None
    protection_spec: str = ""
    below_level_id: str | None = None

    def where(self) -> str:
        """The bays (or the whole zone) the condition covers, in words."""
        if not self.bays:
            return f"the whole of lift zone {self.zone_id} on level {self.level_id}"
        word = "bay" if len(self.bays) == 1 else "bays"
        return f"{word} {', '.join(self.bays)} of level {self.level_id}"

    def sentence(self, system: UnitSystem = "SI") -> str:
        """The one wording of this condition, with its numbers in ``system``.

        Limits are rounded down and amounts to provide rounded up (common practice,
        no source), so a printed figure never promises more than the analysis found.
        """
        load = f" for {self.load_name}" if self.load_name else ""
        if self.kind == "lay_protection":
            if self.protection_id is not None:
                spec = f" ({self.protection_spec})" if self.protection_spec else ""
                return (f"Lay pad {self.protection_id}{spec} over {self.where()} "
                        f"before the lift{load}, and keep it in place.")
            stiff = units.fmt(self.mat_stiffness_max, "stiffness", system, rounding="down")
            travel = ("" if self.mat_travel is None else
                      "; it must be able to compress "
                      + units.fmt(self.mat_travel, "small_length", system, rounding="up"))
            return (f"Lay a spring mat no stiffer than {stiff} over {self.where()}{load} "
                    f"(any softer mat also works{travel}).")
        if self.kind == "cap_hook":
            parts = []
            if self.max_hook_elevation is not None:
                parts.append("keep the hook at or below elevation "
                             + _length(self.max_hook_elevation, system, "down"))
            if self.max_drop_height is not None:
                parts.append("the load's underside no more than "
                             + _length(self.max_drop_height, system, "down")
                             + " above the finished surface")
            return f"Over {self.where()}{load}: " + ", ".join(parts) + "."
        if self.kind == "exclude_area":
            return (f"Do not carry {self.load_name or 'any load'} over {self.where()}; "
                    "keep that area clear of people while the load is lifted.")
        if self.kind == "exclude_level_below":
            below = (f"level {self.below_level_id}" if self.below_level_id
                     else "the space below level " + self.level_id)
            return (f"Keep {below} clear of people under {self.where()} while "
                    f"{self.load_name or 'the load'} is over it: a drop there can "
                    "break through or bring the framing down.")
        if self.kind == "not_assessed":
            return self.detail or (f"Part of lift zone {self.zone_id} is not assessed; "
                                   "do not carry the load there without a separate check.")
        if self.kind == "separate_signoff":
            return self.detail or (f"{self.where().capitalize()}{load}: needs the "
                                   "engineer's separate sign-off.")
        raise ValueError(f"condition kind {self.kind!r}; allowed: {CONDITION_KINDS}")


@dataclass(frozen=True)
class LoadVerdict:
    """The verdict for one load of one lift zone, with its own conditions."""

    zone_id: str
    load_name: str
    verdict: Verdict
    conditions: tuple[Condition, ...]


@dataclass(frozen=True)
class PermitConditions:
    """Everything a permit states: the verdict (the worst over the loads), the
    verdict per load, the conditions de-duplicated in reading order, and what is
    not checked and needs a separate sign-off."""

    verdict: Verdict
    loads: tuple[LoadVerdict, ...]
    conditions: tuple[Condition, ...]
    not_checked: tuple[str, ...]

    @property
    def verdict_words(self) -> str:
        return VERDICT_WORDS[self.verdict]


def worst_verdict(verdicts: object) -> Verdict:
    """The worst of several verdicts (``acceptable`` when there are none)."""
    ranked = [v for v in verdicts if v in VERDICTS]  # type: ignore[attr-defined]
    return max(ranked, key=VERDICTS.index) if ranked else "acceptable"


# --------------------------------------------------------------------------- derivation
def _protections_in_bay(case: CaseResult, rect: object) -> tuple[int, ...]:
    x0, y0, x1, y1 = (getattr(rect, k) for k in ("x0", "y0", "x1", "y1"))
    tol = 1e-6
    inside = (case.x >= x0 - tol) & (case.x <= x1 + tol) & (case.y >= y0 - tol) & \
        (case.y <= y1 + tol)
    found = sorted({int(p) for p in case.protection[inside] if int(p) >= 0})
    return tuple(found)


def _level_below(project: Project, level_id: str) -> str | None:
    lv = project.level(level_id)
    lower = [o for o in project.levels if o.elevation < lv.elevation]
    return max(lower, key=lambda o: o.elevation).id if lower else None


def _hook_elevation(project: Project, b: BaySummary, drop_height: float) -> float | None:
    zone = project.zone(b.zone_id)
    load = next((ld for ld in zone.loads if ld.name == b.load_name), None)
    if load is None:
        return None
    return project.level(b.level_id).elevation + load.hang_length + drop_height


_THROUGH = ("deck_punching", "collapse", "opening", "ductility", "rotation")
"""Governing checks after which the load or debris can reach the level below."""


def _bay_conditions(project: Project, b: BaySummary, case: CaseResult | None,
                    rect: object) -> tuple[list[Condition], bool]:
    """Conditions for one bay summary and whether the bay can be made acceptable."""
    base = dict(zone_id=b.zone_id, load_name=b.load_name, level_id=b.level_id,
                bays=(b.bay_id,))
    conds: list[Condition] = []
    region = tuple((float(px), float(py)) for px, py in (
        (rect.x0, rect.y0), (rect.x1, rect.y0), (rect.x1, rect.y1),  # type: ignore
        (rect.x0, rect.y1)))  # type: ignore[attr-defined]
    pads = _protections_in_bay(case, rect) if case is not None else ()
    for p in pads:
        pa = project.protection_areas[p]
        conds.append(Condition("lay_protection", protection_id=pa.id, **base))  # type: ignore
    kind = b.advice_kind
    if b.response == "perforates" or b.scabbing:
        # a hard load may go through the deck or knock concrete off its soffit
        # (local damage): keep the level below clear under the bay
        conds.append(Condition("exclude_level_below", region=region,
                               below_level_id=b.level_below or _level_below(project,
                                                                            b.level_id),
                               **base))  # type: ignore[arg-type]
    if kind == "none":
        return conds, True
    if kind in ("limit_height", "limit_or_mat") and b.height_limit is not None:
        conds.append(Condition("cap_hook", max_drop_height=b.height_limit,
                               max_hook_elevation=_hook_elevation(project, b, b.height_limit),
                               region=region, **base))  # type: ignore[arg-type]
        return conds, True
    if kind == "mat" and b.mat_stiffness_max is not None:
        conds.append(Condition("lay_protection", mat_stiffness_max=b.mat_stiffness_max,
                               mat_travel=b.mat_travel, region=region,
                               **base))  # type: ignore[arg-type]
        return conds, True
    if kind in ("plastic_mat", "plastic_accept"):
        conds.append(Condition(
            "separate_signoff", detail=(
                f"Bay {b.bay_id} of level {b.level_id} for {b.load_name}: members yield "
                "within the ductility and rotation limits (largest utilisation "
                f"{fmt_utilisation(b.max_utilisation)}); accept only with the engineer's "
                "separate sign-off and inspect the framing after any drop."),
            **base))  # type: ignore[arg-type]
        return conds, True
    # keep_clear / opening: the load must not be carried over the bay
    conds.append(Condition("exclude_area", region=region, **base))  # type: ignore[arg-type]
    if b.governing_check in _THROUGH:
        conds.append(Condition("exclude_level_below", region=region,
                               below_level_id=_level_below(project, b.level_id),
                               **base))  # type: ignore[arg-type]
    return conds, True


def _dedupe(conds: list[Condition]) -> tuple[Condition, ...]:
    seen: set[Condition] = set()
    out = []
    for c in conds:
        if c not in seen:
            seen.add(c)
            out.append(c)
    return tuple(sorted(out, key=lambda c: CONDITION_KINDS.index(c.kind)))


def derive_conditions(project: Project, results: Results) -> PermitConditions:
    """The permit conditions and verdict for ``project`` from its ``results``.

    Per (zone, load): a bay that stays elastic on bare deck needs nothing; a bay
    that stays elastic on a pad lists that pad; a bay that exceeds gets a hook cap
    (the drop-height limit), a spring mat, or is excluded from the load's path (and
    the level below is kept clear where the governing check lets the load or debris
    through); a bay that yields within limits needs the engineer's sign-off. A load
    is ``not_acceptable`` when every bay it can reach must be excluded.
    """
    cases = {(c.zone_id, c.load_name): c for c in results.cases}
    rects = {}
    for lv in project.levels:
        for bay in bays(lv):
            rects[(lv.id, bay.id)] = bay.rect
    by_load: dict[tuple[str, str], list[BaySummary]] = {}
    for b in results.bays:
        by_load.setdefault((b.zone_id, b.load_name), []).append(b)
    loads: list[LoadVerdict] = []
    everything: list[Condition] = []
    for zone in project.lift_zones:
        for ld in zone.loads:
            summaries = by_load.get((zone.id, ld.name), [])
            conds: list[Condition] = []
            excluded = 0
            for b in summaries:
                c, _ = _bay_conditions(project, b, cases.get((zone.id, ld.name)),
                                       rects[(b.level_id, b.bay_id)])
                conds.extend(c)
                excluded += any(x.kind == "exclude_area" for x in c)
            if summaries and excluded == len(summaries):
                verdict: Verdict = "not_acceptable"
            elif conds:
                verdict = "acceptable_with_conditions"
            else:
                verdict = "acceptable"
            dd = _dedupe(conds)
            loads.append(LoadVerdict(zone.id, ld.name, verdict, dd))
            everything.extend(dd)
    not_checked = list(NOT_CHECKED)
    for w in results.warnings:
        not_checked.append(w[0].upper() + w[1:] + ("" if w.endswith(".") else "."))
    for w in results.warnings:
        if "not assessed" in w and w.startswith("zone "):
            zid = w.split()[1].rstrip(":")
            try:
                zone = project.zone(zid)
            except KeyError:
                continue
            everything.append(Condition(
                "not_assessed", zone_id=zid, load_name=None, level_id=zone.level_id,
                detail=(f"Part of lift zone {zid} lies beyond the deck of level "
                        f"{zone.level_id}; drops there are not assessed by droprig. Keep "
                        "the load over the deck there, or have that part checked "
                        "separately.")))
    verdict = worst_verdict(lv.verdict for lv in loads)
    if any(c.kind == "not_assessed" for c in everything) and verdict == "acceptable":
        verdict = "acceptable_with_conditions"
    return PermitConditions(verdict, tuple(loads), _dedupe(everything), tuple(not_checked))


def _is_finite(v: float | None) -> bool:
    return v is not None and math.isfinite(v)
