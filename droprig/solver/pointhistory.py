"""Time history of the struck path at chosen drop points of a chain, and the factors
on the energy method's demands that it gives.

Idealisation: the struck member — the deck member of the load path carrying the
larger lever-rule share w — is a Timoshenko beam (its end condition, span, the
chain's EI, the web's shear stiffness κGA_v and the section's rotary inertia ρI,
:func:`timoshenko_terms`; :func:`droprig.solver.timehistory.timoshenko_modes`)
struck at its own position ``a``; everything else of the path (the other
framing and the columns, the deck's indentation and strip, the load's underside, a
spring mat) is a massless spring in series with the contact. The member sees the load
through its share (:func:`shared_load`: mass w²·M, weight w·W, speed v/w, contact
(f − w²·g_own)/w², so that its own spring and the contact's give the chain's total
compliance f at the load); with w = 1 (``droprig check``, a point on one member) the
whole load, as before. The member's mass per
length (*the mass*) is the structure's: the steel and, over a deck, the deck's
self-weight and the superimposed dead load over the member's tributary width
(:func:`droprig.solver.chain.slab_frame`, lever rule — common practice, no source —
the mass the chain's two-mass step and slab struck mass take). The deck bears on the
member and follows it in the modes that carry its moment, shear and deflection (a
beam's modal mass is the beam's plus what it supports: AISC Design Guide 11, 2nd ed.,
§3.3, the beam mode's weight w = beam + slab + superimposed dead load — from memory);
the steel's mass alone, as before stop 27, left the history lighter than the member
the verdict checks and than the chain's own energy method. The lever rule moves the
whole tributary strip at the member's speed; where the neighbouring members stay
still, less of it moves (a strip spanning to a still neighbour moves about a third
to half of its mass — common practice, no source), so the steel alone
(``droprig verify --steel-mass``) brackets it from below. Deck-less (``droprig
check``) it is the steel's. The other framing's mass is not in the time history
(raising the member's mass to the path's Rayleigh mass at the struck point was tried
and fails near a support, where the member's own Rayleigh mass goes to zero and the
ratio without bound). The contact is elastic–perfectly
plastic as the chain caps it: the crushing force of the deck concrete (or a steel
deck's indentation) over the cover (the plate), a bare flange's local yield force over
its thickness, or a crushable layer's force over its stroke
(:func:`droprig.solver.exacthistory.exact_time_history` with ``F_yield``/``stroke``,
``kGA``/``rhoI``: the Euler–Bernoulli mode shapes of Blevins 1979 Table 8-1 with
Timoshenko frequencies and shears; each phase — contact, crushing, free —
solved in closed form by modal superposition, Chopra 4th ed. §10–12; the Newmark
integration of :mod:`droprig.solver.timehistory` is its plain reference).

Factors (dimensionless, per point): A_X = :data:`TH_MARGIN` × X_th / X_e for the
contact force, the member's largest moment, shear and deflection, X_e the chain's
energy-method force F times the member's unit-load envelope (AISC Manual Table 3-23:
:func:`droprig.solver.beam.max_abs_moment`, ``max_abs_shear``, the largest G(x, a)).
A demand A_X·X_e is then at least the time history's own peak times the margin.

:data:`TH_MARGIN` comes from the convergence study of the time history
(``scripts/convergence_point_history.py``; tests/solver/test_point_history.py repeats
a part of it): the verdict's run (40 modes, cut-off 8 × the cut-off frequency, 8
samples a period, 16 sections) against a refined one (80 modes, cut-off 32, 16
samples a period, 64 sections) on random members and contacts. With each phase exact
the difference is the modal truncation and the sampling of the peaks. Before stop 32
the cut-off frequency was the contact's alone, and the verdict's run read the moment
of a 1.7 kg load on a soft crushing contact 66 % low: its contact force reached the
crushing force 1.2 × its weight in a small fraction of the contact period, a near-step
load under which modes far above 8 × the contact frequency respond dynamically (ramp
load, dynamic load factor up to 1 + 2/(ωₙ·t_r)) while the static correction of the
left-out modes takes them as static; the margin then had to be 1.75, and it, not the
structure, set the verdict of every bay of the demos with the point histories on.
Now the cut-off frequency is the faster of the contact and that rise
(:func:`droprig.solver.timehistory.rise_frequency`), and over 720 random cases
(three seeds) the verdict's run reads at most :data:`CONVERGENCE_SHORTFALL` below the
refined one (medians 1.000–1.004, 90th percentiles ≤ 1.03). The cases left are those
whose cut-off asks for more than the 40 modes kept at most (light loads on stiff or
fast-crushing contacts: the shear and moment, the refined run keeping 58–80) and a
heavy load's contact force ringing on a very stiff contact; the study's members are
Euler–Bernoulli, whose shear under a short blow converges slowest in the modes (the
verdict's member is a Timoshenko one). The margin is 1 + that shortfall + 5 %,
rounded up to 5 %.
SI units throughout.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, cast

import numpy as np
from numpy.typing import ArrayLike

from droprig.solver import amplification, beam, exacthistory, impact
from droprig.solver.beam import EndCondition
from droprig.solver.loadpath import COND_NAMES

if TYPE_CHECKING:
    from droprig.model import Grade, Section
    from droprig.solver.chain import Chain

__all__ = [
    "CAP_BY",
    "CONVERGENCE_SHORTFALL",
    "TH_MARGIN",
    "PointHistory",
    "impulse_factors",
    "member_energy_peaks",
    "merge",
    "point_history",
    "shared_load",
    "struck_member",
    "timoshenko_terms",
]

CAP_BY = ("crushing", "web", "layer")
"""What caps a point's contact force (``struck_member``'s ``cap_by`` indexes it): the
crushing of the deck under the footprint, the web's local yielding under the load, or
the crushable layer."""
CONVERGENCE_SHORTFALL = 0.263
"""Largest shortfall of the verdict's time history below the refined one (fraction),
over 720 random cases (``scripts/convergence_point_history.py 240 SEED``, seeds
20261203, 7 and 11; stop 32, the cut-off set by the contact and the rise to the
crushing force): refined ÷ verdict run, largest per seed — contact force 1.026 / 1.196
/ 1.076, moment 1.026 / 1.104 / 1.254, shear (the largest section's, which the shear
factor takes) 1.072 / 1.197 / 1.263, deflection 1.019 / 1.021 / 1.057; the end shear
1.069 / 1.197 / 1.345, below the refined section shear ÷ the run's section shear,
which the factor covers. Medians 1.000–1.004, 90th percentiles ≤ 1.03. Before stop
32 (seed 20261203): 1.026, 1.661, 1.614, 1.632."""
TH_MARGIN = 1.35
"""Margin on the time history's peaks in the verdict: 1 + :data:`CONVERGENCE_SHORTFALL`
+ 5 %, rounded up to the next 5 % (1.75 before stop 32)."""
POISSON_STEEL = 0.3
"""Poisson's ratio of structural steel (EN 1993-1-1 §3.2.6(1): ν = 0.3,
G = E/(2(1 + ν)) ≈ 81 000 N/mm² for E = 210 000 N/mm²)."""

TH_OPTIONS: dict[str, Any] = {"n_modes": 40, "cutoff": 8.0, "samples_per_period": 8}
"""The time history's settings in the verdict (``exacthistory`` defaults)."""


