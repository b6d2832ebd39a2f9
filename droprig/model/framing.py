"""Bays, the framing generator and removing members (pure geometry, SI)."""

from __future__ import annotations

import math
import string
from collections.abc import Iterable
from dataclasses import dataclass, replace
from typing import Literal

from droprig.model.errors import ModelError, check_range
from droprig.model.project import ColumnGrid, Deck, Level, Member, Rect
from droprig.model.sections import Grade, Section


@dataclass(frozen=True)
class Bay:
    """A column bay: the deck panel between two adjacent grid lines each way.

    This is the unit a safety officer reviews. ``id`` reads like
    ``"1-2/A-B"`` (x-lines then y-lines).
    """

    id: str
    level_id: str
    i: int
    j: int
    rect: Rect


def bays(level: Level) -> tuple[Bay, ...]:
    """The column bays of a level, row by row (y outer, x inner)."""
    g = level.grid
    out = []
    for j in range(len(g.y_lines) - 1):
        for i in range(len(g.x_lines) - 1):
            bay_id = f"{g.x_labels[i]}-{g.x_labels[i + 1]}/{g.y_labels[j]}-{g.y_labels[j + 1]}"
            out.append(Bay(bay_id, level.id, i, j,
                           Rect(g.x_lines[i], g.y_lines[j], g.x_lines[i + 1], g.y_lines[j + 1])))
    return tuple(out)


