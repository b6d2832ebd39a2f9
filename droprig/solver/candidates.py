"""Load-independent tables of the check candidates of a prepared floor: the flexure
and shear rows of the support members of each deck panel as linear combinations of
the panel's local reactions (AISC Manual Table 3-23 by superposition), with the
existing demand over resistance, and the moment stations that can never govern.

SI units (N, N·m, m)."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from droprig.solver.loadpath import Frame

__all__ = ["CandidateTables", "candidate_tables"]


@dataclass(frozen=True, eq=False)
class CandidateTables:
    """Load-independent tables of the check candidates of a prepared floor.

    Support members of each panel (``P`` per panel, ``S`` moment stations each):
    flexure rows (support p, station s) and shear rows (p, end e), each a linear
    combination of the four local reactions r_i of the panel's deck members
    (``m_coef``: per support (4, stations kept, panels); ``v_coef`` (P, 4, 2, panels);
    zero for a panel with fewer supports; ``m_terms``/``v_terms``: per support, the
    reactions that ever enter), existing demand over resistance (``m_Et``: per support
    (stations kept, panels); ``v_Et`` (P·2, panels)) and resistance per support
    (``m_R``/``v_R``, (P, panels)); ``member``/``valid`` (P, panels). ``m_keep``: per
    support, the stations kept — a station whose demand can never exceed another's
    is left out (:func:`_dominated_stations`). Deck members: existing end shear over
    shear resistance ``V_Et`` (2, members).
    """

    P: int
    S: int
    m_coef: tuple[np.ndarray, ...]
    m_terms: tuple[tuple[int, ...], ...]
    m_Et: tuple[np.ndarray, ...]
    m_R: np.ndarray
    v_coef: np.ndarray
    v_terms: tuple[tuple[int, ...], ...]
    v_Et: np.ndarray
    v_R: np.ndarray
    member: np.ndarray
    valid: np.ndarray
    V_Et: np.ndarray
    m_keep: tuple[np.ndarray, ...] = ()


def _dominated_stations(coef: np.ndarray, Et: np.ndarray) -> np.ndarray:
    """Stations of one support member that never govern, (S,) bool.

    The local reactions r_i of a panel are never negative (a downward load between
    the supports of a deck member; AISC Manual Table 3-23), so where station s'
    has coefficients c'_i ≥ |c_i| of station s for every reaction and every panel and
    an existing demand E' ≥ |E|, then |F·Σc_i·r_i + E| ≤ F·Σc'_i·r_i + E' for every
    F ≥ 0: s never has the larger utilisation nor the smaller allowed force (the
    same holds for the rounded values: rounding is monotonic). Of two stations that
    dominate each other the first is kept. ``coef`` (4, S, panels), ``Et`` (S,
    panels)."""
    S = coef.shape[1]
    out = np.zeros(S, dtype=bool)

    def dom(s2: int, s: int) -> bool:
        return bool(np.all(coef[:, s2, :] >= np.abs(coef[:, s, :]))
                    and np.all(Et[s2] >= np.abs(Et[s])))

    for s in range(S):
        out[s] = any(s2 != s and dom(s2, s) and (s2 < s or not dom(s, s2))
                     for s2 in range(S))
    return out


def candidate_tables(frame: Frame, Mr: np.ndarray, Vr: np.ndarray, V0: np.ndarray,
                     M0_sup: np.ndarray) -> CandidateTables:
    """:class:`CandidateTables` of a frame with its resistances and existing actions."""
    sup = frame.pair_sup_member
    n_p, P = sup.shape
    S = frame.pair_sup_mcoef.shape[2]
    supm = np.maximum(sup, 0)
    valid = sup >= 0
    vf = valid.astype(float)
    mc = frame.pair_sup_mcoef * vf[:, :, None, None]  # (panels, P, S, 4)
    vc = frame.pair_sup_rcoef * vf[:, :, None, None]  # (panels, P, 2, 4)

    def terms(c: np.ndarray) -> tuple[tuple[int, ...], ...]:
        return tuple(tuple(i for i in range(4) if np.any(c[:, p, :, i] != 0.0))
                     for p in range(P))

    with np.errstate(divide="ignore", invalid="ignore"):
        m_Et = (M0_sup * vf[:, :, None]) / Mr[supm][:, :, None]
        v_Et = (V0[supm] * vf[:, :, None]) / Vr[supm][:, :, None]
        V_Et = (V0 / Vr[:, None]).T
    coef_all = np.ascontiguousarray(mc.transpose(1, 3, 2, 0))  # (P, 4, S, panels)
    Et_all = np.ascontiguousarray(m_Et.transpose(1, 2, 0))  # (P, S, panels)
    keep = tuple(np.flatnonzero(~_dominated_stations(coef_all[p], Et_all[p]))
                 for p in range(P))
    return CandidateTables(
        P=P, S=S, m_keep=keep,
        m_coef=tuple(np.ascontiguousarray(coef_all[p][:, k]) for p, k in enumerate(keep)),
        m_terms=terms(mc),
        m_Et=tuple(np.ascontiguousarray(Et_all[p][k]) for p, k in enumerate(keep)),
        m_R=np.ascontiguousarray(Mr[supm].T),
        v_coef=np.ascontiguousarray(vc.transpose(1, 3, 2, 0)),
        v_terms=terms(vc), v_Et=np.ascontiguousarray(v_Et.transpose(1, 2, 0)).reshape(
            P * 2, n_p),
        v_R=np.ascontiguousarray(Vr[supm].T), member=np.ascontiguousarray(supm.T),
        valid=np.ascontiguousarray(valid.T), V_Et=np.ascontiguousarray(V_Et))


