"""Plan geometry for drawing lift zones: swing region outlines, the drift-margin
offset and polyline clipping. Pure Python, SI (m, rad)."""

from __future__ import annotations

import itertools
import math

from droprig.model import LiftZone

Pt = tuple[float, float]
ARC_STEP = math.radians(2.0)
"""Angular step when an arc is drawn as a polyline (rad)."""


def _u(a: float) -> Pt:
    return (math.cos(a), math.sin(a))


def arc(c: Pt, r: float, a0: float, sweep: float) -> list[Pt]:
    """Points on a circle of radius ``r`` about ``c`` from ``a0`` through ``sweep``
    (rad, counter-clockwise when positive), ends included."""
    n = max(2, math.ceil(abs(sweep) / ARC_STEP) + 1)
    return [(c[0] + r * math.cos(a0 + sweep * k / (n - 1)),
             c[1] + r * math.sin(a0 + sweep * k / (n - 1))) for k in range(n)]


def is_full_circle(zone: LiftZone) -> bool:
    return zone.slew_sweep >= 2 * math.pi - 1e-9


def swing_outlines(zone: LiftZone) -> list[list[Pt]]:
    """Closed outlines of the swing region (radius band × slew arc), before the
    corridor and the drift margin. A full circle gives the outer and, when
    r_min > 0, the inner circle."""
    c, r0, r1 = zone.crane, zone.r_min, zone.r_max
    if is_full_circle(zone):
        out = [arc(c, r1, 0.0, 2 * math.pi)]
        if r0 > 0:
            out.append(arc(c, r0, 0.0, 2 * math.pi))
        return out
    a0, sw = zone.slew_start, zone.slew_sweep
    pts = arc(c, r1, a0, sw)
    pts += arc(c, r0, a0 + sw, -sw) if r0 > 0 else [c]
    pts.append(pts[0])
    return [pts]


def drift_outlines(zone: LiftZone) -> list[list[Pt]]:
    """Closed outlines of the swing region widened by the drift margin d.

    The region is the set of points within d of the radius band × slew arc:
    outer arc at r_max + d, edges offset by d along their outward normals with
    round corners of radius d, inner arc at r_min − d. When r_min ≤ d the inner
    hole closes and the offset edges meet near the crane (joined by an arc of
    radius d for a slew of at most 180°, at their intersection beyond that).
    """
    c, r0, r1, d = zone.crane, zone.r_min, zone.r_max, zone.drift_margin
    if d <= 0:
        return swing_outlines(zone)
    if is_full_circle(zone):
        out = [arc(c, r1 + d, 0.0, 2 * math.pi)]
        if r0 - d > 0:
            out.append(arc(c, r0 - d, 0.0, 2 * math.pi))
        return out
    a0, sw = zone.slew_start, zone.slew_sweep
    a1 = a0 + sw
    pts = arc(c, r1 + d, a0, sw)
    corner = (c[0] + r1 * math.cos(a1), c[1] + r1 * math.sin(a1))
    pts += arc(corner, d, a1, math.pi / 2)
    if r0 > d:
        corner = (c[0] + r0 * math.cos(a1), c[1] + r0 * math.sin(a1))
        pts += arc(corner, d, a1 + math.pi / 2, math.pi / 2)
        pts += arc(c, r0 - d, a1, -sw)
        corner = (c[0] + r0 * math.cos(a0), c[1] + r0 * math.sin(a0))
        pts += arc(corner, d, a0 + math.pi, math.pi / 2)
    else:
        n1 = _u(a1 + math.pi / 2)
        n0 = _u(a0 - math.pi / 2)
        if sw <= math.pi:
            pts += arc(c, d, a1 + math.pi / 2, math.pi - sw)
        else:
            # offset lines p = c + d·n1 + t·u(a1) and q = c + d·n0 + s·u(a0) meet
            # where d·n1 + t·u1 = d·n0 + s·u0 (2×2 solve).
            u1, u0 = _u(a1), _u(a0)
            rx, ry = d * (n0[0] - n1[0]), d * (n0[1] - n1[1])
            det = u1[0] * (-u0[1]) - u1[1] * (-u0[0])
            if abs(det) < 1e-12:
                pts.append((c[0] + d * n1[0], c[1] + d * n1[1]))
                pts.append((c[0] + d * n0[0], c[1] + d * n0[1]))
            else:
                t = (rx * (-u0[1]) - ry * (-u0[0])) / det
                pts.append((c[0] + d * n1[0] + t * u1[0], c[1] + d * n1[1] + t * u1[1]))
    corner = (c[0] + r1 * math.cos(a0), c[1] + r1 * math.sin(a0))
    pts += arc(corner, d, a0 - math.pi / 2, math.pi / 2)
    pts.append(pts[0])
    return [pts]


