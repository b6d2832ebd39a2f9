"""``droprig analyse FILE [--json OUT|-] [--csv OUT]``: every drop point of every lift zone.

Without ``--json``/``--csv`` a per-bay table is printed in the project's unit
system, followed by the caution. ``--json`` writes the per-bay summaries (SI,
``null`` where no value exists, never NaN; ``level_below``: the loads that
perforate a deck, passed to the level below and assessed there); ``--csv`` one row
per drop point with the SI unit in each column name (``through_level``: the level
a cascaded row came through). Bad input: one message on stderr, exit 2.
"""

from __future__ import annotations

import argparse
import csv
import io
import json
import math
import sys
from dataclasses import asdict
from typing import Any

from droprig import __version__
from droprig.cli import EXIT_BAD_INPUT, EXIT_OK
from droprig.texts import CAUTION

CSV_COLUMNS: tuple[tuple[str, str], ...] = (
    ("x", "x_m"),
    ("y", "y_m"),
    ("drop_height", "drop_height_m"),
    ("static_deflection", "static_deflection_m"),
    ("effective_mass", "effective_mass_kg"),
    ("dynamic_factor", "dynamic_factor"),
    ("peak_force", "peak_force_N"),
    ("max_deflection", "max_deflection_m"),
    ("deceleration_g", "deceleration_g"),
    ("utilisation", "utilisation"),
    ("allowable_drop_height", "allowable_drop_height_m"),
    ("allowable_drop_height_plastic", "allowable_drop_height_plastic_m"),
    ("allowable_mass", "allowable_mass_kg"),
    ("plastic_deflection", "plastic_deflection_m"),
    ("ductility", "ductility"),
    ("support_rotation", "support_rotation_rad"),
    ("required_mat_stiffness", "required_mat_stiffness_N_per_m"),
    ("required_crush_stroke", "required_crush_stroke_m"),
    ("penetration", "penetration_m"),
    ("scabbing_height", "scabbing_height_m"),
    ("perforation_height", "perforation_height_m"),
    ("residual_velocity", "residual_velocity_m_per_s"),
)
"""(CaseResult field, CSV column name with its SI unit)."""


def _finite_or_none(v: Any) -> Any:
    if isinstance(v, float) and not math.isfinite(v):
        return None
    return v


def _clean(obj: Any) -> Any:
    """JSON-safe copy: non-finite floats become null."""
    if isinstance(obj, dict):
        return {k: _clean(v) for k, v in obj.items()}
    if isinstance(obj, list | tuple):
        return [_clean(v) for v in obj]
    return _finite_or_none(obj)


def results_document(project: Any, results: Any) -> dict[str, Any]:
    """The JSON document of ``droprig analyse --json`` (SI units).

    Per bay: the :class:`~droprig.solver.results.BaySummary` fields (SI; the
    structured advice is ``advice_kind`` with ``height_limit``,
    ``height_limit_yields``, ``mat_stiffness_max``, ``mat_travel`` and
    ``planned_drop_height``) and ``advice``: the words, with numbers in the
    project's unit system (:func:`droprig.advice.advice_text`)."""
    from droprig.advice import advice_text

    system = project.settings.unit_system

    def bay_doc(b: Any) -> dict[str, Any]:
        d = asdict(b)
        d["advice"] = advice_text(b, system)
        d["lift"] = b.zone_id
        d["level"] = b.level_id
        d["max_utilisation_unbounded"] = not math.isfinite(b.max_utilisation)
        return d

    bays_out = [bay_doc(b) for b in results.bays]
    cascade_out = [{"lift": f.zone_id, "load": f.load_name, "from_level": f.from_level,
                    "level": f.level_id, "equivalent_drop_height": f.equivalent_height,
                    "points": int(f.case.n), "bays": [bay_doc(b) for b in f.bays]}
                   for f in getattr(results, "cascade", ())]
    return _clean({
        "droprig_version": __version__,
        "project": project.info.name,
        "lift_reference": project.info.lift_reference,
        "revision": project.info.revision,
        "points": int(results.n_points),
        "bays": bays_out,
        "level_below": cascade_out,
        "warnings": list(results.warnings),
        "caution": CAUTION,
    })


def _cell(v: float) -> str:
    if math.isnan(v):
        return ""
    if math.isinf(v):
        return "inf" if v > 0 else "-inf"
    return repr(float(v))


def csv_text(project: Any, results: Any) -> str:
    """One row per drop point (SI units named in the header; empty cell = none)."""
    from droprig.model import bays
    from droprig.solver import CHECKS, DECK, RESPONSES

    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    from droprig.model import STRIKE_ORIENTATIONS

    w.writerow(["lift", "load", "level", "bay", "protection", *[c for _, c in CSV_COLUMNS],
                "governing_member", "governing_check", "response", "scabbing",
                "local_extrapolated", "strike_orientation", "through_level"])
    prot_ids = [p.id for p in project.protection_areas]
    rows = [(c, "") for c in results.cases]
    rows += [(f.case, f.from_level) for f in getattr(results, "cascade", ())]
    for case, through in rows:
        level = project.level(case.level_id)
        bay_ids = [b.id for b in bays(level)]
        mem_ids = [m.id for m in level.members]
        cols = [getattr(case, f) for f, _ in CSV_COLUMNS]
        for i in range(case.n):
            b = int(case.bay[i])
            p = int(case.protection[i])
            g = int(case.governing_member[i])
            w.writerow([case.zone_id, case.load_name, case.level_id,
                        bay_ids[b] if b >= 0 else "", prot_ids[p] if p >= 0 else "",
                        *[_cell(float(c[i])) for c in cols],
                        "deck" if g == DECK else mem_ids[g],
                        CHECKS[int(case.governing_check[i])],
                        RESPONSES[int(case.response[i])],
                        "true" if case.scabbing[i] else "false",
                        "true" if case.local_extrapolated[i] else "false",
                        STRIKE_ORIENTATIONS[int(case.strike_orientation[i])]
                        if case.strike_orientation[i] >= 0 else "", through])
    return buf.getvalue()


