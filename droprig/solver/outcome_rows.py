"""Drop-point rows remembered from one edit to the next (the window's live analysis).

The window re-analyses a lift zone after every edit, first its outcomes
(:func:`droprig.solver.analyse_outcomes`, what it paints at once). An edit to the
zone's region (its radii, slew, corridor, drift margin) moves the zone's edge and the
worst points, but most of its drop points stay where they were: the grid is anchored
on the first column line and the points along the members on the framing
(:mod:`droprig.solver.droppoints`), so the radius moved by a few centimetres leaves
all but the points along the zone's edge in place. The chain's answer at a point
depends on the point, its load, the zone's hoist speed and the project around the
zone (levels, protection areas, settings — and, for a pad given by its crush force,
the loads of the level's zones), never on the region of the zone nor on the zone's
other loads: a row worked out for one edit holds for the next, bit for bit (every step
works row by row: the searches' rounds are per row too, ``chain._close_bracket``). The
one step that does not — a floor's points chosen for their own time history by their
group of bay and load (``chain.FLOOR_POINT_HISTORY``, off) — turns the memory off
(:meth:`OutcomeRows.serves`).

:class:`OutcomeRows` keeps those rows, keyed by :func:`rows_key` and the point's exact
coordinates and load, and works out only the rows it does not hold
(:func:`droprig.solver.evaluate.evaluate_case` at those points). The window's
:class:`~droprig.solver.analysis.ZoneCache` holds two: the outcome stage's rows
(``Drop.outcomes_only``: no plastic height or allowable mass; read by the outcome
stage only) and the full forward rows, from which the confirmed analysis starts (its
confirmation tries every limit as before) and the falls to the levels below are
assessed. The command line and the annex analyse afresh (:func:`droprig.solver.analyse`
holds no memory). ``tests/solver/test_outcome_rows.py`` compares the results with it
and without it after edits of the demo projects and of random projects. Invented data
only there; a property of the implementation (no engineering source).

A speed measure only: the answer is the same as working every row out again.
"""

from __future__ import annotations

import threading
from collections import OrderedDict
from collections.abc import Sequence
from dataclasses import fields

import numpy as np

from droprig.model import LiftLoad, Project
from droprig.solver import evaluate
from droprig.solver.floor import FloorModel

__all__ = ["OutcomeRows", "pad_loads", "rows_key"]

_NOT_READ = ("info", "lift_zones")
"""Fields of :class:`~droprig.model.Project` the chain at a point never reads."""


def pad_loads(project: Project, level_id: str) -> tuple:
    """The loads of the zones on level ``level_id`` where a crushable pad of that level
    is given by its crush force alone: its crush stress is then that force over the
    largest footprint of those loads (:func:`droprig.solver.chain.pad_crush_stress`),
    so they feed every point's answer. Empty otherwise."""
    legacy = any(pa.level_id == level_id and pa.kind == "crushable"
                 and pa.crush_stress is None for pa in project.protection_areas)
    if not legacy:
        return ()
    return tuple(z.loads for z in project.lift_zones if z.level_id == level_id)


def rows_key(project: Project, level_id: str, v_hoist: float) -> tuple:
    """What a drop point's answer on level ``level_id`` is made of besides the point
    and its load (a row's own :class:`~droprig.model.LiftLoad`, kept with the row), as
    frozen model objects: the level, the hoist's lowering speed ``v_hoist`` (m/s: the
    strike speed √(v_h² + 2gh); a zone's ``hoist_speed``, 0 for a fall to a level
    below), the loads of :func:`pad_loads`, and every field of the project the chain
    reads (levels, protection areas, settings). Not a zone's region (radii, slew,
    corridor, drift), which only places the points, nor its other loads. Equal keys
    and loads, equal rows."""
    return (level_id, v_hoist, pad_loads(project, level_id),
            *(getattr(project, f.name) for f in fields(project) if f.name not in _NOT_READ))


class _Store:
    """The rows of one :func:`rows_key`: their outputs in chunks (each a dict of arrays,
    as :func:`~droprig.solver.evaluate.evaluate_case` returns them), where each
    (x, y, load) row lies, and a number for each load met (``load_ids``)."""

    def __init__(self) -> None:
        self.load_ids: dict[LiftLoad, int] = {}
        self.where: dict[tuple[int, int, int], int] = {}
        self.chunks: list[dict[str, np.ndarray]] = []
        self.starts: list[int] = []
        self.n = 0

    def add(self, keys: list[tuple[int, int, int]], out: dict[str, np.ndarray]) -> None:
        start = self.n
        for i, k in enumerate(keys):
            self.where.setdefault(k, start + i)
        self.chunks.append(out)
        self.starts.append(start)
        self.n += len(keys)
        if len(self.chunks) > 8:  # few chunks to gather from
            merged = {k: np.concatenate([c[k] for c in self.chunks]) for k in out}
            self.chunks, self.starts = [merged], [0]

    def gather(self, pos: np.ndarray) -> dict[str, np.ndarray]:
        """The rows at global positions ``pos`` (in that order)."""
        first = self.chunks[0]
        out = {k: np.empty((pos.size, *v.shape[1:]), dtype=v.dtype) for k, v in first.items()}
        bounds = np.asarray([*self.starts, self.n])
        which = np.searchsorted(bounds, pos, side="right") - 1
        for c, chunk in enumerate(self.chunks):
            sel = np.flatnonzero(which == c)
            if sel.size == 0:
                continue
            local = pos[sel] - self.starts[c]
            for k, v in chunk.items():
                out[k][sel] = v[local]
        return out


