"""What the floors' point histories cost and where it goes (issue 12; not part of
``make test``).

    PYTHONPATH=. python benchmarks/bench_point_history.py [--runs 1] [--stepping]

For each demo, a warm ``analyse()`` with the project setting ``dynamic_amplification``
on: with the floors' point histories off (``chain.FLOOR_POINT_HISTORY`` False: the
bounds alone), and on. With them on, every call of
:func:`droprig.solver.pointhistory.point_history` is counted: calls, points run,
distinct points (x, y, load), distinct (point, fall) pairs — a run that repeats one
of these repeats a history already worked out — the time in the calls, the modes kept
and the samples of the longest case (:func:`droprig.solver.exacthistory.
exact_time_history`'s ``modes``, ``steps``).
"""

from __future__ import annotations

import argparse
import time
from dataclasses import replace
from pathlib import Path

import numpy as np

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, exacthistory, floor, pointhistory

ROOT = Path(__file__).resolve().parent.parent
DEMOS = sorted((ROOT / "demo_projects").glob("*.droprig"))


class Stats:
    def __init__(self) -> None:
        self.calls = 0
        self.points = 0
        self.t = 0.0
        self.t_exact = 0.0
        self.pts: set[tuple] = set()
        self.pt_h: set[tuple] = set()
        self.modes: list[int] = []
        self.steps: list[int] = []
        self.per_call: list[tuple[int, float]] = []
        self.samples = np.zeros(3)  # by phase: contact, crushing, free
        self.rounds = 0
        self.fallback = 0
        self.leapt = 0.0
        self.t_choose = 0.0  # chain._point_histories (choosing + point_history)
        self.t_amp = 0.0  # chain.amplification_at (the bounds + the histories)
        self.t_tip = 0.0  # chain._tip_turns (the tip-off search of points not yet met)


S = Stats()
STEPPING = False
"""``--stepping``: the member histories by the plain stepping run (the reference)."""


def install() -> None:
    ph = pointhistory.point_history
    ex = exacthistory.exact_time_history

    def counted(c, sel, h, F, **kw):
        d = c.drop
        t = time.perf_counter()
        try:
            return ph(c, sel, h, F, **kw)
        finally:
            dt = time.perf_counter() - t
            S.calls += 1
            S.points += len(sel)
            S.t += dt
            S.per_call.append((len(sel), dt))
            for i, hh in zip(np.asarray(sel).tolist(), np.asarray(h).tolist(), strict=True):
                key = (round(float(d.geo.x[i]), 9), round(float(d.geo.y[i]), 9),
                       int(d.li[i]), d.landing)
                S.pts.add(key)
                S.pt_h.add((*key, hh))

    def timed_exact(*a, **k):
        t = time.perf_counter()
        try:
            r = ex(*a, **k, stepping=STEPPING)
            S.modes.extend(np.asarray(r.modes).tolist())
            S.steps.append(int(r.steps))
            if r.leapt is not None:
                S.leapt += float(np.sum(r.leapt))
            return r
        finally:
            S.t_exact += time.perf_counter() - t

    cut = exacthistory._Integrator._cut

    def counted_cut(self, idx, ts, which, i_ev, G):
        res = cut(self, idx, ts, which, i_ev, G)
        np.add.at(S.samples, self.kind[idx], res[3])  # the samples scanned, by phase
        S.rounds += 1
        return res

    ref = exacthistory.timehistory.time_history_batched

    def counted_ref(cond, *a, **k):
        S.fallback += len(cond)
        return ref(cond, *a, **k)

    def timed(name: str, attr: str):
        fn = getattr(chain, name)

        def wrapped(*a, **k):
            t = time.perf_counter()
            try:
                return fn(*a, **k)
            finally:
                setattr(S, attr, getattr(S, attr) + time.perf_counter() - t)
        setattr(chain, name, wrapped)

    timed("_point_histories", "t_choose")
    timed("amplification_at", "t_amp")
    timed("_tip_turns", "t_tip")
    exacthistory._Integrator._cut = counted_cut  # type: ignore[method-assign]
    exacthistory.timehistory.time_history_batched = counted_ref  # type: ignore
    pointhistory.point_history = counted  # type: ignore[assignment]
    chain.pointhistory.point_history = counted  # type: ignore[attr-defined]
    exacthistory.exact_time_history = timed_exact  # type: ignore[assignment]
    pointhistory.exacthistory.exact_time_history = timed_exact  # type: ignore


def _time(proj, runs: int) -> float:
    analysis.analyse(proj)  # warm
    ts = []
    for _ in range(runs):
        t = time.perf_counter()
        analysis.analyse(proj)
        ts.append(time.perf_counter() - t)
    return float(np.median(ts))