@dataclass(frozen=True, eq=False)
class PointHistory:
    """Per chosen point (arrays of the chosen points' length): the member modelled
    (index into the level's members), its end condition name, span L and position a
    (m), EI (N·m²), mass per length μ (kg/m), the contact compliance f_c (m/N), the
    crushing force (N, ∞ none) and stroke (m); the time history's peaks ``th`` and the
    chain's energy-method peaks ``energy`` of the same member (N, N·m, N, m; by
    :data:`droprig.solver.verification.QUANTITIES`; ``th`` also ``end_shear``, N: the
    largest |shear| at the member's ends, the support reactions, beside ``shear``, the
    largest of any section), and the factors ``factor`` (TH_MARGIN × th / energy, not
    yet floored at 1; the shear's from the section's, the larger)."""

    member: np.ndarray
    cond: np.ndarray
    L: np.ndarray
    a: np.ndarray
    EI: np.ndarray
    mu: np.ndarray
    f_c: np.ndarray
    F_yield: np.ndarray
    stroke: np.ndarray
    th: dict[str, np.ndarray]
    energy: dict[str, np.ndarray]
    factor: dict[str, np.ndarray]


QUANTITIES = ("force", "moment", "shear", "deflection")


def timoshenko_terms(section: Section, grade: Grade) -> tuple[float, float]:
    """The shear stiffness κGA_v (N) and rotary inertia ρI (kg·m) of a steel I-section
    as a Timoshenko member (:func:`droprig.solver.timehistory.timoshenko_modes`).

    κA = A_v = d·t_w, the web area the shear checks take (AISC 360-16 G2.1, A_w = d·t_w;
    an I-section's web carries its shear — Cowper, J. Appl. Mech. 33 (1966) gives κ·A
    within about 10 % of it for rolled I-sections bent about the strong axis, test
    beside it); G = E/(2(1 + ν)), ν = :data:`POISSON_STEEL`; ρI = (m/A)·I_x, the steel's
    density (mass per length over area) times the second moment of area. SI units."""
    G = grade.E / (2.0 * (1.0 + POISSON_STEEL))
    kGA = G * section.d * section.tw
    rhoI = section.mass_per_length / section.A * section.Ix
    return kGA, rhoI


