"""One member struck by one dropped load: the whole chain of checks for ``droprig
check`` (and a reference for the floor-level analysis).

Method (README, 'What it computes'; every step's source is in the docstring of the
function it calls):

1. Struck-point compliance f = green(a, a) (+ 1/k of a spring mat + 1/k_load of the
   load's own underside: springs in series, Gere §9.10 energy method); effective
   member mass m_e = β·μ·L·(f_s/f_struct)², f_struct = f_s + 1/k_load (Rayleigh,
   :func:`beam.rayleigh_mass_factor`, scaled to the struck point's own deflection as
   in the floor analysis: :func:`droprig.solver.impact.struck_point_mass`), share of
   kinetic energy η = M/(M + m_e).
2. Elastic impact (Gere §9.10) or a crushable layer; peak force F.
3. Actions at the peak: F × unit actions + the existing load (self-weight and a
   UDL); utilisation of flexure, shear, web local yielding and web crippling.
4. Flexure beyond its resistance on a section able to form a plastic hinge:
   elastic–perfectly-plastic energy balance with the mechanism resistance R_p
   (which already carries the existing load); shear and web checks are brittle
   and are re-checked at the force the yielding member can transmit.
5. Inverse answers: the elastic and plastic allowable drop heights.

Deflection against span/N is reported as information only: IBC Table 1604.3 is a
serviceability limit for dead + live load, not a criterion for an accidental
impact (droprig references, "Deflection"), so it never makes a point ``exceeds``.

Assumptions stated in every report: the member is laterally restrained by the
deck; its supports are rigid; the load bears on the top flange over ``bearing``
(0 = a point contact, conservative for the web checks). With a spring mat or a
crushable layer the contact is no longer a perfectly inelastic hit on the bare
member, so the struck-mass share is not taken (η = 1, conservative).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from droprig.model import Grade, ModelError, Section
from droprig.solver import amplification, beam, capacity, impact, limits, plastic

__all__ = [
    "BRITTLE_CHECKS",
    "DEFAULT_DEFLECTION_LIMIT_RATIO",
    "MEMBER_CHECKS",
    "RESULT_KEYS",
    "assess_member",
]

MEMBER_CHECKS: tuple[str, ...] = ("flexure", "shear", "web_yielding", "web_crippling")
BRITTLE_CHECKS: tuple[str, ...] = ("shear", "web_yielding", "web_crippling")

RESULT_KEYS: tuple[str, ...] = (
    "static_deflection",
    "dynamic_factor",
    "peak_force",
    "max_moment",
    "max_shear",
    "max_deflection",
    "effective_mass",
    "deceleration_g",
    "utilisation",
    "governing_check",
    "response",
    "allowable_drop_height",
    "allowable_drop_height_plastic",
    "plastic_deflection",
    "ductility",
    "support_rotation",
    "amplification",
)
"""Keys of :func:`assess_member`'s result, in the order of ``droprig check --json``."""

DEFAULT_DEFLECTION_LIMIT_RATIO = 240.0
"""N in span/N: IBC Table 1604.3, dead + live (information only, see module docstring)."""

_N_DEFLECTION_SAMPLES = 401


def _solve_increasing(fun: Callable[[float], float], target: float = 1.0) -> float:
    """Least F ≥ 0 with fun(F) ≥ target for a non-decreasing ``fun`` (bisection to
    1e-10 relative); 0 if fun(0) ≥ target; inf if never reached."""
    if fun(0.0) >= target:
        return 0.0
    hi = 1.0
    for _ in range(200):
        if fun(hi) >= target:
            break
        hi *= 2.0
    else:
        return math.inf
    lo = 0.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if fun(mid) >= target:
            hi = mid
        else:
            lo = mid
        if hi - lo <= 1e-10 * hi:
            break
    return hi


def _clean(v: float | None) -> float | None:
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


