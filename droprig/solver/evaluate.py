"""Run the per-point chain (:mod:`droprig.solver.chain`) over many drop points: block
by block on all cores (:mod:`droprig.solver.parallel`), the outputs allocated by the
calling thread, the load-independent member actions shared by the loads of a zone.

Every function here gives the same values as :func:`~droprig.solver.chain.run_chain`
on all points at once (``tests/solver/test_parallel.py``). SI units.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field

import numpy as np

from droprig.model import Level, LiftLoad, LiftZone, ModelError, Project
from droprig.solver import chain as chain_mod
from droprig.solver import loadpath, memory
from droprig.solver.chain import (
    FIELDS,
    HEIGHT_FREE,
    LANDINGS,
    Chain,
    Drop,
    column_path_mass_at,
    merge_landings,
    outputs,
    run_chain,
    slab_path_mass_at,
    tilted_governs,
)
from droprig.solver.floor import FloorModel, floor_model
from droprig.solver.geometry import (
    PER_POINT_MASSES,
    Geometry,
    KeptSteps,
    distinct_point_geometry,
    point_geometry,
    slice_geo,
    take_geo,
)
from droprig.solver.loadpath import PathResult
from droprig.solver.parallel import for_blocks
from droprig.solver.unit_actions import unit_actions

__all__ = ["CACHE_MAX_POINTS", "LARGE_JOB_SHARE", "OUTPUTS", "GoverningPoint", "PointCase",
           "distinct_geometry", "evaluate_case", "evaluate_chain", "evaluate_points",
           "governing_point", "large_job_block",
           "point_case", "point_masses", "tile"]

CACHE_MAX_POINTS = 200_000
"""Up to this many drop points the load-independent member actions are kept between
the loads of a zone (about 40 doubles per point); beyond, they are recomputed per
load so that memory stays bounded."""

OUTPUTS = (*FIELDS, "F_allow")
"""The keys of :func:`evaluate_case`'s result."""

_INTS = {"bay", "protection", "governing_member", "governing_check", "response",
         "strike_orientation", "utilisation_check", "utilisation_member"}
_BOOLS = {"scabbing", "local_extrapolated"}


def _loads(load: LiftLoad | Sequence[LiftLoad]) -> tuple[LiftLoad, ...]:
    return (load,) if isinstance(load, LiftLoad) else tuple(load)


def evaluate_chain(fm: FloorModel, project: Project, load: LiftLoad | Sequence[LiftLoad],
                   geo: Geometry, load_index: np.ndarray | None = None, *,
                   detail: bool = True, v_hoist: float = 0.0, landing: str = "flat",
                   tip_off: np.ndarray | None = None) -> Chain:
    """Every step of the chain for ``load`` at the points of ``geo`` (one block, all
    points; the calculation trace and the tests read the step results) for one
    ``landing`` (:data:`~droprig.solver.chain.LANDINGS`). ``load`` may be a sequence
    of loads with ``load_index`` naming the load of each point; ``v_hoist`` is the
    hoist's lowering speed at release (m/s, :class:`Drop`); ``tip_off``: the
    tip-off case's Δ per point (m, ``Drop.tip_off``; only where H > Δ)."""
    memory.keep_freed_memory()
    n = geo.x.size
    li = np.zeros(n, dtype=np.int64) if load_index is None else np.asarray(load_index)
    with np.errstate(all="ignore"):
        return run_chain(Drop(fm, project, geo, _loads(load), li, detail,
                              v_hoist=v_hoist, landing=landing, tip_off=tip_off))


def deck_range_words(level: Level, opening: bool = False) -> str:
    """The deck's plan extent as the allowed range of a point asked for directly, m
    (the analysis's drop points never leave it; a point past an edge has no deck under
    its centre), " (x … to … m, y … to … m)", with ``opening`` "not in an opening"."""
    e = level.grid.extent
    rest = ", not in an opening" if opening else ""
    return f" (x {e.x0:g} to {e.x1:g} m, y {e.y0:g} to {e.y1:g} m{rest})"


@dataclass(frozen=True)
class PointCase:
    """One asked-for drop point: its lift zone, load, the zone level's floor model and
    the point's geometry (one point)."""

    zone: LiftZone
    load: LiftLoad
    fm: FloorModel
    geo: Geometry


