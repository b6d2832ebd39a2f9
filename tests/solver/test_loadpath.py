"""Load path, compliance and Rayleigh effective mass of a floor.

Sources: AISC *Steel Construction Manual* 15th ed., Table 3-23 (beam deflections);
Timoshenko, *Strength of Materials* Part I, impact with the mass of the beam
(effective mass 17/35 of a simple beam struck at midspan, 33/140 of a cantilever
struck at its tip, 13/35 of a fixed–fixed beam at midspan — as listed in
/work/shared/references.md, where 17/35 and 33/140 are also given by Rao,
*Mechanical Vibrations*); Rayleigh's method (the definition m_e = ∫μ(w/w_p)² dx).
"""

from __future__ import annotations

import numpy as np
import pytest

from droprig.model import ColumnGrid, Grade, Level, Member, ModelError, Section, generate_level
from droprig.solver import loadpath

REL = 1e-9  # closed forms evaluated in floating point
QUAD_REL = 1e-6  # fine trapezoid quadrature of the deflected shapes

E = 200e9
GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=E)


def _section(name: str, Ix: float, mass: float, d: float = 0.4) -> Section:
    return Section(name, "custom", d=d, bf=0.18, tw=0.008, tf=0.012, r=0.01, A=8e-3,
                   Ix=Ix, Sx=Ix / (d / 2), Zx=1.12 * Ix / (d / 2), Iy=1e-5,
                   mass_per_length=mass)


BEAM = _section("B", 1.2e-4, 45.0)
GIRDER = _section("G", 3.5e-4, 80.0, 0.45)


@pytest.fixture(scope="module")
def floor():
    return generate_level(level_id="L", name="t", elevation=0.0, x_spacings=(8.0, 8.0),
                          y_spacings=(6.0, 7.0), girder_direction="x", beam_spacing=2.7,
                          girder_section=GIRDER, beam_section=BEAM, girder_grade=GRADE,
                          beam_grade=GRADE)


def _single_span_level(cond: str, span: float = 6.0) -> Level:
    """Two parallel members on column lines x = 0 and x = 5 (deck between them)."""
    grid = ColumnGrid((0.0, 5.0), (0.0, span), ("1", "2"), ("A", "B"))
    members = (
        Member("B1", "beam", (0.0, 0.0), (0.0, span), BEAM, GRADE, cond),
        Member("B2", "beam", (5.0, 0.0), (5.0, span), BEAM, GRADE, cond),
        Member("GA", "girder", (0.0, 0.0), (5.0, 0.0), GIRDER, GRADE),
        Member("GB", "girder", (0.0, span), (5.0, span), GIRDER, GRADE),
    )
    return Level("L", "single", 0.0, grid, members)


@pytest.mark.parametrize("cond, beta, source", [
    ("simple", 17.0 / 35.0, "Timoshenko Part I; Rao: 17/35"),
    ("fixed", 13.0 / 35.0, "Timoshenko Part I / Roark dynamic chapter: 13/35 [mem]"),
])
def test_effective_mass_midspan_on_rigid_supports(cond, beta, source):
    L = 6.0
    frame = loadpath.build_frame(_single_span_level(cond, L))
    res = loadpath.evaluate(frame, [0.0], [L / 2])
    assert res.m_e[0] == pytest.approx(beta * BEAM.mass_per_length * L, rel=REL), source


def test_effective_mass_cantilever_tip():
    # Timoshenko Part I; Rao, Mechanical Vibrations: 33/140 of the cantilever's mass
    grid = ColumnGrid((0.0, 5.0), (0.0, 6.0), ("1", "2"), ("A", "B"))
    members = (
        Member("C1", "beam", (0.0, 0.0), (0.0, -3.0), BEAM, GRADE, "cantilever"),
        Member("C2", "beam", (5.0, 0.0), (5.0, -3.0), BEAM, GRADE, "cantilever"),
        Member("GA", "girder", (0.0, 0.0), (5.0, 0.0), GIRDER, GRADE),
    )
    frame = loadpath.build_frame(Level("L", "cant", 0.0, grid, members))
    res = loadpath.evaluate(frame, [0.0], [-3.0])
    assert res.m_e[0] == pytest.approx(33.0 / 140.0 * BEAM.mass_per_length * 3.0, rel=REL)
    # tip deflection 1/(3EI)·L³, AISC Manual Table 3-23 case 22
    assert res.f[0] == pytest.approx(3.0**3 / (3 * E * BEAM.Ix), rel=REL)


