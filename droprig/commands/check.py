"""``droprig check``: one member struck by one dropped load.

Every value is read with :func:`droprig.units.parse` (a bare number takes the
display unit of the unit system: m/ft for lengths, mm/in for ``--bearing`` and
``--crush-stroke``), checked against its allowed range, and handed to
:func:`droprig.solver.member.assess_member`. ``--json`` prints one JSON object in
SI base units (``null`` where a value does not apply, and for the force-driven
values when a crushable layer bottoms out on a rigid support point, where the force
is unbounded and the response ``exceeds``); otherwise a table in the grade family's
units (or ``--units``) ending with the standard caution.
"""

from __future__ import annotations

import argparse
import json
import math
import sys
from dataclasses import dataclass
from typing import Any

from droprig.cli import EXIT_BAD_INPUT, EXIT_OK
from droprig.model import CONTACT_STIFFNESS_RANGE, ModelError
from droprig.solver import DEFAULT_DEFLECTION_LIMIT_RATIO
from droprig.texts import CAUTION
from droprig.units import UnitError, fmt, parse

# Ranges match the project model (droprig.model.project) so a value accepted here
# is also accepted in a project file.
SPAN_RANGE = (0.5, 60.0)  # m, Member.span
MASS_RANGE = (1.0, 500_000.0)  # kg, LiftLoad.mass
DROP_RANGE = (0.0, 200.0)  # m, LiftLoad.drop_height
STIFFNESS_RANGE = (1e3, 1e12)  # N/m, ProtectionArea.stiffness
LOAD_STIFFNESS_RANGE = CONTACT_STIFFNESS_RANGE  # N/m, LiftLoad.contact_stiffness
CRUSH_FORCE_RANGE = (1e2, 1e8)  # N, ProtectionArea.crush_force
CRUSH_STROKE_RANGE = (1e-3, 3.0)  # m, ProtectionArea.crush_stroke
UDL_RANGE = (0.0, 1e6)  # N/m

# (key, label, quantity) of the printed table
_ROWS: tuple[tuple[str, str, str], ...] = (
    ("static_deflection", "static deflection δst (load at rest)", "small_length"),
    ("effective_mass", "struck effective member mass", "mass"),
    ("dynamic_factor", "dynamic factor K", "dimensionless"),
    ("peak_force", "peak impact force", "force"),
    ("deceleration_g", "peak deceleration of the load (g)", "dimensionless"),
    ("max_moment", "max bending moment (with existing load)", "moment"),
    ("max_shear", "max shear (with existing load)", "force"),
    ("max_deflection", "max member deflection", "small_length"),
    ("utilisation", "utilisation (elastic)", "dimensionless"),
    ("plastic_deflection", "plastic deflection δm", "small_length"),
    ("ductility", "ductility μ", "dimensionless"),
    ("support_rotation", "support rotation θ", "angle"),
    ("allowable_drop_height", "allowable drop height, elastic", "length"),
    ("allowable_drop_height_plastic", "allowable drop height, plastic", "length"),
)


_FORCE_DRIVEN = frozenset({"dynamic_factor", "peak_force", "deceleration_g", "max_moment",
                           "max_shear", "max_deflection", "utilisation"})


class _BadInputError(Exception):
    pass


def _range(field: str, value: float, lo: float, hi: float, quantity: str, system: str, *,
           lo_open: bool = False) -> float:
    bad = value < lo or value > hi or (lo_open and value <= lo)
    if bad:
        rel = ">" if lo_open else "from"
        allowed = (f"{rel} {fmt(lo, quantity, system)} to {fmt(hi, quantity, system)}")
        raise _BadInputError(f"{field}: {fmt(value, quantity, system)} is not allowed; "
                        f"allowed: {allowed}")
    return value


def _parse(args: argparse.Namespace, name: str, quantity: str, system: str) -> float | None:
    text = getattr(args, name.replace("-", "_"))
    if text is None:
        return None
    return parse(text, quantity, system, field=f"--{name}")  # type: ignore[arg-type]


