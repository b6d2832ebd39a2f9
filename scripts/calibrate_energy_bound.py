"""Calibrate the member response per unit member energy force (droprig's energy bound).

However stiff the contact, the drop cannot put more energy into the member than the
load brings and the weight does over its travel; :func:`droprig.solver.amplification.
member_energy_force` turns that energy into the static force at the struck point that
stores it, F_E. This script runs random members (the ranges of
``calibrate_contact_bound.py``, 70 % with an elastic–perfectly plastic contact, a third
of those with a finite stroke) with contacts from κ = f_c/f_s = 1e-4 (a steel item on a
concrete deck over a girder) to 10 through :func:`droprig.solver.timehistory.
time_history_batched` and prints the largest ratios

    B_E,X = peak X of the time history ÷ (F_E × X per unit force)

for X = member moment and deflection (unit-load envelopes, AISC Manual Table 3-23 via
:mod:`droprig.solver.beam`) by cells of r = M/mₑ and κ, and the same for the member's
end shear (the support reactions) and its largest section shear, which are not
bounded this way (they grow as the contact stiffens: an Euler–Bernoulli member passes
a contact spike to its supports through its higher modes). The constants
``B_ENERGY_MOMENT`` and ``B_ENERGY_DEFLECTION`` in ``droprig/solver/amplification.py``
are the maxima times 1.15; ``tests/solver/test_amplification_energy.py`` re-checks them
on other random cases. Seed 11, 400 cases (≈ 70 s CPU).
Run: ``nice .venv/bin/python scripts/calibrate_energy_bound.py [N] [SEED]``.
"""

from __future__ import annotations

import math
import sys

import numpy as np
from calibrate_contact_bound import random_cases, unit_envelopes

from droprig.solver import amplification, impact, timehistory


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 400
    seed = int(sys.argv[2]) if len(sys.argv) > 2 else 11
    rng = np.random.default_rng(seed)
    c = random_cases(rng, n)
    kappa = np.exp(rng.uniform(math.log(1e-4), math.log(10.0), n))
    c["f_c"] = kappa * c["f_s"]
    t = timehistory.time_history_batched(c["cond"], c["L"], c["EI"], c["mu"], c["a"],
                                         c["M"], c["h"], c["f_c"], F_yield=c["F_y"],
                                         stroke=c["s_y"])
    m1, v1, d1 = unit_envelopes(c)
    W = c["M"] * impact.G
    F_E = amplification.member_energy_force(W, c["h"], c["f_s"], c["f_c"], c["F_y"],
                                            c["s_y"])
    r = c["M"] / c["m_e"]
    assert t.reaction is not None
    # at the struck point the energy bound is exact: δ(a) ≤ F_E·f_s
    for name, val, unit in (("moment", t.moment, m1), ("deflection", t.deflection, d1),
                            ("end shear", t.reaction, v1), ("section shear", t.shear, v1)):
        q = val / (F_E * unit)
        i = int(np.argmax(q))
        print(f"B_E {name}: max {q.max():.3f} (r {r[i]:.3g}, κ {kappa[i]:.3g}, "
              f"{c['cond'][i]}, a/L {c['a'][i] / c['L'][i]:.2f}), 99th percentile "
              f"{np.percentile(q, 99):.3f}")
        for lo, hi in ((0.0, 0.01), (0.01, 0.1), (0.1, 1.0), (1.0, math.inf)):
            s = (kappa >= lo) & (kappa < hi)
            if s.any():
                print(f"    κ {lo:g}–{hi:g}: max {q[s].max():.3f} ({int(s.sum())} cases)")


if __name__ == "__main__":
    main()
