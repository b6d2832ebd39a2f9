"""The per-point chain of the floor analysis, written once as named steps.

For the drop points of a :class:`Drop` (vectorised; SI units) every step is one
function that reads the results of the steps before it from the :class:`Chain` and
returns a small frozen dataclass of numpy arrays, one value per point:

1. :func:`load_inputs` → :class:`LoadInputs`: weight, footprint, the load's own
   underside, protection (mat thickness and springs, crushable layer), the drop
   height H on one datum (load underside above the finished surface of the level,
   :func:`droprig.solver.analysis.planned_height`) and the free fall onto the struck
   surface h = H − t_mat (mat top where a protection area covers p); footprint spread
   1:1 through a mat (common practice, no source).
2. :func:`compliance` → :class:`Compliance`: framing f_s (:mod:`~droprig.solver.loadpath`),
   deck indentation and strip bending f_deck (:mod:`~droprig.solver.contact`), the
   load's underside 1/k_load and a spring mat 1/k, in series (1/k_eff = Σ 1/k_i;
   Gere 7th ed. §9.10 energy method).
3. :func:`struck_mass` → :class:`StruckMass`: Rayleigh mass of the path scaled to
   the struck point's own deflection, m_e·(f_s/f)² with f = f_s + f_deck + 1/k_load
   (Timoshenko, Strength of Materials Part I, from memory); zero under a mat or a
   crushable layer (η = 1, conservative); η = M/(M + m_e).
4. :func:`impact` → :class:`Impact`: K = 1 + √(1 + 2ηh/(W f)), F = K·W, δmax = K·W·f
   (Gere Eq. 9-94 with Timoshenko's mass correction, :mod:`~droprig.solver.impact`);
   a crushable layer by :func:`~droprig.solver.impact.impact_crushable`.
5. :func:`demands` → :class:`Demands`: every check family at F (flexure, shear, web
   yielding and crippling under the load, deck flexure and punching), each linear in
   F: demand = F·unit + existing (:mod:`~droprig.solver.linear_checks`).
5a. :func:`dynamic_amplification` → :class:`DynamicAmplification`: factors ≥ 1 on
   the energy method's contact force, member moment and shear from the time-history
   calibration of :mod:`~droprig.solver.amplification` (the energy method reads low
   for loads light against the struck mass); the contact force also bounded by the
   load on its contact spring against an immovable point.
5b. :func:`amplified_demands` → :class:`Demands` (replacing step 5's): every check
   family at its amplified force — flexure at A_M·F, shear at A_V·F, web, deck
   flexure and punching at min(A_F·F, bound) — so the checks use the larger of the
   energy method and the time-history-based demand; beyond yield (steps 7 and 8) the
   kinetic energy is scaled by A_δ².
6. :func:`checks` → :class:`Checks`: the elastic verdict (largest U, least F_allow,
   governing member and check) and the brittle checks at the force the yielding path
   can pass on, R_p (DNV-RP-C204 accidental limit state, from memory).
7. :func:`beyond_yield` → :class:`BeyondYield`: elastic–perfectly-plastic energy
   balance (Biggs 1964), ductility and support rotation against the settings
   (:mod:`~droprig.solver.plastic`), on sections able to form a hinge only.
8. :func:`inverse_answers` → :class:`InverseAnswers`: allowable drop heights, mass,
   mat stiffness, crush stroke (:mod:`~droprig.solver.limits`).
9. :func:`local_damage` → :class:`LocalDamage`: penetration, scabbing and perforation
   of the bare deck by a hard load, flat, on an edge and on a corner, the worst
   governing (modified NDRC + Kennedy, UKAEA/Barr, Chang;
   :mod:`~droprig.solver.local_damage`); a point that perforates reads
   ``perforates`` whatever the framing does.

:func:`run_chain` runs :data:`STEPS` in order; :func:`outputs` writes the
:class:`~droprig.solver.results.CaseResult` arrays from a chain. A new physics step is
one function and one dataclass, and one line in :data:`STEPS` (see DEVELOPERS.md,
"Adding a step to the chain"). A step may return the type of an earlier step to
replace it for the steps after it (e.g. a refined :class:`Compliance`).
"""

from __future__ import annotations

import itertools
from collections import OrderedDict
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, fields, replace
from typing import NamedTuple, TypeVar, cast

import numpy as np

from droprig.model import Level, LiftLoad, ModelError, Project, ProtectionArea
from droprig.solver import amplification as amp_mod
from droprig.solver import (
    capacity,
    columns,
    composite,
    contact,
    crush_table,
    crushing,
    deck,
    limits,
    loadpath,
    pads,
    plastic,
    pointhistory,
    slab,
)
from droprig.solver import footprint as footprint_mod
from droprig.solver import impact as impact_mod
from droprig.solver import local_damage as local_damage_mod
from droprig.solver import struck_mass as struck_mass_mod
from droprig.solver.floor import FloorModel
from droprig.solver.geometry import Geometry, _rows, take_geo
from droprig.solver.linear_checks import Check, Family, small_check
from droprig.solver.loadpath import COND_NAMES
from droprig.solver.results import (
    CHECKS,
    DECK,
    ELASTIC,
    EXCEEDS,
    PERFORATES,
    PLASTIC,
    severity,
)
from droprig.solver.unit_actions import (
    UnitActions,
    argmax_nan_low,
    unit_actions,
    web_resistances,
)

__all__ = [
    "BRITTLE",
    "CHECK",
    "LANDINGS",
    "STEPS",
    "BareMember",
    "BeyondYield",
    "Chain",
    "Checks",
    "Compliance",
    "Demands",
    "Drop",
    "DynamicAmplification",
    "Impact",
    "InverseAnswers",
    "LoadInputs",
    "LocalDamage",
    "SlabResistance",
    "StruckMass",
    "amplified_demands",
    "dynamic_amplification",
    "merge_landings",
    "outputs",
    "planned_height",
    "run_chain",
]

CHECK = {name: i for i, name in enumerate(CHECKS)}
BRITTLE = ("shear", "web_yielding", "web_crippling", "deck_flexure", "deck_punching",
           "connection")
"""Checks with no plastic reserve (DNV-RP-C204 accidental limit state, from memory)."""

FIELDS = ("x", "y", "bay", "protection", "drop_height", "static_deflection",
          "effective_mass", "dynamic_factor", "peak_force", "max_deflection",
          "deceleration_g", "utilisation", "governing_member", "governing_check",
          "response", "allowable_drop_height", "allowable_drop_height_plastic",
          "allowable_mass", "plastic_deflection", "ductility", "support_rotation",
          "required_mat_stiffness", "required_crush_stroke", "penetration", "scabbing",
          "scabbing_height", "perforation_height", "residual_velocity",
          "local_extrapolated", "strike_orientation", "dent_depth", "dent_height",
          "fall_height",
          "structure_compliance", "allowable_height_check", "allowable_height_member",
          "allowable_height_plastic_check", "utilisation_check", "utilisation_member")
"""The :class:`~droprig.solver.results.CaseResult` arrays, in order."""

_NONE_AT_OPENING = ("static_deflection", "effective_mass", "dynamic_factor", "peak_force",
                    "max_deflection", "deceleration_g", "allowable_drop_height",
                    "allowable_drop_height_plastic", "allowable_mass",
                    "plastic_deflection", "ductility", "support_rotation",
                    "required_mat_stiffness", "required_crush_stroke", "penetration",
                    "scabbing_height", "perforation_height", "residual_velocity",
                    "dent_depth", "dent_height")


# --------------------------------------------------------------------------- the runner
@dataclass(frozen=True)
class BareMember:
    """The deck-less mode of the chain (``droprig check``: a floor of one member,
    :func:`droprig.solver.floor.member_floor`): the load bears on the member's top
    flange over ``bearing`` (m; 0 = a point contact), mass ``mass`` (kg) falling
    ``h`` (m) onto the member; in series with it the load's underside ``f_load`` and a
    spring cushion ``f_mat`` (m/N, 0 = none); a crushable layer with crush force
    ``F_c`` (N, ∞ = none) and stroke ``s_c`` (m). No deck: no deck compliance,
    crushing, deck or connection checks, no local damage."""

    mass: float
    h: float
    bearing: float = 0.0
    f_load: float = 0.0
    f_mat: float = 0.0
    F_c: float = np.inf
    s_c: float = 0.0

    @property
    def cushioned(self) -> bool:
        """A cushion or a crushable layer lies between load and member."""
        return self.f_mat > 0.0 or bool(np.isfinite(self.F_c))


@dataclass(frozen=True, eq=False)
class Drop:
    """What is dropped where: the points of ``geo`` on the prepared floor ``fm``, the
    load of each point ``loads[li]``; ``detail`` keeps what the calculation trace shows
    (the governing candidate of every check, beyond yield at every point).

    Trials of a permit condition (:mod:`droprig.solver.confirm`) give per point
    ``H``: the drop height on the datum in place of the load's planned one (m), and
    ``mat_k``: the stiffness of a spring mat laid on the finished surface under the
    whole footprint (N/m; nan = none), as the permit's advised mat is laid.

    ``v_hoist``: the hoist's lowering speed when the load is let go (the zone's
    ``hoist_speed``, m/s): the strike speed V = √(v_h² + 2gh) of every step — the
    energy balances take h + v_h²/(2g) (:func:`energy_fall`), the local-damage step
    V itself.

    ``bare``: the deck-less mode of one member (``loads`` then empty, the load in
    ``bare``).

    ``landing``: ``flat`` (the whole footprint meets the deck) or ``tilted`` (the load
    lands out of level on one edge: :data:`LANDINGS`).

    ``trial``: a forward run of :mod:`droprig.solver.confirm` (a condition tried). Its
    verdict is the forward steps'; its inverse answers only guide the next trial
    value, so they are the closed forms, not confirmed again by forward runs of
    their own (:func:`confirm_amplified_height`): each printed limit is confirmed
    once, by the trial.

    ``outcomes_only``: the forward run of the outcome stage
    (:func:`droprig.solver.analyse_outcomes`, what the window paints while the limits
    are being confirmed). The inverse answers that only the confirmation and the
    printed limits read — the plastic allowable height and the allowable mass, the
    costliest of :func:`inverse_answers` — are not worked out: NaN (``hp_check`` −1),
    never a number that could pass for a limit. Every forward step, the elastic
    allowable height (the refinement places its points by it), the required mat and
    the check that sets the height are as in a full run.

    ``tip_off``: the Δ per point (m) of the second case of a footprint partly on a
    crushable pad — the load tips over the pad's edge and strikes the bare deck beside
    it with at most the energy of a fall H − Δ (:func:`tip_offsets`); where H ≤ Δ
    the fall onto the deck is 0 and the run gives the case's inverse answers only
    (:func:`tip_off_case_rows`; :func:`droprig.solver.evaluate` runs it there and
    keeps the worse case, :func:`merge_tip_off`). NaN at a row: that row is the
    ordinary case (the floor analysis folds the rows whose only case is the tip-off
    into its ordinary run, :func:`_folded_inputs`). ``None``: the ordinary run."""

    fm: FloorModel
    project: Project
    geo: Geometry
    loads: tuple[LiftLoad, ...]
    li: np.ndarray
    detail: bool = False
    H: np.ndarray | None = None
    mat_k: np.ndarray | None = None
    v_hoist: float = 0.0
    bare: BareMember | None = None
    landing: str = "flat"
    trial: bool = False
    outcomes_only: bool = False
    tip_off: np.ndarray | None = None

    @property
    def n(self) -> int:
        return int(self.geo.x.size)

    def per_point(self, values: list[float]) -> np.ndarray:
        """One value per load, spread to the points (n,)."""
        n = self.n
        return np.full(n, values[0]) if len(values) == 1 else np.array(values)[self.li]


S = TypeVar("S")


class Chain:
    """The results of the steps run so far for one :class:`Drop`, by step type:
    ``chain[Compliance]``. A step that returns the type of an earlier step replaces
    it for the steps after it; ``history`` keeps every result in order."""

    def __init__(self, drop: Drop) -> None:
        self.drop = drop
        self._by_type: dict[type, object] = {}
        self.history: list[object] = []
        self._once: dict[Callable[[Chain], object], object] = {}

    def __getitem__(self, kind: type[S]) -> S:
        return cast(S, self._by_type[kind])

    def __contains__(self, kind: type) -> bool:
        return kind in self._by_type

    def add(self, result: object) -> None:
        if type(result) in self._by_type:
            self._once.clear()  # a result replaced: what was read from it is stale
        self._by_type[type(result)] = result
        self.history.append(result)

    def once(self, fn: Callable[[Chain], S]) -> S:
        """``fn(self)`` — a quantity read from the step results so far that more than
        one step needs — worked out once per chain (again after a step replaces a
        result). Callers must not write into what it returns."""
        if fn not in self._once:
            self._once[fn] = fn(self)
        return cast(S, self._once[fn])

    def kept(self, fn: Callable[[Chain], S]) -> S | None:
        """What :meth:`once` holds of ``fn`` (``None`` where not worked out)."""
        return cast("S | None", self._once.get(fn))


# --------------------------------------------------------------------------- 1. inputs
@dataclass(frozen=True, eq=False)
class LoadInputs:
    """Per point: weight ``W`` (N), mass ``M`` (kg), footprint ``fl`` × ``fw`` (m),
    the load's underside compliance ``f_load`` (m/N, 0 = rigid); protection: mat
    thickness ``t_mat`` (m), spring mat compliance ``f_mat`` (m/N), crushable layer
    ``crushable`` with crush force ``F_c`` (N, ∞ none) and stroke ``s_c`` (m); drop
    height ``H`` above the finished surface (m, the datum) and the free fall ``h`` =
    H − t_mat onto the struck surface (m); footprint on the deck ``foot_l`` ×
    ``foot_w`` (spread 1:1 through a mat, then cut at the deck's edges and openings:
    a rectangle of the footprint's proportions with the area that bears, m) and
    bearing length on a flange ``lb`` (its smaller side, m); ``protected``: a pad or
    mat lies under the load (the framing's mass share is then not taken). Under a
    crushable layer the footprint spreads through what is left of it once its stroke
    is spent, t_r = thickness − stroke (the area that bears on the deck after the
    layer bottoms out), and ``f_layer`` (m/N) is that spent layer's own compliance,
    in series with the contact (:func:`droprig.solver.pads.spent_layer_compliance`;
    0 elsewhere). ``base_l`` × ``base_w`` (m): the contact spread through the layer
    as ``foot_l`` × ``foot_w`` but not cut at the deck's edges — the extent of the
    load's base over the framing, which rests on an edge member it overhangs
    (:func:`compliance`; ``None`` where the drop has no deck).
    ``pad``: the protection area the load lands on (index into the
    project's, −1 none; a crushable pad under any part of the footprint,
    :func:`landing_pads`); ``fall_offset``: in the tip-off run (``Drop.tip_off``) the
    Δ of :func:`tip_offsets` (then h = H − Δ onto the bare deck), else ``None``."""

    W: np.ndarray
    M: np.ndarray
    fl: np.ndarray
    fw: np.ndarray
    f_load: np.ndarray
    t_mat: np.ndarray
    f_mat: np.ndarray
    F_c: np.ndarray
    s_c: np.ndarray
    crushable: np.ndarray
    h: np.ndarray
    H: np.ndarray
    foot_l: np.ndarray
    foot_w: np.ndarray
    lb: np.ndarray
    protected: np.ndarray
    f_layer: np.ndarray
    base_l: np.ndarray | None = None
    base_w: np.ndarray | None = None
    pad: np.ndarray | None = None
    fall_offset: np.ndarray | None = None

    @property
    def datum_offset(self) -> np.ndarray:
        """H − h before any clamping, m: the pad's or mat's thickness (the allowable
        falls plus this are heights on the datum), the tip-off's Δ in its run."""
        return self.t_mat if self.fall_offset is None else self.fall_offset


def load_inputs(c: Chain) -> LoadInputs:
    """:class:`LoadInputs` of the drop (common practice for the 1:1 spread, no source):
    the loads' own values per point, the layers under them
    (:func:`_protection_inputs`), a trial mat (:mod:`droprig.solver.confirm`), the
    drop heights (:func:`_drop_heights`) and the contact on the deck
    (:func:`_contact_sides`, :func:`_footprint_on_deck`)."""
    d = c.drop
    if d.bare is not None:
        return _bare_load_inputs(d.bare, d.n)
    loads, geo = d.loads, d.geo
    W = d.per_point([ld.weight for ld in loads])
    M = d.per_point([ld.mass for ld in loads])
    fl = d.per_point([ld.footprint_length for ld in loads])
    fw = d.per_point([ld.footprint_width for ld in loads])
    # the load's own underside (skid, base frame, dunnage) in series: 1/k_load, 0 = rigid
    f_load = d.per_point([0.0 if ld.contact_stiffness is None else 1.0 / ld.contact_stiffness
                          for ld in loads])
    cl, cw = _contact_sides(d, fl, fw)
    if d.tip_off is not None:
        delta = np.asarray(d.tip_off, float)
        tip = _tip_off_inputs(d, W, M, fl, fw, f_load, cl, cw, landing_pads(d, fl, fw),
                              delta)
        folded = ~np.isnan(delta)
        if folded.all():
            return tip
        return _folded_inputs(_ordinary_inputs(d, W, M, fl, fw, f_load, cl, cw), tip,
                              folded, np.asarray(geo.protection))
    return _ordinary_inputs(d, W, M, fl, fw, f_load, cl, cw)


def _ordinary_inputs(d: Drop, W: np.ndarray, M: np.ndarray, fl: np.ndarray,
                     fw: np.ndarray, f_load: np.ndarray, cl: np.ndarray,
                     cw: np.ndarray) -> LoadInputs:
    """:func:`load_inputs` of the ordinary run (no tip-off): the layer under the drop
    point, a trial mat, the drop heights and the contact on the deck."""
    on = np.asarray(d.geo.protection)
    t_mat, f_mat, F_c, s_c, crushable, stroke = _protection_inputs(d, fl, fw, cl, cw, on, W)
    # one datum: the load's underside above the finished surface of the level (given,
    # or hook elevation − hang length − level elevation); the fall onto a pad or mat
    # is that less its thickness
    protected = on >= 0
    if d.mat_k is not None:
        # a trial mat on the finished surface under the whole footprint (confirm.py)
        trial = np.isfinite(d.mat_k) & (d.mat_k > 0.0)
        f_mat = np.where(trial, 1.0 / np.where(trial, d.mat_k, 1.0), f_mat)
        protected = protected | trial
    H, h = _drop_heights(d, t_mat)
    t_spread, f_layer = _spent_layer(cl, cw, t_mat, stroke, crushable)
    foot_l, foot_w = _footprint_on_deck(d, cl, cw, t_spread)
    lb = _web_bearing(d, foot_l, foot_w)
    return LoadInputs(W=W, M=M, fl=fl, fw=fw, f_load=f_load, t_mat=t_mat, f_mat=f_mat,
                      F_c=F_c, s_c=s_c, crushable=crushable, h=h, H=H, foot_l=foot_l,
                      foot_w=foot_w, lb=lb, protected=protected, f_layer=f_layer,
                      base_l=cl + 2.0 * t_spread, base_w=cw + 2.0 * t_spread)


def _folded_inputs(ordinary: LoadInputs, tip: LoadInputs, folded: np.ndarray,
                   protection: np.ndarray) -> LoadInputs:
    """:class:`LoadInputs` of a run whose ``folded`` rows are the tip-off case (``tip``,
    :func:`_tip_off_inputs`) and whose other rows are the ordinary case (``ordinary``;
    its pad the drop point's ``protection``, its datum offset its layer's thickness):
    row by row the one or the other, so that each row's steps are those of a run of its
    case alone (every step works point by point). The floor analysis folds the rows
    where the tip-off is the point's only case into its ordinary run
    (:func:`droprig.solver.evaluate._outputs`)."""
    vals: dict[str, np.ndarray] = {}
    for f in fields(LoadInputs):
        a, b = getattr(ordinary, f.name), getattr(tip, f.name)
        if f.name == "pad":
            a = protection
        elif f.name == "fall_offset":
            a = ordinary.t_mat
        vals[f.name] = np.where(folded, b, a)
    return LoadInputs(**vals)


def _tip_off_inputs(d: Drop, W: np.ndarray, M: np.ndarray, fl: np.ndarray,
                    fw: np.ndarray, f_load: np.ndarray, cl: np.ndarray, cw: np.ndarray,
                    on: np.ndarray, delta: np.ndarray) -> LoadInputs:
    """:class:`LoadInputs` of the tip-off case (``Drop.tip_off``): the bare deck beside
    the pad's edge, struck with at most the energy of a fall h = H − Δ
    (``delta``, :func:`tip_offsets`; m), the contact ``cl`` × ``cw`` with no layer
    under it (spread by a trial mat as any mat); no pad credit, no spent layer; the
    base over the framing ``cl`` × ``cw`` (nothing to spread it, as :func:`load_inputs`
    off a pad)."""
    n = d.n
    zero = np.zeros(n)
    H, _ = _drop_heights(d, zero)
    h = np.maximum(H - np.where(np.isfinite(delta), delta, H), 0.0)
    f_mat = zero.copy()
    protected = np.zeros(n, dtype=bool)
    if d.mat_k is not None:
        trial = np.isfinite(d.mat_k) & (d.mat_k > 0.0)
        f_mat = np.where(trial, 1.0 / np.where(trial, d.mat_k, 1.0), f_mat)
        protected = trial
    foot_l, foot_w = _footprint_on_deck(d, cl, cw, zero)
    return LoadInputs(W=W, M=M, fl=fl, fw=fw, f_load=f_load, t_mat=zero, f_mat=f_mat,
                      F_c=np.full(n, np.inf), s_c=zero.copy(),
                      crushable=np.zeros(n, dtype=bool), h=h, H=H, foot_l=foot_l,
                      foot_w=foot_w, lb=_web_bearing(d, foot_l, foot_w), protected=protected,
                      f_layer=zero.copy(), base_l=cl, base_w=cw, pad=on,
                      fall_offset=np.where(np.isfinite(delta), delta, H))


def tip_off_case_rows(d: Drop) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The rows of ``d``'s points where a load lands partly on a crushable pad and may
    tip over its edge onto the deck at some height — Δ finite (:func:`tip_offsets`) —
    their Δ and the pad's thickness (m), and ``reach``: whether the drop height H is
    above Δ (the load then reaches the deck by tipping at H). The tip-off case
    (``Drop.tip_off``) is run at every one of them: where H ≤ Δ its response does not
    arise at H, but its allowable heights (≥ Δ) do at the heights they offer, so the
    heights the point offers are the lower of the two cases' whatever the planned
    height (:func:`merge_tip_off`). Δ depends on the plan only: remembered per point
    (:func:`_remembered_tip_offsets`) for the trials at other heights."""
    none = (np.zeros(0, dtype=np.int64), np.zeros(0), np.zeros(0),
            np.zeros(0, dtype=bool))
    if d.bare is not None or d.n == 0 or not any(
            pa.kind == "crushable" and pa.level_id == d.fm.level.id
            for pa in d.project.protection_areas):
        return none
    W = d.per_point([ld.weight for ld in d.loads])
    fl = d.per_point([ld.footprint_length for ld in d.loads])
    fw = d.per_point([ld.footprint_width for ld in d.loads])
    delta = _remembered_tip_offsets(d, W, fl, fw)
    if not np.isfinite(delta).any():
        return none
    H, _ = _drop_heights(d, np.zeros(d.n))
    rows = np.flatnonzero(np.isfinite(delta))
    on = landing_pads(d, fl[rows], fw[rows], rows)
    thick = np.array([float(pa.thickness) for pa in d.project.protection_areas] + [0.0])
    top = thick[on]  # on = −1 (none): the appended 0
    return rows, delta[rows], top, H[rows] > delta[rows]


_TIP_MEMO: OrderedDict[tuple, dict[bytes, float]] = OrderedDict()
_TIP_MEMO_POINTS = 400_000
"""Δ of :func:`tip_offsets` remembered per point (x, y, W, footprint:
:func:`_point_keys`) for one plan (:func:`_tip_memo_key`), up to this many points: the
confirmation tries the same points at other heights, and Δ depends on the plan only."""


def _tip_memo_key(d: Drop) -> tuple:
    """What Δ depends on besides the point and the load (:data:`_TIP_MEMO`): the
    protection areas, the level, the deck's plan extent (a pad's edge on it is no free
    edge, :func:`_deck_extent`) and the crush stresses of the level's crushable pads
    (a pad given by a crush force takes its stress from the loads' footprints,
    :func:`pad_crush_stress`): an edit of any of them is a new plan."""
    lv = d.fm.level
    stresses = tuple(pad_crush_stress(d.project, pa) for pa in d.project.protection_areas
                     if pa.level_id == lv.id and pa.kind == "crushable")
    return d.project.protection_areas, lv.id, _deck_extent(d), stresses


def _point_keys(*columns: np.ndarray) -> list[bytes]:
    """One key per point of the float ``columns`` (x, y, W, fl, fw): the bytes of its
    row of float64 values — equal values, equal keys (a −0.0 for a 0.0 only misses the
    memo and is worked out again)."""
    a = np.ascontiguousarray(np.stack([np.asarray(c, float) for c in columns], axis=1))
    return cast(list[bytes], a.view(np.dtype((np.void, 8 * a.shape[1]))).ravel().tolist())


_TURN_MEMO: OrderedDict[tuple, dict[bytes, tuple]] = OrderedDict()
"""The :class:`TipOffTurn` of every point of :data:`_TIP_MEMO` with a finite Δ, under
the same keys, as the plain tuple of its fields (a tuple of numbers and a string is
no work for the garbage collector, tens of thousands of objects would be): what the
calculation trace shows of a point the floor analysis worked out
(:func:`tip_off_turn`), found by the same search (:func:`_tip_turns`)."""


def _may_tip(d: Drop, fl: np.ndarray, fw: np.ndarray) -> np.ndarray:
    """Per point, whether :func:`tip_offsets` may be finite there — the points it need
    not be worked out at are left out, the answer unchanged: a footprint (either plan
    orientation: a square of half-side max(fl, fw)/2, m) that meets no crushable pad
    of the level has no pad to tip over (∞); one that lies with a margin of twice the
    thickest pad's thickness inside one pad and meets no other has every edge on the
    pad and no free edge within reach (∞, :func:`pads.footprint_tip_offset`)."""
    lv = d.fm.level
    pads_ = [pa for pa in d.project.protection_areas
             if pa.level_id == lv.id and pa.kind == "crushable"]
    x, y = d.geo.x, d.geo.y
    r = 0.5 * np.maximum(fl, fw)
    m = r + 2.0 * max(float(pa.thickness) for pa in pads_) + _ABUTS_TIP
    meets = np.zeros(d.n, dtype=np.int64)
    inside = np.zeros(d.n, dtype=bool)
    for pa in pads_:
        a = pa.area
        meets += ((x + m > a.x0) & (x - m < a.x1) & (y + m > a.y0) & (y - m < a.y1))
        inside |= (x - m >= a.x0) & (x + m <= a.x1) & (y - m >= a.y0) & (y + m <= a.y1)
    on_a_pad = np.zeros(d.n, dtype=bool)
    for pa in pads_:
        a = pa.area
        on_a_pad |= (x + r > a.x0) & (x - r < a.x1) & (y + r > a.y0) & (y - r < a.y1)
    return on_a_pad & ~(inside & (meets == 1))


_ABUTS_TIP = 1e-3
"""Slack on :func:`_may_tip`'s margins, m (the rounding of plan coordinates)."""


def _remembered_tip_offsets(d: Drop, W: np.ndarray, fl: np.ndarray,
                            fw: np.ndarray) -> np.ndarray:
    """:func:`tip_offsets` of ``d``'s points, each point worked out once
    (:data:`_TIP_MEMO`)."""
    key = _tip_memo_key(d)
    memo = _TIP_MEMO.setdefault(key, {})
    turns = _TURN_MEMO.setdefault(key, {})
    _TIP_MEMO.move_to_end(key)
    _TURN_MEMO.move_to_end(key)
    out = np.full(d.n, np.inf)
    at = np.flatnonzero(_may_tip(d, fl, fw))
    pts = _point_keys(d.geo.x[at], d.geo.y[at], W[at], fl[at], fw[at])
    got = np.fromiter(map(memo.get, pts, itertools.repeat(np.nan)), float, count=len(pts))
    out[at] = got
    miss = np.flatnonzero(np.isnan(got))
    new = at[miss]
    if new.size:
        on = landing_pads(d, fl[new], fw[new], new)
        tt = _tip_turns(d, d.geo.x[new], d.geo.y[new], fl[new], fw[new], on, W[new])
        out[new] = tt.delta
        new_pts = [pts[j] for j in miss.tolist()]
        memo.update(zip(new_pts, tt.delta.tolist(), strict=True))
        for j in np.flatnonzero(np.isfinite(tt.delta)).tolist():
            turns[new_pts[j]] = _turn_of(d, tt, int(on[j]), j)
        while sum(len(m) for m in _TIP_MEMO.values()) > _TIP_MEMO_POINTS and len(_TIP_MEMO) > 1:
            _TURN_MEMO.pop(next(iter(_TIP_MEMO)), None)
            _TIP_MEMO.popitem(last=False)
        if len(memo) > _TIP_MEMO_POINTS:
            memo.clear()
            turns.clear()
    return out


_TIP_LOWER = ("scabbing_height", "perforation_height", "dent_height")
_TIP_HIGHER = ("penetration", "dent_depth", "residual_velocity")


def merge_tip_off(on_pad: dict[str, np.ndarray], tip: dict[str, np.ndarray],
                  top: np.ndarray, reach: np.ndarray | None = None
                  ) -> dict[str, np.ndarray]:
    """The outputs of points whose load lands partly on a crushable pad
    (:func:`tip_off_case_rows`). Drop point on the pad: the worse of landing on it
    (``on_pad``, its crush credit by area) and tipping over its edge onto the deck
    (``tip``, :func:`tip_offsets`) governs, as between the two landings
    (:func:`merge_landings`); the deck's local damage the worse of the two (start
    heights the lower, NaN — not assessed — giving way to a number; depths and speeds
    the larger; scabbing either). Drop point off the pad (``on_pad`` is then the bare
    deck from H): the load cannot land flat on the bare deck, part of its footprint
    meets the pad first, and the tip-off is its case — from H − Δ, continuous with
    the bare deck as the footprint leaves the pad (Δ → 0); its ``protection`` is that
    pad, so that the permit lays it. A drop point on the pad needs H ≥ the pad's top
    ``top`` (m): an allowable height below it (the tip-off's) allows none (NaN).
    ``reach`` (bool per point, :func:`tip_off_case_rows`; ``None``: everywhere):
    where False the drop height H is at most Δ, the load does not reach the deck by
    tipping at H and the point keeps ``on_pad``'s outputs but for its allowable
    heights, the lower of the two cases' (the tip-off's hold at and above Δ; an
    allowable height taken from the planned height's case alone was not the one the
    point has at that height: rooftop spreader beam on 90 kN pads at (6.0, 7.5) m,
    3.961 m offered at a planned 1.0 m < Δ 1.073 m, the tip-off's U 1.0125 there)."""
    centre = on_pad["protection"] >= 0
    out = merge_landings(on_pad, tip)
    for k in ("allowable_drop_height", "allowable_drop_height_plastic"):
        out[k] = np.where(centre & (out[k] < top), np.nan, out[k])
    # the allowable heights every row keeps
    heights = {k: out[k] for k in (*_BY_HEIGHT, *_BY_PLASTIC_HEIGHT) if k in out}
    # the larger fall of the two: the datum offset H − h a margin may be taken from is
    # the smaller one (t on the pad, Δ tipping off)
    out["fall_height"] = np.fmax(on_pad["fall_height"], tip["fall_height"])
    for k in _TIP_LOWER:
        a, b = on_pad[k], tip[k]
        out[k] = np.where(np.isnan(a) | (b < a), b, a)
    for k in _TIP_HIGHER:
        out[k] = np.fmax(on_pad[k], tip[k])
    out["scabbing"] = on_pad["scabbing"] | tip["scabbing"]
    out = {k: np.where(centre, v, tip[k]) if k in tip else v for k, v in out.items()}
    if reach is None or bool(np.all(reach)):
        return out
    return {k: np.where(reach, v, heights[k] if k in heights else on_pad[k])
            for k, v in out.items()}


def landing_pads(d: Drop, fl: np.ndarray, fw: np.ndarray,
                 rows: np.ndarray | None = None) -> np.ndarray:
    """Per point, the crushable pad the load's footprint ``fl`` × ``fw`` (m; either plan
    orientation) lies on (index into the project's protection areas, −1 none): the
    one under the drop point (``Geometry.protection``), else the crushable pad of the
    level under the largest part of the footprint — a load whose centre is just off a
    pad still meets the part of it that is under its footprint and may tip over its
    edge (:func:`tip_offsets`). The pad's crush credit (:func:`_protection_inputs`)
    is taken where the drop point is on the pad only: off it, the load lands on the
    pad's edge and tips onto the deck, which the tip-off case bounds. A spring mat
    counts under the drop point only (its edge's tip-off is not modelled: README,
    limits). ``rows``: of the points ``rows`` of ``d`` only (``fl``, ``fw`` theirs)."""
    prot, xs, ys = d.geo.protection, d.geo.x, d.geo.y
    if rows is not None:
        prot, xs, ys = np.asarray(prot)[rows], xs[rows], ys[rows]
    on = np.asarray(prot).copy()
    free = np.flatnonzero(on < 0)
    lv = d.fm.level
    if d.bare is not None or free.size == 0:
        return on
    best = np.zeros(free.size)
    x, y = xs[free], ys[free]
    for i, pa in enumerate(d.project.protection_areas):
        if pa.level_id != lv.id or pa.kind != "crushable":
            continue
        r = pa.area
        for along_x in (True, False):
            rect = pads.footprint_rect(x, y, fl[free], fw[free], along_x)
            A = pads.rect_overlap_area(rect, (r.x0, r.y0, r.x1, r.y1))
            take = A > best
            best = np.where(take, A, best)
            on[free[take]] = i
    return on


def tip_offsets(d: Drop, fl: np.ndarray, fw: np.ndarray, on: np.ndarray,
                W: np.ndarray) -> np.ndarray:
    """Per point, the Δ (m) of a load tipping over the edge of the crushable pad it
    lands on (``on``, :func:`landing_pads`) onto the deck: it strikes the deck with
    at most the energy of a fall H − Δ
    (:func:`droprig.solver.pads.footprint_tip_offset` over that pad and every layer
    of the same kind and thickness, the less of the footprint's two plan
    orientations); ∞ where it cannot (the footprint wholly on the layers, a spring
    mat, no pad). W in N, footprint ``fl`` × ``fw`` in m."""
    return _tip_turns(d, d.geo.x, d.geo.y, fl, fw, on, W).delta


class _TipTurns(NamedTuple):
    """:func:`_tip_turns`' answer per point: Δ (m, ∞ none), the turn θ (rad), the
    length tipped over (m), the direction (index into
    :data:`droprig.solver.pads.TIP_DIRECTIONS`) and whether the footprint's length lies
    along x."""

    delta: np.ndarray
    theta: np.ndarray
    length: np.ndarray
    direction: np.ndarray
    along_x: np.ndarray


def _tip_turns(d: Drop, xs: np.ndarray, ys: np.ndarray, fl: np.ndarray, fw: np.ndarray,
               on: np.ndarray, W: np.ndarray) -> _TipTurns:
    """:func:`tip_offsets` at the points (``xs``, ``ys``; m) of ``d``'s plan with the
    turn, length and direction each Δ is found at (:class:`_TipTurns`):
    :func:`droprig.solver.pads.footprint_tip_turn` of both plan orientations in one
    call, the footprint's length along y kept only where its Δ is the less (as
    :func:`tip_off_turn_reference` picks it)."""
    prot, lv = d.project.protection_areas, d.fm.level
    n = xs.size
    out = _TipTurns(np.full(n, np.inf), np.full(n, np.nan), np.full(n, np.nan),
                    np.full(n, -1, dtype=np.int64), np.ones(n, dtype=bool))
    if d.bare is not None:
        return out
    for i, pa in enumerate(prot):
        if pa.level_id != lv.id or pa.kind != "crushable":
            continue
        sel = np.flatnonzero(on == i)
        if sel.size == 0:
            continue
        layers = _tip_layers(d, pa)
        x, y = xs[sel], ys[sel]
        # both plan orientations in one call
        a = pads.footprint_rect(x, y, fl[sel], fw[sel], True)
        b = pads.footprint_rect(x, y, fl[sel], fw[sel], False)
        rect = tuple(np.concatenate([u, v]) for u, v in zip(a, b, strict=True))
        tt = pads.footprint_tip_turn(rect, np.concatenate([W[sel], W[sel]]),  # type: ignore[arg-type]
                                     float(pa.thickness), layers, deck=_deck_extent(d))
        m = sel.size
        # along y where its Δ is a number less than along x's
        ay = np.isfinite(tt.delta[m:]) & (tt.delta[m:] < tt.delta[:m])
        pick = np.where(ay, np.arange(m) + m, np.arange(m))
        out.delta[sel] = np.minimum(tt.delta[:m], tt.delta[m:])
        out.theta[sel] = tt.theta[pick]
        out.length[sel] = tt.length[pick]
        out.direction[sel] = tt.direction[pick]
        out.along_x[sel] = ~ay
    return out


