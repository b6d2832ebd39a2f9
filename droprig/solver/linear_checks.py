"""Checks whose demand is linear in the impact force.

Every check of a member or of the deck at a drop point has a demand that is linear in
the peak force F: demand = F·u + E, with u the demand per newton at the point (from
the load path) and E the demand of the existing loads. Against a resistance R the
utilisation is U = |F·u + E|/R and the largest force the check allows is

    F_allow = (R − sign(u)·E)/|u|   (∞ where u = 0; −1 where |E| > R already)

(the linear inequality |F·u + E| ≤ R solved for F ≥ 0; common practice, no source).
A check family (flexure at every station of every member of the load path, shear at
every member end, …) has many such candidates per point; the family's U is the largest
and its F_allow the smallest over the candidates, and the candidate with the largest U
names the governing member.

Arrays are laid out candidate-first, (C, n), so that every operation runs over
contiguous rows of drop points.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

__all__ = ["F_HUGE", "Check", "Family", "argmax0", "argmin_axis", "demand", "first_at",
           "small_check"]

F_HUGE = 1e300
"""Stands in for an unbounded force so that 0·∞ reads as 0 (a rigid point puts no
load on a member that takes no share of it) while any share of it stays ∞."""


def demand(F: np.ndarray, unit: np.ndarray, exist: np.ndarray | None) -> np.ndarray:
    """|F·unit + exist| (``exist`` None: no existing demand); ∞ where F is unbounded and
    the candidate takes a share."""
    inf = np.isinf(F)
    has_inf = bool(inf.any())
    d = (np.minimum(F, F_HUGE) if has_inf else F) * unit
    if exist is not None:
        d += exist
    np.abs(d, out=d)
    if has_inf:
        d = np.where(inf & (unit != 0.0), np.inf, d)
    return d


def first_at(D: np.ndarray, V: np.ndarray, axis: int) -> np.ndarray:
    """Index along ``axis`` of the first entry of ``D`` equal to ``V`` (``V`` = the max
    or min of ``D`` over ``axis``): ``np.argmax``/``np.argmin`` over a leading axis
    without the transposed copy numpy makes for it. Up to 8 entries: the matches are
    packed as bits (first entry = highest bit) and the highest set bit is looked up.
    Where ``V`` holds a NaN the answer is the first NaN: callers hand those to numpy."""
    D = np.moveaxis(D, axis, 0)
    S = D.shape[0]
    if S <= 8:
        e = np.equal(D, V).view(np.uint8)
        w = (np.uint8(1) << np.arange(S - 1, -1, -1, dtype=np.uint8)).reshape(
            (S,) + (1,) * (D.ndim - 1))
        e *= w
        code = e.sum(axis=0, dtype=np.uint8)
        return np.take(_FIRST_BIT[S], code)
    j = np.zeros(V.shape, dtype=np.intp)
    m = np.empty(V.shape, dtype=bool)
    for c in range(S - 1, -1, -1):  # the lowest matching index written last
        np.equal(D[c], V, out=m)
        np.copyto(j, c, where=m)
    return j


def _first_bit_tables() -> dict[int, np.ndarray]:
    """For S entries packed as bits (entry c → bit S−1−c): the entry of the highest
    set bit of each code (0 where none is set)."""
    out = {}
    for S in range(1, 9):
        codes = np.arange(1 << S)
        hb = np.zeros(codes.size, dtype=np.intp)
        nz = codes > 0
        hb[nz] = S - 1 - np.floor(np.log2(codes[nz])).astype(np.intp)
        out[S] = hb
    return out


_FIRST_BIT = _first_bit_tables()


SMALL = 2048
"""Up to this many points numpy's own argmax/argmin over a leading axis is faster
than :func:`first_at` (fewer calls); both give the same index."""

ROW_BLOCK = 1 << 18
"""Elements per operation when rows of a (C, n) family are processed a few at a time
(about 256 KiB: the operands stay in the core's cache)."""


def argmax0(D: np.ndarray, U: np.ndarray) -> np.ndarray:
    """``np.argmax(D, axis=0)`` given ``U = D.max(axis=0)`` (same index, first maximum;
    first NaN where a column holds one)."""
    if D.shape[0] == 1:
        return np.zeros(U.shape, dtype=np.intp)
    if U.size <= SMALL or np.isnan(U).any():
        return np.argmax(D, axis=0)
    return first_at(D, U, 0)


def argmin_axis(D: np.ndarray, V: np.ndarray, axis: int) -> np.ndarray:
    """``np.argmin(D, axis=axis)`` given ``V = D.min(axis=axis)`` (same index, first
    minimum; first NaN where the reduced line holds one)."""
    if V.size <= SMALL or np.isnan(V).any():
        return np.argmin(D, axis=axis)
    return first_at(D, V, axis)


def _row_blocks(a: int, b: int, n: int) -> list[slice]:
    """Rows a..b in blocks of about :data:`ROW_BLOCK` elements (n per row)."""
    k = max(1, ROW_BLOCK // max(n, 1))
    return [slice(s, min(s + k, b)) for s in range(a, b, k)]


@dataclass
class Check:
    """One check family over the points: U at the elastic peak, allowed force and the
    member it governs on; for the calculation trace also the governing candidate's
    demand per N, existing demand and resistance (None otherwise). ``U_at(F)``: the
    family's U at another force; ``at(F)``: the family's whole check at another force
    — its U, the member that governs there and (with the detail) that candidate's
    demand per N, existing demand and resistance (None where not kept). A check made
    at an amplified force A·F takes its member and detail from ``at(A·F)``: the
    candidate with the largest U at F need not be the one at A·F (the existing demand
    E weighs less as the force grows)."""

    name: str
    U: np.ndarray
    F_allow: np.ndarray
    member: np.ndarray
    unit: np.ndarray | None
    exist: np.ndarray | None
    resist: np.ndarray | None
    U_at: Callable[[np.ndarray], np.ndarray]
    at: Callable[[np.ndarray], Check] | None = None


def small_check(name: str, F: np.ndarray, unit: np.ndarray, exist: np.ndarray | None,
                resist: np.ndarray, member: np.ndarray, detail: bool = True) -> Check:
    """A family of a few candidates given as (k, n) arrays (``exist`` None: no existing
    demand): U = max_c |F·u_c + E_c|/R_c, F_allow = min_c (R_c − sign(u_c)·E_c)/|u_c|.
    The governing candidate has the largest U (where U is unbounded: the lowest
    allowed force)."""
    D = demand(F[None, :], unit, exist)
    D /= resist
    U = D.max(axis=0)
    with np.errstate(divide="ignore", invalid="ignore"):
        if exist is None:
            fa = resist / np.abs(unit)
        else:
            fa = (resist - np.sign(unit) * exist) / np.abs(unit)
            fa = np.where(np.abs(exist) > resist, -1.0, fa)
    fa = np.where(np.isnan(fa), np.inf, fa)
    F_allow = fa.min(axis=0)
    if not detail and D.shape[0] == 1:
        j = np.zeros(U.shape, dtype=np.intp)
    else:
        j = argmax0(D, U)
        unbounded = np.isinf(U)
        if unbounded.any():
            j = np.where(unbounded, np.argmin(fa, axis=0), j)
    cols = np.arange(F.size)
    shape = D.shape

    def U_at(Fx: np.ndarray) -> np.ndarray:
        d = demand(Fx[None, :], unit, exist)
        d /= resist
        return d.max(axis=0)

    mem = (np.broadcast_to(member, shape)[0] if shape[0] == 1
           else np.broadcast_to(member, shape)[j, cols])

    def at(Fx: np.ndarray) -> Check:
        return small_check(name, Fx, unit, exist, resist, member, detail)

    if not detail:
        return Check(name, U, F_allow, mem, None, None, None, U_at, at)
    ex = np.zeros(shape) if exist is None else np.broadcast_to(exist, shape)
    return Check(name, U, F_allow, mem, np.broadcast_to(unit, shape)[j, cols],
                 ex[j, cols], np.broadcast_to(resist, shape)[j, cols], U_at, at)


class Family:
    """Load-independent candidates of one check family over n points.

    ``ut`` (C, n): demand per unit force at p divided by the resistance; ``Et`` (C, n):
    existing demand divided by the resistance; ``src`` (C,): the source of each row,
    an index into ``members`` (K, n) and ``resist`` (K, n), the member and resistance
    per point. ``groups``: the rows of each source as consecutive (start, stop) runs in
    source order, when the rows are laid out so (else None). The allowed force per
    candidate, ``fa`` = (1 − sign(ut)·Et)/|ut| (∞ where ut = 0, −1 where |Et| > 1), and
    its minimum ``F_allow`` do not depend on the load; ``gmin`` (K, n) is the minimum
    per source when ``groups`` is given.
    """

    def __init__(self, ut: np.ndarray, Et: np.ndarray, members: np.ndarray,
                 resist: np.ndarray, src: np.ndarray,
                 groups: tuple[tuple[int, int], ...] | None = None) -> None:
        self.ut = ut
        self.Et = Et
        self.members = members
        self.resist = resist
        self.src = np.asarray(src, dtype=np.intp)
        self.groups = groups
        self._allowed()

    @classmethod
    def from_candidates(cls, unit: np.ndarray, exist: np.ndarray, resist: np.ndarray,
                        member: np.ndarray) -> Family:
        """A family from plain (C, n) arrays of demand per N, existing demand,
        resistance and member (one source per row)."""
        R = np.ascontiguousarray(resist, dtype=float)
        return cls(np.ascontiguousarray(unit) / R, np.ascontiguousarray(exist) / R,
                   np.ascontiguousarray(member), R, np.arange(R.shape[0]))

    def _allowed(self) -> None:
        # (1 − sign(ut)·Et)/|ut| written as (copysign(1, ut) − Et)/ut: the same value
        # bit for bit (−(1 + Et)/(−|ut|) for ut < 0); ut = ±0 gives ±(1 ∓ Et)/±0 = ∞
        # while |Et| < 1, and the NaN of |Et| = 1 over ut = 0 is set to ∞ below
        ut, Et = self.ut, self.Et
        fa = np.empty_like(ut)
        with np.errstate(divide="ignore", invalid="ignore"):
            for rows in _row_blocks(0, ut.shape[0], ut.shape[1]):
                blk = fa[rows]
                u = ut[rows]
                if u.size and u.min() > 0.0:  # sagging only: copysign(1, ut) = 1
                    np.subtract(1.0, Et[rows], out=blk)
                else:
                    np.copysign(1.0, u, out=blk)
                    blk -= Et[rows]
                blk /= u
        # (a NaN in Et reads as over: the exact test below then runs)
        over = bool(Et.size) and not (Et.max() <= 1.0 and Et.min() >= -1.0)
        self.fa = fa
        self._reduce_fa()
        if np.isnan(self.F_allow).any():
            # a NaN unit demand sets no limit (∞); nor does ut = 0 with |Et| = 1
            np.copyto(fa, np.inf, where=np.isnan(fa) & (np.isnan(ut) | ~np.isnan(Et)))
            over = True
        if over:  # the existing demand alone exceeds the resistance
            np.copyto(fa, -1.0, where=np.abs(Et) > 1.0)
            self._reduce_fa()

    def _reduce_fa(self) -> None:
        fa = self.fa
        if self.groups is None:
            self.gmin = None
            self.F_allow = fa.min(axis=0)
            return
        self.gmin = np.stack([fa[a:b].min(axis=0) for a, b in self.groups])
        self.F_allow = self.gmin.min(axis=0)

    # ----------------------------------------------------------------- at a force
    def _rows_max(self, F: np.ndarray, a: int, b: int, out: np.ndarray,
                  inf: np.ndarray | None) -> None:
        """out = max over rows a..b of |F·ut + Et| (a few rows at a time)."""
        ut, Et = self.ut, self.Et
        for i, rows in enumerate(_row_blocks(a, b, F.size)):
            d = F * ut[rows]
            d += Et[rows]
            np.abs(d, out=d)
            if inf is not None:
                np.copyto(d, np.inf, where=inf & (ut[rows] != 0.0))
            if i:
                np.maximum(out, d.max(axis=0), out=out)
            else:
                d.max(axis=0, out=out)

    def U_at(self, F: np.ndarray) -> np.ndarray:
        """max_c |F·ut_c + Et_c| (∞ where F is unbounded and a candidate takes a share)."""
        inf = np.isinf(F)
        has_inf = bool(inf.any())
        Fm = np.minimum(F, F_HUGE) if has_inf else F
        out = np.empty(F.shape)
        self._rows_max(Fm, 0, self.ut.shape[0], out, inf if has_inf else None)
        return out

    def check(self, name: str, F: np.ndarray, detail: bool = True) -> Check:
        """The family at force F: U, the governing member, and for ``detail`` the
        governing candidate's demand per N, existing demand and resistance."""
        n = F.size
        cols = np.arange(n)

        def at(Fx: np.ndarray) -> Check:
            return self.check(name, Fx, detail)

        inf = np.isinf(F)
        has_inf = bool(inf.any())
        Fm = np.minimum(F, F_HUGE) if has_inf else F
        if self.groups is not None and not detail:
            # the first row with the largest U lies in the first source with it
            gmax = np.empty((len(self.groups), n))
            for gi, (a, b) in enumerate(self.groups):
                self._rows_max(Fm, a, b, gmax[gi], inf if has_inf else None)
            U = gmax.max(axis=0)
            g = argmax0(gmax, U)
            unbounded = np.isinf(U)
            if unbounded.any():
                assert self.gmin is not None  # set with the groups
                g = np.where(unbounded, np.argmin(self.gmin, axis=0), g)
            return Check(name, U, self.F_allow, self.members[g, cols], None, None, None,
                         self.U_at, at)
        D = demand(F[None, :], self.ut, self.Et)
        U = D.max(axis=0)
        j = argmax0(D, U)
        unbounded = np.isinf(U)
        if unbounded.any():
            j = np.where(unbounded, np.argmin(self.fa, axis=0), j)
        s = self.src[j]
        member = self.members[s, cols]
        if not detail:
            return Check(name, U, self.F_allow, member, None, None, None, self.U_at, at)
        R = self.resist[s, cols]
        return Check(name, U, self.F_allow, member, self.ut[j, cols] * R,
                     self.Et[j, cols] * R, R, self.U_at, at)

    def tiled(self, k: int) -> Family:
        """This family repeated ``k`` times along the points (one copy per load)."""
        return self._columns(lambda a: np.tile(a, (1, k)) if a.ndim == 2 else np.tile(a, k))

    def take(self, idx: np.ndarray) -> Family:
        """This family at the points ``idx`` only (every array is per point, column by
        column: the values are those of the family built on those points alone)."""
        return self._columns(lambda a: np.take(a, idx, axis=a.ndim - 1))

    @staticmethod
    def concat(parts: Sequence[Family]) -> Family | None:
        """The families of several sets of points one after the other, or ``None``
        where their candidate rows differ (not one floor's layout)."""
        first = parts[0]
        if any(f.ut.shape[0] != first.ut.shape[0] or f.groups != first.groups
               or not np.array_equal(f.src, first.src)
               or (f.gmin is None) != (first.gmin is None) for f in parts):
            return None
        fam = object.__new__(Family)
        for attr in ("ut", "Et", "members", "resist", "fa"):
            setattr(fam, attr, np.concatenate([getattr(f, attr) for f in parts], axis=1))
        fam.src = first.src
        fam.groups = first.groups
        fam.gmin = None if first.gmin is None else np.concatenate(
            [f.gmin for f in parts], axis=1)
        fam.F_allow = np.concatenate([f.F_allow for f in parts])
        return fam

    def _columns(self, per_point: Callable[[np.ndarray], np.ndarray]) -> Family:
        """A family with ``per_point`` applied to every per-point array (the candidate
        rows, their sources and groups unchanged)."""
        fam = object.__new__(Family)
        for attr in ("ut", "Et", "members", "resist", "fa"):
            setattr(fam, attr, per_point(getattr(self, attr)))
        fam.src = self.src
        fam.groups = self.groups
        fam.gmin = None if self.gmin is None else per_point(self.gmin)
        fam.F_allow = per_point(self.F_allow)
        return fam
