"""A level prepared for analysis under one set of settings: load path
(:mod:`droprig.solver.loadpath`), resistances (:mod:`droprig.solver.capacity`,
:mod:`droprig.solver.deck`) and the actions of the existing loads (member self-weight,
deck self-weight, superimposed dead and live load left in place, by tributary width;
AISC Manual Table 3-23 by superposition). Prepared floors are remembered between
analyses (:func:`floor_model`).

SI units (N, N·m, m, Pa)."""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any, cast

import numpy as np

from droprig.model import ColumnGrid, Grade, Level, Member, ModelError, Project, Section, Settings
from droprig.model.project import EndCondition
from droprig.solver import beam, cancel, capacity, composite, contact, deck, impact
from droprig.solver.candidates import CandidateTables, candidate_tables
from droprig.solver.loadpath import COND_NAMES, Frame, build_frame, tributary_widths

__all__ = ["FloorModel", "build_floor", "existing_moment", "floor_cache", "floor_model",
           "member_floor", "remember"]


@dataclass(frozen=True, eq=False)
class FloorModel:
    """A level prepared for analysis under one set of settings (see :func:`build_floor`).

    Per member: flexural and shear resistance ``Mr`` (N·m), ``Vr`` (N), existing
    uniform load ``w0`` (N/m) and end reactions ``V0`` (N); existing loads at the
    nodes ``P0`` (N); existing moments at the support-member stations of each
    panel ``M0_sup`` (N·m). Deck: existing pressure ``q0`` (Pa) and moment
    resistance per width ``deck_Mr`` (N·m/m). ``hinge``: per member, can its section
    form a plastic hinge (AISC 360-16 App. 1 / EN 1993-1-1 Class 1)?
    """

    level: Level
    settings: Settings
    frame: Frame
    Mr: np.ndarray
    Vr: np.ndarray
    w0: np.ndarray
    V0: np.ndarray
    P0: np.ndarray
    M0_sup: np.ndarray
    q0: float
    deck_Mr: float
    group: np.ndarray
    groups: tuple[tuple[object, object], ...]
    warnings: tuple[str, ...] = field(default=())
    hinge: np.ndarray | None = None
    tables: CandidateTables | None = None
    _mass: float | None = field(default=None, repr=False)
    _memo: dict = field(default_factory=dict, repr=False)
    """Small load-independent tables computed on first use (web resistances per
    bearing length)."""

    @property
    def frame_mass(self) -> float:
        """Mass of all members of the level, kg (an upper bound of any Rayleigh
        effective mass of a load path)."""
        if self._mass is None:
            object.__setattr__(self, "_mass", float(sum(
                m.section.mass_per_length * m.span for m in self.level.members)))
        return self._mass  # type: ignore[return-value]


