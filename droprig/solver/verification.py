"""Time-history verification of the energy method for one member or one drop point.

* :func:`verify_member` — one member struck by one load (``droprig verify`` with
  ``droprig check``'s options);
* :func:`verify_point` — a drop point of a project: the struck member (the member of
  the load path carrying the larger share w of the load, with the chain's EI, crushing
  force and stroke: :func:`droprig.solver.pointhistory.struck_member`, the one source
  the chain's own point histories read) modelled alone, seeing the
  load through its share (:func:`droprig.solver.pointhistory.shared_load`: mass w²·M,
  weight w·W, speed v/w), the rest of the path (other framing, deck indentation and
  strip, the load's underside, a spring mat) as a massless spring in series with the
  contact; its demands are its share w of the chain's force;
* :func:`verification_table` — one row per bay summary, at the bay's governing point
  (the annex prints it).

Both methods are run on the same idealisation so that their ratio shows the method,
not the idealisation: the energy method of :func:`timehistory.energy_method_peaks`
(Gere 7th ed. §9.10 with the Rayleigh struck mass, as droprig applies it: η = 1 under
mats; the struck mass referred to the load, mₑ·(f_s/f)², as the floor chain and
droprig check take it) and the time history the verdict's point histories use,
:func:`exacthistory.exact_time_history` (Euler–Bernoulli modes, Blevins 1979 Table
8-1; each phase in closed form by modal superposition, Chopra §10–12). The factors
and demands shown are the chain's own amplification step at the point, exactly what
the verdict used. A rigid
contact is given KAPPA_MIN × the member's compliance (an Euler–Bernoulli member struck
rigidly has no converged contact force; moment and deflection do not depend on it).
SI units throughout.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, cast

import numpy as np

from droprig.model import Grade, Level, ModelError, Project, Section
from droprig.solver import (
    amplification,
    beam,
    exacthistory,
    impact,
    pointhistory,
    timehistory,
)
from droprig.solver.beam import EndCondition
from droprig.solver.capacity import Basis
from droprig.solver.geometry import Geometry

if TYPE_CHECKING:
    from droprig.solver.chain import Chain, DynamicAmplification

__all__ = [
    "QUANTITIES",
    "SKIP_OFF_PANEL",
    "SKIP_OVER_SUPPORT",
    "OverSupportError",
    "PointVerification",
    "Verification",
    "verification_table",
    "verify_member",
    "verify_point",
]

QUANTITIES: tuple[str, ...] = ("force", "moment", "shear", "deflection")
"""Compared peaks: contact force (N), member moment (N·m), end shear (N: the support
reactions, what the member's shear check and its end connections take on both sides —
the energy method's F times the largest static end reaction per unit force, the time
history's largest |shear| at the member's ends), deflection (m)."""

ENVELOPE_SAMPLES = 400
"""Equal intervals over the member at which the verification's energy column reads the
largest unit-load deflection G(x, a) (and at a itself): the resolution the
verification has always printed (the chain's point histories take 200)."""


@dataclass(frozen=True)
class Verification:
    """Energy method and time history of one struck member, impact alone (SI).

    ``energy``, ``time_history``, ``amplification`` map :data:`QUANTITIES` to the
    energy method's peak (capped by crushing as the chain caps it), the time
    history's peak (with the same elastic–perfectly plastic contact) and the factor
    the verdict applies (:func:`droprig.solver.amplification.amplified_forces`);
    ``verdict`` the demand the checks use (factor × energy), ``crushing_force`` (N,
    ∞ none) and what sets it, ``cap_by`` (:data:`droprig.solver.pointhistory.CAP_BY`:
    the deck's crushing, the web's local yielding under the load, the crushable
    layer), ``stroke`` (m, how deep the contact may crush at that force, ∞ none) and
    ``crush`` (m) the time history's crushed depth (of the contact itself, in the
    load's travel: at most ``stroke``);
    ``energy_deflection_at_point`` (m) is F·G(a, a) for the plot of the struck
    point; ``mass_ratio`` r = M/mₑ (w²·M/mₑ where the member takes a lever-rule share
    w of the load), ``compliance_ratio`` κ = f_c/f_s (the contact as the member sees it);
    ``contact_compliance`` (m/N) the contact spring the time history used
    (``contact_assumed`` when a rigid contact was given KAPPA_MIN × f_s); ``modes``
    integrated in time, ``time_step`` (s), ``separation_time`` (s, None if the load
    stays in contact); ``history``: the recorded histories (their shear: the largest
    along the member); ``section_shear`` (N): the time history's largest |shear| of
    any section — beside the load it carries the contact pulse into the web, which
    the web's local checks take at the contact force (the ``shear`` row compares end
    shears, the same quantity on both sides)."""

    energy: dict[str, float]
    time_history: dict[str, float]
    amplification: dict[str, float]
    energy_deflection_at_point: float
    mass_ratio: float
    compliance_ratio: float
    contact_compliance: float
    contact_assumed: bool
    modes: int
    time_step: float
    separation_time: float | None
    history: timehistory.History
    verdict: dict[str, float] | None = None
    crushing_force: float = math.inf
    cap_by: str = "crushing"
    crush: float = 0.0
    stroke: float = math.inf
    section_shear: float = math.nan

    def ratio(self, key: str) -> float | None:
        """Energy method ÷ time history of ``key`` (None where the history is 0)."""
        t = self.time_history[key]
        return self.energy[key] / t if t > 0 else None


@dataclass(frozen=True)
class PointVerification:
    """:class:`Verification` of a project drop point: zone, load, point (m), bay,
    the member modelled (id, end condition, span L and position a in m, stiffness EI
    in N·m² — the chain's, composite where the member is studded) and the chain's own
    peak force on the framing there (N, the whole path: the two-mass model's where two
    forces per point, else the energy method's); the member, EI, crushing force and
    stroke are the chain's own (:func:`droprig.solver.pointhistory.struck_member`).

    ``pad_edge``: ``"tip_off"`` where the tip-off over a crushable pad's edge governs
    the point (:func:`droprig.solver.evaluate.governing_point`): what is verified is the
    deck contact as a landing on the bare deck from the bound's height, the fall
    ``fall`` = H − Δ (m; Δ = ``tip_delta``, m) — the tipping motion itself (the turn
    about the pad's edge, the layer crushing under it) is not in the time history, the
    energy bound W·(H − Δ) stands for it (tests/solver/test_pad_edge.py holds it
    against a rigid-block history); ``"on_pad"`` where landing on the pad governs (the
    tip-off checked too); ``""`` elsewhere."""

    zone_id: str
    load_name: str
    x: float
    y: float
    bay_id: str
    member_id: str
    cond: str
    L: float
    a: float
    chain_peak_force: float
    verification: Verification
    EI: float = math.nan
    pad_edge: str = ""
    fall: float = math.nan
    tip_delta: float = math.nan


SKIP_OVER_SUPPORT = "over a support"
"""Why a bay's governing point is left out of the verification table: over a column or
a support of the modelled member, where that member does not move."""

SKIP_OFF_PANEL = "off a deck panel"
"""Why a bay's governing point is left out: no deck panel under it (past an edge, or in
an opening)."""


class OverSupportError(ModelError):
    """A point over a support of the modelled member: the member does not move there,
    so its time history is no check of the point (:data:`SKIP_OVER_SUPPORT`).
    ``member_id`` names the member where known, ``along`` (m) where the point lies
    along it (the window says both in the project's units)."""

    member_id: str = ""
    along: float = math.nan


@functools.lru_cache(maxsize=256)
def _member_history(cond: EndCondition, L: float, EI: float, mu: float, a: float, M: float,
                    h: float, f_c: float, F_yield: float, stroke: float, weight: float,
                    kGA: float = math.inf, rhoI: float = 0.0) -> timehistory.TimeHistoryPeaks:
    """:func:`droprig.solver.exacthistory.exact_time_history` of one case with the
    verdict's settings (:data:`droprig.solver.pointhistory.TH_OPTIONS`), histories
    recorded; arguments as there (SI; ``kGA``, ``rhoI`` the Timoshenko member's).
    Remembered by its exact inputs: a project of equal levels, or a regular grid, asks
    the annex's verification table for the same member history many times (a stress
    project of three equal levels: 390 bays, 30 distinct histories). The result is
    shared: read it, never write to it."""
    return exacthistory.exact_time_history(cond, L, EI, mu, a, M, h, f_c, record=True,
                                           F_yield=F_yield, stroke=stroke, weight=weight,
                                           kGA=kGA, rhoI=rhoI, **pointhistory.TH_OPTIONS)


def _verify(s: dict[str, float], M: float, h: float, struck_mass: bool, *,
            chain_factors: tuple[float, dict[str, float]],
            contact_force: tuple[float, float] | None = None) -> Verification:
    """The verification of the struck member ``s`` (:func:`_struck`: one point's
    :func:`droprig.solver.pointhistory.struck_member` record — end condition, L and a
    (m), EI (N·m²), μ (kg/m), share w, own compliance G(a, a) and the path's f_all
    (m/N), crushing force (N), stroke (m) and what caps the contact, the Timoshenko
    terms κGA (N) and ρI (kg·m), :func:`droprig.solver.pointhistory.timoshenko_terms`)
    struck by the load of mass ``M`` (kg) falling ``h`` (m, with the hoist's head:
    :func:`droprig.solver.chain.energy_fall`); ``struck_mass``: whether the chain's
    energy method took the struck-mass share. ``chain_factors``: the chain's force on
    the framing at the point (N) and its factors by :data:`QUANTITIES` (the verdict's:
    no force of its own). The member's lever-rule share w (0.5–1; the rest of the
    path's compliance beyond w²·G(a, a) may be negative down to −(1 − w²)·G(a, a)):
    the time history sees the load through it (:func:`droprig.solver.pointhistory.
    shared_load`) and the member's energy-method and verdict demands are w × those of
    the whole force — the chain's own energy peaks on the member
    (:func:`droprig.solver.pointhistory.member_energy_peaks`, the one place the w·F ×
    unit-load envelopes are worked out). ``contact_force``: the force row's (N) and
    factor (:func:`_contact_row`)."""
    cond = cast(EndCondition, str(s["cond"]))
    L, EI, mu, a = float(s["L"]), float(s["EI"]), float(s["mu"]), float(s["a"])
    f_s = float(s["g_m"])
    if not f_s > 0.0:
        raise OverSupportError("at", a, "a point off the supports (the member does not "
                               "move there)", "m")
    w = min(max(float(s["share"]), 0.5), 1.0)
    W = M * impact.G
    F_yield = float(s["F_yield"])
    cap = F_yield if F_yield > W else math.inf
    stroke = float(s["stroke"])
    # the load as the member sees it (w = 1: as it is)
    # the rest of the path in series: everything but the member's own spring under its
    # share w (f_all − G(a, a), then G(a, a) + that: shared_load takes the whole path)
    f_c = float(s["f_all"]) - f_s
    r = pointhistory.shared_load(w, M, h, f_s + f_c, f_s, cap, stroke)
    f_b = float(r["f_c"][()])
    assumed = f_b <= amplification.KAPPA_MIN * f_s
    f_th = max(f_b, amplification.KAPPA_MIN * f_s)
    # the integrator and settings of the verdict's own point histories
    t = _member_history(cond, L, EI, mu, a, float(r["M"][()]), float(r["h"][()]), f_th,
                        float(r["F_yield"][()]), float(r["stroke"][()]),
                        float(r["weight"][()]), float(s["kGA"]), float(s["rhoI"]))
    # the table's mass ratio of the member struck alone (the verification's r):
    # M over the Rayleigh mass mₑ = β·μ·L (amplification.amplification's r)
    m_e = float(beam.rayleigh_mass_factor(cond, np.asarray(L), np.asarray(a))) * mu * L
    r_mass = M / m_e if m_e > 0.0 else math.inf
    # what the verdict uses: the chain's own force on the framing on this member's
    # unit-load envelopes (its share w; the contact force is the load's), times the
    # chain's factors (its amplification step; 1 with amplification off)
    F, factor = chain_factors
    rec = {k: np.atleast_1d(np.asarray(v)) for k, v in s.items()}
    rec["share"] = np.array([w])
    peaks = pointhistory.member_energy_peaks(rec, np.array([F]), samples=ENVELOPE_SAMPLES)
    energy = {k: float(peaks[k][0]) for k in QUANTITIES}
    if contact_force is not None and contact_force[0] > 0.0:
        energy, factor = _contact_row(energy, factor, *contact_force)
    assert t.history is not None
    t_sep = float(t.t_separation[0])
    th = {k: float(getattr(t, k)[0]) for k in QUANTITIES}
    # end shears on both sides (the energy column's: F × the largest static end reaction)
    ends = t.shear if t.reaction is None else t.reaction
    section_shear, th["shear"] = th["shear"], float(ends[0])
    history = t.history
    if w < 1.0:
        # back from the member's coordinate: force P/w, travel and crushed depth w·Q
        th["force"] /= w
        history = replace(history, contact_force=history.contact_force / w,
                          load_displacement=history.load_displacement * w)
    return Verification(
        energy=energy, time_history=th, amplification=factor,
        verdict={k: factor[k] * energy[k] for k in QUANTITIES},
        crushing_force=cap, cap_by=pointhistory.CAP_BY[int(s.get("cap_by", 0))],
        crush=w * float(t.crush[0]) if t.crush is not None else 0.0,
        stroke=stroke if math.isfinite(cap) else math.inf,
        energy_deflection_at_point=w * F * f_s,
        mass_ratio=r_mass * w**2, compliance_ratio=f_b / f_s,
        contact_compliance=f_th, contact_assumed=assumed, modes=int(t.modes[0]),
        time_step=float(t.dt[0]), separation_time=t_sep if math.isfinite(t_sep) else None,
        history=history, section_shear=section_shear)


def _contact_row(energy: dict[str, float], factor: dict[str, float], F_local: float,
                 A_local: float) -> tuple[dict[str, float], dict[str, float]]:
    """The force row compares the force at the contact that the point's checks take,
    F_local (N: the deck's flexure and punching take the chain's deck force F_deck;
    where there is no deck the webs under the load take the force on the framing F),
    times the factor ``A_local`` those checks take (the chain's amplification of that
    family, 1 with amplification off), beside the time history's contact force. Not
    the chain's two-mass contact spike under a hard load on a bare deck
    (``Impact.contact``): no strength check takes it — the local-damage checks judge
    that strike by its speed (DOE-STD-3014 App. C) — so it is not the verdict's."""
    return {**energy, "force": F_local}, {**factor, "force": A_local}


def _local_force(chain: Chain, amplified: bool) -> tuple[float, float]:
    """The force at the contact that the chain's checks take at its first point (N)
    and the factor they take it with: the deck's force F_deck where the point has deck
    checks (flexure, punching: the contact force under a declared soft underside, the
    one-mass force of the load on deck and framing in series under a hard load,
    :func:`droprig.solver.chain.two_forces`), else the force on the framing F (the
    webs' local checks under the load); the factor the chain's amplification gives
    that family where the verdict is ``amplified``, else 1."""
    from droprig.solver.chain import Demands, DynamicAmplification, Impact

    imp = chain[Impact]
    deck = "deck_punching" in chain[Demands].checks
    F = float((imp.deck if deck else imp.F)[0])
    if not amplified:
        return F, 1.0
    da = chain[DynamicAmplification]
    family = "deck_punching" if deck else "web_yielding"
    A = da.factor.get(family, da.A_force)
    return F, float(A[0])


def verify_member(section: Section, grade: Grade, cond: EndCondition, L: float, a: float,
                  mass: float, h: float, *, cushion_stiffness: float | None = None,
                  load_stiffness: float | None = None,
                  beam_mass: bool = True, basis: Basis = "aisc360", bearing: float = 0.0,
                  udl: float = 0.0, self_weight: bool = True) -> Verification:
    """One member (SI inputs as :func:`droprig.solver.member.assess_member`), verified
    as a floor of one member: ``droprig check --amplified``'s chain
    (:func:`droprig.solver.member.member_chain`, the chain's amplification step, its
    own time history where it ran one; ``basis``, ``bearing`` (m), ``udl`` (N/m) and
    ``self_weight`` as the check's) and its struck-member record, read as the floor's
    verification reads it (:func:`verify_point`): the contact compliance
    1/k_cushion + 1/k_load in series, the struck-mass share mₑ·(f_s/f)² unless a mat is
    given or ``beam_mass`` is off (droprig check's rule), the contact capped as the
    chain caps it (the bare flange's local yield force over the flange's thickness,
    :func:`droprig.solver.capacity.flange_contact_force_bound`). Raises
    :class:`OverSupportError` (field ``at``) on a support, where the member does not
    move."""
    if cond not in beam.END_CONDITIONS:
        raise ModelError("support", cond, "one of " + ", ".join(beam.END_CONDITIONS))
    from droprig.solver.member import MemberDrop, member_chain

    c = member_chain(MemberDrop(section, grade, cond, L, a, mass, h, basis=basis,
                                bearing=bearing, cushion_stiffness=cushion_stiffness,
                                load_stiffness=load_stiffness, udl=udl,
                                self_weight=self_weight, beam_mass=beam_mass,
                                dynamic_amplification=True))
    ver, _ = _chain_verification(c, amplified=True, where=("at", float(a)))
    return ver


def _factors(da: DynamicAmplification, i: int) -> dict[str, float]:
    """The chain's amplification factors at point ``i`` by :data:`QUANTITIES`."""
    return {"force": float(da.A_force[i]), "moment": float(da.A_moment[i]),
            "shear": float(da.A_shear[i]), "deflection": float(da.A_deflection[i])}


def _struck(chain: Chain, steel_only: bool = False) -> dict[str, float]:
    """The chain's struck member at its first point
    (:func:`droprig.solver.pointhistory.struck_member`, the one source the chain's own
    point histories read), as scalars; its mass per length μ (kg/m) the record's — the
    steel with the deck and superimposed dead load over its tributary width — or, with
    ``steel_only``, the frame's alone (:func:`verify_point`'s ``slab_mass`` off); the
    steel section's where the project leaves member mass out of the struck mass (a
    time history needs the member's mass)."""
    s = {k: v[0] for k, v in pointhistory.struck_member(chain, np.zeros(1, dtype=np.int64)
                                                        ).items()}
    member = chain.drop.fm.level.members[int(s["member"])]
    mu = float(s["mu_steel"]) if steel_only else float(s["mu"])
    s["mu"] = mu if mu > 0.0 else member.section.mass_per_length
    return s


def _chain_verification(chain: Chain, *, amplified: bool, where: tuple[str, object],
                        steel_only: bool = False) -> tuple[Verification, dict[str, float]]:
    """The verification of a chain's first point — a floor's drop point or a member's
    one-member floor, read the same way: the struck member's record (:func:`_struck`),
    the chain's load, strike speed (the free fall plus the hoist's lowering-speed
    head, h + v_h²/2g, :func:`droprig.solver.chain.energy_fall`: the time history
    starts at the same speed), force on the framing and contact force (N), and, where
    the verdict is ``amplified``, its factors — else the verdict is the energy method
    (factors 1); the force row compares the chain's contact force (what the local
    checks take). Raises :class:`OverSupportError` naming ``where`` (the field and
    its value: the point, or the member's struck position in m) over a support of the
    struck member. Returns the verification and the record."""
    from droprig.solver.chain import (
        DynamicAmplification,
        Impact,
        LoadInputs,
        StruckMass,
        energy_fall,
    )

    s = _struck(chain, steel_only)
    if bool(s["over_support"]):
        member = chain.drop.fm.level.members[int(s["member"])]
        field, value = where
        # droprig verify's member (field "at", m) is the one-member floor's only member
        name = "the member" if field == "at" else f"member {member.id}"
        err = OverSupportError(field, value,
                               f"a point off the supports of {name} (it is "
                               f"{float(s['a']):.3f} m along it, over a support, where "
                               "the modelled member does not move)",
                               "m" if field == "at" else "")
        err.member_id, err.along = str(member.id), float(s["a"])
        raise err
    inp, imp = chain[LoadInputs], chain[Impact]
    amplified = amplified and DynamicAmplification in chain
    factors = (_factors(chain[DynamicAmplification], 0) if amplified
               else dict.fromkeys(QUANTITIES, 1.0))
    h_e = float(energy_fall(chain, inp.h)[0])
    ver = _verify(s, float(inp.M[0]), h_e, bool(chain[StruckMass].m_e[0] > 0.0),
                  chain_factors=(float(imp.F[0]), factors),
                  contact_force=_local_force(chain, amplified))
    if not amplified:
        # the checks use the chain's energy method alone (amplification off in the
        # project's settings): that is the demand the verdict uses (the force row: the
        # force at the contact the point's checks take)
        ver = replace(ver, verdict=dict(ver.energy),
                      amplification=dict.fromkeys(QUANTITIES, 1.0))
    return ver, s


def verify_point(project: Project, zone_id: str, load_name: str, x: float,
                 y: float, *, slab_mass: bool = True) -> PointVerification:
    """A drop point (x, y in m) of load ``load_name`` of lift zone ``zone_id`` (see the
    module docstring for the idealisation). Raises :class:`ModelError` naming the
    zone, load or point when they do not exist or the point is not over a deck panel,
    over an opening, or :class:`OverSupportError` over a support of the modelled
    member. The member and the contact are the chain's own
    (:func:`droprig.solver.pointhistory.struck_member`, as the chain's point
    histories take them): the chain's EI (composite where studded), and a contact
    elastic–perfectly plastic as the chain caps it — ``Impact.F_cap`` over
    ``Impact.cap_depth`` (the lesser of the deck's crushing, over a concrete deck's
    cover or a steel deck's plate, and the web's local yielding under the contact,
    over the flange's thickness: :func:`droprig.solver.chain.web_contact_bound`), or
    a crushable layer's force over its stroke.

    ``slab_mass`` (default): the member's mass per length also carries the deck's
    self-weight and the level's superimposed dead load over its tributary width,
    μ + (g_deck + q_sd)·b/g (kg/m; :func:`droprig.solver.chain.slab_frame`, the mass
    the chain's two-mass step and struck mass take; lever rule, common practice, no
    source) — the slab moves with the member it sits on, as the verdict's point
    histories take it (:func:`droprig.solver.pointhistory.struck_member`). Off: the
    steel's mass alone (the idealisation before stop 27), to show how far the mass
    moves the comparison. The member is a Timoshenko beam
    (:func:`droprig.solver.pointhistory.timoshenko_terms`)."""
    from droprig.solver.chain import DynamicAmplification, Impact, LoadInputs
    from droprig.solver.evaluate import governing_point, point_case

    case = point_case(project, zone_id, load_name, x, y, opening=True,
                      fields=("verify.lift", "verify.load", "verify.point"))
    fm, geo = case.fm, case.geo
    # the case and landing that govern the point, as the calculation trace follows them
    # (at a pad's edge the tip-off's chain: its fall H − Δ onto the bare deck)
    gp = governing_point(fm, project, case.load, geo, case.zone.hoist_speed)
    chain = gp.chain
    inp = chain[LoadInputs]
    tip = gp.tip_governs and inp.fall_offset is not None
    edge = "" if not gp.cases else "tip_off" if tip else "on_pad"
    amplified = bool(project.settings.dynamic_amplification and DynamicAmplification in chain)
    ver, s = _chain_verification(chain, amplified=amplified, steel_only=not slab_mass,
                                 where=("verify.point", (float(x), float(y))))
    member = fm.level.members[int(s["member"])]
    return PointVerification(zone_id=zone_id, load_name=load_name, x=float(x), y=float(y),
                             bay_id=_bay_name(fm.level, geo), member_id=member.id,
                             cond=str(s["cond"]), L=float(s["L"]), a=float(s["a"]),
                             chain_peak_force=float(chain[Impact].F[0]),
                             verification=ver, EI=float(s["EI"]), pad_edge=edge,
                             fall=float(inp.h[0]),
                             tip_delta=float(inp.fall_offset[0])  # type: ignore[index]
                             if tip else math.nan)


def _bay_name(level: Level, geo: Geometry) -> str:
    """The id of the column bay (droprig.model.bays) the point lies in, '' if none."""
    from droprig.model import bays

    b = int(geo.bay[0])
    all_bays = bays(level)
    return all_bays[b].id if 0 <= b < len(all_bays) else ""


def verification_table(project: Project, results: object, *,
                       zone_id: str | None = None,
                       skipped: list[tuple[object, str]] | None = None,
                       slab_mass: bool = True,
                       ) -> tuple[PointVerification, ...]:
    """One :class:`PointVerification` per bay summary of ``results`` (a
    :class:`~droprig.solver.results.Results`), at the bay's governing point; bays whose
    governing point cannot be verified (over a support of the modelled member, off a
    deck panel) are left out, and appended to ``skipped`` (when given) as (bay
    summary, :data:`SKIP_OVER_SUPPORT` or :data:`SKIP_OFF_PANEL`) so the reader can be
    told which were not verified and why. ``zone_id`` keeps
    one lift zone; ``slab_mass`` as :func:`verify_point`."""
    rows: list[PointVerification] = []
    for b in getattr(results, "bays", ()):
        if zone_id is not None and b.zone_id != zone_id:
            continue
        try:
            pv = verify_point(project, b.zone_id, b.load_name, b.governing_x, b.governing_y,
                              slab_mass=slab_mass)
        except OverSupportError:
            if skipped is not None:
                skipped.append((b, SKIP_OVER_SUPPORT))
            continue
        except ModelError:
            if skipped is not None:
                skipped.append((b, SKIP_OFF_PANEL))
            continue
        rows.append(PointVerification(**{**pv.__dict__, "bay_id": b.bay_id}))
    return tuple(rows)