def struck_member(c: Chain, sel: np.ndarray) -> dict[str, np.ndarray]:
    """The modelled member at the points ``sel`` (indices): member index, end
    condition name, L (m), a (m, kept 10⁻⁶·L off the ends), EI (N·m², the chain's:
    E·I_tr of the transformed section where the floor takes the member as composite,
    EN 1994-1-1 §5.4.2.2 / AISC 360-16 §I3, :func:`droprig.solver.composite.
    transformed_inertia`; else E·Ix), the mass per length μ (kg/m: over a deck the
    steel plus the deck's self-weight and superimposed dead load over the tributary
    width, :func:`droprig.solver.chain.slab_frame`; deck-less, the frame's — see the
    module docstring, "The mass"; ``mu_steel`` the frame's alone, 0 where the project
    leaves member mass out), the Timoshenko terms κGA_v (N) and ρI (kg·m,
    :func:`timoshenko_terms`), its share w and own compliance G(a, a) (m/N); and the
    chain's path compliance at the load f_all (m/N, the structure's under a crushable
    layer), the contact compliance beyond the
    member f_c (m/N, ≥ 0), the crushing force (N, ∞ none or not above the weight) and
    its stroke (m, :func:`droprig.solver.chain.crush_depth_available`, or the
    layer's). ``over_support`` is true where the path's own position of the member is
    over one of its supports (G = 0 there: the member does not move). The one source of
    the struck member for the chain's point histories and for
    :func:`droprig.solver.verification.verify_point`."""
    from droprig.solver.chain import (
        Compliance,
        Impact,
        LoadInputs,
        slab_frame,
    )

    d, inp, comp, imp = c.drop, c[LoadInputs], c[Compliance], c[Impact]
    path, fr = d.geo.path, d.fm.frame
    share = path.share[sel]
    k = np.where(share[:, 0] >= share[:, 1], 0, 1)
    rows = np.arange(sel.size)
    m = path.members[sel][rows, k].astype(int)
    a_path = path.a[sel][rows, k]
    L = fr.L[m]
    a = np.clip(a_path, 1e-6 * L, L * (1.0 - 1e-6))
    EI = fr.EI[m]
    mu = fr.mu[m]
    cond = np.asarray(COND_NAMES, dtype=object)[np.asarray(fr.cond, int)[m]]
    g_m = np.zeros(sel.size)
    g_path = np.zeros(sel.size)
    for cn in dict.fromkeys(cond.tolist()):
        i = cond == cn
        cc = cast(EndCondition, cn)
        g_m[i] = beam.green(cc, L[i], EI[i], a[i], a[i])
        g_path[i] = beam.green(cc, L[i], EI[i], a_path[i], a_path[i])
    crushable = inp.crushable[sel]
    f_all = np.where(crushable, comp.f_struct[sel], comp.f[sel])
    f_c = np.maximum(f_all - g_m, 0.0)
    # the mass the member moves: its steel and, over a deck, the deck's self-weight and
    # the superimposed dead load over its tributary width (chain.slab_frame, the mass
    # the chain's two-mass step takes) — module docstring, "The mass"
    mu_th = slab_frame(d.fm).mu[m] if d.bare is None else mu
    # the member as a Timoshenko beam: the web's shear stiffness and the section's
    # rotary inertia (timoshenko_terms), per distinct member
    distinct, back = np.unique(m, return_inverse=True)
    terms = np.array([timoshenko_terms(d.fm.level.members[int(mi)].section,
                                       d.fm.level.members[int(mi)].grade)
                      for mi in distinct], dtype=float).reshape(-1, 2)
    kGA, rhoI = terms[back.ravel(), 0], terms[back.ravel(), 1]
    W = inp.W[sel]
    F_y = np.where(crushable, inp.F_c[sel], imp.F_cap[sel])
    stroke = np.where(crushable, inp.s_c[sel], imp.cap_depth[sel])
    F_y = np.where(np.isfinite(F_y) & (F_y > W), F_y, np.inf)
    # what caps the contact (CAP_BY): the deck's crushing, the web's local yielding
    # under the load (chain.web_contact_bound; deck-less, the bare flange's bound,
    # chain.bare_flange_bound, the same mechanism) or the crushable layer
    web = (imp.F_cap[sel] < imp.F_crush[sel]) | (d.bare is not None)
    cap_by = np.where(crushable, 2, np.where(web, 1, 0))
    w = np.clip(share[rows, k], 0.5, 1.0)  # the larger of two shares summing to 1
    return {"member": m, "cond": cond, "L": L, "a": a, "EI": EI, "mu": mu_th, "kGA": kGA,
            "rhoI": rhoI, "mu_steel": mu, "g_m": g_m,
            "f_c": f_c, "F_yield": F_y, "stroke": stroke, "share": w, "f_all": f_all,
            "over_support": ~(g_path > 0.0), "cap_by": cap_by}