def assess_member(
    section: Section,
    grade: Grade,
    cond: beam.EndCondition,
    L: float,
    a: float,
    mass: float,
    h: float,
    *,
    basis: capacity.Basis,
    phi: float = 1.0,
    dif: float = 1.0,
    bearing: float = 0.0,
    cushion_stiffness: float | None = None,
    load_stiffness: float | None = None,
    crush_force: float | None = None,
    crush_stroke: float | None = None,
    udl: float = 0.0,
    self_weight: bool = True,
    beam_mass: bool = True,
    deflection_limit_ratio: float = DEFAULT_DEFLECTION_LIMIT_RATIO,
    ductility_limit: float = 6.0,
    rotation_limit: float = math.radians(2.0),
    dynamic_amplification: bool = True,
) -> dict[str, Any]:
    """Assess one member (span L, m; end condition ``cond``) struck at ``a`` (m from
    the origin end) by a mass (kg) falling ``h`` (m).

    Returns a dict with exactly :data:`RESULT_KEYS` in SI base units (m, N, N·m, kg,
    rad; ``governing_check`` a name from :data:`MEMBER_CHECKS` or ``collapse``,
    ``ductility``, ``rotation``; ``response`` ``elastic``/``plastic``/``exceeds``).
    Values that do not apply are ``None`` (never NaN or inf). ``utilisation`` is the
    elastic demand over resistance of the governing strength check (above 1 for a
    plastic response: read ductility and rotation then). ``effective_mass`` is the
    member's Rayleigh mass scaled to the struck point, m_e·(f_s/f_struct)² (as the
    floor analysis), reported even where it is not used (η = 1 with a mat or a
    crushable layer). ``load_stiffness`` (N/m): the load's own underside (skid, base
    frame, dunnage) in series with the member; ``None`` = rigid (conservative); it
    does not change η. ``deflection_limit_ratio`` is
    validated but never changes the verdict (deflection is information only; the
    edges compare ``max_deflection`` with span/N themselves). Raises
    :class:`~droprig.model.ModelError` naming the argument for inputs outside range.

    ``dynamic_amplification`` (on by default, as the floor analysis): every check is
    made at its amplified force (:func:`droprig.solver.amplification.amplified_forces`
    — the same rule as the floor chain's ``dynamic_amplification`` step; flexure at
    A_M·F, shear at A_V·F, web checks at the bounded contact force A_F·F), the energy
    beyond yield scaled by A_δ², the allowable heights confirmed by a forward run;
    ``amplification`` then holds the factors ``force``, ``moment``, ``shear``,
    ``deflection``, the ratios ``mass_ratio`` (r = M/mₑ) and ``compliance_ratio`` (κ)
    and ``set_by`` (what set each factor); ``None`` when off (the energy method).
    """
    _check_inputs(cond, basis, L, a, mass, h, bearing, udl, cushion_stiffness,
                  load_stiffness, crush_force, crush_stroke, deflection_limit_ratio,
                  ductility_limit, rotation_limit)
    st = _strike(section, grade, cond, L, a, mass, h, basis, phi, dif, bearing,
                 cushion_stiffness, load_stiffness, crush_force, crush_stroke, udl,
                 self_weight, beam_mass, ductility_limit, rotation_limit)
    F_el = _impact_force(st)
    acts = _Actions(st)
    amp = _amplification(st, st.h, F_el) if dynamic_amplification else None
    st_by = st
    if amp is not None:
        base = _Actions(st)
        acts.scale(amp)
        # beyond yield: the kinetic energy × A_δ² (as the floor chain)
        st_by = replace(st, h=st.h * amp["deflection"] ** 2)
    U_el = acts.utilisations(F_el)
    gov_el = max(U_el, key=lambda k: U_el[k])
    F_allow = {k: _solve_increasing(fn) for k, fn in acts.u_fun.items()}
    h_allow = _elastic_height(st, min(F_allow.values()))
    if amp is not None:
        h_allow = _confirm_height(st, base, h_allow)
    hinge_ok = capacity.plastic_hinge_capable(section, grade, basis)
    R_p = float(beam.plastic_collapse_load_udl(cond, L, a, acts.Mr, st.w0)) if hinge_ok \
        else math.nan
    out: dict[str, Any] = dict.fromkeys(RESULT_KEYS)
    out["static_deflection"] = st.d_st
    out["dynamic_factor"] = F_el / st.W
    out["effective_mass"] = st.m_e
    out["allowable_drop_height"] = h_allow
    if U_el["flexure"] <= 1.0 or not hinge_ok:
        out["peak_force"] = F_el
        out["max_moment"] = acts.moment(F_el)
        out["max_shear"] = acts.shear(F_el)
        out["max_deflection"] = acts.deflection_at(F_el)
        out["utilisation"] = U_el[gov_el]
        out["governing_check"] = gov_el
        out["response"] = "elastic" if U_el[gov_el] <= 1.0 else "exceeds"
    else:
        out.update(_beyond_yield(st_by, acts, F_el, U_el["flexure"], R_p))
    plastic_usable = hinge_ok and min(F_allow[k] for k in BRITTLE_CHECKS) >= R_p
    if plastic_usable:
        h_pl = _plastic_height(st, R_p, h_allow)
        if amp is not None and h_pl is not None:
            h_pl = max(h_pl / amp["deflection"] ** 2, h_allow)
        out["allowable_drop_height_plastic"] = h_pl
    out["deceleration_g"] = float(impact.deceleration_g(out["peak_force"], st.W))
    for k in RESULT_KEYS:
        if k not in ("governing_check", "response", "amplification"):
            out[k] = _clean(out[k])
    out["amplification"] = amp
    return out