def _turn_of(d: Drop, tt: _TipTurns, pad: int, j: int) -> tuple:
    """The fields of the :class:`TipOffTurn` of point ``j`` of :func:`_tip_turns`'
    answer ``tt`` (Δ finite), on pad ``pad``, as a plain tuple (:data:`_TURN_MEMO`)."""
    return (pad, float(d.project.protection_areas[pad].thickness),
            float(tt.delta[j]), float(tt.theta[j]), float(tt.length[j]),
            pads.TIP_DIRECTIONS[int(tt.direction[j])], bool(tt.along_x[j]))


def _deck_extent(d: Drop) -> tuple[float, float, float, float]:
    """The deck's plan extent (x0, y0, x1, y1; m) of ``d``'s level: a pad's edge on it
    is no edge a load tips over onto the deck (:func:`pads.footprint_tip_offset`)."""
    e = d.fm.level.grid.extent
    return float(e.x0), float(e.y0), float(e.x1), float(e.y1)


def _tip_layers(d: Drop, pa: ProtectionArea
                ) -> list[tuple[tuple[float, float, float, float], float, float]]:
    """The crushable layers a load on pad ``pa`` may tip over (its level's, of its
    thickness): ((x0, y0, x1, y1) m, crush stress Pa, stroke m) for
    :func:`droprig.solver.pads.footprint_tip_offset`."""
    return [((o.area.x0, o.area.y0, o.area.x1, o.area.y1), pad_crush_stress(d.project, o),
             float(o.crush_stroke))  # type: ignore[arg-type]
            for o in d.project.protection_areas
            if o.level_id == d.fm.level.id and o.kind == "crushable"
            and abs(o.thickness - pa.thickness) <= _SAME_THICKNESS]


@dataclass(frozen=True)
class TipOffTurn:
    """The tip-off over a pad's edge at one drop point, as the calculation trace shows
    it: the pad (index into the project's protection areas) and its thickness ``t``
    (m), the least Δ (m) of :func:`tip_offsets`, the turn θ (rad) at which it is
    found, the footprint's length ``length`` (m) in the direction it tips
    (``direction``, :data:`droprig.solver.pads.TIP_DIRECTIONS`) and whether the
    footprint's length lies along x (``along_x``)."""

    pad: int
    t: float
    delta: float
    theta: float
    length: float
    direction: str
    along_x: bool


def tip_off_turn(d: Drop) -> TipOffTurn | None:
    """:class:`TipOffTurn` of the first point of ``d`` (the trace's one point): the same
    pad, layers and Δ as :func:`tip_offsets` (the less of the two plan orientations),
    with the turn and direction it is found at; ``None`` where the load cannot tip
    over a pad's edge there."""
    if d.bare is not None or d.n == 0:
        return None
    W = d.per_point([ld.weight for ld in d.loads])[:1]
    fl = d.per_point([ld.footprint_length for ld in d.loads])[:1]
    fw = d.per_point([ld.footprint_width for ld in d.loads])[:1]
    # the floor analysis found this point's turn by the same search (_tip_turns)
    known = _TURN_MEMO.get(_tip_memo_key(d), {}).get(
        _point_keys(d.geo.x[:1], d.geo.y[:1], W, fl, fw)[0])
    if known is not None:
        return TipOffTurn(*known)
    return tip_off_turn_reference(d, W, fl, fw)


def tip_off_turn_reference(d: Drop, W: np.ndarray, fl: np.ndarray,
                           fw: np.ndarray) -> TipOffTurn | None:
    """:func:`tip_off_turn` worked out afresh (the plain reference the remembered
    turns of :func:`_tip_turns` equal): each plan orientation on its own, the footprint
    along y taken where its Δ is the less. ``W`` (N), ``fl``, ``fw`` (m) of the first
    point, as arrays of one."""
    sub = replace(d, geo=take_geo(d.geo, np.array([0]), steps=False),
                  li=np.asarray(d.li)[:1])
    i = int(landing_pads(sub, fl, fw)[0])
    if i < 0 or d.project.protection_areas[i].kind != "crushable":
        return None
    pa = d.project.protection_areas[i]
    best: TipOffTurn | None = None
    for along_x in (True, False):
        rect = pads.footprint_rect(sub.geo.x, sub.geo.y, fl, fw, along_x)
        tt = pads.footprint_tip_turn(rect, W, float(pa.thickness), _tip_layers(d, pa),
                                     deck=_deck_extent(d))
        if np.isfinite(tt.delta[0]) and (best is None or tt.delta[0] < best.delta):
            best = TipOffTurn(i, float(pa.thickness), float(tt.delta[0]),
                              float(tt.theta[0]), float(tt.length[0]),
                              pads.TIP_DIRECTIONS[int(tt.direction[0])], along_x)
    return best


