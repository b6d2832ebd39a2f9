"""Time history of a load dropped on one member: an independent check of the energy
method (modal superposition, Newmark integration, compression-only contact).

Model (SI units: m, N, kg, s; downward positive):

* The member is an Euler–Bernoulli beam of bending stiffness EI (N·m²) and mass per
  length μ (kg/m), end condition ``simple``, ``fixed``, ``propped`` (fixed at x = 0,
  pinned at L) or ``cantilever`` (fixed at 0). Its modes φₙ(x) and circular
  frequencies ωₙ = (λₙ/L)²·√(EI/μ) are the closed forms of Blevins, *Formulas for
  Natural Frequency and Mode Shape* (1979), Table 8-1 (cases pinned–pinned,
  clamped–clamped, clamped–pinned, clamped–free); Clough & Penzien, *Dynamics of
  Structures* 2nd ed., Ch. 18.
* With ``kGA`` (the web's shear stiffness κG·A_v, N) and ``rhoI`` (the section's
  rotary inertia ρ·I, kg·m) the member is a Timoshenko beam (Timoshenko 1921): each
  kept mode keeps its Euler–Bernoulli shape φₙ for the deflection, with the section
  rotation ψ = (Θ/W)ₙ·φₙ', and takes the frequency of that pair
  (:func:`timoshenko_modes`: exact for the simply supported member — Han, Benaroya &
  Wei, J. Sound Vib. 225 (1999) — the Rayleigh quotient of the pair for the other end
  conditions); moments read EI·ψ', shears κGA·(w' − ψ) (from the mode's moment
  equation), the static fields add the shear deflection (:func:`shear_deflection`).
  Shear then travels at c_s = √(κGA/μ) (a support feels a blow no sooner than its
  distance over c_s) and the end shear under a short pulse converges in the modes kept
  (tests/solver/test_timoshenko_history.py). The defaults (κGA = ∞, ρI = 0) are the
  Euler–Bernoulli member.
* The load (mass M, weight W = M·g) touches the member at ``a`` with velocity
  v₀ = √(2gh) through a contact spring of compliance f_c (m/N: mats, the load's
  underside, the deck's local compliance — the series springs of the energy method).
  The spring pushes only (compression-only): the load separates on rebound and may
  land again inside the window. With a crushing force ``F_yield`` the spring is
  elastic–perfectly plastic: the contact force never exceeds F_yield, the excess
  compression is a permanent set (crushing of the deck concrete or of the load's
  underside; Johnson, *Contact Mechanics* §6.2, rigid–plastic indentation), and once
  the set reaches ``stroke`` (the cover over the bars) the spring is elastic again
  without a cap (bottomed out) — the model of droprig's crushing-limited impact
  (:func:`droprig.solver.crushing.crushing_limited_impact`).
* Modes whose frequency lies far above the contact frequency respond quasi-statically;
  they are kept as the member's residual flexibility
  f_res = G(a, a) − Σₖₑₚₜ φₙ(a)²/(mₙωₙ²), in series with the contact spring (static
  correction / mode-acceleration method: Clough & Penzien 2nd ed., §13-4 "mode
  acceleration"; Craig & Kurdila, *Fundamentals of Structural Dynamics* 2nd ed.,
  §14.5 residual flexibility — from memory). Moments, shears and deflections carry the
  same static correction, so they tend to the energy method's quasi-static shape for
  a heavy load.
* Equations of motion (mass-normalised modes φ̃ₙ = φₙ/√mₙ, mₙ = μ∫φₙ²dx):
  M·ü = W − F,  q̈ₙ + ωₙ²qₙ = φ̃ₙ(a)·F,  F = max(0, k·(u − Σφ̃ₙ(a)qₙ)),
  k = 1/(f_c + f_res); u(0) = 0, u̇(0) = v₀, q(0) = q̇(0) = 0. The member's own
  weight and any existing load are static and added by the caller (linear elastic
  superposition).
* Integration: Newmark's average-acceleration method (γ = 1/2, β = 1/4; Newmark,
  J. Eng. Mech. Div. ASCE 85 (1959); Chopra, *Dynamics of Structures* 4th ed.,
  §5.4 and Table 5.4.2), unconditionally stable; each step tries the contact and
  the free state and keeps the one whose contact force has the right sign. The run
  covers the first peak and the rebound: 1.25 × the longer of the member's
  fundamental period and the loaded system's period 2π√((M + mₑ)(f_s + f_c)), every
  case to its own end (a case's peaks do not depend on the cases run with it; a run
  that stopped one fundamental period after the batch's separations missed a second
  landing in the window). :mod:`droprig.solver.exacthistory` solves the same model
  phase by phase in closed form (the verdict's integrator); this one is its plain
  reference.

All functions are vectorised over cases (one entry per drop point or random case).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import cast

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import beam, impact
from droprig.solver.beam import EndCondition

__all__ = [
    "DEFAULT_CUTOFF",
    "DEFAULT_MODES",
    "DEFAULT_STEPS_PER_PERIOD",
    "EnergyPeaks",
    "History",
    "TimeHistoryPeaks",
    "eigenvalue_parameters",
    "energy_method_peaks",
    "mode_shapes",
    "mode_slopes",
    "natural_frequencies",
    "rise_frequency",
    "section_terms",
    "shear_deflection",
    "time_history",
    "time_history_batched",
    "timoshenko_modes",
]

DEFAULT_MODES = 40
"""Largest number of member modes integrated in time (the rest are quasi-static)."""
DEFAULT_CUTOFF = 8.0
"""Modes above DEFAULT_CUTOFF × the contact frequency √(1/(M·f_c)) are quasi-static."""
DEFAULT_STEPS_PER_PERIOD = 40
"""Newmark steps per period of the contact (or of the member, whichever is shorter)."""
_N_SECTIONS = 64  # sections along the member where moments, shears and deflections peak
_MAX_STEPS = 200_000


# --------------------------------------------------------------------------- modes
def _char(cond: str, lam: float) -> float:
    """Characteristic equation of Blevins Table 8-1, written stable for large λ."""
    if cond == "fixed":  # cos λ cosh λ = 1
        return math.cos(lam) - 1.0 / math.cosh(lam)
    if cond == "cantilever":  # cos λ cosh λ = −1
        return math.cos(lam) + 1.0 / math.cosh(lam)
    return math.sin(lam) - math.tanh(lam) * math.cos(lam)  # propped: tan λ = tanh λ


def eigenvalue_parameters(cond: str, n: int) -> np.ndarray:
    """Dimensionless λₙ (n = 1…n) with ωₙ = (λₙ/L)²·√(EI/μ), rad/s.

    Blevins 1979, Table 8-1: pinned–pinned λₙ = nπ; clamped–clamped cos λ·cosh λ = 1
    (4.73004, 7.85320, …); clamped–pinned tan λ = tanh λ (3.92660, 7.06858, …);
    clamped–free cos λ·cosh λ = −1 (1.87510, 4.69409, …). Roots
    by bisection within ±0.4 of the asymptotes (2n + 1)π/2, (4n + 1)π/4 and
    (2n − 1)π/2.
    """
    if cond not in beam.END_CONDITIONS:
        raise ValueError(f"end condition: {cond!r} is not allowed; allowed: "
                         + ", ".join(beam.END_CONDITIONS))
    k = np.arange(1, n + 1, dtype=float)
    if cond == "simple":
        return k * math.pi
    asym = {"fixed": (2 * k + 1) * math.pi / 2, "propped": (4 * k + 1) * math.pi / 4,
            "cantilever": (2 * k - 1) * math.pi / 2}[cond]
    return np.array([_bisect(cond, s - 0.4, s + 0.4) for s in asym])


def _bisect(cond: str, lo: float, hi: float) -> float:
    """The root of :func:`_char` in [lo, hi] (one sign change), by bisection to 1e-14."""
    f_lo = _char(cond, lo)
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        f_mid = _char(cond, mid)
        if (f_mid < 0.0) == (f_lo < 0.0):
            lo, f_lo = mid, f_mid
        else:
            hi = mid
        if hi - lo <= 1e-14:
            break
    return 0.5 * (lo + hi)


def natural_frequencies(cond: str, L: float, EI: float, mu: float, n: int) -> np.ndarray:
    """Circular natural frequencies ωₙ = (λₙ/L)²·√(EI/μ) of a uniform Euler–Bernoulli
    member, rad/s (Blevins 1979, Table 8-1; L m, EI N·m², μ kg/m)."""
    lam = eigenvalue_parameters(cond, n)
    return (lam / L) ** 2 * math.sqrt(EI / mu)


def _sigma_complement(cond: str, lam: np.ndarray) -> np.ndarray:
    """1 − σₙ for Blevins' mode form (cancellation-free for large λ)."""
    em = np.exp(-lam)
    if cond == "cantilever":  # σ = (sinh λ − sin λ)/(cosh λ + cos λ)
        num = em + np.cos(lam) + np.sin(lam)
        den = 0.5 * (1.0 + em**2) + np.cos(lam) * em
    else:  # fixed, propped: σ = (cosh λ − cos λ)/(sinh λ − sin λ)
        num = np.cos(lam) - np.sin(lam) - em
        den = 0.5 * (1.0 - em**2) - np.sin(lam) * em
    # num/(den·e^λ): the e^λ is applied with sinh z or cosh z (see _shapes)
    return num / den