def _amplification(st: _Strike, h: float, F: float) -> dict[str, Any]:
    """The floor chain's amplification rule for one member at the drop h (m) and the
    energy method's force F (N): :func:`droprig.solver.amplification.amplification`
    (r = M/mₑ with the member's Rayleigh mass, κ = f_c/f_s, f_c the elastic springs:
    mat and the load's underside) and
    :func:`~droprig.solver.amplification.amplified_forces` with the rigid-base bound
    and a crushable layer's crush force while its stroke holds. Factors ≥ 1."""
    crushable = st.crush_force is not None and st.crush_stroke is not None
    a = amplification.amplification(st.mass, st.m_path, st.f_c, st.f_s,
                                     struck_mass=st.eta < 1.0)
    rigid = float(amplification.contact_force_bound(st.W, h, st.f_c))
    F_cap = float(st.crush_force) if crushable else math.inf  # type: ignore[arg-type]
    stroke = float(st.crush_stroke) if crushable else math.inf  # type: ignore[arg-type]
    holds = bool(amplification.crush_depth_bound(st.W, h, st.f, F_cap) <= stroke)
    F_ref = float(impact.impact_elastic(st.W, h, st.f, st.eta)[1])
    bottomed = crushable and bool(impact.impact_crushable(
        st.W, h, st.f, st.eta, F_cap, stroke)[2])
    fo = amplification.amplified_forces(a, F, F_ref, rigid, F_cap, holds, bottomed)

    def ratio(x: np.ndarray) -> float:
        v = float(x) / F if F > 0.0 and math.isfinite(F) else 1.0
        return max(v, 1.0) if math.isfinite(v) else 1.0

    return {"force": ratio(fo.local), "moment": ratio(fo.moment), "shear": ratio(fo.shear),
            "deflection": ratio(fo.deflection), "mass_ratio": _clean(float(a.mass_ratio)),
            "compliance_ratio": _clean(float(a.compliance_ratio)),
            "set_by": {k: amplification.SET_BY[int(v)] for k, v in fo.set_by.items()}}


def _confirm_height(st: _Strike, base: _Actions, h_allow: float) -> float:
    """The elastic allowable drop (m) re-checked by a forward run with the factors at
    that height (they depend on it), lowered by (0.98/U)² until U ≤ 1 (as the floor
    chain's ``confirm_amplified_height``; F ∝ √h, Gere 7th ed. Eq. 9-94)."""
    h = h_allow
    for _ in range(12):
        if not (math.isfinite(h) and h > 0.0):
            return h
        F = _impact_force(replace(st, h=h))
        amp = _amplification(st, h, F)
        acts = _Actions(st)
        acts.scale(amp)
        U = max(acts.utilisations(F).values())
        if U <= 1.0:
            return h
        h *= min(0.98, (0.98 / U) ** 2)
    return math.nan