def test_simple_beam_on_columns_midspan_compliance():
    # AISC Manual Table 3-23 case 7: Δmax = PL³/(48EI)
    frame = loadpath.build_frame(_single_span_level("simple"))
    res = loadpath.evaluate(frame, [5.0], [3.0])
    assert res.f[0] == pytest.approx(6.0**3 / (48 * E * BEAM.Ix), rel=REL)


def test_lever_rule_shares(floor):
    # infill beams at x = 0, 8/3, 16/3, 8 in bay 1; a point a third of the way
    frame = loadpath.build_frame(floor)
    x = 8.0 / 3 + (8.0 / 3) / 3
    res = loadpath.evaluate(frame, [x], [2.0])
    assert res.share[0] == pytest.approx([2.0 / 3, 1.0 / 3], rel=REL)  # statics
    assert res.a[0] == pytest.approx([2.0, 2.0], rel=REL)


def _quadrature_check(frame, res, i):
    """Compliance as the deflection under the load and m_e by Rayleigh's definition,
    both from the deflected shapes of every member on the path, trapezoid rule."""
    ip = int(res.pair[i])
    members = loadpath.path_members(frame, ip)
    w_p = 0.0
    for k in range(2):
        m = int(res.members[i, k])
        w_p += res.share[i, k] * loadpath.deflected_shape(frame, res, i, m,
                                                          np.array([res.a[i, k]]))[0]
    kin = 0.0
    w_max = 0.0
    for m in members:
        x = np.linspace(0.0, frame.L[m], 40001)
        w = loadpath.deflected_shape(frame, res, i, m, x)
        kin += frame.mu[m] * np.trapezoid(w * w, x)
        w_max = max(w_max, float(np.max(np.abs(w))))
    return w_p, kin, w_max


BOUND_REL = 1e-3
"""The normalising deflection is an upper bound of the path's largest deflection,
built from tabulated maxima (interpolated) — allowed to fall short by 0.1 %."""


def _check_mass(res, i, w_p, kin, w_max):
    # m_e = ∫μw² / w_ref², w_ref = max(w(p), bound of the path's largest deflection)
    assert res.m_e[i] * res.w_ref[i] ** 2 == pytest.approx(kin, rel=QUAD_REL, abs=0.0)
    assert res.w_ref[i] >= w_p * (1 - REL)
    assert res.w_ref[i] >= w_max * (1 - BOUND_REL)
    assert res.w_ref[i] <= 2.0 * w_max


@pytest.mark.parametrize("p", [(4.0, 3.0), (2.0, 0.4), (10.3, 12.6), (12.0, 7.7),
                               (16.0, 9.0), (8.0, 3.0), (0.0, 0.5), (5.0, 6.0)])
def test_rayleigh_mass_and_compliance_from_deflected_shapes(floor, p):
    # Maxwell–Betti / Clapeyron: the deflection under a unit load equals the
    # internal work; Rayleigh: m_e = Σ ∫ μ (w/w_p)² dx (definition)
    frame = loadpath.build_frame(floor)
    res = loadpath.evaluate(frame, [p[0]], [p[1]])
    w_p, kin, w_max = _quadrature_check(frame, res, 0)
    assert res.f[0] == pytest.approx(w_p, rel=REL)
    _check_mass(res, 0, w_p, kin, w_max)


def test_fixed_beams_on_flexible_girders_mass(floor):
    # fixed-ended infill beams on flexible girders: the support movement enters the
    # span by the reaction influence line (Müller-Breslau); Rayleigh by definition
    from dataclasses import replace

    lv = replace(floor, members=tuple(
        replace(m, end_condition="fixed") if m.role == "beam" else m for m in floor.members))
    frame = loadpath.build_frame(lv)
    res = loadpath.evaluate(frame, [4.0, 1.0], [3.0, 10.0])
    for i in range(2):
        w_p, kin, w_max = _quadrature_check(frame, res, i)
        assert res.f[i] == pytest.approx(w_p, rel=REL)
        _check_mass(res, i, w_p, kin, w_max)


