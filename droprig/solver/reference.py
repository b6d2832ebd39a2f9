"""The load path of a unit load written plainly, one quantity at a time in the order of
the formulas: the reference the fast point kernel (:func:`droprig.solver.loadpath.evaluate`:
blocks on all cores, per-panel tables, in-place ufuncs) is tested against
(``tests/solver/test_point_kernels.py``, named tolerance) and what the calculation trace
uses (:func:`droprig.solver.trace.trace_point`).

For a unit load at p over the deck panel between members 1 and 2 (SI: m, N, kg):

* lever rule over the one-way deck strip (common practice, no source): t = s/S,
  shares w = (1 − t, t), positions a_k along the members;
* own bending of each deck member, g_k(a_k, a_k) (AISC Manual 15th ed. Table 3-23,
  Roark 7th ed. Table 8.1), end reactions r = (w_1·R_0(a_1), w_1·R_L(a_1),
  w_2·R_0(a_2), w_2·R_L(a_2)) passed to the local nodes, node deflections u = D·r
  (D: node flexibility of the member tree, Maxwell–Betti);
* compliance f = Σ_k w_k² g_k(a_k, a_k) + rᵀ u (internal work of the unit-load system);
* Rayleigh effective mass m_e = Σ_m ∫ μ_m w_m(x)² dx / w_ref², with the exact
  integrals of the member shapes tabulated over ξ = a/L
  (:func:`droprig.solver.loadpath._mass_tables`; Timoshenko, Strength of Materials
  Part I) and w_ref the largest deflection of the path (≥ f).
"""

from __future__ import annotations

import numpy as np

from droprig.model.project import GEOMETRY_TOL
from droprig.solver import beam, loadpath
from droprig.solver.loadpath import Frame, PathResult, by_condition

__all__ = ["path_reference"]


def path_reference(frame: Frame, x: np.ndarray, y: np.ndarray, *,
                   with_mass: bool = True) -> PathResult:
    """:class:`~droprig.solver.loadpath.PathResult` of a unit load at each point (x, y),
    by the formulas of the module docstring. Points off every deck panel get the fill
    values of :func:`droprig.solver.loadpath.evaluate` (``pair`` −1, NaN compliance
    and mass); without ``with_mass`` the mass and ``w_ref`` are NaN."""
    x = np.atleast_1d(np.asarray(x, float))
    y = np.atleast_1d(np.asarray(y, float))
    n = x.size
    # the deck panel of each point (cells of the panel grid; the last break closed)
    pair = np.full(n, -1, dtype=np.int64)
    u, v = (y, x) if frame.deck_axis == "x" else (x, y)
    ub, vb = frame.u_breaks, frame.v_breaks
    iu = np.searchsorted(ub, u, side="right") - 1
    iv = np.searchsorted(vb, v, side="right") - 1
    iu = np.where(np.abs(u - ub[-1]) <= GEOMETRY_TOL, ub.size - 2, iu)
    iv = np.where(np.abs(v - vb[-1]) <= GEOMETRY_TOL, vb.size - 2, iv)
    inside = (iu >= 0) & (iu < ub.size - 1) & (iv >= 0) & (iv < vb.size - 1)
    pair[inside] = frame.cell_pair[iu[inside], iv[inside]]
    s = pair >= 0
    p, u, v = pair[s], u[s], v[s]
    # lever rule over the strip
    mem = frame.pair_members.T[:, p]
    c0 = frame.pair_c[p, 0]
    span = frame.pair_c[p, 1] - c0
    pos = np.clip(u - c0, 0.0, span)
    t = pos / span
    share = np.stack([1.0 - t, t])
    L = frame.L[mem]
    a = np.clip((v - frame.vs[mem]) * frame.vdir[mem], 0.0, L)
    cond = frame.cond[mem]
    EI = frame.EI[mem]
    # own bending, end reactions, node deflections
    g = by_condition(beam.green, cond, L, EI, a, a)
    R0, RL = by_condition(beam.unit_reactions, cond, L, a)
    r = np.stack([share[0] * R0[0], share[0] * RL[0], share[1] * R0[1], share[1] * RL[1]])
    D = frame.pair_D16[:, p]
    un = np.stack([D[4 * i] * r[0] + D[4 * i + 1] * r[1] + D[4 * i + 2] * r[2]
                   + D[4 * i + 3] * r[3] for i in range(4)])
    # compliance
    gs = share * g
    f = share[0] * gs[0] + share[1] * gs[1] + (r * un).sum(axis=0)
    out = {
        "members": (mem.T, -1), "share": (share.T, 0.0), "a": (a.T, 0.0),
        "strip_span": (span, np.nan), "strip_pos": (pos, np.nan), "r": (r.T, 0.0),
        "u": (un.T, 0.0), "f": (f, np.nan), "g_own": (gs.T, 0.0),
    }
    if with_mass:
        m_e, w_ref = _rayleigh_mass(frame, p, mem, share, a, L, EI, cond, r, un, f)
    else:
        m_e = w_ref = np.full(f.shape, np.nan)
    out["m_e"] = (m_e, np.nan)
    out["w_ref"] = (w_ref, np.nan)
    full: dict[str, np.ndarray] = {}
    for k, (val, fill) in out.items():
        arr = np.full((n, *val.shape[1:]), fill, dtype=val.dtype)
        arr[s] = val
        full[k] = arr
    return PathResult(pair=pair, **full)


def _rayleigh_mass(frame: Frame, p: np.ndarray, mem: np.ndarray, share: np.ndarray,
                   a: np.ndarray, L: np.ndarray, EI: np.ndarray, cond: np.ndarray,
                   r: np.ndarray, un: np.ndarray, f: np.ndarray,
                   ) -> tuple[np.ndarray, np.ndarray]:
    """Rayleigh mass m_e (kg) and the reference deflection w_ref (m/N) of the path:
    kinetic energy of the deck members (own bending and end movements) and of the
    support members (quadratic form in r), over w_ref²."""
    I_gg, J0, J1, Gmax = by_condition(loadpath._mass_tables, cond, a / L)
    L3EI = L**3 / EI
    I_gg = I_gg * (L * L3EI**2)
    J0 = J0 * (L * L3EI)
    J1 = J1 * (L * L3EI)
    mu = frame.mu[mem]
    ue0, ue1 = un[0::2], un[1::2]
    NR = frame.N_R16[:, mem]
    kin = (mu * (share * share * I_gg + 2.0 * share * (ue0 * J0 + ue1 * J1))
           + ue0 * ue0 * NR[0] + 2.0 * ue0 * ue1 * NR[1] + ue1 * ue1 * NR[3]).sum(axis=0)
    M = frame.pair_M16[:, p]
    for i in range(4):
        kin = kin + r[i] * (M[4 * i] * r[0] + M[4 * i + 1] * r[1] + M[4 * i + 2] * r[2]
                            + M[4 * i + 3] * r[3])
    w_deck = share * Gmax * L3EI + np.maximum(np.abs(ue0), np.abs(ue1))
    w_sup = (frame.pair_wmax[:, p] * r).sum(axis=0)
    w_ref = np.maximum(np.maximum(f, w_sup), np.maximum(w_deck[0], w_deck[1]))
    with np.errstate(divide="ignore", invalid="ignore"):
        m_e = np.where(w_ref > 0.0, kin / np.where(w_ref > 0.0, w_ref, 1.0) ** 2, 0.0)
    return m_e, w_ref
