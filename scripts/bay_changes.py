"""Per bay and load of the demo projects: response, worst U, allowable heights, the
height limit, allowable mass and advice, recorded to JSON and compared between two
recordings (verdict-class changes called out). An engineer's look at what a change
of the physics moves; invented demos, no expected values.

Run (from the tree to record):
``PYTHONPATH=. .venv/bin/python scripts/bay_changes.py record before.json``, then
``... compare before.json after.json``. ``record OUT --amplified`` records with the
project setting ``dynamic_amplification`` on, ``--floor-histories`` also with the
floors' point histories (``chain.FLOOR_POINT_HISTORY``, issue 12), ``--tilted`` with
the project setting ``tilted_landing`` on, ``--tilt-deg X`` with its design tilt
``design_tilt`` X degrees (``--tilted`` implied; the files' own, 5° by default, without).
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
FIELDS = ("response", "max_utilisation", "allowable_drop_height",
          "allowable_drop_height_plastic", "height_limit", "allowable_mass", "advice_kind")


def record(out: Path, amplified: bool = False, floor_histories: bool = False,
           tilted: bool = False, tilt_deg: float | None = None) -> None:
    import math
    from dataclasses import replace

    from droprig.io.project_file import load_project
    from droprig.solver import analysis, chain

    rows = {}
    chain.FLOOR_POINT_HISTORY = floor_histories
    for path in sorted((ROOT / "demo_projects").glob("*.droprig")):
        p = load_project(path)
        if amplified:
            p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
        if tilted or tilt_deg is not None:
            p = replace(p, settings=replace(p.settings, tilted_landing=True))
        if tilt_deg is not None:
            p = replace(p, settings=replace(p.settings, design_tilt=math.radians(tilt_deg)))
        for b in analysis.analyse(p).bays:
            rows[f"{path.stem}|{b.zone_id}|{b.bay_id}|{b.load_name}"] = {
                k: getattr(b, k) for k in FIELDS}
    out.write_text(json.dumps(rows, indent=0))


def _f(v: object) -> str:
    return "   —  " if v is None else f"{v:7.3f}" if isinstance(v, float) else str(v)


def compare(a_path: Path, b_path: Path) -> None:
    a, b = json.loads(a_path.read_text()), json.loads(b_path.read_text())
    n = 0
    for key, x in a.items():
        y = b.get(key)
        if y is None:
            print("only before:", key)
            continue
        if all(x[k] == y[k] or (isinstance(x[k], float) and isinstance(y[k], float)
                                and abs(x[k] - y[k]) <= 1e-9 * max(1.0, abs(x[k])))
               for k in FIELDS):
            continue
        n += 1
        flag = ("  <== VERDICT CLASS" if (x["response"], x["advice_kind"])
                != (y["response"], y["advice_kind"]) else "")
        print(key + ": " + "; ".join(f"{k} {_f(x[k])} -> {_f(y[k])}" for k in FIELDS
                                    if x[k] != y[k]) + flag)
    print(f"{n} of {len(a)} bay rows changed")


if __name__ == "__main__":
    if sys.argv[1:2] == ["record"]:
        record(Path(sys.argv[2]), amplified="--amplified" in sys.argv[3:],
               floor_histories="--floor-histories" in sys.argv[3:],
               tilted="--tilted" in sys.argv[3:],
               tilt_deg=(float(sys.argv[sys.argv.index("--tilt-deg") + 1])
                         if "--tilt-deg" in sys.argv[3:] else None))
    else:
        compare(Path(sys.argv[2]), Path(sys.argv[3]))
