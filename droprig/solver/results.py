"""Result containers of an analysis (SI units; arrays per drop point).

This is the contract between the solver and the edges (GUI, report, CLI).
Arrays use ``nan`` for "not applicable / none exists"; every edge turns nan into
an explicit word (``none``) or JSON ``null`` — never prints a bare NaN.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Literal

import numpy as np

RESPONSES: tuple[str, ...] = ("elastic", "plastic", "exceeds")
"""Response states, worst last. ``elastic``: every check U ≤ 1. ``plastic``:
only flexure exceeded, and the plastic energy balance stays within the ductility
and rotation limits. ``exceeds``: anything else (collapse, brittle check,
limits passed, drop through an opening)."""
ELASTIC, PLASTIC, EXCEEDS = 0, 1, 2

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
                     "plastic_accept", "keep_clear", "opening"]
ADVICE_KINDS: tuple[AdviceKind, ...] = ("none", "limit_height", "mat", "limit_or_mat",
                                        "plastic_mat", "plastic_accept", "keep_clear",
                                        "opening")
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
"""

DECK = -1
"""``governing_member`` value when the deck governs (or no member is involved)."""


@dataclass(frozen=True, eq=False)
class CaseResult:
    """All drop points of one load in one lift zone.

    Every array has shape (n,). ``bay`` indexes ``Results.bays_of(level_id)``
    order (``droprig.model.bays``), ``-1`` outside any bay; ``governing_member``
    indexes ``level.members`` (``DECK`` for the deck); ``protection`` indexes
    ``project.protection_areas`` (``-1`` for bare deck).
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
    load's planned free fall. Text for people: :func:`droprig.advice.advice_text`.
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


@dataclass(frozen=True, eq=False)
class Results:
    cases: tuple[CaseResult, ...] = ()
    bays: tuple[BaySummary, ...] = ()
    warnings: tuple[str, ...] = field(default=())

    @property
    def n_points(self) -> int:
        return sum(c.n for c in self.cases)