def shared_load(w: ArrayLike, M: ArrayLike, h: ArrayLike, f_all: ArrayLike,
                g_own: ArrayLike, F_yield: ArrayLike = np.inf,
                stroke: ArrayLike = np.inf) -> dict[str, np.ndarray]:
    """The load as one member sees it when the footprint shares it by the lever rule,
    in that member's own coordinate (a generalised-coordinate reduction, exact while
    the rest of the path is massless — the time history's idealisation).

    The load (mass M, kg; weight W = M·g, N; falling h, m) presses its contact (force
    F, N) on a footprint that passes w·F (w the member's lever-rule share, 0 < w ≤ 1)
    to the member at its point and the rest to the other member. The path's
    compliance at the load is f_all = w²·g_own + f_rest (m/N; ``droprig.solver.
    loadpath``: Σ w_k²·g_k + rᵀDr, plus the contact), g_own the member's own
    G(a, a). With q the member's deflection at its point and u the load's travel,
    u − w·q = F·f_rest (everything but the member in series, massless). In the
    coordinate Q = u/w, with P = w·F the force on the member:
    Q − q = P·f_rest/w², and the load's equation M·ü = W − F becomes
    (w²·M)·Q̈ = w·W − P (virtual work: P·δq = F·w·δq; kinetic energy ½·M·u̇² =
    ½·(w²M)·Q̇²). So the member sees a load of mass M_b = w²·M (kg) and weight
    W_b = w·W (N), striking at Q̇₀ = v₀/w (h_b = h/w², m: the same kinetic energy)
    through f_b = f_rest/w² = (f_all − w²·g_own)/w² (m/N); a contact that crushes
    at F_yield (N) over ``stroke`` (m of u) crushes at w·F_yield over stroke/w. The
    member's own peaks (moment, shear, deflection) are the reduced run's; its
    contact force is the load's contact force times w. With w = 1 nothing changes.
    (Lagrange's equations with a kinematic constraint, e.g. Clough & Penzien 2nd ed.
    §8-2, generalised coordinates and virtual work — from memory.)

    Returns ``M`` (kg), ``h`` (m), ``weight`` (N), ``f_c`` (m/N, ≥ 0), ``F_yield``
    (N), ``stroke`` (m). Vectorised."""
    w, M, h, f_all, g_own, Fy, sy = np.broadcast_arrays(
        *(np.asarray(v, float) for v in (w, M, h, f_all, g_own, F_yield, stroke)))
    if np.any(~((w > 0.0) & (w <= 1.0))):
        raise ValueError("w: the member's lever-rule share must lie in (0, 1]")
    f_rest = np.maximum(f_all - w**2 * g_own, 0.0)
    return {"M": w**2 * M, "h": h / w**2, "weight": w * M * impact.G,
            "f_c": f_rest / w**2, "F_yield": w * Fy, "stroke": sy / w}


