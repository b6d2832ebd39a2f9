"""The fast kernels of the member actions (:func:`droprig.solver.unit_actions.unit_actions`:
candidate-first tables, in-place ufuncs, dominated stations left out, web resistances
from a table per section) and of the check families
(:class:`droprig.solver.linear_checks.Family`, :func:`~droprig.solver.linear_checks.small_check`)
give the numbers of their plain formulas (:mod:`droprig.solver.reference`:
AISC Manual 15th ed. Table 3-23 by superposition, the linear check
U = |F·u + E|/R, F_allow = (R − sign(u)·E)/|u|, virtual-work collapse loads, AISC 360-16
J10.2/J10.3 and EN 1993-1-5 §6 web resistances) on random floors, within :data:`REL`:
the same expressions, divided in another order (a few ulp; common practice, no
source). Invented floors and forces: inputs only, never expected values.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from droprig.model import Grade, Project, Section, Settings, generate_level
from droprig.solver.floor import build_floor
from droprig.solver.geometry import point_geometry
from droprig.solver.linear_checks import Family, small_check
from droprig.solver.reference import (
    CandidatesReference,
    check_reference,
    unit_actions_reference,
    web_reference,
)
from droprig.solver.unit_actions import unit_actions, web_resistances

REL = 1e-12
"""Kernel against the reference: the same formulas in floating point."""

GRADE = Grade("S355", "EN", ((0.016, 355e6), (0.04, 345e6)), 470e6, E=210e9)
BEAM = Section("B", "custom", d=0.3, bf=0.15, tw=0.0071, tf=0.0107, r=0.015, A=5.4e-3,
               Ix=8.4e-5, Sx=5.6e-4, Zx=6.3e-4, Iy=6.0e-6, mass_per_length=42.2)
GIRDER = Section("G", "custom", d=0.45, bf=0.19, tw=0.0094, tf=0.0146, r=0.021,
                 A=9.9e-3, Ix=3.4e-4, Sx=1.5e-3, Zx=1.7e-3, Iy=1.7e-5, mass_per_length=77.6)
IN, FT, LB, KSI = 0.0254, 0.3048, 0.45359237, 6.894757293168361e6
# W16X26 in A992 fails AISC 360-16 App. 1 λpd: no plastic hinge (tests/solver/test_member.py)
W16X26 = Section("W16X26", "W", 15.7 * IN, 5.50 * IN, 0.250 * IN, 0.345 * IN,
                 (0.747 - 0.345) * IN, 7.68 * IN**2, 301 * IN**4, 38.4 * IN**3,
                 44.2 * IN**3, 9.59 * IN**4, 26 * LB / FT)
A992 = Grade("A992", "ASTM", ((1.0, 50 * KSI),), 65 * KSI, 29000 * KSI)


def _floor(seed: int):
    """A random floor (spacings, girder direction, end conditions, beams that cannot
    form a hinge on some, existing loads up to over capacity) and random drop points,
    a fifth of them on member lines (invented inputs)."""
    rng = np.random.default_rng(seed)
    no_hinge = seed % 2 == 1
    level = generate_level(
        level_id="L", name="r", elevation=0.0,
        x_spacings=tuple(float(v) for v in rng.uniform(4.0, 10.0, int(rng.integers(1, 4)))),
        y_spacings=tuple(float(v) for v in rng.uniform(4.0, 10.0, int(rng.integers(1, 4)))),
        girder_direction="x" if rng.random() < 0.5 else "y",
        beam_spacing=float(rng.uniform(1.5, 3.5)), girder_section=GIRDER,
        beam_section=W16X26 if no_hinge else BEAM, girder_grade=GRADE,
        beam_grade=A992 if no_hinge else GRADE, superimposed_dead=float(rng.uniform(0.0, 2e4)),
        live_in_place=float(rng.uniform(0.0, 5e3)))
    conds = ("simple", "fixed", "propped")
    level = replace(level, members=tuple(replace(m, end_condition=str(rng.choice(conds)))
                                         for m in level.members))
    basis = "aisc360" if no_hinge else str(rng.choice(["en1993", "aisc360"]))
    settings = Settings(design_basis=basis,  # type: ignore[arg-type]
                        resistance_factor=float(rng.uniform(0.8, 1.0)))
    fm = build_floor(level, settings)
    ext = level.grid.extent
    n = 600
    x = rng.uniform(ext.x0, ext.x1, n)
    y = rng.uniform(ext.y0, ext.y1, n)
    m = n // 5
    x[:m], y[:m] = np.round(x[:m]), np.round(y[:m])
    geo = point_geometry(fm, Project(settings=settings, levels=(level,)), x, y)
    keep = geo.path.pair >= 0
    geo = point_geometry(fm, Project(settings=settings, levels=(level,)), x[keep], y[keep])
    return fm, geo, rng


def _close(a: np.ndarray, b: np.ndarray, rel: float = REL) -> bool:
    a, b = np.asarray(a, float), np.asarray(b, float)
    same = (a == b) | (np.isnan(a) & np.isnan(b))
    with np.errstate(invalid="ignore"):
        near = np.abs(a - b) <= rel * np.maximum(np.abs(a), np.abs(b))
    return bool(np.all(same | near))


def _forces(rng: np.random.Generator, n: int) -> np.ndarray:
    F = 10.0 ** rng.uniform(2.0, 7.0, n)
    F[:5] = 0.0
    return F


def _unique_max(c: CandidatesReference, F: np.ndarray) -> np.ndarray:
    """Points whose largest candidate U beats every other member's by 1e-9 (the
    governing member is then defined whatever the rounding)."""
    U = np.abs(F * c.unit + c.exist) / c.resist
    top = U.max(axis=0)
    j = np.argmax(U, axis=0)
    cols = np.arange(F.size)
    other = np.where(c.member == c.member[j, cols], -np.inf, U).max(axis=0)
    return top > other * (1 + 1e-9)


@pytest.fixture(scope="module", params=[11, 12, 13, 14, 15, 16])
def floor(request):
    return _floor(request.param)


def test_families_equal_the_plain_candidates(floor) -> None:
    fm, geo, rng = floor
    ua = unit_actions(fm, geo)
    ref = unit_actions_reference(fm, geo.path)
    F = _forces(rng, geo.x.size)
    for fam, cand, name in ((ua.flexure, ref.flexure, "flexure"),
                            (ua.shear, ref.shear, "shear")):
        U, Fa, member = check_reference(cand, F)
        assert _close(fam.U_at(F), U), name
        assert _close(fam.F_allow, Fa), name
        chk = fam.check(name, F, detail=True)
        assert _close(chk.U, U) and _close(chk.F_allow, Fa), name
        sure = _unique_max(cand, F)
        assert np.array_equal(chk.member[sure], member[sure]), name
        fast = fam.check(name, F, detail=False)
        assert np.array_equal(fast.member[sure], member[sure]), name


def test_plastic_reserve_equals_the_plain_formulas(floor) -> None:
    fm, geo, _ = floor
    ua = unit_actions(fm, geo)
    ref = unit_actions_reference(fm, geo.path)
    assert _close(ua.R_p, ref.R_p)
    assert _close(ua.nh_fa, ref.nh_fa)
    finite = np.isfinite(ref.nh_fa)
    assert np.array_equal(ua.nh_member[finite], ref.nh_member[finite])
    # the member, hinge arm and end condition at every point, support members and
    # ties included: both pick, of the candidates within TIE_REL of the least, the
    # shortest arm (tie_pick / _tie_pick_reference)
    on = geo.path.pair >= 0
    assert np.array_equal(ua.rp_member[on], ref.rp_member[on])
    assert np.array_equal(ua.rp_cond[on], ref.rp_cond[on])
    assert _close(ua.rp_arm[on], ref.rp_arm[on])


def test_tie_rule_picks_the_shortest_arm_within_the_tolerance() -> None:
    """The tie rule of the plastic reserve, kernel and reference alike: within
    TIE_REL of the least collapse force the shortest hinge arm wins (a larger support
    rotation for the same deflection, θ = δ/arm: conservative; common practice, no
    source); beyond it the least force wins whatever its arm; equal arms: the first.
    Invented numbers."""
    from droprig.solver.reference import _tie_pick_reference
    from droprig.solver.unit_actions import TIE_REL, tie_pick

    V = np.array([[100.0, 100.0, 100.0, np.inf],
                  [100.0 * (1 + 0.5 * TIE_REL), 100.0 * (1 + 5 * TIE_REL), 100.0, np.inf],
                  [200.0, 200.0, 100.0, np.inf]])
    arm = np.array([[2.0, 2.0, 1.0, 3.0],
                    [1.0, 1.0, 1.0, 2.0],
                    [0.5, 0.5, 1.0, 1.0]])
    expect = [1, 0, 0, 2]
    assert tie_pick(V, V.min(axis=0), arm).tolist() == expect
    assert [_tie_pick_reference(V[:, i].tolist(), arm[:, i].tolist())
            for i in range(V.shape[1])] == expect


def test_web_resistances_equal_the_clauses(floor) -> None:
    fm, geo, rng = floor
    n = geo.x.size
    lb = rng.uniform(0.0, 0.6, n)
    mem, a = geo.path.members.T, geo.path.a.T
    dist = np.maximum(np.minimum(a, fm.frame.L[mem] - a) - 0.5 * lb, 0.0)
    from droprig.solver import capacity

    Rwy, Rwc = web_resistances(fm, (capacity.web_local_yielding, capacity.web_crippling),
                               mem, np.broadcast_to(lb, mem.shape), dist)
    ry, rc = web_reference(fm, geo.path, lb)
    assert _close(Rwy, ry) and _close(Rwc, rc)


def test_web_resistances_with_few_bearing_lengths(floor) -> None:
    """A bearing length per load and mat thickness (a few distinct values, one of them
    at a single point, which a sample of the points can miss): the table per
    (section, bearing) gives the clauses' values at every point."""
    fm, geo, rng = floor
    n = geo.x.size
    lb = rng.choice([0.1, 0.25, 0.4], n)
    lb[n // 2 + 1] = 0.33  # at one point only
    mem, a = geo.path.members.T, geo.path.a.T
    dist = np.maximum(np.minimum(a, fm.frame.L[mem] - a) - 0.5 * lb, 0.0)
    from droprig.solver import capacity

    Rwy, Rwc = web_resistances(fm, (capacity.web_local_yielding, capacity.web_crippling),
                               mem, np.broadcast_to(lb, mem.shape), dist)
    ry, rc = web_reference(fm, geo.path, lb)
    assert _close(Rwy, ry) and _close(Rwc, rc)


def test_distinct_values_equal_numpy_unique() -> None:
    """The few-distinct-values lookup of the web tables equals ``np.unique`` with its
    inverse (values, and each point's index), with values the sample misses, NaN and
    many distinct values (invented arrays)."""
    from droprig.solver.unit_actions import _distinct

    rng = np.random.default_rng(3)
    cases = [rng.choice([0.2, 0.5, 0.7], 5000), np.r_[np.full(3000, 0.3), 0.9],
             rng.uniform(0.0, 1.0, 300), np.r_[rng.choice([0.1, 0.2], 100), np.nan],
             np.zeros(0), np.full(7, 0.25)]
    for b in cases:
        u, inv = _distinct(b)
        ue, inve = np.unique(b, return_inverse=True)
        assert np.array_equal(u, ue, equal_nan=True)
        assert np.array_equal(np.asarray(inv).ravel(), np.asarray(inve).ravel())


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_check_family_kernels_equal_the_linear_check(seed: int) -> None:
    """Family and small_check against U = |F·u + E|/R, F_allow = (R − sign(u)E)/|u|,
    with zero, negative, over-capacity and unloaded candidates (invented values)."""
    rng = np.random.default_rng(seed)
    C, n = 7, 400
    unit = rng.normal(0.0, 1.0, (C, n))
    unit[rng.random((C, n)) < 0.1] = 0.0
    exist = rng.normal(0.0, 2e4, (C, n))
    resist = rng.uniform(5e4, 2e5, (C, n))
    exist[rng.random((C, n)) < 0.03] = 3e5  # the existing load alone exceeds R
    member = rng.integers(0, 5, (C, n))
    cand = CandidatesReference(unit, exist, resist, member, np.arange(C)[:, None])
    F = _forces(rng, n)
    U, Fa, gov = check_reference(cand, F)
    sure = _unique_max(cand, F)
    chk = Family.from_candidates(unit, exist, resist, member).check("t", F)
    assert _close(chk.U, U) and _close(chk.F_allow, Fa)
    assert np.array_equal(chk.member[sure], gov[sure])
    sc = small_check("t", F, unit, exist, resist, member)
    assert _close(sc.U, U) and _close(sc.F_allow, Fa)
    assert np.array_equal(sc.member[sure], gov[sure])
    assert _close(sc.U_at(2.0 * F), check_reference(cand, 2.0 * F)[0])


@pytest.mark.parametrize("cond", ["simple", "fixed", "propped"])
def test_flexure_allowed_force_is_the_exact_peak_never_above(cond: str) -> None:
    """The force the flexure check allows a point load on a member with its own UDL is
    the force at which the exact peak moment reaches the resistance — never above it.
    Checked against the peak of point load + UDL found independently: for a simple
    beam by AISC Manual 15th ed. Table 3-23 cases 1 (UDL, M = w·x(L − x)/2) and 7
    (point load, M = P·b·x/L left of the load, P·a·(L − x)/L right of it) added and
    maximised where the shear is zero (statics), for the fixed and propped beams by
    :func:`droprig.solver.beam.max_abs_moment` (Roark 7th ed. Table 8.1, exact
    candidates; ``tests/solver/test_beam.py``), each solved for the force with scipy's
    brentq. Before the peak station the stations alone allowed up to ~4 % more
    (issue 9). Invented members and positions: inputs only."""
    from scipy.optimize import brentq

    from droprig.solver import beam
    from droprig.solver.floor import member_floor

    rng = np.random.default_rng({"simple": 1, "fixed": 2, "propped": 3}[cond])

    def simple_peak(P: float, L: float, a: float, w: float) -> float:
        b = L - a
        R0 = P * b / L + w * L / 2.0  # left reaction, Table 3-23 cases 1 + 7
        xs = [0.0, a, L]
        for x in (R0 / w, (R0 - P) / w):  # V = 0 on either side of the load
            xs.append(min(max(x, 0.0), L))
        m = [w * x * (L - x) / 2.0 + (P * b * x / L if x <= a else P * a * (L - x) / L)
             for x in xs]
        return max(abs(v) for v in m)

    worst = 0.0
    for _ in range(25):
        L = float(rng.uniform(3.0, 12.0))
        a = float(rng.uniform(0.05, 0.95)) * L
        fm0 = member_floor(BEAM, GRADE, cond, L, 0.0, Settings())
        Mr = float(fm0.Mr[0])
        w = float(rng.uniform(0.1, 0.7)) * 8.0 * Mr / L**2  # the UDL alone under Mr
        fm = member_floor(BEAM, GRADE, cond, L, w, Settings())
        geo = point_geometry(fm, Project(), np.array([a]), np.array([0.0]))
        F = float(unit_actions(fm, geo).flexure.F_allow[0])
        def over(P: float, L: float = L, a: float = a, w: float = w,
                 Mr: float = Mr) -> float:
            if cond == "simple":
                return simple_peak(P, L, a, w) - Mr
            return float(beam.max_abs_moment(cond, L, P, a, w)) - Mr

        F_exact = brentq(over, 0.0, 1e3 * Mr / L, xtol=1e-12, rtol=1e-14)
        assert F <= F_exact * (1.0 + 1e-9)
        assert F == pytest.approx(F_exact, rel=1e-9)
        worst = max(worst, abs(F / F_exact - 1.0))
    assert worst < 1e-9


def test_trace_geometry_carries_the_plain_member_actions(floor) -> None:
    """The calculation trace's geometry (``point_geometry(..., reference=True)``) hands
    the chain the member actions of the plain formulas
    (:func:`~droprig.solver.reference.reference_unit_actions`), which give the
    kernel's numbers within :data:`REL` at a force — U, allowed force and governing
    member of flexure and shear, the plastic reserve with its member, arm and end
    condition (the same linear check and tie rule; invented floors)."""
    fm, geo, rng = floor
    proj = Project(settings=fm.settings, levels=(fm.level,))
    sub = np.arange(min(geo.x.size, 120))
    ref_geo = point_geometry(fm, proj, geo.x[sub], geo.y[sub], reference=True)
    plain, fast = ref_geo.cache["ua"], unit_actions(fm, point_geometry(fm, proj, geo.x[sub],
                                                                       geo.y[sub]))
    assert plain is not fast and plain.flexure.ut.shape[0] >= fast.flexure.ut.shape[0]
    F = _forces(rng, sub.size)
    for name in ("flexure", "shear"):
        a, b = getattr(plain, name).check(name, F), getattr(fast, name).check(name, F)
        assert _close(a.U, b.U) and _close(a.F_allow, b.F_allow), name
    assert _close(plain.R_p, fast.R_p) and _close(plain.rp_arm, fast.rp_arm)
    assert np.array_equal(plain.rp_member, fast.rp_member)
    assert np.array_equal(plain.rp_cond, fast.rp_cond)
