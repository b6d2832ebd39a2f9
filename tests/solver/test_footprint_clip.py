"""A footprint cut at the deck's edge and over an opening: the contact checks use the
part that bears.

Sources: plane geometry (rectangle overlap areas); EN 1992-1-1 §6.7(2) Eq. (6.63)
(crushing of the concrete under a loaded area A_c0, F = A_c0·f·√(A_c1/A_c0) ≤ 3·f·A_c0,
A_c1 reached over the slab depth, Fig. 6.29) with EN 1992-1-1 Table 3.1
f_cm = f_ck + 8 MPa, or ACI 318-19 §22.8.3.2 (0.85·f'c·A1·√(A2/A1), ratio ≤ 2) with
f'c + 8.3 MPa (ACI 318-19 §26.12.3.1, from memory), and droprig's stated strain-rate
factor 1.25 (CEB-FIP MC90 §2.1.6). The
demo project is an invented scenario: it supplies the geometry, never an expected
value.
"""

from __future__ import annotations

import math
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest

from droprig.io.project_file import load_project
from droprig.model import Rect
from droprig.solver import analysis, evaluate, footprint
from droprig.solver.chain import Impact, LoadInputs

ROOT = Path(__file__).resolve().parents[2]
REL = 1e-12


def test_footprint_on_deck_by_hand():
    ext = (0.0, 0.0, 10.0, 8.0)
    # centre 0.25 m from the edge x = 0, footprint 1.0 × 0.6:
    # length along x: x ∈ [−0.25, 0.75] → 0.75 × 0.6 = 0.45 m² on the deck
    # length along y: x ∈ [−0.05, 0.55] → 0.55 × 1.0 = 0.55 m²; the smaller is kept,
    # as a 1.0 × 0.6 rectangle scaled by √(0.45/0.6)
    sx, sy, share = footprint.footprint_on_deck(0.25, 4.0, 1.0, 0.6, ext)
    assert float(share) == pytest.approx(0.45 / 0.6, rel=REL)
    assert float(sx) * float(sy) == pytest.approx(0.45, rel=REL)
    assert (float(sx), float(sy)) == pytest.approx((math.sqrt(0.75), 0.6 * math.sqrt(0.75)),
                                                   rel=REL)
    # at a corner (0.2, 0.1): length along x → 0.7 × 0.4 = 0.28; along y → 0.5 × 0.6 = 0.30
    sx, sy, share = footprint.footprint_on_deck(0.2, 0.1, 1.0, 0.6, ext)
    assert float(sx) * float(sy) == pytest.approx(0.28, rel=REL)
    # wholly on the deck: unchanged
    sx, sy, share = footprint.footprint_on_deck(5.0, 4.0, 1.0, 0.6, ext)
    assert (float(sx), float(sy), float(share)) == pytest.approx((1.0, 0.6, 1.0), rel=REL)


def test_footprint_over_an_opening_by_hand():
    # opening x ∈ [5.3, 7], y ∈ [0, 8]; footprint 1.0 × 0.6 centred at (5.0, 4.0):
    # along x: [4.5, 5.5] × [3.7, 4.3] loses 0.2 × 0.6 = 0.12 → 0.48 m²
    # along y: [4.7, 5.3] × [3.5, 4.5] loses nothing → 0.6 m²; the 0.48 m² is kept
    sx, sy, share = footprint.footprint_on_deck(5.0, 4.0, 1.0, 0.6, (0.0, 0.0, 10.0, 8.0),
                                                ((5.3, 0.0, 7.0, 8.0),))
    assert float(sx) * float(sy) == pytest.approx(0.48, rel=1e-12)
    assert float(share) == pytest.approx(0.8, rel=1e-12)


def test_footprint_on_deck_is_continuous_along_a_line():
    # the contact must not jump as the point moves (drop points are sampled): the
    # sides change by at most their first-order amount over a 1 mm step
    xs = np.linspace(0.01, 1.5, 1491)
    sx, sy, _ = footprint.footprint_on_deck(xs, 4.0, 1.0, 0.6, (0.0, 0.0, 10.0, 8.0))
    assert np.max(np.abs(np.diff(sx))) < 2e-3 and np.max(np.abs(np.diff(sy))) < 2e-3


