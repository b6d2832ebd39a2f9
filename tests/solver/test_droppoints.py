"""Lift-zone geometry and drop points.

Expected values are plane geometry worked by hand (distance from a point to a
circle, a segment, a polygon edge; common practice, no source), and the statics
of the framing generator (members on grid lines).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.model import Deck, Grade, LiftZone, Rect, Section, generate_level
from droprig.solver import droppoints, loadpath

ABS = 1e-12

GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6)
SEC = Section("S", "custom", d=0.4, bf=0.18, tw=0.008, tf=0.012, r=0.01, A=8e-3, Ix=2e-4,
              Sx=1e-3, Zx=1.1e-3, Iy=1e-5, mass_per_length=60.0)


@pytest.fixture(scope="module")
def frame():
    level = generate_level(level_id="L", name="t", elevation=0.0, x_spacings=(8.0, 8.0),
                           y_spacings=(6.0, 6.0), girder_direction="x", beam_spacing=2.7,
                           girder_section=SEC, beam_section=SEC, girder_grade=GRADE,
                           beam_grade=GRADE,
                           deck=Deck(openings=(Rect(9.0, 7.0, 10.0, 8.0),)))
    return loadpath.build_frame(level)


def _zone(**kw):
    args = dict(id="Z", name="z", level_id="L", crane=(0.0, 0.0), r_min=2.0, r_max=10.0)
    args.update(kw)
    return LiftZone(**args)


def test_annulus_distances():
    z = _zone()
    x = np.array([5.0, 1.0, 13.0, 0.0])
    y = np.array([0.0, 0.0, 0.0, 0.0])
    # inside; 1 m inside the hole (r_min − r); 3 m beyond r_max; at the crane: r_min
    assert droppoints.sector_distance(z, x, y) == pytest.approx([0.0, 1.0, 3.0, 2.0], abs=ABS)


def test_sector_edge_distance():
    # quarter sector from +x to +y: the point (5, −3) is 3 m from the edge along +x
    z = _zone(slew_start=0.0, slew_end=math.pi / 2)
    d = droppoints.sector_distance(z, np.array([5.0, -3.0]), np.array([-3.0, 5.0]))
    assert d == pytest.approx([3.0, 3.0], abs=ABS)
    # a point behind the crane: nearest is the inner corner (2, 0) or (0, 2)
    d = droppoints.sector_distance(z, np.array([-1.0]), np.array([-1.0]))
    assert d[0] == pytest.approx(math.hypot(3.0, 1.0), abs=ABS)


def test_slew_across_zero_and_full_circle():
    z = _zone(slew_start=math.radians(350), slew_end=math.radians(10))
    assert droppoints.in_zone(z, np.array([5.0]), np.array([0.0]))[0]
    assert not droppoints.in_zone(z, np.array([0.0]), np.array([5.0]))[0]
    full = _zone(slew_start=1.0, slew_end=1.0 + 2 * math.pi)
    assert full.slew_sweep == pytest.approx(2 * math.pi)
    assert droppoints.in_zone(full, np.array([0.0, -5.0]), np.array([5.0, 0.0])).all()


def test_drift_margin_widens_the_zone():
    z = _zone(drift_margin=0.5)
    x = np.array([10.4, 10.6, 1.6, 1.4])
    assert list(droppoints.in_zone(z, x, np.zeros(4))) == [True, False, True, False]


def test_corridor_intersection_and_polygon_distance():
    corridor = ((1.0, -1.0), (9.0, -1.0), (9.0, 1.0), (1.0, 1.0))
    z = _zone(corridor=corridor, drift_margin=0.0)
    d = droppoints.polygon_distance(corridor, np.array([5.0, 5.0, 12.0]),
                                    np.array([0.0, 4.0, 5.0]))
    assert d == pytest.approx([0.0, 3.0, 5.0], abs=ABS)  # 3-4-5 triangle to (9, 1)
    inside = droppoints.in_zone(z, np.array([5.0, 5.0, 0.5]), np.array([0.0, 3.0, 0.0]))
    assert list(inside) == [True, False, False]


def test_projection_lands_on_the_widened_edge():
    corridor = ((1.0, -1.0), (9.0, -1.0), (9.0, 1.0), (1.0, 1.0))
    z = _zone(corridor=corridor, drift_margin=0.4, slew_start=-0.5, slew_end=0.5)
    x = np.array([5.0, 12.0, 5.0, 5.0])
    y = np.array([3.0, 0.0, 0.2, -4.0])
    px, py = droppoints.project_into_zone(z, x, y)
    assert droppoints.in_zone(z, px, py).all()
    assert px[2] == 5.0 and py[2] == 0.2  # inside: unchanged
    assert py[0] == pytest.approx(1.4, abs=1e-9)  # 0.4 beyond the corridor's top edge


@pytest.mark.parametrize("corridor", [(), ((1.0, -1.0), (9.0, -1.0), (9.0, 1.0), (1.0, 1.0))])
def test_into_zone_tests_only_the_moved_points(corridor) -> None:
    """into_zone (the refinements' projection with its in-zone test of the moved points
    only) gives project_into_zone's points and in_zone of all of them, exactly. A
    property of the implementation (the in-zone test is point by point), no
    engineering source; random points are inputs only."""
    z = _zone(corridor=corridor, drift_margin=0.4, slew_start=-0.5, slew_end=0.5)
    rng = np.random.default_rng(5)
    x, y = rng.uniform(-2.0, 14.0, 3000), rng.uniform(-6.0, 8.0, 3000)
    qx, qy, inside = droppoints.into_zone(z, x, y)
    px, py = droppoints.project_into_zone(z, x, y)
    assert np.array_equal(qx, px) and np.array_equal(qy, py)
    assert np.array_equal(inside, droppoints.in_zone(z, qx, qy))
    moved = (qx != x) | (qy != y)
    assert moved.sum() > 100 and inside[moved].mean() > 0.9


def test_bay_index_order(frame):
    level = frame.level
    # bays row by row (y outer, x inner): (1-2/A-B, 2-3/A-B, 1-2/B-C, 2-3/B-C)
    idx = droppoints.bay_index(level, np.array([1.0, 9.0, 1.0, 15.0, -1.0]),
                               np.array([1.0, 1.0, 7.0, 11.0, 1.0]))
    assert list(idx) == [0, 1, 2, 3, -1]
    assert droppoints.in_bay_rect(level, 0, np.array([8.0]), np.array([6.0]))[0]
    assert droppoints.in_bay_rect(level, 3, np.array([8.0]), np.array([6.0]))[0]


def test_base_points_cover_the_governing_places(frame):
    z = LiftZone("Z", "z", "L", (8.0, 6.0), 0.0, 5.0, drift_margin=0.0)
    x, y = droppoints.base_points(frame, z, 0.5)
    assert droppoints.in_zone(z, x, y).all()
    assert (loadpath.locate(frame, x, y) >= 0).all()
    pts = set(zip(np.round(x, 6), np.round(y, 6), strict=True))
    # the column at the zone centre, midspan of the infill beam at x = 8 + 8/3
    assert (8.0, 6.0) in pts
    assert (round(8.0 + 8.0 / 3, 6), 9.0) in pts
    # the deck mid-strip between beams x = 8 and 8 + 8/3 is sampled along its length
    on_mid = np.isclose(x, 8.0 + 4.0 / 3)
    assert on_mid.sum() >= 10
    # points near a girder for the web checks: d/2 and d from the beam's end
    assert (round(8.0 + 8.0 / 3, 6), 6.2) in pts
    assert (round(8.0 + 8.0 / 3, 6), 6.4) in pts
    # no duplicates
    assert len(pts) == x.size


def test_points_in_an_opening_are_kept(frame):
    z = LiftZone("Z", "z", "L", (9.5, 7.5), 0.0, 2.0, drift_margin=0.0)
    x, y = droppoints.base_points(frame, z, 0.25)
    op = droppoints.in_openings(frame.level, x, y)
    assert op.any() and (~op).any()


def test_zone_off_the_deck_has_no_points(frame):
    z = LiftZone("Z", "z", "L", (100.0, 100.0), 0.0, 5.0)
    x, _ = droppoints.base_points(frame, z, 0.5)
    assert x.size == 0


def test_zone_reaching_beyond_the_deck_is_flagged(frame):
    inside = LiftZone("Z", "z", "L", (8.0, 6.0), 0.0, 3.0, drift_margin=0.0)
    outside = LiftZone("Z", "z", "L", (15.0, 6.0), 0.0, 3.0, drift_margin=0.0)
    assert not droppoints.reaches_off_deck(frame, inside, 0.5)
    assert droppoints.reaches_off_deck(frame, outside, 0.5)


def test_nearest_in_polygon_all_edges_equals_edge_by_edge():
    """The nearest boundary point of a corridor, every edge at once (the kernel used
    by :func:`droppoints.project_into_zone`), equals the plain edge-by-edge loop
    exactly — the same floating-point expressions, the first nearest edge kept — on
    random star polygons, some with a repeated (zero-length) edge. Invented polygons:
    inputs only; the loop is the reference (nearest point on a segment, t clipped to
    [0, 1]; common practice, no source)."""
    rng = np.random.default_rng(7)
    for k in range(60):
        n = int(rng.integers(3, 12))
        ang = np.sort(rng.uniform(0.0, 2.0 * np.pi, n))
        r = rng.uniform(1.0, 5.0, n)
        poly = tuple((float(a), float(b)) for a, b in zip(r * np.cos(ang), r * np.sin(ang),
                                                          strict=True))
        if k % 5 == 0:
            poly = (*poly, poly[-1])
        x, y = rng.uniform(-6.0, 6.0, 400), rng.uniform(-6.0, 6.0, 400)
        fast = droppoints._nearest_in_polygon(poly, x, y)
        plain = droppoints._nearest_in_polygon_by_edge(poly, x, y)
        assert np.array_equal(fast[0], plain[0]) and np.array_equal(fast[1], plain[1])
