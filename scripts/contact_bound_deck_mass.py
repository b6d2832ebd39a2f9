"""How much the deck's and the framing's mass can lower the contact-force bound of the
demos' light hard items (issue 12): at each bay's point of worst U with dynamic
amplification on (spreader beams, spreader bar, hook block), per point:

* the rigid-base force F_r = W·(1 + √(1 + 2h/(W·f_c))) on the contact springs f_c
  (the deck's indentation and strip, the load's underside; Gere 7th ed. §9.10,
  η = 1) — the amplification's bound is 1.05·F_r;
* the two-mass contact force (load M – contact spring k_c = 1/f_c – struck mass m –
  framing spring k_2 = 1/f_s; CEB Bulletin 187 two-mass model — from memory),
  unmargined (:func:`droprig.solver.struck_mass.two_mass_peaks`), with m the path's
  Rayleigh mass with the slab (the chain's ``m2``) and with m the slab alone over
  the footprint (the least mass that must move with the contact: the concrete
  between the load and the steel), and the same by ``scipy.integrate.solve_ivp``
  (independent integration, the slab-over-footprint case);
* the closed form of a free two-body collision through k_c (the framing spring
  neglected during the spike): v·√(k_c·μ_r), μ_r = M·m/(M + m) (centre-of-mass
  frame, ½μ_r·v² = F²/(2k_c); Goldsmith, *Impact*, 1960, ch. 1 — from memory).

Prints a Markdown table. Run: ``.venv/bin/python scripts/contact_bound_deck_mass.py``.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
from scipy.integrate import solve_ivp

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import analysis, chain, struck_mass
from droprig.solver.chain import Compliance, LoadInputs, StruckMass
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.impact import G

CASES = (("rooftop_plant_swap", ("Spreader",)), ("steel_erection_floor", ("Spreader",)),
         ("two_level_rigging", ("Spreader", "Hook")))


def two_mass_ivp(M: float, v0: float, kc: float, m: float, k2: float) -> float:
    """Peak contact force (N) of the two-mass model by solve_ivp (Radau, tight
    tolerances), x downward from first contact, gravity on the load, the contact
    spring compression-only, over three periods of the fast mode."""
    W = M * G

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        F = kc * max(y[0] - y[2], 0.0)
        return [y[1], G - F / M, y[3], (F - k2 * y[2]) / m]

    w_hi = np.sqrt(kc * (1.0 / M + 1.0 / m))
    t_end = 3.0 * 2.0 * np.pi / w_hi
    sol = solve_ivp(rhs, (0.0, t_end), [0.0, v0, 0.0, 0.0], method="DOP853",
                    rtol=1e-10, atol=1e-14, max_step=t_end / 2000.0)
    del W
    return float(np.max(kc * np.maximum(sol.y[0] - sol.y[2], 0.0)))


def main() -> None:
    print("| demo | bay | load | M kg | v m/s | f_c m/N | F_r MN | m2 kg | TM(m2) / F_r "
          "| m_slab kg | TM(m_slab) / F_r | ivp(m_slab) / F_r | closed form(m_slab) / F_r "
          "| U on |")
    print("|---|---|---|---|---|---|---|---|---|---|---|---|---|---|")
    for name, loads in CASES:
        p = load_project(demo_dir() / f"{name}.droprig")
        p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
        res = analysis.analyse(p)
        seen: set[tuple[str, float, float]] = set()
        for bay in res.bays:
            if not any(s in bay.load_name for s in loads):
                continue
            x, y = bay.utilisation_x, bay.utilisation_y
            assert x is not None and y is not None
            if (bay.load_name, x, y) in seen:
                continue
            seen.add((bay.load_name, x, y))
            zone = next(z for z in p.lift_zones if z.id == bay.zone_id)
            load = next(ld for ld in zone.loads if ld.name == bay.load_name)
            lv = p.level(bay.level_id)
            fm = analysis.build_floor(lv, p.settings)
            geo = analysis.point_geometry(fm, p, np.array([x]), np.array([y]))
            ch = evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)
            inp, comp, sm = ch[LoadInputs], ch[Compliance], ch[StruckMass]
            assert sm.m2 is not None
            M, W = float(inp.M[0]), float(inp.W[0])
            h = float(chain.energy_fall(ch, inp.h)[0])
            v = float(np.sqrt(2.0 * G * h))
            fc = float(comp.f_series[0])
            fs = float(comp.f_s[0])
            Fr = W * (1.0 + np.sqrt(1.0 + 2.0 * h / (W * fc)))
            m2 = float(sm.m2[0])
            m_slab = (lv.deck.thickness * lv.deck.concrete.density
                      * float(inp.foot_l[0] * inp.foot_w[0]))
            tm2 = struck_mass.two_mass_peaks(M, v, 1.0 / fc, m2, 1.0 / fs).F_contact
            tms = struck_mass.two_mass_peaks(M, v, 1.0 / fc, m_slab, 1.0 / fs).F_contact
            ivp = two_mass_ivp(M, v, 1.0 / fc, m_slab, 1.0 / fs)
            mu_r = M * m_slab / (M + m_slab)
            closed = v * np.sqrt(mu_r / fc)
            print(f"| {name} | {bay.bay_id} | {bay.load_name} | {M:.0f} | {v:.2f} "
                  f"| {fc:.3g} | {Fr / 1e6:.2f} | {m2:.0f} | {float(tm2) / Fr:.3f} "
                  f"| {m_slab:.0f} | {float(tms) / Fr:.3f} | {ivp / Fr:.3f} "
                  f"| {closed / Fr:.3f} | {bay.max_utilisation:.3g} |")


if __name__ == "__main__":
    main()
