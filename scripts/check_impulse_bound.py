"""Study: the impulse bound (droprig.solver.amplification_impulse) against the exact
time history (droprig.solver.exacthistory) with the same modes kept (the stated
truncation: n_modes 40, cut-off 8 × the contact frequency) and a finer time step and
more sections (16 samples a period, 64 sections): bound ÷ history per quantity on
random members, light loads included (r = M/mₑ 1e-4 … 30, κ = f_c/f_s 0.001 … 3, a
third with a crushing contact). Usage: check_impulse_bound.py [N] [SEED]."""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from droprig.solver import amplification_impulse, beam, exacthistory, impact, pointhistory

CONDS = ("simple", "fixed", "propped", "cantilever")
CONVERGED = {**pointhistory.TH_OPTIONS, "samples_per_period": 16, "sections": 64}


def random_cases(rng: np.random.Generator, n: int, cond: str,
                 r_range: tuple[float, float] = (1e-4, 30.0)) -> dict[str, np.ndarray]:
    """``n`` random drops on members of end condition ``cond`` (SI arrays)."""
    L = rng.uniform(2.0, 15.0, n)
    EI = 2e11 * np.exp(rng.uniform(math.log(1e-6), math.log(1e-3), n))
    mu = np.exp(rng.uniform(math.log(10.0), math.log(300.0), n))
    a = L * (rng.uniform(0.02, 1.0, n) if cond == "cantilever"
             else rng.uniform(0.003, 0.997, n))
    r = np.exp(rng.uniform(math.log(r_range[0]), math.log(r_range[1]), n))
    kappa = np.exp(rng.uniform(math.log(1e-3), math.log(3.0), n))
    h = np.exp(rng.uniform(math.log(0.02), math.log(3.0), n))
    m_e = beam.rayleigh_mass_factor(cond, L, a) * mu * L
    f_s = beam.green(cond, L, EI, a, a)
    M = r * m_e
    W = M * impact.G
    crush = rng.random(n) < 0.33
    F_y = np.where(crush, W * np.exp(rng.uniform(math.log(3.0), math.log(300.0), n)), np.inf)
    stroke = np.where(crush, rng.uniform(0.002, 0.05, n), np.inf)
    return {"L": L, "EI": EI, "mu": mu, "a": a, "M": M, "h": h, "f_c": kappa * f_s,
            "F_yield": F_y, "stroke": stroke, "r": r, "kappa": kappa}


def ratios(cond: str, c: dict[str, np.ndarray], opts: dict | None = None,
           one_hump: bool = True) -> dict[str, np.ndarray]:
    """Bound ÷ converged history per quantity."""
    args = (cond, c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
    kw = {"F_yield": c["F_yield"], "stroke": c["stroke"]}
    b = amplification_impulse.impulse_peak_bounds(*args, **kw, one_hump=one_hump)
    t = exacthistory.exact_time_history(*args, **kw, **(opts or CONVERGED))
    return {q: b[q] / getattr(t, q) for q in ("force", "moment", "shear", "deflection")}


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 50
    rng = np.random.default_rng(int(sys.argv[2]) if len(sys.argv) > 2 else 20261205)
    for cond in CONDS:
        c = random_cases(rng, n, cond)
        rt = ratios(cond, c)
        light = c["r"] < 0.1
        for q, v in rt.items():
            print(f"{cond:10s} {q:10s} least {v.min():.3f} median {np.median(v):.2f} "
                  f"largest {v.max():.1f}  light(r<0.1) least {v[light].min():.3f} "
                  f"median {np.median(v[light]):.2f}")
        i = int(np.argmin(np.minimum.reduce(list(rt.values()))))
        print("   least at", {k: float(v[i]) for k, v in c.items()})


if __name__ == "__main__":
    main()