def clip_polyline(pts: list[Pt], box: tuple[float, float, float, float]) -> list[list[Pt]]:
    """Parts of a polyline inside ``box`` = (x0, y0, x1, y1) (Liang–Barsky per
    segment, consecutive visible segments joined)."""
    x0, y0, x1, y1 = box
    parts: list[list[Pt]] = []
    cur: list[Pt] = []
    for (ax, ay), (bx, by) in itertools.pairwise(pts):
        dx, dy = bx - ax, by - ay
        t0, t1 = 0.0, 1.0
        ok = True
        for p, q in ((-dx, ax - x0), (dx, x1 - ax), (-dy, ay - y0), (dy, y1 - ay)):
            if abs(p) < 1e-15:
                if q < 0:
                    ok = False
                    break
                continue
            r = q / p
            if p < 0:
                t0 = max(t0, r)
            else:
                t1 = min(t1, r)
            if t0 > t1:
                ok = False
                break
        if not ok:
            if len(cur) > 1:
                parts.append(cur)
            cur = []
            continue
        s = (ax + t0 * dx, ay + t0 * dy)
        e = (ax + t1 * dx, ay + t1 * dy)
        if cur and (abs(cur[-1][0] - s[0]) > 1e-9 or abs(cur[-1][1] - s[1]) > 1e-9):
            if len(cur) > 1:
                parts.append(cur)
            cur = []
        if not cur:
            cur = [s]
        cur.append(e)
        if t1 < 1.0:
            parts.append(cur)
            cur = []
    if len(cur) > 1:
        parts.append(cur)
    return parts


def hatch_segments(x0: float, y0: float, x1: float, y1: float, spacing: float,
                   slope: int) -> list[tuple[float, float, float, float]]:
    """Segments of 45° hatch lines (``slope`` +1 or −1) at ``spacing`` measured
    along x, clipped to the rectangle [x0, x1] × [y0, y1]."""
    out = []
    w, h = x1 - x0, y1 - y0
    # lines y - y0 = slope·(x - x0) + c for c over the range that meets the box
    k = -math.floor(h / spacing) - 1 if slope > 0 else 0
    kmax = math.ceil(w / spacing) + 1 if slope > 0 else math.ceil((w + h) / spacing) + 1
    for i in range(k, kmax):
        c = i * spacing
        if slope > 0:
            # y = y0 + (x - x0) - c  ->  enters where x = x0 + c (y = y0) or y = y0 ...
            xa, ya = x0 + max(c, 0.0), y0 + max(-c, 0.0)
            xb = min(x1, x0 + c + h)
            yb = y0 + (xb - x0) - c
        else:
            # y = y0 + c - (x - x0)
            xa = x0 + max(0.0, c - h)
            ya = y0 + c - (xa - x0)
            xb = min(x1, x0 + c)
            yb = y0 + c - (xb - x0)
        if xb - xa > 1e-9:
            out.append((xa, ya, xb, yb))
    return out


def clip_polygon(poly: list[Pt], box: tuple[float, float, float, float]) -> list[Pt]:
    """The part of polygon ``poly`` inside the rectangle ``box`` = (x0, y0, x1, y1)
    (Sutherland–Hodgman: the clip window is convex, the polygon may be any simple
    polygon; a non-convex one may come back with zero-width bridges, harmless for a
    fill). Empty list when nothing is inside."""
    x0, y0, x1, y1 = box
    def at_x(a: Pt, b: Pt, x: float) -> Pt:
        return (x, a[1] + (b[1] - a[1]) * (x - a[0]) / (b[0] - a[0]))

    def at_y(a: Pt, b: Pt, y: float) -> Pt:
        return (a[0] + (b[0] - a[0]) * (y - a[1]) / (b[1] - a[1]), y)

    edges = (
        (lambda p: p[0] >= x0, lambda a, b: at_x(a, b, x0)),
        (lambda p: p[0] <= x1, lambda a, b: at_x(a, b, x1)),
        (lambda p: p[1] >= y0, lambda a, b: at_y(a, b, y0)),
        (lambda p: p[1] <= y1, lambda a, b: at_y(a, b, y1)),
    )
    out = [p for k, p in enumerate(poly) if k == 0 or p != poly[k - 1]]
    if len(out) > 1 and out[0] == out[-1]:
        out = out[:-1]
    for inside, cross in edges:
        if not out:
            break
        src, out = out, []
        prev = src[-1]
        for cur in src:
            if inside(cur):
                if not inside(prev):
                    out.append(cross(prev, cur))
                out.append(cur)
            elif inside(prev):
                out.append(cross(prev, cur))
            prev = cur
    return out if len(out) >= 3 else []
