"""The end connection of a struck member as a spring: its stiffness by the component
method and the most force it can carry under a drop (issue 12, the end-shear spike).

A member's time history with rigid ends (:mod:`droprig.solver.exacthistory`) carries a
light hard item's contact pulse to its supports as a shear wave, which a rigid end
reflects and doubles: a sub-millisecond end-shear spike. A real end connection (bolts
in shear and bearing, the plates, the member behind it) is a spring; a pulse shorter
than its time constant passes it only in part. This module holds:

* :func:`bolt_shear_stiffness`, :func:`bolt_bearing_stiffness`,
  :func:`series_stiffness` — EN 1993-1-8:2005 §6.3.2, Table 6.11, rows 11 and 12
  (the stiffness coefficients of bolts in shear and in bearing, non-preloaded;
  preloaded, slip-resistant bolts are rigid there, k = ∞), components in series
  (§6.3.1); from memory — the search found the standard's resistance tables, not
  this table's text: the engineer confirms against the standard;
* :func:`default_connection_stiffness` — the stated default per member: a bearing-type
  bolted shear connection holding the most bolts its web takes, the other components
  left out (they add compliance: the estimate is on the stiff side);
* :func:`connection_force_bound` — the most force a connection spring can carry,
  √(2·k·E), with E the most energy the drop can put into the structure (energy
  conservation; :func:`droprig.solver.amplification.member_energy_force`'s E);
* :func:`shear_impedance` — Z = √(κGA·ρA) of the member's shear waves: a connection
  of stiffness k passes a pulse much shorter than Z/k only as its impulse times k/Z
  (the member's end as a shear line on a spring, Z·u̇ + k·u = 2·f_in), slower ones
  whole — which pulses a connection softens.

SI units: N, m, kg, s, Pa.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

__all__ = [
    "BOLT_DIAMETER",
    "BOLT_F_UB",
    "D_M16",
    "EDGE_DISTANCE",
    "E_STEEL",
    "K_B_MAX",
    "K_T_MAX",
    "PITCH",
    "bolt_bearing_stiffness",
    "bolt_shear_stiffness",
    "bolts_in_web",
    "connection_force_bound",
    "default_connection_stiffness",
    "series_stiffness",
    "shear_impedance",
]

E_STEEL = 210e9
"""Young's modulus of structural steel, Pa (EN 1993-1-1 §3.2.6)."""
D_M16 = 0.016
"""The nominal diameter of an M16 bolt, m: Table 6.11's reference diameter d_M16."""
K_B_MAX = 1.25
"""Table 6.11 (notes): k_b = min(k_b1, k_b2) ≤ 1.25 (the spacing factor of bearing);
the default takes the cap: the stiffest bearing the table allows."""
K_T_MAX = 2.5
"""Table 6.11 (notes): k_t = 1.5·t_j/d_M16 ≤ 2.5 (the thickness factor of bearing)."""
BOLT_DIAMETER = 0.020
"""Default bolt: M20 (m), the common bolt of simple shear connections (common
practice, no source)."""
BOLT_F_UB = 800e6
"""Default bolt grade 8.8: f_ub = 800 MPa (EN 1993-1-8 Table 3.1)."""
PITCH = 0.0484
"""The least pitch p₁ = 2.2·d₀ of M20 bolts in 22 mm holes, m (EN 1993-1-8 Table 3.3):
the most bolts a web holds."""
EDGE_DISTANCE = 0.0264
"""The least end distance e₁ = 1.2·d₀ of M20 bolts in 22 mm holes, m (Table 3.3)."""


def _positive(name: str, value: ArrayLike, unit: str, *, allow_inf: bool = False
              ) -> np.ndarray:
    """``value`` as a float array, every entry > 0 (and finite unless ``allow_inf``);
    ValueError naming the field and the allowed range otherwise."""
    v = np.asarray(value, float)
    ok = (v > 0.0) & (np.isfinite(v) | (allow_inf & (v == np.inf)))
    if not np.all(ok):
        bad = v[~ok].flat[0]
        rng = "> 0" + ("" if allow_inf else " and finite")
        raise ValueError(f"{name}: {bad!r} {unit} is not allowed; it must be {rng} {unit}")
    return v


def bolt_shear_stiffness(n_b: ArrayLike, d: ArrayLike, f_ub: ArrayLike,
                         planes: ArrayLike = 1) -> np.ndarray:
    """Stiffness of n_b non-preloaded bolts in shear, N/m: E·k₁₁ per shear plane,
    k₁₁ = 16·n_b·d²·f_ub/(E·d_M16) (m) — EN 1993-1-8:2005 Table 6.11 row 11, from
    memory; d (m) the bolt's diameter, f_ub (Pa) its ultimate strength, ``planes``
    the shear planes (each a spring in parallel). E cancels: 16·n_b·d²·f_ub/d_M16."""
    n = _positive("n_b (bolts)", n_b, "")
    dd = _positive("d (bolt diameter)", d, "m")
    fu = _positive("f_ub (bolt ultimate strength)", f_ub, "Pa")
    p = _positive("planes (shear planes)", planes, "")
    return 16.0 * n * dd**2 * fu / D_M16 * p