def mode_shapes(cond: str, lam: np.ndarray, xi: ArrayLike) -> tuple[np.ndarray, ...]:
    """Mode shapes and derivatives at ξ = x/L: (φ, L²φ'', L³φ''') with shape
    (n modes, len ξ), dimensionless.

    pinned–pinned φ = sin λξ; the others (Blevins 1979, Table 8-1)
    φ = cosh λξ − cos λξ − σ(sinh λξ − sin λξ), evaluated as
    e^(−λξ) + (1 − σ)·sinh λξ − cos λξ + σ sin λξ so that no large terms cancel.
    """
    xi = np.atleast_1d(np.asarray(xi, float))
    lam = np.asarray(lam, float)[:, None]
    z = lam * xi[None, :]
    if cond == "simple":
        return np.sin(z), -(lam**2) * np.sin(z), -(lam**3) * np.cos(z)
    c = _sigma_complement(cond, lam)  # (1 − σ)·e^λ
    sigma = 1.0 - c * np.exp(-lam)
    ez = np.exp(-z)
    # (1 − σ)·sinh z = c·(e^(z−λ) − e^(−z−λ))/2, likewise cosh
    sh = 0.5 * c * (np.exp(z - lam) - np.exp(-z - lam))
    ch = 0.5 * c * (np.exp(z - lam) + np.exp(-z - lam))
    # cosh z − σ sinh z = e^(−z) + (1 − σ) sinh z; sinh z − σ cosh z = −e^(−z) + (1 − σ) cosh z
    c_s = ez + sh
    s_c = -ez + ch
    phi = c_s - np.cos(z) + sigma * np.sin(z)
    d2 = lam**2 * (c_s + np.cos(z) - sigma * np.sin(z))
    d3 = lam**3 * (s_c - np.sin(z) - sigma * np.cos(z))
    return phi, d2, d3


def mode_slopes(cond: str, lam: np.ndarray, xi: ArrayLike) -> np.ndarray:
    """L·φ'(ξ) of :func:`mode_shapes`' modes, shape (n modes, len ξ), dimensionless:
    pinned–pinned λ·cos λξ; the others λ·(sinh λξ + sin λξ − σ(cosh λξ − cos λξ))
    (the derivative of Blevins 1979 Table 8-1's form), evaluated without cancellation
    as in :func:`mode_shapes`."""
    xi = np.atleast_1d(np.asarray(xi, float))
    lam = np.asarray(lam, float)[:, None]
    z = lam * xi[None, :]
    if cond == "simple":
        return lam * np.cos(z)
    c = _sigma_complement(cond, lam)
    sigma = 1.0 - c * np.exp(-lam)
    # sinh z − σ cosh z = −e^(−z) + (1 − σ) cosh z
    s_c = -np.exp(-z) + 0.5 * c * (np.exp(z - lam) + np.exp(-z - lam))
    return lam * (s_c + np.sin(z) + sigma * np.cos(z))


@dataclass(frozen=True)
class _Modal:
    """Modal data of one end condition at unit length: λ, ∫φ²dξ and shapes."""

    lam: np.ndarray
    norm: np.ndarray  # ∫₀¹ φ² dξ
    norm1: np.ndarray  # ∫₀¹ (dφ/dξ)² dξ


_MODAL_CACHE: dict[tuple[str, int], _Modal] = {}


def _modal(cond: str, n: int) -> _Modal:
    key = (cond, n)
    if key not in _MODAL_CACHE:
        lam = eigenvalue_parameters(cond, n)
        t, w = np.polynomial.legendre.leggauss(24)
        edges = np.linspace(0.0, 1.0, 4 * n + 1)
        xi = (0.5 * (edges[:-1, None] + edges[1:, None])
              + 0.5 * (edges[1:, None] - edges[:-1, None]) * t[None, :]).ravel()
        wt = (0.5 * (edges[1:, None] - edges[:-1, None]) * w[None, :]).ravel()
        phi = mode_shapes(cond, lam, xi)[0]
        slope = mode_slopes(cond, lam, xi)
        _MODAL_CACHE[key] = _Modal(lam=lam, norm=phi**2 @ wt, norm1=slope**2 @ wt)
    return _MODAL_CACHE[key]


