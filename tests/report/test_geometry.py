"""Plan geometry of the annex figure: swing-region outlines, the drift-margin
offset, clipping and hatch segments.

The drift outline is checked against the definition of an offset curve: every
point of the outline of a region widened by d lies at distance d from the
region (Minkowski sum with a disc of radius d; common practice, no source).
"""

from __future__ import annotations

import math

import pytest

from droprig.model import LiftZone
from droprig.report.geometry import (
    arc,
    clip_polyline,
    drift_outlines,
    hatch_segments,
    swing_outlines,
)

# Arcs are drawn as chords every 2°; a chord of radius R sags R(1 − cos 1°) ≈ 1.5e-4·R.
CHORD_TOL = 2e-4
GEOM_TOL = 1e-9


def _dist_to_segment(p: tuple[float, float], a: tuple[float, float],
                     b: tuple[float, float]) -> float:
    ax, ay = a
    bx, by = b
    dx, dy = bx - ax, by - ay
    t = max(0.0, min(1.0, ((p[0] - ax) * dx + (p[1] - ay) * dy) / (dx * dx + dy * dy)))
    return math.hypot(p[0] - ax - t * dx, p[1] - ay - t * dy)


def _dist_to_region(z: LiftZone, p: tuple[float, float]) -> float:
    """Exact distance from p to the annular sector of zone z (0 inside)."""
    cx, cy = z.crane
    r = math.hypot(p[0] - cx, p[1] - cy)
    ang = math.atan2(p[1] - cy, p[0] - cx)
    rel = (ang - z.slew_start) % (2 * math.pi)
    if rel <= z.slew_sweep + 1e-12 or z.slew_sweep >= 2 * math.pi - 1e-9:
        return max(r - z.r_max, z.r_min - r, 0.0)
    out = math.inf
    for a in (z.slew_start, z.slew_start + z.slew_sweep):
        u = (math.cos(a), math.sin(a))
        out = min(out, _dist_to_segment(p, (cx + z.r_min * u[0], cy + z.r_min * u[1]),
                                        (cx + z.r_max * u[0], cy + z.r_max * u[1])))
    return out


ZONES = [
    # id, crane, r_min, r_max, slew start, slew end (deg), drift
    ("quarter", (0.0, 0.0), 3.0, 12.0, 10.0, 100.0, 1.0),
    ("wide", (5.0, -2.0), 4.0, 20.0, -40.0, 200.0, 1.5),
    ("from_crane_narrow", (0.0, 0.0), 0.0, 9.0, 180.0, 300.0, 0.7),
    ("from_crane_wide", (2.0, 3.0), 0.5, 15.0, 30.0, 280.0, 1.0),
    ("full_ring", (0.0, 0.0), 5.0, 10.0, 0.0, 360.0, 1.0),
]


@pytest.mark.parametrize(("name", "crane", "r0", "r1", "a0", "a1", "d"), ZONES,
                         ids=[z[0] for z in ZONES])
def test_drift_outline_lies_at_the_drift_margin(name: str, crane: tuple[float, float],
                                                r0: float, r1: float, a0: float, a1: float,
                                                d: float) -> None:
    z = LiftZone(name, name, "L1", crane, r0, r1, math.radians(a0), math.radians(a1), d)
    for ring in drift_outlines(z):
        for p in ring:
            # offset curve: distance d from the region (common practice, no source)
            assert _dist_to_region(z, p) == pytest.approx(d, rel=0, abs=CHORD_TOL * r1 + 1e-6)


@pytest.mark.parametrize(("name", "crane", "r0", "r1", "a0", "a1", "d"), ZONES,
                         ids=[z[0] for z in ZONES])
def test_swing_outline_is_the_region_boundary(name: str, crane: tuple[float, float],
                                              r0: float, r1: float, a0: float, a1: float,
                                              d: float) -> None:
    z = LiftZone(name, name, "L1", crane, r0, r1, math.radians(a0), math.radians(a1), d)
    for ring in swing_outlines(z):
        assert ring[0] == pytest.approx(ring[-1])  # closed
        for p in ring:
            # a boundary point is in the region: distance 0 (definition)
            assert _dist_to_region(z, p) == pytest.approx(0.0, abs=1e-9)


def test_arc_ends_exactly_on_the_circle() -> None:
    pts = arc((1.0, 2.0), 3.0, 0.0, math.pi / 2)
    # cos 0 = 1, sin π/2 = 1 (trigonometry)
    assert pts[0] == pytest.approx((4.0, 2.0))
    assert pts[-1] == pytest.approx((1.0, 5.0))


@pytest.mark.parametrize(("poly", "expected"), [
    # inside stays whole
    ([(1, 1), (2, 2), (3, 1)], [[(1, 1), (2, 2), (3, 1)]]),
    # crossing x = 10 is cut at the edge (line through (5,5)-(15,5) meets x = 10 at y = 5)
    ([(5, 5), (15, 5)], [[(5, 5), (10, 5)]]),
    # leaving and re-entering gives two parts
    ([(5, 5), (15, 5), (15, 8), (5, 8)], [[(5, 5), (10, 5)], [(10, 8), (5, 8)]]),
    # wholly outside gives nothing
    ([(11, 11), (20, 20)], []),
])
def test_clip_polyline(poly: list, expected: list) -> None:
    # Liang–Barsky parametric clipping (Liang & Barsky, ACM TOG 3(1), 1984)
    parts = clip_polyline([tuple(map(float, p)) for p in poly], (0.0, 0.0, 10.0, 10.0))
    assert len(parts) == len(expected)
    for got, exp in zip(parts, expected, strict=True):
        flat_got = [c for p in got for c in p]
        flat_exp = [float(c) for p in exp for c in p]
        assert flat_got == pytest.approx(flat_exp)


@pytest.mark.parametrize("slope", [1, -1])
@pytest.mark.parametrize(("w", "h", "spacing"), [(10.0, 4.0, 2.0), (3.0, 9.0, 1.5),
                                                 (7.3, 7.3, 0.9)])
def test_hatch_segments_stay_in_the_rectangle_at_45_degrees(slope: int, w: float, h: float,
                                                            spacing: float) -> None:
    segs = hatch_segments(1.0, 2.0, 1.0 + w, 2.0 + h, spacing, slope)
    assert segs
    for xa, ya, xb, yb in segs:
        for x, y in ((xa, ya), (xb, yb)):
            assert 1.0 - GEOM_TOL <= x <= 1.0 + w + GEOM_TOL
            assert 2.0 - GEOM_TOL <= y <= 2.0 + h + GEOM_TOL
        # 45° lines: |Δy| = |Δx| with the sign of the slope (definition)
        assert (yb - ya) == pytest.approx(slope * (xb - xa))
    # lines x − slope·y = const are spaced `spacing` along x, so the family covers
    # the rectangle with about (w + h)/spacing lines (geometry, no source)
    assert abs(len(segs) - (w + h) / spacing) <= 2
