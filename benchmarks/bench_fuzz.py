"""The long form of the fuzz harness (issue 16, item 9): ≥ 10⁴ cases of mutated demo
files and random valid projects through ``droprig validate`` and ``droprig analyse``.

Run: ``.venv/bin/python benchmarks/bench_fuzz.py [--cases N] [--seed S] [--quick]``

Prints the tally (accepted, refused, crashes, hangs, NaN, validate/analyse
disagreements, slowest case) and lists up to 20 failures; exits 1 on any failure.
``make bench`` runs the quick form (1,000 cases); the full run is
``--cases 10000`` (about 20 minutes on one core). The harness itself is
``tests/fuzz/harness.py`` (shared with the quick form in ``make test``).
"""

from __future__ import annotations

import argparse
import importlib.util
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))


def _harness():  # type: ignore[no-untyped-def]
    spec = importlib.util.spec_from_file_location("droprig_fuzz_harness",
                                                  ROOT / "tests" / "fuzz" / "harness.py")
    assert spec is not None and spec.loader is not None
    mod = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = mod
    spec.loader.exec_module(mod)
    return mod


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--cases", type=int, default=10_000)
    ap.add_argument("--seed", type=int, default=20261203)
    ap.add_argument("--quick", action="store_true", help="1,000 cases")
    ap.add_argument("--progress", type=int, default=0, metavar="N",
                    help="print the running tally every N cases and each failure at once "
                         "(a long run stopped early still reports what it saw)")
    args = ap.parse_args()
    n = 1_000 if args.quick else args.cases
    h = _harness()
    t0 = time.perf_counter()
    seen = [0]

    def progress(tally) -> None:  # type: ignore[no-untyped-def]
        for f in tally.failures[seen[0]:]:
            print("  failure:", f[:500], flush=True)
        seen[0] = len(tally.failures)
        if args.progress and tally.cases % args.progress == 0:
            print(f"  after {tally.summary()}; wall {time.perf_counter() - t0:.0f} s",
                  flush=True)

    tally = h.run(n, args.seed, on_case=progress if args.progress else None)
    print(f"fuzz (seed {args.seed}): {tally.summary()}; wall {time.perf_counter() - t0:.0f} s")
    for f in tally.failures[:20]:
        print("  -", f[:500])
    return 1 if tally.failures else 0


if __name__ == "__main__":
    raise SystemExit(main())
