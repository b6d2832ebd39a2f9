"""The struck deck panel as a ductile member: yield lines, continuity, ductility class,
punching perimeters at free edges and openings, topping over ribs.

Sources: K. W. Johansen, *Yield-line Theory* (1962) and R. Park & W. L. Gamble,
*Reinforced Concrete Slabs* 2nd ed. (Wiley 2000) ch. 9–10 — the fan 2π(m + m′)
under a concentrated load, 8m for a simply supported square panel loaded at its
centre, 4m(Lx/Ly + Ly/Lx) for a rectangle, 16m for a clamped square with m′ = m
(all from memory of the published patterns); EN 1992-1-1:2004 §3.1.7, §5.6.2(2),
§5.6.3(2), §6.4.2 (Figs. 6.14, 6.15), §6.4.5(3); AISC Manual 15th ed. Table 3-23
(cases 8, 16); PyNiteFEA 3.x (PyPI ``PyNiteFEA``) for the continuous strip.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from droprig.solver import beam, slab

REL = 1e-9
"""Closed forms checked against closed forms: rounding only."""

REL_FE = 5e-3
"""Continuous strip against a 7-span PyNiteFEA model: the 3 far spans on each side
stand in for an infinite run (stiffness 3.4615 vs 2√3 = 3.4641 EI/L, 0.08 %)."""

M = 12.0e3  # N·m/m, a sagging capacity used only as a scale factor


# ---------------------------------------------------------------- yield-line patterns
def test_fan_point_load_is_two_pi_m_plus_m_neg():
    # Johansen; Park & Gamble ch. 10: concentrated load, P = 2π(m + m′), any radius
    for m_neg in (0.0, 0.5 * M, M):
        for R in (0.5, 3.0, 50.0):
            assert slab.fan_collapse_load(M, m_neg, 0.0, R) == pytest.approx(
                2 * math.pi * (M + m_neg), rel=REL)


def test_fan_circular_patch_virtual_work():
    # Park & Gamble ch. 10 (from memory): patch of radius r, fan radius R:
    # P = 2π(m + m′)/(1 − 2r/(3R)); r = 0.3, R = 1.2 → 1 − 1/6 = 5/6
    assert slab.fan_collapse_load(M, 0.0, 0.3, 1.2) == pytest.approx(
        2 * math.pi * M * 6 / 5, rel=REL)
    # support inside the loaded circle: no fan can form
    assert np.isinf(slab.fan_collapse_load(M, 0.0, 0.5, 0.4))


@pytest.mark.parametrize("Lx, Ly", [(4.0, 4.0), (3.0, 6.0), (2.5, 9.0)])
def test_panel_pattern_central_load(Lx, Ly):
    # Park & Gamble ch. 9: simply supported rectangle, central point load,
    # P = 4m(Lx/Ly + Ly/Lx); square → 8m
    P = slab.panel_pattern_collapse_load(Lx, Ly, Lx / 2, Ly / 2, M, M)
    assert P == pytest.approx(4 * M * (Lx / Ly + Ly / Lx), rel=REL)
    if Lx == Ly:
        assert P == pytest.approx(8 * M, rel=REL)


def test_panel_pattern_clamped_square():
    # Park & Gamble ch. 9: clamped square with m′ = m, central load → 8(m + m′) = 16m
    P = slab.panel_pattern_collapse_load(4.0, 4.0, 2.0, 2.0, M, M, M, M, M, M)
    assert P == pytest.approx(16 * M, rel=REL)


def test_yield_line_resistance_takes_the_fan_in_a_square_panel():
    # Park & Gamble ch. 10: with no top steel in the field, the fan 2πm = 6.28m under
    # a point load governs the simply supported square (pattern 8m)
    P = slab.yield_line_resistance(4.0, 4.0, 2.0, 2.0, M, M, 0.0)
    assert P == pytest.approx(2 * math.pi * M, rel=REL)


def test_yield_line_orthotropic_fan_affinity():
    # Johansen's affinity theorem (from memory): mx, my = μ·mx → fan 2π√(mx·my)
    P = slab.yield_line_resistance(6.0, 6.0, 3.0, 3.0, M, 0.2 * M, 0.0)
    assert P == pytest.approx(2 * math.pi * M * math.sqrt(0.2), rel=REL)


def test_one_way_strip_midspan():
    # Park & Gamble (from memory): P = 4·b·(m + m′)/ℓ at midspan with equal hogging
    P = slab.one_way_strip_collapse_load(3.0, 1.5, 1.2, M, 0.4 * M, 0.4 * M)
    assert P == pytest.approx(4 * 1.2 * 1.4 * M / 3.0, rel=REL)
    # m′ = 0: the beam collapse load Mp·L/(a·b) (AISC / Neal) with Mp = m·b
    P0 = slab.one_way_strip_collapse_load(3.0, 1.0, 1.2, M)
    assert P0 == pytest.approx(beam.plastic_collapse_load("simple", 3.0, 1.0, M * 1.2),
                               rel=REL)


def test_support_line_never_governed_by_sagging():
    # a load on a girder line (y = 0) or a beam line (x = 0) bears on the steel:
    # no yield-line mechanism of the panel and no sagging strip moment
    # (statics: the load passes straight into the support)
    P = slab.yield_line_resistance(3.0, 9.0, [1.5, 0.0, 1.5], [0.0, 4.5, 9.0], M, M, 0.2)
    assert np.all(np.isinf(P))
    Msag = slab.continuous_strip_sagging_moment(3.0, [0.0, 3.0], 1e6, slab.K_INTERIOR * 1e6 / 3,
                                                slab.K_INTERIOR * 1e6 / 3)
    assert np.all(Msag == 0.0)


# ---------------------------------------------------------------- continuous strip
def test_end_springs_reduce_to_published_cases():
    L, EI = 3.0, 2.0e6
    a = np.array([0.4, 1.0, 1.5, 2.3])
    b = L - a
    # K → ∞: fixed–fixed, MA = a·b²/L², MB = a²·b/L² (AISC Manual Table 3-23 case 16)
    MA, MB = slab.continuous_strip_end_moments(L, a, EI, 1e18, 1e18)
    np.testing.assert_allclose(MA, a * b**2 / L**2, rtol=1e-9)
    np.testing.assert_allclose(MB, a**2 * b / L**2, rtol=1e-9)
    np.testing.assert_allclose(slab.continuous_strip_compliance(L, a, EI, 1e18, 1e18),
                               beam.green("fixed", L, EI, a, a), rtol=1e-8)
    # K = 0: simple span (case 8)
    np.testing.assert_allclose(slab.continuous_strip_compliance(L, a, EI, 0.0, 0.0),
                               beam.green("simple", L, EI, a, a), rtol=REL)
    # one end fixed, the other pinned: propped (droprig's propped is fixed at x = 0)
    np.testing.assert_allclose(slab.continuous_strip_compliance(L, a, EI, 1e18, 0.0),
                               beam.green("propped", L, EI, a, a), rtol=1e-8)


def _pynite_continuous(n_spans: int, L: float, EI: float, span: int, a: float):
    """Equal-span continuous beam on pinned supports; unit load at ``a`` in ``span``.
    Returns (deflection under the load, |M| at the loaded span's left, right support)."""
    from Pynite import FEModel3D

    E = 30e9
    Iz = EI / E
    m = FEModel3D()
    m.add_material("c", E, 12.5e9, 0.2, 2400.0)
    m.add_section("s", 1.0, Iz, Iz, Iz)
    xs = sorted({i * L for i in range(n_spans + 1)} | {span * L + a})
    names = []
    for i, x in enumerate(xs):
        m.add_node(f"N{i}", x, 0.0, 0.0)
        names.append(f"N{i}")
    for i in range(len(xs) - 1):
        m.add_member(f"M{i}", names[i], names[i + 1], "c", "s")
    for i, x in enumerate(xs):
        support = abs(x / L - round(x / L)) < 1e-9
        m.def_support(names[i], support, support, True, True, False, False)
    k = xs.index(span * L + a)
    m.add_node_load(names[k], "FY", -1.0)
    m.analyze_linear(check_statics=False)
    w = -m.nodes[names[k]].DY["Combo 1"]
    left = xs.index(span * L)
    # moment at a support node from the member ending there
    ml = abs(m.members[f"M{left - 1}"].moment("Mz", L, "Combo 1"))
    mr_member = m.members[f"M{k}"]
    mr = abs(mr_member.moment("Mz", mr_member.L(), "Combo 1"))
    return w, ml, mr


@pytest.mark.parametrize("a", [0.75, 1.5, 2.2])
def test_continuous_strip_against_pynite(a):
    pytest.importorskip("Pynite")
    L, EI = 3.0, 1.5e6
    w, ml, mr = _pynite_continuous(7, L, EI, 3, a)  # PyNiteFEA 7-span strip
    K = slab.K_INTERIOR * EI / L
    assert slab.continuous_strip_compliance(L, a, EI, K, K) == pytest.approx(w, rel=REL_FE)
    MA, MB = slab.continuous_strip_end_moments(L, a, EI, K, K)
    assert MA == pytest.approx(ml, rel=REL_FE)
    assert MB == pytest.approx(mr, rel=REL_FE)


# ---------------------------------------------------------------- ductility
def test_neutral_axis_ratio_roof_slab():
    # EN 1992-1-1 §3.1.7(3): As = 900 mm²/m, fyd = 500, fcd = 30/1.2 = 25 MPa:
    # λx = 900 × 500/(25 × 1000) = 18 mm, x = 22.5 mm; d = 130 − 25 − 6 = 99 mm
    # → x/d = 0.227 ≤ 0.45 (§5.6.3(2)): ductile
    r = slab.neutral_axis_ratio(9.0e-4, 0.099, 30e6, 500e6, "en1993")
    assert r == pytest.approx(22.5 / 99, rel=REL)
    assert slab.is_ductile(r, 30e6)
    # ACI 318-19 §22.2.2: c = As·fy/(0.85·f'c·β1), β1 = 0.85 at 28 MPa
    c = slab.neutral_axis_ratio(8.0e-4, 0.12, 28e6, 420e6, "aisc360") * 0.12
    assert c == pytest.approx(8.0e-4 * 420e6 / (0.85 * 28e6 * 0.85), rel=REL)


def test_heavily_reinforced_slab_is_brittle():
    # §5.6.3(2): x/d > 0.45 → not ductile (4000 mm²/m in a 99 mm depth: x/d = 1.01)
    r = slab.neutral_axis_ratio(4.0e-3, 0.099, 30e6, 500e6, "en1993")
    assert r > 0.45 and not slab.is_ductile(r, 30e6)
    # above C50/60 the limit drops to 0.35
    assert not slab.is_ductile(0.40, 60e6) and slab.is_ductile(0.40, 40e6)


def test_series_resistance_weaker_spring_sets_plateau():
    # Biggs 1964 ch. 5 (from memory): springs in series share one force
    R, dy, first = slab.series_resistance([100e3, 300e3], [1e-6, 1e-6], 200e3, 2e-6)
    np.testing.assert_allclose(R, [100e3, 200e3])
    np.testing.assert_allclose(dy, [0.3, 0.6])
    np.testing.assert_array_equal(first, [1, 2])


# ---------------------------------------------------------------- perimeters, widths
def test_basic_control_perimeter():
    # EN 1992-1-1 §6.4.2(1): u1 = 2(cx + cy) + 4πd
    u = slab.control_perimeter_edges(0.3, 0.2, 0.1)
    assert u == pytest.approx(2 * 0.5 + 4 * math.pi * 0.1, rel=REL)


def test_control_perimeter_at_an_edge_and_a_corner():
    # EN 1992-1-1 Fig. 6.15 (from memory): area against a free edge (e = 0) along
    # its cx side: u1 = cx + 2cy + 2πd (two quarter circles left, straight runs
    # to the edge); at a corner: cx + cy + πd
    cx, cy, d = 0.3, 0.2, 0.1
    edge = slab.control_perimeter_edges(cx, cy, d, e_y0=0.0)
    assert edge == pytest.approx(cx + 2 * cy + 2 * math.pi * d, rel=REL)
    corner = slab.control_perimeter_edges(cx, cy, d, e_x0=0.0, e_y0=0.0)
    assert corner == pytest.approx(cx + cy + math.pi * d, rel=REL)
    # an edge 0.1 m away (< 2d) adds the straight runs of 0.1 m
    near = slab.control_perimeter_edges(cx, cy, d, e_y0=0.1)
    assert near == pytest.approx(cx + 2 * cy + 2 * math.pi * d + 2 * 0.1, rel=REL)
    # farther than 2d: the basic perimeter
    far = slab.control_perimeter_edges(cx, cy, d, e_y0=0.25)
    assert far == pytest.approx(slab.control_perimeter_edges(cx, cy, d), rel=REL)
    assert edge < far and corner < edge


def test_loaded_perimeter_u0_at_edges():
    # EN 1992-1-1 §6.4.5(3) (from memory): interior 2(c1 + c2); edge c2 + 3d ≤ c2 + 2c1;
    # corner 3d ≤ c1 + c2
    cx, cy, d = 0.3, 0.2, 0.1
    assert slab.loaded_perimeter_edges(cx, cy, d) == pytest.approx(1.0)
    assert slab.loaded_perimeter_edges(cx, cy, d, e_x0=0.0) == pytest.approx(cy + 3 * d)
    assert slab.loaded_perimeter_edges(cx, cy, d, e_x0=0.0, e_y1=0.0) == pytest.approx(3 * d)


def test_opening_tangent_rule():
    # EN 1992-1-1 Fig. 6.14: opening on the +x axis from x = 0.5 to 0.7, |y| ≤ 0.05,
    # tangents from the centre at ±atan(0.05/0.5); on the straight face x = 0.1 + 2d
    # = 0.3 they cut |y| ≤ 0.3 × 0.1 = 0.03 → 0.06 m ineffective
    u = slab.opening_ineffective_length(0.0, 0.0, 0.2, 0.2, 0.1, (0.5, -0.05, 0.7, 0.05))
    assert u == pytest.approx(0.06, rel=5e-3)  # sampled at 720 points: ≤ 0.5 %
    # same opening rotated to the other three sides: same length (symmetry)
    for rect in ((-0.05, 0.5, 0.05, 0.7), (-0.7, -0.05, -0.5, 0.05), (-0.05, -0.7, 0.05, -0.5)):
        assert slab.opening_ineffective_length(0.0, 0.0, 0.2, 0.2, 0.1, rect) == \
            pytest.approx(0.06, rel=5e-3)
    # farther than 6d from the loaded area: no reduction
    assert slab.opening_ineffective_length(0.0, 0.0, 0.2, 0.2, 0.1,
                                           (0.8, -0.05, 1.0, 0.05)) == 0.0


def test_effective_width_cut_by_free_edge():
    # common practice, no source: half-widths limited by the slab on each side
    b = slab.effective_width_with_edges(2.0, 0.4, [np.inf, 0.3, 0.0], np.inf)
    np.testing.assert_allclose(b, [2.0, 1.0 + 0.5, 1.0 + 0.2])


def test_topping_depth():
    # EN 1994-1-1 §9.7.6 (from memory): depth over the ribs h_c = h − h_p
    assert slab.topping_depth(0.13, 0.06) == pytest.approx(0.07)
    with pytest.raises(ValueError, match="rib_height"):
        slab.topping_depth(0.13, 0.13)
