"""Benchmark: the plan view with a large roof and many drop points.

Run as a script: ``QT_QPA_PLATFORM=offscreen python benchmarks/bench_plan_view.py``.
A 16 × 10 bay roof (≈ 830 members) with one lift zone and 10⁴ or 10⁵ drop
points (synthetic values: this measures drawing, not engineering). Prints the
median of the repeats for ``set_results`` (bay states, point index, overlay
raster), one full repaint (``grab``) per overlay, one hover lookup and one
zoom step. Targets (our own): set_results ≤ 0.2 s, repaint ≤ 0.1 s, hover ≤ 2 ms.
"""

from __future__ import annotations

import argparse
import math
import os
import statistics
import sys
import time

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

TARGETS = {"set_results": 0.2, "repaint": 0.1, "hover": 0.002}


def _project():
    from droprig.io.sections import get_grade, get_section
    from droprig.model import LiftLoad, LiftZone, Project, Settings, generate_level

    level = generate_level(
        level_id="R", name="Roof", elevation=12.0, x_spacings=(9.0,) * 16,
        y_spacings=(7.5,) * 10, girder_direction="y", beam_spacing=2.0,
        girder_section=get_section("W24X68"), beam_section=get_section("W16X26"),
        girder_grade=get_grade("A992"), beam_grade=get_grade("A992"))
    zone = LiftZone("Z1", "Demo crane", "R", crane=(72.0, 37.5), r_min=2.0, r_max=60.0,
                    loads=(LiftLoad("Demo load", 2000.0, drop_height=1.0),))
    return Project(settings=Settings(grid_resolution=0.25), levels=(level,),
                   lift_zones=(zone,))


def _results(project, n: int):
    import numpy as np

    from droprig.model import bays
    from droprig.solver.results import BaySummary, CaseResult, Results

    rng = np.random.default_rng(1)
    ext = project.levels[0].grid.extent
    side = math.sqrt(ext.width * ext.height / n)
    xs, ys = np.meshgrid(np.arange(ext.x0, ext.x1, side), np.arange(ext.y0, ext.y1, side))
    x, y = xs.ravel(), ys.ravel()
    k = x.size
    u = rng.uniform(0.0, 1.6, k)
    z = np.zeros(k)
    bl = bays(project.levels[0])
    case = CaseResult(
        "Z1", "Demo load", "R", 2000.0, 2000 * 9.80665, 1.0, x, y, np.zeros(k, dtype=int),
        -np.ones(k, dtype=int), z + 1.0, z, z, z, z, z, z, u, np.zeros(k, dtype=int),
        np.zeros(k, dtype=int), np.where(u > 1.3, 2, np.where(u > 1.0, 1, 0)),
        3.0 - 2 * u, 3.5 - 2 * u, z, z, z, z, z, z)
    sums = tuple(BaySummary("R", b.id, "Z1", "Demo load", 1, 0.5, "elastic", 1.0, 1.0,
                            b.rect.x0, b.rect.y0, "", "flexure", "none") for b in bl)
    return Results((case,), sums)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--repeat", type=int, default=5)
    args = ap.parse_args(argv)

    from PySide6.QtWidgets import QApplication

    from droprig.gui.plan_view import PlanView

    app = QApplication.instance() or QApplication(sys.argv[:1])
    project = _project()
    view = PlanView()
    view.resize(1400, 900)
    view.show()
    view.set_project(project, "R")
    app.processEvents()
    print(f"members: {len(project.levels[0].members)}")
    slow = False
    for n in (10_000, 100_000):
        results = _results(project, n)
        timings: dict[str, list[float]] = {"set_results": [], "repaint": [], "hover": [],
                                           "zoom": []}
        for _ in range(args.repeat):
            view.set_overlay("utilisation")
            t0 = time.perf_counter()
            view.set_results(results)
            timings["set_results"].append(time.perf_counter() - t0)
            for mode in ("outcome", "utilisation", "drop_height"):
                view.set_overlay(mode)
                t0 = time.perf_counter()
                view.grab()
                timings["repaint"].append(time.perf_counter() - t0)
            t0 = time.perf_counter()
            for j in range(100):
                view.describe(10.0 + j, 30.0)
            timings["hover"].append((time.perf_counter() - t0) / 100)
            t0 = time.perf_counter()
            view.zoom_by(1.25)
            view.grab()
            timings["zoom"].append(time.perf_counter() - t0)
            view.fit()
        print(f"{results.n_points} drop points:")
        for key, vals in timings.items():
            med = statistics.median(vals)
            target = TARGETS.get(key)
            flag = ""
            if target is not None and med > target:
                flag = f"  SLOWER than target {target:g} s"
                slow = slow or n <= 10_000
            print(f"  {key:12s} median {med * 1000:8.2f} ms{flag}")
    return 1 if slow else 0


if __name__ == "__main__":
    raise SystemExit(main())
