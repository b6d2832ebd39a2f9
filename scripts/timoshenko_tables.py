"""The amplification tables (calibrated on Euler–Bernoulli time histories) against the
Timoshenko member's time history on random members: the check of
tests/solver/test_amplification.py (the table's demand — the factor times the energy
method, the force capped by the rigid-base bound — never below the verdict's time
history), with real rolled sections so that the member has a web (κGA_v, ρI:
:func:`droprig.solver.pointhistory.timoshenko_terms`), the member's mass per length
its steel times 1–8 (a deck over its tributary width), positions, mass ratios,
contact ratios and drops drawn as the test draws them. Prints, per end condition and
quantity, the least and largest demand ÷ history for the Euler–Bernoulli and the
Timoshenko member (< 1: the table reads below that history).
Run: ``PYTHONPATH=. .venv/bin/python scripts/timoshenko_tables.py [N_PER_COND] [SEED]``.
"""

from __future__ import annotations

import math
import sys

import numpy as np

from droprig.io.sections import get_grade, get_section
from droprig.solver import amplification, beam, exacthistory, impact, pointhistory, timehistory

SECTIONS = ("IPE 200", "IPE 300", "IPE 400", "IPE 600", "HEB 200", "HEB 300", "W8X31",
            "W12X26", "W16X26", "W14X90", "W21X44", "W24X55")
CONDS = ("simple", "fixed", "propped", "cantilever")
QUANT = ("force", "moment", "shear", "deflection")


def cases(rng: np.random.Generator, n: int, cond: str) -> dict[str, np.ndarray]:
    gr = get_grade("A992")
    secs = [get_section(SECTIONS[int(i)]) for i in rng.integers(len(SECTIONS), size=n)]
    L = rng.uniform(2.0, 15.0, n)
    EI = np.array([gr.E * s.Ix for s in secs])
    mu = np.array([s.mass_per_length for s in secs]) * rng.uniform(1.0, 8.0, n)
    terms = np.array([pointhistory.timoshenko_terms(s, gr) for s in secs])
    a = L * (rng.uniform(0.02, 1.0, n) if cond == "cantilever"
             else rng.uniform(0.003, 0.997, n))
    r = np.exp(rng.uniform(math.log(0.02), math.log(300.0), n))
    kappa = np.exp(rng.uniform(math.log(0.001), math.log(10.0), n))
    h = np.exp(rng.uniform(math.log(0.02), math.log(3.0), n))
    m_e = beam.rayleigh_mass_factor(cond, L, a) * mu * L
    f_s = beam.green(cond, L, EI, a, a)
    return {"L": L, "EI": EI, "mu": mu, "a": a, "M": r * m_e, "h": h, "f_c": kappa * f_s,
            "f_s": f_s, "m_e": m_e, "kGA": terms[:, 0], "rhoI": terms[:, 1], "r": r,
            "kappa": kappa}


def main(argv: list[str]) -> None:
    n = int(argv[0]) if argv else 50
    rng = np.random.default_rng(int(argv[1]) if len(argv) > 1 else 20261205)
    print("| end | quantity | EB: least | EB: largest | Timoshenko: least | "
          "Timoshenko: largest | T ÷ EB history (range) |")
    print("|---|---|---|---|---|---|---|")
    for cond in CONDS:
        c = cases(rng, n, cond)
        args = (cond, c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
        eb = exacthistory.exact_time_history(*args, **pointhistory.TH_OPTIONS)
        ti = exacthistory.exact_time_history(*args, kGA=c["kGA"], rhoI=c["rhoI"],
                                             **pointhistory.TH_OPTIONS)
        e = timehistory.energy_method_peaks(*args, struck_mass=True, scaled_mass=True)
        amp = amplification.amplification(c["M"], c["m_e"], c["f_c"], c["f_s"],
                                          struck_mass=True, cond=cond, xi=c["a"] / c["L"])
        bound = amplification.contact_force_bound(c["M"] * impact.G, c["h"], c["f_c"])
        for q in QUANT:
            demand = getattr(amp, q) * getattr(e, q)
            if q == "force":
                demand = np.minimum(demand, bound)
            re, rt = demand / getattr(eb, q), demand / getattr(ti, q)
            tr = getattr(ti, q) / getattr(eb, q)
            print(f"| {cond} | {q} | {re.min():.2f} | {re.max():.2f} | {rt.min():.2f} | "
                  f"{rt.max():.2f} | {tr.min():.2f}–{tr.max():.2f} |", flush=True)
            bad = np.flatnonzero(rt < 1.0)
            for i in bad[:3]:
                print(f"|   below: L={c['L'][i]:.2f} a/L={c['a'][i] / c['L'][i]:.3f} "
                      f"r={c['r'][i]:.3g} κ={c['kappa'][i]:.3g} h={c['h'][i]:.2f} "
                      f"ratio {rt[i]:.3f} |||||||")


if __name__ == "__main__":
    main(sys.argv[1:])
