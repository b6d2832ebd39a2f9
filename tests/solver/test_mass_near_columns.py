"""Rayleigh effective mass of drop points approaching a column.

Rayleigh's method (Timoshenko, *Strength of Materials* Part I, impact with the mass
of the beam; from memory): m_e = Σ∫μ (w/w_ref)² dx with |w| ≤ w_ref along the load
path, so 0 ≤ m_e ≤ Σ μL, the mass of the members. A point a rounding error away from
a column (grid lines in feet converted to metres never land exactly) must give a
value inside that bound that joins its neighbours smoothly, not rounding noise.
"""

from __future__ import annotations

import numpy as np
import pytest

from droprig.model import Grade, Section, generate_level
from droprig.solver import loadpath

FT = 0.3048  # m per international foot (exact by definition; from memory)
E = 200e9
GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=E)

DIRECTIONS = 12  # rays towards each column, including along both grid lines
DIST = np.logspace(-1, -15, 57)  # m, from 100 mm to below one ulp of the coordinate
NEAR = 1e-4  # m: continuity is checked on rays closer than this ...
RESOLVED = 1e-12
"""... and farther than this (m): below ~1000 ulp of a coordinate of tens of metres
the rounded offset no longer points along the ray, and the mass (whose limit at a
column depends on the direction of approach) belongs to another direction; there
only the bound is checked."""
JUMP_TOL = 0.01
"""Largest change of m_e between neighbouring points closer than NEAR, as a share of
Σ μL: the Rayleigh quotient of a load nearing a support tends to a finite limit along
each ray (the deflected shape of the struck member approaches a fixed shape);
common practice, no source."""


def _section(name: str, Ix: float, mass: float, d: float = 0.4) -> Section:
    return Section(name, "custom", d=d, bf=0.18, tw=0.008, tf=0.012, r=0.01, A=8e-3,
                   Ix=Ix, Sx=Ix / (d / 2), Zx=1.12 * Ix / (d / 2), Iy=1e-5,
                   mass_per_length=mass)


BEAM = _section("B", 1.2e-4, 45.0)
GIRDER = _section("G", 3.5e-4, 80.0, 0.45)


def _level(kind: str, girder_direction: str):
    if kind == "SI":
        xs, ys, bs = (8.0, 8.0), (6.0, 7.0), 2.7
    else:  # a floor set out in feet: 30 ft bays, beams at 10 ft, origin off zero
        xs, ys, bs = (30 * FT,) * 3, (25 * FT, 30 * FT), 10 * FT
    return generate_level(level_id="L", name=kind, elevation=0.0, x_spacings=xs,
                          y_spacings=ys, girder_direction=girder_direction,
                          beam_spacing=bs, girder_section=GIRDER, beam_section=BEAM,
                          girder_grade=GRADE, beam_grade=GRADE,
                          origin=(0.0, 0.0) if kind == "SI" else (3 * FT, 7 * FT))


@pytest.mark.parametrize("kind", ["SI", "feet"])
@pytest.mark.parametrize("girder_direction", ["x", "y"])
def test_effective_mass_approaching_a_column(kind, girder_direction):
    level = _level(kind, girder_direction)
    frame = loadpath.build_frame(level)
    total = float(np.sum(frame.mu * frame.L))  # Σ μL, kg
    g = level.grid
    ang = 2.0 * np.pi * np.arange(DIRECTIONS) / DIRECTIONS
    checked = 0
    for cx in g.x_lines:
        for cy in g.y_lines:
            # each ray: the column coordinate plus d·(cos, sin), as a plan editor or a
            # unit conversion would produce it
            x = cx + DIST[None, :] * np.round(np.cos(ang), 15)[:, None]
            y = cy + DIST[None, :] * np.round(np.sin(ang), 15)[:, None]
            res = loadpath.evaluate(frame, x.ravel(), y.ravel())
            m_e = res.m_e.reshape(x.shape)
            ok = (res.pair >= 0).reshape(x.shape)
            off = (res.w_ref > 0.0).reshape(x.shape)  # exactly on the column: w ≡ 0
            on_deck = ok & off
            # Rayleigh (Timoshenko Part I; from memory): finite, 0 ≤ m_e ≤ Σ μL
            assert np.all(np.isfinite(m_e[on_deck])), (cx, cy)
            assert np.all(m_e[on_deck] >= 0.0), (cx, cy, m_e[on_deck].min())
            assert np.all(m_e[on_deck] <= total), (cx, cy, m_e[on_deck].max(), total)
            # continuity along each ray near the column
            for r in range(DIRECTIONS):
                keep = on_deck[r] & (DIST <= NEAR) & (DIST >= RESOLVED)
                v = m_e[r, keep]
                if v.size < 2:
                    continue
                jump = np.max(np.abs(np.diff(v)))
                assert jump <= JUMP_TOL * total, (cx, cy, ang[r], jump, v)
                checked += 1
    assert checked > 0
