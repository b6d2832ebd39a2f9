"""Single-beam statics, deflections, plastic collapse and effective mass.

Sources:
* AISC Steel Construction Manual 15th ed., Table 3-23 and Roark's Formulas for Stress
  and Strain 7th ed., Table 8.1 — closed forms as transcribed in the team's
  references ("Beam formulas"); the propped case there has its simple support at
  x = 0 and is mapped onto droprig's orientation (fixed at x = 0) in each test.
* PyNiteFEA (independent 3-D frame FE program from PyPI): strong axis ``Iz`` for a
  member along X loaded in Y; sagging Mz comes out negative; dy negative downward.
* Maxwell–Betti reciprocal theorem (any mechanics text).
* Virtual-work plastic collapse loads (references, "Plastic collapse loads", derived).
* Effective-mass factors 17/35, 13/35, 33/140: Timoshenko, Strength of Materials
  Part I; Rao, Mechanical Vibrations (cantilever 33/140) — as tagged in the references.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from droprig.solver import beam

REL_CLOSED_FORM = 1e-10  # our algebra against the published closed form
REL_FE = 5e-3  # against PyNiteFEA (brief: ≤ 0.5 %)
ABS_FE_MOMENT = 1e-9  # N·m per N, near moment zeros
REL_QUADRATURE = 1e-12
REL_GRID = 1e-6  # collapse load minimised over a hinge grid

CONDS = ("simple", "fixed", "propped", "cantilever")
EI = 3.7e7  # N·m², any positive value


@pytest.fixture
def rng() -> np.random.Generator:
    return np.random.default_rng(20240611)


def _geometry(rng: np.random.Generator, n: int = 25) -> tuple[np.ndarray, ...]:
    L = rng.uniform(1.0, 20.0, n)
    a = L * rng.uniform(0.05, 0.95, n)
    x = L * rng.uniform(0.0, 1.0, n)
    return L, a, x


# --------------------------------------------------------------------------- closed forms
def test_simple_deflection_closed_form(rng: np.random.Generator) -> None:
    L, a, _x = _geometry(rng)
    b = L - a
    # AISC Manual Table 3-23 case 8: under the load Pa²b²/(3EIL)
    assert np.allclose(beam.green("simple", L, EI, a, a), a**2 * b**2 / (3 * EI * L),
                       rtol=REL_CLOSED_FORM)
    # for x ≤ a: Pbx(L² − b² − x²)/(6EIL)
    xl = a * rng.uniform(0, 1, a.shape)
    assert np.allclose(beam.green("simple", L, EI, xl, a),
                       b * xl * (L**2 - b**2 - xl**2) / (6 * EI * L), rtol=REL_CLOSED_FORM)


def test_fixed_deflection_closed_form(rng: np.random.Generator) -> None:
    L, a, _x = _geometry(rng)
    b = L - a
    # AISC Manual Table 3-23 case 18 / Roark Table 8.1: under the load Pa³b³/(3EIL³)
    assert np.allclose(beam.green("fixed", L, EI, a, a), a**3 * b**3 / (3 * EI * L**3),
                       rtol=REL_CLOSED_FORM)
    xl = a * rng.uniform(0, 1, a.shape)
    # for x ≤ a: Pb²x²(3aL − 3ax − bx)/(6EIL³)
    assert np.allclose(beam.green("fixed", L, EI, xl, a),
                       b**2 * xl**2 * (3 * a * L - 3 * a * xl - b * xl) / (6 * EI * L**3),
                       rtol=REL_CLOSED_FORM)


def test_fixed_maximum_deflection() -> None:
    # AISC Manual Table 3-23 case 18: a > b, Δmax = 2Pa³b²/(3EI(3a + b)²) at x = 2aL/(3a + b)
    L, a = 8.0, 5.0
    b = L - a
    xm = 2 * a * L / (3 * a + b)
    expected = 2 * a**3 * b**2 / (3 * EI * (3 * a + b) ** 2)
    assert beam.green("fixed", L, EI, xm, a) == pytest.approx(expected, rel=REL_CLOSED_FORM)
    xs = np.linspace(0, L, 20001)
    assert np.max(beam.green("fixed", L, EI, xs, a)) == pytest.approx(expected, rel=1e-8)


def test_fixed_end_moments_closed_form(rng: np.random.Generator) -> None:
    L, a, _ = _geometry(rng)
    b = L - a
    M0, ML = beam.unit_end_moments("fixed", L, a)
    # AISC Manual Table 3-23 case 18: end moments Pab²/L² and Pa²b/L² (hogging)
    assert np.allclose(M0, -a * b**2 / L**2, rtol=REL_CLOSED_FORM)
    assert np.allclose(ML, -(a**2) * b / L**2, rtol=REL_CLOSED_FORM)


def test_propped_closed_form_mapped(rng: np.random.Generator) -> None:
    """References: simple support at x = 0, fixed at x = L, a from the simple support.
    droprig: fixed at x = 0, pinned at x = L. So a_pub = L − a, b_pub = a."""
    L, a, _ = _geometry(rng)
    a_pub, b_pub = L - a, a
    R0, RL = beam.unit_reactions("propped", L, a)
    # R1 = Pb²(a + 2L)/(2L³) at the simple support (our x = L)
    assert np.allclose(RL, b_pub**2 * (a_pub + 2 * L) / (2 * L**3), rtol=REL_CLOSED_FORM)
    assert np.allclose(R0 + RL, 1.0, rtol=REL_CLOSED_FORM)
    # fixed-end moment Pab(a + L)/(2L²) (hogging, at our x = 0)
    M0, ML = beam.unit_end_moments("propped", L, a)
    assert np.allclose(M0, -a_pub * b_pub * (a_pub + L) / (2 * L**2), rtol=REL_CLOSED_FORM)
    assert np.allclose(ML, 0.0)
    # under the load Pa²b³(3L + a)/(12EIL³)
    assert np.allclose(beam.green("propped", L, EI, a, a),
                       a_pub**2 * b_pub**3 * (3 * L + a_pub) / (12 * EI * L**3),
                       rtol=REL_CLOSED_FORM)


def test_cantilever_closed_form(rng: np.random.Generator) -> None:
    L, a, _ = _geometry(rng)
    b_pub = a  # references: b from the fixed end to the load
    # under the load Pb³/(3EI); free end Pb²(3L − b)/(6EI)
    assert np.allclose(beam.green("cantilever", L, EI, a, a), b_pub**3 / (3 * EI),
                       rtol=REL_CLOSED_FORM)
    assert np.allclose(beam.green("cantilever", L, EI, L, a),
                       b_pub**2 * (3 * L - b_pub) / (6 * EI), rtol=REL_CLOSED_FORM)
    R0, RL = beam.unit_reactions("cantilever", L, a)
    assert np.allclose(R0, 1.0) and np.allclose(RL, 0.0)
    assert np.allclose(beam.unit_end_moments("cantilever", L, a)[0], -a)


@pytest.mark.parametrize(
    ("cond", "R0_coef", "M0_coef", "mid_defl_coef"),
    [
        # AISC Manual Table 3-23: case 1 (simple), 15 (fixed), 12 (propped), 19 (cantilever)
        ("simple", 0.5, 0.0, 5 / 384),  # case 1: 5wL⁴/(384EI) at midspan
        ("fixed", 0.5, -1 / 12, 1 / 384),  # case 15: wL⁴/(384EI) at midspan
        ("propped", 5 / 8, -1 / 8, 1 / 192),  # case 12: wL⁴/(192EI) at midspan
        ("cantilever", 1.0, -1 / 2, 17 / 384),  # case 19 at x = L/2: w(L/2)²(6L² − 2L² + L²/4)/24
    ],
)
def test_udl_closed_forms(cond: str, R0_coef: float, M0_coef: float,
                          mid_defl_coef: float) -> None:
    L, w = 7.3, 4.1e3
    R0, RL = beam.udl_reactions(cond, L, w)
    assert R0 == pytest.approx(R0_coef * w * L, rel=REL_CLOSED_FORM)
    assert R0 + RL == pytest.approx(w * L, rel=REL_CLOSED_FORM)
    assert beam.udl_end_moments(cond, L, w)[0] == pytest.approx(M0_coef * w * L**2,
                                                                rel=REL_CLOSED_FORM, abs=1e-9)
    assert beam.udl_deflection(cond, L, EI, w, L / 2) == pytest.approx(
        mid_defl_coef * w * L**4 / EI, rel=REL_CLOSED_FORM)


@pytest.mark.parametrize("cond", ("simple", "fixed", "propped"))
def test_precision_next_to_supports(cond: str) -> None:
    """The published closed forms (AISC Manual Table 3-23 cases 8, 18, 14 as transcribed in
    the references; propped mapped to fixed-at-0) evaluated in exact rational arithmetic:
    no cancellation within a nanometre of a support."""
    from fractions import Fraction

    L = Fraction(6)

    def exact(x: Fraction, a: Fraction) -> Fraction:
        lo, hi = min(x, a), max(x, a)
        b = L - hi
        if cond == "simple":  # b·x(L² − b² − x²)/(6L)
            return b * lo * (L**2 - b**2 - lo**2) / (6 * L)
        if cond == "fixed":  # b²x²(3aL − 3ax − bx)/(6L³)
            return b**2 * lo**2 * (3 * hi * L - 3 * hi * lo - b * lo) / (6 * L**3)
        # propped, published with a' = L − a from the simple support: under the load
        # a'²b'³(3L + a')/(12L³); away from it the simple value + M0·x(L − x)(2L − x)/(6L)
        M0 = -hi * b * (2 * L - hi) / (2 * L**2)
        simple = b * lo * (L**2 - b**2 - lo**2) / (6 * L)
        return simple + M0 * lo * (L - lo) * (2 * L - lo) / (6 * L)

    pts = [Fraction(v) for v in (1e-9, 1e-6, 1e-3, 0.3, 2.9, 3.1, 5.9)]
    pts += [L - Fraction(v) for v in (1e-3, 1e-6, 1e-9)]
    pts = [Fraction(float(p)) for p in pts]  # the exact value of the float we pass
    for x in pts:
        for a in pts:
            assert float(beam.green(cond, 6.0, 1.0, float(x), float(a))) == pytest.approx(
                float(exact(x, a)), rel=1e-13)
    a_pub = L - Fraction(1, 10**6)  # propped: the published form under the load
    if cond == "propped":
        b_pub = L - a_pub
        assert float(beam.green(cond, 6.0, 1.0, float(b_pub), float(b_pub))) == pytest.approx(
            float(a_pub**2 * b_pub**3 * (3 * L + a_pub) / (12 * L**3)), rel=1e-12)


@pytest.mark.parametrize("cond", CONDS)
def test_maxwell_reciprocity(cond: str, rng: np.random.Generator) -> None:
    # Maxwell–Betti reciprocal theorem: green(x, a) = green(a, x)
    L, a, x = _geometry(rng, 200)
    assert np.allclose(beam.green(cond, L, EI, x, a), beam.green(cond, L, EI, a, x),
                       rtol=1e-12, atol=1e-18)


@pytest.mark.parametrize("cond", CONDS)
def test_equilibrium_and_end_moments(cond: str, rng: np.random.Generator) -> None:
    # statics: R0 + RL = 1; M(0) = M0, M(L) = ML; V = dM/dx (any statics text)
    L, a, x = _geometry(rng)
    R0, RL = beam.unit_reactions(cond, L, a)
    M0, ML = beam.unit_end_moments(cond, L, a)
    assert np.allclose(R0 + RL, 1.0)
    assert np.allclose(beam.unit_moment(cond, L, L, a), ML, atol=1e-12)
    assert np.allclose(beam.unit_moment(cond, L, 0.0, a), M0, atol=1e-12)
    h = 1e-6
    xs = np.where(np.abs(x - a) < 1e-3, x + 2e-3, x).clip(1e-3, L - 1e-3)
    dM = (beam.unit_moment(cond, L, xs + h, a) - beam.unit_moment(cond, L, xs - h, a)) / (2 * h)
    assert np.allclose(dM, beam.unit_shear(cond, L, xs, a), atol=1e-6)


# --------------------------------------------------------------------------- PyNiteFEA
def _pynite(cond: str, L: float, a: float, xs: list[float], w: float = 0.0):
    from Pynite import FEModel3D

    m = FEModel3D()
    m.add_node("N0", 0.0, 0.0, 0.0)
    m.add_node("N1", L, 0.0, 0.0)
    m.add_material("steel", 200e9, 77e9, 0.3, 0.0)
    m.add_section("sec", 1e-2, 1e-5, EI / 200e9, 1e-6)  # strong axis Iz (loads in Y)
    m.add_member("M", "N0", "N1", "steel", "sec")
    supports = {
        "simple": ((True, True, True, True, False, False),
                   (False, True, True, False, False, False)),
        "fixed": ((True,) * 6, (True,) * 6),
        "propped": ((True,) * 6, (False, True, True, False, False, False)),
        "cantilever": ((True,) * 6, (False,) * 6),
    }[cond]
    m.def_support("N0", *supports[0])
    m.def_support("N1", *supports[1])
    if w:
        m.add_member_dist_load("M", "Fy", -w, -w)
    else:
        m.add_member_pt_load("M", "Fy", -1.0, a)
    m.analyze_linear()
    mem = m.members["M"]
    defl = np.array([-mem.deflection("dy", x, "Combo 1") for x in xs])
    mom = np.array([-mem.moment("Mz", x, "Combo 1") for x in xs])
    r0 = m.nodes["N0"].RxnFY["Combo 1"]
    rl = m.nodes["N1"].RxnFY["Combo 1"]
    return defl, mom, r0, rl


@pytest.mark.parametrize("cond", CONDS)
def test_against_pynite_point_load(cond: str, rng: np.random.Generator) -> None:
    for _ in range(3):
        L = float(rng.uniform(2.0, 15.0))
        a = float(L * rng.uniform(0.1, 0.9))
        xs = [float(v) for v in L * rng.uniform(0.02, 0.98, 4)] + [a]
        defl, mom, r0, rl = _pynite(cond, L, a, xs)
        ours = beam.green(cond, L, EI, np.array(xs), a)
        assert np.allclose(ours, defl, rtol=REL_FE, atol=1e-3 * np.max(np.abs(defl)))
        assert np.allclose(beam.unit_moment(cond, L, np.array(xs), a), mom, rtol=REL_FE,
                           atol=ABS_FE_MOMENT + 1e-3 * np.max(np.abs(mom)))
        R0, RL = beam.unit_reactions(cond, L, a)
        assert float(R0) == pytest.approx(r0, rel=REL_FE, abs=1e-9)
        assert float(RL) == pytest.approx(rl, rel=REL_FE, abs=1e-9)


@pytest.mark.parametrize("cond", CONDS)
def test_against_pynite_udl(cond: str) -> None:
    L, w = 9.0, 2500.0
    xs = [0.7, 2.9, 4.5, 6.1, 8.3]
    defl, mom, r0, rl = _pynite(cond, L, 0.0, xs, w=w)
    assert np.allclose(beam.udl_deflection(cond, L, EI, w, np.array(xs)), defl, rtol=REL_FE)
    assert np.allclose(beam.udl_moment(cond, L, w, np.array(xs)), mom, rtol=REL_FE,
                       atol=1e-6 * w * L**2)
    R0, RL = beam.udl_reactions(cond, L, w)
    assert float(R0) == pytest.approx(r0, rel=REL_FE)
    assert float(RL) == pytest.approx(rl, rel=REL_FE, abs=1e-6 * w * L)


# --------------------------------------------------------------------------- envelopes
@pytest.mark.parametrize("cond", CONDS)
def test_envelopes_match_dense_sampling(cond: str, rng: np.random.Generator) -> None:
    # statics: the exact candidate search equals a dense sampling of M(x), V(x)
    for _ in range(5):
        L = float(rng.uniform(2, 12))
        a = float(L * rng.uniform(0.05, 0.95))
        P = float(rng.uniform(0, 5e4))
        w = float(rng.uniform(0, 2e4))
        xs = np.linspace(0, L, 40001)
        M = P * beam.unit_moment(cond, L, xs, a) + beam.udl_moment(cond, L, w, xs)
        assert float(beam.max_abs_moment(cond, L, P, a, w)) == pytest.approx(
            np.max(np.abs(M)), rel=1e-6)
        V = P * beam.unit_shear(cond, L, xs, a) + beam.udl_shear(cond, L, w, xs)
        assert float(beam.max_abs_shear(cond, L, P, a, w)) == pytest.approx(
            np.max(np.abs(V)), rel=1e-6)


# --------------------------------------------------------------------------- plastic
@pytest.mark.parametrize(
    ("cond", "formula"),
    [
        # virtual work (references "Plastic collapse loads", derived):
        ("simple", lambda L, a, Mp: Mp * L / (a * (L - a))),  # MpL/(ab)
        ("fixed", lambda L, a, Mp: 2 * Mp * L / (a * (L - a))),  # 2MpL/(ab)
        # published Mp(b + 2a)/(ab) with a from the simple support: a_pub = L − a, b_pub = a
        ("propped", lambda L, a, Mp: Mp * (a + 2 * (L - a)) / ((L - a) * a)),
        ("cantilever", lambda L, a, Mp: Mp / a),  # Mp/b, b from the fixed end = our a
    ],
)
def test_plastic_collapse_load(cond: str, formula, rng: np.random.Generator) -> None:
    L, a, _ = _geometry(rng)
    Mp = rng.uniform(1e4, 1e6, L.shape)
    expected = formula(L, a, Mp)
    assert np.allclose(beam.plastic_collapse_load(cond, L, a, Mp), expected,
                       rtol=REL_CLOSED_FORM)
    # the mechanism search with no UDL finds the same load
    assert np.allclose(beam.plastic_collapse_load_udl(cond, L, a, Mp, 0.0), expected,
                       rtol=REL_GRID)


def test_plastic_collapse_with_udl_simple_beam_statics() -> None:
    # statically determinate: collapse when max |M| = Mp (equilibrium), hinge may move
    L, Mp, w = 6.0, 100e3, 8e3
    for a in (0.7, 1.9, 3.0, 4.4):
        P = float(beam.plastic_collapse_load_udl("simple", L, a, Mp, w))
        assert float(beam.max_abs_moment("simple", L, P, a, w)) == pytest.approx(Mp, rel=1e-12)


def test_plastic_collapse_with_udl_fixed_and_cantilever_by_hand() -> None:
    # virtual work (Neal, The Plastic Methods of Structural Analysis): fixed beam, load at
    # midspan, hinges at the ends and under the load: P·δ + w·L·δ/2 = 4Mp·(2δ/L)
    L, Mp, w = 6.0, 100e3, 8e3
    assert float(beam.plastic_collapse_load_udl("fixed", L, L / 2, Mp, w)) == pytest.approx(
        8 * Mp / L - w * L / 2, rel=1e-12)
    # cantilever, root hinge: P·a + w·L²/2 = Mp
    assert float(beam.plastic_collapse_load_udl("cantilever", L, 4.0, Mp, w / 4)) == \
        pytest.approx((Mp - w / 4 * L**2 / 2) / 4.0, rel=1e-12)


@pytest.mark.parametrize("cond", ["simple", "fixed", "propped"])
def test_plastic_collapse_with_udl_is_the_least_mechanism(cond: str,
                                                          rng: np.random.Generator) -> None:
    # kinematic theorem: the collapse load is the least load over the span-hinge
    # position ξ (virtual work, written out here on a fine grid of ξ, Neal)
    kl, kr = {"simple": (1, 1), "fixed": (2, 2), "propped": (2, 1)}[cond]
    L = rng.uniform(2.0, 12.0, 50)
    a = rng.uniform(0.05, 0.95, 50) * L
    Mp = rng.uniform(5e4, 5e5, 50)
    w = rng.uniform(0.0, 6e4, 50)
    xi = np.concatenate([np.linspace(0.0, 1.0, 200_001)[1:-1][None, :] * L[:, None],
                         a[:, None]], axis=1)  # the load's own point: a kink of P(ξ)
    d_a = np.where(a[:, None] <= xi, a[:, None] / xi, (L - a)[:, None] / (L[:, None] - xi))
    P_grid = (Mp[:, None] * (kl / xi + kr / (L[:, None] - xi)) - w[:, None] * L[:, None] / 2
              ) / d_a
    least = np.maximum(P_grid.min(axis=1), 0.0)
    P = beam.plastic_collapse_load_udl(cond, L, a, Mp, w)
    assert np.all(P <= least * (1 + 1e-12))
    assert np.allclose(P, least, rtol=1e-6)


def test_plastic_collapse_at_support_is_infinite() -> None:
    assert np.isinf(beam.plastic_collapse_load("simple", 5.0, 0.0, 1e5))
    assert np.isinf(beam.plastic_collapse_load("fixed", 5.0, 5.0, 1e5))


# --------------------------------------------------------------------------- mass
@pytest.mark.parametrize(
    ("cond", "where", "expected"),
    [
        ("simple", 0.5, 17 / 35),  # Timoshenko Part I: simple beam at midspan
        ("fixed", 0.5, 13 / 35),  # Timoshenko / Roark: fixed–fixed at midspan
        ("cantilever", 1.0, 33 / 140),  # Rao, Mechanical Vibrations: cantilever tip
    ],
)
def test_rayleigh_mass_factor(cond: str, where: float, expected: float) -> None:
    for L in (1.0, 7.5):
        assert float(beam.rayleigh_mass_factor(cond, L, where * L)) == pytest.approx(
            expected, rel=REL_QUADRATURE)


@pytest.mark.parametrize("cond", CONDS)
def test_rayleigh_quadrature_exact_against_trapezoid(cond: str) -> None:
    # ∫ (y/y(a))² dx / L by a dense trapezoid rule (definition)
    L, a = 6.0, 2.2
    xs = np.linspace(0, L, 200001)
    y = beam.green(cond, L, 1.0, xs, a) / beam.green(cond, L, 1.0, a, a)
    assert float(beam.rayleigh_mass_factor(cond, L, a)) == pytest.approx(
        np.trapezoid(y**2, xs) / L, rel=1e-8)


def test_rayleigh_support_point_is_zero() -> None:
    assert float(beam.rayleigh_mass_factor("simple", 5.0, 0.0)) == 0.0


@settings(max_examples=40, deadline=None)
@given(st.sampled_from(CONDS), st.floats(1.0, 30.0), st.floats(0.05, 0.95),
       st.floats(0.0, 1.0))
def test_green_positive_and_broadcasts(cond: str, L: float, ra: float, rx: float) -> None:
    # a downward load never lifts any point of these members (common practice, no source)
    x = np.array([rx * L, L * 0.5])
    g = beam.green(cond, L, EI, x[:, None], np.array([ra * L])[None, :])
    assert g.shape == (2, 1)
    assert np.all(g >= -1e-18)


def test_bad_end_condition() -> None:
    with pytest.raises(ValueError, match="end condition"):
        beam.green("hinged", 5.0, EI, 1.0, 2.0)  # type: ignore[arg-type]
