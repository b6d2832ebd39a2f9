"""The core layers never import Qt (common practice, no source: keeps the
solver usable headless and testable without a display)."""

from __future__ import annotations

import ast
import pathlib

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[1] / "droprig"
CORE = ("model", "solver", "io", "report")


def _imports(path: pathlib.Path) -> set[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(a.name.split(".")[0] for a in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module.split(".")[0])
            if node.module.startswith("droprig."):
                names.add(node.module)
    return names


@pytest.mark.parametrize("layer", CORE)
def test_core_layers_do_not_import_qt(layer: str) -> None:
    for path in (ROOT / layer).rglob("*.py"):
        assert "PySide6" not in _imports(path), f"{path} imports PySide6"


def test_model_imports_nothing_above_it() -> None:
    for path in (ROOT / "model").rglob("*.py"):
        imps = _imports(path)
        assert "numpy" not in imps and "pint" not in imps, path
        for bad in ("droprig.solver", "droprig.io", "droprig.report", "droprig.gui"):
            assert not any(i.startswith(bad) for i in imps), f"{path} imports {bad}"


def test_solver_imports_only_model_and_numpy() -> None:
    for path in (ROOT / "solver").rglob("*.py"):
        imps = _imports(path)
        for bad in ("droprig.io", "droprig.report", "droprig.gui", "droprig.units",
                    "droprig.advice", "droprig.outcomes", "droprig.texts", "matplotlib",
                    "pint", "scipy"):
            assert not any(i.startswith(bad) for i in imps), f"{path} imports {bad}"


def _outer_files() -> list[pathlib.Path]:
    return [p for p in ROOT.rglob("*.py") if (ROOT / "solver") not in p.parents]


def test_outer_layers_use_only_the_solver_face() -> None:
    # GUI, CLI, report and the shared edge modules import the solver's public names
    # from ``droprig.solver`` and nothing from its modules
    for path in _outer_files():
        deep = sorted(i for i in _imports(path) if i.startswith("droprig.solver."))
        assert not deep, f"{path.relative_to(ROOT)} imports {deep}"


def test_solver_face_names_exist() -> None:
    import droprig.solver as solver

    assert solver.__all__, "the solver's public face is empty"
    for name in solver.__all__:
        assert hasattr(solver, name), name
    for name in ("analyse", "trace_point", "assess_member", "member_resistances",
                 "check_framing", "Results", "CaseResult", "BaySummary", "Trace"):
        assert name in solver.__all__, name


def test_nothing_imports_the_command_line_but_itself() -> None:
    # the caution and error texts live in droprig.texts; no arrow runs back up
    for path in _outer_files():
        rel = path.relative_to(ROOT)
        if rel.parts[0] == "commands" or rel.name in ("cli.py", "__main__.py"):
            continue
        bad = [i for i in _imports(path) if i in ("droprig.cli", "droprig.commands")
               or i.startswith("droprig.commands.")]
        assert not bad, f"{rel} imports {bad}"


@pytest.mark.parametrize("module", ["outcomes.py", "advice.py", "texts.py"])
def test_shared_edge_modules_are_qt_free(module: str) -> None:
    # read by the desktop app, the annex and the command line alike
    imps = _imports(ROOT / module)
    assert "PySide6" not in imps and "matplotlib" not in imps and "reportlab" not in imps
    assert not any(i.startswith("droprig.gui") or i.startswith("droprig.report")
                   for i in imps)


def test_outcome_palette_needs_nothing_but_the_standard_library() -> None:
    assert not any(i.startswith("droprig") or i in ("numpy", "pint")
                   for i in _imports(ROOT / "outcomes.py"))
