"""``droprig verify``: the time history of one member struck by one dropped load,
beside the energy method that ``droprig check`` uses.

Takes ``droprig check``'s options (same units, ranges and messages). Prints, for the
impact alone (existing loads excluded, they are static and add the same to both), the
energy method's peak contact force, member moment, shear and deflection, the time
history's (:mod:`droprig.solver.timehistory`), their ratio, and the amplified demand
of :mod:`droprig.solver.amplification`; ``--json`` one JSON object in SI units;
``--plots DIR`` force-, deflection- and moment-time PNGs. A crushable layer is not
modelled by the time history (elastic contact only) and is refused by name.
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from dataclasses import dataclass
from typing import Any

from droprig.cli import CAUTION, EXIT_BAD_INPUT, EXIT_OK
from droprig.commands.check import (
    DROP_RANGE,
    LOAD_STIFFNESS_RANGE,
    MASS_RANGE,
    SPAN_RANGE,
    STIFFNESS_RANGE,
    _BadInputError,
    _parse,
    _range,
)
from droprig.model import ModelError
from droprig.units import UnitError, fmt

QUANTITIES: tuple[tuple[str, str, str], ...] = (
    ("force", "peak contact force", "force"),
    ("moment", "peak member moment", "moment"),
    ("shear", "peak member shear", "force"),
    ("deflection", "peak member deflection", "small_length"),
)
"""(key, label, unit quantity) of the compared peaks, in print and JSON order."""


@dataclass(frozen=True)
class MemberVerification:
    """Everything ``verify`` reports for one member (SI units)."""

    energy: dict[str, float]
    time_history: dict[str, float]
    amplification: dict[str, float]
    mass_ratio: float
    compliance_ratio: float
    contact_compliance: float
    contact_assumed: bool
    modes: int
    time_step: float
    separation_time: float | None
    history: Any


def run(args: argparse.Namespace) -> int:
    """Body of ``droprig verify``; 0 on success, 2 on bad input (message on stderr)."""
    try:
        return _run(args)
    except (_BadInputError, UnitError) as exc:
        print(f"droprig verify: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except ModelError as exc:
        print(f"droprig verify: --{exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except OSError as exc:
        print(f"droprig verify: --plots: {exc.strerror or exc}: "
              f"{getattr(exc, 'filename', '') or ''}".rstrip(), file=sys.stderr)
        return EXIT_BAD_INPUT


def verify_member(section: Any, grade: Any, cond: str, L: float, a: float, mass: float,
                  h: float, *, cushion_stiffness: float | None = None,
                  load_stiffness: float | None = None,
                  beam_mass: bool = True) -> MemberVerification:
    """Energy method and time history of one member (SI inputs as for
    :func:`droprig.solver.member.assess_member`). The contact compliance is
    1/k_cushion + 1/k_load; with neither (a rigid load on the bare member) it is taken
    as :data:`~droprig.solver.amplification.KAPPA_MIN` × the member's compliance, since
    an Euler–Bernoulli member struck rigidly has no converged contact force
    (``contact_assumed``)."""
    from droprig.solver import amplification, beam, timehistory

    EI = grade.E * section.Ix
    mu = section.mass_per_length
    f_s = float(beam.green(cond, L, EI, a, a))
    f_c = 0.0
    if cushion_stiffness is not None:
        f_c += 1.0 / cushion_stiffness
    if load_stiffness is not None:
        f_c += 1.0 / load_stiffness
    assumed = f_c <= amplification.KAPPA_MIN * f_s
    f_th = max(f_c, amplification.KAPPA_MIN * f_s)
    # droprig's energy rule: η from the struck mass unless a mat is in the path
    e = timehistory.energy_method_peaks(cond, L, EI, mu, a, mass, h, f_c,
                                        struck_mass=beam_mass and cushion_stiffness is None)
    t = timehistory.time_history(cond, L, EI, mu, a, mass, h, f_th, record=True)
    m_e = float(e.effective_mass)
    amp = amplification.amplification(mass, m_e, f_c, f_s)
    energy = {"force": float(e.force), "moment": float(e.moment), "shear": float(e.shear),
              "deflection": float(e.deflection)}
    th = {"force": float(t.force[0]), "moment": float(t.moment[0]),
          "shear": float(t.shear[0]), "deflection": float(t.deflection[0])}
    factors = {"force": float(amp.force), "moment": float(amp.moment),
               "shear": float(amp.shear), "deflection": float(amp.deflection)}
    t_sep = float(t.t_separation[0])
    return MemberVerification(
        energy=energy, time_history=th, amplification=factors,
        mass_ratio=float(amp.mass_ratio), compliance_ratio=f_c / f_s,
        contact_compliance=f_th, contact_assumed=assumed, modes=int(t.modes[0]),
        time_step=float(t.dt[0]), separation_time=t_sep if math.isfinite(t_sep) else None,
        history=t.history)


def _run(args: argparse.Namespace) -> int:
    from droprig.io.sections import GradeNotFound, SectionNotFound, get_grade, get_section
    from droprig.solver import beam

    try:
        section = get_section(args.section)
    except SectionNotFound as exc:
        raise _BadInputError(f"--section: {exc}") from exc
    try:
        grade = get_grade(args.grade)
    except GradeNotFound as exc:
        raise _BadInputError(f"--grade: {exc}") from exc
    system = args.units or ("US" if grade.family == "ASTM" else "SI")
    span = _parse(args, "span", "length", system)
    at = _parse(args, "at", "length", system)
    mass = _parse(args, "mass", "mass", system)
    drop = _parse(args, "drop", "length", system)
    assert span is not None and at is not None and mass is not None and drop is not None
    k_c = _parse(args, "cushion-stiffness", "stiffness", system)
    k_load = _parse(args, "load-stiffness", "stiffness", system)
    _range("--span", span, *SPAN_RANGE, "length", system)
    _range("--at", at, 0.0, span, "length", system)
    _range("--mass", mass, *MASS_RANGE, "mass", system)
    _range("--drop", drop, *DROP_RANGE, "length", system)
    if k_c is not None:
        _range("--cushion-stiffness", k_c, *STIFFNESS_RANGE, "stiffness", system)
    if k_load is not None:
        _range("--load-stiffness", k_load, *LOAD_STIFFNESS_RANGE, "stiffness", system)
    if args.crush_force is not None or args.crush_stroke is not None:
        raise _BadInputError("--crush-force: the time history models an elastic contact "
                             "only; verify without the crushable layer, or with "
                             "--cushion-stiffness for an elastic mat")
    if float(beam.green(args.support, span, 1.0, at, at)) <= 0.0:
        raise _BadInputError(f"--at: {fmt(at, 'length', system)} is on a support of a "
                             f"{args.support} member, which does not move; move the point")

    v = verify_member(section, grade, args.support, span, at, mass, drop,
                      cushion_stiffness=k_c, load_stiffness=k_load,
                      beam_mass=not args.no_beam_mass)
    plots: list[str] = []
    if args.plots:
        from droprig.report.verify_plots import VerificationPlotData, write_verification_pngs

        title = (f"{section.name}, {args.support} {fmt(span, 'length', system)}, "
                 f"{fmt(mass, 'mass', system)} from {fmt(drop, 'length', system)}")
        data = VerificationPlotData(history=v.history, energy_force=v.energy["force"],
                                    energy_deflection=_energy_at_point(v, section, grade,
                                                                       args.support, span, at),
                                    energy_moment=v.energy["moment"], title=title)
        plots = [str(p) for p in write_verification_pngs(data, args.plots, system)]
    if args.json:
        print(json.dumps(_as_json(v, plots), indent=2))
        return EXIT_OK
    print(_table(args, section.name, grade.name, system, span, at, mass, drop, v, plots))
    return EXIT_OK


def _energy_at_point(v: MemberVerification, section: Any, grade: Any, cond: str, L: float,
                     a: float) -> float:
    """The energy method's deflection at the struck point, F·G(a, a) (m), for the plot
    of the struck point's deflection."""
    from droprig.solver import beam

    return v.energy["force"] * float(beam.green(cond, L, grade.E * section.Ix, a, a))


