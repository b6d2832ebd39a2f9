"""Load-independent data of a set of drop points: load path
(:func:`droprig.solver.loadpath.evaluate`), bay, protection area and deck opening.

SI units (m)."""

from __future__ import annotations

import threading
from collections import OrderedDict
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field, fields, replace

import numpy as np

from droprig.model import LiftLoad, Project
from droprig.solver import droppoints, memory
from droprig.solver.floor import FloorModel
from droprig.solver.loadpath import PathResult
from droprig.solver.loadpath import evaluate as evaluate_path
from droprig.solver.reference import path_reference, reference_unit_actions
from droprig.solver.unit_actions import UnitActions, unit_actions

__all__ = ["KEPT_POINTS", "LOAD_FREE", "PER_POINT_MASSES", "Geometry", "KeptSteps", "concat_geo",
           "distinct_point_geometry", "point_geometry", "slice_geo", "take_geo"]


@dataclass(frozen=True, eq=False)
class Geometry:
    """Load-independent data of a set of drop points."""

    x: np.ndarray
    y: np.ndarray
    path: PathResult
    bay: np.ndarray
    protection: np.ndarray
    opening: np.ndarray
    cache: dict = field(default_factory=dict, repr=False)


def _rows(result: object, pick: Callable[[np.ndarray], np.ndarray], n: int) -> object:
    """A step result (a frozen dataclass of per-point arrays) with ``pick`` applied to
    every array field; each must hold one row per point (``n``) along its first axis."""
    change = {}
    for f in fields(result):  # type: ignore[arg-type]
        v = getattr(result, f.name)
        if isinstance(v, np.ndarray):
            if v.ndim == 0 or v.shape[0] != n:
                raise ValueError(f"{type(result).__name__}.{f.name}: not one row per point")
            change[f.name] = pick(v)
    return replace(result, **change)  # type: ignore[type-var]


def _hard_free(loads: Sequence[LiftLoad]) -> tuple[LiftLoad, ...]:
    return tuple(ld if ld.hard is False else replace(ld, hard=False) for ld in loads)


@dataclass(frozen=True, eq=False)
class KeptSteps:
    """The results of the chain's height-free steps
    (:data:`droprig.solver.chain.HEIGHT_FREE`) at the points of a geometry, row for
    row, kept with it by the analysis run that worked them out: the loads of that run
    (``loads``, their hardness set aside: those steps do not read it), each row's load
    index ``li``, and per landing (``flat``, ``tilted``) the results by type. A later
    run at the same rows, loads and landing with no trial mat takes them
    (:meth:`given`) instead of working them out again at its own drop height."""

    loads: tuple[LiftLoad, ...]
    li: np.ndarray
    by_landing: dict[str, dict[type, object]]

    @staticmethod
    def of(loads: Sequence[LiftLoad], li: np.ndarray,
           by_landing: dict[str, dict[type, object]]) -> KeptSteps:
        return KeptSteps(_hard_free(loads), np.asarray(li), by_landing)

    def given(self, loads: Sequence[LiftLoad], li: np.ndarray, landing: str,
              mat_k: np.ndarray | None) -> dict[type, object] | None:
        """The kept results for a run of ``loads[li]`` on ``landing`` (``None`` where
        the run is not the kept one's: other loads or rows, or a trial mat laid)."""
        got = self.by_landing.get(landing)
        if got is None or mat_k is not None or li.shape != self.li.shape \
                or _hard_free(loads) != self.loads or not np.array_equal(li, self.li):
            return None
        return got

    def per_point(self, pick: Callable[[np.ndarray], np.ndarray]) -> KeptSteps:
        """These results with ``pick`` applied to every per-point array."""
        n = self.li.size
        return KeptSteps(self.loads, pick(self.li),
                         {k: {t: _rows(r, pick, n) for t, r in d.items()}
                          for k, d in self.by_landing.items()})

    @staticmethod
    def concat(parts: Sequence[KeptSteps]) -> KeptSteps | None:
        """The results of several sets of points one after the other (``None`` where
        they were kept for other loads, landings or steps)."""
        first = parts[0]
        if any(p.loads != first.loads or p.by_landing.keys() != first.by_landing.keys()
               or any(p.by_landing[k].keys() != first.by_landing[k].keys()
                      for k in first.by_landing) for p in parts):
            return None
        by: dict[str, dict[type, object]] = {}
        for k, d in first.by_landing.items():
            by[k] = {}
            for t, r in d.items():
                rs = [p.by_landing[k][t] for p in parts]
                change = {}
                for f in fields(r):  # type: ignore[arg-type]
                    vs = [getattr(x, f.name) for x in rs]
                    if all(isinstance(v, np.ndarray) for v in vs):
                        change[f.name] = np.concatenate(vs)
                    elif any(isinstance(v, np.ndarray) for v in vs):
                        return None  # an array in some parts only (None in others)
                by[k][t] = replace(r, **change)  # type: ignore[type-var]
        return KeptSteps(first.loads, np.concatenate([p.li for p in parts]), by)


