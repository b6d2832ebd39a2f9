"""Load test (issue 16, item 10): a generated project of 10 levels × ~500 members ×
20 lift zones — analyse time, annex time and size, peak memory.

Run: ``.venv/bin/python benchmarks/bench_loadtest.py [--no-annex] [--save FILE]``

The project is invented (regular framing from :func:`droprig.model.generate_level`,
two zones of two loads per level, grid resolution 0.5 m). Peak memory is the
process's maximum resident set (``resource.getrusage``, Linux kilobytes) after each
step (tracemalloc is not used: it slows the allocation-heavy solver several times).
Timings on a shared machine are noisy; read them with the load average printed.
"""

from __future__ import annotations

import argparse
import os
import resource
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from droprig.io.project_file import dumps_project, loads_project  # noqa: E402
from droprig.model import Project  # noqa: E402
from tests.builders import tall_frame  # noqa: E402


def load_test_project(levels: int = 10, zones_per_level: int = 2) -> Project:
    """10 levels of 12 × 10 bays (502 members each), two lift zones of two loads per
    level, one crushable pad per level (:func:`tests.builders.tall_frame`)."""
    return tall_frame(levels, zones_per_level)


def _cancel_latency(project: Project, after: float = 3.0) -> float:
    """Seconds from cancelling a running analysis to its end (the window's cancel)."""
    import threading

    from droprig.solver import analysis, floor
    from droprig.solver.cancel import AnalysisCancelledError, CancelToken, cancellable

    floor._FLOORS.clear()
    token = CancelToken()
    stopped: list[float] = []

    def work() -> None:
        try:
            with cancellable(token):
                analysis.analyse(project)
        except AnalysisCancelledError:
            pass
        stopped.append(time.perf_counter())

    th = threading.Thread(target=work)
    th.start()
    time.sleep(after)
    t_cancel = time.perf_counter()
    token.cancel()
    th.join()
    return stopped[0] - t_cancel


def _rss_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--no-annex", action="store_true")
    ap.add_argument("--save", default=None, help="also write the project file here")
    args = ap.parse_args()
    print(f"load average {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    project = load_test_project()
    text = dumps_project(project)
    if args.save:
        Path(args.save).write_text(text, encoding="utf-8")
    n_m = sum(len(lv.members) for lv in project.levels)
    print(f"load test: {len(project.levels)} levels, {n_m} members, "
          f"{len(project.lift_zones)} lift zones, file {len(text) / 1e6:.2f} MB")
    t0 = time.perf_counter()
    project = loads_project(text)
    print(f"  load + validate file: {time.perf_counter() - t0:.2f} s")
    from droprig.preflight import analysis_problems
    from droprig.solver.analysis import analyse

    t0 = time.perf_counter()
    problems = analysis_problems(project)
    print(f"  preflight (prepared floors): {time.perf_counter() - t0:.2f} s, "
          f"{len(problems)} problems")
    print(f"  cancel: stopped {_cancel_latency(project):.2f} s after the cancel "
          "(issue 16: < 1 s)")
    from droprig.solver import floor as _floor

    _floor._FLOORS.clear()  # the timed run prepares its floors afresh
    t0 = time.perf_counter()
    results = analyse(project)
    dt = time.perf_counter() - t0
    print(f"  analyse: {dt:.1f} s, {results.n_points:,} drop points, {len(results.bays):,} "
          f"bay summaries; max RSS {_rss_mb():.0f} MB")
    if args.no_annex:
        return 0
    from droprig.report.annex import write_annex

    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "annex.pdf"
        t0 = time.perf_counter()
        c0 = time.process_time()
        try:
            pages = write_annex(project, results, out)
        except Exception as exc:  # a figure to report, not a crash of the benchmark
            print(f"  annex: FAILED after {time.perf_counter() - t0:.0f} s: "
                  f"{type(exc).__name__}: {str(exc)[:200]}")
            return 1
        dt = time.perf_counter() - t0
        cpu = time.process_time() - c0
        size = os.path.getsize(out)
    print(f"  annex: {dt:.1f} s ({cpu:.1f} s CPU: the wall time of a loaded machine), "
          f"{pages} pages, {size / 1e6:.1f} MB; max RSS {_rss_mb():.0f} MB")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
