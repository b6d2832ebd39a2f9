"""Calibrate the member response per unit peak contact force (droprig's crushing cap).

With the contact force bounded (by the crushing of the deck concrete under the
footprint, or of a crushable pad), the member demands are bounded by the member's
dynamic response to a push-only force pulse no larger than that bound. This script
runs random members (the ranges of ``calibrate_amplification.py``) through
:func:`droprig.solver.timehistory.time_history_batched`, 70 % of them with an
elastic–perfectly plastic contact (crushing force 0.05–3 × the energy method's force,
≥ 1.2 W; a third of those with a finite stroke), and prints the largest ratios

    B_X = peak X of the time history ÷ (peak contact force × X per unit force)

for X = member moment, shear and deflection (unit-load envelopes, AISC Manual Table
3-23 via :mod:`droprig.solver.beam`), and the largest crushed depth of the time
history ÷ the energy bound of :func:`droprig.solver.amplification.crush_depth_bound`.
The constants in ``droprig/solver/amplification.py`` are these maxima times a margin;
``tests/solver/test_amplification_capped.py`` re-checks them on other random cases.
Run: ``nice .venv/bin/python scripts/calibrate_contact_bound.py [N] [SEED]``.
"""

from __future__ import annotations

import math
import sys

import numpy as np

from droprig.solver import amplification, beam, impact, timehistory

CONDS = ("simple", "fixed", "propped", "cantilever")


def random_cases(rng: np.random.Generator, n: int, capped_share: float = 0.7
                 ) -> dict[str, np.ndarray]:
    """Random member drops (the calibration ranges), some with a capped contact."""
    rows = []
    for _ in range(n):
        cond = CONDS[int(rng.integers(4))]
        L = rng.uniform(2.0, 15.0)
        EI = 2e11 * math.exp(rng.uniform(math.log(1e-6), math.log(1e-3)))
        mu = math.exp(rng.uniform(math.log(10.0), math.log(300.0)))
        a = L * (rng.uniform(0.3, 1.0) if cond == "cantilever" else rng.uniform(0.08, 0.92))
        r = math.exp(rng.uniform(math.log(0.02), math.log(300.0)))
        kappa = math.exp(rng.uniform(math.log(0.001), math.log(10.0)))
        h = math.exp(rng.uniform(math.log(0.02), math.log(3.0)))
        f_s = float(beam.green(cond, L, EI, a, a))
        m_e = float(beam.rayleigh_mass_factor(cond, L, a)) * mu * L
        M, f_c = r * m_e, kappa * f_s
        W = M * impact.G
        F_el = float(timehistory.energy_method_peaks(cond, L, EI, mu, a, M, h, f_c).force)
        F_y, s_y = math.inf, math.inf
        if rng.uniform() < capped_share:
            F_y = max(1.2 * W, F_el * math.exp(rng.uniform(math.log(0.05), math.log(3.0))))
            if rng.uniform() < 1.0 / 3.0:
                s_y = math.exp(rng.uniform(math.log(1e-3), math.log(0.1)))
        rows.append((cond, L, EI, mu, a, M, h, f_c, F_y, s_y, f_s, m_e))
    cols = list(zip(*rows, strict=True))
    out = {"cond": np.array(cols[0], dtype=object)}
    for i, k in enumerate(("L", "EI", "mu", "a", "M", "h", "f_c", "F_y", "s_y", "f_s",
                           "m_e"), start=1):
        out[k] = np.array(cols[i], float)
    return out


def unit_envelopes(c: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Per case the largest |moment|, |shear| and deflection along the member per unit
    force at the struck point (N·m/N, N/N, m/N)."""
    xi = np.linspace(0.0, 1.0, 401)
    m1, v1, d1 = [], [], []
    for cond, L, EI, a in zip(c["cond"], c["L"], c["EI"], c["a"], strict=True):
        m1.append(float(beam.max_abs_moment(cond, L, 1.0, a)))
        v1.append(float(beam.max_abs_shear(cond, L, 1.0, a)))
        d1.append(max(float(np.max(beam.green(cond, L, EI, L * xi, a))),
                      float(beam.green(cond, L, EI, a, a))))
    return np.array(m1), np.array(v1), np.array(d1)


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 1000
    seed = int(sys.argv[2]) if len(sys.argv) > 2 else 1
    c = random_cases(np.random.default_rng(seed), n)
    t = timehistory.time_history_batched(c["cond"], c["L"], c["EI"], c["mu"], c["a"],
                                         c["M"], c["h"], c["f_c"], F_yield=c["F_y"],
                                         stroke=c["s_y"])
    m1, v1, d1 = unit_envelopes(c)
    capped = np.isfinite(c["F_y"])
    for name, val, unit in (("moment", t.moment, m1), ("shear", t.shear, v1),
                            ("deflection", t.deflection, d1)):
        ratio = val / (t.force * unit)
        print(f"B_{name}: max {ratio.max():.3f} (capped {ratio[capped].max():.3f}, "
              f"elastic {ratio[~capped].max():.3f}), 99th percentile "
              f"{np.percentile(ratio, 99):.3f}")
    W = c["M"] * impact.G
    cb = amplification.crush_depth_bound(W, c["h"], c["f_s"] + c["f_c"], c["F_y"])
    assert t.crush is not None
    sel = capped & (t.crush > 0.0)
    print(f"crushed depth ÷ energy bound: max {np.max(t.crush[sel] / cb[sel]):.3f} "
          f"over {int(sel.sum())} crushed cases")
    nb = capped & ~np.isfinite(c["s_y"])
    print(f"contact force ≤ F_yield where never bottomed: "
          f"{bool(np.all(t.force[nb] <= c['F_y'][nb] * (1 + 1e-9)))}")


if __name__ == "__main__":
    main()
