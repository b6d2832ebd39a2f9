"""Permit conditions derived once from the results (an edge module, Qt-free).

The analysis says, per bay, load and lift zone, how the framing responds and what
the bay needs (:class:`droprig.solver.results.BaySummary`). A person signing a lift
permit needs the same facts as *conditions*: which pads or mats to lay, which areas
the load must not be carried over, the highest hook elevation per area, which level
below to keep clear, and what droprig did not check. :func:`derive_conditions`
turns the results into those conditions and one verdict:

* ``acceptable`` — every assessed bay stays elastic on bare deck;
* ``acceptable_with_conditions`` — acceptable when every listed condition is kept;
* ``not_acceptable`` — no practical condition makes the lift acceptable (every bay
  the load can reach must be excluded), or the lift plan cannot keep the conditions:
  a pick-up or set-down point lies in a bay a load must not be carried over
  (:func:`plan_clashes`).

A bay's own verdict (:class:`BayVerdict`) is ``not_acceptable`` where the load must
not be carried over it (exclusion), ``acceptable_with_conditions`` where a pad, a
mat, a hook limit or the engineer's sign-off makes it acceptable.

Every sentence and table cell with a number is written here
(:meth:`Condition.sentence`, :meth:`BayVerdict.cells`); the desktop app, the command
line and the annex print these objects and compose no such text of their own.

Drop-height datum (one everywhere): the height of the load's underside above the
finished surface of the level (top of deck); a fall onto a pad or mat is that height
less the pad's thickness. A maximum hook elevation is that height plus the level's
elevation plus the load's hang length (hook to load underside). Limits are rounded
down and amounts to provide rounded up where they are printed (common practice, no
source), so a printed figure never promises more than the analysis found.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass, replace
from typing import Literal

from droprig import units
from droprig.model import (
    Level,
    Project,
    ProtectionArea,
    Rect,
    bay_ranges,
    bays,
    lift_point_tags,
    limit_is_practical,
    pads_above,
)
from droprig.outcomes import fmt_utilisation_check
from droprig.solver import (
    LIMIT_MARGIN,
    BaySummary,
    Results,
    pad_crush_stress,
)
from droprig.units import UnitSystem

__all__ = [
    "CELL_KEYS",
    "CLASH_ADVICE",
    "CONDITION_KINDS",
    "HOOK_KEEP_OFF",
    "LIMIT_NOTE",
    "NOT_CHECKED",
    "VERDICTS",
    "VERDICT_WORDS",
    "BayVerdict",
    "Condition",
    "ConditionKind",
    "LoadVerdict",
    "PermitConditions",
    "PlanClash",
    "Verdict",
    "clash_sentences",
    "derive_conditions",
    "fmt_elevation",
    "fmt_height",
    "plan_clashes",
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
                        "cap_hook", "not_assessed", "separate_signoff",
                        "note_level_below"]
CONDITION_KINDS: tuple[ConditionKind, ...] = (
    "lay_protection", "cap_hook", "exclude_area", "exclude_level_below",
    "note_level_below", "separate_signoff", "not_assessed")
"""Condition kinds in reading order. ``note_level_below``: concrete may scab off the
soffit over a level below recorded as unoccupied (``Level.occupied_below`` false) — a
note that the permit relies on that record (it still counts as a condition)."""

BELOW_CAUSES: tuple[str, ...] = ("", "perforation", "scabbing")
"""Why the level below is kept clear (``Condition.cause`` of ``exclude_level_below``):
the framing or deck failing (``""``: punching, collapse, an opening, members past their
limits), a hard load going through the deck, or concrete scabbing off the soffit over
an occupied level below."""

NOT_CHECKED: tuple[str, ...] = (
    "The crane, its foundations or outrigger support, the rigging and the lifting "
    "accessories are not checked by droprig.",
    "Columns, connections, walls and foundations below the struck framing are not "
    "checked.",
    "That the pick-up and set-down points and the path between them keep every "
    "condition (exclusion areas, hook limits, pads in place) is for the appointed "
    "lifting person to confirm.",
    "Secondary effects of a drop (a load toppling or sliding after impact, debris, "
    "fire or spill) are not checked.",
)
"""What droprig never checks, printed on every permit (common practice, no source)."""

ENERGY_ONLY = ("Dynamic amplification is off: the demands are the energy method's, which "
               "reads low for a load light against the struck framing (the time-history "
               "ratios of Appendix B2 show by how much at each bay's governing point).")
"""Named among the things not checked when the project's checks use the energy method
alone (Gere §9.10's limitation for a light load; droprig.solver.amplification)."""

SIG_HEIGHT = 3
"""Significant figures of a drop height (m or ft): 0.0700 m, 0.930 m, 10.8 m."""
SIG_MASS = 3
SIG_STIFFNESS = 3

YIELD_AT_LIMIT = ("a drop from the height limit lets members yield within the ductility "
                  "and rotation limits")
YIELDS_AS_PLANNED = ("a drop as planned lets members yield within the ductility and "
                     "rotation limits")

_THROUGH = ("deck_punching", "collapse", "opening", "ductility", "rotation")
"""Governing checks after which the load or debris can reach the level below
(punching through the deck, a collapsing path, an opening, members beyond their
ductility or rotation limits)."""


def fmt_height(value: float | None, system: UnitSystem = "SI", *,
               rounding: units.Rounding = "down", unit: bool = True) -> str:
    """A drop height on the datum, to :data:`SIG_HEIGHT` significant figures,
    rounded down by default (a limit); ``unit`` false: the digits alone (a table
    whose header names the unit)."""
    return units.fmt_sig(value, "length", system, sig=SIG_HEIGHT, rounding=rounding,
                         unit=unit)


LIMIT_NOTE = ("A hook or drop-height limit is 90 % of the least height the analysis "
              "allows for it over the bays it covers (elastic; beyond yield where the "
              "condition says members may yield; or where local damage starts): a margin "
              "for the places between the drop points analysed, about 5 % of force. So "
              "an elastic limit reads below the allowable height beside it.")
"""Why a printed limit is below the allowable height beside it (the inspector showed
an allowable 0.117 m beside a condition of 0.105 m without saying why; common
practice, no source: :data:`droprig.solver.results.LIMIT_MARGIN`, whose 0.9 it states
in words: ``tests/test_permit.py`` holds the two together)."""

HOOK_KEEP_OFF = "keep load off"
"""The hook-elevation cell of a bay the load must not be carried over: no elevation
is safe there. It read "none", which a signer can take for "no cap" (seen under Xvfb
on the rooftop demo's spreader bays; common practice, no source: a blank limit must
never read as an open one)."""


def fmt_elevation(value: float | None, system: UnitSystem = "SI") -> str:
    """An elevation limit to the display decimals of a length (mm or 0.01 ft),
    rounded down."""
    return units.fmt(value, "length", system, rounding="down")


def _join(words: Iterable[str]) -> str:
    w = list(words)
    return w[0] if len(w) == 1 else ", ".join(w[:-1]) + " and " + w[-1]


def _rect_text(r: Rect, system: UnitSystem) -> str:
    def f(v: float) -> str:
        return units.fmt(v, "length", system, unit=False)

    u = units.display_unit("length", system)
    return f"x {f(r.x0)}–{f(r.x1)} {u}, y {f(r.y0)}–{f(r.y1)} {u}"


def pad_words(pa: ProtectionArea, system: UnitSystem = "SI",
              stress: float | None = None) -> str:
    """A pad's or mat's specification in words, as the analysis reads it — the one
    wording the permit sentences and the annex's inputs table share: kind, thickness
    and a crushable layer's crush stress on the pressed area and stroke, or a spring
    mat's compression modulus (stiffness = modulus × pressed area ÷ thickness), or the
    stiffness an older file gives for the load's footprint. ``stress`` (Pa): the crush
    stress the analysis reads for an older file's crush force
    (:func:`droprig.solver.pad_crush_stress`: the force over the largest load footprint
    on its level); the wording then names both."""
    t = units.fmt(pa.thickness, "small_length", system)
    if pa.kind == "crushable":
        stroke = units.fmt_sig(pa.crush_stroke, "small_length", system)
        if pa.crush_stress is not None:
            crush = (f"crush stress {units.fmt_sig(pa.crush_stress, 'pressure', system)}"
                     " on the pressed area")
        elif stress is not None:
            crush = (f"crush stress {units.fmt_sig(stress, 'pressure', system)} on the "
                     f"pressed area (its crush force "
                     f"{units.fmt_sig(pa.crush_force, 'force', system)} over the largest "
                     "load footprint on its level)")
        else:
            crush = (f"crush force {units.fmt_sig(pa.crush_force, 'force', system)} "
                     "(read over the largest load footprint on its level)")
        return f"crushable, {t} thick, {crush}, stroke {stroke}"
    if pa.modulus is not None:
        return (f"spring mat, {t} thick, compression modulus "
                f"{units.fmt_sig(pa.modulus, 'pressure', system)} (stiffness = modulus "
                "× pressed area ÷ thickness)")
    return (f"spring mat, {t} thick, stiffness "
            f"{units.fmt_sig(pa.stiffness, 'stiffness', system)} (for the load's footprint)")


@dataclass(frozen=True)
class Condition:
    """One permit condition for one lift zone (and load) on one level.

    ``kind``: one of :data:`CONDITION_KINDS`. ``bays``: the bay names it applies to
    (empty = the whole zone). ``protection_id``: the pad or mat to lay
    (``lay_protection`` of a pad in the project); a mat not yet in the project is
    given by ``mat_stiffness_max`` (N/m, the stiffest that works) and ``mat_travel``
    (m, how far it must be able to compress). ``max_drop_height`` (m, load underside
    above the finished surface of the level) and ``max_hook_elevation`` (m, the
    project's elevation datum, with ``hang_length`` m from hook to load underside)
    for ``cap_hook``. ``region``: plan polygon (m) where the condition applies, if
    one rectangle holds it. ``below_level_id``: the level to keep clear
    (``exclude_level_below``; ``None`` = the space below, no level in the project).
    ``detail``: words without numbers for ``not_assessed`` / ``separate_signoff``.
    ``protection``: the pad or mat itself, for its specification in the sentence.
    ``cause``: why the level below is kept clear (:data:`BELOW_CAUSES`).
    ``off_pads``: for ``cap_hook``, the pads or mats on those bays whose top stands
    at or above the limit (:func:`droprig.model.pads_above`): the load is kept off
    them there, the limit holds over the rest of the bays.
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
    hang_length: float | None = None
    below_level_id: str | None = None
    protection: ProtectionArea | None = None
    cause: str = ""
    pad_stress: float | None = None
    off_pads: tuple[ProtectionArea, ...] = ()

    def where(self, level: Level | None = None) -> str:
        """The bays (or the whole zone) the condition covers, in words. With the
        condition's ``level``, the bays are condensed to grid ranges
        (:func:`droprig.model.bay_ranges`: "bays 2-5/A-C and 6-7/B-C", every bay
        named once) — the annex of a large project."""
        if not self.bays:
            return f"lift zone {self.zone_id} on level {self.level_id}"
        names: tuple[str, ...] = self.bays
        if level is not None and level.id == self.level_id:
            names = bay_ranges(level, self.bays)
        word = "bay" if len(self.bays) == 1 else "bays"
        return f"{word} {_join(names)} of level {self.level_id}"

    def _for(self) -> str:
        return f" for {self.load_name}" if self.load_name else ""

    def spec(self, system: UnitSystem = "SI") -> str:
        """The specification of the pad or mat of a ``lay_protection`` condition
        (:func:`pad_words`, then where it lies)."""
        pa = self.protection
        if pa is None:
            return ""
        body = pad_words(pa, system, self.pad_stress)
        return f"{pa.name + ': ' if pa.name else ''}{body}; {_rect_text(pa.area, system)}"

    def _off_pads(self, system: UnitSystem) -> str:
        """The ``cap_hook`` sentence's words for :attr:`off_pads` ("" without)."""
        if not self.off_pads:
            return ""
        top = min(pa.thickness for pa in self.off_pads)
        ids = _join([pa.id for pa in self.off_pads])
        word = "pad" if len(self.off_pads) == 1 else "pads"
        its = "its top stands" if len(self.off_pads) == 1 else "their tops stand at least"
        return (f" Keep it off {word} {ids} there: {its} "
                f"{units.fmt(top, 'small_length', system)} above the finished surface, "
                "above that limit.")

    def sentence(self, system: UnitSystem = "SI", level: Level | None = None) -> str:
        """The one wording of this condition, with its numbers in ``system``; with
        the condition's ``level``, its bays condensed to grid ranges (:meth:`where`)."""
        where = self.where(level)
        if self.kind == "lay_protection":
            if self.protection_id is not None:
                return (f"Lay pad {self.protection_id} ({self.spec(system)}) before the "
                        f"lift and keep it in place: {where}{self._for()} "
                        f"{'relies' if len(self.bays) == 1 else 'rely'} on it.")
            stiff = units.fmt_sig(self.mat_stiffness_max, "stiffness", system,
                                  sig=SIG_STIFFNESS, rounding="down")
            travel = ("" if self.mat_travel is None else
                      " and able to compress at least "
                      + units.fmt_sig(self.mat_travel, "small_length", system,
                                      rounding="up"))
            return (f"Lay a spring mat no stiffer than {stiff}{travel} over the whole of "
                    f"{where}{self._for()} (a softer mat also works).")
        if self.kind == "cap_hook":
            hook = ""
            if self.max_hook_elevation is not None:
                elev = fmt_elevation(self.max_hook_elevation, system)
                if self.hang_length:
                    hook = (f": the hook at or below elevation {elev} with the "
                            f"{units.fmt(self.hang_length, 'length', system)} hang length")
                else:  # no hang length given (a drop-height load): the underside itself
                    hook = (f": its underside at or below elevation {elev} (add the hang "
                            "length for the hook)")
            return (f"Over {where}{self._for()}: keep the load's underside no more "
                    f"than {fmt_height(self.max_drop_height, system)} above the finished "
                    f"surface{hook}.{self._off_pads(system)}")
        if self.kind == "exclude_area":
            return (f"Do not carry {self.load_name or 'any load'} over {where}; "
                    "keep that area clear of people while the load is lifted.")
        below = (f"level {self.below_level_id}" if self.below_level_id
                 else f"the space below level {self.level_id}")
        if self.kind == "exclude_level_below":
            if self.cause == "scabbing":
                return (f"Keep {below} clear of people under {where}, or hang a catch "
                        f"deck under the soffit there, while {self.load_name or 'the load'}"
                        " is lifted: a drop there can knock concrete off the soffit "
                        "(scabbing).")
            why = ("can go through the deck (perforation)" if self.cause == "perforation"
                   else "can break through the deck or bring the framing down")
            return (f"Keep {below} clear of people under {where} while "
                    f"{self.load_name or 'the load'} is lifted: a drop there {why}.")
        if self.kind == "note_level_below":
            return (f"Note: {below} is recorded as unoccupied; a drop of "
                    f"{self.load_name or 'the load'} on {where} can knock concrete off "
                    "the soffit (scabbing). Keep it unoccupied during the lift and "
                    "inspect the soffit after any drop.")
        if self.kind == "separate_signoff":
            return (f"Over {where}{self._for()}, {self.detail}; accept only with the "
                    "engineer's separate sign-off, and inspect the framing and the level "
                    "below after any drop.")
        if self.kind == "not_assessed":
            return self.detail
        raise ValueError(f"condition kind {self.kind!r}; allowed: {CONDITION_KINDS}")


CELL_KEYS: tuple[str, ...] = ("verdict", "planned", "allowable", "hook", "utilisation",
                              "conditions", "mass")
"""Keys of :meth:`BayVerdict.cells`, in table order."""


@dataclass(frozen=True)
class BayVerdict:
    """The verdict for one bay and load of a lift zone, with the figures a table
    shows and the conditions that apply to the bay.

    Heights on the datum (m): ``planned_drop_height``, ``allowable_drop_height``
    (the least elastic one, set by ``allowable_check`` at (``allowable_x``,
    ``allowable_y``)); ``allowable_fall`` (m) the fall onto the pad that lies at that
    point (``allowable_pad``), else ``None``; ``max_hook_elevation`` (m) the highest
    hook elevation over the bay: the hook limit of its conditions, else the hook
    elevation of :data:`~droprig.solver.results.LIMIT_MARGIN` × the allowable height
    (never below the planned height, found acceptable); ``None`` where the load must
    be kept off the bay. ``allowable_mass`` (kg): the least over the bay of the mass
    that keeps it elastic from the planned height, through any pad there.
    """

    zone_id: str
    load_name: str
    level_id: str
    bay_id: str
    verdict: Verdict
    response: str
    conditions: tuple[Condition, ...]
    planned_drop_height: float | None
    allowable_drop_height: float | None
    allowable_check: str
    allowable_x: float | None
    allowable_y: float | None
    allowable_pad: str | None
    allowable_fall: float | None
    max_hook_elevation: float | None
    max_utilisation: float
    utilisation_check: str
    allowable_mass: float | None = None

    def cells(self, system: UnitSystem = "SI") -> dict[str, str]:
        """The table cells of this bay (keys :data:`CELL_KEYS`), the one text every
        surface prints."""
        if self.allowable_drop_height is None:
            allow = "none"
        else:
            allow = fmt_height(self.allowable_drop_height, system)
            if self.allowable_check:
                allow += f" ({self.allowable_check.replace('_', ' ')})"
            if self.allowable_pad is not None and self.allowable_fall is not None:
                allow += (f"; fall onto pad {self.allowable_pad} "
                          f"{fmt_height(self.allowable_fall, system)}")
        util = fmt_utilisation_check(self.max_utilisation, self.utilisation_check)
        return {
            "verdict": VERDICT_WORDS[self.verdict],
            "planned": fmt_height(self.planned_drop_height, system, rounding="nearest"),
            "allowable": allow,
            "hook": (HOOK_KEEP_OFF if self.max_hook_elevation is None
                     and self.verdict == "not_acceptable"
                     else fmt_elevation(self.max_hook_elevation, system)),
            "utilisation": util,
            "conditions": " ".join(c.sentence(system) for c in self.conditions) or "none",
            "mass": units.fmt_sig(self.allowable_mass, "mass", system, sig=SIG_MASS,
                                  rounding="down"),
        }


@dataclass(frozen=True)
class LoadVerdict:
    """The verdict for one load of one lift zone, with its own conditions
    (merged over its bays) and its bays' verdicts."""

    zone_id: str
    load_name: str
    verdict: Verdict
    conditions: tuple[Condition, ...]
    bays: tuple[BayVerdict, ...] = ()

    @property
    def kept_off(self) -> bool:
        """Every bay the load can reach must be excluded: no practical condition makes
        it acceptable (whatever the lift plan's points)."""
        return bool(self.bays) and all(b.verdict == "not_acceptable" for b in self.bays)


@dataclass(frozen=True)
class PlanClash:
    """A pick-up or set-down point of the lift plan that lies in a bay a load of the
    same lift zone must not be carried over: the plan and the conditions disagree.

    Points are not tied to a load in the project file, so every load of the zone is
    taken to pass over each of its points (the rigging travels with the load it
    lifts; a drop while picking up or setting down lands in that bay) — the safe
    reading. ``tag``: the point's tag on the conditions plan (``P1``, ``S2``;
    :func:`droprig.model.lift_point_tags`); ``kind``: ``pick_up`` / ``set_down``;
    a point on the line between two bays lies in both."""

    zone_id: str
    level_id: str
    tag: str
    kind: str
    label: str
    bay_id: str
    load_name: str

    def point_words(self) -> str:
        """``pick-up point P1 (old unit on the plinth)``."""
        what = "pick-up" if self.kind == "pick_up" else "set-down"
        return f"{what} point {self.tag}" + (f" ({self.label})" if self.label else "")

    def sentence(self) -> str:
        """This clash alone in words (one entry of the JSON's ``plan_clashes``)."""
        return clash_sentences((self,))[0]


def clash_sentences(clashes: Iterable[PlanClash],
                    cond_no: dict[tuple[str, str, str], int] | None = None) -> list[str]:
    """The plan clashes in words, one sentence per bay: its points and the loads that
    must not be carried over it (with the number of each load's exclusion condition
    as printed, ``cond_no[(zone, load, bay)]``, where given). Four clashes of the
    rooftop demo read as one sentence, not four."""
    groups: dict[tuple[str, str, str], tuple[list[str], list[str]]] = {}
    for c in clashes:
        pts, lds = groups.setdefault((c.zone_id, c.level_id, c.bay_id), ([], []))
        pt = c.point_words()
        n = (cond_no or {}).get((c.zone_id, c.load_name, c.bay_id))
        ld = c.load_name + (f" (C{n})" if n is not None else "")
        if pt not in pts:
            pts.append(pt)
        if ld not in lds:
            lds.append(ld)
    out = []
    for (zone_id, level_id, bay_id), (pts, lds) in groups.items():
        verb = "lies" if len(pts) == 1 else "lie"
        out.append(f"{_join(pts)} of lift zone {zone_id} {verb} in bay {bay_id} of level "
                   f"{level_id}, which {_join(lds)} must not be carried over")
    return out


CLASH_ADVICE = ("The lift as planned cannot keep the conditions: move the point, protect "
                "or prop that bay, or change the plan, and assess again before signing.")
"""What a signer does about a :class:`PlanClash` (common practice, no source)."""


@dataclass(frozen=True)
class PermitConditions:
    """Everything a permit states: the verdict (the worst over the loads), the
    verdict per load, the conditions de-duplicated in reading order, and what is
    not checked and needs a separate sign-off."""

    verdict: Verdict
    loads: tuple[LoadVerdict, ...]
    conditions: tuple[Condition, ...]
    not_checked: tuple[str, ...]
    clashes: tuple[PlanClash, ...] = ()
    """Lift-plan points in bays a load must not be carried over; any makes the
    verdict ``not_acceptable`` (:func:`plan_clashes`)."""

    @property
    def verdict_words(self) -> str:
        return VERDICT_WORDS[self.verdict]

    @property
    def bays(self) -> tuple[BayVerdict, ...]:
        """Every bay verdict, load by load."""
        return tuple(b for lv in self.loads for b in lv.bays)

    def bay(self, zone_id: str, load_name: str, bay_id: str) -> BayVerdict:
        for b in self.bays:
            if (b.zone_id, b.load_name, b.bay_id) == (zone_id, load_name, bay_id):
                return b
        raise KeyError((zone_id, load_name, bay_id))

    def sentences(self, system: UnitSystem = "SI") -> tuple[str, ...]:
        """The conditions in reading order, one sentence each."""
        return tuple(c.sentence(system) for c in self.conditions)


def worst_verdict(verdicts: Iterable[str]) -> Verdict:
    """The worst of several verdicts (``acceptable`` when there are none)."""
    ranked = [v for v in verdicts if v in VERDICTS]
    return max(ranked, key=VERDICTS.index) if ranked else "acceptable"  # type: ignore


# --------------------------------------------------------------------------- derivation
def _level_below(project: Project, level_id: str) -> str | None:
    lv = project.level(level_id)
    lower = [o for o in project.levels if o.elevation < lv.elevation]
    return max(lower, key=lambda o: o.elevation).id if lower else None


def _union_rect(rects: list[Rect]) -> tuple[tuple[float, float], ...] | None:
    """The corners of the union of grid-bay rectangles when it is one rectangle."""
    if not rects:
        return None
    x0 = min(r.x0 for r in rects)
    y0 = min(r.y0 for r in rects)
    x1 = max(r.x1 for r in rects)
    y1 = max(r.y1 for r in rects)
    area = sum(r.width * r.height for r in rects)
    if abs(area - (x1 - x0) * (y1 - y0)) > 1e-6 * max(area, 1.0):
        return None
    return ((x0, y0), (x1, y0), (x1, y1), (x0, y1))


def _overlaps(a: Rect, b: Rect) -> bool:
    """Whether two rectangles share an area (not only an edge): a pad that only
    touches a bay's edge belongs to the next bay."""
    tol = 1e-6
    return min(a.x1, b.x1) - max(a.x0, b.x0) > tol and min(a.y1, b.y1) - max(a.y0, b.y0) > tol


def _pad_at(project: Project, level_id: str, x: float | None, y: float | None
            ) -> ProtectionArea | None:
    """The pad or mat the analysis found at (x, y) (the first that covers it)."""
    if x is None or y is None:
        return None
    for pa in project.protection_areas:
        if pa.level_id == level_id and pa.area.x0 <= x <= pa.area.x1 and \
                pa.area.y0 <= y <= pa.area.y1:
            return pa
    return None


def _bay_verdict(project: Project, b: BaySummary, rect: Rect) -> BayVerdict:
    """The conditions and verdict of one bay summary."""
    zone = project.zone(b.zone_id)
    load = next(ld for ld in zone.loads if ld.name == b.load_name)
    level = project.level(b.level_id)
    base = dict(zone_id=b.zone_id, load_name=b.load_name, level_id=b.level_id,
                bays=(b.bay_id,))
    region = ((rect.x0, rect.y0), (rect.x1, rect.y0), (rect.x1, rect.y1), (rect.x0, rect.y1))

    def hook(h: float | None) -> float | None:
        return None if h is None else level.elevation + load.hang_length + h

    def _cap_on_pads(conds: list[Condition], pads: dict[str, ProtectionArea],
                     h: float | None) -> None:
        """A bay that is acceptable because pads lie on it is acceptable up to its
        allowable height only (a pad's crush capacity is finite): state that height
        (× :data:`~droprig.solver.results.LIMIT_MARGIN`, never below the planned
        height, which the analysis found acceptable) as a hook limit."""
        if pads and h is not None and math.isfinite(h):
            h = max(LIMIT_MARGIN * h, b.planned_drop_height or 0.0)
            conds.append(Condition("cap_hook", max_drop_height=h,  # type: ignore[arg-type]
                                   max_hook_elevation=hook(h), hang_length=load.hang_length,
                                   region=region, off_pads=off(h), **base))

    conds: list[Condition] = []
    pads = {pa.id: pa for pa in project.protection_areas
            if pa.id in b.protections and _overlaps(pa.area, rect)}
    for pid, pa in pads.items():
        stress = pad_crush_stress(project, pa) if pa.kind == "crushable" else None
        conds.append(Condition("lay_protection", protection_id=pid,  # type: ignore[arg-type]
                               protection=pa, pad_stress=stress, **base))
    kind = b.advice_kind
    verdict: Verdict = "acceptable_with_conditions"

    def practical(h: float) -> bool:
        # the solver's rule (summary.without_limit_under_pads): pads standing above
        # the limit covering the whole bay leave no practical hook limit
        return limit_is_practical(pads.values(), rect, h)

    def off(h: float | None) -> tuple[ProtectionArea, ...]:
        return () if h is None else pads_above(pads.values(), rect, h)

    if kind in ("limit_height", "limit_or_mat") and b.height_limit is not None and \
            not practical(b.height_limit):
        kind = "mat" if kind == "limit_or_mat" else "keep_clear"
    below_id = b.level_below or _level_below(project, b.level_id)
    if b.response == "perforates":
        # a hard load may go through the deck (local damage): the level below is an
        # exclusion area whether or not it is recorded as occupied
        conds.append(Condition("exclude_level_below", region=region,  # type: ignore
                               below_level_id=below_id, cause="perforation", **base))
    elif b.scabbing and level.occupied_below:
        # concrete may scab off the soffit onto people: keep the level below clear
        # under the bay (or a catch deck)
        conds.append(Condition("exclude_level_below", region=region,  # type: ignore
                               below_level_id=below_id, cause="scabbing", **base))
    elif b.scabbing:
        # over a level below recorded as unoccupied: a note that the permit relies on it
        conds.append(Condition("note_level_below", region=region,  # type: ignore
                               below_level_id=below_id, cause="scabbing", **base))
    if kind == "level_below":
        # a hard load perforates the deck as planned: the hook limit keeps it under
        # the height where scabbing or perforation starts *and* within the framing's
        # limits (the solver's perforation_limit); with none, or under a pad's top,
        # no limit is practical and the bay is excluded
        cap, yields = b.height_limit, b.height_limit_yields
        if cap is not None and practical(cap):
            conds.append(Condition("cap_hook", max_drop_height=cap,  # type: ignore
                                   max_hook_elevation=hook(cap),
                                   hang_length=load.hang_length, region=region,
                                   off_pads=off(cap), **base))
            if yields:
                conds.append(Condition("separate_signoff", detail=YIELD_AT_LIMIT,  # type: ignore
                                       **base))
        else:
            kind = "keep_clear"
    if kind == "limit_height" or (kind == "limit_or_mat" and b.height_limit is not None):
        conds.append(Condition("cap_hook", max_drop_height=b.height_limit,  # type: ignore
                               max_hook_elevation=hook(b.height_limit),
                               hang_length=load.hang_length, region=region,
                               off_pads=off(b.height_limit), **base))
        if b.height_limit_yields:
            conds.append(Condition("separate_signoff", detail=YIELD_AT_LIMIT,  # type: ignore
                                   **base))
    elif kind == "mat":
        conds.append(Condition("lay_protection", mat_stiffness_max=b.mat_stiffness_max,
                               mat_travel=b.mat_travel, region=region,  # type: ignore
                               **base))
    elif kind in ("plastic_mat", "plastic_accept"):
        conds.append(Condition("separate_signoff", detail=YIELDS_AS_PLANNED,  # type: ignore
                               **base))
        _cap_on_pads(conds, pads, b.allowable_drop_height_plastic)
    elif kind == "none":
        _cap_on_pads(conds, pads, b.allowable_drop_height)
    elif kind in ("keep_clear", "opening"):
        verdict = "not_acceptable"
        # the load is kept off the bay: nothing on it is relied on
        conds = [c for c in conds if c.kind != "lay_protection"]
        conds.append(Condition("exclude_area", region=region, **base))  # type: ignore
        if (b.governing_check in _THROUGH or b.utilisation_check in _THROUGH) and \
                not any(c.kind == "exclude_level_below" for c in conds):
            conds.append(Condition("exclude_level_below", region=region,  # type: ignore
                                   below_level_id=_level_below(project, b.level_id),
                                   **base))
    kept_off = {pa.id for c in conds if c.kind == "cap_hook" for pa in c.off_pads}
    if kept_off:
        # the load is kept off those pads here: the bay does not rely on them
        conds = [c for c in conds
                 if not (c.kind == "lay_protection" and c.protection_id in kept_off)]
    if not conds:
        verdict = "acceptable"
    caps = [c.max_hook_elevation for c in conds
            if c.kind == "cap_hook" and c.max_hook_elevation is not None]
    if caps:
        hook_limit: float | None = min(caps)
    elif verdict != "not_acceptable" and b.allowable_drop_height is not None:
        hook_limit = hook(max(LIMIT_MARGIN * b.allowable_drop_height,
                              b.planned_drop_height or 0.0))
    else:
        hook_limit = None
    pad = _pad_at(project, b.level_id, b.height_x, b.height_y)
    fall = (None if pad is None or b.allowable_drop_height is None
            else b.allowable_drop_height - pad.thickness)
    return BayVerdict(
        zone_id=b.zone_id, load_name=b.load_name, level_id=b.level_id, bay_id=b.bay_id,
        verdict=verdict, response=b.response, conditions=tuple(conds),
        planned_drop_height=b.planned_drop_height,
        allowable_drop_height=b.allowable_drop_height, allowable_check=b.height_check,
        allowable_x=b.height_x, allowable_y=b.height_y,
        allowable_pad=None if pad is None else pad.id, allowable_fall=fall,
        max_hook_elevation=hook_limit,
        max_utilisation=b.max_utilisation, utilisation_check=b.utilisation_check,
        allowable_mass=b.allowable_mass)


def _merge_key(c: Condition, system: UnitSystem = "SI") -> tuple[object, ...]:
    """Conditions that differ only in their bays are one condition over the bays.

    Limits are compared as printed (the condition's sentence without its bays, in
    the project's units; the least limit is kept, so the merged sentence prints the
    same figure): the two-level demo printed "no more than 0.118 m" three times, for
    the spreader over three groups of bays whose limits differed in the tenth digit
    (0.1183214799 against 0.1183214785 m). Common practice, no source: one rule, one
    condition."""
    return (c.kind, c.zone_id, c.load_name, c.level_id, c.protection_id, c.hang_length,
            c.below_level_id, c.protection, c.detail, c.cause,
            replace(c, bays=(), region=None).sentence(system))


def _merge(conds: Iterable[Condition], rects: dict[tuple[str, str], Rect],
           across_loads: bool = False, system: UnitSystem = "SI") -> tuple[Condition, ...]:
    """Merge conditions over bays (and, for pads to lay, over loads), de-duplicate,
    and sort in reading order (kind, then first appearance)."""
    groups: dict[tuple[object, ...], list[Condition]] = {}
    for c in conds:
        if across_loads and c.kind == "lay_protection" and c.protection_id is not None:
            c = replace(c, load_name=None)
        if c.kind == "not_assessed":
            key: tuple[object, ...] = (c.kind, c.zone_id, c.load_name, c.detail)
        else:
            key = _merge_key(c, system)
        groups.setdefault(key, []).append(c)
    out: list[Condition] = []
    for group in groups.values():
        first = group[0]
        if first.kind == "not_assessed":
            out.append(first)
            continue
        names: list[str] = []
        for c in group:
            names.extend(n for n in c.bays if n not in names)
        region = first.region
        if first.kind != "lay_protection" or first.protection_id is None:
            region = _union_rect([rects[(first.level_id, n)] for n in names]) \
                if len(names) > 1 else first.region
        elif first.protection is not None:
            r = first.protection.area
            region = ((r.x0, r.y0), (r.x1, r.y0), (r.x1, r.y1), (r.x0, r.y1))
        least = {}
        for name in ("max_drop_height", "max_hook_elevation", "mat_stiffness_max"):
            vals = [getattr(c, name) for c in group if getattr(c, name) is not None]
            if vals:
                least[name] = min(vals)
        travel = [c.mat_travel for c in group if c.mat_travel is not None]
        if travel:
            least["mat_travel"] = max(travel)
        out.append(replace(first, bays=tuple(names), region=region, **least))
    order = {k: i for i, k in enumerate(CONDITION_KINDS)}
    return tuple(sorted(out, key=lambda c: order[c.kind]))


def derive_conditions(project: Project, results: Results) -> PermitConditions:
    """The permit conditions and verdict for ``project`` from its ``results``.

    Per (zone, load) and bay: a bay that stays elastic on bare deck needs nothing;
    every pad or mat the bay's drop points lie on is a condition (the results assume
    it); a bay that exceeds gets a hook limit (its drop-height limit on the datum, from
    50 mm up), else a spring mat laid over the whole bay, else it is excluded from
    the load's path — with the level below kept clear where the governing check lets
    the load or debris through; a bay that yields within limits, or whose height
    limit lets members yield, needs the engineer's separate sign-off. A load is
    ``not_acceptable`` when every bay it can reach must be excluded; the permit's
    verdict is the worst over the loads. Parts of a zone beyond the deck are not
    assessed and are a condition of their own.
    """
    system = project.settings.unit_system  # conditions merge as printed (_merge_key)
    rects: dict[tuple[str, str], Rect] = {}
    for lv in project.levels:
        for bay in bays(lv):
            rects[(lv.id, bay.id)] = bay.rect
    by_load: dict[tuple[str, str], list[BaySummary]] = {}
    for b in results.bays:
        by_load.setdefault((b.zone_id, b.load_name), []).append(b)
    loads: list[LoadVerdict] = []
    everything: list[Condition] = []
    connections = connection_conditions(project)
    for zone in project.lift_zones:
        # connections without an entered capacity: every load of the zone relies on
        # them (a condition of the load, not of one bay)
        conn = [c for c in connections if c.zone_id == zone.id]
        for ld in zone.loads:
            summaries = by_load.get((zone.id, ld.name), [])
            # (results a step behind an edited project: bays no longer on the grid
            # are left out)
            bvs = tuple(_bay_verdict(project, b, rects[(b.level_id, b.bay_id)])
                        for b in summaries if (b.level_id, b.bay_id) in rects)
            conds = _merge([*(c for bv in bvs for c in bv.conditions), *conn], rects,
                           system=system)
            verdict: Verdict = "acceptable_with_conditions" if conds else "acceptable"
            load_v = LoadVerdict(zone.id, ld.name, verdict, conds, bvs)
            loads.append(replace(load_v, verdict="not_acceptable") if load_v.kept_off
                         else load_v)
            everything.extend(conds)
    not_checked = list(NOT_CHECKED)
    if not project.settings.dynamic_amplification:
        not_checked.append(ENERGY_ONLY)
    for w in results.warnings:
        if "beyond the deck" in w:
            continue  # a condition of its own (not_assessed)
        text = w[0].upper() + w[1:] + ("" if w.endswith(".") else ".")
        if text not in not_checked:
            not_checked.append(text)
    for zone in project.lift_zones:
        if any(w.startswith(f"zone {zone.id}: part of the zone lies beyond the deck")
               for w in results.warnings):
            everything.append(Condition(
                "not_assessed", zone_id=zone.id, load_name=None, level_id=zone.level_id,
                detail=(f"Part of lift zone {zone.id} lies beyond the deck of level "
                        f"{zone.level_id}; drops there are not assessed by droprig. Do "
                        "not carry a load there unless that area is checked separately "
                        "and kept clear of people.")))
    clashes = plan_clashes(project, loads)
    clashing = {(c.zone_id, c.load_name) for c in clashes}
    loads = [replace(lv, verdict="not_acceptable")
             if (lv.zone_id, lv.load_name) in clashing else lv for lv in loads]
    verdict = worst_verdict(lv.verdict for lv in loads)
    merged = _merge(everything, rects, across_loads=True, system=system)
    if verdict == "acceptable" and merged:
        verdict = "acceptable_with_conditions"
    return PermitConditions(verdict, tuple(loads), merged, tuple(not_checked),
                            tuple(clashes))


def plan_clashes(project: Project, loads: Iterable[LoadVerdict]) -> list[PlanClash]:
    """Every pick-up or set-down point that lies in (or on the edge of) a bay a load
    of its lift zone must not be carried over (a bay verdict ``not_acceptable``).

    Such a plan cannot keep its own conditions: the load starts or ends its lift
    where a drop is not acceptable. The load's verdict is then ``not_acceptable``
    and so is the permit's (common practice, no source: a permit whose conditions
    the lift plan cannot keep is not a permit to sign). Before, only the annex
    listed these, under a headline that read "acceptable with conditions" (the
    rooftop demo, read with pdftoppm)."""
    excluded: dict[tuple[str, str], list[tuple[str, str]]] = {}
    for lv in loads:
        for bv in lv.bays:
            if bv.verdict == "not_acceptable":
                excluded.setdefault((bv.zone_id, bv.level_id), []).append(
                    (bv.bay_id, bv.load_name))
    out: list[PlanClash] = []
    for zone in project.lift_zones:
        hits = excluded.get((zone.id, zone.level_id))
        if not hits or not zone.lift_points:
            continue
        try:
            level = project.level(zone.level_id)
        except KeyError:
            continue
        rect = {b.id: b.rect for b in bays(level)}
        for tag, pt in zip(lift_point_tags(zone), zone.lift_points, strict=True):
            for bay_id, load_name in hits:
                r = rect.get(bay_id)
                if r is not None and r.contains(*pt.at):
                    out.append(PlanClash(zone.id, zone.level_id, tag, pt.kind, pt.label,
                                         bay_id, load_name))
    return out


CONNECTION_NAMES_SHOWN = 12
"""Members named in a connection sign-off condition before "and N more"."""


def connection_conditions(project: Project) -> list[Condition]:
    """A separate sign-off per lift zone whose level has members without an entered
    end-connection capacity (``Member.connection_capacity``).

    droprig checks end shear against each connection's capacity; a capacity cannot be
    inferred from the beam (simple connections are often weaker than the web), so
    without it the check runs at the web's plastic shear resistance and the permit
    requires the engineer to confirm the named connections or enter their capacity
    (droprig.solver.composite.CONNECTION_DEFAULT_FRACTION; common practice, no source).
    """
    out: list[Condition] = []
    for zone in project.lift_zones:
        try:
            level = project.level(zone.level_id)
        except KeyError:
            continue
        missing = [m.id for m in level.members if m.connection_capacity is None]
        if not missing:
            continue
        shown = missing[:CONNECTION_NAMES_SHOWN]
        more = len(missing) - len(shown)
        names = (", ".join(shown) + f" and {more} more") if more else _join(shown)
        word = "member" if len(missing) == 1 else "members"
        out.append(Condition(
            "separate_signoff", zone_id=zone.id, load_name=None, level_id=level.id,
            detail=(f"the end connections of {word} {names} have no shear capacity "
                    "entered: their end shear was checked against the web's shear "
                    "resistance, which a simple connection may not reach; enter each "
                    "connection's capacity, or have the engineer confirm the connections "
                    "carry the beam's web shear resistance")))
    return out


def _is_finite(v: float | None) -> bool:
    return v is not None and math.isfinite(v)
