"""Where a demo's warm ``analyse()`` spends its time, phase by phase, and how many
chain evaluations each phase makes (not part of ``make test``; issue 9).

    PYTHONPATH=. python benchmarks/bench_phases.py [--runs 5]

Phases (each the wall time of the functions named, summed over an analysis; the
phases do not overlap): the first pass over the drop points (the first
``evaluate_case`` of :func:`droprig.solver.refine.zone_points_geometry`), the
refinement (its later ones), the confirmation of the points' plastic heights
(:func:`droprig.solver.confirm.confirm_point_heights`), the confirmation rounds of the
bays' limits (:func:`droprig.solver.confirm._run`), the bay summaries
(:func:`droprig.solver.summary.summarise`), the falls to the levels below
(:func:`droprig.solver.analysis.cascade_down`) and the rest. Within them, the chain's
``inverse_answers`` step is timed on its own (the inverse answers).

For each phase: chain runs, rows (points × loads × landings: one row is one chain
evaluation of one point, one load, one landing), and rows that repeat a row the
analysis ran before (the same point, load, trial height, trial mat, landing, trial
flag and case — the ordinary one or the tip-off with its Δ): repeated work a cache
could skip (a trial's repeats within one run are run once already,
:func:`droprig.solver.evaluate._distinct_rows`; before speed31 the key left out the
case, and a point's two cases read as a repeat). Wall times are means per analysis; the
wrappers add about 1 µs a call. The tip-off over a pad's edge: the rows of its own
runs of the chain (``Drop.tip_off`` a Δ at every row: runs that take kept
height-free steps) and their time, and the rows riding in the ordinary runs
(``Drop.tip_off`` NaN at the other rows: the rows whose only case is the tip-off,
and the second case of the others where no steps are kept,
:func:`droprig.solver.evaluate._outputs`).
"""

from __future__ import annotations

import argparse
import time
from collections import defaultdict
from pathlib import Path

import numpy as np

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, confirm, evaluate, refine

ROOT = Path(__file__).resolve().parent.parent
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))

PHASES = ("first pass", "refinement", "point heights", "bay-limit rounds",
          "bay summaries", "falls")


class Probe:
    """The phase stack, the times and the row counts of one analysis."""

    def __init__(self) -> None:
        self.stack: list[str] = ["other"]
        self.T: dict[str, float] = defaultdict(float)
        self.runs: dict[str, int] = defaultdict(int)
        self.rows: dict[str, int] = defaultdict(int)
        self.repeats: dict[str, int] = defaultdict(int)
        self.inverse: dict[str, float] = defaultdict(float)
        self.seen: set[tuple] = set()
        self.refine_calls = 0
        self.tip_rows = 0  # rows of the tip-off's own runs (Drop.tip_off all Δ)
        self.fold_rows = 0  # tip-off rows folded into an ordinary run (Δ, NaN elsewhere)
        self.tip_T = 0.0  # wall time of the tip-off's own runs, s

    def reset(self) -> None:
        self.__init__()  # type: ignore[misc]


P = Probe()


def _phase(name: str, fn):
    def w(*a, **k):
        P.stack.append(name)
        t = time.perf_counter()
        try:
            return fn(*a, **k)
        finally:
            dt = time.perf_counter() - t
            P.stack.pop()
            P.T[name] += dt
            P.T[P.stack[-1] + " (minus)"] -= dt  # exclusive time of the outer phase
    w.__name__ = fn.__name__
    return w


def _row_keys(d: chain.Drop) -> list[tuple]:
    g = d.geo
    li = np.asarray(d.li)
    load_ids = [(ld.name, ld.mass, ld.hard, ld.drop_height) for ld in d.loads]
    H = np.full(d.n, np.nan) if d.H is None else np.asarray(d.H, float)
    mk = np.full(d.n, np.nan) if d.mat_k is None else np.asarray(d.mat_k, float)
    # (NaN read as None: NaN is not equal to itself, so a key holding one would
    # never be found again)
    Hk = [None if h != h else h for h in H.tolist()]
    mkk = [None if m != m else m for m in mk.tolist()]
    # the case of the row: the tip-off's Δ, None the ordinary case (a point's two
    # cases are two rows, not a repeat)
    tip = [None] * d.n if d.tip_off is None else [
        None if t != t else t for t in np.asarray(d.tip_off, float).tolist()]
    return [(float(g.x[i]), float(g.y[i]), load_ids[int(li[i])], Hk[i], mkk[i],
             d.landing, d.trial, d.outcomes_only, d.v_hoist, tip[i])
            for i in range(d.n)]


