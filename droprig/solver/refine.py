"""The drop points of a lift zone: every load at the zone's base points
(:func:`droprig.solver.droppoints.base_points`), then local refinement around the
worst points of each bay (:data:`REFINE_PASSES` passes, spacing ÷4 each).

SI units (m)."""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING

import numpy as np

from droprig.model import LiftZone, Project
from droprig.solver import droppoints, evaluate
from droprig.solver.evaluate import tile
from droprig.solver.floor import FloorModel
from droprig.solver.geometry import (
    Geometry,
    concat_geo,
    point_geometry,
)
from droprig.solver.results import severity

if TYPE_CHECKING:
    from droprig.solver.outcome_rows import OutcomeRows

__all__ = ["REFINE_PASSES", "REFINE_TOP", "severity", "zone_points", "zone_points_geometry"]

REFINE_PASSES = 3
"""Local refinement passes around the worst points of each bay (spacing ÷4 each)."""
REFINE_TOP = (2, 1, 1)
"""Points per bay and load around which each pass refines."""


def _refine(fm: FloorModel, zone: LiftZone, res: dict[str, np.ndarray],
            step: float, n_top: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Points on a 5 × 5 lattice of spacing ``step`` around the worst points of
    each bay for each load — the most severe (:func:`severity`) and those with the
    least allowable drop height (the hook limits and mats come from that least
    height: where a yielding slab makes a point less severe than a brittle one
    elsewhere, the least height need not lie at the most severe point) — moved into
    the zone where they fall outside it, kept where they lie over a deck panel.
    Returns x, y and the load index of each."""
    sev = severity(res["utilisation"], res["response"])
    finite = np.isfinite(res["utilisation"])
    bay = res["bay"]
    li = res["load_index"]
    # worst n_top points per (load, bay): sort by group then severity
    group = li * (int(bay.max(initial=0)) + 2) + (bay + 1)
    cand = np.flatnonzero(finite)
    if cand.size == 0:
        return np.zeros(0), np.zeros(0), np.zeros(0, dtype=np.int64)
    top = _top_per_group(sev, group, cand, n_top)
    h = res.get("allowable_drop_height")
    if h is not None:
        low = np.flatnonzero(finite & np.isfinite(h))
        if low.size:
            top = np.union1d(top, _top_per_group(-h, group, low, n_top))
    off = np.arange(-2, 3) * step
    OX, OY = np.meshgrid(off, off)
    x = (res["x"][top][:, None] + OX.ravel()[None, :]).ravel()
    y = (res["y"][top][:, None] + OY.ravel()[None, :]).ravel()
    lj = np.repeat(li[top], OX.size)
    # lattice points beyond the zone edge move onto it: the worst point often lies
    # on the edge nearest a stiff support
    x, y, keep = droppoints.into_zone_over_deck(fm.frame, zone, x, y)
    return x[keep], y[keep], lj[keep]


def _top_per_group(key: np.ndarray, group: np.ndarray, cand: np.ndarray,
                   n_top: int) -> np.ndarray:
    """The ``n_top`` rows of ``cand`` with the largest ``key`` in each group."""
    cand = cand[_top_candidates(key[cand], group[cand], n_top)]
    order = cand[np.lexsort((-key[cand], group[cand]))]
    g = group[order]
    first = np.r_[True, g[1:] != g[:-1]]
    start = np.maximum.accumulate(np.where(first, np.arange(g.size), 0))
    return order[(np.arange(g.size) - start) < n_top]


def _top_candidates(sev: np.ndarray, group: np.ndarray, n_top: int) -> np.ndarray:
    """Positions (ascending) of the points that can be among the ``n_top`` worst of
    their group: severity at least the group's ``n_top``-th distinct largest value
    (a superset of the top points, in the original order, so that sorting it gives the
    same top points as sorting everything)."""
    if sev.size <= 64:
        return np.arange(sev.size)
    G = int(group.max()) + 1
    floor = np.full(G, np.inf)
    keep = np.zeros(sev.size, dtype=bool)
    for _ in range(n_top):
        below = sev < floor[group]
        if not below.any():
            break
        gmax = np.full(G, -np.inf)
        np.maximum.at(gmax, group[below], sev[below])
        floor = np.where(gmax > -np.inf, gmax, floor)
        keep |= below & (sev >= floor[group])
    return np.flatnonzero(keep)


def _keys(x: np.ndarray, y: np.ndarray, li: np.ndarray) -> np.ndarray:
    """One complex key per (point, load), equal to 1e-7 m."""
    return (np.round(x, 7) + 1e5 * li) + 1j * np.round(y, 7)


_REFINE_KEYS = ("x", "y", "bay", "utilisation", "response", "load_index",
                "allowable_drop_height")
"""The fields :func:`_refine` reads (merged after every pass; the others once)."""


def _merge(parts: list[dict[str, np.ndarray]], keys: Sequence[str] | None = None,
           ) -> dict[str, np.ndarray]:
    """Rows of ``parts`` one after the other (all fields, or only ``keys``)."""
    if len(parts) == 1:
        return dict(parts[0]) if keys is None else {k: parts[0][k] for k in keys}
    return {k: np.concatenate([p[k] for p in parts]) for k in (keys or parts[0])}


def zone_points(fm: FloorModel, project: Project, zone: LiftZone,
                base: Geometry | tuple[np.ndarray, np.ndarray]) -> dict[str, np.ndarray]:
    """Evaluate every load of ``zone`` at the base points (a :class:`Geometry`, or x
    and y), then refine around each bay's worst points of each load
    (:data:`REFINE_PASSES` passes, spacing resolution/4, /16, …). ``load_index`` names the
    load of each row."""
    return zone_points_geometry(fm, project, zone, base)[0]


def zone_points_geometry(fm: FloorModel, project: Project, zone: LiftZone,
                         base: Geometry | tuple[np.ndarray, np.ndarray], *,
                         outcomes_only: bool = False, rows: OutcomeRows | None = None
                         ) -> tuple[dict[str, np.ndarray], Geometry | None]:
    """:func:`zone_points` and the geometry of its rows (row for row, with the
    load-independent member actions where they were kept), for the trials of
    :mod:`droprig.solver.confirm` to take their points from; ``None`` for a zone of
    more than :data:`~droprig.solver.evaluate.CACHE_MAX_POINTS` rows (loads × points;
    some 40 doubles a row are kept), whose geometry is not kept.

    ``outcomes_only``: the outcome stage (:func:`droprig.solver.analyse_outcomes`):
    the plastic heights and allowable masses are not worked out (NaN). The points are
    the same as a full run's: :func:`_refine` reads the elastic allowable height, the
    severity and the bays, which such a run works out as a full one does. ``rows``:
    the rows a previous edit worked out are taken from it
    (:class:`~droprig.solver.outcome_rows.OutcomeRows` of the same ``outcomes_only``;
    the same values); no geometry is returned then (the confirmation's trials work
    theirs out)."""
    if rows is not None and rows.outcomes_only != outcomes_only:
        raise ValueError("remembered rows of the other stage")
    loads = list(zone.loads)
    vh = zone.hoist_speed  # the load strikes at √(v_h² + 2gh) (local damage)
    nl = len(loads)
    bx, by = (base.x, base.y) if isinstance(base, Geometry) else base
    nb = bx.size
    li = np.repeat(np.arange(nl), nb)
    if rows is not None and (nb * nl > rows.max_rows // 2 or not rows.serves(fm)):
        rows = None  # a large zone (memory stays bounded), or rows not row by row
    if rows is not None:
        res = rows.evaluate(fm, project, loads, np.tile(bx, nl), np.tile(by, nl), li,
                            v_hoist=vh)
        geos: list[Geometry] | None = None
    elif nb <= evaluate.CACHE_MAX_POINTS:
        # all loads in one pass over the base points repeated once per load; the
        # load-independent actions are computed once and repeated with them
        geo = base if isinstance(base, Geometry) else point_geometry(fm, project, bx, by)
        geo = tile(fm, geo, nl)
        # the height-free steps are kept with the geometry for the trials
        # (confirm.py) at these points
        res = evaluate.evaluate_case(fm, project, loads, geo, li, v_hoist=vh, keep=True,
                                     outcomes_only=outcomes_only)
        geos = [geo]
    else:  # block by block, each block's path shared by the loads
        res = evaluate.evaluate_points(fm, project, loads, bx, by, v_hoist=vh,
                                       outcomes_only=outcomes_only)
        geos = None
    res["load_index"] = li
    step = fm.settings.grid_resolution
    known = np.sort(_keys(res["x"], res["y"], li))  # sorted: membership by bisection
    parts = [res]
    for k in range(REFINE_PASSES):
        step /= 4.0
        x, y, lj = _refine(fm, zone, res, step, REFINE_TOP[min(k, len(REFINE_TOP) - 1)])
        if x.size == 0:
            break
        keys, first = np.unique(_keys(x, y, lj), return_index=True)
        fresh = ~_in_sorted(known, keys)
        new = first[fresh]
        if new.size == 0:
            continue
        x, y, lj = x[new], y[new], lj[new]
        # merged into the sorted known keys (k is sorted: no sort of the whole again)
        known = np.insert(known, np.searchsorted(known, keys[fresh]), keys[fresh])
        if rows is not None:
            r2 = rows.evaluate(fm, project, loads, x, y, lj, v_hoist=vh)
        else:
            geo = evaluate.distinct_geometry(fm, project, x, y)  # a point refined per load
            r2 = evaluate.evaluate_case(fm, project, loads, geo, lj, v_hoist=vh, keep=True,
                                        outcomes_only=outcomes_only)
        r2["load_index"] = lj
        parts.append(r2)
        if geos is not None:
            geos.append(geo)
        res = _merge(parts, _REFINE_KEYS)
    if geos is None or sum(g.x.size for g in geos) > evaluate.CACHE_MAX_POINTS:
        return _merge(parts), None  # memory stays bounded: trials work theirs out
    return _merge(parts), concat_geo(geos)


def _in_sorted(sorted_keys: np.ndarray, keys: np.ndarray) -> np.ndarray:
    """``np.isin(keys, sorted_keys)`` for an already sorted ``sorted_keys`` (one
    bisection per key instead of sorting both arrays)."""
    if sorted_keys.size == 0:
        return np.zeros(keys.shape, dtype=bool)
    i = np.minimum(np.searchsorted(sorted_keys, keys), sorted_keys.size - 1)
    return sorted_keys[i] == keys


