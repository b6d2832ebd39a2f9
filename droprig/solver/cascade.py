"""The level below a struck deck: which level it is, and how fast an object that
perforated the deck arrives on it.

SI units: m, m/s. Kinematics only (uniform acceleration, no drag): an object
leaving the soffit at the residual speed V_r (``local_damage.residual_velocity``)
falls the clear height Δ from the soffit to the top of the level below and
strikes it at V = √(V_r² + 2gΔ), the same as a free fall from
h_eq = V²/(2g) = V_r²/(2g) + Δ. The lower level is then assessed with that
equivalent height and the object's own mass (the plug of concrete it pushes out
is neglected: it keeps more speed for the level below, conservative).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from droprig.model import Level, Project

__all__ = ["G", "clear_height_below", "equivalent_drop_height_below", "level_below"]

G = 9.80665
"""Standard gravity, m/s² (CGPM 1901; ISO 80000-3)."""


def _overlaps(a: Level, b: Level) -> bool:
    ea, eb = a.grid.extent, b.grid.extent
    return ea.x0 < eb.x1 and eb.x0 < ea.x1 and ea.y0 < eb.y1 and eb.y0 < ea.y1


def level_below(project: Project, level_id: str) -> Level | None:
    """The level directly under ``level_id``: the highest level whose top of deck is
    lower than the struck level's soffit and whose column grid overlaps it in
    plan; ``None`` when the project has none (the level below is then unknown to
    droprig and is named only as an exclusion area)."""
    level = project.level(level_id)
    soffit = level.elevation - level.deck.thickness
    cands = [lv for lv in project.levels
             if lv.id != level_id and lv.elevation < soffit and _overlaps(lv, level)]
    return max(cands, key=lambda lv: lv.elevation) if cands else None


def clear_height_below(level: Level, below: Level) -> float:
    """Fall from the struck level's soffit to the top of the level below, m:
    Δ = (z_top − t_deck) − z_below."""
    return level.elevation - level.deck.thickness - below.elevation


def equivalent_drop_height_below(v_residual: ArrayLike, level: Level,
                                 below: Level) -> np.ndarray:
    """Free-fall height onto the level below that gives the same strike speed, m:
    h_eq = V_r²/(2g) + Δ (module docstring); V_r in m/s, ``nan`` where the deck
    was not perforated (no object reaches the level below)."""
    vr = np.asarray(v_residual, float)
    h = vr**2 / (2.0 * G) + clear_height_below(level, below)
    return np.where(vr > 0.0, h, np.nan)
