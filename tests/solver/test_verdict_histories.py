"""The points run through their own time history chosen by their verdicts (issue 12):
with the floors' point histories on, no bay's verdict may be set by a point left at
the bounds where its own history reads a lesser verdict
(``chain._with_verdict_histories``).

Sources:
* the time history itself is the phase-exact modal integrator
  (``droprig.solver.exacthistory``: Euler–Bernoulli modes, Blevins 1979 Table 8-1,
  each phase in closed form, Chopra 4th ed. §10–12), checked against scipy and
  Newmark in test_exact_history.py / test_point_history_cache.py;
* the expected verdict here is that of the same chain with EVERY point run through
  its own history (an independent run of the same model without any choice of
  points); the choice is a property of the implementation (no engineering source):
  the bounds lie above the history, so a point left at them may only read worse, and
  the choice must go on until no such point sets its group's verdict.

The demo project is an invented scenario, used as input only.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import chain
from droprig.solver.chain import BeyondYield, Checks, Drop, DynamicAmplification, run_chain
from droprig.solver.floor import build_floor
from droprig.solver.geometry import point_geometry

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "steel_erection_floor.droprig"


@pytest.fixture(scope="module")
def welder():
    """The steel demo with amplification on; its engine-driven welder at 42 points of
    bay 3-4/B-C (a 7 × 6 lattice, girder lines included), on a floor of its own."""
    p = load_project(DEMO)
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    zone = p.lift_zones[0]
    load = next(ld for ld in zone.loads if ld.name.startswith("Engine"))
    level = p.level(zone.level_id)
    fm = build_floor(level, p.settings)
    xl, yl = level.grid.x_lines, level.grid.y_lines
    xs, ys = np.meshgrid(np.linspace(xl[2], xl[3], 7), np.linspace(yl[1], yl[2], 6))
    geo = point_geometry(fm, p, xs.ravel(), ys.ravel())
    li = np.zeros(xs.size, dtype=np.int64)
    return fm, p, geo, (load,), li, zone.hoist_speed


def _run(w, every: bool):
    fm, p, geo, loads, li, v = w
    with pytest.MonkeyPatch.context() as mp, np.errstate(all="ignore"):
        mp.setattr(chain, "FLOOR_POINT_HISTORY", True)
        if every:  # no choice: every point through its own history
            mp.setattr(chain, "TH_NEAR_WORST", 0.0)
            mp.setattr(chain, "TH_PER_ROUND", 10 ** 9)
            mp.setattr(chain, "TH_VERDICT_ROUNDS", 0, raising=False)
        return run_chain(Drop(fm, p, geo, loads, li, True, v_hoist=v))


def _worst(c) -> tuple[int, float, int]:
    resp, U = c[BeyondYield].response, c[Checks].U
    sev = resp * 1e6 + np.minimum(np.where(np.isnan(U), 0.0, U), 1e5)
    i = int(np.argmax(sev))
    return int(resp[i]), float(U[i]), i


def test_the_bays_verdict_is_its_histories_not_a_bounds(welder) -> None:
    chosen, every = _run(welder, False), _run(welder, True)
    da = chosen[DynamicAmplification]
    assert every[DynamicAmplification].th.sum() > da.th.sum()  # a choice was made
    r_c, U_c, i = _worst(chosen)
    r_e, U_e, _ = _worst(every)
    # the verdict of the bay: the worst response and U of its points, as with every
    # point run (before the choice by verdicts: exceeds at a point left at its bounds
    # against plastic with its own history)
    assert r_c == r_e
    assert U_c == pytest.approx(U_e, rel=1e-6)
    # and the point that sets it ran through its own history
    assert bool(da.th[i])