def bolt_bearing_stiffness(n_b: ArrayLike, d: ArrayLike, f_u: ArrayLike, t: ArrayLike,
                           k_b: ArrayLike = K_B_MAX) -> np.ndarray:
    """Stiffness of n_b bolts bearing on a plate of thickness t (m) and ultimate
    strength f_u (Pa), N/m: E·k₁₂, k₁₂ = 24·n_b·k_b·k_t·d·f_u/E (m), k_t =
    1.5·t/d_M16 ≤ 2.5, k_b ≤ 1.25 — EN 1993-1-8:2005 Table 6.11 row 12, from memory.
    E cancels: 24·n_b·k_b·k_t·d·f_u."""
    n = _positive("n_b (bolts)", n_b, "")
    dd = _positive("d (bolt diameter)", d, "m")
    fu = _positive("f_u (plate ultimate strength)", f_u, "Pa")
    tt = _positive("t (plate thickness)", t, "m")
    kb = np.minimum(_positive("k_b (bearing spacing factor)", k_b, ""), K_B_MAX)
    k_t = np.minimum(1.5 * tt / D_M16, K_T_MAX)
    return 24.0 * n * kb * k_t * dd * fu


def series_stiffness(*k: ArrayLike) -> np.ndarray:
    """Components in series (EN 1993-1-8 §6.3.1: 1/k = Σ 1/kᵢ), N/m; ∞ for a rigid
    component (it adds nothing)."""
    if not k:
        raise ValueError("series_stiffness: no component given")
    comps = [_positive(f"component {i + 1} stiffness", v, "N/m", allow_inf=True)
             for i, v in enumerate(k)]
    flex = sum(np.where(np.isinf(c), 0.0, 1.0 / np.where(np.isinf(c), 1.0, c))
               for c in comps)
    with np.errstate(divide="ignore"):
        return np.where(flex > 0.0, 1.0 / np.where(flex > 0.0, flex, 1.0), np.inf)


def bolts_in_web(d: ArrayLike, tf: ArrayLike, r: ArrayLike = 0.0) -> np.ndarray:
    """The most M20 bolts in one vertical line that the web's clear depth
    h = d − 2(t_f + r) holds at the least pitch and end distances (EN 1993-1-8 Table
    3.3: :data:`PITCH`, :data:`EDGE_DISTANCE`), at least 1: 1 + ⌊(h − 2e₁)/p₁⌋."""
    dd, tt, rr = np.broadcast_arrays(*(np.asarray(v, float) for v in (d, tf, r)))
    h = dd - 2.0 * (tt + rr)
    return np.maximum(1.0 + np.floor((h - 2.0 * EDGE_DISTANCE) / PITCH), 1.0)


def default_connection_stiffness(d: ArrayLike, tf: ArrayLike, tw: ArrayLike,
                                 f_u: ArrayLike, r: ArrayLike = 0.0) -> np.ndarray:
    """The stated default stiffness of a member's end connection, N/m: a bearing-type
    (non-preloaded) bolted shear connection of the most M20 8.8 bolts one line in the
    web holds (:func:`bolts_in_web`), in double shear (two cleats: the stiffer of the
    common simple connections), bearing on the member's own web (t_w, f_u; k_b at its
    cap 1.25), in series (EN 1993-1-8 Table 6.11 rows 11 and 12).

    On the stiff side for a bearing-type connection (the more force a connection
    passes, the stiffer it is): the most bolts, the caps of k_b, two shear planes, and
    the cleats' or plate's own bearing and bending, the welds and the member or column
    behind the connection left out (each adds compliance). Not for preloaded
    (slip-resistant) bolts or welded ends: the standard takes those as rigid (k = ∞);
    nor for a member continuous over its support. Section depth d, flange t_f, web
    t_w, root r in m; f_u the web's ultimate strength in Pa."""
    n = bolts_in_web(d, tf, r)
    k11 = bolt_shear_stiffness(n, BOLT_DIAMETER, BOLT_F_UB, 2)
    k12 = bolt_bearing_stiffness(n, BOLT_DIAMETER, f_u, tw)
    return series_stiffness(k11, k12)


def connection_force_bound(k_conn: ArrayLike, energy: ArrayLike) -> np.ndarray:
    """The most force an end connection of stiffness k (N/m) can carry beyond the
    load's and the structure's weight at rest, N: √(2·k·E).

    The structure is linear elastic about its state at rest, the drop puts at most E
    (J) into it (energy conservation less what crushing dissipates:
    :func:`droprig.solver.amplification.member_energy_force`, E = W·(h + s + c)), and
    every spring of it stores ½·k·u² ≥ 0 of that energy at every instant, so
    ½·k·u² ≤ E and the spring's force k·u ≤ √(2·k·E) — whatever the contact's
    stiffness and the pulse's length (Gere 7th ed. §9.10's energy balance, applied to
    one spring). ∞ for a rigid connection."""
    k = _positive("k_conn (connection stiffness)", k_conn, "N/m", allow_inf=True)
    E = np.asarray(energy, float)
    if np.any(~(E >= 0.0)):
        raise ValueError("energy: the drop's energy must be ≥ 0 J (and not NaN)")
    with np.errstate(invalid="ignore"):
        return np.where(np.isinf(k), np.inf, np.sqrt(2.0 * np.where(np.isinf(k), 0.0, k) * E))


def shear_impedance(kGA: ArrayLike, mu: ArrayLike) -> np.ndarray:
    """Impedance of a member's shear waves, N·s/m: Z = √(κGA·ρA) — the force per unit
    transverse velocity of a shear wave travelling at c_s = √(κGA/ρA) (the
    Timoshenko beam's high-frequency shear branch; Graff, *Wave Motion in Elastic
    Solids* §3.4, from memory). κGA in N, ρA = ``mu`` in kg/m."""
    return np.sqrt(_positive("kGA (web shear stiffness)", kGA, "N")
                   * _positive("mu (mass per length)", mu, "kg/m"))

