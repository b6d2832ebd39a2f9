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
from typing import Any

import numpy as np

from droprig.model import Grade, ModelError, Section
from droprig.solver import beam, capacity, impact, limits, plastic

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
    """
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

    g = impact.G
    W = mass * g
    EI = grade.E * section.Ix
    mu_l = section.mass_per_length
    w0 = (mu_l * g if self_weight else 0.0) + udl
    crushable = crush_force is not None
    cushioned = cushion_stiffness is not None or crushable

    # 1. compliance, effective mass
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
    d_st = W * f

    # 2. impact
    if crushable:
        assert crush_force is not None and crush_stroke is not None
        F_el_arr, _, _ = impact.impact_crushable(W, h, f, eta, crush_force, crush_stroke)
        F_el = float(F_el_arr)
    else:
        _, F_el_arr, _ = impact.impact_elastic(W, h, f, eta)
        F_el = float(F_el_arr)
    K = F_el / W

    # 3. resistances and utilisations as functions of the impact force
    Mr = capacity.flexural_resistance(section, grade, basis, phi, dif)
    Vr = capacity.shear_resistance(section, grade, basis, phi, dif)
    dist = max(min(a, L - a) - 0.5 * bearing, 0.0)
    R_wy = float(capacity.web_local_yielding(section, grade, basis, bearing, dist, phi, dif))
    R_wc = float(capacity.web_crippling(section, grade, basis, bearing, dist, phi, dif))

    def _unbounded(fn: Callable[[float], float]) -> Callable[[float], float]:
        # an unbounded force (a bottomed layer on a rigid point) drives to inf only the
        # actions it loads; the others keep their existing-load value
        def wrapped(F: float) -> float:
            if math.isfinite(F):
                return fn(F)
            return math.inf if fn(1.0) > fn(0.0) else fn(0.0)
        return wrapped

    @_unbounded
    def moment(F: float) -> float:
        return float(beam.max_abs_moment(cond, L, F, a, w0))

    @_unbounded
    def shear(F: float) -> float:
        return float(beam.max_abs_shear(cond, L, F, a, w0))

    u_fun: dict[str, Callable[[float], float]] = {
        "flexure": lambda F: moment(F) / Mr,
        "shear": lambda F: shear(F) / Vr,
        "web_yielding": lambda F: F / R_wy,
        "web_crippling": lambda F: F / R_wc,
    }

    def utilisations(F: float) -> dict[str, float]:
        # an unbounded force (a bottomed layer on a rigid point) gives U = inf for every
        # check it loads and leaves the others at their existing-load value
        if math.isfinite(F):
            return {k: fn(F) for k, fn in u_fun.items()}
        return {k: (math.inf if fn(1.0) > fn(0.0) else fn(0.0)) for k, fn in u_fun.items()}

    U_el = utilisations(F_el)
    gov_el = max(U_el, key=lambda k: U_el[k])
    F_allow = {k: _solve_increasing(fn) for k, fn in u_fun.items()}
    F_allow_min = min(F_allow.values())

    # elastic allowable drop height (force at the struck point reaches F_allow)
    if crushable and crush_force is not None and crush_stroke is not None \
            and crush_force < F_allow_min:
        # the layer crushes fully, then the structure takes the rest elastically:
        # ηWh + W(s_c + δ) = F_c·s_c + δ²/(2f), δ = F_allow·f
        # (δ²/(2f) = F_allow²·f/2, finite also for a rigid point f = 0)
        h_el = ((crush_force - W) * crush_stroke + 0.5 * F_allow_min**2 * f
                - W * F_allow_min * f) / (eta * W)
        h_allow = h_el if math.isfinite(h_el) and h_el >= 0.0 else math.nan
    else:
        h_allow = float(limits.allowable_drop_height_elastic(W, F_allow_min, d_st, eta))

    hinge_ok = capacity.plastic_hinge_capable(section, grade, basis)
    R_p = float(beam.plastic_collapse_load_udl(cond, L, a, Mr, w0)) if hinge_ok else math.nan
    brittle_allow = min(F_allow[k] for k in BRITTLE_CHECKS)
    plastic_usable = hinge_ok and brittle_allow >= R_p

    # plastic energy balance: path = (crush layer) + series spring f_c + member (f_s, R_p)
    def plastic_state(h_: float) -> tuple[float, float, bool]:
        """member δm, ductility, collapsed for a drop h_."""
        e_extra = 0.0
        if crushable and crush_force is not None and crush_stroke is not None \
                and crush_force < R_p:
            # gravity work minus crush energy over the depth actually crushed
            c = min(float(impact.crush_depth(W, h_, f, eta, crush_force)), crush_stroke)
            e_extra = (W - crush_force) * c
        h_eff = (eta * W * h_ + e_extra) / W
        d_m, _, coll = plastic.plastic_response(W, max(h_eff, 0.0), 1.0, R_p, R_p * f)
        d_member = float(d_m) - R_p * f_c
        # no reserve left by the existing load (R_p = 0): no finite ductility
        mu_m = d_member / (R_p * f_s) if R_p * f_s > 0 else math.inf
        return d_member, mu_m, bool(coll)

    out: dict[str, Any] = dict.fromkeys(RESULT_KEYS)
    out["static_deflection"] = d_st
    out["dynamic_factor"] = K
    out["effective_mass"] = m_e
    out["allowable_drop_height"] = h_allow

    @_unbounded
    def deflection_at(F: float) -> float:
        x = np.linspace(0.0, L, _N_DEFLECTION_SAMPLES)
        x = np.append(x, a)
        y = F * beam.green(cond, L, EI, x, a) + beam.udl_deflection(cond, L, EI, w0, x)
        return float(np.max(np.abs(y)))

    flex_over = U_el["flexure"] > 1.0
    if not flex_over or not hinge_ok:
        F_pk = F_el
        out["peak_force"] = F_pk
        out["max_moment"] = moment(F_pk)
        out["max_shear"] = shear(F_pk)
        out["max_deflection"] = deflection_at(F_pk)
        out["utilisation"] = U_el[gov_el]
        out["governing_check"] = gov_el
        out["response"] = "elastic" if U_el[gov_el] <= 1.0 else "exceeds"
    else:
        F_pk = min(F_el, R_p)
        U_pk = utilisations(F_pk)
        d_m, mu_m, collapsed = plastic_state(h)
        theta = float(plastic.support_rotation(d_m, L, a, cond)) if not collapsed else math.inf
        out["peak_force"] = F_pk
        out["max_moment"] = moment(F_pk)
        out["max_shear"] = shear(F_pk)
        out["utilisation"] = U_el["flexure"]
        brittle_gov = max(BRITTLE_CHECKS, key=lambda k: U_pk[k])
        if U_pk[brittle_gov] > 1.0:
            out["response"], out["governing_check"] = "exceeds", brittle_gov
            out["max_deflection"] = deflection_at(F_pk)
        elif collapsed:
            out["response"], out["governing_check"] = "exceeds", "collapse"
        else:
            out["max_deflection"] = max(d_m, deflection_at(F_pk))
            out["plastic_deflection"] = d_m
            out["ductility"] = mu_m
            out["support_rotation"] = theta
            if mu_m > ductility_limit:
                out["response"], out["governing_check"] = "exceeds", "ductility"
            elif theta > rotation_limit:
                out["response"], out["governing_check"] = "exceeds", "rotation"
            else:
                out["response"], out["governing_check"] = "plastic", "flexure"

    # plastic allowable drop height: largest h keeping μ ≤ limit and θ ≤ limit
    if plastic_usable and R_p > W and f_s > 0.0:
        arm = a if cond == "cantilever" else min(a, L - a)
        d_lim = min(ductility_limit * R_p * f_s, math.tan(rotation_limit) * arm)
        if d_lim >= R_p * f_s:  # the limit lies beyond first yield
            d_travel = d_lim + R_p * f_c
            d_y = R_p * f
            e_crush = 0.0
            if crushable and crush_force is not None and crush_stroke is not None \
                    and crush_force < R_p:
                e_crush = (crush_force - W) * crush_stroke
            h_pl = (R_p * (d_travel - 0.5 * d_y) - W * d_travel + e_crush) / (eta * W)
            if math.isfinite(h_pl) and h_pl >= 0.0:
                h_el = h_allow if math.isfinite(h_allow) else 0.0
                out["allowable_drop_height_plastic"] = max(h_pl, h_el)

    out["deceleration_g"] = float(impact.deceleration_g(out["peak_force"], W))
    for k in RESULT_KEYS:
        if k not in ("governing_check", "response"):
            out[k] = _clean(out[k])
    return out
