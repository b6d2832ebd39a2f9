"""Load path of a unit load dropped on the deck, by statics, vectorised over drop points.

A unit downward load at plan point p travels down the framing tree

    deck strip -> the two deck-supporting members either side of p (lever rule)
    -> their end reactions -> the members (or columns) their ends rest on -> … -> columns.

Assumptions (stated once, used everywhere):

* The deck spans one way between the two nearest members parallel to the infill
  beams whose extent covers p, as a rigid strip simply supported on them: it
  shares the unit load by the lever rule, (1 − t) to the member on one side and t
  to the other, t = distance from the first member / strip span. The deck's own
  bending adds no flexibility (conservative: a stiffer struck point gives a larger
  impact force). Common practice for one-way decks, no source.
* A member end that lies on a grid intersection rests on a column: a rigid
  support. Otherwise it rests on the member perpendicular to it whose line passes
  through the end (a "node" of that member). A cantilever's free end carries
  nothing. Members do not resist torsion; end moments of fixed or propped ends are
  taken by the connection and not passed on.
* Each member deflects by its own bending under the loads it carries (closed-form
  Green's function of its end condition, :mod:`droprig.solver.beam`) plus the
  movement of its supports. The support movement is carried into the span by the
  member's reaction influence line (Müller-Breslau principle): straight-line
  interpolation for simple beams, a cubic for fixed or propped ends, rigid
  translation for a cantilever. This keeps the deflection under the load equal to
  the internal work of the unit-load system (Maxwell–Betti).

Compliance (m/N): f(p) = Σ_m r_mᵀ G_m r_m over every member m that carries part of
the unit load (r_m its point loads per unit load at p, G_m its Green's matrix),
cross terms included when several point loads sit on one member. It is computed
as f = Σ_k w_k² g_k(a_k, a_k) + rᵀ D r, with k the (at most two) deck-supporting
members, w_k their lever-rule shares, r the end reactions they pass to the nodes
and D = Tᵀ G_n T the node flexibility matrix of the level (T propagates node
loads down the tree, G_n holds the Green's function values between nodes of the
same member).

Effective struck mass (kg), Rayleigh with the static deflected shape
(Timoshenko, *Strength of Materials* Part I): m_e(p) = Σ_m ∫ μ_m (w_m(x)/w_ref)² dx
over the members carrying load. Members that only ride along on a deflecting
support (the beams framing into a struck girder from the other side) are left out:
counted as rigid bodies they double the mass at a girder point, and the two-mass
impact then reads the framing force below a time history of the whole grillage
(0.84-0.86 x for a 220 kg load on a soft contact), while the path's mass reads
1.3-2.1 x it (tests/solver/test_struck_mass_grillage.py: finite-element grillage,
consistent masses, exact modal steps). The path changes at a beam line, so the mass
steps there (two-level demo, girder B at x = 20 m: 5,930 and 3,604 kg either side);
both sides read above the history, the lower mass more so. The
integrals are exact (Gauss–Legendre between kinks, Chebyshev tables for the deck
members; next to a member end, where the tabulated integrals vanish like a power
of the distance to the end, the tables are interpolated in factored form, so that a
point a rounding error from a column gets the limit its neighbours tend to rather
than rounding noise divided by rounding noise). The published form normalises by
the struck point, w_ref = w(p); that
mass grows without bound as p nears a support (w(p) → 0 while the rest of the
path still moves), which would shrink the impact force. droprig normalises by
w_ref = max(w(p), largest deflection sampled along the path): identical where the
struck point moves most (17/35·μL at the midspan of a simple beam), never larger,
hence a larger (conservative) impact force everywhere else.

Everything that does not depend on p is precomputed once per level
(:func:`build_frame`); :func:`evaluate` then works on arrays of points.
"""

from __future__ import annotations

import threading
from collections.abc import Callable, Hashable, Iterable
from dataclasses import dataclass, field, replace
from functools import cache
from typing import Any, TypeVar

import numpy as np

from droprig.model import Level, Member, ModelError
from droprig.model.project import GEOMETRY_TOL
from droprig.solver import beam
from droprig.solver.parallel import for_blocks

T = TypeVar("T")

COND_NAMES: tuple[beam.EndCondition, ...] = ("simple", "fixed", "propped", "cantilever")
"""Order of the integer end-condition codes used in the arrays below."""

_GL_T, _GL_W = np.polynomial.legendre.leggauss(4)
_GL_S = 0.5 * (_GL_T + 1.0)  # nodes on [0, 1]
_GL_WS = 0.5 * _GL_W  # weights on [0, 1]

SUPPORT_TOL = 1e-3
"""A member end within this distance (m) of a column or of another member's line
rests on it."""

CHUNK = 1 << 15
"""Drop points processed per block (keeps the working set in cache and bounds the
memory of the gathers)."""


# --------------------------------------------------------------------------- helpers
def by_condition(fn, codes: np.ndarray, *args: np.ndarray):
    """Evaluate ``fn(cond_name, *args)`` element-wise where ``codes`` holds the end
    condition of each element (indices into :data:`COND_NAMES`). ``fn`` may return
    an array or a tuple of arrays; all ``args`` broadcast with ``codes``."""
    codes = np.asarray(codes)
    if codes.size == 0:
        return fn(COND_NAMES[0], *args)
    lo, hi = int(codes.min()), int(codes.max())
    if lo == hi:
        return fn(COND_NAMES[lo], *args)
    present = np.flatnonzero(np.bincount(codes.ravel(), minlength=len(COND_NAMES)))
    shape = np.broadcast_shapes(codes.shape, *(np.shape(a) for a in args))
    codes_b = np.broadcast_to(codes, shape)
    args_b = [np.broadcast_to(np.asarray(a, float), shape) for a in args]
    out: Any = None
    for c in present:
        sel = codes_b == c
        res = fn(COND_NAMES[int(c)], *(a[sel] for a in args_b))
        if out is None:
            out = (tuple(np.empty(shape) for _ in res) if isinstance(res, tuple)
                   else np.empty(shape))
        if isinstance(res, tuple):
            for o, r in zip(out, res, strict=True):
                o[sel] = r
        else:
            out[sel] = res
    return out


# --------------------------------------------------------------------------- mass integrals
def _unit_integrals(cond: beam.EndCondition, xi: float) -> tuple[float, float, float]:
    """For a member of unit span and unit EI struck at ξ: ∫₀¹ ĝ(s, ξ)² ds and
    ∫₀¹ ĝ(s, ξ)·R̂_e(s) ds (e = 0, 1), by 8-point Gauss–Legendre on [0, ξ] and
    [ξ, 1] (exact: the integrands are polynomials of degree ≤ 6 on each piece)."""
    t, w = np.polynomial.legendre.leggauss(8)
    s = 0.5 * (t + 1.0)
    xs = np.concatenate([xi * s, xi + (1.0 - xi) * s])
    ws = np.concatenate([xi * 0.5 * w, (1.0 - xi) * 0.5 * w])
    g = beam.green(cond, 1.0, 1.0, xs, xi)
    R0, RL = beam.unit_reactions(cond, 1.0, xs)
    return float(ws @ (g * g)), float(ws @ (g * R0)), float(ws @ (g * RL))


_POLY_DEG = 16

_XI = np.linspace(0.0, 1.0, 16385)
"""Nodes of the tables of the mass integrals over ξ = a/L (linear interpolation
between nodes: relative error below 1e-7 for these smooth polynomials)."""


