"""The framing's Rayleigh mass is scaled to the struck point's own deflection.

Rayleigh's method takes the kinetic energy of the struck members in their static
deflected shape, normalised to 1 at the point the load strikes (Timoshenko,
*Strength of Materials* Part I, impact chapter — from memory). With the deck and
the load's underside as springs in series above the framing (Gere, *Mechanics of
Materials* 7th ed. §9.10), the load moves W·f while the framing under it moves
W·f_s, so the framing's share is m_e·(f_s/f)². With the columns as axial springs
(f_s = members' bending + f_col) the Rayleigh shape is that of the members' bending,
so it is scaled by (f_s − f_col)/f; the rigid-body motion the columns' shortening
gives the members is not counted (less mass, higher force: conservative).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis
from droprig.solver.chain import (
    Compliance,
    LoadInputs,
    StruckMass,
)
from droprig.solver.evaluate import evaluate_chain
from tests.builders import AtPoints

ROOT = Path(__file__).resolve().parents[2]
REL = 1e-12


_AtPoints = AtPoints


@pytest.mark.parametrize("name", ["rooftop_plant_swap", "steel_erection_floor"])

def test_mass_share_follows_the_series_springs(name: str) -> None:
    project = load_project(ROOT / "demo_projects" / f"{name}.droprig")
    zone = project.lift_zones[0]
    level = project.level(zone.level_id)
    fm = analysis.build_floor(level, project.settings)
    g = level.grid
    # bay-interior points away from any protection area (bare deck)
    xs = np.linspace(g.x_lines[0], g.x_lines[-1], 23)[1:-1]
    ys = np.full_like(xs, 0.5 * (g.y_lines[0] + g.y_lines[1]))
    geo = analysis.point_geometry(fm, project, xs, ys)
    bare = geo.protection < 0
    assert bare.any()
    for load in zone.loads:
        r = _AtPoints(evaluate_chain(fm, project, load, geo))
        comp = r.chain[Compliance]
        f_s, f = comp.f_s, comp.f_s + comp.f_deck + r.chain[LoadInputs].f_load
        expected = geo.path.m_e * ((f_s - comp.f_col) / f) ** 2
        m_e = r.chain[StruckMass].m_e
        np.testing.assert_allclose(m_e[bare], expected[bare], rtol=REL)
        # the share is a fraction: never more than the framing's own Rayleigh mass
        assert np.all(m_e <= geo.path.m_e * (1 + REL))
        # two forces per point: the struck mass printed is the two-mass model's m2,
        # the same path's Rayleigh mass with the slab and superimposed dead load over
        # the members' tributary widths, referred to the framing point — more than
        # the steel's share wherever the slab is there (a bare deck)
        m2 = r.chain[StruckMass].m2
        assert m2 is not None
        two = bare & (m2 > 0.0)
        assert two.any()
        np.testing.assert_array_equal(r["effective_mass"][two], m2[two])
        assert np.all(m2[two] > m_e[two])


def test_a_drop_over_a_column_takes_no_framing_mass() -> None:
    # over a rigid column the framing does not move (f_s = 0): η = 1, conservative
    project = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = project.lift_zones[0]
    level = project.level(zone.level_id)
    fm = analysis.build_floor(level, project.settings)
    x, y = np.array([level.grid.x_lines[1]]), np.array([level.grid.y_lines[1]])
    geo = analysis.point_geometry(fm, project, x, y)
    r = _AtPoints(evaluate_chain(fm, project, zone.loads[0], geo))
    assert r["effective_mass"][0] == pytest.approx(0.0, abs=1e-6)