def _check_inputs(cond: str, basis: str, L: float, a: float, mass: float, h: float,
                  bearing: float, udl: float, cushion_stiffness: float | None,
                  load_stiffness: float | None, crush_force: float | None,
                  crush_stroke: float | None, deflection_limit_ratio: float,
                  ductility_limit: float, rotation_limit: float) -> None:
    """Raise :class:`~droprig.model.ModelError` naming the first argument outside its
    range (the names of the ``droprig check`` options)."""
    if cond not in beam.END_CONDITIONS:
        raise ModelError("support", cond, "one of " + ", ".join(beam.END_CONDITIONS))
    if basis not in capacity.BASES:
        raise ModelError("code", basis, "one of " + ", ".join(capacity.BASES))
    for name, val, lo in (("span", L, 0.0), ("mass", mass, 0.0)):
        if not (math.isfinite(val) and val > lo):
            raise ModelError(name, val, f"> {lo:g}")
    if not (math.isfinite(a) and 0.0 <= a <= L):
        raise ModelError("at", a, f"0 to the span, {L:g} m", "m")
    if not (math.isfinite(h) and h >= 0.0):
        raise ModelError("drop", h, "≥ 0 m", "m")
    if not (math.isfinite(bearing) and 0.0 <= bearing <= L):
        raise ModelError("bearing", bearing, f"0 to the span, {L:g} m", "m")
    if not (math.isfinite(udl) and udl >= 0.0):
        raise ModelError("udl", udl, "≥ 0 N/m", "N/m")
    if cushion_stiffness is not None and not (math.isfinite(cushion_stiffness)
                                              and cushion_stiffness > 0.0):
        raise ModelError("cushion-stiffness", cushion_stiffness, "> 0 N/m", "N/m")
    if load_stiffness is not None and not (math.isfinite(load_stiffness)
                                           and load_stiffness > 0.0):
        raise ModelError("load-stiffness", load_stiffness, "> 0 N/m", "N/m")
    if (crush_force is None) != (crush_stroke is None):
        raise ModelError("crush-force", crush_force,
                         "a crush force and a crush stroke together, or neither")
    if crush_force is not None and not (math.isfinite(crush_force) and crush_force > 0.0):
        raise ModelError("crush-force", crush_force, "> 0 N", "N")
    if crush_stroke is not None and not (math.isfinite(crush_stroke) and crush_stroke > 0.0):
        raise ModelError("crush-stroke", crush_stroke, "> 0 m", "m")
    for name, val, lo in (("deflection-limit-ratio", deflection_limit_ratio, 0.0),
                          ("ductility-limit", ductility_limit, 1.0),
                          ("rotation-limit", rotation_limit, 0.0)):
        if not (math.isfinite(val) and val >= lo):
            raise ModelError(name, val, f"≥ {lo:g}")


@dataclass(frozen=True)
class _Strike:
    """One member struck at ``a`` (inputs, SI) with its compliance and struck mass:
    ``f_s`` the member's own flexibility at a (m/N), ``f_c`` the elastic springs in
    series (mat and the load's underside), ``f`` = f_s + f_c; ``m_e`` the struck mass
    (kg), ``eta`` the share of kinetic energy kept; ``w0`` existing UDL (N/m)."""

    section: Section
    grade: Grade
    cond: beam.EndCondition
    L: float
    a: float
    mass: float
    h: float
    basis: capacity.Basis
    phi: float
    dif: float
    bearing: float
    crush_force: float | None
    crush_stroke: float | None
    ductility_limit: float
    rotation_limit: float
    W: float
    EI: float
    w0: float
    f_s: float
    f_c: float
    f: float
    m_e: float
    eta: float
    d_st: float
    m_path: float = 0.0


