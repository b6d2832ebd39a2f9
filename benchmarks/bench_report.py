"""Benchmark: the lift-permit annex for each demo project (target ≤ 2 s each).

Run as a script: ``python benchmarks/bench_report.py [--repeat 5]``. Prints the
median of the repeats for analysis and for the annex (``write_annex``: traces,
layout, PDF), per demo project. The analysis is timed separately because the
GUI and the CLI run it once and may write several annexes from it.
"""

from __future__ import annotations

import argparse
import pathlib
import statistics
import sys
import tempfile
import time

ROOT = pathlib.Path(__file__).resolve().parents[1]
TARGET_S = 2.0


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--repeat", type=int, default=5)
    args = ap.parse_args(argv)

    from droprig.io.project_file import load_project
    from droprig.report.annex import write_annex
    from droprig.solver.analysis import analyse

    demos = sorted((ROOT / "demo_projects").glob("*.droprig"))
    if not demos:
        print("no demo projects found", file=sys.stderr)
        return 1
    worst = 0.0
    with tempfile.TemporaryDirectory() as tmp:
        for path in demos:
            project = load_project(path)
            t_an, t_rep = [], []
            pages = 0
            for _ in range(args.repeat):
                t0 = time.perf_counter()
                results = analyse(project)
                t1 = time.perf_counter()
                pages = write_annex(project, results, pathlib.Path(tmp) / "annex.pdf",
                                    project_path=path)
                t2 = time.perf_counter()
                t_an.append(t1 - t0)
                t_rep.append(t2 - t1)
            med_an, med_rep = statistics.median(t_an), statistics.median(t_rep)
            worst = max(worst, med_rep)
            print(f"{path.name:32s} analyse {med_an:6.3f} s   annex {med_rep:6.3f} s "
                  f"({pages} pages; median of {args.repeat})   total {med_an + med_rep:6.3f} s")
    verdict = "within" if worst <= TARGET_S else "OVER"
    print(f"slowest annex {worst:.3f} s: {verdict} the {TARGET_S:.1f} s target")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
