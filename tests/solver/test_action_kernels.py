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
    # the member and arm where a deck member sets R_p by a clear margin
    deck = np.isfinite(ref.rp_arm)
    assert np.array_equal(ua.rp_member[deck], ref.rp_member[deck])
    assert _close(ua.rp_arm[deck], ref.rp_arm[deck])


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
