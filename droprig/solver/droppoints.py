"""Drop points of a lift zone over a level (plan geometry, vectorised, SI).

Zone region: the annulus r_min ≤ r ≤ r_max around the crane, slewing
counter-clockwise from ``slew_start`` to ``slew_end``, intersected with the
corridor polygon when one is drawn; each part is widened by ``drift_margin``
(the load may swing that far outside the path of the hook). Widening the sector
and the corridor separately and intersecting gives a region at least as large as
widening their intersection (conservative: more points, never fewer).

The points assessed are the zone ∩ the deck panels of the level:

* a square grid at ``settings.grid_resolution`` anchored on the first column line,
* every point that can govern: along each member line inside the zone (deck
  members carry the load directly, supports of the deck strips), along the deck
  mid-strips, at member midspans and close to member ends (web checks), at the
  columns, and along the zone boundary (the nearest approach to a stiff support),
* later, :mod:`droprig.solver.analysis` refines around the worst point of each bay.

Points inside a deck opening are kept: the load falls through (response
"exceeds", check "opening").
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from droprig.model import Level, LiftZone
from droprig.solver.loadpath import Frame, frame_memo, locate
from droprig.solver.parallel import for_blocks

__all__ = [
    "base_points",
    "bay_index",
    "in_bay_rect",
    "in_openings",
    "in_zone",
    "into_zone",
    "line_points",
    "project_into_zone",
    "reaches_off_deck",
    "zone_distance",
]

EDGE_TOL = 1e-7
"""Points this close (m) outside the zone or a bay still count as inside."""

BLOCK = 1 << 15
"""Points per block of the plan tests on many points (run on several threads)."""


def _seg_dist(px: np.ndarray, py: np.ndarray, ax: float, ay: float, bx: float,
              by: float) -> np.ndarray:
    """Distance from points to the segment a–b, m."""
    dx, dy = bx - ax, by - ay
    ll = dx * dx + dy * dy
    if ll <= 0.0:
        return np.hypot(px - ax, py - ay)
    t = np.clip(((px - ax) * dx + (py - ay) * dy) / ll, 0.0, 1.0)
    return np.hypot(px - (ax + t * dx), py - (ay + t * dy))


def sector_distance(zone: LiftZone, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Distance (m) from each point to the annular sector of ``zone`` (0 inside)."""
    cx, cy = zone.crane
    dx, dy = x - cx, y - cy
    r = np.hypot(dx, dy)
    radial = np.maximum(np.maximum(zone.r_min - r, r - zone.r_max), 0.0)
    sweep = zone.slew_sweep
    if sweep >= 2 * math.pi - 1e-9:
        return radial
    ang = np.mod(np.arctan2(dy, dx) - zone.slew_start, 2 * math.pi)
    inside_arc = ang <= sweep + 1e-12
    out = radial.copy()
    if not np.all(inside_arc):
        d = np.full(x.shape, np.inf)
        for th in (zone.slew_start, zone.slew_start + sweep):
            c, s = math.cos(th), math.sin(th)
            d = np.minimum(d, _seg_dist(x, y, cx + zone.r_min * c, cy + zone.r_min * s,
                                        cx + zone.r_max * c, cy + zone.r_max * s))
        out = np.where(inside_arc, radial, d)
    return out


