"""Columns under the struck level as axial springs.

The framing model (:mod:`droprig.solver.loadpath`) rests the members on rigid
supports at the grid intersections, so a drop point over a column has no framing
compliance at all and the impact force grows towards the rigid-punch value. Here
every column is an axial spring f_c = L/(E·A) (:func:`droprig.solver.crushing.
column_axial_compliance`), and a unit load at the drop point adds Σ_c R_c²·f_c to the
compliance, R_c the share of the load that reaches column c (statics of the member
tree: Maxwell–Betti / unit-load method, the work of the column forces; Gere §2.3
and §9.10). The reactions follow the load path: the two deck-supporting members'
end reactions (``PathResult.r``), and for an end resting on another member, that
member's unit reactions (AISC Manual Table 3-23), recursively, down to the columns.

Column properties per level (``Level.column_area``, ``Level.column_height``) or the
stated defaults. SI units: m, m², N, m/N.
"""

from __future__ import annotations

import numpy as np

from droprig.model import Level
from droprig.solver import beam
from droprig.solver.crushing import (
    DEFAULT_COLUMN_AREA,
    DEFAULT_COLUMN_HEIGHT,
    column_axial_compliance,
)
from droprig.solver.loadpath import COND_NAMES, Frame, PathResult, frame_memo

__all__ = ["column_compliance", "column_positions", "column_reaction_table",
           "column_rigid_mass", "level_column_compliance"]


def level_column_compliance(level: Level) -> float:
    """Axial compliance of one column under ``level``, m/N (its own area and height,
    or the defaults of :mod:`droprig.solver.crushing`)."""
    A = level.column_area if level.column_area is not None else DEFAULT_COLUMN_AREA
    L = level.column_height if level.column_height is not None else DEFAULT_COLUMN_HEIGHT
    E = min((m.grade.E for m in level.members), default=200e9)
    return float(column_axial_compliance(A, L, E))


def _node_columns(frame: Frame, j: int, memo: dict[int, dict[tuple[float, float], float]]
                  ) -> dict[tuple[float, float], float]:
    """Column forces of a unit load at member node ``j`` (statics, recursive)."""
    if j in memo:
        return memo[j]
    k = int(frame.node_member[j])
    out = _member_point_columns(frame, k, float(frame.node_pos[j]), memo)
    memo[j] = out
    return out


def _member_point_columns(frame: Frame, k: int, s: float,
                          memo: dict[int, dict[tuple[float, float], float]]
                          ) -> dict[tuple[float, float], float]:
    """Column forces of a unit load at ``s`` on member ``k``: its end reactions
    (AISC Manual Table 3-23 by end condition) passed to its supports."""
    m = frame.level.members[k]
    cond = COND_NAMES[int(frame.cond[k])]
    R0, RL = beam.unit_reactions(cond, frame.L[k], s)
    out: dict[tuple[float, float], float] = {}
    for e, R in ((0, float(R0)), (1, float(RL))):
        if R == 0.0:
            continue
        _add_end(frame, k, e, R, out, memo, m.start if e == 0 else m.end)
    return out


def _add_end(frame: Frame, k: int, e: int, R: float, out: dict[tuple[float, float], float],
             memo: dict[int, dict[tuple[float, float], float]],
             xy: tuple[float, float]) -> None:
    m = frame.level.members[k]
    if m.end_condition == "cantilever" and e == 1:
        return  # free end
    node = int(frame.end_node[k, e])
    if node >= frame.n_nodes:  # a column at this end
        key = (round(xy[0], 6), round(xy[1], 6))
        out[key] = out.get(key, 0.0) + R
        return
    for key, v in _node_columns(frame, node, memo).items():
        out[key] = out.get(key, 0.0) + R * v


def column_reaction_table(frame: Frame) -> tuple[np.ndarray, np.ndarray]:
    """Per deck panel (pair), the column forces of a unit reaction at each of its four
    local member ends: ``C`` (n_pairs, 4, K) and the column index of each of the K
    slots ``cols`` (n_pairs, K; −1 = empty). Built once per frame."""

    C, cols, _ = _column_tables(frame)
    return C, cols


def column_positions(frame: Frame) -> np.ndarray:
    """Plan position (x, y) of each column index of :func:`column_reaction_table`,
    (n_columns, 2), m."""
    return _column_tables(frame)[2]


