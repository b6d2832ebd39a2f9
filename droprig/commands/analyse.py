"""``droprig analyse FILE [--json OUT|-] [--csv OUT] [--bays-csv OUT]``: every drop
point of every lift zone, and the permit verdict and conditions.

Without an output option a per-bay table is printed in the project's unit system,
then the permit verdict, its conditions, what is not checked, and the caution.
``--json`` writes the per-bay summaries (SI, ``null`` where no value exists, never
NaN) with each bay's permit cells and the permit (:mod:`droprig.permit`);
``--csv`` one row per drop point with the SI unit in each column name;
``--bays-csv`` one row per bay and load with the permit verdict, SI figures and the
same cell text as the table. Every text with a number comes from
:mod:`droprig.permit`. Bad input: one message on stderr, exit 2.
``level_below`` (JSON): the loads that perforate a deck, passed to the level below
and assessed there; ``through_level`` (CSV): the level a cascaded row came through.
"""

from __future__ import annotations

import argparse
import csv
import io
import json
import math
import sys
from collections.abc import Sequence
from dataclasses import asdict
from typing import Any

from droprig import __version__
from droprig.cli import EXIT_BAD_INPUT, EXIT_OK
from droprig.texts import CAUTION

CSV_COLUMNS: tuple[tuple[str, str], ...] = (
    ("x", "x_m"),
    ("y", "y_m"),
    ("drop_height", "drop_height_m"),
    ("fall_height", "fall_onto_struck_surface_m"),
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
    ("dent_depth", "dent_depth_m"),
    ("dent_height", "dent_height_m"),
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


def _condition_doc(c: Any, system: str) -> dict[str, Any]:
    d = {k: v for k, v in asdict(c).items() if k != "protection"}
    d["region"] = [list(p) for p in c.region] if c.region else None
    d["sentence"] = c.sentence(system)
    return d


def permit_document(project: Any, permit: Any) -> dict[str, Any]:
    """The permit part of the JSON document: verdict, conditions (SI fields and the
    one sentence of each, in the project's units), per-load verdicts, not checked."""
    system = project.settings.unit_system
    return {
        "verdict": permit.verdict,
        "verdict_words": permit.verdict_words,
        "conditions": [_condition_doc(c, system) for c in permit.conditions],
        "loads": [{"lift": lv.zone_id, "load": lv.load_name, "verdict": lv.verdict,
                   "conditions": [c.sentence(system) for c in lv.conditions]}
                  for lv in permit.loads],
        "not_checked": list(permit.not_checked),
        "plan_clashes": [{"lift": c.zone_id, "level": c.level_id, "point": c.tag,
                          "kind": c.kind, "label": c.label, "bay": c.bay_id,
                          "load": c.load_name, "sentence": c.sentence()}
                         for c in permit.clashes],
    }


def results_document(project: Any, results: Any, permit: Any = None) -> dict[str, Any]:
    """The JSON document of ``droprig analyse --json`` (SI units).

    Per bay: the :class:`~droprig.solver.results.BaySummary` fields (SI; every height
    on the datum of the finished surface; each quantity with its own point and check),
    the permit ``verdict``, ``cells`` (the table text of
    :meth:`droprig.permit.BayVerdict.cells`, in the project's unit system),
    ``conditions`` (one sentence each) and ``advice`` (the conditions as one text).
    ``permit``: :func:`permit_document`."""
    from droprig.permit import derive_conditions

    system = project.settings.unit_system
    permit = permit if permit is not None else derive_conditions(project, results)
    verdicts = {(v.zone_id, v.load_name, v.bay_id): v for v in permit.bays}

    def bay_doc(b: Any) -> dict[str, Any]:
        v = verdicts.get((b.zone_id, b.load_name, b.bay_id))
        if v is None:  # a bay of the level below, reached through a perforated deck
            return _cascade_bay_doc(b, system)
        d = asdict(b)
        v = verdicts[(b.zone_id, b.load_name, b.bay_id)]
        cells = v.cells(system)
        d["verdict"] = v.verdict
        d["cells"] = cells
        d["conditions"] = [c.sentence(system) for c in v.conditions]
        d["advice"] = cells["conditions"]
        d["max_hook_elevation"] = v.max_hook_elevation
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
        "permit": permit_document(project, permit),
        "bays": bays_out,
        "level_below": cascade_out,
        "warnings": list(results.warnings),
        "caution": CAUTION,
    })