def test_mass_near_a_support_is_bounded():
    # Rayleigh normalised by the struck point grows without bound near a support
    # (beam.rayleigh_mass_factor → ∞ as a → 0); droprig's mass stays below the
    # member's own mass there (conservative: less mass, larger force).
    from droprig.solver import beam

    frame = loadpath.build_frame(_single_span_level("simple", 6.0))
    res = loadpath.evaluate(frame, [0.0, 0.0], [0.05, 3.0])
    published = beam.rayleigh_mass_factor("simple", 6.0, 0.05) * BEAM.mass_per_length * 6.0
    assert published > 10 * BEAM.mass_per_length * 6.0
    assert res.m_e[0] < BEAM.mass_per_length * 6.0
    assert res.m_e[1] == pytest.approx(17 / 35 * BEAM.mass_per_length * 6.0, rel=REL)


def test_symmetric_floor_gives_symmetric_path(floor):
    # a floor symmetric about x = 8: mirrored points share f and m_e (symmetry)
    frame = loadpath.build_frame(floor)
    xs = np.array([1.3, 2.9, 4.0, 6.1, 7.7])
    ys = np.array([0.4, 3.0, 5.5, 9.1, 12.9])
    a = loadpath.evaluate(frame, xs, ys)
    b = loadpath.evaluate(frame, 16.0 - xs, ys)
    assert np.allclose(a.f, b.f, rtol=1e-12)
    assert np.allclose(a.m_e, b.m_e, rtol=1e-12)


def test_points_off_the_deck_are_not_supported(floor):
    frame = loadpath.build_frame(floor)
    res = loadpath.evaluate(frame, [-1.0, 20.0, 5.0], [3.0, 3.0, 14.0])
    assert list(res.pair) == [-1, -1, -1]
    assert np.all(np.isnan(res.f))


def test_member_end_on_nothing_is_refused():
    grid = ColumnGrid((0.0, 5.0), (0.0, 6.0), ("1", "2"), ("A", "B"))
    members = (
        Member("B1", "beam", (0.0, 0.0), (0.0, 6.0), BEAM, GRADE),
        Member("B2", "beam", (2.5, 0.0), (2.5, 6.0), BEAM, GRADE),  # no girder below
        Member("B3", "beam", (5.0, 0.0), (5.0, 6.0), BEAM, GRADE),
    )
    with pytest.raises(ModelError, match="B2"):
        loadpath.build_frame(Level("L", "bad", 0.0, grid, members))


def test_members_resting_on_each_other_are_refused():
    # P's start rests on Q and Q's end rests on P: no column below either (statics
    # has no solution): refused by name
    grid = ColumnGrid((0.0, 10.0), (0.0, 10.0), ("1", "2"), ("A", "B"))
    members = (
        Member("A", "girder", (0.0, 0.0), (10.0, 0.0), GIRDER, GRADE),
        Member("P", "girder", (3.0, 3.0), (7.0, 3.0), GIRDER, GRADE),
        Member("Q", "beam", (3.0, 0.0), (3.0, 3.0), BEAM, GRADE),
        Member("R", "beam", (7.0, 0.0), (7.0, 3.0), BEAM, GRADE),
    )
    with pytest.raises(ModelError, match="rest on each other"):
        loadpath.build_frame(Level("L", "bad", 0.0, grid, members))


def test_chunked_evaluation_matches(floor, monkeypatch):
    frame = loadpath.build_frame(floor)
    rng = np.random.default_rng(1)
    x, y = rng.uniform(0, 16, 500), rng.uniform(0, 13, 500)
    full = loadpath.evaluate(frame, x, y)
    monkeypatch.setattr(loadpath, "CHUNK", 37)
    part = loadpath.evaluate(frame, x, y)
    assert np.array_equal(full.f, part.f)
    assert np.array_equal(full.m_e, part.m_e)


def test_mass_polynomials_match_quadrature():
    # the Chebyshev polynomials reproduce the exact Gauss–Legendre integrals, and
    # their interpolated tables stay within 1e-6
    for cond in loadpath.COND_NAMES:
        for xi in (0.0, 0.13, 0.5, 0.77, 1.0):
            gg, g0, g1 = loadpath._unit_integrals(cond, xi)
            assert float(loadpath._poly_gg(cond, np.array(xi))) == pytest.approx(
                gg, rel=1e-9, abs=1e-15)
            p0, p1 = loadpath._poly_gr(cond, np.array(xi))
            assert float(p0) == pytest.approx(g0, rel=1e-9, abs=1e-15)
            assert float(p1) == pytest.approx(g1, rel=1e-9, abs=1e-15)
            t = loadpath._mass_tables(cond, np.array(xi))
            assert float(t[0]) == pytest.approx(gg, rel=1e-6, abs=1e-12)
            assert float(t[1]) == pytest.approx(g0, rel=1e-6, abs=1e-12)
