"""corridor_problem(): a corridor must be a simple polygon that encloses an area.

A simple polygon is one whose edges meet only at shared corners, each corner joining
exactly two edges (from memory: the usual definition in computational geometry, e.g.
de Berg et al., *Computational Geometry*, 3rd ed., ch. 3). Corner coordinates are
invented shapes.
"""

from __future__ import annotations

import pytest

from droprig.model import ModelError, check_corridor, corridor_problem
from droprig.model.polygon import polygon_area

AREA_TOL = 1e-12  # m², float round-off

RECT = ((1.0, 1.0), (4.0, 1.0), (4.0, 3.5), (1.0, 3.5))


@pytest.mark.parametrize("pts", [
    (),                                                             # no corridor
    RECT,
    tuple(reversed(RECT)),                                          # clockwise
    ((0.0, 0.0), (6.0, 0.0), (0.0, 4.0)),                           # triangle
    ((0, 0), (6, 0), (6, 2), (2, 2), (2, 6), (0, 6)),               # concave L
    ((0.0, 0.0), (3.0, 0.0), (6.0, 0.0), (6.0, 2.0), (0.0, 2.0)),   # a corner mid-edge
])
def test_simple_polygons_pass(pts: tuple) -> None:
    assert corridor_problem(pts) is None
    assert check_corridor("c", pts) == tuple((float(x), float(y)) for x, y in pts)


@pytest.mark.parametrize(("pts", "says"), [
    (((0, 0), (1, 0)), "2 corner(s)"),
    (((1, 1), (4, 1), (4, 3.5), (5, 2)), "edge 2–3 crosses or touches edge 4–1"),  # bow tie
    (((0, 0), (4, 0), (0, 3), (4, 3)), "crosses or touches"),                     # bow tie
    (((0, 0), (4, 0), (4, 0), (0, 3)), "corners 2 and 3 are at the same place"),
    (((0, 0), (2, 0), (4, 0)), "folds back"),                                      # a line
    (((0, 0), (4, 0), (2, 0), (2, 3)), "folds back"),                              # spike
    (((0, 0), (6, 0), (6, 4), (3, 0), (0, 4)), "crosses or touches"),  # corner on an edge
])
def test_bad_polygons_are_named(pts: tuple, says: str) -> None:
    problem = corridor_problem(pts)
    assert problem is not None and says in problem
    with pytest.raises(ModelError) as err:
        check_corridor("zone Z1.corridor", pts)
    assert err.value.field == "zone Z1.corridor"
    assert "simple polygon" in err.value.allowed


def test_area_of_a_rectangle() -> None:
    # 3 m × 2.5 m = 7.5 m², counter-clockwise positive (shoelace formula, from memory)
    assert polygon_area(RECT) == pytest.approx(7.5, abs=AREA_TOL)
    assert polygon_area(tuple(reversed(RECT))) == pytest.approx(-7.5, abs=AREA_TOL)