def point_case(project: Project, zone_id: str, load_name: str, x: float, y: float, *,
               fields: tuple[str, str, str], reference: bool = False,
               opening: bool = False) -> PointCase:
    """Look up a point asked for directly (the calculation trace, the time-history
    verification): zone ``zone_id``, its load ``load_name`` and the geometry of plan
    point (x, y) in m. Raises :class:`ModelError` naming ``fields`` (zone, load,
    point) and the allowed values for an unknown zone or load, or a point with no deck
    panel under it (``opening`` also refuses a point in a deck opening)."""
    zones = {z.id: z for z in project.lift_zones}
    if zone_id not in zones:
        raise ModelError(fields[0], zone_id, "the id of a lift zone: " + ", ".join(zones))
    zone = zones[zone_id]
    loads = {ld.name: ld for ld in zone.loads}
    if load_name not in loads:
        raise ModelError(fields[1], load_name,
                         f"the name of a load of zone {zone_id}: " + ", ".join(loads))
    fm = floor_model(project.level(zone.level_id), project.settings)
    geo = point_geometry(fm, project, np.array([float(x)]), np.array([float(y)]),
                         reference=reference)
    if geo.path.pair[0] < 0 or (opening and bool(geo.opening[0])):
        raise ModelError(fields[2], (float(x), float(y)),
                         f"a point over a deck panel of level {fm.level.id}"
                         + deck_range_words(fm.level, opening=opening))
    return PointCase(zone, loads[load_name], fm, geo)


def governing_landing_chain(fm: FloorModel, project: Project, load: LiftLoad, geo: Geometry,
                            v_hoist: float = 0.0, tip_off: np.ndarray | None = None
                            ) -> tuple[str, Chain]:
    """The landing that governs a single point (``geo`` of one point) and its chain
    with every step: both landings where the project checks the tilted one
    (``settings.tilted_landing``), the worse governing as the analysis merges them
    (:func:`~droprig.solver.chain.tilted_governs`); else the flat landing. One case:
    the ordinary run, or with ``tip_off`` (Δ, m) the tip-off over a pad's edge — the
    case that governs the point is :func:`governing_point`'s."""
    landing, chain, _ = _landing_cases(fm, project, load, geo, v_hoist, tip_off)
    return landing, chain


def _landing_cases(fm: FloorModel, project: Project, load: LiftLoad, geo: Geometry,
                   v_hoist: float, tip_off: np.ndarray | None
                   ) -> tuple[str, Chain, dict[str, np.ndarray]]:
    """:func:`governing_landing_chain` and the outputs of its landings merged as the
    analysis merges them (:func:`_outputs`)."""
    landings = LANDINGS if project.settings.tilted_landing else ("flat",)
    chains = {k: evaluate_chain(fm, project, load, geo, detail=True, landing=k,
                                v_hoist=v_hoist, tip_off=tip_off) for k in landings}
    flat = outputs(chains["flat"])
    if "tilted" not in chains:
        return "flat", chains["flat"], flat
    tilted = outputs(chains["tilted"])
    merged = merge_landings(flat, tilted)
    if bool(tilted_governs(flat, tilted)[0]):
        return "tilted", chains["tilted"], merged
    return "flat", chains["flat"], merged


@dataclass(frozen=True)
class GoverningPoint:
    """The case that governs one asked-for point (:func:`governing_point`): its
    ``landing`` and ``chain`` with every step; ``tip`` the tip-off over a pad's edge
    where the load's footprint lies partly on a crushable pad (None elsewhere),
    ``tip_governs`` whether the chain is that case's, ``on_pad`` whether the drop point
    lies on the pad (then both cases are compared; off it the tip-off is the point's
    only case, :func:`~droprig.solver.chain.merge_tip_off`); ``cases`` the outputs of
    the two cases (``"on_pad"``, ``"tip_off"``; empty without a tip-off) and ``merged``
    the point's outputs as the floor analysis keeps them; ``unreached`` the two
    cases' outputs where the drop height is at most the tip-off's Δ (the ordinary case
    governs, the allowable heights are still the lower of the two; empty elsewhere)."""

    landing: str
    chain: Chain
    tip: chain_mod.TipOffTurn | None
    tip_governs: bool
    on_pad: bool
    cases: dict[str, dict[str, np.ndarray]]
    merged: dict[str, np.ndarray]
    unreached: dict[str, dict[str, np.ndarray]] = field(default_factory=dict)


