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

**The read.** ψ = F_frame/F_c is tabulated on two grids in log μ, log κ,
log(ρ − 1) and log θ (:mod:`droprig.solver.crush_table_data`, made by
scripts/build_crush_table.py, its grids and seed stated there): one for soft
contacts (κ < :data:`KAPPA_SPLIT`: the load bouncing on its contact pumps the floor,
ψ up to ~4 and varying sharply between nodes; steps 0.25, 0.175, 0.25 decades in
μ, κ, ρ − 1; below κ = :data:`LONG_KAPPA` the histories are followed with a larger
phase budget, :data:`LONG_PHASES`, so that they close rather than hold the energy
bound) and one for stiff ones (steps 0.5, 0.35, 0.25: ψ is smooth there and
varies most with ρ). Along θ (12 nodes a decade on both) the stored value is the
running maximum over every sampled θ up to the node (a load lowered onto the layer
may fall from any lower height: as
:func:`droprig.solver.struck_mass.envelope_two_forces`), and the read in a θ cell
(θ_{j−1}, θ_j] runs linearly in log θ from the upper node's value R_j to the next
one's, R_{j+1}: never below R_j, so never below the running maximum inside the cell,
and continuous and non-decreasing in the fall (the inverse searches bisect on it; a
staircase made them take a third more rounds). Across μ, κ, ρ it takes the largest of
the cell's eight corners, times :data:`MARGIN` (soft; stiff), each the largest exact
÷ read of the generator's random calibration systems off the grids in its band,
counted only above F_c (the chain never reads below F_c). Halving the soft grid's
steps and the stiff grid's ρ step took the soft margin from 1.19 to the figure in
:mod:`~droprig.solver.crush_table_data` and the read's over-read where the history
passes F_c from median 1.07 / 90th percentile 1.54 to the figures in
DEVELOPERS.md (crush30). Below the grid's least θ the first node is read; above its
largest, the last (the running maximum
has then seen the crush end in every phase of the floor's vibration: the crush lasts
over 50 periods there; checked off the grid to 10 × beyond). Outside the
grids in μ, κ or ρ no table value is read: the factor is the all-time energy bound
B_f (:func:`droprig.solver.struck_mass.energy_bounds`, rigorous for every history),
over the chain's force.

**The factor.** φ = max(1, min(F_c·ψ, B_f)/F_chain), with F_chain the chain's own
model (the pulse then the load riding on the floor, capped by B_f): never lowers the
chain; φ·F_chain is the framing force. B_f bounds every history of the model (its
energy at first contact put wholly into the framing), so the min only removes
excess. SI units: N, m, kg, s.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import crush_table_data as _data
from droprig.solver.impact import G

LONG_KAPPA = 0.01
"""κ below which the table's reference histories were followed with the phase budget
:data:`LONG_PHASES` (the load chattering on a very soft contact for hundreds of
phases; with crushhistory's default budget some held the energy bound, ψ up to 9.2
where the closed history gives 2.0). scripts/build_crush_table.py builds and
calibrates with it; the tests' reference takes the same budget."""
LONG_PHASES = 4000
"""crushhistory's phase budget (stopping rule 3) for κ < :data:`LONG_KAPPA`."""
KAPPA_SPLIT = _data.KAPPA_SPLIT
KAPPA_BANDS = _data.KAPPA_BANDS
"""κ at the margins' band edges (the last is KAPPA_SPLIT, the tables' split)."""
MARGIN = _data.MARGIN
"""The margin of each κ band (below the first edge, …, above the last)."""
BOX: tuple[tuple[float, float], ...] = tuple(
    (min(s[0], t[0]), max(s[-1], t[-1]))
    for s, t in zip(_data.SOFT_AXES, _data.STIFF_AXES, strict=True))
"""The tables' box (log10 μ, κ, ρ − 1, θ: least, largest), both grids' union."""

__all__ = ["BOX", "KAPPA_BANDS", "KAPPA_SPLIT", "LONG_KAPPA", "LONG_PHASES", "MARGIN",
           "crush_factor", "crush_groups", "table_psi"]


