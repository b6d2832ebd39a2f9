"""``verify_point`` shows what the verdict used: with dynamic amplification on, the
factors of the chain's own amplification step at the point (droprig.solver.chain
``dynamic_amplification``), not factors the verification works out for itself.
A wiring check (the same numbers through two routes); the physics of the factors is
tested against outside sources in test_amplification*.py and test_point_history.py.
The demo project is an invented scenario used as input only."""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver.chain import DynamicAmplification, Impact
from droprig.solver.evaluate import evaluate_chain
from droprig.solver.floor import floor_model
from droprig.solver.geometry import point_geometry
from droprig.solver.verification import verify_point

DEMO = Path(__file__).resolve().parents[2] / "demo_projects" / "rooftop_plant_swap.droprig"


def test_verify_point_uses_the_chain_factors() -> None:
    p = load_project(DEMO)
    p = replace(p, settings=replace(p.settings, dynamic_amplification=True))
    zone = p.zone("MC1")
    load = next(ld for ld in zone.loads if ld.name == "AHU-3 (old, drained)")
    x, y = 7.5, 13.5
    pv = verify_point(p, "MC1", load.name, x, y)
    fm = floor_model(p.level(zone.level_id), p.settings)
    c = evaluate_chain(fm, p, load, point_geometry(fm, p, np.array([x]), np.array([y])),
                       detail=True)
    da, F = c[DynamicAmplification], float(c[Impact].F[0])
    v = pv.verification
    want = {"force": da.A_force[0], "moment": da.A_moment[0], "shear": da.A_shear[0],
            "deflection": da.A_deflection[0]}
    for q, A in want.items():
        assert v.amplification[q] == pytest.approx(float(A), rel=1e-12)
        assert v.verdict is not None
        assert v.verdict[q] == pytest.approx(float(A) * v.energy[q], rel=1e-12)
    # the energy-method force shown is the chain's at the point
    assert v.energy["force"] == pytest.approx(F, rel=1e-9)