def timoshenko_modes(lam: np.ndarray, norm: np.ndarray, norm1: np.ndarray,
                     L: np.ndarray, EI: np.ndarray, mu: np.ndarray, kGA: np.ndarray,
                     rhoI: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Frequencies of a Timoshenko member (shear deformation and rotary inertia) in
    the Euler–Bernoulli mode shapes φₙ, per case (rows) and mode (columns).

    Each mode is the Rayleigh–Ritz pair w = W·φₙ(x), ψ = Θ·φₙ'(x) (deflection and
    section rotation; it meets the end conditions of a Timoshenko member: w = ψ = 0
    at a clamp, w = 0 and M = EI·ψ' = 0 at a pin). With the energies
    ½∫EI·ψ'² + ½∫κGA·(w' − ψ)² and ½∫μ·ẇ² + ½∫ρI·ψ̇² (Timoshenko 1921) the pair
    has the 2 × 2 stiffness [[g, −g], [−g, e + g]] and mass diag(m, j), per
    ∫φ² dx: m = μ, e = EI·λ⁴/L⁴ (∫φ''² = λ⁴/L⁴·∫φ² for these ends), g = κGA·q/L²,
    j = ρI·q/L², q = ∫(dφ/dξ)²dξ / ∫φ²dξ. Its lower root
    (m·j/g)·ω⁴ − (j + m·(1 + e/g))·ω² + e = 0 is the flexural frequency
    ω² = 2e / (B + √(B² − 4·A·e)), A = m·j/g, B = j + m·(1 + e/g), and Θ/W = 1 − ω²·m/g.
    For the simply supported member (φ = sin nπξ, q = (nπ)²) this is exactly the
    lower branch of Timoshenko's frequency equation
    (κGA·k² − μω²)(EI·k² + κGA − ρI·ω²) = (κGA·k)², k = nπ/L (Han, Benaroya & Wei,
    J. Sound Vib. 225 (1999) §3; Blevins 1979 ch. 8 — from memory); for the other
    end conditions it is the Rayleigh quotient of that pair (an upper bound of the
    lowest), a stated approximation checked against a Timoshenko finite-element
    model in the tests. κGA = ∞ and ρI = 0 give the Euler–Bernoulli ωₙ back; κGA = ∞
    alone gives Rayleigh's rotary-inertia beam. The second (shear) spectrum is not
    modelled (its modes are stiff in the transverse direction and go into the
    residual flexibility).

    Arguments: λₙ, ∫φ²dξ, ∫(dφ/dξ)²dξ (modes,), L (m), EI (N·m²), μ (kg/m), κGA (N,
    may be ∞), ρI (kg·m) per case. Returns ωₙ (rad/s), Θ/W (dimensionless, 1 for
    Euler–Bernoulli) and the modal mass mₙ = L·∫φ²dξ·(μ + j·(Θ/W)²) (kg, the mode's
    generalised mass with W = 1)."""
    Lc, EIc, muc = L[:, None], EI[:, None], mu[:, None]
    q = (norm1 / norm)[None, :]
    e = EIc * lam[None, :] ** 4 / Lc**4
    with np.errstate(divide="ignore"):
        gam = np.where(np.isfinite(kGA), 1.0 / kGA, 0.0)[:, None] * Lc**2 / q  # 1/g
    j = rhoI[:, None] * q / Lc**2
    A = muc * j * gam
    B = j + muc * (1.0 + e * gam)
    omega2 = 2.0 * e / (B + np.sqrt(np.maximum(B**2 - 4.0 * A * e, 0.0)))
    ratio = 1.0 - omega2 * muc * gam
    m_n = Lc * norm[None, :] * (muc + j * ratio**2)
    return np.sqrt(omega2), ratio, m_n


def shear_deflection(cond: EndCondition, L: np.ndarray, x: np.ndarray, a: np.ndarray,
                     kGA: np.ndarray) -> np.ndarray:
    """Shear part of a member's deflection at x (m) under a unit load at a (m/N):
    w_s' = V/κGA with the Euler–Bernoulli shear V = dM/dx (:func:`beam.unit_moment`,
    sagging +), w_s(0) = 0 and, for a member supported at both ends, w_s(L) = 0:
    w_s(x) = [M(x) − M(0) − (x/L)·(M(L) − M(0))]/κGA (cantilever: [M(x) − M(0)]/κGA).
    Exact for the simply supported member and the cantilever (statically
    determinate); for the fixed and propped members it is the unit-load (virtual work)
    value with the released member as the virtual system and the Euler–Bernoulli
    shear as the real one, first-order exact in the shear flexibility
    (Timoshenko & Gere, *Mechanics of Materials*, shear deflections; Roark 7th ed.
    §8.10 — from memory). κGA = ∞ gives 0. Arrays broadcast; kGA in N."""
    M0 = beam.unit_moment(cond, L, np.zeros_like(a), a)
    Mx = beam.unit_moment(cond, L, x, a)
    ws = Mx - M0
    if cond != "cantilever":
        ws = ws - x / L * (beam.unit_moment(cond, L, L, a) - M0)
    with np.errstate(divide="ignore"):
        inv = np.where(np.isfinite(kGA), 1.0 / kGA, 0.0)
    return ws * inv


# --------------------------------------------------------------------------- results
@dataclass(frozen=True)
class EnergyPeaks:
    """Energy-method peaks of the impact alone (no existing load), per case: contact
    force F = K·W (N), member moment F·max|M₁| (N·m), shear F·max|V₁| (N), member
    deflection F·max G(x, a) (m) and the Rayleigh effective mass mₑ (kg)."""

    force: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    deflection: np.ndarray
    effective_mass: np.ndarray


@dataclass(frozen=True)
class History:
    """Recorded histories of one case: time t (s), contact force (N), deflection at
    the struck point (m), largest |moment| (N·m) and |shear| (N) along the member and
    the load's displacement (m), each of shape (steps + 1,)."""

    t: np.ndarray
    contact_force: np.ndarray
    deflection: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    load_displacement: np.ndarray


@dataclass(frozen=True)
class TimeHistoryPeaks:
    """Peaks of the time history (impact alone), per case: contact force (N), member
    moment (N·m), shear (N), deflection (m); time of the first separation (s, NaN if
    the load stays in contact), modes integrated in time, time step (s), steps;
    ``history`` for a single recorded case; ``crush`` the permanent set of an
    elastic–perfectly plastic contact (m, 0 for an elastic one); ``reaction`` the
    largest |shear| at the member's ends (N: the dynamic support reactions, what the
    verdict's end-shear checks read — the section shear beside the load also carries
    the contact spike, which the web's local checks take; None where not computed);
    ``leapt`` the samples of each case the bounded search of
    :func:`droprig.solver.exacthistory.exact_time_history` leapt in free flight
    (None where it did not run)."""

    force: np.ndarray
    moment: np.ndarray
    shear: np.ndarray
    deflection: np.ndarray
    t_separation: np.ndarray
    modes: np.ndarray
    dt: np.ndarray
    steps: int
    history: History | None = None
    crush: np.ndarray | None = None
    reaction: np.ndarray | None = None
    leapt: np.ndarray | None = None


