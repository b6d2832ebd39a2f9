"""Per bay and load of the demo projects: verdict, worst U and allowable drop height
with one force per point (``chain.TWO_FORCES`` off) and with two (on, the default),
the governing check of each. An engineer's look at what the two-mass model changes.

Run: ``.venv/bin/python -m scripts.two_force_bay_changes [project.droprig ...]``
(default: every project in demo_projects/).
"""

from __future__ import annotations

import sys
from pathlib import Path

from droprig.io.project_file import load_project
from droprig.solver import analysis, chain

ROOT = Path(__file__).resolve().parents[1]


def _h(v: float | None) -> str:
    return "  —  " if v is None else f"{v * 1000:7.0f}"


def main(paths: list[Path]) -> None:
    was = chain.TWO_FORCES
    try:
        for path in paths:
            proj = load_project(path)
            res = {}
            for flag in (False, True):
                chain.TWO_FORCES = flag
                res[flag] = {(b.zone_id, b.bay_id, b.load_name): b
                             for b in analysis.analyse(proj).bays}
            print(f"\n== {path.stem}")
            print(f"{'bay':8} {'load':28} {'verdict one → two':24} {'U one → two':18} "
                  f"{'H_allow mm one → two':22} check (two)")
            for key, b1 in res[False].items():
                b2 = res[True][key]
                verdict = f"{b1.response} → {b2.response}"
                print(f"{key[1]:8} {key[2][:28]:28} {verdict:24} "
                      f"{b1.max_utilisation:6.2f} → {b2.max_utilisation:6.2f}   "
                      f"{_h(b1.allowable_drop_height)} → {_h(b2.allowable_drop_height)}   "
                      f"{b2.governing_check}")
    finally:
        chain.TWO_FORCES = was


if __name__ == "__main__":
    args = [Path(a) for a in sys.argv[1:]]
    main(args or sorted((ROOT / "demo_projects").glob("*.droprig")))
