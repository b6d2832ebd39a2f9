"""The end-shear spike of a struck member through a real end connection (issue 12).

On random simply supported rolled members (sections and ranges as
``scripts/timoshenko_tables.py`` draws them; light items r = M/mₑ 0.005–1, contacts
κ = f_c/f_s 1e-3–0.3, falls 0.05–3 m, the struck point 0.05–0.5 L), the independent
Timoshenko model (``tests/solver/connection_reference``: the member on end springs)
gives the peak connection force k·|u| as the connection's stiffness k goes from
rigid (the pinned Timoshenko beam's end reaction,
``tests/solver/timoshenko_reference``) to 10×, 3× and 1× the stated default
(:func:`droprig.solver.amplification_connection.default_connection_stiffness`).
Printed per case and summarised: the ratios to the rigid end reaction, the
connection force bound √(2·k·E) over the history (≥ 1 expected), the energy
method's end shear over it, the pulse's length against the connection's time
constant Z/k, and the allowable masses each end-shear rule would give.
Run: ``PYTHONPATH=. .venv/bin/python scripts/connection_end_shear.py [N] [SEED]``;
``--masses [N] [SEED]`` prints the allowable masses instead.
"""

from __future__ import annotations

import math
import sys

import numpy as np

from droprig.io.sections import get_grade, get_section
from droprig.solver import amplification, beam, impact, pointhistory, timehistory
from droprig.solver import amplification_connection as ac
from tests.solver.connection_reference import connection_drop
from tests.solver.test_end_shear_dynamic import verdict_end_shear
from tests.solver.timoshenko_reference import timoshenko_drop

SECTIONS = ("IPE 200", "IPE 300", "IPE 400", "IPE 600", "HEB 200", "HEB 300", "W8X31",
            "W12X26", "W16X26", "W14X90", "W21X44", "W24X55")
MULTIPLES = (10.0, 3.0, 1.0)


def case(rng: np.random.Generator) -> dict[str, float | str]:
    """One random simply supported member struck by a light item (SI)."""
    name = SECTIONS[int(rng.integers(len(SECTIONS)))]
    s, gr = get_section(name), get_grade("A992")
    L = float(rng.uniform(2.0, 12.0))
    mu = s.mass_per_length * float(rng.uniform(1.0, 8.0))
    kGA, rhoI = pointhistory.timoshenko_terms(s, gr)
    a = L * float(rng.uniform(0.05, 0.5))
    EI = gr.E * s.Ix
    m_e = float(beam.rayleigh_mass_factor("simple", L, a)) * mu * L
    f_s = float(beam.green("simple", L, EI, a, a))
    r = math.exp(rng.uniform(math.log(0.005), math.log(1.0)))
    kap = math.exp(rng.uniform(math.log(1e-3), math.log(0.3)))
    h = math.exp(rng.uniform(math.log(0.05), math.log(3.0)))
    k_def = float(ac.default_connection_stiffness(s.d, s.tf, s.tw, gr.fu, s.r))
    return {"name": name, "L": L, "EI": EI, "mu": mu, "kGA": kGA, "rhoI": rhoI, "a": a,
            "M": r * m_e, "h": h, "f_c": kap * f_s, "f_s": f_s, "k_def": k_def,
            "V_pl": 0.6 * gr.section_fy(s) * s.d * s.tw}


def drop_energy(c: dict, k: float) -> float:
    """E = W·(h + s) (J) with the member's compliance at the point including both
    connections' (the struck point moves (1 − ξ)·u₀ + ξ·u_L)."""
    xi = c["a"] / c["L"]
    f_s = c["f_s"] + ((1 - xi) ** 2 + xi**2) / k
    W = c["M"] * impact.G
    F_E = float(amplification.member_energy_force(W, c["h"], f_s, c["f_c"]))
    return 0.5 * F_E**2 * f_s