def point_history(c: Chain, sel: np.ndarray, h: np.ndarray, F: np.ndarray,
                  **th_options: object) -> PointHistory:
    """The time history at the points ``sel`` (indices into the chain's points) for
    the free falls ``h`` (m, per chosen point) and the chain's energy-method contact
    force there ``F`` (N, per chosen point); factors as in the module docstring. A
    contact stiffer than :data:`droprig.solver.amplification.KAPPA_MIN` × the
    member's compliance is given that compliance (an Euler–Bernoulli member struck
    rigidly has no converged contact force; the crushing or flange-yield cap then
    bounds it)."""
    from droprig.solver.chain import LoadInputs

    inp = c[LoadInputs]
    s = struck_member(c, sel)
    w = s["share"]
    # the load as the member sees it through its lever-rule share (shared_load)
    r = shared_load(w, inp.M[sel], h, s["f_all"], s["g_m"], s["F_yield"], s["stroke"])
    f_th = np.maximum(r["f_c"], amplification.KAPPA_MIN * s["g_m"])
    peaks = _member_peaks(c.drop.fm._memo, s, r, f_th, {**TH_OPTIONS, **th_options})
    energy = member_energy_peaks(s, F)
    th = {q: peaks[q].copy() for q in QUANTITIES}
    th["force"] = th["force"] / w
    # the end shear (the support reactions, N) beside the largest section shear: what
    # the verification compares with the energy method's end shear (the factors keep
    # the section's, the larger)
    th["end_shear"] = peaks["end_shear"].copy()
    factor = {}
    with np.errstate(divide="ignore", invalid="ignore"):
        for q in QUANTITIES:
            e = energy[q]
            factor[q] = np.where(e > 0.0, TH_MARGIN * th[q] / np.where(e > 0.0, e, 1.0),
                                 np.inf)
    return PointHistory(member=s["member"], cond=s["cond"], L=s["L"], a=s["a"], EI=s["EI"],
                        mu=s["mu"], f_c=f_th, F_yield=s["F_yield"], stroke=s["stroke"],
                        th=th, energy=energy, factor=factor)


HISTORY_CACHE_SIZE = 200_000
"""Most member histories kept per prepared floor (:func:`_member_peaks`): five floats
and a key of fourteen each, a few tens of MB at most; past it the cache is emptied."""
_PEAK_KEYS = ("force", "moment", "shear", "deflection", "end_shear")