def build_floor(level: Level, settings: Settings) -> FloorModel:
    """Load path, resistances and existing-load actions of ``level``."""
    frame = build_frame(level, include_member_mass=settings.include_member_mass)
    basis = settings.design_basis
    phi, dif = settings.resistance_factor, settings.dynamic_increase_factor
    n_m = frame.n_members
    Mr_comp, EI_comp, comp_warn = composite_members(level, settings, tributary_widths(frame))
    if np.any(np.isfinite(EI_comp)):
        frame = build_frame(level, include_member_mass=settings.include_member_mass,
                            EI=np.where(np.isfinite(EI_comp), EI_comp, frame.EI))
    groups: list[tuple[object, object]] = []
    gidx = np.zeros(n_m, dtype=np.int64)
    Mr = np.zeros(n_m)
    Vr = np.zeros(n_m)
    hinge = np.ones(n_m, dtype=bool)
    cache: dict[tuple[object, object], tuple[float, float, int, bool]] = {}
    for k, m in enumerate(level.members):
        key = (m.section, m.grade)
        if key not in cache:
            try:
                mr = capacity.flexural_resistance(m.section, m.grade, basis, phi, dif)
                vr = capacity.shear_resistance(m.section, m.grade, basis, phi, dif)
                hk = capacity.plastic_hinge_capable(m.section, m.grade, basis)
            except ValueError as exc:
                raise ModelError(f"level {level.id}.members[{m.id}].section", m.section.name,
                                 f"a section droprig can check ({exc})") from exc
            cache[key] = (mr, vr, len(groups), hk)
            groups.append(key)
        Mr[k], Vr[k], gidx[k], hinge[k] = cache[key]
        if np.isfinite(Mr_comp[k]):
            Mr[k] = Mr_comp[k]
    # existing loads
    warnings: list[str] = list(comp_warn)
    g = impact.G
    q0 = 0.0
    w0 = np.zeros(n_m)
    if settings.include_existing_loads:
        q0 = level.deck.self_weight_pressure + level.superimposed_dead + level.live_in_place
        w0 = np.array([m.section.mass_per_length * g for m in level.members])
        w0 = w0 + q0 * tributary_widths(frame)
    n_n = frame.n_nodes
    b = np.zeros(n_n + 1)
    udl_R = np.zeros((n_m, 2))
    for k in range(n_m):
        R0, RL = beam.udl_reactions(COND_NAMES[frame.cond[k]], frame.L[k], w0[k])
        udl_R[k] = (R0, RL)
        for e in range(2):
            b[frame.end_node[k, e]] += udl_R[k, e]
    b[n_n] = 0.0
    P0 = frame.T @ b
    V0 = udl_R.copy()
    for k in range(n_m):
        on = frame.nodes_on[k]
        if on.size:
            R0, RL = beam.unit_reactions(COND_NAMES[frame.cond[k]], frame.L[k], frame.node_pos[on])
            V0[k, 0] += R0 @ P0[on]
            V0[k, 1] += RL @ P0[on]
    M0_sup = np.zeros(frame.pair_sup_x.shape)
    for ip in range(frame.n_pairs):
        for jp, mm in enumerate(frame.pair_sup_member[ip]):
            if mm < 0:
                continue
            M0_sup[ip, jp] = existing_moment(frame, w0, P0, int(mm), frame.pair_sup_x[ip, jp])
    # members already over capacity under the existing loads alone
    for k, m in enumerate(level.members):
        if k % 64 == 0:
            cancel.check()  # stops a cancelled analysis (solver/cancel.py)
        xs = np.linspace(0.0, frame.L[k], 21)
        M_ex = np.max(np.abs(existing_moment(frame, w0, P0, k, xs)))
        if M_ex > Mr[k] or np.max(V0[k]) > Vr[k]:
            warnings.append(f"level {level.id}: member {m.id} is over capacity under the "
                            "existing loads alone; every drop on its load path exceeds")
    deck_Mr = deck.deck_flexure_resistance(level.deck, basis, phi)
    return FloorModel(level=level, settings=settings, frame=frame, Mr=Mr, Vr=Vr, w0=w0,
                      V0=V0, P0=P0, M0_sup=M0_sup, q0=q0, deck_Mr=deck_Mr, group=gidx,
                      groups=tuple(groups), warnings=tuple(warnings), hinge=hinge,
                      tables=candidate_tables(frame, Mr, Vr, V0, M0_sup))


def composite_members(level: Level, settings: Settings, trib: np.ndarray
                      ) -> tuple[np.ndarray, np.ndarray, list[str]]:
    """Plastic moment (N·m) and stiffness E·I (N·m²) of the members studded to the deck
    (``Member.composite``), NaN for the others, and warnings.

    Full shear connection (EN 1994-1-1 §6.2.1.2 / AISC 360-16 §I3.2a,
    :func:`droprig.solver.composite.composite_plastic_moment`) with the effective
    width min(L/8, half the spacing) a side (§5.4.1.2 / §I3.1a; the spacing from the
    member's tributary deck width) and the concrete over the ribs; the transformed
    uncracked inertia with the short-term modular ratio E_a/E_cm (§5.4.2.2) for the
    stiffness (stiffer: a higher impact force). Only simply supported members: the
    hogging ends of fixed or propped members are steel alone, so their flag is
    ignored with a warning. The resistance factor and the dynamic increase factor
    apply as for steel."""
    n = len(level.members)
    Mr = np.full(n, np.nan)
    EI = np.full(n, np.nan)
    warn: list[str] = []
    dk = level.deck
    basis = settings.design_basis
    for k, m in enumerate(level.members):
        if not m.composite:
            continue
        if m.end_condition != "simple" or trib[k] <= 0.0:
            warn.append(f"member {m.id}: composite action is taken only for a simply "
                        "supported member carrying deck; it is checked as steel alone")
            continue
        sec = composite.CompositeSection(
            d=m.section.d, bf=m.section.bf, tf=m.section.tf, tw=m.section.tw, A=m.section.A,
            Ix=m.section.Ix, b_eff=composite.effective_width(m.span, trib[k], trib[k], basis),
            h_c=dk.thickness - dk.rib_height, h_p=dk.rib_height)
        fy = m.grade.section_fy(m.section) * settings.dynamic_increase_factor
        Mr[k] = settings.resistance_factor * composite.composite_plastic_moment(
            sec, fy, dk.concrete.fc, basis)
        n_mod = m.grade.E / contact.concrete_modulus(dk.concrete.fc, basis)
        EI[k] = m.grade.E * composite.transformed_inertia(sec, n_mod)
    return Mr, EI, warn