def main(argv: list[str] | None = None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=1)
    ap.add_argument("--demo", action="append", help="demo stem (default: all)")
    ap.add_argument("--stepping", action="store_true",
                    help="the member histories by the stepping run (before the bounded "
                         "search), for the before/after figures")
    ap.add_argument("--trials", type=lambda v: v == "on", action="append",
                    help="point histories in the confirmation trials: on/off "
                         "(repeatable; default off)")
    a = ap.parse_args(argv)
    a.trials = a.trials or [False]
    global STEPPING
    STEPPING = a.stepping
    install()
    print("member histories by the " + ("stepping run" if a.stepping else "bounded search"))
    for path in DEMOS:
        if a.demo and path.stem not in a.demo:
            continue
        proj = load_project(path)
        p_on = replace(proj, settings=replace(proj.settings, dynamic_amplification=True))
        chain.FLOOR_POINT_HISTORY = False
        off = _time(proj, a.runs)
        bounds = _time(p_on, a.runs)
        print(f"\n{path.stem}: analyse amplification off {off:.2f} s, on with bounds "
              f"{bounds:.2f} s")
        for trials in a.trials:
            _histories(p_on, off, trials)


def _histories(p_on, off: float, trials: bool) -> None:
    """One analysis with the floors' point histories on (``trials``: in the
    confirmation trials too), the history cache emptied first."""
    chain.FLOOR_POINT_HISTORY = True
    chain.TRIAL_POINT_HISTORY = trials
    try:
        for fm in list(floor._FLOORS.values()):  # an empty history cache
            fm._memo.pop("point_histories", None)
        S.__init__()  # type: ignore[misc]
        t = time.perf_counter()
        analysis.analyse(p_on)
        hist = time.perf_counter() - t
        calls, points, pts, pt_h = S.calls, S.points, len(S.pts), len(S.pt_h)
        integrated, t_in, t_ex = len(S.modes), S.t, S.t_exact
        samples, rounds, fallback = S.samples.copy(), S.rounds, S.fallback
        t_choose, t_amp, t_tip = S.t_choose, S.t_amp, S.t_tip
        t = time.perf_counter()
        analysis.analyse(p_on)  # again on the same floor: its histories kept
        again = time.perf_counter() - t
    finally:
        chain.FLOOR_POINT_HISTORY = False
        chain.TRIAL_POINT_HISTORY = False
    where = "in the trials too" if trials else "not in the trials"
    print(f"  on with point histories ({where}): {hist:.2f} s ({hist / off:.1f} x off); "
          f"again on the same floor {again:.2f} s")
    if calls:
        # the split of the run (amplification_at nests in the refinement's and the
        # confirmation's chain runs; the tip-off search runs for points the run
        # chooses that the runs before it had not met)
        print(f"  split: integrator {t_ex:.2f} s, preparing the points (point_history "
              f"less the integrator) {t_in - t_ex:.2f} s, choosing them (_point_histories "
              f"less point_history) {t_choose - t_in:.2f} s, the bounds (amplification_at "
              f"less _point_histories) {t_amp - t_choose:.2f} s, tip-off search of new "
              f"points {t_tip:.2f} s, the rest {hist - t_amp - t_tip:.2f} s")
        print(f"  point_history calls {calls}, points run {points}, distinct points "
              f"{pts}, distinct (point, fall) {pt_h}, integrated {integrated} (the rest "
              f"from the cache); time in them {t_in:.2f} s (integrator {t_ex:.2f} s), "
              f"{t_ex / max(integrated, 1) * 1e3:.1f} ms an integrated point")
        if S.modes:
            m = np.asarray(S.modes)
            print(f"  modes kept: median {np.median(m):.0f}, max {m.max()}; samples of "
                  f"the longest case per call: median {np.median(S.steps):.0f}, max "
                  f"{max(S.steps)}")
            share = samples / max(samples.sum(), 1.0)
            print(f"  samples scanned {samples.sum():.3g} in {rounds} rounds: contact "
                  f"{share[0]:.0%}, crushing {share[1]:.0%}, free (load apart) "
                  f"{share[2]:.0%}; leapt in free flight {S.leapt:.3g}; chattering cases "
                  f"handed to the Newmark reference {fallback}")
            pc = np.asarray(S.per_call)
            print(f"  points per call: median {np.median(pc[:, 0]):.0f}, max "
                  f"{pc[:, 0].max():.0f}; ms per call median {np.median(pc[:, 1]) * 1e3:.1f}")


if __name__ == "__main__":
    main()
