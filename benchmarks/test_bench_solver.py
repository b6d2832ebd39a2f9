"""``make bench`` entry: the solver benchmark script in its quick form (prints figures)."""

from __future__ import annotations

import importlib.util
from pathlib import Path


def test_solver_benchmark_quick() -> None:
    path = Path(__file__).with_name("bench_solver.py")
    spec = importlib.util.spec_from_file_location("bench_solver", path)
    assert spec and spec.loader
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    out = mod.main(["--quick"])
    if "pynite" in out:
        assert out["pynite"]["max_rel_difference"] < 1e-6  # same model as the FE grillage
