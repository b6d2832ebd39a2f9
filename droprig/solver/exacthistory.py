"""Time history of a load dropped on one member, phase by phase in closed form: the
fast integrator of the point histories in the verdict.

The model is that of :mod:`droprig.solver.timehistory` (the Newmark integration kept
beside it as the plain reference; same modes, residual flexibility, contact and
output sections): the member's kept modes (mass-normalised coordinates q̃ₙ,
circular frequencies ωₙ; Euler–Bernoulli, Blevins 1979 Table 8-1, or with ``kGA`` and
``rhoI`` the Timoshenko member of :func:`droprig.solver.timehistory.timoshenko_modes`),
the load's mass M on a contact spring k = 1/(f_c + f_res), undamped. The struck system is piecewise
linear, and each phase has an exact solution (Chopra, *Dynamics of Structures* 4th
ed., §10.2 and §12.1–12.4, modal superposition of an undamped linear system; Clough &
Penzien 2nd ed. §11-1 and §12-2 — from memory):

* **contact** (elastic spring, force F = k·(u − Σφ̃ₙ(a)q̃ₙ − p), p the permanent set):
  M·ẍ + K·x = b with x = (u, q̃₁…q̃_N), mass diag(M, 1, …, 1),
  K = diag(0, ω₁², …) + k·c·cᵀ, c = (1, −φ̃₁(a), …), b = (W, 0, …) + k·p·c.
  K is positive definite, so with M^(−½)·K·M^(−½) = Ψ·Λ·Ψᵀ (``numpy.linalg.eigh``,
  batched over points) x(t) = x_s + M^(−½)Ψ·(z₀ cos Ωt + ż₀/Ω sin Ωt), x_s = K⁻¹b,
  z₀ = Ψᵀ M^(½) (x₀ − x_s), ż₀ = Ψᵀ M^(½) ẋ₀, Ω = √Λ;
* **crushing** (the contact force held at F_yield while the set grows): the load
  decelerates uniformly, ü = (W − F_yield)/M, and each mode responds to the constant
  force φ̃ₙ·F_yield in closed form, q̃ₙ = q̃ₛ + (q̃₀ − q̃ₛ) cos ωₙt + (q̃̇₀/ωₙ) sin ωₙt,
  q̃ₛ = φ̃ₙF_yield/ωₙ²; it ends when the gap closes no more (elastic unloading, the set
  fixed) or the set reaches the stroke (then elastic and uncapped);
* **free** (separated): the load falls freely, ü = g, the modes vibrate freely (the
  crushing case with zero force); it ends when the gap closes on the set again.

Each phase's response — the contact force, and the deflection, moment and shear at the
member's sections (the modes plus the static correction per unit contact force, as in
the reference) — is a constant plus a sum of harmonics (plus a quadratic for the gap).
It is sampled at ``samples_per_period`` samples per period of the phase's highest
frequency, the largest sample of each output is refined by a parabola through it and
its neighbours, and the phase's ends are found by bisection of the closed form
between the samples that bracket them (to 1e-12 of the sample spacing), so no
time-step error accumulates: what is left is the modal truncation and the sampling of
the peaks (``scripts/convergence_point_history.py``). The window and its end are the
reference's: 1.25 × the longer of the member's fundamental period and the loaded
period (plus the crushing time), every case to its own end — a load that bounces off
and lands again inside it is followed through the second landing.

**Bounded search** (the default; ``stepping=True`` keeps the plain run above as its
reference, and ``record`` always steps). The same samples, fewer of them worked out:

* *outputs*: in a phase every output is a constant plus harmonics, so it never exceeds
  |y_c| + Σⱼ|CV_qj|·√(Aⱼ² + Bⱼ²) (+ the tail added to its peak; the triangle
  inequality — common practice, no source); an output whose bound cannot beat the
  peak it folds into (the force's, its family's, an end section's also the
  reaction's) is not evaluated for the rest of the phase;
* *free flight*: once the load has bounced clear the gap is c·x − p ≤ g₀ − p + l·τ +
  w·τ² + Σⱼ√(gaⱼ² + gbⱼ²) (w = W/(2M)), so no landing can fall between the roots of
  that parabola; the samples up to the last one before its second root (or the
  window's end) are not scanned for a landing nor bisected, and the live outputs'
  peaks over them come from one product (outputs × harmonics)·(harmonics × samples)
  per case; the samples after the leap are the stepping run's (the same grid);
* the harmonics at the samples by rotation, e^{iΩ(τ + 64b·dt)}·e^{iΩs·dt}, not cos
  and sin of every sample (the same angles to a few ulps of Ω·t);
* an event's bracket narrowed by Newton's method kept inside it (*rtsafe*, Press et
  al., *Numerical Recipes* 3rd ed., §9.4; the gap's rate and acceleration in closed
  form): about 7 evaluations of the closed form an event, the bracket's ends and the
  two probes included (measured on the demos' 1,505 member cases, stop 31), where the
  stepping run takes 24.

The peaks agree with the stepping run's to rounding where the same samples are
worked out: both refine every sampled crest by its parabola (:func:`_crest_peaks`),
so neither the rounds' nor the leap's pieces' edges matter (before stop 31 only a
round's largest sample was refined, and the two runs differed by up to 1e-3 where
their rounds were cut at other samples). What is left: a dead output's crest whose
parabola would have risen above its own bound is refined by the stepping run alone
(:data:`FAST_TOLERANCE`, ``tests/solver/test_exact_history_fast.py``). Measured:
``benchmarks/bench_point_history.py``.

Cost: the samples grow with the modes kept (a stiff contact keeps up to 40, sampled 8
times a period of the highest over the whole window) and every contact change is a
round of its own, so a point costs about 1–40 ms (``benchmarks/bench_verify.py``:
on 100 random members about the Newmark reference's cost, not the ≤ 1 ms aimed at).
The bounded search takes the demos' member histories at 3.8–6.0 ms a point against
the stepping run's 8.7–12.9 ms (one BLAS thread, ``benchmarks/bench_point_history.py
[--stepping]``; docs/amplification_record.md, stop 30); at stop 31 the demos' 1,505
member cases took 2.6–3.7 CPU s against the stepping run's 8.0–10.5 s (busy machine).
The contact phases are solved in closed form too; what is sampled there is the peaks
and the scan that brackets the next event (they end within ~30 samples).

Cases are vectorised: points of one end condition and a similar number of kept modes
run together, each in its own phase, in rounds of a chunk of samples per point; the
grouping is a matter of speed alone (a case's left-out modes stay at rest, every
sampled crest is refined). A case
whose contact chatters more than :data:`MAX_EVENTS` times (a grazing load on a
vibrating member) is run by the reference instead. SI units: m, N, kg, s.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from typing import cast

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import impact, timehistory
from droprig.solver.beam import EndCondition
from droprig.solver.timehistory import History, TimeHistoryPeaks

__all__ = ["DEFAULT_SAMPLES_PER_PERIOD", "FAST_TOLERANCE", "MAX_EVENTS", "exact_time_history"]

DEFAULT_SAMPLES_PER_PERIOD = 8
"""Samples per period of a phase's highest frequency (peaks refined by a parabola)."""
DEFAULT_SECTIONS = 16
"""Equal intervals of the member at whose ends (and both sides of the load) the
deflection, moment and shear are followed (the reference follows 64)."""
FAST_TOLERANCE = 1e-5
"""Largest relative difference of the bounded search's peaks from the stepping run's
(module docstring, "Bounded search"): a dead output's crest whose parabola would have
risen above the output's bound (measured at stop 31: ≤ 5e-13 on 40 random members,
≤ 2.1e-7 on the demos' 1,505 member cases, a moment; the rest rounding — before every
crest was refined the two differed by up to 1e-3, the parabola's refinement, which
raises a sampled crest by up to 7 % of a harmonic's amplitude, cos(π/8) = 0.924 to
0.992, tests/solver/test_exact_history.py)."""
MAX_EVENTS = 400
"""Phase changes per case before the case is handed to the Newmark reference."""
TAIL = 0.01
"""Modes not sampled in a free or crushing phase: their amplitudes' sum (the bound on
their part, added to the peak) is at most TAIL of the family's largest."""
_BUDGET = 32_768  # samples per round over all active cases (the search for phase ends)
_CHUNK = 600_000  # outputs × samples evaluated at once (a few MB: kept in cache)
_BISECT = 22  # bisection steps on a bracket of one sample spacing, then a secant step

_CONTACT, _CRUSH, _FREE = 0, 1, 2


