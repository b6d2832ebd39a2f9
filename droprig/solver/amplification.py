"""Dynamic amplification of the energy method's demands, calibrated on the time history.

The energy method with the Rayleigh struck mass (``impact``, Gere §9.10 with
Timoshenko's mass correction) is exact for a heavy load and reads low for a light one:
a light load excites the member's higher modes and bounces off before the member has
taken up the motion the static shape assumes. droprig therefore multiplies the
energy method's impact demands (contact force, member moment, shear, deflection) by
factors ≥ 1 read from a table (:mod:`droprig.solver.amplification_table`) of

* the struck member's end condition and the struck position ξ (the distance to the
  nearer support over the span: 0–0.08, 0.08–0.25, 0.25–0.5; a cantilever's from its
  fixed end: 0–0.3, 0.3–0.6, 0.6–1),
* r = M/mₑ, the load mass over the member's effective mass at the struck point
  (Rayleigh, mₑ = β·μ·L, kg/kg), and
* κ = f_c/f_s, the contact compliance (everything between the load and the member:
  mats, the load's underside, the deck, the other framing and the columns, m/N) over
  the member's compliance at the struck point G(a, a) (m/N).

These are the variables of the time history's own idealisation
(:mod:`droprig.solver.pointhistory`: the struck member with its modes, everything
else a massless spring in series with the contact), so the table bounds that time
history point by point. Each value is the largest ratio time history ÷ energy method
found for random members (span 2–15 m, EI 0.2–200 MN·m², μ 10–300 kg/m, drops
0.02–3 m) in that cell and its neighbouring r and κ cells, times a margin for the
time history's convergence (10 %; 15 % moment; 30 % shear), never below 1 —
``scripts/calibrate_amplification.py`` reproduces it and
``tests/solver/test_amplification.py`` re-checks it on random cases not used to make
it. The time history is the verdict's (:mod:`droprig.solver.exacthistory`:
Euler–Bernoulli modes, Blevins 1979 Table 8-1, each phase in closed form, Chopra
4th ed. §10–12; its Newmark reference :mod:`droprig.solver.timehistory`, Chopra
§5.4).

Keying the table on the struck position tightens it where the struck member's own
bending is most of the framing's compliance: without it every point had to take the
factors of the worst position in its cell. Over a girder line or a column the member
whose modes the table describes is not the one that moves, and the chain takes the
envelope over every condition and band there (``droprig.solver.chain.
struck_member_table``). On the demos' light hard items the governing points are such
points, and the bounds stay far above the point's own time history (README, "Dynamic
amplification").

A contact stiffer than the table's least κ (0.001; a rigid load on a bare member,
κ = 0) takes the first column: an Euler–Bernoulli member hit rigidly has no
converged contact force, so there the force and shear factors are an assumption
(stated in the README), while moment and deflection converge.

Continuity (:func:`amplification`). The cells are read between their corners, not
cell by cell (which stepped at every edge while the time history is smooth). Why the
interpolated factor still bounds the time history: at a point inside cell C the
bilinear weights are ≥ 0 and sum to 1 over C's four corners, so the factor is at
least the least of them; each corner takes the largest cell touching it, C among
them, so each corner value is ≥ C's own value, the calibrated bound over C — hence
the factor ≥ the cell value everywhere (on an edge ≥ both cells'), and it bounds the
time history wherever the cell value did. It is at most the largest value of C and
its neighbouring cells (the price of continuity). The outermost nodes lie inside the
outer cells and take the values of the outer cells touching them, so the same holds
there and beyond them. :func:`cell_amplification` keeps the cell-by-cell read as the
reference; ``tests/solver/test_amplification_continuous.py`` checks both.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import impact

__all__ = [
    "B_DEFLECTION",
    "B_ENERGY_DEFLECTION",
    "B_ENERGY_MOMENT",
    "B_MOMENT",
    "B_SHEAR",
    "B_SHEAR_SHORT",
    "CANTILEVER_POSITION_EDGES",
    "COMPLIANCE_RATIO_EDGES",
    "COMPLIANCE_RATIO_NODES",
    "CONDITIONS",
    "KAPPA_MIN",
    "MASS_RATIO_EDGES",
    "MASS_RATIO_MIN",
    "MASS_RATIO_NODES",
    "POSITION_BLEND",
    "POSITION_EDGES",
    "RIGID_BASE_MARGIN",
    "SET_BY",
    "SHORT_PULSE_COMPLIANCE_RATIO",
    "SHORT_PULSE_MASS_RATIO",
    "Amplification",
    "AmplifiedForces",
    "amplification",
    "amplified_forces",
    "cell_amplification",
    "contact_force_bound",
    "crush_depth_bound",
    "interpolate_nodes",
    "member_energy_force",
    "node_envelope",
    "position_band",
    "short_pulse",
]

MASS_RATIO_EDGES: tuple[float, ...] = (0.03, 0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0)
"""Inner edges of the load-mass ÷ struck-mass cells (below 0.03 … above 100)."""
COMPLIANCE_RATIO_EDGES: tuple[float, ...] = (0.003, 0.01, 0.03, 0.1, 0.3, 1.0, 3.0)
"""Inner edges of the contact ÷ member compliance cells (below 0.003 … above 3)."""
KAPPA_MIN = 0.001
"""Least contact ÷ member compliance sampled by the calibration."""
MASS_RATIO_MIN = 0.03
"""Least load ÷ struck mass r at which :func:`amplified_forces` uses the table: its
lowest cell (r < 0.03, calibrated from r = 0.01, ``scripts/calibrate_amplification.py``)
read the time history's shear at 0.34–0.98 × for r = 0.001–0.009 and 0.82 × at
r = 0.012 (a cantilever, κ = 0.002), and a fixed member's moment at 0.84 × for
r = 0.01–0.03 (``scripts/calibrate_short_pulse_shear.py``,
``tests/solver/test_end_shear_short_pulse.py``): below it the bounds alone set the demands."""

CONDITIONS: tuple[str, ...] = ("simple", "fixed", "propped", "cantilever")
"""End conditions of the table (the order of :data:`droprig.solver.loadpath.COND_NAMES`)."""
POSITION_EDGES: tuple[float, ...] = (0.08, 0.25)
"""Inner edges of the struck-position bands ξ = min(a, L − a)/L (near a support,
between, mid-span)."""
CANTILEVER_POSITION_EDGES: tuple[float, ...] = (0.3, 0.6)
"""Inner edges of a cantilever's position bands ξ = a/L from its fixed end."""
POSITION_BLEND = 0.02
"""Width (in ξ, dimensionless) over which a position band's factor fades beyond its
band (:func:`amplification`): the factor runs continuously across a band edge."""


