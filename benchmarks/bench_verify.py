"""Speed of the dynamic amplification and of ``verify`` (prints figures; not part of
``make test``).

Run: ``.venv/bin/python benchmarks/bench_verify.py [--quick]``

1. the demo projects' full ``analyse`` with the project setting ``dynamic_amplification``
   off and on (median, warm: the prepared floor reused) and their ratio — target ≤ 2;
2. one verification of a point (``droprig.solver.verify_point`` at a bay's governing
   point, and ``verify_member`` for a light load on one member) — target ≤ 0.5 s;
3. the annex's verification table (every bay's governing point) per demo project.
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from dataclasses import replace
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import numpy as np  # noqa: E402

from droprig.io.project_file import load_project  # noqa: E402
from droprig.io.sections import get_grade, get_section  # noqa: E402
from droprig.solver import (  # noqa: E402
    analyse,
    exacthistory,
    pointhistory,
    timehistory,
    verification_table,
    verify_member,
    verify_point,
)

DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


def _median_time(fn, runs: int) -> float:
    ts = []
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        ts.append(time.perf_counter() - t)
    return statistics.median(ts)


def main(argv: list[str] | None = None) -> dict[str, float]:
    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true")
    args = ap.parse_args(argv)
    runs = 3 if args.quick else 11
    out: dict[str, float] = {}
    for path in DEMOS:
        p = load_project(path)
        on = replace(p, settings=replace(p.settings, dynamic_amplification=True))
        analyse(p)  # warm (the prepared floor is remembered per settings)
        t_off = _median_time(lambda p=p: analyse(p), runs)
        analyse(on)
        t_on = _median_time(lambda on=on: analyse(on), runs)
        out[f"{path.stem}.analyse_off_ms"] = t_off * 1e3
        out[f"{path.stem}.analyse_on_ms"] = t_on * 1e3
        out[f"{path.stem}.ratio"] = t_on / t_off
        print(f"{path.stem}: analyse warm median {t_off * 1e3:.1f} ms off, "
              f"{t_on * 1e3:.1f} ms with amplification — ratio {t_on / t_off:.2f} "
              "(target ≤ 2)")
        res = analyse(p)
        rows = []
        for b in res.bays:
            try:
                verify_point(p, b.zone_id, b.load_name, b.governing_x, b.governing_y)
            except ValueError:
                continue
            rows.append(b)
        if rows:
            b = rows[0]
            t_pt = _median_time(lambda b=b, p=p: verify_point(p, b.zone_id, b.load_name,
                                                                b.governing_x,
                                                                b.governing_y), runs)
            worst = max(_median_time(lambda b=b, p=p: verify_point(
                p, b.zone_id, b.load_name, b.governing_x, b.governing_y), 1) for b in rows)
            out[f"{path.stem}.verify_point_s"] = t_pt
            out[f"{path.stem}.verify_point_worst_s"] = worst
            print(f"  verify of a point: {t_pt:.3f} s median, slowest bay {worst:.3f} s "
                  "(target ≤ 0.5 s)")
        t_tab = _median_time(lambda p=p, res=res: verification_table(p, res), 1)
        out[f"{path.stem}.table_s"] = t_tab
        print(f"  verification table, {len(res.bays)} bays: {t_tab:.2f} s")
    # the integrators, per point batched: the phase-exact one of the verdict against
    # the Newmark reference, on 100 random members (tests/solver/test_exact_history.py)
    sys.path.insert(0, str(ROOT / "tests" / "solver"))
    from test_exact_history import _random_cases

    c = _random_cases(np.random.default_rng(20261204), 100)
    a_ = (c["cond"], c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    t_ex = _median_time(lambda: exacthistory.exact_time_history(
        *a_, F_yield=c["F_y"], **pointhistory.TH_OPTIONS), 1)
    t_nm = _median_time(lambda: timehistory.time_history_batched(*a_, F_yield=c["F_y"]), 1)
    out["exact_ms_per_point"] = t_ex * 10.0
    out["newmark_ms_per_point"] = t_nm * 10.0
    print(f"time history of 100 random members: phase-exact {t_ex * 10.0:.1f} ms a point, "
          f"Newmark {t_nm * 10.0:.1f} ms a point (target ≤ 1 ms)")
    sec, gr = get_section("W16X26"), get_grade("A992")
    t_m = _median_time(lambda: verify_member(sec, gr, "simple", 7.3152, 2.7432, 27.2, 0.9144,
                                             load_stiffness=2e7), runs)
    out["verify_member_light_s"] = t_m
    print(f"verify of one member, 27 kg from 0.9 m on a 7.3 m W16X26: {t_m:.3f} s "
          "(target ≤ 0.5 s)")
    return out


if __name__ == "__main__":
    main()
