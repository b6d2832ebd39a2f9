"""A load dropped on a crushable layer over a floor with mass: the exact history of
the two-mass system, phase by phase in closed form (the framing's peak under a
crushing pad: the reference of the default path's table, :mod:`droprig.solver.crush_table`,
built by scripts/build_crush_table.py; see Cost).

The system (x downward from the instant of first contact, m; the floor's own weight
in equilibrium at x2 = 0): the load, mass M (kg, weight W = M·g), strikes at v0
(m/s) the layer lying on the floor's mass m2 (kg) on the framing's stiffness k2
(N/m). Between them the contact spring k_c (N/m: the load's underside, the deck)
is in series with a rigid–plastic layer (crush force F_c, N; stroke s_c, m): an
elastic–perfectly plastic, no-tension connector with permanent set p (m):

    M·x1'' = W − F,   m2·x2'' = F − k2·x2,
    F = k_c·(x1 − x2 − p) in contact (0 ≤ F ≤ F_c while p < s_c; uncapped once the
    stroke is spent), F = 0 apart, and p grows at x1' − x2' while F = F_c.

Each phase has an exact solution (Biggs, *Introduction to Structural Dynamics*,
1964, ch. 2 and 5; Clough & Penzien, *Dynamics of Structures*, ch. 2–4 for one
degree of freedom, ch. 9–12 for the modes of two — from memory):

* **elastic** (contact, p fixed): two modes about the static position
  x2s = W/k2, x1s = x2s + p + W/k_c. The eigenvalues λ of
  M·m2·λ² − (k_c·m2 + (k_c + k2)·M)·λ + k_c·k2 = 0, shapes (1, r) with
  r = 1 − λ·M/k_c, modal masses M + m2·r²; each modal coordinate
  q = q0·cos ωt + (q̇0/ω)·sin ωt, q0 = (M·y1 + m2·r·y2)/(M + m2·r²) (y the
  deviation from the static position). F = W + k_c·Σ(1 − r)·q,
  x2 = x2s + Σ r·q. It ends where F reaches F_c (a crush; not once the stroke is
  spent) or 0 (the load leaves the floor);
* **crushing** (F = F_c): the load decelerates uniformly, x1'' = (W − F_c)/M; the
  floor is a single degree of freedom under the constant F_c,
  x2 = F_c/k2 + (x2₀ − F_c/k2)·cos ω₂t + (v2₀/ω₂)·sin ω₂t, ω₂ = √(k2/m2) (Biggs
  ch. 2's suddenly applied force); p = x1 − x2 − F_c/k_c. It ends where the
  closing speed x1' − x2' comes down to 0 (elastic unloading with the set p) or p
  reaches the stroke s_c (then elastic, uncapped: bottoming out);
* **apart** (F = 0): the load falls freely, x1'' = g; the floor vibrates freely about
  0. It ends where the gap closes, x1 − x2 = p.

Events are found vectorised over the cases: each phase is sampled on a grid (16
samples per period of its highest frequency, or finer where its end is nearer), the
first sample past the event brackets it and :data:`BISECT` bisections of the closed
form place it (to 2⁻⁴⁰ of a sample spacing); the framing's largest deflection in a
phase is its largest sample refined by Newton's method on x2' = 0 (exact for the
one-harmonic phases).

**Window and stopping rules.** The history is followed to the end of a window, two
periods of the elastic system's lower mode after the last crushing phase ends
(:data:`WINDOW`, the scipy reference's; as :mod:`droprig.solver.exacthistory` takes
its reference's window), or to one of the rules below; ``F_frame`` is the largest
framing force inside it. Undamped, a later beat of the two modes, or a load bouncing
on a soft contact, could still raise the peak; real floors damp that, and ``F_all``
states what it could reach at most over all later time:

1. an elastic phase that can never end: with the modal amplitudes R (m), the contact
   force stays within W ± k_c·Σ|1 − r|·R, and where that lies in [0, F_c] (or in
   [0, ∞) once bottomed) the case stays in this phase for ever; its framing peak is
   then at most x2s + Σ|r|·R, the supremum over all time of an undamped two-mode
   vibration (reached arbitrarily closely for incommensurate frequencies);
2. the energy bound: with E' = ½M·v1² + ½m2·v2² + ½k2·x2² + ½k_c·e² − W·(x2 + e)
   (e = x1 − x2 − p the contact's compression, its term 0 apart), dE'/dt =
   −(F_c − W)·p' ≤ 0, and ½k_c·e² − W·e ≥ −W²/(2k_c), so ½k2·x2² − W·x2 ≤
   E' + W²/(2k_c) at every later time: the framing's force k2·x2 can no longer pass
   W + √(W² + 2k2·E' + k2·W²/k_c). Once that is at most the peak found, the case
   stops (its peak can no longer grow); where the window ends otherwise, ``F_all``
   is this bound (or rule 1's supremum, where the last phase never ends);
3. a case with more than :data:`MAX_PHASES` phases, or an elastic phase with no end
   inside :data:`HORIZON` periods of its lower mode that rule 1 does not close, is
   given that energy bound as ``F_frame`` too (``bounded``): safe, not tight.

The model, its springs and masses are those of the scipy time history the tests
check it against (tests/solver/test_after_bottoming.py ``_history``). SI units: N, m, kg, s.

Cost: about 0.6–0.7 ms a case where the contact is softer than ~10 × the framing and
3–4 ms where it is stiffer (a fast mode sampled over the slow one's window, and many
short re-crushes); the chain's default path meets ~40 000 crushing cases per demo
analysis (its height searches), so the default reads its dimensionless table
(:mod:`droprig.solver.crush_table`, as :func:`droprig.solver.struck_mass.envelope_two_forces`
reads its envelope) and this module is the reference the table is built from and
checked against (0.6–20 ms a case over the table's whole box).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import cast

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver.impact import G

__all__ = ["BISECT", "HORIZON", "MAX_PHASES", "CrushHistory", "crush_history"]

SAMPLES = 16
"""Samples per period of a phase's highest frequency (events bracketed, peaks
refined by Newton's method)."""
CHUNK = 64
"""Samples per case and round of the search for a phase's end."""
BISECT = 40
"""Bisections of a bracketing sample interval (to 2⁻⁴⁰ of a spacing)."""
HORIZON = 4.0
"""Periods of the lower mode an elastic phase is searched for its end before the
case is given the energy bound (stopping rule 3)."""
WINDOW = 2.0
"""Periods of the elastic system's lower mode the history is followed after the last
crushing phase ends (or after first contact where the layer never crushes): the
window of the scipy reference's (two periods after the pad's crush)."""
MAX_PHASES = 400
"""Phases per case before it is given the energy bound (stopping rule 3)."""

