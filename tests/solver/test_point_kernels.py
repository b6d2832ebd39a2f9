"""The fast point kernel (:func:`droprig.solver.loadpath.evaluate`) gives the numbers of
the plain formulas it implements (:func:`droprig.solver.reference.path_reference`: the
load-path formulas of :mod:`droprig.solver.loadpath` — lever rule, Green's functions of
AISC *Steel Construction Manual* 15th ed. Table 3-23, node flexibility, Rayleigh mass —
written one quantity at a time) on several floors and random ones, within
:data:`REL` (the same expressions, sums possibly in another order: a few ulp; common
practice, no source), and the same numbers bit for bit whatever the block size and the
number of threads. The plane geometry of :mod:`droprig.solver.droppoints` (distance to a
segment, even–odd rule) is checked against its edge-by-edge form.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.model import Grade, LiftZone, Section, generate_level
from droprig.solver import droppoints, loadpath, parallel
from droprig.solver.reference import path_reference

GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=210e9)
BEAM = Section("B", "custom", d=0.3, bf=0.15, tw=0.0071, tf=0.0107, r=0.015, A=5.4e-3,
               Ix=8.4e-5, Sx=5.6e-4, Zx=6.3e-4, Iy=6.0e-6, mass_per_length=42.2)
GIRDER = Section("G", "custom", d=0.45, bf=0.19, tw=0.0094, tf=0.0146, r=0.021,
                 A=9.9e-3, Ix=3.4e-4, Sx=1.5e-3, Zx=1.7e-3, Iy=1.7e-5, mass_per_length=77.6)


def _frame(girder: str = "simple", beam_cond: str = "simple") -> loadpath.Frame:
    from dataclasses import replace

    level = generate_level(level_id="L", name="t", elevation=0.0, x_spacings=(9.0, 7.5),
                           y_spacings=(6.0, 8.0), girder_direction="x", beam_spacing=3.0,
                           girder_section=GIRDER, beam_section=BEAM, girder_grade=GRADE,
                           beam_grade=GRADE)
    conds = {"girder": girder, "beam": beam_cond}
    level = replace(level, members=tuple(replace(m, end_condition=conds[m.role])
                                         for m in level.members))
    return loadpath.build_frame(level)


REL = 1e-12
"""Kernel against the reference: the same formulas in floating point."""


def _random_frame(seed: int) -> loadpath.Frame:
    """A random regular floor with random end conditions (invented inputs)."""
    from dataclasses import replace

    rng = np.random.default_rng(seed)
    level = generate_level(
        level_id="L", name="r", elevation=0.0,
        x_spacings=tuple(float(v) for v in rng.uniform(4.0, 10.0, int(rng.integers(1, 4)))),
        y_spacings=tuple(float(v) for v in rng.uniform(4.0, 10.0, int(rng.integers(1, 4)))),
        girder_direction="x" if rng.random() < 0.5 else "y",
        beam_spacing=float(rng.uniform(1.5, 3.5)), girder_section=GIRDER,
        beam_section=BEAM, girder_grade=GRADE, beam_grade=GRADE)
    conds = ("simple", "fixed", "propped")
    level = replace(level, members=tuple(replace(m, end_condition=str(rng.choice(conds)))
                                         for m in level.members))
    return loadpath.build_frame(level)


@pytest.fixture(scope="module", params=[("simple", "simple"), ("fixed", "propped"),
                                        ("propped", "fixed"), 101, 102, 103, 104])
def frame(request):
    if isinstance(request.param, int):
        return _random_frame(request.param)
    return _frame(*request.param)


def _points(frame: loadpath.Frame, n: int, seed: int = 3) -> tuple[np.ndarray, np.ndarray]:
    ext = frame.level.grid.extent
    rng = np.random.default_rng(seed)
    x = rng.uniform(ext.x0 - 0.5, ext.x1 + 0.5, n)
    y = rng.uniform(ext.y0 - 0.5, ext.y1 + 0.5, n)
    m = n // 5
    x[:m], y[:m] = np.round(x[:m]), np.round(y[:m])  # on member lines and columns
    return x, y


def _same(a: np.ndarray, b: np.ndarray) -> bool:
    return a.shape == b.shape and bool(np.all((a == b) | (np.isnan(a) & np.isnan(b))))


def _close(a: np.ndarray, b: np.ndarray) -> bool:
    same = (a == b) | (np.isnan(a) & np.isnan(b))
    with np.errstate(invalid="ignore"):
        near = np.abs(a - b) <= REL * np.maximum(np.abs(a), np.abs(b))
    return a.shape == b.shape and bool(np.all(same | near))


def test_kernel_equals_the_formulas(frame):
    x, y = _points(frame, 20000)
    ref = path_reference(frame, x, y)
    res = loadpath.evaluate(frame, x, y)
    assert np.array_equal(res.pair, ref.pair)
    assert np.array_equal(res.members, ref.members)
    for k in ("share", "a", "strip_span", "strip_pos", "r", "u", "f", "g_own", "m_e",
              "w_ref"):
        assert _close(getattr(res, k), getattr(ref, k)), k
    # off the deck: the documented fill values
    s = ref.pair >= 0
    assert (~s).any() and s.any()
    assert np.all(res.members[~s] == -1) and np.all(np.isnan(res.f[~s]))
    assert np.all(np.isnan(res.m_e[~s])) and np.all(res.r[~s] == 0.0)


@pytest.mark.parametrize("threads", ["1", "2", "3"])
def test_results_do_not_depend_on_blocks_or_threads(frame, monkeypatch, threads):
    x, y = _points(frame, 5000, seed=11)
    whole = loadpath.evaluate(frame, x, y)
    monkeypatch.setenv("DROPRIG_THREADS", threads)
    monkeypatch.setattr(loadpath, "CHUNK", 257)  # many blocks: the thread pool runs
    assert len(range(0, x.size, 257)) >= parallel.MIN_PARALLEL_BLOCKS
    part = loadpath.evaluate(frame, x, y)
    for k in whole.__dataclass_fields__:
        assert _same(getattr(part, k), getattr(whole, k)), k


def test_locate_takes_any_shape():
    frame = _frame()
    x, y = _points(frame, 12)
    flat = loadpath.locate(frame, x, y)
    assert loadpath.locate(frame, x.reshape(3, 4), y.reshape(3, 4)).shape == (3, 4)
    assert np.array_equal(loadpath.locate(frame, x.reshape(3, 4), y.reshape(3, 4)).ravel(),
                          flat)
    assert int(loadpath.locate(frame, x[0], y[0])) == flat[0]


# --------------------------------------------------------------------------- plan geometry
def _seg_dist(px, py, ax, ay, bx, by):
    """Distance from points to the segment a–b (projection clipped to the segment)."""
    dx, dy = bx - ax, by - ay
    ll = dx * dx + dy * dy
    if ll <= 0.0:
        return np.hypot(px - ax, py - ay)
    t = np.clip(((px - ax) * dx + (py - ay) * dy) / ll, 0.0, 1.0)
    return np.hypot(px - (ax + t * dx), py - (ay + t * dy))


def _polygon_distance(poly, x, y):
    """One edge at a time: the nearest edge, and the even–odd rule for inside."""
    inside = np.zeros(x.shape, dtype=bool)
    d = np.full(x.shape, np.inf)
    n = len(poly)
    for i in range(n):
        (ax, ay), (bx, by) = poly[i], poly[(i + 1) % n]
        d = np.minimum(d, _seg_dist(x, y, ax, ay, bx, by))
        with np.errstate(divide="ignore", invalid="ignore"):
            xint = ax + (y - ay) * (bx - ax) / (by - ay)
        inside ^= ((ay > y) != (by > y)) & (x < xint)
    return np.where(inside, 0.0, d)


def test_polygon_distance_equals_the_edge_by_edge_form():
    rng = np.random.default_rng(5)
    for _ in range(60):
        k = int(rng.integers(1, 10))
        poly = [tuple(float(c) for c in np.round(rng.uniform(-5, 5, 2), 1)) for _ in range(k)]
        if k > 2 and rng.random() < 0.3:
            poly[1] = poly[0]  # a zero-length edge
        n = int(rng.integers(1, 3000))
        x = np.round(rng.uniform(-6, 6, n), int(rng.integers(0, 3)))
        y = np.round(rng.uniform(-6, 6, n), int(rng.integers(0, 3)))
        want = _polygon_distance(tuple(poly), x, y)
        assert np.array_equal(droppoints.polygon_distance(tuple(poly), x, y), want)


def test_in_zone_is_the_zone_distance_test():
    zones = [
        LiftZone("A", "a", "L", (-3.0, 7.0), 2.0, 18.0, math.radians(-60), math.radians(70),
                 0.5),
        LiftZone("B", "b", "L", (8.0, -10.0), 5.0, 40.0, drift_margin=1.0,
                 corridor=((2.0, 1.0), (14.0, 1.0), (14.0, 4.0), (2.0, 4.0))),
        LiftZone("C", "c", "L", (0.0, 0.0), 0.0, 30.0, drift_margin=0.0,
                 corridor=((0.0, 0.0), (10.0, 0.0), (10.0, 0.0), (5.0, 8.0))),
    ]
    rng = np.random.default_rng(9)
    x, y = np.round(rng.uniform(-5, 20, 20000), 1), np.round(rng.uniform(-5, 20, 20000), 1)
    for z in zones:
        want = droppoints.zone_distance(z, x, y) <= z.drift_margin + droppoints.EDGE_TOL
        assert np.array_equal(droppoints.in_zone(z, x, y), want)


def test_dedupe_keeps_the_first_of_each_lattice_point():
    rng = np.random.default_rng(2)
    x = np.round(rng.uniform(-1, 1, 5000), 2)
    y = np.round(rng.uniform(-1, 1, 5000), 2)
    x[::7], y[::11] = -1e-8, 1e-8  # −0 and +0 on the lattice: one point
    tol = 1e-6
    key = np.stack([np.round(y / tol), np.round(x / tol)], axis=1)
    _, idx = np.unique(key, axis=0, return_index=True)
    idx = np.sort(idx)
    dx, dy = droppoints.dedupe(x, y, tol)
    assert np.array_equal(dx, x[idx]) and np.array_equal(dy, y[idx])


def test_remembered_base_points_are_the_callers_own():
    frame = _frame()
    z = LiftZone("Z", "z", "L", (8.0, 6.0), 0.0, 5.0, drift_margin=0.0)
    x, _ = droppoints.base_points(frame, z, 0.5)
    want = x.copy()
    x[:] = -1.0  # the caller may change its arrays
    x2, _ = droppoints.base_points(frame, z, 0.5)
    assert np.array_equal(x2, want)
    lx, _ = droppoints.line_points(frame, 0.25)
    assert not lx.flags.writeable