def install() -> None:
    run = chain.run_chain

    def counted(d, given=None):
        ph = P.stack[-1]
        P.runs[ph] += 1
        P.rows[ph] += d.n
        for key in _row_keys(d):
            if key in P.seen:
                P.repeats[ph] += 1
            else:
                P.seen.add(key)
        if d.tip_off is None:
            return run(d, given)
        folded = int(np.count_nonzero(~np.isnan(np.asarray(d.tip_off, float))))
        if folded < d.n:
            P.fold_rows += folded
            return run(d, given)
        P.tip_rows += d.n
        t = time.perf_counter()
        try:
            return run(d, given)
        finally:
            P.tip_T += time.perf_counter() - t

    evaluate.run_chain = counted  # type: ignore[assignment]
    chain.run_chain = counted  # type: ignore[assignment]

    inv = chain.inverse_answers

    def timed_inverse(c):
        t = time.perf_counter()
        try:
            return inv(c)
        finally:
            P.inverse[P.stack[-1]] += time.perf_counter() - t
    timed_inverse.__name__ = "inverse_answers"
    chain.STEPS = tuple(timed_inverse if s is inv else s for s in chain.STEPS)

    ev = evaluate.evaluate_case

    def ev_in_refine(*a, **k):
        if P.stack[-1] == "zone points":
            P.refine_calls += 1
            name = "first pass" if P.refine_calls == 1 else "refinement"
            return _phase(name, ev)(*a, **k)
        return ev(*a, **k)
    evaluate.evaluate_case = ev_in_refine  # type: ignore[assignment]

    zpg = refine.zone_points_geometry

    def zpg_w(*a, **k):
        P.refine_calls = 0
        return zpg(*a, **k)
    refine.zone_points_geometry = _phase("zone points", zpg_w)  # type: ignore
    confirm.confirm_point_heights = _phase("point heights",  # type: ignore
                                           confirm.confirm_point_heights)
    confirm._run = _phase("bay-limit rounds", confirm._run)  # type: ignore
    analysis.summarise = _phase("bay summaries", analysis.summarise)  # type: ignore
    analysis.cascade_down = _phase("falls", analysis.cascade_down)  # type: ignore


def main(argv: list[str] | None = None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=5)
    a = ap.parse_args(argv)
    install()
    for path in DEMOS:
        proj = load_project(path)
        analysis.analyse(proj)
        tot: dict[str, float] = defaultdict(float)
        inv: dict[str, float] = defaultdict(float)
        wall = cpu = tip_T = 0.0
        for _ in range(a.runs):
            P.reset()
            t, c = time.perf_counter(), time.process_time()
            analysis.analyse(proj)
            wall += time.perf_counter() - t
            cpu += time.process_time() - c
            tip_T += P.tip_T
            for k, v in P.T.items():
                tot[k] += v
            for k, v in P.inverse.items():
                inv[k] += v
        n = a.runs
        print(f"\n{path.stem}: {wall / n * 1e3:.1f} ms per analysis "
              f"({cpu / n * 1e3:.1f} ms of this process's CPU time: a shared machine)")
        print(f"  tip-off over a pad's edge: its own runs {P.tip_rows} rows, "
              f"{tip_T / n * 1e3:.1f} ms; in the ordinary runs {P.fold_rows} rows")
        print(f"  {'phase':18s} {'ms':>7s} {'inverse ms':>10s} {'runs':>5s} "
              f"{'rows':>7s} {'repeated':>8s}")
        other = wall - sum(tot[p] for p in PHASES)
        for ph in (*PHASES, "other"):
            ms = (tot[ph] if ph != "other" else other) / n * 1e3
            print(f"  {ph:18s} {ms:7.1f} {inv[ph] / n * 1e3:10.1f} {P.runs[ph]:5d} "
                  f"{P.rows[ph]:7d} {P.repeats[ph]:8d}")


if __name__ == "__main__":
    main()
