"""Convergence of the time history in modes and time step: the margin on the
per-point time history the verdict uses (``droprig.solver.pointhistory.TH_MARGIN``).

Random members and contacts (the ranges of ``calibrate_contact_bound.py``: simple,
fixed, propped and cantilever members, span 2–15 m, EI 0.2–200 MN·m², μ 10–300 kg/m,
load ÷ struck mass 0.02–300, contact ÷ member compliance 0.001–10, drops 0.02–3 m,
70 % with an elastic–perfectly plastic contact) are run twice through the phase-exact
integrator :func:`droprig.solver.exacthistory.exact_time_history`: with the settings
the verdict uses (``pointhistory.TH_OPTIONS``) and refined (80 modes, a cut-off of 32
× the contact frequency, 16 samples per period, 64 sections). Each phase is solved in
closed form, so the difference is the modal truncation and the sampling of the peaks
in time and along the member. Prints, per peak (contact force, member moment, shear,
deflection), the largest refined ÷ verdict-setting ratio — the verdict's run may read
low by at most that — and the margin it implies (largest ratio + 5 %, rounded up to
5 %).

Run: ``nice .venv/bin/python scripts/convergence_point_history.py [N] [SEED]``.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))
sys.path.insert(0, str(Path(__file__).resolve().parent))

from calibrate_contact_bound import random_cases

from droprig.solver import exacthistory, pointhistory

REFINED = {"n_modes": 80, "cutoff": 32.0, "samples_per_period": 16, "sections": 64}
"""The refined run (modes, cut-off and time step each several times the verdict's)."""

QUANTITIES = ("force", "moment", "shear", "deflection")


def study(n: int, seed: int) -> dict[str, float]:
    """Largest refined ÷ verdict-setting peak per quantity over ``n`` random cases."""
    rng = np.random.default_rng(seed)
    c = random_cases(rng, n)
    args = (c["cond"], c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    kw = {"F_yield": c["F_y"], "stroke": c["s_y"]}
    base = exacthistory.exact_time_history(*args, **kw, **pointhistory.TH_OPTIONS)
    ref = exacthistory.exact_time_history(*args, **kw, **REFINED)
    out = {}
    for q in QUANTITIES:
        b, r = getattr(base, q), getattr(ref, q)
        out[q] = float(np.max(r / b))
        out[q + " median"] = float(np.median(r / b))
    return out


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 240
    seed = int(sys.argv[2]) if len(sys.argv) > 2 else 20261203
    worst = study(n, seed)
    for q, v in worst.items():
        print(f"{q:17s} refined ÷ verdict run: {v:.3f}")
    m = max(v for q, v in worst.items() if "median" not in q) + 0.05
    print(f"margin: {math.ceil(m * 20.0 - 1e-9) / 20.0:.2f}")


if __name__ == "__main__":
    main()
