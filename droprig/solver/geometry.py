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
from droprig.solver.reference import path_reference

__all__ = ["Geometry", "point_geometry", "slice_geo"]


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
    (:func:`droprig.solver.reference.path_reference`; the calculation trace)."""
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
        inside = (x >= r.x0) & (x <= r.x1) & (y >= r.y0) & (y <= r.y1)
        prot[inside] = i
    opening = droppoints.in_openings(fm.level, x, y)
    return Geometry(x, y, path, bay, prot, opening)


def slice_geo(geo: Geometry, sl: slice) -> Geometry:
    p = geo.path
    path = PathResult(**{f: getattr(p, f)[sl] for f in p.__dataclass_fields__})
    return Geometry(geo.x[sl], geo.y[sl], path, geo.bay[sl], geo.protection[sl],
                    geo.opening[sl])