def _member_peaks(memo: dict, s: dict[str, np.ndarray], r: dict[str, np.ndarray],
                  f_th: np.ndarray, options: dict[str, Any]) -> dict[str, np.ndarray]:
    """The struck member's own peaks (:func:`droprig.solver.exacthistory.
    exact_time_history` on ``s`` and the shared load ``r``, contact compliance f_th):
    contact force (N, the member's w·F), moment (N·m), shear (N, the largest section's),
    deflection (m) and end shear (N, the support reactions; the section's where the
    run gives none), per point.

    A member history is set by its inputs alone — end condition, L, EI, μ, a, the
    Timoshenko terms, the shared load's mass, fall, weight, contact compliance,
    crushing force and stroke, and the run's settings — and the refinement and the
    confirmation run the same point at the same fall in several chain runs (issue 12:
    the steel demo ran 6,913 points, 3,908 of them distinct). Each history is kept in
    ``memo`` (the prepared floor's, so it lives as long as the floor does and a
    change to the floor starts afresh) under its exact inputs (floats compared
    exactly: a changed input is a new history), and only the points not yet run are
    run, together. The peaks are those of the same model and settings: the
    refinement's meaning is unchanged (tests/solver/test_point_history_cache.py)."""
    cache: dict[tuple, tuple[float, ...]] = memo.setdefault("point_histories", {})
    opts = tuple(sorted((k, repr(v)) for k, v in options.items()))
    cols = [s["L"], s["EI"], s["mu"], s["a"], s["kGA"], s["rhoI"], r["M"], r["h"],
            r["weight"], f_th, r["F_yield"], r["stroke"]]
    vals = np.stack([np.asarray(v, float) for v in cols], axis=1).tolist()
    keys = [(str(cn), *row, opts) for cn, row in zip(s["cond"].tolist(), vals, strict=True)]
    n = len(keys)
    out = {q: np.zeros(n) for q in _PEAK_KEYS}
    todo: list[int] = []
    first: dict[tuple, int] = {}
    repeats: list[tuple[int, int]] = []
    for i, key in enumerate(keys):
        got = cache.get(key)
        if got is None:
            if key in first:  # a point repeated within the run: run it once
                repeats.append((i, first[key]))
            else:
                first[key] = i
                todo.append(i)
            continue
        for q, v in zip(_PEAK_KEYS, got, strict=True):
            out[q][i] = v
    if todo:
        j = np.asarray(todo)
        t = exacthistory.exact_time_history(s["cond"][j], s["L"][j], s["EI"][j],
                                            s["mu"][j], s["a"][j], r["M"][j], r["h"][j],
                                            f_th[j], F_yield=r["F_yield"][j],
                                            stroke=r["stroke"][j], weight=r["weight"][j],
                                            kGA=s["kGA"][j], rhoI=s["rhoI"][j], **options)
        got_q = {q: np.asarray(getattr(t, q), float) for q in QUANTITIES}
        got_q["end_shear"] = (np.asarray(t.reaction, float) if t.reaction is not None
                              else got_q["shear"].copy())
        if len(cache) + j.size > HISTORY_CACHE_SIZE:
            cache.clear()
        for m, i in enumerate(todo):
            row = tuple(float(got_q[q][m]) for q in _PEAK_KEYS)
            for q, v in zip(_PEAK_KEYS, row, strict=True):
                out[q][i] = v
            if all(math.isfinite(x) or x == math.inf for x in keys[i][1:-1]):
                cache[keys[i]] = row
        for i, i0 in repeats:
            for q in _PEAK_KEYS:
                out[q][i] = out[q][i0]
    return out


def _member_units(c: Chain, sel: np.ndarray, s: dict[str, np.ndarray]
                  ) -> tuple[np.ndarray, np.ndarray]:
    """The struck member's Rayleigh mass factor β (:func:`droprig.solver.beam.
    rayleigh_mass_factor`) and largest unit-load deflection (m/N, as
    :func:`droprig.solver.amplification_impulse.unit_deflection`) at the points ``sel``:
    load-independent, so worked out once per point and kept with the points'
    geometry."""
    from droprig.solver import amplification_impulse

    geo = c.drop.geo
    n = geo.x.shape[0]
    got = geo.cache.get("impulse_units")
    if got is None or got["beta"].shape[0] != n:
        got = {"beta": np.full(n, np.nan), "unit_d": np.full(n, np.nan)}
        geo.cache["impulse_units"] = got
    todo = np.isnan(got["beta"][sel])
    if todo.any():
        t = {k: v[todo] for k, v in s.items()}
        beta = np.zeros(int(todo.sum()))
        for cn in dict.fromkeys(t["cond"].tolist()):
            i = t["cond"] == cn
            beta[i] = beam.rayleigh_mass_factor(cast(EndCondition, cn), t["L"][i], t["a"][i])
        got["beta"][sel[todo]] = beta
        # tabulated: no larger than the history's 200 intervals, so the factor on it
        # no smaller (the safe side)
        ud = np.zeros(beta.size)
        for cn in dict.fromkeys(t["cond"].tolist()):
            i = t["cond"] == cn
            ud[i] = amplification_impulse.unit_deflection(
                str(cn), t["L"][i], t["EI"][i], t["a"][i], int(TH_OPTIONS["n_modes"]))
        got["unit_d"][sel[todo]] = ud
    return got["beta"][sel], got["unit_d"][sel]