# --------------------------------------------------------------------------- energy
def energy_method_peaks(cond: EndCondition, L: ArrayLike, EI: ArrayLike, mu: ArrayLike,
                        a: ArrayLike, M: ArrayLike, h: ArrayLike,
                        f_c: ArrayLike = 0.0, *, struck_mass: bool = True,
                        scaled_mass: bool = False) -> EnergyPeaks:
    """The energy method's peaks for the same cases (Gere 7th ed., §9.10, Eq. 9-94
    with Timoshenko's struck-mass share η = M/(M + mₑ), mₑ = β·μ·L from
    :func:`beam.rayleigh_mass_factor`): f = G(a, a) + f_c, δst = W·f,
    K = 1 + √(1 + 2ηh/δst), F = K·W; moment, shear and deflection are F times the
    unit-load envelopes (AISC Manual Table 3-23). N, N·m, m, kg. ``struck_mass=False``
    takes η = 1 (droprig's rule under mats and crushable layers); mₑ is still reported.
    ``scaled_mass``: the floor chain's rule, η from mₑ·(f_s/(f_s + f_c))² (the struck
    mass referred to the load's own displacement; droprig.solver.chain.struck_mass)."""
    L, EI, mu, a, M, h, f_c = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (L, EI, mu, a, M, h, f_c)))
    W = M * impact.G
    f_s = beam.green(cond, L, EI, a, a)
    m_e = beam.rayleigh_mass_factor(cond, L, a) * mu * L
    m_eta = m_e * (f_s / (f_s + f_c)) ** 2 if scaled_mass else m_e
    eta = impact.mass_efficiency(M, m_eta) if struck_mass else 1.0
    _, F, _ = impact.impact_elastic(W, h, f_s + f_c, eta)
    xi = np.linspace(0.0, 1.0, 401)
    x = L[..., None] * xi
    defl = np.max(beam.green(cond, L[..., None], EI[..., None], x, a[..., None]), axis=-1)
    defl = np.maximum(defl, f_s)
    return EnergyPeaks(force=F, moment=F * beam.max_abs_moment(cond, L, 1.0, a),
                       shear=F * beam.max_abs_shear(cond, L, 1.0, a),
                       deflection=F * defl, effective_mass=m_e)


# --------------------------------------------------------------------------- history
def _green_aa(cond: str | ArrayLike, L: np.ndarray, EI: np.ndarray,
              a: np.ndarray) -> np.ndarray:
    """G(a, a) (m/N) for one end condition or one per case."""
    if isinstance(cond, str):
        return np.asarray(beam.green(cast(EndCondition, cond), L, EI, a, a), float)
    conds = np.broadcast_to(np.asarray(cond, dtype=object), L.shape)
    out = np.zeros(L.shape)
    for cnd in dict.fromkeys(conds.tolist()):
        i = conds == cnd
        out[i] = beam.green(cast(EndCondition, cnd), L[i], EI[i], a[i], a[i])
    return out


def checked_case(cond: str | ArrayLike, values: tuple[ArrayLike, ...], record: bool,
                 weight: ArrayLike | None = None
                 ) -> tuple[tuple[np.ndarray, ...], np.ndarray, np.ndarray]:
    """The inputs of a time history (L, EI, mu, a, M, h, f_c, F_yield, stroke, in SI)
    broadcast to one array each (at least 1-D), checked as both integrators need
    them; with the static compliance f_s at the load (:func:`_green_aa`, m/N) and
    the weight W = M·g (N), or ``weight`` where given (N, > 0: a load seen through a
    generalised coordinate, :func:`droprig.solver.pointhistory.shared_load`). Raises
    ValueError naming the input: ``record`` with more than one case; a rigid contact
    on a rigid support; a weight not above 0; a crushing force not above the weight,
    or a negative stroke."""
    arrs = tuple(np.atleast_1d(v) for v in np.broadcast_arrays(
        *(np.asarray(v, float) for v in values)))
    L, EI, _mu, a, M, _h, f_c, F_y, s_y = arrs
    if record and L.size != 1:
        raise ValueError("record: histories are kept for one case at a time")
    f_s = _green_aa(cond if isinstance(cond, str)
                    else np.broadcast_to(np.asarray(cond, dtype=object), L.shape),
                    L, EI, a)
    if np.any(f_s + f_c <= 0.0):
        raise ValueError("a: a point on a rigid support with a rigid contact has no "
                         "finite impact force; give a contact compliance")
    if weight is None:
        W = M * impact.G
    else:
        W = np.broadcast_to(np.asarray(weight, float), L.shape).copy()
        if np.any(~(W > 0.0)) or np.any(~np.isfinite(W)):
            raise ValueError("weight: the load's weight must be a finite number > 0 N")
    if np.any(~(F_y > W)) or np.any(~(s_y >= 0.0)):
        raise ValueError("F_yield: the crushing force must exceed the load's weight "
                         "(allowed: > M·g, N) and stroke must be ≥ 0 m")
    return arrs, f_s, W


def section_terms(kGA: ArrayLike, rhoI: ArrayLike, shape: tuple[int, ...]
                  ) -> tuple[np.ndarray, np.ndarray]:
    """κGA (N) and ρI (kg·m) of a Timoshenko member broadcast to the cases' shape
    and checked: κGA > 0 (∞: no shear deformation), ρI ≥ 0 and finite. Raises
    ValueError naming the field and its allowed range."""
    kg = np.broadcast_to(np.asarray(kGA, float), shape).copy()
    ri = np.broadcast_to(np.asarray(rhoI, float), shape).copy()
    if np.any(np.isnan(kg)) or np.any(~(kg > 0.0)):
        raise ValueError("kGA: the web's shear stiffness κG·A_v must be > 0 N "
                         "(inf: no shear deformation)")
    if np.any(~np.isfinite(ri)) or np.any(ri < 0.0):
        raise ValueError("rhoI: the section's rotary inertia ρ·I must be a finite "
                         "number ≥ 0 kg·m")
    return kg, ri


