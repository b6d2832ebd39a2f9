"""Dynamic amplification of the energy method's demands, calibrated on the time history.

The energy method with the Rayleigh struck mass (``impact``, Gere §9.10 with
Timoshenko's mass correction) is exact for a heavy load and reads low for a light one:
a light load excites the member's higher modes and bounces off before the member has
taken up the motion the static shape assumes. droprig therefore multiplies the
energy method's impact demands (contact force, member moment, shear, deflection) by
factors ≥ 1 read from a table of

* r = M/mₑ, the load mass over the struck effective mass (Rayleigh, kg/kg), and
* κ = f_c/f_s, the contact compliance (mats, the load's underside, the deck's local
  compliance, m/N) over the member's compliance at the struck point (m/N).

Each table value is the largest ratio time history ÷ energy method found for random
members (simple, fixed, propped, cantilever; span 2–15 m, EI 0.2–200 MN·m², μ
10–300 kg/m, any struck point, drops 0.02–3 m) in that cell and its neighbours, times
a margin for the time history's own convergence and the sampling (10 %; 15 % for shear), never below
1 — ``scripts/calibrate_amplification.py`` reproduces it and
``tests/solver/test_amplification.py`` re-checks it on random cases not used to make
it. The time history is :mod:`droprig.solver.timehistory` (Euler–Bernoulli modes,
Blevins 1979 Table 8-1; Newmark average acceleration, Chopra §5.4).

A contact stiffer than the table's least κ (0.001; a rigid load on a bare member,
κ = 0) takes the first column: an Euler–Bernoulli member hit rigidly has no
converged contact force, so there the force and shear factors are an assumption
(stated in the README), while moment and deflection converge.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import impact

__all__ = [
    "B_DEFLECTION",
    "B_MOMENT",
    "B_SHEAR",
    "COMPLIANCE_RATIO_EDGES",
    "KAPPA_MIN",
    "MASS_RATIO_EDGES",
    "RIGID_BASE_MARGIN",
    "SET_BY",
    "Amplification",
    "AmplifiedForces",
    "amplification",
    "amplified_forces",
    "contact_force_bound",
    "crush_depth_bound",
]

MASS_RATIO_EDGES: tuple[float, ...] = (0.03, 0.1, 0.3, 1.0, 3.0, 10.0, 30.0, 100.0)
"""Inner edges of the load-mass ÷ struck-mass cells (below 0.03 … above 100)."""
COMPLIANCE_RATIO_EDGES: tuple[float, ...] = (0.003, 0.01, 0.03, 0.1, 0.3, 1.0, 3.0)
"""Inner edges of the contact ÷ member compliance cells (below 0.003 … above 3)."""
KAPPA_MIN = 0.001
"""Least contact ÷ member compliance sampled by the calibration."""

# rows: mass-ratio cells (light → heavy); columns: compliance-ratio cells (stiff → soft)
# against the energy method with the Rayleigh struck-mass share η = M/(M + mₑ)
_FORCE: tuple[tuple[float, ...], ...] = (
    (253.28, 253.28, 114.53, 83.19, 50.78, 22.58, 18.56, 12.58),
    (253.28, 253.28, 114.53, 83.19, 50.78, 22.58, 18.56, 12.58),
    (167.93, 167.93, 63.45, 42.49, 21.59, 16.85, 9.75, 8.20),
    (74.52, 74.52, 29.13, 20.83, 14.64, 7.05, 5.67, 4.70),
    (19.66, 19.66, 19.66, 11.17, 5.32, 4.11, 2.91, 2.49),
    (16.84, 16.84, 8.52, 6.27, 5.32, 2.68, 1.80, 1.46),
    (8.06, 8.06, 5.48, 4.80, 2.38, 1.97, 1.46, 1.30),
    (4.75, 4.75, 3.26, 2.46, 1.96, 1.59, 1.30, 1.24),
    (3.33, 3.33, 2.90, 2.00, 1.49, 1.46, 1.22, 1.15),
)
_MOMENT: tuple[tuple[float, ...], ...] = (
    (14.12, 14.12, 11.45, 12.28, 12.28, 12.28, 10.18, 10.18),
    (14.12, 14.12, 11.45, 12.28, 12.28, 12.28, 10.18, 10.18),
    (13.93, 13.93, 9.77, 8.20, 8.20, 8.20, 7.39, 7.39),
    (8.38, 8.38, 5.82, 6.47, 6.47, 6.47, 5.42, 5.42),
    (3.91, 3.95, 3.95, 3.95, 3.16, 3.61, 3.63, 3.63),
    (2.87, 2.87, 2.26, 2.26, 2.13, 2.22, 2.22, 2.22),
    (2.16, 2.16, 1.83, 1.79, 1.79, 1.71, 1.44, 1.44),
    (1.59, 1.59, 1.59, 1.44, 1.38, 1.32, 1.32, 1.32),
    (1.40, 1.40, 1.40, 1.27, 1.24, 1.22, 1.18, 1.18),
)
_SHEAR: tuple[tuple[float, ...], ...] = (
    (238.28, 238.28, 90.19, 85.54, 70.40, 25.20, 25.20, 16.46),
    (238.28, 238.28, 90.19, 85.54, 70.40, 25.20, 25.20, 16.46),
    (123.65, 123.65, 64.49, 39.86, 22.12, 21.23, 15.66, 11.10),
    (62.04, 62.04, 26.31, 26.31, 16.76, 8.37, 8.37, 6.99),
    (23.92, 23.92, 21.49, 10.08, 6.32, 5.72, 4.85, 4.81),
    (23.20, 23.20, 9.03, 7.54, 4.65, 3.35, 2.64, 2.64),
    (9.57, 9.57, 6.38, 3.52, 3.52, 2.68, 1.52, 1.52),
    (5.34, 5.34, 5.34, 3.39, 2.24, 1.53, 1.44, 1.38),
    (3.66, 3.66, 3.62, 2.06, 1.67, 1.49, 1.29, 1.28),
)
_DEFLECTION: tuple[tuple[float, ...], ...] = (
    (2.34, 2.40, 2.93, 2.93, 3.44, 4.28, 7.68, 7.68),
    (2.34, 2.40, 2.93, 2.93, 3.44, 4.28, 7.68, 7.68),
    (2.01, 2.15, 2.93, 2.93, 3.44, 4.04, 7.68, 7.68),
    (1.90, 1.90, 2.00, 2.30, 2.56, 3.66, 6.67, 6.67),
    (1.71, 1.71, 1.75, 1.95, 2.40, 3.13, 3.13, 3.13),
    (1.64, 1.64, 1.75, 1.79, 2.06, 2.46, 2.46, 2.46),
    (1.56, 1.56, 1.75, 1.75, 1.82, 1.82, 1.82, 1.73),
    (1.56, 1.56, 1.69, 1.69, 1.69, 1.61, 1.35, 1.35),
    (1.18, 1.24, 1.26, 1.26, 1.27, 1.27, 1.27, 1.24),
)


# against the energy method with η = 1 (droprig's rule under mats and crushable layers)
_FORCE_ETA_ONE: tuple[tuple[float, ...], ...] = (
    (28.74, 28.74, 16.84, 9.86, 5.66, 3.38, 2.19, 1.48),
    (28.74, 28.74, 16.84, 9.86, 5.66, 3.38, 2.19, 1.48),
    (28.74, 28.74, 14.66, 9.19, 5.10, 3.32, 2.00, 1.46),
    (25.89, 25.89, 11.85, 6.83, 5.10, 2.75, 1.90, 1.46),
    (13.19, 13.19, 10.87, 5.76, 4.21, 2.45, 1.60, 1.30),
    (13.19, 13.19, 6.44, 4.57, 4.21, 2.13, 1.58, 1.22),
    (7.11, 7.11, 5.12, 4.28, 2.13, 1.77, 1.34, 1.22),
    (4.63, 4.63, 3.17, 2.36, 1.91, 1.52, 1.28, 1.19),
    (3.28, 3.28, 2.87, 1.97, 1.48, 1.44, 1.19, 1.15),
)
_MOMENT_ETA_ONE: tuple[tuple[float, ...], ...] = (
    (3.00, 3.00, 2.23, 1.78, 1.78, 1.75, 2.30, 2.30),
    (3.05, 3.05, 2.30, 2.25, 2.25, 2.25, 2.67, 2.67),
    (3.05, 3.05, 2.30, 2.25, 2.25, 2.25, 2.67, 2.67),
    (3.05, 3.05, 2.30, 2.25, 2.25, 2.25, 2.67, 2.67),
    (2.32, 2.32, 2.08, 1.99, 1.89, 1.91, 1.97, 1.97),
    (2.18, 2.18, 1.87, 1.85, 1.79, 1.72, 1.72, 1.72),
    (1.91, 1.91, 1.65, 1.59, 1.59, 1.57, 1.31, 1.31),
    (1.57, 1.57, 1.57, 1.38, 1.35, 1.27, 1.27, 1.27),
    (1.39, 1.39, 1.39, 1.26, 1.24, 1.20, 1.17, 1.17),
)
_SHEAR_ETA_ONE: tuple[tuple[float, ...], ...] = (
    (30.84, 30.84, 15.91, 10.98, 9.32, 6.53, 3.36, 3.01),
    (30.84, 30.84, 15.91, 14.30, 9.32, 6.53, 3.36, 3.01),
    (30.84, 30.84, 15.21, 14.30, 7.78, 3.78, 3.25, 3.01),
    (21.68, 21.68, 14.30, 14.30, 7.78, 3.33, 3.12, 2.76),
    (17.43, 17.43, 11.87, 6.18, 3.90, 3.28, 2.89, 2.53),
    (17.43, 17.43, 6.82, 6.18, 3.90, 2.65, 2.05, 2.05),
    (8.46, 8.46, 5.75, 3.32, 3.13, 2.45, 1.44, 1.44),
    (5.25, 5.25, 5.25, 3.32, 2.18, 1.49, 1.41, 1.33),
    (3.62, 3.62, 3.57, 2.04, 1.66, 1.48, 1.28, 1.27),
)
_DEFLECTION_ETA_ONE: tuple[tuple[float, ...], ...] = (
    (1.11, 1.11, 1.11, 1.11, 1.15, 1.19, 2.92, 2.92),
    (1.11, 1.11, 1.11, 1.11, 1.18, 1.67, 3.02, 3.02),
    (1.18, 1.18, 1.15, 1.16, 1.32, 1.79, 3.02, 3.02),
    (1.38, 1.38, 1.37, 1.51, 1.60, 1.80, 3.02, 3.02),
    (1.38, 1.38, 1.59, 1.59, 1.69, 1.80, 2.28, 2.28),
    (1.50, 1.50, 1.62, 1.62, 1.69, 1.80, 1.80, 1.80),
    (1.50, 1.50, 1.62, 1.62, 1.69, 1.69, 1.69, 1.58),
    (1.50, 1.50, 1.62, 1.62, 1.62, 1.56, 1.29, 1.29),
    (1.17, 1.23, 1.26, 1.26, 1.26, 1.26, 1.26, 1.23),
)


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


def amplification(M: ArrayLike, m_e: ArrayLike, f_c: ArrayLike, f_s: ArrayLike, *,
                  struck_mass: ArrayLike = True) -> Amplification:
    """Amplification factors for a load of mass M (kg) on a struck path of Rayleigh
    effective mass mₑ (kg) and compliance f_s (m/N) through a contact compliance f_c
    (m/N). Vectorised; a demand is max(energy, factor × energy) = factor × energy.

    Table lookup by cell (no interpolation): r = M/mₑ (mₑ = 0: a massless path, the
    energy method is exact and every factor is 1), κ = f_c/f_s (f_s = 0: κ = ∞,
    the load rests on a rigid point and the contact spring alone is loaded — the
    energy method is exact). ``struck_mass``: whether the energy method took the
    struck-mass share η = M/(M + mₑ) (per case); where it took η = 1 (droprig's rule
    under mats and crushable layers) the η = 1 tables apply, with the path's Rayleigh
    mass still giving r. Calibration and sources in the module docstring.
    """
    M, m_e, f_c, f_s, sm = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (M, m_e, f_c, f_s)), np.asarray(struck_mass, bool))
    with np.errstate(divide="ignore", invalid="ignore"):
        r = np.where(m_e > 0.0, M / np.where(m_e > 0.0, m_e, 1.0), np.inf)
        kappa = np.where(f_s > 0.0, f_c / np.where(f_s > 0.0, f_s, 1.0), np.inf)
    ir = np.searchsorted(MASS_RATIO_EDGES, r, side="right")
    ik = np.searchsorted(COMPLIANCE_RATIO_EDGES, kappa, side="right")
    exact = ~np.isfinite(r) | ~np.isfinite(kappa)

    def look(table: tuple[tuple[float, ...], ...],
             table_one: tuple[tuple[float, ...], ...]) -> np.ndarray:
        t = np.where(sm, np.asarray(table, float)[ir, ik], np.asarray(table_one, float)[ir, ik])
        return np.where(exact, 1.0, t)

    return Amplification(force=look(_FORCE, _FORCE_ETA_ONE),
                         moment=look(_MOMENT, _MOMENT_ETA_ONE),
                         shear=look(_SHEAR, _SHEAR_ETA_ONE),
                         deflection=look(_DEFLECTION, _DEFLECTION_ETA_ONE),
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


@dataclass(frozen=True)
class AmplifiedForces:
    """The forces (N) at which each family of checks is made, per point: ``local``
    the contact force (web, deck flexure, punching), ``moment``, ``shear`` and
    ``deflection`` the force whose static member response bounds the time history's
    peak member moment, shear and deflection; ``capped`` where the crushing bound
    on the contact force holds (never crushed through its stroke); ``set_by`` per
    quantity ("local", "moment", "shear", "deflection") the index in
    :data:`SET_BY` of the term that set it."""

    local: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    deflection: np.ndarray
    capped: np.ndarray
    set_by: dict[str, np.ndarray]


SET_BY: tuple[str, ...] = ("energy method", "time-history table", "rigid-base bound",
                           "crushing force", "contact-force bound", "point time history")
"""What set an amplified force (:attr:`AmplifiedForces.set_by`): the energy method's
own force, the table, the load against an immovable point, the crushing force,
(member quantities) the member's response to the bounded contact force, or the
point's own time history (the chain's choice of points,
:func:`droprig.solver.chain.dynamic_amplification`)."""


def amplified_forces(amp: Amplification, F: ArrayLike, F_ref: ArrayLike,
                     F_rigid: ArrayLike, F_crush: ArrayLike,
                     crush_holds: ArrayLike, bottomed: ArrayLike = False) -> AmplifiedForces:
    """The checks' forces, each the larger of the energy method's force F (N, as the
    chain gives it — capped by crushing) and the least of the upper bounds of the
    time history:

    * contact force: min(A_F·F_ref, F_rigid, F_crush) — the table on the energy
      method's elastic force F_ref (N, uncapped, as calibrated; only where
      A_F·F_ref ≤ F_crush, i.e. the contact stays elastic, the tables' calibration),
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
      elastic–perfectly plastic contact).

    ``bottomed``: where the energy method crushes through the whole stroke and the
    rest of the energy is taken elastically; the tables then apply to the energy
    method's own (bottomed) force F, the elastic impact of what is left after the
    stroke; where the crushing may pass its stroke (``crush_holds`` false) they apply
    to the elastic force F_ref with no crushing at all — both checked on the time
    history with a finite stroke (same test).

    Every term is an upper bound of the time history (tests/solver/
    test_amplification_capped.py), so their least is one too. Vectorised, N."""
    F, F_ref, F_rigid, F_crush, holds, bot = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (F, F_ref, F_rigid, F_crush)),
        np.asarray(crush_holds, bool), np.asarray(bottomed, bool))
    F_ref = np.where(bot, F, F_ref)
    cap = np.where(holds, F_crush, np.inf)
    # the tables were calibrated on a linear contact: they bound the time history only
    # where their own contact force stays below the crushing force (the contact then
    # never yields and the capped history is the linear one)
    table_ok = bot | ~holds | (amp.force * F_ref <= F_crush)
    terms = np.stack([np.where(table_ok, amp.force * F_ref, np.inf), F_rigid, cap])
    i_loc = np.argmin(terms, axis=0)
    least = np.take_along_axis(terms, i_loc[None], axis=0)[0]
    local = np.maximum(F, least)
    set_by = {"local": np.where(F >= least, 0, i_loc + 1)}
    out = {}
    for key, A, B in (("moment", amp.moment, B_MOMENT), ("shear", amp.shear, B_SHEAR),
                      ("deflection", amp.deflection, B_DEFLECTION)):
        tab, bnd = np.where(table_ok, A * F_ref, np.inf), B * local
        least_m = np.minimum(tab, bnd)
        out[key] = np.maximum(F, least_m)
        set_by[key] = np.where(F >= least_m, 0, np.where(tab <= bnd, 1, 4))
    return AmplifiedForces(local=local, moment=out["moment"], shear=out["shear"],
                           deflection=out["deflection"],
                           capped=holds & np.isfinite(F_crush), set_by=set_by)