def _strike(section: Section, grade: Grade, cond: beam.EndCondition, L: float, a: float,
            mass: float, h: float, basis: capacity.Basis, phi: float, dif: float,
            bearing: float, cushion_stiffness: float | None, load_stiffness: float | None,
            crush_force: float | None, crush_stroke: float | None, udl: float,
            self_weight: bool, beam_mass: bool, ductility_limit: float,
            rotation_limit: float) -> _Strike:
    """Compliance (AISC Manual Table 3-23 via :func:`beam.green`; springs in series,
    Gere §9.10) and struck mass (:func:`impact.struck_point_mass`, η = 1 under a mat or
    a crushable layer)."""
    g = impact.G
    W = mass * g
    EI = grade.E * section.Ix
    mu_l = section.mass_per_length
    w0 = (mu_l * g if self_weight else 0.0) + udl
    crushable = crush_force is not None
    cushioned = cushion_stiffness is not None or crushable
    f_s = float(beam.green(cond, L, EI, a, a))
    # elastic springs in series with the member: the mat and the load's underside
    f_c = 1.0 / cushion_stiffness if cushion_stiffness is not None else 0.0
    if load_stiffness is not None:
        f_c += 1.0 / load_stiffness
    f = f_s + f_c
    if f <= 0.0 and not crushable:
        raise ModelError("at", a, "a point off the supports (droprig takes supports as "
                         "rigid, so a load landing on one has no finite force) — or give "
                         "a cushion or a crushable layer", "m")
    # Rayleigh mass of the member scaled to the struck point: the load moves W·f_struct
    # (member and the load's underside in series), the member under it W·f_s
    m_rayleigh = (float(beam.rayleigh_mass_factor(cond, L, a)) * mu_l * L) if beam_mass \
        else 0.0
    f_struct = f_s + (1.0 / load_stiffness if load_stiffness is not None else 0.0)
    m_e = float(impact.struck_point_mass(m_rayleigh, f_s, f_struct))
    eta = 1.0 if cushioned else float(impact.mass_efficiency(mass, m_e))
    return _Strike(section, grade, cond, L, a, mass, h, basis, phi, dif, bearing,
                   crush_force, crush_stroke, ductility_limit, rotation_limit, W, EI, w0,
                   f_s, f_c, f, m_e, eta, W * f, m_rayleigh)


def _impact_force(st: _Strike) -> float:
    """Peak force F (N): Gere 7th ed. §9.10 Eq. 9-94 (:func:`impact.impact_elastic`) or
    through a crushable layer (:func:`impact.impact_crushable`)."""
    if st.crush_force is not None and st.crush_stroke is not None:
        F_arr, _, _ = impact.impact_crushable(st.W, st.h, st.f, st.eta, st.crush_force,
                                              st.crush_stroke)
        return float(F_arr)
    _, F_arr, _ = impact.impact_elastic(st.W, st.h, st.f, st.eta)
    return float(F_arr)


def _unbounded(fn: Callable[[float], float]) -> Callable[[float], float]:
    """``fn`` that, at an unbounded force (a bottomed layer on a rigid point), is ∞ for
    an action the force loads and keeps its existing-load value for the others."""
    def wrapped(F: float) -> float:
        if math.isfinite(F):
            return fn(F)
        return math.inf if fn(1.0) > fn(0.0) else fn(0.0)
    return wrapped


