"""Allowable masses of the random floors' loads with dynamic amplification on (the
floors of tests/permit_projects.random_project: invented, no expected values): per
floor and load, the least allowable mass over its bays, and the medians by load mass.
What the issue-12 amplification reads for light items, before and after a change of
the time history (run it from each tree).
Run: ``PYTHONPATH=. .venv/bin/python scripts/light_item_masses.py [N_FLOORS] [SEED0]``
(from the tree's root: it reads tests/permit_projects.py).
"""

from __future__ import annotations

import statistics
import sys
from dataclasses import replace

from droprig.solver import analyse
from tests.permit_projects import random_project


def main(argv: list[str]) -> None:
    n = int(argv[0]) if argv else 10
    seed0 = int(argv[1]) if len(argv) > 1 else 1
    rows: list[tuple[float, float]] = []
    for seed in range(seed0, seed0 + n):
        p = random_project(seed)
        p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
        res = analyse(p)
        least: dict[str, float] = {}
        mass = {ld.name: ld.mass for z in p.lift_zones for ld in z.loads}
        for b in res.bays:
            if b.allowable_mass is not None:
                least[b.load_name] = min(least.get(b.load_name, float("inf")),
                                         float(b.allowable_mass))
        for name, m_allow in least.items():
            rows.append((float(mass[name]), m_allow))
            print(f"floor {seed:3d}  {name:8s} {mass[name]:7.0f} kg  allowable "
                  f"{m_allow:9.3f} kg", flush=True)
    if rows:
        allow = [r[1] for r in rows]
        print(f"\n{len(rows)} loads: allowable mass {min(allow):.3g}–{max(allow):.3g} kg, "
              f"median {statistics.median(allow):.3g} kg")


if __name__ == "__main__":
    main(sys.argv[1:])