PER_POINT_MASSES = ("slab_path_mass", "column_path_mass")
"""Entries of ``Geometry.cache`` that are one float per point and depend on the points
and the prepared floor only: the path's Rayleigh mass with the slab
(:func:`droprig.solver.chain.slab_path_mass`) and the mass the columns' shortening
moves (:func:`droprig.solver.chain.column_path_mass`), kg. :func:`take_geo` and
:func:`concat_geo` carry them row for row (the same values as working them out at
those points: each is per point)."""

LOAD_FREE = ("ua", "struck_member_table", *PER_POINT_MASSES)
"""Entries of ``Geometry.cache`` that depend on the points and the prepared floor only
(the member actions, the struck member's table, :data:`PER_POINT_MASSES`), never on a
load, a drop height or the settings outside the floor: kept with a remembered point
set (:func:`point_geometry`)."""

KEPT_POINTS = 16_000
"""Drop points whose geometry a prepared floor remembers, over all its point sets
(about 1.2 kB a point with its member actions: ~20 MB a floor, and
``floor._FLOORS_MAX`` floors; the oldest set is forgotten first). A set larger than
half of this is never kept: a large job's blocks would only fill the memory. The
demo projects' analyses use 4,700–8,400 points in 10–13 sets a floor."""

_KEPT_LOCK = threading.Lock()


class _KeptCache(dict):
    """``Geometry.cache`` of a remembered point set: starts with the set's
    :data:`LOAD_FREE` entries, and a :data:`LOAD_FREE` entry written to it is kept
    for the set's next geometry too. Every other entry (the chain's kept steps,
    slices) stays with this geometry alone."""

    def __init__(self, kept: dict) -> None:
        super().__init__(kept)
        self._kept = kept

    def __setitem__(self, key: object, value: object) -> None:
        super().__setitem__(key, value)
        if key in LOAD_FREE:
            self._kept[key] = value


def point_geometry(fm: FloorModel, project: Project, x: np.ndarray, y: np.ndarray, *,
                   reference: bool = False) -> Geometry:
    """Load path and plan attributes of drop points (bay, protection area, opening).
    The load path by the fast kernel (:func:`droprig.solver.loadpath.evaluate`), or
    with ``reference`` by the plain formulas
    (:func:`droprig.solver.reference.path_reference`; the calculation trace), and then
    the member actions too (:func:`droprig.solver.reference.reference_unit_actions`,
    kept for the chain in place of the kernel's).

    The kernel's answer for a set of points is remembered by the prepared floor
    ``fm`` (keyed by the points' exact coordinates and the project's protection
    areas, :data:`KEPT_POINTS` at most), with the :data:`LOAD_FREE` results later
    worked out for it (:func:`~droprig.solver.unit_actions.unit_actions`): a
    re-analysis of the same zone after an edit that leaves the floor and the drop
    points as they were (a load, a height, a setting the floor does not hold) takes
    them instead of working them out again. The arrays are shared, never written."""
    memory.keep_freed_memory()
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    if reference or 2 * x.size > KEPT_POINTS:
        return _point_geometry(fm, project, x, y, reference=reference)
    key = (project.protection_areas, x.tobytes(), y.tobytes())
    with _KEPT_LOCK:
        kept = fm._memo.setdefault("point_geometry", OrderedDict())
        got = kept.get(key)
        if got is not None:
            kept.move_to_end(key)
    if got is not None:
        g, load_free = got
        return Geometry(g.x, g.y, g.path, g.bay, g.protection, g.opening,
                        _KeptCache(load_free))
    # (copies: the caller's arrays are its own to change)
    geo = _point_geometry(fm, project, x.copy(), y.copy(), reference=False)
    extra: dict = {}
    out = Geometry(geo.x, geo.y, geo.path, geo.bay, geo.protection, geo.opening,
                   _KeptCache(extra))
    with _KEPT_LOCK:
        kept[key] = (geo, extra)
        total = sum(g.x.size for g, _ in kept.values())
        while total > KEPT_POINTS and len(kept) > 1:
            _, (old, _) = kept.popitem(last=False)
            total -= old.x.size
    return out


def _point_geometry(fm: FloorModel, project: Project, x: np.ndarray, y: np.ndarray, *,
                    reference: bool) -> Geometry:
    """:func:`point_geometry` worked out afresh."""
    with_mass = fm.settings.include_member_mass
    path = (path_reference(fm.frame, x, y, with_mass=with_mass) if reference
            else evaluate_path(fm.frame, x, y, with_mass=with_mass))
    bay = droppoints.bay_index(fm.level, x, y)
    prot = -np.ones(x.shape, dtype=np.int64)
    for i in range(len(project.protection_areas) - 1, -1, -1):
        pa = project.protection_areas[i]
        if pa.level_id != fm.level.id:
            continue
        r = pa.area
        # the same edge tolerance as the zone and the bays: a pad laid to a grid line
        # or the deck edge covers the points refined onto that line
        tol = droppoints.EDGE_TOL
        inside = (x >= r.x0 - tol) & (x <= r.x1 + tol) & (y >= r.y0 - tol) & \
            (y <= r.y1 + tol)
        prot[inside] = i
    opening = droppoints.in_openings(fm.level, x, y)
    geo = Geometry(x, y, path, bay, prot, opening)
    if reference and fm.tables is not None:
        geo.cache["ua"] = reference_unit_actions(fm, path)
    return geo