def main(argv: list[str]) -> None:
    n = int(argv[0]) if argv else 24
    rng = np.random.default_rng(int(argv[1]) if len(argv) > 1 else 20261205)
    print("| section | L m | a/L | M kg | h m | κ | pulse ms | Z/k ms | V_rigid kN | "
          + " | ".join(f"{m:g}k ÷ rigid" for m in MULTIPLES)
          + " | √(2kE) ÷ V_k | energy method ÷ V_k | verdict ÷ V_k |")
    print("|" + "---|" * (12 + len(MULTIPLES)))
    rows = []
    for _ in range(n):
        c = case(rng)
        args = (c["L"], c["EI"], c["mu"], c["kGA"], c["rhoI"], c["a"], c["M"], c["h"],
                c["f_c"])
        rig = timoshenko_drop(*args, n_modes=40)
        Vk = {m: connection_drop(*args, m * c["k_def"], n_modes=40).connection
              for m in MULTIPLES}
        k = c["k_def"]
        bound = float(ac.connection_force_bound(k, drop_energy(c, k)))
        em = timehistory.energy_method_peaks("simple", c["L"], c["EI"], c["mu"], c["a"],
                                             c["M"], c["h"], c["f_c"], scaled_mass=True)
        V_em = float(em.shear)
        V_v = verdict_end_shear(c["L"], c["EI"], c["mu"], c["a"], c["M"], c["h"], c["f_c"])
        Z = float(ac.shear_impedance(c["kGA"], c["mu"]))
        pulse = math.pi * math.sqrt(c["M"] * c["f_c"]) * 1e3
        V1 = Vk[1.0]
        print(f"| {c['name']} | {c['L']:.2f} | {c['a'] / c['L']:.2f} | {c['M']:.2f} | "
              f"{c['h']:.2f} | {c['f_c'] / c['f_s']:.3g} | {pulse:.3f} | "
              f"{Z / k * 1e3:.3f} | {rig.reaction / 1e3:.1f} | "
              + " | ".join(f"{Vk[m] / rig.reaction:.2f}" for m in MULTIPLES)
              + f" | {bound / V1:.2f} | {V_em / V1:.2f} | {V_v / V1:.2f} |", flush=True)
        rows.append((Vk[1.0] / rig.reaction, bound / V1, V_em / V1, V_v / V1,
                     Vk[10.0] / rig.reaction, Vk[3.0] / rig.reaction))
    a = np.array(rows)
    print(f"\n{n} cases: 1k ÷ rigid {a[:, 0].min():.2f}–{a[:, 0].max():.2f} "
          f"(median {np.median(a[:, 0]):.2f}); 3k {a[:, 5].min():.2f}–{a[:, 5].max():.2f}; "
          f"10k {a[:, 4].min():.2f}–{a[:, 4].max():.2f}")
    print(f"√(2kE) ÷ V_k {a[:, 1].min():.2f}–{a[:, 1].max():.2f} "
          f"(median {np.median(a[:, 1]):.2f}); energy method ÷ V_k "
          f"{a[:, 2].min():.2f}–{a[:, 2].max():.2f}; verdict (amplified) ÷ V_k "
          f"{a[:, 3].min():.2f}–{a[:, 3].max():.2f} (median {np.median(a[:, 3]):.2f})")


def allowable_masses(n: int, seed: int, n_hist: int = 4) -> None:
    """Per random member (the same draw), the allowable mass from its drop height and
    contact (κ kept as f_c/f_s) with the end shear at the web's plastic resistance
    V = 0.6·F_y·d·t_w (AISC 360-16 G2.1, φ = 1): by the verdict's amplified end shear
    (amplification on), by √(2kE) at the default connection, and by the connection's
    own history (the independent model) — bisection in log M, 24 steps."""
    rng = np.random.default_rng(seed)
    print("| section | L m | h m | κ | V_pl kN | M_allow verdict kg | M_allow √(2kE) kg | "
          "M_allow history kg |")
    print("|---|---|---|---|---|---|---|---|")
    for i in range(n):
        c = case(rng)
        kap = c["f_c"] / c["f_s"]

        def allow(V_of_M, steps: int = 24, lo_kg: float = 1e-3, hi_kg: float = 1e5) -> float:
            lo, hi = math.log(lo_kg), math.log(hi_kg)
            for _ in range(steps):
                mid = 0.5 * (lo + hi)
                if V_of_M(math.exp(mid)) > c["V_pl"]:
                    hi = mid
                else:
                    lo = mid
            return math.exp(lo)

        def v_verdict(M: float) -> float:
            return verdict_end_shear(c["L"], c["EI"], c["mu"], c["a"], M, c["h"],
                                     kap * c["f_s"])

        def v_bound(M: float) -> float:
            cc = {**c, "M": M}
            return float(ac.connection_force_bound(c["k_def"], drop_energy(cc, c["k_def"])))

        def v_hist(M: float) -> float:
            return connection_drop(c["L"], c["EI"], c["mu"], c["kGA"], c["rhoI"], c["a"], M,
                                   c["h"], kap * c["f_s"], c["k_def"], n_modes=40).connection

        m_b = allow(v_bound)
        # the history never passes √(2kE): its allowable mass is at least m_b (10 steps
        # between m_b and 100·m_b, the first cases only: a heavy load's window is long)
        m_h = (f"{allow(v_hist, 10, m_b, 100.0 * m_b):.3g}" if i < n_hist else "–")
        print(f"| {c['name']} | {c['L']:.2f} | {c['h']:.2f} | {kap:.3g} | "
              f"{c['V_pl'] / 1e3:.0f} | {allow(v_verdict):.3g} | {m_b:.3g} | {m_h} |",
              flush=True)


if __name__ == "__main__":
    if "--masses" in sys.argv:
        args = [a for a in sys.argv[1:] if a != "--masses"]
        allowable_masses(int(args[0]) if args else 10,
                         int(args[1]) if len(args) > 1 else 20261205)
    else:
        main(sys.argv[1:])
