"""Work budgets: how much a project may ask of droprig, checked before any large
allocation.

A project file is data from outside; nothing in it may make droprig hang or
exhaust memory. Every count a file controls is bounded here, and the number of
drop points each lift zone will generate is estimated from the model alone
(plain arithmetic, no arrays) when the :class:`~droprig.model.Project` is built,
so the loader, ``droprig validate``, ``droprig analyse`` and every edit in the
window refuse an over-large project with the same message, before the solver
allocates anything.

The limits are set so that the largest realistic project — 10 levels × 500
members × 20 lift zones at a 0.25 m grid — runs with room to spare (the load
test in ``benchmarks/bench_loadtest.py``), and anything far beyond gets a
message saying what to change. The figures are droprig's own statement of what
it can do on a desktop computer (common practice, no source).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

from droprig.model.errors import ModelError

if TYPE_CHECKING:
    from droprig.model.project import Level, LiftZone, Project

MAX_FILE_BYTES = 32 * 1024 * 1024
"""Largest project file read, bytes (32 MiB; the load-test project of 5,000 members
is about 1.5 MB)."""

MAX_NESTING = 32
"""Deepest nesting of JSON lists and objects read (a project file nests 6 deep)."""

MAX_LEVELS = 50
MAX_MEMBERS_PER_LEVEL = 2_000
MAX_MEMBERS = 20_000
MAX_LIFT_ZONES = 100
MAX_LOADS_PER_ZONE = 20
MAX_LOADS = 400
MAX_PROTECTION_AREAS = 500
MAX_OPENINGS_PER_LEVEL = 200
MAX_CORRIDOR_CORNERS = 500
"""Counts a project may hold (each at least 4× the largest realistic project)."""

MAX_DROP_POINTS_PER_ZONE = 1_500_000
"""Candidate drop points one lift zone may generate (grid + governing points)."""

MAX_DROP_POINTS = 6_000_000
"""Drop points × loads of the whole project: the rows the solver evaluates and keeps
(about 0.3 kB each with the refinement and the result arrays)."""

MAX_CORRIDOR_TESTS = 300_000_000
"""Candidate drop points × corridor edges: the point-in-corridor and distance tests
of one zone."""

MAX_PROBLEMS_SHOWN = 50
"""Problems listed for one file; the rest are counted."""


class BudgetError(ModelError):
    """A project that asks for more work than droprig's documented limits. The
    message says what is asked, the limit and what to change."""

    def __init__(self, field: str, needed: int, limit: int, message: str) -> None:
        self.field = field
        self.value = needed
        self.allowed = f"at most {limit:,}"
        self.unit = ""
        self.needed = needed
        self.limit = limit
        ValueError.__init__(self, f"{field}: {message}")


def _count(field: str, n: int, limit: int, what: str, advice: str) -> None:
    if n > limit:
        raise BudgetError(field, n, limit,
                          f"{n:,} {what}; the limit is {limit:,}: {advice}")


def check_counts(project: Project) -> None:
    """Refuse a project with more levels, members, zones, loads or protection areas
    than the limits above (:class:`BudgetError`)."""
    _count("levels", len(project.levels), MAX_LEVELS, "levels", "split the project")
    _count("levels", sum(len(lv.members) for lv in project.levels), MAX_MEMBERS,
           "members in all", "split the project")
    _count("lift_zones", len(project.lift_zones), MAX_LIFT_ZONES, "lift zones",
           "split the project")
    _count("lift_zones", sum(len(z.loads) for z in project.lift_zones), MAX_LOADS,
           "loads in all", "split the project")
    _count("protection_areas", len(project.protection_areas), MAX_PROTECTION_AREAS,
           "protection areas", "merge neighbouring mats")
    for lv in project.levels:
        _count(f"level {lv.id}.deck.openings", len(lv.deck.openings), MAX_OPENINGS_PER_LEVEL,
               "deck openings", "merge neighbouring openings")


def _arange_len(start: float, stop: float, step: float) -> int:
    """len(numpy.arange(start, stop, step))."""
    return max(0, math.ceil((stop - start) / step))


def _samples_len(lo: float, hi: float, step: float) -> int:
    """Number of points of ``droprig.solver.droppoints._samples(lo, hi, step)``."""
    return max(1, math.ceil((hi - lo) / step - 1e-9)) + 1


def zone_bbox(zone: LiftZone) -> tuple[float, float, float, float]:
    """Plan box (x0, y0, x1, y1), m, of the zone widened by its drift margin (the
    box the drop-point grid covers)."""
    m = zone.drift_margin
    cx, cy = zone.crane
    x0, y0, x1, y1 = cx - zone.r_max, cy - zone.r_max, cx + zone.r_max, cy + zone.r_max
    if zone.corridor:
        px = [p[0] for p in zone.corridor]
        py = [p[1] for p in zone.corridor]
        x0, x1 = max(x0, min(px)), min(x1, max(px))
        y0, y1 = max(y0, min(py)), min(y1, max(py))
    return x0 - m, y0 - m, x1 + m, y1 + m


def grid_points(level: Level, zone: LiftZone, resolution: float) -> int:
    """Points of the square drop-point grid over the zone's box clipped to the level's
    column grid (the grid :mod:`droprig.solver.droppoints` lays out)."""
    ext = level.grid.extent
    bx0, by0, bx1, by1 = zone_bbox(zone)
    x0, y0 = max(bx0, ext.x0), max(by0, ext.y0)
    x1, y1 = min(bx1, ext.x1), min(by1, ext.y1)
    if x1 < x0 or y1 < y0:
        return 0
    gx0 = ext.x0 + math.floor((x0 - ext.x0) / resolution) * resolution
    gy0 = ext.y0 + math.floor((y0 - ext.y0) / resolution) * resolution
    return (_arange_len(gx0, x1 + resolution * 0.5, resolution)
            * _arange_len(gy0, y1 + resolution * 0.5, resolution))


def line_points(level: Level, step: float) -> int:
    """Points along the member lines and deck mid-strips of ``level`` at ``step``
    (mid-strips counted as one more line per member: an upper estimate)."""
    n = sum(_samples_len(0.0, 1.0, step / m.span) + 5 for m in level.members)
    return 2 * n + len(level.grid.x_lines) * len(level.grid.y_lines)


def boundary_points(zone: LiftZone, step: float) -> int:
    """Points along the widened sector and corridor boundaries at ``step``."""
    m = zone.drift_margin
    full = zone.slew_sweep >= 2 * math.pi - 1e-9
    sweep = 2 * math.pi if full else zone.slew_sweep
    n = 0
    for r in (zone.r_min - m, zone.r_max + m):
        if r > 0:
            n += max(8, math.ceil(r * sweep / step)) + 1
    if not full:
        n += 2 * (_samples_len(max(zone.r_min, 0.0), zone.r_max, step) + 34)
    k = len(zone.corridor)
    for i in range(k):
        (ax, ay), (bx, by) = zone.corridor[i], zone.corridor[(i + 1) % k]
        ln = math.hypot(bx - ax, by - ay)
        if ln > 0:
            n += 2 * _samples_len(0.0, 1.0, step / ln) + 17
    return n


def zone_drop_points(level: Level, zone: LiftZone, resolution: float) -> int:
    """Candidate drop points of ``zone`` over ``level`` at ``resolution`` (m): grid,
    member and mid-strip lines and zone boundary, before the in-zone test — the
    arrays the solver allocates first."""
    step = resolution / 2.0
    return (grid_points(level, zone, resolution) + line_points(level, step)
            + boundary_points(zone, step))


def check_drop_points(project: Project) -> None:
    """Refuse (:class:`BudgetError`) a project whose zones need more drop points,
    corridor tests or evaluated rows than :data:`MAX_DROP_POINTS_PER_ZONE`,
    :data:`MAX_CORRIDOR_TESTS` and :data:`MAX_DROP_POINTS`."""
    levels = {lv.id: lv for lv in project.levels}
    res = project.settings.grid_resolution
    total = 0
    lines: dict[str, int] = {}
    for z in project.lift_zones:
        level = levels.get(z.level_id)
        if level is None:
            continue
        if level.id not in lines:
            lines[level.id] = line_points(level, res / 2.0)
        n = grid_points(level, z, res) + lines[level.id] + boundary_points(z, res / 2.0)
        where = f"zone {z.id}"
        if n > MAX_DROP_POINTS_PER_ZONE:
            raise BudgetError(
                where, n, MAX_DROP_POINTS_PER_ZONE,
                f"needs {n:,} drop points at a grid resolution of {res:g} m, the limit is "
                f"{MAX_DROP_POINTS_PER_ZONE:,}: coarsen the grid resolution or split the "
                "zone")
        tests = n * len(z.corridor)
        if tests > MAX_CORRIDOR_TESTS:
            raise BudgetError(
                where, tests, MAX_CORRIDOR_TESTS,
                f"needs {tests:,} drop-point tests against a corridor of "
                f"{len(z.corridor):,} corners, the limit is {MAX_CORRIDOR_TESTS:,}: "
                "simplify the corridor or coarsen the grid resolution")
        total += n * max(1, len(z.loads))
    if total > MAX_DROP_POINTS:
        raise BudgetError(
            "lift_zones", total, MAX_DROP_POINTS,
            f"the lift zones need {total:,} drop-point evaluations (drop points × loads) at "
            f"a grid resolution of {res:g} m, the limit is {MAX_DROP_POINTS:,}: coarsen the "
            "grid resolution or split the project")