def _gmax(cond: beam.EndCondition, xi: np.ndarray) -> np.ndarray:
    """Largest deflection along a member of unit span and unit EI under a unit load
    at ξ: max over x of ĝ(x, ξ) (dense sampling refined around the peak)."""
    xs = np.linspace(0.0, 1.0, 401)
    g = beam.green(cond, 1.0, 1.0, xs[None, :], xi[:, None])
    j = np.argmax(g, axis=1)
    lo = xs[np.maximum(j - 1, 0)]
    hi = xs[np.minimum(j + 1, xs.size - 1)]
    fine = lo[:, None] + (hi - lo)[:, None] * np.linspace(0.0, 1.0, 201)[None, :]
    return np.max(beam.green(cond, 1.0, 1.0, fine, xi[:, None]), axis=1)


END_ORDER: dict[str, tuple[int, int]] = {
    "simple": (1, 1), "fixed": (2, 2), "propped": (2, 1), "cantilever": (2, 0)}
"""Order p at which the own-bending deflection of a member vanishes as the load
nears each end (x = 0, x = L): the Green's functions of AISC Manual Table 3-23
are ∝ ξ at a pinned end, ∝ ξ² at a fixed end and finite at a free end. The
integrals ∫ĝ² vanish as ξ^(2p), ∫ĝ·R̂_e and ĝ_max as ξ^p."""

_LIMIT_EPS = 1e-6
"""ξ at which the end limits of the tables are taken (relative error O(ξ))."""


def _gmax_at(cond: beam.EndCondition, xi: np.ndarray) -> np.ndarray:
    """:func:`_gmax` in blocks (bounded memory)."""
    return np.concatenate([_gmax(cond, xi[i:i + 1024]) for i in range(0, xi.size, 1024)])


@cache
def _tables(cond: beam.EndCondition) -> np.ndarray:
    """(4, n) tables on :data:`_XI`: P_gg, P_0, P_1 (exact polynomials) and the
    largest deflection ĝ_max (sampled on 1025 nodes, interpolated; computed at
    every node of the first and last of those 1025 cells, where ĝ_max bends most
    sharply towards 0)."""
    z = 2.0 * _XI - 1.0
    c = _POLYS[cond]
    coarse = np.linspace(0.0, 1.0, 1025)
    gm = np.interp(_XI, coarse, _gmax(cond, coarse))
    m = (_XI.size - 1) // (coarse.size - 1)
    for sl in (slice(1, m), slice(_XI.size - m, _XI.size - 1)):
        gm[sl] = _gmax_at(cond, _XI[sl])
    return np.stack([np.polynomial.chebyshev.chebval(z, c[0]),
                     np.polynomial.chebyshev.chebval(z, c[1]),
                     np.polynomial.chebyshev.chebval(z, c[2]), gm])


@cache
def _cell_tables(cond: beam.EndCondition) -> np.ndarray:
    """The tables of :func:`_tables` by cell, (8, n): rows 2k and 2k + 1 hold table k
    at the first and the second node of each cell, so that one gather fetches both
    ends of every table's cell."""
    t = _tables(cond)
    out = np.empty((8, _XI.size - 1))
    for k in range(4):
        out[2 * k] = t[k][:-1]
        out[2 * k + 1] = t[k][1:]
    return out