_ELASTIC, _CRUSH, _APART, _DONE = 0, 1, 2, 3
CRUSH_SAMPLES = 1_000_000
"""Samples a crushing phase is searched for its end where the layer's force does
not exceed the load's weight (no time bound follows from the deceleration)."""

Event = Callable[[np.ndarray, np.ndarray], np.ndarray]
Track = Callable[[np.ndarray, np.ndarray], list[np.ndarray]]
Output = Callable[[np.ndarray, np.ndarray, int], np.ndarray]


@dataclass(frozen=True, eq=False)
class CrushHistory:
    """Peaks of :func:`crush_history`, per case: ``F_frame`` (N, k2 times the floor's
    largest deflection), ``F_contact`` (N, the connector's largest force),
    ``crush`` (m, the permanent set at the end), ``bottomed`` (the stroke was spent),
    ``bounded`` (stopping rule 3: ``F_frame`` is the energy bound), ``phases``
    (the number of phases followed), ``t_end`` (s, the window's end) and ``F_all``
    (N, an upper bound of the framing's force over all later time of the undamped
    model: stopping rules 1 and 2)."""

    F_frame: np.ndarray
    F_contact: np.ndarray
    crush: np.ndarray
    bottomed: np.ndarray
    bounded: np.ndarray
    phases: np.ndarray
    t_end: np.ndarray
    F_all: np.ndarray


