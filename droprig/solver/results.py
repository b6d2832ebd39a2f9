"""Result containers of an analysis (SI units; arrays per drop point).

This is the contract between the solver and the edges (GUI, report, CLI).
Arrays use ``nan`` for "not applicable / none exists"; every edge turns nan into
an explicit word (``none``) or JSON ``null`` — never prints a bare NaN.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

import numpy as np

RESPONSES: tuple[str, ...] = ("elastic", "plastic", "exceeds", "perforates")
"""Response states, worst last. ``elastic``: every check U ≤ 1. ``plastic``:
only flexure exceeded, and the plastic energy balance stays within the ductility
and rotation limits. ``exceeds``: anything else (collapse, brittle check,
limits passed, drop through an opening). ``perforates``: a hard load may go
through the deck (local damage, :mod:`droprig.solver.local_damage`) whatever the
framing does. Scabbing of the soffit is a flag (``CaseResult.scabbing``), not a
state."""
ELASTIC, PLASTIC, EXCEEDS, PERFORATES = 0, 1, 2, 3

CHECKS: tuple[str, ...] = (
    "flexure",
    "shear",
    "web_yielding",
    "web_crippling",
    "deck_flexure",
    "deck_punching",
    "deflection",
    "collapse",
    "ductility",
    "rotation",
    "opening",
    "connection",
)
"""Names of the checks; ``governing_check`` arrays hold indices into this tuple."""

AdviceKind = Literal["none", "limit_height", "mat", "limit_or_mat", "plastic_mat",
                     "plastic_accept", "keep_clear", "opening", "level_below"]
ADVICE_KINDS: tuple[AdviceKind, ...] = ("none", "limit_height", "mat", "limit_or_mat",
                                        "plastic_mat", "plastic_accept", "keep_clear",
                                        "opening", "level_below")
"""What a bay needs (``BaySummary.advice_kind``); the words are written at the
edges (:mod:`droprig.advice`).

* ``none``: every point stays elastic, no protection needed.
* ``limit_height``: exceeds; limit the drop height to ``height_limit``.
* ``mat``: exceeds; a spring mat no stiffer than ``mat_stiffness_max`` that can
  compress ``mat_travel``.
* ``limit_or_mat``: exceeds; either of the two above.
* ``plastic_mat``: yields within limits; such a mat would keep it elastic.
* ``plastic_accept``: yields within limits; no mat keeps it elastic — accept only
  with the engineer's approval.
* ``keep_clear``: exceeds and neither option works: exclusion zone.
* ``opening``: the load can fall through a deck opening: exclusion zone.
* ``level_below``: a hard load may perforate the deck: the level below is an
  exclusion zone; ``height_limit`` (when offered) is the drop height under which
  neither perforation nor scabbing starts *and* the framing stays within its limits
  (``droprig.solver.summary.perforation_limit``): on every advice ``height_limit``
  is the hook limit the permit prints.
