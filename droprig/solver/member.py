"""One member struck by one dropped load (``droprig check``): a floor of one member.

The member runs the same per-point chain as the floor analysis
(:data:`droprig.solver.chain.STEPS`, every step's formula and source in its
docstring) in the chain's deck-less mode (:class:`droprig.solver.chain.BareMember`):
the member on two columns with its existing load (self-weight and a given UDL,
:func:`droprig.solver.floor.member_floor`), the load on its top flange over
``bearing``, in series with a cushion and the load's own underside, or through a
crushable layer. So a member checked alone and the same member in a floor get the
same compliance, struck mass (the floor's Rayleigh rule, scaled to the struck
point), impact force, checks (flexure, shear, web local yielding and crippling),
beyond-yield energy balance and inverse answers.

This module only validates the inputs and writes the chain's results under the keys
of ``droprig check``; besides, it reports the member's largest deflection along its
span (its Green's function and the UDL's deflection, AISC Manual Table 3-23) —
information only: IBC Table 1604.3 is a serviceability limit for dead + live load,
not a criterion for an accidental impact (droprig references, "Deflection"), so it
never makes a point ``exceeds``.

Assumptions stated in every report: the member is laterally restrained by the
deck; its supports are rigid; the load bears on the top flange over ``bearing``
(0 = a point contact, conservative for the web checks). With a spring cushion or a
crushable layer the contact is no longer a perfectly inelastic hit on the bare
member, so the struck-mass share is not taken (η = 1, conservative).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from droprig.model import Grade, ModelError, Project, Section, Settings
from droprig.solver import amplification, beam, capacity, impact
from droprig.solver.chain import (
    BareMember,
    BeyondYield,
    Chain,
    Checks,
    Compliance,
    Demands,
    Drop,
    DynamicAmplification,
    Impact,
    InverseAnswers,
    LoadInputs,
    run_chain,
)
from droprig.solver.floor import FloorModel, member_floor
from droprig.solver.geometry import Geometry
from droprig.solver.linear_checks import Check
from droprig.solver.loadpath import evaluate as evaluate_path
from droprig.solver.results import CHECKS, RESPONSES

__all__ = [
    "BRITTLE_CHECKS",
    "DEFAULT_DEFLECTION_LIMIT_RATIO",
    "MEMBER_CHECKS",
    "RESULT_KEYS",
    "MemberDrop",
    "assess",
    "assess_member",
    "member_chain",
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


def _clean(v: float | None) -> float | None:
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


@dataclass(frozen=True)
class MemberDrop:
    """What ``droprig check`` assesses: one member (``section`` of ``grade``, end
    condition ``cond``, span ``L``, m) struck at ``a`` (m from the origin end) by a
    mass ``mass`` (kg) falling ``h`` (m) — and the options, in SI units:

    ``basis`` the design code (:data:`droprig.solver.capacity.BASES`); ``phi`` the
    resistance factor and ``dif`` the dynamic increase factor on the yield strength;
    ``bearing`` the bearing length on the flange (m, 0 = a point contact);
    ``cushion_stiffness`` a spring cushion and ``load_stiffness`` the load's own
    underside in series with the member (N/m, ``None`` = none / rigid); a crushable
    layer of ``crush_force`` (N) and ``crush_stroke`` (m) (both or neither);
    ``udl`` a uniform load on the member (N/m) and ``self_weight`` its own weight;
    ``beam_mass`` the member's Rayleigh mass in the struck mass;
    ``deflection_limit_ratio`` span/N (information only), ``ductility_limit`` and
    ``rotation_limit`` (rad) beyond yield; ``dynamic_amplification`` the chain's
    amplification step (off by default, as the floor analysis's setting).

    Checked when made: an input outside its range raises
    :class:`~droprig.model.ModelError` naming the ``droprig check`` option."""

    section: Section
    grade: Grade
    cond: beam.EndCondition
    L: float
    a: float
    mass: float
    h: float
    basis: capacity.Basis
    phi: float = 1.0
    dif: float = 1.0
    bearing: float = 0.0
    cushion_stiffness: float | None = None
    load_stiffness: float | None = None
    crush_force: float | None = None
    crush_stroke: float | None = None
    udl: float = 0.0
    self_weight: bool = True
    beam_mass: bool = True
    deflection_limit_ratio: float = DEFAULT_DEFLECTION_LIMIT_RATIO
    ductility_limit: float = 6.0
    rotation_limit: float = math.radians(2.0)
    dynamic_amplification: bool = False

    def __post_init__(self) -> None:
        _check_inputs(self.cond, self.basis, self.L, self.a, self.mass, self.h,
                      self.bearing, self.udl, self.cushion_stiffness, self.load_stiffness,
                      self.crush_force, self.crush_stroke)

    @property
    def settings(self) -> Settings:
        """The chain's settings (a value outside the project's range is refused under
        the ``droprig check`` name of the option)."""
        return _settings(self.basis, self.phi, self.dif, self.deflection_limit_ratio,
                         self.ductility_limit, self.rotation_limit, self.beam_mass,
                         self.dynamic_amplification)


def assess_member(section: Section, grade: Grade, cond: beam.EndCondition, L: float,
                  a: float, mass: float, h: float, *, basis: capacity.Basis,
                  **options: Any) -> dict[str, Any]:
    """Assess one member (span L, m; end condition ``cond``) struck at ``a`` (m from
    the origin end) by a mass (kg) falling ``h`` (m), by the floor's chain
    (:func:`member_chain`). ``options``: the keyword fields of :class:`MemberDrop`
    (an unknown one raises ``TypeError``); :func:`assess` takes a :class:`MemberDrop`.

    Returns a dict with exactly :data:`RESULT_KEYS` in SI base units (m, N, N·m, kg,
    rad; ``governing_check`` a name from :data:`MEMBER_CHECKS` or ``collapse``,
    ``ductility``, ``rotation``; ``response`` ``elastic``/``plastic``/``exceeds``).
    Values that do not apply are ``None`` (never NaN or inf). ``utilisation`` is the
    largest elastic demand over resistance (above 1 for a plastic response: read
    ductility and rotation then). ``peak_force``, ``max_moment``, ``max_shear`` are
    at the force the member passes on: the elastic peak, or R_p once flexure yields.
    ``effective_mass`` is the member's Rayleigh mass scaled to the struck point,
    m_e·(f_s/f_struct)² (as the floor analysis), reported even where it is not used
    (η = 1 with a cushion or a crushable layer). ``load_stiffness`` (N/m): the load's
    own underside (skid, base frame, dunnage) in series with the member; ``None`` =
    rigid (the highest contact force); it does not change η. ``deflection_limit_ratio`` is
    validated but never changes the verdict (deflection is information only; the
    edges compare ``max_deflection`` with span/N themselves). Raises
    :class:`~droprig.model.ModelError` naming the argument for inputs outside range.

    ``dynamic_amplification`` (off by default, as the floor analysis's setting): the
    chain's ``dynamic_amplification`` step makes every check at its amplified force
    (:func:`droprig.solver.amplification.amplified_forces`, the same rule as the
    floor); ``amplification`` then holds the factors ``force``, ``moment``,
    ``shear``, ``deflection``, the ratios ``mass_ratio`` (r = M/mₑ) and
    ``compliance_ratio`` (κ) and ``set_by`` (what set each factor); ``None`` when off.
    """
    return assess(MemberDrop(section, grade, cond, L, a, mass, h, basis, **options))


def assess(drop: MemberDrop) -> dict[str, Any]:
    """:func:`assess_member` for a :class:`MemberDrop`."""
    c = member_chain(drop)
    out = _result(c, drop.cond, drop.L, drop.a)
    for k in RESULT_KEYS:
        if k not in ("governing_check", "response", "amplification"):
            out[k] = _clean(out[k])
    out["amplification"] = _amplification(c) if drop.dynamic_amplification else None
    return out


def _amplification(c: Chain) -> dict[str, Any]:
    """The chain's :class:`~droprig.solver.chain.DynamicAmplification` of the one
    point as plain numbers (factors ≥ 1) and what set each."""
    da = c[DynamicAmplification]
    return {"force": float(da.A_force[0]), "moment": float(da.A_moment[0]),
            "shear": float(da.A_shear[0]), "deflection": float(da.A_deflection[0]),
            "mass_ratio": _clean(float(da.mass_ratio[0])),
            "compliance_ratio": _clean(float(da.compliance_ratio[0])),
            "set_by": {k: amplification.SET_BY[int(v[0])] for k, v in da.set_by.items()}}


def member_chain(drop: MemberDrop) -> Chain:
    """The floor's chain (:func:`droprig.solver.chain.run_chain`) for one member
    struck at ``drop.a``, in the deck-less mode: every step result readable by type,
    ``chain[Impact].F``."""
    d = drop
    settings = d.settings
    w0 = (d.section.mass_per_length * impact.G if d.self_weight else 0.0) + d.udl
    fm = member_floor(d.section, d.grade, d.cond, d.L, w0, settings)
    bare = BareMember(
        mass=d.mass, h=d.h, bearing=d.bearing,
        f_load=0.0 if d.load_stiffness is None else 1.0 / d.load_stiffness,
        f_mat=0.0 if d.cushion_stiffness is None else 1.0 / d.cushion_stiffness,
        F_c=math.inf if d.crush_force is None else d.crush_force,
        s_c=0.0 if d.crush_stroke is None else d.crush_stroke)
    with np.errstate(all="ignore"):
        c = run_chain(Drop(fm, Project(settings=settings), _geometry(fm, d.a, bare), (),
                           np.zeros(1, dtype=np.int64), detail=False, bare=bare))
    if float(c[Compliance].f[0]) <= 0.0 and d.crush_force is None:
        raise ModelError("at", d.a, "a point off the supports (droprig takes supports as "
                         "rigid, so a load landing on one has no finite force) — or give "
                         "a cushion or a crushable layer", "m")
    return c


def _geometry(fm: FloorModel, a: float, bare: BareMember) -> Geometry:
    """The one drop point at ``a`` on the member's line (y = 0): its load path by the
    fast kernel (:func:`droprig.solver.loadpath.evaluate`); ``protection`` 0 under a
    cushion or a crushable layer (no struck-mass share), −1 otherwise."""
    x = np.array([float(a)])
    y = np.zeros(1)
    path = evaluate_path(fm.frame, x, y, with_mass=fm.settings.include_member_mass)
    return Geometry(x, y, path, np.zeros(1, dtype=np.int64),
                    np.full(1, 0 if bare.cushioned else -1, dtype=np.int64),
                    np.zeros(1, dtype=bool))


def _settings(basis: str, phi: float, dif: float, deflection_limit_ratio: float,
              ductility_limit: float, rotation_limit: float, beam_mass: bool,
              dynamic_amplification: bool = False) -> Settings:
    """The chain's settings; a value outside the project's range is refused under the
    ``droprig check`` name of the argument."""
    names = {"resistance_factor": "phi", "dynamic_increase_factor": "dif",
             "deflection_limit_ratio": "deflection-limit-ratio",
             "ductility_limit": "ductility-limit", "rotation_limit": "rotation-limit"}
    try:
        return Settings(design_basis=basis, resistance_factor=phi,  # type: ignore[arg-type]
                        dynamic_increase_factor=dif,
                        deflection_limit_ratio=deflection_limit_ratio,
                        ductility_limit=ductility_limit, rotation_limit=rotation_limit,
                        include_member_mass=beam_mass, include_existing_loads=True,
                        dynamic_amplification=dynamic_amplification)
    except ModelError as exc:
        field = str(exc.field).removeprefix("settings.")
        raise ModelError(names.get(field, field), exc.value, exc.allowed, exc.unit) from exc


def _check_inputs(cond: str, basis: str, L: float, a: float, mass: float, h: float,
                  bearing: float, udl: float, cushion_stiffness: float | None,
                  load_stiffness: float | None, crush_force: float | None,
                  crush_stroke: float | None) -> None:
    """Raise :class:`~droprig.model.ModelError` naming the first argument outside its
    range (the names of the ``droprig check`` options)."""
    if cond not in beam.END_CONDITIONS:
        raise ModelError("support", cond, "one of " + ", ".join(beam.END_CONDITIONS))
    if basis not in capacity.BASES:
        raise ModelError("code", basis, "one of " + ", ".join(capacity.BASES))
    if not (math.isfinite(L) and 0.5 <= L <= 60.0):  # Member.span of a project
        raise ModelError("span", L, "0.5 m to 60 m", "m")
    if not (math.isfinite(mass) and mass > 0.0):
        raise ModelError("mass", mass, "> 0")
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


def _at(chk: Check, F: float) -> float:
    """U of a check family at the force F (N); at an unbounded force (a bottomed
    layer on a rigid point) ∞ for a family the force loads, else its existing-load
    value."""
    if math.isfinite(F):
        return float(chk.U_at(np.array([F]))[0])
    u0, u1 = (float(chk.U_at(np.array([v]))[0]) for v in (0.0, 1.0))
    return math.inf if u1 > u0 else u0


def _member_deflection(fm: FloorModel, cond: beam.EndCondition, L: float, a: float,
                       F: float) -> float:
    """Largest |deflection| (m) along the member under F at ``a`` plus its existing
    UDL (AISC Manual Table 3-23 by superposition, sampled at 401 points and at a)."""
    if not math.isfinite(F):
        return math.inf
    EI = float(fm.frame.EI[0])
    x = np.append(np.linspace(0.0, L, _N_DEFLECTION_SAMPLES), a)
    y = F * beam.green(cond, L, EI, x, a) + beam.udl_deflection(cond, L, EI,
                                                                 float(fm.w0[0]), x)
    return float(np.max(np.abs(y)))


def _result(c: Chain, cond: beam.EndCondition, L: float, a: float) -> dict[str, Any]:
    """The chain's results under :data:`RESULT_KEYS` (floats, not yet cleaned)."""
    fm = c.drop.fm
    inp, comp, imp = c[LoadInputs], c[Compliance], c[Impact]
    ck, by, inv = c[Checks], c[BeyondYield], c[InverseAnswers]
    dem = c[Demands]
    chk = dem.checks
    W, F = float(inp.W[0]), float(imp.F[0])
    R_p = float(dem.actions.R_p[0])
    # flexure beyond its resistance on a section able to form a hinge: the member
    # passes on at most R_p (the chain's beyond-yield step)
    yielded = bool(ck.flex_exceeded[0]) and bool(fm.hinge is not None and fm.hinge[0])
    F_pk = min(F, R_p) if yielded else F
    collapsed = yielded and bool(by.collapsed[0])
    plastic = yielded and not bool(ck.brittle_fail[0]) and not collapsed
    out: dict[str, Any] = dict.fromkeys(RESULT_KEYS)
    out["static_deflection"] = float(imp.d_st[0])
    out["dynamic_factor"] = float(imp.K[0])
    out["peak_force"] = F_pk
    out["max_moment"] = _at(chk["flexure"], F_pk) * float(fm.Mr[0])
    out["max_shear"] = _at(chk["shear"], F_pk) * float(fm.Vr[0])
    # the struck-point mass, also where a cushion or a layer leaves it unused (η = 1)
    m_path = c.drop.geo.path.m_e if fm.settings.include_member_mass else np.zeros(1)
    out["effective_mass"] = float(impact.struck_point_mass(m_path, comp.f_s - comp.f_col,
                                                           comp.f_struct)[0])
    out["deceleration_g"] = float(impact.deceleration_g(F_pk, W))
    out["utilisation"] = float(ck.U[0])
    out["governing_check"] = CHECKS[int(by.gov_check[0])]
    out["response"] = RESPONSES[int(by.response[0])]
    out["allowable_drop_height"] = float(inv.h_el[0])
    # beyond yield only where the member can form a hinge and its brittle checks hold
    # at R_p (the chain's inverse answers; elsewhere its h_pl is the elastic height)
    usable = bool(fm.hinge is not None and fm.hinge[0]) and float(inv.Ub_Rp[0]) <= 1.0 \
        and float(ck.F_allow[0]) > 0.0 and float(by.nh_fa[0]) > R_p
    out["allowable_drop_height_plastic"] = float(inv.h_pl[0]) if usable else None
    if not collapsed:
        out["max_deflection"] = _member_deflection(fm, cond, L, a, F_pk)
    if plastic:
        d_member = max(float(by.d_m[0]) - R_p * float(comp.f_series[0]), 0.0)
        out["plastic_deflection"] = d_member
        out["ductility"] = float(by.ductility[0])
        out["support_rotation"] = float(by.theta[0])
        out["max_deflection"] = max(d_member, out["max_deflection"])
    return out