def governing_point(fm: FloorModel, project: Project, load: LiftLoad, geo: Geometry,
                    v_hoist: float = 0.0) -> GoverningPoint:
    """The case and landing that govern a single point (``geo`` of one point), chosen as
    the floor analysis chooses them (:func:`_outputs`): the landings
    (:func:`governing_landing_chain`), then where the footprint lies partly on a
    crushable pad (:func:`~droprig.solver.chain.tip_off_case_rows`) the worse of landing on
    it and tipping over its edge onto the deck (the response, then the utilisation,
    :func:`~droprig.solver.chain.tilted_governs`), the tip-off alone with the drop
    point off the pad; where the drop height is at most the tip-off's Δ
    (:func:`~droprig.solver.chain.tip_off_case_rows`) the ordinary case, with the
    allowable heights of both in ``merged``. The calculation trace and the
    time-history verification read the same one."""
    landing, chain, out = _landing_cases(fm, project, load, geo, v_hoist, None)
    rows, delta, top, reach = chain_mod.tip_off_case_rows(
        Drop(fm, project, geo, (load,), np.zeros(1, dtype=np.int64), False,
             v_hoist=v_hoist))
    if rows.size == 0:
        return GoverningPoint(landing, chain, None, False, False, {}, out)
    t_landing, t_chain, tip = _landing_cases(fm, project, load, geo, v_hoist, delta)
    merged = chain_mod.merge_tip_off(out, tip, top, reach)
    if not bool(reach[0]):
        # the drop height at most Δ: the load does not reach the deck by tipping; the
        # point's case is the ordinary one, its allowable heights the lower of the two
        return GoverningPoint(landing, chain, None, False, False, {}, merged,
                              {"on_pad": out, "tip_off": tip})
    on_pad = bool(out["protection"][0] >= 0)
    governs = not on_pad or bool(tilted_governs(out, tip)[0])
    turn = chain_mod.tip_off_turn(t_chain.drop)
    cases = {"on_pad": out, "tip_off": tip}
    if governs:
        return GoverningPoint(t_landing, t_chain, turn, True, on_pad, cases, merged)
    return GoverningPoint(landing, chain, turn, False, on_pad, cases, merged)


def _outputs(fm: FloorModel, project: Project, load: LiftLoad | Sequence[LiftLoad],
             geo: Geometry, load_index: np.ndarray | None, H: np.ndarray | None = None,
             mat_k: np.ndarray | None = None, v_hoist: float = 0.0,
             trial: bool = False, keep: bool = False,
             outcomes_only: bool = False) -> dict[str, np.ndarray]:
    """The outputs of the flat landing, or with the project setting
    ``tilted_landing`` of both landings merged, the worse governing
    (:func:`~droprig.solver.chain.merge_landings`). The height-free steps
    (:data:`~droprig.solver.chain.HEIGHT_FREE`) are taken from ``geo``'s kept ones
    where they were kept for this run's loads and rows (:class:`KeptSteps`), and with
    ``keep`` kept with ``geo`` for later runs. ``outcomes_only``: a run of the outcome
    stage (:class:`~droprig.solver.chain.Drop`).

    A footprint partly on a crushable pad (:func:`~droprig.solver.chain.tip_off_case_rows`):
    the worse of landing on it and tipping over its edge onto the deck
    (:func:`~droprig.solver.chain.merge_tip_off`), a second run on those rows. Where
    the drop point is off the pad and the drop height above Δ the tip-off is the
    point's only case (``merge_tip_off`` keeps none of the ordinary run there): those
    rows are run as the tip-off within the ordinary run (``Drop.tip_off`` NaN on the
    other rows, :func:`~droprig.solver.chain._folded_inputs`), each row's numbers those
    of a run of its case alone."""
    n = geo.x.size
    li = np.zeros(n, dtype=np.int64) if load_index is None else np.asarray(load_index)
    loads = _loads(load)
    kept = geo.cache.get("steps")
    by_landing: dict[str, dict[type, object]] = {}
    rows, delta, top, reach = chain_mod.tip_off_case_rows(
        Drop(fm, project, geo, loads, li, False, H, mat_k))
    fold: np.ndarray | None = None
    if rows.size:
        only = reach & (np.asarray(geo.protection)[rows] < 0)
        if only.any():
            fold = np.full(n, np.nan)
            fold[rows[only]] = delta[only]
            rows, delta, top, reach = rows[~only], delta[~only], top[~only], reach[~only]

    if rows.size and kept is None and n + rows.size <= large_job_block():
        # no kept steps to take: the tip-off rows ride in the ordinary run (a run no
        # longer than a large job's block: the memory of a block in flight stays
        # what LARGE_JOB_SHARE allows)
        out, tip, steps = _with_tip_rows(fm, project, loads, geo, li, rows, delta, fold, H,
                                         mat_k, v_hoist, trial, outcomes_only)
        if keep and mat_k is None:
            # the ordinary rows' (the first n of the run's)
            geo.cache["steps"] = KeptSteps.of(loads, li[np.r_[np.arange(n), rows]],
                                              steps).per_point(lambda a: a[:n])
        return _merged_tip_rows(out, rows, tip, top, reach)

    def run(landing: str) -> dict[str, np.ndarray]:
        given = kept.given(loads, li, landing, mat_k) if kept is not None else None
        c = run_chain(Drop(fm, project, geo, loads, li, False, H, mat_k, v_hoist=v_hoist,
                           landing=landing, trial=trial, outcomes_only=outcomes_only,
                           tip_off=fold), given)
        if keep:
            by_landing[landing] = {t: c[t] for t in HEIGHT_FREE.values() if t in c}
        return outputs(c)

    out = run("flat")
    if fm.settings.tilted_landing:
        out = merge_landings(out, run("tilted"))
    if keep and mat_k is None:
        geo.cache["steps"] = KeptSteps.of(loads, li, by_landing)
    if rows.size:
        tip = _tip_off_run(fm, project, loads, geo, li, rows, delta, H, mat_k, v_hoist,
                           trial, outcomes_only)
        out = _merged_tip_rows(out, rows, tip, top, reach)
    return out