def existing_moment(frame: Frame, w0: np.ndarray, P0: np.ndarray, k: int,
                    x: np.ndarray) -> np.ndarray:
    """Moment (N·m, sagging +) at ``x`` of member ``k`` under its existing uniform load
    and the existing loads of the members resting on it (statics, AISC Manual
    Table 3-23 by superposition)."""
    c = COND_NAMES[frame.cond[k]]
    x = np.asarray(x, float)
    M = beam.udl_moment(c, frame.L[k], w0[k], x)
    on = frame.nodes_on[k]
    if on.size:
        M = M + beam.unit_moment(c, frame.L[k], x[..., None], frame.node_pos[on]) @ P0[on]
    return M


_FLOORS: dict[tuple[Level, Settings], FloorModel] = {}
_FLOORS_MAX = 8
"""Prepared floors kept between analyses (keyed by value: an edited level or changed
settings builds afresh). Live re-analysis after a zone or load edit reuses them."""


def floor_model(level: Level, settings: Settings) -> FloorModel:
    """:func:`build_floor`, remembered for the last few (level, settings) pairs."""
    return remember(_FLOORS, (level, settings), lambda: build_floor(level, settings))


def remember(cache: dict, key: object, make: Callable[[], object]) -> Any:
    """``cache[key]``, made by ``make()`` when missing; the oldest of more than
    :data:`_FLOORS_MAX` entries is dropped."""
    got = cache.get(key)
    if got is None:
        got = make()
        if len(cache) >= _FLOORS_MAX:
            cache.pop(next(iter(cache)))
        cache[key] = got
    return got


def floor_cache(project: Project) -> Callable[[str], FloorModel]:
    def get(level_id: str) -> FloorModel:
        return floor_model(project.level(level_id), project.settings)

    return get



MEMBER_TWIN_SPACING = 1.0
"""Distance (m) of the unloaded twin that closes the deck panel of a one-member floor
(:func:`member_floor`); it carries no share of a load on the member's line."""


def member_floor(section: Section, grade: Grade, cond: str, L: float, w0: float,
                 settings: Settings) -> FloorModel:
    """A floor of one member for ``droprig check``: the member (span ``L``, m; end
    condition ``cond``) on two columns, with its existing uniform load ``w0`` (N/m:
    self-weight and a given UDL, no deck). The floor's load path needs a deck panel
    between two parallel members; the second member is an unloaded twin
    :data:`MEMBER_TWIN_SPACING` away: a load on the member's own line gives the twin a
    lever-rule share of exactly 0 (common practice, no source), so it adds no
    compliance, mass, demand or existing load. Resistances as :func:`build_floor`
    (:mod:`droprig.solver.capacity`); the deck is not used (the chain runs deck-less,
    :class:`droprig.solver.chain.BareMember`). SI units."""
    s = MEMBER_TWIN_SPACING
    grid = ColumnGrid((0.0, L), (0.0, s), ("1", "2"), ("A", "B"))
    members = tuple(Member(mid, "beam", (0.0, y), (L, y), section, grade,
                           cast(EndCondition, cond)) for mid, y in (("member", 0.0),
                                                                    ("twin", s)))
    level = Level(id="member", name="one member", elevation=0.0, grid=grid,
                  members=members, superimposed_dead=0.0, live_in_place=0.0)
    frame = build_frame(level, include_member_mass=settings.include_member_mass)
    basis = settings.design_basis
    phi, dif = settings.resistance_factor, settings.dynamic_increase_factor
    mr = capacity.flexural_resistance(section, grade, basis, phi, dif)
    vr = capacity.shear_resistance(section, grade, basis, phi, dif)
    hinge = capacity.plastic_hinge_capable(section, grade, basis)
    Mr, Vr = np.full(2, mr), np.full(2, vr)
    w = np.array([w0, 0.0])
    V0 = np.zeros((2, 2))
    V0[0] = beam.udl_reactions(cond, L, w0)  # type: ignore[arg-type]
    P0 = np.zeros(frame.n_nodes + 1)
    M0_sup = np.zeros(frame.pair_sup_x.shape)
    return FloorModel(level=level, settings=settings, frame=frame, Mr=Mr, Vr=Vr, w0=w,
                      V0=V0, P0=P0, M0_sup=M0_sup, q0=0.0, deck_Mr=math.nan,
                      group=np.zeros(2, dtype=np.int64), groups=((section, grade),),
                      hinge=np.full(2, hinge),
                      tables=candidate_tables(frame, Mr, Vr, V0, M0_sup))