def table_text(project: Any, results: Any) -> str:
    """Readable per-bay table in the project's unit system."""
    from droprig.advice import advice_text
    from droprig.outcomes import fmt_utilisation
    from droprig.units import fmt

    system = project.settings.unit_system
    head = ("Lift", "Load", "Bay", "Points", "Max U", "Response", "Allowable drop",
            "Governing")
    rows = []
    for b in results.bays:
        rows.append((b.zone_id, b.load_name, b.bay_id, str(b.n_points),
                     fmt_utilisation(b.max_utilisation), b.response,
                     fmt(b.allowable_drop_height, "length", system, rounding="down"),
                     f"{b.governing_member} / {b.governing_check.replace('_', ' ')}"))
    widths = [max(len(h), *(len(r[i]) for r in rows)) if rows else len(h)
              for i, h in enumerate(head)]
    out = [f"droprig {__version__} — {project.info.name}"
           + (f" ({project.info.lift_reference})" if project.info.lift_reference else ""),
           f"{results.n_points} drop points, {len(results.cases)} load case(s)", ""]
    out.append("  ".join(h.ljust(wd) for h, wd in zip(head, widths, strict=True)))
    out.append("  ".join("-" * wd for wd in widths))
    for r in rows:
        out.append("  ".join(c.ljust(wd) for c, wd in zip(r, widths, strict=True)))
    out.append("")
    out.append("Advice per bay:")
    for b in results.bays:
        out.append(f"  {b.zone_id} / {b.load_name} / {b.bay_id}: {advice_text(b, system)}")
    for f in getattr(results, "cascade", ()):
        out.append("")
        out.append(f"Through the deck of level {f.from_level} to level {f.level_id}: "
                   f"{f.load_name} ({f.zone_id}) strikes as if dropped "
                   f"{fmt(f.equivalent_height, 'length', system)}")
        for b in f.bays:
            out.append(f"  {b.bay_id}: {b.response}, max U "
                       f"{fmt_utilisation(b.max_utilisation)}; {advice_text(b, system)}")
    for wmsg in results.warnings:
        out.append(f"Warning: {wmsg}")
    out.append("")
    out.append(CAUTION)
    return "\n".join(out) + "\n"


def _write(target: str, text: str, project_path: str = "", *, force: bool = False,
           option: str = "output") -> None:
    """Write ``text`` to ``target`` atomically ('-' is stdout), never over the project
    file, over another ``.droprig`` file only with ``force``; a replaced file is kept
    as ``.bak`` (:func:`droprig.io.atomic.write_output`)."""
    if target == "-":
        sys.stdout.write(text)
        return
    from droprig.io.atomic import write_output

    write_output(target, text.encode("utf-8"), (project_path,) if project_path else (),
                 force=force, option=option)


def run(args: argparse.Namespace) -> int:
    from droprig.io.atomic import OutputRefusedError, check_output
    from droprig.io.project_file import ProjectFileError, load_project
    from droprig.model import ModelError
    from droprig.solver import analyse
    from droprig.texts import describe_error

    json_out = getattr(args, "json_out", None)
    csv_out = getattr(args, "csv_out", None)
    force = bool(getattr(args, "force", False))
    if json_out == "-" and csv_out == "-":
        print("droprig analyse: --json and --csv cannot both write to stdout (-)",
              file=sys.stderr)
        return EXIT_BAD_INPUT
    try:  # refused before the (possibly long) analysis
        for out, option in ((json_out, "--json"), (csv_out, "--csv")):
            if out and out != "-":
                check_output(out, (args.file,), force=force, option=option)
        if json_out and csv_out and json_out != "-" and json_out == csv_out:
            raise OutputRefusedError("--json and --csv name the same file; give two names")
    except OutputRefusedError as exc:
        print(f"droprig analyse: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    from droprig.preflight import analysis_problems

    try:
        project = load_project(args.file)
        problems = analysis_problems(project)
        if problems:
            print(f"droprig analyse: {args.file}: {len(problems)} problem(s)\n  "
                  + "\n  ".join(problems), file=sys.stderr)
            return EXIT_BAD_INPUT
        results = analyse(project)
    except (ProjectFileError, ModelError, OSError, ValueError) as exc:
        print(f"droprig analyse: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT
    try:
        if csv_out:
            _write(csv_out, csv_text(project, results), args.file, force=force,
                   option="--csv")
        if json_out:
            doc = results_document(project, results)
            _write(json_out, json.dumps(doc, indent=2, ensure_ascii=False, allow_nan=False)
                   + "\n", args.file, force=force, option="--json")
    except OutputRefusedError as exc:
        print(f"droprig analyse: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except OSError as exc:
        print(f"droprig analyse: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT
    if not json_out and not csv_out:
        sys.stdout.write(table_text(project, results))
    elif "-" not in (json_out, csv_out):
        written = ", ".join(x for x in (json_out, csv_out) if x)
        print(f"droprig analyse: {results.n_points} drop points; wrote {written}")
        print(CAUTION)
    return EXIT_OK
