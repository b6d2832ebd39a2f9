"""Inverse answers of the elastic energy method: how high, how heavy, what mat.

``F_allow`` is the peak impact force (N) at the struck point that brings the
governing check to a utilisation of exactly 1 (after the existing load's share is
taken off). Every function inverts the forward model of
:mod:`droprig.solver.impact` (Gere, *Mechanics of Materials* 7th ed., §9.10,
Eq. 9-94 with the struck-mass share η) in closed form. Vectorised; SI units.
``nan`` means "none exists"; ``inf`` means "unlimited".
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import G, crush_depth

__all__ = [
    "allowable_drop_height_elastic",
    "allowable_mass",
    "allowable_mass_crushable",
    "required_crush_stroke",
    "required_mat_stiffness",
]


def _b(*vals: ArrayLike) -> list[np.ndarray]:
    return list(np.broadcast_arrays(*(np.asarray(v, float) for v in vals)))


def allowable_drop_height_elastic(W: ArrayLike, F_allow: ArrayLike, delta_st: ArrayLike,
                                  eta: ArrayLike = 1.0) -> np.ndarray:
    """Largest free fall h (m) with a peak force ≤ F_allow.

    K_a = F_allow/W; h = δst·((K_a − 1)² − 1)/(2η) — Gere §9.10 Eq. 9-94 solved for
    h. nan when K_a < 2 (even a load set down suddenly exceeds F_allow); a rigid
    struck point (δst = 0) gives h = 0. W, F_allow in N; δst in m.
    """
    W, F, d, eta = _b(W, F_allow, delta_st, eta)
    with np.errstate(divide="ignore", invalid="ignore"):
        Ka = F / W
        h = d * ((Ka - 1.0) ** 2 - 1.0) / (2.0 * eta)
    return np.where((Ka >= 2.0) & np.isfinite(h), np.maximum(h, 0.0), np.nan)


def allowable_mass(F_allow: ArrayLike, h: ArrayLike, f: ArrayLike,
                   m_e: ArrayLike = 0.0, g: float = G) -> np.ndarray:
    """Largest dropped mass M (kg) from height h (m) with a peak force ≤ F_allow (N).

    Forward model (Gere §9.10 with η = M/(M + m_e), δst = M·g·f):
    F = M·g·(1 + √(1 + 2h/(g·f·(M + m_e)))), increasing in M. With A = F_allow/g and
    c = 2h/(g·f), F = F_allow rearranges to the quadratic
    (2A + c)·M² − (A² − 2A·m_e)·M − A²·m_e = 0, whose positive root is returned
    (derived). h = 0 gives M = F_allow/(2g). f: compliance of the struck point
    (m/N, > 0); m_e: struck effective mass, kg. nan where F_allow ≤ 0.
    """
    F, h, f, m_e = _b(F_allow, h, f, m_e)
    A = F / g
    with np.errstate(divide="ignore", invalid="ignore"):
        c = np.where(h > 0.0, 2.0 * h / (g * f), 0.0)
        p = 2.0 * A + c
        q = A**2 - 2.0 * A * m_e
        M = (q + np.sqrt(q**2 + 4.0 * p * A**2 * m_e)) / (2.0 * p)
    return np.where((F > 0.0) & np.isfinite(M), M, np.nan)


def allowable_mass_crushable(F_allow: ArrayLike, h: ArrayLike, f_s: ArrayLike,
                             F_c: ArrayLike, s_c: ArrayLike, g: float = G) -> np.ndarray:
    """Largest mass M (kg) dropped h (m) onto a crushable layer (crush force F_c, N;
    stroke s_c, m) over a structure of compliance f_s (m/N) with a peak force ≤
    F_allow (N); η = 1 under the layer.

    Inverts :func:`droprig.solver.impact.impact_crushable` (energy balance, Gere
    §9.10 with a constant-force layer; Engineering ToolBox "Impact Force"). The peak
    force grows with M. Where F_c > F_allow the layer never crushes below F_allow and
    the elastic answer :func:`allowable_mass` (m_e = 0) holds. Where F_c ≤ F_allow
    the peak reaches F_allow only after the layer bottoms out:
    F_allow = W + √(W² + 2(Wh − (F_c − W)s_c)/f_s) solved for W gives
    W = (F_allow²·f_s + 2F_c·s_c) / (2(F_allow·f_s + h + s_c)) (derived), M = W/g.
    nan where F_allow ≤ 0.
    """
    F, h, f, Fc, sc = _b(F_allow, h, f_s, F_c, s_c)
    elastic = allowable_mass(F, h, f, 0.0, g)
    with np.errstate(divide="ignore", invalid="ignore"):
        W = (F**2 * f + 2.0 * Fc * sc) / (2.0 * (F * f + h + sc))
    M = np.where(Fc <= F, W / g, elastic)
    return np.where((F > 0.0) & np.isfinite(M), M, np.nan)


def required_mat_stiffness(W: ArrayLike, h: ArrayLike, eta: ArrayLike, F_allow: ArrayLike,
                           f_structure: ArrayLike) -> np.ndarray:
    """Stiffness k (N/m) of a spring mat, in series with the structure, that brings
    the peak force down to F_allow; any softer mat also works.

    Series springs: f = f_structure + 1/k (Engineering ToolBox, "Impact Force";
    any mechanics text). Required total compliance from Gere §9.10 solved for δst:
    δst = 2ηh/((K_a − 1)² − 1), f = δst/W, K_a = F_allow/W, so
    k = 1/(f − f_structure). inf where the bare structure already suffices; nan where
    no mat can help (F_allow < 2W: a load set down suddenly still exceeds);
    0 at exactly K_a = 2 with h > 0. W, F_allow in N; h in m; f_structure in m/N.
    """
    W, h, eta, F, fs = _b(W, h, eta, F_allow, f_structure)
    Ka = F / W
    den = (Ka - 1.0) ** 2 - 1.0
    with np.errstate(divide="ignore", invalid="ignore"):
        f_req = 2.0 * eta * h / (den * W)
        k = 1.0 / (f_req - fs)
    k = np.where(f_req <= fs, np.inf, k)
    k = np.where(den <= 0.0, np.where(h * eta > 0.0, 0.0, np.inf), k)
    return np.where(Ka < 2.0, np.nan, k)


def required_crush_stroke(W: ArrayLike, h: ArrayLike, eta: ArrayLike, F_allow: ArrayLike,
                          f_structure: ArrayLike) -> np.ndarray:
    """Stroke (m) of a crushable layer whose crush force is F_allow that arrests the
    load without bottoming out.

    Energy balance (see :func:`droprig.solver.impact.crush_depth`):
    c = (ηWh + W·F_c·f_s − F_c²·f_s/2)/(F_c − W) with F_c = F_allow; 0 where no
    crushing is needed (elastic peak ≤ F_allow); nan where F_allow ≤ W (the layer
    can never stop the load). With f_s → 0 it is the stopping distance of the
    Engineering ToolBox "Impact Force" page with a net force F_c − W. N, m, m/N.
    """
    W, h, eta, F, fs = _b(W, h, eta, F_allow, f_structure)
    c = crush_depth(W, h, fs, eta, F)
    return np.where(F <= W, np.nan, c)