def _mass_tables(cond: beam.EndCondition, xi: np.ndarray,
                 ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The four tables of :func:`_tables` interpolated linearly at ξ (uniform nodes:
    the cell index is computed, not searched); in the first and last cell, where
    they vanish like a power of the distance to the end, by :func:`_end_cells`."""
    n = _XI.size - 1
    z = np.clip(np.asarray(xi, float), 0.0, 1.0) * n
    i = np.minimum(z.astype(np.intp), n - 1)
    w = z - i
    g = _cell_tables(cond).take(i, axis=1)  # (8, *xi.shape): both nodes of each cell
    out = []
    for k in range(4):
        lo, hi = g[2 * k], g[2 * k + 1]
        hi = np.subtract(hi, lo, out=hi if isinstance(hi, np.ndarray) else None)
        hi *= w
        hi += lo  # lo + (hi − lo)·w, the interpolation between the cell's nodes
        out.append(np.asarray(hi))
    end = (i == 0) | (i == n - 1)
    if np.any(end):
        t = _tables(cond)
        q, lim = _end_cells(cond)
        first = i[end] == 0
        we = w[end]
        s = np.where(first, we, 1.0 - we)  # distance to the end, in cells
        for k in range(4):
            h_end = np.where(first, lim[k, 0], lim[k, 1])
            h_in = np.where(first, t[k][1], t[k][n - 1])
            qk = np.where(first, q[0, k], q[1, k])
            out[k][end] = s ** qk * (h_end + (h_in - h_end) * s)
    return out[0], out[1], out[2], out[3]


@cache
def _end_cells(cond: beam.EndCondition) -> tuple[np.ndarray, np.ndarray]:
    """Data of the first and last table cells, where the four tabulated functions
    vanish like a power of the distance to the member end (:data:`END_ORDER`) and a
    straight line between the nodes would be wrong by a factor up to ~1/ξ. There
    each function is written φ(s)·H with s the distance to the end in units of
    the cell, φ = s^q, and H is interpolated linearly between its end limit
    lim P/s^q (taken at ξ = :data:`_LIMIT_EPS`) and the table value at the inner
    node (so the value there, and continuity with the next cell, is exact).
    Returns the (4,) orders q and (4, 2) end limits H at the ends ξ = 0 and ξ = 1."""
    t = _tables(cond)
    h = 1.0 / (_XI.size - 1)
    p0, p1 = END_ORDER[cond]
    q = np.array([[2 * p0, p0, p0, p0], [2 * p1, p1, p1, p1]], dtype=float)  # (end, k)
    lim = np.empty((4, 2))
    for e, xi_e in ((0, _LIMIT_EPS), (1, 1.0 - _LIMIT_EPS)):
        vals = np.array([*_unit_integrals(cond, xi_e), _gmax(cond, np.array([xi_e]))[0]])
        lim[:, e] = vals / (_LIMIT_EPS / h) ** q[e]
    # a free end (q = 0): the table's own end value
    lim[:, 1] = np.where(q[1] == 0.0, t[:, -1], lim[:, 1])
    return q, lim


def _make_polys() -> dict[beam.EndCondition, tuple[np.ndarray, np.ndarray, np.ndarray]]:
    """Chebyshev interpolants on ξ ∈ [0, 1] of the integrals of :func:`_unit_integrals`.

    Each integral is a polynomial in ξ of degree ≤ 13 (the Green's functions of
    AISC Manual Table 3-23 are cubic in x and in a on each side of the load), so the
    degree-16 interpolant reproduces it to rounding error. Scaling: with span L
    and stiffness EI, ∫g² dx = L⁷/EI² · P_gg(a/L), ∫g·R_e dx = L⁴/EI · P_e(a/L).
    """
    nodes = 0.5 * (1.0 - np.cos(np.pi * (np.arange(_POLY_DEG + 1) + 0.5) / (_POLY_DEG + 1)))
    out = {}
    for cond in COND_NAMES:
        vals = np.array([_unit_integrals(cond, float(x)) for x in nodes])
        coefs = [np.polynomial.chebyshev.chebfit(2.0 * nodes - 1.0, vals[:, i], _POLY_DEG)
                 for i in range(3)]
        out[cond] = (coefs[0], coefs[1], coefs[2])
    return out


_POLYS = _make_polys()


def _poly_gg(cond: beam.EndCondition, xi: np.ndarray) -> np.ndarray:
    return np.polynomial.chebyshev.chebval(2.0 * np.asarray(xi) - 1.0, _POLYS[cond][0])


def _poly_gr(cond: beam.EndCondition, xi: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    z = 2.0 * np.asarray(xi) - 1.0
    return (np.polynomial.chebyshev.chebval(z, _POLYS[cond][1]),
            np.polynomial.chebyshev.chebval(z, _POLYS[cond][2]))


# --------------------------------------------------------------------------- data
@dataclass(frozen=True, eq=False)
class Frame:
    """Everything about one level's framing that does not depend on the drop point.

    Arrays over members (index = position in ``level.members``): ``cond`` code,
    ``L`` span (m), ``EI`` (N·m²), ``mu`` steel mass per length (kg/m), ``vs`` and
    ``vdir`` (start coordinate along the member's axis and +1/−1 direction),
    ``end_node`` (n_m, 2) node each end rests on (``n_nodes`` = rigid or free).
    Nodes: ``node_member`` supporting member, ``node_pos`` position along it (m),
    ``node_xy``. ``T`` and ``D``: (n_nodes + 1)² with a zero last row/column.
    Deck: deck-supporting members span along ``deck_axis`` ("x" or "y"); the plan
    is cut into cells by ``u_breaks`` (across the deck members) and ``v_breaks``
    (along them); ``cell_pair`` gives the panel (pair of supporting members) of
    each cell, −1 where no deck panel exists.
    """

    level: Level
    cond: np.ndarray
    L: np.ndarray
    EI: np.ndarray
    mu: np.ndarray
    vs: np.ndarray
    vdir: np.ndarray
    cross: np.ndarray
    end_node: np.ndarray
    node_member: np.ndarray
    node_pos: np.ndarray
    node_xy: np.ndarray
    nodes_on: tuple[np.ndarray, ...]
    T: np.ndarray
    D: np.ndarray
    deck_axis: str
    u_breaks: np.ndarray
    v_breaks: np.ndarray
    cell_pair: np.ndarray
    pair_members: np.ndarray
    pair_c: np.ndarray
    pair_nodes: np.ndarray
    pair_D: np.ndarray
    pair_M: np.ndarray
    pair_support: tuple[tuple[int, ...], ...]
    N_R: np.ndarray
    # support-member actions per pair (padded): member, stations, unit moment and
    # end-reaction coefficients on the local reaction vector (4 entries)
    pair_sup_member: np.ndarray
    pair_sup_x: np.ndarray
    pair_sup_mcoef: np.ndarray
    pair_sup_rcoef: np.ndarray
    pair_sup_wcoef: np.ndarray
    pair_D16: np.ndarray
    pair_M16: np.ndarray
    pair_wmax: np.ndarray
    N_R16: np.ndarray
    warnings: tuple[str, ...] = field(default=())
    memo: dict = field(default_factory=dict, repr=False)
    """Point-independent tables derived from this frame, built on first use and kept
    with it (the frame is immutable, so they never go stale): see
    :func:`frame_memo`."""

    @property
    def n_members(self) -> int:
        return int(self.L.shape[0])

    @property
    def n_nodes(self) -> int:
        return int(self.node_member.shape[0])

    @property
    def n_pairs(self) -> int:
        return int(self.pair_members.shape[0])


MEMO_MAX = 32
"""Entries kept in a frame's :attr:`Frame.memo` (the oldest tuple key is dropped
first)."""

_MEMO_LOCK = threading.Lock()


def frame_memo(frame: Frame, key: Hashable, make: Callable[[], T]) -> T:
    """``make()``, remembered in ``frame.memo`` under ``key`` (built once per frame
    and key; a key that cannot be hashed is not remembered). ``key`` must name
    everything besides the frame that the value depends on."""
    memo = frame.memo
    try:
        return memo[key]
    except KeyError:
        pass
    except TypeError:  # unhashable key
        return make()
    value = make()
    with _MEMO_LOCK:
        if key not in memo:
            # drop the oldest tuple keys (per zone, step, …); the few per-frame
            # tables under plain names stay
            while len(memo) >= MEMO_MAX:
                old = next((k for k in memo if isinstance(k, tuple)), None)
                if old is None:
                    break
                del memo[old]
            memo[key] = value
    return memo.get(key, value)


# --------------------------------------------------------------------------- build
def _support_deflection(c: beam.EndCondition, L: float, EI: float, x: np.ndarray, s_on: np.ndarray,
                        Tq: np.ndarray, d0: np.ndarray, dL: np.ndarray) -> np.ndarray:
    """Deflection (m/N) at ``x`` of a support member per local reaction (columns):
    own bending under its node loads Tq plus its ends' movement d0, dL carried by the
    reaction influence lines."""
    W = np.zeros((x.size, Tq.shape[1]))
    if s_on.size:
        W += beam.green(c, L, EI, x[:, None], s_on[None, :]) @ Tq
    R0, RL = beam.unit_reactions(c, L, x)
    return W + R0[:, None] * d0[None, :] + RL[:, None] * dL[None, :]


def _is_column(level: Level, p: tuple[float, float]) -> bool:
    g = level.grid
    return (min(abs(p[0] - x) for x in g.x_lines) <= SUPPORT_TOL
            and min(abs(p[1] - y) for y in g.y_lines) <= SUPPORT_TOL)


def _find_support(level: Level, k: int, p: tuple[float, float]) -> tuple[int, float]:
    """The member (index, position along it) that member ``k``'s end at ``p`` rests on."""
    me = level.members[k]
    best: tuple[int, float] | None = None
    best_interior = False
    for j, m in enumerate(level.members):
        if j == k or m.axis == me.axis:
            continue
        ax = 0 if m.axis == "x" else 1
        c = m.start[1 - ax]
        if abs(p[1 - ax] - c) > SUPPORT_TOL:
            continue
        lo, hi = sorted((m.start[ax], m.end[ax]))
        if not (lo - SUPPORT_TOL <= p[ax] <= hi + SUPPORT_TOL):
            continue
        s = min(max(abs(p[ax] - m.start[ax]), 0.0), m.span)
        interior = lo + SUPPORT_TOL < p[ax] < hi - SUPPORT_TOL
        if best is None or (interior and not best_interior):
            best, best_interior = (j, s), interior
    if best is None:
        which = "start" if p == me.start else "end"
        raise ModelError(f"level {level.id}.members[{me.id}].{which}", p,
                         "a column (grid intersection) or a perpendicular member passing "
                         "through the member end")
    return best


def _check_acyclic(level: Level, rests_on: dict[int, set[int]]) -> None:
    state: dict[int, int] = {}

    def visit(m: int, stack: list[int]) -> None:
        st = state.get(m, 0)
        if st == 2:
            return
        if st == 1:
            cyc = [level.members[i].id for i in stack[stack.index(m):]]
            raise ModelError(f"level {level.id}.members", " -> ".join(cyc),
                             "members that rest on each other without a column below")
        state[m] = 1
        stack.append(m)
        for s in rests_on.get(m, ()):
            visit(s, stack)
        stack.pop()
        state[m] = 2

    for m in range(len(level.members)):
        visit(m, [])


def _deck_axis(level: Level) -> str:
    beams: list[str] = [m.axis for m in level.members if m.role == "beam"]
    if beams:
        return max(("x", "y"), key=beams.count)
    girders: list[str] = [m.axis for m in level.members if m.role == "girder"]
    if not girders:
        raise ModelError(f"level {level.id}.members", 0, "at least one member")
    return "y" if max(("x", "y"), key=girders.count) == "x" else "x"


def build_frame(level: Level, *, include_member_mass: bool = True,
                EI: np.ndarray | None = None,
                extra_mass: np.ndarray | None = None) -> Frame:
    """Precompute the load-path data of ``level`` (see :class:`Frame`). ``EI``
    (N·m², per member) replaces the steel sections' E·Ix (composite members);
    ``extra_mass`` (kg/m, per member) is added to the steel's mass per length μ in
    the Rayleigh struck mass (e.g. the slab and superimposed dead load over the
    member's tributary width, :func:`tributary_widths`)."""
    mb = _member_arrays(level, include_member_mass)
    if EI is not None:
        mb = replace(mb, EI=np.asarray(EI, float).copy())
    if extra_mass is not None:
        mb = replace(mb, mu=mb.mu + np.asarray(extra_mass, float))
    nd = _nodes(level, mb)
    T, D = _node_matrices(mb, nd)
    N_R, quad = _member_quadrature(mb, nd)
    deck_axis, u_breaks, v_breaks, cell_pair, pairs = _deck_cells(level, mb)
    n_p, n_m = pairs.shape[0], mb.L.size
    pair_c = mb.cross[pairs] if n_p else np.zeros((0, 2))
    pair_nodes = np.concatenate([nd.end_node[pairs[:, 0]], nd.end_node[pairs[:, 1]]],
                                axis=1) if n_p else np.zeros((0, 4), dtype=np.int64)
    pair_D = D[pair_nodes[:, :, None], pair_nodes[:, None, :]] if n_p else np.zeros((0, 4, 4))
    support_lists = [_support_path(level, nd, pairs[ip], pair_nodes[ip])
                     for ip in range(n_p)]
    pair_M = np.zeros((n_p, 4, 4))
    for ip, path in enumerate(support_lists):
        pair_M[ip] = _support_mass_form(mb, nd, T, D, quad, path, pair_nodes[ip])
    sup_member, sup_x, sup_m, sup_r, sup_w, sup_wmax = _support_actions(
        mb, nd, T, D, pair_nodes, support_lists)
    return Frame(
        level=level, cond=mb.cond, L=mb.L, EI=mb.EI, mu=mb.mu, vs=mb.vs, vdir=mb.vdir,
        cross=mb.cross, end_node=nd.end_node, node_member=nd.node_member,
        node_pos=nd.node_pos, node_xy=nd.node_xy, nodes_on=nd.nodes_on,
        T=T, D=D, deck_axis=deck_axis, u_breaks=u_breaks, v_breaks=v_breaks,
        cell_pair=cell_pair, pair_members=pairs, pair_c=pair_c, pair_nodes=pair_nodes,
        pair_D=pair_D, pair_M=pair_M, pair_support=tuple(support_lists), N_R=N_R,
        pair_sup_member=sup_member, pair_sup_x=sup_x, pair_sup_mcoef=sup_m,
        pair_sup_rcoef=sup_r, pair_sup_wcoef=sup_w,
        pair_D16=np.ascontiguousarray(pair_D.reshape(n_p, 16).T),
        pair_M16=np.ascontiguousarray(pair_M.reshape(n_p, 16).T),
        pair_wmax=np.ascontiguousarray(sup_wmax.T),
        N_R16=np.ascontiguousarray(N_R.reshape(n_m, 4).T),
    )


@dataclass(frozen=True, eq=False)
class _MemberArrays:
    """Per member: end condition code, span L (m), EI (N·m²), mass per length μ
    (kg/m; 0 without member mass), start ``vs`` and direction ``vdir`` along its axis,
    plan coordinate ``cross`` across it, axis index (0 = x)."""

    members: tuple[Member, ...]
    cond: np.ndarray
    L: np.ndarray
    EI: np.ndarray
    mu: np.ndarray
    vs: np.ndarray
    vdir: np.ndarray
    cross: np.ndarray
    axis_idx: np.ndarray


def _member_arrays(level: Level, include_member_mass: bool) -> _MemberArrays:
    members = level.members
    n_m = len(members)
    if n_m == 0:
        raise ModelError(f"level {level.id}.members", 0, "at least one member")
    cond = np.array([COND_NAMES.index(m.end_condition) for m in members], dtype=np.int64)
    mu = np.array([m.section.mass_per_length for m in members])
    if not include_member_mass:
        mu = np.zeros(n_m)
    axis_idx = np.array([0 if m.axis == "x" else 1 for m in members])
    return _MemberArrays(
        members=members, cond=cond, L=np.array([m.span for m in members]),
        EI=np.array([m.grade.E * m.section.Ix for m in members]), mu=mu,
        vs=np.array([m.start[a] for m, a in zip(members, axis_idx, strict=True)]),
        vdir=np.array([1.0 if m.end[a] >= m.start[a] else -1.0
                       for m, a in zip(members, axis_idx, strict=True)]),
        cross=np.array([m.start[1 - a] for m, a in zip(members, axis_idx, strict=True)]),
        axis_idx=axis_idx)


@dataclass(frozen=True, eq=False)
class _Nodes:
    """Member ends resting on other members: ``end_node`` (members, 2; n_n = on a
    column or free), the member and position (m) of each node, its plan point, the
    nodes on each member."""

    n_n: int
    end_node: np.ndarray
    node_member: np.ndarray
    node_pos: np.ndarray
    node_xy: np.ndarray
    nodes_on: tuple[np.ndarray, ...]


def _nodes(level: Level, mb: _MemberArrays) -> _Nodes:
    node_key: dict[tuple[int, int], int] = {}
    node_member: list[int] = []
    node_pos: list[float] = []
    node_xy: list[tuple[float, float]] = []
    end_ref: list[list[int]] = []
    rests_on: dict[int, set[int]] = {}
    for k, m in enumerate(mb.members):
        refs = []
        for e, p in enumerate((m.start, m.end)):
            if (m.end_condition == "cantilever" and e == 1) or _is_column(level, p):
                refs.append(-1)
                continue
            j, s = _find_support(level, k, p)
            key = (j, round(s / GEOMETRY_TOL))
            if key not in node_key:
                node_key[key] = len(node_member)
                node_member.append(j)
                node_pos.append(s)
                node_xy.append(p)
            refs.append(node_key[key])
            rests_on.setdefault(k, set()).add(j)
        end_ref.append(refs)
    _check_acyclic(level, rests_on)
    n_n = len(node_member)
    node_member_a = np.array(node_member, dtype=np.int64)
    return _Nodes(
        n_n=n_n,
        end_node=np.array([[n_n if r < 0 else r for r in refs] for refs in end_ref],
                          dtype=np.int64),
        node_member=node_member_a, node_pos=np.array(node_pos, dtype=float),
        node_xy=np.array(node_xy, dtype=float).reshape(-1, 2),
        nodes_on=tuple(np.flatnonzero(node_member_a == k) for k in range(len(mb.members))))


def _node_matrices(mb: _MemberArrays, nd: _Nodes) -> tuple[np.ndarray, np.ndarray]:
    """Node propagation T = (I − P)⁻¹ (a node load passed down the member tree by the
    reaction influence lines) and node flexibility D = Tᵀ·G·T (Maxwell–Betti)."""
    n_n, L, EI, end_node = nd.n_n, mb.L, mb.EI, nd.end_node
    P = np.zeros((n_n + 1, n_n + 1))
    Gn = np.zeros((n_n + 1, n_n + 1))
    for k in range(L.size):
        on = nd.nodes_on[k]
        if on.size == 0:
            continue
        c = COND_NAMES[mb.cond[k]]
        s_on = nd.node_pos[on]
        R0, RL = beam.unit_reactions(c, L[k], s_on)
        for e, R in ((0, R0), (1, RL)):
            tgt = end_node[k, e]
            if tgt < n_n:
                P[tgt, on] += R
        Gn[np.ix_(on, on)] = beam.green(c, L[k], EI[k], s_on[:, None], s_on[None, :])
    T = np.linalg.inv(np.eye(n_n + 1) - P)
    T[n_n, :] = 0.0
    T[:, n_n] = 0.0
    D = T.T @ Gn @ T
    D = 0.5 * (D + D.T)
    return T, D


def _member_quadrature(mb: _MemberArrays, nd: _Nodes,
                       ) -> tuple[np.ndarray, list[tuple[np.ndarray, np.ndarray]]]:
    """Gauss points of each member between its nodes, and N_R (members, 2, 2): the
    mass form of the support movement carried by the reaction influence lines."""
    L, n_m = mb.L, mb.L.size
    N_R = np.zeros((n_m, 2, 2))
    quad: list[tuple[np.ndarray, np.ndarray]] = []
    for k in range(n_m):
        brk = np.unique(np.concatenate(([0.0, L[k]], nd.node_pos[nd.nodes_on[k]])))
        seg0, seg1 = brk[:-1], brk[1:]
        xq = (seg0[:, None] + (seg1 - seg0)[:, None] * _GL_S[None, :]).ravel()
        wq = ((seg1 - seg0)[:, None] * _GL_WS[None, :]).ravel()
        quad.append((xq, wq))
        R0, RL = beam.unit_reactions(COND_NAMES[mb.cond[k]], L[k], xq)
        Rq = np.stack([R0, RL], axis=1)
        N_R[k] = mb.mu[k] * (Rq * wq[:, None]).T @ Rq
    return N_R, quad


def _deck_cells(level: Level, mb: _MemberArrays,
                ) -> tuple[str, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Deck span axis, cell breaks across (u) and along (v) the deck members, the
    panel of each cell (−1 none) and the two deck members of each panel."""
    L, vs, vdir, cross = mb.L, mb.vs, mb.vdir, mb.cross
    deck_axis = _deck_axis(level)
    dk_idx = 0 if deck_axis == "x" else 1
    deck_members = [k for k in range(L.size) if mb.axis_idx[k] == dk_idx]
    c_deck = cross[deck_members]
    v_lo = np.minimum(vs[deck_members], vs[deck_members] + vdir[deck_members] * L[deck_members])
    v_hi = np.maximum(vs[deck_members], vs[deck_members] + vdir[deck_members] * L[deck_members])
    u_breaks = np.unique(np.round(c_deck / GEOMETRY_TOL) * GEOMETRY_TOL)
    v_breaks = np.unique(np.round(np.concatenate([v_lo, v_hi]) / GEOMETRY_TOL) * GEOMETRY_TOL)
    nu, nv = max(len(u_breaks) - 1, 0), max(len(v_breaks) - 1, 0)
    cell_pair = -np.ones((nu, nv), dtype=np.int64)
    pair_index: dict[tuple[int, int], int] = {}
    for iv in range(nv):
        vmid = 0.5 * (v_breaks[iv] + v_breaks[iv + 1])
        cover = [(c_deck[i], deck_members[i]) for i in range(len(deck_members))
                 if v_lo[i] - GEOMETRY_TOL <= vmid <= v_hi[i] + GEOMETRY_TOL]
        for iu in range(nu):
            ulo, uhi = u_breaks[iu], u_breaks[iu + 1]
            left = [(c, k) for c, k in cover if c <= ulo + GEOMETRY_TOL]
            right = [(c, k) for c, k in cover if c >= uhi - GEOMETRY_TOL]
            if not left or not right:
                continue
            kl = max(left)[1]
            kr = min(right)[1]
            key = (kl, kr)
            if key not in pair_index:
                pair_index[key] = len(pair_index)
            cell_pair[iu, iv] = pair_index[key]
    pairs = np.array(list(pair_index), dtype=np.int64).reshape(-1, 2)
    return deck_axis, u_breaks, v_breaks, cell_pair, pairs


def _support_path(level: Level, nd: _Nodes, pair: np.ndarray,
                  nl: np.ndarray) -> tuple[int, ...]:
    """The members that carry a panel's deck members (sorted), following the nodes
    down to the columns; a deck member of the panel among them is refused."""
    n_n, members = nd.n_n, level.members
    path: list[int] = []
    todo = [int(n) for n in nl if n < n_n]
    seen_nodes: set[int] = set()
    while todo:
        node = todo.pop()
        if node in seen_nodes:
            continue
        seen_nodes.add(node)
        mm = int(nd.node_member[node])
        if mm not in path:
            path.append(mm)
        todo.extend(int(x) for x in nd.end_node[mm] if x < n_n)
    for kk in (int(pair[0]), int(pair[1])):
        if kk in path:
            raise ModelError(
                f"level {level.id}.members[{members[kk].id}]", members[kk].id,
                "a deck-supporting member that does not also carry, in the same "
                "deck panel, the load of the members it supports")
    path.sort()
    return tuple(path)


def _support_mass_form(mb: _MemberArrays, nd: _Nodes, T: np.ndarray, D: np.ndarray,
                       quad: list[tuple[np.ndarray, np.ndarray]], path: tuple[int, ...],
                       nl: np.ndarray) -> np.ndarray:
    """Kinetic-energy form (4, 4) of the support members of a panel per local
    reaction: Σ μ ∫ Φᵀ Φ dx with Φ their deflection per reaction (own bending under
    the node loads + end movement by the reaction influence lines)."""
    L, EI, end_node = mb.L, mb.EI, nd.end_node
    Mloc = np.zeros((4, 4))
    for mm in path:
        xq, wq = quad[mm]
        on = nd.nodes_on[mm]
        c = COND_NAMES[mb.cond[mm]]
        Phi = np.zeros((xq.size, 4))
        if on.size:
            g = beam.green(c, L[mm], EI[mm], xq[:, None], nd.node_pos[on][None, :])
            Phi += g @ T[np.ix_(on, nl)]
        R0, RL = beam.unit_reactions(c, L[mm], xq)
        Phi += R0[:, None] * D[end_node[mm, 0], nl][None, :]
        Phi += RL[:, None] * D[end_node[mm, 1], nl][None, :]
        Mloc += mb.mu[mm] * (Phi * wq[:, None]).T @ Phi
    return 0.5 * (Mloc + Mloc.T)


def _support_actions(mb: _MemberArrays, nd: _Nodes, T: np.ndarray, D: np.ndarray,
                     pair_nodes: np.ndarray, support_lists: list[tuple[int, ...]],
                     ) -> tuple[np.ndarray, ...]:
    """Support-member unit actions per panel: stations, moments, end reactions and
    deflections per local reaction, and the largest deflection per reaction."""
    L, EI, cond, end_node, nodes_on, node_pos = mb.L, mb.EI, mb.cond, nd.end_node, \
        nd.nodes_on, nd.node_pos

    def stations(k: int) -> np.ndarray:
        """Ends, nodes and midpoints between them; a simple member's ends carry no
        moment and are left out."""
        pts = np.unique(np.concatenate(([0.0, L[k]], node_pos[nodes_on[k]])))
        mids = 0.5 * (pts[:-1] + pts[1:])
        st = np.unique(np.concatenate([pts, mids]))
        if COND_NAMES[cond[k]] == "simple":
            st = st[(st > 0.0) & (st < L[k])]
        return st

    n_p = len(support_lists)
    st = [stations(k) for k in range(L.size)]
    n_sup = max((len(p) for p in support_lists), default=0)
    n_st = max((len(st[k]) for p in support_lists for k in p), default=1)
    sup_member = -np.ones((n_p, n_sup), dtype=np.int64)
    sup_x = np.zeros((n_p, n_sup, n_st))
    sup_m = np.zeros((n_p, n_sup, n_st, 4))
    sup_r = np.zeros((n_p, n_sup, 2, 4))
    sup_w = np.zeros((n_p, n_sup, n_st, 4))
    sup_wmax = np.zeros((n_p, 4))
    for ip, sup_path in enumerate(support_lists):
        nl = pair_nodes[ip]
        for jp, mm in enumerate(sup_path):
            on = nodes_on[mm]
            c = COND_NAMES[cond[mm]]
            xs = st[mm]
            xs_pad = np.concatenate([xs, np.full(n_st - xs.size, xs[-1])])
            sup_member[ip, jp] = mm
            sup_x[ip, jp] = xs_pad
            Tq = T[np.ix_(on, nl)]  # node loads on mm per local reaction
            um = beam.unit_moment(c, L[mm], xs_pad[:, None], node_pos[on][None, :])
            sup_m[ip, jp] = um @ Tq
            R0, RL = beam.unit_reactions(c, L[mm], node_pos[on])
            sup_r[ip, jp, 0] = R0 @ Tq
            sup_r[ip, jp, 1] = RL @ Tq
            # deflection at the stations per local reaction (own bending + supports)
            sup_w[ip, jp] = _support_deflection(c, L[mm], EI[mm], xs_pad, node_pos[on], Tq,
                                                D[end_node[mm, 0], nl], D[end_node[mm, 1], nl])
            dense = np.unique(np.concatenate([np.linspace(0.0, L[mm], 257), xs]))
            Wd = _support_deflection(c, L[mm], EI[mm], dense, node_pos[on], Tq,
                                     D[end_node[mm, 0], nl], D[end_node[mm, 1], nl])
            sup_wmax[ip] = np.maximum(sup_wmax[ip], np.maximum(Wd, 0.0).max(axis=0))
    return sup_member, sup_x, sup_m, sup_r, sup_w, sup_wmax


# --------------------------------------------------------------------------- per point
@dataclass(frozen=True, eq=False)
class PathResult:
    """Load path of a unit load at each drop point (arrays over points, SI).

    ``pair`` panel index (−1: no deck panel: not assessed); ``members`` (n, 2)
    the deck-supporting members, ``share`` (n, 2) their lever-rule shares w_k,
    ``a`` (n, 2) positions along them (m), ``strip_span`` and ``strip_pos`` the
    deck strip span and the distance of p from the first member (m), ``r`` (n, 4)
    end reactions passed to the local nodes, ``u`` (n, 4) the node deflections
    (m/N), ``f`` compliance (m/N), ``m_e`` effective mass (kg), ``g_own`` (n, 2)
    own-bending deflection of each deck member under its share (m/N), ``w_ref``
    the deflection that normalises the Rayleigh shape (m/N, ≥ f).
    """

    pair: np.ndarray
    members: np.ndarray
    share: np.ndarray
    a: np.ndarray
    strip_span: np.ndarray
    strip_pos: np.ndarray
    r: np.ndarray
    u: np.ndarray
    f: np.ndarray
    m_e: np.ndarray
    g_own: np.ndarray
    w_ref: np.ndarray

    @property
    def supported(self) -> np.ndarray:
        return self.pair >= 0


@dataclass(frozen=True, eq=False)
class _PointTables:
    """Per-panel copies of the frame data the point kernel reads, laid out
    (quantity, panel) so that one ``take`` along the panel axis fetches a block of
    quantities for every point. Every entry is a copy of a frame value or the same
    floating-point expression of frame values that the kernel would otherwise
    evaluate per point, so the results do not change."""

    cond: beam.EndCondition | None
    """The end condition shared by every member (None: mixed; see ``codes``)."""
    codes: np.ndarray
    """(2, n_p) end-condition codes of the two deck members of each panel."""
    members: np.ndarray
    """(n_p, 2) the two deck members of each panel (row per panel)."""
    geo: np.ndarray
    """(10, n_p): c0, strip span, then per deck member (2 rows each) L, vs, vdir, EI."""
    mass: np.ndarray
    """(12, n_p) per deck member: μ, L⁴/EI, L⁷/EI², N00, N01 and N11 of ``N_R``."""
    l3ei: np.ndarray
    """(2, n_p) per deck member: L³/EI."""
    d_rows: np.ndarray
    d_map: tuple[int, ...]
    """Distinct rows of ``pair_D16`` and the row of each of its 16 entries (the node
    flexibility matrix is symmetric: 10 of 16 are distinct)."""
    m_rows: np.ndarray
    m_map: tuple[int, ...]
    wmax: np.ndarray
    """(4, n_p) ``pair_wmax``."""
    cells: np.ndarray | None
    """Panel of each cell padded with −1 on every side, flat, (n_u + 2)·(n_v + 2)
    (None: no deck cells)."""


def _distinct_rows(t: np.ndarray) -> tuple[np.ndarray, tuple[int, ...]]:
    rows: list[np.ndarray] = []
    where: list[int] = []
    for r in t:
        for j, q in enumerate(rows):
            if np.array_equal(q, r):
                where.append(j)
                break
        else:
            where.append(len(rows))
            rows.append(r)
    return np.array(rows).reshape(len(rows), t.shape[1]), tuple(where)


def _point_tables(frame: Frame) -> _PointTables:
    """The :class:`_PointTables` of ``frame`` (built once, kept on the frame)."""
    return frame_memo(frame, "point_tables", lambda: _build_point_tables(frame))


def _build_point_tables(frame: Frame) -> _PointTables:
    pm = frame.pair_members  # (n_p, 2)
    memT = np.ascontiguousarray(pm.T)
    L, EI = frame.L, frame.EI
    l3ei = L**3 / EI
    NR = frame.N_R16
    codes = frame.cond[memT]
    uniform = frame.cond.size > 0 and int(frame.cond.min()) == int(frame.cond.max())
    geo = np.concatenate([frame.pair_c[:, :1].T, (frame.pair_c[:, 1] - frame.pair_c[:, 0])[None],
                          L[memT], frame.vs[memT], frame.vdir[memT], EI[memT]])
    mass = np.concatenate([frame.mu[memT], (L * l3ei)[memT], (L * l3ei**2)[memT],
                           NR[0][memT], NR[1][memT], NR[3][memT]])
    d_rows, d_map = _distinct_rows(frame.pair_D16)
    m_rows, m_map = _distinct_rows(frame.pair_M16)
    cells = None
    if frame.u_breaks.size >= 2 and frame.v_breaks.size >= 2:
        cp = frame.cell_pair
        pad = -np.ones((cp.shape[0] + 2, cp.shape[1] + 2), dtype=np.int64)
        pad[1:-1, 1:-1] = cp
        cells = pad.ravel()
    pt = _PointTables(
        cond=COND_NAMES[int(frame.cond[0])] if uniform else None, codes=codes,
        members=np.ascontiguousarray(pm), geo=np.ascontiguousarray(geo),
        mass=np.ascontiguousarray(mass), l3ei=np.ascontiguousarray(l3ei[memT]),
        d_rows=d_rows, d_map=d_map, m_rows=m_rows, m_map=m_map,
        wmax=np.ascontiguousarray(frame.pair_wmax), cells=cells)
    return pt


def locate(frame: Frame, x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Panel index of each point (−1 outside every deck panel)."""
    x = np.asarray(x, float)
    y = np.asarray(y, float)
    shape = np.broadcast_shapes(x.shape, y.shape)
    pt = _point_tables(frame)
    if pt.cells is None:
        return -np.ones(shape, dtype=np.int64)
    u, v = (y, x) if frame.deck_axis == "x" else (x, y)
    ub, vb = frame.u_breaks, frame.v_breaks
    u = np.broadcast_to(u, shape).reshape(-1)
    v = np.broadcast_to(v, shape).reshape(-1)
    # cell index + 1 along each axis: 0 before the first break, size − 1 beyond the
    # last; points exactly on the last break belong to the last cell
    iu = np.searchsorted(ub, u, side="right")
    iv = np.searchsorted(vb, v, side="right")
    iu[np.abs(u - ub[-1]) <= GEOMETRY_TOL] = ub.size - 1
    iv[np.abs(v - vb[-1]) <= GEOMETRY_TOL] = vb.size - 1
    iu *= vb.size + 1
    iu += iv
    return pt.cells.take(iu).reshape(shape)


_FILL: dict[str, tuple[tuple[int, ...], type, float]] = {
    "members": ((2,), np.int64, -1), "share": ((2,), float, 0.0), "a": ((2,), float, 0.0),
    "strip_span": ((), float, np.nan), "strip_pos": ((), float, np.nan),
    "r": ((4,), float, 0.0), "u": ((4,), float, 0.0), "f": ((), float, np.nan),
    "m_e": ((), float, np.nan), "g_own": ((2,), float, 0.0), "w_ref": ((), float, np.nan),
}
"""Shape per point, dtype and value off the deck panels of each :class:`PathResult`
array."""


def evaluate(frame: Frame, x: Iterable[float] | np.ndarray,
             y: Iterable[float] | np.ndarray, *, with_mass: bool = True) -> PathResult:
    """Load path, compliance f(p) (m/N) and effective mass m_e(p) (kg) at each point.

    Formulas in the module docstring. Points outside every deck panel get
    ``pair = −1`` and nan for f and m_e. Blocks of :data:`CHUNK` points run on
    several threads (:func:`droprig.solver.parallel.for_blocks`); every point is
    computed by the same operations whatever its block, so the results do not
    depend on the number of threads.
    """
    x = np.atleast_1d(np.asarray(x, float))
    y = np.atleast_1d(np.asarray(y, float))
    n = x.size
    pt = _point_tables(frame)
    pair = np.empty(n, dtype=np.int64)
    out: dict[str, np.ndarray] = {k: np.empty((n, *sh), dtype=dt)
                                  for k, (sh, dt, _) in _FILL.items()}

    def block(s: int, e: int) -> None:
        p = locate(frame, x[s:e], y[s:e])
        pair[s:e] = p
        idx = np.flatnonzero(p >= 0)
        if idx.size < e - s:
            for k, (_, _, fill) in _FILL.items():
                out[k][s:e] = fill
            if idx.size == 0:
                return
        if idx.size == e - s:
            sel: slice | np.ndarray = slice(s, e)
        elif idx[-1] - idx[0] == idx.size - 1:  # a run of points: slices, no gathers
            sel = slice(s + int(idx[0]), s + int(idx[-1]) + 1)
            p = p[idx[0]:idx[-1] + 1]
        else:
            sel = idx + s
            p = p[idx]
        _evaluate_supported(frame, pt, x[sel], y[sel], p, with_mass, out, sel)

    for_blocks(block, n, CHUNK)
    return PathResult(pair=pair, **out)


def _evaluate_supported(frame: Frame, pt: _PointTables, x: np.ndarray, y: np.ndarray,
                        pair: np.ndarray, with_mass: bool, out: dict[str, np.ndarray],
                        sel: slice | np.ndarray) -> None:
    """Kernel of :func:`evaluate` for points over a deck panel; writes rows ``sel``
    of ``out``. Arrays are laid out component-first, (k, n), so every operation runs
    over contiguous memory; sums run in the order of the formulas in the comments
    (floating-point addition is not associative: the order is part of the result)."""
    u, v = (y, x) if frame.deck_axis == "x" else (x, y)
    n = pair.size
    out["members"][sel] = pt.members.take(pair, axis=0)
    G = pt.geo.take(pair, axis=1)
    c0, span = G[0], G[1]
    L, vs, vdir, EI = G[2:4], G[4:6], G[6:8], G[8:10]
    # pos = clip(u − c0, 0, span)
    pos = np.subtract(u, c0)
    np.maximum(pos, 0.0, out=pos)
    np.minimum(pos, span, out=pos)
    share = np.empty((2, n))  # lever rule: 1 − t, t
    np.divide(pos, span, out=share[1])  # span > 0: distinct member lines
    np.subtract(1.0, share[1], out=share[0])
    # a = clip((v − vs)·vdir, 0, L)
    a = np.subtract(v, vs)
    a *= vdir
    np.maximum(a, 0.0, out=a)
    np.minimum(a, L, out=a)
    if pt.cond is not None:
        g_aa = beam.green(pt.cond, L, EI, a, a)
        R0, RL = beam.unit_reactions(pt.cond, L, a)
    else:
        cond = pt.codes.take(pair, axis=1)
        g_aa = by_condition(beam.green, cond, L, EI, a, a)
        R0, RL = by_condition(beam.unit_reactions, cond, L, a)
    r = np.empty((4, n))
    np.multiply(share[0], R0[0], out=r[0])
    np.multiply(share[0], RL[0], out=r[1])
    np.multiply(share[1], R0[1], out=r[2])
    np.multiply(share[1], RL[1], out=r[3])
    tmp = np.empty(n)
    Dl = pt.d_rows.take(pair, axis=1)
    un = np.empty((4, n))
    for i in range(4):
        _quad4(Dl, pt.d_map, i, r, un[i], tmp)
    del Dl
    gs = np.multiply(share, g_aa, out=g_aa)  # g_own
    # f = (w0·g0 + w1·g1) + (((r0·u0 + r1·u1) + r2·u2) + r3·u3)
    f = np.multiply(share[0], gs[0])
    np.multiply(share[1], gs[1], out=tmp)
    f += tmp
    ru = np.multiply(r[0], un[0])
    for j in (1, 2, 3):
        np.multiply(r[j], un[j], out=tmp)
        ru += tmp
    f += ru
    for key, val in (("share", share), ("a", a), ("strip_span", span), ("strip_pos", pos),
                     ("r", r), ("u", un), ("f", f), ("g_own", gs)):
        _put(out[key], sel, val)
    if not with_mass:  # no mass asked for: none given (never uninitialised memory)
        out["m_e"][sel] = np.nan
        out["w_ref"][sel] = np.nan
        return
    m_e, w_ref = _kernel_mass(pt, pair, None if pt.cond is not None else cond, a, L, share,
                              un, r, f, tmp)
    _put(out["m_e"], sel, m_e)
    _put(out["w_ref"], sel, w_ref)


def _quad4(rows: np.ndarray, where: tuple[int, ...], i: int, r: np.ndarray, dst: np.ndarray,
           tmp: np.ndarray) -> None:
    """dst = ((A_i0·r0 + A_i1·r1) + A_i2·r2) + A_i3·r3 (``tmp``: scratch, (n,))."""
    np.multiply(rows[where[4 * i]], r[0], out=dst)
    for j in (1, 2, 3):
        np.multiply(rows[where[4 * i + j]], r[j], out=tmp)
        dst += tmp


def _kernel_mass(pt: _PointTables, pair: np.ndarray, cond: np.ndarray | None,
                 a: np.ndarray, L: np.ndarray, share: np.ndarray, un: np.ndarray,
                 r: np.ndarray, f: np.ndarray, tmp: np.ndarray,
                 ) -> tuple[np.ndarray, np.ndarray]:
    """Rayleigh mass m_e (kg) and normalising deflection w_ref (m/N) of the points of
    :func:`_evaluate_supported` (``cond``: the end-condition codes when mixed; ``a``
    is overwritten)."""
    n = pair.size
    # Rayleigh mass: deck members by the exact integrals (tabulated on a/L), support
    # members by the precomputed quadratic form pair_M
    xi = np.divide(a, L, out=a)  # a is not needed any more
    if pt.cond is not None:
        I_gg, J0, J1, Gmax = _mass_tables(pt.cond, xi)
    else:
        assert cond is not None
        I_gg, J0, J1, Gmax = by_condition(_mass_tables, cond, xi)
    M = pt.mass.take(pair, axis=1)
    mu, L4EI, L7EI2 = M[0:2], M[2:4], M[4:6]
    N00, N01, N11 = M[6:8], M[8:10], M[10:12]
    I_gg *= L7EI2  # L·(L³/EI)²
    J0 *= L4EI  # L·(L³/EI)
    J1 *= L4EI
    ue0, ue1 = un[0::2], un[1::2]  # node deflections at each deck member's two ends
    # per deck member: ((μ·(w²·I_gg + 2w·(ue0·J0 + ue1·J1)) + ue0²·N00)
    #                   + 2·ue0·ue1·N01) + ue1²·N11
    A = np.multiply(share, share)
    A *= I_gg
    B = np.multiply(ue0, J0, out=J0)
    B += np.multiply(ue1, J1, out=J1)
    C = np.multiply(2.0, share)
    C *= B
    A += C
    A *= mu
    np.multiply(ue0, ue0, out=C)
    C *= N00
    A += C
    np.multiply(2.0, ue0, out=C)
    C *= ue1
    C *= N01
    A += C
    np.multiply(ue1, ue1, out=C)
    C *= N11
    A += C
    kin = np.add(A[0], A[1])
    Ml = pt.m_rows.take(pair, axis=1)
    q = np.empty(n)
    for i in range(4):  # kin += r_i·(M r)_i
        _quad4(Ml, pt.m_map, i, r, q, tmp)
        q *= r[i]
        kin += q
    del Ml
    # normalising deflection: the larger of w(p) and an upper bound of the largest
    # deflection along the path (own bending maximum + largest end movement for the
    # deck members; Σ_i r_i·max_s W_s,i for the support members, W ≥ 0)
    w_deck = np.multiply(share, Gmax, out=Gmax)
    w_deck *= pt.l3ei.take(pair, axis=1)
    w_deck += np.maximum(np.abs(ue0), np.abs(ue1))
    W = pt.wmax.take(pair, axis=1)
    w_sup = np.multiply(W[0], r[0])
    for j in (1, 2, 3):
        np.multiply(W[j], r[j], out=tmp)
        w_sup += tmp
    w_ref = np.maximum(np.maximum(f, w_sup), np.maximum(w_deck[0], w_deck[1]))
    m_e = np.zeros(n)
    with np.errstate(divide="ignore", invalid="ignore"):
        np.divide(kin, np.square(w_ref), out=m_e, where=w_ref > 0.0)
    return m_e, w_ref


def _put(dst: np.ndarray, sel: slice | np.ndarray, val: np.ndarray) -> None:
    """dst[sel] = val.T for a (k, n) ``val`` (one component at a time: a strided
    copy of each is much faster than one transposing copy), dst[sel] = val for (n,)."""
    if val.ndim == 1:
        dst[sel] = val
        return
    dT = dst.T
    for j in range(val.shape[0]):
        dT[j][sel] = val[j]


def deflected_shape(frame: Frame, path: PathResult, i: int, member: int,
                    x: np.ndarray) -> np.ndarray:
    """Deflection w_m(x) (m per N at p) of ``member`` for the unit load at point ``i``
    of ``path`` (own bending plus support movement, see the module docstring).
    Used by the trace and the tests; not vectorised over points."""
    x = np.asarray(x, float)
    c = COND_NAMES[frame.cond[member]]
    Lm, EI = frame.L[member], frame.EI[member]
    ip = int(path.pair[i])
    nl = frame.pair_nodes[ip]
    r = path.r[i]
    q = frame.T[:, nl] @ r  # total node loads
    uall = frame.D[:, nl] @ r  # node deflections
    w = np.zeros_like(x)
    for k in range(2):
        if frame.pair_members[ip, k] == member:
            w += path.share[i, k] * beam.green(c, Lm, EI, x, path.a[i, k])
    on = frame.nodes_on[member]
    if on.size:
        w += beam.green(c, Lm, EI, x[:, None], frame.node_pos[on][None, :]) @ q[on]
    R0, RL = beam.unit_reactions(c, Lm, x)
    w += R0 * uall[frame.end_node[member, 0]] + RL * uall[frame.end_node[member, 1]]
    return w


def path_members(frame: Frame, pair: int) -> tuple[int, ...]:
    """Every member that carries part of a load dropped in panel ``pair``."""
    return tuple(sorted({int(k) for k in frame.pair_members[pair]}
                        | set(frame.pair_support[pair])))


def tributary_widths(frame: Frame) -> np.ndarray:
    """Deck width carried by each member (m): half the strip span on each side for
    the deck-supporting members, 0 for the others (one-way deck, lever rule)."""
    trib = np.zeros(frame.n_members)
    if frame.n_pairs == 0:
        return trib
    # each cell contributes its width × length / member length, shared half and half
    ub, vb = frame.u_breaks, frame.v_breaks
    for iu in range(frame.cell_pair.shape[0]):
        for iv in range(frame.cell_pair.shape[1]):
            ip = frame.cell_pair[iu, iv]
            if ip < 0:
                continue
            du = ub[iu + 1] - ub[iu]
            dv = vb[iv + 1] - vb[iv]
            for k in frame.pair_members[ip]:
                trib[k] += 0.5 * du * dv / frame.L[k]
    return trib


__all__ = [
    "CHUNK",
    "COND_NAMES",
    "Frame",
    "PathResult",
    "build_frame",
    "by_condition",
    "deflected_shape",
    "evaluate",
    "frame_memo",
    "locate",
    "path_members",
    "tributary_widths",
]