def _column_tables(frame: Frame) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    def make() -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        memo: dict[int, dict[tuple[float, float], float]] = {}
        per_pair: list[list[dict[tuple[float, float], float]]] = []
        keys: dict[tuple[float, float], int] = {}
        for ip in range(frame.n_pairs):
            slots = []
            for k in frame.pair_members[ip]:
                m = frame.level.members[int(k)]
                for e in (0, 1):
                    d: dict[tuple[float, float], float] = {}
                    _add_end(frame, int(k), e, 1.0, d, memo, m.start if e == 0 else m.end)
                    slots.append(d)
                    for key in d:
                        keys.setdefault(key, len(keys))
            per_pair.append(slots)
        K = max((len({c for d in slots for c in d}) for slots in per_pair), default=0)
        K = max(K, 1)
        C = np.zeros((frame.n_pairs, 4, K))
        cols = -np.ones((frame.n_pairs, K), dtype=np.int64)
        for ip, slots in enumerate(per_pair):
            local: dict[tuple[float, float], int] = {}
            for si, d in enumerate(slots):
                for key, v in d.items():
                    c = local.setdefault(key, len(local))
                    C[ip, si, c] += v
                    cols[ip, c] = keys[key]
        pos = np.zeros((len(keys), 2))
        for key, i in keys.items():
            pos[i] = key
        return C, cols, pos

    return frame_memo(frame, "column_tables", make)


def column_rigid_mass(frame: Frame, path: PathResult, mu: np.ndarray) -> np.ndarray:
    """Mass moved by the columns' shortening, referred to the columns' own share of
    the displacement at each drop point, kg. The members framing into column c move
    rigidly with its top (a linear shape from that end: ∫(x/L)²dx = L/3 of each
    member's mass ``mu``·L, kg/m × m — Rayleigh, Timoshenko, *Strength of Materials*
    Part I; the cross terms of members moved at both ends are left out, a lower
    bound), m_c = Σ μ_k·L_k/3; a unit load at the point moves the column tops
    R_c·f_c, and their share of the point's displacement is f_col = Σ_c R_c²·f_c
    (:func:`column_compliance`; unit-load method, Gere §9.10), so
    m = Σ_c m_c·(R_c·f_c)²/f_col² = Σ_c m_c·R_c²/(Σ_c R_c²)² for one column
    compliance f_c on the level. 0 where no column takes a share."""
    C, cols = column_reaction_table(frame)
    n = path.f.shape[0]
    if frame.n_pairs == 0 or n == 0:
        return np.zeros(n)
    pos = column_positions(frame)
    m_col = np.zeros(pos.shape[0])
    index = {(float(x), float(y)): i for i, (x, y) in enumerate(pos)}
    for k, m in enumerate(frame.level.members):
        for e, xy in ((0, m.start), (1, m.end)):
            if int(frame.end_node[k, e]) < frame.n_nodes:
                continue
            if m.end_condition == "cantilever" and e == 1:
                continue
            i = index.get((round(xy[0], 6), round(xy[1], 6)))
            if i is not None:
                m_col[i] += float(mu[k]) * float(frame.L[k]) / 3.0
    pair = np.where(path.pair >= 0, path.pair, 0)
    Rc = np.einsum("ns,nsk->nk", path.r, C[pair])
    mk = np.where(cols[pair] >= 0, m_col[np.maximum(cols[pair], 0)], 0.0)
    R2 = Rc * Rc
    num = np.sum(mk * R2, axis=1)
    den = np.sum(R2, axis=1) ** 2
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(den > 0.0, num / den, 0.0)
    return np.where(path.pair >= 0, out, 0.0)


def column_compliance(frame: Frame, path: PathResult, f_column: float) -> np.ndarray:
    """Compliance added at each drop point by the axial springs of the columns, m/N:
    Σ_c R_c²·f_c with R_c = Σ_slot r_slot·C[slot, c] (unit-load method; Gere §9.10).
    Points with no deck panel: 0."""
    C, _ = column_reaction_table(frame)
    n = path.f.shape[0]
    if frame.n_pairs == 0 or n == 0:
        return np.zeros(n)
    pair = np.where(path.pair >= 0, path.pair, 0)
    Rc = np.einsum("ns,nsk->nk", path.r, C[pair])
    return np.where(path.pair >= 0, np.sum(Rc * Rc, axis=1) * f_column, 0.0)
