"""Load-independent data of a set of drop points: load path
(:func:`droprig.solver.loadpath.evaluate`), bay, protection area and deck opening.

SI units (m)."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from droprig.model import Project
from droprig.solver import droppoints, memory
from droprig.solver.floor import FloorModel
from droprig.solver.loadpath import PathResult
from droprig.solver.loadpath import evaluate as evaluate_path
from droprig.solver.reference import path_reference, reference_unit_actions
from droprig.solver.unit_actions import UnitActions

__all__ = ["Geometry", "concat_geo", "point_geometry", "slice_geo", "take_geo"]


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


def point_geometry(fm: FloorModel, project: Project, x: np.ndarray, y: np.ndarray, *,
                   reference: bool = False) -> Geometry:
    """Load path and plan attributes of drop points (bay, protection area, opening).
    The load path by the fast kernel (:func:`droprig.solver.loadpath.evaluate`), or
    with ``reference`` by the plain formulas
    (:func:`droprig.solver.reference.path_reference`; the calculation trace), and then
    the member actions too (:func:`droprig.solver.reference.reference_unit_actions`,
    kept for the chain in place of the kernel's)."""
    memory.keep_freed_memory()
    x = np.asarray(x, float)
    y = np.asarray(y, float)
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


def slice_geo(geo: Geometry, sl: slice) -> Geometry:
    p = geo.path
    path = PathResult(**{f: getattr(p, f)[sl] for f in p.__dataclass_fields__})
    return Geometry(geo.x[sl], geo.y[sl], path, geo.bay[sl], geo.protection[sl],
                    geo.opening[sl])




def take_geo(geo: Geometry, idx: np.ndarray) -> Geometry:
    """The points ``idx`` of ``geo`` (rows in that order), with the load-independent
    member actions taken along where ``geo`` has them: the same values as
    :func:`point_geometry` and :func:`~droprig.solver.unit_actions.unit_actions` at
    those points, without working them out again (every quantity is per point)."""
    p = geo.path
    path = PathResult(**{f: getattr(p, f)[idx] for f in p.__dataclass_fields__})
    out = Geometry(geo.x[idx], geo.y[idx], path, geo.bay[idx], geo.protection[idx],
                   geo.opening[idx])
    ua = geo.cache.get("ua")
    if ua is not None:
        out.cache["ua"] = ua.take(idx)
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
    return out