def distinct_point_geometry(fm: FloorModel, project: Project, x: np.ndarray,
                            y: np.ndarray,
                            prepare: Callable[[Geometry], object] | None = None
                            ) -> Geometry:
    """:func:`point_geometry` of points among which some repeat (the same x and y: the
    lattices of several trials refined around one worst point, or of several loads
    around one point), with the load path and the member actions
    (:func:`~droprig.solver.unit_actions.unit_actions`) of each distinct point worked
    out once and taken for its repeats (:func:`take_geo`): the same values, row for
    row (both are per point). ``prepare``: called on the geometry of the distinct
    points before it is taken for the repeats (to work out more per-point entries of
    its cache once, :data:`PER_POINT_MASSES`)."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    _, first, inv = np.unique(x + 1j * y, return_index=True, return_inverse=True)
    if first.size == x.size:
        geo = point_geometry(fm, project, x, y)
        if prepare is not None:
            prepare(geo)
        return geo
    geo = point_geometry(fm, project, x[first], y[first])
    unit_actions(fm, geo)
    if prepare is not None:
        prepare(geo)
    return take_geo(geo, inv.ravel())


def slice_geo(geo: Geometry, sl: slice) -> Geometry:
    p = geo.path
    path = PathResult(**{f: getattr(p, f)[sl] for f in p.__dataclass_fields__})
    return Geometry(geo.x[sl], geo.y[sl], path, geo.bay[sl], geo.protection[sl],
                    geo.opening[sl])




def take_geo(geo: Geometry, idx: np.ndarray, *, steps: bool = True,
             actions: bool = True) -> Geometry:
    """The points ``idx`` of ``geo`` (rows in that order), with the load-independent
    member actions taken along where ``geo`` has them (``actions``): the same values
    as :func:`point_geometry` and :func:`~droprig.solver.unit_actions.unit_actions`
    at those points, without working them out again (every quantity is per point);
    with ``steps``, the chain's height-free step results kept with ``geo``
    (:class:`KeptSteps`) too."""
    idx = np.asarray(idx)
    if idx.dtype == bool:
        idx = np.flatnonzero(idx)

    def rows(a: np.ndarray) -> np.ndarray:  # a[idx]; take copies whole rows faster
        return np.take(a, idx, axis=0)

    p = geo.path
    path = PathResult(**{f: rows(getattr(p, f)) for f in p.__dataclass_fields__})
    out = Geometry(rows(geo.x), rows(geo.y), path, rows(geo.bay), rows(geo.protection),
                   rows(geo.opening))
    ua = geo.cache.get("ua")
    if ua is not None and actions:
        out.cache["ua"] = ua.take(idx)
    for key in PER_POINT_MASSES:
        v = geo.cache.get(key)
        if v is not None and v.shape == geo.x.shape:
            out.cache[key] = rows(v)
    kept = geo.cache.get("steps")
    if steps and kept is not None:
        out.cache["steps"] = kept.per_point(rows)
    return out


def concat_geo(parts: list[Geometry]) -> Geometry:
    """The points of ``parts`` one after the other, with their member actions where
    every part has them (and their candidate layouts agree)."""
    if len(parts) == 1:
        return parts[0]
    paths = [g.path for g in parts]
    path = PathResult(**{f: np.concatenate([getattr(p, f) for p in paths])
                         for f in paths[0].__dataclass_fields__})
    def cat(name: str) -> np.ndarray:
        return np.concatenate([getattr(g, name) for g in parts])

    out = Geometry(cat("x"), cat("y"), path, cat("bay"), cat("protection"), cat("opening"))
    uas = [g.cache.get("ua") for g in parts]
    if all(u is not None for u in uas):
        ua = UnitActions.concat([u for u in uas if u is not None])
        if ua is not None:
            out.cache["ua"] = ua
    for key in PER_POINT_MASSES:
        vs = [g.cache.get(key) for g in parts]
        if all(v is not None and v.shape == g.x.shape for v, g in zip(vs, parts, strict=True)):
            out.cache[key] = np.concatenate(vs)  # type: ignore[arg-type]
    kept = [g.cache.get("steps") for g in parts]
    if all(k is not None for k in kept):
        both = KeptSteps.concat([k for k in kept if k is not None])
        if both is not None:
            out.cache["steps"] = both
    return out
