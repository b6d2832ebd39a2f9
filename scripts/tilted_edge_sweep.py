"""Random sweep of a load landing tilted on one edge: the chain's tilted landing (the
whole mass on the edge, the two-mass envelope at the lowest edge's fall,
``struck_mass.envelope_two_forces``, and since stop 32 the larger of that and the energy
bound of either edge's strike, ``footprint.tilted_contact_bound``) and the flat landing
(the same mass on both edges' springs) against the 2-DOF time history of the body's
drop and rotation of ``tests/solver/test_tilted_edge_history.py`` (``_history``).
Invented systems; the figures are the history's. What it printed (40 systems a run,
three inertias each: thin plate, uniform block, corner masses):

* edge contact force, the envelope alone ÷ history: 1.02–1.46 at 0.6°, 0.88–1.10 at
  1.7°, 0.89–1.28 at 2.9° (seed 27); the far edge's strike meets the floor on its
  rebound and falls b·tilt further (adding b·sin θ to the fall leaves 0.79 at 2°, seed
  28, and 0.91 at 1°, seed 29);
* edge contact force, the larger of the envelope and the energy bound ÷ history: see
  the README's limits for the figures of the run at stop 32 (``bound@tilt``: the bound
  at the system's own tilt; ``chain``: at the chain's design tilt of 5°, what the
  analysis reads for any tilt up to it);
* framing force, the larger of the flat and tilted landings ÷ history: 0.99–1.52;
* the flat landing's contact force (both edges) ÷ the history's worse edge: 1.24–1.99.

Run: ``PYTHONPATH=. .venv/bin/python scripts/tilted_edge_sweep.py [n] [seed] [tilt_rad]``
(about 3 s a system); the last lines give min / median / max of each column.
"""

from __future__ import annotations

import math
import sys

import numpy as np

from droprig.solver.footprint import PAD_TILT, tilted_contact_bound
from droprig.solver.impact import G
from droprig.solver.struck_mass import envelope_two_forces
from tests.solver.test_tilted_edge_history import _history


def _system(rng: np.random.Generator, tilt: float | None) -> tuple[float, ...]:
    M = float(np.exp(rng.uniform(math.log(200), math.log(8000))))
    mu = float(np.exp(rng.uniform(math.log(0.3), math.log(10))))  # floor mass / load mass
    k_f = float(np.exp(rng.uniform(math.log(2e6), math.log(1e8))))
    k_c = float(np.exp(rng.uniform(math.log(1e7), math.log(2e9))))
    h = float(np.exp(rng.uniform(math.log(0.1), math.log(3.0))))
    b, H = float(rng.uniform(0.5, 4.0)), float(rng.uniform(0.2, 3.0))
    t = float(rng.choice([0.01, 0.03, 0.05])) if tilt is None else tilt
    return M, mu * M, k_c, k_f, h, b, H, t


def main(n: int, seed: int, tilt: float | None) -> None:
    rng = np.random.default_rng(seed)
    cols: dict[str, list[float]] = {"envelope": [], "bound@tilt": [], "chain": [],
                                    "framing": [], "flat contact": []}
    for _ in range(n):
        M, m2, k_c, k_f, h, b, H, t = _system(rng, tilt)
        one = [np.array([v]) for v in (M * G, h, 1.0 / k_c, 1.0 / k_f, m2)]
        Fc_t, Ff_t = envelope_two_forces(*one)
        one[2] = np.array([0.5 / k_c])  # flat: both edges' springs
        Fc_f, Ff_f = envelope_two_forces(*one)
        edge = frame = 0.0
        for I_G in (M * b**2 / 12, M * (b**2 + H**2) / 12, M * (b**2 + H**2) / 4):
            FA, FB, Ff = _history(M, b, I_G, h, t, k_c, m2, k_f)
            edge, frame = max(edge, FA, FB), max(frame, Ff)
        env = float(Fc_t[0])
        at_t = max(env, float(tilted_contact_bound(M * G, h, 1.0 / k_c, 1.0 / k_f, b, t)))
        chain = max(env, float(tilted_contact_bound(M * G, h, 1.0 / k_c, 1.0 / k_f, b,
                                                    max(t, PAD_TILT))))
        row = {"envelope": env / edge, "bound@tilt": at_t / edge, "chain": chain / edge,
               "framing": max(float(Ff_t[0]), float(Ff_f[0])) / frame,
               "flat contact": float(Fc_f[0]) / edge}
        for k, v in row.items():
            cols[k].append(v)
        print(f"M={M:6.0f} kg m2/M={m2 / M:5.2f} k_c={k_c:.1e} k_f={k_f:.1e} h={h:.2f} "
              f"b={b:.2f} H={H:.2f} tilt={t:.4f}: edge contact: envelope "
              f"{row['envelope']:.2f}, bound@tilt {row['bound@tilt']:.2f}, chain "
              f"{row['chain']:.2f}; framing (worse landing) {row['framing']:.2f}, flat "
              f"contact {row['flat contact']:.2f}", flush=True)
    for k, v in cols.items():
        print(f"{k}: min {min(v):.2f} median {float(np.median(v)):.2f} max {max(v):.2f}")


if __name__ == "__main__":
    a = sys.argv[1:]
    main(int(a[0]) if a else 40, int(a[1]) if len(a) > 1 else 27,
         float(a[2]) if len(a) > 2 else None)