def _checked(M: ArrayLike, v0: ArrayLike, F_c: ArrayLike, s_c: ArrayLike,
             k_c: ArrayLike, m2: ArrayLike, k2: ArrayLike) -> list[np.ndarray]:
    """The inputs broadcast to one flat shape; ValueError naming a field out of range."""
    arrs = [np.ravel(a).astype(float) for a in np.broadcast_arrays(
        *(np.asarray(v, float) for v in (M, v0, F_c, s_c, k_c, m2, k2)))]
    M_, v0_, F_c_, s_c_, k_c_, m2_, k2_ = arrs
    for name, a, what in (("M", M_, "the load's mass, finite > 0 kg"),
                          ("k_c", k_c_, "the contact stiffness, finite > 0 N/m"),
                          ("m2", m2_, "the floor's mass, finite > 0 kg"),
                          ("k2", k2_, "the framing's stiffness, finite > 0 N/m"),
                          ("F_c", F_c_, "the layer's crush force, finite > 0 N")):
        if not np.all(np.isfinite(a) & (a > 0.0)):
            raise ValueError(f"{name}: {what} is required")
    if not np.all(np.isfinite(v0_) & (v0_ >= 0.0)):
        raise ValueError("v0: the strike speed must be a finite number ≥ 0 m/s")
    if np.any(np.isnan(s_c_) | (s_c_ < 0.0)):
        raise ValueError("s_c: the layer's stroke must be ≥ 0 m (inf: never spent)")
    if np.any(~np.isfinite(s_c_) & (F_c_ <= M_ * G)):
        raise ValueError("F_c: a layer that crushes under the load's weight "
                         "(F_c ≤ M·g) needs a finite stroke s_c")
    return arrs


