"""End shear of a struck member by three models, on random simply supported steel
members hit by light items: the Timoshenko beam (``tests/solver/timoshenko_reference``,
shear waves at a finite speed, the independent check), droprig's Euler–Bernoulli modal
time history (``timehistory.time_history``'s ``reaction``), and Biggs's SDOF dynamic
reaction (1964, Ch. 5, V = c_R·R + c_F·F with the coefficients derived from the static
shape, ``tests/solver/test_end_shear_dynamic.sdof_reactions``) at the Timoshenko run's
own peaks (its most: |c_R|·R_max + |c_F|·F_max); and the verdict's end shear
(``amplification.amplified_forces``, elastic contact, no crushing). Prints a Markdown
table of the ratios to the Timoshenko end reaction.

Sections (EN 10365, from memory; κA = the web): IPE 200, IPE 300, IPE 450, HEB 300.
Run: ``.venv/bin/python scripts/end_shear_models.py [cases] [seed]``.
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from droprig.solver import beam, timehistory
from tests.solver.test_end_shear_dynamic import sdof_reactions, verdict_end_shear
from tests.solver.timoshenko_reference import timoshenko_drop

SECTIONS = {  # A m², I m⁴, web area m²
    "IPE 200": (28.5e-4, 1943e-8, 0.1836 * 0.0056),
    "IPE 300": (53.8e-4, 8356e-8, 0.2786 * 0.0071),
    "IPE 450": (98.8e-4, 33740e-8, 0.4208 * 0.0094),
    "HEB 300": (149.1e-4, 25170e-8, 0.262 * 0.011),
}
E, G_MOD, RHO = 210e9, 81e9, 7850.0


def main() -> None:
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 12
    rng = np.random.default_rng(int(sys.argv[2]) if len(sys.argv) > 2 else 20261204)
    print("| section | L m | ξ | M kg | h m | κ | V_T kN | EB ÷ T | SDOF ÷ T | verdict ÷ T "
          "| V_T ÷ static V(F_T) |")
    print("|---|---|---|---|---|---|---|---|---|---|---|")
    names = list(SECTIONS)
    for _ in range(n):
        sec = names[rng.integers(len(names))]
        A, I, Aw = SECTIONS[sec]
        L = float(rng.uniform(3.0, 9.0))
        xi = float(rng.choice([0.5, 0.35, 0.2]))
        M = float(np.exp(rng.uniform(np.log(5.0), np.log(200.0))))
        h = float(rng.uniform(0.3, 2.5))
        a = xi * L
        EI, mu, kGA, rhoI = E * I, RHO * A, G_MOD * Aw, RHO * I
        f_s = float(beam.green("simple", L, EI, a, a))
        kappa = float(np.exp(rng.uniform(np.log(1e-3), np.log(0.3))))
        f_c = kappa * f_s
        t = timoshenko_drop(L, EI, mu, kGA, rhoI, a, M, h, f_c, n_modes=40)
        eb = timehistory.time_history("simple", L, EI, mu, a, M, h, f_c, n_modes=40)
        cR, cF = sdof_reactions("simple", L, a)
        R_max = t.deflection / f_s
        V_sdof = max(abs(cR[i]) * R_max + abs(cF[i]) * t.force for i in (0, 1))
        V_v = verdict_end_shear(L, EI, mu, a, M, h, f_c)
        V_stat = float(beam.max_abs_shear("simple", L, t.force, a))
        assert eb.reaction is not None
        print(f"| {sec} | {L:.2f} | {xi:.2f} | {M:.1f} | {h:.2f} | {kappa:.3g} "
              f"| {t.reaction / 1e3:.1f} | {float(eb.reaction[0]) / t.reaction:.2f} "
              f"| {V_sdof / t.reaction:.2f} | {V_v / t.reaction:.2f} "
              f"| {t.reaction / V_stat:.2f} |")


if __name__ == "__main__":
    main()