def time_history(cond: EndCondition | ArrayLike, L: ArrayLike, EI: ArrayLike, mu: ArrayLike,
                 a: ArrayLike,
                 M: ArrayLike, h: ArrayLike, f_c: ArrayLike = 0.0, *,
                 n_modes: int = DEFAULT_MODES, cutoff: float = DEFAULT_CUTOFF,
                 steps_per_period: int = DEFAULT_STEPS_PER_PERIOD,
                 duration: float = 1.25, record: bool = False,
                 F_yield: ArrayLike = math.inf, stroke: ArrayLike = math.inf,
                 weight: ArrayLike | None = None, kGA: ArrayLike = math.inf,
                 rhoI: ArrayLike = 0.0, rise: bool = True,
                 _plan: bool = False) -> TimeHistoryPeaks:
    """Peaks of the impact of a mass M (kg) falling h (m) onto a member (end
    condition ``cond``, span L m, EI N·m², μ kg/m) at ``a`` (m from the origin end)
    through a contact compliance f_c (m/N); model and sources in the module docstring.

    Modes up to ``n_modes`` with ωₙ ≤ ``cutoff`` × √(1/(M·f_c)) are integrated in
    time (all ``n_modes`` for a rigid contact f_c = 0, where the residual flexibility
    of the omitted modes is the only contact spring — an Euler–Bernoulli member hit
    rigidly has no converged contact force); the time step is the shorter of the
    contact period 2π√(M·(f_c + f_res)) and the highest kept mode's period over
    ``steps_per_period``. ``duration`` × the longer of the fundamental and the loaded
    period is simulated. Cases broadcast; ``record`` keeps the histories (one case).

    ``F_yield`` (N, > W; ∞ elastic) caps the contact force: the contact spring is
    elastic–perfectly plastic with a permanent set that grows while the force is at
    F_yield, until the set reaches ``stroke`` (m; ∞ never), after which it is elastic
    and uncapped (module docstring). The run is lengthened by the crushing time
    M·v₀/(F_yield − W).

    ``weight`` (N, default M·g): the load's weight where it is not M·g — a load
    seen through a generalised coordinate (:func:`droprig.solver.pointhistory.
    shared_load`); the load then falls freely at W/M.

    ``kGA`` (N, the web's shear stiffness κG·A_v; ∞ none) and ``rhoI`` (kg·m, the
    section's rotary inertia ρ·I) make the member a Timoshenko beam
    (:func:`timoshenko_modes`, :func:`section_terms`); the defaults are the
    Euler–Bernoulli member.

    ``rise`` (default): the cut-off's frequency is the faster of the contact and the
    contact force's rise to ``F_yield`` (:func:`rise_frequency`); false: the contact's
    alone (the model before stop 32, kept for the convergence study).
    """
    (L, EI, mu, a, M, h, f_c, F_y, s_y), f_s, W = checked_case(
        cond, (L, EI, mu, a, M, h, f_c, F_yield, stroke), record, weight)
    kGA_a, rhoI_a = section_terms(kGA, rhoI, L.shape)
    v0 = np.sqrt(2.0 * impact.G * h)
    su = _merged_setup(cond, L, EI, mu, a, M, f_c, f_s, n_modes, cutoff, kGA_a, rhoI_a,
                       v0 if rise else None, F_y if rise else None)
    dt, t_end = _step_and_window(su, M, mu, L, f_s, f_c, F_y, W, v0, steps_per_period,
                                 duration)
    if _plan:  # steps each case needs (for time_history_batched); nothing integrated
        z = np.zeros(L.size)
        return TimeHistoryPeaks(force=z, moment=z, shear=z, deflection=z,
                                t_separation=z, modes=su["kept"].sum(axis=1),
                                dt=np.ceil(t_end / dt), steps=0)
    n_steps = int(min(np.max(np.ceil(t_end / dt)), _MAX_STEPS))
    return _integrate(su, M, W, v0, F_y, s_y, t_end / n_steps, n_steps, record)


def _merged_setup(cond: EndCondition | ArrayLike, L: np.ndarray, EI: np.ndarray,
                  mu: np.ndarray, a: np.ndarray, M: np.ndarray, f_c: np.ndarray,
                  f_s: np.ndarray, n_modes: int, cutoff: float, kGA: np.ndarray,
                  rhoI: np.ndarray, v0: np.ndarray | None = None,
                  F_yield: np.ndarray | None = None) -> dict[str, np.ndarray]:
    """:func:`_setup` of every case: for one end condition at once; for one per case,
    per condition, then merged (arrays over the cases in their order)."""
    P = L.size
    if isinstance(cond, str):
        return _setup(cast(EndCondition, cond), L, EI, mu, a, M, f_c, f_s, n_modes, cutoff,
                      kGA=kGA, rhoI=rhoI, v0=v0, F_yield=F_yield)
    conds = np.broadcast_to(np.asarray(cond, dtype=object), L.shape)
    su: dict[str, np.ndarray] = {}
    for cnd in dict.fromkeys(conds.tolist()):
        idx = np.flatnonzero(conds == cnd)
        part = _setup(cnd, L[idx], EI[idx], mu[idx], a[idx], M[idx], f_c[idx], f_s[idx],
                      n_modes, cutoff, kGA=kGA[idx], rhoI=rhoI[idx],
                      v0=None if v0 is None else v0[idx],
                      F_yield=None if F_yield is None else F_yield[idx])
        for key, val in part.items():
            if key not in su:
                su[key] = np.zeros((P, *val.shape[1:]), dtype=val.dtype)
            su[key][idx] = val
    return su


def _step_and_window(su: dict[str, np.ndarray], M: np.ndarray, mu: np.ndarray,
                     L: np.ndarray, f_s: np.ndarray, f_c: np.ndarray, F_y: np.ndarray,
                     W: np.ndarray, v0: np.ndarray, steps_per_period: int,
                     duration: float) -> tuple[np.ndarray, np.ndarray]:
    """The time step (s): the shorter of the contact period over
    ``steps_per_period`` and the highest kept mode's (stiffened by the contact
    spring) over 8; and the run's length (s): ``duration`` × the longer of the
    fundamental and the loaded period, plus the crushing time M·v₀/(F_yield − W)."""
    omega, kept, k, pt = su["omega"], su["kept"], su["k"], su["pt"]
    P, N = L.size, omega.shape[1]
    w_top = np.max(np.where(kept, omega, 0.0), axis=1) if N else np.zeros(P)
    # a mode stiffened by the contact spring: ω² ≤ ωₙ² + k·φ̃ₙ²
    w_top = np.sqrt(w_top**2 + k * np.max(pt**2, axis=1, initial=0.0))
    with np.errstate(divide="ignore"):
        T_top = np.where(w_top > 0.0, 2.0 * math.pi / np.where(w_top > 0, w_top, 1.0), np.inf)
    # the contact period sets the accuracy; the highest kept mode (nearly quasi-static
    # by the cut-off) gets at least 8 steps per period
    T_c = 2.0 * math.pi * np.sqrt(su["f_k"] / su["inv_m"])
    dt = np.minimum(T_c / steps_per_period, T_top / 8.0)
    # the loaded system's period, with the struck point's Rayleigh mass taken at most as
    # the member's own mass: referred to a point near a support that mass grows without
    # bound (the point barely moves), and the run (1e4 s for a point 1e-6·L from a
    # support) was then cut to _MAX_STEPS with a step far too long — it read 1.9 × the
    # rigid-base force, an energy the drop does not have
    T_sys = 2.0 * math.pi * np.sqrt((M + np.minimum(su["m_e"], mu * L)) * (f_s + f_c))
    with np.errstate(divide="ignore", invalid="ignore"):
        t_crush = np.where(np.isfinite(F_y), M * v0 / (F_y - W), 0.0)
    t_end = duration * (np.maximum(su["T1"], T_sys) + t_crush)
    return dt, t_end


