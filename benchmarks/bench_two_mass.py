"""Cost of the two-mass impact solution per point
(:func:`droprig.solver.struck_mass.two_mass_peaks` and
:func:`~droprig.solver.struck_mass.impact_two_forces`), µs per point, on random
loads, struck masses and springs spanning the demos' range (load 10–10⁴ kg, struck
mass 30–3·10⁴ kg, framing 10⁶–3·10⁸ N/m, contact 0.1–1000 × the framing).
Target (issue 10): < 2 µs per point. ``envelope_two_forces`` (the chain's: the
tabulated envelope over lower drops) is timed alongside.
Run: ``.venv/bin/python benchmarks/bench_two_mass.py [n]``.
"""

from __future__ import annotations

import sys
import time

import numpy as np

from droprig.solver import struck_mass
from droprig.solver.impact import G


def main(n: int = 32_000, repeat: int = 3) -> None:
    rng = np.random.default_rng(0)
    M = 10 ** rng.uniform(1, 4, n)
    m2 = 10 ** rng.uniform(1.5, 4.5, n)
    k2 = 10 ** rng.uniform(6, 8.5, n)
    kc = k2 * 10 ** rng.uniform(-1, 3, n)
    h = rng.uniform(0.05, 5.0, n)
    v0 = np.sqrt(2 * G * h)
    best = {"two_mass_peaks": np.inf, "impact_two_forces": np.inf,
            "envelope_two_forces": np.inf}
    struck_mass.envelope_two_forces(M[:10] * G, h[:10], 1 / kc[:10], 1 / k2[:10], m2[:10])
    for _ in range(repeat):
        t = time.perf_counter()
        pk = struck_mass.two_mass_peaks(M, v0, kc, m2, k2)
        best["two_mass_peaks"] = min(best["two_mass_peaks"], time.perf_counter() - t)
        t = time.perf_counter()
        struck_mass.impact_two_forces(M * G, h, 1 / kc, 1 / k2, m2)
        best["impact_two_forces"] = min(best["impact_two_forces"], time.perf_counter() - t)
        t = time.perf_counter()
        struck_mass.envelope_two_forces(M * G, h, 1 / kc, 1 / k2, m2)
        best["envelope_two_forces"] = min(best["envelope_two_forces"],
                                          time.perf_counter() - t)
    for k, v in best.items():
        print(f"{k}: {v / n * 1e6:.2f} µs/point ({n} points, best of {repeat})")
    c = np.bincount(pk.contacts)
    print("contacts followed:", {i: int(x) for i, x in enumerate(c) if x})


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 32_000)