@pytest.fixture(scope="module")
def steel():
    p = load_project(ROOT / "demo_projects" / "steel_erection_floor.droprig")
    z = p.lift_zones[0]
    lv = p.level(z.level_id)
    return p, lv, z.loads[0]


def _chain(p, lv, load, xs, ys):
    fm = analysis.build_floor(lv, p.settings)
    geo = analysis.point_geometry(fm, p, np.asarray(xs, float), np.asarray(ys, float))
    return evaluate.evaluate_chain(fm, p, load, geo)


def test_clipped_footprint_at_the_deck_edge_in_the_chain(steel):
    p, lv, load = steel
    load = replace(load, footprint_length=1.0, footprint_width=0.6, contact_stiffness=None)
    ext = lv.grid.extent
    xs = [ext.x0 + 0.25, 0.5 * (ext.x0 + ext.x1) + 0.3]  # at the edge; inside a bay
    ys = [0.5 * (ext.y0 + ext.y1) + 1.1] * 2
    c = _chain(p, lv, load, xs, ys)
    inp, imp = c[LoadInputs], c[Impact]
    # the edge point: 0.45 m² bears (hand, as above) as 1.0 × 0.6 scaled by √0.75;
    # the inside point: 1.0 × 0.6
    edge = (math.sqrt(0.75), 0.6 * math.sqrt(0.75))
    assert (inp.foot_l[0], inp.foot_w[0]) == pytest.approx(edge, rel=REL)
    assert (inp.foot_l[1], inp.foot_w[1]) == pytest.approx((1.0, 0.6), rel=REL)
    # crushing bound by hand, × 1.25 for the strain rate on the mean strength:
    # EN 1992-1-1 Eq. 6.63, b_i = min(3c_i, c_i + h), ratio ≤ 3, f_cm = f_ck + 8 MPa;
    # ACI 318-19 §22.8.3.2, A2 spread 1:2 over h, ratio ≤ 2, 0.85·(f'c + 8.3 MPa)
    fc, h = lv.deck.concrete.fc, lv.deck.thickness
    assert p.settings.design_basis in ("en1993", "aisc360")
    for i, (c1, c2) in enumerate((edge, (1.0, 0.6))):
        if p.settings.design_basis == "en1993":
            b1, b2 = min(3 * c1, c1 + h), min(3 * c2, c2 + h)
            q = (fc + 8e6) * min(math.sqrt(b1 * b2 / (c1 * c2)), 3.0)
        else:
            b1, b2 = c1 + 4 * h, c2 + 4 * h
            q = 0.85 * (fc + 8.3e6) * min(math.sqrt(b1 * b2 / (c1 * c2)), 2.0)
        assert float(imp.F_crush[i]) == pytest.approx(1.25 * q * c1 * c2, rel=1e-9)
    assert imp.F_crush[0] < imp.F_crush[1]


def test_footprint_over_an_opening_in_the_chain(steel):
    p, lv, load = steel
    load = replace(load, footprint_length=1.0, footprint_width=0.6, contact_stiffness=None)
    ext = lv.grid.extent
    xm, ym = 0.5 * (ext.x0 + ext.x1) + 0.3, 0.5 * (ext.y0 + ext.y1) + 1.1
    op = Rect(xm + 0.3, ym - 1.0, xm + 1.3, ym + 1.0)  # 0.3 m from the load's centre
    lv2 = replace(lv, deck=replace(lv.deck, openings=(op,)))
    c = _chain(p, lv2, load, [xm], [ym])
    inp = c[LoadInputs]
    # along x the footprint loses 0.2 × 0.6 m over the opening (0.48 m²); along y it
    # stays whole (0.6 m²): 0.48 m² bears
    assert float(inp.foot_l[0] * inp.foot_w[0]) == pytest.approx(0.48, rel=1e-9)
