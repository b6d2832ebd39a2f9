"""Response beyond yield: elastic–perfectly-plastic energy balance of the struck path.

The struck path is idealised as a spring with resistance R(δ) = δ/f up to the
plastic collapse resistance R_p (yield deflection δy = R_p·f) and R_p beyond.
Energy balance at the maximum deflection δm (Biggs, *Introduction to Structural
Dynamics*, 1964, ch. 2; UFC 3-340-02 ch. 3 — both from memory):

    R_p·(δm − δy/2) = η·W·h + W·δm.

Vectorised over drop points; SI units (N, m, rad).
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import impact_elastic

__all__ = ["allowable_height_plastic", "plastic_response", "support_rotation"]


def plastic_response(W: ArrayLike, h: ArrayLike, eta: ArrayLike, R_p: ArrayLike,
                     delta_y: ArrayLike) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Peak deflection δm (m), ductility μ = δm/δy and collapse flag of a load W (N)
    falling h (m) onto an elastic–perfectly-plastic path (R_p in N, δy in m).

    If the elastic peak K·W (K from Gere §9.10 with f = δy/R_p) stays ≤ R_p the
    response is elastic: δm = K·W·δy/R_p, μ ≤ 1. Otherwise
    δm = (η·W·h + R_p·δy/2)/(R_p − W) (Biggs 1964; UFC 3-340-02 ch. 3, from memory).
    R_p ≤ W: the path cannot hold the load even statically — collapse (δm = μ = inf).
    """
    W, h, eta, R_p, d_y = np.broadcast_arrays(*(np.asarray(v, float)
                                                for v in (W, h, eta, R_p, delta_y)))
    collapsed = R_p <= W
    with np.errstate(divide="ignore", invalid="ignore"):
        f = np.where(R_p > 0.0, d_y / np.where(R_p > 0.0, R_p, 1.0), 0.0)
        _, F_el, d_el = impact_elastic(W, h, f, eta)
        d_pl = (eta * W * h + 0.5 * R_p * d_y) / (R_p - W)
    d_m = np.where(collapsed, np.inf, np.where(F_el <= R_p, d_el, d_pl))
    with np.errstate(divide="ignore", invalid="ignore"):
        mu = np.where(collapsed, np.inf, d_m / np.where(d_y > 0.0, d_y, 1.0))
    mu = np.where((d_y <= 0.0) & ~collapsed, np.inf, mu)
    return d_m, mu, collapsed


def support_rotation(delta_m: ArrayLike, L: ArrayLike, a: ArrayLike,
                     cond: str = "simple") -> np.ndarray:
    """Support rotation of the plastic mechanism, rad.

    Hinge under the load, rigid segments: θ = atan(δm / min(a, L − a)), which at
    midspan is the published θ = atan(2δm/L) (Biggs 1964; UFC 3-340-02 ch. 3, from
    memory). Cantilever (fixed at x = 0): the whole arm turns about the root,
    θ = atan(δm/a). δm, L, a in m.
    """
    d, L, a = np.broadcast_arrays(*(np.asarray(v, float) for v in (delta_m, L, a)))
    arm = a if cond == "cantilever" else np.minimum(a, L - a)
    with np.errstate(divide="ignore", invalid="ignore"):
        theta = np.arctan(d / arm)
    return np.where(arm > 0.0, theta, np.where(d > 0.0, np.pi / 2.0, 0.0))


def allowable_height_plastic(W: ArrayLike, eta: ArrayLike, R_p: ArrayLike,
                             delta_y: ArrayLike, mu_limit: ArrayLike) -> np.ndarray:
    """Largest free fall (m) keeping the ductility at or below ``mu_limit``.

    Energy balance at δm = μ·δy: η·W·h = R_p·δy·(μ − ½) − W·μ·δy ⇒
    h = δy·(R_p(μ − ½) − W·μ)/(η·W) (Biggs 1964; UFC 3-340-02 ch. 3, from memory;
    references give it with η = 1). nan where no height works (R_p ≤ W, or even a
    load placed gently exceeds the limit). W, R_p in N; δy in m.
    """
    W, eta, R_p, d_y, mu = np.broadcast_arrays(*(np.asarray(v, float)
                                                 for v in (W, eta, R_p, delta_y, mu_limit)))
    with np.errstate(divide="ignore", invalid="ignore"):
        h = d_y * (R_p * (mu - 0.5) - W * mu) / (eta * W)
    ok = (R_p > W) & (h >= 0.0) & np.isfinite(h)
    return np.where(ok, h, np.nan)