"""

LIMIT_MARGIN = 0.9
"""A limit offered as a condition (a drop-height limit, the stiffest spring mat) is this
share of the least value found at the drop points. The limit is exact at the points
analysed; between them, and where the grid refinement (which closes in on the
highest utilisation, not on the least allowable height) did not reach, a point may
need a little less — up to about 1 % of the allowed force on random floors (the
closed-loop test, tests/test_permit.py). 90 % of a height or a stiffness keeps
roughly 5 % of force in hand (F grows with √h and √k; Gere §9.10 Eq. 9-94; the
margin itself is common practice, no source)."""

DECK = -1
"""``governing_member`` value when the deck governs (or no member is involved)."""


@dataclass(frozen=True, eq=False)
class CaseResult:
    """All drop points of one load in one lift zone.

    Every array has shape (n,). Heights are on droprig's one datum: the load's
    underside above the finished surface (top of deck) of the level —
    ``drop_height`` (the planned height), ``allowable_drop_height`` and
    ``allowable_drop_height_plastic``; ``fall_height`` is the free fall onto the
    struck surface (the datum height less the thickness of a pad or mat there).
    ``structure_compliance`` (m/N): framing, deck and the load's underside in series,
    without any mat (what a mat laid there would be in series with).
    ``allowable_height_check`` / ``allowable_height_member``: the check (index into
    :data:`CHECKS`) and member that set the elastic allowable height (the least
    allowed force). ``required_mat_stiffness``: the stiffest spring mat laid over the
    point that keeps it elastic (η = 1 under a mat; ``inf`` where the structure
    alone suffices). ``allowable_height_plastic_check``: ``ductility`` or ``rotation``
    (index into :data:`CHECKS`) where that limit sets the height beyond yield, -1 where
    the elastic height is the larger. ``allowable_mass`` accounts for a pad or mat at the point.
    ``bay`` indexes ``Results.bays_of(level_id)``
    order (``droprig.model.bays``), ``-1`` outside any bay; ``governing_member``
    indexes ``level.members`` (``DECK`` for the deck); ``protection`` indexes
    ``project.protection_areas`` (``-1`` for bare deck).

    Local damage of the deck by a hard load (bare deck only; nan / False / −1 where
    not assessed, and at every point when not given): ``penetration`` (m),
    ``scabbing`` (bool), ``scabbing_height`` and
    ``perforation_height`` (free fall at which each starts, m), ``residual_velocity``
    (m/s after perforation, 0 when not perforated), ``local_extrapolated`` (bool: the
    strike speed is outside the formulas' test range) and ``strike_orientation``
    (index into ``droprig.model.STRIKE_ORIENTATIONS`` of the governing one); on a
    steel plate deck ``dent_depth`` (m, plastic membrane dent) and ``dent_height``
    (drop height on the datum at which the dent reaches
    ``droprig.solver.local_damage.DENT_LIMIT``, m).
    """

    zone_id: str
    load_name: str
    level_id: str
    mass: float
    weight: float
    planned_drop_height: float
    x: np.ndarray
    y: np.ndarray
    bay: np.ndarray
    protection: np.ndarray
    drop_height: np.ndarray
    static_deflection: np.ndarray
    effective_mass: np.ndarray
    dynamic_factor: np.ndarray
    peak_force: np.ndarray
    max_deflection: np.ndarray
    deceleration_g: np.ndarray
    utilisation: np.ndarray
    governing_member: np.ndarray
    governing_check: np.ndarray
    response: np.ndarray
    allowable_drop_height: np.ndarray
    allowable_drop_height_plastic: np.ndarray
    allowable_mass: np.ndarray
    plastic_deflection: np.ndarray
    ductility: np.ndarray
    support_rotation: np.ndarray
    required_mat_stiffness: np.ndarray
    required_crush_stroke: np.ndarray
    penetration: np.ndarray = None  # type: ignore[assignment]
    scabbing: np.ndarray = None  # type: ignore[assignment]
    scabbing_height: np.ndarray = None  # type: ignore[assignment]
    perforation_height: np.ndarray = None  # type: ignore[assignment]
    residual_velocity: np.ndarray = None  # type: ignore[assignment]
    local_extrapolated: np.ndarray = None  # type: ignore[assignment]
    strike_orientation: np.ndarray = None  # type: ignore[assignment]
    dent_depth: np.ndarray = None  # type: ignore[assignment]
    dent_height: np.ndarray = None  # type: ignore[assignment]

    fall_height: np.ndarray | None = None
    structure_compliance: np.ndarray | None = None
    allowable_height_check: np.ndarray | None = None
    allowable_height_member: np.ndarray | None = None
    allowable_height_plastic_check: np.ndarray | None = None
    utilisation_check: np.ndarray = None  # type: ignore[assignment]
    utilisation_member: np.ndarray = None  # type: ignore[assignment]

    def __post_init__(self) -> None:
        # local-damage arrays not given: "not assessed" at every point
        n = int(self.x.shape[0])
        fill = {"penetration": np.full(n, np.nan), "scabbing": np.zeros(n, dtype=bool),
                "scabbing_height": np.full(n, np.nan),
                "perforation_height": np.full(n, np.nan), "residual_velocity": np.zeros(n),
                "local_extrapolated": np.zeros(n, dtype=bool),
                "strike_orientation": np.full(n, -1, dtype=np.int64),
                "dent_depth": np.full(n, np.nan), "dent_height": np.full(n, np.nan)}
        for k, v in fill.items():
            if getattr(self, k) is None:
                object.__setattr__(self, k, v)
        # not given: the governing check names U (results built by hand)
        if self.utilisation_check is None:
            object.__setattr__(self, "utilisation_check", self.governing_check)
        if self.utilisation_member is None:
            object.__setattr__(self, "utilisation_member", self.governing_member)

    @property
    def n(self) -> int:
        return int(self.x.shape[0])


@dataclass(frozen=True)
class BaySummary:
    """The worst outcome in one column bay for one load of one lift zone.

    ``advice_kind`` (one of :data:`ADVICE_KINDS`) says what the bay needs, with its
    numbers in SI: ``height_limit`` (m, the drop height offered as a limit;
    ``height_limit_yields`` when members then yield within the limits and
    ``allowable_drop_height`` keeps them elastic), ``mat_stiffness_max`` (N/m, the
    stiffest spring mat that works) and ``mat_travel`` (m, how far it must be able
    to compress); ``None`` where not offered. ``planned_drop_height`` (m): the
    load's planned drop height. Words for people: :mod:`droprig.permit` (the conditions
    and cells every surface prints).

    Every height is on droprig's one datum: the load's underside above the finished
    surface of the level (a fall onto a pad is that less the pad's thickness).

    Each quantity carries its own governing point and check: ``max_utilisation`` at
    (``utilisation_x``, ``utilisation_y``) by ``utilisation_check`` of
    ``utilisation_member``; ``allowable_drop_height`` (the least elastic one) at
    (``height_x``, ``height_y``), set by ``height_check`` of ``height_member``;
    ``height_limit`` at (``height_limit_x``, ``height_limit_y``) set by
    ``height_limit_check``; ``allowable_mass`` (kg, the least over the bay at the
    planned height, through any pad there) at (``allowable_mass_x``,
    ``allowable_mass_y``). ``governing_*`` is the worst point (response, then U).
    ``protections``: ids of the pads and mats the bay's drop points lie on.

    Local damage (hard loads): ``scabbing`` (some point of the bay may scab the
    soffit), ``scabbing_height`` / ``perforation_height`` (least drop height, on the
    same datum, at which each starts in the bay, m; ``None`` where not assessed),
    ``local_extrapolated`` (the answer lies outside the formulas' test speeds),
    ``strike_orientation`` (the governing one at the worst point) and ``level_below``
    (id of the level under this one in the project, ``None`` when the project does not
    hold it). A steel plate deck: ``dent_depth`` (deepest plastic dent in the bay, m)
    and ``dent_height`` (least drop height on the datum at which the dent reaches
    ``droprig.solver.local_damage.DENT_LIMIT``, m); ``None`` elsewhere.
    """

    level_id: str
    bay_id: str
    zone_id: str
    load_name: str
    n_points: int
    max_utilisation: float
    response: str
    allowable_drop_height: float | None
    allowable_drop_height_plastic: float | None
    governing_x: float
    governing_y: float
    governing_member: str
    governing_check: str
    advice_kind: AdviceKind
    height_limit: float | None = None
    height_limit_yields: bool = False
    mat_stiffness_max: float | None = None
    mat_travel: float | None = None
    planned_drop_height: float | None = None
    utilisation_x: float | None = None
    utilisation_y: float | None = None
    utilisation_member: str = ""
    utilisation_check: str = ""
    height_x: float | None = None
    height_y: float | None = None
    height_member: str = ""
    height_check: str = ""
    height_limit_x: float | None = None
    height_limit_y: float | None = None
    height_limit_check: str = ""
    protections: tuple[str, ...] = ()
    allowable_mass: float | None = None
    allowable_mass_x: float | None = None
    allowable_mass_y: float | None = None
    scabbing: bool = False
    scabbing_height: float | None = None
    perforation_height: float | None = None
    local_extrapolated: bool = False
    strike_orientation: str | None = None
    level_below: str | None = None
    dent_depth: float | None = None
    dent_height: float | None = None


@dataclass(frozen=True)
class TraceStep:
    """One line of a calculation trace.

    ``formula`` uses plain symbols; ``inputs`` maps each symbol to
    ``(value_SI, quantity)`` where quantity is one of ``length, force, mass,
    moment, stress, stiffness, compliance, area, inertia, modulus, angle,
    dimensionless``; the edges substitute numbers in the user's units.
    """

    title: str
    symbol: str
    formula: str
    inputs: dict[str, tuple[float, str]]
    value: float
    quantity: str
    source: str


@dataclass(frozen=True)
class Trace:
    zone_id: str
    load_name: str
    x: float
    y: float
    steps: tuple[TraceStep, ...]
    response: str
    governing_member: str
    governing_check: str
    utilisation_check: str = ""
    """The check whose U is the point's U (the verdict's ``governing_check`` can be
    another: a brittle check at the yield force, ductility, rotation)."""
    pad_edge: str = ""
    """Where the load's footprint lies partly on a crushable pad: ``"tip_off"`` when the
    tip-off over the pad's edge onto the bare deck governs the point (the steps are
    that case's), ``"on_pad"`` when landing on the pad does (the tip-off checked too);
    ``""`` elsewhere (:func:`droprig.solver.evaluate.governing_point`)."""


@dataclass(frozen=True, eq=False)
class Cascade:
    """A load that perforates a deck, passed down to the level below and assessed
    there in the same run. ``from_level``/``level_id``: the perforated level and the
    level below; ``zone_id``, ``load_name``: the lift and load; ``equivalent_height``
    (m): the free fall onto the level below with the same strike speed (residual
    speed after perforation plus the clear fall, the largest over the perforating
    points; :mod:`droprig.solver.cascade`); ``case`` and ``bays``: the level below's
    results at the perforating points, with its own bay outcomes."""

    zone_id: str
    load_name: str
    from_level: str
    level_id: str
    equivalent_height: float
    case: CaseResult
    bays: tuple[BaySummary, ...]


@dataclass(frozen=True, eq=False)
class Results:
    cases: tuple[CaseResult, ...] = ()
    bays: tuple[BaySummary, ...] = ()
    warnings: tuple[str, ...] = field(default=())
    cascade: tuple[Cascade, ...] = field(default=())

    @property
    def n_points(self) -> int:
        return sum(c.n for c in self.cases)


def severity(utilisation: np.ndarray, response: np.ndarray) -> np.ndarray:
    """Sort key, larger = worse: response state, then utilisation (the order of a
    bay's verdict: :mod:`droprig.solver.summary`, the refinement, the confirmation
    and the choice of points run through their own history)."""
    U = np.where(np.isnan(utilisation), 0.0, utilisation)
    return response * 1e6 + np.minimum(U, 1e5)
