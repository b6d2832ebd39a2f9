"""The concrete's crushing bound near a free edge: the distribution area of the
bearing pressure stays concentric with the loaded area and within the member.

Sources: EN 1992-1-1:2004 §6.7(2), Eq. (6.63) and Fig. 6.29 (the centre of A_c1 on
the line of action through the centre of A_c0; b2 ≤ 3·b1, h ≥ b2 − b1); ACI 318-19
§22.8.3.2 (A2 the lower base of the largest frustum wholly within the support,
geometrically similar and concentric, sides 1 vertical : 2 horizontal, √(A2/A1) ≤ 2).
The project is the invented rooftop demo.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.solver import analysis, crushing, footprint
from droprig.solver.chain import Impact, LoadInputs
from droprig.solver.evaluate import evaluate_chain

ROOT = Path(__file__).resolve().parents[2]


def test_distribution_area_stops_at_a_free_edge_en():
    # a 0.4 × 0.4 m plate on a 0.25 m slab, f_ck 30 MPa, no rate factor:
    # far from edges b2 = min(3·0.4, 0.4 + 0.25) = 0.65 m, ratio 0.65/0.4 = 1.625;
    # 0.05 m from a free edge b2 = 0.4 + 2·0.05 = 0.5 m, ratio 1.25; on the edge 1
    fm = 30e6 + 8e6
    far = crushing.concrete_bearing_pressure(30e6, 0.4, 0.4, 0.25, "en1993", dif=1.0)
    near = crushing.concrete_bearing_pressure(30e6, 0.4, 0.4, 0.25, "en1993", dif=1.0,
                                              margin=0.05)
    edge = crushing.concrete_bearing_pressure(30e6, 0.4, 0.4, 0.25, "en1993", dif=1.0,
                                              margin=0.0)
    assert float(far) == pytest.approx(fm * 1.625, rel=1e-12)
    assert float(near) == pytest.approx(fm * 1.25, rel=1e-12)
    assert float(edge) == pytest.approx(fm, rel=1e-12)


def test_distribution_area_stops_at_a_free_edge_aci():
    # ACI: A2 side = c + 4h = 0.4 + 0.4 = 0.8 m far away (√(A2/A1) = 2, the cap);
    # 0.1 m clear of an edge: 0.6 m, √(A2/A1) = 1.5
    q = 0.85 * (28e6 + 8.3e6)
    far = crushing.concrete_bearing_pressure(28e6, 0.4, 0.4, 0.1, "aisc360", dif=1.0)
    near = crushing.concrete_bearing_pressure(28e6, 0.4, 0.4, 0.1, "aisc360", dif=1.0,
                                              margin=0.1)
    assert float(far) == pytest.approx(q * 2.0, rel=1e-12)
    assert float(near) == pytest.approx(q * 1.5, rel=1e-12)


def test_bad_margin_is_refused():
    with pytest.raises(ValueError, match="margin"):
        crushing.concrete_bearing_pressure(30e6, 0.4, 0.4, 0.25, "en1993", margin=-0.1)
    with pytest.raises(ValueError, match="margin"):
        crushing.concrete_bearing_pressure(30e6, 0.4, 0.4, 0.25, "en1993", margin=math.nan)


def test_free_edge_margin_geometry():
    # plane geometry: deck 0–10 × 0–8 m, an opening 4–5 × 4–5 m; a 1.0 × 0.6 m area
    ext, op = (0.0, 0.0, 10.0, 8.0), ((4.0, 4.0, 5.0, 5.0),)
    e = footprint.free_edge_margin(np.array([2.0, 0.2, 6.0, 4.5, 2.0]),
                                   np.array([2.0, 3.0, 4.5, 4.5, 7.9]), 1.0, 0.6, ext, op)
    # (2, 2): 2 m to the deck edges, 2.0 − 0.3; (0.2, 3): 0.2 − 0.3 < 0: 0;
    # (6, 4.5): 1 m to the opening's side, 0.7; inside the opening: 0; 0.1 m from y1: 0
    assert e == pytest.approx([1.7, 0.0, 0.7, 0.0, 0.0], abs=1e-12)


def test_spreader_beam_at_the_roof_edge_column():
    # the rooftop demo's 300 kg spreader beam (4.0 × 0.3 m) dropped flat at column 2/C
    # (7.5, 18.0), on the roof's edge: half its footprint bears, 0.6 m², and the
    # pressure has no room to spread (e = 0): F_crush = 1.25·(30 + 8) MPa·0.6 m² =
    # 28.5 MN (EN 1992-1-1 Eq. 6.63 without the enhancement; 1.25 the rate factor of
    # droprig.solver.crushing), where it was 37.0 MN with the enhancement of a
    # distribution area reaching past the edge. The flat rigid landing's contact
    # (29.0 MN before) is held to it
    p = load_project(ROOT / "demo_projects" / "rooftop_plant_swap.droprig")
    zone = p.lift_zones[0]
    load = next(ld for ld in zone.loads if ld.name == "Spreader beam 4 m")
    fm = analysis.build_floor(p.level(zone.level_id), p.settings)
    geo = analysis.point_geometry(fm, p, np.array([7.5]), np.array([18.0]))
    c = evaluate_chain(fm, p, load, geo, v_hoist=zone.hoist_speed)
    inp, imp = c[LoadInputs], c[Impact]
    assert float(inp.foot_l[0] * inp.foot_w[0]) == pytest.approx(0.6, rel=1e-9)
    assert float(inp.edge_margin[0]) == 0.0
    assert float(imp.F_crush[0]) == pytest.approx(1.25 * 38e6 * 0.6, rel=1e-9)
    assert float(imp.contact[0]) <= float(imp.F_crush[0]) * (1 + 1e-12)
