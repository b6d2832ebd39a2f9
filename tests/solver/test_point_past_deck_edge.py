"""A drop point asked for directly (calculation trace, ``droprig verify``) just past a
deck edge (issue 10, finding 4): a clear message naming the field and the allowed
range, never a number from a point with no deck under its centre; at the edge
itself the result follows the points just inside."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model import ModelError
from droprig.solver import trace_point, verify_point

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def roof():
    return load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")


def _U(t) -> float:
    return float([s.value for s in t.steps if s.symbol == "U"][-1])


@pytest.mark.parametrize("past", [0.001, 0.01, 0.5])
def test_a_point_past_the_deck_edge_is_refused_with_the_range(roof, past: float) -> None:
    z = roof.lift_zones[0]
    e = roof.level(z.level_id).grid.extent
    load = z.loads[0].name
    for x, y in ((e.x1 + past, 5.0), (e.x0 - past, 5.0), (5.0, e.y1 + past),
                 (5.0, e.y0 - past)):
        with pytest.raises(ModelError) as err:
            trace_point(roof, z.id, load, x, y)
        assert err.value.field == "trace.point"
        assert f"x {e.x0:g} to {e.x1:g} m, y {e.y0:g} to {e.y1:g} m" in str(err.value)
        with pytest.raises(ModelError) as err2:
            verify_point(roof, z.id, load, x, y)
        assert err2.value.field == "verify.point"
        assert f"x {e.x0:g} to {e.x1:g} m" in str(err2.value)


def test_at_the_edge_the_trace_follows_the_points_inside(roof) -> None:
    # the footprint cut at the deck edge (footprint.footprint_on_deck) changes
    # continuously as the point nears the edge: U on the edge line within 10 % of
    # U 1 mm inside (common practice, no source: no spike at an edge)
    z = roof.lift_zones[0]
    e = roof.level(z.level_id).grid.extent
    for ld in z.loads:
        on = _U(trace_point(roof, z.id, ld.name, e.x1, 5.3))
        inside = _U(trace_point(roof, z.id, ld.name, e.x1 - 0.001, 5.3))
        assert np.isfinite(on) and on == pytest.approx(inside, rel=0.10), (ld.name, on, inside)