def run(args: argparse.Namespace) -> int:
    """Body of ``droprig check``; 0 on success, 2 on bad input (message on stderr)."""
    try:
        return _run(args)
    except (_BadInputError, UnitError) as exc:
        print(f"droprig check: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except ModelError as exc:
        print(f"droprig check: --{exc}", file=sys.stderr)
        return EXIT_BAD_INPUT


@dataclass(frozen=True)
class MemberDrop:
    """The member and drop that ``droprig check`` and ``droprig verify`` share, in SI
    (m, kg, N/m), read from the command line and checked against their ranges."""

    section: Any
    grade: Any
    system: str
    span: float
    at: float
    mass: float
    drop: float
    cushion_stiffness: float | None
    load_stiffness: float | None


def member_drop(args: argparse.Namespace) -> MemberDrop:
    """Section, grade, span, point, mass, drop and the optional mat and load-underside
    stiffnesses of a single-member command; raises :class:`_BadInputError` naming the
    option and its allowed range."""
    from droprig.io.sections import GradeNotFound, SectionNotFound, get_grade, get_section

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
    return MemberDrop(section, grade, system, span, at, mass, drop, k_c, k_load)


def _run(args: argparse.Namespace) -> int:
    from droprig.solver import RESULT_KEYS, assess_member, on_rigid_support

    md = member_drop(args)
    section, grade, system = md.section, md.grade, md.system
    span, at, mass, drop = md.span, md.at, md.mass, md.drop
    k_c, k_load = md.cushion_stiffness, md.load_stiffness
    basis = args.code or ("aisc360" if grade.family == "ASTM" else "en1993")
    bearing = _parse(args, "bearing", "small_length", system)
    F_c = _parse(args, "crush-force", "force", system)
    s_c = _parse(args, "crush-stroke", "small_length", system)
    udl = _parse(args, "udl", "line_load", system)
    if bearing is not None:
        _range("--bearing", bearing, 0.0, span, "small_length", system)
    if (F_c is None) != (s_c is None):
        missing = "--crush-stroke" if s_c is None else "--crush-force"
        raise _BadInputError(f"{missing}: missing; a crushable layer needs both --crush-force "
                        "and --crush-stroke")
    if F_c is not None and s_c is not None:
        _range("--crush-force", F_c, *CRUSH_FORCE_RANGE, "force", system)
        _range("--crush-stroke", s_c, *CRUSH_STROKE_RANGE, "small_length", system)
    if udl is not None:
        _range("--udl", udl, *UDL_RANGE, "line_load", system)
    if on_rigid_support(args.support, span, at) and k_c is None \
            and F_c is None and k_load is None:
        raise _BadInputError(f"--at: {fmt(at, 'length', system)} is on a support of a "
                        f"{args.support} member; supports are taken as rigid, so the "
                        "impact force has no finite value there. Give --cushion-stiffness, "
                        "--load-stiffness or --crush-force/--crush-stroke, or move the point")

    try:
        result = assess_member(
            section, grade, args.support, span, at, mass, drop,
            basis=basis,
            bearing=bearing or 0.0,
            cushion_stiffness=k_c,
            load_stiffness=k_load,
            crush_force=F_c,
            crush_stroke=s_c,
            udl=udl or 0.0,
            self_weight=not args.no_self_weight,
            beam_mass=not args.no_beam_mass,
            dynamic_amplification=args.amplified,
        )
    except ValueError as exc:  # ModelError is handled by run(); out-of-scope sections here
        if isinstance(exc, ModelError):
            raise
        raise _BadInputError(f"--section: {exc}") from exc

    if args.json:
        print(json.dumps({k: result[k] for k in RESULT_KEYS}, indent=2))
        return EXIT_OK
    print(_table(args, section.name, grade.name, basis, system, span, at, mass, drop,
                 bearing or 0.0, k_c, F_c, s_c, udl or 0.0, result, k_load))
    return EXIT_OK


def _num(v: float | None) -> str:
    """A ratio to 3 significant figures, '∞' spelled as 'unbounded'."""
    return "unbounded" if v is None else f"{v:.3g}"


def _table(args: argparse.Namespace, section: str, grade: str, basis: str, system: str,
           span: float, at: float, mass: float, drop: float, bearing: float,
           k_c: float | None, F_c: float | None, s_c: float | None, udl: float,
           r: dict[str, Any], k_load: float | None = None) -> str:
    code = {"aisc360": "AISC 360-16", "en1993": "EN 1993-1-1 / EN 1993-1-5"}[basis]
    lines = [
        f"droprig check — {section} {grade}, {args.support} span "
        f"{fmt(span, 'length', system)}, struck at {fmt(at, 'length', system)} from the origin end",
        f"load {fmt(mass, 'mass', system)} dropped {fmt(drop, 'length', system)}; "
        f"bearing {fmt(bearing, 'small_length', system)}"
        + (" (point contact, conservative)" if bearing == 0.0 else "")
        + f"; design basis {code}, resistance factor 1.0 (accidental)",
    ]
    if k_c is not None:
        lines.append(f"spring mat {fmt(k_c, 'stiffness', system)}")
    lines.append("load underside (skid, base frame, dunnage) "
                 + (f"{fmt(k_load, 'stiffness', system)} in series" if k_load is not None
                    else "rigid (highest contact force)"))
    if F_c is not None and s_c is not None:
        lines.append(f"crushable layer {fmt(F_c, 'force', system)} over "
                     f"{fmt(s_c, 'small_length', system)}")
    existing = "self-weight" if not args.no_self_weight else "no self-weight"
    if udl > 0.0:
        existing += f" + {fmt(udl, 'line_load', system)}"
    lines.append(f"existing load: {existing}; member mass "
                 + ("ignored (η = 1)" if args.no_beam_mass else "included"))
    lines.append("")
    width = max(len(label) for _, label, _ in _ROWS)
    unbounded = r["peak_force"] is None  # a bottomed layer on a rigid point
    for key, label, quantity in _ROWS:
        value = r[key]
        if value is not None:
            text = fmt(value, quantity, system)
        elif unbounded and key in _FORCE_DRIVEN and r["response"] == "exceeds":
            text = "unbounded (rigid point, layer bottomed out)"
        else:
            text = "none"
        lines.append(f"  {label:<{width}}  {text}")
    lines.append("")
    n_limit = DEFAULT_DEFLECTION_LIMIT_RATIO
    limit = span / n_limit
    defl = r["max_deflection"]
    if defl is not None:
        ratio = span / defl if defl > 0 else math.inf
        lines.append(f"  deflection: span/{ratio:,.0f} against span/{n_limit:g} = "
                     f"{fmt(limit, 'small_length', system)} — information only "
                     "(IBC Table 1604.3 serviceability limit, not a criterion for an accidental "
                     "impact)")
    amp = r.get("amplification")
    if amp is None:
        lines.append("  dynamic amplification: off (energy method alone, for comparison "
                     "only)")
    else:
        lines.append(
            f"  dynamic amplification (time-history calibration; r = M/mₑ "
            f"{_num(amp['mass_ratio'])}, κ {_num(amp['compliance_ratio'])}): contact force "
            f"×{amp['force']:.3g} ({amp['set_by']['local']}), moment ×{amp['moment']:.3g} "
            f"({amp['set_by']['moment']}), shear ×{amp['shear']:.3g} "
            f"({amp['set_by']['shear']}); the checks above are at these forces")
    verdict = r["response"].upper()
    lines.append(f"  RESPONSE: {verdict}  (governing: {r['governing_check'].replace('_', ' ')})")
    lines.append("")
    lines.append("Assumptions: member laterally restrained by the deck; rigid supports; "
                 "static deflected shape for the struck mass (Rayleigh).")
    lines.append(CAUTION)
    return "\n".join(lines)