def _as_json(v: MemberVerification, plots: list[str]) -> dict[str, Any]:
    ratio = {k: (v.energy[k] / v.time_history[k] if v.time_history[k] > 0 else None)
             for k, _, _ in QUANTITIES}
    return {
        "energy_method": v.energy,
        "time_history": v.time_history,
        "energy_over_time_history": ratio,
        "amplification": v.amplification,
        "amplified_demand": {k: v.amplification[k] * v.energy[k] for k, _, _ in QUANTITIES},
        "mass_ratio": v.mass_ratio,
        "compliance_ratio": v.compliance_ratio,
        "contact_compliance": v.contact_compliance,
        "contact_assumed": v.contact_assumed,
        "modes": v.modes,
        "time_step": v.time_step,
        "separation_time": v.separation_time,
        "plots": plots,
        "caution": CAUTION,
    }


def _table(args: argparse.Namespace, section: str, grade: str, system: str, span: float,
           at: float, mass: float, drop: float, v: MemberVerification,
           plots: list[str]) -> str:
    sysu: Any = system
    lines = [
        f"droprig verify — {section} {grade}, {args.support} span "
        f"{fmt(span, 'length', sysu)}, struck at {fmt(at, 'length', sysu)} from the origin end",
        f"load {fmt(mass, 'mass', sysu)} dropped {fmt(drop, 'length', sysu)}; impact alone "
        "(existing loads are static and add the same to both methods)",
        f"load mass ÷ struck effective mass {v.mass_ratio:.3g}; contact ÷ member compliance "
        f"{v.compliance_ratio:.3g}; {v.modes} member modes in time, step "
        f"{v.time_step * 1e6:.3g} µs"
        + (f"; the load separates at {v.separation_time * 1e3:.3g} ms"
           if v.separation_time is not None else "; the load stays in contact"),
    ]
    if v.contact_assumed:
        lines.append("rigid contact: the time history takes a contact compliance of 0.1 % "
                     "of the member's (a rigid hit on an Euler–Bernoulli member has no "
                     "converged contact force); moment and deflection do not depend on it")
    lines.append("")
    head = f"  {'':<24}{'energy method':>16}{'time history':>16}{'energy ÷ TH':>13}" \
           f"{'factor':>8}{'amplified':>16}"
    lines.append(head)
    for key, label, quantity in QUANTITIES:
        e, t, f = v.energy[key], v.time_history[key], v.amplification[key]
        ratio = f"{e / t:.2f}" if t > 0 else "none"
        lines.append(f"  {label:<24}{fmt(e, quantity, sysu):>16}{fmt(t, quantity, sysu):>16}"
                     f"{ratio:>13}{f:>8.2f}{fmt(f * e, quantity, sysu):>16}")
    lines.append("")
    lines.append("Energy method: Gere §9.10 with the Rayleigh struck mass (as droprig check). "
                 "Time history: Euler–Bernoulli modes (Blevins Table 8-1), compression-only "
                 "contact, Newmark average acceleration. The amplified demand is the "
                 "energy method times the calibrated factor; it is never below the time "
                 "history on the calibration's random cases.")
    for p in plots:
        lines.append(f"plot written: {p}")
    lines.append(CAUTION)
    return "\n".join(lines)