def _merged_tip_rows(out: dict[str, np.ndarray], rows: np.ndarray,
                     tip: dict[str, np.ndarray], top: np.ndarray, reach: np.ndarray
                     ) -> dict[str, np.ndarray]:
    """``out`` with its ``rows`` replaced by their merge with the tip-off case ``tip``
    (:func:`droprig.solver.chain.merge_tip_off`; ``top``, ``reach`` as there); the
    arrays changed are copies, ``out``'s own are not written into."""
    merged = chain_mod.merge_tip_off({k: v[rows] for k, v in out.items()}, tip, top, reach)
    for k, v in merged.items():
        out[k] = out[k].copy()
        out[k][rows] = v
    return out


def _with_tip_rows(fm: FloorModel, project: Project, loads: tuple[LiftLoad, ...],
                   geo: Geometry, li: np.ndarray, rows: np.ndarray, delta: np.ndarray,
                   fold: np.ndarray | None, H: np.ndarray | None, mat_k: np.ndarray | None,
                   v_hoist: float, trial: bool, outcomes_only: bool
                   ) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray],
                              dict[str, dict[type, object]]]:
    """The ordinary run at every point of ``geo`` and the tip-off case at its points
    ``rows`` (Δ ``delta``, m) in one run of the chain: the ``rows`` repeated after the
    ``n`` points, ``Drop.tip_off`` Δ there and ``fold`` (NaN: the ordinary case) at
    the points (:func:`~droprig.solver.chain._folded_inputs`). Every step works row
    by row, so each row's numbers are those of a run of its case alone
    (:func:`_outputs`, :func:`_tip_off_run`: the plain form, two runs); one run
    instead of two halves the searches' rounds (each round's cost is mostly fixed).
    Returns the ordinary outputs (n rows) and the tip-off's (``rows``), each the flat
    landing or both merged, and the run's height-free steps by landing (the n points,
    then ``rows``)."""
    n = geo.x.size
    # the load-independent actions and masses worked out on geo itself (kept with it
    # for later runs at its points) and taken along to the longer run
    unit_actions(fm, geo)
    point_masses(fm, geo)
    both = np.r_[np.arange(n), rows]
    g2 = take_geo(geo, both, steps=False)
    tip_all = np.full(n, np.nan) if fold is None else np.asarray(fold, float)
    tip_all = np.r_[tip_all, delta]

    def pick(a: np.ndarray | None) -> np.ndarray | None:
        return None if a is None else np.asarray(a)[both]

    by_landing: dict[str, dict[type, object]] = {}

    def run(landing: str) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray]]:
        c = run_chain(Drop(fm, project, g2, loads, li[both], False, pick(H), pick(mat_k),
                           v_hoist=v_hoist, landing=landing, trial=trial,
                           outcomes_only=outcomes_only, tip_off=tip_all))
        by_landing[landing] = {t: c[t] for t in HEIGHT_FREE.values() if t in c}
        o = outputs(c)
        return {k: v[:n] for k, v in o.items()}, {k: v[n:] for k, v in o.items()}

    out, tip = run("flat")
    if fm.settings.tilted_landing:
        out_t, tip_t = run("tilted")
        out, tip = merge_landings(out, out_t), merge_landings(tip, tip_t)
    return out, tip, by_landing