class OutcomeRows:
    """The rows of the last ``size`` :func:`rows_key` values (at most ``max_rows`` rows
    together; the oldest key's rows go first). ``outcomes_only``: the outcome stage's
    rows (``Drop.outcomes_only``: no plastic height or allowable mass), else the full
    forward rows the confirmed analysis starts from (its confirmation then works the
    trials' geometry out itself: the same values). Safe to share between threads (a
    lock around the lookups; the rows are worked out outside it)."""

    def __init__(self, size: int = 4, max_rows: int = 100_000, *,
                 outcomes_only: bool = True) -> None:
        self.size = size
        self.max_rows = max_rows
        self.outcomes_only = outcomes_only
        self._stores: OrderedDict[int, tuple[tuple, _Store]] = OrderedDict()
        self._next = 0
        self._lock = threading.Lock()
        self.hits = 0
        self.misses = 0

    @staticmethod
    def serves(fm: FloorModel) -> bool:
        """Whether rows of this floor may be remembered: not where the chain chooses
        points for their own time history by their group
        (``chain.FLOOR_POINT_HISTORY`` with ``dynamic_amplification``: a row's answer
        would depend on the other rows worked out with it)."""
        from droprig.solver import chain

        return not (chain.FLOOR_POINT_HISTORY and fm.settings.dynamic_amplification)

    def _store(self, key: tuple) -> _Store:
        for sid, (k, st) in self._stores.items():
            if k == key:  # (the model objects an edit leaves are the same objects)
                self._stores.move_to_end(sid)
                return st
        st = _Store()
        self._stores[self._next] = (key, st)
        self._next += 1
        while len(self._stores) > self.size:
            self._stores.popitem(last=False)
        return st

    def _trim(self) -> None:
        total = sum(st.n for _, st in self._stores.values())
        while total > self.max_rows and self._stores:
            _, (_, st) = self._stores.popitem(last=False)
            total -= st.n

    def evaluate(self, fm: FloorModel, project: Project, loads: Sequence[LiftLoad],
                 x: np.ndarray, y: np.ndarray, li: np.ndarray, *,
                 v_hoist: float = 0.0) -> dict[str, np.ndarray]:
        """The outputs (:func:`~droprig.solver.evaluate.evaluate_case`, with
        :attr:`outcomes_only`) of the rows (x, y in m; ``li`` the index of each row's
        load in ``loads``) on the floor ``fm``, struck with the hoist's lowering speed
        ``v_hoist`` (m/s), the rows held taken, the others worked out and kept."""
        x = np.ascontiguousarray(x, dtype=float)
        y = np.ascontiguousarray(y, dtype=float)
        li = np.ascontiguousarray(li, dtype=np.int64)
        rk = rows_key(project, fm.level.id, v_hoist)
        with self._lock:
            st = self._store(rk)
            ids = np.array([st.load_ids.setdefault(ld, len(st.load_ids)) for ld in loads],
                           dtype=np.int64)
            # exact coordinates (the bits of the doubles; -0.0 as 0.0) and the load
            keys = list(zip((x + 0.0).view(np.int64).tolist(),
                            (y + 0.0).view(np.int64).tolist(),
                            ids[li].tolist() if li.size else [], strict=True))
            got = [st.where.get(k, -1) for k in keys]
        pos = np.asarray(got, dtype=np.int64)
        hit, miss = np.flatnonzero(pos >= 0), np.flatnonzero(pos < 0)
        new = None
        if miss.size or not hit.size:
            geo = evaluate.distinct_geometry(fm, project, x[miss], y[miss])
            new = evaluate.evaluate_case(fm, project, list(loads), geo, li[miss],
                                         v_hoist=v_hoist,
                                         outcomes_only=self.outcomes_only)
        with self._lock:
            self.hits += hit.size
            self.misses += miss.size
            held = st.gather(pos[hit]) if hit.size else None
            if miss.size and new is not None:
                for v in new.values():  # shared with the caller: never written
                    v.flags.writeable = False
                st.add([keys[i] for i in miss.tolist()], new)
                self._trim()
        if held is None:
            assert new is not None
            return dict(new)
        if new is None:
            return held
        out = {k: np.empty((x.size, *v.shape[1:]), dtype=v.dtype) for k, v in held.items()}
        for k in out:
            out[k][hit] = held[k]
            out[k][miss] = new[k]
        return out