def exact_time_history(cond: EndCondition | ArrayLike, L: ArrayLike, EI: ArrayLike,
                       mu: ArrayLike, a: ArrayLike, M: ArrayLike, h: ArrayLike,
                       f_c: ArrayLike = 0.0, *, F_yield: ArrayLike = math.inf,
                       stroke: ArrayLike = math.inf,
                       n_modes: int = timehistory.DEFAULT_MODES,
                       cutoff: float = timehistory.DEFAULT_CUTOFF,
                       samples_per_period: int = DEFAULT_SAMPLES_PER_PERIOD,
                       duration: float = 1.25, record: bool = False, rise: bool = True,
                       sections: int = DEFAULT_SECTIONS, group: int = 256,
                       weight: ArrayLike | None = None, kGA: ArrayLike = math.inf,
                       rhoI: ArrayLike = 0.0, stepping: bool = False) -> TimeHistoryPeaks:
    """Peaks of the impact of a mass M (kg) falling h (m) onto a member (end condition
    ``cond``, one name or one per case; span L m, EI N·m², μ kg/m) at ``a`` (m) through
    a contact compliance f_c (m/N), with an elastic–perfectly plastic contact
    (``F_yield`` N > M·g, ∞ elastic; ``stroke`` m); the model, modes kept (``n_modes``,
    ``cutoff``) and outputs of :func:`droprig.solver.timehistory.time_history`, solved
    phase by phase in closed form (module docstring). ``record`` keeps the sampled
    histories (one case). ``dt`` in the result is each case's sample spacing in its
    last phase (s) and ``steps`` the largest number of samples of a case. ``weight``
    (N, default M·g), ``kGA`` (N) and ``rhoI`` (kg·m, the Timoshenko member's shear
    stiffness and rotary inertia; defaults Euler–Bernoulli): as there. ``stepping``:
    every phase sampled to its end, every output (the bounded search's plain
    reference; ``record`` always steps). ``rise``: as in :func:`timehistory.time_history`."""
    if samples_per_period < 4:
        raise ValueError("samples_per_period: at least 4 samples per period")
    (L, EI, mu, a, M, h, f_c, F_y, s_y), f_s, W = timehistory.checked_case(
        cond, (L, EI, mu, a, M, h, f_c, F_yield, stroke), record, weight)
    kGA_a, rhoI_a = timehistory.section_terms(kGA, rhoI, L.shape)
    P = L.size
    conds = np.broadcast_to(np.asarray(cond, dtype=object), L.shape)
    g = impact.G
    if np.any(~np.isfinite(h)) or np.any(h < 0.0):
        raise ValueError("h: the drop height must be a finite number ≥ 0 m")
    v0 = np.sqrt(2.0 * g * h)
    out = {k: np.zeros(P) for k in ("force", "moment", "shear", "deflection", "reaction",
                                    "t_separation", "dt", "crush", "leapt")}
    modes, steps = np.zeros(P, int), 0
    history: History | None = None
    fallback: list[np.ndarray] = []
    for cnd in dict.fromkeys(conds.tolist()):
        ic = np.flatnonzero(conds == cnd)
        su = timehistory._setup(cast(EndCondition, cnd), L[ic], EI[ic], mu[ic], a[ic],
                                M[ic], f_c[ic], f_s[ic], n_modes, cutoff, sections,
                                kGA=kGA_a[ic], rhoI=rhoI_a[ic], v0=v0[ic] * rise, F_yield=F_y[ic])
        kept = su["kept"].sum(axis=1)
        om = np.where(su["kept"], su["omega"], 0.0)  # left-out modes at rest (_run)
        t_end = _window(su, M[ic], mu[ic], L[ic], f_s[ic] + f_c[ic], F_y[ic], W[ic],
                        v0[ic], duration)
        for sel in _groups(kept, group):
            N = int(kept[sel].max())
            run = _run(M=M[ic][sel], W=W[ic][sel], k=su["k"][sel], v0=v0[ic][sel],
                       omega=om[sel][:, :N], pt=su["pt"][sel][:, :N],
                       Wsec=np.concatenate([su["Wd"][sel][:, :N], su["Wm"][sel][:, :N],
                                            su["Wv"][sel][:, :N]], axis=2),
                       Rsec=np.concatenate([su["Rd"][sel], su["Rm"][sel], su["Rv"][sel]],
                                           axis=1),
                       n_sec=su["Rd"].shape[1], F_y=F_y[ic][sel], s_y=s_y[ic][sel],
                       t_end=t_end[sel], T1=su["T1"][sel], sp=samples_per_period,
                       record=record, fast=not (stepping or record))
            idx = ic[sel]
            for key in out:
                out[key][idx] = run[key]
            modes[idx] = kept[sel]
            steps = max(steps, int(run["samples"].max()))
            history = run["history"] if run["history"] is not None else history
            if np.any(run["chatter"]):
                fallback.append(idx[run["chatter"]])
    if fallback:  # chattering contacts: the Newmark reference
        fb = np.concatenate(fallback)
        ref = timehistory.time_history_batched(
            conds[fb], L[fb], EI[fb], mu[fb], a[fb], M[fb], h[fb], f_c[fb], F_yield=F_y[fb],
            stroke=s_y[fb], weight=W[fb], kGA=kGA_a[fb], rhoI=rhoI_a[fb], n_modes=n_modes,
            cutoff=cutoff, rise=rise)
        for key in out:
            out[key][fb] = 0.0 if key == "leapt" else getattr(ref, key)
    return TimeHistoryPeaks(force=out["force"], moment=out["moment"], shear=out["shear"],
                            deflection=out["deflection"], t_separation=out["t_separation"],
                            modes=modes, dt=out["dt"], steps=steps, history=history,
                            crush=out["crush"], reaction=out["reaction"],
                            leapt=None if (stepping or record) else out["leapt"])


def _window(su: dict[str, np.ndarray], M: np.ndarray, mu: np.ndarray, L: np.ndarray,
            f: np.ndarray, F_y: np.ndarray, W: np.ndarray, v0: np.ndarray,
            duration: float) -> np.ndarray:
    """The run's end (s), the reference's window (:func:`droprig.solver.timehistory.
    time_history`): ``duration`` × (the longer of the fundamental period and the loaded
    period 2π√((M + min(mₑ, μL))·f), f the member's and contact compliance, m/N) plus
    the crushing time M·v₀/(F_yield − W)."""
    T_sys = 2.0 * math.pi * np.sqrt((M + np.minimum(su["m_e"], mu * L)) * f)
    with np.errstate(divide="ignore", invalid="ignore"):
        t_crush = np.where(np.isfinite(F_y), M * v0 / (F_y - W), 0.0)
    return duration * (np.maximum(su["T1"], T_sys) + t_crush)


def _groups(kept: np.ndarray, group: int) -> Iterator[np.ndarray]:
    """The cases (indices) in groups of at most ``group`` with similar numbers of kept
    modes (at most 3 × or 8 more than the group's fewest), fewest first. A matter of
    speed alone: a case's peaks do not depend on its group (its left-out modes at
    rest, every sampled crest refined; tests/solver/test_exact_history_batch.py).
    Wider groups run fewer rounds; on the demos' 1,505 member cases 3 × took about
    15 % less than 1.5 × (stop 31), one group per end condition more."""
    order = np.argsort(kept, kind="stable")
    g0 = 0
    while g0 < order.size:
        n0 = int(kept[order[g0]])
        e = g0 + 1
        while (e < order.size and e - g0 < group
               and kept[order[e]] <= max(3 * n0, n0 + 8)):
            e += 1
        yield order[g0:e]
        g0 = e


class _Phase:
    """Closed-form solution of every case's current phase (arrays, cases first):
    x(τ) = s + l·τ + w·τ² + V·(A cos Ωτ + B sin Ωτ); the outputs (contact force, then
    the sections' deflection, moment and shear);
    the gap c·x(τ) = g0 + g1·τ + g2·τ² + Σ(ga cos Ωτ + gb sin Ωτ); the outputs
    y(τ) = yc + (A cos Ωτ + B sin Ωτ)·CV (CV: the outputs per unit harmonic)."""

    def __init__(self, P: int, n1: int, Q: int) -> None:
        self.Om = np.ones((P, n1))
        self.V = np.zeros((P, n1, n1))
        self.A = np.zeros((P, n1))
        self.B = np.zeros((P, n1))
        self.As = np.zeros((P, n1))  # the harmonics sampled (the rest bounded by tail)
        self.Bs = np.zeros((P, n1))
        self.tail = np.zeros((P, Q))
        self.s = np.zeros((P, n1))
        self.l_u = np.zeros(P)  # only the load moves with l and w
        self.w_u = np.zeros(P)
        self.yc = np.zeros((P, Q))
        self.CV = np.zeros((P, Q, n1))
        self.ga = np.zeros((P, n1))
        self.gb = np.zeros((P, n1))
        self.g0 = np.zeros(P)
        self.dt = np.zeros(P)