def _table() -> np.ndarray:
    """The calibrated factors as one array [variant, quantity, condition, position
    band, r cell, κ cell] (variant 0: the chain's struck-mass share, 1: η = 1;
    quantities force, moment, shear, deflection)."""
    from droprig.solver.amplification_table import TABLE
    return np.asarray(TABLE, float)


_TABLE = _table()
QUANTITY_INDEX = {"force": 0, "moment": 1, "shear": 2, "deflection": 3}


def position_band(cond_index: ArrayLike, xi: ArrayLike) -> np.ndarray:
    """The position band (0, 1, 2) of a struck point at ξ = a/L (dimensionless) on a
    member of end condition ``cond_index`` (index into :data:`CONDITIONS`): by the
    distance to the nearer support, a cantilever's by the distance from its fixed
    end."""
    ci, xi = np.broadcast_arrays(np.asarray(cond_index, int), np.asarray(xi, float))
    cant = ci == CONDITIONS.index("cantilever")
    d = np.where(cant, xi, np.minimum(xi, 1.0 - xi))
    return np.where(cant, np.searchsorted(CANTILEVER_POSITION_EDGES, d, side="right"),
                    np.searchsorted(POSITION_EDGES, d, side="right"))


@dataclass(frozen=True)
class Amplification:
    """Factors (≥ 1, dimensionless) on the energy method's impact demands: contact
    force, member moment, shear and deflection; the mass ratio r = M/mₑ and the
    compliance ratio κ = f_c/f_s they were read at; ``beyond_table`` where κ is below
    :data:`KAPPA_MIN` (a rigid or near-rigid contact, see the module docstring)."""

    force: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    deflection: np.ndarray
    mass_ratio: np.ndarray
    compliance_ratio: np.ndarray
    beyond_table: np.ndarray


MASS_RATIO_NODES: tuple[float, ...] = (0.01, *MASS_RATIO_EDGES, 300.0)
"""r of the nodes the factors are interpolated between (:func:`amplification`): the
cell edges and one more node half a decade beyond each end (0.01, the least r the
calibration sampled; 300), beyond which the outer cell's own value is held."""
COMPLIANCE_RATIO_NODES: tuple[float, ...] = (KAPPA_MIN, *COMPLIANCE_RATIO_EDGES, 10.0)
"""κ of the interpolation nodes, as :data:`MASS_RATIO_NODES` (0.001, the least κ the
calibration sampled; the edges; 10)."""


def node_envelope(cells: np.ndarray) -> np.ndarray:
    """The upper envelope of cell values at the nodes of the (log r, log κ) grid
    (:data:`MASS_RATIO_NODES` × :data:`COMPLIANCE_RATIO_NODES`): ``cells[..., i, j]``
    holds cell (r cell i, κ cell j) of the 9 × 8 table; the result ``[..., p, q]``
    (10 × 9) holds at each node the largest of the cells touching it — four at an
    inner node (r cells p − 1, p and κ cells q − 1, q), the outer cells alone at the
    outermost nodes (which lie inside them). Dimensionless factors."""
    pad = [(0, 0)] * (cells.ndim - 2) + [(1, 1), (1, 1)]
    c = np.pad(cells, pad, mode="edge")
    c = np.maximum(c[..., :-1, :], c[..., 1:, :])
    return np.maximum(c[..., :-1], c[..., 1:])


_LOG_R_NODES = np.log(np.asarray(MASS_RATIO_NODES, float))
_LOG_K_NODES = np.log(np.asarray(COMPLIANCE_RATIO_NODES, float))