class _Peaks:
    """The peaks of a run, folded block by block (``take``): contact force ``F``,
    moment ``M``, shear ``V``, deflection ``D`` over the sections and end shear
    ``R`` (reaction); with ``record``, the first case's histories."""

    def __init__(self, su: dict[str, np.ndarray], P: int, record: bool) -> None:
        self.Wd, self.Wm, self.Wv = su["Wd"], su["Wm"], su["Wv"]
        self.Rd, self.Rm, self.Rv = su["Rd"], su["Rm"], su["Rv"]
        self.pk = {k_: np.zeros(P) for k_ in ("F", "M", "V", "D", "R")}
        self.record = record
        self.rec: dict[str, list[np.ndarray]] = {k_: [] for k_ in ("F", "M", "V", "D", "U")}

    def take(self, qb: np.ndarray, Fb: np.ndarray) -> None:
        """Fold a block of steps (P, B, N) and forces (P, B) into the peaks."""
        pk, rec = self.pk, self.rec
        ends = [0, _N_SECTIONS]  # the grid's end columns (x = 0 and x = L)
        d = np.einsum("pbn,pns->pbs", qb, self.Wd) + Fb[:, :, None] * self.Rd[:, None, :]
        mo = np.einsum("pbn,pns->pbs", qb, self.Wm) + Fb[:, :, None] * self.Rm[:, None, :]
        sh = np.einsum("pbn,pns->pbs", qb, self.Wv) + Fb[:, :, None] * self.Rv[:, None, :]
        ma, sa = np.abs(mo).max(axis=2), np.abs(sh).max(axis=2)
        pk["F"][:] = np.maximum(pk["F"], Fb.max(axis=1))
        pk["D"][:] = np.maximum(pk["D"], np.abs(d).max(axis=(1, 2)))
        pk["M"][:] = np.maximum(pk["M"], ma.max(axis=1))
        pk["V"][:] = np.maximum(pk["V"], sa.max(axis=1))
        pk["R"][:] = np.maximum(pk["R"], np.abs(sh[:, :, ends]).max(axis=(1, 2)))
        if self.record:  # copies: the block's buffers are reused by the next block
            rec["F"].append(Fb[0].copy())
            rec["D"].append(d[0, :, -2].copy())
            rec["M"].append(ma[0].copy())
            rec["V"].append(sa[0].copy())


def _newmark_matrices(su: dict[str, np.ndarray], M: np.ndarray, dt: np.ndarray
                      ) -> tuple[np.ndarray, ...]:
    """The Newmark (average acceleration) system of x = [u, q̃₁ … q̃_N]: the masses,
    the gap vector c (gap = c·x), a0 = 4/dt², a1 = 4/dt, the inverse of the effective
    stiffness in contact (K + k·c·cᵀ + a0·M) and the diagonal one apart (K + a0·M)."""
    omega, kept, k, pt = su["omega"], su["kept"], su["k"], su["pt"]
    P, N = M.size, omega.shape[1]
    n1 = N + 1
    mass = np.concatenate([M[:, None], np.ones((P, N))], axis=1)
    Kf = np.concatenate([np.zeros((P, 1)), np.where(kept, omega**2, 1.0)], axis=1)
    cvec = np.concatenate([np.ones((P, 1)), -pt], axis=1)  # gap = cvec·x
    a0 = 4.0 / dt**2
    a1 = 4.0 / dt
    Kc = np.zeros((P, n1, n1))
    Kc[:, np.arange(n1), np.arange(n1)] = Kf
    Kc += k[:, None, None] * cvec[:, :, None] * cvec[:, None, :]
    Khat_c = Kc.copy()
    Khat_c[:, np.arange(n1), np.arange(n1)] += (a0[:, None] * mass)
    Kc_inv = np.linalg.inv(Khat_c)
    Kf_hat = Kf + a0[:, None] * mass
    return mass, cvec, a0, a1, Kc_inv, Kf_hat


def _integrate(su: dict[str, np.ndarray], M: np.ndarray, W: np.ndarray, v0: np.ndarray,
               F_y: np.ndarray, s_y: np.ndarray, dt: np.ndarray, n_steps: int,
               record: bool) -> TimeHistoryPeaks:
    """Newmark average acceleration over ``n_steps`` steps ``dt`` (s), x = [u, q̃₁ …
    q̃_N], the contact spring compression-only and capped at ``F_y`` until the set
    reaches ``s_y`` (module docstring); the peaks block by block (:class:`_Peaks`)."""
    kept, k = su["kept"], su["k"]
    P, N = M.size, su["omega"].shape[1]
    n1 = N + 1
    mass, cvec, a0, a1, Kc_inv, Kf_hat = _newmark_matrices(su, M, dt)
    load = np.zeros((P, n1))
    load[:, 0] = W
    x = np.zeros((P, n1))
    v = np.zeros((P, n1))
    v[:, 0] = v0
    acc = np.zeros((P, n1))
    acc[:, 0] = W / M
    peaks = _Peaks(su, P, record)
    t_sep = np.full(P, np.nan)
    in_contact = np.ones(P, bool)
    capped = bool(np.any(np.isfinite(F_y)))
    p_set = np.zeros(P)  # permanent set of the contact spring, m
    block = 256
    qb = np.zeros((P, block, N))
    Fb = np.zeros((P, block))
    ub = np.zeros((P, block))
    j = 1  # slot 0 holds the state at t = 0 (at rest, no force)
    for i in range(n_steps):
        rhs = load + mass * (a0[:, None] * x + a1[:, None] * v + acc)
        if capped:
            # contact force k·(gap − set): the set enters the right-hand side
            x_c = np.einsum("pij,pj->pi", Kc_inv, rhs + (k * p_set)[:, None] * cvec)
            F_c = k * (np.einsum("pi,pi->p", cvec, x_c) - p_set)
        else:
            x_c = np.einsum("pij,pj->pi", Kc_inv, rhs)
            F_c = k * np.einsum("pi,pi->p", cvec, x_c)
        x_f = rhs / Kf_hat
        touch = F_c >= 0.0
        x_new = np.where(touch[:, None], x_c, x_f)
        F = np.where(touch, F_c, 0.0)
        if capped:
            cap = np.where(p_set >= s_y, np.inf, F_y)
            yld = F_c > cap
            if yld.any():
                # plastic: the contact force is the crushing force, the set grows
                x_p = (rhs - np.where(yld, cap, 0.0)[:, None] * cvec) / Kf_hat
                x_new = np.where(yld[:, None], x_p, x_new)
                F = np.where(yld, cap, F)
                p_set = np.where(yld, np.einsum("pi,pi->p", cvec, x_p)
                                 - np.where(yld, cap, 0.0) / k, p_set)
        t_sep = np.where(in_contact & ~touch & np.isnan(t_sep), (i + 1) * dt, t_sep)
        in_contact = touch
        acc = a0[:, None] * (x_new - x) - a1[:, None] * v - acc
        v = 2.0 * (x_new - x) / dt[:, None] - v
        x = x_new
        qb[:, j] = x[:, 1:]
        Fb[:, j] = F
        ub[:, j] = x[:, 0]
        j += 1
        if j == block or i == n_steps - 1:
            peaks.take(qb[:, :j], Fb[:, :j])
            if record:
                peaks.rec["U"].append(ub[0, :j].copy())
            j = 0
    history = None
    pk, rec = peaks.pk, peaks.rec
    if record:
        t = np.arange(n_steps + 1) * dt[0]
        history = History(t=t, contact_force=np.concatenate(rec["F"]),
                          deflection=np.concatenate(rec["D"]),
                          moment=np.concatenate(rec["M"]), shear=np.concatenate(rec["V"]),
                          load_displacement=np.concatenate(rec["U"]))
    return TimeHistoryPeaks(force=pk["F"], moment=pk["M"], shear=pk["V"],
                            deflection=pk["D"], t_separation=t_sep,
                            modes=kept.sum(axis=1), dt=dt, steps=n_steps,
                            history=history, crush=p_set, reaction=pk["R"])