def _run(*, M: np.ndarray, W: np.ndarray, k: np.ndarray, v0: np.ndarray, omega: np.ndarray,
         pt: np.ndarray, Wsec: np.ndarray, Rsec: np.ndarray, n_sec: int, F_y: np.ndarray,
         s_y: np.ndarray, t_end: np.ndarray, T1: np.ndarray, sp: int,
         record: bool, fast: bool = False) -> dict:
    """Cases of one end condition with N kept modes (a prefix of ``omega``; modes not
    kept have φ̃ = 0 and ω = 0 and stay at rest — with ω = 0 a case's left-out modes do
    not set its sampling, where before stop 31 the contact phase's spacing took the
    group's highest ω and a point's peaks moved by up to 0.6 % with its company): peaks
    by phases (see :func:`exact_time_history`).
    ``Wsec`` (P, N, 3S) the sections' deflection, moment and shear per unit q̃ₙ,
    ``Rsec`` (P, 3S) their static correction per unit contact force. Rounds of
    :class:`_Integrator` until every case has ended."""
    it = _Integrator(M=M, W=W, k=k, v0=v0, omega=omega, pt=pt, Wsec=Wsec, Rsec=Rsec,
                     n_sec=n_sec, F_y=F_y, s_y=s_y, t_end=t_end, T1=T1, sp=sp, record=record,
                     fast=fast)
    it.set_phase(np.arange(it.P))
    while it.active.any():
        it.round()
    return it.result()


def _contact_modes(k: np.ndarray, omega: np.ndarray, pt: np.ndarray, Wsec: np.ndarray,
                   Rsec: np.ndarray, M: np.ndarray) -> tuple:
    """The contact phase's modes (they do not depend on the set p): cases P, kept
    modes N, states n1 = N + 1, outputs Q; ω with 1 for a mode at rest, the gap vector
    c (gap = c·x), the outputs per unit state ``base`` and per unit contact force R,
    the masses and their roots, the eigenvalues λ, mode shapes M^(-1/2)·Ψ, Ω = √λ, c·V
    and the outputs per unit harmonic CV (P, Q, n1)."""
    P, N = pt.shape
    n1 = N + 1
    Q = 1 + Rsec.shape[1]
    om = np.where(omega > 0.0, omega, 1.0)
    c = np.concatenate([np.ones((P, 1)), -pt], axis=1)  # gap = c·x
    base = np.zeros((P, Q, n1))  # outputs per unit state: sections' modal part
    base[:, 1:, 1:] = np.transpose(Wsec, (0, 2, 1))
    R = np.concatenate([np.ones((P, 1)), Rsec], axis=1)  # outputs per unit contact force
    mass = np.concatenate([M[:, None], np.ones((P, N))], axis=1)
    msq = np.sqrt(mass)
    Kbase = np.zeros((P, n1, n1))
    Kbase[:, np.arange(1, n1), np.arange(1, n1)] = om**2
    Kc = Kbase + k[:, None, None] * c[:, :, None] * c[:, None, :]
    Ks = Kc / (msq[:, :, None] * msq[:, None, :])
    lam_c, psi_c = np.linalg.eigh(Ks)  # the contact phase's modes do not depend on p
    lam_c = np.maximum(lam_c, 1e-300)
    V_c = psi_c / msq[:, :, None]  # M^(-1/2)·Ψ
    Om_c = np.sqrt(lam_c)
    cV_c = np.einsum("pi,pij->pj", c, V_c)
    RcV_c = R[:, :, None] * (k[:, None] * cV_c)[:, None, :]
    CV_c = base @ V_c + RcV_c  # (P, Q, n1)
    return P, N, n1, Q, om, c, base, R, mass, msq, lam_c, V_c, Om_c, cV_c, CV_c


