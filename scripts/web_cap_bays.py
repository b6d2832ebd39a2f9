"""Per bay and load of the demo projects with dynamic amplification on and the floors'
point histories (``chain.FLOOR_POINT_HISTORY``, issue 12): the response, the worst U,
the check and point that set it, and the allowable drop height — the figures behind
the web cap's measurement (issues 10/12, ``chain.web_contact_bound``). Invented demos,
no expected values. Run from the tree to measure (``PYTHONPATH=/work/main`` for main):
``PYTHONPATH=. .venv/bin/python scripts/web_cap_bays.py [--off]`` (``--off``: the
project's own settings, histories off). Prints a Markdown table and a count of the
bays by response.
"""

from __future__ import annotations

import sys
from collections import Counter
from dataclasses import replace
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def main(on: bool) -> None:
    from droprig.io.project_file import load_project
    from droprig.solver import analysis, chain

    chain.FLOOR_POINT_HISTORY = on
    count: Counter[str] = Counter()
    print("| demo | bay | load | response | U | check | member | point (m) | h_allow (m) |")
    print("|---|---|---|---|---|---|---|---|---|")
    for path in sorted((ROOT / "demo_projects").glob("*.droprig")):
        p = load_project(path)
        if on:
            p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
        for b in analysis.analyse(p).bays:
            count[b.response] += 1
            h = b.allowable_drop_height
            print(f"| {path.stem} | {b.bay_id} | {b.load_name} | {b.response} | "
                  f"{b.max_utilisation:.3f} | {b.utilisation_check} | {b.utilisation_member} | "
                  f"({b.utilisation_x:.3f}, {b.utilisation_y:.3f}) | "
                  f"{'—' if h is None else f'{h:.3f}'} |")
    print()
    print(", ".join(f"{k}: {v}" for k, v in sorted(count.items())))


if __name__ == "__main__":
    main(on="--off" not in sys.argv[1:])