def _tip_off_run(fm: FloorModel, project: Project, loads: tuple[LiftLoad, ...],
                 geo: Geometry, li: np.ndarray, rows: np.ndarray, delta: np.ndarray,
                 H: np.ndarray | None, mat_k: np.ndarray | None, v_hoist: float,
                 trial: bool, outcomes_only: bool) -> dict[str, np.ndarray]:
    """The outputs of the tip-off case (``Drop.tip_off`` = ``delta``, m) at the points
    ``rows`` of ``geo`` (:func:`_outputs`): the flat landing, or both merged."""
    sub = take_geo(geo, rows, steps=False)

    def pick(a: np.ndarray | None) -> np.ndarray | None:
        return None if a is None else np.asarray(a)[rows]

    def run_tip(landing: str) -> dict[str, np.ndarray]:
        return outputs(run_chain(Drop(fm, project, sub, loads, li[rows], False, pick(H),
                                      pick(mat_k), v_hoist=v_hoist, landing=landing,
                                      trial=trial, outcomes_only=outcomes_only,
                                      tip_off=delta)))

    tip = run_tip("flat")
    if fm.settings.tilted_landing:
        tip = merge_landings(tip, run_tip("tilted"))
    return tip


def evaluate_case(fm: FloorModel, project: Project, load: LiftLoad | Sequence[LiftLoad],
                  geo: Geometry, load_index: np.ndarray | None = None,
                  H: np.ndarray | None = None, mat_k: np.ndarray | None = None, *,
                  v_hoist: float = 0.0, trial: bool = False,
                  keep: bool = False, outcomes_only: bool = False
                  ) -> dict[str, np.ndarray]:
    """The :class:`~droprig.solver.results.CaseResult` arrays of ``load`` at the points
    of ``geo`` under their field names, and ``F_allow`` (N, the elastic allowed force).

    ``load`` may be a sequence of loads with ``load_index`` naming the load of each
    point (several cases in one vectorised pass). ``H`` and ``mat_k``: per-point trial
    drop heights and mats; ``v_hoist``: the hoist's lowering speed at release, m/s;
    ``trial``: a forward run of a condition tried (:class:`~droprig.solver.chain.Drop`);
    ``keep``: keep the height-free step results with ``geo`` for the trials at its
    points (:class:`~droprig.solver.geometry.KeptSteps`; one block only — a larger run
    keeps none); ``outcomes_only``: the outcome stage's run, its plastic heights and
    allowable masses not worked out (NaN; :class:`~droprig.solver.chain.Drop`)."""
    n = geo.x.size
    memory.keep_freed_memory()
    if n == 0:
        return {k: np.zeros(0, dtype=np.int64 if k in _INTS else bool if k in _BOOLS
                            else float) for k in OUTPUTS}
    chunk = loadpath_chunk()
    with np.errstate(all="ignore"):
        if n <= chunk:
            if trial and not keep:
                once = _distinct_rows(geo, load_index, H, mat_k)
                if once is not None:
                    # a trial's repeated rows (the same point, load, height and mat)
                    # run once: every step works row by row
                    u, back = once
                    r = _outputs(fm, project, load, take_geo(geo, u),
                                 None if load_index is None else np.asarray(load_index)[u],
                                 None if H is None else np.asarray(H)[u],
                                 None if mat_k is None else np.asarray(mat_k)[u], v_hoist,
                                 trial, False, outcomes_only)
                    return {k: v[back] for k, v in r.items()}
            return _outputs(fm, project, load, geo, load_index, H, mat_k, v_hoist, trial,
                            keep, outcomes_only)

        def block(s: int, e: int) -> list[dict[str, np.ndarray]]:
            sl = slice(s, e)
            li = None if load_index is None else load_index[sl]
            sub = geo.cache.get(("slice", s))
            if sub is None:
                sub = slice_geo(geo, sl)
                if n <= CACHE_MAX_POINTS:  # keep per-point actions for the next load
                    geo.cache[("slice", s)] = sub
            with np.errstate(all="ignore"):
                return [_outputs(fm, project, load, sub, li,
                                 None if H is None else H[sl],
                                 None if mat_k is None else mat_k[sl], v_hoist, trial,
                                 outcomes_only=outcomes_only)]

        li0 = None if load_index is None else load_index[:1]
        probe = _outputs(fm, project, load, slice_geo(geo, slice(0, 1)), li0,
                         None if H is None else H[:1],
                         None if mat_k is None else mat_k[:1], v_hoist, trial,
                         outcomes_only=outcomes_only)
        return _blockwise(n, 1, chunk, block, probe)


