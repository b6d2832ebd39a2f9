"""The framing's peak under a crushable layer that crushes and does not bottom out,
read from a dimensionless table of the exact two-mass history
(:func:`droprig.solver.crushhistory.crush_history`), for the chain's default path
(:func:`droprig.solver.chain.framing_while_crushing`).

**The groups.** The system of :mod:`droprig.solver.crushhistory` with the stroke not
spent (s_c = ∞: a layer that bottoms out is the after-bottoming model's,
:func:`droprig.solver.chain.after_bottoming`, chosen where the one-mass balance
spends the stroke) has seven quantities: the load's mass M (kg), the floor's mass m2
(kg), the contact stiffness k_c and the framing's k2 (N/m), the crush force F_c (N),
the strike speed v0 (m/s) and g (m/s²). Their dimensions (mass, length, time) have
rank 3, so by the Buckingham Π theorem (Buckingham, *Phys. Rev.* 4, 1914 — from
memory) the framing's peak divided by F_c is a function of 7 − 3 = 4 groups:

* μ = m2/M, the floor's mass over the load's;
* κ = k_c/k2, the contact's stiffness over the framing's;
* ρ = F_c/W (W = M·g), the layer's crush force over the load's weight;
* θ = M·v0·ω₂/F_c (ω₂ = √(k2/m2), rad/s), the strike's momentum over the layer's
  impulse in one radian of the floor's vibration: the crush lasts about
  θ/(1 − 1/ρ) radians on a floor that does not move (the load's deceleration
  (F_c − W)/M from v0), so θ is the height's group (v0 = √(2·g·h)).

Check: with M, k2 and v0·√(M/k2) as the units of mass, stiffness and length every
equation of the model (crushhistory's module docstring) is written in μ, κ, ρ, θ
alone (g enters only through W = M·g = F_c/ρ); the test scales M, k2 and g-free
lengths by random factors at fixed groups and finds the same ratio to 1e-9.

**Window or all time.** The table holds the window's peak (``CrushHistory.F_frame``:
two periods of the elastic system's lower mode after the last crush, the window of
the scipy reference and of every other history the chain is checked against,
:mod:`droprig.solver.exacthistory`), not the all-time bound ``F_all``. The bound is
not a peak of any motion: it is the energy left at the window's end put wholly into
the framing of an undamped model, reached only where a load keeps bouncing on a soft
contact in phase with the floor for ever (up to 2.9 × the window's peak). A real
floor's damping (2–5 % of critical for steel and composite floors, common practice,
no source) takes that energy out within a few cycles; a number set by the undamped
idealisation's endless bouncing is the artefact rule 5 forbids. Inside the window
the table keeps every bounce and re-crush the exact history finds (the 0.869 × of
the steel demo's joist bundle is such a bounce). Where the history could not be
closed inside its phase budget (``bounded``) it reads the energy bound: safe.

**The read.** ψ = F_frame/F_c is tabulated on a grid in log μ, log κ, log(ρ − 1)
and log θ (:mod:`droprig.solver.crush_table_data`, made by
scripts/build_crush_table.py, its grid and seed stated there). Along θ the stored
value is the running maximum over every sampled θ up to the node (a load lowered
onto the layer may fall from any lower height: as
:func:`droprig.solver.struck_mass.envelope_two_forces`), and the read in a θ cell
(θ_{j−1}, θ_j] runs linearly in log θ from the upper node's value R_j to the next
one's, R_{j+1}: never below R_j, so never below the running maximum inside the cell,
and continuous and non-decreasing in the fall (the inverse searches bisect on it; a
staircase made them take a third more rounds). Across μ, κ, ρ it takes the largest of
the cell's eight corners, times
:data:`MARGIN`: one for soft contacts (κ < 1: the load bouncing on its contact pumps
the floor, ψ up to ~4 and varying sharply between the nodes) and one for stiff ones,
each the largest exact ÷ read of the generator's random calibration systems off the
grid, counted only above F_c (the chain never reads below F_c). Below the grid's
least θ the first node is read; above its largest, the last (the running maximum
has then seen the crush end in every phase of the floor's vibration: the crush lasts
over 50 periods there; checked off the grid to 10 × beyond). Outside the
grid in μ, κ or ρ no table value is read: the factor is the all-time energy bound
B_f (:func:`droprig.solver.struck_mass.energy_bounds`, rigorous for every history),
over the chain's force.

**The factor.** φ = max(1, min(F_c·ψ, B_f)/F_chain), with F_chain the chain's own
model (the pulse then the load riding on the floor, capped by B_f): never lowers the
chain; φ·F_chain is the framing force. B_f bounds every history of the model (its
energy at first contact put wholly into the framing), so the min only removes
excess. SI units: N, m, kg, s.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.crush_table_data import AXES, KAPPA_SPLIT, MARGIN, PSI
from droprig.solver.impact import G

__all__ = ["MARGIN", "crush_factor", "crush_groups", "table_psi"]

_PSI = np.zeros((2, 2, 2, 2))
_AX: list[np.ndarray] = []  # log10 μ, log10 κ, log10(ρ − 1), log10 θ
_CORNERS = _PSI.ravel()
"""The largest of each cell's eight corners in μ, κ, ρ at each θ node, flat."""
_LO = np.zeros((4, 1))
_STEP = np.ones((4, 1))
_CELLS = np.ones((3, 1))  # the last cell's lower node per axis
_STRIDES = np.zeros(3, np.intp)
_NT = 1