def _spent_layer(cl: np.ndarray, cw: np.ndarray, t_mat: np.ndarray, s_c: np.ndarray,
                 crushable: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The thickness through which the contact ``cl`` × ``cw`` (m) spreads to the deck
    (m) and the spent layer's compliance (m/N) per point. A spring mat spreads it
    through its whole thickness ``t_mat``. A crushable layer bottoms out before the
    deck feels more than its crush force: the deck then bears the contact spread
    through the residual thickness t_r = max(t_mat − s_c, 0) (a smaller area than
    the whole thickness gives: the higher contact pressure and the lower crushing and
    punching resistance), and t_r is in series with the hard contact
    (:func:`droprig.solver.pads.spent_layer_compliance`; before this the layer was
    rigid once spent and the contact the deck's indentation under the whole pad-spread
    footprint, a rigid punch of 10⁻¹¹ m/N: 38 MN for a 300 kg spreader beam)."""
    t_spread = t_mat.copy()
    f_layer = np.zeros(t_mat.shape)
    if crushable.any():
        t_r = np.maximum(t_mat[crushable] - s_c[crushable], 0.0)
        t_spread[crushable] = t_r
        f_layer[crushable] = pads.spent_layer_compliance(cl[crushable], cw[crushable], t_r)
    return t_spread, f_layer


def _contact_sides(d: Drop, fl: np.ndarray, fw: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The contact's sides (m): the whole footprint ``fl`` × ``fw`` for a flat landing;
    for a load landing tilted on one edge, the strip along its shorter edge (the
    smaller contact of the four edges of
    :func:`droprig.solver.footprint.tilted_edges`), centred on the drop point,
    carrying the whole force (common practice, no source)."""
    if d.landing == "tilted":
        return (np.minimum(fl, fw),
                np.minimum(footprint_mod.EDGE_CONTACT_WIDTH, np.maximum(fl, fw)))
    if d.landing != "flat":
        raise ValueError(f"landing: {d.landing!r} is not allowed; allowed: {LANDINGS}")
    return fl, fw


def slab_spread_depth(fm: FloorModel) -> float:
    """The depth of deck a load on the deck's top spreads through to a member's top
    flange (m): the concrete over the ribs of a concrete deck (the solid slab's
    whole depth; :meth:`droprig.model.Deck.over_ribs`, the least depth the load
    crosses at a member), 0 for a steel deck (plate or grating: no spread credited)."""
    dk = fm.level.deck
    return 0.0 if dk.is_steel else float(dk.over_ribs().thickness)


def _web_bearing(d: Drop, foot_l: np.ndarray, foot_w: np.ndarray) -> np.ndarray:
    """Bearing length ``lb`` on a member's top flange (m) of the contact ``foot_l`` ×
    ``foot_w`` on the deck (m) (:func:`droprig.solver.footprint.web_bearing_length`):
    for a load landing tilted on one edge, its edge strip spread at 45° through the
    slab (:func:`slab_spread_depth`) — the strip's own 50 mm would take the web's
    bearing as if the edge stood on the bare flange; for a flat landing the
    footprint's smaller side, as before (no slab spread credited: conservative)."""
    h_s = slab_spread_depth(d.fm) if d.landing == "tilted" else 0.0
    return footprint_mod.web_bearing_length(foot_l, foot_w, h_s)


def _protection_inputs(d: Drop, fl: np.ndarray, fw: np.ndarray, cl: np.ndarray,
                       cw: np.ndarray, on: np.ndarray, W: np.ndarray
                       ) -> tuple[np.ndarray, ...]:
    """Per point, what the protection area under it gives (:class:`LoadInputs`): mat
    thickness ``t_mat`` (m), spring mat compliance ``f_mat`` (m/N), crush force
    ``F_c`` (N, ∞ none), stroke ``s_c`` (m) and ``crushable`` — pads by area
    (:func:`_layer_credit`) for the contact ``cl`` × ``cw`` of the footprint
    ``fl`` × ``fw`` (m), on the protection area ``on`` of each point
    (:func:`landing_pads`) — and the layer's own stroke (m; what is left of the layer
    once spent is its thickness less this, :func:`_spent_layer`). A load landing
    tilted on a crushable layer gets the wedge's credit (:func:`_tilted_crush_credit`,
    ``W`` the load's weight, N): then ``s_c`` is the stroke of that credit, not the
    layer's; on a spring mat, the whole base's stiffness where the whole base lies on
    the mat (:func:`_tilted_mat_credit`)."""
    n, lv = d.n, d.fm.level
    t_mat = np.zeros(n)
    f_mat = np.zeros(n)
    F_c = np.full(n, np.inf)
    s_c = np.zeros(n)
    crushable = np.zeros(n, dtype=bool)
    s_layer = np.zeros(n)
    any_mat = bool(np.any(on >= 0))
    prot = d.project.protection_areas
    for i, pa in enumerate(prot):
        if not any_mat or pa.level_id != lv.id:
            continue
        sel = on == i
        if not sel.any():
            continue
        t_mat[sel] = pa.thickness
        credit, stroke = _layer_credit(d, i, sel, fl, fw, cl, cw)
        if pa.kind == "spring":
            if d.landing == "tilted":
                credit = _tilted_mat_credit(d, i, sel, fl, fw)
            f_mat[sel] = np.where(credit > 0.0, 1.0 / np.where(credit > 0.0, credit, 1.0),
                                  0.0)
        else:
            crushable[sel] = True
            s_full = np.where(np.isfinite(stroke), stroke,
                              float(pa.crush_stroke))  # type: ignore[arg-type]
            s_layer[sel] = s_full
            if d.landing == "tilted":
                credit, s_full = _tilted_crush_credit(d, i, sel, fl, fw, cl, cw, W[sel],
                                                      credit, s_full)
            F_c[sel] = credit
            s_c[sel] = s_full
    return t_mat, f_mat, F_c, s_c, crushable, s_layer


def _tilted_mat_credit(d: Drop, i: int, sel: np.ndarray, fl: np.ndarray,
                       fw: np.ndarray) -> np.ndarray:
    """The stiffness (N/m; 0 none) credited at the points ``sel`` to spring mat ``i``
    (and the mats of its thickness it abuts, as :func:`_layer_credit`) under a load
    landing tilted on one edge: the whole base ``fl`` × ``fw`` (m) on the mat, spread
    1:1 through it (:func:`droprig.solver.pads.tilted_mat_stiffness`: the band under
    the sinking edge widens to the whole base, whose stiffness bounds its slope; the
    edge strip alone read the force low), at the stiffest modulus of the mats pressed
    (an older mat given by its stiffness for the load's footprint: that stiffness).
    Only where the whole base lies on those mats in both plan orientations: a base
    partly off them turns down onto the bare deck beside them, in parallel with the
    mat and far stiffer, so no mat is credited there (f_mat = 0, conservative)."""
    prot, geo = d.project.protection_areas, d.geo
    together = _pads_like(d, i, "spring")
    xs, ys, a, b = geo.x[sel], geo.y[sel], fl[sel], fw[sel]
    boxes = [(prot[j].area.x0, prot[j].area.y0, prot[j].area.x1, prot[j].area.y1)
             for j in together]
    # mats that overlap each other would count their common part twice: then one
    # mat must hold the whole base
    apart = not any(float(pads.rect_overlap_area(p, q)) > 0.0
                    for u, p in enumerate(boxes) for q in boxes[u + 1:])
    whole = np.ones(xs.shape, dtype=bool)
    k = np.zeros(xs.shape)
    for along_x in (True, False):
        rect = pads.footprint_rect(xs, ys, a, b, along_x)
        on = np.zeros(xs.shape)
        for j, box in zip(together, boxes, strict=True):
            o = prot[j]
            A_ov = pads.rect_overlap_area(rect, box)
            on = on + A_ov if apart else np.maximum(on, A_ov)
            if o.modulus is not None:
                k_j = pads.tilted_mat_stiffness(o.modulus, o.thickness, a, b)
            else:  # older files: the stiffness for the load's own footprint
                k_j = np.full(xs.shape, float(o.stiffness))  # type: ignore[arg-type]
            k = np.where(A_ov > 0.0, np.maximum(k, k_j), k)
        whole &= on >= a * b * (1.0 - 1e-9)
    return np.where(whole, k, 0.0)


def _tilted_crush_credit(d: Drop, i: int, sel: np.ndarray, fl: np.ndarray,
                         fw: np.ndarray, cl: np.ndarray, cw: np.ndarray, W: np.ndarray,
                         F_strip: np.ndarray, s_strip: np.ndarray
                         ) -> tuple[np.ndarray, np.ndarray]:
    """The crush force F_c (N) and stroke s_c (m) credited at the points ``sel`` of a
    load of weight ``W`` (N) landing tilted on crushable layer ``i`` (and the layers
    pressed with it, as :func:`_layer_credit`): the edge strip ``cl`` × ``cw`` (m)
    sinks into the layer and the crushed band widens to the whole base as it goes
    (:func:`droprig.solver.footprint.wedge_crush_work` at the project's design tilt,
    :func:`landing_tilt`; the base of width b = max(``fl``,
    ``fw``) across the edge lies on either side of it, in either plan orientation: the
    least work of the four, conservative). Over the layer's stroke s (the least of the
    layers the band reaches) the layer does the work E = Σσ_c·ℓ·∫o dδ and ends at the
    force F_e = Σσ_c·ℓ·o(s) (ℓ the strip's overlap with each layer along the edge).
    The chain takes a layer as a constant force over a stroke, the work net of the
    load's weight (F_c − W)·s_c: credited as F_c = F_e (the highest force the
    crushing puts through, the floor's plateau) and s_c = (E − W·s)/(F_e − W), so
    that the net work, the fall left when the layer bottoms and whether it bottoms are
    the wedge's (energy balance of the crushing, Gere 7th ed. §2.8 — from memory).
    Where the wedge cannot beat the weight (E ≤ W·s or F_e ≤ W) the strip's own
    credit ``F_strip`` over ``s_strip`` stays (before this the only credit: the
    strip's area, its net work no more than the wedge's)."""
    prot, geo = d.project.protection_areas, d.geo
    together = _pads_like(d, i, "crushable")
    xs, ys, ln, wd = geo.x[sel], geo.y[sel], cl[sel], cw[sel]
    b = np.maximum(fl[sel], fw[sel])
    tilt = landing_tilt(d)
    best_E = np.full(xs.shape, np.inf)
    best_F = np.zeros(xs.shape)
    best_s = np.full(xs.shape, np.inf)
    for along_x in (True, False):
        # along the edge: the strip's extent; across it: the band from the strip's side
        a, c = (xs, ys) if along_x else (ys, xs)
        for sign in (1.0, -1.0):
            E = np.zeros(xs.shape)
            F_e = np.zeros(xs.shape)
            stroke = np.full(xs.shape, np.inf)
            for j in together:
                o = prot[j]
                r = o.area
                (e0, e1), (q0, q1) = ((r.x0, r.x1), (r.y0, r.y1)) if along_x else \
                    ((r.y0, r.y1), (r.x0, r.x1))
                ell = np.maximum(np.minimum(a + 0.5 * ln, e1) - np.maximum(a - 0.5 * ln, e0),
                                 0.0)
                lead = sign * c - 0.5 * wd
                p0, p1 = (q0, q1) if sign > 0 else (-q1, -q0)
                s_j = float(o.crush_stroke)  # type: ignore[arg-type]
                sigma = pad_crush_stress(d.project, o)
                work, o_end = footprint_mod.wedge_crush_work(lead, wd, b, s_j, tilt, p0, p1)
                E += sigma * ell * work
                F_e += sigma * ell * o_end
                stroke = np.where(ell * o_end > 0.0, np.minimum(stroke, s_j), stroke)
            take = (E < best_E) | ((E == best_E) & (F_e < best_F))
            best_E = np.where(take, E, best_E)
            best_F = np.where(take, F_e, best_F)
            best_s = np.where(take, stroke, best_s)
    s = np.where(np.isfinite(best_s), best_s, s_strip)
    net = best_E - W * s
    ok = (net > 0.0) & (best_F > W)
    with np.errstate(divide="ignore", invalid="ignore"):
        s_eq = np.where(ok, net / np.where(ok, best_F - W, 1.0), s_strip)
    return np.where(ok, best_F, F_strip), s_eq


def _layer_credit(d: Drop, i: int, sel: np.ndarray, fl: np.ndarray, fw: np.ndarray,
                  cl: np.ndarray, cw: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Pads by area at the points ``sel`` on protection area ``i``: the part of the
    footprint on the layer — this one and every layer of the same kind and thickness
    it abuts, which the footprint presses at the same moment — the less of the two
    footprint orientations (conservative); a layer of another thickness is not
    credited. Returns the credit (spring stiffness N/m, or crush force N) and the
    least stroke of the crushable layers pressed (m, inf none). A tilted landing
    presses the layers under its edge strip only (``cl`` × ``cw``)."""
    prot, lv, geo = d.project.protection_areas, d.fm.level, d.geo
    pa = prot[i]
    together = [j for j, o in enumerate(prot)
                if o.level_id == lv.id and o.kind == pa.kind
                and abs(o.thickness - pa.thickness) <= _SAME_THICKNESS]
    xs, ys, fls, fws = geo.x[sel], geo.y[sel], cl[sel], cw[sel]
    A_fp = fl[sel] * fw[sel]
    per_orient = []
    stroke = np.full(xs.shape, np.inf)
    for along_x in (True, False):
        rect = pads.footprint_rect(xs, ys, fls, fws, along_x)
        total = np.zeros(xs.shape)
        for j in together:
            o = prot[j]
            r = o.area
            A_ov = pads.rect_overlap_area(rect, (r.x0, r.y0, r.x1, r.y1))
            if o.kind == "spring":
                if o.modulus is not None:
                    total += pads.spring_mat_stiffness(o.modulus, o.thickness, A_ov)
                else:  # older files: the stiffness for the load's own footprint
                    total += float(o.stiffness) * A_ov / A_fp  # type: ignore[arg-type]
            else:
                total += pads.crushable_pad_force(pad_crush_stress(d.project, o), A_ov)
                stroke = np.where(A_ov > 0.0,
                                  np.minimum(stroke, float(o.crush_stroke)),  # type: ignore[arg-type]
                                  stroke)
        per_orient.append(total)
    return np.minimum(per_orient[0], per_orient[1]), stroke


def _drop_heights(d: Drop, t_mat: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The drop height ``H`` on the datum (the trial's ``Drop.H``, else each load's
    :func:`planned_height`, m) and the free fall ``h`` = H − t_mat onto the struck
    surface (m; a trial height under a pad's top rests on the pad; a planned one
    there is refused, :func:`_refuse_below_pad`)."""
    n, loads, li, lv = d.n, d.loads, d.li, d.fm.level
    if d.H is not None:
        H = np.asarray(d.H, float).copy()
    else:
        H = np.empty(n)
        for j, ld in enumerate(loads):
            sel = li == j if len(loads) > 1 else slice(None)
            H[sel] = planned_height(ld, lv)
    h = H - t_mat
    if d.H is not None:
        h = np.maximum(h, 0.0)  # a trial height under a pad's top: resting on the pad
    elif n and float(np.min(h)) < 0.0:
        _refuse_below_pad(loads, li, lv, t_mat, H)
    return H, h


def _footprint_on_deck(d: Drop, cl: np.ndarray, cw: np.ndarray,
                       t_mat: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The contact ``cl`` × ``cw`` spread 1:1 through a mat of thickness ``t_mat``,
    then the part that bears on the deck: cut at the deck's edges and over openings
    (:func:`droprig.solver.footprint.footprint_on_deck`), each side at least
    :data:`MIN_CONTACT_SIDE` (m)."""
    lv, geo = d.fm.level, d.geo
    spread = 2.0 * t_mat
    ext = lv.grid.extent
    foot_l, foot_w, _share = footprint_mod.footprint_on_deck(
        geo.x, geo.y, cl + spread, cw + spread, (ext.x0, ext.y0, ext.x1, ext.y1),
        tuple((o.x0, o.y0, o.x1, o.y1) for o in lv.deck.openings))
    return np.maximum(foot_l, MIN_CONTACT_SIDE), np.maximum(foot_w, MIN_CONTACT_SIDE)


_SAME_THICKNESS = 1e-3
"""Layers whose thicknesses differ by at most this (m) are pressed together by one
footprint (common practice, no source)."""

LANDINGS = ("flat", "tilted")
"""How a load meets the deck; every drop point is checked for each, the worse
governing (:func:`merge_landings`)."""

MIN_CONTACT_SIDE = 1e-3
"""Least side of the contact rectangle on the deck, m (a footprint all but wholly over
an opening or off the deck still bears on a sliver; keeps the contact checks finite)."""


def _pads_like(d: Drop, i: int, kind: str) -> list[int]:
    """Indices of the protection areas laid together with area ``i`` on the drop's
    level: of ``kind`` and of its thickness (within :data:`_SAME_THICKNESS`), so that a
    base bearing across their joint bears on one layer."""
    prot, pa = d.project.protection_areas, d.project.protection_areas[i]
    return [j for j, o in enumerate(prot)
            if o.level_id == d.fm.level.id and o.kind == kind
            and abs(o.thickness - pa.thickness) <= _SAME_THICKNESS]


def hoist_head(v_hoist: float) -> float:
    """The height a free fall would need to reach the hoist's lowering speed v_h
    (m/s): v_h²/(2g), m (uniform acceleration; 4.6 mm at 0.3 m/s). A load let go
    while lowering strikes at V = √(v_h² + 2gh) and brings ½·M·V² = M·g·(h + v_h²/2g)
    of kinetic energy: every energy balance of the chain (impact, beyond yield,
    amplification bounds, inverse answers) uses the fall ``h`` plus this head, the
    same strike speed as the local-damage step."""
    return float(v_hoist) ** 2 / (2.0 * impact_mod.G)


def energy_fall(c: Chain, h: np.ndarray) -> np.ndarray:
    """The free falls ``h`` (m) plus the hoist's head :func:`hoist_head` of the drop:
    the height whose free fall from rest gives the strike speed √(v_h² + 2gh), m."""
    head = hoist_head(c.drop.v_hoist)
    return h + head if head > 0.0 else h


def fall_from_energy(c: Chain, h_e: np.ndarray) -> np.ndarray:
    """An allowable energy height h_e (m) as the allowable free fall: h_e − v_h²/(2g)
    (:func:`hoist_head`); where that is below 0 the lowering speed alone brings more
    energy than allowed and no fall is allowed (NaN)."""
    head = hoist_head(c.drop.v_hoist)
    if head <= 0.0:
        return h_e
    with np.errstate(invalid="ignore"):
        out = h_e - head
        return np.where(np.isfinite(out) & (out >= 0.0), out, np.nan)


def planned_height(load: LiftLoad, level: Level) -> float:
    """The load's planned drop height H (m) on droprig's one datum: its underside
    above the finished surface (top of deck) of ``level``. Given directly
    (``drop_height``) or as hook elevation − hang length − level elevation
    (``LiftLoad.height_above`` refuses a load below the surface); both input modes
    mean the same physical height. The free fall onto a pad or mat of thickness t is
    H − t."""
    if load.drop_height is not None:
        return float(load.drop_height)
    return load.height_above(level.elevation)


def _refuse_below_pad(loads: tuple[LiftLoad, ...], li: np.ndarray, level: Level,
                      t_mat: np.ndarray, H: np.ndarray) -> None:
    """A planned height below the top of a pad or mat the load can pass over is not a
    drop: name the load's field and the height it must reach."""
    bad = int(np.argmin(H - t_mat))
    ld = loads[int(li[bad])] if len(loads) > 1 else loads[0]
    need = float(t_mat[bad])
    if ld.drop_height is not None:
        raise ModelError(f"load {ld.name}.drop_height", float(H[bad]),
                         f"≥ {need:g} m (the load's underside above the top of a pad or "
                         f"mat on level {level.id})", "m")
    raise ModelError(f"load {ld.name}.hook_elevation", ld.hook_elevation,
                     f"≥ {level.elevation + ld.hang_length + need:g} m (the load's "
                     f"underside above the top of a pad or mat on level {level.id})", "m")


def pad_crush_stress(project: Project, pa: object) -> float:
    """Crush stress of a crushable layer, Pa: its own, or for older projects its crush
    force over the largest declared footprint of the loads on its level
    (:func:`droprig.solver.pads.crush_stress_from_force`; the analysis warns)."""
    stress = getattr(pa, "crush_stress", None)
    if stress is not None:
        return float(stress)
    level_id = getattr(pa, "level_id", None)
    areas = [ld.footprint_length * ld.footprint_width for z in project.lift_zones
             if z.level_id == level_id for ld in z.loads]
    return pads.crush_stress_from_force(float(getattr(pa, "crush_force")),  # noqa: B009
                                        max(areas, default=1.0))


# --------------------------------------------------------------------------- 2. compliance
@dataclass(frozen=True, eq=False)
class Compliance:
    """Per point (m/N): framing ``f_s``, deck ``f_deck`` (indentation and one-way strip
    bending), everything in series with a mat ``f_struct`` = f_s + f_deck + f_load,
    the elastic springs in series with the yielding framing ``f_series`` = f_deck +
    f_load + f_mat, and the total ``f`` = f_struct + f_mat. Deck strip span
    ``strip_span`` and position ``strip_pos`` (m); ``f_col`` (m/N): the columns'
    axial springs, part of ``f_s``; ``k_left``, ``k_right`` (N·m/rad): the rotational
    restraint of the continuous deck strip at its two supports (0 at a deck edge);
    ``g_strip`` (m³, times 1/EI gives m/N) its deflection under a unit load at EI = 1,
    ``cont_ratio`` its sagging moment under the load over the simple span's a·b/L;
    ``f_deck_local`` (m/N) the indentation part of ``f_deck``; ``bridged``: a flat
    landing whose rigid base covers both support lines of the strip in one of its
    plan orientations (:func:`droprig.solver.footprint.bridges_strip`; the strip's
    bending is then left out of ``f_deck``: stiffer, a higher force), and
    ``bridged_both``: in both orientations (the deck strip then carries nothing and
    is not checked).
    """

    f_s: np.ndarray
    f_deck: np.ndarray
    f_struct: np.ndarray
    f_series: np.ndarray
    f: np.ndarray
    strip_span: np.ndarray
    strip_pos: np.ndarray
    f_col: np.ndarray
    k_left: np.ndarray
    k_right: np.ndarray
    g_strip: np.ndarray
    cont_ratio: np.ndarray
    f_deck_local: np.ndarray
    bridged: np.ndarray
    bridged_both: np.ndarray


def strip_restraint(c: Chain, EI: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Rotational restraint of the deck strip at its two supports, N·m/rad: the far
    spans of a continuous slab, K = 2√3·EI/L (:data:`droprig.solver.slab.K_INTERIOR`,
    equal spans), where the deck goes on beyond the support; 0 at a deck edge."""
    d = c.drop
    path, frame = d.geo.path, d.fm.frame
    span = path.strip_span
    ext = d.fm.level.grid.extent
    lo, hi = (ext.y0, ext.y1) if frame.deck_axis == "x" else (ext.x0, ext.x1)
    tol = 1e-3
    mem = np.where(path.members >= 0, path.members, 0)
    u1, u2 = frame.cross[mem[:, 0]], frame.cross[mem[:, 1]]
    with np.errstate(divide="ignore", invalid="ignore"):
        K = np.where(span > 0.0, slab.K_INTERIOR * EI / np.where(span > 0.0, span, 1.0), 0.0)
    k_first = np.where((u1 > lo + tol) & (u1 < hi - tol), K, 0.0)
    k_second = np.where((u2 > lo + tol) & (u2 < hi - tol), K, 0.0)
    return k_first, k_second


def compliance(c: Chain) -> Compliance:
    """Springs in series, 1/k_eff = Σ 1/k_i (Gere 7th ed. §9.10 energy method): the
    framing with the columns' axial springs (:mod:`droprig.solver.columns`), the deck's
    local indentation (:func:`droprig.solver.contact.deck_local_compliance`) and the
    continuous deck strip (:func:`droprig.solver.slab.continuous_strip_compliance`,
    gross section, restrained by the spans beyond its supports), the load's underside
    and a mat."""
    d, inp = c.drop, c[LoadInputs]
    if d.bare is not None:
        return _bare_compliance(d, inp)
    lv, path = d.fm.level, d.geo.path
    span, pos = path.strip_span, path.strip_pos
    basis = d.fm.settings.design_basis
    width = deck.deck_effective_width(span, pos, np.maximum(inp.foot_l, inp.foot_w),
                                      lv.deck.thickness)
    EI = contact.deck_strip_EI(lv.deck, width, basis)
    k_l, k_r = strip_restraint(c, EI)
    # the restrained strip once, at EI = 1 (K/EI): deflection and moment under the load
    # (slab.continuous_strip_end_moments; the compliance scales as 1/EI)
    ok = span > 0.0
    L = np.where(ok, span, 1.0)
    x = np.clip(pos, 0.0, L)
    b = L - x
    Kn = slab.K_INTERIOR / L
    kl_n, kr_n = np.where(k_l > 0.0, Kn, 0.0), np.where(k_r > 0.0, Kn, 0.0)
    MA, MB = slab.continuous_strip_end_moments(L, x, 1.0, kl_n, kr_n)
    g1 = np.where(ok, slab.strip_green(L, x, x, kl_n, kr_n), 0.0)
    M_ss = x * b / L
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.where(ok & (M_ss > 0.0),
                         np.maximum(M_ss - (MA * b + MB * x) / L, 0.0)
                         / np.where(M_ss > 0.0, M_ss, 1.0), 0.0)
    f_strip = g1 / EI
    # a flat landing's base is a rigid body on the strip: it bears at its ends or on
    # the support lines it reaches (slab.rigid_base_strip_compliance; continuous, 0
    # where it rests on both beams), in the stiffer plan orientation (the higher
    # force). Its extent is the base's own, not cut at a deck edge: a base
    # overhanging the edge rests on the edge member. The deck checks are left out
    # only where the footprint bridges the strip in both orientations.
    if d.landing == "flat":
        base_l = inp.foot_l if inp.base_l is None else inp.base_l
        base_w = inp.foot_w if inp.base_w is None else inp.base_w
        bridged = footprint_mod.bridges_strip(span, pos, np.maximum(base_l, base_w))
        both = footprint_mod.bridges_strip(span, pos, np.minimum(inp.foot_l, inp.foot_w))
        g_base = np.minimum(slab.rigid_base_strip_compliance(L, x, base_l, kl_n, kr_n),
                            slab.rigid_base_strip_compliance(L, x, base_w, kl_n, kr_n))
        f_strip = np.where(ok, np.minimum(g_base, g1) / EI, 0.0)
    else:  # a tilted landing bears on one edge strip: no bridging credited
        bridged = both = np.zeros(d.n, dtype=bool)
    f_local = contact.deck_local_compliance(lv.deck, inp.foot_l, inp.foot_w, basis)
    f_deck = f_local + f_strip
    f_col = columns.column_compliance(d.fm.frame, path, columns.level_column_compliance(lv))
    f_s = path.f + f_col
    # the load's underside and a spent crushable layer in series with the contact
    f_struct = f_s + f_deck + inp.f_load + inp.f_layer
    f_series = f_deck + inp.f_load + inp.f_layer + inp.f_mat
    return Compliance(f_s=f_s, f_deck=f_deck, f_struct=f_struct, f_series=f_series,
                      f=f_struct + inp.f_mat, strip_span=span, strip_pos=pos, f_col=f_col,
                      k_left=k_l, k_right=k_r, g_strip=g1, cont_ratio=ratio,
                      f_deck_local=f_local, bridged=bridged, bridged_both=both)


# --------------------------------------------------------------------------- 3. struck mass
@dataclass(frozen=True, eq=False)
class StruckMass:
    """Per point: the path's Rayleigh mass scaled to the struck point ``m_e`` (kg;
    zero under a mat or a crushable layer, or where the framing mass is not taken) and
    the share of kinetic energy kept by the hit ``eta`` = M/(M + m_e); ``m2`` (kg):
    the struck path's Rayleigh mass with the slab and the superimposed dead load over
    each member's tributary width (:func:`slab_path_mass`), referred to the framing
    point — the second mass of the two-mass impact (zero where ``m_e`` is, and in the
    deck-less mode, where the impact keeps the one-mass balance)."""

    m_e: np.ndarray
    eta: np.ndarray
    m2: np.ndarray | None = None


def struck_mass(c: Chain) -> StruckMass:
    """m_e·((f_s − f_col)/f_struct)² (Rayleigh with the struck point's own deflection,
    the members' bending only; Timoshenko, Strength of Materials Part I, from memory),
    η = M/(M + m_e)
    (:func:`droprig.solver.impact.mass_efficiency`)."""
    d, inp, comp = c.drop, c[LoadInputs], c[Compliance]
    n = d.n
    m_e = d.geo.path.m_e if d.fm.settings.include_member_mass else np.zeros(n)
    # A Rayleigh mass Σ∫μ(w/w_ref)² dx with |w| ≤ w_ref cannot be negative nor exceed
    # the mass of the members (Timoshenko Part I). loadpath keeps it finite and
    # continuous up to a column (factored end tables); should a value outside that
    # bound ever appear, the framing's mass share is not taken (η = 1, conservative)
    m_bound = d.fm.frame_mass
    m_e = np.where(np.isfinite(m_e) & (m_e >= 0.0) & (m_e <= m_bound), m_e, 0.0)
    # the load moves W·f (f = f_s + f_deck + 1/k_load), the members' bending under it
    # W·(f_s − f_col): the Rayleigh shape of loadpath is the members' own bending, so
    # it is scaled by that share alone. The columns' shortening moves the members as
    # rigid bodies; that mass is not counted (less struck mass: higher force,
    # conservative), and the struck mass goes to zero continuously at a column
    m_e = impact_mod.struck_point_mass(m_e, comp.f_s - comp.f_col, comp.f_struct)
    # under a mat or a crushable layer the hit on the framing is no longer perfectly
    # inelastic: its mass share is not taken (η = 1, conservative; as droprig check)
    m_e = np.where(inp.protected, 0.0, m_e)
    m2 = None
    if TWO_FORCES and d.bare is None and d.fm.settings.include_member_mass:
        # the same share of the path's mass with the slab and superimposed dead load,
        # referred to the framing point (x2 of the two-mass model moves W·f_s)
        with np.errstate(divide="ignore", invalid="ignore"):
            bend = np.where(comp.f_s > 0.0, (comp.f_s - comp.f_col) / comp.f_s, 0.0)
        m_slab = slab_path_mass(c)
        m2 = m_slab * bend**2
        # and the members (with their slab) moved rigidly by the columns' shortening,
        # referred to the framing point by the columns' share of its displacement
        # (columns.column_rigid_mass): a drop over a column still strikes the mass
        # of the floor around it
        with np.errstate(divide="ignore", invalid="ignore"):
            col_share = np.where(comp.f_s > 0.0, comp.f_col / comp.f_s, 0.0)
        m2 = m2 + column_path_mass(c) * col_share**2
        # zero under a mat (the one force there); kept under a crushable layer, where
        # a load that bottoms the layer out meets the floor through the two-mass
        # model (:func:`after_bottoming`)
        mat = inp.protected & ~(inp.crushable & (inp.f_mat <= 0.0))
        m2 = np.where(mat | ~np.isfinite(m2), 0.0, m2)
    return StruckMass(m_e=m_e, eta=impact_mod.mass_efficiency(inp.M, m_e), m2=m2)


TWO_FORCES = True
"""Two forces per point, on: the floor chain gives the contact force and the force on
the framing of the two-mass model with the slab's and the column-moved floor's mass
(:func:`struck_mass` ``m2``, :func:`two_forces`), each the envelope over lower drops
(monotone in the height); the inverse answers are found on the forward chain
(:func:`two_force_height`): every allowable height holds in the forward run, and
1.01 × it fails (tests/solver/test_two_force_inverse.py). A test switch only (off:
the one-mass step alone, as tests that guard it set it; README, "Two forces per
point")."""


def slab_frame(fm: FloorModel) -> loadpath.Frame:
    """The floor's load path with the deck's self-weight and the level's superimposed
    dead load added to each member's mass per length over its tributary width,
    μ + (ρh + q_sd/g)·b (kg/m; :func:`droprig.solver.struck_mass.
    distributed_mass_per_length`, lever rule, common practice, no source); the same
    stiffness as ``fm.frame`` (built once per frame)."""
    def make() -> loadpath.Frame:
        lv = fm.level
        q = lv.deck.self_weight_pressure + lv.superimposed_dead
        extra = q / impact_mod.G * loadpath.tributary_widths(fm.frame)
        return loadpath.build_frame(lv, include_member_mass=True, EI=fm.frame.EI,
                                    extra_mass=extra)
    return loadpath.frame_memo(fm.frame, "slab_frame", make)


def column_path_mass(c: Chain) -> np.ndarray:
    """Mass (kg, with the slab and superimposed dead load) that the columns'
    shortening moves rigidly, referred to the columns' share of each drop point's
    displacement (:func:`droprig.solver.columns.column_rigid_mass` on
    :func:`slab_frame`'s μ), kept with the points' geometry."""
    return column_path_mass_at(c.drop.fm, c.drop.geo)


def column_path_mass_at(fm: FloorModel, geo: Geometry) -> np.ndarray:
    """:func:`column_path_mass` at the points of ``geo`` on the prepared floor ``fm``
    (kg), kept with ``geo``."""
    got = geo.cache.get("column_path_mass")
    if got is None or got.shape != geo.x.shape:
        got = columns.column_rigid_mass(fm.frame, geo.path, slab_frame(fm).mu)
        geo.cache["column_path_mass"] = got
    return got


def slab_path_mass(c: Chain) -> np.ndarray:
    """Rayleigh mass (kg) of the struck path with the slab and superimposed dead load
    (:func:`slab_frame`; Timoshenko, *Strength of Materials* Part I, as
    :mod:`droprig.solver.loadpath`) at the drop points, kept with the points'
    geometry (load-independent)."""
    return slab_path_mass_at(c.drop.fm, c.drop.geo)


def slab_path_mass_at(fm: FloorModel, geo: Geometry) -> np.ndarray:
    """:func:`slab_path_mass` at the points of ``geo`` on the prepared floor ``fm``
    (kg), kept with ``geo``."""
    got = geo.cache.get("slab_path_mass")
    if got is None or got.shape != geo.x.shape:
        got = loadpath.evaluate(slab_frame(fm), geo.x, geo.y).m_e
        geo.cache["slab_path_mass"] = got
    return got


# --------------------------------------------------------------------------- 4. impact
@dataclass(frozen=True, eq=False)
class Impact:
    """Per point: dynamic factor ``K`` = F/W, peak force ``F`` (N), peak deflection of
    the load ``d_max`` (m), static deflection ``d_st`` = W·f (m); through a crushable
    layer its crushed depth ``crush`` (m) and whether it bottomed out ``bottomed``;
    ``F_crush`` (N): the force at which the deck concrete under the footprint crushes
    (the bound on the contact force), ``deck_crush`` (m) how deep it crushed and
    ``deck_through`` whether the crushing passed the cover. ``F_web`` (N): the force
    at which a deck member's web under the contact yields locally
    (:func:`web_contact_bound`; ∞ where the contact bears on no flange) and
    ``F_cap`` = min(F_crush, F_web) (N): the bound on the force that enters the
    framing through the contact, with ``cap_depth`` (m) the plastic depth over which
    it holds (the cover where the concrete's crushing caps, the flange's thickness
    where the web caps); the one-mass force and the framing force are capped by
    F_cap, the two-mass contact force by the deck's crushing F_crush alone (the
    slab's own inertia over the flange can pass more than the web for a spike).

    Two forces per point: ``F`` is the force on the framing (member flexure, shear,
    connections, webs under the load, columns, the slab's yield lines, beyond yield
    and the inverse answers) and ``F_contact`` the force between the load and the
    struck surface (deck flexure and punching, the crushing bound, local damage);
    both from :func:`droprig.solver.struck_mass.envelope_two_forces` where the two-mass
    idealisation applies (a bare deck and the struck path's mass with the slab,
    ``StruckMass.m2`` > 0), and both today's one force elsewhere (under mats and
    crushable layers, deck-less). ``eta_frame``: the share of the energy that, in
    the one-mass balance on f, gives ``F`` (:func:`droprig.solver.struck_mass.
    equivalent_eta`; ``eta`` of the struck mass where one force); ``two_mass``
    (bool): the points with two forces; ``F_deck`` (N): the force of the deck's
    checks (flexure, punching; :func:`two_forces`); ``searched`` (bool): the points
    whose allowable height and mass are searched on the forward impact
    (:class:`TwoForceKernel`): those with two forces and those on a crushable layer
    that a higher drop bottoms out (:func:`after_bottoming`)."""

    K: np.ndarray
    F: np.ndarray
    d_max: np.ndarray
    d_st: np.ndarray
    crush: np.ndarray
    bottomed: np.ndarray
    F_crush: np.ndarray
    deck_crush: np.ndarray
    deck_through: np.ndarray
    F_web: np.ndarray
    F_cap: np.ndarray
    cap_depth: np.ndarray
    F_contact: np.ndarray | None = None
    eta_frame: np.ndarray | None = None
    two_mass: np.ndarray | None = None
    F_deck: np.ndarray | None = None
    searched: np.ndarray | None = None

    @property
    def contact(self) -> np.ndarray:
        """The contact force (N): ``F_contact``, or ``F`` where one force."""
        return self.F if self.F_contact is None else self.F_contact

    @property
    def deck(self) -> np.ndarray:
        """The deck's force (N, what its flexure and punching take): ``F_deck``, or
        ``F`` where one force."""
        return self.F if self.F_deck is None else self.F_deck

    @property
    def contact_ratio(self) -> np.ndarray:
        """F_contact / F (1 where one force or F is 0 or not finite)."""
        return self._ratio(self.F_contact)

    @property
    def deck_ratio(self) -> np.ndarray:
        """F_deck / F (1 where one force or F is 0 or not finite)."""
        return self._ratio(self.F_deck)

    def _ratio(self, Fx: np.ndarray | None) -> np.ndarray:
        if Fx is None:
            return np.ones(self.F.shape)
        with np.errstate(divide="ignore", invalid="ignore"):
            r = Fx / self.F
        return np.where(np.isfinite(r) & (self.F > 0.0), r, 1.0)


def impact(c: Chain) -> Impact:
    """Gere 7th ed. §9.10 Eq. 9-94 with Timoshenko's mass correction
    (:func:`droprig.solver.impact.impact_elastic`); a crushable layer by the energy
    balance of :func:`droprig.solver.impact.impact_crushable`."""
    return impact_at(c, None)


def impact_at(c: Chain, h: np.ndarray | None, sel: np.ndarray | None = None) -> Impact:
    """:func:`impact` for the free falls ``h`` (m; ``None``: the planned ones);
    ``sel`` (bool per point): the two forces are worked out at these points only (the
    others keep the one force; for a caller that reads ``sel`` alone)."""
    d, inp, comp, sm = c.drop, c[LoadInputs], c[Compliance], c[StruckMass]
    # the energy height: the fall plus the hoist's lowering speed head (hoist_head)
    h = energy_fall(c, inp.h if h is None else h)
    n = d.n
    W, crushable = inp.W, inp.crushable
    K, F_el, d_max = impact_mod.impact_elastic(W, h, comp.f, sm.eta)
    F = F_el.copy()
    crush = np.zeros(n)
    bottomed = np.zeros(n, dtype=bool)
    if crushable.any():
        Fcr, dep, bot = impact_mod.impact_crushable(W[crushable], h[crushable],
                                                    comp.f_struct[crushable],
                                                    sm.eta[crushable], inp.F_c[crushable],
                                                    inp.s_c[crushable])
        F[crushable] = Fcr
        crush[crushable] = dep
        bottomed[crushable] = bot
        K = np.where(crushable, F / W, K)
        d_max = np.where(crushable, F * comp.f_struct + crush, d_max)
    # contact force bounded by the crushing of the deck concrete under the footprint
    # (EN 1992-1-1 §6.7 / ACI 318-19 §22.8.3.2 as an upper estimate,
    # droprig.solver.crushing); the crushing absorbs F_crush·c; crushing deeper than
    # the cover reaches the bars: the rest of the energy is then taken elastically
    lv = d.fm.level
    if lv.deck.is_steel:
        # a steel plate or grating yields under the footprint at p = 3·fy (Tabor's
        # constraint, Johnson ch. 6); "through" once the indentation passes the plate
        F_crush = (crushing.steel_indentation_pressure(lv.deck.steel_fy)
                   * inp.foot_l * inp.foot_w)
        depth_available = lv.deck.thickness
    else:
        F_crush = crushing.concrete_bearing_pressure(
            lv.deck.concrete.fc, inp.foot_l, inp.foot_w, lv.deck.thickness,
            d.fm.settings.design_basis) * inp.foot_l * inp.foot_w
        depth_available = lv.deck.cover
    if d.bare is not None:
        # deck-less: the hard load on the bare top flange — the contact force is
        # bounded by the flange and web yielding locally under it (AISC 360-16 J10.2
        # at Fu, capacity.flange_contact_force_bound), until the dent passes the
        # flange's thickness
        F_crush, depth_available = bare_flange_bound(c)
    # ... and by the web of the member under the contact, which yields locally at
    # F_web (web_contact_bound): the force entering the framing is the lesser, over
    # the depth of the one that caps (the flange's thickness for the web)
    F_web, web_depth = c.once(web_contact_bound)
    web = F_web < F_crush
    F_cap = np.where(web, F_web, F_crush)
    cap_depth = np.where(web, web_depth, depth_available)
    deck_crush = np.zeros(n)
    deck_through = np.zeros(n, dtype=bool)
    cap = ~crushable & (F > F_cap)
    # the deck's own checks (flexure, punching) keep the force the deck's crushing
    # alone lets through: past the web's yield the slab's part of the force and its
    # own inertia still load the deck (conservative for the deck)
    F_deck = None
    if (cap & web).any():  # (a new array then: F is capped in place below)
        F_deck = deck_one_mass(W, h, comp.f, sm.eta, F_crush, F_cap, F, F, depth_available)
    if cap.any():
        Fb, dep, thr = crushing.crushing_limited_impact(W[cap], h[cap], comp.f[cap],
                                                        sm.eta[cap], F_cap[cap],
                                                        cap_depth[cap])
        F[cap] = Fb
        deck_crush[cap] = dep
        deck_through[cap] = thr
        K = np.where(cap, F / W, K)
        d_max = np.where(cap, F * comp.f + deck_crush, d_max)
    one = Impact(K=K, F=F, d_max=d_max, d_st=W * comp.f, crush=crush, bottomed=bottomed,
                 F_crush=F_crush, deck_crush=deck_crush, deck_through=deck_through,
                 F_web=F_web, F_cap=F_cap, cap_depth=cap_depth, F_deck=F_deck)
    return two_forces(c, h, one, sel)


def two_forces(c: Chain, h: np.ndarray, one: Impact,
               sel: np.ndarray | None = None) -> Impact:
    """The impact's two forces where the two-mass idealisation applies (a bare deck —
    no mat or crushable layer — and the struck path's mass with the slab,
    ``StruckMass.m2``; ``h`` the energy heights, m), on top of the one-force impact
    ``one`` (returned unchanged elsewhere, and where :data:`TWO_FORCES` is off).

    Every force here is the largest that a drop from any height up to h gives (the
    monotone envelope of the two-mass peaks in the drop height,
    :func:`droprig.solver.struck_mass.envelope_two_forces`): a lower drop can give a
    two-mass system the larger peak (Biggs 1964 ch. 5 — from memory) and a load
    being lowered can fall from any height below the planned one. Each force below
    is non-decreasing in h, so the inverse answers found by bisection on this step
    (:func:`two_force_height`) are exact.

    * Contact force F_c (N): the envelope with the contact springs f_series (the
      load's underside, the deck's indentation and strip) against the framing f_s
      and its mass m2; bounded by the crushing of the struck surface, F_crush (the
      one-force step's bound; above it the one-force crushing result, which exceeds
      F_crush only where the crushing passed the cover).
    * Force on the framing F (N): the envelope's framing force; at most twice the
      largest force the contact lets into the framing, 2·max(F_cap, one-force F)
      (F_cap: the deck's crushing or the web's local yielding under the contact,
      :func:`web_contact_bound`; a force bounded by P on an elastic system at rest
      gives at most 2P, dynamic load factor 2: Biggs 1964 ch. 2 — from memory).
    * Force on the deck ``F_deck`` (N, deck flexure and punching): the contact force
      where the load's underside is declared (a soft contact, CEB Bulletin 187's soft
      impact — from memory); for a hard load on a bare deck the contact spike (a
      fraction of a millisecond) is the hard-missile local damage's to judge
      (:func:`local_damage`, DOE-STD-3014 App. C), and the deck's quasi-static checks
      keep the one-mass force of the load on the deck and framing in series
      (``one.F``)."""
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    if sm.m2 is None:
        return one
    fits = two_mass_fits(c) & np.isfinite(one.F)
    two = ~inp.protected & ~inp.crushable & fits
    # a crushable layer (and no spring mat): the after-bottoming stage where it
    # bottoms out
    pad = pad_two_mass(c) & np.isfinite(one.F)
    if sel is not None:
        two = two & sel
        pad = pad & sel
    bot = pad & one.bottomed
    if not (two.any() or pad.any()):
        return one
    W = inp.W
    Fc = one.F.copy()
    Ff = one.F.copy()
    F_deck = one.deck.copy()
    soft = inp.f_load > 0.0
    if two.any():
        Fc2, Ff2 = struck_mass_mod.envelope_two_forces(W[two], h[two], comp.f_series[two],
                                                       comp.f_s[two], sm.m2[two])
        if c.drop.landing == "tilted":
            Fc2 = np.maximum(Fc2, tilted_far_edge(c, h, two))
        through = np.maximum(one.F_crush[two], one.F[two])
        Fc[two] = np.where(Fc2 > one.F_crush[two], through, Fc2)
        Ff[two] = np.minimum(Ff2, 2.0 * np.maximum(one.F_cap[two], one.F[two]))
        F_deck[two] = np.where(soft[two], Fc[two], one.deck[two])
    eta_frame = np.where(two, struck_mass_mod.equivalent_eta(W, h, comp.f, Ff, sm.eta),
                         sm.eta)
    if bot.any():
        Fc[bot], Ff[bot], F_deck[bot] = _bottomed_forces(c, h, one, bot)
    # a layer that crushes and does not bottom out: the framing's response to the
    # layer's force for the crush's duration (framing_while_crushing)
    crushing = pad & ~one.bottomed & (one.crush > 0.0)
    if crushing.any():
        Ff[crushing] = framing_while_crushing(W[crushing], h[crushing], inp.F_c[crushing],
                                              comp.f_series[crushing], comp.f_s[crushing],
                                              sm.m2[crushing])
    new = two | bot | crushing
    K = np.where(new, Ff / W, one.K)
    d_max = np.where(two, Ff * comp.f + one.deck_crush, one.d_max)
    d_max = np.where(bot | crushing, Ff * comp.f + one.crush, d_max)
    return Impact(K=K, F=Ff, d_max=d_max, d_st=one.d_st, crush=one.crush,
                  bottomed=one.bottomed, F_crush=one.F_crush, deck_crush=one.deck_crush,
                  deck_through=one.deck_through, F_web=one.F_web, F_cap=one.F_cap,
                  cap_depth=one.cap_depth, F_contact=Fc, eta_frame=eta_frame,
                  two_mass=two, F_deck=F_deck, searched=two | pad)


def tilted_far_edge(c: Chain, h: np.ndarray, rows: np.ndarray) -> np.ndarray:
    """The contact force (N) at the points ``rows`` of a load landing tilted on one edge
    on a bare deck, at the energy heights ``h`` (m): the energy bound of either edge's
    strike, :func:`droprig.solver.footprint.tilted_contact_bound`, the edges the base's
    width across the edge strip apart (max of the footprint's sides, m), each on the
    contact springs ``f_series``, over the framing ``f_s`` (m/N), at the project's
    design tilt (:func:`landing_tilt`). Non-decreasing in h (the inverse answers'
    bisection stays exact)."""
    inp, comp = c[LoadInputs], c[Compliance]
    b = np.maximum(inp.fl[rows], inp.fw[rows])
    return footprint_mod.tilted_contact_bound(inp.W[rows], h[rows], comp.f_series[rows],
                                              comp.f_s[rows], b, landing_tilt(c.drop))


def landing_tilt(d: Drop) -> float:
    """The design tilt of a tilted landing, rad: the project's ``Settings.design_tilt``
    (the tilt the lift plan allows, 0–15°; default
    :data:`~droprig.solver.footprint.PAD_TILT`, 5°). Every use of the tilt in the chain,
    its kernels and the calculation trace reads it here."""
    return float(d.project.settings.design_tilt)


def _bottomed_forces(c: Chain, h: np.ndarray, one: Impact, bot: np.ndarray
                     ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """:func:`two_forces`' contact, framing and deck forces (N) at the rows ``bot``
    where a crushable layer bottoms out: the after-bottoming stage
    (:func:`after_bottoming`), the framing at least the crushing branch's force at the
    bottoming height (:func:`bottoming_floor`), the deck the contact force under a
    declared underside and the one-mass force otherwise."""
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    assert sm.m2 is not None
    W = inp.W
    ab = after_bottoming(W[bot], h[bot], inp.F_c[bot], inp.s_c[bot], comp.f[bot],
                         comp.f_series[bot], comp.f_s[bot], sm.m2[bot],
                         one.F_crush[bot], crush_depth_available(c))
    kept = c.kept(bottoming_floors)
    Ff = np.maximum(ab.F_frame, bottoming_floor(
        W[bot], inp.F_c[bot], inp.s_c[bot], comp.f_struct[bot], sm.eta[bot],
        comp.f_series[bot], comp.f_s[bot], sm.m2[bot]) if kept is None else kept[bot])
    F_deck = np.where(inp.f_load[bot] > 0.0, ab.F_contact, ab.F_one)
    return ab.F_contact, Ff, F_deck


def framing_while_crushing(W: np.ndarray, h: np.ndarray, F_c: np.ndarray,
                           f_series: np.ndarray, f_s: np.ndarray,
                           m2: np.ndarray) -> np.ndarray:
    """The force on the framing (N) under a crushable layer that crushes and does not
    bottom out (crush force F_c, N), the struck floor's mass m2 (kg) on the framing's
    compliance f_s (m/N): F_f = φ·F_chain, with F_chain = max(F_c, min(F_pulse, B_f))
    and φ ≥ 1 the exact history's correction (:func:`crushing_parts`)."""
    F_chain, phi = crushing_parts(W, h, F_c, f_series, f_s, m2)
    return F_chain * phi


def crushing_parts(W: np.ndarray, h: np.ndarray, F_c: np.ndarray,
                   f_series: np.ndarray, f_s: np.ndarray,
                   m2: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The two parts of :func:`framing_while_crushing`: the chain's model
    F_chain = max(F_c, min(F_pulse, B_f)) (N) and the factor φ ≥ 1 on it (the
    trace shows both).

    * F_pulse: the layer's force F_c on the floor for as long as the crush lasts
      (t_c, from the load's deceleration (F_c − W)/M against the floor's motion
      under F_c), then the load riding on the floor
      (:func:`droprig.solver.impact.framing_under_crush`: the rectangular pulse's
      dynamic load factor, 2·sin(π·t_c/T) for t_c ≤ T/2, else 2, Biggs 1964 ch. 2 —
      from memory — with the load's momentum and weight after it); strike speed
      v0 = √(2·g·h) from the energy height h (m).
    * B_f: the energy bound of the whole fall on the framing with the layer rigid
      (:func:`droprig.solver.struck_mass.energy_bounds` with the contact's f_series,
      m/N): the layer's work only takes energy away; it bounds every history.
    * At least F_c: below the layer's crushing threshold the one-mass balance gives
      the framing up to F_c, and a load lowered onto the layer may strike from any
      lower height (the envelope over lower drops, as :func:`two_forces`), so the
      force stays one non-decreasing function of the fall (the searches need it).
    * φ = max(1, min(F_c·ψ, B_f)/F_chain)
      (:func:`droprig.solver.crush_table.crush_factor`):
      ψ the exact two-mass history's framing peak over F_c
      (:func:`droprig.solver.crushhistory.crush_history`, the contact spring
      1/f_series between the load and the layer, the load free to bounce and
      re-crush), read from a dimensionless table in m2/M, k_c/k2, F_c/W and the
      height's group, conservatively (the cell's largest corner, non-decreasing in
      the fall). The pulse model takes the contact rigid and the load riding on the
      floor after the crush; with a soft underside the load bounces and the history
      reads up to ~1.5 × it (the steel demo's joist bundle at PAD1: 1.15 ×).
      φ·F_chain is non-decreasing in h (both parts are).

    W in N."""
    M = W / impact_mod.G
    v0 = np.sqrt(2.0 * impact_mod.G * np.maximum(h, 0.0))
    F_p = impact_mod.framing_under_crush(M, v0, F_c, m2, 1.0 / f_s)
    _, Bf = struck_mass_mod.energy_bounds(W, h, f_series, f_s)
    F_chain = np.maximum(F_c, np.minimum(F_p, Bf))
    phi = crush_table.crush_factor(W, h, F_c, 1.0 / f_series, 1.0 / f_s, m2, F_chain, Bf)
    return F_chain, phi


def bottoming_floor(W: np.ndarray, F_c: np.ndarray, s_c: np.ndarray, f: np.ndarray,
                    eta: np.ndarray, f_series: np.ndarray, f_s: np.ndarray,
                    m2: np.ndarray) -> np.ndarray:
    """The framing force (N) of a layer that just bottoms out, by the crushing branch:
    :func:`framing_while_crushing` at the energy height h_b where the one-mass
    balance spends the stroke, η·W·h_b = (F_c − W)·s_c − W·F_c·f + F_c²·f/2
    (:func:`droprig.solver.impact.crush_depth` with c = s_c; f the compliance, m/N,
    and η the mass efficiency the bottoming is decided with). A drop that bottoms the
    layer out takes at least this (a load may fall from any lower height, the
    envelope of :func:`two_forces`): without it the exact history's table could give
    the crushing branch just below h_b more than the after-bottoming model just
    above it, and the force would fall with the fall (the searches bisect on it).
    W, F_c in N; s_c in m; f_series, f_s in m/N; m2 in kg."""
    with np.errstate(divide="ignore", invalid="ignore"):
        h_b = ((F_c - W) * s_c - W * F_c * f + 0.5 * F_c ** 2 * f) / (eta * W)
    h_b = np.where(np.isfinite(h_b), np.maximum(h_b, 0.0), 0.0)
    return framing_while_crushing(W, h_b, F_c, f_series, f_s, m2)


def bottoming_floors(c: Chain) -> np.ndarray:
    """:func:`bottoming_floor` at every point on a crushable layer where the two-mass
    stage after bottoming applies (:func:`pad_two_mass`; N per point, NaN elsewhere):
    height-free, so kept with a chain that re-runs the impact at other heights
    (:func:`rows_chain`) for :func:`_bottomed_forces`, whose rows it reads."""
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    out = np.full(c.drop.n, np.nan)
    p = pad_two_mass(c)
    if p.any():
        assert sm.m2 is not None
        out[p] = bottoming_floor(inp.W[p], inp.F_c[p], inp.s_c[p], comp.f_struct[p],
                                 sm.eta[p], comp.f_series[p], comp.f_s[p], sm.m2[p])
    return out


def crushing_peak(c: Chain) -> np.ndarray:
    """The largest force on the framing while a crushable layer crushes, N per point
    (``F_c`` off the two-mass points and where no layer lies): the framing's force
    (:func:`framing_while_crushing`, non-decreasing in the fall) at the energy height
    where the layer just bottoms out, from the one-mass balance of
    :func:`droprig.solver.impact.crush_depth` with c = s_c:
    η·W·h_b = (F_c − W)·s_c − W·F_c·f + F_c²·f/2 (f = f_struct, m/N). The layer's
    work counts beyond yield only where this stays below the framing's resistance
    (the framing does not yield while the layer crushes)."""
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    out = inp.F_c.copy()
    p = pad_two_mass(c) & (inp.F_c > inp.W)
    if p.any():
        W, F_c, s_c, f = inp.W[p], inp.F_c[p], inp.s_c[p], comp.f_struct[p]
        with np.errstate(divide="ignore", invalid="ignore"):
            h_b = ((F_c - W) * s_c - W * F_c * f + 0.5 * F_c ** 2 * f) / (sm.eta[p] * W)
        assert sm.m2 is not None
        out[p] = framing_while_crushing(W, np.maximum(h_b, 0.0), F_c, comp.f_series[p],
                                        comp.f_s[p], sm.m2[p])
    return out


def two_mass_fits(c: Chain) -> np.ndarray:
    """The points where the two-mass model has its inputs (bool): the struck floor's
    mass m2 > 0 and finite, positive compliances of the framing and the contact."""
    comp, sm = c[Compliance], c[StruckMass]
    if sm.m2 is None:
        return np.zeros(c.drop.n, dtype=bool)
    return ((sm.m2 > 0.0) & np.isfinite(comp.f) & (comp.f_s > 0.0)
            & (comp.f_series > 0.0))


def pad_two_mass(c: Chain) -> np.ndarray:
    """The points on a crushable layer (no spring mat with it) where a drop that
    bottoms the layer out meets the floor by the two-mass model
    (:func:`after_bottoming`), bool."""
    inp = c[LoadInputs]
    return inp.crushable & (inp.f_mat <= 0.0) & two_mass_fits(c)


@dataclass(frozen=True, eq=False)
class AfterBottoming:
    """The forces of a drop that bottoms out a crushable layer (:func:`after_bottoming`),
    per point, N: ``F_contact`` (between the load, through the spent layer, and the
    deck), ``F_frame`` (on the framing), ``F_one`` (the one-mass force of the residual
    fall on the bare deck, crushing-capped: the deck's force under a hard load) and
    the residual energy height ``h_r`` (m)."""

    F_contact: np.ndarray
    F_frame: np.ndarray
    F_one: np.ndarray
    h_r: np.ndarray


def residual_height(W: np.ndarray, h: np.ndarray, F_c: np.ndarray, s_c: np.ndarray,
                    f: np.ndarray) -> np.ndarray:
    """Energy height (m) left when a crushable layer bottoms out: the work of the fall
    W·(h + s_c) less the layer's crush F_c·s_c, plus the fall with the floor's
    deflection under the layer's force while it crushes (at most 2·F_c·f, a suddenly
    applied force on an elastic system at rest, dynamic load factor 2: Biggs 1964
    ch. 2 — from memory), all given to the load (an upper bound of the energy that
    meets the hard contact; energy balance, common practice, no source):
    h_r = max(h − (F_c/W − 1)·s_c + 2·F_c·f, 0). W, F_c in N; h, s_c in m; f in m/N."""
    return np.maximum(h - (F_c / W - 1.0) * s_c + 2.0 * F_c * f, 0.0)


def closing_height(h_r: np.ndarray, F_c: np.ndarray, f_s: np.ndarray,
                   m2: np.ndarray) -> np.ndarray:
    """Energy height (m) of the closing speed at which the spent layer meets the deck:
    the load's speed from the residual height h_r (m, :func:`residual_height`),
    √(2·g·h_r), plus the largest speed of the floor (mass m2, kg, on the framing's
    compliance f_s, m/N) under the layer's force F_c (N) applied suddenly from rest,
    F_c·ω₂/k2 = F_c·√(f_s/m2) (x2 = F_c/k2·(1 − cos ω₂t), ω₂ = √(k2/m2): Biggs 1964
    ch. 2 — from memory): h_cl = (√(2·g·h_r) + F_c·√(f_s/m2))²/(2·g). The floor
    may be moving up when the stroke is spent; the contact's spike is set by the
    closing speed, not the load's alone (the load's speed alone read the contact at
    0.79–1.0 × the exact history, :func:`droprig.solver.crushhistory.crush_history`,
    on random bottoming systems and 0.92–1.0 × on the rooftop demo's rows; with the
    floor's speed and the layer's force F_c added, :func:`after_bottoming`, never below
    it on 14,000 systems and demo rows: scripts/bottoming_ratios.py,
    tests/solver/test_after_bottoming.py)."""
    with np.errstate(divide="ignore", invalid="ignore"):
        v2 = np.where(m2 > 0.0, F_c * np.sqrt(f_s / m2), 0.0)
    v = np.sqrt(2.0 * impact_mod.G * np.maximum(h_r, 0.0)) + v2
    return v * v / (2.0 * impact_mod.G)


def crush_capped(W: np.ndarray, h: np.ndarray, f: np.ndarray, eta: np.ndarray,
                 F_crush: np.ndarray, F_el: np.ndarray,
                 depth_available: float | np.ndarray) -> np.ndarray:
    """The one-mass force (N): the elastic ``F_el`` (Gere 7th ed. §9.10 Eq. 9-94 at the
    energy heights ``h``, m, compliance f, m/N, energy share η) where it stays below the
    surface's crushing force F_crush (N), else the crushing-limited impact
    (:func:`droprig.solver.crushing.crushing_limited_impact`, crushed no deeper than
    ``depth_available``, m, one or per point), as :func:`impact_at` caps it (there
    with ``F_crush`` its F_cap). ``F_el`` itself where
    nothing is capped: callers must not write into the result."""
    cap = F_el > F_crush
    if not cap.any():
        return F_el
    F1 = F_el.copy()
    dep = (depth_available[cap] if isinstance(depth_available, np.ndarray)
           else depth_available)
    F1[cap], _, _ = crushing.crushing_limited_impact(W[cap], h[cap], f[cap], eta[cap],
                                                     F_crush[cap], dep)
    return F1


def deck_one_mass(W: np.ndarray, h: np.ndarray, f: np.ndarray, eta: np.ndarray,
                  F_crush: np.ndarray, F_cap: np.ndarray, F_el: np.ndarray, F1: np.ndarray,
                  depth_available: float) -> np.ndarray:
    """The one-mass force the deck's checks take (N): where the web's local yielding
    caps the contact below the deck's crushing (``F_cap`` < ``F_crush``, N) the
    elastic ``F_el`` capped by the deck's crushing alone (:func:`crush_capped` over the
    deck's ``depth_available``, m): past the web's yield the slab's part of the force
    and its own inertia still load the deck (conservative for the deck); elsewhere the
    one-mass force ``F1`` (N). W in N, h in m, f in m/N. Callers must not write into
    the result."""
    web = F_cap < F_crush
    if not web.any():
        return F1
    return np.where(web, crush_capped(W, h, f, eta, F_crush, F_el, depth_available), F1)


def _one_mass_capped(W: np.ndarray, h: np.ndarray, f: np.ndarray, F_crush: np.ndarray,
                     depth_available: float) -> np.ndarray:
    """The one-mass force (N) of the energy heights ``h`` (m) on the compliance f
    (m/N, η = 1), crushing-limited above F_crush (:func:`crush_capped`)."""
    one = np.ones(W.shape)
    _, F_el, _ = impact_mod.impact_elastic(W, h, f, one)
    return crush_capped(W, h, f, one, F_crush, F_el, depth_available)


def after_bottoming(W: np.ndarray, h: np.ndarray, F_c: np.ndarray, s_c: np.ndarray,
                    f: np.ndarray, f_series: np.ndarray, f_s: np.ndarray, m2: np.ndarray,
                    F_crush: np.ndarray, depth_available: float,
                    envelope: Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]
                    | None = None) -> AfterBottoming:
    """A load that bottoms out a crushable layer (crush force F_c = crush stress ×
    the footprint's overlap with the layer, N; stroke s_c, m): the layer absorbs
    (F_c − W)·s_c of the energy height h (m, the fall with the hoist's head), and the
    residual energy (:func:`residual_height`, h_r) meets the deck through the spent
    layer as a bare drop does: the two-mass model of the load on its contact springs
    (f_series: the load's underside and the deck's indentation and strip, m/N)
    against the struck floor's mass m2 (kg) on the framing's compliance f_s (m/N),
    the envelope over lower drops (:func:`droprig.solver.struck_mass.
    envelope_two_forces`; CEB Bulletin 187 (1988) two-mass model, Biggs 1964 ch. 5 —
    from memory), the contact bounded by the crushing of the deck under the footprint
    F_crush (N; crushed no deeper than ``depth_available``, m), read at the
    closing speed's height (:func:`closing_height`: the floor's speed under the
    layer's force added to the load's) with the layer's F_c added (on the contact
    when the stroke is spent), and the framing force
    by twice the contact force that passes, as :func:`two_forces` does for a bare
    deck. The framing's free vibration from the layer's stage adds at most 2·F_c
    (the layer's force applied suddenly, dynamic load factor 2, a linear framing:
    superposition), F_f = min(F_f2(h_r), 2·max(F_crush, F_1)) + 2·F_c; once the
    layer is spent neither force passes the energy bounds of what is left
    (:func:`droprig.solver.struck_mass.energy_bounds` at h0 = h − (F_c/W − 1)·s_c:
    the energy balance with the layer's work F_c·s_c dissipated, rigorous for a
    linear framing); while it crushes the framing takes at most 2·F_c (within the
    bound of the whole fall), and the forces are at least the layer's F_c. W in N,
    f (m/N) the series compliance of the one-mass balance (η = 1 under a layer,
    Gere 7th ed. §9.10 Eq. 9-94). Checked against a scipy time history of load –
    layer (crushing, then rigid) – contact spring – struck mass – framing spring
    (tests/solver/test_after_bottoming.py: framing 1.04–1.72 ×, contact 1.02 × the
    history; the one-mass balance it replaces read 0.77–0.86 × the history's
    framing force for the rooftop demo's 4.2 t unit). ``envelope(h_r)``: the
    envelope's (contact, framing) forces at these points (the kernel's
    :class:`droprig.solver.struck_mass.EnvelopeLookup`; the same numbers)."""
    h_r = residual_height(W, h, F_c, s_c, f)
    F1 = _one_mass_capped(W, h_r, f, F_crush, depth_available)
    if envelope is None:
        _, Ff2 = struck_mass_mod.envelope_two_forces(W, h_r, f_series, f_s, m2)
    else:
        _, Ff2 = envelope(h_r)
    # the contact: the spent layer closes at the load's speed plus the floor's, which
    # the layer's force has set moving (closing_height), and the layer's force F_c,
    # on the contact when the stroke is spent, adds to the closing impact's (linear
    # once the layer is spent: superposition)
    h_cl = closing_height(h_r, F_c, f_s, m2)
    Fc2 = (struck_mass_mod.envelope_two_forces(W, h_cl, f_series, f_s, m2)[0]
           if envelope is None else envelope(h_cl)[0]) + F_c
    through = np.maximum(F_crush, F1)
    Fc = Fc2
    over = Fc2 > F_crush
    if over.any():
        Fc = Fc2.copy()
        Fc[over] = np.maximum(F_crush[over], _one_mass_capped(
            W[over], h_cl[over], f[over], F_crush[over], depth_available))
    # the framing is linear: its free vibration from the layer's stage (amplitude at
    # most 2·F_c·f_s, a suddenly applied force) adds to its response to the pulse
    Ff = np.minimum(Ff2, 2.0 * through) + 2.0 * F_c
    # ... and once the layer is spent no force passes the energy bounds of what is
    # left, W·h0 with h0 = h − (F_c/W − 1)·s_c (the layer's work is dissipated)
    Bc, Bf = struck_mass_mod.energy_bounds(W, np.maximum(h - (F_c / W - 1.0) * s_c, 0.0),
                                           f_series, f_s)
    Ff = np.minimum(Ff, Bf)
    Fc = np.minimum(Fc, Bc)
    # while the layer crushes its force (at most F_c) reaches the framing with a
    # dynamic load factor of at most 2 (Biggs 1964 ch. 2 — from memory), within the
    # energy bound of the whole fall; every force at least the layer's F_c (each
    # non-decreasing in the drop height across the bottoming, as the searches need)
    _, Bf_all = struck_mass_mod.energy_bounds(W, h, f_series, f_s)
    Ff = np.maximum(Ff, np.minimum(2.0 * F_c, Bf_all))
    return AfterBottoming(F_contact=np.maximum(Fc, F_c), F_frame=np.maximum(Ff, F_c),
                          F_one=np.maximum(F1, F_c), h_r=h_r)


def crush_depth_available(c: Chain) -> float:
    """How deep the surface under the load may crush (dent) before the impact step's
    crushing force no longer bounds the contact force, m: a concrete deck's cover
    over the bars, a steel deck's plate, or (deck-less) the bare flange's thickness."""
    d = c.drop
    if d.bare is not None:
        return float(d.fm.level.members[0].section.tf)
    dk = d.fm.level.deck
    return float(dk.thickness if dk.is_steel else dk.cover)


def bare_flange_bound(c: Chain) -> tuple[np.ndarray, float]:
    """Deck-less mode (one member): the upper estimate of the contact force through
    the bare top flange (N, per point; :func:`droprig.solver.capacity.
    flange_contact_force_bound` over the bearing, at the struck point's distance to
    the nearer end) and the depth of dent after which it no longer holds (the
    flange's thickness, m)."""
    d, inp = c.drop, c[LoadInputs]
    member = d.fm.level.members[0]
    sec, grade = member.section, member.grade
    a = d.geo.path.a[:, 0]
    L = d.fm.frame.L[0]
    dist = np.maximum(np.minimum(a, L - a) - 0.5 * inp.lb, 0.0)
    return capacity.flange_contact_force_bound(sec, grade, inp.lb, dist), float(sec.tf)


def web_contact_bound(c: Chain) -> tuple[np.ndarray, np.ndarray]:
    """The force the contact can pass into the framing before the web of a deck
    member under it yields locally, and the plastic depth over which that holds:
    ``(F_web, depth)`` per point (N, m; ∞ and 0 where it does not apply).

    Physics (issues 10 and 12): where the load's footprint bears on a beam's or
    girder's flange, that part of the strike's force enters the member through its
    web over the bearing — the footprint's smaller side spread through the slab as
    the web checks take it (``LoadInputs.lb``). The web yields locally at
    R = Fu·tw·(5k + lb) (AISC 360-16 J10.2, Eq. J10-2, or 2.5k + lb within d of the
    end, Eq. J10-3; EN 1993-1-5 §6 states the same mechanism; at Fu, the strain-
    hardened flow stress, an upper estimate: :func:`droprig.solver.capacity.
    web_contact_resistance`, never below the web check's own resistance). In the
    chain's model the member m carries share_m of the force at the point (the web
    checks' demand, ``path.share``), and the part 1 − σ of the force bears on the
    flanges directly (σ: :func:`slab_share`, the rest reaches the members through
    the slab, spread along them); the web under the contact therefore yields once
    F·(1 − σ)·share_m = R_m, first at the member m taking the most of it:

        F_web = R_m / |share_m| / (1 − σ)        (∞ where 1 − σ = 0)

    at or above the web yielding check's allowed force (1 − σ ≤ 1, R_m at or above
    the check's resistance), so that wherever the force reaches F_web the web check
    reads U ≥ 1: the verdict names the web locally damaged there, and no allowable
    answer (found below every check's allowed force) moves. Beyond F_web the
    contact is plastic: the web and flange yield under the load and absorb F_web
    per metre of indentation (a rigid–plastic contact as the concrete's crushing,
    :func:`droprig.solver.crushing.crushing_limited_impact`), over at most the
    governing member's flange thickness tf — the depth the deck-less bound already
    takes (:func:`bare_flange_bound`: a dent deeper than the flange folds it and
    the web cripples, AISC 360-16 J10.3's mechanism); past that the rest of the
    energy is taken elastically (conservative). Deck-less (one member: its
    :func:`bare_flange_bound` is already this mechanism), steel decks (no
    flange share worked out) and soft contacts (a declared underside, a mat or a
    crushable layer under the load: the deck's bound, conservative): ∞."""
    d, inp = c.drop, c[LoadInputs]
    fm, n = d.fm, d.n
    lv = fm.level
    none = (np.full(n, np.inf), np.zeros(n))
    # a hard contact only (no declared underside, no mat or layer under the load):
    # there the idealised contact spring drives the contact force to MN; a soft
    # contact keeps the deck's bound (∞ here: conservative, and no cost)
    hard = ~inp.protected & ~(np.asarray(inp.f_load) > 0.0)
    if d.bare is not None or lv.deck.is_steel or n == 0 or not hard.any():
        return none
    # the share that bears on the flanges directly; only where it is not nil is the
    # web's resistance worked out (the rest of the points: ∞)
    direct = 1.0 - c.once(slab_share_at)
    pts = np.flatnonzero(hard & (direct > 0.0))
    if pts.size == 0:
        return none
    F_allow, tf = _web_member_bound(c, pts)
    F_web, depth_out = none
    ok = np.isfinite(F_allow)
    F_web[pts] = np.where(ok, F_allow / direct[pts], np.inf)
    depth_out[pts] = np.where(ok, tf, 0.0)
    return F_web, depth_out


def _web_member_bound(c: Chain, pts: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """:func:`web_contact_bound` at the points ``pts`` (indices) before the flange
    share: R/(share·t) of the path's member taking the most of the force, N (∞ where
    none), and that member's flange thickness tf, m."""
    d, inp = c.drop, c[LoadInputs]
    fm = d.fm
    path = d.geo.path
    memT = np.ascontiguousarray(path.members[pts].T)
    shareT = np.abs(np.ascontiguousarray(path.share[pts].T))
    aT = np.ascontiguousarray(path.a[pts].T)
    LT = fm.frame.L[memT]
    lb = inp.lb[pts]
    dist = np.maximum(np.minimum(aT, LT - aT) - 0.5 * lb, 0.0)
    # within a section depth of a member's end the load increasingly bears on the
    # support itself (the column's or girder's): the web mechanism between load and
    # support shortens to nothing at the end, so the cap is faded out there,
    # R/share/t with t = clip(dist/d, 0, 1) (∞ once the bearing reaches the end;
    # continuous, only ever raising the cap — common practice, no source)
    ng = len(fm.groups)
    grpT = fm.group[np.where(memT >= 0, memT, 0)] if ng > 1 else np.zeros(memT.shape, int)
    depth = np.array([sec.d for sec, _ in fm.groups])  # type: ignore[attr-defined]
    t_end = np.clip(dist / depth[grpT], 0.0, 1.0)
    weight = np.where(memT >= 0, shareT * t_end, 0.0)
    # the member that takes the most of the force at its web (largest share·t): its
    # web yields first but for a difference of resistance between members; the
    # others' (higher caps as their share is less) are not worked out — a cap no
    # lower than the least over the members, so conservative
    j = np.argmax(weight, axis=0)
    cols = np.arange(pts.size)
    mem, w = memT[j, cols], weight[j, cols]
    (R,) = web_resistances(fm, (capacity.web_contact_resistance,), mem[None, :],
                           lb[None, :], dist[j, cols][None, :])
    ok = w > 0.0
    with np.errstate(divide="ignore", invalid="ignore"):
        F_allow = np.where(ok, R[0] / np.where(ok, w, 1.0), np.inf)
    tf = np.array([sec.tf for sec, _ in fm.groups])  # type: ignore[attr-defined]
    return F_allow, tf[grpT[j, cols]]


# --------------------------------------------------------------------------- 5. demands
@dataclass(frozen=True, eq=False)
class Demands:
    """Every check family at the peak force: ``checks`` by name (in
    :data:`~droprig.solver.results.CHECKS` order), each a
    :class:`~droprig.solver.linear_checks.Check` (U, F_allow, governing member; with
    ``detail`` the governing candidate's demand per N, existing demand and
    resistance); ``actions``: the load-independent member actions and plastic reserve
    of the path (:class:`~droprig.solver.unit_actions.UnitActions`)."""

    checks: dict[str, Check]
    actions: UnitActions


def demands(c: Chain) -> Demands:
    """Member actions by AISC Manual Table 3-23 superposition
    (:mod:`droprig.solver.unit_actions`); web local yielding and crippling under the
    load (AISC 360-16 J10.2/J10.3, EN 1993-1-5 §6; :mod:`droprig.solver.capacity`);
    deck flexure (worse footprint orientation) and punching (ACI 318-19 §22.2/§22.6,
    EN 1992-1-1 §6.4.4; :mod:`droprig.solver.deck`)."""
    d, inp, comp, imp = c.drop, c[LoadInputs], c[Compliance], c[Impact]
    fm, geo, detail, n = d.fm, d.geo, d.detail, d.n
    F = imp.F
    ua = unit_actions(fm, geo)
    path = geo.path
    memT = np.ascontiguousarray(path.members.T)
    shareT = np.ascontiguousarray(path.share.T)
    aT = np.ascontiguousarray(path.a.T)
    LT = fm.frame.L[memT]
    out: dict[str, Check] = {}
    out["flexure"] = ua.flexure.check("flexure", F, detail)
    out["shear"] = ua.shear.check("shear", F, detail)
    if d.bare is None:  # deck-less (one member): no end connection given
        conn = ua.family("connection", lambda: connection_family(fm, ua.shear))
        out["connection"] = conn.check("connection", F, detail)
    # web checks under the load (each deck-supporting member, its share)
    lb = inp.lb
    dist = np.maximum(np.minimum(aT, LT - aT) - 0.5 * lb, 0.0)
    lb_pts = np.broadcast_to(lb, memT.shape)
    Rwy, Rwc = web_resistances(fm, (capacity.web_local_yielding, capacity.web_crippling),
                               memT, lb_pts, dist)
    out["web_yielding"] = small_check("web_yielding", F, shareT, None, Rwy, memT, detail)
    out["web_crippling"] = small_check("web_crippling", F, shareT, None, Rwc, memT, detail)
    if d.bare is not None:  # deck-less (one member): no deck checks
        return Demands(checks=out, actions=ua)
    # deck flexure (worse of the two footprint orientations) and punching
    lv = fm.level
    span, pos = comp.strip_span, comp.strip_pos
    thick = lv.deck.thickness
    mu1 = deck.deck_unit_moment_per_width(span, pos, inp.foot_l, inp.foot_w, thick)
    mu2 = deck.deck_unit_moment_per_width(span, pos, inp.foot_w, inp.foot_l, thick)
    # the strip is continuous over its supports: the sagging moment under the load is
    # that of a span restrained by the spans beyond (droprig.solver.slab), zero on a
    # support line (the load bears on the steel there)
    # near a girder the panel also carries load across to it: crossing strips share the
    # load by their deflections (two_way_share); the cross strip is checked with the
    # distribution steel, 20 % of the main bars (EN 1992-1-1 §9.3.1.1(2), as punching)
    share_x, Ly, yb = two_way_share(c)
    m_x = np.maximum(mu1, mu2) * comp.cont_ratio * share_x
    # the cross strip between the girders: the base on the slab and the nearer
    # girder's flange as a rigid body, the slab's share as a patch
    # (cross_strip_moment, base_on_line; continuous as the footprint reaches the
    # line), worse plan orientation
    ey = np.minimum(yb, Ly - yb)
    b_fl, h_p = support_spread(fm)
    g_main = np.where(comp.strip_span > 0.0, comp.g_strip, np.inf)
    m_y = np.maximum(
        cross_strip_moment(Ly, yb, inp.foot_l, inp.foot_w, thick, b_fl, h_p, g_main),
        cross_strip_moment(Ly, yb, inp.foot_w, inp.foot_l, thick, b_fl, h_p, g_main))
    soft = presses_uniformly(c)
    if soft.any():  # no rigid-base statics: the part of the pressure on the slab
        m_y = np.where(soft, _uniform_cross_strip(c, Ly, yb, ey, g_main), m_y)
    # a rigid base over both beams of its strip (in both plan orientations) rests on
    # the beams: the strip between them carries none of the impact
    # (footprint.bridges_strip). A footprint that presses uniformly (a declared
    # underside, a mat or layer under it) still loads the slab between the beams with
    # the pressure there: its strip keeps the patch moment (the whole force on the
    # strip, conservative; statics of a uniform pressure, common practice, no source)
    rigid_both = comp.bridged_both & ~soft
    m_x = np.where(rigid_both, 0.0, m_x)
    m_y = np.where(rigid_both, 0.0, m_y)
    M0_deck = deck.deck_existing_moment_per_width(span, fm.q0)
    out["deck_flexure"] = small_check(
        "deck_flexure", F, np.stack([m_x, m_y]),
        np.stack([np.broadcast_to(M0_deck, (n,)), np.zeros(n)]),
        np.stack([np.full(n, fm.deck_Mr), np.full(n, DISTRIBUTION_SHARE * fm.deck_Mr)]),
        np.full((2, n), DECK), detail)
    R_punch = punching_resistance_at(c)
    deckm = np.full((1, n), DECK)
    beta = punching_near_support(c, ey)
    out["deck_punching"] = small_check("deck_punching", F, beta[None, :], None,
                                       np.broadcast_to(R_punch, (n,))[None, :], deckm,
                                       detail)
    return Demands(checks=on_contact(out, imp), actions=ua)


CONTACT_CHECKS = ("deck_flexure", "deck_punching")
"""Check families driven by the contact force (the deck lies within the contact
springs of the two-mass model: its indentation and strip bending); every other family
takes the force on the framing (``Impact.F``)."""


def on_contact(checks: dict[str, Check], imp: Impact) -> dict[str, Check]:
    """The :data:`CONTACT_CHECKS` of ``checks`` (built at the framing force F) at the
    deck's force F_deck = A·F (:func:`two_forces`), A = ``imp.deck_ratio``: U =
    U_at(A·F), allowed force F_allow/A in terms of F (linear in F, as
    :func:`_scaled`); unchanged where the impact gives one force."""
    if imp.F_deck is None:
        return checks
    A = imp.deck_ratio
    out = dict(checks)
    for name in CONTACT_CHECKS:
        if name in out:
            out[name] = at_force(_scaled(out[name], A), imp.F)
    return out


# --------------------------------------------------------------------------- 5a. amplification
@dataclass(frozen=True, eq=False)
class DynamicAmplification:
    """Per point: load mass ÷ struck mass of the path ``mass_ratio`` (r = M/mₑ with
    the path's Rayleigh mass at the struck framing point), contact ÷ framing
    compliance ``compliance_ratio`` (κ = (f − f_s)/f_s), the factors on the energy
    method's force F at which the checks are made — contact force ``A_force`` (web,
    deck flexure, punching), member moment ``A_moment``, shear ``A_shear`` and
    deflection ``A_deflection`` (dimensionless, ≥ 1; each the amplified force of
    :func:`droprig.solver.amplification.amplified_forces` over F) — the contact-force
    bound ``F_bound`` (N: the rigid-base bound, and the crushing force where the
    crushing holds within its stroke) and the factor each check family takes,
    ``factor`` by check name; ``set_by`` what set the local, moment, shear and
    deflection forces (index into :data:`droprig.solver.amplification.SET_BY`);
    ``th``: the points whose factors come from their own time history
    (:func:`droprig.solver.pointhistory.point_history`, bool) and ``history`` that run
    (its points in ascending order; None where no point was run);
    ``A_deflection_bound`` the deflection factor of the bounds alone (what the
    inverse answers take, None where it equals ``A_deflection``); ``F_energy`` the
    member energy force (N, :func:`droprig.solver.amplification.member_energy_force`;
    None where not computed)."""

    mass_ratio: np.ndarray
    compliance_ratio: np.ndarray
    A_force: np.ndarray
    A_moment: np.ndarray
    A_shear: np.ndarray
    A_deflection: np.ndarray
    F_bound: np.ndarray
    factor: dict[str, np.ndarray]
    set_by: dict[str, np.ndarray]
    th: np.ndarray | None = None
    history: pointhistory.PointHistory | None = None
    A_deflection_bound: np.ndarray | None = None
    F_energy: np.ndarray | None = None


def dynamic_amplification(c: Chain) -> DynamicAmplification:
    """The factor each family of checks takes, from
    :func:`droprig.solver.amplification.amplified_forces`: the larger of the energy
    method's force and the least of the time history's upper bounds — the tables
    (calibrated on :mod:`droprig.solver.exacthistory`: Euler–Bernoulli modes, Blevins
    1979 Table 8-1, each phase in closed form, Chopra 4th ed. §10–12; keyed on the
    struck member's end condition and position band where its own bending is most of
    the framing's compliance, :func:`struck_member_table`) on the energy method's
    elastic force as calibrated (with the struck-mass share where η < 1, η = 1 under
    mats and crushable layers); the load on its contact springs against an immovable
    point (Gere 7th ed. §9.10, η = 1, +5 %); the crushing force — of the deck
    concrete under the footprint (Impact's F_crush) or of a crushable layer — where
    the crushing cannot pass its stroke (the cover; the layer's stroke) even with all
    the energy in it (:func:`droprig.solver.amplification.crush_depth_bound`); and for
    member moment, shear and deflection the member's largest response per unit peak
    contact force (B_M, B_V, B_δ, calibrated on the time history with an
    elastic–perfectly plastic contact). The tables apply only where their contact
    force stays below the crushing force (they were calibrated on elastic contacts);
    a crushable layer is an elastic–perfectly plastic contact like the deck's
    crushing, with its own force and stroke.

    Where it matters the point's own time history
    (:func:`droprig.solver.pointhistory.point_history`, its peaks × the convergence
    margin TH_MARGIN over the energy method's) lowers a factor to its own where that
    is less (both lie above the time history): in each group of points of one bay
    and one load, the points whose bounded U lies within 10 % of the group's worst
    (:data:`TH_NEAR_WORST`: they set the group's verdict and limit) and above the
    energy method's, the largest :data:`TH_PER_ROUND` per round; a run lowers the
    group's worst, so the choice is repeated (:data:`TH_ROUNDS`); after the verdict
    steps the choice goes on by the points' verdicts (:func:`_with_verdict_histories`)
    until no point left at its bounds sets its group's verdict. Every other point
    keeps the
    bounds, which lie above its time history."""
    return amplification_at(c, c[LoadInputs].h, c[Impact])


FLOOR_POINT_HISTORY = False
"""Whether floor runs (not only ``droprig check``'s one member) choose points for
their own time history (:func:`_point_histories`). Off: even with the phase-exact
integrator (:mod:`droprig.solver.exacthistory`) a point costs 1–40 ms (many kept
modes over a long window, and a light load chattering on a stiff member — each
contact change is a round of its own); with it on the demos' analyses took 11–42 s
against 0.3–0.7 s even with the histories cached (:func:`droprig.solver.pointhistory.
point_history`) and the confirmation trials at the bounds (:data:`TRIAL_POINT_HISTORY`),
and lowered the worst U by 1–20 % and no limit (``benchmarks/bench_point_history.py``,
docs/amplification_record.md); since stop 33 the run points' inverse answers are
their histories' too, at a cost measured in docs/amplification_record.md (stop 33);
floors keep the bounds (upper bounds of the time history)."""
TRIAL_POINT_HISTORY = False
"""Whether a floor's confirmation trials (``Drop.trial``: :mod:`droprig.solver.
confirm`, a condition tried at every point of a bay) choose points for their own time
history as a forward run does. Off: a trial is judged at the bounds (upper bounds of
the time history, above the factor a point's own history would give) but for the
points whose verdict at the bounds would fail it, which run through their own
history (:func:`_with_trial_histories`, since stop 33: the limits offered are the
histories' where points ran, :func:`_history_height`, and at the bounds their trials
stepped back to the bounds'); a condition that holds in its trial holds at every
tried point's own history. The trials were most of the cost: the rooftop demo ran
1,525 of its 2,058 point histories (48 of its 59 s) in them
(``benchmarks/bench_point_history.py``)."""
LIMIT_POINT_HISTORY = False
"""With :data:`FLOOR_POINT_HISTORY` on, whether the run points' inverse answers are
their own histories' too (:func:`_history_height`, the history's A_δ in
:func:`_plastic_height`), the choice goes on by the limits
(:func:`_with_limit_histories`) and a confirmation trial runs the points failing at
their bounds through their history (:func:`_with_trial_histories`). Off: the
allowable heights and masses are the bounds' (above the history's, so conservative),
as up to stop 32. Off because of its cost: the two-level demo's switch-on analysis
took 515.7 CPU s with it against 6.7 s without (the history height search 385 s, the
choice by limits 232 s, the trials 93 s; docs/amplification_record.md, stop 33),
while on the steel demo's welder it lifted a run point's elastic allowable height
from 0.368 m (bounds) to 1.828 m against its history's 1.829 m."""
TH_LIMIT_CHOICE_ROUNDS = 12
"""Most rounds of the choice by the limits (:func:`_with_limit_histories`), as
:data:`TH_VERDICT_ROUNDS`: a group whose least limit is still a bound's after it
keeps that bound (conservative)."""
TH_TRIAL_U = 0.98
"""U above which a trial's point at its bounds would fail an elastic condition's
trial (droprig.solver.confirm.CONFIRM_U) and is run through its own history
(:func:`_with_trial_histories`)."""
TH_TRIAL_PER_GROUP = 64
"""Most points per group (bay × load) of a trial run through their own history
(:func:`_with_trial_histories`): a cost cap; a trial with more failing points at
their bounds fails and steps back."""
TH_LIMIT_UP_ROUNDS = 4
"""Rounds in which a point's history-confirmed allowable height is raised towards
the height where its own history reaches U = 1 (:func:`_history_height`): the
confirmation only lowers a closed form worked out with the factors at the planned
height."""
TH_LIMIT_UP_U = 0.995
"""A history-confirmed allowable height is raised only where its U is below this."""
TH_NEAR_WORST = 0.9
"""Points whose bounded U is within 10 % of their group's worst (bay × load) could set
the group's limit."""
TH_PER_ROUND = 2
"""Points per group (bay × load) run through their own time history per round (the
largest bounded U first)."""
TH_ROUNDS = 3
"""Rounds of the choice per chain run: a run can lower a group's worst, bringing
further points within 10 % of it."""
TH_VERDICT_ROUNDS = 12
"""Most rounds of the second choice (:func:`_with_verdict_histories`): after the
verdict steps, the points whose verdict at the bounds (response, then U) is worse
than their group's worst run through its own history are run too, the worst
:data:`TH_PER_ROUND` · 2^k per group in round k, until the group's worst is a
history's. A
cost cap: a group still set by a point at its bounds after it keeps the bounds, which
lie above that point's history (conservative)."""


def _energy_demands(c: Chain) -> Demands:
    """Step 5's own :class:`Demands` (the energy method's, before amplification)."""
    return next(r for r in c.history if isinstance(r, Demands))


def _utilisation(dem: Demands, factor: dict[str, np.ndarray], F: np.ndarray,
                 contact_scale: np.ndarray | float = 1.0) -> np.ndarray:
    """Largest U of every check family of ``dem`` at its amplified force (the
    connection check, end shear, at the shear factor); the deck's (contact) families
    at ``contact_scale`` × that force (dimensionless: their F_deck/F at the force's
    height over the one step 5 scaled them to, :func:`amplified_utilisation_at`)."""
    U = np.zeros(F.shape)
    for name, chk in dem.checks.items():
        A = factor.get(name, factor["shear"])
        Fx = A * F * contact_scale if name in CONTACT_CHECKS else A * F
        with np.errstate(invalid="ignore"):
            U = np.fmax(U, chk.U_at(Fx))
    return U


def _th_factors(ph: pointhistory.PointHistory, deck_ratio: np.ndarray | None = None
                ) -> dict[str, np.ndarray]:
    """Factors (≥ 1) of the check families (and ``deflection``) from the points' own
    time history. ``deck_ratio`` (F_deck/F at the history's points, :attr:`Impact.
    deck_ratio`; None: 1): the deck's flexure and punching take the factor on the
    deck's force F_deck (:func:`_utilisation`), so theirs is TH_MARGIN × the history's
    contact force over F_deck — the force factor over F_deck/F — lest a deck force
    below the framing's read below the history (stop 32: at the steel demo's joist
    bundle, 3-4/A-B, F_deck 378.7 kN against a framing force near 640 kN and a history
    of 379.6 kN; the margin 1.75 had hidden it)."""
    one = {q: np.where(np.isfinite(v), np.maximum(v, 1.0), 1.0)
           for q, v in ph.factor.items()}
    deck = one["force"]
    if deck_ratio is not None:
        r = np.asarray(deck_ratio, float)
        ok = np.isfinite(r) & (r > 0.0)
        with np.errstate(divide="ignore", invalid="ignore"):
            deck = np.where(ok & np.isfinite(ph.factor["force"]),
                            np.maximum(ph.factor["force"] / np.where(ok, r, 1.0), 1.0),
                            one["force"])
    return {"flexure": one["moment"], "shear": one["shear"], "web_yielding": one["force"],
            "web_crippling": one["force"], "deck_flexure": deck,
            "deck_punching": deck, "deflection": one["deflection"]}


def amplification_at(c: Chain, h: np.ndarray, imp: Impact,
                     th_points: np.ndarray | None = None) -> DynamicAmplification:
    """:func:`dynamic_amplification` for the free falls ``h`` (m) and their impact
    (the energy bounds at the fall plus the hoist's head, :func:`energy_fall`);
    ``th_points`` (bool per point): run the points' own time history at exactly these
    points (the inverse answers re-use the forward step's choice) instead of choosing
    them. The bounds (:func:`_amplified_bounds`) as factors on the chain's force
    (:func:`_bound_factors`), lowered to the points' own time history where it runs
    (:func:`_with_histories`)."""
    d = c.drop
    if not d.fm.settings.dynamic_amplification:
        return _no_amplification(d.n)
    h = energy_fall(c, h)
    b = _amplified_bounds(c, h, imp)
    factor = _bound_factors(imp, b.forces)
    set_by = dict(b.forces.set_by)
    factor, set_by = _with_impulse_bounds(c, h, imp, b.a, factor, set_by)
    th, hist = _point_histories(c, h, imp.F, factor, th_points, imp.deck_ratio)
    A_D_bound = factor["deflection"]
    if hist is not None:
        factor, set_by = _with_histories(d.n, th, hist, factor, set_by,
                                         imp.deck_ratio[th])
    A_D = factor.pop("deflection")
    return DynamicAmplification(mass_ratio=b.a.mass_ratio,
                                compliance_ratio=b.a.compliance_ratio,
                                A_force=factor["web_yielding"], A_moment=factor["flexure"],
                                A_shear=factor["shear"], A_deflection=A_D,
                                F_bound=np.minimum(b.rigid, np.where(b.holds, b.F_cap,
                                                                     np.inf)),
                                factor=factor, set_by=set_by, th=th, history=hist,
                                A_deflection_bound=A_D_bound, F_energy=b.F_energy)


def _no_amplification(n: int) -> DynamicAmplification:
    """The setting off: every factor 1, no bound (n points)."""
    one = np.ones(n)
    names = ("flexure", "shear", "web_yielding", "web_crippling", "deck_flexure",
             "deck_punching")
    return DynamicAmplification(mass_ratio=np.full(n, np.nan),
                                compliance_ratio=np.full(n, np.nan), A_force=one,
                                A_moment=one, A_shear=one, A_deflection=one,
                                F_bound=np.full(n, np.inf),
                                factor=dict.fromkeys(names, one),
                                set_by=dict.fromkeys(("local", "moment", "shear",
                                                      "deflection"),
                                                     np.zeros(n, int)))


@dataclass(frozen=True, eq=False)
class _Bounds:
    """The amplification's inputs at the points: the table's answer ``a``
    (:func:`droprig.solver.amplification.amplification`), the rigid-base bound
    ``rigid`` (N), the crushing cap ``F_cap`` (N) and whether its stroke ``holds``,
    the member energy force ``F_energy`` (N) and the amplified forces ``forces``
    (:func:`droprig.solver.amplification.amplified_forces`)."""

    a: amp_mod.Amplification
    rigid: np.ndarray
    F_cap: np.ndarray
    holds: np.ndarray
    F_energy: np.ndarray
    forces: amp_mod.AmplifiedForces


OWN_TABLE_SHARE = (0.5, 0.6)
"""Shares of the framing's compliance that is the struck member's own bending between
which the table fades from the envelope over every condition and position band to
the member's own (:func:`own_table_weight`)."""


def own_table_weight(own: np.ndarray, f_s: np.ndarray, f_col: np.ndarray) -> np.ndarray:
    """Weight (0–1, dimensionless) of the struck member's own table against the
    envelope over every condition and band (:func:`droprig.solver.amplification.
    amplification`'s ``own_weight``): 0 where the member's own bending (``own``, share
    of the members' bending compliance, times f_s − f_col over f_s; compliances m/N)
    is at most half the framing's compliance — over a girder line or a column the
    member struck is not the one that moves — rising linearly to 1 at
    :data:`OWN_TABLE_SHARE` [1]. Before it the table switched at one half and the
    factors stepped there (a shear factor 21.4 → 8.1 across 5 mm,
    tests/solver/test_amplification_continuous.py); the envelope is the larger, so
    the fade reads at or above the switch's value."""
    with np.errstate(divide="ignore", invalid="ignore"):
        q = np.where(f_s > 0.0, own * (f_s - f_col) / np.where(f_s > 0.0, f_s, 1.0), 0.0)
    lo, hi = OWN_TABLE_SHARE
    return np.clip((q - lo) / (hi - lo), 0.0, 1.0)


def _amplified_bounds(c: Chain, h: np.ndarray, imp: Impact) -> _Bounds:
    """The table, the bounds and the amplified forces of the energy heads ``h`` (m)."""
    inp, comp, sm = c[LoadInputs], c[Compliance], c[StruckMass]
    crushable = inp.crushable
    # the elastic contact: through a crushable layer (rigid until it crushes) the
    # load's underside alone, else the deck, mats and the load's underside
    f_beyond = np.where(crushable, comp.f_struct, comp.f)
    f_contact = f_beyond - comp.f_s
    a = c.once(table_amplification)  # the table (no height: once per chain)
    rigid = amp_mod.contact_force_bound(inp.W, h, f_contact)
    # the tables multiply the energy method's elastic (uncapped) force, as calibrated
    # (the chain's struck-mass share: its mass, normalised by w_ref, is at most the
    # tables' mass, so this force is at least the calibration's energy method's)
    _, F_ref, _ = impact_mod.impact_elastic(inp.W, h, f_beyond, sm.eta)
    # the crushing cap — the layer's, or the deck concrete's — and its stroke
    # (the deck's crushing, not the web's cap, Impact.F_cap: the tables were
    # calibrated on a linear contact and are used only where their contact stays
    # below this force, amp_mod.amplified_forces; against the web's lower cap they
    # dropped out at hard points and the fallback bounds read higher — a rooftop
    # demo bay's U 16.4 → 30.1 — so the bounds keep the higher, deck's force:
    # each is still an upper bound of the history, which itself takes F_cap)
    F_cap = np.where(crushable, inp.F_c, imp.F_crush)
    stroke = np.where(crushable, inp.s_c, crush_depth_available(c))
    holds = amp_mod.crush_depth_bound(inp.W, h, f_beyond, F_cap) <= stroke
    # the most energy the drop can put into the framing, as a static force at the
    # struck point (bounds member moment and deflection however stiff the contact);
    # under a crushable layer the deck may crush too: the lesser crushing force over
    # both strokes bounds what they dissipate
    F_low = np.where(crushable, np.fmin(inp.F_c, imp.F_crush), F_cap)
    stroke_all = np.where(crushable, inp.s_c + crush_depth_available(c), stroke)
    F_energy = amp_mod.member_energy_force(inp.W, h, comp.f_s, f_contact, F_low,
                                           stroke_all)
    forces = amp_mod.amplified_forces(a, imp.F, F_ref, rigid, F_cap, holds,
                                      bottomed=imp.bottomed | imp.deck_through,
                                      F_energy=F_energy)
    return _Bounds(a=a, rigid=rigid, F_cap=F_cap, holds=holds, F_energy=F_energy,
                   forces=forces)


def table_amplification(c: Chain) -> amp_mod.Amplification:
    """The table's factors at the points (:func:`droprig.solver.amplification.
    amplification`), read at the drop's mass and the path's compliances — no height —
    so worked out once per chain (:meth:`Chain.once`): keyed on the struck path as
    one member (as calibrated on one member): r = M/mₑ with the path's Rayleigh mass
    at the struck point (:func:`table_mass`), κ = the contact ÷ the framing's
    compliance (through a crushable layer, rigid until it crushes, the load's
    underside alone, else the deck, mats and the load's underside); and the struck
    member's end condition and position band where its own bending is most of the
    framing's compliance (the envelope over every condition and band elsewhere: over
    a girder or a column the member struck is not the one that moves)."""
    d, inp, comp, sm = c.drop, c[LoadInputs], c[Compliance], c[StruckMass]
    f_beyond = np.where(inp.crushable, comp.f_struct, comp.f)
    m_path = table_mass(d.geo.path.m_e, d.geo.path.w_ref, d.geo.path.f)
    key = struck_member_table(c)
    w_own = own_table_weight(key["own"], comp.f_s, comp.f_col)
    cond = np.where(w_own > 0.0, key["cond"], -1)
    return amp_mod.amplification(inp.M, m_path, f_beyond - comp.f_s, comp.f_s,
                                 struck_mass=sm.m_e > 0.0, cond=cond, xi=key["xi"],
                                 own_weight=w_own)


def table_mass(m_e: np.ndarray, w_ref: np.ndarray, f: np.ndarray) -> np.ndarray:
    """The path's Rayleigh mass with its shape scaled to 1 at the struck point, kg:
    mₑ·(w_ref/f)², the mass r = M/mₑ of the amplification tables is taken with.

    The load path's Rayleigh mass ``m_e`` (kg) is normalised by w_ref (m/N), the
    larger of the struck point's deflection f (m/N) and the largest along the path
    (:mod:`droprig.solver.loadpath`: never larger than the published form, for the
    energy balance); the tables were calibrated with the member's Rayleigh mass
    β(a)·μ·L, its static shape scaled to 1 at the struck point
    (:func:`droprig.solver.beam.rayleigh_mass_factor`, Timoshenko, *Strength of
    Materials* Part I; ``scripts/calibrate_amplification.py``). Kinetic energy
    ½·mₑ·ẇ_ref² = ½·m·ẇ(p)² gives m = mₑ·(w_ref/f)². With the mass normalised by
    w_ref, r read up to (w_ref/f)² too high wherever the struck point is not where
    the path moves most (near a support, a cantilever struck inboard, over a girder
    line): a cell of heavier loads, whose factors are lower (a cantilever IPE 300
    struck at 0.54 L read r 1.20 in place of 0.23; on random single members, the
    table's demand read that way fell below the time history: contact force up to
    1.48 ×, moment 1.21 ×, deflection 1.59 ×, read at this mass never —
    tests/solver/test_amplification_keying.py). 0 where the mass or f is not
    positive and finite (no moving mass: the energy method is exact, factor 1)."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        m = m_e * np.square(np.where(f > 0.0, w_ref / f, np.nan))
    return np.where(np.isfinite(m) & (m > 0.0), m, 0.0)


def _bound_factors(imp: Impact, forces: amp_mod.AmplifiedForces) -> dict[str, np.ndarray]:
    """The amplified forces as factors (≥ 1) on the chain's force F of each check
    family and ``deflection``; the deck's checks read the deck's force F_deck (F where
    one force): the larger of it and the bound on the contact force."""
    F = imp.F
    with np.errstate(divide="ignore", invalid="ignore"):
        def ratio(Fx: np.ndarray) -> np.ndarray:
            r_ = np.where(F > 0.0, Fx / np.where(F > 0.0, F, 1.0), 1.0)
            return np.where(np.isfinite(r_), np.maximum(r_, 1.0), 1.0)
    local, A_M, A_V, A_D = (ratio(forces.local), ratio(forces.moment),
                            ratio(forces.shear), ratio(forces.deflection))
    F_deck = F * imp.deck_ratio
    lb = forces.local_bound if forces.local_bound is not None else forces.local
    with np.errstate(divide="ignore", invalid="ignore"):
        A_deck = np.where(F_deck > 0.0, np.maximum(F_deck, lb) / np.where(F_deck > 0.0,
                                                                           F_deck, 1.0), 1.0)
    A_deck = np.where(np.isfinite(A_deck), np.maximum(A_deck, 1.0), 1.0)
    return {"flexure": A_M, "shear": A_V, "web_yielding": local,
            "web_crippling": local, "deck_flexure": A_deck, "deck_punching": A_deck,
            "deflection": A_D}


IMPULSE_MASS_RATIO = 1.0
"""Largest r = M/mₑ (the table's mass ratio) at which the impulse bound
(:func:`_with_impulse_bounds`) is worked out: above it the load is not light against
the member, its contact not short, and the other bounds are the tighter (a cost
limit, not a validity one: the bound holds for any load)."""
IMPULSE_FADE_MASS_RATIO = 0.5
"""r from which the impulse bound fades out (:func:`impulse_fade`): between this and
:data:`IMPULSE_MASS_RATIO` the factor runs from it to the other bounds'
continuously, so the factors do not step where it stops being worked out."""


def impulse_fade(r: np.ndarray) -> np.ndarray:
    """Weight t (0–1, dimensionless) of the other bounds against the impulse bound at
    mass ratio r (dimensionless): 0 up to :data:`IMPULSE_FADE_MASS_RATIO` (r₀),
    ln(r/r₀)/ln(r₁/r₀) up to :data:`IMPULSE_MASS_RATIO` (r₁), 1 from it. Where the
    impulse bound A_I is below the other bounds' factor A, the factor taken is
    A_I + t·(A − A_I): between two upper bounds of the time history, so at least the
    lesser of them (itself one) and never below the factor taken before the fade
    (min(A, A_I) for r ≤ r₁, A above), running continuously from the impulse bound
    (r ≤ r₀) to the other bounds (r ≥ r₁). Before it the factors stepped where the
    bound stopped being worked out (a moment factor 2.5 → 3.3 at r = 1,
    tests/solver/test_amplification_continuous.py)."""
    r = np.asarray(r, float)
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.log(r / IMPULSE_FADE_MASS_RATIO) / np.log(IMPULSE_MASS_RATIO
                                                         / IMPULSE_FADE_MASS_RATIO)
    return np.clip(np.where(np.isfinite(t), t,
                            np.where(r > IMPULSE_FADE_MASS_RATIO, 1.0, 0.0)), 0.0, 1.0)


def _with_impulse_bounds(c: Chain, h: np.ndarray, imp: Impact, a: amp_mod.Amplification,
                         factor: dict[str, np.ndarray], set_by: dict[str, np.ndarray]
                         ) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
    """The factors lowered to the impulse bound of the point's own time history
    (:func:`droprig.solver.pointhistory.impulse_factors`; Duhamel's integral on the
    struck member's kept modes, the contact's impulse and peak force — an upper bound
    of that history as the other bounds are, so the least of them is one) where it is
    less, at the light loads' points (r < :data:`IMPULSE_MASS_RATIO`, fading into the
    other bounds from :data:`IMPULSE_FADE_MASS_RATIO`, :func:`impulse_fade`) on a path whose
    factors lie above 1; the member's moment, shear and deflection (the connection
    check, end shear, takes the shear's), the member's local checks at the contact
    force (web yielding, crippling) and the deck's at its share of it."""
    d = c.drop
    ok = ((d.geo.path.pair >= 0) & ~d.geo.opening & np.isfinite(imp.F) & (imp.F > 0.0)
          & np.isfinite(h) & (h > 0.0) & (a.mass_ratio < IMPULSE_MASS_RATIO))
    A_max = np.maximum(np.maximum(factor["web_yielding"], factor["flexure"]),
                       np.maximum(factor["shear"], factor["deflection"]))
    sel = np.flatnonzero(ok & (A_max > 1.0 + 1e-9))
    if sel.size == 0:
        return factor, set_by
    got = pointhistory.impulse_factors(c, sel, h[sel], imp.F[sel])
    t = impulse_fade(a.mass_ratio[sel])  # 0 up to IMPULSE_FADE_MASS_RATIO

    def faded(A: np.ndarray, other: np.ndarray) -> np.ndarray:
        # A + t·(other − A) where the impulse bound A is the lesser (impulse_fade)
        with np.errstate(invalid="ignore"):
            return np.where(A < other, A + t * (other - A), other)
    factor = {k: v.copy() for k, v in factor.items()}
    set_by = {k: v.copy() for k, v in set_by.items()}
    ti = amp_mod.SET_BY.index("impulse bound")
    for fam, q, key in (("flexure", "moment", "moment"), ("shear", "shear", "shear"),
                        ("deflection", "deflection", "deflection"),
                        ("web_yielding", "force", "local"), ("web_crippling", "force", None)):
        A = np.where(np.isfinite(got[q]), np.maximum(got[q], 1.0), np.inf)
        lower = A < factor[fam][sel]
        factor[fam][sel] = faded(A, factor[fam][sel])
        if key is not None:
            set_by[key][sel] = np.where(lower, ti, set_by[key][sel])
    # the deck's checks read the deck's force F_deck = deck_ratio·F, at most the contact
    # force at the load, which the bound caps at got["force"]·F
    with np.errstate(divide="ignore", invalid="ignore"):
        A_deck = np.maximum(got["force"] / imp.deck_ratio[sel], 1.0)
    A_deck = np.where(np.isfinite(A_deck), A_deck, np.inf)
    for fam in ("deck_flexure", "deck_punching"):
        factor[fam][sel] = faded(A_deck, factor[fam][sel])
    return factor, set_by


def _with_histories(n: int, th: np.ndarray, hist: pointhistory.PointHistory,
                    factor: dict[str, np.ndarray], set_by: dict[str, np.ndarray],
                    deck_ratio: np.ndarray | None = None
                    ) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
    """The factors at the points ``th`` lowered to their own time history's where
    that is less (:func:`_th_factors`, ``deck_ratio`` F_deck/F at those points), and
    what set them marked so."""
    idx = np.flatnonzero(th)
    got = _th_factors(hist, deck_ratio)
    factor = {k: v.copy() for k, v in factor.items()}
    lower = {}
    for k in factor:
        lower[k] = np.zeros(n, dtype=bool)
        lower[k][idx] = got[k] < factor[k][idx]
        factor[k][idx] = np.minimum(factor[k][idx], got[k])
    ti = amp_mod.SET_BY.index("point time history")
    keyed = {"local": "web_yielding", "moment": "flexure", "shear": "shear",
             "deflection": "deflection"}
    set_by = {k: np.where(lower[keyed[k]], ti, v) for k, v in set_by.items()}
    return factor, set_by


def struck_member_table(c: Chain) -> dict[str, np.ndarray]:
    """Per point, the deck member of the load path with the larger lever-rule share
    (the struck member of :func:`droprig.solver.pointhistory.struck_member`) as the
    amplification table reads it: end condition index ``cond``
    (:data:`droprig.solver.loadpath.COND_NAMES`), position ``xi`` = a/L, and ``own``
    the share of the members' bending compliance that is that member's own bending
    under its share (w_k·g_own,k over the path's bending, dimensionless, 0–1; 0 where
    no path). Load-independent, kept with the points' geometry."""
    geo = c.drop.geo
    got = geo.cache.get("struck_member_table")
    if got is not None and got["xi"].shape == geo.x.shape:
        return got
    fr, path = c.drop.fm.frame, geo.path
    n = geo.x.shape[0]
    share = path.share
    k = np.where(share[:, 0] >= share[:, 1], 0, 1)
    rows = np.arange(n)
    m = path.members[rows, k].astype(int)
    valid = (m >= 0) & (path.pair >= 0)
    m = np.where(valid, m, 0)
    L = fr.L[m]
    xi = np.clip(path.a[rows, k] / L, 0.0, 1.0)
    ci = np.where(valid, np.asarray(fr.cond, int)[m], 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        own = share[rows, k] * path.g_own[rows, k] / path.f
    own = np.where(valid & np.isfinite(own), np.clip(own, 0.0, 1.0), 0.0)
    got = {"cond": ci, "xi": np.where(valid, xi, 0.5), "own": own}
    geo.cache["struck_member_table"] = got
    return got


def _groups(d: Drop) -> np.ndarray:
    """Per point, the index of its group of the choice of points run through their
    own history: one bay and one load."""
    group = np.asarray(d.geo.bay, np.int64) * (len(d.loads) + 1) + np.asarray(d.li, np.int64)
    return np.unique(group, return_inverse=True)[1]


def _history_ok(d: Drop, F: np.ndarray, h: np.ndarray) -> np.ndarray:
    """The points that can be run through their own time history (bool): on a member
    of the path (not over a deck opening) with a finite positive force F (N) and fall
    h (m)."""
    return ((d.geo.path.pair >= 0) & ~d.geo.opening & np.isfinite(F) & (F > 0.0)
            & np.isfinite(h) & (h > 0.0))


def _top_per_group(key: np.ndarray, gi: np.ndarray, cand: np.ndarray, k: int) -> np.ndarray:
    """The points ``cand`` with the ``k`` largest ``key`` in each group ``gi``,
    ascending."""
    order = cand[np.lexsort((-key[cand], gi[cand]))]
    g_o = gi[order]
    start = np.r_[0, np.flatnonzero(np.diff(g_o)) + 1]
    rank = np.arange(order.size) - np.repeat(start, np.diff(np.r_[start, order.size]))
    return np.sort(order[rank < k])


def _point_histories(c: Chain, h: np.ndarray, F: np.ndarray, factor: dict[str, np.ndarray],
                     th_points: np.ndarray | None, deck_ratio: np.ndarray | None = None
                     ) -> tuple[np.ndarray, pointhistory.PointHistory | None]:
    """The points run through their own time history (bool per point) and that run
    (its points in ascending order), chosen as :func:`dynamic_amplification` says
    (or ``th_points``); ``deck_ratio`` F_deck/F per point (:func:`_th_factors`)."""
    d = c.drop
    n = d.n
    th = np.zeros(n, dtype=bool)
    floor_off = not FLOOR_POINT_HISTORY or (d.trial and not TRIAL_POINT_HISTORY)
    if th_points is not None:  # given (a later choice's, or the inverse answers')
        th = np.asarray(th_points, bool) & _history_ok(d, F, h)
        if not th.any():
            return th, None
        idx = np.flatnonzero(th)
        return th, pointhistory.point_history(c, idx, h[idx], F[idx])
    if d.bare is None and floor_off:
        return th, None
    ok = _history_ok(d, F, h)
    dem = _energy_demands(c)
    U_now = _utilisation(dem, factor, F)
    U_e = _utilisation(dem, {k: np.ones(n) for k in factor}, F)  # energy method
    A_max = np.maximum(np.maximum(factor["web_yielding"], factor["flexure"]),
                       np.maximum(factor["shear"], factor["deflection"]))
    eligible = ok & np.isfinite(U_now) & (A_max > 1.0 + 1e-9)
    if not eligible.any():
        return th, None
    gi = _groups(d)
    now = {k: v.copy() for k, v in factor.items()}
    rows: list[np.ndarray] = []
    runs: list[pointhistory.PointHistory] = []
    for _ in range(TH_ROUNDS):
        worst = np.full(gi.max() + 1, -np.inf)
        np.maximum.at(worst, gi, np.where(ok & np.isfinite(U_now), U_now, -np.inf))
        # the bound could set the group's worst (its verdict) or limit: within 10 %
        # of the group's worst and above the energy method's U (else nothing to
        # gain); the largest TH_PER_ROUND of each group per round
        cand = np.flatnonzero(eligible & ~th & (U_now >= TH_NEAR_WORST * worst[gi])
                              & (U_now > U_e * (1.0 + 1e-9)))
        if cand.size == 0:
            break
        idx = _top_per_group(U_now, gi, cand, TH_PER_ROUND)
        ph = pointhistory.point_history(c, idx, h[idx], F[idx])
        got = _th_factors(ph, None if deck_ratio is None else deck_ratio[idx])
        for k in now:
            now[k][idx] = np.minimum(now[k][idx], got[k])
        U_now = _utilisation(dem, now, F)
        th[idx] = True
        rows.append(idx)
        runs.append(ph)
    if not runs:
        return th, None
    return th, pointhistory.merge(np.concatenate(rows), runs)


def _scaled(chk: Check, A: np.ndarray) -> Check:
    """``chk`` evaluated at the force A·F: U = U_at(A·F) for the impact force F the
    chain's Impact step gives, allowed (energy-method) force F_allow/A; the governing
    candidate's detail is kept (its demand per N of the amplified force), and ``at``
    gives the check at A·F with the member and candidate that govern there."""
    U_at = chk.U_at
    inner = chk.at

    def at_U(Fx: np.ndarray) -> np.ndarray:
        return U_at(A * Fx)

    at = None
    if inner is not None:
        def at(Fx: np.ndarray) -> Check:
            got = inner(A * Fx)
            return Check(name=chk.name, U=got.U, F_allow=chk.F_allow / A,
                         member=got.member, unit=got.unit, exist=got.exist,
                         resist=got.resist, U_at=at_U, at=at)

    return Check(name=chk.name, U=chk.U, F_allow=chk.F_allow / A, member=chk.member,
                 unit=chk.unit, exist=chk.exist, resist=chk.resist, U_at=at_U, at=at)


def at_force(chk: Check, F: np.ndarray) -> Check:
    """``chk`` (a family scaled by :func:`_scaled`) made at the impact force F (N): its
    U there and the member and candidate that govern there (:attr:`Check.at`), the
    allowed force kept. Where the check keeps no ``at``: U at F, member and detail as
    they were."""
    if chk.at is None:
        return Check(name=chk.name, U=chk.U_at(F), F_allow=chk.F_allow, member=chk.member,
                     unit=chk.unit, exist=chk.exist, resist=chk.resist, U_at=chk.U_at)
    got = chk.at(F)
    return Check(name=chk.name, U=got.U, F_allow=chk.F_allow, member=got.member,
                 unit=got.unit, exist=got.exist, resist=got.resist, U_at=chk.U_at,
                 at=chk.at)


def amplified_demands(c: Chain) -> Demands:
    """Every check family of :class:`Demands` at its amplified force A·F (linear in F:
    U = |A·F·u + E|/R; F_allow/A in terms of the energy method's force), so the
    checks use max(energy method, time-history-based demand) — A ≥ 1. With the
    project setting ``dynamic_amplification`` off, step 5's demands unchanged."""
    imp, dem, amp = c[Impact], c[Demands], c[DynamicAmplification]
    if not c.drop.fm.settings.dynamic_amplification:
        return dem  # the energy method's demands, unchanged
    out: dict[str, Check] = {}
    for name, chk in dem.checks.items():
        # the connection check is end shear: it takes the shear factor
        A = amp.factor.get(name, amp.A_shear)
        # the member and candidate that govern at the amplified force (at A·F the
        # existing demand weighs less: another member can govern than at F)
        out[name] = at_force(_scaled(chk, A), imp.F)
    return Demands(checks=out, actions=dem.actions)


def connection_family(fm: FloorModel, shear: Family) -> Family:
    """End shear of every path member against its end connections: the shear
    family's end candidates (AISC Manual Table 3-23 end reactions) with the
    connection capacity ``Member.connection_capacity`` in place of the web's
    resistance, or the stated default
    :data:`droprig.solver.composite.CONNECTION_DEFAULT_FRACTION` of it
    (:func:`droprig.solver.composite.connection_capacity`). Brittle (bolts, welds)."""
    Vc = fm._memo.get("connection_capacity")
    if Vc is None:  # per member, kept on the prepared floor
        Vc = fm._memo["connection_capacity"] = np.array(
            [composite.connection_capacity(float(fm.Vr[k]), m.connection_capacity)
             for k, m in enumerate(fm.level.members)])
    mem = shear.members
    Vc_pts = np.where(mem >= 0, Vc[np.where(mem >= 0, mem, 0)], np.inf)
    with np.errstate(divide="ignore", invalid="ignore"):
        scale = np.where(np.isfinite(Vc_pts), shear.resist / Vc_pts, 1.0)
    rows = scale[shear.src]
    return Family(shear.ut * rows, shear.Et * rows, mem,
                  np.where(np.isfinite(Vc_pts), Vc_pts, shear.resist), shear.src,
                  shear.groups)


def support_spread(fm: FloorModel) -> tuple[float, float]:
    """(b, h): half the least flange width of the level's members and the depth the
    load spreads through to them (the concrete over the ribs), m — the inputs of
    :func:`base_on_line` (the least flange: the least direct bearing, conservative
    for the slab)."""
    lv = fm.level
    b = 0.5 * min((m.section.bf for m in lv.members), default=0.0)
    return b, float(lv.deck.over_ribs().thickness)


def base_on_line(e: np.ndarray, ext: np.ndarray, b: float, h: float
                 ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A rigid base of extent ``ext`` (m) whose centre lies ``e`` ≥ 0 (m) from a
    support line, on the slab (uniform springs) and the line's flange (half-width
    ``b``, rigid): the share of the force the slab carries, the distance of that
    part's resultant from the line and its equivalent uniform length (m), per point.

    The base's near edge is at s0 = e − ext/2, its far edge at s1 = e + ext/2. Clear
    of the flange it rests on the slab alone: share 1 at e, length ext. Bearing on
    the flange it tips about p = clip(b, s0, s1), the flange's edge (or the base's
    edge where the spread, not the base, reaches the flange): the slab under
    [p, s1] takes a triangular pressure, share 3(e − p)/(2(s1 − p)) (0 once the
    centre is over the flange), resultant at p + 2(s1 − p)/3, length (s1 − p)/2
    (statics of a rigid base on a knife edge and uniform springs; Hetényi 1946
    ch. 1 — from memory). The flange is engaged by λ, the part of its near half
    [0, b] under the footprint spread at 45° through the slab depth ``h``
    (EN 1994-1-1 §9.4.3(2) — from memory), from 0 as the spread reaches the flange's
    edge to 1 when it covers the half, raised smoothly, λ = 3t² − 2t³ of the covered
    part t (no kink in U where the engagement starts: a ridge there was missed by the
    grid's refinement by 1.2 %); the two states are mixed by λ (share,
    moment of the share and length weighted), so the result is continuous as the
    base comes onto the line (before, the slab was relieved outright the instant
    the footprint's edge reached it). SI units."""
    e, ext = np.broadcast_arrays(np.asarray(e, float), np.asarray(ext, float))
    s0 = e - 0.5 * ext
    bb = max(b, 1e-9)
    near = s0 - h < bb  # elsewhere λ = 0: the slab alone (exact, not an approximation)
    if not near.all():
        share, pos, length = np.ones(e.shape), e.copy(), ext.copy()
        if near.any():
            share[near], pos[near], length[near] = base_on_line(e[near], ext[near], b, h)
        return share, pos, length
    s1 = e + 0.5 * ext
    t_lam = np.clip((bb - (s0 - h)) / bb, 0.0, 1.0)
    lam = t_lam * t_lam * (3.0 - 2.0 * t_lam)  # smooth start and end of the engagement
    p = np.clip(bb, s0, s1)
    run = np.maximum(s1 - p, 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        piv = np.where(run > 0.0, np.clip(1.5 * (e - p) / np.where(run > 0.0, run, 1.0),
                                          0.0, 1.0), 0.0)
    share = (1.0 - lam) + lam * piv
    mom = (1.0 - lam) * e + lam * piv * (p + 2.0 * run / 3.0)
    lng = (1.0 - lam) * ext + lam * piv * 0.5 * run
    with np.errstate(divide="ignore", invalid="ignore"):
        ok = share > 0.0
        pos = np.where(ok, mom / np.where(ok, share, 1.0), e)
        length = np.where(ok, lng / np.where(ok, share, 1.0), 0.0)
    return share, pos, length


def cross_strip_moment(Ly: np.ndarray, y: np.ndarray, across: np.ndarray,
                       along: np.ndarray, thick: float, b: float, h: float,
                       g_main: np.ndarray | None = None) -> np.ndarray:
    """Sagging moment per metre width of the slab's cross strip between the girder
    lines (span ``Ly``, load centred ``y`` from the first line), per newton of the
    load, N·m/m per N.

    The base (extent ``across`` normal to the girder lines, ``along`` parallel)
    on the slab and the nearer girder's flange (:func:`base_on_line`: share F_s of
    the force on the slab, its resultant's distance a from the line and length c),
    the slab part as a patch of length c at a on the simply supported strip
    (:func:`droprig.solver.deck.deck_unit_moment_per_width`), F_s·m(a, c); the
    flange engaged through the 45° spread over the slab depth ``h``. With
    ``g_main`` (m/N, the main strip's deflection under a unit load, inf where none)
    the cross strip's share of the slab part is taken where that part acts:
    1 − g_y(a)/(g_main + g_y(a)), g_y(a) = a²(Ly − a)²/(3·Ly) (:func:`two_way_share`'s
    crossing strips at the resultant, not at the load's centre, which lies nearer
    the girder). Clear of the
    girders (the spread short of the flange) this is the patch at the load's
    centre; it falls continuously as the base comes to rest over a
    girder (before, the cross strip was dropped the instant the footprint's edge
    reached the line: U stepped 2.2× on a random floor). SI units (m)."""
    Ly, y, a_c, a_l = np.broadcast_arrays(*(np.asarray(v, float) for v in (Ly, y, across, along)))
    e = np.clip(np.minimum(y, Ly - y), 0.0, None)
    share, pos, length = base_on_line(e, a_c, b, h)
    out = _slab_part_moment(Ly, share, pos, length, a_l, thick, g_main)
    return np.where(np.isfinite(out), out, 0.0)


def _slab_part_moment(Ly: np.ndarray, share: np.ndarray, pos: np.ndarray,
                      length: np.ndarray, along: np.ndarray, thick: float,
                      g_main: np.ndarray | None) -> np.ndarray:
    """The cross strip's sagging moment per metre width of the part of the load on the
    slab (share F_s, centre ``pos`` m from the nearer girder line, length m, extent
    ``along`` m parallel to the lines): a patch on the simply supported strip of span
    ``Ly``, F_s·m(pos, length) (:func:`droprig.solver.deck.deck_unit_moment_per_width`),
    of which the cross strip takes 1 − g_y/(g_main + g_y), g_y = pos²(Ly − pos)²/(3·Ly),
    where the main strip's deflection ``g_main`` (m/N) is given (Rankine–Grashof
    crossing strips at that part's centre). N·m/m per N; may be non-finite where the
    part is empty (the callers mask it)."""
    out = share * deck.deck_unit_moment_per_width(Ly, pos, length, along, thick)
    if g_main is None:
        return out
    gy = pos**2 * (Ly - pos) ** 2 / (3.0 * Ly)
    with np.errstate(divide="ignore", invalid="ignore"):
        tot = g_main + gy
        return out * np.where(tot > 0.0, 1.0 - gy / np.where(tot > 0.0, tot, 1.0), 1.0)


def uniform_on_line(e: np.ndarray, ext: np.ndarray, b: float,
                    edge: np.ndarray | bool = False
                    ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A footprint of extent ``ext`` (m) pressing uniformly (a declared underside
    stiffness, a mat or a crushable layer: :func:`presses_uniformly`) whose centre
    lies ``e`` ≥ 0 (m) from a support line: the share of its force on the slab of
    this side beyond the flange's edge (half-width ``b``), that part's centre from the
    line and its length (m), per point.

    The pressure q = F/ext acts on [s0, s1] = [e − ext/2, e + ext/2]. What lies over
    the flange (|s| ≤ b) bears on the steel directly and what lies beyond it on the
    slab across the line; this side's slab takes [p, s1], p = clip(b, s0, s1):
    share (s1 − p)/ext, centre (p + s1)/2, length s1 − p (statics of a uniform
    pressure; common practice, no source). Where the line is the deck's ``edge``
    nothing lies beyond the flange's outer edge: the load rests on [max(s0, −b), s1]
    only, and the slab's share is (s1 − p)/(s1 − max(s0, −b)) (the footprint as the
    deck sees it, already cut to the deck's area: ``_footprint_on_deck``). Continuous
    in e: 1, e, ext clear of the flange, falling to 0 as the footprint comes over it
    (before, the whole patch stayed on the cross strip until the footprint's edge
    reached the line and was dropped there: U stepped by more than 5 % for moves of
    1 mm, a random floor's soft underside). SI units."""
    e, ext, edge = np.broadcast_arrays(np.asarray(e, float), np.asarray(ext, float),
                                       np.asarray(edge, bool))
    bb = max(b, 0.0)
    s0, s1 = e - 0.5 * ext, e + 0.5 * ext
    p = np.clip(bb, s0, s1)
    length = s1 - p
    rests = np.where(edge, s1 - np.maximum(s0, -bb), ext)
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(rests > 0.0, length / np.where(rests > 0.0, rests, 1.0), 0.0)
    return share, 0.5 * (p + s1), length


def uniform_cross_strip_moment(Ly: np.ndarray, y: np.ndarray, across: np.ndarray,
                               along: np.ndarray, thick: float, b: float,
                               g_main: np.ndarray, edge: np.ndarray | bool = False
                               ) -> np.ndarray:
    """Sagging moment per metre width of the cross strip between the girder lines
    (span ``Ly``, footprint centred ``y`` from the first) under a footprint pressing
    uniformly (extent ``across`` normal to the lines, ``along`` parallel), per newton
    of the load, N·m/m per N: the part on this side's slab (:func:`uniform_on_line`
    at the nearer line, share F_s, centre a, length c) as a patch on the simply
    supported strip, F_s·m(a, c) (:func:`droprig.solver.deck.deck_unit_moment_per_width`;
    AISC Manual Table 3-23 case 7 with the patch spread), of which the cross strip
    takes 1 − g_y(a)/(g_main + g_y(a)) by the crossing strips at that part's centre
    (as :func:`cross_strip_moment`; ``g_main`` m/N, inf where no main strip). Clear
    of the flanges this is the whole footprint at its centre with the crossing
    strips' share there, the rule before. ``edge``: the nearer girder line is the
    deck's edge (:func:`uniform_on_line`). SI units (m)."""
    Ly, y, a_c, a_l = np.broadcast_arrays(*(np.asarray(v, float) for v in (Ly, y, across, along)))
    e = np.clip(np.minimum(y, Ly - y), 0.0, None)
    share, pos, length = uniform_on_line(e, a_c, b, edge)
    out = _slab_part_moment(Ly, share, pos, length, a_l, thick, g_main)
    return np.where(np.isfinite(out) & (share > 0.0), out, 0.0)


def _uniform_cross_strip(c: Chain, Ly: np.ndarray, yb: np.ndarray, ey: np.ndarray,
                         g_main: np.ndarray) -> np.ndarray:
    """:func:`uniform_cross_strip_moment` of a footprint pressing uniformly, the worse
    plan orientation, the deck's edge named (:func:`edge_lines`), N·m/m per N."""
    inp = c[LoadInputs]
    b_fl, _h = support_spread(c.drop.fm)
    thick = c.drop.fm.level.deck.thickness
    g_edge, _b_edge = edge_lines(c, ey)
    return np.maximum(
        uniform_cross_strip_moment(Ly, yb, inp.foot_l, inp.foot_w, thick, b_fl, g_main,
                                   g_edge),
        uniform_cross_strip_moment(Ly, yb, inp.foot_w, inp.foot_l, thick, b_fl, g_main,
                                   g_edge))


def edge_lines(c: Chain, ey: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Per point: whether the nearer girder line (``ey`` m from the point, along the
    deck beams) is the deck's edge, and whether the nearer beam line of the deck
    strip is (:func:`strip_restraint` gives no restraint there), from the level's
    grid extent (tolerance 1 mm). Plan geometry."""
    d, comp = c.drop, c[Compliance]
    ext = d.fm.level.grid.extent
    along = d.geo.x if d.fm.frame.deck_axis == "x" else d.geo.y
    lo, hi = (ext.x0, ext.x1) if d.fm.frame.deck_axis == "x" else (ext.y0, ext.y1)
    to_edge = np.minimum(along - lo, hi - along)
    g_edge = np.abs(to_edge - np.asarray(ey, float)) < 1e-3
    span, pos = comp.strip_span, comp.strip_pos
    near_first = pos <= 0.5 * span
    b_edge = (span > 0.0) & np.where(near_first, comp.k_left <= 0.0, comp.k_right <= 0.0)
    return g_edge, b_edge


def slab_bearing_share(span: np.ndarray, pos: np.ndarray, extent: np.ndarray, b: float,
                       h: float) -> np.ndarray:
    """Share of a rigid base's force that bears on the slab beside the nearer of
    two parallel support lines (0 and ``span``, m; the base of ``extent`` m centred
    ``pos`` m from the first), per point: :func:`base_on_line`'s share, 1 clear of
    the lines and where no span exists, continuous as the base comes to rest on a
    line (0 once its centre is over the flange). Dimensionless."""
    span, pos, ext = np.broadcast_arrays(*(np.asarray(v, float) for v in (span, pos, extent)))
    e = np.clip(np.minimum(pos, span - pos), 0.0, None)
    share, _pos, _len = base_on_line(e, ext, b, h)
    return np.where(span > 0.0, share, 1.0)


def presses_uniformly(c: Chain) -> np.ndarray:
    """Per point: the footprint presses the deck uniformly rather than as a rigid
    base — a declared underside stiffness (``LoadInputs.f_load`` > 0), or a mat or
    crushable layer under the load (``t_mat`` > 0). The rigid-base statics of
    :func:`base_on_line` are not credited there: the cross strip and punching take
    the part of the uniform pressure that lies on the slab beyond the flanges
    (:func:`uniform_on_line`), continuous as the footprint comes over a line."""
    inp = c[LoadInputs]
    return (np.asarray(inp.f_load) > 0.0) | (np.asarray(inp.t_mat) > 0.0)


def girder_share(c: Chain, across: np.ndarray) -> np.ndarray:
    """:func:`slab_bearing_share` of the base across the girder lines (extent
    ``across`` m normal to them, at y along the deck beam of span Ly), the flange
    engaged by the footprint itself (the strut through the slab's depth is
    :func:`punching_near_support`'s β). Dimensionless."""
    _share, Ly, yb = two_way_share(c)
    b, _h = support_spread(c.drop.fm)
    return slab_bearing_share(Ly, yb, across, b, 0.0)


def beam_share(c: Chain, along: np.ndarray) -> np.ndarray:
    """:func:`slab_bearing_share` of the base across the strip's two deck beams
    (extent ``along`` m in the strip's direction), as :func:`girder_share`; 1 where
    the point has no strip. Dimensionless."""
    comp = c[Compliance]
    b, _h = support_spread(c.drop.fm)
    return slab_bearing_share(comp.strip_span, comp.strip_pos, along, b, 0.0)


def punching_near_support(c: Chain, ey: np.ndarray) -> np.ndarray:
    """Share of the contact force that loads the deck in punching, per point.

    The part of the force a rigid base passes to a beam's or girder's flange bears
    on the steel by direct compression and cannot punch (the crushing of the
    concrete under the footprint, :mod:`droprig.solver.crushing`, is the check
    there): the share that bears on the slab σ (:func:`beam_share`,
    :func:`girder_share`: the base as a rigid body on the slab's springs and the
    flanges it covers, :func:`base_on_line`; the lesser, the larger over the two
    plan orientations of the footprint). Close to a support the rest goes to it
    partly by a direct strut: EN 1992-1-1 §6.2.2(6) lets the contribution of a load
    applied within 0.5d ≤ a_v ≤ 2d of the support be multiplied by β = a_v/(2d),
    applied here to punching as to one-way shear (from memory; β = 0.25 for
    a_v ≤ 0.5d, down to a footprint over the line). a_v is the clear distance from
    the footprint to the nearest support line, in the strip's direction (beams) or
    across it (girders), measured to the line rather than the flange edge and with
    the footprint's smaller half-side (both give the larger a_v: conservative);
    ``ey`` the distance to the nearer girder line (m, as :func:`demands` has it).
    Returns σ·β: continuous in the point (before, 0 as soon as the footprint
    reached a line: a step from 0.25). SI units (m); 1 beyond 2d and clear of the
    flanges."""
    d, inp, comp = c.drop, c[LoadInputs], c[Compliance]
    dk = d.fm.level.deck
    if dk.is_steel:
        return np.ones(d.n)
    dd = max(deck.effective_depth(dk.over_ribs()), 1e-3)  # d as the punching check's
    span, pos = comp.strip_span, comp.strip_pos
    ex = np.where(span > 0.0, np.minimum(pos, span - pos), 0.0)
    half = 0.5 * np.minimum(inp.foot_l, inp.foot_w)
    a_v = np.minimum(ex, ey) - half
    beta = np.clip(a_v / (2.0 * dd), 0.25, 1.0)
    # σ at the girder distance of two_way_share — the ey demands passes — worked out
    # once per chain (web_contact_bound reads it too)
    return c.once(slab_share_at) * beta


def slab_share_at(c: Chain) -> np.ndarray:
    """:func:`slab_share` at each point's distance to the nearer girder line
    (:func:`two_way_share`'s y and Ly, as :func:`demands` takes it)."""
    _share, Ly, yb = two_way_share(c)
    return slab_share(c, np.minimum(yb, Ly - yb))


def slab_share(c: Chain, ey: np.ndarray) -> np.ndarray:
    """σ, the share of the contact force that bears on the slab rather than directly
    on a beam's or girder's flange, per point (dimensionless, 0-1): a rigid base on
    the slab's springs and the flanges it covers (:func:`beam_share`,
    :func:`girder_share`, :func:`base_on_line`; the lesser over the two line
    families, the larger over the two plan orientations of the footprint), and for a
    footprint that presses uniformly the part of its pressure on the slab beyond the
    flanges (:func:`uniform_on_line`). ``ey`` the distance to the nearer girder line
    (m). 1 − σ is the share that bears on the steel: :func:`punching_near_support`
    and :func:`web_contact_bound`."""
    d, inp, comp = c.drop, c[LoadInputs], c[Compliance]
    span, pos = comp.strip_span, comp.strip_pos
    ex = np.where(span > 0.0, np.minimum(pos, span - pos), 0.0)
    sigma = np.maximum(np.minimum(beam_share(c, inp.foot_l), girder_share(c, inp.foot_w)),
                       np.minimum(beam_share(c, inp.foot_w), girder_share(c, inp.foot_l)))
    # a footprint pressing uniformly: the part of its pressure on the slab beyond the
    # flanges (uniform_on_line), the larger over the two plan orientations
    soft = presses_uniformly(c)
    if soft.any():
        b_fl, _h = support_spread(d.fm)
        ey_line = np.clip(ey, 0.0, None)
        g_edge, b_edge = edge_lines(c, ey)

        def on_slab(along: np.ndarray, across: np.ndarray) -> np.ndarray:
            sb = np.where(span > 0.0, uniform_on_line(ex, along, b_fl, b_edge)[0], 1.0)
            return sb * uniform_on_line(ey_line, across, b_fl, g_edge)[0]

        sigma_u = np.maximum(on_slab(inp.foot_l, inp.foot_w), on_slab(inp.foot_w, inp.foot_l))
        sigma = np.where(soft, sigma_u, sigma)
    return sigma


def punching_resistance_at(c: Chain) -> np.ndarray:
    """Punching resistance of the deck under the footprint at each point, N.

    :func:`droprig.solver.deck.punching_resistance` with the concrete over the ribs
    of a composite deck (h − rib height, EN 1994-1-1 §9.7.6, from memory), scaled by
    the share of the control perimeter u1 left beside a deck opening within 6d: the
    part between the tangents from the loaded area's centre to the opening is
    ineffective (EN 1992-1-1 §6.4.2(3), Fig. 6.14); the worse footprint orientation
    is taken (conservative; the same geometry is used for the ACI basis, whose
    perimeter is at d/2). The deck's outline rests on edge members in droprig's
    model (a supported edge, where the load bears on the steel), so the free-edge
    perimeters of §6.4.2(4) apply at openings only — through the tangent rule."""
    d, inp = c.drop, c[LoadInputs]
    lv, s = d.fm.level, d.fm.settings
    dk = lv.deck
    dk_p = dk.over_ribs()
    R = np.broadcast_to(deck.punching_resistance(dk_p, inp.foot_l, inp.foot_w,
                                                 s.design_basis, s.resistance_factor),
                        (d.n,))
    if not dk.openings:
        return R
    dd = max(deck.effective_depth(dk_p), 1e-3)
    x, y = d.geo.x, d.geo.y
    ratio = np.ones(d.n)
    for lx, ly in ((inp.foot_l, inp.foot_w), (inp.foot_w, inp.foot_l)):
        u1 = slab.control_perimeter_edges(lx, ly, dd)
        cut = np.zeros(d.n)
        for op in dk.openings:
            reach = 8.0 * dd  # 6d from the loaded area plus the 2d of u1
            near = ((x + lx / 2 + reach >= op.x0) & (x - lx / 2 - reach <= op.x1)
                    & (y + ly / 2 + reach >= op.y0) & (y - ly / 2 - reach <= op.y1))
            if near.any():
                cut[near] += slab.opening_ineffective_length(
                    x[near], y[near], lx[near], ly[near], dd, (op.x0, op.y0, op.x1, op.y1))
        ratio = np.minimum(ratio, np.maximum(u1 - cut, 0.0) / u1)
    return R * ratio


DISTRIBUTION_SHARE = 0.2
"""Distribution (cross) steel of the deck as a share of its main bars: the minimum of
EN 1992-1-1 §9.3.1.1(2), 20 % (the same assumption as the punching check)."""


def two_way_share(c: Chain) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Share of the load carried by the deck strip between the beams, the rest going
    along the cross strip to the girders, by equal deflection of two crossing strips
    at the load (Rankine–Grashof crossing-strip method; Reynolds, *Reinforced Concrete
    Designer's Handbook*, two-way slabs — from memory): share = g_y/(g_x + g_y),
    g_x the restrained main strip's deflection under a unit load
    (:func:`droprig.solver.slab.continuous_strip_compliance`, same EI both ways),
    g_y = y²(Ly − y)²/(3·Ly) of the cross strip simply supported on the girders
    (AISC Manual Table 3-23 case 8; conservative for the main strip). On a girder
    line g_y = 0: the load bears on the girder. Returns (share, Ly, y) with Ly the
    girder spacing (the deck beams' span, m) and y the position along it (m)."""
    d, comp = c.drop, c[Compliance]
    path, frame = d.geo.path, d.fm.frame
    span = comp.strip_span
    mem = np.where(path.members[:, 0] >= 0, path.members[:, 0], 0)
    Ly = frame.L[mem]
    yb = np.clip(path.a[:, 0], 0.0, Ly)
    ok = span > 0.0
    gx = comp.g_strip
    gy = yb**2 * (Ly - yb) ** 2 / (3.0 * Ly)
    tot = gx + gy
    with np.errstate(divide="ignore", invalid="ignore"):
        share = np.where(tot > 0.0, gy / np.where(tot > 0.0, tot, 1.0), 0.0)
    return np.where(ok, share, 0.0), Ly, yb


# --------------------------------------------------------------------------- 5c. slab
@dataclass(frozen=True, eq=False)
class SlabResistance:
    """Per point: the struck deck panel as a ductile member in series with the
    framing. ``R_yl`` (N): yield-line resistance of the panel under the load (inf on
    a support line, where a panel opening lies near, or where the slab is not
    ductile); ``ell`` (m): distance from the load to the nearest support line (the
    segments' lever for the support rotation); ``ductile``: the slab section may be
    taken past yield here (deck flexure is then not brittle); ``R`` (N): the
    resistance of slab and framing in series, min(R_frame, R_yl); ``slab_first``:
    the slab's mechanism forms before the framing's (R_yl < R_frame)."""

    R_yl: np.ndarray
    ell: np.ndarray
    ductile: np.ndarray
    R: np.ndarray
    slab_first: np.ndarray


def slab_rotation_limit(settings_limit: float) -> float:
    """Support-rotation limit of the slab's yield-line mechanism, rad: the less of
    :data:`droprig.solver.slab.ROTATION_LIMIT_SLAB` (2°, UFC 3-340-02 ch. 4 for slabs
    without shear reinforcement or membrane detailing — from memory) and the
    project's rotation limit."""
    return min(slab.ROTATION_LIMIT_SLAB, settings_limit)


def slab_ductile(fm: FloorModel) -> bool:
    """Whether the level's deck section is under-reinforced enough to be taken past
    yield: x_u/d ≤ 0.45 (fck ≤ 50 MPa) or 0.35 (EN 1992-1-1 §5.6.3(2) simplified
    rotation check, :func:`droprig.solver.slab.is_ductile`; x_u by §3.1.7(3) or
    ACI 318-19 §22.2.2, :func:`droprig.solver.slab.neutral_axis_ratio`)."""
    dk = fm.level.deck
    dd = deck.effective_depth(dk)
    if dd <= 0.0 or dk.rebar_area <= 0.0:
        return False
    xu_d = slab.neutral_axis_ratio(dk.rebar_area, dd, dk.concrete.fc, dk.concrete.fy_rebar,
                                   fm.settings.design_basis)
    return bool(slab.is_ductile(xu_d, dk.concrete.fc))


def hogging_resistance(fm: FloorModel) -> float:
    """Hogging moment resistance per metre width over the beams and girders from the
    deck's top bars, N·m/m (:func:`droprig.solver.deck.deck_flexure_resistance` with
    the top bars as the tension steel; 0 without top bars)."""
    dk = fm.level.deck
    if dk.top_rebar_area <= 0.0:
        return 0.0
    return float(deck.deck_flexure_resistance(dk.hogging_section(), fm.settings.design_basis,
                                              fm.settings.resistance_factor))


def slab_resistance(c: Chain) -> SlabResistance:
    """Yield-line resistance of the struck panel (Lx = the deck strip's span between
    the beams, Ly = the beams' span between the girders, load at (x, y) in it), the
    least of the conical fan and the four-segment pattern
    (:func:`droprig.solver.slab.yield_line_resistance`; Johansen; Park & Gamble,
    *Reinforced Concrete Slabs* 2nd ed. ch. 9–10 — from memory), with sagging
    m_x = M_r − m_0 along the main bars (the existing load's strip moment
    q·L²/8 taken off, conservative), m_y = 20 % of M_r across them (distribution
    steel, EN 1992-1-1 §9.3.1.1(2)), hogging from the top bars over every support
    line, and the load as the circle of the footprint's area. In series with the
    framing, the pair yields at R = min(R_frame, R_yl) (UFC 3-340-02 ch. 3,
    resistance of elements in series; :func:`droprig.solver.slab.series_resistance`).
    N, m."""
    d, inp, comp = c.drop, c[LoadInputs], c[Compliance]
    fm, n = d.fm, d.n
    R_frame = c[Demands].actions.R_p
    inf = np.full(n, np.inf)
    if d.bare is not None or fm.level.deck.is_steel:
        # deck-less (one member), or a steel plate / grating deck: no concrete slab
        # mechanism is credited (a steel deck's flexure stays a brittle check:
        # conservative)
        return SlabResistance(R_yl=inf, ell=np.zeros(n), ductile=np.zeros(n, dtype=bool),
                              R=R_frame, slab_first=np.zeros(n, dtype=bool))
    _share, Ly, yb = two_way_share(c)
    Lx, xa = comp.strip_span, np.clip(comp.strip_pos, 0.0, np.maximum(comp.strip_span, 0.0))
    ell = np.minimum(np.minimum(xa, Lx - xa), np.minimum(yb, Ly - yb))
    ductile = np.full(n, slab_ductile(fm)) & (Lx > 0.0) & (Ly > 0.0)
    dk = fm.level.deck
    if ductile.any() and dk.openings:
        # a panel with an opening near the load: no credit (the patterns assume a
        # whole panel)
        reach = np.maximum(Lx, Ly)
        x, y = d.geo.x, d.geo.y
        for op in dk.openings:
            gx = np.maximum(0.0, np.maximum(op.x0 - x, x - op.x1))
            gy = np.maximum(0.0, np.maximum(op.y0 - y, y - op.y1))
            ductile &= np.hypot(gx, gy) > reach
    if not ductile.any():
        return SlabResistance(R_yl=inf, ell=ell, ductile=ductile, R=R_frame,
                              slab_first=np.zeros(n, dtype=bool))
    m0 = deck.deck_existing_moment_per_width(np.where(Lx > 0.0, Lx, 0.0), fm.q0)
    mx = np.maximum(fm.deck_Mr - m0, 0.0)
    my = DISTRIBUTION_SHARE * fm.deck_Mr
    m_neg = hogging_resistance(fm)
    r_load = np.sqrt(inp.foot_l * inp.foot_w / np.pi)
    with np.errstate(divide="ignore", invalid="ignore"):
        R_yl = slab.yield_line_resistance(Lx, Ly, xa, yb, mx, my, r_load, m_neg, m_neg)
    # a rigid base resting on both beams of the strip loads no slab mechanism
    R_yl = np.where(ductile & np.isfinite(R_yl) & (R_yl > 0.0) & ~comp.bridged_both, R_yl,
                    np.inf)
    R, _dy, first = slab.series_resistance(R_frame, comp.f_s, R_yl, comp.f_deck)
    return SlabResistance(R_yl=R_yl, ell=ell, ductile=ductile, R=R,
                          slab_first=(first == 2) & np.isfinite(R_yl))


# --------------------------------------------------------------------------- 6. checks
@dataclass(frozen=True, eq=False)
class Checks:
    """Per point, the elastic verdict: largest utilisation ``U``, least allowed force
    ``F_allow`` (N), governing check (index into CHECKS) and member, ``response``
    (elastic or exceeds; plastic is decided by :func:`beyond_yield`), and the brittle
    checks at the force the yielding path can pass on: at min(F, R_p) their largest
    ``Ub_cap`` (member ``brittle_member``, check ``brittle_check``), at R_p each
    ``Ub_at_Rp`` (in :data:`BRITTLE` order)."""

    U: np.ndarray
    F_allow: np.ndarray
    gov_check: np.ndarray
    gov_member: np.ndarray
    response: np.ndarray
    flex_exceeded: np.ndarray
    brittle_fail: np.ndarray
    Ub_cap: np.ndarray
    Ub_at_Rp: tuple[np.ndarray, ...]
    util_check: np.ndarray | None = None
    util_member: np.ndarray | None = None


def checks(c: Chain) -> Checks:
    """U = max over checks; F_allow = min over checks (linear in F, common practice, no
    source); brittle checks at R_p where F > R_p (DNV-RP-C204, from memory), R_p the
    resistance of slab and framing in series (:func:`slab_resistance`); deck flexure
    of a ductile slab yields instead of breaking (EN 1992-1-1 §5.6.3(2))."""
    d, imp, dem = c.drop, c[Impact], c[Demands]
    n, F, chk = d.n, imp.F, dem.checks
    names = list(chk)
    Ustack = np.stack([chk[k].U for k in names])
    rows = np.arange(n)
    gi = argmax_nan_low(Ustack)
    U = Ustack[gi, rows]
    F_allow = chk[names[0]].F_allow
    for k in names[1:]:
        F_allow = np.minimum(F_allow, chk[k].F_allow)
    gov_check = np.array([CHECK[names[i]] for i in range(len(names))])[gi]
    gov_member = np.stack([chk[k].member for k in names])[gi, rows]
    sr = c[SlabResistance]
    R_p = sr.R
    # U at F_cap = min(F, R_p) is U at F where F_cap is F (F ≤ R_p or F is NaN) and
    # U at R_p elsewhere: each brittle family is evaluated at R_p once, for this and
    # for the plastic inverse answer (same values as evaluating at F_cap). Deck
    # flexure of a ductile slab is not brittle: its mechanism is part of R_p.
    # (deck-less, one member: no deck checks)
    brittle = tuple(k for k in BRITTLE if k in chk)
    zero = np.zeros(n)

    def brittle_U(k: str, U: np.ndarray) -> np.ndarray:
        return np.where(sr.ductile, zero, U) if k == "deck_flexure" else U

    # two forces per point: the deck's (contact) families are scaled to the framing
    # force by A = F_deck/F (on_contact). Where A < 1 the framing yielding at R_p
    # does not lower the force on the deck below min(F_deck, R_p): the contact lies
    # before the struck mass in the load path (two-mass model, CEB Bulletin 187 —
    # from memory), so the framing's plastic resistance bounds it no lower than the
    # one force in series would be (R_p), and never above its own elastic value
    A = imp.deck_ratio
    with np.errstate(divide="ignore", invalid="ignore"):
        R_deck = np.where(A < 1.0, np.fmin(F, R_p / np.where(A > 0.0, A, 1.0)), R_p)
    Ub_at_Rp = tuple(brittle_U(k, chk[k].U_at(R_deck if k in CONTACT_CHECKS else R_p))
                     for k in brittle)
    at_F = (F <= R_p) | np.isnan(F)
    Ub = np.stack([np.where(at_F, brittle_U(k, chk[k].U), u)
                   for k, u in zip(brittle, Ub_at_Rp, strict=True)])
    jb = argmax_nan_low(Ub)
    Ub_max = Ub[jb, rows]
    brittle_member = np.stack([chk[k].member for k in brittle])[jb, rows]
    brittle_check = np.array([CHECK[k] for k in brittle])[jb]
    flex_exceeded = chk["flexure"].U > 1.0
    if "deck_flexure" in chk:
        flex_exceeded = flex_exceeded | (sr.ductile & (chk["deck_flexure"].U > 1.0))
    # the slab's yield-line mechanism forms first (R_p = R_yl in series, below the
    # force): the path yields there whatever the sagging-strip check reads, as the
    # inverse answers and the brittle checks at R_p take it (a load set down on a
    # random floor read 'exceeds' at a zero fall while its plastic height was 0.8 mm)
    flex_exceeded = flex_exceeded | (sr.slab_first & (F > R_p))
    response = np.full(n, ELASTIC, dtype=np.int64)
    over = U > 1.0
    brittle_fail = over & (~flex_exceeded | (Ub_max > 1.0))
    response[over] = EXCEEDS
    # the family whose U is the point's U (printed beside U), before the verdict's
    # governing check replaces it (a brittle check failing at the yield force)
    util_check, util_member = gov_check, gov_member
    gov_check = np.where(brittle_fail & flex_exceeded, brittle_check, gov_check)
    gov_member = np.where(brittle_fail & flex_exceeded, brittle_member, gov_member)
    return Checks(U=U, F_allow=F_allow, gov_check=gov_check, gov_member=gov_member,
                  response=response, flex_exceeded=flex_exceeded, brittle_fail=brittle_fail,
                  Ub_cap=Ub_max, Ub_at_Rp=Ub_at_Rp, util_check=util_check,
                  util_member=util_member)


# --------------------------------------------------------------------------- 7. beyond yield
@dataclass(frozen=True, eq=False)
class BeyondYield:
    """Per point: the path as elastic–perfectly-plastic with resistance ``R_p`` (N,
    by member ``rp_member``); the drop height left for the structure ``h_struct`` (m;
    a bottomed crushable layer's work taken out); peak deflection ``d_m`` (m),
    ``collapsed``, framing ductility and support rotation (rad) — computed where
    the path yields (every point with ``detail``), NaN elsewhere; ``no_hinge``: flexure
    beyond the resistance of a member that cannot form a hinge (least such force
    ``nh_fa``, N). ``response``, ``gov_check``, ``gov_member``: the verdict after
    yielding; ``plastic_deflection``, ``ductility_out``, ``rotation_out``: the
    outputs (NaN where the path does not yield)."""

    R_p: np.ndarray
    rp_member: np.ndarray
    h_struct: np.ndarray
    d_m: np.ndarray
    collapsed: np.ndarray
    ductility: np.ndarray
    theta: np.ndarray
    no_hinge: np.ndarray
    nh_fa: np.ndarray
    response: np.ndarray
    gov_check: np.ndarray
    gov_member: np.ndarray
    plastic_deflection: np.ndarray
    ductility_out: np.ndarray
    rotation_out: np.ndarray


def beyond_yield(c: Chain) -> BeyondYield:
    """Where only flexure exceeds on hinge-capable members (AISC 360-16 App. 1 /
    EN 1993-1-1 Class 1): R_p(δm − δy/2) = ηW h + W δm with δy = R_p·f (Biggs 1964,
    :func:`droprig.solver.plastic.plastic_response`); ductility of the framing
    (δm − R_p·f_series)/(R_p·f_s); support rotation
    (:func:`droprig.solver.plastic.support_rotation`). Steps: the energy the
    structure takes (:func:`_structure_head`), the response at the points that yield
    (:func:`_plastic_points`) and the verdict (:func:`_yield_verdict`)."""
    d, imp = c.drop, c[Impact]
    ck, sr = c[Checks], c[SlabResistance]
    n = d.n
    # the framing's share of the energy: the two-mass model's where it applies
    eta = c[StruckMass].eta if imp.eta_frame is None else imp.eta_frame
    h_struct = _structure_head(c, eta)
    over = ck.U > 1.0
    pl = over & ~ck.brittle_fail
    sub = slice(None) if d.detail or bool(pl.all()) else np.flatnonzero(pl)
    d_m_s, coll_s, duct_s, theta_s = _plastic_points(c, sub, h_struct, eta)
    d_m: np.ndarray
    ductility: np.ndarray
    theta: np.ndarray
    if isinstance(sub, slice):
        d_m, collapsed, ductility, theta = d_m_s, coll_s, duct_s, theta_s
    else:
        d_m, ductility, theta = (np.full(n, np.nan) for _ in range(3))
        collapsed = np.zeros(n, dtype=bool)
        d_m[sub], collapsed[sub], ductility[sub], theta[sub] = d_m_s, coll_s, duct_s, theta_s
    response, gov_check, gov_member, no_hinge = _yield_verdict(c, pl, collapsed, ductility,
                                                               theta)
    ua = c[Demands].actions
    return BeyondYield(R_p=sr.R, rp_member=ua.rp_member, h_struct=h_struct, d_m=d_m,
                       collapsed=collapsed, ductility=ductility, theta=theta,
                       no_hinge=no_hinge, nh_fa=ua.nh_fa, response=response,
                       gov_check=gov_check, gov_member=gov_member,
                       plastic_deflection=np.where(pl, d_m, np.nan),
                       ductility_out=np.where(pl, ductility, np.nan),
                       rotation_out=np.where(pl, theta, np.nan))


def _structure_head(c: Chain, eta: np.ndarray) -> np.ndarray:
    """The energy head the structure takes beyond yield (m): the fall with the
    hoist's head (:func:`energy_fall`), less the crushed layer's work
    (F_c − W)·s_c/(ηW) where the layer crushes below R_p and bottoms, × A_δ² of the
    dynamic amplification (an elastic response would deflect A_δ times the energy
    method's, δ ∝ √E; an approximation beyond yield, stated in the README; × 1 when
    the setting is off)."""
    inp, imp = c[LoadInputs], c[Impact]
    W, F_c, s_c = inp.W, inp.F_c, inp.s_c
    h = energy_fall(c, inp.h)  # with the hoist's lowering speed head
    R_p = c[SlabResistance].R
    # energy beyond yield: structure alone (mat compliance and crushed stroke removed)
    h_struct = h.copy()
    crush_ok = inp.crushable & (c.once(crushing_peak) < R_p) & imp.bottomed
    with np.errstate(divide="ignore", invalid="ignore"):
        h_struct = np.where(crush_ok, np.maximum(h - (F_c - W) * s_c / (eta * W), 0.0),
                            h_struct)
    return h_struct * c[DynamicAmplification].A_deflection ** 2


def _plastic_points(c: Chain, sub: slice | np.ndarray, h_struct: np.ndarray,
                    eta: np.ndarray) -> tuple[np.ndarray, ...]:
    """At the points ``sub``: the peak deflection δm (m), collapse (bool), the
    framing's ductility and the support rotation (rad,
    :func:`droprig.solver.plastic.support_rotation`); where the slab's mechanism
    forms first the framing stays elastic (ductility R/R_frame) and the rotation is
    the slab's about the nearest support line
    (:func:`droprig.solver.slab.slab_support_rotation`)."""
    inp, comp = c[LoadInputs], c[Compliance]
    ua, sr = c[Demands].actions, c[SlabResistance]
    R_p, f_s, f = sr.R, comp.f_s, comp.f
    R_ps, f_s_s = R_p[sub], f_s[sub]
    d_m_s, _mu_tot, coll_s = plastic.plastic_response(inp.W[sub], h_struct[sub], eta[sub],
                                                      R_ps, R_ps * f[sub])
    with np.errstate(invalid="ignore"):
        d_struct = np.maximum(d_m_s - R_ps * comp.f_series[sub], 0.0)
        d_struct = np.where(np.isfinite(d_m_s), d_struct, np.inf)
        d_y_s = R_ps * f_s_s
        duct_s = np.where(d_y_s > 0, d_struct / np.where(d_y_s > 0, d_y_s, 1.0), np.inf)
    theta_s = np.zeros(d_struct.shape)
    cond_s, arm_s = ua.rp_cond[sub], ua.rp_arm[sub]
    one = not cond_s.size or cond_s.min() == cond_s.max()
    for cc in cond_s[:1] if one else np.unique(cond_s):
        sel = slice(None) if one else cond_s == cc
        Lsel = arm_s[sel] if COND_NAMES[int(cc)] == "cantilever" else 2 * arm_s[sel]
        theta_s[sel] = plastic.support_rotation(d_struct[sel], Lsel, arm_s[sel],
                                                COND_NAMES[int(cc)])
    # the slab's mechanism first: the framing stays elastic (ductility R/R_frame) and
    # the plastic deflection is the slab's, turning its segments about the nearest
    # support line (slab.slab_support_rotation; limit slab_rotation_limit)
    sf_s = sr.slab_first[sub]
    if sf_s.any():
        with np.errstate(divide="ignore", invalid="ignore"):
            d_slab = np.maximum(d_m_s - R_ps * f[sub], 0.0)
            duct_s = np.where(sf_s, R_ps / ua.R_p[sub], duct_s)
            theta_sl = slab.slab_support_rotation(d_slab, sr.ell[sub])
        theta_s = np.where(sf_s, theta_sl, theta_s)
    return d_m_s, coll_s, duct_s, theta_s


def _yield_verdict(c: Chain, pl: np.ndarray, collapsed: np.ndarray, ductility: np.ndarray,
                   theta: np.ndarray) -> tuple[np.ndarray, ...]:
    """Response, governing check and member of the points ``pl`` beyond yield:
    collapse, ductility, rotation, or plastic (flexure; the deck's where the slab
    yields); flexure beyond the resistance of a member that cannot form a plastic
    hinge (AISC 360-16 App. 1 / EN 1993-1-1 Class 1) has no plastic reserve and
    exceeds (as in droprig check, :mod:`droprig.solver.member`). Returns response,
    gov_check, gov_member and no_hinge."""
    s = c.drop.fm.settings
    ck, sr, imp, ua = c[Checks], c[SlabResistance], c[Impact], c[Demands].actions
    R_p = sr.R
    col = pl & collapsed
    duct = pl & ~collapsed & (ductility > s.ductility_limit)
    theta_lim = np.where(sr.slab_first, slab_rotation_limit(s.rotation_limit),
                         s.rotation_limit)
    rot = pl & ~collapsed & ~duct & (theta > theta_lim)
    ok_pl = pl & ~collapsed & ~duct & ~rot
    no_hinge = ok_pl & (np.where(sr.slab_first, R_p, imp.F) > ua.nh_fa)
    ok_pl = ok_pl & ~no_hinge
    response = ck.response.copy()
    response[ok_pl] = PLASTIC
    gov_check = np.where(col, CHECK["collapse"], ck.gov_check)
    gov_check = np.where(duct, CHECK["ductility"], gov_check)
    gov_check = np.where(rot, CHECK["rotation"], gov_check)
    gov_check = np.where(ok_pl, CHECK["flexure"], gov_check)
    gov_member = np.where(pl, ua.rp_member, ck.gov_member)
    # the yielding is the slab's where its mechanism forms first, or where only the
    # deck's elastic strip check is exceeded
    slab_gov = pl & (sr.slab_first | ~(c[Demands].checks["flexure"].U > 1.0))
    gov_check = np.where(slab_gov & ok_pl, CHECK["deck_flexure"], gov_check)
    gov_member = np.where(slab_gov, DECK, gov_member)
    gov_check = np.where(no_hinge, CHECK["flexure"], gov_check)
    gov_member = np.where(no_hinge, ua.nh_member, gov_member)
    return response, gov_check, gov_member, no_hinge


# --------------------------------------------------------------------------- 8. inverse
@dataclass(frozen=True, eq=False)
class InverseAnswers:
    """Per point: allowable drop heights ``h_el`` (elastic) and ``h_pl`` (beyond yield
    within the limits), m, as falls onto the struck surface; allowable mass
    ``m_allow`` (kg, through a crushable layer where one lies); the stiffest spring
    mat laid on the finished surface that keeps the point elastic ``k_req`` (N/m, η =
    1 under a mat, ∞ where the structure alone suffices) and the crush stroke
    ``s_req`` (m) (NaN where none exists); ``Ub_Rp``: the largest brittle utilisation
    at R_p; ``h_check`` / ``h_member``: the check (index into CHECKS) and member of
    the least allowed force, which set ``h_el``; ``hp_check``: ``ductility`` or
    ``rotation`` where that limit sets ``h_pl``, -1 where ``h_el`` is the larger."""

    h_el: np.ndarray
    h_pl: np.ndarray
    m_allow: np.ndarray
    k_req: np.ndarray
    s_req: np.ndarray
    Ub_Rp: np.ndarray
    h_check: np.ndarray
    h_member: np.ndarray
    hp_check: np.ndarray


def with_crush_energy(h_allow: np.ndarray, where: np.ndarray, F_c: np.ndarray,
                      s_c: np.ndarray, W: np.ndarray, eta: np.ndarray) -> np.ndarray:
    """An allowable height over a crushable layer that bottoms out, m: the layer takes
    (F_c − W)·s_c of the energy ηWh (:func:`droprig.solver.impact.impact_crushable`,
    case 3, solved for h: h = h_allow + (F_c − W)·s_c/(ηW)). A layer weaker than the
    load's weight (F_c ≤ W) crushes under the weight alone and *adds* (W − F_c)·s_c:
    the height shrinks, and where it would fall below 0 no height is allowed (nan),
    so an inverse answer never claims a margin the forward chain does not give."""
    with np.errstate(divide="ignore", invalid="ignore"):
        bonus = np.where(where, (F_c - W) * s_c / (eta * W), 0.0)
        out = h_allow + bonus
    return np.where(np.isfinite(out) & (out >= 0.0), out, np.nan)


MASS_BISECTIONS = 48
"""Bisection steps of :func:`_mass_through_crushing` (the bracket shrinks 2⁻⁴⁸)."""


def _mass_through_crushing(F_allow: np.ndarray, h: np.ndarray, f: np.ndarray,
                           m_e: np.ndarray, F_crush: np.ndarray, cover: float,
                           M_low: np.ndarray) -> np.ndarray:
    """Largest mass M (kg) whose peak force through the crushing-limited contact of
    the impact step stays ≤ F_allow (N), by bisection on the forward model itself:
    F(M) = :func:`droprig.solver.crushing.crushing_limited_impact` with W = M·g and
    η = M/(M + m_e) (Gere §9.10 with Timoshenko's mass share), increasing in M.
    Bracket: ``M_low`` (the elastic answer, where the force is at most F_allow) and
    F_allow/g (the force is never below the weight). The lower end is returned, so
    the answer never exceeds what the forward model allows. h in m, f in m/N, m_e in
    kg, cover in m."""
    lo = M_low.copy()
    hi = np.maximum(F_allow / impact_mod.G, lo)
    for _ in range(MASS_BISECTIONS):
        mid = 0.5 * (lo + hi)
        W = mid * impact_mod.G
        eta = impact_mod.mass_efficiency(mid, m_e)
        _, F_el, _ = impact_mod.impact_elastic(W, h, f, eta)
        F_cap, _, _ = crushing.crushing_limited_impact(W, h, f, eta, F_crush, cover)
        F = np.where(F_el > F_crush, F_cap, F_el)
        ok = F <= F_allow
        lo = np.where(ok, mid, lo)
        hi = np.where(ok, hi, mid)
    return lo


def inverse_answers(c: Chain) -> InverseAnswers:
    """Gere Eq. 9-94 solved for h, M, k and a crush stroke
    (:mod:`droprig.solver.limits`); beyond yield the energy balance at the ductility
    and rotation limits (:func:`droprig.solver.plastic.allowable_height_plastic`).
    Steps: :func:`_elastic_height`, :func:`_plastic_height`,
    :func:`_allowable_mass_of`, :func:`_mat_answers`, :func:`_height_check`."""
    d, sm, imp, ck = c.drop, c[StruckMass], c[Impact], c[Checks]
    # the framing's share of the energy (two-mass model where it applies; the
    # allowed force F_allow is stated as a force on the framing, the contact checks
    # scaled to it): the height at which the one-mass balance with this share gives
    # F_allow (struck_mass.equivalent_eta)
    eta = sm.eta if imp.eta_frame is None else imp.eta_frame
    F_allow = ck.F_allow
    Fa_pos = np.where(F_allow > 0, F_allow, np.nan)
    # the two-force points' impact at any height (the searches' fast kernel)
    kern = (TwoForceKernel(c, np.flatnonzero(imp.searched))
            if imp.searched is not None and imp.searched.any() and not d.trial else None)
    h_el = _elastic_height(c, eta, Fa_pos, kern)
    if d.outcomes_only:  # not worked out: the confirmation's answers (Drop)
        h_pl, hp_check, Ub_Rp = _untried_plastic(c)
        m_allow = np.full(d.n, np.nan)
    else:
        h_pl, hp_check, Ub_Rp = _plastic_height(c, eta, h_el, kern)
        m_allow = _allowable_mass_of(c, Fa_pos, kern)
    k_req, s_req = _mat_answers(c, Fa_pos)
    h_check, h_member = _height_check(c)
    return InverseAnswers(h_el=h_el, h_pl=h_pl, m_allow=m_allow, k_req=k_req, s_req=s_req,
                          Ub_Rp=Ub_Rp, h_check=h_check, h_member=h_member,
                          hp_check=hp_check)


def _untried_plastic(c: Chain) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """:func:`_plastic_height`'s results in a run of the outcome stage
    (``Drop.outcomes_only``): no plastic height (NaN), no check that sets it (−1), and
    the largest brittle utilisation at R_p as :func:`_plastic_height` takes it (a
    maximum over the brittle checks, no search)."""
    ub = c[Checks].Ub_at_Rp
    Ub_Rp = ub[0]
    for u in ub[1:]:
        Ub_Rp = np.maximum(Ub_Rp, u)
    n = c.drop.n
    return np.full(n, np.nan), np.full(n, -1, dtype=np.int64), Ub_Rp


def _elastic_height(c: Chain, eta: np.ndarray, Fa_pos: np.ndarray,
                    kern: TwoForceKernel | None) -> np.ndarray:
    """The elastic allowable free fall (m): Gere Eq. 9-94 solved for h at the allowed
    force ``Fa_pos`` (N, NaN none) with the framing's energy share ``eta``, with the
    crushing work of a layer or of the deck's concrete, less the hoist's head; then
    confirmed by the forward run where amplified, or searched where two forces."""
    d, inp, imp = c.drop, c[LoadInputs], c[Impact]
    W, F_c, s_c, crushable = inp.W, inp.F_c, inp.s_c, inp.crushable
    F_allow = c[Checks].F_allow
    h_el = limits.allowable_drop_height_elastic(W, Fa_pos, imp.d_st, eta)
    h_el = with_crush_energy(h_el, crushable & (F_c <= F_allow), F_c, s_c, W, eta)
    # bare deck whose concrete crushes below the allowed force: the force stays at
    # F_crush while the concrete crushes and passes F_crush only once the crushing has
    # gone through the cover (impact step, crushing_limited_impact): the height at
    # which the force then reaches F_allow takes the crushing work (F_crush − W)·cover
    cover = crush_depth_available(c)  # as the impact step's depth
    # (the crushing bounds the contact force: F_crush against the allowed force at
    # the contact, F_allow·F_contact/F)
    h_el = with_crush_energy(h_el, ~crushable & (imp.F_crush < F_allow * imp.deck_ratio),
                             imp.F_crush, np.full(d.n, cover), W, eta)
    # the energy heights above as free falls: less the hoist's lowering speed head
    h_el = fall_from_energy(c, h_el)
    if d.fm.settings.dynamic_amplification and not d.trial:
        h_b = confirm_amplified_height(c, h_el)
        h_el = _history_height(c, h_el, h_b)
    elif kern is not None:
        h_el = two_force_elastic_height(c, h_el, kern)
    return h_el


def _plastic_height(c: Chain, eta: np.ndarray, h_el: np.ndarray,
                    kern: TwoForceKernel | None) -> tuple[np.ndarray, ...]:
    """The allowable free fall beyond yield (m): the energy balance at the ductility
    and rotation limits (the slab's rotation where its mechanism forms first), with
    a crushing layer's work, the brittle checks at R_p, and A_δ² of the amplification;
    searched by the forward run where two forces (:func:`_two_force_plastic`); at
    least ``h_el``. Returns h_pl, the check that sets it (−1 where ``h_el``) and the
    largest brittle utilisation at R_p."""
    inp, comp, ck = c[LoadInputs], c[Compliance], c[Checks]
    by, sr, ua = c[BeyondYield], c[SlabResistance], c[Demands].actions
    s = c.drop.fm.settings
    W, F_c, s_c, crushable = inp.W, inp.F_c, inp.s_c, inp.crushable
    F_allow, R_p, f_s, f = ck.F_allow, by.R_p, comp.f_s, comp.f
    # plastic: ductility and rotation limits, brittle checks at R_p
    Ub_Rp = ck.Ub_at_Rp[0]
    for u in ck.Ub_at_Rp[1:]:
        Ub_Rp = np.maximum(Ub_Rp, u)
    with np.errstate(divide="ignore", invalid="ignore"):
        d_rot = np.tan(s.rotation_limit) * np.where(
            ua.rp_cond == COND_NAMES.index("cantilever"), ua.rp_arm, ua.rp_arm)
        d_lim_s = np.minimum(s.ductility_limit * R_p * f_s, d_rot)
        mu_tot = (d_lim_s + R_p * comp.f_series) / (R_p * f)
        # the slab's mechanism first: its plastic deflection up to the slab's rotation
        # limit about the nearest support line (as beyond_yield checks it)
        d_slab = np.tan(slab_rotation_limit(s.rotation_limit)) * sr.ell
        mu_tot = np.where(sr.slab_first, (R_p * f + d_slab) / (R_p * f), mu_tot)
    h_pl = plastic.allowable_height_plastic(W, eta, R_p, R_p * f, mu_tot)
    # (the layer's work where the framing stays below R_p while it crushes)
    h_pl = with_crush_energy(h_pl, crushable & (c.once(crushing_peak) < R_p), F_c, s_c, W, eta)
    # the drop height that gives the structure that energy after amplification (A_δ²)
    # (the bounds' factor, which lie above the history; at the points the forward run
    # put through their own time history, the history's, as beyond_yield takes it)
    da = c[DynamicAmplification]
    A_D = da.A_deflection if da.A_deflection_bound is None else da.A_deflection_bound
    if LIMIT_POINT_HISTORY and da.th is not None:
        A_D = np.where(da.th, da.A_deflection, A_D)
    h_pl = fall_from_energy(c, h_pl / A_D ** 2)
    # beyond yield only where the mechanism forms before a member without hinge
    # capacity reaches its flexural resistance
    h_pl = np.where((Ub_Rp <= 1.0) & (F_allow > 0) & (by.nh_fa > R_p), h_pl, np.nan)
    if kern is not None:
        # (a crushable layer's points keep the closed form: beyond yield the layer's
        # work comes off the one-mass balance, η = 1, as beyond_yield has it)
        two_pl = c[Impact].two_mass
        assert two_pl is not None
        h_pad = np.where(two_pl, np.nan, h_pl)
        h_pl = _two_force_plastic(c, eta, np.where(two_pl, h_pl, np.nan), h_el, kern)
        h_pl = np.where(two_pl, h_pl, h_pad)
    # what sets the plastic height: the ductility or the rotation limit, or the
    # elastic height where that is larger
    with np.errstate(invalid="ignore"):
        hp_check = np.where(s.ductility_limit * R_p * f_s <= d_rot, CHECK["ductility"],
                            CHECK["rotation"])
    hp_check = np.where(sr.slab_first, CHECK["rotation"], hp_check)
    hp_check = np.where(np.isnan(h_pl) | (h_el >= h_pl), -1, hp_check)
    return np.fmax(h_pl, h_el), hp_check, Ub_Rp


def _two_force_plastic(c: Chain, eta: np.ndarray, h_pl: np.ndarray, h_el: np.ndarray,
                       kern: TwoForceKernel) -> np.ndarray:
    """Two forces: the framing's energy share changes with the height; the energy
    the closed form allows, η·h (η of the planned height), is matched by the forward
    impact's η_frame(h)·h_e(h), non-decreasing in h (two_forces):
    :func:`two_force_height` (m)."""
    imp = c[Impact]
    E_lim = eta * energy_fall(c, h_pl)
    E_k = E_lim[kern.idx]

    def within(kn: TwoForceKernel, rows: np.ndarray, hx: np.ndarray) -> np.ndarray:
        e = kn.forces(hx, rows)[2]
        with np.errstate(divide="ignore", invalid="ignore"):
            return e * energy_fall(c, hx) / E_k[rows] - (1.0 + 1e-12)

    # where the energy at the elastic allowable height already passes the limit,
    # the plastic boundary lies below it and the answer is the elastic height
    # (h_pl = max(h_pl, h_el) below): no search there
    assert imp.two_mass is not None
    ask = imp.two_mass & np.isfinite(h_pl) & np.isfinite(h_el) & (h_el > 0.0)
    if ask.any():
        ia = np.flatnonzero(ask)
        below = within(kern, np.searchsorted(kern.idx, ia), h_el[ia]) > 0.0
        h_pl[ia[below]] = h_el[ia[below]]
        skip = np.zeros(c.drop.n, dtype=bool)
        skip[ia[below]] = True
        return np.where(skip, h_pl, two_force_height(c, np.where(skip, np.nan, h_pl),
                                                     within, kern))
    return two_force_height(c, h_pl, within, kern)


def _allowable_mass_of(c: Chain, Fa_pos: np.ndarray,
                       kern: TwoForceKernel | None) -> np.ndarray:
    """The allowable mass (kg) at the planned fall (with the hoist's head): Gere Eq.
    9-94 solved for M (:func:`droprig.solver.limits.allowable_mass`), through the
    deck's crushing where it caps the force, searched where two forces, and through
    a crushable layer where one lies (η = 1 under a layer)."""
    inp, comp, sm, imp = c[LoadInputs], c[Compliance], c[StruckMass], c[Impact]
    F_c, s_c, crushable, f = inp.F_c, inp.s_c, inp.crushable, comp.f
    F_allow = c[Checks].F_allow
    cover = crush_depth_available(c)
    h_e = energy_fall(c, inp.h)
    m_allow = limits.allowable_mass(Fa_pos, h_e, f, sm.m_e)
    capped = ~crushable & (imp.F_crush < F_allow) & np.isfinite(m_allow)
    if capped.any():
        m_allow[capped] = _mass_through_crushing(
            Fa_pos[capped], h_e[capped], f[capped], sm.m_e[capped], imp.F_crush[capped],
            cover, m_allow[capped])
    if crushable.any():
        # through the crushable layer that lies there (η = 1 under a layer; the
        # one-mass balance, the search's start where the layer bottoms out)
        m_allow[crushable] = limits.allowable_mass_crushable(
            Fa_pos[crushable], h_e[crushable], comp.f_struct[crushable], F_c[crushable],
            s_c[crushable])
    if kern is not None:
        m_allow = two_force_mass(c, kern, m_allow, inp.h)
    return m_allow


def _mat_answers(c: Chain, Fa_pos: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """A mat laid on the finished surface over the point: the fall is the datum height
    H, and the framing's mass share is not taken (η = 1, as the forward model does
    under protection): the required mat stiffness (N/m; inf where the structure alone
    suffices) and crush stroke (m), Gere Eq. 9-94 (:mod:`droprig.solver.limits`)."""
    inp, comp = c[LoadInputs], c[Compliance]
    H_e = energy_fall(c, inp.H)
    k_req = limits.required_mat_stiffness(inp.W, H_e, 1.0, Fa_pos, comp.f_struct)
    k_req = np.where(np.isnan(Fa_pos), np.nan, k_req)
    s_req = limits.required_crush_stroke(inp.W, H_e, 1.0, Fa_pos, comp.f_struct)
    return k_req, np.where(np.isfinite(s_req), s_req, np.nan)


def _height_check(c: Chain) -> tuple[np.ndarray, np.ndarray]:
    """The check (index into CHECKS) and member that set the allowable height: the
    least allowed force of the check families."""
    chk = c[Demands].checks
    names = list(chk)
    Fa_stack = np.stack([chk[k].F_allow for k in names])
    ai = np.argmin(np.where(np.isnan(Fa_stack), np.inf, Fa_stack), axis=0)
    h_check = np.array([CHECK[k] for k in names])[ai]
    h_member = np.stack([chk[k].member for k in names])[ai, np.arange(c.drop.n)]
    return h_check, h_member


_CONFIRM_ROUNDS = 12


def two_force_utilisation_at(c: Chain, h: np.ndarray,
                             sel: np.ndarray | None = None) -> np.ndarray:
    """Largest elastic U of every check family at the free falls ``h`` (m) with the
    impact's two forces there (:func:`impact_at`; non-decreasing in h): the framing
    families at the force on the framing, the deck's at its own force (step 5's
    families are linear in F; the deck's were scaled to the planned height's ratio
    F_deck/F, undone here);
    ``sel``: only these points are read (:func:`impact_at`)."""
    imp0 = c[Impact]
    imp = impact_at(c, h, sel)
    A0 = imp0.deck_ratio
    F_deck = imp.deck
    U = np.zeros(c.drop.n)
    for name, chk in c[Demands].checks.items():
        Fx = F_deck / A0 if name in CONTACT_CHECKS else imp.F
        with np.errstate(invalid="ignore"):
            U = np.fmax(U, chk.U_at(Fx))
    return U


BISECTIONS = 52
"""Rounds at most of :func:`two_force_height` after the bracket (the bracket halves
in √h at least every fourth round; :func:`_close_bracket` for the count)."""
H_TOL = 1e-3
"""Width of :func:`two_force_height`'s final bracket, as a share of the height (the
answer lies within it below the exact boundary)."""
H_SEARCH_MAX = 1000.0
"""Largest allowable free fall :func:`two_force_height` looks for, m."""
EXCESS_ROWS = 8192
"""Rows of :func:`two_force_height`'s forward runs taken at a time (memory: some 40
temporaries a row; the rows are independent, so the answers do not depend on it)."""


class TwoForceKernel:
    """The impact step's forces at the points with two forces (``Impact.two_mass``)
    for any drop height: the fast kernel of the allowable-height searches
    (:func:`two_force_height`). Everything that does not depend on the height — the
    points' weights, compliances, struck masses, the crushing bound and the
    envelope's cell in μ and κ (:class:`droprig.solver.struck_mass.EnvelopeLookup`)
    — is gathered once; :meth:`forces` then does the height's arithmetic alone, the
    same formulas as :func:`impact_at` on those points (one-mass Gere §9.10 Eq. 9-94,
    crushing-limited impact, the envelope over lower drops, the caps of
    :func:`two_forces`). :func:`impact_at` is its plain reference (compared at 1e-12
    in tests/solver/test_two_force_kernel.py). ``idx``: the chain's points it holds.
    SI units."""

    def __init__(self, c: Chain, idx: np.ndarray) -> None:
        inp, comp, sm, imp = c[LoadInputs], c[Compliance], c[StruckMass], c[Impact]
        assert sm.m2 is not None
        self.idx = idx
        self.head = hoist_head(c.drop.v_hoist)
        self.W = inp.W[idx]
        self.f = comp.f[idx]
        self.eta = sm.eta[idx]
        self.F_crush = imp.F_crush[idx]
        self.depth = crush_depth_available(c)  # as the impact step's (the deck's)
        # the one-mass force's cap and its depth (the deck's crushing or the web's
        # local yielding, as the impact step's)
        self.F_cap, self.cap_depth = imp.F_cap[idx], imp.cap_depth[idx]
        self.soft = inp.f_load[idx] > 0.0
        self.m_e = sm.m_e[idx]
        self.f_series, self.f_s, self.m2 = comp.f_series[idx], comp.f_s[idx], sm.m2[idx]
        self.env = struck_mass_mod.EnvelopeLookup(self.W, self.f_series, self.f_s, self.m2)
        # a tilted landing: the contact force at least the edges' energy bound
        # (tilted_far_edge), the edges the base's width across the strip apart
        self.b_edges = (np.maximum(inp.fl, inp.fw)[idx] if c.drop.landing == "tilted"
                        else None)
        self.tilt = landing_tilt(c.drop)
        # the points on a crushable layer (after_bottoming where it bottoms out)
        self.pad = pad_two_mass(c)[idx]
        self.F_c, self.s_c = inp.F_c[idx], inp.s_c[idx]
        # per kernel row, bottoming_floor at the row's own load, where worked out
        # (_have): it reads no height, so a height search works it out once a row
        self._floor = np.zeros(idx.size)
        self._have = np.zeros(idx.size, dtype=bool)

    def bottoming_fall(self) -> np.ndarray:
        """Per kernel row, the free fall (m) at which a crushable layer's crush depth
        reaches its stroke (:func:`droprig.solver.impact.crush_depth` = s_c solved
        for h: η·W·h_e = s_c·(F_c − W) − W·F_c·f + F_c²·f/2, h = h_e less the hoist's
        head): there the force jumps from F_c to the stage after bottoming
        (:meth:`_on_pads`), so a search's boundary often lies on it; NaN off a layer,
        where F_c ≤ W or at no positive fall. A trial height for the searches only:
        their answers rest on the forward runs, not on it."""
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            he = (self.s_c * (self.F_c - self.W) - self.W * self.F_c * self.f
                  + 0.5 * self.F_c**2 * self.f) / (self.eta * self.W)
        h = he - self.head
        return np.where(self.pad & (self.F_c > self.W) & np.isfinite(h) & (h > 0.0), h,
                        np.nan)

    def bottoming_mass(self, h: np.ndarray) -> np.ndarray:
        """Per kernel row, the load mass (kg) that bottoms out a crushable layer from
        the free falls ``h`` (m): :meth:`bottoming_fall`'s balance with W = M·g and
        η = M/(M + m_e) (as :meth:`forces_at_mass`), a quadratic in M:
        M²·(g·h_e + A) + M·(m_e·A − B) − m_e·B = 0 with A = g·(s_c + F_c·f),
        B = s_c·F_c + F_c²·f/2; its positive root. NaN off a layer or where that
        load is not lighter than F_c/g. A trial mass for the search only."""
        he = h + self.head if self.head > 0.0 else h
        g = impact_mod.G
        # (off a layer F_c may be infinite: those rows are NaN below)
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            A = g * (self.s_c + self.F_c * self.f)
            B = self.s_c * self.F_c + 0.5 * self.F_c**2 * self.f
            a2 = g * he + A
            b1 = self.m_e * A - B
            M = (-b1 + np.sqrt(b1**2 + 4.0 * a2 * self.m_e * B)) / (2.0 * a2)
        return np.where(self.pad & np.isfinite(M) & (M > 0.0) & (M * g < self.F_c), M,
                        np.nan)

    def forces(self, h: np.ndarray, rows: np.ndarray | None = None,
               need_eta: bool = True) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """At the free falls ``h`` (m) of the kernel's points ``rows`` (all where
        None): the force on the framing F (N), the deck's force F_deck (N) and the
        framing's energy share η_frame, as :func:`impact_at` gives them (``need_eta``
        False: the one-mass η in its place, not worked out)."""
        r = slice(None) if rows is None else rows
        W, eta = self.W[r], self.eta[r]
        he = h + self.head if self.head > 0.0 else h
        he = np.broadcast_to(np.asarray(he, float), W.shape)
        p = self.pad[r]
        if not p.any():
            out = self._bare(he, r, rows, need_eta)
        else:
            # the rows on a crushable layer are the layer's alone (_on_pads): the
            # bare deck's two forces only at the others
            Ff, F_deck, eta_f = np.empty(W.shape), np.empty(W.shape), eta.copy()
            q = ~p
            if q.any():
                sub = np.arange(self.W.size)[r][q]
                Ff[q], F_deck[q], eta_f[q] = self._bare(he[q], sub, sub, need_eta)
            out = (Ff, F_deck, eta_f)
        return self._on_pads(out, r, W, he, eta)

    def _bare(self, he: np.ndarray, r: slice | np.ndarray, rows: np.ndarray | None,
              need_eta: bool) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """:meth:`forces` at kernel rows ``r`` off any crushable layer (``rows``: the
        same as indices, or None for all), at the energy heights ``he`` (m): the
        one-mass force capped by crushing and the two-mass envelope's caps."""
        W, f, eta, F_crush = self.W[r], self.f[r], self.eta[r], self.F_crush[r]
        F_cap = self.F_cap[r]
        # Gere Eq. 9-94 as impact_mod.dynamic_factor (W·f > 0 at every point here)
        e = eta * he
        ratio = np.where(e <= 0.0, 0.0, 2.0 * e / (W * f))
        F_el = (1.0 + np.sqrt(1.0 + ratio)) * W
        F1 = crush_capped(W, he, f, eta, F_cap, F_el, self.cap_depth[r])
        F1d = self._deck_force(W, he, f, eta, F_crush, F_cap, F_el, F1)
        Fc2, Ff2 = self.env.at(he, rows)
        Fc2 = self._with_edges(Fc2, W, he, r)
        return self._caps(W, he, f, eta, F_crush, F1, Fc2, Ff2, self.soft[r], need_eta,
                          F_cap, F1d)

    def forces_at_mass(self, h: np.ndarray, M: np.ndarray, rows: np.ndarray,
                       need_eta: bool = True) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """:meth:`forces` for loads of mass ``M`` (kg) in place of the points' own
        (the same underside, footprint and struck masses; η = M/(M + m_e), the
        envelope through :func:`droprig.solver.struck_mass.envelope_two_forces`)."""
        W = M * impact_mod.G
        eta = impact_mod.mass_efficiency(M, self.m_e[rows])
        he = h + self.head if self.head > 0.0 else h
        W, eta, he = np.broadcast_arrays(W, eta, np.asarray(he, float))
        # the rows on a crushable layer are the layer's alone (_on_pads)
        q = ~self.pad[rows]
        Ff, F_deck, eta_f = np.empty(W.shape), np.empty(W.shape), eta.copy()
        if q.any():
            sub = rows[q]
            Wq, eq, hq = W[q], eta[q], he[q]
            f, F_crush, F_cap = self.f[sub], self.F_crush[sub], self.F_cap[sub]
            _, F_el, _ = impact_mod.impact_elastic(Wq, hq, f, eq)
            F1 = crush_capped(Wq, hq, f, eq, F_cap, F_el, self.cap_depth[sub])
            F1d = self._deck_force(Wq, hq, f, eq, F_crush, F_cap, F_el, F1)
            Fc2, Ff2 = struck_mass_mod.envelope_two_forces(Wq, hq, self.f_series[sub],
                                                           self.f_s[sub], self.m2[sub])
            Fc2 = self._with_edges(Fc2, Wq, hq, sub)
            Ff[q], F_deck[q], eta_f[q] = self._caps(Wq, hq, f, eq, F_crush, F1, Fc2, Ff2,
                                                    self.soft[sub], need_eta, F_cap, F1d)
        return self._on_pads((Ff, F_deck, eta_f), rows, W, he, eta, mass=True)

    def _on_pads(self, out: tuple[np.ndarray, np.ndarray, np.ndarray],
                 r: slice | np.ndarray, W: np.ndarray, he: np.ndarray, eta: np.ndarray,
                 mass: bool = False) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """``out`` (F, F_deck, η_frame) with the rows on a crushable layer replaced by
        the impact step's forces there: the layer's energy balance
        (:func:`droprig.solver.impact.impact_crushable`, η as the step's) and, where
        it bottoms out, :func:`after_bottoming` (the framing's share η)."""
        p = self.pad[r]
        if not p.any():
            return out
        # (the callers' arrays are their own, made for this call: written in place)
        Ff, F_deck, eta_f = out
        # the kernel rows on a layer, each array gathered once
        ip = np.flatnonzero(p) if isinstance(r, slice) else r[p]
        Wp, hp, ep = W[p], he[p], eta[p]
        f, F_c, s_c = self.f[ip], self.F_c[ip], self.s_c[ip]
        F, dep, bot = impact_mod.impact_crushable(Wp, hp, f, ep, F_c, s_c)
        Fd = F.copy()
        crushing = ~bot & (dep > 0.0)
        if crushing.any():
            # as two_forces: the framing under the crushing layer
            ic = ip[crushing]
            F[crushing] = framing_while_crushing(
                Wp[crushing], hp[crushing], F_c[crushing],
                self.f_series[ic], self.f_s[ic], self.m2[ic])
        if bot.any():
            ib = ip[bot]
            env = (None if mass else
                   lambda hr: self.env.at(hr, ib))
            ab = after_bottoming(Wp[bot], hp[bot], F_c[bot], s_c[bot], f[bot],
                                 self.f_series[ib], self.f_s[ib], self.m2[ib],
                                 self.F_crush[ib], self.depth, env)
            if mass:
                floor = bottoming_floor(Wp[bot], F_c[bot], s_c[bot], f[bot], ep[bot],
                                        self.f_series[ib], self.f_s[ib], self.m2[ib])
            else:
                floor = self._own_bottoming_floor(ib)
            F[bot] = np.maximum(ab.F_frame, floor)
            Fd[bot] = np.where(self.soft[ib], ab.F_contact, ab.F_one)
        Ff[p], F_deck[p], eta_f[p] = F, Fd, ep
        return Ff, F_deck, eta_f

    def _own_bottoming_floor(self, rows: np.ndarray) -> np.ndarray:
        """:func:`bottoming_floor` (N) at the kernel ``rows`` with their own loads (W,
        η of :meth:`forces`): the same function of the same per-row inputs, worked out
        once a row and remembered (a height search asks for it at every round)."""
        fresh = ~self._have[rows]
        if fresh.any():
            u = np.unique(rows[fresh])
            self._floor[u] = bottoming_floor(self.W[u], self.F_c[u], self.s_c[u], self.f[u],
                                             self.eta[u], self.f_series[u], self.f_s[u],
                                             self.m2[u])
            self._have[u] = True
        return self._floor[rows]

    def _with_edges(self, Fc2: np.ndarray, W: np.ndarray, he: np.ndarray,
                    r: slice | np.ndarray) -> np.ndarray:
        """The contact force ``Fc2`` (N) of the kernel rows ``r`` at least the edges'
        energy bound where the load lands tilted (:func:`tilted_far_edge`'s, on the
        kernel's own copies; ``Fc2`` itself for a flat landing)."""
        if self.b_edges is None:
            return Fc2
        return np.maximum(Fc2, footprint_mod.tilted_contact_bound(
            W, he, self.f_series[r], self.f_s[r], self.b_edges[r], self.tilt))

    def _deck_force(self, W: np.ndarray, he: np.ndarray, f: np.ndarray, eta: np.ndarray,
                    F_crush: np.ndarray, F_cap: np.ndarray, F_el: np.ndarray,
                    F1: np.ndarray) -> np.ndarray:
        """The one-mass force the deck's checks take (N), as the impact step's
        (:func:`deck_one_mass`, over the deck's crushing depth)."""
        return deck_one_mass(W, he, f, eta, F_crush, F_cap, F_el, F1, self.depth)

    @staticmethod
    def _caps(W: np.ndarray, he: np.ndarray, f: np.ndarray, eta: np.ndarray,
              F_crush: np.ndarray, F1: np.ndarray, Fc2: np.ndarray, Ff2: np.ndarray,
              soft: np.ndarray, need_eta: bool = True, F_cap: np.ndarray | None = None,
              F1_deck: np.ndarray | None = None
              ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """The caps of :func:`two_forces` on the envelope's forces (N); ``F_cap`` the
        impact's bound on the force into the framing (``F_crush`` where None),
        ``F1_deck`` the one-mass force of the deck's checks (``F1`` where None)."""
        through = np.maximum(F_crush, F1)
        Fc = np.where(Fc2 > F_crush, through, Fc2)
        Ff = np.minimum(Ff2, 2.0 * (through if F_cap is None else np.maximum(F_cap, F1)))
        ok = np.isfinite(F1)
        Ff = np.where(ok, Ff, F1)
        F_deck = np.where(ok & soft, Fc, F1 if F1_deck is None else F1_deck)
        if not need_eta:  # the caller reads the forces alone
            return Ff, F_deck, eta
        eta_f = np.where(ok, struck_mass_mod.equivalent_eta(W, he, f, Ff, eta), eta)
        return Ff, F_deck, eta_f


def two_force_height(c: Chain, h0: np.ndarray,
                     excess_at: Callable[[TwoForceKernel, np.ndarray, np.ndarray],
                                         np.ndarray],
                     kern: TwoForceKernel | None = None,
                     top: float = H_SEARCH_MAX,
                     hint: np.ndarray | None = None) -> np.ndarray:
    """The largest free fall (m) at which the forward two-force chain passes, per
    point with two forces (others keep ``h0``): ``excess_at(kern, rows, h)`` is the
    forward run's excess at the falls ``h`` of the kernel's points ``rows``
    (:class:`TwoForceKernel`, the impact step at those points): ≤ 0 where it passes,
    non-decreasing in h (the forces are the monotone envelope of :func:`two_forces`).
    So the pass/fail boundary is one height, and it is found exactly: from ``h0``
    (the closed form with the planned height's energy share,
    :func:`droprig.solver.struck_mass.equivalent_eta`) and its excess r0, the heights
    h0/(1 + r0)² × (1 ± H_TOL/3) (exact where the excess grows as √h, a force by
    Gere §9.10; across the boundary from h0 where it grows as h^p, ½ ≤ p ≤ 1); the
    passes come first, and the last pass and the first failure bracket the boundary
    (beyond these the bracket goes on out by ×4 or ÷4). Then
    each round runs two heights per point about an estimate of the boundary — first
    ``hint`` (per point, NaN none: a height where the excess jumps, a pad's
    bottoming) where it lies in the bracket, then a Newton step on the local power
    law of the last pair (the excess grows as h^p with p from 0.1 to 2.4 on the
    demos, not as √h alone), else the power law through the bracket's ends — with a
    step of :data:`STEP`·:data:`H_TOL` to either side, so that a good estimate closes
    the bracket in one round; bisections keep the round count bounded
    (:func:`_close_bracket`). The bracket always holds a passing and a failing height
    and ends within :data:`H_TOL` of the height (at most :data:`BISECTIONS` rounds):
    the estimates set how many rounds it takes, not where the answer may lie. The
    lower end — a height the forward run passed — is returned. NaN where even a
    zero fall fails; ``top`` (:data:`H_SEARCH_MAX`) where that passes. The same
    search serves any variable the excess grows with as a power (the allowable mass,
    :func:`two_force_mass`, with its own ``top``)."""
    two = c[Impact].searched
    if two is None or not two.any():
        return h0
    live_all = two & np.isfinite(h0)
    if not live_all.any():
        return h0
    idx = np.flatnonzero(live_all)
    if kern is None:
        kern = TwoForceKernel(c, idx)
    kidx = np.searchsorted(kern.idx, idx)
    assert np.array_equal(kern.idx[kidx], idx), "the kernel does not hold every point"

    def run(w: np.ndarray, trial: np.ndarray) -> np.ndarray:
        # the forward run's excess at the points w (of idx) at the heights trial (one
        # per point, or a row of several per point); NaN as a failure (+inf). Each
        # row's excess is its own (row by row arithmetic): taken EXCESS_ROWS rows at a
        # time, so that a large block's temporaries stay small
        k = trial.shape[1] if trial.ndim == 2 else 1
        rows = np.repeat(kidx[w], k)
        t = trial.ravel()
        r = np.concatenate([np.asarray(excess_at(kern, rows[s:s + EXCESS_ROWS],
                                                 t[s:s + EXCESS_ROWS]), dtype=float)
                            for s in range(0, rows.size, EXCESS_ROWS)]) \
            if rows.size > EXCESS_ROWS else np.asarray(excess_at(kern, rows, t), dtype=float)
        return np.where(np.isnan(r), np.inf, r).reshape(trial.shape)

    h = h0.copy()
    h[idx] = search_boundary(run, h0[idx], top, None if hint is None else hint[idx])
    return h


def search_boundary(run: Callable[[np.ndarray, np.ndarray], np.ndarray],
                    start: np.ndarray, top: float,
                    hint: np.ndarray | None = None) -> np.ndarray:
    """:func:`two_force_height`'s search on its own: per point, the highest variable
    (a height, m, or a mass, kg) at which ``run(w, trial)`` — the excess of the
    points ``w`` at ``trial`` (one per point, or a row of several per point; +inf
    for a failure), non-decreasing — is ≤ 0, within :data:`H_TOL` below the
    boundary; from ``start`` (the closed form), up to ``top``; ``hint``: a trial
    per point where the excess may jump (NaN none). NaN where even 0 fails."""
    br = _first_bracket(run, _clip(start, 1e-6 * min(top, 1.0), top), top)
    unbounded, none = _widen_bracket(run, br, top)
    br.hint = hint
    _close_bracket(run, br, ~unbounded & ~none)
    return np.where(none, np.nan, br.lo)


def _clip(a: np.ndarray, lo: np.ndarray | float, hi: np.ndarray | float) -> np.ndarray:
    """``np.clip(a, lo, hi)`` (the same values, NaN kept) without its call cost: the
    searches call it on a few rows many times."""
    return np.minimum(np.maximum(a, lo), hi)


_Excess = Callable[[np.ndarray, np.ndarray], np.ndarray]
"""The forward run's excess at points ``w`` (of the search's) at trial heights (one
per point, or a row of several per point); +inf for a failure that gave NaN."""


class _Bracket:
    """The search's bracket per point (mutable, updated in place by the rounds): the
    highest passing height ``lo`` and the lowest failing one ``hi`` (m; 0 for none
    yet) with their excesses ``r_lo``, ``r_hi`` (NaN none), and ``n_ok``: how many
    heights of the first fan passed (``nf`` tried)."""

    def __init__(self, lo: np.ndarray, hi: np.ndarray, r_lo: np.ndarray, r_hi: np.ndarray,
                 n_ok: np.ndarray, nf: int) -> None:
        self.lo, self.hi, self.r_lo, self.r_hi = lo, hi, r_lo, r_hi
        self.n_ok, self.nf = n_ok, nf
        # the last pair of trials per point and their excesses (NaN: none)
        self.pair = np.full((lo.size, 2), np.nan)
        self.r_pair = np.full((lo.size, 2), np.nan)
        # a height per point where the excess may jump, tried first (NaN: none)
        self.hint: np.ndarray | None = None

    def take(self, w: np.ndarray, trial: np.ndarray, r: np.ndarray) -> np.ndarray:
        """One trial height per point ``w``: a pass raises ``lo``, a failure lowers
        ``hi``; returns the passes."""
        okw = r <= 0.0
        self.lo[w[okw]], self.r_lo[w[okw]] = trial[okw], r[okw]
        self.hi[w[~okw]], self.r_hi[w[~okw]] = trial[~okw], r[~okw]
        return okw


def _first_bracket(run: _Excess, start: np.ndarray, top: float) -> _Bracket:
    """The first fan: the start ``start`` (m) and its excess r0, and the pair
    H_TOL/3 either side of start/(1 + r0)². The excess is a ratio less one that
    grows as h^p, p between ½ (a force, Gere §9.10) and 1 (an energy): start/(1 + r0)²
    lies across the boundary from the start, and on it where p = ½; the pair then
    closes the bracket. The passes come first (non-decreasing excess)."""
    m = start.size
    everyone = np.arange(m)
    r0 = run(everyone, start)
    with np.errstate(divide="ignore", invalid="ignore"):
        U0 = np.where(np.isfinite(r0) & (r0 > -1.0), 1.0 + r0, np.where(r0 > 0, 16.0, 1 / 16))
    h1 = _clip(start / U0**2, start / 16.0, np.minimum(16.0 * start, top))
    pair = np.minimum(np.stack([h1 * (1.0 - H_TOL / 3.0), h1 * (1.0 + H_TOL / 3.0)], axis=1),
                      top)
    fan = np.sort(np.concatenate([start[:, None], pair], axis=1), axis=1)
    rp = run(everyone, pair)
    rf = np.take_along_axis(np.concatenate([r0[:, None], rp], axis=1),
                            np.argsort(np.concatenate([start[:, None], pair], axis=1),
                                       axis=1), axis=1)
    n_ok = (rf <= 0.0).sum(axis=1)  # non-decreasing: the passes come first
    nf = fan.shape[1]
    ar = np.arange(m)
    i_lo, i_hi = np.maximum(n_ok - 1, 0), np.minimum(n_ok, nf - 1)
    br = _Bracket(lo=np.where(n_ok > 0, fan[ar, i_lo], 0.0),
                  hi=np.where(n_ok < nf, fan[ar, i_hi], 0.0),
                  r_lo=np.where(n_ok > 0, rf[ar, i_lo], np.nan),
                  r_hi=np.where(n_ok < nf, rf[ar, i_hi], np.nan), n_ok=n_ok, nf=nf)
    br.pair[:], br.r_pair[:] = pair, rp
    return br


def _widen_bracket(run: _Excess, br: _Bracket, top: float) -> tuple[np.ndarray, np.ndarray]:
    """Beyond the fan: up by ×4 from an all-passing fan (to ``top``), down by ÷4 from
    an all-failing one (to ~10⁻²⁰ m, then a zero fall). Returns the points that pass
    at ``top`` and those where even a zero fall fails."""
    up = (br.n_ok == br.nf) & (br.lo < top)
    down = br.n_ok == 0
    # the points going up (at most 12 steps) and those going down (at most 32) are
    # others (nf ≥ 1): both step in one run a round (each row's excess is its own)
    for k in range(32):
        if k == 12:
            up[:] = False
        if not (up.any() or down.any()):
            break
        wu, wd = np.flatnonzero(up), np.flatnonzero(down)
        w = np.concatenate([wu, wd])
        trial = np.concatenate([np.minimum(br.lo[wu] * 4.0, top), br.hi[wd] / 4.0])
        br.pair[w] = np.nan
        okw = br.take(w, trial, run(w, trial))
        up[wu] = okw[:wu.size] & (trial[:wu.size] < top)
        down[wd] = ~okw[wu.size:]
    unbounded = br.hi == 0.0  # passes at top
    none = np.zeros(br.lo.size, dtype=bool)
    if down.any():  # failing down to ~10⁻²⁰ m: does a zero fall pass?
        w = np.flatnonzero(down)
        r = run(w, np.zeros(w.size))
        okw = r <= 0.0
        br.lo[w[okw]], br.r_lo[w[okw]] = 0.0, r[okw]
        none[w[~okw]] = True
    return unbounded, none


def _close_bracket(run: _Excess, br: _Bracket, work: np.ndarray) -> None:
    """Rounds of two heights per point of ``work``, ``x·(1 ± STEP·H_TOL)`` about an
    estimate x of the boundary (:func:`_round_estimate`), so that an estimate within
    STEP·H_TOL closes the bracket in one round; until the bracket is within
    :data:`H_TOL` (at most :data:`BISECTIONS` rounds).

    The bracket is proven at every round: its lower end is a height the forward run
    passed and its upper end one it failed (each trial moves the end on its own
    side, and only inside the bracket), so the answer ``lo`` passes and, the excess
    being non-decreasing, the exact boundary lies in (lo, hi] with
    hi − lo ≤ H_TOL·hi: lo ≥ (1 − H_TOL)·boundary, whatever the estimates were.
    They only set how many rounds it takes. Termination: the third round in a row
    that does not halve the bracket's width in √h is followed by a bisection (the
    mid-point in √h, which halves it); the widths never grow, so the width halves at
    least every :data:`SLOW_ROUNDS` + 1 rounds. From the fan's bracket (ends at most
    ×16 apart, √hi − √lo ≤ 3·√lo) 13 halvings bring hi − lo ≤ 2·√hi·(√hi − √lo)
    below H_TOL·hi: 13 × 4 = 52 = :data:`BISECTIONS` rounds."""
    lo, hi = br.lo, br.hi
    bisect = np.zeros(lo.size, dtype=bool)
    slow = np.zeros(lo.size, dtype=np.int64)
    first = True
    for _ in range(BISECTIONS):
        work = work & (hi - lo > H_TOL * hi)
        if not work.any():
            break
        w = np.flatnonzero(work)
        lw, hw = lo[w], hi[w]
        sl, sh = np.sqrt(lw), np.sqrt(hw)
        mid = (0.5 * (sl + sh)) ** 2
        x = np.where(bisect[w], mid, _round_estimate(br, w, first))
        hinted = (x == br.hint[w]) if first and br.hint is not None else None
        first = False
        d = STEP * H_TOL * x
        pair = np.stack([_clip(x - d, lw, hw), _clip(x + d, lw, hw)], axis=1)
        # strictly inside the bracket (a pair on an end would not move it)
        inside = (pair > lw[:, None]) & (pair < hw[:, None])
        pair = np.sort(np.where(inside, pair, mid[:, None]), axis=1)
        r = run(w, pair)
        br.pair[w], br.r_pair[w] = pair, r
        if hinted is not None:  # a pair across a jump gives no slope
            br.pair[w[hinted]] = np.nan
        width0 = sh - sl
        _take_pair(br, w, pair, r)
        # the SLOW_ROUNDS-th round in a row that did not halve the bracket (in √h)
        # is followed by a bisection
        halved = (np.sqrt(hi[w]) - np.sqrt(lo[w])) <= 0.5 * width0
        slow[w] = np.where(halved | bisect[w], 0, slow[w] + 1)
        bisect[w] = slow[w] >= SLOW_ROUNDS


def _take_pair(br: _Bracket, w: np.ndarray, pair: np.ndarray, r: np.ndarray) -> None:
    """The highest passing and the lowest failing trial of each point's ``pair``
    (sorted; the passes come first, the excess being non-decreasing) become the
    bracket's ends."""
    okp = r <= 0.0
    n_okp = okp.sum(axis=1)
    got = n_okp > 0
    j = np.maximum(n_okp - 1, 0)
    br.lo[w[got]] = pair[got, j[got]]
    br.r_lo[w[got]] = r[got, j[got]]
    upper = n_okp < 2
    jt = np.minimum(n_okp, 1)
    br.hi[w[upper]] = pair[upper, jt[upper]]
    br.r_hi[w[upper]] = r[upper, jt[upper]]


SLOW_ROUNDS = 3
"""Rounds in a row without halving the bracket after which :func:`_close_bracket`
bisects."""
STEP = 0.45
"""Half-spacing of :func:`_close_bracket`'s pair of trials, as a share of
:data:`H_TOL` (below ½: a pair that straddles the boundary closes the bracket)."""


def _round_estimate(br: _Bracket, w: np.ndarray, first: bool) -> np.ndarray:
    """The estimate of the boundary (m) for a round at the points ``w``: in the first
    round a jump height of the excess (``br.hint``, a pad's bottoming) where it lies
    inside the bracket; else the Newton step on the last pair's local power law
    (:func:`_local_power_root`) where it lands inside the bracket and the pair's
    excesses differ; else the power law through the bracket's ends
    (:func:`_power_law_root`); the mid-point in √h where the last pair's excesses were
    equal (a step of the excess: a jump lies between the ends)."""
    lw, hw = br.lo[w], br.hi[w]
    x = _power_law_root(lw, hw, br.r_lo[w], br.r_hi[w])
    xn = _local_power_root(br.pair[w], br.r_pair[w])
    x = np.where((xn > lw) & (xn < hw), xn, x)
    flat = br.r_pair[w, 0] == br.r_pair[w, 1]
    x = np.where(flat, (0.5 * (np.sqrt(lw) + np.sqrt(hw))) ** 2, x)
    if first and br.hint is not None:
        hint = br.hint[w]
        x = np.where((hint > lw) & (hint < hw), hint, x)
    return x


def _local_power_root(pair: np.ndarray, r_pair: np.ndarray) -> np.ndarray:
    """The height (m) where the excess crosses zero, estimated from the last pair of
    trials (two close heights per point, ``pair``, their excesses ``r_pair``): the
    local exponent p = Δln(1 + r)/Δln h between them, and the power law
    1 + r = (h/h*)^p through the pair's mid-point (in logs),
    h* = h_m·(1 + r_m)^(−1/p) (a Newton step on ln(1 + r) in ln h; the measured
    exponents of the demos' excesses run from 0.1 to 2.4). NaN where it cannot be
    drawn (no pair, a pair of one height, an excess unknown or ≤ −1, p ≤ 0)."""
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        g = np.log1p(r_pair)
        lh = np.log(pair)
        p = (g[:, 1] - g[:, 0]) / (lh[:, 1] - lh[:, 0])
        lm, gm = 0.5 * (lh[:, 0] + lh[:, 1]), 0.5 * (g[:, 0] + g[:, 1])
        x = np.exp(lm - gm / p)
    return np.where(np.isfinite(x) & (p > 0.0), x, np.nan)


def _power_law_root(lo: np.ndarray, hi: np.ndarray, r_lo: np.ndarray,
                    r_hi: np.ndarray) -> np.ndarray:
    """The height (m) where the excess r (a utilisation less one) crosses zero,
    estimated from the bracket's ends ``lo`` (r_lo ≤ 0) and ``hi`` (r_hi > 0): on the
    power law 1 + r = (h/h*)^p through both ends, i.e. false position of ln(1 + r)
    in ln h, h* = lo·(hi/lo)^t with t = −ln(1 + r_lo)/(ln(1 + r_hi) − ln(1 + r_lo))
    (exact for any exponent p). Where that law cannot be drawn (lo = 0, an end's
    excess unknown or ≤ −1), false position of r in √h (the forces grow nearly as
    √h, Gere §9.10), and the mid-point in √h where r is unknown at an end."""
    sl, sh = np.sqrt(lo), np.sqrt(hi)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        t = np.where(np.isfinite(r_lo) & np.isfinite(r_hi) & (r_hi > r_lo),
                     -r_lo / (r_hi - r_lo), 0.5)
        x = (sl + _clip(t, 0.0, 1.0) * (sh - sl)) ** 2
        gl, gh = np.log1p(r_lo), np.log1p(r_hi)
        tp = -gl / (gh - gl)
        law = (lo > 0.0) & np.isfinite(gl) & np.isfinite(gh) & (gh > gl)
        xp = lo * (hi / lo) ** _clip(tp, 0.0, 1.0)
    return np.where(law, xp, x)


MASS_SEARCH_MAX = 1.0e6
"""Largest allowable mass :func:`two_force_mass` looks for, kg."""


def two_force_mass(c: Chain, kern: TwoForceKernel, m0: np.ndarray,
                   h: np.ndarray) -> np.ndarray:
    """The allowable mass at the planned height with two forces per point, kg: the
    heaviest load of the same underside whose framing force and deck force
    (:meth:`TwoForceKernel.forces_at_mass`) keep every check family within its
    allowed force (as :func:`two_force_elastic_height`), found by the search of
    :func:`two_force_height` in the mass (the forces grow with M as a power ½–1:
    F ≈ √(2·M·g·h/f) + M·g, Gere §9.10) from the one-mass closed form's mass ``m0``
    (Gere §9.10 solved for M), within :data:`H_TOL` of it; droprig.solver.confirm
    tries the bay's printed mass on the forward chain. ``h``: the planned free falls
    (m). Others keep ``m0``; NaN where no mass passes."""
    chk = c[Demands].checks
    A0 = c[Impact].deck_ratio
    n = c.drop.n
    Fa_frame = np.full(n, np.inf)
    Fa_deck = np.full(n, np.inf)
    for name, ck in chk.items():
        fa = np.where(np.isnan(ck.F_allow), np.inf, ck.F_allow)
        if name in CONTACT_CHECKS:
            Fa_deck = np.minimum(Fa_deck, fa * A0)
        else:
            Fa_frame = np.minimum(Fa_frame, fa)
    Fa_frame_k, Fa_deck_k, h_k = Fa_frame[kern.idx], Fa_deck[kern.idx], h[kern.idx]

    def excess(kn: TwoForceKernel, rows: np.ndarray, Mx: np.ndarray) -> np.ndarray:
        with np.errstate(divide="ignore", invalid="ignore"):
            F, F_deck, _ = kn.forces_at_mass(h_k[rows], Mx, rows, need_eta=False)
            return np.maximum(F / Fa_frame_k[rows], F_deck / Fa_deck_k[rows]) - 1.0

    start = np.where(np.isfinite(m0) & (m0 > 0.0), m0, np.nan)
    hint = np.full(n, np.nan)
    hint[kern.idx] = kern.bottoming_mass(h_k)
    out = two_force_height(c, start, excess, kern, top=MASS_SEARCH_MAX, hint=hint)
    return np.where(np.isnan(start), m0, out)


def two_force_elastic_height(c: Chain, h_el: np.ndarray,
                             kern: TwoForceKernel | None = None) -> np.ndarray:
    """The elastic allowable free fall with two forces per point, m
    (:func:`two_force_height`): the forward run passes where the force on the
    framing is at most the least allowed force of the framing's families and the
    deck's force at most that of the deck's (each family linear in its force,
    common practice, no source); the answer is then read once more through every
    family's own utilisation (:func:`two_force_utilisation_at`), and lowered by
    10⁻⁹ of itself where the rounding of an allowed force left it a hair over."""
    chk = c[Demands].checks
    n = c.drop.n
    A0 = c[Impact].deck_ratio
    Fa_frame = np.full(n, np.inf)
    Fa_deck = np.full(n, np.inf)
    for name, ck in chk.items():
        fa = np.where(np.isnan(ck.F_allow), np.inf, ck.F_allow)
        if name in CONTACT_CHECKS:
            Fa_deck = np.minimum(Fa_deck, fa * A0)  # on the deck's own force
        else:
            Fa_frame = np.minimum(Fa_frame, fa)

    two = c[Impact].searched
    assert two is not None
    if kern is None:
        kern = TwoForceKernel(c, np.flatnonzero(two))
    Fa_frame_k, Fa_deck_k = Fa_frame[kern.idx], Fa_deck[kern.idx]

    def excess(kn: TwoForceKernel, rows: np.ndarray, hx: np.ndarray) -> np.ndarray:
        F, F_deck, _ = kn.forces(hx, rows, need_eta=False)
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.maximum(F / Fa_frame_k[rows], F_deck / Fa_deck_k[rows]) - 1.0

    # every point is searched from its closed form to the forward run's own
    # boundary: a closed form that already passes is not kept (it would make the
    # answer depend on the planned height through the energy share it starts from:
    # 2.647 against 3.882 m, tests/solver/test_pad_height_independent.py)
    hint = np.full(n, np.nan)
    hint[kern.idx] = kern.bottoming_fall()
    h = two_force_height(c, h_el, excess, kern, hint=hint)
    for _ in range(3):
        live = two & np.isfinite(h) & (h > 0.0)
        if not live.any():
            break
        U = two_force_utilisation_at(c, np.where(live, h, 0.0), live)
        over = live & (U > 1.0 + 1e-9)
        if not over.any():
            break
        h = np.where(over, h * (1.0 - 1e-9), h)
    return h


def amplified_utilisation_at(c: Chain, h: np.ndarray,
                             th: np.ndarray | None = None,
                             rows: np.ndarray | None = None) -> np.ndarray:
    """Largest elastic U of every check family at the free falls ``h`` (m): the
    impact at h (:func:`impact_at`) and the bounds of the amplification at h
    (:func:`amplification_at`) on step 5's energy-method checks (linear in F); ``th``
    (bool per point, None none): these points take their own time history at h
    (:func:`droprig.solver.pointhistory.point_history`, the factor the lesser of it
    and the bounds, as a forward run that runs them; with
    :data:`LIMIT_POINT_HISTORY`). The bounds lie at or above what a forward run at h
    takes (a point's own time history only lowers a factor), so a height they allow
    holds in the forward run whichever points it runs. ``rows`` (indices, ascending;
    without ``th``): work out only these points (every step read is per point,
    :func:`rows_chain`); U is then NaN at the others."""
    if th is not None:
        imp = impact_at(c, h)
        amp = amplification_at(c, h, imp, th_points=np.asarray(th, bool))
        factor, F, ratio = amp.factor, imp.F, imp.deck_ratio
        rows = None
    elif rows is None:
        imp = impact_at(c, h)
        amp = amplification_at(c, h, imp, th_points=np.zeros(c.drop.n, dtype=bool))
        factor, F, ratio = amp.factor, imp.F, imp.deck_ratio
    else:
        sub = rows_chain(c, rows)
        imp = impact_at(sub, h[rows])
        amp = amplification_at(sub, h[rows], imp,
                               th_points=np.zeros(rows.size, dtype=bool))
        n = c.drop.n
        factor = {k: _spread(v, rows, n, 1.0) for k, v in amp.factor.items()}
        F, ratio = _spread(imp.F, rows, n, 0.0), _spread(imp.deck_ratio, rows, n, 1.0)
    # step 5 scaled the deck's families to the planned height's F_deck/F (on_contact);
    # at h the ratio is the impact's at h (as two_force_utilisation_at undoes it):
    # with the planned ratio a random floor's deck flexure read U 1.001 at a fall
    # whose forward run reads 0.770, so no height was found there
    scale = ratio / c[Impact].deck_ratio
    U = _utilisation(_energy_demands(c), factor, F, scale)
    if rows is not None:
        U = _spread(U[rows], rows, c.drop.n, np.nan)
    return U


def _spread(v: np.ndarray, rows: np.ndarray, n: int, fill: float) -> np.ndarray:
    """``v`` (one value per row of ``rows``) at those rows of an array of ``n``, the
    others ``fill``."""
    out = np.full(n, fill)
    out[rows] = v
    return out


def rows_chain(c: Chain, rows: np.ndarray) -> Chain:
    """A chain of the points ``rows`` (indices) of ``c`` alone: its drop at those rows
    and the results of steps 1–4 (:class:`LoadInputs`, :class:`Compliance`,
    :class:`StruckMass`, :class:`Impact`) taken row for row, with the points'
    load-independent quantities kept with the geometry and the height-free quantities
    the impact and the bounds read (:func:`web_contact_bound`,
    :func:`table_amplification`, :func:`bottoming_floors`, :func:`droprig.solver.
    pointhistory.struck_members`). Every quantity these hold is per point, so a
    step worked out on it reads, at each row, what it reads on ``c`` at that point
    (tests/solver/test_rows_chain.py compares them at tolerance 0 on random floors):
    the confirmation of the amplified heights (:func:`confirm_amplified_height`)
    re-runs only the points still over."""
    d = c.drop
    n = d.n

    def pick(a: np.ndarray) -> np.ndarray:
        return np.take(a, rows, axis=0)

    def per_point(v: np.ndarray | None) -> np.ndarray | None:
        return pick(v) if isinstance(v, np.ndarray) and v.ndim > 0 and v.shape[0] == n \
            else v

    geo = take_geo(d.geo, rows, steps=False, actions=False)
    for key in ("struck_member_table", "impulse_units"):
        got = d.geo.cache.get(key)
        if got is not None and all(v.shape[0] == n for v in got.values()):
            geo.cache[key] = {k: pick(v) for k, v in got.items()}
    sub = Chain(replace(d, geo=geo, li=pick(np.asarray(d.li)), H=per_point(d.H),
                        mat_k=per_point(d.mat_k), tip_off=per_point(d.tip_off)))
    for kind in (LoadInputs, Compliance, StruckMass, Impact):
        sub.add(_rows(c[kind], pick, n))
    F_web, depth = c.once(web_contact_bound)
    sub._once[web_contact_bound] = (pick(F_web), pick(depth))
    sub._once[table_amplification] = _rows(c.once(table_amplification), pick, n)
    sub._once[bottoming_floors] = pick(c.once(bottoming_floors))
    struck = c.once(pointhistory.struck_members)
    sub._once[pointhistory.struck_members] = {k: pick(v) for k, v in struck.items()}
    return sub


def _history_height(c: Chain, h_el: np.ndarray, h_b: np.ndarray) -> np.ndarray:
    """The elastic allowable free falls (m) with the bounds' answers ``h_b``, and at
    the points the forward run put through their own time history
    (:attr:`DynamicAmplification.th`) their history's: the closed form ``h_el`` (at
    those points already on the history's factors at the planned height) confirmed
    by :func:`confirm_amplified_height` with each point's own history at each trial
    fall, then raised towards the fall where the history reaches U = 1
    (:func:`_raise_height`); at least the bounds' answer (the bounds lie above the
    history, so their height holds too)."""
    th = c[DynamicAmplification].th
    if not LIMIT_POINT_HISTORY or th is None or not th.any():
        return h_b
    h = _raise_height(c, th, confirm_amplified_height(c, h_el, th))
    return np.where(th & np.isfinite(h) & ~(h <= h_b), h, h_b)


def _raise_height(c: Chain, th: np.ndarray, h: np.ndarray) -> np.ndarray:
    """The falls ``h`` (m) at the points ``th``, each one its own history passes,
    raised for at most :data:`TH_LIMIT_UP_ROUNDS` rounds while its U there is below
    :data:`TH_LIMIT_UP_U`: to h·(0.99/U)² (F ∝ √h, Gere 7th ed. Eq. 9-94; at most
    × 4) until a fall fails, then within the bracket [pass, fail] by the power law
    U ∝ hᵖ through its ends (p at least 0.1); a trial that passes becomes the answer.
    Stops where the bracket is within 4 %. Only passing falls are ever returned."""
    h = h.copy()
    hi = np.full(h.shape, np.inf)
    U_hi = np.full(h.shape, np.nan)
    for _ in range(TH_LIMIT_UP_ROUNDS):
        live = th & np.isfinite(h) & (h > 0.0) & (hi > 1.04 * h)
        if not live.any():
            break
        U = amplified_utilisation_at(c, np.where(live, h, 0.0), live)
        low = live & np.isfinite(U) & (U > 0.0) & (U < TH_LIMIT_UP_U)
        if not low.any():
            break
        Ul = np.where(low, U, 1.0)
        with np.errstate(divide="ignore", invalid="ignore"):
            p = np.log(U_hi / Ul) / np.log(hi / h)
            p = np.where(np.isfinite(hi) & np.isfinite(p), np.maximum(p, 0.1), 0.5)
            up = h * np.minimum((0.99 / Ul) ** (1.0 / p), 4.0)
        up = np.where(np.isfinite(hi), np.clip(up, 1.01 * h, 0.99 * hi), up)
        up = np.where(low, up, 0.0)
        U_up = amplified_utilisation_at(c, up, low)
        ok = low & (U_up <= 1.0)
        fail = low & ~ok
        h = np.where(ok, up, h)
        hi, U_hi = np.where(fail, up, hi), np.where(fail, U_up, U_hi)
    return h


def confirm_amplified_height(c: Chain, h_el: np.ndarray,
                             th: np.ndarray | None = None) -> np.ndarray:
    """The elastic allowable free fall with dynamic amplification, m: the factors
    depend on the height (the rigid-base and crushing bounds, the energy method's own
    force), so the closed form's height — with the factors at the planned height — is
    re-checked by a forward run of the bounds at that height
    (:func:`amplified_utilisation_at`) and lowered by (0.98/U)² where U > 1 (F ∝ √h
    for a drop large against the static deflection, Gere 7th ed. Eq. 9-94), until
    every point holds (at most :data:`_CONFIRM_ROUNDS` rounds; a point still over then
    gets no height, NaN). Each round re-runs only the points the last one lowered
    (the others' heights, and so their U ≤ 1, are unchanged: every step is per point);
    :func:`confirm_amplified_height_reference` re-runs every point each round. With
    ``th`` (:data:`LIMIT_POINT_HISTORY`) only those points are searched, each on its
    own time history (:func:`_confirm_on_histories`; the others: NaN)."""
    if th is not None:
        return _confirm_on_histories(c, h_el, th)
    h = h_el.copy()
    todo = np.isfinite(h) & (h > 0.0)  # the points whose U at h is not yet known ≤ 1
    for _ in range(_CONFIRM_ROUNDS):
        if not todo.any():
            return h
        U = amplified_utilisation_at(c, h, rows=np.flatnonzero(todo))
        over = todo & (U > 1.0)
        if not over.any():
            return h
        h = np.where(over, h * np.minimum(0.98, (0.98 / U) ** 2), h)
        todo = over & np.isfinite(h) & (h > 0.0)
    if not todo.any():
        return h
    U = amplified_utilisation_at(c, h, rows=np.flatnonzero(todo))
    return np.where(todo & (U > 1.0), np.nan, h)


def confirm_amplified_height_reference(c: Chain, h_el: np.ndarray) -> np.ndarray:
    """:func:`confirm_amplified_height` as first written, every live point re-run each
    round (the plain reference it is compared with at tolerance 0,
    tests/solver/test_rows_chain.py)."""
    return _confirm_on_histories(c, h_el, None)


def _confirm_on_histories(c: Chain, h_el: np.ndarray,
                          th: np.ndarray | None) -> np.ndarray:
    """:func:`confirm_amplified_height`'s rounds with every live point re-run each
    round, the points ``th`` on their own time history at each trial fall and only
    they searched (the others NaN); ``None``: every point at the bounds (the plain
    reference)."""
    h = h_el.copy() if th is None else np.where(th, h_el, np.nan)
    for _ in range(_CONFIRM_ROUNDS):
        live = np.isfinite(h) & (h > 0.0)
        if not live.any():
            break
        U = np.ones(c.drop.n)
        U[live] = amplified_utilisation_at(c, np.where(live, h, 0.0), th)[live]
        over = live & (U > 1.0)
        if not over.any():
            return h
        h = np.where(over, h * np.minimum(0.98, (0.98 / U) ** 2), h)
    live = np.isfinite(h) & (h > 0.0)
    U = amplified_utilisation_at(c, np.where(live, h, 0.0), th)
    return np.where(live & (U > 1.0), np.nan, h)


# --------------------------------------------------------------------------- 9. local damage
@dataclass(frozen=True, eq=False)
class LocalDamage:
    """Per point: local damage of the bare deck by a hard load (worst of its strike
    orientations; :func:`~droprig.solver.local_damage.load_local_damage`).
    ``assessed``: a hard load on bare deck (no mat or crushable layer, no opening, no
    declared soft underside). ``penetration`` (m), ``scabbing`` / ``perforation``
    (bool), ``h_scab`` / ``h_perf`` (free fall at which each starts, m),
    ``v_res`` (m/s after perforation), ``v_strike`` (strike speed √(v_h² + 2gh), m/s),
    ``extrapolated`` (outside the formulas' test speeds) and ``orientation`` (index
    into ``STRIKE_ORIENTATIONS``, −1 where not assessed); nan / False elsewhere.
    On a steel plate deck also the plastic dent: ``dent`` (m, deepest over the
    orientations), ``h_dent`` (free fall at which the dent reaches
    :data:`~droprig.solver.local_damage.DENT_LIMIT`, m, lowest over the orientations)
    and ``dent_valid`` (the membrane estimate within its validity, and the load not
    through the plate by BRL); nan / False elsewhere."""

    assessed: np.ndarray
    penetration: np.ndarray
    scabbing: np.ndarray
    perforation: np.ndarray
    h_scab: np.ndarray
    h_perf: np.ndarray
    v_res: np.ndarray
    v_strike: np.ndarray
    extrapolated: np.ndarray
    orientation: np.ndarray
    dent: np.ndarray
    h_dent: np.ndarray
    dent_valid: np.ndarray


def plate_dent(c: Chain, load: LiftLoad, sel: np.ndarray
               ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Dent of a steel plate deck by a hard ``load`` at the points ``sel``: depth (m,
    deepest over the load's strike orientations), the free fall at which it reaches
    :data:`~droprig.solver.local_damage.DENT_LIMIT` (m, lowest) and validity (every
    orientation's estimate valid), by the plate's plastic membrane energy
    (:func:`~droprig.solver.local_damage.plate_dent_stiffness`, punch radius the
    equivalent radius of the strike contact, clamped at half the deck strip's span
    between the beams — common practice, no source) at the energy height of the
    drop (:func:`energy_fall`)."""
    d, inp, comp = c.drop, c[LoadInputs], c[Compliance]
    dk = d.fm.level.deck
    R = 0.5 * comp.strip_span[sel]
    h_e = energy_fall(c, inp.h[sel])
    W_all, h_all, ok_all = [], [], []
    for o in load.strike_orientations:
        deq, _p, _n = local_damage_mod.strike_geometry(o, load.footprint_length,
                                                       load.footprint_width,
                                                       load.edge_width)
        a = 0.5 * deq
        k = local_damage_mod.plate_dent_stiffness(dk.thickness, dk.steel_fy, a, R)
        W = local_damage_mod.plate_dent_depth(load.mass, h_e, k)
        W_all.append(W)
        h_all.append(local_damage_mod.plate_dent_height(load.mass,
                                                        local_damage_mod.DENT_LIMIT, k,
                                                        d.v_hoist))
        ok_all.append(local_damage_mod.plate_dent_valid(W, dk.thickness, a, R))
    W_s, h_s = np.stack(W_all), np.stack(h_all)
    # (an orientation whose footprint covers the panel has no dent mode: NaN, left
    # out; all NaN stays NaN)
    return (np.fmax.reduce(W_s, axis=0), np.fmin.reduce(h_s, axis=0),
            np.all(np.stack(ok_all), axis=0))


def local_damage(c: Chain) -> LocalDamage:
    """:class:`LocalDamage` of the drop: each hard load
    (:func:`~droprig.solver.local_damage.is_hard`) at its points on bare deck, free
    fall ``LoadInputs.h`` from the hoist's lowering speed ``Drop.v_hoist`` (strike
    speed V = √(v_h² + 2gh), uniform acceleration), the level's deck (full depth,
    its concrete and bottom bars). The start heights h_s, h_p are the free falls
    that reach each start speed from v_h, (V² − v_h²)/(2g). Under a mat or a
    crushable layer the layer spreads the strike and the deck is not assessed for
    local damage here (the contact checks judge it)."""
    d, inp = c.drop, c[LoadInputs]
    n = d.n
    nan = np.full(n, np.nan)
    out = {"assessed": np.zeros(n, dtype=bool), "penetration": nan.copy(),
           "scabbing": np.zeros(n, dtype=bool), "perforation": np.zeros(n, dtype=bool),
           "h_scab": nan.copy(), "h_perf": nan.copy(), "v_res": np.zeros(n),
           "v_strike": nan.copy(),
           "extrapolated": np.zeros(n, dtype=bool),
           "orientation": np.full(n, -1, dtype=np.int64),
           "dent": nan.copy(), "h_dent": nan.copy(), "dent_valid": np.zeros(n, dtype=bool)}
    bare = (inp.t_mat <= 0.0) & ~inp.crushable & ~d.geo.opening
    deck_ = d.fm.level.deck
    for j, load in enumerate(d.loads):
        if not local_damage_mod.is_hard(load):
            continue
        sel = bare & (d.li == j) if len(d.loads) > 1 else bare
        if not sel.any():
            continue
        # worked out once per distinct height (the points share the planned one)
        r, at = local_damage_mod.distinct_height_damage(load, deck_, inp.h[sel], d.v_hoist)
        orient = np.array([local_damage_mod.ORIENTATIONS.index(o) for o in r.orientations])
        out["assessed"][sel] = True
        out["penetration"][sel] = r.penetration[at]
        out["scabbing"][sel] = r.scabbing[at]
        out["perforation"][sel] = r.perforation[at]
        out["h_scab"][sel] = r.h_scabbing[at]
        out["h_perf"][sel] = r.h_perforation[at]
        out["v_res"][sel] = r.v_residual[at]
        out["v_strike"][sel] = local_damage_mod.impact_speed(inp.h[sel], d.v_hoist)
        out["extrapolated"][sel] = r.extrapolated[at]
        out["orientation"][sel] = orient[r.governing[at]]
        if deck_.kind == "steel_plate":
            out["dent"][sel], out["h_dent"][sel], valid = plate_dent(c, load, sel)
            # where the load goes through (BRL) the dent is no measure: not valid
            out["dent_valid"][sel] = valid & ~r.perforation[at]
    return LocalDamage(**out)


# --------------------------------------------------------------------------- deck-less
def _bare_load_inputs(b: BareMember, n: int) -> LoadInputs:
    """:class:`LoadInputs` of one member's drop (:class:`BareMember`): W = M·g, no
    mat thickness (the fall is the drop height), bearing length ``b.bearing``."""
    full = np.full
    return LoadInputs(W=full(n, b.mass * impact_mod.G), M=full(n, b.mass),
                      fl=full(n, b.bearing), fw=full(n, b.bearing), f_load=full(n, b.f_load),
                      t_mat=np.zeros(n), f_mat=full(n, b.f_mat), F_c=full(n, b.F_c),
                      s_c=full(n, b.s_c), crushable=full(n, bool(np.isfinite(b.F_c))),
                      h=full(n, b.h), H=full(n, b.h), foot_l=full(n, b.bearing),
                      foot_w=full(n, b.bearing), lb=full(n, b.bearing),
                      protected=full(n, b.cushioned), f_layer=np.zeros(n))


def _bare_compliance(d: Drop, inp: LoadInputs) -> Compliance:
    """:class:`Compliance` of one member (no deck, no columns): f_s from the load path
    (the member's Green's function, AISC Manual Table 3-23), in series with the
    load's underside and a cushion (Gere 7th ed. §9.10)."""
    zero = np.zeros(d.n)
    f_s = d.geo.path.f
    f_struct = f_s + inp.f_load
    return Compliance(f_s=f_s, f_deck=zero, f_struct=f_struct,
                      f_series=inp.f_load + inp.f_mat, f=f_struct + inp.f_mat,
                      strip_span=zero, strip_pos=zero, f_col=zero, k_left=zero,
                      k_right=zero, g_strip=zero, cont_ratio=zero, f_deck_local=zero,
                      bridged=np.zeros(d.n, dtype=bool), bridged_both=np.zeros(d.n, dtype=bool))


# --------------------------------------------------------------------------- run
STEPS: tuple[Callable[[Chain], object], ...] = (
    load_inputs,
    compliance,
    struck_mass,
    impact,
    demands,
    dynamic_amplification,
    amplified_demands,
    slab_resistance,
    checks,
    beyond_yield,
    inverse_answers,
    local_damage,
)
"""The steps of the chain, in order (each reads only the results before it)."""


HEIGHT_FREE: dict[str, type] = {"compliance": Compliance, "struck_mass": StruckMass,
                                 "slab_resistance": SlabResistance}
"""Steps of :data:`STEPS` (by name) and their result types whose values depend on the
points, the loads, the landing and what lies under the load, but read neither the drop
height (the trial heights ``Drop.H``, the hoist speed) nor whether the load is hard: a
trial at points the analysis ran, with no trial mat, takes them from that run
(:func:`run_chain` ``given``; :class:`droprig.solver.geometry.KeptSteps`)."""


def run_chain(drop: Drop, given: Mapping[type, object] | None = None) -> Chain:
    """Every step of :data:`STEPS` for ``drop``; a step of :data:`HEIGHT_FREE` whose
    result ``given`` holds (worked out for the same points, loads, landing and
    protection at another drop height) is taken from it instead of run again. After
    :func:`beyond_yield`, the points' own time histories chosen again by their
    verdicts (:func:`_with_verdict_histories`)."""
    chain = Chain(drop)
    for step in STEPS:
        kind = HEIGHT_FREE.get(getattr(step, "__name__", "")) if given else None
        if given and kind is not None and kind in given:
            chain.add(given[kind])
        else:
            chain.add(step(chain))
        if step is beyond_yield:
            chain = (_with_trial_histories(chain) if drop.trial and not TRIAL_POINT_HISTORY
                     else _with_verdict_histories(chain))
        elif step is inverse_answers:
            chain = _with_limit_histories(chain)
    return chain


VERDICT_STEPS: tuple[Callable[[Chain], object], ...] = (amplified_demands, slab_resistance,
                                                         checks, beyond_yield)
"""The steps after :func:`dynamic_amplification` up to the verdict, run again by
:func:`_with_verdict_histories`."""


def _with_verdict_histories(c: Chain) -> Chain:
    """``c`` with more points run through their own time history where a verdict at
    the bounds could set its group's (bay × load) verdict: the first choice
    (:func:`_point_histories`) ranks points by U before the verdict is known, but a
    point's response beyond yield (ductility, the brittle checks at the plastic force)
    takes the bounds' factors too, so a point at its bounds could read *exceeds* where
    its own history reads *plastic* (the steel demo's welder with amplification on: 9
    of 9 rows *exceeds* with the first choice, *plastic* with every point's history,
    as with amplification off). Round by round (at most :data:`TH_VERDICT_ROUNDS`)
    the points whose verdict (response, then U; :func:`_history_candidates`) is worse
    than the worst of their group's run points are run, the worst
    :data:`TH_PER_ROUND` · 2^k of each group in round k (doubling: where the bounds
    lie far above the histories many points read worse at them than the history
    that sets the verdict, 2,383 of the steel demo's 8,148 first points), and the
    steps from the amplification to the verdict (:data:`VERDICT_STEPS`) run again
    with the points so chosen. Every point left at its bounds lies above its own
    history (conservative): a bay's largest U may still read at a point of a lesser
    verdict left at its bounds (on the demos up to 1.80 × the U with every point run;
    running those as well cost as much as running every point, 33–49 s against
    31 s on the steel demo — the bounds lie above the history almost everywhere)."""
    for k in range(TH_VERDICT_ROUNDS):
        th = _history_candidates(c, TH_PER_ROUND << k)
        if th is None:
            return c
        c = _rerun_from_amplification(c, th, VERDICT_STEPS)
    return c


def _rerun_from_amplification(c: Chain, th: np.ndarray, steps: Sequence[Callable[[Chain], object]]
                              ) -> Chain:
    """A new chain with ``c``'s steps before the amplification, the amplification with
    the points ``th`` (bool per point) run through their own time history, then
    ``steps`` (the verdict steps, and the inverse answers where the limits are
    chosen): the one rerun of :func:`_with_verdict_histories`,
    :func:`_with_trial_histories` and :func:`_with_limit_histories`."""
    new = Chain(c.drop)
    for r in c.history:
        if isinstance(r, DynamicAmplification):
            break
        new.add(r)
    new.add(amplification_at(new, new[LoadInputs].h, new[Impact], th_points=th))
    for step in steps:
        new.add(step(new))
    return new


def _history_candidates(c: Chain, per_group: int) -> np.ndarray | None:
    """The points to run through their own time history (bool per point): those
    already run and, in each group (bay × load), the :data:`TH_PER_ROUND` whose
    verdict at the bounds — response, then U (the order the bay summary takes, as
    :func:`droprig.solver.results.severity`) — is worst among those worse than the
    worst of the group's run points. ``None``: nothing to add (the setting or the
    floors' histories off, a trial, or every group's worst already a history's)."""
    d = c.drop
    da = c[DynamicAmplification]
    if da.th is None or d.bare is not None or not FLOOR_POINT_HISTORY or \
            (d.trial and not TRIAL_POINT_HISTORY):
        return None
    A_max = np.maximum(np.maximum(da.A_force, da.A_moment),
                       np.maximum(da.A_shear, da.A_deflection))
    ok = _history_ok(d, c[Impact].F, c[LoadInputs].h) & (A_max > 1.0 + 1e-9)
    sev = severity(c[Checks].U, c[BeyondYield].response)
    gi = _groups(d)
    worst_run = np.full(gi.max(initial=-1) + 1, -np.inf)
    np.maximum.at(worst_run, gi, np.where(da.th, sev, -np.inf))
    cand = np.flatnonzero(ok & ~da.th & (sev > worst_run[gi] + 1e-9))
    if cand.size == 0:
        return None
    th = da.th.copy()
    th[_top_per_group(sev, gi, cand, per_group)] = True
    return th


def _with_trial_histories(c: Chain) -> Chain:
    """A confirmation trial (``Drop.trial``) with the floors' point histories on and
    :data:`TRIAL_POINT_HISTORY` off: the points whose verdict at the bounds would fail
    a trial — a response beyond *plastic*, or U above :data:`TH_TRIAL_U` — are run
    through their own time history at their trial fall (at most
    :data:`TH_TRIAL_PER_GROUP` per group, the worst first), and the steps from the
    amplification to the verdict run again. A limit offered from the points'
    histories (:func:`_history_height`) would otherwise step back to the bounds' in
    its trial. Every point left at its bounds lies above its own history, so a trial
    that holds holds at every tried point's own history (never above what the
    history allows); one whose failing points pass the cap fails, as before."""
    d = c.drop
    da = c[DynamicAmplification]
    if not (FLOOR_POINT_HISTORY and LIMIT_POINT_HISTORY) or TRIAL_POINT_HISTORY or \
            d.bare is not None or not d.fm.settings.dynamic_amplification:
        return c
    A_max = np.maximum(np.maximum(da.A_force, da.A_moment),
                       np.maximum(da.A_shear, da.A_deflection))
    ok = _history_ok(d, c[Impact].F, c[LoadInputs].h) & (A_max > 1.0 + 1e-9)
    U, resp = c[Checks].U, c[BeyondYield].response
    cand = np.flatnonzero(ok & ((resp > PLASTIC) | (U > TH_TRIAL_U)))
    if cand.size == 0:
        return c
    th = np.zeros(d.n, dtype=bool)
    th[_top_per_group(severity(U, resp), _groups(d), cand, TH_TRIAL_PER_GROUP)] = True
    return _rerun_from_amplification(c, th, VERDICT_STEPS)


def _with_limit_histories(c: Chain) -> Chain:
    """``c`` with more points run through their own time history where a limit at
    the bounds could set its group's (bay × load) least limit: the mirror of
    :func:`_with_verdict_histories` for the inverse answers. A bay offers the least
    allowable height (elastic, beyond yield) and mass over its points; a point run
    through its history takes its answers from that history (:func:`_history_height`),
    one left at its bounds the bounds' (lower: the bounds lie above the history). So
    a point at its bounds whose answer is below the least of its group's run points
    would set the bay's limit by a bound: round by round (at most
    :data:`TH_LIMIT_CHOICE_ROUNDS`) the lowest :data:`TH_PER_ROUND` · 2^k of them per
    group (:func:`_limit_candidates`) are run, and the steps from the amplification
    to the inverse answers run again. What is left at its bounds after the cap keeps
    the bounds' answer (conservative)."""
    for k in range(TH_LIMIT_CHOICE_ROUNDS):
        th = _limit_candidates(c, TH_PER_ROUND << k)
        if th is None:
            return c
        c = _rerun_from_amplification(c, th, (*VERDICT_STEPS, inverse_answers))
    return c


def _limit_candidates(c: Chain, per_group: int) -> np.ndarray | None:
    """The points to run through their own time history for the limits (bool per
    point): those already run and, in each group (bay × load), the ``per_group``
    furthest below the least of the group's run points in an inverse answer — the
    elastic or plastic allowable height or the allowable mass (no answer, NaN, as
    0) — among the points left at their bounds where the amplification acts (a
    group with no run point keeps its bounds: its first choice found no point whose
    bounds lie above the energy method's U).
    ``None``: nothing to add (the setting or the floors' histories off, a trial, no
    run point, or no bounded answer below the run points' least)."""
    d = c.drop
    da = c[DynamicAmplification]
    if da.th is None or not da.th.any() or d.bare is not None or \
            not (FLOOR_POINT_HISTORY and LIMIT_POINT_HISTORY) or d.trial:
        return None
    inv = c[InverseAnswers]
    A_max = np.maximum(np.maximum(da.A_force, da.A_moment),
                       np.maximum(da.A_shear, da.A_deflection))
    ok = _history_ok(d, c[Impact].F, c[LoadInputs].h) & (A_max > 1.0 + 1e-9) & ~da.th
    gi = _groups(d)
    below = np.zeros(d.n)
    for v in (inv.h_el, inv.h_pl, inv.m_allow):
        v = np.where(np.isnan(v), 0.0, v)
        least = np.full(gi.max(initial=-1) + 1, np.inf)
        np.minimum.at(least, gi, np.where(da.th, v, np.inf))
        with np.errstate(divide="ignore", invalid="ignore"):
            r = np.where(np.isfinite(least[gi]) & (v < least[gi] * (1.0 - 1e-9)),
                         least[gi] / v, 0.0)
        below = np.maximum(below, np.where(np.isnan(r), np.inf, r))
    cand = np.flatnonzero(ok & (below > 0.0))
    if cand.size == 0:
        return None
    th = da.th.copy()
    th[_top_per_group(below, gi, cand, per_group)] = True
    return th


def outputs(c: Chain) -> dict[str, np.ndarray]:
    """The :class:`~droprig.solver.results.CaseResult` arrays of a chain under their
    field names, and ``F_allow`` (N); at a deck opening the load falls through
    (U = ∞, exceeds, governing check ``opening``, no other value)."""
    d, inp, sm, imp = c.drop, c[LoadInputs], c[StruckMass], c[Impact]
    ck, by, inv, ld = c[Checks], c[BeyondYield], c[InverseAnswers], c[LocalDamage]
    geo = d.geo
    comp = c[Compliance]
    out = {
        "x": geo.x, "y": geo.y, "bay": geo.bay,
        "protection": geo.protection if inp.pad is None else inp.pad,
        "drop_height": inp.H, "fall_height": inp.h, "structure_compliance": comp.f_struct,
        "static_deflection": imp.d_st,
        # the struck mass the impact used: with the slab where two forces
        "effective_mass": sm.m_e if imp.two_mass is None or sm.m2 is None
        else np.where(imp.two_mass, sm.m2, sm.m_e),
        "dynamic_factor": imp.K, "peak_force": imp.F, "max_deflection": imp.d_max,
        "deceleration_g": impact_mod.deceleration_g(imp.contact, inp.W), "utilisation": ck.U,
        "governing_member": by.gov_member.astype(np.int64),
        "governing_check": by.gov_check.astype(np.int64), "response": by.response,
        # the check (and its member) whose U is the point's U
        "utilisation_check": (ck.gov_check if ck.util_check is None
                              else ck.util_check).astype(np.int64),
        "utilisation_member": (ck.gov_member if ck.util_member is None
                               else ck.util_member).astype(np.int64),
        # allowable heights on the datum: the fall they allow plus the pad's thickness
        "allowable_drop_height": inv.h_el + inp.datum_offset,
        "allowable_drop_height_plastic": inv.h_pl + inp.datum_offset,
        "allowable_height_check": inv.h_check.astype(np.int64),
        "allowable_height_member": inv.h_member.astype(np.int64),
        "allowable_height_plastic_check": inv.hp_check.astype(np.int64),
        "allowable_mass": inv.m_allow, "plastic_deflection": by.plastic_deflection,
        "ductility": by.ductility_out, "support_rotation": by.rotation_out,
        "required_mat_stiffness": inv.k_req, "required_crush_stroke": inv.s_req,
        "penetration": ld.penetration, "scabbing": ld.scabbing,
        # on the datum too: the fall at which each starts plus the pad's thickness
        "scabbing_height": ld.h_scab + inp.datum_offset,
        "perforation_height": ld.h_perf + inp.datum_offset,
        "residual_velocity": ld.v_res, "local_extrapolated": ld.extrapolated,
        "strike_orientation": ld.orientation,
        # steel plate decks: the dent and the height (on the datum) of the dent limit
        "dent_depth": ld.dent, "dent_height": ld.h_dent + inp.datum_offset,
    }
    if ld.perforation.any():
        out["response"] = np.where(ld.perforation, PERFORATES, out["response"])
    op = geo.opening
    if op.any():
        for k in _NONE_AT_OPENING:
            out[k] = np.where(op, np.nan, out[k])
        out["utilisation"] = np.where(op, np.inf, out["utilisation"])
        out["response"] = np.where(op, EXCEEDS, out["response"])
        out["governing_check"] = np.where(op, CHECK["opening"], out["governing_check"])
        out["governing_member"] = np.where(op, DECK, out["governing_member"])
        out["utilisation_check"] = np.where(op, CHECK["opening"], out["utilisation_check"])
        out["utilisation_member"] = np.where(op, DECK, out["utilisation_member"])
        out["allowable_height_check"] = np.where(op, CHECK["opening"],
                                                 out["allowable_height_check"])
        out["allowable_height_member"] = np.where(op, DECK, out["allowable_height_member"])
    out["F_allow"] = ck.F_allow
    return out


_BY_RESPONSE = ("static_deflection", "effective_mass", "dynamic_factor", "peak_force",
                "max_deflection", "deceleration_g", "utilisation", "governing_member",
                "governing_check", "response", "plastic_deflection", "ductility",
                "support_rotation", "structure_compliance", "utilisation_check",
                "utilisation_member")
"""Outputs that describe the response at a point: taken from the governing landing."""

_BY_HEIGHT = ("allowable_drop_height", "allowable_height_check", "allowable_height_member",
              "F_allow")
_BY_PLASTIC_HEIGHT = ("allowable_drop_height_plastic", "allowable_height_plastic_check")


def _lower(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """True where ``b`` is the lower value; NaN (none exists: no height allowed) is
    the lowest of all."""
    return (np.isnan(b) & ~np.isnan(a)) | (b < a)


def tilted_governs(flat: dict[str, np.ndarray], tilted: dict[str, np.ndarray]
                   ) -> np.ndarray:
    """Per point, whether the tilted landing governs: the worse response, then the
    larger utilisation (NaN below every number)."""
    Uf = np.where(np.isnan(flat["utilisation"]), -np.inf, flat["utilisation"])
    Ut = np.where(np.isnan(tilted["utilisation"]), -np.inf, tilted["utilisation"])
    rf, rt = flat["response"], tilted["response"]
    return np.asarray((rt > rf) | ((rt == rf) & (Ut > Uf)))


def merge_landings(flat: dict[str, np.ndarray], tilted: dict[str, np.ndarray]
                   ) -> dict[str, np.ndarray]:
    """The outputs of a point checked for both landings, the worse governing: the
    response, utilisation and what goes with them from the landing with the worse
    response (then the larger utilisation); each allowable height (and its check,
    member and allowed force) the lower of the two; the allowable mass and the
    stiffest mat that works the less, the crush stroke needed the larger (NaN — none
    exists — wins). Everything else is the same for both landings."""
    out = dict(flat)
    gov = tilted_governs(flat, tilted)
    for k in _BY_RESPONSE:
        out[k] = np.where(gov, tilted[k], flat[k])
    low = _lower(flat["allowable_drop_height"], tilted["allowable_drop_height"])
    for k in _BY_HEIGHT:
        out[k] = np.where(low, tilted[k], flat[k])
    low = _lower(flat["allowable_drop_height_plastic"], tilted["allowable_drop_height_plastic"])
    for k in _BY_PLASTIC_HEIGHT:
        out[k] = np.where(low, tilted[k], flat[k])
    out["allowable_mass"] = np.minimum(flat["allowable_mass"], tilted["allowable_mass"])
    out["required_mat_stiffness"] = np.minimum(flat["required_mat_stiffness"],
                                               tilted["required_mat_stiffness"])
    out["required_crush_stroke"] = np.maximum(flat["required_crush_stroke"],
                                              tilted["required_crush_stroke"])
    return out