@dataclass(frozen=True)
class _Tables:
    """The two tables (soft contacts, stiff ones) ready to read as one: each cell's
    corner maximum in μ, κ, ρ at every θ node, both tables flat one after the other,
    and per table (the last axis, 0 soft, 1 stiff) its axes' least values and steps
    (log10 μ, log10 κ, log10(ρ − 1), log10 θ; uniform), its last cell's lower node
    per axis, its strides and where its corners start."""

    corners: np.ndarray
    lo: np.ndarray  # (4, 2)
    step: np.ndarray  # (4, 2)
    cells: np.ndarray  # (3, 2)
    strides: np.ndarray  # (3, 2)
    start: np.ndarray  # (2,)
    nt: int

    @staticmethod
    def of(*grids: tuple[ArrayLike, tuple[tuple[float, ...], ...] | list[np.ndarray]]
           ) -> _Tables:
        """The tables of ``grids`` ((ψ at the nodes, the running maximum along θ;
        axes), soft then stiff, on the same θ nodes); each cell's corner maximum is
        taken once here."""
        corners, lo, step, cells, strides = [], [], [], [], []
        nts = set()
        for psi, axes in grids:
            p = np.asarray(psi, float)
            ax = [np.asarray(a, float) for a in axes]
            c = p[:-1, :-1, :-1]
            for a in (0, 1):
                for b in (0, 1):
                    for d in (0, 1):
                        c = np.maximum(c, p[a:a + c.shape[0], b:b + c.shape[1],
                                            d:d + c.shape[2]])
            nt = ax[3].size
            nts.add(nt)
            corners.append(np.ascontiguousarray(c).ravel())
            lo.append([a[0] for a in ax])
            step.append([a[1] - a[0] for a in ax])
            cells.append([a.size - 2 for a in ax[:3]])
            strides.append([c.shape[1] * c.shape[2] * nt, c.shape[2] * nt, nt])
        if len(nts) != 1:
            raise ValueError("crush tables: the grids must share their θ nodes")
        start = np.cumsum([0] + [c.size for c in corners[:-1]])
        return _Tables(np.concatenate(corners), np.array(lo, float).T,
                       np.array(step, float).T, np.array(cells, float).T,
                       np.array(strides, np.intp).T, start.astype(np.intp), nts.pop())

    def read(self, x: np.ndarray, g: np.ndarray | slice
             ) -> tuple[np.ndarray, np.ndarray]:
        """The unmargined read (module docstring) at the groups' logs ``x`` (4, n)
        from table ``g`` (per point, 0 soft and 1 stiff; or ``slice(i, i + 1)``
        for all points from table i), and whether each point lies inside its grid in
        μ, κ, ρ."""
        u = (x - self.lo[:, g]) / self.step[:, g]
        cells = self.cells[:, g]
        inside = np.all((u[:3] >= 0.0) & (u[:3] <= cells + 1.0), axis=0)
        # the cell in μ, κ, ρ (its corner maximum)
        cell = np.clip(np.floor(np.where(inside, u[:3], 0.0)), 0.0, cells).astype(np.intp)
        base = np.sum(self.strides[:, g] * cell, axis=0) + self.start[g]
        # θ in the cell (θ_{j−1}, θ_j]: from the node above, R_j, at its foot to the
        # next, R_{j+1}, at its top, f = 0 … 1 (continuous, non-decreasing, never
        # below R_j)
        t = np.nan_to_num(u[3], nan=0.0)
        j = np.clip(np.ceil(t), 0.0, self.nt - 1.0)
        f = np.clip(t - (j - 1.0), 0.0, 1.0)
        ji = j.astype(np.intp)
        lo = self.corners.take(base + ji)
        hi = self.corners.take(base + np.minimum(ji + 1, self.nt - 1))
        return lo + f * (hi - lo), inside


_TABLES = _Tables.of((_data.SOFT_PSI, _data.SOFT_AXES), (_data.STIFF_PSI, _data.STIFF_AXES))


def _use(soft: tuple[ArrayLike, list[np.ndarray]],
         stiff: tuple[ArrayLike, list[np.ndarray]]) -> None:
    """Read the tables ``soft`` and ``stiff`` (ψ, axes) from now on (the stored ones
    at import; the generator's calibration passes fresh ones)."""
    global _TABLES
    _TABLES = _Tables.of(soft, stiff)


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
    not). Dimensionless; the soft contacts' table for κ < :data:`KAPPA_SPLIT`, the
    stiff ones' above, each the largest of the cell's corners in μ, κ, ρ, from the
    cell's upper θ node to the next (module docstring), times the :data:`MARGIN` of
    κ's band (:data:`KAPPA_BANDS`)."""
    mu, kappa, rho, theta = np.broadcast_arrays(*(np.asarray(v, float)
                                                  for v in (mu, kappa, rho, theta)))
    # the logs of the groups, (4, n); ρ ≤ 1 and θ = 0 fall below the grid
    x = np.log10(np.maximum(np.stack([mu.ravel(), kappa.ravel(), rho.ravel() - 1.0,
                                      theta.ravel()]), 1e-300))
    k = kappa.ravel()
    stiff = k >= KAPPA_SPLIT
    n_stiff = int(np.count_nonzero(stiff))
    # one table for all points where they share it, else each point's own
    g = (slice(1, 2) if n_stiff == k.size else slice(0, 1) if n_stiff == 0
         else stiff.astype(np.intp))
    psi, inside = _TABLES.read(x, g)
    margin: np.ndarray | float = MARGIN[-1]  # the band's margin (KAPPA_BANDS)
    for edge, m_band in zip(KAPPA_BANDS[::-1], MARGIN[-2::-1], strict=True):
        margin = np.where(k < edge, m_band, margin)
    psi = np.where(inside, margin * psi, np.inf)
    return psi.reshape(mu.shape), inside.reshape(mu.shape)


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
