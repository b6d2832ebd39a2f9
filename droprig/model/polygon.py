"""Plan polygons (lift corridors): is a list of corners a simple polygon with an area?

A corridor bounds where the load may travel; the drop points are the swing sector
inside it. A polygon whose edges cross or touch (a bow tie, a spike that doubles back)
or that encloses no area has no clear inside, so droprig refuses it wherever a corridor
is entered: typed, drawn or dragged on the plan.
"""

from __future__ import annotations

from collections.abc import Sequence

from droprig.model.errors import ModelError
from droprig.model.project import GEOMETRY_TOL

Corner = tuple[float, float]

CORRIDOR_ALLOWED = ("a simple polygon of at least 3 corners that encloses an area: "
                    "no two corners at the same place, no edge crossing or touching "
                    "another edge")
"""What a corridor may be, in words for the refusal message."""


def _cross(o: Corner, a: Corner, b: Corner) -> float:
    return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])


def _side(o: Corner, a: Corner, b: Corner, scale: float) -> int:
    """Which side of line o→a point b lies on: +1, −1, or 0 within GEOMETRY_TOL."""
    c = _cross(o, a, b)
    if abs(c) <= GEOMETRY_TOL * scale:
        return 0
    return 1 if c > 0 else -1


def _within(a: Corner, b: Corner, p: Corner) -> bool:
    """``p`` (on the line ab) lies within the segment ab's box, with tolerance."""
    t = GEOMETRY_TOL
    return (min(a[0], b[0]) - t <= p[0] <= max(a[0], b[0]) + t
            and min(a[1], b[1]) - t <= p[1] <= max(a[1], b[1]) + t)


def _segments_meet(a: Corner, b: Corner, c: Corner, d: Corner) -> bool:
    """Segments ab and cd cross or touch (endpoints and overlaps included)."""
    s1 = _side(a, b, c, _len(a, b))
    s2 = _side(a, b, d, _len(a, b))
    s3 = _side(c, d, a, _len(c, d))
    s4 = _side(c, d, b, _len(c, d))
    if s1 * s2 < 0 and s3 * s4 < 0:
        return True
    return ((s1 == 0 and _within(a, b, c)) or (s2 == 0 and _within(a, b, d))
            or (s3 == 0 and _within(c, d, a)) or (s4 == 0 and _within(c, d, b)))


def _dist(a: Corner, b: Corner) -> float:
    return ((b[0] - a[0]) ** 2 + (b[1] - a[1]) ** 2) ** 0.5


def _len(a: Corner, b: Corner) -> float:
    """Scale of the side test on line ab: |ab|, at least 1 m, so the test's tolerance
    is a distance of GEOMETRY_TOL from the line."""
    return max(_dist(a, b), 1.0)


def polygon_area(points: Sequence[Corner]) -> float:
    """Signed area (m², counter-clockwise positive), shoelace formula."""
    n = len(points)
    return 0.5 * sum(points[i][0] * points[(i + 1) % n][1]
                     - points[(i + 1) % n][0] * points[i][1] for i in range(n))


def _first_close_pair(pts: list[Corner]) -> tuple[int, int] | None:
    """The first pair (i < j, in lexicographic order) of corners within GEOMETRY_TOL
    of each other in x and in y, or None. Sorted by x, each corner is compared only
    with the corners after it within the tolerance: O(n log n) for any corridor
    whose corners are not piled on one vertical line."""
    t = GEOMETRY_TOL
    order = sorted(range(len(pts)), key=lambda i: pts[i][0])
    best: tuple[int, int] | None = None
    for a, i in enumerate(order):
        xi, yi = pts[i]
        for j in order[a + 1:]:
            if pts[j][0] - xi > t:
                break
            if abs(pts[j][1] - yi) <= t:
                pair = (min(i, j), max(i, j))
                if best is None or pair < best:
                    best = pair
    return best


def _box_pairs(pts: list[Corner], edges: list[tuple[int, int]]) -> list[tuple[int, int]]:
    """Pairs (a < b) of edges whose bounding boxes, widened by GEOMETRY_TOL, overlap,
    in lexicographic order: a sweep over the edges sorted by their left end (the
    classic sort-and-sweep broad phase; O(n log n + k) for k overlapping pairs)."""
    t = GEOMETRY_TOL
    box = []
    for i, j in edges:
        (x0, y0), (x1, y1) = pts[i], pts[j]
        box.append((min(x0, x1) - t, max(x0, x1) + t, min(y0, y1) - t, max(y0, y1) + t))
    order = sorted(range(len(edges)), key=lambda e: box[e][0])
    out = []
    for pos, a in enumerate(order):
        _, ax1, ay0, ay1 = box[a]
        for b in order[pos + 1:]:
            bx0, _, by0, by1 = box[b]
            if bx0 > ax1:
                break
            if by0 <= ay1 and ay0 <= by1:
                out.append((min(a, b), max(a, b)))
    out.sort()
    return out


def corridor_problem(points: Sequence[Corner]) -> str | None:
    """Why ``points`` (plan corners, m, in order) is not an acceptable corridor, in
    words naming the corners (numbered from 1), or None if it is. An empty list is
    acceptable (no corridor: the whole swing sector)."""
    pts = [(float(x), float(y)) for x, y in points]
    n = len(pts)
    if n == 0:
        return None
    if n < 3:
        return f"{n} corner(s)"
    same = _first_close_pair(pts)
    if same is not None:
        return f"corners {same[0] + 1} and {same[1] + 1} are at the same place"
    edges = [(i, (i + 1) % n) for i in range(n)]

    def name(e: tuple[int, int]) -> str:
        return f"{e[0] + 1}–{e[1] + 1}"

    # only pairs of edges whose boxes (widened by the tolerance) overlap can meet:
    # found by a sweep along x, tested in the order of the full pairwise loop so the
    # message names the same pair
    for a, b in _box_pairs(pts, edges):
        (i, j), (k, m) = edges[a], edges[b]
        shared = {i, j} & {k, m}
        if not shared:
            if _segments_meet(pts[i], pts[j], pts[k], pts[m]):
                return f"edge {name(edges[a])} crosses or touches edge {name(edges[b])}"
            continue
        # adjacent edges: they may not fold back over each other
        v = shared.pop()
        p = pts[j] if v == i else pts[i]
        q = pts[m] if v == k else pts[k]
        o = pts[v]
        if _side(o, p, q, _len(o, p)) == 0 and \
                (p[0] - o[0]) * (q[0] - o[0]) + (p[1] - o[1]) * (q[1] - o[1]) > 0:
            return f"edge {name(edges[b])} folds back over edge {name(edges[a])}"
    area = abs(polygon_area(pts))
    perimeter = sum(_dist(pts[i], pts[(i + 1) % n]) for i in range(n))
    if area <= GEOMETRY_TOL * perimeter:
        return "the corners lie on one line (no area)"
    return None


def check_corridor(field: str, points: Sequence[Corner]) -> tuple[Corner, ...]:
    """``points`` as a tuple of float pairs, or ModelError(field, problem, allowed)."""
    problem = corridor_problem(points)
    if problem is not None:
        raise ModelError(field, problem, CORRIDOR_ALLOWED)
    return tuple((float(x), float(y)) for x, y in points)
