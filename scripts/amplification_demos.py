"""Per bay and load of the demo projects: the worst utilisation with the energy method
alone (setting ``dynamic_amplification`` off) and with dynamic amplification on, the
check whose U it is, the outcome and the height limit offered, and at the point of
the worst U with amplification on: the factors of member moment and shear, what set
them (:data:`droprig.solver.amplification.SET_BY`), the mass ratio r = M/mₑ, the
compliance ratio κ, and the point's own time history
(:func:`droprig.solver.pointhistory.point_history`, the struck member with the rest
of the path as a spring; its peaks without the margin) over the verdict's demand of
the struck member — contact force, moment, shear (≤ 1: the verdict lies above it).
Prints a Markdown table (the README's "Dynamic amplification").
Run: ``.venv/bin/python scripts/amplification_demos.py [--two-forces]``.
"""

from __future__ import annotations

import sys
from dataclasses import replace

import numpy as np

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import amplification, analysis, chain, pointhistory
from droprig.solver.chain import DynamicAmplification, Impact
from droprig.solver.evaluate import evaluate_chain

DEMOS = ("rooftop_plant_swap", "steel_erection_floor", "two_level_rigging")


def _with(p, on: bool):
    return replace(p, settings=replace(p.settings, dynamic_amplification=on))


def _h(v: float | None) -> str:
    return "–" if v is None else f"{v:.2f}"


def _at_point(p, bay) -> dict[str, float | str]:
    """Factors, what set them and time history ÷ verdict at the bay's point of worst U."""
    zone = next(z for z in p.lift_zones if z.id == bay.zone_id)
    load = next(ld for ld in zone.loads if ld.name == bay.load_name)
    fm = analysis.build_floor(p.level(bay.level_id), p.settings)
    x = np.array([bay.utilisation_x if bay.utilisation_x is not None else bay.governing_x])
    y = np.array([bay.utilisation_y if bay.utilisation_y is not None else bay.governing_y])
    geo = analysis.point_geometry(fm, p, x, y)
    ch = evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)
    amp = ch[DynamicAmplification]
    F = ch[Impact].F
    out: dict[str, float | str] = {
        "A_M": float(amp.A_moment[0]), "A_V": float(amp.A_shear[0]),
        "by_M": amplification.SET_BY[int(amp.set_by["moment"][0])],
        "by_V": amplification.SET_BY[int(amp.set_by["shear"][0])],
        "r": float(amp.mass_ratio[0]), "k": float(amp.compliance_ratio[0])}
    if geo.path.pair[0] < 0 or not np.isfinite(F[0]) or F[0] <= 0.0:
        return {**out, "th_F": float("nan"), "th_M": float("nan"), "th_V": float("nan")}
    h = chain.energy_fall(ch, ch[chain.LoadInputs].h)
    ph = pointhistory.point_history(ch, np.array([0]), h[:1], F[:1])
    for key, q, A in (("th_F", "force", amp.A_force), ("th_M", "moment", amp.A_moment),
                      ("th_V", "shear", amp.A_shear)):
        out[key] = float(ph.th[q][0] / (A[0] * ph.energy[q][0]))
    return out


def main() -> None:
    if "--two-forces" in sys.argv:
        chain.TWO_FORCES = True
    print("| demo | bay | load | U off | U on | check on | outcome off → on "
          "| height limit off → on (m) | A_M (set by) | A_V (set by) | r | κ "
          "| TH ÷ verdict F / M / V |")
    print("|---|---|---|---|---|---|---|---|---|---|---|---|---|")
    for name in DEMOS:
        p = load_project(demo_dir() / f"{name}.droprig")
        r0 = analysis.analyse(_with(p, False))
        p1 = _with(p, True)
        r1 = analysis.analyse(p1)
        for b0, b1 in zip(r0.bays, r1.bays, strict=True):
            assert (b0.bay_id, b0.load_name) == (b1.bay_id, b1.load_name)
            a = _at_point(p1, b1)
            print(f"| {name} | {b1.bay_id} | {b1.load_name} "
                  f"| {b0.max_utilisation:.3g} | {b1.max_utilisation:.3g} "
                  f"| {b1.utilisation_check} | {b0.response} → {b1.response} "
                  f"| {_h(b0.height_limit)} → {_h(b1.height_limit)} "
                  f"| {a['A_M']:.3g} ({a['by_M']}) | {a['A_V']:.3g} ({a['by_V']}) "
                  f"| {a['r']:.3g} | {a['k']:.3g} "
                  f"| {a['th_F']:.2f} / {a['th_M']:.2f} / {a['th_V']:.2f} |")


if __name__ == "__main__":
    main()
