"""``droprig verify``: the time history beside the energy method.

``droprig verify FILE [--lift ID] [--bay ID] [--load NAME]``: the governing point of
each bay of a project's analysis (:func:`droprig.solver.verification_table`); with one
point selected, the full comparison (and ``--plots``). Without FILE, one member with
``droprig check``'s options (same units, ranges and messages). Prints, for the
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
import sys
from typing import TYPE_CHECKING, Any

from droprig.cli import EXIT_BAD_INPUT, EXIT_OK
from droprig.commands.check import (
    UDL_RANGE,
    _BadInputError,
    _parse,
    _range,
    member_drop,
)
from droprig.model import ModelError
from droprig.texts import CAUTION
from droprig.units import UnitError, fmt

if TYPE_CHECKING:
    from droprig.solver import Verification

QUANTITIES: tuple[tuple[str, str, str], ...] = (
    ("force", "peak contact force", "force"),
    ("moment", "peak member moment", "moment"),
    ("shear", "peak member end shear", "force"),
    ("deflection", "peak member deflection", "small_length"),
)
"""(key, label, unit quantity) of the compared peaks, in print and JSON order."""


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


_MEMBER_REQUIRED = ("section", "grade", "span", "at", "mass", "drop")
_MEMBER_ONLY = (*_MEMBER_REQUIRED, "bearing", "cushion_stiffness", "load_stiffness",
                "crush_force", "crush_stroke", "udl")


def _run(args: argparse.Namespace) -> int:
    if args.file is not None:
        given = [n for n in _MEMBER_ONLY if getattr(args, n) is not None]
        if given:
            raise _BadInputError(f"--{given[0].replace('_', '-')}: member options are for "
                                 "verifying one member without a project file; with FILE "
                                 "use --lift, --bay and --load")
        return _run_project(args)
    for n in ("lift", "bay", "load"):
        if getattr(args, n) is not None:
            raise _BadInputError(f"--{n}: needs a project FILE")
    if getattr(args, "slab_mass", None) is not None:
        flag = "--slab-mass" if args.slab_mass else "--steel-mass"
        raise _BadInputError(f"{flag}: needs a project FILE (one member has no deck)")
    missing = [n for n in _MEMBER_REQUIRED if getattr(args, n) is None]
    if missing:
        raise _BadInputError(f"--{missing[0]}: missing; give a project FILE, or the member "
                             "options --section, --grade, --span, --at, --mass, --drop")
    return _run_member(args)


def _run_member(args: argparse.Namespace) -> int:
    from droprig.solver import on_rigid_support, verify_member

    md = member_drop(args)
    section, grade, system = md.section, md.grade, md.system
    span, at, mass, drop = md.span, md.at, md.mass, md.drop
    k_c, k_load = md.cushion_stiffness, md.load_stiffness
    if args.crush_force is not None or args.crush_stroke is not None:
        raise _BadInputError("--crush-force: the time history models an elastic contact "
                             "only; verify without the crushable layer, or with "
                             "--cushion-stiffness for an elastic mat")
    if on_rigid_support(args.support, span, at):
        raise _BadInputError(f"--at: {fmt(at, 'length', system)} is on a support of a "
                             f"{args.support} member, which does not move; move the point")

    # the factors are droprig check --amplified's: the same basis, bearing and loads
    basis = args.code or ("aisc360" if grade.family == "ASTM" else "en1993")
    bearing = _parse(args, "bearing", "small_length", system)
    udl = _parse(args, "udl", "line_load", system)
    if bearing is not None:
        _range("--bearing", bearing, 0.0, span, "small_length", system)
    if udl is not None:
        _range("--udl", udl, *UDL_RANGE, "line_load", system)
    v = verify_member(section, grade, args.support, span, at, mass, drop,
                      cushion_stiffness=k_c, load_stiffness=k_load,
                      beam_mass=not args.no_beam_mass, basis=basis, bearing=bearing or 0.0,
                      udl=udl or 0.0, self_weight=not args.no_self_weight)
    plots: list[str] = []
    if args.plots:
        from droprig.report.verify_plots import VerificationPlotData, write_verification_pngs

        title = (f"{section.name}, {args.support} {fmt(span, 'length', system)}, "
                 f"{fmt(mass, 'mass', system)} from {fmt(drop, 'length', system)}")
        data = VerificationPlotData(history=v.history, energy_force=v.energy["force"],
                                    energy_deflection=v.energy_deflection_at_point,
                                    energy_moment=v.energy["moment"], title=title)
        plots = [str(p) for p in write_verification_pngs(data, args.plots, system)]
    if args.json:
        print(json.dumps(_as_json(v, plots), indent=2))
        return EXIT_OK
    print(_table(args, section.name, grade.name, system, span, at, mass, drop, v, plots))
    return EXIT_OK


def _as_json(v: Verification, plots: list[str]) -> dict[str, Any]:
    ratio = {k: (v.energy[k] / v.time_history[k] if v.time_history[k] > 0 else None)
             for k, _, _ in QUANTITIES}
    return {
        "energy_method": v.energy,
        "time_history": v.time_history,
        "energy_over_time_history": ratio,
        "amplification": v.amplification,
        "amplified_demand": {k: v.amplification[k] * v.energy[k] for k, _, _ in QUANTITIES},
        "crushing_force": v.crushing_force if v.crushing_force < float("inf") else None,
        "crushed_depth": v.crush,
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
           at: float, mass: float, drop: float, v: Verification,
           plots: list[str]) -> str:
    from droprig.solver import TH_MARGIN

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
                     "of the member's (a rigid hit converges slowly in the modes kept); "
                     "moment and deflection do not depend on it")
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
                 "Time history: the member as a Timoshenko beam (web shear stiffness and "
                 "rotary inertia; Blevins Table 8-1 mode shapes), compression-only "
                 "contact (capped by the bare flange's local yield force, as droprig "
                 "check caps it), each phase in closed form. The amplified demand is "
                 "droprig check --amplified's: the energy method times the factor of its "
                 "amplification step — the member's own time history × "
                 f"{TH_MARGIN:.2f} (convergence margin) where the check runs "
                 "one, else the calibrated bounds; never below the time history.")
    for p in plots:
        lines.append(f"plot written: {p}")
    lines.append(CAUTION)
    return "\n".join(lines)


def _run_project(args: argparse.Namespace) -> int:
    from droprig.commands import describe_error
    from droprig.io.project_file import ProjectFileError, load_project
    from droprig.solver import analyse, verification_table

    try:
        project = load_project(args.file)
    except (ProjectFileError, OSError, ValueError) as exc:
        raise _BadInputError(f"{args.file}: {describe_error(exc)}") from exc
    zones = [z.id for z in project.lift_zones]
    if args.lift is not None and args.lift not in zones:
        raise _BadInputError(f"--lift: {args.lift!r} is not a lift zone of the project; "
                             "allowed: " + ", ".join(zones))
    results = analyse(project)
    bays = [b for b in results.bays
            if (args.lift is None or b.zone_id == args.lift)
            and (args.bay is None or b.bay_id == args.bay)
            and (args.load is None or b.load_name == args.load)]
    if not bays:
        known = sorted({b.bay_id for b in results.bays})
        raise _BadInputError("--bay: no analysed bay matches"
                             + (f" {args.bay!r}" if args.bay else "")
                             + (f" for load {args.load!r}" if args.load else "")
                             + "; bays: " + ", ".join(known))
    selected = type(results)(cases=results.cases, bays=tuple(bays),
                             warnings=results.warnings)
    skipped_bays: list[tuple[object, str]] = []
    slab = getattr(args, "slab_mass", None) is not False  # the default: with the slab
    rows = verification_table(project, selected, skipped=skipped_bays, slab_mass=slab)
    system: Any = project.settings.unit_system
    plots: list[str] = []
    if args.plots:
        if len(rows) != 1:
            raise _BadInputError(f"--plots: {len(rows)} points selected; narrow to one with "
                                 "--lift, --bay and --load")
        from droprig.report.verify_plots import VerificationPlotData, write_verification_pngs

        r = rows[0]
        v = r.verification
        data = VerificationPlotData(
            history=v.history, energy_force=v.energy["force"],
            energy_deflection=v.energy_deflection_at_point,
            energy_moment=v.energy["moment"],
            title=f"{r.zone_id} {r.bay_id}, {r.load_name} on {r.member_id}")
        plots = [str(p) for p in write_verification_pngs(data, args.plots, system)]
    if args.json:
        doc = [{"zone": r.zone_id, "load": r.load_name, "bay": r.bay_id, "x": r.x, "y": r.y,
                "member": r.member_id, "support": r.cond, "span": r.L, "at": r.a,
                "chain_peak_force": r.chain_peak_force, "pad_edge": r.pad_edge or None,
                "fall": r.fall, "tip_delta": r.tip_delta if r.pad_edge == "tip_off" else None,
                **_as_json(r.verification, [])}
               for r in rows]
        print(json.dumps({"points": doc, "plots": plots, "skipped": len(bays) - len(rows),
                          "slab_mass": slab, "caution": CAUTION},
                         indent=2))
        return EXIT_OK
    carried = ("its steel, the deck and the superimposed dead load over its tributary "
               "width" if slab else "its steel alone (--steel-mass)")
    lines = [f"droprig verify — {args.file}: governing point of each bay, impact alone; "
             "the struck member modelled alone under its share of the load, carrying "
             f"the mass of {carried}, the rest of the path (other framing, deck, load underside, "
             "mat) as a spring in series", ""]
    lines.append(f"  {'':<48}{'':>19}   energy method ÷ time history"
                 "     verdict ÷ time history")
    head = (f"  {'zone':<6}{'bay':<10}{'load':<22}{'member':<10}{'r = M/mₑ':>10}"
            f"{'κ':>9}   {'force':>6}{'moment':>8}{'shear':>7}{'defl.':>7}"
            f"   {'force':>6}{'moment':>8}{'shear':>7}")
    lines.append(head)
    for r in rows:
        v = r.verification
        rat = [v.ratio(k) for k, _, _ in QUANTITIES]
        txt = "".join(f"{(f'{x:.2f}' if x is not None else 'none'):>{w}}"
                      for x, w in zip(rat, (6, 8, 7, 7), strict=True))
        ver = v.verdict or {}
        vr = [(ver[k] / v.time_history[k] if v.time_history[k] > 0 and k in ver else None)
              for k in ("force", "moment", "shear")]
        txt2 = "".join(f"{(f'{x:.2f}' if x is not None else 'none'):>{w}}"
                       for x, w in zip(vr, (6, 8, 7), strict=True))
        lines.append(f"  {r.zone_id:<6}{r.bay_id:<10}{r.load_name[:21]:<22}"
                     f"{r.member_id:<10}{v.mass_ratio:>10.3g}{v.compliance_ratio:>9.3g}"
                     f"   {txt}   {txt2}")
    from droprig.report.verification import FORCE_ROW_WORDS, pad_edge_words, skipped_words

    lines += [f"  {line}" for line in skipped_words(skipped_bays)]
    lines += [f"  {w}" for w in (pad_edge_words(r, system) for r in rows) if w]
    lines.append("")
    if project.settings.dynamic_amplification:
        used = ("The verdict uses the amplified demands (dynamic amplification is on in "
                "this project); verdict ÷ time history ≥ 1 where it covers the time "
                "history (README, 'Dynamic amplification').")
    else:
        used = ("Dynamic amplification is off in this project: the verdict uses the "
                "energy method's demands, so its ratios equal the energy method's and read "
                "low wherever those are below 1.")
    lines.append("Energy method below 1: it reads lower than the time history there. "
                 + used + " Both runs cap the contact force alike: by crushing (deck concrete "
                 "or crushable layer) or by the struck beam's web yielding locally under "
                 "the load. " + FORCE_ROW_WORDS)
    for p in plots:
        lines.append(f"plot written: {p}")
    lines.append(CAUTION)
    print("\n".join(lines))
    return EXIT_OK