def time_history_batched(cond: ArrayLike, L: ArrayLike, EI: ArrayLike, mu: ArrayLike,
                         a: ArrayLike, M: ArrayLike, h: ArrayLike, f_c: ArrayLike = 0.0, *,
                         F_yield: ArrayLike = math.inf, stroke: ArrayLike = math.inf,
                         weight: ArrayLike | None = None,
                         kGA: ArrayLike = math.inf, rhoI: ArrayLike = 0.0,
                         group: int = 128, spread: float = 1.5,
                         n_modes: int = DEFAULT_MODES, cutoff: float = DEFAULT_CUTOFF,
                         steps_per_period: int = DEFAULT_STEPS_PER_PERIOD,
                         rise: bool = True) -> TimeHistoryPeaks:
    """:func:`time_history` of many cases of mixed end conditions (``cond`` an array of
    names), run vectorised in groups of ``group`` cases of one end condition and a
    similar number of time steps (a group runs as many steps as its longest case), so
    that one case needing many steps does not hold up the rest. Same model and
    sources as :func:`time_history` (``n_modes``, ``cutoff``, ``steps_per_period``,
    ``rise`` as there); the peaks come back in the cases' order (``dt``/``steps``: per case the
    time step, and the largest group's steps)."""
    cond_a = np.atleast_1d(np.asarray(cond, dtype=object))
    L, EI, mu, a, M, h, f_c, F_y, s_y, Wt, kG, rI = (
        np.atleast_1d(v) for v in np.broadcast_arrays(
            *(np.asarray(v, float) for v in (L, EI, mu, a, M, h, f_c, F_yield, stroke,
                                             np.nan if weight is None else weight,
                                             kGA, rhoI))))
    Wt = np.where(np.isnan(Wt), M * impact.G, Wt)
    cond_a = np.broadcast_to(cond_a, L.shape)
    out = {k: np.zeros(L.size) for k in ("force", "moment", "shear", "deflection",
                                         "t_separation", "dt", "crush", "reaction")}
    modes = np.zeros(L.size, int)
    steps = 0
    need = time_history(cond_a, L, EI, mu, a, M, h, f_c, F_yield=F_y, stroke=s_y,
                        weight=Wt, kGA=kG, rhoI=rI, _plan=True, n_modes=n_modes,
                        cutoff=cutoff, rise=rise,
                        steps_per_period=steps_per_period).dt
    order = np.argsort(need, kind="stable")
    need = need[order]
    g = 0
    while g < order.size:
        e = max(min(int(np.searchsorted(need, spread * need[g], side="right")), g + group),
                g + 1)
        sel = order[g:e]
        g = e
        t = time_history(cond_a[sel], L[sel], EI[sel], mu[sel], a[sel], M[sel], h[sel],
                         f_c[sel], F_yield=F_y[sel], stroke=s_y[sel], weight=Wt[sel],
                         kGA=kG[sel], rhoI=rI[sel], n_modes=n_modes,
                         cutoff=cutoff, steps_per_period=steps_per_period, rise=rise)
        for k in out:
            out[k][sel] = getattr(t, k)
        modes[sel] = t.modes
        steps = max(steps, t.steps)
    return TimeHistoryPeaks(force=out["force"], moment=out["moment"], shear=out["shear"],
                            deflection=out["deflection"], t_separation=out["t_separation"],
                            modes=modes, dt=out["dt"], steps=steps, crush=out["crush"],
                            reaction=out["reaction"])


