"""Per bay and load of the demo projects: the worst utilisation with the energy method
alone (setting ``dynamic_amplification`` off) and with dynamic amplification on, the
check that governs, and at the governing point what set the amplified force
(:data:`droprig.solver.amplification.SET_BY`), the mass ratio r = M/mₑ and the
compliance ratio κ. Prints a Markdown table (the README's "Dynamic amplification").
Run: ``.venv/bin/python scripts/amplification_demos.py``.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import amplification, analysis
from droprig.solver.chain import DynamicAmplification
from droprig.solver.evaluate import evaluate_chain

DEMOS = ("rooftop_plant_swap", "steel_erection_floor", "two_level_rigging")
_KEY = {"flexure": "moment", "shear": "shear", "connection": "shear"}


def _with(p, on: bool):
    return replace(p, settings=replace(p.settings, dynamic_amplification=on))


def _at_point(p, bay) -> tuple[str, float, float, float]:
    """What set the governing check's amplified force at the bay's worst point."""
    zone = next(z for z in p.lift_zones if z.id == bay.zone_id)
    load = next(ld for ld in zone.loads if ld.name == bay.load_name)
    fm = analysis.build_floor(p.level(bay.level_id), p.settings)
    x = np.array([bay.utilisation_x if bay.utilisation_x is not None else bay.governing_x])
    y = np.array([bay.utilisation_y if bay.utilisation_y is not None else bay.governing_y])
    geo = analysis.point_geometry(fm, p, x, y)
    ch = evaluate_chain(fm, p, load, geo)
    amp = ch[DynamicAmplification]
    key = _KEY.get(bay.utilisation_check or bay.governing_check, "local")
    return (amplification.SET_BY[int(amp.set_by[key][0])],
            float(amp.factor.get(bay.utilisation_check, amp.A_shear)[0]),
            float(amp.mass_ratio[0]), float(amp.compliance_ratio[0]))


def main() -> None:
    print("| demo | level / bay | load | U off | U on | check on | response off → on "
          "| factor | set by | r | κ |")
    print("|---|---|---|---|---|---|---|---|---|---|---|")
    for name in DEMOS:
        p = load_project(demo_dir() / f"{name}.droprig")
        r0 = analysis.analyse(_with(p, False))
        p1 = _with(p, True)
        r1 = analysis.analyse(p1)
        for b0, b1 in zip(r0.bays, r1.bays, strict=True):
            assert (b0.bay_id, b0.load_name) == (b1.bay_id, b1.load_name)
            by, A, r, k = _at_point(p1, b1)
            print(f"| {name} | {b1.level_id} / {b1.bay_id} | {b1.load_name} "
                  f"| {b0.max_utilisation:.3g} | {b1.max_utilisation:.3g} "
                  f"| {b1.utilisation_check or b1.governing_check} "
                  f"| {b0.response} → {b1.response} | {A:.3g} | {by} | {r:.3g} | {k:.3g} |")


if __name__ == "__main__":
    main()
