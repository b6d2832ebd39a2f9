"""Protection pads and mats by area: what a pad gives depends on how much of the
load's footprint lands on it.

A crushable layer (timber-and-foam pad, honeycomb, EPS) crushes at a stress, not
at a force: its crushing force is the crush stress times the area that is
actually pressed — the overlap of the load's footprint and the pad. A footprint
half on a pad gets half the credit, however its centre falls. A spring mat
(rubber, timber crane mat on a soft layer) has stiffness E_c·A/t over the same
overlap (a layer in uniaxial compression, Gere §2.3 with the constrained modulus
of the mat material).

Rectangles are axis-aligned, (x0, y0, x1, y1) in m; vectorised over drop points.
SI units: m, m², Pa, N, N/m.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "crush_stress_from_force",
    "crushable_pad_force",
    "footprint_rect",
    "rect_overlap_area",
    "spring_mat_stiffness",
]


def footprint_rect(x: ArrayLike, y: ArrayLike, length: ArrayLike, width: ArrayLike,
                   along_x: bool = True) -> tuple[np.ndarray, np.ndarray, np.ndarray,
                                                  np.ndarray]:
    """Footprint rectangle (x0, y0, x1, y1) of a load centred at (x, y), m; its
    ``length`` along x (``along_x``) or along y."""
    x, y, L, B = np.broadcast_arrays(*(np.asarray(v, float) for v in (x, y, length, width)))
    hx, hy = (0.5 * L, 0.5 * B) if along_x else (0.5 * B, 0.5 * L)
    return x - hx, y - hy, x + hx, y + hy


def rect_overlap_area(a: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike],
                      b: tuple[ArrayLike, ArrayLike, ArrayLike, ArrayLike]) -> np.ndarray:
    """Area common to two axis-aligned rectangles, m²:
    max(0, min(x1) − max(x0))·max(0, min(y1) − max(y0)) (plane geometry)."""
    ax0, ay0, ax1, ay1 = (np.asarray(v, float) for v in a)
    bx0, by0, bx1, by1 = (np.asarray(v, float) for v in b)
    dx = np.maximum(0.0, np.minimum(ax1, bx1) - np.maximum(ax0, bx0))
    dy = np.maximum(0.0, np.minimum(ay1, by1) - np.maximum(ay0, by0))
    return dx * dy


def crushable_pad_force(crush_stress: ArrayLike, overlap_area: ArrayLike) -> np.ndarray:
    """Crushing force of a pad under the part of the footprint on it, N:
    F_c = σ_c·A_overlap (plateau stress of a crushable layer times the pressed
    area; Gibson & Ashby, *Cellular Solids* 2nd ed. 1997, ch. 5 plateau stress —
    from memory). No overlap: no credit (F_c = 0)."""
    return np.asarray(crush_stress, float) * np.asarray(overlap_area, float)


def spring_mat_stiffness(modulus: ArrayLike, thickness: ArrayLike,
                         overlap_area: ArrayLike) -> np.ndarray:
    """Stiffness of a mat layer under the pressed area, N/m: k = E_c·A/t (a layer in
    uniaxial compression, Gere §2.3; E_c the mat's compression modulus in Pa, t in
    m). No overlap: 0 (the mat does not act)."""
    E, t, A = np.broadcast_arrays(*(np.asarray(v, float) for v in (modulus, thickness,
                                                                   overlap_area)))
    if np.any(t <= 0.0):
        raise ValueError("protection thickness: must be > 0 m for a spring mat")
    return E * A / t


def crush_stress_from_force(crush_force: float, footprint_area: float) -> float:
    """Crush stress of a pad described by a crush force, Pa: σ_c = F_c/A, with A the
    declared load footprint the force was meant for (used to read older project
    files; the reader warns that the stress was derived)."""
    if footprint_area <= 0.0:
        raise ValueError("footprint area: must be > 0 m² to turn a crush force into a stress")
    return crush_force / footprint_area
