"""``droprig report FILE -o annex.pdf [--lift ID]``: the lift-permit annex.

Loads the project, analyses every drop point, writes the PDF atomically
(temporary file in the output folder, then ``os.replace``: a failed run never
leaves a half-written annex), and prints the output path, the page count and the
overall verdict with the standard caution. Bad input (unreadable or invalid
project, unknown lift zone, missing output folder, output that would overwrite
the project) prints one clear message and exits 2.
"""

from __future__ import annotations

import argparse
import os
import sys

from droprig.cli import EXIT_BAD_INPUT, EXIT_OK
from droprig.texts import CAUTION


def _fail(message: str) -> int:
    print(f"droprig report: {message}", file=sys.stderr)
    return EXIT_BAD_INPUT


def run(args: argparse.Namespace) -> int:
    from droprig.io.project_file import ProjectFileError, load_project
    from droprig.model import ModelError
    from droprig.report import content
    from droprig.texts import describe_error
    from droprig.units import UnitError

    path = args.file
    out = args.output
    lift = getattr(args, "lift", None)
    if not out or not str(out).strip():
        return _fail("-o/--output: give the path of the PDF to write, e.g. annex.pdf")
    folder = os.path.dirname(os.path.abspath(out))
    if not os.path.isdir(folder):
        return _fail(f"-o/--output: folder {folder} does not exist")
    if os.path.isdir(out):
        return _fail(f"-o/--output: {out} is a folder; give a file name such as annex.pdf")
    from droprig.io.atomic import OutputRefusedError, check_output, keep_backup

    try:
        check_output(out, (path,), force=bool(getattr(args, "force", False)),
                     option="-o/--output")
    except OutputRefusedError as exc:
        return _fail(str(exc))
    notes: list[str] = []
    try:
        project = load_project(path, notes=notes)
    except ProjectFileError as exc:
        problems = getattr(exc, "problems", None) or [str(exc)]
        lines = "\n  ".join(str(p) for p in problems)
        return _fail(f"{path}: cannot read the project:\n  {lines}")
    except (OSError, ValueError) as exc:
        return _fail(f"{path}: {describe_error(exc)}")
    try:
        zones = content.select_zones(project, lift)
    except ModelError as exc:
        return _fail(str(exc))
    if not zones:
        return _fail(f"{path}: the project has no lift zone to report on")

    from droprig.preflight import analysis_problems
    from droprig.report.annex import write_annex
    from droprig.solver import analyse

    problems = analysis_problems(project)
    if problems:
        return _fail(f"{path}: cannot analyse the project:\n  " + "\n  ".join(problems))
    try:
        results = analyse(project)
    except (ModelError, UnitError) as exc:
        return _fail(f"{path}: {exc}")
    try:
        keep_backup(out)
        pages = write_annex(project, results, out, project_path=path, lift=lift)
    except (ModelError, UnitError) as exc:
        return _fail(str(exc))
    except OSError as exc:
        return _fail(f"cannot write {out}: {describe_error(exc)}")
    from droprig.report.annex import VERDICT_WORDS, permit_conditions

    permit = permit_conditions(project, results)
    print(f"{os.path.abspath(out)} ({pages} pages)")
    for note in notes:  # an older format converted: what changed in meaning
        print(f"note: {note}")
    print(f"overall verdict: {VERDICT_WORDS[permit.verdict].upper()}")  # type: ignore[attr-defined]
    from droprig.permit import clash_sentences

    for sentence in clash_sentences(permit.clashes):  # type: ignore[attr-defined]
        print(f"  the lift plan and the conditions disagree: {sentence}")
    verdicts = content.zone_verdicts(project, results, zones)
    for zv in verdicts:
        zs = content.OUTCOMES.get(zv.response, content.OUTCOMES[content.NOT_ASSESSED])
        print(f"  lift zone {zv.zone.id}: worst response {zs.label.lower()}")
    print(CAUTION)
    return EXIT_OK