class _Actions:
    """Resistances (AISC 360-16 F2/G2/J10, EN 1993-1-1 6.2.5/6.2.6, EN 1993-1-5 §6;
    :mod:`droprig.solver.capacity`) and the member's actions at a force F (N) at a plus
    its existing UDL (AISC Manual Table 3-23 by superposition)."""

    def __init__(self, st: _Strike) -> None:
        self.st = st
        sec, grd, basis, phi, dif = st.section, st.grade, st.basis, st.phi, st.dif
        self.Mr = capacity.flexural_resistance(sec, grd, basis, phi, dif)
        self.Vr = capacity.shear_resistance(sec, grd, basis, phi, dif)
        dist = max(min(st.a, st.L - st.a) - 0.5 * st.bearing, 0.0)
        self.R_wy = float(capacity.web_local_yielding(sec, grd, basis, st.bearing, dist,
                                                      phi, dif))
        self.R_wc = float(capacity.web_crippling(sec, grd, basis, st.bearing, dist, phi,
                                                 dif))
        self.moment = _unbounded(
            lambda F: float(beam.max_abs_moment(st.cond, st.L, F, st.a, st.w0)))
        self.shear = _unbounded(
            lambda F: float(beam.max_abs_shear(st.cond, st.L, F, st.a, st.w0)))
        self.deflection_at = _unbounded(self._deflection)
        self.u_fun: dict[str, Callable[[float], float]] = {
            "flexure": lambda F: self.moment(F) / self.Mr,
            "shear": lambda F: self.shear(F) / self.Vr,
            "web_yielding": lambda F: F / self.R_wy,
            "web_crippling": lambda F: F / self.R_wc,
        }

    def scale(self, amp: dict[str, Any]) -> None:
        """Make every check at its amplified force (:func:`_amplification`): flexure
        and the reported moment at A_M·F, shear at A_V·F, the web checks at A_F·F,
        the deflection at A_δ·F."""
        moment, shear, defl = self.moment, self.shear, self.deflection_at
        A_M, A_V, A_F, A_D = (amp["moment"], amp["shear"], amp["force"],
                              amp["deflection"])
        self.moment = lambda F: moment(A_M * F)
        self.shear = lambda F: shear(A_V * F)
        self.deflection_at = lambda F: defl(A_D * F)
        self.u_fun = {
            "flexure": lambda F: self.moment(F) / self.Mr,
            "shear": lambda F: self.shear(F) / self.Vr,
            "web_yielding": lambda F: A_F * F / self.R_wy,
            "web_crippling": lambda F: A_F * F / self.R_wc,
        }

    def _deflection(self, F: float) -> float:
        st = self.st
        x = np.linspace(0.0, st.L, _N_DEFLECTION_SAMPLES)
        x = np.append(x, st.a)
        y = F * beam.green(st.cond, st.L, st.EI, x, st.a) + beam.udl_deflection(
            st.cond, st.L, st.EI, st.w0, x)
        return float(np.max(np.abs(y)))

    def utilisations(self, F: float) -> dict[str, float]:
        """U of every check at F; an unbounded force (a bottomed layer on a rigid
        point) gives U = ∞ for every check it loads, the others keep their
        existing-load value."""
        if math.isfinite(F):
            return {k: fn(F) for k, fn in self.u_fun.items()}
        return {k: (math.inf if fn(1.0) > fn(0.0) else fn(0.0))
                for k, fn in self.u_fun.items()}


def _elastic_height(st: _Strike, F_allow_min: float) -> float:
    """Elastic allowable drop height (m): the force at the struck point reaches
    F_allow (Gere Eq. 9-94 solved for h, :func:`limits.allowable_drop_height_elastic`;
    through a crushable layer that crushes fully, the energy balance
    ηWh + W(s_c + δ) = F_c·s_c + δ²/(2f), δ = F_allow·f)."""
    W, f, eta = st.W, st.f, st.eta
    if st.crush_force is not None and st.crush_stroke is not None \
            and st.crush_force < F_allow_min:
        # (δ²/(2f) = F_allow²·f/2, finite also for a rigid point f = 0)
        h_el = ((st.crush_force - W) * st.crush_stroke + 0.5 * F_allow_min**2 * f
                - W * F_allow_min * f) / (eta * W)
        return h_el if math.isfinite(h_el) and h_el >= 0.0 else math.nan
    return float(limits.allowable_drop_height_elastic(W, F_allow_min, st.d_st, eta))