def _bracket(log_nodes: np.ndarray, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Lower node index and weight of the upper node (0–1) of the log-linear
    interpolation at u = log(x), clamped to the end nodes outside them."""
    n = log_nodes.size
    uc = np.clip(u, log_nodes[0], log_nodes[-1])
    i = np.clip(np.searchsorted(log_nodes, uc, side="right") - 1, 0, n - 2)
    t = (uc - log_nodes[i]) / (log_nodes[i + 1] - log_nodes[i])
    return i, np.clip(t, 0.0, 1.0)


_Bracket = tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]


def _brackets(r: np.ndarray, kappa: np.ndarray) -> _Bracket:
    """Lower node indices and upper-node weights (i, s) in r and (j, t) in κ."""
    i, s = _bracket(_LOG_R_NODES, np.log(np.maximum(r, 1e-300)))
    j, t = _bracket(_LOG_K_NODES, np.log(np.maximum(kappa, 1e-300)))
    return i, s, j, t


def _at(nodes: np.ndarray, lead: tuple[ArrayLike, ...], br: _Bracket) -> np.ndarray:
    """:func:`interpolate_nodes` with the brackets worked out (:func:`_brackets`)."""
    i, s, j, t = br
    ix: tuple[np.ndarray, ...] = tuple(np.asarray(v, np.int64) for v in lead)
    v00: np.ndarray = nodes[(*ix, i, j)]
    v10: np.ndarray = nodes[(*ix, i + 1, j)]
    v01: np.ndarray = nodes[(*ix, i, j + 1)]
    v11: np.ndarray = nodes[(*ix, i + 1, j + 1)]
    return (1.0 - s) * (1.0 - t) * v00 + s * (1.0 - t) * v10 + (1.0 - s) * t * v01 \
        + s * t * v11


def _at_q(nodes: np.ndarray, lead: tuple[np.ndarray, ...], br: _Bracket) -> np.ndarray:
    """As :func:`_at` on a node table with the quantity as its last axis
    ``nodes[..., p, q, quantity]``: every quantity at once, [case, quantity]."""
    i, s, j, t = br
    v00: np.ndarray = nodes[(*lead, i, j)]
    v10: np.ndarray = nodes[(*lead, i + 1, j)]
    v01: np.ndarray = nodes[(*lead, i, j + 1)]
    v11: np.ndarray = nodes[(*lead, i + 1, j + 1)]
    s, t = s[:, None], t[:, None]
    return (1.0 - s) * (1.0 - t) * v00 + s * (1.0 - t) * v10 + (1.0 - s) * t * v01 \
        + s * t * v11


def interpolate_nodes(nodes: np.ndarray, lead: tuple[ArrayLike, ...], r: np.ndarray,
                      kappa: np.ndarray) -> np.ndarray:
    """Bilinear interpolation in (log r, log κ) of a node table ``nodes[..., p, q]``
    (:func:`node_envelope`) at r = M/mₑ and κ = f_c/f_s (finite, > 0;
    dimensionless), per case: ``lead`` the indices of the leading axes (arrays
    broadcasting with r), held at the outermost nodes beyond them."""
    return _at(nodes, lead, _brackets(np.asarray(r, float), np.asarray(kappa, float)))


_NODES = node_envelope(_TABLE)  # [variant, quantity, condition, band, r node, κ node]
_ENV_NODES = node_envelope(_TABLE.max(axis=(2, 3)))  # [variant, quantity, r node, κ node]
# the same with the quantity last, for reading every quantity in one index
_NODES_Q = np.ascontiguousarray(np.moveaxis(_NODES, 1, -1))
_ENV_NODES_Q = np.ascontiguousarray(np.moveaxis(_ENV_NODES, 1, -1))


def _band_weights(cond_index: np.ndarray, xi: np.ndarray) -> np.ndarray:
    """Weights (0–1, dimensionless) of the three position bands at ξ, shape
    ξ.shape + (3,): 1 inside a band, falling linearly to 0 over
    :data:`POSITION_BLEND` beyond its edges (band coordinate as
    :func:`position_band`)."""
    cant = cond_index == CONDITIONS.index("cantilever")
    d = np.where(cant, xi, np.minimum(xi, 1.0 - xi))[..., None]
    lo = np.where(cant[..., None], np.array([0.0, *CANTILEVER_POSITION_EDGES]),
                  np.array([0.0, *POSITION_EDGES]))
    hi = np.where(cant[..., None], np.array([*CANTILEVER_POSITION_EDGES, 1.0]),
                  np.array([*POSITION_EDGES, 0.5]))
    dist = np.maximum(np.maximum(lo - d, d - hi), 0.0)
    return np.clip(1.0 - dist / POSITION_BLEND, 0.0, 1.0)


def _condition_index(cond: ArrayLike) -> np.ndarray:
    """Index into :data:`CONDITIONS` of each case's end condition (name or index;
    negative: not known)."""
    cv = np.asarray(cond)
    if cv.dtype.kind in "iu":
        return cv.astype(int)
    names = {n: i for i, n in enumerate(CONDITIONS)}
    return np.vectorize(lambda n: names[str(n)], otypes=[int])(cv) if cv.size else \
        np.zeros(cv.shape, int)


def _own_factors(variant: np.ndarray, cs: np.ndarray, xs: np.ndarray, use: np.ndarray,
                 br: _Bracket) -> np.ndarray:
    """The struck member's own factors [case, quantity] (flat cases; condition index
    ``cs``, position ξ ``xs``): the largest over the position bands of
    1 + w_b·(v_b − 1) (:func:`_band_weights`), worked out where ``use`` (1 elsewhere)."""
    wb = _band_weights(cs, xs)  # [case, band]
    own = np.ones((variant.size, len(QUANTITY_INDEX)))
    for band in range(len(POSITION_EDGES) + 1):
        sel = np.flatnonzero((wb[:, band] > 0.0) & use)
        if sel.size == 0:
            continue
        v = _at_q(_NODES_Q, (variant[sel], cs[sel], np.full(sel.size, band)),
                  (br[0][sel], br[1][sel], br[2][sel], br[3][sel]))
        own[sel] = np.maximum(own[sel], 1.0 + wb[sel, band, None] * (v - 1.0))
    return own


def amplification(M: ArrayLike, m_e: ArrayLike, f_c: ArrayLike, f_s: ArrayLike, *,
                  struck_mass: ArrayLike = True, cond: ArrayLike | None = None,
                  xi: ArrayLike | None = None,
                  own_weight: ArrayLike | None = None) -> Amplification:
    """Amplification factors for a load of mass M (kg) on a member of Rayleigh
    effective mass mₑ = β·μ·L at the struck point (kg, unscaled) and compliance f_s
    = G(a, a) there (m/N) through a contact compliance f_c (m/N); the member's end
    condition ``cond`` (name or index into :data:`CONDITIONS`, per case) and struck
    position ξ = a/L (dimensionless). Vectorised; a demand is max(energy, factor ×
    energy) with the energy method of the calibration (Gere 7th ed. §9.10 Eq. 9-94 on
    f_s + f_c with η = M/(M + mₑ·(f_s/(f_s + f_c))²), the chain's struck-mass rule).

    The factor is continuous in r = M/mₑ and κ = f_c/f_s: the table holds one bound
    per cell (condition, position band (:func:`position_band`), r cell, κ cell), and
    a cell-by-cell read jumped at every cell edge (e.g. a moment factor 2.06 → 3.58
    as r crossed 1) while the time history it bounds is smooth. Each node of the
    (log r, log κ) grid — the cells' corners, at :data:`MASS_RATIO_EDGES` ×
    :data:`COMPLIANCE_RATIO_EDGES` — takes the largest of the (up to four) cells
    touching it (:func:`node_envelope`), and the factor is the bilinear interpolation
    of the node values in (log r, log κ) (:func:`interpolate_nodes`). The outer cells
    (r < 0.03 or > 100, κ < 0.003 or > 3) are unbounded: one more node half a decade
    into each (:data:`MASS_RATIO_NODES`, :data:`COMPLIANCE_RATIO_NODES`) carries the
    outer cells' own values, held beyond it.

    Why it still bounds the time history: module docstring, "Continuity".

    Across the struck position too: the struck member's own factor is the largest
    over the three position bands of 1 + w_b·(v_b − 1), v_b band b's interpolated
    factor and w_b 1 inside band b, falling linearly to 0 over
    :data:`POSITION_BLEND` beyond it — inside a band at least that band's factor,
    continuous across its edges. ``own_weight`` (0–1, per case; default 1) blends
    the member's own factor with the envelope over every condition and band,
    env + w·(own − env): the chain fades from the envelope to the member's own
    table as the member's bending becomes most of the framing's compliance
    (:func:`droprig.solver.chain.own_table_weight`); the envelope is at least the
    member's own factor, so any weight stays at or above it.

    Special cases: mₑ = 0 (no moving mass, r = ∞: the energy method is exact and
    every factor is 1) and f_s = 0 (κ = ∞, the load rests on a rigid point and the
    contact spring alone is loaded — exact). Without ``cond`` and ``xi`` (or where
    ``cond`` is negative) the largest factor over every condition and position band
    is taken (the envelope is taken cell by cell before the nodes').
    ``struck_mass``: whether the energy method took the struck-mass share (per case);
    where it took η = 1 (droprig's rule under mats and crushable layers) the η = 1
    table applies, with the member's mass still giving r. Calibration and sources in
    the module docstring.
    """
    M, m_e, f_c, f_s, sm = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (M, m_e, f_c, f_s)), np.asarray(struck_mass, bool))
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(m_e > 0.0, M / np.where(m_e > 0.0, m_e, 1.0), np.inf)
        kappa = np.where(f_s > 0.0, f_c / np.where(f_s > 0.0, f_s, 1.0), np.inf)
    exact = ~np.isfinite(r) | ~np.isfinite(kappa)
    r_in = np.where(exact, 1.0, r)
    k_in = np.where(exact, 1.0, kappa)
    variant = np.where(sm, 0, 1).ravel()
    shape = M.shape
    br = _brackets(r_in.ravel(), k_in.ravel())
    # [case, quantity]: the envelope over every condition and band
    out = _at_q(_ENV_NODES_Q, (variant,), br)
    if cond is not None and xi is not None:
        ci = np.broadcast_to(_condition_index(cond), shape).ravel()
        known = ci >= 0  # a negative condition: not known here, the envelope
        cs = np.where(known, ci, 0)
        xs = np.broadcast_to(np.clip(np.asarray(xi, float), 0.0, 1.0), shape).ravel()
        w_own = np.broadcast_to(np.clip(np.asarray(
            1.0 if own_weight is None else own_weight, float), 0.0, 1.0), shape).ravel()
        w_own = np.where(known, w_own, 0.0)
        own = _own_factors(variant, cs, xs, w_own > 0.0, br)
        out = out + w_own[:, None] * (own - out)
    out = np.where(exact.ravel()[:, None], 1.0, out)

    def look(q: int) -> np.ndarray:
        return out[:, q].reshape(shape)

    return Amplification(force=look(0), moment=look(1), shear=look(2), deflection=look(3),
                         mass_ratio=r, compliance_ratio=kappa,
                         beyond_table=(kappa < KAPPA_MIN) & ~exact)


def cell_amplification(M: ArrayLike, m_e: ArrayLike, f_c: ArrayLike, f_s: ArrayLike, *,
                       struck_mass: ArrayLike = True, cond: ArrayLike | None = None,
                       xi: ArrayLike | None = None) -> Amplification:
    """The calibrated table read cell by cell (no interpolation): each factor the
    bound of its cell as ``scripts/calibrate_amplification.py`` made it, arguments
    and units as :func:`amplification`. Not used by the verdict (it steps at every
    cell edge); kept as the reference :func:`amplification` never reads below
    (``tests/solver/test_amplification_continuous.py``)."""
    M, m_e, f_c, f_s, sm = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (M, m_e, f_c, f_s)), np.asarray(struck_mass, bool))
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(m_e > 0.0, M / np.where(m_e > 0.0, m_e, 1.0), np.inf)
        kappa = np.where(f_s > 0.0, f_c / np.where(f_s > 0.0, f_s, 1.0), np.inf)
    ir = np.searchsorted(MASS_RATIO_EDGES, r, side="right")
    ik = np.searchsorted(COMPLIANCE_RATIO_EDGES, kappa, side="right")
    exact = ~np.isfinite(r) | ~np.isfinite(kappa)
    variant = np.where(sm, 0, 1)
    env = _TABLE.max(axis=(2, 3))
    if cond is None or xi is None:
        known = np.zeros(M.shape, bool)
        cs = ix = np.zeros(M.shape, int)
    else:
        ci = np.broadcast_to(_condition_index(cond), M.shape)
        known = ci >= 0
        cs = np.where(known, ci, 0)
        ix = np.broadcast_to(position_band(cs, np.clip(np.asarray(xi, float), 0.0, 1.0)),
                             M.shape)

    def look(q: int) -> np.ndarray:
        t = np.where(known, _TABLE[variant, q, cs, ix, ir, ik], env[variant, q, ir, ik])
        return np.where(exact, 1.0, t)

    return Amplification(force=look(0), moment=look(1), shear=look(2), deflection=look(3),
                         mass_ratio=r, compliance_ratio=kappa,
                         beyond_table=(kappa < KAPPA_MIN) & ~exact)


RIGID_BASE_MARGIN = 1.05
"""Margin on :func:`contact_force_bound`: the time history's contact force reached
1.011 × the rigid-base value on the calibration's random members (the member springs
back into the load), so 5 % covers it."""


def contact_force_bound(W: ArrayLike, h: ArrayLike, f_c: ArrayLike) -> np.ndarray:
    """Upper bound of the contact force, N: the load (weight W, N; drop h, m) on its
    contact spring (compliance f_c, m/N) against an immovable point, with the whole
    kinetic energy in the spring (η = 1): RIGID_BASE_MARGIN × W·(1 + √(1 + 2h/(W·f_c)))
    (Gere 7th ed., §9.10, Eq. 9-94); ``inf`` for a rigid contact (f_c = 0). A contact
    force demand may take min(factor × energy, this bound) — both lie above the time
    history."""

    W, h, f_c = np.broadcast_arrays(*(np.asarray(v, float) for v in (W, h, f_c)))
    _, F, _ = impact.impact_elastic(W, h, f_c, 1.0)
    return np.where(f_c > 0.0, RIGID_BASE_MARGIN * F, np.inf)


# --------------------------------------------------------------------------- crushing cap
B_MOMENT = 3.5
"""Largest member moment per unit peak contact force, over the static moment of that
force (the member's dynamic load factor under push-only contact pulses; a step force
gives 2 on one mode, Clough & Penzien 2nd ed. §4-3 / Biggs 1964 Fig. 2.6, from
memory; repeated contacts and higher modes give more): calibrated on the time history
by ``scripts/calibrate_contact_bound.py`` — largest ratio 3.00 over 1,200 random
members (840 with a capped contact; 99th percentile 2.35) × 1.15, rounded up."""
B_SHEAR = 6.1
"""As :data:`B_MOMENT` for the member shear: largest 5.29 (99th percentile 3.62) ×
1.15 (higher modes load the supports of a light member)."""
B_DEFLECTION = 3.55
"""As :data:`B_MOMENT` for the member deflection: largest 3.07 (99th percentile
2.17) × 1.15."""


# --------------------------------------------------------------------------- short pulse
B_SHEAR_SHORT = 2.0
"""Member shear per unit contact-force bound under a short elastic contact pulse
(:func:`short_pulse`), over the static shear of that force: V ≤ B_SHEAR_SHORT ×
V_st(F_rigid), F_rigid the rigid-base bound of :func:`contact_force_bound` (N),
V_st the member's largest static shear under a point force at the struck point
(AISC Manual Table 3-23 via :func:`droprig.solver.beam.max_abs_shear`).

Why a factor on the peak force and not B_SHEAR's: a pulse of one sign no larger than
P drives each mode to at most twice its static response to P while it lasts half
the mode's period or less (the rectangular pulse's dynamic load factor 2, the largest
of any such pulse: Biggs 1964 ch. 2 Fig. 2.6, Clough & Penzien 2nd ed. §5-2 shock
spectra — from memory); modes much slower than the pulse take the impulse
(Clough & Penzien §5-3: q̇ = φ(a)·∫F dt, small against the peak force's static
response), modes much faster follow it quasi-statically. So a short pulse's end shear
scales with its peak force, as a static load does, not with the many rebounds and
long crushing plateaus B_SHEAR (6.1) was calibrated on. 2 is that dynamic load
factor; the time history sets no lower value: its largest shear over V_st(F_rigid)
reached 1.70 with the verdict's settings and 1.80 with 80 modes, cut-off 32 and 16
samples a period (a cantilever) on 288 random members in the short-pulse domain, and
a Timoshenko beam's end reaction 1.41 × the static end shear of its own peak contact
force (shear waves at a finite speed;
``tests/solver/timoshenko_reference.py``) — ``scripts/
calibrate_short_pulse_shear.py``, ``tests/solver/test_end_shear_short_pulse.py``."""
SHORT_PULSE_MASS_RATIO = 1.0
"""Largest r = M/mₑ (load over the member's Rayleigh mass at the struck point) of a
short pulse (:func:`short_pulse`)."""
SHORT_PULSE_COMPLIANCE_RATIO = 0.1
"""Largest κ = f_c/f_s (contact over member compliance) of a short pulse: a contact ten
times stiffer than the member shapes the pulse (:func:`short_pulse`)."""


def short_pulse(mass_ratio: ArrayLike, compliance_ratio: ArrayLike, F_rigid: ArrayLike,
                F_crush: ArrayLike = np.inf) -> np.ndarray:
    """Whether the contact pulse is short against the member's periods and elastic,
    per case (bool): r = M/mₑ ≤ :data:`SHORT_PULSE_MASS_RATIO` and κ = f_c/f_s ≤
    :data:`SHORT_PULSE_COMPLIANCE_RATIO` (dimensionless), and the contact never
    reaches the crushing force, F_rigid ≤ F_crush (N; F_rigid finite: the load on its
    contact spring against an immovable point, :func:`contact_force_bound`).

    The load on its contact spring against an immovable point rebounds after half a
    period, t₀ = π·√(M·f_c) (s; M kg, f_c m/N), and the member's Rayleigh period at
    the struck point is T_R = 2π·√(mₑ·f_s) (s; no longer than its fundamental period:
    Rayleigh's quotient bounds ω₁ from above — Clough & Penzien 2nd ed. §8-5, from
    memory), so t₀/T_R = ½·√(r·κ) ≤ 0.16 here: the pulse is short against the
    member's periods, and a contact ten times stiffer than the member at the point
    sets its shape. Where it holds the member shear is bounded by
    :data:`B_SHEAR_SHORT` × the static shear of F_rigid (:func:`amplified_forces`)."""
    r, k, Fr, Fc = np.broadcast_arrays(*(np.asarray(v, float) for v in (
        mass_ratio, compliance_ratio, F_rigid, F_crush)))
    with np.errstate(invalid="ignore"):
        return ((r <= SHORT_PULSE_MASS_RATIO) & (k <= SHORT_PULSE_COMPLIANCE_RATIO)
                & (k >= 0.0) & np.isfinite(Fr) & (Fr <= Fc))


def crush_depth_bound(W: ArrayLike, h: ArrayLike, f: ArrayLike,
                      F_crush: ArrayLike) -> np.ndarray:
    """Upper bound of the depth crushed under a contact force capped at F_crush (N),
    m: the work of the load's weight W (N) over its fall h (m), the crushing c and
    the static elastic travel F_crush·f (f the series compliance of contact and
    member, m/N) all goes into crushing — F_crush·c ≤ W·(h + c + F_crush·f) (energy
    balance, Gere 7th ed. §9.10 with no energy left in the load) ⇒
    c ≤ 1.05·W·(h + F_crush·f)/(F_crush − W). Checked on the time history
    (tests/solver/test_amplification_capped.py, scripts/calibrate_contact_bound.py):
    without the 1.05 the crushed depth reached 1.002 × the bound (cases where nearly
    all the energy goes into crushing; the time integration's own energy error); the
    5 % covers that. ∞ where F_crush ≤ W, 0 where F_crush is infinite (no
    crushing)."""
    W, h, f, Fc = np.broadcast_arrays(*(np.asarray(v, float) for v in (W, h, f, F_crush)))
    with np.errstate(divide="ignore", invalid="ignore"):
        c = 1.05 * W * (h + Fc * f) / (Fc - W)
    return np.where(~np.isfinite(Fc), 0.0, np.where(Fc > W, c, np.inf))


# --------------------------------------------------------------------------- energy bound
B_ENERGY_MOMENT = 3.95
"""Largest member moment of the time history over the static moment of the member
energy force (:func:`member_energy_force`): 3.40 over 400 random members
(``scripts/calibrate_energy_bound.py``, contacts down to κ = 1e-4, 70 % with a
crushing cap) × 1.15, rounded up. The energy bounds the deflection at the struck
point exactly; the moment it bounds only through the member's mode shapes, hence
the calibration (largest where a very light load strikes stiffly: higher modes)."""
B_ENERGY_DEFLECTION = 1.5
"""As :data:`B_ENERGY_MOMENT` for the member's largest deflection: 1.27 × 1.15,
rounded up (at the struck point the bound is exact, ≤ 1; elsewhere along the member,
the free vibration after the load has left, above it)."""


def member_energy_force(W: ArrayLike, h: ArrayLike, f_s: ArrayLike, f_c: ArrayLike,
                        F_crush: ArrayLike = np.inf, stroke: ArrayLike = np.inf
                        ) -> np.ndarray:
    """The static force at the struck point whose strain energy is the most the drop
    can put into the member, N: F_E = √(2·E/f_s).

    The member (struck-point compliance f_s, m/N) is linear elastic and at rest; the
    load (weight W, N) falls h (m) onto it through a contact spring (compliance f_c,
    m/N), elastic–perfectly plastic at F_crush (N) over ``stroke`` (m). Energy is
    conserved less what crushing dissipates, so at every instant the member's energy
    (strain + kinetic) is at most W·(h + u_max), u_max the load's lowest travel below
    first contact. At that lowest point the load is at rest on the contact and the
    springs hold at least s²/(2f) (f = f_s + f_c, s the elastic travel; two springs in
    series store least for a given total travel) and crushing c took F_crush·c, so
    s²/(2f) − W·s ≤ W·h and (F_crush − W)·c ≤ W·h + W²·f/2, i.e.
    s ≤ W·f·(1 + √(1 + 2h/(W·f))) (Gere 7th ed. §9.10 Eq. 9-94 with η = 1) and
    c ≤ min(stroke, (W·h + W²·f/2)/(F_crush − W)). Of all the member's deflected shapes
    with deflection δ at the struck point the static one under a point force there
    stores least strain energy, δ²/(2·f_s) (minimum potential energy; Timoshenko &
    Gere, *Theory of Elastic Stability*, or any text on energy methods — from
    memory), so δ ≤ F_E·f_s at every instant with E = W·(h + s + c). Vectorised; ∞
    where f_s = 0."""
    W, h, f_s, f_c, Fc, sc = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (W, h, f_s, f_c, F_crush, stroke)))
    f = f_s + f_c
    with np.errstate(divide="ignore", invalid="ignore"):
        s = np.where(f > 0.0, W * f * (1.0 + np.sqrt(1.0 + 2.0 * h / (W * f))), 0.0)
        c = np.where(np.isfinite(Fc) & (Fc > W),
                     (W * h + 0.5 * W**2 * f) / (Fc - W), 0.0)
        c = np.minimum(c, sc)
        F_E = np.where(f_s > 0.0, np.sqrt(2.0 * W * (h + s + c) / f_s), np.inf)
    return F_E


@dataclass(frozen=True)
class AmplifiedForces:
    """The forces (N) at which each family of checks is made, per point: ``local``
    the contact force (web, deck flexure, punching), ``moment``, ``shear`` and
    ``deflection`` the force whose static member response bounds the time history's
    peak member moment, shear and deflection; ``capped`` where the crushing bound
    on the contact force holds (never crushed through its stroke); ``set_by`` per
    quantity ("local", "moment", "shear", "deflection") the index in
    :data:`SET_BY` of the term that set it; ``local_bound`` the least of the upper
    bounds of the contact force alone (N, before the larger of it and F is taken: a
    family reading another force than F — the deck's, with two forces — takes the
    larger of its own force and this)."""

    local: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    deflection: np.ndarray
    capped: np.ndarray
    set_by: dict[str, np.ndarray]
    local_bound: np.ndarray | None = None


SET_BY: tuple[str, ...] = ("energy method", "time-history table", "rigid-base bound",
                           "crushing force", "contact-force bound", "point time history",
                           "member energy bound", "short-pulse shear bound",
                           "impulse bound")
"""What set an amplified force (:attr:`AmplifiedForces.set_by`): the energy method's
own force, the table, the load against an immovable point, the crushing force,
(member quantities) the member's response to the bounded contact force, the
point's own time history (the chain's choice of points,
:func:`droprig.solver.chain.dynamic_amplification`), or (member moment and
deflection) the most energy the drop can put into the member
(:func:`member_energy_force`), or (member shear) the short elastic contact pulse's
bound (:data:`B_SHEAR_SHORT`, :func:`short_pulse`), or the impulse and peak force of
the contact on the struck member's modes (:mod:`droprig.solver.amplification_impulse`,
:func:`droprig.solver.chain._with_impulse_bounds`)."""


def _member_forces(amp: Amplification, F: np.ndarray, F_tab: np.ndarray,
                   local: np.ndarray, F_E: np.ndarray, V_short: np.ndarray,
                   set_by: dict[str, np.ndarray]) -> dict[str, np.ndarray]:
    """Member moment, shear and deflection forces of :func:`amplified_forces` (N): the
    larger of F and the least of the table on F_tab (∞ where the table does not
    apply), B_X × the contact-force bound ``local``, B_E × the member energy force F_E
    (moment, deflection) and the short-pulse shear force ``V_short`` (∞ where the
    pulse is not short); what set each is written into ``set_by``."""
    out = {}
    inf = np.full(F.shape, np.inf)
    for key, A, B, B_E, other, i_other in (
            ("moment", amp.moment, B_MOMENT, B_ENERGY_MOMENT, inf, "member energy bound"),
            ("shear", amp.shear, B_SHEAR, np.inf, V_short, "short-pulse shear bound"),
            ("deflection", amp.deflection, B_DEFLECTION, B_ENERGY_DEFLECTION, inf,
             "member energy bound")):
        with np.errstate(invalid="ignore"):
            tab = A * F_tab
        tab = np.where(np.isfinite(F_tab), tab, np.inf)
        bnd = B * local
        en = np.fmin(B_E * F_E if np.isfinite(B_E) else inf, other)
        i_en = np.where(other < en * (1.0 + 1e-12), SET_BY.index(i_other),
                        SET_BY.index("member energy bound"))
        # fmin: a missing (NaN) energy force drops its term, never the others
        least_m = np.fmin(np.minimum(tab, bnd), en)
        out[key] = np.maximum(F, least_m)
        set_by[key] = np.where(F >= least_m, 0, np.where(
            en < np.minimum(tab, bnd), i_en, np.where(tab <= bnd, 1, 4)))
    return out


def amplified_forces(amp: Amplification, F: ArrayLike, F_ref: ArrayLike,
                     F_rigid: ArrayLike, F_crush: ArrayLike,
                     crush_holds: ArrayLike, bottomed: ArrayLike = False,
                     F_energy: ArrayLike = np.inf) -> AmplifiedForces:
    """The checks' forces, each the larger of the energy method's force F (N, as the
    chain gives it — capped by crushing) and the least of the upper bounds of the
    time history:

    * contact force: min(A_F·F_ref, F_rigid, F_crush) — the table on the energy
      method's elastic force F_ref (N, uncapped, as calibrated; only where
      A_F·F_ref ≤ F_crush, i.e. the contact stays elastic, the tables' calibration,
      and r ≥ :data:`MASS_RATIO_MIN`, the least it was calibrated on),
      the load on its
      contact spring against an immovable point F_rigid (N,
      :func:`contact_force_bound`), and the crushing force F_crush (N) where the
      crushing stays within its stroke (``crush_holds``, from
      :func:`crush_depth_bound`): an elastic–perfectly plastic contact never passes
      more;
    * member moment, shear, deflection: min(A_X·F_ref, B_X·F_local) — the table
      (where the contact stays elastic, as above), or
      the member's largest dynamic response to a contact pulse no larger than the
      contact force bound F_local (:data:`B_MOMENT`, :data:`B_SHEAR`,
      :data:`B_DEFLECTION`, calibrated on the time history with an
      elastic–perfectly plastic contact);
    * member shear also B_VS·F_rigid where the contact pulse is short and elastic
      (:func:`short_pulse` of the table's r and κ; :data:`B_SHEAR_SHORT`): a short
      pulse loads the supports as its peak force does statically, times at most its
      dynamic load factor;
    * member moment and deflection also B_E·F_energy — the member's response to the
      most energy the drop can put into it (F_energy, N, :func:`member_energy_force`;
      :data:`B_ENERGY_MOMENT`, :data:`B_ENERGY_DEFLECTION`): unlike the contact force,
      this does not grow without bound as the contact stiffens (a light hard load's
      contact force is a short spike the member does not follow).

    ``bottomed``: where the energy method crushes through the whole stroke and the
    rest of the energy is taken elastically; the tables then apply to the larger of
    the energy method's own (bottomed) force F and the elastic force F_ref; where
    the crushing may pass its stroke (``crush_holds`` false) they apply to the
    elastic force F_ref with no crushing at all — both checked on the time
    history with a finite stroke (same test).

    Every term is an upper bound of the time history (tests/solver/
    test_amplification_capped.py), so their least is one too. Vectorised, N."""
    F, F_ref, F_rigid, F_crush, F_E, holds, bot = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (F, F_ref, F_rigid, F_crush, F_energy)),
        np.asarray(crush_holds, bool), np.asarray(bottomed, bool))
    # bottomed: the larger of the bottomed force and the elastic one with no crushing
    # (with the position-keyed table the bottomed force alone read a capped time
    # history 5 % low: tests/solver/test_amplification_capped.py)
    F_ref = np.where(bot, np.maximum(F, F_ref), F_ref)
    cap = np.where(holds, F_crush, np.inf)
    # the tables were calibrated on a linear contact: they bound the time history only
    # where their own contact force stays below the crushing force (the contact then
    # never yields and the capped history is the linear one)
    table_ok = bot | ~holds | (amp.force * F_ref <= F_crush)
    # nor below the least mass ratio it was calibrated on (MASS_RATIO_MIN)
    table_ok = table_ok & ~(amp.mass_ratio < MASS_RATIO_MIN)
    terms = np.stack([np.where(table_ok, amp.force * F_ref, np.inf), F_rigid, cap])
    i_loc = np.argmin(terms, axis=0)
    least = np.take_along_axis(terms, i_loc[None], axis=0)[0]
    local = np.maximum(F, least)
    set_by = {"local": np.where(F >= least, 0, i_loc + 1)}
    # a short elastic pulse: the shear from the static shear of the rigid-base bound
    short = short_pulse(amp.mass_ratio, amp.compliance_ratio, F_rigid, F_crush)
    out = _member_forces(amp, F, np.where(table_ok, F_ref, np.inf), local, F_E,
                         np.where(short, B_SHEAR_SHORT * F_rigid, np.inf), set_by)
    return AmplifiedForces(local=local, moment=out["moment"], shear=out["shear"],
                           deflection=out["deflection"],
                           capped=holds & np.isfinite(F_crush), set_by=set_by,
                           local_bound=least)
