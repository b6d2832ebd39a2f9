"""Verdict ÷ time history at the verified points of the demo projects (each bay's
governing point, :func:`droprig.solver.verification_table`), with dynamic
amplification off and on, and the struck member carrying the slab (the default) or
its steel alone: per demo and quantity the least and largest ratio of the verdict's
demand (the chain's force on the member's unit-load envelopes, times its factors
where amplification is on) to the point's time history (Timoshenko member,
:mod:`droprig.solver.exacthistory`). A ratio below 1 is a verdict below the
reference. Prints a Markdown table.
Run: ``PYTHONPATH=. .venv/bin/python scripts/verify_ratios.py [--steel-mass]
[--floor-histories]``; ``--floor-histories``: amplification on also with the floors'
point histories (``chain.FLOOR_POINT_HISTORY``, issue 12), a third row per demo.
"""

from __future__ import annotations

import sys
from dataclasses import replace

from droprig.commands.demo import demo_dir
from droprig.io.project_file import load_project
from droprig.solver import analyse, verification_table

DEMOS = ("rooftop_plant_swap", "steel_erection_floor", "two_level_rigging")
QUANTITIES = ("force", "moment", "shear", "deflection")


def ratios(name: str, amplified: bool, slab_mass: bool) -> dict[str, list[float]]:
    """Verdict ÷ time history at each verified point of demo ``name``, by quantity."""
    p = load_project(demo_dir() / f"{name}.droprig")
    p = replace(p, settings=replace(p.settings, dynamic_amplification=amplified))
    rows = verification_table(p, analyse(p), slab_mass=slab_mass)
    out: dict[str, list[float]] = {q: [] for q in QUANTITIES}
    for r in rows:
        v = r.verification
        for q in QUANTITIES:
            if v.time_history[q] > 0.0:
                out[q].append(v.verdict[q] / v.time_history[q])
    return out


def main(argv: list[str]) -> None:
    from droprig.solver import chain

    slab = "--steel-mass" not in argv
    modes = [(False, False), (True, False)]
    if "--floor-histories" in argv:
        modes.append((True, True))
    print(f"mass: {'steel + slab + SDL (tributary)' if slab else 'steel alone'}\n")
    print("| demo | amplification | points | force | moment | shear | deflection |")
    print("|---|---|---|---|---|---|---|")
    for name in DEMOS:
        for amp, hist in modes:
            chain.FLOOR_POINT_HISTORY = hist
            try:
                r = ratios(name, amp, slab)
            finally:
                chain.FLOOR_POINT_HISTORY = False
            cells = [f"{min(v):.3f}–{max(v):.3f}" if v else "–" for v in r.values()]
            label = "on + floor histories" if hist else "on" if amp else "off"
            print(f"| {name} | {label} | {len(r['force'])} | " + " | ".join(cells) + " |",
                  flush=True)


if __name__ == "__main__":
    main(sys.argv[1:])