def _modes(M: np.ndarray, m2: np.ndarray, kc: np.ndarray, k2: np.ndarray
           ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Circular frequencies ω (rad/s), shapes r (x2 per unit x1) and modal masses
    (kg) of the elastic two-mass system, shape (n, 2), lower mode first."""
    b = kc * m2 + (kc + k2) * M
    disc = np.sqrt(np.maximum(b * b - 4.0 * M * m2 * kc * k2, 0.0))
    lam = np.stack([2.0 * kc * k2 / (b + disc), (b + disc) / (2.0 * M * m2)], axis=1)
    r = 1.0 - lam * (M / kc)[:, None]
    return np.sqrt(lam), r, M[:, None] + m2[:, None] * r * r


@dataclass(frozen=True, eq=False)
class _Elastic:
    """One elastic phase's closed form for a set of cases (module docstring)."""

    W: np.ndarray
    kc: np.ndarray
    x1s: np.ndarray
    x2s: np.ndarray
    w: np.ndarray
    r: np.ndarray
    a: np.ndarray  # q0, (n, 2)
    b: np.ndarray  # q̇0/ω, (n, 2)

    @staticmethod
    def at(s: dict[str, np.ndarray], i: np.ndarray) -> _Elastic:
        M, m2, kc, k2, W = (s[k][i] for k in ("M", "m2", "kc", "k2", "W"))
        w, r, mm = _modes(M, m2, kc, k2)
        x2s = W / k2
        x1s = x2s + s["p"][i] + W / kc
        y1, y2 = s["x1"][i] - x1s, s["x2"][i] - x2s
        a = (M[:, None] * y1[:, None] + m2[:, None] * r * y2[:, None]) / mm
        qd = (M[:, None] * s["v1"][i][:, None] + m2[:, None] * r
              * s["v2"][i][:, None]) / mm
        return _Elastic(W, kc, x1s, x2s, w, r, a, qd / w)

    def q(self, t: np.ndarray, d: int = 0) -> np.ndarray:
        """The modal coordinates' d-th time derivative at t (n, k): (n, k, 2)."""
        wt = self.w[:, None, :] * t[..., None]
        c, s = np.cos(wt), np.sin(wt)
        a, b = self.a[:, None, :], self.b[:, None, :]
        wd = self.w[:, None, :] ** d
        return wd * [a * c + b * s, b * c - a * s, -a * c - b * s, a * s - b * c][d]

    def force(self, t: np.ndarray, d: int = 0) -> np.ndarray:
        return (self.W[:, None] * (d == 0)
                + self.kc[:, None] * np.sum((1.0 - self.r[:, None, :]) * self.q(t, d), 2))

    def x2(self, t: np.ndarray, d: int = 0) -> np.ndarray:
        return self.x2s[:, None] * (d == 0) + np.sum(self.r[:, None, :] * self.q(t, d), 2)

    def x1(self, t: np.ndarray, d: int = 0) -> np.ndarray:
        return self.x1s[:, None] * (d == 0) + np.sum(self.q(t, d), 2)


@dataclass(frozen=True, eq=False)
class _Capped:
    """A crushing (force F on the floor: F_c) or apart (F = 0) phase: the load under
    a constant acceleration, the floor a single degree of freedom under F."""

    x10: np.ndarray
    v10: np.ndarray
    acc: np.ndarray
    xc: np.ndarray  # the floor's centre of vibration F/k2
    a: np.ndarray  # x2₀ − xc
    b: np.ndarray  # v2₀/ω₂
    w: np.ndarray

    @staticmethod
    def at(s: dict[str, np.ndarray], i: np.ndarray, F: np.ndarray) -> _Capped:
        w = np.sqrt(s["k2"][i] / s["m2"][i])
        xc = F / s["k2"][i]
        return _Capped(s["x1"][i], s["v1"][i], G - F / s["M"][i], xc, s["x2"][i] - xc,
                       s["v2"][i] / w, w)

    def x1(self, t: np.ndarray, d: int = 0) -> np.ndarray:
        x10, v10, acc = self.x10[:, None], self.v10[:, None], self.acc[:, None]
        return [x10 + v10 * t + 0.5 * acc * t * t, v10 + acc * t][d]

    def x2(self, t: np.ndarray, d: int = 0) -> np.ndarray:
        w, a, b = self.w[:, None], self.a[:, None], self.b[:, None]
        c, s = np.cos(w * t), np.sin(w * t)
        return [self.xc[:, None] + a * c + b * s, w * (b * c - a * s),
                -w * w * (a * c + b * s)][d]

    def x2_max(self, tau: np.ndarray) -> np.ndarray:
        """The largest x2 on [0, τ] (exact: the first crest inside, or an end)."""
        R = np.hypot(self.a, self.b)
        t_top = np.mod(np.arctan2(self.b, self.a), 2.0 * np.pi) / self.w
        ends = np.maximum(self.x2(np.zeros((tau.size, 1)))[:, 0],
                          self.x2(tau[:, None])[:, 0])
        return np.where(t_top <= tau, self.xc + R, ends)


def _take(obj: _Elastic | _Capped, i: np.ndarray) -> _Elastic | _Capped:
    """The phase's closed form for the cases ``i`` of it."""
    return type(obj)(*(getattr(obj, f)[i] for f in obj.__dataclass_fields__))


def _first_event(ev: Event, track: Track, dt: np.ndarray, limit: np.ndarray
                 ) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The first time τ (s) at which the event function ``ev(i, t)`` (≤ 0 before the
    event) turns positive, sampled every ``dt`` (s) up to ``limit`` samples and
    bisected :data:`BISECT` times (``inf`` where not found), and for each tracked
    output of ``track(i, t)`` (list of (n, k) arrays) the largest sample before τ and
    its time: returns ``(tau, found, best, t_best)`` (best, t_best: (m, n))."""
    n = dt.size
    tau = np.full(n, np.inf)
    live = np.ones(n, bool)
    best = np.full((0, n), -np.inf)
    t_best = np.zeros((0, n))
    j = np.arange(1, CHUNK + 1, dtype=float)
    k0 = 0
    while live.any():
        idx = np.flatnonzero(live)
        t = dt[idx, None] * (k0 + j)[None, :]
        inside = (k0 + j)[None, :] <= limit[idx, None]  # the search's last sample
        hit_k = (ev(idx, t) > 0.0) & inside
        hit = hit_k.any(axis=1)
        first = np.where(hit, np.argmax(hit_k, axis=1), CHUNK)
        before = (j[None, :] - 1 < first[:, None]) & inside  # samples before the event's
        outs = track(idx, t)
        if best.shape[0] == 0:
            best = np.full((len(outs), n), -np.inf)
            t_best = np.zeros((len(outs), n))
        for m, o in enumerate(outs):
            o = np.where(before, o, -np.inf)
            kb = np.argmax(o, axis=1)
            ob = o[np.arange(idx.size), kb]
            up = ob > best[m, idx]
            best[m, idx[up]] = ob[up]
            t_best[m, idx[up]] = t[np.arange(idx.size), kb][up]
        if hit.any():
            ih, fh = idx[hit], first[hit]
            hi = t[hit, fh]
            lo = np.where(fh > 0, t[hit, np.maximum(fh - 1, 0)], dt[ih] * k0)
            for _ in range(BISECT):
                mid = 0.5 * (lo + hi)
                up = ev(ih, mid[:, None])[:, 0] > 0.0
                hi = np.where(up, mid, hi)
                lo = np.where(up, lo, mid)
            tau[ih] = hi
            live[ih] = False
        k0 += CHUNK
        live &= k0 < limit
    return tau, np.isfinite(tau), best, t_best


def _refined_max(f: Output, i: np.ndarray, best: np.ndarray, t_best: np.ndarray,
                 dt: np.ndarray, tau: np.ndarray) -> np.ndarray:
    """The largest value of the closed form ``f(i, t, d)`` (d-th derivative) on
    [0, τ]: the largest sample (``best`` at ``t_best``) refined by four Newton steps
    on f' = 0 within a sample spacing of it, and the phase's two ends."""
    t = t_best.copy()
    lo, hi = np.maximum(t - dt, 0.0), np.minimum(t + dt, tau)
    for _ in range(4):
        d1, d2 = f(i, t[:, None], 1)[:, 0], f(i, t[:, None], 2)[:, 0]
        step = np.where(d2 < 0.0, -d1 / np.where(d2 < 0.0, d2, -1.0), 0.0)
        t = np.clip(t + step, lo, hi)
    ends = np.maximum(f(i, np.zeros((i.size, 1)), 0)[:, 0], f(i, tau[:, None], 0)[:, 0])
    return np.maximum(np.maximum(best, f(i, t[:, None], 0)[:, 0]), ends)


def _set_state(s: dict[str, np.ndarray], i: np.ndarray, ph: _Elastic | _Capped,
               tau: np.ndarray) -> None:
    """The cases' displacements and speeds at the phase's end τ."""
    t = tau[:, None]
    s["x1"][i], s["v1"][i] = ph.x1(t)[:, 0], ph.x1(t, 1)[:, 0]
    s["x2"][i], s["v2"][i] = ph.x2(t)[:, 0], ph.x2(t, 1)[:, 0]


def _elastic_phase(s: dict[str, np.ndarray], i: np.ndarray) -> None:
    """Follow the cases ``i`` through an elastic phase (module docstring): close the
    ones that stay in it for ever (stopping rule 1), find the others' end."""
    el = _Elastic.at(s, i)
    R = np.hypot(el.a, el.b)
    S = el.kc * np.sum(np.abs(1.0 - el.r) * R, axis=1)
    bot, F_c = s["bottomed"][i], s["F_c"][i]
    # rule 1: a phase that never ends; its supremum bounds all later time, and it is
    # followed (no event searched) to the window's end
    eternal = (el.W - S >= 0.0) & (bot | (el.W + S <= F_c))
    e = i[eternal]
    s["x2_sup"][e] = (el.x2s + np.sum(np.abs(el.r) * R, 1))[eternal]
    s["open"][i] = ~eternal
    dt = 2.0 * np.pi / el.w[:, 1] / SAMPLES
    left = s["t_end"][i] - s["t"][i]  # to the window's end
    limit = np.floor(np.where(eternal, left, np.minimum(HORIZON * 2.0 * np.pi
                                                        / el.w[:, 0], left)) / dt)

    def ev(k: np.ndarray, t: np.ndarray) -> np.ndarray:
        F = cast(_Elastic, _take(el, k)).force(t)
        F = np.maximum(np.where(bot[k, None], -np.inf, F - F_c[k, None]), -F)
        return np.where(eternal[k, None], -np.inf, F)

    def track(k: np.ndarray, t: np.ndarray) -> list[np.ndarray]:
        ek = cast(_Elastic, _take(el, k))
        return [ek.x2(t), ek.force(t)]

    tau, found, best, t_best = _first_event(ev, track, dt, limit)
    end = np.where(found, tau, left)  # no end found: the window's (the samples' last
    # is at most a spacing before it; the value there is taken with them)
    k = np.arange(i.size)
    x2 = _refined_max(lambda k, t, d: cast(_Elastic, _take(el, k)).x2(t, d), k,
                      best[0], t_best[0], dt, end)
    Fm = _refined_max(lambda k, t, d: cast(_Elastic, _take(el, k)).force(t, d), k,
                      best[1], t_best[1], dt, end)
    s["x2_peak"][i] = np.maximum(s["x2_peak"][i], x2)
    s["F_peak"][i] = np.maximum(s["F_peak"][i], Fm)
    # no end inside the window: done; none inside HORIZON periods before it: rule 3
    s["bounded"][i[~found & (HORIZON * 2.0 * np.pi / el.w[:, 0] < left) & ~eternal]] = True
    s["kind"][i[~found]] = _DONE
    f = np.flatnonzero(found)
    ef = _take(el, f)
    s["t"][i[f]] += tau[f]
    _set_state(s, i[f], ef, tau[f])
    F_end = cast(_Elastic, ef).force(tau[f][:, None])[:, 0]
    s["kind"][i[f]] = np.where((F_end > 0.5 * F_c[f]) & ~bot[f], _CRUSH, _APART)


def _capped_phase(s: dict[str, np.ndarray], i: np.ndarray, crushing: bool) -> None:
    """Follow the cases ``i`` through a crushing phase (F = F_c) or an apart one
    (F = 0) to its end (module docstring)."""
    F_c, s_c, kc = s["F_c"][i], s["s_c"][i], s["kc"][i]
    cp = _Capped.at(s, i, F_c if crushing else np.zeros(i.size))
    R, w = np.hypot(cp.a, cp.b), cp.w
    if crushing:
        # the closing speed v1 − v2 ≤ v1₀ + a·t + R·ω is 0 by t_max (a < 0)
        with np.errstate(divide="ignore"):
            t_max = np.where(cp.acc < 0.0, (cp.v10 + R * w) / -np.minimum(cp.acc, -1e-300),
                             np.inf)

        def ev(k: np.ndarray, t: np.ndarray) -> np.ndarray:
            c = cast(_Capped, _take(cp, k))
            p = c.x1(t) - c.x2(t) - (F_c / kc)[k, None]
            return np.maximum(c.x2(t, 1) - c.x1(t, 1), p - s_c[k, None])
    else:
        # the gap x1 − x2 − p ≥ x2₀ − R + v1₀·t + g·t²/2 is closed by t_max
        t_max = (-cp.v10 + np.sqrt(cp.v10 ** 2 + 2.0 * G * np.maximum(R - cp.a, 0.0))) / G
        p_set = s["p"][i]

        def ev(k: np.ndarray, t: np.ndarray) -> np.ndarray:
            c = cast(_Capped, _take(cp, k))
            return c.x1(t) - c.x2(t) - p_set[k, None]
    dt = 2.0 * np.pi / w / SAMPLES
    fin = np.isfinite(t_max)
    dt = np.where(fin, np.minimum(dt, t_max / SAMPLES), dt)
    dt = np.maximum(dt, 1e-300)
    limit = np.where(fin, np.ceil(t_max / dt) + 2.0, CRUSH_SAMPLES)
    tau, found, _, _ = _first_event(ev, lambda k, t: [], dt, limit)
    s["bounded"][i[~found]] = True
    s["kind"][i[~found]] = _DONE
    f = np.flatnonzero(found)
    i, cf, tau = i[f], cast(_Capped, _take(cp, f)), tau[f]
    # a flight that outlasts the window ends with it (a crush is followed to its end)
    over = np.zeros(i.size, bool) if crushing else tau > s["t_end"][i] - s["t"][i]
    s["x2_peak"][i] = np.maximum(s["x2_peak"][i], cf.x2_max(
        np.where(over, s["t_end"][i] - s["t"][i], tau)))
    s["kind"][i[over]] = _DONE
    s["open"][i[over]] = True
    _set_state(s, i, cf, tau)
    s["t"][i] += tau
    s["kind"][i] = np.where(s["kind"][i] == _DONE, _DONE, _ELASTIC)
    if crushing:
        w_lo = _modes(s["M"][i], s["m2"][i], kc[f], s["k2"][i])[0][:, 0]
        s["t_end"][i] = s["t"][i] + WINDOW * 2.0 * np.pi / w_lo
        s["F_peak"][i] = np.maximum(s["F_peak"][i], F_c[f])
        p = s["x1"][i] - s["x2"][i] - F_c[f] / kc[f]
        spent = p >= s_c[f]
        s["bottomed"][i] |= spent
        s["p"][i] = np.minimum(np.maximum(p, s["p"][i]), s_c[f])


def _energy_bound(s: dict[str, np.ndarray], i: np.ndarray) -> np.ndarray:
    """Stopping rule 2: the largest framing force (N) the cases ``i`` can still
    reach, W + √(W² + 2k2·E' + k2·W²/k_c) (module docstring)."""
    M, m2, kc, k2, W = (s[k][i] for k in ("M", "m2", "kc", "k2", "W"))
    x2, e = s["x2"][i], s["x1"][i] - s["x2"][i] - s["p"][i]
    E = (0.5 * M * s["v1"][i] ** 2 + 0.5 * m2 * s["v2"][i] ** 2 + 0.5 * k2 * x2 ** 2
         + 0.5 * kc * np.maximum(e, 0.0) ** 2 - W * (x2 + e))
    return W + np.sqrt(np.maximum(W * W + 2.0 * k2 * E + k2 * W * W / kc, 0.0))


def crush_history(M: ArrayLike, v0: ArrayLike, F_c: ArrayLike, s_c: ArrayLike,
                  k_c: ArrayLike, m2: ArrayLike, k2: ArrayLike,
                  max_phases: int = MAX_PHASES) -> CrushHistory:
    """Peaks of a load of mass M (kg) striking at v0 (m/s) a crushable layer (crush
    force F_c, N; stroke s_c, m, ``inf`` never spent) through a contact spring k_c
    (N/m) on a floor of mass m2 (kg) on the framing's stiffness k2 (N/m), from
    first contact on, phase by phase in closed form to the stopping rule (module
    docstring); vectorised over the broadcast inputs (results flat). ``max_phases``:
    the phase budget of stopping rule 3 (:data:`MAX_PHASES`; the crush table's second
    pass gives very soft contacts a larger one, scripts/build_crush_table.py).
    ValueError naming the field where an input is out of range."""
    M_, v0_, F_c_, s_c_, kc, m2_, k2_ = _checked(M, v0, F_c, s_c, k_c, m2, k2)
    n = M_.size
    z = np.zeros(n)
    s = {"M": M_, "m2": m2_, "kc": kc, "k2": k2_, "W": M_ * G, "F_c": F_c_, "s_c": s_c_,
         "x1": z.copy(), "v1": v0_.copy(), "x2": z.copy(), "v2": z.copy(), "p": z.copy(),
         "x2_peak": z.copy(), "F_peak": z.copy(), "bottomed": s_c_ <= 0.0,
         "bounded": np.zeros(n, bool), "kind": np.full(n, _ELASTIC), "t": z.copy(),
         "x2_sup": np.full(n, -np.inf), "open": np.zeros(n, bool),
         "t_end": WINDOW * 2.0 * np.pi / _modes(M_, m2_, kc, k2_)[0][:, 0]}
    if not (isinstance(max_phases, int) and max_phases >= 1):
        raise ValueError("max_phases: the phase budget must be a whole number ≥ 1")
    phases = np.zeros(n, int)
    for _ in range(max_phases):
        live = s["kind"] != _DONE
        if not live.any():
            break
        phases += live
        kinds = s["kind"].copy()
        for kind in (_ELASTIC, _CRUSH, _APART):
            i = np.flatnonzero(kinds == kind)
            if i.size == 0:
                continue
            if kind == _ELASTIC:
                _elastic_phase(s, i)
            else:
                _capped_phase(s, i, kind == _CRUSH)
        i = np.flatnonzero(s["kind"] != _DONE)
        spent = _energy_bound(s, i) <= s["k2"][i] * s["x2_peak"][i]
        s["kind"][i[spent]] = _DONE
        s["open"][i[spent]] = False
    i = np.flatnonzero((s["kind"] != _DONE) | s["bounded"])
    s["bounded"][i] = True
    F_frame = s["k2"] * s["x2_peak"]
    F_frame[i] = np.maximum(F_frame[i], _energy_bound(s, i))
    # over all later time: the supremum of a phase that never ends (rule 1), else the
    # energy bound (rule 2) where the window cut the history
    F_all = np.maximum(F_frame, s["k2"] * s["x2_sup"])
    o = np.flatnonzero(s["open"])
    F_all[o] = np.maximum(F_all[o], _energy_bound(s, o))
    return CrushHistory(F_frame=F_frame, F_contact=s["F_peak"], crush=s["p"].copy(),
                        bottomed=s["bottomed"].copy(), bounded=s["bounded"].copy(),
                        phases=phases, t_end=s["t_end"].copy(), F_all=F_all)
