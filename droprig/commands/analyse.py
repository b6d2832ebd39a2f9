"""``droprig analyse FILE [--json OUT|-] [--csv OUT]``: every drop point of every lift zone.

Without ``--json``/``--csv`` a per-bay table is printed in the project's unit
system, followed by the caution. ``--json`` writes the per-bay summaries (SI,
``null`` where no value exists, never NaN); ``--csv`` one row per drop point with
the SI unit in each column name. Bad input: one message on stderr, exit 2.
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
    bays_out = []
    for b in results.bays:
        d = asdict(b)
        d["advice"] = advice_text(b, system)
        d["lift"] = b.zone_id
        d["level"] = b.level_id
        d["max_utilisation_unbounded"] = not math.isfinite(b.max_utilisation)
        bays_out.append(d)
    return _clean({
        "droprig_version": __version__,
        "project": project.info.name,
        "lift_reference": project.info.lift_reference,
        "revision": project.info.revision,
        "points": int(results.n_points),
        "bays": bays_out,
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
    w.writerow(["lift", "load", "level", "bay", "protection", *[c for _, c in CSV_COLUMNS],
                "governing_member", "governing_check", "response"])
    prot_ids = [p.id for p in project.protection_areas]
    for case in results.cases:
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
                        RESPONSES[int(case.response[i])]])
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
    for wmsg in results.warnings:
        out.append(f"Warning: {wmsg}")
    out.append("")
    out.append(CAUTION)
    return "\n".join(out) + "\n"


def _write(target: str, text: str) -> None:
    """Write ``text`` to ``target`` atomically ('-' is stdout)."""
    if target == "-":
        sys.stdout.write(text)
        return
    from droprig.io.atomic import atomic_write_bytes

    atomic_write_bytes(target, text.encode("utf-8"))


def run(args: argparse.Namespace) -> int:
    from droprig.io.project_file import ProjectFileError, load_project
    from droprig.model import ModelError
    from droprig.solver import analyse
    from droprig.texts import describe_error

    try:
        project = load_project(args.file)
        results = analyse(project)
    except (ProjectFileError, ModelError, OSError, ValueError) as exc:
        print(f"droprig analyse: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT
    json_out = getattr(args, "json_out", None)
    csv_out = getattr(args, "csv_out", None)
    if json_out == "-" and csv_out == "-":
        print("droprig analyse: --json and --csv cannot both write to stdout (-)",
              file=sys.stderr)
        return EXIT_BAD_INPUT
    try:
        if csv_out:
            _write(csv_out, csv_text(project, results))
        if json_out:
            doc = results_document(project, results)
            _write(json_out, json.dumps(doc, indent=2, ensure_ascii=False, allow_nan=False)
                   + "\n")
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