def _use(psi: ArrayLike, axes: tuple[tuple[float, ...], ...] | list[np.ndarray]) -> None:
    """Read the table ``psi`` on ``axes`` from now on (the stored one at import; the
    generator's calibration passes a fresh one): each cell's corner maximum is
    taken once here."""
    global _PSI, _AX, _CORNERS, _LO, _STEP, _CELLS, _STRIDES, _NT
    _PSI = np.asarray(psi, float)
    _AX = [np.asarray(a, float) for a in axes]
    c = _PSI[:-1, :-1, :-1]
    for a in (0, 1):
        for b in (0, 1):
            for d in (0, 1):
                c = np.maximum(c, _PSI[a:a + c.shape[0], b:b + c.shape[1], d:d + c.shape[2]])
    _CORNERS = np.ascontiguousarray(c).ravel()
    _LO = np.array([[ax[0]] for ax in _AX])
    _STEP = np.array([[ax[1] - ax[0]] for ax in _AX])
    _CELLS = np.array([[ax.size - 2] for ax in _AX[:3]], float)
    _NT = _AX[3].size
    _STRIDES = np.array([c.shape[1] * c.shape[2] * _NT, c.shape[2] * _NT, _NT], np.intp)


_use(PSI, AXES)


def crush_groups(M: ArrayLike, v0: ArrayLike, F_c: ArrayLike, k_c: ArrayLike,
                 m2: ArrayLike, k2: ArrayLike) -> tuple[np.ndarray, ...]:
    """The groups (μ, κ, ρ, θ) of the module docstring, dimensionless: μ = m2/M,
    κ = k_c/k2, ρ = F_c/(M·g), θ = M·v0·√(k2/m2)/F_c (M, m2 kg; v0 m/s; F_c N;
    k_c, k2 N/m)."""
    M, v0, F_c, k_c, m2, k2 = np.broadcast_arrays(*(np.asarray(v, float)
                                                    for v in (M, v0, F_c, k_c, m2, k2)))
    return m2 / M, k_c / k2, F_c / (M * G), M * v0 * np.sqrt(k2 / m2) / F_c


def table_psi(mu: ArrayLike, kappa: ArrayLike, rho: ArrayLike,
              theta: ArrayLike) -> tuple[np.ndarray, np.ndarray]:
    """The table's read (module docstring) of ψ = F_frame/F_c at the groups, and
    whether the point lies inside the grid in μ, κ and ρ (bool; ψ is ``inf`` where
    not). Dimensionless; the largest of the cell's corners in μ, κ, ρ, from the
    cell's upper θ node to the next (module docstring), times :data:`MARGIN` (soft
    contacts κ < ``KAPPA_SPLIT``, stiff)."""
    mu, kappa, rho, theta = np.broadcast_arrays(*(np.asarray(v, float)
                                                  for v in (mu, kappa, rho, theta)))
    # the logs of the groups, (4, n); ρ ≤ 1 and θ = 0 fall below the grid
    x = np.log10(np.maximum(np.stack([mu.ravel(), kappa.ravel(), rho.ravel() - 1.0,
                                      theta.ravel()]), 1e-300))
    u = (x - _LO) / _STEP
    inside = np.all((u[:3] >= 0.0) & (u[:3] <= _CELLS + 1.0), axis=0)
    # the cell in μ, κ, ρ (its corner maximum, _CORNERS)
    cell = np.clip(np.floor(np.where(inside, u[:3], 0.0)), 0.0, _CELLS).astype(np.intp)
    base = _STRIDES @ cell
    # θ in the cell (θ_{j−1}, θ_j]: from the node above, R_j, at its foot to the next,
    # R_{j+1}, at its top, f = 0 … 1 (continuous, non-decreasing, never below R_j)
    t = np.nan_to_num(u[3], nan=0.0)
    j = np.clip(np.ceil(t), 0.0, _NT - 1.0)
    f = np.clip(t - (j - 1.0), 0.0, 1.0)
    ji = j.astype(np.intp)
    lo = _CORNERS.take(base + ji)
    hi = _CORNERS.take(base + np.minimum(ji + 1, _NT - 1))
    psi = (lo + f * (hi - lo)).reshape(mu.shape)
    inside = inside.reshape(mu.shape)
    margin = np.where(kappa < KAPPA_SPLIT, MARGIN[0], MARGIN[1])
    return np.where(inside, margin * psi, np.inf), inside


def crush_factor(W: ArrayLike, h: ArrayLike, F_c: ArrayLike, k_c: ArrayLike,
                 k2: ArrayLike, m2: ArrayLike, F_chain: ArrayLike,
                 B_f: ArrayLike) -> np.ndarray:
    """φ = max(1, min(F_c·ψ, B_f)/F_chain) (module docstring), dimensionless: the
    factor on the chain's framing force ``F_chain`` (N) under a layer that crushes
    and does not bottom out; W the load's weight (N), h the energy height (m, strike
    speed √(2·g·h)), F_c the crush force (N), k_c, k2 the contact's and the
    framing's stiffness (N/m), m2 the floor's mass (kg), B_f the all-time energy
    bound of the framing's force (N)."""
    W, h, F_c, k_c, k2, m2, F_chain, B_f = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (W, h, F_c, k_c, k2, m2, F_chain, B_f)))
    M = W / G
    v0 = np.sqrt(2.0 * G * np.maximum(h, 0.0))
    psi, _ = table_psi(*crush_groups(M, v0, F_c, k_c, m2, k2))
    with np.errstate(invalid="ignore", over="ignore", divide="ignore"):
        phi = np.minimum(F_c * psi, B_f) / F_chain
    return np.maximum(np.where(np.isfinite(phi), phi, 1.0), 1.0)