def member_energy_peaks(s: dict[str, np.ndarray], F: np.ndarray, samples: int = 200,
                        unit_d: np.ndarray | None = None, share: bool = True
                        ) -> dict[str, np.ndarray]:
    """The chain's energy-method peaks on the struck member ``s``
    (:func:`struck_member`) for its contact force F (N, per point): the contact force
    F, and its share w·F times the member's unit-load envelopes (AISC Manual Table
    3-23: :func:`droprig.solver.beam.max_abs_moment`, ``max_abs_shear``, the largest
    G(x, a), sampled at ``samples`` equal intervals and at a; ``unit_d`` where known)
    — moment (N·m), shear (N), deflection (m). ``share`` false: w = 1."""
    w = s["share"] if share else np.ones(np.asarray(F).shape)
    n = w.size
    unit_m = np.zeros(n)
    unit_v = np.zeros(n)
    unit_d_known = unit_d
    unit_d = np.zeros(n) if unit_d is None else unit_d
    cond = s["cond"]
    xi = np.linspace(0.0, 1.0, samples + 1)
    for cn in dict.fromkeys(cond.tolist()):
        i = cond == cn
        cc = cast(EndCondition, cn)
        L, a, EI = s["L"][i], s["a"][i], s["EI"][i]
        unit_m[i] = beam.max_abs_moment(cc, L, 1.0, a)
        unit_v[i] = beam.max_abs_shear(cc, L, 1.0, a)
        if unit_d_known is not None:
            continue
        x = L[:, None] * xi[None, :]
        unit_d[i] = np.maximum(
            np.max(beam.green(cc, L[:, None], EI[:, None], x, a[:, None]), axis=1),
            s["g_m"][i])
    # the chain's demand on this member: its share w of the force F (the contact
    # force stays F); the history's contact force is the member's (w·F) over w
    energy = {"force": F, "moment": w * F * unit_m, "shear": w * F * unit_v,
              "deflection": w * F * unit_d}
    return energy


def struck_members(c: Chain) -> dict[str, np.ndarray]:
    """:func:`struck_member` at every point of the chain (one row per point) with the
    member's unit-load envelopes of :func:`member_energy_peaks` (``unit_m``, m;
    ``unit_v``, dimensionless: per N of the member's share), NaN at the points on no
    member of the path or over a deck opening (the points no bound is worked out
    at). Height-free: kept with a chain that re-runs the bounds at other heights
    (:func:`droprig.solver.chain.rows_chain`) for :func:`impulse_factors`, whose rows
    are those of :func:`struck_member` and :func:`member_energy_peaks` at its points
    (every quantity is per point)."""
    d = c.drop
    n = d.n
    on = np.flatnonzero((d.geo.path.pair >= 0) & ~d.geo.opening)
    s = struck_member(c, on)
    cond = s["cond"]
    unit_m = np.zeros(on.size)
    unit_v = np.zeros(on.size)
    for cn in dict.fromkeys(cond.tolist()):
        i = cond == cn
        cc = cast(EndCondition, cn)
        unit_m[i] = beam.max_abs_moment(cc, s["L"][i], 1.0, s["a"][i])
        unit_v[i] = beam.max_abs_shear(cc, s["L"][i], 1.0, s["a"][i])
    s["unit_m"], s["unit_v"] = unit_m, unit_v
    out: dict[str, np.ndarray] = {}
    for k, v in s.items():
        full = np.full(n, None, dtype=object) if v.dtype == object else (
            np.full(n, -1, dtype=v.dtype) if v.dtype.kind in "iub" else np.full(n, np.nan))
        full[on] = v
        out[k] = full
    return out