def polygon_distance(poly: tuple[tuple[float, float], ...], x: np.ndarray,
                     y: np.ndarray) -> np.ndarray:
    """Distance (m) from each point to a simple polygon (0 inside; even–odd rule).

    Every edge at once, laid out (edge, point); each distance and crossing is the
    same floating-point expression as for one edge at a time (:func:`_seg_dist`)."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    if x.ndim != 1 or x.shape != y.shape or not poly:
        return _polygon_distance_by_edge(poly, x, y)
    e = _edges(tuple((float(px), float(py)) for px, py in poly))
    out = np.empty(x.shape)

    def block(s: int, t: int) -> None:
        px, py = x[s:t], y[s:t]
        out[s:t] = np.where(_inside(e, px, py), 0.0, _edge_distance(e, px, py))

    for_blocks(block, x.size, max(256, (1 << 17) // len(poly)))
    return out


@dataclass(frozen=True)
class _Edges:
    """Edges of a polygon as (n, 1) columns: start a, end b, d = b − a, |d|² (1 for a
    zero-length edge, flagged in ``degenerate``), sx = bx − ax, sy = by − ay."""

    ax: np.ndarray
    ay: np.ndarray
    by: np.ndarray
    dx: np.ndarray
    dy: np.ndarray
    ll: np.ndarray
    sx: np.ndarray
    sy: np.ndarray
    degenerate: np.ndarray | None


@lru_cache(maxsize=64)
def _edges(poly: tuple[tuple[float, float], ...]) -> _Edges:
    p = np.array(poly, dtype=float).reshape(-1, 2)
    ax, ay = p[:, 0], p[:, 1]
    bx, by = np.roll(ax, -1), np.roll(ay, -1)
    dx, dy = bx - ax, by - ay
    ll = dx * dx + dy * dy
    deg = ll <= 0.0
    col = lambda v: np.ascontiguousarray(v, dtype=float).reshape(-1, 1)  # noqa: E731
    return _Edges(col(ax), col(ay), col(by), col(dx), col(dy), col(np.where(deg, 1.0, ll)),
                  col(dx), col(dy), deg if deg.any() else None)


def _edge_distance(e: _Edges, px: np.ndarray, py: np.ndarray) -> np.ndarray:
    """Distance from each point to the nearest edge (the boundary), :func:`_seg_dist`
    for every edge at once."""
    ex = np.subtract(px, e.ax)  # (edge, point)
    ey = np.subtract(py, e.ay)
    # nearest point of each edge: t = clip(((p − a)·d)/|d|², 0, 1)
    tt = np.multiply(ex, e.dx)
    tt += np.multiply(ey, e.dy, out=ex)
    tt /= e.ll
    np.clip(tt, 0.0, 1.0, out=tt)
    if e.degenerate is not None:
        tt[e.degenerate] = 0.0  # a zero-length edge: its point a
    qx = np.multiply(tt, e.dx, out=ex)
    qx += e.ax
    np.subtract(px, qx, out=qx)
    qy = np.multiply(tt, e.dy, out=tt)
    qy += e.ay
    np.subtract(py, qy, out=qy)
    return np.hypot(qx, qy, out=qx).min(axis=0)


def _inside(e: _Edges, px: np.ndarray, py: np.ndarray) -> np.ndarray:
    """Even–odd rule: an odd number of edges cross the horizontal line through p,
    right of p."""
    cross = np.greater(e.ay, py)
    cross ^= np.greater(e.by, py)
    with np.errstate(divide="ignore", invalid="ignore"):
        xint = np.subtract(py, e.ay)
        xint *= e.sx
        xint /= e.sy
        xint += e.ax
    cross &= np.less(px, xint)
    return np.logical_xor.reduce(cross, axis=0)


def _polygon_distance_by_edge(poly: tuple[tuple[float, float], ...], x: np.ndarray,
                              y: np.ndarray) -> np.ndarray:
    inside = np.zeros(x.shape, dtype=bool)
    d = np.full(x.shape, np.inf)
    n = len(poly)
    for i in range(n):
        ax, ay = poly[i]
        bx, by = poly[(i + 1) % n]
        d = np.minimum(d, _seg_dist(x, y, ax, ay, bx, by))
        cond = (ay > y) != (by > y)
        with np.errstate(divide="ignore", invalid="ignore"):
            xint = ax + (y - ay) * (bx - ax) / (by - ay)
        inside ^= cond & (x < xint)
    return np.where(inside, 0.0, d)


def zone_distance(zone: LiftZone, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """How far (m) each point lies outside the un-widened zone: the larger of its
    distances to the sector and to the corridor (0 inside both)."""
    d = sector_distance(zone, x, y)
    if zone.corridor:
        d = np.maximum(d, polygon_distance(zone.corridor, x, y))
    return d


def _nearest_on_segment(px: np.ndarray, py: np.ndarray, ax: float, ay: float, bx: float,
                        by: float) -> tuple[np.ndarray, np.ndarray]:
    dx, dy = bx - ax, by - ay
    ll = dx * dx + dy * dy
    if ll <= 0.0:
        return np.full(px.shape, ax), np.full(py.shape, ay)
    t = np.clip(((px - ax) * dx + (py - ay) * dy) / ll, 0.0, 1.0)
    return ax + t * dx, ay + t * dy


def _nearest_in_sector(zone: LiftZone, x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray,
                                                                              np.ndarray]:
    """Nearest point of the (un-widened) annular sector to each point."""
    cx, cy = zone.crane
    dx, dy = x - cx, y - cy
    r = np.hypot(dx, dy)
    safe = np.where(r > 0, r, 1.0)
    ux = np.where(r > 0, dx / safe, math.cos(zone.slew_start))
    uy = np.where(r > 0, dy / safe, math.sin(zone.slew_start))
    rc = np.clip(r, zone.r_min, zone.r_max)
    qx, qy = cx + rc * ux, cy + rc * uy
    sweep = zone.slew_sweep
    if sweep >= 2 * math.pi - 1e-9:
        return qx, qy
    ang = np.mod(np.arctan2(dy, dx) - zone.slew_start, 2 * math.pi)
    inside_arc = ang <= sweep + 1e-12
    best_d = np.full(x.shape, np.inf)
    bx_, by_ = qx.copy(), qy.copy()
    for th in (zone.slew_start, zone.slew_start + sweep):
        c, s_ = math.cos(th), math.sin(th)
        ex, ey = _nearest_on_segment(x, y, cx + zone.r_min * c, cy + zone.r_min * s_,
                                     cx + zone.r_max * c, cy + zone.r_max * s_)
        d = np.hypot(x - ex, y - ey)
        better = d < best_d
        bx_ = np.where(better, ex, bx_)
        by_ = np.where(better, ey, by_)
        best_d = np.minimum(best_d, d)
    return np.where(inside_arc, qx, bx_), np.where(inside_arc, qy, by_)


def _nearest_in_polygon(poly: tuple[tuple[float, float], ...], x: np.ndarray,
                        y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Nearest point of the polygon (its boundary, or the point itself inside) to each
    point: every edge at once, laid out (edge, point), the first nearest edge kept —
    the same floating-point expressions and choice as :func:`_nearest_on_segment`
    edge by edge (``_nearest_in_polygon_by_edge``)."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    if x.ndim != 1 or x.shape != y.shape or not poly:
        return _nearest_in_polygon_by_edge(poly, x, y)
    inside = polygon_distance(poly, x, y) <= 0.0
    e = _edges(tuple((float(px), float(py)) for px, py in poly))
    tt = np.multiply(np.subtract(x, e.ax), e.dx)  # (edge, point)
    tt += np.multiply(np.subtract(y, e.ay), e.dy)
    tt /= e.ll
    np.clip(tt, 0.0, 1.0, out=tt)
    if e.degenerate is not None:
        tt[e.degenerate] = 0.0  # a zero-length edge: its point a
    ex = np.multiply(tt, e.dx)
    ex += e.ax
    ey = np.multiply(tt, e.dy, out=tt)
    ey += e.ay
    d = np.hypot(x - ex, y - ey)
    j = np.argmin(d, axis=0)  # the first edge of least distance
    cols = np.arange(x.size)
    qx, qy = ex[j, cols], ey[j, cols]
    if np.isnan(d).any():  # the edge-by-edge form keeps x, y where no distance is a number
        return _nearest_in_polygon_by_edge(poly, x, y)
    return np.where(inside, x, qx), np.where(inside, y, qy)


def _nearest_in_polygon_by_edge(poly: tuple[tuple[float, float], ...], x: np.ndarray,
                                y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    inside = polygon_distance(poly, x, y) <= 0.0
    best_d = np.full(x.shape, np.inf)
    qx, qy = x.copy(), y.copy()
    n = len(poly)
    for i in range(n):
        (ax, ay), (bx, by) = poly[i], poly[(i + 1) % n]
        ex, ey = _nearest_on_segment(x, y, ax, ay, bx, by)
        d = np.hypot(x - ex, y - ey)
        better = d < best_d
        qx = np.where(better, ex, qx)
        qy = np.where(better, ey, qy)
        best_d = np.minimum(best_d, d)
    return np.where(inside, x, qx), np.where(inside, y, qy)


def _pull(x: np.ndarray, y: np.ndarray, qx: np.ndarray, qy: np.ndarray,
          margin: float) -> tuple[np.ndarray, np.ndarray]:
    """Move each point to within ``margin`` of its nearest set point (qx, qy)."""
    d = np.hypot(x - qx, y - qy)
    k = np.where(d > margin, margin / np.where(d > 0, d, 1.0), 1.0)
    return qx + (x - qx) * k, qy + (y - qy) * k


def project_into_zone(zone: LiftZone, x: np.ndarray, y: np.ndarray,
                      sweeps: int = 4) -> tuple[np.ndarray, np.ndarray]:
    """Move points outside the widened zone onto its boundary (points inside stay).

    Nearest-point projection onto the widened sector, then onto the widened
    corridor, alternated ``sweeps`` times (alternating projections onto two
    intersecting sets approach a point of their intersection). Used to refine the
    search for the worst drop point right up to the zone's edge.
    """
    px, py, _ = into_zone(zone, x, y, sweeps)
    return px, py


def into_zone(zone: LiftZone, x: np.ndarray, y: np.ndarray,
              sweeps: int = 4) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """:func:`project_into_zone` and :func:`in_zone` of the points it gives: a point
    it leaves where it was lies in the zone already, so only the moved points are
    tested again (the test is point by point: the same answer as testing all)."""
    x = np.asarray(x, float).copy()
    y = np.asarray(y, float).copy()
    inside = in_zone(zone, x, y)
    out = ~inside
    if not out.any():
        return x, y, inside
    px, py = x[out], y[out]
    m = zone.drift_margin
    for _ in range(sweeps if zone.corridor else 1):
        qx, qy = _nearest_in_sector(zone, px, py)
        px, py = _pull(px, py, qx, qy, m)
        if zone.corridor:
            qx, qy = _nearest_in_polygon(zone.corridor, px, py)
            px, py = _pull(px, py, qx, qy, m)
    x[out], y[out] = px, py
    inside[out] = in_zone(zone, px, py)
    return x, y, inside


def into_zone_over_deck(frame: Frame, zone: LiftZone, x: np.ndarray, y: np.ndarray
                        ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """:func:`into_zone` of the points (m) and whether each moved point lies in the
    zone and over a deck panel (:func:`~droprig.solver.loadpath.locate` ≥ 0), worked
    out once per distinct point and taken for its repeats (the refinement lattices of
    several loads, or of several trials of one bay, around one worst point): both are
    point by point, so the same values row for row as working out every point."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    _, first, inv = np.unique(x + 1j * y, return_index=True, return_inverse=True)
    inv = inv.ravel()
    px, py, inside = into_zone(zone, x[first], y[first])
    keep = inside & (locate(frame, px, py) >= 0)
    return px[inv], py[inv], keep[inv]


