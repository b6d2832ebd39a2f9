"""Punching of the deck by a load close to, or over, a supporting beam.

Sources: EN 1992-1-1 §6.2.2(6) — a load applied within 0.5d ≤ a_v ≤ 2d of the edge
of a support contributes β = a_v/(2d) of itself to the shear force (applied here to
punching as to one-way shear, from memory); a load whose footprint reaches over the
support line goes into the steel by direct compression, where the slab cannot punch
around it (common practice, no source). d over the ribs of a composite deck:
EN 1994-1-1 §9.7.6 (from memory). The demo project is an invented scenario: it
supplies the geometry (beams every 2.5 m in x, girders every 9 m in y), never an
expected value.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, evaluate
from droprig.solver.chain import Demands, Impact
from droprig.solver.deck import BAR_DIAMETER

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def roof():
    return load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")


def test_share_of_the_force_that_punches_by_hand(roof):
    lv = roof.level(roof.lift_zones[0].level_id)
    dk = lv.deck
    d = dk.thickness - max(dk.rib_height, 0.0) - dk.cover - BAR_DIAMETER / 2
    a = 0.1  # a 0.1 × 0.1 m footprint: half-side 0.05 m
    load = replace(roof.lift_zones[0].loads[0], footprint_length=a, footprint_width=a)
    # beam line at x = 2.5 m, mid-way between the girders at y = 0 and 9 m (4.5 m off)
    a_v = np.array([-0.02, 0.25 * d, 0.5 * d, d, 1.5 * d, 2.0 * d, 3.0 * d])
    beta = np.array([0.0, 0.25, 0.25, 0.5, 0.75, 1.0, 1.0])
    xs = 2.5 + a / 2 + a_v
    ys = np.full(xs.size, 4.5)
    fm = analysis.build_floor(lv, roof.settings)
    geo = analysis.point_geometry(fm, roof, xs, ys)
    ch = evaluate.evaluate_chain(fm, roof, load, geo, landing="flat")
    got = ch[Demands].checks["deck_punching"]
    F = ch[Impact].F
    far = got.U[-1] / F[-1]  # 1/V_R: the same footprint, so the same resistance
    np.testing.assert_allclose(got.U / F, beta * far, rtol=1e-9, atol=1e-15)


def test_over_a_girder_line_no_punching(roof):
    # on the girder at y = 9 m, 1.25 m from the beams on either side: the footprint
    # bears on the girder
    lv = roof.level(roof.lift_zones[0].level_id)
    load = replace(roof.lift_zones[0].loads[0], footprint_length=0.3, footprint_width=0.3)
    fm = analysis.build_floor(lv, roof.settings)
    geo = analysis.point_geometry(fm, roof, np.array([3.75, 3.75]), np.array([9.0, 4.5]))
    ch = evaluate.evaluate_chain(fm, roof, load, geo, landing="flat")
    U = ch[Demands].checks["deck_punching"].U
    assert U[0] == 0.0
    assert U[1] > 0.0