def _cascade_bay_doc(b: Any, system: str) -> dict[str, Any]:
    """A bay of the level below (cascade through a perforated deck): its summary and
    advice; the permit of the level above names the level below as a condition."""
    from droprig.advice import advice_text

    d = asdict(b)
    d["advice"] = advice_text(b, system)
    d["lift"] = b.zone_id
    d["level"] = b.level_id
    d["max_utilisation_unbounded"] = not math.isfinite(b.max_utilisation)
    return d


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
                "local_extrapolated", "strike_orientation", "through_level",
                "utilisation_check"])
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
                        if case.strike_orientation[i] >= 0 else "", through,
                        CHECKS[int(case.utilisation_check[i])]])
    return buf.getvalue()


BAY_CSV_COLUMNS: tuple[str, ...] = (
    "lift", "load", "level", "bay", "verdict", "response", "planned_drop_height_m",
    "allowable_drop_height_m", "allowable_check", "allowable_pad",
    "allowable_fall_onto_pad_m", "max_hook_elevation_m", "max_utilisation",
    "utilisation_check", "allowable_mass_kg", "verdict_text", "planned_text",
    "allowable_text", "hook_text", "utilisation_text", "mass_text", "conditions_text")
"""Columns of ``--bays-csv``: SI figures (unit in the name, empty = none) and the
permit cells as printed (``*_text``, in the project's unit system)."""


def bays_csv_text(project: Any, results: Any, permit: Any = None) -> str:
    """One row per bay and load: the permit verdict, SI figures on the datum of the
    finished surface, and the same cell text the table and the annex print."""
    from droprig.permit import derive_conditions

    system = project.settings.unit_system
    permit = permit if permit is not None else derive_conditions(project, results)
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(BAY_CSV_COLUMNS)

    def num(v: float | None) -> str:
        return "" if v is None else _cell(float(v))

    for v in permit.bays:
        c = v.cells(system)
        w.writerow([v.zone_id, v.load_name, v.level_id, v.bay_id, v.verdict, v.response,
                    num(v.planned_drop_height), num(v.allowable_drop_height),
                    v.allowable_check, v.allowable_pad or "", num(v.allowable_fall),
                    num(v.max_hook_elevation), num(v.max_utilisation),
                    v.utilisation_check, num(v.allowable_mass), c["verdict"], c["planned"],
                    c["allowable"], c["hook"], c["utilisation"], c["mass"],
                    c["conditions"]])
    return buf.getvalue()


def table_text(project: Any, results: Any, permit: Any = None) -> str:
    """Readable per-bay table in the project's unit system, then the permit."""
    from droprig.permit import CLASH_ADVICE, LIMIT_NOTE, clash_sentences, derive_conditions
    from droprig.units import fmt

    system = project.settings.unit_system
    permit = permit if permit is not None else derive_conditions(project, results)
    verdicts = {(v.zone_id, v.load_name, v.bay_id): v for v in permit.bays}
    head = ("Lift", "Load", "Bay", "Points", "Verdict", "Max U (check)",
            "Allowable drop height, elastic (check)", "Max hook elevation", "Planned drop",
            "Allowable mass")
    rows = []
    for b in results.bays:
        c = verdicts[(b.zone_id, b.load_name, b.bay_id)].cells(system)
        rows.append((b.zone_id, b.load_name, b.bay_id, str(b.n_points), c["verdict"],
                     c["utilisation"], c["allowable"], c["hook"], c["planned"], c["mass"]))
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
    out.append("Heights are the load's underside above the finished surface of the level; "
               "a fall onto a pad is that less the pad's thickness.")
    out.append("")
    out.append(f"Permit verdict: {permit.verdict_words.upper()}")
    if permit.clashes:
        out.append("The lift plan and the conditions disagree:")
        for sentence in clash_sentences(permit.clashes):
            out.append(f"  - {sentence}")
        out.append(f"  {CLASH_ADVICE}")
    if permit.conditions:
        out.append("Conditions:")
        for i, sentence in enumerate(permit.sentences(system), 1):
            out.append(f"  {i}. {sentence}")
        if any(c.kind == "cap_hook" for c in permit.conditions):
            out.append(f"  ({LIMIT_NOTE})")
    out.append("Not checked (separate sign-off):")
    for item in permit.not_checked:
        out.append(f"  - {item}")
    for f in getattr(results, "cascade", ()):
        out.append("")
        out.append(f"Through the deck of level {f.from_level} to level {f.level_id}: "
                   f"{f.load_name} ({f.zone_id}) strikes as if dropped "
                   f"{fmt(f.equivalent_height, 'length', system)}")
        out.extend(_cascade_lines(f.bays, system))
    for wmsg in results.warnings:
        out.append(f"Warning: {wmsg}")
    out.append("")
    out.append(CAUTION)
    return "\n".join(out) + "\n"