DISTINCT_SHARE = 0.97
"""A trial run's rows are run once each (:func:`_distinct_rows`) where at most this
share of them is distinct: below 3 % repeats the taking of the rows costs about what
it saves."""


def _distinct_rows(geo: Geometry, load_index: np.ndarray | None, H: np.ndarray | None,
                   mat_k: np.ndarray | None) -> tuple[np.ndarray, np.ndarray] | None:
    """The rows of a run that differ in what the chain reads of a row — the point (x,
    y, its bay, protection and opening), the load index, the trial height ``H`` and
    mat ``mat_k`` — as ``(u, back)``: ``u`` the first row of each kind, in order, and
    ``back`` per row its position in ``u`` (row i's outputs are those of row
    ``u[back[i]]``); ``None`` where more than :data:`DISTINCT_SHARE` of the rows are
    distinct. Equal rows are equal bit for bit (the same geometry of the same point)."""
    n = geo.x.size
    cols = [geo.x, geo.y, np.asarray(geo.bay, float), np.asarray(geo.protection, float),
            np.asarray(geo.opening, float)]
    for a in (load_index, H, mat_k):
        if a is not None:
            cols.append(np.asarray(a, float))
    rows = np.ascontiguousarray(np.stack(cols, axis=1))
    keys = rows.view(np.dtype((np.void, rows.dtype.itemsize * rows.shape[1]))).ravel()
    _, first, inv = np.unique(keys, return_index=True, return_inverse=True)
    if first.size > DISTINCT_SHARE * n:
        return None
    order = np.argsort(first)
    rank = np.empty_like(order)
    rank[order] = np.arange(order.size)
    return first[order], rank[inv.ravel()]


