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
    "SPENT_LAYER_MODULUS",
    "crush_stress_from_force",
    "crushable_pad_force",
    "footprint_rect",
    "rect_overlap_area",
    "spent_layer_compliance",
    "spring_mat_stiffness",
]

SPENT_LAYER_MODULUS = 370e6
"""Compression modulus of a crushable layer once its stroke is spent, Pa: softwood
across the grain, E_90,mean of strength class C24 (EN 338:2016 Table 1 — from
memory: E_0,mean/30 = 11 000/30 ≈ 370 MPa). The timber of a timber-and-foam pad is
its stiffest common constituent before the cells collapse (a densified foam is
softer); a stiffer spent layer gives the higher contact force. A hardwood bearer
(D40, E_90,mean ≈ 860 MPa) would be stiffer: a layer of that kind needs its own value
(README, limits)."""


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


def spent_layer_compliance(length: ArrayLike, width: ArrayLike, residual: ArrayLike,
                           modulus: ArrayLike = SPENT_LAYER_MODULUS) -> np.ndarray:
    """Compliance of what is left of a crushable layer once its stroke is spent, m/N:
    the residual thickness t_r = thickness − stroke (m) under the contact
    ``length`` × ``width`` (a, b in m), the pressure spreading at 1:1 through it (as
    through every layer, common practice, no source), each slice dz in uniaxial
    compression (Gere §2.3: dδ = F·dz/(E·A(z))), A(z) = (a + 2z)(b + 2z):

        f = ∫₀^t_r dz / (E·(a + 2z)(b + 2z))
          = ln[(a + 2t_r)·b / (a·(b + 2t_r))] / (2E·(b − a))      (a ≠ b)
          = t_r / (E·a·(a + 2t_r))                               (a = b)

    E = ``modulus`` (Pa, :data:`SPENT_LAYER_MODULUS`). The spread makes the layer
    stiffer than a column of the contact's own area (t_r/(E·a·b)): the higher
    contact force. t_r = 0 (a layer crushed through): 0. Vectorised."""
    a, b, t, E = np.broadcast_arrays(*(np.asarray(v, float) for v in (length, width,
                                                                     residual, modulus)))
    if np.any(~(a > 0.0)) or np.any(~(b > 0.0)):
        raise ValueError("contact sides: must be > 0 m for a spent layer's compliance")
    if np.any(~(E > 0.0)):
        raise ValueError("spent layer modulus: must be > 0 Pa")
    t = np.maximum(t, 0.0)
    near = np.abs(b - a) <= 1e-9 * np.maximum(a, b)
    with np.errstate(divide="ignore", invalid="ignore"):
        diff = np.log((a + 2.0 * t) * b / (a * (b + 2.0 * t))) / (2.0 * E * (b - a))
    same = t / (E * a * (a + 2.0 * t))
    return np.where(t > 0.0, np.where(near, same, diff), 0.0)