def rise_frequency(w_c: np.ndarray, f_c: np.ndarray, v0: np.ndarray,
                   F_yield: np.ndarray) -> np.ndarray:
    """The frequency (rad/s) that sets the cut-off of the modes kept: the contact
    frequency w_c, or — where the contact force is capped at a crushing force F_yield
    (N) below the elastic peak — the frequency of the sine whose quarter period is the
    force's rise to that cap, if higher.

    The contact force of a load striking at v0 (m/s) through a contact of compliance
    f_c (m/N) on a member at rest rises as F(t) ≈ F_el·sin(w_c·t), F_el = v0/(f_c·w_c)
    (initial rate v0/f_c); it reaches the cap F_yield after
    t_r = arcsin(min(1, F_yield/F_el))/w_c, and the quarter period of the same rise is
    π/(2·w_r): w_r = w_c·(π/2)/arcsin(min(1, F_yield/F_el)) ≥ w_c (= w_c where the
    contact never crushes). A mode of circular frequency ωₙ under a force ramped to a
    constant over t_r responds with a dynamic load factor up to 1 + 2/(ωₙ·t_r) (Chopra,
    *Dynamics of Structures* 4th ed. §4.5, the ramp load; Biggs 1964 ch. 2 — from
    memory), where the static correction of a left-out mode takes 1: with a cap far
    below the elastic peak (a light load on a soft, crushing contact) the rise is much
    shorter than the contact period and modes well above the contact frequency × the
    cut-off respond dynamically (``scripts/convergence_point_history.py``, stop 32:
    the verdict's run read the moment 66 % low there). Kept modes ωₙ ≤ cut-off × w_r
    leave 1 + 2/(cut-off·π/2) for the left-out ones' part (cut-off 8: ≤ 1.16 × a part
    that is itself small). f_c = 0 or F_yield = ∞ or v0 = 0: w_c. SI units."""
    w_c = np.asarray(w_c, float)
    f_c, v0, F_y = (np.broadcast_to(np.asarray(x, float), w_c.shape)
                    for x in (f_c, v0, F_yield))
    ok = (f_c > 0.0) & np.isfinite(w_c) & (w_c > 0.0) & (v0 > 0.0) & np.isfinite(F_y) \
        & (F_y > 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        F_el = np.where(ok, v0 / np.where(ok, f_c * w_c, 1.0), 1.0)
        ratio = np.where(ok, np.minimum(F_y / F_el, 1.0), 1.0)
        w_r = np.where(ok, w_c * (0.5 * math.pi) / np.arcsin(np.maximum(ratio, 1e-300)),
                       w_c)
    return np.maximum(w_c, w_r)


_SETUP_KEYS = ("omega", "m_e", "inv_m", "kept", "f_k", "k", "pt", "Wd", "Wm",
               "Wv", "Rd", "Rm", "Rv", "T1")


def _section_shapes(cond: EndCondition, lam: np.ndarray, L: np.ndarray, a: np.ndarray,
                    sections: int) -> tuple[np.ndarray, ...]:
    """The member's sections x (m, cases first: ``sections`` equal intervals, then just
    left and just right of the load at ``a``) and the modes' shape and its first,
    second and third derivatives there, φ, L·φ', L²·φ'', L³·φ''' (:func:`mode_shapes`,
    :func:`mode_slopes`; each (cases, modes, sections))."""
    P, N = L.size, lam.size
    xi = np.linspace(0.0, 1.0, sections + 1)
    eps = 1e-9
    shp = (*mode_shapes(cond, lam, xi), mode_slopes(cond, lam, xi))
    xa_l = np.clip(a - eps * L, 0.0, L)
    xa_r = np.clip(a + eps * L, 0.0, L)
    xs = np.concatenate([L[:, None] * xi[None, :], xa_l[:, None], xa_r[:, None]], axis=1)
    at_l = (*mode_shapes(cond, lam, xa_l / L), mode_slopes(cond, lam, xa_l / L))
    at_r = (*mode_shapes(cond, lam, xa_r / L), mode_slopes(cond, lam, xa_r / L))
    out = [xs]
    for j in (0, 3, 1, 2):  # φ, L·φ', L²·φ'', L³·φ'''
        at_a = np.stack([at_l[j].T, at_r[j].T], axis=2)  # (P, N, 2)
        out.append(np.concatenate([np.broadcast_to(shp[j], (P, N, xi.size)), at_a], axis=2))
    return tuple(out)


def _setup(cond: EndCondition, L: np.ndarray, EI: np.ndarray, mu: np.ndarray, a: np.ndarray,
           M: np.ndarray, f_c: np.ndarray, f_s: np.ndarray, n_modes: int,
           cutoff: float, sections: int = _N_SECTIONS, kGA: np.ndarray | None = None,
           rhoI: np.ndarray | None = None, v0: np.ndarray | None = None,
           F_yield: np.ndarray | None = None) -> dict[str, np.ndarray]:
    """Modal data of the cases of one end condition (see :func:`time_history`):
    frequencies, kept modes, contact stiffness, modal and static-correction fields
    at the member's sections (``sections`` equal intervals, and both sides of the
    load), fundamental period; each array has the cases first. ``kGA`` (N, ∞ none)
    and ``rhoI`` (kg·m) per case make the member a Timoshenko one
    (:func:`timoshenko_modes`; the static fields take the shear deflection of
    :func:`shear_deflection`); None: Euler–Bernoulli. With the impact speed ``v0``
    (m/s) and the crushing force ``F_yield`` (N, ∞ none) per case, the cut-off is set
    by the faster of the contact and the force's rise to its cap
    (:func:`rise_frequency`); None: by the contact alone."""
    P = L.size
    kGA = np.full(P, np.inf) if kGA is None else np.broadcast_to(kGA, L.shape)
    rhoI = np.zeros(P) if rhoI is None else np.broadcast_to(rhoI, L.shape)
    md = _modal(cond, max(n_modes, 1))
    lam, norm, norm1 = md.lam[:n_modes], md.norm[:n_modes], md.norm1[:n_modes]
    N = lam.size
    # (P, N): Timoshenko frequencies, rotation ratio Θ/W and modal masses (Euler–
    # Bernoulli where κGA = ∞ and ρI = 0)
    omega, rot, m_n = timoshenko_modes(lam, norm, norm1, L, EI, mu, kGA, rhoI)
    # the member's static compliance at the load with its shear deflection
    f_s = f_s + shear_deflection(cond, L, a, a, kGA)
    xi_a = a / L
    phi_a = mode_shapes(cond, lam, xi_a)[0].T if N else np.zeros((P, 0))
    # contact frequency: the load and the struck mass on either side of the contact
    # spring, √(k_c·(1/M + 1/mₑ)) (two masses on one spring)
    m_e = beam.rayleigh_mass_factor(cond, L, a) * mu * L
    with np.errstate(divide="ignore"):
        inv_m = 1.0 / M + np.where(m_e > 0.0, 1.0 / np.where(m_e > 0.0, m_e, 1.0), 0.0)
        w_c = np.where(f_c > 0.0, np.sqrt(inv_m / np.where(f_c > 0.0, f_c, 1.0)), np.inf)
    if v0 is not None and F_yield is not None:  # a fast rise to a crushing cap
        w_c = rise_frequency(w_c, f_c, v0, F_yield)
    kept = omega <= cutoff * w_c[:, None]
    # the modal flexibility kept dynamic; the rest is the residual flexibility
    flex_n = np.where(kept, phi_a**2 / (m_n * omega**2), 0.0)
    f_res = np.maximum(f_s - flex_n.sum(axis=1), 0.0)
    f_k = f_c + f_res
    if np.any(f_k <= 0.0):
        raise ValueError("contact: zero contact compliance with every mode kept")
    k = 1.0 / f_k
    pt = np.where(kept, phi_a / np.sqrt(m_n), 0.0)  # φ̃ₙ(a); omitted modes stay at 0

    xs, Phi, D1, D2, D3 = _section_shapes(cond, lam, L, a, sections)
    Lc = L[:, None, None]
    EIc = EI[:, None, None]
    sq = np.sqrt(m_n)[:, :, None]
    kept3 = kept[:, :, None]
    rot3 = rot[:, :, None]
    # per unit generalised coordinate q̃ₙ (w = φ, ψ = (Θ/W)·φ'): deflection φ, moment
    # EI·ψ' (written −(Θ/W)·EIφ'', sagging +) and shear V = κGA·(w' − ψ), read from
    # the mode's moment equation ρI·ψ̈ = EI·ψ'' + κGA·(w' − ψ) as
    # V = −(Θ/W)·(EIφ''' + ρI·ωₙ²·φ') — identical to κGA·(1 − Θ/W)·φ' for the simply
    # supported member's exact modes (tests), and it keeps the shear at a clamp, where
    # the Euler–Bernoulli shape has φ' = 0 (Euler–Bernoulli: −EIφ''')
    Wd = np.where(kept3, Phi / sq, 0.0)
    Wm = np.where(kept3, -rot3 * EIc * D2 / Lc**2 / sq, 0.0)
    Wv = np.where(kept3, -rot3 * (EIc * D3 / Lc**3
                                  + rhoI[:, None, None] * omega[:, :, None] ** 2 * D1 / Lc)
                  / sq, 0.0)
    # static correction per unit contact force: exact unit-load field (with the shear
    # deflection) − kept modes
    stat = (pt / omega**2)[:, :, None] if N else np.zeros((P, 0, 1))
    a_c = a[:, None]
    Rd = (beam.green(cond, L[:, None], EI[:, None], xs, a_c)
          + shear_deflection(cond, L[:, None], xs, a_c, kGA[:, None])
          - np.sum(Wd * stat, axis=1))
    Rm = beam.unit_moment(cond, L[:, None], xs, a_c) - np.sum(Wm * stat, axis=1)
    Rv = beam.unit_shear(cond, L[:, None], xs, a_c)
    r0 = beam.unit_reactions(cond, L, a)[0]
    Rv[:, -2] = r0  # just left of the load
    Rv[:, -1] = r0 - 1.0  # just right of the load
    Rv = Rv - np.sum(Wv * stat, axis=1)
    T1 = 2.0 * math.pi / timoshenko_modes(md.lam[:1], md.norm[:1], md.norm1[:1], L, EI, mu,
                                          kGA, rhoI)[0][:, 0]
    loc = locals()
    return {key: loc[key] for key in _SETUP_KEYS}