def _blockwise(n: int, n_sets: int, chunk: int,
               block: Callable[[int, int], list[dict[str, np.ndarray]]],
               probe: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """Outputs of ``n_sets`` sets of ``n`` rows (set-major) computed block by block on
    all cores: ``block(s, e)`` returns each set's arrays for rows s..e. The outputs are
    allocated by the calling thread, their fields and types taken from ``probe`` (its
    heap is reused from one large job to the next; memory first touched in a worker's
    heap is not)."""
    out = {k: np.empty((n_sets * n, *v.shape[1:]), dtype=v.dtype) for k, v in probe.items()}

    def run(s: int, e: int) -> None:
        for j, part in enumerate(block(s, e)):
            for k, v in part.items():
                out[k][j * n + s:j * n + e] = v

    for_blocks(run, n, chunk)
    return out


def loadpath_chunk() -> int:
    """Points per block of the vectorised evaluation (cache-sized)."""
    return int(loadpath.CHUNK)


LARGE_JOB_SHARE = 0.75
"""A job of more than :data:`CACHE_MAX_POINTS` points (:func:`evaluate_points`) runs in
blocks of this share of :func:`loadpath_chunk`: each block in flight holds some 2.7 kB
a point (its member actions, the chain's step results, the searches' temporaries) and
the results 0.3 kB a point, so that 10⁶ points on two cores stay within 500 MB
(benchmarks/bench_solver.py: 515–530 MB at the full block, 475–481 MB at ¾)."""


def large_job_block() -> int:
    """Points per block of a job of more than :data:`CACHE_MAX_POINTS` points."""
    return max(1, int(LARGE_JOB_SHARE * loadpath_chunk()))


def evaluate_points(fm: FloorModel, project: Project, loads: Sequence[LiftLoad],
                    x: np.ndarray, y: np.ndarray, *, v_hoist: float = 0.0,
                    load_index: np.ndarray | None = None,
                    outcomes_only: bool = False) -> dict[str, np.ndarray]:
    """Every load at every point, load by load ((len(loads)·n) rows, load-major):
    :func:`point_geometry` and :func:`evaluate_case` block by block on all cores,
    each block's load path and load-independent member actions shared by the loads.
    With ``load_index``, each point with its own load ``loads[load_index]`` instead
    (n rows, one chain run for all the loads). The path for large sets of points:
    nothing of the size of all points is kept but the results. Same values as the two
    functions called on all points. ``v_hoist``: the hoist's lowering speed at
    release, m/s; ``outcomes_only``: as :func:`evaluate_case`."""
    memory.keep_freed_memory()
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    n, nl = x.size, len(loads)
    if n == 0 or nl == 0:
        return evaluate_case(fm, project, list(loads), point_geometry(fm, project, x, y),
                             np.zeros(0, dtype=np.int64), v_hoist=v_hoist,
                             outcomes_only=outcomes_only)
    own = None if load_index is None else np.asarray(load_index, dtype=np.int64)
    sets = nl if own is None else 1

    def block(s: int, e: int) -> list[dict[str, np.ndarray]]:
        geo = point_geometry(fm, project, x[s:e], y[s:e])
        with np.errstate(all="ignore"):
            if own is not None:
                return [_outputs(fm, project, loads, geo, own[s:e], v_hoist=v_hoist,
                                 outcomes_only=outcomes_only)]
            return [_outputs(fm, project, ld, geo, None, v_hoist=v_hoist,
                             outcomes_only=outcomes_only) for ld in loads]

    size = loadpath_chunk() if n <= CACHE_MAX_POINTS else large_job_block()
    if n <= size:  # one block: no probe run for the output types
        parts = block(0, n)
        return {k: np.concatenate([p[k] for p in parts]) if sets > 1 else parts[0][k]
                for k in parts[0]}
    with np.errstate(all="ignore"):
        probe = _outputs(fm, project, loads if own is not None else loads[0],
                         point_geometry(fm, project, x[:1], y[:1]),
                         None if own is None else own[:1], v_hoist=v_hoist,
                         outcomes_only=outcomes_only)
    return _blockwise(n, sets, size, block, probe)


def point_masses(fm: FloorModel, geo: Geometry) -> None:
    """Work out and keep with ``geo`` the load-free masses per point that the chain's
    struck-mass step reads where it gives two forces
    (:data:`~droprig.solver.geometry.PER_POINT_MASSES`: the path's mass with the
    slab, the column-moved mass; kg), so that :func:`tile`, ``take_geo`` and
    ``concat_geo`` pass them on and a remembered point set keeps them."""
    if chain_mod.TWO_FORCES and fm.settings.include_member_mass:
        slab_path_mass_at(fm, geo)
        column_path_mass_at(fm, geo)


def distinct_geometry(fm: FloorModel, project: Project, x: np.ndarray,
                      y: np.ndarray) -> Geometry:
    """:func:`~droprig.solver.geometry.distinct_point_geometry` with the masses of
    :func:`point_masses` worked out once per distinct point (and kept with a
    remembered point set)."""
    return distinct_point_geometry(fm, project, x, y,
                                   prepare=lambda g: point_masses(fm, g))


def tile(fm: FloorModel, geo: Geometry, k: int) -> Geometry:
    """``geo`` repeated ``k`` times (one copy per load), with its load-independent
    member actions and masses (:func:`point_masses`) computed once and repeated
    alongside."""
    if k == 1:
        return geo
    ua = unit_actions(fm, geo)
    point_masses(fm, geo)
    p = geo.path
    path = PathResult(**{f: np.concatenate([getattr(p, f)] * k)
                         for f in p.__dataclass_fields__})
    out = Geometry(np.tile(geo.x, k), np.tile(geo.y, k), path, np.tile(geo.bay, k),
                   np.tile(geo.protection, k), np.tile(geo.opening, k))
    out.cache["ua"] = ua.tiled(k)
    for key in PER_POINT_MASSES:
        v = geo.cache.get(key)
        if v is not None:
            out.cache[key] = np.tile(v, k)
    return out
