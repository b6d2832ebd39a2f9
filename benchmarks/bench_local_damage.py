"""Extra cost per drop point of the local-damage step (prints figures; not part of
``make test``).

Run: ``.venv/bin/python benchmarks/bench_local_damage.py [--quick]``

For each demo project's hard loads, :func:`droprig.solver.local_damage.load_local_damage`
(three strike orientations, four perforation families each; and on a 10 mm steel
plate deck, BRL and the plastic dent) over n drop points with
drop heights spread over 0–2× the load's height; reported as ns per drop point
per load, next to the floor analysis's own time per drop point for scale; then the
demo's whole ``analyse`` with and without the step (the same project with every
load marked not hard), interleaved runs, medians.
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from dataclasses import replace
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from droprig.io.project_file import load_project  # noqa: E402
from droprig.model import Deck  # noqa: E402
from droprig.solver import analysis  # noqa: E402
from droprig.solver import local_damage as ld  # noqa: E402

DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


def _median(fn, runs: int) -> float:
    ts = []
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        ts.append(time.perf_counter() - t)
    return statistics.median(ts)


def main(argv: list[str] | None = None) -> dict[str, dict[str, float]]:
    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true")
    args = ap.parse_args(argv)
    n = 20_000 if args.quick else 1_000_000
    runs = 3 if args.quick else 5
    out: dict[str, dict[str, float]] = {}
    rng = np.random.default_rng(0)
    for path in DEMOS:
        project = load_project(path)
        t_an = _median(lambda p=project: analysis.analyse(p), runs)
        n_pts = 0
        res = analysis.analyse(project)
        for case in res.cases:
            n_pts += int(case.x.size)
        for z in project.lift_zones:
            lv = project.level(z.level_id)
            for load in z.loads:
                if not ld.is_hard(load):
                    continue
                h = rng.uniform(0.0, 2.0 * load.height_above(lv.elevation), n)
                t = _median(lambda ld_=load, d=lv.deck, hh=h: ld.load_local_damage(ld_, d, hh),
                            runs)
                key = f"{path.stem}/{load.name}"
                out[key] = {"ns_per_point": 1e9 * t / n,
                            "analysis_ns_per_point": 1e9 * t_an / max(n_pts, 1)}
                print(f"{key}: local damage {1e9 * t / n:8.1f} ns/point "
                      f"({len(load.strike_orientations)} orientations, n = {n}); "
                      f"floor analysis {1e9 * t_an / max(n_pts, 1):8.1f} ns/point "
                      f"({n_pts} points, median {1e3 * t_an:.1f} ms)")
                plate = Deck(kind="steel_plate", thickness=0.010)
                t_pl = _median(lambda ld_=load, hh=h, d=plate: ld.load_local_damage(ld_, d, hh),
                               runs)
                out[key]["plate_ns_per_point"] = 1e9 * t_pl / n
                print(f"{key}: on a 10 mm steel plate deck (BRL) {1e9 * t_pl / n:8.1f} "
                      "ns/point")
                if hasattr(ld, "plate_dent_depth"):
                    # the plate's plastic dent per orientation (as chain.plate_dent):
                    # k, depth, the height of the dent limit and the validity
                    R = rng.uniform(0.3, 1.5, n)

                    def dent(ld_=load, hh=h, RR=R) -> None:
                        for o in ld_.strike_orientations:
                            deq, _p, _n = ld.strike_geometry(
                                o, ld_.footprint_length, ld_.footprint_width,
                                ld_.edge_width)
                            k = ld.plate_dent_stiffness(0.010, 235e6, deq / 2, RR)
                            W = ld.plate_dent_depth(ld_.mass, hh, k)
                            ld.plate_dent_height(ld_.mass, ld.DENT_LIMIT, k)
                            ld.plate_dent_valid(W, 0.010, deq / 2, RR)

                    t_dn = _median(dent, runs)
                    out[key]["dent_ns_per_point"] = 1e9 * t_dn / n
                    print(f"{key}: plate dent (all orientations) {1e9 * t_dn / n:8.1f} "
                          "ns/point")
        soft = replace(project, lift_zones=tuple(
            replace(z, loads=tuple(replace(ld_, hard=False) for ld_ in z.loads))
            for z in project.lift_zones))
        a, b = [], []
        for _ in range(runs * 3):
            t0 = time.perf_counter()
            analysis.analyse(project)
            a.append(time.perf_counter() - t0)
            t0 = time.perf_counter()
            analysis.analyse(soft)
            b.append(time.perf_counter() - t0)
        n_hard = sum(c.n for c in res.cases
                     if ld.is_hard(next(x for z in project.lift_zones for x in z.loads
                                        if x.name == c.load_name)))
        extra = statistics.median(a) - statistics.median(b)
        out[f"{path.stem}/analyse"] = {"with_ms": 1e3 * statistics.median(a),
                                       "without_ms": 1e3 * statistics.median(b)}
        print(f"{path.stem}: analyse {1e3 * statistics.median(a):.1f} ms with the step, "
              f"{1e3 * statistics.median(b):.1f} ms without (extra {1e3 * extra:.2f} ms over "
              f"{n_hard} hard-load points; includes the cascade and any change in refinement)")
    return out


if __name__ == "__main__":
    main(sys.argv[1:])