def default_labels(n: int, style: Literal["numbers", "letters"]) -> tuple[str, ...]:
    """Grid labels 1, 2, 3 … or A, B, … Z, AA, AB … (I and O skipped, common practice,
    no source)."""
    if style == "numbers":
        return tuple(str(i + 1) for i in range(n))
    letters = [c for c in string.ascii_uppercase if c not in "IO"]
    out: list[str] = []
    k = 0
    while len(out) < n:
        out.append(letters[k] if k < len(letters) else
                   letters[k // len(letters) - 1] + letters[k % len(letters)])
        k += 1
    return tuple(out)


def generate_level(
    *,
    level_id: str,
    name: str,
    elevation: float,
    x_spacings: tuple[float, ...],
    y_spacings: tuple[float, ...],
    girder_direction: Literal["x", "y"],
    beam_spacing: float,
    girder_section: Section,
    beam_section: Section,
    girder_grade: Grade,
    beam_grade: Grade,
    deck: Deck | None = None,
    superimposed_dead: float = 1000.0,
    live_in_place: float = 0.0,
    x_labels: tuple[str, ...] | None = None,
    y_labels: tuple[str, ...] | None = None,
    origin: tuple[float, float] = (0.0, 0.0),
) -> Level:
    """Build a regularly framed level.

    Girders run along ``girder_direction`` on every grid line of that direction,
    spanning column to column. Infill beams run the other way between girders,
    on every column line (framing column to column) and at equal spacing no
    larger than ``beam_spacing`` inside each bay. The deck spans between the
    beams, parallel to the girders. All members simply supported.
    """
    check_range("generator.beam_spacing", beam_spacing, 0.5, 10.0, unit="m")
    if not x_spacings or not y_spacings:
        raise ModelError("generator.spacings", (x_spacings, y_spacings),
                         "at least one bay each way")
    xs = [origin[0]]
    for i, s in enumerate(x_spacings):
        check_range(f"generator.x_spacings[{i}]", s, 0.5, 60.0, unit="m")
        xs.append(xs[-1] + s)
    ys = [origin[1]]
    for i, s in enumerate(y_spacings):
        check_range(f"generator.y_spacings[{i}]", s, 0.5, 60.0, unit="m")
        ys.append(ys[-1] + s)
    grid = ColumnGrid(
        tuple(xs), tuple(ys),
        x_labels or default_labels(len(xs), "numbers"),
        y_labels or default_labels(len(ys), "letters"),
    )
    members: list[Member] = []
    # Work in (u, v): u along girders, v across. Girders on the v-lines.
    u_lines, v_lines = (xs, ys) if girder_direction == "x" else (ys, xs)
    u_lab, v_lab = (grid.x_labels, grid.y_labels) if girder_direction == "x" else (
        grid.y_labels, grid.x_labels)

    def pt(u: float, v: float) -> tuple[float, float]:
        return (u, v) if girder_direction == "x" else (v, u)

    for j, v in enumerate(v_lines):
        for i in range(len(u_lines) - 1):
            members.append(Member(f"G{v_lab[j]}/{u_lab[i]}-{u_lab[i + 1]}", "girder",
                                   pt(u_lines[i], v), pt(u_lines[i + 1], v),
                                   girder_section, girder_grade))
    for j in range(len(v_lines) - 1):
        for i in range(len(u_lines)):
            members.append(Member(f"B{u_lab[i]}/{v_lab[j]}-{v_lab[j + 1]}", "beam",
                                  pt(u_lines[i], v_lines[j]), pt(u_lines[i], v_lines[j + 1]),
                                  beam_section, beam_grade))
            if i == len(u_lines) - 1:
                continue
            width = u_lines[i + 1] - u_lines[i]
            n = max(1, math.ceil(width / beam_spacing - 1e-9))
            for k in range(1, n):
                u = u_lines[i] + width * k / n
                members.append(Member(
                    f"B{u_lab[i]}.{k}/{v_lab[j]}-{v_lab[j + 1]}", "beam",
                    pt(u, v_lines[j]), pt(u, v_lines[j + 1]), beam_section, beam_grade))
    return Level(level_id, name, elevation, grid, tuple(members), deck or Deck(),
                 superimposed_dead, live_in_place)


# ------------------------------------------------------------------ removing members

SUPPORT_TOL = 1e-3
"""m; a member end this close to a grid intersection rests on a column, and this close
to a perpendicular member's line (within its length) rests on that member. The same
tolerance as the load path (``droprig.solver.loadpath.SUPPORT_TOL``)."""


def _on_column(level: Level, p: tuple[float, float]) -> bool:
    g = level.grid
    return (min(abs(p[0] - x) for x in g.x_lines) <= SUPPORT_TOL
            and min(abs(p[1] - y) for y in g.y_lines) <= SUPPORT_TOL)


def _carriers(level: Level, me: Member, p: tuple[float, float]) -> list[str]:
    """Ids of the members perpendicular to ``me`` whose line passes through ``p``
    (within their length): what that end of ``me`` may rest on."""
    out = []
    for m in level.members:
        if m.id == me.id or m.axis == me.axis:
            continue
        ax = 0 if m.axis == "x" else 1
        if abs(p[1 - ax] - m.start[1 - ax]) > SUPPORT_TOL:
            continue
        lo, hi = sorted((m.start[ax], m.end[ax]))
        if lo - SUPPORT_TOL <= p[ax] <= hi + SUPPORT_TOL:
            out.append(m.id)
    return out


def resting_on(level: Level, member_ids: Iterable[str]) -> tuple[str, ...]:
    """Members of ``level`` that would rest on nothing once ``member_ids`` are removed:
    an end that needs a support (not on a column, not the free end of a cantilever)
    whose every carrier is removed; then, in turn, what rests only on those. In level
    order, without ``member_ids`` themselves. An end that rests on nothing already is
    not counted (the removal did not cause it). Raises ModelError for an unknown id."""
    ids = list(member_ids)
    known = {m.id for m in level.members}
    for mid in ids:
        if mid not in known:
            raise ModelError(f"level {level.id}.members", mid,
                             "the id of a member on level " + level.id)
    needs: dict[str, list[list[str]]] = {}
    for m in level.members:
        ends = [m.start] if m.end_condition == "cantilever" else [m.start, m.end]
        needs[m.id] = [c for c in (_carriers(level, m, p) for p in ends
                                   if not _on_column(level, p)) if c]
    gone = set(ids)
    changed = True
    while changed:
        changed = False
        for m in level.members:
            if m.id not in gone and any(all(c in gone for c in cs) for cs in needs[m.id]):
                gone.add(m.id)
                changed = True
    return tuple(m.id for m in level.members if m.id in gone and m.id not in ids)


def without_members(level: Level, member_ids: Iterable[str]) -> Level:
    """``level`` without ``member_ids`` (the others keep their order). Refuses
    (ModelError naming them) if another member would then rest on nothing — remove
    those too, in the same call — or if no member would be left."""
    ids = list(member_ids)
    left_over = resting_on(level, ids)
    if left_over:
        raise ModelError(f"level {level.id}.members", ", ".join(left_over),
                         "removing members nothing else rests on; these rest on "
                         + ", ".join(ids) + ": remove them with it")
    kept = tuple(m for m in level.members if m.id not in set(ids))
    if not kept:
        raise ModelError(f"level {level.id}.members", 0,
                         "at least one member (delete the level instead)")
    return replace(level, members=kept)


def bay_ranges(level: Level, bay_ids: Iterable[str]) -> tuple[str, ...]:
    """``bay_ids`` of ``level`` condensed to rectangles of whole bays, each written
    like a bay id over several bays: ``"2-5/A-C"`` is every bay between grid lines
    2 and 5 and lines A and C (droprig's own wording). A single bay reads as its id.

    Rectangles are runs of bays along x on one bay row, stacked over the rows
    where the same run recurs, so every bay is named exactly once; they are listed
    row by row (y, then x). Ids that are not bays of ``level`` follow as given.
    Linear in the number of bays of the level.
    """
    g = level.grid
    nx = len(g.x_lines) - 1
    index = {b.id: (b.i, b.j) for b in bays(level)}
    wanted = dict.fromkeys(bay_ids)
    cells = {index[b] for b in wanted if b in index}
    others = [b for b in wanted if b not in index]
    # runs along x per bay row
    runs: dict[int, list[tuple[int, int]]] = {}
    for j in sorted({j for _, j in cells}):
        i = 0
        while i < nx:
            if (i, j) in cells:
                i0 = i
                while i + 1 < nx and (i + 1, j) in cells:
                    i += 1
                runs.setdefault(j, []).append((i0, i))
            i += 1
    # stack equal runs of consecutive rows: (i0, i1) -> [j0, j1] of the open one
    done: list[tuple[int, int, int, int]] = []
    open_: dict[tuple[int, int], list[int]] = {}
    for j in sorted(runs):
        now = set(runs[j])
        for run in list(open_):
            if run not in now or open_[run][1] != j - 1:
                j0, j1 = open_.pop(run)
                done.append((j0, run[0], run[1], j1))
        for run in runs[j]:
            if run in open_:
                open_[run][1] = j
            else:
                open_[run] = [j, j]
    done += [(j0, run[0], run[1], j1) for run, (j0, j1) in open_.items()]
    done.sort()
    out = [f"{g.x_labels[i0]}-{g.x_labels[i1 + 1]}/{g.y_labels[j0]}-{g.y_labels[j1 + 1]}"
           for j0, i0, i1, j1 in done]
    return tuple(out + others)


def id_ranges(order: Iterable[str], ids: Iterable[str]) -> tuple[str, ...]:
    """``ids`` in the order of ``order`` with runs of three or more neighbours in
    ``order`` written first–last (``"L03–L08"``, an en dash); ids not in ``order``
    follow as given. For lists of levels or zones."""
    seq = list(dict.fromkeys(order))
    pos = {k: n for n, k in enumerate(seq)}
    wanted = dict.fromkeys(ids)
    have = sorted(pos[k] for k in wanted if k in pos)
    out: list[str] = []
    k = 0
    while k < len(have):
        m = k
        while m + 1 < len(have) and have[m + 1] == have[m] + 1:
            m += 1
        if m - k >= 2:
            out.append(f"{seq[have[k]]}–{seq[have[m]]}")
        else:
            out += [seq[have[n]] for n in range(k, m + 1)]
        k = m + 1
    return tuple(out + [k_ for k_ in wanted if k_ not in pos])
