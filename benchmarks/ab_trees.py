"""Warm ``analyse()`` of the demo projects on two source trees, timed in turns (not
part of ``make test``; a shared machine's load drifts by tens of % from one minute to
the next, so two trees are only compared run against run, interleaved).

    python benchmarks/ab_trees.py /work/main /work/wt/mybranch [--rounds 7] [--runs 5]

Each round starts one fresh interpreter per tree (``PYTHONPATH`` = the tree), which
analyses every demo once to warm up and then ``--runs`` times; the round's figure is
the median of those runs, by wall clock and by process CPU time. Printed: per tree
and demo the median over the rounds, the range, and the ratio of the two trees'
medians; /proc/loadavg before and after.
"""

from __future__ import annotations

import argparse
import json
import statistics
import subprocess
import sys
from pathlib import Path

CHILD = r"""
import json, statistics, sys, time
from pathlib import Path
from droprig.io.project_file import load_project
from droprig.solver import analyse
runs = int(sys.argv[1])
out = {}
for p in sorted(Path("demo_projects").glob("*.droprig")):
    proj = load_project(p)
    analyse(proj)
    wall, cpu = [], []
    for _ in range(runs):
        t, c = time.perf_counter(), time.process_time()
        analyse(proj)
        wall.append(time.perf_counter() - t)
        cpu.append(time.process_time() - c)
    out[p.stem] = (statistics.median(wall), statistics.median(cpu))
print(json.dumps(out))
"""


def _loadavg() -> str:
    try:
        return Path("/proc/loadavg").read_text().strip()
    except OSError:
        return "?"


def main(argv: list[str] | None = None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("trees", nargs=2, type=Path)
    ap.add_argument("--rounds", type=int, default=7)
    ap.add_argument("--runs", type=int, default=5)
    a = ap.parse_args(argv)
    print(f"loadavg before: {_loadavg()}")
    got: dict[str, list[dict[str, list[float]]]] = {str(t): [] for t in a.trees}
    for r in range(a.rounds):
        order = a.trees if r % 2 == 0 else a.trees[::-1]
        for tree in order:
            res = subprocess.run([sys.executable, "-c", CHILD, str(a.runs)], cwd=tree,
                                 env={"PYTHONPATH": str(tree), "PATH": "/usr/bin:/bin"},
                                 capture_output=True, text=True, check=True)
            got[str(tree)].append(json.loads(res.stdout.strip().splitlines()[-1]))
    print(f"loadavg after:  {_loadavg()}")
    demos = sorted(got[str(a.trees[0])][0])
    meds: dict[tuple[str, str, int], float] = {}
    for tree in a.trees:
        print(f"\n{tree}: median of {a.rounds} rounds (each the median of {a.runs} warm runs)")
        for d in demos:
            line = []
            for k, what in ((0, "wall"), (1, "cpu")):
                v = [rnd[d][k] * 1e3 for rnd in got[str(tree)]]
                meds[(str(tree), d, k)] = statistics.median(v)
                line.append(f"{what} {statistics.median(v):6.1f} ms ({min(v):.1f}–{max(v):.1f})")
            print(f"   {d:24s} " + ", ".join(line))
    t0, t1 = (str(t) for t in a.trees)
    print(f"\nratio {a.trees[1].name} / {a.trees[0].name}:")
    for d in demos:
        print(f"   {d:24s} wall {meds[(t1, d, 0)] / meds[(t0, d, 0)]:.3f}, "
              f"cpu {meds[(t1, d, 1)] / meds[(t0, d, 1)]:.3f}")


if __name__ == "__main__":
    main()
