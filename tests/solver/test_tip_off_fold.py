"""The floor analysis runs the rows whose only case is the tip-off over a pad's edge
(drop point off the pad, drop height above Δ) inside its ordinary run
(``Drop.tip_off`` NaN on the other rows, ``chain._folded_inputs``) instead of running
them twice and keeping the second run. Every number must be the one the two separate
runs give, merged as ``chain.merge_tip_off`` merges them (the plain reference, written
out here as the floor analysis did it before the fold).

Sources: a fast path compared with its plain reference on the same inputs
(DEVELOPERS.md, "Fast kernels beside plain formulas"; common practice, no source),
within 1e-12 relative: the fold reorders no arithmetic, each row's steps are its own.
The tip-off's physics is checked against its energy balance and a rigid-block history
in test_pad_edge.py. The demo project is an invented scenario.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import chain, evaluate
from droprig.solver.floor import floor_model
from droprig.solver.geometry import point_geometry, take_geo

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def rooftop_pad_edges():
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = p.lift_zones[0]
    fm = floor_model(p.level(zone.level_id), p.settings)
    # points on both sides of the pads' free edge at y = 9.3 m and across the deck
    xs, ys = np.meshgrid(np.linspace(1.0, 14.0, 9), np.linspace(7.0, 11.5, 10))
    geo = point_geometry(fm, p, xs.ravel(), ys.ravel())
    return p, zone, fm, geo


def _reference(fm, p, loads, geo, li, H):
    """The floor analysis's outputs as they were before the fold: the ordinary run at
    every point, the tip-off run at every point with Δ finite, merged."""
    drop = chain.Drop(fm, p, geo, loads, li, False, H)
    out = chain.outputs(chain.run_chain(drop))
    rows, delta, top, reach = chain.tip_off_case_rows(drop)
    sub = take_geo(geo, rows, steps=False)
    tip = chain.outputs(chain.run_chain(chain.Drop(
        fm, p, sub, loads, li[rows], False, None if H is None else H[rows], tip_off=delta)))
    merged = chain.merge_tip_off({k: v[rows] for k, v in out.items()}, tip, top, reach)
    for k, v in merged.items():
        out[k] = out[k].copy()
        out[k][rows] = v
    return out, rows, reach, np.asarray(geo.protection)[rows] < 0


@pytest.mark.parametrize("planned", [True, False], ids=["planned height", "trial heights"])
def test_folded_rows_are_the_two_runs_merged(rooftop_pad_edges, planned):
    p, zone, fm, geo = rooftop_pad_edges
    loads = tuple(zone.loads)
    n = geo.x.size
    li = np.arange(n) % len(loads)
    # trial heights from 0.2 m to 4 m: below and above the tip-off's Δ (~1 m)
    H = None if planned else np.linspace(0.2, 4.0, n)
    with np.errstate(all="ignore"):  # as evaluate.evaluate_case runs the chain
        ref, _rows, reach, off = _reference(fm, p, loads, geo, li, H)
        got = evaluate._outputs(fm, p, loads, geo, li, H)
    assert (reach & off).sum() >= 5 and (~off).sum() >= 5  # both kinds of row are here
    assert got.keys() == ref.keys()
    for k, a in ref.items():
        b = got[k]
        if a.dtype.kind == "f":
            np.testing.assert_allclose(b, a, rtol=1e-12, atol=0.0, equal_nan=True, err_msg=k)
        else:
            np.testing.assert_array_equal(b, a, err_msg=k)