def _plastic_state(st: _Strike, R_p: float, h_: float) -> tuple[float, float, bool]:
    """Member δm (m), ductility and collapsed for a drop h_: the path (crush layer) +
    series spring f_c + member (f_s, R_p) elastic–perfectly-plastic (Biggs 1964,
    :func:`plastic.plastic_response`)."""
    W, f, eta = st.W, st.f, st.eta
    e_extra = 0.0
    if st.crush_force is not None and st.crush_stroke is not None and st.crush_force < R_p:
        # gravity work minus crush energy over the depth actually crushed
        c = min(float(impact.crush_depth(W, h_, f, eta, st.crush_force)), st.crush_stroke)
        e_extra = (W - st.crush_force) * c
    h_eff = (eta * W * h_ + e_extra) / W
    d_m, _, coll = plastic.plastic_response(W, max(h_eff, 0.0), 1.0, R_p, R_p * f)
    d_member = float(d_m) - R_p * st.f_c
    # no reserve left by the existing load (R_p = 0): no finite ductility
    mu_m = d_member / (R_p * st.f_s) if R_p * st.f_s > 0 else math.inf
    return d_member, mu_m, bool(coll)


def _beyond_yield(st: _Strike, acts: _Actions, F_el: float, U_flexure: float,
                  R_p: float) -> dict[str, Any]:
    """Flexure beyond its resistance on a hinge-capable section: the force is capped
    at R_p, brittle checks are re-checked there, then collapse, ductility and support
    rotation (:func:`plastic.support_rotation`) against the limits."""
    out: dict[str, Any] = {}
    F_pk = min(F_el, R_p)
    U_pk = acts.utilisations(F_pk)
    d_m, mu_m, collapsed = _plastic_state(st, R_p, st.h)
    theta = float(plastic.support_rotation(d_m, st.L, st.a, st.cond)) if not collapsed \
        else math.inf
    out["peak_force"] = F_pk
    out["max_moment"] = acts.moment(F_pk)
    out["max_shear"] = acts.shear(F_pk)
    out["utilisation"] = U_flexure
    brittle_gov = max(BRITTLE_CHECKS, key=lambda k: U_pk[k])
    if U_pk[brittle_gov] > 1.0:
        out["response"], out["governing_check"] = "exceeds", brittle_gov
        out["max_deflection"] = acts.deflection_at(F_pk)
    elif collapsed:
        out["response"], out["governing_check"] = "exceeds", "collapse"
    else:
        out["max_deflection"] = max(d_m, acts.deflection_at(F_pk))
        out["plastic_deflection"] = d_m
        out["ductility"] = mu_m
        out["support_rotation"] = theta
        if mu_m > st.ductility_limit:
            out["response"], out["governing_check"] = "exceeds", "ductility"
        elif theta > st.rotation_limit:
            out["response"], out["governing_check"] = "exceeds", "rotation"
        else:
            out["response"], out["governing_check"] = "plastic", "flexure"
    return out


def _plastic_height(st: _Strike, R_p: float, h_allow: float) -> float | None:
    """Largest drop height (m) keeping μ ≤ limit and θ ≤ limit (energy balance at the
    limit deflection, Biggs 1964), not below the elastic one; None where the limit lies
    before first yield or no height works."""
    W, f_s, eta = st.W, st.f_s, st.eta
    if not (R_p > W and f_s > 0.0):
        return None
    arm = st.a if st.cond == "cantilever" else min(st.a, st.L - st.a)
    d_lim = min(st.ductility_limit * R_p * f_s, math.tan(st.rotation_limit) * arm)
    if d_lim < R_p * f_s:  # the limit lies before first yield
        return None
    d_travel = d_lim + R_p * st.f_c
    d_y = R_p * st.f
    e_crush = 0.0
    if st.crush_force is not None and st.crush_stroke is not None and st.crush_force < R_p:
        e_crush = (st.crush_force - W) * st.crush_stroke
    h_pl = (R_p * (d_travel - 0.5 * d_y) - W * d_travel + e_crush) / (eta * W)
    if not (math.isfinite(h_pl) and h_pl >= 0.0):
        return None
    h_el = h_allow if math.isfinite(h_allow) else 0.0
    return max(h_pl, h_el)
