"""Member shear under a short elastic contact pulse, over the static shear of the
rigid-base contact-force bound: the study behind
:data:`droprig.solver.amplification.B_SHEAR_SHORT`.

Random members (the four end conditions, span 2–15 m, EI 0.2–200 MN·m², μ 10–300 kg/m,
any struck position with the ends' 0.3 % left out, drops 0.02–3 m) inside the
short-pulse domain of :func:`droprig.solver.amplification.short_pulse` (r = M/mₑ
0.001–1, κ = f_c/f_s 0.001–0.1, elastic contact) are run through the verdict's time
history (:func:`droprig.solver.exacthistory.exact_time_history` with
``pointhistory.TH_OPTIONS``) and, with ``--refined``, a refined one (80 modes, cut-off
32, 16 samples a period, 64 sections); simply supported steel members (EN 10365
sections, from memory) also through the Timoshenko beam of
``tests/solver/timoshenko_reference.py`` (shear waves at a finite speed). Printed: the
largest and least ratio

    ρ = time history's largest |shear| ÷ V_st(F_rigid)

(V_st the member's largest static shear under a point force at the struck point,
``beam.max_abs_shear``; F_rigid ``amplification.contact_force_bound``), and the
verdict's shear (``amplification.amplified_forces``) over the time history's.
Run: ``nice .venv/bin/python scripts/calibrate_short_pulse_shear.py [N] [SEED] [--refined]``.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from droprig.solver import amplification, beam, exacthistory, impact, pointhistory, timehistory

CONDS = ("simple", "fixed", "propped", "cantilever")
REFINED = {"n_modes": 80, "cutoff": 32.0, "samples_per_period": 16, "sections": 64}
SECTIONS = {  # A m², I m⁴, web area m² (EN 10365, from memory; κA = the web)
    "IPE 200": (28.5e-4, 1943e-8, 0.1836 * 0.0056),
    "IPE 300": (53.8e-4, 8356e-8, 0.2786 * 0.0071),
    "IPE 450": (98.8e-4, 33740e-8, 0.4208 * 0.0094),
    "HEB 300": (149.1e-4, 25170e-8, 0.262 * 0.011),
}
E_STEEL, G_STEEL, RHO = 210e9, 81e9, 7850.0


def random_short_cases(rng: np.random.Generator, n: int, cond: str
                       ) -> dict[str, np.ndarray]:
    """``n`` random drops on members of end condition ``cond`` inside the short-pulse
    domain (module docstring); SI arrays L, EI, mu, a, M, h, f_c, f_s, m_e."""
    L = rng.uniform(2.0, 15.0, n)
    EI = 2e11 * np.exp(rng.uniform(math.log(1e-6), math.log(1e-3), n))
    mu = np.exp(rng.uniform(math.log(10.0), math.log(300.0), n))
    a = L * (rng.uniform(0.02, 1.0, n) if cond == "cantilever"
             else rng.uniform(0.003, 0.997, n))
    r = np.exp(rng.uniform(math.log(1e-3), math.log(amplification.SHORT_PULSE_MASS_RATIO), n))
    kappa = np.exp(rng.uniform(math.log(amplification.KAPPA_MIN),
                               math.log(amplification.SHORT_PULSE_COMPLIANCE_RATIO), n))
    h = np.exp(rng.uniform(math.log(0.02), math.log(3.0), n))
    m_e = beam.rayleigh_mass_factor(cond, L, a) * mu * L
    f_s = beam.green(cond, L, EI, a, a)
    return {"L": L, "EI": EI, "mu": mu, "a": a, "M": r * m_e, "h": h, "f_c": kappa * f_s,
            "f_s": f_s, "m_e": m_e}


def verdict_shear(cond: str, c: dict[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray,
                                                               np.ndarray]:
    """The verdict's shear force (N, ``amplified_forces`` with an elastic contact and
    the chain's struck-mass rule), its largest static shear along the member (N) and
    V_st(F_rigid) (N), per case."""
    W = c["M"] * impact.G
    e = timehistory.energy_method_peaks(cond, c["L"], c["EI"], c["mu"], c["a"], c["M"],
                                        c["h"], c["f_c"], struck_mass=True,
                                        scaled_mass=True)
    amp = amplification.amplification(c["M"], c["m_e"], c["f_c"], c["f_s"], cond=cond,
                                      xi=c["a"] / c["L"])
    F_rigid = amplification.contact_force_bound(W, c["h"], c["f_c"])
    fo = amplification.amplified_forces(
        amp, e.force, e.force, F_rigid, np.inf, False,
        F_energy=amplification.member_energy_force(W, c["h"], c["f_s"], c["f_c"]))
    assert np.all(amplification.short_pulse(amp.mass_ratio, amp.compliance_ratio, F_rigid))
    v1 = beam.max_abs_shear(cond, c["L"], 1.0, c["a"])
    return fo.shear, fo.shear * v1, F_rigid * v1


def main() -> None:
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    n = int(args[0]) if args else 100
    rng = np.random.default_rng(int(args[1]) if len(args) > 1 else 20261204)
    refined = "--refined" in sys.argv
    print("| model | condition | cases | ρ least | ρ largest | verdict ÷ history least "
          "| largest |")
    print("|---|---|---|---|---|---|---|")
    for cond in CONDS:
        c = random_short_cases(rng, n, cond)
        _, V_verdict, V_rigid = verdict_shear(cond, c)
        args_ = (cond, c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
        runs = [("verdict's history", pointhistory.TH_OPTIONS)]
        if refined:
            runs.append(("refined history", REFINED))
        for name, opts in runs:
            t = exacthistory.exact_time_history(*args_, **opts)
            rho, ratio = t.shear / V_rigid, V_verdict / t.shear
            print(f"| {name} | {cond} | {n} | {rho.min():.2f} | {rho.max():.2f} "
                  f"| {ratio.min():.2f} | {ratio.max():.2f} |")
    timoshenko(rng, max(n // 10, 4))


def timoshenko(rng: np.random.Generator, n: int) -> None:
    """Simply supported steel members through the Timoshenko beam (module docstring)."""
    from tests.solver.timoshenko_reference import timoshenko_drop

    rho, ratio = [], []
    names = list(SECTIONS)
    for _ in range(n):
        A, I, Aw = SECTIONS[names[int(rng.integers(len(names)))]]
        L = float(rng.uniform(3.0, 9.0))
        a = L * float(rng.uniform(0.05, 0.5))
        EI, mu = E_STEEL * I, RHO * A
        f_s = float(beam.green("simple", L, EI, a, a))
        m_e = float(beam.rayleigh_mass_factor("simple", L, a)) * mu * L
        r = math.exp(rng.uniform(math.log(0.005), 0.0))
        kappa = math.exp(rng.uniform(math.log(amplification.KAPPA_MIN),
                                     math.log(amplification.SHORT_PULSE_COMPLIANCE_RATIO)))
        h = float(rng.uniform(0.3, 2.5))
        c = {k: np.array([v]) for k, v in (("L", L), ("EI", EI), ("mu", mu), ("a", a),
                                           ("M", r * m_e), ("h", h), ("f_c", kappa * f_s),
                                           ("f_s", f_s), ("m_e", m_e))}
        _, V_verdict, V_rigid = verdict_shear("simple", c)
        t = timoshenko_drop(L, EI, mu, G_STEEL * Aw, RHO * I, a, r * m_e, h, kappa * f_s,
                            n_modes=40)
        rho.append(t.reaction / float(V_rigid[0]))
        ratio.append(float(V_verdict[0]) / t.reaction)
    print(f"| Timoshenko end reaction | simple | {n} | {min(rho):.2f} | {max(rho):.2f} "
          f"| {min(ratio):.2f} | {max(ratio):.2f} |")


if __name__ == "__main__":
    main()
