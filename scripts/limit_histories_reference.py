"""The reference for the limits taken from the points' own time histories (issue 12,
stop 33): every bay row of the demo projects with dynamic amplification and the
floors' point histories on, as the analysis chooses its points
(``chain.FLOOR_POINT_HISTORY``), against the same with EVERY eligible point of the
analysis and of every confirmation trial run through its own history (no choice:
``chain.TH_NEAR_WORST`` 0, ``TH_PER_ROUND`` unbounded, ``TRIAL_POINT_HISTORY`` on).
Slow (minutes): a script, not a test. Invented demos, no expected values.

    PYTHONPATH=. python scripts/limit_histories_reference.py record OUT.json [--every]
    PYTHONPATH=. python scripts/limit_histories_reference.py compare CHOSEN.json EVERY.json

``record`` writes each row's response, worst U, allowable heights (elastic, plastic),
height limit, allowable mass and advice, and the CPU seconds of each demo's
``analyse()`` (one cold run, the process's CPU time). ``compare`` prints, per row, the
chosen run's limits over the every-point run's (a ratio above 1 is a limit above what
every point's own history allows: flagged UNSAFE) and the verdict classes that differ.
"""

from __future__ import annotations

import json
import sys
import time
from dataclasses import replace
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
FIELDS = ("response", "max_utilisation", "allowable_drop_height",
          "allowable_drop_height_plastic", "height_limit", "allowable_mass", "advice_kind")
LIMITS = ("allowable_drop_height", "allowable_drop_height_plastic", "height_limit",
          "allowable_mass")


def record(out: Path, every: bool) -> None:
    from droprig.io.project_file import load_project
    from droprig.solver import analysis, chain

    chain.FLOOR_POINT_HISTORY = True
    if every:
        chain.TH_NEAR_WORST = 0.0
        chain.TH_PER_ROUND = 10 ** 9
        chain.TRIAL_POINT_HISTORY = True
    rows: dict[str, object] = {}
    cpu: dict[str, float] = {}
    for path in sorted((ROOT / "demo_projects").glob("*.droprig")):
        p = load_project(path)
        p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
        t = time.process_time()
        res = analysis.analyse(p)
        cpu[path.stem] = time.process_time() - t
        print(f"{path.stem}: {cpu[path.stem]:.1f} CPU s", flush=True)
        for b in res.bays:
            rows[f"{path.stem}|{b.zone_id}|{b.bay_id}|{b.load_name}"] = {
                k: getattr(b, k) for k in FIELDS}
    out.write_text(json.dumps({"rows": rows, "cpu": cpu}, indent=0))


def _ratio(a: object, b: object) -> str:
    if a is None and b is None:
        return "  both none"
    if a is None or b is None:
        return f"  {a} / {b}"
    r = float(a) / float(b) if float(b) else float("inf")
    return f"{r:7.3f}" + ("  UNSAFE" if r > 1.0 + 1e-6 else "")


def compare(a_path: Path, b_path: Path) -> None:
    a, b = json.loads(a_path.read_text()), json.loads(b_path.read_text())
    print("CPU s:", {k: (round(a["cpu"][k], 1), round(b["cpu"].get(k, float("nan")), 1))
                     for k in a["cpu"]})
    classes = 0
    unsafe = 0
    ratios: list[float] = []
    for key, x in a["rows"].items():
        y = b["rows"].get(key)
        if y is None:
            print("only in the first:", key)
            continue
        if (x["response"], x["advice_kind"]) != (y["response"], y["advice_kind"]):
            classes += 1
            print(f"{key}: CLASS {x['response']}/{x['advice_kind']} vs "
                  f"{y['response']}/{y['advice_kind']}")
        parts = []
        for k in LIMITS:
            parts.append(f"{k[:26]} {_ratio(x[k], y[k])}")
            if x[k] is not None and y[k] is not None and float(y[k]) > 0.0:
                r = float(x[k]) / float(y[k])
                ratios.append(r)
                unsafe += r > 1.0 + 1e-6
        print(f"{key}: " + "; ".join(parts))
    print(f"{len(a['rows'])} rows; {classes} verdict classes differ; {unsafe} limits above "
          f"the every-point run's; ratios min {min(ratios, default=float('nan')):.3f} "
          f"max {max(ratios, default=float('nan')):.3f}")


if __name__ == "__main__":
    if sys.argv[1:2] == ["record"]:
        record(Path(sys.argv[2]), every="--every" in sys.argv[3:])
    else:
        compare(Path(sys.argv[2]), Path(sys.argv[3]))
