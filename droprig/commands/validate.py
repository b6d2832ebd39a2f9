"""``droprig validate FILE``: check a project file without analysing it.

Prints ``ok`` and a one-line summary and returns 0, or prints every problem
(each with its JSON path) and returns 2: what the loader refuses and what the
analysis would refuse (:func:`droprig.preflight.analysis_problems`), so ``ok``
means ``droprig analyse`` accepts the file. A valid file says nothing about the
safety of a lift; it only means droprig can read it.
"""

from __future__ import annotations

import argparse
import sys

from droprig.cli import EXIT_BAD_INPUT, EXIT_OK


def _plural(n: int, word: str, plural: str | None = None) -> str:
    return f"{n} {word if n == 1 else (plural or word + 's')}"


def summary(project: object) -> str:
    """``2 levels, 52 members, 1 lift zone, 3 loads, 1 protection area``."""
    from droprig.model import Project

    assert isinstance(project, Project)
    n_members = sum(len(lv.members) for lv in project.levels)
    n_loads = sum(len(z.loads) for z in project.lift_zones)
    return ", ".join((
        _plural(len(project.levels), "level"),
        _plural(n_members, "member"),
        _plural(len(project.lift_zones), "lift zone"),
        _plural(n_loads, "load"),
        _plural(len(project.protection_areas), "protection area"),
    ))


def run(args: argparse.Namespace) -> int:
    from droprig.commands import describe_error
    from droprig.io.project_file import ProjectFileError, load_project

    path = args.file
    try:
        project = load_project(path)
    except ProjectFileError as exc:
        n = getattr(exc, "total", len(exc.problems))
        print(f"{path}: {_plural(n, 'problem')}")
        for problem in exc.problems:
            print(f"  {problem}")
        return EXIT_BAD_INPUT
    except (OSError, ValueError) as exc:
        print(f"{path}: {describe_error(exc)}", file=sys.stderr)
        return EXIT_BAD_INPUT
    from droprig.preflight import analysis_problems

    problems = analysis_problems(project)
    if problems:
        print(f"{path}: {_plural(len(problems), 'problem')}")
        for problem in problems:
            print(f"  {problem}")
        return EXIT_BAD_INPUT
    print("ok")
    print(f"{path}: {summary(project)}")
    return EXIT_OK