def in_zone(zone: LiftZone, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """True where the point lies in the zone widened by its drift margin.

    :func:`zone_distance` ≤ margin, evaluated as sector distance ≤ margin and (where
    that holds) corridor distance ≤ margin: the same test, as max(a, b) ≤ c exactly
    when a ≤ c and b ≤ c (a nan fails both forms)."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    lim = zone.drift_margin + EDGE_TOL
    ok = sector_distance(zone, x, y) <= lim
    if not zone.corridor:
        return ok
    if ok.ndim != 1 or x.shape != y.shape:
        return ok & (polygon_distance(zone.corridor, x, y) <= lim)
    # corridor distance ≤ margin: 0 inside the polygon, else the distance to its edges
    idx = np.flatnonzero(ok)
    e = _edges(tuple((float(px), float(py)) for px, py in zone.corridor))

    def block(s: int, t: int) -> None:
        sub = idx[s:t]
        px, py = x[sub], y[sub]
        res = np.full(sub.size, 0.0 <= lim)
        out = np.flatnonzero(~_inside(e, px, py))
        res[out] = _edge_distance(e, px[out], py[out]) <= lim
        ok[sub] = res

    for_blocks(block, idx.size, max(256, (1 << 17) // len(zone.corridor)))
    return ok


def in_openings(level: Level, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """True where the point lies inside a deck opening (edges included)."""
    out = np.zeros(np.shape(x), dtype=bool)
    if not level.deck.openings:
        return out
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    if out.ndim != 1 or x.shape != y.shape:
        for r in level.deck.openings:
            out |= (x >= r.x0) & (x <= r.x1) & (y >= r.y0) & (y <= r.y1)
        return out

    def block(s: int, e: int) -> None:
        xb, yb, ob = x[s:e], y[s:e], out[s:e]
        t = np.empty(e - s, dtype=bool)
        for r in level.deck.openings:
            ins = np.greater_equal(xb, r.x0)
            ins &= np.less_equal(xb, r.x1, out=t)
            ins &= np.greater_equal(yb, r.y0, out=t)
            ins &= np.less_equal(yb, r.y1, out=t)
            ob |= ins

    for_blocks(block, out.size, BLOCK)
    return out


def bay_index(level: Level, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Index into ``droprig.model.bays(level)`` (y outer, x inner); −1 outside."""
    g = level.grid
    xl, yl = np.asarray(g.x_lines), np.asarray(g.y_lines)
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    if x.ndim != 1 or x.shape != y.shape:
        i = np.clip(np.searchsorted(xl, x, side="right") - 1, 0, xl.size - 2)
        j = np.clip(np.searchsorted(yl, y, side="right") - 1, 0, yl.size - 2)
        inside = (x >= xl[0] - EDGE_TOL) & (x <= xl[-1] + EDGE_TOL) & \
            (y >= yl[0] - EDGE_TOL) & (y <= yl[-1] + EDGE_TOL)
        return np.where(inside, j * (xl.size - 1) + i, -1)
    out = np.empty(x.shape, dtype=np.intp)
    x_lo, x_hi = xl[0] - EDGE_TOL, xl[-1] + EDGE_TOL
    y_lo, y_hi = yl[0] - EDGE_TOL, yl[-1] + EDGE_TOL

    def block(s: int, e: int) -> None:
        xb, yb = x[s:e], y[s:e]
        i = np.searchsorted(xl, xb, side="right")
        i -= 1
        np.clip(i, 0, xl.size - 2, out=i)
        j = np.searchsorted(yl, yb, side="right")
        j -= 1
        np.clip(j, 0, yl.size - 2, out=j)
        j *= xl.size - 1
        j += i
        t = np.empty(e - s, dtype=bool)
        inside = np.greater_equal(xb, x_lo)
        inside &= np.less_equal(xb, x_hi, out=t)
        inside &= np.greater_equal(yb, y_lo, out=t)
        inside &= np.less_equal(yb, y_hi, out=t)
        j[~inside] = -1
        out[s:e] = j

    for_blocks(block, x.size, BLOCK)
    return out


def in_bay_rect(level: Level, bay: int, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """True where the point lies in bay ``bay`` including its edges (a point on a
    shared grid line or at a column belongs to every bay it touches)."""
    g = level.grid
    nx = len(g.x_lines) - 1
    i, j = bay % nx, bay // nx
    x0, x1 = g.x_lines[i], g.x_lines[i + 1]
    y0, y1 = g.y_lines[j], g.y_lines[j + 1]
    return (x >= x0 - EDGE_TOL) & (x <= x1 + EDGE_TOL) & (y >= y0 - EDGE_TOL) & \
        (y <= y1 + EDGE_TOL)


def _zone_bbox(zone: LiftZone) -> tuple[float, float, float, float]:
    m = zone.drift_margin
    cx, cy = zone.crane
    x0, y0, x1, y1 = cx - zone.r_max, cy - zone.r_max, cx + zone.r_max, cy + zone.r_max
    if zone.corridor:
        px = [p[0] for p in zone.corridor]
        py = [p[1] for p in zone.corridor]
        x0, x1 = max(x0, min(px)), min(x1, max(px))
        y0, y1 = max(y0, min(py)), min(y1, max(py))
    return x0 - m, y0 - m, x1 + m, y1 + m


def _samples(lo: float, hi: float, step: float) -> np.ndarray:
    n = max(1, math.ceil((hi - lo) / step - 1e-9))
    return np.linspace(lo, hi, n + 1)


def line_points(frame: Frame, step: float) -> tuple[np.ndarray, np.ndarray]:
    """Points along every member line, along each deck mid-strip, at member
    midspans, at d/2, d and the ends of every member (web checks near supports)
    and at every column, m. Built once per frame and step (read-only arrays)."""
    return frame_memo(frame, ("line_points", float(step)),
                      lambda: _frozen(*_line_points(frame, step)))


def _frozen(x: np.ndarray, y: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    for a in (x, y):
        a.setflags(write=False)
    return x, y


def _line_points(frame: Frame, step: float) -> tuple[np.ndarray, np.ndarray]:
    level = frame.level
    xs: list[np.ndarray] = []
    ys: list[np.ndarray] = []
    for m in level.members:
        (x0, y0), (x1, y1) = m.start, m.end
        L = m.span
        d = m.section.d
        t = np.concatenate([_samples(0.0, 1.0, step / L),
                            np.array([0.5, d / (2 * L), d / L, 1 - d / (2 * L), 1 - d / L])])
        t = np.clip(t, 0.0, 1.0)
        xs.append(x0 + (x1 - x0) * t)
        ys.append(y0 + (y1 - y0) * t)
    # deck mid-strips: halfway between the two members of each panel, over the cell
    ub, vb = frame.u_breaks, frame.v_breaks
    for iu in range(frame.cell_pair.shape[0]):
        for iv in range(frame.cell_pair.shape[1]):
            ip = frame.cell_pair[iu, iv]
            if ip < 0:
                continue
            c0, c1 = frame.pair_c[ip]
            um = 0.5 * (c0 + c1)
            if not (ub[iu] - EDGE_TOL <= um <= ub[iu + 1] + EDGE_TOL):
                continue
            v = _samples(vb[iv], vb[iv + 1], step)
            u = np.full(v.shape, um)
            x, y = (v, u) if frame.deck_axis == "x" else (u, v)
            xs.append(x)
            ys.append(y)
    cols = np.array(level.grid.columns, dtype=float).reshape(-1, 2)
    xs.append(cols[:, 0])
    ys.append(cols[:, 1])
    return np.concatenate(xs), np.concatenate(ys)


def boundary_points(zone: LiftZone, step: float) -> tuple[np.ndarray, np.ndarray]:
    """Points on the boundary of the widened sector and of the widened corridor, m."""
    m = zone.drift_margin
    cx, cy = zone.crane
    xs: list[np.ndarray] = []
    ys: list[np.ndarray] = []
    full = zone.slew_sweep >= 2 * math.pi - 1e-9
    th0 = zone.slew_start
    sweep = zone.slew_sweep
    for r in (zone.r_min - m, zone.r_max + m):
        if r <= 0:
            continue
        n = max(8, math.ceil(r * (2 * math.pi if full else sweep) / step))
        th = th0 + np.linspace(0.0, 2 * math.pi if full else sweep, n + 1)
        xs.append(cx + r * np.cos(th))
        ys.append(cy + r * np.sin(th))
    if not full:
        for th_e, sgn in ((th0, -1.0), (th0 + sweep, 1.0)):
            c, s = math.cos(th_e), math.sin(th_e)
            nx, ny = -s * sgn, c * sgn  # outward normal of the straight edge
            rr = _samples(max(zone.r_min, 0.0), zone.r_max, step)
            xs.append(cx + rr * c + m * nx)
            ys.append(cy + rr * s + m * ny)
            for r in (zone.r_min, zone.r_max):  # rounded corners
                if r <= 0 and m <= 0:
                    continue
                phi = np.linspace(0.0, 2 * math.pi, 17)
                xs.append(cx + r * c + m * np.cos(phi))
                ys.append(cy + r * s + m * np.sin(phi))
    if zone.corridor:
        poly = zone.corridor
        for i in range(len(poly)):
            (ax, ay), (bx, by) = poly[i], poly[(i + 1) % len(poly)]
            ln = math.hypot(bx - ax, by - ay)
            if ln <= 0:
                continue
            t = _samples(0.0, 1.0, step / ln)
            nx, ny = (by - ay) / ln, -(bx - ax) / ln
            for sgn in (1.0, -1.0):
                xs.append(ax + (bx - ax) * t + sgn * m * nx)
                ys.append(ay + (by - ay) * t + sgn * m * ny)
            phi = np.linspace(0.0, 2 * math.pi, 17)
            xs.append(ax + m * np.cos(phi))
            ys.append(ay + m * np.sin(phi))
    if not xs:
        return np.zeros(0), np.zeros(0)
    x, y = np.concatenate(xs), np.concatenate(ys)
    # pull each point a hair inside so that rounding never drops it
    d = zone_distance(zone, x, y)
    keep = d <= m + 1e-6
    return x[keep], y[keep]


def base_points(frame: Frame, zone: LiftZone, resolution: float) -> tuple[np.ndarray,
                                                                         np.ndarray]:
    """Grid plus governing points of ``zone`` over ``frame``'s deck (see module
    docstring), deduplicated to 1e-6 m. Points outside every deck panel and
    outside the zone are dropped, except points in openings which are kept.
    Remembered per frame, zone and resolution (the caller gets its own copies)."""
    x, y = frame_memo(frame, ("base_points", zone, float(resolution)),
                      lambda: _frozen(*_base_points(frame, zone, resolution)))
    return x.copy(), y.copy()


def _base_points(frame: Frame, zone: LiftZone, resolution: float) -> tuple[np.ndarray,
                                                                          np.ndarray]:
    level = frame.level
    ext = level.grid.extent
    bx0, by0, bx1, by1 = _zone_bbox(zone)
    x0, y0 = max(bx0, ext.x0), max(by0, ext.y0)
    x1, y1 = min(bx1, ext.x1), min(by1, ext.y1)
    parts_x: list[np.ndarray] = []
    parts_y: list[np.ndarray] = []
    if x1 >= x0 and y1 >= y0:
        gx0 = ext.x0 + math.floor((x0 - ext.x0) / resolution) * resolution
        gy0 = ext.y0 + math.floor((y0 - ext.y0) / resolution) * resolution
        gx = np.arange(gx0, x1 + resolution * 0.5, resolution)
        gy = np.arange(gy0, y1 + resolution * 0.5, resolution)
        GX, GY = np.meshgrid(gx, gy)
        parts_x.append(GX.ravel())
        parts_y.append(GY.ravel())
    lx, ly = line_points(frame, resolution / 2.0)
    parts_x.append(lx)
    parts_y.append(ly)
    zx, zy = boundary_points(zone, resolution / 2.0)
    parts_x.append(zx)
    parts_y.append(zy)
    x = np.concatenate(parts_x)
    y = np.concatenate(parts_y)
    # over a deck panel, then in the zone (the zone test on those points only)
    idx = np.flatnonzero(locate(frame, x, y) >= 0)
    x, y = x[idx], y[idx]
    keep = in_zone(zone, x, y)
    return dedupe(x[keep], y[keep])


def reaches_off_deck(frame: Frame, zone: LiftZone, resolution: float) -> bool:
    """True when part of the widened zone lies beyond the deck panels of the level
    (sampled on a grid of ``resolution``, or coarser for a large zone — at most about
    150 × 150 samples): drops there are not assessed here. Remembered per frame,
    zone and resolution."""
    return frame_memo(frame, ("reaches_off_deck", zone, float(resolution)),
                      lambda: _reaches_off_deck(frame, zone, resolution))


def _reaches_off_deck(frame: Frame, zone: LiftZone, resolution: float) -> bool:
    bx0, by0, bx1, by1 = _zone_bbox(zone)
    step = max(resolution, (bx1 - bx0) / 150.0, (by1 - by0) / 150.0)
    gx = np.arange(bx0, bx1 + step, step)
    gy = np.arange(by0, by1 + step, step)
    GX, GY = np.meshgrid(gx, gy)
    x, y = GX.ravel(), GY.ravel()
    off = np.flatnonzero(locate(frame, x, y) < 0)
    return bool(np.any(in_zone(zone, x[off], y[off])))


def dedupe(x: np.ndarray, y: np.ndarray, tol: float = 1e-6) -> tuple[np.ndarray, np.ndarray]:
    """Remove repeated points (closer than ``tol`` on a lattice), keeping order by
    (y, x)."""
    if x.size == 0:
        return x, y
    ky, kx = np.round(y / tol), np.round(x / tol)
    # the first point of each run of equal (ky, kx) in a stable sort: the first
    # occurrence of each lattice key, as np.unique(..., axis=0, return_index=True)
    order = np.lexsort((kx, ky))
    sy, sx = ky[order], kx[order]
    first = np.empty(order.size, dtype=bool)
    first[0] = True
    np.not_equal(sy[1:], sy[:-1], out=first[1:])
    first[1:] |= sx[1:] != sx[:-1]
    idx = np.sort(order[first])
    return x[idx], y[idx]