def _cascade_lines(bays: Sequence[Any], system: str) -> list[str]:
    """One line per bay (its response and worst U), then each distinct advice once,
    naming the bays it is for (the same long local-damage advice is not repeated bay
    by bay)."""
    from droprig.advice import advice_text
    from droprig.outcomes import fmt_utilisation

    lines = [f"  {b.bay_id}: {b.response}, max U {fmt_utilisation(b.max_utilisation)}"
             for b in bays]
    groups: dict[str, list[str]] = {}
    for b in bays:
        groups.setdefault(advice_text(b, system), []).append(b.bay_id)
    for text, ids in groups.items():
        who = "each bay above" if len(ids) == len(bays) and len(bays) > 1 else (
            ("bay " if len(ids) == 1 else "bays ") + ", ".join(ids))
        lines.append(f"  For {who}: {text}")
    return lines


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
    from droprig.permit import derive_conditions
    from droprig.solver import analyse
    from droprig.texts import describe_error

    json_out = getattr(args, "json_out", None)
    csv_out = getattr(args, "csv_out", None)
    bays_out = getattr(args, "bays_csv_out", None)
    force = bool(getattr(args, "force", False))
    outs = ((json_out, "--json"), (csv_out, "--csv"), (bays_out, "--bays-csv"))
    if [json_out, csv_out, bays_out].count("-") > 1:
        print("droprig analyse: only one of --json, --csv and --bays-csv can write to "
              "stdout (-)", file=sys.stderr)
        return EXIT_BAD_INPUT
    try:  # refused before the (possibly long) analysis
        for out, option in outs:
            if out and out != "-":
                check_output(out, (args.file,), force=force, option=option)
        files = [o for o, _ in outs if o and o != "-"]
        if len(set(files)) < len(files):
            raise OutputRefusedError("--json, --csv and --bays-csv name the same file; "
                                     "give each its own name")
    except OutputRefusedError as exc:
        print(f"droprig analyse: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    from droprig.preflight import analysis_problems

    notes: list[str] = []
    try:
        project = load_project(args.file, notes=notes)
        problems = analysis_problems(project)
        if problems:
            print(f"droprig analyse: {args.file}: {len(problems)} problem(s)\n  "
                  + "\n  ".join(problems), file=sys.stderr)
            return EXIT_BAD_INPUT
        results = analyse(project)
    except (ProjectFileError, ModelError, OSError, ValueError) as exc:
        print(f"droprig analyse: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT
    for note in notes:  # an older format converted: what changed in meaning
        print(f"droprig analyse: note: {note}", file=sys.stderr)
    permit = derive_conditions(project, results)
    try:
        if csv_out:
            _write(csv_out, csv_text(project, results), args.file, force=force,
                   option="--csv")
        if bays_out:
            _write(bays_out, bays_csv_text(project, results, permit), args.file,
                   force=force, option="--bays-csv")
        if json_out:
            doc = results_document(project, results, permit)
            _write(json_out, json.dumps(doc, indent=2, ensure_ascii=False, allow_nan=False)
                   + "\n", args.file, force=force, option="--json")
    except OutputRefusedError as exc:
        print(f"droprig analyse: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except OSError as exc:
        print(f"droprig analyse: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT
    if not json_out and not csv_out and not bays_out:
        sys.stdout.write(table_text(project, results, permit))
    elif "-" not in (json_out, csv_out, bays_out):
        written = ", ".join(x for x in (json_out, csv_out, bays_out) if x)
        print(f"droprig analyse: {results.n_points} drop points; permit verdict: "
              f"{permit.verdict_words}; wrote {written}")
        print(CAUTION)
    return EXIT_OK