class _Integrator:
    """The phase-by-phase solution of :func:`_run`'s cases: the contact phase's modes
    (:func:`_contact_modes`), the cases' states (``x``, ``xd``, set ``p``, ``cap``,
    phase ``kind``, times ``t0`` and ``tau``), the current phases' closed forms ``ph``
    (:class:`_Phase`) and the peaks ``pk`` (force, deflection, moment, shear); the
    arrays are updated in place by :meth:`round` until no case is ``active``."""

    def __init__(self, *, M: np.ndarray, W: np.ndarray, k: np.ndarray, v0: np.ndarray,
                 omega: np.ndarray, pt: np.ndarray, Wsec: np.ndarray, Rsec: np.ndarray,
                 n_sec: int, F_y: np.ndarray, s_y: np.ndarray, t_end: np.ndarray,
                 T1: np.ndarray, sp: int, record: bool, fast: bool = False) -> None:
        self.fast = fast
        self.M, self.W, self.k, self.v0, self.omega, self.pt = M, W, k, v0, omega, pt
        self.F_y, self.s_y, self.t_end, self.T1, self.sp = F_y, s_y, t_end, T1, sp
        self.record = record
        (self.P, self.N, self.n1, self.Q, self.om, self.c, self.base, self.R, self.mass,
         self.msq, self.lam_c, self.V_c, self.Om_c, self.cV_c,
         self.CV_c) = _contact_modes(k, omega, pt, Wsec, Rsec, M)
        P, n1, Q = self.P, self.n1, self.Q
        x = np.zeros((P, n1))
        xd = np.zeros((P, n1))
        xd[:, 0] = v0
        p = np.zeros(P)
        cap = F_y.copy()
        kind = np.full(P, _CONTACT)
        t0 = np.zeros(P)
        tau = np.zeros(P)
        t_sep = np.full(P, np.nan)
        active = np.ones(P, bool)
        events = np.zeros(P, int)
        expect = np.full((P, 3), 64.0)  # samples a phase of each kind took last (search)
        samples = np.zeros(P, int)
        chatter = np.zeros(P, bool)
        pk = np.zeros((P, 5))  # force, deflection, moment, shear, end shear
        ph = _Phase(P, n1, Q)
        rec: dict[str, list[np.ndarray]] = {key: [] for key in ("t", "F", "D", "M", "V", "U")}
        S = n_sec
        sl = {"D": slice(1, 1 + S), "M": slice(1 + S, 1 + 2 * S), "V": slice(1 + 2 * S, 1 + 3 * S)}
        self.x, self.xd, self.p, self.cap, self.kind, self.t0 = x, xd, p, cap, kind, t0
        self.tau, self.t_sep, self.active, self.events = tau, t_sep, active, events
        self.expect, self.samples, self.chatter, self.pk = expect, samples, chatter, pk
        self.ph, self.rec, self.S, self.sl = ph, rec, S, sl
        self.bnd = np.zeros((P, Q))  # bound on each output's folded value, this phase
        self.gbnd = np.zeros(P)  # bound on the gap's harmonic part, this phase
        self.leaps = np.zeros(P, int)  # samples skipped by the gap's bound (bench)

    def set_phase(self, idx: np.ndarray) -> None:
        """The closed form of each case's phase from its state at the phase's start
        (:meth:`_set_contact`, :meth:`_set_free`)."""
        if idx.size == 0:
            return
        kd = self.kind[idx]
        e = idx[kd == _CONTACT]
        if e.size:
            self._set_contact(e)
        f = idx[kd != _CONTACT]
        if f.size:
            self._set_free(f)
        if self.fast:
            self._set_bounds(idx)

    def _set_contact(self, e: np.ndarray) -> None:
        """The contact phase of the cases ``e``: the modes of the contact system about
        the static position."""
        W, k, sp, n1, c, base = self.W, self.k, self.sp, self.n1, self.c, self.base
        R, mass, lam_c, V_c, Om_c = self.R, self.mass, self.lam_c, self.V_c, self.Om_c
        cV_c, CV_c, x, xd, p, ph = self.cV_c, self.CV_c, self.x, self.xd, self.p, self.ph
        Ve, lam = V_c[e], lam_c[e]
        b = np.zeros((e.size, n1))
        b[:, 0] = W[e]
        b += (k[e] * p[e])[:, None] * c[e]
        # x_s = K⁻¹ b = V Λ⁻¹ Vᵀ b
        xs = np.einsum("pij,pj->pi", Ve, np.einsum("pji,pj->pi", Ve, b) / lam)
        z0 = np.einsum("pji,pj->pi", Ve, mass[e] * (x[e] - xs))
        zd0 = np.einsum("pji,pj->pi", Ve, mass[e] * xd[e])
        ph.Om[e], ph.V[e], ph.s[e] = Om_c[e], Ve, xs
        ph.A[e], ph.B[e] = z0, zd0 / Om_c[e]
        ph.As[e], ph.Bs[e] = z0, zd0 / Om_c[e]
        ph.tail[e] = 0.0
        ph.l_u[e] = 0.0
        ph.w_u[e] = 0.0
        Fs = k[e] * (np.einsum("pi,pi->p", c[e], xs) - p[e])
        ph.yc[e] = np.einsum("pqi,pi->pq", base[e], xs) + R[e] * Fs[:, None]
        ph.CV[e] = CV_c[e]  # (p, Q, J)
        ph.g0[e] = np.einsum("pi,pi->p", c[e], xs)
        ph.ga[e] = cV_c[e] * z0
        ph.gb[e] = cV_c[e] * zd0 / Om_c[e]
        ph.dt[e] = 2.0 * math.pi / (sp * Om_c[e].max(axis=1))

    def _set_free(self, f: np.ndarray) -> None:
        """A free or crushing phase of the cases ``f``: the member's own modes under the
        crushing force (0 free), the load moving with g and that force."""
        M, W, pt, t_end, sp, N = self.M, self.W, self.pt, self.t_end, self.sp, self.N
        n1, Q, om, base, R, x = self.n1, self.Q, self.om, self.base, self.R, self.x
        xd, cap, kind, ph, sl = self.xd, self.cap, self.kind, self.ph, self.sl
        Fc = np.where(kind[f] == _CRUSH, cap[f], 0.0)
        ptf, omf = pt[f], om[f]
        qs = ptf * Fc[:, None] / omf**2
        Am = x[f, 1:] - qs
        Bm = xd[f, 1:] / omf
        Om = np.ones((f.size, n1))
        Om[:, :N] = omf
        A = np.zeros((f.size, n1))
        B = np.zeros((f.size, n1))
        A[:, :N], B[:, :N] = Am, Bm
        V = np.zeros((f.size, n1, n1))
        V[:, np.arange(1, n1), np.arange(N)] = 1.0
        s = np.concatenate([x[f, :1], qs], axis=1)
        ph.Om[f], ph.V[f], ph.s[f], ph.A[f], ph.B[f] = Om, V, s, A, B
        ph.l_u[f] = xd[f, 0]
        ph.w_u[f] = 0.5 * (W[f] - Fc) / M[f]
        Wt = np.zeros((f.size, Q, n1))
        Wt[:, :, :N] = base[f][:, :, 1:]
        ph.yc[f] = np.einsum("pqn,pn->pq", base[f][:, :, 1:], qs) + R[f] * Fc[:, None]
        ph.CV[f] = Wt
        ph.g0[f] = x[f, 0] - np.einsum("pn,pn->p", ptf, qs)
        ph.ga[f] = np.concatenate([-ptf * Am, np.zeros((f.size, 1))], axis=1)
        ph.gb[f] = np.concatenate([-ptf * Bm, np.zeros((f.size, 1))], axis=1)
        # the modes whose free vibration is small are not sampled: their part of
        # each output is bounded by the sum of their amplitudes (added to the
        # sampled peak), where that sum is at most TAIL of the family's largest
        amp = np.abs(Wt) * np.hypot(A, B)[:, None, :]  # (f, Q, J)
        tail = np.cumsum(amp[:, :, ::-1], axis=2)[:, :, ::-1]
        tail = np.concatenate([tail, np.zeros((f.size, Q, 1))], axis=2)  # from j
        tot = tail[:, :, 0]
        thr = np.zeros((f.size, Q))
        for fam in ("D", "M", "V"):
            thr[:, sl[fam]] = TAIL * tot[:, sl[fam]].max(axis=1, keepdims=True)
        gamp = np.abs(ptf) * np.hypot(Am, Bm)
        gtail = np.cumsum(gamp[:, ::-1], axis=1)[:, ::-1]
        gtail = np.concatenate([gtail, np.zeros((f.size, 2))], axis=1)
        ok = (np.all(tail <= thr[:, :, None] * (1.0 + 1e-12), axis=1)
              & (gtail <= TAIL * gtail[:, :1]))
        m = np.argmax(ok, axis=1)  # harmonics sampled
        keep = np.arange(n1)[None, :] < m[:, None]
        ph.As[f], ph.Bs[f] = np.where(keep, A, 0.0), np.where(keep, B, 0.0)
        ph.tail[f] = np.take_along_axis(tail, m[:, None, None], axis=2)[:, :, 0]
        om_s = np.max(np.where(keep, Om, 0.0), axis=1)
        ph.dt[f] = 2.0 * math.pi / (sp * np.maximum(om_s, 1e-30))
        # a phase with no kept mode: sample by the window instead
        none = om_s <= 0.0
        ph.dt[f[none]] = t_end[f[none]] / 64.0


    def gap(self, idx: np.ndarray, t: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Gap c·x and its rate at phase times ``t`` (cases idx; t (n,) or (n, G))."""
        ph = self.ph
        tt = t if t.ndim == 2 else t[:, None]
        arg = ph.Om[idx][:, None, :] * tt[:, :, None]
        cs, sn = np.cos(arg), np.sin(arg)
        ga, gb, Om = ph.ga[idx][:, None, :], ph.gb[idx][:, None, :], ph.Om[idx][:, None, :]
        l_u, w_u = ph.l_u[idx][:, None], ph.w_u[idx][:, None]
        gv = ph.g0[idx][:, None] + l_u * tt + w_u * tt**2 + np.sum(ga * cs + gb * sn, axis=2)
        gd = l_u + 2.0 * w_u * tt + np.sum((gb * cs - ga * sn) * Om, axis=2)
        return (gv, gd) if t.ndim == 2 else (gv[:, 0], gd[:, 0])

    def event_fn(self, idx: np.ndarray, which: np.ndarray, t: np.ndarray) -> np.ndarray:
        """The ending function of each case's phase at phase times t (> 0 once the
        phase has ended): 0 separation, 1 yield, 2 unloading, 3 stroke, 4 contact."""
        k, p, cap, gap = self.k, self.p, self.cap, self.gap
        gv, gd = gap(idx, t)
        F = k[idx] * (gv - p[idx])
        return np.select([which == 0, which == 1, which == 2, which == 3],
                         [-F, F - cap[idx], -gd, gv - cap[idx] / k[idx] - p[idx]],
                         gv - p[idx])

    def outputs(self, idx: np.ndarray, t: np.ndarray) -> np.ndarray:
        """The outputs at phase times t (cases idx; t (n,)) → (n, Q)."""
        ph = self.ph
        arg = ph.Om[idx] * t[:, None]
        z = ph.A[idx] * np.cos(arg) + ph.B[idx] * np.sin(arg)
        return ph.yc[idx] + np.einsum("pj,pqj->pq", z, ph.CV[idx])

    def state(self, idx: np.ndarray, t: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """x and ẋ at phase times t (cases idx)."""
        ph = self.ph
        arg = ph.Om[idx] * t[:, None]
        cs, sn = np.cos(arg), np.sin(arg)
        A, B, Om = ph.A[idx], ph.B[idx], ph.Om[idx]
        xv = ph.s[idx] + np.einsum("pij,pj->pi", ph.V[idx], A * cs + B * sn)
        xdv = np.einsum("pij,pj->pi", ph.V[idx], (B * cs - A * sn) * Om)
        xv[:, 0] += ph.l_u[idx] * t + ph.w_u[idx] * t**2
        xdv[:, 0] += ph.l_u[idx] + 2.0 * ph.w_u[idx] * t
        return xv, xdv

    def fold(self, idx: np.ndarray, Y: np.ndarray) -> None:
        """Fold outputs (n, Q) into the peaks."""
        pk, sl = self.pk, self.sl
        pk[idx, 0] = np.maximum(pk[idx, 0], Y[:, 0])
        for j, key in enumerate(("D", "M", "V"), start=1):
            pk[idx, j] = np.maximum(pk[idx, j], np.abs(Y[:, sl[key]]).max(axis=1))
        # the end sections x = 0 and x = L (the first and the last of the equal
        # intervals, before the two beside the load): the support reactions
        V = Y[:, sl["V"]]
        ends = np.maximum(np.abs(V[:, 0]), np.abs(V[:, self.S - 3]))
        pk[idx, 4] = np.maximum(pk[idx, 4], ends)

    def round(self) -> None:
        """One round over the active cases: samples of each phase, its end (an event or
        the window's end) found exactly, the peaks folded, the phases advanced. Fast
        (bounded search): a free phase first leaps the samples where neither a peak
        nor a landing can fall (:meth:`_leap`), and only the outputs whose bound can
        still beat their peak are evaluated (:meth:`_fold_live`)."""
        idx = np.flatnonzero(self.active)
        if self.fast:
            self._leap(idx)
        dt, ts, cs, sn, which, i_ev, G = self._scan(idx)
        t_cut, ev_which, stop, nvalid = self._cut(idx, ts, which, i_ev, G)
        if self.fast:
            self._fold_live(idx, cs, sn, nvalid, G)
        else:
            self._fold_samples(idx, ts, cs, sn, nvalid, G)
        self._fold_cut(idx, t_cut)
        self._advance(idx, dt, ts, t_cut, ev_which, stop, nvalid)

    def _set_bounds(self, idx: np.ndarray) -> None:
        """The bounds of the phase just set (cases idx): for each output
        |y_c| + Σⱼ|CV_qj|·√(Aⱼ² + Bⱼ²) over the sampled harmonics, plus the tail
        added to its peak — no sample of the phase, nor its parabola's top, folds
        more, barring the parabola's overshoot (module docstring); and for the gap
        Σⱼ√(gaⱼ² + gbⱼ²) over every harmonic (the landing's test takes them all)."""
        ph = self.ph
        r = np.hypot(ph.As[idx], ph.Bs[idx])  # (n, J)
        self.bnd[idx] = (np.abs(ph.yc[idx]) + np.einsum("pqj,pj->pq", np.abs(ph.CV[idx]), r)
                         + ph.tail[idx])
        self.gbnd[idx] = np.hypot(ph.ga[idx], ph.gb[idx]).sum(axis=1)

    def live(self, idx: np.ndarray) -> np.ndarray:
        """(n, Q): the outputs whose bound this phase can still beat the peak they
        fold into (:meth:`_peaks`)."""
        return self.bnd[idx] > self._peaks(idx)

    def _leap(self, idx: np.ndarray) -> None:
        """Free phases leap whole sample spacings to the first time the load could land:
        the gap c·x − p ≤ g₀ − p + l·τ + w·τ² + Σⱼ√(gaⱼ² + gbⱼ²) (w = W/(2M) > 0),
        so no landing falls between the roots τ₁ < τ₂ of the right-hand side; a case
        at τ in [τ₁, τ₂] goes on from the last sample before τ₂ (on its own grid: the
        samples after it are the stepping run's), or the window's end, and the peaks
        of the samples leapt are found by :meth:`_fold_span`."""
        ph, tau = self.ph, self.tau
        f = idx[self.kind[idx] == _FREE]
        if f.size == 0:
            return
        w, lu = ph.w_u[f], ph.l_u[f]
        c0 = ph.g0[f] - self.p[f] + self.gbnd[f]
        disc = lu * lu - 4.0 * w * c0
        with np.errstate(invalid="ignore", divide="ignore"):
            sq = np.sqrt(np.maximum(disc, 0.0))
            # the roots, stably (Numerical Recipes 3rd ed. §5.6)
            q_ = -0.5 * (lu - sq)
            r2 = np.where(q_ > 0.0, q_ / w, 0.0)
            r1 = np.where(q_ > 0.0, c0 / q_, 0.0)
        t_stop = np.maximum(self.t_end[f] - self.t0[f], tau[f])
        ok = (disc > 0.0) & (r1 <= tau[f]) & (tau[f] < r2) & (w > 0.0)
        dt = ph.dt[f]
        target = np.minimum(r2, t_stop)
        n = np.where(ok, np.floor((target - tau[f]) / dt), 0.0)
        n = np.maximum(n - 1.0, 0.0)  # short of the bound's root and the window's end
        go = n >= _BLOCK
        if not go.any():
            return
        g, ng = f[go], n[go].astype(int)
        self._fold_span(g, ng)
        self.leaps[g] += ng
        self.samples[g] += ng
        tau[g] = tau[g] + ng * dt[go]
        self.expect[g, _FREE] = 16.0

    def _fold_span(self, f: np.ndarray, n: np.ndarray) -> None:
        """The peaks of the live outputs (:meth:`live`) over the next n[i] samples of
        the free phases f (phase times τ + g·dt, g = 0…n−1), case by case as one
        product (outputs × harmonics) · (harmonics × samples) (worked out in products
        of :data:`_GEMM_ONE_THREAD` multiply-adds), in pieces of :data:`_SPAN` samples
        overlapping by one; each output's largest sample of a piece, refined by the
        parabola through it and its neighbours where it is a top of the samples, plus
        the tail (as :meth:`_fold_samples` folds a round)."""
        ph = self.ph
        live = self.live(f)
        for k, i in enumerate(f.tolist()):
            q = np.flatnonzero(live[k])
            N = int(n[k])
            if q.size == 0 or N == 0:
                continue
            # the harmonics sampled that reach a live output
            jj = np.flatnonzero(np.any(ph.CV[i][q] != 0.0, axis=0)
                                & ((ph.As[i] != 0.0) | (ph.Bs[i] != 0.0)))
            J = jj.size
            CV = ph.CV[i][np.ix_(q, jj)]
            yc, tail = ph.yc[i][q], ph.tail[i][q]
            force = q == 0
            dt = ph.dt[i]
            # the samples 0…N are folded here (N is where the next round starts), their
            # neighbours −1 (after the phase's first sample) and N + 1 (still before
            # the landing's bound and the window's end: the leap stops two samples
            # short) taken too, so that a crest at 0 or N is refined here
            first = 0 if self.tau[i] > 0.0 else 1
            span = _SPAN
            piece = max(64, _GEMM_ONE_THREAD // max(q.size * J, 1))
            CVt = np.ascontiguousarray(CV.T)
            for g0 in range(0, N + 1, span):
                lo = max(g0 - 1, -1 + first)
                hi = min(g0 + span + 1, N + 2)
                if J:
                    z = _harmonics(ph.Om[i][jj], float(self.tau[i]) + lo * dt, float(dt),
                                   hi - lo, ph.As[i][jj], ph.Bs[i][jj])  # (G, J)
                    Yt = np.empty((hi - lo, q.size))
                    for c in range(0, hi - lo, piece):  # products of one thread's size
                        np.matmul(z[c:c + piece], CVt, out=Yt[c:c + piece])
                    Y = Yt.T + yc[:, None]
                else:
                    Y = np.repeat(yc[:, None], hi - lo, axis=1)
                Ya = np.where(force[:, None], Y, np.abs(Y))
                a0 = g0 - lo  # the piece's own samples: [a0, a1)
                a1 = min(g0 + span, N + 1) - lo
                best = _crest_peaks(Ya, a0, a1)
                full = np.full((1, self.Q), -np.inf)
                full[0, q] = best + tail
                self._fold_values(np.array([i]), full)

    def _peaks(self, idx: np.ndarray) -> np.ndarray:
        """(n, Q): the peak each output folds into (the force's, its family's; for the
        end sections the smaller of the shear's and the reaction's)."""
        pk, sl, S = self.pk[idx], self.sl, self.S
        peak = np.empty((idx.size, self.Q))
        peak[:, 0] = pk[:, 0]
        for j, key in enumerate(("D", "M", "V"), start=1):
            peak[:, sl[key]] = pk[:, j, None]
        v0 = sl["V"].start
        for q in (v0, v0 + S - 3):
            peak[:, q] = np.minimum(pk[:, 3], pk[:, 4])
        return peak

    def _scan(self, idx: np.ndarray) -> tuple:
        """G samples of each active case's phase (its own spacing ``dt``): the phase
        times ``ts``, the harmonics' cos/sin and the first sample past an event
        (``which``: 0 separation, 1 yield, 2 unloading, 3 stroke, 4 contact; ``i_ev``, G
        none)."""
        W, k, s_y, p, cap, kind = self.W, self.k, self.s_y, self.p, self.cap, self.kind
        tau, expect, ph = self.tau, self.expect, self.ph
        G = int(np.clip(2.0 * expect[idx, kind[idx]].max(), 16,
                        max(16, min(4096, _BUDGET // idx.size))))
        gg = np.arange(G, dtype=float)
        dt = ph.dt[idx]
        ts = tau[idx][:, None] + dt[:, None] * gg[None, :]  # (n, G) phase times
        if self.fast:
            cs, sn = _rotations(ph.Om[idx], tau[idx], dt, G)
        else:
            arg = ph.Om[idx][:, None, :] * ts[:, :, None]
            cs, sn = np.cos(arg), np.sin(arg)
        Om, ga, gb = ph.Om[idx][:, None, :], ph.ga[idx][:, None, :], ph.gb[idx][:, None, :]
        l_u, w_u = ph.l_u[idx][:, None], ph.w_u[idx][:, None]
        gv = ph.g0[idx][:, None] + l_u * ts + w_u * ts**2 + np.sum(ga * cs + gb * sn, axis=2)
        gd = l_u + 2.0 * w_u * ts + np.sum((gb * cs - ga * sn) * Om, axis=2)
        kd = kind[idx][:, None]
        Fv = k[idx][:, None] * (gv - p[idx][:, None])
        capi = cap[idx][:, None]
        tol = 1e-9 * np.maximum(capi, W[idx][:, None])
        which = np.full(ts.shape, -1)
        cont = kd == _CONTACT
        which = np.where(cont & (Fv < -1e-12 * W[idx][:, None]), 0, which)
        which = np.where(cont & (which < 0) & (Fv > capi + tol), 1, which)
        cr = kd == _CRUSH
        p_now = gv - capi / k[idx][:, None]
        which = np.where(cr & (gd < 0.0), 2, which)
        which = np.where(cr & (which < 0) & (p_now >= s_y[idx][:, None]), 3, which)
        which = np.where((kd == _FREE) & (gv - p[idx][:, None] > 0.0), 4, which)
        which[:, 0] = -1
        hit = which >= 0
        i_ev = np.where(hit.any(axis=1), np.argmax(hit, axis=1), G)
        return dt, ts, cs, sn, which, i_ev, G

    def _cut(self, idx: np.ndarray, ts: np.ndarray, which: np.ndarray,
             i_ev: np.ndarray, G: int) -> tuple:
        """Where each case's samples end: the event's time by bisection of the closed
        form within its bracket, then a secant step, or the window's end; the
        samples before it counted."""
        t_end, t0, tau, samples = self.t_end, self.t0, self.tau, self.samples
        event_fn = self.event_fn
        # the window's end
        t_stop = np.maximum(t_end[idx] - t0[idx], tau[idx])
        # the event's time by bisection of the closed form within its bracket
        has = i_ev < G
        t_cut = np.where(has, np.inf, ts[:, -1])
        ev_which = np.full(idx.size, -1)
        if has.any():
            r = np.flatnonzero(has)
            ii = idx[r]
            wh = which[r, i_ev[r]]
            lo = ts[r, i_ev[r] - 1]
            hi = ts[r, i_ev[r]]
            if self.fast:
                lo, hi, f_lo, f_hi = self._newton_bracket(ii, wh, lo, hi)
            else:
                for _ in range(_BISECT):
                    mid = 0.5 * (lo + hi)
                    up = event_fn(ii, wh, mid) > 0.0
                    hi = np.where(up, mid, hi)
                    lo = np.where(up, lo, mid)
                f_lo, f_hi = event_fn(ii, wh, lo), event_fn(ii, wh, hi)
            with np.errstate(divide="ignore", invalid="ignore"):
                sec = lo + (hi - lo) * (-f_lo) / (f_hi - f_lo)
            t_cut[r] = np.where((f_lo <= 0.0) & (f_hi > f_lo) & np.isfinite(sec),
                                np.clip(sec, lo, hi), hi)
            ev_which[r] = wh
        stop = t_stop <= t_cut
        t_cut = np.minimum(t_cut, t_stop)
        ev_which = np.where(stop, -1, ev_which)
        nvalid = np.sum(ts <= t_cut[:, None], axis=1)
        samples[idx] += nvalid
        return t_cut, ev_which, stop, nvalid

    def _event_terms(self, ii: np.ndarray, wh: np.ndarray) -> tuple:
        """What the event functions of the cases ``ii`` (their events ``wh``) need at
        any time, gathered once: Ω, the gap's harmonic, linear and quadratic terms,
        and each event function as f = α·gap + β·ġap + γ (the gap's rate standing in
        for the unloading's −ġap; :meth:`event_fn`'s five, written so that
        f' = α·ġap + β·g̈ap)."""
        ph, k, p, cap = self.ph, self.k[ii], self.p[ii], self.cap[ii]
        one = np.ones(ii.size)
        zero = np.zeros(ii.size)
        with np.errstate(invalid="ignore"):
            alpha = np.select([wh == 0, wh == 1, wh == 2], [-k, k, zero], one)
            beta = np.where(wh == 2, -one, zero)
            gamma = np.select([wh == 0, wh == 1, wh == 2, wh == 3],
                              [k * p, -k * p - cap, zero, -cap / k - p], -p)
        return (ph.Om[ii], ph.ga[ii], ph.gb[ii], ph.g0[ii], ph.l_u[ii], ph.w_u[ii],
                alpha, beta, gamma)

    @staticmethod
    def _event_value(terms: tuple, r: np.ndarray,
                     t: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """The event function f and its rate f' of the rows ``r`` of ``terms``
        (:meth:`_event_terms`) at phase times t: the gap g0 + l·τ + w·τ² +
        Σ(ga cos Ωτ + gb sin Ωτ) and its first two derivatives, in closed form."""
        Om, ga, gb, g0, l_u, w_u, alpha, beta, gamma = (x[r] for x in terms)
        arg = Om * t[:, None]
        cs, sn = np.cos(arg), np.sin(arg)
        hv = ga * cs + gb * sn
        gv = g0 + l_u * t + w_u * t * t + hv.sum(axis=1)
        gd = l_u + 2.0 * w_u * t + np.sum(Om * (gb * cs - ga * sn), axis=1)
        gdd = 2.0 * w_u - np.sum(Om * Om * hv, axis=1)
        return alpha * gv + beta * gd + gamma, alpha * gd + beta * gdd

    def _newton_bracket(self, ii: np.ndarray, wh: np.ndarray, lo: np.ndarray,
                        hi: np.ndarray) -> tuple[np.ndarray, ...]:
        """The bracket [lo, hi] of each event (f(lo) ≤ 0 < f(hi), f = :meth:`event_fn`)
        narrowed to 2⁻²² of its width, as the stepping run's 22 bisections narrow it,
        by Newton's method on the closed form kept inside the bracket and falling back
        to a bisection where a step would leave it or not halve it (*rtsafe*:
        Press et al., *Numerical Recipes* 3rd ed., §9.4); the root is then bracketed
        by two probes ½·2⁻²² of the width either side. The function's rate is exact
        (the gap's derivatives in closed form), so about 3 steps and one pair of
        probes instead of 22 bisections. Returns lo, hi, f(lo), f(hi)."""
        terms = self._event_terms(ii, wh)
        allr = np.arange(ii.size)
        f_lo, _ = self._event_value(terms, allr, lo)
        f_hi, _ = self._event_value(terms, allr, hi)
        tol = (hi - lo) * 2.0**-_BISECT
        ok = (f_lo <= 0.0) & (f_hi > 0.0)  # else: bisection all the way, as before
        with np.errstate(divide="ignore", invalid="ignore"):
            sec = lo - f_lo * (hi - lo) / (f_hi - f_lo)  # start at the chord's root
        t = np.where(ok & (sec > lo) & (sec < hi), sec, 0.5 * (lo + hi))
        dx_old = hi - lo
        act = np.flatnonzero(hi - lo > tol)
        for _ in range(4 * _BISECT):
            if act.size == 0:
                break
            ft, dft = self._event_value(terms, act, t[act])
            up = ft > 0.0
            hi[act] = np.where(up, t[act], hi[act])
            f_hi[act] = np.where(up, ft, f_hi[act])
            lo[act] = np.where(up, lo[act], t[act])
            f_lo[act] = np.where(up, f_lo[act], ft)
            a_lo, a_hi = lo[act], hi[act]
            with np.errstate(divide="ignore", invalid="ignore"):
                step = ft / dft
                tn = t[act] - step
            # Newton where it stays strictly inside the bracket and the step at least
            # halves against the one before; else a bisection
            newton = (ok[act] & np.isfinite(tn) & (tn > a_lo) & (tn < a_hi)
                      & (np.abs(step) < 0.5 * dx_old[act]))
            tn = np.where(newton, tn, 0.5 * (a_lo + a_hi))
            dx_old[act] = np.where(newton, np.abs(step), 0.5 * (a_hi - a_lo))
            # converged: bracket the root by two probes half the tolerance either side
            near = newton & (np.abs(step) <= 0.25 * tol[act])
            if near.any():
                r = act[near]
                p_lo = np.maximum(tn[near] - 0.5 * tol[r], lo[r])
                p_hi = np.minimum(tn[near] + 0.5 * tol[r], hi[r])
                both = np.concatenate([r, r])
                fp, _ = self._event_value(terms, both, np.concatenate([p_lo, p_hi]))
                fl, fh = fp[:r.size], fp[r.size:]
                got = (fl <= 0.0) & (fh > 0.0)
                rg = r[got]
                lo[rg], hi[rg], f_lo[rg], f_hi[rg] = p_lo[got], p_hi[got], fl[got], fh[got]
                # a probe on the root's side narrows the bracket all the same
                rb = r[~got]
                lo[rb] = np.where(fl[~got] <= 0.0, p_lo[~got], lo[rb])
                f_lo[rb] = np.where(fl[~got] <= 0.0, fl[~got], f_lo[rb])
                hi[rb] = np.where(fh[~got] > 0.0, p_hi[~got], hi[rb])
                f_hi[rb] = np.where(fh[~got] > 0.0, fh[~got], f_hi[rb])
                tn[near] = 0.5 * (lo[r] + hi[r])
            t[act] = tn
            act = act[(hi[act] - lo[act] > tol[act]) & (ft != 0.0)]
        return lo, hi, f_lo, f_hi

    def _fold_samples(self, idx: np.ndarray, ts: np.ndarray, cs: np.ndarray,
                      sn: np.ndarray, nvalid: np.ndarray, G: int) -> None:
        """The outputs at the valid samples folded into the peaks."""
        record, Q, t0, ph, rec, S = self.record, self.Q, self.t0, self.ph, self.rec, self.S
        sl, state, fold = self.sl, self.state, self.fold
        # the outputs at the valid samples, in buckets of similar length (powers of
        # two), each peak refined by a parabola through the largest and its neighbours
        z = ph.As[idx][:, None, :] * cs + ph.Bs[idx][:, None, :] * sn  # (n, G, J)
        bucket = np.ceil(np.log2(np.maximum(nvalid, 1))).astype(int)
        for bk in np.unique(bucket):
            rb = np.flatnonzero(bucket == bk)
            Gb = min(1 << int(bk), G)
            step = max(1, _CHUNK // (Q * Gb))
            for c0 in range(0, rb.size, step):
                r = rb[c0:c0 + step]
                ii = idx[r]
                nv = nvalid[r]
                # samples past the cut repeat the last valid one (no effect on a peak)
                gi = np.minimum(np.arange(Gb)[None, :], np.maximum(nv - 1, 0)[:, None])
                zb = np.take_along_axis(z[r], gi[:, :, None], axis=1)
                zb = np.concatenate([zb, np.ones((r.size, Gb, 1))], axis=2)
                CVb = np.concatenate([ph.CV[ii], ph.yc[ii][:, :, None]], axis=2)
                Y = np.einsum("mqj,mgj->mqg", CVb, zb, optimize=True)  # (m, Q, Gb)
                Fr = Y[:, 0, :].copy()
                if record:
                    Yr = Y[0].copy()
                Ya = np.abs(Y, out=Y)
                Ya[:, 0, :] = Fr
                fold(ii, _parabola_peaks(Ya, nv, Gb) + ph.tail[ii])
                if record:
                    m = nv[0]
                    rec["t"].append(t0[ii[0]] + ts[r[0], :m])
                    rec["F"].append(Yr[0, :m])
                    rec["D"].append(Yr[S - 1, :m])  # just left of the struck point
                    rec["M"].append(np.abs(Yr[sl["M"], :m]).max(axis=0))
                    rec["V"].append(np.abs(Yr[sl["V"], :m]).max(axis=0))
                    rec["U"].append(state(np.repeat(ii[:1], m), ts[r[0], :m])[0][:, 0])

    def _fold_live(self, idx: np.ndarray, cs: np.ndarray, sn: np.ndarray,
                   nvalid: np.ndarray, G: int) -> None:
        """:meth:`_fold_samples` on the live outputs only (:meth:`live`; a case's
        list padded with its other outputs, whose folding changes nothing): the
        same samples, the same parabola and tail, the same peaks, barring a dead
        output whose parabola would have overshot its own bound."""
        Q, ph = self.Q, self.ph
        live = self.live(idx)
        use = np.flatnonzero(live.any(axis=1) & (nvalid > 0))
        if use.size == 0:
            return
        bucket = np.ceil(np.log2(np.maximum(nvalid[use], 1))).astype(int)
        for bk in np.unique(bucket):
            rb = use[bucket == bk]
            Gb = min(1 << int(bk), G)
            nl = int(live[rb].sum(axis=1).max())
            step = max(1, _CHUNK // (nl * Gb))
            for c0 in range(0, rb.size, step):
                r = rb[c0:c0 + step]
                ii = idx[r]
                nv = nvalid[r]
                order = np.argsort(~live[r], axis=1, kind="stable")[:, :nl]  # (m, nl)
                z = ph.As[ii][:, None, :] * cs[r, :Gb] + ph.Bs[ii][:, None, :] * sn[r, :Gb]
                CVb = np.take_along_axis(ph.CV[ii], order[:, :, None], axis=1)
                Y = np.einsum("mqj,mgj->mqg", CVb, z, optimize=True)
                Y += np.take_along_axis(ph.yc[ii], order, axis=1)[:, :, None]
                Ya = np.where((order == 0)[:, :, None], Y, np.abs(Y))
                # samples past the cut left out (−∞: no peak, no neighbour the parabola
                # takes, which stays inside the valid run)
                Ya = np.where(np.arange(Gb)[None, None, :] < nv[:, None, None], Ya, -np.inf)
                val = _parabola_peaks(Ya, nv, Gb) + np.take_along_axis(ph.tail[ii], order,
                                                                        axis=1)
                full = np.full((r.size, Q), -np.inf)
                np.put_along_axis(full, order, val, axis=1)
                self._fold_values(ii, full)

    def _fold_values(self, idx: np.ndarray, v: np.ndarray, repeated: bool = False) -> None:
        """Fold folded values (n, Q; the force signed, the rest ≥ 0, −∞ none) into the
        peaks, as :meth:`fold` folds outputs (``repeated``: idx may repeat a case)."""
        pk, sl, S = self.pk, self.sl, self.S
        V = v[:, sl["V"]]
        cols = [v[:, 0]] + [v[:, sl[key]].max(axis=1) for key in ("D", "M", "V")]
        cols.append(np.maximum(V[:, 0], V[:, S - 3]))
        for j, col in enumerate(cols):
            if repeated:
                np.maximum.at(pk[:, j], idx, col)
            else:
                pk[idx, j] = np.maximum(pk[idx, j], col)

    def _fold_cut(self, idx: np.ndarray, t_cut: np.ndarray) -> None:
        """The outputs at the cut folded into the peaks."""
        record, t0, rec, S, sl = self.record, self.t0, self.rec, self.S, self.sl
        outputs, state, fold = self.outputs, self.state, self.fold
        # the outputs at the cut (an event, the window's end) exactly
        Ycut = outputs(idx, t_cut)
        fold(idx, Ycut)
        if record:
            rec["t"].append(t0[idx[:1]] + t_cut[:1])
            rec["F"].append(Ycut[:1, 0])
            rec["D"].append(Ycut[:1, S - 1])
            rec["M"].append(np.abs(Ycut[:1, sl["M"]]).max(axis=1))
            rec["V"].append(np.abs(Ycut[:1, sl["V"]]).max(axis=1))
            rec["U"].append(state(idx[:1], t_cut[:1])[0][:, 0])

    def _advance(self, idx: np.ndarray, dt: np.ndarray, ts: np.ndarray,
                 t_cut: np.ndarray, ev_which: np.ndarray, stop: np.ndarray,
                 nvalid: np.ndarray) -> None:
        """Each case on: past its samples, ended at the window's end, or into its next
        phase at the event (a case past :data:`MAX_EVENTS` is handed to the reference)."""
        k, s_y, c, x, xd, p = self.k, self.s_y, self.c, self.x, self.xd, self.p
        cap, kind, t0, tau, t_sep = self.cap, self.kind, self.t0, self.tau, self.t_sep
        active, events, expect = self.active, self.events, self.expect
        chatter, set_phase, state = self.chatter, self.set_phase, self.state
        # advance
        go_on = ~stop & (ev_which < 0)
        ki = kind[idx]
        expect[idx, ki] = np.where(go_on, 2.0 * expect[idx, ki],
                                   np.maximum(nvalid + (tau[idx] - 0.0) / dt, 8.0))
        # the next round starts on this round's last but one sample, so that its last
        # sample, a crest perhaps, has both neighbours in the next (_crest_peaks)
        tau[idx[go_on]] = ts[go_on, -2]
        active[idx[stop]] = False
        ch = ev_which >= 0
        if ch.any():
            r = np.flatnonzero(ch)
            ii = idx[r]
            xv, xdv = state(ii, t_cut[r])
            x[ii], xd[ii] = xv, xdv
            t0[ii] += t_cut[r]
            tau[ii] = 0.0
            wh = ev_which[r]
            events[ii] += 1
            first = (wh == 0) & np.isnan(t_sep[ii])
            t_sep[ii[first]] = t0[ii[first]]
            # new phases: separation → free; yield → crushing (or contact
            # uncapped once the set has reached the stroke); unloading → contact with
            # the set fixed; stroke → contact uncapped; contact → contact
            gcur = np.einsum("pi,pi->p", c[ii], xv)
            new = np.select([wh == 0, wh == 1, wh == 4], [_FREE, _CRUSH, _CONTACT], _CONTACT)
            at_stroke = (wh == 1) & (p[ii] >= s_y[ii])
            new = np.where(at_stroke, _CONTACT, new)
            cap[ii[at_stroke]] = np.inf
            unl = wh == 2
            p[ii[unl]] = gcur[unl] - cap[ii[unl]] / k[ii[unl]]
            stk = wh == 3
            p[ii[stk]] = s_y[ii[stk]]
            cap[ii[stk]] = np.inf
            kind[ii] = new
            over = events[ii] > MAX_EVENTS
            chatter[ii[over]] = True
            active[ii[over]] = False
            set_phase(ii[~over])

    def result(self) -> dict:
        """The peaks and what the caller reads of the run."""
        k, F_y, record, c, x, p = self.k, self.F_y, self.record, self.c, self.x, self.p
        cap, kind, t_sep, events = self.cap, self.kind, self.t_sep, self.events
        samples, chatter, pk, ph = self.samples, self.chatter, self.pk, self.ph
        rec = self.rec
        crush = np.where(np.isfinite(F_y) & (kind == _CRUSH),
                         np.einsum("pi,pi->p", c, x) - cap / k, p)
        history = None
        if record:
            t = np.concatenate(rec["t"])
            # rounds overlap (a round starts on the last but one sample of the one
            # before): each time once, in order
            keep = np.ones(t.size, bool)
            keep[1:] = t[1:] > np.maximum.accumulate(t)[:-1]
            col = {key: np.concatenate(rec[key])[keep] for key in ("F", "D", "M", "V", "U")
                   if rec[key]}
            t = t[keep]
            history = History(t=t, contact_force=col["F"], deflection=col["D"],
                              moment=col["M"], shear=col["V"],
                              load_displacement=col.get("U", np.zeros_like(t)))
        return {"force": pk[:, 0], "deflection": pk[:, 1], "moment": pk[:, 2], "shear": pk[:, 3],
                "reaction": pk[:, 4], "t_separation": t_sep, "dt": ph.dt.copy(),
                "crush": np.maximum(crush, 0.0),
                "samples": samples, "chatter": chatter, "history": history, "events": events,
                "leapt": self.leaps.astype(float)}


_ROT = 64  # samples per block of the rotations (:func:`_rotations`)
_BLOCK = 16  # fewest samples a leap takes (:meth:`_Integrator._leap`)
_SPAN = 8192  # samples per piece of a leap's span (:meth:`_Integrator._fold_span`)
_GEMM_ONE_THREAD = 1 << 18
"""Multiply-adds of one product of :meth:`_Integrator._fold_span` (outputs × harmonics ×
samples): a leap's span is taken in pieces this small, below the size at which the
BLAS library splits a product over threads (OpenBLAS's m·n·k threshold, 2¹⁸ —
from memory); on a busy shared 2-core machine the split product of 24 × 40 × 4096
took 16 ms against 0.26 ms on one thread (measured, this module's stop-30 study,
``docs/amplification_record.md``)."""


def _crest_peaks(Ya: np.ndarray, i0: int, i1: int) -> np.ndarray:
    """The peak of each row of samples ``Ya`` (…, n; a uniform grid, −∞ where a sample
    is not valid) over the samples i0 ≤ i < i1: the largest sample, and every crest
    among them with a finite neighbour on either side (y₋ ≤ y₀ ≥ y₊, 1 ≤ i ≤ n − 2)
    raised to the vertex of the parabola through it and its neighbours,
    y₀ + (y₊ − y₋)²/(8·(2y₀ − y₋ − y₊)), the rise at most |y₊ − y₋| (three-point vertex,
    common practice, no source). Every crest is refined, not only the largest
    sample's, so the peak of a run of samples does not depend on where the run is cut
    into rounds or pieces (stop 31; before it a crest on a round's edge, or below the
    round's largest sample, went unrefined, and a point's peaks moved by up to 6.5e-4
    with the points it ran with). A crest can beat the largest sample only where
    y₀ + |y₊ − y₋| does, so the parabola is worked out at those samples alone."""
    n = Ya.shape[-1]
    best = Ya[..., i0:i1].max(axis=-1)
    a, b = max(i0, 1), min(i1, n - 1)
    if b <= a:
        return best
    y0, ym, yp = Ya[..., a:b], Ya[..., a - 1:b - 1], Ya[..., a + 1:b + 1]
    with np.errstate(invalid="ignore", over="ignore"):
        d = np.subtract(yp, ym)
        np.abs(d, out=d)
        e = d + y0
        cand = np.nonzero(e > best[..., None])
        if cand[0].size == 0:
            return best
        c0, cm, cp, cd = y0[cand], ym[cand], yp[cand], d[cand]
        crest = (c0 >= cm) & (c0 >= cp) & np.isfinite(cm) & np.isfinite(cp)
        den = 2.0 * c0 - cm - cp
        rise = np.where(crest & (den > 0.0),
                        (cp - cm) ** 2 / (8.0 * np.where(den > 0.0, den, 1.0)), 0.0)
        top = np.where(crest, c0 + np.minimum(rise, cd), -np.inf)
    out = best.copy()
    np.maximum.at(out, cand[:-1], top)
    return out


def _parabola_peaks(Ya: np.ndarray, nv: np.ndarray, G: int) -> np.ndarray:
    """The peak of each row of samples ``Ya`` (cases × outputs × G, on a uniform grid;
    a case's first ``nv`` valid, the rest past its cut): :func:`_crest_peaks` over the
    valid samples, a crest refined where both its neighbours are valid."""
    valid = np.arange(G)[None, None, :] < np.asarray(nv)[:, None, None]
    return _crest_peaks(np.where(valid, Ya[..., :G], -np.inf), 0, G)


def _harmonics(Om: np.ndarray, tau: float, dt: float, G: int, A: np.ndarray,
               B: np.ndarray) -> np.ndarray:
    """A·cos Ω(τ + g·dt) + B·sin Ω(τ + g·dt), g = 0…G−1, of one case's harmonics (Ω, A,
    B (J,)) → (G, J): Re((A − iB)·e^{iΩ(τ + 64b·dt)}·e^{iΩs·dt}) with g = 64·b + s, the
    rotations of :func:`_rotations` with the amplitudes folded into the 64-sample
    blocks' factor (two real products a sample and harmonic instead of a complex
    product and two more)."""
    J = Om.size
    Bk = min(_ROT, G)
    nb = -(-G // Bk)
    s = np.arange(Bk, dtype=float)
    b = np.arange(nb, dtype=float)
    inner = np.exp(1j * (Om[None, :] * (dt * s[:, None])))  # (Bk, J)
    outer = (A - 1j * B)[None, :] * np.exp(1j * (Om[None, :] * (tau + Bk * dt * b[:, None])))
    z = (outer.real[:, None, :] * inner.real[None, :, :]
         - outer.imag[:, None, :] * inner.imag[None, :, :])
    return z.reshape(nb * Bk, J)[:G]


def _rotations(Om: np.ndarray, tau: np.ndarray, dt: np.ndarray,
               G: int) -> tuple[np.ndarray, np.ndarray]:
    """cos and sin of Ωⱼ·(τ + g·dt), g = 0…G−1, per case (Ω (n, J), τ and dt (n,))
    → two (n, G, J) arrays, as e^{iΩ(τ + 64·b·dt)}·e^{iΩ·s·dt} with g = 64·b + s:
    (64 + G/64)·J complex exponentials instead of 2·G·J cos and sin; the same
    angles to a few ulps of Ω·t (the sums of angles)."""
    n, J = Om.shape
    B = min(_ROT, G)
    nb = -(-G // B)
    s = np.arange(B, dtype=float)
    b = np.arange(nb, dtype=float)
    inner = np.exp(1j * (Om[:, None, :] * (dt[:, None, None] * s[None, :, None])))
    outer = np.exp(1j * (Om[:, None, :] * (tau[:, None, None]
                                           + (B * dt)[:, None, None] * b[None, :, None])))
    e = (outer[:, :, None, :] * inner[:, None, :, :]).reshape(n, nb * B, J)[:, :G]
    return e.real, e.imag