def impulse_factors(c: Chain, sel: np.ndarray, h: np.ndarray, F: np.ndarray
                    ) -> dict[str, np.ndarray]:
    """Factors (dimensionless, per point of ``sel``; not floored at 1) on the chain's
    energy-method peaks (:func:`member_energy_peaks` of its force F, N) that bound the
    point's own time history from above without running it: the impulse and
    peak-force bounds of :func:`droprig.solver.amplification_impulse.
    tabulated_bounds` (the tabulated ``impulse_peak_bounds``, never below it) on the
    same struck member, shared load, contact floor (:data:`droprig.solver.
    amplification.KAPPA_MIN` × G(a, a)), modes and cut-off as :func:`point_history`
    (free falls ``h``, m). No margin: a bound of the same model, not a sample of it.
    ``force`` is the contact force's factor, inf where the history's contact is
    softer than the chain's (the floor: the contact-force bound of the floored model
    is not one of the chain's contact)."""
    from droprig.solver import amplification_impulse
    from droprig.solver.chain import LoadInputs

    inp = c[LoadInputs]
    kept = c.kept(struck_members)  # struck_member's rows, where kept with the chain
    s = struck_member(c, sel) if kept is None else {k: v[sel] for k, v in kept.items()}
    w = s["share"]
    r = shared_load(w, inp.M[sel], h, s["f_all"], s["g_m"], s["F_yield"], s["stroke"])
    floor = amplification.KAPPA_MIN * s["g_m"]
    f_th = np.maximum(r["f_c"], floor)
    beta, unit_d = _member_units(c, sel, s)
    b = amplification_impulse.tabulated_bounds(
        s["cond"], s["L"], s["EI"], s["mu"], s["a"], r["M"], r["h"], f_th,
        F_yield=r["F_yield"], stroke=r["stroke"], weight=r["weight"],
        n_modes=int(TH_OPTIONS["n_modes"]), cutoff=float(TH_OPTIONS["cutoff"]),
        beta=beta)
    if kept is None:
        energy = member_energy_peaks(s, F, unit_d=unit_d)
    else:  # member_energy_peaks(s, F, unit_d=unit_d) with the unit envelopes kept
        wF = w * F
        energy = {"force": F, "moment": wF * s["unit_m"], "shear": wF * s["unit_v"],
                  "deflection": wF * unit_d}
    b["force"] = np.where(r["f_c"] >= floor, b["force"] / w, np.inf)
    out = {}
    with np.errstate(divide="ignore", invalid="ignore"):
        for q in QUANTITIES:
            e = energy[q]
            out[q] = np.where(e > 0.0, b[q] / np.where(e > 0.0, e, 1.0), np.inf)
    return out


def merge(points: np.ndarray, runs: list[PointHistory]) -> PointHistory:
    """One :class:`PointHistory` of several runs whose points (``points``, the runs'
    point indices concatenated) are distinct, sorted by point."""
    order = np.argsort(points, kind="stable")

    def cat(get: object) -> np.ndarray:
        return np.concatenate([get(r) for r in runs])[order]  # type: ignore[operator]

    def cat_d(attr: str) -> dict[str, np.ndarray]:
        return {q: cat(lambda r, q=q: getattr(r, attr)[q]) for q in QUANTITIES}

    if len(runs) == 1:
        return runs[0]
    return PointHistory(member=cat(lambda r: r.member), cond=cat(lambda r: r.cond),
                        L=cat(lambda r: r.L), a=cat(lambda r: r.a), EI=cat(lambda r: r.EI),
                        mu=cat(lambda r: r.mu), f_c=cat(lambda r: r.f_c),
                        F_yield=cat(lambda r: r.F_yield), stroke=cat(lambda r: r.stroke),
                        th=cat_d("th"), energy=cat_d("energy"), factor=cat_d("factor"))
