"""What the slab and superimposed dead load in the struck mass, with the two-mass
idealisation, would change on the demo projects (a measurement, not wired into the
chain): at every bay centre of every zone and for every load, the chain's energy
method today (steel-only Rayleigh mass, η = M/(M + mₑ)) beside

* mₑ with the slab: the Rayleigh mass of the path with the deck's self-weight and the
  level's superimposed dead load over each member's tributary width
  (``loadpath.build_frame(extra_mass=)``), referred to the framing point;
* the two-mass model (``struck_mass.two_mass_impact``: the load on the contact spring
  k_c = 1/(f_deck + f_load), the struck mass m₂ on the framing spring k₂ = 1/f_s):
  peak contact force F_c and framing force k₂·x₂.

Unprotected, uncapped points only (under a pad the chain takes η = 1; where the deck
crushes the force is the crushing bound). Prints a Markdown table.
Run: ``.venv/bin/python scripts/struck_mass_effect.py``.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import analysis, loadpath, struck_mass
from droprig.solver.chain import Compliance, Impact, LoadInputs, StruckMass
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.impact import G

DEMOS = ("rooftop_plant_swap", "steel_erection_floor", "two_level_rigging")


def slab_frame(fm):
    """The floor's load path with the slab and superimposed dead load in μ (kg/m)."""
    lv = fm.level
    q = lv.deck.self_weight_pressure + lv.superimposed_dead
    extra = q / G * loadpath.tributary_widths(fm.frame)
    return loadpath.build_frame(lv, include_member_mass=True, EI=fm.frame.EI,
                                extra_mass=extra)


def main() -> None:
    print("| demo | load | M kg | bays | mₑ steel kg | m₂ slab kg | F today kN "
          "| F_c two-mass kN | k₂x₂ two-mass kN | F_c/F | k₂x₂/F |")
    print("|---|---|---|---|---|---|---|---|---|---|---|")
    for name in DEMOS:
        p = load_project(demo_dir() / f"{name}.droprig")
        p = replace(p, settings=replace(p.settings, dynamic_amplification=False),
                    protection_areas=())
        for zone in p.lift_zones:
            lv = p.level(zone.level_id)
            fm = analysis.build_floor(lv, p.settings)
            gx, gy = np.asarray(lv.grid.x_lines), np.asarray(lv.grid.y_lines)
            xs, ys = np.meshgrid(0.5 * (gx[1:] + gx[:-1]),
                                 0.5 * (gy[1:] + gy[:-1]))
            xs, ys = xs.ravel(), ys.ravel()
            geo = analysis.point_geometry(fm, p, xs, ys)
            ok = geo.path.pair >= 0
            if not ok.any():
                continue
            geo = analysis.point_geometry(fm, p, xs[ok], ys[ok])
            m_slab = loadpath.evaluate(slab_frame(fm), xs[ok], ys[ok]).m_e
            for load in zone.loads:
                c = evaluate_chain(fm, p, load, geo)
                inp, comp, sm, imp = c[LoadInputs], c[Compliance], c[StruckMass], c[Impact]
                free = np.isfinite(imp.F) & (imp.F < imp.F_crush) & (inp.h > 0.0)
                if not free.any():
                    continue
                bend = np.where(comp.f_s > 0, (comp.f_s - comp.f_col) / comp.f_s, 0.0)
                m2 = m_slab * bend**2
                kc = 1.0 / (comp.f_deck + inp.f_load)
                k2 = 1.0 / comp.f_s
                v0 = np.sqrt(2.0 * G * inp.h)
                Fc, x2 = struck_mass.two_mass_impact(inp.M, v0, kc, m2, k2, n_time=4000)
                Fg = x2 * k2
                r_c, r_g = (Fc / imp.F)[free], (Fg / imp.F)[free]
                print(f"| {name} | {load.name} | {load.mass:.0f} | {int(free.sum())} | "
                      f"{np.median(sm.m_e[free]):.0f} | {np.median(m2[free]):.0f} | "
                      f"{np.median(imp.F[free]) / 1e3:.1f} | "
                      f"{np.median(Fc[free]) / 1e3:.1f} | {np.median(Fg[free]) / 1e3:.1f} | "
                      f"{r_c.min():.2f}–{r_c.max():.2f} | {r_g.min():.2f}–{r_g.max():.2f} |")
    print("\nmedians over the bay centres; ratios min–max. "
          f"g = {G} m/s²; {math.nan!r} never printed.")


if __name__ == "__main__":
    main()
